"""The Python entry point: `check(path_or_case)` runs a case and returns a `CheckResult`.

`CheckResult.data` holds exactly what results.json holds; `write(folder)` writes the output
folder (results.json, figures and, unless `report=False`, the design note files).
`hand_check` is `shearcheck hand`: the hand side alone.

The member, section and report modules are imported where they are first needed, so that
`import fem` and `shearcheck hand` start without gmsh, scikit-fem or matplotlib.
"""

from __future__ import annotations

import json
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

from fem.case.model import Case
from fem.case.parse import load_case
from fem.output_folder import staged_output
from fem.progress import Progress, as_progress
from fem.provenance import provenance
from fem.results import Result, write_json

if TYPE_CHECKING:  # the run types, for annotations only (no import at run time)
    from fem.member.check import BeamRun
    from fem.section.check import SectionRun

__all__ = ["CheckResult", "check", "write_outputs", "hand_check"]


@dataclass
class CheckResult:
    """A finished check: the case, the result dataclass and the run behind the figures."""

    case: Case
    result: Result
    run: BeamRun | SectionRun | None = None   # None for a result built by hand
    figures: list[Path] = field(default_factory=list)

    @property
    def data(self) -> dict[str, Any]:
        return self.result.to_dict()

    @property
    def verdict(self) -> str:
        return self.result.verdict

    def summary(self) -> str:
        from fem.report.console import summary_table

        return summary_table(self.data)

    def to_json(self) -> str:
        return json.dumps(self.data, indent=1, allow_nan=False)

    def plot_shear(self, path: str | Path) -> Path:
        """Shear contour (beam) or |tau| over the section (section) to `path`."""
        if self.case.kind == "beam":
            from fem.report.member_figures import contour_figure

            return contour_figure(self.case, self.run.finest, self.result.cuts, "txy",
                                  Path(path))
        from fem.report.section_figures import section_shear_figure

        return section_shear_figure(self.case, self.run, Path(path))

    def plot_profile(self, index: int, path: str | Path) -> Path:
        """FE vs hand profile at cut `index` (beam) or along the neutral axis (section)."""
        if self.case.kind == "beam":
            from fem.report.member_figures import profile_figure

            return profile_figure(self.case, self.result.cuts[index], Path(path))
        from fem.report.section_figures import section_profile_figure

        return section_profile_figure(self.case, self.run, Path(path))

    def plot_von_mises(self, path: str | Path) -> Path:
        """Von Mises contour of a beam check, with cuts, supports and loads, to `path`."""
        if self.case.kind != "beam":
            raise ValueError("the von Mises contour belongs to beam checks; a section check "
                             "carries its shear stresses only (plot_shear)")
        from fem.report.member_figures import contour_figure

        return contour_figure(self.case, self.run.finest, self.result.cuts, "von_mises",
                              Path(path))

    def plot_convergence(self, path: str | Path) -> Path:
        """The convergence figure (needs mesh.levels >= 2) to `path`."""
        from fem.report.convergence_figure import convergence_figure, has_study

        if not has_study(self.result.convergence):
            raise ValueError("a convergence figure needs two or more mesh levels; set "
                             "mesh.levels in the case")
        return convergence_figure(self.result.convergence, self.result.units, Path(path))

    def write_report(self, folder: str | Path) -> list[Path]:
        """The whole output folder with the design note (see `write_outputs`)."""
        return write_outputs(self, folder, report=True)


def check(path_or_case: str | Path | Case,
          progress: Progress | Callable[[str], None] | None = None) -> CheckResult:
    """Run a case file (or a loaded `Case`) and return the result; writes nothing.

    `progress` is a `fem.progress.Progress` (e.g. `BarProgress()` for a bar on stderr) or
    a plain ``callable(message)`` called as each mesh level begins.
    """
    case = path_or_case if isinstance(path_or_case, Case) else load_case(path_or_case)
    if case.kind == "beam":
        from fem.member.check import check_beam
        from fem.member.deflection import beam_deflection

        beam = check_beam(case, progress=progress)
        beam.result.deflection = beam_deflection(case, beam.finest)  # informative only
        return _stamp(CheckResult(case=case, result=beam.result, run=beam))
    from fem.section.check import check_section_case

    prog = as_progress(progress)  # the section run calls a plain progress(message)
    prog.start(case.mesh.levels)
    try:
        section = check_section_case(case, progress=prog.step)
    finally:
        prog.close()
    return _stamp(CheckResult(case=case, result=section.result, run=section))


def _stamp(res: CheckResult) -> CheckResult:
    """Provenance (versions, case file name and SHA-256, UTC time) and the title block."""
    c = res.case
    res.result.provenance = provenance(c.file, c.text or None)
    res.result.project = c.project.given() if c.project is not None else None
    return res


def write_outputs(res: CheckResult, out: str | Path, report: bool = True) -> list[Path]:
    """Write the output folder atomically; return the files written.

    With `report` (the default): the PNG figures, fields.vtu and profiles.csv
    (`fem.report.fields`), report.html and report.pdf (`fem.report.note`) and results.json;
    without it results.json only.
    """
    out = Path(out)
    names: list[str] = []
    figures: list[str] = []
    with staged_output(out) as stage:
        if report:
            from fem.report.fields import write_fields
            from fem.report.figures import write_figures
            from fem.report.note import write_report

            figs = write_figures(res, stage)
            figures = [p.name for p in figs]
            names += figures
            names += [p.name for p in write_fields(res, stage)]
            names += [p.name for p in write_report(res, stage, figs)]
        write_json(res.result, stage / "results.json")
        names.append("results.json")
    if report:
        res.figures = [out / n for n in figures]
    return [out / n for n in names]


def hand_check(case: Case, out: Path) -> str:
    """Write results.json (FE figures null) into `out`; return the calculation text."""
    if case.kind == "beam":
        from fem.member.hand_only import beam_hand_result

        res, lines = beam_hand_result(case)
    else:
        from fem.section.hand_only import section_hand_result

        res, lines = section_hand_result(case)
    res.provenance = provenance(case.file, case.text or None)
    res.project = case.project.given() if case.project is not None else None
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
