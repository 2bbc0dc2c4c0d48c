"""Figures of a beam check (matplotlib, Agg): shear and von Mises contours, cut profiles.

Colour: a diverging, perceptually uniform map centred on zero for signed shear
('coolwarm' with a symmetric norm), a sequential one for magnitudes ('cividis');
Gouraud shading, no contour bands. The colour scale ends at the largest value outside the
excluded zones (boundary idealisations, drawn as dotted circles) and the sharp re-entrant
corners (singular, marked x), so that a support corner does not wash out the rest of the
member; the colour bar shows an arrow when values beyond it exist. Cut lines and profiles
never bridge a hole. Every figure names its quantity and units.
"""

from __future__ import annotations

import math
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.patches  # noqa: E402
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
import shapely  # noqa: E402
from matplotlib.colors import Normalize, TwoSlopeNorm  # noqa: E402
from matplotlib.lines import Line2D  # noqa: E402
from matplotlib.tri import Triangulation  # noqa: E402
from shapely.geometry import LineString  # noqa: E402

from fem.case.model import Case  # noqa: E402
from fem.case.outline import (  # noqa: E402
    cut_strips,
    domain_polygon,
    patches,
    reentrant_corners,
)
from fem.member.level import Level, excluded_zones  # noqa: E402
from fem.report.png import save_png  # noqa: E402
from fem.results import CutResult, Envelope  # noqa: E402

__all__ = ["contour_figure", "profile_figure", "ratio_along_member_figure",
           "profiles_figure", "mesh_figure", "write_beam_figures", "number", "force_text",
           "DIVERGING", "SEQUENTIAL", "FE_COLOUR", "HAND_COLOUR"]

DIVERGING = "coolwarm"
SEQUENTIAL = "cividis"
INK = "#222222"
SUPPORT_COLOUR = "#1b7837"
LOAD_COLOUR = "#762a83"
FE_COLOUR = "#b2182b"
HAND_COLOUR = "#2166ac"
UNSAFE_COLOUR = "#f4a582"    # light red of the same diverging family as FE_COLOUR
EXCLUDED_COLOUR = "#d9d9d9"
QUANTITIES = {"txy": "shear stress τxy", "von_mises": "von Mises stress"}


def number(v: float, digits: int = 4) -> str:
    """`v` to `digits` significant figures, without an exponent between 1e-3 and 1e7."""
    if v is None or not math.isfinite(v):
        return "–"
    if v == 0:
        return "0"
    mag = math.floor(math.log10(abs(v)))
    if -3 <= mag < 7:
        return f"{v:.{max(0, digits - 1 - mag)}f}"
    return f"{v:.{digits - 1}e}"


LARGER_UNIT = {"N": ("kN", 1e3), "lbf": ("kip", 1e3)}


def force_text(v: float, unit: str) -> str:
    """A force for a label: in kN (kip) from 10 kN (10 kip) on, else in the case's unit."""
    if unit in LARGER_UNIT and abs(v) >= 1e4:
        unit, v = LARGER_UNIT[unit][0], v / LARGER_UNIT[unit][1]
    t = number(v)
    if "." in t and "e" not in t:
        t = t.rstrip("0").rstrip(".")
    return f"{t} {unit}"


def _outline(ax, dom) -> None:
    for ring in [dom.exterior, *dom.interiors]:
        x, y = ring.xy
        ax.plot(x, y, color=INK, lw=0.8, zorder=4)


def _arrows(case: Case, level: Level, span: float) -> list[tuple[tuple, tuple, np.ndarray]]:
    """(head, tail, force) of each load's arrow: to the patch centre or the pin's hole."""
    out = []
    for p, ld in zip(level.mm.loads, case.loads, strict=True):
        head = case.beam.holes[p.hole].center if p.hole is not None else p.centroid
        F = np.asarray(ld.force, float)
        d = F / max(np.hypot(*F), 1e-300) * 0.12 * span
        out.append((tuple(head), (head[0] - d[0], head[1] - d[1]), F))
    return out


