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
