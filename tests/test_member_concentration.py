"""Stress concentrations at holes against Kirsch's and Howland's solutions
(`fem.member.concentration`).

The cases go through the normal case format and the whole run (`fem.member.check.check_beam`),
so the peaks, the nominal stresses and the formulas are the ones a user's report shows.
"""

from __future__ import annotations

import pytest

from classical.coefficients import kt_net_howland
from fem.case import parse_case
from fem.member.check import BeamRun, check_beam
from fem.member.concentration import Concentration

SIGMA = 10.0  # far-field stress of the plates, MPa

PLATE = """
schema = 1
name = "plate-hole"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 1.0
[geometry]
shape = "rectangle"
length = {W}
depth = {W}
[[geometry.holes]]
center = [{c}, {c}]
radius = {r}
# two point supports, a fixed one and a roller, carry nothing: the loads balance
[[supports]]
at = [0.0, 0.0]
fix = "xy"
[[supports]]
at = [{W}, 0.0]
fix = "y"
{loads}
[mesh]
size = {size}
levels = {levels}
[check]
method = "{method}"
cuts = [{c}]
"""

TENSION = """
[[loads]]
edge = "left"
force = [{mF}, 0.0]
[[loads]]
edge = "right"
force = [{F}, 0.0]
"""

# uniform shear tau on all four edges, each edge load along its own edge
SHEAR = """
[[loads]]
edge = "top"
force = [{F}, 0.0]
[[loads]]
edge = "bottom"
force = [{mF}, 0.0]
[[loads]]
edge = "right"
force = [0.0, {F}]
[[loads]]
edge = "left"
force = [0.0, {mF}]
"""


def _plate(mode: str, W: float = 200.0, r: float = 5.0, size: float = 20.0,
           levels: int = 3) -> BeamRun:
    F = SIGMA * W * 1.0
    loads = (TENSION if mode == "tension" else SHEAR).format(F=F, mF=-F)
    text = PLATE.format(W=W, c=W / 2, r=r, loads=loads, size=size, levels=levels,
                        method="shear-formula" if mode == "tension" else "average")
    return check_beam(parse_case(text, f"plate-{mode}.toml"))


def _hole(run: BeamRun) -> Concentration:
    (c,) = [c for c in run.concentrations if c.feature.kind == "hole"]
    return c


def _formula(c: Concentration, name: str):
    (v,) = [v for v in c.formulas if v.name.startswith(name)]
    return v


def _reactions_vanish(run: BeamRun, load: float) -> None:
    for rx, ry in run.levels[-1].sol.reactions.values():
        assert abs(rx) < 1e-9 * load and abs(ry) < 1e-9 * load


@pytest.fixture(scope="module")
def tension() -> BeamRun:
    return _plate("tension")


@pytest.fixture(scope="module")
def shear() -> BeamRun:
    return _plate("shear")


def test_kirsch_tension(tension):
    """Kirsch (1898); Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 35 (section
    number from memory): a small circular hole in an infinite plate under uniaxial tension sigma
    has the hoop stress
    sigma (1 - 2 cos 2 theta) on its edge, +3 sigma at theta = 90 deg and -sigma at 0.

    Plate W = 20 d (200 mm, d = 10 mm), uniform end tractions, element sizes 20, 10, 5 mm.
    A finite plate deviates from Kirsch: the slow study below measures the square plate's
    own peak at +0.6 % (W = 20 d). Measured here: 3.011 and -1.008 sigma; held to 1 %
    against 3 and 2 % against -1. The supports carry nothing (reactions ~1e-10 N), so the
    plate is loaded by the tractions alone."""
    c = _hole(tension)
    assert c.tension / SIGMA == pytest.approx(3.0, rel=0.01)
    assert c.compression / SIGMA == pytest.approx(-1.0, rel=0.02)
    _reactions_vanish(tension, SIGMA * 200.0)
    k = _formula(c, "Kirsch")
    assert k.kt == pytest.approx(3.0, rel=1e-12)
    assert k.peak == pytest.approx(3.0 * SIGMA, rel=1e-9)  # hand far field = P/(W t)
    assert abs(k.fe_error) < 0.01
    # the nominal is the hand net-section stress N/A_net = P/((W - d) t): tension dominates
    assert c.nominal == pytest.approx(SIGMA * 200.0 / 190.0, rel=1e-9)
    assert c.nominal_basis.startswith("net-section sigma")
    assert c.kt == pytest.approx(abs(c.peak) / c.nominal, rel=1e-12)
    assert c.converged
    (f,) = [f for f in tension.result.findings if f.kind == "concentration"]
    assert f.ratio is None and "hole 0" in f.message and "Kirsch" in f.message


