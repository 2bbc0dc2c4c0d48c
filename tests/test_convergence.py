"""Tests of `fem.convergence`: GCI, Richardson extrapolation, singularity detection."""

from __future__ import annotations

import dataclasses
import doctest
import json
import math

import numpy as np
import pytest

import fem.convergence as convergence
from fem.convergence import (
    GCI_LIMIT,
    SAFETY_FACTOR_THREE_GRID,
    SAFETY_FACTOR_TWO_GRID,
    ConvergenceInputError,
    gci_study,
    growth_exponent,
    is_singular,
    log_log_slope,
    richardson,
    williams_lambda,
)


def _manufactured(phi0: float, c: float, p: float, sizes: list[float]) -> list[float]:
    """phi(h) = phi0 + c h**p, evaluated exactly at each size."""
    return [phi0 + c * h**p for h in sizes]


def _strict_json(est: convergence.ConvergenceEstimate) -> str:
    return json.dumps(dataclasses.asdict(est), allow_nan=False)


# --- Celik et al. (2008) worked example -------------------------------------------------


def test_celik_2008_table1_worked_example() -> None:
    """Celik et al. (2008), J. Fluids Eng. 130(7) 078001, Table 1, first column.

    Inputs and expected figures are quoted from memory of that table, not re-read from the
    paper: N1, N2, N3 = 18000, 8000, 4500 cells in 2D, h = (1/N)**(1/2), so r21 = 1.5 and
    r32 = 1.333; phi1, phi2, phi3 = 6.063, 5.972, 5.863. Printed results: p = 1.53,
    phi_ext21 = 6.1685, e_a21 = 1.5 %, e_ext21 = 1.7 %, GCI_fine21 = 2.2 %. Asserted to the
    printed precision (half a unit of the last printed digit).
    """
    cells = [18000, 8000, 4500]
    sizes = [(1.0 / n) ** 0.5 for n in cells]
    est = gci_study(sizes, [6.063, 5.972, 5.863])

    assert sizes[1] / sizes[0] == pytest.approx(1.5, abs=5e-4)
    assert sizes[2] / sizes[1] == pytest.approx(1.333, abs=5e-4)
    assert est.observed_order == pytest.approx(1.53, abs=5e-3)
    assert est.extrapolated == pytest.approx(6.1685, abs=5e-5)
    assert est.approx_rel_error == pytest.approx(0.015, abs=5e-4)
    assert est.extrapolated_rel_error == pytest.approx(0.017, abs=5e-4)
    assert est.gci == pytest.approx(0.022, abs=5e-4)
    assert est.safety_factor == SAFETY_FACTOR_THREE_GRID == 1.25
    assert est.converging and not est.oscillating
    assert est.converged(GCI_LIMIT)
    assert not est.converged(0.02)


# --- Manufactured sequences -------------------------------------------------------------


@pytest.mark.parametrize("p", [2.0, 1.0])
@pytest.mark.parametrize("r", [2.0, 1.5])
def test_manufactured_power_law_recovers_order_and_limit(p: float, r: float) -> None:
    """Manufactured sequence phi(h) = phi0 + C h**p (constructed here, exact in h).

    Richardson extrapolation (Richardson 1911) is exact for it, so the observed order and
    the extrapolated value must be recovered to round-off. The GCI then has the closed form
    1.25 |C h1**p| / |phi1| (Celik et al. 2008, eq. 7 with e_a21 = |C h1**p (r**p - 1)/phi1|).
    """
    phi0, c, h1 = 250.0, -40.0, 0.05
    sizes = [h1 * r**2, h1, h1 * r]  # deliberately unsorted
    est = gci_study(sizes, _manufactured(phi0, c, p, sizes))

    phi1 = phi0 + c * h1**p
    assert est.sizes == pytest.approx((h1, h1 * r, h1 * r**2), rel=1e-15)
    assert est.observed_order == pytest.approx(p, abs=1e-6)
    assert est.extrapolated == pytest.approx(phi0, abs=1e-9)
    assert est.gci == pytest.approx(1.25 * abs(c * h1**p) / abs(phi1), rel=1e-9)
    assert est.extrapolated_rel_error == pytest.approx(abs(c * h1**p / phi0), rel=1e-9)
    assert est.converging and not est.oscillating


