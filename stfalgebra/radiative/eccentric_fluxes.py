"""Orbit-averaged energy and angular-momentum fluxes of eccentric binaries, through 2PN.

* Newtonian, 1PN and 2PN (instantaneous): the general-orbit fluxes summed over the modes
  (:mod:`stfalgebra.radiative.general_fluxes`) on the quasi-Keplerian orbit of
  :mod:`stfalgebra.binary.keplerian` (1PN; at 2PN the harmonic-coordinate 2PN representation
  with its periodic terms), averaged exactly over the radial period
  (:mod:`stfalgebra.binary.orbit_averages`), in ``x`` and the time eccentricity ``e_t``.
* 1.5PN: the leading tail, ``4 pi x^(3/2) phi(e_t)`` and ``4 pi x^(3/2) psi(e_t)`` with the
  enhancement functions of :mod:`stfalgebra.radiative.tail_enhancement` kept as sympy functions
  (their series and values come from that module). The instantaneous fluxes have no 1.5PN term
  for non-spinning binaries, and the hereditary terms have no 2PN term (the next tail
  correction is 2.5PN), so the 2PN coefficient is the instantaneous one.

Normalisation (``../shared/conventions.md``): averaged fluxes are divided by
``(32/5)(c^5/G) nu^2 x^5`` (energy) and ``(32/5) m c^2 nu^2 x^(7/2)`` (angular momentum),
``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n`` the orbit-averaged azimuthal frequency.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any

import sympy as sp

from ..binary.keplerian import quasi_keplerian_from_frequency, tidy_eccentricity
from ..binary.masses import reduce_mass_difference
from ..binary.orbit_averages import E_SIN_U, ONE_MINUS_E_COS_U, mean_power
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
#: read off the table of contributions (the quasi-Keplerian orbit with the instantaneous fluxes,
#: plus the leading 1.5PN tail through the enhancement functions).
ECCENTRIC_MAX_PN = maximum_eccentric_order()

_TAIL_ORDER = PNOrder(3, 2)
_HALF = sp.Rational(1, 2)
_W = ONE_MINUS_E_COS_U
_ZETA = E_SIN_U
_EPS = eps_symbol


def check_eccentric_order(pn: Any) -> sp.Rational:
    """A PN order of the eccentric-orbit averages: a multiple of 1/2 up to :data:`ECCENTRIC_MAX_PN`.

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
            f"eccentric-orbit averages are derived through {ECCENTRIC_MAX_PN}PN (quasi-Keplerian "
            f"orbit and instantaneous fluxes, leading 1.5PN tail; the table of contributions has no "
            f"eccentric row beyond); pn = {order} is beyond the inputs")
    return sp.Rational(order.numerator, order.denominator)


# Opaque symbols for the elements during the substitution and expansion (every coefficient
# stays a polynomial in them and a Laurent polynomial in w): the values (functions of e_t) come
# in only after the powers of w have been collected, so no rational function of e_t is ever
# expanded. ``_ROOT`` is sqrt(1 - e_t^2), ``_ECC`` the e_t of w = 1 - e_t cos u.
_ROOT, _ECC = sp.Dummy("root", positive=True), sp.Dummy("ecc", positive=True)
_ELEMENT_NAMES = ("axis", "radial", "motion", "angular", "advance")


@lru_cache(maxsize=None)
def _element_symbols(pn_order: int) -> dict[tuple[str, int], sp.Dummy]:
    return {(name, k): sp.Dummy(f"{name}{k}") for name in _ELEMENT_NAMES for k in range(1, pn_order + 1)}


