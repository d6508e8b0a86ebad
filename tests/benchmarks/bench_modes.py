"""Benchmark of the circular mode sets: the command line cold and warm against ``import sympy``,
and the growth of the derivation with lmax.

Command line (each case a fresh process, timed by the launcher of ``_common.run_child``:
whole-process CPU time, user + system, of the child alone):

- cold ``stfalgebra modes --orbit circular --pn-relative 1 --lmax 8 --json --no-cache``;
- the same at lmax 16;
- cold ``--pn-relative 0 --lmax 30``;
- cold ``--pn-relative 2 --lmax 8`` (the 2PN issue) and ``--pn-relative 5/2 --lmax 8`` (the 2.5PN
  issue: modes not served at 5/2 are listed with their refusal);
- warm: the lmax 8 request served from a fresh cache directory (``STFALGEBRA_CACHE_DIR``,
  filled once by an untimed run).

The baseline ``python -c "import sympy"`` runs in the same rounds, interleaved with the cases
(round k runs the baseline, then every case once), so that a change of load hits both. Every
figure is the median over the rounds (at least 3) of the CPU time, given as a ratio to the
median CPU time of the baseline; the median wall time is printed beside it.

Growth: ``derive_modes(lmax, pn_relative=1)`` in a fresh child per run, for lmax = 4, 8, ...,
24; the child measures the CPU time of the derivation alone, and the total size of the results
(characters of every mode's printed expression, ``ModeResult.hhat_text``). The least-squares
exponents of log(time), log(characters) and log(number of modes) against log(lmax) say whether
the work per mode grows faster than the size of its result (it does not when the exponent of
the time is at most that of the characters).

Goals (the engine issue): cold lmax 8 <= 1.5x import sympy, cold lmax 16 <= 4x, cold relative 0
lmax 30 <= 10x, warm <= 0.3x; (the 2PN issue) cold relative 2 lmax 8 <= 5x; (the 2.5PN issue)
cold relative 5/2 lmax 8 <= 10x. Times are not asserted on; under load (printed) they are
indicative.

Run:  python3 tests/benchmarks/bench_modes.py [--rounds 5] [--growth 4 8 12 16 20 24] [--quick]
      python3 tests/benchmarks/bench_modes.py --profile 16   (cProfile of one cold mode set)
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from _common import (  # noqa: E402
    REPOSITORY, ChildRun, child_environment, describe_machine, format_bytes, format_seconds,
    growth_exponent, load_note, run_child,
)

# ``python -c GROWTH_SCRIPT LMAX``: one cold mode set; prints one JSON line.
GROWTH_SCRIPT = r"""
import json, sys, time
cpu_start = time.process_time()
from stfalgebra.radiative.modes import derive_modes
cpu_imported = time.process_time()
lmax = int(sys.argv[1])
wall = time.perf_counter()
results = derive_modes(lmax, pn_relative=1)
wall_derived = time.perf_counter()
cpu_derived = time.process_time()
texts = [r.hhat_text() for r in results if r.refused is None]
cpu_printed = time.process_time()
print(json.dumps({
    "import_cpu": cpu_imported - cpu_start,
    "derive_cpu": cpu_derived - cpu_imported,
    "derive_wall": wall_derived - wall,
    "print_cpu": cpu_printed - cpu_derived,
    "derived": len(texts),
    "refused": sum(r.refused is not None for r in results),
    "characters": sum(len(t) for t in texts),
    "sympy_imported": "sympy" in sys.modules,
}))
"""

# ``python -c PROFILE_SCRIPT LMAX COUNT``: cProfile of a cold mode set, top entries printed.
PROFILE_SCRIPT = r"""
import cProfile, io, pstats, sys
from stfalgebra.radiative.modes import derive_modes
lmax, count = int(sys.argv[1]), int(sys.argv[2])
profiler = cProfile.Profile()
profiler.enable()
derive_modes(lmax, pn_relative=1)
profiler.disable()
for order in ("cumulative", "tottime"):
    stream = io.StringIO()
    pstats.Stats(profiler, stream=stream).strip_dirs().sort_stats(order).print_stats(count)
    text = stream.getvalue()
    print(f"--- sorted by {order} ---")
    print(text[text.index("ncalls"):].rstrip())
"""

# ``python -c SYMPY_PROBE ARGS...``: runs the CLI in-process and says whether sympy got imported.
SYMPY_PROBE = r"""
import contextlib, io, sys
from stfalgebra.cli import main
with contextlib.redirect_stdout(io.StringIO()):
    main(sys.argv[1:])
