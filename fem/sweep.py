"""Parametric sweeps: one case file, some of its keys varied over ranges, one check per point.

``shearcheck sweep CASE.toml --vary geometry.length=100:400:7 [--vary ...]`` runs the
cartesian product of the ranges. Each point is the case file's parsed TOML with the dotted
keys replaced, written back to TOML (`dumps_toml`) and validated by `fem.case.parse_case`,
so a point is exactly what a user could have written by hand.

The output folder is the sweep's durable state, written only by the process that drives
the sweep (workers return their results; they write nothing)::

    sweep.json      what this sweep is: base case file and its hash, varied keys and values
    index.jsonl     one line per finished point (ok or failed), appended and fsynced
    points/p0003/   case.toml, and results.json (ok) or error.txt (failed)
    sweep.csv, summary.json, ratio.png   rebuilt from the index when the sweep ends

A point counts as finished only once its index line is on disk, so a sweep killed at any
moment loses no finished point, and re-running it skips exactly the indexed points
(a half-written last line is cut off first): nothing is repeated or duplicated. A point that
fails (bad input, a model that cannot be meshed or solved, any error in the chain) is a
finished point with its message. A local worker process that dies outright (a crash in
native code) stops the sweep with an internal error; a re-run resumes. On Dask such a point
is retried by the scheduler and then recorded as failed.
"""

from __future__ import annotations

import copy
import hashlib
import itertools
import json
import math
import os
import re
import sys
import threading
import traceback
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .errors import CaseError, SolveError
from .results import CAUTION, atomic_write, write_json

__all__ = [
    "Vary", "Point", "SweepReport", "parse_vary", "get_key", "set_key", "dumps_toml",
    "make_points", "run_point", "point_row", "run_sweep", "threshold", "progress_bar",
    "read_index", "ratio_figure", "process_pool", "CSV_FIELDS",
]

CSV_FIELDS = ("status", "verdict", "ratio_max", "tau_max_fe", "tau_max_hand", "gci", "message")
_POINT_LOCK = threading.Lock()   # one check at a time per process: gmsh is not thread-safe


# --------------------------------------------------------------------------- the ranges

@dataclass(frozen=True)
class Vary:
    """One varied key and its values (START:STOP:N, both ends included)."""

    key: str
    values: tuple[float, ...]


def parse_vary(spec: str) -> Vary:
    """Parse ``KEY=START:STOP:N`` (N >= 1 equally spaced values, ends included)."""
    m = re.fullmatch(r"\s*([A-Za-z0-9_.-]+)\s*=\s*([^:]+):([^:]+):([^:]+)\s*", spec)
    if not m:
        raise CaseError("--vary", spec, "write KEY=START:STOP:N, e.g. geometry.length=100:400:7")
    key, a, b, n = m.groups()
    try:
        start, stop, count = float(a), float(b), int(n)
    except ValueError:
        raise CaseError("--vary", key, f"START and STOP must be numbers and N a whole number, "
                                       f"got {a}:{b}:{n}") from None
    if count < 1 or not (math.isfinite(start) and math.isfinite(stop)):
        raise CaseError("--vary", key, "needs finite START and STOP and N >= 1")
    if count == 1:
        return Vary(key, (start,))
    step = (stop - start) / (count - 1)
    return Vary(key, tuple(start + i * step if i < count - 1 else stop for i in range(count)))


def _walk(data: Any, key: str, file: str) -> tuple[Any, str | int]:
    parts = key.split(".")
    node = data
    for i, part in enumerate(parts):
        last = i == len(parts) - 1
        where = ".".join(parts[: i + 1])
        if isinstance(node, list):
            if not part.isdigit() or int(part) >= len(node):
                raise CaseError(file, where, f"no entry {part}; the array has {len(node)} "
                                             "(numbered from 0)")
            idx: str | int = int(part)
        elif isinstance(node, dict):
            if part not in node:
                known = ", ".join(str(k) for k in node) or "none"
                raise CaseError(file, where, f"is not in the case file (known here: {known}); "
                                             "a sweep varies keys the file already has")
            idx = part
        else:
            raise CaseError(file, where, "is inside a plain value, not a table or array")
        if last:
            return node, idx
        node = node[idx]  # type: ignore[index]
    raise CaseError(file, key, "empty key")


