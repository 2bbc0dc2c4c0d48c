"""The verification benchmarks (cases/verification/) as the test suite's published checks,
and `shearcheck verify` (fem.study.verify, fem.study.benchmark).

One source of truth: every published value the suite holds the FE and the hand library to
lives in a benchmark file, with its source in the file. The quick subset (``quick = true``)
runs in the default suite through the command itself; the full set runs in the slow suite,
one test per benchmark.
"""

from __future__ import annotations

import json
import math
import shutil
from dataclasses import replace
from pathlib import Path

import pytest
from conftest import ROOT

from fem.case import load_case
from fem.cli import main
from fem.errors import CaseError
from fem.study.benchmark import load_benchmark
from fem.study.verify import _verdict_of, run_benchmark

FOLDER = ROOT / "cases" / "verification"
ALL = sorted(FOLDER.glob("*.toml"))
QUICK = [p for p in ALL if load_benchmark(p).quick]
FULL = [p for p in ALL if not load_benchmark(p).quick]


def test_the_set_covers_what_the_manual_promises():
    """At least 20 benchmarks; members, sections and the hand library all present; the quick
    subset is a stated, non-empty part of it."""
    kinds = [load_benchmark(p).kind for p in ALL]
    assert len(ALL) >= 20
    assert {"FE beam", "FE section", "hand library"} <= set(kinds)
    assert 0 < len(QUICK) < len(ALL)


@pytest.fixture(scope="module")
def quick_run(tmp_path_factory):
    """`shearcheck verify --quick` once for the module (two workers, as CI has)."""
    out = tmp_path_factory.mktemp("verify")
    import contextlib
    import io

    buf = io.StringIO()
    with contextlib.redirect_stdout(buf):
        rc = main(["verify", str(FOLDER), "--quick", "--out", str(out), "--workers", "2",
                   "--quiet"])
    return rc, buf.getvalue(), out


def test_verify_quick_passes_and_writes_the_report(quick_run):
    """Exit 0, the last line says all pass; verification.json has the contract's keys, the
    provenance and one entry per quick benchmark; the HTML and PDF reports exist, name the
    caution, and carry no path of this machine."""
    rc, text, out = quick_run
    assert rc == 0, text
    assert text.strip().splitlines()[-1].startswith(f"all {len(QUICK)} benchmarks pass")
    data = json.loads((out / "verification.json").read_text(encoding="utf-8"))
    assert data["passed"] is True and data["quick"] is True
    assert [b["name"] for b in data["benchmarks"]] == [p.stem for p in QUICK]
    for b in data["benchmarks"]:
        assert {"name", "source", "quantity", "reference", "computed", "error", "tolerance",
                "gci", "passed", "unit"} <= set(b)
        assert b["unit"]
    prov = data["provenance"]
    assert {"shearcheck", "python", "packages", "platform", "run_utc"} <= set(prov)
    assert {"numpy", "scipy", "scikit-fem", "gmsh"} <= set(prov["packages"])
    html = (out / "verification.html").read_text(encoding="utf-8")
    assert "licensed engineer" in html and "Provenance" in html
    assert (out / "verification.pdf").read_bytes()[:5] == b"%PDF-"
    for text_out in (html, (out / "verification.json").read_text(encoding="utf-8")):
        assert str(ROOT) not in text_out and str(out) not in text_out


@pytest.mark.parametrize("path", QUICK, ids=lambda p: p.stem)
def test_quick_benchmark(path: Path, quick_run):
    """Each quick benchmark passes: the published value (source in its file) within its
    tolerance, on a mesh whose GCI is within it too."""
    _, _, out = quick_run
    data = json.loads((out / "verification.json").read_text(encoding="utf-8"))
    (b,) = [b for b in data["benchmarks"] if b["name"] == path.stem]
    assert b["passed"], b["reason"]
    if load_benchmark(path).case is not None:
        assert len(b["levels"]) >= 2   # a convergence study, not one mesh


@pytest.mark.slow
@pytest.mark.parametrize("path", FULL, ids=lambda p: p.stem)
def test_full_benchmark(path: Path):
    """Each benchmark outside the quick subset passes (its source and closed form are in its
    file's [reference] table)."""
    r = run_benchmark(path)
    assert r.passed, r.reason


def test_a_moved_reference_fails_and_is_named(tmp_path: Path, capsys):
    """A copy of two benchmarks, one with its reference value moved by 5 %: verify exits 1
    and the last line names that one only."""
    folder = tmp_path / "bench"
    folder.mkdir()
    for name in ("circle-torsion-constant", "hand-rectangle-second-moment"):
        shutil.copy(FOLDER / f"{name}.toml", folder)
    p = folder / "circle-torsion-constant.toml"
    b = load_benchmark(p)
    text = p.read_text(encoding="utf-8")
    assert text.count(f"value = {b.value!r}") == 1
    p.write_text(text.replace(f"value = {b.value!r}", f"value = {b.value * 1.05!r}"),
                 encoding="utf-8")
    rc = main(["verify", str(folder), "--out", str(tmp_path / "out"), "--workers", "1"])
    last = capsys.readouterr().out.strip().splitlines()[-1]
    assert rc == 1
    assert last.startswith("FAILED 1 of 2") and "circle-torsion-constant" in last
    assert "hand-rectangle" not in last
    data = json.loads((tmp_path / "out" / "verification.json").read_text(encoding="utf-8"))
    assert data["passed"] is False


