"""Hand-versus-FE comparison of the shear stress in a cross-section.

The FE side is :func:`fem.section.solve.solve_section` (Saint-Venant flexure, loads through
the shear centre).  The hand side uses only :mod:`classical` functions on the polygon
outline (:func:`classical.shear.max_shear_formula`, ``shear_profile``, ``average_shear``,
``direct_shear``), applied to the outline turned into the frame of each cut family:

* **shear formula** ``tau = V Q / (I b)``: the shear is resolved along the principal axes
  (u along the axis of I1, v normal to it; for I_xy = 0 simply x and y).  V_v uses cuts
  parallel to u (Q about u, I = I1), V_u cuts parallel to v (I = I2); each peak is the worst
  cut of a scan over the section.  With both components nonzero the two peaks are added as
  vectors, ``sqrt(tau_u^2 + tau_v^2)``: exact where both peak at one point (solid
  doubly-symmetric sections), on the safe side elsewhere.
  The worst cut parallel to the neutral axis (generalised formula, below) is also
  scanned and the larger of the two is ``tau_max_hand``; for one shear component on a
  section with I_xy = 0 both are the classical horizontal (V_y) or vertical (V_x) cuts.
* **thin-wall** (the default ``auto`` choice for thin open and closed walls,
  :mod:`fem.section.hand_method`): the shear flow along the centre line, peak |q|/t; for
  it ``tau_max_hand`` is that peak (the shear formula on cuts across the wall), and
  ``tau_chord_hand`` keeps the worst cut parallel to an axis.
* **average** / **single-shear**: ``|V| / A``.
* **double-shear**: a pin carrying F = |V| through two shear planes; each plane carries
  V/2, so the FE section is solved with V/2 and the hand value is ``F / (2 A)``.

The **neutral axis** is the line through the centroid on which the bending stress rate
a x + b y vanishes (horizontal for V_y on a section with I_xy = 0); n = (a, b)/|(a, b)| is
its unit normal and s runs along d = (n_y, -n_x) from the centroid.  Profiles carry the
signed FE component tau . n and the hand value of the generalised shear formula for a
cut parallel to the axis, ``|(a, b)| Q_n / L`` (Q_n the first moment about the axis of
the part beyond the cut, L the chord length): the mean of tau . n over any such cut
equals it exactly in the elastic solution, so ``tau_fe_mean`` is a check of the FE.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import asdict, dataclass, field, replace

import numpy as np

from classical.sections import Outline, SectionProperties, chord_segments, polygon_properties
from classical.shear import average_shear, direct_shear, max_shear_formula, shear_profile
from fem.case.model import SECTION_METHODS, Joint, SectionGeometry, Units
from fem.case.plates import drawn_section
from fem.results import Finding, MeshInfo
from fem.section.hand_method import HandChoice, choose_method, thin_wall_peak
from fem.section.joints import JointFlow, default_joints, joint_findings, joint_flows
from fem.section.mesh import SectionMesh, SectionShape, mesh_section, section_shape
from fem.section.solve import SectionSolution, solve_section

__all__ = ["CutProfile", "SectionCheck", "check_section", "METHODS"]

#: hand methods of a section check; ``auto`` picks by the section (fem.section.hand_method)
METHODS = SECTION_METHODS
DEFAULT_UNITS = Units()   # mm, N, MPa: what a bare call means

@dataclass(frozen=True)
class CutProfile:
    """FE tau . n along a cut parallel to the neutral axis at ``offset`` along n."""

    offset: float
    x: tuple[float, ...]
    y: tuple[float, ...]
    s: tuple[float, ...]
    tau_fe: tuple[float, ...]
    tau_hand: float
    tau_fe_mean: float


@dataclass(frozen=True)
class SectionCheck:
    """Result of :func:`check_section`; ``to_dict`` gives the contract's ``section`` object."""

    shape: str
    method: str                 # the method used (``auto`` resolved)
    method_reason: str          # why that method, in plain words
    tolerance: float
    V: tuple[float, float]
    V_solved: tuple[float, float]
    A: float
    I: dict[str, float]  # noqa: E741  (the contract's key)
    centroid: tuple[float, float]
    shear_centre: tuple[float, float]
    shear_centre_nu: tuple[float, float]
    J: float
    G: float
    tau_max_fe: float
    tau_at: tuple[float, float]
    tau_max_regular: float
    tau_at_regular: tuple[float, float]
    tau_max_hand: float
    tau_chord_hand: float
    tau_avg_hand: float
    hand: float
    ratio: float                # regular peak / hand: the headline (corner zones left out)
    ratio_raw: float            # raw peak anywhere / hand
    hand_value: float | None
    hand_properties: dict[str, float]
    neutral_axis: CutProfile
    cuts: tuple[CutProfile, ...]
    shear_coefficients: tuple[float, float]
    torsion_stress_per_torque: float
    resultant: dict[str, object]
    mesh: MeshInfo
    timings: dict[str, float]
    findings: tuple[Finding, ...]
    solution: SectionSolution | None = field(default=None, repr=False, compare=False)
    joints: tuple[JointFlow, ...] = ()

    def to_dict(self) -> dict:
        """The ``section`` object of results.json (contract keys first, then extras)."""
        na = self.neutral_axis
        return {
            "A": self.A, "I": dict(self.I), "centroid": list(self.centroid),
            "shear_centre": list(self.shear_centre), "J": self.J,
            "tau_max_fe": self.tau_max_fe, "tau_at": list(self.tau_at),
            "tau_max_hand": self.tau_max_hand, "tau_avg_hand": self.tau_avg_hand,
            "ratio": self.ratio, "ratio_raw": self.ratio_raw,
            "hand_method_used": self.method, "hand_method_reason": self.method_reason,
            "neutral_axis": {"s": list(na.s), "tau_fe": list(na.tau_fe),
                             "tau_hand": [na.tau_hand] * len(na.s),
                             "x": list(na.x), "y": list(na.y), "tau_fe_mean": na.tau_fe_mean},
            "method": self.method, "hand": self.hand, "hand_value": self.hand_value,
            "V": list(self.V), "V_solved": list(self.V_solved),
            "shear_centre_nu": list(self.shear_centre_nu),
            "tau_max_regular": self.tau_max_regular,
            "tau_at_regular": list(self.tau_at_regular), "tau_chord_hand": self.tau_chord_hand,
            "G": self.G, "GJ": self.G * self.J,
            "shear_coefficients": list(self.shear_coefficients),
            "torsion_stress_per_torque": self.torsion_stress_per_torque,
            "hand_properties": dict(self.hand_properties),
            "cuts": [{**asdict(c), "tau_hand": [c.tau_hand] * len(c.s)} for c in self.cuts],
            "resultant": dict(self.resultant),
        }

    def results(self) -> dict:
        """The section-specific top-level parts of results.json."""
        return {"section": self.to_dict(), "mesh": asdict(self.mesh),
                "equilibrium": {"applied": list(self.resultant["applied"]),
                                "reactions": list(self.resultant["fe"]),
                                "relative_error": self.resultant["relative_error"]},
                "findings": [asdict(f) for f in self.findings],
                "timings": dict(self.timings),
                **({"joints": [j.to_dict() for j in self.joints]} if self.joints else {})}


