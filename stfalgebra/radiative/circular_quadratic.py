"""The quadratic interactions of U_ij at relative 2.5PN on a circular orbit, by explicit components.

The MPM iteration tabulates the terms of U_L and V_L (:mod:`stfalgebra.radiative.interaction_table`):
``coefficient (G/c^(2 order)) STF_l[A^(p)_(aK) B^(q)_(aK')]`` with a number of contracted index
pairs, or with one Levi-Civita symbol ``eps_(i a b) A_(a ...) B_(b ...)``, instantaneous or
integrated over the past (memory). At relative 2.5PN U_ij holds products of the mass quadrupole
with itself (one contraction) and ``eps S_a M^(4)_bj`` (Blanchet, Living Rev. Relativ. 17, 2
(2014), sec. 3.3, lists them; the project derives them).

This module evaluates such terms on the Newtonian circular orbit with explicit Cartesian
components at phi = 0 (n = e_x, lambda = e_y), independently of the orbit-tensor algebra of
:mod:`stfalgebra.radiative.nonlinear`:

- ``M_ij = nu m r^2 n_<ij>`` split into harmonics ``exp(-i s phi)``, s = 2, 0, -2, with
  ``n = (exp(-i phi) b + exp(i phi) conj(b))/2``, ``b = e_x + i e_y``; the p-th derivative of
  harmonic s is ``(-i s omega)^p`` times it;
- ``S_i = nu m r^2 omega e_z`` (the Newtonian angular momentum, constant);
- the product's harmonic s = m is kept; a memory integral ``int_-oo^t`` of ``exp(-i m omega t')``
  is ``i/(m omega)`` times it (m != 0; the constant m = 0 part is the DC memory, another row);
- the channel of mode (l, m) = (2, 2) (``Z+^2``, ``Z+ = k.(n + i lambda)``) of a symmetric T_ij
  is ``T_ij w_i w_j``, ``w = (1, -i, 0)/2`` (the trace drops out).

The coefficients of the moments are taken from the project's own Newtonian moments and angular
momentum; only the harmonic decomposition is written here.

**Conventions**: channels of :mod:`stfalgebra.moments.orbit_tensor` (exp(-i m phi) implied),
eps = 1/c, engine coefficients in nu, m, r, phidot (= omega), G.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from itertools import product

from ..exact import ExactPolynomial, engine_symbols
from ..orders import PNOrder
from ..pnseries import PNSeries
from .contributions import Contribution, check_mode, mode_kind

__all__ = ["circular_quadratic_channel", "quadratic_quadrupole_terms"]

_I = ExactPolynomial("I")
_ZERO = ExactPolynomial(0)
_AXES = range(3)


def _matrix(entries) -> tuple:
    return tuple(tuple(ExactPolynomial(v) if not isinstance(v, ExactPolynomial) else v for v in row) for row in entries)


def _outer(a, b) -> tuple:
    return tuple(tuple(a[i] * b[j] for j in _AXES) for i in _AXES)


def _add(a, b) -> tuple:
    return tuple(tuple(a[i][j] + b[i][j] for j in _AXES) for i in _AXES)


def _scale(a, factor) -> tuple:
    return tuple(tuple(a[i][j] * factor for j in _AXES) for i in _AXES)


@lru_cache(maxsize=None)
def _quadrupole_harmonics() -> dict[int, tuple]:
    """``n_<ij>`` at phi = 0 split into the harmonics exp(-i s phi): {s: 3x3 matrix}."""
    b = (ExactPolynomial(1), _I, _ZERO)
    b_bar = (ExactPolynomial(1), -_I, _ZERO)
    quarter = Fraction(1, 4)
    identity = _matrix([[1 if i == j else 0 for j in _AXES] for i in _AXES])
    return {2: _scale(_outer(b, b), quarter), -2: _scale(_outer(b_bar, b_bar), quarter),
            0: _add(_scale(_add(_outer(b, b_bar), _outer(b_bar, b)), quarter), _scale(identity, Fraction(-1, 3)))}


@lru_cache(maxsize=None)
def _scales() -> tuple[ExactPolynomial, ExactPolynomial]:
    """The Newtonian amplitudes: I_ij = A r^2 n_<ij> (A from the project's moment) and
    S = B e_z (B = mu J/mu from the cited angular momentum), on the circular orbit."""
    from ..binary.cited_inputs import angular_momentum_per_reduced_mass
    from ..moments.mass import mass_moment

    s = engine_symbols()
    quadrupole = mass_moment(2, 0).terms[(2, 0, 0)].coefficient(0)        # nu m (times x_<ij>)
    spin = s.nu * s.m * angular_momentum_per_reduced_mass(s)[0]             # nu m r^2 phidot
    return quadrupole * s.r**2, spin


def _factor(name: str, rank: int, times: int) -> dict[int, tuple]:
    """{s: components} of the p-th derivative of the factor (vector components as a 1 x 3 row)."""
    amplitude, spin = _scales()
    phidot = ExactPolynomial("phidot")
    if name == "M" and rank == 2:
        # the constant (s = 0) part has no derivative
        return {s: _scale(value, amplitude * (-_I * s * phidot) ** times)
                for s, value in _quadrupole_harmonics().items() if times == 0 or s != 0}
    if name == "S" and rank == 1:
        if times:
            return {}
        return {0: ((_ZERO, _ZERO, spin),)}
    raise ValueError(f"the circular evaluation holds the mass quadrupole and the current dipole, got {name}_{rank}")


_LEVI = {(0, 1, 2): 1, (1, 2, 0): 1, (2, 0, 1): 1, (0, 2, 1): -1, (2, 1, 0): -1, (1, 0, 2): -1}


def _pair_product(term, left: tuple, right: tuple) -> tuple:
    """The rank-2 tensor of one term before the STF projection, from the components."""
    (_, p, _), (_, q, _) = term.factors
    if term.epsilon == 0 and term.contractions == 1 and p == 2 and q == 2:
        return tuple(tuple(sum((left[i][a] * right[j][a] for a in _AXES), _ZERO) for j in _AXES) for i in _AXES)
    if term.epsilon == 1 and term.contractions == 0 and p == 1 and q == 2:
        vector = left[0]
        return tuple(tuple(sum((sign * vector[a] * right[b][j] for (i2, a, b), sign in _LEVI.items() if i2 == i),
                               _ZERO) for j in _AXES) for i in _AXES)
    raise ValueError(f"a product the circular evaluation does not hold: {term}")


def _channel_22(tensor: tuple) -> ExactPolynomial:
    """The Z+^2 coefficient of T_ij k_i k_j: T_ij w_i w_j with w = (1, -i, 0)/2 (symmetrised)."""
    w = (ExactPolynomial(Fraction(1, 2)), -_I / 2, _ZERO)
    total = _ZERO
    for i, j in product(_AXES, _AXES):
        total = total + (tensor[i][j] + tensor[j][i]) * w[i] * w[j] / 2
    return total


def quadratic_quadrupole_terms(pn_relative: Fraction = Fraction(5, 2)) -> tuple:
    """The tabulated quadratic terms of U_ij at exactly ``pn_relative`` (instantaneous and memory).

    Example
    -------
    >>> len(quadratic_quadrupole_terms())
    5
    """
    from .interaction_table import radiative_terms

    return tuple(term for term in radiative_terms("U", 2, pn_relative)
                 if term.kind in ("instantaneous", "memory") and term.order == pn_relative and term.coefficient)


@lru_cache(maxsize=None)
def _quadratic_22() -> PNSeries:
    phidot = ExactPolynomial("phidot")
    m = 2
    total = _ZERO
    for term in quadratic_quadrupole_terms():
        left, right = (_factor(*factor) for factor in term.factors)
        for (s1, a), (s2, b) in product(left.items(), right.items()):
            if s1 + s2 != m:
                continue
            value = _channel_22(_pair_product(term, a, b)) * term.coefficient
            if term.kind == "memory":
                value = value * _I / (m * phidot)     # int_-oo^t exp(-i m omega t') dt'
            total = total + value
    order = PNOrder(5, 2)
    return PNSeries._from_trusted({order.twice: total * ExactPolynomial("G")}, order.twice)


def circular_quadratic_channel(l: int, m: int, *, row: Contribution, orbit: str) -> PNSeries:
    """The quadratic interactions of U_ij at relative 2.5PN on the channel of (2, 2), circular orbit.

    Example
    -------
    >>> from stfalgebra.radiative.contributions import CONTRIBUTIONS
    >>> row = next(row for row in CONTRIBUTIONS if row.family == "quadratic" and row.available and row.l_max == 2)
    >>> circular_quadratic_channel(2, 2, row=row, orbit="circular").orders
    (PNOrder(5/2),)
    """
    check_mode(l, m)
    if (l, m) != (2, 2) or mode_kind(l, m) != "mass" or orbit != "circular":
        raise ValueError(f"the 2.5PN quadratic interactions are evaluated for the circular (2,2) channel, "
                         f"got ({l},{m}) on {orbit!r} orbits")
    return _quadratic_22()
