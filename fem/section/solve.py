r"""Saint-Venant torsion and flexure of a prismatic bar, solved on a section mesh.

Coordinates x, y below are measured from the centroid (computed on the mesh with the same
quadrature as everything else, so the discrete problems are exactly compatible).

**Torsion** (Timoshenko & Goodier, *Theory of Elasticity*, 3rd ed., ch. 10, warping form):
the warping function :math:`\omega` solves :math:`\nabla^2\omega = 0` with
:math:`\partial\omega/\partial n = y n_x - x n_y` on every boundary.  By the divergence
theorem the weak form needs no boundary integral,
:math:`\int\nabla\omega\cdot\nabla v\,dA = \int (y v_{,x} - x v_{,y})\,dA`, and

.. math:: J = I_{xx} + I_{yy} - \int \nabla\omega\cdot\nabla\omega \, dA, \qquad
          \tau_{zx} = G\theta(\omega_{,x} - y), \quad \tau_{zy} = G\theta(\omega_{,y} + x).

**Flexure** (Saint-Venant flexure without twist; Timoshenko & Goodier §§118-124, written in
the displacement form in which :math:`\tau = G(\nabla w + \partial_z(u, v))`).  With the
bending stress rate :math:`\partial\sigma_z/\partial z = a x + b y`, equilibrium
:math:`\int x(ax+by)\,dA = V_x`, :math:`\int y(ax+by)\,dA = V_y` gives

.. math:: \begin{bmatrix} a \\ b \end{bmatrix} =
          \begin{bmatrix} I_{yy} & I_{xy} \\ I_{xy} & I_{xx} \end{bmatrix}^{-1}
          \begin{bmatrix} V_x \\ V_y \end{bmatrix}

(the full inverse: coupled bending for :math:`I_{xy} \ne 0`).  The shear stress is
:math:`\tau = \nabla\Phi + h` with the Poisson-ratio field from the transverse
displacements of the bending solution,

.. math:: h = -\frac{\nu}{2(1+\nu)}\Big(a\tfrac{x^2-y^2}{2} + b x y,\;
          b\tfrac{y^2-x^2}{2} + a x y\Big),

which gives :math:`\operatorname{curl}\tau = \frac{\nu}{1+\nu}(b x - a y)` (Beltrami-Michell
compatibility, zero rotation rate at the centroid).  :math:`\Phi` solves the pure-Neumann
problem :math:`\operatorname{div}\tau = -(a x + b y)`, :math:`\tau\cdot n = 0`, weakly
:math:`\int\nabla\Phi\cdot\nabla v = \int (a x + b y) v - \int h\cdot\nabla v`.

All three problems share the Laplacian stiffness K, factorised once for the three
right-hand sides; the free constant is fixed by a Lagrange multiplier (the constraint
:math:`\int u\,dA = 0`, one extra row/column :math:`\int\phi_i\,dA`), solved without
the dense row in the factorisation, see :func:`_solve_neumann`.

**Shear centre.**  ``shear_centre`` is the warping-based (Trefftz) centre: the point S about
which the torsion warping is orthogonal to x and y, i.e.
:math:`I_{\omega x} - y_S I_{yy} + x_S I_{xy} = 0`,
:math:`I_{\omega y} - y_S I_{xy} + x_S I_{xx} = 0` with :math:`I_{\omega x} = \int\omega x\,dA`.
It is independent of ν and equals the point of action of the ν = 0 flexure stresses
(reciprocal theorem, exact also for the discrete solutions).  ``shear_centre_nu`` is the
point of action of the flexure stresses at the given ν (their moment about the centroid),
the flexure-stress definition (Timoshenko & Goodier, bending of prismatic bars); the two
differ slightly for unsymmetric sections.

**Shear coefficients** (energy definition): for a unit shear along x (y),
:math:`k = 1 / (A \int |\tau|^2 dA)`, i.e. the shear strain energy equals
:math:`V^2/(2 G k A)`.  Not Cowper's (1966) coefficient, which averages displacements;
the two agree at ν = 0 for the rectangle (5/6) and the circle (6/7).
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field

import numpy as np
import scipy.sparse as sp
from scipy.spatial import cKDTree
from skfem import Basis, BilinearForm, ElementTriP1, ElementTriP2, LinearForm

from fem.linear_solver import factorize
from fem.section.mesh import SectionMesh

__all__ = ["SectionSolution", "solve_section"]


@BilinearForm
def _laplace(u, v, w):
    return u.grad[0] * v.grad[0] + u.grad[1] * v.grad[1]


@LinearForm
def _ones(v, w):
    return v


def _poisson_h(x, y, a, b, nu):
    """The Poisson-ratio field h(x, y) for bending-rate coefficients (a, b)."""
    c = -nu / (2.0 * (1.0 + nu))
    return (c * (a * (x * x - y * y) / 2 + b * x * y), c * (b * (y * y - x * x) / 2 + a * x * y))


def _loads(c: np.ndarray, nu: float) -> list[LinearForm]:
    def xy(w):
        return w.x[0] - c[0], w.x[1] - c[1]

    @LinearForm
    def torsion(v, w):
        x, y = xy(w)
        return y * v.grad[0] - x * v.grad[1]

    def flexure(a, b):
        @LinearForm
        def form(v, w):
            x, y = xy(w)
            hx, hy = _poisson_h(x, y, a, b, nu)
            return (a * x + b * y) * v - hx * v.grad[0] - hy * v.grad[1]
        return form

    return [torsion, flexure(1.0, 0.0), flexure(0.0, 1.0)]


@dataclass(eq=False)
class SectionSolution:
    """Torsion and flexure results of one section mesh (fields at element corners).

    Attributes
    ----------
    A, centroid, Ixx, Iyy, Ixy
        Area properties integrated on the mesh (Ixx = int y^2 dA about the centroid).
    J
        Saint-Venant torsion constant [L^4].
    shear_centre, shear_centre_nu
        Warping-based (ν-independent) centre and flexure-stress centre at ν [L], global.
    shear_coefficients
        Energy shear coefficients (k_x, k_y); ``shear_flexibility`` the 2x2 matrix
        F_ij = int tau^(i) . tau^(j) dA for unit V_x (i=0), V_y (i=1) [1/L^2].
    corners
        (ne, 3, 2) coordinates of every element's corners.
    tau_vx, tau_vy
        (ne, 3, 2) [tau_zx, tau_zy] at the corners per unit V_x and per unit V_y [1/L^2].
    tau_torsion
        (ne, 3, 2) torsion stress per unit G*theta [L].
    resultant
        2x2: column j = (int tau_zx, int tau_zy) dA for unit load j (V_x, V_y); exact
        solution: the identity.
    residual
        Relative residual of the factorised saddle system.
    solver
        The direct solver that factorised it ("pardiso" or "superlu", `fem.linear_solver`).
    """

    mesh: SectionMesh
    nu: float
    A: float
    centroid: tuple[float, float]
    Ixx: float
    Iyy: float
    Ixy: float
    J: float
    shear_centre: tuple[float, float]
    shear_centre_nu: tuple[float, float]
    shear_coefficients: tuple[float, float]
    shear_flexibility: np.ndarray
    corners: np.ndarray
    tau_vx: np.ndarray
    tau_vy: np.ndarray
    tau_torsion: np.ndarray
    resultant: np.ndarray
    residual: float
    dofs: int
    timings: dict[str, float] = field(default_factory=dict)
    solver: str = "superlu"
    _basis: Basis | None = field(default=None, repr=False)
    _vectors: dict[str, np.ndarray] = field(default_factory=dict, repr=False)

    def stress(self, Vx: float, Vy: float) -> np.ndarray:
        """(ne, 3, 2) flexure shear stress [tau_zx, tau_zy] at element corners for (Vx, Vy)."""
        return Vx * self.tau_vx + Vy * self.tau_vy

    def quadrature_stress(self, Vx: float, Vy: float) -> tuple[np.ndarray, ...]:
        """Flexure stress at the quadrature points: (x, y, tau_zx, tau_zy, dA), each (ne, nq).

        For error norms and integrals: sum(f * dA) integrates f over the section.
        """
        b = self._basis
        gx, gy = np.asarray(b.global_coordinates())
        ab = Vx * self._vectors["ab_vx"] + Vy * self._vectors["ab_vy"]
        g = b.interpolate(ab[0] * self._vectors["phi_a"] + ab[1] * self._vectors["phi_b"]).grad
        hx, hy = _poisson_h(gx - self.centroid[0], gy - self.centroid[1], ab[0], ab[1], self.nu)
        return gx, gy, g[0] + hx, g[1] + hy, b.dx

    def torsion_stress(self, T: float) -> np.ndarray:
        """(ne, 3, 2) torsion shear stress for torque T (tau = T/J * tau_torsion)."""
        return T / self.J * self.tau_torsion

    def nodal(self, values: np.ndarray) -> np.ndarray:
        """Average corner values (ne, 3, k) over the elements at each vertex -> (nv, k)."""
        t = self.mesh.finder.t
        nv = self.mesh.finder.p.shape[1]
        count = np.bincount(t.ravel(), minlength=nv)
        flat = values.transpose(1, 0, 2).reshape(-1, values.shape[2])
        out = np.column_stack([np.bincount(t.ravel(), weights=flat[:, k], minlength=nv)
                               for k in range(values.shape[2])])
        return out / count[:, None]

    def probe(self, points: np.ndarray, Vx: float, Vy: float) -> np.ndarray:
        """Flexure shear stress [tau_zx, tau_zy] of the FE solution at points (n, 2) -> (n, 2).

        The element is found on the straight-sided twin mesh (for a point just outside,
        e.g. on a curved edge, the nearest element); the reference point follows from the
        inverse isoparametric map, and the P2 gradient is evaluated there exactly.
        """
        pts = np.atleast_2d(np.asarray(points, dtype=float))
        gx, gy = self._probe_gradients(pts)
        ab = Vx * self._vectors["ab_vx"] + Vy * self._vectors["ab_vy"]
        u = ab[0] * self._vectors["phi_a"] + ab[1] * self._vectors["phi_b"]
        x, y = pts[:, 0] - self.centroid[0], pts[:, 1] - self.centroid[1]
        hx, hy = _poisson_h(x, y, ab[0], ab[1], self.nu)
        return np.column_stack([gx @ u + hx, gy @ u + hy])

    def probe_torsion(self, points: np.ndarray) -> np.ndarray:
        """Torsion stress per unit G*theta at points (n, 2) -> (n, 2) [L]."""
        pts = np.atleast_2d(np.asarray(points, dtype=float))
        gx, gy = self._probe_gradients(pts)
        w = self._vectors["omega"]
        x, y = pts[:, 0] - self.centroid[0], pts[:, 1] - self.centroid[1]
        return np.column_stack([gx @ w - y, gy @ w + x])

    def _probe_gradients(self, pts: np.ndarray) -> tuple[sp.csr_matrix, sp.csr_matrix]:
        basis = self._basis
        cells, lam = _locate(self.mesh.finder, pts)
        X = lam[:, 1:].T[:, :, None]            # straight-sided guess, refined by Newton
        target = pts.T[:, :, None]
        if self.mesh.order == 2:
            for _ in range(8):                   # unclipped: points may sit just outside
                dX = np.einsum("ijkl,jkl->ikl", basis.mapping.invDF(X, tind=cells),
                               target - basis.mapping.F(X, tind=cells))
                X = X + dX
                if np.max(np.abs(dX)) < 1e-13:
                    break
        grads = np.array([basis.elem.gbasis(basis.mapping, X, k, tind=cells)[0].grad[:, :, 0]
                          for k in range(basis.Nbfun)])           # (nbfun, 2, n)
        rows = np.tile(np.arange(len(pts)), basis.Nbfun)
        cols = basis.element_dofs[:, cells].ravel()
        shape = (len(pts), basis.N)
        return tuple(sp.csr_matrix((grads[:, d, :].ravel(), (rows, cols)), shape=shape)
                     for d in range(2))


def _locate(m, pts: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Best element and barycentric coordinates of each point (vectorised)."""
    tri = m.p[:, m.t].transpose(2, 1, 0)  # (ne, 3, 2)
    tree = cKDTree(tri.mean(axis=1))
    k = min(16, len(tri))
    _, cand = tree.query(pts, k)
    cand = np.asarray(cand).reshape(len(pts), k)
    a, b, c = tri[cand, 0], tri[cand, 1], tri[cand, 2]       # (n, k, 2)
    v0, v1, v2 = b - a, c - a, pts[:, None, :] - a
    det = v0[..., 0] * v1[..., 1] - v0[..., 1] * v1[..., 0]
    l1 = (v2[..., 0] * v1[..., 1] - v2[..., 1] * v1[..., 0]) / det
    l2 = (v0[..., 0] * v2[..., 1] - v0[..., 1] * v2[..., 0]) / det
    lam = np.stack([1 - l1 - l2, l1, l2], axis=-1)             # (n, k, 3)
    best = np.argmax(lam.min(axis=-1), axis=1)
    rows = np.arange(len(pts))
    return cand[rows, best], lam[rows, best]


