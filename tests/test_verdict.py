"""The one verdict rule (`fem.verdict.decide`): each row of its table, and the tolerance
boundary. Pure logic on findings; no mesh is run here (the chain's verdicts are tested in
tests/test_member_check.py, tests/test_section_check.py and on every bundled case)."""

from __future__ import annotations

import pytest

from fem.results import Finding
from fem.verdict import DECIDING_KINDS, decide, is_excess

TOL = 0.05


def f(kind: str, ratio: float | None) -> Finding:
    return Finding(kind=kind, at=[0.0, 0.0], ratio=ratio, message="")


EXCESS = [f("shear-excess", 1.2)]
WITHIN = [f("shear-excess", 1.04), f("combined-stress", 3.0), f("bearing", 2.0)]


def test_row1_excess_on_a_converged_study_is_unsafe():
    v = decide(EXCESS, tolerance=TOL, levels=3, converged=True)
    assert v.word == "unsafe" and v.rule.startswith("1")


def test_row1_holds_even_where_a_singular_corner_governs():
    v = decide(EXCESS, tolerance=TOL, levels=3, converged=True, singular_governs=True)
    assert v.word == "unsafe"


def test_row2_excess_on_a_single_mesh_is_unsafe():
    v = decide(EXCESS, tolerance=TOL, levels=1, converged=False)
    assert v.word == "unsafe" and v.rule.startswith("2")


def test_excess_on_an_unconverged_study_is_inconclusive():
    """Row 5: the excess may be discretisation error."""
    v = decide(EXCESS, tolerance=TOL, levels=3, converged=False)
    assert v.word == "inconclusive" and v.rule.startswith("5")


def test_row3_a_converged_feature_excess_decides_alone():
    v = decide(WITHIN, tolerance=TOL, levels=3, converged=False, converged_feature_excess=True)
    assert v.word == "unsafe" and v.rule.startswith("3")


def test_row4_a_governing_singular_corner_is_inconclusive():
    v = decide(WITHIN, tolerance=TOL, levels=3, converged=True, singular_governs=True)
    assert v.word == "inconclusive" and v.rule.startswith("4")


@pytest.mark.parametrize("levels, converged", [(1, False), (2, False), (3, False)])
def test_row5_not_converged_or_one_level_is_inconclusive(levels, converged):
    v = decide(WITHIN, tolerance=TOL, levels=levels, converged=converged)
    assert v.word == "inconclusive" and v.rule.startswith("5")


def test_row6_converged_without_excess_holds():
    v = decide(WITHIN, tolerance=TOL, levels=2, converged=True)
    assert v.word == "holds" and v.rule.startswith("6")


def test_tolerance_boundary():
    """A ratio of exactly 1 + tolerance is within; the next float above it is an excess."""
    edge = 1.0 + TOL
    assert not is_excess(f("shear-excess", edge), TOL)
    assert is_excess(f("shear-excess", edge + 1e-12), TOL)
    assert decide([f("shear-excess", edge)], tolerance=TOL, levels=3,
                  converged=True).word == "holds"
    assert decide([f("shear-excess", edge + 1e-12)], tolerance=TOL, levels=3,
                  converged=True).word == "unsafe"


@pytest.mark.parametrize("kind", sorted(DECIDING_KINDS))
def test_every_deciding_kind_decides(kind):
    assert decide([f(kind, 2.0)], tolerance=TOL, levels=3, converged=True).word == "unsafe"


@pytest.mark.parametrize("kind", ["combined-stress", "bearing", "excluded", "singular",
                                  "not-converged"])
def test_informative_kinds_do_not_decide(kind):
    assert decide([f(kind, 2.0)], tolerance=TOL, levels=3, converged=True).word == "holds"


def test_a_finding_without_ratio_never_decides():
    assert decide([f("shear-excess", None)], tolerance=TOL, levels=3,
                  converged=True).word == "holds"
