"""Tests of stfalgebra/codegen/numpy_source.py: the vectorised numpy module."""

from __future__ import annotations

import numpy as np
import pytest
import sympy as sp
from hypothesis import given, settings
from hypothesis import strategies as st

from codegen_inputs import random_mode_like_expression

from stfalgebra import symbols as S
from stfalgebra.codegen.emission import CodeInput, EmissionSet, NamedExpression
from stfalgebra.codegen.mode_sets import PSI, mode_emission, orbit_emission
from stfalgebra.codegen.numpy_source import emit_numpy, load_generated_module
from stfalgebra.codegen.verification import exact_values, verify_numpy


def test_published_modes_match_exact_values_with_broadcasting(published_modes):
    emission = mode_emission(published_modes)
    module = load_generated_module(emit_numpy(emission), "modes_under_test")
    xs = np.array([0.05, 0.1, 0.2])[:, None]
    psis = np.array([-1.0, 0.3])[None, :]
    nu = 0.16
    delta = (1 - 4 * nu) ** 0.5
    result = module.stfalgebra_modes(xs, nu, delta, psis)
    assert tuple(result) == module.OUTPUT_NAMES
    for i in range(3):
        for j in range(2):
            point = {S.x: float(xs[i, 0]), S.nu: nu, S.delta: delta, PSI: float(psis[0, j])}
            for name, exact in zip(module.OUTPUT_NAMES, exact_values(emission, point)):
                value = result[name][i, j]
                assert abs(value - exact) <= 1e-13 * abs(exact), name


def test_scalar_inputs_give_zero_dimensional_complex_arrays():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("one", sp.Integer(1)),), "d")
    module = load_generated_module(emit_numpy(emission), "m")
    value = module.f(0.3)["one"]
    assert value.shape == () and value.dtype == np.complex128 and value == 1


def test_constant_output_broadcasts_to_input_shape():
    emission = EmissionSet("f", (CodeInput(S.x, "x"),), (NamedExpression("c", sp.I * sp.pi),), "d")
    module = load_generated_module(emit_numpy(emission), "m")
    value = module.f(np.zeros(4))["c"]
    assert value.shape == (4,)
    np.testing.assert_allclose(value, 1j * np.pi, rtol=1e-15)


def test_source_imports_only_numpy_and_is_deterministic(published_modes):
    emission = mode_emission(published_modes)
    source = emit_numpy(emission)
    assert source == emit_numpy(emission)
    imports = [line for line in source.splitlines() if line.startswith(("import", "from"))]
    assert imports == ["import numpy"]
    compile(source, "generated", "exec")


def test_load_refuses_non_text():
    with pytest.raises(TypeError, match="bytes"):
        load_generated_module(b"x = 1", "m")


@settings(max_examples=15, deadline=None)
@given(st.data())
def test_random_mode_like_expressions_verify(data):
    expression = random_mode_like_expression(data.draw, st)
    emission = orbit_emission("f", [NamedExpression("h", expression), NamedExpression("conj", sp.conjugate(expression))])
    report = verify_numpy(emission, points=4)
    assert report.verified and report.max_relative_error <= 1e-12
