"""Tests of stfalgebra.binary.centre_of_mass: the 1PN relations follow from the mass dipole."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.centre_of_mass import (
    centre_of_mass_factors,
    centre_of_mass_velocity_factors,
)
from stfalgebra.binary.dynamics import OrbitTimeDerivative
from stfalgebra.binary.masses import individual_masses, mass_fractions, reduce_mass_difference
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

eps = sp.Symbol("eps", positive=True)


def test_newtonian_factors():
    s1, s2 = centre_of_mass_factors(0)
    x1, x2 = mass_fractions()
    assert s1.coefficient(0) == sp.expand(x2) and s2.coefficient(0) == sp.expand(-x1)
    assert s1.known_through == sp.Rational(1, 2)


def test_separation_is_difference():
    s1, s2 = centre_of_mass_factors(1)
    assert (s1 - s2).expand() == PNSeries({0: 1}, sp.Rational(3, 2))


def test_factors_derived_from_mass_dipole():
    # 1PN conserved mass dipole (from memory / common practice):
    # G_i = sum_A m_A (1 + v_A^2/(2 c^2) - G m_B/(2 r c^2)) y_A = 0, with Newtonian
    # v_1 = X2 v, v_2 = -X1 v inside the 1PN bracket. Unknown: a common shift t,
    # s1 = X2 + t, s2 = -X1 + t (so that s1 - s2 = 1).
    t = sp.Symbol("t")
    ma, mb = individual_masses()
    x1, x2 = mass_fractions()
    v2 = rdot**2 + r**2 * phidot**2
    dipole = (ma * (1 + eps**2 * x2**2 * v2 / 2 - eps**2 * G * mb / (2 * r)) * (x2 + t)
              + mb * (1 + eps**2 * x1**2 * v2 / 2 - eps**2 * G * ma / (2 * r)) * (-x1 + t))
    # t is O(eps^2): solve the linear equation to that order
    solution = sp.solve(dipole, t)[0]
    t_series = PNSeries.from_expression(solution.subs(delta**2, 1 - 4 * nu), eps, 1)
    s1, s2 = centre_of_mass_factors(1)
    expected_t = reduce_mass_difference(t_series.coefficient(1).subs(
        delta**2, 1 - 4 * nu))
    # the Newtonian dipole gives t = 0 at leading order
    assert t_series.coefficient(0) == 0
    assert sp.expand(reduce_mass_difference(s1.coefficient(1)) - expected_t) == 0
    assert sp.expand(reduce_mass_difference(s2.coefficient(1)) - expected_t) == 0


def test_beyond_1pn_refused():
    with pytest.raises(OrderBeyondInputsError, match="2"):
        centre_of_mass_factors(2)
    with pytest.raises(OrderBeyondInputsError):
        centre_of_mass_factors(1)[0].coefficient(2)


def test_velocity_factors():
    (p1, q1), (p2, q2) = centre_of_mass_velocity_factors(1)
    s1, _ = centre_of_mass_factors(1)
    assert p1 == s1
    assert q1 == OrbitTimeDerivative(1)(s1)
    assert q1.coefficient(0) == 0 and q1.coefficient(1) != 0
    # x = y1 - y2 implies v = v1 - v2: the q's cancel
    assert (q1 - q2).expand().orders == ()
    (p1n, q1n), _ = centre_of_mass_velocity_factors(0)
    assert q1n.orders == ()
