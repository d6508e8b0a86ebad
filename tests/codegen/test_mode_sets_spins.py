"""Emission of modes with aligned spins (stfalgebra.codegen.mode_sets): chi1, chi2 become
inputs after the masses, the verifier samples them, and the generated numpy code agrees with the
exact expressions (the verification of generate_code evaluates both at random points)."""

from __future__ import annotations

import pytest

from stfalgebra.codegen import generate_code, mode_emission
from stfalgebra.codegen.mode_sets import SPIN_INPUTS
from stfalgebra.radiative.modes import derive_mode


def test_spinning_modes_take_chi1_chi2_after_the_masses():
    results = [derive_mode(2, 1, pn=1, spins="aligned"), derive_mode(2, 2, pn=1, spins="aligned")]
    emission = mode_emission(results)
    assert [i.symbol.name for i in emission.inputs] == ["x", "nu", "delta", "chi1", "chi2", "psi"]
    general = mode_emission([derive_mode(2, 1, pn=1, orbit="general", spins="aligned")], mass_inputs=True)
    assert [i.symbol.name for i in general.inputs] == ["r", "rdot", "phi", "phidot", "m1", "m2", "chi1", "chi2", "c"]
    # the symbols are the engine's own (real) chi1, chi2: the expressions depend on them
    assert all(any(o.expression.has(spin.symbol) for o in emission.outputs) for spin in SPIN_INPUTS)


def test_generated_numpy_code_is_verified_with_spins():
    emission = mode_emission([derive_mode(2, 1, pn=1, spins="aligned"), derive_mode(3, 2, pn="3/2", spins="aligned")])
    code = generate_code(emission, "numpy", verify=True, points=4)
    assert "chi1" in str(code)


def test_without_spins_the_signature_is_unchanged():
    emission = mode_emission([derive_mode(2, 1, pn=1)])
    assert [i.symbol.name for i in emission.inputs] == ["x", "nu", "delta", "psi"]


def test_modes_with_and_without_spins_cannot_share_a_function():
    with pytest.raises(ValueError, match="with and without spins"):
        mode_emission([derive_mode(2, 1, pn=1), derive_mode(2, 2, pn=1, spins="aligned")])
