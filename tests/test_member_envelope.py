"""The envelope: FE peak |tau_xy| against the hand value in every section along a member."""

from __future__ import annotations

import json

import numpy as np
import pytest
from conftest import CANTILEVER, plate_cantilever

from fem.case import parse_case
from fem.member.envelope import (
    JUDGED_REACH,
    element_sizes,
    envelope_stations,
    member_envelope,
)
from fem.member.level import ExcludedZone, excluded_zones, run_level
from fem.member.recovery import PointLocator
from fem.results import Result, Timings, write_json

STUBBY = plate_cantilever(5.0, 1)   # 20 kN spread uniformly on the free edge


@pytest.fixture(scope="module")
def slender():
    case = parse_case(CANTILEVER.format(length=600.0, size=10.0, levels=1, cuts="[300.0]"),
                      "slender.toml")
    return case, run_level(case, 10.0, None, None)


@pytest.fixture(scope="module")
def stubby():
    case = parse_case(STUBBY, "stubby.toml")
    level = run_level(case, 5.0, None, None)
    return case, level, member_envelope(case, level)


def _arrays(env):
    x = np.asarray(env.x)
    r = np.array([np.nan if v is None else v for v in env.ratio])
    return x, r


def test_slender_cantilever_ratio_is_one_away_from_the_ends(slender):
    """Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 21: a cantilever with a
    parabolic end shear P has tau_xy = (P/2I)(c^2 - y^2) exactly, the shear formula; so
    FE/hand -> 1 away from the clamp and the loaded end. 600 x 100 x 10, P = 10 kN: hand
    tau = 1.5 V/A = 15 MPa at every x; within 1 % over the middle (x from 150 to 450;
    measured 0.67 % on the 10 mm mesh, the section peak being the largest element-vertex
    value, 1.0 % on a 12.5 mm mesh)."""
    case, level = slender
    env = member_envelope(case, level)
    x, r = _arrays(env)
    mid = (x >= 150.0) & (x <= 450.0)
    assert mid.sum() >= 20
    assert np.allclose(np.asarray(env.tau_hand)[mid], 15.0, rtol=1e-9)
    assert np.nanmax(np.abs(r[mid] - 1.0)) < 0.01
    assert env.unsafe == [] or all(a > 450.0 or b < 150.0 for a, b in env.unsafe)


def test_stubby_plate_worst_point_lies_between_the_cuts(stubby):
    """The 200 x 100 x 10 plate cantilever, 20 kN as a uniform shear on the free end: the
    hand value is 1.5 V/A = 30 MPa everywhere (statics, common practice). Near the loaded
    end the uniform traction is not the parabola (Saint-Venant's principle, Timoshenko &
    Goodier, Theory of Elasticity, 3rd ed., section 21 again), and the FE section peak rises above
    VQ/(Ib) about a third of a depth from the end. Computed independently here, from the stress
    field on
    vertical lines 0.25 mm apart (point location, not the envelope's edge crossings):
    the envelope's worst x lies within one element of that, and its ratio is above 1.05
    (measured 1.0592 at x = 172.7 on the 5 mm mesh)."""
    case, level, env = stubby
    zones = excluded_zones(case, level.mm.supports, level.mm.loads)
    loc = PointLocator(level.field.p, level.field.t)
    xs = np.arange(12.0, 188.0, 0.25)        # outside the excluded stretches [0, 10], [190, 200]
    ys = np.linspace(1e-6, 100.0 - 1e-6, 201)
    X, Y = np.meshgrid(xs, ys, indexing="ij")
    tau = np.abs(level.field.at(loc, X.ravel(), Y.ravel())["txy"]).reshape(X.shape)
    for z in zones:
        tau[np.hypot(X - z.at[0], Y - z.at[1]) <= z.radius] = 0.0
    ratio = tau.max(axis=1) / 30.0
    x_indep = xs[int(np.argmax(ratio))]
    w = env.worst
    assert w is not None and abs(w.x - x_indep) <= level.size
    assert w.ratio > 1.05
    assert w.ratio == pytest.approx(ratio.max(), rel=5e-3)
    assert w.tau_hand == pytest.approx(30.0, rel=1e-9)
    assert any(a <= w.x <= b for a, b in env.unsafe)
    cuts = [c.x for c in level.cuts_fe]
    assert all(abs(c - w.x) > level.size for c in cuts)   # the automatic cuts miss it


