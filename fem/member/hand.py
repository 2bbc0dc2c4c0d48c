"""The hand side of a beam check: what a careful engineer would do on paper.

Supports and loads are idealised as beam supports and loads on the member axis
(classical.beam1d): a clamped end stretch fixes u, v and rotation; a bearing patch or
point fixes what its `fix` says, at its centre; a patch load on the top or bottom is a
line load over its length; an end load or pin load is a point load at its centre. V and M
at each cut come from statics of that model (exact for determinate layouts, elementary
beam theory otherwise); the section at the cut is the stack of material strips
(classical.strips); the stresses are the shear formula, V/A and M c/I.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from classical.beam1d import BeamModel, BeamSupport, LineLoad, MechanismError, PointLoad
from classical.beam1d import solve_beam as _solve_beam
from classical.shear import average_shear, direct_shear
from classical.strips import StripSection
from fem.case.model import Case
from fem.case.outline import Patch, Strip
from fem.errors import SolveError

__all__ = ["CutHand", "beam_model", "member_model", "hand_at_cut", "total_load"]


@dataclass(frozen=True)
class CutHand:
    """Hand values at one cut."""

    x: float
    section: StripSection
    V: float
    N: float
    M: float
    y: np.ndarray
    tau: np.ndarray          # shear formula profile, signed
    sigma_x: np.ndarray      # N/A + M (y - yb)/I, signed
    tau_max_formula: float
    y_at_tau_max: float
    tau_avg: float
    tau_method: float        # the hand value of check.method
    sigma_x_max: float


def _support(patch: Patch, fix: str, depth: float) -> BeamSupport:
    x = patch.centroid[0]
    r: set[str] = set()
    if "x" in fix:
        r.add("u")
    if "y" in fix:
        r.add("v")
    if patch.is_vertical() and patch.length > 0.25 * depth and "x" in fix:
        r.add("rot")  # a restrained end stretch of real depth stops rotation
    return BeamSupport(x=x, restrains=frozenset(r), name=patch.name)


def beam_model(case: Case, supports: list[Patch], loads: list[Patch], axis_y: float,
               EA: float, EI: float, stations: list[float]) -> BeamModel:
    """The 1D statics model of the member (see module docstring)."""
    g = case.beam
    x0, y0, x1, y1 = _bounds(case)
    depth = y1 - y0
    sups = [_support(p, s.fix, depth) for p, s in zip(supports, case.supports, strict=True)]
    points, lines = [], []
    for ld, p in zip(case.loads, loads, strict=True):
        Fx, Fy = ld.force
        if p.hole is not None:
            cx, cy = g.holes[p.hole].center
            points.append(PointLoad(x=cx, Fx=Fx, Fy=Fy, y=cy))
        elif p.is_horizontal() and p.length > 0:
            (a, b) = sorted(q[0] for q in p.ends)[0], sorted(q[0] for q in p.ends)[-1]
            lines.append(LineLoad(x0=a, x1=b, Fx=Fx, Fy=Fy, y=p.centroid[1],
                                  shape=ld.distribution))
        else:
            cx, cy = p.centroid
            points.append(PointLoad(x=cx, Fx=Fx, Fy=Fy, y=cy))
    try:
        return _solve_beam(sups, points, lines, EA=EA, EI=EI, axis_y=axis_y, stations=stations)
    except MechanismError:
        # a single bearing patch also resists rotation over its length: try that
        stiff = [BeamSupport(s.x, s.restrains | {"rot"}, s.name) if "v" in s.restrains else s
                 for s in sups]
        try:
            return _solve_beam(stiff, points, lines, EA=EA, EI=EI, axis_y=axis_y,
                               stations=stations)
        except MechanismError:
            raise SolveError("the supports, idealised as beam supports, cannot carry the "
                             "loads by statics; the hand side is undefined") from None


def member_model(case: Case, supports: list[Patch], loads: list[Patch],
                 stations: list[float]) -> BeamModel:
    """`beam_model` with the axis, EA and EI of the section at mid-length (gross section;
    EI only matters for indeterminate layouts)."""
    from classical.strips import StripSection
    from fem.case.outline import cut_strips, domain_polygon

    g = case.beam
    dom = domain_polygon(g)
    t = case.material.thickness
    mid = cut_strips(g, 0.5 * (dom.bounds[0] + dom.bounds[2]), t, dom)
    if not mid:  # a void at mid-length: take the first cut that has material
        mid = next(s for x in stations if (s := cut_strips(g, x, t, dom)))
    ref = StripSection(tuple((s.y0, s.y1, s.t) for s in mid))
    E = case.material.E
    return beam_model(case, supports, loads, axis_y=ref.centroid, EA=E * ref.area,
                      EI=E * ref.inertia, stations=stations)


def _bounds(case: Case) -> tuple[float, float, float, float]:
    from fem.case.outline import domain_polygon

    return domain_polygon(case.beam).bounds


def total_load(case: Case) -> float:
    """|sum of applied forces|, the F of single- and double-shear checks."""
    fx = sum(ld.force[0] for ld in case.loads)
    fy = sum(ld.force[1] for ld in case.loads)
    return float(np.hypot(fx, fy))


def hand_at_cut(case: Case, model: BeamModel, x: float, strips: list[Strip],
                y: np.ndarray) -> CutHand:
    """Section properties, V, M and hand stresses at the cut x, sampled at y."""
    sec = StripSection(tuple((s.y0, s.y1, s.t) for s in strips))
    yb, A, Ixx = sec.centroid, sec.area, sec.inertia
    V, N, M = model.forces(x, y_c=yb)
    b = sec.width(y)
    with np.errstate(divide="ignore", invalid="ignore"):
        tau = np.where(b > 0, V * sec.first_moment(y) / (Ixx * b), 0.0)
    dense = np.linspace(sec.bottom, sec.top, 2001)
    db = sec.width(dense)
    with np.errstate(divide="ignore", invalid="ignore"):
        dt = np.where(db > 0, np.abs(V) * sec.first_moment(dense) / (Ixx * db), 0.0)
    k = int(np.argmax(dt))
    sigma = N / A + M * (y - yb) / Ixx
    c = sec.fibre_distance()
    avg = average_shear(abs(V), A)
    method = case.check.method
    if method == "shear-formula":
        tm = float(dt[k])
    elif method == "average":
        tm = avg
    else:
        tm = direct_shear(total_load(case), A, 1 if method == "single-shear" else 2)
    return CutHand(x=x, section=sec, V=V, N=N, M=M, y=y, tau=tau, sigma_x=sigma,
                   tau_max_formula=float(dt[k]), y_at_tau_max=float(dense[k]),
                   tau_avg=avg, tau_method=tm,
                   sigma_x_max=float(abs(N) / A + abs(M) * c / Ixx))
