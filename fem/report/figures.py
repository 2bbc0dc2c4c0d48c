"""All figures of a run, by kind, plus the convergence figure: one call from the output writer."""

from __future__ import annotations

from pathlib import Path
from typing import Any

__all__ = ["write_figures"]


def write_figures(res: Any, folder: Path) -> list[Path]:
    """Write the PNG figures of a finished check into `folder`; return their paths."""
    if res.case.kind == "beam":
        from fem.report.member_figures import write_beam_figures

        paths = write_beam_figures(res.case, res.run.finest, res.result.cuts, folder,
                                   envelope=getattr(res.result, "envelope", None))
        if getattr(res.result, "planes", None):
            from fem.report.plane_figures import plot_planes

            paths.append(plot_planes(res.result.planes, res.result.units, res.case.name,
                                     Path(folder) / "planes.png"))
    else:
        from fem.report.section_figures import write_section_figures
        from fem.report.wall_figures import write_wall_figures

        paths = write_section_figures(res.case, res.run, folder)
        paths += write_wall_figures(res.case, res.run, folder)
    from fem.report.model_figure import run_figure  # the model as `shearcheck show` draws it

    paths.insert(0, run_figure(res, Path(folder)))
    from fem.report.convergence_figure import convergence_figure, has_study

    if has_study(res.result.convergence):
        paths.append(convergence_figure(res.result.convergence, res.result.units,
                                        Path(folder) / "convergence.png"))
    res.figures = paths
    return paths
