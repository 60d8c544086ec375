"""The engine: check families over member rows, chunk by chunk, on a thread per core.

Rows (member, combination) are independent, so they are cut into chunks that fit the processor
caches and run on a thread per core (numpy releases the interpreter lock inside its array
operations). A distributed engine would plug in here: it receives MemberRows and the families and
returns the same (rows, blocks) in row order.
"""

from __future__ import annotations

import ctypes
import ctypes.util
import itertools
import os
import threading
import time
from collections import deque
from collections.abc import Callable, Iterator
from concurrent.futures import Future, ThreadPoolExecutor
from typing import Any, TypeVar, overload

import pandas as pd

from .checks.member_info import with_member_info
from .model.rows import CheckBlock, MemberRows, block_concat, rows_concat, rows_slice

__all__ = ["CHUNK_ROWS", "CheckFamily", "iter_checks", "release_free_memory", "run_checks"]

CheckFamily = Callable[[MemberRows], list[CheckBlock]]
CHUNK_ROWS = 20_000  # rows per chunk: (rows x stations) arrays of a few MB stay in cache
Digest = TypeVar("Digest")  # what a caller's `keep` makes of a chunk's blocks


@overload
def iter_checks(rows: MemberRows, families: list[CheckFamily], *,
                overrides: pd.DataFrame | None = None, chunk_rows: int | None = None,
                threads: int | None = None, timings: dict[str, float] | None = None,
                keep: None = None) -> Iterator[tuple[MemberRows, list[CheckBlock]]]: ...


@overload
def iter_checks(rows: MemberRows, families: list[CheckFamily], *,
                overrides: pd.DataFrame | None = None, chunk_rows: int | None = None,
                threads: int | None = None, timings: dict[str, float] | None = None,
                keep: Callable[[MemberRows, list[CheckBlock]], Digest]
                ) -> Iterator[tuple[MemberRows, Digest]]: ...


def iter_checks(rows: MemberRows, families: list[CheckFamily], *,
                overrides: pd.DataFrame | None = None, chunk_rows: int | None = None,
                threads: int | None = None, timings: dict[str, float] | None = None,
                keep: Callable[[MemberRows, list[CheckBlock]], Any] | None = None
                ) -> Iterator[tuple[MemberRows, Any]]:
    """Section classes, member buckling values and every check family, chunk by chunk.

    Rows are independent, so they are cut into chunks that fit the processor caches and run on
    a thread per core (numpy releases the interpreter lock inside its array operations). Yields
    (rows of the chunk with their member information, one block per check) in row order; only a
    few chunks are in flight at a time, so a caller that keeps less than the whole blocks never
    holds a full-size set of intermediate values.

    timings: if given, the seconds spent in each stage are added to it, summed over the worker
        threads: 'classification and buckling values' (section class per station, member
        overrides, member buckling values), one entry per family (the family's __name__) and
        'keep' (the time of `keep`).
    keep: if given, applied to (rows, blocks) of each chunk on the worker thread, and the chunk
        yields (rows, keep(rows, blocks)) instead: the blocks are dropped there, so a caller
        that keeps a digest never holds a chunk's full blocks on its own thread.
    """
    n = rows.n_rows
    chunk_rows = chunk_rows or CHUNK_ROWS  # read at the call: a test may set a small one
    bounds = [(a, min(a + chunk_rows, n)) for a in range(0, n, chunk_rows)] or [(0, 0)]
    lock = threading.Lock()

    def add(stage: str, seconds: float) -> None:
        if timings is not None:
            with lock:
                timings[stage] = timings.get(stage, 0.0) + seconds

    def one(bound: tuple[int, int]) -> tuple[MemberRows, Any]:
        t0 = time.perf_counter()
        part = with_member_info(rows_slice(rows, *bound), overrides)
        add("classification and buckling values", time.perf_counter() - t0)
        blocks = []
        for family in families:
            t0 = time.perf_counter()
            blocks.extend(family(part))
            add(getattr(family, "__name__", str(family)), time.perf_counter() - t0)
        if keep is None:
            return part, blocks
        t0 = time.perf_counter()
        kept = keep(part, blocks)
        add("keep", time.perf_counter() - t0)
        return part, kept

    workers = min(threads or os.cpu_count() or 1, len(bounds))
    if workers <= 1:
        for bound in bounds:
            yield one(bound)
        return
    with ThreadPoolExecutor(workers) as pool:
        pending: deque[Future] = deque()
        ahead = iter(bounds)
        for bound in itertools.islice(ahead, 2 * workers):
            pending.append(pool.submit(one, bound))
        while pending:
            result = pending.popleft().result()
            for bound in itertools.islice(ahead, 1):
                pending.append(pool.submit(one, bound))
            yield result


def run_checks(rows: MemberRows, families: list[CheckFamily], *,
               overrides: pd.DataFrame | None = None, chunk_rows: int | None = None,
               threads: int | None = None) -> tuple[MemberRows, list[CheckBlock]]:
    """Section classes, member buckling values and every check family for all rows.

    The chunks of `iter_checks` joined in row order. Returns the rows with their member
    information and one block per check.
    """
    parts = list(iter_checks(rows, families, overrides=overrides, chunk_rows=chunk_rows,
                             threads=threads))
    if len(parts) == 1:
        return parts[0]
    joined_rows = rows_concat([p for p, _ in parts])
    blocks = [block_concat([p[1][k] for p in parts]) for k in range(len(parts[0][1]))]
    del parts
    release_free_memory()
    return joined_rows, blocks


def release_free_memory() -> None:
    """Hand memory that the run has freed back to the operating system (the C library's
    malloc_trim). The worker threads' chunk arrays are freed into heaps that the C library
    keeps (one per thread): on the large job of docs/speed.md about 0.4 GiB after the checks,
    which the long table, a few large arrays allocated afterwards, could not reuse. A no-op
    where there is no malloc_trim."""
    try:
        trim = ctypes.CDLL(ctypes.util.find_library("c") or "libc.so.6").malloc_trim
    except (OSError, AttributeError):
        return
    trim(0)
