"""The regression suite: the bundled cases hold their baselines; drifts are caught and named.

The baselines were made with ``shearcheck regress --update`` at one mesh level and each
case's own element size (`made_with` in every baseline file), the settings this suite runs.
"""

from __future__ import annotations

import json
import shutil
import tomllib
from pathlib import Path

import pytest
from conftest import ROOT

from fem.cli import main
from fem.study.regress import (
    REL_CAP,
    REL_FLOOR,
    ROUND_OFF,
    Row,
    baseline_path,
    compare,
    figures_of,
    merge_baseline,
    run_suite,
    tolerances,
)

CASES = ROOT / "cases"


def test_every_case_has_a_documented_header_and_a_baseline():
    paths = sorted(CASES.glob("*.toml"))
    kinds = {tomllib.loads(p.read_text())["kind"] for p in paths}
    assert len(paths) >= 12 and kinds == {"beam", "section"}
    for p in paths:
        text = p.read_text()
        head = "\n".join(line for line in text.splitlines() if line.startswith("#"))
        for word in ("Scenario", "Hand calculation", "What the FE shows"):
            assert word in head, f"{p.name}: header lacks {word!r}"
        base = json.loads(baseline_path(p).read_text())
        assert base["case"] == tomllib.loads(text)["name"]
        assert base["made_with"]["levels"] == 1
        assert base["tolerance_rule"]
        assert all("rel_tol" in f for f in base["figures"].values()
                   if isinstance(f["value"], float))


def test_bundled_suite_holds(capsys):
    """The whole suite at the baselines' settings, as CI runs it."""
    assert main(["regress", str(CASES), "--workers", "2"]) == 0
    out = capsys.readouterr().out
    assert "all " in out.splitlines()[-1] and "hold" in out.splitlines()[-1]
    for p in CASES.glob("*.toml"):
        assert p.stem in out


@pytest.fixture
def stub_copy(tmp_path: Path) -> Path:
    for name in ("stub-cantilever.toml", "stub-cantilever.baseline.json"):
        shutil.copy(CASES / name, tmp_path / name)
    return tmp_path


def test_drift_exits_1_naming_case_and_figure(stub_copy, capsys):
    """A baseline moved beyond its tolerance, and a changed verdict, are drifts; --update
    rewrites the baseline (printing what changed) and the suite holds again."""
    bp = stub_copy / "stub-cantilever.baseline.json"
    base = json.loads(bp.read_text())
    fig = base["figures"]["cut x=150 tau_max_fe"]
    fig["value"] *= 1 + 2 * fig["rel_tol"]
    base["figures"]["verdict"]["value"] = "holds"
    bp.write_text(json.dumps(base))
    assert main(["regress", str(stub_copy), "--workers", "1"]) == 1
    out = capsys.readouterr().out
    last = out.splitlines()[-1]
    assert "DRIFT" in last and "stub-cantilever" in last
    assert "cut x=150 tau_max_fe (drift)" in last and "verdict (changed)" in last
    assert main(["regress", str(stub_copy), "--update", "--workers", "1"]) == 0
    out = capsys.readouterr().out
    assert "cut x=150 tau_max_fe" in out and "updated" in out
    assert main(["regress", str(stub_copy), "--workers", "1", "--quiet"]) == 0
    assert "hold" in capsys.readouterr().out
    before = bp.read_bytes()
    assert main(["regress", str(stub_copy), "--update", "--workers", "1"]) == 0
    last = capsys.readouterr().out.splitlines()[-1]
    assert bp.read_bytes() == before, "nothing moved: the baseline must not be rewritten"
    assert "wrote 0 baseline(s)" in last and "1 baseline(s) unchanged" in last


def test_missing_baseline_and_unknown_case(stub_copy, capsys):
    (stub_copy / "stub-cantilever.baseline.json").unlink()
    rep = run_suite(stub_copy, workers=1, quiet=True)
    assert not rep.holds and [r.status for r in rep.rows] == ["missing"]
    assert main(["regress", str(stub_copy), "--only", "no-such-case"]) == 2
    assert "no-such-case" in capsys.readouterr().err


# --------------------------------------------------------------------------- pure parts