def test_pass_rule_rows():
    """The pass rule (fem.study.verify docstring), each row at its boundary: error above the
    tolerance fails; a GCI above it fails even when the error is small; otherwise passes;
    a benchmark that did not run fails."""
    b = load_benchmark(FOLDER / "circle-torsion-constant.toml")
    v, tol = b.value, b.tolerance
    assert _verdict_of(b, v * (1 + 0.999 * tol), None)[1]
    assert not _verdict_of(b, v * (1 + 1.001 * tol), None)[1]
    assert _verdict_of(b, v, 0.999 * tol)[1]
    ok, why = _verdict_of(b, v, 1.001 * tol)[1:]
    assert not ok and "GCI" in why
    assert not _verdict_of(b, None, None)[1]
    scaled = replace(b, value=0.0, scale=10.0)   # near-zero value: error relative to scale
    assert _verdict_of(scaled, 0.999 * tol * 10.0, None)[1]
    assert not _verdict_of(scaled, 1.001 * tol * 10.0, None)[1]


# --------------------------------------------------------------------------- one source

PINNED = {  # bundled analytical case -> the benchmarks that pin it to published values
    "stub-cantilever": ["cantilever-parabolic-shear", "cantilever-bending-stress"],
    "deep-beam-uniform": ["deep-beam-uniform-shear", "deep-beam-uniform-bending"],
    "plate-hole-tension": ["strip-hole-tension-howland"],
    "rectangle-narrow-section": ["rectangle-narrow-flexure"],
    "rectangle-square-section": ["rectangle-square-flexure"],
    "rectangle-wide-section": ["rectangle-wide-flexure"],
    "round-pin-section": ["round-pin-flexure"],
}


@pytest.mark.parametrize("bundled", sorted(PINNED))
def test_bundled_analytical_cases_are_pinned(bundled: str):
    """The benchmark is the bundled case itself (geometry, material, loads, supports, mesh,
    cuts): only its name and title differ."""
    case = load_case(ROOT / "cases" / f"{bundled}.toml")
    for name in PINNED[bundled]:
        bench = load_benchmark(FOLDER / f"{name}.toml").case
        assert bench is not None
        assert replace(bench, name=case.name, title=case.title, file=case.file) == case


def _rect_factor(b: float, h: float, nu: float, terms: int = 400) -> float:
    s = sum(1 / (n * n * math.cosh(min(n * math.pi * h / b, 700.0))) for n in range(1, terms))
    return 1 + nu / (1 + nu) * (b / h) ** 2 * (2 / 3 - 4 / math.pi**2 * s)


def test_reference_values_follow_from_their_closed_forms():
    """The numbers written in the files are the formulas stated in their notes: the
    Saint-Venant rectangle series (Timoshenko & Goodier, Theory of Elasticity, 3rd ed.,
    section 124, section number from memory), which also gives the book's table 1.033, 1.126,
    1.396, 1.988 at nu = 1/4 (table from memory); the circle's (3 + 2 nu)/(2 (1 + nu)) V/A;
    the torsion constants; the cantilever and deep-beam stresses; the cantilever tip
    deflection (Cowper 1966); Williams' exponent."""
    from fem.convergence import williams_lambda

    for bh, table in ((0.5, 1.033), (1, 1.126), (2, 1.396), (4, 1.988)):
        assert _rect_factor(bh, 1, 0.25) == pytest.approx(table, abs=6e-4)

    def value(name: str) -> float:
        return load_benchmark(FOLDER / f"{name}.toml").value

    for name, b, h, nu in (("rectangle-narrow-flexure", 20, 40, 0.25),
                           ("rectangle-square-flexure", 40, 40, 0.25),
                           ("rectangle-wide-flexure", 160, 40, 0.25),
                           ("rectangle-2to1-flexure-nu03", 80, 40, 0.3)):
        assert value(name) == pytest.approx(1.5 * 10000 / (b * h) * _rect_factor(b, h, nu),
                                            rel=1e-6)
    assert value("round-pin-flexure") == pytest.approx(
        (3 + 0.6) / 2.6 * 10000 / (math.pi * 30**2 / 4), rel=1e-6)
    assert value("circle-shear-coefficient") == pytest.approx(
        6 * 1.3**2 / (7 + 14 * 0.3 + 8 * 0.3**2), rel=1e-6)
    assert value("circle-torsion-constant") == pytest.approx(math.pi * 30**4 / 32, rel=1e-7)
    assert value("hollow-circle-torsion-constant") == pytest.approx(
        math.pi * (40**4 - 24**4) / 32, rel=1e-7)
    assert value("ellipse-torsion-constant") == pytest.approx(
        math.pi * 30**3 * 15**3 / (30**2 + 15**2), rel=1e-7)
    assert value("triangle-torsion-constant") == pytest.approx(math.sqrt(3) * 60**4 / 80,
                                                               rel=1e-7)
    inertia = 10 * 200**3 / 12
    assert value("deep-beam-uniform-bending") == pytest.approx(
        25 * (300**2 - 75**2) * 100 / inertia + 50 / (2 * inertia) * 4 * 100**3 / 15, rel=1e-12)
    assert value("cantilever-bending-stress") == pytest.approx(
        10000 * 150 * 50 / (10 * 100**3 / 12), rel=1e-12)
    assert value("ell-corner-williams") == pytest.approx(williams_lambda(270.0) - 1, abs=1e-6)
    i_tip, k = 10 * 100**3 / 12, 10 * 1.3 / (12 + 11 * 0.3)   # Cowper (1966), rectangle
    assert value("cantilever-tip-deflection") == pytest.approx(
        -(1000 * 1000**3 / (3 * 200000 * i_tip) + 1000 * 1000 / (k * 200000 / 2.6 * 1000)),
        rel=1e-9)
    r = 0.2
    assert value("strip-hole-tension-howland") == pytest.approx(
        (3.00 - 3.13 * r + 3.66 * r**2 - 1.53 * r**3) * 100000 / (160 * 10), rel=1e-9)


