"""Tests of stfalgebra.pnseries: construction, bookkeeping of known_through, arithmetic
against sympy's own ``series``, substitution, display."""

from __future__ import annotations

import fractions
import math

import pytest
import sympy as sp
from hypothesis import example, given, settings
from hypothesis import strategies as st

from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.pnseries import PNSeries

eps, a, b, y = sp.symbols("eps a b y")
half = sp.Rational(1, 2)


def _sympy_series_coefficients(expr: sp.Expr, top_power: int) -> dict[int, sp.Expr]:
    """Reference: sympy's own Laurent series of ``expr`` in eps through eps**top_power."""
    lift = 8  # sympy's series needs a non-negative number of terms: expand eps^lift expr
    ser = sp.series(expr * eps**lift, eps, 0, top_power + lift + 1).removeO()
    poly = sp.expand(ser)
    out: dict[int, sp.Expr] = {}
    for term in sp.Add.make_args(poly):
        coeff, power = term.as_coeff_exponent(eps)
        out[int(power) - lift] = out.get(int(power) - lift, 0) + coeff
    return {k: v for k, v in out.items() if sp.simplify(v) != 0}


def _same(series: PNSeries, expr: sp.Expr) -> None:
    """Every known coefficient of ``series`` agrees with sympy's series of ``expr``."""
    top = int(2 * series.known_through)
    ref = _sympy_series_coefficients(expr, top)
    mine = {int(2 * k): v for k, v in series.terms.items()}
    for k in set(ref) | set(mine):
        if k <= top:
            assert sp.simplify(mine.get(k, 0) - ref.get(k, 0)) == 0, (k, mine.get(k), ref.get(k))


# ----------------------------------------------------------------------------- construction
def test_constructor_drops_zeros_and_orders_canonically():
    s1 = PNSeries({1: a, 0: 1, half: 0}, known_through=1)
    s2 = PNSeries({0: 1, 1: a}, known_through=1)
    assert s1 == s2 and hash(s1) == hash(s2)
    assert s1.orders == (0, 1)
    assert s1.coefficient(half) == 0


def test_constructor_accepts_fraction_and_rational_orders():
    s = PNSeries({fractions.Fraction(3, 2): a, sp.Rational(1, 2): b}, known_through=2)
    assert s.orders == (half, sp.Rational(3, 2))


def test_coefficients_stored_as_given():
    coeff = a * (1 + b)
    s = PNSeries({0: coeff}, 0)
    assert s.coefficient(0) is coeff or s.coefficient(0) == coeff
    assert s.coefficient(0).is_Mul


@pytest.mark.parametrize("order", [1.0, sp.Float(0.5), True, "1"])
def test_float_or_bad_type_order_rejected(order):
    with pytest.raises(TypeError, match="order"):
        PNSeries({order: 1}, known_through=2)


def test_third_order_rejected():
    with pytest.raises(ValueError, match="1/3"):
        PNSeries({sp.Rational(1, 3): 1}, known_through=2)


def test_order_beyond_known_through_rejected():
    with pytest.raises(ValueError, match="beyond known_through"):
        PNSeries({2: a}, known_through=1)


def test_float_coefficient_rejected():
    with pytest.raises(TypeError, match="0.5"):
        PNSeries({0: 0.5}, known_through=1)
    with pytest.raises(TypeError, match="no floats"):
        PNSeries({0: a * sp.Float(0.5)}, known_through=1)


def test_known_through_float_rejected():
    with pytest.raises(TypeError, match="known_through"):
        PNSeries({0: 1}, known_through=1.5)


def test_terms_must_be_mapping():
    with pytest.raises(TypeError, match="mapping"):
        PNSeries([(0, 1)], known_through=1)


def test_equality_is_structural():
    # a*(1+b) and a + a*b are equal mathematically but not structurally
    assert PNSeries({0: a * (1 + b)}, 1) != PNSeries({0: a + a * b}, 1)
    assert PNSeries({0: a * (1 + b)}, 1).expand() == PNSeries({0: a + a * b}, 1)
    assert PNSeries({0: 1}, 1) != PNSeries({0: 1}, 2)
    assert PNSeries({0: 1}, 1) != 1


# ----------------------------------------------------------------------------- views
def test_coefficient_beyond_known_raises():
    s = PNSeries({0: 1, 1: a}, known_through=sp.Rational(3, 2))
    assert s.coefficient(sp.Rational(3, 2)) == 0
    with pytest.raises(OrderBeyondInputsError, match="order 2"):
        s.coefficient(2)


def test_exact_series_answers_every_order():
    s = PNSeries({0: 1}, sp.oo)
    assert s.is_exact and s.known_through == math.inf and s.known_through == sp.oo
    assert s.coefficient(100) == 0


