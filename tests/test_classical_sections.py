"""Tests for classical.sections: polygon route against closed forms and tables."""

from __future__ import annotations

import math

import numpy as np
import pytest

from classical.sections import (
    SHAPES,
    Outline,
    angle,
    angle_properties,
    box,
    box_properties,
    channel,
    channel_properties,
    chord_length,
    chord_length_x,
    chord_segments,
    chord_segments_x,
    circle,
    circle_properties,
    first_moment_above,
    first_moment_right,
    i,
    i_properties,
    polygon,
    polygon_properties,
    rectangle,
    rectangle_properties,
    section_outline,
    tee,
    tee_properties,
    tube,
    tube_properties,
)

FIELDS = ("A", "cx", "cy", "Ixx", "Iyy", "Ixy", "I1", "I2")

# (builder, closed form, parameters): straight-sided shapes, exact polygons
STRAIGHT = [
    (rectangle, rectangle_properties, dict(width=30.0, depth=70.0)),
    (box, box_properties, dict(width=120.0, depth=200.0, wall=6.3)),
    (i, i_properties, dict(depth=300.0, flange_width=150.0, flange_thickness=10.7,
                           web_thickness=7.1)),
    (channel, channel_properties, dict(depth=200.0, flange_width=75.0, flange_thickness=11.5,
                                       web_thickness=8.5)),
    (tee, tee_properties, dict(depth=120.0, flange_width=100.0, flange_thickness=12.0,
                               web_thickness=7.0)),
    (angle, angle_properties, dict(leg_x=150.0, leg_y=90.0, thickness=10.0)),
]


def _close(a: object, b: object, rel: float) -> None:
    """Compare SectionProperties; zero references use the section's own scale."""
    length = math.sqrt(b.A)
    for f in FIELDS:
        scale = {"A": b.A, "cx": length, "cy": length}.get(f, b.I1)
        assert abs(getattr(a, f) - getattr(b, f)) <= rel * max(abs(getattr(b, f)), scale), f


def _rects(shape: str, p: dict[str, float]) -> list[tuple[float, float, float, float, float]]:
    """The shape as signed rectangles (x0, x1, y0, y1, sign) in the builder's frame."""
    if shape == "rectangle":
        w, d = p["width"] / 2, p["depth"] / 2
        return [(-w, w, -d, d, 1.0)]
    if shape == "box":
        w, d, t = p["width"] / 2, p["depth"] / 2, p["wall"]
        return [(-w, w, -d, d, 1.0), (-w + t, w - t, -d + t, d - t, -1.0)]
    h, b = p.get("depth"), p.get("flange_width")
    tf, tw = p.get("flange_thickness"), p.get("web_thickness")
    if shape == "i":
        return [(-b / 2, b / 2, h / 2 - tf, h / 2, 1.0), (-b / 2, b / 2, -h / 2, -h / 2 + tf, 1.0),
                (-tw / 2, tw / 2, -h / 2 + tf, h / 2 - tf, 1.0)]
    if shape == "channel":
        return [(0, b, h / 2 - tf, h / 2, 1.0), (0, b, -h / 2, -h / 2 + tf, 1.0),
                (0, tw, -h / 2 + tf, h / 2 - tf, 1.0)]
    if shape == "tee":
        return [(-b / 2, b / 2, h - tf, h, 1.0), (-tw / 2, tw / 2, 0, h - tf, 1.0)]
    a, c, t = p["leg_x"], p["leg_y"], p["thickness"]
    return [(0, a, 0, t, 1.0), (0, t, t, c, 1.0)]


def _q_above_rects(rects: list, y: float, cy: float) -> float:
    """Q above y of signed rectangles: sum sign * width * clipped height * (mid - cy)."""
    q = 0.0
    for x0, x1, y0, y1, s in rects:
        lo = max(y0, y)
        if y1 > lo:
            q += s * (x1 - x0) * (y1 - lo) * ((y1 + lo) / 2 - cy)
    return q


@pytest.mark.parametrize(("build", "closed", "params"), STRAIGHT,
                         ids=[s[0].__name__ for s in STRAIGHT])