def _data(tau: float, ratio: float | None, verdict: str = "holds") -> dict:
    return {"kind": "beam", "verdict": verdict,
            "cuts": [{"x": 50.0, "tau_max_fe": tau, "ratio": ratio}],
            "peak": {"tau_max": 2 * tau, "von_mises_max": 100.0}}


def test_tolerance_rule():
    """2 x the change under a 10 % smaller element, within [0.5 %, 25 %]; a near-zero shear
    is measured against 1 % of the peak von Mises (here 1.0)."""
    fig = figures_of(_data(10.0, 1.2))
    tol = tolerances(fig, figures_of(_data(10.1, 1.2)))
    assert tol["cut x=50 tau_max_fe"]["rel_tol"] == pytest.approx(0.02)
    assert tol["cut x=50 ratio"]["rel_tol"] == REL_FLOOR
    assert tol["peak tau_max"]["rel_tol"] == pytest.approx(0.02)
    assert "rel_tol" not in tol["verdict"]
    assert tolerances(fig, figures_of(_data(20.0, 2.0)))["cut x=50 ratio"]["rel_tol"] == REL_CAP
    small = tolerances(figures_of(_data(0.2, None)), figures_of(_data(0.25, None)))
    assert small["cut x=50 tau_max_fe"]["rel_tol"] == pytest.approx(2 * 0.05 / 1.0)


def test_compare_statuses():
    base = {"made_with": {"levels": 1, "size": 10.0, "order": 2},
            "figures": tolerances(figures_of(_data(10.0, 1.2)), figures_of(_data(10.0, 1.2)))}
    settings = {"levels": 1, "size": 10.0, "order": 2}
    same = compare("c", base, figures_of(_data(10.04, 1.2)), settings)
    assert all(r.status == "ok" for r in same)
    moved = {r.figure: r for r in compare("c", base, figures_of(_data(10.1, 1.2, "unsafe")),
                                          settings)}
    assert moved["cut x=50 tau_max_fe"].status == "drift"
    assert moved["cut x=50 tau_max_fe"].change == pytest.approx(0.01)
    assert moved["verdict"].status == "changed"
    other = _data(10.0, 1.2)
    other["cuts"][0]["x"] = 60.0
    st = {r.figure: r.status for r in compare("c", base, figures_of(other),
                                              {**settings, "size": 8.0})}
    assert st["cut x=50 ratio"] == "gone" and st["cut x=60 ratio"] == "new"
    assert st["settings size"] == "changed"
    assert compare("c", None, {}, settings)[0].status == "missing"
    assert not Row("c", "f", 1, 2, 0.5, "drift").holds


def test_update_rewrites_only_figures_moved_beyond_round_off():
    """Noise of 1e-12 moves nothing (no rewrite); a real change replaces that figure only,
    the others keep their stored value and tolerance."""
    settings = {"levels": 1, "size": 10.0, "order": 2}
    stored = tolerances(figures_of(_data(10.0, 1.2)), figures_of(_data(10.1, 1.2)))
    base = {"made_with": settings, "figures": stored}
    noisy = figures_of(_data(10.0 * (1 + 1e-12), 1.2 * (1 - 1e-12)))
    tol_now = tolerances(noisy, figures_of(_data(10.3, 1.3)))
    assert merge_baseline(base, noisy, tol_now, settings) == (None, [])
    moved = figures_of(_data(10.0, 1.2 * (1 + 100 * ROUND_OFF)))
    figs, names = merge_baseline(base, moved, tolerances(moved, moved), settings)
    assert names == ["cut x=50 ratio"]
    assert figs["cut x=50 tau_max_fe"] == stored["cut x=50 tau_max_fe"]
    assert figs["cut x=50 ratio"]["value"] == moved["cut x=50 ratio"]["value"]
    assert figs["cut x=50 ratio"]["rel_tol"] == REL_FLOOR
    verdict = figures_of(_data(10.0, 1.2, "unsafe"))
    assert merge_baseline(base, verdict, tolerances(verdict, verdict), settings)[1] == ["verdict"]
    other = {**settings, "size": 8.0}
    assert set(merge_baseline(base, noisy, tol_now, other)[1]) == set(noisy)
