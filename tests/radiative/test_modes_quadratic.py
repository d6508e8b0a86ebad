"""Circular modes whose relative-1.5PN term needs the quadratic interactions the MPM iteration
derives (stfalgebra/mpm, read through stfalgebra/radiative/interaction_table.py): the modes
with l >= 5 mass or l >= 4 current, and the odd-l m = 0 modes, against their published values.

Published values: Blanchet, Faye, Iyer & Sinha, Class. Quantum Grav. 25, 165003 (2008), sec. 5
(Eqs. (9.4) of the living review: Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.5); the
numbers are from memory, written as leading factor times bracket in the same normalisation as
the toolkit (Hhat_lm with h_lm = 2 G m nu x/(R c^2) sqrt(16 pi/5) Hhat_lm exp(-i m psi)).
"""

from __future__ import annotations

import sympy as sp
import pytest

from stfalgebra.radiative.contributions import QUADRATIC_TABULATED_LMAX
from stfalgebra.radiative.modes import derive_mode, derive_modes
from stfalgebra.symbols import delta, nu, x

THREE_HALVES = sp.Rational(3, 2)
LN2, LN3, LN5 = sp.log(2), sp.log(3), sp.log(5)


def _bracket(l, m, prefactor, leading_power):
    """The mode divided by its published leading factor, as a polynomial in sqrt(x)."""
    hhat = derive_mode(l, m, pn_relative=THREE_HALVES).hhat
    return sp.expand(sp.expand(hhat / (prefactor * x**leading_power)))


def _coefficient(expr, power):
    y = sp.Symbol("y", positive=True)
    return sp.expand(sp.expand(expr).subs(x, y**2)).coeff(y, int(2 * power))


def _same(a, b):
    return sp.simplify(sp.expand_log(sp.expand(a - b), force=True)) == 0


# (l, m): (leading factor, leading power of x, {power of x inside the bracket: coefficient}),
# BFIS 2008 sec. 5 (from memory)
PUBLISHED = {
    (4, 3): (-9 * sp.I / (4 * sp.sqrt(70)) * delta, sp.Rational(3, 2), {
        0: 1 - 2 * nu,
        1: -sp.Rational(39, 11) + sp.Rational(1267, 132) * nu - sp.Rational(131, 33) * nu**2,
        THREE_HALVES: 3 * sp.pi * (1 - 2 * nu)
        + sp.I * (-sp.Rational(32, 5) + sp.Rational(16301, 810) * nu + 6 * (LN3 - LN2) * (1 - 2 * nu)),
    }),
    (4, 1): (sp.I / (84 * sp.sqrt(10)) * delta, sp.Rational(3, 2), {
        0: 1 - 2 * nu,
        1: -sp.Rational(101, 33) + sp.Rational(337, 44) * nu - sp.Rational(83, 33) * nu**2,
        THREE_HALVES: sp.pi * (1 - 2 * nu)
        + sp.I * (-sp.Rational(32, 15) + sp.Rational(1661, 30) * nu - 2 * LN2 * (1 - 2 * nu)),
    }),
    (5, 5): (625 * sp.I / (96 * sp.sqrt(66)) * delta, sp.Rational(3, 2), {
        0: 1 - 2 * nu,
        1: -sp.Rational(263, 39) + sp.Rational(688, 39) * nu - sp.Rational(256, 39) * nu**2,
        THREE_HALVES: 5 * sp.pi * (1 - 2 * nu)
        + sp.I * (-sp.Rational(181, 14) + sp.Rational(105834, 3125) * nu + 10 * (LN5 - LN2) * (1 - 2 * nu)),
    }),
}


@pytest.mark.parametrize("mode", sorted(PUBLISHED))
def test_modes_with_derived_quadratic_interactions_match_the_published_ones(mode):
    prefactor, power, terms = PUBLISHED[mode]
    bracket = _bracket(*mode, prefactor, power)
    for order, expected in terms.items():
        assert _same(_coefficient(bracket, order), expected), (mode, order)


def test_hhat_30_comes_from_an_instantaneous_quadratic_interaction():
    # Hhat_30 = -(2/5) i sqrt(6/7) nu x^(5/2) (BFIS 2008 sec. 5, from memory): no memory term
    # in V_ijk, so nothing non-oscillating; the instantaneous eps M x M products of V_ijk give it
    hhat = derive_mode(3, 0, pn_relative=THREE_HALVES).hhat
    assert _same(hhat, -sp.Rational(2, 5) * sp.I * sp.sqrt(sp.Rational(6, 7)) * nu * x**sp.Rational(5, 2))
    assert derive_mode(3, 0, pn_relative=1).hhat == 0


@pytest.mark.parametrize("l", [3, 5, 7])
def test_odd_zero_modes_are_imaginary_and_proportional_to_nu(l):
    # planar orbits: Hhat_l0 = (-1)^l conj(Hhat_l0), so odd-l m = 0 modes are imaginary; they
    # come only from products of two moments (each proportional to m nu), divided by the
    # normalisation's nu: proportional to nu, absent in the test-mass limit (common practice)
    hhat = sp.expand(derive_mode(l, 0, pn_relative=THREE_HALVES).hhat)
    assert hhat != 0 and hhat.coeff(sp.I, 0) == 0
    assert hhat.subs(nu, 0) == 0
    # one power of x: the current mode's leading order (l - 1)/2 plus the relative 3/2
    assert sp.Poly(hhat, x**sp.Rational(1, 2)).monoms() == [(l + 2,)]


@pytest.mark.parametrize("l", [5, 6, 7, 8])
def test_every_m_of_the_tabulated_degrees_is_served_at_relative_three_halves(l):
    for res in derive_modes(l, pn_relative=THREE_HALVES):
        if res.l != l:
            continue
        assert res.hhat is not None, (res.l, res.m, res.refused)   # m = 0, even l: the DC memory
    assert l <= QUADRATIC_TABULATED_LMAX


def test_the_provenance_writes_out_the_quadratic_terms_used():
    provenance = derive_mode(4, 4, pn_relative=THREE_HALVES).provenance
    assert any("U_L, l = 4" in line and "(2/5) int_0^oo dtau I^(3)_<ij I^(3)_kl>(t - tau)" in line
               for line in provenance)
    assert not any("quadratic terms" in line for line in derive_mode(4, 4, pn_relative=1).provenance)
