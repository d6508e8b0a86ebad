"""Tests of stfalgebra.binary.spinning_dynamics: the spinning two-body dynamics (cited point-mass
inputs through 2PN plus the leading spin-orbit inputs of Kidder, Phys. Rev. D 52, 821 (1995),
Sec. II, from memory) conserve E and J = L + S_1 + S_2 along numerically integrated precessing
orbits with the residual falling as c^-5 (the next-to-leading spin-orbit terms, not entered);
aligned spins keep the orbit planar, misaligned ones tilt it; in the exact engine E and L are
conserved along the aligned-spin orbit through relative 3/2."""

from __future__ import annotations

import math
from fractions import Fraction
from functools import lru_cache
from types import SimpleNamespace

import pytest
import sympy as sp

from stfalgebra.binary.spin_orbit_inputs import spin_orbit_acceleration
from stfalgebra.binary.spin_variables import SPIN_ORBIT_ORDER, spin_combinations
from stfalgebra.binary.spinning_dynamics import (
    AlignedSpinOrbitDerivative, aligned_spin_acceleration, aligned_spin_angular_momentum,
    aligned_spin_energy, numeric_spinning_binary,
)
from stfalgebra.exact import ExactPolynomial

_SPEEDS_OF_LIGHT = (16.0, 32.0, 64.0)
_DURATION = 45.0          # about two radial periods of the orbit below


def _initial_state(chi1, chi2):
    # G = m = 1, eccentric orbit starting at r = 1 slightly out of the x-y plane
    return [1.0, 0.0, 0.0, 0.0, 1.25, 0.1, *chi1, *chi2]


@lru_cache(maxsize=None)
def _integrate(speed_of_light: float, chi1: tuple, chi2: tuple, pn_order: int = 2):
    from scipy.integrate import solve_ivp

    binary = numeric_spinning_binary(nu=0.2, c=speed_of_light, pn_order=pn_order)
    solution = solve_ivp(binary.derivatives, (0.0, _DURATION), _initial_state(chi1, chi2), method="DOP853",
                         rtol=1e-13, atol=1e-15, dense_output=True)
    assert solution.success
    samples = [solution.sol(_DURATION * k / 300) for k in range(301)]
    return binary, samples


_PRECESSING = ((0.5, 0.3, 0.6), (-0.4, 0.2, 0.5))


@lru_cache(maxsize=None)
def _residuals(speed_of_light: float) -> dict[str, float]:
    binary, samples = _integrate(speed_of_light, *_PRECESSING)
    energies = [binary.energy(state) for state in samples]
    momenta = [binary.total_angular_momentum(state) for state in samples]
    # the same energy without its spin-orbit term: not conserved at c^-3
    spin_free = [e - speed_of_light**-3 * _spin_orbit_energy(binary, state) for e, state in zip(energies, samples)]
    return {"E": max(abs(e - energies[0]) for e in energies),
            "J": max(math.dist(j, momenta[0]) for j in momenta),
            "E without E_SO": max(abs(e - spin_free[0]) for e in spin_free)}


def _spin_orbit_energy(binary, state) -> float:
    from stfalgebra.binary.spin_orbit_inputs import spin_orbit_energy

    return spin_orbit_energy(binary._namespace(state))[SPIN_ORBIT_ORDER]


@pytest.mark.parametrize("quantity, power", [("E", 5), ("J", 5), ("E without E_SO", 3)])
def test_conservation_residuals_fall_as_expected_when_c_doubles(quantity, power):
    # precessing spins (chi_1 = (0.5, 0.3, 0.6), chi_2 = (-0.4, 0.2, 0.5)), nu = 1/5, 2PN point
    # masses: E and J are constant up to the missing next-to-leading spin-orbit terms, O(c^-5),
    # so the residual falls by about 2^5 per doubling of c (measured for c = 16 -> 32 -> 64:
    # E 37.9, 35.1; J 28.6, 31.6; the departures from 32 are the next order, O(c^-6)). Without
    # its spin-orbit term the energy drifts at c^-3 (ratios 8.18, 8.04): the check sees the
    # spin-orbit terms.
    residuals = [_residuals(c_value)[quantity] for c_value in _SPEEDS_OF_LIGHT]
    ratios = [residuals[i] / residuals[i + 1] for i in range(len(residuals) - 1)]
    for ratio in ratios:
        assert abs(ratio / 2**power - 1) < 0.25, (quantity, residuals, ratios)