@lru_cache(maxsize=None)
def _element_values(pn_order: int) -> dict[sp.Dummy, sp.Expr]:
    """The opaque symbols' values: the relative corrections of ``a_r x c^2/(G m)``, ``e_r/e_t``,
    ``n G m/(c^3 x^(3/2))``, ``e_phi/e_t``, ``k`` at each order of x, and from 2PN the periodic
    coefficients ``f_t``, ``g_t/e_t``, ``f_phi/e_t^2``, ``g_phi/e_t^3``; in ``_ECC``, ``_ROOT``."""
    elements = quasi_keplerian_from_frequency(pn_order)
    symbols = _element_symbols(pn_order)
    series = {"axis": (elements.semi_major_axis, -1, G * m / c**2),
              "radial": (elements.radial_eccentricity, 0, et),
              "motion": (elements.mean_motion, sp.Rational(3, 2), c**3 / (G * m)),
              "angular": (elements.angular_eccentricity, 0, et),
              "advance": (elements.periastron_advance, 0, 1)}
    def value(expr: sp.Expr) -> sp.Expr:
        return _in_root(sp.sympify(expr).subs(et, _ECC))

    out = {}
    for (name, k), symbol in symbols.items():
        element, lead, scale = series[name]
        out[symbol] = value(element.coefficient(lead + k) / scale)
    for name, power in (("time_anomaly_term", 0), ("time_sine_term", 1), ("phase_sine_2v_term", 2),
                        ("phase_sine_3v_term", 3)):
        if elements.has_periodic_terms:
            out[_periodic_symbols()[name]] = value(getattr(elements, name).coefficient(2) / et**power)
    return out


@lru_cache(maxsize=None)
def _periodic_symbols() -> dict[str, sp.Dummy]:
    return {name: sp.Dummy(name) for name in ("time_anomaly_term", "time_sine_term", "phase_sine_2v_term",
                                              "phase_sine_3v_term")}


@lru_cache(maxsize=None)
def _dimensionless_orbit(pn_order: int) -> tuple[dict[sp.Symbol, PNSeries], PNSeries]:
    """r c^2 x/(G m), rdot/(c sqrt(x)), phidot G m/(c^3 x^(3/2)) on the quasi-Keplerian orbit,
    and ``dl/du = n dt/du``, as PN series in sqrt(x) from order 0, coefficients Laurent
    polynomials in w = 1 - e_t cos u and polynomials in zeta = e_t sin u and the opaque element
    symbols (values: :func:`_element_values`).

    With ``cos u = (1 - w)/e_t``: ``1 - e cos u = w - (e/e_t - 1)(1 - w)`` for ``e = e_r,
    e_phi``; at 2PN (periodic terms, Newtonian v) ``dv/du = s/w``, ``cos v = (s^2 - w)/(e_t w)``,
    ``s = sqrt(1 - e_t^2)`` (the representation of :mod:`stfalgebra.binary.keplerian`).
    """
    symbols = _element_symbols(pn_order)
    known = sp.Rational(pn_order) + _HALF if pn_order < 2 else sp.Integer(2)

    def relative(name: str) -> PNSeries:
        return PNSeries({0: 1, **{k: symbols[(name, k)] for k in range(1, pn_order + 1)}}, known)

    axis, radial, motion, angular = (relative(name) for name in ("axis", "radial", "motion", "angular"))
    advance = relative("advance") - 1
    w, zeta, s = _W, _ZETA, _ROOT
    radius = (axis * (w - (radial - 1) * (1 - w))).expand()
    anomaly_rate = PNSeries({0: w}, known)
    angle_factor = PNSeries({0: 1}, known)
    if pn_order >= 2:
        periodic = _periodic_symbols()
        rate_v = s / w
        cos_v = (s**2 - w) / (_ECC * w)
        # f_t (v' - 1) + g_t cos v v', with g_t = e_t * symbol
        anomaly_rate = anomaly_rate + PNSeries({2: sp.expand(
            periodic["time_anomaly_term"] * (rate_v - 1)
            + periodic["time_sine_term"] * _ECC * cos_v * rate_v)}, known)
        cos_2v = 2 * cos_v**2 - 1
        cos_3v = (4 * cos_v**2 - 3) * cos_v
        angle_factor = angle_factor + PNSeries({2: sp.expand(
            2 * periodic["phase_sine_2v_term"] * _ECC**2 * cos_2v
            + 3 * periodic["phase_sine_3v_term"] * _ECC**3 * cos_3v)}, known)
    # sqrt(1 - e_phi^2) = s sqrt(1 - (e_t^2/s^2)((e_phi/e_t)^2 - 1))
    root_phi = ((1 - (angular**2 - 1) * (_ECC**2 / s**2)) ** _HALF * s).expand()
    rate_phi = (root_phi / (w - (angular - 1) * (1 - w))).expand()
    radial_velocity = (axis * radial * motion * zeta / anomaly_rate).expand()
    angular_velocity = ((1 + advance) * motion * rate_phi * angle_factor / anomaly_rate).expand()
    orbit = {r: radius, rdot: radial_velocity, phidot: angular_velocity}
    for symbol, series in orbit.items():
        orbit[symbol] = series.map_coefficients(sp.expand)
    return orbit, anomaly_rate


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
    pn_order = int(min(order, 2))
    orbit, anomaly_rate = _dimensionless_orbit(pn_order)
    # with G = m = c = 1, dimensional analysis turns the 1/c order n into the x order n once
    # r, rdot, phidot are divided by their x-scalings (checked, not assumed)
    unit = flux.map_coefficients(lambda v: sp.expand(v.subs({G: 1, m: 1})))
    _check_homogeneous(unit, weight)
    unit = unit.truncate(order)
    for symbol in (r, rdot, phidot):
        unit = unit.substitute(symbol, orbit[symbol], _EPS)
    # time average over the radial period: (1/2 pi) int F (dl/du) du, l = n (t - t_0)
    unit = (unit * anomaly_rate).truncate(order)
    normalisation = sp.Rational(32, 5) * nu**2
    values = _element_values(pn_order)
    terms = {}
    for k, coeff in unit.terms.items():
        averaged = _average_over_anomaly(sp.expand(coeff / normalisation), values)
        terms[k] = reduce_mass_difference(averaged) if averaged.has(delta) else averaged
    return PNSeries(terms, order).map_coefficients(collect_in_nu)


