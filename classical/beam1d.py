"""Elementary beam statics for any support layout: a 1D Euler-Bernoulli frame.

Nodes sit at every support, load end and requested station; each element is the standard
two-node frame element (axial EA/L, bending 12EI/L^3 ... 4EI/L; e.g. Przemieniecki,
*Theory of Matrix Structural Analysis*, 1968, ch. 5). Distributed loads get consistent
nodal loads (Gauss quadrature of the Hermite shapes, exact for the polynomial loads used
here), so nodal displacements and reactions are exact Euler-Bernoulli values; for a
statically determinate layout the reactions are those of statics alone and EI does not
matter.

Section forces follow from the free body to the right of the station (loads and
reactions), with the sign convention of the cut integrals used by the FE side:
``V = sum of Fy to the right`` (= integral of tau_xy over a face with normal +x),
``N = sum of Fx to the right``, and ``M = -sum[(x_i - x) Fy_i - (y_i - y_c) Fx_i] -
sum C_i`` (C counter-clockwise couples), i.e. M > 0 puts the top fibres in tension and
dM/dx = V. Units: any consistent set (forces F, lengths L; moments F L).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = ["BeamSupport", "PointLoad", "LineLoad", "BeamModel", "solve_beam",
           "MechanismError"]


class MechanismError(ValueError):
    """The 1D support layout cannot carry the loads (a mechanism)."""


@dataclass(frozen=True)
class BeamSupport:
    """A support at x restraining any of 'u' (axial), 'v' (transverse), 'rot'."""

    x: float
    restrains: frozenset[str]
    name: str = ""


@dataclass(frozen=True)
class PointLoad:
    """Force (Fx, Fy) acting at (x, y) and a counter-clockwise couple C  [F, L, F L]."""

    x: float
    Fx: float = 0.0
    Fy: float = 0.0
    y: float = 0.0
    C: float = 0.0


@dataclass(frozen=True)
class LineLoad:
    """Total force (Fx, Fy) spread over x0..x1 at height y, 'uniform' or 'parabolic'.

    Parabolic: intensity 6 F s (1 - s)/(x1 - x0), s = (x - x0)/(x1 - x0).
    """

    x0: float
    x1: float
    Fx: float = 0.0
    Fy: float = 0.0
    y: float = 0.0
    shape: str = "uniform"

    def fraction_right_of(self, x: float) -> tuple[float, float]:
        """(fraction of the total right of x, its centroid x)."""
        if x <= self.x0:
            return 1.0, self._centroid(self.x0, self.x1)
        if x >= self.x1:
            return 0.0, x
        return self._part(x, self.x1), self._centroid(x, self.x1)

    def _cdf(self, x: float) -> float:
        s = (x - self.x0) / (self.x1 - self.x0)
        return s if self.shape == "uniform" else 3 * s**2 - 2 * s**3

    def _part(self, a: float, b: float) -> float:
        return self._cdf(b) - self._cdf(a)

    def _centroid(self, a: float, b: float) -> float:
        g = np.polynomial.legendre.leggauss(6)
        xs = 0.5 * (b - a) * g[0] + 0.5 * (a + b)
        w = self.intensity(xs) * g[1]
        return float((w * xs).sum() / w.sum()) if w.sum() > 0 else 0.5 * (a + b)

    def intensity(self, x: np.ndarray) -> np.ndarray:
        s = (np.asarray(x) - self.x0) / (self.x1 - self.x0)
        inside = (s >= 0) & (s <= 1)
        q = np.ones_like(s) if self.shape == "uniform" else 6 * s * (1 - s)
        return np.where(inside, q / (self.x1 - self.x0), 0.0)


@dataclass(frozen=True)
class BeamModel:
    """Solved beam: reactions per support, and section forces at any station."""

    supports: tuple[BeamSupport, ...]
    reactions: tuple[tuple[float, float, float], ...]  # (Rx, Ry, C) per support
    points: tuple[PointLoad, ...]
    lines: tuple[LineLoad, ...]
    axis_y: float
    determinate: bool

    def forces(self, x: float, y_c: float | None = None) -> tuple[float, float, float]:
        """(V, N, M) at station x, moments about (x, y_c) (default: the beam axis)."""
        yc = self.axis_y if y_c is None else y_c
        V = N = M = 0.0
        forces = [(p.x, p.y, p.Fx, p.Fy, p.C) for p in self.points]
        forces += [(s.x, self.axis_y, r[0], r[1], r[2])
                   for s, r in zip(self.supports, self.reactions, strict=True)]
        for xi, yi, fx, fy, c in forces:
            if xi > x:
                V += fy
                N += fx
                M -= (xi - x) * fy - (yi - yc) * fx + c
        for ln in self.lines:
            frac, xc = ln.fraction_right_of(x)
            if frac > 0:
                V += frac * ln.Fy
                N += frac * ln.Fx
                M -= (xc - x) * frac * ln.Fy - (ln.y - yc) * frac * ln.Fx
        return V, N, M


def _frame_k(L: float, EA: float, EI: float) -> np.ndarray:
    a, b = EA / L, EI / L**3
    return np.array([
        [a, 0, 0, -a, 0, 0],
        [0, 12 * b, 6 * b * L, 0, -12 * b, 6 * b * L],
        [0, 6 * b * L, 4 * b * L**2, 0, -6 * b * L, 2 * b * L**2],
        [-a, 0, 0, a, 0, 0],
        [0, -12 * b, -6 * b * L, 0, 12 * b, -6 * b * L],
        [0, 6 * b * L, 2 * b * L**2, 0, -6 * b * L, 4 * b * L**2],
    ])


def _node(nodes: np.ndarray, x: float) -> int:
    """Index of the node nearest to x."""
    return int(np.argmin(np.abs(nodes - x)))


RANK_TOL = 1e-9   # rigid-body restraint matrix (entries of order 1): rank-deficient below this


def _restraint_rows(fixed: list[tuple[int, int]], xi: np.ndarray) -> np.ndarray:
    """Rows of the rigid-body modes (u = a, v = b + c xi, rot = c) seen by each fixed dof,
    in the member's own length unit (xi = (x - x_first) / span): scale-free."""
    rows = {0: lambda i: (1.0, 0.0, 0.0), 1: lambda i: (0.0, 1.0, xi[i]),
            2: lambda i: (0.0, 0.0, 1.0)}
    return np.array([rows[k](i) for i, k in fixed], dtype=float).reshape(-1, 3)


