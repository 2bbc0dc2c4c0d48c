"""The case model's kind-narrowing accessors (fem/case/model.py)."""
import pytest

from fem.case import load_case
from fem.case.model import BeamGeometry, SectionGeometry
from tests.conftest import ROOT

CASES = ROOT / "cases"


def test_beam_accessor_gives_member_geometry_and_refuses_sections():
    beam = load_case(CASES / "stub-cantilever.toml")
    assert isinstance(beam.beam, BeamGeometry)
    with pytest.raises(TypeError, match="no section geometry"):
        _ = beam.section


def test_section_accessor_gives_section_geometry_and_refuses_members():
    sec = load_case(CASES / "round-pin-section.toml")
    assert isinstance(sec.section, SectionGeometry)
    with pytest.raises(TypeError, match="no member geometry"):
        _ = sec.beam
