"""Shared helpers of the on-demand benchmarks: machine description, load, timing of fresh child
processes (wall time and the child's own peak memory), best-of timing and a growth fit.

Not a test module and not part of the package: the benchmark scripts import it from their own
directory. Times are never asserted on; figures measured under load are indicative.
"""

from __future__ import annotations

import datetime
import json
import math
import os
import platform
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Callable, Sequence

REPOSITORY = Path(__file__).resolve().parents[2]

__all__ = [
    "REPOSITORY", "ChildRun", "best_of", "child_environment", "cpu_model", "describe_machine",
    "format_bytes", "format_seconds", "growth_exponent", "load_note", "run_child",
]


def cpu_model() -> str:
    """The CPU model name from /proc/cpuinfo (the platform's processor string elsewhere)."""
    try:
        with open("/proc/cpuinfo", encoding="utf-8") as handle:
            for line in handle:
                if line.lower().startswith("model name"):
                    return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return platform.processor() or platform.machine() or "unknown"


def load_note() -> str:
    """One line with the 1, 5 and 15 minute load averages and the core count."""
    try:
        one, five, fifteen = os.getloadavg()
    except OSError:
        return "load average: unavailable"
    cores = os.cpu_count() or 1
    # the benchmark itself keeps one core busy; more than half a core of other work beyond it
    # slows the figures down
    busy = " (machine busy: figures are indicative)" if one > cores - 0.5 else ""
    return f"load average {one:.2f} {five:.2f} {fifteen:.2f} on {cores} cores{busy}"


def describe_machine() -> list[str]:
    """Lines naming the machine, interpreter, library versions, date and current load."""
    import sympy

    try:
        import symengine

        symengine_version = symengine.__version__
    except ImportError:  # the benchmark of the backend says so itself
        symengine_version = "not installed"
    try:
        import numpy

        numpy_version = numpy.__version__
    except ImportError:
        numpy_version = "not installed"
    now = datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    return [
        f"machine: {os.cpu_count()} cores (nproc), {cpu_model()}, {platform.system()} {platform.machine()}",
        f"python {platform.python_version()}, sympy {sympy.__version__}, symengine {symengine_version}, "
        f"numpy {numpy_version}; date {now}",
        load_note(),
    ]


def format_seconds(seconds: float) -> str:
    """Seconds with a unit that keeps three significant figures readable."""
    if seconds >= 1.0:
        return f"{seconds:.2f} s"
    if seconds >= 1e-3:
        return f"{seconds * 1e3:.2f} ms"
    if seconds >= 1e-6:
        return f"{seconds * 1e6:.2f} us"
    return f"{seconds * 1e9:.1f} ns"


def format_bytes(count: int) -> str:
    """A byte count in MiB."""
    return f"{count / 2**20:.0f} MiB"


def best_of(function: Callable[[], object], repeats: int,
            prepare: Callable[[], object] | None = None) -> tuple[float, float, object]:
    """Smallest wall time and smallest CPU time (this process) of ``repeats`` calls, the least
    disturbed by other load, and the last result. ``prepare`` runs untimed before each call
    (e.g. clearing caches for a cold run)."""
    best_wall = best_cpu = math.inf
    result = None
    for _ in range(max(1, repeats)):
        if prepare is not None:
            prepare()
        wall, cpu = time.perf_counter(), time.process_time()
        result = function()
        best_cpu = min(best_cpu, time.process_time() - cpu)
        best_wall = min(best_wall, time.perf_counter() - wall)
    return best_wall, best_cpu, result


def growth_exponent(sizes: Sequence[float], seconds: Sequence[float]) -> float | None:
    """Least-squares slope of log(seconds) against log(size): time ~ size^slope.

    None with fewer than two points.
    """
    if len(sizes) < 2 or len(sizes) != len(seconds):
        return None
    xs = [math.log(s) for s in sizes]
    ys = [math.log(t) for t in seconds]
    x_mean = sum(xs) / len(xs)
    y_mean = sum(ys) / len(ys)
    numerator = sum((x - x_mean) * (y - y_mean) for x, y in zip(xs, ys))
    denominator = sum((x - x_mean) ** 2 for x in xs)
    return numerator / denominator if denominator else None


