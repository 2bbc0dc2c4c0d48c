"""Typed, path-aware access to a parsed TOML table.

Every key read goes through `Table.take`, which checks type and range and raises a
`CaseError` naming the file and the dotted key path. `Table.close` refuses any key that was
not read, so a typo never passes silently; a missing key names any unread key that looks
like a misspelling of it. `key_lines` maps key paths to the line they are written on, so
that messages can point at the line.
"""

from __future__ import annotations

import difflib
import math
import re
from collections.abc import Callable, Sequence
from typing import Any

from fem.errors import CaseError

__all__ = ["Table", "REQUIRED", "MAX_MAGNITUDE", "as_point", "key_lines", "line_of"]

REQUIRED = object()
MAX_MAGNITUDE = 1e15  # no number of a case is larger (any unit): keeps products finite


def _is_number(v: Any) -> bool:
    return isinstance(v, int | float) and not isinstance(v, bool)


class Table:
    """A TOML table being read, with its file name and key path for messages."""

    def __init__(self, data: Any, file: str, path: str = "") -> None:
        if not isinstance(data, dict):
            raise CaseError(file, path or "(top level)", f"must be a table, got {_kind(data)}")
        self.data = data
        self.file = file
        self.path = path
        self.used: set[str] = set()

    def key(self, name: str) -> str:
        return f"{self.path}.{name}" if self.path else name

    def error(self, name: str, message: str) -> CaseError:
        return CaseError(self.file, self.key(name), message)

    def has(self, name: str) -> bool:
        return name in self.data

    def raw(self, name: str, default: Any = REQUIRED) -> Any:
        self.used.add(name)
        if name not in self.data:
            if default is REQUIRED:
                raise self.error(name, "is required but missing" + self._unread_hint(name))
            return default
        return self.data[name]

    def number(self, name: str, default: Any = REQUIRED, *, low: float | None = None,
               high: float | None = None, low_open: bool = False, high_open: bool = False,
               integer: bool = False) -> Any:
        v = self.raw(name, default)
        if v is default and name not in self.data:
            return v
        if integer:
            if not isinstance(v, int) or isinstance(v, bool):
                raise self.error(name, f"must be a whole number, got {_show(v)}")
        elif not _is_number(v):
            raise self.error(name, f"must be a number, got {_show(v)}")
        if not math.isfinite(v):
            raise self.error(name, f"must be finite, got {v}")
        if abs(v) > MAX_MAGNITUDE:
            raise self.error(name, f"{v:g} is out of scale; numbers must lie within "
                                   f"+-{MAX_MAGNITUDE:g}")
        _check_range(self, name, v, low, high, low_open, high_open)
        return float(v) if not integer else int(v)

    def text(self, name: str, default: Any = REQUIRED, *,
             allowed: Sequence[str] | None = None, pattern: Callable[[str], bool] | None = None,
             describe: str = "") -> Any:
        v = self.raw(name, default)
        if v is default and name not in self.data:
            return v
        if not isinstance(v, str):
            raise self.error(name, f"must be a string, got {_show(v)}")
        if allowed is not None and v not in allowed:
            raise self.error(name, f"{v!r} is not allowed; use one of: {', '.join(allowed)}")
        if pattern is not None and not pattern(v):
            raise self.error(name, f"{v!r} is not allowed; {describe}")
        return v

    def flag(self, name: str, default: Any = REQUIRED) -> Any:
        v = self.raw(name, default)
        if v is default and name not in self.data:
            return v
        if not isinstance(v, bool):
            raise self.error(name, f"must be true or false, got {_show(v)}")
        return v

    def point(self, name: str, default: Any = REQUIRED) -> Any:
        v = self.raw(name, default)
        if v is default and name not in self.data:
            return v
        return as_point(v, self.file, self.key(name))

    def numbers(self, name: str, default: Any = REQUIRED, *, low: float | None = None,
                high: float | None = None) -> Any:
        v = self.raw(name, default)
        if v is default and name not in self.data:
            return v
        if not isinstance(v, list) or not all(_is_number(x) and math.isfinite(x) for x in v):
            raise self.error(name, f"must be a list of numbers, got {_show(v)}")
        if any(abs(x) > MAX_MAGNITUDE for x in v):
            raise self.error(name, f"is out of scale; numbers must lie within "
                                   f"+-{MAX_MAGNITUDE:g}")
        for x in v:
            _check_range(self, name, x, low, high, False, False)
        return tuple(float(x) for x in v)

    def table(self, name: str, default: Any = REQUIRED) -> Table | None:
        v = self.raw(name, default)
        if v is default and name not in self.data:
            return v
        return Table(v, self.file, self.key(name))

    def tables(self, name: str) -> list[Table]:
        v = self.raw(name, [])
        if not isinstance(v, list):
            raise self.error(name, f"must be an array of tables ([[{self.key(name)}]]), "
                                   f"got {_kind(v)}")
        return [Table(x, self.file, f"{self.key(name)}.{i}") for i, x in enumerate(v)]

    def close(self) -> None:
        extra = sorted(set(self.data) - self.used)
        if extra:
            known = ", ".join(sorted(self.used)) or "none"
            near = difflib.get_close_matches(extra[0], sorted(self.used), n=1, cutoff=0.6)
            hint = f"did you mean {near[0]!r}? " if near else ""
            raise self.error(extra[0], f"unknown key ({hint}known here: {known})")

    def _unread_hint(self, name: str) -> str:
        unread = sorted(k for k in self.data if k not in self.used)
        if not unread:
            return ""
        near = difflib.get_close_matches(name, unread, n=1, cutoff=0.6)
        if near:
            return f" ({near[0]!r} is given here: a misspelling of {name!r}?)"
        return f" (given here but not known: {', '.join(unread)})"


