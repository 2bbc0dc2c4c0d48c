"""Outlines from DXF drawings (fem.case.drawing): the same model as typed arcs, and every
hostile drawing refused on its own with a one-line message naming file, layer and entity.

The DXF files are written here with ezdxf. Bulge and ARC conventions: DXF reference
(LWPOLYLINE group 42; ARC angles counter-clockwise in degrees; $INSUNITS codes 1 in, 4 mm,
6 m).
"""

from __future__ import annotations

import math
from pathlib import Path

import ezdxf
import numpy as np
import pytest

from fem.api import check
from fem.case import load_case, parse_case
from fem.case.drawing import MAX_DRAWING_BYTES
from fem.cli import main
from fem.errors import CaseError

Q = math.tan(math.pi / 8)

MEMBER = """
schema = 1
name = "drawn-bracket"
kind = "beam"
[units]
length = "{unit}"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
{geometry}
[[supports]]
from = [0.0, 0.0]
to = [40.0, 0.0]
fix = "xy"
[[loads]]
from = [200.0, 140.0]
to = [200.0, 200.0]
force = [0.0, -5000.0]
[mesh]
size = 10.0
"""

TYPED = """shape = "polygon"
points = [[0, 0], [40, 0], [40, 120, -0.41421356237309503], [60, 140], [200, 140],
          [200, 200], [0, 200]]
[[geometry.holes]]
center = [20.0, 170.0]
radius = 8.0"""


def new_doc(units: int = 4):
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = units
    return doc, doc.modelspace()


def l_bracket_dxf(path: Path, units: int = 4, layer: str = "OUTLINE",
                  extra=None) -> Path:
    """The L bracket of TYPED drawn as LINEs, one ARC (the 20 mm fillet in the re-entrant
    corner, centre (60, 120), counter-clockwise from 90 to 180 degrees) and a CIRCLE hole,
    plus a title TEXT on layer NOTES."""
    doc, msp = new_doc(units)
    a = {"dxfattribs": {"layer": layer}}
    msp.add_line((0, 0), (40, 0), **a)
    msp.add_line((40, 0), (40, 120), **a)
    msp.add_arc((60, 120), 20, 90, 180, **a)
    msp.add_line((60, 140), (200, 140), **a)
    msp.add_line((200, 140), (200, 200), **a)
    msp.add_line((200, 200), (0, 200), **a)
    msp.add_line((0, 200), (0, 0), **a)
    msp.add_circle((20, 170), 8, **a)
    msp.add_text("BRACKET B1", dxfattribs={"layer": "NOTES"})
    if extra is not None:
        extra(msp)
    doc.saveas(path)
    return path


def drawn(tmp_path: Path, name: str = "b.dxf", layer: str | None = "OUTLINE",
          unit: str = "mm"):
    geometry = f'shape = "drawing"\nfile = "{name}"' + (f'\nlayer = "{layer}"' if layer else "")
    case = tmp_path / "case.toml"
    case.write_text(MEMBER.format(unit=unit, geometry=geometry), encoding="utf-8")
    return load_case(case)


def test_drawing_equals_typed_arcs(tmp_path):
    """The drawn L bracket (LINE + ARC fillet + CIRCLE hole) gives the model and results
    of the case typed with a bulge vertex and a hole to 1e-6: same outline vertices and
    bulges, same mesh, same peaks and cut values."""
    l_bracket_dxf(tmp_path / "b.dxf")
    a = drawn(tmp_path)
    b = parse_case(MEMBER.format(unit="mm", geometry=TYPED), "typed.toml")
    np.testing.assert_allclose(a.beam.ring, b.beam.ring, atol=1e-9)
    assert a.beam.holes == b.beam.holes and a.beam.drawing == "b.dxf, layer 'OUTLINE'"
    ra, rb = check(a).data, check(b).data
    assert ra["mesh"]["dofs"] == rb["mesh"]["dofs"]
    for k in ("tau_max", "von_mises_max", "principal_max"):
        assert ra["peak"][k] == pytest.approx(rb["peak"][k], rel=1e-6)
    for ca, cb in zip(ra["cuts"], rb["cuts"], strict=True):
        for k in ("V_fe", "M_fe", "tau_max_fe", "tau_max_hand"):
            assert ca[k] == pytest.approx(cb[k], rel=1e-6, abs=1e-9)
    assert ra["verdict"] == rb["verdict"]


