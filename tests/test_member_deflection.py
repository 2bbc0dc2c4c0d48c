"""Deflection beside beam theory: the FE against Timoshenko's bending plus shear deflection.

Plane stress plates 10 thick, E = 200000 MPa, nu = 0.3, clamped on the left edge, a
parabolic shear of P = 1000 N down on the right edge (the load of Timoshenko & Goodier's
end-loaded cantilever).
"""

from __future__ import annotations

import pytest

import fem
from classical.coefficients import cowper_rectangle
from fem.case import parse_case

E, NU, T, P = 200000.0, 0.3, 10.0, 1000.0
G = E / (2 * (1 + NU))


def _cantilever(length: float, depth: float, size: float, extra: str = "") -> str:
    return f"""
schema = 1
name = "defl"
kind = "beam"
[material]
E = {E}
nu = {NU}
thickness = {T}
[geometry]
shape = "rectangle"
length = {length}
depth = {depth}
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, {-P}]
distribution = "parabolic"
{extra}
[mesh]
size = {size}
levels = 1
"""


def _tip(length: float, depth: float, size: float) -> tuple[float, dict]:
    d = fem.check(parse_case(_cantilever(length, depth, size), "defl.toml")).data["deflection"]
    return -d["loads"][0]["fe"][1], d


def test_slender_cantilever_within_half_a_percent_of_timoshenko():
    """L = 1000, h = 100 (L/h = 10): the tip deflection P L³/(3EI) + P L/(kGA) with Cowper's
    k = 10(1 + ν)/(12 + 11ν) for a rectangle (Cowper 1966, J. Appl. Mech. 33:335-340)."""
    L, h = 1000.0, 100.0
    A, I = T * h, T * h**3 / 12  # noqa: E741
    ref = P * L**3 / (3 * E * I) + P * L / (cowper_rectangle(NU) * G * A)
    fe, d = _tip(L, h, 12.5)
    assert fe == pytest.approx(ref, rel=0.005)
    assert -d["hand"] == pytest.approx(ref, rel=1e-12)
    assert d["loads"][0]["ratio"] == pytest.approx(fe / ref, rel=1e-9)
    assert d["max_fe"] >= fe and d["at"][0] == pytest.approx(L)
    assert "Cowper" in d["method"] and "cantilever" in d["method"]


def test_deep_cantilever_inside_the_elasticity_bracket():
    """L = 200, h = 100 (L/h = 2). Timoshenko & Goodier, Theory of Elasticity, 3rd ed., §21:
    with the axis element horizontal at the built-in end the tip deflection is P L³/(3EI);
    with the vertical element of the end section kept vertical it is larger by
    P c² L/(2 I G) = 3 P L/(2 A G) (c = h/2). A fully clamped end lies between the two."""
    L, h = 200.0, 100.0
    A, I = T * h, T * h**3 / 12  # noqa: E741
    low = P * L**3 / (3 * E * I)
    high = low + 3 * P * L / (2 * A * G)
    fe, d = _tip(L, h, 6.25)
    assert low < fe < high, (low, fe, high)
    assert low < -d["hand"] < high   # Cowper's k = 0.85 lies between 2/3 and infinity


def test_no_hand_value_for_a_member_with_a_hole():
    text = _cantilever(400.0, 100.0, 20.0, "[[geometry.holes]]\ncenter = [200.0, 50.0]\n"
                                           "radius = 15.0\n")
    d = fem.check(parse_case(text, "defl.toml")).data["deflection"]
    assert d["hand"] is None and "not prismatic" in d["method"]
    assert d["max_fe"] > 0 and d["loads"][0]["fe"][1] < 0