def test_straight_shapes_match_closed_forms(build, closed, params) -> None:
    """Straight-sided outlines are exact polygons, so Green's theorem must reproduce the
    closed forms (composite rectangles, parallel-axis theorem) to rounding, 1e-12."""
    _close(polygon_properties(build(**params)), closed(**params), 1e-12)


@pytest.mark.parametrize(("build", "closed", "params"), STRAIGHT,
                         ids=[s[0].__name__ for s in STRAIGHT])
def test_first_moment_matches_composite_rectangles(build, closed, params) -> None:
    """Q above y by polygon clipping equals the sum over the shape's rectangles of
    area above y times its centroid offset (exact), at cuts through every part."""
    outline = build(**params)
    p = closed(**params)
    rects = _rects(build.__name__, params)
    _, ymin, _, ymax = outline.bounds
    scale = p.A * math.sqrt(p.A)
    for y in np.linspace(ymin, ymax, 37):
        expected = _q_above_rects(rects, y, p.cy)
        assert first_moment_above(outline, y) == pytest.approx(expected, abs=1e-12 * scale)


@pytest.mark.parametrize(("build", "closed", "params"), STRAIGHT,
                         ids=[s[0].__name__ for s in STRAIGHT])
def test_first_moment_right_matches_composite_rectangles(build, closed, params) -> None:
    """Q right of x about the centroidal y axis = the same rectangle sum with x and y
    exchanged (exact)."""
    outline = build(**params)
    p = closed(**params)
    swapped = [(y0, y1, x0, x1, s) for x0, x1, y0, y1, s in _rects(build.__name__, params)]
    xmin, _, xmax, _ = outline.bounds
    for x in np.linspace(xmin, xmax, 29):
        expected = _q_above_rects(swapped, x, p.cx)
        assert first_moment_right(outline, x) == pytest.approx(
            expected, abs=1e-12 * p.A * math.sqrt(p.A))


def test_rectangle_q_at_centroid() -> None:
    """Q at the neutral axis of a b x h rectangle is b h^2/8 (Gere & Goodno, Mechanics
    of Materials, 7th ed., Sec. 5.8, from memory); Q(y) = (b/2)(h^2/4 - y^2) elsewhere."""
    b, h = 40.0, 90.0
    r = rectangle(b, h)
    assert first_moment_above(r, 0.0) == pytest.approx(b * h**2 / 8, rel=1e-13)
    for y in (-30.0, -5.0, 12.5, 44.0):
        assert first_moment_above(r, y) == pytest.approx(b / 2 * (h**2 / 4 - y**2), rel=1e-12)


@pytest.mark.parametrize("n", [64, 256, 1024])
def test_circle_and_tube_converge_as_inverse_square(n: int) -> None:
    """Inscribed n-gon of radius r: A = (n/2) r^2 sin(2 pi/n) exactly, and the relative
    errors of A and I against the true circle (pi r^2, pi r^4/4) are about (2 pi/n)^2/6
    and (2 pi/n)^2/3 (series expansion of sin): polygon route converges as 1/n^2."""
    d = 50.0
    r = d / 2
    pc, exact = polygon_properties(circle(d, segments=n)), circle_properties(d)
    assert pc.A == pytest.approx(n / 2 * r**2 * math.sin(2 * math.pi / n), rel=1e-13)
    e = (2 * math.pi / n) ** 2
    assert abs(pc.A / exact.A - 1) == pytest.approx(e / 6, rel=0.05)
    assert abs(pc.Ixx / exact.Ixx - 1) == pytest.approx(e / 3, rel=0.05)
    pt, et = polygon_properties(tube(d, 4.0, segments=n)), tube_properties(d, 4.0)
    assert abs(pt.A / et.A - 1) < 1.1 * e / 6
    assert abs(pt.Iyy / et.Iyy - 1) < 1.1 * e / 3
    assert abs(pt.Ixy) < 1e-12 * et.Ixx


def test_circle_first_moment_and_chord() -> None:
    """True circle: Q(y) = (2/3)(r^2 - y^2)^(3/2) and b(y) = 2 sqrt(r^2 - y^2) (integration
    of the circular segment); the 4096-gon agrees to its discretisation error."""
    r = 10.0
    c = circle(2 * r, segments=4096)
    for y in (0.0, 3.0, -6.5, 9.0):
        assert first_moment_above(c, y) == pytest.approx(
            2 / 3 * (r * r - y * y) ** 1.5, rel=1e-5)
        assert chord_length(c, y) == pytest.approx(2 * math.sqrt(r * r - y * y), rel=1e-5)


