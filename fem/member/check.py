"""A whole check: the levels of a convergence study, comparison, verdict and result.

`check_beam(case)` runs every level (halving the element size), tracks the governing
quantities, estimates their discretisation error (GCI, `fem.convergence`), tells singular
corners from converging peaks, and returns the `Result` plus the finest `Level` for plots.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from fem.case.model import Case
from fem.case.outline import domain_polygon, reentrant_corners
from fem.case.sizing import estimate_dofs, level_size
from fem.convergence import GCI_LIMIT, SETTLED, accepted, gci_study, is_singular
from fem.errors import SolveError
from fem.member.adapt import next_size_field, representative_size
from fem.member.compare import beam_findings, cut_results, peak_result, verdict
from fem.member.concentration import Concentration, concentration_findings, concentrations
from fem.member.level import Level, excluded_zones, run_level
from fem.progress import Progress, as_progress
from fem.results import ConvergenceResult, Equilibrium, Finding, MeshInfo, Result, Timings

__all__ = ["BeamRun", "check_beam", "GCI_LIMIT", "SETTLED", "ADAPT_GROWTH"]

# elements of each adaptive level over the one before: h ratio sqrt(2.2) = 1.48, above the
# 1.3 Celik et al. (2008) ask of a refinement; bench/bench_speed.py measured 2 and 1.7
ADAPT_GROWTH = 2.2



@dataclass
class BeamRun:
    result: Result
    finest: Level
    levels: list[Level]
    concentrations: list[Concentration] = field(default_factory=list)


def _study(sizes: list[float], values: list[float]) -> dict:
    if len(values) < 2:
        return {"values": values, "observed_order": None, "extrapolated": None, "gci": None,
                "converged": False, "singular": False}
    est = gci_study(sizes, values)
    singular = is_singular(sizes, values)
    return {"values": values, "observed_order": est.observed_order,
            "extrapolated": est.extrapolated, "gci": est.gci,
            "approx_rel_error": est.approx_rel_error,
            "converged": accepted(est) and not singular,
            "singular": singular}


def _corner_peaks(level: Level, corners: list, radius: float) -> list[float]:
    p = level.field.p
    vm = level.field.nodal["von_mises"]
    out = []
    for c in corners:
        near = np.hypot(p[0] - c.at[0], p[1] - c.at[1]) <= radius
        out.append(float(vm[near].max()) if near.any() else 0.0)
    return out


def check_beam(case: Case, progress: Progress | Callable[[str], None] | None = None) -> BeamRun:
    levels: list[Level] = []
    xs = None
    n = case.mesh.levels
    work = [estimate_dofs(case, level_size(case, k)) for k in range(n)]
    prog = as_progress(progress)
    prog.start(sum(work))
    background = None  # adaptive levels: the size field from the previous level's estimate
    try:
        for k in range(n):
            size = case.mesh.size if case.mesh.adaptive else level_size(case, k)
            prog.step(f"level {k + 1}/{n}: size {size:g} {case.units.length}"
                      + (" (adaptive)" if case.mesh.adaptive and k else ""), work[k])
            lv = run_level(case, size, xs, background)
            if not lv.cuts_fe:
                raise SolveError("no cut meets material carrying the loads; name the cuts "
                                 "in check.cuts")
            xs = [c.x for c in lv.cuts_fe]
            if case.mesh.adaptive:
                lv.size = representative_size(lv.mm)  # what the GCI study compares
                background = next_size_field(case, lv.mm, lv.field, ADAPT_GROWTH)
            levels.append(lv)
    finally:
        prog.close()
    fin = levels[-1]
    cuts = cut_results(fin)
    peak = peak_result(fin)
    zones = excluded_zones(case, fin.mm.supports, fin.mm.loads)
    findings = beam_findings(case, fin, cuts, peak, zones)
    sizes = [lv.size for lv in levels]
    dom = domain_polygon(case.geometry)  # type: ignore[arg-type]
    depth = dom.bounds[3] - dom.bounds[1]
    # governing cut: largest ratio on the finest mesh
    g = int(np.argmax([-1.0 if c.ratio is None else c.ratio for c in cuts]))
    quantities = {f"cut x={c.x:g} tau_max": _study(sizes, [lv.cuts_fe[i].tau_max
                                                          for lv in levels])
                  for i, c in enumerate(cuts)}
    for name in ("tau", "von_mises", "principal"):
        quantities[f"peak {name}"] = _study(sizes, [lv.peaks[name][0] for lv in levels])
    conc = concentrations(case, levels, zones, _study)  # holes, fillets, sharp corners
    findings += concentration_findings(case, conc)
    quantities.update({c.feature.key: c.study for c in conc if c.study})
    corners = reentrant_corners(dom)
    singular_at = []
    r_corner = 0.05 * depth
    if len(levels) >= 3 and corners:
        per_level = [_corner_peaks(lv, corners, r_corner) for lv in levels]
        for j, c in enumerate(corners):
            vals = [pl[j] for pl in per_level]
            if is_singular(sizes, vals):
                singular_at.append((c, vals))
                quantities[f"corner ({c.at[0]:g}, {c.at[1]:g}) von_mises"] = _study(sizes, vals)
    # governing: the worst cut's shear; with no hand shear anywhere (a member in pure
    # tension) the domain's principal-stress peak
    no_shear = all(c.ratio is None for c in cuts)
    gov_name = "peak principal" if no_shear else f"cut x={cuts[g].x:g} tau_max"
    gov = quantities[gov_name]
    S, L = case.units.stress, case.units.length
    for c, vals in singular_at:
        growth = vals[-1] / vals[-2] if vals[-2] else math.inf
        findings.append(Finding(kind="singular", at=list(c.at), ratio=float(f"{growth:.4g}"),
                                message=(f"The sharp {c.angle:.0f} degree re-entrant corner at "
                                         f"({c.at[0]:g}, {c.at[1]:g}) {L} is singular: its peak "
                                         f"stress grows with every refinement ({vals[0]:.4g} to "
                                         f"{vals[-1]:.4g} {S}) and has no finite value. Model "
                                         "the real fillet radius, or read the stress at a "
                                         "stated distance from the corner.")))
    singular_governs = any(math.hypot(peak.tau_at[0] - c.at[0], peak.tau_at[1] - c.at[1])
                           <= r_corner or math.hypot(peak.von_mises_at[0] - c.at[0],
                                                     peak.von_mises_at[1] - c.at[1]) <= r_corner
                           for c, _ in singular_at)
    converged = len(levels) >= 2 and gov["converged"]
    if len(levels) < 2:
        findings.append(Finding(kind="not-converged", at=[cuts[g].x, cuts[g].y_at_tau_max_fe],
                                ratio=None, message=("Only one mesh was run, so the FE figures "
                                                     "carry no error estimate; set mesh.levels "
                                                     "to 3 for a convergence study.")))
    elif not gov["converged"]:
        gci = gov["gci"]
        findings.append(Finding(kind="not-converged", at=[cuts[g].x, cuts[g].y_at_tau_max_fe],
                                ratio=None, message=(
                                    f"The governing shear at x = {cuts[g].x:g} {L} has not "
                                    f"converged (GCI {'n/a' if gci is None else f'{gci:.1%}'}, "
                                    f"limit {GCI_LIMIT:.0%}); refine the mesh.")))
    v = verdict(case, findings, converged, singular_governs)
    definite_excess = any(f.kind in ("short-beam", "shear-excess", "hand-value", "concentration")
                          and f.ratio is not None and f.ratio > 1 + case.check.tolerance
                          for f in findings)
    if v == "inconclusive" and definite_excess and (converged or len(levels) == 1):
        v = "unsafe"
    if v == "inconclusive" and any(c.converged and c.ratio is not None
                                   and c.ratio > 1 + case.check.tolerance for c in conc):
        v = "unsafe"  # a converged peak at a hole or fillet above the hand shear decides alone
    sol, mm = fin.sol, fin.mm
    conv = ConvergenceResult(
        sizes=sizes, tau_max=gov["values"], observed_order=gov["observed_order"],
        extrapolated=gov["extrapolated"], gci=gov["gci"], singular=bool(singular_at),
        converged=converged,
        quantity=("peak max principal stress (no hand shear at any cut)" if no_shear
                  else f"tau_max at the governing cut x = {cuts[g].x:g}"),
        dofs=[lv.sol.basis.N for lv in levels], quantities=quantities)
    timings = Timings(mesh=sum(lv.mm.seconds for lv in levels),
                      assemble=sum(lv.sol.seconds_assemble for lv in levels),
                      solve=sum(lv.sol.seconds_solve for lv in levels),
                      post=sum(lv.seconds_post for lv in levels))
    result = Result(
        case=case.name, kind="beam", title=case.title,
        units={"length": L, "force": case.units.force, "stress": S},
        mesh=MeshInfo(nodes=int(mm.mesh.doflocs.shape[1]), elements=int(mm.mesh.nelements),
                      dofs=int(sol.basis.N), size=mm.size, order=mm.order, curved=mm.curved,
                      solver=sol.solver, iterations=sol.iterations),
        equilibrium=Equilibrium(applied=list(sol.applied), reactions=list(sol.reaction_total),
                                relative_error=sol.equilibrium_error),
        cuts=cuts, peak=peak, convergence=conv, verdict=v, findings=findings, timings=timings,
        hand_method=case.check.method, tolerance=case.check.tolerance)
    return BeamRun(result=result, finest=fin, levels=levels, concentrations=conc)
