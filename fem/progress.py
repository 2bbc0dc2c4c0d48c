"""Progress of a long check: a small protocol, a console bar (tqdm) and adapters.

A run announces its units of work (the mesh levels of a convergence study) through three
calls: ``start(total)`` once, ``step(message, work)`` as each unit begins, ``close()`` at
the end, also after a failure. ``work`` is the unit's expected cost in any consistent
measure (the beam run passes the estimated dofs of the level), so that the bar's fraction
and time estimate follow the cost rather than the count: each level costs about four times
the one before.

`console_progress` gives a bar on stderr, or ``None`` when ``--quiet`` is set or stderr is
not a terminal (a log file or a pipe gets no control characters). `as_progress` turns
``None`` or a plain ``callable(message)`` into a `Progress`, so older callers keep working.
"""

from __future__ import annotations

import sys
from collections.abc import Callable
from typing import IO, Protocol, runtime_checkable

from tqdm import tqdm

__all__ = ["Progress", "BarProgress", "CallbackProgress", "NullProgress", "as_progress",
           "console_progress"]


@runtime_checkable
class Progress(Protocol):
    """What a run calls to report progress."""

    def start(self, total: float) -> None:
        """The run begins; `total` is the summed work of all its units."""

    def step(self, message: str, work: float = 1.0) -> None:
        """The next unit begins; it is expected to cost `work`."""

    def close(self) -> None:
        """The run ended (finished or failed)."""


class NullProgress:
    """Reports nothing."""

    def start(self, total: float) -> None:
        pass

    def step(self, message: str, work: float = 1.0) -> None:
        pass

    def close(self) -> None:
        pass


class CallbackProgress:
    """Calls `fn(message)` at every step: the plain callable hook."""

    def __init__(self, fn: Callable[[str], object]) -> None:
        self.fn = fn

    def start(self, total: float) -> None:
        pass

    def step(self, message: str, work: float = 1.0) -> None:
        self.fn(message)

    def close(self) -> None:
        pass


class BarProgress:
    """A tqdm bar on `stream`: fraction and time estimate by work, the message beside it.

    The bar counts a unit as done when the next one begins; it is removed on `close`, so
    the console keeps only the run's summary. Calling the object is `step` with unit work,
    for code that expects a plain ``callable(message)``.
    """

    def __init__(self, stream: IO[str] | None = None, desc: str = "shearcheck") -> None:
        self.stream = stream if stream is not None else sys.stderr
        self.desc = desc
        self.bar: tqdm | None = None
        self._pending = 0.0

    def start(self, total: float) -> None:
        self.close()
        self.bar = tqdm(total=total, file=self.stream, desc=self.desc, leave=False,
                        dynamic_ncols=True, mininterval=0.0,
                        bar_format="{desc} {percentage:3.0f}%|{bar}| [{elapsed}<{remaining}]")

    def step(self, message: str, work: float = 1.0) -> None:
        if self.bar is None:
            self.start(total=0.0)
        assert self.bar is not None
        if self._pending:
            self.bar.update(self._pending)
        if self.bar.total is not None and self.bar.n + work > self.bar.total:
            self.bar.total = self.bar.n + work  # more work than announced: grow the bar
        self._pending = work
        self.bar.set_description_str(f"{self.desc}: {message}", refresh=True)

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()
        self.bar = None
        self._pending = 0.0

    def __call__(self, message: str) -> None:
        self.step(message)


def as_progress(progress: Progress | Callable[[str], object] | None) -> Progress:
    """A `Progress` from a `Progress`, a plain ``callable(message)`` or ``None``."""
    if progress is None:
        return NullProgress()
    if isinstance(progress, Progress):
        return progress
    if callable(progress):
        return CallbackProgress(progress)
    raise TypeError(f"progress must be a Progress, a callable or None, got {progress!r}")


def console_progress(quiet: bool, stream: IO[str] | None = None) -> BarProgress | None:
    """A bar on `stream` (default stderr) when it is a terminal and not `quiet`; else None."""
    stream = stream if stream is not None else sys.stderr
    if quiet or not getattr(stream, "isatty", lambda: False)():
        return None
    return BarProgress(stream)
