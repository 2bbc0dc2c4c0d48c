"""Plane elasticity on a meshed member: forms, supports, loads, solve and reactions.

Plane stress uses lambda* = E nu / (1 - nu^2) (not the 3D lambda, see FEM-NOTES), plane
strain the 3D lambda. The out-of-plane thickness enters the stiffness element by element
(zones). Loads are assembled as force per unit length of boundary and scaled so that each
resultant equals the stated force to round-off.

The stiffness is assembled from element matrices computed for all elements at once
(`element_stiffness`), not through a generic weak form. The condensed system is solved by
`fem.linear_solver.solve_spd`: a direct factorisation (PARDISO when pypardiso is importable,
else SuperLU in symmetric mode) when its estimated memory fits, else AMG-CG on the three
rigid-body modes with the direct solve behind it; every attempt is kept in
`Solution.attempts` (results.json `mesh.solve_attempts`). bench/bench_speed.py measures both
against the generic route.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
from skfem import Basis, ElementTriP2, ElementVector, FacetBasis, LinearForm, asm
from skfem.element import ElementTriP1

from fem.case.model import Case, Load
from fem.case.outline import Patch, check_mechanism
from fem.errors import SolveError
from fem.linear_solver import Attempt, cg_amg, factorize, solve_spd
from fem.member.mesh import MemberMesh

__all__ = ["Solution", "lame", "solve_member", "check_mechanism", "RESIDUAL_LIMIT",
           "SOLVE_METHOD", "element_stiffness", "assemble_stiffness", "rigid_body_modes",
           "solve_linear"]

RESIDUAL_LIMIT = 1e-6  # |K u - f| / |f| on the free dofs above this: the solve is not trusted
# "auto": direct while the estimated factor memory fits the memory available, else AMG-CG
# (fem.linear_solver.solve_spd); "direct" / "iterative" force one (the benchmark does)
SOLVE_METHOD = "auto"


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
    attempts: tuple[Attempt, ...] = ()      # every solver tried, the answer's last

    @property
    def solver(self) -> str:
        """The solver that produced u: "pardiso", "superlu" or "amg-cg"."""
        return self.attempts[-1].solver if self.attempts else "superlu"

    @property
    def iterations(self) -> int:
        """CG iterations of the answer (0 for a direct solve)."""
        return self.attempts[-1].iterations if self.attempts else 0

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


def element_stiffness(basis: Basis, lam: float, mu: float,
                      thickness: np.ndarray) -> np.ndarray:
    """Element stiffness matrices of plane elasticity for every element at once.

    With scalar shape functions phi_a and displacement components i, j, the bilinear form
    int t (2 mu eps(u) : eps(v) + lam div u div v) gives the entries

        K[(a, i), (b, j)] = lam P[(i, a), (j, b)] + mu P[(j, a), (i, b)]
                            + mu delta_ij (P[(0, a), (0, b)] + P[(1, a), (1, b)])

    of the gradient products P[(i, a), (j, b)] = int t d_i phi_a d_j phi_b. P comes from one
    batched product over the basis's own quadrature and mapping (curved elements included);
    the element matrix is then a fixed linear map of P (`_stiffness_map`).

    Parameters
    ----------
    basis : skfem.Basis
        Vector basis (`ElementVector` of a scalar element); its local function 2a + c is
        component c of scalar function a.
    lam, mu : float
        Lame parameters (plane stress: lambda*).
    thickness : ndarray
        Out-of-plane thickness per element.

    Returns
    -------
    ndarray
        (nelems, Nbfun, Nbfun), rows and columns in the basis's local order.
    """
    ns = basis.Nbfun // 2
    grad = np.stack([basis.basis[2 * a][0].grad[0] for a in range(ns)], axis=1)
    nel, nq = grad.shape[2], grad.shape[3]
    g = grad.transpose(2, 0, 1, 3).reshape(nel, 2 * ns, nq)          # row i * ns + a
    w = basis.dx * np.asarray(thickness, float)[:, None]
    P = np.matmul(g * w[:, None, :], g.transpose(0, 2, 1)).reshape(nel, -1)
    return (P @ _stiffness_map(ns, lam, mu)).reshape(nel, 2 * ns, 2 * ns)


def _stiffness_map(ns: int, lam: float, mu: float) -> np.ndarray:
    """The constant matrix taking flattened P to the flattened element matrix (see above)."""
    nb = 2 * ns
    a, i, b, j = (x.ravel() for x in np.meshgrid(np.arange(ns), np.arange(2), np.arange(ns),
                                                 np.arange(2), indexing="ij"))
    k = (2 * a + i) * nb + 2 * b + j                                   # entry of K
    C = np.zeros((nb * nb, nb * nb))
    C[(i * ns + a) * nb + j * ns + b, k] += lam
    C[(j * ns + a) * nb + i * ns + b, k] += mu
    d = i == j
    for c in range(2):
        C[(c * ns + a[d]) * nb + c * ns + b[d], k[d]] += mu
    return C


def assemble_stiffness(basis: Basis, Ke: np.ndarray) -> sp.csr_matrix:
    """Global CSR matrix from element matrices (nelems, Nbfun, Nbfun) of `basis`."""
    dofs = basis.element_dofs.T.astype(np.int32)                      # (nelems, Nbfun)
    nb = dofs.shape[1]
    rows = np.repeat(dofs, nb, axis=1).ravel()
    cols = np.tile(dofs, (1, nb)).ravel()
    return sp.coo_matrix((Ke.ravel(), (rows, cols)), shape=(basis.N, basis.N)).tocsr()


def rigid_body_modes(basis: Basis, dofs: np.ndarray) -> np.ndarray:
    """Translations in x, y and the rotation about the centroid at `dofs`: (len(dofs), 3)."""
    comp = np.zeros(basis.N, dtype=np.int64)
    comp[basis.split_indices()[1]] = 1
    xy = basis.doflocs[:, dofs]
    xy = xy - xy.mean(axis=1, keepdims=True)
    c = comp[dofs]
    B = np.zeros((len(dofs), 3))
    B[c == 0, 0] = 1.0
    B[c == 1, 1] = 1.0
    B[:, 2] = np.where(c == 0, -xy[1], xy[0])
    return B


def solve_linear(A: sp.csr_matrix, b: np.ndarray, method: str = "direct",
                 modes: np.ndarray | None = None) -> tuple[np.ndarray, int]:
    """Solve the symmetric positive definite system A x = b by one named route.

    Parameters
    ----------
    A : csr_matrix
        The condensed stiffness matrix.
    b : ndarray
        Right-hand side.
    method : {"direct", "pardiso", "superlu", "amg"}
        "direct": the preferred direct solver (`fem.linear_solver.factorize`); "pardiso" or
        "superlu" force one; "amg": `fem.linear_solver.cg_amg` (conjugate gradients with
        smoothed-aggregation AMG on the rigid-body modes, true-residual and stagnation
        stops).
    modes : ndarray, optional
        (n, 3) rigid-body modes (`rigid_body_modes`), required for "amg".

    Returns
    -------
    (x, CG iterations); 0 iterations for a direct solve.
    """
    if method in ("direct", "pardiso", "superlu"):
        with factorize(A, None if method == "direct" else method) as factor:
            return factor.solve(b), 0
    if method != "amg" or modes is None:
        raise ValueError(f"unknown solver {method!r}, or AMG without rigid-body modes")
    res = cg_amg(A, b, modes)
    return res.x, res.iterations


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
    # a straight patch is integrated on the straight-sided twin (same dofs, same facets):
    # exact on a straight edge, and it avoids inverting badly curved neighbours
    host = mm.mesh if patch.hole is not None else mm.finder_mesh
    fb = FacetBasis(host, basis.elem, facets=mm.boundaries[patch.name],
                    intorder=2 * mm.order + 2)
    if patch.hole is not None:
        c = np.asarray(case.beam.holes[patch.hole].center)

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


def _relative_residual(A: sp.csr_matrix, x: np.ndarray, b: np.ndarray) -> float:
    return float(np.linalg.norm(A @ x - b) / max(float(np.linalg.norm(b)), 1e-300))


def solve_member(case: Case, mm: MemberMesh) -> Solution:
    """Assemble, constrain, solve; reactions from K u - f on the constrained dofs."""
    check_mechanism(case, mm.supports)
    t0 = time.perf_counter()
    elem = ElementVector(ElementTriP2() if mm.order == 2 else ElementTriP1())
    basis = Basis(mm.mesh, elem, intorder=2 * mm.order)
    lam, mu = lame(case.material.E, case.material.nu, case.material.model)
    K = assemble_stiffness(basis, element_stiffness(basis, lam, mu, mm.thickness))
    f = np.zeros(basis.N)
    for load, patch in zip(case.loads, mm.loads, strict=True):
        f += _load_vector(basis, mm, load, patch, case)
    fixed_by = {s.name: _support_dofs(basis, mm, sup.fix, s)
                for sup, s in zip(case.supports, mm.supports, strict=True)}
    fixed = np.unique(np.concatenate(list(fixed_by.values())))
    t1 = time.perf_counter()
    is_free = np.ones(basis.N, dtype=bool)
    is_free[fixed] = False
    free = np.flatnonzero(is_free)  # not setdiff1d: numpy 2.4's integer unique is slow here
    u = np.zeros(basis.N)
    Kff = K[free][:, free]  # measured faster than masking the stored entries
    try:
        u[free], attempts = solve_spd(Kff, f[free], lambda: rigid_body_modes(basis, free),
                                      SOLVE_METHOD)
    except RuntimeError as exc:
        raise SolveError(f"the stiffness matrix is singular ({exc}); the supports probably "
                         "leave part of the member free to move") from None
    if not np.all(np.isfinite(u)):
        raise SolveError("the solve gave non-finite displacements; check E, nu and supports")
    residual = _relative_residual(Kff, u[free], f[free])
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
                    load_scale=sum(float(np.hypot(*ld.force)) for ld in case.loads),
                    attempts=tuple(attempts))