def _solve_neumann(K: sp.spmatrix, m: np.ndarray, F: np.ndarray, solver: str | None = None
                   ) -> tuple[np.ndarray, np.ndarray, float, str]:
    """Solve the multiplier system [[K, m], [m^T, 0]] [U; lam] = [F; 0] for several columns.

    K is the pure-Neumann Laplacian (K 1 = 0), so the multiplier follows from the constant
    test function: lam = 1^T F / 1^T m.  The compatible system K U = F - m lam is solved
    with one dof pinned (K minus that row and column is SPD; one factorisation by
    `fem.linear_solver.factorize` for all columns, `solver` forces one) and the constant is
    then shifted so that m^T U = 0.  This is the saddle-point solution itself, without the
    dense multiplier row in the factorisation (2-3x faster here at 30k-50k dofs; the two
    agree to 1e-12).  Returns U, lam, the relative residual of the full saddle system and
    the name of the direct solver used.
    """
    lam = F.sum(axis=0) / m.sum()
    G = F - np.outer(m, lam)
    U = np.zeros_like(F)
    with factorize(K[1:, 1:].tocsr(), solver) as factor:
        U[1:] = factor.solve(G[1:])
    U -= (m @ U) / m.sum()
    res = np.vstack([K @ U + np.outer(m, lam) - F, (m @ U)[None, :]])
    return U, lam, float(np.linalg.norm(res) / np.linalg.norm(F)), factor.name


