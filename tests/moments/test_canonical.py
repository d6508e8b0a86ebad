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
