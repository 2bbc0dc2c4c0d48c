"""FE against hand at each cut, and the findings in plain words.

The findings feed the one verdict rule (`fem.verdict.decide`): those whose kind is in
`fem.verdict.DECIDING_KINDS` decide it; bearing and combined-stress findings inform and
do not change the verdict on the shear check.

Finding kinds at a cut name the cause: ``concentration`` when the nearest station is a hole
or a cut-out (the feature concentrates the shear), ``short-beam`` when it is a load, a
support or a change of section (a zone end), ``shear-excess`` when none is within a depth.
With a direct-shear method (single or double shear, tau = F/(n A)) a ``method-excess``
finding names the method and n at the worst cut.
"""

from __future__ import annotations

import numpy as np

from fem.case.model import Case
from fem.case.outline import member_depth
from fem.member.hand import total_load
from fem.member.level import ExcludedZone, Level, nearest_station
from fem.member.recovery import von_mises
from fem.results import CutResult, Finding, Peak, Profile, significant

__all__ = ["cut_results", "peak_result", "beam_findings", "stations",
           "DIRECT_PLANES", "FEATURE_STATIONS"]

#: shear planes n of the direct-shear methods, tau = F/(n A)
DIRECT_PLANES = {"single-shear": 1, "double-shear": 2}
#: station names of geometric features whose excess is a concentration, not a short beam
FEATURE_STATIONS = ("hole ", "cut-out ")


def cut_results(level: Level) -> list[CutResult]:
    out = []
    # hand shear below this share of the largest is round-off (e.g. midspan of a symmetric
    # beam): no ratio is formed there
    floor = 1e-9 * max((hd.tau_method for hd in level.cuts_hand), default=0.0)
    for fe, hd in zip(level.cuts_fe, level.cuts_hand, strict=True):
        mat = level.field.material  # plane strain: sz = nu (sx + sy) on both sides
        vm_fe = float(np.max(von_mises(mat, fe.sxx, fe.syy, fe.txy)))
        vm_hand = float(np.max(von_mises(mat, hd.sigma_x, 0.0 * hd.sigma_x, hd.tau)))
        # a cut where the hand side carries no shear (a load-free overhang) has no ratio
        ratio = fe.tau_max / hd.tau_method if hd.tau_method > floor else None
        out.append(CutResult(
            x=fe.x, V_fe=fe.V, V_hand=hd.V, M_fe=fe.M, M_hand=hd.M,
            tau_max_fe=fe.tau_max, y_at_tau_max_fe=fe.y_at_tau_max,
            tau_max_hand=hd.tau_method, tau_avg_hand=hd.tau_avg, ratio=ratio,
            sigma_x_max_fe=fe.sigma_x_max, sigma_x_max_hand=hd.sigma_x_max,
            profile=Profile(y=fe.y.tolist(), tau_fe=fe.txy.tolist(), tau_hand=hd.tau.tolist(),
                            sigma_x_fe=fe.sxx.tolist(), sigma_x_hand=hd.sigma_x.tolist()),
            N_fe=fe.N, N_hand=hd.N, A=hd.section.area, I=hd.section.inertia,
            centroid_y=hd.section.centroid, tau_formula_hand=hd.tau_max_formula,
            von_mises_max_fe=vm_fe, von_mises_max_hand=vm_hand))
    return out


def peak_result(level: Level) -> Peak:
    pk = level.peaks
    return Peak(tau_max=pk["tau"][0], tau_at=list(pk["tau"][1]),
                von_mises_max=pk["von_mises"][0], von_mises_at=list(pk["von_mises"][1]),
                principal_max=pk["principal"][0], principal_at=list(pk["principal"][1]))


def stations(case: Case, level: Level) -> list[tuple[str, float, float]]:
    """Named x-extents of loads, supports and changes of section."""
    g = case.beam
    out = []
    for p in level.mm.supports + level.mm.loads:
        kind = "support" if p.name.startswith("support") else "load"
        if p.hole is not None:
            h = g.holes[p.hole]
            out.append((f"pin {kind} on hole {p.hole}", h.center[0] - h.radius,
                        h.center[0] + h.radius))
        else:
            xs = [q[0] for q in p.ends]
            out.append((p.name, min(xs), max(xs)))  # e.g. "load-0", "support-1"
    for k, h in enumerate(g.holes):
        out.append((f"hole {k}", h.center[0] - h.radius, h.center[0] + h.radius))
    for k, c in enumerate(g.cutouts):
        out.append((f"cut-out {k}", c.corner[0], c.corner[0] + c.size[0]))
    for k, z in enumerate(g.zones):
        out.append((f"zone {k} end", z.corner[0], z.corner[0]))
        out.append((f"zone {k} end", z.corner[0] + z.size[0], z.corner[0] + z.size[0]))
    return out