def _rotated(outline: Outline, c: tuple[float, float], phi: float) -> Outline:
    """Outline in the frame turned by phi about c: X = R(-phi) (p - c)."""
    cs, sn = math.cos(phi), math.sin(phi)
    rot = np.array([[cs, sn], [-sn, cs]])
    return Outline((outline.outer - c) @ rot.T, tuple((h - c) @ rot.T for h in outline.holes))


def _peak(outline: Outline, c: tuple[float, float], phi: float, V: float) -> float:
    """Worst shear-formula cut of the outline turned by phi, cuts along the new x axis
    (classical :func:`max_shear_formula`, I = Ixx of the turned outline)."""
    return 0.0 if V == 0.0 else abs(max_shear_formula(_rotated(outline, c, phi), V, 201).tau_max)


def _shear_formula_peak(outline: Outline, V: tuple[float, float]) -> tuple[float, float]:
    """Shear-formula peak in the principal frame, components added as vectors; also
    returns the principal angle."""
    p = polygon_properties(outline)
    th, c = p.angle, (p.cx, p.cy)
    vu = math.cos(th) * V[0] + math.sin(th) * V[1]
    vv = -math.sin(th) * V[0] + math.cos(th) * V[1]
    return math.hypot(_peak(outline, c, th, vv), _peak(outline, c, th + math.pi / 2, vu)), th


