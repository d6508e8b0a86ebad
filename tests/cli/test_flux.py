"""The eccentric-orbit part of `flux` (cli/command_flux.py): the payload builder and the JSON
contract of `flux --orbit eccentric` through 1.5PN. The circular part is pinned in
test_modes_cli.py."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
import sympy as sp

from stfalgebra.cli.command_flux import ENHANCEMENT_SERIES_ORDER, eccentric_flux_payload
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.eccentric_fluxes import averaged_energy_flux
from stfalgebra.radiative.tail_enhancement import tail_enhancement_series
from stfalgebra.symbols import et, nu, x

REGRESSION = Path(__file__).resolve().parent.parent / "data" / "regression"
NAMES = {"x": x, "nu": nu, "et": et}
KEYS = {"orbit", "pn", "energy", "angular_momentum"}


def test_flux_payload_strings():
    payload = eccentric_flux_payload(1)
    assert set(payload) == {"energy", "angular_momentum"}
    energy = sp.sympify(payload["energy"], locals=NAMES)
    assert energy.free_symbols == {x, nu, et}
    expected = averaged_energy_flux(1).coefficient(0) + x * averaged_energy_flux(1).coefficient(1)
    assert sp.simplify(energy - expected) == 0
    momentum = sp.sympify(payload["angular_momentum"], locals=NAMES)
    # Peters, Phys. Rev. 136, B1224 (1964)
    assert sp.simplify(momentum.subs(x, 0) - (1 + sp.Rational(7, 8) * et**2) / (1 - et**2) ** 2) == 0
    with pytest.raises(OrderBeyondInputsError):
        eccentric_flux_payload(2)


@pytest.mark.parametrize("pn", ["0", "1"])
def test_json_is_that_of_the_previous_version(run_cli, pn):
    """The keys and (as expressions) the values of the recorded outputs of the previous version
    (tests/data/regression, with their commands)."""
    code, out, _ = run_cli("flux", "--orbit", "eccentric", "--pn", pn, "--json")
    assert code == 0
    obj = json.loads(out)
    recorded = json.loads((REGRESSION / f"eccentric_flux_pn_{pn}.json").read_text())
    assert set(obj) == set(recorded) == KEYS
    for key in ("energy", "angular_momentum"):
        difference = sp.sympify(obj[key], locals=NAMES) - sp.sympify(recorded[key], locals=NAMES)
        assert sp.simplify(difference) == 0


def test_one_and_a_half_pn_json(run_cli):
    code, out, _ = run_cli("flux", "--orbit", "eccentric", "--pn", "1.5", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == KEYS | {"enhancement_functions", "enhancement_series"}
    assert obj["pn"] == "3/2"
    phi, psi = sp.Function("phi"), sp.Function("psi")
    names = dict(NAMES, phi=phi, psi=psi)
    energy = sp.sympify(obj["energy"], locals=names)
    momentum = sp.sympify(obj["angular_momentum"], locals=names)
    lower = eccentric_flux_payload(1)
    tail = x ** sp.Rational(3, 2) * 4 * sp.pi
    assert sp.simplify(energy - sp.sympify(lower["energy"], locals=NAMES) - tail * phi(et)) == 0
    assert sp.simplify(momentum - sp.sympify(lower["angular_momentum"], locals=NAMES) - tail * psi(et)) == 0
    series = obj["enhancement_series"]
    assert series["order"] == ENHANCEMENT_SERIES_ORDER
    expected_phi, expected_psi = tail_enhancement_series(ENHANCEMENT_SERIES_ORDER)
    assert sp.expand(sp.sympify(series["phi"], locals=NAMES) - expected_phi) == 0
    assert sp.expand(sp.sympify(series["psi"], locals=NAMES) - expected_psi) == 0
    # Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993), from memory
    assert series["phi"].endswith("2335*et**2/192 + 1")


def test_text_output_names_the_enhancement_functions(run_cli):
    code, out, _ = run_cli("flux", "--orbit", "eccentric", "--pn", "3/2")
    assert code == 0
    assert "phi(et):" in out and "psi(et):" in out and f"through et^{ENHANCEMENT_SERIES_ORDER}" in out


def test_orders_beyond_one_and_a_half_are_refused(run_cli):
    code, out, err = run_cli("flux", "--orbit", "eccentric", "--pn", "2")
    assert code == 2 and out == "" and err.count("\n") == 1 and "through order 3/2 at most" in err
