"""A `kind = "section"` case through the same chain: levels, convergence, Result, figures.

Each level runs `fem.section.level.check_section` at half the previous element size; the
section peak tau_max_fe is the governing quantity of the GCI study (`fem.convergence`). The
finest level supplies the `section` object, findings and verdict; the verdict becomes
`inconclusive` when the peak has not converged or a singular corner governs.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from fem.case.model import Case
from fem.case.sizing import level_size
from fem.convergence import GCI_LIMIT, accepted, gci_study, is_singular
from fem.results import ConvergenceResult, Equilibrium, Finding, MeshInfo, Result, Timings
from fem.section.level import SectionCheck, check_section

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
    g = case.geometry
    out = []
    for k in range(case.mesh.levels):
        size = level_size(case, k)
        if progress:
            progress(f"level {k + 1}/{case.mesh.levels}: size {size:g}")
        out.append(check_section(g.shape, dict(g.params), E=case.material.E,  # type: ignore
                                 nu=case.material.nu, Vx=case.shear[0], Vy=case.shear[1],
                                 size=size, order=case.mesh.order, method=case.check.method,
                                 tolerance=case.check.tolerance,
                                 hand_value=case.check.hand_value))
    return out


def check_section_case(case: Case,
                       progress: Callable[[str], None] | None = None) -> SectionRun:
    """Run a section case over its levels; return the `SectionRun`."""
    levels = _levels(case, progress)
    fin = levels[-1]
    sizes = [level_size(case, k) for k in range(len(levels))]
    values = [lv.tau_max_fe for lv in levels]
    regular = [lv.tau_max_regular for lv in levels]
    findings = list(fin.findings)
    order = extrapolated = gci = None
    singular = converged = False
    if len(levels) >= 2:
        est = gci_study(sizes, values)
        order, extrapolated, gci = est.observed_order, est.extrapolated, est.gci
        singular = len(levels) >= 3 and is_singular(sizes, values)
        converged = accepted(est) and not singular
        if singular:
            reg = gci_study(sizes, regular)
            reg_ok = accepted(reg)
            if not any(f.kind == "singular" for f in findings):
                findings.append(Finding(kind="singular", at=list(fin.tau_at), ratio=None,
                                        message=("The section peak grows with every "
                                                 "refinement: a sharp re-entrant corner is "
                                                 "singular. Model the real root radius.")))
            converged = reg_ok
    if len(levels) < 2:
        findings.append(Finding(kind="not-converged", at=list(fin.tau_at), ratio=None,
                                message=("Only one mesh was run, so the FE figures carry no "
                                         "error estimate; set mesh.levels to 3.")))
    elif not converged:
        findings.append(Finding(kind="not-converged", at=list(fin.tau_at), ratio=None,
                                message=(f"The section peak has not converged (GCI "
                                         f"{'n/a' if gci is None else f'{gci:.1%}'}, limit "
                                         f"{GCI_LIMIT:.0%}); refine the mesh.")))
    verdict = fin.verdict
    if verdict == "holds" and not converged:
        verdict = "inconclusive"
    d = fin.results()
    u = case.units
    timings = Timings(**{k: sum(lv.timings.get(k, 0.0) for lv in levels)
                         for k in ("mesh", "assemble", "solve", "post")})
    m = d["mesh"]
    result = Result(
        case=case.name, kind="section", title=case.title,
        units={"length": u.length, "force": u.force, "stress": u.stress},
        mesh=MeshInfo(nodes=m["nodes"], elements=m["elements"], dofs=m["dofs"],
                      size=m["size"], order=m["order"]),
        verdict=verdict, findings=findings, timings=timings,
        convergence=ConvergenceResult(sizes=sizes, tau_max=values, observed_order=order,
                                      extrapolated=extrapolated, gci=gci, singular=singular,
                                      converged=converged, quantity="section tau_max",
                                      dofs=[lv.mesh.dofs for lv in levels],
                                      quantities={"section tau_max outside corners": {
                                          "values": regular}}),
        equilibrium=Equilibrium(**d["equilibrium"]), section=d["section"],
        hand_method=fin.method, tolerance=case.check.tolerance)
    return SectionRun(result=result, levels=levels)
