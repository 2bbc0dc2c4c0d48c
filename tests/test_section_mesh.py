"""Section meshes: exact geometry (true arcs), frames shared with classical, refinement."""

from __future__ import annotations

import math

import gmsh
import numpy as np
import pytest
from skfem import Basis, ElementTriP2, MeshTri1, MeshTri2

from classical.sections import (
    angle_properties,
    box_properties,
    channel_properties,
    circle_properties,
    i_properties,
    polygon_properties,
    rectangle_properties,
    tee_properties,
    tube_properties,
)
from fem.section.mesh import mesh_section, section_shape


def _moments(sm) -> tuple[float, float, float, float, float, float]:
    b = Basis(sm.mesh, ElementTriP2(), intorder=4)
    x, y = np.asarray(b.global_coordinates())
    dx = b.dx
    A = dx.sum()
    cx, cy = (x * dx).sum() / A, (y * dx).sum() / A
    X, Y = x - cx, y - cy
    return A, cx, cy, (Y * Y * dx).sum(), (X * X * dx).sum(), (X * Y * dx).sum()


SHARP = [
    ("rectangle", dict(width=40.0, depth=20.0), rectangle_properties),
    ("box", dict(width=40.0, depth=60.0, wall=3.0), box_properties),
    ("i", dict(depth=300.0, flange_width=150.0, flange_thickness=10.7, web_thickness=7.1),
     i_properties),
    ("channel", dict(depth=100.0, flange_width=50.0, flange_thickness=8.0, web_thickness=6.0),
     channel_properties),
    ("tee", dict(depth=100.0, flange_width=80.0, flange_thickness=10.0, web_thickness=8.0),
     tee_properties),
    ("angle", dict(leg_x=60.0, leg_y=40.0, thickness=6.0), angle_properties),
]


@pytest.mark.parametrize(("shape", "params", "closed"), SHARP, ids=[s[0] for s in SHARP])
def test_straight_shapes_match_closed_forms(shape, params, closed):
    """Straight-sided shapes: A, centroid, Ixx, Iyy, Ixy of the mesh equal the composite-
    rectangle closed forms of classical.shapes (same frame) to 1e-10 relative: P2
    quadrature of polynomials on straight triangles is exact."""
    sm = mesh_section(section_shape(shape, **params), size=5.0)
    A, cx, cy, ixx, iyy, ixy = _moments(sm)
    p = closed(**params)
    scale = math.sqrt(p.A)
    assert A == pytest.approx(p.A, rel=1e-10)
    assert cx == pytest.approx(p.cx, abs=1e-10 * scale)
    assert cy == pytest.approx(p.cy, abs=1e-10 * scale)
    assert ixx == pytest.approx(p.Ixx, rel=1e-10)
    assert iyy == pytest.approx(p.Iyy, rel=1e-10)
    assert ixy == pytest.approx(p.Ixy, abs=1e-10 * p.Ixx)


def test_true_arcs_circle_and_tube():
    """Circle d = 10 and tube d = 50, t = 3 (closed forms A = pi d^2/4, I = pi d^4/64 and
    differences): the isoparametric mesh is within 1e-5 relative, its mid-edge nodes
    lie on the true circle, and a linear mesh of the same size is much worse
    (area error 8e-4 vs 1e-7 on an ellipse, FEM-NOTES)."""
    for shape, params, closed in [("circle", dict(diameter=10.0), circle_properties),
                                  ("tube", dict(diameter=50.0, wall=3.0), tube_properties)]:
        sm = mesh_section(section_shape(shape, **params), size=params["diameter"] / 12)
        assert isinstance(sm.mesh, MeshTri2)
        A, _, _, ixx, iyy, _ = _moments(sm)
        p = closed(**params)
        assert A == pytest.approx(p.A, rel=1e-5)
        assert ixx == pytest.approx(p.Ixx, rel=1e-5)
        assert iyy == pytest.approx(p.Iyy, rel=1e-5)
    sm = mesh_section(section_shape("circle", diameter=10.0), size=1.0)
    f = sm.boundaries["outer"]
    mids = sm.mesh.doflocs[:, sm.mesh.dofs.facet_dofs[0, f]]
    assert np.allclose(np.hypot(*mids), 5.0, atol=1e-9)
    lin = mesh_section(section_shape("circle", diameter=10.0), size=1.0, order=1)
    assert isinstance(lin.mesh, MeshTri1)
    quad_err = abs(_moments(sm)[0] / (25 * math.pi) - 1)
    b = Basis(lin.mesh, ElementTriP2())
    lin_err = abs(b.dx.sum() / (25 * math.pi) - 1)
    assert quad_err < lin_err / 50


