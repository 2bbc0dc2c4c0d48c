"""Stress concentrations at features: holes, fillets of cut-outs and sharp re-entrant corners.

For every feature the FE peak near it is found on each mesh level, its discretisation error
estimated (the run's convergence study) and set beside the hand side:

* **Peak.** The principal stress of largest magnitude at the nodes within a feature's reach
  (1.5 radii of a hole's centre or a fillet's arc centre, 5 % of the depth round a sharp
  corner), leaving out the excluded zones of `fem.member.level`. On a free edge the principal
  stresses are the hoop stress and 0, so this is the edge stress the published factors give.
  The largest |tau_xy| within the same reach is kept for the shear check.
* **Nominal (our choice).** From the hand side at the net section through the feature (the
  cut x = hole centre; x = the fillet's arc centre, where the arc meets the cut-out edge and
  the reduced section begins; just beside a sharp corner, on the side with less material):
  sigma_nom = |N|/A + |M| c/I of that section and tau_nom = the hand shear of the chosen
  method there. The larger of the two is the nominal: sigma_nom where the section works in
  tension or bending (the factors of the handbooks are referred to it), tau_nom where it is
  shear-dominated (a far field of pure shear tau has principal stresses +-tau, so
  Kt = peak/tau is the factor of the pure-shear solution). ``Kt = |peak| / nominal``.
  At a hole the shear is also referred to the shear formula of the net section at the
  hole's x: ``Kt,tau = |tau_xy| peak / (VQ/(Ib))``, with Kirsch's pure-shear values beside
  it (peak principal stress 4 tau, edge |tau_xy| at most 2 tau).
* **Published formulas**, where they apply, beside the FE value (as predicted peak stresses,
  so the comparison does not depend on the nominal chosen):

  - *Kirsch* (1898; Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 35): a
    circular hole in an infinite plate, hoop-stress extremes
    ``(sx + sy) +- 2 sqrt((sx - sy)^2 + 4 txy^2)`` under the far field; 3 sigma in tension,
    +-4 tau in pure shear. The far field is the hand stress state of the *gross* section
    (hole ignored) at the hole centre: sx = N/A + M (y - yb)/I, sy = 0, txy = V Q/(I b)
    (shear formula) or V/A (average). Applied when the hole is unloaded and nothing but
    material lies within 10 d of its centre (so d <= W/20 for a hole on the axis). Measured
    here: a square plate of side W loaded on its edges peaks above Kirsch by 2.8 % at
    W = 10 d, 0.7 % at 20 d and 0.2 % at 40 d (about 8.5 (d/W)^2).
  - *Finite-width strip in tension* (Howland 1930, polynomial fit of Peterson's chart 4.1,
    `classical.coefficients.kt_net_howland`): a central hole in a straight strip of width W,
    ``sigma_max = Kt_net(d/W) N/A_net``. Applied when the hole is unloaded and centred, the
    member is a plain strip for one width either side, the hand section carries tension or
    compression only (bending and shear below 2 % of N/A) and d/W <= 0.5 (the range of
    Howland's series, from memory).

  A fillet has no formula here (only its FE Kt); nor has a hole that carries a pin load (its
  peak is a bearing and lug stress). A sharp corner has no finite Kt at all
  (Williams 1952: stress ~ r**(lambda - 1)); its record gives the measured growth instead.
* **Sharp corners.** The stress is sampled at a distance ``CORNER_SAMPLE_RATIO * h`` from
  the vertex along the bisector into the material (h the level's element size). The mesh
  refines sharp corners to h/6 (`fem.member.mesh`), so the sample sits two corner elements out:
  it is a smooth function of the mesh, whereas the nodal value at the vertex depends on the
  shapes of the few elements that happen to meet there; and it moves in with h, so on a
  singular corner it grows like h**(lambda - 1). `growth` is the log-log slope over the
  levels (`fem.convergence.growth_exponent`), beside Williams' lambda - 1.

Findings (kind ``concentration``) name the feature, give Kt with its nominal, the formula
values and the GCI of the peak; ``ratio`` is the FE peak |tau_xy| near a hole or fillet over
the hand shear of the chosen method at the net section, so a concentration that makes the
hand shear check unsafe decides the verdict (`fem.verdict.decide`). Sharp corners give a
finding without a ratio (the `singular` finding of `fem.member.check` speaks for their growth).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np
from shapely.geometry import Point, box

from classical.bending import principal_stresses
from classical.coefficients import kirsch_hole_edge_extremes, kt_net_howland
from fem.case.model import BeamGeometry, Case
from fem.case.outline import (
    ARC_SEGMENTS,
    cut_strips,
    domain_polygon,
    member_depth,
    outline_polygon,
    reentrant_corners,
)
from fem.convergence import ConvergenceInputError, growth_exponent, williams_lambda
from fem.member.hand import CutHand, hand_at_cut, member_model
from fem.member.level import ExcludedZone, Level
from fem.member.recovery import PointLocator, von_mises
from fem.results import Finding, significant

__all__ = [
    "CORNER_SAMPLE_RATIO", "KIRSCH_CLEARANCE", "KIRSCH_SHEAR_KT", "KIRSCH_SHEAR_TAU_EDGE",
    "STRIP_MAX_D_OVER_W", "Feature", "FormulaValue",
    "Concentration", "features", "concentrations", "concentration_findings",
]

CORNER_SAMPLE_RATIO = 1.0 / 3.0  # sharp-corner sample distance / element size (see above)
KIRSCH_CLEARANCE = 10.0          # material all round within this many diameters: "infinite"
STRIP_MAX_D_OVER_W = 0.5         # Howland's series covers d/W up to 0.5 (from memory)
#: Kirsch, infinite plate with a circular hole in pure shear tau: hoop stress
#: -4 tau sin 2 theta, so the peak principal stress is 4 tau, and tau_xy on the edge
#: 2 tau sin^2 2 theta, at most 2 tau
KIRSCH_SHEAR_KT = 4.0
KIRSCH_SHEAR_TAU_EDGE = 2.0
KIRSCH_SHEAR_SOURCE = ("Kirsch 1898; Pilkey & Pilkey, Peterson's Stress Concentration "
                       "Factors, 3rd ed., infinite plate in pure shear, from memory")
_PURE = 0.02                     # bending or shear below 2 % of N/A: "pure" tension
_REACH = 1.5                     # search radius of a hole or fillet, in radii


@dataclass(frozen=True)
class Feature:
    """A place where stress concentrates.

    ``centre`` is a hole's centre, a fillet's arc centre or a sharp corner's vertex;
    ``radius`` 0 for a sharp corner; ``bisector`` the unit vector into the material at a
    corner; ``x_net`` the cut of the net section; ``hole`` the hole's index.
    """

    kind: str                       # "hole" | "fillet" | "corner"
    name: str
    key: str                        # name of the tracked quantity
    centre: tuple[float, float]
    radius: float
    reach: float
    x_net: float
    angle: float = 0.0
    bisector: tuple[float, float] | None = None
    hole: int | None = None
    loaded: bool = False            # a pin load bears on this hole


@dataclass(frozen=True)
class FormulaValue:
    """A published factor beside the FE peak: the peak stress it predicts, signed."""

    name: str
    source: str
    kt: float
    nominal: float                  # the formula's own nominal stress (magnitude)
    nominal_basis: str
    peak: float                     # predicted extreme of largest magnitude
    opposite: float | None          # the other extreme, where the formula gives it
    fe_error: float = math.nan      # FE extreme of the same sign / predicted - 1
    fe_error_opposite: float | None = None


@dataclass
class Concentration:
    """One feature's peak over the levels, its Kt and the formulas that apply."""

    feature: Feature
    sizes: list[float]
    values: list[float]             # |peak| per level (corners: the bisector sample)
    peak: float                     # signed principal stress of largest magnitude, finest
    at: tuple[float, float]
    tension: float                  # largest s1 within reach, finest
    compression: float              # smallest s2 within reach, finest
    tau_peak: float                 # largest |tau_xy| within reach, finest
    tau_at: tuple[float, float]
    sigma_nominal: float | None = None
    tau_nominal: float | None = None
    nominal: float | None = None
    nominal_basis: str = ""
    kt: float | None = None
    formulas: list[FormulaValue] = field(default_factory=list)
    ratio: float | None = None      # tau_peak / tau_nominal
    tau_formula: float | None = None  # holes: VQ/(Ib) of the net section at the hole's x
    kt_shear: float | None = None   # holes: tau_peak / tau_formula
    growth: float | None = None     # corners: log-log slope of the sample against h
    williams: float | None = None   # corners: lambda - 1 for the corner's angle
    corner_peaks: list[float] = field(default_factory=list)  # corners: nodal peak per level
    study: dict[str, Any] = field(default_factory=dict)

    @property
    def converged(self) -> bool:
        return bool(self.study.get("converged"))