def test_leading_order_and_coefficient():
    s = PNSeries({-1: a, 0: 1}, 1)
    assert s.leading_order == -1 and s.leading_coefficient == a
    with pytest.raises(OrderBeyondInputsError):
        PNSeries({}, 1).leading_order
    with pytest.raises(ValueError):
        PNSeries({}, sp.oo).leading_coefficient


def test_to_expression():
    s = PNSeries({-1: a, half: b}, 1)
    assert s.to_expression(eps) == a / eps**2 + b * eps


def test_truncate_shift_map():
    s = PNSeries({0: 1, 1: a, 2: b}, 2)
    assert s.truncate(1) == PNSeries({0: 1, 1: a}, 1)
    with pytest.raises(OrderBeyondInputsError):
        s.truncate(sp.Rational(5, 2))
    assert s.shift(-1) == PNSeries({-1: 1, 0: a, 1: b}, 1)
    assert s.shift(half).known_through == sp.Rational(5, 2)
    assert s.map_coefficients(lambda v: sp.sympify(v).subs(a, 0)) == PNSeries({0: 1, 2: b}, 2)


# ----------------------------------------------------------------------------- from_expression
def test_from_expression_half_integer_and_negative_orders():
    s = PNSeries.from_expression(a / eps**2 + b * eps + 3 * eps**3, eps, 1)
    assert s == PNSeries({-1: a, half: b}, 1)


def test_from_expression_keeps_sqrt_pi_log_of_other_symbols():
    expr = sp.sqrt(y) + sp.pi * eps**2 * sp.log(y)
    s = PNSeries.from_expression(expr, eps, sp.oo)
    assert s.coefficient(0) == sp.sqrt(y) and s.coefficient(1) == sp.pi * sp.log(y)


def test_from_expression_rational_function():
    expr = (1 + a * eps) / (1 - b * eps**2)
    s = PNSeries.from_expression(expr, eps, 2)
    _same(s, expr)
    assert s.known_through == 2


def test_from_expression_exact_polynomial_division():
    s = PNSeries.from_expression((1 - eps**4) / (1 - eps**2), eps, sp.oo)
    assert s == PNSeries({0: 1, 1: 1}, sp.oo)


@pytest.mark.parametrize("bad", [sp.sqrt(eps), eps**half * a, sp.log(eps), sp.exp(eps),
                                 a**eps])
def test_from_expression_non_integer_power_rejected(bad):
    with pytest.raises(ValueError):
        PNSeries.from_expression(1 + bad, eps, 2)


def test_from_expression_infinite_series_needs_finite_order():
    with pytest.raises(ValueError, match="known_through"):
        PNSeries.from_expression(1 / (1 - eps), eps, sp.oo)


def test_from_expression_eps_must_be_symbol():
    with pytest.raises(TypeError, match="Symbol"):
        PNSeries.from_expression(1, 1 / sp.Symbol("c"), 1)


# ----------------------------------------------------------------------------- arithmetic
def test_scalar_arithmetic():
    s = PNSeries({0: 1, 1: a}, 1)
    assert s + 1 == PNSeries({0: 2, 1: a}, 1)
    assert 1 - s == PNSeries({1: -a}, 1)
    assert 2 * s == PNSeries({0: 2, 1: 2 * a}, 1)
    assert s * 0 == PNSeries({}, sp.oo)
    assert s / 2 == PNSeries({0: half, 1: a / 2}, 1)
    with pytest.raises(ZeroDivisionError):
        s / 0
    with pytest.raises(TypeError, match="no floats"):
        s * 0.5


def test_sum_known_through_is_minimum():
    s = PNSeries({0: 1, 2: a}, 2) + PNSeries({0: 1, 1: b}, 1)
    assert s == PNSeries({0: 2, 1: b}, 1)


def test_product_known_through_uses_leading_orders():
    # lead -1 known through 0, times lead 1 known through 2:
    # min(-1 + 2, 1 + 0) = 1
    p = PNSeries({-1: a, 0: 1}, 0) * PNSeries({1: b}, 2)
    assert p.known_through == 1
    assert p == PNSeries({0: a * b, 1: b}, 1)


def test_product_with_series_vanishing_through_known():
    # 0 + O(eps^2) times exact 1 + eps^2: known through min(1 + 0, 0 + 1/2 + ... ) = 1/2
    z = PNSeries({}, half)
    p = z * PNSeries({0: 1, 1: 1}, sp.oo)
    assert p.known_through == half and p.orders == ()


def test_exact_product_stays_exact():
    p = PNSeries({0: 1, 1: a}, sp.oo) * PNSeries({0: 1, 1: -a}, sp.oo)
    assert p == PNSeries({0: 1, 2: -a**2}, sp.oo)


