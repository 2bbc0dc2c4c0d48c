"""Cross-section properties by the polygon route (Green's theorem and exact clipping).

A section is an :class:`Outline`: one outer ring and any number of holes, each a
polygon of straight edges.  Area, centroid and second moments follow exactly from
Green's theorem over the edges; the first moment Q of the material on one side of a
cut and the chord length b on the cut come from exact half-plane clipping and edge
crossings.  Curved boundaries must therefore be discretised by the caller (the shape
builders in :mod:`classical.shapes` do it), and the properties are those of the polygon.

Coordinates are the user's; all moments are about the centroidal axes parallel to x
and y:  Ixx = integral of (y - cy)^2 dA, Iyy = integral of (x - cx)^2 dA,
Ixy = integral of (x - cx)(y - cy) dA.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

__all__ = [
    "Outline",
    "SectionProperties",
    "chord_length",
    "chord_length_x",
    "chord_segments",
    "chord_segments_x",
    "first_moment_above",
    "first_moment_right",
    "polygon_properties",
]


@dataclass(frozen=True)
class SectionProperties:
    """Area properties of a section about its centroidal axes.

    Attributes
    ----------
    A : float
        Area [L^2].
    cx, cy : float
        Centroid [L].
    Ixx, Iyy, Ixy : float
        Centroidal second moments [L^4]: Ixx = int (y-cy)^2 dA, Iyy = int (x-cx)^2 dA,
        Ixy = int (x-cx)(y-cy) dA.
    I1, I2 : float
        Principal second moments, I1 >= I2:
        (Ixx+Iyy)/2 +- sqrt(((Ixx-Iyy)/2)^2 + Ixy^2).
    angle : float
        Angle [rad] from the x axis to the axis about which the second moment is I1,
        counter-clockwise positive, in (-pi/2, pi/2]:  angle = atan2(-2 Ixy, Ixx - Iyy)/2,
        from I(theta) = Ixx cos^2 + Iyy sin^2 - 2 Ixy sin cos (common practice, e.g.
        Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 12.8, from memory).  Set to 0 when
        I1 - I2 <= 1e-12 (Ixx + Iyy) (every centroidal axis is principal).
    """

    A: float
    cx: float
    cy: float
    Ixx: float
    Iyy: float
    Ixy: float
    I1: float
    I2: float
    angle: float

    @classmethod
    def from_centroidal(
        cls, A: float, cx: float, cy: float, Ixx: float, Iyy: float, Ixy: float
    ) -> SectionProperties:
        """Build the record from centroidal values, computing the principal ones."""
        mean = 0.5 * (Ixx + Iyy)
        radius = math.hypot(0.5 * (Ixx - Iyy), Ixy)
        if radius <= 0.5e-12 * abs(Ixx + Iyy):
            theta = 0.0
        else:
            theta = 0.5 * math.atan2(-2.0 * Ixy, Ixx - Iyy)
            if theta <= -0.5 * math.pi:
                theta += math.pi
        return cls(
            float(A), float(cx), float(cy), float(Ixx), float(Iyy), float(Ixy),
            mean + radius, mean - radius, theta,
        )


def _clean_ring(points: object, what: str) -> np.ndarray:
    ring = np.array(points, dtype=float)
    if ring.ndim != 2 or ring.shape[1] != 2:
        raise ValueError(f"{what} must be an (n, 2) array of points, got shape {ring.shape}")
    if len(ring) > 1 and np.array_equal(ring[0], ring[-1]):
        ring = ring[:-1]
    if len(ring) < 3 or not np.all(np.isfinite(ring)):
        raise ValueError(f"{what} needs at least 3 finite distinct points")
    return ring


def _signed_area(ring: np.ndarray) -> float:
    x, y = ring[:, 0], ring[:, 1]
    return 0.5 * float(np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y))


def _oriented(ring: np.ndarray, ccw: bool) -> np.ndarray:
    area = _signed_area(ring)
    if area == 0.0:
        raise ValueError("a ring has zero area")
    return ring if (area > 0) == ccw else ring[::-1].copy()


@dataclass(frozen=True, eq=False)
class Outline:
    """A section outline: an outer ring and holes (polygons, straight edges).

    ``outer`` is stored counter-clockwise and every hole clockwise whatever the input
    orientation; a repeated closing point is dropped.  Holes must lie inside the outer
    ring and must not overlap each other (not checked).  Arrays are read-only copies.
    """

    outer: np.ndarray
    holes: tuple[np.ndarray, ...] = field(default=())

    def __post_init__(self) -> None:
        outer = _oriented(_clean_ring(self.outer, "outer"), ccw=True)
        holes = tuple(
            _oriented(_clean_ring(h, f"hole {k}"), ccw=False) for k, h in enumerate(self.holes)
        )
        for ring in (outer, *holes):
            ring.setflags(write=False)
        object.__setattr__(self, "outer", outer)
        object.__setattr__(self, "holes", holes)

    @property
    def rings(self) -> tuple[np.ndarray, ...]:
        """Outer ring (counter-clockwise) followed by the holes (clockwise)."""
        return (self.outer, *self.holes)

    @property
    def bounds(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the outer ring."""
        lo, hi = self.outer.min(axis=0), self.outer.max(axis=0)
        return float(lo[0]), float(lo[1]), float(hi[0]), float(hi[1])