def _in_root(expr: sp.Expr) -> sp.Expr:
    """A function of ``_ECC`` and powers of ``1 - _ECC^2`` (half-integer ones included) as a
    rational function of ``_ECC`` and ``_ROOT = sqrt(1 - _ECC^2)`` with even powers of ``_ECC``
    eliminated."""
    expr = expr.replace(lambda p: p.is_Pow and sp.expand(p.base - (1 - _ECC**2)) == 0 and (2 * p.exp).is_Integer,
                        lambda p: _ROOT ** int(2 * p.exp))
    expr = sp.cancel(sp.together(expr))
    num, den = sp.fraction(expr)
    reduce = lambda v: sp.rem(sp.expand(v), _ECC**2 - (1 - _ROOT**2), _ECC)  # noqa: E731
    return sp.cancel(reduce(num) / reduce(den))


def _average_over_anomaly(expr: sp.Expr, values: dict[sp.Dummy, sp.Expr]) -> sp.Expr:
    """Uniform u-average of a Laurent polynomial in w, polynomial in zeta (coefficients in the
    opaque element symbols): the powers of w are collected first, then the element values and
    the means of w^k (:func:`~stfalgebra.binary.orbit_averages.mean_power`) come in."""
    by_power: dict[int, list[sp.Expr]] = {}
    for term in sp.Add.make_args(expr):
        coeff, zeta_power = term.as_coeff_exponent(_ZETA)
        if zeta_power % 2:
            continue   # odd in u
        if zeta_power:
            # zeta^2 = e_t^2 - (1 - w)^2
            pieces = sp.Add.make_args(sp.expand(coeff * (_ECC**2 - (1 - _W) ** 2) ** (int(zeta_power) // 2)))
        else:
            pieces = (coeff,)
        for piece in pieces:
            rest, power = piece.as_coeff_exponent(_W)
            if rest.has(_W) or not power.is_Integer:
                raise ValueError(f"integrand is not a Laurent polynomial in 1 - e cos u: {piece}")
            by_power.setdefault(int(power), []).append(rest)
    total = sp.S.Zero
    for power, coeffs in by_power.items():
        coefficient = _in_root(sp.Add(*coeffs).xreplace(values))
        total += coefficient * _in_root(mean_power(power, _ECC))
    total = sp.cancel(sp.together(total)).subs(_ECC, et)
    return tidy_eccentricity(total.subs(_ROOT, sp.sqrt(1 - et**2)), et)


@lru_cache(maxsize=None)
def _averaged_instantaneous_flux(kind: str, order: sp.Rational) -> PNSeries:
    """The orbit average of the instantaneous mode-summed flux (energy: weight 10 in the
    homogeneity check, angular momentum: 7), through ``order`` (0, 1/2, 1 or 2: there is no
    instantaneous 1.5PN term)."""
    from .general_fluxes import general_orbit_angular_momentum_flux, general_orbit_energy_flux

    if kind == "energy":
        return _average_instantaneous(general_orbit_energy_flux(order, instantaneous_only=True), 10, order)
    return _average_instantaneous(general_orbit_angular_momentum_flux(order, instantaneous_only=True), 7, order)


def _instantaneous_order(order: sp.Rational) -> sp.Rational:
    """The order of the instantaneous average a request needs: 1 serves 3/2 (no instantaneous
    1.5PN term), 2 serves 2."""
    return order if order >= 2 else min(order, sp.Integer(1))


def _with_tail(instantaneous: PNSeries, tail_function: type[sp.Function], order: sp.Rational
               ) -> PNSeries:
    """Through 1PN the instantaneous average; from 1.5PN add the tail (no instantaneous 1.5PN
    term for non-spinning binaries; no hereditary 2PN term)."""
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
        PN order 0, 1/2, 1, 3/2 or 2 (int, Rational or string).

    Returns
    -------
    PNSeries
        ``<F>/((32/5)(c^5/G) nu^2 x^5)`` in ``eps = sqrt(x)`` (order ``n`` <-> ``x^n``),
        coefficients in ``et`` and ``nu``; known through ``pn``. At 1.5PN the coefficient is
        ``4 pi phi(et)`` (:class:`~stfalgebra.radiative.tail_enhancement.EnergyTailEnhancement`).

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 2`` (above :data:`ECCENTRIC_MAX_PN`).

    **Conventions**: the instantaneous general-orbit flux
    (:func:`~stfalgebra.radiative.fluxes.energy_flux_from_modes`, summed over the modes) on the
    quasi-Keplerian orbit in harmonic coordinates (1PN; 2PN from pn = 2), averaged over the radial period;
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
    instantaneous = _averaged_instantaneous_flux("energy", _instantaneous_order(order))
    return _with_tail(instantaneous, EnergyTailEnhancement, order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def averaged_angular_momentum_flux(pn: Any = 1) -> PNSeries:
    """Orbit-averaged angular-momentum flux ``<dJ_z/dt>`` of an eccentric binary, from the modes.

    Parameters
    ----------
    pn:
        PN order 0, 1/2, 1, 3/2 or 2.

    Returns
    -------
    PNSeries
        ``<dJ_z/dt>/((32/5) m c^2 nu^2 x^(7/2))`` in ``eps = sqrt(x)``, coefficients in ``et``
        and ``nu``; known through ``pn``. At 1.5PN the coefficient is ``4 pi psi(et)``
        (:class:`~stfalgebra.radiative.tail_enhancement.AngularMomentumTailEnhancement`).

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 2`` (above :data:`ECCENTRIC_MAX_PN`).

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
    instantaneous = _averaged_instantaneous_flux("angular_momentum", _instantaneous_order(order))
    return _with_tail(instantaneous, AngularMomentumTailEnhancement, order)
