"""Checks of a section-kind case that need more than one key: do the dimensions make a shape?

`fem.case.parse` reads each parameter (a number > 0, root_radius >= 0, rings of points);
`validate_section` then refuses combinations that leave no shape or a degenerate one, naming
the key to change and what is allowed: a tube wall at least its radius, a box wall at least
half its width or depth, flanges that meet across the depth, a web or root fillets wider than
the flange, an angle as thick as a leg, a polygon that crosses itself, holes that are not
wholly inside the outline or that touch each other. Nothing here meshes.
"""

from __future__ import annotations

from typing import Any

from shapely.geometry import Polygon

from fem.case.arcs import check_ring, ring_polygon
from fem.case.model import THIN_WALL_SHAPES, Case, SectionGeometry
from fem.case.plates import build_up, validate_built_up, validate_joints
from fem.errors import CaseError

__all__ = ["validate_section", "section_extent", "MIN_RADIUS", "MAX_SIZE"]

MIN_RADIUS = 1e-4  # root radii (unless 0), walls, gaps: at least this x the section's extent
MAX_SIZE = 0.25    # mesh.size at most this x the section's extent


def _fits(p: dict[str, Any], key: str, ok_without_root: bool, ok: bool, base: str,
          with_root: str, file: str) -> None:
    """Raise for `key` (or root_radius, if only the root fillet breaks it) unless `ok`."""
    if ok:
        return
    r = p.get("root_radius", 0.0)
    if ok_without_root and r > 0:
        raise CaseError(file, "geometry.root_radius", f"{r:g} does not fit: {with_root}")
    raise CaseError(file, f"geometry.{key}", base)


def _flanged(shape: str, p: dict[str, Any], file: str) -> None:
    h, b = p["depth"], p["flange_width"]
    tf, tw, r = p["flange_thickness"], p["web_thickness"], p.get("root_radius", 0.0)
    smallest = MIN_RADIUS * max(h, b)
    if 0 < r < smallest:
        raise CaseError(file, "geometry.root_radius", f"{r:g} is too small to model; give 0 "
                                                      f"for a sharp corner or at least "
                                                      f"{smallest:.3g}")
    if shape == "tee":
        _fits(p, "flange_thickness", tf < h, tf + r < h,
              f"{tf:g} must be smaller than the depth ({h:g}) to leave a web",
              f"flange_thickness + root_radius must be < depth ({h:g})", file)
    else:
        _fits(p, "flange_thickness", 2 * tf < h, 2 * (tf + r) < h,
              f"{tf:g} must be smaller than half the depth ({h / 2:g}): two flanges must "
              "leave a web between them",
              f"2 x (flange_thickness + root_radius) must be < depth ({h:g})", file)
    fillets = 1 if shape == "channel" else 2
    _fits(p, "web_thickness", tw < b, tw + fillets * r < b,
          f"{tw:g} must be smaller than the flange_width ({b:g})",
          f"web_thickness + {'' if fillets == 1 else '2 x '}root_radius must be < "
          f"flange_width ({b:g})", file)


def _ring(points: list[tuple[float, ...]], key: str, file: str) -> Polygon:
    for i in range(1, len(points)):
        if points[i][:2] == points[i - 1][:2]:
            raise CaseError(file, f"{key}.{i}", f"{list(points[i])} repeats the point before "
                                                "it; give each corner once")
    if any(len(p) > 2 for p in points):  # arc edges (fem.case.arcs)
        ring = ring_polygon(points)
        x0, y0, x1, y1 = ring.bounds if not ring.is_empty else (0.0, 0.0, 0.0, 0.0)
        extent = max(x1 - x0, y1 - y0)
        return check_ring(points, file, key, extent, MIN_RADIUS * extent)
    ring = Polygon(points)
    if not ring.is_valid or ring.area <= 0:
        raise CaseError(file, key, "the outline crosses itself or has no area; give the "
                                   "corners in order round the boundary")
    x0, y0, x1, y1 = ring.bounds
    small = MIN_RADIUS * max(x1 - x0, y1 - y0)
    if ring.minimum_clearance < small:
        raise CaseError(file, key, f"corners or edges come within {ring.minimum_clearance:.3g} "
                                   f"of each other; keep them at least {small:.3g} apart")
    return ring


