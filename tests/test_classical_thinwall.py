"""Tests for classical.thinwall: open thin-walled shear flow and shear centres."""

from __future__ import annotations

import math

import numpy as np
import pytest

from classical.thinwall import (
    WallSegment,
    angle_centreline,
    angle_shear_centre,
    channel_centreline,
    channel_shear_centre,
    i_centreline,
    mono_i_shear_centre,
    shear_centre,
    shear_flow,
    shear_flow_resultant,
    tee_centreline,
    tee_shear_centre,
    thinwall_properties,
)

H, B, TF, TW = 300.0, 150.0, 10.0, 7.0


def test_i_centreline_second_moment() -> None:
    """Thin-wall I: Ixx = t_w h^3/12 + b t_f h^2/2 (flange own terms in t^3 dropped;
    Megson, Ch. 16 convention)."""
    p = thinwall_properties(i_centreline(H, B, TF, TW))
    assert p.Ixx == pytest.approx(TW * H**3 / 12 + B * TF * H**2 / 2, rel=1e-14)
    assert p.A == pytest.approx(TW * H + 2 * B * TF, rel=1e-14)


def test_i_web_shear_flow_integrates_to_v() -> None:
    """In the thin-wall I the flange flows are horizontal, so the web alone carries the
    vertical shear: int_web q dy = V exactly; the flange flows cancel in x."""
    V = 4.0e4
    segs = i_centreline(H, B, TF, TW)
    web = shear_flow_resultant(segs, V, indices=[0])
    assert web.Fy == pytest.approx(V, rel=1e-13)
    whole = shear_flow_resultant(segs, V)
    assert whole.Fx == pytest.approx(0.0, abs=1e-12 * V)
    assert whole.Fy == pytest.approx(V, rel=1e-13)


def test_i_shear_flow_values() -> None:
    """q at the neutral axis = (V/I)(b t_f h/2 + t_w h^2/8); at the flange root of each
    half flange V b t_f h/(4 I); zero at the flange tips (shear formula, Gere & Goodno,
    Mechanics of Materials, 7th ed., Ch. 6, from memory)."""
    V = 1.0e4
    segs = i_centreline(H, B, TF, TW)
    ixx = TW * H**3 / 12 + B * TF * H**2 / 2
    q_web = shear_flow(segs, 0, [0.0, H / 2, H], V)
    assert q_web[1] == pytest.approx(V / ixx * (B * TF * H / 2 + TW * H**2 / 8), rel=1e-13)
    assert q_web[0] == pytest.approx(V * B * TF * H / (2 * ixx), rel=1e-13)  # two half flanges
    q_flange = shear_flow(segs, 1, [0.0, B / 2], V)  # top-left half flange from the web
    assert abs(q_flange[0]) == pytest.approx(V * B * TF * H / (4 * ixx), rel=1e-13)
    assert q_flange[1] == pytest.approx(0.0, abs=1e-12 * abs(q_flange[0]))


@pytest.mark.parametrize(("h", "b", "tf", "tw"),
                         [(200.0, 80.0, 10.0, 10.0), (250.0, 90.0, 14.0, 8.0)])
def test_channel_shear_centre(h: float, b: float, tf: float, tw: float) -> None:
    """Channel: e = 3 b^2 t_f/(6 b t_f + h t_w) from the web centre line, behind the web;
    for equal thickness 3 b^2/(h + 6 b) (Gere & Goodno, Mechanics of
    Materials, 7th ed., Ch. 6, from memory).  200 x 80 equal thickness: e = 3*6400/(200 + 480) =
    28.235 mm."""
    sc = shear_centre(channel_centreline(h, b, tf, tw))
    e = channel_shear_centre(h, b, tf, tw)
    assert sc.x == pytest.approx(-e, rel=1e-12)
    assert sc.y == pytest.approx(0.0, abs=1e-12 * h)
    if tf == tw:
        assert e == pytest.approx(3 * b**2 / (h + 6 * b), rel=1e-15)
        assert e == pytest.approx(28.235294117647058, rel=1e-12)


def test_mono_symmetric_i() -> None:
    """I with unequal flanges: shear centre h I_b/(I_t + I_b) below the top flange, where
    I_t, I_b are the flanges' second moments about the web (Megson, Ch. 16)."""
    h, bt, tt, bb, tb = 200.0, 120.0, 10.0, 80.0, 8.0
    segs = (WallSegment((0, -h / 2), (0, h / 2), 6.0),
            WallSegment((0, h / 2), (-bt / 2, h / 2), tt),
            WallSegment((0, h / 2), (bt / 2, h / 2), tt),
            WallSegment((0, -h / 2), (-bb / 2, -h / 2), tb),
            WallSegment((0, -h / 2), (bb / 2, -h / 2), tb))
    sc = shear_centre(segs)
    assert sc.y == pytest.approx(h / 2 - mono_i_shear_centre(h, bt, tt, bb, tb), rel=1e-12)
    assert sc.x == pytest.approx(0.0, abs=1e-12 * h)


def test_tee_and_angle_shear_centre_at_leg_junction() -> None:
    """Tee and angle: every wall passes through the junction of the centre lines, so the
    shear centre is there (thin-wall theory, common practice); the solid-frame helpers
    place it at (0, depth - t_f/2) for the tee and (t/2, t/2) for the angle."""
    depth, tf = 120.0, 12.0
    tee = tee_centreline(depth - tf / 2, 100.0, tf, 7.0)
    moved = tuple(WallSegment((s.start[0], s.start[1] + depth - tf / 2),
                              (s.end[0], s.end[1] + depth - tf / 2), s.t) for s in tee)
    sc, ref = shear_centre(moved), tee_shear_centre(depth, tf)
    assert (sc.x, sc.y) == pytest.approx((ref.x, ref.y), abs=1e-12 * depth)
    t = 10.0
    ang = angle_centreline(150.0 - t / 2, 90.0 - t / 2, t)
    moved = tuple(WallSegment((s.start[0] + t / 2, s.start[1] + t / 2),
                              (s.end[0] + t / 2, s.end[1] + t / 2), s.t) for s in ang)
    sc, ref = shear_centre(moved), angle_shear_centre(t)
    assert (sc.x, sc.y) == pytest.approx((ref.x, ref.y), abs=1e-12 * 150.0)


