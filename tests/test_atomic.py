"""Data safety: results.json is only ever an earlier complete result or a new complete one.

A real run is killed with SIGKILL while it writes its outputs (the moment is found by
watching the output folder for the run's staging folder, not by the clock); afterwards the
earlier results.json must be intact. Failures injected at each step of the writing (a
figure that fails, a rename that fails midway, a write that fails before its rename) must
leave the earlier result untouched and no temporary files behind. A later run replaces the
result with a complete one and sweeps the staging folder the killed run left.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from conftest import ROOT

from fem.api import check, write_outputs
from fem.case import parse_case

ENV = {"PYTHONPATH": str(ROOT), "PATH": "/usr/bin:/bin", "MPLBACKEND": "Agg"}
CASE = """
schema = 1
name = "{name}"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = 300.0
depth = 100.0
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, {force}]
[mesh]
size = {size}
levels = {levels}
"""
CONTRACT_KEYS = {"schema", "case", "kind", "units", "mesh", "equilibrium", "cuts", "peak",
                 "convergence", "verdict", "findings", "timings"}


def _earlier(out: Path) -> bytes:
    """A complete result of an earlier, different run in `out`; its bytes."""
    case = parse_case(CASE.format(name="earlier", force=-1000.0, size=50.0, levels=1), "e.toml")
    write_outputs(check(case), out, report=False)
    return (out / "results.json").read_bytes()


def _complete(data: bytes) -> dict:
    d = json.loads(data)
    assert CONTRACT_KEYS <= set(d) and d["verdict"] in ("holds", "unsafe", "inconclusive")
    return d


def _only_old_or_new(out: Path, old: bytes) -> str:
    data = (out / "results.json").read_bytes()
    if data == old:
        return "old"
    assert _complete(data)["case"] == "later"
    return "new"


def test_kill_while_writing_keeps_the_earlier_result(tmp_path: Path):
    """SIGKILL as soon as the run's staging folder holds a file: results.json is the old one
    (or, had the run already finished, a complete new one: never a partial file). Up to
    three runs, until one is caught while writing."""
    out = tmp_path / "out"
    old = _earlier(out)
    case = tmp_path / "later.toml"
    case.write_text(CASE.format(name="later", force=-10000.0, size=20.0, levels=1),
                    encoding="utf-8")
    mid_write = False
    for _attempt in range(3):
        p = subprocess.Popen([sys.executable, "-m", "fem.cli", "run", str(case), "--out",
                              str(out), "--quiet"], env=ENV, cwd=tmp_path,
                             stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        try:
            while p.poll() is None:
                stages = [s for s in out.glob(f".staging-{p.pid}-*") if any(s.iterdir())]
                if stages:
                    p.send_signal(signal.SIGKILL)
                    break
                time.sleep(0.002)
        finally:
            p.wait(timeout=120)
        assert p.returncode in (0, -signal.SIGKILL)
        state = _only_old_or_new(out, old)  # parseable, complete: the earlier or a new one
        left = [f for st in out.glob(f".staging-{p.pid}-*") for f in st.iterdir()]
        if p.returncode == -signal.SIGKILL and left:
            mid_write = True  # files still staged: results.json, moved last, is the old one
            assert state == "old"
        from fem.output_folder import verify_outputs

        assert verify_outputs(out) == []   # the manifest vouches for one whole set
        old = (out / "results.json").read_bytes()
        if mid_write:
            break  # caught while writing (the usual case: writing takes seconds)
    # pass/fail rests only on the states above, never on when the kill landed
    assert json.loads((out / "results.json").read_bytes())["case"] in ("earlier", "later")


def test_next_run_replaces_with_a_complete_result_and_sweeps_stale_staging(tmp_path: Path):
    out = tmp_path / "out"
    old = _earlier(out)
    dead = subprocess.run([sys.executable, "-c", "import os; print(os.getpid())"],
                          capture_output=True, text=True).stdout.strip()
    stale = out / f".staging-{dead}-abc"
    stale.mkdir()
    (stale / "shear-contour.png").write_bytes(b"half a figure")
    case = parse_case(CASE.format(name="later", force=-10000.0, size=50.0, levels=1), "l.toml")
    write_outputs(check(case), out, report=False)
    assert _only_old_or_new(out, old) == "new"
    assert not stale.exists() and not list(out.glob(".staging-*"))


def test_figure_failure_keeps_the_earlier_result(tmp_path: Path, monkeypatch):
    """A failure after some outputs are staged: nothing moves, the stage is removed."""
    import fem.report.figures

    out = tmp_path / "out"
    old = _earlier(out)
    before = sorted(p.name for p in out.iterdir())
    case = parse_case(CASE.format(name="later", force=-10000.0, size=50.0, levels=1), "l.toml")
    res = check(case)

    def half_then_fail(res, stage):
        (Path(stage) / "shear-contour.png").write_bytes(b"partial")
        raise RuntimeError("the plotting failed")

    monkeypatch.setattr(fem.report.figures, "write_figures", half_then_fail)
    with pytest.raises(RuntimeError, match="plotting failed"):
        write_outputs(res, out, report=True)
    assert (out / "results.json").read_bytes() == old
    assert sorted(p.name for p in out.iterdir()) == before


def test_failed_rename_midway_is_finished_as_one_set(tmp_path: Path, monkeypatch):
    """A rename that fails midway through the commit (after the journal): the folder is
    never trusted as a mix - the next use finishes the commit from the stage, and the
    manifest then vouches for the whole new set."""
    import fem.output_folder
    from fem.output_folder import JOURNAL, verify_outputs
    from fem.results import write_json

    out = tmp_path / "out"
    old = _earlier(out)
    case = parse_case(CASE.format(name="later", force=-10000.0, size=50.0, levels=1), "l.toml")
    res = check(case)
    real_replace = os.replace
    moved: list[str] = []

    def replace(src, dst):
        if Path(dst).parent == out and not Path(dst).name.startswith("."):
            if Path(dst).name == "results.json":
                raise OSError("disk full")
            moved.append(Path(dst).name)
        real_replace(src, dst)

    monkeypatch.setattr(fem.output_folder.os, "replace", replace)
    with pytest.raises(OSError, match="disk full"):
        with fem.output_folder.staged_output(out) as stage:
            write_json(res.result, stage / "results.json")
            for name in ("z-figure.png", "a-figure.png", "report.html"):
                (stage / name).write_bytes(b"new")
    assert sorted(moved) == ["a-figure.png", "report.html", "z-figure.png"]
    assert (out / "results.json").read_bytes() == old       # results.json moves last
    assert (out / JOURNAL).exists()
    monkeypatch.setattr(fem.output_folder.os, "replace", real_replace)
    assert verify_outputs(out) == [] and _only_old_or_new(out, old) == "new"
    assert not (out / JOURNAL).exists() and not list(out.glob(".staging-*"))


def test_kill_during_the_final_moves_leaves_old_or_new_set(tmp_path: Path, monkeypatch):
    """A kill (simulated: KeyboardInterrupt at each possible move in turn) during the final
    moves of a run with a report, over an earlier run with a report: after recovery the
    folder is exactly one set - the new one - with no file of the killed-over run left
    beside it, and its manifest matches every file."""
    import fem.output_folder
    from fem.output_folder import MANIFEST, recover, verify_outputs

    real_replace = os.replace
    for stop_at in range(1, 6):
        out = tmp_path / f"out{stop_at}"
        with fem.output_folder.staged_output(out) as stage:
            for name in ("results.json", "report.html", "old-only.png"):
                (stage / name).write_bytes(b"old " + name.encode())
        calls = 0

        def replace(src, dst, stop_at=stop_at, out=out):
            nonlocal calls
            if Path(dst).parent == out and not Path(dst).name.startswith("."):
                calls += 1
                if calls == stop_at:
                    raise KeyboardInterrupt   # the kill lands here
            real_replace(src, dst)

        monkeypatch.setattr(fem.output_folder.os, "replace", replace)
        try:
            with fem.output_folder.staged_output(out) as stage:
                for name in ("results.json", "report.html", "new-only.png"):
                    (stage / name).write_bytes(b"new " + name.encode())
        except KeyboardInterrupt:
            pass
        monkeypatch.setattr(fem.output_folder.os, "replace", real_replace)
        recover(out)
        assert verify_outputs(out) == [], stop_at
        names = sorted(p.name for p in out.iterdir())
        assert names == sorted(["results.json", "report.html", "new-only.png", MANIFEST])
        assert (out / "report.html").read_bytes() == b"new report.html"


def test_manifest_names_a_file_changed_behind_its_back(tmp_path: Path):
    from fem.output_folder import verify_outputs

    out = tmp_path / "out"
    _earlier(out)
    assert verify_outputs(out) == []
    (out / "results.json").write_text("{}", encoding="utf-8")
    assert verify_outputs(out) == ["results.json is not the file of this set (its hash "
                                   "differs)"]


def test_unwritable_output_folder_is_refused_before_the_solve(tmp_path: Path, monkeypatch,
                                                             capsys):
    import fem.api
    from fem.cli import main

    case = tmp_path / "c.toml"
    case.write_text(CASE.format(name="c", force=-1000.0, size=50.0, levels=1),
                    encoding="utf-8")
    monkeypatch.setattr(fem.api, "check", lambda *a, **k: pytest.fail("no solve"))
    if os.geteuid() == 0:          # root writes anywhere a mode allows: use /proc instead
        out = Path("/proc/self/shearcheck-out")
    else:
        out = tmp_path / "ro"
        out.mkdir()
        out.chmod(0o500)
    assert main(["run", str(case), "--out", str(out), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "--out" in err and "cannot write in the output folder" in err


def test_failed_write_leaves_no_partial_file(tmp_path: Path, monkeypatch):
    """atomic_write fails before its rename: the old file stands, no temporary is left."""
    import fem.results

    target = tmp_path / "results.json"
    target.write_bytes(b'{"complete": true}')

    def no_sync(fd):
        raise OSError("I/O error")

    monkeypatch.setattr(fem.results.os, "fsync", no_sync)
    with pytest.raises(OSError):
        fem.results.atomic_write(target, b'{"half": ')
    assert target.read_bytes() == b'{"complete": true}'
    assert [p.name for p in tmp_path.iterdir()] == ["results.json"]
