"""The design note of a check: one self-contained HTML file and a PDF, from the same content.

`design_note(res, figures)` gathers what an engineer needs to follow and defend the check,
in order: a first page that is the summary (the verdict in plain words, the findings in
short, the comparison table and the key figure), then the findings in full, the inputs,
the hand calculation (the governing cut written out with its numbers and units, every cut
in one table), the FE model and its equilibrium, FE against hand per cut, the deflection,
the convergence study, the other figures (in `FIGURE_ORDER`, so upright ones pair side by
side), the assumptions with the caution, and the provenance and the case file as run in
two appendices. Every number comes from the result dataclasses (`fem.results`) or, for
the geometry of a cut, the hand side of the finest level (`fem.member.hand.CutHand`), so
each can be traced by name. `fem.report.html` renders the note as one page with the
figures as data URIs and the styles inline (no external file, link, script or font);
`fem.report.pdf` typesets the same note on A4 pages with ReportLab.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any

from classical.bending import shear_yield
from fem.case.project import PROJECT_FIELDS, PROJECT_LABELS
from fem.provenance import case_file_name
from fem.report.blocks import Block, Figure, Note, Section, Table, sci
from fem.report.convergence_figure import quantity_label
from fem.report.html import render_html
from fem.report.joint_note import joint_section, plane_section
from fem.report.section_note import (
    section_comparison,
    section_fe,
    section_hand,
    section_verdict_words,
)
from fem.results import CAUTION, atomic_write

__all__ = ["design_note", "write_report", "title_block", "governing_cut", "figure_order",
           "KEY_FIGURES", "FIGURE_ORDER", "PDF_MISSING"]

# ----------------------------------------------------------------------------- content

def _units(res: Any) -> tuple[str, str, str]:
    u = res.result.units
    return u["length"], u["force"], u["stress"]


def _where(p: Any) -> str:
    if p.edge:
        return f"{p.edge} edge"
    if p.start is not None:
        return f"from ({p.start[0]:g}, {p.start[1]:g}) to ({p.end[0]:g}, {p.end[1]:g})"
    if p.hole is not None:
        return f"pin bearing on hole {p.hole}"
    if p.width == 0:
        return f"point at ({p.at[0]:g}, {p.at[1]:g})"
    return f"patch at ({p.at[0]:g}, {p.at[1]:g}), width {p.width:g}"


def _inputs(res: Any) -> Section:
    c, (L, F, S) = res.case, _units(res)
    m, g = c.material, c.geometry
    s = Section("Inputs")
    s.items.append(Table(["item", "value"], [
        ["case file", case_file_name(c.file)], ["kind", c.kind],
        ["units", f"length {L}, force {F}, stress {S}"],
        ["material", f"E = {sci(m.E)} {S}, ν = {m.nu:g}"
         + (f", thickness t = {m.thickness:g} {L}" if c.kind == "beam" else "")
         + (f", yield {m.yield_stress:g} {S}" if m.yield_stress else "")],
        ["model", m.model],
        ["mesh", f"size {c.mesh.size:g} {L}, order {c.mesh.order}, {c.mesh.levels} level(s) "
                 f"halving the size, at most {c.mesh.max_dofs} dofs"
         + "".join(f"; refined to {r.size:g} {L} within {r.radius:g} {L} of "
                   f"({r.at[0]:g}, {r.at[1]:g})" for r in c.mesh.refine)],
        ["hand method", f"{c.check.method}, tolerance {c.check.tolerance:.0%}"
         + (f", your hand value {c.check.hand_value:g} {S}" if c.check.hand_value else "")],
    ], "Case data"))
    if c.kind != "beam":
        s.items.append(Table(["parameter", f"value [{L}]"],
                             [[k, str(v)] for k, v in g.params.items()],
                             f"Section: {g.shape}"))
        vx, vy = (c.units.user_force(v) for v in c.shear)   # as in the case file
        s.items.append(Block(f"Shear force [Vx, Vy] = [{vx:g}, {vy:g}] {F}, "
                             "through the shear centre."))
        return s
    rows = [["outline", f"rectangle {g.length:g} × {g.depth:g} {L} (x from 0, y from 0)"
             if g.shape == "rectangle" else f"polygon of {len(g.points)} points"]]
    rows += [[f"hole {k}", f"centre ({h.center[0]:g}, {h.center[1]:g}) {L}, radius "
              f"{h.radius:g} {L}"] for k, h in enumerate(g.holes)]
    rows += [[f"cut-out {k}", f"corner ({q.corner[0]:g}, {q.corner[1]:g}), size "
              f"{q.size[0]:g} × {q.size[1]:g} {L}, fillet {q.fillet:g} {L}"]
             for k, q in enumerate(g.cutouts)]
    rows += [[f"zone {k}", f"corner ({z.corner[0]:g}, {z.corner[1]:g}), size {z.size[0]:g} × "
              f"{z.size[1]:g} {L}, thickness {z.thickness:g} {L}"] for k, z in enumerate(g.zones)]
    s.items.append(Table(["part", "description"], rows, "Geometry"))
    s.items.append(Table(["support", "where", "restrains"],
                         [[f"support-{k}", _where(p.where), p.fix]
                          for k, p in enumerate(c.supports)], "Supports"))
    s.items.append(Table(["load", "where", f"force (Fx, Fy) [{F}]", "distribution"],
                         [[f"load-{k}", _where(q.where),
                           f"({sci(c.units.user_force(q.force[0]))}, "
                           f"{sci(c.units.user_force(q.force[1]))})",
                           q.distribution] for k, q in enumerate(c.loads)], "Loads"))
    return s


def _governing(cuts: list[Any]) -> tuple[int, str]:
    """The cut the note writes out in full and why, in the note's words: the one with the
    largest FE/hand ratio; where no cut has a ratio, the one with the largest hand shear
    stress, and where no cut carries shear either (a bar in tension), the largest normal
    stress."""
    rated = [k for k, c in enumerate(cuts) if c.ratio is not None]
    if rated:
        return max(rated, key=lambda k: cuts[k].ratio), "governs: largest FE/hand ratio"
    k = max(range(len(cuts)), key=lambda k: (abs(cuts[k].tau_max_hand or 0.0),
                                             abs(cuts[k].sigma_x_max_hand or 0.0)))
    return k, ("governs: largest hand shear stress" if cuts[k].tau_max_hand
               else "no shear at any cut: largest normal stress")


def governing_cut(cuts: list[Any]) -> int:
    """Index of the cut the note writes out in full (`_governing`)."""
    return _governing(cuts)[0]


def _strip_ranges(sec: Any) -> str:
    return ", ".join(f"{sci(y0)}–{sci(y1)}" for y0, y1, _ in sec.strips)


def _worked_cut(k: int, c: Any, h: Any, r: Any, why: str, L: str, F: str, S: str) -> Block:
    """Cut `k` (1-based) written out, every value with its unit, so the arithmetic reads
    right whatever the force and stress units. Forces and stresses from the result
    (`c`, a `CutResult`); only the geometry (Q, b, strips, c) from the hand side (`h`)."""
    sec, yq = h.section, h.y_at_tau_max
    Q, b, cfib = float(sec.first_moment(yq)), float(sec.width(yq)), sec.fibre_distance()
    A2, A3, A4, FL = f"{L}²", f"{L}³", f"{L}⁴", f"{F}·{L}"
    strips = " + ".join(f"{t:g} {L} × {sci(y1 - y0)} {L}" for y0, y1, t in sec.strips)
    N = abs(c.N_hand) > 0
    lines = [
        f"Cut {k} ({why}), x = {c.x:g} {L}: material from y = "
        + ", ".join(f"{sci(y0)} to {sci(y1)}" for y0, y1, _ in sec.strips) + f" {L}",
        f"  A = Σ t·h = {strips} = {sci(c.A)} {A2}",
        f"  ȳ = {sci(c.centroid_y)} {L};   I = Σ t[(y₁−ȳ)³ − (y₀−ȳ)³]/3 = {sci(c.I)} {A4}",
        f"  V = {sci(c.V_hand)} {F};   M = {sci(c.M_hand)} {FL}"
        + (f";   N = {sci(c.N_hand)} {F}" if N else ""),
        f"  at y = {sci(yq)} {L}:  Q = {sci(Q)} {A3},  b = {sci(b)} {L}",
        f"  τ = VQ/(Ib) = {sci(abs(c.V_hand))} {F} × {sci(Q)} {A3} / ({sci(c.I)} {A4} × "
        f"{sci(b)} {L}) = {sci(c.tau_formula_hand)} {S}",
        f"  V/A = {sci(abs(c.V_hand))} {F} / {sci(c.A)} {A2} = {sci(c.tau_avg_hand)} {S}",
        ("  σ = |N|/A + |M|c/I = " f"{sci(abs(c.N_hand))} {F} / {sci(c.A)} {A2} + "
         if N else "  σ = |M|c/I = ")
        + f"{sci(abs(c.M_hand))} {FL} × {sci(cfib)} {L} / {sci(c.I)} {A4} = "
        + f"{sci(c.sigma_x_max_hand)} {S}   (c = {sci(cfib)} {L}, extreme fibre from ȳ)",
    ]
    if r.hand_method != "shear-formula":
        lines.append(f"  hand value of the {r.hand_method} method: {sci(c.tau_max_hand)} {S}")
    return Block("\n".join(lines), "formula")


def _cut_table(r: Any, hands: list[Any], worked: int, L: str, F: str, S: str) -> Table:
    """Every cut's hand calculation in one row: section, forces, the shear formula at its
    worst level, V/A and the bending stress, each column with its unit; the row of the
    cut written out (index `worked`) highlighted."""
    N = any(abs(c.N_hand) > 0 for c in r.cuts)
    method = r.hand_method != "shear-formula"
    head = ["cut", f"x [{L}]", f"material y [{L}]", f"A [{L}²]", f"ȳ [{L}]", f"I [{L}⁴]",
            f"V [{F}]", f"M [{F}·{L}]", *([f"N [{F}]"] if N else []), f"y at τmax [{L}]",
            f"Q [{L}³]", f"b [{L}]", f"τ = VQ/(Ib) [{S}]", f"V/A [{S}]",
            f"σ = |N|/A + |M|c/I [{S}]" if N else f"σ = |M|c/I [{S}]",
            *([f"hand value, {r.hand_method} [{S}]"] if method else [])]
    rows = []
    for k, (c, h) in enumerate(zip(r.cuts, hands, strict=True), start=1):
        sec, yq = h.section, h.y_at_tau_max
        rows.append([str(k), f"{c.x:g}", _strip_ranges(sec), sci(c.A), sci(c.centroid_y),
                     sci(c.I), sci(c.V_hand), sci(c.M_hand),
                     *([sci(c.N_hand)] if N else []), sci(yq),
                     sci(float(sec.first_moment(yq))), sci(float(sec.width(yq))),
                     sci(c.tau_formula_hand), sci(c.tau_avg_hand), sci(c.sigma_x_max_hand),
                     *([sci(c.tau_max_hand)] if method else [])])
    return Table(head, rows, f"Hand calculation at every cut, the same steps as cut "
                 f"{worked + 1} above (highlighted)", marked={worked})


def _hand(res: Any) -> Section:
    """The method in words, the governing cut written out with its numbers, then every
    cut in one table."""
    (L, F, S), r = _units(res), res.result
    if res.case.kind != "beam":
        return section_hand(res)
    s = Section("Hand calculation")
    words = ("At each cut x the section is the stack of material strips met by the vertical "
             "line (width b = plate thickness t). V and M come from statics of the member as a "
             "beam on the idealised supports; M is taken about the centroid of the cut. The "
             "shear formula τ = VQ/(Ib) is evaluated over the depth and its largest value is "
             "shown; Q is the first moment of the area above that level about the centroid.")
    hands = res.run.finest.cuts_hand if res.run is not None else []
    if not r.cuts or len(hands) != len(r.cuts):
        s.items.append(Block(words))
        return s
    k, why = _governing(r.cuts)
    if len(r.cuts) > 1:
        words += (f" Cut {k + 1} ({why}) is written out; the other cuts follow the same "
                  "steps, tabulated below.")
    s.items.append(Block(words))
    s.items.append(_worked_cut(k + 1, r.cuts[k], hands[k], r, why, L, F, S))
    s.items.append(_cut_table(r, hands, k, L, F, S))
    return s


def _fe(res: Any) -> Section:
    (L, F, S), r = _units(res), res.result
    s = Section("Finite-element model")
    m = r.mesh
    rows = []
    if m is not None:
        elem = (f"{'quadratic (6-node)' if m.order == 2 else 'linear (3-node)'} triangles"
                + (", curved edges" if m.curved else ""))
        rows += [["elements", f"{m.elements} {elem}"], ["nodes", str(m.nodes)],
                 ["degrees of freedom", str(m.dofs)],
                 ["element size (finest level)", f"{m.size:g} {L}"]]
    e = r.equilibrium
    if e is not None:
        ref = math.hypot(*e.applied)
        rows += [["applied load (Fx, Fy)",
                  f"({sci(e.applied[0], ref=ref)}, {sci(e.applied[1], ref=ref)}) {F}"],
                 ["support reactions (Rx, Ry)",
                  f"({sci(e.reactions[0], ref=ref)}, {sci(e.reactions[1], ref=ref)}) {F}"],
                 ["equilibrium error |ΣF|/|F|", f"{e.relative_error:.1e}"]]
    t = r.timings
    rows.append(["time: mesh / assemble / solve / post",
                 f"{t.mesh:.2f} / {t.assemble:.2f} / {t.solve:.2f} / {t.post:.2f} s"])
    s.items.append(Table(["item", "value"], rows))
    if r.peak is not None:
        s.items.append(_peaks_table(r.peak, res.case.material.yield_stress, L, S))
    return s


def _peaks_table(p: Any, fy: float | None, L: str, S: str) -> Table:
    """The FE peaks; with a yield stress fy, the shear peak against the von Mises shear
    yield fy/√3 (`classical.bending.shear_yield`) and the von Mises peak against fy."""
    head = ["quantity", f"FE peak [{S}]", f"at (x, y) [{L}]"]
    rows = [["|τxy|", p.tau_max, p.tau_at], ["von Mises σvm", p.von_mises_max, p.von_mises_at],
            ["max principal σ1", p.principal_max, p.principal_at]]
    if fy:
        tau_y = shear_yield(fy)
        head.append("utilisation")
        rows[0].append(f"τ/(fy/√3) = {p.tau_max / tau_y:.0%}")
        rows[1].append(f"σvm/fy = {p.von_mises_max / fy:.0%}")
        rows[2].append("–")
    body = [[name, sci(v), f"({sci(at[0])}, {sci(at[1])})", *rest]
            for name, v, at, *rest in rows]
    caption = "Peaks outside the excluded zones (finest mesh)"
    if fy:
        caption += (f"; utilisation of the shear peak against the von Mises shear yield "
                    f"fy/√3 = {sci(shear_yield(fy))} {S}, of the von Mises peak against the "
                    f"yield stress fy = {fy:g} {S}")
    return Table(head, body, caption)


def _comparison_tables(res: Any) -> list[Table]:
    """The comparison tables of a beam: peak stresses per cut, then resultants per cut."""
    (L, F, S), r = _units(res), res.result
    tol = r.tolerance
    forces, stresses, bad = [], [], set()
    for i, c in enumerate(r.cuts, start=1):
        over = c.ratio is not None and c.ratio > 1 + tol
        status = ("no hand shear" if c.ratio is None else
                  f"exceeds by {c.ratio - 1:.0%}" if over else "within tolerance")
        if over:
            bad.add(i - 1)
        forces.append([str(i), f"{c.x:g}", sci(c.V_fe), sci(c.V_hand), sci(c.M_fe),
                       sci(c.M_hand), sci(c.N_fe), sci(c.N_hand)])
        stresses.append([str(i), f"{c.x:g}", sci(c.tau_max_fe), sci(c.y_at_tau_max_fe),
                         sci(c.tau_max_hand), "–" if c.ratio is None else f"{c.ratio:.3f}",
                         status, sci(c.sigma_x_max_fe), sci(c.sigma_x_max_hand)])
    return [Table(
        ["cut", f"x [{L}]", f"τmax FE [{S}]", f"at y [{L}]", f"τ hand [{S}]", "FE / hand",
         "shear check", f"|σx| max FE [{S}]", f"|σx| max hand [{S}]"], stresses,
        f"Peak stresses at each cut: τ hand is the {r.hand_method} value, FE from the finest "
        f"mesh; tolerance {tol:.0%}", marked=bad), Table(
        ["cut", f"x [{L}]", f"V FE [{F}]", f"V hand [{F}]", f"M FE [{F}·{L}]",
         f"M hand [{F}·{L}]", f"N FE [{F}]", f"N hand [{F}]"], forces,
        "Resultants at each cut: FE integrated over the cut, hand from statics")]


def _comparison(res: Any) -> tuple[Table | None, Section]:
    """The headline comparison table (for the summary) and the section with the rest."""
    if res.case.kind != "beam":
        sec = section_comparison(res)
        tables = [it for it in sec.items if isinstance(it, Table)]
        head = tables[0] if tables else None
        sec.items = [it for it in sec.items if it is not head]
        return head, sec
    stresses, forces = _comparison_tables(res)
    return stresses, Section("FE against hand", [forces])


def _deflection(res: Any) -> Section | None:
    """FE displacements beside the beam-theory deflection (informative, not the verdict)."""
    d = res.result.deflection
    if not d:
        return None
    L = res.result.units["length"]
    s = Section("Deflection (informative)")
    how = (f"Beam theory: {d['method']}." if d.get("hand") is not None else
           f"No beam-theory value: {d['method'].removeprefix('no hand value: ')}.")
    s.items.append(Block(
        f"Largest FE displacement |u| = {sci(d['max_fe'])} {L} at ({sci(d['at'][0])}, "
        f"{sci(d['at'][1])}) {L}, finest mesh. The deflection does not enter the shear "
        f"verdict. {how}"))
    rows = [[r["load"], sci(r["fe"][0], ref=d["max_fe"]), sci(r["fe"][1], ref=d["max_fe"]),
             sci(r["hand"]), "–" if r["ratio"] is None else f"{r['ratio']:.3f}"]
            for r in d.get("loads", [])]
    s.items.append(Table(["load", f"FE ux [{L}]", f"FE uy [{L}]", f"hand uy [{L}]",
                          "FE / hand"], rows,
                         "Displacement at each load: FE mean over the loaded stretch (the "
                         "node of a point load); hand: Timoshenko beam, bending plus shear"))
    return s


def _verdict_words(res: Any) -> str:
    r = res.result
    tol = r.tolerance
    if r.kind == "beam" and r.cuts:
        over = [c for c in r.cuts if c.ratio is not None and c.ratio > 1 + tol]
        worst = max((c for c in r.cuts if c.ratio is not None), key=lambda c: c.ratio,
                    default=None)
        L = r.units["length"]
        if r.verdict == "unsafe" and over and worst is not None:
            return (f"The {r.hand_method} check is unsafe for this member: the FE shear stress "
                    f"exceeds the hand value by more than {tol:.0%} at {len(over)} of "
                    f"{len(r.cuts)} cuts, by up to {worst.ratio - 1:.0%} at x = {worst.x:g} {L}.")
        if r.verdict == "holds" and worst is not None:
            return (f"The {r.hand_method} check holds: at no cut does the FE shear stress exceed "
                    f"the hand value by more than {tol:.0%} (largest ratio {worst.ratio:.3f} at "
                    f"x = {worst.x:g} {L}), and the governing FE figure has converged.")
    if r.kind == "section":
        words = section_verdict_words(res)
        if words:
            return words
    reasons = {"unsafe": "the FE exceeds the hand value beyond the tolerance (see findings)",
               "holds": "the FE stays within the tolerance of the hand value",
               "inconclusive": "the governing FE figure has not converged, only one mesh was "
                               "run, or a singular point governs (see findings)"}
    return f"Verdict {r.verdict}: {reasons.get(r.verdict, '')}."


def _short(message: str, limit: int = 200) -> str:
    """A finding's where and how much: its text up to the first ': ' or '; ' (the why
    follows there), at most about `limit` characters."""
    head = re.split(r": |; ", message, maxsplit=1)[0].rstrip(".")
    if len(head) > limit:
        head = head[:limit].rsplit(" ", 1)[0] + " …"
    return head + "."


def _findings(res: Any) -> tuple[list[Block], Section | None]:
    """The summary's verdict and findings in short, and the findings in full."""
    r = res.result
    out = [Block(f"{r.verdict.upper()}. {_verdict_words(res)}", f"verdict-{r.verdict}")]
    main = [f for f in r.findings if f.kind != "excluded"]
    out += [Block(f"{f.kind}: {_short(f.message)}", "finding") for f in main]
    if not main:
        out.append(Block("No findings."))
        return out, None
    full = Section("Findings in full", [Block(f"{f.kind}: {f.message}", "finding")
                                        for f in main])
    return out, full


