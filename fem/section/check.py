"""A `kind = "section"` case through the same chain: levels, convergence, verdict, Result.

Each level runs `fem.section.level.check_section` at half the previous element size; the
section peak is the governing quantity of the GCI study (`fem.convergence`), its regular
part (away from sharp re-entrant corners) where a corner is singular. The finest level
supplies the `section` object and findings; `fem.verdict.decide` gives the verdict, by the
same rule as for members.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from functools import partial

from fem.case.model import Case
from fem.case.sizing import check_real_dofs, level_size
from fem.convergence import acceptance, gci_study, is_singular
from fem.results import (
    ConvergenceResult,
    Equilibrium,
    Finding,
    MeshInfo,
    Result,
    Timings,
    forces_to_case_unit,
)
from fem.section.level import SectionCheck, check_section
from fem.verdict import decide

__all__ = ["SectionRun", "check_section_case"]


@dataclass
class SectionRun:
    """A finished section study: the result and every level's check (coarsest first)."""

    result: Result
    levels: list[SectionCheck]

    @property
    def finest(self) -> SectionCheck:
        return self.levels[-1]


def _levels(case: Case, progress: Callable[[str], None] | None) -> list[SectionCheck]:
    g = case.section
    out = []
    for k in range(case.mesh.levels):
        size = level_size(case, k)
        if progress:
            progress(f"level {k + 1}/{case.mesh.levels}: size {size:g}")
        out.append(check_section(g.shape, dict(g.params), E=case.material.E,
                                 nu=case.material.nu, Vx=case.shear[0], Vy=case.shear[1],
                                 size=size, order=case.mesh.order, method=case.check.method,
                                 tolerance=case.check.tolerance,
                                 hand_value=case.check.hand_value,
                                 joints=case.check.joints,
                                 check_dofs=partial(check_real_dofs, case, size=size),
                                 units=case.units))
    return out


@dataclass(frozen=True)
class _Study:
    """The section peak's convergence: numbers for results.json and the acceptance."""

    order: float | None = None
    extrapolated: float | None = None
    gci: float | None = None
    singular: bool = False
    converged: bool = False
    reason: str = "one mesh only"


def check_section_case(case: Case,
                       progress: Callable[[str], None] | None = None) -> SectionRun:
    """Run a section case: levels -> convergence of the peak -> findings -> verdict.

    Steps: `_levels` (one `check_section` per element size), `_study` (GCI of the peak,
    of its regular part where a corner is singular), `_extra_findings` (singular and
    not-converged), `decide` (the one verdict rule), `_result`.
    """
    levels = _levels(case, progress)
    fin = levels[-1]
    sizes = [level_size(case, k) for k in range(len(levels))]
    study = _study(case, levels, sizes)
    findings = list(fin.findings) + _extra_findings(fin, levels, study)
    tol = case.check.tolerance
    # the raw peak (at the corner), not the headline regular one, decides whether it governs
    singular_governs = (any(f.kind == "singular" for f in findings)
                        and fin.ratio_raw > 1.0 + tol)
    verdict = decide(findings, tolerance=tol, levels=len(levels), converged=study.converged,
                     singular_governs=singular_governs)
    result = _result(case, levels, sizes, study, findings, verdict.word)
    forces_to_case_unit(result, 1.0 / case.units.force_scale)
    return SectionRun(result=result, levels=levels)


def _study(case: Case, levels: list[SectionCheck], sizes: list[float]) -> _Study:
    """GCI study of the section peak; where it grows at a singular corner, the regular peak
    (outside the corner discs) is the one that must converge."""
    if len(levels) < 2:
        return _Study()
    order = float(case.mesh.order)
    values = [lv.tau_max_fe for lv in levels]
    est = gci_study(sizes, values, formal_order=order)
    singular = len(levels) >= 3 and is_singular(sizes, values)
    ok = acceptance(est, formal_order=order)
    if singular:
        ok = acceptance(gci_study(sizes, [lv.tau_max_regular for lv in levels],
                                  formal_order=order), formal_order=order)
    return _Study(order=est.observed_order, extrapolated=est.extrapolated, gci=est.gci,
                  singular=singular, converged=ok.converged,
                  reason=("the peak outside the singular corners: " if singular else "")
                  + ok.reason)


def _extra_findings(fin: SectionCheck, levels: list[SectionCheck], study: _Study
                    ) -> list[Finding]:
    out = []
    if study.singular and not any(f.kind == "singular" for f in fin.findings):
        out.append(Finding(kind="singular", at=list(fin.tau_at), ratio=None, message=(
            "The section peak grows with every refinement: a sharp re-entrant corner is "
            "singular. Model the real root radius.")))
    if len(levels) < 2:
        out.append(Finding(kind="not-converged", at=list(fin.tau_at), ratio=None, message=(
            "Only one mesh was run, so the FE figures carry no error estimate; set "
            "mesh.levels to 3.")))
    elif not study.converged:
        out.append(Finding(kind="not-converged", at=list(fin.tau_at), ratio=None, message=(
            f"The section peak has not converged: {study.reason}. Refine the mesh "
            "(smaller mesh.size or more mesh.levels).")))
    return out


def _result(case: Case, levels: list[SectionCheck], sizes: list[float], study: _Study,
            findings: list[Finding], verdict: str) -> Result:
    """The section's `Result` (what results.json holds) from the finished study."""
    d = levels[-1].results()
    u = case.units
    timings = Timings(**{k: sum(lv.timings.get(k, 0.0) for lv in levels)
                         for k in ("mesh", "assemble", "solve", "post")})
    m = d["mesh"]
    return Result(
        case=case.name, kind="section", title=case.title,
        units={"length": u.length, "force": u.force, "stress": u.stress},
        mesh=MeshInfo(nodes=m["nodes"], elements=m["elements"], dofs=m["dofs"],
                      size=m["size"], order=m["order"], solver=m["solver"]),
        verdict=verdict, findings=findings, timings=timings,
        convergence=ConvergenceResult(
            sizes=sizes, tau_max=[lv.tau_max_fe for lv in levels],
            observed_order=study.order, extrapolated=study.extrapolated, gci=study.gci,
            singular=study.singular, converged=study.converged, quantity="section tau_max",
            dofs=[lv.mesh.dofs for lv in levels],
            quantities={"section tau_max outside corners": {
                "values": [lv.tau_max_regular for lv in levels]},
                **{f"{j.name} q_fe": {"values": [lv.joints[k].q_fe for lv in levels]}
                   for k, j in enumerate(levels[-1].joints)}}),
        equilibrium=Equilibrium(**d["equilibrium"]), section=d["section"],
        hand_method=levels[-1].method, tolerance=case.check.tolerance,
        joints=d.get("joints"))
