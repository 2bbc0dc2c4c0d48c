"""Cross-section geometry with true arcs, meshed by gmsh and handed to scikit-fem.

A section is one outer :class:`Ring` and any number of hole rings.  A ring is either a
full circle or a polygon whose vertices may carry a fillet radius; fillets and circles
are exact OCC arcs, so a quadratic mesh (``order=2``, an isoparametric `MeshTri2`) puts
its mid-edge nodes on the true curve.  Frames follow :mod:`classical.shapes`
(rectangle, circle, tube, box, i centred on the origin; channel with the back of the web
on x = 0; tee with the web tip on y = 0 and the flange on top; angle with its outer
corner at the origin), so FE and hand results share coordinates.

Sharp re-entrant corners (material angle above ``fem.case.outline.CORNER_ANGLE`` = 190
degrees; the vertices of a faceted arc are not corners) get a ``Distance`` +
``Threshold`` background field: there the flexure and torsion stresses are singular
(about r^(-1/3) at a 270-degree corner) and the finer mesh keeps the error local.
Fillet arcs get a field of their own (about five elements per quarter circle).

Adding a shape is one builder plus one registration line (:func:`register_shape`).
"""

from __future__ import annotations

import inspect
import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import gmsh
import numpy as np
from skfem import MeshTri1, MeshTri2

from classical.arcs import arc_midpoint, arc_radius, arc_tangents, facet_ring, ring_circle
from classical.sections import Outline, section_outline, split_vertices
from fem.case.outline import is_sharp_corner
from fem.gmsh_session import gmsh_session, set_background

__all__ = [
    "Ring",
    "SectionShape",
    "SectionMesh",
    "SHAPE_BUILDERS",
    "mesh_section",
    "register_shape",
    "section_shape",
]



@dataclass(frozen=True, eq=False)
class Ring:
    """One closed boundary: a circle (``circle = (xc, yc, r)``) or a polygon.

    Polygon rings are stored with the material on their left (outer counter-clockwise,
    holes clockwise); ``radii[k]`` is the fillet radius at vertex k (0 = sharp corner).
    """

    points: np.ndarray = field(default_factory=lambda: np.zeros((0, 2)))
    radii: np.ndarray = field(default_factory=lambda: np.zeros(0))
    circle: tuple[float, float, float] | None = None
    bulges: np.ndarray | None = None   # arc edges (classical.arcs): edge k -> k + 1

    def material_angles(self) -> np.ndarray:
        """Angle of material at each vertex [rad] (pi - the signed turn; > pi re-entrant).

        The turn is between the tangents of the edges that meet there, so a straight edge
        running tangent into an arc is no corner at all."""
        if self.circle is not None:
            return np.zeros(0)
        p = self.points
        d_in, d_out = p - np.roll(p, 1, axis=0), np.roll(p, -1, axis=0) - p
        if self.bulges is not None and np.any(self.bulges):
            n = len(p)
            for k in np.flatnonzero(self.bulges):
                t0, t1 = arc_tangents(p[k], p[(k + 1) % n], float(self.bulges[k]))
                d_out[k], d_in[(k + 1) % n] = t0, t1
        cross = d_in[:, 0] * d_out[:, 1] - d_in[:, 1] * d_out[:, 0]
        dot = np.sum(d_in * d_out, axis=1)
        return np.pi - np.arctan2(cross, dot)

    def reentrant(self) -> np.ndarray:
        """Boolean per vertex: a re-entrant corner, material angle above
        :data:`fem.case.outline.CORNER_ANGLE` (190 degrees).  The vertices of a faceted
        arc turn by a degree or so and are not corners (the constant gives the reasoning)."""
        if self.circle is not None:
            return np.zeros(0, dtype=bool)
        return np.array([is_sharp_corner(math.degrees(a)) for a in self.material_angles()],
                        dtype=bool)


def _polygon_ring(points: Sequence[Sequence[float]], radii: Sequence[float] | None = None,
                  hole: bool = False) -> Ring:
    """A ring of vertices [x, y] or [x, y, bulge] (arc edges, classical.arcs); a ring made
    wholly of arcs of one circle is that circle."""
    pts, bulges = split_vertices(points)
    if len(pts) > 2 and np.array_equal(pts[0], pts[-1]):
        pts, bulges = pts[:-1], bulges[:-1]
    circle = ring_circle(pts, bulges)
    if circle is not None:
        return _circle_ring(*circle)
    rad = np.zeros(len(pts)) if radii is None else np.asarray(radii, dtype=float)
    x, y = facet_ring(pts, bulges).T
    ccw = np.sum(x * np.roll(y, -1) - np.roll(x, -1) * y) > 0
    if ccw == hole:  # material on the left: outer CCW, holes CW
        # reversed, edge j runs back along the old edge n-2-j: the bulge changes sign
        pts, rad = pts[::-1].copy(), rad[::-1].copy()
        bulges = -np.roll(bulges[::-1], -1)
    return Ring(points=pts, radii=rad, bulges=bulges if np.any(bulges) else None)


