"""Shared helpers: write small case files for tests."""

from __future__ import annotations

import textwrap
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture
def write_case(tmp_path: Path):
    """Write TOML text (dedented) to a file in tmp_path and return its path."""

    def _write(text: str, name: str = "case.toml") -> Path:
        p = tmp_path / name
        p.write_text(textwrap.dedent(text), encoding="utf-8")
        return p

    return _write


CANTILEVER = """
schema = 1
name = "cantilever"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = {length}
depth = 100.0
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, -10000.0]
distribution = "parabolic"
[mesh]
size = {size}
levels = {levels}
[check]
cuts = {cuts}
"""


def plate_cantilever(size_mm: float, levels: int, distribution: str = "uniform",
                     length_unit: str = "mm", force_unit: str = "N", mm: float = 1.0,
                     newton: float = 1.0) -> str:
    """A 200 x 100 x 10 mm plate cantilever, clamped left, 20 kN down on its right edge
    spread by `distribution`, written in the given units (`mm` and `newton`: that length
    and force unit's size in mm and N)."""
    mpa = newton / mm**2                       # one stress unit in N/mm2
    return f"""
schema = 1
name = "plate-cantilever"
kind = "beam"
[units]
length = "{length_unit}"
force = "{force_unit}"
[material]
E = {200000.0 / mpa!r}
nu = 0.3
thickness = {10.0 / mm!r}
[geometry]
shape = "rectangle"
length = {200.0 / mm!r}
depth = {100.0 / mm!r}
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, {-20000.0 / newton!r}]
distribution = "{distribution}"
[mesh]
size = {size_mm / mm!r}
levels = {levels}
"""