def beam_findings(case: Case, level: Level, cuts: list[CutResult], peak: Peak,
                  zones: list[ExcludedZone]) -> list[Finding]:
    u = case.units
    L, S = u.length, u.stress
    tol = case.check.tolerance
    depth = member_depth(case.beam)
    st = stations(case, level)
    method = case.check.method
    out: list[Finding] = []
    inside_patch = [any(min(q[0] for q in p.ends) <= c.x <= max(q[0] for q in p.ends)
                        for p in level.mm.supports + level.mm.loads if p.hole is None)
                    for c in cuts]
    worst_vm: tuple[float, CutResult] | None = None
    for c, under in zip(cuts, inside_patch, strict=True):
        if c.von_mises_max_hand > 0 and not under:
            rv = c.von_mises_max_fe / c.von_mises_max_hand
            if worst_vm is None or rv > worst_vm[0]:
                worst_vm = (rv, c)
        if c.ratio is not None and c.ratio > 1 + tol:
            name, dist = nearest_station(c.x, st)
            near = dist <= depth
            kind = (("concentration" if name.startswith(FEATURE_STATIONS) else "short-beam")
                    if near else "shear-excess")
            why = _why(name, dist, depth, L) if near else (
                "the stress distribution over the cut departs from the hand method's "
                "assumption")
            out.append(Finding(kind=kind, at=[c.x, c.y_at_tau_max_fe], ratio=significant(c.ratio),
                               message=(f"At x = {c.x:g} {L} the FE shear stress peaks at "
                                        f"{c.tau_max_fe:.4g} {S} (y = {c.y_at_tau_max_fe:.4g} "
                                        f"{L}), {100 * (c.ratio - 1):.1f} % above the {method} "
                                        f"value {c.tau_max_hand:.4g} {S}: {why}.")))
    out += _direct_shear(case, cuts)
    if worst_vm is not None and worst_vm[0] > 1 + tol:
        rv, c = worst_vm
        out.append(Finding(kind="combined-stress", at=[c.x, c.y_at_tau_max_fe],
                           ratio=significant(rv),
                           message=(f"At x = {c.x:g} {L} the FE von Mises stress reaches "
                                    f"{c.von_mises_max_fe:.4g} {S}, {100 * (rv - 1):.1f} % above "
                                    f"the hand combination of σ = N/A + M y/I and VQ/(Ib) "
                                    f"({c.von_mises_max_hand:.4g} {S}); the worst cut of "
                                    "those not under a patch.")))
    out += _bearing(case, level, cuts)
    ys = case.material.yield_stress
    if ys and peak.von_mises_max > ys:
        out.append(Finding(kind="combined-stress", at=peak.von_mises_at,
                           ratio=significant(peak.von_mises_max / ys),
                           message=(f"The FE von Mises peak {peak.von_mises_max:.4g} {S} at "
                                    f"({peak.von_mises_at[0]:.4g}, {peak.von_mises_at[1]:.4g}) "
                                    f"{L} exceeds the yield stress {ys:g} {S} (utilisation "
                                    f"{peak.von_mises_max / ys:.2f}); linear results beyond "
                                    "yield overstate the stress.")))
    hv = case.check.hand_value
    if hv is not None and peak.tau_max > (1 + tol) * hv:
        out.append(Finding(kind="hand-value", at=peak.tau_at, ratio=significant(peak.tau_max / hv),
                           message=(f"Your hand value {hv:g} {S} is exceeded: the FE shear "
                                    f"stress peaks at {peak.tau_max:.4g} {S} at "
                                    f"({peak.tau_at[0]:.4g}, {peak.tau_at[1]:.4g}) {L}, "
                                    f"{100 * (peak.tau_max / hv - 1):.1f} % above it.")))
    for z in zones:
        out.append(Finding(kind="excluded", at=list(z.at), ratio=None,
                           message=(f"Peaks within {z.radius:g} {L} of ({z.at[0]:.4g}, "
                                    f"{z.at[1]:.4g}) {L} are left out: {z.why} is an "
                                    "idealisation whose local stress has no finite limit.")))
    return out


