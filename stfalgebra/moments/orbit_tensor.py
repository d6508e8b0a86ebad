"""Symmetric tensors built from the vectors of the relative orbit, and their spinor channels.

Every source moment of a two-body system in its centre-of-mass frame is a sum of STF products
of a few vectors: the relative position x, the relative velocity v and (for current moments,
once) ell = x cross v; later the spins S1, S2 and cross products with them. The coefficients
are PN series in 1/c whose coefficients are exact polynomials (:mod:`stfalgebra.exact`) in
r, 1/r, rdot, phidot and the binary's constants. This module holds that representation,
:class:`OrbitTensor`, its exact time derivative along the motion, and its reduction to
"spinor channels", which is what the mode assembler projects.

Representation
--------------
A :class:`VectorBasis` names the vectors and says, for each, (i) its time derivative as a
linear combination of the basis vectors (``dx/dt = v``, ``dv/dt = alpha_x x + alpha_v v``,
``d ell/dt = alpha_v ell`` for an acceleration of the form ``a = alpha_x x + alpha_v v``) and
(ii) its components on the spinor probes (below). A rank-l tensor with terms ``{e: s}``
(``e`` a tuple of exponents, one per basis vector, summing to l) stands for

    T_L = sum_e s_e  STF[ prod_i (V_i)^(e_i) ],

i.e. (in the probe-polynomial language of :mod:`stfalgebra.stf`) the harmonic part of
``sum_e s_e prod_i (V_i.k)^(e_i)``. The STF bracket is implied, never expanded: the
projections downstream (onto alpha_L^lm, an STF tensor) do not see traces. For the planar
basis ``(x, v, ell)`` the key ``(a, b, c)`` means ``x_<A v_B ell_C>``.

Channels
--------
With n = (cos phi, sin phi, 0), lambda = e_z x n, the complex probes Z+ = k.(n + i lambda),
Z- = k.(n - i lambda) and u_z = k.e_z satisfy dZ+/dt = -i phidot Z+, dZ-/dt = +i phidot Z-,
du_z/dt = 0, and n + i lambda = exp(-i phi)(e_x + i e_y). A vector V has components
``V.k = V_+ Z+ + V_- Z- + V_z u_z``: ``x.k = (r/2)(Z+ + Z-)``,
``v.k = (1/2)[(rdot - i r phidot) Z+ + (rdot + i r phidot) Z-]``, ``ell.k = r^2 phidot u_z``.
Writing a tensor as ``sum_pqc C_pqc Z+^p Z-^q u_z^c``, each channel evolves alone:
``d/dt (C Z+^p Z-^q u_z^c) = (dC/dt - i (p - q) phidot C) Z+^p Z-^q u_z^c``, and its contraction
with alpha_L^lm is non-zero only for p - q = m, where it carries exp(-i m phi).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from math import comb, factorial
from typing import Any, Callable, Mapping

from ..exact import ExactPolynomial, engine_symbols
from ..lazy_sympy import sp
from ..pnseries import PNSeries

__all__ = ["OrbitTensor", "VectorBasis", "PLANAR_BASIS", "channel_of_monomial", "differentiate_along_orbit"]

Monomial = tuple[int, ...]
_ZERO = ExactPolynomial(0)


@dataclass(frozen=True)
class VectorBasis:
    """The vectors a orbit tensor is built from.

    Parameters
    ----------
    names:
        Vector names, e.g. ``("x", "v", "ell")``.
    components:
        For each vector, its components ``(V_+, V_-, V_z)`` on the probes ``Z+, Z-, u_z``
        (engine polynomials in r, rdot, phidot, ...; module docstring).
    derivatives:
        ``derivatives(alpha_x, alpha_v)`` returns, for each vector, its time derivative as
        ``{vector name: PN-series coefficient}``; ``alpha_x``, ``alpha_v`` describe the
        acceleration ``a = alpha_x x + alpha_v v``.

    **Conventions**: module docstring.

    Example
    -------
    >>> PLANAR_BASIS.names
    ('x', 'v', 'ell')
    """

    names: tuple[str, ...]
    components: tuple[tuple[ExactPolynomial, ExactPolynomial, ExactPolynomial], ...]
    derivatives: Callable[[PNSeries, PNSeries], dict[str, dict[str, PNSeries]]] = field(compare=False)

    def index(self, name: str) -> int:
        return self.names.index(name)


def _planar_components() -> tuple:
    s = engine_symbols()
    half = ExactPolynomial(1) / 2
    return (
        (s.r * half, s.r * half, _ZERO),
        ((s.rdot - s.I * s.r * s.phidot) * half, (s.rdot + s.I * s.r * s.phidot) * half, _ZERO),
        (_ZERO, _ZERO, s.r**2 * s.phidot),
    )


def _planar_derivatives(alpha_x: PNSeries, alpha_v: PNSeries) -> dict[str, dict[str, PNSeries]]:
    one = PNSeries._from_trusted({0: ExactPolynomial(1)}, float("inf"))
    return {"x": {"v": one}, "v": {"x": alpha_x, "v": alpha_v}, "ell": {"ell": alpha_v}}


#: The basis of non-spinning planar orbits: x, v and ell = x cross v.
PLANAR_BASIS = VectorBasis(("x", "v", "ell"), _planar_components(), _planar_derivatives)


def _as_series(value: Any) -> PNSeries:
    if isinstance(value, PNSeries):
        return value
    if isinstance(value, ExactPolynomial):
        return PNSeries._from_trusted({0: value}, float("inf"))
    return PNSeries({0: value}, float("inf"))


@dataclass(frozen=True)
class OrbitTensor:
    """An STF tensor ``sum_e s_e STF[prod_i V_i^(e_i)]`` with PN-series coefficients (eps = 1/c).

    Parameters
    ----------
    rank:
        l >= 0.
    terms:
        Mapping from exponent tuples (one entry per basis vector, summing to ``rank``) to
        PNSeries (or scalars).
    basis:
        The vectors (default :data:`PLANAR_BASIS`: key ``(a, b, c)`` is ``x_<A v_B ell_C>``).

    **Conventions**: x = y1 - y2, v = dx/dt, ell = x cross v = r^2 phidot e_z for an orbit in
    the x-y plane with phi measured from the x axis (``../shared/conventions.md``).

    Example
    -------
    >>> from stfalgebra.moments.orbit_tensor import OrbitTensor
    >>> T = OrbitTensor.monomial(2, (2, 0, 0))          # x_<ij>
    >>> T.channel(2, 0, 0).coefficient(0)                  # x_<ij> k_ij = r^2 (Z+ + Z-)^2/4
    r**2/4
    """

    rank: int
    terms: Mapping[Monomial, PNSeries]
    provenance: tuple[str, ...] = field(default=(), compare=False)
    basis: VectorBasis = field(default=PLANAR_BASIS, compare=False)

    def __post_init__(self) -> None:
        if isinstance(self.rank, bool) or not isinstance(self.rank, int) or self.rank < 0:
            raise ValueError(f"rank must be a non-negative integer, got {self.rank!r}")
        size = len(self.basis.names)
        clean: dict[Monomial, PNSeries] = {}
        for key, value in self.terms.items():
            key = tuple(key)
            if len(key) != size or min(key) < 0 or sum(key) != self.rank:
                raise ValueError(f"monomial {key} does not have rank {self.rank} over the basis {self.basis.names}")
            clean[key] = _as_series(value)
        object.__setattr__(self, "terms", dict(sorted(clean.items())))

    @classmethod
    def _trusted(cls, rank: int, terms: dict, basis: VectorBasis, provenance: tuple = ()) -> "OrbitTensor":
        obj = object.__new__(cls)
        object.__setattr__(obj, "rank", rank)
        object.__setattr__(obj, "terms", dict(sorted(terms.items())))
        object.__setattr__(obj, "provenance", provenance)
        object.__setattr__(obj, "basis", basis)
        return obj

    # -- construction -------------------------------------------------------------------
    @classmethod
    def monomial(cls, rank: int, key: Monomial, coefficient: Any = 1, basis: VectorBasis = PLANAR_BASIS) -> "OrbitTensor":
        """The single term ``coefficient * STF[prod V_i^(key_i)]``."""
        if not isinstance(coefficient, (PNSeries, ExactPolynomial)) and isinstance(coefficient, int):
            coefficient = ExactPolynomial(coefficient)
        return cls(rank, {key: coefficient}, basis=basis)

    @classmethod
    def zero(cls, rank: int, basis: VectorBasis = PLANAR_BASIS) -> "OrbitTensor":
        return cls(rank, {}, basis=basis)

    # -- algebra ------------------------------------------------------------------------
    def __add__(self, other: "OrbitTensor") -> "OrbitTensor":
        if not isinstance(other, OrbitTensor):
            return NotImplemented
        if other.rank != self.rank:
            raise ValueError(f"cannot add tensors of ranks {self.rank} and {other.rank}")
        if other.basis.names != self.basis.names:
            raise ValueError(f"cannot add tensors over the bases {self.basis.names} and {other.basis.names}")
        out = dict(self.terms)
        for key, value in other.terms.items():
            out[key] = out[key] + value if key in out else value
        return OrbitTensor._trusted(self.rank, out, self.basis)

    def __neg__(self) -> "OrbitTensor":
        return self.scale(-1)

    def __sub__(self, other: "OrbitTensor") -> "OrbitTensor":
        return self + (-other)

    def scale(self, factor: Any) -> "OrbitTensor":
        """Multiply every coefficient by a scalar or a PN series."""
        return OrbitTensor._trusted(self.rank, {k: v * factor for k, v in self.terms.items()}, self.basis)

    def map_coefficients(self, func: Callable[[Any], Any]) -> "OrbitTensor":
        return OrbitTensor._trusted(self.rank, {k: v.map_coefficients(func) for k, v in self.terms.items()}, self.basis)

    def truncate(self, order: Any) -> "OrbitTensor":
        """Every coefficient truncated at ``order``."""
        return OrbitTensor._trusted(self.rank, {k: v.truncate(order) for k, v in self.terms.items()},
                                       self.basis, self.provenance)

    # -- time derivative ----------------------------------------------------------------
    def time_derivative(self, scalar_derivative: Callable[[PNSeries], PNSeries],
                        alpha_x: PNSeries, alpha_v: PNSeries) -> "OrbitTensor":
        """d/dt along a motion with acceleration ``a = alpha_x x + alpha_v v``.

        Each factor ``(V_i.k)^(e_i)`` gives ``e_i (V_i.k)^(e_i - 1) (dV_i/dt).k`` with the
        basis' derivative rules (planar: ``d(x.k)/dt = v.k``, ``d(v.k)/dt = alpha_x x.k +
        alpha_v v.k``, ``d(ell.k)/dt = alpha_v ell.k``); ``scalar_derivative`` differentiates
        the coefficients (functions of r, rdot, phidot) along the same motion.
        """
        rules = self.basis.derivatives(alpha_x, alpha_v)
        index = {name: k for k, name in enumerate(self.basis.names)}
        out: dict[Monomial, PNSeries] = {}

        def add(key: Monomial, value: PNSeries) -> None:
            out[key] = out[key] + value if key in out else value

        for key, s in self.terms.items():
            add(key, scalar_derivative(s))
            for i, exponent in enumerate(key):
                if not exponent:
                    continue
                for target, weight in rules[self.basis.names[i]].items():
                    j = index[target]
                    new = list(key)
                    new[i] -= 1
                    new[j] += 1
                    add(tuple(new), s * weight * exponent)
        return OrbitTensor._trusted(self.rank, out, self.basis)

    # -- channels -----------------------------------------------------------------------
    def on_circular_orbit(self, frequency: Any = None) -> "OrbitTensor":
        """The tensor on a circular orbit: ``rdot = 0`` in every coefficient (``phidot`` is then
        the constant orbital frequency omega). ``frequency`` is accepted for sympy-era callers
        and must be omega or None."""
        return self.map_coefficients(lambda e: e.substitute({"rdot": 0}) if isinstance(e, ExactPolynomial)
                                     else _sympy_on_circle(e))

    def channel(self, p: int, q: int, c: int, *, circular_frequency: Any = None) -> PNSeries:
        """Coefficient of ``Z+^p Z-^q u_z^c`` (module docstring), a PN series.

        ``circular_frequency`` (any non-None value) takes the channel factors on the circular
        orbit (``rdot = 0``); the coefficients should already be there
        (:meth:`on_circular_orbit`).
        """
        total = None
        circular = circular_frequency is not None
        for key, s in self.terms.items():
            factor = _channel_factor(self.basis, key, p, q, c, circular)
            if factor.is_zero():
                continue
            piece = s * factor
            total = piece if total is None else total + piece
        if total is None:
            known = min((s._known2 for s in self.terms.values()), default=float("inf"))
            return PNSeries._from_trusted({}, known)
        return total

    def with_provenance(self, *lines: str) -> "OrbitTensor":
        """The same tensor with a provenance trail (where its inputs came from)."""
        return replace(self, provenance=self.provenance + tuple(lines))

    def _structure_name(self, key: Monomial, latex: bool) -> str:
        names = {"ell": r"\ell" if latex else "ell"}
        parts = []
        for name, exponent in zip(self.basis.names, key):
            label = names.get(name, name)
            if latex:
                parts.extend([label] * exponent)
            elif exponent:
                parts.append(label if exponent == 1 else f"{label}^{exponent}")
        return ("".join(parts) if latex else " ".join(parts)) or "1"

    def _repr_latex_(self) -> str:
        from ..symbols import c as light

        from ..symbols import eps
        pieces = []
        for key, s in sorted(self.terms.items(), key=lambda kv: (-kv[0][0], kv[0])):
            coeff = sp.latex(sp.factor_terms(s.to_expression(eps).subs(eps, 1 / light)))
            pieces.append(rf"\left({coeff}\right) \mathrm{{STF}}[{self._structure_name(key, True)}]")
        return "$" + (" + ".join(pieces) if pieces else "0") + "$"

    def __str__(self) -> str:
        """Readable form: one line per STF structure, coefficients with c explicit."""
        if not self.terms:
            return "0"
        lines = []
        for key, s in sorted(self.terms.items(), key=lambda kv: (-kv[0][0], kv[0])):
            pieces = []
            for order in s.orders:
                coeff = sp.factor(sp.sympify(s.coefficient(order)))
                pieces.append(sp.sstr(coeff) if order == 0 else f"({sp.sstr(coeff)})/c^{sp.sstr(2 * sp.Rational(order))}")
            body = " + ".join(pieces) if pieces else "0"
            lines.append(f"STF[{self._structure_name(key, False)}] * [{body}]")
        known = min(s.known_through for s in self.terms.values())
        text = "\n".join(lines)
        return text + f"\n(+ O(1/c^{sp.sstr(2 * sp.Rational(known) + 1)}) relative)" if known != float("inf") else text


def _sympy_on_circle(expr: Any) -> Any:
    from ..symbols import rdot

    return sp.expand(expr.xreplace({rdot: sp.Integer(0)}))


def _multinomial_expansion(components: tuple, exponent: int) -> dict[tuple[int, int, int], ExactPolynomial]:
    """(A+ Z+ + A- Z- + Az uz)^e as {(p, q, c): coefficient}."""
    plus, minus, z = components
    out: dict[tuple[int, int, int], ExactPolynomial] = {}
    for i in range(exponent + 1):
        if i and plus.is_zero():
            break
        for j in range(exponent - i + 1):
            if j and minus.is_zero():
                break
            k = exponent - i - j
            if k and z.is_zero():
                continue
            weight = factorial(exponent) // (factorial(i) * factorial(j) * factorial(k))
            out[(i, j, k)] = plus**i * minus**j * z**k * weight
    return out


_CHANNEL_CACHE: dict = {}


def _channel_factor(basis: VectorBasis, key: Monomial, p: int, q: int, c: int, circular: bool) -> ExactPolynomial:
    """Coefficient of Z+^p Z-^q u_z^c in prod_i (V_i.k)^(key_i)."""
    cache_key = (basis.names, key, p, q, c, circular)
    cached = _CHANNEL_CACHE.get(cache_key)
    if cached is not None:
        return cached
    partial: dict[tuple[int, int, int], ExactPolynomial] = {(0, 0, 0): ExactPolynomial(1)}
    for components, exponent in zip(basis.components, key):
        if not exponent:
            continue
        if circular:
            components = tuple(v.substitute({"rdot": 0}) for v in components)
        expansion = _multinomial_expansion(components, exponent)
        updated: dict[tuple[int, int, int], ExactPolynomial] = {}
        for (a1, b1, c1), v1 in partial.items():
            for (a2, b2, c2), v2 in expansion.items():
                target = (a1 + a2, b1 + b2, c1 + c2)
                if target[0] > p or target[1] > q or target[2] > c:
                    continue
                product = v1 * v2
                updated[target] = updated[target] + product if target in updated else product
        partial = updated
    result = partial.get((p, q, c), _ZERO)
    _CHANNEL_CACHE[cache_key] = result
    return result


def channel_of_monomial(a: int, b: int, c: int, p: int, q: int, *, radial: Any = None, angular: Any = None) -> Any:
    """Coefficient of Z+^p Z-^q u_z^c in (x.k)^a (v.k)^b (ell.k)^c for a planar orbit (sympy).

    x.k = (r/2)(Z+ + Z-), v.k = (1/2)[(rdot - i r phidot) Z+ + (rdot + i r phidot) Z-],
    ell.k = r^2 phidot u_z. Zero unless p + q = a + b. ``radial``, ``angular`` replace rdot,
    phidot (for example 0 and omega on a circular orbit).

    Example
    -------
    >>> channel_of_monomial(2, 0, 0, 1, 1)
    r**2/2
    """
    from ..symbols import phidot, r, rdot

    if p + q != a + b or p < 0 or q < 0:
        return sp.Integer(0)
    radial = rdot if radial is None else radial
    angular = phidot if angular is None else angular
    plus = radial - sp.I * r * angular
    minus = radial + sp.I * r * angular
    total = sp.Integer(0)
    for j in range(max(0, p - b), min(a, p) + 1):  # j powers of Z+ from (x.k)^a
        k = p - j                                   # powers of Z+ from (v.k)^b
        total += comb(a, j) * comb(b, k) * plus**k * minus**(b - k)
    return sp.expand(total * r**a * (r**2 * angular)**c / sp.Integer(2)**(a + b))


def _orbit_operators(pn_order: int) -> tuple[Any, PNSeries, PNSeries]:
    """The orbit derivative and ``alpha_x``, ``alpha_v`` of ``a = alpha_x x + alpha_v v``."""
    from ..binary.cited_inputs import (
        acceleration_n_factor, acceleration_v_factor, check_input_order, known_through,
    )
    from ..binary.orbit_derivative import OrbitTimeDerivative

    cached = _OPERATORS.get(pn_order)
    if cached is not None:
        return cached
    check_input_order(pn_order, "equations of motion")
    s = engine_symbols()
    known2 = known_through(pn_order).twice
    # a = alpha n + beta v with n = x/r: alpha_x = alpha/r, alpha_v = beta
    alpha_x = {2 * k: value * s.r**-1 for k, value in acceleration_n_factor(s).items() if k <= pn_order}
    alpha_v = {2 * k: value for k, value in acceleration_v_factor(s).items() if k <= pn_order}
    result = (OrbitTimeDerivative(pn_order), PNSeries._from_trusted(alpha_x, known2),
              PNSeries._from_trusted(alpha_v, known2))
    _OPERATORS[pn_order] = result
    return result


_OPERATORS: dict[int, tuple] = {}


def differentiate_along_orbit(tensor: OrbitTensor, pn_order: int, times: int = 1) -> OrbitTensor:
    """The ``times``-th time derivative of a orbit tensor along the PN relative orbit.

    Parameters
    ----------
    tensor:
        A orbit tensor with engine coefficients.
    pn_order:
        PN order of the equations of motion used.
    times:
        A non-negative int.

    Returns
    -------
    OrbitTensor

    **Conventions**: harmonic-coordinate equations of motion of
    :mod:`stfalgebra.binary.cited_inputs`, written ``a = alpha_x x + alpha_v v``.

    Example
    -------
    >>> x_ = OrbitTensor.monomial(1, (1, 0, 0))
    >>> differentiate_along_orbit(x_, 0, 2).terms[(1, 0, 0)].coefficient(0)   # d^2x/dt^2 = -G m x/r^3
    -G*m*r**(-3)
    """
    if isinstance(times, bool) or not isinstance(times, int) or times < 0:
        raise ValueError(f"times must be a non-negative int, got {times!r}")
    derivative, alpha_x, alpha_v = _orbit_operators(pn_order)
    for _ in range(times):
        tensor = tensor.time_derivative(derivative, alpha_x, alpha_v)
    return tensor
