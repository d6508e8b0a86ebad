"""Tests of stfalgebra.radiative.spinning_fluxes: the circular aligned-spin energy flux by the
mode sum and by the STF formula, against the published spin-orbit coefficient and the
black-hole-perturbation test-mass limit."""

from __future__ import annotations

from fractions import Fraction

import pytest

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.exact import ExactPolynomial
from stfalgebra.orders import PNOrder
from stfalgebra.radiative.fluxes import circular_energy_flux_from_modes
from stfalgebra.radiative.spinning_fluxes import (
    check_spinning_flux_order, spinning_circular_x_rate, spinning_energy_flux_from_modes,
    spinning_energy_flux_from_moments,
)

NU, DELTA = ExactPolynomial("nu"), ExactPolynomial("delta")
CHI1, CHI2 = ExactPolynomial("chi1"), ExactPolynomial("chi2")
X1, X2 = (1 + DELTA) / 2, (1 - DELTA) / 2
S_L = X1 * X1 * CHI1 + X2 * X2 * CHI2          # c S_l/(G m^2)
SIGMA_L = X2 * CHI2 - X1 * CHI1                # c Sigma_l/(G m^2)
THREE_HALVES = PNOrder(3, 2)


def test_spin_orbit_flux_coefficient_is_published():
    # F/F_N at x^(3/2): 4 pi - 4 s_l - (5/4) delta sigma_l (Kidder, PRD 52, 821 (1995); Blanchet,
    # Living Rev. Relativ. 17, 2 (2014), the spin-orbit part of the flux; from memory, as quoted
    # in the task)
    value = spinning_energy_flux_from_modes("3/2").coefficient(THREE_HALVES)
    assert value == 4 * ExactPolynomial("pi") - 4 * S_L - Fraction(5, 4) * DELTA * SIGMA_L


def test_test_mass_limit_is_black_hole_perturbation_theory():
    # a test mass on a circular equatorial Kerr orbit: F/F_N = 1 - (1247/336) x + (4 pi - (11/4) q) x^(3/2)
    # (Tagoshi, Shibata, Tanaka & Sasaki, PRD 54, 1439 (1996); from memory)
    value = spinning_energy_flux_from_modes("3/2").coefficient(THREE_HALVES)
    assert value.substitute({"nu": 0, "delta": 1}) == 4 * ExactPolynomial("pi") - Fraction(11, 4) * CHI1


@pytest.mark.parametrize("pn", [0, 1, Fraction(3, 2)])
def test_both_routes_agree(pn):
    by_modes = spinning_energy_flux_from_modes(pn)
    by_moments = spinning_energy_flux_from_moments(pn)
    assert by_modes.known_through == by_moments.known_through
    for order in set(by_modes.orders) | set(by_moments.orders):
        difference = by_modes.coefficient(order) - ExactPolynomial.from_sympy(by_moments.coefficient(order))
        assert difference.is_zero(), order


def test_without_spins_it_is_the_non_spinning_flux():
    spinning = spinning_energy_flux_from_modes("3/2")
    plain = circular_energy_flux_from_modes("3/2")
    for order in spinning.orders:
        assert (spinning.coefficient(order).substitute({"chi1": 0, "chi2": 0}) - plain.coefficient(order)).is_zero()


def test_orders_beyond_the_spin_orbit_terms_are_refused():
    with pytest.raises(OrderBeyondInputsError, match="through order 3/2 at most"):
        check_spinning_flux_order(2)


def test_secular_x_rate_has_the_published_spin_orbit_term():
    # (dx/dt)/((64/5)(c^3/(G m)) nu x^5) = 1 - (743/336 + 11 nu/4) x + (4 pi - beta) x^(3/2) with
    # beta = (1/12) sum_A chi_A (113 X_A^2 + 75 nu) (Kidder 1995; Blanchet, Living Rev. Relativ. 17,
    # 2 (2014), Sec. 11.3: -47/3 s_l - 25/4 delta sigma_l; from memory)
    rate = spinning_circular_x_rate("3/2")
    assert rate.coefficient(1) == -Fraction(743, 336) - Fraction(11, 4) * NU
    beta = (CHI1 * (113 * X1 * X1 + 75 * NU) + CHI2 * (113 * X2 * X2 + 75 * NU)) / 12
    assert rate.coefficient(THREE_HALVES) == 4 * ExactPolynomial("pi") - beta
    assert rate.coefficient(THREE_HALVES) == (4 * ExactPolynomial("pi") - Fraction(47, 3) * S_L
                                              - Fraction(25, 4) * DELTA * SIGMA_L)
