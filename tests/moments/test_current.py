"""Current moments J_L of two point masses (the 1PN field terms are checked in
test_field_integrals.py; here the assembled moments)."""

from __future__ import annotations

import pytest
import sympy as sp

from stfalgebra.moments.current import current_moment
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

V2 = rdot**2 + r**2 * phidot**2


def test_one_pn_current_quadrupole_circular():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014); Kidder (1995), Phys. Rev. D 52, 821 (issue
    # statement): on a circular orbit J_ij = -nu m delta eps_{ab<i} x_{j>a} v_b [1 + gamma (67/28 - 2 nu/7)]
    J2 = current_moment(2, 1)
    coeff = J2.terms[(1, 0, 1)]
    assert coeff.coefficient(0) == -delta * m * nu
    gamma = sp.Symbol("gamma")
    # circular, at this order v^2 = G m/r = gamma c^2 and rdot = 0
    first = sp.sympify(coeff.coefficient(1)).subs(rdot, 0).subs(phidot, sp.sqrt(G * m / r**3))
    assert sp.simplify(first / (-delta * m * nu) - G * m / r * (sp.Rational(67, 28) - sp.Rational(2, 7) * nu)) == 0


def test_one_pn_current_quadrupole_general_orbit():
    # General orbit, from memory (Blanchet 2014 Living Review, two-body J_ij at 1PN):
    # J_ij = -nu m delta { [1 + v^2 (13/28 - 17 nu/7) + (G m/r)(27/14 + 15 nu/7)] eps_{ab<i} x_{j>a} v_b
    #                      + (5/28)(1 - 2 nu) r rdot eps_{ab<i} v_{j>a} v_b }
    J2 = current_moment(2, 1)
    mu = nu * m
    lead = sp.expand(J2.terms[(1, 0, 1)].coefficient(1))
    assert sp.expand(lead + delta * mu * (V2 * (sp.Rational(13, 28) - sp.Rational(17, 7) * nu)
                                          + G * m / r * (sp.Rational(27, 14) + sp.Rational(15, 7) * nu))) == 0
    assert sp.expand(J2.terms[(0, 1, 1)].coefficient(1) + delta * mu * sp.Rational(5, 28) * (1 - 2 * nu) * r * rdot) == 0


def test_angular_momentum_is_the_current_dipole():
    # J_i at 1PN is the conserved angular momentum of the 1PN dynamics (from memory, Blanchet 2014):
    # J/(mu) = x cross v [1 + (1 - 3 nu) v^2/(2 c^2) + (3 + nu) G m/(r c^2)]
    J1 = current_moment(1, 1)
    coeff = J1.terms[(0, 0, 1)]
    assert coeff.coefficient(0) == m * nu
    assert sp.expand(coeff.coefficient(1) - m * nu * ((1 - 3 * nu) * V2 / 2 + (3 + nu) * G * m / r)) == 0


def test_errors():
    with pytest.raises(ValueError, match="l = 0"):
        current_moment(0, 0)
