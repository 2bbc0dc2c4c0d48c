"""Built-up sections and joint lines: reading, the union of the plates, their interfaces.

A built-up section (``shape = "built-up"``) is a set of ``[[geometry.plates]]``, each a
rectangle (``corner`` = lower-left, ``size`` = [width, height]) or a polygon (``points``).
The plates are unioned into one section of one material (the case's ``[material]``: a
plate girder of one steel, a glulam of one grade; plates of different stiffness would
need a transformed section, which this does not do). Plates must meet along edges: an
overlap, or a plate that touches the rest only at a point or not at all, is refused. Where
two plates share an edge the shared stretch is an **interface**; straight interfaces are
named ``joint-0``, ``joint-1``, ... in the order the plates are given.

A joint (``[[check.joints]]``, any section shape) is a straight line from ``from`` to ``to``
across the section: a weld throat, a bolt row, a glue line. It must cut right across the
material: both ends on the outline or outside it, one stretch of material between them
(not across a hole, not out and back in), and not along an edge of the outline. Nothing
here meshes; `fem.section.joints` computes the shear flow across each joint.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
from shapely.geometry import LineString, MultiPolygon, Point, Polygon
from shapely.ops import linemerge, unary_union

from classical.sections import section_outline
from fem.case.model import Case, Joint, SectionGeometry
from fem.case.outline import domain_polygon
from fem.case.reader import Table, as_point
from fem.errors import CaseError

__all__ = ["BuiltUp", "Interface", "build_up", "drawn_section", "read_joints", "read_plates",
           "section_polygon", "validate_built_up", "validate_joints", "validate_planes",
           "GEOMETRY_TOL"]

GEOMETRY_TOL = 1e-9  # lengths below this x the section's extent are round-off (touching)


@dataclass(frozen=True)
class Interface:
    """A straight stretch shared by two plates: ``plates`` = (i, j) in input order."""

    name: str
    start: tuple[float, float]
    end: tuple[float, float]
    plates: tuple[int, int]


@dataclass(frozen=True)
class BuiltUp:
    """The union of the plates: outer ring (counter-clockwise), holes, interfaces."""

    outer: tuple[tuple[float, float], ...]
    holes: tuple[tuple[tuple[float, float], ...], ...]
    interfaces: tuple[Interface, ...]

    @property
    def polygon(self) -> Polygon:
        return Polygon(self.outer, self.holes)

    def polygon_params(self) -> dict[str, Any]:
        """The union as ``shape = "polygon"`` parameters (points, holes)."""
        return {"points": [list(p) for p in self.outer],
                "holes": [[list(p) for p in h] for h in self.holes]}


def read_plates(t: Table) -> tuple[tuple[tuple[float, float], ...], ...]:
    """``[[geometry.plates]]`` -> one corner list (counter-clockwise) per plate."""
    plates = []
    for p in t.tables("plates"):
        if p.has("points"):
            for k in ("corner", "size"):
                if p.has(k):
                    raise p.error(k, "give either points or corner + size, not both")
            raw = p.raw("points")
            if not isinstance(raw, list) or len(raw) < 3:
                raise p.error("points", "must be a list of at least three [x, y] points")
            pts = [as_point(q, p.file, f"{p.key('points')}.{i}") for i, q in enumerate(raw)]
        else:
            (x, y), (w, h) = p.point("corner"), p.point("size")
            if min(w, h) <= 0:
                raise p.error("size", f"width and height must be > 0, got {[w, h]}")
            pts = [(x, y), (x + w, y), (x + w, y + h), (x, y + h)]
        p.close()
        poly = Polygon(pts)
        if not poly.is_valid or poly.area <= 0:
            raise CaseError(p.file, p.path, "the plate's outline crosses itself or has no "
                                            "area; give its corners in order round it")
        plates.append(tuple(poly.exterior.coords[:-1]) if poly.exterior.is_ccw
                      else tuple(poly.exterior.coords[:-1][::-1]))
    if len(plates) < 2:
        raise t.error("plates", f"a built-up section needs at least two [[geometry.plates]], "
                                f"got {len(plates)}")
    return tuple(plates)


def _extent(polys: list[Polygon]) -> float:
    x0, y0, x1, y1 = unary_union(polys).bounds
    return max(x1 - x0, y1 - y0)


def _straight_pieces(line: LineString, tol: float) -> list[tuple[tuple[float, float], ...]]:
    """Split a polyline where it turns; each straight stretch as (start, end)."""
    pts = np.asarray(line.coords)
    out, first = [], 0
    for k in range(1, len(pts) - 1):
        a, b = pts[k] - pts[first], pts[k + 1] - pts[k]
        if abs(a[0] * b[1] - a[1] * b[0]) > tol * np.linalg.norm(a) * np.linalg.norm(b):
            out.append((tuple(pts[first]), tuple(pts[k])))
            first = k
    out.append((tuple(pts[first]), tuple(pts[-1])))
    return [tuple((float(p[0]), float(p[1])) for p in s) for s in out]


def _tidy(ring: list[tuple[float, float]], tol: float) -> tuple[tuple[float, float], ...]:
    """Drop repeated and collinear vertices of a closed ring."""
    pts = [p for k, p in enumerate(ring) if math.dist(p, ring[k - 1]) > tol]
    changed = True
    while changed and len(pts) > 3:
        changed = False
        for k in range(len(pts)):
            a, b, c = np.array(pts[k - 1]), np.array(pts[k]), np.array(pts[(k + 1) % len(pts)])
            u, w = b - a, c - b
            if abs(u[0] * w[1] - u[1] * w[0]) <= 1e-12 * np.linalg.norm(u) * np.linalg.norm(w) \
                    and u @ w > 0:
                del pts[k]
                changed = True
                break
    return tuple((float(x), float(y)) for x, y in pts)


def build_up(plates: tuple, file: str = "<case>") -> BuiltUp:
    """Union the plates and find their interfaces; `CaseError` on overlapping or loose
    plates (key ``geometry.plates.N``)."""
    polys = [Polygon(p) for p in plates]
    tol = GEOMETRY_TOL * _extent(polys)
    for j, pj in enumerate(polys):
        for i in range(j):
            overlap = pj.intersection(polys[i]).area
            if overlap > tol * math.sqrt(min(pj.area, polys[i].area)):
                raise CaseError(file, f"geometry.plates.{j}",
                                f"overlaps plate {i} (common area {overlap:.4g}); plates "
                                "must meet along edges, not overlap")
    union = unary_union(polys)
    if isinstance(union, MultiPolygon) or union.geom_type != "Polygon":
        loose = next(k for k, p in enumerate(polys)
                     if unary_union([q for m, q in enumerate(polys) if m != k])
                     .intersection(p).length <= tol)
        raise CaseError(file, f"geometry.plates.{loose}",
                        "does not share an edge with the other plates; plates of a built-up "
                        "section must meet along edges (a weld, bolt row or glue line)")
    interfaces = []
    for i in range(len(polys)):
        for j in range(i + 1, len(polys)):
            common = polys[i].boundary.intersection(polys[j].boundary)
            lines = [g for g in getattr(common, "geoms", [common])
                     if g.geom_type in ("LineString", "MultiLineString") and g.length > tol]
            if not lines:
                continue
            merged = linemerge(lines) if len(lines) > 1 else lines[0]
            for line in getattr(merged, "geoms", [merged]):
                for a, b in _straight_pieces(line, 1e-9):
                    if math.dist(a, b) > tol:
                        s, e = sorted([a, b])
                        interfaces.append(Interface(f"joint-{len(interfaces)}", s, e, (i, j)))
    outer = union.exterior if union.exterior.is_ccw else LineString(union.exterior.coords[::-1])
    holes = tuple(_tidy(list(h.coords[:-1]), tol) for h in union.interiors)
    return BuiltUp(_tidy(list(outer.coords[:-1]), tol), holes, tuple(interfaces))


def drawn_section(g: SectionGeometry, file: str = "<case>") -> SectionGeometry:
    """A built-up section as the ``polygon`` it is drawn as (others unchanged): for code
    that needs only the outline (hand side, size estimate, mesh). `file` names the case
    file in an error about the plates."""
    if g.shape != "built-up":
        return g
    return SectionGeometry("polygon", build_up(g.params["plates"], file).polygon_params())


def section_polygon(g: SectionGeometry, file: str = "<case>") -> Polygon:
    """The section as a shapely polygon (arcs as the hand side's facets)."""
    if g.shape == "built-up":
        return build_up(g.params["plates"], file).polygon
    o = section_outline(g.shape, **g.params)
    return Polygon(o.outer, list(o.holes))


def validate_built_up(case: Case) -> None:
    """Refuse plates that overlap or do not meet the rest along an edge."""
    build_up(case.section.params["plates"], case.file)


def read_joints(t: Table) -> tuple[Joint, ...]:
    """``[[check.joints]]`` -> `Joint` records (geometry checked by `validate_joints`)."""
    out: list[Joint] = []
    for k, j in enumerate(t.tables("joints")):
        name = j.text("name", f"joint-{k}")
        if any(o.name == name for o in out):
            raise j.error("name", f"{name!r} is used by another joint; give each a new name")
        start, end = j.point("from"), j.point("to")
        if start == end:
            raise j.error("to", "equals 'from'; a joint line needs two different points")
        cap = j.number("capacity", None, low=0.0, low_open=True)
        spacing = j.number("spacing", None, low=0.0, low_open=True)
        throat = j.number("throat", None, low=0.0, low_open=True)
        welds = j.number("welds", 1, integer=True, low=1, high=16)
        if j.has("welds") and throat is None:
            raise j.error("welds", "counts the welds of a 'throat'; give the throat too")
        j.close()
        out.append(Joint(name, start, end, cap, spacing, throat, welds, key=j.path))
    return tuple(out)


def validate_planes(case: Case) -> None:
    """Each ``check.planes`` level lies strictly inside the member's depth."""
    _, y0, _, y1 = domain_polygon(case.beam).bounds
    tol = 1e-6 * (y1 - y0)
    for k, y in enumerate(case.check.planes):
        if not y0 + tol < y < y1 - tol:
            raise CaseError(case.file, f"check.planes.{k}",
                            f"{y:g} is not inside the member: a plane must lie between its "
                            f"bottom and top, {y0:g} < y < {y1:g}")


def _material_pieces(cut: Any, tol: float) -> list[LineString]:
    return [g for g in getattr(cut, "geoms", [cut])
            if g.geom_type == "LineString" and g.length > tol]


def validate_joints(case: Case) -> None:
    """Each joint line cuts right across the section once, or `CaseError` naming
    ``check.joints.N``."""
    if not case.check.joints:
        return
    poly = section_polygon(case.section, case.file)
    x0, y0, x1, y1 = poly.bounds
    tol = 1e-6 * max(x1 - x0, y1 - y0)
    for k, jt in enumerate(case.check.joints):
        key = f"check.joints.{k}"
        line = LineString([jt.start, jt.end])
        along = line.intersection(poly.boundary)
        if sum(g.length for g in getattr(along, "geoms", [along])) > tol:
            raise CaseError(case.file, key, "lies along an edge of the outline; a joint line "
                                            "must run across the material, from one edge to "
                                            "another")
        pieces = _material_pieces(line.intersection(poly), tol)
        if not pieces:
            raise CaseError(case.file, key, f"from {list(jt.start)} to {list(jt.end)} misses "
                                            f"the section (x {x0:g}..{x1:g}, y {y0:g}..{y1:g})")
        if len(pieces) > 1:
            holes = [h for h in poly.interiors if Polygon(h).intersection(line).length > tol]
            why = ("crosses a hole" if holes else "leaves the section and enters it again")
            raise CaseError(case.file, key, f"{why}; a joint line must cross one stretch of "
                                            "material, from edge to edge")
        for end, p in (("from", jt.start), ("to", jt.end)):
            if poly.buffer(-tol).contains(Point(p)):
                raise CaseError(case.file, f"{key}.{end}",
                                f"{list(p)} lies inside the material; the line must reach "
                                "the outline at both ends to cut across the section")
