"""The envelope: FE against hand in every vertical section along the member.

The cuts compare FE and hand at a few x; between them the FE shear may rise above the hand
value unseen. The envelope takes stations along the whole member, no further apart than the
smallest element that meets the gap between two stations, plus the named cuts. At each
station x the FE side is the peak |tau_xy| over the material of the vertical line through x
(the recovered stress field, the same element-vertex values `fem.member.cuts.sample_cut`
interpolates), leaving out points inside the excluded idealisation zones; the hand side is
`fem.member.hand.hand_at_cut` at the same x (statics + the strips of that section + the
chosen method), so the envelope and the cuts use one hand calculation.

tau_xy is linear in each (P2) element, so along a vertical line it is piecewise linear and its
largest magnitude lies where the line crosses an element edge: the FE peak of a section is
the largest |tau_xy| over those crossings (`section_peaks`), exact for the recovered field
and never below a cut's sampled `tau_max` at the same x. No point location is needed.

ratio(x) = tau_fe(x) / tau_hand(x). `excluded` lists the x-extents of the excluded zones:
their stations keep their values (the figure greys them), but next to a support corner or a
patch end the remaining points of the section still carry the idealisation (the clamp
crowding shear towards its corners, a bearing patch spreading its load), so the worst
station and the `unsafe` stretches (ratio > 1 + tolerance) are taken outside them.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from fem.case.model import Case
from fem.case.outline import cut_strips, domain_polygon
from fem.member.hand import hand_at_cut, member_model
from fem.member.level import ExcludedZone, Level, excluded_zones
from fem.member.recovery import StressField
from fem.results import Envelope, EnvelopePoint, significant

__all__ = ["member_envelope", "envelope_stations", "element_sizes", "section_peaks", "widened",
           "JUDGED_REACH", "RATIO_FLOOR", "END_INSET"]

# hand shear below this share of the member's largest hand shear forms no ratio: there the
# hand value passes through zero (e.g. midspan under a symmetric load, or between two patch
# loads) and the ratio would compare the FE's small residual shear with a vanishing number
# (measured: 25 x a 0.43 MPa hand value at the web-opening beam's midspan, 5-7 x on the
# coped beams under their patch). A quarter keeps every stretch where the shear check of
# the member is about its real shear, and is where a stubby member's peaks sit.
RATIO_FLOOR = 0.25
# the envelope's FE peaks leave out points within this many zone radii of an excluded zone's
# centre: the disc holds the idealisation's singular core, but just outside it the stress
# still carries its tail (measured: the clamped corners of the Timoshenko & Goodier §21
# cantilever, 100 mm deep, 10 mm disc, put 5.6 % excess at 15 mm from the corner on the
# 2.5 mm mesh, rising with refinement: 4.2, 3.4, 5.6 %). Whole sections are not dropped:
# the shear at mid-depth under a bearing patch is real and stays judged
JUDGED_REACH = 2.0
# the first and last stations lie this share of the span inside the member's ends: a
# vertical line along an end edge meets the material in that edge only
END_INSET = 1e-6
# x and stresses are kept to this many significant figures in the result
DIGITS = 6


def _r(v: float) -> float:
    return significant(v, DIGITS)


def element_sizes(level: Level) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(x_min, x_max, longest edge) of every element of the level's (straight) mesh."""
    p, t = level.field.p, level.field.t
    xs = p[0][t]                                     # (3, nelems)
    corners = p[:, t]                                # (2, 3, nelems)
    edges = corners - np.roll(corners, 1, axis=1)
    h = np.sqrt((edges ** 2).sum(axis=0)).max(axis=0)
    return xs.min(axis=0), xs.max(axis=0), h