def _patches(ax, case: Case, level: Level, span: float) -> None:
    """Supports (green), loads (purple: the patch or the loaded half of a pin hole, and an
    arrow with the resultant)."""
    for p in level.mm.supports:
        if p.point is not None:
            ax.plot(*p.point, marker="^", color=SUPPORT_COLOUR, ms=9, zorder=6, clip_on=False)
        for a, b in p.segments:
            ax.plot([a[0], b[0]], [a[1], b[1]], color=SUPPORT_COLOUR, lw=5, alpha=0.85,
                    solid_capstyle="butt", zorder=5, clip_on=False)
    for p, (head, tail, F) in zip(level.mm.loads, _arrows(case, level, span), strict=True):
        if p.hole is not None:  # the pin bears on the half of the hole facing the force
            hole = case.beam.holes[p.hole]
            phi = math.atan2(F[1], F[0]) + np.linspace(-0.5 * math.pi, 0.5 * math.pi, 60)
            ax.plot(hole.center[0] + hole.radius * np.cos(phi),
                    hole.center[1] + hole.radius * np.sin(phi), color=LOAD_COLOUR, lw=4,
                    alpha=0.85, solid_capstyle="butt", zorder=5)
        for a, b in p.segments:
            ax.plot([a[0], b[0]], [a[1], b[1]], color=LOAD_COLOUR, lw=5, alpha=0.85,
                    solid_capstyle="butt", zorder=5, clip_on=False)
        ax.annotate("", xy=head, xytext=tail, zorder=7, annotation_clip=False,
                    arrowprops={"arrowstyle": "-|>", "color": LOAD_COLOUR, "lw": 2.0})
        x0, _, x1, _ = domain_polygon(case.beam).bounds
        inward = tail[0] > 0.5 * (x0 + x1)  # the label on the member's side stays inside
        F_given = case.units.user_force(float(np.hypot(*F)))   # as in the case file
        ax.text(tail[0], tail[1], f" {force_text(F_given, case.units.force)} ",
                color=LOAD_COLOUR, fontsize=8, ha="right" if inward else "left",
                va="bottom" if head[1] <= tail[1] else "top", zorder=7)


def _cut_lines(ax, dom, cuts: list[CutResult], colour: str) -> None:
    """Each cut drawn over the material only, labelled below the member."""
    x0, y0, x1, y1 = dom.bounds
    for c in cuts:
        line = LineString([(c.x, y0 - 1.0), (c.x, y1 + 1.0)])
        for piece in shapely.get_parts(dom.intersection(line)):
            if piece.geom_type == "LineString" and piece.length > 0:
                ys = [q[1] for q in piece.coords]
                ax.plot([c.x, c.x], [min(ys), max(ys)], color=colour, lw=0.9, ls=(0, (4, 3)),
                        zorder=4)
        ax.text(c.x, y0 - 0.015 * (y1 - y0), f"{c.x:g}", ha="center", va="top", fontsize=7,
                color=INK)


