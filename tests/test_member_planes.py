"""Longitudinal shear on horizontal planes of a member (fem.member.planes)."""

from __future__ import annotations

import numpy as np
import pytest
from conftest import CANTILEVER

from fem.api import check
from fem.case import parse_case
from fem.errors import CaseError


def _case(planes: str, size: float = 5.0) -> str:
    return CANTILEVER.format(length=400.0, size=size, levels=1, cuts="[200.0]").replace(
        "[check]\n", f"[check]\nplanes = {planes}\n")


def test_plane_at_mid_length_of_the_cantilever_is_vq_over_i():
    """Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 21: the cantilever with
    a parabolic end shear P has tau_xy = (P/2I)(c^2 - y'^2) exactly, so on a plane
    25 mm below the top (y = 75; h = 100, t = 10, P = 10 kN) the longitudinal shear per
    length is q = tau t = V Q/I, Q = 10 x 25 x 37.5 = 9375 mm3, I = 10 x 100^3/12:
    |q| = 112.5 N/mm.  FE at mid-length (x = 200) within 0.5 %; the FE total between the
    ends of the plane equals the hand change of M Q / I within 1 %."""
    res = check(parse_case(_case("[75.0]"), "c.toml"))
    (p,) = res.result.planes
    x = np.asarray(p["x"])
    k = int(np.argmin(np.abs(x - 200.0)))
    assert abs(x[k] - 200.0) < 1.0
    assert p["q_hand"][k] == pytest.approx(-10000.0 * 9375.0 / (10 * 100.0**3 / 12), rel=1e-9)
    assert p["q_fe"][k] == pytest.approx(p["q_hand"][k], rel=0.005)
    assert p["total_fe"] == pytest.approx(p["total_hand"], rel=0.01)


def test_plane_outside_the_member_is_refused():
    with pytest.raises(CaseError) as e:
        parse_case(_case("[50.0, 100.0]"), "c.toml")
    assert e.value.key == "check.planes.1" and "not inside the member" in e.value.message
