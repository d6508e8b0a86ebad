"""Tests of stfalgebra/cli/command_phasing.py: the circular inspiral on the command line.

The values are those of the engine (tests/radiative/test_energy_balance.py checks them against
the published coefficients and a second route); here: the printed forms (text, LaTeX, JSON)
are the same expressions, every quantity states its order, and orders beyond what the inputs
give are refused with the limiting quantity named."""

from __future__ import annotations

import json

import sympy as sp

from stfalgebra import symbols as S

NAMES = {"x": S.x, "nu": S.nu, "m": S.m, "G": S.G, "c": S.c}


def test_json_quantities_read_back_as_the_published_phase(run_cli):
    code, out, err = run_cli("phasing", "--pn", "3/2", "--format", "json")
    assert code == 0 and err == ""
    document = json.loads(out)
    assert document["pn"] == "3/2" and list(document["quantities"]) == [
        "energy", "angular_momentum", "energy_flux", "x_rate", "phase", "time"]
    phase = document["quantities"]["phase"]
    assert phase["pn"] == "3/2" and phase["symbol"] == "phi - phi_0" and phase["provenance"]
    x, nu = S.x, S.nu
    # Blanchet, Living Rev. Relativ. 17, 2 (2014), sec. 9.3 (from memory)
    expected = -x**sp.Rational(-5, 2) / (32 * nu) * (1 + (sp.Rational(3715, 1008) + sp.Rational(55, 12) * nu) * x
                                                   - 10 * sp.pi * x**sp.Rational(3, 2))
    assert sp.expand(sp.sympify(phase["expression"], locals=NAMES) - expected) == 0
    # the form's pieces rebuild the expression: prefactor * sum coefficient * x^order
    rebuilt = sp.sympify(phase["prefactor"], locals=NAMES) * sp.Add(*[
        sp.sympify(term["coefficient"], locals=NAMES) * x ** sp.Rational(term["order"]) for term in phase["terms"]])
    assert sp.expand(rebuilt - expected) == 0
    energy = document["quantities"]["energy"]
    assert energy["prefactor"] == "-1/2*m*nu*c**2*x"


def test_text_and_latex(run_cli):
    code, out, _ = run_cli("phasing", "--pn", "1", "--quantity", "x_rate", "--quantity", "time")
    assert code == 0
    assert "dx/dt = 64/5*nu*c**3*x**5/(G*m)*(1 + x*(-743/336 - 11/4*nu))" in out
    assert "t - t_0 = -5/256*G*m/(nu*c**3*x**4)*(1 + x*(743/252 + 11/3*nu))" in out
    assert "E =" not in out and "(through relative order 1)" in out
    code, out, _ = run_cli("phasing", "--pn", "1", "--format", "latex")
    assert code == 0 and out.count(r"\begin{equation}") == 6 and r"\phi - \phi_0 = -\frac{1}{32 \nu x^{5/2}}" in out


def test_orders_beyond_the_inputs_are_refused_naming_the_quantity(run_cli):
    from stfalgebra.radiative.energy_balance import maximum_quantity_order

    beyond = str(maximum_quantity_order("phase") + sp.Rational(1, 2))
    code, out, err = run_cli("phasing", "--pn", beyond)
    assert code == 2 and out == "" and err.count("\n") == 1 and "phase" in err
    # the energy alone goes further (the 2PN dynamics)
    code, out, _ = run_cli("phasing", "--pn", str(maximum_quantity_order("energy")), "--quantity", "energy")
    assert code == 0 and "x**2*(-27/8 + 19/8*nu - 1/24*nu**2)" in out
    code, _, err = run_cli("phasing", "--pn", "0.3")
    assert code == 2 and err.count("\n") == 1


def test_cache_serves_the_same_document(run_cli):
    first = run_cli("phasing", "--pn", "1", "--format", "json")
    second = run_cli("phasing", "--pn", "1", "--format", "json")
    assert first == second and first[0] == 0
