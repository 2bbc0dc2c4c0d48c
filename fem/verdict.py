"""The verdict: one rule for members and sections, decided in one place (`decide`).

The verdict is the word a checking engineer acts on, so its rule is a short table, stated
here once and tested row by row (tests/test_verdict.py).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from fem.results import Finding

__all__ = ["DECIDING_KINDS", "Verdict", "decide", "is_excess"]

DECIDING_KINDS = frozenset({
    # members: at a cut or along the member
    "short-beam", "shear-excess", "concentration", "envelope-excess", "method-excess",
    # sections: over the section
    "junction-peak", "edge-excess", "joint-excess",
    # both: the user's own hand value
    "hand-value",
})
"""Finding kinds that say the FE exceeds the hand value the check is about. Others inform
(von Mises against a hand combination, bearing, excluded zones, singular corners, yield)."""


@dataclass(frozen=True)
class Verdict:
    """The verdict word and the row of the rule table that decided it."""

    word: str      # "holds", "unsafe" or "inconclusive"
    rule: str


def is_excess(f: Finding, tolerance: float) -> bool:
    """A deciding finding whose ratio is above 1 + tolerance (equal to it is within)."""
    return f.kind in DECIDING_KINDS and f.ratio is not None and f.ratio > 1.0 + tolerance


def decide(findings: Sequence[Finding], *, tolerance: float, levels: int, converged: bool,
           singular_governs: bool = False, converged_feature_excess: bool = False) -> Verdict:
    """The verdict of a check, by the first row that applies:

    ====  ===============================================================  ============
    row   condition                                                        verdict
    ====  ===============================================================  ============
    1     an excess finding (`is_excess`) and the governing quantity       unsafe
          converged (`fem.convergence.acceptance`)
    2     an excess finding and a single mesh level: the FE already        unsafe
          exceeds the hand value on the one mesh run
    3     a converged peak at a hole, fillet or corner above 1 + tol       unsafe
          (`converged_feature_excess`): it decides on its own
    4     a singular re-entrant corner governs the peak                    inconclusive
    5     one mesh level only, or the governing quantity not converged     inconclusive
    6     otherwise: converged, no excess                                  holds
    ====  ===============================================================  ============

    An excess on a multi-level study that has not converged is row 5: the excess may be
    discretisation error. `tolerance` is the case's `check.tolerance` (a ratio up to
    1 + tolerance is within).
    """
    excess = any(is_excess(f, tolerance) for f in findings)
    if excess and converged and levels >= 2:
        return Verdict("unsafe", "1: excess on a converged study")
    if excess and levels == 1:
        return Verdict("unsafe", "2: excess on the single mesh run")
    if converged_feature_excess:
        return Verdict("unsafe", "3: converged excess at a hole, fillet or corner")
    if singular_governs:
        return Verdict("inconclusive", "4: a singular corner governs")
    if levels < 2 or not converged:
        return Verdict("inconclusive", "5: not converged")
    return Verdict("holds", "6: converged, no excess")