def test_unsymmetric_angle_resultant_equals_applied_shear() -> None:
    """Unequal-leg angle (Ixy != 0): the general open-section flow (Megson, Ch. 16)
    must resolve into exactly the applied (Vx, Vy) and vanish at both free ends."""
    segs = angle_centreline(150.0, 90.0, 10.0)
    assert thinwall_properties(segs).Ixy != 0
    for vx, vy in ((0.0, 1.0), (1.0, 0.0), (-2.0, 3.0)):
        r = shear_flow_resultant(segs, vy, vx)
        assert (r.Fx, r.Fy) == pytest.approx((vx, vy), abs=1e-13)
        assert shear_flow(segs, 0, 150.0, vy, vx) == pytest.approx(0.0, abs=1e-15)
        assert shear_flow(segs, 1, 90.0, vy, vx) == pytest.approx(0.0, abs=1e-15)


def test_shear_flow_continuity_at_junction() -> None:
    """Kirchhoff-like balance at the I web-flange junction: the web flow at its top equals
    the sum of the two half-flange flows leaving it (equilibrium of the junction)."""
    segs = i_centreline(H, B, TF, TW)
    q_web_top = shear_flow(segs, 0, H, 1.0)
    left, right = shear_flow(segs, 1, 0.0, 1.0), shear_flow(segs, 2, 0.0, 1.0)
    assert q_web_top == pytest.approx(left + right, rel=1e-13)


def test_closed_section_rejected() -> None:
    """A closed cell is statically indeterminate in shear flow: not an open tree."""
    tri = (WallSegment((0, 0), (1, 0), 0.1), WallSegment((1, 0), (0, 1), 0.1),
           WallSegment((0, 1), (0, 0), 0.1))
    with pytest.raises(ValueError, match="open tree"):
        shear_centre(tri)
    with pytest.raises(ValueError):
        shear_flow(tri, 0, np.array([0.5]), 1.0)


def test_equal_angle_wall_stress_peak() -> None:
    """Equal angle, centre-line legs b from the corner, wall t, shear Vy: A = 2bt, centroid
    (b/4, b/4), Ixx = Iyy = 5tb^3/24, Ixy = -tb^3/8, so q = (7.5 Qx + 4.5 Qy) V/(t b^3)
    (module formula, Megson Ch. 16); on the vertical leg dq/dy = 0 at y = 0.4 b, where
    tau = 1.35 V/(b t) (derived here by hand from that formula).  b = 79, t = 2,
    V = 10 kN: 85.44."""
    from classical.thinwall import wall_stress_peak

    b, t, V = 79.0, 2.0, 1.0e4
    pk = wall_stress_peak(angle_centreline(b, b, t), V)
    assert pk.tau == pytest.approx(1.35 * V / (b * t), rel=1e-12)
    assert pk.at == pytest.approx((0.0, 0.4 * b), abs=1e-9)


def test_closed_cells_tube_and_box() -> None:
    """Closed single cells (closed-cell correction, Megson, Aircraft Structures for
    Engineering Students, 4th ed., Ch. 17, edition and chapter from memory): a thin
    tube peaks at V/(pi R t) = 2V/A on the neutral axis (360-gon centre line: 1e-4);
    a box of centre lines b x h, wall t, at 3V(2b + h)/(4 t h (h + 3b)) mid-web (cut at
    the top flange's middle, where q = 0 by symmetry; derived here by hand).  The flow's
    resultant is the applied shear (Simpson's rule is exact for the quadratic q)."""
    from classical.thinwall import (
        box_centreline,
        closed_cell_shear_flow,
        closed_cell_stress_peak,
        tube_centreline,
        tube_thinwall_peak,
    )

    V = 1000.0
    assert tube_thinwall_peak(100.0, 2.0, V) == pytest.approx(V / (math.pi * 49.0 * 2.0))
    tube = closed_cell_stress_peak(tube_centreline(100.0, 2.0), 2.0, V)
    assert tube.tau == pytest.approx(tube_thinwall_peak(100.0, 2.0, V), rel=1e-4)
    assert abs(tube.at[1]) < 1.0
    b, h, t = 78.0, 38.0, 2.0
    box = closed_cell_stress_peak(box_centreline(b + t, h + t, t), t, V)
    assert box.tau == pytest.approx(3 * V * (2 * b + h) / (4 * t * h * (h + 3 * b)), rel=1e-12)
    assert abs(box.at[1]) < 1e-9 and abs(abs(box.at[0]) - b / 2) < 1e-9
    segs, s, q = closed_cell_shear_flow(box_centreline(b + t, h + t, t), t, V, samples=3)
    fy = sum((sk[-1] - sk[0]) / 6 * (qk[0] + 4 * qk[1] + qk[2]) * seg.direction[1]
             for seg, sk, qk in zip(segs, s, q, strict=True))
    fx = sum((sk[-1] - sk[0]) / 6 * (qk[0] + 4 * qk[1] + qk[2]) * seg.direction[0]
             for seg, sk, qk in zip(segs, s, q, strict=True))
    assert abs(fy) == pytest.approx(V, rel=1e-12) and abs(fx) < 1e-9 * V
