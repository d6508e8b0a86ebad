"""Tests of stfalgebra/checking/compare.py: PN-order comparison of expressions."""

from __future__ import annotations

import json
import math
import time

import mpmath
import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra import symbols as S
from stfalgebra.checking.compare import (
    MAX_EXPANDED_TERMS,
    compare_expressions,
    compare_with_derived,
    parse_pn_order,
    time_limit,
)
from stfalgebra.checking.safe_parser import parse_expression
from stfalgebra.errors import ExpressionRefusedError, OrderBeyondInputsError, RefusedModeError

x, nu, delta, pi = S.x, S.nu, S.delta, sp.pi
R = sp.Rational
# Hhat_22 of circular orbits through 2PN, Blanchet, Living Rev. Relativ. 17, 2 (2014) (from memory).
HHAT22 = (1 + x * (-R(107, 42) + R(55, 42) * nu) + 2 * pi * x**R(3, 2)
          + x**2 * (-R(2173, 1512) - R(1069, 216) * nu + R(2047, 1512) * nu**2))
HHAT22_1PN_TEXT = "1 + x*(-107/42 + 55*nu/42)"


def _order(report, order):
    return next(o for o in report.orders if o.order == order)


def test_published_1pn_agrees():
    report = compare_expressions(parse_expression(HHAT22_1PN_TEXT), HHAT22, pn=1)
    assert report.agree
    assert [o.label for o in report.orders] == ["x^0", "x^(1/2)", "x^1"]
    assert "result: AGREE" in report.to_text()


def test_changed_coefficient_is_named_by_order_and_power_of_nu():
    report = compare_expressions(parse_expression("1 + x*(-107/42 + 55*nu/43)"), HHAT22, pn=1)
    assert not report.agree
    terms = {t.nu_power: t for t in _order(report, 1).terms}
    assert terms[0].status == "agree"
    assert terms[1].status == "differ" and terms[1].difference == R(55, 43) - R(55, 42)
    text = report.to_text()
    assert "nu^1: differ: yours 55/43, derived 55/42" in text
    assert "result: DIFFER at x^1" in text


def test_terms_beyond_pn_are_reported_not_compared():
    user = parse_expression("1 + x*(-107/42 + 55*nu/42) + 5 x^(3/2) + delta^2 x^2")
    report = compare_expressions(user, HHAT22, pn=1)
    assert report.agree
    assert [(label, c) for _, label, c in report.beyond] == [("x^(3/2)", 5), ("x^2", 1 - 4 * nu)]
    assert "not compared" in report.to_text()


def test_canonical_forms_agree():
    # log(16 x) = 4 log 2 + log x; delta^2 = 1 - 4 nu; 2 pi x^(3/2) written as 2 pi x sqrt(x).
    derived = x**3 * (-R(428, 105) * sp.log(16 * x)) + 2 * pi * x**R(3, 2) + delta**2 * x
    user = parse_expression("x^3 (-428/105)(4 log(2) + log(x)) + 2 pi x sqrt(x) + (1 - 4nu) x")
    assert compare_expressions(user, derived, pn=3).agree


def test_zero_orders_are_listed_as_agreeing():
    report = compare_expressions(sp.Integer(1), sp.Integer(1), pn=R(3, 2))
    assert [(o.label, o.status, o.terms) for o in report.orders[1:]] == [
        ("x^(1/2)", "agree", ()), ("x^1", "agree", ()), ("x^(3/2)", "agree", ())]


def test_negative_orders_of_the_user_are_compared():
    report = compare_expressions(parse_expression("1/x + 1"), sp.Integer(1), pn=0)
    assert report.orders[0].label == "x^-1" and report.orders[0].status == "differ"


def test_rational_function_is_expanded():
    user = parse_expression("1/(1 + x (107/42 - 55 nu/42))")
    report = compare_expressions(user, HHAT22, pn=1)
    assert report.agree and report.beyond_known_through == 2 and report.beyond


def test_non_polynomial_in_nu_is_compared_as_a_whole():
    report = compare_expressions(parse_expression("sqrt(1 - 4 nu) x^(1/2)"), delta * sp.sqrt(x), pn=R(1, 2))
    term = _order(report, R(1, 2)).terms[0]
    assert term.nu_power is None and term.status == "differ"  # the sign of delta is not fixed by nu
    assert "not a power of nu" in report.to_text()