def _excluded(res: Any) -> Table | None:
    r = res.result
    excl = [f for f in r.findings if f.kind == "excluded"]
    if not excl:
        return None
    rows = []
    for f in excl:
        m = re.search(r"within (\S+) .*left out: (.*) is an idealisation", f.message)
        rows.append([f"({sci(f.at[0])}, {sci(f.at[1])})", m[1] if m else "",
                     m[2] if m else f.message])
    L = r.units["length"]
    return Table([f"centre (x, y) [{L}]", f"radius [{L}]", "idealisation"], rows,
                 "Left out of the peaks: zones around boundary idealisations, whose local "
                 "stress has no finite limit")


def _convergence(res: Any) -> Section:
    r, (L, _, S) = res.result, _units(res)
    s = Section("Convergence study")
    cv = r.convergence
    if cv is None or len(cv.sizes) < 2:
        s.items.append(Block("One mesh only: the FE figures carry no discretisation error "
                             "estimate. Set mesh.levels to 3 for a convergence study."))
        return s
    s.items.append(Block(
        f"Each level halves the element size. Governing quantity: "
        f"{quantity_label(cv.quantity, L)}: "
        f"extrapolated {sci(cv.extrapolated)} {S}, fine-grid GCI "
        f"{'n/a' if cv.gci is None else f'{cv.gci:.2%}'} (Celik et al. 2008; converged when "
        f"within 5 % and monotone, or changing by less than 0.5 % between the two finest "
        f"meshes): {'converged' if cv.converged else 'not converged'}."))
    head = ["quantity"] + [f"h = {h:g}" for h in cv.sizes] + ["order", "extrapolated", "GCI",
                                                             "converged"]
    rows = [["dofs"] + [str(d) for d in cv.dofs] + ["", "", "", ""]] if cv.dofs else []
    marked = set()
    governing = {"values": cv.tau_max, "observed_order": cv.observed_order,
                 "extrapolated": cv.extrapolated, "gci": cv.gci, "converged": cv.converged,
                 "singular": cv.singular}
    quantities = {k: ({**governing, **q} if list(q["values"]) == list(cv.tau_max) else q)
                  for k, q in cv.quantities.items()}
    if not any(list(q["values"]) == list(cv.tau_max) for q in quantities.values()):
        quantities = {cv.quantity: governing, **quantities}
    for name, q in quantities.items():
        gci = q.get("gci")
        if list(q["values"]) == list(cv.tau_max):
            marked.add(len(rows))
        rows.append([quantity_label(name, L)] + [sci(v) for v in q["values"]]
                    + [sci(q.get("observed_order"), 3), sci(q.get("extrapolated")),
                       "–" if gci is None else f"{gci:.2%}",
                       ("singular" if q.get("singular") else "–" if "converged" not in q
                        else "yes" if q["converged"] else "no")])
    s.items.append(Table(head, rows, f"Stresses in {S}, sizes h in {L}; the governing "
                         "quantity is highlighted", marked=marked))
    return s


