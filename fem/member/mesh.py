"""Meshing a member with gmsh and handing the mesh to scikit-fem with its names intact.

The mesh is read straight from the gmsh API (not through meshio, which drops boundary tags
of quadratic meshes): corner vertices are numbered first so scikit-fem keeps our numbering,
each physical curve becomes a named set of facet indices, each physical point a named node.
Curved members (holes, fillets) get an isoparametric `MeshTri2`; straight ones a `MeshTri1`
carrying P2 elements (same dofs, affine map, exact point location).
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from dataclasses import dataclass, field

import gmsh
import numpy as np
from skfem import MeshTri1, MeshTri2

from fem.case.model import BeamGeometry, Case
from fem.case.outline import (
    Patch,
    check_mechanism,
    curved_edges,
    domain_polygon,
    member_depth,
    patches,
    reentrant_corners,
)
from fem.case.sizing import (  # GRADING: size growth per unit distance
    GRADING,
    check_real_dofs,
    estimate_dofs,
)
from fem.errors import SolveError
from fem.gmsh_session import gmsh_session, set_background
from fem.member.frame import Frame
from fem.member.gmsh_model import build_member, name_boundaries

__all__ = ["MemberMesh", "mesh_member", "SHARED_HOLE_FIELDS", "RADIUS_BAND", "linear_mesh_dofs"]

SHARED_HOLE_FIELDS = True   # one size field per band of hole radii (False: one per hole, the
                            # old way, kept for bench/bench_holes.py's same-run baseline)


@dataclass
class MemberMesh:
    """A meshed member: the scikit-fem mesh plus everything named on it."""

    mesh: MeshTri1 | MeshTri2
    finder_mesh: MeshTri1            # straight-sided twin for point location
    order: int
    size: float
    boundaries: dict[str, np.ndarray]  # name -> facet indices
    points: dict[str, int]             # name -> vertex index (point patches)
    thickness: np.ndarray              # per element
    supports: list[Patch]
    loads: list[Patch]
    seconds: float = 0.0
    extra: dict = field(default_factory=dict)

    @property
    def curved(self) -> bool:
        return isinstance(self.mesh, MeshTri2)


def _size_fields(case: Case, size: float, sup: list[Patch], lds: list[Patch], fr: Frame,
                 gf: BeamGeometry, background: Callable[[Frame], int] | None = None) -> None:
    """Distance/threshold refinement at patch ends, holes, fillets and corners.

    Everything is worked out in case units and handed to gmsh in the frame `fr`; `gf` is
    the geometry in that frame (as built)."""
    g = case.beam
    fields = []
    scale = size / case.mesh.size
    f = gmsh.model.mesh.field

    def threshold(points: list[tuple[float, float]] | None, curves: list[int] | None,
                  fine: float, dmin: float, dmax: float) -> None:
        fine = min(fine, size)
        # grade the size at most GRADING per unit distance, so fine spots never sit next to
        # coarse, badly curved isoparametric elements
        dmax = max(dmax, dmin + (size - fine) / GRADING)
        d = f.add("Distance")
        if points:
            tags = [gmsh.model.occ.addPoint(*fr.point(p), 0) for p in points]
            gmsh.model.occ.synchronize()
            f.setNumbers(d, "PointsList", tags)
        if curves:
            f.setNumbers(d, "CurvesList", curves)
            f.setNumber(d, "Sampling", 200)
        t = f.add("Threshold")
        f.setNumber(t, "InField", d)
        f.setNumber(t, "SizeMin", fr.length(fine))
        f.setNumber(t, "SizeMax", fr.length(size))
        f.setNumber(t, "DistMin", fr.length(dmin))
        f.setNumber(t, "DistMax", fr.length(dmax))
        fields.append(t)

    depth = member_depth(case.beam)
    ends = [p for patch in sup + lds for p in patch.ends]
    if ends:
        threshold(ends, None, size / 4, 0.0, 0.25 * depth)
    corners = [c.at for c in reentrant_corners(domain_polygon(g))]
    if corners:
        threshold(corners, None, size / 6, 0.0, 0.25 * depth)
    # 24 elements round a hole at level 0, doubling with each level. Holes of about one
    # radius (within RADIUS_BAND) share one field - one Distance over all their curves, the
    # fine size of the smallest, the reach of the largest: gmsh evaluates every field of the
    # Min at every size query, so a field per hole made meshing grow with the square of the
    # hole count (bench/bench_holes.py). Equal radii give exactly the mesh of a field each.
    for group in _hole_groups(g.holes) if SHARED_HOLE_FIELDS else [[k] for k in
                                                                   range(len(g.holes))]:
        curves = [int(t) for k in group
                  for t in gmsh.model.getEntitiesForPhysicalGroup(1, _phys_tag(1, f"hole-{k}"))]
        rmin = min(g.holes[k].radius for k in group)
        rmax = max(g.holes[k].radius for k in group)
        threshold(None, curves, min(size / 2, 2 * math.pi * rmin / 24 * scale), 0.0, 1.5 * rmax)
    arcs = curved_edges(g)   # arcs of the outline and openings (fem.case.arcs)
    arcs_f = curved_edges(gf)  # the same arcs in the mesh frame, to find their gmsh curves
    circles = [t for _, t in gmsh.model.getEntities(1)
               if gmsh.model.getType(1, t) == "Circle" and not _is_hole(gf, t)]
    arc_curves = [t for t in circles if _is_arc(arcs_f, t)]
    fillet_curves = [t for t in circles if t not in arc_curves]
    if arc_curves:
        rmin = min(a.radius for a in arcs)
        # 24 elements round a full circle of the smallest arc at level 0 (a no-op for arcs
        # large beside the element size, e.g. a haunch), doubling with each level
        fine = 2 * math.pi * rmin / 24 * scale
        if fine < size:
            threshold(None, arc_curves, fine, 0.0, 1.5 * rmin)
    if fillet_curves:
        rmin = min(c.fillet for c in g.cutouts if c.fillet > 0)
        # 6 elements along a quarter-circle fillet at level 0, doubling with each level
        threshold(None, fillet_curves, min(size / 2, 0.5 * math.pi * rmin / 6 * scale),
                  0.0, 2.0 * rmin)
    for r in case.mesh.refine:
        threshold([r.at], None, r.size * scale, r.radius, 2 * r.radius)
    if background is not None:  # e.g. fem.member.adapt.size_field: one more field in the minimum
        fields.append(background(fr))
    set_background(fields, fr.length(size))


RADIUS_BAND = 1.25   # holes whose radii lie within this ratio share one size field


def _hole_groups(holes) -> list[list[int]]:
    """Hole indices in groups of radii within RADIUS_BAND of the group's smallest."""
    order = sorted(range(len(holes)), key=lambda k: holes[k].radius)
    groups: list[list[int]] = []
    for k in order:
        if groups and holes[k].radius <= RADIUS_BAND * holes[groups[-1][0]].radius:
            groups[-1].append(k)
        else:
            groups.append([k])
    return groups