def test_general_orbit_expansion_in_inverse_c():
    # Leading general-orbit Hhat_22 (conventions.md), plus a made-up 1PN term.
    leading = S.m / S.r + S.r**2 * S.phidot**2 + 2 * sp.I * S.r * S.rdot * S.phidot - S.rdot**2
    derived = leading + S.m**2 / (S.r**2 * S.c**2)
    user = parse_expression(r"\frac{m}{r} + r^2\dot\phi^2 + 2 i r \dot r \dot\phi - \dot r^2 + m^2/(r c)^2",
                            orbit="general")
    report = compare_expressions(user, derived, orbit="general", pn=1)
    assert report.agree
    assert [o.label for o in report.orders] == ["c^0", "1/c^1", "1/c^2"]
    wrong = compare_expressions(user + S.m / (S.r * S.c), derived, orbit="general", pn=1)
    assert [o.label for o in wrong.orders if o.status == "differ"] == ["1/c^1"]


def test_json_is_serialisable_and_stable():
    report = compare_expressions(parse_expression("1 + x*(-107/42 + 55*nu/43)"), HHAT22, pn=1)
    text = json.dumps(report.to_json(), sort_keys=True)
    assert json.loads(text)["verdict"] == "differ"
    again = compare_expressions(parse_expression("1 + x*(-107/42 + 55*nu/43)"), HHAT22, pn=1)
    assert json.dumps(again.to_json(), sort_keys=True) == text


@settings(max_examples=15, deadline=None)
@given(order=st.sampled_from([R(0), R(1, 2), R(1), R(3, 2), R(2)]), nu_power=st.integers(0, 3),
       numerator=st.integers(-50, 50).filter(bool), denominator=st.integers(1, 30))
def test_a_single_perturbation_is_located(order, nu_power, numerator, denominator):
    change = R(numerator, denominator)
    user = HHAT22 + change * nu**nu_power * x**order
    report = compare_expressions(user, HHAT22, pn=2)
    assert not report.agree
    differing = [(o.order, t.nu_power, t.difference) for o in report.orders for t in o.terms if t.status == "differ"]
    assert differing == [(order, nu_power, change)]


def test_size_guard_refuses_huge_expansions_quickly():
    user = parse_expression("(x + nu + delta + 1)^64 (x + nu + delta + 2)^64")
    start = time.perf_counter()
    with pytest.raises(ExpressionRefusedError, match=f"more than {MAX_EXPANDED_TERMS} terms"):
        compare_expressions(user, HHAT22, pn=1)
    assert time.perf_counter() - start < 2.0


def test_time_limit_interrupts():
    start = time.perf_counter()
    with pytest.raises(ExpressionRefusedError, match="took longer than 0.2 s"):
        with time_limit(0.2):
            while True:
                pass
    assert time.perf_counter() - start < 2.0


def test_time_limit_off_and_restored():
    # the previous SIGALRM handler and a cleared interval timer come back after the block
    import signal

    before = signal.getsignal(signal.SIGALRM)
    with time_limit(None):
        assert signal.getsignal(signal.SIGALRM) is before
    with time_limit(5):
        assert signal.getsignal(signal.SIGALRM) is not before
        assert signal.getitimer(signal.ITIMER_REAL)[0] > 0
    assert signal.getsignal(signal.SIGALRM) is before
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0


@pytest.mark.parametrize("bad", ["-1", "1/3", "x", "1e400", True, 0.3, None, "9" * 100])
def test_bad_orders_refused(bad):
    with pytest.raises(ValueError, match="PN order must be"):
        parse_pn_order(bad)


def test_good_orders():
    assert [parse_pn_order(v) for v in ("3/2", "1.5", 2, R(5, 2), 0.5)] == [R(3, 2), R(3, 2), 2, R(5, 2), R(1, 2)]


def test_bad_arguments():
    with pytest.raises(ValueError, match="orbit must be"):
        compare_expressions(x, x, orbit="elliptic", pn=1)
    with pytest.raises(TypeError, match="str"):
        compare_expressions("x", x, pn=1)


# --- against the toolkit's own derivation ------------------------------------------------

def test_published_hhat22_agrees_with_the_derivation():
    report = compare_with_derived(HHAT22_1PN_TEXT, 2, 2, pn=1)
    assert report.agree and report.label == "Hhat_2,2"


def test_published_hhat21_agrees_with_the_derivation():
    # Hhat_21 = (i delta/3)[x^(1/2) + x^(3/2)(-17/28 + 5 nu/7)], Blanchet LRR 2014 (from memory).
    text = r"\frac{i}{3}\delta\left(x^{1/2} + x^{3/2}\left(-\frac{17}{28} + \frac{5}{7}\nu\right)\right)"
    assert compare_with_derived(text, 2, 1, pn=R(3, 2)).agree


