"""Transverse deflection of prismatic beams under point loads, bending plus shear.

Timoshenko beam theory: the deflection w = w_b + w_s, the bending part of Euler-Bernoulli
theory and the shear part from the shear strain V/(k G A) of the section, with Cowper's
shear coefficient k (`classical.coefficients`, Cowper 1966, J. Appl. Mech. 33:335-340).
Units: any consistent set; P [F], lengths [L], EI [F L^2], kGA [F]; w [L], in the direction
of P. Validity: small deflections, linear elastic, prismatic member, loads transverse.
Sources of the bending parts: Gere & Goodno, Mechanics of Materials, 7th ed., Appendix H,
Tables H-1 (cantilever, load at a) and H-2 (simple beam, load at a) (from memory); the
shear parts are the unit-load integral of V v / (k G A) along the span (common practice).
`classical.statics` builds the same cases by Macaulay integration; the tests hold the two
against each other.
"""

from __future__ import annotations

__all__ = ["cantilever_point_deflection", "simply_supported_point_deflection"]


def _check(EI: float, kGA: float) -> None:
    if not (EI > 0 and kGA > 0):
        raise ValueError("need EI > 0 and kGA > 0 (kGA may be inf)")


def cantilever_point_deflection(P: float, a: float, x: float, EI: float, kGA: float) -> float:
    """Cantilever clamped at x = 0, point load P at x = a; deflection at x (0 <= x, a):

    w(x) = P x² (3a − x)/(6 EI) + P x/(kGA)          for x <= a,
    w(x) = P a² (3x − a)/(6 EI) + P a/(kGA)          for x >= a;

    at the tip under a tip load (x = a = L): P L³/(3 EI) + P L/(k G A).
    """
    _check(EI, kGA)
    if x < 0 or a < 0:
        raise ValueError("x and a are measured from the clamp and must be >= 0")
    if x <= a:
        return P * x**2 * (3 * a - x) / (6 * EI) + P * x / kGA
    return P * a**2 * (3 * x - a) / (6 * EI) + P * a / kGA


def simply_supported_point_deflection(P: float, a: float, x: float, L: float, EI: float,
                                      kGA: float) -> float:
    """Simple beam on supports at x = 0 and x = L, point load P at x = a, b = L − a:

    w(x) = P b x (L² − b² − x²)/(6 L EI) + P b x/(L kGA)                  for x <= a,
    w(x) = P a (L − x)(L² − a² − (L − x)²)/(6 L EI) + P a (L − x)/(L kGA)  for x >= a;

    at midspan under a central load: P L³/(48 EI) + P L/(4 k G A).
    """
    _check(EI, kGA)
    if not (L > 0 and 0 <= a <= L and 0 <= x <= L):
        raise ValueError("need L > 0 and 0 <= a, x <= L")
    b = L - a
    if x <= a:
        return P * b * x * (L**2 - b**2 - x**2) / (6 * L * EI) + P * b * x / (L * kGA)
    r = L - x
    return P * a * r * (L**2 - a**2 - r**2) / (6 * L * EI) + P * a * r / (L * kGA)
