"""A progress line on stderr for long imports and exports.

The library reports progress through a callback (rows done so far); this draws it. It stays
silent unless stderr is a terminal, never draws in ``--json`` mode, and appears only once the work
has taken longer than ``DELAY_S``, so quick commands print exactly what they always printed.
"""

from __future__ import annotations

import time
from typing import Any

DELAY_S = 1.5


class RowProgress:
    """A context manager and a callable ``progress(rows_done)``."""

    def __init__(self, what: str, *, quiet: bool = False, unit: str = "rows"):
        self.what = what
        self.unit = unit
        self.quiet = quiet
        self._bar: Any = None
        self._task: Any = None
        self._start = time.monotonic()

    def __enter__(self) -> RowProgress:
        self._start = time.monotonic()
        return self

    def __call__(self, done: int) -> None:
        if self.quiet:
            return
        if self._bar is None:
            if time.monotonic() - self._start < DELAY_S:
                return
            self._open()
            if self._bar is None:
                return
        self._bar.update(self._task, completed=done)

    def _open(self) -> None:
        from rich.console import Console   # rich comes with typer; loaded only for long work
        from rich.progress import Progress, SpinnerColumn, TextColumn, TimeElapsedColumn

        err = Console(stderr=True)
        if not err.is_terminal:
            self.quiet = True
            return
        self._bar = Progress(SpinnerColumn(), TextColumn("{task.description}"),
                             TextColumn(f"{{task.completed:,}} {self.unit}"), TimeElapsedColumn(),
                             console=err, transient=True)
        self._bar.start()
        self._task = self._bar.add_task(self.what, total=None)

    def __exit__(self, *exc: object) -> None:
        if self._bar is not None:
            self._bar.stop()
            self._bar = None


__all__ = ["DELAY_S", "RowProgress"]
