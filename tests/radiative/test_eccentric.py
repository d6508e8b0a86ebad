"""Tests of stfalgebra.radiative.eccentric: orbit averages, averaged fluxes from the modes,
harmonic decomposition, secular evolution."""

from __future__ import annotations

import cmath
import math
import warnings

import numpy as np
import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st
from scipy import integrate, special

from stfalgebra.binary.keplerian import KeplerEllipse, a, e, u
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.eccentric import (
    averaged_angular_momentum_flux,
    averaged_energy_flux,
    eccentric_flux_payload,
    harmonic_power,
    harmonic_power_sum,
    integrate_secular_evolution,
    keplerian_mode,
    mean_inverse_power,
    mean_power,
    mode_fourier_coefficient,
    newtonian_secular_rates,
    newtonian_semi_major_axis_track,
    orbit_average,
    secular_rates,
)
from stfalgebra.radiative.fluxes import (
    circular_angular_momentum_flux_from_modes,
    circular_energy_flux_from_modes,
)
from stfalgebra.symbols import G, c, delta, et, m, nu, x

ECC = st.floats(0, 0.9)


def _quad_mean(func, ecc):
    with warnings.catch_warnings():
        # integrands odd in u average to an exact zero that quad cannot reach in relative terms
        warnings.simplefilter("ignore", integrate.IntegrationWarning)
        value, _ = integrate.quad(lambda t: func(t, ecc), 0, 2 * math.pi, epsabs=1e-13,
                                  epsrel=1e-13, limit=200)
    return value / (2 * math.pi)


# ----------------------------------------------------------------------------- raw averages
@pytest.mark.parametrize("power", range(1, 9))
def test_mean_inverse_power_is_laplace_legendre_form(power):
    # from memory: Laplace's integral P_n(z) = (1/pi) int_0^pi (z - sqrt(z^2 - 1) cos t)^(-n-1) dt
    s = sp.sqrt(1 - e**2)
    legendre = s ** (-power) * sp.legendre(power - 1, 1 / s)
    assert sp.simplify(mean_inverse_power(power) - legendre) == 0


@settings(max_examples=15, deadline=None)
@given(ecc=ECC, power=st.integers(-6, 9))
@example(ecc=0.0, power=-3)
@example(ecc=0.9, power=9)
def test_mean_power_against_quadrature(ecc, power):
    exact = float(mean_power(power, sp.Float(ecc, 30)) if power != 0 else 1)
    numeric = _quad_mean(lambda t, ev: (1 - ev * math.cos(t)) ** power, ecc)
    assert exact == pytest.approx(numeric, rel=1e-11)


def test_orbit_average_reference_values():
    orbit = KeplerEllipse()
    # common practice (Kepler problem): <r> = a (1 + e^2/2), <1/r> = 1/a, <r^2> = a^2 (1 + 3e^2/2)
    assert sp.simplify(orbit_average(orbit.radius()) - a * (1 + e**2 / 2)) == 0
    assert sp.simplify(orbit_average(1 / orbit.radius()) - 1 / a) == 0
    assert sp.simplify(orbit_average(orbit.radius() ** 2) - a**2 * (1 + 3 * e**2 / 2)) == 0
    assert orbit_average(sp.sin(u) ** 3) == 0
    assert orbit_average(sp.cos(u), 0) == 0
    assert orbit_average(sp.cos(u) ** 2, 0) == sp.Rational(1, 2)


def test_orbit_average_at_a_numeric_eccentricity():
    # regression: a numeric e used to be replaced by a symbol that the integrand did not contain
    half = sp.Rational(1, 2)
    value = orbit_average(1 / (1 - half * sp.cos(u)) ** 3, half)
    assert sp.simplify(value - mean_inverse_power(2, half)) == 0
    symbolic = orbit_average(sp.cos(u) ** 2 / (1 - e * sp.cos(u)))
    assert sp.simplify(orbit_average(sp.cos(u) ** 2 / (1 - half * sp.cos(u)), half)
                       - symbolic.subs(e, half)) == 0


@settings(max_examples=6, deadline=None)
@given(ecc=st.floats(0.01, 0.9), powers=st.tuples(st.integers(0, 3), st.integers(0, 4),
                                                   st.integers(0, 6)))
@example(ecc=0.5, powers=(1, 2, 3))
@example(ecc=0.5, powers=(0, 1, 5))
def test_orbit_average_against_quadrature(ecc, powers):
    j, k, n = powers
    expr = sp.cos(u) ** j * sp.sin(u) ** k / (1 - e * sp.cos(u)) ** n
    exact = float(orbit_average(expr).subs(e, sp.Float(ecc, 30)))
    numeric = _quad_mean(lambda t, ev: math.cos(t) ** j * math.sin(t) ** k
                         * (1 - ev * math.cos(t)) ** (1 - n), ecc)
    assert exact == pytest.approx(numeric, rel=1e-9, abs=1e-12)


