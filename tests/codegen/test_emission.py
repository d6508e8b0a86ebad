"""Tests of stfalgebra/codegen/emission.py: inputs, real/imaginary split, CSE preparation."""

from __future__ import annotations

import random

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from stfalgebra import symbols as S
from stfalgebra.codegen.emission import (
    CodeInput,
    EmissionSet,
    NamedExpression,
    prepare_emission,
    split_real_imaginary,
)

a, b, t = sp.symbols("a b t", real=True)
_ATOMS = [a, b, sp.cos(t), sp.sin(t), sp.sqrt(2), sp.pi, sp.log(3), sp.Integer(2)]


@st.composite
def complex_polynomials(draw):
    terms = []
    for _ in range(draw(st.integers(1, 5))):
        coefficient = sp.Rational(draw(st.integers(-9, 9)), draw(st.integers(1, 5)))
        power_of_i = draw(st.integers(0, 5))
        factors = draw(st.lists(st.sampled_from(_ATOMS), max_size=3))
        terms.append(coefficient * sp.I**power_of_i * sp.Mul(*factors))
    expression = sp.Add(*terms)
    if draw(st.booleans()):
        expression *= sp.cos(2 * t) - sp.I * sp.sin(2 * t)
    return expression


@settings(max_examples=60, deadline=None)
@given(complex_polynomials())
def test_split_reassembles_and_parts_are_real(expression):
    real, imag = split_real_imaginary(expression)
    assert not real.has(sp.I) and not imag.has(sp.I)
    assert sp.expand(real + sp.I * imag - expression) == 0


def test_split_falls_back_for_exponentials():
    real, imag = split_real_imaginary(sp.exp(sp.I * t) * a)
    assert sp.simplify(real - a * sp.cos(t)) == 0 and sp.simplify(imag - a * sp.sin(t)) == 0


def test_split_groups_by_phase():
    amplitude = 1 + a * b + sp.I * b
    real, imag = split_real_imaginary(amplitude * (sp.cos(t) - sp.I * sp.sin(t)))
    assert real == sp.collect(sp.expand(real), [sp.cos(t), sp.sin(t)])
    assert sp.expand(real - ((1 + a * b) * sp.cos(t) + b * sp.sin(t))) == 0
    assert sp.expand(imag - (b * sp.cos(t) - (1 + a * b) * sp.sin(t))) == 0


def _inputs():
    return (CodeInput(S.m1, "mass 1"), CodeInput(S.m2, "mass 2"), CodeInput(S.x, "x"))


def test_unused_intermediates_are_dropped_and_used_ones_kept_in_order():
    emission = EmissionSet(
        "f", _inputs(), (NamedExpression("y", S.nu * S.x),), "demo",
        intermediates=((S.nu, S.m1 * S.m2 / (S.m1 + S.m2) ** 2), (S.delta, (S.m1 - S.m2) / (S.m1 + S.m2))),
    )
    prepared = prepare_emission(emission)
    names = [name for name, _ in prepared.assignments]
    assert "nu" in names and "delta" not in names
    assert prepared.unused_parameters == ()


def test_unused_parameters_are_reported():
    emission = EmissionSet("f", _inputs(), (NamedExpression("y", S.x),), "demo")
    assert prepare_emission(emission).unused_parameters == ("m1", "m2")


def test_names_are_sanitised_and_distinct():
    lam = sp.Symbol("lambda", real=True)
    emission = EmissionSet("my function!", (CodeInput(lam, "a Python keyword as input"),),
                           (NamedExpression("h(2,-2)", lam), NamedExpression("h(2,2)", 2 * lam)), "demo")
    prepared = prepare_emission(emission)
    assert prepared.function_name == "my_function"
    assert prepared.parameters == ("lambda_",)
    assert prepared.output_names == ("h_2_m2", "h_2_2")


def test_constants_become_named():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),),
                           (NamedExpression("y", sp.pi * S.x + sp.EulerGamma + sp.E),), "demo")
    assert [name for name, _ in prepare_emission(emission).constants] == ["k_pi", "k_euler_gamma", "k_e"]


def test_output_with_undeclared_symbol_is_refused():
    with pytest.raises(ValueError, match="not inputs: \\['nu'\\]"):
        EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", S.nu),), "demo")


def test_empty_outputs_refused():
    with pytest.raises(ValueError, match="at least one output"):
        EmissionSet("f", (CodeInput(S.x, "x"),), (), "demo")


def test_repeated_input_refused():
    with pytest.raises(ValueError, match="repeat"):
        EmissionSet("f", (CodeInput(S.x, "x"), CodeInput(S.x, "x again")), (NamedExpression("y", S.x),), "demo")


def test_bad_input_types():
    with pytest.raises(TypeError, match="'x'"):
        CodeInput("x", "not a symbol")
    with pytest.raises(ValueError, match="empty range"):
        CodeInput(S.x, "x", 1.0, 1.0)
    with pytest.raises(TypeError, match="sympy Expr"):
        NamedExpression("y", "x + 1")
    with pytest.raises(ValueError, match="non-empty"):
        NamedExpression("", S.x)


def test_integer_output_is_accepted():
    assert NamedExpression("one", 1).expression == sp.Integer(1)


def test_draw_point_uses_ranges_and_sampler():
    emission = EmissionSet("f", (CodeInput(S.x, "x", 0.1, 0.2),), (NamedExpression("y", S.x),), "demo")
    point = emission.draw_point(random.Random(1))
    assert 0.1 <= point[S.x] <= 0.2
    broken = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", S.x),), "demo", sampler=lambda rng: {})
    with pytest.raises(ValueError, match="no value for inputs \\['x'\\]"):
        broken.draw_point(random.Random(1))
