"""The model before solving (`shearcheck show`): one figure and a one-screen summary.

`preview(case, folder)` meshes the first level (as the check would), draws `model.png` and
returns a :class:`Preview` whose `summary()` fits one terminal screen. Nothing is solved:
the figure shows what the case describes, so a wrong support, a load pointing the wrong way
or a mesh far too coarse is seen before a long run.

Members: the material (grey), zones of another thickness (tinted, labelled), holes,
openings and cut-outs (white), the first-level mesh (thin lines), supports (green bars,
triangles for points) with their fixity, loads (purple patches and an arrow with the
resultant's magnitude and unit), cuts (dashed, labelled with x), refinement circles and the
sharp re-entrant corners (x). Sections: the outline, holes, mesh, sharp corners and the
shear resultant drawn at the centroid (it acts through the shear centre, which only the
solve finds). The title gives the mesh: elements, dofs, and the size guard's estimate.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
import shapely  # noqa: E402
from matplotlib.collections import LineCollection  # noqa: E402
from matplotlib.patches import Circle, PathPatch  # noqa: E402
from matplotlib.path import Path as MplPath  # noqa: E402
from shapely.geometry import LineString, Point, Polygon, box  # noqa: E402

from classical.sections import polygon_properties  # noqa: E402
from fem.case.arcs import ring_polygon  # noqa: E402
from fem.case.model import Case  # noqa: E402
from fem.case.outline import curved_edges, domain_polygon, reentrant_corners  # noqa: E402
from fem.case.sizing import estimate_dofs, level_size  # noqa: E402
from fem.report.png import save_png  # noqa: E402

__all__ = ["Preview", "preview", "run_figure", "FIGURE_NAME"]

FIGURE_NAME = "model.png"
INK = "#222222"
MATERIAL = "#e4e4e4"
ZONE = "#c7dcef"
MESH = "#8c8c8c"
SUPPORT = "#1b7837"
LOAD = "#762a83"
CUT = "#2166ac"
REFINE = "#b35806"
DPI = 110


@dataclass
class Preview:
    """What `shearcheck show` found: the figure, the mesh counts and the summary lines."""

    figure: Path
    elements: int
    nodes: int
    dofs: int
    estimate: int
    finest_estimate: int
    lines: list[str] = field(default_factory=list)
    seconds: dict[str, float] = field(default_factory=dict)

    def summary(self) -> str:
        return "\n".join(self.lines)


def _n(v: float, digits: int = 4) -> str:
    """`v` to `digits` significant figures, without an exponent between 1e-3 and 1e7."""
    if v == 0 or not math.isfinite(v):
        return f"{v:g}"
    mag = math.floor(math.log10(abs(v)))
    if -3 <= mag < 7:
        text = f"{round(v, digits - 1 - mag):.{max(0, digits - 1 - mag)}f}"
        return text.rstrip("0").rstrip(".") if "." in text else text
    return f"{v:.{digits - 1}e}"


def _pt(p) -> str:
    return f"({_n(p[0])}, {_n(p[1])})"


def _rings_path(poly: Polygon) -> MplPath:
    verts, codes = [], []
    for ring in [poly.exterior, *poly.interiors]:
        c = np.asarray(ring.coords)
        verts.append(c)
        codes += [MplPath.MOVETO] + [MplPath.LINETO] * (len(c) - 2) + [MplPath.CLOSEPOLY]
    return MplPath(np.vstack(verts), codes)


def _fill(ax, poly, colour: str, z: float) -> None:
    for part in getattr(poly, "geoms", [poly]):
        if part.geom_type == "Polygon" and not part.is_empty:
            ax.add_patch(PathPatch(_rings_path(part), facecolor=colour, edgecolor="none",
                                   zorder=z))


def _edges(ax, p: np.ndarray, facets: np.ndarray) -> None:
    seg = np.stack([p[:, facets[0]].T, p[:, facets[1]].T], axis=1)
    ax.add_collection(LineCollection(seg, colors=MESH, linewidths=0.25, zorder=2),
                      autolim=False)


def _outline(ax, poly: Polygon) -> None:
    for ring in [poly.exterior, *poly.interiors]:
        x, y = ring.xy
        ax.plot(x, y, color=INK, lw=0.9, zorder=4)


def _figure(bounds: tuple[float, float, float, float]):
    x0, y0, x1, y1 = bounds
    w, h = max(x1 - x0, 1e-300), max(y1 - y0, 1e-300)
    fw = 9.0 if w > 1.3 * h else 6.5   # an upright model prints at half width in the note
    fh = min(max(fw * h / w + 1.2, 3.2), 8.0)
    fig, ax = plt.subplots(figsize=(fw, fh), dpi=DPI)
    ax.set_aspect("equal")
    pad = 0.2 * max(w, h)   # room for load arrows (0.145 x the size) and their labels
    ax.set_xlim(x0 - pad, x1 + pad)
    ax.set_ylim(y0 - pad, y1 + pad)
    ax.tick_params(labelsize=7)
    return fig, ax, max(w, h)


def _mesh_line(kind: str, size: float, order: int, elements: int, dofs: int, estimate: int,
               unit: str) -> str:
    return (f"first-level mesh: size {_n(size)} {unit}, order {order}, {elements:,} elements, "
            f"{dofs:,} dofs (size-guard estimate {estimate:,})")


def preview(case: Case, folder: Path, mesh: Any = None) -> Preview:
    """Mesh the first level of `case`, draw `folder/model.png`, and summarise; no solve.

    `mesh`: the first level's mesh when a check has already made it (a `MemberMesh` or a
    `SectionMesh`), so the report's model figure shows the very mesh that was solved."""
    folder.mkdir(parents=True, exist_ok=True)
    if case.kind == "beam":
        return _member(case, folder, mesh)
    return _section(case, folder, mesh)