def _is_hole(g, tag: int) -> bool:
    xyz = gmsh.model.getValue(1, tag, [gmsh.model.getParametrizationBounds(1, tag)[0][0]])
    return any(abs(math.dist(xyz[:2], h.center) - h.radius) < 1e-6 * h.radius for h in g.holes)


def _is_arc(arcs, tag: int) -> bool:
    lo, hi = gmsh.model.getParametrizationBounds(1, tag)
    xyz = gmsh.model.getValue(1, tag, [0.5 * (lo[0] + hi[0])])
    return any(abs(math.dist(xyz[:2], a.centre) - a.radius) < 1e-6 * a.radius for a in arcs)


def _phys_tag(dim: int, name: str) -> int:
    for d, t in gmsh.model.getPhysicalGroups(dim):
        if gmsh.model.getPhysicalName(d, t) == name:
            return t
    raise KeyError(name)


def mesh_member(case: Case, size: float | None = None,
                background: Callable[[Frame], int] | None = None) -> MemberMesh:
    """Mesh the member at element size `size` (default: mesh.size) and hand it over.

    `background`, if given, is called inside the gmsh session with the mesh frame and
    returns the tag of one more size field; the element size is the smallest of all fields
    (adaptive refinement). gmsh works in the member's dimensionless frame
    (fem/member/frame.py), so the mesh is the same whatever the units.
    """
    size = case.mesh.size if size is None else size
    g = case.beam
    estimate = estimate_dofs(case, size)
    if estimate > case.mesh.max_dofs:
        from fem.errors import CaseError

        raise CaseError(case.file, "mesh.max_dofs",
                        f"the model would have about {estimate:,} dofs at size {size:g}, "
                        f"above the limit {case.mesh.max_dofs:,}; raise mesh.size or max_dofs")
    dom = domain_polygon(g)
    sup, lds = patches(case, dom)
    check_mechanism(case, sup)  # refuse a mechanism before gmsh runs
    t0 = time.perf_counter()
    x0, y0, x1, y1 = dom.bounds
    fr = Frame.of(dom.bounds)
    tol = 1e-7 * max(x1 - x0, y1 - y0) / fr.scale
    gf, sup_f, lds_f = fr.geometry(g), [fr.patch(p) for p in sup], [fr.patch(p) for p in lds]
    with gmsh_session():
        try:
            surf_names = build_member(gf, sup_f, lds_f)
            groups = name_boundaries(gf, sup_f, lds_f, tol)
            _size_fields(case, size, sup, lds, fr, gf, background)
            gmsh.option.setNumber("Mesh.Algorithm", 6)
            gmsh.model.mesh.generate(2)
            # the real count, before the second-order pass, the hand-over and assembly: an
            # outline the estimate underrates is stopped here, not after minutes of solving
            check_real_dofs(case, linear_mesh_dofs(case), size)
            if case.mesh.order == 2 and _curved(case):  # straight: P2 on the linear mesh
                gmsh.model.mesh.setOrder(2)
                _untangle(size)
        except Exception as exc:
            if type(exc) is not Exception:  # gmsh raises plain Exception; anything else is ours
                raise
            raise SolveError(f"gmsh could not build or mesh the member at size {size:g} "
                             f"({exc}); check the geometry for features much smaller than "
                             "the element size, or change mesh.size") from None
        mm = _hand_over(case, size, surf_names, groups, fr)
    mm.supports, mm.loads = sup, lds
    mm.seconds = time.perf_counter() - t0
    return mm