def test_kirsch_pure_shear(shear):
    """Kirsch (1898); Timoshenko & Goodier, Theory of Elasticity, 3rd ed., section 35 (from
    memory; pure shear as tension s along one
    diagonal and compression -s along the other): hoop stress -4 tau sin 2 theta, extremes
    +-4 tau at 45 degrees to the shear axes; tau_xy on the edge is 2 tau sin^2 2 theta, at
    most 2 tau. Same plate and meshes as the tension case. Measured: +4.011, -4.014 tau and
    tau_xy 2.004 tau; held to 2 %.

    The hand side (method "average") gives tau = V/A: 10 MPa on the gross section (Kirsch's
    far field) and 10 x 200/190 MPa on the net section (the nominal; shear dominates)."""
    c = _hole(shear)
    assert c.tension / SIGMA == pytest.approx(4.0, rel=0.02)
    assert c.compression / SIGMA == pytest.approx(-4.0, rel=0.02)
    _reactions_vanish(shear, SIGMA * 200.0)
    k = _formula(c, "Kirsch")
    assert k.kt == pytest.approx(4.0, rel=1e-12)
    assert sorted([k.peak, k.opposite]) == pytest.approx([-40.0, 40.0], rel=1e-9)
    assert abs(k.fe_error) < 0.02 and abs(k.fe_error_opposite) < 0.02
    tau_net = SIGMA * 200.0 / 190.0
    assert c.nominal == pytest.approx(tau_net, rel=1e-9)
    assert c.nominal_basis.startswith("hand shear (average)")
    assert c.tau_peak / SIGMA == pytest.approx(2.0, rel=0.02)
    assert c.ratio == pytest.approx(c.tau_peak / tau_net, rel=1e-12)
    (f,) = [f for f in shear.result.findings if f.kind == "concentration"]
    assert f.ratio == pytest.approx(c.ratio, rel=1e-5) and "unsafe" in f.message
    # the shear nominal VQ/(Ib) of the net section x = 100 (strips 0-95 and 105-200 mm,
    # t = 1): V = 2000 N, I = (200^3 - 10^3)/12 = 666583.3 mm^4, worst at the hole edge
    # y = 105 where Q = 95 x 52.5 = 4987.5 mm^3 and b = 1 mm: 14.964 MPa (shear formula,
    # hand arithmetic); FE |tau_xy| about 2 tau = 20 MPa gives Kt,tau about 1.34
    tau_vq = 2000.0 * 4987.5 / ((200.0**3 - 10.0**3) / 12.0)
    assert c.tau_formula == pytest.approx(tau_vq, rel=1e-3)
    assert c.kt_shear == pytest.approx(c.tau_peak / c.tau_formula, rel=1e-12)
    assert c.kt_shear == pytest.approx(2.0 * SIGMA / tau_vq, rel=0.03)
    assert f"Kt,τ = {c.kt_shear:.3g}" in f.message and "Kt = 4 on the applied shear" in f.message
    # the concentration decides: the average shear misses the doubled shear at the hole
    assert shear.result.verdict == "unsafe"


