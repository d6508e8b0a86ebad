"""Tests of stfalgebra.radiative.spinning_eccentric_fluxes: the orbit-averaged fluxes with aligned
spins, exact in e_t, against their circular limit (the circular aligned-spin flux of the project,
x^(3/2) term 4 pi - 4 s_l - (5/4) delta sigma_l: Kidder, Phys. Rev. D 52, 821 (1995); Blanchet,
Living Rev. Relativ. 17, 2 (2014), Sec. 11.3), the non-spinning averages (chi -> 0), and a
numerical time average of the instantaneous flux along the parametrised orbit (scipy quad)."""

from __future__ import annotations

import math

import pytest
import sympy as sp
from scipy.integrate import quad

from stfalgebra.binary.keplerian import u
from stfalgebra.binary.spin_keplerian import aligned_spin_quasi_keplerian
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.radiative.eccentric_fluxes import averaged_angular_momentum_flux, averaged_energy_flux
from stfalgebra.radiative.spinning_eccentric_fluxes import (
    spinning_averaged_angular_momentum_flux, spinning_averaged_energy_flux,
)
from stfalgebra.radiative.spinning_fluxes import spinning_energy_flux_from_modes
from stfalgebra.radiative.spinning_general_fluxes import spinning_general_energy_flux
from stfalgebra.radiative.tail_enhancement import AngularMomentumTailEnhancement, EnergyTailEnhancement
from stfalgebra.symbols import G, c, delta, et, m, nu, phidot, r, rdot

CHI1, CHI2 = ExactPolynomial("chi1").to_sympy(), ExactPolynomial("chi2").to_sympy()
SO = sp.Rational(3, 2)
TAILS = {EnergyTailEnhancement(et): 0, AngularMomentumTailEnhancement(et): 0}


def _spin_part(value):
    return sp.expand(value.xreplace(TAILS))


@pytest.mark.parametrize("spinning, plain", [
    (spinning_averaged_energy_flux, averaged_energy_flux),
    (spinning_averaged_angular_momentum_flux, averaged_angular_momentum_flux),
])
def test_without_spins_it_is_the_non_spinning_average(spinning, plain):
    ours, theirs = spinning("3/2"), plain("3/2")
    for order in (0, 1, SO):
        assert sp.simplify(ours.coefficient(order).subs({CHI1: 0, CHI2: 0}) - theirs.coefficient(order)) == 0
    assert spinning(1) == plain(1)


@pytest.mark.parametrize("spinning", [spinning_averaged_energy_flux, spinning_averaged_angular_momentum_flux])
def test_circular_limit_is_the_circular_aligned_spin_flux(spinning):
    # at e_t = 0 the averages are the circular flux (both normalisations coincide there, F = omega
    # dJ/dt); its x^(3/2) spin term (-4 s_l - 5/4 delta sigma_l), and 4 pi from phi(0) = psi(0) = 1
    circular = spinning_energy_flux_from_modes(SO).coefficient(SO).to_sympy()
    ours = spinning("3/2").coefficient(SO)
    assert sp.expand(_spin_part(ours).subs(et, 0) - (circular - 4 * sp.pi)) == 0
    assert sp.expand(circular.subs({CHI1: 1, CHI2: 0, delta: 1, nu: 0}) - (4 * sp.pi - sp.Rational(11, 4))) == 0


def test_numerical_time_average_along_the_parametrised_orbit():
    # a second route to the average: the instantaneous flux along r(u), rdot(u), phidot(u) of the
    # aligned-spin orbit, time-averaged by quadrature (dt = (1 - e_t cos u) du/n); the spin-induced
    # part, divided by x^(3/2), must be the x^(3/2) coefficient up to a relative O(x)
    x_value, e_value, nu_value, spins = 1e-4, 0.4, 0.15, (0.7, -0.4)
    elements = aligned_spin_quasi_keplerian()
    values = {et: e_value, nu: nu_value, delta: math.sqrt(1 - 4 * nu_value), G: 1, m: 1, c: 1}

    def along_orbit(series, chi):
        terms = [(float(order), coefficient.subs(values).subs({CHI1: chi[0], CHI2: chi[1]}))
                 for order, coefficient in series.terms.items()]
        return sp.Add(*[coefficient * x_value**order for order, coefficient in terms])

    flux = spinning_general_energy_flux(SO)
    inverse_c = sp.Symbol("inverse_c")
    flux_expr = sum(value.subs({G: 1, m: 1}) * inverse_c ** int(2 * order) for order, value in flux.terms.items())

    def averaged(chi):
        orbit = {r: along_orbit(elements.radius(), chi), rdot: along_orbit(elements.radial_velocity(), chi),
                 phidot: along_orbit(elements.angular_velocity(), chi)}
        integrand = sp.lambdify(u, flux_expr.subs(values).subs({CHI1: chi[0], CHI2: chi[1], inverse_c: 1}).subs(orbit)
                                * (1 - e_value * sp.cos(u)), "math")
        return quad(integrand, 0, 2 * math.pi, epsabs=0, epsrel=1e-13, limit=200)[0] / (2 * math.pi)

    normalisation = 32 / 5 * nu_value**2 * x_value**5
    numeric = (averaged(spins) - averaged((0.0, 0.0))) / normalisation / x_value**1.5
    exact = float(_spin_part(spinning_averaged_energy_flux("3/2").coefficient(SO)).subs(values).subs(
        {CHI1: spins[0], CHI2: spins[1]}))
    assert abs(numeric - exact) < 50 * x_value * abs(exact)


def test_orders_beyond_the_spin_orbit_terms_are_refused():
    with pytest.raises(OrderBeyondInputsError):
        spinning_averaged_energy_flux(2)
