"""Sweeps: ranges, the TOML writer, thresholds, local and Dask runs, failures, kill and resume.

One small sweep is the reference of every run test: a stub cantilever (depth 100 mm, clamped
at the left end) under a hump-shaped load over its top edge (distribution "parabolic",
10 kN in all), its length varied 0 to 250 mm in 50 mm steps, one coarse mesh level. The
length 0 cannot be a member: that point must fail with its message and the sweep go on.
"""

from __future__ import annotations

import json
import os
import shutil
import signal
import subprocess
import sys
import time
import tomllib
from pathlib import Path

import pytest
from conftest import ROOT
from hypothesis import given, settings
from hypothesis import strategies as st

from fem.errors import CaseError
from fem.study.sweep import (
    dumps_toml,
    make_points,
    parse_vary,
    read_index,
    run_sweep,
    set_key,
    threshold,
)

STUB = """\
schema = 1
name = "stub-hump"
title = "Stub cantilever under a hump-shaped top load"
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
edge = "top"
force = [0.0, -10000.0]
distribution = "parabolic"

[mesh]
size = 12.5
levels = 1
"""
VARY = "geometry.length=0:250:6"


@pytest.fixture(scope="module")
def stub(tmp_path_factory) -> Path:
    p = tmp_path_factory.mktemp("stub") / "stub.toml"
    p.write_text(STUB, encoding="utf-8")
    return p


@pytest.fixture(scope="module")
def local(stub, tmp_path_factory):
    out = tmp_path_factory.mktemp("local")
    return run_sweep(stub, [parse_vary(VARY)], out, workers=2, quiet=True)


# --------------------------------------------------------------------------- pure parts

def test_parse_vary():
    """START:STOP:N gives N equally spaced values with both ends exact."""
    v = parse_vary("geometry.cutouts.0.fillet=0:6:4")
    assert v.key == "geometry.cutouts.0.fillet"
    assert v.values == (0.0, 2.0, 4.0, 6.0)
    assert parse_vary("mesh.size=5:5:1").values == (5.0,)
    for bad in ("geometry.length", "geometry.length=1:2", "geometry.length=a:2:3",
                "geometry.length=1:2:0"):
        with pytest.raises(CaseError):
            parse_vary(bad)


def test_set_key_replaces_only_existing_numbers():
    data = tomllib.loads(STUB)
    new = set_key(data, "geometry.length", 120.0)
    assert new["geometry"]["length"] == 120.0 and data["geometry"]["length"] == 300.0
    assert set_key(data, "loads.0.force.1", -5.0)["loads"][0]["force"] == [0.0, -5.0]
    assert set_key(data, "mesh.levels", 3.0)["mesh"]["levels"] == 3
    with pytest.raises(CaseError, match="geometry.lenght"):
        set_key(data, "geometry.lenght", 1.0)
    with pytest.raises(CaseError, match="loads.3"):
        set_key(data, "loads.3.force.1", 1.0)
    with pytest.raises(CaseError, match="only numbers"):
        set_key(data, "geometry.shape", 1.0)
    with pytest.raises(CaseError, match="whole numbers"):
        set_key(data, "mesh.levels", 1.5)


def test_points_are_the_cartesian_product():
    pts = make_points(tomllib.loads(STUB), [parse_vary("geometry.length=100:200:2"),
                                            parse_vary("geometry.depth=50:100:3")])
    assert [p.id for p in pts] == [f"p{i:04d}" for i in range(6)]
    assert [tuple(p.params.values()) for p in pts] == [
        (100.0, 50.0), (100.0, 75.0), (100.0, 100.0), (200.0, 50.0), (200.0, 75.0),
        (200.0, 100.0)]
    assert tomllib.loads(pts[4].text)["geometry"] == {"shape": "rectangle", "length": 200.0,
                                                       "depth": 75.0}


_keys = st.text("abcxyz_-", min_size=1, max_size=5)
_scalars = (st.integers(-10**12, 10**12) | st.floats(allow_nan=False) | st.booleans()
            | st.text(max_size=8))
