"""Tests for classical.units: exact SI definitions of the inch and the pound-force."""

from __future__ import annotations

import itertools

import pytest

from classical.units import (
    FORCE_UNITS,
    LENGTH_UNITS,
    OUTPUT_STRESS_UNITS,
    STRESS_UNITS,
    convert_force,
    convert_length,
    convert_stress,
    force_scale,
    stress_factor,
    stress_unit,
)


@pytest.mark.parametrize(
    ("length", "force", "name"),
    [("mm", "N", "MPa"), ("m", "N", "Pa"), ("m", "kN", "kPa"), ("in", "lbf", "psi"),
     ("in", "kip", "ksi"), ("mm", "kN", "GPa"), ("in", "N", "N/in2"), ("mm", "lbf", "lbf/mm2"),
     ("m", "kip", "kip/m2")],
)
def test_stress_unit_names(length: str, force: str, name: str) -> None:
    """N/mm2 = MPa, N/m2 = Pa, kN/m2 = kPa, kN/mm2 = GPa, lbf/in2 = psi, kip/in2 = ksi
    (definitions); combinations without a name are spelt force/length2."""
    assert stress_unit(length, force) == name


def test_inch_and_pound_definitions() -> None:
    """1 in = 25.4 mm exactly, 1 kip = 1000 lbf, 1 lbf = 4.4482216152605 N (exact SI
    definitions), hence 1 ksi = 4448.2216152605/0.0254^2 Pa = 6.894757293168361 MPa."""
    assert convert_length(1.0, "in", "mm") == pytest.approx(25.4, rel=1e-15)
    assert convert_force(1.0, "kip", "lbf") == pytest.approx(1000.0, rel=1e-15)
    assert convert_force(1.0, "lbf", "N") == 4.4482216152605
    assert convert_stress(1.0, "ksi", "MPa") == pytest.approx(6.894757293168361, rel=1e-14)
    assert convert_stress(1.0, "MPa", "psi") == pytest.approx(145.03773773020923, rel=1e-12)


def test_compound_stress_unit_factor() -> None:
    """1 N/in2 = 1/0.0254^2 Pa = 1550.0031000062 Pa (definition of the inch)."""
    assert stress_factor("N/in2") == pytest.approx(1550.0031000062, rel=1e-12)
    assert convert_stress(1.0, stress_unit("in", "N"), "Pa") == pytest.approx(1550.0031000062)


def test_round_trips() -> None:
    """Converting a -> b -> a returns the value (to rounding) for every pair of units."""
    for table, conv in ((LENGTH_UNITS, convert_length), (FORCE_UNITS, convert_force),
                        (STRESS_UNITS, convert_stress)):
        for a, b in itertools.product(table, repeat=2):
            assert conv(conv(3.7, a, b), b, a) == pytest.approx(3.7, rel=1e-14)


def test_stress_unit_consistent_with_factors() -> None:
    """For every force/length pair the named unit's factor equals force/length^2."""
    for length, force in itertools.product(LENGTH_UNITS, FORCE_UNITS):
        expected = FORCE_UNITS[force] / LENGTH_UNITS[length] ** 2
        assert stress_factor(stress_unit(length, force)) == pytest.approx(expected, rel=1e-12)


def test_unknown_units_raise_with_allowed_list() -> None:
    """Unknown names raise ValueError naming the allowed values."""
    with pytest.raises(ValueError, match="'mm'"):
        convert_length(1.0, "ft", "m")
    with pytest.raises(ValueError, match="'kip'"):
        convert_force(1.0, "N", "ton")
    with pytest.raises(ValueError, match="'MPa'"):
        convert_stress(1.0, "bar", "MPa")
    with pytest.raises(ValueError, match="'in'"):
        stress_unit("cm", "N")


def test_output_stress_names() -> None:
    """N/mm² is the MPa (1 N/mm² = 1e6 N/m², exact SI definitions, common practice)."""
    assert OUTPUT_STRESS_UNITS["N/mm²"] == OUTPUT_STRESS_UNITS["MPa"] == 1e6
    assert set(OUTPUT_STRESS_UNITS) == {"MPa", "kPa", "Pa", "psi", "ksi", "N/mm²", "GPa"}
    assert stress_factor("N/mm²") == 1e6


def test_force_scale_makes_force_over_area_the_stress_unit() -> None:
    """Working force unit = stress unit × length²: kN with mm and MPa is 1000 working
    units (the N), kN with m and MPa 1e-3 (the MN), kip with in and psi 1000 (the lbf);
    exactly 1 where force/length² is the stress unit itself (SI and inch-pound
    definitions, common practice)."""
    assert force_scale("mm", "kN", "MPa") == pytest.approx(1000.0, rel=1e-12)
    assert force_scale("m", "kN", "MPa") == pytest.approx(1e-3, rel=1e-12)
    assert force_scale("in", "kip", "psi") == pytest.approx(1000.0, rel=1e-12)
    assert force_scale("m", "kN", "psi") == pytest.approx(1000.0 / 6894.757293168, rel=1e-9)
    for length, force, stress in (("mm", "N", "MPa"), ("mm", "N", "N/mm²"),
                                  ("in", "lbf", "psi"), ("m", "kN", "kPa"),
                                  ("mm", "kN", "GPa"), ("in", "kip", "ksi")):
        assert force_scale(length, force, stress) == 1.0   # exactly: no factor at all
