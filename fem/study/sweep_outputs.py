"""What a finished sweep writes from its index: sweep.csv, summary.json and ratio.png.

`threshold` finds where the governing ratio crosses 1 + tolerance along a 1-D sweep.
"""

from __future__ import annotations

import itertools
import os
from collections.abc import Iterable
from pathlib import Path
from typing import Any

from fem.results import CAUTION, atomic_write, write_json
from fem.study.keys import Vary

__all__ = ["CSV_FIELDS", "threshold", "ratio_figure", "finish"]

CSV_FIELDS = ("status", "verdict", "ratio_max", "tau_max_fe", "tau_max_hand", "gci", "message")

def threshold(xs: Iterable[float], ratios: Iterable[float | None],
              level: float) -> tuple[float | None, list[float]]:
    """Where the ratio crosses `level` (linear interpolation between neighbouring points,
    in ascending x): (first crossing or None, all crossings)."""
    pts = sorted((x, r) for x, r in zip(xs, ratios, strict=True) if r is not None)
    cross = []
    for (x0, r0), (x1, r1) in itertools.pairwise(pts):
        d0, d1 = r0 - level, r1 - level
        if d0 == 0.0:
            cross.append(x0)
        elif d0 * d1 < 0:
            cross.append(x0 + (x1 - x0) * d0 / (d0 - d1))
    if pts and pts[-1][1] == level:
        cross.append(pts[-1][0])
    cross = sorted(set(cross))
    return (cross[0] if cross else None), cross


def _fmt(v: Any) -> str:
    if v is None:
        return ""
    if isinstance(v, float):
        return f"{v:.10g}"
    return str(v)


def _csv(path: Path, varies: list[Vary], rows: list[dict[str, Any]]) -> None:
    import csv
    import io

    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["id", *[v.key for v in varies], *CSV_FIELDS])
    for r in rows:
        w.writerow([r["id"], *[_fmt(r["params"][v.key]) for v in varies],
                    *[_fmt(r.get(k)) for k in CSV_FIELDS]])
    atomic_write(path, buf.getvalue().encode("utf-8"))


def _unit(key: str, case: Any) -> str:
    u = case.units
    last = key.split(".")
    if last[0] == "loads" and "force" in last:
        return u.force
    if key in ("material.E", "material.yield", "check.hand_value"):
        return u.stress
    if key in ("material.nu", "check.tolerance", "mesh.levels", "mesh.order", "schema"):
        return "-"
    return u.length


def finish(out: Path, case: Any, varies: list[Vary], rows: list[dict[str, Any]]) -> dict:
    tol = case.check.tolerance
    level = 1.0 + tol
    rows = sorted(rows, key=lambda r: int(r["id"][1:]))
    ok = [r for r in rows if r["status"] == "ok"]
    summary: dict[str, Any] = {
        "schema": 1, "case": case.name, "parameters": [v.key for v in varies],
        "points": len(rows), "ok": len(ok), "failed": len(rows) - len(ok),
        "tolerance": tol, "level": level, "threshold": None, "crossings": [],
        "failures": [{"id": r["id"], "params": r["params"], "message": r["message"]}
                     for r in rows if r["status"] != "ok"],
        "caution": CAUTION,
    }
    if len(varies) == 1:
        k = varies[0].key
        th, cross = threshold([r["params"][k] for r in ok], [r["ratio_max"] for r in ok], level)
        summary["threshold"], summary["crossings"] = th, cross
    else:
        summary["note"] = "threshold is given for 1-D sweeps only"
    _csv(out / "sweep.csv", varies, rows)
    write_json(summary, out / "summary.json")
    if ok:
        ratio_figure(out / "ratio.png", case, varies, ok, level, summary["threshold"])
    return summary


def ratio_figure(path: Path, case: Any, varies: list[Vary], rows: list[dict[str, Any]],
                 level: float, at: float | None) -> Path:
    """Max ratio against the first varied key; one line per combination of the others,
    coloured along a perceptually uniform map; the 1 + tolerance line dashed."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    k0 = varies[0].key
    groups: dict[tuple, list[tuple[float, float]]] = {}
    for r in rows:
        if r["ratio_max"] is None:
            continue
        rest = tuple(r["params"][v.key] for v in varies[1:])
        groups.setdefault(rest, []).append((r["params"][k0], r["ratio_max"]))
    cmap = plt.get_cmap("viridis")
    fig, ax = plt.subplots(figsize=(6.4, 4.2), constrained_layout=True)
    for j, (rest, pts) in enumerate(sorted(groups.items())):
        pts.sort()
        label = ", ".join(f"{v.key} = {x:g} {_unit(v.key, case)}".replace(" -", "")
                          for v, x in zip(varies[1:], rest, strict=True))
        colour = cmap(0.15 + 0.7 * j / max(1, len(groups) - 1)) if len(groups) > 1 else "C0"
        ax.plot([p[0] for p in pts], [p[1] for p in pts], "o-", color=colour, ms=4,
                label=label or None)
    ax.axhline(level, color="0.3", ls="--", lw=1.0, label=f"1 + tolerance = {level:g}")
    if at is not None:
        ax.axvline(at, color="0.3", ls=":", lw=1.0, label=f"threshold {k0} = {at:.4g}")
    ax.set_xlabel(f"{k0} [{_unit(k0, case)}]")
    ax.set_ylabel("max ratio τ_FE / τ_hand [-]")
    ax.set_title(f"{case.name}: FE against the {case.check.method} value", fontsize=10)
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=8)
    fig.get_layout_engine().set(rect=(0.0, 0.035, 1.0, 0.965))  # room for the caution
    fig.text(0.01, 0.008, CAUTION, fontsize=6, color="0.35")
    tmp = path.with_name(f".{path.stem}.tmp{path.suffix}")
    fig.savefig(tmp, dpi=120)
    plt.close(fig)
    os.replace(tmp, path)
    return path
