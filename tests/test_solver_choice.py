"""The fast stiffness assembly and the solver choice of `fem.member.solve` (correctness, not speed).

The element kernel must reproduce scikit-fem's generic assembly of the same weak form
int t (2 mu eps(u) : eps(v) + lam div u div v) (plane elasticity, common practice), on
straight and curved elements; the AMG-CG path must give the direct solution; the fast
direct solver (PARDISO) must give SuperLU's answer, and a run without it must still pass
and say so in results.json.
"""

from __future__ import annotations

import json
import sys

import numpy as np
import pytest
from conftest import CANTILEVER, ROOT
from skfem import (
    Basis,
    BilinearForm,
    ElementTriP1,
    ElementTriP2,
    ElementVector,
    MeshTri1,
    MeshTri2,
    asm,
)
from skfem.helpers import ddot, sym_grad, trace

import fem.linear_solver as ls
import fem.member.solve as fs
from fem.api import check, write_outputs
from fem.case import load_case, parse_case
from fem.case.sizing import level_size
from fem.member.mesh import mesh_member


@BilinearForm
def generic_stiffness(u, v, w):
    eu, ev = sym_grad(u), sym_grad(v)
    return w.thk * (2.0 * w.mu * ddot(eu, ev) + w.lam * trace(eu) * trace(ev))


def _meshes():
    straight = MeshTri1.init_symmetric().refined(2)
    straight = straight.translated((0.3, -0.2)).scaled((2.0, 0.7))  # non-unit Jacobians
    curved = MeshTri2.init_circle(2)                                  # isoparametric P2
    return [(straight, ElementTriP1(), 2), (straight, ElementTriP2(), 4),
            (curved, ElementTriP2(), 4)]


@pytest.mark.parametrize("mesh, elem, intorder", _meshes())
def test_kernel_matches_generic_assembly(mesh, elem, intorder):
    """Same matrix as the generic form, with a different thickness on every element."""
    basis = Basis(mesh, ElementVector(elem), intorder=intorder)
    lam, mu = fs.lame(210e3, 0.3, "plane-stress")
    thk = 1.0 + np.arange(mesh.nelements) % 5
    K = fs.assemble_stiffness(basis, fs.element_stiffness(basis, lam, mu, thk))
    ref = asm(generic_stiffness, basis, lam=lam, mu=mu,
              thk=np.repeat(thk[:, None], basis.X.shape[1], axis=1)).tocsr()
    assert K.shape == ref.shape
    assert abs(K - ref).max() <= 1e-12 * abs(ref).max()


def test_rigid_body_modes_are_the_null_space():
    """The unconstrained stiffness does no work on translations and the rotation."""
    mesh = MeshTri2.init_circle(2)
    basis = Basis(mesh, ElementVector(ElementTriP2()), intorder=4)
    K = fs.assemble_stiffness(basis, fs.element_stiffness(basis, 1.0, 1.0,
                                                          np.ones(mesh.nelements)))
    B = fs.rigid_body_modes(basis, np.arange(basis.N))
    assert np.abs(K @ B).max() <= 1e-10 * abs(K).max() * np.abs(B).max()
    assert np.linalg.matrix_rank(B) == 3


@pytest.fixture(scope="module")
def cantilever():
    case = parse_case(CANTILEVER.format(length=400.0, size=20.0, levels=1, cuts="[200.0]"),
                      "cantilever.toml")
    return case, mesh_member(case)


def test_amg_matches_direct(cantilever):
    """AMG-CG on the rigid-body modes reaches the direct solution of the condensed system
    (its true relative residual within fem.linear_solver.CG_RTOL)."""
    case, mm = cantilever
    sol = fs.solve_member(case, mm)
    free = np.delete(np.arange(sol.basis.N), sol.fixed)
    A, b = sol.K[free][:, free], sol.f[free]
    direct, its_direct = fs.solve_linear(A, b, "direct")
    amg, its = fs.solve_linear(A, b, "amg", fs.rigid_body_modes(sol.basis, free))
    assert its_direct == 0 and 0 < its < ls.CG_MAXITER
    assert ls.relative_residual(A, amg, b) <= ls.CG_RTOL
    assert np.abs(amg - direct).max() <= 1e-6 * np.abs(direct).max()


