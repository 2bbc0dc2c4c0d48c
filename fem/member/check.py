"""A whole member check: the levels of a convergence study, comparison, verdict and result.

`check_beam(case)` runs every level (halving the element size, or sizing adaptive levels by
the error estimate), compares FE and hand on the finest level, estimates the discretisation
error of the governing quantities (GCI, `fem.convergence`), tells singular corners from
converging peaks, decides the verdict (`fem.verdict.decide`) and returns the `BeamRun`.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import asdict, dataclass, field
from typing import Any

import numpy as np

from fem.case.model import Case
from fem.case.outline import Corner, domain_polygon, member_depth, reentrant_corners
from fem.case.sizing import estimate_dofs, level_size
from fem.convergence import acceptance, gci_study, is_singular
from fem.errors import SolveError
from fem.member.adapt import next_size_field, representative_size
from fem.member.compare import beam_findings, cut_results, peak_result
from fem.member.concentration import Concentration, concentration_findings, concentrations
from fem.member.envelope import member_envelope, section_peaks, widened
from fem.member.level import ExcludedZone, Level, excluded_zones, run_level
from fem.member.planes import member_planes, plane_findings
from fem.progress import Progress, as_progress
from fem.results import (
    ConvergenceResult,
    CutResult,
    Envelope,
    Equilibrium,
    Finding,
    MeshInfo,
    Peak,
    Result,
    Timings,
    forces_to_case_unit,
)
from fem.verdict import decide

__all__ = ["BeamRun", "check_beam", "ADAPT_GROWTH", "CORNER_RADIUS"]

# elements of each adaptive level over the one before: h ratio sqrt(2.2) = 1.48, above the
# 1.3 Celik et al. (2008) ask of a refinement; bench/bench_speed.py measured 2 and 1.7
ADAPT_GROWTH = 2.2

# radius, as a fraction of the member depth, of the disc around a sharp re-entrant corner in
# which its peak is tracked and inside which a domain peak counts as the corner's: small
# enough to hold only the corner's own field, fixed under refinement so verdicts stay put
CORNER_RADIUS = 0.05

# the envelope's worst point governs the convergence study when its ratio is above the worst
# cut's by more than this share; closer, the two are the same place (the envelope includes
# the cuts' stations) and the cut, with its profile, is the figure reported
ENVELOPE_MARGIN = 1e-3
# the quantity key of the FE shear at the envelope's worst point, one per level
ENVELOPE_WORST = "envelope worst station tau"


@dataclass
class BeamRun:
    """A finished member study: the result and every level (coarsest first)."""

    result: Result
    finest: Level
    levels: list[Level]
    concentrations: list[Concentration] = field(default_factory=list)


@dataclass(frozen=True)
class _Singular:
    corner: Corner
    values: list[float]     # its von Mises peak on each level


def check_beam(case: Case, progress: Progress | Callable[[str], None] | None = None) -> BeamRun:
    """Run a member case: levels -> findings on the finest -> convergence -> verdict.

    The steps, each a function below: `_run_levels` (mesh, solve, recover, cuts and hand side
    per level); `cut_results` / `peak_result` / `beam_findings` (FE against hand on the
    finest mesh, `fem.member.compare`); `concentrations` (holes, fillets, corners);
    `_quantities` (the GCI study of every tracked figure); `_singular_corners`; the governing
    quantity and its convergence finding; `decide` (the one verdict rule); `_result`.
    """
    levels = _run_levels(case, progress)
    fin = levels[-1]
    cuts, peak = cut_results(fin), peak_result(fin)
    zones = excluded_zones(case, fin.mm.supports, fin.mm.loads)
    findings = beam_findings(case, fin, cuts, peak, zones)
    depth = member_depth(case.beam)
    corners = reentrant_corners(domain_polygon(case.beam))
    env_zones = zones + _corner_zones(corners, depth)
    envelope = member_envelope(case, fin, env_zones)
    findings += _envelope_findings(case, envelope, cuts)
    study = _study_of(case)
    conc = concentrations(case, levels, zones, study)
    findings += concentration_findings(case, conc)
    quantities = _quantities(levels, cuts, study)
    if envelope.worst is not None:
        quantities[ENVELOPE_WORST] = study([lv.size for lv in levels],
                                           _station_peaks(levels, envelope.worst.x, env_zones))
    quantities.update({c.feature.key: c.study for c in conc if c.study})
    singular = _singular_corners(corners, levels, depth)
    for s in singular:
        quantities[f"corner ({s.corner.at[0]:g}, {s.corner.at[1]:g}) von_mises"] = study(
            [lv.size for lv in levels], s.values)
    findings += [_singular_finding(case, s) for s in singular]
    gov = _governing(cuts, envelope, conc)
    converged = len(levels) >= 2 and quantities[gov.name]["converged"]
    findings += _convergence_findings(case, levels, quantities[gov.name], gov)
    tol = case.check.tolerance
    verdict = decide(findings, tolerance=tol, levels=len(levels), converged=converged,
                     singular_governs=_singular_governs(peak, singular, CORNER_RADIUS * depth),
                     converged_feature_excess=any(c.converged and c.ratio is not None
                                                  and c.ratio > 1 + tol for c in conc))
    result = _result(case, levels, cuts, peak, findings, verdict.word, quantities, gov,
                     bool(singular), converged)
    result.envelope = envelope
    planes = member_planes(case, fin, zones)
    if planes:
        result.planes = [p.to_dict() for p in planes]
        result.findings += plane_findings(case, planes, tol)
    forces_to_case_unit(result, 1.0 / case.units.force_scale)
    return BeamRun(result=result, finest=fin, levels=levels, concentrations=conc)


def _run_levels(case: Case, progress: Progress | Callable[[str], None] | None) -> list[Level]:
    """Every level of the study, coarsest first, the progress bar weighted by dofs."""
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
    return levels


def _corner_zones(corners: list[Corner], depth: float) -> list[ExcludedZone]:
    """Discs around sharp re-entrant corners, left out of the envelope: there the elastic
    stress has no finite value, and the corner is judged by its own (singular or
    concentration) finding instead."""
    r = CORNER_RADIUS * depth
    return [ExcludedZone(at=c.at, radius=r, why=f"the sharp {c.angle:.0f} degree corner")
            for c in corners]


def _envelope_findings(case: Case, env: Envelope, cuts: list[CutResult]) -> list[Finding]:
    """An `envelope-excess` finding where the worst point along the member (between or at
    the cuts, outside the excluded zones) exceeds the hand value by more than the tolerance
    and no cut within an element of it already says so."""
    w, tol = env.worst, case.check.tolerance
    if w is None or w.ratio is None or w.ratio <= 1 + tol:
        return []
    if any(c.ratio is not None and c.ratio >= w.ratio * (1 - 1e-3) for c in cuts):
        return []   # a cut is (near) the worst point: its own finding names the cause
    L, S = case.units.length, case.units.stress
    stretches = ", ".join(f"{a:g} to {b:g}" for a, b in env.unsafe)
    return [Finding(kind="envelope-excess", at=[w.x, w.y], ratio=w.ratio, message=(
        f"Between the cuts, at x = {w.x:g} {L} the FE shear stress peaks at {w.tau_fe:.4g} "
        f"{S} (y = {w.y:.4g} {L}), {100 * (w.ratio - 1):.1f} % above the "
        f"{case.check.method} value {w.tau_hand:.4g} {S} there; the hand value is exceeded "
        f"over x = {stretches} {L} (see ratio-along-member.png)."))]


def _study_of(case: Case) -> Callable[[list[float], list[float]], dict[str, Any]]:
    """The GCI study of one quantity over the levels, judged at the element's order."""
    order = float(case.mesh.order)

    def study(sizes: list[float], values: list[float]) -> dict[str, Any]:
        if len(values) < 2:
            return {"values": values, "observed_order": None, "extrapolated": None,
                    "gci": None, "converged": False, "singular": False,
                    "reason": "one mesh only"}
        est = gci_study(sizes, values, formal_order=order)
        singular = is_singular(sizes, values)
        ok = acceptance(est, formal_order=order)
        return {"values": values, "observed_order": est.observed_order,
                "extrapolated": est.extrapolated, "gci": est.gci,
                "approx_rel_error": est.approx_rel_error,
                "converged": ok.converged and not singular, "singular": singular,
                "reason": ("the value grows with every refinement (singular)" if singular
                           else ok.reason)}

    return study


