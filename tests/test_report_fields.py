"""Field files: fields.vtu reads back through meshio; profiles.csv holds one block per cut."""

from __future__ import annotations

import csv
from pathlib import Path

import meshio
import numpy as np
import pytest
from conftest import CANTILEVER, ROOT

from fem.api import check
from fem.case import load_case, parse_case
from fem.report.fields import (
    PRINCIPAL_VTU_FIELDS,
    PROFILE_COLUMNS,
    SECTION_VTU_FIELDS,
    VTU_FIELDS,
    profiles_csv_text,
    write_fields,
    write_vtu,
)


@pytest.fixture(scope="module")
def res():
    text = CANTILEVER.format(length=300.0, size=20.0, levels=1, cuts="[100.0, 150.0, 200.0]")
    return check(parse_case(text, "cantilever.toml"))


def test_vtu_round_trip(res, tmp_path: Path):
    """Points, triangles and every named field come back exactly (binary float64)."""
    f = res.run.finest.field
    m = meshio.read(write_vtu(f, tmp_path / "fields.vtu"))
    assert m.points.shape == (f.p.shape[1], 3)
    np.testing.assert_array_equal(m.points[:, :2], f.p.T)
    assert np.all(m.points[:, 2] == 0.0)
    tri = m.get_cells_type("triangle")
    np.testing.assert_array_equal(tri, f.t[:3].T)
    assert set(m.point_data) == {"displacement", *VTU_FIELDS, *PRINCIPAL_VTU_FIELDS}
    for name, key in VTU_FIELDS.items():
        np.testing.assert_allclose(m.point_data[name], f.nodal[key], rtol=0, atol=0)
    u = m.point_data["displacement"]
    assert u.shape == (f.p.shape[1], 3) and np.all(u[:, 2] == 0.0)
    np.testing.assert_array_equal(u[:, :2], f.displacement.T)


def test_vtu_fields_agree_with_each_other(res, tmp_path: Path):
    """Plane stress von Mises sqrt(sx^2 - sx sy + sy^2 + 3 txy^2) and the larger principal
    stress (sx + sy)/2 + sqrt(((sx - sy)/2)^2 + txy^2) (common practice) from the file's
    own stress components; the cantilever tip deflects downwards (load -y)."""
    m = meshio.read(write_vtu(res.run.finest.field, tmp_path / "f.vtu"))
    d = m.point_data
    sx, sy, t = d["sigma_xx"], d["sigma_yy"], d["tau_xy"]
    np.testing.assert_allclose(d["von_mises"], np.sqrt(sx**2 - sx * sy + sy**2 + 3 * t**2),
                               rtol=1e-10, atol=1e-9)
    p1 = 0.5 * (sx + sy) + np.sqrt((0.5 * (sx - sy)) ** 2 + t**2)
    np.testing.assert_allclose(d["principal_max"], p1, rtol=1e-10, atol=1e-9)
    p2 = 0.5 * (sx + sy) - np.sqrt((0.5 * (sx - sy)) ** 2 + t**2)
    np.testing.assert_allclose(d["principal_min"], p2, rtol=1e-10, atol=1e-9)
    # each direction is a unit eigenvector of the stress tensor [[sx, t], [t, sy]]
    for name, lam in (("direction_max", p1), ("direction_min", p2)):
        n = d[name][:, :2]
        np.testing.assert_allclose(np.hypot(n[:, 0], n[:, 1]), 1.0, rtol=1e-12)
        scale = np.abs(p1) + np.abs(p2) + 1e-12
        np.testing.assert_allclose((sx * n[:, 0] + t * n[:, 1] - lam * n[:, 0]) / scale, 0.0,
                                   atol=1e-9)
        np.testing.assert_allclose((t * n[:, 0] + sy * n[:, 1] - lam * n[:, 1]) / scale, 0.0,
                                   atol=1e-9)
    tip = np.argmax(m.points[:, 0])
    assert d["displacement"][tip, 1] < 0.0


def test_profiles_csv_has_one_block_per_cut(res):
    """Header, then the cuts in order, each block the cut's whole profile at its x."""
    rows = list(csv.reader(profiles_csv_text(res.result).splitlines()))
    assert rows[0] == ["cut", "x [mm]", "y [mm]", "tau_fe [MPa]", "tau_hand [MPa]",
                       "sigma_x_fe [MPa]", "sigma_x_hand [MPa]"]
    assert [c.split(" [")[0] for c in rows[0]] == list(PROFILE_COLUMNS)
    body = rows[1:]
    cuts = res.result.cuts
    blocks = [int(r[0]) for r in body]
    assert blocks == sorted(blocks)
    assert sorted(set(blocks)) == list(range(1, len(cuts) + 1))
    for k, c in enumerate(cuts, start=1):
        block = np.array([[float(v) for v in r[1:]] for r in body if int(r[0]) == k])
        assert block.shape == (len(c.profile.y), 6)
        assert np.all(block[:, 0] == c.x)
        for j, col in enumerate(("y", "tau_fe", "tau_hand", "sigma_x_fe", "sigma_x_hand"),
                                start=1):
            np.testing.assert_allclose(block[:, j], getattr(c.profile, col), rtol=1e-8,
                                       atol=1e-9)


def test_write_fields_writes_both_files(res, tmp_path: Path):
    names = [p.name for p in write_fields(res, tmp_path)]
    assert names == ["fields.vtu", "profiles.csv"]
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".")]  # no temporaries


def test_section_vtu_carries_the_shear_field(tmp_path: Path):
    """A section check's fields.vtu: its mesh and the flexure shear stress, whose largest
    magnitude is the section's FE peak within the vertex averaging (the peak is taken from
    element-corner values, the file holds their averages at the vertices)."""
    case = load_case(ROOT / "cases" / "rectangle-wide-section.toml").with_mesh(levels=1,
                                                                              size=8.0)
    res = check(case)
    names = [p.name for p in write_fields(res, tmp_path)]
    assert names == ["fields.vtu", "profiles.csv"]
    m = meshio.read(tmp_path / "fields.vtu")
    assert set(m.point_data) == set(SECTION_VTU_FIELDS)
    d = m.point_data
    np.testing.assert_allclose(d["tau_magnitude"], np.hypot(d["tau_zx"], d["tau_zy"]),
                               rtol=1e-12)
    np.testing.assert_array_equal(d["tau"][:, :2], np.column_stack([d["tau_zx"], d["tau_zy"]]))
    assert np.all(d["tau"][:, 2] == 0.0)
    peak = res.result.section["tau_max_fe"]
    assert d["tau_magnitude"].max() == pytest.approx(peak, rel=0.05)
    x, y = m.points[:, 0], m.points[:, 1]
    assert x.max() - x.min() == pytest.approx(160.0) and y.max() - y.min() == pytest.approx(40.0)
