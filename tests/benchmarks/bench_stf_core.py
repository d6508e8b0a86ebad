"""Benchmark of the STF core: STF projection plus full contraction, toolkit against naive.

The tensor is x_<L-Q} v_{Q>} with q = l // 2, built from two vectors, in two flavours:

- explicit: x and v carry rational components;
- abstract: x and v are abstract vectors for the toolkit; the naive code, which needs
  components, gets symbolic components (x1, x2, x3), (v1, v2, v3).

Each case times STF projection plus the full contraction of the STF tensor with itself
(and, for the toolkit, with n_<L>, n an abstract unit vector). The naive baseline is written
below, independently of the toolkit: sympy arrays, symmetrise by averaging over the l! index
permutations, then subtract the trace terms component by component (Thorne 1980, eq. (2.2)),
then sum products of components. Its cost per component is the same for every component, so
when a full naive run would exceed the time budget it is timed on a subset of components and
extrapolated (the printout says so). For l = 12 and 16 only the toolkit is timed.

Run:  python3 tests/benchmarks/bench_stf_core.py [--budget SECONDS] [--ranks 4 6 8]
"""

from __future__ import annotations

import argparse
import itertools
import os
import platform
import sys
import time
from math import factorial

import sympy as sp
from sympy.core.cache import clear_cache as clear_sympy_cache

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))

from stfalgebra.stf.tensors import SymmetricTensor, clear_caches  # noqa: E402
from stfalgebra.stf.vectors import Vector, dot  # noqa: E402

X_COMPONENTS = (sp.Rational(3, 2), sp.Rational(-1, 3), sp.Rational(5, 4))
V_COMPONENTS = (sp.Rational(-2, 5), sp.Rational(7, 3), sp.Rational(1, 2))
X_SYMBOLS = sp.symbols("x1 x2 x3", real=True)
V_SYMBOLS = sp.symbols("v1 v2 v3", real=True)


# --------------------------------------------------------------------------- naive baseline


def _double_factorial(n: int) -> int:
    value = 1
    while n > 1:
        value *= n
        n -= 2
    return value


def naive_outer(factors: list[tuple]) -> dict[tuple[int, ...], sp.Expr]:
    """All 3^l components of the outer product of the given component triples."""
    return {
        index: sp.Mul(*(factor[i] for factor, i in zip(factors, index)))
        for index in itertools.product(range(3), repeat=len(factors))
    }


def naive_symmetrize_component(array: dict, index: tuple[int, ...]) -> sp.Expr:
    """One component of the symmetric part: the average over the l! index permutations."""
    rank = len(index)
    return sp.Add(*(array[perm] for perm in itertools.permutations(index))) / factorial(rank)


