"""Leading-order memory growth of eccentric binaries (stfalgebra.radiative.eccentric_memory)."""

import numpy as np
import pytest
import sympy as sp
from scipy.integrate import quad

from stfalgebra import symbols as S
from stfalgebra.binary.keplerian import e, u
from stfalgebra.radiative.eccentric_memory import (
    averaged_quadrupole_power, memory_growth_per_orbit, memory_growth_per_x, memory_rate_enhancement,
    peters_mathews_enhancement,
)
from stfalgebra.radiative.modes import derive_mode


def test_the_m_sum_of_the_powers_is_the_peters_mathews_flux():
    # Peters & Mathews, Phys. Rev. 131, 435 (1963), eq. (16) (from memory)
    expected = (1 + sp.Rational(73, 24) * e**2 + sp.Rational(37, 96) * e**4) / (1 - e**2)**sp.Rational(7, 2)
    assert sp.simplify(peters_mathews_enhancement() - expected) == 0


@pytest.mark.parametrize("l", [2, 4])
def test_circular_limit(l):
    assert memory_rate_enhancement(l).subs(e, 0) == 1
    assert memory_growth_per_x(l).subs(e, 0) == 1
    # per orbit on a circle: Hhat_l0 (128 pi/5) nu x^(5/2), from the circular memory mode
    hhat = derive_mode(l, 0, pn=0).hhat
    assert sp.simplify(memory_growth_per_orbit(l).subs(e, 0)
                       - hhat * sp.Rational(128, 5) * sp.pi * S.nu * S.x**sp.Rational(5, 2)) == 0


@pytest.mark.parametrize("m, ecc", [(2, 0.3), (0, 0.6), (-2, 0.5)])
def test_exact_average_matches_quadrature_over_the_orbit(m, ecc):
    # an independent average: the mode differentiated in time numerically along the Kepler orbit
    # (a = G m = 1), integrated over the mean anomaly with scipy
    hhat = derive_mode(2, m, orbit="general", pn=0).hhat.subs({S.m: 1, S.c: 1})
    value = sp.lambdify((S.r, S.rdot, S.phidot), hhat, "numpy")

    def mode_at(mean_anomaly):
        anomaly = mean_anomaly
        for _ in range(60):
            anomaly = mean_anomaly + ecc * np.sin(anomaly)
        w = 1 - ecc * np.cos(anomaly)
        phase = 2 * np.arctan2(np.sqrt(1 + ecc) * np.sin(anomaly / 2), np.sqrt(1 - ecc) * np.cos(anomaly / 2))
        return value(w, ecc * np.sin(anomaly) / w, np.sqrt(1 - ecc**2) / w**2) * np.exp(-1j * m * phase)

    def power(mean_anomaly, step=1e-5):
        derivative = (mode_at(mean_anomaly + step) - mode_at(mean_anomaly - step)) / (2 * step)
        return abs(derivative) ** 2

    numeric = quad(power, 0, 2 * np.pi, limit=200, epsabs=1e-11)[0] / (2 * np.pi)
    exact = float(averaged_quadrupole_power(m).subs(e, ecc))
    assert numeric == pytest.approx(exact, rel=1e-7)


def test_enhancements_grow_with_eccentricity_and_the_growth_per_x_stays_finite():
    for l in (2, 4):
        g = sp.lambdify(e, memory_rate_enhancement(l))
        ratio = sp.lambdify(e, memory_growth_per_x(l))
        assert g(0.1) < g(0.5) < g(0.9)
        # as e -> 1 both the memory rate and the flux blow up as (1 - e^2)^(-7/2): their ratio is finite
        assert np.isfinite(float(sp.limit(memory_growth_per_x(l), e, 1)))
        assert 0.9 < ratio(0.5) < 1.1


def test_only_l_2_and_4_at_leading_order():
    with pytest.raises(ValueError, match="l = 2 and l = 4"):
        memory_rate_enhancement(6)
    with pytest.raises(ValueError, match="m must be"):
        averaged_quadrupole_power(3)
