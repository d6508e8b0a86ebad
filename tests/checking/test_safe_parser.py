"""Tests of stfalgebra/checking/safe_parser.py: accepted syntax, hostile input, fuzzing."""

from __future__ import annotations

import builtins
import time
from contextlib import ExitStack
from unittest import mock

import pytest
import sympy as sp
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

import sympy.parsing.sympy_parser
from stfalgebra import symbols as S
from stfalgebra.checking.safe_parser import MAX_DEPTH, MAX_LENGTH, allowed_symbols, parse_expression
from stfalgebra.errors import ExpressionRefusedError

x, nu, delta = S.x, S.nu, S.delta
# Hhat_22 through 1PN, Blanchet, Living Rev. Relativ. 17, 2 (2014) (from memory).
HHAT22_1PN = 1 + x * (-sp.Rational(107, 42) + sp.Rational(55, 42) * nu)


@pytest.mark.parametrize("text, expected", [
    # Reference values: common practice (the meaning of ordinary mathematical notation).
    ("1 + x*(-107/42 + 55*nu/42)", HHAT22_1PN),
    ("1 + x(-107/42 + 55nu/42)", HHAT22_1PN),
    (r"1 + x\left(-\frac{107}{42} + \frac{55}{42}\nu\right)", HHAT22_1PN),
    ("1 + x (-107/42 + 55 ν/42)", HHAT22_1PN),
    ("2 pi x^(3/2)", 2 * sp.pi * x**sp.Rational(3, 2)),
    ("2*pi*x**(3/2)", 2 * sp.pi * x**sp.Rational(3, 2)),
    (r"2\pi x^{3/2}", 2 * sp.pi * x**sp.Rational(3, 2)),
    (r"\frac{i}{3}\delta x^{1/2}", sp.I * delta * sp.sqrt(x) / 3),
    ("I*delta*sqrt(x)/3", sp.I * delta * sp.sqrt(x) / 3),
    (r"\sqrt{\frac{5}{7}}", sp.sqrt(sp.Rational(5, 7))),
    (r"\sqrt[3]{x}", x**sp.Rational(1, 3)),
    (r"\frac12 x", x / 2),
    (r"\frac 1 2", sp.Rational(1, 2)),
    ("-x^2", -x**2),
    ("2^3^2", sp.Integer(512)),
    ("x^-1", 1 / x),
    ("1/2 x", x / 2),
    ("0.25", sp.Rational(1, 4)),
    ("1e-3", sp.Rational(1, 1000)),
    ("1.5E2", sp.Integer(150)),
    ("-856/105 EulerGamma - 428/105 log(16 x)", -sp.Rational(856, 105) * sp.EulerGamma - sp.Rational(428, 105) * sp.log(16 * x)),
    (r"\gamma_E + \ln{x}", sp.EulerGamma + sp.log(x)),
    (r"\gamma_{E} + \ln x^2", sp.EulerGamma + sp.log(x**2)),
    ("gamma_E", sp.EulerGamma),
    (r"\mathrm{i} \pi", sp.I * sp.pi),
    ("exp(i pi)", sp.Integer(-1)),
    ("x − 1", x - 1),
    ("2·x × nu", 2 * x * nu),
    (r"2 \cdot x \times \delta", 2 * x * delta),
    (r"x\,\nu\;\delta\!", x * nu * delta),
    ("{x + 1}^2", (x + 1)**2),
    ("((((x))))", x),
])
def test_accepted(text, expected):
    assert parse_expression(text) == expected


def test_decimals_are_exact():
    assert parse_expression("0.1") == sp.Rational(1, 10)


def test_general_orbit_symbols_and_latex_dots():
    value = parse_expression(r"\frac{m}{r} + r^2\dot{\phi}^2 + 2 i r \dot r \dot\phi - \dot{r}^2", orbit="general")
    # Leading general-orbit Hhat_22 with G = 1 (conventions.md).
    assert value == S.m / S.r + S.r**2 * S.phidot**2 + 2 * sp.I * S.r * S.rdot * S.phidot - S.rdot**2
    assert parse_expression("rdot/c", orbit="general") == S.rdot / S.c