def test_manufactured_unequal_ratios_uses_iteration() -> None:
    """Manufactured phi(h) = phi0 + C h**1.7 with r21 = 2, r32 = 1.5 (constructed here).

    With unequal ratios q(p) != 0 and the fixed-point iteration of Celik et al. (2008),
    eqs. 3-4, is needed; it is exact for a pure power law.
    """
    sizes = [0.1, 0.2, 0.3]
    est = gci_study(sizes, _manufactured(1.0, 0.8, 1.7, sizes))
    assert est.observed_order == pytest.approx(1.7, abs=1e-6)
    assert est.extrapolated == pytest.approx(1.0, abs=1e-9)


def test_only_three_finest_levels_are_used() -> None:
    """Celik et al. (2008), section 2: the estimate is formed from the three finest grids.

    A fourth, coarsest level with an arbitrary value must not change the estimate.
    """
    sizes = [0.1, 0.2, 0.4]
    values = _manufactured(5.0, 2.0, 2.0, sizes)
    three = gci_study(sizes, values)
    four = gci_study([*sizes, 0.8], [*values, -123.0])
    assert four.sizes == (0.1, 0.2, 0.4, 0.8)
    assert four.observed_order == three.observed_order
    assert four.gci == three.gci


# --- Flags and exact zeros --------------------------------------------------------------


def test_oscillating_sequence_is_flagged() -> None:
    """Celik et al. (2008), eq. 3 remark: eps32/eps21 < 0 indicates oscillatory convergence.

    phi = 1.00, 1.10, 0.95 (finest first): eps21 = 0.10, eps32 = -0.15.
    """
    est = gci_study([0.1, 0.2, 0.4], [1.00, 1.10, 0.95])
    assert est.oscillating
    assert est.converging  # |eps21/eps32| = 2/3 < 1
    assert est.gci is not None
    assert not est.converged(1.0)
    _strict_json(est)


def test_oscillating_order_solves_celik_equation() -> None:
    """Celik et al. (2008), eqs. 3-4 with s = -1 and unequal ratios (r21 = 2, r32 = 1.5).

    The returned p must satisfy p ln r21 = |ln|eps32/eps21| + ln((r21**p + 1)/(r32**p + 1))|,
    written out here independently of the module.
    """
    sizes, values = [0.1, 0.2, 0.3], [1.00, 1.08, 0.90]
    est = gci_study(sizes, values)
    p = est.observed_order
    assert est.oscillating and p is not None
    r21, r32 = 2.0, 1.5
    eps21, eps32 = values[1] - values[0], values[2] - values[1]
    rhs = abs(math.log(abs(eps32 / eps21)) + math.log((r21**p + 1.0) / (r32**p + 1.0)))
    assert p * math.log(r21) == pytest.approx(rhs, abs=1e-12)
    assert p > 0.0


def test_diverging_sequence_is_flagged() -> None:
    """Celik et al. (2008), convergence condition R = eps21/eps32, |R| < 1 for convergence.

    phi = 1.3, 1.1, 1.0 (finest first): |eps21| = 0.2 > |eps32| = 0.1, R = 2.
    """
    est = gci_study([0.1, 0.2, 0.4], [1.3, 1.1, 1.0])
    assert not est.converging
    assert not est.oscillating
    assert not est.converged(10.0)
    _strict_json(est)


