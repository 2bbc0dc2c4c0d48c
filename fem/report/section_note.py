"""The design note's sections for a `kind = "section"` check (`fem.section.check`).

Every number comes from ``result.section`` (the contract's `section` object plus the
section check's extras: ``hand_properties``, ``neutral_axis``, ``cuts``, ``J``, shear
centre and coefficients); keys a result does not carry are left out, not invented.
"""

from __future__ import annotations

import math
from typing import Any

from fem.report.blocks import Block, Section, Table, sci

__all__ = ["section_hand", "section_fe", "section_comparison", "section_verdict_words"]


def _u(res: Any) -> tuple[str, str, str]:
    u = res.result.units
    return u["length"], u["force"], u["stress"]


def _pair(v: Any, ref: float = 0.0) -> str:
    if not (isinstance(v, list | tuple) and len(v) == 2):
        return "–"
    return f"({sci(v[0], ref=ref)}, {sci(v[1], ref=ref)})"


def section_hand(res: Any) -> Section:
    """Section properties, the shear, the shear formula and V/A with numbers."""
    (L, F, S), r = _u(res), res.result
    sec, c = r.section or {}, res.case
    hp = sec.get("hand_properties") or {}
    A = hp.get("A", sec.get("A"))
    Vx, Vy = c.shear          # working units (fem.case.model.Units): V/A is in S
    V = math.hypot(Vx, Vy)
    f = c.units.user_force    # forces as in the case file
    s = Section("Hand calculation")
    s.items.append(Block(
        "Properties of the section outline (exact polygon integrals); the shear formula "
        "τ = VQ/(Ib) is evaluated on cuts across the section with the exact first moment Q and "
        "width b of each, and its largest value is the hand value; V/A is the average."))
    size = math.sqrt(A) if A else 0.0  # round-off beside the section's size prints as 0
    lines = [f"Section {c.geometry.shape}: A = {sci(A)} {L}²,  centroid "
             f"{_pair([hp.get('cx', 0.0), hp.get('cy', 0.0)], size)} {L}"]
    if "Ixx" in hp:
        lines.append(f"  Ixx = ∫y² dA = {sci(hp['Ixx'])} {L}⁴;   Iyy = ∫x² dA = "
                     f"{sci(hp['Iyy'])} {L}⁴;   Ixy = ∫xy dA = "
                     f"{sci(hp['Ixy'], ref=max(hp['Ixx'], hp['Iyy']))} {L}⁴")
        if abs(hp.get("angle", 0.0)) > 1e-6:
            lines.append(f"  principal: I₁ = {sci(hp['I1'])} {L}⁴, I₂ = {sci(hp['I2'])} {L}⁴ "
                         f"at {math.degrees(hp['angle']):.3g}°")
    lines.append(f"  V = (Vx, Vy) = ({sci(f(Vx))}, {sci(f(Vy))}) {F}, |V| = {sci(f(V))} {F}, "
                 "through the shear centre")
    used = sec.get("hand_method_used", r.hand_method)
    if used == "thin-wall" and sec.get("tau_max_hand") is not None:
        lines.append(f"  thin-walled shear flow along the centre line, peak |q|/t = "
                     f"{sci(sec['tau_max_hand'])} {S}")
        if sec.get("tau_chord_hand") is not None:
            lines.append(f"  (τ = VQ/(Ib) on cuts parallel to an axis, for reference: "
                         f"{sci(sec['tau_chord_hand'])} {S})")
    elif "tau_max_hand" in sec:
        lines.append(f"  τ = VQ/(Ib), worst cut = {sci(sec['tau_max_hand'])} {S}")
    if A:
        lines.append(f"  V/A = {sci(f(V))} {F} / {sci(A)} {L}² = {sci(V / A)} {S}")
    if sec.get("hand_method_reason"):
        lines.append(f"  hand method: {used}, chosen because: {sec['hand_method_reason']}")
    if sec.get("hand") is not None and used not in ("shear-formula", "thin-wall"):
        lines.append(f"  hand value of the {r.hand_method} method: {sci(sec['hand'])} {S}")
    if c.check.hand_value:
        lines.append(f"  your own hand value: {sci(c.check.hand_value)} {S}")
    s.items.append(Block("\n".join(lines), "formula"))
    s.items += [Block(t, "formula") for t in r.hand_calculation]
    return s


