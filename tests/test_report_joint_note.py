"""The joints block of the design note (fem.report.joint_note)."""

from __future__ import annotations

from types import SimpleNamespace

from fem.report.blocks import Table
from fem.report.joint_note import joint_section


def _res(joints, tolerance=0.05):
    hp = {"cx": 0.0, "cy": 114.67, "Ixx": 7.65e6, "Iyy": 1.74e6, "Ixy": 0.0}
    result = SimpleNamespace(joints=joints, units={"length": "mm", "force": "N", "stress": "MPa"},
                             section={"hand_properties": hp, "V_solved": [0.0, 20000.0]},
                             tolerance=tolerance)
    return SimpleNamespace(result=result, case=SimpleNamespace(shear=(0.0, 20000.0)))


JOINT = {"name": "joint-0", "from": [-5.0, 150.0], "to": [5.0, 150.0], "Q": 59510.0,
         "Qx": 59510.0, "Qy": 0.0, "q_hand": 155.58, "q_fe": 155.61, "ratio": 1.0002,
         "part_area": 1440.0, "part_centroid": [0.0, 156.0], "second_cut": "",
         "demand": None, "capacity": None, "max_spacing": None, "throat": 4.0, "welds": 2,
         "throat_stress": 19.45}


def test_no_joints_no_block():
    assert joint_section(_res(None)) is None


def test_table_and_written_out_hand_flow():
    """One row per joint with Q, q hand, q FE, ratio and the weld check; the hand q is
    written out as Q = A (y - ybar) and q = V Q / I with the numbers."""
    s = joint_section(_res([JOINT, {**JOINT, "name": "joint-1", "ratio": 1.2}]))
    table = next(i for i in s.items if isinstance(i, Table))
    assert [r[0] for r in table.rows] == ["joint-0", "joint-1"] and table.marked == {1}
    assert "τ_throat = q/(2·4)" in table.rows[0][-1]
    text = s.items[-1].text
    assert "Q = A (y − ȳ) = 1440 × 41.33" in text and "q = V Q / I = 20000 × 59510" in text
