"""Arc edges in polygon outlines: reading, checking and faceting rings of vertices.

One form (README, case file): a vertex of a polygon outline is ``[x, y]`` or
``[x, y, bulge]``; the bulge belongs to the edge from that vertex to the next one (the last
vertex's to the first), 0 or left out = straight, b = tan(theta/4) with theta the arc's
included angle, positive counter-clockwise (the DXF convention, :mod:`classical.arcs`).
``[[1, 0, 1], [-1, 0], ...]`` starts with a half circle of radius 1 through (0, 1).

The FE models build these edges as true OCC arcs; shapely and the hand side use a faceting
within `classical.arcs.FACET_SAGITTA` of the radius.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

import numpy as np
import shapely
from shapely.geometry import LineString, Polygon

from classical.arcs import (
    STRAIGHT_BULGE,
    arc_angle,
    arc_centre,
    arc_radius,
    facet_arc,
    facet_ring,
)
from fem.case.reader import MAX_MAGNITUDE
from fem.errors import CaseError

__all__ = ["Arc", "read_ring", "ring_polygon", "ring_arcs", "check_ring", "on_arc",
           "MAX_BULGE", "MIN_ARC_RADIUS", "Vertex"]

Vertex = tuple[float, float, float]   # x, y, bulge of the edge to the next vertex
MAX_BULGE = 1e3       # |bulge| at most this (an arc of 359.5 degrees between two vertices)
MIN_ARC_RADIUS = 1e-4  # an arc's radius at least this x the outline's extent (as fillets)


def _show(v: Any) -> str:
    s = repr(v)
    return s if len(s) <= 40 else s[:37] + "..."


def read_ring(raw: Any, file: str, key: str) -> tuple[Vertex, ...]:
    """A TOML list of ``[x, y]`` / ``[x, y, bulge]`` vertices, checked one by one: at least
    three, or two joined by an arc (a half disc; two half circles make a circle)."""
    if not isinstance(raw, list) or len(raw) < 2:
        raise CaseError(file, key, "must be a list of at least three vertices [x, y] or "
                                   "[x, y, bulge]")
    out: list[Vertex] = []
    for i, v in enumerate(raw):
        k = f"{key}.{i}"
        if (not isinstance(v, list) or len(v) not in (2, 3)
                or not all(isinstance(x, int | float) and not isinstance(x, bool)
                           and math.isfinite(x) for x in v)):
            raise CaseError(file, k, f"must be a vertex [x, y] or [x, y, bulge] of finite "
                                     f"numbers, got {_show(v)}")
        if any(abs(x) > MAX_MAGNITUDE for x in v[:2]):
            raise CaseError(file, k, f"{_show(v)} is out of scale; numbers must lie within "
                                     f"+-{MAX_MAGNITUDE:g}")
        b = float(v[2]) if len(v) == 3 else 0.0
        if abs(b) > MAX_BULGE:
            raise CaseError(file, k, f"bulge {b:g} is out of range; |bulge| <= {MAX_BULGE:g} "
                                     "(1 is a half circle, 0 a straight edge)")
        out.append((float(v[0]), float(v[1]), 0.0 if abs(b) < STRAIGHT_BULGE else b))
    for i in range(1, len(out)):
        if out[i][:2] == out[i - 1][:2]:
            raise CaseError(file, f"{key}.{i}", f"{list(out[i][:2])} repeats the vertex before "
                                                "it; give each vertex once")
    if len(out) > 2 and out[-1][:2] == out[0][:2]:
        out.pop()   # a closing repeat of the first vertex: the ring closes by itself
    if len(out) < 3 and not any(v[2] for v in out):
        raise CaseError(file, key, "must be a list of at least three different vertices, or "
                                   "two joined by an arc")
    return tuple(out)


def ring_polygon(ring: Sequence[Sequence[float]]) -> Polygon:
    """The ring as a shapely polygon, arcs faceted (`classical.arcs.facet_ring`)."""
    pts = [p[:2] for p in ring]
    bulges = [p[2] if len(p) > 2 else 0.0 for p in ring]
    return Polygon(facet_ring(pts, bulges))


class Arc:
    """One arc edge: its ends, centre, radius and included angle (signed, radians)."""

    __slots__ = ("start", "end", "centre", "radius", "angle", "index")

    def __init__(self, start: Sequence[float], end: Sequence[float], bulge: float,
                 index: int) -> None:
        self.start = (float(start[0]), float(start[1]))
        self.end = (float(end[0]), float(end[1]))
        c = arc_centre(start, end, bulge)
        self.centre = (float(c[0]), float(c[1]))
        self.radius = arc_radius(start, end, bulge)
        self.angle = arc_angle(bulge)
        self.index = index


def ring_arcs(ring: Sequence[Sequence[float]]) -> list[Arc]:
    """The arc edges of a ring of vertices (index = the vertex the edge starts from)."""
    n = len(ring)
    return [Arc(ring[k], ring[(k + 1) % n], ring[k][2], k) for k in range(n)
            if len(ring[k]) > 2 and ring[k][2] != 0.0]


def on_arc(p: Sequence[float], arcs: Sequence[Arc], near: float) -> bool:
    """Is `p` on one of the arcs, away from the arc's ends by more than `near`?"""
    for a in arcs:
        if abs(math.dist(p, a.centre) - a.radius) >= near:
            continue
        if min(math.dist(p, a.start), math.dist(p, a.end)) <= near:
            continue
        a0 = math.atan2(a.start[1] - a.centre[1], a.start[0] - a.centre[0])
        ap = math.atan2(p[1] - a.centre[1], p[0] - a.centre[0])
        sweep = (ap - a0) % (2 * math.pi) if a.angle > 0 else (a0 - ap) % (2 * math.pi)
        if sweep < abs(a.angle):
            return True
    return False