def naive_traces(symmetric: dict, rank: int) -> list[dict]:
    """k-fold traces of a symmetric array, k = 0 .. l/2 (last index pairs contracted)."""
    traces = [symmetric]
    for k in range(1, rank // 2 + 1):
        previous = traces[-1]
        current_rank = rank - 2 * k
        traces.append(
            {
                index: sp.Add(*(previous[index + (a, a)] for a in range(3)))
                for index in itertools.product(range(3), repeat=current_rank)
            }
        )
    return traces


def naive_trace_free_component(traces: list[dict], index: tuple[int, ...]) -> sp.Expr:
    """F_<L> at one index: sum_k a_k Sym(delta^k F^(k)) by averaging over permutations."""
    rank = len(index)
    total = traces[0][index]
    for k in range(1, rank // 2 + 1):
        coefficient = sp.Rational(
            (-1) ** k * factorial(rank) * _double_factorial(2 * rank - 2 * k - 1),
            factorial(rank - 2 * k) * _double_factorial(2 * rank - 1) * _double_factorial(2 * k),
        )
        trace = traces[k]
        accumulated = []
        for perm in itertools.permutations(index):
            if all(perm[2 * j] == perm[2 * j + 1] for j in range(k)):
                accumulated.append(trace[perm[2 * k:]])
        total += coefficient * sp.Add(*accumulated) / factorial(rank)
    return sp.expand(total)


def naive_case(x: tuple, v: tuple, rank: int, budget: float) -> dict:
    """Naive STF projection plus self-contraction; extrapolated if over ``budget`` seconds.

    Returns a dict with the (measured or extrapolated) ``seconds``, ``complete`` and, when
    complete, the contraction ``value``.
    """
    q = rank // 2
    indices = list(itertools.product(range(3), repeat=rank))
    total = len(indices)
    clear_sympy_cache()
    start = time.perf_counter()
    array = naive_outer([x] * (rank - q) + [v] * q)
    # step 1: symmetrise every component, stopping early when over half the budget
    symmetric = {}
    for count, index in enumerate(indices, 1):
        symmetric[index] = naive_symmetrize_component(array, index)
        if time.perf_counter() - start > budget / 2 and count < total:
            break
    step1_done = len(symmetric)
    step1_time = time.perf_counter() - start
    if step1_done < total:
        # untimed stand-in for the components not symmetrised, only so that the later steps
        # have data to run on: the raw outer-product values, which are no larger than the
        # symmetrised ones, so the later steps' costs are if anything underestimated (the
        # ratio stays conservative); the results are then not compared
        for index in indices[step1_done:]:
            symmetric[index] = array[index]
        step1_estimate = step1_time * total / step1_done
    else:
        step1_estimate = step1_time
    # step 2: traces (cheap); step 3: trace-free components; step 4: contraction
    start = time.perf_counter()
    traces = naive_traces(symmetric, rank)
    step2_time = time.perf_counter() - start
    start = time.perf_counter()
    trace_free = {}
    for count, index in enumerate(indices, 1):
        trace_free[index] = naive_trace_free_component(traces, index)
        if time.perf_counter() - start > budget / 2 and count < total:
            break
    step3_done = len(trace_free)
    step3_time = time.perf_counter() - start
    step3_estimate = step3_time * total / step3_done
    value = None
    step4_estimate = 0.0
    if step1_done == total and step3_done == total:
        start = time.perf_counter()
        value = sp.expand(sp.Add(*(trace_free[index] ** 2 for index in indices)))
        step4_estimate = time.perf_counter() - start
    else:
        start = time.perf_counter()
        partial = sp.Add(*(trace_free[index] ** 2 for index in indices[:step3_done]))
        sp.expand(partial)
        step4_estimate = (time.perf_counter() - start) * total / step3_done
    seconds = step1_estimate + step2_time + step3_estimate + step4_estimate
    return {
        "seconds": seconds,
        "complete": value is not None,
        "value": value,
        "fraction_timed": min(step1_done, step3_done) / total,
    }


# --------------------------------------------------------------------------- toolkit


def toolkit_case(x: Vector, v: Vector, rank: int, repeats: int = 3) -> dict:
    """Best of ``repeats`` cold runs (caches cleared) of STF projection plus contractions."""
    q = rank // 2
    n = Vector("n", unit=True)
    best_self = best_n = float("inf")
    value = value_n = None
    for _ in range(repeats):
        clear_caches()
        clear_sympy_cache()
        start = time.perf_counter()
        projected = SymmetricTensor.from_vectors(*([x] * (rank - q) + [v] * q)).stf()
        value = projected.contract(projected)
        best_self = min(best_self, time.perf_counter() - start)
        clear_caches()
        clear_sympy_cache()
        start = time.perf_counter()
        projected = SymmetricTensor.from_vectors(*([x] * (rank - q) + [v] * q)).stf()
        value_n = projected.contract(SymmetricTensor.from_vectors(*([n] * rank)).stf())
        best_n = min(best_n, time.perf_counter() - start)
    return {"seconds": best_self, "seconds_with_n": best_n, "value": value, "value_with_n": value_n}


def run_case(rank: int, kind: str, budget: float | None = 60.0) -> dict:
    """Time one case. ``kind`` is "explicit" or "abstract"; ``budget=None`` skips the naive run.

    Returns the toolkit figures, the naive figures (if run), their ratio and whether the
    two results agree (checked when the naive run is complete).
    """
    if kind == "explicit":
        x = Vector("x", components=X_COMPONENTS)
        v = Vector("v", components=V_COMPONENTS)
        naive_x, naive_v = X_COMPONENTS, V_COMPONENTS
    elif kind == "abstract":
        x, v = Vector("x"), Vector("v")
        naive_x, naive_v = X_SYMBOLS, V_SYMBOLS
    else:
        raise ValueError(f"kind must be 'explicit' or 'abstract', got {kind!r}")
    result = {"rank": rank, "kind": kind, "toolkit": toolkit_case(x, v, rank)}
    if budget is None:
        return result
    naive = naive_case(naive_x, naive_v, rank, budget)
    result["naive"] = naive
    result["ratio"] = naive["seconds"] / result["toolkit"]["seconds"]
    if naive["complete"]:
        toolkit_value = result["toolkit"]["value"]
        if kind == "abstract":
            dots = {
                dot(x, x): sum(a * a for a in X_SYMBOLS),
                dot(x, v): sum(a * b for a, b in zip(X_SYMBOLS, V_SYMBOLS)),
                dot(v, v): sum(b * b for b in V_SYMBOLS),
            }
            toolkit_value = toolkit_value.xreplace(dots)
        result["agree"] = sp.expand(toolkit_value - naive["value"]) == 0
    return result


def _describe(result: dict) -> str:
    toolkit = result["toolkit"]
    line = (
        f"l={result['rank']:2d} {result['kind']:8s} toolkit {toolkit['seconds']*1e3:9.2f} ms"
        f" (with n_<L>: {toolkit['seconds_with_n']*1e3:8.2f} ms)"
    )
    naive = result.get("naive")
    if naive is not None:
        how = (
            "measured"
            if naive["complete"]
            else f"extrapolated from {naive['fraction_timed']:.2%} of the components"
        )
        line += f" | naive {naive['seconds']:10.2f} s ({how}) | ratio {result['ratio']:12.0f}x"
        if "agree" in result:
            line += f" | results agree: {result['agree']}"
    return line


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--budget", type=float, default=60.0, help="naive seconds per case before extrapolating")
    parser.add_argument("--ranks", type=int, nargs="*", default=[4, 6, 8], help="ranks compared with naive")
    parser.add_argument("--alone", type=int, nargs="*", default=[12, 16], help="ranks timed for the toolkit alone")
    args = parser.parse_args(argv)
    print(f"machine: {platform.machine()} {platform.processor() or ''} python {platform.python_version()} sympy {sp.__version__}")
    print("case: STF projection of x_<L-Q} v_{Q>} (q = l//2) plus its full contraction with itself")
    for rank in args.ranks:
        for kind in ("explicit", "abstract"):
            print(_describe(run_case(rank, kind, args.budget)), flush=True)
    for rank in args.alone:
        for kind in ("explicit", "abstract"):
            print(_describe(run_case(rank, kind, None)), flush=True)


if __name__ == "__main__":
    main()
