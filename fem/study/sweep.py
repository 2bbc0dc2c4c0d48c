"""Parametric sweeps: one case file, some of its keys varied over ranges, one check per point.

``shearcheck sweep CASE.toml --vary geometry.length=100:400:7 [--vary ...]`` runs the
cartesian product of the ranges. Each point is the case file's parsed TOML with the dotted
keys replaced, written back to TOML (`dumps_toml`) and validated by `fem.case.parse.parse_case`,
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
import tomllib
import traceback
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from fem.api import check
from fem.case.limits import MAX_SWEEP_POINTS
from fem.case.parse import parse_case, read_case_text
from fem.errors import CaseError, SolveError
from fem.output_folder import check_writable
from fem.results import atomic_write, write_json
from fem.study.cluster import (
    SCHEDULER_DEADLINE,
    connect_client,
    parse_scheduler,
    probe_scheduler,
)
from fem.study.index import append_row, compact_index, read_index, refuse_link
from fem.study.keys import Vary, get_key, parse_vary, set_key
from fem.study.pool import (
    POINT_LOCK,
    end_workers,
    process_pool,
    progress_bar,
    terminate_as_interrupt,
)
from fem.study.sweep_outputs import CSV_FIELDS, finish, ratio_figure, threshold
from fem.study.toml_writer import dumps_toml

__all__ = [
    "Vary", "Point", "SweepReport", "parse_vary", "get_key", "set_key", "dumps_toml",
    "make_points", "check_sweep_size", "run_point", "point_row", "run_sweep", "threshold",
    "progress_bar",
    "read_index", "ratio_figure", "process_pool", "CSV_FIELDS",
]



# --------------------------------------------------------------------------- points

@dataclass(frozen=True)
class Point:
    id: str
    params: dict[str, float]
    text: str


def check_sweep_size(varies: list[Vary]) -> None:
    """Refuse a product of --vary counts above `MAX_SWEEP_POINTS` (before any point)."""
    total = math.prod(len(v.values) for v in varies)
    if total > MAX_SWEEP_POINTS:
        counts = " x ".join(f"{len(v.values):,}" for v in varies)
        raise CaseError("--vary", varies[0].key, f"the ranges make {counts} = {total:,} "
                                                 f"points, above the limit of "
                                                 f"{MAX_SWEEP_POINTS:,} sweep points")


def make_points(base: dict[str, Any], varies: list[Vary], file: str = "<case>",
                levels: int | None = None) -> list[Point]:
    """The cartesian product of the ranges, in order (the last key varies fastest)."""
    if levels is not None:
        base = copy.deepcopy(base)
        base.setdefault("mesh", {})["levels"] = int(levels)
    keys = [v.key for v in varies]
    check_sweep_size(varies)
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


def run_point(text: str, file: str, folder: str | None = None) -> dict[str, Any]:
    """Check one point (in a worker); return ``{"status": "ok", "data": results}`` or
    ``{"status": "failed", "message": ...}``. Never raises for a bad point. `folder` is the
    base case's folder, where a drawing it names is found."""
    with POINT_LOCK:
        try:
            return {"status": "ok", "data": check(parse_case(text, file, folder)).data}
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


def _store(out: Path, point: Point, outcome: dict[str, Any]) -> dict[str, Any]:
    folder = out / "points" / point.id
    for d in (out / "points", folder):
        refuse_link(d)          # a link planted in the folder would take the files elsewhere
    atomic_write(folder / "case.toml", point.text.encode("utf-8"))
    if outcome["status"] == "ok":
        write_json(outcome["data"], folder / "results.json")
    else:
        text = outcome.get("message", "") + "\n" + outcome.get("traceback", "")
        atomic_write(folder / "error.txt", text.encode("utf-8"))
    row = point_row(point, outcome)
    append_row(out / "index.jsonl", row)
    return row


def _label(out: Path, p: Point) -> str:
    """The name messages give a point's case: its case.toml in the sweep folder (so line
    numbers match, and messages do not depend on where the folder is)."""
    return f"points/{p.id}/case.toml"


def _run_local(todo: list[Point], out: Path, workers: int | None,
               done: Callable[[Point, dict[str, Any]], None], folder: str | None = None) -> None:
    from concurrent.futures import as_completed

    pool = process_pool(min(workers or os.cpu_count() or 1, len(todo)))
    try:
        with terminate_as_interrupt():   # SIGTERM, like SIGINT, ends the workers too
            futures = {pool.submit(run_point, p.text, _label(out, p), folder): p for p in todo}
            for fut in as_completed(futures):
                done(futures[fut], fut.result())
    except BaseException:
        end_workers(pool)
        raise
    pool.shutdown()


