"""The size guard: estimate the dofs of a mesh from area, element size and refinements.

The estimate runs before gmsh does (from `fem.case.parse.parse_case`, for the finest level of
the study, and again in `fem.member.mesh.mesh_member` for each size), so a model too large for
`mesh.max_dofs` is refused in milliseconds with the estimate and the limit in the message.

Triangles per unit area are `DENSITY / h^2` for element size h (gmsh's Frontal-Delaunay
meshes measured here: 2.3 triangles per h^2, an equilateral triangle of side h has area
0.433 h^2), plus `PERIMETER * DENSITY` per element length of boundary (the boundary row,
which dominates thin walls meshed coarsely). The refinements of `fem.member.mesh._size_fields`
(patch ends, re-entrant corners, holes, fillets, arcs of the outline and openings,
`mesh.refine`) grade h linearly from a
fine size to the global size over a distance (at most `GRADING` per unit distance); their
extra triangles are integrated in closed form and added. Overlapping refinements are
counted twice, so the estimate errs on the large side there. Section meshes refine sharp
re-entrant corners and root fillets their own way (`SECTION_CORNER`, `SECTION_GRADING`, as
in `fem.section.mesh`). A P2 mesh has about 2 nodes per triangle (vertices + edge
midpoints), a P1 mesh 1/2; a beam has 2 dofs per node, a section's warping problem 1.
Measured against real meshes (tests/test_hostile.py): beams 0.90 to 1.08 of the real dof
count, sections 0.66 (thin walls meshed coarser than their thickness) to 1.08.
"""

from __future__ import annotations

import math

import numpy as np
import shapely
from shapely.geometry import Point, Polygon

from classical.sections import section_outline
from fem.case.model import Case
from fem.case.outline import (
    curved_edges,
    domain_polygon,
    outline_polygon,
    patches,
    reentrant_corners,
)
from fem.case.plates import drawn_section
from fem.errors import CaseError

__all__ = ["estimate_dofs", "level_size", "check_size", "check_real_dofs", "check_scale",
           "DENSITY",
           "PERIMETER", "GRADING"]

DENSITY = 2.3    # triangles per (element size)^2 of area
PERIMETER = 0.4  # extra triangles per element along the boundary (over DENSITY): thin walls
GRADING = 0.5    # largest growth of element size per unit distance from a refinement (the
                 # mesher's size fields use it too: fem.member.mesh imports it from here)


def _graded(h0: float, H: float, d0: float, d1: float, r: float = 0.0) -> float:
    """Extra (1/h^2 - 1/H^2) integrated over a graded region, in size^-2 * area.

    h = h0 within distance d0 of the feature, growing linearly to H at d1. A point feature
    (r = 0) integrates over the disc of radius d1; a circle of radius r (material outside)
    over the ring r .. r + d1.
    """
    if h0 >= H or d1 <= 0:
        return 0.0
    d1 = max(d1, d0 + (H - h0) / GRADING)  # as fem.member.mesh grades its size fields
    inner = math.pi * ((r + d0) ** 2 - r**2) * (1 / h0**2 - 1 / H**2)
    L = d1 - d0
    if L <= 0:
        return inner
    b = (H - h0) / L
    i1 = (math.log(H / h0) + h0 / H - 1.0) / b**2        # int_0^L s / h(s)^2 ds
    i0 = (1.0 / h0 - 1.0 / H) / b                        # int_0^L 1 / h(s)^2 ds
    ring = 2 * math.pi * (i1 + (r + d0) * i0)
    ring -= math.pi * ((r + d1) ** 2 - (r + d0) ** 2) / H**2
    return inner + ring


SHORT_SEGMENT = 2.2   # extra triangles per straight outline segment much shorter than the
                      # element size: gmsh keeps every vertex of a polygon, so each short
                      # segment brings its own small triangles and the grading away from
                      # them (measured here 1.6 to 2.1 for outlines of 200 to 2000 segments
                      # 0.15 to 1.5 long at sizes 2 to 50; tests/test_hostile.py keeps the
                      # estimate within a factor 1.5 of such meshes)


