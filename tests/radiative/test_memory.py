"""The memory formula from the energy radiated per solid angle (stfalgebra.radiative.memory)."""

from fractions import Fraction

import numpy as np
import pytest
import sympy as sp

from stfalgebra.radiative.interaction_table import radiative_terms
from stfalgebra.radiative.memory import (
    memory_coupling, memory_pairs, memory_rate, memory_terms_from_flux,
)
from stfalgebra.stf.harmonics import spherical_harmonic, spin_weighted_harmonic

THETA, PHI = sp.symbols("theta phi", real=True)


def _quadrature(l1, m1, l2, m2, l, m):
    """int (-2)Y_l1m1 conj((-2)Y_l2m2) conj(Y_lm) dOmega by Gauss-Legendre in cos(theta) and the
    trapezoidal rule in phi (both exact for these trigonometric polynomials)."""
    integrand = sp.lambdify((THETA, PHI), spin_weighted_harmonic(-2, l1, m1, THETA, PHI)
                            * sp.conjugate(spin_weighted_harmonic(-2, l2, m2, THETA, PHI))
                            * sp.conjugate(spherical_harmonic(l, m, THETA, PHI)), "numpy")
    nodes, weights = np.polynomial.legendre.leggauss(24)
    phis = np.linspace(0, 2 * np.pi, 32, endpoint=False)
    theta, phi = np.meshgrid(np.arccos(nodes), phis, indexing="ij")
    values = integrand(theta, phi) * np.ones_like(theta)
    return complex(np.sum(weights[:, None] * values) * 2 * np.pi / len(phis))


@pytest.mark.parametrize("modes", [(2, 2, 2, 2, 2, 0), (2, 2, 2, 2, 4, 0), (3, 1, 2, 1, 2, 0), (2, 1, 3, -1, 4, 2),
                                   (3, 3, 2, 2, 3, 1), (4, -2, 2, 1, 5, -3), (2, 2, 3, 2, 3, 0)])
def test_coupling_matches_the_quadrature_of_the_harmonics(modes):
    # independent route: the project's own spin-weighted harmonics integrated numerically
    exact = complex(sp.N(memory_coupling(*modes), 30))
    assert abs(exact - _quadrature(*modes)) < 1e-12


def test_coupling_vanishes_off_the_selection_rules():
    assert memory_coupling(2, 2, 2, 1, 2, 0) == 0      # m != m1 - m2
    assert memory_coupling(2, 2, 2, 2, 6, 0) == 0      # l > l1 + l2
    with pytest.raises(ValueError, match="l >= 2"):
        memory_coupling(1, 0, 2, 0, 2, 0)


def test_quadrupole_memory_rate_gives_the_leading_dc_memory_weight():
    # by hand: int |(-2)Y_22|^2 Y_20 dOmega = (5/(64 pi)) sqrt(5/(4 pi)) 2 pi int_-1^1 (1 + c)^4
    # (3c^2 - 1)/2 dc = (2/7) sqrt(5/(4 pi)); the same for m = -2; times -sqrt(0!/4!)
    a = sp.Symbol("a", positive=True)
    rate = memory_rate(2, 0, {(2, 2): a, (2, -2): a})
    assert sp.simplify(rate + 2 * sp.Rational(2, 7) * sp.sqrt(5 / (4 * sp.pi)) * a**2 / sp.sqrt(24)) == 0


def _mpm_memory(moment, l, order):
    return {(term.factors, term.contractions, term.epsilon): term.coefficient
            for term in radiative_terms(moment, l, order) if term.kind == "memory" and term.order == order}


@pytest.mark.parametrize("moment, l, order", [("U", 4, Fraction(3, 2)), ("U", 2, Fraction(5, 2)),
                                              ("U", 3, Fraction(5, 2)), ("V", 2, Fraction(5, 2)),
                                              ("V", 3, Fraction(3, 2))])
def test_memory_formula_agrees_with_the_mpm_iteration_term_by_term(moment, l, order):
    # the two routes: the flux over the sphere against the harmonics, and the iteration of the
    # field equations (stfalgebra.mpm); a zero from the formula must be an absent MPM term
    mpm = _mpm_memory(moment, l, order)
    flux = {(term.factors, term.contractions, term.epsilon): term.coefficient
            for term in memory_terms_from_flux(moment, l, order)}
    assert {key: value for key, value in flux.items() if value} == mpm
    assert set(mpm) <= set(flux)


def test_published_memory_terms():
    # U_ij at relative 2.5PN: -(2/7) int M^(3)_a<i M^(3)_j>a (Blanchet, Class. Quantum Grav. 15, 89
    # (1998); from memory); U_ijkl at 1.5PN: (2/5) int M^(3)_<ij M^(3)_kl> (Blanchet, Living Rev.
    # Relativ. 17, 2 (2014), sec. 3; from memory); U_ijk at 2.5PN: -(1/3) int M^(3)_a<i M^(4)_jk>a
    # (Faye, Blanchet & Iyer, Class. Quantum Grav. 32, 045016 (2015); from memory)
    assert memory_terms_from_flux("U", 2, Fraction(5, 2))[0].coefficient == Fraction(-2, 7)
    assert memory_terms_from_flux("U", 4, Fraction(3, 2))[0].coefficient == Fraction(2, 5)
    assert memory_terms_from_flux("U", 3, Fraction(5, 2))[0].coefficient == Fraction(-1, 3)


def test_pairs_follow_rank_parity_and_powers_of_c():
    assert memory_pairs("U", 4, Fraction(3, 2)) == ((("M", 2), ("M", 2), 0, 0),)
    assert memory_pairs("U", 4, Fraction(1)) == ()
    assert memory_pairs("V", 2, Fraction(5, 2)) == ((("M", 2), ("M", 3), 1, 1), (("M", 2), ("S", 2), 1, 0))
    with pytest.raises(ValueError, match="'W'"):
        memory_pairs("W", 2, Fraction(1))


def test_exact_3j_symbols_match_sympy():
    # reference library: sympy.physics.wigner.wigner_3j
    from itertools import product

    from sympy.physics.wigner import wigner_3j

    from stfalgebra.radiative.memory import wigner_3j_exact

    for j1, j2, j3 in product(range(4), repeat=3):
        for m1, m2 in product(range(-j1, j1 + 1), range(-j2, j2 + 1)):
            m3 = -m1 - m2
            if abs(m3) <= j3:
                assert sp.expand(wigner_3j_exact(j1, j2, j3, m1, m2, m3).to_sympy()
                                 - wigner_3j(j1, j2, j3, m1, m2, m3)) == 0
    assert wigner_3j_exact(2, 2, 2, 1, 1, 0).rational == 0      # m1 + m2 + m3 != 0
