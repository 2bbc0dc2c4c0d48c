"""`shearcheck hand`: the hand calculation alone, written out as it would appear in a calc.

No mesh, no solve: the same hand side the FE check compares against (fem.hand for beams,
classical.sections/shear for sections), with every FE figure null in results.json.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from .case import Case
from .hand import hand_at_cut, member_model, total_load
from .level import cut_positions
from .outputs import staged_output
from .plane import cut_strips, domain_polygon, patches
from .results import CutResult, Profile, Result, Timings, write_json

__all__ = ["hand_check", "beam_hand_result", "section_hand_result"]


def _units(case: Case) -> dict[str, str]:
    return {"length": case.units.length, "force": case.units.force, "stress": case.units.stress}


def beam_hand_result(case: Case) -> tuple[Result, list[str]]:
    """The hand side of a beam case at its cuts, and the calculation as text lines."""
    g = case.geometry
    dom = domain_polygon(g)  # type: ignore[arg-type]
    sup, lds = patches(case, dom)
    xs = cut_positions(case, sup, lds)
    model = member_model(case, sup, lds, stations=xs)
    L, F, S = case.units.length, case.units.force, case.units.stress
    lines = [f"Hand calculation: {case.title} ({case.name})",
             f"Units: {L}, {F}; stress {S}. Method: {case.check.method}.",
             "Statics: " + ("statically determinate" if model.determinate else
                            "statically indeterminate, elementary beam theory (EI constant)"),
             ""]
    for s, r in zip(model.supports, model.reactions, strict=True):
        lines.append(f"  reaction at {s.name} (x = {s.x:g} {L}): Rx = {r[0]:.5g} {F}, "
                     f"Ry = {r[1]:.5g} {F}, couple = {r[2]:.5g} {F} {L}")
    cuts = []
    for x in xs:
        strips = cut_strips(g, x, case.material.thickness, dom)  # type: ignore[arg-type]
        y = np.concatenate([np.linspace(s.y0, s.y1, 41) for s in strips])
        hd = hand_at_cut(case, model, x, strips, y)
        sec = hd.section
        q = float(sec.first_moment(hd.y_at_tau_max))
        b = float(sec.width(hd.y_at_tau_max))
        lines += ["", f"Cut at x = {x:g} {L}: material " + ", ".join(
            f"{s.y0:g}..{s.y1:g} {L} (t = {s.t:g})" for s in strips),
            f"  A = {sec.area:.6g} {L}2, y_bar = {sec.centroid:.6g} {L}, "
            f"I = {sec.inertia:.6g} {L}4",
            f"  V = {hd.V:.6g} {F}, N = {hd.N:.6g} {F}, M = {hd.M:.6g} {F} {L}",
            f"  shear formula at y = {hd.y_at_tau_max:.4g} {L}: tau = V Q/(I b) = "
            f"{abs(hd.V):.6g} x {q:.6g} / ({sec.inertia:.6g} x {b:.4g}) = "
            f"{hd.tau_max_formula:.4g} {S}",
            f"  average: V/A = {abs(hd.V):.6g} / {sec.area:.6g} = {hd.tau_avg:.4g} {S}",
            f"  bending: |N|/A + |M| c/I = {abs(hd.N):.6g}/{sec.area:.6g} + {abs(hd.M):.6g} x "
            f"{sec.fibre_distance():.4g}/{sec.inertia:.6g} = {hd.sigma_x_max:.4g} {S}"]
        if case.check.method in ("single-shear", "double-shear"):
            n = 1 if case.check.method == "single-shear" else 2
            lines.append(f"  {case.check.method}: F/({n}A) = {total_load(case):.6g} / ({n} x "
                         f"{sec.area:.6g}) = {hd.tau_method:.4g} {S}")
        cuts.append(CutResult(
            x=x, V_fe=None, V_hand=hd.V, M_fe=None, M_hand=hd.M, tau_max_fe=None,
            y_at_tau_max_fe=None, tau_max_hand=hd.tau_method, tau_avg_hand=hd.tau_avg,
            ratio=None, sigma_x_max_fe=None, sigma_x_max_hand=hd.sigma_x_max,
            profile=Profile(y=y.tolist(), tau_fe=[], tau_hand=hd.tau.tolist(),
                            sigma_x_hand=hd.sigma_x.tolist()),
            N_fe=None, N_hand=hd.N, A=sec.area, I=sec.inertia, centroid_y=sec.centroid,
            tau_formula_hand=hd.tau_max_formula))  # type: ignore[arg-type]
    gov = max(cuts, key=lambda c: c.tau_max_hand)
    lines += ["", f"Governing hand shear stress: {gov.tau_max_hand:.4g} {S} at x = {gov.x:g} {L}"]
    res = Result(case=case.name, kind="beam", title=case.title, units=_units(case), mesh=None,
                 verdict="inconclusive", findings=[], timings=Timings(), convergence=None,
                 cuts=cuts, peak=None, equilibrium=None, hand_method=case.check.method,
                 tolerance=case.check.tolerance, hand_calculation=lines)
    return res, lines


def section_hand_result(case: Case) -> tuple[Result, list[str]]:
    """Section properties and hand shear stresses of a section case."""
    from classical.sections import (
        chord_length,
        first_moment_above,
        polygon_properties,
        section_outline,
    )
    from classical.shear import average_shear, direct_shear, max_shear_formula

    g = case.geometry
    outline = section_outline(g.shape, **g.params)  # type: ignore[union-attr]
    p = polygon_properties(outline)
    Vx, Vy = case.shear
    L, F, S = case.units.length, case.units.force, case.units.stress
    V = float(np.hypot(Vx, Vy))
    mx = max_shear_formula(outline, abs(Vy)) if Vy else None
    tau_formula = mx.tau_max if mx is not None else float("nan")
    avg = average_shear(V, p.A)
    method = case.check.method
    if method == "shear-formula":
        tau_hand = tau_formula
    elif method == "double-shear":
        tau_hand = direct_shear(V, p.A, 2)
    else:
        tau_hand = avg if method == "average" else direct_shear(V, p.A, 1)
    lines = [f"Hand calculation: {case.title} ({case.name})",
             f"Section {g.shape} {g.params}; units {L}, {F}; stress {S}",  # type: ignore
             f"  A = {p.A:.6g} {L}2, centroid = ({p.cx:.5g}, {p.cy:.5g}) {L}",
             f"  Ixx = {p.Ixx:.6g}, Iyy = {p.Iyy:.6g}, Ixy = {p.Ixy:.6g} {L}4",
             f"  shear V = [{Vx:g}, {Vy:g}] {F}"]
    if mx is not None:
        q = first_moment_above(outline, mx.y_at)
        b = chord_length(outline, mx.y_at)
        lines.append(f"  shear formula (Vy) worst cut y = {mx.y_at:.4g} {L}: tau = V Q/(I b) = "
                     f"{abs(Vy):.6g} x {q:.6g} / ({p.Ixx:.6g} x {b:.4g}) = {tau_formula:.4g} {S}")
    lines.append(f"  average V/A = {V:.6g}/{p.A:.6g} = {avg:.4g} {S}")
    if method in ("single-shear", "double-shear"):
        n = 1 if method == "single-shear" else 2
        lines.append(f"  {method}: F/({n}A) = {tau_hand:.4g} {S}")
    section = {"A": p.A, "I": {"xx": p.Ixx, "yy": p.Iyy, "xy": p.Ixy},
               "centroid": [p.cx, p.cy], "shear_centre": None, "J": None, "tau_max_fe": None,
               "tau_at": None, "tau_max_hand": tau_formula if mx is not None else None,
               "tau_avg_hand": avg, "ratio": None, "tau_method_hand": tau_hand,
               "neutral_axis": {"s": [], "tau_fe": [], "tau_hand": []}}
    res = Result(case=case.name, kind="section", title=case.title, units=_units(case),
                 mesh=None, verdict="inconclusive", findings=[], timings=Timings(),
                 convergence=None, section=section, hand_method=method,
                 tolerance=case.check.tolerance, hand_calculation=lines)
    return res, lines


def hand_check(case: Case, out: Path) -> str:
    """Write results.json (FE figures null) into `out`; return the calculation text."""
    res, lines = (beam_hand_result if case.kind == "beam" else section_hand_result)(case)
    d = res.to_dict()
    d["mesh"] = {"nodes": None, "elements": None, "dofs": None, "size": None, "order": None}
    d["convergence"] = {"sizes": [], "tau_max": [], "observed_order": None,
                        "extrapolated": None, "gci": None, "singular": False}
    d["verdict"] = "inconclusive"
    d["note"] = "hand side only: no FE was run, so no verdict on the hand method is possible"
    if case.kind == "beam":
        d["peak"] = {k: None for k in ("tau_max", "tau_at", "von_mises_max", "von_mises_at",
                                       "principal_max", "principal_at")}
        d["equilibrium"] = {"applied": None, "reactions": None, "relative_error": None}
    with staged_output(Path(out)) as stage:
        write_json(d, stage / "results.json")
    return "\n".join(lines)
