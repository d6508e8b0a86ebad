"""Tests of the raw Cartesian-polynomial kernels (stfalgebra/stf/cartesian.py)."""

from __future__ import annotations

import itertools
import re
from math import factorial

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stfalgebra.stf.cartesian import (
    PROBE,
    contract_cartesian,
    harmonic_part_cartesian,
    is_harmonic,
    laplacian_cartesian,
    monomial_coefficients,
    polynomial_from_coefficients,
)

k1, k2, k3 = PROBE
NORM_SQUARED = k1**2 + k2**2 + k3**2
PROPERTY = settings(max_examples=15, deadline=None)


def multi_indices(rank: int):
    return [(a, b, rank - a - b) for a in range(rank + 1) for b in range(rank - a + 1)]


@st.composite
def homogeneous_polynomials(draw, max_rank: int = 6, rank: int | None = None):
    """A random homogeneous polynomial (given or random rank), small rational coefficients."""
    if rank is None:
        rank = draw(st.integers(min_value=0, max_value=max_rank))
    coefficients = {}
    for key in multi_indices(rank):
        numerator = draw(st.integers(min_value=-5, max_value=5))
        denominator = draw(st.integers(min_value=1, max_value=4))
        coefficients[key] = sp.Rational(numerator, denominator)
    return polynomial_from_coefficients(coefficients), rank


def power_of_dot(n, rank):
    return sp.expand((n[0] * k1 + n[1] * k2 + n[2] * k3) ** rank)


def double_factorial(n: int) -> int:
    return 1 if n <= 0 else n * double_factorial(n - 2)


# ------------------------------------------------------------------ coefficients


def test_monomial_coefficients_of_a_symbolic_polynomial():
    nu, r = sp.symbols("nu r", positive=True)
    p = (1 + nu) * (k1 + r * k2) * k3
    assert monomial_coefficients(p, 2) == {(1, 0, 1): 1 + nu, (0, 1, 1): r + nu * r}


def test_monomial_coefficients_zero_and_constant():
    assert monomial_coefficients(sp.S.Zero, 4) == {}
    assert monomial_coefficients(sp.Rational(3, 2), 0) == {(0, 0, 0): sp.Rational(3, 2)}


def test_monomial_coefficients_cancellation_drops_key():
    assert monomial_coefficients((k1 + k2) ** 2 - k1**2 - 2 * k1 * k2, 2) == {(0, 2, 0): 1}


@pytest.mark.parametrize("bad", [k1 + k2**2, k1**3, sp.Integer(1)])
def test_degree_mismatch_is_rejected(bad):
    with pytest.raises(ValueError, match="degree"):
        monomial_coefficients(bad, 2)


@pytest.mark.parametrize("bad", [sp.sin(k1) * k2, 1 / k1, sp.sqrt(k2) * k1])
def test_non_polynomial_is_rejected(bad):
    with pytest.raises(ValueError, match="not a polynomial"):
        monomial_coefficients(bad, 1)


@pytest.mark.parametrize("rank", [-1, 1.5, 2.0, "2", None, True])
def test_bad_rank_names_the_value(rank):
    with pytest.raises(ValueError, match=re.escape(repr(rank))):
        harmonic_part_cartesian(k1, rank)


def test_string_input_is_not_parsed():
    with pytest.raises(TypeError, match="k1"):
        monomial_coefficients("k1**2", 2)


def test_polynomial_from_coefficients_rejects_bad_keys():
    with pytest.raises(ValueError, match=r"\(1, -1, 0\)"):
        polynomial_from_coefficients({(1, -1, 0): 1})
    with pytest.raises(TypeError):
        polynomial_from_coefficients([((1, 0, 0), 1)])


@PROPERTY
@given(homogeneous_polynomials())
def test_coefficients_round_trip(data):
    p, rank = data
    assert polynomial_from_coefficients(monomial_coefficients(p, rank)) == p


# ------------------------------------------------------------------ contraction


def test_contraction_of_tensor_products_is_power_of_dot_product():
    # common practice: n_L n'_L = (n.n')^l
    n, n_prime = (1, 2, -3), (sp.Rational(1, 2), -1, 4)
    for rank in range(6):
        dot = sum(a * b for a, b in zip(n, n_prime))
        assert contract_cartesian(power_of_dot(n, rank), power_of_dot(n_prime, rank), rank) == dot**rank


def test_contraction_component_weights():
    # T_L S_L written out component by component: T = S = e_x e_y + e_y e_x has T_L S_L = 2
    assert contract_cartesian(2 * k1 * k2, 2 * k1 * k2, 2) == 2
    assert contract_cartesian(k1 * k2, k3**2, 2) == 0


@PROPERTY
@given(homogeneous_polynomials(), st.data())
def test_contraction_is_symmetric_and_bilinear(data, more):
    p, rank = data
    q = more.draw(homogeneous_polynomials(rank=rank))[0]
    assert sp.expand(contract_cartesian(p, q, rank) - contract_cartesian(q, p, rank)) == 0
    three_p = contract_cartesian(3 * p, q, rank)
    assert sp.expand(three_p - 3 * contract_cartesian(p, q, rank)) == 0


