"""Benchmark of generated code: C and numpy from ``stfalgebra.codegen`` against sympy's lambdify.

Expression set: the circular modes 2 <= l <= 4 (m != 0; m = 0 is refused, non-linear memory),
each through the highest relative PN order the toolkit derives for it (tried from 3/2 down),
as the strain R c^2 h_lm/(G m) with its phase factor exp(-i m psi): inputs x, nu, delta, psi.

Contenders, all over the same samples (10^6 by default, in chunks of 10^5 so that the outputs
fit in memory):

- generated C, compiled into a shared library with the project's verification flags
  (``-std=c99 -O2``), called once per chunk through ctypes by a small C loop written here
  (one call of the generated function per sample); also, for scale, one ctypes call per sample
  on a subset;
- the generated numpy function, called on whole chunks;
- ``sympy.lambdify`` of the same complex expressions: scalar (``modules="math"``, a Python
  loop over a subset of the samples, the per-sample time extrapolated) and vectorised
  (``modules="numpy"``, whole chunks); for information also the vectorised one with
  ``cse=True``.

Vectorised contenders take the best of three calls per chunk; the scalar loops run once. Wall
and CPU times are both printed (CPU time is the steadier figure on a loaded machine).

The generated code is first verified against exact evaluation (``verify_c``, ``verify_numpy``)
and the contenders are compared with each other on the first chunk. Goals (issue 8): C >= 50x
scalar lambdify per sample, >= 5x numpy lambdify. Times are not asserted on.

Run:  python3 tests/benchmarks/bench_codegen.py [--samples 1000000] [--lmax 4] [--quick]
"""

from __future__ import annotations

import argparse
import ctypes
import math
import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
import sympy as sp

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))

from _common import describe_machine, format_seconds, load_note  # noqa: E402

from stfalgebra.codegen import (  # noqa: E402
    emit_c, emit_numpy, find_c_compiler, load_generated_module, mode_emission, prepare_emission,
    verify_c, verify_numpy,
)
from stfalgebra.codegen.verification import COMPILER_FLAGS  # noqa: E402
from stfalgebra.errors import OrderBeyondInputsError, RefusedModeError  # noqa: E402
from stfalgebra.radiative.modes import derive_mode  # noqa: E402

ORDERS = ("3/2", "1", "1/2", "0")
CHUNK = 100_000
REPEATS = 3  # each chunk of a vectorised contender: best of this many calls (load noise)
SCALAR_GOAL = 50.0
NUMPY_GOAL = 5.0


def select_modes(lmax: int) -> tuple[list, dict]:
    """Each mode 2 <= l <= lmax, m != 0, at the highest relative order of :data:`ORDERS` the
    toolkit derives; returns the results and a count per order."""
    results, counts = [], {}
    for l in range(2, lmax + 1):
        for m in range(l, -l - 1, -1):
            if m == 0:
                continue
            for order in ORDERS:
                try:
                    result = derive_mode(l, m, pn_relative=order)
                except (OrderBeyondInputsError, RefusedModeError):
                    continue
                results.append(result)
                counts[order] = counts.get(order, 0) + 1
                break
    return results, counts


def draw_samples(count: int, seed: int = 20240517) -> list[np.ndarray]:
    """x in [0.02, 0.25], masses with m1/m2 in [1, 10] (so nu, delta consistent), psi in
    [-pi, pi]: the ranges of the codegen sampler, drawn with numpy."""
    rng = np.random.default_rng(seed)
    x = rng.uniform(0.02, 0.25, count)
    ratio = rng.uniform(1.0, 10.0, count)
    nu = ratio / (1.0 + ratio) ** 2
    delta = (ratio - 1.0) / (ratio + 1.0)
    psi = rng.uniform(-math.pi, math.pi, count)
    return [x, nu, delta, psi]


_DRIVER = """\
#include "{header}"

/* One call of the generated function per sample; outputs stored sample-major. */
void bench_loop(long count, const double *const *inputs, double *re_out, double *im_out)
{{
    for (long i = 0; i < count; ++i) {{
        {name}({arguments}, re_out + i * {outputs}, im_out + i * {outputs});
    }}
}}
"""


