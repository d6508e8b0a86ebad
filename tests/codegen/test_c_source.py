"""Tests of stfalgebra/codegen/c_source.py: the C99 printer, compiled and called through ctypes."""

from __future__ import annotations

import ctypes
import subprocess

import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from codegen_inputs import random_mode_like_expression

from stfalgebra import symbols as S
from stfalgebra.codegen.c_source import emit_c
from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
from stfalgebra.codegen.mode_sets import mode_emission, orbit_emission
from stfalgebra.codegen.verification import exact_values, find_c_compiler, verify_c

COMPILER = find_c_compiler()
needs_compiler = pytest.mark.skipif(COMPILER is None, reason="no C compiler on this machine")

# The flags the task fixes for the generated code (common practice for a shared library).
REQUIRED_FLAGS = ["-std=c99", "-O2", "-Wall", "-Werror", "-shared", "-fPIC"]


def _compile(code, directory, extra=()):
    (directory / code.header_name).write_text(code.header)
    source = directory / f"{code.function_name}.c"
    source.write_text(code.source)
    library = directory / "libtest.so"
    done = subprocess.run([COMPILER, *REQUIRED_FLAGS, *extra, "-o", str(library), str(source), "-lm"],
                          capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    return library


@needs_compiler
def test_published_modes_compile_with_required_flags_and_match_exact_values(tmp_path, published_modes):
    emission = mode_emission(published_modes)
    code = emit_c(emission)
    library = ctypes.CDLL(str(_compile(code, tmp_path, extra=["-Wextra", "-pedantic"])))
    function = getattr(library, code.function_name)
    function.argtypes = [ctypes.c_double] * 4 + [ctypes.POINTER(ctypes.c_double)] * 2
    point = {S.x: 0.13, S.nu: 0.2, S.delta: (1 - 4 * 0.2) ** 0.5, sp.Symbol("psi", real=True): 0.7}
    n = len(code.output_names)
    real, imag = (ctypes.c_double * n)(), (ctypes.c_double * n)()
    function(*[point[s] for s in emission.input_symbols()], real, imag)
    for k, exact in enumerate(exact_values(emission, point)):
        assert abs(complex(real[k], imag[k]) - exact) <= 1e-13 * abs(exact)


@needs_compiler
def test_single_file_compiles(tmp_path, published_modes):
    code = emit_c(mode_emission(published_modes[:1]))
    source = tmp_path / "single.c"
    source.write_text(code.single_file())
    done = subprocess.run([COMPILER, *REQUIRED_FLAGS, "-o", str(tmp_path / "lib.so"), str(source), "-lm"],
                          capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr
    assert "#include \"" not in code.single_file()


def test_header_documents_signature_and_indices(published_modes):
    code = emit_c(mode_emission(published_modes, function_name="waveform"))
    assert "void waveform(double x, double nu, double delta, double psi, double *re_out, double *im_out);" in code.header
    assert "#define waveform_OUTPUT_COUNT 5" in code.header
    assert "#define waveform_INDEX_h_2_1 0" in code.header
    assert '#include "waveform.h"' in code.source
    assert "static const double k_pi = 3.14159265358979323846264338328;" in code.source
    assert "M_PI" not in code.source  # not part of C99


def test_no_floats_in_exact_coefficients_beyond_double_literals():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", sp.Rational(1, 3) * S.x**5),), "d")
    assert "(1.0/3.0)*pow(x, 5)" in emission_c_body(emission)


def emission_c_body(emission):
    source = emit_c(emission).source
    return source[source.index("{"):]


def test_small_integer_powers_are_products():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", S.x**3 + S.x**2),), "d")
    body = emission_c_body(emission)
    assert "(x*x*x)" in body and "pow(" not in body


@needs_compiler
def test_power_in_a_denominator_keeps_its_parentheses():
    # Regression: c**-2 was printed as "/c*c", i.e. multiplied back by c.
    emission = EmissionSet("f", (CodeInput(S.c, "c", 0.5, 2.0), CodeInput(S.x, "x")),
                           (NamedExpression("y", S.x / S.c**2 + S.x**3 / S.c**4),), "d")
    assert "/(c*c)" in emission_c_body(emission) or "/((c*c)" in emission_c_body(emission)
    assert verify_c(emission).verified


def test_comment_terminators_in_descriptions_are_defused():
    emission = EmissionSet("f", (CodeInput(S.x, "evil */ int x; /*"),), (NamedExpression("y", S.x, "*/"),), "s */ t")
    code = emit_c(emission)
    for text in (code.header, code.source):
        body = text.split("*/", 1)[1]  # after the documentation comment: no stray comment end
        assert "int x;" not in body


@needs_compiler
def test_unused_parameter_is_voided_and_compiles_with_wextra(tmp_path):
    emission = EmissionSet("f", (CodeInput(S.x, "x"), CodeInput(S.nu, "unused")), (NamedExpression("y", S.x),), "d")
    code = emit_c(emission)
    assert "(void)nu;" in code.source
    _compile(code, tmp_path, extra=["-Wextra"])


def test_bad_header_name_refused():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", S.x),), "d")
    with pytest.raises(ValueError, match="plain file name"):
        emit_c(emission, header_name="../evil.h")


@needs_compiler
def test_general_orbit_mode_verifies(general_mode):
    report = verify_c(mode_emission([general_mode], mass_inputs=True))
    assert report.verified and report.max_relative_error <= 1e-12


@needs_compiler
@settings(max_examples=4, deadline=None)
@given(st.data())
def test_random_mode_like_expressions_verify(data):
    expression = random_mode_like_expression(data.draw, st)
    report = verify_c(orbit_emission("f", [NamedExpression("h", expression)]), points=4)
    assert report.verified and report.max_relative_error <= 1e-12


def test_header_and_source_carry_one_emission_set_hash():
    from stfalgebra.codegen.c_source import emission_set_id

    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", 1 + S.x / 3),), "demo")
    other = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", 1 + S.x / 5),), "demo")
    code, changed = emit_c(emission), emit_c(other)
    assert emission_set_id(code.header) == emission_set_id(code.source) == emission_set_id(code.single_file())
    assert emission_set_id(code.header) != emission_set_id(changed.header)
    assert emit_c(emission) == code  # deterministic
    assert emission_set_id("int main(void);") is None


@needs_compiler
def test_a_mixed_pair_refuses_to_compile(tmp_path):
    one = emit_c(EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", S.x),), "demo"))
    two = emit_c(EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("y", 2 * S.x),), "demo"))
    (tmp_path / one.header_name).write_text(two.header)
    (tmp_path / "f.c").write_text(one.source)
    done = subprocess.run([COMPILER, *REQUIRED_FLAGS, "-o", str(tmp_path / "lib.so"), str(tmp_path / "f.c"), "-lm"],
                          capture_output=True, text=True, timeout=300)
    assert done.returncode != 0 and "belongs to another emission" in done.stderr
