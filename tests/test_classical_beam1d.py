"""Cross-check of the 1D stiffness solver (classical.beam1d) against the closed forms of
classical.statics (Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., Table 8.1;
Gere & Goodno, Mechanics of Materials, 7th ed., Appendix H; Euler-Bernoulli; both from memory).

Sign conventions differ and are converted here: beam1d uses upward Fy, V = sum of Fy
to the right and M > 0 hogging (dM/dx = V), so V_1d = -V and M_1d = -M of statics
(V = upward forces to the left, M sagging).  The clamp couple C (counter-clockwise)
is -M_a at x = 0 and +M_b at x = L; a sagging end moment M0 at a free end is the
counter-clockwise couple C = M0.
"""

from __future__ import annotations

import pytest

from classical import statics
from classical.beam1d import BeamSupport, LineLoad, PointLoad, solve_beam

L, EI, EA = 2.5, 3.2e6, 1.0e9
P, W, A_POS = 1.5e4, 6.0e3, 0.9
CLAMP = frozenset({"u", "v", "rot"})
PIN = frozenset({"u", "v"})
ROLLER = frozenset({"v"})
STATIONS = [0.13, 0.55, 1.01, 1.47, 1.93, 2.37]  # away from every load point

CASES = {
    "cantilever_tip": ([BeamSupport(0.0, CLAMP)], [PointLoad(L, Fy=-P)], [],
                       statics.cantilever_tip_load(P, L, EI)),
    "cantilever_udl": ([BeamSupport(0.0, CLAMP)], [], [LineLoad(0.0, L, Fy=-W * L)],
                       statics.cantilever_uniform_load(W, L, EI)),
    "cantilever_moment": ([BeamSupport(0.0, CLAMP)], [PointLoad(L, C=2.0e4)], [],
                          statics.cantilever_end_moment(2.0e4, L, EI)),
    "ss_point": ([BeamSupport(0.0, PIN), BeamSupport(L, ROLLER)], [PointLoad(A_POS, Fy=-P)], [],
                 statics.simply_supported_point_load(P, A_POS, L, EI)),
    "ss_udl": ([BeamSupport(0.0, PIN), BeamSupport(L, ROLLER)], [], [LineLoad(0.0, L, Fy=-W * L)],
               statics.simply_supported_uniform_load(W, L, EI)),
    "ss_patch": ([BeamSupport(0.0, PIN), BeamSupport(L, ROLLER)], [],
                 [LineLoad(0.4, 1.7, Fy=-W * 1.3)],
                 statics.simply_supported_patch_load(W, 0.4, 1.7, L, EI)),
    "propped_udl": ([BeamSupport(0.0, CLAMP), BeamSupport(L, ROLLER)], [],
                    [LineLoad(0.0, L, Fy=-W * L)],
                    statics.propped_cantilever_uniform_load(W, L, EI)),
    "propped_point": ([BeamSupport(0.0, CLAMP), BeamSupport(L, ROLLER)], [PointLoad(A_POS, Fy=-P)],
                      [], statics.propped_cantilever_point_load(P, A_POS, L, EI)),
    "fixed_udl": ([BeamSupport(0.0, CLAMP), BeamSupport(L, CLAMP)], [],
                  [LineLoad(0.0, L, Fy=-W * L)], statics.fixed_fixed_uniform_load(W, L, EI)),
    "fixed_point": ([BeamSupport(0.0, CLAMP), BeamSupport(L, CLAMP)], [PointLoad(A_POS, Fy=-P)],
                    [], statics.fixed_fixed_point_load(P, A_POS, L, EI)),
}


@pytest.mark.parametrize("name", list(CASES))
def test_reactions_and_section_forces_match_closed_forms(name: str) -> None:
    """Exact Euler-Bernoulli stiffness reactions equal the Roark closed forms (R_a, R_b,
    clamp moments, e.g. fixed-fixed point load M_a = -P a b^2/L^2), and V(x), M(x) agree
    at stations between loads (statics of the free body), both to 1e-9."""
    supports, points, lines, ref = CASES[name]
    model = solve_beam(supports, points, lines, EA=EA, EI=EI)
    scale_f, scale_m = max(P, W * L), max(P, W * L) * L
    ra = model.reactions[0]
    assert ra[1] == pytest.approx(ref.R_a, abs=1e-9 * scale_f)
    assert ra[2] == pytest.approx(-ref.M_a, abs=1e-9 * scale_m)
    if len(supports) == 2:
        rb = model.reactions[1]
        assert rb[1] == pytest.approx(ref.R_b, abs=1e-9 * scale_f)
        expected_cb = ref.M_b if "rot" in supports[1].restrains else 0.0
        assert rb[2] == pytest.approx(expected_cb, abs=1e-9 * scale_m)
    for x in STATIONS:
        v, _, m = model.forces(x)
        assert v == pytest.approx(-float(ref.shear(x)), abs=1e-9 * scale_f)
        assert m == pytest.approx(-float(ref.moment(x)), abs=1e-9 * scale_m)