def test_solver_chosen_by_memory(cantilever, monkeypatch):
    """When the estimated factor does not fit the available memory, solve_member uses
    AMG-CG, records the skipped direct solve, and gets the same answer."""
    case, mm = cantilever
    direct = fs.solve_member(case, mm)
    assert direct.solver == ls.direct_solvers()[0] and direct.iterations == 0
    assert [a.outcome for a in direct.attempts] == ["answer"]
    monkeypatch.setattr(ls, "available_memory", lambda: 10**6)
    amg = fs.solve_member(case, mm)
    assert amg.solver == "amg-cg" and amg.iterations > 0
    assert [a.outcome for a in amg.attempts] == ["too-large", "answer"]
    assert np.abs(amg.u - direct.u).max() <= 1e-6 * np.abs(direct.u).max()
    for name, r in direct.reactions.items():
        assert amg.reactions[name] == pytest.approx(r, rel=1e-6, abs=1e-6 * 10000.0)


def test_stalled_cg_falls_back_to_direct(cantilever, monkeypatch):
    """If CG stops above its tolerance, the direct solve takes over and both are recorded."""
    case, mm = cantilever
    real = ls.cg_amg
    monkeypatch.setattr(fs, "SOLVE_METHOD", "iterative")
    monkeypatch.setattr(ls, "cg_amg", lambda A, b, modes: real(A, b, modes, maxiter=1))
    sol = fs.solve_member(case, mm)
    assert sol.solver == ls.direct_solvers()[0]
    assert [(a.solver, a.outcome, a.iterations) for a in sol.attempts][0] == \
        ("amg-cg", "not-reached", 1)
    assert sol.attempts[0].residual > ls.CG_RTOL
    assert sol.equilibrium_error < 1e-8


BUNDLED = ROOT / "cases" / "web-opening-beam.toml"


@pytest.mark.skipif("pardiso" not in ls.direct_solvers(),
                    reason="pypardiso (MKL) is not installed on this platform")
def test_fast_solver_equals_fallback_on_a_bundled_case(monkeypatch):
    """PARDISO and SuperLU give the same displacements (relative difference <= 1e-10) on a
    bundled case; the condensed stiffness is SPD and well enough conditioned that two
    direct solvers agree to round-off."""
    case = load_case(BUNDLED)
    mm = mesh_member(case, level_size(case, 0))
    fast = fs.solve_member(case, mm)
    assert fast.solver == "pardiso"
    monkeypatch.setattr(ls, "direct_solvers", lambda: ("superlu",))
    slow = fs.solve_member(case, mm)
    assert slow.solver == "superlu"
    assert np.linalg.norm(fast.u - slow.u) <= 1e-10 * np.linalg.norm(slow.u)


def test_run_without_the_fast_package(monkeypatch, tmp_path):
    """With pypardiso unimportable a bundled case still runs, gives the same verdict and
    records SuperLU in results.json (mesh.solver, mesh.solve_attempts)."""
    case = load_case(BUNDLED).with_mesh(levels=1)
    with_fast = check(case)
    monkeypatch.setitem(sys.modules, "pypardiso", None)
    res = check(case)
    assert res.verdict == with_fast.verdict
    write_outputs(res, tmp_path, report=False)
    mesh = json.loads((tmp_path / "results.json").read_text())["mesh"]
    assert mesh["solver"] == "superlu" and mesh["iterations"] == 0
    assert [(a["solver"], a["outcome"]) for a in mesh["solve_attempts"]] == \
        [("superlu", "answer")]
    assert mesh["solve_attempts"][0]["residual"] < 1e-10


def test_unknown_solver_refused():
    A = fs.sp.identity(3, format="csr")
    with pytest.raises(ValueError, match="unknown solver"):
        fs.solve_linear(A, np.ones(3), "amg")  # no rigid-body modes
    with pytest.raises(ValueError, match="unknown"):
        fs.solve_linear(A, np.ones(3), "cholesky")
