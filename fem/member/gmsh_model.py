"""gmsh (OCC) model of a beam-kind member, with every patch its own physical group.

Small builders, one per feature, each returning OCC tags; `build_member` assembles them,
splits the boundary at patch ends and names the physical groups:
``material`` / ``zone-k`` (surfaces), ``support-i`` / ``load-j`` (curves, or a point for a
point patch), ``hole-k`` (curves of each hole). Must be called inside
`fem.gmsh_session.gmsh_session`.
"""

from __future__ import annotations

import math

import gmsh

from classical.arcs import arc_midpoint
from fem.case.model import BeamGeometry, Cutout, Hole, Zone
from fem.case.outline import Patch, outline_polygon

__all__ = ["build_member", "name_boundaries", "MATERIAL"]

MATERIAL = "material"


def _outline(g: BeamGeometry) -> int:
    occ = gmsh.model.occ
    if g.shape == "rectangle":
        return occ.addRectangle(0.0, 0.0, 0.0, g.length, g.depth)
    if g.bulges:
        return _ring_surface(g.ring)
    pts = list(outline_polygon(g).exterior.coords)[:-1]
    tags = [occ.addPoint(x, y, 0.0) for x, y in pts]
    lines = [occ.addLine(tags[i], tags[(i + 1) % len(tags)]) for i in range(len(tags))]
    return occ.addPlaneSurface([occ.addCurveLoop(lines)])


def _ring_surface(ring: tuple[tuple[float, float, float], ...]) -> int:
    """A plane surface bounded by straight edges and true circular arcs (bulge != 0); each
    arc is drawn through its midpoint, so arcs beyond a half circle are unambiguous."""
    occ = gmsh.model.occ
    tags = [occ.addPoint(x, y, 0.0) for x, y, _ in ring]
    n = len(ring)
    curves = []
    for k in range(n):
        a, b = ring[k], ring[(k + 1) % n]
        if a[2] == 0.0:
            curves.append(occ.addLine(tags[k], tags[(k + 1) % n]))
        else:
            mx, my = arc_midpoint(a[:2], b[:2], a[2])
            mid = occ.addPoint(float(mx), float(my), 0.0)
            curves.append(occ.addCircleArc(tags[k], mid, tags[(k + 1) % n], center=False))
            occ.remove([(0, mid)])
    return occ.addPlaneSurface([occ.addCurveLoop(curves)])


def _hole(h: Hole) -> int:
    return gmsh.model.occ.addDisk(h.center[0], h.center[1], 0.0, h.radius, h.radius)


def _cutout(c: Cutout, inside: list[bool]) -> int:
    """Rectangle with true arcs of radius `fillet` at the corners flagged inside."""
    occ = gmsh.model.occ
    (x0, y0), (w, h) = c.corner, c.size
    if c.fillet <= 0 or not any(inside):
        return occ.addRectangle(x0, y0, 0.0, w, h)
    r = c.fillet
    corners = [(x0, y0), (x0 + w, y0), (x0 + w, y0 + h), (x0, y0 + h)]
    inward = [(1, 1), (-1, 1), (-1, -1), (1, -1)]
    # per corner: (point entering the corner, point leaving it, arc centre or None)
    seq: list[tuple[int, int, int | None]] = []
    for k, ((cx, cy), (sx, sy)) in enumerate(zip(corners, inward, strict=True)):
        if inside[k]:
            prev_dir = (corners[k][0] - corners[k - 1][0], corners[k][1] - corners[k - 1][1])
            n = math.hypot(*prev_dir)
            ex, ey = cx - prev_dir[0] / n * r, cy - prev_dir[1] / n * r
            nxt = corners[(k + 1) % 4]
            nd = (nxt[0] - cx, nxt[1] - cy)
            m = math.hypot(*nd)
            lx, ly = cx + nd[0] / m * r, cy + nd[1] / m * r
            seq.append((occ.addPoint(ex, ey, 0), occ.addPoint(lx, ly, 0),
                        occ.addPoint(cx + sx * r, cy + sy * r, 0)))
        else:
            p = occ.addPoint(cx, cy, 0)
            seq.append((p, p, None))
    curves = []
    for k, (enter, leave, centre) in enumerate(seq):
        if centre is not None:
            curves.append(occ.addCircleArc(enter, centre, leave))
        curves.append(occ.addLine(leave, seq[(k + 1) % 4][0]))
    return occ.addPlaneSurface([occ.addCurveLoop(curves)])


def _zone(z: Zone) -> int:
    return gmsh.model.occ.addRectangle(z.corner[0], z.corner[1], 0.0, z.size[0], z.size[1])


def _corner_inside(c: Cutout, g: BeamGeometry) -> list[bool]:
    from shapely.geometry import Point

    outline = outline_polygon(g)
    (x0, y0), (w, h) = c.corner, c.size
    shrunk = outline.buffer(-1e-9 * (w + h))
    return [shrunk.contains(Point(p)) for p in
            ((x0, y0), (x0 + w, y0), (x0 + w, y0 + h), (x0, y0 + h))]


