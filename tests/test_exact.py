"""Tests of stfalgebra/exact.py: the exact coefficient engine against sympy (an outside
reference: every identity is checked by converting both sides to sympy and expanding)."""

from __future__ import annotations

from fractions import Fraction

import pytest
import sympy as sp
from hypothesis import example, given, settings, strategies as st

from stfalgebra.exact import (
    ExactPolynomial, NotRepresentableError, SurdConstant, exact, log_of_rational,
)
from stfalgebra.symbols import delta, nu, r

_NAMES = ["I", "delta", "nu", "r", "rinv", "rdot", "phidot", "G", "m", "pi", "EulerGamma", "log2", "log3", "log_x"]

monomials = st.tuples(st.sampled_from(_NAMES), st.integers(0, 3), st.fractions(max_denominator=9, min_value=-5, max_value=5))


@st.composite
def polynomials(draw, size=4):
    total = ExactPolynomial(0)
    for name, power, coefficient in draw(st.lists(monomials, min_size=0, max_size=size)):
        total = total + exact(name) ** power * coefficient
    return total


def _reduced(expr):
    """sympy's own normal form of the same rules: expand with I**2 = -1 (automatic) and
    delta**2 -> 1 - 4 nu (polynomial remainder)."""
    expr = sp.expand(expr)
    return sp.expand(sp.rem(sp.Poly(expr, delta), sp.Poly(delta**2 - 1 + 4 * nu, delta)).as_expr()) if expr.has(delta) else expr


@settings(max_examples=60, deadline=None)
@given(polynomials(), polynomials())
@example(ExactPolynomial(0), ExactPolynomial(1))
def test_ring_operations_agree_with_sympy(a, b):
    for value, reference in ((a + b, a.to_sympy() + b.to_sympy()), (a - b, a.to_sympy() - b.to_sympy()),
                             (a * b, a.to_sympy() * b.to_sympy())):
        assert sp.expand(_reduced(value.to_sympy()) - _reduced(reference)) == 0


@settings(max_examples=60, deadline=None)
@given(polynomials())
def test_text_form_parses_back_to_the_same_polynomial(a):
    parsed = sp.sympify(a.to_text(), locals={"nu": nu, "delta": delta, "r": r, **{
        name: sp.Symbol(name, real=True) for name in ("rdot", "phidot")}, "G": sp.Symbol("G", positive=True),
        "m": sp.Symbol("m", positive=True), "x": sp.Symbol("x", positive=True)})
    assert ExactPolynomial.from_sympy(parsed) == a


@settings(max_examples=60, deadline=None)
@given(polynomials())
def test_conjugate_real_and_imaginary_parts(a):
    assert a.real_part() + exact("I") * a.imaginary_part() == a
    assert a.conjugate() == a.real_part() - exact("I") * a.imaginary_part()
    assert sp.expand(sp.conjugate(a.to_sympy()) - a.conjugate().to_sympy()) == 0


def test_normal_form_rules():
    d, n, I, rr, ri = (exact(k) for k in ("delta", "nu", "I", "r", "rinv"))
    assert d**2 == 1 - 4 * n and d**3 == d - 4 * n * d
    assert I**2 == -1 and I**4 == 1
    assert rr * ri == 1 and rr**2 * ri**3 == ri
    assert (rr**-2) == ri**2 and (3 * rr) ** -1 == ri / 3
    assert hash(d**2) == hash(1 - 4 * n)


def test_division_and_refusals():
    n = exact("nu")
    assert (n * n + n) / n == n + 1
    with pytest.raises(ValueError):
        (n + 1) / (n + 2)
    with pytest.raises(ZeroDivisionError):
        n / 0
    with pytest.raises(ValueError):
        (n + 1) ** -1
    with pytest.raises(NotRepresentableError):
        ExactPolynomial.from_sympy(sp.sqrt(nu))
    with pytest.raises(NotRepresentableError):
        ExactPolynomial.from_sympy(sp.exp(nu))


@pytest.mark.parametrize("value", [Fraction(3, 2), Fraction(10, 1), Fraction(15, 14), Fraction(1, 97), 6])
def test_logarithms_of_rationals_split_over_primes(value):
    # log(6) = log(2) + log(3) etc.: the prime split equals the logarithm to 50 digits (mpmath via sympy)
    assert abs(sp.N(log_of_rational(value).to_sympy() - sp.log(sp.Rational(value)), 60)) < sp.Float("1e-50")
    assert ExactPolynomial.from_sympy(sp.log(6) - sp.log(2) - sp.log(3)) == 0


@given(st.fractions(min_value=-20, max_value=20, max_denominator=50), st.fractions(min_value=0, max_value=50, max_denominator=50))
def test_surd_constant_equals_its_value(rational, radicand):
    value = SurdConstant(rational, radicand)
    assert sp.simplify(value.to_sympy() - sp.Rational(rational) * sp.sqrt(sp.Rational(radicand))) == 0
    assert sp.sympify(value.to_text()) == value.to_sympy()
    assert value.squared() == rational**2 * radicand


def test_polynomials_pickle_and_compare_with_sympy():
    import pickle

    a = exact("nu") * 3 + exact("I") / 2
    assert pickle.loads(pickle.dumps(a)) == a
    assert a == 3 * nu + sp.I / 2 and a != 3 * nu
    assert sp.sympify(a) == 3 * nu + sp.I / 2