def _cut(sol: SectionSolution, o_na: Outline, frame: tuple, v_eff: float, eta: float,
         V: tuple[float, float], npts: int) -> CutProfile:
    c, d, n = frame
    segs = chord_segments(o_na, eta)
    total = sum(hi - lo for lo, hi in segs)
    xi = [np.linspace(lo, hi, max(11, int(npts * (hi - lo) / total))) for lo, hi in segs]
    xs = np.concatenate(xi)
    pts = c + xs[:, None] * d + eta * n
    tau = sol.probe(pts, *V) @ n
    mean = 0.0  # trapezoidal rule over each chord segment
    for k0, x in zip(np.cumsum([0] + [len(x) for x in xi[:-1]]), xi, strict=True):
        t = tau[k0:k0 + len(x)]
        mean += float(np.sum(0.5 * (t[1:] + t[:-1]) * np.diff(x)))
    hand = shear_profile(o_na, v_eff, [eta])[0]
    return CutProfile(float(eta), tuple(pts[:, 0]), tuple(pts[:, 1]), tuple(xs),
                      tuple(tau), float(hand), float(mean / total))


def _near(p: np.ndarray, pts: np.ndarray, r: float) -> bool:
    return len(pts) > 0 and float(np.min(np.linalg.norm(pts - p, axis=1))) <= r


@dataclass(frozen=True)
class _FePeaks:
    """The FE peak |tau| anywhere and outside the discs around sharp re-entrant corners."""

    peak: float
    at: np.ndarray
    peak_regular: float
    at_regular: np.ndarray
    sharp: np.ndarray


@dataclass(frozen=True)
class _HandSide:
    """The hand values and the neutral-axis frame their profiles are taken in."""

    tau_max: float            # shear formula (or thin-wall) peak
    tau_chord: float          # worst cut parallel to an axis
    tau_avg: float
    hand: float               # the chosen method's value
    props: SectionProperties  # polygon_properties of the outline
    o_na: Outline             # outline in the neutral-axis frame
    frame: tuple              # (centroid, d along the axis, n normal to it)
    v_eff: float              # |(a, b)| I_n: the generalised formula's shear
    phi: float                # angle of the neutral axis


def _solved_shear(method: str, Vx: float, Vy: float) -> tuple[float, float]:
    """The shear the section is solved for: the pin force shared by two planes for
    ``double-shear``, else (Vx, Vy)."""
    f = 0.5 if method == "double-shear" else 1.0
    return (f * Vx, f * Vy)


def _fe_peaks(sol: SectionSolution, geom: SectionShape, Vs: tuple[float, float],
              size: float) -> _FePeaks:
    """Peak |tau| at the element corners, anywhere and outside discs of radius
    max(size, 0.05 sqrt(A)) around sharp re-entrant corners (fixed with refinement, so
    verdicts stay put)."""
    corners = sol.corners.reshape(-1, 2)
    mag = np.linalg.norm(sol.stress(*Vs), axis=2).ravel()
    k = int(np.argmax(mag))
    sharp = geom.sharp_reentrant_corners()
    regular = np.ones(len(mag), dtype=bool)
    r_ex = max(size, 0.05 * math.sqrt(sol.A))
    for q in sharp:
        regular &= np.linalg.norm(corners - q, axis=1) > r_ex
    kr = int(np.flatnonzero(regular)[np.argmax(mag[regular])])
    return _FePeaks(float(mag[k]), corners[k], float(mag[kr]), corners[kr], sharp)


