"""A sweep's index.jsonl: one line per finished point, appended and fsynced.

A point counts as finished once its line is on disk; a line torn by a kill is cut off
when the index is next read, so a resumed sweep repeats nothing and loses nothing.
"""

from __future__ import annotations

import json
import os
from pathlib import Path
from typing import Any

__all__ = ["read_index", "append_row"]

def read_index(path: Path) -> list[dict[str, Any]]:
    """Finished points in the index, first entry per id; a torn last line is cut off."""
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
    for line in raw[:end].decode("utf-8").splitlines():
        try:
            row = json.loads(line)
        except json.JSONDecodeError:
            continue
        if isinstance(row, dict) and row.get("id") not in seen:
            seen.add(row.get("id"))
            rows.append(row)
    return rows


def append_row(path: Path, row: dict[str, Any]) -> None:
    line = json.dumps(row, allow_nan=False) + "\n"
    with open(path, "a", encoding="utf-8") as fh:
        fh.write(line)
        fh.flush()
        os.fsync(fh.fileno())
