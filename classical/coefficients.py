"""Timoshenko shear coefficients and elastic stress-concentration factors.

Shear coefficients k (shear rigidity k G A) are Cowper's: G. R. Cowper (1966), "The
shear coefficient in Timoshenko's beam theory", J. Appl. Mech. 33, 335-340, Table 1
(formulas from memory).  nu is Poisson's ratio, valid -1 < nu <= 0.5.

Stress concentration at a circular hole in an infinite plate is Kirsch's solution
(G. Kirsch, 1898; Timoshenko & Goodier, Theory of Elasticity, 3rd ed., Sec. 35).  For
a strip of width W with a central hole of diameter d in uniaxial tension P (thickness
t) two fits of the net-section factor are given; the nominal stresses are

    sigma_net = P / ((W - d) t),   sigma_gross = P / (W t) = sigma_net (1 - d/W),

so Kt_gross = Kt_net / (1 - d/W) (both give the same peak stress).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "HoopExtremes",
    "cowper_circle",
    "cowper_hollow_circle",
    "cowper_i_section",
    "cowper_rectangle",
    "cowper_thin_box",
    "cowper_thin_tube",
    "kirsch_hole_edge",
    "kirsch_hole_edge_extremes",
    "kirsch_pure_shear",
    "kirsch_tension",
    "kt_gross_from_net",
    "kt_hole_strip",
    "kt_net_heywood",
    "kt_net_howland",
    "nominal_stress_gross",
    "nominal_stress_net",
]


def _nu(nu: float) -> None:
    if not -1.0 < nu <= 0.5:
        raise ValueError(f"Poisson's ratio must be in (-1, 0.5], got {nu!r}")


def cowper_rectangle(nu: float) -> float:
    """Solid rectangle: k = 10 (1 + nu) / (12 + 11 nu)  (nu = 0.3: 0.8497).  Cowper 1966."""
    _nu(nu)
    return 10 * (1 + nu) / (12 + 11 * nu)


def cowper_circle(nu: float) -> float:
    """Solid circle: k = 6 (1 + nu) / (7 + 6 nu)  (nu = 0.3: 0.8864).  Cowper 1966."""
    _nu(nu)
    return 6 * (1 + nu) / (7 + 6 * nu)


def cowper_thin_tube(nu: float) -> float:
    """Thin-walled round tube: k = 2 (1 + nu) / (4 + 3 nu)  (nu = 0.3: 0.5306).
    The m -> 1 limit of :func:`cowper_hollow_circle`.  Cowper 1966."""
    _nu(nu)
    return 2 * (1 + nu) / (4 + 3 * nu)


def cowper_hollow_circle(nu: float, m: float) -> float:
    """Hollow circle, m = inner/outer radius in [0, 1):
    k = 6 (1 + nu)(1 + m^2)^2 / ((7 + 6 nu)(1 + m^2)^2 + (20 + 12 nu) m^2).
    m = 0 gives the solid circle.  Cowper 1966."""
    _nu(nu)
    if not 0.0 <= m < 1.0:
        raise ValueError(f"m must be in [0, 1), got {m!r}")
    s = (1 + m * m) ** 2
    return 6 * (1 + nu) * s / ((7 + 6 * nu) * s + (20 + 12 * nu) * m * m)


def cowper_i_section(nu: float, b: float, h: float, t_f: float, t_w: float) -> float:
    """Thin-walled doubly symmetric I, shear parallel to the web; m = 2 b t_f/(h t_w),
    n = b/h (h depth, b flange width, t_f, t_w thicknesses):
    k = 10 (1 + nu)(1 + 3 m)^2 / [(12 + 72 m + 150 m^2 + 90 m^3)
        + nu (11 + 66 m + 135 m^2 + 90 m^3) + 30 n^2 (m + m^2) + 5 nu n^2 (8 m + 9 m^2)].
    m = 0 (no flanges) gives the rectangle.  Cowper 1966 (from memory; the same form is
    widely reproduced)."""
    _nu(nu)
    for name, v in {"b": b, "h": h, "t_f": t_f, "t_w": t_w}.items():
        if not v > 0:
            raise ValueError(f"{name} must be > 0")
    m, n = 2 * b * t_f / (h * t_w), b / h
    den = (12 + 72 * m + 150 * m**2 + 90 * m**3) + nu * (11 + 66 * m + 135 * m**2 + 90 * m**3)
    den += 30 * n**2 * (m + m**2) + 5 * nu * n**2 * (8 * m + 9 * m**2)
    return 10 * (1 + nu) * (1 + 3 * m) ** 2 / den


def cowper_thin_box(nu: float, b: float, h: float, t_f: float, t_w: float) -> float:
    """Thin-walled rectangular tube, shear parallel to the two webs of depth h and
    thickness t_w, flanges of width b and thickness t_f; m = b t_f/(h t_w), n = b/h:
    k = 10 (1 + nu)(1 + 3 m)^2 / [(12 + 72 m + 150 m^2 + 90 m^3)
        + nu (11 + 66 m + 135 m^2 + 90 m^3) + 10 n^2 ((3 + nu) m + 3 m^2)].
    Square tube (m = n = 1): 20 (1 + nu)/(48 + 39 nu); m = 0 gives the rectangle.
    Cowper 1966 (from memory)."""
    _nu(nu)
    for name, v in {"b": b, "h": h, "t_f": t_f, "t_w": t_w}.items():
        if not v > 0:
            raise ValueError(f"{name} must be > 0")
    m, n = b * t_f / (h * t_w), b / h
    den = (12 + 72 * m + 150 * m**2 + 90 * m**3) + nu * (11 + 66 * m + 135 * m**2 + 90 * m**3)
    den += 10 * n**2 * ((3 + nu) * m + 3 * m**2)
    return 10 * (1 + nu) * (1 + 3 * m) ** 2 / den


@dataclass(frozen=True)
class HoopExtremes:
    """Largest and smallest hoop stress on the hole edge and where (theta from x, rad)."""

    max: float
    theta_max: float
    min: float
    theta_min: float


def kirsch_hole_edge(
    theta: ArrayLike, sx: float, sy: float = 0.0, txy: float = 0.0
) -> float | np.ndarray:
    """Hoop stress on the edge of a circular hole in an infinite plate under the far
    field (sx, sy, txy), theta measured from the x axis:

        sigma_theta = (sx + sy) - 2 (sx - sy) cos 2 theta - 4 txy sin 2 theta.

    Independent of the hole radius; plane stress or strain, linear elastic.
    Kirsch 1898; Timoshenko & Goodier, 3rd ed., Sec. 35 (superposition of its tension
    result along x, along y and the 45-degree pure-shear case)."""
    th = np.asarray(theta, dtype=float)
    out = (sx + sy) - 2 * (sx - sy) * np.cos(2 * th) - 4 * txy * np.sin(2 * th)
    return float(out) if out.ndim == 0 else out


def kirsch_hole_edge_extremes(sx: float, sy: float = 0.0, txy: float = 0.0) -> HoopExtremes:
    """Extremes of :func:`kirsch_hole_edge`: (sx + sy) +- 2 sqrt((sx - sy)^2 + 4 txy^2),
    i.e. 3 s1 - s2 and 3 s2 - s1 in principal far-field stresses, at theta_max = phi/2
    + pi/2 and theta_min = phi/2 with phi = atan2(2 txy, sx - sy) (the s1 direction is
    phi/2)."""
    r = 2.0 * math.hypot(sx - sy, 2.0 * txy)
    phi = math.atan2(2.0 * txy, sx - sy)
    return HoopExtremes(sx + sy + r, 0.5 * phi + 0.5 * math.pi, sx + sy - r, 0.5 * phi)


def kirsch_tension() -> float:
    """Kt = 3 for uniaxial tension (peak 3 sigma at theta = 90 deg).  Kirsch 1898."""
    return kirsch_hole_edge_extremes(1.0).max


def kirsch_pure_shear() -> float:
    """Kt = 4 for pure shear tau (peak 4 tau, at 45 deg to the shear axes, on the
    diagonal normal to the principal tension).  Kirsch 1898; T&G 3rd ed., Sec. 35."""
    return kirsch_hole_edge_extremes(0.0, 0.0, 1.0).max


def _ratio(d_over_w: float) -> float:
    if not 0.0 <= d_over_w < 1.0:
        raise ValueError(f"d/W must be in [0, 1), got {d_over_w!r}")
    return d_over_w


def kt_net_heywood(d_over_w: float) -> float:
    """Heywood's fit, net section: Kt_net = 2 + (1 - d/W)^3, 0 <= d/W < 1
    (3 at d/W = 0, tends to 2 as d/W -> 1).  R. B. Heywood, Designing by Photoelasticity,
    1952, as quoted in Peterson's Stress Concentration Factors (from memory)."""
    return 2.0 + (1.0 - _ratio(d_over_w)) ** 3


