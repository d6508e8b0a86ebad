"""Tests of stfalgebra.binary.spin_keplerian: the quasi-Keplerian orbit with aligned spins, derived
from the cited energy and angular momentum, checked by conservation of E and J along the
parametrised orbit (exact), by a numerical integration of the spinning equations of motion
(scipy), by the Lense-Thirring periastron advance of a test mass, by its circular limit against
the circular orbit of binary/spin_circular.py (derived by another route), and by chi -> 0 against
the 1PN quasi-Keplerian orbit of binary/keplerian.py."""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np
import pytest
import sympy as sp
from scipy.integrate import solve_ivp

from stfalgebra.binary.keplerian import quasi_keplerian_from_frequency, u
from stfalgebra.binary.orbit_averages import E_SIN_U, ONE_MINUS_E_COS_U, to_anomaly_variables
from stfalgebra.binary.spin_circular import circular_angular_momentum, circular_energy, spinning_gamma_over_x
from stfalgebra.binary.spin_keplerian import (
    SPIN_ANGULAR_MOMENTUM, aligned_spin_elements_from_energy, aligned_spin_quasi_keplerian,
    aligned_spin_radial_equation,
)
from stfalgebra.binary.spinning_dynamics import (
    aligned_spin_angular_momentum, aligned_spin_energy, numeric_spinning_binary,
)
from stfalgebra.exact import ExactPolynomial
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, c, delta, eps, et, m, nu, phidot, r, rdot

CHI1, CHI2 = ExactPolynomial("chi1").to_sympy(), ExactPolynomial("chi2").to_sympy()
NO_SPINS = {CHI1: 0, CHI2: 0}
SO = sp.Rational(3, 2)
NAMES = ("mean_motion", "semi_major_axis", "radial_eccentricity", "angular_eccentricity", "periastron_advance",
         "energy", "angular_momentum")


def _zero(expr) -> bool:
    return sp.simplify(sp.expand(expr)) == 0


def test_without_spins_the_elements_are_the_1pn_quasi_keplerian_orbit():
    # binary/keplerian.py: Damour & Deruelle (1985), entered from the published E, J forms
    spinning, plain = aligned_spin_quasi_keplerian(), quasi_keplerian_from_frequency(1)
    for name in NAMES:
        ours, theirs = getattr(spinning, name), getattr(plain, name)
        assert ours.known_through == theirs.known_through
        for order in set(ours.terms) | set(theirs.terms):
            assert _zero(ours.coefficient(order).subs(NO_SPINS) - theirs.coefficient(order)), (name, order)


def test_spins_enter_at_relative_three_halves_and_not_in_the_mean_motion_at_fixed_energy():
    elements = aligned_spin_quasi_keplerian()
    newtonian = {"mean_motion": SO, "semi_major_axis": -1, "energy": 1, "angular_momentum": sp.Rational(-1, 2)}
    for name in NAMES:
        series = getattr(elements, name)
        lead = newtonian.get(name, 0)
        for order, value in series.terms.items():
            if order - lead < SO:
                assert not value.has(CHI1, CHI2), (name, order)
    # n(E) has no spin-orbit term (the radial period depends on the energy only at this order)
    n = aligned_spin_elements_from_energy()["mean_motion"]
    assert not n.has(CHI1, CHI2)


def test_test_mass_periastron_advance_is_lense_thirring():
    # a test mass on an equatorial orbit of a Kerr hole with spin chi: the periastron advances by
    # 2 pi k with k_SO = -4 chi (G M/(c^2 p))^(3/2) = -4 chi/(c^3 h^3), h = J/(G M) (Lense-Thirring:
    # d(varpi)/dt = -4 G J_BH/(c^2 a^3 (1 - e^2)^(3/2)), common practice)
    k = aligned_spin_elements_from_energy()["periastron_advance"]
    inverse_c = sp.Symbol("eps_inverse_c", positive=True)
    test_mass = {nu: 0, delta: 1, CHI2: 0}
    assert sp.expand(k.coeff(inverse_c, 3).subs(test_mass)) == -4 * CHI1 / SPIN_ANGULAR_MOMENTUM**3
    # in (x, e_t): -4 chi x^(3/2)/(1 - e_t^2)^(3/2), since h = sqrt(1 - e^2)/sqrt(x) at leading order
    advance = aligned_spin_quasi_keplerian().periastron_advance.coefficient(SO)
    assert _zero(advance.subs(test_mass) + 4 * CHI1 / (1 - et**2) ** sp.Rational(3, 2))


