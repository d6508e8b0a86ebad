"""Eccentric binaries: orbit averages, harmonic decomposition, secular evolution.

* Orbit averages over one radial period, exact in the eccentricity. Time averages become
  averages over the eccentric anomaly, ``<F> = (1/2 pi) int_0^(2 pi) F (1 - e_t cos u) du``
  (``n dt = (1 - e_t cos u) du`` through 1PN), and every integrand is reduced to powers of
  ``w = 1 - e cos u``. The mean of ``w^(-N)`` is derived once by residues (``N = 1``) and a
  recurrence in ``e`` (:func:`mean_inverse_power`).
* Averaged energy and angular-momentum fluxes, Newtonian and 1PN (instantaneous terms), from
  the general-orbit fluxes summed over the modes (:mod:`stfalgebra.radiative.fluxes`) on the
  quasi-Keplerian orbit of :mod:`stfalgebra.binary.keplerian`, in ``x`` and ``e_t``.
* Harmonic decomposition of the Newtonian modes in the mean anomaly: Bessel-function
  coefficients of each mode and the power in each harmonic of the orbital frequency.
* Secular evolution from the balance of energy and angular momentum: ``da/dt, de/dt``
  (Newtonian), ``dx/dt, de_t/dt`` (1PN), the closed ``a(e)`` relation of the Newtonian
  evolution, and a numerical integrator of the secular equations.

Normalisation (``../shared/conventions.md``): averaged fluxes are divided by
``(32/5)(c^5/G) nu^2 x^5`` (energy) and ``(32/5) m c^2 nu^2 x^(7/2)`` (angular momentum),
``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n`` the orbit-averaged azimuthal frequency.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import mpmath
import sympy as sp

from ..binary.keplerian import (
    KeplerEllipse,
    a as semi_major_axis_symbol,
    e as kepler_eccentricity,
    quasi_keplerian_from_frequency,
    tidy_eccentricity,
    u,
    validate_eccentricity,
    validate_frequency_parameter,
)
from ..binary.masses import reduce_mass_difference, validate_nu
from ..errors import OrderBeyondInputsError
from ..pnseries import PNSeries
from ..symbols import G, c, delta, et, m, nu, phidot, r, rdot, x

__all__ = [
    "ECCENTRIC_MAX_PN",
    "mean_inverse_power",
    "mean_power",
    "orbit_average",
    "averaged_energy_flux",
    "averaged_angular_momentum_flux",
    "eccentric_flux_payload",
    "keplerian_mode",
    "mode_fourier_coefficient",
    "harmonic_power",
    "harmonic_power_sum",
    "newtonian_secular_rates",
    "newtonian_semi_major_axis_track",
    "secular_rates",
    "SecularTrackPoint",
    "integrate_secular_evolution",
]

#: Highest PN order of the averaged fluxes and secular rates (1PN quasi-Keplerian orbit and
#: instantaneous fluxes; the 1.5PN tails are not averaged here).
ECCENTRIC_MAX_PN = sp.Integer(1)

_W = sp.Dummy("w", positive=True)      # 1 - e cos u
_ZETA = sp.Dummy("zeta", real=True)    # e sin u
_EPS = sp.Dummy("eps_x", positive=True)
_HALF = sp.Rational(1, 2)


# ----------------------------------------------------------------------------- order checks
def _check_order(pn: Any) -> sp.Rational:
    """A PN order 0, 1/2 or 1 (int, Rational or string); beyond 1 is refused."""
    if isinstance(pn, bool):
        raise TypeError(f"pn must be a multiple of 1/2, got {pn!r}")
    if isinstance(pn, str):
        try:
            value = sp.Rational(pn.strip())
        except (TypeError, ValueError, sp.SympifyError):
            raise ValueError(f"pn must be a non-negative multiple of 1/2, got {pn!r}") from None
    elif isinstance(pn, (int, sp.Integer, sp.Rational)):
        value = sp.Rational(pn)
    else:
        raise TypeError(f"pn must be an int, Rational or string, got {pn!r}")
    if value < 0 or not (2 * value).is_Integer:
        raise ValueError(f"pn must be a non-negative multiple of 1/2, got {pn!r}")
    if value > ECCENTRIC_MAX_PN:
        raise OrderBeyondInputsError(
            f"eccentric-orbit averages are derived through {ECCENTRIC_MAX_PN}PN (1PN "
            f"quasi-Keplerian orbit, instantaneous fluxes); pn = {value} is beyond the inputs")
    return value


# ----------------------------------------------------------------------------- raw averages
@lru_cache(maxsize=None)
def _inverse_power_numerator(power: int) -> sp.Expr:
    """A_N(e) with (1/2 pi) int_0^(2 pi) (1 - e cos u)^(-N) du = A_N(e)/sqrt(1 - e^2).

    N = 1 by residues: with z = exp(i u) the integral is (1/2 pi i) contour integral of
    (-2/e) dz/((z - z_-)(z - z_+)), z_+- = (1 +- s)/e, s = sqrt(1 - e^2); only z_- lies inside
    the unit circle, residue (-2/e)/(z_- - z_+) = 1/s. Higher N from
    d/de (1 - e cos u)^(-N) = N cos u (1 - e cos u)^(-N-1) and e cos u = 1 - (1 - e cos u):
    I_(N+1) = I_N + (e/N) dI_N/de.
    """
    ecc = kepler_eccentricity
    if power == 1:
        s = sp.Symbol("s", positive=True)      # sqrt(1 - e^2)
        z_minus, z_plus = (1 - s) / ecc, (1 + s) / ecc
        residue = sp.cancel(sp.together((-2 / ecc) / (z_minus - z_plus)))
        return sp.cancel(residue * s)
    prev = _inverse_power_numerator(power - 1)
    # I = A (1 - e^2)^(-1/2): dI/de = (A' + e A/(1 - e^2)) (1 - e^2)^(-1/2)
    n = power - 1
    return sp.factor(sp.cancel(prev + ecc / n * (sp.diff(prev, ecc) + ecc * prev / (1 - ecc**2))))


def mean_inverse_power(power: int, eccentricity: Any = kepler_eccentricity) -> sp.Expr:
    """Mean of ``(1 - e cos u)^(-N)`` over the eccentric anomaly, exact in ``e``.

    Parameters
    ----------
    power:
        ``N >= 1``.
    eccentricity:
        ``e`` in [0, 1) or a symbol (default the Keplerian ``e``).

    Returns
    -------
    sympy.Expr
        ``(1/2 pi) int_0^(2 pi) (1 - e cos u)^(-N) du``, a rational function of ``e`` divided
        by ``(1 - e^2)^(N - 1/2)``.

    **Conventions**: uniform measure in ``u`` (not in time: the time average of ``f`` is the
    ``u``-average of ``f (1 - e cos u)``).

    Example
    -------
    >>> mean_inverse_power(3)
    (e**2/2 + 1)/(1 - e**2)**(5/2)

    References
    ----------
    Derived here (residues for N = 1, recurrence in ``e``); equals
    ``(1 - e^2)^(-N/2) P_(N-1)(1/sqrt(1 - e^2))`` by Laplace's integral for the Legendre
    polynomials (from memory, tested).
    """
    if isinstance(power, bool) or not isinstance(power, int) or power < 1:
        raise ValueError(f"power must be an int >= 1, got {power!r}")
    ecc = validate_eccentricity(eccentricity)
    value = tidy_eccentricity(_inverse_power_numerator(power) / sp.sqrt(1 - kepler_eccentricity**2),
                              kepler_eccentricity)
    return _factor_display(value, kepler_eccentricity).subs(kepler_eccentricity, ecc)


def mean_power(power: int, eccentricity: Any = kepler_eccentricity) -> sp.Expr:
    """Mean of ``(1 - e cos u)^p`` over the eccentric anomaly for any integer ``p``.

    Parameters
    ----------
    power:
        An integer ``p`` (negative powers through :func:`mean_inverse_power`).
    eccentricity:
        ``e`` in [0, 1) or a symbol.

    Returns
    -------
    sympy.Expr
        For ``p >= 0`` the polynomial ``sum_j binom(p, 2j) binom(2j, j) (e/2)^(2j)``.

    **Conventions**: uniform measure in ``u``.

    Example
    -------
    >>> mean_power(2)
    e**2/2 + 1

    References
    ----------
    Common practice (binomial expansion; mean of cos^(2j) u is binom(2j, j)/4^j).
    """
    if isinstance(power, bool) or not isinstance(power, int):
        raise TypeError(f"power must be an int, got {power!r}")
    ecc = validate_eccentricity(eccentricity)
    if power < 0:
        return mean_inverse_power(-power, ecc)
    return _mean_power_raw(power).subs(kepler_eccentricity, ecc)


@lru_cache(maxsize=None)
def _mean_power_raw(power: int) -> sp.Expr:
    if power < 0:
        return _inverse_power_numerator(-power) / sp.sqrt(1 - kepler_eccentricity**2)
    ecc = kepler_eccentricity
    return sp.expand(sum(sp.binomial(power, 2 * j) * sp.binomial(2 * j, j) * (ecc / 2) ** (2 * j)
                         for j in range(power // 2 + 1)))


def _factor_display(expr: sp.Expr, ecc: sp.Symbol) -> sp.Expr:
    """``P/(Q (1 - e^2)^k)`` with the numeric content of ``P`` pulled out front."""
    out = []
    for term in sp.Add.make_args(expr):
        num, den = sp.fraction(term)
        content, prim = sp.factor_terms(sp.expand(num)).as_coeff_Mul()
        out.append(content * prim / den if content != 1 else term)
    return sp.Add(*out)


def _average_laurent(expr: sp.Expr, ecc: sp.Symbol) -> sp.Expr:
    """u-average of an expression polynomial in w^(+-1) and zeta (w = 1 - e cos u,
    zeta = e sin u, ``ecc`` the e)."""
    expr = sp.expand(expr)
    if expr.has(_ZETA):
        reduced = []
        for term in sp.Add.make_args(expr):
            coeff, power = term.as_coeff_exponent(_ZETA)
            if coeff.has(_ZETA) or not power.is_Integer:
                raise ValueError(f"integrand is not polynomial in e sin u: {term}")
            if power % 2:
                continue   # odd in u: averages to zero
            reduced.append(coeff * (ecc**2 - (1 - _W) ** 2) ** (int(power) // 2))
        expr = sp.expand(sp.Add(*reduced))
    by_power: dict[int, list[sp.Expr]] = {}
    for term in sp.Add.make_args(expr):
        coeff, power = term.as_coeff_exponent(_W)
        if coeff.has(_W) or not power.is_Integer:
            raise ValueError(f"integrand is not a Laurent polynomial in 1 - e cos u: {term}")
        by_power.setdefault(int(power), []).append(coeff)
    total = sp.S.Zero
    for power, coeffs in by_power.items():
        total += sp.Add(*coeffs) * _mean_power_raw(power).subs(kepler_eccentricity, ecc)
    if not isinstance(ecc, sp.Symbol):
        return sp.radsimp(sp.expand(total))
    return tidy_eccentricity(total, ecc)


def orbit_average(expr: Any, eccentricity: Any = kepler_eccentricity,
                  anomaly: sp.Symbol = u) -> sp.Expr:
    """Time average over one radial period of a function of the eccentric anomaly.

    Parameters
    ----------
    expr:
        A sympy expression in ``cos(u)``, ``sin(u)`` (polynomially) and powers of
        ``(1 - e cos u)`` in denominators, with ``e`` the ``eccentricity`` symbol.
    eccentricity:
        The eccentricity entering ``n dt = (1 - e cos u) du`` (``e_t`` at 1PN); a symbol,
        or a number in [0, 1).
    anomaly:
        The eccentric-anomaly symbol (default :data:`stfalgebra.binary.keplerian.u`).

    Returns
    -------
    sympy.Expr
        ``(1/2 pi) int_0^(2 pi) expr (1 - e cos u) du``, exact, as
        ``A(e) + B(e) sqrt(1 - e^2)`` with ``A, B`` rational (see
        :func:`~stfalgebra.binary.keplerian.tidy_eccentricity`).

    Raises
    ------
    ValueError
        An integrand that is not of that form, or an eccentricity outside [0, 1).

    **Conventions**: the time average over the radial period ``P = 2 pi/n``; the mean anomaly
    ``l = u - e sin u = n (t - t_0)``.

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e, u
    >>> orbit_average(sp.cos(u))
    -e/2
    >>> orbit_average(1 / (1 - e * sp.cos(u))**2)
    1/sqrt(1 - e**2)

    References
    ----------
    Common practice (averages over the Keplerian orbit; the mean of ``(1 - e cos u)^(-N)``
    from :func:`mean_inverse_power`).
    """
    ecc_value = validate_eccentricity(eccentricity)
    integrand = sp.sympify(expr)
    if isinstance(ecc_value, sp.Symbol):
        ecc = sp.Dummy("e", positive=True)
        integrand = integrand.subs(ecc_value, ecc)
    elif ecc_value.is_number:
        ecc = ecc_value
        if ecc == 0:
            # circular: the time average is the plain average of a trigonometric polynomial
            return sp.simplify(sp.integrate(sp.expand(integrand), (anomaly, 0, 2 * sp.pi)) / (2 * sp.pi))
    else:
        raise ValueError(f"eccentricity must be a symbol or a number, got {eccentricity!r}")
    integrand = integrand.subs({sp.cos(anomaly): (1 - _W) / ecc, sp.sin(anomaly): _ZETA / ecc})
    if integrand.has(anomaly):
        raise ValueError(f"{expr} depends on {anomaly} other than through cos and sin")
    result = _average_laurent(integrand * _W, ecc)
    return result.subs(ecc, ecc_value) if isinstance(ecc_value, sp.Symbol) else result


# ----------------------------------------------------------------------------- averaged fluxes
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
            value = sp.expand(value / scale)
            value = value.subs({sp.cos(u): (1 - _W) / et, sp.sin(u): _ZETA / et})
            value = sp.expand(sp.cancel(sp.together(value)))
            if value.has(u) or value.has(c) or value.has(G) or value.has(m):
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


def _average_flux(flux: PNSeries, weight: int, order: sp.Rational) -> PNSeries:
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
        averaged = _average_laurent(coeff * _W / normalisation, et)
        terms[k] = reduce_mass_difference(averaged) if averaged.has(delta) else averaged
    return PNSeries(terms, order).map_coefficients(lambda v: _collect_nu(v))


def _collect_nu(expr: sp.Expr) -> sp.Expr:
    """Display: each term P(e)/(1 - e^2)^k with P collected in nu."""
    parts = []
    for term in sp.Add.make_args(expr):
        num, den = sp.fraction(term)
        parts.append(sp.collect(sp.expand(num), nu) / den)
    return sp.Add(*parts)


@lru_cache(maxsize=None)
def averaged_energy_flux(pn: Any = 1) -> PNSeries:
    """Orbit-averaged energy flux of an eccentric binary, exact in ``e_t``, from the modes.

    Parameters
    ----------
    pn:
        PN order 0, 1/2 or 1 (int, Rational or string).

    Returns
    -------
    PNSeries
        ``<F>/((32/5)(c^5/G) nu^2 x^5)`` in ``eps = sqrt(x)`` (order ``n`` <-> ``x^n``),
        coefficients in ``et`` and ``nu``; known through ``pn``.

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 1``.

    **Conventions**: the instantaneous general-orbit flux
    (:func:`~stfalgebra.radiative.fluxes.energy_flux_from_modes`, summed over the modes) on the
    1PN quasi-Keplerian orbit in harmonic coordinates, averaged over the radial period;
    ``x = (G m omega/c^3)^(2/3)``, ``omega = (1 + k) n``; ``e_t`` the time eccentricity.

    Example
    -------
    >>> averaged_energy_flux(0).coefficient(0)
    (37*et**4/96 + 73*et**2/24 + 1)/(1 - et**2)**(7/2)

    References
    ----------
    Peters & Mathews, Phys. Rev. 131, 435 (1963) (Newtonian enhancement); Blanchet &
    Schafer, Mon. Not. R. Astron. Soc. 239, 845 (1989) (1PN); compared in the tests.
    """
    order = _check_order(pn)
    from .fluxes import energy_flux_from_modes

    return _average_flux(energy_flux_from_modes(orbit="general", pn=order), 10, order)


@lru_cache(maxsize=None)
def averaged_angular_momentum_flux(pn: Any = 1) -> PNSeries:
    """Orbit-averaged angular-momentum flux ``<dJ_z/dt>`` of an eccentric binary, from the modes.

    Parameters
    ----------
    pn:
        PN order 0, 1/2 or 1.

    Returns
    -------
    PNSeries
        ``<dJ_z/dt>/((32/5) m c^2 nu^2 x^(7/2))`` in ``eps = sqrt(x)``, coefficients in ``et``
        and ``nu``; known through ``pn``.

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 1``.

    **Conventions**: as :func:`averaged_energy_flux`; positive for loss by the binary.

    Example
    -------
    >>> averaged_angular_momentum_flux(0).coefficient(0)
    (7*et**2/8 + 1)/(1 - et**2)**2

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (Newtonian); Junker & Schafer, Mon. Not. R. Astron.
    Soc. 254, 146 (1992) (1PN); compared in the tests.
    """
    order = _check_order(pn)
    from .fluxes import angular_momentum_flux_from_modes

    return _average_flux(angular_momentum_flux_from_modes(orbit="general", pn=order), 7, order)


def eccentric_flux_payload(pn: Any) -> dict:
    """The averaged eccentric-orbit fluxes for the command line, as sympy strings.

    Parameters
    ----------
    pn:
        PN order 0, 1/2 or 1.

    Returns
    -------
    dict
        ``{"energy": str, "angular_momentum": str}``: :func:`averaged_energy_flux` and
        :func:`averaged_angular_momentum_flux` as expressions in ``x, nu, et`` (sympy syntax).

    Raises
    ------
    OrderBeyondInputsError
        ``pn > 1``.

    **Conventions**: energy flux divided by ``(32/5)(c^5/G) nu^2 x^5``, angular-momentum flux
    by ``(32/5) m c^2 nu^2 x^(7/2)``; harmonic coordinates, time eccentricity ``et``.

    Example
    -------
    >>> eccentric_flux_payload(0)["angular_momentum"]
    '(7*et**2/8 + 1)/(1 - et**2)**2'

    References
    ----------
    As :func:`averaged_energy_flux`.
    """
    order = _check_order(pn)

    def text(series: PNSeries) -> str:
        terms = [coeff * x ** k for k, coeff in series.terms.items()]
        return sp.sstr(sp.Add(*terms, evaluate=False) if len(terms) > 1 else sp.Add(*terms))

    return {"energy": text(averaged_energy_flux(order)),
            "angular_momentum": text(averaged_angular_momentum_flux(order))}


# ----------------------------------------------------------------------------- harmonics
def keplerian_mode(l: int, m_index: int, orbit: KeplerEllipse | None = None,
                   anomaly: sp.Symbol = u) -> sp.Expr:
    """A Newtonian mode on the Keplerian ellipse as an explicit function of ``u``.

    Parameters
    ----------
    l, m_index:
        The mode; the leading (Newtonian-type) term of ``Hhat_lm`` is used.
    orbit:
        The ellipse (default ``KeplerEllipse()``: symbols ``a, e``).
    anomaly:
        The eccentric-anomaly symbol.

    Returns
    -------
    sympy.Expr
        ``Hhat_lm exp(-i m phi)`` at leading order as a rational function of ``cos u, sin u``,
        so that ``h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) * this``; ``G = 1`` inside, as in Hhat.

    **Conventions**: general-orbit normalisation of ``../shared/conventions.md``; periastron
    at ``u = 0``, ``phi = 0``.

    Example
    -------
    >>> h = keplerian_mode(2, 2, KeplerEllipse(1, 0))
    >>> sp.simplify(h.rewrite(sp.exp))
    2*m*exp(-2*I*u)

    References
    ----------
    Common practice (the Keplerian orbit substituted in the leading-order modes of
    :func:`~stfalgebra.radiative.modes.derive_mode`).
    """
    from .modes import derive_mode

    orbit = KeplerEllipse() if orbit is None else orbit
    hhat = derive_mode(l, m_index, orbit="general", pn_relative=0).hhat
    subs = {key: value.subs(G, 1) for key, value in orbit.orbit_substitution(anomaly).items()}
    return hhat.subs(subs) * orbit.phase_factor(m_index, anomaly)


@lru_cache(maxsize=None)
def _mode_trig_polynomial(l: int, m_index: int) -> tuple[sp.Expr, dict[int, sp.Expr]]:
    """(C, {k: q_k}) with Hhat_lm exp(-i m phi) = C d^l/dt^l Q, Q = r^l exp(-i m phi) =
    sum_k q_k exp(i k u) on the ellipse a = 1, G m = 1 (so n = 1).

    The leading mass modes are l time derivatives of the mass moment, whose (l, m) part is
    proportional to r^l exp(-i m phi); C is read off at one exact point and the
    proportionality then checked identically.
    """
    from .projection import mode_kind

    if mode_kind(l, m_index) != "mass":
        raise ValueError(f"the harmonic decomposition is implemented for mass-type modes "
                         f"(l + m even), got (l, m) = ({l}, {m_index})")
    ecc = kepler_eccentricity
    cos_u, sin_u, root = sp.symbols("cos_u sin_u root_e", real=True)
    orbit = KeplerEllipse(1, ecc)
    to_symbols = {sp.cos(u): cos_u, sp.sin(u): sin_u}

    def algebraic(expr: sp.Expr) -> sp.Expr:
        return sp.sympify(expr).subs(sp.sqrt(1 - ecc**2), root).subs(to_symbols)

    mode = algebraic(keplerian_mode(l, m_index, orbit).subs(m, 1))
    q_u = orbit.radius() ** l * orbit.phase_factor(m_index)
    derivative = q_u
    for _ in range(l):      # d/dt = (n/(1 - e cos u)) d/du, n = 1
        derivative = sp.diff(derivative, u) / (1 - ecc * sp.cos(u))
    derivative = algebraic(derivative)
    # exact point: e = 3/5 (root 4/5), cos u = 5/13, sin u = 12/13
    point = {ecc: sp.Rational(3, 5), root: sp.Rational(4, 5), cos_u: sp.Rational(5, 13),
             sin_u: sp.Rational(12, 13)}
    constant = sp.nsimplify(sp.expand(sp.cancel(mode.subs(point) / derivative.subs(point))))
    difference = sp.together(mode - constant * derivative)
    numerator = sp.expand(sp.fraction(difference)[0])
    for relation, variable in ((sin_u**2 + cos_u**2 - 1, sin_u), (root**2 - 1 + ecc**2, root)):
        numerator = sp.rem(numerator, relation, variable)
    if sp.expand(numerator) != 0 or constant == 0:
        raise ArithmeticError(f"mode ({l}, {m_index}) is not a multiple of "
                              f"d^l/dt^l (r^l e^(-i m phi))")
    z = sp.Dummy("z")
    poly = sp.cancel(sp.together(algebraic(q_u)))
    poly = sp.expand(poly.subs({cos_u: (z + 1 / z) / 2, sin_u: (z - 1 / z) / (2 * sp.I)}))
    coefficients: dict[int, sp.Expr] = {}
    for term in sp.Add.make_args(poly):
        coeff, power = term.as_coeff_exponent(z)
        if coeff.has(z) or not power.is_Integer:
            raise ArithmeticError(f"r^l exp(-i m phi) is not a trigonometric polynomial: {term}")
        coefficients[int(power)] = coefficients.get(int(power), 0) + coeff
    return constant, {k: sp.expand(v.subs(root, sp.sqrt(1 - ecc**2)))
                      for k, v in coefficients.items() if sp.expand(v) != 0}


def mode_fourier_coefficient(l: int, m_index: int, p: int) -> sp.Expr:
    """Coefficient of ``exp(i p l)`` (``l`` the mean anomaly) in a Newtonian mode, in Bessel
    functions.

    Parameters
    ----------
    l, m_index:
        A mass-type mode (``l + m`` even), leading order.
    p:
        The harmonic, any integer.

    Returns
    -------
    sympy.Expr
        ``H_p`` with ``Hhat_lm exp(-i m phi) = sum_p H_p exp(i p l)`` on the ellipse with
        ``a = 1``, ``G m = 1`` (mean motion 1; ``Hhat`` scales as ``(G m/a)``, the
        ``p``-th harmonic oscillates at ``p n``), a combination of ``besselj(p - k, p e)``.

    **Conventions**: ``h_lm = (4 G m nu/(R c^4)) sqrt(pi/5) Hhat_lm exp(-i m phi)``; with
    ``Q = r^l exp(-i m phi) = sum_k q_k exp(i k u)`` and ``Hhat_lm exp(-i m phi) = C
    d^l Q/dt^l``: ``H_p = C (i p)^l sum_k (k/p) q_k J_(p-k)(p e)`` for ``p != 0`` (by parts
    and ``J_n(z) = (1/2 pi) int exp(i (z sin u - n u)) du``), ``H_0 = 0``.

    Example
    -------
    >>> from stfalgebra.binary.keplerian import e
    >>> mode_fourier_coefficient(2, 2, -2).subs(e, 0)
    2

    References
    ----------
    Peters & Mathews, Phys. Rev. 131, 435 (1963) (Bessel expansion of the Keplerian quadrupole);
    derived here from the modes.
    """
    for name, value in (("l", l), ("m", m_index), ("p", p)):
        if isinstance(value, bool) or not isinstance(value, int):
            raise TypeError(f"{name} must be an int, got {value!r}")
    if p == 0:
        return sp.S.Zero
    constant, q = _mode_trig_polynomial(l, m_index)
    ecc = kepler_eccentricity
    total = sum(sp.Rational(k, p) * qk * sp.besselj(p - k, p * ecc) for k, qk in q.items())
    return sp.expand(constant * (sp.I * p) ** l * total)


@lru_cache(maxsize=None)
def _numeric_mode_data(l: int, m_index: int):
    constant, q = _mode_trig_polynomial(l, m_index)
    funcs = {k: sp.lambdify(kepler_eccentricity, v, "mpmath") for k, v in q.items()}
    return complex(constant), funcs


_NEWTONIAN_MODES = ((2, 2), (2, 0), (2, -2))


def harmonic_power(p: int, eccentricity: Any) -> float:
    """Power radiated in the ``p``-th harmonic of the mean motion, Newtonian order.

    Parameters
    ----------
    p:
        Harmonic number ``p >= 1`` (gravitational-wave frequency ``p n``).
    eccentricity:
        ``e`` in [0, 1), a number.

    Returns
    -------
    float
        ``P_p/((32/5)(c^5/G) nu^2 x^5)`` summed over the Newtonian modes (2, +-2), (2, 0),
        both signs of the frequency: ``(1/32) sum_lm p^2 (|H_p|^2 + |H_-p|^2)``.

    **Conventions**: ``x = (G m n/c^3)^(2/3)`` (Newtonian order); the sum over ``p`` is the
    averaged flux (Parseval).

    Example
    -------
    >>> round(harmonic_power(2, 0), 12)
    1.0

    References
    ----------
    Peters & Mathews, Phys. Rev. 131, 435 (1963) (the function g(n, e)); derived here from
    the modes.
    """
    if isinstance(p, bool) or not isinstance(p, int) or p < 1:
        raise ValueError(f"harmonic number must be an int >= 1, got {p!r}")
    ecc = validate_eccentricity(eccentricity)
    if not ecc.is_number:
        raise TypeError(f"eccentricity must be a number, got {eccentricity!r}")
    ev = mpmath.mpf(float(ecc))
    total = mpmath.mpf(0)
    for l, m_index in _NEWTONIAN_MODES:
        constant, funcs = _numeric_mode_data(l, m_index)
        for sign in (1, -1):
            q = sign * p
            value = sum(mpmath.mpf(k) / q * f(ev) * mpmath.besselj(q - k, q * ev)
                        for k, f in funcs.items())
            value = constant * (1j * q) ** l * value
            total += q * q * abs(value) ** 2
    return float(total / 32)


def harmonic_power_sum(eccentricity: Any, tolerance: float = 1e-14, max_harmonic: int = 20000
                       ) -> float:
    """Sum of :func:`harmonic_power` over ``p >= 1`` until the terms fall below ``tolerance``.

    Parameters
    ----------
    eccentricity:
        ``e`` in [0, 1), a number.
    tolerance:
        Stop after the harmonic peak once a term is below ``tolerance`` times the sum.
    max_harmonic:
        Safety limit on ``p``.

    Returns
    -------
    float
        The Newtonian averaged energy flux in units of ``(32/5)(c^5/G) nu^2 x^5``.

    Raises
    ------
    ArithmeticError
        No convergence by ``max_harmonic`` (eccentricities very close to 1).

    **Conventions**: as :func:`harmonic_power`.

    Example
    -------
    >>> round(harmonic_power_sum(0.3), 9)
    1.77624328

    References
    ----------
    Peters & Mathews, Phys. Rev. 131, 435 (1963).
    """
    ecc = validate_eccentricity(eccentricity)
    total = 0.0
    peak = 0.0
    for p in range(1, max_harmonic + 1):
        term = harmonic_power(p, ecc)
        total += term
        peak = max(peak, term)
        if p > 2 and term < tolerance * total and term < peak:
            return total
    raise ArithmeticError(f"harmonic sum did not converge by p = {max_harmonic} at e = {eccentricity}")


# ----------------------------------------------------------------------------- secular evolution
@lru_cache(maxsize=None)
def newtonian_secular_rates() -> tuple[sp.Expr, sp.Expr]:
    """``da/dt`` and ``de/dt`` of the Newtonian orbit under the averaged radiation reaction.

    Returns
    -------
    (sympy.Expr, sympy.Expr)
        ``da/dt`` and ``de/dt`` in ``a, e, G, m, nu, c``, from the balance
        ``d(mu E)/dt = -<F>``, ``d(mu J)/dt = -<dJ_z/dt>`` with ``E = -G m/(2a)``,
        ``J = sqrt(G m a (1 - e^2))`` and the Newtonian averaged fluxes from the modes
        (``x = G m/(c^2 a)``).

    **Conventions**: ``mu = m nu``; the Keplerian ellipse of
    :class:`~stfalgebra.binary.keplerian.KeplerEllipse`.

    Example
    -------
    >>> da, de = newtonian_secular_rates()
    >>> da
    -64*G**3*m**3*nu*(37*e**4/96 + 73*e**2/24 + 1)/(5*a**3*c**5*(1 - e**2)**(7/2))

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (compared in the tests).
    """
    ecc, axis = kepler_eccentricity, semi_major_axis_symbol
    orbit = KeplerEllipse(axis, ecc)
    mu = m * nu
    xv = G * m / (c**2 * axis)
    energy_flux = (sp.Rational(32, 5) * c**5 / G * nu**2 * xv**5
                   * averaged_energy_flux(0).coefficient(0).subs(et, ecc))
    momentum_flux = (sp.Rational(32, 5) * m * c**2 * nu**2 * xv ** sp.Rational(7, 2)
                     * averaged_angular_momentum_flux(0).coefficient(0).subs(et, ecc))
    da, de = sp.symbols("da de")
    equations = [
        sp.diff(mu * orbit.energy, axis) * da + sp.diff(mu * orbit.energy, ecc) * de + energy_flux,
        sp.diff(mu * orbit.angular_momentum, axis) * da
        + sp.diff(mu * orbit.angular_momentum, ecc) * de + momentum_flux,
    ]
    solution = sp.solve(equations, [da, de], dict=True)[0]
    scale = G**3 * m**3 * nu / c**5
    out = []
    for value, power in ((solution[da], 3), (solution[de], 4)):
        unit = scale / axis**power
        shape = sp.cancel(sp.powsimp(sp.expand(value / unit), force=True))
        if shape.has(axis) or shape.has(G) or shape.has(m) or shape.has(c) or shape.has(nu):
            raise ArithmeticError(f"secular rate does not scale as {unit}: {value}")
        content, rest = _newtonian_display(shape)
        out.append((unit * content) * rest)
    return out[0], out[1]


def _newtonian_display(value: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
    """A function of e alone as (K, e^k P(e)/(1 - e^2)^(n/2)) with P(0) = 1."""
    ecc = kepler_eccentricity
    rest = tidy_eccentricity(value, ecc)
    if len(sp.Add.make_args(rest)) != 1:
        return sp.S.One, rest
    num, den = sp.fraction(rest)
    content, prim = sp.factor_terms(sp.expand(num)).as_coeff_Mul()
    # keep the polynomial normalised to 1 at e = 0 where possible
    prim_expanded = sp.expand(prim)
    lead = prim_expanded.subs(ecc, 0)
    if lead != 0 and lead.is_number:
        content, prim_expanded = content * lead, sp.expand(prim_expanded / lead)
    ecc_power = sp.S.One
    if lead == 0:
        # factor out powers of e
        k = min(sp.Poly(prim_expanded, ecc).monoms())[0]
        ecc_power = ecc**k
        prim_expanded = sp.expand(prim_expanded / ecc**k)
        lead0 = prim_expanded.subs(ecc, 0)
        content, prim_expanded = content * lead0, sp.expand(prim_expanded / lead0)
    return content, ecc_power * prim_expanded / den


@lru_cache(maxsize=None)
def newtonian_semi_major_axis_track() -> sp.Expr:
    """The semi-major axis as a function of the eccentricity along the Newtonian evolution.

    Integrates ``d ln a/de = (da/dt)/(a de/dt)`` from :func:`newtonian_secular_rates` by
    partial fractions over the rationals (every factor of the denominator gives a power).

    Returns
    -------
    sympy.Expr
        ``a(e)`` with the integration constant ``c0`` (a symbol).

    Raises
    ------
    ArithmeticError
        If the integral were not a sum of logarithms (it is).

    **Conventions**: ``e`` the Keplerian eccentricity, ``c0`` fixed by the initial condition.

    Example
    -------
    >>> newtonian_semi_major_axis_track()
    c0*e**(12/19)*(121*e**2/304 + 1)**(870/2299)/(1 - e**2)

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (compared in the tests).
    """
    ecc = kepler_eccentricity
    da, de = newtonian_secular_rates()
    rate = sp.cancel(sp.powsimp(da / (semi_major_axis_symbol * de), force=True))
    if rate.has(semi_major_axis_symbol) or rate.has(nu) or rate.has(G):
        raise ArithmeticError(f"d ln a/de depends on more than e: {rate}")
    num, den = sp.fraction(sp.cancel(rate))
    quotient, remainder = sp.div(sp.Poly(num, ecc), sp.Poly(den, ecc))
    if not quotient.is_zero:
        raise ArithmeticError(f"d ln a/de has a polynomial part: {quotient}")
    _, factors = sp.factor_list(den, ecc)
    unknowns = []
    ansatz = sp.S.Zero
    logs = []
    for factor, multiplicity in factors:
        if multiplicity != 1 or sp.degree(factor, ecc) > 2:
            raise ArithmeticError(f"unexpected factor {factor}**{multiplicity} in d ln a/de")
        alpha = sp.Dummy("alpha")
        unknowns.append(alpha)
        ansatz += alpha * sp.diff(factor, ecc) / factor
        logs.append((alpha, factor))
        if sp.degree(factor, ecc) == 2:
            beta = sp.Dummy("beta")
            unknowns.append(beta)
            ansatz += beta / factor
    numerator_eq = sp.Poly(sp.cancel(ansatz * den) - sp.cancel(rate * den), ecc)
    solution = sp.solve(numerator_eq.coeffs(), unknowns, dict=True)
    if len(solution) != 1:
        raise ArithmeticError("partial fractions of d ln a/de failed")
    solution = solution[0]
    for symbol in unknowns:
        if symbol.name == "beta" and solution.get(symbol, 0) != 0:
            raise ArithmeticError("d ln a/de integrates to an arctangent")
    track = sp.Symbol("c0", positive=True)
    powers: dict[sp.Expr, sp.Expr] = {}
    for alpha, factor in logs:
        # |factor| made positive on 0 < e < 1
        sign = 1 if factor.subs(ecc, sp.Rational(1, 2)) > 0 else -1
        base = sp.expand(sign * factor)
        lead = base.subs(ecc, 0)
        base = sp.expand(base / lead) if lead not in (0,) else base
        powers[base] = powers.get(base, 0) + solution[alpha]
    # merge (1 - e)^p (1 + e)^p into (1 - e^2)^p
    one_minus, one_plus = 1 - ecc, 1 + ecc
    if one_minus in powers and one_plus in powers and powers[one_minus] == powers[one_plus]:
        p = powers.pop(one_minus)
        powers.pop(one_plus)
        powers[1 - ecc**2] = p
    for base, p in powers.items():
        track = track * base**p
    return track


@lru_cache(maxsize=None)
def secular_rates(pn: Any = 1) -> tuple[PNSeries, PNSeries]:
    """Secular ``dx/dt`` and ``de_t/dt`` from the balance of energy and angular momentum.

    Parameters
    ----------
    pn:
        0, 1/2 or 1.

    Returns
    -------
    (PNSeries, PNSeries)
        ``(dx/dt)/((c^3/(G m)) nu x^5)`` and ``(de_t/dt)/((c^3/(G m)) nu x^4)``, PN series in
        ``eps = sqrt(x)`` with coefficients in ``et, nu``; known through ``pn``.

    **Conventions**: ``d(mu E)/dt = -<F>``, ``d(mu J)/dt = -<dJ_z/dt>`` with ``E(x, e_t)``,
    ``J(x, e_t)`` of the quasi-Keplerian orbit (:mod:`stfalgebra.binary.keplerian`) and the
    averaged fluxes of this module; harmonic coordinates.

    Example
    -------
    >>> dx, de = secular_rates(0)
    >>> de.coefficient(0)
    (-121*et**3/15 - 304*et/15)/(1 - et**2)**(5/2)

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (Newtonian); Junker & Schafer, Mon. Not. R. Astron.
    Soc. 254, 146 (1992) (1PN); compared in the tests.
    """
    order = _check_order(pn)
    pn_order = 1 if order >= 1 else 0
    elements = quasi_keplerian_from_frequency(pn_order)
    # dimensionless: E/(c^2) = sum x^n eps_n, J c/(G m) = x^(-1/2) sum x^n j_n
    energy = elements.energy.map_coefficients(lambda v: sp.expand(v / c**2))
    momentum = elements.angular_momentum.map_coefficients(lambda v: sp.expand(v * c / (G * m)))
    energy = energy.truncate(1 + order)
    momentum = momentum.truncate(sp.Rational(-1, 2) + order)
    flux_e = averaged_energy_flux(order)
    flux_j = averaged_angular_momentum_flux(order)
    # with G = m = c = 1, mu = nu: nu dE/dt = -(32/5) nu^2 x^5 F, nu dJ/dt = -(32/5) nu^2 x^(7/2) G
    # write dx/dt = nu x^5 X, de/dt = nu x^4 Y and divide by nu x^5 (energy), nu x^(7/2) (J):
    #   x dE/dx X + dE/de x^-1 Y ... as series in sqrt(x):
    e_x = _x_derivative(energy)                 # dE/dx
    e_e = energy.map_coefficients(lambda v: sp.diff(v, et))
    j_x = _x_derivative(momentum)
    j_e = momentum.map_coefficients(lambda v: sp.diff(v, et))
    # equations:  e_x (x^5 X) + e_e (x^4 Y) = -(32/5) x^5 F
    #             j_x (x^5 X) + j_e (x^4 Y) = -(32/5) x^(7/2) G
    # i.e.  e_x X + e_e x^-1 Y = -(32/5) F ;  j_x x^(3/2) X + j_e x^(1/2) Y = -(32/5) G
    a11, a12 = e_x, e_e.shift(-1)
    a21, a22 = j_x.shift(sp.Rational(3, 2)), j_e.shift(_HALF)
    rhs1, rhs2 = flux_e * sp.Rational(-32, 5), flux_j * sp.Rational(-32, 5)
    det = (a11 * a22 - a12 * a21).map_coefficients(lambda v: tidy_eccentricity(v, et))
    x_rate = (rhs1 * a22 - a12 * rhs2) / det
    e_rate = (a11 * rhs2 - a21 * rhs1) / det
    x_rate = x_rate.truncate(order).map_coefficients(lambda v: _collect_nu(tidy_eccentricity(v, et)))
    e_rate = e_rate.truncate(order).map_coefficients(lambda v: _collect_nu(tidy_eccentricity(v, et)))
    return x_rate, e_rate


def _x_derivative(series: PNSeries) -> PNSeries:
    """d/dx of a series in eps = sqrt(x): x^n -> n x^(n-1)."""
    terms = {order - 1: order * coeff for order, coeff in series.terms.items() if order != 0}
    return PNSeries(terms, series.known_through - 1)


@dataclass(frozen=True)
class SecularTrackPoint:
    """One point of a secular evolution: ``x``, ``e_t`` and ``tau = c^3 (t - t_0)/(G m)``."""

    x: float
    et: float
    tau: float

    def to_json(self) -> dict:
        return {"x": self.x, "et": self.et, "tau": self.tau}


@lru_cache(maxsize=None)
def _numeric_rates(order: sp.Rational):
    x_rate, e_rate = secular_rates(order)
    xs = sp.Dummy("x", positive=True)
    x_expr = sum(coeff * xs**k for k, coeff in x_rate.terms.items())
    e_expr = sum(coeff * xs**k for k, coeff in e_rate.terms.items())
    return (sp.lambdify((xs, et, nu), x_expr, "math"), sp.lambdify((xs, et, nu), e_expr, "math"))


def integrate_secular_evolution(x_initial: Any, e_initial: Any, x_final: Any, nu_value: Any,
                                pn: Any = 1, points: int = 11, steps: int = 2000
                                ) -> list[SecularTrackPoint]:
    """Integrate the secular equations ``de_t/dx`` and ``dt/dx`` from ``x_initial`` to ``x_final``.

    Parameters
    ----------
    x_initial, x_final:
        Frequency parameters (> 0); the integration runs in ``ln x`` (either direction).
    e_initial:
        Initial time eccentricity in [0, 1).
    nu_value:
        Symmetric mass ratio in (0, 1/4].
    pn:
        0, 1/2 or 1 (order of :func:`secular_rates`).
    points:
        Number of output points (>= 2), equally spaced in ``ln x``.
    steps:
        Fourth-order Runge-Kutta steps in ``ln x`` between the end points.

    Returns
    -------
    list of SecularTrackPoint
        ``x``, ``e_t`` and ``tau = c^3 (t - t_initial)/(G m)`` at each output point.

    Raises
    ------
    ValueError
        Non-positive ``x``, ``e`` outside [0, 1), ``nu`` outside (0, 1/4], or the eccentricity
        leaving [0, 1) during the integration (backwards towards e = 1).

    **Conventions**: ``de_t/d ln x = (de_t/dt)/(dx/dt) x``, ``dtau/d ln x = x/(dx/dt)``, rates
    from :func:`secular_rates` (the PN series evaluated as truncated polynomials in ``x``).

    Example
    -------
    >>> track = integrate_secular_evolution(0.01, 0.3, 0.02, 0.25, pn=0, points=2)
    >>> round(track[-1].et, 4)
    0.1158

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (Newtonian evolution); common practice (RK4).
    """
    order = _check_order(pn)
    x0 = float(validate_frequency_parameter(x_initial, "x_initial"))
    x1 = float(validate_frequency_parameter(x_final, "x_final"))
    e0 = float(validate_eccentricity(e_initial, "e_initial"))
    nv = float(validate_nu(nu_value))
    if isinstance(points, bool) or not isinstance(points, int) or points < 2:
        raise ValueError(f"points must be an int >= 2, got {points!r}")
    if isinstance(steps, bool) or not isinstance(steps, int) or steps < 1:
        raise ValueError(f"steps must be a positive int, got {steps!r}")
    x_rate, e_rate = _numeric_rates(order)

    def derivatives(log_x: float, ecc: float) -> tuple[float, float]:
        xv = math.exp(log_x)
        if not 0 <= ecc < 1:
            raise ValueError(f"the eccentricity left [0, 1) during the integration (e = {ecc}, "
                             f"x = {xv})")
        xdot = nv * xv**5 * x_rate(xv, ecc, nv)
        edot = nv * xv**4 * e_rate(xv, ecc, nv)
        if xdot <= 0:
            raise ValueError(f"dx/dt = {xdot} is not positive at x = {xv}, e = {ecc}: outside the "
                             f"range where the truncated PN rates make sense")
        return edot * xv / xdot, xv / xdot

    start, stop = math.log(x0), math.log(x1)
    segments = points - 1
    per_segment = max(1, math.ceil(steps / segments))
    h = (stop - start) / (segments * per_segment)
    state_e, state_tau, log_x = e0, 0.0, start
    out = [SecularTrackPoint(x0, e0, 0.0)]
    for _ in range(segments):
        for _ in range(per_segment):
            k1 = derivatives(log_x, state_e)
            k2 = derivatives(log_x + h / 2, state_e + h / 2 * k1[0])
            k3 = derivatives(log_x + h / 2, state_e + h / 2 * k2[0])
            k4 = derivatives(log_x + h, state_e + h * k3[0])
            state_e += h / 6 * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0])
            state_tau += h / 6 * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1])
            log_x += h
        out.append(SecularTrackPoint(math.exp(log_x), max(state_e, 0.0), state_tau))
    return out
