"""Cut sampling and automatic cut placement."""

from __future__ import annotations

from fem.member.cuts import automatic_cuts


def test_automatic_cuts_flank_each_station():
    """Quarter points plus one cut a quarter depth outside each station, inside the span."""
    xs = automatic_cuts(0.0, 400.0, 100.0, [(0.0, 0.0), (380.0, 400.0)], min_gap=5.0)
    assert xs == [25.0, 100.0, 200.0, 300.0, 355.0]