def _assumptions(res: Any) -> Section:
    c = res.case
    if c.kind == "beam":
        model = ("plane stress (thin plate, σzz = 0)" if c.material.model == "plane-stress"
                 else "plane strain (εzz = 0)")
        lines = [
            f"Two-dimensional model of the member in its plane, {model}.",
            "Linear elastic, isotropic material; small strains and displacements; static load.",
            "Supports and loads as idealised in the case: point supports, point loads and the "
            "ends of clamped or loaded stretches have no finite local stress, so small zones "
            "around them are left out of the peaks.",
            "Hand values follow elementary beam theory (plane sections remain plane) on the "
            "idealised supports, with the section of each cut.",
            "Stresses are recovered at element vertices and averaged at nodes for contours and "
            "peaks; cut profiles interpolate the element stresses.",
        ]
    else:
        lines = ["Saint-Venant flexure of a prismatic bar: linear elastic, isotropic, small "
                 "strain; the shear acts through the shear centre (no twist).",
                 "Hand values: the shear formula VQ/(Ib) at its worst cut and the average V/A."]
    s = Section("Assumptions and limits")
    s.items += [Block(t, "bullet") for t in lines]
    s.items.append(Block(CAUTION, "caution"))
    return s


_CAPTIONS = {"model": "The model as solved: outline, holes, zones, supports, loads with "
                      "their resultants, cuts, refinements and the first level's mesh.",
             "shear-contour": "Shear stress τxy over the member (finest mesh), with the cuts, "
                              "supports, loads and the excluded zones.",
             "von-mises-contour": "Von Mises stress over the member (finest mesh).",
             "ratio-along-member": "FE peak |τxy| of every vertical section against the hand "
                                   "value at the same x (finest mesh), their ratio with the "
                                   "1 + tolerance line, unsafe stretches shaded and excluded "
                                   "zones greyed (not judged).",
             "section-shear": "Shear stress magnitude |τ| over the section under the case's "
                              "shear, with the shear flow (arrows) and the FE peak.",
             "neutral-axis-profile": "FE and hand shear stress along the neutral axis.",
             "profiles": "Shear stress τxy over the depth at every cut: FE (finest mesh) "
                         "against the shear formula VQ/(Ib); each cut's figure with σx too is "
                         "in the output folder (profile-NN.png).",
             "mesh": "The finest mesh, with the refinement at the supports, loads, holes "
                     "and corners.",
             "section-flow": "Shear flow over the section: arrows give the direction and size "
                             "of τ, colour |τ|; centroid (+), shear centre (×) and the joint "
                             "lines with their FE shear flow.",
             "planes": "Longitudinal shear per unit length on each plane (check.planes): "
                       "FE τxy·t against VQ/I along the member, excluded zones greyed.",
             "wall-flow": "Shear flow along each wall's centre line: the FE stress averaged "
                          "through the wall against thin-wall theory (Megson, Ch. 16-17).",
             "convergence": "Convergence: the governing FE figure against element size with "
                            "the extrapolated value and the GCI band; every tracked quantity's "
                            "distance from its extrapolated value."}