def run_figure(res: Any, folder: Path) -> Path:
    """model.png of a finished check (`fem.api.CheckResult`), on its first level's mesh."""
    run = getattr(res, "run", None)
    levels = getattr(run, "levels", None) or []
    mesh = None
    if levels:
        first = levels[0]
        mesh = first.mm if res.case.kind == "beam" else first.solution.mesh
    return preview(res.case, Path(folder), mesh).figure


def _counts_member(mm, order: int) -> tuple[int, int, int]:
    f = mm.finder_mesh
    nv, nf = f.p.shape[1], f.facets.shape[1]
    nodes = nv + nf if order == 2 else nv
    return int(f.t.shape[1]), int(nodes), 2 * int(nodes)


def _member(case: Case, folder: Path, mm: Any = None) -> Preview:
    from fem.member.level import cut_positions
    from fem.member.mesh import mesh_member

    t0 = time.perf_counter()
    g, u = case.beam, case.units
    state = "not solved" if mm is None else "as solved"
    mm = mesh_member(case) if mm is None else mm
    t1 = time.perf_counter()
    elements, nodes, dofs = _counts_member(mm, case.mesh.order)
    levels = case.mesh.levels
    fin = estimate_dofs(case, level_size(case, levels - 1))
    dom = domain_polygon(g)
    cuts = cut_positions(case, mm.supports, mm.loads)
    corners = reentrant_corners(dom)
    fig, ax, span = _figure(dom.bounds)
    _fill(ax, dom, MATERIAL, 1)
    for k, z in enumerate(g.zones):
        part = dom.intersection(box(z.corner[0], z.corner[1], z.corner[0] + z.size[0],
                                    z.corner[1] + z.size[1]))
        _fill(ax, part, ZONE, 1.5)
        if not part.is_empty:
            c = part.representative_point()
            ax.text(c.x, c.y, f"zone-{k}\nt = {_n(z.thickness)} {u.length}", fontsize=7,
                    ha="center", va="center", color=INK, zorder=8)
    _edges(ax, mm.finder_mesh.p, mm.finder_mesh.facets)
    _outline(ax, dom)
    for k, h in enumerate(g.holes):
        ax.text(h.center[0], h.center[1], f"hole-{k}", fontsize=7, ha="center", va="center",
                zorder=8)
    for k, c in enumerate(g.cutouts):
        ax.text(c.corner[0] + c.size[0] / 2, c.corner[1] + c.size[1] / 2, f"cut-out {k}",
                fontsize=7, ha="center", va="center", zorder=8, clip_on=True)
    for k, o in enumerate(g.openings):
        c = ring_polygon(o).representative_point()
        ax.text(c.x, c.y, f"opening {k}", fontsize=7, ha="center", va="center", zorder=8)
    x0, y0, x1, y1 = dom.bounds
    for x in cuts:   # over the material only: a cut never bridges a hole or a gap
        for piece in shapely.get_parts(dom.intersection(LineString([(x, y0 - 1), (x, y1 + 1)]))):
            if piece.geom_type == "LineString" and piece.length > 0:
                ys = [q[1] for q in piece.coords]
                ax.plot([x, x], [min(ys), max(ys)], color=CUT, lw=0.9, ls=(0, (4, 3)),
                        zorder=5)
        ax.text(x, y0 - 0.02 * span, f"x = {_n(x)}", color=CUT, fontsize=7, ha="center",
                va="top", rotation=90, zorder=8)
    for r in case.mesh.refine:
        ax.add_patch(Circle(r.at, r.radius, fill=False, ec=REFINE, lw=1.0, ls="--", zorder=6))
        ax.text(r.at[0], r.at[1] + r.radius, f"refine {_n(r.size)}", color=REFINE,
                fontsize=7, ha="center", va="bottom", zorder=8)
    for c in corners:
        ax.plot(*c.at, marker="x", color=INK, ms=7, mew=1.5, zorder=9)
    _member_patches(ax, case, mm, span, dom)
    size = mm.size
    est = estimate_dofs(case, size)
    title = _mesh_line("beam", size, case.mesh.order, elements, dofs, est, u.length)
    ax.set_title(f"{case.name}: the model, {state}\n{title}", fontsize=9)
    ax.set_xlabel(f"x [{u.length}]", fontsize=8)
    ax.set_ylabel(f"y [{u.length}]", fontsize=8)
    path = folder / FIGURE_NAME
    save_png(fig, path, tight=False, dpi=DPI)
    t2 = time.perf_counter()
    lines = [f"{case.name} (beam): {case.title}",
             f"  geometry: {_geometry_words(case)}; {_n(x1 - x0)} x {_n(y1 - y0)} {u.length}, "
             f"thickness {_n(case.material.thickness)} {u.length}, {case.material.model}"]
    for s, p in zip(case.supports, mm.supports, strict=True):
        lines.append(f"  {p.name}: fixes {s.fix} {_where(p)}")
    for ld, p in zip(case.loads, mm.loads, strict=True):
        fx, fy = (u.user_force(v) for v in ld.force)   # as given in the case file
        F = math.hypot(fx, fy)
        lines.append(f"  {p.name}: [{_n(fx)}, {_n(fy)}] {u.force} "
                     f"(|F| = {_n(F)} {u.force}, {ld.distribution}) {_where(p)}")
    lines.append(f"  cuts at x = {', '.join(_n(x) for x in cuts)} {u.length}"
                 + ("" if case.check.cuts else " (automatic)"))
    if case.mesh.refine:
        lines.append("  refinements: " + "; ".join(
            f"{_n(r.size)} within {_n(r.radius)} of {_pt(r.at)}" for r in case.mesh.refine))
    if corners:
        lines.append("  sharp re-entrant corners (singular): "
                     + ", ".join(f"{_pt(c.at)} {c.angle:.0f} deg" for c in corners[:6])
                     + (" ..." if len(corners) > 6 else ""))
    lines.append("  " + _mesh_line("beam", size, case.mesh.order, elements, dofs, est,
                                   u.length))
    lines.append(f"  the study: {levels} level(s), finest size "
                 f"{_n(level_size(case, levels - 1))} {u.length}, estimate {fin:,} dofs "
                 f"(limit mesh.max_dofs = {case.mesh.max_dofs:,})")
    lines.append(f"  check: {case.check.method}, tolerance {case.check.tolerance:g}")
    return Preview(path, elements, nodes, dofs, est, fin, lines,
                   {"mesh": t1 - t0, "figure": t2 - t1})