_values = _scalars | st.lists(_scalars, max_size=3) | st.lists(st.lists(_scalars, max_size=2),
                                                               max_size=2)
_tables = st.recursive(
    st.dictionaries(_keys, _values, max_size=3),
    lambda inner: st.dictionaries(_keys, _values | inner | st.lists(inner, min_size=1,
                                                                    max_size=2), max_size=3),
    max_leaves=4)


@settings(max_examples=150, deadline=None)
@given(_tables)
def test_toml_writer_round_trips(data):
    """tomllib reads back exactly what dumps_toml wrote (tables, arrays of tables, scalars,
    nested arrays, any string)."""
    assert tomllib.loads(dumps_toml(data)) == data


@pytest.mark.parametrize("path", sorted((ROOT / "cases").glob("*.toml")), ids=lambda p: p.stem)
def test_toml_writer_round_trips_bundled_cases(path):
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    assert tomllib.loads(dumps_toml(data)) == data


def test_threshold_interpolates_linearly():
    """Crossing of 1.05 between (100, 1.15) and (200, 1.00): x = 100 + 100 x 0.10/0.15."""
    th, cross = threshold([300, 100, 200], [0.98, 1.15, 1.0], 1.05)
    assert th == pytest.approx(100 + 100 * 0.10 / 0.15) and cross == [th]
    assert threshold([1, 2, 3], [1.0, 1.01, None], 1.05) == (None, [])
    th, cross = threshold([1, 2, 3], [1.1, 1.0, 1.1], 1.05)
    assert cross == pytest.approx([1.5, 2.5]) and th == pytest.approx(1.5)


# --------------------------------------------------------------------------- runs

def test_stub_length_sweep_excess_falls_and_threshold(local):
    """The FE excess over the shear formula falls as the stub gets longer: the load's
    curvature (q'' ~ 1/L^2) disturbs plane sections less (Timoshenko & Goodier, Theory of
    Elasticity, 3rd ed., section 23: the corrections to elementary beam theory for distributed
    loads are of
    order (h/L)^2). Measured here: max ratio 1.54, 1.30, 1.11, 1.05, 1.03 at L = 50..250;
    it crosses 1.05 between 150 and 250 mm, about two depths."""
    ok = [r for r in local.rows if r["status"] == "ok"]
    lengths = [r["params"]["geometry.length"] for r in ok]
    ratios = [r["ratio_max"] for r in ok]
    assert lengths == [50.0, 100.0, 150.0, 200.0, 250.0]
    assert all(a > b for a, b in zip(ratios, ratios[1:], strict=False))
    assert ratios[0] > 1.3 and ratios[-1] < 1.05
    th = local.summary["threshold"]
    assert th is not None and 150.0 < th < 250.0
    s = json.loads((local.out / "summary.json").read_text())
    assert s["threshold"] == pytest.approx(th) and s["level"] == pytest.approx(1.05)
    assert (local.out / "ratio.png").stat().st_size > 0


def test_failed_point_is_recorded_and_sweep_goes_on(local):
    bad = [r for r in local.rows if r["status"] == "failed"]
    assert [r["id"] for r in bad] == ["p0000"]
    assert "geometry.length" in bad[0]["message"] and "> 0" in bad[0]["message"]
    assert (local.out / "points" / "p0000" / "error.txt").exists()
    assert (local.out / "points" / "p0003" / "results.json").exists()
    csv = (local.out / "sweep.csv").read_text().splitlines()
    assert csv[0] == ("id,geometry.length,status,verdict,ratio_max,tau_max_fe,tau_max_hand,"
                      "gci,message")
    assert len(csv) == 7 and csv[1].startswith("p0000,0,failed,")


