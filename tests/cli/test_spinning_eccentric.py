"""Tests of the aligned-spin eccentric commands (stfalgebra/cli/spinning_eccentric.py):
``flux --orbit eccentric --spins aligned`` and ``evolve --spins aligned`` with ``--chi1``,
``--chi2``; without the options every output stays as before (the non-spinning CLI tests pin it)."""

from __future__ import annotations

import json

import pytest
import sympy as sp

from stfalgebra.radiative.secular_tracks import integrate_secular_evolution

TRACK = ("--x0", "0.01", "--e0", "0.3", "--x-final", "0.02", "--nu", "0.2", "--points", "3")


def test_eccentric_flux_with_spins_json(run_cli):
    code, out, err = run_cli("flux", "--orbit", "eccentric", "--spins", "aligned", "--pn", "3/2", "--json")
    assert code == 0 and err == ""
    payload = json.loads(out)
    assert payload["spins"] == "aligned" and payload["orbit"] == "eccentric"
    assert {"energy", "angular_momentum", "forms", "enhancement_functions", "enhancement_series"} <= set(payload)
    energy = sp.sympify(payload["energy"])
    assert {"chi1", "chi2", "delta", "et", "nu", "x"} <= {str(symbol) for symbol in energy.free_symbols}
    # the circular limit of the spin term: -4 s_l - 5/4 delta sigma_l (test mass: -11/4)
    x, et, chi1, chi2, delta, nu = sp.symbols("x et chi1 chi2 delta nu")
    spin = sp.expand(energy.subs(sp.Function("phi")(et), 0)).coeff(x**sp.Rational(3, 2))
    assert sp.simplify(spin.subs({et: 0, chi1: 1, chi2: 0, delta: 1, nu: 0})) == sp.Rational(-11, 4)


def test_without_spins_the_eccentric_flux_is_unchanged(run_cli):
    _, plain, _ = run_cli("flux", "--orbit", "eccentric", "--pn", "1", "--json")
    _, spinning, _ = run_cli("flux", "--orbit", "eccentric", "--spins", "aligned", "--pn", "1", "--json")
    plain, spinning = json.loads(plain), json.loads(spinning)
    assert "spins" not in plain and spinning.pop("spins") == "aligned"
    assert spinning == plain       # no spin term below x^(3/2)


def test_evolve_with_spins_rates_and_track(run_cli):
    code, out, err = run_cli("evolve", "--pn", "3/2", "--spins", "aligned", "--chi1", "0.9", "--chi2=-1/2",
                             *TRACK, "--json")
    assert code == 0 and err == ""
    payload = json.loads(out)
    assert payload["spins"] == "aligned" and (payload["chi1"], payload["chi2"]) == (0.9, -0.5)
    assert "chi1" in payload["rates"]["dx_dt"] and "chi2" in payload["rates"]["de_dt"]
    _, plain, _ = run_cli("evolve", "--pn", "3/2", *TRACK, "--json")
    plain = json.loads(plain)
    assert "spins" not in plain and "chi1" not in plain
    # spins aligned with L slow the inspiral: e_t at the end differs from the non-spinning track
    assert payload["track"][-1]["et"] != plain["track"][-1]["et"]
    assert payload["track"][-1]["tau"] > plain["track"][-1]["tau"]


def test_evolve_with_zero_spins_is_the_non_spinning_track(run_cli):
    code, out, _ = run_cli("evolve", "--pn", "3/2", "--spins", "aligned", *TRACK, "--json")
    assert code == 0
    expected = integrate_secular_evolution(0.01, 0.3, 0.02, 0.2, pn=sp.Rational(3, 2), points=3)
    assert json.loads(out)["track"] == [point.to_json() for point in expected]


@pytest.mark.parametrize("argv, words", [
    (("evolve", "--pn", "1", "--chi1", "0.5"), "--chi1 needs --spins aligned"),
    (("evolve", "--pn", "1", "--spins", "aligned", "--chi2", "1.01"), "--chi2 must be a number in [-1, 1]"),
    (("evolve", "--pn", "1", "--spins", "aligned", "--chi1", "nan"), "--chi1 must be a number in [-1, 1]"),
    (("evolve", "--pn", "2", "--spins", "aligned"), "spin-spin terms"),
    (("flux", "--orbit", "eccentric", "--spins", "aligned", "--pn", "2"), "spin-spin terms"),
])
def test_bad_input_is_one_line_and_exit_code_2(run_cli, argv, words):
    code, out, err = run_cli(*argv)
    assert code == 2 and out == ""
    assert words in err and err.count("\n") == 1


def test_the_bound_with_spins_is_read_from_the_table():
    from dataclasses import replace

    from stfalgebra.cli.options import maximum_pn_order
    from stfalgebra.errors import OrderBeyondInputsError
    from stfalgebra.orders import PNOrder
    from stfalgebra.radiative import contributions as table

    rows = table.table_for_spins("aligned")
    assert maximum_pn_order("evolve", spins="aligned") == table.maximum_eccentric_order(rows) == PNOrder(3, 2)
    assert maximum_pn_order("flux", orbit="eccentric", spins="aligned") == PNOrder(3, 2)
    # without the eccentric orbit in the spin row, the table has no eccentric average with spins
    without = tuple(replace(row, orbits=("circular", "general")) if row.family == "instantaneous" else row
                    for row in rows)
    with pytest.raises(OrderBeyondInputsError):
        table.maximum_eccentric_order(without)
