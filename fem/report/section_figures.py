"""Figures of a section check: |tau| over the section with the shear flow, and the
neutral-axis profile FE versus hand.  Matplotlib with the Agg backend; PNG at 150 dpi."""

from __future__ import annotations

from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.collections import LineCollection  # noqa: E402
from matplotlib.path import Path as MplPath  # noqa: E402
from matplotlib.tri import Triangulation  # noqa: E402
from mpl_toolkits.axes_grid1 import make_axes_locatable  # noqa: E402

from fem.case.model import Case  # noqa: E402
from fem.report.member_figures import force_text  # noqa: E402
from fem.report.png import save_png  # noqa: E402
from fem.section.check import SectionRun  # noqa: E402
from fem.section.level import SectionCheck  # noqa: E402

__all__ = ["plot_neutral_axis", "plot_section_stress", "section_shear_figure",
           "section_profile_figure", "write_section_figures"]


def _inside(check: SectionCheck, pts: np.ndarray) -> np.ndarray:
    outline = check.solution.mesh.geometry.outline
    mask = MplPath(outline.outer).contains_points(pts)
    for h in outline.holes:
        mask &= ~MplPath(h).contains_points(pts)
    return mask


def plot_section_stress(check: SectionCheck, length_unit: str, stress_unit: str,
                        path: str | Path, arrows: int = 22, force_unit: str = "",
                        force_scale: float = 1.0) -> Path:
    """|tau| over the section (nodal averages, Gouraud shading, 'viridis') with arrows of
    the shear flow (length proportional to |tau|), the outline and the FE peak marked.

    The colour scale and arrows stop at the peak away from sharp re-entrant corners
    (``tau_max_regular``); a singular corner shows as the colour bar's extension.

    Parameters
    ----------
    check
        From :func:`fem.section.level.check_section` (must carry its solution).
    length_unit, stress_unit
        Axis and colour-bar labels, e.g. ``"mm"``, ``"MPa"``.
    path
        PNG file to write.
    arrows
        Arrows along the longer side of the bounding box.

    Returns
    -------
    Path
        The file written.
    """
    sol = check.solution
    m = sol.mesh.finder
    tau = sol.stress(*check.V_solved)
    mag = np.linalg.norm(sol.nodal(tau), axis=1)
    x0, y0 = m.p.min(axis=1)
    x1, y1 = m.p.max(axis=1)
    aspect = (y1 - y0) / (x1 - x0)
    fig, ax = plt.subplots(figsize=(7.0, float(np.clip(5.2 * aspect + 1.6, 3.2, 8.5))))
    tri = Triangulation(m.p[0], m.p[1], m.t.T)
    top = check.tau_max_regular  # colours and arrows not swamped by a singular corner
    pc = ax.tripcolor(tri, mag, shading="gouraud", cmap="viridis", vmin=0.0, vmax=top)
    ax.add_collection(LineCollection(sol.mesh.boundary_lines, colors="k", linewidths=0.9))
    step = max(x1 - x0, y1 - y0) / arrows
    gx, gy = np.meshgrid(np.arange(x0 + step / 2, x1, step), np.arange(y0 + step / 2, y1, step))
    pts = np.column_stack([gx.ravel(), gy.ravel()])
    pts = pts[_inside(check, pts)]
    if len(pts):
        t = sol.probe(pts, *check.V_solved)
        ax.quiver(pts[:, 0], pts[:, 1], t[:, 0], t[:, 1], color="white", alpha=0.85,
                  angles="xy", scale_units="xy", scale=top / (0.9 * step),
                  width=0.004, headwidth=3.5)
    ax.plot(*check.tau_at, marker="o", mfc="none", mec="tab:red", ms=10, mew=1.8, ls="none")
    ax.set_aspect("equal")
    ax.set_xlim(x0 - 0.05 * (x1 - x0), x1 + 0.05 * (x1 - x0))
    ax.set_ylim(y0 - 0.05 * (y1 - y0), y1 + 0.05 * (y1 - y0))
    ax.set_xlabel(f"x [{length_unit}]")
    ax.set_ylabel(f"y [{length_unit}]")
    vx, vy = (v / force_scale for v in check.V_solved)   # in the case's force unit
    ax.set_title(f"{check.shape}: |τ| [{stress_unit}] under V = (Vx, Vy) = "
                 f"({force_text(vx, force_unit)}, {force_text(vy, force_unit)}); arrows: "
                 f"shear flow\nred circle: FE peak {check.tau_max_fe:.4g} {stress_unit}",
                 fontsize=10)
    extend = "max" if check.tau_max_fe > top * (1 + 1e-9) else "neither"
    cax = make_axes_locatable(ax).append_axes("right", size="4%", pad=0.12)
    fig.colorbar(pc, cax=cax, label=f"|τ| [{stress_unit}]", extend=extend)
    return save_png(fig, path)


def plot_neutral_axis(check: SectionCheck, length_unit: str, stress_unit: str,
                      path: str | Path) -> Path:
    """FE shear stress along the neutral axis versus the hand value (shear formula for
    that cut; and the chosen method's value if different).  Returns the file written."""
    na = check.neutral_axis
    s, fe = np.asarray(na.s), np.asarray(na.tau_fe)
    fig, ax = plt.subplots(figsize=(7.0, 4.2))
    breaks = np.flatnonzero(np.diff(s) > 2 * np.median(np.diff(s))) + 1
    for k, (ss, ff) in enumerate(zip(np.split(s, breaks), np.split(fe, breaks), strict=True)):
        ax.plot(ss, ff, color="tab:blue", lw=1.8, label="FE τ·n" if k == 0 else None)
    ax.axhline(na.tau_hand, color="tab:orange", ls="--", lw=1.5,
               label=f"shear formula for this cut = {na.tau_hand:.4g}")
    if check.method != "shear-formula":
        ax.axhline(check.hand, color="tab:green", ls=":", lw=1.5,
                   label=f"{check.method} = {check.hand:.4g}")
    ax.set_xlabel(f"s along the neutral axis from the centroid [{length_unit}]")
    ax.set_ylabel(f"τ [{stress_unit}]")
    ax.set_ylim(bottom=min(0.0, float(fe.min()) * 1.1))
    ax.set_title(f"{check.shape}: shear stress on the neutral axis")
    ax.grid(alpha=0.3)
    ax.legend(fontsize=8)
    return save_png(fig, path)




def section_shear_figure(case: Case, run: SectionRun, path: Path) -> Path:
    """|tau| over the section on the finest mesh, to `path`."""
    u = case.units
    return plot_section_stress(run.finest, u.length, u.stress, Path(path),
                               force_unit=u.force, force_scale=u.force_scale)


def section_profile_figure(case: Case, run: SectionRun, path: Path) -> Path:
    """FE against hand shear along the neutral axis on the finest mesh, to `path`."""
    u = case.units
    return plot_neutral_axis(run.finest, u.length, u.stress, Path(path))


def write_section_figures(case: Case, run: SectionRun, folder: Path) -> list[Path]:
    folder = Path(folder)
    return [section_shear_figure(case, run, folder / "section-shear.png"),
            section_profile_figure(case, run, folder / "neutral-axis-profile.png")]
