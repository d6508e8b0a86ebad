"""Orbit-averaged energy and angular-momentum fluxes of eccentric binaries, through 1.5PN.

* Newtonian and 1PN (instantaneous): the general-orbit fluxes summed over the modes
  (:mod:`stfalgebra.radiative.fluxes`) on the 1PN quasi-Keplerian orbit of
  :mod:`stfalgebra.binary.keplerian`, averaged exactly over the radial period
  (:mod:`stfalgebra.binary.orbit_averages`), in ``x`` and the time eccentricity ``e_t``.
* 1.5PN: the leading tail, ``4 pi x^(3/2) phi(e_t)`` and ``4 pi x^(3/2) psi(e_t)`` with the
  enhancement functions of :mod:`stfalgebra.radiative.tail_enhancement` kept as sympy functions
  (their series and values come from that module). The instantaneous fluxes have no 1.5PN term
  for non-spinning binaries.

Normalisation (``../shared/conventions.md``): averaged fluxes are divided by
``(32/5)(c^5/G) nu^2 x^5`` (energy) and ``(32/5) m c^2 nu^2 x^(7/2)`` (angular momentum),
``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n`` the orbit-averaged azimuthal frequency.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from ..binary.keplerian import quasi_keplerian_from_frequency, u
from ..binary.masses import reduce_mass_difference
from ..binary.orbit_averages import ONE_MINUS_E_COS_U, average_anomaly_polynomial, to_anomaly_variables
from ..errors import OrderBeyondInputsError
from ..orders import PNOrder, as_pn_order, parse_pn_order
from ..pnseries import PNSeries
from ..symbols import G, c, delta, eps as eps_symbol, et, m, nu, phidot, r, rdot
from .contributions import maximum_eccentric_order
from .tail_enhancement import (
    TAIL_FLUX_NORMALISATION,
    AngularMomentumTailEnhancement,
    EnergyTailEnhancement,
)

__all__ = [
    "ECCENTRIC_MAX_PN",
    "check_eccentric_order",
    "averaged_energy_flux",
    "averaged_angular_momentum_flux",
    "collect_in_nu",
]

#: Highest PN order of the orbit-averaged fluxes and of the secular rates of eccentric orbits,
#: read off the table of contributions (1PN quasi-Keplerian orbit with instantaneous fluxes,
#: plus the leading 1.5PN tail through the enhancement functions).
ECCENTRIC_MAX_PN = maximum_eccentric_order()

_TAIL_ORDER = PNOrder(3, 2)
_HALF = sp.Rational(1, 2)
_W = ONE_MINUS_E_COS_U
_EPS = eps_symbol


def check_eccentric_order(pn: Any) -> sp.Rational:
    """A PN order of the eccentric-orbit averages: 0, 1/2, 1 or 3/2.

    Parameters
    ----------
    pn:
        An int, Rational, Fraction, PNOrder, or text (``"3/2"``, ``"1.5"``); floats are refused.

    Returns
    -------
    sympy.Rational

    Raises
    ------
    TypeError
        Not exact (a float, a bool).
    ValueError
        Negative or not a multiple of 1/2.
    OrderBeyondInputsError
        Above :data:`ECCENTRIC_MAX_PN`.

    **Conventions**: absolute PN order, ``x^pn`` relative to the Newtonian flux.

    Example
    -------
    >>> check_eccentric_order("1.5")
    3/2

    References
    ----------
    Common practice.
    """
    if isinstance(pn, str):
        order = parse_pn_order(pn, "pn")
    else:
        order = as_pn_order(pn, "pn")
        if order < 0:
            raise ValueError(f"pn must be a non-negative multiple of 1/2, got {pn!r}")
    if order > ECCENTRIC_MAX_PN:
        raise OrderBeyondInputsError(
            f"eccentric-orbit averages are derived through {ECCENTRIC_MAX_PN}PN (1PN "
            f"quasi-Keplerian orbit and instantaneous fluxes, leading 1.5PN tail); pn = {order} "
            f"is beyond the inputs")
    return sp.Rational(order.numerator, order.denominator)


@lru_cache(maxsize=None)
def _dimensionless_orbit(pn_order: int) -> dict[sp.Symbol, PNSeries]:
    """r c^2 x/(G m), rdot/(c sqrt(x)), phidot G m/(c^3 x^(3/2)) on the quasi-Keplerian orbit,
    as PN series in sqrt(x) from order 0, coefficients in w = 1 - e_t cos u, zeta = e_t sin u,
    e_t, nu."""
    elements = quasi_keplerian_from_frequency(pn_order)
    scales = {r: (elements.radius(), -1, G * m / c**2),
              rdot: (elements.radial_velocity(), _HALF, c),
              phidot: (elements.angular_velocity(), sp.Rational(3, 2), c**3 / (G * m))}
    out = {}
    for symbol, (series, lead, scale) in scales.items():
        def to_w(value: sp.Expr, scale: sp.Expr = scale) -> sp.Expr:
            value = to_anomaly_variables(sp.expand(value / scale), et, u)
            value = sp.expand(sp.cancel(sp.together(value)))
            if value.has(c) or value.has(G) or value.has(m):
                raise ArithmeticError(f"orbit coefficient not reduced: {value}")
            return value
        out[symbol] = series.shift(-lead).map_coefficients(to_w)
    return out


def _check_homogeneous(series: PNSeries, weight: int) -> None:
    """Each order-n coefficient (G = m = 1) must scale as lam^(weight + 2n) under
    r -> r/lam^2, rdot -> lam rdot, phidot -> lam^3 phidot (dimensional analysis, c = 1)."""
    lam = sp.Dummy("lam", positive=True)
    for order, coeff in series.terms.items():
        scaled = coeff.subs({r: r / lam**2, rdot: lam * rdot, phidot: lam**3 * phidot},
                            simultaneous=True)
        if sp.expand(scaled - lam ** (weight + 2 * order) * coeff) != 0:
            raise ArithmeticError(f"flux coefficient at order {order} is not homogeneous: {coeff}")


def collect_in_nu(expr: sp.Expr) -> sp.Expr:
    """Display: each term ``P(e)/(1 - e^2)^k`` with ``P`` collected in ``nu``.

    Parameters
    ----------
    expr:
        A sum of such terms.

    Returns
    -------
    sympy.Expr

    **Conventions**: display only (the value is unchanged).

    Example
    -------
    >>> collect_in_nu((et**2 * nu + 1 + nu) / (1 - et**2))
    (nu*(et**2 + 1) + 1)/(1 - et**2)

    References
    ----------
    Common practice.
    """
    parts = []
    for term in sp.Add.make_args(expr):
        num, den = sp.fraction(term)
        parts.append(sp.collect(sp.expand(num), nu) / den)
    return sp.Add(*parts)


def _average_instantaneous(flux: PNSeries, weight: int, order: sp.Rational) -> PNSeries:
    """Average a general-orbit flux S (F = (G/c^5) S, series in 1/c) over the quasi-Keplerian
    orbit; normalised by (32/5) nu^2 and the x-scaling, a PN series in sqrt(x)."""
    pn_order = 1 if order >= 1 else 0
    orbit = _dimensionless_orbit(pn_order)
    # with G = m = c = 1, dimensional analysis turns the 1/c order n into the x order n once
    # r, rdot, phidot are divided by their x-scalings (checked, not assumed)
    unit = flux.map_coefficients(lambda v: sp.expand(v.subs({G: 1, m: 1})))
    _check_homogeneous(unit, weight)
    unit = unit.truncate(order)
    for symbol in (r, rdot, phidot):
        unit = unit.substitute(symbol, orbit[symbol], _EPS)
    unit = unit.truncate(order)
    normalisation = sp.Rational(32, 5) * nu**2
    terms = {}
    for k, coeff in unit.terms.items():
        averaged = average_anomaly_polynomial(coeff * _W / normalisation, et)
        terms[k] = reduce_mass_difference(averaged) if averaged.has(delta) else averaged
    return PNSeries(terms, order).map_coefficients(collect_in_nu)


@lru_cache(maxsize=None)
def _averaged_instantaneous_flux(kind: str, order: sp.Rational) -> PNSeries:
    """The orbit average of the instantaneous mode-summed flux (energy: weight 10 in the
    homogeneity check, angular momentum: 7), through ``order`` <= 1."""
    from .fluxes import angular_momentum_flux_from_modes, energy_flux_from_modes

    if kind == "energy":
        return _average_instantaneous(energy_flux_from_modes(orbit="general", pn=order), 10, order)
    return _average_instantaneous(angular_momentum_flux_from_modes(orbit="general", pn=order), 7, order)


def _with_tail(instantaneous: PNSeries, tail_function: type[sp.Function], order: sp.Rational
               ) -> PNSeries:
    """Through 1PN the instantaneous average; at 1.5PN add the tail (no instantaneous 1.5PN
    term for non-spinning binaries)."""
    if order < _TAIL_ORDER:
        return instantaneous
    terms = dict(instantaneous.terms)
    terms[sp.Rational(3, 2)] = TAIL_FLUX_NORMALISATION * tail_function(et)
    return PNSeries(terms, order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def averaged_energy_flux(pn: Any = 1) -> PNSeries:
    """Orbit-averaged energy flux of an eccentric binary, exact in ``e_t``, from the modes.

    Parameters
    ----------
    pn:
        PN order 0, 1/2, 1 or 3/2 (int, Rational or string).

    Returns
    -------
    PNSeries
        ``<F>/((32/5)(c^5/G) nu^2 x^5)`` in ``eps = sqrt(x)`` (order ``n`` <-> ``x^n``),
        coefficients in ``et`` and ``nu``; known through ``pn``. At 1.5PN the coefficient is
        ``4 pi phi(et)`` (:class:`~stfalgebra.radiative.tail_enhancement.EnergyTailEnhancement`).

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 3/2``.

    **Conventions**: the instantaneous general-orbit flux
    (:func:`~stfalgebra.radiative.fluxes.energy_flux_from_modes`, summed over the modes) on the
    1PN quasi-Keplerian orbit in harmonic coordinates, averaged over the radial period;
    ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n``; ``e_t`` the time eccentricity.

    Example
    -------
    >>> averaged_energy_flux(0).coefficient(0)
    (37*et**4/96 + 73*et**2/24 + 1)/(1 - et**2)**(7/2)
    >>> averaged_energy_flux("3/2").coefficient(sp.Rational(3, 2))
    4*pi*phi(et)

    References
    ----------
    Peters & Mathews, Phys. Rev. 131, 435 (1963) (Newtonian enhancement); Blanchet &
    Schafer, Mon. Not. R. Astron. Soc. 239, 845 (1989) (1PN); Blanchet & Schafer, Class.
    Quantum Grav. 10, 2699 (1993) (tail); compared in the tests.
    """
    order = check_eccentric_order(pn)
    instantaneous = _averaged_instantaneous_flux("energy", min(order, sp.Integer(1)))
    return _with_tail(instantaneous, EnergyTailEnhancement, order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def averaged_angular_momentum_flux(pn: Any = 1) -> PNSeries:
    """Orbit-averaged angular-momentum flux ``<dJ_z/dt>`` of an eccentric binary, from the modes.

    Parameters
    ----------
    pn:
        PN order 0, 1/2, 1 or 3/2.

    Returns
    -------
    PNSeries
        ``<dJ_z/dt>/((32/5) m c^2 nu^2 x^(7/2))`` in ``eps = sqrt(x)``, coefficients in ``et``
        and ``nu``; known through ``pn``. At 1.5PN the coefficient is ``4 pi psi(et)``
        (:class:`~stfalgebra.radiative.tail_enhancement.AngularMomentumTailEnhancement`).

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 3/2``.

    **Conventions**: as :func:`averaged_energy_flux`; positive for loss by the binary.

    Example
    -------
    >>> averaged_angular_momentum_flux(0).coefficient(0)
    (7*et**2/8 + 1)/(1 - et**2)**2

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (Newtonian); Junker & Schafer, Mon. Not. R. Astron.
    Soc. 254, 146 (1992) (1PN); Arun, Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009)
    (tail); compared in the tests.
    """
    order = check_eccentric_order(pn)
    instantaneous = _averaged_instantaneous_flux("angular_momentum", min(order, sp.Integer(1)))
    return _with_tail(instantaneous, AngularMomentumTailEnhancement, order)
