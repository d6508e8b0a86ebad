"""Secular rates of an eccentric binary from the balance of energy and angular momentum.

The orbit-averaged losses (:mod:`stfalgebra.radiative.eccentric_fluxes`) drive the slow drift
of the orbital elements:

    d(mu E)/dt = -<F>,        d(mu J)/dt = -<dJ_z/dt>,

with ``E`` and ``J`` the conserved energy and angular momentum per unit reduced mass of the
orbit (Keplerian ellipse at Newtonian order: ``da/dt, de/dt``; 1PN quasi-Keplerian orbit in
``x`` and ``e_t``: ``dx/dt, de_t/dt``). The linear system is solved order by order as PN
series; nothing is typed in. At 1.5PN the tails enter through the enhancement functions
``phi(e_t)`` and ``psi(e_t)``, kept as sympy functions
(:mod:`stfalgebra.radiative.tail_enhancement`); ``de_t/dt`` needs both.
"""

from __future__ import annotations

from functools import lru_cache
from typing import Any, Callable

import sympy as sp

from ..binary.keplerian import KeplerEllipse, a as semi_major_axis_symbol, e as kepler_eccentricity
from ..binary.keplerian import quasi_keplerian_from_frequency, tidy_eccentricity
from ..pnseries import PNSeries
from ..symbols import G, c, et, m, nu
from .eccentric_fluxes import (
    ECCENTRIC_MAX_PN,
    averaged_angular_momentum_flux,
    averaged_energy_flux,
    check_eccentric_order,
    collect_in_nu,
)
from .tail_enhancement import AngularMomentumTailEnhancement, EnergyTailEnhancement, tail_enhancement

__all__ = [
    "solve_balance",
    "newtonian_secular_rates",
    "secular_rates",
    "numeric_secular_rates",
    "compile_secular_rates",
]

_HALF = sp.Rational(1, 2)
# below this e_t the numeric rates use the series of the tail terms in e_t
_SMALL_ECCENTRICITY = 0.05
_SMALL_ECCENTRICITY_SERIES_ORDER = 18


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
        content, rest = _normalised_display(shape)
        out.append((unit * content) * rest)
    return out[0], out[1]


def _normalised_display(value: sp.Expr) -> tuple[sp.Expr, sp.Expr]:
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


def _x_derivative(series: PNSeries) -> PNSeries:
    """d/dx of a series in eps = sqrt(x): x^n -> n x^(n-1)."""
    terms = {order - 1: order * coeff for order, coeff in series.terms.items() if order != 0}
    return PNSeries(terms, series.known_through - 1)