def _fmt(v: float) -> str:
    return f"{v:.4g}"


def _pt(p: Sequence[float]) -> str:
    return f"({_fmt(p[0])}, {_fmt(p[1])})"


def _bisector(dom, at: tuple[float, float], scale: float) -> tuple[float, float]:
    """Unit vector into the material: the mean direction of the material arc round `at`."""
    th = (np.arange(720) + 0.5) * (2 * math.pi / 720)
    eps = 1e-4 * scale
    inside = np.array([dom.contains(Point(at[0] + eps * math.cos(a), at[1] + eps * math.sin(a)))
                       for a in th])
    v = np.array([np.cos(th[inside]).sum(), np.sin(th[inside]).sum()])
    n = float(np.hypot(*v))
    return (float(v[0] / n), float(v[1] / n)) if n > 0 else (0.0, 0.0)


def _net_x(dom, g: BeamGeometry, x: float, scale: float) -> float:
    """x itself if material is cut there, else just beside it on the side with less of it."""
    eps = 1e-6 * scale
    sides = []
    for xx in (x - eps, x + eps):
        s = cut_strips(g, xx, 1.0, dom)
        if s:
            sides.append((sum(p.y1 - p.y0 for p in s), xx))
    if not sides:
        return x
    return min(sides)[1]


