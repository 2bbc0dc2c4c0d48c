"""The member in the plane, outside gmsh: outline, patches, cuts and features.

shapely holds the member as a polygon (arcs as fine polylines) so that placements can be
resolved and checked before meshing, cuts can be intersected with the material, and
features (holes, fillets, re-entrant corners, patch ends) can be listed for refinement,
findings and excluded zones. The gmsh model (`fem.member.gmsh_model`) is built from the same data
with true arcs.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass

import numpy as np
import shapely
from shapely.geometry import LineString, Point, Polygon, box
from shapely.ops import unary_union

from fem.case.arcs import Arc, check_ring, on_arc, ring_arcs, ring_polygon
from fem.case.model import BeamGeometry, Case, Cutout, Placement
from fem.errors import CaseError

__all__ = [
    "Patch", "Corner", "Strip", "outline_polygon", "domain_polygon", "cutout_polygon",
    "resolve_patch", "patches", "cut_strips", "reentrant_corners", "validate_geometry",
    "bounding_box", "member_depth", "check_mechanism", "ARC_SEGMENTS", "CORNER_ANGLE",
    "is_sharp_corner", "curved_edges",
]

ARC_SEGMENTS = 64  # polyline segments per quarter circle in the shapely model
MIN_FEATURE = 1e-6  # patch widths, stretches and cut margins below this x member size: refused
MIN_FILLET = 1e-4   # a cut-out fillet is 0 (sharp) or at least this x the member size
# A vertex is a sharp re-entrant corner only when its material angle exceeds this [degrees].
# A faceted arc turns by 360/n degrees per vertex (n facets per full circle), so an arc drawn
# with 36 or more facets per circle (the shapely arcs here: 4 x ARC_SEGMENTS = 256, 1.4
# degrees) has no vertex above 190. The stress exponent 1 - lambda of a wedge of material
# angle alpha goes to 0 as alpha goes to 180 (Williams 1952): at 190 degrees it is
# 1 - 180/190 = 0.053 for the section's out-of-plane shear (a halving of the element size
# raises the corner peak 3.7 %, below the 5 % default tolerance) and 0.100 for plane mode I
# (sin(lambda alpha) + lambda sin(alpha) = 0), and the strength of the singular term vanishes
# with the kink (alpha - 180) itself: near-180 corners are not singular in any practical
# sense, while a 200-degree kink (exponents 0.10 and 0.18) already is.
CORNER_ANGLE = 190.0


def is_sharp_corner(material_angle: float) -> bool:
    """Does a sharp vertex of this material angle [degrees] count as a singular re-entrant
    corner? True above `CORNER_ANGLE` (its comment gives the reasoning)."""
    return material_angle > CORNER_ANGLE


@dataclass(frozen=True)
class Patch:
    """A resolved support or load stretch.

    `segments` are straight stretches of the boundary (empty for a point or a hole);
    `point` is set for a point patch; `hole` for a pin bearing on a hole.
    """

    name: str
    segments: tuple[tuple[tuple[float, float], tuple[float, float]], ...] = ()
    point: tuple[float, float] | None = None
    hole: int | None = None

    @property
    def length(self) -> float:
        return sum(math.dist(a, b) for a, b in self.segments)

    @property
    def centroid(self) -> tuple[float, float]:
        if self.point is not None:
            return self.point
        L = self.length
        cx = sum(0.5 * (a[0] + b[0]) * math.dist(a, b) for a, b in self.segments) / L
        cy = sum(0.5 * (a[1] + b[1]) * math.dist(a, b) for a, b in self.segments) / L
        return (cx, cy)

    @property
    def ends(self) -> list[tuple[float, float]]:
        if self.point is not None:
            return [self.point]
        return [p for seg in self.segments for p in seg]

    def is_vertical(self) -> bool:
        return bool(self.segments) and all(abs(a[0] - b[0]) < 1e-9 * (1 + abs(a[0]))
                                           for a, b in self.segments)

    def is_horizontal(self) -> bool:
        return bool(self.segments) and all(abs(a[1] - b[1]) < 1e-9 * (1 + abs(a[1]))
                                           for a, b in self.segments)


@dataclass(frozen=True)
class Corner:
    """A sharp re-entrant corner of the domain: location and interior angle (degrees)."""

    at: tuple[float, float]
    angle: float


@dataclass(frozen=True)
class Strip:
    """One material stretch of a cut: y0 < y1 with out-of-plane thickness t."""

    y0: float
    y1: float
    t: float


def outline_polygon(g: BeamGeometry) -> Polygon:
    if g.shape == "rectangle":
        return box(0.0, 0.0, g.length, g.depth)
    # tolerance 0 drops only exactly collinear vertices: one edge per straight stretch
    poly = ring_polygon(g.ring) if g.bulges else Polygon(g.points)
    if poly.is_valid:
        with np.errstate(all="ignore"):  # denormal coordinates overflow GEOS' tolerance
            poly = shapely.simplify(poly, 0.0)
    return shapely.geometry.polygon.orient(poly, 1.0)


def cutout_polygon(c: Cutout, outline: Polygon) -> Polygon:
    """The cut-out, with its corners that fall inside the outline rounded by `fillet`."""
    (x0, y0), (w, h) = c.corner, c.size
    corners = [(x0, y0), (x0 + w, y0), (x0 + w, y0 + h), (x0, y0 + h)]
    if c.fillet <= 0:
        return Polygon(corners)
    r = c.fillet
    inward = [(1, 1), (-1, 1), (-1, -1), (1, -1)]
    pts: list[tuple[float, float]] = []
    start_angle = [180.0, 270.0, 0.0, 90.0]
    for (cx, cy), (sx, sy), a0 in zip(corners, inward, start_angle, strict=True):
        if outline.buffer(-1e-9 * (w + h)).contains(Point(cx, cy)):
            ox, oy = cx + sx * r, cy + sy * r
            for k in range(ARC_SEGMENTS + 1):
                a = math.radians(a0 + 90.0 * k / ARC_SEGMENTS)
                pts.append((ox + r * math.cos(a), oy + r * math.sin(a)))
        else:
            pts.append((cx, cy))
    return Polygon(pts)


@functools.lru_cache(maxsize=64)
def domain_polygon(g: BeamGeometry) -> Polygon:
    """The material of the member: the outline less its holes and cut-outs.

    Cached per geometry (a frozen, hashable dataclass; shapely geometries are immutable),
    so the case checks, every mesh level, the hand side, the findings and the envelope
    share one polygon instead of rebuilding it at each call.
    """
    outline = outline_polygon(g)
    removed = [Point(h.center).buffer(h.radius, quad_segs=ARC_SEGMENTS) for h in g.holes]
    removed += [cutout_polygon(c, outline) for c in g.cutouts]
    removed += [ring_polygon(o) for o in g.openings]
    dom = outline.difference(unary_union(removed)) if removed else outline
    return dom


def member_depth(g: BeamGeometry) -> float:
    """The member's depth: the height of its material's bounding box (the length every
    depth-relative size and zone is measured in)."""
    bounds = domain_polygon(g).bounds
    return bounds[3] - bounds[1]


def bounding_box(g: BeamGeometry) -> tuple[float, float, float, float]:
    return tuple(outline_polygon(g).bounds)


def _tol(dom: Polygon) -> float:
    x0, y0, x1, y1 = dom.bounds
    return 1e-7 * max(x1 - x0, y1 - y0)


def _edge_line(edge: str, g: BeamGeometry) -> LineString:
    L, h = g.length, g.depth
    return {"left": LineString([(0, 0), (0, h)]), "right": LineString([(L, 0), (L, h)]),
            "bottom": LineString([(0, 0), (L, 0)]), "top": LineString([(0, h), (L, h)])}[edge]


def _straight_pieces(geom) -> list[tuple[tuple[float, float], tuple[float, float]]]:
    lines = shapely.get_parts(shapely.line_merge(geom)) if not geom.is_empty else []
    out = []
    for ln in lines:
        if ln.geom_type != "LineString" or ln.length == 0:
            continue
        c = list(ln.coords)
        out.append(((c[0][0], c[0][1]), (c[-1][0], c[-1][1])))
    return out


def _boundary_edges(dom: Polygon) -> list[tuple[np.ndarray, np.ndarray]]:
    edges = []
    for ring in [dom.exterior, *dom.interiors]:
        c = np.asarray(ring.coords)
        edges += [(c[i], c[i + 1]) for i in range(len(c) - 1) if np.any(c[i] != c[i + 1])]
    return edges


def _extent(dom: Polygon) -> float:
    x0, y0, x1, y1 = dom.bounds
    return max(x1 - x0, y1 - y0)


def _onto_boundary(p: tuple[float, float], dom: Polygon, eps: float) -> tuple[float, float]:
    """`p` moved onto the boundary, and onto a boundary vertex closer than `eps`."""
    q = dom.boundary.interpolate(dom.boundary.project(Point(p)))
    best = (q.x, q.y)
    for ring in [dom.exterior, *dom.interiors]:
        c = np.asarray(ring.coords)
        k = int(np.argmin(np.hypot(c[:, 0] - q.x, c[:, 1] - q.y)))
        if math.dist(c[k], best) < eps:
            return (float(c[k, 0]), float(c[k, 1]))
    return (float(best[0]), float(best[1]))


def resolve_patch(where: Placement, name: str, key: str, case: Case, dom: Polygon) -> Patch:
    """Turn a placement into boundary stretches of the domain, or refuse it."""
    g = case.beam
    tol = _tol(dom)
    file = case.file
    if where.hole is not None:
        if where.hole >= len(g.holes):
            raise CaseError(file, f"{key}.hole", f"hole {where.hole} does not exist; the case "
                                                 f"has {len(g.holes)} hole(s), numbered from 0")
        return Patch(name=name, hole=where.hole)
    if where.edge is not None:
        if g.shape != "rectangle":
            raise CaseError(file, f"{key}.edge", "edges are named for rectangles only; use "
                                                 "from/to or at + width on a polygon")
        on = dom.boundary.intersection(_edge_line(where.edge, g).buffer(tol))
        segs = _straight_pieces(on)
        segs = [s for s in segs if math.dist(*s) > 10 * tol]
        if not segs:
            raise CaseError(file, f"{key}.edge", f"nothing of the {where.edge} edge is left "
                                                 "after holes and cut-outs")
        return Patch(name=name, segments=tuple(_snap(s, where.edge, g) for s in segs))
    eps = MIN_FEATURE * _extent(dom)
    if where.start is not None:
        for label, p in (("from", where.start), ("to", where.end)):
            if dom.boundary.distance(Point(p)) > 1e3 * tol:
                raise CaseError(file, f"{key}.{label}", f"{list(p)} is not on the outline")
        a, b = _onto_boundary(where.start, dom, eps), _onto_boundary(where.end, dom, eps)
        if math.dist(a, b) < eps:
            raise CaseError(file, f"{key}.to", f"is only {math.dist(a, b):.3g} from 'from'; a "
                                               f"stretch must be at least {eps:.3g} long (use "
                                               "at + width = 0 for a point)")
        seg = LineString([a, b])
        covered = dom.boundary.intersection(seg.buffer(1e3 * tol, cap_style="flat")).length
        if covered < (1 - 1e-4) * seg.length or not _on_one_edge(dom, a, b, tol):
            raise CaseError(file, key, f"the stretch {list(a)} to {list(b)} does not lie on a "
                                       "single straight stretch of the outline")
        if _on_curve(a, g, tol) and _on_curve(b, g, tol):
            raise CaseError(file, key, f"the stretch {list(a)} to {list(b)} lies on a curved "
                                       "part of the outline (a hole or fillet); a patch needs "
                                       "a straight stretch")
        return Patch(name=name, segments=((a, b),))
    # at + width
    if dom.boundary.distance(Point(where.at)) > 1e3 * tol:
        raise CaseError(file, f"{key}.at", f"{list(where.at)} is not on the outline")
    p = np.asarray(_onto_boundary(where.at, dom, eps), float)
    if where.width == 0:
        return Patch(name=name, point=(float(p[0]), float(p[1])))
    if where.width < eps:
        raise CaseError(file, f"{key}.width", f"{where.width:g} is too narrow to mesh; give 0 "
                                              f"for a point or at least {eps:.3g}")
    if _on_curve(where.at, g, tol):
        raise CaseError(file, f"{key}.at", f"{list(where.at)} lies on a curved part of the "
                                           "outline (a hole or fillet); a patch needs a "
                                           "straight stretch")
    for e0, e1 in _boundary_edges(dom):
        d = e1 - e0
        L = float(np.hypot(*d))
        s = float(np.dot(p - e0, d) / L)
        off = abs(_cross(d, p - e0) / L)
        if off < 1e3 * tol and -1e3 * tol <= s <= L + 1e3 * tol:
            s0, s1 = s - where.width / 2, s + where.width / 2
            s0, s1 = (0.0 if abs(s0) < eps else s0), (L if abs(s1 - L) < eps else s1)
            if s0 < -1e-6 * L or s1 > L * (1 + 1e-6):
                raise CaseError(file, f"{key}.width",
                                f"{where.width:g} runs past the end of the straight stretch "
                                f"at {list(where.at)} (it is {L:g} long there)")
            a = tuple(float(v) for v in e0 + d * max(s0, 0.0) / L)
            b = tuple(float(v) for v in e0 + d * min(s1, L) / L)
            return Patch(name=name, segments=((a, b),))
    raise CaseError(file, f"{key}.at", f"{list(where.at)} lies on a curved part of the outline;"
                                       " a patch needs a straight stretch")


def _on_curve(p, g: BeamGeometry, tol: float) -> bool:
    """Is `p` on a hole circle, an arc of the outline or an opening, or a cut-out fillet
    arc (away from the arc's ends)?"""
    near = 1e3 * tol
    if on_arc(p, curved_edges(g), near):
        return True
    for h in g.holes:
        if abs(math.dist(p, h.center) - h.radius) < near:
            return True
    outline = outline_polygon(g)
    for c in g.cutouts:
        if c.fillet <= 0:
            continue
        (x0, y0), (w, hgt), r = c.corner, c.size, c.fillet
        corners = [(x0, y0), (x0 + w, y0), (x0 + w, y0 + hgt), (x0, y0 + hgt)]
        for (cx, cy), (sx, sy) in zip(corners, [(1, 1), (-1, 1), (-1, -1), (1, -1)],
                                      strict=True):
            if not outline.buffer(-1e-9 * (w + hgt)).contains(Point(cx, cy)):
                continue
            ox, oy = cx + sx * r, cy + sy * r
            between = (min(cx, ox) + near < p[0] < max(cx, ox) - near
                       and min(cy, oy) + near < p[1] < max(cy, oy) - near)
            if between and abs(math.dist(p, (ox, oy)) - r) < near:
                return True
    return False


def curved_edges(g: BeamGeometry) -> list[Arc]:
    """The arc edges of the outline and of the openings (`fem.case.arcs`)."""
    arcs = ring_arcs(g.ring) if g.bulges else []
    for o in g.openings:
        arcs += ring_arcs(o)
    return arcs


def _snap(seg, edge: str, g: BeamGeometry):
    (x0, y0), (x1, y1) = seg
    if edge in ("left", "right"):
        x = 0.0 if edge == "left" else g.length
        lo, hi = sorted((y0, y1))
        return ((x, lo), (x, hi))
    y = 0.0 if edge == "bottom" else g.depth
    lo, hi = sorted((x0, x1))
    return ((lo, y), (hi, y))


def _on_one_edge(dom: Polygon, a, b, tol: float) -> bool:
    a, b = np.asarray(a, float), np.asarray(b, float)
    for e0, e1 in _boundary_edges(dom):
        d = e1 - e0
        L = float(np.hypot(*d))
        ok = True
        for p in (a, b):
            s = float(np.dot(p - e0, d) / L)
            off = abs(_cross(d, p - e0) / L)
            ok &= off < 1e3 * tol and -1e3 * tol <= s <= L + 1e3 * tol
        if ok:
            return True
    return False


def patches(case: Case, dom: Polygon | None = None) -> tuple[list[Patch], list[Patch]]:
    """Resolved (supports, loads), named 'support-i' and 'load-j'."""
    dom = dom if dom is not None else domain_polygon(case.beam)
    sup = [resolve_patch(s.where, f"support-{i}", s.key or f"supports.{i}", case, dom)
           for i, s in enumerate(case.supports)]
    lds = [resolve_patch(ld.where, f"load-{j}", ld.key or f"loads.{j}", case, dom)
           for j, ld in enumerate(case.loads)]
    return sup, lds


def cut_strips(g: BeamGeometry, x: float, thickness: float,
               dom: Polygon | None = None) -> list[Strip]:
    """Material of the vertical line at `x`, bottom to top, split where the thickness changes."""
    dom = dom if dom is not None else domain_polygon(g)
    x0, y0, x1, y1 = dom.bounds
    line = LineString([(x, y0 - 1.0), (x, y1 + 1.0)])
    pieces = shapely.get_parts(dom.intersection(line))
    spans = sorted((min(p.coords[0][1], p.coords[-1][1]), max(p.coords[0][1], p.coords[-1][1]))
                   for p in pieces if p.geom_type == "LineString" and p.length > 0)
    strips: list[Strip] = []
    for lo, hi in spans:
        cuts = {lo, hi}
        for z in g.zones:
            if z.corner[0] <= x <= z.corner[0] + z.size[0]:
                cuts |= {v for v in (z.corner[1], z.corner[1] + z.size[1]) if lo < v < hi}
        ys = sorted(cuts)
        for a, b in zip(ys[:-1], ys[1:], strict=True):
            strips.append(Strip(a, b, _thickness_at(g, x, 0.5 * (a + b), thickness)))
    return strips


def _thickness_at(g: BeamGeometry, x: float, y: float, base: float) -> float:
    t = base
    for z in g.zones:
        if (z.corner[0] <= x <= z.corner[0] + z.size[0]
                and z.corner[1] <= y <= z.corner[1] + z.size[1]):
            t = z.thickness
    return t


def reentrant_corners(dom: Polygon) -> list[Corner]:
    """Vertices of the domain whose interior (material) angle exceeds `CORNER_ANGLE`.

    Polyline arcs (holes, fillets, faceted outlines) turn a little at every vertex; those
    vertices are not corners (see `CORNER_ANGLE`)."""
    out = []
    rings = [shapely.geometry.polygon.orient(dom, 1.0).exterior,
             *shapely.geometry.polygon.orient(dom, 1.0).interiors]
    for ring in rings:
        c = np.asarray(ring.coords)[:-1]
        n = len(c)
        for i in range(n):
            a, p, b = c[i - 1], c[i], c[(i + 1) % n]
            u, v = p - a, b - p
            turn = math.degrees(math.atan2(_cross(u, v), float(np.dot(u, v))))
            interior = 180.0 - turn  # material lies to the left on every oriented ring
            if is_sharp_corner(interior):
                out.append(Corner(at=(float(p[0]), float(p[1])), angle=interior))
    return out


def _cross(a: np.ndarray, b: np.ndarray) -> float:
    return float(a[0] * b[1] - a[1] * b[0])


def check_mechanism(case: Case, supports: list[Patch]) -> None:
    """Refuse supports that leave rigid motion in x, y or rotation free.

    x-restraints act along horizontal lines (their y matters), y-restraints along vertical
    lines (their x matters). A rigid rotation about P is stopped unless every restraint
    line passes through P: all x-restraints at one y and all y-restraints at one x.
    """
    xs, ys = [], []
    for s, patch in zip(case.supports, supports, strict=True):
        pts = patch.ends if patch.point is None else [patch.point]
        if "x" in s.fix:
            xs += pts
        if "y" in s.fix:
            ys += pts
    all_pts = xs + ys
    span = max(max(p[0] for p in all_pts) - min(p[0] for p in all_pts),
               max(p[1] for p in all_pts) - min(p[1] for p in all_pts), 0.0) if all_pts else 0.0
    x0, y0, x1, y1 = outline_polygon(case.beam).bounds
    tiny = 1e-9 * max(x1 - x0, y1 - y0, span)
    free = []
    if not xs:
        free.append("x (no support fixes x)")
    if not ys:
        free.append("y (no support fixes y)")
    one_y = not xs or max(p[1] for p in xs) - min(p[1] for p in xs) <= tiny
    one_x = not ys or max(p[0] for p in ys) - min(p[0] for p in ys) <= tiny
    if one_y and one_x and (xs or ys):
        px = f"{ys[0][0]:g}" if ys else "any x"
        py = f"{xs[0][1]:g}" if xs else "any y"
        free.append(f"rotation (every restraint passes through ({px}, {py}))")
    if free:
        raise CaseError(case.file, "supports",
                        f"the supports cannot stop rigid motion in {' and '.join(free)}; "
                        "add or widen a support")


def _patch_geometry(p: Patch):
    if p.point is not None:
        return Point(p.point)
    if p.segments:
        return shapely.MultiLineString([list(seg) for seg in p.segments])
    return None   # a pin load on a hole


def _check_loads_off_fixed(case: Case, sup: list[Patch], lds: list[Patch],
                           tol: float) -> None:
    """Refuse a load that lies wholly on stretches fixed in every direction it pushes: it
    goes straight into the support, stresses nothing and every result would be zero."""
    for ld, patch in zip(case.loads, lds, strict=True):
        geom = _patch_geometry(patch)
        if geom is None:
            continue
        dirs = {d for d, f in zip("xy", ld.force, strict=True) if f != 0.0}
        held = [_patch_geometry(p) for s, p in zip(case.supports, sup, strict=True)
                if dirs <= set(s.fix)]
        held = [h for h in held if h is not None]
        if not held:
            continue
        cover = unary_union(held).buffer(tol)
        rest = geom.difference(cover)
        if rest.is_empty or (patch.point is None and rest.length <= tol):
            fixed = " and ".join(sorted(dirs))
            raise CaseError(case.file, ld.key or "loads",
                            f"lies wholly on a support fixed in {fixed}: the load goes "
                            "straight into the support and stresses nothing; move it off "
                            "the support")


def validate_geometry(case: Case) -> None:
    """Geometric checks that need the outline; raise CaseError naming the key."""
    g = case.beam
    f = case.file
    outline = outline_polygon(g)
    if not outline.is_valid or outline.area <= 0:
        raise CaseError(f, "geometry.points", "the outline crosses itself or has no area")
    size = max(outline.bounds[2] - outline.bounds[0], outline.bounds[3] - outline.bounds[1])
    small = MIN_FEATURE * size
    if g.bulges:
        check_ring(g.ring, f, "geometry.points", size, small)
    elif g.shape != "rectangle" and outline.minimum_clearance < small:
        raise CaseError(f, "geometry.points", f"corners or edges of the outline come within "
                                              f"{outline.minimum_clearance:.3g} of each other; "
                                              f"keep them at least {small:.3g} apart")
    for i, h in enumerate(g.holes):
        if h.radius < small:
            raise CaseError(f, f"geometry.holes.{i}.radius", f"{h.radius:g} is too small to "
                                                             f"model; at least {small:.3g}")
        disk = Point(h.center).buffer(h.radius, quad_segs=ARC_SEGMENTS)
        if not outline.buffer(-1e-6 * size).contains(disk):
            raise CaseError(f, f"geometry.holes.{i}", "the hole must lie inside the outline, "
                                                      "clear of its edge")
        for j, other in enumerate(g.holes[:i]):
            if math.dist(h.center, other.center) <= h.radius + other.radius + 1e-6 * size:
                raise CaseError(f, f"geometry.holes.{i}", f"overlaps hole {j}")
        for j, c in enumerate(g.cutouts):
            if cutout_polygon(c, outline).distance(disk) <= 1e-6 * size:
                raise CaseError(f, f"geometry.holes.{i}", f"touches or overlaps cut-out {j}; "
                                                          "a hole must stand clear of cut-outs")
    _check_openings(g, f, outline, size, small)
    for i, c in enumerate(g.cutouts):
        if min(c.size) < small:
            raise CaseError(f, f"geometry.cutouts.{i}.size", f"{list(c.size)} is too small to "
                                                             f"model; at least {small:.3g} each")
        if 0 < c.fillet < MIN_FILLET * size:
            raise CaseError(f, f"geometry.cutouts.{i}.fillet",
                            f"{c.fillet:g} is too small to model; give 0 for a sharp corner "
                            f"or at least {MIN_FILLET * size:.3g}")
        if not cutout_polygon(c, outline).intersects(outline):
            raise CaseError(f, f"geometry.cutouts.{i}", "lies wholly outside the outline")
    for i, z in enumerate(g.zones):
        if min(z.size) < small:
            raise CaseError(f, f"geometry.zones.{i}.size", f"{list(z.size)} is too small to "
                                                           f"model; at least {small:.3g} each")
        if not box(z.corner[0], z.corner[1], z.corner[0] + z.size[0],
                   z.corner[1] + z.size[1]).intersects(outline):
            raise CaseError(f, f"geometry.zones.{i}", "lies wholly outside the outline")
    dom = domain_polygon(g)
    if dom.geom_type != "Polygon" or dom.is_empty:
        raise CaseError(f, "geometry.cutouts", "the cut-outs split the member into pieces "
                                               "or remove all of it")
    if g.cutouts:
        sharp = outline.difference(unary_union([box(c.corner[0], c.corner[1],
                                                    c.corner[0] + c.size[0],
                                                    c.corner[1] + c.size[1]) for c in g.cutouts]))
        if sharp.geom_type == "Polygon" and sharp.minimum_clearance < small:
            raise CaseError(f, "geometry.cutouts", f"the cut-outs leave a sliver, gap or step "
                                                   f"of {sharp.minimum_clearance:.3g}; line "
                                                   "their edges up with the outline or keep "
                                                   f"them at least {small:.3g} apart")
    sup, lds = patches(case, dom)
    _check_loads_off_fixed(case, sup, lds, small)
    if case.mesh.size > size:
        raise CaseError(f, "mesh.size", f"{case.mesh.size:g} is larger than the member "
                                        f"({size:g}); give a size a fraction of the depth")
    for i, r in enumerate(case.mesh.refine):
        if r.size > case.mesh.size:
            raise CaseError(f, f"mesh.refine.{i}.size", f"{r.size:g} is coarser than mesh.size "
                                                        f"{case.mesh.size:g}")
    if case.check.cuts:
        x0, _, x1, _ = dom.bounds
        eps = MIN_FEATURE * (x1 - x0)
        for i, x in enumerate(case.check.cuts):
            if not x0 < x < x1:
                raise CaseError(f, f"check.cuts.{i}", f"{x:g} is outside the member "
                                                      f"({x0:g} < x < {x1:g})")
            if not x0 + eps < x < x1 - eps:
                raise CaseError(f, f"check.cuts.{i}", f"{x:g} is within {eps:.3g} of an end of "
                                                      "the member; move it inside")
            if not cut_strips(g, x, 1.0, dom):
                raise CaseError(f, f"check.cuts.{i}", f"no material at x = {x:g}")


def _check_openings(g: BeamGeometry, f: str, outline: Polygon, size: float,
                    small: float) -> None:
    """Each opening a valid ring inside the outline, clear of holes, cut-outs and the others."""
    inner = outline.buffer(-1e-6 * size)
    done: list[Polygon] = []
    for j, ring in enumerate(g.openings):
        key = f"geometry.openings.{j}"
        poly = check_ring(ring, f, key, size, small)
        if not inner.contains(poly):
            raise CaseError(f, key, "the opening must lie inside the outline, clear of its "
                                    "edge")
        for k, other in enumerate(done):
            if poly.distance(other) <= 1e-6 * size:
                raise CaseError(f, key, f"touches or overlaps opening {k}")
        for k, h in enumerate(g.holes):
            if poly.distance(Point(h.center)) <= h.radius + 1e-6 * size:
                raise CaseError(f, key, f"touches or overlaps hole {k}")
        for k, c in enumerate(g.cutouts):
            if cutout_polygon(c, outline).distance(poly) <= 1e-6 * size:
                raise CaseError(f, key, f"touches or overlaps cut-out {k}")
        done.append(poly)