def contour_figure(case: Case, level: Level, cuts: list[CutResult], quantity: str,
                   path: Path) -> Path:
    """Smooth contour of 'txy' (diverging) or 'von_mises' (sequential) with the model drawn."""
    f = level.field
    tri = Triangulation(f.p[0], f.p[1], f.t.T)
    vals = f.nodal[quantity]
    S, L = case.units.stress, case.units.length
    dom = domain_polygon(case.beam)
    x0, y0, x1, y1 = dom.bounds
    w, h = x1 - x0, y1 - y0
    zones = excluded_zones(case, level.mm.supports, level.mm.loads)
    keep = np.ones(f.p.shape[1], bool)
    for z in zones:
        keep &= np.hypot(f.p[0] - z.at[0], f.p[1] - z.at[1]) > z.radius
    # a sharp re-entrant corner is singular (Williams 1952): its value depends on the mesh
    # only, so it sets neither the scale nor the peak shown (radius as in
    # fem.member.check.check_beam)
    corners = reentrant_corners(dom)
    for c in corners:
        keep &= np.hypot(f.p[0] - c.at[0], f.p[1] - c.at[1]) > 0.05 * h
    mag = np.abs(vals)
    ipk = int(np.argmax(np.where(keep, mag, -np.inf))) if keep.any() else int(np.argmax(mag))
    lim = float(mag[ipk]) or float(mag.max()) or 1.0
    clipped = bool(mag.max() > lim * (1 + 1e-9))
    span = max(w, h)
    ty = [t[1] for _, t, _ in _arrows(case, level, span)]
    xlim = (x0 - 0.04 * span, x1 + 0.04 * span)
    ylim = (min([y0 - 0.08 * h, *ty]) - 0.02 * span, max([y1 + 0.03 * h, *ty]) + 0.04 * span)
    # height from the drawing's aspect: about 5.4 in of axes width, title and legend band
    fig_h = float(np.clip(5.4 * (ylim[1] - ylim[0]) / (xlim[1] - xlim[0]) + 2.2, 3.8, 9.5))
    fig, ax = plt.subplots(figsize=(8.0, fig_h))
    label = f"{QUANTITIES[quantity]} [{S}]"
    if quantity == "txy":
        im = ax.tripcolor(tri, vals, shading="gouraud", cmap=DIVERGING,
                          norm=TwoSlopeNorm(0.0, -lim, lim))
        cut_colour = INK
        extend = "both" if clipped else "neither"
    else:
        im = ax.tripcolor(tri, vals, shading="gouraud", cmap=SEQUENTIAL,
                          norm=Normalize(0.0, lim))
        cut_colour = "#f2f2f2"
        extend = "max" if clipped else "neither"
    _outline(ax, dom)
    _cut_lines(ax, dom, cuts, cut_colour)
    for z in zones:  # only the part of each zone inside the member
        ring = shapely.Point(z.at).buffer(z.radius, quad_segs=32).exterior
        for piece in shapely.get_parts(ring.intersection(dom)):
            if piece.geom_type == "LineString":
                ax.plot(*piece.xy, ls=":", lw=1.0, color=cut_colour, zorder=4)
    for c in corners:
        ax.plot(*c.at, marker="x", ms=8, mew=1.8, color=INK, zorder=8)
    _patches(ax, case, level, span)
    px, py = f.p[0, ipk], f.p[1, ipk]
    ax.plot(px, py, marker="o", ms=7, mfc="none", mec=INK, mew=1.5, zorder=8)
    peak_name = "max |τxy|" if quantity == "txy" else "max"
    right = px > x0 + 0.6 * w  # keep the label inside the member's box
    high = py > y0 + 0.8 * h
    ax.annotate(f"{peak_name} {number(lim)} {S}", (px, py),
                xytext=(-8 if right else 8, -8 if high else 8), textcoords="offset points",
                ha="right" if right else "left", va="top" if high else "bottom", fontsize=8,
                color=INK, zorder=8,
                bbox={"boxstyle": "round,pad=0.2", "fc": "white", "ec": "none", "alpha": 0.8})
    ax.set_xlim(*xlim)
    ax.set_ylim(*ylim)
    ax.set_aspect("equal")
    ax.set_xlabel(f"x [{L}]")
    ax.set_ylabel(f"y [{L}]")
    ax.set_title(f"{QUANTITIES[quantity][0].upper()}{QUANTITIES[quantity][1:]}, finest mesh "
                 f"(element size {level.size:g} {L})", loc="left", fontsize=11,
                 fontweight="bold")
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    cb = fig.colorbar(im, ax=ax, shrink=0.85, pad=0.02, extend=extend)
    cb.set_label(label)
    handles = [Line2D([], [], color=SUPPORT_COLOUR, lw=5, label="support"),
               Line2D([], [], color=LOAD_COLOUR, lw=5, label="load"),
               Line2D([], [], color=INK, lw=0.9, ls=(0, (4, 3)), label=f"cut (x in {L})"),
               Line2D([], [], marker="o", mfc="none", mec=INK, ls="none", label="peak")]
    if zones:
        handles.append(Line2D([], [], color=INK, ls=":", label="excluded zone"))
    if corners:
        handles.append(Line2D([], [], color=INK, marker="x", mew=1.8, ls="none",
                              label="sharp corner (singular)"))
    fig.legend(handles=handles, loc="lower center", bbox_to_anchor=(0.5, 0.2 / fig_h),
               ncol=len(handles), frameon=False, fontsize=8)
    note = "peak and colour scale: largest value outside the excluded zones"
    note += " and sharp corners" if corners else ""
    if clipped:
        note += " (the arrow on the colour bar: larger values there)"
    fig.text(0.5, 0.06 / fig_h, note, ha="center", va="bottom", fontsize=7, color="#555555")
    fig.tight_layout(rect=(0, 0.55 / fig_h, 1, 1))
    return save_png(fig, path, tight=False)


