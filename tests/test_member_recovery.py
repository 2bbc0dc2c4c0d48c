"""Stress recovery and point location."""

from __future__ import annotations

import math

import numpy as np
import pytest
from skfem import MeshTri1

from fem.member.recovery import PointLocator, recover, von_mises


def test_locator_barycentric_is_exact_for_linear_fields():
    """A linear function is reproduced exactly by barycentric interpolation (common
    practice), including at points just outside the mesh (clipped to the nearest element)."""
    m = MeshTri1.init_tensor(np.linspace(0, 2, 9), np.linspace(0, 1, 5))
    loc = PointLocator(m.p, m.t)
    rng = np.random.default_rng(1)
    x, y = rng.uniform(0, 2, 200), rng.uniform(0, 1, 200)
    e, bary = loc.locate(x, y)
    f = 3.0 * m.p[0] - 2.0 * m.p[1] + 1.0
    vals = np.einsum("ij,ij->i", f[m.t[:, e].T], bary)
    assert np.allclose(vals, 3 * x - 2 * y + 1, atol=1e-12)
    e2, b2 = loc.locate(np.array([2.0 + 1e-9]), np.array([0.5]))
    assert np.all(b2 >= 0) and b2.sum() == pytest.approx(1.0)


@pytest.mark.parametrize("model, vm", [("plane-stress", 10.0),
                                       ("plane-strain", math.sqrt(79.0))])
def test_von_mises_follows_the_material_model(model, vm):
    """The bar of tests/test_member_solve.py under sigma_xx = 10 (exact, uniform): plane
    stress gives sigma_vm = 10; plane strain adds sigma_zz = nu sigma_xx = 3, so
    sigma_vm = sqrt(((10 - 0)^2 + (0 - 3)^2 + (3 - 10)^2)/2) = sqrt(79) = 8.888 (J2 form,
    hand arithmetic; plane-strain sigma_zz = nu (sx + sy), common practice)."""
    from test_member_solve import BAR

    from fem.case import parse_case
    from fem.member.mesh import mesh_member
    from fem.member.solve import solve_member

    case = parse_case(BAR.format(model=model), "bar.toml")
    mm = mesh_member(case)
    f = recover(solve_member(case, mm), mm, case.material)
    assert np.allclose(f.nodal["von_mises"], vm, rtol=1e-9)
    assert np.allclose(von_mises(case.material, f.sxx, f.syy, f.txy), vm, rtol=1e-9)
