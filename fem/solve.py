"""Plane elasticity on a meshed member: forms, supports, loads, solve and reactions.

Plane stress uses lambda* = E nu / (1 - nu^2) (not the 3D lambda, see FEM-NOTES), plane
strain the 3D lambda. The out-of-plane thickness enters the stiffness element by element
(zones). Loads are assembled as force per unit length of boundary and scaled so that each
resultant equals the stated force to round-off. The direct solve uses SuperLU with the
symmetric minimum-degree ordering (measured 2-3.5x faster than the default here).
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import splu
from skfem import Basis, BilinearForm, ElementTriP2, ElementVector, FacetBasis, LinearForm, asm
from skfem.element import ElementTriP1
from skfem.helpers import ddot, sym_grad, trace

from .case import Case, Load
from .errors import SolveError
from .mesh import MemberMesh
from .plane import Patch, check_mechanism

__all__ = ["Solution", "lame", "solve_member", "check_mechanism", "RESIDUAL_LIMIT"]

RESIDUAL_LIMIT = 1e-6  # |K u - f| / |f| on the free dofs above this: the solve is not trusted


@dataclass
class Solution:
    """Displacements and what was needed to get them."""

    basis: Basis
    u: np.ndarray
    K: sp.csr_matrix
    f: np.ndarray
    fixed: np.ndarray                       # constrained dofs
    reactions: dict[str, tuple[float, float]]  # support name -> (Rx, Ry)
    applied: tuple[float, float]
    lam: float
    mu: float
    seconds_assemble: float
    seconds_solve: float

    @property
    def reaction_total(self) -> tuple[float, float]:
        rx = sum(r[0] for r in self.reactions.values())
        ry = sum(r[1] for r in self.reactions.values())
        return (rx, ry)

    load_scale: float = 1.0                 # sum of |F| over the loads

    @property
    def equilibrium_error(self) -> float:
        """|applied + reactions| / sum |F_i| (loads may be self-equilibrated)."""
        a, r = np.array(self.applied), np.array(self.reaction_total)
        return float(np.linalg.norm(a + r) / max(self.load_scale, 1e-300))


def lame(E: float, nu: float, model: str) -> tuple[float, float]:
    """(lambda, mu) for plane stress (lambda* = E nu/(1-nu^2)) or plane strain."""
    mu = E / (2.0 * (1.0 + nu))
    if model == "plane-strain":
        return E * nu / ((1.0 + nu) * (1.0 - 2.0 * nu)), mu
    return E * nu / (1.0 - nu**2), mu


@BilinearForm
def _stiffness(u, v, w):
    eu, ev = sym_grad(u), sym_grad(v)
    return w.thk * (2.0 * w.mu * ddot(eu, ev) + w.lam * trace(eu) * trace(ev))


def _load_vector(basis: Basis, mm: MemberMesh, load: Load, patch: Patch,
                 case: Case) -> np.ndarray:
    F = np.asarray(load.force, float)
    mag = float(np.hypot(*F))
    if mag == 0.0:
        return np.zeros(basis.N)
    d = F / mag
    if patch.point is not None:
        f = np.zeros(basis.N)
        dofs = basis.nodal_dofs[:, mm.points[patch.name]]
        f[dofs] = F
        return f
    fb = FacetBasis(mm.mesh, basis.elem, facets=mm.boundaries[patch.name],
                    intorder=2 * mm.order + 2)
    if patch.hole is not None:
        c = np.asarray(case.geometry.holes[patch.hole].center)

        @LinearForm
        def bearing(v, w):
            rx, ry = w.x[0] - c[0], w.x[1] - c[1]
            r = np.sqrt(rx**2 + ry**2)
            p = np.maximum(0.0, (rx * d[0] + ry * d[1]) / r)
            return p * (rx / r * v[0] + ry / r * v[1])

        raw = asm(bearing, fb)
    else:
        (a, b) = _span(patch)
        axis = (b - a) / max(np.linalg.norm(b - a), 1e-300)
        L = float(np.dot(b - a, axis))
        parabolic = load.distribution == "parabolic"

        @LinearForm
        def traction(v, w):
            if parabolic:
                s = ((w.x[0] - a[0]) * axis[0] + (w.x[1] - a[1]) * axis[1]) / L
                q = np.clip(s * (1.0 - s), 0.0, None)
            else:
                q = 1.0 + 0.0 * w.x[0]
            return q * (d[0] * v[0] + d[1] * v[1])

        raw = asm(traction, fb)
    ix, iy = basis.split_indices()
    res = np.array([raw[ix].sum(), raw[iy].sum()])
    along = float(res @ d)
    if along <= 0:
        raise SolveError(f"the load {patch.name} could not be applied on its stretch")
    return raw * (mag / along)


def _span(patch: Patch) -> tuple[np.ndarray, np.ndarray]:
    pts = np.array(patch.ends, float)
    a0 = pts[0]
    direction = pts[np.argmax(np.linalg.norm(pts - a0, axis=1))] - a0
    s = (pts - a0) @ direction
    return pts[np.argmin(s)], pts[np.argmax(s)]


def _support_dofs(basis: Basis, mm: MemberMesh, fix: str, patch: Patch) -> np.ndarray:
    comps = [i for i, c in enumerate("xy") if c in fix]
    if patch.point is not None:
        return basis.nodal_dofs[comps, mm.points[patch.name]].ravel()
    facets = mm.boundaries[patch.name]
    view = basis.get_dofs(facets=facets)
    return np.concatenate([view.all(f"u^{i + 1}") for i in comps])


def solve_member(case: Case, mm: MemberMesh) -> Solution:
    """Assemble, constrain, solve; reactions from K u - f on the constrained dofs."""
    check_mechanism(case, mm.supports)
    t0 = time.perf_counter()
    elem = ElementVector(ElementTriP2() if mm.order == 2 else ElementTriP1())
    basis = Basis(mm.mesh, elem, intorder=2 * mm.order)
    lam, mu = lame(case.material.E, case.material.nu, case.material.model)
    nqp = basis.X.shape[1]
    thk = np.repeat(mm.thickness[:, None], nqp, axis=1)
    K = asm(_stiffness, basis, lam=lam, mu=mu, thk=thk).tocsr()
    f = np.zeros(basis.N)
    for load, patch in zip(case.loads, mm.loads, strict=True):
        f += _load_vector(basis, mm, load, patch, case)
    fixed_by = {s.name: _support_dofs(basis, mm, sup.fix, s)
                for sup, s in zip(case.supports, mm.supports, strict=True)}
    fixed = np.unique(np.concatenate(list(fixed_by.values())))
    t1 = time.perf_counter()
    free = np.setdiff1d(np.arange(basis.N), fixed)
    u = np.zeros(basis.N)
    Kff = K[free][:, free].tocsc()
    try:
        lu = splu(Kff, permc_spec="MMD_AT_PLUS_A", options={"SymmetricMode": True})
        u[free] = lu.solve(f[free])
    except RuntimeError as exc:
        raise SolveError(f"the stiffness matrix is singular ({exc}); the supports probably "
                         "leave part of the member free to move") from None
    if not np.all(np.isfinite(u)):
        raise SolveError("the solve gave non-finite displacements; check E, nu and supports")
    residual = float(np.linalg.norm(Kff @ u[free] - f[free]) /
                     max(float(np.linalg.norm(f[free])), 1e-300))
    if not residual <= RESIDUAL_LIMIT:
        raise SolveError(f"the stiffness matrix is singular or nearly so: the solution leaves a "
                         f"relative residual of {residual:.2g} (limit {RESIDUAL_LIMIT:g}); the "
                         "supports may leave part of the member free to move, or the "
                         "thicknesses and E span too many orders of magnitude")
    t2 = time.perf_counter()
    r = K @ u - f
    reactions: dict[str, tuple[float, float]] = {}
    owned: set[int] = set()
    xdofs = set(basis.split_indices()[0].tolist())
    for name, dofs in fixed_by.items():
        mine = [int(i) for i in dofs if int(i) not in owned]
        owned.update(mine)
        rx = float(sum(r[i] for i in mine if i in xdofs))
        ry = float(sum(r[i] for i in mine if i not in xdofs))
        reactions[name] = (rx, ry)
    applied = (float(f[list(xdofs)].sum()), float(f.sum() - f[list(xdofs)].sum()))
    return Solution(basis=basis, u=u, K=K, f=f, fixed=fixed, reactions=reactions,
                    applied=applied, lam=lam, mu=mu, seconds_assemble=t1 - t0,
                    seconds_solve=t2 - t1,
                    load_scale=sum(float(np.hypot(*ld.force)) for ld in case.loads))
