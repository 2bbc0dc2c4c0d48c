"""Figures of a beam check (matplotlib, Agg): shear and von Mises contours, cut profiles.

Colour: a diverging, perceptually uniform map centred on zero for signed shear
('coolwarm' with a symmetric norm), a sequential one for magnitudes ('cividis');
Gouraud shading, no contour bands. Every figure names its quantity and units.
"""

from __future__ import annotations

from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.colors import TwoSlopeNorm  # noqa: E402
from matplotlib.tri import Triangulation  # noqa: E402

from .case import Case  # noqa: E402
from .level import Level  # noqa: E402
from .plane import domain_polygon  # noqa: E402
from .results import CutResult  # noqa: E402

__all__ = ["contour_figure", "profile_figure", "write_beam_figures", "DIVERGING", "SEQUENTIAL"]

DIVERGING = "coolwarm"
SEQUENTIAL = "cividis"
INK = "#222222"


def _outline(ax, case: Case) -> None:
    dom = domain_polygon(case.geometry)  # type: ignore[arg-type]
    for ring in [dom.exterior, *dom.interiors]:
        x, y = ring.xy
        ax.plot(x, y, color=INK, lw=0.8)


def _patches(ax, case: Case, level: Level) -> None:
    for p in level.mm.supports:
        if p.point is not None:
            ax.plot(*p.point, marker="^", color="#1b7837", ms=8, zorder=5)
        for a, b in p.segments:
            ax.plot([a[0], b[0]], [a[1], b[1]], color="#1b7837", lw=4, alpha=0.8,
                    solid_capstyle="butt", zorder=5)
    dom = domain_polygon(case.geometry)  # type: ignore[arg-type]
    span = max(dom.bounds[2] - dom.bounds[0], dom.bounds[3] - dom.bounds[1])
    for p, ld in zip(level.mm.loads, case.loads, strict=True):
        if p.hole is not None:
            h = case.geometry.holes[p.hole]
            x, y = h.center
        else:
            x, y = p.centroid
            for a, b in p.segments:
                ax.plot([a[0], b[0]], [a[1], b[1]], color="#762a83", lw=4, alpha=0.8,
                        solid_capstyle="butt", zorder=5)
        F = np.asarray(ld.force, float)
        d = F / max(np.hypot(*F), 1e-300) * 0.12 * span
        ax.annotate("", xy=(x, y), xytext=(x - d[0], y - d[1]), zorder=6,
                    arrowprops={"arrowstyle": "-|>", "color": "#762a83", "lw": 1.8})


def contour_figure(case: Case, level: Level, cuts: list[CutResult], quantity: str,
                   path: Path) -> Path:
    """Smooth contour of 'txy' (diverging) or 'von_mises' (sequential) with the model drawn."""
    f = level.field
    tri = Triangulation(f.p[0], f.p[1], f.t.T)
    vals = f.nodal[quantity]
    S, L = case.units.stress, case.units.length
    dom = domain_polygon(case.geometry)  # type: ignore[arg-type]
    w = dom.bounds[2] - dom.bounds[0]
    h = dom.bounds[3] - dom.bounds[1]
    fig, ax = plt.subplots(figsize=(8.0, max(2.8, min(7.0, 8.0 * h / w + 1.2))))
    if quantity == "txy":
        lim = float(np.abs(vals).max()) or 1.0
        im = ax.tripcolor(tri, vals, shading="gouraud", cmap=DIVERGING,
                          norm=TwoSlopeNorm(0.0, -lim, lim))
        label = f"shear stress τxy [{S}]"
    else:
        im = ax.tripcolor(tri, vals, shading="gouraud", cmap=SEQUENTIAL)
        label = f"von Mises stress [{S}]"
    _outline(ax, case)
    for c in cuts:
        ys = c.profile.y
        ax.plot([c.x, c.x], [min(ys), max(ys)], color=INK, lw=0.9, ls=(0, (4, 3)))
        ax.text(c.x, max(ys), f" {c.x:g}", rotation=90, va="bottom", ha="center", fontsize=7,
                color=INK)
    _patches(ax, case, level)
    ax.set_aspect("equal")
    ax.set_xlabel(f"x [{L}]")
    ax.set_ylabel(f"y [{L}]")
    ax.set_title(f"{case.title} — {label.split(' [')[0]}", loc="left", fontsize=10)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    cb = fig.colorbar(im, ax=ax, shrink=0.85, pad=0.02)
    cb.set_label(label)
    fig.tight_layout()
    fig.savefig(path, dpi=150)
    plt.close(fig)
    return path


def profile_figure(case: Case, cut: CutResult, path: Path) -> Path:
    """tau(y) FE vs hand at one cut, and sigma_x beside it."""
    S, L = case.units.stress, case.units.length
    y = np.asarray(cut.profile.y)
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(7.5, 4.0), sharey=True)
    a1.plot(cut.profile.tau_fe, y, color="#b2182b", lw=1.8, label="FE")
    a1.plot(cut.profile.tau_hand, y, color="#2166ac", lw=1.4, ls="--",
            label="shear formula VQ/(Ib)")
    if case.check.method != "shear-formula":
        sign = np.sign(np.mean(cut.profile.tau_fe)) or 1.0
        a1.axvline(sign * cut.tau_max_hand, color="#4d4d4d", lw=1.0, ls=":",
                   label=f"{case.check.method} value")
    a1.set_xlabel(f"τxy [{S}]")
    a1.set_ylabel(f"y [{L}]")
    ratio = "n/a (no hand shear)" if cut.ratio is None else f"{cut.ratio:.3f}"
    a1.set_title(f"x = {cut.x:g} {L}: FE/hand {ratio}", loc="left", fontsize=10)
    a1.legend(fontsize=8, frameon=False)
    a2.plot(cut.profile.sigma_x_fe, y, color="#b2182b", lw=1.8, label="FE")
    a2.plot(cut.profile.sigma_x_hand, y, color="#2166ac", lw=1.4, ls="--", label="N/A + My/I")
    a2.set_xlabel(f"σx [{S}]")
    a2.legend(fontsize=8, frameon=False)
    for a in (a1, a2):
        a.axvline(0.0, color="#bbbbbb", lw=0.6)
        a.grid(alpha=0.25)
        for side in ("top", "right"):
            a.spines[side].set_visible(False)
    fig.tight_layout()
    fig.savefig(path, dpi=150)
    plt.close(fig)
    return path


def write_beam_figures(case: Case, level: Level, cuts: list[CutResult],
                       folder: Path) -> list[Path]:
    folder = Path(folder)
    out = [contour_figure(case, level, cuts, "txy", folder / "shear-contour.png"),
           contour_figure(case, level, cuts, "von_mises", folder / "von-mises-contour.png")]
    for i, c in enumerate(cuts):
        out.append(profile_figure(case, c, folder / f"profile-{i + 1:02d}.png"))
    return out
