"""Tests of stfalgebra/cli/command_check.py: the `stfalgebra check` contract."""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import stfalgebra
from stfalgebra.cli import main

PACKAGE_PARENT = Path(stfalgebra.__file__).resolve().parent.parent
# Hhat_22 through 1PN, Blanchet, Living Rev. Relativ. 17, 2 (2014) (from memory).
HHAT22 = "1 + x*(-107/42 + 55*nu/42)"
HHAT22_CHANGED = "1 + x*(-107/42 + 55*nu/43)"
CHECK_22 = ["check", "--mode", "2", "2", "--pn", "1"]


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_published_hhat22_agrees(capsys):
    code, out, err = run([*CHECK_22, HHAT22], capsys)
    assert code == 0 and err == ""
    assert out.rstrip().endswith("result: AGREE")


def test_changed_coefficient_differs_and_is_named(capsys):
    code, out, _ = run([*CHECK_22, HHAT22_CHANGED], capsys)
    assert code == 1
    assert "x^1      differ" in out
    assert "nu^1: differ: yours 55/43, derived 55/42, yours - derived = -55/1806" in out
    assert "result: DIFFER at x^1" in out


def test_latex_input(capsys):
    latex = r"1 + x\left(-\frac{107}{42} + \frac{55}{42}\nu\right)"
    assert run([*CHECK_22, latex], capsys)[0] == 0


def test_expression_starting_with_minus_after_double_dash(capsys):
    # Hhat_21 = (i delta/3) x^(1/2) + ..., Blanchet LRR 2014 (from memory): the minus sign is wrong.
    code, out, _ = run(["check", "--mode", "2", "1", "--pn", "1/2", "--", r"-\frac{i}{3}\delta x^{1/2}"], capsys)
    assert code == 1 and "x^(1/2)  differ" in out
    assert run(["check", "--mode", "2", "1", "--pn", "1/2", "--", r"\frac{i}{3}\delta x^{1/2}"], capsys)[0] == 0


def test_general_orbit(capsys):
    # Leading general-orbit Hhat_22 (conventions.md, G = 1).
    argv = ["check", "--mode", "2", "2", "--pn", "0", "--orbit", "general", "m/r + r^2 phidot^2 + 2 i r rdot phidot - rdot^2"]
    assert run(argv, capsys)[0] == 0


HOSTILE = ["__import__('os').system('touch pwned')", "().__class__", "lambda: 0", "x**9999999999",
           "(" * 100000 + "x" + ")" * 100000, "open", "'x'", 'f"{x}"', "x.conjugate()", "y", "",
           "(" * 150 + "x" + ")" * 150, "(x + nu + delta + 1)^64 (x + nu + 2)^64 (nu + delta + 3)^64"]


