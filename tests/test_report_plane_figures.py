"""The planes figure of a member (fem.report.plane_figures)."""

from __future__ import annotations

from pathlib import Path

from fem.report.plane_figures import plot_planes


def test_planes_figure_is_written(tmp_path: Path):
    """Two planes give one PNG with a panel each (a non-empty PNG file)."""
    x = [float(v) for v in range(10, 400, 10)]
    planes = [{"y": y, "x": x, "q_fe": [-112.0] * len(x), "q_hand": [-112.5] * len(x),
               "total_fe": -4.3e4, "total_hand": -4.4e4, "x_range": [x[0], x[-1]],
               "excluded": [False] * len(x)} for y in (75.0, 50.0)]
    p = plot_planes(planes, {"force": "N", "length": "mm"}, "cantilever", tmp_path / "p.png")
    assert p.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and p.stat().st_size > 10_000
