"""Independent pieces of work on a process per core.

Used where the work is a Python loop that holds the interpreter lock, so threads do not help:
the eigen solves of the frame's load combinations (ARPACK's reverse-communication loop runs in
Python). The processes are forked, so they start with the caller's data (the factorised
stiffness among it) without copying or pickling it; only each item and its result travel.
"""

from __future__ import annotations

import multiprocessing
import os
import warnings
from collections.abc import Callable, Iterable
from concurrent.futures import ProcessPoolExecutor
from typing import Any

from threadpoolctl import threadpool_limits

__all__ = ["PROCESS_ITEMS_MIN", "core_count", "process_map"]

PROCESS_ITEMS_MIN = 4   # fewer items than this run in the caller's process (a fork costs more)

_task: Callable[[Any], Any] | None = None


def core_count() -> int:
    """Cores this process may run on."""
    try:
        return len(os.sched_getaffinity(0))
    except AttributeError:          # not on every platform
        return os.cpu_count() or 1


def _one(item: Any) -> Any:
    if _task is None:
        raise RuntimeError("process_map: no task in this worker")
    return _task(item)


def _start_worker() -> None:
    # one BLAS thread per process: the processes already use every core
    threadpool_limits(limits=1, user_api="blas")


def process_map(task: Callable[[Any], Any], items: Iterable[Any], *,
                workers: int | None = None) -> list[Any]:
    """[task(item) for item in items], in order, on up to `workers` forked processes (default:
    a process per core). In the caller's process where there is one core, fewer than
    PROCESS_ITEMS_MIN items, or no fork (the platform has none)."""
    global _task
    todo = list(items)
    count = min(workers or core_count(), len(todo))
    if (count < 2 or len(todo) < PROCESS_ITEMS_MIN
            or "fork" not in multiprocessing.get_all_start_methods()):
        return [task(item) for item in todo]
    _task = task
    try:
        with warnings.catch_warnings():
            # Python warns that a fork beside other threads (a progress display) may deadlock;
            # the workers only run `task` on their own copy of the data and touch no lock of
            # those threads
            warnings.simplefilter("ignore", DeprecationWarning)
            with ProcessPoolExecutor(count, mp_context=multiprocessing.get_context("fork"),
                                     initializer=_start_worker) as pool:
                return list(pool.map(_one, todo))
    finally:
        _task = None
