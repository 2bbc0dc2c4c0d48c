"""Thin-walled open sections: shear flow along the centre line and the shear centre.

A section is a sequence of straight :class:`WallSegment` (centre line from ``start`` to
``end``, constant thickness ``t``) joined at shared end points into an open tree (no
closed cell).  Thin-wall idealisation throughout: area and second moments are those of
the centre lines, t L and t L^3/12-type terms only (terms in t^3 are dropped), and the
shear stress is uniform through the wall, tau = q / t.

Shear flow (Megson, Aircraft Structures for Engineering Students, 4th ed., Ch. 16,
shear of open-section beams; equation number not recalled).  For shears Vx, Vy through
the shear centre, q at a cut is fixed by equilibrium of the part of the section beyond
the cut; with Qx = int (y - cy) t ds and Qy = int (x - cx) t ds over the part on the
``end`` side of the cut,

    q = [(Vy Iyy - Vx Ixy) Qx + (Vx Ixx - Vy Ixy) Qy] / (Ixx Iyy - Ixy^2),

positive from ``start`` toward ``end``.  For Ixy = 0 and Vx = 0 this is q = Vy Qx / Ixx
(the shear formula).  q is zero at free ends and quadratic along a straight segment,
so resultants and moments of q are integrated exactly in closed form.

Closed single cells (tube, box: :func:`closed_cell_shear_flow`) add the closed-cell
correction: the cell is cut open at one point, the open-section flow q_open follows as
above, and a constant q0 = -(oint q_open/t ds)/(oint ds/t) restores zero twist (the
shear passes through the shear centre); q = q_open + q0 (Megson, 4th ed., Ch. 17, shear
of closed-section beams; chapter from memory).  :func:`wall_stress_peak` and
:func:`closed_cell_stress_peak` give the largest wall stress |q|/t, the thin-walled hand
value of a section's peak shear stress.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from classical.geometry import SectionProperties

__all__ = [
    "ShearCentre",
    "ShearFlowResultant",
    "WallSegment",
    "WallStressPeak",
    "angle_centreline",
    "box_centreline",
    "closed_cell_shear_flow",
    "closed_cell_stress_peak",
    "angle_shear_centre",
    "channel_centreline",
    "channel_shear_centre",
    "i_centreline",
    "mono_i_shear_centre",
    "shear_centre",
    "shear_flow",
    "shear_flow_resultant",
    "tee_centreline",
    "tee_shear_centre",
    "thinwall_properties",
    "tube_centreline",
    "tube_thinwall_peak",
    "wall_stress_peak",
]


@dataclass(frozen=True)
class WallSegment:
    """Straight wall: centre line from ``start`` to ``end`` [L], thickness ``t`` [L]."""

    start: tuple[float, float]
    end: tuple[float, float]
    t: float

    @property
    def length(self) -> float:
        return math.dist(self.start, self.end)

    @property
    def direction(self) -> tuple[float, float]:
        n = self.length
        return ((self.end[0] - self.start[0]) / n, (self.end[1] - self.start[1]) / n)


@dataclass(frozen=True)
class ShearFlowResultant:
    """Resultant of a shear flow: forces Fx, Fy [F] and moment Mz [F L] about a point
    (counter-clockwise positive, Mz = sum of x dFy - y dFx)."""

    Fx: float
    Fy: float
    Mz: float


@dataclass(frozen=True)
class ShearCentre:
    """Shear-centre coordinates [L] in the frame of the segments."""

    x: float
    y: float


def thinwall_properties(segments: Sequence[WallSegment]) -> SectionProperties:
    """Centre-line properties: A = sum t L, centroid of the lines, and per segment
    Ixx += t L (dy^2 L^2/12 + (ybar - cy)^2), Iyy likewise, Ixy += t L (dx dy L^2/12 +
    (xbar - cx)(ybar - cy)), with (dx, dy) the unit direction.  Thin-wall theory
    (t^3 terms dropped); common practice.
    """
    segs = _check(segments)
    tl = np.array([s.t * s.length for s in segs])
    mid = np.array([[(s.start[k] + s.end[k]) / 2 for k in (0, 1)] for s in segs])
    d = np.array([s.direction for s in segs])
    ln2 = np.array([s.length**2 for s in segs]) / 12.0
    area = tl.sum()
    c = tl @ mid / area
    r = mid - c
    ixx = np.sum(tl * (d[:, 1] ** 2 * ln2 + r[:, 1] ** 2))
    iyy = np.sum(tl * (d[:, 0] ** 2 * ln2 + r[:, 0] ** 2))
    ixy = np.sum(tl * (d[:, 0] * d[:, 1] * ln2 + r[:, 0] * r[:, 1]))
    return SectionProperties.from_centroidal(area, c[0], c[1], ixx, iyy, ixy)


def _check(segments: Sequence[WallSegment]) -> tuple[WallSegment, ...]:
    segs = tuple(segments)
    if not segs:
        raise ValueError("no segments")
    for k, s in enumerate(segs):
        if not (s.t > 0 and s.length > 0):
            raise ValueError(f"segment {k} needs t > 0 and non-zero length")
    return segs


def _nodes(segs: tuple[WallSegment, ...]) -> list[tuple[int, int]]:
    """Node numbers (start, end) per segment; points closer than 1e-9 x size merge."""
    size = max(s.length for s in segs)
    points: list[tuple[float, float]] = []

    def node(p: tuple[float, float]) -> int:
        for k, q in enumerate(points):
            if math.dist(p, q) <= 1e-9 * size:
                return k
        points.append(p)
        return len(points) - 1

    ends = [(node(s.start), node(s.end)) for s in segs]
    reached, frontier = {0}, [0]
    while frontier:
        n = frontier.pop()
        for a, b in ends:
            for m in (a, b):
                if n in (a, b) and m not in reached:
                    reached.add(m)
                    frontier.append(m)
    if len(points) != len(segs) + 1 or len(reached) != len(points):
        raise ValueError("segments must form one open tree (connected, no closed cell)")
    return ends


def _beyond(segs: tuple[WallSegment, ...], c: np.ndarray) -> list[np.ndarray]:
    """Per segment, [Qy, Qx] of all whole segments reached from its end node without
    passing through it (the part of the section beyond the end)."""
    ends = _nodes(segs)
    q_seg = [s.t * s.length * (np.add(s.start, s.end) / 2 - c) for s in segs]
    out = []
    for j, (_, e) in enumerate(ends):
        total, stack, seen = np.zeros(2), [e], {e}
        while stack:
            n = stack.pop()
            for k, (a, b) in enumerate(ends):
                if k != j and n in (a, b):
                    other = b if a == n else a
                    if other not in seen:
                        seen.add(other)
                        stack.append(other)
                        total = total + q_seg[k]
        out.append(total)
    return out


def _coefficients(p: SectionProperties, vy: float, vx: float) -> tuple[float, float]:
    det = p.Ixx * p.Iyy - p.Ixy**2
    return (vy * p.Iyy - vx * p.Ixy) / det, (vx * p.Ixx - vy * p.Ixy) / det


def shear_flow(
    segments: Sequence[WallSegment], index: int, s: float | np.ndarray, Vy: float,
    Vx: float = 0.0,
) -> np.ndarray:
    """Shear flow q [F/L] at distances ``s`` from the start of segment ``index``.

    q = a Qx + b Qy (module docstring), the first moments taken over the end side of
    the cut: the segment part (s, L) plus everything beyond its end node.  Positive
    toward the segment's ``end``.  Shear stress in the wall is q / t.
    """
    segs = _check(segments)
    p = thinwall_properties(segs)
    c = np.array([p.cx, p.cy])
    seg = segs[index]
    s = np.asarray(s, dtype=float)
    length, d = seg.length, np.array(seg.direction)
    r0 = np.array(seg.start) - c
    beyond = _beyond(segs, c)[index]
    part = [seg.t * (r0[k] * (length - s) + d[k] * (length**2 - s**2) / 2) for k in (0, 1)]
    a, b = _coefficients(p, Vy, Vx)
    return a * (beyond[1] + part[1]) + b * (beyond[0] + part[0])


def shear_flow_resultant(
    segments: Sequence[WallSegment], Vy: float, Vx: float = 0.0,
    about: tuple[float, float] = (0.0, 0.0), indices: Sequence[int] | None = None,
) -> ShearFlowResultant:
    """Exact resultant of q over the chosen segments (default all) about ``about``.

    Per segment, int_0^L q ds = a (L Qx_beyond + t ((y0 - cy) L^2/2 + dy L^3/3)) + b (...x);
    the force is that integral times the direction, the moment that integral times the
    constant lever (x0 - px) dy - (y0 - py) dx.  Equilibrium requires (Fx, Fy) = (Vx, Vy)
    over the whole section.
    """
    segs = _check(segments)
    p = thinwall_properties(segs)
    c = np.array([p.cx, p.cy])
    beyond = _beyond(segs, c)
    a, b = _coefficients(p, Vy, Vx)
    fx = fy = mz = 0.0
    for k in range(len(segs)) if indices is None else indices:
        seg = segs[k]
        length, d = seg.length, seg.direction
        r0 = np.array(seg.start) - c
        q_int = [beyond[k][m] * length + seg.t * (r0[m] * length**2 / 2 + d[m] * length**3 / 3)
                 for m in (0, 1)]
        total = a * q_int[1] + b * q_int[0]
        lever = (seg.start[0] - about[0]) * d[1] - (seg.start[1] - about[1]) * d[0]
        fx, fy, mz = fx + total * d[0], fy + total * d[1], mz + total * lever
    return ShearFlowResultant(float(fx), float(fy), float(mz))


def shear_centre(segments: Sequence[WallSegment]) -> ShearCentre:
    """Shear centre of an open thin-walled section: the point through which the shear
    flow of a shear Vy = 1 (and of Vx = 1) passes, x_sc = Mz(Vy=1), y_sc = -Mz(Vx=1)
    about the origin.  Source: definition of the shear centre (Megson, Ch. 16)."""
    x = shear_flow_resultant(segments, 1.0, 0.0).Mz
    y = -shear_flow_resultant(segments, 0.0, 1.0).Mz
    return ShearCentre(x + 0.0, y + 0.0)  # + 0.0 turns -0.0 into 0.0


def i_centreline(h: float, b: float, t_f: float, t_w: float) -> tuple[WallSegment, ...]:
    """Doubly symmetric I: web (0, -h/2)->(0, h/2), four half-flanges from the web ends to
    (+-b/2, +-h/2); h between flange centre lines."""
    y = h / 2
    return (
        WallSegment((0, -y), (0, y), t_w),
        WallSegment((0, y), (-b / 2, y), t_f), WallSegment((0, y), (b / 2, y), t_f),
        WallSegment((0, -y), (-b / 2, -y), t_f), WallSegment((0, -y), (b / 2, -y), t_f),
    )


def channel_centreline(h: float, b: float, t_f: float, t_w: float) -> tuple[WallSegment, ...]:
    """Channel: web centre line on x = 0 from (0, -h/2) to (0, h/2), flanges to (b, +-h/2);
    h between flange centre lines, b from the web centre line to the flange tip."""
    y = h / 2
    return (WallSegment((0, -y), (0, y), t_w),
            WallSegment((0, y), (b, y), t_f), WallSegment((0, -y), (b, -y), t_f))


def tee_centreline(h: float, b: float, t_f: float, t_w: float) -> tuple[WallSegment, ...]:
    """Tee: flange centre line on y = 0 from (-b/2, 0) to (b/2, 0) through the junction,
    web from (0, 0) down to (0, -h); h from the flange centre line to the web tip."""
    return (WallSegment((0, 0), (0, -h), t_w),
            WallSegment((0, 0), (-b / 2, 0), t_f), WallSegment((0, 0), (b / 2, 0), t_f))


def angle_centreline(a: float, b: float, t: float) -> tuple[WallSegment, ...]:
    """Angle: legs from the centre-line corner (0, 0) to (a, 0) and to (0, b)."""
    return (WallSegment((0, 0), (a, 0), t), WallSegment((0, 0), (0, b), t))


def channel_shear_centre(h: float, b: float, t_f: float, t_w: float) -> float:
    """Distance e [L] of the shear centre from the web centre line, on the side away from
    the flanges:  e = 3 b^2 t_f / (6 b t_f + h t_w);  for t_f = t_w, e = 3 b^2/(h + 6 b).

    h between flange centre lines, b from the web centre line to the flange tip.
    Derivation: I = h^2 (h t_w + 6 b t_f)/12 (thin wall), flange force
    F = V b^2 t_f h/(4 I), and F h = V e.  Equal-thickness form: Gere & Goodno,
    Mechanics of Materials, 7th ed., Ch. 6; Beer & Johnston, Mechanics of Materials,
    Ch. 6 (chapters from memory).  Valid for t << b, h.
    """
    return 3.0 * b**2 * t_f / (6.0 * b * t_f + h * t_w)


def mono_i_shear_centre(
    h: float, b_top: float, t_top: float, b_bottom: float, t_bottom: float
) -> float:
    """Distance [L] of the shear centre below the top-flange centre line of an I with
    unequal flanges: e = h I_b / (I_t + I_b), I_t = t_top b_top^3/12, I_b likewise.

    The flanges carry a horizontal shear in proportion to their second moments about
    the web (the web carries none in thin-wall theory); moments about the top flange
    give e.  On the web centre line.  Common practice (Megson, Ch. 16).
    """
    it, ib = t_top * b_top**3, t_bottom * b_bottom**3
    return h * ib / (it + ib)


def tee_shear_centre(depth: float, flange_thickness: float) -> ShearCentre:
    """Shear centre of a tee at the junction of the flange and web centre lines: in the
    :func:`classical.shapes.tee` frame (0, depth - t_f/2).  Every wall passes through it,
    so the shear flow has no moment about it.  Common practice (thin wall)."""
    return ShearCentre(0.0, depth - flange_thickness / 2)


def angle_shear_centre(thickness: float) -> ShearCentre:
    """Shear centre of an angle at the junction of the leg centre lines: in the
    :func:`classical.shapes.angle` frame (t/2, t/2).  Common practice (thin wall)."""
    return ShearCentre(thickness / 2, thickness / 2)


@dataclass(frozen=True)
class WallStressPeak:
    """Largest wall shear stress |q|/t [F/L^2] of a thin-walled section: on segment
    ``segment`` at distance ``s`` [L] from its start, point ``at`` [L]."""

    tau: float
    segment: int
    s: float
    at: tuple[float, float]


def _quadratic_candidates(length: float, d: tuple[float, float], r0: np.ndarray,
                          a: float, b: float) -> np.ndarray:
    """Ends of a segment and the stationary point of q (dq/ds = -t (a y + b x) = 0 at
    s* = -(a r0y + b r0x)/(a dy + b dx)) where it lies inside."""
    s = [0.0, length]
    den = a * d[1] + b * d[0]
    if den != 0.0:
        st = -(a * r0[1] + b * r0[0]) / den
        if 0.0 < st < length:
            s.append(st)
    return np.array(s)


def wall_stress_peak(segments: Sequence[WallSegment], Vy: float,
                     Vx: float = 0.0) -> WallStressPeak:
    """Peak wall shear stress max |q|/t of an open thin-walled section (q from
    :func:`shear_flow`; exact: q is quadratic along each segment, so the maximum is at an
    end or at the stationary point of q).  Source: Megson, Ch. 16 (as the module).
    Valid for t << wall lengths; shear through the shear centre."""
    segs = _check(segments)
    p = thinwall_properties(segs)
    c = np.array([p.cx, p.cy])
    a, b = _coefficients(p, Vy, Vx)
    best = WallStressPeak(0.0, 0, 0.0, segs[0].start)
    for k, seg in enumerate(segs):
        ss = _quadratic_candidates(seg.length, seg.direction, np.array(seg.start) - c, a, b)
        tau = np.abs(shear_flow(segs, k, ss, Vy, Vx)) / seg.t
        j = int(np.argmax(tau))
        if tau[j] > best.tau:
            d = seg.direction
            at = (float(seg.start[0] + ss[j] * d[0]), float(seg.start[1] + ss[j] * d[1]))
            best = WallStressPeak(float(tau[j]), k, float(ss[j]), at)
    return best


def _closed_loop(points: Sequence[Sequence[float]], t: float) -> tuple[WallSegment, ...]:
    pts = [tuple(map(float, q)) for q in points]
    if len(pts) < 3 or not t > 0:
        raise ValueError("a closed cell needs at least 3 centre-line points and t > 0")
    return tuple(WallSegment(pts[k], pts[(k + 1) % len(pts)], t) for k in range(len(pts)))


def _closed_q(seg: WallSegment, c: np.ndarray, a: float, b: float, q_start: float,
              s: np.ndarray) -> np.ndarray:
    """q_open along one segment of a cut-open cell: q_start - t (a Qx + b Qy) of the wall
    from the segment's start to s (quadratic in s)."""
    d, r0 = seg.direction, np.array(seg.start) - c
    return q_start - seg.t * (a * (r0[1] * s + d[1] * s**2 / 2) + b * (r0[0] * s + d[0] * s**2 / 2))


