"""Figures of a section's shear flow: over the section (arrows, centroid, shear centre,
joint lines) and along the wall centre lines (FE against thin-wall theory).
Matplotlib with the Agg backend; PNG at 150 dpi."""

from __future__ import annotations

from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.collections import LineCollection  # noqa: E402
from matplotlib.tri import Triangulation  # noqa: E402
from mpl_toolkits.axes_grid1 import make_axes_locatable  # noqa: E402

from fem.case.model import Case  # noqa: E402
from fem.report.png import save_png  # noqa: E402
from fem.section.check import SectionRun  # noqa: E402
from fem.section.hand_method import CENTRELINE_SHAPES  # noqa: E402
from fem.section.level import SectionCheck  # noqa: E402
from fem.section.walls import wall_flows  # noqa: E402

__all__ = ["force_text", "plot_section_flow", "plot_wall_flow", "write_wall_figures",
           "WALL_NAMES", "ARROW_CELLS"]

ARROW_CELLS = 28  # arrows: one per cell of a grid this many cells across the section

#: names of the walls of each shape, in the order of fem.section.hand_method.centreline
WALL_NAMES = {
    "channel": ("web", "top flange", "bottom flange"),
    "i": ("web", "top flange, left", "top flange, right", "bottom flange, left",
          "bottom flange, right"),
    "tee": ("web", "flange, left", "flange, right"),
    "angle": ("horizontal leg", "vertical leg"),
    "box": ("bottom", "right side", "top", "left side"),
}


def force_text(v: float, unit: str) -> str:
    """A force for a title: 20000 N -> '20 kN' (N only; other units as given)."""
    if unit == "N" and abs(v) >= 1e6:
        return f"{v / 1e6:.4g} MN"
    if unit == "N" and abs(v) >= 1e3:
        return f"{v / 1e3:.4g} kN"
    return f"{v:.4g} {unit}"


def _arrow_points(check: SectionCheck, cells: int) -> tuple[np.ndarray, float]:
    """One element centroid per grid cell (the one nearest the cell's centre): arrows that
    reach thin walls a plain grid would miss."""
    m = check.solution.mesh.finder
    cen = m.p[:, m.t].mean(axis=1).T
    lo, hi = m.p.min(axis=1), m.p.max(axis=1)
    step = float(max(hi - lo)) / cells
    cell = np.floor((cen - lo) / step).astype(int)
    centre = lo + (cell + 0.5) * step
    dist = np.linalg.norm(cen - centre, axis=1)
    key = cell[:, 0] * (cells + 2) + cell[:, 1]
    order = np.lexsort((dist, key))
    first = np.ones(len(order), dtype=bool)
    first[1:] = key[order][1:] != key[order][:-1]
    return cen[order[first]], step