def _hand_side(geom: SectionShape, sol: SectionSolution, shape: str, params: dict, method: str,
               V: tuple[float, float], Vs: tuple[float, float]) -> _HandSide:
    """The hand values (module doc) and the neutral-axis frame: the FE bending-rate
    coefficients give the axis, the hand Q comes from the polygon."""
    hp = polygon_properties(geom.outline)
    tau_avg = average_shear(math.hypot(*V), hp.A) if method != "double-shear" else \
        direct_shear(math.hypot(*V), hp.A, planes=2)
    Iinv = np.linalg.inv([[sol.Iyy, sol.Ixy], [sol.Ixy, sol.Ixx]])
    ab = Iinv @ (np.array(Vs) / np.hypot(*Vs))  # direction only: no underflow for tiny V
    n = ab / np.linalg.norm(ab)
    d = np.array([n[1], -n[0]])
    phi = math.atan2(d[1], d[0])
    ab_h = np.linalg.inv([[hp.Iyy, hp.Ixy], [hp.Ixy, hp.Ixx]]) @ np.array(Vs)
    o_na = _rotated(geom.outline, (hp.cx, hp.cy), phi)
    frame = (np.array(sol.centroid), d, n)
    v_eff = float(np.linalg.norm(ab_h)) * polygon_properties(o_na).Ixx  # |(a, b)| I_n
    tau_sf, theta = _shear_formula_peak(geom.outline, Vs)
    if min(abs(math.sin(phi - theta)), abs(math.cos(phi - theta))) > 1e-9:  # other cuts
        tau_sf = max(tau_sf, _peak(geom.outline, (hp.cx, hp.cy), phi, v_eff))
    tau_chord = tau_sf
    if method == "thin-wall":
        tau_sf = thin_wall_peak(shape, params, *Vs).tau
    hand = tau_sf if method in ("shear-formula", "thin-wall") else tau_avg
    return _HandSide(tau_sf, tau_chord, tau_avg, hand, hp, o_na, frame, v_eff, phi)


def _profiles(sol: SectionSolution, hs: _HandSide, Vs: tuple[float, float]
              ) -> tuple[CutProfile, tuple[CutProfile, ...]]:
    """FE tau . n along the neutral axis and along cuts parallel to it at 0, 1/4, 1/2
    and 3/4 of the way to each extreme fibre."""
    na = _cut(sol, hs.o_na, hs.frame, hs.v_eff, 0.0, Vs, 201)
    eta = np.concatenate([r[:, 1] for r in hs.o_na.rings])
    levels = sorted({*(fr * eta.max() for fr in (0.25, 0.5, 0.75)),
                     *(fr * eta.min() for fr in (0.25, 0.5, 0.75)), 0.0})
    return na, tuple(_cut(sol, hs.o_na, hs.frame, hs.v_eff, e, Vs, 101) for e in levels)


def _singular_finding(geom: SectionShape, pk: _FePeaks, hand: float, size: float, S: str
                      ) -> Finding | None:
    """``singular`` when the raw peak sits at a sharp re-entrant corner."""
    if not _near(pk.at, pk.sharp, 1e-9 * size + 0.5 * size):
        return None
    ratio_raw, ratio = pk.peak / hand, pk.peak_regular / hand
    kc = int(np.argmin(np.linalg.norm(pk.sharp - pk.at, axis=1)))
    alpha = float(geom.sharp_reentrant_angles()[kc])
    return Finding("singular", [float(pk.at[0]), float(pk.at[1])], ratio_raw,
        f"The FE peak {pk.peak:.4g} {S} sits at a sharp re-entrant corner (material angle "
        f"{math.degrees(alpha):.0f} degrees), where the elastic shear stress is singular, "
        f"growing like r^({math.pi / alpha - 1:.3f}) towards the corner: it keeps growing "
        f"as the mesh is refined, so its value here depends on the mesh. The headline "
        f"ratio uses the peak away from the corners, {pk.peak_regular:.4g} {S} ({ratio:.3f} x "
        f"the hand value); the corner peak is {ratio_raw:.3f} x. Model the real root radius "
        f"(fillet) of the corner to get its finite peak.")


