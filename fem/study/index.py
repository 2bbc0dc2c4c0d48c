"""A sweep's index.jsonl: one line per finished point, appended and fsynced.

A point counts as finished once its line is on disk; a line torn by a kill is cut off
when the index is next read, so a resumed sweep repeats nothing and loses nothing. A
damaged line (not JSON, not UTF-8, no id or status) is dropped with a warning, and
`compact_index` rewrites the index (atomically) without it, so its point runs again. The
index is never written through a symbolic link planted in the sweep folder.
"""

from __future__ import annotations

import json
import os
from pathlib import Path
from typing import Any

from fem.errors import CaseError
from fem.results import atomic_write

__all__ = ["read_index", "append_row", "valid_row", "compact_index", "refuse_link"]

STATUSES = ("ok", "failed")


def refuse_link(path: Path) -> None:
    """Refuse to read or write `path` if it is a symbolic link (planted in the folder)."""
    if Path(path).is_symlink():
        raise CaseError(str(path), "", "is a symbolic link; shearcheck writes its own files "
                                       "only, never through a link: remove it")


def valid_row(row: Any) -> bool:
    """An index line as `point_row` writes it: an id, a known status, its parameters."""
    return (isinstance(row, dict) and isinstance(row.get("id"), str)
            and row.get("status") in STATUSES and isinstance(row.get("params"), dict))


def read_index(path: Path, damaged: list[str] | None = None) -> list[dict[str, Any]]:
    """Finished points in the index, first entry per id; a torn last line is cut off.

    Lines that are not a valid row are skipped; their line numbers are appended to
    `damaged` when given.
    """
    path = Path(path)
    refuse_link(path)
    if not path.exists():
        return []
    raw = path.read_bytes()
    end = raw.rfind(b"\n") + 1
    if end < len(raw):                      # killed while writing: drop the partial line
        with open(path, "r+b") as fh:
            fh.truncate(end)
            fh.flush()
            os.fsync(fh.fileno())
    rows, seen = [], set()
    for n, line in enumerate(raw[:end].split(b"\n")[:-1], start=1):
        try:
            row = json.loads(line.decode("utf-8"))
        except (UnicodeDecodeError, json.JSONDecodeError):
            row = None
        if not valid_row(row):
            if damaged is not None and line.strip():
                damaged.append(f"line {n}")
            continue
        if row["id"] not in seen:
            seen.add(row["id"])
            rows.append(row)
    return rows


def compact_index(path: Path, rows: list[dict[str, Any]]) -> None:
    """Rewrite the index with `rows` only (temporary file, fsync, rename)."""
    refuse_link(path)
    text = "".join(json.dumps(r, allow_nan=False) + "\n" for r in rows)
    atomic_write(Path(path), text.encode("utf-8"))


def append_row(path: Path, row: dict[str, Any]) -> None:
    line = (json.dumps(row, allow_nan=False) + "\n").encode("utf-8")
    flags = os.O_WRONLY | os.O_APPEND | os.O_CREAT | getattr(os, "O_NOFOLLOW", 0)
    refuse_link(path)
    fd = os.open(path, flags, 0o666)   # O_NOFOLLOW: a link planted since is refused too
    with os.fdopen(fd, "wb") as fh:
        fh.write(line)
        fh.flush()
        os.fsync(fh.fileno())