def solve_balance(energy: PNSeries, momentum: PNSeries, energy_flux: PNSeries, momentum_flux: PNSeries,
                  order: Any, tidy_determinant: Callable[[sp.Expr], sp.Expr] | None = None
                  ) -> tuple[PNSeries, PNSeries]:
    """The secular rates ``X``, ``Y`` (``dx/dt = nu x^5 X``, ``de_t/dt = nu x^4 Y`` with
    ``G = m = c = 1``) from the balance of energy and angular momentum, through ``order``.

    ``energy`` is ``E/c^2 = sum x^n e_n`` and ``momentum`` is ``J c/(G m) = x^(-1/2) sum x^n j_n``
    (series in ``eps = sqrt(x)`` with coefficients in ``et``); the fluxes are normalised as in
    :func:`~stfalgebra.radiative.eccentric_fluxes.averaged_energy_flux` and
    :func:`~stfalgebra.radiative.eccentric_fluxes.averaged_angular_momentum_flux`. With
    ``mu = nu``, ``nu dE/dt = -(32/5) nu^2 x^5 F`` and ``nu dJ/dt = -(32/5) nu^2 x^(7/2) G``, the
    rates solve the linear system

        e_x X + e_e x^-1 Y = -(32/5) F,   j_x x^(3/2) X + j_e x^(1/2) Y = -(32/5) G

    (Cramer's rule; ``tidy_determinant`` simplifies the determinant's coefficients first). Used
    with and without spins (:mod:`stfalgebra.radiative.spinning_secular_rates`).
    """
    a11, a12 = _x_derivative(energy), energy.map_coefficients(lambda v: sp.diff(v, et)).shift(-1)
    a21 = _x_derivative(momentum).shift(sp.Rational(3, 2))
    a22 = momentum.map_coefficients(lambda v: sp.diff(v, et)).shift(_HALF)
    rhs1, rhs2 = energy_flux * sp.Rational(-32, 5), momentum_flux * sp.Rational(-32, 5)
    det = a11 * a22 - a12 * a21
    if tidy_determinant is not None:
        det = det.map_coefficients(tidy_determinant)
    return ((rhs1 * a22 - a12 * rhs2) / det).truncate(order), ((a11 * rhs2 - a21 * rhs1) / det).truncate(order)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def secular_rates(pn: Any = 1) -> tuple[PNSeries, PNSeries]:
    """Secular ``dx/dt`` and ``de_t/dt`` from the balance of energy and angular momentum.

    Parameters
    ----------
    pn:
        0, 1/2, 1, 3/2 or 2 (up to :data:`~stfalgebra.radiative.eccentric_fluxes.ECCENTRIC_MAX_PN`).

    Returns
    -------
    (PNSeries, PNSeries)
        ``(dx/dt)/((c^3/(G m)) nu x^5)`` and ``(de_t/dt)/((c^3/(G m)) nu x^4)``, PN series in
        ``eps = sqrt(x)`` with coefficients in ``et, nu`` (and from 1.5PN the enhancement
        functions ``phi(et)``, ``psi(et)``); known through ``pn``.

    **Conventions**: ``d(mu E)/dt = -<F>``, ``d(mu J)/dt = -<dJ_z/dt>`` with ``E(x, e_t)``,
    ``J(x, e_t)`` of the quasi-Keplerian orbit (:mod:`stfalgebra.binary.keplerian`) and the
    averaged fluxes of :mod:`stfalgebra.radiative.eccentric_fluxes`; harmonic coordinates.

    Example
    -------
    >>> dx, de = secular_rates(0)
    >>> de.coefficient(0)
    (-121*et**3/15 - 304*et/15)/(1 - et**2)**(5/2)
    >>> secular_rates("3/2")[0].coefficient(sp.Rational(3, 2))
    256*pi*phi(et)/5

    References
    ----------
    Peters, Phys. Rev. 136, B1224 (1964) (Newtonian); Junker & Schafer, Mon. Not. R. Astron.
    Soc. 254, 146 (1992) (1PN); Arun, Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009)
    (1.5PN tails); compared in the tests.
    """
    order = check_eccentric_order(pn)
    if 1 <= order < 2:
        # one derivation serves 1PN and 1.5PN (the lower coefficients of a PN series do not
        # depend on where it is truncated); 2PN needs the 2PN orbit, derived on its own
        x_rate, e_rate = _rates_from_balance(sp.Rational(3, 2))
        return x_rate.truncate(order), e_rate.truncate(order)
    return _rates_from_balance(order)