def test_zero_order_sequence_gives_no_gci() -> None:
    """Celik et al. (2008), eq. 7: r21**p - 1 = 0 when p = 0, the GCI is undefined.

    Equal changes on equal ratios (phi = 3, 2, 1) give p = 0; GCI and extrapolation None.
    """
    est = gci_study([0.1, 0.2, 0.4], [3.0, 2.0, 1.0])
    assert est.observed_order == pytest.approx(0.0, abs=1e-12)
    assert est.gci is None and est.extrapolated is None
    assert not est.converging
    assert "NaN" not in _strict_json(est)


def test_equal_values_are_converged_with_zero_gci() -> None:
    """Celik et al. (2008), eq. 6: e_a21 = 0 when phi1 = phi2, so GCI_fine21 = 0.

    The order is undefined (any p fits) and reported as None; the result is strict JSON.
    """
    est = gci_study([0.1, 0.2, 0.4], [7.5, 7.5, 7.5])
    assert est.gci == 0.0
    assert est.observed_order is None
    assert est.extrapolated == 7.5
    assert est.approx_rel_error == 0.0 and est.extrapolated_rel_error == 0.0
    assert est.converged(0.0)
    assert json.loads(_strict_json(est))["observed_order"] is None


def test_fine_pair_equal_coarse_differs() -> None:
    """Celik et al. (2008), eq. 6: phi1 = phi2 gives e_a21 = 0 even if phi3 differs."""
    est = gci_study([0.1, 0.2, 0.4], [2.0, 2.0, 1.0])
    assert est.gci == 0.0 and est.converging and est.observed_order is None


def test_coarse_pair_equal_fine_differs_is_not_converging() -> None:
    """Celik et al. (2008), eq. 3: eps32 = 0 != eps21 gives ln 0, no finite order.

    Reported as not converging with order, extrapolation and GCI None, no NaN.
    """
    est = gci_study([0.1, 0.2, 0.4], [1.5, 1.0, 1.0])
    assert not est.converging
    assert est.observed_order is None and est.gci is None
    _strict_json(est)


# --- Two grids --------------------------------------------------------------------------


def test_two_grid_estimate_uses_safety_factor_three() -> None:
    """Roache (1994), J. Fluids Eng. 116, 405-413: two-grid GCI with factor of safety 3.0.

    Manufactured phi = 100 + 20 h**2 on h = 0.1, 0.2 with the default formal order 2:
    GCI = 3 |e_a21| / (2**2 - 1) and the extrapolation is exact.
    """
    est = gci_study([0.2, 0.1], [100.8, 100.2])
    e_a = 0.6 / 100.2
    assert est.safety_factor == SAFETY_FACTOR_TWO_GRID == 3.0
    assert est.assumed_order == 2.0 and est.observed_order is None
    assert est.gci == pytest.approx(3.0 * e_a / 3.0, rel=1e-12)
    assert est.extrapolated == pytest.approx(100.0, abs=1e-9)


def test_two_grid_formal_order_is_a_parameter() -> None:
    """Roache (1994): the two-grid GCI is 3 e_a21 / (r**p - 1) with p the assumed order."""
    est = gci_study([0.1, 0.2], [100.2, 100.8], formal_order=1.0)
    assert est.gci == pytest.approx(3.0 * (0.6 / 100.2) / (2.0 - 1.0), rel=1e-12)
    assert est.assumed_order == 1.0


@pytest.mark.parametrize(
    ("sizes", "values"),
    [
        ([0.1], [1.0]),
        ([0.1, 0.2], [1.0]),
        ([0.1, 0.1, 0.2], [1.0, 2.0, 3.0]),
        ([0.0, 0.1], [1.0, 2.0]),
        ([0.1, 0.2], [1.0, float("nan")]),
    ],
)
def test_bad_input_is_rejected(sizes: list[float], values: list[float]) -> None:
    """Input contract of `gci_study` (this module): at least two distinct positive sizes."""
    with pytest.raises(ConvergenceInputError):
        gci_study(sizes, values)


