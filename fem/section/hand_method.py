"""The hand method an engineer would use for the section in hand, and its peak.

``auto`` (the default of a section case) picks by the kind of section:

* **thin-wall** — open thin walls (i, channel, tee, angle) by the shear flow along the
  centre line (:func:`classical.thinwall.wall_stress_peak`); closed thin walls (tube,
  box) with the closed-cell correction (:func:`classical.thinwall.closed_cell_stress_peak`).
  The shear flow follows the wall, so it is right where cuts parallel to an axis are not
  across the wall (the legs of an angle, whose principal axes are turned 45 degrees) and it
  handles coupled bending (I_xy != 0) directly.
* **shear-formula** — solid sections (rectangle, circle, thick named shapes, drawn
  polygons): tau = VQ/(Ib) on the worst cut (:mod:`fem.section.level`).

"Thin" is decided by :data:`THIN_WALL_RATIO`.  ``check.method`` forces a method;
``thin-wall`` then needs a shape with a centre-line model (:data:`CENTRELINE_SHAPES`).
"""

from __future__ import annotations

from dataclasses import dataclass

from classical.thinwall import (
    WallSegment,
    WallStressPeak,
    angle_centreline,
    box_centreline,
    channel_centreline,
    closed_cell_stress_peak,
    i_centreline,
    tee_centreline,
    tube_centreline,
    wall_stress_peak,
)
from fem.case.model import THIN_WALL_SHAPES

__all__ = ["HandChoice", "THIN_WALL_RATIO", "CENTRELINE_SHAPES", "centreline", "choose_method",
           "thin_wall_ratio", "thin_wall_peak"]

# Thin-wall theory drops terms of order t/b (the walls' own t^3 inertia, the overlap of the
# walls at junctions and corners, the variation of tau through the wall). A wall at most a
# tenth of the smaller outside dimension is the common rule for "thin" (common practice);
# measured here, the thin-wall peak is within 1 % of the FE peak of an equal angle at
# t/b = 0.025 and 0.1 % of VQ/(It) on the exact outline for an I at t/b = 0.071.
THIN_WALL_RATIO = 0.1

#: shapes with a centre-line model in classical.thinwall (open walls, closed cells)
CLOSED_SHAPES = ("tube", "box")
CENTRELINE_SHAPES = THIN_WALL_SHAPES
OPEN_SHAPES = tuple(s for s in CENTRELINE_SHAPES if s not in CLOSED_SHAPES)


@dataclass(frozen=True)
class HandChoice:
    """The method used for the hand value and why, in plain words."""

    method: str
    reason: str


def thin_wall_ratio(shape: str, params: dict) -> float | None:
    """Largest wall thickness over the smaller outside dimension, or None for shapes
    without walls (rectangle, circle, polygon)."""
    p = params
    if shape in ("i", "channel", "tee"):
        t = max(p["flange_thickness"], p["web_thickness"])
        return t / min(p["depth"], p["flange_width"])
    if shape == "angle":
        return p["thickness"] / min(p["leg_x"], p["leg_y"])
    if shape == "box":
        return p["wall"] / min(p["width"], p["depth"])
    if shape == "tube":
        return p["wall"] / p["diameter"]
    return None


def choose_method(shape: str, params: dict, method: str = "auto") -> HandChoice:
    """The hand method for ``method`` (``auto`` picks; anything else is kept, with reason).

    Raises
    ------
    ValueError
        ``thin-wall`` forced on a shape without a centre-line model.
    """
    ratio = thin_wall_ratio(shape, params)
    if method == "thin-wall":
        if shape not in CENTRELINE_SHAPES:
            raise ValueError(f"method 'thin-wall' needs a shape with a centre line "
                             f"({', '.join(CENTRELINE_SHAPES)}), not {shape!r}")
        return HandChoice("thin-wall", f"thin-walled shear flow, as check.method asks "
                                       f"(wall/size {ratio:.3g})")
    if method != "auto":
        return HandChoice(method, f"{method}, as check.method asks")
    if ratio is not None and ratio <= THIN_WALL_RATIO:
        closed = shape in CLOSED_SHAPES
        return HandChoice("thin-wall", (
            f"a thin-walled {'closed' if closed else 'open'} section (wall/size {ratio:.3g} "
            f"<= {THIN_WALL_RATIO:g}): the shear flow along the centre line"
            + (" with the closed-cell correction" if closed else "")
            + " follows the wall, where cuts parallel to an axis need not be across it"
            + ("" if closed or shape == "angle" else "; root radii are not in the model")))
    why = ("a drawn polygon (no centre-line model)" if shape == "polygon" else
           "a built-up section of plates (no centre-line model)" if shape == "built-up" else
           f"a solid {shape}" if ratio is None else
           f"walls too thick for thin-wall theory (wall/size {ratio:.3g} > {THIN_WALL_RATIO:g})")
    return HandChoice("shear-formula", f"{why}: tau = VQ/(Ib) on the worst cut")


def centreline(shape: str, params: dict) -> tuple[WallSegment, ...]:
    """The wall centre lines of a thin-walled shape in the mesh's frame (open shapes and
    box; a tube has no straight walls)."""
    if shape == "box":
        pts = box_centreline(params["width"], params["depth"], params["wall"])
        return tuple(WallSegment(pts[k], pts[(k + 1) % 4], params["wall"]) for k in range(4))
    if shape not in OPEN_SHAPES:
        raise ValueError(f"no straight centre-line model for shape {shape!r}")
    return _open_segments(shape, params)


def _open_segments(shape: str, p: dict) -> tuple[WallSegment, ...]:
    """Centre lines in the frames of classical.shapes (fem.section.mesh uses the same)."""
    if shape == "i":
        return i_centreline(p["depth"] - p["flange_thickness"], p["flange_width"],
                            p["flange_thickness"], p["web_thickness"])
    if shape == "channel":
        tw = p["web_thickness"]
        segs = channel_centreline(p["depth"] - p["flange_thickness"], p["flange_width"] - tw / 2,
                                  p["flange_thickness"], tw)
        return _shifted(segs, tw / 2, 0.0)
    if shape == "tee":
        h = p["depth"] - p["flange_thickness"] / 2
        segs = tee_centreline(h, p["flange_width"], p["flange_thickness"], p["web_thickness"])
        return _shifted(segs, 0.0, h)
    t = p["thickness"]
    segs = angle_centreline(p["leg_x"] - t / 2, p["leg_y"] - t / 2, t)
    return _shifted(segs, t / 2, t / 2)


def _shifted(segs: tuple[WallSegment, ...], dx: float, dy: float) -> tuple[WallSegment, ...]:
    return tuple(WallSegment((s.start[0] + dx, s.start[1] + dy), (s.end[0] + dx, s.end[1] + dy),
                             s.t) for s in segs)


def thin_wall_peak(shape: str, params: dict, Vx: float, Vy: float) -> WallStressPeak:
    """The thin-walled hand value: peak |q|/t for shear (Vx, Vy) through the shear centre."""
    p = params
    if shape == "box":
        return closed_cell_stress_peak(box_centreline(p["width"], p["depth"], p["wall"]),
                                       p["wall"], Vy, Vx)
    if shape == "tube":
        return closed_cell_stress_peak(tube_centreline(p["diameter"], p["wall"]), p["wall"],
                                       Vy, Vx)
    if shape not in OPEN_SHAPES:
        raise ValueError(f"no centre-line model for shape {shape!r}")
    return wall_stress_peak(_open_segments(shape, p), Vy, Vx)
