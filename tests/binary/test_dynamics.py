"""Tests of stfalgebra.binary.dynamics: conserved E and J along the 1PN equations of motion
check the acceleration independently."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra.binary import dynamics
from stfalgebra.binary.dynamics import (
    OrbitTimeDerivative,
    check_pn_order,
    conserved_angular_momentum,
    conserved_energy,
    relative_acceleration,
)
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, m, nu, phi, phidot, r, rdot


@pytest.fixture(autouse=True)
def _clear():
    dynamics.clear_caches()
    yield
    dynamics.clear_caches()


def test_newtonian_acceleration():
    a_n, a_lambda = relative_acceleration(0)
    assert a_n == PNSeries({0: -G * m / r**2}, sp.Rational(1, 2))
    assert a_lambda.orders == ()


def test_1pn_acceleration_circular_limit():
    # circular orbit: a_n at rdot = 0 is -(G m/r^2)[1 + ((1 + 3 nu) r^2 phidot^2 -
    # 2 (2 + nu) G m/r)/c^2] (from memory, Blanchet 2014 Living Review)
    a_n, a_lambda = relative_acceleration(1)
    value = a_n.coefficient(1).subs(rdot, 0)
    expected = -G * m / r**2 * ((1 + 3 * nu) * r**2 * phidot**2 - 2 * (2 + nu) * G * m / r)
    assert sp.expand(value - expected) == 0
    assert a_lambda.coefficient(1).subs(rdot, 0) == 0


@pytest.mark.parametrize("bad", [3, 4])
def test_beyond_order_refused(bad):
    with pytest.raises(OrderBeyondInputsError, match=str(bad)):
        relative_acceleration(bad)
    with pytest.raises(OrderBeyondInputsError):
        OrbitTimeDerivative(bad)


@pytest.mark.parametrize("bad", [-1])
def test_negative_order_value_error(bad):
    with pytest.raises(ValueError, match="-1"):
        check_pn_order(bad)


@pytest.mark.parametrize("bad", [1.0, True, "1"])
def test_order_type_error(bad):
    with pytest.raises(TypeError):
        relative_acceleration(bad)


@pytest.mark.parametrize("pn_order", [0, 1, 2])
def test_energy_conserved(pn_order):
    d = OrbitTimeDerivative(pn_order)
    de = d(conserved_energy(pn_order)).expand()
    assert de.orders == ()
    assert de.known_through == pn_order + sp.Rational(1, 2)


@pytest.mark.parametrize("pn_order", [0, 1, 2])
def test_angular_momentum_conserved(pn_order):
    d = OrbitTimeDerivative(pn_order)
    dj = d(conserved_angular_momentum(pn_order)).expand()
    assert dj.orders == ()
    assert dj.known_through == pn_order + sp.Rational(1, 2)


def test_wrong_acceleration_would_be_caught():
    # regression guard for the checks above: the Newtonian EOM does not conserve the 1PN energy
    de = OrbitTimeDerivative(0)(conserved_energy(1))
    assert de.known_through == sp.Rational(1, 2)
    with pytest.raises(OrderBeyondInputsError):
        de.coefficient(1)
    # and with a tampered 1PN coefficient the derivative is non-zero
    tampered = conserved_energy(1) + PNSeries({1: G * m * rdot**2 / r}, sp.Rational(3, 2))
    assert OrbitTimeDerivative(1)(tampered).expand().orders != ()


def test_kinematics():
    d = OrbitTimeDerivative(1)
    assert d(PNSeries({0: r}, sp.oo)) == PNSeries({0: rdot}, sp.oo)
    assert d(PNSeries({0: phi}, sp.oo)) == PNSeries({0: phidot}, sp.oo)
    a_n, a_lambda = relative_acceleration(1)
    drdot = d(PNSeries({0: rdot}, sp.oo)).expand()
    assert drdot == (PNSeries({0: r * phidot**2}, sp.oo) + a_n).expand()
    dphidot = d(PNSeries({0: phidot}, sp.oo)).expand()
    assert dphidot == (PNSeries({0: -2 * rdot * phidot / r}, sp.oo)
                       + a_lambda.map_coefficients(lambda e: e / r)).expand()


def test_constants_have_zero_derivative():
    d = OrbitTimeDerivative(1)
    assert d(PNSeries({0: G * m * nu}, sp.oo)) == PNSeries({}, sp.oo)


def test_known_through_bookkeeping():
    d = OrbitTimeDerivative(1)
    # input known through 1 with leading order 0: min(1, 0 + 3/2) = 1
    assert d(PNSeries({0: rdot, 1: r}, 1)).known_through == 1
    # leading order -1: unknown EOM terms beyond 3/2 enter at -1 + 3/2 = 1/2
    assert d(PNSeries({-1: rdot}, sp.oo)).known_through == sp.Rational(1, 2)
    # vanishing through 1: first possible term at 3/2
    assert d(PNSeries({}, 1)).known_through == 1
    # a leading coefficient in r only does not feel the acceleration: the bound comes from
    # the first coefficient with rdot or phidot (order 1 + 3/2)
    assert d(PNSeries({0: r, 1: rdot}, sp.oo)).known_through == sp.Rational(5, 2)
    assert d(PNSeries({0: r}, sp.oo)).known_through is sp.oo


def test_derivative_refuses_non_series():
    with pytest.raises(TypeError):
        OrbitTimeDerivative(0)(r)


def test_repeated_and_cache():
    d = OrbitTimeDerivative(1)
    s = PNSeries({0: r**3 * phidot}, sp.oo)
    two = d.repeated(s, 2)
    assert two == d(d(s))
    assert d(s) is d(s)
    assert d.repeated(s, 0) == s
    with pytest.raises(ValueError):
        d.repeated(s, -1)


@settings(max_examples=10, deadline=None)
@given(st.integers(-3, 3), st.integers(0, 3), st.integers(0, 3))
def test_leibniz_rule(a, b, k):
    # d(fg) = f dg + g df on monomials (a property of any derivation)
    d = OrbitTimeDerivative(1)
    f = PNSeries({0: r**a * rdot**b}, sp.oo)
    g = PNSeries({0: phidot**k * r}, sp.oo)
    left = d(f * g).expand()
    right = (f * d(g) + g * d(f)).expand()
    assert left == right


def test_twelve_derivatives_fast():
    import time
    d = OrbitTimeDerivative(1)
    s = PNSeries({0: r**12, 1: r**12 * (rdot**2 + G * m / r)}, sp.Rational(3, 2))
    start = time.perf_counter()
    d.repeated(s, 14)
    assert time.perf_counter() - start < 30


@settings(max_examples=15, deadline=None)
@given(st.integers(-4, 4), st.integers(0, 3), st.integers(0, 3), st.integers(-2, 2))
def test_polynomial_path_agrees_with_generic_path(a, b, k, q):
    # the fast polynomial derivative and the sympy.diff one give the same expanded pieces
    coeff = sp.expand((nu + q) * G * m * r**a * rdot**b * phidot**k + r**(a - 1) * rdot)
    fast = dynamics._poly_derivative(coeff, 1)
    slow = dynamics._generic_derivative(coeff, 1)
    assert fast is not None
    for key in set(fast) | set(slow):
        assert sp.expand(fast.get(key, 0) - slow.get(key, 0)) == 0


def test_generic_path_for_roots_and_phase():
    d = OrbitTimeDerivative(0)
    out = d(PNSeries({0: sp.sqrt(r) * sp.cos(phi)}, sp.oo))
    expected = rdot * sp.cos(phi) / (2 * sp.sqrt(r)) - sp.sqrt(r) * sp.sin(phi) * phidot
    assert sp.expand(out.coefficient(0) - expected) == 0
