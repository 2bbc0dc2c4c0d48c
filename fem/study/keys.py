"""`--vary` ranges and dotted keys: which key of a case's TOML a sweep varies, and to what.

``parse_vary("geometry.length=100:400:7")`` gives the key and its values (ends included);
`get_key` / `set_key` read and replace one dotted key (``loads.0.force.1``) of parsed TOML,
refusing (`CaseError`) a key the case does not have or a value of another type.
"""

from __future__ import annotations

import copy
import math
import re
from dataclasses import dataclass
from typing import Any

from fem.case.limits import MAX_SWEEP_POINTS
from fem.errors import CaseError

__all__ = ["Vary", "parse_vary", "get_key", "set_key", "is_integer_key", "INTEGER_KEYS"]

@dataclass(frozen=True)
class Vary:
    """One varied key and its values (START:STOP:N, both ends included)."""

    key: str
    values: tuple[float, ...]


def parse_vary(spec: str) -> Vary:
    """Parse ``KEY=START:STOP:N`` (N >= 1 equally spaced values, ends included)."""
    m = re.fullmatch(r"\s*([A-Za-z0-9_.-]+)\s*=\s*([^:]+):([^:]+):([^:]+)\s*", spec)
    if not m:
        raise CaseError("--vary", spec, "write KEY=START:STOP:N, e.g. geometry.length=100:400:7")
    key, a, b, n = m.groups()
    try:
        start, stop, count = float(a), float(b), int(n)
    except ValueError:
        raise CaseError("--vary", key, f"START and STOP must be numbers and N a whole number, "
                                       f"got {a}:{b}:{n}") from None
    if count < 1 or not (math.isfinite(start) and math.isfinite(stop)):
        raise CaseError("--vary", key, "needs finite START and STOP and N >= 1")
    if count > MAX_SWEEP_POINTS:
        raise CaseError("--vary", key, f"N = {count:,} is above the limit of "
                                       f"{MAX_SWEEP_POINTS:,} sweep points")
    if count == 1:
        return Vary(key, (start,))
    step = (stop - start) / (count - 1)
    return Vary(key, tuple(start + i * step if i < count - 1 else stop for i in range(count)))


INTEGER_KEYS = ("schema", "mesh.order", "mesh.levels", "mesh.max_dofs", "loads.*.hole")


def is_integer_key(key: str) -> bool:
    """Does the case format read `key` as a whole number (`INTEGER_KEYS`)?"""
    parts = key.split(".")
    for pattern in INTEGER_KEYS:
        want = pattern.split(".")
        if len(want) == len(parts) and all(w in ("*", p) for w, p in zip(want, parts,
                                                                         strict=True)):
            return True
    return False


def _walk(data: Any, key: str, file: str) -> tuple[Any, str | int]:
    parts = key.split(".")
    node = data
    for i, part in enumerate(parts):
        last = i == len(parts) - 1
        where = ".".join(parts[: i + 1])
        if isinstance(node, list):
            if not part.isdigit() or int(part) >= len(node):
                raise CaseError(file, where, f"no entry {part}; the array has {len(node)} "
                                             "(numbered from 0)")
            idx: str | int = int(part)
        elif isinstance(node, dict):
            if part not in node:
                known = ", ".join(str(k) for k in node) or "none"
                raise CaseError(file, where, f"is not in the case file (known here: {known}); "
                                             "a sweep varies keys the file already has")
            idx = part
        else:
            raise CaseError(file, where, "is inside a plain value, not a table or array")
        if last:
            return node, idx
        node = node[idx]
    raise CaseError(file, key, "empty key")


def get_key(data: dict[str, Any], key: str, file: str = "<case>") -> Any:
    """The value at a dotted key (array entries by number: ``geometry.cutouts.0.fillet``)."""
    node, idx = _walk(data, key, file)
    return node[idx]


def set_key(data: dict[str, Any], key: str, value: float, file: str = "<case>") -> dict:
    """A deep copy of `data` with the number at the dotted `key` replaced by `value`.

    The key must exist and hold a number. A key the case format reads as a whole number
    (`INTEGER_KEYS`, e.g. ``mesh.levels``) takes only whole values; any other key written
    as a TOML integer (``length = 300``) is a length or a force and takes fractions too.
    """
    out = copy.deepcopy(data)
    node, idx = _walk(out, key, file)
    old = node[idx]
    if isinstance(old, bool) or not isinstance(old, int | float):
        raise CaseError(file, key, f"holds {old!r}; only numbers can be varied")
    if isinstance(old, int) and is_integer_key(key):
        if float(value) != round(value):
            raise CaseError(file, key, f"takes whole numbers, got {value:g}")
        value = int(round(value))
    elif isinstance(old, int) and float(value) == round(value) and abs(value) < 2**53:
        value = int(round(value))      # stays as written where it can
    else:
        value = float(value)
    node[idx] = value
    return out


# --------------------------------------------------------------------------- TOML out