def test_averages_refuse_bad_input():
    with pytest.raises(ValueError, match="eccentricity"):
        orbit_average(sp.cos(u), sp.Rational(6, 5))
    with pytest.raises(ValueError, match="power"):
        mean_inverse_power(0)
    with pytest.raises(ValueError, match="not polynomial|Laurent|other than"):
        orbit_average(sp.sqrt(sp.cos(u) + 2))


# ----------------------------------------------------------------------------- averaged fluxes
def test_newtonian_energy_flux_is_peters_mathews():
    # Peters & Mathews, Phys. Rev. 131, 435 (1963): f(e) = (1 + 73/24 e^2 + 37/96 e^4)/(1 - e^2)^(7/2)
    flux = averaged_energy_flux(0)
    expected = (1 + sp.Rational(73, 24) * et**2 + sp.Rational(37, 96) * et**4) / (1 - et**2) ** sp.Rational(7, 2)
    assert flux.known_through == 0
    assert sp.simplify(flux.coefficient(0) - expected) == 0


def test_newtonian_angular_momentum_flux_is_peters():
    # Peters, Phys. Rev. 136, B1224 (1964): (1 + 7/8 e^2)/(1 - e^2)^2
    flux = averaged_angular_momentum_flux(0)
    assert sp.simplify(flux.coefficient(0) - (1 + sp.Rational(7, 8) * et**2) / (1 - et**2) ** 2) == 0


def test_1pn_energy_flux_against_published_enhancement():
    # from memory: Blanchet & Schafer, MNRAS 239, 845 (1989), as restated in x and e_t
    # (harmonic coordinates) by Arun, Blanchet, Iyer & Qusailah, Phys. Rev. D 77, 064035 (2008)
    expected = (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu
                + et**2 * (sp.Rational(10475, 672) - sp.Rational(1081, 36) * nu)
                + et**4 * (sp.Rational(10043, 384) - sp.Rational(311, 12) * nu)
                + et**6 * (sp.Rational(2179, 1792) - sp.Rational(851, 576) * nu)) / (1 - et**2) ** sp.Rational(9, 2)
    flux = averaged_energy_flux(1)
    assert flux.known_through == 1
    assert flux.coefficient(sp.Rational(1, 2)) == 0
    assert sp.simplify(flux.coefficient(1) - expected) == 0


def test_1pn_angular_momentum_flux_against_published_enhancement():
    # from memory: Junker & Schafer, MNRAS 254, 146 (1992), in x and e_t (harmonic coordinates)
    # as restated by Arun, Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009)
    expected = (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu
                + et**2 * (sp.Rational(3019, 336) - sp.Rational(335, 24) * nu)
                + et**4 * (sp.Rational(8399, 2688) - sp.Rational(275, 96) * nu)) / (1 - et**2) ** 3
    assert sp.simplify(averaged_angular_momentum_flux(1).coefficient(1) - expected) == 0


def test_circular_limits_match_the_circular_fluxes():
    # circular results from the modes; published: 1 + (-1247/336 - 35 nu/12) x (Blanchet,
    # Living Rev. Relativ. 17, 2 (2014)), and F = omega dJ/dt
    circular = circular_energy_flux_from_modes(1)
    assert sp.expand(circular.coefficient(1) - (sp.Rational(-1247, 336) - sp.Rational(35, 12) * nu)) == 0
    circular_j = circular_angular_momentum_flux_from_modes(1)
    for order in (0, 1):
        energy = averaged_energy_flux(1).coefficient(order).subs(et, 0)
        momentum = averaged_angular_momentum_flux(1).coefficient(order).subs(et, 0)
        assert sp.expand(energy - circular.coefficient(order)) == 0
        assert sp.expand(momentum - circular_j.coefficient(order)) == 0


def test_flux_orders_beyond_1pn_are_refused():
    with pytest.raises(OrderBeyondInputsError):
        averaged_energy_flux(2)
    with pytest.raises(OrderBeyondInputsError):
        averaged_angular_momentum_flux("3/2")
    with pytest.raises(ValueError, match="pn"):
        averaged_energy_flux(-1)
    with pytest.raises(TypeError):
        averaged_energy_flux(1.0)


def test_flux_payload_strings():
    payload = eccentric_flux_payload(1)
    assert set(payload) == {"energy", "angular_momentum"}
    names = {"x": x, "nu": nu, "et": et}
    energy = sp.sympify(payload["energy"], locals=names)
    assert energy.free_symbols == {x, nu, et}
    expected = averaged_energy_flux(1).coefficient(0) + x * averaged_energy_flux(1).coefficient(1)
    assert sp.simplify(energy - expected) == 0
    momentum = sp.sympify(payload["angular_momentum"], locals=names)
    assert sp.simplify(momentum.subs(x, 0) - (1 + sp.Rational(7, 8) * et**2) / (1 - et**2) ** 2) == 0
    with pytest.raises(OrderBeyondInputsError):
        eccentric_flux_payload(2)