def _edge_finding(na: CutProfile, method: str, lim: float, S: str) -> Finding | None:
    """``edge-excess`` when tau at an end of the neutral axis exceeds the chord formula."""
    na_tau = np.asarray(na.tau_fe)
    s = np.asarray(na.s)
    ends = np.zeros(len(s), dtype=bool)
    ends[[0, -1]] = True
    jumps = np.flatnonzero(np.diff(s) > 2 * np.median(np.diff(s)))
    ends[jumps] = ends[jumps + 1] = True
    k_end = int(np.flatnonzero(ends)[np.argmax(na_tau[ends])])
    edge_ratio = float(na_tau[k_end] / na.tau_hand) if na.tau_hand > 0 else 0.0
    p_end = (float(na.x[k_end]), float(na.y[k_end]))
    if not (edge_ratio > lim and method != "thin-wall"):  # a chord-formula finding only
        return None
    return Finding("edge-excess", list(p_end), edge_ratio,
        f"At the end of the neutral axis the FE shear stress is {na_tau[k_end]:.4g} {S}, "
        f"{edge_ratio:.3f} x the shear formula VQ/(Ib) = {na.tau_hand:.4g} {S} for that cut: "
        f"the formula gives the average along the cut and assumes the stress uniform "
        f"across the width, which fails for wide chords (Poisson effect: for a square "
        f"about 1.13 x, for width = 4 x depth about 2 x, Timoshenko & Goodier).")


def _peak_finding(geom: SectionShape, sol: SectionSolution, pk: _FePeaks, hs: _HandSide,
                  method: str, size: float, lim: float, edge_flagged: bool, units: Units
                  ) -> Finding | None:
    """``junction-peak`` (at a flange-web junction or re-entrant corner) or
    ``method-excess`` (elsewhere) when the regular peak exceeds the hand value."""
    ratio, at_r, peak_r, hand = pk.peak_regular / hs.hand, pk.at_regular, pk.peak_regular, \
        hs.hand
    if not ratio > lim:
        return None
    S, L = units.stress, units.length
    fillets = geom.filleted_reentrant_corners()
    r_max = max((float(r.radii.max()) for r in geom.rings if r.circle is None and r.radii.size),
                default=0.0)
    if _near(at_r, fillets, 2.0 * r_max + size) or _near(at_r, pk.sharp, 3.0 * size):
        return Finding("junction-peak", [float(at_r[0]), float(at_r[1])], ratio,
            f"The peak {peak_r:.4g} {S} at ({at_r[0]:.4g}, {at_r[1]:.4g}) {L} is at a "
            f"flange-web junction / re-entrant corner, "
            f"{ratio:.3f} x the hand value {hand:.4g} {S}: the hand value averages the stress "
            f"over the cut and misses the concentration where the section changes width.")
    n = hs.frame[2]
    if edge_flagged and abs((at_r - sol.centroid) @ n) < size:
        return None
    return Finding("method-excess", [float(at_r[0]), float(at_r[1])], ratio,
        f"The FE peak {peak_r:.4g} {S} at ({at_r[0]:.4g}, {at_r[1]:.4g}) {L} is "
        f"{ratio:.3f} x the {method} value {hand:.4g} {S}: the hand value is an average "
        f"(over a cut, or over the whole section), and the elastic stress here is not "
        f"uniform across the cuts through this point.")


def _user_finding(pk: _FePeaks, hand_value: float | None, lim: float, S: str
                  ) -> Finding | None:
    """``hand-value`` when the regular peak exceeds the user's own hand value."""
    user_ratio = pk.peak_regular / hand_value if hand_value else None
    if user_ratio is None or not user_ratio > lim:
        return None
    at_r = pk.at_regular
    return Finding("hand-value", [float(at_r[0]), float(at_r[1])], user_ratio,
        f"The FE peak {pk.peak_regular:.4g} {S} exceeds your hand value {hand_value:.4g} {S} by "
        f"{100 * (user_ratio - 1):.1f} %.")