def _edges(ring: Sequence[Sequence[float]]) -> list[LineString]:
    n = len(ring)
    out = []
    for k in range(n):
        b = ring[k][2] if len(ring[k]) > 2 else 0.0
        pts = np.vstack([facet_arc(ring[k], ring[(k + 1) % n], b), [ring[(k + 1) % n][:2]]])
        out.append(LineString(pts))
    return out


def check_ring(ring: Sequence[Sequence[float]], file: str, key: str, extent: float,
               small: float) -> Polygon:
    """Refuse a ring whose arcs are too small or that crosses itself; return its polygon.

    `extent`: the size of the outline (arc radii at least MIN_ARC_RADIUS x extent);
    `small`: the least distance between edges that do not meet (as for straight polygons).
    """
    for a in ring_arcs(ring):
        if a.radius < MIN_ARC_RADIUS * extent:
            raise CaseError(file, f"{key}.{a.index}", f"the arc from {list(a.start)} has radius "
                                                      f"{a.radius:.3g}, too small to model; at "
                                                      f"least {MIN_ARC_RADIUS * extent:.3g} "
                                                      "(or 0 bulge for a straight edge)")
    poly = ring_polygon(ring)
    if not poly.is_valid or poly.area <= 0:
        raise CaseError(file, key, "the outline crosses itself or has no area (an arc may "
                                   "swing across another edge; check the bulge signs: + runs "
                                   "counter-clockwise)")
    if not any(len(p) > 2 and p[2] != 0.0 for p in ring):
        return poly
    edges = _edges(ring)
    n = len(edges)
    tree = shapely.STRtree(edges)
    left, right = tree.query(edges, predicate="dwithin", distance=small)
    for i, j in zip(left.tolist(), right.tolist(), strict=True):
        if i < j and (j - i) % n not in (0, 1, n - 1):
            raise CaseError(file, key, f"edges {i} and {j} come within "
                                       f"{edges[i].distance(edges[j]):.3g} of each other; keep "
                                       f"them at least {small:.3g} apart")
    return poly
