"""The Python entry point: `check(path_or_case)` runs a case and returns a `CheckResult`.

`CheckResult.data` holds exactly what results.json holds; `write(folder)` writes the output
folder (results.json, figures and, unless `report=False`, the design note files).
"""

from __future__ import annotations

import json
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .case import Case, load_case
from .outputs import staged_output, summary_table
from .progress import Progress
from .results import Result, write_json

__all__ = ["CheckResult", "check", "write_outputs"]


@dataclass
class CheckResult:
    """A finished check: the result dataclass, its JSON form and what the figures need."""

    case: Case
    result: Result
    run: Any = None              # fem.run.BeamRun or the section check object
    figures: list[Path] = field(default_factory=list)

    @property
    def data(self) -> dict[str, Any]:
        return self.result.to_dict()

    @property
    def verdict(self) -> str:
        return self.result.verdict

    def summary(self) -> str:
        return summary_table(self.data)

    def to_json(self) -> str:
        return json.dumps(self.data, indent=1, allow_nan=False)

    def plot_shear(self, path: str | Path) -> Path:
        """Shear contour (beam) or |tau| over the section (section) to `path`."""
        if self.case.kind == "beam":
            from .plots import contour_figure

            return contour_figure(self.case, self.run.finest, self.result.cuts, "txy",
                                  Path(path))
        from .section_run import section_shear_figure

        return section_shear_figure(self, Path(path))

    def plot_profile(self, index: int, path: str | Path) -> Path:
        """FE vs hand profile at cut `index` (beam) or along the neutral axis (section)."""
        if self.case.kind == "beam":
            from .plots import profile_figure

            return profile_figure(self.case, self.result.cuts[index], Path(path))
        from .section_run import section_profile_figure

        return section_profile_figure(self, Path(path))

    def plot_von_mises(self, path: str | Path) -> Path:
        """Von Mises contour of a beam check, with cuts, supports and loads, to `path`."""
        if self.case.kind != "beam":
            raise ValueError("the von Mises contour belongs to beam checks; a section check "
                             "carries its shear stresses only (plot_shear)")
        from .plots import contour_figure

        return contour_figure(self.case, self.run.finest, self.result.cuts, "von_mises",
                              Path(path))

    def plot_convergence(self, path: str | Path) -> Path:
        """The convergence figure (needs mesh.levels >= 2) to `path`."""
        from .plots_convergence import convergence_figure, has_study

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
        from .run import check_beam

        run = check_beam(case, progress=progress)
        return CheckResult(case=case, result=run.result, run=run)
    from .progress import as_progress
    from .section_run import check_section_case

    prog = as_progress(progress)  # the section run calls a plain progress(message)
    prog.start(case.mesh.levels)
    try:
        return check_section_case(case, progress=prog.step)
    finally:
        prog.close()


def write_outputs(res: CheckResult, out: str | Path, report: bool = True) -> list[Path]:
    """Write the output folder atomically; return the files written.

    With `report` (the default): the PNG figures, fields.vtu and profiles.csv
    (`fem.fields`), report.html and report.pdf (`fem.report`) and results.json; without
    it results.json only.
    """
    out = Path(out)
    names: list[str] = []
    figures: list[str] = []
    with staged_output(out) as stage:
        if report:
            from .fields import write_fields
            from .figures import write_figures
            from .report import write_report

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