@pytest.mark.parametrize("text", HOSTILE, ids=[ascii(t[:20]) + f"({len(t)})" for t in HOSTILE])
def test_hostile_expressions_exit_2_with_one_line(text, capsys, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    code, out, err = run([*CHECK_22, "--", text], capsys)
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and err.startswith("stfalgebra check: error: expression refused")
    assert not (tmp_path / "pwned").exists()


@pytest.mark.parametrize("argv, message", [
    (["check", "--mode", "2", "5", "--pn", "1", "x"], "|m| must not exceed l"),
    (["check", "--mode", "2", "0", "--pn", "1", "x"], "memory"),
    (["check", "--mode", "2", "2", "--pn", "1/3", "x"], "multiple of 1/2"),
    (["check", "--mode", "2", "2", "--pn", "9", "x"], "--pn = 9: the toolkit derives this result through order 3/2"),
    (["check", "--mode", "2", "2", "--pn", "1"], "exactly one of EXPR and --file"),
])
def test_bad_requests_exit_2(argv, message, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == "" and message in err and err.count("\n") == 1


def test_argparse_errors_exit_2(capsys):
    assert main(["check", "--mode", "2", "--pn", "1", "x"]) == 2
    assert main([*CHECK_22, "-x"]) == 2  # an expression starting with '-' must follow '--'


def test_file_of_lines(tmp_path, capsys):
    path = tmp_path / "exprs.txt"
    path.write_text(f"# published\n{HHAT22}\n\n{HHAT22_CHANGED}\n")
    code, out, _ = run([*CHECK_22, "--file", str(path)], capsys)
    assert code == 1
    assert "== line 2\n" in out and "== line 4\n" in out
    assert out.count("result: AGREE") == 1 and out.count("result: DIFFER") == 1


def test_file_json_list_and_object(tmp_path, capsys):
    listing = tmp_path / "list.json"
    listing.write_text(json.dumps([HHAT22, HHAT22]))
    assert run([*CHECK_22, "--file", str(listing)], capsys)[0] == 0
    mapping = tmp_path / "object.json"
    mapping.write_text(json.dumps({"paper A": HHAT22, "paper B": HHAT22_CHANGED}))
    code, out, _ = run([*CHECK_22, "--json", "--file", str(mapping)], capsys)
    document = json.loads(out)
    assert code == 1 and document["verdict"] == "differ" and document["exit_code"] == 1
    assert [(c["name"], c["verdict"]) for c in document["checks"]] == [("paper A", "agree"), ("paper B", "differ")]


def test_file_with_a_refused_entry_exits_2_and_reports_the_rest(tmp_path, capsys):
    path = tmp_path / "exprs.json"
    path.write_text(json.dumps([HHAT22, "__import__('os')"]))
    code, out, err = run([*CHECK_22, "--json", "--file", str(path)], capsys)
    document = json.loads(out)
    assert code == 2 and document["verdict"] == "refused"
    assert [c["verdict"] for c in document["checks"]] == ["agree", "refused"]
    assert "item 2: expression refused: dunder name" in err


@pytest.mark.parametrize("content, message", [
    ("[1, 2]", "is not a string"),
    ("[\"x\"", "not valid JSON"),
    ("\n# only a comment\n", "holds no expression"),
])
def test_bad_files_exit_2(tmp_path, capsys, content, message):
    path = tmp_path / "bad"
    path.write_text(content)
    code, _, err = run([*CHECK_22, "--file", str(path)], capsys)
    assert code == 2 and message in err


def test_missing_and_binary_files_exit_2(tmp_path, capsys):
    assert "cannot read" in run([*CHECK_22, "--file", str(tmp_path / "missing")], capsys)[2]
    binary = tmp_path / "binary"
    binary.write_bytes(b"\xff\xfe\x00")
    assert "not UTF-8" in run([*CHECK_22, "--file", str(binary)], capsys)[2]


def test_json_single_expression(capsys):
    code, out, _ = run([*CHECK_22, "--json", HHAT22_CHANGED], capsys)
    document = json.loads(out)
    assert code == 1 and document["mode"] == [2, 2] and document["pn"] == "1"
    report = document["checks"][0]["report"]
    order = next(o for o in report["orders"] if o["order"] == "1")
    assert [(t["nu_power"], t["status"]) for t in order["terms"]] == [("0", "agree"), ("1", "differ")]


_FUZZ_ALPHABET = "x nu delta pi I ( ) + - * / ^ 1 2 3 . ' _ [ ] sqrt log exp \\frac { } lambda __".split(" ")


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(text=st.lists(st.sampled_from(_FUZZ_ALPHABET), max_size=15).map(" ".join))
def test_fuzz_exit_codes(text, capsys):
    code, _, err = run([*CHECK_22, "--", text], capsys)
    assert code in (0, 1, 2)
    assert "Traceback" not in err
    if code == 2:
        assert err.count("\n") == 1


def _subprocess(argv, seed, cwd):
    env = {**os.environ, "PYTHONHASHSEED": str(seed), "PYTHONPATH": str(PACKAGE_PARENT)}
    return subprocess.run([sys.executable, "-m", "stfalgebra", *argv], capture_output=True, cwd=cwd, env=env,
                          timeout=300)


def test_output_is_deterministic_across_hash_seeds(tmp_path):
    path = tmp_path / "exprs.txt"
    path.write_text(f"{HHAT22_CHANGED}\n" + r"1 + x\left(-\frac{107}{42} + \frac{55}{42}\nu + \delta^2\right)" + "\n")
    outputs = []
    for seed in (0, 4242):
        text = _subprocess([*CHECK_22, "--file", str(path)], seed, tmp_path)
        as_json = _subprocess([*CHECK_22, "--json", "--file", str(path)], seed, tmp_path)
        assert text.returncode == as_json.returncode == 1, text.stderr
        outputs.append((text.stdout, as_json.stdout))
    assert outputs[0] == outputs[1]


def test_subprocess_hostile_input_exit_2_without_traceback(tmp_path):
    done = _subprocess([*CHECK_22, "--", "__import__('os').system('touch pwned')"], 7, tmp_path)
    assert done.returncode == 2 and done.stdout == b""
    assert done.stderr.count(b"\n") == 1 and b"Traceback" not in done.stderr
    assert not (tmp_path / "pwned").exists()


def test_failure_inside_the_comparison_is_a_one_line_refusal(monkeypatch, capsys):
    import stfalgebra.checking.compare as compare_module

    def broken(*args, **kwargs):
        raise NotImplementedError("simulated\nsympy failure")

    monkeypatch.setattr(compare_module, "compare_expressions", broken)
    code, out, err = run([*CHECK_22, HHAT22], capsys)
    assert code == 2 and out == "" and err.count("\n") == 1
    assert "cannot expand it as a PN series (NotImplementedError: simulated sympy failure)" in err


def test_non_rational_powers_of_the_expansion_parameter_are_refused(capsys):
    code, _, err = run([*CHECK_22, "x^(1/3)"], capsys)
    assert code == 2 and err.count("\n") == 1


def test_expensive_expression_hits_the_time_limit(capsys):
    import time

    from stfalgebra.radiative.modes import derive_mode

    derive_mode(2, 2, pn=1)  # derived (and cached) beforehand: the budget goes to the expression
    start = time.perf_counter()
    code, out, err = run([*CHECK_22, "--time-limit", "1", "1/(1 + x + nu)^60"], capsys)
    elapsed = time.perf_counter() - start
    assert (code, out) == (2, ""), err
    assert "time budget of the run (1 s, --time-limit) ran out" in err and err.count("\n") == 1, err
    assert elapsed < 60, elapsed  # without the limit this runs for minutes; generous for loaded CI