def test_inverse_needs_nonzero_leading_coefficient():
    with pytest.raises(ZeroDivisionError):
        PNSeries({}, 2).inverse()
    with pytest.raises(ZeroDivisionError, match="vanishes"):
        PNSeries({0: a - a * (1 + b) + a * b, 1: 1}, 2).inverse()


def test_inverse_of_exact_multiterm_needs_through():
    s = PNSeries({0: 1, 1: a}, sp.oo)
    with pytest.raises(ValueError, match="through"):
        s.inverse()
    assert s.inverse(through=2) == PNSeries({0: 1, 1: -a, 2: a**2}, 2)
    assert PNSeries({-1: a}, sp.oo).inverse() == PNSeries({1: 1 / a}, sp.oo)


def test_inverse_known_through_bookkeeping():
    inv = PNSeries({-1: a, 0: 1}, 1).inverse()
    # relative part known through 2 orders; leading order 1 -> known through 3
    assert inv.known_through == 3
    _same(inv, 1 / (a / eps**2 + 1))


def test_division_by_exact_series_expands_as_far_as_needed():
    q = PNSeries({0: 1}, 2) / PNSeries({0: 1, 1: -a}, sp.oo)
    assert q == PNSeries({0: 1, 1: a, 2: a**2}, 2)
    with pytest.raises(ValueError, match="infinite"):
        PNSeries({0: 1}, sp.oo) / PNSeries({0: 1, 1: -a}, sp.oo)


def test_power_of_leading_order_must_stay_half_integer():
    with pytest.raises(ValueError, match="multiple of 1/2"):
        PNSeries({half: 1}, 2) ** sp.Rational(1, 2)
    s = PNSeries({1: 4 * a}, 2) ** sp.Rational(1, 2)
    assert s.leading_order == half and s.leading_coefficient == 2 * sp.sqrt(a)


def test_power_rejects_float_and_symbolic_exponents():
    s = PNSeries({0: 1}, 2)
    with pytest.raises(TypeError):
        s ** 0.5
    with pytest.raises(TypeError):
        s ** a


def test_power_zero_and_positive_integer():
    s = PNSeries({0: 2, 1: a}, 1)
    assert s**0 == PNSeries({0: 1}, sp.oo)
    assert s**2 == s * s


def test_power_known_through():
    # lead order -1, known through 1: (relative known 2) ** (-3/2) -> lead 3/2, known 7/2
    s = PNSeries({-1: 1, 0: a, 1: b}, 1) ** sp.Rational(-3, 2)
    assert s.leading_order == sp.Rational(3, 2)
    assert s.known_through == sp.Rational(7, 2)
    _same(s, (1 / eps**2 + a + b * eps**2) ** sp.Rational(-3, 2))


# hypothesis: random rational functions in eps against sympy's own series
small = st.integers(min_value=-3, max_value=3)
nonzero = st.integers(min_value=1, max_value=3)


def _rational_function(num: list[int], den: list[int], d0: int, low: int) -> sp.Expr:
    numer = sum(cf * eps**k for k, cf in enumerate(num)) + a * eps
    denom = d0 + sum(cf * eps**(k + 1) for k, cf in enumerate(den))
    return eps**low * numer / denom


rational_functions = st.builds(
    _rational_function,
    st.lists(small, min_size=1, max_size=3).filter(lambda v: v[0] != 0),
    st.lists(small, min_size=0, max_size=2),
    nonzero,
    st.integers(min_value=-2, max_value=1),
)
known_orders = st.integers(min_value=1, max_value=4).map(lambda k: sp.Rational(k, 2))


@settings(max_examples=12, deadline=None)
@given(rational_functions, rational_functions, known_orders, known_orders)
@example(eps**-2 * (1 + a * eps), 1 + eps + a * eps, sp.Rational(1, 2), 2)
@example((a * eps + 1) / eps, (a * eps + 1) / eps**2, half, half)  # negative top order
def test_product_matches_sympy_series(f, g, kf, kg):
    sf = PNSeries.from_expression(f, eps, kf + PNSeries.from_expression(f, eps, 4).leading_order)
    sg = PNSeries.from_expression(g, eps, kg + PNSeries.from_expression(g, eps, 4).leading_order)
    prod = sf * sg
    assert prod.known_through == min(sf.leading_order + sg.known_through,
                                     sg.leading_order + sf.known_through)
    _same(prod, f * g)


@settings(max_examples=12, deadline=None)
@given(rational_functions, known_orders)
def test_inverse_matches_sympy_series(f, k):
    sf = PNSeries.from_expression(f, eps, k + PNSeries.from_expression(f, eps, 4).leading_order)
    inv = sf.inverse()
    assert inv.known_through == sf.known_through - 2 * sf.leading_order
    _same(inv, 1 / f)
    assert (sf * inv).truncate(inv.known_through + sf.leading_order).expand().terms == {0: 1}


