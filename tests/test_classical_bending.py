"""Tests for classical.bending: flexure formula and plane-stress transformation."""

from __future__ import annotations

import math

import numpy as np
import pytest

from classical.bending import (
    bending_stress,
    bending_stress_at,
    max_shear_plane,
    principal_stresses,
    shear_yield,
    von_mises_plane,
    von_mises_plane_strain,
)


def _transform(sx: float, sy: float, txy: float, th: float) -> tuple[float, float]:
    """sigma_x' and tau_x'y' on a plane whose normal is at th from x (Gere & Goodno,
    Mechanics of Materials, 7th ed., Sec. 7.2 transformation equations, from memory)."""
    c, s = math.cos(2 * th), math.sin(2 * th)
    return ((sx + sy) / 2 + (sx - sy) / 2 * c + txy * s, -(sx - sy) / 2 * s + txy * c)


def test_flexure_formula_rectangle() -> None:
    """Rectangle b x h: sigma_max = M c/I = 6 M/(b h^2); M = 2.4e6 N mm, b = 40, h = 60
    gives 6 * 2.4e6 / (40 * 3600) = 100 MPa (Gere & Goodno, Mechanics of Materials, 7th ed.,
    Sec. 5.5, from memory)."""
    b, h, M = 40.0, 60.0, 2.4e6
    assert bending_stress(M, h / 2, b * h**3 / 12) == pytest.approx(100.0, rel=1e-14)


def test_signed_flexure_convention() -> None:
    """sigma = -M y/I: sagging M > 0 compresses the top (y > 0), stretches the bottom."""
    assert bending_stress_at(5.0, 2.0, 4.0) == -2.5
    assert bending_stress_at(5.0, -2.0, 4.0) == 2.5
    out = bending_stress_at(5.0, np.array([-2.0, 0.0, 2.0]), 4.0)
    assert out.tolist() == [2.5, 0.0, -2.5]


def test_von_mises_special_states() -> None:
    """Uniaxial: sigma; pure shear: sqrt(3) tau; equibiaxial: sigma (definition)."""
    assert von_mises_plane(120.0, 0.0, 0.0) == pytest.approx(120.0)
    assert von_mises_plane(0.0, 0.0, 50.0) == pytest.approx(50.0 * math.sqrt(3))
    assert von_mises_plane(80.0, 80.0, 0.0) == pytest.approx(80.0)


def test_principal_stresses_worked_values() -> None:
    """sx = 50, sy = -10, txy = 40: centre 20, radius sqrt(30^2 + 40^2) = 50, so
    s1 = 70, s2 = -30 at atan2(80, 60)/2 = 26.565 deg (Mohr's circle, hand arithmetic);
    the transformation equations give s1 and zero shear on that plane."""
    p = principal_stresses(50.0, -10.0, 40.0)
    assert (p.s1, p.s2) == pytest.approx((70.0, -30.0), rel=1e-14)
    assert p.angle == pytest.approx(0.5 * math.atan2(80.0, 60.0), rel=1e-14)
    sn, tau = _transform(50.0, -10.0, 40.0, p.angle)
    assert sn == pytest.approx(70.0, rel=1e-14) and tau == pytest.approx(0.0, abs=1e-12)


def test_max_shear_plane() -> None:
    """Same state: tau_max = R = 50 with sigma_avg = 20 at theta_p - 45 deg, where the
    transformation gives +50; absolute maximum with s3 = 0 is max(50, 70/2) = 50.  For
    s1 = 100, s2 = 50 the out-of-plane maximum s1/2 = 50 exceeds R = 25."""
    m = max_shear_plane(50.0, -10.0, 40.0)
    assert (m.tau_max, m.sigma_avg, m.tau_abs) == pytest.approx((50.0, 20.0, 50.0))
    sn, tau = _transform(50.0, -10.0, 40.0, m.angle)
    assert tau == pytest.approx(50.0, rel=1e-14) and sn == pytest.approx(20.0, rel=1e-14)
    m2 = max_shear_plane(100.0, 50.0, 0.0)
    assert (m2.tau_max, m2.tau_abs) == pytest.approx((25.0, 50.0))


def test_arrays_broadcast_and_invariants() -> None:
    """Arrays: s1 + s2 = sx + sy and s1 s2 = sx sy - txy^2 (stress invariants)."""
    rng = np.random.default_rng(1)
    sx, sy, txy = rng.normal(size=(3, 50)) * 100
    p = principal_stresses(sx, sy, txy)
    assert np.allclose(p.s1 + p.s2, sx + sy, rtol=1e-12, atol=1e-10)
    assert np.allclose(p.s1 * p.s2, sx * sy - txy**2, rtol=1e-10, atol=1e-8)
    assert np.all(p.s1 >= p.s2)
    assert np.all((p.angle > -math.pi / 2) & (p.angle <= math.pi / 2))
    vm = von_mises_plane(sx, sy, txy)
    assert np.allclose(vm, np.sqrt(p.s1**2 - p.s1 * p.s2 + p.s2**2), rtol=1e-12)


def test_von_mises_plane_strain_hand_value() -> None:
    """Plane strain, sx = 150, sy = txy = 0, nu = 0.25: sz = nu (sx + sy) = 37.5 and
    sigma_vm = sqrt(((150 - 0)^2 + (0 - 37.5)^2 + (37.5 - 150)^2)/2) = sqrt(18281.25)
    = 135.208 (hand arithmetic; J2 form with plane-strain sz, common practice), where the
    plane-stress form gives 150."""
    assert von_mises_plane_strain(150.0, 0.0, 0.0, 0.25) == pytest.approx(
        math.sqrt(18281.25), rel=1e-14)
    assert von_mises_plane_strain(150.0, 0.0, 0.0, 0.25) == pytest.approx(135.208, abs=1e-3)
    assert von_mises_plane(150.0, 0.0, 0.0) == pytest.approx(150.0)


def test_von_mises_plane_strain_shear_and_limits() -> None:
    """Pure shear has sz = 0, so sqrt(3) tau as in plane stress; nu = 0 is plane stress;
    equibiaxial sx = sy = s gives sz = 2 nu s and sigma_vm = |1 - 2 nu| s (definition)."""
    assert von_mises_plane_strain(0.0, 0.0, 50.0, 0.3) == pytest.approx(50.0 * math.sqrt(3))
    rng = np.random.default_rng(2)
    sx, sy, txy = rng.normal(size=(3, 20)) * 100
    assert np.allclose(von_mises_plane_strain(sx, sy, txy, 0.0), von_mises_plane(sx, sy, txy),
                       rtol=1e-12)
    assert von_mises_plane_strain(80.0, 80.0, 0.0, 0.3) == pytest.approx(0.4 * 80.0)
    with pytest.raises(ValueError):
        von_mises_plane_strain(1.0, 0.0, 0.0, 0.5)


def test_shear_yield_is_fy_over_root_3() -> None:
    """Von Mises in pure shear: sqrt(3) tau_y = fy, so fy = 250 gives tau_y = 144.338
    (common practice); its von Mises stress is fy."""
    assert shear_yield(250.0) == pytest.approx(144.3376, rel=1e-6)
    assert von_mises_plane(0.0, 0.0, shear_yield(250.0)) == pytest.approx(250.0, rel=1e-14)
    with pytest.raises(ValueError):
        shear_yield(0.0)
