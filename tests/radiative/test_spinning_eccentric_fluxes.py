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


def _integrated_average(x_value: float, e_value: float, nu_value: float, chi: tuple[float, float]) -> float:
    """<F>/((32/5) nu^2 x^5) over one radial period of the spinning equations of motion (G = m = c = 1),
    started at the periastron of the aligned-spin quasi-Keplerian orbit of (x, e_t)."""
    import numpy as np
    from scipy.integrate import solve_ivp

    from stfalgebra.binary.spinning_dynamics import numeric_spinning_binary

    elements = aligned_spin_quasi_keplerian()
    values = {et: e_value, nu: nu_value, delta: math.sqrt(1 - 4 * nu_value), G: 1, m: 1, c: 1, u: 0,
              CHI1: chi[0], CHI2: chi[1]}

    def number(series):
        return sum(float(value.subs(values)) * x_value ** float(order) for order, value in series.terms.items())

    r_peri, phidot_peri = number(elements.radius()), number(elements.angular_velocity())
    binary = numeric_spinning_binary(nu=nu_value, c=1.0, pn_order=1)
    state = [r_peri, 0, 0, 0, r_peri * phidot_peri, 0, 0, 0, chi[0], 0, 0, chi[1]]

    def periastron(_t, y):
        return y[0] * y[3] + y[1] * y[4]
    periastron.direction = 1
    guess = 2 * math.pi / x_value**1.5
    solution = solve_ivp(binary.derivatives, (0, 1.5 * guess), state, method="DOP853", rtol=1e-12, atol=1e-12,
                         events=periastron, dense_output=True)
    period = [t for t in solution.t_events[0] if t > 0.2 * guess][0]
    flux = spinning_general_energy_flux(SO)
    expression = sum(value.subs({G: 1, m: 1, nu: nu_value, delta: values[delta], CHI1: chi[0], CHI2: chi[1]})
                     for value in flux.terms.values())           # c = 1: every order at once
    function = sp.lambdify((r, rdot, phidot), expression, "numpy")
    times = np.linspace(0, period, 4097)[:-1]                    # periodic: the rectangle rule is spectral
    y = solution.sol(times)
    radius = np.hypot(y[0], y[1])
    radial_velocity = (y[0] * y[3] + y[1] * y[4]) / radius
    angular_velocity = (y[0] * y[4] - y[1] * y[3]) / radius**2
    return float(np.mean(function(radius, radial_velocity, angular_velocity))) / (32 / 5 * nu_value**2 * x_value**5)


def test_time_average_along_the_integrated_spinning_orbit():
    # the whole chain by a second route: the spinning equations of motion integrated over one
    # radial period and the instantaneous flux averaged along them; the spin-induced part against
    # x^(3/2) times the spin-orbit coefficient. What is left is the 1PN x spin-orbit cross term
    # (relative O(x)): it must halve with x
    e_value, nu_value, chi = 0.3, 0.2, (0.8, -0.5)
    values = {et: e_value, nu: nu_value, delta: math.sqrt(1 - 4 * nu_value), CHI1: chi[0], CHI2: chi[1]}
    exact = float(_spin_part(spinning_averaged_energy_flux("3/2").coefficient(SO)).subs(values))
    relative = {}
    for x_value in (0.004, 0.002):
        numeric = (_integrated_average(x_value, e_value, nu_value, chi)
                   - _integrated_average(x_value, e_value, nu_value, (0.0, 0.0))) / x_value**1.5
        relative[x_value] = (numeric - exact) / exact
        assert abs(relative[x_value]) < 25 * x_value, (x_value, numeric, exact)
    assert 1.8 < relative[0.004] / relative[0.002] < 2.2, relative
