"""Built-up sections and joint lines in the case file (fem.case.plates)."""

from __future__ import annotations

import pytest

from fem.case.parse import parse_case
from fem.case.plates import build_up, drawn_section
from fem.errors import CaseError

HEAD = """
schema = 1
name = "girder"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[loads]
shear = [0.0, 1000.0]
[mesh]
size = 5.0
[geometry]
shape = "built-up"
"""
I_PLATES = """
[[geometry.plates]]
corner = [-100.0, 290.0]
size = [200.0, 10.0]
[[geometry.plates]]
corner = [-100.0, 0.0]
size = [200.0, 10.0]
[[geometry.plates]]
points = [[-4.0, 10.0], [4.0, 10.0], [4.0, 290.0], [-4.0, 290.0]]
"""


def test_plates_union_and_interfaces_are_named_in_order():
    """An I of three plates: the union is one 12-corner outline (collinear points of the
    plates dropped), and the two web-to-flange stretches are joint-0 (top flange, plate 0
    with plate 2) and joint-1 (bottom), each 8 long at y = 290 and y = 10."""
    case = parse_case(HEAD + I_PLATES)
    b = build_up(case.section.params["plates"])
    assert len(b.outer) == 12 and not b.holes
    assert [(i.name, i.plates, i.start, i.end) for i in b.interfaces] == [
        ("joint-0", (0, 2), (-4.0, 290.0), (4.0, 290.0)),
        ("joint-1", (1, 2), (-4.0, 10.0), (4.0, 10.0))]
    d = drawn_section(case.section)
    assert d.shape == "polygon" and len(d.params["points"]) == 12
    assert b.polygon.area == pytest.approx(2 * 2000.0 + 8 * 280.0)


def test_joints_are_read_with_their_fastener_keys():
    case = parse_case(HEAD + I_PLATES + """
[check]
[[check.joints]]
name = "top-welds"
from = [-4.0, 290.0]
to = [4.0, 290.0]
throat = 4.0
welds = 2
""")
    (j,) = case.check.joints
    assert (j.name, j.throat, j.welds, j.capacity) == ("top-welds", 4.0, 2, None)


@pytest.mark.parametrize("extra, key, words", [
    ("[check]\n[[check.joints]]\nfrom = [-4.0, 150.0]\nto = [4.0, 150.0]\nwelds = 2\n",
     "check.joints.0.welds", "throat"),
    ("[check]\n[[check.joints]]\nfrom = [-4.0, 150.0]\nto = [-4.0, 150.0]\n",
     "check.joints.0.to", "equals 'from'"),
    ("[check]\n[[check.joints]]\nfrom = [-4.0, 150.0]\nto = [4.0, 150.0]\n"
     "[[check.joints]]\nname = 'joint-0'\nfrom = [-4.0, 50.0]\nto = [4.0, 50.0]\n",
     "check.joints.1.name", "used by another"),
    ("[check]\n[[check.joints]]\nfrom = [-200.0, 500.0]\nto = [200.0, 500.0]\n",
     "check.joints.0", "misses the section"),
    ("[check]\n[[check.joints]]\nfrom = [-100.0, 300.0]\nto = [100.0, 300.0]\n",
     "check.joints.0", "along an edge"),
])
def test_bad_joints_name_the_key(extra, key, words):
    with pytest.raises(CaseError) as e:
        parse_case(HEAD + I_PLATES + extra)
    assert e.value.key == key and words in e.value.message


def test_one_plate_is_not_built_up():
    with pytest.raises(CaseError) as e:
        parse_case(HEAD + "[[geometry.plates]]\ncorner = [0.0, 0.0]\nsize = [10.0, 10.0]\n")
    assert e.value.key == "geometry.plates" and "at least two" in e.value.message
