"""Unit tables and conversions for lengths, forces and stresses.

All factors are exact SI definitions: 1 in = 0.0254 m exactly (international yard and
pound agreement, 1959) and 1 lbf = 0.45359237 kg x 9.80665 m/s^2 = 4.4482216152605 N
exactly (standard gravity, CGPM 1901).  These are common practice.

A stress unit is either one of the named units in :data:`STRESS_UNITS` or a compound
name ``"<force>/<length>2"`` built from :data:`FORCE_UNITS` and :data:`LENGTH_UNITS`
(e.g. ``"N/in2"``), which is what :func:`stress_unit` returns for combinations that
have no common name.
"""

from __future__ import annotations

import math

__all__ = [
    "FORCE_UNITS",
    "LENGTH_UNITS",
    "OUTPUT_STRESS_UNITS",
    "STRESS_UNITS",
    "convert_force",
    "convert_length",
    "convert_stress",
    "force_scale",
    "stress_factor",
    "stress_unit",
]

#: metres per unit
LENGTH_UNITS: dict[str, float] = {"mm": 1e-3, "m": 1.0, "in": 0.0254}

#: newtons per unit
FORCE_UNITS: dict[str, float] = {
    "N": 1.0,
    "kN": 1e3,
    "lbf": 4.4482216152605,
    "kip": 4448.2216152605,
}

_PSI = FORCE_UNITS["lbf"] / LENGTH_UNITS["in"] ** 2

#: pascals per unit
STRESS_UNITS: dict[str, float] = {
    "Pa": 1.0,
    "kPa": 1e3,
    "MPa": 1e6,
    "GPa": 1e9,
    "psi": _PSI,
    "ksi": 1e3 * _PSI,
}


#: pascals per unit of the names a case may give as ``[units] stress``
OUTPUT_STRESS_UNITS: dict[str, float] = {
    "MPa": 1e6, "kPa": 1e3, "Pa": 1.0, "psi": _PSI, "ksi": 1e3 * _PSI, "N/mm²": 1e6,
    "GPa": 1e9,
}


def _lookup(table: dict[str, float], unit: str, kind: str) -> float:
    try:
        return table[unit]
    except (KeyError, TypeError):
        allowed = ", ".join(repr(k) for k in table)
        raise ValueError(f"unknown {kind} unit {unit!r}; allowed: {allowed}") from None


def stress_unit(length: str, force: str) -> str:
    """Name of the stress unit force/length^2.

    A named unit of :data:`STRESS_UNITS` is returned when force/length^2 equals it
    (N/mm2 -> "MPa", N/m2 -> "Pa", kN/m2 -> "kPa", kN/mm2 -> "GPa", lbf/in2 -> "psi",
    kip/in2 -> "ksi"); otherwise the compound name ``f"{force}/{length}2"``.

    Parameters
    ----------
    length : str
        A key of :data:`LENGTH_UNITS`.
    force : str
        A key of :data:`FORCE_UNITS`.

    Raises
    ------
    ValueError
        If either unit is unknown.
    """
    factor = _lookup(FORCE_UNITS, force, "force") / _lookup(LENGTH_UNITS, length, "length") ** 2
    for name, pascals in STRESS_UNITS.items():
        if math.isclose(factor, pascals, rel_tol=1e-12):
            return name
    return f"{force}/{length}2"


def stress_factor(unit: str) -> float:
    """Pascals per unit of a stress unit.

    Accepts the named units of :data:`STRESS_UNITS` and compound names
    ``"<force>/<length>2"`` (factor = force/length^2 in N/m^2).

    Raises
    ------
    ValueError
        If the unit is neither, naming the allowed values.
    """
    if isinstance(unit, str) and unit in STRESS_UNITS:
        return STRESS_UNITS[unit]
    if isinstance(unit, str) and unit in OUTPUT_STRESS_UNITS:
        return OUTPUT_STRESS_UNITS[unit]
    if isinstance(unit, str) and "/" in unit and unit.endswith("2"):
        force, length = unit[:-1].split("/", 1)
        if force in FORCE_UNITS and length in LENGTH_UNITS:
            return FORCE_UNITS[force] / LENGTH_UNITS[length] ** 2
    allowed = ", ".join(repr(k) for k in STRESS_UNITS)
    raise ValueError(
        f"unknown stress unit {unit!r}; allowed: {allowed} or '<force>/<length>2' with force in "
        f"{sorted(FORCE_UNITS)} and length in {sorted(LENGTH_UNITS)}"
    )


def convert_length(value: float, from_unit: str, to_unit: str) -> float:
    """Convert a length: value * m_per(from_unit) / m_per(to_unit).

    Units are keys of :data:`LENGTH_UNITS`; raises ``ValueError`` otherwise.
    """
    return value * _lookup(LENGTH_UNITS, from_unit, "length") / _lookup(
        LENGTH_UNITS, to_unit, "length"
    )


def convert_force(value: float, from_unit: str, to_unit: str) -> float:
    """Convert a force: value * N_per(from_unit) / N_per(to_unit).

    Units are keys of :data:`FORCE_UNITS`; raises ``ValueError`` otherwise.
    """
    return value * _lookup(FORCE_UNITS, from_unit, "force") / _lookup(
        FORCE_UNITS, to_unit, "force"
    )


def convert_stress(value: float, from_unit: str, to_unit: str) -> float:
    """Convert a stress: value * Pa_per(from_unit) / Pa_per(to_unit).

    Units as accepted by :func:`stress_factor`; raises ``ValueError`` otherwise.
    """
    return value * stress_factor(from_unit) / stress_factor(to_unit)


def force_scale(length: str, force: str, stress: str) -> float:
    """Working force units per unit of `force`, when stresses are to be in `stress`.

    A model whose lengths are in `length` and whose stresses are in `stress` is consistent
    when its forces are in the working unit W = stress x length^2 (so that a force over an
    area is a stress in that unit, with no factor). A force of `force` units is then

        c = N_per(force) / (Pa_per(stress) x m_per(length)^2)

    working units. Examples: kN with mm and MPa gives c = 1000 (W is the N); kN with m and
    MPa gives c = 1e-3 (W is the MN); N with mm and MPa gives exactly 1.

    Units as accepted by :func:`stress_factor` and keys of :data:`FORCE_UNITS` and
    :data:`LENGTH_UNITS`; raises ``ValueError`` otherwise. Exact SI factors (common
    practice); c is returned as exactly 1.0 when it equals 1 to round-off, so a case
    whose stress unit is force/length^2 itself is computed without any factor.
    """
    c = _lookup(FORCE_UNITS, force, "force") / (
        stress_factor(stress) * _lookup(LENGTH_UNITS, length, "length") ** 2
    )
    return 1.0 if math.isclose(c, 1.0, rel_tol=1e-12) else c
