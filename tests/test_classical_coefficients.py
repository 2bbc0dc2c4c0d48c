"""Tests for classical.coefficients: Cowper shear coefficients and Kirsch/strip Kt."""

from __future__ import annotations

import math

import numpy as np
import pytest

from classical.coefficients import (
    cowper_circle,
    cowper_hollow_circle,
    cowper_i_section,
    cowper_rectangle,
    cowper_thin_box,
    cowper_thin_tube,
    kirsch_hole_edge,
    kirsch_hole_edge_extremes,
    kirsch_pure_shear,
    kirsch_tension,
    kt_gross_from_net,
    kt_hole_strip,
    kt_net_heywood,
    kt_net_howland,
    nominal_stress_gross,
    nominal_stress_net,
)


def test_cowper_values() -> None:
    """Cowper (1966): rectangle 10(1+nu)/(12+11nu) -> 13/15.3 = 0.8497 at nu = 0.3 and
    5/6 at nu = 0; solid circle 6(1+nu)/(7+6nu) -> 7.8/8.8 = 0.8864 and 6/7; thin tube
    2(1+nu)/(4+3nu) -> 2.6/4.9 = 0.5306 and 1/2."""
    assert cowper_rectangle(0.3) == pytest.approx(0.8497, abs=5e-5)
    assert cowper_rectangle(0.0) == pytest.approx(5 / 6, rel=1e-15)
    assert cowper_circle(0.3) == pytest.approx(0.8864, abs=5e-5)
    assert cowper_circle(0.0) == pytest.approx(6 / 7, rel=1e-15)
    assert cowper_thin_tube(0.3) == pytest.approx(0.5306, abs=5e-5)
    assert cowper_thin_tube(0.0) == pytest.approx(0.5, rel=1e-15)


def test_cowper_limits_are_consistent() -> None:
    """Hollow circle m = 0 is the solid circle and m -> 1 the thin tube; the I section
    with no flanges (m = 2 b t_f/(h t_w) = 0) is the rectangle (limits of Cowper's
    formulas)."""
    for nu in (0.0, 0.25, 0.3, 0.5):
        assert cowper_hollow_circle(nu, 0.0) == pytest.approx(cowper_circle(nu), rel=1e-15)
        assert cowper_hollow_circle(nu, 1 - 1e-9) == pytest.approx(cowper_thin_tube(nu),
                                                                   rel=1e-8)
        assert cowper_i_section(nu, 100.0, 300.0, 1e-12, 7.0) == pytest.approx(
            cowper_rectangle(nu), rel=1e-9)


def test_cowper_i_section_is_about_the_web_area() -> None:
    """Plausibility of the I formula: for a rolled-I proportion (h 300, b 150, t_f 10.7,
    t_w 7.1; m = 1.507, n = 0.5) k A lies within 5 % of the web area h t_w, the design
    rule that the web carries the shear (common practice)."""
    nu, b, h, tf, tw = 0.3, 150.0, 300.0, 10.7, 7.1
    k = cowper_i_section(nu, b, h, tf, tw)
    assert k * (2 * b * tf + h * tw) / (h * tw) == pytest.approx(1.0, abs=0.05)


def test_cowper_thin_box() -> None:
    """Thin square tube (m = n = 1): k = 20 (1 + nu)/(48 + 39 nu), 0.4355 at nu = 0.3
    (Cowper 1966, from memory); with no flanges the two webs act as a rectangle."""
    for nu in (0.0, 0.3):
        assert cowper_thin_box(nu, 100.0, 100.0, 2.0, 2.0) == pytest.approx(
            20 * (1 + nu) / (48 + 39 * nu), rel=1e-14)
        assert cowper_thin_box(nu, 100.0, 200.0, 1e-12, 3.0) == pytest.approx(
            cowper_rectangle(nu), rel=1e-9)
    assert cowper_thin_box(0.3, 1.0, 1.0, 1.0, 1.0) == pytest.approx(0.4355, abs=5e-5)


