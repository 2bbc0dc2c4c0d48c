"""Findings and the verdict rules."""

from __future__ import annotations

from conftest import CANTILEVER

from fem.api import check
from fem.case import parse_case
from fem.member.compare import verdict
from fem.results import Finding


def _case(levels: int = 1):
    return parse_case(CANTILEVER.format(length=60.0, size=10.0, levels=levels,
                                        cuts="[10.0, 30.0]"), "stub.toml")


def test_verdict_rules():
    """unsafe on a deciding excess; inconclusive when not converged or singular governs."""
    case = _case()
    excess = [Finding("short-beam", [0, 0], 1.2, "")]
    info = [Finding("bearing", [0, 0], 3.0, ""), Finding("excluded", [0, 0], None, "")]
    assert verdict(case, excess, converged=True, singular=False) == "unsafe"
    assert verdict(case, info, converged=True, singular=False) == "holds"
    assert verdict(case, info, converged=False, singular=False) == "inconclusive"
    assert verdict(case, excess, converged=True, singular=True) == "inconclusive"


BRACKET = """
schema = 1
name = "bracket"
kind = "beam"
[material]
E = 205000.0
nu = 0.3
thickness = 12.0
[geometry]
shape = "rectangle"
length = 200.0
depth = 240.0
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
at = [150.0, 240.0]
width = 40.0
force = [0.0, -90000.0]
[mesh]
size = 12.0
levels = 2
[check]
cuts = [60.0, 125.0]
"""


def test_bracket_beside_a_bearing_load_is_unsafe():
    """A deep bracket (span < depth) with a bearing patch on top: 5 mm beside the patch the
    shear crowds towards the loaded edge and exceeds 1.5 V/A = 46.9 MPa by about 15 %
    (measured 1.15 at 6 and 12 mm meshes); the finding names the cut and the load. Away
    from the load (x = 60) the shear formula holds (ratio below 1)."""
    res = check(parse_case(BRACKET, "bracket.toml")).result
    assert res.verdict == "unsafe"
    far, near = res.cuts
    assert far.ratio < 1.0 and near.ratio > 1.10
    f = [f for f in res.findings if f.kind == "short-beam"]
    assert len(f) == 1 and "load" in f[0].message and f[0].at[0] == 125.0
