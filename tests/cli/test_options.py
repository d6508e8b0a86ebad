"""Tests of stfalgebra/cli/options.py: every numeric option parsed, validated and bounded in one
place, with the same bounds on every command that takes it (issue 12)."""

from __future__ import annotations

import os
import subprocess
import sys
import textwrap
from fractions import Fraction
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import stfalgebra
from stfalgebra.cli import main
from stfalgebra.cli.options import (
    L_MAXIMUM, STEPS_RANGE, TRACK_POINTS_RANGE, VERIFICATION_POINTS_RANGE, check_mode, maximum_pn_order,
    parse_bounded_order, parse_eccentricity, parse_frequency_parameter, parse_integer, parse_lmax, parse_nu,
    parse_number, parse_steps, parse_time_limit, parse_track_points,
)
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.orders import PNOrder

PACKAGE_PARENT = Path(stfalgebra.__file__).resolve().parent.parent


@pytest.fixture(autouse=True)
def _private_cache(tmp_path, monkeypatch):
    monkeypatch.setenv("STFALGEBRA_CACHE_DIR", str(tmp_path / "cache"))


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


# ------------------------------------------------------------------------------ the parsers

def test_documented_maximum_of_l_is_at_least_30():
    assert L_MAXIMUM >= 30
    assert parse_lmax(str(L_MAXIMUM)) == L_MAXIMUM
    with pytest.raises(ValueError, match=f"--lmax must be an integer from 2 to {L_MAXIMUM}, got '{L_MAXIMUM + 1}'"):
        parse_lmax(str(L_MAXIMUM + 1))


@pytest.mark.parametrize("text", ["1e100000000", "9" * 5000, "1" + "0" * 100, "0x10", "2.0", " ", "", "nan",
                                  "1_000"])
def test_integers_refuse_text_before_converting_it(text):
    with pytest.raises(ValueError, match="must be an integer from 1 to 100000"):
        parse_steps(text)


@pytest.mark.parametrize("text, value", [("1/4", Fraction(1, 4)), ("0.25", Fraction(1, 4)), ("2.5e-1", Fraction(1, 4)),
                                         (" 1 / 5 ", Fraction(1, 5)), (".2", Fraction(1, 5)), ("+0.2", Fraction(1, 5))])
def test_numbers_accept_decimals_and_fractions_exactly(text, value):
    assert parse_nu(text) == value


@pytest.mark.parametrize("text", ["abc", "nan", "NaN", "inf", "-inf", "0", "-0.1", "0.3", "1/0", "0x1p-2",
                                  "1e100000000", "1/" + "9" * 40, "1e-400", "0.25.1", "1//4", ""])
def test_nu_outside_its_range_or_not_a_number_is_one_line(text):
    with pytest.raises(ValueError) as info:
        parse_nu(text)
    message = str(info.value)
    assert message.startswith("--nu must be a number in (0, 1/4]") and "\n" not in message


def test_eccentricity_and_frequency_parameter_ranges():
    assert parse_eccentricity("0") == 0 and parse_eccentricity("9/10") == Fraction(9, 10)
    for bad in ("1", "1.2", "-0.1", "0.99999999999999999999"):  # the last one's double is 1.0
        with pytest.raises(ValueError, match=r"\[0, 1\)"):
            parse_eccentricity(bad)
    assert parse_frequency_parameter("1e-8", "--x0") == Fraction(1, 10**8)
    for bad in ("0", "1e-9", "1", "-0.01"):
        with pytest.raises(ValueError, match=r"--x0 must be a number in \[1e-8, 1\)"):
            parse_frequency_parameter(bad, "--x0")


def test_counts_and_time_limits():
    assert parse_steps(str(STEPS_RANGE[1])) == STEPS_RANGE[1]
    assert parse_track_points("2") == 2
    with pytest.raises(ValueError, match=f"from {TRACK_POINTS_RANGE[0]} to {TRACK_POINTS_RANGE[1]}"):
        parse_track_points("100000000")
    assert VERIFICATION_POINTS_RANGE == (1, 1000)
    assert parse_time_limit("2.5") == 2.5 and parse_time_limit("5/2") == 2.5
    with pytest.raises(ValueError, match=r"\[1, 3600\] seconds"):
        parse_time_limit("0")