def solve_beam(supports: list[BeamSupport], points: list[PointLoad], lines: list[LineLoad],
               EA: float = 1.0, EI: float = 1.0, axis_y: float = 0.0,
               stations: list[float] | None = None) -> BeamModel:
    """Reactions by statics (determinate) or the stiffness method; MechanismError for a
    mechanism.

    Couples from forces applied off the axis: a force Fx at height y acts on the axis with
    the couple -(y - axis_y) Fx. Horizontal reactions act on the axis.

    Everything is scale-free: lengths are measured in the span (xi = (x - x_first) / span),
    so a member of 1e-6 or 1e6 length units, or translated far from the origin, gives the
    same decisions. The mechanism test is the rank of the rigid-body restraint matrix
    (`_restraint_rows`, entries of order 1); a determinate layout (three independent
    restraints) takes its reactions from the three equilibrium equations alone; an
    indeterminate one from the frame stiffness in span units, where only the ratio
    EA span^2 / EI enters. `stations` are accepted for compatibility: section forces at any
    station follow from the free body (`BeamModel.forces`) and need no node there (a node a
    hair from another made the stiffness matrix ill-conditioned).
    """
    del stations
    xs = {s.x for s in supports} | {p.x for p in points}
    xs |= {v for ln in lines for v in (ln.x0, ln.x1)}
    nodes = np.array(sorted(xs))
    span = float(nodes[-1] - nodes[0]) if len(nodes) > 1 else 0.0
    if len(nodes) > 1:  # stations a hair apart (round-off) are one node, not a 0-length element
        scale = max(span, 1e-300)
        nodes = nodes[np.concatenate([[True], np.diff(nodes) > 1e-9 * scale])]
    n = len(nodes)
    if n < 2:
        unit = max(abs(float(nodes[0])), 1.0) if span == 0.0 else span
        nodes = np.array([nodes[0], nodes[0] + unit])
        n = 2
    Lr = float(nodes[-1] - nodes[0])
    xi = (nodes - nodes[0]) / Lr
    f = np.zeros(3 * n)   # nodal loads: forces F, couples F L (physical)
    g, w = np.polynomial.legendre.leggauss(6)
    for e in range(n - 1):
        x0, x1 = nodes[e], nodes[e + 1]
        L = x1 - x0
        idx = np.arange(3 * e, 3 * e + 6)
        xq = 0.5 * L * g + 0.5 * (x0 + x1)
        s = (xq - x0) / L
        Nv = np.array([1 - 3 * s**2 + 2 * s**3, L * (s - 2 * s**2 + s**3),
                       3 * s**2 - 2 * s**3, L * (-(s**2) + s**3)])
        Nu = np.array([1 - s, s])
        for ln in lines:
            q = ln.intensity(xq) * 0.5 * L * w
            f[idx[[1, 2, 4, 5]]] += Nv @ q * ln.Fy
            f[idx[[0, 3]]] += Nu @ q * ln.Fx
            f[idx[[2, 5]]] += -(ln.y - axis_y) * ln.Fx * (Nu @ q)
    for p in points:
        i = _node(nodes, p.x)
        f[3 * i:3 * i + 3] += [p.Fx, p.Fy, p.C - (p.y - axis_y) * p.Fx]
    fixed: list[tuple[int, int]] = []
    for sup in supports:
        i = _node(nodes, sup.x)
        fixed += [(i, k) for k, name in enumerate(("u", "v", "rot")) if name in sup.restrains]
    fixed = sorted(set(fixed))
    A = _restraint_rows(fixed, xi)
    sv = np.linalg.svd(A, compute_uv=False) if len(fixed) else np.zeros(0)
    if len(sv) < 3 or sv[2] <= RANK_TOL * sv[0]:
        raise MechanismError("the supports, idealised as beam supports, form a mechanism")
    # S: dofs in span units (u, v divided by Lr; rotations as they are)
    S = np.tile([Lr, Lr, 1.0], n)
    fs = S * f    # work-conjugate loads of the scaled dofs: Lr F, Lr F, couples
    if len(fixed) == 3:
        r_s = np.linalg.solve(A.T, -np.array([fs[0::3].sum(), fs[1::3].sum(),
                                               (xi * fs[1::3]).sum() + fs[2::3].sum()]))
        r = np.zeros(3 * n)
        for (i, k), val in zip(fixed, r_s, strict=True):
            r[3 * i + k] = val / S[3 * i + k]
    else:
        r = _indeterminate(nodes, xi, fixed, fs, S, EA * Lr**2 / EI)
    reactions = []
    for sup in supports:
        i = _node(nodes, sup.x)
        mine = [k for k, name in enumerate(("u", "v", "rot")) if name in sup.restrains]
        vals = [0.0, 0.0, 0.0]
        for k in mine:
            vals[k] = float(r[3 * i + k])
        reactions.append(tuple(vals))
    # several supports at one node share its reaction: give it to the first
    seen: set[int] = set()
    for j, sup in enumerate(supports):
        i = _node(nodes, sup.x)
        if i in seen:
            reactions[j] = (0.0, 0.0, 0.0)
        seen.add(i)
    return BeamModel(supports=tuple(supports), reactions=tuple(reactions),
                     points=tuple(points), lines=tuple(lines), axis_y=axis_y,
                     determinate=len(fixed) == 3)


def _indeterminate(nodes: np.ndarray, xi: np.ndarray, fixed: list[tuple[int, int]],
                   fs: np.ndarray, S: np.ndarray, alpha: float) -> np.ndarray:
    """Physical reactions of an indeterminate layout: the frame stiffness in span units
    (EI = 1, EA = alpha = EA span^2 / EI), symmetric diagonal scaling before the solve."""
    n = len(nodes)
    K = np.zeros((3 * n, 3 * n))
    for e in range(n - 1):
        idx = np.arange(3 * e, 3 * e + 6)
        K[np.ix_(idx, idx)] += _frame_k(xi[e + 1] - xi[e], alpha, 1.0)
    fixed_dofs = [3 * i + k for i, k in fixed]
    free = np.setdiff1d(np.arange(3 * n), fixed_dofs)
    Kff = K[np.ix_(free, free)]
    d = 1.0 / np.sqrt(np.diag(Kff))
    u = np.zeros(3 * n)
    u[free] = d * np.linalg.solve(d[:, None] * Kff * d[None, :], d * fs[free])
    return (K @ u - fs) / S