def plot_section_flow(check: SectionCheck, case: Case, path: str | Path,
                      cells: int = ARROW_CELLS) -> Path:
    """|τ| over the section (sequential 'cividis', smooth shading) with shear-flow arrows,
    the centroid (+), the shear centre (×) and the joint lines with their FE q."""
    u = case.units
    sol = check.solution
    m = sol.mesh.finder
    mag = np.linalg.norm(sol.nodal(sol.stress(*check.V_solved)), axis=1)
    x0, y0 = m.p.min(axis=1)
    x1, y1 = m.p.max(axis=1)
    aspect = (y1 - y0) / (x1 - x0)
    fig, ax = plt.subplots(figsize=(7.2, float(np.clip(5.4 * aspect + 1.8, 3.4, 9.0))))
    top = check.tau_max_regular
    pc = ax.tripcolor(Triangulation(m.p[0], m.p[1], m.t.T), mag, shading="gouraud",
                      cmap="cividis", vmin=0.0, vmax=top)
    ax.add_collection(LineCollection(sol.mesh.boundary_lines, colors="k", linewidths=0.9))
    pts, step = _arrow_points(check, cells)
    t = sol.probe(pts, *check.V_solved)
    ax.quiver(pts[:, 0], pts[:, 1], t[:, 0], t[:, 1], color="white", angles="xy",
              scale_units="xy", scale=top / (0.9 * step), width=0.0035, headwidth=4,
              headlength=4.5, minlength=0.2, pivot="mid")
    ax.plot(*check.centroid, marker="+", color="tab:orange", ms=13, mew=2.2, ls="none",
            label="centroid")
    ax.plot(*check.shear_centre, marker="x", color="tab:red", ms=11, mew=2.2, ls="none",
            label="shear centre")
    for j in check.joints:
        xs, ys = zip(j.start, j.end, strict=True)
        ax.plot(xs, ys, color="magenta", lw=2.4, solid_capstyle="butt")
        ax.annotate(f"{j.name}: q = {u.user_force(j.q_fe):.4g} {u.force}/{u.length}",
                    ((j.start[0] + j.end[0]) / 2, (j.start[1] + j.end[1]) / 2),
                    xytext=(8, 8), textcoords="offset points", fontsize=8, color="magenta",
                    bbox={"boxstyle": "round,pad=0.2", "fc": "white", "ec": "none",
                          "alpha": 0.8})
    ax.set_aspect("equal")
    sc = check.shear_centre          # may lie outside the section (a channel's does)
    x0, x1 = min(x0, sc[0]), max(x1, sc[0])
    y0, y1 = min(y0, sc[1]), max(y1, sc[1])
    pad = 0.06 * max(x1 - x0, y1 - y0)
    ax.set_xlim(x0 - pad, x1 + pad)
    ax.set_ylim(y0 - pad, y1 + pad)
    ax.set_xlabel(f"x [{u.length}]")
    ax.set_ylabel(f"y [{u.length}]")
    vx, vy = (u.user_force(v) for v in check.V_solved)   # in the case's force unit
    v = (force_text(vy, u.force) if vx == 0 else force_text(vx, u.force) if vy == 0
         else f"({force_text(vx, u.force)}, {force_text(vy, u.force)})")
    ax.set_title(f"{case.name}: shear flow for V{'y' if vx == 0 else 'x' if vy == 0 else ''}"
                 f" = {v}\narrows: direction and size of τ; colour |τ| [{u.stress}]",
                 fontsize=10)
    ax.legend(loc="upper right", fontsize=8, framealpha=0.9)
    cax = make_axes_locatable(ax).append_axes("right", size="4%", pad=0.12)
    fig.colorbar(pc, cax=cax, label=f"|τ| [{u.stress}]",
                 extend="max" if check.tau_max_fe > top * (1 + 1e-9) else "neither")
    return save_png(fig, path)


def plot_wall_flow(check: SectionCheck, case: Case, path: str | Path) -> Path:
    """Shear flow along each wall's centre line: FE averaged through the wall (solid)
    against thin-wall theory (dashed), walls side by side and named."""
    u = case.units
    shape, params = case.section.shape, dict(case.section.params)
    flows = wall_flows(check.solution, shape, params, check.V_solved, 81)
    names = WALL_NAMES.get(shape, ())
    fig, ax = plt.subplots(figsize=(8.0, 4.4))
    offset, gap = 0.0, 0.06 * sum(w.segment.length for w in flows)
    for k, w in enumerate(flows):
        x = offset + w.s
        ax.plot(x, [u.user_force(q) for q in w.q_fe], color="tab:blue", lw=1.9,
                label="FE, through the wall" if k == 0 else None)
        ax.plot(x, [u.user_force(q) for q in w.q_thin], color="tab:orange", ls="--", lw=1.5,
                label="thin-wall theory" if k == 0 else None)
        ax.axvspan(x[0], x[-1], color="0.93" if k % 2 else "0.97", zorder=0)
        ax.text((x[0] + x[-1]) / 2, 1.0, names[k] if k < len(names) else f"wall {k}",
                transform=ax.get_xaxis_transform(), ha="center", va="bottom", fontsize=8)
        offset = x[-1] + gap
    ax.axhline(0.0, color="0.5", lw=0.6)
    ax.set_xticks([])
    ax.set_xlabel("along each wall's centre line, from its start (walls side by side; "
                  f"length to scale, {u.length})", fontsize=8)
    ax.set_ylabel(f"shear flow q [{u.force}/{u.length}]")
    vx, vy = (u.user_force(v) for v in check.V_solved)
    ax.set_title(f"{case.name}: shear flow along the walls, V = "
                 f"{force_text(vy if vx == 0 else np.hypot(vx, vy), u.force)}\n",
                 fontsize=10)
    ax.legend(fontsize=8, loc="best")
    ax.grid(alpha=0.3, axis="y")
    return save_png(fig, path)




def write_wall_figures(case: Case, run: SectionRun, folder: Path) -> list[Path]:
    """``section-flow.png`` always; ``wall-flow.png`` for shapes with straight walls."""
    folder = Path(folder)
    out = [plot_section_flow(run.finest, case, folder / "section-flow.png")]
    if case.section.shape in CENTRELINE_SHAPES and case.section.shape != "tube":
        out.append(plot_wall_flow(run.finest, case, folder / "wall-flow.png"))
    return out