def test_symbols_are_the_project_symbols():
    assert parse_expression("x nu delta").free_symbols == {S.x, S.nu, S.delta}
    assert set(allowed_symbols("general")) == {"r", "rdot", "phidot", "m", "c", "nu", "delta"}


HOSTILE = [
    ("__import__('os')", "dunder name '__import__'"),
    ("__import__('os').system('touch /tmp/stfalgebra_pwned')", "dunder name"),
    ("().__class__", "attribute access"),
    ("().__class__.__bases__[0].__subclasses__()", "attribute access"),
    ("lambda: 0", "name 'lambda'"),
    ("x**9999999999", "beyond the bound"),
    ("x^(10^10)", "beyond the bound"),
    ("open", "name 'open'"),
    ("open('/etc/passwd')", "name 'open'"),
    ("'x'", "string quote"),
    ('"x"', "string quote"),
    ('f"{x}"', "name 'f'"),
    ('"{x}"', "string quote"),
    ("x.conjugate()", "attribute access"),
    ("eval('1')", "name 'eval'"),
    ("eval(x)", "call of 'eval'"),
    ("exec", "name 'exec'"),
    ("sin(x)", "call of 'sin'"),
    ("x[0]", "square bracket"),
    ("log(x, 2)", "','"),
    ("x = 1", "character '='"),
    ("x; y", "character ';'"),
    ("x if x else x", "name 'if'"),
    ("Symbol('y')", "name 'Symbol'"),
    ("y", "name 'y'"),
    ("eta", "name 'eta'"),
    ("x^nu", "exponents must be rational numbers"),
    ("(((2^64)^64)^64)", "4096 bits"),
    ("(x+1)^64^2", "beyond the bound"),
    ("exp(exp(exp(exp(x))))", "exp nested"),
    ("exp(exp(1001))", "exp of a number"),
    ("1e99999", "decimal exponent"),
    ("1/0", "division by zero"),
    ("log(0)", "log(0)"),
    ("0^-1", "division by zero"),
    ("", "empty expression"),
    ("x +", "unexpected end"),
    ("(x", "unclosed '('"),
    ("x)", "unmatched ')'"),
    ("()", "empty group"),
    ("2 3", "two numbers side by side"),
    ("\\input{x}", "LaTeX command '\\\\input'"),
    ("\\gamma", "only \\gamma_E"),
    ("\\sqrt[x]{2}", "root index"),
    ("\x00", "character '\\x00'"),
    ("x\u202e", "character"),
    ("9" * 500, "longer than 400"),
    ("a" * 100, "name longer than"),
    ("-" * 200 + "x", "nesting deeper than"),
    ("(" * 150 + "x" + ")" * 150, "nesting deeper than"),
    ("(" * 100000 + "x" + ")" * 100000, "200001 characters"),
    ("x" + " + x" * 6000, "characters (at most 20000)"),
]


def _short(text: str) -> str:
    return ascii(text if len(text) <= 24 else f"{text[:16]}...({len(text)} chars)")


@pytest.mark.parametrize("text, reason", HOSTILE, ids=[_short(text) for text, _ in HOSTILE])
def test_hostile_input_is_refused_quickly_and_named(text, reason, tmp_path):
    start = time.perf_counter()
    with pytest.raises(ExpressionRefusedError) as info:
        parse_expression(text)
    assert reason in str(info.value)
    assert time.perf_counter() - start < 2.0
    assert not (tmp_path / "stfalgebra_pwned").exists()


def test_refusal_message_is_one_line_and_short():
    with pytest.raises(ExpressionRefusedError) as info:
        parse_expression("x\n" + "'" + "y" * 5000)
    message = str(info.value)
    assert "\n" not in message and len(message) < 200


