"""`fem.linear_solver`: direct factorisations agree, one factor serves many right-hand
sides, CG stops on its true residual and at stagnation, the memory switch and the fallback.

Exact solutions here are those of the direct solve itself (the systems are SPD and well
conditioned, so two independent direct solvers agree to round-off; common practice).
"""

from __future__ import annotations

import numpy as np
import pytest
import scipy.sparse as sp

import fem.linear_solver as ls

PARDISO = "pardiso" in ls.direct_solvers()


def laplacian_2d(n: int) -> sp.csr_matrix:
    """The 5-point Laplacian on an n x n grid with Dirichlet sides: SPD, condition ~ n^2."""
    t = sp.diags([-1.0, 2.0, -1.0], [-1, 0, 1], shape=(n, n))
    eye = sp.identity(n)
    return (sp.kron(t, eye) + sp.kron(eye, t)).tocsr()


@pytest.fixture(scope="module")
def system():
    A = laplacian_2d(40)
    rng = np.random.default_rng(7)
    return A, rng.standard_normal(A.shape[0])


@pytest.mark.parametrize("solver", ["superlu", "pardiso"])
def test_one_factor_serves_every_right_hand_side(system, solver):
    """Three columns at once equal three single solves; the residual is round-off."""
    if solver == "pardiso" and not PARDISO:
        pytest.skip("pypardiso (MKL) is not installed on this platform")
    A, b = system
    B = np.column_stack([b, 2.0 * b + 1.0, np.sin(np.arange(len(b)))])
    with ls.factorize(A, solver) as f:
        assert f.name == solver
        X = f.solve(B)
        singles = [f.solve(B[:, k]) for k in range(3)]
    assert X.shape == B.shape
    for k in range(3):
        assert np.abs(X[:, k] - singles[k]).max() <= 1e-12 * np.abs(X).max()
    assert ls.relative_residual(A, X, B) <= 1e-12


@pytest.mark.skipif(not PARDISO, reason="pypardiso (MKL) is not installed on this platform")
def test_pardiso_and_superlu_agree(system):
    A, b = system
    xp = ls.factorize(A, "pardiso").solve(b)
    xs = ls.factorize(A, "superlu").solve(b)
    assert np.linalg.norm(xp - xs) <= 1e-10 * np.linalg.norm(xs)


def test_cg_converges_on_the_true_residual(system):
    """With a working preconditioner CG stops once |b - A x| / |b| <= rtol, and not later
    than one iteration after (the residual is checked every iteration)."""
    A, b = system
    d = 1.0 / A.diagonal()
    res = ls.cg_amg(A, b, None, rtol=1e-8, maxiter=2000, preconditioner=lambda r: d * r)
    assert res.outcome == "converged"
    true = ls.relative_residual(A, res.x, b)
    assert true == pytest.approx(res.residual, rel=1e-6) and true <= 1e-8
    again = ls.cg_amg(A, b, None, rtol=1e-8, maxiter=res.iterations - 1,
                      preconditioner=lambda r: d * r)
    assert again.outcome == "not-reached"


def test_cg_stops_at_stagnation(system):
    """An unreachable tolerance (below round-off): CG must stop by the stagnation rule soon
    after the residual stops falling, far short of its iteration cap, and hand back its
    best iterate."""
    A, b = system
    d = 1.0 / A.diagonal()
    res = ls.cg_amg(A, b, None, rtol=1e-30, maxiter=5000, preconditioner=lambda r: d * r)
    assert res.outcome == "stagnated"
    assert ls.STAGNATION_WINDOW <= res.iterations < 1000
    assert res.residual <= 1e-12
    assert ls.relative_residual(A, res.x, b) == pytest.approx(res.residual, rel=1e-6)


def test_memory_switch_and_records(system, monkeypatch):
    """Direct while the estimated factor fits the available memory; above it AMG-CG, and
    the skipped direct solve is recorded with the reason."""
    A, b = system
    modes = lambda: np.ones((A.shape[0], 1))  # noqa: E731  (the Laplacian's near-null space)
    x, attempts = ls.solve_spd(A, b, modes)
    assert [a.outcome for a in attempts] == ["answer"]
    assert attempts[0].solver == ls.direct_solvers()[0] and attempts[0].residual <= 1e-12
    monkeypatch.setattr(ls, "available_memory", lambda: 1000)
    xi, attempts = ls.solve_spd(A, b, modes)
    assert [(a.solver, a.outcome) for a in attempts] == [(ls.direct_solvers()[0], "too-large"),
                                                         ("amg-cg", "answer")]
    assert "GiB" in attempts[0].note
    assert attempts[1].iterations > 0 and attempts[1].residual <= ls.CG_RTOL
    assert np.linalg.norm(xi - x) <= 1e-6 * np.linalg.norm(x)


def test_failed_cg_falls_back_to_direct(system, monkeypatch):
    """CG that does not reach its tolerance: the direct solve gives the answer, and both
    attempts are recorded (CG's iterations and residual kept)."""
    A, b = system
    real = ls.cg_amg
    monkeypatch.setattr(ls, "cg_amg", lambda A, b, modes: real(A, b, modes, maxiter=2))
    x, attempts = ls.solve_spd(A, b, lambda: np.ones((A.shape[0], 1)), "iterative")
    assert [a.outcome for a in attempts] == ["not-reached", "answer"]
    assert attempts[0].solver == "amg-cg" and attempts[0].iterations == 2
    assert attempts[0].residual > ls.CG_RTOL
    assert ls.relative_residual(A, x, b) <= 1e-12


def test_fast_package_unimportable(system, monkeypatch):
    """Without pypardiso the direct solver is SuperLU, and asking for PARDISO is refused."""
    import sys

    monkeypatch.setitem(sys.modules, "pypardiso", None)
    assert ls.direct_solvers() == ("superlu",)
    A, b = system
    _, attempts = ls.solve_spd(A, b)
    assert attempts[-1].solver == "superlu"
    with pytest.raises(ValueError, match="pypardiso"):
        ls.factorize(A, "pardiso")


def test_estimate_grows_with_size():
    small, large = laplacian_2d(20), laplacian_2d(80)
    for s in ("pardiso", "superlu"):
        assert 0 < ls.estimate_factor_bytes(small, s) < ls.estimate_factor_bytes(large, s)
    assert ls.available_memory() > 0


def test_unknown_choices_refused(system):
    A, b = system
    with pytest.raises(ValueError, match="unknown direct solver"):
        ls.factorize(A, "cholesky")
    with pytest.raises(ValueError, match="unknown method"):
        ls.solve_spd(A, b, method="fastest")
    with pytest.raises(ValueError, match="near-null space"):
        ls.solve_spd(A, b, method="iterative")
