"""Benchmark of the test suite: wall and CPU time of ``python -m pytest -q -n 2``.

The suite runs in a fresh child through the launcher of ``_common.run_child``: the wall time,
and the CPU time (user + system) of pytest together with its worker processes (``wait4``
counts the descendants a process has waited for, which pytest-xdist does for its workers).
The slowest tests are listed (``--durations``) so that a slow one can be found. Times are not
asserted on; under load (printed) they are indicative.

Goal (the engine issue): the suite no slower than before the engine, about 4 minutes of wall
time on 2 cores. Judged on the wall time and on CPU time / workers (the wall time the run would
take with both cores to itself; under load the wall time also counts other sessions' work).

Run:  python3 tests/benchmarks/bench_suite.py [--workers 2] [--durations 15] [--quick]
"""

from __future__ import annotations

import argparse
import os
import re
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))

from _common import REPOSITORY, child_environment, describe_machine, format_seconds, load_note, run_child  # noqa: E402

GOAL_SECONDS = 240.0
# a small, fast test module for the smoke run
QUICK_TARGET = "tests/test_layering.py"


def run_suite(workers: int, durations: int, timeout: float, targets: list[str]) -> dict:
    """Run pytest once in a fresh child; wall, CPU, outcome counts and the slowest tests."""
    command = [sys.executable, "-m", "pytest", "-q", f"--durations={durations}", *targets]
    if workers > 1:
        command += ["-n", str(workers)]
    elif targets:   # a small smoke target: spare the start-up of plugins it does not use
        command += ["-p", "no:xdist", "-p", "no:hypothesispytest"]
    run = run_child(command, timeout=timeout, env=child_environment(), cwd=REPOSITORY)
    lines = run.stdout.strip().splitlines()
    summary = lines[-1] if lines else ""
    counts = {word: int(number) for number, word in re.findall(r"(\d+) (passed|failed|errors?|skipped|xfailed)",
                                                              summary)}
    slowest = [line.strip() for line in lines if re.match(r"^\s*\d+\.\d+s (call|setup|teardown) ", line)]
    failures = [line.strip() for line in lines if line.startswith(("FAILED ", "ERROR "))]
    return {"command": " ".join(command[1:]), "wall": run.seconds, "cpu": run.cpu_seconds,
            "returncode": run.returncode, "timed_out": run.timed_out, "summary": summary,
            "counts": counts, "slowest": slowest, "failures": failures}


def main(argv: list[str] | None = None) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--workers", type=int, default=2, help="pytest-xdist workers (-n)")
    parser.add_argument("--durations", type=int, default=15, help="slowest tests listed")
    parser.add_argument("--timeout", type=float, default=3600.0, help="seconds before the run is stopped")
    parser.add_argument("--quick", action="store_true", help=f"smoke run: {QUICK_TARGET} only, one process")
    args = parser.parse_args(argv)
    targets = [QUICK_TARGET] if args.quick else []
    if args.quick:
        args.workers, args.durations = 1, 3
    for line in describe_machine():
        print(line)
    figures = run_suite(args.workers, args.durations, args.timeout, targets)
    print(f"python {figures['command']}")
    print(f"  {figures['summary']}")
    print(f"  wall {format_seconds(figures['wall'])}, CPU {format_seconds(figures['cpu'])} "
          f"(pytest and its workers), exit {figures['returncode']}")
    for line in figures["failures"]:
        print(f"  {line}")
    if figures["slowest"]:
        print(f"  slowest {len(figures['slowest'])}:")
        for line in figures["slowest"]:
            print(f"    {line}")
    if not args.quick:
        # CPU time over the workers is the wall time the run would take with the cores to itself
        # (the workers are busy throughout); on a shared machine it is the steadier figure
        per_worker = figures["cpu"] / max(args.workers, 1)
        figures["cpu_per_worker"] = per_worker
        for label, seconds in (("wall time", figures["wall"]), ("CPU time / workers", per_worker)):
            verdict = ("met" if seconds <= GOAL_SECONDS
                       else f"MISSED by {seconds / GOAL_SECONDS:.2f}x")
            print(f"goal suite <= {GOAL_SECONDS / 60:.0f} min on {args.workers} cores, {label} "
                  f"{format_seconds(seconds)}: {verdict}")
    print(load_note())
    return figures


if __name__ == "__main__":
    main()
