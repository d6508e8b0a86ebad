"""Checks of stfalgebra/moments/orbit_polynomials.py: the ring derivative along the orbit against
the project's OrbitTensor derivative (orbit_tensor.differentiate_along_orbit) and the binary layer's
OrbitTimeDerivative, and the conversion to OrbitTensor."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.dynamics import OrbitTimeDerivative
from stfalgebra.moments import orbit_polynomials as op
from stfalgebra.moments.orbit_tensor import differentiate_along_orbit as derivative_along_orbit
from stfalgebra.symbols import eps as EPS
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

KX, KV = op.KX, op.KV


@pytest.mark.parametrize("pn_order", [0, 1])
def test_orbit_derivative_matches_the_orbit_tensor_derivative(pn_order):
    # reference: OrbitTensor.time_derivative through orbit_tensor.differentiate_along_orbit (its own
    # alpha_x, alpha_v from the polar acceleration)
    expression = (nu * r**3 * rdot * KX**2 * KV + G * m * delta / r * KX * KV**2
                  + EPS**2 * (r**2 * phidot**2 - G * m / r) * KX**3)
    polynomial = op.from_expression(expression)
    known = sp.Rational(3, 2)
    derivative = op.truncate(op.time_derivative(op.time_derivative(polynomial, pn_order), pn_order), 2)
    expected = derivative_along_orbit(op.to_tensor(3, polynomial, known), pn_order, times=2)
    got = op.to_tensor(3, derivative, known)
    for key in set(got.terms) | set(expected.terms):
        for order in range(pn_order + 1):  # the Newtonian derivative fixes order 0 only
            a = got.terms[key].coefficient(order) if key in got.terms else 0
            b = expected.terms[key].coefficient(order) if key in expected.terms else 0
            assert sp.expand(a - b) == 0, (key, order)


def test_scalar_derivative_matches_the_binary_layer():
    # reference: OrbitTimeDerivative(2) on a scalar series (no probe scalars)
    scalar = r**2 * rdot * phidot + G * m / r + EPS**4 * r * phidot**2
    got = op.truncate(op.time_derivative(op.from_expression(scalar), 2), 4)
    expected = OrbitTimeDerivative(2)(PNSeries.from_expression(scalar, EPS, sp.Rational(5, 2)))
    got_series = op.to_tensor(0, got, sp.Rational(5, 2)).terms[(0, 0, 0)]
    for order in (0, 1, 2):
        assert sp.expand(got_series.coefficient(order) - expected.coefficient(order)) == 0


def test_round_trip_and_bad_degree():
    expression = G * m / r * KX * KV + r**2 * KX**2
    tensor = op.to_tensor(2, op.from_expression(expression), 1)
    assert tensor.terms[(1, 1, 0)].coefficient(0) == G * m / r
    with pytest.raises(AssertionError):
        op.to_tensor(3, op.from_expression(expression), 1)


@pytest.mark.parametrize("exponent", [0, 1, 2, 5, 8])
def test_truncated_power_equals_the_truncated_full_power(exponent):
    # reference: the full power by the ring, truncated afterwards
    f = op.from_expression((1 + EPS**2 * G * m / r + EPS**4 * nu * rdot**2) * KX + EPS**2 * r * KV)
    for order in (0, 2, 4):
        assert op.truncated_power(f, exponent, order) == op.truncate(f**exponent, order)