def _circle_ring(xc: float, yc: float, r: float) -> Ring:
    return Ring(circle=(float(xc), float(yc), float(r)))


@dataclass(frozen=True, eq=False)
class SectionShape:
    """A section shape with exact arcs, plus the polygon outline the hand side uses."""

    shape: str
    params: dict
    outer: Ring
    holes: tuple[Ring, ...]
    outline: Outline

    @property
    def rings(self) -> tuple[Ring, ...]:
        return (self.outer, *self.holes)

    def sharp_reentrant_corners(self) -> np.ndarray:
        """(k, 2) coordinates of re-entrant vertices without a fillet."""
        pts = [r.points[r.reentrant() & (r.radii == 0.0)] for r in self.rings if r.circle is None]
        return np.vstack(pts) if pts else np.zeros((0, 2))

    def sharp_reentrant_angles(self) -> np.ndarray:
        """Material angles [rad] at :meth:`sharp_reentrant_corners`, same order."""
        a = [r.material_angles()[r.reentrant() & (r.radii == 0.0)] for r in self.rings
             if r.circle is None]
        return np.concatenate(a) if a else np.zeros(0)

    def filleted_reentrant_corners(self) -> np.ndarray:
        """(k, 2) coordinates of re-entrant vertices with a fillet (the sharp corner point)."""
        pts = [r.points[r.reentrant() & (r.radii > 0.0)] for r in self.rings if r.circle is None]
        return np.vstack(pts) if pts else np.zeros((0, 2))


#: shape name -> builder returning (outer ring, hole rings) from keyword parameters
SHAPE_BUILDERS: dict[str, Callable[..., tuple[Ring, tuple[Ring, ...]]]] = {}


def register_shape(name: str) -> Callable[[Callable], Callable]:
    """Decorator: register a ring builder under a shape name."""

    def deco(fn: Callable) -> Callable:
        SHAPE_BUILDERS[name] = fn
        return fn

    return deco


def _rect(w: float, d: float) -> list[tuple[float, float]]:
    return [(-w / 2, -d / 2), (w / 2, -d / 2), (w / 2, d / 2), (-w / 2, d / 2)]


@register_shape("rectangle")
def _rectangle(width: float, depth: float) -> tuple[Ring, tuple[Ring, ...]]:
    return _polygon_ring(_rect(width, depth)), ()


@register_shape("circle")
def _circle(diameter: float) -> tuple[Ring, tuple[Ring, ...]]:
    return _circle_ring(0.0, 0.0, diameter / 2), ()


@register_shape("tube")
def _tube(diameter: float, wall: float) -> tuple[Ring, tuple[Ring, ...]]:
    return _circle_ring(0.0, 0.0, diameter / 2), (_circle_ring(0.0, 0.0, diameter / 2 - wall),)


@register_shape("box")
def _box(width: float, depth: float, wall: float) -> tuple[Ring, tuple[Ring, ...]]:
    inner = _polygon_ring(_rect(width - 2 * wall, depth - 2 * wall), hole=True)
    return _polygon_ring(_rect(width, depth)), (inner,)


@register_shape("i")
def _i(depth: float, flange_width: float, flange_thickness: float, web_thickness: float,
       root_radius: float = 0.0) -> tuple[Ring, tuple[Ring, ...]]:
    x, y, xw, r = flange_width / 2, depth / 2, web_thickness / 2, root_radius
    yf = y - flange_thickness
    corners = [(-x, -y), (x, -y), (x, -yf), (xw, -yf), (xw, yf), (x, yf),
               (x, y), (-x, y), (-x, yf), (-xw, yf), (-xw, -yf), (-x, -yf)]
    return _polygon_ring(corners, [0, 0, 0, r, r, 0, 0, 0, 0, r, r, 0]), ()


@register_shape("channel")
def _channel(depth: float, flange_width: float, flange_thickness: float, web_thickness: float,
             root_radius: float = 0.0) -> tuple[Ring, tuple[Ring, ...]]:
    b, tw, r = flange_width, web_thickness, root_radius
    y, yf = depth / 2, depth / 2 - flange_thickness
    corners = [(0, -y), (b, -y), (b, -yf), (tw, -yf), (tw, yf), (b, yf), (b, y), (0, y)]
    return _polygon_ring(corners, [0, 0, 0, r, r, 0, 0, 0]), ()