def _closed_cell(points: Sequence[Sequence[float]], t: float, Vy: float, Vx: float
                 ) -> tuple[tuple[WallSegment, ...], np.ndarray, float, float, list[float], float]:
    """The cell's segments, centroid, bending-rate coefficients a, b, the open flow at each
    segment start, and the closed-cell correction q0 (q = q_open + q0)."""
    segs = _closed_loop(points, t)
    p = thinwall_properties(segs)
    c = np.array([p.cx, p.cy])
    a, b = _coefficients(p, Vy, Vx)
    starts, q_start, total, perimeter = [], 0.0, 0.0, 0.0
    for seg in segs:
        L = seg.length
        q3 = _closed_q(seg, c, a, b, q_start, np.array([0.0, L / 2, L]))
        starts.append(q_start)
        total += L / 6 * float(q3[0] + 4 * q3[1] + q3[2])   # Simpson: exact for quadratic q
        perimeter += L
        q_start = float(q3[2])
    return segs, c, a, b, starts, -total / perimeter


def closed_cell_shear_flow(points: Sequence[Sequence[float]], t: float, Vy: float,
                           Vx: float = 0.0, samples: int = 5
                           ) -> tuple[tuple[WallSegment, ...], np.ndarray, np.ndarray]:
    """Shear flow q [F/L] around one closed cell of constant wall thickness t [L].

    ``points`` are the centre-line vertices in order (the cell's polygon, either sense).
    The cell is cut at ``points[0]``; along segment k (start P_k, unit direction d,
    r0 = P_k - centroid) q_open(s) = q_k - t (a (r0y s + dy s^2/2) + b (r0x s + dx s^2/2))
    with a, b the bending-rate coefficients of the module formula, then
    q = q_open + q0, q0 = -(oint q_open ds)/(oint ds) (t constant; Simpson's rule per
    segment, exact for the quadratic q).  Positive along the segments' direction.
    Source: Megson, 4th ed., Ch. 17 (chapter from memory).  Valid for t << cell size;
    shear through the shear centre (no twist).

    Returns
    -------
    (segments, s, q)
        The loop's segments; ``s`` (n_seg, samples) distances from each start; ``q`` the
        flow there.
    """
    segs, c, a, b, starts, q0 = _closed_cell(points, t, Vy, Vx)
    s = np.array([np.linspace(0.0, seg.length, samples) for seg in segs])
    q = np.array([_closed_q(seg, c, a, b, qs, s[k])
                  for k, (seg, qs) in enumerate(zip(segs, starts, strict=True))])
    return segs, s, q + q0