def as_point(v: Any, file: str, key: str) -> tuple[float, float]:
    if (not isinstance(v, list) or len(v) != 2
            or not all(_is_number(x) and math.isfinite(x) for x in v)):
        raise CaseError(file, key, f"must be a point [x, y] of two numbers, got {_show(v)}")
    if any(abs(x) > MAX_MAGNITUDE for x in v):
        raise CaseError(file, key, f"{_show(v)} is out of scale; numbers must lie within "
                                   f"+-{MAX_MAGNITUDE:g}")
    return (float(v[0]), float(v[1]))


def _check_range(t: Table, name: str, v: float, low: float | None, high: float | None,
                 low_open: bool, high_open: bool) -> None:
    if low is not None and (v < low or (low_open and v == low)):
        rel = ">" if low_open else ">="
        raise t.error(name, f"must be {rel} {low:g}, got {v:g}")
    if high is not None and (v > high or (high_open and v == high)):
        rel = "<" if high_open else "<="
        raise t.error(name, f"must be {rel} {high:g}, got {v:g}")


def _kind(v: Any) -> str:
    return {dict: "a table", list: "an array", str: "a string", bool: "a boolean"}.get(
        type(v), type(v).__name__)


def _show(v: Any) -> str:
    s = repr(v)
    return s if len(s) <= 40 else s[:37] + "..."


_HEADER = re.compile(r"^\s*(\[\[?)\s*([A-Za-z0-9_\-\.\" ]+?)\s*\]\]?\s*(#.*)?$")
_ASSIGN = re.compile(r"^\s*([A-Za-z0-9_\-\.\" ]+?)\s*=")


def key_lines(text: str) -> dict[str, int]:
    """Map dotted key paths (arrays of tables numbered from 0) to their 1-based line.

    A light scan of table headers and `key =` lines: enough to point at the line of a
    bad value or table; anything it cannot follow is simply left out.
    """
    lines: dict[str, int] = {}
    count: dict[str, int] = {}
    current = ""
    depth = 0  # open brackets of a value running over several lines
    for n, line in enumerate(text.splitlines(), start=1):
        code = re.sub(r'"[^"]*"|\'[^\']*\'', "", line).split("#")[0]
        if depth > 0:
            depth = max(0, depth + code.count("[") - code.count("]"))
            continue
        m = _HEADER.match(line)
        if m:
            parts = [p.strip().strip('"') for p in m.group(2).split(".")]
            path = ""
            for i, part in enumerate(parts):
                path = f"{path}.{part}" if path else part
                if i < len(parts) - 1 and path in count:
                    path = f"{path}.{count[path] - 1}"  # inside the latest array element
            if m.group(1) == "[[":
                lines.setdefault(path, n)
                count[path] = count.get(path, 0) + 1
                path = f"{path}.{count[path] - 1}"
            current = path
            lines.setdefault(current, n)
            continue
        m = _ASSIGN.match(line)
        if m and not line.lstrip().startswith("#"):
            key = ".".join(p.strip().strip('"') for p in m.group(1).split("."))
            lines.setdefault(f"{current}.{key}" if current else key, n)
            value = code.split("=", 1)[1] if "=" in code else ""
            depth = max(0, value.count("[") - value.count("]"))
    return lines


def line_of(text: str, key: str) -> int | None:
    """The line of `key`, or of the nearest enclosing table written in the text."""
    lines = key_lines(text)
    parts = key.split(".")
    while parts:
        k = ".".join(parts)
        if k in lines:
            return lines[k]
        parts.pop()
    return None