def envelope_stations(level: Level, x0: float, x1: float,
                      extra: list[float] | None = None) -> np.ndarray:
    """Stations from x0 to x1, no gap wider than the smallest element that meets it.

    The span is split into bins about one widest element extent wide (at least half of it),
    so an element meets at most three neighbouring bins; each bin takes the smallest
    longest edge of the elements that meet it and is filled with evenly spaced stations at
    most that far apart. `extra` (the named cuts) are added.
    """
    ex0, ex1, h = element_sizes(level)
    width = max(float((ex1 - ex0).max()), 1e-12 * (x1 - x0))
    nbins = max(1, math.ceil((x1 - x0) / width))
    width = (x1 - x0) / nbins
    hbin = np.full(nbins, np.inf)
    k0 = np.clip(((ex0 - x0) / width).astype(int), 0, nbins - 1)
    k1 = np.clip(((ex1 - x0) / width).astype(int), 0, nbins - 1)
    for step in (0, 1, 2):  # the bins were narrowed to fit the span: at most three per element
        np.minimum.at(hbin, np.minimum(k0 + step, k1), h)
    hbin[~np.isfinite(hbin)] = width   # a bin no element meets (cannot happen on a mesh)
    pieces = [x0 + width * (k + np.arange(math.ceil(width / hbin[k] - 1e-9)) / math.ceil(
        width / hbin[k] - 1e-9)) for k in range(nbins)]
    xs = np.concatenate([*pieces, [x1], np.asarray(extra or [], float)])
    inset = END_INSET * (x1 - x0)
    xs = np.clip(xs, x0 + inset, x1 - inset)
    xs = np.unique(np.round(xs, 12))
    return xs[np.concatenate([[True], np.diff(xs) > 1e-9 * (x1 - x0)])]


def section_peaks(field: StressField, xs: np.ndarray, zones: list[ExcludedZone]
                  ) -> tuple[np.ndarray, np.ndarray]:
    """Largest |tau_xy| on each vertical line x = xs[k] (sorted), and its height.

    Every element edge that spans x contributes the value at its crossing, linear between
    the element's vertex values; crossings inside a zone are left out. Where no crossing is
    left the peak is -inf (and the height nan).
    """
    p, t = field.p, field.t
    ne = t.shape[1]
    st, ys, taus = [], [], []
    for i, j in ((0, 1), (1, 2), (2, 0)):
        xa, xb = p[0, t[i]], p[0, t[j]]
        i0 = np.searchsorted(xs, np.minimum(xa, xb), "left")
        i1 = np.searchsorted(xs, np.maximum(xa, xb), "right")
        cnt = np.where(xa != xb, i1 - i0, 0)   # a vertical edge: its ends lie on the others
        e = np.repeat(np.arange(ne), cnt)
        first = np.cumsum(cnt) - cnt
        s = np.repeat(i0, cnt) + np.arange(int(cnt.sum())) - np.repeat(first, cnt)
        f = (xs[s] - xa[e]) / (xb[e] - xa[e])
        ys.append(p[1, t[i, e]] + f * (p[1, t[j, e]] - p[1, t[i, e]]))
        taus.append(field.txy[e, i] + f * (field.txy[e, j] - field.txy[e, i]))
        st.append(s)
    s, y = np.concatenate(st), np.concatenate(ys)
    tau = np.abs(np.concatenate(taus))
    out = np.zeros(len(s), bool)
    for z in zones:
        out |= np.hypot(xs[s] - z.at[0], y - z.at[1]) <= z.radius
    s, y, tau = s[~out], y[~out], tau[~out]
    peak = np.full(len(xs), -np.inf)
    np.maximum.at(peak, s, tau)
    at = np.full(len(xs), np.nan)
    hit = np.flatnonzero(tau == peak[s])
    at[s[hit]] = y[hit]
    return peak, at


def _stretches(x: np.ndarray, flag: np.ndarray) -> list[list[float]]:
    """[x_first, x_last] of each run of flagged stations."""
    out = []
    k = 0
    while k < len(x):
        if flag[k]:
            j = k
            while j + 1 < len(x) and flag[j + 1]:
                j += 1
            out.append([_r(x[k]), _r(x[j])])
            k = j + 1
        else:
            k += 1
    return out


def _inside(x: np.ndarray, stretches: list[list[float]]) -> np.ndarray:
    """Stations inside (or on the ends of) any of the stretches."""
    m = np.zeros(len(x), bool)
    for a, b in stretches:
        m |= (x >= a) & (x <= b)
    return m