def test_rerun_skips_finished_points(local, stub):
    again = run_sweep(stub, [parse_vary(VARY)], local.out, workers=2, quiet=True)
    assert again.ran == 0 and again.skipped == 6
    assert len((local.out / "index.jsonl").read_text().splitlines()) == 6
    with pytest.raises(CaseError, match="another sweep"):
        run_sweep(stub, [parse_vary("geometry.length=0:250:5")], local.out, quiet=True)


def test_dask_cluster_gives_the_same_csv(local, stub, tmp_path):
    """The same sweep through a Dask scheduler (two single-threaded worker processes)."""
    import distributed
    with distributed.LocalCluster(processes=True, n_workers=2, threads_per_worker=1,
                                  dashboard_address=None) as cluster:
        rep = run_sweep(stub, [parse_vary(VARY)], tmp_path, scheduler=cluster.scheduler_address,
                        quiet=True)
    assert rep.ran == 6
    assert (tmp_path / "sweep.csv").read_text() == (local.out / "sweep.csv").read_text()


def test_killed_sweep_resumes_without_loss_or_repeat(local, stub, tmp_path):
    """SIGKILL the sweep (and its worker) once two points are indexed, tear the last index
    line by hand as a kill mid-write would, resume: every point once, the finished ones
    untouched, and the same CSV as the uninterrupted run."""
    cmd = [sys.executable, "-m", "fem.cli", "sweep", str(stub), "--vary", VARY, "--out",
           str(tmp_path), "--workers", "1", "--quiet"]
    proc = subprocess.Popen(cmd, cwd=ROOT, start_new_session=True, stdout=subprocess.DEVNULL,
                            stderr=subprocess.PIPE)
    index = tmp_path / "index.jsonl"
    try:
        while proc.poll() is None:
            if index.exists() and len(index.read_text().splitlines()) >= 2:
                break
            time.sleep(0.02)
        assert proc.poll() is None, proc.stderr.read().decode()  # still running when killed
        os.killpg(proc.pid, signal.SIGKILL)
    finally:
        proc.wait()
    before = read_index(index)
    assert 2 <= len(before) < 6
    kept = {r["id"]: (tmp_path / "points" / r["id"]).stat().st_mtime_ns for r in before
            if r["status"] == "ok"}
    with open(index, "a", encoding="utf-8") as fh:
        fh.write('{"id": "p0005", "params": {"geometry.len')   # a torn line
    rep = run_sweep(stub, [parse_vary(VARY)], tmp_path, workers=2, quiet=True)
    assert rep.skipped == len(before) and rep.ran == 6 - len(before)
    ids = [json.loads(line)["id"] for line in index.read_text().splitlines()]
    assert sorted(ids) == [f"p{i:04d}" for i in range(6)]
    for pid, mtime in kept.items():
        assert (tmp_path / "points" / pid).stat().st_mtime_ns == mtime
    assert (tmp_path / "sweep.csv").read_text() == (local.out / "sweep.csv").read_text()


def test_cli_sweep_bad_key_exits_2(stub, tmp_path, capsys):
    from fem.cli import main

    assert main(["sweep", str(stub), "--vary", "geometry.lenght=1:2:2", "--out",
                 str(tmp_path)]) == 2
    err = capsys.readouterr().err
    assert "geometry.lenght" in err and len(err.strip().splitlines()) == 1


# --------------------------------------------------------------------------- second round

FAILING = "geometry.length=-2:-1:3"   # every point is refused at parse time: no mesh, fast


def test_integer_written_keys_vary_as_floats():
    """`length = 300` is a length written without a decimal point: it takes 200.5; keys
    the format reads as whole numbers (mesh.levels, loads.N.hole) still refuse fractions."""
    from fem.study.keys import is_integer_key

    data = tomllib.loads(STUB.replace("length = 300.0", "length = 300"))
    assert set_key(data, "geometry.length", 200.5)["geometry"]["length"] == 200.5
    assert set_key(data, "geometry.length", 200.0)["geometry"]["length"] == 200
    assert is_integer_key("loads.3.hole") and not is_integer_key("loads.3.force.1")
    with pytest.raises(CaseError, match="whole numbers"):
        set_key(data, "mesh.levels", 2.5)


