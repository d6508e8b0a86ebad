"""Symmetric tensors built from the relative orbit: x, v and ell = x cross v.

Every source moment of a planar two-body system in its centre-of-mass frame is a sum of
STF products of the relative position x, the relative velocity v and (for current moments,
once) the vector ell = x cross v, with scalar coefficients that are PN series in 1/c whose
coefficients depend on r, rdot, phidot. This module holds that representation,
:class:`RelativeTensor`, its exact time derivative along an equation of motion of the form
dv/dt = alpha_x x + alpha_v v (Newtonian and 1PN harmonic dynamics both have it), and its
reduction to "spinor channels", which is what the mode assembler projects.

Representation
--------------
A rank-l :class:`RelativeTensor` with terms ``{(a, b, c): s}`` stands for the STF tensor

    T_L = sum s_abc  x_<A v_B ell_C>,      a + b + c = l,

i.e. (in the probe-polynomial language of :mod:`stfalgebra.stf`) the harmonic part of
sum s_abc (x.k)^a (v.k)^b (ell.k)^c. The STF bracket is implied, never expanded: the
projections used downstream (onto alpha_L^lm, an STF tensor) do not see traces.

Channels
--------
With n = (cos phi, sin phi, 0), lambda = e_z x n, the complex probes Z+ = k.(n + i lambda),
Z- = k.(n - i lambda) and u_z = k.e_z satisfy dZ+/dt = -i phidot Z+, dZ-/dt = +i phidot Z-,
du_z/dt = 0, and n + i lambda = exp(-i phi)(e_x + i e_y). Writing a tensor as
sum_{pqc} C_pqc Z+^p Z-^q u_z^c, each channel evolves alone:
d/dt (C Z+^p Z-^q u_z^c) = (dC/dt - i (p - q) phidot C) Z+^p Z-^q u_z^c, and its contraction
with alpha_L^lm is non-zero only for p - q = m, where it carries exp(-i m phi).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from math import comb
from typing import Callable, Mapping

import sympy as sp

from ..pnseries import PNSeries
from ..symbols import phidot, r, rdot

__all__ = ["RelativeTensor", "channel_of_monomial"]

Monomial = tuple[int, int, int]


def _as_series(value) -> PNSeries:
    if isinstance(value, PNSeries):
        return value
    return PNSeries({0: sp.sympify(value)}, sp.oo)


@dataclass(frozen=True)
class RelativeTensor:
    """An STF tensor sum_abc s_abc x_<A v_B ell_C> with PN-series coefficients (eps = 1/c).

    Parameters
    ----------
    rank:
        l >= 0.
    terms:
        Mapping (a, b, c) -> PNSeries (or a scalar), a + b + c = rank. c counts factors of
        ell = x cross v (0 for mass-type tensors, 1 for current-type ones).

    **Conventions**: x = y1 - y2, v = dx/dt, ell = x cross v = r^2 phidot e_z for an orbit in
    the x-y plane with phi measured from the x axis (``../shared/conventions.md``).

    Example
    -------
    >>> from stfalgebra.moments.relative_tensor import RelativeTensor
    >>> T = RelativeTensor.monomial(2, (2, 0, 0))          # x_<ij>
    >>> T.channel(2, 0, 0).coefficient(0)                  # x_<ij> k_ij = r^2 (Z+ + Z-)^2/4
    r**2/4
    """

    rank: int
    terms: Mapping[Monomial, PNSeries]
    provenance: tuple[str, ...] = field(default=(), compare=False)

    def __post_init__(self) -> None:
        if not isinstance(self.rank, int) or self.rank < 0:
            raise ValueError(f"rank must be a non-negative integer, got {self.rank!r}")
        clean: dict[Monomial, PNSeries] = {}
        for key, value in self.terms.items():
            a, b, c = key
            if min(a, b, c) < 0 or a + b + c != self.rank:
                raise ValueError(f"monomial {key} does not have rank {self.rank}")
            clean[key] = _as_series(value)
        object.__setattr__(self, "terms", dict(sorted(clean.items())))

    # -- construction -------------------------------------------------------------------
    @classmethod
    def monomial(cls, rank: int, key: Monomial, coefficient=1) -> "RelativeTensor":
        """The single term ``coefficient * x_<A v_B ell_C>`` with (a, b, c) = key."""
        return cls(rank, {key: coefficient})

    @classmethod
    def zero(cls, rank: int) -> "RelativeTensor":
        return cls(rank, {})

    # -- algebra ------------------------------------------------------------------------
    def __add__(self, other: "RelativeTensor") -> "RelativeTensor":
        if not isinstance(other, RelativeTensor):
            return NotImplemented
        if other.rank != self.rank:
            raise ValueError(f"cannot add tensors of ranks {self.rank} and {other.rank}")
        out = dict(self.terms)
        for key, value in other.terms.items():
            out[key] = out[key] + value if key in out else value
        return RelativeTensor(self.rank, out)

    def __neg__(self) -> "RelativeTensor":
        return self.scale(-1)

    def __sub__(self, other: "RelativeTensor") -> "RelativeTensor":
        return self + (-other)

    def scale(self, factor) -> "RelativeTensor":
        """Multiply every coefficient by a scalar or a PN series."""
        return RelativeTensor(self.rank, {k: v * factor for k, v in self.terms.items()})

    def map_coefficients(self, func: Callable[[sp.Expr], sp.Expr]) -> "RelativeTensor":
        return RelativeTensor(self.rank, {k: v.map_coefficients(func) for k, v in self.terms.items()})

    # -- time derivative ----------------------------------------------------------------
    def time_derivative(self, scalar_derivative: Callable[[PNSeries], PNSeries],
                        alpha_x: PNSeries, alpha_v: PNSeries) -> "RelativeTensor":
        """d/dt along an equation of motion dv/dt = alpha_x x + alpha_v v.

        Uses d(x.k)/dt = v.k, d(v.k)/dt = alpha_x x.k + alpha_v v.k and
        d(ell.k)/dt = (x cross dv/dt).k = alpha_v ell.k; ``scalar_derivative`` differentiates
        the coefficients (functions of r, rdot, phidot) along the same dynamics.
        """
        out: dict[Monomial, PNSeries] = {}

        def add(key: Monomial, value: PNSeries) -> None:
            out[key] = out[key] + value if key in out else value

        for (a, b, c), s in self.terms.items():
            add((a, b, c), scalar_derivative(s))
            if a:
                add((a - 1, b + 1, c), s * a)
            if b:
                add((a + 1, b - 1, c), s * alpha_x * b)
                add((a, b, c), s * alpha_v * b)
            if c:
                add((a, b, c), s * alpha_v * c)
        return RelativeTensor(self.rank, {k: v.expand() for k, v in out.items()})

    # -- channels -----------------------------------------------------------------------
    def on_circular_orbit(self, frequency: sp.Expr) -> "RelativeTensor":
        """The tensor on a circular orbit: rdot = 0, phidot = frequency in every coefficient."""
        on_orbit = {rdot: sp.Integer(0), phidot: frequency}
        return self.map_coefficients(lambda e: sp.expand(e.xreplace(on_orbit)))

    def channel(self, p: int, q: int, c: int, *, circular_frequency: sp.Expr | None = None) -> PNSeries:
        """Coefficient of Z+^p Z-^q u_z^c (see the module docstring), a PN series.

        Only terms with the same number c of ell factors contribute (ell.k = r^2 phidot u_z).
        ``circular_frequency`` = omega says the coefficients are already on the circular orbit
        (:meth:`on_circular_orbit`), so the channel factors are taken there too.
        """
        radial, angular = rdot, phidot
        if circular_frequency is not None:
            radial, angular = sp.Integer(0), circular_frequency
        total = None
        for (a, b, cc), s in self.terms.items():
            if cc != c:
                continue
            factor = channel_of_monomial(a, b, c, p, q, radial=radial, angular=angular)
            if factor == 0:
                continue
            piece = s * factor
            total = piece if total is None else total + piece
        if total is None:
            known = min((s.known_through for s in self.terms.values()), default=sp.oo)
            return PNSeries({}, known)
        return total.expand()

    def with_provenance(self, *lines: str) -> "RelativeTensor":
        """The same tensor with a provenance trail (where its inputs came from)."""
        return replace(self, provenance=self.provenance + tuple(lines))

    def _repr_latex_(self) -> str:
        from ..symbols import c as light

        eps = sp.Symbol("eps")
        pieces = []
        for (a, b, c), s in sorted(self.terms.items(), key=lambda kv: (-kv[0][0], kv[0])):
            names = ["x"] * a + ["v"] * b + [r"\ell"] * c
            tensor = "".join(names) or "1"
            coeff = sp.latex(sp.factor_terms(s.to_expression(eps).subs(eps, 1 / light)))
            pieces.append(rf"\left({coeff}\right) \mathrm{{STF}}[{tensor}]")
        return "$" + (" + ".join(pieces) if pieces else "0") + "$"

    def __str__(self) -> str:
        """Readable form: one line per STF structure, coefficients with c explicit."""
        if not self.terms:
            return "0"
        lines = []
        for (a, b, c), s in sorted(self.terms.items(), key=lambda kv: (-kv[0][0], kv[0])):
            parts = [f"x^{a}" if a > 1 else "x" if a == 1 else "",
                     f"v^{b}" if b > 1 else "v" if b == 1 else "",
                     f"ell^{c}" if c > 1 else "ell" if c == 1 else ""]
            tensor = " ".join(p for p in parts if p) or "1"
            pieces = []
            for order in s.orders:
                coeff = sp.factor(s.coefficient(order))
                pieces.append(sp.sstr(coeff) if order == 0 else f"({sp.sstr(coeff)})/c^{sp.sstr(2 * order)}")
            body = " + ".join(pieces) if pieces else "0"
            lines.append(f"STF[{tensor}] * [{body}]")
        known = min(s.known_through for s in self.terms.values())
        return "\n".join(lines) + f"\n(+ O(1/c^{sp.sstr(2 * known + 1)}) relative)" if known != sp.oo else "\n".join(lines)


def channel_of_monomial(a: int, b: int, c: int, p: int, q: int, *,
                        radial: sp.Expr = rdot, angular: sp.Expr = phidot) -> sp.Expr:
    """Coefficient of Z+^p Z-^q u_z^c in (x.k)^a (v.k)^b (ell.k)^c for a planar orbit.

    x.k = (r/2)(Z+ + Z-), v.k = (1/2)[(rdot - i r phidot) Z+ + (rdot + i r phidot) Z-],
    ell.k = r^2 phidot u_z. Zero unless p + q = a + b.
    """
    if p + q != a + b or p < 0 or q < 0:
        return sp.Integer(0)
    plus = radial - sp.I * r * angular
    minus = radial + sp.I * r * angular
    total = sp.Integer(0)
    for j in range(max(0, p - b), min(a, p) + 1):  # j powers of Z+ from (x.k)^a
        k = p - j                                   # powers of Z+ from (v.k)^b
        total += comb(a, j) * comb(b, k) * plus**k * minus**(b - k)
    return sp.expand(total * r**a * (r**2 * angular)**c / sp.Integer(2)**(a + b))
