"""Tests of stfalgebra/orders.py: the one PN-order type and the bounded parser at the edge."""

from __future__ import annotations

from fractions import Fraction

import pytest
import sympy as sp
from hypothesis import example, given, strategies as st

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.orders import PNOrder, as_pn_order, parse_pn_order

half_integers = st.integers(min_value=-40, max_value=40).map(PNOrder.from_twice)


@given(half_integers, half_integers)
@example(PNOrder(0), PNOrder(1, 2))
def test_sums_and_differences_of_orders_stay_orders(a, b):
    assert isinstance(a + b, PNOrder) and isinstance(a - b, PNOrder) and isinstance(-a, PNOrder)
    assert (a + b).twice == a.twice + b.twice
    assert a + b == Fraction(a) + Fraction(b)


@given(half_integers)
def test_order_equals_and_prints_like_its_fraction(a):
    assert a == Fraction(a.twice, 2) and hash(a) == hash(Fraction(a.twice, 2))
    assert sp.Rational(a.twice, 2) == sp.sympify(a)
    assert parse_pn_order(str(abs(a))) == abs(a)
    assert a.to_json() == str(Fraction(a.twice, 2))


@pytest.mark.parametrize("text, value", [("1.5", Fraction(3, 2)), ("3/2", Fraction(3, 2)), ("2", 2),
                                         (" 0.50 ", Fraction(1, 2)), (1.5, Fraction(3, 2)),
                                         (sp.Rational(5, 2), Fraction(5, 2))])
def test_parse_accepts_decimals_fractions_and_exact_numbers(text, value):
    assert parse_pn_order(text) == value


@pytest.mark.parametrize("text", ["1e100000000", "1e3", "abc", "", "1.25", "1/3", "-1", "nan", "inf",
                                  "1" * 60, "3/0", float("nan"), float("inf"), 1e300, True, None, 0.3])
def test_parse_refuses_malformed_or_huge_values_with_one_line(text):
    with pytest.raises(ValueError) as info:
        parse_pn_order(text, "--pn")
    message = str(info.value)
    assert "\n" not in message and "--pn" in message and len(message) < 200


def test_parse_bounds_name_the_largest_order():
    with pytest.raises(OrderBeyondInputsError, match=r"through order 3/2 at most"):
        parse_pn_order("2", "--pn-relative", maximum=Fraction(3, 2))


def test_constructor_refuses_floats_and_non_half_integers():
    with pytest.raises(TypeError):
        PNOrder(1.5)
    with pytest.raises(ValueError):
        PNOrder(1, 3)
    with pytest.raises(TypeError, match="pn"):
        as_pn_order("1", "pn")
