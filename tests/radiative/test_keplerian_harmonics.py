"""Tests of stfalgebra.radiative.keplerian_harmonics: Bessel decomposition of the Newtonian modes,
power per harmonic, weighted harmonic sums (numbers and exact series)."""

from __future__ import annotations

import cmath
import math

import mpmath
import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import special

from stfalgebra.binary.keplerian import KeplerEllipse, e, u
from stfalgebra.radiative import keplerian_harmonics as harmonics_module
from stfalgebra.radiative.keplerian_harmonics import (
    harmonic_angular_momentum_power,
    harmonic_power,
    harmonic_power_sum,
    keplerian_mode,
    mode_fourier_coefficient,
    weighted_harmonic_series,
    weighted_harmonic_sums,
)
from stfalgebra.symbols import c, delta, m


def _peters_mathews_energy(ecc: float) -> float:
    # Peters & Mathews, Phys. Rev. 131, 435 (1963): f(e) = (1 + 73/24 e^2 + 37/96 e^4)/(1 - e^2)^(7/2)
    return (1 + 73 / 24 * ecc**2 + 37 / 96 * ecc**4) / (1 - ecc**2) ** 3.5


def _peters_angular_momentum(ecc: float) -> float:
    # Peters, Phys. Rev. 136, B1224 (1964): (1 + 7/8 e^2)/(1 - e^2)^2
    return (1 + 7 / 8 * ecc**2) / (1 - ecc**2) ** 2


def _peters_mathews_g(n, ecc):
    # from memory: Peters & Mathews, Phys. Rev. 131, 435 (1963), eq. (20)
    j = lambda k: special.jv(k, n * ecc)  # noqa: E731
    first = j(n - 2) - 2 * ecc * j(n - 1) + 2 / n * j(n) + 2 * ecc * j(n + 1) - j(n + 2)
    second = j(n - 2) - 2 * j(n) + j(n + 2)
    return n**4 / 32 * (first**2 + (1 - ecc**2) * second**2 + 4 / (3 * n**2) * j(n) ** 2)


# ----------------------------------------------------------------------------- symbolic coefficients
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


# ----------------------------------------------------------------------------- per-harmonic power
@pytest.mark.parametrize("ecc", [0.0, 0.2, 0.5, 0.8])
@pytest.mark.parametrize("p", [1, 2, 3, 7])
def test_harmonic_power_is_peters_mathews_g(p, ecc):
    assert harmonic_power(p, ecc) == pytest.approx(_peters_mathews_g(p, ecc), rel=1e-10, abs=1e-15)


def test_circular_orbit_radiates_in_the_second_harmonic_only():
    assert harmonic_power(2, 0) == pytest.approx(1.0, rel=1e-14)
    assert harmonic_angular_momentum_power(2, 0) == pytest.approx(1.0, rel=1e-14)
    for p in (1, 3, 4):
        assert harmonic_power(p, 0) == 0
        assert harmonic_angular_momentum_power(p, 0) == 0


def test_bessel_numbers_against_mpmath():
    """The scipy evaluation of the per-harmonic sums against the symbolic Bessel coefficients
    evaluated with mpmath at 30 digits (negative harmonics through mpmath's own J_nu(-z))."""
    ecc = sp.Rational(7, 10)
    for p in (1, 5, 23):
        energy = angular = sp.S.Zero
        for l, m_index in ((2, 2), (2, 0), (2, -2)):
            for q in (p, -p):
                value = complex(mode_fourier_coefficient(l, m_index, q).subs(e, ecc).evalf(30))
                energy += q * q * abs(value) ** 2 / 32
                angular += -m_index * q * abs(value) ** 2 / 32
        assert harmonic_power(p, 0.7) == pytest.approx(float(energy), rel=1e-12)
        assert harmonic_angular_momentum_power(p, 0.7) == pytest.approx(float(angular), rel=1e-12)


# ----------------------------------------------------------------------------- sums
@pytest.mark.parametrize("ecc", [0.0, 0.1, 0.3, 0.5, 0.7, 0.9, 0.95])
def test_harmonic_sums_are_the_closed_averaged_fluxes(ecc):
    """Newtonian averaged fluxes: the harmonic sums (Parseval) against the closed forms, which
    the toolkit derives by a different route (orbit averages of the mode-summed flux)."""
    sums = weighted_harmonic_sums(ecc)
    assert sums.energy == pytest.approx(_peters_mathews_energy(ecc), rel=1e-12)
    assert sums.angular_momentum == pytest.approx(_peters_angular_momentum(ecc), rel=1e-12)
    assert harmonic_power_sum(ecc) == sums.energy


