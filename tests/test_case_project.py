"""The optional [project] title block: read as given, blanks left blank, bad keys named."""

from __future__ import annotations

import hashlib
import json
import subprocess
import sys
from pathlib import Path

import pytest
from conftest import ROOT

from fem.case.parse import load_case, parse_case
from fem.case.project import PROJECT_FIELDS, Project
from fem.cli import main
from fem.errors import CaseError

BASE = (ROOT / "cases" / "stub-cantilever.toml").read_text(encoding="utf-8")


def test_title_block_read_as_given_with_blanks():
    case = parse_case(BASE + '\n[project]\nproject = "Dock 4 crane rail"\njob = "J-2291"\n'
                             'date = 2026-03-14\nnotes = "line one\\nline two"\n', "c.toml")
    assert case.project == Project(project="Dock 4 crane rail", job="J-2291",
                                   date="2026-03-14", notes="line one\nline two")
    assert case.project.given() == {"project": "Dock 4 crane rail", "job": "J-2291",
                                    "date": "2026-03-14", "notes": "line one\nline two"}
    assert case.project.checked_by == ""           # not given: blank, never invented
    assert parse_case(BASE, "c.toml").project is None
    assert PROJECT_FIELDS == ("project", "job", "member", "prepared_by", "checked_by", "date",
                              "revision", "notes")


@pytest.mark.parametrize("body, key, fragment", [
    ('jobnumber = "7"', "project.jobnumber", "unknown key"),
    ("revision = 3", "project.revision", "must be a string"),
    ('member = "B1\\nB2"', "project.member", "one line"),
    ('job = "' + "x" * 201 + '"', "project.job", "at most 200"),
])
def test_bad_project_keys_are_named(body, key, fragment):
    with pytest.raises(CaseError) as e:
        parse_case(BASE + f"\n[project]\n{body}\n", "c.toml")
    assert e.value.key == key and fragment in str(e.value)


def test_unknown_project_key_exits_2_naming_it(tmp_path: Path, capsys):
    p = tmp_path / "c.toml"
    p.write_text(BASE + '\n[project]\nprepard_by = "A. Engineer"\n', encoding="utf-8")
    assert main(["hand", str(p), "--out", str(tmp_path / "o"), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "project.prepard_by" in err and "prepared_by" in err and len(err.splitlines()) == 1


def test_hand_results_carry_project_and_provenance(tmp_path: Path):
    """results.json: the title block as given and the provenance (CASE-FORMAT.md names);
    the case hash is the SHA-256 of the file's bytes (CRLF line ends kept as written)."""
    p = tmp_path / "c.toml"
    text = BASE + '\n[project]\nproject = "Dock 4"\nrevision = "B"\n'
    p.write_bytes(text.replace("\n", "\r\n").encode("utf-8"))
    assert load_case(p).text.count("\r\n") == text.count("\n")
    assert main(["hand", str(p), "--out", str(tmp_path / "o"), "--quiet"]) == 0
    d = json.loads((tmp_path / "o" / "results.json").read_text())
    assert d["project"] == {"project": "Dock 4", "revision": "B"}
    prov = d["provenance"]
    assert prov["case_sha256"] == hashlib.sha256(p.read_bytes()).hexdigest()
    assert prov["case_file"] == "c.toml"
    assert set(prov) >= {"shearcheck", "python", "packages", "case_file", "case_sha256",
                         "run_utc", "platform"}
    assert set(prov["packages"]) >= {"numpy", "scipy", "scikit-fem", "gmsh", "meshio"}
    assert prov["run_utc"].endswith("Z")
    assert str(tmp_path) not in (tmp_path / "o" / "results.json").read_text()
    contract = ROOT.parent / "shared" / "contract-check"
    if contract.exists():
        r = subprocess.run([sys.executable, str(contract), str(tmp_path / "o")],
                           capture_output=True, text=True)
        assert r.returncode == 0, r.stdout + r.stderr
