"""Sparse symmetric positive definite solves: the one place a solver is chosen.

Both kinds use it: the member's condensed stiffness (`fem.member.solve`) and the section's
pinned Laplacian (`fem.section.solve`). What it offers:

- `factorize(A)`: a direct factorisation that serves any number of right-hand sides.
  PARDISO (Intel MKL, through the `pypardiso` package, real SPD mode, METIS ordering) when
  it can be imported, otherwise SuperLU in symmetric mode with the minimum-degree ordering
  of A + A^T (scipy; never MMD without symmetric mode, see FEM-NOTES). Measured on the demo
  bracket at 400k dofs (bench/bench_speed.py): PARDISO about half the CPU time of SuperLU
  and 0.7 of its peak memory.
- `cg_amg(A, b, modes)`: conjugate gradients preconditioned by smoothed-aggregation AMG on
  the rigid-body modes (the default near-null space does not converge, FEM-NOTES). It stops
  on the true relative residual |b - A x| / |b| <= `CG_RTOL`, and at stagnation: when the
  best residual has not fallen by `STAGNATION_FACTOR` within `STAGNATION_WINDOW` iterations.
- `solve_spd(A, b, modes)`: the policy. Direct when the estimated peak memory of the
  factorisation (`estimate_factor_bytes`) fits in `MEMORY_SHARE` of the memory available
  now (`available_memory`), otherwise AMG-CG; if CG does not reach its tolerance, the direct
  solve takes over. Every attempt is returned (`Attempt`), so results.json can say which
  solver was tried, its iterations and residual, and which one gave the answer.

This module sits on the core floor: it imports numpy and scipy only (pypardiso and pyamg
inside the functions that need them).
"""

from __future__ import annotations

import os
import sys
import time
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import scipy.sparse as sp

__all__ = ["Attempt", "Factor", "CGResult", "factorize", "direct_solvers", "cg_amg",
           "solve_spd", "estimate_factor_bytes", "available_memory", "relative_residual",
           "CG_RTOL", "CG_MAXITER", "STAGNATION_WINDOW", "STAGNATION_FACTOR", "MEMORY_SHARE",
           "FACTOR_BYTES"]

CG_RTOL = 1e-8          # true relative residual at which CG stops (reached in ~30 iterations)
CG_MAXITER = 300        # measured 28-34 iterations from 100k to 1M dofs at 1e-8
STAGNATION_WINDOW = 20  # iterations without the best residual falling ...
STAGNATION_FACTOR = 0.5  # ... to this fraction of what it was: CG has stagnated
MEMORY_SHARE = 0.5      # the factorisation may use this share of the memory available now
# peak bytes of a factorisation per nnz(A) log2(n), fitted with margin to the demo bracket
# at 110k and 400k dofs (bench/bench_speed.py; about 6.4 measured for SuperLU, 4.1 PARDISO)
FACTOR_BYTES = {"pardiso": 6.0, "superlu": 9.0}


@dataclass(frozen=True)
class Attempt:
    """One solver's go at a system, as results.json records it.

    outcome: "answer" (this one produced the displacements), "stagnated" (CG stopped
    improving above its tolerance), "not-reached" (CG hit its iteration cap), "failed"
    (the solver raised), "too-large" (direct skipped: estimated factor memory over the
    share of available memory).
    """

    solver: str
    outcome: str
    iterations: int = 0
    residual: float = float("nan")   # true relative residual |b - A x| / |b|
    seconds: float = 0.0
    note: str = ""


class Factor:
    """A direct factorisation of an SPD matrix; `solve` takes (n,) or (n, k) right-hand sides."""

    def __init__(self, name: str, solve: Callable[[np.ndarray], np.ndarray],
                 release: Callable[[], None] | None = None) -> None:
        self.name = name
        self._solve = solve
        self._release = release

    def solve(self, b: np.ndarray) -> np.ndarray:
        return self._solve(np.asarray(b, dtype=float))

    def close(self) -> None:
        """Free the factor's memory now (PARDISO holds it outside Python)."""
        if self._release is not None:
            self._release()
            self._release = None

    def __enter__(self) -> Factor:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    def __del__(self) -> None:
        try:
            self.close()
        except Exception:  # noqa: BLE001  (interpreter shutdown: the library may be gone)
            pass