def test_sweep_size_limit_just_under_and_over():
    """One --vary of MAX_SWEEP_POINTS values is taken, one more refused before any value is
    made; a product over the limit is refused before any point is built."""
    from fem.case.limits import MAX_SWEEP_POINTS
    from fem.study.sweep import check_sweep_size

    assert len(parse_vary(f"geometry.length=1:2:{MAX_SWEEP_POINTS}").values) == MAX_SWEEP_POINTS
    with pytest.raises(CaseError, match="above the limit of 10,000"):
        parse_vary(f"geometry.length=1:2:{MAX_SWEEP_POINTS + 1}")
    with pytest.raises(CaseError, match="above the limit"):
        parse_vary("geometry.length=1:2:1000000000")
    a, b = parse_vary("geometry.length=1:2:100"), parse_vary("geometry.depth=1:2:100")
    check_sweep_size([a, b])
    with pytest.raises(CaseError, match=r"100 x 101 = 10,100 points"):
        check_sweep_size([a, parse_vary("geometry.depth=1:2:101")])


def test_cli_sweep_refuses_huge_products_fast(stub, tmp_path, capsys):
    import time

    from fem.cli import main

    t0 = time.perf_counter()
    assert main(["sweep", str(stub), "--vary", "geometry.length=1:2:10000", "--vary",
                 "geometry.depth=1:2:10000", "--out", str(tmp_path / "s")]) == 2
    assert time.perf_counter() - t0 < 10
    assert "100,000,000 points" in capsys.readouterr().err
    assert not (tmp_path / "s").exists()


def test_cli_sweep_out_that_is_a_file_is_bad_input(stub, tmp_path, capsys):
    from fem.cli import main

    f = tmp_path / "f"
    f.write_text("keep me", encoding="utf-8")
    assert main(["sweep", str(stub), "--vary", FAILING, "--out", str(f)]) == 2
    assert "not a folder" in capsys.readouterr().err and f.read_text() == "keep me"