def _where(p) -> str:
    if p.hole is not None:
        return f"as a pin bearing on hole-{p.hole}"
    if p.point is not None:
        return f"at the point {_pt(p.point)}"
    return "on " + ", ".join(f"{_pt(a)} to {_pt(b)}" for a, b in p.segments)


def _geometry_words(case: Case) -> str:
    g = case.beam
    shape = g.shape if not g.drawing else f"drawing {g.drawing}"
    bits = [shape if g.shape == "rectangle" else f"{shape} of {len(g.points)} vertices"]
    arcs = len(curved_edges(g))
    for n, word in ((arcs, "arc"), (len(g.holes), "hole"), (len(g.openings), "opening"),
                    (len(g.cutouts), "cut-out"), (len(g.zones), "zone")):
        if n:
            bits.append(f"{n} {word}{'s' if n > 1 else ''}")
    return ", ".join(bits)


def _outside(p, dom: Polygon, span: float) -> tuple[float, float]:
    """The point a little outside the boundary next to a patch: where its arrow ends."""
    if p.hole is not None or not p.segments:
        return p.point if p.point is not None else p.centroid
    (ax_, ay), (bx, by) = p.segments[0]
    n = np.array([by - ay, ax_ - bx]) / max(math.hypot(bx - ax_, by - ay), 1e-300)
    c = np.asarray(p.centroid)
    probe = c + n * 1e-3 * span
    if dom.contains(Point(*probe)):
        n = -n
    q = c + n * 0.025 * span
    return (float(q[0]), float(q[1]))


