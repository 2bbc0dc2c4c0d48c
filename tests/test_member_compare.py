"""Findings at cuts and stations (the verdict rule itself: tests/test_verdict.py)."""

from __future__ import annotations

import pytest
from conftest import CANTILEVER

from fem.api import check
from fem.case import parse_case
from fem.verdict import decide


def _case(levels: int = 1):
    return parse_case(CANTILEVER.format(length=60.0, size=10.0, levels=levels,
                                        cuts="[10.0, 30.0]"), "stub.toml")


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


def _direct(method: str, hole: str = "", cuts: str = "[150.0]"):
    text = CANTILEVER.format(length=300.0, size=10.0, levels=1, cuts=cuts)
    text = text.replace("[check]", f'[check]\nmethod = "{method}"')
    return check(parse_case(text.replace("[[supports]]", hole + "[[supports]]"),
                            "direct.toml")).result


@pytest.mark.parametrize(("method", "n", "words"), [("single-shear", 1, "single-shear"),
                                                    ("double-shear", 2, "double-shear")])
def test_direct_shear_excess_names_the_method_and_n(method, n, words):
    """Cantilever 300 x 100 x 10 mm, tip load F = 10 kN: direct shear tau = F/(n A) with
    A = 1000 mm^2 gives 10 MPa (single, n = 1) and 5 MPa (double, n = 2) (Gere & Goodno,
    Mechanics of Materials, 7th ed., Sec. 1.6, from memory); the elastic shear at mid-length peaks
    at 1.5 V/A = 15 MPa (shear formula, rectangle), so the FE exceeds F/(nA) by about 1.5 n. The
    `method-excess` finding names the method and n and quotes F/(nA); it decides."""
    res = _direct(method)
    (c,) = res.cuts
    assert c.tau_max_hand == pytest.approx(10.0 / n, rel=1e-12)
    (f,) = [f for f in res.findings if f.kind == "method-excess"]
    assert f.ratio == pytest.approx(1.5 * n, rel=0.02)
    assert words in f.message and f"n = {n} " in f.message
    assert ("F/A =" if n == 1 else "F/(2 A) =") in f.message
    other = "double-shear" if n == 1 else "single-shear"
    assert other not in f.message
    assert f"{10.0 / n:.4g} MPa" in f.message and "15 MPa" in f.message
    assert decide([f], tolerance=0.05, levels=3, converged=True).word == "unsafe"


def test_shear_formula_has_no_method_excess_finding():
    """The method-excess finding is for direct shear only; the shear formula's own excess
    beside a feature carries the cause's kind."""
    res = _direct("shear-formula")
    assert not [f for f in res.findings if f.kind == "method-excess"]


HOLE = "[[geometry.holes]]\ncenter = [150.0, 50.0]\nradius = 15.0\n"


def test_cut_beside_a_hole_is_a_concentration_not_a_short_beam():
    """A 30 mm hole at mid-length of the 100 mm deep cantilever, cuts through it and 15 mm
    beside it: the FE shear exceeds VQ/(Ib) of the net section there (measured 1.64 and
    1.34 at 10 mm elements), caused by the hole, so the cut findings are `concentration`
    and name the hole; no load, support or change of section is within a depth, so none is
    `short-beam`."""
    res = _direct("shear-formula", HOLE, "[150.0, 165.0]")
    at_cuts = [f for f in res.findings if f.at[0] in (150.0, 165.0) and f.ratio]
    assert len(at_cuts) == 2
    assert all(f.kind == "concentration" and "hole 0" in f.message for f in at_cuts)
    assert not [f for f in res.findings if f.kind == "short-beam"]
    assert res.verdict == "unsafe"



def test_cut_von_mises_is_plane_strain_for_a_plane_strain_member():
    """The bar of tests/test_member_solve.py under sigma_xx = 10 in plane strain: at every
    cut the FE and the hand von Mises stress are sqrt(((10 - 0)^2 + (0 - 3)^2 + (3 - 10)^2)
    /2) = sqrt(79) = 8.888 (sigma_zz = nu sigma_xx = 3; hand arithmetic), not 10."""
    import math

    from test_member_solve import BAR

    from fem.member.compare import cut_results
    from fem.member.level import run_level

    case = parse_case(BAR.format(model="plane-strain"), "bar.toml")
    cuts = cut_results(run_level(case, case.mesh.size, [50.0]))
    assert cuts[0].von_mises_max_fe == pytest.approx(math.sqrt(79.0), rel=1e-6)
    assert cuts[0].von_mises_max_hand == pytest.approx(math.sqrt(79.0), rel=1e-9)