def test_root_fillets_match_exact_area_and_polygon_route():
    """I with root radius r = 15 (fillets tangent to web and flange): the exact area is
    the sharp-rooted closed form plus 4 r^2 (1 - pi/4) (each fillet fills a square r x r
    less a quarter circle); the FE area matches it to 1e-5.  Ixx against classical's
    polygon (64 chords per fillet, which add the circular segments, about 1.3e-5 of A)
    to 5e-5."""
    params = dict(depth=300.0, flange_width=150.0, flange_thickness=10.7,
                  web_thickness=7.1, root_radius=15.0)
    geom = section_shape("i", **params)
    sm = mesh_section(geom, size=6.0)
    A, cx, cy, ixx, iyy, _ = _moments(sm)
    p = polygon_properties(geom.outline)
    sharp = {k: v for k, v in params.items() if k != "root_radius"}
    assert A == pytest.approx(i_properties(**sharp).A + 4 * 15.0**2 * (1 - math.pi / 4),
                              rel=1e-5)
    assert ixx == pytest.approx(p.Ixx, rel=5e-5)
    assert abs(cx) < 1e-9 and abs(cy) < 1e-9
    assert len(geom.sharp_reentrant_corners()) == 0
    assert len(geom.filleted_reentrant_corners()) == 4


def test_reentrant_corners_found_and_refined():
    """Sharp re-entrant corners: the angle has one at (t, t), a box four (its inner
    corners), a polygon with a square hole four; the mesh at the angle's corner is
    refined to about size/8 (Threshold field), away from it the size is kept."""
    ang = section_shape("angle", leg_x=60.0, leg_y=40.0, thickness=6.0)
    assert np.allclose(ang.sharp_reentrant_corners(), [[6.0, 6.0]])
    box = section_shape("box", width=40.0, depth=20.0, wall=2.0)
    assert sorted(map(tuple, box.sharp_reentrant_corners())) == sorted(
        [(-18.0, -8.0), (18.0, -8.0), (18.0, 8.0), (-18.0, 8.0)])
    poly = section_shape("polygon", points=[[0, 0], [10, 0], [10, 10], [0, 10]],
                            holes=[[[2, 2], [4, 2], [4, 4], [2, 4]]])
    assert len(poly.sharp_reentrant_corners()) == 4
    sm = mesh_section(ang, size=3.0)
    p, t = sm.finder.p, sm.finder.t
    edge = np.linalg.norm(p[:, t[0]] - p[:, t[1]], axis=0)
    centre = p[:, t].mean(axis=1)
    near = np.hypot(centre[0] - 6.0, centre[1] - 6.0) < 0.5
    far = np.hypot(centre[0] - 6.0, centre[1] - 6.0) > 20.0
    assert edge[near].max() < 3.0 / 4
    assert np.median(edge[far]) > 3.0 / 2


def test_named_boundaries_and_numbering():
    """Physical groups: 'outer' and 'hole-0' are facet sets of the mesh covering every
    boundary facet once; corner vertices are numbered first (0..nv-1)."""
    sm = mesh_section(section_shape("tube", diameter=20.0, wall=2.0), size=1.5)
    outer, hole = sm.boundaries["outer"], sm.boundaries["hole-0"]
    allf = np.sort(sm.mesh.boundary_facets())
    assert np.array_equal(np.sort(np.concatenate([outer, hole])), allf)
    r = np.hypot(*sm.mesh.p[:, sm.mesh.facets[:, hole].ravel()])
    assert np.allclose(r, 8.0, atol=1e-9)
    nv = sm.mesh.t.max() + 1
    assert np.array_equal(sm.finder.p, sm.mesh.doflocs[:, :nv])
    assert np.array_equal(sm.finder.t, sm.mesh.t)
    assert sm.nodes == sm.mesh.doflocs.shape[1] and sm.elements == sm.mesh.t.shape[1]