def compile_with_driver(code, directory: Path) -> ctypes.CDLL:
    """Compile the generated C and the loop driver into one shared library."""
    compiler = find_c_compiler()
    if compiler is None:
        raise RuntimeError("no C compiler found: the C figures need one")
    (directory / code.header_name).write_text(code.header, encoding="utf-8")
    source = directory / f"{code.function_name}.c"
    source.write_text(code.source, encoding="utf-8")
    arguments = ", ".join(f"inputs[{k}][i]" for k in range(len(code.parameters)))
    driver = directory / "bench_driver.c"
    driver.write_text(_DRIVER.format(header=code.header_name, name=code.function_name, arguments=arguments,
                                     outputs=len(code.output_names)), encoding="utf-8")
    library = directory / "libbench_generated.so"
    subprocess.run([compiler, *COMPILER_FLAGS, "-o", str(library), str(source), str(driver), "-lm"],
                   check=True, capture_output=True, text=True)
    return ctypes.CDLL(str(library))


def time_c_loop(library: ctypes.CDLL, samples: list[np.ndarray], outputs: int) -> tuple[float, float, np.ndarray]:
    """Wall and CPU seconds for all samples through the C loop, and the complex outputs of the
    first chunk."""
    loop = library.bench_loop
    loop.restype = None
    loop.argtypes = [ctypes.c_long, ctypes.POINTER(ctypes.POINTER(ctypes.c_double)),
                     ctypes.c_void_p, ctypes.c_void_p]
    count = len(samples[0])
    chunk = min(CHUNK, count)
    real = np.empty((chunk, outputs))
    imag = np.empty((chunk, outputs))
    first = None
    total = total_cpu = 0.0
    for begin in range(0, count, chunk):
        pieces = [np.ascontiguousarray(s[begin:begin + chunk]) for s in samples]
        pointers = (ctypes.POINTER(ctypes.c_double) * len(pieces))(
            *[p.ctypes.data_as(ctypes.POINTER(ctypes.c_double)) for p in pieces])
        n = len(pieces[0])
        best = best_cpu = math.inf
        for _ in range(REPEATS):
            start, cpu = time.perf_counter(), time.process_time()
            loop(n, pointers, real.ctypes.data, imag.ctypes.data)
            best_cpu = min(best_cpu, time.process_time() - cpu)
            best = min(best, time.perf_counter() - start)
        total, total_cpu = total + best, total_cpu + best_cpu
        if first is None:
            first = real[:n] + 1j * imag[:n]
    return total, total_cpu, first


def time_c_per_call(library: ctypes.CDLL, code, samples: list[np.ndarray], count: int) -> tuple[float, float]:
    """Wall and CPU seconds per sample when Python calls the generated function once per
    sample (ctypes)."""
    function = getattr(library, code.function_name)
    function.restype = None
    function.argtypes = [ctypes.c_double] * len(code.parameters) + [ctypes.POINTER(ctypes.c_double)] * 2
    n_out = len(code.output_names)
    real = (ctypes.c_double * n_out)()
    imag = (ctypes.c_double * n_out)()
    rows = [tuple(float(s[i]) for s in samples) for i in range(count)]
    start, cpu = time.perf_counter(), time.process_time()
    for row in rows:
        function(*row, real, imag)
    return (time.perf_counter() - start) / count, (time.process_time() - cpu) / count


def time_vectorised(function, samples: list[np.ndarray], as_matrix) -> tuple[float, float, np.ndarray]:
    """Wall and CPU seconds for all samples in chunks through a vectorised ``function``; first
    chunk's outputs as a (chunk, outputs) complex matrix."""
    count = len(samples[0])
    chunk = min(CHUNK, count)
    total = total_cpu = 0.0
    first = None
    for begin in range(0, count, chunk):
        pieces = [s[begin:begin + chunk] for s in samples]
        best = best_cpu = math.inf
        for _ in range(REPEATS):
            start, cpu = time.perf_counter(), time.process_time()
            value = function(*pieces)
            best_cpu = min(best_cpu, time.process_time() - cpu)
            best = min(best, time.perf_counter() - start)
        total, total_cpu = total + best, total_cpu + best_cpu
        if first is None:
            first = as_matrix(value, len(pieces[0]))
    return total, total_cpu, first


