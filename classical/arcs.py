"""Circular arcs given by a bulge, and their faceting into polylines.

An outline is a ring of vertices; the edge from vertex k to vertex k + 1 is straight when
its bulge b_k is 0 and a circular arc otherwise. The bulge is the DXF convention (an open
standard): b = tan(theta / 4), theta the arc's included angle, positive when the arc runs
counter-clockwise from the first point to the second. For a chord of length c:

* radius           r = c (1 + b^2) / (4 |b|)
* sagitta          s = b c / 2 (signed: the arc's midpoint lies s to the right of the chord
                   direction; a counter-clockwise arc bulges to the right of its chord)
* centre           chord midpoint + n_right (s - sign(b) r), n_right the unit right normal
* tangent at start the chord direction turned by -theta/2, at the end by +theta/2

(bulge geometry: the DXF reference, LWPOLYLINE group code 42; the rest is plane geometry,
common practice). b = 1 is a half circle; |b| > 1 an arc of more than half a circle.

The hand side works on polygons (Green's theorem, exact clipping): arcs are faceted into
chords no farther than ``FACET_SAGITTA`` times the radius from the true arc.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

__all__ = [
    "FACET_SAGITTA",
    "FACET_ANGLE",
    "STRAIGHT_BULGE",
    "arc_centre",
    "arc_radius",
    "arc_angle",
    "arc_midpoint",
    "arc_tangents",
    "facet_arc",
    "facet_ring",
    "ring_circle",
]

# Chords of a faceted arc stay within this fraction of the radius of the true arc. An
# inscribed chord of half-angle a has sagitta r (1 - cos a) ~ r a^2 / 2 and cuts off the
# area (2/3) s c of its segment, so a faceted disc loses (4/3) FACET_SAGITTA of its area
# (2.7e-5) and its second moment about a diameter about twice that; first moments Q and
# chord widths b are off by the same order. The hand values (VQ/(Ib), V/A) therefore agree
# with the true arcs to a few parts in 1e5, far below any tolerance of a check (and 4 x
# closer than the 256-gon circles of classical.shapes). The largest turn at a facet vertex
# is FACET_ANGLE = 2 acos(1 - FACET_SAGITTA) = 0.72 degrees, so no facet vertex can pass
# for a corner (fem.case.outline.CORNER_ANGLE is 190 degrees). A full circle takes 497
# chords: the polygon routes scan a cut at every vertex height (cost ~ vertices^2), and
# 1e-6 (2221 chords) made a half-circle section's hand side take 5 s instead of 0.3 s.
FACET_SAGITTA = 2e-5
FACET_ANGLE = 2.0 * math.acos(1.0 - FACET_SAGITTA)  # [rad] largest angle of one chord
# |bulge| below this is a straight edge: the arc's sagitta would be below 5e-9 of its chord,
# round-off of a drawing program rather than a curve.
STRAIGHT_BULGE = 1e-8


def _chord(p0: Sequence[float], p1: Sequence[float]) -> tuple[np.ndarray, float]:
    a, b = np.asarray(p0, float)[:2], np.asarray(p1, float)[:2]
    return b - a, float(np.hypot(*(b - a)))


def arc_angle(bulge: float) -> float:
    """Included angle theta = 4 atan(b) [rad], signed (+ counter-clockwise)."""
    return 4.0 * math.atan(bulge)


def arc_radius(p0: Sequence[float], p1: Sequence[float], bulge: float) -> float:
    """Radius r = c (1 + b^2) / (4 |b|) of the arc from p0 to p1 [length]; b != 0."""
    _, c = _chord(p0, p1)
    return c * (1.0 + bulge * bulge) / (4.0 * abs(bulge))


def arc_centre(p0: Sequence[float], p1: Sequence[float], bulge: float) -> np.ndarray:
    """Centre of the arc from p0 to p1 with bulge b != 0 (see the module docstring)."""
    d, c = _chord(p0, p1)
    mid = 0.5 * (np.asarray(p0, float)[:2] + np.asarray(p1, float)[:2])
    right = np.array([d[1], -d[0]]) / c
    s = 0.5 * bulge * c
    return mid + right * (s - math.copysign(arc_radius(p0, p1, bulge), bulge))


def arc_midpoint(p0: Sequence[float], p1: Sequence[float], bulge: float) -> np.ndarray:
    """The point of the arc halfway along it: chord midpoint + sagitta to the right."""
    d, c = _chord(p0, p1)
    mid = 0.5 * (np.asarray(p0, float)[:2] + np.asarray(p1, float)[:2])
    return mid + np.array([d[1], -d[0]]) / c * (0.5 * bulge * c)


def arc_tangents(p0: Sequence[float], p1: Sequence[float], bulge: float
                 ) -> tuple[np.ndarray, np.ndarray]:
    """Unit tangents (direction of travel) at the start and at the end of the edge."""
    d, c = _chord(p0, p1)
    u = d / c
    half = 0.5 * arc_angle(bulge)

    def turned(a: float) -> np.ndarray:
        return np.array([u[0] * math.cos(a) - u[1] * math.sin(a),
                         u[0] * math.sin(a) + u[1] * math.cos(a)])

    return turned(-half), turned(half)


def facet_arc(p0: Sequence[float], p1: Sequence[float], bulge: float,
              sagitta: float = FACET_SAGITTA) -> np.ndarray:
    """Points of the faceted edge from p0 up to (not including) p1, shape (n, 2).

    A straight edge (|bulge| < STRAIGHT_BULGE) gives p0 alone; an arc gives n equal chords
    with vertices on the true arc, n = ceil(|theta| / (2 acos(1 - sagitta))).
    """
    start = np.asarray(p0, float)[:2]
    if abs(bulge) < STRAIGHT_BULGE:
        return start[None, :]
    theta = arc_angle(bulge)
    n = max(1, math.ceil(abs(theta) / (2.0 * math.acos(1.0 - sagitta)) - 1e-9))
    ctr = arc_centre(p0, p1, bulge)
    r = arc_radius(p0, p1, bulge)
    a0 = math.atan2(start[1] - ctr[1], start[0] - ctr[0])
    a = a0 + theta * np.arange(n) / n
    pts = ctr + r * np.column_stack([np.cos(a), np.sin(a)])
    pts[0] = start  # exactly the given vertex
    return pts


def facet_ring(points: Sequence[Sequence[float]], bulges: Sequence[float] | None = None,
               sagitta: float = FACET_SAGITTA) -> np.ndarray:
    """The closed ring as a polygon (n, 2), without the closing repeat of the first point.

    ``bulges[k]`` belongs to the edge from vertex k to vertex k + 1 (the last to the first);
    None or an empty sequence means every edge is straight.
    """
    pts = np.asarray([p[:2] for p in points], float)
    if bulges is None or len(bulges) == 0 or not np.any(np.abs(bulges) >= STRAIGHT_BULGE):
        return pts
    n = len(pts)
    parts = [facet_arc(pts[k], pts[(k + 1) % n], float(bulges[k]), sagitta) for k in range(n)]
    return np.vstack(parts)


def ring_circle(points: Sequence[Sequence[float]], bulges: Sequence[float],
                rel: float = 1e-9) -> tuple[float, float, float] | None:
    """(xc, yc, r) when every edge of the ring is an arc of one circle turning once round
    it (a circle drawn as two or more arcs), else None."""
    pts = np.asarray([p[:2] for p in points], float)
    n = len(pts)
    if n < 2 or len(bulges) != n or any(abs(b) < STRAIGHT_BULGE for b in bulges):
        return None
    if not (all(b > 0 for b in bulges) or all(b < 0 for b in bulges)):
        return None
    centres = [arc_centre(pts[k], pts[(k + 1) % n], bulges[k]) for k in range(n)]
    radii = [arc_radius(pts[k], pts[(k + 1) % n], bulges[k]) for k in range(n)]
    r = radii[0]
    if any(abs(q - r) > rel * r for q in radii):
        return None
    if any(float(np.hypot(*(c - centres[0]))) > rel * r for c in centres):
        return None
    if abs(abs(sum(arc_angle(b) for b in bulges)) - 2.0 * math.pi) > 1e-6:
        return None
    return (float(centres[0][0]), float(centres[0][1]), float(r))
