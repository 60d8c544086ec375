"""A progress display on the terminal for the long stages of a run, quiet when the output is not
a terminal (a pipe, a file, a test), and the time each stage took when asked for
(`framesweep run --stage-times`)."""

from __future__ import annotations

import sys
import time
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from dataclasses import dataclass

__all__ = ["QUIET", "StageTime", "Stages", "Tick", "peak_memory_gib"]

Tick = Callable[[int], None]


@dataclass(frozen=True)
class StageTime:
    """How long one stage took; `depth` counts the stages it runs inside; `peak_gib` is the
    process's peak resident memory when it ended (GiB)."""

    name: str
    start: float
    seconds: float
    depth: int
    peak_gib: float


def peak_memory_gib() -> float:
    """The peak resident set of this process so far, in GiB (0 where the system cannot say)."""
    try:
        import resource
    except ImportError:  # not on every system
        return 0.0
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    return peak / 1024 ** 3 if sys.platform == "darwin" else peak / 1024 ** 2


class Stages:
    """`with stages.stage("checks", total=n) as tick: ... tick(1)`; prints nothing unless
    standard error is a terminal (or `enabled` says otherwise). With `timed`, each stage and
    each `step` (a part of a stage, timed but never displayed) is kept in `times`."""

    def __init__(self, enabled: bool | None = None, *, timed: bool = False,
                 on_time: Callable[[StageTime], None] | None = None) -> None:
        from rich.console import Console

        self.console = Console(stderr=True)
        self.enabled = self.console.is_terminal if enabled is None else enabled
        self.timed = timed
        self.on_time = on_time   # told as each stage ends (a run stopped midway still says)
        self.times: list[StageTime] = []
        self._open = 0

    @contextmanager
    def _timer(self, name: str) -> Iterator[None]:
        start, depth = time.perf_counter(), self._open
        self._open += 1
        try:
            yield
        finally:
            self._open -= 1
            if self.timed:
                done = StageTime(name, start, time.perf_counter() - start, depth,
                                 peak_memory_gib())
                self.times.append(done)
                if self.on_time is not None:
                    self.on_time(done)

    @contextmanager
    def step(self, name: str) -> Iterator[None]:
        """Timed when asked for, never displayed: a part of a displayed stage, or a span that
        holds displayed stages."""
        with self._timer(name):
            yield

    def clock(self) -> Callable[[str], None]:
        """`lap = stages.clock(); ...; lap("design members"); ...; lap("checks")`: each call
        times the code since the previous one (or since the clock was made), as a step."""
        start, depth = time.perf_counter(), self._open

        def lap(name: str) -> None:
            nonlocal start
            now = time.perf_counter()
            if self.timed:
                done = StageTime(name, start, now - start, depth, peak_memory_gib())
                self.times.append(done)
                if self.on_time is not None:
                    self.on_time(done)
            start = now

        return lap

    def timings(self) -> list[StageTime]:
        """The stages and steps timed so far, in the order they started."""
        return sorted(self.times, key=lambda t: t.start)

    @contextmanager
    def stage(self, name: str, total: int | None = None) -> Iterator[Tick]:
        with self._timer(name), self._shown(name, total) as tick:
            yield tick

    @contextmanager
    def _shown(self, name: str, total: int | None) -> Iterator[Tick]:
        if not self.enabled:
            yield _no_tick
            return
        from rich.progress import (
            BarColumn,
            MofNCompleteColumn,
            Progress,
            SpinnerColumn,
            TextColumn,
            TimeElapsedColumn,
        )

        columns = [SpinnerColumn(), TextColumn("{task.description}")]
        if total:
            columns += [BarColumn(), MofNCompleteColumn()]
        columns.append(TimeElapsedColumn())
        with Progress(*columns, console=self.console, transient=False) as bar:
            task = bar.add_task(name, total=total)

            def tick(n: int = 1) -> None:
                bar.advance(task, n)

            yield tick
            bar.update(task, completed=total if total else 1, total=total or 1)


def _no_tick(n: int = 1) -> None:
    """What a stage advances by when progress is not shown."""


QUIET = Stages(enabled=False)
