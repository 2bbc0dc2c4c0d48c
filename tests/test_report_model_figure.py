"""`shearcheck show`: the model drawn and summarised without solving (fem.report.model_figure)."""

from __future__ import annotations

from pathlib import Path

import pytest

import fem.api
import fem.member.level
import fem.member.solve
import fem.section.level
import fem.section.solve
from fem.api import check
from fem.case import load_case
from fem.cli import main
from fem.report.model_figure import preview

CASES = Path(__file__).resolve().parents[1] / "cases"


@pytest.fixture
def no_solver(monkeypatch):
    """Every route to a solve raises: show must never need one."""
    def boom(*a, **k):
        raise AssertionError("show called the solver")

    for mod, name in ((fem.member.solve, "solve_member"), (fem.member.level, "solve_member"),
                      (fem.section.solve, "solve_section"),
                      (fem.section.level, "solve_section"), (fem.api, "check"),
                      (fem.member.level, "run_level")):
        monkeypatch.setattr(mod, name, boom)


@pytest.mark.parametrize("name", ["coped-beam-fillet", "thin-channel-section"])
def test_show_draws_without_solving(tmp_path, capsys, no_solver, name):
    out = tmp_path / "out"
    assert main(["show", str(CASES / f"{name}.toml"), "--out", str(out)]) == 0
    png = (out / "model.png").read_bytes()
    assert png[:8] == b"\x89PNG\r\n\x1a\n" and len(png) > 10_000
    text = capsys.readouterr().out
    assert "first-level mesh" in text and "dofs" in text and "size-guard estimate" in text
    assert len(text.splitlines()) <= 24          # one screen
    assert not list(out.glob(".*.tmp"))


def test_show_member_lists_supports_loads_cuts(tmp_path, no_solver):
    pv = preview(load_case(CASES / "coped-beam-fillet.toml"), tmp_path)
    text = pv.summary()
    assert "support-0" in text and "load-0" in text and "cuts at x =" in text
    assert " N" in text or " kN" in text


def test_show_dof_count_is_the_first_level_of_the_check(tmp_path):
    """The dofs that show reports are those of the check's first level (same mesh)."""
    case = load_case(CASES / "stub-cantilever.toml")
    pv = preview(case, tmp_path)
    ran = check(case.with_mesh(levels=1)).data["mesh"]
    assert pv.dofs == ran["dofs"] and pv.elements == ran["elements"]
    assert 0.8 < pv.estimate / pv.dofs < 1.25


def test_show_bad_case_exit_2(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text('schema = 1\nname = "x"\nkind = "beam"\n', encoding="utf-8")
    assert main(["show", str(bad), "--out", str(tmp_path / "o")]) == 2
    assert capsys.readouterr().err.count("\n") == 1
    assert not (tmp_path / "o" / "model.png").exists()