def kt_net_howland(d_over_w: float) -> float:
    """Polynomial fit to Howland's (1930) solution, net section:
    Kt_net = 3.00 - 3.13 r + 3.66 r^2 - 1.53 r^3, r = d/W in [0, 1).
    Howland (1930), Phil. Trans. R. Soc. A 229, 49-86, as the polynomial fit of Pilkey &
    Pilkey, Peterson's Stress Concentration Factors, 3rd ed. (Wiley, 2008), Chart 4.1 (fit
    coefficients and chart number from memory)."""
    r = _ratio(d_over_w)
    return 3.00 - 3.13 * r + 3.66 * r**2 - 1.53 * r**3


def kt_gross_from_net(kt_net: float, d_over_w: float) -> float:
    """Kt_gross = Kt_net / (1 - d/W): the same peak referred to sigma_gross = P/(W t)."""
    return kt_net / (1.0 - _ratio(d_over_w))


def kt_hole_strip(d_over_w: float, fit: str = "howland", nominal: str = "net") -> float:
    """Kt of a strip with a central hole in tension by ``fit`` ("howland" or
    "heywood"), referred to the ``nominal`` stress ("net" or "gross", module docstring)."""
    fits = {"howland": kt_net_howland, "heywood": kt_net_heywood}
    if fit not in fits:
        raise ValueError(f"unknown fit {fit!r}; allowed: {', '.join(fits)}")
    if nominal not in ("net", "gross"):
        raise ValueError(f"unknown nominal {nominal!r}; allowed: net, gross")
    kt = fits[fit](d_over_w)
    return kt if nominal == "net" else kt_gross_from_net(kt, d_over_w)


def nominal_stress_net(P: float, W: float, d: float, t: float) -> float:
    """sigma_net = P / ((W - d) t), the mean stress on the section through the hole."""
    if not (0 <= d < W and t > 0):
        raise ValueError("need 0 <= d < W and t > 0")
    return P / ((W - d) * t)


def nominal_stress_gross(P: float, W: float, t: float) -> float:
    """sigma_gross = P / (W t), the mean stress away from the hole."""
    if not (W > 0 and t > 0):
        raise ValueError("need W > 0 and t > 0")
    return P / (W * t)
