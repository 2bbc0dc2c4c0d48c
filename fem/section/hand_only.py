"""`shearcheck hand` for a section: properties and hand shear stresses, written out as in a calc.

No mesh, no solve: the same hand side the FE check compares against (`classical.sections`,
`classical.shear`), with every FE figure null in results.json (`fem.api.hand_check`).
"""

from __future__ import annotations

import numpy as np

from classical.sections import (
    chord_length,
    first_moment_above,
    polygon_properties,
    section_outline,
)
from classical.shear import average_shear, direct_shear, max_shear_formula
from fem.case.model import Case
from fem.case.plates import drawn_section
from fem.results import Result, Timings, forces_to_case_unit
from fem.section.hand_method import choose_method, thin_wall_peak
from fem.section.joints import default_joints, hand_joint_lines

__all__ = ["section_hand_result"]


def _units(case: Case) -> dict[str, str]:
    return {"length": case.units.length, "force": case.units.force, "stress": case.units.stress}


def section_hand_result(case: Case) -> tuple[Result, list[str]]:
    """Section properties and hand shear stresses of a section case."""
    g = drawn_section(case.section)
    outline = section_outline(g.shape, **g.params)
    p = polygon_properties(outline)
    Vx, Vy = case.shear
    L, F, S = case.units.length, case.units.force, case.units.stress
    f = case.units.user_force   # working force units -> the case's (fem.case.model.Units)
    V = float(np.hypot(Vx, Vy))
    mx = max_shear_formula(outline, abs(Vy)) if Vy else None
    tau_formula = mx.tau_max if mx is not None else float("nan")
    avg = average_shear(V, p.A)
    choice = choose_method(case.section.shape, dict(g.params), case.check.method)
    method = choice.method
    thin = thin_wall_peak(g.shape, dict(g.params), Vx, Vy) if method == "thin-wall" else None
    if thin is not None:
        tau_hand = thin.tau
    elif method == "shear-formula":
        tau_hand = tau_formula
    elif method == "double-shear":
        tau_hand = direct_shear(V, p.A, 2)
    else:
        tau_hand = avg if method == "average" else direct_shear(V, p.A, 1)
    lines = [f"Hand calculation: {case.title} ({case.name})",
             (f"Section built-up of {len(case.section.params['plates'])} plates (one "
              f"material), outline {g.params['points']}" if case.section.shape == "built-up"
              else f"Section {g.shape} {g.params}") + f"; units {L}, {F}; stress {S}",
             f"  A = {p.A:.6g} {L}2, centroid = ({p.cx:.5g}, {p.cy:.5g}) {L}",
             f"  Ixx = {p.Ixx:.6g}, Iyy = {p.Iyy:.6g}, Ixy = {p.Ixy:.6g} {L}4",
             f"  shear V = [{f(Vx):g}, {f(Vy):g}] {F}"]
    if mx is not None:
        q = first_moment_above(outline, mx.y_at)
        b = chord_length(outline, mx.y_at)
        lines.append(f"  shear formula (Vy) worst cut y = {mx.y_at:.4g} {L}: tau = V Q/(I b) = "
                     f"{f(abs(Vy)):.6g} {F} x {q:.6g} {L}3 / ({p.Ixx:.6g} {L}4 x {b:.4g} {L}) "
                     f"= {tau_formula:.4g} {S}")
    if thin is not None:
        lines.append(f"  thin-walled shear flow along the centre line: peak |q|/t = "
                     f"{thin.tau:.4g} {S} at ({thin.at[0]:.4g}, {thin.at[1]:.4g}) {L}")
    lines += hand_joint_lines(outline, p, default_joints(case.section.shape,
                                                         dict(case.section.params),
                                                         case.check.joints),
                              (Vx, Vy), case.units)
    lines.append(f"  hand method: {method} ({choice.reason})")
    lines.append(f"  average V/A = {f(V):.6g} {F} / {p.A:.6g} {L}2 = {avg:.4g} {S}")
    if method in ("single-shear", "double-shear"):
        n = 1 if method == "single-shear" else 2
        lines.append(f"  {method}: F/({n}A) = {tau_hand:.4g} {S}")
    section = {"A": p.A, "I": {"xx": p.Ixx, "yy": p.Iyy, "xy": p.Ixy},
               "centroid": [p.cx, p.cy], "shear_centre": None, "J": None, "tau_max_fe": None,
               "tau_at": None, "tau_max_hand":
                   (thin.tau if thin else tau_formula if mx is not None else None),
               "tau_chord_hand": tau_formula if mx is not None else None,
               "tau_avg_hand": avg, "ratio": None, "tau_method_hand": tau_hand,
               "neutral_axis": {"s": [], "tau_fe": [], "tau_hand": []},
               "hand_method_used": method, "hand_method_reason": choice.reason}
    res = Result(case=case.name, kind="section", title=case.title, units=_units(case),
                 mesh=None, verdict="inconclusive", findings=[], timings=Timings(),
                 convergence=None, section=section, hand_method=method,
                 tolerance=case.check.tolerance, hand_calculation=lines)
    forces_to_case_unit(res, 1.0 / case.units.force_scale)
    return res, lines
