"""The command-line contract of `enhancement` (flags, JSON keys, exit codes)."""

from __future__ import annotations

import json
import os
import subprocess
import sys
import time

import pytest
import sympy as sp

from stfalgebra.cli.command_enhancement import MAX_ECCENTRICITY
from stfalgebra.radiative.tail_enhancement import (
    TAIL_ENHANCEMENT_MAX_ECCENTRICITY,
    tail_enhancement,
    tail_enhancement_series,
)
from stfalgebra.symbols import et

NAMES = {"et": et}


def test_the_command_serves_the_range_of_the_library():
    # the command states the limit without importing sympy (cache hits stay light)
    assert float(MAX_ECCENTRICITY) == TAIL_ENHANCEMENT_MAX_ECCENTRICITY


def test_json_keys_and_values(run_cli):
    code, out, err = run_cli("enhancement", "--eccentricity", "0.5", "--json")
    assert code == 0 and err == ""
    obj = json.loads(out)
    assert set(obj) == {"eccentricity", "energy", "angular_momentum"}
    assert obj["eccentricity"] == "0.5"
    values = tail_enhancement(0.5)
    assert obj["energy"] == values.energy and obj["angular_momentum"] == values.angular_momentum


@pytest.mark.parametrize("text, shown", [("0", "0"), ("0.50", "0.5"), ("5e-1", "0.5"),
                                         ("1/3", "1/3"), ("+0.95", "0.95")])
def test_eccentricity_is_echoed_exactly(run_cli, text, shown):
    code, out, _ = run_cli("enhancement", "--eccentricity", text, "--json")
    assert code == 0 and json.loads(out)["eccentricity"] == shown


def test_circular_value_is_one(run_cli):
    code, out, _ = run_cli("enhancement", "--eccentricity", "0", "--json")
    obj = json.loads(out)
    assert obj["energy"] == 1.0 and obj["angular_momentum"] == 1.0


def test_series_with_and_without_eccentricity(run_cli):
    code, out, _ = run_cli("enhancement", "--eccentricity", "0.1", "--series", "6", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == {"eccentricity", "energy", "angular_momentum", "energy_series",
                        "angular_momentum_series"}
    phi, psi = tail_enhancement_series(6)
    assert sp.expand(sp.sympify(obj["energy_series"], locals=NAMES) - phi) == 0
    assert sp.expand(sp.sympify(obj["angular_momentum_series"], locals=NAMES) - psi) == 0
    code, out, _ = run_cli("enhancement", "--series", "4", "--json")
    assert code == 0
    obj = json.loads(out)
    assert set(obj) == {"energy_series", "angular_momentum_series"}
    # Blanchet & Schafer, Class. Quantum Grav. 10, 2699 (1993); Arun, Blanchet, Iyer & Sinha,
    # Phys. Rev. D 80, 124018 (2009) (from memory)
    assert obj["energy_series"] == "42955*et**4/768 + 2335*et**2/192 + 1"
    assert obj["angular_momentum_series"] == "2415*et**4/128 + 209*et**2/32 + 1"


def test_text_output_reports_the_harmonics(run_cli):
    code, out, _ = run_cli("enhancement", "--eccentricity", "0.5", "--series", "2")
    assert code == 0
    assert "phi(et) = 13.12593888" in out and "psi(et) = 4.87661702" in out
    assert "47 harmonics" in out and "phi(et) through et^2: 2335*et**2/192 + 1" in out


def test_cached_answer_is_the_same(run_cli):
    first = run_cli("enhancement", "--eccentricity", "0.3", "--json")
    second = run_cli("enhancement", "--eccentricity", "0.3", "--json")
    assert first == second
    assert "23 harmonics" in run_cli("enhancement", "--eccentricity", "0.3")[1]


@pytest.mark.parametrize("argv, words", [
    (["--eccentricity", "0.951"], "[0, 0.95]"),
    (["--eccentricity", "-0.1"], "[0, 0.95]"),
    (["--eccentricity", "1"], "[0, 0.95]"),
    (["--eccentricity", "nan"], "--eccentricity"),
    (["--eccentricity", "inf"], "--eccentricity"),
    (["--eccentricity", "1e100000000"], "--eccentricity"),
    (["--eccentricity", "9" * 5000], "--eccentricity"),
    (["--eccentricity", "0x1p-1"], "--eccentricity"),
    (["--eccentricity", "1/0"], "--eccentricity"),
    (["--eccentricity", ""], "--eccentricity"),
    (["--series", "3"], "even"),
    (["--series", "0"], "from 2 to 40"),
    (["--series", "42"], "from 2 to 40"),
    (["--series", "1e3"], "--series"),
    (["--series", "99999999999999"], "--series"),
    ([], "--eccentricity"),
])
def test_bad_input_is_one_line_and_exit_code_2(run_cli, argv, words):
    code, out, err = run_cli("enhancement", *argv)
    assert code == 2
    assert out == ""
    assert err.count("\n") == 1 and words in err and "Traceback" not in err


def test_a_high_eccentricity_takes_seconds_not_minutes(tmp_path):
    """The budget of the contract: `enhancement --eccentricity 0.9 --json` in a fresh process,
    nothing cached, in a few seconds (generous bound for a loaded machine)."""
    env = dict(os.environ, STFALGEBRA_NO_CACHE="1")
    start = time.perf_counter()
    done = subprocess.run([sys.executable, "-m", "stfalgebra", "enhancement", "--eccentricity", "0.9",
                           "--json"], capture_output=True, text=True, env=env, timeout=120)
    elapsed = time.perf_counter() - start
    assert done.returncode == 0, done.stderr
    assert json.loads(done.stdout)["energy"] == pytest.approx(41628.4241016622, rel=1e-12)
    assert elapsed < 30