@pytest.mark.parametrize("ecc", [0.5, 0.9, 0.95])
@pytest.mark.parametrize("tolerance", [1e-10, 1e-13])
def test_truncation_meets_its_tolerance(ecc, tolerance):
    reference = weighted_harmonic_sums(ecc, 1, tolerance=1e-17)
    truncated = weighted_harmonic_sums(ecc, 1, tolerance=tolerance)
    assert truncated.harmonics < reference.harmonics
    assert abs(truncated.energy / reference.energy - 1) < tolerance
    assert abs(truncated.angular_momentum / reference.angular_momentum - 1) < tolerance


def test_harmonic_counts_of_the_default_tolerance():
    # figures quoted in the docstrings (this implementation, tolerance 1e-13, weight 1)
    counts = {ecc: weighted_harmonic_sums(ecc, 1).harmonics for ecc in (0.1, 0.5, 0.9, 0.95)}
    assert counts == {0.1: 11, 0.5: 47, 0.9: 671, 0.95: 1942}


def test_sum_beyond_its_harmonic_budget_is_refused():
    with pytest.raises(ArithmeticError, match="did not converge"):
        weighted_harmonic_sums(0.95, 1, max_harmonic=100)


# ----------------------------------------------------------------------------- exact series
def test_newtonian_series_are_the_closed_forms_expanded():
    """Weight 0: the exact Bessel series must be the Taylor series of Peters-Mathews and Peters
    (Phys. Rev. 131, 435 (1963); Phys. Rev. 136, B1224 (1964))."""
    order = 16
    energy, momentum = weighted_harmonic_series(order)
    closed_e = (1 + sp.Rational(73, 24) * e**2 + sp.Rational(37, 96) * e**4) / (1 - e**2) ** sp.Rational(7, 2)
    closed_j = (1 + sp.Rational(7, 8) * e**2) / (1 - e**2) ** 2
    for series, closed in ((energy, closed_e), (momentum, closed_j)):
        taylor = sp.Poly(sp.series(closed, e, 0, order + 1).removeO(), e).all_coeffs()[::-1]
        taylor += [0] * (order + 1 - len(taylor))
        assert list(series) == taylor


@pytest.mark.parametrize("ecc", [0.05, 0.15])
def test_weighted_series_against_the_numeric_sums(ecc):
    energy, momentum = weighted_harmonic_series(40, 1)
    sums = weighted_harmonic_sums(ecc, 1)
    assert float(sum(cf * sp.Float(ecc, 30) ** k for k, cf in enumerate(energy))) == \
        pytest.approx(sums.energy, rel=1e-12)
    assert float(sum(cf * sp.Float(ecc, 30) ** k for k, cf in enumerate(momentum))) == \
        pytest.approx(sums.angular_momentum, rel=1e-12)


@settings(max_examples=5, deadline=None)
@given(order=st.integers(0, 12), weight=st.integers(0, 2))
def test_lower_orders_are_prefixes_of_higher_ones(order, weight):
    """Every coefficient is complete: truncating a longer series gives the shorter one."""
    short = weighted_harmonic_series(order, weight)
    long = weighted_harmonic_series(order + 6, weight)
    assert short[0] == long[0][: order + 1] and short[1] == long[1][: order + 1]
    assert all(value == 0 for value in short[0][1::2] + short[1][1::2])


def test_bessel_series_against_mpmath():
    # DLMF 10.2.2 (series of J_nu) checked numerically; nu < 0 through J_(-nu) = (-1)^nu J_nu
    for nu in (-3, 0, 2, 5):
        series = harmonics_module._bessel_series(nu, 4, 30)
        value = sum(float(cf) * 0.1 ** k for k, cf in enumerate(series))
        assert value == pytest.approx(float(mpmath.besselj(nu, 0.4)), rel=1e-14)


def test_harmonics_refuse_bad_input():
    with pytest.raises(ValueError, match="harmonic number"):
        harmonic_power(0, 0.1)
    with pytest.raises(ValueError, match="harmonic number"):
        harmonic_angular_momentum_power(True, 0.1)
    with pytest.raises(ValueError, match="eccentricity"):
        harmonic_power(2, 1.0)
    with pytest.raises(TypeError, match="number"):
        weighted_harmonic_sums(e)
    with pytest.raises(ValueError, match="frequency_weight"):
        weighted_harmonic_sums(0.1, -1)
    with pytest.raises(ValueError, match="tolerance"):
        weighted_harmonic_sums(0.1, 0, tolerance=0)
    with pytest.raises(ValueError, match="order"):
        weighted_harmonic_series(-2)
    with pytest.raises(ValueError, match="mass-type"):
        mode_fourier_coefficient(2, 1, 3)
    with pytest.raises(TypeError):
        mode_fourier_coefficient(2, 2, 1.5)
