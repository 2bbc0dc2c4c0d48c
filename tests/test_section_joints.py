"""Shear flow across joints of built-up sections: FE against VQ/I (fem.section.joints)."""

from __future__ import annotations

import pytest

from fem.case.model import Joint
from fem.section.level import check_section

E, NU = 200_000.0, 0.3

# flange plate 120 x 12 on a web plate 10 x 150 (a welded tee), the web tip at y = 0
TEE = (((-60.0, 150.0), (60.0, 150.0), (60.0, 162.0), (-60.0, 162.0)),
       ((-5.0, 0.0), (5.0, 0.0), (5.0, 150.0), (-5.0, 150.0)))


def _box(h: float, b: float, t: float) -> tuple:
    """Four plates: flanges b x t across the full width, webs t x (h - 2t) between them."""
    return (((0, h - t), (b, h - t), (b, h), (0, h)), ((0, 0), (b, 0), (b, t), (0, t)),
            ((0, t), (t, t), (t, h - t), (0, h - t)),
            ((b - t, t), (b, t), (b, h - t), (b - t, h - t)))


def test_built_up_tee_joint_is_vq_over_i():
    """Tee of a 120 x 12 flange on a 10 x 150 web, Vy = 20 kN: the flange-to-web joint
    (the interface found automatically, joint-0) carries q = V Q / I with Q = A_f (y_f - ybar)
    of the flange (Gere & Goodno, Mechanics of Materials, shear flow in built-up beams;
    common practice).  Closed form: A = 1440 + 1500, ybar = (1440 x 156 + 1500 x 75) / A,
    I = sum(b h^3/12 + A d^2).  FE within 1 %; the throat stress of two 4 mm welds is
    q / (2 x 4)."""
    Af, Aw = 120 * 12.0, 10 * 150.0
    ybar = (Af * 156.0 + Aw * 75.0) / (Af + Aw)
    I = 120 * 12**3 / 12 + Af * (156 - ybar) ** 2 + 10 * 150**3 / 12 + Aw * (75 - ybar) ** 2  # noqa: E741
    q = 20_000.0 * Af * (156.0 - ybar) / I
    joints = (Joint("joint-0", (-5.0, 150.0), (5.0, 150.0), throat=4.0, welds=2),)
    r = check_section("built-up", {"plates": TEE}, E, NU, 0.0, 20_000.0, 3.0, joints=joints)
    (j,) = r.joints
    assert j.q_hand == pytest.approx(q, rel=1e-9)
    assert j.Qx == pytest.approx(Af * (156.0 - ybar), rel=1e-9)
    assert j.q_fe == pytest.approx(q, rel=0.01)
    assert j.throat_stress == pytest.approx(j.q_design / 8.0, rel=1e-12)
    assert not [f for f in r.findings if f.kind.startswith("joint")]
    default = check_section("built-up", {"plates": TEE}, E, NU, 0.0, 20_000.0, 3.0)
    assert [x.name for x in default.joints] == ["joint-0"]
    assert default.joints[0].q_fe == pytest.approx(q, rel=0.01)


def test_box_of_four_plates_web_to_flange_by_symmetry():
    """Box 300 wide, 500 deep, plates 10 thick (t/h = 0.02), Vy = 100 kN.  A web-to-flange
    joint alone does not cut the closed cell; by symmetry the flow on the vertical axis is
    zero, so each joint carries q = V Q / I with Q of one flange half,
    Q = (b/2) t (h/2 - t/2), I = (b h^3 - (b - 2t)(h - 2t)^3) / 12 (the thin-walled
    closed-section result for a doubly symmetric box; common practice).  FE within 2 %
    at all four joints, signs opposite at top and bottom."""
    h, b, t, V = 500.0, 300.0, 10.0, 100_000.0
    Q = b / 2 * t * (h / 2 - t / 2)
    I = (b * h**3 - (b - 2 * t) * (h - 2 * t) ** 3) / 12  # noqa: E741
    r = check_section("built-up", {"plates": _box(h, b, t)}, E, NU, 0.0, V, 5.0)
    assert len(r.joints) == 4
    for j in r.joints:
        assert j.second_cut == "x = 150"
        assert abs(j.q_hand) == pytest.approx(V * Q / I, rel=1e-9)
        assert j.ratio == pytest.approx(1.0, abs=0.02)
    assert {round(j.q_fe / abs(j.q_fe)) for j in r.joints} == {1, -1}


TEE_CASE = """
schema = 1
name = "tee"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[geometry]
shape = "built-up"
[[geometry.plates]]
corner = [-60.0, 150.0]
size = [120.0, 12.0]
[[geometry.plates]]
corner = [-5.0, 0.0]
size = [10.0, 150.0]
[loads]
shear = [0.0, 20000.0]
[mesh]
size = 3.0
levels = 1
"""


