"""`shearcheck hand`: the hand side alone, in the contract's shape with FE figures null."""

from __future__ import annotations

import json

import pytest
from conftest import CANTILEVER

from fem.api import hand_check
from fem.case import parse_case

SECTION = """
schema = 1
name = "plank"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[geometry]
shape = "rectangle"
width = 40.0
depth = 20.0
[loads]
shear = [0.0, 1000.0]
[mesh]
size = 2.0
"""


def test_beam_hand_only(tmp_path):
    """Cantilever P = 10 kN, 10 x 100: tau = 1.5 V/A = 15 MPa at every cut, |M| = P(L - x)
    (statics, common practice); FE figures are null."""
    case = parse_case(CANTILEVER.format(length=300.0, size=10.0, levels=1,
                                        cuts="[50.0, 150.0]"), "c.toml")
    text = hand_check(case, tmp_path)
    d = json.loads((tmp_path / "results.json").read_text())
    assert [c["tau_max_hand"] for c in d["cuts"]] == pytest.approx([15.0, 15.0])
    assert [abs(c["M_hand"]) for c in d["cuts"]] == pytest.approx([2.5e6, 1.5e6])
    assert all(c["tau_max_fe"] is None and c["ratio"] is None for c in d["cuts"])
    assert "10000 N x 12500 mm3 / (833333 mm4 x 10 mm) = 15 MPa" in text


def test_section_hand_only(tmp_path):
    """Rectangle 40 x 20 under Vy = 1000: A = 800, Ixx = 40 x 20^3/12, VQ/(Ib) = 1.5 V/A
    = 1.875 MPa, V/A = 1.25 MPa (common practice)."""
    hand_check(parse_case(SECTION, "s.toml"), tmp_path)
    s = json.loads((tmp_path / "results.json").read_text())["section"]
    assert s["A"] == pytest.approx(800.0)
    assert s["I"]["xx"] == pytest.approx(40 * 20**3 / 12)
    assert s["tau_max_hand"] == pytest.approx(1.875, rel=1e-6)
    assert s["tau_avg_hand"] == pytest.approx(1.25)
