"""The dimensionless frame gmsh meshes a member in, so the mesh does not depend on the units.

gmsh's meshers are not scale-invariant: the same 200 x 100 plate with a hole meshed at scale
1, 1e-3, 1/25.4 and 7 gives four different meshes (measured: node counts 189–191, node
sums apart in the third digit), so a member written in mm/N, m/kN or in/lbf got a different
mesh and ratios up to 0.5 % apart. Every number handed to gmsh is therefore measured from
the member's bottom-left corner in units of its depth and snapped to a grid of 2**-40
(about 1e-12 of the depth): the three unit systems then hand gmsh bit-identical numbers and
get bit-identical meshes (measured, same plate). The mesh nodes are mapped back to the
case's coordinates in the hand-over. The frame also keeps a member placed far from the
origin (coordinates 1e12 times its size) meshable: gmsh sees numbers of order one.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from fem.case.model import BeamGeometry, Cutout, Hole, Zone
from fem.case.outline import Patch

__all__ = ["Frame", "SNAP"]

SNAP = 2.0**-40   # grid of the frame's numbers: far below any element, far above round-off

Point = tuple[float, float]


def _snap(v: float) -> float:
    return round(v / SNAP) * SNAP


@dataclass(frozen=True)
class Frame:
    """Case coordinates (x, y) -> frame coordinates ((x - x0) / depth, (y - y0) / depth)."""

    origin: Point
    scale: float

    @classmethod
    def of(cls, bounds: tuple[float, float, float, float]) -> Frame:
        """The frame of a member with domain bounds (x0, y0, x1, y1): its depth is the unit."""
        x0, y0, x1, y1 = bounds
        return cls(origin=(x0, y0), scale=(y1 - y0) or (x1 - x0))

    def length(self, v: float) -> float:
        return _snap(v / self.scale)

    def point(self, p: Point) -> Point:
        return (_snap((p[0] - self.origin[0]) / self.scale),
                _snap((p[1] - self.origin[1]) / self.scale))

    def points(self, x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Arrays of case coordinates in the frame (snapped like `point`)."""
        return (np.round((x - self.origin[0]) / self.scale / SNAP) * SNAP,
                np.round((y - self.origin[1]) / self.scale / SNAP) * SNAP)

    def lengths(self, v: np.ndarray) -> np.ndarray:
        return np.round(v / self.scale / SNAP) * SNAP

    def back(self, xy: np.ndarray) -> np.ndarray:
        """Frame coordinates, shape (n, 2), back to case coordinates."""
        return np.asarray(self.origin) + self.scale * xy

    def geometry(self, g: BeamGeometry) -> BeamGeometry:
        """The member's outline, holes, openings, cut-outs and zones in the frame (thickness and
        arc bulges unchanged)."""
        return replace(
            g, length=self.length(g.length), depth=self.length(g.depth),
            # anything after x, y in a vertex (an arc's bulge) is dimensionless: kept as is
            points=tuple(self.point(p) + tuple(p[2:]) for p in g.points),
            holes=tuple(Hole(center=self.point(h.center), radius=self.length(h.radius))
                        for h in g.holes),
            cutouts=tuple(replace(c, corner=self.point(c.corner), size=self._size(c),
                                  fillet=self.length(c.fillet)) for c in g.cutouts),
            zones=tuple(replace(z, corner=self.point(z.corner), size=self._size(z))
                        for z in g.zones),
            # an opening's vertices are (x, y, bulge); the bulge is dimensionless
            openings=tuple(tuple(self.point(v[:2]) + tuple(v[2:]) for v in ring)
                           for ring in g.openings))

    def patch(self, p: Patch) -> Patch:
        return replace(p, segments=tuple((self.point(a), self.point(b)) for a, b in p.segments),
                       point=None if p.point is None else self.point(p.point))

    def _size(self, c: Cutout | Zone) -> Point:
        return (self.length(c.size[0]), self.length(c.size[1]))
