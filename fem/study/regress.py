"""The regression suite: every bundled case against its stored baseline figures.

Each ``cases/NAME.toml`` has a ``cases/NAME.baseline.json`` beside it holding the figures
compared (`figures_of`), the mesh settings they were made with, and a relative tolerance
per figure chosen by `TOLERANCE_RULE`. ``shearcheck regress`` runs the cases in a process
pool (one fresh interpreter, hence one gmsh session, per worker), prints one row per figure
and reports a drift when any figure moves beyond its tolerance, the verdict changes, a
figure appears or disappears, or a case fails to run. ``--update`` rewrites the baselines
(only then), and only where a figure moved by more than round-off (`ROUND_OFF`): a figure
that did not keep its stored value and tolerance, a baseline none of whose figures moved
is not rewritten at all, and the table names every figure that moved.
"""

from __future__ import annotations

import json
import math
import os
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from fem.api import check
from fem.case.parse import load_case
from fem.errors import CaseError
from fem.provenance import package_version
from fem.results import atomic_write
from fem.study.pool import POINT_LOCK, end_workers, process_pool, progress_bar

__all__ = [
    "Row", "SuiteReport", "figures_of", "tolerances", "compare", "run_suite", "case_paths",
    "format_table", "baseline_path", "TOLERANCE_RULE", "REL_FLOOR", "REL_CAP", "PERTURB",
    "STRESS_FLOOR", "ROUND_OFF", "merge_baseline",
]

REL_FLOOR = 0.005   # the convergence module's SETTLED: below it, changes are sampling noise
REL_CAP = 0.25
PERTURB = 0.9       # the second mesh of the tolerance rule: element size times this
ROUND_OFF = 1e-9    # relative change below which a figure has not moved (floating-point noise)
STRESS_FLOOR = 0.01  # beam stresses are compared relative to at least this x peak von Mises
TOLERANCE_RULE = (
    "Relative tolerance per figure = 2 x its relative change when the case is re-run with "
    f"the element size times {PERTURB:g} (another mesh of the same fineness: what a harmless "
    "change in meshing does), at least 0.5 % (the level below which shearcheck counts a "
    "change as sampling noise) and at most 25 %. A beam's shear stresses are compared relative "
    "to the larger of |value| and 1 % of its peak von Mises stress (a cut that carries almost "
    "no shear is not held to its noise), a section's shear-centre coordinates relative to "
    "the larger of |value| and sqrt(A). The verdict must match exactly.")


def baseline_path(case_path: Path) -> Path:
    return case_path.with_name(case_path.name.removesuffix(".toml") + ".baseline.json")


def figures_of(data: dict[str, Any]) -> dict[str, dict[str, Any]]:
    """The compared figures of a results.json dict: name -> {"value", "scale"?}."""
    f: dict[str, dict[str, Any]] = {"verdict": {"value": data["verdict"]}}
    if data["kind"] == "section":
        s = data["section"]
        f["section tau_max_fe"] = {"value": s.get("tau_max_fe")}
        f["section ratio"] = {"value": s.get("ratio")}
        f["section J"] = {"value": s.get("J")}
        scale = math.sqrt(s["A"]) if s.get("A") else 0.0
        sc = s.get("shear_centre") or [None, None]
        f["section shear_centre x"] = {"value": sc[0], "scale": scale}
        f["section shear_centre y"] = {"value": sc[1], "scale": scale}
        for j in data.get("joints") or []:   # joint lines (fem.section.joints)
            f[f"joint {j['name']} q_fe"] = {"value": j["q_fe"]}
            f[f"joint {j['name']} ratio"] = {"value": j["ratio"]}
        return f
    pk = data.get("peak") or {}
    floor = STRESS_FLOOR * (pk.get("von_mises_max") or 0.0)
    for c in data.get("cuts") or []:
        f[f"cut x={c['x']:g} tau_max_fe"] = {"value": c["tau_max_fe"], "scale": floor}
        f[f"cut x={c['x']:g} ratio"] = {"value": c["ratio"]}
    f["peak tau_max"] = {"value": pk.get("tau_max"), "scale": floor}
    f["peak von_mises_max"] = {"value": pk.get("von_mises_max")}
    for p in data.get("planes") or []:   # check.planes (fem.member.planes)
        k = len(p["x"]) // 4   # a quarter of the way along (mid-length may carry no shear)
        f[f"plane y={p['y']:g} q_fe quarter"] = {"value": p["q_fe"][k]}
        f[f"plane y={p['y']:g} total_fe"] = {"value": p["total_fe"],
                                            "scale": abs(max(p["q_fe"], key=abs))
                                            * (p["x_range"][1] - p["x_range"][0])}
    return f