def _caption(res: Any, p: Path) -> str:
    if p.stem in _CAPTIONS:
        return _CAPTIONS[p.stem]
    if p.stem.startswith("profile-") and res.result.cuts:
        k = int(p.stem.split("-")[1])
        if k <= len(res.result.cuts):
            return (f"Cut {k} at x = {res.result.cuts[k - 1].x:g} {res.result.units['length']}: "
                    "FE and hand shear and normal stresses over the depth.")
    return p.stem.replace("-", " ").capitalize() + "."


KEY_FIGURES = ("ratio-along-member", "section-shear", "shear-contour")

# the figures after the summary, in an order that pairs the upright ones side by side:
# model beside mesh, the two contour plots, the section's own figures, then the wide ones
FIGURE_ORDER = ("model", "mesh", "shear-contour", "von-mises-contour", "section-shear",
                "section-flow", "neutral-axis-profile", "wall-flow", "profiles", "planes",
                "convergence")


def figure_order(figs: list[Figure]) -> list[Figure]:
    """`figs` in `FIGURE_ORDER`; a figure not named there goes before the convergence
    figure, in the order given."""
    last = FIGURE_ORDER.index("convergence")
    return sorted(figs, key=lambda f: FIGURE_ORDER.index(f.path.stem)
                  if f.path.stem in FIGURE_ORDER else last - 0.5)


