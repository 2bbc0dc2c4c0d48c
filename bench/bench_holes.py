"""Meshing time of a plate with many small holes (issue 16): 25, 50 and 100 holes.

A plain script (not collected by pytest): `python bench/bench_holes.py`. A 1000 x 200 mm
plate clamped at the left end, loaded at the right, with n holes of radius 3 mm on a grid;
one mesh level at size 20 mm. Prints, per n, the wall time of `fem.member.mesh.mesh_member`
(OCC model + size fields + gmsh meshing + hand-over) with one size field per hole radius
(`SHARED_HOLE_FIELDS`, the default) and, as the same-run baseline, one field per hole (the
old way; `--full` adds it at 100 holes, which takes minutes), their ratio, the real dof
count and the size guard's estimate.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import fem.member.mesh  # noqa: E402
from fem.case.parse import parse_case  # noqa: E402
from fem.case.sizing import estimate_dofs  # noqa: E402
from fem.member.mesh import mesh_member  # noqa: E402

CASE = """
schema = 1
name = "holes"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = 1000.0
depth = 200.0
{holes}
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, -10000.0]
[mesh]
size = 20.0
levels = 1
"""


def holes(n: int, mixed: bool = False) -> str:
    """n holes of radius 3 mm, or (mixed) of radii 2.5 to 3.5 mm in five steps."""
    cols = 25
    rows = (n + cols - 1) // cols
    return "".join(f"[[geometry.holes]]\ncenter = [{100.0 + 32.0 * (i % cols)}, "
                   f"{200.0 * (1 + i // cols) / (rows + 1)}]\n"
                   f"radius = {2.5 + 0.25 * (i % 5) if mixed else 3.0}\n"
                   for i in range(n))


def timed(case, shared: bool) -> tuple[float, int]:
    fem.member.mesh.SHARED_HOLE_FIELDS = shared
    t0 = time.perf_counter()
    m = mesh_member(case).finder_mesh
    return time.perf_counter() - t0, 2 * (m.nvertices + m.facets.shape[1])


def main() -> None:
    full = "--full" in sys.argv
    for n in (25, 50, 100):
        case = parse_case(CASE.format(holes=holes(n)), "holes.toml")
        new, real = timed(case, True)
        line = (f"{n:4d} holes: shared fields {new:6.2f} s, {real:,} dofs (estimate "
                f"{estimate_dofs(case, case.mesh.size):,})")
        if n < 100 or full:
            old, real_old = timed(case, False)
            line += f"; a field per hole {old:6.2f} s: {old / new:5.1f}x slower"
            assert real_old == real, "the two ways must give the same mesh"
        print(line, flush=True)
    for n in (25, 100):   # radii 2.5 .. 3.5: two bands share a field each
        case = parse_case(CASE.format(holes=holes(n, mixed=True)), "holes.toml")
        new, real = timed(case, True)
        line = f"{n:4d} mixed radii: banded fields {new:6.2f} s, {real:,} dofs"
        if n < 100 or full:
            old, real_old = timed(case, False)
            line += (f"; a field per hole {old:6.2f} s ({real_old:,} dofs): "
                     f"{old / new:5.1f}x slower")
        print(line, flush=True)


if __name__ == "__main__":
    main()
