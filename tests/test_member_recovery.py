"""Stress recovery and point location."""

from __future__ import annotations

import numpy as np
import pytest
from skfem import MeshTri1

from fem.member.recovery import PointLocator


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
