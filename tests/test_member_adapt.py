"""Adaptive refinement: the recovery-based error estimate and the sizes it asks for."""

from __future__ import annotations

import numpy as np
import pytest
from skfem import MeshTri1

from fem.case import parse_case
from fem.member.adapt import (
    adaptive_levels,
    compliance,
    error_indicator,
    smoothed_by_zone,
    target_sizes,
)
from fem.member.mesh import mesh_member
from fem.member.recovery import PointLocator, recover
from fem.member.solve import solve_member

BAR = """
schema = 1
name = "bar"
kind = "beam"
[material]
E = 1000.0
nu = {nu}
thickness = 2.0
[geometry]
shape = "rectangle"
length = 100.0
depth = 10.0
{zones}
[[supports]]
edge = "left"
fix = "x"
[[supports]]
at = [0.0, 0.0]
fix = "y"
[[loads]]
edge = "right"
force = [200.0, 0.0]
[mesh]
size = 5.0
"""

ZONE = """[[geometry.zones]]
corner = [50.0, 0.0]
size = [50.0, 10.0]
thickness = 4.0"""


def _estimate(text: str):
    case = parse_case(text, "bar.toml")
    mm = mesh_member(case)
    field = recover(solve_member(case, mm), mm)
    C_inv = compliance(case.material.E, case.material.nu, case.material.model)
    return field, mm, error_indicator(field, mm.thickness, C_inv)


def test_zero_for_uniform_stress():
    """A bar under end traction has sigma_xx = F/(h t) = 10 everywhere (common practice);
    the smoothing reproduces a uniform field exactly, so the estimate vanishes."""
    field, _, eta = _estimate(BAR.format(nu=0.3, zones=""))
    assert np.allclose(field.sxx, 10.0, rtol=1e-9)
    assert eta.max() < 1e-9 * 10.0 * np.sqrt(100.0 * 10.0 * 2.0 / 1000.0)


def test_zero_across_a_thickness_step():
    """With nu = 0 a bar of two thicknesses carries sigma = F/(h t) in each part exactly
    (10 and 5; t sigma is continuous, the strains need no lateral fit; common practice).
    Smoothing within each zone keeps the jump, so the estimate is zero; averaging across
    the step (fem.member.recovery's nodal field) would not be."""
    field, mm, eta = _estimate(BAR.format(nu=0.0, zones=ZONE))
    smooth = smoothed_by_zone(field, mm.thickness)
    assert np.allclose(smooth["sxx"], field.sxx, atol=1e-9)
    assert set(np.round(np.unique(field.sxx), 6)) == {5.0, 10.0}
    assert eta.max() < 1e-9
    nodal = field.nodal["sxx"][field.t.T]
    assert np.abs(nodal - field.sxx).max() > 1.0      # the plain average smears the step


def test_positive_where_the_field_is_not_reproduced():
    """A cantilever in bending has a stress field the averaging cannot reproduce exactly."""
    text = BAR.format(nu=0.3, zones="").replace('force = [200.0, 0.0]', 'force = [0.0, 20.0]')
    text = text.replace('edge = "left"\nfix = "x"', 'edge = "left"\nfix = "xy"')
    _, _, eta = _estimate(text)
    assert eta.max() > 0.0


def test_sizes_equidistribute():
    """Equal estimates: every element gets the same size and the count is the target;
    a larger estimate on the left half gives smaller sizes there."""
    mesh = MeshTri1.init_symmetric().refined(3).scaled((2.0, 1.0))
    p, t = mesh.p, mesh.t
    n = t.shape[1]
    h0 = target_sizes(p, t, np.ones(n), n, order=2)
    assert np.allclose(h0, h0[0])
    h2 = target_sizes(p, t, np.ones(n), 2 * n, order=2)
    assert np.allclose(h2, h0 / np.sqrt(2.0))
    left = p[0, t].mean(axis=0) < 1.0
    h = target_sizes(p, t, np.where(left, 8.0, 1.0), n, order=2)
    assert h[p[0] < 0.5].max() < h[p[0] > 1.5].min()


HOLE = """
schema = 1
name = "hole"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = 200.0
depth = 100.0
[[geometry.holes]]
center = [100.0, 50.0]
radius = 10.0
[[supports]]
at = [0.0, 50.0]
fix = "xy"
[[supports]]
at = [200.0, 50.0]
fix = "y"
[[loads]]
edge = "left"
force = [-50000.0, 0.0]
[[loads]]
edge = "right"
force = [50000.0, 0.0]
[mesh]
size = 20.0
"""


def _areas(field) -> np.ndarray:
    a, b, c = (field.p[:, field.t[i]] for i in range(3))
    return 0.5 * np.abs((b[0] - a[0]) * (c[1] - a[1]) - (c[0] - a[0]) * (b[1] - a[1]))


@pytest.fixture(scope="module")
def hole_levels():
    return adaptive_levels(parse_case(HOLE, "hole.toml"), levels=2, growth=2.0)


def test_refinement_goes_where_the_estimate_is(hole_levels):
    """Where the estimate was largest the next mesh is much finer; where it was smallest
    the size barely changes; the element count grows by about the asked factor."""
    a, b = hole_levels
    centre = a.field.p[:, a.field.t].mean(axis=1)
    e, _ = PointLocator(b.field.p, b.field.t).locate(centre[0], centre[1])
    shrink = np.sqrt(_areas(b.field)[e] / _areas(a.field))
    order = np.argsort(a.eta)
    top, bottom = order[-len(order) // 10:], order[: len(order) // 2]
    assert np.median(shrink[top]) < 0.75 * np.median(shrink[bottom])
    assert 1.3 < b.field.t.shape[1] / a.field.t.shape[1] < 3.5
    assert b.h < a.h