def test_sign_convention_flips_the_verdict():
    report = compare_with_derived(HHAT22_1PN_TEXT, 2, 2, pn=1, sign_convention="theta-phi")
    assert not report.agree


def test_general_orbit_leading_hhat22_agrees_with_the_derivation():
    # conventions.md: Hhat_22 = G m/r + r^2 phidot^2 + 2 i r rdot phidot - rdot^2 (G = 1).
    text = "m/r + r^2 phidot^2 + 2 i r rdot phidot - rdot^2"
    assert compare_with_derived(text, 2, 2, orbit="general", pn=0).agree


def test_refused_mode_propagates():
    # (4,0) is the DC memory, served through relative 2 beyond its leading x^0
    with pytest.raises((RefusedModeError, OrderBeyondInputsError), match="memory"):
        compare_with_derived("0", 4, 0, pn=sp.Rational(5, 2))


# ------------------------------------------- verdicts that are never wrong (issue 12)

from stfalgebra.checking.compare import SEPARATION, WORKING_DIGITS, canonical_logarithms  # noqa: E402
from stfalgebra.checking.safe_parser import parse_with_decimals  # noqa: E402

HHAT22_1PN = 1 + x * (-R(107, 42) + R(55, 42) * nu)


@given(a=st.integers(1, 10**6), b=st.integers(1, 10**6), c=st.integers(1, 10**6))
@settings(max_examples=60, deadline=None)
def test_canonical_logarithms_turn_log_identities_into_zero(a, b, c):
    # log(a b / c) = log a + log b - log c: an identity of the rationals (common practice)
    expression = sp.log(R(a * b, c)) - sp.log(a) - sp.log(b) + sp.log(c)
    assert sp.expand(canonical_logarithms(sp.expand_log(expression, force=True))) == 0


def test_canonical_logarithms_leave_what_cannot_be_factored_cheaply():
    huge = sp.nextprime(2**300) * sp.nextprime(2**301)
    assert canonical_logarithms(sp.log(huge)) == sp.log(huge)
    assert canonical_logarithms(sp.log(x) + sp.log(sp.pi)) == sp.log(x) + sp.log(sp.pi)


def test_exact_agreement_after_canonical_logarithms():
    # regression (false DIFFER): log(6) - log(2) - log(3) was kept as a non-zero difference
    report = compare_expressions(HHAT22_1PN + x * (sp.log(6) - sp.log(2) - sp.log(3)), HHAT22_1PN, pn=1)
    assert report.verdict == "agree" and report.agree and report.spot_check.passed


@pytest.mark.parametrize("extra", [sp.exp(-100), sp.exp(nu**64) - 1, sp.log(1 + nu**60), sp.exp(-150),
                                   R(1, 10**60)])
def test_tiny_differences_differ(extra):
    # regression (false AGREE): the former absolute threshold of 1e-30 hid these
    report = compare_expressions(HHAT22_1PN + x * extra, HHAT22_1PN, pn=1)
    assert report.verdict == "differ" and not report.agree


def test_threshold_is_relative_to_the_size_of_the_terms():
    # the same relative difference in a tiny and in a huge coefficient gives the same verdict
    for scale in (R(1, 10**40), R(10**40)):
        report = compare_expressions(x * scale * (1 + sp.exp(-60)), x * scale, pn=1)
        assert report.verdict == "differ", scale
    assert SEPARATION <= 1e-60 and WORKING_DIGITS >= 90


def test_cannot_decide_is_never_an_agreement():
    with mpmath.workdps(140):
        numerator = int(mpmath.floor(mpmath.pi * mpmath.mpf(10) ** 120))
    report = compare_expressions(HHAT22_1PN + x * (pi - R(numerator, 10**120)), HHAT22_1PN, pn=1)
    assert report.verdict == "cannot decide" and not report.agree
    assert "CANNOT DECIDE at x^1" in report.to_text()
    assert json.loads(json.dumps(report.to_json()))["verdict"] == "cannot decide"