def test_cli_sweep_with_failed_points_exits_nonzero_with_a_count(stub, tmp_path, capsys):
    """Every point failed: exit 2 and the count on stderr (also with --quiet); some failed:
    exit 1 (the `local` sweep's summary has one failed point of six)."""
    from fem.cli import _sweep_exit, main

    assert main(["sweep", str(stub), "--vary", FAILING, "--out", str(tmp_path / "s"),
                 "--workers", "1", "--quiet"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "3 of 3 sweep points failed" in err[0]
    assert "geometry.length" in err[0]
    assert _sweep_exit({"failed": 1, "points": 6, "failures": [{"message": "m"}]}) == 1
    assert _sweep_exit({"failed": 0, "points": 6, "failures": []}) == 0


def test_damaged_index_and_missing_point_folder_run_again(stub, tmp_path):
    """A `{}` line, a line without status, a non-UTF-8 byte and a deleted point folder: each
    point concerned runs again, with one warning, and the index ends with each point once."""
    import shutil

    run_sweep(stub, [parse_vary(FAILING)], tmp_path, workers=1, quiet=True)
    index = tmp_path / "index.jsonl"
    lines = index.read_bytes().splitlines(keepends=True)
    assert len(lines) == 3
    no_status = json.loads(lines[1])
    del no_status["status"]
    index.write_bytes(b"{}\n" + lines[0] + json.dumps(no_status).encode() + b"\n"
                      + b'{"id": "p0002", "\xff"}\n')
    rep = run_sweep(stub, [parse_vary(FAILING)], tmp_path, workers=1, quiet=True,
                    warn=(warnings := []).append)
    assert rep.ran == 2 and rep.skipped == 1
    assert len(warnings) == 1 and "3 damaged or stale entries" in warnings[0]
    shutil.rmtree(tmp_path / "points" / "p0000")
    warnings.clear()
    rep = run_sweep(stub, [parse_vary(FAILING)], tmp_path, workers=1, quiet=True,
                    warn=warnings.append)
    assert rep.ran == 1 and "point p0000" in warnings[0]
    ids = sorted(json.loads(x)["id"] for x in index.read_text().splitlines())
    assert ids == ["p0000", "p0001", "p0002"]


def test_index_is_never_written_through_a_planted_link(stub, tmp_path):
    from fem.cli import main

    victim = tmp_path / "victim.txt"
    victim.write_text("precious", encoding="utf-8")
    out = tmp_path / "s"
    out.mkdir()
    (out / "index.jsonl").symlink_to(victim)
    assert main(["sweep", str(stub), "--vary", FAILING, "--out", str(out), "--quiet"]) == 2
    assert victim.read_text(encoding="utf-8") == "precious"


def _children(pid: int) -> set[int]:
    path = Path(f"/proc/{pid}/task/{pid}/children")
    return {int(x) for x in path.read_text().split()} if path.exists() else set()


def _alive(pid: int) -> bool:
    try:
        stat = Path(f"/proc/{pid}/stat").read_text()
    except OSError:
        return False
    return stat.rsplit(")", 1)[1].split()[0] != "Z"


@pytest.mark.skipif(not Path("/proc/self/task").exists(), reason="needs /proc")
@pytest.mark.parametrize("sig", [signal.SIGTERM, signal.SIGINT, signal.SIGKILL])
def test_sweep_workers_end_with_the_main_process(stub, tmp_path, sig):
    """SIGTERM or SIGINT to the sweep's main process alone (not its group), or SIGKILL that
    no handler sees: every worker process is gone within seconds."""
    cmd = [sys.executable, "-m", "fem.cli", "sweep", str(stub), "--vary",
           "geometry.length=100:250:8", "--out", str(tmp_path), "--workers", "2", "--quiet"]
    proc = subprocess.Popen(cmd, cwd=ROOT, start_new_session=True, stdout=subprocess.DEVNULL,
                            stderr=subprocess.DEVNULL)
    workers: set[int] = set()
    try:
        deadline = time.monotonic() + 120
        while time.monotonic() < deadline and proc.poll() is None:
            workers = _children(proc.pid)
            if len(workers) >= 2 and any(_children(w) == set() for w in workers):
                time.sleep(1.0)        # let them start a point
                workers = _children(proc.pid)
                break
            time.sleep(0.05)
        assert proc.poll() is None and len(workers) >= 2
        os.kill(proc.pid, sig)
        proc.wait(timeout=60)
        end = time.monotonic() + 20
        while time.monotonic() < end and any(_alive(w) for w in workers):
            time.sleep(0.1)
        assert not any(_alive(w) for w in workers), sig
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
        for w in workers | _children(proc.pid):   # a failed run must not leave orphans
            if _alive(w):
                os.kill(w, signal.SIGKILL)


def test_a_sweep_of_a_drawn_case_finds_its_drawing(tmp_path: Path):
    """A case whose outline comes from a DXF (`geometry.file`, relative to the case file)
    sweeps like any other: each point is named after its case.toml in the sweep folder,
    but its drawing is found beside the base case (before, every point failed with
    "no such file")."""
    case = tmp_path / "case" / "haunched-bracket.toml"
    (case.parent / "drawings").mkdir(parents=True)
    shutil.copy(ROOT / "cases" / "haunched-bracket.toml", case)
    shutil.copy(ROOT / "cases" / "drawings" / "haunched-bracket.dxf", case.parent / "drawings")
    rep = run_sweep(case, [parse_vary("material.thickness=10:12:2")], tmp_path / "sw",
                    workers=1, levels=1, quiet=True)
    assert [r["status"] for r in rep.rows] == ["ok", "ok"], rep.failed
    for p in (tmp_path / "sw").rglob("*.toml"):   # no machine path in what the sweep wrote
        assert str(tmp_path) not in p.read_text(encoding="utf-8")
