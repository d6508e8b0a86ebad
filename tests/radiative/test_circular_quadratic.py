"""Tests of stfalgebra/radiative/circular_quadratic.py: the quadratic interactions of U_ij at
relative 2.5PN on the circular (2,2) channel, by explicit components."""

from __future__ import annotations

from fractions import Fraction

import pytest

from stfalgebra.binary.circular_frequency import on_circular_orbit
from stfalgebra.exact import ExactPolynomial
from stfalgebra.radiative.circular_quadratic import circular_quadratic_channel, quadratic_quadrupole_terms
from stfalgebra.radiative.contributions import CONTRIBUTIONS
from stfalgebra.radiative.radiative_moments import instantaneous_2pn_circular

ROW = next(row for row in CONTRIBUTIONS if row.family == "quadratic" and row.available and row.l_max == 2)


def test_the_tabulated_terms_of_u_ij():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), U_ij at 2.5PN (from memory): the memory
    # -(2/7) int M^(3)_a<i M^(3)_j>a, the products (1/7) M^(5) M, -(5/7) M^(4) M^(1), -(2/7) M^(3) M^(2)
    # and (1/3) eps_ab<i M^(4)_j>a S_b (written eps_iab S_a M_bj with -1/3 in the iteration's table)
    coefficients = sorted((term.kind, term.coefficient) for term in quadratic_quadrupole_terms())
    assert coefficients == sorted([("memory", Fraction(-2, 7)), ("instantaneous", Fraction(1, 7)),
                                   ("instantaneous", Fraction(-5, 7)), ("instantaneous", Fraction(-2, 7)),
                                   ("instantaneous", Fraction(-1, 3))])


def test_quadratic_part_of_hhat_22():
    # by hand: on the circle only M^(5)_a<i M_j>a (through the constant part of M_ij) and the
    # eps S M^(4) term reach m = 2: (4/21) i nu - (4/3) i nu = -(8/7) i nu times x^(5/2); the
    # memory integrand M^(3) M^(3) has no m = 2 part
    newtonian = on_circular_orbit(instantaneous_2pn_circular(2, 2).truncate(0), 2)
    piece = on_circular_orbit(circular_quadratic_channel(2, 2, row=ROW, orbit="circular"), 2)
    # the channels carry their dimension: the Newtonian one lands at x^1, this piece 5/2 beyond
    assert newtonian.orders == (1,) and piece.orders == (Fraction(7, 2),)
    assert piece.coefficient(Fraction(7, 2)) / newtonian.coefficient(1) == -ExactPolynomial("I") * ExactPolynomial("nu") * Fraction(8, 7)


def test_other_channels_are_refused():
    with pytest.raises(ValueError, match="circular"):
        circular_quadratic_channel(2, 0, row=ROW, orbit="circular")
