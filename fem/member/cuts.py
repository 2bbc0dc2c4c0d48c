"""Cuts: FE stress profiles over the depth and resultants V, M at vertical sections.

A cut x = const meets the material in one or more strips (several where it crosses a hole
or cut-out). Resultants use Gauss-Legendre quadrature on sub-intervals of each strip no
longer than half an element: V_fe = sum int tau_xy t dy, M_fe = sum int sigma_xx (y - yb) t dy,
N_fe = sum int sigma_xx t dy, with yb the centroid of the cut section.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from classical.strips import StripSection
from fem.case.outline import Strip
from fem.member.recovery import PointLocator, StressField

__all__ = ["CutFE", "sample_cut", "automatic_cuts"]

GAUSS = np.polynomial.legendre.leggauss(5)
PROFILE_POINTS = 61  # per strip, ends included (just inside the material)


@dataclass(frozen=True)
class CutFE:
    """FE side of one cut."""

    x: float
    V: float
    N: float
    M: float
    y: np.ndarray          # profile stations
    txy: np.ndarray
    sxx: np.ndarray
    syy: np.ndarray
    tau_max: float
    y_at_tau_max: float
    sigma_x_max: float


def _quadrature(strips: list[Strip], h: float) -> tuple[np.ndarray, np.ndarray]:
    ys, ws = [], []
    for s in strips:
        n = max(4, math.ceil((s.y1 - s.y0) / (0.5 * h)))
        edges = np.linspace(s.y0, s.y1, n + 1)
        a, b = edges[:-1, None], edges[1:, None]
        ys.append((0.5 * (b - a) * GAUSS[0] + 0.5 * (a + b)).ravel())
        ws.append((0.5 * (b - a) * GAUSS[1] * s.t).ravel())
    return np.concatenate(ys), np.concatenate(ws)


def sample_cut(x: float, strips: list[Strip], field: StressField, locator: PointLocator,
               h: float) -> CutFE:
    """Profiles and resultants of the FE stresses along the cut at x."""
    section = StripSection(tuple((s.y0, s.y1, s.t) for s in strips))
    yb = section.centroid
    yq, wq = _quadrature(strips, h)
    q = field.at(locator, np.full_like(yq, x), yq)
    V = float(wq @ q["txy"])
    N = float(wq @ q["sxx"])
    M = float(wq @ (q["sxx"] * (yq - yb)))
    prof = []
    for s in strips:
        eps = 1e-9 * (s.y1 - s.y0)
        prof.append(np.linspace(s.y0 + eps, s.y1 - eps, PROFILE_POINTS))
    yp = np.concatenate(prof)
    pv = field.at(locator, np.full_like(yp, x), yp)
    i = int(np.argmax(np.abs(pv["txy"])))
    return CutFE(x=x, V=V, N=N, M=M, y=yp, txy=pv["txy"], sxx=pv["sxx"], syy=pv["syy"],
                 tau_max=float(abs(pv["txy"][i])), y_at_tau_max=float(yp[i]),
                 sigma_x_max=float(np.abs(pv["sxx"]).max()))


def automatic_cuts(x_min: float, x_max: float, depth: float,
                   stations: list[tuple[float, float]], min_gap: float) -> list[float]:
    """Cuts spread along the member plus one either side of each station.

    `stations` are (x_left, x_right) extents of loads, supports and features; a cut is
    placed a quarter depth (at most a tenth of the span) outside each extent, where the
    hand method is most questioned, and at the quarter points of the span.
    """
    span = x_max - x_min
    off = min(0.25 * depth, 0.1 * span)
    xs = [x_min + span * f for f in (0.25, 0.5, 0.75)]
    for lo, hi in stations:
        xs += [lo - off, hi + off]
    lo_lim, hi_lim = x_min + 0.5 * off, x_max - 0.5 * off
    xs = sorted(x for x in xs if lo_lim <= x <= hi_lim)
    out: list[float] = []
    for x in xs:
        if not out or x - out[-1] >= min_gap:
            out.append(round(x, 9))
    return out