def _key_figure(figs: list[Figure]) -> Figure | None:
    """The summary's figure: the ratio along the member (beams), the section's |τ|."""
    for stem in KEY_FIGURES:
        for f in figs:
            if f.path.stem == stem:
                return f
    return figs[0] if figs else None


def title_block(project: Any) -> list[tuple[str, str]]:
    """(label, value) of every title-block field but notes; blank where not given."""
    return [(PROJECT_LABELS[k], getattr(project, k, "") if project is not None else "")
            for k in PROJECT_FIELDS if k != "notes"]


def _appendix(res: Any) -> list[Section]:
    """Provenance (versions, case hash, time) and the case file exactly as run."""
    c, prov = res.case, res.result.provenance or {}
    name = case_file_name(c.file)
    out = []
    if prov:
        pairs = [("shearcheck", prov.get("shearcheck")), ("Python", prov.get("python"))]
        pairs += list((prov.get("packages") or {}).items())
        pairs += [("run (UTC)", prov.get("run_utc")), ("platform", prov.get("platform"))]
        per_row = 3   # (software, version) pairs side by side, read down each pair
        n = -(-len(pairs) // per_row)
        pairs += [("", "")] * (n * per_row - len(pairs))
        rows = [[str(v) for j in range(per_row) for v in pairs[j * n + i]] for i in range(n)]
        out.append(Section("Appendix A: provenance", [
            Table(["software", "version"] * per_row, rows, "What produced this note"),
            Block(f"Case file {prov.get('case_file')}, SHA-256 {prov.get('case_sha256')}; "
                  f"run {prov.get('run_utc')}. Running the case file of Appendix B with these "
                  "versions reproduces this note.", "small")]))
    if c.text:
        out.append(Section(f"Appendix B: the case file {name}, exactly as run", [
            Block(c.text.replace("\r\n", "\n").rstrip("\n"), "code")]))
    return out


def design_note(res: Any, figures: list[Path]) -> Note:
    """The content of the design note of a finished check.

    First page (the summary): the verdict, the findings, the key figure and the comparison
    table; then the findings in full, the inputs, the hand calculation, the FE model, the
    rest of the comparison, the deflection, the convergence study, the other figures (a
    `pair` section: upright ones side by side), the assumptions, and the provenance and
    case file in the appendices.
    """
    r, c = res.result, res.case
    paths = [Path(p) for p in figures if Path(p).suffix == ".png"]
    if any(p.stem == "profiles" for p in paths):  # the overview stands for the cut figures
        paths = [p for p in paths if not p.stem.startswith("profile-")]
    figs = [Figure(p, _caption(res, p)) for p in paths]
    key = _key_figure(figs)
    head, rest = _comparison(res)
    short, full = _findings(res)
    summary = Section("Summary", short)
    if head is not None:
        summary.items.append(head)
    if key is not None:
        summary.items.append(key)
    fe = _fe(res) if r.kind == "beam" else section_fe(res)
    excl = _excluded(res)
    if excl is not None:
        fe.items.append(excl)
    inputs = _inputs(res)
    sections = [summary, *([full] if full is not None else []), inputs, _hand(res), fe, rest]
    sections += [j for j in (joint_section(res), plane_section(res)) if j is not None]
    defl = _deflection(res)
    if defl is not None:
        sections.append(defl)
    sections.append(_convergence(res))
    others = figure_order([f for f in figs if f is not key])
    if others:
        sections.append(Section("Figures", list(others), pair=True))
    sections.append(_assumptions(res))   # with the caution, closing the note's body
    sections += _appendix(res)
    prov = r.provenance or {}
    version = prov.get("shearcheck")
    return Note(title=r.title,
                subtitle=f"case {case_file_name(c.file)} · {r.kind} check · shearcheck"
                         + (f" {version}" if version else "")
                         + (f" · run {prov['run_utc']}" if prov.get("run_utc") else ""),
                verdict=r.verdict, sections=sections, title_block=title_block(c.project),
                remarks=c.project.notes if c.project is not None else "", caution=CAUTION)


PDF_MISSING = ("report.pdf not written: the PDF library ReportLab cannot be imported ({why}); "
               "install it with `pip install reportlab`. report.html holds the same note.")


def write_report(res: Any, folder: Path, figures: list[Path] | None = None) -> list[Path]:
    """report.html and report.pdf of a finished check into `folder`; return their paths.

    `figures` are the PNG files to include (default: those the check has written). Where
    ReportLab cannot be imported the PDF is skipped: `res.result.pdf_skipped` says why (it
    goes into results.json and the console summary), and the HTML is written all the same.
    """
    folder = Path(folder)
    note = design_note(res, list(figures if figures is not None else res.figures))
    out_html = folder / "report.html"
    atomic_write(out_html, render_html(note).encode("utf-8"))
    try:
        from fem.report.pdf import write_pdf
    except ImportError as exc:
        res.result.pdf_skipped = PDF_MISSING.format(why=exc)
        return [out_html]
    res.result.pdf_skipped = None
    out_pdf = folder / "report.pdf"
    write_pdf(note, out_pdf)
    return [out_html, out_pdf]