def linear_mesh_dofs(case: Case) -> int:
    """Dofs of the member's mesh just generated by gmsh (linear triangles so far): 2 per
    vertex, and for P2 2 per edge too. Edges by Euler's formula for a connected plane
    triangulation with H holes: E = V + T - 1 + H."""
    types, _, nodes_of = gmsh.model.mesh.getElements(2)
    tri = [nd.astype(np.int64) for ty, nd in zip(types, nodes_of, strict=True) if ty == 2]
    if not tri:
        return 0
    used = np.concatenate(tri)
    seen = np.zeros(int(used.max()) + 1, dtype=bool)   # a mask, not np.unique (see below)
    seen[used] = True
    nodes, tris = int(seen.sum()), len(used) // 3
    if case.mesh.order == 1:
        return 2 * nodes
    return 2 * (nodes + nodes + tris - 1 + len(case.beam.holes))


def _curved(case: Case) -> bool:
    """Holes, fillets and arcs need curved (isoparametric) P2 elements; straight outlines
    do not."""
    g = case.beam
    return bool(g.holes) or any(c.fillet > 0 for c in g.cutouts) or bool(curved_edges(g))


def _min_jacobian() -> float:
    _, tags, _ = gmsh.model.mesh.getElements(2)
    tags = np.concatenate(tags) if len(tags) else np.zeros(0)
    return float(gmsh.model.mesh.getElementQualities(tags, "minSJ").min()) if len(tags) else 1.0


