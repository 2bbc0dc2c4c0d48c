"""Outlines from a drawing: `[geometry] shape = "drawing"`, read from a DXF file.

The file is read with ezdxf (a well-kept DXF library, pure Python). On the chosen layer (or
the whole model space when no `layer` is given) these entities make contours:

* LWPOLYLINE and 2D POLYLINE, with their bulges: a closed one is a contour; an open one
  joins other pieces like a chain of lines and arcs;
* LINE and ARC: chained end to end into contours (ends closer than `JOIN_TOL` x the
  drawing's size meet);
* CIRCLE: a contour of its own (a hole, or a round section's outline).

The largest closed contour is the outline; every other one must lie inside it and becomes
a hole (circles keep their centre and radius; others are openings of arcs and lines). Any
other entity type on the chosen layer is refused by name and handle, never skipped; with
`layer` given, entities on other layers are ignored. `$INSUNITS` of the drawing, when set,
must be the case's `[units] length`. Files above `MAX_DRAWING_BYTES` are refused before
they are read.

Every refusal is a `CaseError` on `geometry.file` (or `geometry.layer`) that names the
drawing as the case file gives it, the layer and the entity handle where one is to blame.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import numpy as np
from shapely.geometry import Polygon

from classical.arcs import STRAIGHT_BULGE
from fem.case.arcs import Vertex, check_ring, ring_polygon
from fem.case.outline import MIN_FEATURE
from fem.errors import CaseError

__all__ = ["Drawing", "read_drawing", "MAX_DRAWING_BYTES", "JOIN_TOL", "INSUNITS",
           "CONTOUR_TYPES"]

# A member's or a section's outline is a few kilobytes of DXF; a whole sheet with title
# block, hatching and dimensions runs to megabytes. 16 MiB covers any drawing worth reading
# for one outline (ezdxf reads about 1 MiB/s here, so at most ~15 s) and refuses a runaway
# file before any of it is parsed; put the member on a layer of its own, or in a file of
# its own, when a sheet is larger.
MAX_DRAWING_BYTES = 16 * 2**20
# Entity ends closer than this x the drawing's extent are one point: CAD snaps are exact to
# round-off (1e-12 or so), while a gap a user can see at any zoom is far above it.
JOIN_TOL = 1e-7
# $INSUNITS codes (DXF reference, header variables) -> our length units, and names of others
INSUNITS = {1: "in", 4: "mm", 6: "m"}
OTHER_UNITS = {2: "feet", 3: "miles", 5: "centimetres", 7: "kilometres", 8: "microinches",
               9: "mils", 10: "yards", 11: "angstroms", 12: "nanometres", 13: "microns",
               14: "decimetres"}
CONTOUR_TYPES = ("LINE", "ARC", "CIRCLE", "LWPOLYLINE", "POLYLINE")


@dataclass(frozen=True)
class Drawing:
    """What a drawing gives the case: the outline, circular holes and other openings."""

    outline: tuple[Vertex, ...]
    circles: tuple[tuple[float, float, float], ...]       # (x, y, r) holes
    openings: tuple[tuple[Vertex, ...], ...]
    units: str | None                                      # from $INSUNITS, None if unset
    source: str                                            # "file.dxf" or "file.dxf, layer X"


@dataclass
class _Piece:
    start: tuple[float, float]
    end: tuple[float, float]
    bulge: float
    handle: str
    kind: str


@dataclass
class _Contour:
    ring: tuple[Vertex, ...] | None
    circle: tuple[float, float, float] | None
    handles: tuple[str, ...]
    kinds: tuple[str, ...]

    def polygon(self) -> Polygon:
        if self.circle is not None:
            x, y, r = self.circle
            return ring_polygon(((x + r, y, 1.0), (x - r, y, 1.0)))
        assert self.ring is not None
        return ring_polygon(self.ring)

    def name(self) -> str:
        ents = [f"{k} {h}" for k, h in zip(self.kinds, self.handles, strict=True)]
        return ents[0] if len(ents) == 1 else (
            f"{', '.join(ents[:3])}{' ...' if len(ents) > 3 else ''} ({len(ents)} entities)")


class _Refusal(Exception):
    """Raised inside the reader; turned into a CaseError with the file and layer."""

    def __init__(self, message: str, key: str = "geometry.file") -> None:
        super().__init__(message)
        self.key = key


def read_drawing(path: Path, shown: str, layer: str | None, length_unit: str,
                 case_file: str) -> Drawing:
    """Read the outline of a member or section from the DXF file at `path`.

    Parameters
    ----------
    path
        Where the file is (resolved against the case file's folder).
    shown
        The file as the case names it (messages never show the machine's folders).
    layer
        Only entities on this layer count (others are ignored); None: every entity of the
        model space counts.
    length_unit
        `[units] length` of the case, checked against the drawing's `$INSUNITS`.
    case_file
        The case file, for the `CaseError`.
    """
    where = f"{shown}" + (f", layer {layer!r}" if layer is not None else "")
    try:
        return _read(path, layer, length_unit, where)
    except _Refusal as exc:
        raise CaseError(case_file, exc.key, f"{where}: {exc}") from None


def _read(path: Path, layer: str | None, length_unit: str, where: str) -> Drawing:
    try:
        size = path.stat().st_size
    except FileNotFoundError:
        raise _Refusal("no such file (the path is taken from the case file's folder)") from None
    except OSError as exc:
        raise _Refusal(f"cannot read the file ({exc.__class__.__name__})") from None
    if not path.is_file():
        raise _Refusal("is not a file")
    if size > MAX_DRAWING_BYTES:
        raise _Refusal(f"the file is {size / 2**20:.1f} MiB, above the limit of "
                       f"{MAX_DRAWING_BYTES / 2**20:.0f} MiB for one outline; put the member "
                       "on a layer of its own in a file of its own")
    doc = _open(path)
    units = _units(doc, length_unit)
    entities = list(doc.modelspace())
    if layer is not None:
        present = sorted({e.dxf.layer for e in entities if e.dxf.hasattr("layer")})
        entities = [e for e in entities if e.dxf.hasattr("layer") and e.dxf.layer == layer]
        if not entities:
            raise _Refusal(f"no entities on this layer; the drawing's layers with entities: "
                           f"{', '.join(map(repr, present)) or 'none'}", "geometry.layer")
    contours, pieces = [], []
    for e in entities:
        kind = e.dxftype()
        if kind not in CONTOUR_TYPES or (kind == "POLYLINE" and not e.is_2d_polyline):
            what = "3D POLYLINE or mesh" if kind == "POLYLINE" else kind
            on = f" on layer {e.dxf.layer!r}" if e.dxf.hasattr("layer") else ""
            hint = ("give geometry.layer = the outline's layer to leave it out"
                    if layer is None else "draw curves as arcs, circles or polylines with "
                                          "bulges, or move it to another layer")
            raise _Refusal(f"entity {what} (handle {e.dxf.handle}){on} is not a line, arc, "
                           f"circle or 2D polyline; {hint}")
        flip = kind != "LINE" and _flip(e)   # a LINE is in world coordinates
        if kind == "CIRCLE":
            c = _wcs(e, e.dxf.center)
            contours.append(_Contour(None, (c[0], c[1], float(e.dxf.radius)),
                                     (e.dxf.handle,), (kind,)))
        elif kind in ("LINE", "ARC"):
            pieces.append(_line_or_arc(e, kind))
        else:
            ring, closed = _polyline(e, flip)
            if closed:
                contours.append(_Contour(ring, None, (e.dxf.handle,), (kind,)))
            else:
                n = len(ring)
                pieces += [_Piece(ring[k][:2], ring[k + 1][:2], ring[k][2], e.dxf.handle, kind)
                           for k in range(n - 1)]
    extent = _extent(contours, pieces)
    tol = JOIN_TOL * extent
    for p in pieces:
        if math.dist(p.start, p.end) <= tol:
            raise _Refusal(f"entity {p.kind} (handle {p.handle}) has zero length")
    contours += _chains(pieces, tol, length_unit)
    if not contours:
        raise _Refusal("no closed contour: draw the outline as a closed polyline or a closed "
                       "chain of lines and arcs")
    return _assemble(contours, units, where)


def _open(path: Path):
    import ezdxf

    try:
        return ezdxf.readfile(str(path))
    except (OSError, ezdxf.DXFError, UnicodeDecodeError, ValueError, EOFError):
        raise _Refusal("is not a readable DXF drawing (empty, damaged or another kind of "
                       "file); export the outline as DXF") from None


def _units(doc, length_unit: str) -> str | None:
    code = int(doc.header.get("$INSUNITS", 0) or 0)
    if code == 0:
        return None
    have = INSUNITS.get(code) or OTHER_UNITS.get(code, f"unit code {code}")
    if have != length_unit:
        raise _Refusal(f"the drawing is in {have} ($INSUNITS = {code}) but [units] length "
                       f"is {length_unit!r}; give length = {have!r} if that is one of mm, m, "
                       "in, or save the drawing in the case's unit", "units.length")
    return have


def _flip(e) -> bool:
    """True when the entity's extrusion is -z (its OCS is mirrored); other tilts refused."""
    if not e.dxf.hasattr("extrusion"):
        return False
    x, y, z = e.dxf.extrusion
    if abs(x) > 1e-12 or abs(y) > 1e-12:
        raise _Refusal(f"entity {e.dxftype()} (handle {e.dxf.handle}) is not in the drawing "
                       "plane (its extrusion is tilted)")
    return z < 0


def _wcs(e, p) -> tuple[float, float]:
    q = e.ocs().to_wcs(p)
    return (float(q[0]), float(q[1]))


def _line_or_arc(e, kind: str) -> _Piece:
    if kind == "LINE":
        a, b = e.dxf.start, e.dxf.end
        return _Piece((float(a[0]), float(a[1])), (float(b[0]), float(b[1])), 0.0,
                      e.dxf.handle, kind)
    sweep = (float(e.dxf.end_angle) - float(e.dxf.start_angle)) % 360.0
    if sweep < 1e-9:
        raise _Refusal(f"entity ARC (handle {e.dxf.handle}) has no sweep")
    a, b = e.start_point, e.end_point      # in the WCS (ezdxf applies the OCS)
    bulge = math.tan(math.radians(sweep) / 4.0) * (-1.0 if _flip(e) else 1.0)
    return _Piece((float(a[0]), float(a[1])), (float(b[0]), float(b[1])), bulge,
                  e.dxf.handle, kind)


def _polyline(e, flip: bool) -> tuple[tuple[Vertex, ...], bool]:
    if e.dxftype() == "LWPOLYLINE":
        raw = [(x, y, b) for x, y, b in e.get_points("xyb")]
        closed = bool(e.closed)
    else:
        raw = [(v.dxf.location[0], v.dxf.location[1], v.dxf.bulge) for v in e.vertices]
        closed = bool(e.is_closed)
    ocs = e.ocs()
    pts: list[Vertex] = []
    for x, y, b in raw:
        q = ocs.to_wcs((x, y, 0.0))
        b = -float(b) if flip else float(b)
        pts.append((float(q[0]), float(q[1]), 0.0 if abs(b) < STRAIGHT_BULGE else b))
    if len(pts) < 2:
        raise _Refusal(f"entity {e.dxftype()} (handle {e.dxf.handle}) has fewer than two "
                       "vertices")
    out = [pts[0]]
    for p in pts[1:]:       # a repeated vertex is a zero-length edge: drop it
        if p[:2] == out[-1][:2]:
            out[-1] = (out[-1][0], out[-1][1], p[2])
        else:
            out.append(p)
    if len(out) > 2 and out[-1][:2] == out[0][:2]:
        out.pop()
        closed = True
    if not closed:
        return tuple(out), False
    if len(out) < 3 and not any(v[2] for v in out):
        raise _Refusal(f"entity {e.dxftype()} (handle {e.dxf.handle}) encloses no area")
    return tuple(out), True


def _extent(contours: list[_Contour], pieces: list[_Piece]) -> float:
    xs, ys = [], []
    for c in contours:
        if c.circle is not None:
            x, y, r = c.circle
            xs += [x - r, x + r]
            ys += [y - r, y + r]
        else:
            assert c.ring is not None
            xs += [v[0] for v in c.ring]
            ys += [v[1] for v in c.ring]
    for p in pieces:
        xs += [p.start[0], p.end[0]]
        ys += [p.start[1], p.end[1]]
    if not xs:
        raise _Refusal("no closed contour: nothing to read (no lines, arcs, circles or "
                       "polylines)")
    return max(max(xs) - min(xs), max(ys) - min(ys), 1e-300)


def _chains(pieces: list[_Piece], tol: float, unit: str) -> list[_Contour]:
    """Join lines, arcs and open polyline pieces end to end into closed contours."""
    if not pieces:
        return []
    from scipy.spatial import cKDTree

    ends = np.array([q for p in pieces for q in (p.start, p.end)], dtype=float)
    parent = np.arange(len(ends))

    def root(i: int) -> int:
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return int(i)

    for i, j in cKDTree(ends).query_pairs(tol):
        parent[root(i)] = root(j)
    node = np.array([root(i) for i in range(len(ends))])
    members: dict[int, list[int]] = {}
    for i, n in enumerate(node):
        members.setdefault(int(n), []).append(i)
    # one point per joint: a line's or polyline's typed end rather than an arc's end, which
    # the file gives by centre, radius and angles (cos 270 degrees is -1.8e-16, not 0)
    at: dict[int, tuple[float, float]] = {}
    for n, ids in members.items():
        typed = [i for i in ids if pieces[i // 2].kind != "ARC"]
        x, y = ends[(typed or ids)[0]]
        at[n] = (float(x), float(y))
    for ids in members.values():
        if len(ids) == 1:
            _open_end(pieces, ends, node, ids[0], tol, unit)
        if len(ids) > 2:
            who = ", ".join(f"{pieces[i // 2].kind} {pieces[i // 2].handle}" for i in ids)
            x, y = ends[ids[0]]
            raise _Refusal(f"{len(ids)} entity ends meet at ({x:.6g}, {y:.6g}) ({who}); "
                           "a contour must not branch")
    used = [False] * len(pieces)
    out = []
    for start in range(len(pieces)):
        if used[start]:
            continue
        ring: list[Vertex] = []
        handles, kinds = [], []
        k, forward = start, True
        first_node = node[2 * start]
        while True:
            used[k] = True
            p = pieces[k]
            a = at[int(node[2 * k + (0 if forward else 1)])]
            ring.append((a[0], a[1], p.bulge if forward else -p.bulge))
            handles.append(p.handle)
            kinds.append(p.kind)
            here = node[2 * k + (1 if forward else 0)]
            if here == first_node:
                break
            nxt = [i for i in members[int(here)] if i // 2 != k]
            k, forward = nxt[0] // 2, nxt[0] % 2 == 0
        if len(ring) < 3 and not any(v[2] for v in ring):
            raise _Refusal(f"the contour of {', '.join(handles)} encloses no area")
        out.append(_Contour(tuple(ring), None, tuple(handles), tuple(kinds)))
    return out


def _open_end(pieces: list[_Piece], ends: np.ndarray, node: np.ndarray, i: int,
              tol: float, unit: str) -> None:
    """Refuse an open chain: name the loose end and the gap to the nearest other one."""
    p = pieces[i // 2]
    x, y = ends[i]
    loose = [j for j in range(len(ends)) if j != i and np.sum(node == node[j]) == 1]
    if loose:
        d = np.hypot(*(ends[loose] - ends[i]).T)
        j = loose[int(np.argmin(d))]
        q = pieces[j // 2]
        raise _Refusal(f"open chain: entity {p.kind} (handle {p.handle}) ends at "
                       f"({x:.6g}, {y:.6g}) and the nearest loose end, of {q.kind} (handle "
                       f"{q.handle}) at ({ends[j][0]:.6g}, {ends[j][1]:.6g}), is "
                       f"{float(d.min()):.4g} {unit} away (ends closer than {tol:.3g} {unit} "
                       "join); close the gap in the drawing")
    raise _Refusal(f"open chain: entity {p.kind} (handle {p.handle}) ends at ({x:.6g}, "
                   f"{y:.6g}) with nothing to join")


def _assemble(contours: list[_Contour], units: str | None, where: str) -> Drawing:
    polys = []
    for c in contours:
        poly = c.polygon()
        if not poly.is_valid or poly.area <= 0:
            raise _Refusal(f"the contour of {c.name()} crosses itself")
        polys.append(poly)
    x0, y0, x1, y1 = polys[max(range(len(polys)), key=lambda k: polys[k].area)].bounds
    extent = max(x1 - x0, y1 - y0)
    for c in contours:   # the checks of typed rings, reported against the entities
        if c.ring is not None:
            try:
                check_ring(c.ring, "", "ring", extent, MIN_FEATURE * extent)
            except CaseError as exc:
                raise _Refusal(f"the contour of {c.name()}: "
                               f"{exc.message.replace('edges', 'its edges')}") from None
    order = sorted(range(len(contours)), key=lambda k: -polys[k].area)
    outer, opoly = contours[order[0]], polys[order[0]]
    circles, openings, inner = [], [], []
    for k in order[1:]:
        c, poly = contours[k], polys[k]
        if not opoly.contains(poly):
            what = ("lies apart from" if not opoly.intersects(poly)
                    else "overlaps or touches")
            raise _Refusal(f"two outer contours: {c.name()} {what} the outline "
                           f"({outer.name()}); a drawing holds one member or section (give "
                           "geometry.layer, or a file per member)")
        for j, other in inner:
            if other.contains(poly):
                raise _Refusal(f"{c.name()} lies inside the hole {contours[j].name()}; "
                               "islands inside holes are not supported")
        inner.append((k, poly))
        if c.circle is not None:
            circles.append(c.circle)
        else:
            assert c.ring is not None
            openings.append(c.ring)
    if outer.circle is not None:
        x, y, r = outer.circle
        ring: tuple[Vertex, ...] = ((x + r, y, 1.0), (x - r, y, 1.0))
    else:
        assert outer.ring is not None
        ring = outer.ring
    return Drawing(ring, tuple(circles), tuple(openings), units, where)