def time_scalar(function, samples: list[np.ndarray], budget: float,
                limit: int) -> tuple[float, float, int, np.ndarray]:
    """Wall and CPU seconds per sample of a scalar ``function`` looped in Python over the
    first samples (until ``limit`` samples or ``budget`` seconds), the number timed and their
    outputs."""
    rows = [tuple(float(s[i]) for s in samples) for i in range(min(limit, len(samples[0])))]
    values = []
    start, cpu = time.perf_counter(), time.process_time()
    for row in rows:
        values.append(function(*row))
        if time.perf_counter() - start > budget:
            break
    elapsed, elapsed_cpu = time.perf_counter() - start, time.process_time() - cpu
    return elapsed / len(values), elapsed_cpu / len(values), len(values), np.array(values, dtype=complex)


def _relative_error(value: np.ndarray, reference: np.ndarray) -> float:
    """Largest |value - reference| relative to each output's largest |reference| (a relative
    error per value means nothing near a zero of an output, e.g. delta -> 0)."""
    scale = np.maximum(np.max(np.abs(reference), axis=0), 1e-300)
    return float(np.max(np.abs(value - reference) / scale))


def main(argv: list[str] | None = None) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--samples", type=int, default=1_000_000, help="number of samples")
    parser.add_argument("--lmax", type=int, default=4, help="highest l of the mode set")
    parser.add_argument("--scalar-budget", type=float, default=20.0,
                        help="seconds for the scalar lambdify loop (per-sample time extrapolated)")
    parser.add_argument("--quick", action="store_true", help="smoke run: l <= 2, 10^4 samples")
    args = parser.parse_args(argv)
    if args.quick:
        args.samples, args.lmax, args.scalar_budget = 10_000, 2, 2.0
    for line in describe_machine():
        print(line)

    start = time.perf_counter()
    results, counts = select_modes(args.lmax)
    derive_seconds = time.perf_counter() - start
    emission = mode_emission(results, function_name="bench_modes")
    start = time.perf_counter()
    prepared = prepare_emission(emission)
    c_code = emit_c(prepared)
    numpy_source = emit_numpy(prepared)
    emit_seconds = time.perf_counter() - start
    c_report = verify_c(emission, c_code)
    numpy_report = verify_numpy(emission, numpy_source)
    orders = ", ".join(f"{n} at relative {o}" for o, n in sorted(counts.items(), key=lambda t: -float(sp.Rational(t[0]))))
    names = [o.name for o in emission.outputs]
    symbols = list(emission.input_symbols())
    expressions = [o.expression for o in emission.outputs]
    operations = sum(sp.count_ops(e) for e in expressions)
    print(f"expressions: {len(names)} modes l <= {args.lmax} ({orders}), strain with exp(-i m psi); "
          f"inputs {', '.join(s.name for s in symbols)}; {operations} operations before CSE, "
          f"{len(prepared.assignments)} CSE temporaries")
    print(f"set-up (not timed below): derivation {format_seconds(derive_seconds)}, preparation + emission "
          f"{format_seconds(emit_seconds)}")
    print(f"verification: {c_report.summary()}; {numpy_report.summary()}")
    samples = draw_samples(args.samples)
    count = args.samples
    print(f"samples: {count} in chunks of {min(CHUNK, count)} [{load_note()}]")

    figures: dict = {"samples": count, "outputs": len(names)}
    with tempfile.TemporaryDirectory(prefix="stfalgebra-bench-codegen-") as scratch:
        library = compile_with_driver(c_code, Path(scratch))
        figures["c"], figures["c_cpu"], c_first = time_c_loop(library, samples, len(names))
        figures["c_per_call"], figures["c_per_call_cpu"] = time_c_per_call(library, c_code, samples,
                                                                           min(count, 20_000))

    module = load_generated_module(numpy_source, "bench_generated_numpy")
    generated = getattr(module, prepared.function_name)
    figures["numpy"], figures["numpy_cpu"], numpy_first = time_vectorised(
        generated, samples, lambda value, n: np.stack([np.broadcast_to(value[k], (n,)) for k in module.OUTPUT_NAMES], 1))

    start = time.perf_counter()
    vector_lambdified = sp.lambdify(symbols, expressions, modules="numpy")
    vector_cse = sp.lambdify(symbols, expressions, modules="numpy", cse=True)
    scalar_lambdified = sp.lambdify(symbols, expressions, modules="math")
    figures["lambdify_build"] = time.perf_counter() - start

    def lambdified_matrix(value, n):
        return np.stack([np.broadcast_to(np.asarray(v, dtype=complex), (n,)) for v in value], 1)

    figures["lambdify_numpy"], figures["lambdify_numpy_cpu"], lambdify_first = time_vectorised(
        vector_lambdified, samples, lambdified_matrix)
    figures["lambdify_numpy_cse"], figures["lambdify_numpy_cse_cpu"], _ = time_vectorised(
        vector_cse, samples, lambdified_matrix)
    per_sample, per_sample_cpu, timed, scalar_values = time_scalar(scalar_lambdified, samples,
                                                                   args.scalar_budget, count)
    figures["lambdify_scalar_per_sample"], figures["lambdify_scalar_per_sample_cpu"] = per_sample, per_sample_cpu
    figures["lambdify_scalar_timed"] = timed

    reference = lambdify_first
    figures["agreement"] = {
        "C": _relative_error(c_first, reference),
        "generated numpy": _relative_error(numpy_first, reference),
        "scalar lambdify": _relative_error(scalar_values[:len(reference)], reference[:len(scalar_values)]),
    }
    c_per_sample, c_per_sample_cpu = figures["c"] / count, figures["c_cpu"] / count

    def line(label: str, wall: float, cpu: float, note: str = "") -> None:
        print(f"  {label:38s} {format_seconds(wall):>10}/sample (CPU {format_seconds(cpu):>10}), total "
              f"{format_seconds(wall * count):>9} for {count} | C is {wall / c_per_sample:7.1f}x faster "
              f"(CPU: {cpu / max(c_per_sample_cpu, 1e-15):7.1f}x){note}")

    print("per-sample evaluation of all outputs (real and imaginary parts):")
    line("generated C (C loop, one call/sample)", c_per_sample, c_per_sample_cpu)
    line("generated C (one ctypes call/sample)", figures["c_per_call"], figures["c_per_call_cpu"],
         " (ctypes overhead)")
    for label, key in (("generated numpy (vectorised)", "numpy"), ("lambdify numpy (vectorised)", "lambdify_numpy"),
                       ("lambdify numpy, cse=True (vectorised)", "lambdify_numpy_cse")):
        line(label, figures[key] / count, figures[key + "_cpu"] / count)
    line("lambdify math (scalar loop)", per_sample, per_sample_cpu, f" (timed on {timed} samples, extrapolated)")
    print("agreement with lambdify numpy (max error relative to each output's largest value, first chunk): "
          + ", ".join(f"{k} {v:.1e}" for k, v in figures["agreement"].items()))
    scalar_ratio = per_sample / c_per_sample
    numpy_ratio = figures["lambdify_numpy"] / figures["c"]
    scalar_ratio_cpu = per_sample_cpu / max(c_per_sample_cpu, 1e-15)
    numpy_ratio_cpu = figures["lambdify_numpy_cpu"] / max(figures["c_cpu"], 1e-15)
    print(f"goal C >= {SCALAR_GOAL:.0f}x scalar lambdify: {'met' if scalar_ratio >= SCALAR_GOAL else 'MISSED'} "
          f"({scalar_ratio:.0f}x wall, {scalar_ratio_cpu:.0f}x CPU); goal C >= {NUMPY_GOAL:.0f}x numpy lambdify: "
          f"{'met' if numpy_ratio >= NUMPY_GOAL else 'MISSED'} ({numpy_ratio:.1f}x wall, {numpy_ratio_cpu:.1f}x CPU)")
    print(load_note())
    figures["scalar_ratio"], figures["numpy_ratio"] = scalar_ratio, numpy_ratio
    return figures


if __name__ == "__main__":
    main()
