"""Tests of stfalgebra.binary.spin_orbit_inputs: the cited spin-orbit acceleration, precession,
energy and angular momentum (Kidder, Phys. Rev. D 52, 821 (1995), Sec. II; Blanchet, Living Rev.
Relativ. 17, 2 (2014), Sec. 11.2; entered from memory) conserve E and J = L + S_1 + S_2 exactly
at spin-orbit order for spins of any direction (an identity in chi_1, chi_2, delta at
exact rational positions and velocities), and a wrong coefficient is caught. The numerical conservation along
integrated orbits is in tests/binary/test_spinning_dynamics.py; the circular and test-mass
checks in tests/binary/test_spin_circular.py."""

from __future__ import annotations

from fractions import Fraction
from functools import lru_cache
from types import SimpleNamespace

import pytest
import sympy as sp

from stfalgebra.binary import spin_orbit_inputs
from stfalgebra.binary.spin_orbit_inputs import (
    SPIN_ORBIT_INPUTS, exchanged_bodies, precession_frequencies, spin_orbit_acceleration,
    spin_orbit_angular_momentum, spin_orbit_energy,
)
from stfalgebra.binary.spin_variables import individual_spins, spin_combinations

SO = Fraction(3, 2)
_G, _m, _c = sp.symbols("G m c", positive=True)
_nu, _delta = sp.symbols("nu delta", real=True)
_X = sp.Matrix(sp.symbols("x1:4", real=True))
_V = sp.Matrix(sp.symbols("v1:4", real=True))
_CHI1 = sp.Matrix(sp.symbols("a1:4", real=True))
_CHI2 = sp.Matrix(sp.symbols("b1:4", real=True))
_R = sp.Symbol("R", positive=True)    # |x|, differentiated through dR/dx_i = x_i/R
# positions with rational |x| (Pythagorean quadruples) and velocities: at each such point the
# residuals are exact polynomials in chi_1, chi_2, nu, delta, which must vanish identically
_POINTS = (((2, 3, 6), (Fraction(1, 3), Fraction(-1, 2), Fraction(1, 5))),
           ((1, 4, 8), (Fraction(-2, 7), Fraction(1, 4), Fraction(3, 11))),
           ((-4, 4, 7), (Fraction(1, 2), Fraction(1, 9), Fraction(-1, 6))))


def _namespace(x=_X, v=_V, chi1=_CHI1, chi2=_CHI2, delta=_delta):
    r = _R
    spin, difference = spin_combinations(chi1, chi2, delta)
    return SimpleNamespace(G=_G, m=_m, nu=_nu, delta=delta, r=r, rdot=x.dot(v) / r, q=sp.Rational,
                           x=x, v=v, spin=spin, spin_difference=difference,
                           cross=lambda a, b: a.cross(b), dot=lambda a, b: a.dot(b))


def _time_derivative(quantity, acceleration, chi1_rate, chi2_rate, moving=True):
    """d/dt along x' = v (if ``moving``), v' = acceleration, chi_A' = chi_A rate (chain rule)."""
    total = 0
    radial = sp.diff(quantity, _R)
    for i in range(3):
        total += ((sp.diff(quantity, _X[i]) + radial * _X[i] / _R) * _V[i] * int(moving)
                  + sp.diff(quantity, _V[i]) * acceleration[i]
                  + sp.diff(quantity, _CHI1[i]) * chi1_rate[i] + sp.diff(quantity, _CHI2[i]) * chi2_rate[i])
    return total


def _at_positions(expression):
    """The expression at each exact point (x, v), expanded, with nu = (1 - delta^2)/4 and
    G = m = 1 (the residuals are homogeneous in G and m)."""
    values = []
    for position, velocity in _POINTS:
        point = {**dict(zip(_X, map(sp.Integer, position))), **dict(zip(_V, map(sp.Rational, velocity))),
                 _nu: (1 - _delta**2) / 4, _G: 1, _m: 1, _R: sp.sqrt(sum(sp.Integer(a)**2 for a in position))}
        values.append(sp.expand(expression.xreplace(point)))
    return values