def get_key(data: dict[str, Any], key: str, file: str = "<case>") -> Any:
    """The value at a dotted key (array entries by number: ``geometry.cutouts.0.fillet``)."""
    node, idx = _walk(data, key, file)
    return node[idx]


def set_key(data: dict[str, Any], key: str, value: float, file: str = "<case>") -> dict:
    """A deep copy of `data` with the number at the dotted `key` replaced by `value`.

    The key must exist and hold a number; a whole-number key (e.g. ``mesh.levels``) takes
    only whole values.
    """
    out = copy.deepcopy(data)
    node, idx = _walk(out, key, file)
    old = node[idx]
    if isinstance(old, bool) or not isinstance(old, int | float):
        raise CaseError(file, key, f"holds {old!r}; only numbers can be varied")
    if isinstance(old, int):
        if float(value) != round(value):
            raise CaseError(file, key, f"takes whole numbers, got {value:g}")
        value = int(round(value))
    node[idx] = value
    return out


# --------------------------------------------------------------------------- TOML out

_BARE = re.compile(r"[A-Za-z0-9_-]+")


def _key(k: str) -> str:
    return k if _BARE.fullmatch(k) else json.dumps(k, ensure_ascii=False)


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):   # JSON escapes are TOML's; DEL is the one control left raw
        return json.dumps(v, ensure_ascii=False).replace("\x7f", "\\u007f")
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{_key(k)} = {_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(f"cannot write {type(v).__name__} to TOML")


def _is_table_array(v: Any) -> bool:
    return isinstance(v, list) and bool(v) and all(isinstance(x, dict) for x in v)


def _table(lines: list[str], data: dict[str, Any], path: list[str]) -> None:
    for k, v in data.items():
        if not isinstance(v, dict) and not _is_table_array(v):
            lines.append(f"{_key(k)} = {_value(v)}")
    for k, v in data.items():
        name = ".".join(_key(p) for p in [*path, k])
        if isinstance(v, dict):
            lines += ["", f"[{name}]"]
            _table(lines, v, [*path, k])
        elif _is_table_array(v):
            for item in v:
                lines += ["", f"[[{name}]]"]
                _table(lines, item, [*path, k])


def dumps_toml(data: dict[str, Any]) -> str:
    """TOML text for a dict as `tomllib` returns it (tables, arrays of tables, scalars);
    ``tomllib.loads(dumps_toml(d)) == d``."""
    lines: list[str] = []
    _table(lines, data, [])
    return "\n".join(lines).lstrip("\n") + "\n"


# --------------------------------------------------------------------------- points

@dataclass(frozen=True)
class Point:
    id: str
    params: dict[str, float]
    text: str


def make_points(base: dict[str, Any], varies: list[Vary], file: str = "<case>",
                levels: int | None = None) -> list[Point]:
    """The cartesian product of the ranges, in order (the last key varies fastest)."""
    if levels is not None:
        base = copy.deepcopy(base)
        base.setdefault("mesh", {})["levels"] = int(levels)
    keys = [v.key for v in varies]
    if len(set(keys)) != len(keys):
        raise CaseError("--vary", keys[0], "the same key is varied twice")
    for v in varies:
        set_key(base, v.key, v.values[0], file)   # refuse a bad key before anything runs
    out = []
    for i, combo in enumerate(itertools.product(*(v.values for v in varies))):
        data = base
        for k, x in zip(keys, combo, strict=True):
            data = set_key(data, k, x, file)
        params = {k: get_key(data, k, file) for k in keys}
        out.append(Point(id=f"p{i:04d}", params=params, text=dumps_toml(data)))
    return out


def run_point(text: str, file: str) -> dict[str, Any]:
    """Check one point (in a worker); return ``{"status": "ok", "data": results}`` or
    ``{"status": "failed", "message": ...}``. Never raises for a bad point."""
    from .api import check
    from .case import parse_case

    with _POINT_LOCK:
        try:
            return {"status": "ok", "data": check(parse_case(text, file)).data}
        except CaseError as exc:
            return {"status": "failed", "message": str(exc)}
        except SolveError as exc:
            return {"status": "failed", "message": f"cannot solve: {exc}"}
        except Exception as exc:  # a point that breaks the chain must not stop the sweep
            return {"status": "failed", "message": f"{exc.__class__.__name__}: {exc}",
                    "traceback": traceback.format_exc()}


def _governing(data: dict[str, Any]) -> tuple[float | None, float | None, float | None]:
    if data.get("kind") == "section":
        s = data.get("section") or {}
        return s.get("ratio"), s.get("tau_max_fe"), s.get("tau_max_hand")
    cuts = [c for c in data.get("cuts") or [] if c.get("ratio") is not None]
    if not cuts:
        return None, None, None
    c = max(cuts, key=lambda c: c["ratio"])
    return c["ratio"], c["tau_max_fe"], c["tau_max_hand"]


def point_row(point: Point, outcome: dict[str, Any]) -> dict[str, Any]:
    """The index line of a finished point."""
    row: dict[str, Any] = {"id": point.id, "params": point.params, "status": outcome["status"]}
    if outcome["status"] == "ok":
        d = outcome["data"]
        ratio, fe, hand = _governing(d)
        row.update(verdict=d.get("verdict"), ratio_max=ratio, tau_max_fe=fe, tau_max_hand=hand,
                   gci=(d.get("convergence") or {}).get("gci"), message="")
    else:
        row.update(verdict=None, ratio_max=None, tau_max_fe=None, tau_max_hand=None, gci=None,
                   message=outcome.get("message", ""))
    return row


# --------------------------------------------------------------------------- the index

def read_index(path: Path) -> list[dict[str, Any]]:
    """Finished points in the index, first entry per id; a torn last line is cut off."""
    if not path.exists():
        return []
    raw = path.read_bytes()
    end = raw.rfind(b"\n") + 1
    if end < len(raw):                      # killed while writing: drop the partial line
        with open(path, "r+b") as fh:
            fh.truncate(end)
            fh.flush()
            os.fsync(fh.fileno())
    rows, seen = [], set()
    for line in raw[:end].decode("utf-8").splitlines():
        try:
            row = json.loads(line)
        except json.JSONDecodeError:
            continue
        if isinstance(row, dict) and row.get("id") not in seen:
            seen.add(row.get("id"))
            rows.append(row)
    return rows


def _append(path: Path, row: dict[str, Any]) -> None:
    line = json.dumps(row, allow_nan=False) + "\n"
    with open(path, "a", encoding="utf-8") as fh:
        fh.write(line)
        fh.flush()
        os.fsync(fh.fileno())


def _store(out: Path, point: Point, outcome: dict[str, Any]) -> dict[str, Any]:
    folder = out / "points" / point.id
    atomic_write(folder / "case.toml", point.text.encode("utf-8"))
    if outcome["status"] == "ok":
        write_json(outcome["data"], folder / "results.json")
    else:
        text = outcome.get("message", "") + "\n" + outcome.get("traceback", "")
        atomic_write(folder / "error.txt", text.encode("utf-8"))
    row = point_row(point, outcome)
    _append(out / "index.jsonl", row)
    return row


# --------------------------------------------------------------------------- running

def progress_bar(total: int, desc: str, quiet: bool = False, unit: str = "point") -> Any:
    """A tqdm bar on stderr; silent (disabled) when quiet or when stderr is not a terminal."""
    from tqdm import tqdm

    return tqdm(total=total, desc=desc, unit=unit, file=sys.stderr, dynamic_ncols=True,
                leave=False, disable=quiet or not sys.stderr.isatty())


def process_pool(workers: int | None):
    """A process pool (spawn: every worker a fresh interpreter with its own gmsh)."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    n = max(1, workers or os.cpu_count() or 1)
    return ProcessPoolExecutor(max_workers=n, mp_context=multiprocessing.get_context("spawn"))


def _label(out: Path, p: Point) -> str:
    """The name messages give a point's case: its case.toml in the sweep folder (so line
    numbers match, and messages do not depend on where the folder is)."""
    return f"points/{p.id}/case.toml"


def _run_local(todo: list[Point], out: Path, workers: int | None,
               done: Callable[[Point, dict[str, Any]], None]) -> None:
    from concurrent.futures import as_completed

    pool = process_pool(min(workers or os.cpu_count() or 1, len(todo)))
    try:
        futures = {pool.submit(run_point, p.text, _label(out, p)): p for p in todo}
        for fut in as_completed(futures):
            done(futures[fut], fut.result())
    except BaseException:
        pool.shutdown(wait=False, cancel_futures=True)
        raise
    pool.shutdown()


def _run_dask(todo: list[Point], out: Path, address: str, tag: str,
              done: Callable[[Point, dict[str, Any]], None]) -> None:
    try:
        from distributed import Client, as_completed
    except ImportError:
        raise CaseError("--scheduler", address, "needs Dask: pip install "
                                                "'shearcheck[cluster]'") from None
    try:
        client = Client(address, timeout="20s")
    except (OSError, TimeoutError) as exc:
        raise CaseError("--scheduler", address, f"cannot reach the scheduler ({exc})") from None
    try:
        futures = {client.submit(run_point, p.text, _label(out, p), pure=False,
                                 key=f"shearcheck-{tag}-{p.id}"): p for p in todo}
        for fut in as_completed(futures):
            try:
                outcome = fut.result()
            except Exception as exc:   # e.g. the worker died on this point, more than once
                outcome = {"status": "failed", "message": f"worker lost ({exc!r})"}
            done(futures[fut], outcome)
    finally:
        client.close()


@dataclass
class SweepReport:
    """What a sweep produced (also written to summary.json)."""

    out: Path
    rows: list[dict[str, Any]]
    ran: int
    skipped: int
    summary: dict[str, Any] = field(default_factory=dict)

    @property
    def failed(self) -> list[dict[str, Any]]:
        return [r for r in self.rows if r["status"] != "ok"]


def _identity(case_path: Path, text: str, varies: list[Vary], levels: int | None) -> dict:
    return {"schema": 1, "case": str(case_path),
            "case_sha256": hashlib.sha256(text.encode("utf-8")).hexdigest(),
            "vary": [{"key": v.key, "values": list(v.values)} for v in varies],
            "levels": levels}


def run_sweep(case_path: str | Path, varies: list[Vary], out: str | Path,
              workers: int | None = None, scheduler: str | None = None,
              levels: int | None = None, quiet: bool = False) -> SweepReport:
    """Run (or resume) a sweep into `out`; see the module docstring for the layout."""
    import tomllib

    from .case import parse_case

    case_path, out = Path(case_path), Path(out)
    try:
        text = case_path.read_text(encoding="utf-8")
    except OSError:
        raise CaseError(str(case_path), "", "file not found or unreadable") from None
    base_case = parse_case(text, str(case_path))          # the base itself must be valid
    base = tomllib.loads(text)
    if not varies:
        raise CaseError("--vary", "", "give at least one --vary KEY=START:STOP:N")
    points = make_points(base, varies, str(case_path), levels)
    ident = _identity(case_path, text, varies, levels)
    manifest = out / "sweep.json"
    if manifest.exists():
        old = json.loads(manifest.read_text(encoding="utf-8"))
        if {k: old.get(k) for k in ident if k != "case"} != {k: v for k, v in ident.items()
                                                              if k != "case"}:
            raise CaseError(str(manifest), "", "this folder holds another sweep (other case "
                                               "file, ranges or levels); use a new --out")
    else:
        atomic_write(manifest, json.dumps(ident, indent=1).encode("utf-8"))
    finished = {r["id"] for r in read_index(out / "index.jsonl")}
    todo = [p for p in points if p.id not in finished]
    bar = progress_bar(len(points), f"sweep {base_case.name}", quiet)
    bar.update(len(points) - len(todo))

    def done(p: Point, outcome: dict[str, Any]) -> None:
        row = _store(out, p, outcome)
        bar.set_postfix_str(f"{p.id} {row['status']}")
        bar.update(1)

    try:
        if todo and scheduler:
            _run_dask(todo, out, scheduler, ident["case_sha256"][:12], done)
        elif todo:
            _run_local(todo, out, workers, done)
    finally:
        bar.close()
    order = {p.id: i for i, p in enumerate(points)}
    rows = sorted((r for r in read_index(out / "index.jsonl") if r["id"] in order),
                  key=lambda r: order[r["id"]])
    rep = SweepReport(out=out, rows=rows, ran=len(todo), skipped=len(points) - len(todo))
    rep.summary = _finish(out, base_case, varies, rows)
    return rep


# --------------------------------------------------------------------------- results

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


def _finish(out: Path, case: Any, varies: list[Vary], rows: list[dict[str, Any]]) -> dict:
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