@register_shape("tee")
def _tee(depth: float, flange_width: float, flange_thickness: float, web_thickness: float,
         root_radius: float = 0.0) -> tuple[Ring, tuple[Ring, ...]]:
    h, x, xw, r = depth, flange_width / 2, web_thickness / 2, root_radius
    yf = h - flange_thickness
    corners = [(-xw, 0), (xw, 0), (xw, yf), (x, yf), (x, h), (-x, h), (-x, yf), (-xw, yf)]
    return _polygon_ring(corners, [0, 0, r, 0, 0, 0, 0, r]), ()


@register_shape("angle")
def _angle(leg_x: float, leg_y: float, thickness: float) -> tuple[Ring, tuple[Ring, ...]]:
    t = thickness
    return _polygon_ring([(0, 0), (leg_x, 0), (leg_x, t), (t, t), (t, leg_y), (0, leg_y)]), ()


@register_shape("polygon")
def _polygon(points: Sequence[Sequence[float]],
             holes: Sequence[Sequence[Sequence[float]]] = ()) -> tuple[Ring, tuple[Ring, ...]]:
    return _polygon_ring(points), tuple(_polygon_ring(h, hole=True) for h in holes)


def section_shape(shape: str, **params: object) -> SectionShape:
    """Build the exact geometry of a named shape (parameters as in the case contract).

    The parameters are validated by :func:`classical.sections.section_outline` (same
    names, same messages), whose polygon outline is kept for the hand calculation.

    Raises
    ------
    ValueError
        Unknown shape (listing the valid ones), unknown/missing parameter, bad dimensions.
    """
    if shape not in SHAPE_BUILDERS:
        valid = ", ".join(sorted(SHAPE_BUILDERS))
        raise ValueError(f"unknown shape {shape!r}; valid shapes: {valid}")
    accepted = inspect.signature(SHAPE_BUILDERS[shape]).parameters
    for name in params:
        if name not in accepted:
            raise ValueError(f"shape {shape!r} has no parameter {name!r}; "
                             f"parameters: {', '.join(accepted)}")
    outline = section_outline(shape, **params)
    outer, holes = SHAPE_BUILDERS[shape](**params)
    return SectionShape(shape, dict(params), outer, holes, outline)


@dataclass(eq=False)
class SectionMesh:
    """A meshed section: the scikit-fem mesh and what the solver and plots need."""

    geometry: SectionShape
    mesh: MeshTri1 | MeshTri2
    finder: MeshTri1                   # straight-sided twin on the corner vertices
    order: int
    size: float
    boundaries: dict[str, np.ndarray]  # physical curve name -> facet indices
    boundary_lines: np.ndarray         # (n_facets, 3, 2) corner-mid-corner polylines
    seconds: float = 0.0

    @property
    def nodes(self) -> int:
        return int(self.mesh.doflocs.shape[1])

    @property
    def elements(self) -> int:
        return int(self.mesh.t.shape[1])


