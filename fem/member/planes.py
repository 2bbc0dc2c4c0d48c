"""Longitudinal shear on horizontal planes of a member (``check.planes = [y, ...]``).

A plane is a horizontal line y = y_p in elevation: the glue line of a laminated beam, the
flange-to-web weld line of a girder drawn with zones. At stations x along it:

* **FE**: the longitudinal shear force per unit length q_FE(x) = τxy(x, y_p) t, with t the
  out-of-plane thickness at y_p (at a thickness change, the mean of τxy t just below and
  just above: the force per length is continuous there, the stress is not);
* **hand**: q = V Q / I at that x (V from the statics model, Q the first moment of the
  material above y_p about the section's centroid, I of the cut; classical.strips),
  the shear flow of built-up members (Gere & Goodno, Mechanics of Materials; common
  practice);
* **totals** between the first and last station: ∫ q_FE dx against the hand change of
  the force in the part above, F = M Q / I (dF/dx = V Q / I for a prismatic member).

Near a load patch, a support or a hole the elastic q departs from VQ/I: the plot shows
where, and a ``plane-excess`` finding (it informs; the verdict is the envelope's) names the
worst station outside the excluded zones.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from classical.strips import StripSection
from fem.case.model import Case
from fem.case.outline import cut_strips, domain_polygon
from fem.member.level import ExcludedZone, Level
from fem.member.recovery import PointLocator
from fem.results import Finding

__all__ = ["PlaneResult", "member_planes", "plane_findings", "STATIONS"]

STATIONS = 241  # stations along a plane (ends left out by half a spacing)
SIDE = 1e-6     # offset above/below the plane / depth, to read each side of a zone line


@dataclass
class PlaneResult:
    """One plane: stations and q [force/length], FE and hand; totals between the ends."""

    y: float
    x: list[float]
    q_fe: list[float]
    q_hand: list[float]
    total_fe: float
    total_hand: float
    x_range: list[float]
    excluded: list[bool] = field(default_factory=list)

    def to_dict(self) -> dict:
        return {"y": self.y, "x": self.x, "q_fe": self.q_fe, "q_hand": self.q_hand,
                "total_fe": self.total_fe, "total_hand": self.total_hand,
                "x_range": self.x_range, "excluded": self.excluded}


def member_planes(case: Case, level: Level, zones: list[ExcludedZone] = ()) -> list[PlaneResult]:
    """FE and hand longitudinal shear along every plane of ``case.check.planes``."""
    planes = getattr(case.check, "planes", None) or ()
    if not planes:
        return []
    g = case.beam
    dom = domain_polygon(g)
    x0, y0, x1, y1 = dom.bounds
    eps = SIDE * (y1 - y0)
    locator = PointLocator(level.field.p, level.field.t)
    out = []
    for yp in planes:
        xs = x0 + (np.arange(STATIONS) + 0.5) * (x1 - x0) / STATIONS
        keep, qh, F, t_lo, t_hi = [], [], [], [], []
        for x in xs:
            strips = cut_strips(g, float(x), case.material.thickness, dom)
            below = [s.t for s in strips if s.y0 <= yp - eps and yp - eps <= s.y1]
            above = [s.t for s in strips if s.y0 <= yp + eps and yp + eps <= s.y1]
            ok = bool(below) and bool(above)
            keep.append(ok)
            if not ok:
                continue
            sec = StripSection(tuple((s.y0, s.y1, s.t) for s in strips))
            V, _, M = level.model.forces(float(x), y_c=sec.centroid)
            Q = float(sec.first_moment(yp))
            qh.append(V * Q / sec.inertia)
            F.append(M * Q / sec.inertia)
            t_lo.append(below[0])
            t_hi.append(above[0])
        x = xs[np.asarray(keep, bool)]
        if len(x) < 2:
            continue
        lo = level.field.at(locator, x, np.full(len(x), yp - eps))["txy"]
        hi = level.field.at(locator, x, np.full(len(x), yp + eps))["txy"]
        q_fe = 0.5 * (lo * np.asarray(t_lo) + hi * np.asarray(t_hi))
        ex = [any(np.hypot(xx - z.at[0], yp - z.at[1]) <= z.radius for z in zones) for xx in x]
        out.append(PlaneResult(
            y=float(yp), x=[float(v) for v in x], q_fe=[float(v) for v in q_fe],
            q_hand=[float(v) for v in qh], total_fe=float(np.trapezoid(q_fe, x)),
            total_hand=float(F[-1] - F[0]), x_range=[float(x[0]), float(x[-1])],
            excluded=ex))
    return out


def plane_findings(case: Case, planes: list[PlaneResult], tolerance: float) -> list[Finding]:
    """``plane-excess`` (informs) at the worst station of each plane outside the excluded
    zones where |q_FE| exceeds |VQ/I| by more than the tolerance (stations where the hand
    q is below 1 % of its largest value are not judged)."""
    u = case.units
    per = f"{u.force}/{u.length}"
    out = []
    for p in planes:
        fe, hd = np.abs(p.q_fe), np.abs(p.q_hand)
        judged = (hd > 0.01 * hd.max()) & ~np.asarray(p.excluded, bool) if len(hd) else hd
        if not np.any(judged):
            continue
        r = np.where(judged, fe / np.where(judged, hd, 1.0), 0.0)
        k = int(np.argmax(r))
        if r[k] > 1.0 + tolerance:
            out.append(Finding("plane-excess", [p.x[k], p.y], float(r[k]),
                f"On the plane y = {p.y:g} {u.length} at x = {p.x[k]:.4g} {u.length} the FE "
                f"longitudinal shear {u.user_force(p.q_fe[k]):.4g} {per} is {r[k]:.3f} x VQ/I "
                f"= {u.user_force(p.q_hand[k]):.4g} {per}: "
                f"near a load, support, hole or change of section the shear flow is not "
                f"that of beam theory."))
    return out
