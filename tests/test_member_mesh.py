"""Meshing and the hand-over to scikit-fem: names kept, patches exact, curves faithful."""

from __future__ import annotations

import math

import numpy as np
import pytest
from skfem import MeshTri1, MeshTri2
from test_case_outline import COPED

from fem.case import parse_case
from fem.case.sizing import estimate_dofs
from fem.member.mesh import mesh_member


def _facet_length(mm, name: str) -> float:
    m = mm.finder_mesh
    f = m.facets[:, mm.boundaries[name]]
    return float(np.linalg.norm(m.p[:, f[0]] - m.p[:, f[1]], axis=0).sum())


@pytest.fixture(scope="module")
def coped():
    return mesh_member(parse_case(COPED.format(fillet=10.0), "c.toml"))


def test_named_boundaries_have_their_stated_length(coped):
    """Each patch is exactly its stated length: the boundary is split at patch ends."""
    assert set(coped.boundaries) == {"support-0", "load-0", "hole-0"}
    assert _facet_length(coped, "support-0") == pytest.approx(240.0, rel=1e-12)
    assert _facet_length(coped, "load-0") == pytest.approx(20.0, rel=1e-12)


def test_curved_members_get_isoparametric_p2(coped):
    """With holes and fillets the mesh is MeshTri2 and the hole's area is faithful: the
    material area is the outline minus the cope (with fillet) minus pi r^2 (exact)."""
    assert isinstance(coped.mesh, MeshTri2)
    from skfem import Basis, ElementTriP2, Functional, asm

    area = asm(Functional(lambda w: 1.0 + 0.0 * w.x[0]), Basis(coped.mesh, ElementTriP2()))
    exact = 400 * 300 - (100 * 60 - (1 - math.pi / 4) * 100.0) - math.pi * 30**2
    assert area == pytest.approx(exact, rel=1e-6)


def test_straight_member_uses_affine_mesh():
    text = COPED.format(fillet=0.0)
    text = text.replace("[[geometry.holes]]\ncenter = [250.0, 150.0]\nradius = 30.0\n", "")
    mm = mesh_member(parse_case(text, "s.toml"))
    assert isinstance(mm.mesh, MeshTri1)


def test_dof_estimate_is_close(coped):
    """The pre-mesh estimate is within a factor 1.5 of the real dof count."""
    case = parse_case(COPED.format(fillet=10.0), "c.toml")
    real = 2 * coped.mesh.doflocs.shape[1] if isinstance(coped.mesh, MeshTri2) else None
    est = estimate_dofs(case, case.mesh.size)
    assert real is not None and 1 / 1.5 < est / real < 1.5


def test_true_arcs_in_a_polygon_outline_and_opening():
    """An L bracket whose re-entrant corner is an arc (r = 20) and a round-ended slot
    opening: true OCC arcs, an isoparametric MeshTri2 whose area equals the exact area
    (sharp L + r^2 (1 - pi/4) - slot 2 x 20 + pi 5^2) to 1e-6 (the faceted polygon's
    would be off by (4/3) FACET_SAGITTA of the arcs' share), and every boundary node of
    the fillet on the circle r = 20 about (60, 120) to round-off."""
    from skfem import Basis, ElementTriP2
    from test_case_arcs import case, l_bracket

    slot = "[[[10.0, 150.0], [30.0, 150.0, 1.0], [30.0, 160.0], [10.0, 160.0, 1.0]]]"
    mm = mesh_member(case(l_bracket(), f"openings = {slot}"))
    assert isinstance(mm.mesh, MeshTri2)
    area = Basis(mm.mesh, ElementTriP2(), intorder=4).dx.sum()
    exact = 40 * 200 + 160 * 60 + 20**2 * (1 - math.pi / 4) - 200 - math.pi * 25
    assert area == pytest.approx(exact, rel=1e-6)
    p = mm.mesh.doflocs
    near = (p[0] > 40.5) & (p[0] < 59.5) & (p[1] > 120.5) & (p[1] < 139.5)
    r = np.hypot(p[0, near] - 60.0, p[1, near] - 120.0)
    on_arc = np.abs(r - 20.0) < 1e-3
    assert on_arc.sum() >= 6
    assert np.abs(r[on_arc] - 20.0).max() < 1e-9


def test_size_guard_counts_the_refinement_along_arcs():
    """The dof estimate (fem.case.sizing) includes the graded refinement along outline and
    opening arcs: within 15 % of the real count for a bracket with a 20 mm fillet arc and a
    slot with 5 mm half-circle ends (without it: 0.71 at size 8)."""
    from test_case_arcs import case, l_bracket

    slot = "[[[10.0, 150.0], [30.0, 150.0, 1.0], [30.0, 160.0], [10.0, 160.0, 1.0]]]"
    c = case(l_bracket(), f"openings = {slot}")
    for size in (8.0, 4.0):
        mm = mesh_member(c, size)
        f = mm.finder_mesh
        real = 2 * (f.p.shape[1] + f.facets.shape[1])
        assert 0.85 < estimate_dofs(c, size) / real < 1.15
