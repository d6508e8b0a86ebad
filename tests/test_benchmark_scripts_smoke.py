"""Smoke tests of the on-demand benchmarks in tests/benchmarks (modes, backend, codegen): the
smallest case of each runs to the end and its internal cross-checks hold, so the scripts
cannot rot. The benchmark directory itself is not collected, and no time is asserted on.
(The STF-core benchmark has its own smoke test in tests/stf.)"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import pytest

BENCHMARKS = Path(__file__).resolve().parent / "benchmarks"


def _load(name: str):
    spec = importlib.util.spec_from_file_location(f"stfalgebra_{name}", BENCHMARKS / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    spec.loader.exec_module(module)
    return module


def test_modes_benchmark_quick_run(capsys):
    figures = _load("bench_modes").main(["--quick"])
    out = capsys.readouterr().out
    (only,) = figures["sets"]
    assert only["lmax"] == 4 and not only["timed_out"]
    # l <= 4, m != 0: 4 + 6 + 8 modes derived; m = 0 refused (non-linear memory)
    assert (only["derived"], only["refused"]) == (18, 3)
    assert only["work"] > 0 and only["peak_bytes"] > 0
    cli = figures["cli"]
    assert cli["warm_equals_cold"]
    assert cli["warm_imports_sympy"] in ("True", "False")
    assert "lmax= 4" in out and "import sympy" in out and "load average" in out


def test_backend_benchmark_quick_run(capsys):
    figures = _load("bench_backend").main(["--quick"])
    out = capsys.readouterr().out
    if not figures:
        pytest.skip("symengine not installed")
    (stf,) = figures["stf"]
    assert stf["rank"] == 4 and stf["agree"] and stf["expand_agree"] and stf["calls"] > 0
    (derivative,) = figures["derivative"]
    assert derivative["agree"] and derivative["backend_sympy_agree"] and derivative["backend_symengine_agree"]
    assert "ratio" in out


def test_codegen_benchmark_quick_run(capsys):
    from stfalgebra.codegen import find_c_compiler

    if find_c_compiler() is None:
        pytest.skip("no C compiler")
    figures = _load("bench_codegen").main(["--quick"])
    out = capsys.readouterr().out
    assert figures["samples"] == 10_000
    # l = 2, m = +-1, +-2
    assert figures["outputs"] == 4
    assert all(error < 1e-10 for error in figures["agreement"].values()), figures["agreement"]
    assert "goal C >=" in out