def _point_to_mkl() -> None:
    """Tell pypardiso where the mkl wheel put libmkl_rt (its documented PYPARDISO_MKL_RT).

    Without it, every solver object pypardiso makes (one at its import, one per
    factorisation) falls back to a recursive glob of the whole environment when
    ctypes' find_library misses the wheel's library: about a second each, measured in the
    demo's profile.
    """
    if os.environ.get("PYPARDISO_MKL_RT"):
        return
    for pattern in ("lib/libmkl_rt.so*", "lib/libmkl_rt*.dylib", "Library/bin/mkl_rt*.dll"):
        found = sorted(Path(sys.prefix).glob(pattern), key=lambda p: len(p.name))
        if found:
            os.environ["PYPARDISO_MKL_RT"] = str(found[0])
            return


def _pardiso_module():
    """pypardiso's wrapper module, or None if it (or MKL) cannot be loaded here."""
    _point_to_mkl()
    try:
        from pypardiso import pardiso_wrapper
    except (ImportError, OSError):
        return None
    return pardiso_wrapper


def direct_solvers() -> tuple[str, ...]:
    """The direct solvers usable in this environment, preferred first."""
    return (("pardiso",) if _pardiso_module() is not None else ()) + ("superlu",)


def _superlu(A: sp.spmatrix) -> Factor:
    from scipy.sparse.linalg import splu

    lu = splu(sp.csc_matrix(A), permc_spec="MMD_AT_PLUS_A", options={"SymmetricMode": True})
    return Factor("superlu", lu.solve)


def _pardiso(A: sp.spmatrix, wrapper) -> Factor:
    upper = sp.triu(A, format="csr")        # symmetric types take the upper triangle
    upper.sort_indices()
    ps = wrapper.PyPardisoSolver(mtype=2)   # real symmetric positive definite
    try:
        ps.factorize(upper)
    except wrapper.PyPardisoError as exc:
        ps.free_memory(everything=True)
        raise RuntimeError(f"PARDISO could not factorise the matrix ({exc})") from None

    def solve(b: np.ndarray) -> np.ndarray:
        try:
            return ps.solve(upper, b)
        except wrapper.PyPardisoError as exc:
            raise RuntimeError(f"PARDISO could not solve ({exc})") from None

    return Factor("pardiso", solve, lambda: ps.free_memory(everything=True))


def factorize(A: sp.spmatrix, solver: str | None = None) -> Factor:
    """Factorise the SPD matrix A once, for every right-hand side that follows.

    Parameters
    ----------
    A : sparse matrix
        Symmetric positive definite (both triangles stored).
    solver : {"pardiso", "superlu"}, optional
        Force one; default: the first of `direct_solvers()`.

    Raises
    ------
    RuntimeError
        The matrix is singular (or not positive definite) to the solver.
    ValueError
        An unknown or unavailable solver was asked for.
    """
    name = solver or direct_solvers()[0]
    if name == "superlu":
        return _superlu(A)
    if name == "pardiso":
        wrapper = _pardiso_module()
        if wrapper is None:
            raise ValueError("the direct solver 'pardiso' needs the pypardiso package (MKL)")
        return _pardiso(A, wrapper)
    raise ValueError(f"unknown direct solver {name!r}; allowed: pardiso, superlu")


def relative_residual(A: sp.spmatrix, x: np.ndarray, b: np.ndarray) -> float:
    """|b - A x| / |b| (Frobenius norm over all columns)."""
    return float(np.linalg.norm(A @ x - b) / max(float(np.linalg.norm(b)), 1e-300))


@dataclass(frozen=True)
class CGResult:
    x: np.ndarray
    iterations: int
    residual: float        # true relative residual of x
    outcome: str           # "converged" | "stagnated" | "not-reached"


