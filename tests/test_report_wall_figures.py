"""The shear-flow figures of a section (fem.report.wall_figures)."""

from __future__ import annotations

from pathlib import Path

from fem.case.parse import parse_case
from fem.report.wall_figures import force_text, write_wall_figures
from fem.section.check import check_section_case

CHANNEL = """
schema = 1
name = "ch"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[geometry]
shape = "channel"
depth = 200.0
flange_width = 80.0
flange_thickness = 4.0
web_thickness = 4.0
[loads]
shear = [0.0, 20000.0]
[mesh]
size = 4.0
"""


def test_force_text_reads_like_a_title():
    assert force_text(20000.0, "N") == "20 kN"
    assert force_text(2.5e6, "N") == "2.5 MN"
    assert force_text(12.0, "kip") == "12 kip"


def test_thin_walled_section_gets_flow_and_wall_figures(tmp_path: Path):
    """A channel writes section-flow.png and wall-flow.png (non-empty PNG files)."""
    case = parse_case(CHANNEL)
    paths = write_wall_figures(case, check_section_case(case), tmp_path)
    assert [p.name for p in paths] == ["section-flow.png", "wall-flow.png"]
    for p in paths:
        assert p.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and p.stat().st_size > 10_000
