"""Longitudinal shear along the planes of a member (``check.planes``): FE against VQ/I.
Matplotlib with the Agg backend; PNG at 150 dpi."""

from __future__ import annotations

from pathlib import Path
from typing import Any

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402

from fem.report.png import save_png  # noqa: E402

__all__ = ["plot_planes"]


def plot_planes(planes: list[dict[str, Any]], units: dict[str, str], name: str,
                path: str | Path) -> Path:
    """q along x on every plane: FE solid, hand VQ/I dashed, excluded stations greyed."""
    F, L = units["force"], units["length"]
    fig, axes = plt.subplots(len(planes), 1, figsize=(8.0, 2.0 + 2.4 * len(planes)),
                             sharex=True, squeeze=False)
    for ax, p in zip(axes[:, 0], planes, strict=True):
        x = np.asarray(p["x"])
        ax.plot(x, p["q_fe"], color="tab:blue", lw=1.8, label="FE: τxy·t on the plane")
        ax.plot(x, p["q_hand"], color="tab:orange", ls="--", lw=1.5, label="hand: VQ/I")
        ex = np.asarray(p.get("excluded") or [False] * len(x), bool)
        for xx in x[ex]:
            ax.axvspan(xx - 0.5 * (x[1] - x[0]), xx + 0.5 * (x[1] - x[0]), color="0.85", lw=0)
        ax.axhline(0.0, color="0.5", lw=0.6)
        ax.set_ylabel(f"q [{F}/{L}]")
        ref = float(np.max(np.abs(p["q_fe"]))) * (x[-1] - x[0])  # round-off below 1e-9 ref
        tot = [0.0 if abs(v) < 1e-9 * ref else v for v in (p["total_fe"], p["total_hand"])]
        ax.set_title(f"plane y = {p['y']:g} {L}: total from x = {p['x_range'][0]:.4g} to "
                     f"{p['x_range'][1]:.4g}: FE {tot[0]:.4g} {F}, hand ΔF = {tot[1]:.4g} {F}",
                     fontsize=9)
        ax.grid(alpha=0.3)
        ax.legend(fontsize=8, loc="best")
    axes[-1, 0].set_xlabel(f"x [{L}]")
    fig.suptitle(f"{name}: longitudinal shear per unit length on the planes", fontsize=10)
    return save_png(fig, path)
