"""Smoke test of tests/benchmarks/bench_stf_core.py: its smallest case runs and agrees with
the naive component baseline (the benchmark directory itself is not collected)."""

from __future__ import annotations

import importlib.util
from pathlib import Path

import pytest

from stfalgebra.stf.tensors import clear_caches

BENCHMARK = Path(__file__).resolve().parents[1] / "benchmarks" / "bench_stf_core.py"


@pytest.fixture(autouse=True)
def _fresh_caches():
    clear_caches()
    yield
    clear_caches()


def _load_benchmark():
    spec = importlib.util.spec_from_file_location("bench_stf_core", BENCHMARK)
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    spec.loader.exec_module(module)
    return module


@pytest.mark.parametrize("kind", ["explicit", "abstract"])
def test_smallest_benchmark_case_runs_and_agrees(kind):
    benchmark = _load_benchmark()
    result = benchmark.run_case(4, kind, budget=30.0)
    assert result["naive"]["complete"]
    assert result["agree"]
    assert result["toolkit"]["seconds"] > 0
    assert "l= 4" in benchmark._describe(result)