def child_environment(**overrides: str | None) -> dict[str, str]:
    """The current environment with the repository on PYTHONPATH (so a child imports this
    checkout even without an install) and the given variables set (None removes one)."""
    environment = dict(os.environ)
    path = environment.get("PYTHONPATH")
    environment["PYTHONPATH"] = str(REPOSITORY) + (os.pathsep + path if path else "")
    for key, value in overrides.items():
        if value is None:
            environment.pop(key, None)
        else:
            environment[key] = value
    return environment


@dataclass(frozen=True)
class ChildRun:
    """One child process: its wall time, its CPU time (user + system), its own peak resident
    memory (``ru_maxrss`` from ``wait4``), exit code, output, and whether it was stopped on
    timeout. On a loaded machine the CPU time is the better estimate of the idle wall time."""

    seconds: float
    cpu_seconds: float
    peak_bytes: int
    returncode: int | None
    stdout: str
    stderr: str
    timed_out: bool


# Runs in a small, freshly started interpreter that starts the measured command and reaps it.
# Why the detour: on Linux a process inherits its parent's peak-RSS high-water mark through
# fork and exec, so a child forked straight from a benchmark that has imported sympy would
# report the benchmark's peak, not its own. A child forked from this small launcher inherits
# only the launcher's few MiB, which any Python child exceeds at once.
_LAUNCHER = r"""
import json, os, signal, subprocess, sys, time
spec = json.loads(sys.argv[1])
with open(spec["stdout"], "wb") as out, open(spec["stderr"], "wb") as err:
    start = time.perf_counter()
    process = subprocess.Popen(spec["command"], stdout=out, stderr=err, cwd=spec["cwd"])
    timed_out = False
    while True:
        pid, status, usage = os.wait4(process.pid, os.WNOHANG)
        if pid == process.pid:
            break
        if time.perf_counter() - start > spec["timeout"]:
            timed_out = True
            os.kill(process.pid, signal.SIGKILL)
            _, status, usage = os.wait4(process.pid, 0)
            break
        time.sleep(0.001)
    seconds = time.perf_counter() - start
    process.returncode = os.waitstatus_to_exitcode(status)
print(json.dumps({"seconds": seconds, "cpu": usage.ru_utime + usage.ru_stime, "maxrss": usage.ru_maxrss, "returncode": process.returncode,
                  "timed_out": timed_out}))
"""


def run_child(command: Sequence[str], *, timeout: float, env: dict[str, str] | None = None,
              cwd: str | os.PathLike[str] | None = None) -> ChildRun:
    """Run ``command`` in a fresh process and measure it.

    A small launcher interpreter starts the command, times it and reaps it with ``os.wait4``,
    which returns the resource usage of that child alone; on timeout the launcher kills the
    child (by its process id) and the run is marked ``timed_out``. The launcher's own start-up
    is not in ``seconds``.
    """
    with tempfile.TemporaryDirectory(prefix="stfalgebra-bench-") as scratch:
        stdout_path = os.path.join(scratch, "stdout")
        stderr_path = os.path.join(scratch, "stderr")
        spec = {"command": list(command), "timeout": timeout, "stdout": stdout_path, "stderr": stderr_path,
                "cwd": None if cwd is None else str(cwd)}
        launcher = subprocess.run([sys.executable, "-c", _LAUNCHER, json.dumps(spec)], env=env,
                                  capture_output=True, text=True, timeout=timeout + 60)
        if launcher.returncode != 0:
            raise RuntimeError(f"benchmark launcher failed: {launcher.stderr.strip()[-2000:]}")
        report = json.loads(launcher.stdout)
        with open(stdout_path, encoding="utf-8", errors="replace") as handle:
            stdout = handle.read()
        with open(stderr_path, encoding="utf-8", errors="replace") as handle:
            stderr = handle.read()
    # ru_maxrss is in KiB on Linux, in bytes on macOS
    scale = 1 if sys.platform == "darwin" else 1024
    return ChildRun(report["seconds"], report["cpu"], int(report["maxrss"]) * scale,
                    None if report["timed_out"] else report["returncode"], stdout, stderr, report["timed_out"])