def test_contraction_rank_mismatch():
    with pytest.raises(ValueError, match="rank=2"):
        contract_cartesian(k1**2, k1**3, 2)


# ------------------------------------------------------------------ Laplacian and STF part


def test_laplacian_examples():
    # common practice: Laplacian of |k|^2 is 6, of k1^2 k2^2 is 2 k2^2 + 2 k1^2
    assert laplacian_cartesian(NORM_SQUARED) == 6
    assert laplacian_cartesian(k1**2 * k2**2) == 2 * k1**2 + 2 * k2**2
    assert laplacian_cartesian(sp.Integer(7)) == 0


def test_harmonic_part_rank_two_is_trace_free_part():
    # common practice: T_<ij> = T_ij - delta_ij T_kk/3
    p = 2 * k1**2 + 5 * k3**2 + k1 * k2
    expected = p - sp.Rational(7, 3) * NORM_SQUARED
    assert sp.expand(harmonic_part_cartesian(p, 2) - expected) == 0


def test_harmonic_part_rank_three_of_unit_vector():
    # Thorne (1980) eq. (2.3): n_<ijk> = n_i n_j n_k - (1/5)(n_i delta_jk + 2 perms)
    expected = k3**3 - sp.Rational(3, 5) * k3 * NORM_SQUARED
    assert sp.expand(harmonic_part_cartesian(k3**3, 3) - expected) == 0


@pytest.mark.parametrize("rank", range(0, 9))
def test_norm_of_stf_unit_vector(rank):
    # Thorne (1980) eq. (2.5) / conventions.md: n_<L> n_L = l!/(2l-1)!!
    n = (sp.Rational(2, 7), sp.Rational(3, 7), sp.Rational(6, 7))
    value = contract_cartesian(harmonic_part_cartesian(power_of_dot(n, rank), rank), power_of_dot(n, rank), rank)
    assert value == sp.Rational(factorial(rank), double_factorial(2 * rank - 1))


@pytest.mark.parametrize("rank", range(0, 7))
def test_stf_overlap_is_legendre(rank):
    # conventions.md (Thorne 1980): n_<L> n'_<L> = (l!/(2l-1)!!) P_l(n.n')
    n = (sp.Rational(2, 3), sp.Rational(1, 3), sp.Rational(2, 3))
    n_prime = (sp.Rational(3, 5), 0, sp.Rational(4, 5))
    cosine = sum(a * b for a, b in zip(n, n_prime))
    first = harmonic_part_cartesian(power_of_dot(n, rank), rank)
    second = harmonic_part_cartesian(power_of_dot(n_prime, rank), rank)
    expected = sp.Rational(factorial(rank), double_factorial(2 * rank - 1)) * sp.legendre(rank, cosine)
    assert contract_cartesian(first, second, rank) == expected


@PROPERTY
@given(homogeneous_polynomials(max_rank=7))
@example((sp.Integer(3), 0))
@example((k2, 1))
def test_harmonic_part_is_harmonic_idempotent_projection(data):
    p, rank = data
    harmonic = harmonic_part_cartesian(p, rank)
    assert is_harmonic(harmonic)
    assert sp.expand(harmonic_part_cartesian(harmonic, rank) - harmonic) == 0
    if harmonic != 0:
        assert set(sum(key) for key in monomial_coefficients(harmonic, rank)) == {rank}
    # the removed part is a trace: divisible by |k|^2
    remainder = sp.Poly(sp.expand(p - harmonic), *PROBE)
    if not remainder.is_zero:
        _, rest = sp.div(remainder, sp.Poly(NORM_SQUARED, *PROBE))
        assert rest.is_zero


@PROPERTY
@given(homogeneous_polynomials(max_rank=6), st.data())
def test_stf_projection_is_orthogonal(data, more):
    # T_<L> S_L = T_<L> S_<L>: the trace part of S drops out against an STF tensor
    p, rank = data
    q = more.draw(homogeneous_polynomials(rank=rank))[0]
    harmonic_p = harmonic_part_cartesian(p, rank)
    assert sp.expand(
        contract_cartesian(harmonic_p, q, rank) - contract_cartesian(harmonic_p, harmonic_part_cartesian(q, rank), rank)
    ) == 0


def test_harmonic_part_symbolic_coefficients():
    a, b = sp.symbols("a b")
    p = a * k1**2 + b * k2 * k3
    harmonic = harmonic_part_cartesian(p, 2)
    assert sp.expand(harmonic - (p - a * NORM_SQUARED / 3)) == 0
    assert is_harmonic(harmonic)


def test_is_harmonic_examples():
    assert is_harmonic(k1**2 - k2**2)
    assert is_harmonic(sp.Integer(1))
    assert not is_harmonic(NORM_SQUARED)


def test_speed_rank_ten():
    # regression guard: the trace removal works on coefficient dicts, not on expanded products
    p = sp.expand((k1 + 2 * k2 - k3) ** 10 + k1**4 * k2**3 * k3**3)
    harmonic = harmonic_part_cartesian(p, 10)
    assert is_harmonic(harmonic)
    coefficient_count = len(list(itertools.islice(monomial_coefficients(harmonic, 10), 1000)))
    assert 0 < coefficient_count <= 66
