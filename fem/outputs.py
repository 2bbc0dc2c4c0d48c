"""The output folder: staged writing, so a failed run never spoils an earlier result.

Every file of a run is first written into a hidden staging folder beside the outputs;
only when all of them exist are they moved into place, `results.json` last (each move an
atomic rename). A run that fails midway leaves the previous complete result untouched.
A run killed outright (SIGKILL, power loss) leaves its staging folder behind; the next run
into the same folder removes staging folders whose process is gone (the folder name
carries the process id).
"""

from __future__ import annotations

import os
import shutil
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

__all__ = ["staged_output", "summary_table"]


@contextmanager
def staged_output(out: Path) -> Iterator[Path]:
    """Yield a staging folder; on success move its files into `out` (results.json last)."""
    out = Path(out)
    out.mkdir(parents=True, exist_ok=True)
    _sweep_stale(out)
    stage = Path(tempfile.mkdtemp(prefix=f".staging-{os.getpid()}-", dir=out))
    try:
        yield stage
        files = sorted(stage.iterdir(), key=lambda p: p.name == "results.json")
        for f in files:
            os.replace(f, out / f.name)
    finally:
        shutil.rmtree(stage, ignore_errors=True)


def _sweep_stale(out: Path) -> None:
    """Remove staging folders left by runs whose process no longer exists (POSIX only:
    elsewhere signal 0 is not a harmless probe)."""
    if os.name != "posix":
        return
    for stage in out.glob(".staging-*"):
        pid = stage.name.split("-")[1]
        if not pid.isdigit() or int(pid) == os.getpid():
            continue
        try:
            os.kill(int(pid), 0)
        except ProcessLookupError:
            shutil.rmtree(stage, ignore_errors=True)
        except OSError:
            pass  # alive (or not ours to signal): leave it


def _fmt(v: float | None, w: int = 10) -> str:
    return f"{'-':>{w}}" if v is None else f"{v:>{w}.4g}"


def summary_table(d: dict) -> str:
    """A short console summary of results.json content."""
    u = d["units"]
    lines = [f"{d['title']}  ({d['case']}, {d['kind']})"]
    if d["kind"] == "beam":
        lines.append(f"{'x':>8} {'V_fe':>10} {'V_hand':>10} {'tau_fe':>10} {'tau_hand':>10} "
                     f"{'ratio':>7}   [{u['length']}, {u['force']}, {u['stress']}]")
        for c in d["cuts"]:
            lines.append(f"{c['x']:>8g} {_fmt(c['V_fe'])} {_fmt(c['V_hand'])} "
                         f"{_fmt(c['tau_max_fe'])} {_fmt(c['tau_max_hand'])} "
                         f"{_fmt(c['ratio'], 7)}")
    else:
        s = d["section"]
        lines.append(f"tau_max FE {_fmt(s['tau_max_fe'])} {u['stress']}   hand "
                     f"{_fmt(s['tau_max_hand'])}   V/A {_fmt(s['tau_avg_hand'])}   ratio "
                     f"{_fmt(s['ratio'], 7)}")
    c = d.get("convergence") or {}
    if c.get("gci") is not None:
        lines.append(f"convergence: {len(c['sizes'])} levels, GCI {c['gci']:.2%}, "
                     f"observed order {_fmt(c['observed_order'], 5).strip()}")
    lines.append(f"verdict: {d['verdict'].upper()}")
    for f in d["findings"]:
        if f["kind"] != "excluded":
            lines.append(f"  - [{f['kind']}] {f['message']}")
    n_ex = sum(1 for f in d["findings"] if f["kind"] == "excluded")
    if n_ex:
        lines.append(f"  ({n_ex} boundary-idealisation zones left out of the peaks; "
                     "see results.json)")
    return "\n".join(lines)
