"""Adaptive refinement driven by a recovery-based (Zienkiewicz-Zhu) error estimate.

The smoothed stresses sigma* (vertex averages as in `fem.member.recovery`, but over the elements of
one thickness zone) are compared with the raw element-vertex stresses sigma_h. Both are
linear on each (straight-sided) element, so the estimate per element,

    eta_e^2 = int_e t (sigma* - sigma_h)^T C^-1 (sigma* - sigma_h) dA,

is integrated exactly from the vertex values (Zienkiewicz & Zhu, Int. J. Numer. Methods
Eng. 24 (1987) 337-357, eq. 4 with the energy norm). New element sizes equidistribute eta
over a target number of elements, with eta_e ~ h^(p+1) for elements of order p, and reach
gmsh as a background PostView field (`size_field`, passed to `fem.member.mesh.mesh_member`).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import gmsh
import numpy as np

from fem.case.model import Case
from fem.member.frame import Frame
from fem.member.level import excluded_zones, peaks
from fem.member.mesh import MemberMesh, mesh_member
from fem.member.recovery import StressField, recover
from fem.member.solve import Solution, solve_member

__all__ = ["compliance", "smoothed_by_zone", "error_indicator", "target_sizes", "size_field",
           "AdaptiveLevel", "adaptive_levels"]

STEP_LIMIT = (0.25, 2.0)  # a new size stays within these factors of the old (common practice)


def compliance(E: float, nu: float, model: str) -> np.ndarray:
    """C^-1 for (sigma_xx, sigma_yy, tau_xy) -> (eps_xx, eps_yy, gamma_xy), plane stress or
    plane strain (Timoshenko & Goodier, 3rd ed., sections 7 and 16)."""
    if model == "plane-strain":
        return (1.0 + nu) / E * np.array([[1.0 - nu, -nu, 0.0], [-nu, 1.0 - nu, 0.0],
                                          [0.0, 0.0, 2.0]])
    return np.array([[1.0, -nu, 0.0], [-nu, 1.0, 0.0], [0.0, 0.0, 2.0 * (1.0 + nu)]]) / E


def _areas(p: np.ndarray, t: np.ndarray) -> np.ndarray:
    a, b, c = (p[:, t[i]] for i in range(3))
    return 0.5 * np.abs((b[0] - a[0]) * (c[1] - a[1]) - (c[0] - a[0]) * (b[1] - a[1]))


def smoothed_by_zone(field: StressField, thickness: np.ndarray) -> dict[str, np.ndarray]:
    """Vertex averages of the element-vertex stresses over the elements of one thickness:
    (nelems, 3) per component. Stresses jump where the thickness does (flange to web), so
    averaging across that line would report the jump as an error that never goes away."""
    _, zone = np.unique(thickness, return_inverse=True)
    key = (field.t * (zone.max() + 1) + zone).T                 # (nelems, 3): vertex, zone
    _, slot = np.unique(key.ravel(), return_inverse=True)
    count = np.bincount(slot)
    out = {}
    for k in ("sxx", "syy", "txy"):
        mean = np.bincount(slot, weights=getattr(field, k).ravel()) / count
        out[k] = mean[slot].reshape(key.shape)
    return out


def error_indicator(field: StressField, thickness: np.ndarray,
                    C_inv: np.ndarray) -> np.ndarray:
    """eta_e per element: energy norm of smoothed (by zone) minus raw stress.

    For linear f, g with vertex values f_i, g_i on a triangle of area A,
    int f g dA = A/12 (sum f_i g_i + sum f_i sum g_i).
    """
    area = _areas(field.p, field.t)
    smooth = smoothed_by_zone(field, thickness)
    d = np.stack([smooth[k] - getattr(field, k) for k in ("sxx", "syy", "txy")])
    eta2 = np.zeros(len(area))
    for k in range(3):
        for m in range(3):
            if C_inv[k, m] != 0.0:
                fg = (d[k] * d[m]).sum(axis=1) + d[k].sum(axis=1) * d[m].sum(axis=1)
                eta2 += C_inv[k, m] * fg
    return np.sqrt(np.maximum(thickness * area / 12.0 * eta2, 0.0))


def target_sizes(p: np.ndarray, t: np.ndarray, eta: np.ndarray, n_elements: float,
                 order: int, frozen: np.ndarray | None = None) -> np.ndarray:
    """Nodal element sizes that equidistribute the error over about `n_elements` elements.

    With eta_e ~ h_e^(p+1), an element refined to h' carries eta_e (h'/h_e)^(p+1) per new
    element and (h_e/h')^2 new elements; equal shares eta* give
    h' = h_e (eta*/eta_e)^(1/(p+1)) with eta*^q = sum eta_e^q / n_elements, q = 2/(p+1).
    Sizes change by at most STEP_LIMIT per step; `frozen` elements keep theirs. Each vertex
    takes the mean size of its elements.
    """
    h = np.sqrt(4.0 * _areas(p, t) / math.sqrt(3.0))       # equilateral edge of that area
    q = 2.0 / (order + 1)
    eta = np.maximum(eta, 1e-300 + 1e-12 * eta.max())
    eta_star = (np.sum(eta**q) / n_elements) ** (1.0 / q)
    h_new = np.clip(h * (eta_star / eta) ** (1.0 / (order + 1)),
                    STEP_LIMIT[0] * h, STEP_LIMIT[1] * h)
    if frozen is not None:
        h_new[frozen] = h[frozen]
    count = np.bincount(t.ravel(), minlength=p.shape[1])
    return np.bincount(t.ravel(), weights=np.tile(h_new, 3), minlength=p.shape[1]) / count


def size_field(p: np.ndarray, t: np.ndarray, nodal_size: np.ndarray) -> Callable[[Frame], int]:
    """A hook for `mesh_member(..., background=)`: inside the gmsh session it adds the nodal
    sizes on the old triangles, in the mesh frame, as a list-based view and returns a
    PostView field on it."""

    def add(fr: Frame) -> int:
        x, y = fr.points(p[0][t], p[1][t])                    # (3, nelems)
        data = np.vstack([x, y, np.zeros_like(x), fr.lengths(nodal_size[t])]).T.ravel()
        view = gmsh.view.add("adaptive size")
        gmsh.view.addListData(view, "ST", t.shape[1], data.tolist())
        f = gmsh.model.mesh.field.add("PostView")
        gmsh.model.mesh.field.setNumber(f, "ViewTag", view)
        return f

    return add


@dataclass
class AdaptiveLevel:
    """One mesh of an adaptive sequence."""

    mm: MemberMesh
    sol: Solution
    field: StressField
    eta: np.ndarray                                   # per element
    peaks: dict[str, tuple[float, tuple[float, float]]]

    @property
    def h(self) -> float:
        """Representative element size (area / number of elements)^(1/2), Celik et al. 2008."""
        return float(math.sqrt(_areas(self.field.p, self.field.t).sum() / self.field.t.shape[1]))


def next_size_field(case: Case, mm: MemberMesh, field: StressField,
                    growth: float) -> Callable[[Frame], int]:
    """The size field for the next mesh: about `growth` times the elements of `mm`, sized
    from its error estimate. Elements in the excluded zones (idealised supports and
    load-patch ends, `fem.member.level.excluded_zones`) keep their size: their stresses are not
    sought, and refining a singular point never ends."""
    C_inv = compliance(case.material.E, case.material.nu, case.material.model)
    eta = error_indicator(field, mm.thickness, C_inv)
    centre = field.p[:, field.t].mean(axis=1)
    frozen = np.zeros(field.t.shape[1], dtype=bool)
    for z in excluded_zones(case, mm.supports, mm.loads):
        frozen |= np.hypot(centre[0] - z.at[0], centre[1] - z.at[1]) <= z.radius
    sizes = target_sizes(field.p, field.t, eta, growth * field.t.shape[1], mm.order, frozen)
    return size_field(field.p, field.t, sizes)


def representative_size(mm: MemberMesh) -> float:
    """h = edge of the equilateral triangle of the mean element area (Celik et al. 2008 use
    h = (A/N)^(1/2); the constant cancels in refinement ratios)."""
    p, t = mm.finder_mesh.p, mm.finder_mesh.t
    return float(np.sqrt(4.0 * _areas(p, t).mean() / math.sqrt(3.0)))


def adaptive_levels(case: Case, levels: int, growth: float = 2.0) -> list[AdaptiveLevel]:
    """The case's own mesh, then `levels - 1` meshes, each with about `growth` times the
    elements of the one before (see `next_size_field`)."""
    C_inv = compliance(case.material.E, case.material.nu, case.material.model)
    out: list[AdaptiveLevel] = []
    background = None
    for _ in range(levels):
        mm = mesh_member(case, case.mesh.size, background=background)
        sol = solve_member(case, mm)
        field = recover(sol, mm, case.material)
        zones = excluded_zones(case, mm.supports, mm.loads)
        eta = error_indicator(field, mm.thickness, C_inv)
        out.append(AdaptiveLevel(mm=mm, sol=sol, field=field, eta=eta,
                                 peaks=peaks(field, zones)))
        background = next_size_field(case, mm, field, growth)
    return out
