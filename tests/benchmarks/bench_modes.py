"""Benchmark of the full circular mode set and of the command line, cold and warm.

Workload per lmax: every circular mode 2 <= l <= lmax through relative 1PN
(``derive_modes(lmax, pn_relative=1)``) plus the (2,2) mode through 1.5PN
(``derive_mode(2, 2, pn=1.5)``; when the toolkit refuses that order the refusal is printed and
only the 1PN set is timed). Each lmax runs in a FRESH child process, so no ``lru_cache`` carries
over; the child times its import and its derivation, the parent reads the child's own peak
resident memory (``wait4``). Printed: the times, their ratio to the lmax = 4 baseline and the
least-squares growth exponent of log(time) against log(lmax).

Command line: ``stfalgebra modes --orbit circular --pn-relative 1 --lmax 8 --json --no-cache``
(cold), then the same request served from a fresh cache directory (``STFALGEBRA_CACHE_DIR``,
warm), against ``python -c "import sympy"`` measured in the same run.

Goals (issue 8): cold CLI < 10 s, warm CLI < 2x import sympy, lmax = 12 < 60 s. Times are not
asserted on; under load (printed) they are indicative.

Run:  python3 tests/benchmarks/bench_modes.py [--lmax 4 6 8 10 12] [--timeout SECONDS] [--quick]
      python3 tests/benchmarks/bench_modes.py --profile 8   (cProfile of one cold mode set)
"""

from __future__ import annotations

import argparse
import json
import os
import shutil
import statistics
import sys
import tempfile
from pathlib import Path

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from _common import (  # noqa: E402
    REPOSITORY, ChildRun, child_environment, describe_machine, format_bytes, format_seconds,
    growth_exponent, load_note, run_child,
)