# ----------------------------------------------------------------------------- harmonics
def _peters_mathews_g(n, ecc):
    # from memory: Peters & Mathews, Phys. Rev. 131, 435 (1963), eq. (20)
    j = lambda k: special.jv(k, n * ecc)  # noqa: E731
    first = j(n - 2) - 2 * ecc * j(n - 1) + 2 / n * j(n) + 2 * ecc * j(n + 1) - j(n + 2)
    second = j(n - 2) - 2 * j(n) + j(n + 2)
    return n**4 / 32 * (first**2 + (1 - ecc**2) * second**2 + 4 / (3 * n**2) * j(n) ** 2)


@pytest.mark.parametrize("ecc", [0.0, 0.2, 0.5, 0.8])
@pytest.mark.parametrize("p", [1, 2, 3, 7])
def test_harmonic_power_is_peters_mathews_g(p, ecc):
    assert harmonic_power(p, ecc) == pytest.approx(_peters_mathews_g(p, ecc), rel=1e-10, abs=1e-15)


@pytest.mark.parametrize("ecc", [0.0, 0.1, 0.3, 0.5, 0.7])
def test_harmonic_power_sums_to_the_averaged_flux(ecc):
    total = float(averaged_energy_flux(0).coefficient(0).subs(et, sp.Float(ecc, 30)))
    assert abs(harmonic_power_sum(ecc) - total) < 1e-10 * total


def test_circular_orbit_radiates_in_the_second_harmonic_only():
    assert harmonic_power(2, 0) == pytest.approx(1.0, rel=1e-14)
    assert harmonic_power(1, 0) == 0
    assert harmonic_power(3, 0) == 0


@pytest.mark.parametrize("lm", [(2, 2), (2, 0), (3, 1)])
def test_mode_fourier_coefficients_against_discrete_transform(lm):
    """Bessel coefficients against a direct transform in the mean anomaly (Kepler's equation
    solved by Newton iteration)."""
    l, m_index = lm
    ecc = 0.4
    mode = keplerian_mode(l, m_index, KeplerEllipse(1, sp.Rational(2, 5))).subs(
        {m: 1, c: 1, delta: 1})
    func = sp.lambdify(u, mode, "cmath")
    samples = 256
    values = []
    for j in range(samples):
        mean = 2 * math.pi * j / samples
        anomaly = mean
        for _ in range(50):
            anomaly -= (anomaly - ecc * math.sin(anomaly) - mean) / (1 - ecc * math.cos(anomaly))
        values.append(complex(func(anomaly)))
    transform = np.fft.fft(np.array(values)) / samples
    for p in (-5, -2, -1, 1, 2, 4):
        exact = complex(mode_fourier_coefficient(l, m_index, p).subs(
            {e: sp.Rational(2, 5), c: 1, delta: 1}).evalf(20))
        assert cmath.isclose(exact, transform[p % samples], rel_tol=1e-9, abs_tol=1e-12)
    assert mode_fourier_coefficient(l, m_index, 0) == 0


def test_harmonics_refuse_bad_input():
    with pytest.raises(ValueError, match="harmonic number"):
        harmonic_power(0, 0.1)
    with pytest.raises(ValueError, match="eccentricity"):
        harmonic_power(2, 1.0)
    with pytest.raises(ValueError, match="mass-type"):
        mode_fourier_coefficient(2, 1, 3)
    with pytest.raises(TypeError):
        mode_fourier_coefficient(2, 2, 1.5)


# ----------------------------------------------------------------------------- secular evolution
def test_newtonian_secular_rates_are_peters():
    # Peters, Phys. Rev. 136, B1224 (1964), with m1 m2 (m1 + m2) = nu m^3
    da, de = newtonian_secular_rates()
    peters_da = (-sp.Rational(64, 5) * G**3 * nu * m**3 / (c**5 * a**3 * (1 - e**2) ** sp.Rational(7, 2))
                 * (1 + sp.Rational(73, 24) * e**2 + sp.Rational(37, 96) * e**4))
    peters_de = (-sp.Rational(304, 15) * e * G**3 * nu * m**3 / (c**5 * a**4 * (1 - e**2) ** sp.Rational(5, 2))
                 * (1 + sp.Rational(121, 304) * e**2))
    assert sp.simplify(da - peters_da) == 0
    assert sp.simplify(de - peters_de) == 0


