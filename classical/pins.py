"""Hand models for short members loaded in shear: pins, bolts, lugs, stubby blocks.

Two idealisations of a member bridging a gap g between loaded parts (common practice
in fastener and clevis design; the models are the textbook cantilever with a tip load
and the simply supported beam with a central load):

* single shear: a cantilever of length g loaded at the tip, V = F, M_max = F g;
* double shear: a simply supported span g loaded at mid-span, V = F/2, M_max = F g/4.

Stresses are then the elementary ones: sigma_b = M / S (S the elastic section modulus:
b h^2/6, pi d^3/32), tau_avg = V / A, and the shear-formula maximum (3/2 and 4/3 of
tau_avg for rectangle and circle).  The models ignore bearing, contact and local
deformation and are meant as the reference that the finite-element results are judged
against when the member is short.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "MemberLoads",
    "MemberStresses",
    "double_shear_loads",
    "gap_for_ratio",
    "rectangular_stresses",
    "round_stresses",
    "shear_bending_ratio",
    "single_shear_loads",
]

_MODELS = ("single", "double")
_SHAPES = ("round", "rectangle")


@dataclass(frozen=True)
class MemberLoads:
    """Internal shear V [F] and maximum bending moment M [F L] of a short-member model."""

    model: str
    V: float
    M: float


@dataclass(frozen=True)
class MemberStresses:
    """Maximum bending stress sigma_b, average shear tau_avg = V/A and shear-formula
    maximum tau_max [F/L^2]."""

    sigma_b: float
    tau_avg: float
    tau_max: float


def _positive(**values: float) -> None:
    for name, v in values.items():
        if not (math.isfinite(v) and v > 0):
            raise ValueError(f"{name} must be > 0, got {v!r}")


def _choice(value: str, allowed: tuple[str, ...], what: str) -> None:
    if value not in allowed:
        raise ValueError(f"unknown {what} {value!r}; allowed: {', '.join(allowed)}")


def single_shear_loads(F: float, gap: float) -> MemberLoads:
    """Single shear as a cantilever of length g with a tip load F: V = F, M = F g."""
    _positive(gap=gap)
    return MemberLoads("single", F, F * gap)


def double_shear_loads(F: float, gap: float) -> MemberLoads:
    """Double shear as a simply supported span g with F at mid-span: V = F/2, M = F g/4."""
    _positive(gap=gap)
    return MemberLoads("double", F / 2, F * gap / 4)


def rectangular_stresses(V: float, M: float, b: float, h: float) -> MemberStresses:
    """Rectangle b wide, h deep (h along the load): sigma_b = 6 M/(b h^2),
    tau_avg = V/(b h), tau_max = 3 V/(2 b h).  Source: Gere & Goodno, 7th ed.,
    Secs. 5.5 and 5.8 (from memory)."""
    _positive(b=b, h=h)
    return MemberStresses(6 * M / (b * h**2), V / (b * h), 1.5 * V / (b * h))


def round_stresses(V: float, M: float, d: float) -> MemberStresses:
    """Solid round of diameter d: sigma_b = 32 M/(pi d^3), tau_avg = 4 V/(pi d^2),
    tau_max = (4/3) tau_avg.  Source: Gere & Goodno, 7th ed., Secs. 5.5 and 5.9
    (from memory)."""
    _positive(d=d)
    tau = 4 * V / (math.pi * d**2)
    return MemberStresses(32 * M / (math.pi * d**3), tau, 4 * tau / 3)


def _ratio_constant(shape: str, model: str) -> float:
    """c in tau_avg / sigma_b = size / (c g): round 8 (single), 4 (double);
    rectangle 6 (single), 3 (double)."""
    _choice(shape, _SHAPES, "shape")
    _choice(model, _MODELS, "model")
    return {("round", "single"): 8.0, ("round", "double"): 4.0,
            ("rectangle", "single"): 6.0, ("rectangle", "double"): 3.0}[(shape, model)]


def shear_bending_ratio(gap: float, size: float, shape: str = "round",
                        model: str = "single") -> float:
    """tau_avg / sigma_b = size / (c g) for a member of diameter (round) or depth h
    along the load (rectangle) = ``size``:
    round single (F/A)/(32 F g/(pi d^3)) = d/(8 g); round double d/(4 g);
    rectangle single (F/(b h))/(6 F g/(b h^2)) = h/(6 g); rectangle double h/(3 g).
    Independent of F and of the rectangle's width.  Derived from the models above."""
    _positive(gap=gap, size=size)
    return size / (_ratio_constant(shape, model) * gap)


def gap_for_ratio(ratio: float, size: float, shape: str = "round",
                  model: str = "single") -> float:
    """Gap g at which tau_avg falls to ``ratio`` times sigma_b: g = size / (c ratio),
    the inverse of :func:`shear_bending_ratio` (round single: g = d/(8 r))."""
    _positive(ratio=ratio, size=size)
    return size / (_ratio_constant(shape, model) * ratio)
