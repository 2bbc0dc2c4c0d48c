"""`shearcheck hand` writes into its own default folder (`out/<name>-hand`), so a hand-only
results.json never lands beside the figures and note of a full run (issue: no stale
folders)."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

from conftest import ROOT

from fem.cli import main


def test_hand_then_run_into_defaults_leaves_two_consistent_folders(tmp_path: Path,
                                                                     monkeypatch, capsys):
    shutil.copy(ROOT / "cases" / "stub-cantilever.toml", tmp_path / "stub.toml")
    monkeypatch.chdir(tmp_path)
    assert main(["hand", "stub.toml", "--quiet"]) == 0
    assert main(["run", "stub.toml", "--quiet", "--no-report"]) == 0
    name = json.loads((tmp_path / "out" / "stub-cantilever" / "results.json").read_text())
    hand_dir, run_dir = tmp_path / "out" / "stub-cantilever-hand", tmp_path / "out" / name["case"]
    hand = json.loads((hand_dir / "results.json").read_text())
    run = json.loads((run_dir / "results.json").read_text())
    assert hand["mesh"]["dofs"] is None and "hand side only" in hand["note"]
    assert run["mesh"]["dofs"] > 0 and "note" not in run
    assert sorted(p.name for p in hand_dir.iterdir()) == ["manifest.json", "results.json"]
    assert hand["case"] == run["case"] == "stub-cantilever"
    assert capsys.readouterr().out == ""
