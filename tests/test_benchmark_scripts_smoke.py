"""Smoke tests of the on-demand benchmarks in tests/benchmarks (modes, engine, backend, codegen): the
smallest case of each runs to the end and its internal cross-checks hold, so the scripts
cannot rot. The benchmark directory itself is not collected, and no time is asserted on.
(The STF-core benchmark has its own smoke test in tests/stf.)"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

import pytest

BENCHMARKS = Path(__file__).resolve().parent / "benchmarks"


def _load(name: str):
    spec = importlib.util.spec_from_file_location(f"stfalgebra_{name}", BENCHMARKS / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    # registered before it runs, as an import would (dataclasses look their module up there)
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    return module


def test_modes_benchmark_quick_run(capsys):
    figures = _load("bench_modes").main(["--quick"])
    out = capsys.readouterr().out
    cli = figures["cli"]
    assert not cli["failed"], cli["failed"]
    assert set(cli["summary"]) == {"baseline", "cold8", "warm8"}
    assert all(item["cpu"] > 0 and item["runs"] == 1 for item in cli["summary"].values())
    assert cli["warm_equals_cold"] and not cli["no_cache_wrote"]
    assert cli["imports_sympy"]["warm8"] in ("True", "False")
    # l = 2: every m derived (m = 0: the DC memory); l = 3 adds its seven (m = 0: zero at this order)
    assert [(p["lmax"], p["derived"], p["refused"]) for p in figures["growth"]] == [(2, 5, 0), (3, 12, 0)]
    assert figures["growth_summary"]["time"] is not None
    assert "import sympy" in out and "load average" in out and "goals: not assessed" in out


def test_engine_benchmark_quick_run(capsys):
    figures = _load("bench_engine").main(["--quick"])
    out = capsys.readouterr().out
    # every candidate's replay equals the package's own output (the engine's replay included)
    assert figures["all_identical"]
    assert [case["l"] for case in figures["circular"]] == [2, 3]
    assert [case["l"] for case in figures["general"]] == [2]
    for case in figures["circular"] + figures["general"]:
        assert {"engine", "flint", "python"} <= set(case["candidates"])
        assert all(entry["identical"] and entry["cpu"] > 0 for entry in case["candidates"].values())
    assert "ratio = candidate / engine" in out


def test_backend_benchmark_quick_run(capsys):
    figures = _load("bench_backend").main(["--quick"])
    out = capsys.readouterr().out
    if not figures:
        pytest.skip("symengine not installed")
    (stf,) = figures["stf"]
    assert stf["rank"] == 4 and stf["agree"] and stf["expand_agree"] and stf["calls"] > 0
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


def test_suite_benchmark_quick_run(capsys):
    figures = _load("bench_suite").main(["--quick"])
    out = capsys.readouterr().out
    assert figures["returncode"] == 0 and not figures["timed_out"]
    assert figures["counts"].get("passed", 0) > 0 and "failed" not in figures["counts"]
    assert figures["wall"] > 0 and figures["cpu"] > 0
    assert "tests/test_layering.py" in out and "load average" in out