def _quantities(levels: list[Level], cuts: list[CutResult],
                study: Callable[[list[float], list[float]], dict[str, Any]]
                ) -> dict[str, dict[str, Any]]:
    """The tracked figures over the levels: each cut's tau_max and the domain peaks."""
    sizes = [lv.size for lv in levels]
    out = {f"cut x={c.x:g} tau_max": study(sizes, [lv.cuts_fe[i].tau_max for lv in levels])
           for i, c in enumerate(cuts)}
    for name in ("tau", "von_mises", "principal"):
        out[f"peak {name}"] = study(sizes, [lv.peaks[name][0] for lv in levels])
    return out


def _corner_peaks(level: Level, corners: list[Corner], radius: float) -> list[float]:
    p = level.field.p
    vm = level.field.nodal["von_mises"]
    out = []
    for c in corners:
        near = np.hypot(p[0] - c.at[0], p[1] - c.at[1]) <= radius
        out.append(float(vm[near].max()) if near.any() else 0.0)
    return out


def _singular_corners(corners: list[Corner], levels: list[Level], depth: float
                      ) -> list[_Singular]:
    """Sharp re-entrant corners whose peak grows with every refinement (needs 3 levels)."""
    if len(levels) < 3 or not corners:
        return []
    sizes = [lv.size for lv in levels]
    per_level = [_corner_peaks(lv, corners, CORNER_RADIUS * depth) for lv in levels]
    out = []
    for j, c in enumerate(corners):
        vals = [pl[j] for pl in per_level]
        if is_singular(sizes, vals):
            out.append(_Singular(c, vals))
    return out