@settings(max_examples=200, deadline=None)
@given(st.text(max_size=80))
def test_fuzz_number_parser_never_raises_anything_but_a_value_error(text):
    try:
        value = parse_number(text, "--x", low=Fraction(-10), high=Fraction(10))
    except ValueError as exc:
        assert "\n" not in str(exc)
    else:
        assert -10 <= value <= 10


def test_check_mode():
    assert check_mode(30, -30) == (30, -30)
    for l, m in ((1, 0), (31, 1), (2, 3)):
        with pytest.raises(ValueError):
            check_mode(l, m)


# --------------------------------------------------------------------- the largest PN order

def test_maximum_pn_order_reads_the_table_of_contributions():
    from stfalgebra.radiative import contributions as table

    three_halves = PNOrder(3, 2)
    # the mass quadrupole with its 2.5PN rows (reaction, canonical moment, quadratic, ADM tail)
    assert maximum_pn_order("mode", relative=True, modes=[(2, 2)]) == PNOrder(5, 2)
    assert maximum_pn_order("mode", relative=True, modes=[(2, 1)]) == PNOrder(5, 2)
    assert maximum_pn_order("modes", orbit="general", relative=True, lmax=4) == 1
    # absolute: the largest order any mode asked for supports; leading orders (l - 2)/2 (mass)
    # and (l - 1)/2 (current), Blanchet LRR 2014 sec. 9 (from memory)
    assert maximum_pn_order("mode", modes=[(2, 2)]) == PNOrder(5, 2)
    assert maximum_pn_order("check", modes=[(3, 2)]) == 1 + PNOrder(5, 2)
    assert maximum_pn_order("emit", lmax=5) == max(table.maximum_mode_order(l, m, "circular")
                                                   for l in range(2, 6) for m in (l, l - 1))
    assert maximum_pn_order("flux") == table.maximum_flux_order("circular") == PNOrder(5, 2)
    assert maximum_pn_order("flux", orbit="eccentric") == table.maximum_eccentric_order() == maximum_pn_order("evolve")
    with pytest.raises(ValueError, match="unknown command"):
        maximum_pn_order("plot")


def test_bounded_order_names_the_maximum():
    with pytest.raises(OrderBeyondInputsError, match="--pn = 2: the toolkit derives this result through order 3/2"):
        parse_bounded_order("2", "--pn", PNOrder(3, 2))
    calls = []
    with pytest.raises(ValueError, match="multiple of 1/2"):
        parse_bounded_order("1e100000000", "--pn", lambda: calls.append(1))
    assert calls == []  # malformed text is refused before the maximum is even looked up


# --------------------------------------------------- the same bounds on every command

