"""Section solve speed: torsion + both flexure problems at about 50k P2 dofs.

Runs, in one process on the same mesh, (a) `fem.section.solve.solve_section` (one Laplacian
assembly, one pinned factorisation reused for the three right-hand sides) and (b) a generic
route: the saddle-point system with the Lagrange-multiplier row solved three times by
scipy's default `spsolve` (SuperLU, COLAMD). Prints both times and their ratio.

    python bench/bench_section.py
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import spsolve
from skfem import Basis, BilinearForm, ElementTriP2, LinearForm, asm
from skfem.helpers import dot, grad

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from fem.section.mesh import mesh_section, section_shape  # noqa: E402
from fem.section.solve import solve_section  # noqa: E402


@BilinearForm
def laplace(u, v, w):
    return dot(grad(u), grad(v))


@LinearForm
def ones(v, w):
    return v


def generic(sm, n_rhs: int = 3) -> float:
    """Assemble and solve the bordered Neumann system n_rhs times with default spsolve."""
    t0 = time.perf_counter()
    basis = Basis(sm.mesh, ElementTriP2(), intorder=4)
    K = asm(laplace, basis)
    m = asm(ones, basis)
    A = sp.bmat([[K, m[:, None]], [m[None, :], None]], format="csc")
    rng = np.random.default_rng(0)
    for _ in range(n_rhs):
        b = rng.standard_normal(A.shape[0])
        b[:-1] -= m * (b[:-1].sum() / m.sum())   # compatible data
        b[-1] = 0.0
        spsolve(A, b)
    return time.perf_counter() - t0


def main() -> int:
    sm = mesh_section(section_shape("rectangle", width=40.0, depth=10.0), 0.195)
    t0 = time.perf_counter()
    sol = solve_section(sm, 0.3)
    ours = time.perf_counter() - t0
    base = generic(sm)
    print(f"section solve at {sol.dofs:,} dofs (torsion + Vx + Vy flexure):")
    print(f"  ours    {ours:6.2f} s  (assemble {sol.timings.get('assemble', 0):.2f}, "
          f"solve {sol.timings.get('solve', 0):.2f}, post {sol.timings.get('post', 0):.2f})")
    print(f"  generic {base:6.2f} s  (bordered system, default spsolve x 3)")
    print(f"  ratio ours/generic {ours / base:.3f}; target: ours under 2 s here")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
