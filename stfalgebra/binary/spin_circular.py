"""Circular orbits of a binary with aligned spins, derived in the exact engine.

Nothing here is typed in. With spins along the orbital angular momentum the orbit stays planar
and circular orbits exist (the tangential spin-orbit acceleration is proportional to ``rdot``);
from the cited 1PN point-mass acceleration and the cited leading spin-orbit acceleration
(:mod:`stfalgebra.binary.spinning_dynamics`) this module derives, with ``G = m = c = 1`` and
PN series in the engine (``chi1``, ``chi2`` are generators):

- ``y = omega^2 r^3/(G m)`` as a series in ``gamma = G m/(r c^2)`` (``eps = sqrt(gamma)``):
  the radial equation ``-r omega^2 = a_n(r, rdot = 0, phidot = omega)``; the spin-orbit part of
  ``a_n`` is linear in ``omega``, so ``y`` appears with the power 1/2 and the series has a
  ``gamma^(3/2)`` term; solved by iteration (:func:`spinning_frequency_in_gamma`);
- ``g = gamma/x`` as a series in ``x = (G m omega/c^3)^(2/3)`` by series reversion
  (:func:`spinning_gamma_over_x`);
- any general-orbit series in ``1/c`` (energy, angular momentum, a moment's channel) put on the
  circular orbit as a series in ``x`` (:func:`spinning_circular_reduction`), and the circular
  energy and orbital angular momentum :func:`circular_energy`, :func:`circular_angular_momentum`.

Every result is known through relative order 3/2 (spin-spin terms enter at 2PN).

**Conventions**: :mod:`stfalgebra.binary.spin_variables` (``s_l = X1^2 chi1 + X2^2 chi2``,
``sigma_l = X2 chi2 - X1 chi1``, spins along ``+e_z`` for positive ``chi``); harmonic
coordinates; ``x = (G m omega/c^3)^(2/3)``, ``gamma = G m/(r c^2)``.
"""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache

from ..exact import ExactPolynomial
from ..orders import PNOrder
from ..pnseries import PNSeries
from .circular_frequency import reduction_with_gamma
from .cited_inputs import acceleration_n_factor, acceleration_v_factor
from .spin_variables import SPIN_ORBIT_ORDER, SPINNING_KNOWN_THROUGH
from .spinning_dynamics import (
    aligned_spin_acceleration, aligned_spin_angular_momentum, aligned_spin_energy, aligned_spin_namespace,
)

__all__ = [
    "spinning_frequency_in_gamma",
    "spinning_gamma_over_x",
    "spinning_circular_reduction",
    "circular_energy",
    "circular_angular_momentum",
]

_ONE = ExactPolynomial(1)
_EXACT_ONE = PNSeries._from_trusted({0: _ONE}, float("inf"))


def _dimensionless(value: ExactPolynomial) -> ExactPolynomial:
    return value.substitute({"G": 1, "m": 1})


@lru_cache(maxsize=1)
def _radial_acceleration_on_circle() -> ExactPolynomial:
    """``a_n`` at ``rdot = 0`` with G = m = c = 1 (all orders added: the powers of ``1/r`` and
    ``phidot`` carry the PN order), after checking that no tangential acceleration remains."""
    s = aligned_spin_namespace()
    point_mass = {k: v for k, v in acceleration_n_factor(s).items() if k <= 1}
    tangential = [v * s.r * s.phidot for k, v in acceleration_v_factor(s).items() if k <= 1]
    spin_n, spin_lambda = aligned_spin_acceleration()
    tangential.append(spin_lambda)
    if any(not _dimensionless(v).substitute({"rdot": 0}).is_zero() for v in tangential):
        raise ArithmeticError("the acceleration has a tangential part on a circular orbit")
    total = spin_n
    for value in point_mass.values():
        total = total + value
    # beta v has a radial part beta rdot, zero at rdot = 0
    return _dimensionless(total).substitute({"rdot": 0})


@lru_cache(maxsize=1)
def spinning_frequency_in_gamma() -> PNSeries:
    """``y = omega^2 r^3/(G m)`` of a circular orbit with aligned spins, in ``gamma`` (``eps = sqrt(gamma)``).

    Returns
    -------
    PNSeries
        ``1 + (-3 + nu) gamma + c_{3/2} gamma^(3/2) + O(gamma^2)``, coefficients in nu, delta,
        chi1, chi2; known through 3/2.

    **Conventions**: module docstring.

    Example
    -------
    >>> y = spinning_frequency_in_gamma()
    >>> y.coefficient(1)
    -3 + nu
    >>> y.coefficient(Fraction(3, 2)).substitute({"chi2": 0, "delta": 1, "nu": 0})   # test mass
    -2*chi1

    References
    ----------
    Derived here from the cited accelerations; to be compared with Kidder, Phys. Rev. D 52,
    821 (1995), Sec. IV, and Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.3,
    ``omega^2 = (G m/r^3)[1 + (-3 + nu) gamma - (5 s_l + 3 delta sigma_l) gamma^(3/2)]``
    (from memory; tested).
    """
    pieces: list[tuple[int, Fraction, ExactPolynomial]] = []   # (doubled gamma power, y power, coefficient)
    for monomial, coefficient in _radial_acceleration_on_circle().terms():
        phidot_power = monomial.pop("phidot", 0)
        b, a = monomial.pop("rinv", 0), monomial.pop("r", 0)
        rest = ExactPolynomial(coefficient)
        for name, power in monomial.items():
            rest = rest * ExactPolynomial(name) ** power
        # y = -r^2 a_n, r = 1/gamma, phidot = y^(1/2) gamma^(3/2)
        pieces.append((2 * (b - a - 2) + 3 * phidot_power, Fraction(phidot_power, 2), -rest))
    known = SPINNING_KNOWN_THROUGH
    y = PNSeries._from_trusted({0: _ONE}, 0)
    while y.known_through < known:
        updated = PNSeries._from_trusted({}, float("inf"))
        for power2, y_power, coefficient in pieces:
            factor = y.power(y_power) if y_power else _EXACT_ONE
            updated = updated + factor.shift(PNOrder.from_twice(power2)) * coefficient
        updated = updated.truncate(min(updated.known_through, known))
        if updated.known_through <= y.known_through:
            raise ArithmeticError("iteration for the circular frequency does not converge")
        y = updated
    return y


