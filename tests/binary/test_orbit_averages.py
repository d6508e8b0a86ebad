"""Tests of stfalgebra.binary.orbit_averages: exact averages over the eccentric anomaly."""

from __future__ import annotations

import math
import warnings

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st
from scipy import integrate

from stfalgebra.binary.keplerian import KeplerEllipse, a, e, u
from stfalgebra.binary.orbit_averages import (
    E_SIN_U,
    ONE_MINUS_E_COS_U,
    average_anomaly_polynomial,
    mean_inverse_power,
    mean_power,
    orbit_average,
    to_anomaly_variables,
)

ECC = st.floats(0, 0.9)


def _quad_mean(func, ecc):
    with warnings.catch_warnings():
        # integrands odd in u average to an exact zero that quad cannot reach in relative terms
        warnings.simplefilter("ignore", integrate.IntegrationWarning)
        value, _ = integrate.quad(lambda t: func(t, ecc), 0, 2 * math.pi, epsabs=1e-13,
                                  epsrel=1e-13, limit=200)
    return value / (2 * math.pi)


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


def test_anomaly_variables_round_trip():
    # zeta^2 = e^2 - (1 - w)^2 is sin^2 + cos^2 = 1 (common practice)
    w, zeta = ONE_MINUS_E_COS_U, E_SIN_U
    assert to_anomaly_variables(e * sp.cos(u), e) == 1 - w
    assert to_anomaly_variables(sp.sin(u), e) == zeta / e
    # the u-average (uniform measure) of sin^2 u is 1/2 and of sin u is 0
    assert average_anomaly_polynomial(zeta**2 / e**2, e) == sp.Rational(1, 2)
    assert average_anomaly_polynomial(zeta * w, e) == 0


def test_averages_refuse_bad_input():
    with pytest.raises(ValueError, match="eccentricity"):
        orbit_average(sp.cos(u), sp.Rational(6, 5))
    with pytest.raises(ValueError, match="power"):
        mean_inverse_power(0)
    with pytest.raises(TypeError, match="power"):
        mean_power(1.5)
    with pytest.raises(ValueError, match="not polynomial|Laurent|other than"):
        orbit_average(sp.sqrt(sp.cos(u) + 2))
    with pytest.raises(ValueError, match="other than"):
        to_anomaly_variables(u * sp.cos(u), e)
    with pytest.raises(ValueError, match="polynomial in e sin u"):
        average_anomaly_polynomial(1 / E_SIN_U, e)
