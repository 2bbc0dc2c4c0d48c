"""The design note's joints block: the table and the hand shear flow written out.

Every number comes from ``result.joints`` (fem.section.joints.JointFlow.to_dict) and
``result.section['hand_properties']``; nothing is recomputed here.
"""

from __future__ import annotations

import math
from typing import Any

from fem.report.blocks import Block, Section, Table, sci

__all__ = ["joint_section", "plane_section"]


def _check_text(j: dict, F: str, L: str, S: str) -> str:
    parts = []
    if j.get("demand") is not None:
        parts.append(f"q·s = {sci(j['demand'])} {F}"
                     + (f" vs C = {sci(j['capacity'])} {F}" if j.get("capacity") else ""))
    if j.get("max_spacing") is not None:
        parts.append(f"s_max = C/q = {sci(j['max_spacing'])} {L}")
    if j.get("throat_stress") is not None:
        parts.append(f"τ_throat = q/({j['welds']}·{sci(j['throat'])}) = "
                     f"{sci(j['throat_stress'])} {S}")
    return "; ".join(parts) or "–"


def _written_out(j: dict, hp: dict, V: tuple[float, float], L: str, F: str) -> str:
    """The hand shear flow of one joint with its numbers."""
    if j.get("q_hand") is None:
        return (f"{j['name']}: the line alone cuts off no part and the section is not "
                f"symmetric about the line of the shear: statically indeterminate "
                f"(closed cell), no VQ/I; FE q = {sci(j['q_fe'])} {F}/{L}.")
    cx, cy = j["part_centroid"]
    A = j["part_area"]
    second = (f" together with the axis of symmetry {j['second_cut']} (q = 0 there by "
              "symmetry)" if j.get("second_cut") else "")
    simple_y = V[0] == 0.0 and abs(hp["Ixy"]) <= 1e-9 * max(hp["Ixx"], hp["Iyy"])
    simple_x = V[1] == 0.0 and abs(hp["Ixy"]) <= 1e-9 * max(hp["Ixx"], hp["Iyy"])
    head = (f"{j['name']}: part cut off by the line{second}: A = {sci(A)} {L}², centroid "
            f"({sci(cx)}, {sci(cy)}) {L}; section centroid ({sci(hp['cx'])}, {sci(hp['cy'])})"
            f" {L}")
    if simple_y:
        return (f"{head}\n  Q = A (y − ȳ) = {sci(A)} × {sci(cy - hp['cy'])} = {sci(j['Qx'])} "
                f"{L}³;  q = V Q / I = {sci(V[1])} × {sci(j['Qx'])} / {sci(hp['Ixx'])} = "
                f"{sci(j['q_hand'])} {F}/{L}")
    if simple_x:
        return (f"{head}\n  Q = A (x − x̄) = {sci(A)} × {sci(cx - hp['cx'])} = {sci(j['Qy'])} "
                f"{L}³;  q = V Q / I = {sci(V[0])} × {sci(j['Qy'])} / {sci(hp['Iyy'])} = "
                f"{sci(j['q_hand'])} {F}/{L}")
    return (f"{head}\n  Qx = {sci(j['Qx'])} {L}³, Qy = {sci(j['Qy'])} {L}³;  q = a Qy + b Qx "
            f"with (a, b) = [[Iyy, Ixy], [Ixy, Ixx]]⁻¹ (Vx, Vy) = {sci(j['q_hand'])} {F}/{L}")


def joint_section(res: Any) -> Section | None:
    """'Joints' for a result with joint lines, else None."""
    r = res.result
    joints = getattr(r, "joints", None)
    if not joints:
        return None
    u = r.units
    L, F, S = u["length"], u["force"], u["stress"]
    sec = r.section or {}
    hp = sec.get("hand_properties") or {}
    V = tuple(sec.get("V_solved") or map(res.case.units.user_force, res.case.shear))
    s = Section("Joints: shear flow across welds, bolt rows and glue lines")
    s.items.append(Block(
        "q is the shear force per unit length of the member carried across each joint line. "
        "Hand: q = VQ/I with Q the first moment of the part the line cuts off (shear flow in "
        "built-up members; common practice). FE: the flow of the FE shear stress across the "
        "line, ∫τ·n ds, taken as a domain integral about the line so that the singular "
        "stress where a joint meets a re-entrant corner does not spoil it. Fastener and weld "
        "checks use the larger of the two. All plates are one material (the case's)."))
    tol = r.tolerance
    rows, marked = [], set()
    for k, j in enumerate(joints):
        ratio = j.get("ratio")
        if ratio is not None and ratio > 1.0 + tol:
            marked.add(k)
        Q = j.get("Q")
        rows.append([j["name"],
                     f"({sci(j['from'][0])}, {sci(j['from'][1])}) – "
                     f"({sci(j['to'][0])}, {sci(j['to'][1])})",
                     sci(abs(Q)) if Q is not None and math.isfinite(Q) else "–",
                     sci(j.get("q_hand")), sci(j["q_fe"]),
                     f"{ratio:.3f}" if ratio is not None else "–",
                     _check_text(j, F, L, S)])
    s.items.append(Table(["joint", f"line [{L}]", f"|Q| [{L}³]", f"q hand [{F}/{L}]",
                          f"q FE [{F}/{L}]", "FE / hand", "fasteners / welds"], rows,
                         f"Joints (ratio above {1 + tol:.2f} marked)", marked))
    s.items.append(Block("\n".join(_written_out(j, hp, V, L, F) for j in joints), "formula"))
    return s


def plane_section(res: Any) -> Section | None:
    """'Longitudinal shear on planes' for a member with ``check.planes``, else None."""
    r = res.result
    planes = getattr(r, "planes", None)
    if not planes:
        return None
    L, F = r.units["length"], r.units["force"]
    s = Section("Longitudinal shear on planes (glue lines, weld lines)")
    s.items.append(Block(
        "Along each horizontal plane the FE longitudinal shear per unit length τxy·t is set "
        "against q = VQ/I at the same x (Q of the material above the plane; common "
        "practice), and the total between the first and last station against the hand "
        "change of the force in the part above, ΔF = Δ(MQ/I)."))
    rows = []
    for p in planes:
        x = p["x"]
        k = min(range(len(x)), key=lambda i: abs(x[i] - 0.5 * (x[0] + x[-1])))
        ratio = p["q_fe"][k] / p["q_hand"][k] if p["q_hand"][k] else None
        rows.append([sci(p["y"]), sci(x[k]), sci(p["q_fe"][k]), sci(p["q_hand"][k]),
                     f"{ratio:.3f}" if ratio is not None else "–", sci(p["total_fe"]),
                     sci(p["total_hand"])])
    s.items.append(Table([f"plane y [{L}]", f"x mid [{L}]", f"q FE [{F}/{L}]",
                          f"VQ/I [{F}/{L}]", "FE / hand", f"∫q dx FE [{F}]",
                          f"ΔF hand [{F}]"], rows, "Planes, at mid-length and in total"))
    return s
