"""Tests of stfalgebra.radiative.spinning_secular_rates: dx/dt and de_t/dt of eccentric binaries with
aligned spins, against the non-spinning rates (chi -> 0), the circular aligned-spin dx/dt of the
project at e_t = 0 (x^(3/2) term 4 pi - 47/3 s_l - 25/4 delta sigma_l: Kidder, Phys. Rev. D 52, 821
(1995); Blanchet, Living Rev. Relativ. 17, 2 (2014), Sec. 11.3), and the float rates."""

from __future__ import annotations

import math

import pytest
import sympy as sp

from stfalgebra.exact import ExactPolynomial
from stfalgebra.radiative.secular_rates import numeric_secular_rates, secular_rates
from stfalgebra.radiative.spinning_fluxes import spinning_circular_x_rate
from stfalgebra.radiative.spinning_secular_rates import (
    numeric_spinning_secular_rates, spinning_secular_rates, validate_spin_component,
)
from stfalgebra.radiative.tail_enhancement import AngularMomentumTailEnhancement, EnergyTailEnhancement
from stfalgebra.symbols import delta, et, nu

CHI1, CHI2 = ExactPolynomial("chi1").to_sympy(), ExactPolynomial("chi2").to_sympy()
SO = sp.Rational(3, 2)
TAILS = {EnergyTailEnhancement(et): 0, AngularMomentumTailEnhancement(et): 0}


def test_without_spins_they_are_the_non_spinning_rates():
    for ours, theirs in zip(spinning_secular_rates("3/2"), secular_rates(SO)):
        for order in (0, 1, SO):
            assert sp.simplify(ours.coefficient(order).subs({CHI1: 0, CHI2: 0}) - theirs.coefficient(order)) == 0
    assert spinning_secular_rates(1)[0].coefficient(1) == secular_rates(1)[0].coefficient(1)


def test_circular_limit_is_the_circular_aligned_spin_rate():
    x_rate, e_rate = spinning_secular_rates("3/2")
    circular = spinning_circular_x_rate(SO).coefficient(SO).to_sympy()      # in units of (64/5) nu x^5
    spin_x = sp.expand(x_rate.coefficient(SO).xreplace(TAILS))
    assert sp.expand(spin_x.subs(et, 0) - sp.Rational(64, 5) * (circular - 4 * sp.pi)) == 0
    # the spin part of de_t/dt vanishes with e_t (a circular orbit stays circular)
    spin_e = sp.expand(e_rate.coefficient(SO).xreplace(TAILS))
    assert spin_e.has(CHI1) and spin_e.subs(et, 0) == 0


def test_float_rates_are_the_series():
    x_value, e_value, nu_value, chi = 0.01, 0.3, 0.2, (0.5, -0.8)
    spinning = numeric_spinning_secular_rates("3/2", *chi)
    plain = numeric_secular_rates(SO)
    x_rate, e_rate = spinning_secular_rates("3/2")
    values = {et: e_value, nu: nu_value, delta: math.sqrt(1 - 4 * nu_value), CHI1: chi[0], CHI2: chi[1]}
    for index, series in enumerate((x_rate, e_rate)):
        coefficient = sp.expand(series.coefficient(SO).xreplace(TAILS))
        spin = float((coefficient - coefficient.subs({CHI1: 0, CHI2: 0})).subs(values))
        expected = plain[index](x_value, e_value, nu_value) + spin * x_value**1.5
        assert math.isclose(spinning[index](x_value, e_value, nu_value), expected, rel_tol=1e-12)
    assert numeric_spinning_secular_rates("3/2", 0.0, 0.0) == plain


@pytest.mark.parametrize("bad, error", [(1.5, ValueError), (-1.01, ValueError), (float("nan"), ValueError),
                                        ("0.5", TypeError), (True, TypeError)])
def test_spin_components_are_bounded(bad, error):
    with pytest.raises(error):
        validate_spin_component(bad, "chi1")
