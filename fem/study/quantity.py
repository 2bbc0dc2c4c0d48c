"""A path into results.json: how a verification benchmark names the number it checks.

Syntax (one path, no spaces except inside quotes)::

    path  := step ("." step)*
    step  := key index*
    key   := name | '"' any text but '"' '"'       names: letters, digits, _ and -
    index := "[" integer "]"                        list item by position (from 0; -1 last)
           | "[" name "=" number "]"                the list item whose `name` equals number

Examples: ``section.tau_max_fe``, ``section.I.xx``, ``section.shear_centre[0]``,
``cuts[x=250].sigma_x_max_fe``, ``convergence.quantities."peak principal".values[-1]``.
A match ``[x=250]`` compares numbers to a relative 1e-9 (so 250 finds 250.0). Every miss is
a `QuantityError` that says which step failed and what was there instead.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from typing import Any

__all__ = ["QuantityError", "Step", "parse_path", "resolve", "resolve_values"]

_NAME = r"[A-Za-z0-9_-]+"
_KEY = re.compile(rf'({_NAME})|"([^"]*)"')
_INDEX = re.compile(rf"\[\s*(-?\d+)\s*\]|\[\s*({_NAME})\s*=\s*([-+0-9.eE]+)\s*\]")


class QuantityError(ValueError):
    """A path that does not parse, or does not lead to a number in the data."""


@dataclass(frozen=True)
class Step:
    key: str
    indices: tuple[int | tuple[str, float], ...] = ()


def parse_path(path: str) -> list[Step]:
    """The steps of a path (module docstring); `QuantityError` on bad syntax."""
    if not isinstance(path, str) or not path.strip():
        raise QuantityError("the quantity path is empty")
    steps: list[Step] = []
    pos, text = 0, path.strip()
    while True:
        m = _KEY.match(text, pos)
        if not m:
            raise QuantityError(f"bad quantity path {path!r}: expected a key at character "
                                f"{pos + 1}")
        key = m.group(1) if m.group(1) is not None else m.group(2)
        pos = m.end()
        idx: list[int | tuple[str, float]] = []
        while pos < len(text) and text[pos] == "[":
            n = _INDEX.match(text, pos)
            if not n:
                raise QuantityError(f"bad quantity path {path!r}: an index is [N] or "
                                    f"[name=number], at character {pos + 1}")
            if n.group(1) is not None:
                idx.append(int(n.group(1)))
            else:
                try:
                    idx.append((n.group(2), float(n.group(3))))
                except ValueError:
                    raise QuantityError(f"bad quantity path {path!r}: {n.group(3)!r} is not "
                                        "a number") from None
            pos = n.end()
        steps.append(Step(key, tuple(idx)))
        if pos == len(text):
            return steps
        if text[pos] != ".":
            raise QuantityError(f"bad quantity path {path!r}: expected '.' or '[' at "
                                f"character {pos + 1}")
        pos += 1


def _same(a: Any, b: float) -> bool:
    return (isinstance(a, int | float) and not isinstance(a, bool)
            and math.isclose(float(a), b, rel_tol=1e-9, abs_tol=1e-12))


def _index(obj: Any, ix: int | tuple[str, float], where: str) -> Any:
    if not isinstance(obj, list):
        raise QuantityError(f"{where} is not a list, so it cannot be indexed")
    if isinstance(ix, int):
        if not -len(obj) <= ix < len(obj):
            raise QuantityError(f"{where} has {len(obj)} items; index {ix} is out of range")
        return obj[ix]
    name, value = ix
    hits = [o for o in obj if isinstance(o, dict) and _same(o.get(name), value)]
    if len(hits) != 1:
        have = [o.get(name) for o in obj if isinstance(o, dict)]
        raise QuantityError(f"{where} has {'no' if not hits else len(hits)} item(s) with "
                            f"{name} = {value:g}; it has {name} = {have}")
    return hits[0]


def _walk(data: Any, path: str) -> tuple[Any, str]:
    obj, where = data, ""
    for step in parse_path(path):
        here = where or "the results"
        if not isinstance(obj, dict):
            raise QuantityError(f"{here} is not a table, so it has no key {step.key!r}")
        if step.key not in obj:
            keys = ", ".join(sorted(map(str, obj))) or "none"
            raise QuantityError(f"{here} has no key {step.key!r} (it has: {keys})")
        obj, where = obj[step.key], f"{where}.{step.key}" if where else step.key
        for ix in step.indices:
            obj = _index(obj, ix, where)
            where += f"[{ix}]" if isinstance(ix, int) else f"[{ix[0]}={ix[1]:g}]"
    return obj, where


def _number(obj: Any, where: str) -> float:
    if isinstance(obj, bool) or not isinstance(obj, int | float):
        raise QuantityError(f"{where} is {type(obj).__name__}, not a number")
    if not math.isfinite(obj):
        raise QuantityError(f"{where} is {obj}, not a finite number")
    return float(obj)


def resolve(data: Any, path: str) -> float:
    """The number at `path` in `data` (a results.json dict or any nested dicts/lists)."""
    return _number(*_walk(data, path))


def resolve_values(data: Any, path: str) -> list[float]:
    """The list of numbers at `path` (e.g. a quantity's values over the mesh levels)."""
    obj, where = _walk(data, path)
    if not isinstance(obj, list) or not obj:
        raise QuantityError(f"{where} is not a list of numbers")
    return [_number(v, f"{where}[{k}]") for k, v in enumerate(obj)]