def test_determinacy_flag() -> None:
    """Cantilever and simple beam are statically determinate (three restraints); the
    propped and fixed-fixed beams are not (structural classification)."""
    flags = {n: solve_beam(s, p, ln, EA=EA, EI=EI).determinate
             for n, (s, p, ln, _) in CASES.items()}
    assert flags["cantilever_tip"] and flags["ss_udl"]
    assert not flags["propped_udl"] and not flags["fixed_point"]


def test_station_a_hair_from_a_support_is_merged():
    """A station 1e-10 from a support (round-off of an automatic cut) must not form a
    zero-length element: the cantilever's reactions stay R = P, C = P L (statics)."""
    from classical.beam1d import BeamSupport, PointLoad, solve_beam

    m = solve_beam([BeamSupport(0.0, frozenset({"u", "v", "rot"}))],
                   [PointLoad(x=300.1234567891, Fy=-10.0)], [], EA=1e6, EI=1e9,
                   stations=[1e-10, 150.0, 300.1234567891 - 1e-10])
    assert m.reactions[0][1] == pytest.approx(10.0, rel=1e-9)
    assert m.reactions[0][2] == pytest.approx(10.0 * 300.1234567891, rel=1e-9)


@pytest.mark.parametrize("scale", [1e-9, 1e-3, 1.0, 1e5, 1e12])
@pytest.mark.parametrize("offset", [0.0, 1e6])
def test_statics_is_scale_free(scale, offset):
    """A clamped cantilever and a propped one, drawn at any size and far from the origin,
    with a station and a load a hair from the clamp: same reactions (relative) as at unit
    size. Statics of the free body (cantilever: R = -F, C = -F a; propped cantilever, load
    at mid-span: R_prop = 5F/16, Gere & Goodno, Mechanics of Materials, 7th ed., table G-2,
    from memory) - the rank test once called these mechanisms from 1e5 up."""
    L = 300.0 * scale
    x0 = offset * L
    clamp = BeamSupport(x0, frozenset({"u", "v", "rot"}))
    loads = [PointLoad(x0 + L, Fy=-1000.0), PointLoad(x0 + 1e-6 * L, Fy=-1.0)]
    m = solve_beam([clamp], loads, [], EA=1e3 * scale**2, EI=scale**4,
                   stations=[x0 + 4e-7 * L, x0 + 0.5 * L])
    Rx, Ry, C = m.reactions[0]
    assert m.determinate and Ry == pytest.approx(1001.0, rel=1e-9)
    assert C == pytest.approx(1000.0 * L + 1e-6 * L, rel=1e-9)
    prop = solve_beam([BeamSupport(x0, frozenset({"u", "v", "rot"})),
                       BeamSupport(x0 + L, frozenset({"v"}))],
                      [PointLoad(x0 + 0.5 * L, Fy=-16.0)], [], EA=1e6 * scale**2,
                      EI=scale**4)
    assert not prop.determinate
    assert prop.reactions[1][1] == pytest.approx(5.0, rel=1e-6)


def test_mechanism_is_still_a_mechanism_at_any_scale():
    from classical.beam1d import MechanismError

    for scale in (1e-9, 1.0, 1e9):
        with pytest.raises(MechanismError):
            solve_beam([BeamSupport(0.0, frozenset({"u", "v"}))],
                       [PointLoad(300.0 * scale, Fy=-1.0)], [])
        with pytest.raises(MechanismError):   # two rollers: nothing stops sliding in x
            solve_beam([BeamSupport(0.0, frozenset({"v"})),
                        BeamSupport(300.0 * scale, frozenset({"v"}))],
                       [PointLoad(150.0 * scale, Fy=-1.0)], [])
