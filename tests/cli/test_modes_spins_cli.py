"""The `--spins` option of `mode` and `modes`: aligned-spin modes with chi1, chi2, refusals with
exit code 2, and outputs without the option unchanged."""

from __future__ import annotations

import json

import sympy as sp


def test_mode_with_aligned_spins_prints_the_spin_orbit_term(run_cli):
    code, out, _ = run_cli("mode", "2", "1", "--pn", "1", "--spins", "aligned", "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["spins"] == "aligned"
    x, delta, chi1, chi2 = sp.symbols("x delta chi1 chi2")
    # Hhat_21 = (i/3) delta x^(1/2) + (i/2) x sigma_l, sigma_l = X2 chi2 - X1 chi1 (Arun, Buonanno,
    # Faye & Ochsner 2009, from memory; derived in the engine, tests/radiative/test_spinning_channels.py)
    sigma = (1 - delta) / 2 * chi2 - (1 + delta) / 2 * chi1
    expected = sp.I * delta / 3 * sp.sqrt(x) + sp.I * x * sigma / 2
    assert sp.expand(sp.sympify(obj["hhat"]) - expected) == 0


def test_modes_table_names_the_spins(run_cli):
    code, out, _ = run_cli("modes", "--lmax", "2", "--pn-relative", "1", "--spins", "aligned")
    assert code == 0
    assert "chi1" in out and "spins aligned" in out


def test_without_the_option_the_output_is_unchanged(run_cli):
    plain = run_cli("mode", "2", "2", "--pn", "3/2", "--json")
    explicit = run_cli("mode", "2", "2", "--pn", "3/2", "--spins", "none", "--json")
    assert plain[0] == explicit[0] == 0 and plain[1] == explicit[1]
    assert "spins" not in json.loads(plain[1]) and "chi1" not in plain[1]


def test_refusals_exit_2_with_the_missing_terms(run_cli):
    code, _, err = run_cli("mode", "2", "1", "--pn", "2", "--spins", "aligned")
    assert code == 2 and "next-to-leading spin-orbit" in err
    code, _, err = run_cli("mode", "2", "2", "--pn", "3/2", "--spins", "aligned", "--orbit", "general")
    assert code == 2 and "tail" in err
    code, out, _ = run_cli("mode", "2", "1", "--pn", "1", "--spins", "aligned", "--orbit", "general", "--json")
    assert code == 0 and "chi1" in json.loads(out)["hhat"]
    code, _, err = run_cli("mode", "2", "2", "--pn", "1", "--spins", "precessing")
    assert code == 2


def test_flux_with_aligned_spins_by_both_routes(run_cli):
    code, out, _ = run_cli("flux", "--pn", "3/2", "--spins", "aligned", "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["spins"] == "aligned" and obj["routes_agree"] is True
    x, nu, delta, chi1, chi2 = sp.symbols("x nu delta chi1 chi2")
    # x^(3/2): 4 pi - 4 s_l - (5/4) delta sigma_l (Kidder 1995, from memory), here at nu = 0, delta = 1:
    # 4 pi - (11/4) chi1 (Tagoshi, Shibata, Tanaka & Sasaki 1996, from memory)
    energy = sp.sympify(obj["energy"])
    v = sp.Symbol("v", positive=True)
    term = sp.expand(energy.subs(x, v**2)).coeff(v, 3).subs({nu: 0, delta: 1})
    assert sp.expand(term - (4 * sp.pi - sp.Rational(11, 4) * chi1)) == 0
    code, _, err = run_cli("flux", "--pn", "2", "--spins", "aligned")
    assert code == 2 and "spin-spin" in err
    # eccentric averages with spins are served since issue 18's eccentric item (tests/cli/test_spinning_eccentric.py)
    code, out, _ = run_cli("flux", "--pn", "1", "--spins", "aligned", "--orbit", "eccentric", "--json")
    assert code == 0 and json.loads(out)["spins"] == "aligned"
    plain = run_cli("flux", "--pn", "1", "--json")
    assert plain[0] == 0 and "spins" not in json.loads(plain[1])


def test_emit_with_aligned_spins_takes_chi1_chi2(run_cli):
    code, out, err = run_cli("emit", "--mode", "2", "1", "--pn", "1", "--spins", "aligned", "--language", "numpy")
    assert code == 0 and "verified" in err
    assert "def stfalgebra_modes(x, nu, delta, chi1, chi2, psi)" in out
    code, _, err = run_cli("emit", "--mode", "2", "1", "--pn", "2", "--spins", "aligned", "--language", "numpy")
    assert code == 2 and "next-to-leading spin-orbit" in err


def test_check_with_aligned_spins_agrees_and_differs(run_cli):
    # Hhat_21 = (i/3) delta x^(1/2) + (i/2) x sigma_l (Arun et al. 2009, from memory)
    right = "I*delta/3*sqrt(x) + I*x*((1-delta)/2*chi2 - (1+delta)/2*chi1)/2"
    code, out, _ = run_cli("check", "--mode", "2", "1", "--pn", "1", "--spins", "aligned", "--json", "--", right)
    assert code == 0 and json.loads(out)["verdict"] == "agree" and json.loads(out)["spins"] == "aligned"
    wrong = "I*delta/3*sqrt(x) + I*x*((1-delta)/2*chi2 + (1+delta)/2*chi1)/2"      # sign of chi1 flipped
    code, _, _ = run_cli("check", "--mode", "2", "1", "--pn", "1", "--spins", "aligned", "--", wrong)
    assert code == 1
    code, _, err = run_cli("check", "--mode", "2", "1", "--pn", "1", "--", right)     # chi needs --spins
    assert code == 2 and "name 'chi" in err


def test_flux_with_aligned_spins_has_the_balance_and_the_forms(run_cli):
    code, out, _ = run_cli("flux", "--pn", "3/2", "--spins", "aligned", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj["forms"]) == {"energy", "angular_momentum", "binding_energy", "x_rate"}
    x, nu, delta, chi1, chi2 = sp.symbols("x nu delta chi1 chi2")
    v = sp.Symbol("v", positive=True)
    x1, x2 = (1 + delta) / 2, (1 - delta) / 2
    s_l, sigma_l = x1**2 * chi1 + x2**2 * chi2, x2 * chi2 - x1 * chi1

    def at_three_halves(text):
        return sp.expand(sp.expand(sp.sympify(text).subs(x, v**2)).coeff(v, 3).subs(nu, x1 * x2))

    # E = -(m nu c^2 x/2)[1 + ... + x^(3/2)(14/3 s_l + 2 delta sigma_l)] (Kidder 1995, Blanchet 2014, from memory)
    assert at_three_halves(obj["binding_energy"]) == sp.expand((sp.Rational(14, 3) * s_l + 2 * delta * sigma_l)
                                                               .subs(nu, x1 * x2))
    # dx/dt: x^(3/2)(4 pi - beta), 12 beta = 113 s_l + 75 nu (chi1 + chi2) (Kidder 1995, from memory)
    beta = (113 * s_l + 75 * x1 * x2 * (chi1 + chi2)) / 12
    assert at_three_halves(obj["x_rate"]) == sp.expand(4 * sp.pi - beta)
    # each printed term names its rows: the spin-orbit terms come from the spin row, the tail's 4 pi too
    top = obj["forms"]["energy"]["terms"][-1]
    assert top["order"] == "3/2" and any("spin parts" in row for row in top["provenance"])
    assert any(row.startswith("tail") for row in top["provenance"])
    code, text, _ = run_cli("flux", "--pn", "3/2", "--spins", "aligned")
    assert code == 0 and "# spins aligned" in text and "x_rate: dx/dt = " in text


def test_mode_with_aligned_spins_in_the_printed_forms(run_cli):
    code, out, _ = run_cli("mode", "2", "1", "--pn-relative", "1", "--spins", "aligned", "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["sign_convention"].startswith("minus-phi-theta")
    assert [term["order"] for term in obj["terms"]] == ["0", "1/2", "1"]
    assert any("spin parts" in row for row in obj["terms"][1]["provenance"])
    code, out, _ = run_cli("mode", "2", "1", "--pn-relative", "1", "--spins", "aligned", "--format", "latex")
    assert code == 0 and "% spins aligned" in out and r"\chi_1" in out