def _findings(geom: SectionShape, sol: SectionSolution, pk: _FePeaks, hs: _HandSide,
              na: CutProfile, method: str, size: float, tolerance: float,
              hand_value: float | None, joints: tuple[JointFlow, ...], units: Units
              ) -> list[Finding]:
    """Every finding of one mesh, in order (joints last). The verdict is decided from the
    findings of the finest level by `fem.verdict.decide` (fem.section.check), not here."""
    lim = 1.0 + tolerance
    S = units.stress
    singular = _singular_finding(geom, pk, hs.hand, size, S)
    edge = _edge_finding(na, method, lim, S)
    found = [singular, edge,
             _peak_finding(geom, sol, pk, hs, method, size, lim, edge is not None, units),
             _user_finding(pk, hand_value, lim, S)]
    return [f for f in found if f is not None] + joint_findings(joints, tolerance, units)


def check_section(shape: str, params: dict, E: float, nu: float, Vx: float, Vy: float,
                  size: float, order: int = 2, method: str = "auto",
                  tolerance: float = 0.05, hand_value: float | None = None,
                  joints: Sequence[Joint] = (),
                  check_dofs: Callable[[int], None] | None = None,
                  units: Units = DEFAULT_UNITS) -> SectionCheck:
    """Solve a section for shear (Vx, Vy) through its shear centre and compare with hand.

    The recipe: choose the hand method -> mesh and solve -> FE peaks (`_fe_peaks`) ->
    hand side (`_hand_side`) -> profiles (`_profiles`) -> joints (`joint_flows`) ->
    findings (`_findings`) -> `SectionCheck` (`_assemble`).

    Parameters
    ----------
    shape, params
        Shape name and parameters as in the case contract (see :mod:`fem.section.mesh`).
    E, nu
        Young's modulus [stress] (for G = E / (2 (1 + nu)), G J, G k A) and Poisson's ratio.
    Vx, Vy
        Shear force components [force]; for ``double-shear`` the pin force.
    size, order
        Target element size [length] and element order (1 or 2).
    method
        ``auto`` (thin walls ``thin-wall``, solid sections ``shear-formula``; see
        :func:`fem.section.hand_method.choose_method`) | ``shear-formula`` | ``thin-wall`` |
        ``average`` | ``single-shear`` | ``double-shear`` (module doc).
    tolerance
        A finding where the FE exceeds the hand value by more than this fraction.
    hand_value
        Optional user's own peak shear stress [stress]; exceeded -> a ``hand-value`` finding.
    joints
        Joint lines (:class:`fem.case.model.Joint`); none given on a ``built-up``
        section -> every plate interface (:func:`fem.section.joints.default_joints`).
    check_dofs
        Called with the real dof count of the mesh before anything is assembled (the size
        guard on the real model, `fem.case.sizing.check_real_dofs`); it raises to stop.
    units
        The case's units: the names in the finding messages, and the force unit in which
        the joint flows are printed (`fem.case.model.Units.user_force`).

    Returns
    -------
    SectionCheck
        The properties, peaks, profiles and findings of one mesh (a refinement study
        repeats the call with smaller ``size``; its verdict is `fem.verdict.decide` over
        the findings, in `fem.section.check`). ``tau_max_regular`` is the peak outside
        discs of radius max(size, 0.05 sqrt(A)) around sharp re-entrant corners; the
        findings and the headline ``ratio`` use it; ``tau_max_fe`` and ``ratio_raw`` are
        the peak anywhere (which at a singular corner depends on the mesh).
    """
    if method not in METHODS:
        raise ValueError(f"unknown method {method!r}; valid methods: {', '.join(METHODS)}")
    if Vx == 0.0 and Vy == 0.0:
        raise ValueError("the shear [Vx, Vy] must not be zero")
    choice = choose_method(shape, params, method)
    drawn = drawn_section(SectionGeometry(shape, params))
    geom = replace(section_shape(drawn.shape, **drawn.params), shape=shape)
    smesh = mesh_section(geom, size, order)
    if check_dofs is not None:   # the real count (one dof a node), before any assembly
        check_dofs(smesh.nodes)
    sol = solve_section(smesh, nu)
    t0 = time.perf_counter()
    Vs = _solved_shear(choice.method, Vx, Vy)
    pk = _fe_peaks(sol, geom, Vs, size)
    hs = _hand_side(geom, sol, shape, params, choice.method, (Vx, Vy), Vs)
    na, cuts = _profiles(sol, hs, Vs)
    flows = joint_flows(sol, geom.outline, hs.props, default_joints(shape, params, joints), Vs)
    findings = _findings(geom, sol, pk, hs, na, choice.method, size, tolerance, hand_value,
                         flows, units)
    return replace(_assemble(shape, choice, geom, smesh, sol, pk, hs, na, cuts, findings,
                             E=E, V=(Vx, Vy), Vs=Vs, size=size, order=order,
                             tolerance=tolerance, hand_value=hand_value,
                             t_post=time.perf_counter() - t0), joints=flows)


