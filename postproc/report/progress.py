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
            yield lambda n=1: None
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
            yield lambda n=1: bar.advance(task, n)
            bar.update(task, completed=total if total else 1, total=total or 1)


QUIET = Stages(enabled=False)
