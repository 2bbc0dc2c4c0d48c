"""The hand side of a beam check: 1D statics on idealised supports, strips, stresses."""

from __future__ import annotations

import numpy as np
import pytest
from conftest import CANTILEVER

from fem.case import parse_case
from fem.case.outline import cut_strips, patches
from fem.member.hand import beam_model, hand_at_cut


def test_cantilever_hand_values():
    """Cantilever, tip load P = 10 kN at L = 300 (Young & Budynas, Roark's
    Formulas for Stress and Strain, 7th ed., Table 8.1, case 1a, from memory):
    V = P, |M| = P (L - x); rectangle 10 x 100: tau_max = 1.5 V/A = 15 MPa,
    M c/I = 10000 x 200 x 50 / (10 x 100^3/12) = 120 MPa at x = 100."""
    case = parse_case(CANTILEVER.format(length=300.0, size=10.0, levels=1, cuts="[100.0]"),
                      "c.toml")
    sup, lds = patches(case)
    model = beam_model(case, sup, lds, axis_y=50.0, EA=2e8, EI=1e12, stations=[100.0])
    assert model.determinate
    strips = cut_strips(case.geometry, 100.0, 10.0)
    y = np.linspace(0, 100, 101)
    h = hand_at_cut(case, model, 100.0, strips, y)
    assert h.V == pytest.approx(-10000.0) and h.M == pytest.approx(2.0e6)
    assert h.tau_max_formula == pytest.approx(15.0) and h.y_at_tau_max == pytest.approx(50.0)
    assert h.tau_avg == pytest.approx(10.0) and h.sigma_x_max == pytest.approx(120.0)
    assert h.sigma_x[-1] == pytest.approx(120.0)  # hogging: top fibre in tension