# Executed in each fresh child: ``python -c CHILD_SCRIPT LMAX``; prints one JSON line.
CHILD_SCRIPT = r"""
import json, resource, sys, time
start = time.perf_counter()
from stfalgebra.errors import OrderBeyondInputsError
from stfalgebra.radiative.modes import derive_mode, derive_modes
imported = time.perf_counter()
cpu_imported = time.process_time()
lmax = int(sys.argv[1])
results = derive_modes(lmax, pn_relative=1)
modes_done = time.perf_counter()
tail_refused = None
tail_size = 0
try:
    tail = derive_mode(2, 2, pn="3/2")
    tail_size = len(str(tail.hhat))
except OrderBeyondInputsError as exc:
    tail_refused = str(exc)
tail_done = time.perf_counter()
cpu_done = time.process_time()
print(json.dumps({
    "import_seconds": imported - start,
    "modes_seconds": modes_done - imported,
    "tail_seconds": tail_done - modes_done,
    "tail_refused": tail_refused,
    "work_cpu": cpu_done - cpu_imported,
    "derived": sum(r.hhat is not None for r in results),
    "refused": sum(r.hhat is None for r in results),
    "characters": sum(len(str(r.hhat)) for r in results if r.hhat is not None) + tail_size,
    "self_peak_kib": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss,
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

CLI_ARGUMENTS = ("modes", "--orbit", "circular", "--pn-relative", "1", "--json")

COLD_GOAL_SECONDS = 10.0
WARM_GOAL_RATIO = 2.0
LMAX12_GOAL_SECONDS = 60.0


def cli_command() -> list[str]:
    """The installed console script beside this interpreter, else ``python -m stfalgebra``."""
    script = Path(sys.executable).parent / "stfalgebra"
    if script.is_file() and os.access(script, os.X_OK):
        return [str(script)]
    return [sys.executable, "-m", "stfalgebra"]


def run_mode_set(lmax: int, timeout: float) -> dict:
    """Derive the mode set of ``lmax`` in a fresh child; figures as a dict.

    Keys: ``lmax``, ``wall`` and ``cpu`` (the whole child, including interpreter start and
    imports), ``peak_bytes``, ``timed_out`` and, when the child finished, the child's own figures
    (``import_seconds``, ``modes_seconds``, ``tail_seconds``, ``tail_refused``, ``derived``,
    ``refused``, ``characters``, ``work_cpu``) and ``work`` = modes + tail seconds (wall).
    """
    run = run_child([sys.executable, "-c", CHILD_SCRIPT, str(lmax)], timeout=timeout,
                    env=child_environment(), cwd=REPOSITORY)
    figures = {"lmax": lmax, "wall": run.seconds, "cpu": run.cpu_seconds, "peak_bytes": run.peak_bytes,
               "timed_out": run.timed_out}
    if run.timed_out:
        return figures
    if run.returncode != 0:
        raise RuntimeError(f"mode-set child for lmax = {lmax} failed ({run.returncode}): "
                           f"{run.stderr.strip()[-2000:]}")
    figures.update(json.loads(run.stdout.strip().splitlines()[-1]))
    figures["work"] = figures["modes_seconds"] + figures["tail_seconds"]
    return figures


def _timed_runs(command: list[str], repeats: int, timeout: float, env: dict[str, str]) -> list[ChildRun]:
    runs = []
    for _ in range(repeats):
        run = run_child(command, timeout=timeout, env=env, cwd=REPOSITORY)
        if run.timed_out:
            raise RuntimeError(f"{' '.join(command)} did not finish within {timeout:.0f} s")
        if run.returncode != 0:
            raise RuntimeError(f"{' '.join(command)} failed ({run.returncode}): {run.stderr.strip()[-2000:]}")
        runs.append(run)
    return runs


def run_cli(lmax: int, *, cold_repeats: int, warm_repeats: int, baseline_repeats: int, timeout: float) -> dict:
    """Time the CLI cold (``--no-cache``), once while filling a fresh cache, and warm; and the
    ``import sympy`` baseline. Returns best (minimum) and median times and a consistency flag
    (the warm output equals the cold output)."""
    command = cli_command() + list(CLI_ARGUMENTS) + ["--lmax", str(lmax)]
    baseline = _timed_runs([sys.executable, "-c", "import sympy"], baseline_repeats, timeout,
                           child_environment())
    with tempfile.TemporaryDirectory(prefix="stfalgebra-bench-cache-") as cache:
        env = child_environment(STFALGEBRA_CACHE_DIR=cache, STFALGEBRA_NO_CACHE=None)
        cold = _timed_runs(command + ["--no-cache"], cold_repeats, timeout, env)
        if os.listdir(cache):
            raise RuntimeError("--no-cache wrote into the cache directory")
        filling = _timed_runs(command, 1, timeout, env)
        warm = _timed_runs(command, warm_repeats, timeout, env)
        # does the warm path import sympy? (the cache is meant to make that unnecessary)
        probe = ("import sys\nfrom stfalgebra.cli import main\nimport contextlib, io\n"
                 "with contextlib.redirect_stdout(io.StringIO()):\n"
                 f"    main({[*CLI_ARGUMENTS, '--lmax', str(lmax)]!r})\n"
                 "print('sympy' in sys.modules)")
        imports_sympy = _timed_runs([sys.executable, "-c", probe], 1, timeout, env)[0].stdout.strip()
    same = json.loads(warm[-1].stdout) == json.loads(cold[0].stdout) == json.loads(filling[0].stdout)

    def summary(runs: list[ChildRun]) -> dict:
        times = [r.seconds for r in runs]
        return {"best": min(times), "median": statistics.median(times), "runs": len(times),
                "cpu": min(r.cpu_seconds for r in runs),
                "peak_bytes": max(r.peak_bytes for r in runs)}

    return {"lmax": lmax, "command": "stfalgebra " + " ".join(command[len(cli_command()):]),
            "launcher": " ".join(cli_command()),
            "baseline": summary(baseline), "cold": summary(cold), "filling": summary(filling),
            "warm": summary(warm), "warm_equals_cold": same, "warm_imports_sympy": imports_sympy}


def _goal(met: bool) -> str:
    return "met" if met else "MISSED"


def main(argv: list[str] | None = None) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--lmax", type=int, nargs="*", default=[4, 6, 8, 10, 12], help="mode sets to time")
    parser.add_argument("--timeout", type=float, default=240.0,
                        help="seconds per child before it is stopped (larger lmax are then skipped)")
    parser.add_argument("--cli-lmax", type=int, default=8, help="lmax of the command-line timing")
    parser.add_argument("--quick", action="store_true", help="smoke run: lmax 4 only, CLI at lmax 2, one repeat")
    parser.add_argument("--profile", type=int, metavar="LMAX",
                        help="only profile derive_modes(LMAX, pn_relative=1) cold (cProfile top entries)")
    parser.add_argument("--profile-entries", type=int, default=25, help="entries per profile listing")
    args = parser.parse_args(argv)
    if args.profile is not None:
        run = run_child([sys.executable, "-c", PROFILE_SCRIPT, str(args.profile), str(args.profile_entries)],
                        timeout=10 * args.timeout, env=child_environment(), cwd=REPOSITORY)
        print(f"cProfile of derive_modes({args.profile}, pn_relative=1), fresh process "
              f"(wall {format_seconds(run.seconds)} with profiling overhead) [{load_note()}]")
        print(run.stdout if run.returncode == 0 else run.stderr)
        return {"profile": run.stdout}
    if args.quick:
        args.lmax, args.cli_lmax = [4], 2
        repeats = {"cold_repeats": 1, "warm_repeats": 1, "baseline_repeats": 1}
    else:
        # one --no-cache run: the cache-filling run is a second cold sample
        repeats = {"cold_repeats": 1, "warm_repeats": 5, "baseline_repeats": 5}
    for line in describe_machine():
        print(line)
    print("workload: derive_modes(lmax, pn_relative=1) + derive_mode(2, 2, pn=3/2), circular orbit, "
          "each lmax in a fresh process (cold caches)")
    print("  'work' = derivation time inside the child; 'wall' adds interpreter start and imports; "
          "peak = child's ru_maxrss")
    sets = []
    for lmax in sorted(args.lmax):
        figures = run_mode_set(lmax, args.timeout)
        sets.append(figures)
        if figures["timed_out"]:
            print(f"lmax={lmax:2d}: stopped after {args.timeout:.0f} s (timeout); larger lmax skipped "
                  f"[{load_note()}]", flush=True)
            break
        base = sets[0].get("work")
        ratio = figures["work"] / base if base else float("nan")
        cpu_ratio = figures["work_cpu"] / sets[0]["work_cpu"] if sets[0].get("work_cpu") else float("nan")
        print(f"lmax={lmax:2d}: work {format_seconds(figures['work']):>9} wall, {format_seconds(figures['work_cpu']):>9} CPU"
              f" (1PN set {format_seconds(figures['modes_seconds'])}, 22 at 1.5PN {format_seconds(figures['tail_seconds'])})"
              f" | whole child {format_seconds(figures['wall'])} wall, {format_seconds(figures['cpu'])} CPU"
              f" (import {format_seconds(figures['import_seconds'])})"
              f" | peak {format_bytes(figures['peak_bytes'])} | {figures['derived']} modes derived,"
              f" {figures['refused']} refused (m = 0) | {figures['characters']} characters"
              f" | ratio to lmax={sets[0]['lmax']}: {ratio:.2f}x wall, {cpu_ratio:.2f}x CPU", flush=True)
    done = [s for s in sets if not s["timed_out"]]
    if done and done[0]["tail_refused"]:
        print(f"(2,2) at 1.5PN: not available, refused by the toolkit: {done[0]['tail_refused']}")
    elif done:
        print("(2,2) at 1.5PN: derived (tails available)")
    exponent = growth_exponent([s["lmax"] for s in done], [s["work"] for s in done])
    cpu_exponent = growth_exponent([s["lmax"] for s in done], [s["work_cpu"] for s in done])
    if exponent is not None:
        print(f"growth: work ~ lmax^{exponent:.2f} on wall time, lmax^{cpu_exponent:.2f} on CPU time "
              f"(least squares of log(work) on log(lmax), lmax = {', '.join(str(s['lmax']) for s in done)})")
    twelve = next((s for s in sets if s["lmax"] == 12), None)
    if twelve is not None:
        if twelve["timed_out"]:
            print(f"goal lmax=12 < {LMAX12_GOAL_SECONDS:.0f} s: MISSED (stopped after {args.timeout:.0f} s)")
        else:
            print(f"goal lmax=12 < {LMAX12_GOAL_SECONDS:.0f} s: {_goal(twelve['wall'] < LMAX12_GOAL_SECONDS)} "
                  f"on wall time ({format_seconds(twelve['wall'])}), "
                  f"{_goal(twelve['cpu'] < LMAX12_GOAL_SECONDS)} on CPU time ({format_seconds(twelve['cpu'])})")

    cli = run_cli(args.cli_lmax, timeout=args.timeout, **repeats)
    base = cli["baseline"]["best"]
    print(f"CLI: {cli['command']} (run as {cli['launcher']}) [{load_note()}]")
    print(f"  baseline python -c 'import sympy': best {format_seconds(base)}, median "
          f"{format_seconds(cli['baseline']['median'])} ({cli['baseline']['runs']} runs), "
          f"CPU {format_seconds(cli['baseline']['cpu'])}, peak {format_bytes(cli['baseline']['peak_bytes'])}")
    for label, key in (("cold (--no-cache)", "cold"), ("cold, filling a fresh cache", "filling"),
                       ("warm (served from the cache)", "warm")):
        item = cli[key]
        print(f"  {label:30s} best {format_seconds(item['best']):>9}, median {format_seconds(item['median']):>9}"
              f" ({item['runs']} runs), CPU {format_seconds(item['cpu']):>9}, peak {format_bytes(item['peak_bytes'])},"
              f" {item['best'] / base:.2f}x import sympy (CPU: {item['cpu'] / cli['baseline']['cpu']:.2f}x)")
    print(f"  warm output identical to cold: {cli['warm_equals_cold']}; "
          f"warm path imports sympy: {cli['warm_imports_sympy']}")
    if args.cli_lmax == 8:
        print(f"goal cold < {COLD_GOAL_SECONDS:.0f} s: {_goal(cli['cold']['best'] < COLD_GOAL_SECONDS)} on wall "
              f"time, {_goal(cli['cold']['cpu'] < COLD_GOAL_SECONDS)} on CPU time; "
              f"goal warm < {WARM_GOAL_RATIO:.0f}x import sympy: "
              f"{_goal(cli['warm']['best'] < WARM_GOAL_RATIO * base)} on wall time, "
              f"{_goal(cli['warm']['cpu'] < WARM_GOAL_RATIO * cli['baseline']['cpu'])} on CPU time")
    print(load_note())
    return {"sets": sets, "growth_exponent": exponent, "growth_exponent_cpu": cpu_exponent, "cli": cli}


if __name__ == "__main__":
    main()
