"""Deflection of a member: the FE displacements beside the beam-theory value where one applies.

Informative only (it never enters the verdict). `beam_deflection(case, level)` gives the
``deflection`` object of results.json:

* ``max_fe``, ``at``: the largest displacement magnitude over the finest mesh and where;
* ``loads``: per load, the FE displacement ``fe`` = [ux, uy] at the load (the mean over
  the loaded stretch weighted by length, the node of a point load, the loaded hole's edge
  for a pin) and, where beam theory applies, the hand value ``hand`` of the displacement
  along the load's line of action (Timoshenko beam theory: bending plus shear with
  Cowper's coefficient, `classical.deflection`), with ``ratio`` = FE / hand;
* ``hand``: the hand value at the load with the largest one, ``fe_at_hand`` the FE value
  there (the same component), and ``method`` saying which beam model gave it, or why none.

Beam theory applies to a prismatic member: a rectangle without holes, cut-outs or zones,
loaded by transverse forces only, each at the free end or over a short patch (at most
`SHORT_PATCH` of the span, taken as a point load at its centre, common practice), either
clamped on one end edge (a cantilever) or on two supports (points or patches on the top or
bottom edge) one restraining xy and the other y only (a simple beam). Anything else gets the
FE values and ``hand`` = null with the reason.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from classical.coefficients import cowper_rectangle
from classical.deflection import cantilever_point_deflection, simply_supported_point_deflection
from fem.case.model import Case, Load, Placement
from fem.member.level import Level

__all__ = ["beam_deflection", "beam_model", "SHORT_PATCH"]

SHORT_PATCH = 0.1   # a patch up to this fraction of the span counts as a point load


def _fe_at_loads(level: Level) -> list[np.ndarray]:
    """FE displacement [ux, uy] at each load, in the order of the case's loads."""
    u, p = level.field.displacement, level.field.p
    facets = level.mm.mesh.facets
    out = []
    for patch in level.mm.loads:
        if patch.name in level.mm.points:
            out.append(u[:, level.mm.points[patch.name]].copy())
            continue
        f = level.mm.boundaries.get(patch.name, np.zeros(0, np.int64))
        if len(f) == 0:
            out.append(np.full(2, np.nan))
            continue
        a, b = facets[0, f], facets[1, f]
        ln = np.hypot(*(p[:, a] - p[:, b]))
        out.append((0.5 * (u[:, a] + u[:, b]) * ln).sum(axis=1) / ln.sum())
    return out


def _end_x(case: Case, where: Placement) -> float | None:
    g = case.beam
    return {"left": 0.0, "right": g.length}.get(where.edge or "")


def _on_long_edge(case: Case, where: Placement) -> bool:
    g = case.beam
    if where.at is None:
        return False
    return math.isclose(where.at[1], 0.0, abs_tol=1e-9 * g.depth) or math.isclose(
        where.at[1], g.depth, rel_tol=1e-9)


def _load_x(case: Case, ld: Load, span: float) -> float | None:
    """x of a transverse point-like load, or None when beam theory has no point load here."""
    w = ld.where
    if ld.force[0] != 0.0:
        return None
    if w.edge in ("left", "right"):
        return _end_x(case, w)
    if w.at is not None and _on_long_edge(case, w) and w.width <= SHORT_PATCH * span:
        return w.at[0]
    return None


def beam_model(case: Case) -> tuple[str, dict[str, float]] | str:
    """("cantilever" | "simple", {"root" or "a", "b"}) of a prismatic beam, or the reason
    (a sentence) why the case is no such beam."""
    g = case.beam
    if g.shape != "rectangle" or g.holes or g.cutouts or g.zones:
        return "the member is not prismatic (a polygon, holes, cut-outs or zones)"
    sup = case.supports
    if len(sup) == 1 and sup[0].fix == "xy" and sup[0].where.edge in ("left", "right"):
        return "cantilever", {"root": _end_x(case, sup[0].where) or 0.0}
    if (len(sup) == 2 and sorted(s.fix for s in sup) == ["xy", "y"]
            and all(_on_long_edge(case, s.where) for s in sup)):
        xa, xb = sorted(s.where.at[0] for s in sup)
        if xb - xa > 0:
            return "simple", {"a": xa, "b": xb}
    return ("the supports are neither one clamped end edge (a cantilever) nor two supports "
            "on the top or bottom edge restraining xy and y (a simple beam)")


def beam_deflection(case: Case, level: Level) -> dict[str, Any]:
    """The ``deflection`` object of results.json (module docstring) for a beam check."""
    u, p = level.field.displacement, level.field.p
    mag = np.hypot(u[0], u[1])
    k = int(np.argmax(mag))
    fe = _fe_at_loads(level)
    out: dict[str, Any] = {"max_fe": float(mag[k]), "at": [float(p[0, k]), float(p[1, k])],
                           "hand": None, "fe_at_hand": None, "method": "",
                           "loads": [{"load": f"load-{i}", "fe": [float(v) for v in f],
                                      "hand": None, "ratio": None}
                                     for i, f in enumerate(fe)]}
    model = beam_model(case)
    if isinstance(model, str):
        out["method"] = f"no hand value: {model}"
        return out
    kind, where = model
    g, m = case.beam, case.material
    E = m.E / (1 - m.nu**2) if m.model == "plane-strain" else m.E
    G = m.E / (2 * (1 + m.nu))
    kappa = cowper_rectangle(m.nu)
    A, I = m.thickness * g.depth, m.thickness * g.depth**3 / 12  # noqa: E741
    EI, kGA = E * I, kappa * G * A
    span = g.length if kind == "cantilever" else where["b"] - where["a"]
    xs = [_load_x(case, ld, span) for ld in case.loads]
    if any(x is None for x in xs):
        out["method"] = ("no hand value: every load must be a transverse force at the free "
                         f"end or on a patch of at most {SHORT_PATCH:.0%} of the span")
        return out

    def hand_at(x: float) -> float:
        """Displacement in +y at x from every load (their Fy), bending plus shear."""
        total = 0.0
        for ld, xl in zip(case.loads, xs, strict=True):
            if kind == "cantilever":
                r = where["root"]
                total += cantilever_point_deflection(ld.force[1], abs(xl - r), abs(x - r), EI,
                                                     kGA)
            else:
                a0 = where["a"]
                if not (a0 <= xl <= where["b"] and a0 <= x <= where["b"]):
                    raise ValueError("outside the span")
                total += simply_supported_point_deflection(ld.force[1], xl - a0, x - a0, span,
                                                           EI, kGA)
        return total

    try:
        hands = [hand_at(x) for x in xs]
    except ValueError:
        out["method"] = "no hand value: a load lies outside the span between the supports"
        return out
    for row, h in zip(out["loads"], hands, strict=True):
        row["hand"] = h
        row["ratio"] = row["fe"][1] / h if h else None
    j = int(np.argmax(np.abs(hands)))
    out["hand"], out["fe_at_hand"] = hands[j], out["loads"][j]["fe"][1]
    name = "cantilever clamped at x = " + f"{where['root']:g}" if kind == "cantilever" else (
        f"simple beam on supports at x = {where['a']:g} and {where['b']:g}")
    out["method"] = (f"Timoshenko beam, {name}: bending plus shear deflection with Cowper's "
                     f"k = {kappa:.4f} (Cowper 1966), E = {E:g}, G = E/(2(1 + ν)) = {G:.6g}, "
                     f"A = {A:g}, I = {I:.6g}; loads as point loads at their centres")
    return out
