"""One mesh level of a beam check: mesh, solve, recover, cut, and the hand side.

`run_level` is the chain for one element size; `fem.member.check` repeats it over the levels of a
convergence study and hands the finest to `fem.member.compare`.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from classical.beam1d import BeamModel
from fem.case.model import Case
from fem.case.outline import Patch, cut_strips, domain_polygon, member_depth
from fem.member.cuts import CutFE, automatic_cuts, sample_cut
from fem.member.frame import Frame
from fem.member.hand import CutHand, hand_at_cut, member_model
from fem.member.mesh import MemberMesh, mesh_member
from fem.member.recovery import PointLocator, StressField, recover
from fem.member.solve import Solution, solve_member

__all__ = ["Level", "ExcludedZone", "run_level", "cut_positions", "excluded_zones", "peaks"]


@dataclass(frozen=True)
class ExcludedZone:
    """A disc left out of the peak search: a boundary-condition idealisation."""

    at: tuple[float, float]
    radius: float
    why: str


@dataclass
class Level:
    size: float
    mm: MemberMesh
    sol: Solution
    field: StressField
    cuts_fe: list[CutFE]
    cuts_hand: list[CutHand]
    peaks: dict[str, tuple[float, tuple[float, float]]]
    seconds_post: float
    model: BeamModel | None = None   # the hand side's statics model


def cut_positions(case: Case, sup: list[Patch], lds: list[Patch]) -> list[float]:
    """check.cuts, or the automatic set near loads, supports and features."""
    if case.check.cuts:
        return list(case.check.cuts)
    g = case.beam
    dom = domain_polygon(g)
    x0, y0, x1, y1 = dom.bounds
    stations = []
    for p in sup + lds:
        if p.hole is not None:
            h = g.holes[p.hole]
            stations.append((h.center[0] - h.radius, h.center[0] + h.radius))
        else:
            xs = [q[0] for q in p.ends]
            stations.append((min(xs), max(xs)))
    for h in g.holes:
        stations.append((h.center[0] - h.radius, h.center[0] + h.radius))
    for c in g.cutouts:
        stations.append((c.corner[0], c.corner[0] + c.size[0]))
    xs = automatic_cuts(x0, x1, y1 - y0, stations, min_gap=0.05 * (y1 - y0))
    return [x for x in xs if cut_strips(g, x, 1.0, dom)]


def excluded_zones(case: Case, sup: list[Patch], lds: list[Patch]) -> list[ExcludedZone]:
    """Point patches and the ends of clamped or loaded stretches, radius a tenth depth."""
    depth = member_depth(case.beam)
    r = min(0.1 * depth, 2.0 * case.mesh.size)
    zones = []
    for p, s in zip(sup, case.supports, strict=True):
        if p.point is not None:
            zones.append(ExcludedZone(p.point, r, f"point support {p.name}"))
        else:
            for e in p.ends:
                zones.append(ExcludedZone(e, r, f"end of the {s.fix}-fixed stretch {p.name}"))
    for p in lds:
        if p.point is not None:
            zones.append(ExcludedZone(p.point, r, f"point load {p.name}"))
        elif p.hole is None:
            for e in p.ends:
                zones.append(ExcludedZone(e, r, f"end of the load patch {p.name}"))
    return zones


def peaks(field: StressField, zones: list[ExcludedZone]) -> dict[str, tuple[float, tuple]]:
    """Largest |tau_xy|, von Mises and max principal outside the excluded zones."""
    p = field.p
    keep = np.ones(p.shape[1], bool)
    for z in zones:
        keep &= np.hypot(p[0] - z.at[0], p[1] - z.at[1]) > z.radius
    out = {}
    for name, values in (("tau", np.abs(field.nodal["txy"])),
                         ("von_mises", field.nodal["von_mises"]),
                         ("principal", field.nodal["principal_max"])):
        v = np.where(keep, values, -np.inf)
        i = int(np.argmax(v))
        out[name] = (float(values[i]), (float(p[0, i]), float(p[1, i])))
    return out


def run_level(case: Case, size: float, xs: list[float] | None = None,
              background: Callable[[Frame], int] | None = None) -> Level:
    """The whole chain at one element size (optionally with an extra size field)."""
    mm = mesh_member(case, size, background=background)
    sol = solve_member(case, mm)
    t0 = time.perf_counter()
    field = recover(sol, mm, case.material)
    locator = PointLocator(field.p, field.t)
    g = case.beam
    dom = domain_polygon(g)
    xs = xs if xs is not None else cut_positions(case, mm.supports, mm.loads)
    strips_at = {x: cut_strips(g, x, case.material.thickness, dom) for x in xs}
    model = member_model(case, mm.supports, mm.loads, stations=xs)
    cuts_fe, cuts_hand = [], []
    vmax = max(abs(model.forces(x)[0]) for x in xs)
    load_scale = sum(float(np.hypot(*ld.force)) for ld in case.loads)
    carries_shear = vmax > 1e-9 * load_scale  # else a pure-tension member: keep every cut
    for x in xs:
        fe = sample_cut(x, strips_at[x], field, locator, size)
        hd = hand_at_cut(case, model, x, strips_at[x], fe.y)
        if case.check.cuts is None and carries_shear and abs(hd.V) <= 1e-9 * vmax:
            continue  # an automatic cut in a load-free overhang compares nothing
        cuts_fe.append(fe)
        cuts_hand.append(hd)
    pk = peaks(field, excluded_zones(case, mm.supports, mm.loads))
    return Level(size=size, mm=mm, sol=sol, field=field, cuts_fe=cuts_fe, cuts_hand=cuts_hand,
                 peaks=pk, seconds_post=time.perf_counter() - t0, model=model)


def nearest_station(x: float, stations: list[tuple[str, float, float]]) -> tuple[str, float]:
    """(name, distance) of the nearest station extent to x."""
    best, dist = "", math.inf
    for name, lo, hi in stations:
        d = 0.0 if lo <= x <= hi else min(abs(x - lo), abs(x - hi))
        if d < dist:
            best, dist = name, d
    return best, dist