def features(case: Case) -> list[Feature]:
    """Holes, fillets of cut-outs and sharp re-entrant corners of a beam-kind case."""
    g = case.beam
    dom = domain_polygon(g)
    x0, y0, x1, y1 = dom.bounds
    depth = y1 - y0
    scale = max(x1 - x0, depth)
    out: list[Feature] = []
    L = case.units.length
    for k, h in enumerate(g.holes):
        out.append(Feature(kind="hole", name=f"hole {k} (d = {_fmt(2 * h.radius)} {L}, centre "
                                             f"{_pt(h.center)} {L})",
                           key=f"hole {k} peak principal", centre=tuple(h.center),
                           radius=h.radius, reach=_REACH * h.radius, x_net=h.center[0], hole=k,
                           loaded=any(ld.where.hole == k for ld in case.loads)))
    outline = outline_polygon(g)
    inward = [(1, 1), (-1, 1), (-1, -1), (1, -1)]
    for k, c in enumerate(g.cutouts):
        if c.fillet <= 0:
            continue
        (cx0, cy0), (w, hgt), r = c.corner, c.size, c.fillet
        corners = [(cx0, cy0), (cx0 + w, cy0), (cx0 + w, cy0 + hgt), (cx0, cy0 + hgt)]
        for (cx, cy), (sx, sy) in zip(corners, inward, strict=True):
            if not outline.buffer(-1e-9 * (w + hgt)).contains(Point(cx, cy)):
                continue  # a corner outside the member is not rounded
            o = (cx + sx * r, cy + sy * r)
            mid = Point(o[0] - sx * r / math.sqrt(2), o[1] - sy * r / math.sqrt(2))
            if dom.boundary.distance(mid) > 1e-3 * r:
                continue  # the arc was cut away by another cut-out
            out.append(Feature(kind="fillet", name=f"the fillet r = {_fmt(r)} {L} at the "
                                                   f"corner {_pt((cx, cy))} {L} of cut-out {k}",
                               key=f"fillet {_pt((cx, cy))} peak principal", centre=o,
                               radius=r, reach=_REACH * r,
                               x_net=_net_x(dom, g, o[0], scale)))
    for c in reentrant_corners(dom):
        out.append(Feature(kind="corner", name=f"the sharp {c.angle:.0f} degree corner at "
                                               f"{_pt(c.at)} {L}",
                           key=f"corner {_pt(c.at)} sample", centre=c.at, radius=0.0,
                           reach=0.05 * depth, x_net=_net_x(dom, g, c.at[0], scale),
                           angle=c.angle, bisector=_bisector(dom, c.at, scale)))
    return out


