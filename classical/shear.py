"""Transverse shear stress by the shear formula, and direct (average) shear.

The shear formula tau = V Q / (I b) gives the average, over the chord b, of the shear
stress parallel to V on a cut y = const, for a prismatic beam bending about the
centroidal x axis (Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 5.8, section
number from memory).  It assumes x is a principal axis (Ixy = 0, e.g. a section
symmetric about y) and V through the shear centre; elsewhere it is an approximation
that ignores Ixy.  It is exact (elasticity) for the average only; across wide chords
the true stress varies (for a square about 12 % above 1.5 V/A at the edge: Timoshenko
& Goodier, Theory of Elasticity, 3rd ed., bending of a bar of rectangular section;
value from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.optimize import minimize_scalar

from classical.geometry import (
    Outline,
    chord_length,
    first_moment_above,
    polygon_properties,
)

__all__ = [
    "ShearMaximum",
    "average_shear",
    "direct_shear",
    "max_shear_formula",
    "pin_bearing",
    "shear_formula",
    "shear_profile",
]


@dataclass(frozen=True)
class ShearMaximum:
    """Largest shear-formula stress over a section.

    Attributes: ``tau_max`` [F/L^2] (signed as V), ``y_at`` [L] the cut where it occurs,
    and the ``Q`` [L^3] and ``b`` [L] there.
    """

    tau_max: float
    y_at: float
    Q: float
    b: float


def shear_formula(V: float, Q: float, I: float, b: float) -> float:  # noqa: E741
    """tau = V Q / (I b)  [F/L^2].

    V shear force [F], Q first moment of the area beyond the cut about the neutral axis
    [L^3], I second moment of the whole section about it [L^4], b chord [L] > 0.
    Source: Gere & Goodno, 7th ed., Sec. 5.8 (section number from memory).
    """
    if not (I > 0 and b > 0):
        raise ValueError(f"need I > 0 and b > 0, got I={I!r}, b={b!r}")
    return V * Q / (I * b)


def shear_profile(outline: Outline, V: float, ys: np.ndarray | list[float]) -> np.ndarray:
    """tau(y) = V Q(y) / (Ixx b(y)) at each cut y in ``ys`` for a vertical shear V.

    Q by exact clipping (:func:`classical.geometry.first_moment_above`), b the chord
    length at y + 0 (:func:`classical.geometry.chord_length`); tau = 0 where b = 0
    (outside the section or on its top edge).  Applies to any outline, holes and
    multiple chords included (b is their total); see the module docstring for validity.
    """
    ixx = polygon_properties(outline).Ixx
    ys = np.asarray(ys, dtype=float)
    out = np.zeros(ys.shape)
    for k, y in np.ndenumerate(ys):
        b = chord_length(outline, y)
        if b > 0.0:
            out[k] = V * first_moment_above(outline, y) / (ixx * b)
    return out


def max_shear_formula(outline: Outline, V: float, n: int = 401) -> ShearMaximum:
    """Largest |tau| of :func:`shear_profile` over the depth of the section.

    Cuts at ``n`` equally spaced y, the centroid and every vertex height are scanned;
    the best is refined by a bounded scalar search between its neighbours.  Exact
    wherever the maximum is at one of the scanned heights (e.g. the centroid of a
    rectangle, circle or I); otherwise to the tolerance of the search (1e-10 of depth).
    """
    if n < 3:
        raise ValueError("n must be >= 3")
    p = polygon_properties(outline)
    _, ymin, _, ymax = outline.bounds
    vertices = np.concatenate([r[:, 1] for r in outline.rings])
    ys = np.unique(np.concatenate([np.linspace(ymin, ymax, n), vertices, [p.cy]]))
    taus = np.abs(shear_profile(outline, 1.0, ys))
    k = int(np.argmax(taus))
    y_best, t_best = float(ys[k]), float(taus[k])
    lo, hi = ys[max(k - 1, 0)], ys[min(k + 1, len(ys) - 1)]
    if hi > lo:
        res = minimize_scalar(
            lambda y: -abs(float(shear_profile(outline, 1.0, [y])[0])),
            bounds=(lo, hi), method="bounded", options={"xatol": 1e-10 * (ymax - ymin)},
        )
        if -res.fun > t_best:
            y_best, t_best = float(res.x), float(-res.fun)
    b = chord_length(outline, y_best)
    return ShearMaximum(V * t_best, y_best, first_moment_above(outline, y_best), b)


def average_shear(V: float, A: float) -> float:
    """Average shear stress over a section, tau_avg = V / A [F/L^2] (common practice)."""
    if not A > 0:
        raise ValueError("A must be > 0")
    return V / A


def direct_shear(F: float, A: float, planes: int = 1) -> float:
    """Direct shear on a fastener: tau = F / (planes A); planes = 1 single shear (F/A),
    2 double shear (F/(2A)).  A is the area of one shear plane.
    Source: Gere & Goodno, 7th ed., Sec. 1.6 (from memory)."""
    if not (isinstance(planes, int) and planes >= 1):
        raise ValueError(f"planes must be a positive integer, got {planes!r}")
    if not A > 0:
        raise ValueError("A must be > 0")
    return F / (planes * A)


def pin_bearing(F: float, d: float, t: float) -> float:
    """Average bearing stress of a pin of diameter d on a plate of thickness t,
    sigma_b = F / (d t) (projected area).  Source: Gere & Goodno, 7th ed., Sec. 1.6
    (from memory)."""
    if not (d > 0 and t > 0):
        raise ValueError("d and t must be > 0")
    return F / (d * t)
