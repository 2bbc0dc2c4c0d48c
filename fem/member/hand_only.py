"""`shearcheck hand` for a member: the hand side at the cuts alone, written out as in a calc.

No mesh, no solve: the same hand side the FE check compares against (`fem.member.hand`), with
every FE figure null in results.json (`fem.api.hand_check` writes it).
"""

from __future__ import annotations

import numpy as np

from fem.case.model import Case
from fem.case.outline import cut_strips, domain_polygon, patches
from fem.member.hand import hand_at_cut, member_model, total_load
from fem.member.level import cut_positions
from fem.results import CutResult, Profile, Result, Timings, forces_to_case_unit

__all__ = ["beam_hand_result", "hand_units"]


def hand_units(case: Case) -> dict[str, str]:
    return {"length": case.units.length, "force": case.units.force, "stress": case.units.stress}


def beam_hand_result(case: Case) -> tuple[Result, list[str]]:
    """The hand side of a beam case at its cuts, and the calculation as text lines."""
    g = case.beam
    dom = domain_polygon(g)
    sup, lds = patches(case, dom)
    xs = cut_positions(case, sup, lds)
    model = member_model(case, sup, lds, stations=xs)
    L, F, S = case.units.length, case.units.force, case.units.stress
    f = case.units.user_force   # working force units -> the case's (fem.case.model.Units)
    lines = [f"Hand calculation: {case.title} ({case.name})",
             f"Units: {L}, {F}; stress {S}. Method: {case.check.method}.",
             "Statics: " + ("statically determinate" if model.determinate else
                            "statically indeterminate, elementary beam theory (EI constant)"),
             ""]
    for s, r in zip(model.supports, model.reactions, strict=True):
        lines.append(f"  reaction at {s.name} (x = {s.x:g} {L}): Rx = {f(r[0]) + 0.0:.5g} {F}, "
                     f"Ry = {f(r[1]) + 0.0:.5g} {F}, couple = {f(r[2]) + 0.0:.5g} {F} {L}")
    cuts = []
    for x in xs:
        strips = cut_strips(g, x, case.material.thickness, dom)
        y = np.concatenate([np.linspace(s.y0, s.y1, 41) for s in strips])
        hd = hand_at_cut(case, model, x, strips, y)
        sec = hd.section
        q = float(sec.first_moment(hd.y_at_tau_max))
        b = float(sec.width(hd.y_at_tau_max))
        lines += ["", f"Cut at x = {x:g} {L}: material " + ", ".join(
            f"{s.y0:g}..{s.y1:g} {L} (t = {s.t:g})" for s in strips),
            f"  A = {sec.area:.6g} {L}2, y_bar = {sec.centroid:.6g} {L}, "
            f"I = {sec.inertia:.6g} {L}4",
            f"  V = {f(hd.V):.6g} {F}, N = {f(hd.N):.6g} {F}, M = {f(hd.M):.6g} {F} {L}",
            f"  shear formula at y = {hd.y_at_tau_max:.4g} {L}: tau = V Q/(I b) = "
            f"{f(abs(hd.V)):.6g} {F} x {q:.6g} {L}3 / ({sec.inertia:.6g} {L}4 x {b:.4g} {L}) "
            f"= {hd.tau_max_formula:.4g} {S}",
            f"  average: V/A = {f(abs(hd.V)):.6g} {F} / {sec.area:.6g} {L}2 = "
            f"{hd.tau_avg:.4g} {S}",
            f"  bending: |N|/A + |M| c/I = {f(abs(hd.N)):.6g} {F} / {sec.area:.6g} {L}2 + "
            f"{f(abs(hd.M)):.6g} {F} {L} x {sec.fibre_distance():.4g} {L} / "
            f"{sec.inertia:.6g} {L}4 = {hd.sigma_x_max:.4g} {S}"]
        if case.check.method in ("single-shear", "double-shear"):
            n = 1 if case.check.method == "single-shear" else 2
            lines.append(f"  {case.check.method}: F/({n}A) = {f(total_load(case)):.6g} {F} / "
                         f"({n} x {sec.area:.6g} {L}2) = {hd.tau_method:.4g} {S}")
        cuts.append(CutResult(
            x=x, V_fe=None, V_hand=hd.V, M_fe=None, M_hand=hd.M, tau_max_fe=None,
            y_at_tau_max_fe=None, tau_max_hand=hd.tau_method, tau_avg_hand=hd.tau_avg,
            ratio=None, sigma_x_max_fe=None, sigma_x_max_hand=hd.sigma_x_max,
            profile=Profile(y=y.tolist(), tau_fe=[], tau_hand=hd.tau.tolist(),
                            sigma_x_hand=hd.sigma_x.tolist()),
            N_fe=None, N_hand=hd.N, A=sec.area, I=sec.inertia, centroid_y=sec.centroid,
            tau_formula_hand=hd.tau_max_formula))
    gov = max(cuts, key=lambda c: c.tau_max_hand)
    lines += ["", f"Governing hand shear stress: {gov.tau_max_hand:.4g} {S} at x = {gov.x:g} {L}"]
    res = Result(case=case.name, kind="beam", title=case.title, units=hand_units(case), mesh=None,
                 verdict="inconclusive", findings=[], timings=Timings(), convergence=None,
                 cuts=cuts, peak=None, equilibrium=None, hand_method=case.check.method,
                 tolerance=case.check.tolerance, hand_calculation=lines)
    forces_to_case_unit(res, 1.0 / case.units.force_scale)
    return res, lines