def _near(level: Level, f: Feature, zones: list[ExcludedZone]) -> np.ndarray:
    p = level.field.p
    keep = np.hypot(p[0] - f.centre[0], p[1] - f.centre[1]) <= f.reach
    for z in zones:
        keep &= np.hypot(p[0] - z.at[0], p[1] - z.at[1]) > z.radius
    return keep


def _peaks(level: Level, near: np.ndarray) -> dict[str, Any]:
    n = level.field.nodal
    p = level.field.p
    ps = principal_stresses(n["sxx"][near], n["syy"][near], n["txy"][near])
    s1, s2 = np.asarray(ps.s1), np.asarray(ps.s2)
    xy = p[:, near]
    i1, i2 = int(np.argmax(s1)), int(np.argmin(s2))
    peak, i = (float(s1[i1]), i1) if abs(s1[i1]) >= abs(s2[i2]) else (float(s2[i2]), i2)
    tau = np.abs(n["txy"][near])
    it = int(np.argmax(tau))
    return {"peak": peak, "at": (float(xy[0, i]), float(xy[1, i])), "tension": float(s1[i1]),
            "compression": float(s2[i2]), "tau": float(tau[it]),
            "tau_at": (float(xy[0, it]), float(xy[1, it])),
            "vm": float(np.max(von_mises(level.field.material, n["sxx"][near], n["syy"][near],
                                         n["txy"][near])))}


def _corner_sample(level: Level, f: Feature, dom, locator: PointLocator) -> float:
    """von Mises of the FE field CORNER_SAMPLE_RATIO * h from the vertex on the bisector
    (NaN where that point is not in the material: a mesh too coarse for the corner)."""
    rho = CORNER_SAMPLE_RATIO * level.size
    assert f.bisector is not None
    q = (f.centre[0] + rho * f.bisector[0], f.centre[1] + rho * f.bisector[1])
    if not dom.contains(Point(q)):
        return math.nan
    s = level.field.at(locator, np.array([q[0]]), np.array([q[1]]))
    return float(np.ravel(von_mises(level.field.material, s["sxx"], s["syy"], s["txy"]))[0])


def _hand(case: Case, level: Level, x: float, y: np.ndarray,
          geometry: BeamGeometry | None = None) -> CutHand | None:
    """The hand side at x, as `fem.member.level.run_level` builds it (optionally on another outline,
    e.g. the gross section with a hole left out)."""
    g = geometry or case.beam
    dom = domain_polygon(g)
    t = case.material.thickness
    strips = cut_strips(g, x, t, dom)
    if not strips:
        return None
    model = level.model or member_model(case, level.mm.supports, level.mm.loads,
                                        [c.x for c in level.cuts_fe])
    return hand_at_cut(case, model, x, strips, y)