def section_fe(res: Any) -> Section:
    """The section mesh, the resultant check and the section's FE constants."""
    (L, F, _), r = _u(res), res.result
    sec, m = r.section or {}, r.mesh
    rows = []
    if m is not None:
        rows += [["elements", f"{m.elements} {'quadratic' if m.order == 2 else 'linear'} "
                              "triangles"],
                 ["nodes", str(m.nodes)], ["degrees of freedom", str(m.dofs)],
                 ["element size (finest level)", f"{m.size:g} {L}"]]
    e = r.equilibrium
    size = math.sqrt(sec["A"]) if sec.get("A") else 0.0
    if e is not None:
        ref = math.hypot(*e.applied)
        rows += [["applied shear (Vx, Vy)", f"{_pair(e.applied, ref)} {F}"],
                 ["∫τ dA of the FE stresses", f"{_pair(e.reactions, ref)} {F}"],
                 ["resultant error", f"{e.relative_error:.1e}"]]
    if "J" in sec:
        rows.append(["torsion constant J", f"{sci(sec['J'])} {L}⁴"])
    if "shear_centre" in sec:
        rows.append(["shear centre (warping)", f"{_pair(sec['shear_centre'], size)} {L}"])
    if "shear_coefficients" in sec:
        rows.append(["shear coefficients (kx, ky)", _pair(sec["shear_coefficients"])])
    s = Section("Finite-element model")
    s.items.append(Table(["item", "value"], rows))
    return s


def section_comparison(res: Any) -> Section:
    """The section peak against the hand value, and FE against hand on every cut."""
    (L, _, S), r = _u(res), res.result
    sec, tol = r.section or {}, r.tolerance
    s = Section("FE against hand")
    ratio = sec.get("ratio")
    over = ratio is not None and ratio > 1 + tol
    size = math.sqrt(sec["A"]) if sec.get("A") else 0.0
    hand = sec.get("hand", sec.get("tau_max_hand"))
    reg = sec.get("tau_max_regular")
    raw = sec.get("tau_max_fe")
    corners = reg is not None and raw and abs(reg - raw) > 1e-9 * reg
    rows = [["peak |τ| away from sharp corners" if corners else "peak |τ| over the section",
             sci(reg if corners else raw),
             _pair(sec.get("tau_at_regular") if corners else sec.get("tau_at"), size),
             sci(hand), "–" if ratio is None else f"{ratio:.3f}",
             "–" if ratio is None else f"exceeds by {ratio - 1:.0%}" if over
             else "within tolerance"]]
    if corners:
        raw_ratio = sec.get("ratio_raw")
        rows.append(["peak at a sharp corner (singular: depends on the mesh)", sci(raw),
                     _pair(sec.get("tau_at"), size), "",
                     "–" if raw_ratio is None else f"{raw_ratio:.3f}", "not compared"])
    na = sec.get("neutral_axis") or {}
    if na.get("tau_fe_mean") is not None:
        hand = na.get("tau_hand")
        hand = max(hand) if isinstance(hand, list | tuple) and hand else hand
        rows.append(["mean τ on the neutral axis", sci(na["tau_fe_mean"]), "", sci(hand), "",
                     ""])
    s.items.append(Table(["quantity", f"FE [{S}]", f"at (x, y) [{L}]", f"hand [{S}]",
                          "FE / hand", "shear check"], rows,
                         f"Hand value: the {sec.get('hand_method_used', r.hand_method)} value; "
                         f"tolerance {tol:.0%}",
                         marked={0} if over else set()))
    cut_rows = []
    for k, cut in enumerate(sec.get("cuts") or [], start=1):
        fe = [abs(v) for v in cut.get("tau_fe", [])]
        hand = cut.get("tau_hand")
        hand = max(hand) if isinstance(hand, list | tuple) and hand else hand
        peak = max(fe) if fe else None
        cut_rows.append([str(k), sci(cut.get("offset")), sci(cut.get("tau_fe_mean")),
                         sci(peak), sci(hand),
                         "–" if not hand or peak is None else f"{peak / hand:.3f}"])
    if cut_rows:
        s.items.append(Table(["cut", f"offset [{L}]", f"FE mean [{S}]", f"FE max [{S}]",
                              f"VQ/(Ib) [{S}]", "FE max / hand"], cut_rows,
                             "Cuts parallel to the neutral axis, offset from the centroid"))
    return s


def section_verdict_words(res: Any) -> str | None:
    """The verdict in one sentence, or None when the result lacks the numbers."""
    r = res.result
    sec = r.section or {}
    ratio, hand = sec.get("ratio"), sec.get("hand", sec.get("tau_max_hand"))
    fe = sec.get("tau_max_regular", sec.get("tau_max_fe"))
    if ratio is None or fe is None or hand is None:
        return None
    S = r.units["stress"]
    words = {"holds": "holds for this section", "unsafe": "is unsafe for this section",
             "inconclusive": "is inconclusive for this section (see findings)"}
    used = sec.get("hand_method_used", r.hand_method)
    return (f"The {used} check {words.get(r.verdict, r.verdict)}: the FE peak "
            f"{sci(fe)} {S} is {ratio:.3f} times the hand value {sci(hand)} {S} (tolerance "
            f"{r.tolerance:.0%}).")