def solve_section(mesh: SectionMesh, nu: float) -> SectionSolution:
    """Solve Saint-Venant torsion and both flexure problems on a section mesh.

    Parameters
    ----------
    mesh
        From :func:`fem.section.mesh.mesh_section` (order 1 -> P1, order 2 -> P2).
    nu
        Poisson's ratio, -1 < nu < 0.5 (enters the flexure stresses only).

    Returns
    -------
    SectionSolution
        Section constants and corner stress fields; see the module docstring for the
        formulation and definitions.
    """
    if not -1.0 < nu < 0.5:
        raise ValueError(f"nu must satisfy -1 < nu < 0.5, got {nu!r}")
    t0 = time.perf_counter()
    elem = ElementTriP2() if mesh.order == 2 else ElementTriP1()
    basis = Basis(mesh.mesh, elem, intorder=4 if mesh.order == 2 else 2)
    dx = basis.dx
    gx, gy = np.asarray(basis.global_coordinates())
    A = float(dx.sum())
    c = np.array([np.sum(gx * dx), np.sum(gy * dx)]) / A
    x, y = gx - c[0], gy - c[1]
    Ixx, Iyy, Ixy = (float(np.sum(q * dx)) for q in (y * y, x * x, x * y))
    K = _laplace.assemble(basis)
    m = _ones.assemble(basis)
    F = np.column_stack([f.assemble(basis) for f in _loads(c, nu)])
    t1 = time.perf_counter()
    U, _, residual, solver = _solve_neumann(K, m, F)
    omega, phi_a, phi_b = U[:, 0], U[:, 1], U[:, 2]
    t2 = time.perf_counter()

    Iinv = np.linalg.inv(np.array([[Iyy, Ixy], [Ixy, Ixx]]))
    ab_vx, ab_vy = Iinv[:, 0], Iinv[:, 1]

    def grad_q(u):  # gradient at quadrature points
        return basis.interpolate(u).grad

    def tau_q(ab):
        g = ab[0] * grad_q(phi_a) + ab[1] * grad_q(phi_b)
        hx, hy = _poisson_h(x, y, ab[0], ab[1], nu)
        return g[0] + hx, g[1] + hy

    taus = [tau_q(ab_vx), tau_q(ab_vy)]
    resultant = np.array([[np.sum(t[k] * dx) for t in taus] for k in range(2)])
    flex = np.array([[np.sum((ti[0] * tj[0] + ti[1] * tj[1]) * dx) for tj in taus]
                     for ti in taus])
    moment = [float(np.sum((x * t[1] - y * t[0]) * dx)) for t in taus]
    wq = np.asarray(basis.interpolate(omega))
    i_wx, i_wy = float(np.sum(wq * x * dx)), float(np.sum(wq * y * dx))
    xs, ys = np.linalg.solve(np.array([[Ixy, -Iyy], [Ixx, -Ixy]]), [-i_wx, -i_wy])
    J = Ixx + Iyy - float(omega @ (K @ omega))

    vb = Basis(mesh.mesh, elem, quadrature=(np.array([[0.0, 1.0, 0.0], [0.0, 0.0, 1.0]]),
                                            np.full(3, 1.0 / 6.0)))
    cx_, cy_ = np.asarray(vb.global_coordinates())
    corners = np.stack([cx_, cy_], axis=-1)
    xv, yv = cx_ - c[0], cy_ - c[1]

    def tau_v(ab):
        g = ab[0] * vb.interpolate(phi_a).grad + ab[1] * vb.interpolate(phi_b).grad
        hx, hy = _poisson_h(xv, yv, ab[0], ab[1], nu)
        return np.stack([g[0] + hx, g[1] + hy], axis=-1)

    gw = vb.interpolate(omega).grad
    tau_t = np.stack([gw[0] - yv, gw[1] + xv], axis=-1)
    t3 = time.perf_counter()
    return SectionSolution(
        mesh=mesh, nu=float(nu), A=A, centroid=(float(c[0]), float(c[1])),
        Ixx=Ixx, Iyy=Iyy, Ixy=Ixy, J=J,
        shear_centre=(float(c[0] + xs), float(c[1] + ys)),
        shear_centre_nu=(float(c[0] + moment[1]), float(c[1] - moment[0])),
        shear_coefficients=(float(1.0 / (A * flex[0, 0])), float(1.0 / (A * flex[1, 1]))),
        shear_flexibility=flex, corners=corners, tau_vx=tau_v(ab_vx), tau_vy=tau_v(ab_vy),
        tau_torsion=tau_t, resultant=resultant, residual=residual, dofs=int(basis.N),
        solver=solver,
        timings={"assemble": t1 - t0, "solve": t2 - t1, "post": t3 - t2}, _basis=basis,
        _vectors={"omega": omega, "phi_a": phi_a, "phi_b": phi_b, "ab_vx": ab_vx,
                  "ab_vy": ab_vy},
    )