def _singular_finding(case: Case, s: _Singular) -> Finding:
    S, L = case.units.stress, case.units.length
    vals, c = s.values, s.corner
    growth = vals[-1] / vals[-2] if vals[-2] else math.inf
    return Finding(kind="singular", at=list(c.at), ratio=float(f"{growth:.4g}"),
                   message=(f"The sharp {c.angle:.0f} degree re-entrant corner at "
                            f"({c.at[0]:g}, {c.at[1]:g}) {L} is singular: its peak stress "
                            f"grows with every refinement ({vals[0]:.4g} to {vals[-1]:.4g} "
                            f"{S}) and has no finite value. Model the real fillet radius, or "
                            "read the stress at a stated distance from the corner."))


def _singular_governs(peak: Peak, singular: list[_Singular], radius: float) -> bool:
    """Whether the domain's shear or von Mises peak sits at a singular corner."""
    return any(math.hypot(at[0] - s.corner.at[0], at[1] - s.corner.at[1]) <= radius
               for s in singular for at in (peak.tau_at, peak.von_mises_at))


def _station_peaks(levels: list[Level], x: float, zones: list[ExcludedZone]) -> list[float]:
    """The FE peak |tau_xy| of the vertical section at `x` on every level: the envelope's
    worst station of the finest mesh, tracked like a cut so its convergence can be judged."""
    return [float(section_peaks(lv.field, np.array([x]), widened(zones))[0][0])
            for lv in levels]


@dataclass(frozen=True)
class _Governing:
    """The figure whose convergence decides the verdict, and where it is."""

    name: str               # its key in the quantities
    at: tuple[float, float]
    what: str               # in words, for results.json and the not-converged finding


