"""The quadratic interactions of U_L and V_L on the circular orbit through relative 2.5PN.

The MPM iteration (:mod:`stfalgebra.mpm`, tabulated in
:mod:`stfalgebra.radiative.interaction_table`) gives every quadratic term of a radiative moment
as ``coefficient (G/c^(2 order)) STF_l[A^(p)_(K P) B^(q)_(K Q)]``, with ``K`` the contracted
index pairs (none or one here), or with one Levi-Civita symbol
``STF_l[eps_(i a b) A^(p)_(a K P) B^(q)_(b K Q)]``; instantaneous, or integrated over the past
(memory). Through relative 2.5PN the terms are:

- the terms entering at relative 1.5PN (U_L with l >= 4, V_L with l >= 3), evaluated here with
  the **1PN** source moments (and the 1PN angular momentum S_i = J_i), so that they are
  complete through relative 2.5PN;
- the terms entering at relative 2.5PN (every l; the first quadratic terms of U_ij, U_ijk,
  V_ij), with the Newtonian moments.

The evaluation uses the **probe polynomial** of an STF tensor, ``T(k) = T_L k^L``, written in
``B = k.e_+``, ``Bb = k.e_-`` (``e_+- = e_x +- i e_y``) and ``Z = k.e_z`` at the orbital phase
phi = 0 (``n = e_x``, ``lambda = e_y``), kept harmonic (trace-free) so that derivatives in k
give the contractions:

- ``A_(J P) k^P = ((p - j)!/p!) d^J A(k)/dk^J`` for j indices taken out of a rank-p tensor;
- ``sum_c d_c F d_c G = 2 (F_B G_Bb + F_Bb G_B) + F_Z G_Z``;
- ``eps_(iab) k_i d_a F d_b G = i [G_Z (B F_B - Bb F_Bb) - F_Z (B G_B - Bb G_Bb) + 2 Z (F_Bb G_B - F_B G_Bb)]``
  (the Cartesian triple product rewritten in B, Bb, Z);
- the STF part of the product is its value on a null k: ``Z^2 = -B Bb`` modulo ``k^2``.

A monomial ``B^a Bb^b Z^c`` is the harmonic ``exp(-i (a - b) phi)`` (``x.k = r (e^(-i phi) B +
e^(i phi) Bb)/2``), so a p-th time derivative on the circle multiplies it by
``(-i (a - b) omega)^p`` and the oscillating memory integral ``int_-oo^t`` of the harmonic
``s != 0`` by ``i/(s omega)`` (the orbit's drift enters 2.5PN beyond: relative 4PN here). The
channel (p, q, c) of a mode (:func:`~stfalgebra.radiative.projection.mode_channel`) is the
coefficient of ``B^p Bb^q Z^c`` after the null reduction: the same channel as
:meth:`~stfalgebra.moments.orbit_tensor.OrbitTensor.channel` (``Z+ = e^(-i phi) B``).

The m = 0 channel of a memory term is the non-oscillating (DC) memory, an integral over the
whole past: it is refused by name (:class:`~stfalgebra.errors.RefusedModeError`) when it does
not vanish; the instantaneous products give the odd-l m = 0 modes.

**Conventions**: channels of :mod:`stfalgebra.moments.orbit_tensor` (the factor exp(-i m phi)
implied), eps = 1/c, engine coefficients in G, m, nu, delta, r, phidot (= omega on the circle),
I; harmonic coordinates; the canonical moments equal the source moments at the accuracy used
(their difference enters at relative 2.5PN, :mod:`stfalgebra.moments.canonical`).
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from math import factorial
from typing import Iterable

from ..errors import RefusedModeError
from ..exact import ExactPolynomial
from ..moments.current import current_moment
from ..moments.mass import mass_moment
from ..orders import PNOrder
from ..pnseries import PNSeries
from .contributions import Contribution, check_mode, mode_kind
from .projection import mode_channel

__all__ = ["probe_polynomial", "orbit_tensor_probe", "harmonic_projection", "laplacian", "quadratic_terms_through",
           "circular_interaction_channel", "circular_quadratic_channel_through"]

Monomial = tuple[int, int, int]
Poly = dict[Monomial, ExactPolynomial]

_I = ExactPolynomial("I")
_PHIDOT = ExactPolynomial("phidot")
_R = ExactPolynomial("r")
_ZERO = ExactPolynomial(0)
#: the relative order through which the evaluation is complete (tails of tails and cubic
#: interactions enter at relative 3PN)
THROUGH = PNOrder(5, 2)


# ----------------------------------------------------------------------------- polynomials
def _add_into(out: Poly, key: Monomial, value: ExactPolynomial) -> None:
    if value.is_zero():
        return
    total = out[key] + value if key in out else value
    if total.is_zero():
        out.pop(key, None)
    else:
        out[key] = total


def _times(left: Poly, right: Poly) -> Poly:
    out: Poly = {}
    for (a1, b1, c1), v1 in left.items():
        for (a2, b2, c2), v2 in right.items():
            _add_into(out, (a1 + a2, b1 + b2, c1 + c2), v1 * v2)
    return out


def _scaled(poly: Poly, factor) -> Poly:
    out: Poly = {}
    for key, value in poly.items():
        _add_into(out, key, value * factor)
    return out


def _sum(polys: Iterable[Poly]) -> Poly:
    out: Poly = {}
    for poly in polys:
        for key, value in poly.items():
            _add_into(out, key, value)
    return out


def _d(poly: Poly, slot: int) -> Poly:
    """d/dB (slot 0), d/dBb (1) or d/dZ (2)."""
    out: Poly = {}
    for key, value in poly.items():
        power = key[slot]
        if power:
            lowered = list(key)
            lowered[slot] -= 1
            _add_into(out, tuple(lowered), value * power)
    return out


def laplacian(poly: Poly) -> Poly:
    """The flat Laplacian in k, ``4 d_B d_Bb + d_Z^2`` (``k1 = (B + Bb)/2``, ``k2 = (B - Bb)/(2 i)``).

    Example
    -------
    >>> laplacian({(1, 1, 0): ExactPolynomial(1)})     # k_x^2 + k_y^2
    {(0, 0, 0): 4}
    """
    return _sum((_scaled(_d(_d(poly, 0), 1), 4), _d(_d(poly, 2), 2)))


def _double_factorial(n: int) -> int:
    return 1 if n <= 0 else n * _double_factorial(n - 2)


def harmonic_projection(poly: Poly, degree: int) -> Poly:
    """The harmonic (STF) part of a homogeneous polynomial of ``degree`` in k:
    ``sum_j (-1)^j (2l-2j-1)!!/((2l-1)!! (2j)!!) (k^2)^j Laplacian^j P``, ``k^2 = B Bb + Z^2``.

    Example
    -------
    >>> h = harmonic_projection({(2, 0, 0): ExactPolynomial(1), (1, 1, 0): ExactPolynomial(2),
    ...                          (0, 2, 0): ExactPolynomial(1)}, 2)     # (2 k_x)^2
    >>> laplacian(h)
    {}

    References
    ----------
    Thorne, Rev. Mod. Phys. 52, 299 (1980), sec. II (the STF projection); common practice.
    """
    k_squared: Poly = {(1, 1, 0): ExactPolynomial(1), (0, 0, 2): ExactPolynomial(1)}
    total: Poly = dict(poly)
    power: Poly = {(0, 0, 0): ExactPolynomial(1)}
    derived = poly
    for j in range(1, degree // 2 + 1):
        derived = laplacian(derived)
        power = _times(power, k_squared)
        weight = Fraction((-1) ** j * _double_factorial(2 * degree - 2 * j - 1),
                          _double_factorial(2 * degree - 1) * _double_factorial(2 * j))
        total = _sum((total, _scaled(_times(power, derived), weight)))
    return total


def _null_reduced(poly: Poly) -> Poly:
    """Modulo k^2 = B Bb + Z^2: ``Z^2 -> -B Bb`` (the STF part's probe polynomial on a null k)."""
    out: Poly = {}
    for (a, b, c), value in poly.items():
        half = c // 2
        _add_into(out, (a + half, b + half, c % 2), value * (-1) ** half)
    return out


# ----------------------------------------------------------------------------- moments
def _power(base: Poly, n: int) -> Poly:
    out: Poly = {(0, 0, 0): ExactPolynomial(1)}
    for _ in range(n):
        out = _times(out, base)
    return out


@lru_cache(maxsize=None)
def _basis_polynomials() -> tuple[Poly, Poly, Poly]:
    """x.k, v.k, ell.k on the circle at phi = 0: ``r (B + Bb)/2``, ``r omega (-i B + i Bb)/2``,
    ``r^2 omega Z``."""
    half = Fraction(1, 2)
    x = {(1, 0, 0): _R * half, (0, 1, 0): _R * half}
    v = {(1, 0, 0): -_I * _R * _PHIDOT * half, (0, 1, 0): _I * _R * _PHIDOT * half}
    ell = {(0, 0, 1): _R**2 * _PHIDOT}
    return x, v, ell


@lru_cache(maxsize=None)
def probe_polynomial(kind: str, rank: int, pn_order: int) -> tuple[dict[int, Poly], int]:
    """The source moment (``kind`` "M": I_L, "S": J_L) on the circle as harmonic probe
    polynomials: ``({doubled PN order: polynomial in B, Bb, Z}, doubled known order)``.

    Built from the project's moments (:func:`~stfalgebra.moments.mass.mass_moment`,
    :func:`~stfalgebra.moments.current.current_moment`, ``rdot = 0``); the mass dipole is zero
    in the centre-of-mass frame.

    Example
    -------
    >>> pieces, known = probe_polynomial("M", 2, 0)
    >>> known, sorted(pieces[0])
    (1, [(0, 0, 2), (0, 2, 0), (1, 1, 0), (2, 0, 0)])
    """
    if kind not in ("M", "S"):
        raise ValueError(f"moment type must be 'M' or 'S', got {kind!r}")
    if kind == "M" and rank == 1:
        return {}, 10**6          # the mass dipole vanishes in the centre-of-mass frame
    moment = mass_moment(rank, pn_order) if kind == "M" else current_moment(rank, pn_order)
    return orbit_tensor_probe(moment)


def orbit_tensor_probe(tensor) -> tuple[dict[int, Poly], int]:
    """An orbit tensor over (x, v, ell) on the circle (``rdot = 0``, phase 0) as harmonic probe
    polynomials: ``({doubled PN order: polynomial in B, Bb, Z}, doubled known order)``.

    Example
    -------
    >>> from stfalgebra.moments.orbit_tensor import OrbitTensor
    >>> pieces, _ = orbit_tensor_probe(OrbitTensor.monomial(1, (1, 0, 0)))      # x_i
    >>> sorted(pieces[0])
    [(0, 1, 0), (1, 0, 0)]
    """
    moment = tensor.on_circular_orbit()
    rank = moment.rank
    if tuple(moment.basis.names) != ("x", "v", "ell"):
        raise ValueError(f"a planar moment over (x, v, ell) was expected, got {moment.basis.names}")
    x, v, ell = _basis_polynomials()
    pieces: dict[int, Poly] = {}
    known = 10**6
    for (a, b, c), series in moment.terms.items():
        known = min(known, series._known2)
        shape = _times(_times(_power(x, a), _power(v, b)), _power(ell, c))
        for order in series.orders:
            coefficient = series.coefficient(order)
            if isinstance(coefficient, ExactPolynomial) and not coefficient.is_zero():
                pieces[order.twice] = _sum((pieces.get(order.twice, {}), _scaled(shape, coefficient)))
    return {k: harmonic_projection(p, rank) for k, p in pieces.items() if p}, known


@lru_cache(maxsize=None)
def _harmonics(kind: str, rank: int, pn_order: int) -> dict[int, dict[int, Poly]]:
    """:func:`probe_polynomial` split by harmonic: {doubled order: {s = a - b: polynomial}}."""
    out: dict[int, dict[int, Poly]] = {}
    for order2, poly in probe_polynomial(kind, rank, pn_order)[0].items():
        split: dict[int, Poly] = {}
        for (a, b, c), value in poly.items():
            split.setdefault(a - b, {})[(a, b, c)] = value
        out[order2] = split
    return out


def _derivative(poly: Poly, times: int) -> Poly:
    """The ``times``-th time derivative on the circle: harmonic s = a - b gets (-i s omega)^times."""
    if not times:
        return poly
    out: Poly = {}
    for (a, b, c), value in poly.items():
        if a != b:
            _add_into(out, (a, b, c), value * (-_I * (a - b) * _PHIDOT) ** times)
    return out


# ----------------------------------------------------------------------------- products
_METRIC = ((0, 1, 2), (1, 0, 2), (2, 2, 1))        # sum_c d_c F d_c G = 2 F_B G_Bb + 2 F_Bb G_B + F_Z G_Z


def _triple(left: Poly, right: Poly) -> Poly:
    """``eps_(iab) k_i d_a F d_b G`` (module docstring)."""
    b_plus: Poly = {(1, 0, 0): ExactPolynomial(1)}
    b_minus: Poly = {(0, 1, 0): ExactPolynomial(1)}
    zed: Poly = {(0, 0, 1): ExactPolynomial(1)}
    fb, fbb, fz = (_d(left, slot) for slot in range(3))
    gb, gbb, gz = (_d(right, slot) for slot in range(3))
    pieces = (
        _times(gz, _sum((_times(b_plus, fb), _scaled(_times(b_minus, fbb), -1)))),
        _scaled(_times(fz, _sum((_times(b_plus, gb), _scaled(_times(b_minus, gbb), -1)))), -1),
        _scaled(_times(zed, _sum((_times(fbb, gb), _scaled(_times(fb, gbb), -1)))), 2),
    )
    return _scaled(_sum(pieces), _I)


def _pair(left: Poly, right: Poly, contractions: int, epsilon: int) -> Poly:
    """The probe polynomial of ``[eps_(iab)] A_([a] K P) B_([b] K Q)`` before the rank factors."""
    if contractions == 0:
        return _triple(left, right) if epsilon else _times(left, right)
    return _sum(_scaled(_pair(_d(left, u), _d(right, w), contractions - 1, epsilon), weight)
                for u, w, weight in _METRIC)


def _term_polynomial(term, pieces_left: Poly, pieces_right: Poly) -> Poly:
    (_, p, times_p), (_, q, times_q) = term.factors
    taken = term.contractions + term.epsilon
    weight = Fraction(factorial(p - taken) * factorial(q - taken), factorial(p) * factorial(q))
    product = _pair(_derivative(pieces_left, times_p), _derivative(pieces_right, times_q),
                    term.contractions, term.epsilon)
    return _scaled(product, weight * term.coefficient)


# ----------------------------------------------------------------------------- the terms
def quadratic_terms_through(moment: str, l: int) -> tuple:
    """The quadratic terms (instantaneous and memory, non-zero) of U_L (``moment="U"``) or V_L
    at relative 3/2 and 5/2, as the MPM iteration derives them.

    Example
    -------
    >>> sorted({str(term.order) for term in quadratic_terms_through("U", 4)})
    ['3/2', '5/2']
    """
    from .interaction_table import radiative_terms

    return tuple(term for term in radiative_terms(moment, l, Fraction(THROUGH))
                 if term.kind in ("instantaneous", "memory") and term.coefficient)


def _moment_order(term_order: Fraction) -> int:
    """The source moments' PN order that makes a term complete through relative 2.5PN."""
    return int(Fraction(THROUGH) - term_order)


@lru_cache(maxsize=None)
def _channel_values(kind: str, l: int, m: int, entering: tuple[Fraction, ...] = (Fraction(3, 2), Fraction(5, 2))
                    ) -> dict[int, ExactPolynomial]:
    """{doubled order: value} of the quadratic terms of U_L or V_L on the channel of (l, m)
    (the terms entering at the relative orders ``entering``)."""
    moment = "U" if kind == "mass" else "V"
    p, q, c = mode_channel(l, m)
    values: dict[int, ExactPolynomial] = {}
    dc_memory = []
    for term in quadratic_terms_through(moment, l):
        if term.order not in entering:
            continue
        pn = _moment_order(term.order)
        left_pieces, right_pieces = (_harmonics(name, rank, pn) for name, rank, _ in term.factors)
        shift = 2 * term.order
        for k1, left in left_pieces.items():
            for k2, right in right_pieces.items():
                twice = int(shift) + k1 + k2
                if twice > THROUGH.twice:
                    continue
                # the product of harmonics s1 and s2 is the harmonic s1 + s2 (the contractions and
                # the triple product are invariant under rotations about e_z): only s1 + s2 = m
                # reaches the channel
                value = _ZERO
                for s1, left_part in left.items():
                    right_part = right.get(m - s1)
                    if right_part is not None:
                        value = value + _null_reduced(_term_polynomial(term, left_part, right_part)).get((p, q, c), _ZERO)
                if value.is_zero():
                    continue
                if term.kind == "memory":
                    if m == 0:
                        dc_memory.append(term)
                        continue
                    value = value * _I / (m * _PHIDOT)     # int_-oo^t exp(-i m omega t') dt'
                values[twice] = values.get(twice, _ZERO) + value * ExactPolynomial("G")
    if dc_memory:
        raise RefusedModeError(
            f"mode ({l},0): the non-oscillating (m = 0) part of the memory integral of "
            f"{dc_memory[0]} is an integral over the whole past of the inspiral, not computed here")
    return {k: v for k, v in values.items() if not v.is_zero()}


def circular_quadratic_channel_through(l: int, m: int) -> PNSeries:
    """The quadratic interactions of U_L (l + m even) or V_L on the channel of (l, m), circular
    orbit, complete through relative 2.5PN (module docstring).

    Returns
    -------
    PNSeries
        In eps = 1/c, known through relative 5/2, engine coefficients in G, m, nu, delta, r,
        phidot, I (Kepler's law not applied: the circular reduction applies it at the order of
        the plan).

    Raises
    ------
    RefusedModeError
        m = 0 where a memory term has a non-oscillating part.

    Example
    -------
    >>> circular_quadratic_channel_through(3, 3).orders
    (PNOrder(5/2),)
    >>> circular_quadratic_channel_through(4, 4).orders
    (PNOrder(3/2), PNOrder(5/2))

    References
    ----------
    The MPM iteration (:mod:`stfalgebra.mpm`); Blanchet, Living Rev. Relativ. 17, 2 (2014),
    sec. 3 (the structure of U_L, V_L at relative 2.5PN).
    """
    l, m = check_mode(l, m)
    return PNSeries._from_trusted(_channel_values(mode_kind(l, m), l, m), THROUGH.twice)


def circular_interaction_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """Evaluator of the table's rows "quadratic interactions through relative 2.5PN": the
    channel of (l, m) on the circular orbit (:func:`circular_quadratic_channel_through`).

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(r for r in CONTRIBUTIONS if r.evaluator and "circular_interaction" in str(r.evaluator))
    >>> circular_interaction_channel(3, 3, row=row, orbit="circular").leading_order
    PNOrder(5/2)
    """
    if orbit != "circular":
        raise ValueError(f"the quadratic interactions through relative 2.5PN are evaluated on circular orbits "
                         f"only, got {orbit!r}")
    return circular_quadratic_channel_through(l, m)
