"""Tests of stfalgebra/binary/orbit_derivative.py: the engine derivative against sympy.diff
along the same polar equations of motion (an independent route through sympy)."""

from __future__ import annotations

import sympy as sp
from hypothesis import given, settings, strategies as st

from stfalgebra.binary import orbit_derivative
from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
from stfalgebra.exact import ExactPolynomial
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, m, nu, phi, phidot, r, rdot


def _by_sympy_diff(coefficient, pn_order):
    """d/dt by sympy.diff with the polar kinematics written out here (common practice)."""
    from stfalgebra.binary.dynamics import relative_acceleration

    a_n, a_lambda = relative_acceleration(pn_order)
    pieces = {0: sp.diff(coefficient, r) * rdot + sp.diff(coefficient, rdot) * r * phidot**2
              - sp.diff(coefficient, phidot) * 2 * rdot * phidot / r}
    for order, value in a_n.terms.items():
        pieces[order.twice] = pieces.get(order.twice, 0) + sp.diff(coefficient, rdot) * value
    for order, value in a_lambda.terms.items():
        pieces[order.twice] = pieces.get(order.twice, 0) + sp.diff(coefficient, phidot) * value / r
    return {k: sp.expand(v) for k, v in pieces.items()}


@settings(max_examples=15, deadline=None)
@given(st.integers(-4, 4), st.integers(0, 3), st.integers(0, 3), st.integers(-2, 2), st.sampled_from([0, 1]))
def test_engine_derivative_agrees_with_sympy_diff(a, b, k, q, pn_order):
    coefficient = sp.expand((nu + q) * G * m * r**a * rdot**b * phidot**k + r**(a - 1) * rdot)
    engine = dict(orbit_derivative._exact_derivative(ExactPolynomial.from_sympy(coefficient), pn_order))
    reference = _by_sympy_diff(coefficient, pn_order)
    for key in set(engine) | set(reference):
        assert sp.expand(sp.sympify(engine.get(key, 0)) - reference.get(key, 0)) == 0


def test_exact_and_sympy_series_give_the_same_derivative():
    d = OrbitTimeDerivative(1)
    sympy_series = PNSeries({0: r**3 * rdot, 1: G * m * nu * phidot**2 * r**2}, sp.Rational(3, 2))
    exact_series = sympy_series.map_coefficients(ExactPolynomial.from_sympy)
    assert all(isinstance(v, ExactPolynomial) for v in exact_series.terms.values())
    assert d.repeated(exact_series, 3) == d.repeated(sympy_series, 3)


def test_phase_dependence_takes_the_sympy_path():
    out = OrbitTimeDerivative(0)(PNSeries({0: r * sp.cos(phi)}, sp.oo))
    assert sp.expand(out.coefficient(0) - (rdot * sp.cos(phi) - r * sp.sin(phi) * phidot)) == 0
