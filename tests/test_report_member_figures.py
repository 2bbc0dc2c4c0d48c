"""Beam figures: the ratio-along-member figure joins the set only when an envelope is given."""

from __future__ import annotations

from pathlib import Path

import matplotlib.image as mpimg
import pytest

import fem.report.member_figures as mf
from fem.case import parse_case
from fem.member.compare import cut_results
from fem.member.envelope import member_envelope
from fem.member.level import run_level
from fem.report.member_figures import ratio_along_member_figure, write_beam_figures
from fem.report.note import _CAPTIONS

PLATE = """
schema = 1
name = "plate"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = 200.0
depth = 100.0
[[geometry.holes]]
center = [100.0, 50.0]
radius = 10.0
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, -20000.0]
[mesh]
size = 20.0
levels = 1
"""


@pytest.fixture(scope="module")
def plate():
    case = parse_case(PLATE, "plate.toml")
    level = run_level(case, 20.0, None, None)
    return case, level, cut_results(level)


@pytest.fixture
def no_contours(monkeypatch):
    """The contours and profiles take seconds to draw and are not under test here."""
    monkeypatch.setattr(mf, "contour_figure", lambda case, level, cuts, q, path: Path(path))
    monkeypatch.setattr(mf, "profile_figure", lambda case, cut, path: Path(path))
    monkeypatch.setattr(mf, "profiles_figure", lambda case, cuts, path: Path(path))
    monkeypatch.setattr(mf, "mesh_figure", lambda case, level, path: Path(path))


def test_no_envelope_no_ratio_figure(plate, tmp_path, no_contours):
    """Current callers (no envelope) get the figures they always got."""
    case, level, cuts = plate
    names = [p.name for p in write_beam_figures(case, level, cuts, tmp_path)]
    assert "ratio-along-member.png" not in names
    assert names[-2:] == ["profiles.png", "mesh.png"]
    assert len(names) == 4 + len(cuts)


def test_envelope_adds_the_ratio_figure(plate, tmp_path, no_contours):
    case, level, cuts = plate
    env = member_envelope(case, level)
    paths = write_beam_figures(case, level, cuts, tmp_path, envelope=env)
    assert [p.name for p in paths][-2:] == ["ratio-along-member.png", "mesh.png"]
    assert len(paths) == 5 + len(cuts) and paths[-2].exists()


def test_ratio_figure_is_drawn_with_a_caption(plate, tmp_path):
    """The figure is a real image (not blank) and the design note has its caption."""
    case, level, _ = plate
    path = ratio_along_member_figure(case, member_envelope(case, level),
                                     tmp_path / "ratio-along-member.png")
    img = mpimg.imread(path)
    assert img.shape[0] > 400 and img.shape[1] > 800 and img[..., :3].std() > 0.05
    assert "ratio-along-member" in _CAPTIONS


def test_overview_and_mesh_figures_and_force_labels(plate, tmp_path):
    """profiles.png holds every cut, mesh.png the finest mesh; forces of 10 kN and more are
    labelled in kN (no 1e+05 in a title)."""
    case, level, cuts = plate
    for path in (mf.profiles_figure(case, cuts, tmp_path / "profiles.png"),
                 mf.mesh_figure(case, level, tmp_path / "mesh.png")):
        img = mpimg.imread(path)
        assert img.shape[0] > 300 and (img[:, :, :3] < 0.5).any(axis=2).mean() > 0.005
    assert mf.force_text(-90000.0, "N") == "-90 kN"
    assert mf.force_text(100000.0, "N") == "100 kN"
    assert mf.force_text(2500.0, "N") == "2500 N"
    assert mf.force_text(12.5, "kN") == "12.5 kN"
    assert mf.force_text(25000.0, "lbf") == "25 kip"