def _rel(a: Any, b: Any, scale: float = 0.0) -> float | None:
    """Relative change from a to b; None when either is not a number."""
    if not isinstance(a, int | float) or not isinstance(b, int | float):
        return None
    ref = max(abs(a), scale)
    if ref == 0.0:
        return 0.0 if b == 0 else math.inf
    return abs(b - a) / ref


def tolerances(fig: dict[str, dict], perturbed: dict[str, dict]) -> dict[str, dict]:
    """Attach `rel_tol` to each numeric figure by TOLERANCE_RULE."""
    out = {}
    for name, f in fig.items():
        g = dict(f)
        if isinstance(f["value"], int | float) and not isinstance(f["value"], bool):
            d = _rel(f["value"], perturbed.get(name, {}).get("value"), f.get("scale", 0.0))
            d = 0.0 if d is None else d
            g["rel_tol"] = float(f"{min(max(2.0 * d, REL_FLOOR), REL_CAP):.3g}")
        out[name] = g
    return out


@dataclass
class Row:
    case: str
    figure: str
    baseline: Any
    now: Any
    change: float | None
    status: str  # ok | drift | changed | new | gone | missing | error: ... | updated | created

    @property
    def holds(self) -> bool:
        return self.status in ("ok", "updated", "created")


def _moved(b: dict[str, Any] | None, n: dict[str, Any] | None) -> bool:
    """Whether a figure moved by more than round-off between a baseline entry and now."""
    if b is None or n is None:
        return b is not n
    bv, nv = b["value"], n["value"]
    d = _rel(bv, nv, b.get("scale", 0.0))
    if d is None or isinstance(bv, bool) or isinstance(nv, bool):
        return bv != nv
    return d > ROUND_OFF


def merge_baseline(base: dict[str, Any] | None, fig: dict[str, dict], tol: dict[str, dict],
                   settings: dict[str, Any]) -> tuple[dict[str, dict] | None, list[str]]:
    """The figures to store and the names of those that moved by more than `ROUND_OFF`.

    A figure that has not moved keeps its stored entry (value and tolerance); a moved, new
    or gone one takes `tol`'s entry (or leaves). Returns (None, []) when nothing moved and
    the settings are those the baseline was made with: the file stays as it is.
    """
    old = (base or {}).get("figures")
    same_settings = base is not None and all(
        base.get("made_with", {}).get(k) == settings.get(k) for k in ("levels", "size", "order"))
    if old is None or not same_settings:
        return tol, list(fig)
    names = [n for n in list(old) + [n for n in fig if n not in old]
             if _moved(old.get(n), fig.get(n))]
    if not names:
        return None, []
    merged = {n: (tol[n] if n in names else old[n]) for n in fig}
    return merged, names


def compare(case: str, base: dict[str, Any] | None, fig: dict[str, dict],
            settings: dict[str, Any]) -> list[Row]:
    """Rows comparing figures now against a baseline file's content."""
    if base is None:
        return [Row(case, "baseline", None, None, None, "missing")]
    rows = []
    made = base.get("made_with", {})
    for k in ("levels", "size", "order"):
        if made.get(k) != settings.get(k):
            rows.append(Row(case, f"settings {k}", made.get(k), settings.get(k), None,
                            "changed"))
    bf = base.get("figures", {})
    for name in list(bf) + [n for n in fig if n not in bf]:
        b, n = bf.get(name), fig.get(name)
        if b is None:
            rows.append(Row(case, name, None, n["value"], None, "new"))
            continue
        if n is None:
            rows.append(Row(case, name, b["value"], None, None, "gone"))
            continue
        bv, nv = b["value"], n["value"]
        if "rel_tol" not in b or bv is None or nv is None:
            rows.append(Row(case, name, bv, nv, None, "ok" if bv == nv else "changed"))
            continue
        d = _rel(bv, nv, b.get("scale", 0.0))
        rows.append(Row(case, name, bv, nv, d, "ok" if d is not None and d <= b["rel_tol"]
                        else "drift"))
    return rows


