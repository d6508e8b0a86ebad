"""Tests of stfalgebra.radiative.tail_enhancement: the enhancement functions phi(e_t), psi(e_t) of
the 1.5PN tail in the averaged fluxes (exact series, numbers, sympy functions)."""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np
import pytest
import sympy as sp

from stfalgebra.radiative.fluxes import circular_energy_flux_from_modes
from stfalgebra.radiative.tail_enhancement import (
    AngularMomentumTailEnhancement,
    EnergyTailEnhancement,
    TAIL_FLUX_NORMALISATION,
    tail_enhancement,
    tail_enhancement_series,
    tail_harmonic_weight,
)
from stfalgebra.symbols import et

R = sp.Rational

# from memory: Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993) (first terms of phi) and
# Arun, Blanchet, Iyer & Qusailah, Phys. Rev. D 77, 064034 (2008) (phi through e^8); Arun,
# Blanchet, Iyer & Sinha, Phys. Rev. D 80, 124018 (2009) (psi through e^8). Equation numbers not
# checked: the stored copies of the papers expose only their first pages.
PUBLISHED_PHI = [1, 0, R(2335, 192), 0, R(42955, 768), 0, R(6204647, 36864), 0, R(352891481, 884736)]
PUBLISHED_PSI = [1, 0, R(209, 32), 0, R(2415, 128), 0, R(730751, 18432), 0, R(10355719, 147456)]


def test_published_small_eccentricity_series():
    phi, psi = tail_enhancement_series(8)
    assert sp.Poly(phi, et).all_coeffs()[::-1] == PUBLISHED_PHI
    assert sp.Poly(psi, et).all_coeffs()[::-1] == PUBLISHED_PSI


def test_circular_limit_is_the_circular_tail_term():
    # phi(0) = psi(0) = 1 and 4 pi x^(3/2) is the 1.5PN term of the circular flux derived by
    # the toolkit (Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory: 4 pi x^(3/2))
    assert tail_harmonic_weight() == R(1, 2)
    values = tail_enhancement(0)
    assert values.energy == 1.0 and values.angular_momentum == 1.0
    assert EnergyTailEnhancement(0) == 1 and AngularMomentumTailEnhancement(0) == 1
    circular = circular_energy_flux_from_modes(R(3, 2)).coefficient(R(3, 2))
    assert sp.simplify(circular - TAIL_FLUX_NORMALISATION) == 0


# ----------------------------------------------------------------------------- independent route
@lru_cache(maxsize=None)
def _quadrupole_transform(ecc: float, samples: int = 2048):
    """Fourier coefficients c_p (Q = sum_p c_p exp(i p l)) of the STF quadrupole x^<ij> of the
    Keplerian ellipse a = 1, by an FFT in the mean anomaly l (Kepler's equation by Newton's
    method): no modes, no Bessel functions."""
    mean = 2 * np.pi * np.arange(samples) / samples
    anomaly = mean + ecc * np.sin(mean)
    for _ in range(60):
        anomaly -= (anomaly - ecc * np.sin(anomaly) - mean) / (1 - ecc * np.cos(anomaly))
    x = np.cos(anomaly) - ecc
    y = math.sqrt(1 - ecc**2) * np.sin(anomaly)
    r2 = x * x + y * y
    components = {"xx": x * x - r2 / 3, "xy": x * y, "yy": y * y - r2 / 3, "zz": -r2 / 3}
    coefficients = {key: np.fft.fft(value) / samples for key, value in components.items()}
    p = np.fft.fftfreq(samples, 1 / samples)
    return p, coefficients


def _fluxes_from_quadrupole(ecc: float):
    """Newtonian and tail fluxes from the quadrupole formula, harmonic by harmonic.

    With G = m = c = a = 1 (n = x = 1) and I_ij = nu x^<ij>: <F> = (1/5) sum_p p^6 |c_p|^2_ij
    and <dJ_z/dt> = (2/5) eps_zjk <I^(2)_ja I^(3)_ka> = (2/5) sum_p (-i p^5) eps_zjk c_ja conj(c_ka)
    (Thorne, Rev. Mod. Phys. 52, 299 (1980), eqs. (4.16'), (4.22'), from memory); the tail raises
    the amplitude of each Fourier component by 1 + pi G M |omega|/c^3 (Blanchet & Schafer 1993,
    from memory), i.e. its power by 1 + 2 pi |p| x^(3/2).
    """
    p, cf = _quadrupole_transform(ecc)
    squared = (np.abs(cf["xx"]) ** 2 + 2 * np.abs(cf["xy"]) ** 2 + np.abs(cf["yy"]) ** 2
               + np.abs(cf["zz"]) ** 2)
    # eps_zjk c_ja conj(c_ka) = c_xa conj(c_ya) - c_ya conj(c_xa), a = x, y
    cross = cf["xx"] * np.conj(cf["xy"]) + cf["xy"] * np.conj(cf["yy"])
    torque = (-1j * p**5 * (cross - np.conj(cross))).real
    energy = np.sum(p**6 * squared) / 5
    momentum = 2 * np.sum(torque) / 5
    energy_tail = np.sum(2 * np.pi * np.abs(p) * p**6 * squared) / 5
    momentum_tail = 2 * np.sum(2 * np.pi * np.abs(p) * torque) / 5
    norm = 32 / 5
    return energy / norm, momentum / norm, energy_tail / (norm * 4 * np.pi), momentum_tail / (norm * 4 * np.pi)


