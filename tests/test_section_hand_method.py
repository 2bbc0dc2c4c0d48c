"""The hand method for the section in hand (fem.section.hand_method)."""

from __future__ import annotations

import math

import pytest

from classical.thinwall import tube_thinwall_peak
from fem.section.hand_method import choose_method, thin_wall_peak, thin_wall_ratio

I_PARAMS = dict(depth=300.0, flange_width=150.0, flange_thickness=10.7, web_thickness=7.1)


def test_thin_walls_get_the_shear_flow_solid_sections_the_shear_formula():
    """The rule (THIN_WALL_RATIO = 0.1, common practice): wall over the smaller outside
    dimension at most 0.1 -> thin-wall; above it, or without walls -> shear-formula.
    I 300 x 150 x 10.7 x 7.1: 10.7/150 = 0.071 thin; tee 100 x 80 x 10 x 8: 10/80 = 0.125
    not; a tube d 100 wall 2 thin and closed; rectangle, circle and polygon solid."""
    assert thin_wall_ratio("i", I_PARAMS) == pytest.approx(10.7 / 150.0)
    assert choose_method("i", I_PARAMS).method == "thin-wall"
    tee = dict(depth=100.0, flange_width=80.0, flange_thickness=10.0, web_thickness=8.0)
    c = choose_method("tee", tee)
    assert c.method == "shear-formula" and "too thick" in c.reason
    tube = choose_method("tube", dict(diameter=100.0, wall=2.0))
    assert tube.method == "thin-wall" and "closed-cell" in tube.reason
    # at the threshold: an angle 100 x 100 x 10 is thin, x 10.5 is not
    assert choose_method("angle", dict(leg_x=100.0, leg_y=100.0, thickness=10.0)).method \
        == "thin-wall"
    assert choose_method("angle", dict(leg_x=100.0, leg_y=100.0, thickness=10.5)).method \
        == "shear-formula"
    for shape, p in [("rectangle", dict(width=100.0, depth=2.0)), ("circle", dict(diameter=5.0)),
                     ("polygon", dict(points=[[0, 0], [1, 0], [0, 1]]))]:
        assert choose_method(shape, p).method == "shear-formula"


def test_forced_methods_are_kept():
    """check.method forces a method; thin-wall needs a centre-line model."""
    assert choose_method("i", I_PARAMS, "shear-formula").method == "shear-formula"
    assert choose_method("i", I_PARAMS, "average").method == "average"
    assert choose_method("tee", dict(depth=100.0, flange_width=80.0, flange_thickness=10.0,
                                     web_thickness=8.0), "thin-wall").method == "thin-wall"
    with pytest.raises(ValueError, match="centre line"):
        choose_method("rectangle", dict(width=1.0, depth=1.0), "thin-wall")


def test_thin_wall_peaks_in_the_shape_frames():
    """Thin-wall peaks on the outside dimensions of the case contract: the I's web flow at
    the neutral axis V (b t_f h/2 + t_w h^2/8)/(I t_w), h = depth - t_f, I = t_w h^3/12 +
    b t_f h^2/2 (thin-wall I, Megson, Aircraft Structures for Engineering Students, 4th ed., Ch.
    16); the tube's 2V/A on the neutral axis (Megson
    Ch. 17, from memory); both at the points where theory puts them (the I's web centre
    line x = 0; the tube's neutral axis y = 0)."""
    V = 1.0e5
    h, b, tf, tw = 300.0 - 10.7, 150.0, 10.7, 7.1
    inertia = tw * h**3 / 12 + b * tf * h**2 / 2
    pk = thin_wall_peak("i", I_PARAMS, 0.0, V)
    assert pk.tau == pytest.approx(V * (b * tf * h / 2 + tw * h**2 / 8) / (inertia * tw),
                                   rel=1e-12)
    assert pk.at == pytest.approx((0.0, 0.0), abs=1e-9)
    tube = thin_wall_peak("tube", dict(diameter=100.0, wall=2.0), 0.0, V)
    assert tube.tau == pytest.approx(tube_thinwall_peak(100.0, 2.0, V), rel=1e-4)
    assert abs(tube.at[1]) < 1.0 and math.hypot(*tube.at) == pytest.approx(49.0, rel=1e-3)
    ch = thin_wall_peak("channel", dict(depth=200.0, flange_width=75.0, flange_thickness=4.0,
                                        web_thickness=4.0), 0.0, 2.0e4)
    assert ch.tau == pytest.approx(29.45, rel=1e-3)  # cases/thin-channel-section.toml header
    assert ch.at == pytest.approx((2.0, 0.0), abs=1e-9)
