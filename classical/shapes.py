"""Outline builders for standard shapes and their exact closed-form properties.

Frames (all lengths in one consistent unit):

* rectangle, circle, tube, box, i: centred on the origin (symmetric about x and y).
* channel: back of the web on x = 0, flanges pointing +x, symmetric about y = 0.
* tee: web centred on x = 0, web tip on y = 0, flange on top (top face y = depth).
* angle: outer corner at the origin, legs along +x and +y.

Curved boundaries are polygons with vertices on the true arc: ``segments`` edges per
full circle, ``segments // 4`` per quarter-circle root fillet.  The inscribed polygon
of n edges has area (n/2) r^2 sin(2 pi/n), a relative error of about (2 pi/n)^2 / 6,
so the polygon route converges as 1/n^2 to the closed forms below (true arcs).
Root fillets are tangent to the web face and the inner flange face (rolled-section
practice); the closed forms for i, channel and tee are for sharp roots (no fillet).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from classical.geometry import Outline, SectionProperties

__all__ = [
    "angle",
    "angle_properties",
    "box",
    "box_properties",
    "channel",
    "channel_properties",
    "circle",
    "circle_properties",
    "i",
    "i_properties",
    "polygon",
    "rectangle",
    "rectangle_properties",
    "tee",
    "tee_properties",
    "tube",
    "tube_properties",
]


def _require(condition: bool, message: str) -> None:
    if not condition:
        raise ValueError(message)


def _positive(**values: float) -> None:
    for name, value in values.items():
        _require(math.isfinite(value) and value > 0.0, f"{name} must be > 0, got {value!r}")


def _flanged(depth: float, width: float, t_f: float, t_w: float, r: float) -> None:
    _positive(depth=depth, flange_width=width, flange_thickness=t_f, web_thickness=t_w)
    _require(math.isfinite(r) and r >= 0.0, f"root_radius must be >= 0, got {r!r}")


def _arc(radius: float, n: int, start: float = 0.0, sweep: float = 2.0 * math.pi) -> np.ndarray:
    theta = start + sweep * np.arange(n) / n
    return radius * np.column_stack([np.cos(theta), np.sin(theta)])


def _rounded(corners: Sequence[tuple[float, float]], radii: Sequence[float], n: int) -> np.ndarray:
    """Ring through ``corners``; a right-angled corner with radius r > 0 becomes a
    quarter circle of ``n`` edges tangent to both adjacent edges."""
    pts = np.asarray(corners, dtype=float)
    out: list[np.ndarray] = []
    for k, c in enumerate(pts):
        r = radii[k]
        if r == 0.0:
            out.append(c[None, :])
            continue
        u = pts[k - 1] - c
        w = pts[(k + 1) % len(pts)] - c
        u, w = u / np.linalg.norm(u), w / np.linalg.norm(w)
        centre = c + r * (u + w)
        a0 = math.atan2(-w[1], -w[0])
        sweep = (math.atan2(-u[1], -u[0]) - a0 + math.pi) % (2.0 * math.pi) - math.pi
        theta = a0 + sweep * np.linspace(0.0, 1.0, n + 1)
        out.append(centre + r * np.column_stack([np.cos(theta), np.sin(theta)]))
    return np.vstack(out)


def rectangle(width: float, depth: float) -> Outline:
    """Solid rectangle width (along x) by depth (along y), centred on the origin."""
    _positive(width=width, depth=depth)
    w, d = 0.5 * width, 0.5 * depth
    return Outline(np.array([(-w, -d), (w, -d), (w, d), (-w, d)]))


def circle(diameter: float, segments: int = 256) -> Outline:
    """Solid circle centred on the origin; regular inscribed polygon of ``segments`` edges."""
    _positive(diameter=diameter)
    _require(segments >= 3, "segments must be >= 3")
    return Outline(_arc(0.5 * diameter, segments))


def tube(diameter: float, wall: float, segments: int = 256) -> Outline:
    """Circular tube of outside diameter and wall thickness, centred on the origin."""
    _positive(diameter=diameter, wall=wall)
    _require(2.0 * wall < diameter, "wall must be < diameter/2")
    _require(segments >= 3, "segments must be >= 3")
    r = 0.5 * diameter
    return Outline(_arc(r, segments), (_arc(r - wall, segments),))


def box(width: float, depth: float, wall: float) -> Outline:
    """Rectangular hollow section with sharp corners and uniform wall, centred."""
    _positive(width=width, depth=depth, wall=wall)
    _require(2.0 * wall < min(width, depth), "wall must be < min(width, depth)/2")
    return Outline(
        rectangle(width, depth).outer, (rectangle(width - 2 * wall, depth - 2 * wall).outer,)
    )


def i(
    depth: float,
    flange_width: float,
    flange_thickness: float,
    web_thickness: float,
    root_radius: float = 0.0,
    segments: int = 256,
) -> Outline:
    """Doubly symmetric I section centred on the origin, web along y.

    Four root fillets of radius ``root_radius`` (``segments // 4`` edges each).
    """
    b, h, tf, tw, r = flange_width, depth, flange_thickness, web_thickness, root_radius
    _flanged(h, b, tf, tw, r)
    _require(tw + 2 * r <= b and 2 * (tf + r) < h, "flange/web/root radius do not fit")
    x, y, xw, yf = 0.5 * b, 0.5 * h, 0.5 * tw, 0.5 * h - tf
    corners = [(-x, -y), (x, -y), (x, -yf), (xw, -yf), (xw, yf), (x, yf),
               (x, y), (-x, y), (-x, yf), (-xw, yf), (-xw, -yf), (-x, -yf)]
    radii = [0, 0, 0, r, r, 0, 0, 0, 0, r, r, 0]
    return Outline(_rounded(corners, radii, max(1, segments // 4)))


def channel(
    depth: float,
    flange_width: float,
    flange_thickness: float,
    web_thickness: float,
    root_radius: float = 0.0,
    segments: int = 256,
) -> Outline:
    """Channel with the back of the web on x = 0, flanges toward +x, symmetric about y = 0."""
    b, h, tf, tw, r = flange_width, depth, flange_thickness, web_thickness, root_radius
    _flanged(h, b, tf, tw, r)
    _require(tw + r <= b and 2 * (tf + r) < h, "flange/web/root radius do not fit")
    y, yf = 0.5 * h, 0.5 * h - tf
    corners = [(0, -y), (b, -y), (b, -yf), (tw, -yf), (tw, yf), (b, yf), (b, y), (0, y)]
    radii = [0, 0, 0, r, r, 0, 0, 0]
    return Outline(_rounded(corners, radii, max(1, segments // 4)))


def tee(
    depth: float,
    flange_width: float,
    flange_thickness: float,
    web_thickness: float,
    root_radius: float = 0.0,
    segments: int = 256,
) -> Outline:
    """Tee with the flange on top (top face y = depth), web tip on y = 0, centred on x = 0."""
    b, h, tf, tw, r = flange_width, depth, flange_thickness, web_thickness, root_radius
    _flanged(h, b, tf, tw, r)
    _require(tw + 2 * r <= b and tf + r < h, "flange/web/root radius do not fit")
    x, xw, yf = 0.5 * b, 0.5 * tw, h - tf
    corners = [(-xw, 0), (xw, 0), (xw, yf), (x, yf), (x, h), (-x, h), (-x, yf), (-xw, yf)]
    radii = [0, 0, r, 0, 0, 0, 0, r]
    return Outline(_rounded(corners, radii, max(1, segments // 4)))


def angle(leg_x: float, leg_y: float, thickness: float) -> Outline:
    """Angle with the outer corner at the origin, legs along +x and +y, sharp corners."""
    _positive(leg_x=leg_x, leg_y=leg_y, thickness=thickness)
    t = thickness
    _require(t < min(leg_x, leg_y), "thickness must be < both legs")
    return Outline(np.array([(0, 0), (leg_x, 0), (leg_x, t), (t, t), (t, leg_y), (0, leg_y)]))


def polygon(points: Sequence[Sequence[float]], holes: Sequence[object] = ()) -> Outline:
    """Arbitrary polygon (any orientation) with optional holes inside it."""
    return Outline(np.asarray(points, dtype=float), tuple(np.asarray(h) for h in holes))


def rectangle_properties(width: float, depth: float) -> SectionProperties:
    """A = b h, Ixx = b h^3/12, Iyy = h b^3/12 (b = width, h = depth), centroid at 0.

    Source: Gere & Goodno, Mechanics of Materials, 7th ed., Appendix E (from memory).
    """
    _positive(width=width, depth=depth)
    b, h = width, depth
    return SectionProperties.from_centroidal(b * h, 0, 0, b * h**3 / 12, h * b**3 / 12, 0)


def circle_properties(diameter: float) -> SectionProperties:
    """True circle: A = pi d^2/4, Ixx = Iyy = pi d^4/64.  Source: Gere & Goodno, App. E."""
    _positive(diameter=diameter)
    i_ = math.pi * diameter**4 / 64
    return SectionProperties.from_centroidal(math.pi * diameter**2 / 4, 0, 0, i_, i_, 0)


def tube_properties(diameter: float, wall: float) -> SectionProperties:
    """True circular tube, d_i = d - 2 t: A = pi (d^2 - d_i^2)/4, I = pi (d^4 - d_i^4)/64.

    Source: difference of two circles (Gere & Goodno, App. E).
    """
    _positive(diameter=diameter, wall=wall)
    _require(2.0 * wall < diameter, "wall must be < diameter/2")
    d, di = diameter, diameter - 2 * wall
    i_ = math.pi * (d**4 - di**4) / 64
    return SectionProperties.from_centroidal(math.pi * (d**2 - di**2) / 4, 0, 0, i_, i_, 0)


def box_properties(width: float, depth: float, wall: float) -> SectionProperties:
    """Sharp-cornered box, b = width, h = depth, t = wall, b_i = b - 2t, h_i = h - 2t:
    A = b h - b_i h_i, Ixx = (b h^3 - b_i h_i^3)/12, Iyy = (h b^3 - h_i b_i^3)/12.

    Source: difference of two rectangles; common practice.
    """
    _positive(width=width, depth=depth, wall=wall)
    _require(2.0 * wall < min(width, depth), "wall must be < min(width, depth)/2")
    b, h, bi, hi = width, depth, width - 2 * wall, depth - 2 * wall
    return SectionProperties.from_centroidal(
        b * h - bi * hi, 0, 0, (b * h**3 - bi * hi**3) / 12, (h * b**3 - hi * bi**3) / 12, 0
    )


def i_properties(
    depth: float, flange_width: float, flange_thickness: float, web_thickness: float
) -> SectionProperties:
    """Sharp-rooted doubly symmetric I (h = depth, b = flange width, t_f, t_w):
    A = 2 b t_f + (h - 2 t_f) t_w,  Ixx = (b h^3 - (b - t_w)(h - 2 t_f)^3)/12,
    Iyy = (2 t_f b^3 + (h - 2 t_f) t_w^3)/12.

    Source: composite rectangles (Gere & Goodno, 7th ed., Sec. 5.10, from memory).
    """
    b, h, tf, tw = flange_width, depth, flange_thickness, web_thickness
    _flanged(h, b, tf, tw, 0.0)
    hw = h - 2 * tf
    return SectionProperties.from_centroidal(
        2 * b * tf + hw * tw, 0, 0, (b * h**3 - (b - tw) * hw**3) / 12,
        (2 * tf * b**3 + hw * tw**3) / 12, 0,
    )


def channel_properties(
    depth: float, flange_width: float, flange_thickness: float, web_thickness: float
) -> SectionProperties:
    """Sharp-rooted channel in the :func:`channel` frame (h = depth, b = flange width):
    A = 2 b t_f + h_w t_w with h_w = h - 2 t_f,  cx = (2 t_f b^2 + h_w t_w^2)/(2 A), cy = 0,
    Ixx = (b h^3 - (b - t_w) h_w^3)/12,  Iyy = (2 t_f b^3 + h_w t_w^3)/3 - A cx^2.

    Source: composite rectangles and the parallel-axis theorem; common practice.
    """
    b, h, tf, tw = flange_width, depth, flange_thickness, web_thickness
    _flanged(h, b, tf, tw, 0.0)
    hw = h - 2 * tf
    area = 2 * b * tf + hw * tw
    cx = (2 * tf * b**2 + hw * tw**2) / (2 * area)
    return SectionProperties.from_centroidal(
        area, cx, 0, (b * h**3 - (b - tw) * hw**3) / 12,
        (2 * tf * b**3 + hw * tw**3) / 3 - area * cx**2, 0,
    )


def tee_properties(
    depth: float, flange_width: float, flange_thickness: float, web_thickness: float
) -> SectionProperties:
    """Sharp-rooted tee in the :func:`tee` frame (h = depth, b = flange width, h_w = h - t_f):
    A = b t_f + h_w t_w,  cy = (b t_f (h - t_f/2) + t_w h_w^2/2)/A,
    Ixx = b t_f^3/12 + b t_f (h - t_f/2 - cy)^2 + t_w h_w^3/12 + t_w h_w (h_w/2 - cy)^2,
    Iyy = (t_f b^3 + h_w t_w^3)/12.

    Source: composite rectangles and the parallel-axis theorem; common practice.
    """
    b, h, tf, tw = flange_width, depth, flange_thickness, web_thickness
    _flanged(h, b, tf, tw, 0.0)
    hw = h - tf
    area = b * tf + hw * tw
    cy = (b * tf * (h - tf / 2) + tw * hw**2 / 2) / area
    ixx = b * tf**3 / 12 + b * tf * (h - tf / 2 - cy) ** 2 + tw * hw**3 / 12
    ixx += tw * hw * (hw / 2 - cy) ** 2
    return SectionProperties.from_centroidal(area, 0, cy, ixx, (tf * b**3 + hw * tw**3) / 12, 0)


def angle_properties(leg_x: float, leg_y: float, thickness: float) -> SectionProperties:
    """Angle in the :func:`angle` frame as two rectangles, a = leg_x, b = leg_y, t:
    horizontal leg A1 = a t at (a/2, t/2), vertical leg A2 = (b - t) t at (t/2, (b + t)/2);
    A = A1 + A2, centroid = area-weighted mean, and with the parallel-axis theorem
    Ixx = a t^3/12 + A1 (t/2 - cy)^2 + t (b - t)^3/12 + A2 ((b + t)/2 - cy)^2,
    Iyy = t a^3/12 + A1 (a/2 - cx)^2 + (b - t) t^3/12 + A2 (t/2 - cx)^2,
    Ixy = A1 (a/2 - cx)(t/2 - cy) + A2 (t/2 - cx)((b + t)/2 - cy)  (negative).

    Source: composite rectangles; common practice.
    """
    _positive(leg_x=leg_x, leg_y=leg_y, thickness=thickness)
    a, b, t = leg_x, leg_y, thickness
    _require(t < min(a, b), "thickness must be < both legs")
    a1, a2 = a * t, (b - t) * t
    x1, y1, x2, y2 = a / 2, t / 2, t / 2, (b + t) / 2
    area = a1 + a2
    cx, cy = (a1 * x1 + a2 * x2) / area, (a1 * y1 + a2 * y2) / area
    ixx = a * t**3 / 12 + a1 * (y1 - cy) ** 2 + t * (b - t) ** 3 / 12 + a2 * (y2 - cy) ** 2
    iyy = t * a**3 / 12 + a1 * (x1 - cx) ** 2 + (b - t) * t**3 / 12 + a2 * (x2 - cx) ** 2
    ixy = a1 * (x1 - cx) * (y1 - cy) + a2 * (x2 - cx) * (y2 - cy)
    return SectionProperties.from_centroidal(area, cx, cy, ixx, iyy, ixy)
