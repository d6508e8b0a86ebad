"""Point-particle sources of the two-body system, as the moment formulas need them.

Masses m_A = m X_A with X1 = (1 + delta)/2, X2 = (1 - delta)/2; centre-of-mass positions
y_A = s_A x (s_A from :mod:`stfalgebra.binary.centre_of_mass`); the time derivative along the
relative orbit for :class:`~stfalgebra.moments.relative_tensor.RelativeTensor`.
"""

from __future__ import annotations

from functools import lru_cache

import sympy as sp

from ..binary.centre_of_mass import centre_of_mass_factors
from ..binary.dynamics import OrbitTimeDerivative, relative_acceleration
from ..binary.masses import mass_fractions, reduce_mass_difference
from ..errors import OrderBeyondInputsError
from ..pnseries import PNSeries
from ..symbols import c, m, phidot, r, rdot
from .relative_tensor import Monomial, RelativeTensor

__all__ = [
    "EPS", "MOMENT_PN_ORDERS", "mass_fractions", "newtonian_position_factors",
    "position_factor_sum", "companion_weighted_sum", "one_pn_position_shift", "as_series",
    "derivative_along_orbit", "check_moment_order", "retardation_term", "first_derivative_term",
]

#: The PN expansion parameter of general-orbit series: eps = 1/c.
EPS = sp.Symbol("eps", positive=True)

#: PN orders of the source moments the toolkit derives, and the relative order through which
#: each is then known: a Newtonian moment is known through relative 1/2 and a 1PN one through
#: 3/2, because non-spinning point-mass source moments have no 0.5PN or 1.5PN corrections
#: (odd half-orders first appear with radiation reaction at 2.5PN; common practice).
MOMENT_PN_ORDERS = {0: sp.Rational(1, 2), 1: sp.Rational(3, 2)}


def check_moment_order(pn_order: int) -> sp.Rational:
    """Validate a source-moment PN order; return the relative order it is known through."""
    if isinstance(pn_order, bool) or pn_order not in MOMENT_PN_ORDERS:
        raise OrderBeyondInputsError(
            f"source moments are derived at Newtonian (0) and 1PN (1) order; "
            f"PN order {pn_order!r} is beyond the toolkit's inputs")
    return MOMENT_PN_ORDERS[pn_order]


def newtonian_position_factors() -> tuple[sp.Expr, sp.Expr]:
    """Newtonian centre-of-mass factors: y1 = X2 x, y2 = -X1 x."""
    X1, X2 = mass_fractions()
    return X2, -X1


@lru_cache(maxsize=None)
def companion_weighted_sum(power: int) -> sp.Expr:
    """sum_A m_A (m_B/m) s_A^power with Newtonian s_A (the weight of the other body's
    potential G m_B/r12 at body A), reduced."""
    X1, X2 = mass_fractions()
    s1, s2 = newtonian_position_factors()
    return reduce_mass_difference(sp.expand(m * X1 * X2 * s1**power + m * X2 * X1 * s2**power))


def one_pn_position_shift() -> sp.Expr:
    """The common 1PN centre-of-mass shift: y_A = (s_A^N + shift/c^2) x, read off
    :func:`stfalgebra.binary.centre_of_mass.centre_of_mass_factors` (it is the same for both
    bodies)."""
    s1, s2 = centre_of_mass_factors(1)
    shift1, shift2 = s1.coefficient(1), s2.coefficient(1)
    if sp.expand(shift1 - shift2) != 0:
        raise AssertionError("the 1PN centre-of-mass shift is expected to be common to both bodies")
    return shift1


@lru_cache(maxsize=None)
def position_factor_sum(power: int) -> sp.Expr:
    """sum_A m_A s_A^power with Newtonian s_A, reduced (delta^2 -> 1 - 4 nu).

    For power = l this is the mass-ratio factor of the Newtonian I_L: nu m (X2^(l-1) +
    (-1)^l X1^(l-1)).
    """
    X1, X2 = mass_fractions()
    s1, s2 = newtonian_position_factors()
    return reduce_mass_difference(sp.expand(m * X1 * s1**power + m * X2 * s2**power))


def as_series(expr: sp.Expr, known_through) -> PNSeries:
    """An expression with explicit c, as a PN series in eps = 1/c."""
    return PNSeries.from_expression(sp.sympify(expr).subs(c, 1 / EPS), EPS, known_through)


@lru_cache(maxsize=None)
def _orbit_operators(pn_order: int):
    a_n, a_lambda = relative_acceleration(pn_order)
    # a = a_n n + a_lambda lambda with n = x/r, lambda = (v - rdot n)/(r phidot):
    # a = alpha_x x + alpha_v v (the 1PN harmonic acceleration has this form).
    alpha_v = a_lambda.map_coefficients(lambda e: sp.cancel(e / (r * phidot)))
    alpha_x = (a_n - alpha_v * rdot).map_coefficients(lambda e: sp.cancel(sp.expand(e / r)))
    return OrbitTimeDerivative(pn_order), alpha_x, alpha_v


def retardation_term(l: int, structure: Monomial, weight: sp.Expr) -> RelativeTensor:
    """The first retardation correction common to the 1PN mass (M1) and current (C1) moment
    formulas: (1/(2 c^2 (2l+3))) d^2/dt^2 [weight r^2 STF[structure]], with the time
    derivatives along the Newtonian orbit (the term is already 1PN)."""
    term = RelativeTensor(l, {structure: as_series(weight * r**2, sp.oo)})
    term = derivative_along_orbit(term, 0, times=2)
    return term.scale(as_series(1 / (2 * c**2 * (2 * l + 3)), sp.oo))


def first_derivative_term(l: int, inner: dict, factor: sp.Expr) -> RelativeTensor:
    """factor * d/dt [sum inner] along the Newtonian orbit, inner = {(a, b, c): expression}."""
    term = RelativeTensor(l, {key: as_series(value, sp.oo) for key, value in inner.items()})
    return derivative_along_orbit(term, 0, times=1).scale(as_series(factor, sp.oo))


def derivative_along_orbit(tensor: RelativeTensor, pn_order: int, times: int = 1) -> RelativeTensor:
    """The ``times``-th time derivative of a relative tensor along the PN relative orbit."""
    derivative, alpha_x, alpha_v = _orbit_operators(pn_order)
    for _ in range(times):
        tensor = tensor.time_derivative(derivative, alpha_x, alpha_v)
    return tensor