def test_semi_major_axis_track_is_peters():
    # Peters, Phys. Rev. 136, B1224 (1964), eq. (5.11)-ish (from memory):
    # a(e) = c0 e^(12/19)/(1 - e^2) (1 + 121/304 e^2)^(870/2299)
    c0 = sp.Symbol("c0", positive=True)
    peters = c0 * e ** sp.Rational(12, 19) / (1 - e**2) * (1 + sp.Rational(121, 304) * e**2) ** sp.Rational(870, 2299)
    track = newtonian_semi_major_axis_track()
    assert sp.simplify(track / peters) == 1
    # and it solves da/de = (da/dt)/(de/dt)
    da, de = newtonian_secular_rates()
    assert sp.simplify(sp.diff(track, e) - (da / de).subs(a, track)) == 0


def test_eccentricity_drops_threefold_when_the_axis_halves():
    # common practice: at small e, e ~ a^(19/12), so halving a divides e by 2^(19/12) ~ 3
    track = integrate_secular_evolution(0.005, 0.01, 0.01, 0.25, pn=0, points=2, steps=400)
    ratio = track[0].et / track[-1].et
    assert 2.9 < ratio < 3.1
    assert ratio == pytest.approx(2 ** (19 / 12), rel=1e-3)


@pytest.mark.parametrize("e0", [0.1, 0.6])
def test_integrated_track_follows_the_closed_form(e0):
    track = integrate_secular_evolution(0.002, e0, 0.02, 0.1, pn=0, points=3, steps=3000)
    closed = sp.lambdify(e, newtonian_semi_major_axis_track().subs(sp.Symbol("c0", positive=True), 1))
    for point in track[1:]:
        # Newtonian: a = G m/(c^2 x), so a(e)/a(e0) = x0/x
        assert closed(point.et) / closed(e0) == pytest.approx(0.002 / point.x, rel=1e-8)
    assert track[-1].tau > track[1].tau > 0


def test_1pn_secular_rates_circular_limit_and_newtonian_part():
    dx, de = secular_rates(1)
    # Peters (1964) at Newtonian order in x: dx/dt = (64/5) nu x^5 f(e) (c^3/(G m))
    f = (1 + sp.Rational(73, 24) * et**2 + sp.Rational(37, 96) * et**4) / (1 - et**2) ** sp.Rational(7, 2)
    assert sp.simplify(dx.coefficient(0) - sp.Rational(64, 5) * f) == 0
    assert sp.simplify(de.coefficient(0) + sp.Rational(304, 15) * et * (1 + sp.Rational(121, 304) * et**2)
                       / (1 - et**2) ** sp.Rational(5, 2)) == 0
    # circular: dx/dt = (64/5) nu x^5 [1 - (743/336 + 11 nu/4) x] (Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), from memory)
    assert sp.expand(dx.coefficient(1).subs(et, 0)
                     + sp.Rational(64, 5) * (sp.Rational(743, 336) + sp.Rational(11, 4) * nu)) == 0
    assert de.coefficient(1).subs(et, 0) == 0
    # from memory: Junker & Schafer, MNRAS 254, 146 (1992) / Arun et al, Phys. Rev. D 80,
    # 124018 (2009): de_t/dt = -(304/15) nu x^4 e_t [1 + x (-2817/2128 - 1021/228 nu) + ...]
    # at small e_t (only this leading e_t term is recalled)
    small_e = sp.series(de.coefficient(1) / de.coefficient(0).diff(et).subs(et, 0), et, 0, 2).removeO()
    assert sp.expand(small_e - et * (sp.Rational(-2817, 2128) - sp.Rational(1021, 228) * nu)) == 0


def test_1pn_track_is_close_to_newtonian_at_low_frequency():
    newtonian = integrate_secular_evolution(1e-4, 0.5, 2e-4, 0.25, pn=0, points=2, steps=200)
    first = integrate_secular_evolution(1e-4, 0.5, 2e-4, 0.25, pn=1, points=2, steps=200)
    assert abs(first[-1].et - newtonian[-1].et) < 1e-3 * newtonian[-1].et
    assert first[-1].et != newtonian[-1].et


def test_secular_integration_refuses_bad_input():
    with pytest.raises(ValueError, match="x_initial must be positive"):
        integrate_secular_evolution(-0.01, 0.1, 0.02, 0.25)
    with pytest.raises(ValueError, match="e_initial must lie in"):
        integrate_secular_evolution(0.01, 1.0, 0.02, 0.25)
    with pytest.raises(ValueError, match="nu"):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.3)
    with pytest.raises(ValueError, match="points"):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.25, points=1)
    with pytest.raises(OrderBeyondInputsError):
        integrate_secular_evolution(0.01, 0.1, 0.02, 0.25, pn=2)
