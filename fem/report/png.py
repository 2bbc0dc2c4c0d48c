"""One way to write a figure: a PNG moved into place whole, the figure closed after."""

from __future__ import annotations

import os
from pathlib import Path

import matplotlib

matplotlib.use("Agg")

import matplotlib.pyplot as plt  # noqa: E402

__all__ = ["save_png", "DPI"]

DPI = 150   # sharp on an A4 page at two figures a page, small enough to embed in the note


def save_png(fig: plt.Figure, path: str | Path, tight: bool = True, dpi: float = DPI) -> Path:
    """Write `fig` to `path` (folders made; written beside it, then moved in place, so never
    half a file), laid out tight unless the caller already placed its parts
    (`tight=False`), and close it."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    if tight:
        fig.tight_layout()
    tmp = path.with_name(f".{path.name}.tmp")
    fig.savefig(tmp, dpi=dpi, format="png")
    plt.close(fig)
    os.replace(tmp, path)
    return path