def test_stations_are_no_coarser_than_the_local_elements(stubby):
    """Every gap between stations is at most the longest edge of every element it meets,
    and the named cuts are stations (the spacing rule of fem.member.envelope)."""
    case, level, env = stubby
    x = np.asarray(env.x)
    lo, hi, h = element_sizes(level)
    a, b = x[:-1, None], x[1:, None]
    meets = (lo[None, :] < b) & (hi[None, :] > a)
    smallest = np.where(meets, h[None, :], np.inf).min(axis=1)
    assert np.all(np.diff(x) <= smallest * (1 + 1e-9))
    for c in level.cuts_fe:
        assert np.min(np.abs(x - c.x)) < 1e-6
    assert x[0] > 0.0 and x[-1] <= 200.0 and x[-1] - x[0] > 199.9   # x kept to 6 digits


def test_stations_follow_a_refined_mesh():
    """Same rule on a graded mesh: where elements are smaller the stations are closer."""
    case = parse_case(STUBBY + """
[[mesh.refine]]
at = [100.0, 50.0]
radius = 10.0
size = 1.0
""", "refined.toml")
    level = run_level(case, 10.0, None, None)
    x = envelope_stations(level, 0.0, 200.0)
    gaps = np.diff(x)
    near = (x[:-1] > 95.0) & (x[1:] < 105.0)
    far = (x[:-1] > 30.0) & (x[1:] < 70.0)     # away from the clamp corners too
    assert gaps[near].max() <= 2.5 and gaps[far].min() > 3.0


def test_excluded_zones_are_honoured(stubby):
    """A disc over the worst point takes it out of the peak; a disc over the whole depth
    leaves those sections without an FE value and without a ratio; the worst station and
    the unsafe stretches never lie in an excluded stretch."""
    case, level, env = stubby
    w = env.worst
    own = excluded_zones(case, level.mm.supports, level.mm.loads)
    spot = ExcludedZone((w.x, w.y), 8.0, "test spot")
    env2 = member_envelope(case, level, own + [spot])
    k = int(np.argmin(np.abs(np.asarray(env2.x) - w.x)))
    assert env2.tau_fe[k] is not None and env2.tau_fe[k] < w.tau_fe
    assert env2.worst.x < w.x - 8.0 or env2.worst.x > w.x + 8.0
    whole = ExcludedZone((60.0, 50.0), 55.0, "test disc over the full depth")
    env3 = member_envelope(case, level, [whole])
    x3 = np.asarray(env3.x)
    covered = np.abs(x3 - 60.0) < np.sqrt(55.0**2 - 50.0**2)  # the disc spans y = 0..100
    assert covered.any()
    assert all(env3.tau_fe[i] is None and env3.ratio[i] is None
               for i in np.flatnonzero(covered))
    assert env3.excluded == [[5.0, 115.0]]
    # FE peaks leave out JUDGED_REACH radii about the centre: x > 60 + 2 x 55 = 170
    assert env3.worst.x > 60.0 + JUDGED_REACH * 55.0
    assert all(a > 170.0 for a, b in env3.unsafe)


def test_the_tolerance_sets_the_unsafe_stretches(stubby):
    """ratio > 1 + tolerance marks a stretch: a tolerance above the worst ratio marks none."""
    case, level, env = stubby
    assert member_envelope(case, level, None, env.worst.ratio - 1.0 + 1e-3).unsafe == []
    wide = member_envelope(case, level, None, 0.0).unsafe
    assert sum(b - a for a, b in wide) > sum(b - a for a, b in env.unsafe)


def test_envelope_goes_into_results_json(stubby, tmp_path):
    """results.json carries `envelope` with the contract's spelling; floats or null only;
    without an envelope there is no key."""
    case, level, env = stubby
    res = Result(case="stubby-plate", kind="beam", title="t",
                 units={"length": "mm", "force": "N", "stress": "MPa"}, mesh=None,
                 verdict="holds", findings=[], timings=Timings(), convergence=None,
                 envelope=env)
    d = json.loads(write_json(res, tmp_path / "results.json").read_text())["envelope"]
    assert {"x", "tau_fe", "tau_hand", "ratio", "worst", "excluded", "unsafe"} <= set(d)
    assert len(d["x"]) == len(d["tau_fe"]) == len(d["tau_hand"]) == len(d["ratio"])
    assert set(d["worst"]) >= {"x", "ratio", "tau_fe", "tau_hand"}
    assert all(v is None or isinstance(v, float) for v in d["ratio"] + d["tau_fe"])
    res.envelope = None
    assert "envelope" not in res.to_dict()