@settings(max_examples=10, deadline=None)
@given(rational_functions, st.sampled_from([sp.Rational(1, 2), sp.Rational(-1, 2), 3, -2,
                                            sp.Rational(2, 3)]))
def test_power_matches_sympy_series(f, p):
    sf = PNSeries.from_expression(f, eps, 1 + PNSeries.from_expression(f, eps, 4).leading_order)
    if (sf.leading_order * sp.Rational(p) * 2).q != 1:
        with pytest.raises(ValueError):
            sf**p
        return
    result = sf**p
    assert result.known_through == sf.leading_order * p + (sf.known_through - sf.leading_order)
    lead = sf.leading_coefficient
    # compare the relative part so that sympy's branch for c0**p plays no role
    rel = sp.expand(f / (lead * eps ** (2 * sf.leading_order)))
    _same((result / lead**p).shift(-sf.leading_order * p), rel**p)


@settings(max_examples=10, deadline=None)
@given(st.lists(small, min_size=2, max_size=4), known_orders)
def test_truncated_inputs_agree_with_exact_product(cfs, k):
    # the known part of a product of truncated series never depends on the dropped terms
    f = sum(cf * eps**i for i, cf in enumerate(cfs)) + 1
    g = 1 + a * eps + b * eps**3
    exact = PNSeries.from_expression(f, eps, sp.oo) * PNSeries.from_expression(g, eps, sp.oo)
    trunc = PNSeries.from_expression(f, eps, k) * PNSeries.from_expression(g, eps, 1)
    assert exact.truncate(trunc.known_through).expand() == trunc.expand()


# ----------------------------------------------------------------------------- substitution
def test_substitute_against_direct_expansion():
    s = PNSeries({0: y**2, half: 1 / y, 1: sp.sqrt(y) * a}, 1)
    t = PNSeries({0: 1, half: b, 1: a}, 1)
    result = s.substitute(y, t, eps)
    expr = s.to_expression(eps).subs(y, t.to_expression(eps))
    _same(result, expr)
    assert result.known_through == 1


def test_substitute_lowers_known_through_from_substituted_series():
    s = PNSeries({0: y, 2: 1}, 2)
    t = PNSeries({0: 1}, half)
    assert s.substitute(y, t, eps).known_through == half


def test_substitute_leading_order_needs_remainder_powers():
    s = PNSeries({0: 1 / y, 1: 1 / y**2}, 1)
    t = PNSeries({-1: a, 0: 1}, 0)
    with pytest.raises(ValueError, match="remainder_powers"):
        s.substitute(y, t, eps)
    result = s.substitute(y, t, eps, remainder_powers=(-3, 0))
    # remainder beyond order 1 with y**-3 moves up by 3: known through 4; known terms:
    # 0 + K(t**-1) = 0 + 1 = 1 and 1 + K(t**-2) = 1 + 2 = 3
    assert result.known_through == 1
    _same(result, s.to_expression(eps).subs(y, a / eps**2 + 1))


def test_substitute_into_exact_series():
    s = PNSeries({0: 1 / y}, sp.oo)
    t = PNSeries({-1: a, 0: 1}, 0)
    result = s.substitute(y, t, eps)
    assert result.known_through == 2
    _same(result, 1 / (a / eps**2 + 1))


def test_substitute_refuses_symbol_inside_function():
    with pytest.raises(ValueError, match="monomial"):
        PNSeries({0: sp.log(y)}, 1).substitute(y, PNSeries({0: 1}, 1), eps)


def test_substitute_checks_eps():
    with pytest.raises(ValueError, match="expansion parameter"):
        PNSeries({0: y}, 1).substitute(eps, PNSeries({0: 1}, 1), eps)
    with pytest.raises(ValueError, match="contains"):
        PNSeries({0: y}, 1).substitute(y, eps, eps)


def test_substitute_scalar():
    assert PNSeries({0: y, 1: y**2}, 1).substitute(y, 2, eps) == PNSeries({0: 2, 1: 4}, 1)


# ----------------------------------------------------------------------------- display
def test_repr_shows_first_unknown_order():
    assert repr(PNSeries({0: 1, half: -2}, 1)) == "PNSeries(1 - 2*eps + O(eps**3))"
    assert repr(PNSeries({}, sp.oo)) == "PNSeries(0)"
    assert repr(PNSeries({}, 0)) == "PNSeries(O(eps))"


def test_latex():
    text = PNSeries({0: 1, 1: a}, 1)._repr_latex_()
    assert text == r"$1 + a \epsilon^{2} + O(\epsilon^{3})$"
