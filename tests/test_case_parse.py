"""Case files: parsing into dataclasses and refusing what the contract does not allow."""

from __future__ import annotations

import pytest
from conftest import CANTILEVER

from fem.case import Case, parse_case
from fem.errors import CaseError


def _cant(**kw) -> str:
    args = {"length": 300.0, "size": 10.0, "levels": 1, "cuts": "[100.0]"}
    args.update(kw)
    return CANTILEVER.format(**args)


def test_parse_beam_case():
    c = parse_case(_cant(), "c.toml")
    assert isinstance(c, Case)
    assert c.kind == "beam" and c.units.stress == "MPa"
    assert c.geometry.length == 300.0 and c.material.model == "plane-stress"
    assert c.loads[0].distribution == "parabolic" and c.supports[0].where.edge == "left"
    assert c.check.cuts == (100.0,) and c.mesh.order == 2


@pytest.mark.parametrize("change, fragment", [
    (("nu = 0.3", "nu = 0.5"), "material.nu: must be < 0.5"),
    (("E = 200000.0", "E = -1.0"), "material.E: must be > 0"),
    (("size = 10.0", "size = 0"), "mesh.size: must be > 0"),
    (("fix = \"xy\"", "fix = \"z\""), "supports.0.fix: 'z' is not allowed"),
    (("edge = \"right\"", "edge = \"rigth\""), "loads.0.edge: 'rigth' is not allowed"),
    (("thickness = 10.0", "thickness = 10.0\nthicknes = 2.0"), "material.thicknes: unknown key"),
    (("kind = \"beam\"", "kind = \"plate\""), "kind: 'plate' is not allowed"),
    (("schema = 1", "schema = 7"), "schema: version 7 is not known"),
    (("cuts = [100.0]", "cuts = [400.0]"), "check.cuts.0: 400 is outside the member"),
    (("length = 300.0", "length = \"300\""), "geometry.length: must be a number"),
])
def test_bad_values_are_named(change, fragment):
    """Each bad value is refused with the file, the key path and what is allowed."""
    text = _cant().replace(*change)
    with pytest.raises(CaseError) as err:
        parse_case(text, "bad.toml")
    assert fragment in str(err.value)
    assert str(err.value).startswith("bad.toml")


def test_toml_syntax_error_names_the_line():
    with pytest.raises(CaseError) as err:
        parse_case("schema = 1\nname = \n", "broken.toml")
    assert err.value.line == 2 and "broken.toml:2" in str(err.value)


def test_zero_load_refused():
    with pytest.raises(CaseError, match="every load is zero"):
        parse_case(_cant().replace("[0.0, -10000.0]", "[0.0, 0.0]"), "z.toml")


def test_units_stress_is_the_unit_of_every_stress_and_forces_stay_as_given():
    """[units] stress is optional (default force/length²: N & mm → MPa); given, it is the
    unit of every stress in the file and the outputs, and the case is computed in working
    units: forces × force_scale = N_per(force) / (Pa_per(stress) m_per(length)²), so that
    force / area is a stress in that unit (kN with mm and MPa: 1 kN = 1000 N, the working
    unit; SI definitions, common practice). E and the lengths are read as given."""
    plain = parse_case(_cant(), "c.toml")
    assert plain.units.stress == "MPa" and plain.units.stress_name is None
    assert plain.units.force_scale == 1.0
    named = parse_case(_cant().replace("[material]", '[units]\nstress = "N/mm²"\n[material]'),
                       "c.toml")
    assert named.units.stress == "N/mm²" and named.units.force_scale == 1.0
    kn_text = _cant().replace("[material]", '[units]\nforce = "kN"\nstress = "MPa"\n'
                                            '[material]').replace("-10000.0", "-10.0")
    kn = parse_case(kn_text, "c.toml")
    assert kn.units.stress == "MPa" and kn.units.force_scale == 1000.0
    assert kn.loads[0].force == plain.loads[0].force == (0.0, -10000.0)   # working: N
    assert kn.material.E == plain.material.E
    assert kn.units.user_force(kn.loads[0].force[1]) == -10.0
    gpa = parse_case(kn_text.replace('"MPa"', '"GPa"').replace("-10.0", "-10000.0"), "c.toml")
    assert gpa.units.stress == "GPa" and gpa.units.force_scale == 1.0   # kN/mm² itself
    with pytest.raises(CaseError, match="units.stress.*'bar' is not allowed"):
        parse_case(kn_text.replace('"MPa"', '"bar"'), "c.toml")


def test_section_method_defaults_to_auto_beam_to_shear_formula():
    """A section case without check.method asks for "auto" (the hand method picked by the
    section, fem.section.hand_method); a beam keeps "shear-formula"; thin-wall is a
    section method only."""
    sec = ("schema = 1\nname = \"s\"\nkind = \"section\"\n[material]\nE = 2e5\nnu = 0.3\n"
           "[geometry]\nshape = \"rectangle\"\nwidth = 10.0\ndepth = 20.0\n"
           "[loads]\nshear = [0.0, 1.0]\n[mesh]\nsize = 2.0\n")
    assert parse_case(sec, "s.toml").check.method == "auto"
    assert parse_case(sec + "[check]\ntolerance = 0.1\n", "s.toml").check.method == "auto"
    with pytest.raises(CaseError, match="check.method"):
        parse_case(sec.replace("rectangle", "circle").replace(
            "width = 10.0\ndepth = 20.0", "diameter = 10.0") + "[check]\nmethod = \"thin-wall\"\n",
            "s.toml")
    assert parse_case(_cant(), "b.toml").check.method == "shear-formula"
    with pytest.raises(CaseError, match="check.method"):
        parse_case(_cant().replace("cuts = [100.0]", "cuts = [100.0]\nmethod = \"thin-wall\""),
                   "b.toml")