def test_richardson_formula() -> None:
    """Richardson (1911); Celik et al. (2008) eq. 5: (r**p f1 - f2)/(r**p - 1)."""
    assert richardson(6.063, 5.972, 1.5, 1.53) == pytest.approx(
        (1.5**1.53 * 6.063 - 5.972) / (1.5**1.53 - 1.0), rel=1e-15
    )
    assert richardson(1.0 + 0.01, 1.0 + 0.04, 2.0, 2.0) == pytest.approx(1.0, abs=1e-12)
    with pytest.raises(ConvergenceInputError):
        richardson(1.0, 2.0, 1.0, 2.0)


# --- Williams corner singularity --------------------------------------------------------


def test_williams_270_degree_corner() -> None:
    """Williams (1952), J. Appl. Mech. 19, 526-528: mode I, 270 deg wedge, lambda = 0.5445.

    Also the root satisfies sin(lambda alpha) + lambda sin(alpha) = 0 and is not the
    mode-II root (0.9085) of the antisymmetric equation.
    """
    lam = williams_lambda(270.0)
    alpha = math.radians(270.0)
    assert lam == pytest.approx(0.5445, abs=1e-4)
    assert math.sin(lam * alpha) + lam * math.sin(alpha) == pytest.approx(0.0, abs=1e-12)
    assert lam - 1.0 == pytest.approx(-0.456, abs=1e-3)


def test_williams_crack_and_straight_edge() -> None:
    """Williams (1952): 360 deg (crack) gives lambda = 0.5; 180 deg (flat edge) gives 1."""
    assert williams_lambda(360.0) == pytest.approx(0.5, abs=1e-10)
    assert williams_lambda(180.0) == 1.0
    assert williams_lambda(180.01) < 1.0
    angles = np.linspace(181.0, 359.0, 37)
    lams = [williams_lambda(a) for a in angles]
    assert all(a > b for a, b in zip(lams, lams[1:], strict=False))
    with pytest.raises(ConvergenceInputError):
        williams_lambda(90.0)


# --- Growth exponent and singularity ----------------------------------------------------


SIZES = [0.4, 0.2, 0.1, 0.05, 0.025]


def test_growth_exponent_of_synthetic_singular_sequence() -> None:
    """Williams (1952): a 270 deg corner stress grows as h**(lambda - 1), lambda = 0.5445.

    The synthetic sequence 12 h**-0.456 must return exponent -0.456 and be singular.
    """
    values = [12.0 * h**-0.456 for h in SIZES]
    assert growth_exponent(SIZES, values) == pytest.approx(-0.456, abs=1e-10)
    assert is_singular(SIZES, values)
    est = gci_study(SIZES, values)
    assert not est.converging


def test_converging_sequence_is_not_singular() -> None:
    """Manufactured P2-like stress phi = 80 (1 - 0.3 h**2) (constructed here): not singular.

    It grows monotonically under refinement, but its log-log slope is near 0.
    """
    values = [80.0 * (1.0 - 0.3 * h**2) for h in SIZES]
    assert abs(growth_exponent(SIZES, values)) < 0.05
    assert not is_singular(SIZES, values)


def test_resolved_concentration_is_not_singular() -> None:
    """Manufactured phi = 3 (1 - 0.6 h**2) on h = 1 ... 0.125 (constructed here).

    Steep growth on coarse meshes (overall slope below -0.15) but a flat finest pair: an
    under-resolved stress concentration, not a singularity.
    """
    sizes = [1.0, 0.5, 0.25, 0.125]
    values = [3.0 * (1.0 - 0.6 * h**2) for h in sizes]
    assert growth_exponent(sizes, values) < -0.15
    assert not is_singular(sizes, values)


def test_non_monotone_sequence_is_not_singular() -> None:
    """Definition in `is_singular` (this module): growth must be monotone under refinement."""
    values = [12.0 * h**-0.456 for h in SIZES]
    values[2] *= 1.5
    assert not is_singular(SIZES, values)


