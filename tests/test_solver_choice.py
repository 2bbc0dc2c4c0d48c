"""The fast stiffness assembly and the solver choice of `fem.member.solve` (correctness, not speed).

The element kernel must reproduce scikit-fem's generic assembly of the same weak form
int t (2 mu eps(u) : eps(v) + lam div u div v) (plane elasticity, common practice), on
straight and curved elements; the AMG-CG path must give the direct solution.
"""

from __future__ import annotations

import numpy as np
import pytest
from conftest import CANTILEVER
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

import fem.member.solve as fs
from fem.case import parse_case
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
    """AMG-CG on the rigid-body modes reaches the direct solution of the condensed system."""
    case, mm = cantilever
    sol = fs.solve_member(case, mm)
    free = np.delete(np.arange(sol.basis.N), sol.fixed)
    A, b = sol.K[free][:, free], sol.f[free]
    direct, its_direct = fs.solve_linear(A, b, "direct")
    amg, its = fs.solve_linear(A, b, "amg", fs.rigid_body_modes(sol.basis, free))
    assert its_direct == 0 and 0 < its < fs.CG_MAXITER
    assert np.abs(amg - direct).max() <= 1e-7 * np.abs(direct).max()


def test_solver_chosen_by_size(cantilever, monkeypatch):
    """Above DIRECT_LIMIT free dofs solve_member uses AMG-CG and gets the same answer."""
    case, mm = cantilever
    direct = fs.solve_member(case, mm)
    assert direct.solver == "direct" and direct.iterations == 0
    monkeypatch.setattr(fs, "DIRECT_LIMIT", 10)
    amg = fs.solve_member(case, mm)
    assert amg.solver == "amg" and amg.iterations > 0
    assert np.abs(amg.u - direct.u).max() <= 1e-7 * np.abs(direct.u).max()
    for name, r in direct.reactions.items():
        assert amg.reactions[name] == pytest.approx(r, rel=1e-6, abs=1e-6 * 10000.0)


def test_stalled_cg_falls_back_to_direct(cantilever, monkeypatch):
    """If CG stops above the residual limit, the direct solve takes over."""
    case, mm = cantilever
    monkeypatch.setattr(fs, "DIRECT_LIMIT", 10)
    monkeypatch.setattr(fs, "CG_MAXITER", 1)
    sol = fs.solve_member(case, mm)
    assert sol.solver == "direct"
    assert sol.equilibrium_error < 1e-8


def test_unknown_solver_refused():
    A = fs.sp.identity(3, format="csr")
    with pytest.raises(ValueError, match="unknown solver"):
        fs.solve_linear(A, np.ones(3), "amg")  # no rigid-body modes
    with pytest.raises(ValueError, match="unknown solver"):
        fs.solve_linear(A, np.ones(3), "cholesky")