@lru_cache(maxsize=1)
def spinning_gamma_over_x() -> PNSeries:
    """``g = gamma/x`` of a circular orbit with aligned spins, in ``x`` (``eps = sqrt(x)``).

    Returns
    -------
    PNSeries
        ``1 + (1 - nu/3) x + g_{3/2} x^(3/2) + O(x^2)``; known through 3/2.

    Example
    -------
    >>> spinning_gamma_over_x().coefficient(Fraction(3, 2)).substitute({"chi2": 0, "delta": 1, "nu": 0})
    2*chi1/3

    References
    ----------
    Derived here by series reversion of ``x = gamma y(gamma)^(1/3)`` (common practice).
    """
    inverse_cube_root = spinning_frequency_in_gamma().power(Fraction(-1, 3))
    known = inverse_cube_root.known_through
    g = PNSeries._from_trusted({0: _ONE}, 0)
    while g.known_through < known:
        updated = PNSeries._from_trusted({}, float("inf"))
        for order, coefficient in inverse_cube_root.terms.items():
            # Y_k (x g)^k, k a multiple of 1/2
            factor = g.power(order) if order else _EXACT_ONE
            updated = updated + factor.shift(order) * coefficient
        updated = updated.truncate(min(updated.known_through, known))
        if updated.known_through <= g.known_through:
            raise ArithmeticError("series reversion for gamma(x) does not converge")
        g = updated
    return g


def spinning_circular_reduction(series: PNSeries) -> tuple[PNSeries, tuple[int, int, int]]:
    """A general-orbit series in ``1/c`` put on the circular orbit with aligned spins.

    Parameters
    ----------
    series:
        Engine coefficients polynomial in ``r``, ``1/r``, ``rdot``, ``phidot`` (or ``omega``),
        ``G``, ``m``, chi1, chi2 and constants, dimensionally homogeneous (spins through chi).

    Returns
    -------
    (PNSeries, (a, b, d))
        The series in ``eps = sqrt(x)`` computed with ``G = m = c = 1`` (``rdot = 0``,
        ``phidot = x^(3/2)``, ``r = 1/(x g(x))``) and the scale ``G^a m^b c^d`` that restores the
        units; known through the lower of the input's known order (moved by the common shift)
        and 3/2 beyond the leading term.

    Raises
    ------
    ValueError
        A series that is not dimensionally homogeneous, or has no known term.

    Example
    -------
    >>> energy, scale = spinning_circular_reduction(aligned_spin_energy())
    >>> scale                                                  # E/mu = c^2 * series
    (0, 0, 2)

    References
    ----------
    Common practice (dimensional bookkeeping of PN orders).
    """
    return reduction_with_gamma(series, spinning_gamma_over_x())


@lru_cache(maxsize=1)
def circular_energy() -> PNSeries:
    """Binding energy ``E/(mu c^2)`` of a circular orbit with aligned spins, a series in ``x``.

    Returns
    -------
    PNSeries
        ``-(x/2)[1 - (3/4 + nu/12) x + e_{3/2} x^(3/2)] + O(x^3)`` (``eps = sqrt(x)``).

    Example
    -------
    >>> circular_energy().coefficient(Fraction(5, 2)).substitute({"chi2": 0, "delta": 1, "nu": 0})
    -4*chi1/3

    References
    ----------
    Derived here from the cited energy and accelerations; to be compared with Blanchet, Living
    Rev. Relativ. 17, 2 (2014), Sec. 11.3, and Kidder, Phys. Rev. D 52, 821 (1995), Sec. IV:
    ``x^(3/2) (14/3 s_l + 2 delta sigma_l)`` inside the bracket (tested).
    """
    series, scale = spinning_circular_reduction(aligned_spin_energy())
    if scale != (0, 0, 2):
        raise ArithmeticError(f"E/mu should scale as c^2, got G^a m^b c^d = {scale}")
    return series


@lru_cache(maxsize=1)
def circular_angular_momentum() -> PNSeries:
    """Orbital angular momentum ``L c/(mu G m)`` of a circular orbit with aligned spins, in ``x``.

    Returns
    -------
    PNSeries
        ``x^(-1/2) [1 + (3/2 + nu/6) x + j_{3/2} x^(3/2)] + O(x^(3/2))``; the total
        ``J = L + S_l`` adds ``(G m^2/c) s_l``.

    Example
    -------
    >>> circular_angular_momentum().coefficient(-Fraction(1, 2))
    1

    References
    ----------
    Derived here from the cited angular momentum and accelerations; to be compared with
    Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.3 (tested through the first law
    ``dE = omega dL`` and from memory).
    """
    series, scale = spinning_circular_reduction(aligned_spin_angular_momentum())
    if scale != (1, 1, -1):
        raise ArithmeticError(f"L/mu should scale as G m/c, got G^a m^b c^d = {scale}")
    return series