def _fillet_area(r: float, m: int) -> float:
    """Material of one polygonal fillet: the r x r corner square minus the fan of m
    triangles of the inscribed quarter circle, r^2 - (m/2) r^2 sin(pi/(2m)) (geometry);
    tends to r^2 (1 - pi/4) for true arcs."""
    return r * r - m / 2 * r * r * math.sin(math.pi / (2 * m))


@pytest.mark.parametrize("segments", [16, 256])
def test_root_radius_area_exact_and_converging(segments: int) -> None:
    """Four polygonal fillets add exactly 4 _fillet_area(r, segments // 4) to the sharp I,
    which converges to the true-arc (4 - pi) r^2 as 1/m^2 (error r^2 (pi/2)^3/(12 m^2)
    per fillet, from the series of sin)."""
    p = dict(depth=300.0, flange_width=150.0, flange_thickness=10.7, web_thickness=7.1)
    r, m = 15.0, segments // 4
    a = polygon_properties(i(**p, root_radius=r, segments=segments)).A
    added = a - i_properties(**p).A
    assert added == pytest.approx(4 * _fillet_area(r, m), rel=1e-11)
    err = added - (4 - math.pi) * r * r
    assert err == pytest.approx(4 * r * r * (math.pi / 2) ** 3 / (12 * m * m), rel=0.01)


def test_published_section_tables() -> None:
    """With root radii modelled, published tables (from memory): IPE 300 (h 300, b 150,
    tw 7.1, tf 10.7, r 15 mm): A = 53.81 cm^2, Iy = 8356 cm^4, Iz = 603.8 cm^4 (European
    IPE tables); UB 305x165x40 (h 303.4, b 165.0, tw 6.0, tf 10.2, r 8.9 mm):
    A = 51.3 cm^2, Iy = 8503 cm^4, Iz = 764 cm^4 (UK section tables).  Tolerance: the
    rounding of the tabulated figures."""
    p = dict(depth=300.0, flange_width=150.0, flange_thickness=10.7, web_thickness=7.1)
    fil = polygon_properties(i(**p, root_radius=15.0))
    assert fil.A / 1e2 == pytest.approx(53.81, abs=0.006)
    assert fil.Ixx / 1e4 == pytest.approx(8356, abs=0.6)
    assert fil.Iyy / 1e4 == pytest.approx(603.8, abs=0.06)
    ub = polygon_properties(i(303.4, 165.0, 10.2, 6.0, root_radius=8.9))
    assert ub.A / 1e2 == pytest.approx(51.3, abs=0.06)
    assert ub.Ixx / 1e4 == pytest.approx(8503, abs=0.6)
    assert ub.Iyy / 1e4 == pytest.approx(764, abs=0.6)


def test_fillets_on_channel_and_tee() -> None:
    """Channel and tee have two polygonal root fillets each (geometry, _fillet_area)."""
    r = 8.0
    add = 2 * _fillet_area(r, 64)
    c = dict(depth=200.0, flange_width=75.0, flange_thickness=11.5, web_thickness=8.5)
    assert polygon_properties(channel(**c, root_radius=r)).A == pytest.approx(
        channel_properties(**c).A + add, rel=1e-12)
    t = dict(depth=120.0, flange_width=100.0, flange_thickness=12.0, web_thickness=7.0)
    assert polygon_properties(tee(**t, root_radius=r)).A == pytest.approx(
        tee_properties(**t).A + add, rel=1e-12)


