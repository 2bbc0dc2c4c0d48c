"""The convergence figure: how the governing FE figure settles as the mesh is refined.

Left: the governing quantity (``result.convergence``) against element size h on log-log
axes, with the Richardson-extrapolated value and the fine-grid GCI band
``phi_1 (1 +/- GCI)`` (Celik et al. 2008; see `fem.convergence`), and the curve
``phi_ext + (phi_1 - phi_ext)(h/h_1)^p`` that the extrapolation assumes. Right: every
tracked quantity's distance from its own extrapolated value, relative, against h; a
straight line of slope p is convergence at order p.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Any

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.ticker import FuncFormatter, NullFormatter  # noqa: E402

from fem.report.member_figures import FE_COLOUR, HAND_COLOUR, number  # noqa: E402
from fem.report.png import save_png  # noqa: E402
from fem.results import ConvergenceResult  # noqa: E402

__all__ = ["convergence_figure", "has_study", "quantity_label"]

_PLAIN = FuncFormatter(lambda v, _: number(v, 3))
_SIZE = FuncFormatter(lambda v, _: f"{v:g}")


def has_study(conv: ConvergenceResult | None) -> bool:
    """True when there are two or more levels to draw."""
    return conv is not None and len(conv.sizes) >= 2


def quantity_label(name: str, length_unit: str = "") -> str:
    """A tracked quantity's key (`fem.member.check`) in words.

    'cut x=20 tau_max' -> 'τmax at x = 20'.
    """
    L = f" {length_unit}" if length_unit else ""
    words = {"tau_max": "τmax", "von_mises": "von Mises", "tau": "|τxy|", "principal": "σ1"}
    m = re.fullmatch(r"cut x=(\S+) (\w+)", name)
    if m:
        return f"{words.get(m[2], m[2])} at x = {m[1]}{L}"
    m = re.fullmatch(r"corner \((.+)\) (\w+)", name)
    if m:
        return f"{words.get(m[2], m[2])} at the corner ({m[1]}){L}"
    m = re.fullmatch(r"peak (\w+)", name)
    if m:
        return f"peak {words.get(m[1], m[1])}"
    m = re.fullmatch(r"(\w+) at the governing cut x = (\S+)", name)
    if m:
        return f"{words.get(m[1], m[1])} at the governing cut x = {m[2]}{L}"
    return name


def convergence_figure(conv: ConvergenceResult, units: dict[str, str], path: Path) -> Path:
    """Write the convergence figure of a study with two or more levels to `path`."""
    if not has_study(conv):
        raise ValueError("a convergence figure needs two or more mesh levels")
    S, L = units["stress"], units["length"]
    h = np.asarray(conv.sizes, float)
    v = np.abs(np.asarray(conv.tau_max, float))
    order = np.argsort(h)
    h, v = h[order], v[order]
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(10.5, 4.2))
    ext = conv.extrapolated
    h_lo = h[0] / 4.0
    if conv.gci is not None:
        a1.axhspan(v[0] * (1 - conv.gci), v[0] * (1 + conv.gci), color=FE_COLOUR, alpha=0.12,
                   lw=0, label=f"GCI band: finest ± {conv.gci:.2%}")
    if ext is not None:
        a1.axhline(abs(ext), color=HAND_COLOUR, ls="--", lw=1.2,
                   label=f"extrapolated {number(abs(ext))} {S}")
        p = conv.observed_order if conv.observed_order is not None else 2.0
        hh = np.geomspace(h_lo, h[-1], 100)
        a1.plot(hh, abs(ext) + (v[0] - abs(ext)) * (hh / h[0]) ** p, color="#888888", lw=0.9,
                ls=":", label=f"Richardson curve, order {p:.2f}"
                + ("" if conv.observed_order is not None else " (assumed)"))
    a1.plot(h, v, "o-", color=FE_COLOUR, lw=1.6, ms=6, label="FE, per mesh level", zorder=5)
    for hk, vk in zip(h, v, strict=True):
        a1.annotate(number(vk), (hk, vk), xytext=(0, 7), textcoords="offset points",
                    ha="center", fontsize=7.5)
    a1.set_xscale("log")
    a1.set_yscale("log")
    a1.set_xlim(h_lo * 0.8, h[-1] * 1.3)
    _relative_panel(a2, conv.sizes, conv.quantities, conv.tau_max)
    for ax in (a1, a2):
        ax.xaxis.set_major_formatter(_SIZE)
        ax.xaxis.set_minor_formatter(NullFormatter())
        ax.set_xticks(h)
        ax.set_xlabel(f"element size h [{L}]")
        ax.grid(alpha=0.25, which="both")
        for side in ("top", "right"):
            ax.spines[side].set_visible(False)
    a1.yaxis.set_major_formatter(_PLAIN)
    a1.yaxis.set_minor_formatter(_PLAIN)
    name = quantity_label(conv.quantity, L) or "governing quantity"
    a1.set_ylabel(f"{name} [{S}]", fontsize=8.5)
    a1.legend(fontsize=7.5, frameon=False, loc="best")
    gci = "n/a" if conv.gci is None else f"{conv.gci:.2%}"
    a1.set_title(f"Governing figure: GCI {gci}, "
                 f"{'converged' if conv.converged else 'not converged'}", loc="left",
                 fontsize=10, fontweight="bold")
    return save_png(fig, path)


def _relative_panel(ax: Any, level_sizes: list[float],
                    quantities: dict[str, dict[str, Any]], governing: list[float]) -> None:
    colours = plt.get_cmap("tab10").colors
    markers = "osD^v<>ph*"
    drawn = 0
    rows = [(k, q) for k, q in quantities.items() if q.get("extrapolated")]
    for j, (name, q) in enumerate(rows):
        ext = abs(q["extrapolated"])
        sizes = np.asarray(level_sizes, float)
        vals = np.abs(np.asarray(q["values"], float))
        if sizes.size != vals.size:
            continue
        rel = np.abs(vals - ext) / ext
        ok = rel > 0
        if ok.sum() < 1:
            continue
        main = list(q["values"]) == list(governing)  # the governing series itself
        ax.plot(sizes[ok], rel[ok], marker=markers[j % len(markers)], ms=4,
                lw=2.2 if main else 1.0, color=colours[j % len(colours)],
                label=quantity_label(name) + (" (governing)" if main else ""))
        drawn += 1
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_ylabel("|FE − extrapolated| / extrapolated")
    two = len(level_sizes) == 2
    ax.set_title("Every tracked quantity" + (" (two levels: order 2 assumed)" if two else ""),
                 loc="left", fontsize=10, fontweight="bold")
    if drawn:
        ax.yaxis.set_major_formatter(FuncFormatter(lambda v, _: f"{100 * v:.3g} %"))
        ax.legend(fontsize=7, frameon=False, loc="upper left", bbox_to_anchor=(1.0, 1.0))
    else:
        ax.text(0.5, 0.5, "no quantity with an extrapolated value", transform=ax.transAxes,
                ha="center", va="center", fontsize=8)