@lru_cache(maxsize=None)
def _rates(scale_acceleration=1):
    """The Newtonian acceleration plus the spin-orbit one (as the coefficient of eps = 1/c^3 in
    a bookkeeping series), and the spin precession rates (coefficient of 1/c^2)."""
    s = _namespace()
    newtonian = -_G * _m * _X / s.r**3
    spin_orbit = spin_orbit_acceleration(s)[SO] * scale_acceleration
    omega1, omega2 = precession_frequencies(s)
    return s, newtonian, spin_orbit, omega1.cross(_CHI1), omega2.cross(_CHI2)


def _energy_residual(scale_acceleration=1):
    s, newtonian, spin_orbit, _, _ = _rates(scale_acceleration)
    zero = sp.zeros(3, 1)
    newtonian_energy = _V.dot(_V) / 2 - _G * _m / s.r
    # order c^-3 of dE/dt: the Newtonian energy along a_SO plus E_SO along the Newtonian orbit
    # (the spins precess at c^-2, which moves E_SO only at c^-5)
    return (_time_derivative(newtonian_energy, spin_orbit, zero, zero, moving=False)
            + _time_derivative(spin_orbit_energy(s)[SO], newtonian, zero, zero))


def test_energy_is_conserved_at_spin_orbit_order_for_any_spin_directions():
    # Kidder 1995 eqs. (2.2c), (2.7) (from memory): dE/dt vanishes identically at O(c^-3)
    assert all(value == 0 for value in _at_positions(_energy_residual()))


def test_wrong_spin_orbit_coefficient_is_caught_by_energy_conservation():
    # the identity above can fail: a 10 % error in the acceleration leaves a residual
    assert any(value != 0 for value in _at_positions(_energy_residual(Fraction(11, 10))))


def test_total_angular_momentum_is_conserved_at_spin_orbit_order():
    # J/mu = x cross v + L_SO/c^3 + (G m/(c nu)) s: at O(c^-3) the orbital torque of a_SO,
    # the change of L_SO along the Newtonian orbit and the precession of the spins cancel
    # (Kidder 1995 eqs. (2.2c), (2.4), (2.9c), from memory)
    s, newtonian, spin_orbit, chi1_rate, chi2_rate = _rates()
    zero = sp.zeros(3, 1)
    orbital_torque = _X.cross(spin_orbit)
    spin_orbit_change = [_time_derivative(component, newtonian, zero, zero)
                         for component in spin_orbit_angular_momentum(s)[SO]]
    spin_rate, _ = spin_combinations(chi1_rate, chi2_rate, _delta)
    for i in range(3):
        # times nu: the spins enter J/mu as (G m/(c nu)) s
        residual = _nu * (orbital_torque[i] + spin_orbit_change[i]) + _G * _m * spin_rate[i]
        assert all(value == 0 for value in _at_positions(residual)), i


def test_wrong_precession_is_caught_by_angular_momentum_conservation():
    s, newtonian, spin_orbit, chi1_rate, chi2_rate = _rates()
    zero = sp.zeros(3, 1)
    orbital_torque = _X.cross(spin_orbit)
    spin_orbit_change = [_time_derivative(component, newtonian, zero, zero)
                         for component in spin_orbit_angular_momentum(s)[SO]]
    # body 1 turned with body 2's frequency: J is no longer conserved
    omega2 = precession_frequencies(s)[1]
    spin_rate, _ = spin_combinations(omega2.cross(_CHI1), chi2_rate, _delta)
    residual = _nu * (orbital_torque[2] + spin_orbit_change[2]) + _G * _m * spin_rate[2]
    assert any(value != 0 for value in _at_positions(residual))


def test_spin_magnitudes_are_constant():
    # constant-magnitude spin variables: chi_A . dchi_A/dt = 0 identically
    _, _, _, chi1_rate, chi2_rate = _rates()
    assert sp.expand(_CHI1.dot(chi1_rate)) == 0
    assert sp.expand(_CHI2.dot(chi2_rate)) == 0


