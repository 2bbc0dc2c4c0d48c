"""Speed of the beam chain against bare scikit-fem on the same meshes, one command.

Run from the repository root (opt-in; not part of the test suite):

    python bench/bench_speed.py            # ~25k, 110k, 400k dofs and the demo (~10 min)
    python bench/bench_speed.py --quick    # ~25k and 110k dofs and the demo (~2 min)
    python bench/bench_speed.py --full     # adds 1M dofs (one repeat), the forced solver
                                           # runs and the adaptive study (~30 min)

It prints, all measured in this run:

1. the table: for each size, one fresh process meshes the demo bracket (P2, curved hole)
   and runs, interleaved, three times each (one at 1M): the project's chain - `mesh_member`,
   the assembly and solve of `fem.member.solve.solve_member` (split by its own timers), and
   `recover` - and the bare scikit-fem route on the same mesh - `linear_elasticity` with the
   plane-stress lambda, `asm`, `solve(*condense(K, f, D=...))` with SciPy's default
   `spsolve`, and stresses projected on P1DG (`Basis.project`). Medians, in microseconds per
   dof, with the project's ratio to bare for assemble, solve, post and assemble + solve, the
   solver the project used, the process's peak memory after the project's runs (VmHWM, see
   `peak_memory_gib`) and how far the two displacement fields differ;
2. the wall time of `python -m fem.cli demo` (three levels and the full note) and its
   phases from results.json;
3. (--full) the direct and the AMG-CG solve forced at 400k and 1M dofs, the evidence for the
   memory switch in `fem.linear_solver.solve_spd`;
4. (--full) the dofs that adaptive refinement (`fem.member.adapt`) needs for the GCI of the
   peak von Mises stress that the case's own levels reach, on a plate with a hole and a
   filleted cope.

The machine is shared by whatever else runs on it: the two routes are interleaved in one
process and medians count; the load average is printed at start and end.
"""

from __future__ import annotations

import argparse
import json
import math
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from fem.case import load_case  # noqa: E402
from fem.member.mesh import mesh_member  # noqa: E402

DEMO = ROOT / "fem" / "data" / "stub-bracket.toml"
DOFS_AT_SIZE_1 = 113_068 * 2.5**2  # demo bracket: dofs ~ C / size^2 (measured)


def size_for(dofs: float) -> float:
    """Element size of the demo bracket that gives about `dofs` degrees of freedom."""
    return math.sqrt(DOFS_AT_SIZE_1 / dofs)


def bare_route(mm, lam: float, mu: float, f: np.ndarray, fixed: np.ndarray) -> dict:
    """scikit-fem defaults on the project's mesh: generic weak form, asm, condense, solve
    (spsolve, COLAMD), stresses projected on P1DG. Seconds per phase and the field."""
    from skfem import Basis, ElementTriP1DG, ElementTriP2, ElementVector, asm, condense, solve
    from skfem.helpers import sym_grad
    from skfem.models.elasticity import linear_elasticity

    t = float(mm.thickness[0])
    t0, c0 = time.perf_counter(), time.process_time()
    basis = Basis(mm.mesh, ElementVector(ElementTriP2()))
    K = asm(linear_elasticity(lam * t, mu * t), basis)
    t1 = time.perf_counter()
    u = solve(*condense(K, f, D=fixed))
    t2, c2 = time.perf_counter(), time.process_time()
    eps = sym_grad(basis.interpolate(u))
    dg = basis.with_element(ElementTriP1DG())
    for i, j in ((0, 0), (1, 1), (0, 1)):
        sig = 2.0 * mu * eps[i, j] + (lam * (eps[0, 0] + eps[1, 1]) if i == j else 0.0)
        dg.project(sig)
    t3 = time.perf_counter()
    return {"assemble": t1 - t0, "solve": t2 - t1, "post": t3 - t2, "cpu_as": c2 - c0, "u": u}


def timed(fn, *args):
    w, c = time.perf_counter(), time.process_time()
    out = fn(*args)
    return out, time.perf_counter() - w, time.process_time() - c


def ours_route(case, size: float) -> tuple[dict, object]:
    """The project's chain at `size`: mesh, assemble + solve (own timers), recovery."""
    from fem.member.recovery import recover
    from fem.member.solve import solve_member

    mm = mesh_member(case, size)
    sol, _, cpu_as = timed(solve_member, case, mm)
    t0 = time.perf_counter()
    recover(sol, mm)
    post = time.perf_counter() - t0
    return {"mesh": mm.seconds, "assemble": sol.seconds_assemble, "solve": sol.seconds_solve,
            "post": post, "cpu_as": cpu_as}, (mm, sol)


