"""Parsed TOML back to text: what a sweep point's case.toml holds (`dumps_toml`).

Only what case files use: tables, arrays of tables, numbers, strings, booleans and arrays.
"""

from __future__ import annotations

import json
import math
import re
from typing import Any

__all__ = ["dumps_toml"]

_BARE = re.compile(r"[A-Za-z0-9_-]+")


def _key(k: str) -> str:
    return k if _BARE.fullmatch(k) else json.dumps(k, ensure_ascii=False)


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):   # JSON escapes are TOML's; DEL is the one control left raw
        return json.dumps(v, ensure_ascii=False).replace("\x7f", "\\u007f")
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{_key(k)} = {_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(f"cannot write {type(v).__name__} to TOML")


def _is_table_array(v: Any) -> bool:
    return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)


def _table(lines: list[str], data: dict[str, Any], path: list[str]) -> None:
    for k, v in data.items():
        if not isinstance(v, dict) and not _is_table_array(v):
            lines.append(f"{_key(k)} = {_value(v)}")
    for k, v in data.items():
        name = ".".join(_key(p) for p in [*path, k])
        if isinstance(v, dict):
            lines += ["", f"[{name}]"]
            _table(lines, v, [*path, k])
        elif _is_table_array(v):
            for item in v:
                lines += ["", f"[[{name}]]"]
                _table(lines, item, [*path, k])


def dumps_toml(data: dict[str, Any]) -> str:
    """TOML text for a dict as `tomllib` returns it (tables, arrays of tables, scalars);
    ``tomllib.loads(dumps_toml(d)) == d``."""
    lines: list[str] = []
    _table(lines, data, [])
    return "\n".join(lines).lstrip("\n") + "\n"
