"""A progress display on the terminal for the long stages of a run, quiet when the output is not
a terminal (a pipe, a file, a test)."""

from __future__ import annotations

from collections.abc import Callable, Iterator
from contextlib import contextmanager

__all__ = ["QUIET", "Stages", "Tick"]

Tick = Callable[[int], None]


class Stages:
    """`with stages.stage("checks", total=n) as tick: ... tick(1)`; prints nothing unless
    standard error is a terminal (or `enabled` says otherwise)."""

    def __init__(self, enabled: bool | None = None) -> None:
        from rich.console import Console

        self.console = Console(stderr=True)
        self.enabled = self.console.is_terminal if enabled is None else enabled

    @contextmanager
    def stage(self, name: str, total: int | None = None) -> Iterator[Tick]:
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
