"""Every bundled case runs (at its own mesh settings, one level for speed) and meets the
contract; the analytical ones are pinned to their published values by the benchmarks of
cases/verification/ (tests/test_study_verify.py)."""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest
from conftest import ROOT

from fem.api import check, write_outputs
from fem.case import load_case

CASES = sorted((ROOT / "cases").glob("*.toml")) + [ROOT / "fem" / "data" / "stub-bracket.toml"]
CONTRACT = ROOT.parent / "shared" / "contract-check"


@pytest.mark.parametrize("path", CASES, ids=lambda p: p.stem)
def test_bundled_case_runs(path: Path, tmp_path: Path):
    """A bundled case gives a verdict and a results.json that meets the contract."""
    case = load_case(path).with_mesh(levels=1)
    res = check(case)
    assert res.verdict in ("holds", "unsafe", "inconclusive")
    write_outputs(res, tmp_path, report=False)
    if CONTRACT.exists():
        c = subprocess.run([sys.executable, str(CONTRACT), str(tmp_path)], capture_output=True,
                           text=True)
        assert c.returncode == 0, c.stdout