def _per_strip(y: np.ndarray, values: list[float], strips) -> list[tuple[np.ndarray, ...]]:
    """Split a profile at the gaps between material strips (a line never bridges a hole)."""
    v = np.asarray(values, float)
    out = []
    edges = [(s.y0, s.y1) for s in strips] or [(y.min(), y.max())]
    # merge strips that touch (a change of thickness is no gap)
    merged: list[list[float]] = []
    for a, b in edges:
        if merged and a - merged[-1][1] <= 1e-9 * (1 + abs(a)):
            merged[-1][1] = b
        else:
            merged.append([a, b])
    for a, b in merged:
        m = (y >= a - 1e-9 * (1 + abs(a))) & (y <= b + 1e-9 * (1 + abs(b)))
        if m.any():
            out.append((y[m], v[m]))
    return out, merged


def profile_figure(case: Case, cut: CutResult, path: Path) -> Path:
    """tau(y) FE vs hand at one cut, and sigma_x beside it."""
    S, L = case.units.stress, case.units.length
    y = np.asarray(cut.profile.y)
    dom = domain_polygon(case.beam)
    strips = cut_strips(case.beam, cut.x, case.material.thickness, dom)
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(8.0, 4.9), sharey=True)
    panels = ((a1, cut.profile.tau_fe, cut.profile.tau_hand, "VQ/(Ib)"),
              (a2, cut.profile.sigma_x_fe, cut.profile.sigma_x_hand, "N/A + M(y − ȳ)/I"))
    for ax, fe, hand, hand_label in panels:
        pieces_fe, merged = _per_strip(y, fe, strips)
        pieces_hd, _ = _per_strip(y, hand, strips)
        for k, ((yy, vf), (_, vh)) in enumerate(zip(pieces_fe, pieces_hd, strict=True)):
            ax.plot(vf, yy, color=FE_COLOUR, lw=1.8, label="FE" if k == 0 else None)
            ax.plot(vh, yy, color=HAND_COLOUR, lw=1.4, ls="--",
                    label=f"hand: {hand_label}" if k == 0 else None)
        for (_, b), (a, _) in zip(merged[:-1], merged[1:], strict=True):
            ax.axhspan(b, a, color="#e6e6e6", zorder=0)
            ax.text(0.98, 0.5 * (a + b), "no material", transform=ax.get_yaxis_transform(),
                    ha="right", va="center", fontsize=7, color="#666666",
                    bbox={"boxstyle": "round,pad=0.2", "fc": "#e6e6e6", "ec": "none"})
        ax.axvline(0.0, color="#bbbbbb", lw=0.6)
        ax.grid(alpha=0.25)
        for side in ("top", "right"):
            ax.spines[side].set_visible(False)
    tau_fe = np.asarray(cut.profile.tau_fe)
    i = int(np.argmax(np.abs(tau_fe)))
    a1.plot(tau_fe[i], y[i], "o", color=FE_COLOUR, ms=5, ls="none",
            label=f"FE peak |τ| = {number(cut.tau_max_fe)} {S} at y = {number(y[i])} {L}")
    sign = float(np.sign(tau_fe[i])) or 1.0
    a1.axvline(sign * cut.tau_avg_hand, color="#4d4d4d", lw=1.0, ls=":",
               label=f"hand: V/A = {number(cut.tau_avg_hand)} {S}")
    if case.check.method not in ("shear-formula", "average"):
        a1.axvline(sign * cut.tau_max_hand, color="#4d4d4d", lw=1.0, ls="-.",
                   label=f"hand: {case.check.method} {number(cut.tau_max_hand)} {S}")
    a1.set_xlabel(f"shear stress τxy [{S}]")
    a1.set_ylabel(f"y [{L}]")
    a2.set_xlabel(f"normal stress σx [{S}]")
    ratio = ("no hand shear at this cut" if cut.ratio is None else
             f"FE {number(cut.tau_max_fe)} vs hand {number(cut.tau_max_hand)} {S}, "
             f"ratio {cut.ratio:.3f}")
    fig.suptitle(f"Cut at x = {cut.x:g} {L}: {ratio}", x=0.01, ha="left", fontsize=11,
                 fontweight="bold")
    _legend_below(fig, [a1, a2])
    return save_png(fig, path, tight=False)


