"""Tests of stfalgebra/cli/command_flux.py: the payload builder and the JSON contract of
`flux --orbit eccentric` through 2PN; the energy balance of `flux --orbit circular` (keys
"binding_energy" and "x_rate") against the published circular series. The circular flux itself
is pinned in test_modes_cli.py."""

from __future__ import annotations

import json
from fractions import Fraction
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
    # issue 13 added "forms" (the same fluxes with their prefactors); the contract's keys stay
    assert set(payload) == {"energy", "angular_momentum", "forms"}
    energy = sp.sympify(payload["energy"], locals=NAMES)
    assert energy.free_symbols == {x, nu, et}
    expected = averaged_energy_flux(1).coefficient(0) + x * averaged_energy_flux(1).coefficient(1)
    assert sp.simplify(energy - expected) == 0
    momentum = sp.sympify(payload["angular_momentum"], locals=NAMES)
    # Peters, Phys. Rev. 136, B1224 (1964)
    assert sp.simplify(momentum.subs(x, 0) - (1 + sp.Rational(7, 8) * et**2) / (1 - et**2) ** 2) == 0
    with pytest.raises(OrderBeyondInputsError):
        eccentric_flux_payload("5/2")


@pytest.mark.parametrize("pn", ["0", "1"])
def test_json_is_that_of_the_previous_version(run_cli, pn):
    """The keys and (as expressions) the values of the recorded outputs of the previous version
    (tests/data/regression, with their commands)."""
    code, out, _ = run_cli("flux", "--orbit", "eccentric", "--pn", pn, "--json")
    assert code == 0
    obj = json.loads(out)
    recorded = json.loads((REGRESSION / f"eccentric_flux_pn_{pn}.json").read_text())
    assert set(recorded) == KEYS and set(obj) == KEYS | {"forms"}
    for key in ("energy", "angular_momentum"):
        difference = sp.sympify(obj[key], locals=NAMES) - sp.sympify(recorded[key], locals=NAMES)
        assert sp.simplify(difference) == 0


