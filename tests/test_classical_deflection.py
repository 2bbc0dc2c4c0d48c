"""Point-load deflections, bending plus shear, against the Macaulay integration of
`classical.statics` (an independent route to the same Timoshenko beam cases)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from classical.coefficients import cowper_rectangle
from classical.deflection import cantilever_point_deflection, simply_supported_point_deflection
from classical.statics import cantilever_tip_load, simply_supported_point_load

EI, KGA, L = 2.0e10, 3.0e6, 500.0


def test_cantilever_tip_is_bending_plus_shear():
    """Tip load: P L³/(3EI) + P L/(kGA) (Cowper 1966 for k); the same as statics."""
    P = 1.0e4
    w = cantilever_point_deflection(P, L, L, EI, KGA)
    assert w == pytest.approx(P * L**3 / (3 * EI) + P * L / KGA, rel=1e-14)
    assert w == pytest.approx(float(cantilever_tip_load(P, L, EI, KGA).deflection(L)),
                              rel=1e-12)


@pytest.mark.parametrize("x", [0.0, 120.0, 300.0, 410.0, 500.0])
def test_cantilever_any_point_load_any_station(x):
    """Load at a = 300: below the load the slope-integrated form, beyond it a straight
    line; Maxwell's reciprocity w(x; a) = w(a; x)."""
    P, a = 7.0e3, 300.0
    w = cantilever_point_deflection(P, a, x, EI, KGA)
    if x <= a:
        assert w == pytest.approx(P * x**2 * (3 * a - x) / (6 * EI) + P * x / KGA)
    assert w == pytest.approx(cantilever_point_deflection(P, x, a, EI, KGA), rel=1e-12)


@pytest.mark.parametrize("a, x", [(250.0, 250.0), (100.0, 100.0), (100.0, 400.0),
                                  (400.0, 130.0)])
def test_simple_beam_against_statics(a, x):
    P = 5.0e3
    w = simply_supported_point_deflection(P, a, x, L, EI, KGA)
    ref = float(simply_supported_point_load(P, a, L, EI, KGA).deflection(x))
    assert w == pytest.approx(ref, rel=1e-10)
    if a == x == L / 2:
        assert w == pytest.approx(P * L**3 / (48 * EI) + P * L / (4 * KGA), rel=1e-14)


def test_euler_bernoulli_limit_and_bad_input():
    assert cantilever_point_deflection(1.0, L, L, EI, math.inf) == pytest.approx(
        L**3 / (3 * EI))
    assert cowper_rectangle(0.3) == pytest.approx(0.8497, abs=1e-4)  # Cowper 1966, Table 1
    with pytest.raises(ValueError):
        simply_supported_point_deflection(1.0, 600.0, 10.0, L, EI, KGA)
    with pytest.raises(ValueError):
        cantilever_point_deflection(1.0, 10.0, -1.0, EI, KGA)
    assert np.isfinite(simply_supported_point_deflection(1.0, 0.0, 0.0, L, EI, KGA))