def table_child(size: float, repeats: int) -> dict:
    """Part 1 in this (fresh) process: both routes on one mesh, interleaved, medians."""
    case = load_case(DEMO)
    ours, bare = [], []
    for k in range(repeats):
        o, (mm, sol) = ours_route(case, size)
        ours.append(o)
        if k == 0:
            peak = peak_memory_gib()    # before the bare route's larger factor
        bare.append(bare_route(mm, sol.lam, sol.mu, sol.f, sol.fixed))
    diff = float(np.abs(bare[-1]["u"] - sol.u).max() / np.abs(sol.u).max())

    def median(rows: list[dict]) -> dict:
        keys = ("mesh", "assemble", "solve", "post", "cpu_as")
        return {k: float(np.median([r[k] for r in rows])) for k in keys if k in rows[0]}

    return {"dofs": int(sol.basis.N), "ours": median(ours), "bare": median(bare),
            "solver": sol.solver, "iterations": sol.iterations, "peak_gib": peak,
            "difference": diff, "repeats": repeats}


def peak_memory_gib() -> float:
    """This process's peak resident memory. Linux keeps the parent's high-water mark in
    ru_maxrss across fork and exec, so VmHWM (reset with the new address space) is read
    first; ru_maxrss is the fallback elsewhere."""
    try:
        for line in Path("/proc/self/status").read_text().splitlines():
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 2**20
    except OSError:
        pass
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 2**20


def child(size: float, solver: str) -> dict:
    """One level of the chain at `size` in this (fresh) process; times and peak memory."""
    import fem.member.solve as fs
    from fem.member.recovery import recover

    if solver != "auto":
        fs.SOLVE_METHOD = "iterative" if solver == "amg" else "direct"
    case = load_case(DEMO)
    mm, _, cpu_mesh = timed(mesh_member, case, size)
    sol, _, cpu_solve = timed(fs.solve_member, case, mm)
    _, post, cpu_post = timed(recover, sol, mm)
    return {"size": size, "dofs": int(sol.basis.N), "mesh": mm.seconds,
            "assemble": sol.seconds_assemble, "solve": sol.seconds_solve, "post": post,
            "cpu_mesh": cpu_mesh, "cpu_solve": cpu_solve, "cpu_post": cpu_post,
            "solver": sol.solver, "iterations": sol.iterations,
            "peak_gib": peak_memory_gib()}


def run_child(size: float, solver: str = "auto", repeats: int = 0) -> dict:
    """`child` (or `table_child` with repeats > 0) in a fresh process."""
    extra = ["--repeats", str(repeats)] if repeats else []
    out = subprocess.run([sys.executable, __file__, "--child", str(size), "--solver", solver,
                          *extra], capture_output=True, text=True, check=True, cwd=ROOT)
    return json.loads(out.stdout.strip().splitlines()[-1])


def adaptive_vs_uniform(name: str, growths: tuple[float, ...] = (2.0, 1.7)) -> list[str]:
    """Part 5: dofs for the same GCI of the peak von Mises stress (outside the excluded
    zones), the case's own levels (every size halved) against adaptive refinement."""
    from fem.case.sizing import level_size
    from fem.convergence import gci_study
    from fem.member.adapt import adaptive_levels
    from fem.member.level import excluded_zones, peaks
    from fem.member.recovery import recover
    from fem.member.solve import solve_member

    case = load_case(ROOT / "cases" / f"{name}.toml")
    sizes, values, dofs = [], [], []
    for k in range(case.mesh.levels):
        mm = mesh_member(case, level_size(case, k))
        sol = solve_member(case, mm)
        field = recover(sol, mm)
        sizes.append(mm.size)
        values.append(peaks(field, excluded_zones(case, mm.supports, mm.loads))["von_mises"][0])
        dofs.append(sol.basis.N)
    gci_u = gci_study(sizes, values).gci
    lines = [f"   {name}: uniform levels {dofs[-1]:,} dofs, peak {values[-1]:.2f}, "
             f"GCI {gci_u:.3%}"]
    for growth in growths:
        levels = adaptive_levels(case, 5, growth)
        vals = [lv.peaks["von_mises"][0] for lv in levels]
        hs = [lv.h for lv in levels]
        for j in range(2, len(levels)):
            gci = gci_study(hs[j - 2:j + 1], vals[j - 2:j + 1]).gci
            if gci is not None and gci <= gci_u:
                n = levels[j].sol.basis.N
                lines.append(f"     adaptive (x{growth:g} elements a step, h ratio "
                             f"{hs[j - 1] / hs[j]:.2f}): GCI {gci:.3%} at {n:,} dofs = "
                             f"{n / dofs[-1]:.2f} of uniform, peak {vals[j]:.2f}")
                break
        else:
            lines.append(f"     adaptive (x{growth:g}): GCI not reached in {len(levels)} levels "
                         f"(peaks {', '.join(f'{v:.2f}' for v in vals)})")
    return lines