def test_every_benchmark_names_its_source():
    """A source per benchmark, with an edition, a year or "common practice"; recalled
    values say "from memory"; the Howland fit is cited one way in every file."""
    howland = set()
    for p in ALL:
        b = load_benchmark(p)
        assert len(b.source) > 20 and len(b.note) > 80, p.name
        assert any(k in b.source for k in ("ed.", "19", "20", "common practice")), p.name
        if "Howland" in b.source:
            howland.add(b.source)
    assert len(howland) == 1


# --------------------------------------------------------------------------- the file

BASE = """# a benchmark
schema = 1
name = "tiny"
kind = "section"
[material]
E = 205000.0
nu = 0.3
[geometry]
shape = "circle"
diameter = 30.0
[loads]
shear = [0.0, 10000.0]
[mesh]
size = 2.0
levels = 2
"""
REF = """
[reference]
source = "common practice"
quantity = "section.J"
value = 79521.564
tolerance = 0.005
note = "A round bar's torsion constant, pi d^4/32, as a tiny benchmark for the file checks."
"""


@pytest.mark.parametrize("text, key", [
    (BASE, "reference"),
    (BASE + REF.replace('value = 79521.564\n', ''), "reference.value"),
    (BASE + REF + "colour = 1\n", "reference.colour"),
    (BASE + REF + "measure = \"peak\"\n", "reference.measure"),
    (BASE + REF.replace("section.J", "section..J"), "reference.quantity"),
    (BASE + REF + "tolerance_x = 0\n", "reference.tolerance_x"),
    (BASE + REF + "unit = 1\n", "reference.unit"),
    (REF + BASE.replace("# a benchmark\n", "[case]\n"), "reference"),
    (BASE + REF + 'function = "os.system"\n', "reference.function"),
    (BASE + REF + 'function = "classical.shapes.circle"\n', "reference.function"),
    (REF.replace("tolerance = 0.005", "tolerance = 0"), "reference.tolerance"),
])
def test_bad_benchmark_files_are_refused(tmp_path: Path, text: str, key: str):
    """A bad [reference] is a CaseError naming the file and the key."""
    p = tmp_path / "bad.toml"
    p.write_text(text, encoding="utf-8")
    with pytest.raises(CaseError) as e:
        load_benchmark(p)
    assert e.value.key == key and "bad.toml" in str(e.value)


def test_a_bad_benchmark_exits_2_in_one_line(tmp_path: Path, capsys):
    """Bad input on the command line: one line on stderr, exit 2, nothing run."""
    folder = tmp_path / "bench"
    folder.mkdir()
    (folder / "bad.toml").write_text(BASE, encoding="utf-8")
    assert main(["verify", str(folder), "--out", str(tmp_path / "out")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "bad.toml" in err[0] and "reference" in err[0]
    assert main(["verify", str(FOLDER), "--only", "no-such", "--out", str(tmp_path)]) == 2
    assert "no-such" in capsys.readouterr().err
    assert not (tmp_path / "out").exists()


def test_hand_library_call_with_a_nested_argument(tmp_path: Path):
    """A function benchmark calls classical.* with keyword arguments; a table with a
    `function` key is called first (here the outline of a 40 x 60 rectangle)."""
    r = run_benchmark(FOLDER / "hand-rectangle-first-moment.toml")
    assert r.computed == pytest.approx(40 * 60**2 / 8, rel=1e-12) and r.passed
    assert r.gci is None and r.levels == []
