"""Mass moments I_L of two point masses."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import given, settings, strategies as st

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.moments.mass import mass_moment
from stfalgebra.symbols import G, delta, m, nu, phidot, r, rdot

EPS = sp.Symbol("eps", positive=True)
V2 = rdot**2 + r**2 * phidot**2


def _coefficient(tensor, key, order):
    return sp.expand(tensor.terms[key].coefficient(order)) if key in tensor.terms else 0


def test_one_pn_mass_quadrupole_general_orbit():
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), the 1PN two-body mass quadrupole (from memory):
    # I_ij = nu m { x_<ij> [1 + (29/42)(1 - 3 nu) v^2/c^2 - (1/7)(5 - 8 nu) G m/(r c^2)]
    #               - (4/7)(1 - 3 nu) r rdot x_<i v_j>/c^2 + (11/21)(1 - 3 nu) r^2 v_<ij>/c^2 }
    I2 = mass_moment(2, 1)
    mu = nu * m
    assert _coefficient(I2, (2, 0, 0), 0) == mu
    assert sp.expand(_coefficient(I2, (2, 0, 0), 1)
                     - mu * (sp.Rational(29, 42) * (1 - 3 * nu) * V2 - sp.Rational(1, 7) * (5 - 8 * nu) * G * m / r)) == 0
    assert sp.expand(_coefficient(I2, (1, 1, 0), 1) + mu * sp.Rational(4, 7) * (1 - 3 * nu) * r * rdot) == 0
    assert sp.expand(_coefficient(I2, (0, 2, 0), 1) - mu * sp.Rational(11, 21) * (1 - 3 * nu) * r**2) == 0


@settings(max_examples=25, deadline=None)
@given(st.integers(min_value=0, max_value=9), st.integers(min_value=1, max_value=9), st.integers(min_value=1, max_value=9))
def test_newtonian_mass_ratio_factor_is_the_two_body_sum(l, mass1, mass2):
    # I_L = sum_A m_A y_A^<L>, with the centre of mass at the origin: m1 y1 + m2 y2 = 0,
    # y1 - y2 = x (definition; checked at unequal integer masses)
    total = mass1 + mass2
    y1, y2 = sp.Rational(mass2, total), -sp.Rational(mass1, total)
    expected = mass1 * y1**l + mass2 * y2**l
    got = mass_moment(l, 0).terms[(l, 0, 0)].coefficient(0)
    values = {m: total, nu: sp.Rational(mass1 * mass2, total**2), delta: sp.Rational(mass1 - mass2, total)}
    assert sp.simplify(sp.sympify(got).subs(values) - expected) == 0


def test_moment_orders_and_errors():
    assert mass_moment(3, 1).terms[(3, 0, 0)].known_through == sp.Rational(3, 2)
    assert mass_moment(3, 0).terms[(3, 0, 0)].known_through == sp.Rational(1, 2)
    with pytest.raises(OrderBeyondInputsError):
        mass_moment(2, 3)
    with pytest.raises(ValueError):
        mass_moment(-1, 0)
    with pytest.raises(TypeError):
        mass_moment(2.0, 0)