@pytest.mark.parametrize("argv, message", [
    (["mode", "31", "2", "--pn", "0"], "l must be an integer from 2 to 30, got '31'"),
    (["mode", "2000", "2000", "--pn-relative", "0"], "l must be an integer from 2 to 30, got '2000'"),
    (["modes", "--lmax", "60", "--pn", "0"], "--lmax must be an integer from 2 to 30, got '60'"),
    (["emit", "--lmax", "31", "--pn", "0"], "--lmax must be an integer from 2 to 30, got '31'"),
    (["emit", "--mode", "40", "2", "--pn", "0"], "mode indices must be an integer from -30 to 30, got '40'"),
    (["check", "--mode", "40", "2", "--pn", "0", "x"], "mode indices must be an integer from -30 to 30, got '40'"),
    (["evolve", "--pn", "0", "--x0", "0.01", "--e0", "0.2", "--x-final", "0.02", "--steps", "1000000000"],
     "--steps must be an integer from 1 to 100000, got '1000000000'"),
    (["evolve", "--pn", "0", "--x0", "0.01", "--e0", "0.2", "--x-final", "0.02", "--points", "100000000"],
     "--points must be an integer from 2 to 10000, got '100000000'"),
    (["emit", "--mode", "2", "2", "--pn", "0", "--points", "100000"], "--points must be an integer from 1 to 1000"),
    (["check", "--mode", "2", "2", "--pn", "0", "--time-limit", "1e9", "x"], "--time-limit must be a number in [1, 3600]"),
])
def test_unbounded_options_are_refused_at_once(capsys, monkeypatch, argv, message):
    # regression: `modes --lmax 60`, `mode 2000 2000`, `evolve --steps 1000000000` and
    # `--points 100000000` ran without bound; now they are refused before any derivation starts
    from stfalgebra.radiative import modes as mode_module
    from stfalgebra.radiative import secular_tracks

    def no_work(*args, **kwargs):
        raise AssertionError("a derivation started before the options were checked")

    for module, name in ((mode_module, "derive_mode"), (mode_module, "derive_modes"),
                         (secular_tracks, "integrate_secular_evolution")):
        monkeypatch.setattr(module, name, no_work)
    code, out, err = run(capsys, *argv)
    assert (code, out) == (2, "")
    assert message in err and err.count("\n") == 1


_HUGE_ORDERS = textwrap.dedent("""
    import contextlib, io, sys
    from stfalgebra.cli import main
    for argv in [["mode", "2", "2", "--pn", "1e100000000"], ["modes", "--lmax", "3", "--pn", "1e100000000"],
                 ["flux", "--pn", "1e100000000"], ["evolve", "--pn", "1e100000000"],
                 ["check", "--mode", "2", "2", "--pn", "1e100000000", "x"],
                 ["mode", "2", "2", "--pn", "1e100000"], ["emit", "--mode", "2", "2", "--pn-relative", "1e100000000"]]:
        err = io.StringIO()
        with contextlib.redirect_stderr(err):
            code = main(argv)
        print(code, err.getvalue().strip())
""")


def test_huge_pn_orders_are_refused_at_once_on_every_command(tmp_path):
    # regression: `--pn 1e100000000` hung mode, modes, flux, evolve and check (still running
    # after 10 minutes), and `--pn 1e100000` ended in "Exceeds the limit (4300 digits)"; the
    # subprocess's timeout bounds the test if a hang comes back
    env = dict(os.environ, PYTHONPATH=str(PACKAGE_PARENT), STFALGEBRA_CACHE_DIR=str(tmp_path))
    done = subprocess.run([sys.executable, "-c", _HUGE_ORDERS], env=env, capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert len(lines) == 7
    for line in lines:
        code, message = line.split(" ", 1)
        assert code == "2", line
        assert "must be a multiple of 1/2 such as 1, 1.5 or 3/2, got '1e100000" in message, line


def test_orders_beyond_the_maximum_name_it_on_every_command(capsys):
    for argv, maximum in ((["mode", "2", "2", "--pn", "7/2"], "5/2"), (["flux", "--pn", "3"], "5/2"),
                          (["flux", "--orbit", "eccentric", "--pn", "5/2"], "2"), (["evolve", "--pn", "5/2"], "2"),
                          (["modes", "--lmax", "3", "--pn-relative", "3"], "5/2"),
                          (["emit", "--mode", "2", "2", "--pn", "3"], "5/2")):
        code, out, err = run(capsys, *argv)
        assert (code, out) == (2, ""), argv
        assert f"through order {maximum} at most" in err and err.count("\n") == 1, err


def test_building_the_parsers_does_not_import_the_table_of_contributions():
    # regression: help texts that printed the table's bounds were computed for every command at
    # start-up, so a cached `modes` imported the table (and flint) and took twice as long
    import subprocess
    import sys

    code = ("import sys; from stfalgebra.cli import build_parser; build_parser(); "
            "print('stfalgebra.radiative.contributions' in sys.modules, 'flint' in sys.modules)")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert done.stdout.split() == ["False", "False"]