def _ring_moments(ring: np.ndarray) -> np.ndarray:
    """Signed [A, int x, int y, int x^2, int y^2, int xy] of one ring (Green's theorem).

    With c_i = x_i y_{i+1} - x_{i+1} y_i:  A = sum c_i / 2,
    int x = sum (x_i + x_{i+1}) c_i / 6,  int x^2 = sum (x_i^2 + x_i x_{i+1} + x_{i+1}^2) c_i / 12,
    int xy = sum (x_i y_{i+1} + 2 x_i y_i + 2 x_{i+1} y_{i+1} + x_{i+1} y_i) c_i / 24
    (common practice; e.g. Steger, "On the calculation of arbitrary moments of polygons",
    1996, from memory).  Positive for a counter-clockwise ring.
    """
    if len(ring) < 3:
        return np.zeros(6)
    x, y = ring[:, 0], ring[:, 1]
    xn, yn = np.roll(x, -1), np.roll(y, -1)
    c = x * yn - xn * y
    return np.array([
        np.sum(c) / 2.0,
        np.sum((x + xn) * c) / 6.0,
        np.sum((y + yn) * c) / 6.0,
        np.sum((x * x + x * xn + xn * xn) * c) / 12.0,
        np.sum((y * y + y * yn + yn * yn) * c) / 12.0,
        np.sum((x * yn + 2.0 * x * y + 2.0 * xn * yn + xn * y) * c) / 24.0,
    ])


def _net_moments(rings: Sequence[np.ndarray]) -> np.ndarray:
    return np.sum([_ring_moments(r) for r in rings], axis=0)


def _centroid(outline: Outline) -> tuple[float, float]:
    ref = outline.outer.mean(axis=0)
    m = _net_moments([r - ref for r in outline.rings])
    if not m[0] > 0.0:
        raise ValueError("outline has non-positive net area")
    return float(ref[0] + m[1] / m[0]), float(ref[1] + m[2] / m[0])


def polygon_properties(outline: Outline) -> SectionProperties:
    """Exact area properties of a polygonal outline by Green's theorem.

    A = sum over rings of (1/2) sum (x_i y_{i+1} - x_{i+1} y_i); first and second moments
    by the edge sums of :func:`_ring_moments`; holes (clockwise) enter with negative sign.
    Moments are evaluated in coordinates shifted to the centroid (two passes) so that
    no large parallel-axis cancellation occurs.  Exact for straight-sided outlines up to
    rounding; valid for any simple outer ring with disjoint holes inside it.
    Source: Green's theorem in the plane; common practice.
    """
    cx, cy = _centroid(outline)
    m = _net_moments([r - (cx, cy) for r in outline.rings])
    area, sx, sy = m[0], m[1], m[2]
    ixx = m[4] - sy * sy / area
    iyy = m[3] - sx * sx / area
    ixy = m[5] - sx * sy / area
    return SectionProperties.from_centroidal(
        area, cx + sx / area, cy + sy / area, ixx, iyy, ixy
    )


def _clip_above(ring: np.ndarray, c: float) -> np.ndarray:
    """Sutherland-Hodgman clip of one ring to the half-plane y >= c (orientation kept).

    For a non-convex ring the result may contain coincident edges along y = c; they
    cancel in every Green's-theorem integral, so the moments stay exact.
    """
    inside = ring[:, 1] >= c
    if inside.all():
        return ring
    if not inside.any():
        return ring[:0]
    nxt = np.roll(ring, -1, axis=0)
    cross = inside != (nxt[:, 1] >= c)
    with np.errstate(divide="ignore", invalid="ignore"):
        t = (c - ring[:, 1]) / (nxt[:, 1] - ring[:, 1])
    hit = np.column_stack([ring[:, 0] + t * (nxt[:, 0] - ring[:, 0]), np.full(len(ring), c)])
    points = np.stack([ring, hit], axis=1)
    return points[np.column_stack([inside, cross])]


