"""Plane elasticity: the plane-stress parameters, loads and reactions."""

from __future__ import annotations

import numpy as np
import pytest

from fem.case import parse_case
from fem.member.mesh import mesh_member
from fem.member.recovery import recover
from fem.member.solve import lame, solve_member

BAR = """
schema = 1
name = "bar"
kind = "beam"
[material]
E = 1000.0
nu = 0.3
thickness = 2.0
model = "{model}"
[geometry]
shape = "rectangle"
length = 100.0
depth = 10.0
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


def test_plane_stress_lambda():
    """Plane stress: lambda* = E nu/(1 - nu^2) (Timoshenko & Goodier, Theory of Elasticity, 3rd ed.,
    section 8, Plane Stress)."""
    lam, mu = lame(1000.0, 0.3, "plane-stress")
    assert lam == pytest.approx(1000 * 0.3 / 0.91) and mu == pytest.approx(1000 / 2.6)


@pytest.mark.parametrize("model, strain", [
    ("plane-stress", 10.0 / 1000.0),
    ("plane-strain", 10.0 * (1 - 0.3**2) / 1000.0),
])
def test_uniaxial_bar(model, strain):
    """A bar under uniform end traction sigma = F/(h t) = 200/(10 x 2) = 10: exact
    sigma_xx = 10 everywhere and strain sigma/E (plane stress) or sigma(1 - nu^2)/E (plane
    strain, the lateral faces free in y); common practice."""
    case = parse_case(BAR.format(model=model), "bar.toml")
    mm = mesh_member(case)
    sol = solve_member(case, mm)
    f = recover(sol, mm)
    assert np.allclose(f.sxx, 10.0, rtol=1e-9)
    assert np.allclose(f.txy, 0.0, atol=1e-9)
    ux_end = f.displacement[0][np.isclose(f.p[0], 100.0)]
    assert np.allclose(ux_end, strain * 100.0, rtol=1e-9)
    assert sol.equilibrium_error < 1e-10
    assert sol.reaction_total[0] == pytest.approx(-200.0, rel=1e-10)


def test_mechanism_refused():
    """A single point fixed in y cannot stop x or rotation: refused before solving."""
    from fem.errors import CaseError

    text = BAR.format(model="plane-stress").replace('edge = "left"\nfix = "x"',
                                                     'at = [0.0, 10.0]\nfix = "y"')
    case = parse_case(text, "m.toml")
    with pytest.raises(CaseError, match="rigid motion in x"):
        solve_member(case, mesh_member(case))