def test_decimals_are_compared_at_their_precision():
    # sqrt(pi) = 1.7724538509055160272981674833411451827975494561223871282..., digits from mpmath
    parsed = parse_with_decimals("1.77245385090551602729816748334114518279754945612238/sqrt(pi)")
    report = compare_expressions(parsed.with_decimals, sp.Integer(1), pn=0, decimals=parsed.decimals)
    assert (report.verdict, report.digits, report.agree) == ("agrees to digits", 51, False)
    assert "AGREES TO 51 DIGITS" in report.to_text()
    rounded = parse_with_decimals("1.77245385090551602729816748334114518279754945612239/sqrt(pi)")
    assert compare_expressions(rounded.with_decimals, sp.Integer(1), pn=0, decimals=rounded.decimals).digits == 51
    # 1.3 units off in the last digit given: beyond the precision of the input
    wrong = parse_with_decimals("1.77245385090551602729816748334114518279754945612240/sqrt(pi)")
    assert compare_expressions(wrong.with_decimals, sp.Integer(1), pn=0, decimals=wrong.decimals).verdict == "differ"


_ZERO_IN_DISGUISE = st.sampled_from([
    sp.log(6) - sp.log(2) - sp.log(3),
    10 * sp.log(15) - 10 * sp.log(10) - 10 * sp.log(R(3, 2)),
    sp.log(R(1, 12)) + 2 * sp.log(2) + sp.log(3),
    (1 - 4 * nu - delta**2),
    sp.sqrt(12) - 2 * sp.sqrt(3),
    sp.log(sp.sqrt(8)) - R(3, 2) * sp.log(2),
    sp.exp(sp.log(7)) - 7,
    sp.log(-6) - sp.log(2) - sp.log(3) - sp.I * pi,
])


@given(zero=_ZERO_IN_DISGUISE, order=st.sampled_from([R(0), R(1, 2), R(1)]), power=st.integers(0, 2),
       factor=st.integers(-9, 9).filter(bool))
@settings(max_examples=100, deadline=None)
def test_fuzz_rewritten_expressions_always_agree(zero, order, power, factor):
    user = HHAT22_1PN + factor * zero * nu**power * x**order
    assert compare_expressions(user, HHAT22_1PN, pn=1).verdict == "agree"


_SMALL = st.one_of(
    st.integers(1, 300).map(lambda n: sp.exp(-n)),
    st.integers(1, 64).map(lambda n: sp.exp(nu**n) - 1),
    st.integers(1, 64).map(lambda n: sp.log(1 + nu**n)),
    st.integers(1, 80).map(lambda n: R(1, 10**n)),
    st.integers(2, 40).map(lambda n: pi - R(int(mpmath.floor(mpmath.pi * 10**n)), 10**n)),
)


@given(small=_SMALL, order=st.sampled_from([R(0), R(1, 2), R(1)]), power=st.integers(0, 2),
       sign=st.sampled_from([1, -1]))
@settings(max_examples=100, deadline=None)
def test_fuzz_perturbed_expressions_never_agree(small, order, power, sign):
    user = HHAT22_1PN + sign * small * nu**power * x**order
    verdict = compare_expressions(user, HHAT22_1PN, pn=1).verdict
    assert verdict in ("differ", "cannot decide")


def test_time_limits_nest_and_each_reports_its_own_expiry():
    import signal

    before = signal.getsignal(signal.SIGALRM)
    start = time.perf_counter()
    with pytest.raises(ExpressionRefusedError, match="outer took longer than 0.3 s"):
        with time_limit(0.3, "outer"):
            with time_limit(5, "inner"):  # the outer deadline comes first and ends both
                while True:
                    pass
    assert time.perf_counter() - start < 2.0
    with time_limit(5, "outer"):
        with pytest.raises(ExpressionRefusedError, match="inner took longer than 0.2 s"):
            with time_limit(0.2, "inner"):
                while True:
                    pass
        assert signal.getitimer(signal.ITIMER_REAL)[0] > 2  # the outer limit is armed again
    assert signal.getsignal(signal.SIGALRM) is before and signal.getitimer(signal.ITIMER_REAL)[0] == 0


def test_phi_phase_result_fed_back_through_the_parser_agrees_with_a_finite_spot_check():
    # regression (issue 13): a derivation in the phase phi held G, c, m and r0 inside its tail
    # logarithm, which the parser refused and the spot check evaluated as "inf"; it now holds
    # ln(x/x0) (x0 the reference of psi), and its own printed text must check back
    from stfalgebra.radiative.modes import derive_mode

    result = derive_mode(2, 2, pn=R(3, 2), phase="phi")
    assert result.hhat.free_symbols == {S.x, S.nu, S.x0}
    for text in (result.hhat_text(), result.hhat_latex()):
        report = compare_expressions(parse_expression(text), result.hhat, pn=R(3, 2))
        assert report.verdict == "agree" and report.spot_check.passed
        assert math.isfinite(report.spot_check.max_relative_difference)