def _short_segments(rings: list, size: float) -> float:
    """Extra triangles of the polygon segments shorter than the element size: SHORT_SEGMENT
    each, fading linearly to none at a segment as long as an element."""
    extra = 0.0
    for ring in rings:
        xy = np.asarray(ring, dtype=float)
        if len(xy) < 2:
            continue
        seg = np.hypot(*(np.roll(xy, -1, axis=0) - xy).T)
        extra += float(np.clip(1.0 - seg / size, 0.0, 1.0).sum())
    return SHORT_SEGMENT * extra


def _beam_triangles(case: Case, size: float) -> float:
    g = case.beam
    dom = domain_polygon(g)
    depth = dom.bounds[3] - dom.bounds[1]
    scale = size / case.mesh.size
    per_h2 = dom.area + PERIMETER * dom.length * size

    def inside(p: tuple[float, float], radius: float) -> float:
        disc = Point(p).buffer(radius, quad_segs=8)
        return dom.intersection(disc).area / disc.area if disc.area > 0 else 0.0

    sup, lds = patches(case, dom)
    ends = {p for patch in sup + lds for p in patch.ends}
    for p in ends:
        per_h2 += inside(p, 0.25 * depth) * _graded(size / 4, size, 0.0, 0.25 * depth) * size**2
    for c in reentrant_corners(dom):
        per_h2 += (inside(c.at, 0.25 * depth) * _graded(size / 6, size, 0.0, 0.25 * depth)
                   * size**2)
    for h in g.holes:
        fine = min(size / 2, 2 * math.pi * h.radius / 24 * scale)
        per_h2 += _graded(fine, size, 0.0, 1.5 * h.radius, h.radius) * size**2
    fillets = [c.fillet for c in g.cutouts if c.fillet > 0]
    if fillets:
        rmin = min(fillets)
        fine = min(size / 2, 0.5 * math.pi * rmin / 6 * scale)
        per_h2 += 4 * len(fillets) * 0.25 * _graded(fine, size, 0.0, 2 * rmin, rmin) * size**2
    arcs = curved_edges(g)   # arcs of the outline and openings, graded as fem.member.mesh does
    if arcs:
        fine = 2 * math.pi * min(a.radius for a in arcs) / 24 * scale
        for a in arcs:
            per_h2 += (abs(a.angle) / (2 * math.pi)
                       * _graded(min(fine, size), size, 0.0, 1.5 * a.radius, a.radius) * size**2)
    for r in case.mesh.refine:
        per_h2 += (inside(r.at, 2 * r.radius) * _graded(r.size * scale, size, r.radius,
                                                         2 * r.radius) * size**2)
    tris = DENSITY * per_h2 / size**2
    if g.shape == "polygon":   # the drawn outline (holes and fillets are true arcs in gmsh)
        tris += _short_segments([list(outline_polygon(g).exterior.coords)[:-1]], size)
    return tris


SECTION_CORNER = 1 / 8   # fem.section.mesh: element size at sharp re-entrant corners / size
SECTION_GRADING = 0.3    # fem.section.mesh: size growth per unit distance from a refinement


def _section_triangles(case: Case, size: float) -> float:
    g = drawn_section(case.section)
    o = section_outline(g.shape, **g.params)
    poly = Polygon(o.outer, list(o.holes))
    per_h2 = poly.area + PERIMETER * poly.length * size
    # corners of the shape drawn without root fillets: sharp corners, or the fillets' sites
    root = float(g.params.get("root_radius", 0.0))
    sharp = section_outline(g.shape, **{**g.params, "root_radius": 0.0}) if root else o
    for c in reentrant_corners(Polygon(sharp.outer, list(sharp.holes))):
        fine = min(size, root / 3) if root else SECTION_CORNER * size
        d1 = fine + (size - fine) / SECTION_GRADING
        disc = Point(c.at).buffer(d1, quad_segs=8)
        share = poly.intersection(disc).area / disc.area
        per_h2 += share * _graded(fine, size, fine, d1) * size**2
    for r in case.mesh.refine:
        per_h2 += _graded(r.size * size / case.mesh.size, size, r.radius, 2 * r.radius) * size**2
    tris = DENSITY * per_h2 / size**2
    if g.shape == "polygon":   # the drawn rings; the other shapes' arcs are true arcs
        tris += _short_segments([o.outer, *o.holes], size)
    return tris


