"""Bending (flexure) stress and plane-stress transformation.

Sign convention for :func:`bending_stress_at`: y is measured upward from the
centroidal (neutral) axis; a positive (sagging) bending moment M compresses the top
fibres, so sigma = -M y / I (tension positive).  Plane-stress components sx, sy, txy
follow the usual elasticity signs (tension positive, txy positive on the +x face in +y).
Arrays are accepted wherever floats are (numpy broadcasting).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "MaxShearPlane",
    "PrincipalStresses",
    "bending_stress",
    "bending_stress_at",
    "max_shear_plane",
    "principal_stresses",
    "shear_yield",
    "von_mises_plane",
    "von_mises_plane_strain",
]


@dataclass(frozen=True)
class PrincipalStresses:
    """In-plane principal stresses s1 >= s2 [F/L^2] and the angle [rad] from x to the
    direction of s1 (counter-clockwise positive, in (-pi/2, pi/2])."""

    s1: float | np.ndarray
    s2: float | np.ndarray
    angle: float | np.ndarray


@dataclass(frozen=True)
class MaxShearPlane:
    """Maximum shear stresses of a plane-stress state.

    ``tau_max`` in-plane maximum R = sqrt(((sx - sy)/2)^2 + txy^2); ``sigma_avg`` the
    normal stress (sx + sy)/2 on its planes; ``angle`` [rad] from x to the normal of the
    plane carrying +tau_max (angle of s1 minus pi/4); ``tau_abs`` the absolute maximum
    including the out-of-plane direction (s3 = 0): max(R, |s1|/2, |s2|/2).
    """

    tau_max: float | np.ndarray
    sigma_avg: float | np.ndarray
    angle: float | np.ndarray
    tau_abs: float | np.ndarray


def _out(value: np.ndarray) -> float | np.ndarray:
    value = np.asarray(value)
    return float(value) if value.ndim == 0 else value


def bending_stress(M: ArrayLike, c: ArrayLike, I: float) -> float | np.ndarray:  # noqa: E741
    """Magnitude form of the flexure formula, sigma = M c / I [F/L^2].

    M bending moment [F L], c distance of the fibre from the neutral axis [L], I second
    moment about that axis [L^4].  Linear elastic, plane sections (Euler-Bernoulli);
    Gere & Goodno, Mechanics of Materials, 7th ed., Sec. 5.5 (from memory).
    """
    if not I > 0:
        raise ValueError("I must be > 0")
    return _out(np.asarray(M, float) * np.asarray(c, float) / I)


def bending_stress_at(M: ArrayLike, y: ArrayLike, I: float) -> float | np.ndarray:  # noqa: E741
    """Signed flexure formula sigma = -M y / I [F/L^2] (tension positive).

    y upward from the neutral axis; M > 0 sagging, i.e. compression at the top (y > 0)
    and tension at the bottom.  Source as :func:`bending_stress`.
    """
    if not I > 0:
        raise ValueError("I must be > 0")
    return _out(-np.asarray(M, float) * np.asarray(y, float) / I)


def von_mises_plane(sx: ArrayLike, sy: ArrayLike, txy: ArrayLike) -> float | np.ndarray:
    """Von Mises equivalent stress for plane stress,
    sigma_vm = sqrt(sx^2 - sx sy + sy^2 + 3 txy^2).  Common practice."""
    sx, sy, txy = np.asarray(sx, float), np.asarray(sy, float), np.asarray(txy, float)
    return _out(np.sqrt(sx * sx - sx * sy + sy * sy + 3.0 * txy * txy))


def von_mises_plane_strain(sx: ArrayLike, sy: ArrayLike, txy: ArrayLike,
                           nu: float) -> float | np.ndarray:
    """Von Mises equivalent stress for plane strain (eps_z = 0), with the out-of-plane
    stress sz = nu (sx + sy) of linear isotropic elasticity:

        sigma_vm = sqrt(((sx - sy)^2 + (sy - sz)^2 + (sz - sx)^2) / 2 + 3 txy^2)

    the full 3D J2 form with tyz = tzx = 0.  Stresses in any one unit [F/L^2], nu
    Poisson's ratio (-1 < nu < 0.5).  Valid for linear elastic plane strain only (sz
    follows from Hooke's law with eps_z = 0).  Source: J2 form, Timoshenko & Goodier,
    Theory of Elasticity, 3rd ed., plane strain sz = nu (sx + sy) (from memory); common
    practice.
    """
    if not -1.0 < nu < 0.5:
        raise ValueError("nu must be in (-1, 0.5)")
    sx, sy, txy = np.asarray(sx, float), np.asarray(sy, float), np.asarray(txy, float)
    sz = nu * (sx + sy)
    j = 0.5 * ((sx - sy) ** 2 + (sy - sz) ** 2 + (sz - sx) ** 2) + 3.0 * txy * txy
    return _out(np.sqrt(j))


def shear_yield(fy: float) -> float:
    """Von Mises shear yield tau_y = fy / sqrt(3) [F/L^2].

    fy the tensile (uniaxial) yield stress [F/L^2], > 0.  In pure shear tau the von Mises
    stress is sqrt(3) tau, so yield starts at tau = fy/sqrt(3) = 0.577 fy.  Valid for
    ductile isotropic metals (the von Mises criterion).  Source: von Mises criterion in
    pure shear, common practice.
    """
    if not fy > 0:
        raise ValueError("fy must be > 0")
    return float(fy) / np.sqrt(3.0)


def principal_stresses(sx: ArrayLike, sy: ArrayLike, txy: ArrayLike) -> PrincipalStresses:
    """s1,2 = (sx + sy)/2 +- sqrt(((sx - sy)/2)^2 + txy^2),
    angle of s1 = atan2(2 txy, sx - sy)/2.

    Source: Mohr's circle, Gere & Goodno, 7th ed., Sec. 7.3 (from memory).  For a
    hydrostatic in-plane state (R = 0) the angle is 0.
    """
    sx, sy, txy = np.asarray(sx, float), np.asarray(sy, float), np.asarray(txy, float)
    mean = 0.5 * (sx + sy)
    radius = np.hypot(0.5 * (sx - sy), txy)
    theta = 0.5 * np.arctan2(2.0 * txy, sx - sy)
    theta = np.where(theta <= -0.5 * np.pi, theta + np.pi, theta)
    vals = [mean + radius, mean - radius, theta]
    return PrincipalStresses(*(_out(v) for v in vals))


def max_shear_plane(sx: ArrayLike, sy: ArrayLike, txy: ArrayLike) -> MaxShearPlane:
    """tau_max = sqrt(((sx - sy)/2)^2 + txy^2) on planes at 45 deg to the principal ones,
    with normal stress (sx + sy)/2; also the absolute maximum with s3 = 0.

    Source: Gere & Goodno, 7th ed., Sec. 7.3 (from memory).
    """
    p = principal_stresses(sx, sy, txy)
    s1, s2 = np.asarray(p.s1), np.asarray(p.s2)
    vals = [
        0.5 * (s1 - s2), 0.5 * (s1 + s2), np.asarray(p.angle) - 0.25 * np.pi,
        np.maximum(0.5 * (s1 - s2), np.maximum(np.abs(s1), np.abs(s2)) / 2),
    ]
    return MaxShearPlane(*(_out(v) for v in vals))