def test_radial_equation_has_the_quasi_keplerian_form():
    radial, angular = aligned_spin_radial_equation()
    inverse_c = sp.Symbol("eps_inverse_c", positive=True)
    assert radial["D"].coeff(inverse_c, 0) == 0 and angular["I"].coeff(inverse_c, 0) == 0
    assert radial["D"].coeff(inverse_c, 3).has(CHI1) and angular["I"].coeff(inverse_c, 3).has(CHI2)


@lru_cache(maxsize=1)
def _orbit_in_anomaly_variables() -> dict:
    """r c^2 x/(G m), rdot/(c sqrt(x)), phidot G m/(c^3 x^(3/2)) along the parametrised orbit."""
    elements = aligned_spin_quasi_keplerian()
    out = {}
    for symbol, series, lead, scale in ((r, elements.radius(), -1, G * m / c**2),
                                        (rdot, elements.radial_velocity(), sp.Rational(1, 2), c),
                                        (phidot, elements.angular_velocity(), SO, c**3 / (G * m))):
        out[symbol] = series.shift(-lead).map_coefficients(
            lambda v, scale=scale: sp.expand(sp.cancel(to_anomaly_variables(sp.expand(v / scale), et, u))))
    return out


def _along_orbit(series: PNSeries, lead: sp.Rational) -> PNSeries:
    """A conserved quantity (engine series in 1/c) on the orbit, divided by its x^lead."""
    unit = series.map_coefficients(lambda v: sp.expand(v.to_sympy().subs({G: 1, m: 1})))
    for symbol, value in _orbit_in_anomaly_variables().items():
        unit = unit.substitute(symbol, value, eps)
    return unit.truncate(SO)


@pytest.mark.parametrize("name, conserved, lead, scale", [
    ("energy", aligned_spin_energy, 1, c**2),
    ("angular_momentum", aligned_spin_angular_momentum, sp.Rational(-1, 2), G * m / c),
])
def test_energy_and_angular_momentum_are_constant_along_the_parametrised_orbit(name, conserved, lead, scale):
    # E(r(u), rdot(u), phidot(u)) must not depend on u and must equal the element E(x, e_t)
    # (exact; zeta^2 = e_t^2 - (1 - w)^2 removes the even powers of e_t sin u)
    values = _along_orbit(conserved(1), lead)
    element = getattr(aligned_spin_quasi_keplerian(), name)
    zeta_squared = et**2 - (1 - ONE_MINUS_E_COS_U) ** 2
    for order in (0, 1, SO):
        value = sp.expand(values.coefficient(order))
        value = sp.expand(value.subs(E_SIN_U**2, zeta_squared))
        expected = element.coefficient(lead + order) / scale
        assert _zero(sp.together(value - expected)), (name, order)