def _fillet(p: np.ndarray, k: int, r: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Tangent points on the incoming and outgoing edges and the centre of a fillet."""
    u = p[k - 1] - p[k]
    w = p[(k + 1) % len(p)] - p[k]
    lu, lw = np.linalg.norm(u), np.linalg.norm(w)
    u, w = u / lu, w / lw
    phi = math.acos(float(np.clip(u @ w, -1.0, 1.0)))
    t = r / math.tan(phi / 2)
    if t >= min(lu, lw):
        raise ValueError(f"fillet radius {r} does not fit at vertex {p[k].tolist()}")
    bis = (u + w) / np.linalg.norm(u + w)
    return p[k] + t * u, p[k] + t * w, p[k] + r / math.sin(phi / 2) * bis


def _add_ring(ring: Ring) -> tuple[int, list[int], list[int], list[int]]:
    """Create a ring's curves; return (loop tag, curve tags, sharp re-entrant vertex point
    tags, fillet arc tags)."""
    occ = gmsh.model.occ
    if ring.circle is not None:
        xc, yc, r = ring.circle
        c = occ.addCircle(xc, yc, 0.0, r)
        return occ.addCurveLoop([c]), [c], [], []
    p, n = ring.points, len(ring.points)
    entry, exit_, arcs, vertex_tags, centres = [], [], [], [], []
    for k in range(n):
        if ring.radii[k] > 0.0:
            t_in, t_out, c = _fillet(p, k, float(ring.radii[k]))
            a, b, ct = (occ.addPoint(*t_in, 0.0), occ.addPoint(*t_out, 0.0),
                        occ.addPoint(*c, 0.0))
            entry.append(a)
            exit_.append(b)
            arcs.append((k, occ.addCircleArc(a, ct, b)))
            centres.append(ct)
        else:
            tag = occ.addPoint(*p[k], 0.0)
            entry.append(tag)
            exit_.append(tag)
            vertex_tags.append(tag)
    curves: list[int] = []
    arc_of = dict(arcs)
    bulges = ring.bulges if ring.bulges is not None else np.zeros(n)
    for k in range(n):
        if k in arc_of:
            curves.append(arc_of[k])
        if bulges[k]:  # an arc edge through its midpoint (unambiguous beyond a half circle)
            mid = occ.addPoint(*arc_midpoint(p[k], p[(k + 1) % n], float(bulges[k])), 0.0)
            edge = occ.addCircleArc(exit_[k], mid, entry[(k + 1) % n], center=False)
            occ.remove([(0, mid)])
            curves.append(edge)
            arcs.append((-1 - k, edge))
        else:
            curves.append(occ.addLine(exit_[k], entry[(k + 1) % n]))
    if centres:
        occ.remove([(0, c) for c in centres])
    sharp = [t for t, re in zip(vertex_tags, ring.reentrant()[ring.radii == 0.0], strict=True)
             if re]
    return occ.addCurveLoop(curves), curves, sharp, [a for _, a in arcs]


def _arc_radii(ring: Ring) -> list[float]:
    """Radii of a ring's arcs in the order `_add_ring` returns them (fillets, then edges)."""
    radii = [float(r) for r in ring.radii[ring.radii > 0]]
    if ring.bulges is not None:
        n = len(ring.points)
        radii += [arc_radius(ring.points[k], ring.points[(k + 1) % n], float(ring.bulges[k]))
                  for k in np.flatnonzero(ring.bulges)]
    return radii


def _threshold(dist: int, fine: float, size: float) -> int:
    f = gmsh.model.mesh.field
    t = f.add("Threshold")
    f.setNumber(t, "InField", dist)
    f.setNumber(t, "SizeMin", fine)
    f.setNumber(t, "SizeMax", size)
    f.setNumber(t, "DistMin", fine)
    f.setNumber(t, "DistMax", fine + (size - fine) / 0.3)  # size grows 0.3 per unit length
    return t


def _size_fields(size: float, corners: list[int], arcs: list[int], radii: list[float],
                 corner_size: float) -> None:
    f = gmsh.model.mesh.field
    fields = []
    if corners:
        d = f.add("Distance")
        f.setNumbers(d, "PointsList", corners)
        fields.append(_threshold(d, corner_size, size))
    for arc, r in zip(arcs, radii, strict=True):
        d = f.add("Distance")
        f.setNumbers(d, "CurvesList", [arc])
        f.setNumber(d, "Sampling", 40)
        fields.append(_threshold(d, min(size, r / 3), size))
    set_background(fields, size)


