"""Tests of stfalgebra/codegen/verification.py: the checks catch wrong code."""

from __future__ import annotations

import dataclasses

import pytest
import sympy as sp

from stfalgebra import symbols as S
from stfalgebra.codegen import verification
from stfalgebra.codegen.c_source import emit_c
from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
from stfalgebra.codegen.mode_sets import mode_emission
from stfalgebra.codegen.numpy_source import emit_numpy
from stfalgebra.codegen.verification import (
    GeneratedCodeMismatchError,
    exact_values,
    find_c_compiler,
    verify_c,
    verify_numpy,
)

needs_compiler = pytest.mark.skipif(find_c_compiler() is None, reason="no C compiler on this machine")


def _emission():
    expression = 1 + S.x * (-sp.Rational(107, 42) + sp.Rational(55, 42) * S.nu)  # Blanchet LRR 2014, from memory
    return EmissionSet("f", (CodeInput(S.x, "x", 0.01, 0.3), CodeInput(S.nu, "nu", 0.05, 0.25)),
                       (NamedExpression("hhat22", expression),), "demo")


def test_exact_values_use_the_exact_binary_inputs():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", 3 * S.x - sp.Rational(3, 10)),), "d")
    # 0.1 as a double is not 1/10: the exact value of 3*0.1 - 3/10 is about 1.7e-17, not 0.
    (value,) = exact_values(emission, {S.x: 0.1})
    assert value != 0 and abs(value) < 1e-16


@needs_compiler
def test_correct_c_passes():
    report = verify_c(_emission())
    assert report.verified and report.compared == 8 and report.max_relative_error < 1e-14
    assert "verified against exact evaluation" in report.summary()


@needs_compiler
def test_tampered_c_is_caught():
    emission = _emission()
    code = emit_c(emission)
    tampered = dataclasses.replace(code, source=code.source.replace("55.0/42.0", "55.0/43.0"))
    assert tampered.source != code.source
    with pytest.raises(GeneratedCodeMismatchError, match="differs from exact evaluation"):
        verify_c(emission, tampered)


@needs_compiler
def test_c_that_does_not_compile_is_reported():
    emission = _emission()
    code = emit_c(emission)
    broken = dataclasses.replace(code, source=code.source + "\nint unused_function(void) { int a; return 0; }\n")
    with pytest.raises(GeneratedCodeMismatchError, match="does not compile"):
        verify_c(emission, broken)


def test_tampered_numpy_is_caught():
    emission = _emission()
    source = emit_numpy(emission).replace("55/42", "55/43")
    with pytest.raises(GeneratedCodeMismatchError, match="numpy output 'hhat22' differs"):
        verify_numpy(emission, source)


def test_missing_compiler_gives_an_unverified_report(monkeypatch):
    monkeypatch.setattr(verification, "find_c_compiler", lambda: None)
    report = verify_c(_emission())
    assert not report.verified and "no C compiler found" in report.summary()


def test_find_c_compiler_honours_cc(monkeypatch):
    monkeypatch.setenv("CC", "definitely-not-a-compiler-xyz")
    found = find_c_compiler()
    assert found is None or "definitely-not" not in found


def test_values_near_a_zero_are_skipped_not_failed():
    # Hhat_32 of circular orbits vanishes at nu = 1/3 (from memory: proportional to 1 - 3 nu);
    # here sin(psi) crosses zero at psi = 0 which the sample includes.
    psi = sp.Symbol("psi", real=True)
    emission = EmissionSet("f", (CodeInput(psi, "phase", -1.0, 1.0),), (NamedExpression("s", sp.sin(psi)),), "d",
                           sampler=lambda rng: {psi: 0.0 if rng.random() < 0.5 else rng.uniform(0.5, 1.0)})
    report = verify_numpy(emission, points=8)
    assert report.skipped_near_zero >= 1 and report.compared + report.skipped_near_zero == 8


def test_identically_zero_output_must_be_exactly_zero():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("z", sp.Integer(0)),), "d")
    assert verify_numpy(emission).verified
    wrong = emit_numpy(emission).replace("value.real = 0", "value.real = 1e-20")
    with pytest.raises(GeneratedCodeMismatchError, match="should vanish"):
        verify_numpy(emission, wrong)


def test_bad_point_count():
    with pytest.raises(ValueError, match="positive int, got 0"):
        verify_numpy(_emission(), points=0)


def test_general_orbit_numpy(general_mode):
    assert verify_numpy(mode_emission([general_mode])).verified


def test_failing_compiler_is_a_compiler_failure_not_a_mismatch(monkeypatch):
    # regression (issue 12): CC=/bin/false was reported as "generated code failed verification"
    from stfalgebra.errors import CompilerFailureError

    monkeypatch.setenv("CC", "/bin/false")
    with pytest.raises(CompilerFailureError, match="fails on a trivial program too"):
        verify_c(_emission())
    with pytest.raises(CompilerFailureError, match="cannot be run"):
        verify_c(_emission(), compiler="/nonexistent/cc-xyz")
    monkeypatch.setenv("CC", "/bin/true")  # "succeeds" and builds nothing
    with pytest.raises(CompilerFailureError, match="no loadable library"):
        verify_c(_emission())
    assert not issubclass(CompilerFailureError, GeneratedCodeMismatchError)


@needs_compiler
def test_broken_generated_code_with_a_working_compiler_stays_a_mismatch():
    emission = _emission()
    code = emit_c(emission)
    broken = dataclasses.replace(code, source=code.source.replace("re_out[0] =", "re_out[0] = undefined_name +"))
    with pytest.raises(GeneratedCodeMismatchError, match="does not compile"):
        verify_c(emission, broken)