def test_chords_and_segments() -> None:
    """Chords of a sharp I: flange width b in the flange, web t_w in the web, 0 above the
    top; box: two walls of thickness t at mid-height; channel cut x = const through the
    flanges gives the two flange thicknesses (geometry)."""
    s = i(300.0, 150.0, 10.7, 7.1)
    assert chord_length(s, 145.0) == pytest.approx(150.0, rel=1e-14)
    assert chord_length(s, 0.0) == pytest.approx(7.1, rel=1e-14)
    assert chord_length(s, 150.0) == 0.0 and chord_length(s, 151.0) == 0.0
    assert chord_length(s, -150.0) == pytest.approx(150.0, rel=1e-14)
    bx = box(120.0, 200.0, 6.0)
    segs = chord_segments(bx, 10.0)
    assert segs == [pytest.approx((-60.0, -54.0)), pytest.approx((54.0, 60.0))]
    ch = channel(200.0, 75.0, 11.5, 8.5)
    ys = chord_segments_x(ch, 40.0)
    assert ys == [pytest.approx((-100.0, -88.5)), pytest.approx((88.5, 100.0))]
    assert chord_length_x(ch, 4.0) == pytest.approx(200.0, rel=1e-14)


def test_orientation_is_normalised() -> None:
    """A clockwise outer ring and a counter-clockwise hole give the same properties as
    the normalised input (box of 100 x 60 with 80 x 40 hole: Ixx = (100 60^3 - 80 40^3)/12)."""
    outer = np.array([(-50, -30), (-50, 30), (50, 30), (50, -30)], float)  # clockwise
    hole = np.array([(-40, -20), (40, -20), (40, 20), (-40, 20)], float)  # counter-clockwise
    p = polygon_properties(polygon(outer, [hole]))
    assert p.A == pytest.approx(100 * 60 - 80 * 40, rel=1e-14)
    assert p.Ixx == pytest.approx((100 * 60**3 - 80 * 40**3) / 12, rel=1e-13)
    normalised = Outline(outer, (hole,))
    assert _signed(normalised.outer) > 0 and _signed(normalised.holes[0]) < 0


def _signed(ring: np.ndarray) -> float:
    x, y = ring[:, 0], ring[:, 1]
    return float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))


def test_principal_axes_of_rotated_rectangle() -> None:
    """A 30 x 50 rectangle (width along x) rotated by 30 deg: principal values stay
    b h^3/12 = 312500 and h b^3/12 = 112500 and the I1 axis (the rectangle's own x) is at
    +30 deg (rotation of axes, Gere & Goodno, Mechanics of Materials, 7th ed., Sec.
    12.8, from memory)."""
    th = math.radians(30)
    rot = np.array([[math.cos(th), -math.sin(th)], [math.sin(th), math.cos(th)]])
    p = polygon_properties(polygon(rectangle(30, 50).outer @ rot.T))
    assert p.I1 == pytest.approx(30 * 50**3 / 12, rel=1e-12)
    assert p.I2 == pytest.approx(50 * 30**3 / 12, rel=1e-12)
    assert p.angle == pytest.approx(th, rel=1e-12)


def test_equal_angle_principal_axis_at_45_degrees() -> None:
    """Equal-leg angle: Ixx = Iyy, so the principal axes are at 45 deg and
    I1,2 = Ixx -+ Ixy (Ixy < 0); symmetry about the line y = x."""
    p = polygon_properties(angle(100.0, 100.0, 10.0))
    assert p.Ixy < 0
    assert p.angle == pytest.approx(math.pi / 4, rel=1e-12)
    assert p.I1 == pytest.approx(p.Ixx - p.Ixy, rel=1e-12)


def test_registry_and_errors() -> None:
    """The registry holds the nine named shapes; section_outline builds them and rejects
    unknown shapes, unknown or missing parameters and impossible dimensions."""
    assert set(SHAPES) == {"rectangle", "circle", "tube", "box", "i", "channel", "tee",
                           "angle", "polygon"}
    a = polygon_properties(section_outline("tee", depth=120.0, flange_width=100.0,
                                           flange_thickness=12.0, web_thickness=7.0))
    _close(a, tee_properties(120.0, 100.0, 12.0, 7.0), 1e-12)
    with pytest.raises(ValueError, match="valid shapes: angle, box"):
        section_outline("hexagon", size=1.0)
    with pytest.raises(ValueError, match="'height'"):
        section_outline("rectangle", width=1.0, height=2.0)
    with pytest.raises(ValueError, match="'depth'"):
        section_outline("rectangle", width=1.0)
    with pytest.raises(ValueError, match="wall"):
        section_outline("tube", diameter=10.0, wall=5.0)
    with pytest.raises(ValueError, match="root radius"):
        i(100.0, 50.0, 10.0, 6.0, root_radius=40.0)