def _untangle(size: float) -> None:
    """Curved P2 elements next to small holes or fillets can fold over (negative Jacobian);
    gmsh's high-order optimisation unfolds them. Only a folded mesh is touched."""
    if _min_jacobian() > 0:
        return
    gmsh.model.mesh.optimize("HighOrder")
    if _min_jacobian() <= 0:
        raise SolveError(f"the curved mesh at size {size:g} has folded elements next to a "
                         "small hole or fillet; give a smaller mesh.size or a mesh.refine "
                         "there")


def _hand_over(case: Case, size: float, surf_names: dict[int, str],
               groups: dict[str, list[int]], fr: Frame) -> MemberMesh:
    tags, coords, _ = gmsh.model.mesh.getNodes()
    xy = fr.back(coords.reshape(-1, 3)[:, :2])
    index = np.full(int(tags.max()) + 1, -1, dtype=np.int64)
    index[tags.astype(np.int64)] = np.arange(len(tags))
    curved = case.mesh.order == 2 and _curved(case)  # only then has gmsh set order 2
    etype = 9 if curved else 2
    nper = 6 if curved else 3
    conn, elem_thk = [], []
    thick = {f"zone-{k}": z.thickness for k, z in enumerate(case.beam.zones)}
    for s, name in surf_names.items():
        types, _, nodes = gmsh.model.mesh.getElements(2, s)
        for ty, nd in zip(types, nodes, strict=True):
            if ty != etype:
                raise SolveError(f"gmsh produced element type {ty}; expected triangles")
            c = index[nd.astype(np.int64)].reshape(-1, nper)
            conn.append(c)
            elem_thk.append(np.full(len(c), thick.get(name, case.material.thickness)))
    t_all = np.vstack(conn).T
    # number corner vertices first, then mid-edge nodes, both in first-use order
    # (masks, not np.unique: numpy 2.4's hash-based integer unique took 1.2 s a call here at
    # 400k dofs)
    is_corner = np.zeros(len(xy), dtype=bool)
    is_corner[t_all[:3].ravel()] = True
    corner_ids = np.flatnonzero(is_corner)
    new = np.full(len(xy), -1, dtype=np.int64)
    new[corner_ids] = np.arange(len(corner_ids))
    if nper == 6:
        is_mid = np.zeros(len(xy), dtype=bool)
        is_mid[t_all[3:].ravel()] = True
        mids = np.flatnonzero(is_mid & ~is_corner)
        new[mids] = len(corner_ids) + np.arange(len(mids))
    used = new >= 0
    p = np.empty((2, used.sum()))
    p[:, new[used]] = xy[used].T
    t = np.ascontiguousarray(new[t_all])
    nv = len(corner_ids)
    finder = MeshTri1(np.ascontiguousarray(p[:, :nv]), np.ascontiguousarray(t[:3]))
    mesh = MeshTri2(p, t) if curved else finder
    facet_of = {(int(a), int(b)): i for i, (a, b) in enumerate(np.sort(mesh.facets, axis=0).T)}
    boundaries, points = {}, {}
    for name, curve_tags in groups.items():
        if curve_tags and curve_tags[0] < 0:
            ntags, _, _ = gmsh.model.mesh.getNodes(0, -curve_tags[0])
            points[name] = int(new[index[int(ntags[0])]])
            continue
        facets = []
        for ct in curve_tags:
            types, _, nodes = gmsh.model.mesh.getElements(1, ct)
            for ty, nd in zip(types, nodes, strict=True):
                k = 3 if ty == 8 else 2
                e = new[index[nd.astype(np.int64)]].reshape(-1, k)[:, :2]
                facets += [facet_of[(int(min(a, b)), int(max(a, b)))] for a, b in e]
        boundaries[name] = np.array(sorted(set(facets)), dtype=np.int64)
    for name, f in boundaries.items():
        if len(f) == 0 and not name.startswith("hole"):
            raise SolveError(f"the mesh has no boundary facets for {name}; "
                             "the patch may be shorter than the element size")
    return MemberMesh(mesh=mesh, finder_mesh=finder, order=case.mesh.order, size=size,
                      boundaries=boundaries, points=points,
                      thickness=np.concatenate(elem_thk), supports=[], loads=[])
