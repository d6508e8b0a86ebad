"""The command-line contract of `evolve` (flags, JSON keys, exit codes)."""

from __future__ import annotations

import json

import pytest
import sympy as sp

from stfalgebra.radiative.tail_enhancement import (
    AngularMomentumTailEnhancement,
    EnergyTailEnhancement,
)

NAMES = {"x": sp.Symbol("x", positive=True), "nu": sp.Symbol("nu", positive=True),
         "et": sp.Symbol("et", nonnegative=True), "e": sp.Symbol("e", nonnegative=True),
         "c0": sp.Symbol("c0", positive=True)}


def test_rates_json_keys_and_newtonian_values(run_cli):
    code, out, _ = run_cli("evolve", "--pn", "0", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == {"pn", "rates", "normalisation", "newtonian_track", "forms"}
    assert obj["pn"] == "0" and set(obj["rates"]) == {"dx_dt", "de_dt"}
    et = NAMES["et"]
    # Peters, Phys. Rev. 136, B1224 (1964), in x = G m/(c^2 a)
    dx = sp.sympify(obj["rates"]["dx_dt"], locals=NAMES)
    de = sp.sympify(obj["rates"]["de_dt"], locals=NAMES)
    assert sp.simplify(dx - sp.Rational(64, 5) * (1 + sp.Rational(73, 24) * et**2 + sp.Rational(37, 96) * et**4)
                       / (1 - et**2) ** sp.Rational(7, 2)) == 0
    assert sp.simplify(de + sp.Rational(304, 15) * et * (1 + sp.Rational(121, 304) * et**2)
                       / (1 - et**2) ** sp.Rational(5, 2)) == 0
    assert obj["newtonian_track"].startswith("a = c0*e**(12/19)")


def test_track_json(run_cli):
    code, out, _ = run_cli("evolve", "--pn", "1", "--x0", "0.01", "--e0", "0.4",
                           "--x-final", "0.05", "--nu", "0.2", "--points", "5", "--steps", "200",
                           "--json")
    assert code == 0
    obj = json.loads(out)
    assert obj["nu"] == 0.2 and len(obj["track"]) == 5
    xs = [point["x"] for point in obj["track"]]
    es = [point["et"] for point in obj["track"]]
    taus = [point["tau"] for point in obj["track"]]
    assert xs[0] == 0.01 and xs[-1] == pytest.approx(0.05, rel=1e-12)
    assert all(b < a_ for a_, b in zip(es, es[1:]))          # circularisation
    assert all(b > a_ for a_, b in zip(taus, taus[1:]))
    x = NAMES["x"]
    assert sp.sympify(obj["rates"]["dx_dt"], locals=NAMES).has(x)


def test_tail_rates_and_track_at_one_and_a_half_pn(run_cli):
    code, out, _ = run_cli("evolve", "--pn", "1.5", "--x0", "0.01", "--e0", "0.3",
                           "--x-final", "0.02", "--points", "3", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == {"pn", "rates", "normalisation", "newtonian_track", "forms", "enhancement_functions",
                        "nu", "track"}
    assert obj["pn"] == "3/2" and set(obj["enhancement_functions"]) == {"phi", "psi"}
    phi, psi = sp.Function("phi"), sp.Function("psi")
    names = dict(NAMES, phi=phi, psi=psi)
    dx = sp.sympify(obj["rates"]["dx_dt"], locals=names)
    de = sp.sympify(obj["rates"]["de_dt"], locals=names)
    x, et = NAMES["x"], NAMES["et"]
    # the x^(3/2) term of dx/dt is (64/5) 4 pi phi(et) (Newtonian flux balance, E = -x/2)
    assert sp.expand(dx.coeff(x ** sp.Rational(3, 2)) - sp.Rational(256, 5) * sp.pi * phi(et)) == 0
    assert de.has(phi(et)) and de.has(psi(et))
    assert [point["x"] for point in obj["track"]][::2] == [0.01, 0.02]


def test_two_pn_rates_and_track(run_cli):
    """`evolve --pn 2`: the keys of 1.5PN; the rates are the derived 2PN series (circular limit of
    dx/dt: (64/5)(34103/18144 + 13661/2016 nu + 59/18 nu^2), Blanchet, Living Rev. Relativ. 17, 2
    (2014), sec. 9.3, from memory), and the track runs with the same integrator."""
    code, out, _ = run_cli("evolve", "--pn", "2", "--x0", "0.01", "--e0", "0.3",
                           "--x-final", "0.02", "--points", "3", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == {"pn", "rates", "normalisation", "newtonian_track", "forms", "enhancement_functions",
                        "nu", "track"}
    assert obj["pn"] == "2"
    phi, psi = sp.Function("phi"), sp.Function("psi")
    names = dict(NAMES, phi=phi, psi=psi)
    x, et, nu = NAMES["x"], NAMES["et"], NAMES["nu"]
    dx = sp.expand(sp.sympify(obj["rates"]["dx_dt"], locals=names))
    circular = sp.Rational(64, 5) * (sp.Rational(34103, 18144) + sp.Rational(13661, 2016) * nu
                                     + sp.Rational(59, 18) * nu**2)
    assert sp.expand(dx.coeff(x, 2).subs(et, 0) - circular) == 0
    from stfalgebra.radiative.secular_rates import secular_rates

    x_rate, _ = secular_rates(2)
    assert sp.simplify(dx.coeff(x, 2) - x_rate.coefficient(2).subs(et, NAMES["et"])) == 0
    track = obj["track"]
    assert [point["x"] for point in track][::2] == [0.01, 0.02]
    assert track[-1]["et"] < track[0]["et"] and track[-1]["tau"] > 0
    # the 2PN terms change the track, slightly, at x ~ 0.01-0.02
    code, out15, _ = run_cli("evolve", "--pn", "1.5", "--x0", "0.01", "--e0", "0.3",
                             "--x-final", "0.02", "--points", "3", "--json")
    other = json.loads(out15)["track"]
    assert 0 < abs(track[-1]["tau"] - other[-1]["tau"]) < 0.05 * abs(other[-1]["tau"])


def test_text_output(run_cli):
    code, out, _ = run_cli("evolve", "--pn", "0", "--x0", "0.01", "--e0", "0.1",
                           "--x-final", "0.02", "--points", "3")
    assert code == 0
    assert "dx_dt:" in out and "de_dt:" in out and "Newtonian track" in out
    assert len([line for line in out.splitlines() if line.strip().startswith("0.0")]) == 3


@pytest.mark.parametrize("argv, words", [
    (["--pn", "5/2"], "--pn = 5/2: the toolkit derives this result through order 2 at most"),
    (["--pn", "-1"], "--pn"),
    (["--pn", "0", "--x0", "0.01", "--e0", "1.2", "--x-final", "0.02"], "--e0 must be a number in [0, 1)"),
    (["--pn", "3/2", "--x0", "0.01", "--e0", "0.96", "--x-final", "0.02"], "0.95"),
    (["--pn", "0", "--x0", "-0.01", "--e0", "0.2", "--x-final", "0.02"], "--x0 must be a number in [1e-8, 1)"),
    (["--pn", "0", "--x0", "0.01", "--e0", "0.2", "--x-final", "0.02", "--nu", "0.3"], "--nu must be a number in (0, 1/4]"),
    (["--pn", "0", "--x0", "0.01", "--x-final", "0.02"], "--e0"),
    (["--pn", "0", "--x0", "abc", "--e0", "0.2", "--x-final", "0.02"], "--x0"),
    (["--pn", "0", "--x0", "nan", "--e0", "0.2", "--x-final", "0.02"], "--x0"),
    (["--pn", "0", "--x0", "1e999", "--e0", "0.2", "--x-final", "0.02"], "--x0"),
    (["--pn", "0", "--x0", "0.01", "--e0", "0.2", "--x-final", "0.02", "--points", "1"], "--points"),
    (["--pn", "0", "--x0", "0.001", "--e0", "0.6", "--x-final", "0.1", "--steps", "1"], "steps"),
])
def test_bad_input_is_one_line_and_exit_code_2(run_cli, argv, words):
    code, out, err = run_cli("evolve", *argv)
    assert code == 2
    assert out == ""
    assert err.count("\n") == 1 and words in err and "Traceback" not in err


def test_rates_refer_to_the_toolkits_enhancement_functions():
    # the strings print the functions by the names phi, psi
    assert str(EnergyTailEnhancement(NAMES["et"])) == "phi(et)"
    assert str(AngularMomentumTailEnhancement(NAMES["et"])) == "psi(et)"


# ------------------------------------------------------------ issue 12 regressions

@pytest.mark.parametrize("nu", ["abc", "nan", "-0.1", "0.3", "inf"])
def test_invalid_nu_is_refused_even_without_a_track(run_cli, nu):
    # regression: an invalid --nu was silently ignored when no track was asked for
    code, out, err = run_cli("evolve", "--pn", "0", "--nu", nu)
    assert (code, out) == (2, "") and err.count("\n") == 1
    assert "--nu must be a number in (0, 1/4]" in err


def test_nu_accepts_fractions(run_cli):
    # regression: `--nu 1/4` was refused as "must be a number" while `--pn 3/2` was accepted
    argv = ["evolve", "--pn", "0", "--x0", "0.01", "--e0", "0.3", "--x-final", "0.02", "--points", "2",
            "--steps", "50", "--json"]
    code, fraction, _ = run_cli(*argv, "--nu", "1/4")
    assert code == 0 and json.loads(fraction)["nu"] == 0.25
    code, decimal, _ = run_cli(*argv, "--nu", "0.25")
    assert code == 0 and decimal == fraction


def test_unused_track_options_are_noted(run_cli):
    code, _, err = run_cli("evolve", "--pn", "0", "--nu", "0.2", "--steps", "10")
    assert code == 0 and err == "stfalgebra evolve: note: --nu, --steps used only with a track (--x0, --e0, --x-final)\n"


def test_track_beyond_the_pn_regime_is_warned_about(run_cli):
    # regression: no warning when the track left the regime where the PN expansion means
    # anything; the bound is the test-mass separatrix x/(1 - e^2) = 1/(6 + 2e) (Cutler,
    # Kennefick & Poisson, Phys. Rev. D 50, 3816 (1994), from memory)
    code, out, err = run_cli("evolve", "--pn", "0", "--x0", "0.01", "--e0", "0.3", "--x-final", "0.2",
                          "--points", "3", "--steps", "200", "--json")
    assert code == 0 and json.loads(out)["track"][-1]["x"] == pytest.approx(0.2)
    assert err.count("\n") == 1 and err.startswith("stfalgebra evolve: warning: the track reaches x/(1 - e_t^2) = ")
    assert "separatrix" in err
    code, _, err = run_cli("evolve", "--pn", "0", "--x0", "0.01", "--e0", "0.3", "--x-final", "0.05",
                        "--points", "3", "--steps", "200")
    assert code == 0 and err == ""


def test_track_uses_the_payload_rates_read_back_exactly():
    """A track integrates the rates of the (possibly cached) payload, read back from its text:
    they equal the derived float rates (regression: a cached `evolve --pn 2` with a track used to
    derive the rates a second time)."""
    from stfalgebra.cli.command_evolve import _series_from_text, evolve_payload
    from stfalgebra.radiative.secular_rates import compile_secular_rates, numeric_secular_rates

    payload = evolve_payload("3/2", use_cache=False)
    read_back = compile_secular_rates(*(_series_from_text(payload["rates"][name]) for name in ("dx_dt", "de_dt")))
    derived = numeric_secular_rates("3/2")
    for point in ((0.02, 0.4, 0.2), (0.01, 0.01, 0.25), (0.05, 0.7, 0.1)):
        for ours, theirs in zip(read_back, derived):
            assert ours(*point) == pytest.approx(theirs(*point), rel=1e-12, abs=1e-14)
