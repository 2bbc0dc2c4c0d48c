"""Stacked-strip sections against closed forms (common practice, any strength-of-materials
text, e.g. Gere & Goodno, Mechanics of Materials, 7th ed., ch. 5 and 12)."""

from __future__ import annotations

import numpy as np
import pytest

from classical.strips import StripSection


def test_rectangle():
    """b x h = 10 x 100: A = 1000, I = b h^3/12, Q(centroid) = b h^2/8, b(y) = 10."""
    s = StripSection(((0.0, 100.0, 10.0),))
    assert s.area == 1000.0 and s.centroid == 50.0
    assert s.inertia == pytest.approx(10 * 100**3 / 12, rel=1e-14)
    assert s.first_moment(50.0) == pytest.approx(10 * 100**2 / 8, rel=1e-14)
    assert s.first_moment(0.0) == pytest.approx(0.0, abs=1e-9)
    assert s.first_moment(100.0) == pytest.approx(0.0, abs=1e-9)
    assert np.all(s.width(np.array([0.0, 50.0, 100.0])) == 10.0)


def test_i_shape_from_strips():
    """I-shape: flanges 100 x 10, web 8 x 180 (total depth 200):
    I = (100 x 200^3 - 92 x 180^3)/12; Q at the flange-web junction = 100 x 10 x 95;
    at the centroid Q = 100 x 10 x 95 + 8 x 90 x 45."""
    s = StripSection(((0, 10, 100.0), (10, 190, 8.0), (190, 200, 100.0)))
    assert s.centroid == pytest.approx(100.0)
    assert s.inertia == pytest.approx((100 * 200**3 - 92 * 180**3) / 12, rel=1e-13)
    assert s.first_moment(190.0) == pytest.approx(100 * 10 * 95, rel=1e-13)
    assert s.first_moment(100.0) == pytest.approx(100 * 10 * 95 + 8 * 90 * 45, rel=1e-13)
    assert s.width(190.0) == 8.0  # the smaller width at a thickness change


def test_two_strips_either_side_of_a_hole():
    """Net section 0..40 and 60..100 (t = 5): Q just below the hole edge at y = 40 equals
    the top strip's 5 x 40 x 30 (its centroid 80 is 30 above the centroid 50)."""
    s = StripSection(((0, 40, 5.0), (60, 100, 5.0)))
    assert s.first_moment(50.0) == pytest.approx(5 * 40 * 30, rel=1e-13)
    assert s.width(50.0) == 0.0
