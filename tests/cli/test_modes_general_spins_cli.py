"""`--spins general` on `mode` and `modes`: general-orbit modes with spins of any direction, every
m on its own; refusals (circular orbits, other commands, orders beyond the leading spin-orbit
terms) with one line and exit code 2."""

from __future__ import annotations

import json

import sympy as sp


def test_mode_json_carries_the_spin_components(run_cli):
    code, out, _ = run_cli("mode", "2", "-2", "--orbit", "general", "--pn-relative", "1", "--spins", "general",
                           "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["spins"] == "general"
    hhat = sp.sympify(obj["hhat"])
    names = {str(s) for s in hhat.free_symbols}
    assert {"chi1_n", "chi1_lambda", "chi2_n", "chi2_lambda"} <= names
    # no spin: the non-spinning general-orbit mode (the planar symmetry then holds again)
    plain = sp.sympify(json.loads(run_cli("mode", "2", "-2", "--orbit", "general", "--pn-relative", "1",
                                          "--json")[1])["hhat"])
    zero = {sp.Symbol(f"chi{a}_{k}", real=True): 0 for a in (1, 2) for k in ("n", "lambda", "ell")}
    zero.update({sp.Symbol(f"chi{a}_{k}"): 0 for a in (1, 2) for k in ("n", "lambda", "ell")})
    assert sp.expand(hhat.subs(zero) - plain) == 0


def test_modes_table_names_the_spin_components(run_cli):
    code, out, _ = run_cli("modes", "--lmax", "2", "--orbit", "general", "--pn-relative", "1", "--spins", "general")
    assert code == 0
    assert "spins of any direction" in out and "chi1_lambda" in out
    code, out, _ = run_cli("modes", "--lmax", "2", "--orbit", "general", "--pn-relative", "1", "--spins", "general",
                           "--format", "latex")
    assert code == 0 and r"\chi_{1\lambda}" in out


def test_refusals_exit_2_in_one_line(run_cli):
    code, _, err = run_cli("mode", "2", "2", "--pn", "1", "--spins", "general")
    assert code == 2 and "general orbits only" in err and len(err.strip().splitlines()) == 1
    code, _, err = run_cli("mode", "2", "1", "--orbit", "general", "--pn-relative", "3/2", "--spins", "general")
    assert code == 2 and "next-to-leading spin-orbit" in err
    for command in (["flux", "--pn", "1"], ["emit", "--pn", "1", "--lmax", "2", "--out", "unused"]):
        code, _, err = run_cli(*command, "--spins", "general")
        assert code == 2 and "general" in err and len(err.strip().splitlines()) == 1
