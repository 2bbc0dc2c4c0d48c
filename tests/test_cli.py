"""The command line: the demo runs, and exit codes follow the contract (0 / 1 / 2)."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

from conftest import ROOT

CONTRACT = ROOT.parent / "shared" / "contract-check"


def _cli(*args: str, cwd: Path) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "fem.cli", *args], cwd=cwd,
                          capture_output=True, text=True, env={"PYTHONPATH": str(ROOT),
                                                                "PATH": "/usr/bin:/bin"})


def test_demo_runs_and_finds_the_hand_method_unsafe(tmp_path: Path):
    """The bundled demo (invented scenario): the service hole and the short span make the
    shear formula unsafe; the run exits 0 and writes results.json and figures."""
    r = _cli("demo", "--out", str(tmp_path / "demo"), cwd=tmp_path)
    assert r.returncode == 0, r.stderr
    d = json.loads((tmp_path / "demo" / "results.json").read_text())
    assert d["verdict"] == "unsafe"
    assert any(f["kind"] == "short-beam" for f in d["findings"])
    assert (tmp_path / "demo" / "shear-contour.png").stat().st_size > 10_000
    assert "verdict: UNSAFE" in r.stdout
    if CONTRACT.exists():
        c = subprocess.run([sys.executable, str(CONTRACT), str(tmp_path / "demo")],
                           capture_output=True, text=True)
        assert c.returncode == 0, c.stdout


def test_bad_input_exits_2_with_one_line(tmp_path: Path, write_case):
    """A typo in a key is named, with the file; no traceback (exit 2)."""
    p = write_case("""
        schema = 1
        name = "typo"
        kind = "beam"
        [material]
        E = 1.0
        nu = 0.3
        thikness = 2.0
    """)
    r = _cli("run", str(p), "--out", str(tmp_path / "o"), cwd=tmp_path)
    assert r.returncode == 2
    assert "Traceback" not in r.stderr
    assert len(r.stderr.strip().splitlines()) == 1
    assert "case.toml" in r.stderr and "material" in r.stderr


def test_missing_file_exits_2(tmp_path: Path):
    r = _cli("run", str(tmp_path / "nope.toml"), cwd=tmp_path)
    assert r.returncode == 2 and "file not found" in r.stderr