def _read(surface: int, order: int, groups: dict[str, list[int]]
          ) -> tuple[np.ndarray, np.ndarray, dict[str, np.ndarray]]:
    """Nodes (N, 2), triangles (3 or 6, ne) and boundary corner pairs from the gmsh API."""
    tags, coords, _ = gmsh.model.mesh.getNodes()
    xy = coords.reshape(-1, 3)[:, :2]
    index = np.full(int(tags.max()) + 1, -1, dtype=np.int64)
    index[tags.astype(np.int64)] = np.arange(len(tags))
    npe = 6 if order == 2 else 3
    etypes, _, enodes = gmsh.model.mesh.getElements(2, surface)
    t = index[np.concatenate([n for n in enodes]).astype(np.int64)].reshape(-1, npe).T
    lines = {}
    for name, curves in groups.items():
        pairs = []
        for c in curves:
            _, _, ln = gmsh.model.mesh.getElements(1, c)
            nodes = index[np.concatenate(ln).astype(np.int64)]
            pairs.append(nodes.reshape(-1, npe // 3 + 1)[:, :2])
        lines[name] = np.vstack(pairs)
    return xy, t, lines


def _compact(xy: np.ndarray, t: np.ndarray, lines: dict[str, np.ndarray]
             ) -> tuple[np.ndarray, np.ndarray, dict[str, np.ndarray]]:
    """Number corner vertices first (0..nv-1), then mid-edge nodes; drop unused nodes;
    orient every triangle counter-clockwise."""
    corners = np.unique(t[:3])
    mids = np.unique(t[3:]) if t.shape[0] == 6 else np.zeros(0, dtype=np.int64)
    new = np.full(len(xy), -1, dtype=np.int64)
    new[corners] = np.arange(len(corners))
    new[mids] = len(corners) + np.arange(len(mids))
    p = xy[np.concatenate([corners, mids])]
    t = new[t]
    a, b, c = p[t[0]], p[t[1]], p[t[2]]
    cw = (b[:, 0] - a[:, 0]) * (c[:, 1] - a[:, 1]) - (b[:, 1] - a[:, 1]) * (c[:, 0] - a[:, 0]) < 0
    perm = [0, 2, 1, 5, 4, 3] if t.shape[0] == 6 else [0, 2, 1]
    t[:, cw] = t[perm][:, cw]
    return p, t, {k: new[v] for k, v in lines.items()}


def _facets_of(mesh: MeshTri1, pairs: np.ndarray) -> np.ndarray:
    nv = mesh.p.shape[1]
    keys = mesh.facets[0].astype(np.int64) * nv + mesh.facets[1]
    order = np.argsort(keys)
    q = np.sort(pairs, axis=1)
    want = q[:, 0] * nv + q[:, 1]
    pos = order[np.searchsorted(keys, want, sorter=order)]
    if not np.array_equal(keys[pos], want):
        raise RuntimeError("a boundary line of the gmsh mesh is not a facet of the mesh")
    return np.unique(pos)


def mesh_section(geometry: SectionShape, size: float, order: int = 2,
                 corner_size: float | None = None) -> SectionMesh:
    """Mesh a section with gmsh (OCC kernel) and read it straight into scikit-fem.

    Parameters
    ----------
    geometry
        From :func:`section_shape`.
    size
        Target element size away from refinements [length].
    order
        2 (quadratic, isoparametric `MeshTri2` with nodes on the true arcs) or 1 (`MeshTri1`).
    corner_size
        Element size at sharp re-entrant corners; default ``size / 8``.

    Returns
    -------
    SectionMesh
        Physical groups: surface ``section``; curves ``outer`` and ``hole-<k>`` (k from 0),
        each also a named facet set in ``boundaries``.
    """
    if order not in (1, 2):
        raise ValueError(f"order must be 1 or 2, got {order!r}")
    if not (math.isfinite(size) and size > 0):
        raise ValueError(f"size must be > 0, got {size!r}")
    corner_size = size / 8 if corner_size is None else corner_size
    start = time.perf_counter()
    with gmsh_session(f"section-{geometry.shape}"):
        occ = gmsh.model.occ
        loops, ring_curves, sharp, arcs, radii = [], [], [], [], []
        for ring in geometry.rings:
            loop, c, s, a = _add_ring(ring)
            loops.append(loop)
            ring_curves.append(c)
            sharp += s
            arcs += a
            radii += _arc_radii(ring)
        surface = occ.addPlaneSurface(loops)
        occ.synchronize()
        gmsh.model.addPhysicalGroup(2, [surface], name="section")
        groups = {}
        for k, curves in enumerate(ring_curves):
            name = "outer" if k == 0 else f"hole-{k - 1}"
            groups[name] = curves
            gmsh.model.addPhysicalGroup(1, curves, name=name)
        _size_fields(size, sharp, arcs, radii, corner_size)
        gmsh.option.setNumber("Mesh.ElementOrder", order)
        gmsh.model.mesh.generate(2)
        xy, t, lines = _read(surface, order, groups)
    p, t, lines = _compact(xy, t, lines)
    nv = int(t[:3].max()) + 1
    finder = MeshTri1(np.ascontiguousarray(p[:nv].T), np.ascontiguousarray(t[:3]), sort_t=False)
    mesh = MeshTri2(np.ascontiguousarray(p.T), t) if order == 2 else finder
    boundaries = {k: _facets_of(finder, v) for k, v in lines.items()}
    allf = finder.boundary_facets()
    ends = finder.p[:, finder.facets[:, allf]].T            # (nf, 2 ends, 2)
    mid = mesh.doflocs[:, mesh.dofs.facet_dofs[0, allf]].T if order == 2 else ends.mean(axis=1)
    polylines = np.stack([ends[:, 0], mid, ends[:, 1]], axis=1)
    mesh = mesh.with_boundaries(boundaries)
    if order == 1:
        finder = mesh
    return SectionMesh(geometry, mesh, finder, order, float(size), boundaries, polylines,
                       time.perf_counter() - start)
