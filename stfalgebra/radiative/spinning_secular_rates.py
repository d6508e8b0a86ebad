"""Secular rates of an eccentric binary with aligned spins, from the balance of energy and angular momentum.

The same balance as :mod:`stfalgebra.radiative.secular_rates`,

    d(mu E)/dt = -<F>,        d(mu J)/dt = -<dJ_z/dt>,

with ``E(x, e_t)`` and ``J(x, e_t)`` (the orbital angular momentum with its spin-orbit term; the
spins are constant for aligned spins, so the loss of the total ``J_z`` is the loss of ``J``) of
the quasi-Keplerian orbit with the spin-orbit terms (:mod:`stfalgebra.binary.spin_keplerian`)
and the averaged fluxes with spins (:mod:`stfalgebra.radiative.spinning_eccentric_fluxes`),
solved order by order as PN series; the spin-orbit terms enter at ``x^(3/2)``.

**Conventions**: :mod:`stfalgebra.binary.spin_variables`; harmonic coordinates; rates normalised
as in :func:`~stfalgebra.radiative.secular_rates.secular_rates`.
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Any, Callable

import sympy as sp

from ..binary.keplerian import tidy_eccentricity
from ..binary.spin_keplerian import aligned_spin_quasi_keplerian
from ..exact import ExactPolynomial
from ..orders import PNOrder
from ..pnseries import PNSeries
from ..symbols import G, c, delta, et, m, nu
from .eccentric_fluxes import collect_in_nu
from .secular_rates import numeric_secular_rates, secular_rates, solve_balance
from .spinning_eccentric_fluxes import (
    SPINNING_ECCENTRIC_MAX_PN, check_spinning_eccentric_order, spinning_averaged_angular_momentum_flux,
    spinning_averaged_energy_flux,
)
from .tail_enhancement import AngularMomentumTailEnhancement, EnergyTailEnhancement

__all__ = ["spinning_secular_rates", "numeric_spinning_secular_rates", "validate_spin_component"]

_HALF = sp.Rational(1, 2)
_SPIN_ORDER = PNOrder(3, 2)


def _spin_symbols() -> tuple[sp.Symbol, sp.Symbol]:
    return ExactPolynomial("chi1").to_sympy(), ExactPolynomial("chi2").to_sympy()


def validate_spin_component(value: Any, name: str = "chi") -> float:
    """A dimensionless aligned spin component ``chi_A``: a real number in [-1, 1].

    Example
    -------
    >>> validate_spin_component(0.5)
    0.5
    >>> validate_spin_component(2, "chi1")
    Traceback (most recent call last):
    ...
    ValueError: chi1 must lie in [-1, 1] (|chi_A| <= 1 for black holes), got 2
    """
    if isinstance(value, bool) or not isinstance(value, (int, float, sp.Rational)):
        raise TypeError(f"{name} must be a real number, got {value!r}")
    number = float(value)
    if not (math.isfinite(number) and -1 <= number <= 1):
        raise ValueError(f"{name} must lie in [-1, 1] (|chi_A| <= 1 for black holes), got {value!r}")
    return number


@lru_cache(maxsize=None)
def _rates_from_balance(order: PNOrder) -> tuple[PNSeries, PNSeries]:
    elements = aligned_spin_quasi_keplerian()
    rational = sp.Rational(order.numerator, order.denominator)
    energy = elements.energy.map_coefficients(lambda v: sp.expand(v / c**2)).truncate(1 + rational)
    momentum = elements.angular_momentum.map_coefficients(lambda v: sp.expand(v * c / (G * m)))
    momentum = momentum.truncate(-_HALF + rational)
    phi_symbol, psi_symbol = sp.Dummy("phi"), sp.Dummy("psi")
    functions = {EnergyTailEnhancement(et): phi_symbol, AngularMomentumTailEnhancement(et): psi_symbol}
    flux_e = spinning_averaged_energy_flux(order).map_coefficients(lambda v: v.xreplace(functions))
    flux_j = spinning_averaged_angular_momentum_flux(order).map_coefficients(lambda v: v.xreplace(functions))
    x_raw, e_raw = solve_balance(energy, momentum, flux_e, flux_j, rational)   # secular_rates.py
    # below x^(3/2), and the tail part at x^(3/2), the rates are the non-spinning ones (no spin
    # term enters there): take them in their tidy form and tidy only the spin-orbit coefficients
    plain = secular_rates(rational)
    chi1, chi2 = _spin_symbols()

    def combine(raw: PNSeries, reference: PNSeries) -> PNSeries:
        terms = {order: reference.coefficient(order) for order in reference.terms if order < _SPIN_ORDER}
        if order_reached(raw):
            value = sp.expand(raw.coefficient(_SPIN_ORDER))
            spin = sp.S.Zero
            for symbol in (chi1, chi2):
                part = value.coeff(symbol)
                if part.has(phi_symbol, psi_symbol):
                    raise ArithmeticError("a spin-orbit term carries a tail enhancement function")
                spin += symbol * collect_in_nu(tidy_eccentricity(part, et))
            rest = sp.expand(value - value.coeff(chi1) * chi1 - value.coeff(chi2) * chi2).xreplace(back)
            tail = reference.coefficient(_SPIN_ORDER)
            if rest.has(chi1, chi2) or sp.simplify(rest - tail) != 0:
                raise ArithmeticError("the non-spinning part of the x^(3/2) rate is not the non-spinning rate")
            terms[_SPIN_ORDER] = tail + spin
        return PNSeries(terms, rational)

    def order_reached(raw: PNSeries) -> bool:
        return raw.known_through >= _SPIN_ORDER

    back = {symbol: function for function, symbol in functions.items()}
    return combine(x_raw, plain[0]), combine(e_raw, plain[1])


@lru_cache(maxsize=None, typed=True)   # typed: pn=True or 1.0 must reach the validation, not 1's entry
def spinning_secular_rates(pn: Any = "3/2") -> tuple[PNSeries, PNSeries]:
    """Secular ``dx/dt`` and ``de_t/dt`` of an eccentric binary with aligned spins.

    Parameters
    ----------
    pn:
        0, 1/2, 1 or 3/2.

    Returns
    -------
    (PNSeries, PNSeries)
        ``(dx/dt)/((c^3/(G m)) nu x^5)`` and ``(de_t/dt)/((c^3/(G m)) nu x^4)`` in
        ``eps = sqrt(x)``, coefficients in ``et``, nu, delta, chi1, chi2 (and ``phi(et)``,
        ``psi(et)`` at 3/2); known through ``pn``.

    **Conventions**: module docstring.

    Example
    -------
    >>> x_rate, e_rate = spinning_secular_rates("3/2")
    >>> chi1, chi2 = _spin_symbols()
    >>> sp.factor(x_rate.coefficient(sp.Rational(3, 2)).subs({et: 0, chi2: 0, delta: 1, nu: 0}))
    -16*(113*chi1 - 48*pi)/15

    References
    ----------
    Derived here; the circular limit is ``dx/dt = (64/5) nu x^5 [... + x^(3/2) (4 pi - 47/3 s_l
    - 25/4 delta sigma_l)]`` (Kidder, Phys. Rev. D 52, 821 (1995); Blanchet, Living Rev. Relativ.
    17, 2 (2014), Sec. 11.3; tested against the circular rate of the project).
    """
    order = check_spinning_eccentric_order(pn)
    if order >= 1:
        x_rate, e_rate = _rates_from_balance(SPINNING_ECCENTRIC_MAX_PN)
        rational = sp.Rational(order.numerator, order.denominator)
        return x_rate.truncate(rational), e_rate.truncate(rational)
    return _rates_from_balance(order)


@lru_cache(maxsize=64)
def numeric_spinning_secular_rates(pn: Any, chi1: float, chi2: float
                                   ) -> tuple[Callable[[float, float, float], float],
                                              Callable[[float, float, float], float]]:
    """:func:`spinning_secular_rates` as float functions of ``(x, e_t, nu)`` at given spins.

    Parameters
    ----------
    pn:
        0, 1/2, 1 or 3/2.
    chi1, chi2:
        The aligned spin components, each in [-1, 1].

    Returns
    -------
    (callable, callable)
        ``X(x, e_t, nu)``, ``Y(x, e_t, nu)`` as in
        :func:`~stfalgebra.radiative.secular_rates.numeric_secular_rates`: the non-spinning rates
        plus the spin-orbit term ``x^(3/2) (chi1 X_1 + chi2 X_2)`` (linear in the spins), with
        ``delta = +sqrt(1 - 4 nu)`` (body 1 the heavier).

    **Conventions**: module docstring; ``m1 >= m2``.

    Example
    -------
    >>> x_rate, _ = numeric_spinning_secular_rates("3/2", 0.0, 0.0)
    >>> x_plain, _ = numeric_secular_rates(sp.Rational(3, 2))
    >>> x_rate(0.01, 0.2, 0.2) == x_plain(0.01, 0.2, 0.2)
    True
    """
    order = check_spinning_eccentric_order(pn)
    first, second = validate_spin_component(chi1, "chi1"), validate_spin_component(chi2, "chi2")
    rational = sp.Rational(order.numerator, order.denominator)
    plain_x, plain_e = numeric_secular_rates(rational)
    if order < _SPIN_ORDER or (first == 0 and second == 0):
        return plain_x, plain_e
    x_series, e_series = spinning_secular_rates(order)
    symbols = _spin_symbols()
    xs = sp.Dummy("x", positive=True)

    def spin_part(series: PNSeries) -> Callable[[float, float, float], float]:
        coefficient = series.coefficient(_SPIN_ORDER)
        linear = sp.expand(coefficient - coefficient.subs({symbols[0]: 0, symbols[1]: 0}))
        if linear.has(EnergyTailEnhancement, AngularMomentumTailEnhancement):
            raise ArithmeticError("the spin-orbit part of a rate carries a tail enhancement function")
        value = linear.subs({symbols[0]: first, symbols[1]: second, delta: sp.sqrt(1 - 4 * nu)})
        return sp.lambdify((xs, et, nu), value * xs ** sp.Rational(3, 2), modules="math")

    spin_x, spin_e = spin_part(x_series), spin_part(e_series)

    def x_rate(x: float, e: float, nu_value: float) -> float:
        return plain_x(x, e, nu_value) + spin_x(x, e, nu_value)

    def e_rate(x: float, e: float, nu_value: float) -> float:
        return plain_e(x, e, nu_value) + spin_e(x, e, nu_value)

    return x_rate, e_rate