def level_size(case: Case, level: int) -> float:
    """Element size at convergence level `level` (0 = coarsest): halving each time."""
    return case.mesh.size / 2.0 ** level


def estimate_dofs(case: Case, size: float) -> int:
    """Estimated dofs of the mesh of `case` at element size `size` (a validated case)."""
    if case.kind == "beam":
        tris, per_node = _beam_triangles(case, size), 2
    else:
        tris, per_node = _section_triangles(case, size), 1
    nodes = tris * (2.0 if case.mesh.order == 2 else 0.5)
    return int(min(per_node * nodes, 1e18))


DEPTH_SAMPLES = 400   # vertical lines along the load path at which the material depth is read


def thinnest_depth(case: Case) -> float:
    """The smallest depth of material the loads pass through (beam cases), in case units.

    At `DEPTH_SAMPLES` vertical lines strictly between the first and the last support or
    load (the load path), the total height of material met by the line; the smallest of
    them. A hole or cut-out reduces it; a tip beyond the last load does not count.
    """
    dom = domain_polygon(case.beam)
    sup, lds = patches(case, dom)
    xs = [q[0] for p in sup + lds for q in p.ends]
    x0, x1 = min(xs), max(xs)
    y0, y1 = dom.bounds[1] - 1.0, dom.bounds[3] + 1.0
    if x1 - x0 <= 0.0:
        return dom.bounds[3] - dom.bounds[1]
    xs = np.linspace(x0, x1, DEPTH_SAMPLES + 2)[1:-1]
    lines = shapely.linestrings(np.stack([np.column_stack([xs, np.full_like(xs, y0)]),
                                          np.column_stack([xs, np.full_like(xs, y1)])], axis=1))
    depths = shapely.length(shapely.intersection(dom, lines))
    depths = depths[depths > 0.0]
    return float(depths.min()) if depths.size else dom.bounds[3] - dom.bounds[1]


def check_element_size(case: Case) -> None:
    """Refuse a member whose element size (coarsest level) exceeds the thinnest depth of
    material on the load path: such a mesh has no element across the depth that carries the
    shear, and two such levels can agree closely while both are wrong (a 17 % error once
    passed as converged), so no convergence study on it can be trusted."""
    if case.kind != "beam":
        return   # sections: mesh.size is limited to a quarter of the extent (section_rules)
    depth = thinnest_depth(case)
    if case.mesh.size > depth:
        raise CaseError(case.file, "mesh.size",
                        f"{case.mesh.size:g} {case.units.length} is larger than the "
                        f"thinnest depth of material on the load path ({depth:.4g} "
                        f"{case.units.length}); use at most that, and for a converged "
                        "study about a quarter of it")


def check_real_dofs(case: Case, dofs: int, size: float) -> None:
    """Refuse a mesh whose real dof count exceeds `mesh.max_dofs` (called after meshing and
    before assembly: the estimate can be beaten by outline detail it does not foresee)."""
    if dofs > case.mesh.max_dofs:
        raise CaseError(case.file, "mesh.max_dofs",
                        f"the mesh at size {size:g} has {dofs:,} dofs (the estimate was "
                        f"{estimate_dofs(case, size):,}), above the limit "
                        f"{case.mesh.max_dofs:,}; raise mesh.size or mesh.max_dofs, or draw "
                        "the outline with fewer points")


