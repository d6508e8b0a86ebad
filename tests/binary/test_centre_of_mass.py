"""Tests of stfalgebra.binary.centre_of_mass: the 1PN relations follow from the mass dipole;
the 2PN relations (with their term along v) keep x = y1 - y2, and the velocity factors are
checked against a second route (Cartesian components differentiated with the phase)."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.binary.centre_of_mass import (
    centre_of_mass_factors,
    centre_of_mass_relations,
    centre_of_mass_velocity_factors,
)
from stfalgebra.binary.dynamics import OrbitTimeDerivative, check_pn_order
from stfalgebra.binary.masses import individual_masses, mass_fractions, reduce_mass_difference
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries
from stfalgebra.symbols import G, delta, m, nu, phi, phidot, r, rdot

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


def test_factors_refuse_2pn_and_point_to_relations():
    # y_A = s_A x cannot hold the 2PN term along v: refused with a pointer, not truncated
    with pytest.raises(ValueError, match=r"centre_of_mass_relations\(2\)"):
        centre_of_mass_factors(2)
    with pytest.raises(OrderBeyondInputsError, match="3"):
        centre_of_mass_factors(3)
    with pytest.raises(OrderBeyondInputsError, match="3"):
        centre_of_mass_relations(3)
    with pytest.raises(OrderBeyondInputsError):
        centre_of_mass_factors(1)[0].coefficient(2)
    with pytest.raises(OrderBeyondInputsError):
        centre_of_mass_relations(2)[0][0].coefficient(3)


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


@pytest.mark.parametrize("pn_order", [0, 1, 2])
def test_relations_keep_the_relative_separation(pn_order):
    # y1 - y2 = x for every pn_order: s1 - s2 = 1 and t1 = t2 (definition of x)
    (s1, t1), (s2, t2) = centre_of_mass_relations(pn_order)
    known = check_pn_order(pn_order)
    assert (s1 - s2).expand() == PNSeries({0: 1}, known)
    assert (t1 - t2).expand().orders == ()
    assert s1.known_through == t1.known_through == known


def test_relations_reduce_to_lower_orders():
    (s1_2, t1_2), (s2_2, _) = centre_of_mass_relations(2)
    s1_1, s2_1 = centre_of_mass_factors(1)
    assert s1_2.truncate(sp.Rational(3, 2)) == s1_1
    assert s2_2.truncate(sp.Rational(3, 2)) == s2_1
    assert t1_2.truncate(sp.Rational(3, 2)).orders == ()
    # the term along v starts at 2PN, proportional to nu delta rdot (Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), Sec. 7.3: Q = -(7/4) G m rdot/c^4, from memory)
    assert t1_2.orders == (2,)
    assert sp.expand(t1_2.coefficient(2) + sp.Rational(7, 4) * G * m * rdot * nu * delta) == 0


def test_relations_vanish_for_equal_masses_and_test_mass():
    # nu delta prefactor (structure of the published relations): equal masses (delta = 0) sit
    # at -+ x/2 exactly, a test mass (nu = 0) moves about the heavy body at rest
    (s1, t1), (s2, t2) = centre_of_mass_relations(2)
    for order in s1.orders:
        assert s1.coefficient(order).subs(delta, 0) == (sp.Rational(1, 2) if order == 0 else 0)
        assert sp.expand(s2.coefficient(order).subs(nu, 0)) == (
            sp.expand(-(1 + delta) / 2) if order == 0 else 0)
    assert t1.coefficient(2).subs(delta, 0) == 0


@pytest.mark.parametrize("pn_order", [1, 2])
def test_velocity_factors_against_cartesian_route(pn_order):
    # second route: write y_A in Cartesian components with x = r (cos phi, sin phi),
    # v = rdot n + r phidot lambda, differentiate each component along the orbit (the phase
    # enters, so the generic sympy.diff path is used) and compare with p_A v + q_A x
    d = OrbitTimeDerivative(pn_order)
    n_vec = (sp.cos(phi), sp.sin(phi))
    lam_vec = (-sp.sin(phi), sp.cos(phi))
    x_vec = [r * c for c in n_vec]
    v_vec = [rdot * a + r * phidot * b for a, b in zip(n_vec, lam_vec)]
    relations = centre_of_mass_relations(pn_order)
    velocities = centre_of_mass_velocity_factors(pn_order)
    for (s_factor, t_factor), (p_factor, q_factor) in zip(relations, velocities):
        for i in range(2):
            position = (s_factor * x_vec[i] + t_factor * v_vec[i]).expand()
            derived = d(position)
            claimed = (p_factor * v_vec[i] + q_factor * x_vec[i]).expand()
            known = min(derived.known_through, claimed.known_through)
            difference = (derived.truncate(known) - claimed.truncate(known)).map_coefficients(
                lambda e: sp.expand(sp.expand_trig(e)))
            assert difference.orders == ()
            assert known == check_pn_order(pn_order)


def test_velocity_factors_2pn_difference_is_v():
    # v1 - v2 = v: p1 - p2 = 1 and q1 = q2 at 2PN as well
    (p1, q1), (p2, q2) = centre_of_mass_velocity_factors(2)
    assert (p1 - p2).expand() == PNSeries({0: 1}, 2)
    assert (q1 - q2).expand().orders == ()
    # the term along v of y_A contributes t_A a to v_A: q1 differs from ds1/dt at 2PN
    (s1, _), _ = centre_of_mass_relations(2)
    assert (q1 - OrbitTimeDerivative(2)(s1)).expand().orders == (2,)