def _kirsch(case: Case, level: Level, f: Feature, dom, S: str) -> FormulaValue | None:
    """Kirsch's extremes under the gross-section hand stresses at the hole centre."""
    if case.check.method not in ("shear-formula", "average"):
        return None
    g = case.beam
    d = 2.0 * f.radius
    disc = Point(f.centre).buffer(KIRSCH_CLEARANCE * d, quad_segs=ARC_SEGMENTS)
    hole = Point(f.centre).buffer(f.radius, quad_segs=ARC_SEGMENTS)
    if dom.intersection(disc).area < (1 - 1e-6) * (disc.area - hole.area):
        return None  # an edge, patch or other feature within 10 d: not an infinite plate
    gross = replace(g, holes=tuple(h for k, h in enumerate(g.holes) if k != f.hole))
    yc = f.centre[1]
    hd = _hand(case, level, f.centre[0], np.array([yc]), gross)
    if hd is None:
        return None
    sec = hd.section
    sx = hd.N / sec.area + hd.M * (yc - sec.centroid) / sec.inertia
    if case.check.method == "average":
        txy = hd.V / sec.area
    else:
        txy = float(hd.tau[0])
    ext = kirsch_hole_edge_extremes(sx, 0.0, txy)
    far = max(abs(v) for v in (principal_stresses(sx, 0.0, txy).s1,
                                principal_stresses(sx, 0.0, txy).s2))
    if far <= 0:
        return None
    peak, other = (ext.max, ext.min) if abs(ext.max) >= abs(ext.min) else (ext.min, ext.max)
    return FormulaValue(
        name="Kirsch (circular hole in an infinite plate)",
        source="Kirsch 1898; Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 35",
        kt=abs(peak) / far, nominal=far,
        nominal_basis=(f"largest principal stress of the far field sigma_x = {_fmt(sx)} {S}, "
                       f"tau = {_fmt(txy)} {S} (hand, gross section at the hole centre)"),
        peak=peak, opposite=other)


def _strip(case: Case, level: Level, f: Feature, dom, hd: CutHand,
           S: str) -> FormulaValue | None:
    """Howland's finite-width factor for a central hole in a strip in tension."""
    g = case.beam
    strips = hd.section.strips
    if len(strips) != 2 or strips[0][2] != strips[1][2]:
        return None
    y0, y1 = strips[0][0], strips[1][1]
    W, d = y1 - y0, 2.0 * f.radius
    if d / W > STRIP_MAX_D_OVER_W or abs(f.centre[1] - 0.5 * (y0 + y1)) > 0.01 * W:
        return None
    window = box(f.centre[0] - W, y0, f.centre[0] + W, y1)
    hole = Point(f.centre).buffer(f.radius, quad_segs=ARC_SEGMENTS)
    if (outline_polygon(g).intersection(window).area < (1 - 1e-6) * window.area
            or dom.intersection(window).area < (1 - 1e-6) * (window.area - hole.area)):
        return None  # not a plain strip for one width either side
    if any(p.hole is None and min(math.dist(f.centre, e) for e in p.ends) < W
           for p in level.mm.supports + level.mm.loads):
        return None
    sec = hd.section
    axial = abs(hd.N) / sec.area
    bending = abs(hd.M) * sec.fibre_distance() / sec.inertia
    if axial <= 0 or bending > _PURE * axial or hd.tau_method > _PURE * axial:
        return None
    kt = kt_net_howland(d / W)
    return FormulaValue(
        name=f"Howland (central hole in a strip in tension, d/W = {d / W:.3g})",
        source=("Howland 1930, polynomial fit of Pilkey & Pilkey, Peterson's Stress "
                "Concentration Factors, 3rd ed., chart 4.1 (classical.coefficients)"),
        kt=kt, nominal=axial, nominal_basis=f"net-section N/A = {_fmt(axial)} {S}",
        peak=math.copysign(kt * axial, hd.N), opposite=None)


def _nominal(c: Concentration, hd: CutHand, method: str, L: str, scale: float) -> None:
    """Kt and the shear ratio against the hand side at the net section (module docstring);
    a hand shear below 1e-9 of `scale` (the largest hand stress of the check) is none."""
    sec = hd.section
    c.sigma_nominal = abs(hd.N) / sec.area + abs(hd.M) * sec.fibre_distance() / sec.inertia
    c.tau_nominal = hd.tau_method if hd.tau_method > 1e-9 * scale else 0.0
    x = f"{_fmt(hd.x)} {L}"
    if c.sigma_nominal >= c.tau_nominal:
        c.nominal = c.sigma_nominal
        c.nominal_basis = f"net-section sigma = |N|/A + |M| c/I at x = {x}"
    else:
        c.nominal = c.tau_nominal
        c.nominal_basis = f"hand shear ({method}) of the net section at x = {x}"
    c.kt = abs(c.peak) / c.nominal if c.nominal > 0 else None
    c.ratio = c.tau_peak / c.tau_nominal if c.tau_nominal > 0 else None
    if c.feature.kind == "hole" and hd.tau_max_formula > 1e-9 * scale:
        c.tau_formula = hd.tau_max_formula
        c.kt_shear = c.tau_peak / c.tau_formula