def _run_dask(todo: list[Point], out: Path, address: str, tag: str,
              done: Callable[[Point, dict[str, Any]], None],
              deadline: float = SCHEDULER_DEADLINE) -> None:
    try:
        from distributed import Client, as_completed
    except ImportError:
        raise CaseError("--scheduler", address, "needs Dask: pip install "
                                                "'shearcheck[cluster]'") from None
    probe_scheduler(address, deadline)        # a silent port or another server: exit 2
    client = connect_client(Client, address, deadline)
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


def _resumable(out: Path, warn: Callable[[str], None] | None) -> list[dict[str, Any]]:
    """The finished points a resumed sweep may skip. Damaged index lines and points whose
    folder (or its results.json / error.txt) is missing are dropped from the index, with a
    warning, so that they run again."""
    index = out / "index.jsonl"
    damaged: list[str] = []
    rows = read_index(index, damaged)
    keep = []
    for r in rows:
        folder = out / "points" / r["id"]
        need = folder / ("results.json" if r["status"] == "ok" else "error.txt")
        if folder.is_symlink() or not need.is_file():
            damaged.append(f"point {r['id']} (its folder or {need.name} is missing)")
        else:
            keep.append(r)
    if damaged:
        compact_index(index, keep)
        (warn or _stderr_warning)(f"{index.name}: {len(damaged)} damaged or stale "
                                  f"entr{'y' if len(damaged) == 1 else 'ies'} "
                                  f"({', '.join(damaged[:5])}{' ...' if len(damaged) > 5 else ''}"
                                  "); those points run again")
    return keep


def _stderr_warning(message: str) -> None:
    import sys

    print(f"shearcheck: warning: {message}", file=sys.stderr)


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
              levels: int | None = None, quiet: bool = False,
              warn: Callable[[str], None] | None = None,
              scheduler_deadline: float = SCHEDULER_DEADLINE) -> SweepReport:
    """Run (or resume) a sweep into `out`; see the module docstring for the layout.

    `scheduler` (``--scheduler``) is validated first (`fem.study.cluster.parse_scheduler`);
    ``""`` is refused, not taken for "run locally". Reaching it is given
    `scheduler_deadline` seconds (to connect and be greeted, and again for the client).
    """
    case_path, out = Path(case_path), Path(out)
    if scheduler is not None:
        scheduler = parse_scheduler(scheduler)
    text = read_case_text(case_path)
    base_case = parse_case(text, str(case_path))          # the base itself must be valid
    base = tomllib.loads(text)
    if not varies:
        raise CaseError("--vary", "", "give at least one --vary KEY=START:STOP:N")
    points = make_points(base, varies, str(case_path), levels)
    check_writable(out)     # a file, or a folder we cannot write, before anything runs
    ident = _identity(case_path, text, varies, levels)
    manifest = out / "sweep.json"
    refuse_link(manifest)
    if manifest.exists():
        try:
            old = json.loads(manifest.read_text(encoding="utf-8"))
        except (UnicodeDecodeError, json.JSONDecodeError):
            raise CaseError(str(manifest), "", "is damaged (not JSON); this folder cannot be "
                                               "resumed: use a new --out") from None
        mine = {k: v for k, v in ident.items() if k != "case"}
        if not isinstance(old, dict) or {k: old.get(k) for k in mine} != mine:
            raise CaseError(str(manifest), "", "this folder holds another sweep (other case "
                                               "file, ranges or levels); use a new --out")
    else:
        atomic_write(manifest, json.dumps(ident, indent=1).encode("utf-8"))
    finished = {r["id"] for r in _resumable(out, warn)}
    todo = [p for p in points if p.id not in finished]
    bar = progress_bar(len(points), f"sweep {base_case.name}", quiet)
    bar.update(len(points) - len(todo))

    def done(p: Point, outcome: dict[str, Any]) -> None:
        row = _store(out, p, outcome)
        bar.set_postfix_str(f"{p.id} {row['status']}")
        bar.update(1)

    try:
        if todo and scheduler:
            _run_dask(todo, out, scheduler, ident["case_sha256"][:12], done,
                      scheduler_deadline)
        elif todo:
            _run_local(todo, out, workers, done, str(case_path.parent.resolve()))
    finally:
        bar.close()
    order = {p.id: i for i, p in enumerate(points)}
    rows = sorted((r for r in read_index(out / "index.jsonl") if r["id"] in order),
                  key=lambda r: order[r["id"]])
    rep = SweepReport(out=out, rows=rows, ran=len(todo), skipped=len(points) - len(todo))
    rep.summary = finish(out, base_case, varies, rows)
    return rep