def _direct_shear(case: Case, cuts: list[CutResult]) -> list[Finding]:
    """A `method-excess` finding at the worst cut when a direct-shear hand value
    tau = F/(n A) (n = 1 single, 2 double shear) is exceeded beyond the tolerance."""
    n = DIRECT_PLANES.get(case.check.method)
    over = [c for c in cuts if c.ratio is not None and c.ratio > 1 + case.check.tolerance]
    if n is None or not over:
        return []
    c = max(over, key=lambda q: q.ratio)
    L, F, S = case.units.length, case.units.force, case.units.stress
    words = "single" if n == 1 else "double"
    force = total_load(case)
    formula, split = ("F/A", f"{c.A:.4g} {L}²") if n == 1 else (
        f"F/({n} A)", f"({n} × {c.A:.4g} {L}²)")
    return [Finding(kind="method-excess", at=[c.x, c.y_at_tau_max_fe], ratio=significant(c.ratio),
                    message=(f"At x = {c.x:g} {L} the FE shear stress peaks at "
                             f"{c.tau_max_fe:.4g} {S} (y = {c.y_at_tau_max_fe:.4g} {L}), "
                             f"{c.ratio:.3g} times the {words}-shear value {formula} = "
                             f"{case.units.user_force(force):.6g} {F} / {split} = "
                             f"{c.tau_max_hand:.4g} "
                             f"{S} with n = {n} shear plane{'s' if n > 1 else ''}: direct "
                             f"shear spreads the force evenly over the section, the elastic "
                             f"shear peaks inside it (the shear formula gives "
                             f"{c.tau_formula_hand:.4g} {S} here)."))]


def _why(name: str, dist: float, depth: float, L: str) -> str:
    """Plain-words cause of an excess near a station."""
    where = (f"the cut crosses the extent of {name}" if dist == 0.0
             else f"the cut is {dist:.4g} {L} ({dist / depth:.2f} depths) from {name}")
    if name.startswith(FEATURE_STATIONS):
        return (f"{where}, which concentrates the shear that the formula spreads as a "
                "parabola over the section")
    return (f"{where}, where plane sections do not stay plane and the shear formula's "
            "slender-beam assumption fails")


def _bearing(case: Case, level: Level, cuts: list[CutResult]) -> list[Finding]:
    """sigma_yy under horizontal patches, which a shear-only check ignores."""
    out = []
    f = level.field
    S, L = case.units.stress, case.units.length
    governing = max((c.tau_max_hand for c in cuts), default=0.0)
    depth = member_depth(case.beam)  # the band under a patch: at most a tenth of it
    patches = list(zip(level.mm.supports, case.supports, strict=True))
    patches += list(zip(level.mm.loads, case.loads, strict=True))
    for p, spec in patches:
        if not p.is_horizontal() or p.length <= 0:
            continue
        xs = sorted(q[0] for q in p.ends)
        y = p.ends[0][1]
        near = ((f.p[0] >= xs[0]) & (f.p[0] <= xs[-1])
                & (np.abs(f.p[1] - y) <= min(0.25 * p.length, 0.1 * depth)))
        if not near.any():
            continue
        syy = np.abs(f.nodal["syy"][near])
        k = int(np.argmax(syy))
        peak = float(syy[k])
        at = [float(f.p[0][near][k]), float(f.p[1][near][k])]
        t = case.material.thickness
        force = spec.force if hasattr(spec, "force") else None
        nominal = (abs(force[1]) / (p.length * t)) if force is not None else None
        if peak > governing:
            extra = (f" (the load over the patch gives F/(w t) = {nominal:.4g} {S})"
                     if nominal else "")
            out.append(Finding(kind="bearing", at=at,
                               ratio=significant(peak / max(governing, 1e-300)),
                               message=(f"Under {p.name} ({xs[0]:g} to {xs[-1]:g} {L}) the "
                                        f"bearing stress σyy reaches {peak:.4g} {S}{extra},"
                                        f" more than the governing hand shear "
                                        f"{governing:.4g} {S}; a shear-only check does not "
                                        "cover it.")))
    return out