def build_member(g: BeamGeometry, supports: list[Patch], loads: list[Patch]) -> dict[int, str]:
    """Build the OCC model; return {surface tag: physical name} (material or zone-k)."""
    occ = gmsh.model.occ
    dom = [(2, _outline(g))]
    tools = [(2, _hole(h)) for h in g.holes]
    tools += [(2, _cutout(c, _corner_inside(c, g))) for c in g.cutouts]
    tools += [(2, _ring_surface(o)) for o in g.openings]
    if tools:
        dom, _ = occ.cut(dom, tools)
    zone_parts: list[tuple[int, list[tuple[int, int]]]] = []
    for k, z in enumerate(g.zones):
        copy = occ.copy(dom)
        part, _ = occ.intersect([(2, _zone(z))], copy)
        if part:
            zone_parts.append((k, part))
    points = {p for patch in supports + loads for p in patch.ends}
    ptags = [(0, occ.addPoint(x, y, 0.0)) for x, y in sorted(points)]
    objects = dom + [e for _, part in zone_parts for e in part]
    occ.fragment(objects, ptags)
    occ.synchronize()
    return _name_surfaces(g)


def _name_surfaces(g: BeamGeometry) -> dict[int, str]:
    names: dict[int, str] = {}
    for _, tag in gmsh.model.getEntities(2):
        x, y, _ = gmsh.model.occ.getCenterOfMass(2, tag)
        name = MATERIAL
        for k, z in enumerate(g.zones):
            if (z.corner[0] <= x <= z.corner[0] + z.size[0]
                    and z.corner[1] <= y <= z.corner[1] + z.size[1]):
                name = f"zone-{k}"
        names[tag] = name
    by_name: dict[str, list[int]] = {}
    for tag, name in names.items():
        by_name.setdefault(name, []).append(tag)
    for name, tags in by_name.items():
        gmsh.model.addPhysicalGroup(2, tags, name=name)
    return names


def name_boundaries(g: BeamGeometry, supports: list[Patch], loads: list[Patch],
                    tol: float) -> dict[str, list[int]]:
    """Physical groups for patches and holes; return {name: curve tags} (points: [-tag])."""
    groups: dict[str, list[int]] = {}
    curves = [t for _, t in gmsh.model.getBoundary(gmsh.model.getEntities(2), combined=True,
                                                   oriented=False)]
    samples = {t: _curve_samples(t) for t in curves}
    for patch in supports + loads:
        if patch.point is not None:
            tag = _point_at(patch.point, tol)
            gmsh.model.addPhysicalGroup(0, [tag], name=patch.name)
            groups[patch.name] = [-tag]
            continue
        if patch.hole is not None:
            h = g.holes[patch.hole]
            tags = [t for t, pts in samples.items()
                    if all(abs(math.dist(p, h.center) - h.radius) < 1e3 * tol for p in pts)]
        else:
            tags = [t for t, pts in samples.items()
                    if all(_on_segments(p, patch.segments, tol) for p in pts)]
        gmsh.model.addPhysicalGroup(1, tags, name=patch.name)
        groups[patch.name] = tags
    for k, h in enumerate(g.holes):
        tags = [t for t, pts in samples.items()
                if all(abs(math.dist(p, h.center) - h.radius) < 1e3 * tol for p in pts)]
        gmsh.model.addPhysicalGroup(1, tags, name=f"hole-{k}")
        groups[f"hole-{k}"] = tags
    return groups


def _curve_samples(tag: int) -> list[tuple[float, float]]:
    lo, hi = gmsh.model.getParametrizationBounds(1, tag)
    ts = [lo[0] + (hi[0] - lo[0]) * s for s in (0.0, 0.25, 0.5, 0.75, 1.0)]
    xyz = gmsh.model.getValue(1, tag, ts)
    return [(xyz[3 * i], xyz[3 * i + 1]) for i in range(len(ts))]


def _on_segments(p: tuple[float, float], segments, tol: float) -> bool:
    for (ax, ay), (bx, by) in segments:
        dx, dy = bx - ax, by - ay
        L2 = dx * dx + dy * dy
        s = ((p[0] - ax) * dx + (p[1] - ay) * dy) / L2
        if -1e-9 <= s <= 1 + 1e-9:
            qx, qy = ax + s * dx, ay + s * dy
            if math.hypot(p[0] - qx, p[1] - qy) < 1e3 * tol:
                return True
    return False


def _point_at(p: tuple[float, float], tol: float) -> int:
    best, dist = -1, math.inf
    for _, tag in gmsh.model.getEntities(0):
        x, y, _ = gmsh.model.getValue(0, tag, [])
        d = math.hypot(x - p[0], y - p[1])
        if d < dist:
            best, dist = tag, d
    if dist > 1e3 * tol:
        raise RuntimeError(f"no model point at {p}")
    return best