def test_kirsch_concentration_factors() -> None:
    """Infinite plate with a circular hole: Kt = 3 in uniaxial tension and 4 in pure
    shear (Kirsch 1898; Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 35,
    section number from memory); equibiaxial tension 2."""
    assert kirsch_tension() == 3.0
    assert kirsch_pure_shear() == 4.0
    assert kirsch_hole_edge_extremes(1.0, 1.0).max == pytest.approx(2.0)


def test_kirsch_hole_edge_distribution() -> None:
    """Uniaxial sigma along x: sigma_theta = sigma (1 - 2 cos 2 theta), i.e. -sigma at
    theta = 0 and 3 sigma at 90 deg (Timoshenko & Goodier, Theory of Elasticity, 3rd
    ed., section 35, from memory); the closed-form
    extremes agree with dense sampling for a general far field, and the peak lies 90
    deg from the far-field s1 direction."""
    assert kirsch_hole_edge(0.0, 1.0) == pytest.approx(-1.0)
    assert kirsch_hole_edge(math.pi / 2, 1.0) == pytest.approx(3.0)
    th = np.linspace(0, 2 * math.pi, 200001)
    sx, sy, txy = 40.0, -15.0, 25.0
    vals = kirsch_hole_edge(th, sx, sy, txy)
    ext = kirsch_hole_edge_extremes(sx, sy, txy)
    assert ext.max == pytest.approx(vals.max(), rel=1e-9)
    assert ext.min == pytest.approx(vals.min(), rel=1e-9)
    assert kirsch_hole_edge(ext.theta_max, sx, sy, txy) == pytest.approx(ext.max, rel=1e-14)
    s1 = 0.5 * (sx + sy) + math.hypot(0.5 * (sx - sy), txy)
    s2 = sx + sy - s1
    assert ext.max == pytest.approx(3 * s1 - s2, rel=1e-14)


def test_strip_with_hole_fits() -> None:
    """Both fits give Kt_net = 3 at d/W = 0 (Kirsch) and tend to 2 as d/W -> 1; they agree
    within 3 % over 0 <= d/W < 1 (Heywood 2 + (1 - r)^3 versus the Howland polynomial;
    at d/W = 0.5: 2.125 and 3 - 1.565 + 0.915 - 0.19125 = 2.15875)."""
    assert kt_net_heywood(0.0) == 3.0 and kt_net_howland(0.0) == 3.0
    assert kt_net_heywood(1 - 1e-12) == pytest.approx(2.0)
    assert kt_net_howland(1 - 1e-12) == pytest.approx(2.0)
    assert kt_net_heywood(0.5) == pytest.approx(2.125, rel=1e-15)
    assert kt_net_howland(0.5) == pytest.approx(2.15875, rel=1e-14)
    for r in np.linspace(0, 0.99, 100):
        assert kt_net_heywood(r) == pytest.approx(kt_net_howland(r), rel=0.03)


def test_gross_and_net_give_the_same_peak() -> None:
    """sigma_max = Kt_net sigma_net = Kt_gross sigma_gross with sigma_net = P/((W-d)t) and
    sigma_gross = P/(W t) (definitions of the nominal stresses)."""
    P, W, d, t = 1.0e4, 50.0, 15.0, 4.0
    r = d / W
    peak_net = kt_hole_strip(r, "howland", "net") * nominal_stress_net(P, W, d, t)
    peak_gross = kt_hole_strip(r, "howland", "gross") * nominal_stress_gross(P, W, t)
    assert peak_net == pytest.approx(peak_gross, rel=1e-14)
    assert kt_gross_from_net(2.0, 0.5) == 4.0
    with pytest.raises(ValueError, match="howland, heywood"):
        kt_hole_strip(0.2, "peterson")
    with pytest.raises(ValueError):
        kt_net_howland(1.0)