def _first_moment_of_side(outline: Outline, cut: float, axis: int) -> float:
    """Q of the material on the far side (coordinate ``axis`` > cut) about the centroid.

    The smaller side is clipped (Q of the whole is zero, so Q_far = -Q_near), which keeps
    Q accurate relative to itself near either edge.  Coordinates are mapped so that the
    clipped side is u >= u_cut; mirroring or swapping axes reverses ring orientation.
    """
    centre = np.array(_centroid(outline))
    local = cut - centre[axis]
    flip = -1.0 if local < 0 else 1.0
    scale = np.array([1.0, flip]) if axis == 1 else np.array([flip, 1.0])
    rings = [(r - centre) * scale for r in outline.rings]
    if axis == 0:
        rings = [r[:, ::-1] for r in rings]
    orientation = flip * (-1.0 if axis == 0 else 1.0)
    return orientation * float(sum(_ring_moments(_clip_above(r, flip * local))[2] for r in rings))


def first_moment_above(outline: Outline, y_cut: float) -> float:
    """First moment Q [L^3] of the material above y = y_cut about the centroidal x axis.

    Q = integral over {y > y_cut} of (y - cy) dA, exact for polygons:
    Q = Q(outer clipped to y >= y_cut) - sum Q(hole clipped to y >= y_cut), each clipped
    ring by Sutherland-Hodgman and Green's theorem.  Q(y_cut <= ymin) = 0 up to rounding
    (the full section about its own centroid).  Source: definition of the first moment
    in the shear formula, e.g. Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 5.8 (section
    number from memory).
    """
    return _first_moment_of_side(outline, float(y_cut), axis=1)


def first_moment_right(outline: Outline, x_cut: float) -> float:
    """First moment Q [L^3] of the material right of x = x_cut about the centroidal y axis.

    Q = integral over {x > x_cut} of (x - cx) dA; the counterpart of
    :func:`first_moment_above` for a shear along x (bending about y).
    """
    return _first_moment_of_side(outline, float(x_cut), axis=0)


def _segments(rings: Sequence[np.ndarray], c: float) -> list[tuple[float, float]]:
    """Material intervals of the line y = c + 0 (the limit from above); intervals
    shorter than 1e-12 of the outline's width (rounding at a vertex) are dropped."""
    hits = []
    for ring in rings:
        nxt = np.roll(ring, -1, axis=0)
        m = (ring[:, 1] > c) != (nxt[:, 1] > c)
        a, b = ring[m], nxt[m]
        hits.append(a[:, 0] + (c - a[:, 1]) / (b[:, 1] - a[:, 1]) * (b[:, 0] - a[:, 0]))
    xs = np.sort(np.concatenate(hits))
    tiny = 1e-12 * float(np.ptp(rings[0][:, 0]))
    merged: list[list[float]] = []
    for lo, hi in xs.reshape(-1, 2):
        if hi - lo <= tiny:
            continue
        if merged and lo <= merged[-1][1]:
            merged[-1][1] = max(merged[-1][1], float(hi))
        else:
            merged.append([float(lo), float(hi)])
    return [(lo, hi) for lo, hi in merged]


def chord_segments(outline: Outline, y_cut: float) -> list[tuple[float, float]]:
    """x-intervals (x_start, x_end) of material on the line y = y_cut, left to right.

    Found from the crossings of the line with every ring edge (even-odd rule, holes
    subtracted).  Where the line runs along a horizontal edge the chord is the limit
    from above (y_cut + 0): the top edge of a rectangle gives no chord, the bottom edge
    the full width.  Source: geometry; common practice.
    """
    return _segments(outline.rings, float(y_cut))


def chord_length(outline: Outline, y_cut: float) -> float:
    """Total material length b [L] of the line y = y_cut (sum of :func:`chord_segments`)."""
    return float(sum(hi - lo for lo, hi in chord_segments(outline, y_cut)))


def chord_segments_x(outline: Outline, x_cut: float) -> list[tuple[float, float]]:
    """y-intervals of material on the line x = x_cut (limit from the right, x_cut + 0)."""
    return _segments([r[:, ::-1] for r in outline.rings], float(x_cut))


def chord_length_x(outline: Outline, x_cut: float) -> float:
    """Total material length [L] of the line x = x_cut."""
    return float(sum(hi - lo for lo, hi in chord_segments_x(outline, x_cut)))