def test_aligned_spins_keep_the_orbit_planar_and_the_spins_fixed():
    binary = numeric_spinning_binary(nu=0.2, c=16.0)
    # started in the plane z = 0 (no initial v_z), with spins along e_z
    state0 = [1.0, 0.0, 0.0, 0.0, 1.25, 0.0, 0.0, 0.0, 0.9, 0.0, 0.0, -0.6]
    from scipy.integrate import solve_ivp

    solution = solve_ivp(binary.derivatives, (0.0, _DURATION), state0, method="DOP853", rtol=1e-12, atol=1e-14)
    assert solution.success
    assert all(value == 0.0 for value in solution.y[2]) and all(value == 0.0 for value in solution.y[5])
    assert all(solution.y[8] == 0.9) and all(solution.y[11] == -0.6)


def test_misaligned_spins_tilt_the_orbital_plane():
    # the check above can fail: with precessing spins ell moves (by ~ 5e-7 at c = 16) while |chi_A|
    # stays constant (constant-magnitude spin variables)
    _, samples = _integrate(16.0, *_PRECESSING)

    def unit_normal(state):
        x, v = state[0:3], state[3:6]
        n = (x[1] * v[2] - x[2] * v[1], x[2] * v[0] - x[0] * v[2], x[0] * v[1] - x[1] * v[0])
        size = math.sqrt(sum(a * a for a in n))
        return [a / size for a in n]

    first = unit_normal(samples[0])
    tilts = [math.dist(unit_normal(state), first) for state in samples]
    assert max(tilts) > 1e-7
    for state in samples:
        assert abs(math.hypot(*state[6:9]) - math.hypot(*_PRECESSING[0])) < 1e-11
        assert abs(math.hypot(*state[9:12]) - math.hypot(*_PRECESSING[1])) < 1e-11


def test_aligned_engine_acceleration_is_the_general_formula_on_the_polar_triad():
    # the engine evaluation (vectors on (n, lambda, e_z)) equals the general formula evaluated with
    # sympy vectors at phi = 0, where n = e_x, lambda = e_y
    G, m, nu, delta, r, rdot, phidot = sp.symbols("G m nu delta r rdot phidot")
    chi1, chi2 = sp.symbols("chi1 chi2", real=True)
    x, v = sp.Matrix([r, 0, 0]), sp.Matrix([rdot, r * phidot, 0])
    spin, difference = spin_combinations(sp.Matrix([0, 0, chi1]), sp.Matrix([0, 0, chi2]), delta)
    s = SimpleNamespace(G=G, m=m, nu=nu, delta=delta, r=r, rdot=rdot, q=sp.Rational, x=x, v=v, spin=spin,
                        spin_difference=difference, cross=lambda a, b: a.cross(b), dot=lambda a, b: a.dot(b))
    general = spin_orbit_acceleration(s)[SPIN_ORBIT_ORDER]
    a_n, a_lambda = aligned_spin_acceleration()
    for engine, reference in ((a_n, general[0]), (a_lambda, general[1])):
        assert engine == ExactPolynomial.from_sympy(sp.expand(reference.subs(nu, (1 - delta**2) / 4)))
    assert general[2] == 0


def test_aligned_spin_circular_orbits_exist():
    # the tangential spin-orbit acceleration is proportional to rdot (Kidder 1995 eq. (2.2c), from
    # memory, on the polar triad): rdot = 0 is consistent
    _, a_lambda = aligned_spin_acceleration()
    assert not a_lambda.is_zero()
    assert a_lambda.substitute({"rdot": 0}).is_zero()


@pytest.mark.parametrize("quantity", [aligned_spin_energy, aligned_spin_angular_momentum])
def test_energy_and_orbital_angular_momentum_are_exact_constants_along_the_aligned_orbit(quantity):
    # with aligned spins the spins are constant, so E/mu and L/mu themselves are conserved:
    # d/dt vanishes through relative 3/2 exactly (engine)
    series = quantity(1)
    rate = AlignedSpinOrbitDerivative()(series)
    assert rate.known_through == Fraction(3, 2)
    assert all(value.is_zero() for value in rate.terms.values())
    assert not series.coefficient(Fraction(3, 2)).is_zero()


def test_orbit_derivative_rejects_other_types():
    with pytest.raises(TypeError, match="PNSeries"):
        AlignedSpinOrbitDerivative()(1)


@pytest.mark.parametrize("bad", [dict(nu=0.3), dict(nu=0.0), dict(c=0.0), dict(G=-1.0)])
def test_numeric_binary_rejects_bad_constants(bad):
    with pytest.raises(ValueError):
        numeric_spinning_binary(**bad)
