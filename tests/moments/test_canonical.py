"""Tests of stfalgebra/moments/canonical.py: the two-body gauge moment W and M_ij - I_ij."""

from __future__ import annotations

import sympy as sp

from stfalgebra.binary.orbit_derivative import OrbitTimeDerivative
from stfalgebra.exact import engine_symbols
from stfalgebra.moments.canonical import canonical_quadrupole_correction, gauge_moment_w
from stfalgebra.pnseries import PNSeries


def test_gauge_moment_is_the_body_sum_with_newtonian_positions():
    # (1/3) sum_A m_A y_A.v_A with y_1 = X_2 x, y_2 = -X_1 x and m_1 m_2/m = nu m: nu m r rdot/3
    # (common practice: Newtonian centre-of-mass relations)
    s = engine_symbols()
    assert gauge_moment_w().coefficient(0) == s.nu * s.m * s.r * s.rdot / 3


def test_canonical_correction_vanishes_on_a_circle_and_not_on_an_ellipse():
    # W = nu m r rdot/3 and all its derivatives vanish along a circular Newtonian orbit
    s = engine_symbols()
    moment = PNSeries._from_trusted({0: s.nu * s.m * s.r**2 / 4}, 1)      # the (2,2) channel of I_ij
    correction = canonical_quadrupole_correction(moment, OrbitTimeDerivative(0), -2 * s.I * s.phidot)
    value = correction.coefficient(sp.Rational(5, 2))
    on_circle = value.substitute({"rdot": 0}).to_sympy()
    from stfalgebra.symbols import G, m, phidot, r

    assert sp.expand(on_circle.subs(G, phidot**2 * r**3 / m)) == 0            # Kepler's law
    assert not value.substitute({"rdot": 1}).is_zero()


def test_w_part_of_every_canonical_correction_vanishes_on_the_circle():
    # the W-terms W^(2) X_L - W^(1) X_L^(1) of M_L - I_L (and the J_ij^(1) W^(1) of S_ij) need only
    # W^(1), W^(2), at Newtonian order (the whole correction is already O(c^-5)): both vanish on
    # the circle (rdot = 0 and Kepler's law), so that part is zero for every l
    from stfalgebra.symbols import G, m, phidot, r

    derivative = OrbitTimeDerivative(0)
    w1 = derivative(gauge_moment_w())
    w2 = derivative(w1)
    for series in (w1, w2):
        value = series.coefficient(0)
        assert not value.is_zero()                                 # not zero off the circle
        on_circle = value.substitute({"rdot": 0}).to_sympy()
        assert sp.expand(on_circle.subs(G, phidot**2 * r**3 / m)) == 0


def test_dipole_gauge_moment_is_the_body_sum_and_survives_on_the_circle():
    # W_i = (3/10) sum_A m_A (y_A^i (y_A.v_A) - y_A^2 v_A^i/3), evaluated with numbers for two
    # bodies (m1 = 3, m2 = 1, Newtonian centre-of-mass positions): equal to the orbit tensor's
    # components; on a circle (x.v = 0) it is (1/10) nu m delta r^2 v, not zero
    import numpy as np

    from stfalgebra.moments.canonical import gauge_moment_w_dipole

    m1, m2 = 3.0, 1.0
    m = m1 + m2
    x, v = np.array([1.2, -0.4, 0.0]), np.array([0.3, 0.8, 0.0])
    bodies = [(m1, m2 / m * x, m2 / m * v), (m2, -m1 / m * x, -m1 / m * v)]
    expected = 0.3 * sum(mass * (y * (y @ u) - (y @ y) * u / 3) for mass, y, u in bodies)
    numbers = {"m": m, "nu": m1 * m2 / m**2, "delta": (m1 - m2) / m, "r": float(np.sqrt(x @ x)),
               "rdot": float(x @ v / np.sqrt(x @ x))}
    tensor = gauge_moment_w_dipole()

    def value(key):
        expr = tensor.terms[key].coefficient(0).to_sympy()
        return float(expr.subs({symbol: numbers[symbol.name] for symbol in expr.free_symbols}))

    got = value((1, 0, 0)) * x + value((0, 1, 0)) * v
    assert np.allclose(got, expected, rtol=1e-12, atol=0)
    assert not tensor.terms[(0, 1, 0)].coefficient(0).substitute({"rdot": 0}).is_zero()
