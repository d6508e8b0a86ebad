"""Benchmark of the STF core's expansion switch: sympy against symengine on the same inputs.

``stfalgebra.stf.backend.expand`` is the STF core's one switch between the two
(``using_backend``). The workload is one the toolkit really runs: the STF projection of
x_<L-Q} v_{Q>} (q = l // 2) plus its full contraction with itself, the vectors carrying
symbolic components (x1, x2, x3), (v1, v2, v3): the Gram entries are sums, so every kernel
result goes through ``backend.expand``. Timed end to end (cold: caches cleared) with each
backend; then every expression the run handed to ``backend.expand`` is recorded and expanded
again, alone, with each backend (the expansion path by itself).

The derivation pipeline's coefficient algebra (moments, modes, fluxes) no longer goes through
this switch: it runs on the exact engine, benchmarked against symengine in ``bench_engine.py``.

Results of the two backends are compared (they must be identical). Ratio = sympy / symengine
(above 1: symengine faster), on the best wall time and the best CPU time of cold runs (CPU time
is the steadier figure on a loaded machine). Times are not asserted on.

Run:  python3 tests/benchmarks/bench_backend.py [--ranks 8 10 12] [--quick]
"""

from __future__ import annotations

import argparse
import contextlib
import os
import sys
from typing import Callable, Iterator

import sympy as sp
from sympy.core.cache import clear_cache as clear_sympy_cache

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))

from _common import best_of, describe_machine, format_seconds, load_note  # noqa: E402

from stfalgebra.stf import backend  # noqa: E402
from stfalgebra.stf.tensors import SymmetricTensor, clear_caches  # noqa: E402
from stfalgebra.stf.vectors import Vector  # noqa: E402

X_SYMBOLS = sp.symbols("x1 x2 x3", real=True)
V_SYMBOLS = sp.symbols("v1 v2 v3", real=True)


@contextlib.contextmanager
def recording_expansions() -> Iterator[list[sp.Expr]]:
    """Record every expression handed to ``backend.expand`` inside the block (callers look
    the function up on the module at call time, so replacing the attribute sees them all)."""
    recorded: list[sp.Expr] = []
    original = backend.expand

    def spy(expression):
        recorded.append(expression)
        return original(expression)

    backend.expand = spy
    try:
        yield recorded
    finally:
        backend.expand = original


def _cold() -> None:
    clear_caches()
    clear_sympy_cache()


def _best(figures: dict, key: str, function: Callable[[], object], repeats: int) -> object:
    """Best cold wall and CPU time of ``function`` into ``figures[key]``, ``figures[key + "_cpu"]``."""
    figures[key], figures[key + "_cpu"], result = best_of(function, repeats, prepare=_cold)
    return result


def _same(first, second) -> bool:
    if isinstance(first, (list, tuple)):
        return len(first) == len(second) and all(_same(a, b) for a, b in zip(first, second))
    return first == second or sp.expand(first - second) == 0


def stf_workload(rank: int) -> sp.Expr:
    """STF projection of x_<L-Q} v_{Q>} with symbolic components and its self-contraction."""
    x = Vector("x", components=X_SYMBOLS)
    v = Vector("v", components=V_SYMBOLS)
    q = rank // 2
    projected = SymmetricTensor.from_vectors(*([x] * (rank - q) + [v] * q)).stf()
    return projected.contract(projected)


def run_stf_case(rank: int, repeats: int) -> dict:
    """End-to-end and expansion-only times of workload 1 under both backends."""
    figures: dict = {"rank": rank}
    results = {}
    for name in ("sympy", "symengine"):
        with backend.using_backend(name):
            results[name] = _best(figures, name, lambda: stf_workload(rank), repeats)
    figures["agree"] = _same(results["sympy"], results["symengine"])
    _cold()
    with backend.using_backend("sympy"), recording_expansions() as inputs:
        stf_workload(rank)
    figures["calls"] = len(inputs)
    figures["nodes"] = sum(max(backend._plain_polynomial_size(e), 0) for e in inputs)
    expanded = {}
    for name in ("sympy", "symengine"):
        with backend.using_backend(name):
            expanded[name] = _best(figures, f"{name}_expand", lambda: [backend.expand(e) for e in inputs], repeats)
    figures["expand_agree"] = _same(expanded["sympy"], expanded["symengine"])
    return figures


def _pair(figures: dict, key: str) -> str:
    return f"{format_seconds(figures[key])} (CPU {format_seconds(figures[key + '_cpu'])})"


def _ratio(figures: dict, slow: str, fast: str) -> str:
    return (f"{figures[slow] / figures[fast]:.2f}x wall, "
            f"{figures[slow + '_cpu'] / max(figures[fast + '_cpu'], 1e-9):.2f}x CPU")


def main(argv: list[str] | None = None) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--ranks", type=int, nargs="*", default=[8, 10, 12], help="ranks of the STF workload")
    parser.add_argument("--repeats", type=int, default=2, help="best of this many cold runs")
    parser.add_argument("--budget", type=float, default=120.0,
                        help="stop at larger ranks once one sympy run exceeds this many seconds")
    parser.add_argument("--quick", action="store_true", help="smoke run: rank 4, one repeat")
    args = parser.parse_args(argv)
    if args.quick:
        args.ranks, args.repeats = [4], 1
    for line in describe_machine():
        print(line)
    if "symengine" not in backend.available_backends():
        print("symengine is not installed: nothing to compare")
        return {}
    print("workload: STF projection of x_<L-Q} v_{Q>} (symbolic components) + self-contraction; "
          "best of cold runs")
    stf_cases = []
    for rank in sorted(args.ranks):
        f = run_stf_case(rank, args.repeats)
        stf_cases.append(f)
        print(f"l={rank:2d}: end to end sympy {_pair(f, 'sympy')}, symengine {_pair(f, 'symengine')}, "
              f"ratio {_ratio(f, 'sympy', 'symengine')} | expansion alone ({f['calls']} calls, {f['nodes']} nodes): "
              f"sympy {_pair(f, 'sympy_expand')}, symengine {_pair(f, 'symengine_expand')}, "
              f"ratio {_ratio(f, 'sympy_expand', 'symengine_expand')} | results identical: "
              f"{f['agree'] and f['expand_agree']}", flush=True)
        if f["sympy"] > args.budget:
            print(f"  (sympy over the {args.budget:.0f} s budget: larger ranks skipped)")
            break
    print(load_note())
    return {"stf": stf_cases}


if __name__ == "__main__":
    main()