def _assemble(shape: str, choice: HandChoice, geom: SectionShape, smesh: SectionMesh,
              sol: SectionSolution,
              pk: _FePeaks, hs: _HandSide, na: CutProfile, cuts: tuple[CutProfile, ...],
              findings: list[Finding], *, E: float, V: tuple[float, float],
              Vs: tuple[float, float], size: float, order: int, tolerance: float,
              hand_value: float | None, t_post: float) -> SectionCheck:
    """The `SectionCheck` of one mesh from its named parts."""
    fe_res = sol.resultant @ np.array(Vs)
    rel = float(np.linalg.norm(fe_res - Vs) / np.linalg.norm(Vs))
    hp = hs.props
    timings = {"mesh": smesh.seconds, "assemble": sol.timings["assemble"],
               "solve": sol.timings["solve"], "post": sol.timings["post"] + t_post}
    return SectionCheck(
        shape=shape, method=choice.method, method_reason=choice.reason, tolerance=tolerance,
        V=V, V_solved=Vs,
        A=sol.A, I={"xx": sol.Ixx, "yy": sol.Iyy, "xy": sol.Ixy}, centroid=sol.centroid,
        shear_centre=sol.shear_centre, shear_centre_nu=sol.shear_centre_nu, J=sol.J,
        G=E / (2.0 * (1.0 + sol.nu)),
        tau_max_fe=pk.peak, tau_at=(float(pk.at[0]), float(pk.at[1])),
        tau_max_regular=pk.peak_regular,
        tau_at_regular=(float(pk.at_regular[0]), float(pk.at_regular[1])),
        tau_max_hand=hs.tau_max, tau_chord_hand=hs.tau_chord, tau_avg_hand=hs.tau_avg,
        hand=hs.hand, ratio=pk.peak_regular / hs.hand, ratio_raw=pk.peak / hs.hand,
        hand_value=hand_value,
        hand_properties={"A": hp.A, "cx": hp.cx, "cy": hp.cy, "Ixx": hp.Ixx, "Iyy": hp.Iyy,
                         "Ixy": hp.Ixy, "I1": hp.I1, "I2": hp.I2, "angle": hp.angle},
        neutral_axis=na, cuts=cuts, shear_coefficients=sol.shear_coefficients,
        torsion_stress_per_torque=float(np.linalg.norm(sol.tau_torsion, axis=2).max() / sol.J),
        resultant={"applied": [float(v) for v in Vs], "fe": [float(v) for v in fe_res],
                   "relative_error": rel},
        mesh=MeshInfo(smesh.nodes, smesh.elements, sol.dofs, float(size), order,
                      curved=order == 2 and any(r.circle is not None or bool(r.radii.any())
                                                or r.bulges is not None for r in geom.rings),
                      solver=sol.solver),
        timings=timings, findings=tuple(findings), solution=sol,
    )