def test_log_log_slope_recovers_rate() -> None:
    """Manufactured error e = 3 h**2 (constructed here): slope 2 to round-off."""
    err = [3.0 * h**2 for h in SIZES]
    assert log_log_slope(SIZES, err) == pytest.approx(2.0, abs=1e-10)
    with pytest.raises(ConvergenceInputError):
        log_log_slope(SIZES, [0.0, *err[1:]])


def test_module_docstring_example_runs() -> None:
    """The module's own doctest (manufactured phi = 10 + 3 h**2) must pass."""
    result = doctest.testmod(convergence)
    assert result.attempted > 0 and result.failed == 0


# ----------------------------------------------------------------- the acceptance rule
# `acceptance` decides whether a governing quantity has converged, so each of its rows is
# tested here at its boundary (values chosen by hand; h halves: 1, 2, 4).

from dataclasses import replace  # noqa: E402

from fem.convergence import SETTLED_BEFORE, acceptance, accepted  # noqa: E402

H3 = [1.0, 2.0, 4.0]


def test_settled_boundary_accepts_noise_just_below_and_refuses_just_above():
    """An oscillation of 0.499 % between the finest two is sampling noise (settled); of
    0.501 % it is an oscillating study with no error bound (SETTLED = 0.5 %)."""
    below = gci_study(H3, [100.0, 100.499, 100.0])
    above = gci_study(H3, [100.0, 100.501, 100.0])
    assert below.oscillating and above.oscillating
    assert accepted(below) and acceptance(below).reason.startswith("settled")
    assert not accepted(above) and "oscillate" in acceptance(above).reason


def test_two_coarse_meshes_that_agree_after_a_big_change_are_not_settled():
    """0.3 % between the finest two after 9.7 % before (above SETTLED_BEFORE = 4 %): an
    observed order of about 5, outside the window, so not converged."""
    est = gci_study(H3, [100.0, 100.3, 110.0])
    assert abs(est.values[2] - est.values[1]) / est.values[0] > SETTLED_BEFORE
    a = acceptance(est)
    assert not a.converged and "observed order" in a.reason


def _converging(gci: float, order: float = 2.0):
    """A converging, non-oscillating 3-grid estimate with the given GCI and order, its
    change between the finest two above SETTLED so the GCI row decides."""
    est = gci_study(H3, [100.0, 101.0, 105.0])
    return replace(est, gci=gci, observed_order=order)


def test_gci_limit_boundary():
    """GCI at the limit (5 %) is accepted, just above it is not."""
    assert accepted(_converging(0.05))
    a = acceptance(_converging(0.050001))
    assert not a.converged and "above the 5% limit" in a.reason


def test_observed_order_window():
    """P2 stresses (formal order 2): observed orders 1 to 4 accepted, outside refused."""
    lo, hi = 1.0, 4.0
    assert accepted(_converging(0.01, hi)) and accepted(_converging(0.01, lo))
    assert not accepted(_converging(0.01, hi * 1.01))
    assert not accepted(_converging(0.01, lo * 0.99))
    assert accepted(_converging(0.01, 1.0), formal_order=1.0)   # P1: 0.5 to 2


def test_a_diverging_study_is_not_converged_and_says_so():
    est = gci_study(H3, [100.0, 104.0, 105.0])   # the change grows under refinement
    a = acceptance(est)
    assert not a.converged and "grows" in a.reason


def test_a_two_level_study_is_judged_on_its_gci_with_safety_factor_three():
    """Roache (1994): two grids, assumed order 2, Fs = 3: GCI = 3 |e| / (2^2 - 1) = |e|."""
    ok = gci_study([1.0, 2.0], [100.0, 104.0])     # e = 4 %: GCI 4 %
    bad = gci_study([1.0, 2.0], [100.0, 106.0])    # e = 6 %: GCI 6 %
    assert ok.gci == pytest.approx(0.04) and accepted(ok)
    assert bad.gci == pytest.approx(0.06) and not accepted(bad)
