"""Closed-form standard beam cases: reactions, V(x), M(x) and deflection.

Conventions (one for every case):

* x runs from end A (x = 0) to end B (x = L).  Cantilevers are clamped at A and free
  at B; propped cantilevers are clamped at A and simply supported at B.
* Loads P (point) and w (per length) act downward when positive.
* R_a, R_b are upward support reactions.  M_a = M(0+) and M_b = M(L-) are the internal
  bending moments at the ends, sagging positive; at a clamp this is Roark's reaction
  moment M_A (negative = hogging).
* V(x) = sum of upward forces left of x = dM/dx (just left of a point load).
* Deflection w(x) is downward positive; w = w_b + w_s.

Bending part (Euler-Bernoulli): EI w_b'' = -M, integrated in closed form by Macaulay
brackets <x - a>^n, with w_b(0) = 0 and the start slope theta_a = w_b'(0) fixed by the
supports.  Shear part (Timoshenko): the section rotation is w_b' and the shear strain
w_s' = V / (k G A), so w_s(x) = (M(x) - M_a) / (k G A); this equals the unit-load
integral int V v_bar / (k G A) dx (e.g. cantilever tip: P L / (k G A)).  kGA = inf
gives Euler-Bernoulli.  For the statically indeterminate cases the redundants include
shear flexibility through phi = 12 EI / (k G A L^2) (derived here from w(L) = 0 and
w_b'(L) = 0 as applicable; phi = 0 recovers Roark).

Source of the Euler-Bernoulli formulas: Roark's Formulas for Stress and Strain, 7th ed.,
Table 8.1 (case numbers from memory; Roark's tables may place the ends mirror-imaged,
e.g. the cantilever's free end on the left) and
Gere & Goodno, Mechanics of Materials, 7th ed., Appendix H, Tables H-1 and H-2 (from
memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "BeamSolution",
    "ConcentratedLoad",
    "DistributedLoad",
    "cantilever_end_moment",
    "cantilever_tip_load",
    "cantilever_uniform_load",
    "fixed_fixed_point_load",
    "fixed_fixed_uniform_load",
    "propped_cantilever_point_load",
    "propped_cantilever_uniform_load",
    "shear_rigidity",
    "simply_supported_patch_load",
    "simply_supported_point_load",
    "simply_supported_uniform_load",
    "timoshenko_phi",
]


@dataclass(frozen=True)
class ConcentratedLoad:
    """Downward point load P [F] at x = a [L]."""

    P: float
    a: float


@dataclass(frozen=True)
class DistributedLoad:
    """Downward uniform load w [F/L] over start <= x <= end [L]."""

    w: float
    start: float
    end: float


def _mac(x: np.ndarray, a: float, n: int) -> np.ndarray:
    """Macaulay bracket <x - a>^n (n >= 1); for n = 0 the step H(x - a), 0 at x = a."""
    d = x - a
    return np.where(d > 0, d**n if n else 1.0, 0.0)


@dataclass(frozen=True)
class BeamSolution:
    """Reactions and response of one beam case (conventions in the module docstring).

    Attributes: ``case`` name, ``L`` [L], ``EI`` [F L^2], ``kGA`` [F] (inf = no shear
    deformation), ``R_a``, ``R_b`` [F], ``M_a``, ``M_b`` [F L], ``theta_a`` = w_b'(0),
    and the loads.  Methods take x (scalar or array) in [0, L].
    """

    case: str
    L: float
    EI: float
    kGA: float
    R_a: float
    M_a: float
    R_b: float
    M_b: float
    theta_a: float
    point_loads: tuple[ConcentratedLoad, ...] = ()
    patch_loads: tuple[DistributedLoad, ...] = ()

    def _sum(self, x: ArrayLike, n: int, coeffs: tuple[float, float]) -> np.ndarray:
        """Load terms of the n-th integral: sum P <x-a>^n / c_p + w (<x-s>^m - <x-e>^m) / c_w."""
        x = np.asarray(x, dtype=float)
        total = np.zeros_like(x)
        for p in self.point_loads:
            total = total + p.P * _mac(x, p.a, n) / coeffs[0]
        for q in self.patch_loads:
            total = total + q.w * (_mac(x, q.start, n + 1) - _mac(x, q.end, n + 1)) / coeffs[1]
        return total

    def shear(self, x: ArrayLike) -> np.ndarray:
        """V(x) = R_a - sum P H(x - a) - sum w (<x - s> - <x - e>)."""
        return self.R_a + 0.0 * np.asarray(x, float) - self._sum(x, 0, (1.0, 1.0))

    def moment(self, x: ArrayLike) -> np.ndarray:
        """M(x) = M_a + R_a x - sum P <x - a> - sum w (<x - s>^2 - <x - e>^2)/2."""
        x = np.asarray(x, dtype=float)
        return self.M_a + self.R_a * x - self._sum(x, 1, (1.0, 2.0))

    def rotation(self, x: ArrayLike) -> np.ndarray:
        """Section rotation w_b'(x) = theta_a - (M_a x + R_a x^2/2 - load terms)/EI;
        positive when the bending deflection grows with x."""
        x = np.asarray(x, dtype=float)
        inner = self.M_a * x + self.R_a * x**2 / 2 - self._sum(x, 2, (2.0, 6.0))
        return self.theta_a - inner / self.EI

    def deflection_bending(self, x: ArrayLike) -> np.ndarray:
        """w_b(x) = theta_a x - (M_a x^2/2 + R_a x^3/6 - sum P <x-a>^3/6
        - sum w (<x-s>^4 - <x-e>^4)/24) / EI  (downward positive)."""
        x = np.asarray(x, dtype=float)
        inner = self.M_a * x**2 / 2 + self.R_a * x**3 / 6 - self._sum(x, 3, (6.0, 24.0))
        return self.theta_a * x - inner / self.EI

    def deflection_shear(self, x: ArrayLike) -> np.ndarray:
        """w_s(x) = (M(x) - M_a) / (k G A) (downward positive)."""
        return (self.moment(x) - self.M_a) / self.kGA

    def deflection(self, x: ArrayLike) -> np.ndarray:
        """Total downward deflection w_b + w_s."""
        return self.deflection_bending(x) + self.deflection_shear(x)


def shear_rigidity(k: float, G: float, A: float) -> float:
    """Timoshenko shear rigidity k G A [F]; k from :mod:`classical.coefficients`."""
    if not (k > 0 and G > 0 and A > 0):
        raise ValueError("k, G and A must be > 0")
    return k * G * A


def timoshenko_phi(EI: float, kGA: float, L: float) -> float:
    """phi = 12 EI / (k G A L^2), the ratio of shear to bending flexibility (common
    practice, e.g. Przemieniecki, Theory of Matrix Structural Analysis, 1968, Ch. 5, from
    memory).  0 for kGA = inf."""
    return 12.0 * EI / (kGA * L**2)


def _check(L: float, EI: float, kGA: float, *positions: float) -> float:
    if not (L > 0 and EI > 0 and kGA > 0):
        raise ValueError("need L > 0, EI > 0 and kGA > 0 (kGA may be inf)")
    for a in positions:
        if not 0.0 <= a <= L:
            raise ValueError(f"load position {a!r} outside [0, L]")
    return timoshenko_phi(EI, kGA, L)


def _build(case: str, L: float, EI: float, kGA: float, R_a: float, M_a: float, R_b: float,
           pinned: bool, points: tuple[ConcentratedLoad, ...] = (),
           patches: tuple[DistributedLoad, ...] = ()) -> BeamSolution:
    """Assemble; for pinned A, theta_a makes w_b(L) = 0, else theta_a = 0 (clamp)."""
    sol = BeamSolution(case, L, EI, kGA, R_a, M_a, R_b, 0.0, 0.0, points, patches)
    theta = -float(sol.deflection_bending(L)) / L if pinned else 0.0
    m_b = float(sol.moment(L))
    return BeamSolution(case, L, EI, kGA, R_a, M_a, R_b, m_b, theta, points, patches)


def cantilever_tip_load(P: float, L: float, EI: float, kGA: float = math.inf) -> BeamSolution:
    """Cantilever, tip load P at x = L: R_a = P, M_a = -P L;
    w(L) = P L^3/(3 EI) + P L/(k G A).  Roark 7th ed. Table 8.1 case 1a."""
    _check(L, EI, kGA)
    return _build("cantilever_tip_load", L, EI, kGA, P, -P * L, 0.0, False,
                  (ConcentratedLoad(P, L),))


def cantilever_uniform_load(w: float, L: float, EI: float, kGA: float = math.inf) -> BeamSolution:
    """Cantilever, uniform load w: R_a = w L, M_a = -w L^2/2;
    w(L) = w L^4/(8 EI) + w L^2/(2 k G A).  Roark 7th ed. Table 8.1 case 2a."""
    _check(L, EI, kGA)
    return _build("cantilever_uniform_load", L, EI, kGA, w * L, -w * L**2 / 2, 0.0, False,
                  patches=(DistributedLoad(w, 0.0, L),))


def cantilever_end_moment(M0: float, L: float, EI: float, kGA: float = math.inf) -> BeamSolution:
    """Cantilever, couple at the free end giving the sagging moment M(x) = M0 throughout:
    R_a = 0, M_a = M0; w(L) = -M0 L^2/(2 EI) (upward for M0 > 0), no shear deflection.
    Roark 7th ed. Table 8.1 case 3a."""
    _check(L, EI, kGA)
    return _build("cantilever_end_moment", L, EI, kGA, 0.0, M0, 0.0, False)


def simply_supported_point_load(
    P: float, a: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Simply supported, load P at x = a, b = L - a: R_a = P b/L, R_b = P a/L;
    w(a) = P a^2 b^2/(3 EI L) + P a b/(L k G A).  Roark 7th ed. Table 8.1 case 1e."""
    _check(L, EI, kGA, a)
    return _build("simply_supported_point_load", L, EI, kGA, P * (L - a) / L, 0.0, P * a / L,
                  True, (ConcentratedLoad(P, a),))