def test_precession_of_body_two_from_exchange_matches_direct_formula():
    # Kidder 1995 eq. (2.4) (from memory): Omega_2 = (G/(c^2 r^3)) (2 + 3 m_1/(2 m_2)) L_N
    s = _namespace()
    omega2 = precession_frequencies(s)[1]
    x1 = (1 + _delta) / 2
    x2 = (1 - _delta) / 2
    expected = _G * _m * _nu * (2 + sp.Rational(3, 2) * x1 / x2) * _X.cross(_V) / s.r**3
    assert all(value.applyfunc(sp.cancel) == sp.zeros(3, 1) for value in _at_positions(omega2 - expected))


def test_exchange_maps_individual_spins():
    # exchanging the bodies swaps chi_1 and chi_2: sigma changes sign, s does not
    spin, difference = spin_combinations(_CHI1, _CHI2, _delta)
    spin_swapped, difference_swapped = spin_combinations(_CHI2, _CHI1, -_delta)
    assert sp.expand(spin - spin_swapped) == sp.zeros(3, 1)
    assert sp.expand(difference + difference_swapped) == sp.zeros(3, 1)
    s1, s2 = individual_spins(spin, difference, _delta, (1 - _delta**2) / 4)
    x1, x2 = (1 + _delta) / 2, (1 - _delta) / 2
    assert sp.expand(s1 - x1**2 * _CHI1) == sp.zeros(3, 1)
    assert sp.expand(s2 - x2**2 * _CHI2) == sp.zeros(3, 1)
    assert exchanged_bodies(SimpleNamespace(delta=1, x=2)).x == -2


def test_table_lists_every_input_with_source_and_checks():
    public = {name for name in spin_orbit_inputs.__all__ if name.startswith("spin_")}
    assert {row.name for row in SPIN_ORBIT_INPUTS} == public
    for row in SPIN_ORBIT_INPUTS:
        assert getattr(spin_orbit_inputs, row.name) is row.function
        assert "Kidder, Phys. Rev. D 52, 821 (1995)" in row.source and "from memory" in row.source
        assert row.quantity and row.checked_by


@pytest.mark.parametrize("function", [row.function for row in SPIN_ORBIT_INPUTS])
def test_inputs_evaluate_with_exact_rationals_and_floats(function):
    # the same formula on Fractions (via TriadVector) and on floats (numpy) agrees
    import numpy as np

    from stfalgebra.binary.triad_vectors import TriadVector, cross, dot

    x, v = (Fraction(2), Fraction(3), Fraction(6)), (Fraction(1, 3), Fraction(-1, 2), Fraction(1, 5))
    chi1, chi2 = (Fraction(1, 2), 0, Fraction(1, 3)), (0, Fraction(-2, 3), Fraction(1, 4))
    delta = Fraction(1, 3)

    def namespace(vector, product, dotted, number):
        spin, difference = spin_combinations(vector(chi1), vector(chi2), number(delta))
        return SimpleNamespace(G=number(1), m=number(1), nu=number(Fraction(2, 9)), delta=number(delta),
                               r=number(7), rdot=number(Fraction(2 * 1, 3 * 7) - Fraction(3, 14) + Fraction(6, 35)),
                               q=lambda a, b: number(Fraction(a, b)), x=vector(x), v=vector(v), spin=spin,
                               spin_difference=difference, cross=product, dot=dotted)

    exact = function(namespace(lambda c: TriadVector(*c), cross, dot, Fraction))
    numeric = function(namespace(lambda c: np.array([float(a) for a in c]), np.cross, np.dot, float))
    assert set(exact) == set(numeric)
    for order, value in exact.items():
        components = value.components if isinstance(value, TriadVector) else (value,)
        assert np.allclose([float(a) for a in components], np.atleast_1d(numeric[order]), rtol=1e-13)
