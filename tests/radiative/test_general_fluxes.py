"""Instantaneous general-orbit fluxes summed from the modes."""

from __future__ import annotations

import sympy as sp

from stfalgebra.binary.circular import circular_gamma
from stfalgebra.radiative.general_fluxes import (
    general_orbit_angular_momentum_flux, general_orbit_energy_flux,
)
from stfalgebra.symbols import G, c, m, nu, phidot, r, rdot, x

EPS = sp.Symbol("eps", positive=True)


def _physical(series):
    return G / c**5 * series.to_expression(EPS).subs(EPS, 1 / c)


def test_newtonian_energy_flux_is_the_quadrupole_formula():
    # Peters & Mathews (1963), Phys. Rev. 131, 435 (instantaneous quadrupole flux, textbook form):
    # F = (8/15) G^3 m^2 mu^2 (12 v^2 - 11 rdot^2)/(c^5 r^4)
    v2 = rdot**2 + r**2 * phidot**2
    expected = sp.Rational(8, 15) * G**3 * m**4 * nu**2 * (12 * v2 - 11 * rdot**2) / (c**5 * r**4)
    assert sp.expand(_physical(general_orbit_energy_flux(0)) - expected) == 0


def test_newtonian_angular_momentum_flux():
    # Peters (1964), Phys. Rev. 136, B1224 (from memory): dL/dt = (8/5) G^2 m mu^2 (r^2 phidot)
    # (2 v^2 - 3 rdot^2 + 2 G m/r)/(c^5 r^3)
    v2 = rdot**2 + r**2 * phidot**2
    expected = sp.Rational(8, 5) * G**2 * m**3 * nu**2 * r**2 * phidot * (2 * v2 - 3 * rdot**2 + 2 * G * m / r) / (c**5 * r**3)
    assert sp.expand(_physical(general_orbit_angular_momentum_flux(0)) - expected) == 0


def _on_circular_orbit(expr):
    # rdot = 0, phidot = omega = c^3 x^(3/2)/(G m), r = G m/(c^2 gamma(x)) through 1PN
    e = sp.Symbol("e", positive=True)
    gamma = circular_gamma(1).to_expression(e).subs(e, sp.sqrt(x))
    value = expr.subs(rdot, 0).subs(phidot, c**3 * x**sp.Rational(3, 2) / (G * m)).subs(r, G * m / (c**2 * gamma))
    value = sp.expand(value / (sp.Rational(32, 5) * c**5 / G * nu**2 * x**5))
    return sp.series(value, x, 0, 2).removeO()


def test_circular_limit_of_the_1pn_energy_flux():
    # Wagoner & Will (1976); Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (314)
    got = _on_circular_orbit(_physical(general_orbit_energy_flux(1)))
    assert sp.expand(got - (1 + (-sp.Rational(1247, 336) - sp.Rational(35, 12) * nu) * x)) == 0


def test_energy_equals_omega_times_angular_momentum_flux_on_circular_orbits():
    # F = omega dJ/dt for circular orbits (../shared/conventions.md)
    F = _physical(general_orbit_energy_flux(1))
    J = _physical(general_orbit_angular_momentum_flux(1)) * phidot
    assert sp.expand(_on_circular_orbit(F) - _on_circular_orbit(J)) == 0


def _on_circular_orbit_two_pn(expr):
    # as _on_circular_orbit, with gamma(x) = x (1 + g1 x + g2 x^2) through 2PN (the binary
    # layer's, from the cited 2PN circular frequency); r^k with 1/gamma = (1 - g1 x + (g1^2 - g2)
    # x^2)/x, then every power of x beyond x^2 (relative) dropped
    e = sp.Symbol("e", positive=True)
    gamma = sp.expand(circular_gamma(2).to_expression(e).subs(e, sp.sqrt(x)))
    g1, g2 = gamma.coeff(x, 2), gamma.coeff(x, 3)
    assert sp.expand(gamma - x * (1 + g1 * x + g2 * x**2)) == 0
    inverse = (1 - g1 * x + (g1**2 - g2) * x**2) / x
    gam = sp.Symbol("gam", positive=True)
    value = sp.expand(expr.subs(rdot, 0).subs(phidot, c**3 * x**sp.Rational(3, 2) / (G * m)).subs(r, G * m / (c**2 * gam)))
    value = value.replace(lambda e: e.is_Pow and e.base == gam,
                          lambda e: gamma**e.exp if e.exp > 0 else inverse**(-e.exp))
    value = sp.expand(value.subs(gam, gamma) / (sp.Rational(32, 5) * c**5 / G * nu**2 * x**5))
    return sum(value.coeff(x, k) * x**k for k in range(3))


def test_circular_limit_of_the_two_pn_instantaneous_fluxes():
    # the circular flux through 2PN (Blanchet, Damour, Iyer, Will & Wiseman, Phys. Rev. Lett. 74,
    # 3515 (1995); Blanchet, Living Rev. Relativ. 17, 2 (2014), eq. (314); from memory) minus its
    # only hereditary term through 2PN, the tail's 4 pi x^(3/2) (Poisson 1993; from memory)
    expected = (1 + (-sp.Rational(1247, 336) - sp.Rational(35, 12) * nu) * x
                + (-sp.Rational(44711, 9072) + sp.Rational(9271, 504) * nu + sp.Rational(65, 18) * nu**2) * x**2)
    F = _physical(general_orbit_energy_flux(2, instantaneous_only=True))
    assert sp.expand(_on_circular_orbit_two_pn(F) - expected) == 0
    J = _physical(general_orbit_angular_momentum_flux(2, instantaneous_only=True)) * phidot
    assert sp.expand(_on_circular_orbit_two_pn(J) - expected) == 0     # F = omega dJ/dt


def test_instantaneous_option_changes_nothing_below_the_tail():
    # the tail enters at relative 1.5PN: through 1PN both tables give the same fluxes
    for function in (general_orbit_energy_flux, general_orbit_angular_momentum_flux):
        assert function(1, instantaneous_only=True) == function(1)


def test_complete_general_orbit_fluxes_stop_before_the_tail():
    import pytest

    from stfalgebra.errors import OrderBeyondInputsError

    with pytest.raises(OrderBeyondInputsError):
        general_orbit_energy_flux(sp.Rational(3, 2))