def _away(at: tuple[float, float], base: Any, span: float) -> tuple[str, str]:
    """The alignment of a label at `at` that keeps it clear of the boundary at `base`."""
    dx, dy = at[0] - base[0], at[1] - base[1]
    tiny = 1e-6 * span
    return ("right" if dx < -tiny else "left" if dx > tiny else "center",
            "top" if dy < -tiny else "bottom" if dy > tiny else "center")


def _member_patches(ax, case: Case, mm, span: float, dom: Polygon) -> None:
    g = case.beam
    for s, p in zip(case.supports, mm.supports, strict=True):
        if p.point is not None:
            ax.plot(*p.point, marker="^", color=SUPPORT, ms=9, zorder=7, clip_on=False)
        for a, b in p.segments:
            ax.plot([a[0], b[0]], [a[1], b[1]], color=SUPPORT, lw=5, alpha=0.85,
                    solid_capstyle="butt", zorder=6, clip_on=False)
        c = _outside(p, dom, 1.5 * span)
        ha, va = _away(c, p.centroid, span) if p.point is None else ("center", "center")
        if p.point is None and va == "center":   # beside an upright edge: up along it
            ha, va, turn = "center", "bottom" if ha == "right" else "top", 90
        else:
            turn = 0
        ax.text(c[0], c[1], f"{p.name} (fixes {s.fix})", color=SUPPORT, fontsize=7, zorder=8,
                ha=ha, va=va, rotation=turn, rotation_mode="anchor")
    for ld, p in zip(case.loads, mm.loads, strict=True):
        F = np.asarray(ld.force, float)
        head = g.holes[p.hole].center if p.hole is not None else _outside(p, dom, span)
        d = F / max(float(np.hypot(*F)), 1e-300) * 0.12 * span
        tail = (head[0] - d[0], head[1] - d[1])
        if p.hole is not None:
            h = g.holes[p.hole]
            phi = math.atan2(F[1], F[0]) + np.linspace(-0.5 * math.pi, 0.5 * math.pi, 60)
            ax.plot(h.center[0] + h.radius * np.cos(phi), h.center[1] + h.radius * np.sin(phi),
                    color=LOAD, lw=4, alpha=0.85, zorder=6)
        for a, b in p.segments:
            ax.plot([a[0], b[0]], [a[1], b[1]], color=LOAD, lw=5, alpha=0.85,
                    solid_capstyle="butt", zorder=6, clip_on=False)
        if p.point is not None:
            ax.plot(*p.point, marker="o", color=LOAD, ms=5, zorder=7)
        ax.annotate("", xy=head, xytext=tail, zorder=9, annotation_clip=False,
                    arrowprops={"arrowstyle": "-|>", "color": LOAD, "lw": 2.0})
        F_given = case.units.user_force(float(np.hypot(*F)))
        ax.text(tail[0], tail[1], f" {p.name}: {_n(F_given)} {case.units.force}",
                color=LOAD, fontsize=8, ha="left", zorder=9,
                va="bottom" if head[1] <= tail[1] else "top")


