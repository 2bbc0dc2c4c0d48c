"""Bulge arcs (classical.arcs): radius, centre, tangents and faceting.

Exact values are plane geometry of the bulge b = tan(theta/4) (the DXF convention, group
code 42 of LWPOLYLINE; the formulas are common practice).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from shapely.geometry import Polygon

from classical.arcs import (
    FACET_ANGLE,
    FACET_SAGITTA,
    arc_centre,
    arc_midpoint,
    arc_radius,
    arc_tangents,
    facet_arc,
    facet_ring,
    ring_circle,
)


def test_half_circle_bulge_one():
    """b = 1 from (1, 0) to (-1, 0): radius 1, centre at the origin, midpoint (0, 1)
    (counter-clockwise); tangents +y at the start and -y at the end."""
    assert arc_radius((1, 0), (-1, 0), 1.0) == pytest.approx(1.0)
    np.testing.assert_allclose(arc_centre((1, 0), (-1, 0), 1.0), [0, 0], atol=1e-15)
    np.testing.assert_allclose(arc_midpoint((1, 0), (-1, 0), 1.0), [0, 1], atol=1e-15)
    t0, t1 = arc_tangents((1, 0), (-1, 0), 1.0)
    np.testing.assert_allclose(t0, [0, 1], atol=1e-15)
    np.testing.assert_allclose(t1, [0, -1], atol=1e-15)


def test_quarter_clockwise():
    """b = -tan(pi/8) from (0, 1) to (1, 0): the clockwise quarter circle about the
    origin, radius 1 (r = c (1 + b^2)/(4|b|) with c = sqrt 2)."""
    b = -math.tan(math.pi / 8)
    assert arc_radius((0, 1), (1, 0), b) == pytest.approx(1.0)
    np.testing.assert_allclose(arc_centre((0, 1), (1, 0), b), [0, 0], atol=1e-14)
    pts = facet_arc((0, 1), (1, 0), b)
    np.testing.assert_allclose(np.hypot(*pts.T), 1.0, rtol=1e-14)


def test_faceting_within_the_sagitta():
    """Every chord's midpoint lies within FACET_SAGITTA x r of the arc, and no chord turns
    by more than FACET_ANGLE (0.72 degrees)."""
    pts = np.vstack([facet_arc((3, 0), (-3, 0), 1.0), [(-3, 0)]])
    mids = 0.5 * (pts[1:] + pts[:-1])
    gap = 3.0 - np.hypot(*mids.T)
    assert gap.max() <= FACET_SAGITTA * 3.0 * (1 + 1e-9)
    d = np.diff(pts, axis=0)
    ang = np.abs(np.diff(np.unwrap(np.arctan2(d[:, 1], d[:, 0]))))
    assert ang.max() <= FACET_ANGLE * (1 + 1e-9)
    assert math.degrees(FACET_ANGLE) == pytest.approx(0.7248, abs=1e-3)


def test_faceted_disc_area():
    """A disc from two half circles: area pi r^2 within (4/3) FACET_SAGITTA (relative)."""
    ring = facet_ring([(2, 0), (-2, 0)], [1.0, 1.0])
    a = Polygon(ring).area
    assert a == pytest.approx(4 * math.pi, rel=1.5 * FACET_SAGITTA)
    assert a < 4 * math.pi


def test_straight_ring_unchanged():
    pts = [(0, 0), (1, 0), (1, 1)]
    np.testing.assert_array_equal(facet_ring(pts, [0, 0, 0]), np.asarray(pts, float))


def test_ring_circle():
    """Arcs of one circle round a full turn are that circle; a D shape is not."""
    c = ring_circle([(5, 1), (1, 5), (-3, 1), (1, -3)], [math.tan(math.pi / 8)] * 4)
    assert c == pytest.approx((1.0, 1.0, 4.0))
    assert ring_circle([(1, 0), (-1, 0)], [1.0, 0.0]) is None
    assert ring_circle([(1, 0), (-1, 0)], [1.0, -1.0]) is None
