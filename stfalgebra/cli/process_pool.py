"""Process pools for the mode sets of the command line (``--jobs N``).

:func:`~stfalgebra.radiative.modes.derive_modes` accepts any executor with the interface of
:class:`concurrent.futures.Executor` (``map``); the command line gives it a
:class:`~concurrent.futures.ProcessPoolExecutor` of ``N`` processes, or none for ``N = 1``. A
cluster scheduler's executor with the same interface plugs into the Python API unchanged.

Ctrl-C: the worker processes ignore SIGINT, so that only the command reports it (exit 130, no
partial output); the pool's processes are then stopped at once.
"""

from __future__ import annotations

import contextlib
import signal
from collections.abc import Iterator
from concurrent.futures import Executor, ProcessPoolExecutor

__all__ = ["mode_executor"]


def _ignore_interrupts() -> None:
    signal.signal(signal.SIGINT, signal.SIG_IGN)


@contextlib.contextmanager
def mode_executor(jobs: int) -> Iterator[Executor | None]:
    """An executor of ``jobs`` worker processes (None for one job: derive in this process).

    Example
    -------
    >>> with mode_executor(1) as pool:
    ...     pool is None
    True
    """
    if jobs <= 1:
        yield None
        return
    pool = ProcessPoolExecutor(max_workers=jobs, initializer=_ignore_interrupts)
    try:
        yield pool
    except BaseException:
        for process in list(getattr(pool, "_processes", {}).values()):
            process.terminate()
        pool.shutdown(wait=False, cancel_futures=True)
        raise
    pool.shutdown(wait=True)