def widened(zones: list[ExcludedZone]) -> list[ExcludedZone]:
    """The zones as the envelope's FE peaks leave them out: JUDGED_REACH times as wide."""
    return [replace(z, radius=JUDGED_REACH * z.radius) for z in zones]


def _zone_stretches(zones: list[ExcludedZone], x0: float, x1: float) -> list[list[float]]:
    """The x-extents of the zones inside the member, overlapping ones merged."""
    spans = sorted((max(x0, z.at[0] - z.radius), min(x1, z.at[0] + z.radius)) for z in zones)
    merged: list[list[float]] = []
    for a, b in spans:
        if b < a:
            continue
        if merged and a <= merged[-1][1]:
            merged[-1][1] = max(merged[-1][1], b)
        else:
            merged.append([a, b])
    return [[_r(a), _r(b)] for a, b in merged]


def member_envelope(case: Case, level: Level, zones: list[ExcludedZone] | None = None,
                    tolerance: float | None = None) -> Envelope:
    """FE peak |tau_xy| and the hand value at stations all along the member.

    Parameters
    ----------
    case
        The beam case (its geometry, thickness and `check.method`).
    level
        A finished mesh level (`fem.member.level.run_level`): its stress field and
        straight-sided mesh give the FE side and the element sizes, its statics model
        (`level.model`, rebuilt when missing) the hand side, its cuts the extra stations.
    zones
        Discs left out of the FE peak (default: `excluded_zones` of the case).
    tolerance
        FE above hand by more than this fraction is unsafe (default: `check.tolerance`).

    Returns
    -------
    Envelope
        Stations, FE and hand values [stress unit], ratio (None where undefined), the worst
        station, the excluded and the unsafe stretches.
    """
    g = case.beam
    dom = domain_polygon(g)
    x0, _, x1, _ = dom.bounds
    zones = excluded_zones(case, level.mm.supports, level.mm.loads) if zones is None else zones
    tol = case.check.tolerance if tolerance is None else tolerance
    cuts = [c.x for c in level.cuts_fe]
    model = level.model or member_model(case, level.mm.supports, level.mm.loads,
                                        stations=cuts or [0.5 * (x0 + x1)])
    xs = envelope_stations(level, x0, x1, cuts)
    keep, hand = [], []
    for x in xs:
        strips = cut_strips(g, float(x), case.material.thickness, dom)
        keep.append(bool(strips))  # a line through no material (a notch through the depth)
        if strips:
            y = np.array([0.5 * (strips[0].y0 + strips[0].y1)])
            hand.append(hand_at_cut(case, model, float(x), strips, y).tau_method)
    x = xs[np.asarray(keep, bool)]
    peak, at = section_peaks(level.field, x, widened(zones))
    hand_a = np.asarray(hand, float)
    floor = RATIO_FLOOR * (hand_a.max() if len(hand_a) else 0.0)
    has_fe = np.isfinite(peak)
    has_ratio = has_fe & (hand_a > floor) & (hand_a > 0)
    ratio = np.where(has_ratio, peak / np.where(has_ratio, hand_a, 1.0), np.nan)
    excluded = _zone_stretches(zones, x0, x1)
    judged = has_ratio & ~_inside(x, excluded)
    worst = None
    if judged.any():
        k = int(np.nanargmax(np.where(judged, ratio, np.nan)))
        worst = EnvelopePoint(x=_r(x[k]), ratio=_r(ratio[k]), tau_fe=_r(peak[k]),
                              tau_hand=_r(hand_a[k]), y=_r(at[k]))
    return Envelope(
        x=[_r(v) for v in x],
        tau_fe=[_r(v) if ok else None for v, ok in zip(peak, has_fe, strict=True)],
        tau_hand=[_r(v) for v in hand_a],
        ratio=[_r(v) if ok else None for v, ok in zip(ratio, has_ratio, strict=True)],
        worst=worst,
        excluded=excluded,
        unsafe=_stretches(x, judged & (np.nan_to_num(ratio) > 1 + tol)),
        tolerance=tol)
