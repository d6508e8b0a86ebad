"""Tests of stfalgebra/moments/mass_reaction.py: the cited 2.5PN term of I_ij on circular orbits."""

from __future__ import annotations

import sympy as sp

from stfalgebra.moments.mass_reaction import REACTION_QUADRUPOLE_SOURCE, reaction_mass_quadrupole_circular


def test_reaction_term_is_cited_and_of_order_five_halves():
    tensor = reaction_mass_quadrupole_circular()
    assert tensor.rank == 2 and list(tensor.terms) == [(1, 1, 0)]          # x_<i v_j>
    assert tensor.terms[(1, 1, 0)].orders == (sp.Rational(5, 2),)
    assert "cited" in REACTION_QUADRUPOLE_SOURCE and "Class. Quantum Grav. 25, 165003" in REACTION_QUADRUPOLE_SOURCE
    assert any("cited" in line for line in tensor.provenance)


def test_reaction_term_channel_is_out_of_phase():
    # x_<i v_j> k_ij on the (2,2) channel: r (r phidot) (Z+ + Z-)(-i)(Z+ - Z-)/4 -> -i r^2 phidot/4
    channel = reaction_mass_quadrupole_circular().channel(2, 0, 0, circular_frequency=True)
    value = channel.coefficient(sp.Rational(5, 2))
    assert value.real_part().is_zero() and not value.imaginary_part().is_zero()


def test_the_reaction_shift_of_the_centre_of_mass_does_not_reach_i_ij():
    # y_A = (X_2 or -X_1 + nu delta P) x + nu delta Q v with the same shift for both bodies
    # (Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 7.3, from memory; Q has a 2.5PN term,
    # stfalgebra.binary.cited_inputs.centre_of_mass_velocity_reaction_term): the Newtonian
    # sum_A m_A y_A^i y_A^j changes linearly in Q by 2 nu delta Q (m_1 X_2 - m_2 X_1) x^(i v^j) = 0,
    # so the cited centre-of-mass frame I_ij needs no separate 2.5PN centre-of-mass term
    m1, m2, q = sp.symbols("m1 m2 q", positive=True)
    x = sp.Matrix(sp.symbols("x1:4"))
    v = sp.Matrix(sp.symbols("v1:4"))
    total = m1 + m2
    y1 = m2 / total * x + q * v
    y2 = -m1 / total * x + q * v
    quadrupole = m1 * y1 * y1.T + m2 * y2 * y2.T
    linear = quadrupole.applyfunc(lambda e: sp.diff(e, q).subs(q, 0))
    assert linear.applyfunc(sp.simplify) == sp.zeros(3, 3)
