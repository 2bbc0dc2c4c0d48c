"""Speed of the beam chain: our assembly and solve against scikit-fem's generic route.

Run from the repository root (opt-in; not part of the test suite):

    python bench/bench_speed.py            # everything, about 10 minutes on 2 cores
    python bench/bench_speed.py --quick    # about a minute: no 400k / 1M runs

It prints, all measured in this run:

1. the same ~110k-dof P2 plane-stress mesh (the demo bracket, curved hole) solved by the
   generic route - `linear_elasticity` with the plane-stress lambda, `asm`, `condense`,
   `skfem.solve` (SciPy's default `spsolve`) - and by `fem.member.solve.solve_member`; wall and CPU
   time of assembly + solve, their ratio, and how far the two displacement fields differ;
2. how assembly + solve and the whole level (mesh, solve, recovery) grow from 10k to 1M
   dofs, each size in a fresh child process with its peak memory (VmHWM, see
   `peak_memory_gib`), and the exponent of a log-log fit of time against dofs;
3. (full run) the direct and the AMG solve forced at 400k and 1M dofs, to show the choice
   of `fem.member.solve.DIRECT_LIMIT`;
4. the wall time of `python -m fem.cli demo` and its phases from results.json;
5. (full run) the dofs that adaptive refinement (`fem.member.adapt`) needs for the GCI of the peak
   von Mises stress that the case's own levels reach, on a plate with a hole and a
   filleted cope.

The machine is shared by whatever else runs on it, so the routes are interleaved and the
fastest of the repeats counts; the CPU-time ratio is the steadier figure under load.
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


def generic_route(mm, lam: float, mu: float, f: np.ndarray, fixed: np.ndarray) -> np.ndarray:
    """scikit-fem defaults: generic weak form, asm, condense, solve (spsolve, COLAMD)."""
    from skfem import Basis, ElementTriP2, ElementVector, asm, condense, solve
    from skfem.models.elasticity import linear_elasticity

    t = float(mm.thickness[0])
    basis = Basis(mm.mesh, ElementVector(ElementTriP2()))
    K = asm(linear_elasticity(lam * t, mu * t), basis)
    return solve(*condense(K, f, D=fixed))


def timed(fn, *args):
    w, c = time.perf_counter(), time.process_time()
    out = fn(*args)
    return out, time.perf_counter() - w, time.process_time() - c


def compare_routes(size: float, repeats: int) -> dict:
    """Part 1: both routes on one mesh, interleaved; fastest of `repeats` each."""
    from fem.member.solve import solve_member

    case = load_case(DEMO)
    mm = mesh_member(case, size)
    if not np.allclose(mm.thickness, mm.thickness[0]):
        raise SystemExit("the comparison needs one thickness (the generic form has one)")
    ours = {"wall": math.inf, "cpu": math.inf}
    generic = {"wall": math.inf, "cpu": math.inf}
    for _ in range(repeats):
        sol, w, c = timed(solve_member, case, mm)
        ours = {"wall": min(ours["wall"], w), "cpu": min(ours["cpu"], c)}
        u, w, c = timed(generic_route, mm, sol.lam, sol.mu, sol.f, sol.fixed)
        generic = {"wall": min(generic["wall"], w), "cpu": min(generic["cpu"], c)}
    dofs = sol.basis.N
    return {"dofs": dofs, "ours": ours, "generic": generic, "solver": sol.solver,
            "difference": float(np.abs(u - sol.u).max() / np.abs(sol.u).max()),
            "ratio_wall": ours["wall"] / generic["wall"],
            "ratio_cpu": ours["cpu"] / generic["cpu"]}


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
        fs.DIRECT_LIMIT = 0 if solver == "amg" else 10**12
    case = load_case(DEMO)
    mm, _, cpu_mesh = timed(mesh_member, case, size)
    sol, _, cpu_solve = timed(fs.solve_member, case, mm)
    _, post, cpu_post = timed(recover, sol, mm)
    return {"size": size, "dofs": int(sol.basis.N), "mesh": mm.seconds,
            "assemble": sol.seconds_assemble, "solve": sol.seconds_solve, "post": post,
            "cpu_mesh": cpu_mesh, "cpu_solve": cpu_solve, "cpu_post": cpu_post,
            "solver": sol.solver, "iterations": sol.iterations,
            "peak_gib": peak_memory_gib()}


def run_child(size: float, solver: str = "auto") -> dict:
    out = subprocess.run([sys.executable, __file__, "--child", str(size), "--solver", solver],
                         capture_output=True, text=True, check=True, cwd=ROOT)
    return json.loads(out.stdout.strip().splitlines()[-1])


def exponent(dofs: list[int], seconds: list[float]) -> float:
    """Slope of log(time) against log(dofs), least squares."""
    return float(np.polyfit(np.log(dofs), np.log(seconds), 1)[0])


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


def main(argv: list[str] | None = None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--quick", action="store_true", help="about a minute: sizes up to ~100k")
    p.add_argument("--child", type=float, default=None, help=argparse.SUPPRESS)
    p.add_argument("--solver", default="auto", help=argparse.SUPPRESS)
    args = p.parse_args(argv)
    if args.child is not None:
        print(json.dumps(child(args.child, args.solver)))
        return 0

    print(f"load average at start: {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    r = compare_routes(size_for(110_000), repeats=2 if args.quick else 3)
    print(f"\n1. same mesh, {r['dofs']:,} dofs (P2 plane stress, curved), assembly + solve")
    for name in ("generic", "ours"):
        w, c = r[name]["wall"], r[name]["cpu"]
        print(f"   {name:8s} wall {w:6.2f} s  cpu {c:6.2f} s  "
              f"({1e6 * w / r['dofs']:.1f} us/dof wall)")
    print(f"   ratio ours/generic: wall {r['ratio_wall']:.3f}, cpu {r['ratio_cpu']:.3f} "
          f"(solver {r['solver']}; displacements differ by {r['difference']:.1e} relative)")

    targets = [10e3, 30e3, 100e3] if args.quick else [10e3, 30e3, 100e3, 400e3, 1e6]
    rows = [run_child(size_for(n)) for n in targets]
    print("\n2. scaling (demo bracket, one level per fresh process); wall s, [cpu s]")
    print("       dofs   mesh  assem  solve   post  [asm+sol]  solver(its)  peak GiB")
    for x in rows:
        its = f"({x['iterations']})" if x["solver"] == "amg" else ""
        print(f"   {x['dofs']:8,d} {x['mesh']:6.2f} {x['assemble']:6.2f} {x['solve']:6.2f} "
              f"{x['post']:6.2f}  [{x['cpu_solve']:7.2f}]  {x['solver']:6s}{its:5s}  "
              f"{x['peak_gib']:8.2f}")
    n = [x["dofs"] for x in rows]
    a_s = [x["assemble"] + x["solve"] for x in rows]
    total = [x["mesh"] + x["assemble"] + x["solve"] + x["post"] for x in rows]
    cpu_as = [x["cpu_solve"] for x in rows]
    cpu_total = [x["cpu_mesh"] + x["cpu_solve"] + x["cpu_post"] for x in rows]
    print(f"   exponent k of time ~ dofs^k: assembly + solve {exponent(n, a_s):.2f} wall, "
          f"{exponent(n, cpu_as):.2f} cpu; whole level {exponent(n, total):.2f} wall, "
          f"{exponent(n, cpu_total):.2f} cpu")

    if not args.quick:
        print("\n3. solver choice (forced), DIRECT_LIMIT from fem.member.solve")
        for target in (400e3, 1e6):
            for solver in ("direct", "amg"):
                x = run_child(size_for(target), solver)
                print(f"   {x['dofs']:9,d} dofs {solver:6s} solve {x['solve']:6.2f} s wall, "
                      f"assembly + solve cpu {x['cpu_solve']:6.2f} s, "
                      f"peak {x['peak_gib']:.2f} GiB"
                      + (f", {x['iterations']} CG iterations" if solver == "amg" else ""))

    d = demo_time()
    print(f"\n4. demo (three levels and the report): {d['wall']:.2f} s wall; phases: mesh "
          f"{d['mesh']:.2f}, assemble {d['assemble']:.2f}, solve {d['solve']:.2f}, "
          f"post {d['post']:.2f} s (the rest is start-up and writing the report)")

    if not args.quick:
        print("\n5. adaptive refinement (fem.member.adapt) against the case's own levels")
        for name in ("plate-hole-tension", "coped-beam-fillet"):
            print("\n".join(adaptive_vs_uniform(name)))
    print(f"load average at end: {os.getloadavg()[0]:.1f}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