def concentrations(case: Case, levels: list[Level], zones: list[ExcludedZone],
                   study: Callable[[list[float], list[float]], dict[str, Any]]
                   ) -> list[Concentration]:
    """Every feature's peak over the levels, Kt against the hand side and the formulas.

    Parameters
    ----------
    case : Case
        A beam-kind case.
    levels : list of Level
        The levels of the convergence study, coarsest first.
    zones : list of ExcludedZone
        Left out of the search, as for the domain peaks.
    study : callable
        ``study(sizes, values) -> dict`` with at least ``values``, ``gci`` and
        ``converged``: the run's convergence judgement (`fem.member.check`), applied to each peak.

    Returns
    -------
    list of Concentration
        One per feature that has nodes within its reach.
    """
    fin = levels[-1]
    dom = domain_polygon(case.beam)
    sizes = [lv.size for lv in levels]
    L = case.units.length
    locators: dict[int, PointLocator] = {}

    def locator(k: int) -> PointLocator:
        if k not in locators:
            locators[k] = PointLocator(levels[k].field.p, levels[k].field.t)
        return locators[k]

    hand_scale = max([c.tau_method for c in fin.cuts_hand]
                     + [c.sigma_x_max for c in fin.cuts_hand] + [0.0])
    depth = member_depth(case.beam)
    stress_ref = max(hand_scale, sum(float(np.hypot(*ld.force)) for ld in case.loads)
                     / (case.material.thickness * depth))
    out = []
    for f in features(case):
        per = []
        for lv in levels:
            near = _near(lv, f, zones)
            per.append(_peaks(lv, near) if near.any() else None)
        if per[-1] is None:
            continue
        pk = per[-1]
        if abs(pk["peak"]) <= 1e-9 * stress_ref:
            continue  # no stress to speak of here (e.g. loads straight into the supports)
        c = Concentration(feature=f, sizes=sizes, values=[], peak=pk["peak"], at=pk["at"],
                          tension=pk["tension"], compression=pk["compression"],
                          tau_peak=pk["tau"], tau_at=pk["tau_at"])
        if f.kind == "corner":
            c.values = [_corner_sample(lv, f, dom, locator(k)) for k, lv in enumerate(levels)]
            c.corner_peaks = [math.nan if q is None else q["vm"] for q in per]
            c.williams = williams_lambda(min(f.angle, 360.0)) - 1.0
            if len(levels) >= 2 and all(math.isfinite(v) for v in c.values):
                try:
                    c.growth = growth_exponent(sizes, c.values)
                except ConvergenceInputError:
                    c.growth = None
        else:
            c.values = [math.nan if q is None else abs(q["peak"]) for q in per]
            if all(math.isfinite(v) and v > 0 for v in c.values):
                c.study = study(sizes, c.values)
        hd = None if f.loaded else _hand(case, fin, f.x_net, np.array([f.centre[1]]))
        if hd is not None:
            _nominal(c, hd, case.check.method, L,
                     max(hand_scale, abs(hd.N) / hd.section.area, hd.tau_method))
            if f.kind == "hole":
                c.formulas = [v for v in (_kirsch(case, fin, f, dom, case.units.stress),
                                          _strip(case, fin, f, dom, hd, case.units.stress))
                              if v is not None]
        c.formulas = [_with_errors(c, v) for v in c.formulas]
        if f.kind == "corner":
            c.kt = c.ratio = None  # no finite peak to compare
        out.append(c)
    return out


def _with_errors(c: Concentration, v: FormulaValue) -> FormulaValue:
    """The FE extreme of the same sign as each predicted one, as a relative error."""

    def err(pred: float) -> float:
        return (c.tension if pred > 0 else c.compression) / pred - 1.0

    return replace(v, fe_error=err(v.peak),
                   fe_error_opposite=None if not v.opposite else err(v.opposite))