def _polygon(p: dict[str, Any], file: str) -> None:
    outer = _ring(p["points"], "geometry.points", file)
    size = max(outer.bounds[2] - outer.bounds[0], outer.bounds[3] - outer.bounds[1])
    inner = outer.buffer(-1e-6 * size)
    holes: list[Polygon] = []
    for j, pts in enumerate(p.get("holes", [])):
        key = f"geometry.holes.{j}"
        h = _ring(pts, key, file)
        if not inner.contains(h):
            raise CaseError(file, key, "the hole must lie wholly inside the outline, clear of "
                                       "its edge")
        for k, other in enumerate(holes):
            if h.distance(other) <= 1e-6 * size:
                raise CaseError(file, key, f"touches or overlaps hole {k}; holes must be "
                                           "apart")
        holes.append(h)


def validate_section(case: Case) -> None:
    """Refuse section dimensions that make no shape; raise `CaseError` naming the key."""
    g = case.section
    p, f = g.params, case.file
    if g.shape not in ("polygon", "built-up"):
        extent = section_extent(g)
        for k, v in p.items():
            if k != "root_radius" and v < MIN_RADIUS * extent:
                raise CaseError(f, f"geometry.{k}", f"{v:g} is too small beside the section's "
                                                    f"{extent:g}; at least "
                                                    f"{MIN_RADIUS * extent:.3g}")
    if g.shape == "tube" and not p["wall"] < p["diameter"] / 2:
        raise CaseError(f, "geometry.wall", f"{p['wall']:g} must be smaller than the radius "
                                            f"({p['diameter'] / 2:g}); the tube needs a bore")
    if g.shape == "box":
        for side in ("width", "depth"):
            if not p["wall"] < p[side] / 2:
                raise CaseError(f, "geometry.wall", f"{p['wall']:g} must be smaller than half "
                                                    f"the {side} ({p[side] / 2:g})")
    if g.shape in ("i", "channel", "tee"):
        _flanged(g.shape, p, f)
    if g.shape == "angle":
        t, leg = p["thickness"], min(p["leg_x"], p["leg_y"])
        if not t < leg:
            raise CaseError(f, "geometry.thickness", f"{t:g} must be smaller than the shorter "
                                                     f"leg ({leg:g})")
    if g.shape == "polygon":
        _polygon(p, f)
    if g.shape == "built-up":
        validate_built_up(case)
    validate_joints(case)
    if case.check.method == "thin-wall" and g.shape not in THIN_WALL_SHAPES:
        raise CaseError(f, "check.method", f"'thin-wall' needs a shape with a centre line "
                                           f"({', '.join(THIN_WALL_SHAPES)}), not {g.shape!r}")
    extent = section_extent(g)
    if case.mesh.size > MAX_SIZE * extent:
        raise CaseError(f, "mesh.size", f"{case.mesh.size:g} is larger than the section "
                                        f"allows: at most {MAX_SIZE * extent:g}, a quarter of "
                                        f"its {extent:g} across (a fraction of the thinnest "
                                        "wall is better)")


def section_extent(g: SectionGeometry) -> float:
    """The larger side of the section's bounding box (a validated section)."""
    p = g.params
    if g.shape in ("circle", "tube"):
        return float(p["diameter"])
    if g.shape in ("rectangle", "box"):
        return float(max(p["width"], p["depth"]))
    if g.shape in ("i", "channel", "tee"):
        return float(max(p["depth"], p["flange_width"]))
    if g.shape == "angle":
        return float(max(p["leg_x"], p["leg_y"]))
    if g.shape == "built-up":
        x0, y0, x1, y1 = build_up(p["plates"]).polygon.bounds
    else:
        x0, y0, x1, y1 = ring_polygon(p["points"]).bounds
    return float(max(x1 - x0, y1 - y0))
