r"""Shear flow across joint lines of a section: FE against VQ/I.

A joint is a straight line across the section (a weld throat, a bolt row, a glue line).
The **FE shear flow** across it is :math:`q_{FE} = \int \tau\cdot n\,ds` along the line
(force per unit length of the member), with n the unit normal pointing into the part the
line cuts off.  The **hand shear flow** is the shear formula of the cut-off part,
:math:`q = V Q / I` (Gere & Goodno, *Mechanics of Materials*, built-up beams and shear
flow; common practice), in its general form :math:`q = a Q_y + b Q_x` with
:math:`(a, b) = [[I_{yy}, I_{xy}], [I_{xy}, I_{xx}]]^{-1} (V_x, V_y)` (for
:math:`I_{xy} = 0` and :math:`V_x = 0` simply :math:`V_y Q_x / I_{xx}`), Q the first
moment of the cut-off part about the centroidal axes.

Equilibrium of the cut-off part along the member gives the hand value exactly for the
elastic solution (the flexure solve has :math:`\operatorname{div}\tau = -(a x + b y)`,
fem.section.solve), so the FE side checks the arithmetic and the choice of part, and a
ratio far from 1 means the line does not cut off the part assumed.

A line that does not separate the section on its own (a web-to-flange joint of a closed
box) cuts off a part only together with another cut.  If the section is mirror-symmetric
about the line through the centroid parallel to the shear, the shear flow on that axis
is zero by symmetry, and the axis is the second cut (the part is the half flange between
the joint and the axis).  Otherwise the joint's share is statically indeterminate
(closed-cell theory): the FE figure is given and the hand value is left out.

Fasteners: with ``spacing`` s, the demand per fastener is q s; with ``capacity`` C per
fastener, the largest spacing is C / q; with ``throat`` a of each of ``welds`` n welds,
the throat shear stress is q / (n a) — all with the larger of the FE and hand |q|.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace

import numpy as np
from shapely import contains_xy
from shapely.affinity import scale
from shapely.geometry import LineString, Point, Polygon
from shapely.ops import polygonize, unary_union

from classical.sections import Outline, SectionProperties
from fem.case.model import Joint, Units
from fem.case.plates import build_up
from fem.results import Finding
from fem.section.solve import SectionSolution

__all__ = ["JointFlow", "hand_flow", "hand_joint_lines", "joint_flows", "joint_findings",
           "default_joints",
           "GAUSS_POINTS"]

GAUSS_POINTS = 16   # Gauss-Legendre points per piece of the line
PIECES = 32         # pieces of the (cosine-graded) line: points cluster at the ends, where
                    # a joint meets a re-entrant corner and the stress is singular
BAND = 0.25  # half-width of the domain-integral band about a joint / its length
SYMMETRY_TOL = 1e-9  # mirror image differing by less than this x the area is symmetric


@dataclass(frozen=True)
class JointFlow:
    """One joint: where it runs, the part it cuts off, FE and hand shear flow [F/L]."""

    name: str
    start: tuple[float, float]          # the stretch across material
    end: tuple[float, float]
    length: float
    normal: tuple[float, float]         # into the cut-off part
    part_area: float
    part_centroid: tuple[float, float]
    Qx: float                           # int (y - cy) dA over the part
    Qy: float                           # int (x - cx) dA over the part
    second_cut: str                     # "" (the joint alone), or the symmetry axis used
    q_hand: float | None                # signed, None if statically indeterminate
    q_fe: float                         # signed, same sense as q_hand (domain integral)
    q_fe_line: float                    # the plain line integral of tau . n (for reference)
    ratio: float | None                 # q_fe / q_hand
    capacity: float | None = None
    spacing: float | None = None
    demand: float | None = None         # q s per fastener
    max_spacing: float | None = None    # C / q
    throat: float | None = None
    welds: int = 1
    throat_stress: float | None = None  # q / (n a)

    @property
    def q_design(self) -> float:
        """The larger |q| of FE and hand: the one fasteners are checked for."""
        return max(abs(self.q_fe), abs(self.q_hand or 0.0))

    def to_dict(self) -> dict:
        """One entry of results.json ``joints[]`` (contract keys first)."""
        Q = self.Qx if abs(self.Qx) >= abs(self.Qy) else self.Qy
        return {"name": self.name, "from": list(self.start), "to": list(self.end),
                "Q": Q, "q_hand": self.q_hand, "q_fe": self.q_fe, "ratio": self.ratio,
                "q_fe_line": self.q_fe_line,
                "Qx": self.Qx, "Qy": self.Qy, "length": self.length,
                "normal": list(self.normal), "part_area": self.part_area,
                "part_centroid": list(self.part_centroid), "second_cut": self.second_cut,
                "capacity": self.capacity, "spacing": self.spacing, "demand": self.demand,
                "max_spacing": self.max_spacing, "throat": self.throat, "welds": self.welds,
                "throat_stress": self.throat_stress}


def default_joints(shape: str, params: dict, joints: Sequence[Joint]) -> tuple[Joint, ...]:
    """The joints to check: those given, else every plate interface of a built-up section."""
    if joints:
        return tuple(joints)
    if shape != "built-up":
        return ()
    return tuple(Joint(i.name, i.start, i.end, key=f"geometry interface {i.name}")
                 for i in build_up(params["plates"]).interfaces)


def _line_points(a: np.ndarray, b: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Quadrature points and weights [length] on the segment a-b, graded to both ends:
    s = L (1 - cos(pi u)) / 2 with composite Gauss-Legendre in u."""
    g, w = np.polynomial.legendre.leggauss(GAUSS_POINTS)
    edges = np.linspace(0.0, 1.0, PIECES + 1)
    u = ((edges[:-1, None] + edges[1:, None]) / 2 + (edges[1:, None] - edges[:-1, None]) / 2
         * g[None, :]).ravel()
    wu = (np.diff(edges)[:, None] / 2 * w[None, :]).ravel()
    L = float(np.linalg.norm(b - a))
    s = L * (1.0 - np.cos(np.pi * u)) / 2
    ds = L * np.pi * np.sin(np.pi * u) / 2 * wu
    return a + (s / L)[:, None] * (b - a), ds