def concentration_findings(case: Case, items: list[Concentration]) -> list[Finding]:
    """One `concentration` finding per feature, in plain words."""
    S, L = case.units.stress, case.units.length
    tol = case.check.tolerance
    method = case.check.method
    out = []
    for c in items:
        f = c.feature
        if f.kind == "corner":
            out.append(Finding(kind="concentration", at=list(f.centre), ratio=None,
                               message=_corner_message(c, S, L)))
            continue
        gci = c.study.get("gci")
        conv = ("one mesh only, no error estimate" if len(c.sizes) < 2 else
                f"{'converged' if c.converged else 'not converged'}, GCI "
                f"{'n/a' if gci is None else f'{gci:.1%}'}")
        text = (f"At {f.name} the FE principal stress peaks at {_fmt(c.peak)} {S} at "
                f"{_pt(c.at)} {L} ({conv})")
        if c.kt is not None:
            text += f": Kt = {c.kt:.3g} on the {c.nominal_basis} ({_fmt(c.nominal)} {S})"
        for v in c.formulas:
            pred, errs = f"{_fmt(v.peak)} {S}", f"{100 * v.fe_error:+.1f} %"
            if v.fe_error_opposite is not None:
                pred = f"{_fmt(v.peak)} and {_fmt(v.opposite or 0.0)} {S}"
                errs += f" and {100 * v.fe_error_opposite:+.1f} %"
            text += (f". {v.name}, Kt = {v.kt:.3g} on the {v.nominal_basis}, predicts {pred}"
                     f" ({v.source}): FE {errs}")
        if c.kt_shear is not None and c.tau_formula is not None:
            text += (f". On the shear nominal VQ/(Ib) = {_fmt(c.tau_formula)} {S} of the net "
                     f"section at x = {_fmt(f.x_net)} {L}, the FE |τxy| peak gives Kt,τ = "
                     f"{c.kt_shear:.3g} and the principal-stress peak "
                     f"{abs(c.peak) / c.tau_formula:.3g}; Kirsch's infinite plate in pure "
                     f"shear has Kt = {KIRSCH_SHEAR_KT:g} on the applied shear (hoop stress "
                     f"±{KIRSCH_SHEAR_KT:g}τ), with |τxy| at most {KIRSCH_SHEAR_TAU_EDGE:g}τ "
                     f"on the edge ({KIRSCH_SHEAR_SOURCE})")
        if f.loaded:
            text += (". The hole carries a pin load: its peak is a bearing and lug stress, "
                     "outside the remote-field factors here, so no Kt is given.")
        elif c.ratio is None:
            text += ". The hand side carries no shear at this section."
        else:
            verdict = ("the hand shear check is unsafe here" if c.ratio > 1 + tol else
                       "within the hand value")
            text += (f". The FE shear |τxy| there reaches {_fmt(c.tau_peak)} {S} at "
                     f"{_pt(c.tau_at)} {L}, {c.ratio:.3g} times the {method} value "
                     f"{_fmt(c.tau_nominal or 0.0)} {S}: {verdict}.")
        out.append(Finding(kind="concentration", at=list(c.at),
                           ratio=None if c.ratio is None else significant(c.ratio),
                           message=text))
    return out


def _corner_message(c: Concentration, S: str, L: str) -> str:
    f = c.feature
    text = (f"{f.name[0].upper()}{f.name[1:]} has no finite stress concentration factor: the "
            f"elastic stress there varies as r^{c.williams:.3f} (Williams 1952), so its peak "
            f"principal stress ({_fmt(abs(c.peak))} {S} on the finest mesh) depends on the mesh")
    if c.growth is not None:
        text += (f"; the stress {CORNER_SAMPLE_RATIO:.3g} h from the corner (h the element "
                 f"size, {_fmt(c.sizes[0])} to {_fmt(c.sizes[-1])} {L}) grew with exponent "
                 f"{c.growth:.3f} over the levels ({_fmt(c.values[0])} to {_fmt(c.values[-1])}"
                 f" {S})")
    if c.nominal:
        text += (f". For reference, the {c.nominal_basis} is {_fmt(c.nominal)} {S}")
    return text + ". Model the real fillet radius to obtain a finite peak."
