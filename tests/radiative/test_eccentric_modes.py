"""Tests of stfalgebra.radiative.eccentric_modes: the circular limit (the circular modes of
derive_mode), the orbit average of the energy flux of the modes along the ellipse (Peters &
Mathews 1963), and the numerical harmonic content against the Bessel decomposition of
keplerian_harmonics (the route of the enhancement functions) and its Parseval sum."""

from __future__ import annotations

import numpy as np
import pytest
import sympy as sp

from stfalgebra.binary.keplerian import e, u
from stfalgebra.binary.orbit_averages import orbit_average
from stfalgebra.radiative.eccentric_modes import mode_along_orbit, numeric_mode_harmonics
from stfalgebra.radiative.keplerian_harmonics import harmonic_power_sum, mode_fourier_coefficient
from stfalgebra.radiative.modes import derive_mode
from stfalgebra.symbols import et, x

HALF = sp.Rational(1, 2)


@pytest.mark.parametrize("l, m, pn", [(2, 2, 0), (2, 2, HALF), (2, 1, HALF)])
def test_circular_limit_is_the_circular_mode(l, m, pn):
    mode = mode_along_orbit(l, m, pn)
    circular = derive_mode(l, m, orbit="circular", pn=pn).hhat
    assert sp.simplify(mode.amplitude.subs(et, 0) - circular) == 0
    assert sp.simplify(mode.periodic_phase.subs(et, 0)) == 0


def test_orbit_averaged_flux_of_the_modes_is_peters_mathews():
    # <F>/((32/5) c^5 nu^2 x^5/G) = (1/8) <sum_lm |d(H_lm e^(-i m phi))/dl|^2>, phi = l + W, and
    # d(phi)/dl = dv/dl = sqrt(1 - e^2)/(1 - e cos u)^2 on the Newtonian ellipse
    w = 1 - e * sp.cos(u)
    total = 0
    for m_index in (2, 0, -2):
        amplitude = mode_along_orbit(2, m_index).amplitude.subs(et, e)
        derivative = sp.diff(amplitude, u) / w - sp.I * m_index * sp.sqrt(1 - e**2) / w**2 * amplitude
        total += sp.expand(derivative * sp.conjugate(derivative).subs(sp.conjugate(e), e))
    average = orbit_average(total / 8)
    # Peters & Mathews, Phys. Rev. 131, 435 (1963): f(e) = (1 + 73/24 e^2 + 37/96 e^4)/(1 - e^2)^(7/2)
    f = (1 + sp.Rational(73, 24) * e**2 + sp.Rational(37, 96) * e**4) / (1 - e**2) ** sp.Rational(7, 2)
    assert sp.simplify(average - f) == 0


def test_numerical_harmonics_against_the_bessel_decomposition():
    ecc = 0.5
    for m_index in (2, 0):
        numeric = numeric_mode_harmonics(2, m_index, ecc, 0.01, harmonics=12)
        for p in range(-8, 9):
            # a = 1, G m = 1: Hhat exp(-i m phi) = 2 H exp(-i m W) exp(-i m l): H_(p-m) = 2 c_p
            bessel = complex(sp.N(mode_fourier_coefficient(2, m_index, p - m_index).subs(e, sp.Rational(1, 2)), 20))
            assert abs(2 * numeric[p] - bessel) < 1e-12, (m_index, p)


def test_parseval_sum_of_the_harmonics_is_the_newtonian_flux():
    ecc = 0.6
    total = 0.0
    for m_index, weight in ((2, 2), (0, 1)):        # m = -2 doubles m = 2
        harmonics = numeric_mode_harmonics(2, m_index, ecc, 0.01, harmonics=150)
        total += weight * sum((p - m_index) ** 2 * abs(c) ** 2 for p, c in harmonics.items()) / 8
    assert total == pytest.approx(harmonic_power_sum(ecc), rel=1e-10)


def test_bad_input():
    with pytest.raises(ValueError, match="pn must lie"):
        mode_along_orbit(2, 2, 3)
    with pytest.raises(ValueError, match="l >= 2"):
        mode_along_orbit(2, 3)
    with pytest.raises(TypeError, match="must be an int"):
        mode_along_orbit(2.0, 2)
    with pytest.raises(ValueError, match="harmonics"):
        numeric_mode_harmonics(2, 2, 0.1, 0.01, harmonics=0)
    with pytest.raises(ValueError, match="frequency"):
        numeric_mode_harmonics(2, 2, 0.1, 2.0)
    assert mode_along_orbit(3, 2, HALF).amplitude == 0       # leading at 1PN: beyond the order
