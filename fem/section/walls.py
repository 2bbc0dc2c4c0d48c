"""Shear flow along the wall centre lines: the FE averaged through the wall against
thin-wall theory (open walls: :func:`classical.thinwall.shear_flow`; a box:
:func:`classical.thinwall.closed_cell_shear_flow`; Megson, 4th ed., Ch. 16-17).

At each station s of a wall's centre line the FE flow is
:math:`q_{FE}(s) = \\int_{-t/2}^{t/2} \\tau\\cdot e\\,dn` across the wall (e along the
wall, Gauss-Legendre through the thickness), i.e. the FE stress averaged through the wall
times t; the sense is the centre line's, from ``start`` to ``end``.  Near a junction
or corner the line across the wall runs into the next wall, where neither side is a
thin-wall flow: compare away from the corners.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from classical.thinwall import WallSegment, closed_cell_shear_flow, shear_flow
from fem.section.hand_method import centreline
from fem.section.solve import SectionSolution

__all__ = ["WallFlow", "through_wall_flow", "wall_flows", "THROUGH_WALL_POINTS"]

THROUGH_WALL_POINTS = 8  # Gauss-Legendre points across the wall (the stress is smooth there)


@dataclass(frozen=True)
class WallFlow:
    """FE and thin-wall shear flow [F/L] at stations ``s`` [L] of one wall."""

    index: int
    segment: WallSegment
    s: np.ndarray
    q_fe: np.ndarray
    q_thin: np.ndarray


def through_wall_flow(sol: SectionSolution, seg: WallSegment, s: np.ndarray,
                  V: tuple[float, float]) -> np.ndarray:
    e = np.array(seg.direction)
    n = np.array([-e[1], e[0]])
    g, w = np.polynomial.legendre.leggauss(THROUGH_WALL_POINTS)
    c = np.asarray(seg.start) + s[:, None] * e                       # (ns, 2)
    pts = c[:, None, :] + (0.5 * seg.t * g)[None, :, None] * n       # (ns, ng, 2)
    tau = sol.probe(pts.reshape(-1, 2), *V) @ e
    return (tau.reshape(len(s), -1) * (0.5 * seg.t * w)).sum(axis=1)


def wall_flows(sol: SectionSolution, shape: str, params: dict, V: tuple[float, float],
               samples: int = 61) -> list[WallFlow]:
    """FE and thin-wall shear flow along every wall of a thin-walled shape (open, box)."""
    segs = centreline(shape, params)
    if shape == "box":
        pts = [s.start for s in segs]
        _, ss, qq = closed_cell_shear_flow(pts, segs[0].t, V[1], V[0], samples)
        thin = list(qq)
        stations = list(ss)
    else:
        stations = [np.linspace(0.0, s.length, samples) for s in segs]
        thin = [shear_flow(segs, k, stations[k], V[1], V[0]) for k in range(len(segs))]
    return [WallFlow(k, seg, stations[k], through_wall_flow(sol, seg, stations[k], V), thin[k])
            for k, seg in enumerate(segs)]