def test_joint_rule_breaks_when_the_hand_q_is_wrong(monkeypatch):
    """The joint-excess rule: with the hand q halved on purpose (a wrong Q), the ratio
    is about 2 and the case's verdict (fem.verdict.decide, one level: row 2) is unsafe
    with a joint-excess finding naming the joint."""
    from fem.case.parse import parse_case
    from fem.section import joints as mod
    from fem.section.check import check_section_case

    monkeypatch.setattr(mod, "hand_flow", lambda ab, Qx, Qy: 0.5 * float(ab[1] * Qx))
    run = check_section_case(parse_case(TEE_CASE))
    found = [f for f in run.result.findings if f.kind == "joint-excess"]
    assert found and "joint-0" in found[0].message and found[0].ratio > 1.5
    assert run.result.verdict == "unsafe"
    assert run.result.joints[0]["ratio"] == pytest.approx(2.0, rel=0.02)


def test_fastener_spacing_and_capacity():
    """Bolts at spacing s with capacity C: demand q s and largest spacing C / q, with the
    larger of FE and hand |q| (definitions, common practice); demand above capacity gives
    an informing joint-capacity finding."""
    jt = (Joint("bolts", (-5.0, 150.0), (5.0, 150.0), capacity=5000.0, spacing=50.0),)
    r = check_section("built-up", {"plates": TEE}, E, NU, 0.0, 20_000.0, 3.0, joints=jt)
    (j,) = r.joints
    assert j.demand == pytest.approx(j.q_design * 50.0, rel=1e-12)
    assert j.max_spacing == pytest.approx(5000.0 / j.q_design, rel=1e-12)
    cap = [f for f in r.findings if f.kind == "joint-capacity"]
    assert cap and cap[0].ratio == pytest.approx(j.demand / 5000.0)


def test_units_stress_keeps_joint_flows_and_capacities_in_the_force_unit():
    """The built-up tee with a bolt row (capacity 5 kN, spacing 50 mm) written in kN, mm and
    [units] stress = "MPa": every stress of results.json is the N/mm run's (MPa both), every
    force, shear flow and capacity that run's in kN, to 1e-9 (SI definitions, common
    practice); the joint-capacity finding speaks in kN and kN/mm."""
    from conftest import unit_mismatches

    from fem.case.parse import parse_case
    from fem.section.check import check_section_case

    bolts = ('[[check.joints]]\nname = "bolts"\nfrom = [-5.0, 150.0]\nto = [5.0, 150.0]\n'
             'spacing = 50.0\n')
    n = TEE_CASE + "[check]\n" + bolts + "capacity = 5000.0\n"
    kn = (TEE_CASE.replace("[material]", '[units]\nforce = "kN"\nstress = "MPa"\n[material]')
          .replace("shear = [0.0, 20000.0]", "shear = [0.0, 20.0]")
          + "[check]\n" + bolts + "capacity = 5.0\n")
    a = check_section_case(parse_case(n, "n.toml")).result
    b = check_section_case(parse_case(kn, "kn.toml")).result
    assert b.units == {"length": "mm", "force": "kN", "stress": "MPa"}
    assert unit_mismatches(a.to_dict(), b.to_dict(), 1e-3) == []
    assert b.verdict == a.verdict
    (cap,) = [f for f in b.findings if f.kind == "joint-capacity"]
    j = b.joints[0]
    assert f"= {j['demand']:.4g} kN exceeds its capacity 5 kN" in cap.message
    assert "kN/mm x 50 mm" in cap.message


def test_hand_lines_of_the_girder_joints():
    """`shearcheck hand` writes each joint's VQ/I: the girder of
    cases/welded-plate-girder-section.toml, Q = 300 x 20 x 440 = 2.64e6 mm3,
    I = 10 x 860^3/12 + 2 (300 x 20^3/12 + 6000 x 440^2), q = 600 kN Q / I = 555.08 N/mm,
    throat q/(2 x 4.2) = 66.08 MPa (common practice)."""
    from conftest import ROOT

    from fem.case import load_case
    from fem.section.hand_only import section_hand_result

    _, lines = section_hand_result(load_case(ROOT / "cases" / "welded-plate-girder-section.toml"))
    text = "\n".join(lines)
    I = 10 * 860**3 / 12 + 2 * (300 * 20**3 / 12 + 6000 * 440**2)  # noqa: E741
    assert f"q = {600_000 * 2.64e6 / I:.5g} N/mm" in text
    assert "q/(2 x 4.2 mm) = 66.08 MPa" in text


def test_unsymmetric_closed_cell_joint_has_no_hand_value():
    """A box whose right web is twice as thick is not symmetric about the vertical axis:
    a web-to-flange joint of the closed cell has no VQ/I of its own (statically
    indeterminate; Megson, 4th ed., Ch. 17, from memory).  No ratio, an informing
    joint-indeterminate finding, and the FE flow still reported."""
    h, b, t = 500.0, 300.0, 10.0
    plates = list(_box(h, b, t))
    plates[3] = ((b - 2 * t, t), (b, t), (b, h - t), (b - 2 * t, h - t))
    r = check_section("built-up", {"plates": tuple(plates)}, E, NU, 0.0, 1e5, 10.0)
    assert all(j.q_hand is None and j.ratio is None for j in r.joints)
    found = [f for f in r.findings if f.kind == "joint-indeterminate"]
    assert len(found) == 4 and all(abs(j.q_fe) > 10.0 for j in r.joints)
