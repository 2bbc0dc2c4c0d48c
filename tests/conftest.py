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
                     newton: float = 1.0, stress: tuple[str, float] | None = None) -> str:
    """A 200 x 100 x 10 mm plate cantilever, clamped left, 20 kN down on its right edge
    spread by `distribution`, written in the given units (`mm` and `newton`: that length
    and force unit's size in mm and N; `stress`: a [units] stress name and its size in
    MPa, else force/length²)."""
    mpa = newton / mm**2 if stress is None else stress[1]   # one stress unit in N/mm2
    stress_line = "" if stress is None else f'stress = "{stress[0]}"'
    return f"""
schema = 1
name = "plate-cantilever"
kind = "beam"
[units]
length = "{length_unit}"
force = "{force_unit}"
{stress_line}
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


# results.json leaves by dimension, for the [units] stress tests: a force, a moment (force x
# length) or a shear flow (force / length) scales with the force unit; the torsion stress
# per unit torque with its inverse; everything else (stresses in one stress unit, lengths,
# ratios, counts) stays. Listed here by hand, apart from fem.results, so a force that the
# code forgets to convert (or a stress it converts by mistake) shows as a mismatch.
FORCE_LEAVES = {"V_fe", "V_hand", "M_fe", "M_hand", "N_fe", "N_hand", "applied", "reactions",
                "V", "V_solved", "resultant.fe", "GJ", "q_fe", "q_hand", "q_fe_line",
                "capacity", "demand", "total_fe"}   # "a.b": key b inside a
PER_FORCE_LEAVES = {"torsion_stress_per_torque"}
UNCOMPARED = {"timings", "provenance", "solve_attempts", "units", "message",
              "hand_calculation", "case_file", "case_sha256"}


def unit_mismatches(a, b, force_ratio: float, path: tuple = ()) -> list[str]:
    """Every leaf of results.json `b` that is not the same leaf of `a` times the factor of
    its dimension (`force_ratio` for a force leaf: b's force unit per a's), to 1e-9."""
    if isinstance(a, dict):
        return [m for k in a if k not in UNCOMPARED
                for m in unit_mismatches(a[k], b.get(k), force_ratio, (*path, k))]
    if isinstance(a, list):
        if not isinstance(b, list) or len(a) != len(b):
            return [f"{'.'.join(path)}: {a!r} against {b!r}"]
        return [m for i, (u, v) in enumerate(zip(a, b, strict=True))
                for m in unit_mismatches(u, v, force_ratio, (*path, str(i)))]
    if isinstance(a, bool) or not isinstance(a, int | float):
        return [] if a == b else [f"{'.'.join(path)}: {a!r} against {b!r}"]
    names = [p for p in path if not p.isdigit()]
    force = (names[-1] in FORCE_LEAVES or ".".join(names[-2:]) in FORCE_LEAVES
             or any(p.endswith(" q_fe") for p in names))
    factor = (1.0 / force_ratio if names[-1] in PER_FORCE_LEAVES
              else force_ratio if force else 1.0)
    ok = isinstance(b, int | float) and abs(b - a * factor) <= 1e-9 * max(abs(a * factor),
                                                                           abs(b), 1e-300)
    return [] if ok else [f"{'.'.join(path)}: {a!r} x {factor:g} against {b!r}"]
