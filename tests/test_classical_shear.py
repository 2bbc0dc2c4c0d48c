"""Tests for classical.shear: shear formula over outlines, direct and bearing stress."""

from __future__ import annotations

import math

import numpy as np
import pytest

from classical.sections import circle, i, i_properties, polygon, rectangle, tube
from classical.shear import (
    average_shear,
    direct_shear,
    max_shear_formula,
    pin_bearing,
    shear_formula,
    shear_profile,
)


def test_shear_formula_value_and_errors() -> None:
    """tau = V Q/(I b): V = 12 kN, Q = 2.0e5 mm^3, I = 8.0e7 mm^4, b = 10 mm gives
    12e3 * 2e5 / (8e7 * 10) = 3.0 MPa (hand arithmetic)."""
    assert shear_formula(12e3, 2.0e5, 8.0e7, 10.0) == pytest.approx(3.0, rel=1e-15)
    with pytest.raises(ValueError):
        shear_formula(1.0, 1.0, 1.0, 0.0)


def test_rectangle_profile_and_maximum() -> None:
    """Rectangle b x h: tau(y) = (3V/(2A))(1 - 4 y^2/h^2), maximum 1.5 V/A at the
    neutral axis, zero at top and bottom (Gere & Goodno, Mechanics of Materials, 7th
    ed., Sec. 5.8, from memory)."""
    b, h, V = 20.0, 60.0, 9000.0
    r = rectangle(b, h)
    ys = np.array([-30.0, -21.0, -7.5, 0.0, 4.0, 29.0, 30.0])
    expected = 1.5 * V / (b * h) * (1 - 4 * ys**2 / h**2)
    assert shear_profile(r, V, ys) == pytest.approx(expected, rel=1e-12, abs=1e-12 * V / (b * h))
    m = max_shear_formula(r, V)
    assert m.tau_max == pytest.approx(1.5 * V / (b * h), rel=1e-12)
    assert m.y_at == pytest.approx(0.0, abs=1e-12 * h)
    assert m.b == pytest.approx(b) and m.Q == pytest.approx(b * h**2 / 8)


def test_outside_and_top_edge_are_zero() -> None:
    """Where the cut misses the section (b = 0) the profile is zero."""
    r = rectangle(2.0, 4.0)
    assert shear_profile(r, 1.0, [2.0, 2.5, -3.0]).tolist() == [0.0, 0.0, 0.0]


@pytest.mark.parametrize("n", [128, 512, 2048])
def test_circle_maximum_converges_to_four_thirds(n: int) -> None:
    """Solid circle: tau_max = (4/3) V/A at the neutral axis (Gere & Goodno, Mechanics
    of Materials, 7th ed., Sec. 5.9, from memory).  The n-gon converges to it at second order like
    its area; the bound 6/n^2 on the relative error is set just above the observed 4.93/n^2."""
    d, V = 2.0, 1.0
    m = max_shear_formula(circle(d, segments=n), V)
    exact = 4 / 3 * V / (math.pi * d**2 / 4)
    assert abs(m.tau_max / exact - 1) < 6 / n**2
    assert abs(m.y_at) < 0.02 * d


def test_triangle_maximum_at_mid_height() -> None:
    """Triangle of base b, height h: tau(s) = 12 V s (h - s)/(b h^3) at depth s from the
    apex, maximum 3 V/(b h) = 1.5 V/A at mid-height (not at the centroid, where it is
    (4/3) V/A).  Derived from Q = b s^2 (h - s)/(3 h), I = b h^3/36, chord b s/h; result
    as in Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 5.8 problems (from memory)."""
    b, h, V = 2.0, 3.0, 1.0
    tri = polygon([(0, 0), (b, 0), (b / 2, h)])
    m = max_shear_formula(tri, V)
    assert m.tau_max == pytest.approx(3 * V / (b * h), rel=1e-9)
    assert m.y_at == pytest.approx(h / 2, abs=1e-6 * h)
    at_centroid = shear_profile(tri, V, [h / 3])[0]
    assert at_centroid == pytest.approx(4 / 3 * V / (b * h / 2), rel=1e-12)


def test_i_section_web() -> None:
    """Sharp I: at the neutral axis Q = b t_f (h - t_f)/2 + t_w (h/2 - t_f)^2/2 and
    tau = V Q/(I t_w), the maximum; just below the flange tau = V b t_f (h - t_f)/(2 I t_w)
    (Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 5.10, from memory)."""
    h, b, tf, tw, V = 300.0, 150.0, 10.7, 7.1, 1.0e5
    s = i(h, b, tf, tw)
    ixx = i_properties(h, b, tf, tw).Ixx
    q0 = b * tf * (h - tf) / 2 + tw * (h / 2 - tf) ** 2 / 2
    m = max_shear_formula(s, V)
    assert m.tau_max == pytest.approx(V * q0 / (ixx * tw), rel=1e-12)
    assert m.y_at == pytest.approx(0.0, abs=1e-9)
    below = shear_profile(s, V, [h / 2 - tf - 1e-9])[0]
    assert below == pytest.approx(V * b * tf * (h - tf) / (2 * ixx * tw), rel=1e-8)


def test_tube_neutral_axis() -> None:
    """Circular tube (radii R, r): at the neutral axis Q = (2/3)(R^3 - r^3), b = 2 (R - r),
    I = pi (R^4 - r^4)/4 (difference of two circles); the 2048-gon agrees to 1e-5."""
    R, r, V = 30.0, 26.0, 1.0
    tau = shear_profile(tube(2 * R, R - r, segments=2048), V, [0.0])[0]
    exact = V * (2 / 3) * (R**3 - r**3) / (math.pi * (R**4 - r**4) / 4 * 2 * (R - r))
    assert tau == pytest.approx(exact, rel=1e-5)


def test_direct_average_and_bearing() -> None:
    """tau = F/A single shear, F/(2A) double shear; average V/A; bearing F/(d t)
    (Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 1.6, from memory)."""
    assert average_shear(10.0, 4.0) == 2.5
    assert direct_shear(10.0, 4.0) == 2.5
    assert direct_shear(10.0, 4.0, planes=2) == 1.25
    assert pin_bearing(10.0, 2.0, 0.5) == 10.0
    with pytest.raises(ValueError):
        direct_shear(1.0, 1.0, planes=0)
    with pytest.raises(ValueError):
        pin_bearing(1.0, 0.0, 1.0)