def test_errors_name_the_problem_and_gmsh_is_released():
    """Bad input raises ValueError naming shape/parameter; gmsh is finalised after a
    failure inside the session and a second user in the same process is refused."""
    with pytest.raises(ValueError, match="valid shapes"):
        section_shape("hexagon", side=1.0)
    with pytest.raises(ValueError, match="no parameter 'radius'"):
        section_shape("circle", radius=1.0)
    with pytest.raises(ValueError, match="order"):
        mesh_section(section_shape("circle", diameter=1.0), size=0.1, order=3)
    too_big = section_shape("polygon", points=[[0, 0], [1, 0], [1, 1]])
    object.__setattr__(too_big.outer, "radii", np.array([0.0, 5.0, 0.0]))
    with pytest.raises(ValueError, match="does not fit"):
        mesh_section(too_big, size=0.2)
    assert not gmsh.isInitialized()
    gmsh.initialize(interruptible=False)
    try:
        with pytest.raises(RuntimeError, match="already in use"):
            mesh_section(section_shape("circle", diameter=1.0), size=0.2)
    finally:
        gmsh.finalize()


def _dent(angle_deg: float) -> list[list[float]]:
    """100 x 50 rectangle whose top edge dips to one vertex at x = 50 with a material angle
    of 180 + 2 atan(h/50) = angle_deg degrees (geometry)."""
    h = 50.0 * math.tan(math.radians((angle_deg - 180.0) / 2))
    return [[0, 0], [100, 0], [100, 50], [50, 50 - h], [0, 50]]


def test_section_corner_angle_rule_185_is_not_a_corner_200_is():
    """The section corner rule is the members' (fem.case.outline.CORNER_ANGLE = 190
    degrees): a 185-degree kink is no sharp re-entrant corner (not refined, no exclusion
    disc), a 200-degree kink is one, with its angle."""
    soft = section_shape("polygon", points=_dent(185.0))
    assert len(soft.sharp_reentrant_corners()) == 0
    hard = section_shape("polygon", points=_dent(200.0))
    assert len(hard.sharp_reentrant_corners()) == 1
    assert np.degrees(hard.sharp_reentrant_angles()[0]) == pytest.approx(200.0, abs=1e-9)


def test_arcs_of_one_circle_are_that_circle():
    """A polygon ring of two half circles (bulge 1) is built as the circle itself, so a
    hollow circle drawn from arcs meshes exactly as the tube shape (same nodes)."""
    arcs = section_shape("polygon", points=[(50.0, 0.0, 1.0), (-50.0, 0.0, 1.0)],
                         holes=[[(35.0, 0.0, 1.0), (-35.0, 0.0, 1.0)]])
    assert arcs.outer.circle == pytest.approx((0.0, 0.0, 50.0))
    assert arcs.holes[0].circle == pytest.approx((0.0, 0.0, 35.0))
    a = mesh_section(arcs, size=5.0)
    b = mesh_section(section_shape("tube", diameter=100.0, wall=15.0), size=5.0)
    np.testing.assert_array_equal(a.mesh.doflocs, b.mesh.doflocs)


def test_half_disc_from_a_bulge_true_arc_and_corners():
    """A half disc r = 30 (a straight diameter and one bulge-1 arc, either orientation):
    mesh area pi r^2 / 2 to 1e-6 and centroid 4r/(3 pi) above the diameter (Gere & Goodno,
    7th ed., App. E, from memory); the diameter meets the arc at 90 degrees (convex), so no
    re-entrant corner; the polygon route (faceted arc) agrees to 1e-4."""
    for pts in ([(30.0, 0.0, 1.0), (-30.0, 0.0)], [(-30.0, 0.0, -1.0), (30.0, 0.0)]):
        g = section_shape("polygon", points=pts)
        assert g.sharp_reentrant_corners().shape == (0, 2)
        np.testing.assert_allclose(np.degrees(g.outer.material_angles()), [90.0, 90.0])
        A, cx, cy, *_ = _moments(mesh_section(g, size=3.0))
        assert A == pytest.approx(math.pi * 450.0, rel=1e-6)
        assert cy == pytest.approx(4 * 30 / (3 * math.pi), rel=1e-6)
        hp = polygon_properties(g.outline)
        assert hp.A == pytest.approx(A, rel=1e-4)
        assert hp.cy == pytest.approx(cy, rel=1e-4)
