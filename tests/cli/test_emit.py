"""Tests of stfalgebra/cli/command_emit.py: the `stfalgebra emit` command."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

import stfalgebra
import stfalgebra.codegen
from stfalgebra import symbols as S
from stfalgebra.cli import main
from stfalgebra.codegen import verification
from stfalgebra.codegen.mode_sets import PSI
from stfalgebra.codegen.numpy_source import load_generated_module
from stfalgebra.codegen.verification import GeneratedCodeMismatchError, find_c_compiler
from stfalgebra.radiative.modes import derive_mode

PACKAGE_PARENT = Path(stfalgebra.__file__).resolve().parent.parent
COMPILER = find_c_compiler()
needs_compiler = pytest.mark.skipif(COMPILER is None, reason="no C compiler on this machine")
REQUIRED_FLAGS = ["-std=c99", "-O2", "-Wall", "-Werror", "-shared", "-fPIC"]  # fixed by the task
EMIT_22 = ["emit", "--mode", "2", "2", "--mode", "2", "1", "--pn", "1"]


def run(argv, capsys):
    code = main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_c_to_stdout(capsys):
    code, out, err = run(EMIT_22, capsys)
    assert code == 0
    assert "void stfalgebra_modes(double x, double nu, double delta, double psi, double *re_out, double *im_out)" in out
    assert "#define stfalgebra_modes_INDEX_h_2_1 1" in out
    if COMPILER:
        assert err.startswith("stfalgebra emit: c: verified against exact evaluation at 8 points")


@needs_compiler
def test_c_files_compile_with_required_flags(tmp_path, capsys):
    code, out, _ = run([*EMIT_22, "--output", str(tmp_path / "modes.c"), "--function-name", "my-modes"], capsys)
    assert code == 0
    assert out.splitlines() == [f"wrote {tmp_path / 'modes.h'}", f"wrote {tmp_path / 'modes.c'}"]
    assert '#include "modes.h"' in (tmp_path / "modes.c").read_text()
    assert "void my_modes(" in (tmp_path / "modes.h").read_text()
    done = subprocess.run([COMPILER, *REQUIRED_FLAGS, "-o", str(tmp_path / "lib.so"), str(tmp_path / "modes.c"), "-lm"],
                          capture_output=True, text=True, timeout=300)
    assert done.returncode == 0, done.stderr


def test_numpy_module_matches_the_derivation(tmp_path, capsys):
    target = tmp_path / "modes.py"
    code, _, err = run([*EMIT_22, "--language", "numpy", "--output", str(target)], capsys)
    assert code == 0 and "numpy: verified" in err
    module = load_generated_module(target.read_text(), "emitted")
    x, nu, psi = 0.1, 0.2, 0.4
    delta = (1 - 4 * nu) ** 0.5
    values = module.stfalgebra_modes(x, nu, delta, psi)
    for (l, m), name in (((2, 2), "h_2_2"), ((2, 1), "h_2_1")):
        mode = derive_mode(l, m, pn=1)
        # conventions.md: R c^2 h_lm/(G m) = 2 nu x sqrt(16 pi/5) Hhat_lm exp(-i m psi).
        hhat = complex(mode.hhat.subs({S.x: x, S.nu: nu, S.delta: delta}).evalf(30))
        expected = 2 * nu * x * np.sqrt(16 * np.pi / 5) * hhat * np.exp(-1j * m * psi)
        assert abs(values[name] - expected) <= 1e-13 * abs(expected)
    assert PSI.name == "psi"


def test_lmax_leaves_out_refused_modes_with_a_note(capsys):
    code, out, _ = run(["emit", "--lmax", "2", "--pn-relative", "0", "--no-verify", "--quantity", "hhat",
                        "--language", "numpy"], capsys)
    assert code == 0
    # (2,0) is served (its DC memory); a mode beyond its order is left out with a note
    assert "OUTPUT_NAMES = ('Hhat_2_2', 'Hhat_2_1', 'Hhat_2_0', 'Hhat_2_m1', 'Hhat_2_m2')" in out
    code, out, _ = run(["emit", "--lmax", "4", "--pn", "5/2", "--no-verify", "--quantity", "hhat",
                        "--language", "numpy"], capsys)
    assert code == 0 and "mode (4, 0) left out" in out


def test_no_verify_prints_no_summary(capsys):
    code, _, err = run([*EMIT_22, "--no-verify"], capsys)
    assert code == 0 and err == ""


def test_general_orbit_with_masses(capsys):
    code, out, err = run(["emit", "--mode", "2", "2", "--orbit", "general", "--pn", "1", "--mass-inputs",
                          "--language", "numpy"], capsys)
    assert code == 0 and "numpy: verified" in err
    assert "def stfalgebra_modes(r, rdot, phi, phidot, m1, m2, c):" in out


def test_missing_compiler_still_emits(monkeypatch, capsys):
    monkeypatch.setattr(verification, "find_c_compiler", lambda: None)
    code, out, err = run(EMIT_22, capsys)
    assert code == 0 and "void stfalgebra_modes(" in out
    assert "note: c: not verified: no C compiler found" in err


def test_failed_verification_exits_1_and_writes_nothing(monkeypatch, tmp_path, capsys):
    def failing(*args, **kwargs):
        raise GeneratedCodeMismatchError("simulated mismatch")

    monkeypatch.setattr(stfalgebra.codegen, "generate_code", failing)
    code, out, err = run([*EMIT_22, "--output", str(tmp_path / "modes.c")], capsys)
    assert code == 1 and out == "" and "simulated mismatch" in err
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize("argv, message", [
    (["emit", "--mode", "2", "5", "--pn", "1"], "|m| must not exceed l"),
    (["emit", "--mode", "4", "0", "--pn", "5/2"], "memory"),
    (["emit", "--mode", "2", "2", "--mode", "2", "2", "--pn", "1"], "given twice"),
    (["emit", "--lmax", "1", "--pn", "1"], "--lmax must be an integer from 2 to 30"),
    (["emit", "--mode", "2", "2", "--pn", "-1"], "pn"),
    (["emit", "--mode", "2", "2", "--pn", "1", "--output", "/nonexistent-dir-xyz/m.c"], "does not exist"),
])
def test_bad_requests_exit_2(argv, message, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == "" and message in err and err.count("\n") == 1


def test_argparse_errors_exit_2():
    for argv in (["emit", "--pn", "1"], ["emit", "--mode", "2", "2", "--lmax", "3", "--pn", "1"],
                 ["emit", "--mode", "2", "2", "--pn", "1", "--language", "fortran"],
                 ["emit", "--mode", "2", "x", "--pn", "1"], ["emit", "--mode", "2", "2", "--pn", "1", "--points", "0"]):
        assert main(argv) == 2


def _subprocess(argv, seed, cwd):
    env = {**os.environ, "PYTHONHASHSEED": str(seed), "PYTHONPATH": str(PACKAGE_PARENT)}
    return subprocess.run([sys.executable, "-m", "stfalgebra", *argv], capture_output=True, cwd=cwd, env=env,
                          timeout=300)


def test_output_is_deterministic_across_hash_seeds(tmp_path):
    argv = ["emit", "--mode", "2", "1", "--mode", "3", "3", "--pn", "3/2", "--mass-inputs"]
    runs = []
    for seed in (0, 999):
        c_run = _subprocess(argv, seed, tmp_path)
        numpy_run = _subprocess([*argv, "--language", "numpy", "--no-verify"], seed, tmp_path)
        assert c_run.returncode == numpy_run.returncode == 0, c_run.stderr
        runs.append((c_run.stdout, c_run.stderr, numpy_run.stdout))
    assert runs[0] == runs[1]


# ------------------------------------------------------------ issue 12 regressions

EMIT_FAST = ["emit", "--mode", "2", "2", "--pn", "1", "--no-verify"]


@needs_compiler
def test_header_and_source_of_different_runs_do_not_compile_together(tmp_path, capsys, monkeypatch):
    # regression: header and source were written by two renames; a crash between them left a
    # new header with an old source that compiled together cleanly
    from stfalgebra.codegen import files
    from stfalgebra.codegen.c_source import emission_set_id

    target = tmp_path / "modes.c"
    assert run([*EMIT_FAST, "--output", str(target)], capsys)[0] == 0
    old_source = target.read_text()
    replaced = []
    real_replace = os.replace

    def crash_after_the_header(source, destination):
        if replaced:
            raise KeyboardInterrupt  # the process dies between the two replacements
        replaced.append(destination)
        real_replace(source, destination)

    monkeypatch.setattr(files.os, "replace", crash_after_the_header)
    code, out, _ = run(["emit", "--mode", "2", "2", "--mode", "3", "3", "--pn", "1", "--no-verify",
                        "--output", str(target)], capsys)
    assert code == 130 and out == ""
    header, source = (tmp_path / "modes.h").read_text(), target.read_text()
    assert source == old_source and emission_set_id(header) != emission_set_id(source)  # a mixed set, recognisable
    assert sorted(p.name for p in tmp_path.iterdir()) == ["modes.c", "modes.h"]  # no temporary left
    done = subprocess.run([COMPILER, *REQUIRED_FLAGS, "-o", str(tmp_path / "lib.so"), str(target), "-lm"],
                          capture_output=True, text=True, timeout=300)
    assert done.returncode != 0 and "belongs to another emission" in done.stderr


@pytest.mark.parametrize("kind", ["symlink", "fifo"])
def test_output_that_is_not_a_regular_file_is_refused(tmp_path, capsys, kind):
    # regression: a symlink or FIFO at the output path was replaced by a regular file
    target = tmp_path / "modes.py"
    elsewhere = tmp_path / "elsewhere.py"
    elsewhere.write_text("keep\n")
    if kind == "symlink":
        target.symlink_to(elsewhere)
    else:
        os.mkfifo(target)
    code, out, err = run([*EMIT_FAST, "--language", "numpy", "--output", str(target)], capsys)
    assert (code, out) == (2, "") and err.count("\n") == 1
    assert "refusing to replace" in err and ("symbolic link" if kind == "symlink" else "FIFO") in err
    assert (target.is_symlink() if kind == "symlink" else not target.is_file()) and elsewhere.read_text() == "keep\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["elsewhere.py", "modes.py"]


def test_read_only_output_is_refused_unless_forced(tmp_path, capsys):
    # regression: read-only files were silently overwritten
    target = tmp_path / "modes.py"
    target.write_text("mine\n")
    target.chmod(0o444)
    code, out, err = run([*EMIT_FAST, "--language", "numpy", "--output", str(target)], capsys)
    assert (code, out) == (2, "") and "read-only" in err and err.count("\n") == 1
    assert target.read_text() == "mine\n"
    code, out, _ = run([*EMIT_FAST, "--language", "numpy", "--output", str(target), "--force"], capsys)
    assert code == 0 and out == f"wrote {target}\n" and "def stfalgebra_modes(" in target.read_text()


@pytest.mark.parametrize("length", [250, 260])
def test_long_function_name_is_one_line(tmp_path, capsys, length):
    # regression: 260 characters ended in an OSError traceback, 250 in "generated code failed
    # verification"
    code, out, err = run(["emit", "--mode", "2", "2", "--pn", "1", "--function-name", "f" * length,
                          "--output", str(tmp_path)], capsys)
    assert (code, out) == (2, "") and err.count("\n") == 1
    assert f"has {length} characters, at most 48" in err and "verification" not in err
    assert list(tmp_path.iterdir()) == []


def test_long_output_name_is_one_line(tmp_path, capsys):
    code, out, err = run([*EMIT_FAST, "--output", str(tmp_path / ("m" * 250 + ".c"))], capsys)
    assert (code, out) == (2, "") and err.count("\n") == 1 and "output file name" in err
    assert list(tmp_path.iterdir()) == []


def test_output_naming_a_directory_writes_inside_it(tmp_path, capsys):
    # regression: `--output DIR` wrote DIR.h and DIR.c beside the directory
    outdir = tmp_path / "generated"
    outdir.mkdir()
    code, out, _ = run([*EMIT_FAST, "--output", str(outdir), "--function-name", "gen_modes"], capsys)
    assert code == 0
    assert out.splitlines() == [f"wrote {outdir / 'gen_modes.h'}", f"wrote {outdir / 'gen_modes.c'}"]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["generated"]
    assert '#include "gen_modes.h"' in (outdir / "gen_modes.c").read_text()
    code, out, _ = run([*EMIT_FAST, "--language", "numpy", "--output", str(outdir)], capsys)
    assert code == 0 and out == f"wrote {outdir / 'stfalgebra_modes.py'}\n"


def test_failing_compiler_is_reported_as_such(tmp_path, capsys, monkeypatch):
    # regression: a compiler that fails (CC=/bin/false) was reported as a failed verification
    monkeypatch.setenv("CC", "/bin/false")
    code, out, err = run([*EMIT_22, "--output", str(tmp_path / "modes.c")], capsys)
    assert (code, out) == (3, "") and err.count("\n") == 1
    assert "the C compiler /bin/false fails on a trivial program too" in err and "verification" not in err
    assert list(tmp_path.iterdir()) == []


def test_emit_jobs_give_the_same_code(capsys):
    # the modes of --lmax derived by two processes give the same generated code as one process
    from stfalgebra.cli import main

    outputs = []
    for jobs in ("1", "2"):
        assert main(["emit", "--lmax", "3", "--pn-relative", "0", "--language", "numpy", "--no-verify",
                     "--jobs", jobs]) == 0
        outputs.append(capsys.readouterr().out)
    assert outputs[0] == outputs[1] and "def " in outputs[0]
