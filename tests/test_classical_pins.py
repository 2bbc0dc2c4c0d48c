"""Tests for classical.pins: single/double-shear short-member models."""

from __future__ import annotations

import itertools
import math

import pytest

from classical.pins import (
    double_shear_loads,
    gap_for_ratio,
    rectangular_stresses,
    round_stresses,
    shear_bending_ratio,
    single_shear_loads,
)


def test_double_shear_is_half_shear_quarter_moment() -> None:
    """Common practice: the double-shear model (simply supported span g, central F)
    carries V = F/2 and M = F g/4, half the shear and a quarter of the moment of the
    single-shear cantilever (V = F, M = F g)."""
    F, g = 12.0e3, 8.0
    s, d = single_shear_loads(F, g), double_shear_loads(F, g)
    assert (s.V, s.M) == (F, F * g)
    assert d.V == pytest.approx(s.V / 2, rel=1e-15)
    assert d.M == pytest.approx(s.M / 4, rel=1e-15)


def test_section_stresses() -> None:
    """Round d: sigma = 32 M/(pi d^3), tau_avg = 4V/(pi d^2), tau_max = (4/3) tau_avg;
    rectangle b x h: sigma = 6 M/(b h^2), tau_avg = V/(b h), tau_max = 1.5 tau_avg
    (Gere & Goodno, Mechanics of Materials, 7th ed., Secs. 5.5, 5.8, 5.9, from memory).  d = 10, V
    = 1000, M = 5000: sigma = 50.93 and tau_avg = 12.73 (hand arithmetic)."""
    r = round_stresses(1000.0, 5000.0, 10.0)
    assert r.sigma_b == pytest.approx(160.0 / math.pi, rel=1e-15)
    assert r.tau_avg == pytest.approx(40.0 / math.pi, rel=1e-15)
    assert r.tau_max == pytest.approx(4 / 3 * r.tau_avg, rel=1e-15)
    q = rectangular_stresses(1000.0, 5000.0, 4.0, 10.0)
    assert (q.sigma_b, q.tau_avg, q.tau_max) == pytest.approx((75.0, 25.0, 37.5), rel=1e-15)


def test_round_single_shear_ratio_closed_form() -> None:
    """Round, single shear: tau_avg/sigma_b = (F/A)/(32 F g/(pi d^3)) = d/(8 g), so the
    gap for a ratio r is g = d/(8 r); d = 16, r = 0.5 gives g = 4."""
    assert gap_for_ratio(0.5, 16.0) == pytest.approx(4.0, rel=1e-15)
    assert shear_bending_ratio(4.0, 16.0) == pytest.approx(0.5, rel=1e-15)


@pytest.mark.parametrize(("shape", "model"),
                         list(itertools.product(("round", "rectangle"), ("single", "double"))))
def test_gap_for_ratio_reproduces_ratio_from_stresses(shape: str, model: str) -> None:
    """At g = gap_for_ratio(r) the model's own stresses give tau_avg/sigma_b = r, for
    every shape and model (closed forms d/(8g), d/(4g), h/(6g), h/(3g))."""
    F, size, r = 5.0e3, 20.0, 0.3
    g = gap_for_ratio(r, size, shape, model)
    loads = (single_shear_loads if model == "single" else double_shear_loads)(F, g)
    st = (round_stresses(loads.V, loads.M, size) if shape == "round"
          else rectangular_stresses(loads.V, loads.M, 7.0, size))
    assert st.tau_avg / st.sigma_b == pytest.approx(r, rel=1e-14)


def test_bad_choices_raise() -> None:
    """Unknown model/shape and non-positive sizes are rejected with the allowed values."""
    with pytest.raises(ValueError, match="single, double"):
        gap_for_ratio(0.5, 10.0, model="triple")
    with pytest.raises(ValueError, match="round, rectangle"):
        shear_bending_ratio(1.0, 10.0, shape="hex")
    with pytest.raises(ValueError):
        single_shear_loads(1.0, 0.0)