def _section(case: Case, folder: Path, sm: Any = None) -> Preview:
    from fem.section.mesh import mesh_section, section_shape

    t0 = time.perf_counter()
    g, u = case.section, case.units
    state = "not solved" if sm is None else "as solved"
    if sm is None:
        sm = mesh_section(section_shape(g.shape, **g.params), case.mesh.size, case.mesh.order)
    geom = sm.geometry
    t1 = time.perf_counter()
    f = sm.finder
    elements, nodes = sm.elements, sm.nodes
    dofs = nodes   # one warping unknown per node
    levels = case.mesh.levels
    fin = estimate_dofs(case, level_size(case, levels - 1))
    o = geom.outline
    poly = Polygon(o.outer, list(o.holes))
    fig, ax, span = _figure(poly.bounds)
    _fill(ax, poly, MATERIAL, 1)
    _edges(ax, f.p, f.facets)
    _outline(ax, poly)
    corners = geom.sharp_reentrant_corners()
    for c in corners:
        ax.plot(*c, marker="x", color=INK, ms=7, mew=1.5, zorder=9)
    hp = polygon_properties(o)
    V = np.asarray(case.shear, float)
    Vm = float(np.hypot(*V))
    d = V / max(Vm, 1e-300) * 0.25 * span
    head = (hp.cx + d[0] / 2, hp.cy + d[1] / 2)
    tail = (hp.cx - d[0] / 2, hp.cy - d[1] / 2)
    ax.annotate("", xy=head, xytext=tail, zorder=9,
                arrowprops={"arrowstyle": "-|>", "color": LOAD, "lw": 2.0})
    ax.text(tail[0], tail[1], f" V = {_n(u.user_force(Vm))} {u.force}\n (through the shear "
            "centre)",
            color=LOAD, fontsize=8, ha="left", va="top", zorder=9)
    ax.plot(hp.cx, hp.cy, marker="+", color=INK, ms=9, zorder=9)
    est = estimate_dofs(case, sm.size)
    title = _mesh_line("section", sm.size, case.mesh.order, elements, dofs, est, u.length)
    ax.set_title(f"{case.name}: the section, {state}\n{title}", fontsize=9)
    ax.set_xlabel(f"x [{u.length}]", fontsize=8)
    ax.set_ylabel(f"y [{u.length}]", fontsize=8)
    path = folder / FIGURE_NAME
    save_png(fig, path, tight=False, dpi=DPI)
    t2 = time.perf_counter()
    x0, y0, x1, y1 = poly.bounds
    arcs = sum(int(np.count_nonzero(r.bulges)) for r in geom.rings if r.bulges is not None)
    circles = sum(r.circle is not None for r in geom.rings)
    lines = [f"{case.name} (section): {case.title}",
             f"  geometry: {g.shape}; {_n(x1 - x0)} x {_n(y1 - y0)} {u.length}; "
             f"{len(geom.holes)} hole(s)"
             + (f", {arcs} arc edge(s)" if arcs else "")
             + (f", {circles} circle(s)" if circles else ""),
             f"  hand properties: A = {_n(hp.A)} {u.length}2, centroid {_pt((hp.cx, hp.cy))}, "
             f"Ixx = {_n(hp.Ixx)}, Iyy = {_n(hp.Iyy)} {u.length}4",
             f"  shear: [{_n(u.user_force(V[0]))}, {_n(u.user_force(V[1]))}] {u.force} "
             "through the shear centre",
             f"  sharp re-entrant corners: {len(corners)}",
             "  " + _mesh_line("section", sm.size, case.mesh.order, elements, dofs, est,
                               u.length),
             f"  the study: {levels} level(s), finest size "
             f"{_n(level_size(case, levels - 1))} {u.length}, estimate {fin:,} dofs "
             f"(limit mesh.max_dofs = {case.mesh.max_dofs:,})",
             f"  check: {case.check.method}, tolerance {case.check.tolerance:g}"]
    return Preview(path, elements, nodes, dofs, est, fin, lines,
                   {"mesh": t1 - t0, "figure": t2 - t1})
