"""A section made of rectangular strips stacked in y: the cut of a 2D member.

A vertical cut through a plate member of thickness t meets material in one or more
stretches [y0, y1]; with thickness zones (flanges drawn in elevation) each stretch has its
own t. The section is therefore a set of rectangles of width t and height y1 - y0, and
its properties are exact sums over the rectangles (common practice).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = ["StripSection"]


@dataclass(frozen=True)
class StripSection:
    """Strips (y0, y1, t), bottom to top, not overlapping. Lengths in any one unit."""

    strips: tuple[tuple[float, float, float], ...]

    @property
    def area(self) -> float:
        """A = sum t (y1 - y0)  [L^2]."""
        return float(sum(t * (b - a) for a, b, t in self.strips))

    @property
    def centroid(self) -> float:
        """y_bar = sum t (y1 - y0)(y0 + y1)/2 / A  [L]."""
        return float(sum(t * (b - a) * 0.5 * (a + b) for a, b, t in self.strips) / self.area)

    @property
    def inertia(self) -> float:
        """I = sum t [(y1 - yb)^3 - (y0 - yb)^3] / 3 about the centroid  [L^4]."""
        yb = self.centroid
        return float(sum(t * ((b - yb) ** 3 - (a - yb) ** 3) / 3.0 for a, b, t in self.strips))

    @property
    def bottom(self) -> float:
        return self.strips[0][0]

    @property
    def top(self) -> float:
        return self.strips[-1][1]

    def first_moment(self, y: np.ndarray | float) -> np.ndarray:
        """Q(y) = integral over the material above y of (eta - y_bar) dA  [L^3].

        Exact for strips: each strip above contributes t [(y1 - yb)^2 - (max(y0, y) - yb)^2]/2.
        Q vanishes at the top and bottom fibres (sum over the section is zero).
        """
        y = np.asarray(y, float)
        yb = self.centroid
        q = np.zeros_like(y)
        for a, b, t in self.strips:
            lo = np.clip(y, a, b)
            q += t * ((b - yb) ** 2 - (lo - yb) ** 2) / 2.0
        return q

    def width(self, y: np.ndarray | float) -> np.ndarray:
        """b(y): the material width at level y (the strip thickness; 0 in a void)  [L].

        At a level shared by two strips (a thickness change) the smaller width is taken,
        which gives the larger shear stress (common practice).
        """
        y = np.asarray(y, float)
        b = np.full_like(y, np.inf)
        for a, top, t in self.strips:
            inside = (y >= a) & (y <= top)
            b = np.where(inside, np.minimum(b, t), b)
        return np.where(np.isinf(b), 0.0, b)

    def fibre_distance(self) -> float:
        """c = the larger distance from the centroid to an extreme fibre  [L]."""
        yb = self.centroid
        return max(self.top - yb, yb - self.bottom)