def test_hole_peak_is_tracked_in_the_convergence_study(tension):
    """The hole's peak is a tracked quantity: one value per level, its GCI (Celik et al.
    2008) and convergence judged like every other quantity of the run."""
    q = tension.result.convergence.quantities["hole 0 peak principal"]
    assert len(q["values"]) == 3 and q["converged"] and not q["singular"]
    assert q["values"][-1] == pytest.approx(abs(_hole(tension).peak), rel=1e-12)


STRIP = """
schema = 1
name = "strip-hole"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 1.0
[geometry]
shape = "rectangle"
length = 250.0
depth = 50.0
[[geometry.holes]]
center = [125.0, 25.0]
radius = {r}
[[supports]]
at = [0.0, 0.0]
fix = "xy"
[[supports]]
at = [250.0, 0.0]
fix = "y"
[[loads]]
edge = "left"
force = [-1000.0, 0.0]
[[loads]]
edge = "right"
force = [1000.0, 0.0]
[mesh]
size = 10.0
levels = 3
[check]
cuts = [125.0]
"""


@pytest.mark.parametrize("d_over_w", [0.2, 0.4])
def test_finite_width_strip(d_over_w: float):
    """A central hole in a strip of width W in tension: Howland (1930), Phil. Trans. R. Soc. A 229,
    49-86, as the polynomial fit of Pilkey &
    Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (Wiley, 2008), Chart 4.1 (fit
    coefficients and chart number from memory)
    (classical.coefficients.kt_net_howland): Kt_net = 3.00 - 3.13 r + 3.66 r^2 - 1.53 r^3,
    r = d/W, on sigma_net = P/((W - d) t): 2.508 at d/W = 0.2, 2.236 at 0.4.

    Strip W = 50 mm, length 5 W (ends 2.5 W from the hole), element sizes 10, 5, 2.5 mm.
    Measured: 2.513 and 2.241 (+0.2 % both); held to 2 %. The hole is too large for
    Kirsch's infinite plate, which is not applied."""
    run = check_beam(parse_case(STRIP.format(r=25.0 * d_over_w), "strip.toml"))
    c = _hole(run)
    assert c.nominal == pytest.approx(1000.0 / (50.0 * (1 - d_over_w)), rel=1e-9)
    assert c.kt == pytest.approx(kt_net_howland(d_over_w), rel=0.02)
    h = _formula(c, "Howland")
    assert h.kt == pytest.approx(kt_net_howland(d_over_w), rel=1e-12)
    assert abs(h.fe_error) < 0.02
    assert not [v for v in c.formulas if v.name.startswith("Kirsch")]
    assert c.converged


def test_loaded_hole_has_no_kt():
    """A hole that carries a pin load is a lug, not a hole in a remote field: its peak is
    reported, without a Kt or a formula."""
    text = STRIP.format(r=5.0).replace(
        '[[loads]]\nedge = "right"\nforce = [1000.0, 0.0]',
        '[[loads]]\nhole = 0\nforce = [1000.0, 0.0]\ndistribution = "cosine"').replace(
        "levels = 3", "levels = 1")
    run = check_beam(parse_case(text, "lug.toml"))
    c = _hole(run)
    assert c.feature.loaded and c.kt is None and c.ratio is None and not c.formulas
    (f,) = [f for f in run.result.findings if f.kind == "concentration"]
    assert "pin load" in f.message


@pytest.mark.slow
@pytest.mark.parametrize("mode, exact", [("tension", 3.0), ("shear", 4.0)])
def test_kirsch_finer(mode: str, exact: float):
    """The Kirsch plates one level finer (sizes down to 2.5 mm, about 84 000 dofs): the peak
    settles at the square plate's own value, measured +0.6 % (tension) and +0.7 % (shear)
    above the infinite plate's 3 and 4 (W = 20 d); still within 1 % and 2 %."""
    c = _hole(_plate(mode, levels=4))
    assert c.tension / SIGMA == pytest.approx(exact, rel=0.01 if mode == "tension" else 0.02)