# --------------------------------------------------------------------------- running

def _run_case(path: str, levels: int | None, factor: float) -> dict[str, Any]:
    """Worker: run one case at the given settings; figures or the error message."""
    t0 = time.perf_counter()
    with POINT_LOCK:
        try:
            case = load_case(path)
            case = case.with_mesh(levels=levels or case.mesh.levels,
                                  size=case.mesh.size * factor)
            data = check(case).data
        except Exception as exc:  # a broken case is a finding of the suite, not a crash
            return {"path": path, "error": f"{exc.__class__.__name__}: {exc}"}
    return {"path": path, "figures": figures_of(data), "name": data["case"],
            "settings": {"levels": case.mesh.levels, "size": case.mesh.size,
                         "order": case.mesh.order},
            "seconds": time.perf_counter() - t0}


def case_paths(folder: Path, only: list[str] | None = None) -> list[Path]:
    """The case files of a folder (NAME.toml), optionally only the named ones."""
    folder = Path(folder)
    if not folder.is_dir():
        raise CaseError(str(folder), "", "is not a folder of case files")
    paths = sorted(p for p in folder.glob("*.toml"))
    if only:
        names = {p.name.removesuffix(".toml"): p for p in paths}
        unknown = [n for n in only if n.removesuffix(".toml") not in names]
        if unknown:
            raise CaseError(str(folder), "--only", f"no case {unknown[0]!r}; the folder has: "
                                                   f"{', '.join(names) or 'none'}")
        paths = [names[n.removesuffix(".toml")] for n in only]
    if not paths:
        raise CaseError(str(folder), "", "holds no *.toml case files")
    return paths


@dataclass
class SuiteReport:
    rows: list[Row] = field(default_factory=list)
    seconds: dict[str, float] = field(default_factory=dict)
    wall: float = 0.0
    updated: list[Path] = field(default_factory=list)
    kept: list[Path] = field(default_factory=list)     # --update: nothing moved, not rewritten

    @property
    def holds(self) -> bool:
        return all(r.holds for r in self.rows)

    @property
    def drifts(self) -> list[Row]:
        return [r for r in self.rows if not r.holds]