def test_polylines_with_bulges_and_mirrored_arcs(tmp_path):
    """The same outline as one closed LWPOLYLINE with the bulge on the fillet vertex, as a
    closed 2D POLYLINE, and as open polylines chained with an ARC whose extrusion is -z
    (mirrored: clockwise in the plan) all read to the typed ring."""
    ring = [(0, 0, 0), (40, 0, 0), (40, 120, -Q), (60, 140, 0), (200, 140, 0),
            (200, 200, 0), (0, 200, 0)]
    want = parse_case(MEMBER.format(unit="mm", geometry=TYPED), "t.toml").beam.ring
    for make in ("lw", "poly", "mirrored"):
        doc, msp = new_doc()
        if make == "lw":
            msp.add_lwpolyline(ring, format="xyb", close=True)
        elif make == "poly":
            pl = msp.add_polyline2d([(x, y) for x, y, _ in ring], close=True)
            for v, (_, _, b) in zip(pl.vertices, ring, strict=True):
                v.dxf.bulge = b
        else:
            msp.add_lwpolyline([(60, 140), (200, 140), (200, 200), (0, 200), (0, 0), (40, 0),
                                (40, 120)])
            # in the OCS of extrusion -z, x is mirrored: centre (-60, 120) there is (60, 120)
            msp.add_arc((-60, 120), 20, 0, 90, dxfattribs={"extrusion": (0, 0, -1)})
        msp.add_circle((20, 170), 8)
        doc.saveas(tmp_path / "b.dxf")
        c = drawn(tmp_path, layer=None)
        got = {(round(x, 9), round(y, 9)): round(b, 9) for x, y, b in c.beam.ring}
        exp = {(round(x, 9), round(y, 9)): round(b, 9) for x, y, b in want}
        if make == "mirrored":   # chained from (60, 140): the ring runs the same way round
            assert set(got) == set(exp) and sorted(got.values()) == sorted(exp.values())
        else:
            assert got == exp


def test_section_from_a_drawing(tmp_path):
    """A drawn hollow circle (two CIRCLEs) is the tube; a drawn half-round shell (a closed
    LWPOLYLINE with bulges) equals the typed polygon section."""
    doc, msp = new_doc()
    msp.add_circle((0, 0), 50)
    msp.add_circle((0, 0), 35)
    doc.saveas(tmp_path / "tube.dxf")
    text = """
schema = 1
name = "drawn-tube"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[geometry]
{g}
[loads]
shear = [0.0, 10000.0]
[mesh]
size = 5.0
"""
    (tmp_path / "d.toml").write_text(text.format(g='shape = "drawing"\nfile = "tube.dxf"'))
    d = check(load_case(tmp_path / "d.toml")).result.section
    t = check(parse_case(text.format(g='shape = "tube"\ndiameter = 100.0\nwall = 15.0'),
                         "t.toml")).result.section
    for k in ("A", "J", "tau_max_fe"):
        assert d[k] == pytest.approx(t[k], rel=1e-6)


# ---- hostile drawings, each its own refusal ------------------------------------------

def refused(tmp_path: Path, match: str, **kw) -> str:
    with pytest.raises(CaseError) as err:
        drawn(tmp_path, **kw)
    msg = str(err.value)
    assert "\n" not in msg and "case.toml" in msg and str(tmp_path) not in msg.split(":", 1)[1]
    assert __import__("re").search(match, msg), msg
    return msg


def test_empty_file(tmp_path):
    (tmp_path / "b.dxf").write_bytes(b"")
    refused(tmp_path, r"geometry\.file.*b\.dxf.*not a readable DXF")


def test_binary_junk(tmp_path):
    (tmp_path / "b.dxf").write_bytes(bytes(range(256)) * 40)
    refused(tmp_path, r"geometry\.file.*not a readable DXF")


def test_missing_file(tmp_path):
    refused(tmp_path, r"geometry\.file.*b\.dxf.*no such file")


def test_open_chain_names_the_gap(tmp_path):
    """The last LINE stops 0.5 mm short of the origin: refused with both loose ends and the
    gap."""
    doc, msp = new_doc()
    for a, b in [((0, 0), (40, 0)), ((40, 0), (40, 40)), ((40, 40), (0, 40)),
                 ((0, 40), (0, 0.5))]:
        msp.add_line(a, b)
    doc.saveas(tmp_path / "b.dxf")
    msg = refused(tmp_path, r"open chain: entity LINE \(handle \w+\) ends at .* is 0\.5 mm away",
                  layer=None)
    assert "layer" not in msg.split("b.dxf")[1].split(":")[0]


def test_self_intersecting_outline(tmp_path):
    doc, msp = new_doc()
    pl = msp.add_lwpolyline([(0, 0), (40, 40), (40, 0), (0, 40)], close=True)
    doc.saveas(tmp_path / "b.dxf")
    refused(tmp_path, rf"LWPOLYLINE {pl.dxf.handle} crosses itself", layer=None)


def test_two_outer_contours(tmp_path):
    doc, msp = new_doc()
    msp.add_lwpolyline([(0, 0), (40, 0), (40, 40), (0, 40)], close=True)
    other = msp.add_lwpolyline([(100, 0), (130, 0), (130, 30), (100, 30)], close=True)
    doc.saveas(tmp_path / "b.dxf")
    refused(tmp_path, rf"two outer contours: LWPOLYLINE {other.dxf.handle} lies apart",
            layer=None)


def test_units_mismatch(tmp_path):
    """A drawing saved in inches ($INSUNITS = 1) for a case in mm: both named."""
    l_bracket_dxf(tmp_path / "b.dxf", units=1)
    refused(tmp_path, r"units\.length.*drawing is in in \(\$INSUNITS = 1\).*'mm'")
    l_bracket_dxf(tmp_path / "b.dxf", units=5)
    refused(tmp_path, r"centimetres")
    l_bracket_dxf(tmp_path / "b.dxf", units=0)   # unitless: taken as the case's unit
    assert drawn(tmp_path).beam.drawing


