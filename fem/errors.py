"""Error types that the CLI turns into exit codes.

`CaseError` is bad input (exit 2, one line, no traceback); `SolveError` is a model that
cannot be solved as stated (also the user's to fix, exit 2); anything else is internal
(exit 1, traceback to a log file).
"""

from __future__ import annotations

__all__ = ["CaseError", "SolveError"]


class CaseError(ValueError):
    """Bad input in a case file: names the file, the key path and what is allowed."""

    def __init__(self, file: str, key: str, message: str, line: int | None = None) -> None:
        self.file = file
        self.key = key
        self.message = message
        self.line = line
        where = f"{file}:{line}" if line else file
        super().__init__(f"{where}: {key}: {message}" if key else f"{where}: {message}")


class SolveError(RuntimeError):
    """The model as stated cannot be meshed or solved; the message says what to change."""
