"""Tests of stfalgebra/radiative/stf_flux_terms.py: the 2.5PN parts of U^(1)_ij of the STF route,
against the mode route's channels (a second implementation of the same contributions)."""

from __future__ import annotations

import sympy as sp

from stfalgebra.radiative.stf_flux_terms import reaction_rate_polynomial, tail_polynomial_with_adm_mass
from stfalgebra.stf.cartesian import PROBE
from stfalgebra.symbols import G, c, m, nu, omega, r, r0

# the Z+^2 coefficient of a quadratic probe polynomial at phi = 0: k = (1, -i, 0)/2
_W = {PROBE[0]: sp.Rational(1, 2), PROBE[1]: -sp.I / 2, PROBE[2]: 0}


def test_reaction_part_of_u_ij_gives_minus_24_i_nu_in_hhat_22():
    # Kidder, Phys. Rev. D 77, 044016 (2008); Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav.
    # 25, 165003 (2008) (from memory): the imaginary x^(5/2) term of Hhat_22 is -24 i nu; the
    # (2,2) channel of U^(1) is (-2 i omega) times that of U, whose Newtonian value is
    # -nu m r^2 omega^2 (Hhat_22 = 1); with Kepler's law x = (r omega/c)^2. U^(1) also holds the
    # drift of the Newtonian amplitude, d/dt(-nu m G m/r) = nu m G m rdot_RR/r^2, which is
    # (32/5) i nu x^(5/2) of (-2 i omega) U: the U^(1) channel gives -24 + 32/5 = -88/5
    channel = sp.expand(reaction_rate_polynomial().subs(_W)) / (-2 * sp.I * omega)
    ratio = sp.expand((channel / (-nu * m * r**2 * omega**2)).subs(G, omega**2 * r**3 / m))
    assert sp.simplify(ratio + sp.Rational(88, 5) * sp.I * nu * (r * omega / c) ** 5) == 0


def test_reaction_part_is_out_of_phase_with_the_newtonian_u_ij():
    # -24 i nu: it adds nothing to |U^(1)|^2 at relative 2.5PN
    channel = sp.expand(reaction_rate_polynomial().subs(_W))
    newtonian_rate = -nu * m * r**2 * omega**2 * (-2 * sp.I * omega)
    assert sp.expand(sp.re(sp.expand(channel * sp.conjugate(newtonian_rate)))) == 0


def test_adm_tail_polynomial_keeps_r0_only_in_the_phase():
    # the tail's ln r0 multiplies the out-of-phase part: on the channel the real part is r0-free
    channel = sp.expand(tail_polynomial_with_adm_mass("mass", 2).subs(_W))
    newtonian_rate = -nu * m * r**2 * omega**2 * (-2 * sp.I * omega)
    in_phase = sp.expand(sp.re(sp.expand(channel * sp.conjugate(newtonian_rate))))
    assert not in_phase.has(r0) and in_phase != 0