def test_circular_limit_is_the_aligned_spin_circular_orbit():
    # binary/spin_circular.py derives E(x), L(x) and r(x) from the circular radial equation; at
    # e_t = 0 the eccentric elements must reduce to them
    elements = aligned_spin_quasi_keplerian()
    energy = circular_energy()                    # E/(mu c^2), orders 1..5/2
    for order in (1, 2, sp.Rational(5, 2)):
        assert _zero(elements.energy.coefficient(order).subs(et, 0) / c**2 - energy.coefficient(order).to_sympy())
    momentum = circular_angular_momentum()        # L c/(mu G m), orders -1/2..1
    for order in (sp.Rational(-1, 2), sp.Rational(1, 2), 1):
        assert _zero(elements.angular_momentum.coefficient(order).subs(et, 0) * c / (G * m)
                     - momentum.coefficient(order).to_sympy())
    # r = G m/(c^2 x g(x)), g = gamma/x; the circular orbit is r = a_r
    inverse_g = spinning_gamma_over_x().inverse()
    for order in (0, 1, SO):
        assert _zero(elements.semi_major_axis.coefficient(order - 1).subs(et, 0) * c**2 / (G * m)
                     - inverse_g.coefficient(order).to_sympy())
    # and the orbit closes into a circle: e_r = e_phi = 0
    for name in ("radial_eccentricity", "angular_eccentricity"):
        assert all(_zero(value.subs(et, 0)) for value in getattr(elements, name).terms.values())


def _numbers(series: PNSeries, x_value: float, values: dict) -> float:
    total = 0.0
    for order, coefficient in series.terms.items():
        total += float(coefficient.subs(values)) * x_value ** float(order)
    return total


def _measured(x_value: float, e_value: float, nu_value: float, chi: tuple[float, float]) -> dict[str, float]:
    """Radial period, periastron advance and apastron of the integrated orbit started at the
    periastron of the quasi-Keplerian orbit (G = m = c = 1)."""
    elements = aligned_spin_quasi_keplerian()
    values = {et: e_value, nu: nu_value, delta: math.sqrt(1 - 4 * nu_value), CHI1: chi[0], CHI2: chi[1],
              G: 1, m: 1, c: 1, u: 0}
    r_peri = _numbers(elements.radius(), x_value, values)
    phidot_peri = _numbers(elements.angular_velocity(), x_value, values)
    binary = numeric_spinning_binary(nu=nu_value, c=1.0, pn_order=1)
    state = [r_peri, 0, 0, 0, r_peri * phidot_peri, 0, 0, 0, chi[0], 0, 0, chi[1]]

    def periastron(_t, y):
        return y[0] * y[3] + y[1] * y[4]
    periastron.direction = 1
    period_guess = 2 * math.pi / x_value**1.5
    solution = solve_ivp(binary.derivatives, (0, 1.6 * period_guess), state, method="DOP853", rtol=1e-12,
                         atol=1e-12, events=periastron, dense_output=True)
    times = [t for t in solution.t_events[0] if t > 0.2 * period_guess]
    period = times[0]
    end = solution.sol(period)
    angle = math.atan2(end[1], end[0]) % (2 * math.pi)
    grid = np.linspace(0, period, 4001)
    radius = np.hypot(*solution.sol(grid)[:2])
    return {"n": 2 * math.pi / period, "k": angle / (2 * math.pi), "apastron": float(radius.max()),
            "predicted_n": _numbers(elements.mean_motion, x_value, values),
            "predicted_k": _numbers(elements.periastron_advance, x_value, values),
            "predicted_apastron": _numbers(elements.semi_major_axis, x_value, values)
            * (1 + _numbers(elements.radial_eccentricity, x_value, values))}


def test_numerical_integration_of_the_spinning_equations_follows_the_orbit():
    # the spin-induced changes of n, k and the apastron (spinning minus non-spinning run at the
    # same x, e_t) against the representation; what is left is the 1PN x spin-orbit cross term
    # the representation does not keep: a relative O(x), so it halves with x
    residuals = {}
    for x_value in (0.004, 0.002):
        spinning = _measured(x_value, 0.3, 0.2, (0.9, -0.6))
        plain = _measured(x_value, 0.3, 0.2, (0.0, 0.0))
        for key in ("n", "k", "apastron"):
            measured = spinning[key] - plain[key]
            predicted = spinning["predicted_" + key] - plain["predicted_" + key]
            residuals[key, x_value] = (measured - predicted) / predicted
            assert abs(residuals[key, x_value]) < 15 * x_value, (key, x_value, measured, predicted)
    for key in ("k", "apastron"):
        assert 1.6 < residuals[key, 0.004] / residuals[key, 0.002] < 2.4, residuals