def simply_supported_uniform_load(
    w: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Simply supported, uniform load w: R_a = R_b = w L/2;
    w(L/2) = 5 w L^4/(384 EI) + w L^2/(8 k G A).  Roark 7th ed. Table 8.1 case 2e."""
    _check(L, EI, kGA)
    return _build("simply_supported_uniform_load", L, EI, kGA, w * L / 2, 0.0, w * L / 2, True,
                  patches=(DistributedLoad(w, 0.0, L),))


def simply_supported_patch_load(
    w: float, start: float, end: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Simply supported, uniform load w over start <= x <= end, c = end - start,
    m = (start + end)/2: R_a = w c (L - m)/L, R_b = w c m/L.  Deflection by Macaulay
    integration (Roark 7th ed. Table 8.1 case 2e with a partial load)."""
    _check(L, EI, kGA, start, end)
    if not start < end:
        raise ValueError("need start < end")
    c, m = end - start, (start + end) / 2
    return _build("simply_supported_patch_load", L, EI, kGA, w * c * (L - m) / L, 0.0,
                  w * c * m / L, True, patches=(DistributedLoad(w, start, end),))


def propped_cantilever_uniform_load(
    w: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Clamped at A, simply supported at B, uniform load w; phi = 12 EI/(k G A L^2):
    R_a = w L (5 + phi)/(2 (4 + phi)), R_b = w L (3 + phi)/(2 (4 + phi)),
    M_a = -w L^2/(2 (4 + phi)).  phi = 0: 5wL/8, 3wL/8, -wL^2/8 and
    w_max = w L^4/(185 EI) at 0.4215 L from B (Roark 7th ed. Table 8.1 case 2c)."""
    phi = _check(L, EI, kGA)
    r_a = w * L * (5 + phi) / (2 * (4 + phi))
    return _build("propped_cantilever_uniform_load", L, EI, kGA, r_a, -w * L**2 / (2 * (4 + phi)),
                  w * L - r_a, False, patches=(DistributedLoad(w, 0.0, L),))


def propped_cantilever_point_load(
    P: float, a: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Clamped at A, simply supported at B, load P at x = a, b = L - a:
    R_a = P b (6 L^2 - 2 b^2 + phi L^2)/(L^3 (4 + phi)), R_b = P - R_a,
    M_a = P b - R_a L.  phi = 0: R_a = P b (3 L^2 - b^2)/(2 L^3),
    M_a = -P a b (L + b)/(2 L^2) (Roark 7th ed. Table 8.1 case 1c)."""
    phi = _check(L, EI, kGA, a)
    b = L - a
    r_a = P * b * (6 * L**2 - 2 * b**2 + phi * L**2) / (L**3 * (4 + phi))
    return _build("propped_cantilever_point_load", L, EI, kGA, r_a, P * b - r_a * L, P - r_a,
                  False, (ConcentratedLoad(P, a),))


def fixed_fixed_uniform_load(
    w: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Both ends clamped, uniform load w: R_a = R_b = w L/2, M_a = M_b = -w L^2/12 (also
    with shear deformation, by symmetry); w(L/2) = w L^4/(384 EI) + w L^2/(8 k G A).
    Roark 7th ed. Table 8.1 case 2d."""
    _check(L, EI, kGA)
    return _build("fixed_fixed_uniform_load", L, EI, kGA, w * L / 2, -w * L**2 / 12, w * L / 2,
                  False, patches=(DistributedLoad(w, 0.0, L),))


def fixed_fixed_point_load(
    P: float, a: float, L: float, EI: float, kGA: float = math.inf
) -> BeamSolution:
    """Both ends clamped, load P at x = a, b = L - a:
    R_a = P b (phi L^2 + 3 b L - 2 b^2)/(L^3 (1 + phi)), R_b = P - R_a,
    M_a = -P a b (2 b + phi L)/(2 L^2 (1 + phi)), M_b = -P a b (2 a + phi L)/(2 L^2 (1 + phi)).
    phi = 0: R_a = P b^2 (3 a + b)/L^3, M_a = -P a b^2/L^2, w(a) = P a^3 b^3/(3 EI L^3)
    (Roark 7th ed. Table 8.1 case 1d)."""
    phi = _check(L, EI, kGA, a)
    b = L - a
    r_a = P * b * (phi * L**2 + 3 * b * L - 2 * b**2) / (L**3 * (1 + phi))
    m_a = -P * a * b * (2 * b + phi * L) / (2 * L**2 * (1 + phi))
    return _build("fixed_fixed_point_load", L, EI, kGA, r_a, m_a, P - r_a, False,
                  (ConcentratedLoad(P, a),))
