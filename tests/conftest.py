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
