"""Stress recovery: element-vertex stresses, smooth nodal fields and point evaluation.

The gradient of a P2 displacement is linear on each straight triangle, so the stresses
evaluated at the three vertices of every element represent the FE stress exactly
(a P1-discontinuous field). Point values interpolate those linearly; smooth nodal fields
(for contours, peaks and the VTU file) average the element values at each vertex.

Von Mises stress: the plane-stress form (sz = 0) for ``model = "plane-stress"``, the full
J2 form with sz = nu (sx + sy) for ``model = "plane-strain"`` (`von_mises`).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike
from scipy.spatial import cKDTree
from skfem import Basis

from classical.bending import principal_stresses, von_mises_plane, von_mises_plane_strain
from fem.case.model import Material
from fem.member.mesh import MemberMesh
from fem.member.solve import Solution

__all__ = ["StressField", "recover", "PointLocator", "von_mises"]


def von_mises(material: Material | None, sx: ArrayLike, sy: ArrayLike,
              txy: ArrayLike) -> float | np.ndarray:
    """Von Mises stress of the in-plane components for the material's 2D model.

    Plane strain carries sz = nu (sx + sy), which the plane-stress form leaves out
    (`classical.bending.von_mises_plane_strain`); plane stress, or no material given,
    uses `classical.bending.von_mises_plane`.
    """
    if material is not None and material.model == "plane-strain":
        return von_mises_plane_strain(sx, sy, txy, material.nu)
    return von_mises_plane(sx, sy, txy)


@dataclass
class StressField:
    """Element-vertex (DG) and nodal-averaged stresses; arrays (nelems, 3) and (nverts,)."""

    sxx: np.ndarray
    syy: np.ndarray
    txy: np.ndarray
    t: np.ndarray          # element -> vertex connectivity (3, nelems)
    p: np.ndarray          # vertex coordinates (2, nverts)
    nodal: dict[str, np.ndarray]
    displacement: np.ndarray  # (2, nverts)
    material: Material | None = None  # its model chooses the von Mises form

    def at(self, locator: PointLocator, x: np.ndarray, y: np.ndarray) -> dict[str, np.ndarray]:
        """sxx, syy, txy at points, by linear interpolation in the containing element."""
        e, bary = locator.locate(x, y)
        out = {}
        for name in ("sxx", "syy", "txy"):
            out[name] = np.einsum("ij,ij->i", getattr(self, name)[e], bary)
        return out


def recover(sol: Solution, mm: MemberMesh, material: Material | None = None) -> StressField:
    """Stresses at the element vertices from the displacement gradient.

    ``material`` chooses the von Mises form (`von_mises`); without it, plane stress.
    """
    mesh = mm.mesh
    vert = np.array([[0.0, 1.0, 0.0], [0.0, 0.0, 1.0]])
    vb = Basis(mesh, sol.basis.elem, quadrature=(vert, np.full(3, 1.0 / 6.0)))
    grad = vb.interpolate(sol.u).grad  # (2 comps, 2 dirs, nelems, 3)
    exx, eyy = grad[0, 0], grad[1, 1]
    gxy = grad[0, 1] + grad[1, 0]
    tr = exx + eyy
    sxx = sol.lam * tr + 2 * sol.mu * exx
    syy = sol.lam * tr + 2 * sol.mu * eyy
    txy = sol.mu * gxy
    t = mesh.t[:3]
    nv = mm.finder_mesh.nvertices
    count = np.bincount(t.T.ravel(), minlength=nv)

    def avg(field: np.ndarray) -> np.ndarray:
        return np.bincount(t.T.ravel(), weights=field.ravel(), minlength=nv) / count

    nodal = {"sxx": avg(sxx), "syy": avg(syy), "txy": avg(txy)}
    nodal["von_mises"] = von_mises(material, nodal["sxx"], nodal["syy"], nodal["txy"])
    nodal["principal_max"] = principal_stresses(nodal["sxx"], nodal["syy"], nodal["txy"]).s1
    disp = sol.u[sol.basis.nodal_dofs[:, :nv]]
    return StressField(sxx=sxx, syy=syy, txy=txy, t=t, p=mm.finder_mesh.p, nodal=nodal,
                       displacement=disp, material=material)


class PointLocator:
    """Vectorised point location on the straight-sided twin of the mesh.

    Candidates are the k elements with the nearest centroids; the one with the largest
    smallest barycentric coordinate wins, so points just outside a straight chord of a
    curved edge fall to the adjacent element (coordinates clipped to the triangle).
    """

    def __init__(self, p: np.ndarray, t: np.ndarray, k: int = 12) -> None:
        self.p, self.t = p, t
        self.k = min(k, t.shape[1])
        self.tree = cKDTree(p[:, t].mean(axis=1).T)
        a, b, c = (p[:, t[i]] for i in range(3))
        self.a = a
        m = np.stack([b - a, c - a], axis=-1)  # (2, nelems, 2)
        det = m[0, :, 0] * m[1, :, 1] - m[0, :, 1] * m[1, :, 0]
        self.inv = np.stack([np.stack([m[1, :, 1], -m[0, :, 1]], -1),
                             np.stack([-m[1, :, 0], m[0, :, 0]], -1)], 1) / det[:, None, None]

    def locate(self, x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        pts = np.column_stack([np.ravel(x), np.ravel(y)])
        _, cand = self.tree.query(pts, k=self.k)
        cand = cand.reshape(len(pts), -1)
        d = pts[:, None, :] - self.a.T[cand]               # (n, k, 2)
        lam12 = np.einsum("nkij,nkj->nki", self.inv[cand], d)
        bary = np.concatenate([1 - lam12.sum(-1, keepdims=True), lam12], axis=-1)
        best = np.argmax(bary.min(-1), axis=1)
        rows = np.arange(len(pts))
        b = np.clip(bary[rows, best], 0.0, None)
        return cand[rows, best], b / b.sum(axis=1, keepdims=True)
