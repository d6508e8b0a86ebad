"""Tests of stfalgebra.binary.masses."""

from __future__ import annotations

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stfalgebra.binary.masses import (
    individual_masses,
    mass_difference_ratio,
    mass_fractions,
    reduce_mass_difference,
    symmetric_mass_ratio,
    validate_nu,
)
from stfalgebra.symbols import G, delta, m, m1, m2, nu, r


def test_individual_masses_sum_and_ratio():
    a, b = individual_masses()
    assert sp.simplify(a + b - m) == 0
    assert sp.simplify((a - b) / m - delta) == 0
    # nu = m1 m2/m^2 = (1 - delta^2)/4 (definitions, common practice)
    assert sp.expand(a * b / m**2 - (1 - delta**2) / 4) == 0


def test_mass_fractions():
    x1, x2 = mass_fractions()
    assert sp.expand(x1 + x2) == 1 and sp.expand(x1 - x2) == delta


def test_ratios_numeric():
    # equal masses: nu = 1/4, delta = 0 (common practice)
    assert symmetric_mass_ratio(1, 1) == sp.Rational(1, 4)
    assert mass_difference_ratio(1, 1) == 0
    assert symmetric_mass_ratio(2, 1) == sp.Rational(2, 9)
    assert mass_difference_ratio(2, 1) == sp.Rational(1, 3)


def test_ratios_symbolic_identity():
    n = symmetric_mass_ratio(m1, m2)
    d = mass_difference_ratio(m1, m2)
    assert sp.simplify(d**2 - (1 - 4 * n)) == 0


@pytest.mark.parametrize("bad", [0, -1, sp.Rational(-1, 2)])
def test_nonpositive_mass_rejected(bad):
    with pytest.raises(ValueError, match="m1"):
        symmetric_mass_ratio(bad, 1)


def test_mass_bad_type():
    with pytest.raises(TypeError, match="m2"):
        mass_difference_ratio(1, "abc def")
    with pytest.raises(TypeError):
        symmetric_mass_ratio(True, 1)


@pytest.mark.parametrize("good", [sp.Rational(1, 4), sp.Rational(1, 10), 0.2, nu, sp.Symbol("q")])
def test_validate_nu_accepts(good):
    assert validate_nu(good) == sp.sympify(good)


@pytest.mark.parametrize("bad", [0, -0.1, 0.3, sp.Rational(1, 3), 1, sp.I / 8])
def test_validate_nu_rejects(bad):
    with pytest.raises(ValueError, match="nu must lie in"):
        validate_nu(bad)


def test_validate_nu_bad_type():
    with pytest.raises(TypeError):
        validate_nu([0.1])


def test_reduce_examples():
    assert reduce_mass_difference(delta**2) == 1 - 4 * nu
    assert reduce_mass_difference(delta**3) == sp.expand(delta * (1 - 4 * nu))
    assert reduce_mass_difference(G * m / r) == G * m / r
    assert reduce_mass_difference((1 + delta) ** 2 / 4) == sp.expand(
        (1 + 2 * delta + 1 - 4 * nu) / 4)


def test_reduce_rational():
    out = reduce_mass_difference(1 / (1 + delta**2))
    assert out == 1 / (2 - 4 * nu)


def test_reduce_refuses_delta_in_function():
    with pytest.raises(ValueError, match="delta"):
        reduce_mass_difference(sp.log(delta) + delta**2)


def test_reduce_is_canonical_for_equal_inputs():
    # the JSON contract: two forms of one quantity reduce to the same expression
    a = (1 - delta) ** 4
    b = sp.expand(a)
    assert reduce_mass_difference(a) == reduce_mass_difference(b)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.integers(-5, 5), min_size=1, max_size=7))
@example([0, 0, 1])
def test_reduce_property(coeffs):
    # output is linear in delta and agrees with the original when delta^2 = 1 - 4 nu
    expr = sum(cf * delta**k * (nu + G) ** (k % 2) for k, cf in enumerate(coeffs))
    out = reduce_mass_difference(expr)
    assert sp.Poly(out, delta).degree() <= 1
    # check at the physical point m1 = 3, m2 = 1: delta = 1/2, nu = 3/16 (common practice)
    point = {delta: sp.Rational(1, 2), nu: sp.Rational(3, 16)}
    assert sp.expand(out.subs(point) - expr.subs(point)) == 0


def test_reduce_fast_enough():
    import time
    expr = sp.expand((1 + delta + nu + G) ** 14)
    start = time.perf_counter()
    reduce_mass_difference(expr)
    assert time.perf_counter() - start < 10
