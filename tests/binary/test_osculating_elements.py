"""Tests of stfalgebra.binary.osculating_elements: the elements are constant along a numerically
integrated Kepler orbit, and the exact rates under a perturbing force equal the numerical
derivative of the osculating map along the perturbed velocity field (an independent route: the
map's finite differences, not its derivation)."""

from __future__ import annotations

import math

import numpy as np
import pytest
import sympy as sp

from stfalgebra.binary.keplerian import a, e, u
from stfalgebra.binary.orbit_integration import RelativeOrbitModel, cartesian_state, polar_coordinates
from stfalgebra.binary.osculating_elements import ELEMENT_NAMES, element_rates, osculating_elements
from stfalgebra.symbols import G, m, phidot, r, rdot


def _state_from_elements(axis, ecc, anomaly, omega):
    w = 1 - ecc * math.cos(anomaly)
    rho = ecc / (1 + math.sqrt(1 - ecc**2))
    true = anomaly + 2 * math.atan2(rho * math.sin(anomaly), 1 - rho * math.cos(anomaly))
    return cartesian_state(axis * w, axis**-0.5 * ecc * math.sin(anomaly) / w, omega + true,
                           axis**-1.5 * math.sqrt(1 - ecc**2) / w**2)


def test_elements_are_constant_on_a_kepler_orbit():
    model = RelativeOrbitModel(0, 0.25, 10.0)
    start = _state_from_elements(1.3, 0.7, 0.4, -1.1)
    times = np.linspace(0, 20.0, 50)
    elements = osculating_elements(*polar_coordinates(model.integrate(start, 20.0).sol(times)))
    assert np.allclose(elements["semi_major_axis"], 1.3, atol=1e-10)
    assert np.allclose(elements["eccentricity"], 0.7, atol=1e-10)
    assert np.allclose(np.angle(np.exp(1j * (elements["periastron_argument"] + 1.1))), 0, atol=1e-9)
    # the mean anomaly advances at n = a^(-3/2)
    l0 = 0.4 - 0.7 * math.sin(0.4)
    drift = np.angle(np.exp(1j * (elements["mean_anomaly"] - l0 - times * 1.3**-1.5)))
    assert np.allclose(drift, 0, atol=1e-9)


@pytest.mark.parametrize("ecc, anomaly", [(0.3, 0.8), (0.75, -2.4)])
def test_exact_rates_against_the_derivative_of_the_map(ecc, anomaly):
    # a perturbing force with radial and transverse parts (k1, k2 numbers)
    k1, k2 = 0.013, -0.021
    radial = k1 * rdot / r**2
    transverse = k2 * phidot * r + k1 / r**3
    rates = element_rates(sp.nsimplify(radial), sp.nsimplify(transverse))
    axis, omega = 1.7, 0.5
    state = np.array(_state_from_elements(axis, ecc, anomaly, omega))
    radius, velocity, _, angular = polar_coordinates(state)
    big_r = k1 * velocity / radius**2
    big_s = k2 * angular * radius + k1 / radius**3
    n_vec = state[:2] / radius
    l_vec = np.array([-n_vec[1], n_vec[0]])
    accel = -n_vec / radius**2 + big_r * n_vec + big_s * l_vec
    field = np.concatenate([state[2:], accel])
    h = 1e-6

    def elements(x):
        values = osculating_elements(*polar_coordinates(x))
        return np.array([values[name] for name in ELEMENT_NAMES])

    numeric = (elements(state + h * field) - elements(state - h * field)) / (2 * h)
    numeric[3] -= axis**-1.5                      # dl/dt - n
    point = {a: axis, e: ecc, u: anomaly, G: 1, m: 1}
    for index, name in enumerate(ELEMENT_NAMES):
        assert float(rates[name].subs(point)) == pytest.approx(numeric[index], rel=1e-6, abs=1e-9)


def test_bad_input():
    with pytest.raises(ValueError, match="bound"):
        osculating_elements(1.0, 0.0, 0.0, 2.0)
    with pytest.raises(ValueError, match="gravitational_mass"):
        osculating_elements(1.0, 0.0, 0.0, 0.5, gravitational_mass=0.0)
    with pytest.raises(TypeError, match="radial"):
        element_rates("x", 0)