def demo_time() -> dict:
    with tempfile.TemporaryDirectory() as tmp:
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "fem.cli", "demo", "--out", tmp, "--quiet"],
                       check=True, cwd=ROOT, env={**os.environ, "PYTHONPATH": str(ROOT)})
        wall = time.perf_counter() - t0
        timings = json.loads((Path(tmp) / "results.json").read_text())["timings"]
    return {"wall": wall, **timings}


def print_table(rows: list[dict]) -> None:
    us = 1e6
    print("\n1. the project against bare scikit-fem on the same mesh (demo bracket, P2, "
          "curved);\n   medians, microseconds per dof; ratio = project / bare")
    print("        dofs  rep |  mesh | assem  solve   post | bare: assem  solve   post | "
          "ratio: assem  solve   post  as+so [cpu] | solver     peak GiB  |du|/|u|")
    for x in rows:
        o, b, n = x["ours"], x["bare"], x["dofs"]
        r = {k: o[k] / b[k] for k in ("assemble", "solve", "post")}
        r_as = (o["assemble"] + o["solve"]) / (b["assemble"] + b["solve"])
        r_cpu = o["cpu_as"] / b["cpu_as"]
        its = f"({x['iterations']})" if x["iterations"] else ""
        print(f"   {n:9,d}  {x['repeats']:3d} | {us * o['mesh'] / n:5.1f} | "
              f"{us * o['assemble'] / n:5.1f} {us * o['solve'] / n:6.1f} "
              f"{us * o['post'] / n:6.1f} |       {us * b['assemble'] / n:5.1f} "
              f"{us * b['solve'] / n:6.1f} {us * b['post'] / n:6.1f} |        "
              f"{r['assemble']:5.3f}  {r['solve']:5.3f}  {r['post']:5.3f}  {r_as:5.3f} "
              f"[{r_cpu:5.3f}] | "
              f"{x['solver'] + its:10s} {x['peak_gib']:6.2f}  {x['difference']:8.1e}")


def main(argv: list[str] | None = None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    mode = p.add_mutually_exclusive_group()
    mode.add_argument("--quick", action="store_true", help="~25k and 110k dofs and the demo")
    mode.add_argument("--full", action="store_true",
                      help="adds 1M dofs, forced solvers and the adaptive study")
    p.add_argument("--child", type=float, default=None, help=argparse.SUPPRESS)
    p.add_argument("--solver", default="auto", help=argparse.SUPPRESS)
    p.add_argument("--repeats", type=int, default=0, help=argparse.SUPPRESS)
    args = p.parse_args(argv)
    if args.child is not None:
        out = (table_child(args.child, args.repeats) if args.repeats
               else child(args.child, args.solver))
        print(json.dumps(out))
        return 0

    print(f"load average at start: {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    targets = [(25e3, 3), (110e3, 3)]
    if not args.quick:
        targets.append((400e3, 3))
    if args.full:
        targets.append((1e6, 1))        # bare spsolve alone is minutes here: one repeat
    rows = []
    for n, reps in targets:
        rows.append(run_child(size_for(n), repeats=reps))
        print(f"   ... {rows[-1]['dofs']:,} dofs done", flush=True)
    print_table(rows)

    d = demo_time()
    print(f"\n2. demo (three levels and the full note): {d['wall']:.2f} s wall; phases: mesh "
          f"{d['mesh']:.2f}, assemble {d['assemble']:.2f}, solve {d['solve']:.2f}, "
          f"post {d['post']:.2f} s (the rest is start-up and writing the report)")

    if args.full:
        print("\n3. solver forced (fem.member.solve.SOLVE_METHOD), one fresh process each")
        for target in (400e3, 1e6):
            for solver in ("direct", "amg"):
                x = run_child(size_for(target), solver)
                print(f"   {x['dofs']:9,d} dofs {solver:6s} solve {x['solve']:6.2f} s wall, "
                      f"assembly + solve cpu {x['cpu_solve']:6.2f} s, "
                      f"peak {x['peak_gib']:.2f} GiB, solver {x['solver']}"
                      + (f", {x['iterations']} CG iterations" if solver == "amg" else ""))
        print("\n4. adaptive refinement (fem.member.adapt) against the case's own levels")
        for name in ("plate-hole-tension", "coped-beam-fillet"):
            print("\n".join(adaptive_vs_uniform(name)))
    print(f"load average at end: {os.getloadavg()[0]:.1f}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