def _extent(case: Case) -> tuple[str, float, float]:
    """(key, larger side, largest |coordinate|) of the member or section as written."""
    if case.kind == "beam":
        g = case.beam
        if g.shape == "rectangle":
            return "geometry.length", max(g.length, g.depth), max(g.length, g.depth)
        xy = np.asarray(g.points, dtype=float)
        key = "geometry.points"
    else:
        g = drawn_section(case.section, case.file)   # built-up: the polygon of its plates
        p = g.params
        if g.shape != "polygon":
            side = max(float(v) for k, v in p.items() if isinstance(v, float)
                       and k != "root_radius")
            return f"geometry.{next(iter(p))}", side, side
        xy = np.asarray([v[:2] for v in p["points"]], dtype=float)  # (x, y[, bulge])
        key = "geometry.plates" if case.section.shape == "built-up" else "geometry.points"
    side = float(max(np.ptp(xy[:, 0]), np.ptp(xy[:, 1])))
    return key, side, float(np.abs(xy).max())


def check_scale(case: Case) -> None:
    """Refuse numbers the model cannot carry in floating point: "out of scale", naming
    the key (limits and their reasons in `fem.case.limits`). Runs before any geometry
    check, so nothing downstream sees such a model."""
    from fem.case.limits import (
        MAX_EXTENT,
        MAX_OFFSET,
        MIN_EXTENT,
        NUMBER_RANGE,
        THICKNESS_RATIO,
    )

    f, unit = case.file, case.units.length
    key, side, far = _extent(case)
    if not MIN_EXTENT <= side <= MAX_EXTENT:
        raise CaseError(f, key, f"out of scale: the {case.kind} is {side:.3g} {unit} across; "
                                f"the mesher works from {MIN_EXTENT:g} to {MAX_EXTENT:g} "
                                "length units: give lengths in another unit (units.length)")
    if far > MAX_OFFSET * side:
        raise CaseError(f, key, f"out of scale: the {case.kind} lies {far / side:.3g} times "
                                f"its own size ({side:.3g} {unit}) from the origin; at most "
                                f"{MAX_OFFSET:g}: move it near (0, 0)")
    t = case.material.thickness
    if case.kind == "beam" and not 1 / THICKNESS_RATIO <= t / side <= THICKNESS_RATIO:
        raise CaseError(f, "material.thickness",
                        f"out of scale: {t:.3g} against a member {side:.3g} {unit} across "
                        f"(ratio {t / side:.3g}; allowed {1 / THICKNESS_RATIO:g} to "
                        f"{THICKNESS_RATIO:g})")
    if case.kind == "beam":
        force = max(math.hypot(*ld.force) for ld in case.loads)
        stress, fkey = force / (t * side), "loads"
    else:
        force = math.hypot(*case.shear)
        stress, fkey = force / side**2, "loads.shear"
    for what, value, k in (("the nominal stress force / area", stress, fkey),
                           ("the nominal strain (stress / E)", stress / case.material.E,
                            "material.E")):
        if not 1 / NUMBER_RANGE <= value <= NUMBER_RANGE:
            raise CaseError(f, k, f"out of scale: {what} is {value:.3g}; allowed "
                                  f"{1 / NUMBER_RANGE:g} to {NUMBER_RANGE:g} (its square must "
                                  "stay a finite number)")


def check_size(case: Case) -> None:
    """Refuse a study whose finest mesh would exceed `mesh.max_dofs` (before any meshing),
    or whose element size exceeds the member's thinnest depth (`check_element_size`)."""
    check_element_size(case)
    levels = case.mesh.levels
    size = case.mesh.size / 2.0 ** (levels - 1)
    estimate = estimate_dofs(case, size)
    if estimate > case.mesh.max_dofs:
        which = f"the finest mesh (level {levels}, size {size:g})" if levels > 1 else \
            f"the mesh (size {size:g})"
        raise CaseError(case.file, "mesh.max_dofs",
                        f"{which} would have about {estimate:,} dofs, above the limit "
                        f"{case.mesh.max_dofs:,}; raise mesh.size, lower mesh.levels or "
                        "raise mesh.max_dofs")