@pytest.mark.parametrize("ecc", [0.0, 0.3, 0.7, 0.9])
def test_against_a_numerical_fourier_decomposition_of_the_quadrupole(ecc):
    energy, momentum, phi, psi = _fluxes_from_quadrupole(ecc)
    # the route itself reproduces the Newtonian closed forms (Peters & Mathews 1963; Peters 1964)
    assert energy == pytest.approx((1 + 73 / 24 * ecc**2 + 37 / 96 * ecc**4) / (1 - ecc**2) ** 3.5, rel=1e-11)
    assert momentum == pytest.approx((1 + 7 / 8 * ecc**2) / (1 - ecc**2) ** 2, rel=1e-11)
    values = tail_enhancement(ecc)
    assert values.energy == pytest.approx(phi, rel=1e-10)
    assert values.angular_momentum == pytest.approx(psi, rel=1e-10)


# ----------------------------------------------------------------------------- series and numbers
@pytest.mark.parametrize("ecc", [0.02, 0.1, 0.2])
def test_series_agree_with_the_numbers_at_small_eccentricity(ecc):
    phi, psi = tail_enhancement_series(40)
    values = tail_enhancement(ecc)
    point = {et: sp.Float(ecc, 40)}
    assert float(phi.subs(point)) == pytest.approx(values.energy, rel=1e-12)
    assert float(psi.subs(point)) == pytest.approx(values.angular_momentum, rel=1e-12)


def test_values_pinned():
    # figures of this implementation (harmonic sums, checked above against an independent route)
    values = tail_enhancement(0.5)
    assert (values.energy, values.angular_momentum) == pytest.approx((13.125938881376, 4.876617025371), rel=1e-12)
    assert [tail_enhancement(ecc).harmonics for ecc in (0.5, 0.9, 0.95)] == [47, 671, 1942]


def test_enhancement_grows_with_eccentricity():
    values = [tail_enhancement(ecc) for ecc in np.linspace(0, 0.95, 12)]
    assert all(b.energy > a_.energy and b.angular_momentum > a_.angular_momentum
               for a_, b in zip(values, values[1:]))


# ----------------------------------------------------------------------------- sympy functions
def test_functions_print_evaluate_and_expand():
    phi, psi = EnergyTailEnhancement(et), AngularMomentumTailEnhancement(et)
    assert sp.sstr(4 * sp.pi * phi) == "4*pi*phi(et)" and str(psi) == "psi(et)"
    assert sp.latex(phi) == r"\varphi\left(et\right)"
    assert phi.is_positive and psi.is_real
    half = R(1, 2)
    assert float(EnergyTailEnhancement(half).evalf()) == pytest.approx(tail_enhancement(0.5).energy, rel=1e-14)
    expansion = sp.series(psi / (1 - et**2), et, 0, 5).removeO()
    assert sp.expand(expansion - (1 + (R(209, 32) + 1) * et**2 + (R(2415, 128) + R(209, 32) + 1) * et**4)) == 0
    assert phi.subs(et, 0) == 1
    # a float argument evaluates, as sympy's own functions do; an exact one stays
    assert float(AngularMomentumTailEnhancement(0.5)) == pytest.approx(tail_enhancement(0.5).angular_momentum, rel=1e-14)
    assert isinstance(EnergyTailEnhancement(half), EnergyTailEnhancement)


def test_bad_input_is_refused():
    with pytest.raises(ValueError, match="0.95"):
        tail_enhancement(0.96)
    with pytest.raises(ValueError, match="e_t"):
        tail_enhancement(-0.1)
    with pytest.raises(TypeError, match="number"):
        tail_enhancement(et)
    with pytest.raises(ValueError, match="even"):
        tail_enhancement_series(3)
    with pytest.raises(ValueError, match="even"):
        tail_enhancement_series(2.0)
    with pytest.raises(ValueError, match="0 <= e_t < 1"):
        EnergyTailEnhancement(2)
    with pytest.raises(ValueError, match="0.95"):
        EnergyTailEnhancement(R(97, 100)).evalf()