def test_one_and_a_half_pn_json(run_cli):
    code, out, _ = run_cli("flux", "--orbit", "eccentric", "--pn", "1.5", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == KEYS | {"enhancement_functions", "enhancement_series", "forms"}
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


def test_orders_beyond_two_are_refused(run_cli):
    code, out, err = run_cli("flux", "--orbit", "eccentric", "--pn", "5/2")
    assert code == 2 and out == "" and err.count("\n") == 1 and "through order 2 at most" in err


def test_two_pn_json_keeps_the_keys_and_adds_the_derived_terms(run_cli):
    """`flux --orbit eccentric --pn 2`: the keys of the 1.5PN output; the values are the 1.5PN ones
    plus x^2 times the derived 2PN averages (whose e_t = 0 limit is the circular 2PN flux)."""
    code, out, _ = run_cli("flux", "--orbit", "eccentric", "--pn", "2", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == KEYS | {"enhancement_functions", "enhancement_series", "forms"}
    assert obj["pn"] == "2" and set(obj["forms"]) == {"energy", "angular_momentum"}
    phi, psi = sp.Function("phi"), sp.Function("psi")
    names = dict(NAMES, phi=phi, psi=psi)
    from stfalgebra.radiative.eccentric_fluxes import averaged_angular_momentum_flux

    lower = eccentric_flux_payload("3/2")
    for key, series in (("energy", averaged_energy_flux(2)), ("angular_momentum", averaged_angular_momentum_flux(2))):
        value = sp.sympify(obj[key], locals=names)
        difference = value - sp.sympify(lower[key], locals=names) - x**2 * series.coefficient(2)
        assert sp.simplify(difference) == 0
        circular = sp.Rational(-44711, 9072) + sp.Rational(9271, 504) * nu + sp.Rational(65, 18) * nu**2
        assert sp.expand(sp.expand(value).coeff(x, 2).subs(et, 0) - circular) == 0
    code, text, _ = run_cli("flux", "--orbit", "eccentric", "--pn", "2")
    assert code == 0 and "every term through relative order 2" in text


def test_flux_help_reads_the_bounds_off_the_table(capsys):
    from stfalgebra.cli import main
    from stfalgebra.cli.options import maximum_pn_order

    assert main(["flux", "--help"]) == 0
    words = " ".join(capsys.readouterr().out.split())
    bounds = (maximum_pn_order("flux", orbit="circular"), maximum_pn_order("flux", orbit="eccentric"))
    assert f"at most {bounds[0]} circular, {bounds[1]} eccentric" in words and bounds == (Fraction(5, 2), 2)


# ----------------------------------------------------------------------------- circular balance
# Blanchet, Living Rev. Relativ. 17, 2 (2014), from memory (equation numbers not checked):
# E(x) of eq. (233) and dx/dt of sec. 9.3, each divided by its leading term
_PUBLISHED = {
    "binding_energy": 1 + (-sp.Rational(3, 4) - nu / 12) * x + (-sp.Rational(27, 8) + sp.Rational(19, 8) * nu
                                                                 - nu**2 / 24) * x**2,
    "x_rate": 1 + (-sp.Rational(743, 336) - sp.Rational(11, 4) * nu) * x + 4 * sp.pi * x**sp.Rational(3, 2)
              + (sp.Rational(34103, 18144) + sp.Rational(13661, 2016) * nu + sp.Rational(59, 18) * nu**2) * x**2
              - (sp.Rational(4159, 672) + sp.Rational(189, 8) * nu) * sp.pi * x**sp.Rational(5, 2),
}


def _through(expression, order):
    return sp.Add(*[term for term in sp.Add.make_args(sp.expand(expression))
                    if sp.degree(term.subs(x, x**2), x) <= 2 * order])


def test_circular_binding_energy_and_x_rate_through_the_top_order(run_cli):
    from stfalgebra.cli.options import maximum_pn_order

    top = maximum_pn_order("flux", orbit="circular")
    code, out, err = run_cli("flux", "--orbit", "circular", "--pn", str(top), "--json")
    assert code == 0 and err == ""
    obj = json.loads(out)
    assert obj["normalisation"]["binding_energy"] == "E / (-(m nu c^2 x/2))"
    assert obj["normalisation"]["x_rate"] == "(dx/dt) / ((64/5) nu c^3 x^5/(G m))"
    names = dict(NAMES, pi=sp.pi)
    for key, published in _PUBLISHED.items():
        expected = _through(published, sp.Rational(top.numerator, top.denominator))
        assert sp.expand(sp.sympify(obj[key], locals=names) - expected) == 0, key
    # the forms carry the prefactors the normalisations name
    G, m, c = sp.symbols("G m c")
    form_names = dict(names, G=G, m=m, c=c)
    energy = sp.sympify(obj["forms"]["binding_energy"]["expression"], locals=form_names)
    assert sp.expand(energy + m * nu * c**2 * x / 2 * sp.sympify(obj["binding_energy"], locals=names)) == 0
    rate = sp.sympify(obj["forms"]["x_rate"]["expression"], locals=form_names)
    assert sp.expand(rate - sp.Rational(64, 5) * nu * c**3 * x**5 / (G * m) * sp.sympify(obj["x_rate"], locals=names)) == 0
    assert obj["forms"]["x_rate"]["provenance"] and obj["forms"]["x_rate"]["terms"][0]["coefficient"] == "1"
    # each term of the fluxes names the contributions it comes from: the tail at 3/2 and (with
    # the 1PN moments and the ADM mass) at 5/2 only
    for term in obj["forms"]["energy"]["terms"]:
        assert term["provenance"], term
        assert any(name.startswith("tail") for name in term["provenance"]) == (term["order"] in ("3/2", "5/2"))


def test_circular_x_rate_carries_the_tail_at_one_and_a_half(run_cli):
    code, out, _ = run_cli("flux", "--pn", "3/2")
    assert code == 0
    assert "x_rate: dx/dt = 64/5*nu*c**3*x**5/(G*m)*(1 + x*(-743/336 - 11/4*nu) + 4*pi*x**(3/2))" in out
    assert "binding_energy: E = -1/2*m*nu*c**2*x*(1 + x*(-3/4 - 1/12*nu))" in out
    code, out, _ = run_cli("flux", "--pn", "1", "--format", "latex")
    assert code == 0 and out.count(r"\begin{equation}") == 4 and r"\frac{dx}{dt} = \frac{64 \nu c^{3} x^{5}}{5 G m}" in out


def test_balance_left_out_with_a_note_beyond_the_conserved_energy(run_cli, monkeypatch):
    import stfalgebra.radiative.energy_balance as balance
    from stfalgebra.orders import PNOrder

    monkeypatch.setattr(balance, "maximum_quantity_order", lambda name: PNOrder(1))
    code, out, _ = run_cli("flux", "--pn", "3/2", "--json", "--no-cache")
    assert code == 0
    obj = json.loads(out)
    assert "binding_energy" not in obj and "x_rate" not in obj and set(obj["forms"]) == {"energy", "angular_momentum"}
    assert obj["notes"] == ["binding_energy and x_rate are left out: the conserved energy of the circular orbit is "
                            "known through relative order 1"]
    code, out, _ = run_cli("flux", "--pn", "3/2", "--no-cache")
    assert code == 0 and "note: binding_energy and x_rate are left out" in out


def test_a_cached_circular_payload_without_balance_or_note_is_refused():
    from stfalgebra.cli.command_flux import check_flux_payload, flux_payload

    payload = flux_payload("circular", "1", use_cache=False)
    check_flux_payload(payload, "circular", "1")
    broken = {key: value for key, value in payload.items() if key not in ("binding_energy", "x_rate")}
    broken["forms"] = {key: payload["forms"][key] for key in ("energy", "angular_momentum")}
    with pytest.raises(ValueError, match="without a note"):
        check_flux_payload(broken, "circular", "1")