print("sympy" in sys.modules)
"""

BASELINE = "python -c 'import sympy'"


@dataclass(frozen=True)
class CliCase:
    """One timed command-line request and its goal (a ratio to the baseline)."""

    key: str
    label: str
    arguments: tuple[str, ...]
    goal: float
    warm: bool = False


def cli_cases(quick: bool) -> list[CliCase]:
    """The goal cases; the quick smoke run keeps one cold and the warm case, at lmax 4, and
    states no goal verdict."""
    def modes(relative: int | str, lmax: int) -> tuple[str, ...]:
        return ("modes", "--orbit", "circular", "--pn-relative", str(relative), "--lmax", str(lmax), "--json")

    small = 4 if quick else 8
    cold = CliCase("cold8", f"cold, relative 1, lmax {small}", modes(1, small) + ("--no-cache",), 1.5)
    warm = CliCase("warm8", f"warm (cached), relative 1, lmax {small}", modes(1, small), 0.3, warm=True)
    if quick:
        return [cold, warm]
    return [cold,
            CliCase("cold16", "cold, relative 1, lmax 16", modes(1, 16) + ("--no-cache",), 4.0),
            CliCase("cold30", "cold, relative 0, lmax 30", modes(0, 30) + ("--no-cache",), 10.0),
            CliCase("cold2pn", "cold, relative 2, lmax 8", modes(2, 8) + ("--no-cache",), 5.0),
            CliCase("cold25pn", "cold, relative 5/2, lmax 8", modes("5/2", 8) + ("--no-cache",), 10.0),
            warm]


def cli_command() -> list[str]:
    """The installed console script beside this interpreter, else ``python -m stfalgebra``."""
    script = Path(sys.executable).parent / "stfalgebra"
    if script.is_file() and os.access(script, os.X_OK):
        return [str(script)]
    return [sys.executable, "-m", "stfalgebra"]


def _failure(run: ChildRun, timeout: float) -> str | None:
    if run.timed_out:
        return f"stopped after {timeout:.0f} s"
    if run.returncode != 0:
        lines = run.stderr.strip().splitlines()
        return f"exit {run.returncode}: {lines[-1] if lines else '(no message)'}"
    return None


def run_cli(cases: list[CliCase], rounds: int, timeout: float, probe_all: bool = True) -> dict:
    """Time the baseline and every case, interleaved, ``rounds`` times; a case that fails is
    recorded with its message and not run again. Returns the runs and the consistency checks
    (whether each case imports sympy: every case, or only the warm one unless ``probe_all``)."""
    runs: dict[str, list[ChildRun]] = {"baseline": []}
    failed: dict[str, str] = {}
    outputs: dict[str, str] = {}
    with tempfile.TemporaryDirectory(prefix="stfalgebra-bench-cache-") as warm_cache, \
            tempfile.TemporaryDirectory(prefix="stfalgebra-bench-nocache-") as cold_cache:
        warm_env = child_environment(STFALGEBRA_CACHE_DIR=warm_cache, STFALGEBRA_NO_CACHE=None)
        cold_env = child_environment(STFALGEBRA_CACHE_DIR=cold_cache, STFALGEBRA_NO_CACHE=None)
        filling = {}
        for case in cases:
            runs[case.key] = []
            if case.warm:   # fill the fresh cache once, untimed in the figures
                run = run_child(cli_command() + list(case.arguments), timeout=timeout, env=warm_env, cwd=REPOSITORY)
                filling[case.key] = run
                message = _failure(run, timeout)
                if message:
                    failed[case.key] = f"filling the cache: {message}"
        for _ in range(rounds):
            runs["baseline"].append(run_child([sys.executable, "-c", "import sympy"], timeout=timeout,
                                              env=child_environment(), cwd=REPOSITORY))
            for case in cases:
                if case.key in failed:
                    continue
                run = run_child(cli_command() + list(case.arguments), timeout=timeout,
                                env=warm_env if case.warm else cold_env, cwd=REPOSITORY)
                message = _failure(run, timeout)
                if message:
                    failed[case.key] = message
                    continue
                runs[case.key].append(run)
                outputs.setdefault(case.key, run.stdout)
        wrote_cold_cache = bool(os.listdir(cold_cache))
        probes = {}
        for case in cases:
            if case.key in failed or not (probe_all or case.warm):
                continue
            probe = run_child([sys.executable, "-c", SYMPY_PROBE, *case.arguments], timeout=timeout,
                              env=warm_env if case.warm else cold_env, cwd=REPOSITORY)
            probes[case.key] = probe.stdout.strip() if probe.returncode == 0 else "probe failed"
    warm = next(case for case in cases if case.warm)
    cold = next(case for case in cases if case.arguments[:-1] == warm.arguments)
    same = (warm.key in outputs and cold.key in outputs
            and json.loads(outputs[warm.key]) == json.loads(outputs[cold.key]))
    return {"runs": runs, "failed": failed, "filling": filling, "warm_equals_cold": same,
            "no_cache_wrote": wrote_cold_cache, "imports_sympy": probes}


def summarise(runs: list[ChildRun]) -> dict:
    """Median CPU and wall time, their spread, peak memory."""
    cpu = [r.cpu_seconds for r in runs]
    wall = [r.seconds for r in runs]
    return {"runs": len(runs), "cpu": statistics.median(cpu), "wall": statistics.median(wall),
            "cpu_min": min(cpu), "cpu_max": max(cpu), "peak_bytes": max(r.peak_bytes for r in runs)}


def run_growth(lmaxes: list[int], repeats: int, timeout: float) -> list[dict]:
    """Median figures of ``repeats`` cold mode sets per lmax (each in a fresh child)."""
    out = []
    for lmax in sorted(lmaxes):
        samples = []
        for _ in range(repeats):
            run = run_child([sys.executable, "-c", GROWTH_SCRIPT, str(lmax)], timeout=timeout,
                            env=child_environment(), cwd=REPOSITORY)
            message = _failure(run, timeout)
            if message:
                out.append({"lmax": lmax, "failed": message})
                print(f"lmax={lmax:2d}: {message}; larger lmax skipped", flush=True)
                return out
            samples.append(json.loads(run.stdout.strip().splitlines()[-1]) | {"child_cpu": run.cpu_seconds})
        if len({s["characters"] for s in samples}) != 1:
            raise RuntimeError(f"lmax {lmax}: the runs printed results of different sizes")
        figures = {"lmax": lmax, "runs": repeats}
        for key in ("derive_cpu", "derive_wall", "print_cpu", "import_cpu", "child_cpu"):
            figures[key] = statistics.median(s[key] for s in samples)
        for key in ("derived", "refused", "characters", "sympy_imported"):
            figures[key] = samples[0][key]
        out.append(figures)
        print(f"lmax={lmax:2d}: derivation {format_seconds(figures['derive_cpu'])} CPU "
              f"(wall {format_seconds(figures['derive_wall'])}), printing {format_seconds(figures['print_cpu'])}, "
              f"whole child {format_seconds(figures['child_cpu'])} | {figures['derived']} modes "
              f"({figures['refused']} refused, m = 0) | {figures['characters']} characters | "
              f"{1e6 * figures['derive_cpu'] / figures['characters']:.1f} us per character | "
              f"sympy imported: {figures['sympy_imported']}", flush=True)
    return out


def growth_summary(points: list[dict]) -> dict:
    """Exponents (log-log least squares) of time, characters and mode count in lmax, and the
    local exponents between neighbouring lmax."""
    done = [p for p in points if "failed" not in p]
    ls = [p["lmax"] for p in done]
    summary = {key: growth_exponent(ls, [p[field] for p in done])
               for key, field in (("time", "derive_cpu"), ("characters", "characters"), ("modes", "derived"))}
    summary["time_per_character"] = (None if summary["time"] is None
                                     else summary["time"] - summary["characters"])
    summary["local"] = [(a["lmax"], b["lmax"],
                         growth_exponent([a["lmax"], b["lmax"]], [a["derive_cpu"], b["derive_cpu"]]),
                         growth_exponent([a["lmax"], b["lmax"]], [a["characters"], b["characters"]]))
                        for a, b in zip(done, done[1:])]
    return summary


def main(argv: list[str] | None = None) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=5,
                        help="rounds of the command-line timing (median; at least 3 for the goals)")
    parser.add_argument("--growth", type=int, nargs="*", default=[4, 8, 12, 16, 20, 24],
                        help="lmax of the growth measurement")
    parser.add_argument("--growth-repeats", type=int, default=3, help="fresh children per lmax (median)")
    parser.add_argument("--timeout", type=float, default=600.0, help="seconds per child before it is stopped")
    parser.add_argument("--quick", action="store_true",
                        help="smoke run: one cold and the warm case at lmax 4, one round, growth at lmax 2 "
                             "and 3; no goal verdicts")
    parser.add_argument("--profile", type=int, metavar="LMAX",
                        help="only profile derive_modes(LMAX, pn_relative=1) cold (cProfile top entries)")
    parser.add_argument("--profile-entries", type=int, default=25, help="entries per profile listing")
    args = parser.parse_args(argv)
    if args.profile is not None:
        run = run_child([sys.executable, "-c", PROFILE_SCRIPT, str(args.profile), str(args.profile_entries)],
                        timeout=args.timeout, env=child_environment(), cwd=REPOSITORY)
        print(f"cProfile of derive_modes({args.profile}, pn_relative=1), fresh process "
              f"(wall {format_seconds(run.seconds)} with profiling overhead) [{load_note()}]")
        print(run.stdout if run.returncode == 0 else run.stderr)
        return {"profile": run.stdout}
    if args.quick:
        args.rounds, args.growth, args.growth_repeats = 1, [2, 3], 1
    elif args.rounds < 3:
        parser.error(f"--rounds must be at least 3 (the goals are medians of at least 3 runs), got {args.rounds}")
    for line in describe_machine():
        print(line)

    cases = cli_cases(args.quick)
    print(f"command line: {' '.join(cli_command())} ...; {args.rounds} round(s), each: {BASELINE}, "
          "then every case once; figures: median whole-process CPU time (user + system) of the child")
    cli = run_cli(cases, args.rounds, args.timeout, probe_all=not args.quick)
    baseline = summarise(cli["runs"]["baseline"])
    cli["summary"] = {"baseline": baseline}
    print(f"  {'baseline ' + BASELINE:44s} CPU {format_seconds(baseline['cpu']):>9} "
          f"(range {format_seconds(baseline['cpu_min'])} - {format_seconds(baseline['cpu_max'])}), "
          f"wall {format_seconds(baseline['wall'])}, peak {format_bytes(baseline['peak_bytes'])}")
    goals = []
    for case in cases:
        if case.key in cli["failed"]:
            print(f"  {case.label:44s} FAILED: {cli['failed'][case.key]}")
            goals.append((case, None))
            continue
        figures = summarise(cli["runs"][case.key])
        figures["ratio"] = figures["cpu"] / baseline["cpu"]
        figures["wall_ratio"] = figures["wall"] / baseline["wall"]
        cli["summary"][case.key] = figures
        goals.append((case, figures["ratio"]))
        print(f"  {case.label:44s} CPU {format_seconds(figures['cpu']):>9} "
              f"(range {format_seconds(figures['cpu_min'])} - {format_seconds(figures['cpu_max'])}), "
              f"wall {format_seconds(figures['wall'])}, peak {format_bytes(figures['peak_bytes'])} | "
              f"{figures['ratio']:.2f}x import sympy (wall: {figures['wall_ratio']:.2f}x) | "
              f"imports sympy: {cli['imports_sympy'].get(case.key, 'not probed')}")
    print(f"  warm output identical to cold: {cli['warm_equals_cold']}; "
          f"--no-cache wrote into the cache directory: {cli['no_cache_wrote']}")
    print(f"  [{load_note()}]")

    print(f"growth: derive_modes(lmax, pn_relative=1), fresh child per run, median of {args.growth_repeats}")
    points = run_growth(args.growth, args.growth_repeats, args.timeout)
    summary = growth_summary(points)
    if summary["time"] is not None:
        print(f"  exponents in lmax: derivation time {summary['time']:.2f}, result characters "
              f"{summary['characters']:.2f}, modes {summary['modes']:.2f}; time per character "
              f"{summary['time_per_character']:+.2f} (work per mode grows "
              f"{'no faster than' if summary['time_per_character'] <= 0.05 else 'FASTER than'} its result)")
        print("  local exponents (time / characters): " + ", ".join(
            f"{a}-{b}: {t:.2f} / {c:.2f}" for a, b, t, c in summary["local"]))
    print(f"  [{load_note()}]")

    if args.quick:
        print("goals: not assessed in the quick run (small lmax, one round)")
    else:
        for case, ratio in goals:
            if ratio is None:
                verdict = "MISSED (failed)"
            else:
                verdict = (f"met ({ratio:.2f}x <= {case.goal}x, margin {case.goal / ratio:.1f}x)" if ratio <= case.goal
                           else f"MISSED ({ratio:.2f}x > {case.goal}x, over by {ratio / case.goal:.2f}x)")
            print(f"goal {case.label} <= {case.goal}x import sympy: {verdict}")
    print(load_note())
    return {"cli": cli, "growth": points, "growth_summary": summary}


if __name__ == "__main__":
    main()
