"""The command-line contract of `orbit-mode` (flags, JSON keys, exit codes): the printed
expressions are those of the library, the harmonics those of numeric_mode_harmonics."""

from __future__ import annotations

import json
import math
import re

import pytest
import sympy as sp

from stfalgebra.binary.keplerian import u
from stfalgebra.radiative.eccentric_modes import mode_along_orbit, numeric_mode_harmonics
from stfalgebra.symbols import delta, et, nu, x

NAMES = {"et": et, "nu": nu, "delta": delta, "x": x, "u": u}


def test_json_keys_and_the_exact_expressions(run_cli):
    code, out, err = run_cli("orbit-mode", "2", "2", "--json")
    assert code == 0 and err == ""
    obj = json.loads(out)
    assert set(obj) == {"l", "m", "pn", "amplitude", "phase", "notes"}
    assert (obj["l"], obj["m"], obj["pn"]) == (2, 2, "1")
    mode = mode_along_orbit(2, 2, 1)
    amplitude = sp.sympify(obj["amplitude"]["expression"], locals=NAMES)
    assert sp.expand(amplitude - mode.amplitude) == 0
    phase = sp.sympify(obj["phase"]["expression"], locals=NAMES)
    assert sp.expand(phase - mode.periodic_phase) == 0
    assert [term["order"] for term in obj["amplitude"]["terms"]] == ["0", "1"]
    assert any("no tails, no memory" in note for note in obj["notes"])


def test_harmonics_are_those_of_the_library(run_cli):
    code, out, _ = run_cli("orbit-mode", "3", "3", "--eccentricity", "0.4", "--harmonics", "5",
                           "--x", "1/20", "--nu", "0.2", "--json")
    assert code == 0
    numeric = json.loads(out)["numeric"]
    assert {key: numeric[key] for key in ("eccentricity", "x", "nu", "harmonics")} == \
        {"eccentricity": "0.4", "x": "0.05", "nu": "0.2", "harmonics": 5}
    expected = numeric_mode_harmonics(3, 3, 0.4, 0.05, pn=1, harmonics=5,
                                      values={nu: 0.2, delta: math.sqrt(1 - 0.8)})
    assert [row["p"] for row in numeric["coefficients"]] == list(range(-5, 6))
    for row in numeric["coefficients"]:
        assert complex(row["real"], row["imag"]) == expected[row["p"]]
    assert max(abs(complex(row["real"], row["imag"])) for row in numeric["coefficients"]) > 0.01


def test_text_and_latex(run_cli):
    code, out, _ = run_cli("orbit-mode", "2", "-1", "--pn", "1/2")
    assert code == 0
    assert "H_2m1 = " in out and "\nW = " in out and "instantaneous part only" in out
    code, out, _ = run_cli("orbit-mode", "2", "2", "--pn", "0", "--format", "latex", "--eccentricity", "0",
                           "--harmonics", "2")
    assert code == 0
    assert out.count(r"\begin{equation}") == 2 and "H_{22} =" in out
    # circular orbit: only p = 0 (frequency -2 omega) is left, c_0 = Hhat_22 = 1
    rows = [line.split()[1:] for line in out.splitlines() if re.match(r"^% -?\d+ ", line)]
    assert [int(row[0]) for row in rows] == [-2, -1, 0, 1, 2]
    assert float(rows[2][1]) == pytest.approx(1.0, abs=1e-12)


@pytest.mark.parametrize("argv, words", [
    (("1", "0"), "l must be an integer from 2"),
    (("2", "3"), "|m| must not exceed l"),
    (("2", "2", "--pn", "3/2"), "2PN quasi-Keplerian orbit"),
    (("2", "2", "--pn", "x"), "--pn"),
    (("2", "2", "--pn", "1e100000000"), "must be a multiple of 1/2"),
    (("31", "2"), "l must be an integer from 2 to 30"),
    (("2", "2", "--eccentricity", "0.95"), "[0, 0.9]"),
    (("2", "2", "--eccentricity", "nan"), "--eccentricity"),
    (("2", "2", "--eccentricity", "0.5", "--harmonics", "201"), "from 1 to 200"),
    (("2", "2", "--eccentricity", "0.5", "--harmonics", "0"), "from 1 to 200"),
    (("2", "2", "--eccentricity", "0.5", "--x", "1"), "[1e-8, 1)"),
    (("2", "2", "--eccentricity", "0.5", "--x", "1e-9"), "[1e-8, 1)"),
    (("2", "2", "--eccentricity", "0.5", "--nu", "0.3"), "(0, 1/4]"),
    (("2", "2", "--harmonics", "4"), "needs --eccentricity"),
    (("2", "2", "--nu", "0.2"), "needs --eccentricity"),
])
def test_bad_input_is_one_line_and_exit_2(run_cli, argv, words):
    code, out, err = run_cli("orbit-mode", *argv)
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and words in err


def test_a_cached_result_prints_the_same(run_cli):
    argv = ("orbit-mode", "2", "1", "--eccentricity", "1/3", "--harmonics", "2", "--nu", "0.2", "--json")
    first = run_cli(*argv)
    assert first[0] == 0
    assert run_cli(*argv) == first
    assert run_cli(*argv, "--no-cache") == first