def _governing(cuts: list[CutResult], env: Envelope,
               conc: list[Concentration]) -> _Governing:
    """The governing quantity: the shear at the worst place on the finest mesh, the worst
    cut or, where the envelope's worst point between the cuts has the larger ratio (by more
    than ENVELOPE_MARGIN), the FE shear there; with no hand shear at any cut (a member in
    pure tension) the principal-stress peak. A worst point within a hole's, fillet's or
    corner's reach is that feature's peak, judged by its own concentration study and
    finding: there the worst cut stays the governing figure."""
    g = int(np.argmax([-1.0 if c.ratio is None else c.ratio for c in cuts]))
    c = cuts[g]
    if all(c.ratio is None for c in cuts):
        return _Governing("peak principal", (c.x, c.y_at_tau_max_fe),
                          "peak max principal stress (no hand shear at any cut)")
    w = env.worst
    at_feature = w is not None and any(
        math.hypot(w.x - k.feature.centre[0], w.y - k.feature.centre[1]) <= k.feature.reach
        for k in conc)
    if (w is not None and w.ratio is not None and not at_feature
            and w.ratio > c.ratio * (1 + ENVELOPE_MARGIN)):
        return _Governing(ENVELOPE_WORST, (w.x, w.y),
                          f"tau_fe at the envelope's worst point x = {w.x:g}")
    return _Governing(f"cut x={c.x:g} tau_max", (c.x, c.y_at_tau_max_fe),
                      f"tau_max at the governing cut x = {c.x:g}")


def _convergence_findings(case: Case, levels: list[Level], gov: dict[str, Any],
                          where: _Governing) -> list[Finding]:
    """A not-converged finding that states the actual reason, if the study is not accepted."""
    at = list(where.at)
    if len(levels) < 2:
        return [Finding(kind="not-converged", at=at, ratio=None, message=(
            "Only one mesh was run, so the FE figures carry no error estimate; set "
            "mesh.levels to 3 for a convergence study."))]
    if gov["converged"]:
        return []
    return [Finding(kind="not-converged", at=at, ratio=None, message=(
        f"The governing shear at x = {where.at[0]:g} {case.units.length} has not converged: "
        f"{gov['reason']}. Refine the mesh (smaller mesh.size or more mesh.levels)."))]


def _result(case: Case, levels: list[Level], cuts: list[CutResult], peak: Peak,
            findings: list[Finding], verdict: str, quantities: dict[str, dict[str, Any]],
            where: _Governing, singular: bool, converged: bool) -> Result:
    """The member's `Result` (what results.json holds) from the finished study."""
    fin = levels[-1]
    sol, mm = fin.sol, fin.mm
    gov = quantities[where.name]
    S, L = case.units.stress, case.units.length
    conv = ConvergenceResult(
        sizes=[lv.size for lv in levels], tau_max=gov["values"],
        observed_order=gov["observed_order"], extrapolated=gov["extrapolated"],
        gci=gov["gci"], singular=singular, converged=converged,
        quantity=where.what,
        dofs=[lv.sol.basis.N for lv in levels], quantities=quantities)
    timings = Timings(mesh=sum(lv.mm.seconds for lv in levels),
                      assemble=sum(lv.sol.seconds_assemble for lv in levels),
                      solve=sum(lv.sol.seconds_solve for lv in levels),
                      post=sum(lv.seconds_post for lv in levels))
    return Result(
        case=case.name, kind="beam", title=case.title,
        units={"length": L, "force": case.units.force, "stress": S},
        mesh=MeshInfo(nodes=int(mm.mesh.doflocs.shape[1]), elements=int(mm.mesh.nelements),
                      dofs=int(sol.basis.N), size=mm.size, order=mm.order, curved=mm.curved,
                      solver=sol.solver, iterations=sol.iterations,
                      solve_attempts=[asdict(a) for a in sol.attempts]),
        equilibrium=Equilibrium(applied=list(sol.applied), reactions=list(sol.reaction_total),
                                relative_error=sol.equilibrium_error),
        cuts=cuts, peak=peak, convergence=conv, verdict=verdict, findings=findings,
        timings=timings, hand_method=case.check.method, tolerance=case.check.tolerance)
