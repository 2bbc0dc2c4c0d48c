"""Tests for classical.statics against the published standard-case formulas.

Published deflection curves are those of Gere & Goodno, Mechanics of Materials, 7th ed.,
Appendix H, Tables H-1 (cantilevers) and H-2 (simple beams), and Young & Budynas,
Roark's Formulas for Stress and Strain, 7th ed., Table 8.1 (propped and fixed beams); all from
memory, written with downward deflection positive.  Shear deflections follow from the unit-load
integral
int V v / (k G A) dx (Timoshenko beam), evaluated by hand for each case.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from classical.statics import (
    cantilever_end_moment,
    cantilever_tip_load,
    cantilever_uniform_load,
    fixed_fixed_point_load,
    fixed_fixed_uniform_load,
    propped_cantilever_point_load,
    propped_cantilever_uniform_load,
    shear_rigidity,
    simply_supported_patch_load,
    simply_supported_point_load,
    simply_supported_uniform_load,
    timoshenko_phi,
)

L, EI, KGA = 2.5, 3.2e6, 4.0e6  # m, N m^2, N
P, W = 1.5e4, 6.0e3  # N, N/m
X = np.linspace(0.0, L, 41)


def test_cantilever_tip_load() -> None:
    """w(x) = P x^2 (3L - x)/(6 EI) (Gere Table H-1); tip P L^3/(3EI) + P L/(k G A);
    V = P, M(0) = -P L."""
    s = cantilever_tip_load(P, L, EI)
    assert s.deflection(X) == pytest.approx(P * X**2 * (3 * L - X) / (6 * EI), rel=1e-12)
    t = cantilever_tip_load(P, L, EI, KGA)
    assert float(t.deflection(L)) == pytest.approx(P * L**3 / (3 * EI) + P * L / KGA, rel=1e-13)
    assert (t.R_a, t.M_a) == (P, -P * L)
    assert t.shear(X[:-1]) == pytest.approx(np.full(40, P))


def test_cantilever_uniform_load() -> None:
    """w(x) = w x^2 (6L^2 - 4 L x + x^2)/(24 EI) (Gere Table H-1), tip w L^4/(8EI);
    shear part w (L x - x^2/2)/(k G A), tip w L^2/(2 k G A)."""
    s = cantilever_uniform_load(W, L, EI, KGA)
    wb = W * X**2 * (6 * L**2 - 4 * L * X + X**2) / (24 * EI)
    assert s.deflection_bending(X) == pytest.approx(wb, rel=1e-12)
    assert s.deflection_shear(X) == pytest.approx(W * (L * X - X**2 / 2) / KGA, rel=1e-12)
    assert float(s.deflection(L)) == pytest.approx(W * L**4 / (8 * EI) + W * L**2 / (2 * KGA))
    assert s.M_a == -W * L**2 / 2


def test_cantilever_end_moment() -> None:
    """Sagging end couple M0: w(x) = -M0 x^2/(2 EI) (Gere Table H-1, upward), M = M0,
    V = 0, no shear deflection."""
    m0 = 2.0e4
    s = cantilever_end_moment(m0, L, EI, KGA)
    assert s.deflection(X) == pytest.approx(-m0 * X**2 / (2 * EI), rel=1e-12, abs=0)
    assert s.moment(X) == pytest.approx(np.full(41, m0))
    assert float(np.max(np.abs(s.shear(X)))) == 0.0


def test_simply_supported_point_load() -> None:
    """Load at a > b = L - a: w = P b x (L^2 - b^2 - x^2)/(6 L EI) for x <= a; maximum
    P b (L^2 - b^2)^(3/2)/(9 sqrt(3) L EI) at x = sqrt((L^2 - b^2)/3) (Gere Table H-2);
    under the load the shear part is P a b/(L k G A)."""
    a = 1.6
    b = L - a
    s = simply_supported_point_load(P, a, L, EI, KGA)
    x = X[X <= a]
    assert s.deflection_bending(x) == pytest.approx(
        P * b * x * (L**2 - b**2 - x**2) / (6 * L * EI), rel=1e-12, abs=1e-18)
    x1 = math.sqrt((L**2 - b**2) / 3)
    peak = P * b * (L**2 - b**2) ** 1.5 / (9 * math.sqrt(3) * L * EI)
    assert float(s.deflection_bending(x1)) == pytest.approx(peak, rel=1e-12)
    assert float(s.deflection_shear(a)) == pytest.approx(P * a * b / (L * KGA), rel=1e-12)
    assert (s.R_a, s.R_b) == pytest.approx((P * b / L, P * a / L))
    assert float(s.deflection(L)) == pytest.approx(0.0, abs=1e-15)


def test_simply_supported_uniform_load() -> None:
    """w(x) = w x (L^3 - 2 L x^2 + x^3)/(24 EI), centre 5 w L^4/(384 EI) (Gere Table
    H-2); shear part w x (L - x)/(2 k G A), centre w L^2/(8 k G A)."""
    s = simply_supported_uniform_load(W, L, EI, KGA)
    wb = W * X * (L**3 - 2 * L * X**2 + X**3) / (24 * EI)
    assert s.deflection_bending(X) == pytest.approx(wb, rel=1e-12, abs=1e-18)
    assert s.deflection_shear(X) == pytest.approx(W * X * (L - X) / (2 * KGA), abs=1e-18)
    assert float(s.deflection(L / 2)) == pytest.approx(
        5 * W * L**4 / (384 * EI) + W * L**2 / (8 * KGA), rel=1e-13)


def test_simply_supported_patch_load() -> None:
    """Load over 0 <= x <= a: w(x) = q x (a^4 - 4 a^3 L + 4 a^2 L^2 + 2 a^2 x^2
    - 4 a L x^2 + L x^3)/(24 L EI) for x <= a (Gere Table H-2); R_a = q a (L - a/2)/L.
    Superposition: loads on [0, c] and [c, L] add up to the full uniform load."""
    a = 1.1
    s = simply_supported_patch_load(W, 0.0, a, L, EI)
    x = X[X <= a]
    curve = W * x * (a**4 - 4 * a**3 * L + 4 * a**2 * L**2 + 2 * a**2 * x**2
                     - 4 * a * L * x**2 + L * x**3) / (24 * L * EI)
    assert s.deflection(x) == pytest.approx(curve, rel=1e-12, abs=1e-18)
    assert s.R_a == pytest.approx(W * a * (L - a / 2) / L, rel=1e-14)
    right = simply_supported_patch_load(W, a, L, L, EI, KGA)
    left = simply_supported_patch_load(W, 0.0, a, L, EI, KGA)
    full = simply_supported_uniform_load(W, L, EI, KGA)
    for f in ("shear", "moment", "deflection"):
        total = getattr(left, f)(X) + getattr(right, f)(X)
        assert total == pytest.approx(getattr(full, f)(X), rel=1e-12, abs=1e-9)


def test_propped_cantilever_uniform_load() -> None:
    """Clamped at A, propped at B: R_a = 5wL/8, R_b = 3wL/8, M_a = -wL^2/8,
    w(x) = w x^2 (3 L^2 - 5 L x + 2 x^2)/(48 EI); maximum about w L^4/(185 EI) at
    0.4215 L from B (Roark Table 8.1; 185 is rounded, exact 1/0.0054161)."""
    s = propped_cantilever_uniform_load(W, L, EI)
    assert (s.R_a, s.R_b, s.M_a) == pytest.approx((5 * W * L / 8, 3 * W * L / 8, -W * L**2 / 8))
    curve = W * X**2 * (3 * L**2 - 5 * L * X + 2 * X**2) / (48 * EI)
    assert s.deflection(X) == pytest.approx(curve, rel=1e-12, abs=1e-18)
    x = np.linspace(0, L, 20001)
    k = int(np.argmax(s.deflection(x)))
    assert 1 - x[k] / L == pytest.approx(0.4215, abs=1e-4)
    assert float(s.deflection(x[k])) == pytest.approx(W * L**4 / (185 * EI), rel=3e-3)


def test_propped_cantilever_central_load() -> None:
    """Central P: R_b = 5P/16, M_a = -3PL/16, w(L/2) = 7 P L^3/(768 EI); maximum
    P L^3/(48 sqrt(5) EI) at L/sqrt(5) from the prop (Roark Table 8.1; Gere & Goodno)."""
    s = propped_cantilever_point_load(P, L / 2, L, EI)
    assert (s.R_b, s.M_a) == pytest.approx((5 * P / 16, -3 * P * L / 16), rel=1e-14)
    assert float(s.deflection(L / 2)) == pytest.approx(7 * P * L**3 / (768 * EI), rel=1e-13)
    xm = L - L / math.sqrt(5)
    assert float(s.deflection(xm)) == pytest.approx(P * L**3 / (48 * math.sqrt(5) * EI))
    assert float(s.rotation(xm)) == pytest.approx(0.0, abs=1e-12 * P * L**2 / EI)


def test_fixed_fixed_uniform_load() -> None:
    """R = wL/2, end moments -wL^2/12, mid-span +wL^2/24, w(x) = w x^2 (L - x)^2/(24 EI),
    centre w L^4/(384 EI) (Roark Table 8.1); with shear deformation the reactions are
    unchanged by symmetry and the centre gains w L^2/(8 k G A)."""
    s = fixed_fixed_uniform_load(W, L, EI, KGA)
    assert (s.M_a, s.M_b) == pytest.approx((-W * L**2 / 12, -W * L**2 / 12), rel=1e-13)
    assert float(s.moment(L / 2)) == pytest.approx(W * L**2 / 24, rel=1e-13)
    assert s.deflection_bending(X) == pytest.approx(
        W * X**2 * (L - X) ** 2 / (24 * EI), rel=1e-12, abs=1e-18)
    assert float(s.deflection(L / 2)) == pytest.approx(
        W * L**4 / (384 * EI) + W * L**2 / (8 * KGA), rel=1e-13)


def test_fixed_fixed_point_load() -> None:
    """M_a = -P a b^2/L^2, M_b = -P a^2 b/L^2, w(a) = P a^3 b^3/(3 EI L^3); centre load:
    P L^3/(192 EI) and end moments -P L/8 (Roark Table 8.1)."""
    a = 0.9
    b = L - a
    s = fixed_fixed_point_load(P, a, L, EI)
    assert (s.M_a, s.M_b) == pytest.approx((-P * a * b**2 / L**2, -P * a**2 * b / L**2))
    assert float(s.deflection(a)) == pytest.approx(P * a**3 * b**3 / (3 * EI * L**3))
    c = fixed_fixed_point_load(P, L / 2, L, EI, KGA)
    assert float(c.deflection(L / 2)) == pytest.approx(P * L**3 / (192 * EI) + P * L / (4 * KGA))
    assert c.M_a == pytest.approx(-P * L / 8, rel=1e-14)


def _released_b(sol, rotation: bool) -> float:
    """Unit-load displacement (or rotation) at B of the beam released at B, using the
    solution's own M and V: int M m/EI + int V v/kGA with m = -(L - x), v = 1 for a
    unit load at B and m = 1, v = 0 for a unit couple (independent quadrature)."""
    kinks = [p.a for p in sol.point_loads]
    if rotation:
        return quad(lambda x: float(sol.moment(x)) / EI, 0, L, points=kinks)[0]
    bend = quad(lambda x: float(sol.moment(x)) * -(L - x) / EI, 0, L, points=kinks)[0]
    return bend + quad(lambda x: float(sol.shear(x)) / KGA, 0, L, points=kinks)[0]


def test_timoshenko_redundants_satisfy_compatibility() -> None:
    """With shear deformation (phi = 12 EI/(kGA L^2) = 1.536 here) the redundants must
    still close the gap at B: zero displacement (and zero rotation when clamped) by the
    unit-load method.  Fixed-fixed M_b = -P a b (2a + phi L)/(2 L^2 (1 + phi)) (derived
    from the same two conditions)."""
    phi = timoshenko_phi(EI, KGA, L)
    a = 0.9
    scale = P * L**3 / EI
    for sol in (propped_cantilever_uniform_load(W, L, EI, KGA),
                propped_cantilever_point_load(P, a, L, EI, KGA),
                fixed_fixed_point_load(P, a, L, EI, KGA)):
        assert abs(_released_b(sol, rotation=False)) < 1e-10 * scale
        assert float(sol.deflection(L)) == pytest.approx(0.0, abs=1e-12 * scale)
    ff = fixed_fixed_point_load(P, a, L, EI, KGA)
    assert abs(_released_b(ff, rotation=True)) < 1e-10 * P * L**2 / EI
    b = L - a
    assert ff.M_b == pytest.approx(-P * a * b * (2 * a + phi * L) / (2 * L**2 * (1 + phi)))
    assert ff.R_a + ff.R_b == pytest.approx(P, rel=1e-14)


def test_shear_is_slope_of_moment() -> None:
    """V = dM/dx (equilibrium of a beam element), checked by central differences."""
    s = simply_supported_patch_load(W, 0.4, 1.9, L, EI)
    x, h = np.array([0.2, 0.7, 1.3, 2.2]), 1e-6
    assert s.shear(x) == pytest.approx((s.moment(x + h) - s.moment(x - h)) / (2 * h), rel=1e-6)


def test_helpers_and_errors() -> None:
    """k G A product, phi definition; bad geometry is rejected."""
    assert shear_rigidity(5 / 6, 80e9, 1e-3) == pytest.approx(5 / 6 * 80e9 * 1e-3)
    assert timoshenko_phi(EI, math.inf, L) == 0.0
    with pytest.raises(ValueError):
        simply_supported_point_load(P, 3.0, L, EI)
    with pytest.raises(ValueError):
        simply_supported_patch_load(W, 1.0, 1.0, L, EI)
    with pytest.raises(ValueError):
        cantilever_tip_load(P, L, -EI)