def run_suite(folder: str | Path = "cases", only: list[str] | None = None,
              update: bool = False, levels: int | None = None, workers: int | None = None,
              quiet: bool = False) -> SuiteReport:
    """Run the cases of `folder` against their baselines (or rewrite them with `update`).

    Cases run at the mesh of their file and at the baseline's number of levels (1 for a
    case without a baseline), unless `levels` is given.
    """
    from concurrent.futures import as_completed

    t0 = time.perf_counter()
    paths = case_paths(Path(folder), only)
    bases: dict[str, dict | None] = {}
    for p in paths:
        bp = baseline_path(p)
        try:
            bases[str(p)] = json.loads(bp.read_text(encoding="utf-8")) if bp.exists() else None
        except (OSError, json.JSONDecodeError) as exc:
            raise CaseError(str(bp), "", f"cannot read the baseline ({exc})") from None
    jobs = []
    for p in paths:
        lv = levels or (bases[str(p)] or {}).get("made_with", {}).get("levels", 1)
        jobs.append((str(p), lv, 1.0))
        if update:
            jobs.append((str(p), lv, PERTURB))
    outcome: dict[tuple[str, float], dict] = {}
    bar = progress_bar(len(jobs), "regress", quiet, unit="run")
    pool = process_pool(min(workers or os.cpu_count() or 1, len(jobs)))
    try:
        futs = {pool.submit(_run_case, *j): j for j in jobs}
        for fut in as_completed(futs):
            j = futs[fut]
            outcome[(j[0], j[2])] = fut.result()
            bar.set_postfix_str(Path(j[0]).name.removesuffix(".toml"))
            bar.update(1)
    except BaseException:
        end_workers(pool)          # running workers too, not only the queued runs
        raise
    finally:
        bar.close()
    pool.shutdown()
    rep = SuiteReport()
    for p in paths:
        name = p.name.removesuffix(".toml")
        res = outcome[(str(p), 1.0)]
        if "error" in res:
            rep.rows.append(Row(name, "run", None, None, None, f"error: {res['error']}"))
            continue
        rep.seconds[name] = res["seconds"]
        if not update:
            rep.rows += compare(name, bases[str(p)], res["figures"], res["settings"])
            continue
        pert = outcome[(str(p), PERTURB)]
        if "error" in pert:
            rep.rows.append(Row(name, "run (size x 0.9)", None, None, None,
                                f"error: {pert['error']}"))
            continue
        base = bases[str(p)]
        figures, moved = merge_baseline(base, res["figures"],
                                        tolerances(res["figures"], pert["figures"]),
                                        res["settings"])
        if figures is None:
            rep.kept.append(baseline_path(p))
            continue
        rows = compare(name, base, res["figures"], res["settings"])
        rep.rows += [Row(r.case, r.figure, r.baseline, r.now, r.change,
                         "created" if r.status == "missing" else "updated")
                     for r in rows if r.status == "missing" or r.figure in moved
                     or r.figure.startswith("settings ")]
        _write_baseline(p, res, figures)
        rep.updated.append(baseline_path(p))
    rep.wall = time.perf_counter() - t0
    return rep


def _write_baseline(path: Path, res: dict[str, Any], figures: dict[str, dict]) -> None:
    data = {
        "schema": 1, "case": res["name"],
        "made_with": {**res["settings"], "gmsh": package_version("gmsh"),
                      "scikit-fem": package_version("scikit-fem")},
        "tolerance_rule": TOLERANCE_RULE,
        "figures": figures,
    }
    atomic_write(baseline_path(path), (json.dumps(data, indent=1, allow_nan=False) + "\n")
                 .encode("utf-8"))


# --------------------------------------------------------------------------- the table

def _show(v: Any) -> str:
    if v is None:
        return "-"
    if isinstance(v, float):
        return f"{v:.6g}"
    return str(v)


def format_table(rep: SuiteReport, all_rows: bool = True) -> str:
    """case | figure | baseline | now | change | status, then one closing line."""
    rows = rep.rows if all_rows else rep.drifts
    head = ("case", "figure", "baseline", "now", "change", "status")
    cells = [head] + [(r.case, r.figure, _show(r.baseline), _show(r.now),
                       "-" if r.change is None else f"{100 * r.change:.3g} %", r.status)
                      for r in rows]
    w = [max(len(c[i]) for c in cells) for i in range(5)]
    lines = ["  ".join(c[i].ljust(w[i]) for i in range(5)) + "  " + c[5] for c in cells]
    cases = sorted({r.case for r in rep.rows})
    if (rep.updated or rep.kept) and rep.holds:
        made = sum(r.status == "created" for r in rep.rows)
        changed = sum(r.status == "updated" for r in rep.rows)
        names = ", ".join(p.name.removesuffix(".baseline.json") for p in rep.updated)
        lines.append(f"wrote {len(rep.updated)} baseline(s) ({made} new)"
                     + (f": {names}" if names else "")
                     + f"; {changed} figure(s) moved by more than round-off; "
                     f"{len(rep.kept)} baseline(s) unchanged, not rewritten "
                     f"({rep.wall:.1f} s)")
    elif rep.holds:
        lines.append(f"all {len(rep.rows)} figures of {len(cases)} case(s) hold "
                     f"({rep.wall:.1f} s)")
    else:
        bad = ", ".join(f"{r.case}: {r.figure} ({r.status})" for r in rep.drifts)
        lines.append(f"DRIFT in {len({r.case for r in rep.drifts})} of {len(cases)} case(s): "
                     f"{bad}")
    return "\n".join(lines)