def test_oversized_file(tmp_path):
    """A 20 MB drawing is refused by its size before any of it is parsed (a sparse file:
    nothing is written)."""
    with open(tmp_path / "b.dxf", "wb") as f:
        f.truncate(20_000_000)
    assert 20_000_000 > MAX_DRAWING_BYTES
    refused(tmp_path, r"19\.1 MiB, above the limit of 16 MiB")


def test_other_layers_ignored_only_when_layer_given(tmp_path):
    """The title TEXT on layer NOTES is ignored with layer = "OUTLINE", and refused by type,
    handle and layer without it; a SPLINE on the outline's layer is refused either way."""
    l_bracket_dxf(tmp_path / "b.dxf")
    assert drawn(tmp_path).beam.holes
    refused(tmp_path, r"entity TEXT \(handle \w+\) on layer 'NOTES' is not a line.*"
                      r"geometry\.layer", layer=None)
    l_bracket_dxf(tmp_path / "b.dxf", extra=lambda msp: msp.add_spline(
        [(100, 150), (120, 160), (140, 150)], dxfattribs={"layer": "OUTLINE"}))
    refused(tmp_path, r"layer 'OUTLINE': entity SPLINE \(handle \w+\)")


def test_unknown_layer_lists_the_layers(tmp_path):
    l_bracket_dxf(tmp_path / "b.dxf")
    refused(tmp_path, r"geometry\.layer.*no entities on this layer.*'NOTES', 'OUTLINE'",
            layer="GUSSET")


def test_branching_chain(tmp_path):
    doc, msp = new_doc()
    for a, b in [((0, 0), (40, 0)), ((40, 0), (40, 40)), ((40, 40), (0, 40)),
                 ((0, 40), (0, 0)), ((40, 0), (80, 0))]:
        msp.add_line(a, b)
    doc.saveas(tmp_path / "b.dxf")
    refused(tmp_path, r"3 entity ends meet at \(40, 0\).*must not branch", layer=None)


def test_cli_exit_2_one_line(tmp_path, capsys):
    (tmp_path / "b.dxf").write_bytes(b"\x00\xff junk")
    case = tmp_path / "case.toml"
    case.write_text(MEMBER.format(unit="mm", geometry='shape = "drawing"\nfile = "b.dxf"'))
    assert main(["run", str(case), "--out", str(tmp_path / "out")]) == 2
    err = capsys.readouterr().err.strip()
    assert err.count("\n") == 0 and "geometry.file" in err and "b.dxf" in err
    assert not (tmp_path / "out").exists()


def test_bundled_drawing_is_reproduced_by_its_script(tmp_path):
    """cases/drawings/make_haunched_bracket.py writes the committed haunched-bracket.dxf:
    the same bytes with the same ezdxf release, the same outline in any case; the haunch is
    one arc of R = (350^2 + 180^2)/360 = 430.278 mm meeting the column face at 90 degrees
    (no re-entrant corner)."""
    import subprocess
    import sys

    from fem.case.arcs import ring_arcs
    from fem.case.drawing import read_drawing
    from fem.case.outline import domain_polygon, reentrant_corners

    root = Path(__file__).resolve().parents[1]
    committed = root / "cases" / "drawings" / "haunched-bracket.dxf"
    made = tmp_path / "again.dxf"
    subprocess.run([sys.executable, str(root / "cases" / "drawings" /
                                        "make_haunched_bracket.py"), str(made)],
                   check=True, capture_output=True)
    if f"{ezdxf.__version__} @" in committed.read_text(encoding="utf-8"):
        assert made.read_bytes() == committed.read_bytes()
    a = read_drawing(committed, "c.dxf", "BRACKET", "mm", "c.toml")
    b = read_drawing(made, "c.dxf", "BRACKET", "mm", "c.toml")
    assert a == b
    arcs = ring_arcs(a.outline)
    assert len(arcs) == 1 and arcs[0].radius == pytest.approx(430.2778, abs=1e-4)
    case = load_case(root / "cases" / "haunched-bracket.toml")
    assert reentrant_corners(domain_polygon(case.beam)) == []


def test_tiny_arc_named_by_its_entity(tmp_path):
    """An ARC of radius 0.001 mm closing a 40 mm outline is refused against the drawing's
    entities (MIN_ARC_RADIUS x the extent), not against a typed key."""
    doc, msp = new_doc()
    msp.add_line((0, 0), (40, 0))
    msp.add_line((40, 0), (40, 40))
    msp.add_line((40, 40), (0.002, 40))
    msp.add_arc((0.001, 40), 0.001, 0, 180)     # (0.002, 40) -> (0, 40)
    msp.add_line((0, 40), (0, 0))
    doc.saveas(tmp_path / "b.dxf")
    refused(tmp_path, r"geometry\.file: b\.dxf: the contour of LINE .*radius.*too small",
            layer=None)