def closed_cell_stress_peak(points: Sequence[Sequence[float]], t: float, Vy: float,
                            Vx: float = 0.0) -> WallStressPeak:
    """Peak wall shear stress max |q|/t of a closed single cell (:func:`closed_cell_shear_flow`;
    the maximum of each quadratic piece is at an end or its stationary point, as in
    :func:`wall_stress_peak`).  Source: Megson, 4th ed., Ch. 17 (from memory)."""
    segs, c, a, b, starts, q0 = _closed_cell(points, t, Vy, Vx)
    best = WallStressPeak(0.0, 0, 0.0, segs[0].start)
    for k, (seg, qs) in enumerate(zip(segs, starts, strict=True)):
        d = seg.direction
        ss = _quadratic_candidates(seg.length, d, np.array(seg.start) - c, a, b)
        tau = np.abs(_closed_q(seg, c, a, b, qs, ss) + q0) / t
        j = int(np.argmax(tau))
        if tau[j] > best.tau:
            best = WallStressPeak(float(tau[j]), k, float(ss[j]),
                                  (seg.start[0] + ss[j] * d[0], seg.start[1] + ss[j] * d[1]))
    return best


def box_centreline(width: float, depth: float, wall: float) -> list[tuple[float, float]]:
    """Centre-line rectangle of a box of outside ``width`` x ``depth`` and wall ``wall``,
    centred on the origin (the :func:`classical.shapes.box` frame), counter-clockwise."""
    x, y = (width - wall) / 2, (depth - wall) / 2
    return [(-x, -y), (x, -y), (x, y), (-x, y)]


TUBE_FACETS = 360  # centre-line polygon of a tube: flow error ~ (pi/360)^2 ~ 1e-4 relative


def tube_centreline(diameter: float, wall: float, n: int = TUBE_FACETS
                    ) -> list[tuple[float, float]]:
    """Centre-line circle (radius (diameter - wall)/2) of a tube as an n-gon, centred on
    the origin, counter-clockwise."""
    r = (diameter - wall) / 2
    th = 2 * math.pi * (np.arange(n) + 0.5) / n
    return [(float(r * math.cos(a)), float(r * math.sin(a))) for a in th]


def tube_thinwall_peak(diameter: float, wall: float, V: float) -> float:
    """Peak shear stress of a thin circular tube: tau = V/(pi R t) = 2 V/A at the neutral
    axis, R = (diameter - wall)/2 the centre-line radius, A = 2 pi R t.  Source: Megson,
    Ch. 17, closed circular section (from memory); common practice.  Valid for t << R."""
    r = (diameter - wall) / 2
    return V / (math.pi * r * wall)
