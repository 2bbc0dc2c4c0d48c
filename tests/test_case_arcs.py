"""Arc edges in polygon outlines (fem.case.arcs): the one form, its checks, and corners.

Exact values: bulge geometry b = tan(theta/4) (DXF convention; plane geometry, common
practice); the corner rule is fem.case.outline.CORNER_ANGLE (190 degrees).
"""

from __future__ import annotations

import math

import pytest

from fem.case import parse_case
from fem.case.outline import domain_polygon, reentrant_corners
from fem.errors import CaseError

Q = math.tan(math.pi / 8)   # bulge of a quarter circle

BRACKET = """
schema = 1
name = "arc-bracket"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "polygon"
points = {points}
{extra}
[[supports]]
from = [0.0, 0.0]
to = [40.0, 0.0]
fix = "xy"
[[loads]]
from = [200.0, 140.0]
to = [200.0, 200.0]
force = [0.0, -5000.0]
[mesh]
size = 8.0
"""


def l_bracket(bulge: float = -Q, radius: float = 20.0) -> str:
    """An L bracket: a 40 mm leg up to y = 200, an arm along the top to x = 200 (60 deep),
    the re-entrant corner at (40, 140) rounded by an arc of `radius`."""
    r = radius
    return (f"[[0.0, 0.0], [40.0, 0.0], [40.0, {140 - r}, {bulge}], [{40 + r}, 140.0], "
            "[200.0, 140.0], [200.0, 200.0], [0.0, 200.0]]")


def case(points: str, extra: str = ""):
    return parse_case(BRACKET.format(points=points, extra=extra), "arc.toml")


def test_tangent_arc_join_is_no_corner():
    """A clockwise quarter arc (bulge -tan(pi/8)) tangent to both legs: no vertex of the
    domain is a re-entrant corner; the area is the sharp L plus r^2 (1 - pi/4)."""
    c = case(l_bracket())
    dom = domain_polygon(c.beam)
    assert reentrant_corners(dom) == []  # fillet material r^2 (1 - pi/4) added to the L
    sharp = 40 * 200 + 160 * 60
    assert dom.area == pytest.approx(sharp + 20**2 * (1 - math.pi / 4), rel=1e-4)


def test_arc_bulging_the_wrong_way_leaves_two_corners():
    """The same ends with bulge +tan(pi/8) (counter-clockwise) meet both legs at 270
    degrees: the detector sees the tangents, not the chord (breaks if it ignored arcs)."""
    c = case(l_bracket(+Q))
    corners = reentrant_corners(domain_polygon(c.beam))
    assert sorted(k.at for k in corners) == [(40.0, 120.0), (60.0, 140.0)]
    assert all(k.angle == pytest.approx(270.0, abs=1.0) for k in corners)


def test_bad_vertices_name_the_key():
    with pytest.raises(CaseError, match=r"geometry\.points\.1.*\[x, y, bulge\]"):
        case("[[0.0, 0.0], [40.0, 0.0, 'a'], [40.0, 40.0]]")
    with pytest.raises(CaseError, match=r"geometry\.points\.1.*bulge 5000 is out of range"):
        case("[[0.0, 0.0], [40.0, 0.0, 5000.0], [40.0, 40.0]]")


def test_arc_radius_too_small():
    """An arc of radius 0.001 mm (a half circle between vertices 0.002 apart) is below
    MIN_ARC_RADIUS x the 40 mm extent and refused by name."""
    with pytest.raises(CaseError, match=r"geometry\.points\.2.*radius.*too small"):
        case("[[0.0, 0.0], [40.0, 0.0], [40.0, 40.0, 1.0], [40.0, 40.002], [0.0, 40.0]]")


def strip(points: str):
    text = BRACKET.format(points=points, extra="").replace(
        "from = [200.0, 140.0]\nto = [200.0, 200.0]", "from = [40.0, 0.0]\nto = [40.0, 10.0]")
    return parse_case(text.replace("size = 8.0", "size = 2.0"), "arc.toml")


def test_arc_crossing_another_edge():
    """A half circle bulging out of a 40 x 10 strip's short edge adds pi 5^2 / 2; a
    bulge of 3 (an arc of 286 degrees) on the 10 mm end swings across the long edges and
    the outline crosses itself."""
    ok = strip("[[0.0, 0.0], [40.0, 0.0], [40.0, 10.0], [0.0, 10.0, 1.0]]")
    assert domain_polygon(ok.beam).area == pytest.approx(400 + math.pi * 25 / 2, rel=1e-4)
    with pytest.raises(CaseError, match=r"geometry\.points.*crosses itself"):
        strip("[[0.0, 0.0], [40.0, 0.0], [40.0, 10.0], [0.0, 10.0, -3.0]]")


def test_patch_on_an_arc_refused():
    text = BRACKET.format(points=l_bracket(), extra="").replace(
        "from = [200.0, 140.0]\nto = [200.0, 200.0]",
        f"at = [{60 - 20 * math.cos(math.pi / 4)}, {120 + 20 * math.sin(math.pi / 4)}]\n"
        "width = 2.0")
    with pytest.raises(CaseError, match=r"loads.*curved part"):
        parse_case(text, "arc.toml")


def test_openings_any_outline():
    """An opening (a slot with round ends, two half circles of radius 5 joined by straight
    edges) is subtracted: area 2 x 20 + pi 5^2 less; one touching the edge is refused."""
    slot = "[[[10.0, 150.0], [30.0, 150.0, 1.0], [30.0, 160.0], [10.0, 160.0, 1.0]]]"
    c = case(l_bracket(), f"openings = {slot}")
    base = domain_polygon(case(l_bracket()).beam).area
    assert domain_polygon(c.beam).area == pytest.approx(base - 200 - math.pi * 25, rel=1e-4)
    with pytest.raises(CaseError, match=r"geometry\.openings\.0.*inside the outline"):
        case(l_bracket(), "openings = [[[-5.0, 150.0], [30.0, 150.0], [30.0, 160.0]]]")