def cg_amg(A: sp.csr_matrix, b: np.ndarray, modes: np.ndarray, rtol: float = CG_RTOL,
           maxiter: int = CG_MAXITER, window: int = STAGNATION_WINDOW,
           preconditioner: Callable[[np.ndarray], np.ndarray] | None = None) -> CGResult:
    """Preconditioned conjugate gradients with a true-residual stop and a stagnation stop.

    The recursively updated residual of CG drifts from the true one in floating point;
    here every step's iterate is judged by its true residual |b - A x| / |b| (one extra
    product per iteration), CG stops when it is within `rtol`, and it stops at stagnation
    when the best true residual has not fallen to `STAGNATION_FACTOR` of its value
    `window` iterations earlier. The best iterate is returned either way.

    Parameters
    ----------
    A : csr_matrix
        SPD system matrix.
    b : ndarray
        Right-hand side (n,).
    modes : ndarray
        (n, k) near-null space for smoothed aggregation (the rigid-body modes).
    preconditioner : callable, optional
        Replaces the AMG V-cycle (tests use it to make CG stagnate on purpose).
    """
    if preconditioner is None:
        import pyamg

        ml = pyamg.smoothed_aggregation_solver(A, B=modes, smooth="energy",
                                               symmetry="symmetric")
        M = ml.aspreconditioner(cycle="V")
        preconditioner = M.matvec
    nb = max(float(np.linalg.norm(b)), 1e-300)
    x = np.zeros_like(b, dtype=float)
    r = np.array(b, dtype=float)
    best_x, best = x.copy(), 1.0
    history = [1.0]                     # best true residual after each iteration
    z = preconditioner(r)
    p = z.copy()
    rz = float(r @ z)
    for k in range(1, maxiter + 1):
        Ap = A @ p
        pAp = float(p @ Ap)
        if not pAp > 0.0:               # breakdown: no further progress possible
            return CGResult(best_x, k - 1, best, "stagnated")
        alpha = rz / pAp
        x += alpha * p
        r -= alpha * Ap
        true = float(np.linalg.norm(b - A @ x)) / nb
        if true < best:
            best, best_x = true, x.copy()
        history.append(best)
        if best <= rtol:
            return CGResult(best_x, k, best, "converged")
        if k >= window and best > STAGNATION_FACTOR * history[k - window]:
            return CGResult(best_x, k, best, "stagnated")
        z = preconditioner(r)
        rz_new = float(r @ z)
        p = z + (rz_new / rz) * p
        rz = rz_new
    return CGResult(best_x, maxiter, best, "not-reached")


def available_memory() -> int:
    """Bytes of memory available to a new allocation now (MemAvailable on Linux)."""
    try:
        with open("/proc/meminfo") as fh:
            for line in fh:
                if line.startswith("MemAvailable:"):
                    return int(line.split()[1]) * 1024
    except OSError:
        pass
    try:
        return int(os.sysconf("SC_AVPHYS_PAGES") * os.sysconf("SC_PAGE_SIZE"))
    except (ValueError, OSError, AttributeError):
        return 8 * 2**30               # unknown platform: assume a modest machine


def estimate_factor_bytes(A: sp.spmatrix, solver: str) -> float:
    """Estimated peak memory of factorising A with `solver` [bytes].

    Nested-dissection-like orderings of 2D meshes give a factor of O(n log n) entries; the
    estimate is FACTOR_BYTES[solver] * nnz(A) * log2(n), fitted with margin to measured
    peaks (see FACTOR_BYTES).
    """
    n = max(A.shape[0], 2)
    return FACTOR_BYTES[solver] * A.nnz * np.log2(n)


def solve_spd(A: sp.csr_matrix, b: np.ndarray,
              modes: Callable[[], np.ndarray] | None = None,
              method: str = "auto") -> tuple[np.ndarray, list[Attempt]]:
    """Solve A x = b (A SPD) by the policy in the module docstring.

    Parameters
    ----------
    A, b
        The system; b of shape (n,).
    modes : callable, optional
        Returns the (n, k) near-null space for AMG; without it only direct solves are made.
    method : {"auto", "direct", "iterative"}
        "auto": direct if its estimated memory fits (`estimate_factor_bytes` against
        `MEMORY_SHARE` x `available_memory()`), else AMG-CG with the direct solve behind it.

    Returns
    -------
    (x, attempts); the last attempt's outcome is "answer".

    Raises
    ------
    RuntimeError
        The direct solve failed (singular matrix).
    """
    if method not in ("auto", "direct", "iterative"):
        raise ValueError(f"unknown method {method!r}; allowed: auto, direct, iterative")
    solver = direct_solvers()[0]
    attempts: list[Attempt] = []
    iterative = method == "iterative"
    if method == "auto" and modes is not None:
        need, have = estimate_factor_bytes(A, solver), available_memory()
        if need > MEMORY_SHARE * have:
            iterative = True
            attempts.append(Attempt(solver, "too-large", note=(
                f"estimated factor memory {need / 2**30:.1f} GiB over {MEMORY_SHARE:g} x "
                f"{have / 2**30:.1f} GiB available")))
    if iterative:
        if modes is None:
            raise ValueError("the iterative solve needs the near-null space (modes)")
        t0 = time.perf_counter()
        cg = cg_amg(A, b, modes())
        done = cg.outcome == "converged"
        attempts.append(Attempt("amg-cg", "answer" if done else cg.outcome, cg.iterations,
                                cg.residual, time.perf_counter() - t0))
        if done:
            return cg.x, attempts
    t0 = time.perf_counter()
    with factorize(A, solver) as factor:
        x = factor.solve(b)
    attempts.append(Attempt(solver, "answer", 0, relative_residual(A, x, b),
                            time.perf_counter() - t0))
    return x, attempts
