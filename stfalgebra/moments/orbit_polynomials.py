"""Moments on the relative orbit as polynomials: exact ring arithmetic and the orbit derivative.

A two-body moment in the centre-of-mass frame is a polynomial in the probe scalars kx = k.x,
kv = k.v (null probe k: (k.x)^a (k.v)^b stands for x_<A v_B>) whose coefficients are PN series
in eps = 1/c with coefficients polynomial in G, m, nu, delta, r, 1/r, rdot, phidot. This module
holds such objects in one sympy polynomial ring over the rationals (generators eps, G, m, nu,
delta, r, ir = 1/r, rdot, phidot, kx, kv), so that the products and time derivatives of the 2PN
moments run on exact polynomial arithmetic instead of expression trees; conversion to and from
sympy and to :class:`~stfalgebra.moments.orbit_tensor.OrbitTensor` happens at the edges.

The time derivative along the orbit is the derivation with
d kx/dt = kv, d kv/dt = a_x kx + a_v kv, dr/dt = rdot, d(1/r)/dt = -rdot/r^2,
d rdot/dt = a_x r + a_v rdot + r phidot^2, d phidot/dt = a_v phidot - 2 rdot phidot/r,
from the relative acceleration a = a_x x + a_v v (:func:`stfalgebra.binary.dynamics.
relative_acceleration_factors`), planar motion v = rdot n + r phidot lambda (then a.n = a_x r +
a_v rdot, a.lambda = a_v r phidot; common practice).

**Conventions**: ``../shared/conventions.md``; eps = 1/c; kx, kv for a null probe.

Example
-------
>>> from stfalgebra.moments.orbit_polynomials import from_expression, time_derivative, KX
>>> from stfalgebra.symbols import r
>>> time_derivative(from_expression(r**2 * KX**2), 0)
2*r**2*kx*kv + 2*r*rdot*kx**2
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

import sympy as sp

from ..binary.dynamics import relative_acceleration_factors
from ..exact import ExactPolynomial
from ..orders import PNOrder
from ..pnseries import PNSeries
from ..symbols import G, delta, m, nu, phidot, r, rdot
from .orbit_tensor import PLANAR_BASIS, OrbitTensor
from ..symbols import eps as EPS

__all__ = ["RING", "KX", "KV", "from_expression", "from_series", "truncate", "truncated_power", "time_derivative",
           "to_tensor", "substitute", "reduce_mass_difference"]

#: The probe scalars k.x and k.v (sympy symbols; the ring generators carry the same names).
KX, KV = sp.symbols("kx kv")
_IR = sp.Symbol("ir", positive=True)
RING, _EPS, _G, _M, _NU, _DELTA, _R, _IRG, _RDOT, _PHIDOT, _KXG, _KVG = sp.ring(
    [EPS, G, m, nu, delta, r, _IR, rdot, phidot, KX, KV], sp.QQ)


def _inverse_powers_of_r(expression: sp.Expr) -> sp.Expr:
    return sp.expand(expression).replace(
        lambda e: e.is_Pow and e.base == r and e.exp.is_Integer and e.exp < 0,
        lambda e: _IR ** (-e.exp))


def from_expression(expression) -> object:
    """A sympy expression polynomial in the ring's symbols and 1/r, as a ring element."""
    return RING(_inverse_powers_of_r(sp.sympify(expression)))


def from_series(series: PNSeries) -> object:
    """A PN series in eps = 1/c (its known terms) as a ring element."""
    return from_expression(series.to_expression(EPS))


def truncate(f, order: int):
    """Drop the monomials with more than ``order`` powers of eps."""
    return RING({monomial: coefficient for monomial, coefficient in f.terms() if monomial[0] <= order})


def truncated_power(f, exponent: int, order: int):
    """``f**exponent`` with every monomial beyond eps^order dropped, truncating after each
    product (a PN series raised to the power l never builds the orders it would throw away).

    Example
    -------
    >>> from stfalgebra.symbols import eps
    >>> truncated_power(from_expression(1 + eps**2), 5, 2)
    5*eps**2 + 1
    """
    return power_by_squaring(RING(1), f, exponent, lambda g: truncate(g, order))