@lru_cache(maxsize=None)
def _rates_from_balance(order: sp.Rational) -> tuple[PNSeries, PNSeries]:
    """dx/dt and de_t/dt through ``order`` (see :func:`secular_rates`)."""
    pn_order = int(min(order, 2))
    elements = quasi_keplerian_from_frequency(pn_order)
    # dimensionless: E/(c^2) = sum x^n eps_n, J c/(G m) = x^(-1/2) sum x^n j_n
    energy = elements.energy.map_coefficients(lambda v: sp.expand(v / c**2))
    momentum = elements.angular_momentum.map_coefficients(lambda v: sp.expand(v * c / (G * m)))
    energy = energy.truncate(1 + order)
    momentum = momentum.truncate(sp.Rational(-1, 2) + order)
    # the enhancement functions become plain symbols for the algebra and come back at the end
    phi_symbol, psi_symbol = sp.Dummy("phi"), sp.Dummy("psi")
    functions = {EnergyTailEnhancement(et): phi_symbol,
                 AngularMomentumTailEnhancement(et): psi_symbol}
    flux_e = averaged_energy_flux(order).map_coefficients(lambda v: v.xreplace(functions))
    flux_j = averaged_angular_momentum_flux(order).map_coefficients(lambda v: v.xreplace(functions))
    x_raw, e_raw = solve_balance(energy, momentum, flux_e, flux_j, order,
                                 tidy_determinant=lambda v: tidy_eccentricity(v, et))
    back = {symbol: function for function, symbol in functions.items()}

    def tidy(value: sp.Expr) -> sp.Expr:
        parts = sp.collect(sp.expand(value), [phi_symbol, psi_symbol], evaluate=False)
        total = sp.S.Zero
        for factor, coeff in parts.items():
            total += collect_in_nu(tidy_eccentricity(coeff, et)) * factor.xreplace(back)
        # display: the common factor of the tail terms in front
        return sp.factor_terms(total) if len(parts) > 1 or 1 not in parts else total

    return x_raw.map_coefficients(tidy), e_raw.map_coefficients(tidy)


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def numeric_secular_rates(pn: Any = 1) -> tuple[Callable[[float, float, float], float],
                                               Callable[[float, float, float], float]]:
    """:func:`secular_rates` as fast float functions of ``(x, e_t, nu)``.

    Parameters
    ----------
    pn:
        0, 1/2, 1, 3/2 or 2 (up to :data:`~stfalgebra.radiative.eccentric_fluxes.ECCENTRIC_MAX_PN`).

    Returns
    -------
    (callable, callable)
        ``X(x, e_t, nu)`` and ``Y(x, e_t, nu)`` with ``dx/dt = (c^3/(G m)) nu x^5 X`` and
        ``de_t/dt = (c^3/(G m)) nu x^4 Y`` (the PN series evaluated as truncated polynomials in
        ``sqrt(x)``); from 1.5PN the enhancement functions are evaluated by
        :func:`~stfalgebra.radiative.tail_enhancement.tail_enhancement` (once per ``e_t``
        for both functions).

    **Conventions**: as :func:`secular_rates`.

    Example
    -------
    >>> x_rate, e_rate = numeric_secular_rates(0)
    >>> round(x_rate(0.01, 0.0, 0.25), 12)
    12.8

    References
    ----------
    As :func:`secular_rates`.
    """
    order = check_eccentric_order(pn)
    return compile_secular_rates(*secular_rates(order))


def compile_secular_rates(x_series: PNSeries, e_series: PNSeries
                          ) -> tuple[Callable[[float, float, float], float], Callable[[float, float, float], float]]:
    """Float functions ``X(x, e_t, nu)``, ``Y(x, e_t, nu)`` of two rate series (those of
    :func:`secular_rates`, e.g. read back from a cached payload), as in
    :func:`numeric_secular_rates`.

    Example
    -------
    >>> x_rate, _ = compile_secular_rates(*secular_rates(0))
    >>> round(x_rate(0.01, 0.0, 0.25), 12)
    12.8
    """
    xs = sp.Dummy("x", positive=True)
    names = {EnergyTailEnhancement: "tail_phi", AngularMomentumTailEnhancement: "tail_psi"}
    last: dict[float, Any] = {}

    def values(eccentricity: float):
        if eccentricity not in last:
            last.clear()
            last[eccentricity] = tail_enhancement(eccentricity)
        return last[eccentricity]

    functions = {"tail_phi": lambda ecc: values(ecc).energy,
                 "tail_psi": lambda ecc: values(ecc).angular_momentum}

    def numeric_coefficient(coeff: sp.Expr) -> sp.Expr:
        if not coeff.has(EnergyTailEnhancement, AngularMomentumTailEnhancement):
            return coeff
        # de_t/dt at 1.5PN is (sqrt(1 - e^2) psi - (1 - e^2) phi)/e: near e = 0 the difference
        # cancels to O(e^2), so small e_t use the exact series (error below e^18 there)
        small = sp.series(coeff, et, 0, _SMALL_ECCENTRICITY_SERIES_ORDER).removeO()
        named = coeff.replace(lambda e: type(e) in names,
                              lambda e: sp.Function(names[type(e)])(*e.args))
        return sp.Piecewise((small, et < _SMALL_ECCENTRICITY), (named, True))

    def compile_series(series: PNSeries) -> Callable[[float, float, float], float]:
        expr = sum(numeric_coefficient(coeff) * xs**k for k, coeff in series.terms.items())
        return sp.lambdify((xs, et, nu), expr, modules=[functions, "math"])

    return compile_series(x_series), compile_series(e_series)