def _smoothstep(u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """S(u) = 3u^2 - 2u^3 on [0, 1] (clipped) and its derivative."""
    u = np.clip(u, 0.0, 1.0)
    return u * u * (3.0 - 2.0 * u), 6.0 * u * (1.0 - u)


def _domain_flux(sol: SectionSolution, a: np.ndarray, b: np.ndarray, n: np.ndarray,
                 part: Polygon, V: tuple[float, float]) -> float:
    r"""FE shear flow into ``part`` across the segment a-b as a domain integral.

    For any psi smooth over the section, div tau = -(a x + b y) and tau . n = 0 on the
    free edges give :math:`\int \tau\cdot\nabla\psi\,dA = \int \psi (a x + b y)\,dA`.
    With H the indicator of the part and psi = H except in a band of half-width w about
    the joint (there psi rises smoothly across the line, and fades out beyond its ends),

    .. math:: q = \int \tau_h\cdot\nabla\psi\,dA - \int (\psi - H)(a x + b y)\,dA,

    exact for the elastic field and, for the FE field, an average of its error over the
    band: unlike the line integral it is not spoilt by the singular stress where a joint
    meets a re-entrant corner (equivalent domain integral; Babuska & Miller, IJNME 1984,
    the post-processing approach, from memory).  Converges with the stresses (order p).
    """
    gx, gy, tx, ty, dA = (np.asarray(v) for v in sol.quadrature_stress(*V))
    L = float(np.linalg.norm(b - a))
    e = (b - a) / L
    w = BAND * L
    d = (gx - a[0]) * n[0] + (gy - a[1]) * n[1]          # across, + into the part
    t = (gx - a[0]) * e[0] + (gy - a[1]) * e[1]          # along, 0 at a, L at b
    band = (np.abs(d) < w) & (t > -w) & (t < L + w)
    x, y, d, t = gx[band], gy[band], d[band], t[band]
    ramp, dramp = _smoothstep((d + w) / (2 * w))
    dramp = dramp / (2 * w)
    lo, dlo = _smoothstep((t + w) / w)                    # fades in before a
    hi, dhi = _smoothstep((L + w - t) / w)                # and out after b
    chi, dchi = lo * hi, (dlo * hi - lo * dhi) / w
    H = contains_xy(part, x, y).astype(float)
    psi = H + (ramp - H) * chi
    grad = (dramp * chi)[:, None] * n + ((ramp - H) * dchi)[:, None] * e
    Iinv = np.linalg.inv([[sol.Iyy, sol.Ixy], [sol.Ixy, sol.Ixx]])
    ca, cb = Iinv @ np.asarray(V, dtype=float)
    rate = ca * (x - sol.centroid[0]) + cb * (y - sol.centroid[1])
    flux = tx[band] * grad[:, 0] + ty[band] * grad[:, 1]
    return float(np.sum((flux - (psi - H) * rate) * dA[band]))


def _pieces(poly: Polygon, lines: list[LineString]) -> list[Polygon]:
    """The faces the lines cut the section into (holes left out)."""
    faces = polygonize(unary_union([poly.boundary, *lines]))
    return [f for f in faces if poly.contains(f.representative_point())]


def _symmetry_axis(poly: Polygon, c: tuple[float, float], V: tuple[float, float]
                   ) -> tuple[LineString, str] | None:
    """The axis through the centroid parallel to the shear, if the section is its mirror
    image about it (shear along x or y only)."""
    x0, y0, x1, y1 = poly.bounds
    pad = max(x1 - x0, y1 - y0)
    if V[0] == 0.0:
        mirror, axis = scale(poly, -1.0, 1.0, origin=c), LineString(
            [(c[0], y0 - pad), (c[0], y1 + pad)])
        name = f"x = {c[0]:.6g}"
    elif V[1] == 0.0:
        mirror, axis = scale(poly, 1.0, -1.0, origin=c), LineString(
            [(x0 - pad, c[1]), (x1 + pad, c[1])])
        name = f"y = {c[1]:.6g}"
    else:
        return None
    if poly.symmetric_difference(mirror).area > SYMMETRY_TOL * poly.area:
        return None
    return axis, name


def _cut_off(poly: Polygon, a: np.ndarray, b: np.ndarray, hp: SectionProperties,
             V: tuple[float, float]) -> tuple[Polygon | None, str]:
    """The part the joint cuts off (smaller of the two faces on either side), alone or
    with the symmetry axis as a second cut; None if it cuts off nothing determinate."""
    e = (b - a) / np.linalg.norm(b - a)
    pad = 1e-6 * math.sqrt(poly.area)
    line = LineString([a - pad * e, b + pad * e])
    mid = Point(*(a + b) / 2)
    candidates = [([line], "")]
    axis = _symmetry_axis(poly, (hp.cx, hp.cy), V)
    if axis is not None:
        candidates.append(([line, axis[0]], axis[1]))
    for lines, second in candidates:
        faces = [f for f in _pieces(poly, lines) if f.exterior.distance(mid) < 10 * pad]
        if len(faces) >= 2:
            return min(faces, key=lambda f: f.area), second
    return None, ""


def hand_flow(ab: np.ndarray, Qx: float, Qy: float) -> float:
    """q = a Qy + b Qx (module doc); V Q / I for I_xy = 0 and a shear along y."""
    return float(ab[0] * Qy + ab[1] * Qx)


@dataclass(frozen=True)
class _Cut:
    """The hand side of one joint: the stretch across material, the part it cuts off."""

    a: np.ndarray
    b: np.ndarray
    n: np.ndarray                 # into the part
    part: Polygon | None
    second: str
    area: float
    centroid: tuple[float, float]
    Qx: float
    Qy: float
    q_hand: float | None


def _joint_cut(poly: Polygon, hp: SectionProperties, jt: Joint, V: tuple[float, float]
               ) -> _Cut:
    """Where the joint crosses the material, the part it cuts off and its VQ/I."""
    inside = LineString([jt.start, jt.end]).intersection(poly)
    seg = max(getattr(inside, "geoms", [inside]), key=lambda g: g.length)
    a, b = (np.asarray(p, dtype=float) for p in seg.coords[:2])
    if (b - a) @ np.subtract(jt.end, jt.start) < 0:   # keep the sense from -> to
        a, b = b, a
    L = float(np.linalg.norm(b - a))
    e = (b - a) / L
    n = np.array([-e[1], e[0]])
    part, second = _cut_off(poly, a, b, hp, V)
    if part is None:
        return _Cut(a, b, n, None, second, 0.0, (math.nan, math.nan), math.nan, math.nan,
                    None)
    if not part.contains(Point(*((a + b) / 2 + 1e-4 * L * n))):
        n = -n
    area, cen = float(part.area), (float(part.centroid.x), float(part.centroid.y))
    Qx, Qy = area * (cen[1] - hp.cy), area * (cen[0] - hp.cx)
    ab = np.linalg.solve([[hp.Iyy, hp.Ixy], [hp.Ixy, hp.Ixx]], np.asarray(V, dtype=float))
    return _Cut(a, b, n, part, second, area, cen, Qx, Qy, hand_flow(ab, Qx, Qy))


def joint_flows(sol: SectionSolution, outline: Outline, hp: SectionProperties,
                joints: Sequence[Joint], V: tuple[float, float]) -> tuple[JointFlow, ...]:
    """FE and hand shear flow across each joint for the solved shear V = (Vx, Vy)."""
    poly = Polygon(outline.outer, list(outline.holes))
    out = []
    for jt in joints:
        c = _joint_cut(poly, hp, jt, V)
        pts, ds = _line_points(c.a, c.b)
        q_line = float(np.sum((sol.probe(pts, *V) @ c.n) * ds))
        q_fe = _domain_flux(sol, c.a, c.b, c.n, c.part, V) if c.part is not None else q_line
        ratio = q_fe / c.q_hand if c.q_hand else None
        flow = JointFlow(jt.name, (float(c.a[0]), float(c.a[1])),
                         (float(c.b[0]), float(c.b[1])), float(np.linalg.norm(c.b - c.a)),
                         (float(c.n[0]), float(c.n[1])), c.area, c.centroid, c.Qx, c.Qy,
                         c.second, c.q_hand, q_fe, q_line, ratio, jt.capacity, jt.spacing,
                         throat=jt.throat, welds=jt.welds)
        out.append(_fasteners(flow))
    return tuple(out)


def hand_joint_lines(outline: Outline, hp: SectionProperties, joints: Sequence[Joint],
                     V: tuple[float, float], units: Units) -> list[str]:
    """The hand shear flow of each joint written out, for ``shearcheck hand`` (V and the
    capacities in working force units, printed in the case's: `Units.user_force`)."""
    length, force, stress, f = units.length, units.force, units.stress, units.user_force
    per = f"{force}/{length}"
    poly = Polygon(outline.outer, list(outline.holes))
    lines = []
    for jt in joints:
        c = _joint_cut(poly, hp, jt, V)
        if c.q_hand is None:
            lines.append(f"  joint {jt.name}: cuts off no part on its own (closed cell, not "
                         "symmetric): statically indeterminate, no VQ/I")
            continue
        extra = f" with the symmetry axis {c.second}" if c.second else ""
        Q = (f"Q = A (y - ybar) = {c.Qx:.6g}" if V[0] == 0.0 else
             f"Q = A (x - xbar) = {c.Qy:.6g}" if V[1] == 0.0 else
             f"Qx = {c.Qx:.6g}, Qy = {c.Qy:.6g}")
        q = abs(c.q_hand)
        lines.append(f"  joint {jt.name}: part cut off{extra}: A = {c.area:.6g} {length}2, "
                     f"centroid ({c.centroid[0] + 0.0:.5g}, {c.centroid[1] + 0.0:.5g}) "
                     f"{length}; {Q} {length}3; q = {f(c.q_hand):.5g} {per}")
        if jt.throat is not None:
            lines.append(f"    weld throat: q/({jt.welds} x {jt.throat:g} {length}) = "
                         f"{q / (jt.welds * jt.throat):.4g} {stress}")
        if jt.capacity is not None:
            lines.append(f"    largest spacing C/q = {f(jt.capacity):g} {force} / "
                         f"{f(q):.5g} {per} = {jt.capacity / q:.4g} {length}")
        if jt.spacing is not None:
            lines.append(f"    demand per fastener q s = {f(q * jt.spacing):.5g} {force}")
    return lines


def _fasteners(f: JointFlow) -> JointFlow:
    """Fastener demand, largest spacing and weld throat stress from the design |q|."""
    q = f.q_design
    return replace(
        f, demand=q * f.spacing if f.spacing is not None else None,
        max_spacing=f.capacity / q if f.capacity is not None and q > 0 else None,
        throat_stress=q / (f.welds * f.throat) if f.throat is not None else None)


def joint_findings(flows: Sequence[JointFlow], tolerance: float,
                   units: Units) -> list[Finding]:
    """``joint-excess`` (FE above VQ/I by more than the tolerance: deciding),
    ``joint-capacity`` (fastener demand above its capacity: informs) and
    ``joint-indeterminate`` (no hand value: informs); flows in working force units,
    printed in the case's (`Units.user_force`)."""
    L, F, f = units.length, units.force, units.user_force
    per = f"{F}/{L}"
    out = []
    for j in flows:
        mid = [(j.start[0] + j.end[0]) / 2, (j.start[1] + j.end[1]) / 2]
        if j.q_hand is None:
            out.append(Finding("joint-indeterminate", mid, None,
                f"Joint {j.name} does not cut off a part of the section on its own, and the "
                f"section is not symmetric about the line of the shear: its share of the "
                f"shear flow is statically indeterminate (closed-cell theory), so there is "
                f"no VQ/I to compare; the FE gives q = {f(j.q_fe):.4g} {per}."))
            continue
        if j.ratio is not None and j.ratio > 1.0 + tolerance:
            out.append(Finding("joint-excess", mid, j.ratio,
                f"Across joint {j.name} the FE shear flow {f(j.q_fe):.4g} {per} is "
                f"{j.ratio:.3f} x VQ/I = {f(j.q_hand):.4g} {per} of the part it cuts off "
                f"(area {j.part_area:.4g} {L}²): the part assumed by the hand calculation is "
                f"not the part the line cuts off, or the joint is not where it is drawn."))
        if j.demand is not None and j.capacity is not None and j.demand > j.capacity:
            out.append(Finding("joint-capacity", mid, j.demand / j.capacity,
                f"Joint {j.name}: the demand per fastener q s = {f(j.q_design):.4g} {per} x "
                f"{j.spacing:.4g} {L} = {f(j.demand):.4g} {F} exceeds its capacity "
                f"{f(j.capacity):.4g} {F} ({j.demand / j.capacity:.3f} x); the largest "
                f"spacing is {j.max_spacing:.4g} {L}."))
    return out
