"""Plane geometry: placements resolved to boundary stretches, cuts, re-entrant corners."""

from __future__ import annotations

import math

import pytest

from fem.case import parse_case
from fem.case.outline import cut_strips, domain_polygon, patches, reentrant_corners
from fem.errors import CaseError

COPED = """
schema = 1
name = "coped"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 8.0
[geometry]
shape = "rectangle"
length = 400.0
depth = 300.0
[[geometry.cutouts]]
corner = [0.0, 240.0]
size = [100.0, 100.0]
fillet = {fillet}
[[geometry.holes]]
center = [250.0, 150.0]
radius = 30.0
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
at = [350.0, 300.0]
width = 20.0
force = [0.0, -1000.0]
[mesh]
size = 20.0
"""


def test_edge_patch_shrinks_with_the_cope():
    """The left edge below a 60 mm deep cope is 240 mm long (common practice: a cope removes
    the edge it covers)."""
    c = parse_case(COPED.format(fillet=0.0), "c.toml")
    sup, lds = patches(c)
    assert sup[0].length == pytest.approx(240.0)
    assert lds[0].length == pytest.approx(20.0) and lds[0].centroid == pytest.approx((350, 300))


def test_cut_strips_through_hole():
    """A cut through the hole centre meets two strips of 120 mm each (300 - 2 x 30)/2."""
    c = parse_case(COPED.format(fillet=0.0), "c.toml")
    s = cut_strips(c.geometry, 250.0, 8.0)
    assert len(s) == 2
    assert s[0].y1 - s[0].y0 == pytest.approx(120.0, rel=1e-3)
    assert all(x.t == 8.0 for x in s)


def test_sharp_cope_corner_is_reentrant_and_fillet_removes_it():
    """A sharp rectangular cope leaves one 270 degree corner at (100, 240); a fillet none."""
    sharp = reentrant_corners(domain_polygon(parse_case(COPED.format(fillet=0.0), "c").geometry))
    assert len(sharp) == 1
    assert sharp[0].at == pytest.approx((100.0, 240.0)) and sharp[0].angle == pytest.approx(270)
    smooth = domain_polygon(parse_case(COPED.format(fillet=10.0), "c").geometry)
    assert reentrant_corners(smooth) == []
    # the fillet takes (4 - pi) r^2 / 4 less material out than the sharp cope
    area_gain = smooth.area - domain_polygon(
        parse_case(COPED.format(fillet=0.0), "c").geometry).area
    assert area_gain == pytest.approx((1 - math.pi / 4) * 100.0, rel=1e-3)


@pytest.mark.parametrize("load, fragment", [
    ('at = [350.0, 290.0]\nwidth = 20.0', "is not on the outline"),
    ('at = [395.0, 300.0]\nwidth = 20.0', "runs past the end"),
    ('from = [300.0, 300.0]\nto = [400.0, 200.0]', "single straight stretch"),
    ('hole = 3', "hole 3 does not exist"),
])
def test_bad_placements(load, fragment):
    text = COPED.format(fillet=0.0).replace('at = [350.0, 300.0]\nwidth = 20.0', load)
    with pytest.raises(CaseError, match=fragment):
        parse_case(text, "p.toml")


def _dented(angle_deg: float):
    """A 100 x 50 plate whose top edge dips to one vertex at x = 50: the material angle
    there is 180 + 2 atan(h/50) degrees (geometry), set to `angle_deg`."""
    from shapely.geometry import Polygon

    h = 50.0 * math.tan(math.radians((angle_deg - 180.0) / 2))
    return Polygon([(0, 0), (100, 0), (100, 50), (50, 50 - h), (0, 50)])


def test_corner_angle_rule_185_is_not_a_corner_200_is():
    """The corner rule (fem.case.outline.CORNER_ANGLE = 190 degrees): a 185-degree kink is
    not a re-entrant corner, a 200-degree one is, at the kink and with its angle."""
    from fem.case.outline import is_sharp_corner

    assert not is_sharp_corner(185.0) and is_sharp_corner(200.0)
    assert reentrant_corners(_dented(185.0)) == []
    found = reentrant_corners(_dented(200.0))
    assert len(found) == 1 and found[0].at == pytest.approx((50.0, 50 - 50 * math.tan(
        math.radians(10.0))))
    assert found[0].angle == pytest.approx(200.0, abs=1e-9)


def test_faceted_arc_is_not_a_corner():
    """A plate whose top edge is a concave arc drawn with 181 points (1-degree facets: each
    vertex has a 181-degree material angle) has no re-entrant corner."""
    from shapely.geometry import Polygon

    th = [math.radians(180 + 180 * k / 180) for k in range(181)]
    arc = [(50 + 40 * math.cos(a), 100 + 40 * math.sin(a)) for a in th][::-1]  # 90 -> 10
    dom = Polygon([(0, 0), (100, 0), (100, 100), *arc, (0, 100)])
    assert dom.is_valid and dom.area == pytest.approx(1e4 - math.pi * 40**2 / 2, rel=1e-3)
    assert reentrant_corners(dom) == []