def _legend_below(fig, axes, ncol: int = 3) -> None:
    """One legend of every labelled line of `axes`, in a band below them (off the data)."""
    handles, labels = [], []
    for ax in axes:
        for h, lab in zip(*ax.get_legend_handles_labels(), strict=True):
            if lab not in labels:
                handles.append(h)
                labels.append(lab)
    rows = -(-len(labels) // ncol)
    band = (0.14 + 0.2 * rows) / fig.get_figheight()
    fig.legend(handles, labels, loc="lower center", ncol=ncol, frameon=False, fontsize=7.5,
               bbox_to_anchor=(0.5, 0.0))
    fig.tight_layout(rect=(0, band, 1, 1))


def profiles_figure(case: Case, cuts: list[CutResult], path: Path) -> Path:
    """τxy(y), FE against hand, at every cut side by side (the note's overview of the cut
    profiles; each cut's own figure has σx too)."""
    S, L = case.units.stress, case.units.length
    n = len(cuts)
    cols = min(n, 3)
    rows = -(-n // cols)
    fig, axes = plt.subplots(rows, cols, figsize=(8.0, 0.7 + 3.0 * rows), sharey=True,
                             squeeze=False)
    dom = domain_polygon(case.beam)
    for k, ax in enumerate(axes.ravel()):
        if k >= n:
            ax.set_axis_off()
            continue
        c = cuts[k]
        y = np.asarray(c.profile.y)
        strips = cut_strips(case.beam, c.x, case.material.thickness, dom)
        pieces_fe, merged = _per_strip(y, c.profile.tau_fe, strips)
        pieces_hd, _ = _per_strip(y, c.profile.tau_hand, strips)
        for j, ((yy, vf), (_, vh)) in enumerate(zip(pieces_fe, pieces_hd, strict=True)):
            ax.plot(vf, yy, color=FE_COLOUR, lw=1.6, label="FE τxy" if j == 0 else None)
            ax.plot(vh, yy, color=HAND_COLOUR, lw=1.3, ls="--",
                    label="hand: VQ/(Ib)" if j == 0 else None)
        for (_, b), (a, _) in zip(merged[:-1], merged[1:], strict=True):
            ax.axhspan(b, a, color="#e6e6e6", zorder=0, label="no material")
        ax.axvline(0.0, color="#bbbbbb", lw=0.6)
        ax.grid(alpha=0.25)
        for side in ("top", "right"):
            ax.spines[side].set_visible(False)
        ratio = "–" if c.ratio is None else f"{c.ratio:.3f}"
        ax.set_title(f"cut {k + 1}, x = {c.x:g} {L}: ratio {ratio}", fontsize=8.5, loc="left")
        ax.set_xlabel(f"τxy [{S}]", fontsize=8)
        ax.tick_params(labelsize=7)
        if k % cols == 0:
            ax.set_ylabel(f"y [{L}]", fontsize=8)
    fig.suptitle("Shear stress over the depth at each cut, FE against hand", x=0.01,
                 ha="left", fontsize=11, fontweight="bold")
    _legend_below(fig, list(axes.ravel()))
    return save_png(fig, path, tight=False)


def mesh_figure(case: Case, level: Level, path: Path) -> Path:
    """The finest mesh (element edges between corner vertices), its refinement visible."""
    f = level.field
    L = case.units.length
    dom = domain_polygon(case.beam)
    x0, y0, x1, y1 = dom.bounds
    span = max(x1 - x0, y1 - y0)
    fig_h = float(np.clip(6.6 * (y1 - y0) / (x1 - x0) + 1.3, 3.2, 9.5))
    fig, ax = plt.subplots(figsize=(8.0, fig_h))
    tri = Triangulation(f.p[0], f.p[1], f.t.T)
    ne = f.t.shape[1]
    ax.triplot(tri, color="#3d4a57", lw=max(0.08, min(0.5, 60.0 / math.sqrt(ne))))
    _outline(ax, dom)
    _patches(ax, case, level, span)
    ax.set_aspect("equal")
    ax.set_xlim(x0 - 0.04 * span, x1 + 0.04 * span)
    ax.set_ylim(y0 - 0.04 * span, y1 + 0.06 * span)
    ax.set_xlabel(f"x [{L}]")
    ax.set_ylabel(f"y [{L}]")
    m = level.mm
    order = "quadratic" if m.order == 2 else "linear"
    ax.set_title(f"Finest mesh: {ne} {order} triangles, element size {level.size:g} {L} "
                 "away from refinements", loc="left", fontsize=10.5, fontweight="bold")
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    return save_png(fig, path)


def _features(case: Case) -> list[tuple[str, float, float, str]]:
    """(name, x_left, x_right, colour) of the supports, loads and holes along the member."""
    sup, lds = patches(case)
    g = case.beam
    out = []
    for plist, colour in ((sup, SUPPORT_COLOUR), (lds, LOAD_COLOUR)):
        for p in plist:
            if p.hole is not None:
                h = g.holes[p.hole]
                out.append((p.name, h.center[0] - h.radius, h.center[0] + h.radius, colour))
            else:
                xs = [q[0] for q in p.ends]
                out.append((p.name, min(xs), max(xs), colour))
    for k, h in enumerate(g.holes):
        out.append((f"hole {k}", h.center[0] - h.radius, h.center[0] + h.radius, INK))
    return out


def _bands(ax, stretches: list[list[float]], colour: str, pad: float, **kw) -> None:
    for a, b in stretches:  # a one-station stretch still shows, a little wide
        ax.axvspan(a - pad if a == b else a, b + pad if a == b else b, color=colour, lw=0, **kw)


def ratio_along_member_figure(case: Case, envelope: Envelope, path: Path) -> Path:
    """FE peak |tau_xy| over the hand value at every station along the member.

    Top: both stresses against x. Middle: their ratio with the 1 + tolerance line, unsafe
    stretches shaded, excluded stretches greyed. Bottom: the member's supports, loads and
    holes by name along the same x.
    """
    S, L = case.units.stress, case.units.length
    x = np.asarray(envelope.x, float)
    nan = float("nan")
    fe = np.array([nan if v is None else v for v in envelope.tau_fe], float)
    hand = np.array([nan if v is None else v for v in envelope.tau_hand], float)
    ratio = np.array([nan if v is None else v for v in envelope.ratio], float)
    dom = domain_polygon(case.beam)
    x0, _, x1, _ = dom.bounds
    pad = 0.004 * (x1 - x0)
    limit = 1.0 + envelope.tolerance
    fig, (a_tau, a_r, a_m) = plt.subplots(3, 1, figsize=(8.0, 6.6), sharex=True,
                                          gridspec_kw={"height_ratios": [2.0, 2.6, 0.7]})
    for ax in (a_tau, a_r):
        _bands(ax, envelope.excluded, EXCLUDED_COLOUR, pad, alpha=0.7, zorder=0)
        _bands(ax, envelope.unsafe, UNSAFE_COLOUR, pad, alpha=0.6, zorder=0)
        ax.grid(alpha=0.25)
        for side in ("top", "right"):
            ax.spines[side].set_visible(False)
    a_tau.plot(x, fe, color=FE_COLOUR, lw=1.6, label="FE: peak |τxy| in the section")
    a_tau.plot(x, hand, color=HAND_COLOUR, lw=1.3, ls="--",
               label=f"hand: {case.check.method}")
    a_tau.set_ylabel(f"shear stress [{S}]")
    a_tau.set_ylim(bottom=0.0)
    a_tau.legend(fontsize=7.5, frameon=False, loc="lower left", bbox_to_anchor=(0.0, 1.0),
                 ncol=2, borderaxespad=0.2)
    a_r.plot(x, ratio, color=INK, lw=1.5, label="FE / hand")
    a_r.axhline(1.0, color="#999999", lw=0.8)
    a_r.axhline(limit, color=FE_COLOUR, lw=1.0, ls=(0, (5, 3)),
                label=f"1 + tolerance = {limit:g}")
    judged = np.isfinite(ratio)
    for a, b in envelope.excluded:
        judged &= (x < a) | (x > b)
    if judged.any():  # the scale follows the judged values, not a spike in an excluded zone
        top = max(limit, float(ratio[judged].max()))
        bottom = min(1.0 - envelope.tolerance, float(ratio[judged].min()))
        a_r.set_ylim(bottom - 0.05 * (top - bottom), top + 0.12 * (top - bottom))
    if envelope.worst is not None:
        w = envelope.worst
        a_r.plot(w.x, w.ratio, "o", mfc="none", mec=FE_COLOUR, mew=1.5, ms=7, zorder=5)
        right = w.x > x0 + 0.6 * (x1 - x0)
        a_r.annotate(f"worst {w.ratio:.3f} at x = {number(w.x)} {L}", (w.x, w.ratio),
                     xytext=(-8 if right else 8, 6), textcoords="offset points",
                     ha="right" if right else "left", va="bottom", fontsize=8, color=INK)
    a_r.set_ylabel("ratio FE / hand")
    handles = [*a_r.get_legend_handles_labels()[0],
               matplotlib.patches.Patch(color=UNSAFE_COLOUR, alpha=0.6, label="unsafe"),
               matplotlib.patches.Patch(color=EXCLUDED_COLOUR, alpha=0.7,
                                        label="excluded zone (not judged)")]
    a_r.legend(handles=handles, fontsize=7.5, frameon=False, loc="lower left",
               bbox_to_anchor=(0.0, 1.0), ncol=4, borderaxespad=0.2)
    # the member along x: a bar with the supports, loads and holes marked by name
    a_m.axhspan(0.35, 0.65, xmin=0.0, xmax=1.0, color="#f0f0f0", zorder=0)
    a_m.plot([x0, x1], [0.35, 0.35], color=INK, lw=0.8)
    a_m.plot([x0, x1], [0.65, 0.65], color=INK, lw=0.8)
    for name, lo, hi, colour in _features(case):
        level = 0.5 if colour == INK else (0.15 if colour == SUPPORT_COLOUR else 0.85)
        if hi - lo > pad:
            a_m.plot([lo, hi], [level, level], color=colour, lw=4, solid_capstyle="butt")
        else:
            a_m.plot(lo, level, marker="^" if colour == SUPPORT_COLOUR else "v", color=colour,
                     ms=7, ls="none")
        a_m.text(0.5 * (lo + hi), level + (0.2 if level > 0.5 else -0.2), name, fontsize=7,
                 color=colour, ha="center", va="bottom" if level > 0.5 else "top",
                 clip_on=False)
    a_m.set_ylim(-0.25, 1.25)
    a_m.set_yticks([])
    for side in ("top", "right", "left"):
        a_m.spines[side].set_visible(False)
    a_m.set_xlabel(f"x [{L}]")
    a_m.set_xlim(x0 - 0.02 * (x1 - x0), x1 + 0.02 * (x1 - x0))
    fig.suptitle(f"FE against hand along the member ({len(x)} sections)", x=0.01, ha="left",
                 fontsize=11, fontweight="bold")
    return save_png(fig, path)


def write_beam_figures(case: Case, level: Level, cuts: list[CutResult], folder: Path,
                       envelope: Envelope | None = None) -> list[Path]:
    """The contours, one profile per cut and all cuts in one (profiles.png), given an
    envelope the ratio along the member, and the finest mesh (mesh.png)."""
    folder = Path(folder)
    out = [contour_figure(case, level, cuts, "txy", folder / "shear-contour.png"),
           contour_figure(case, level, cuts, "von_mises", folder / "von-mises-contour.png")]
    for i, c in enumerate(cuts):
        out.append(profile_figure(case, c, folder / f"profile-{i + 1:02d}.png"))
    if cuts:
        out.append(profiles_figure(case, cuts, folder / "profiles.png"))
    if envelope is not None:
        out.append(ratio_along_member_figure(case, envelope, folder / "ratio-along-member.png"))
    out.append(mesh_figure(case, level, folder / "mesh.png"))
    return out