def power_by_squaring(one, f, exponent: int, cut):
    """``f**exponent`` by repeated squaring, ``cut`` applied after every product (shared by the
    sympy ring here and the flint ring of :mod:`stfalgebra.moments.flint_rings`).

    Example
    -------
    >>> power_by_squaring(1, 3, 5, lambda g: g % 1000)
    243
    """
    result = one
    base = cut(f)
    while exponent:
        if exponent & 1:
            result = cut(result * base)
        exponent >>= 1
        if exponent:
            base = cut(base * base)
    return result


@lru_cache(maxsize=None)
def _images(pn_order: int) -> dict:
    a_x, a_v = relative_acceleration_factors(pn_order)
    a_x, a_v = from_series(a_x), from_series(a_v)
    return {
        _KXG: _KVG,
        _KVG: a_x * _KXG + a_v * _KVG,
        _R: _RDOT,
        _IRG: -_IRG**2 * _RDOT,
        _RDOT: a_x * _R + a_v * _RDOT + _R * _PHIDOT**2,
        _PHIDOT: a_v * _PHIDOT - 2 * _RDOT * _PHIDOT * _IRG,
    }


def time_derivative(f, pn_order: int):
    """d f/dt along the relative orbit of PN order ``pn_order`` (0, 1 or 2); not truncated."""
    total = RING(0)
    for generator, image in _images(pn_order).items():
        derivative = f.diff(generator)
        if derivative:
            total += derivative * image
    return total


def substitute(f, images) -> object:
    """Evaluate a polynomial of another ring at ring elements (``images``: one per generator)."""
    powers: dict[tuple[int, int], object] = {}
    total = RING(0)
    for monomial, coefficient in f.terms():
        term = RING(coefficient)
        for index, exponent in enumerate(monomial):
            if exponent:
                key = (index, exponent)
                if key not in powers:
                    powers[key] = images[index] ** exponent
                term *= powers[key]
        total += term
    return total


def reduce_mass_difference(f):
    """delta^2 -> 1 - 4 nu in every monomial (delta = (m1 - m2)/m, nu = m1 m2/m^2)."""
    out = RING(0)
    reduced = 1 - 4 * _NU
    powers = {0: RING(1)}
    for monomial, coefficient in f.terms():
        k = monomial[4]
        if k < 2:
            out += RING({monomial: coefficient})
            continue
        if k // 2 not in powers:
            powers[k // 2] = reduced ** (k // 2)
        base = list(monomial)
        base[4] = k % 2
        out += RING({tuple(base): coefficient}) * powers[k // 2]
    return out


_ENGINE_NAMES = (None, "G", "m", "nu", "delta", "r", "rinv", "rdot", "phidot")


def _engine_coefficient(pieces: dict) -> ExactPolynomial:
    """A dict {monomial (ring exponents, eps and probes ignored): rational} as an engine
    polynomial (ir -> the engine's 1/r generator)."""
    generators = {name: ExactPolynomial(name) for name in _ENGINE_NAMES[1:]}
    total = ExactPolynomial(0)
    for monomial, coefficient in pieces.items():
        term = ExactPolynomial(Fraction(int(coefficient.numerator), int(coefficient.denominator)))
        for index in range(1, 9):
            if monomial[index]:
                term = term * generators[_ENGINE_NAMES[index]] ** monomial[index]
        total = total + term
    return total


def to_tensor(l: int, f, known) -> OrbitTensor:
    """The ring element as a rank-l OrbitTensor (kx^a kv^b -> x_<A v_B>), series in eps.

    Even powers eps^(2k) become order k; the coefficients are exact engine polynomials
    (:mod:`stfalgebra.exact`), as every source moment's.
    """
    grouped: dict[tuple[int, int], dict[int, dict]] = {}
    for monomial, coefficient in f.terms():
        a, b, power = monomial[9], monomial[10], monomial[0]
        if a + b != l:
            raise AssertionError(f"probe polynomial of degree {a + b}, expected {l}")
        grouped.setdefault((a, b), {}).setdefault(power, {})[monomial] = coefficient
    known2 = PNOrder(known).twice
    terms = {}
    for (a, b), by_power in grouped.items():
        pieces = {power: _engine_coefficient(by_power[power]) for power in by_power if power <= known2}
        terms[(a, b, 0)] = PNSeries._from_trusted(pieces, known2)
    return OrbitTensor._trusted(l, terms, PLANAR_BASIS)
