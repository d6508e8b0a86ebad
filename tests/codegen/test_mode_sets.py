"""Tests of stfalgebra/codegen/mode_sets.py, on explicit inputs and on the toolkit's own modes."""

from __future__ import annotations

import pytest
import sympy as sp
from codegen_inputs import GENERAL_22, PUBLISHED_CIRCULAR, fake_mode

from stfalgebra import symbols as S
from stfalgebra.codegen.emission import NamedExpression
from stfalgebra.codegen.generate import generate_code
from stfalgebra.codegen.mode_sets import PSI, mode_emission, orbit_emission
from stfalgebra.codegen.verification import find_c_compiler
from stfalgebra.errors import OrderBeyondInputsError, RefusedModeError
from stfalgebra.orders import PNOrder
from stfalgebra.radiative.modes import derive_mode, derive_modes

HAS_COMPILER = find_c_compiler() is not None
RELATIVE_ORDERS = [sp.Integer(3), sp.Rational(5, 2), sp.Integer(2), sp.Rational(3, 2), sp.Integer(1),
                   sp.Rational(1, 2), sp.Integer(0)]


def highest_relative_order(orbit: str) -> sp.Rational:
    """The highest relative PN order the toolkit derives for Hhat_22."""
    for order in RELATIVE_ORDERS:
        try:
            derive_mode(2, 2, orbit=orbit, pn_relative=order)
        except OrderBeyondInputsError:
            continue
        return order
    raise AssertionError("the toolkit derives no order at all")


@pytest.fixture(scope="module")
def circular_modes_l4():
    # relative 3/2: the highest order at which every circular mode l <= 4 is served, the DC
    # memory modes (2,0), (4,0) included (the current modes stop there)
    return derive_modes(4, orbit="circular", pn_relative=min(highest_relative_order("circular"), PNOrder(3, 2)))


@pytest.fixture(scope="module")
def general_modes_l3():
    return derive_modes(3, orbit="general", pn_relative=highest_relative_order("general"))


@pytest.mark.parametrize("language", ["c", "numpy"])
def test_toolkit_circular_modes_up_to_l4_verify(circular_modes_l4, language):
    emission = mode_emission(circular_modes_l4, skip_refused=True)
    names = [o.name for o in emission.outputs]
    assert "h_4_m4" in names and "h_2_0" in names  # circular m = 0, even l: the DC memory
    assert not any("mode (2, 0) left out" in note for note in emission.notes)
    code = generate_code(emission, language, points=6)
    if language == "c" and not HAS_COMPILER:
        assert not code.report.verified
    else:
        assert code.report.verified and code.report.max_relative_error <= 1e-12


@pytest.mark.parametrize("language, mass_inputs", [("c", True), ("numpy", False)])
def test_toolkit_general_modes_up_to_l3_verify(general_modes_l3, language, mass_inputs):
    emission = mode_emission(general_modes_l3, mass_inputs=mass_inputs)
    assert "h_2_0" in [o.name for o in emission.outputs]  # general orbits: instantaneous part kept
    code = generate_code(emission, language, points=6)
    if language == "c" and not HAS_COMPILER:
        assert not code.report.verified
    else:
        assert code.report.verified and code.report.max_relative_error <= 1e-12


def test_hhat_quantity_drops_the_phase(circular_modes_l4):
    emission = mode_emission(circular_modes_l4[:1], quantity="hhat")
    assert [i.symbol for i in emission.inputs] == [S.x, S.nu, S.delta]
    assert emission.outputs[0].name == "Hhat_2_2"
    assert generate_code(emission, "numpy", points=4).report.verified


def test_strain_normalisation_circular():
    # conventions.md: R c^2 h_lm/(G m) = 2 nu x sqrt(16 pi/5) Hhat_lm exp(-i m psi).
    emission = mode_emission([fake_mode(2, 2, PUBLISHED_CIRCULAR[(2, 2)])])
    expected = 2 * S.nu * S.x * sp.sqrt(16 * sp.pi / 5) * PUBLISHED_CIRCULAR[(2, 2)] * sp.exp(-2 * sp.I * PSI)
    difference = (emission.outputs[0].expression - expected).rewrite(sp.exp)
    assert sp.simplify(sp.expand(difference)) == 0


def test_strain_normalisation_general():
    # conventions.md: R c^2 h_lm/(G m) = (4 nu/c^2) sqrt(pi/5) Hhat_lm exp(-i m phi), G = 1.
    emission = mode_emission([fake_mode(2, 2, GENERAL_22, orbit="general")])
    expected = 4 * S.nu / S.c**2 * sp.sqrt(sp.pi / 5) * GENERAL_22 * sp.exp(-2 * sp.I * S.phi)
    difference = (emission.outputs[0].expression - expected).rewrite(sp.exp)
    assert sp.simplify(sp.expand(difference)) == 0
    assert [i.symbol.name for i in emission.inputs] == ["r", "rdot", "phi", "phidot", "m", "nu", "delta", "c"]


def test_normalisation_with_assumption_free_symbols_cancels():
    # Regression: a normalisation from sympify carries plain Symbol('G') etc., which did not
    # cancel against the scale R c^2/(G m) and left G, R among the outputs' symbols.
    mode = fake_mode(2, 2, sp.Integer(1))
    mode.normalisation = sp.sympify("2*G*m*nu*x*sqrt(16*pi/5)/(R*c**2)")
    emission = mode_emission([mode])
    assert {s.name for s in emission.outputs[0].expression.free_symbols} == {"nu", "x", "psi"}


def test_refused_mode_raises_or_is_skipped():
    refused = fake_mode(2, 0, None)
    refused.refused = "memory not computed"
    with pytest.raises(RefusedModeError, match="memory not computed"):
        mode_emission([refused])
    with pytest.raises(RefusedModeError, match="every requested mode is refused"):
        mode_emission([refused], skip_refused=True)


def test_mixed_orbits_refused():
    with pytest.raises(ValueError, match="different orbit types"):
        mode_emission([fake_mode(2, 2, sp.Integer(1)), fake_mode(2, 2, GENERAL_22, orbit="general")])


def test_bad_arguments():
    with pytest.raises(ValueError, match="quantity must be one of"):
        mode_emission([fake_mode(2, 2, sp.Integer(1))], quantity="flux")
    with pytest.raises(ValueError, match="empty"):
        mode_emission([])
    with pytest.raises(TypeError, match="attribute 'orbit'"):
        mode_emission([object()])
    with pytest.raises(ValueError, match="orbit must be one of"):
        orbit_emission("f", [NamedExpression("y", S.x)], orbit="elliptic")


def test_flux_like_output_has_no_phase_input():
    # Circular energy flux factor 1 - (1247/336 + 35 nu/12) x, from memory (Blanchet LRR 2014).
    flux = 1 - (sp.Rational(1247, 336) + sp.Rational(35, 12) * S.nu) * S.x
    emission = orbit_emission("flux", [NamedExpression("F", flux)], mass_inputs=True)
    assert [i.symbol.name for i in emission.inputs] == ["x", "m1", "m2"]
    assert generate_code(emission, "numpy", points=4).report.verified