def test_limits_are_the_documented_ones():
    assert MAX_LENGTH == 20000 and MAX_DEPTH == 100
    parse_expression("(" * 90 + "x" + ")" * 90)  # within the depth bound


def test_non_text_refused():
    with pytest.raises(TypeError, match="bytes"):
        parse_expression(b"x")
    with pytest.raises(ValueError, match="orbit must be"):
        parse_expression("x", orbit="elliptic")


_FRAGMENTS = ["x", "nu", "delta", "pi", "I", "i", "EulerGamma", "sqrt", "log", "exp", "ln", "(", ")", "{", "}",
              "+", "-", "*", "/", "^", "**", "0", "1", "2", "64", "3.5", "1e3", ".", "\\frac", "\\sqrt", "\\pi",
              "\\nu", "\\left", "\\right", "\\cdot", "\\dot", "\\gamma_E", "\\mathrm", " ", "__import__", "'", '"',
              "lambda", ":", "[", "]", ",", "os", "_", "\\", "ν", "e", "r", "rdot", "m", "c", "=", "@", "\n"]

_ALLOWED = {S.x, S.nu, S.delta}


def _assert_safe(text):
    start = time.perf_counter()
    with ExitStack() as stack:
        # The parser must never hand text to Python or to sympy's string parser.
        for target in ("eval", "exec", "compile"):
            stack.enter_context(mock.patch.object(builtins, target, side_effect=AssertionError(f"{target} called")))
        stack.enter_context(mock.patch.object(sympy.parsing.sympy_parser, "parse_expr",
                                              side_effect=AssertionError("parse_expr called")))
        try:
            value = parse_expression(text)
        except ExpressionRefusedError as exc:
            assert "\n" not in str(exc)
            value = None
    assert time.perf_counter() - start < 5.0
    if value is not None:
        assert isinstance(value, sp.Expr)
        assert value.free_symbols <= _ALLOWED
        assert not value.has(sp.zoo, sp.nan, sp.oo)


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(st.sampled_from(_FRAGMENTS), max_size=30).map("".join))
@example("__import__('os').system('echo pwned')")
@example("x" * 30)
@example("\\frac{\\frac{1}{2}}{x}")
def test_fuzz_fragments(text):
    _assert_safe(text)


@settings(max_examples=200, deadline=None)
@given(st.text(max_size=60))
def test_fuzz_arbitrary_text(text):
    _assert_safe(text)


# ----------------------------------------------------------------- decimals (issue 12)

from stfalgebra.checking.safe_parser import parse_with_decimals  # noqa: E402


@pytest.mark.parametrize("text, literals", [
    ("1.50 x", [("1.50", 3, sp.Rational(1, 100))]),
    ("0.0025 nu", [("0.0025", 2, sp.Rational(1, 10000))]),
    ("2.5e-3 + 3e5", [("2.5e-3", 2, sp.Rational(1, 10000)), ("3e5", 1, sp.Integer(100000))]),
    ("3/2 x + 7", []),
])
def test_decimals_are_reported_with_their_significant_digits(text, literals):
    parsed = parse_with_decimals(text)
    assert [(d.text, d.digits, d.unit) for d in parsed.decimals] == literals
    assert parsed.exact() == parsed.expression == parse_expression(text)


def test_exponents_and_root_indices_stay_exact():
    parsed = parse_with_decimals(r"x^0.5 * 0.25 + \sqrt[3]{nu}")
    assert [d.text for d in parsed.decimals] == ["0.25"]
    assert parsed.with_decimals.has(sp.sqrt(S.x))


def test_decimal_reading_keeps_every_refusal():
    for text in ("1.5/(0.5 - 0.5)", "0.5^99", "exp(1000.5)"):
        with pytest.raises(ExpressionRefusedError):
            parse_with_decimals(text)
