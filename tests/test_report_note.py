"""The design note: the output folder, the self-contained HTML, the PDF, the figures.

One coarse two-level run of the bundled demo (invented scenario) is shared by the module.
"""

from __future__ import annotations

import base64
import re
import shutil
import subprocess
import tempfile
from dataclasses import replace
from html.parser import HTMLParser
from pathlib import Path

import numpy as np
import pytest
from conftest import ROOT

import fem
from fem.api import CheckResult, write_outputs
from fem.case import load_case, parse_case
from fem.report.blocks import Table, figure_rows, sci
from fem.report.note import design_note, governing_cut
from fem.results import CAUTION

DEMO = ROOT / "fem" / "data" / "stub-bracket.toml"
PNG_MAGIC = b"\x89PNG\r\n\x1a\n"
VOID = {"meta", "img", "br", "hr", "link", "input", "col", "source", "wbr"}


PROJECT = """
[project]
project = "Dock 4 crane rail upgrade"
job = "J-2291"
member = "Bracket B3"
prepared_by = "A. Engineer"
date = "2026-03-14"
revision = "B"
notes = "Plate checked for the new rail bearing."
"""


@pytest.fixture(scope="module")
def run(tmp_path_factory) -> tuple[CheckResult, Path, list[Path]]:
    """The demo with a title block (checked_by left out), written as a file in a folder of
    its own, run from there: the outputs must not name that folder."""
    where = tmp_path_factory.mktemp("case-folder")
    path = where / "stub-bracket.toml"
    demo = re.sub(r"\[project\].*?\n\n", "", DEMO.read_text(encoding="utf-8"), flags=re.S)
    path.write_text(demo + PROJECT, encoding="utf-8")
    case = load_case(path).with_mesh(levels=2, size=24.0)
    case = replace(case, check=replace(case.check, cuts=(35.0, 100.0)))  # beside, through hole
    res = fem.check(case)
    out = tmp_path_factory.mktemp("note")
    return res, out, write_outputs(res, out)


def _note_pngs(files: list[Path]) -> list[Path]:
    """The figures the note shows: every PNG but the single-cut profiles (profiles.png
    stands for them)."""
    return [f for f in files if f.suffix == ".png" and not f.stem.startswith("profile-")]


def _pages(pdf: bytes) -> int:
    return len(re.findall(rb"/Type\s*/Page[^s]", pdf))


class _Doc(HTMLParser):
    """Collects tags, attributes and text, and checks that elements close in order."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list[str] = []
        self.errors: list[str] = []
        self.tags: list[tuple[str, dict[str, str | None]]] = []
        self.text: list[str] = []

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))
        if tag not in VOID:
            self.stack.append(tag)

    def handle_endtag(self, tag):
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes {self.stack[-1:] or 'nothing'}")
        else:
            self.stack.pop()

    def handle_data(self, data):
        self.text.append(data)


def _parse(html: str) -> _Doc:
    d = _Doc()
    d.feed(html)
    d.close()
    return d


def test_output_folder_holds_every_file(run):
    """results.json, both documents, the field files and every figure; nothing staged left."""
    res, out, files = run
    n = len(res.result.cuts)
    expected = {"results.json", "report.html", "report.pdf", "fields.vtu", "profiles.csv",
                "model.png",
                "shear-contour.png", "von-mises-contour.png", "convergence.png",
                "ratio-along-member.png", "profiles.png", "mesh.png"}
    expected |= {f"profile-{k:02d}.png" for k in range(1, n + 1)}
    assert {f.name for f in files} == expected
    assert {p.name for p in out.iterdir()} == expected | {"manifest.json"}  # the set's list
    assert all((out / name).stat().st_size > 0 for name in expected)
    assert [p.name for p in res.figures] == [f.name for f in files if f.suffix == ".png"]
    assert all(p.parent == out for p in res.figures)


def test_html_parses_and_embeds_its_figures(run):
    """Well nested; every figure a PNG data URI; no script, stylesheet link or remote URL."""
    _, out, files = run
    html = (out / "report.html").read_text(encoding="utf-8")
    doc = _parse(html)
    assert doc.errors == [] and doc.stack == []
    imgs = [a["src"] for t, a in doc.tags if t == "img"]
    assert len(imgs) == len(_note_pngs(files))
    for src in imgs:
        assert src.startswith("data:image/png;base64,")
        assert base64.b64decode(src.split(",", 1)[1])[:8] == PNG_MAGIC
    assert not any(t in ("script", "link", "iframe", "object") for t, _ in doc.tags)
    for _, attrs in doc.tags:
        for k, v in attrs.items():
            if k in ("href", "src"):
                assert v and (v.startswith("#") or v.startswith("data:image/png")), (k, v)
    assert not re.search(r"https?://|url\(", html)


def test_html_says_what_the_check_found(run):
    """Title, verdict, caution, units and every cut's hand shear appear in the text."""
    res, out, _ = run
    text = " ".join(_parse((out / "report.html").read_text(encoding="utf-8")).text)
    text = re.sub(r"\s+", " ", text)
    r = res.result
    assert r.title in text and CAUTION in text
    assert r.verdict.upper() in text
    for c in r.cuts:
        assert f"x = {c.x:g} mm" in text
        assert sci(c.tau_formula_hand) in text
    assert "τ = VQ/(Ib) [MPa]" in text   # the hand table's column, with its unit
    for heading in ("Inputs", "Hand calculation", "Finite-element model", "FE against hand",
                    "Convergence study", "Assumptions and limits"):
        assert heading in text
    assert "plane stress" in text and "small strain" in text


_SUPERSCRIPT = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")
_NUM = r"(−?[\d.]+(?:×10[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+)?)"
# units to SI, so the written-out arithmetic is checked whatever units the case uses
_SI = {"N": 1.0, "kN": 1e3, "MN": 1e6, "mm": 1e-3, "cm": 1e-2, "m": 1.0,
       "Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "GPa": 1e9}


def _val(t: str) -> float:
    t = t.replace("−", "-")
    m = re.fullmatch(r"(-?[\d.]+)×10([⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+)", t)
    if m:
        return float(m[1]) * 10 ** int(m[2].translate(_SUPERSCRIPT))
    return float(t)


def _si(value: str, unit: str) -> float:
    """A printed value with its unit ('mm³', 'N·mm', 'MPa') in SI."""
    factor = 1.0
    for part in unit.split("·"):
        power = {"²": 2, "³": 3, "⁴": 4}.get(part[-1], 1)
        factor *= _SI[part.rstrip("²³⁴")] ** power
    return _val(value) * factor


def _hand_section(note):
    return next(s for s in note.sections if s.title == "Hand calculation")


def test_hand_calculation_writes_out_the_governing_cut_with_units(run):
    """One cut written out, every value with its unit; each substituted line
    τ = VQ/(Ib) = V F × Q L³ / (I L⁴ × b L) = τ S (and V/A, σ = |M|c/I) holds in SI to the
    printed digits, so the arithmetic reads right whatever the force and stress units."""
    res, _, _ = run
    sec = _hand_section(design_note(res, []))
    blocks = [b for b in sec.items if getattr(b, "style", "") == "formula"]
    assert len(blocks) == 1
    text = blocks[0].text
    u = r"(\S+)"
    m = re.search(rf"VQ/\(Ib\) = {_NUM} {u} × {_NUM} {u} / \({_NUM} {u} × {_NUM} {u}\) "
                  rf"= {_NUM} {u}", text)
    assert m, text
    V, Q, I, b, tau = (_si(m[k], m[k + 1]) for k in (1, 3, 5, 7, 9))  # noqa: E741
    assert (m[2], m[4], m[6], m[8], m[10]) == ("N", "mm³", "mm⁴", "mm", "MPa")
    assert V * Q / (I * b) == pytest.approx(tau, rel=2e-3)
    m = re.search(rf"V/A = {_NUM} {u} / {_NUM} {u} = {_NUM} {u}", text)
    assert _si(m[1], m[2]) / _si(m[3], m[4]) == pytest.approx(_si(m[5], m[6]), rel=2e-3)
    m = re.search(rf"σ = \|M\|c/I = {_NUM} {u} × {_NUM} {u} / {_NUM} {u} = {_NUM} {u}", text)
    M, c, I2, sigma = (_si(m[k], m[k + 1]) for k in (1, 3, 5, 7))
    assert M * c / I2 == pytest.approx(sigma, rel=2e-3)


def test_hand_calculation_tabulates_every_cut(run):
    """One table, one row per cut, each header with its unit; forces and stresses are the
    result's own (CutResult), so the table and the comparison agree."""
    res, _, _ = run
    sec = _hand_section(design_note(res, []))
    tables = [t for t in sec.items if isinstance(t, Table)]
    assert len(tables) == 1
    t = tables[0]
    cuts = res.result.cuts
    assert len(t.rows) == len(cuts) >= 2
    col = {h.split(" [")[0]: j for j, h in enumerate(t.header)}
    for h in t.header[1:]:
        assert re.search(r"\[.+\]$", h), h   # a unit on every column but the cut number
    for row, c in zip(t.rows, cuts, strict=True):
        assert row[col["x"]] == f"{c.x:g}"
        assert row[col["V"]] == sci(c.V_hand) and row[col["M"]] == sci(c.M_hand)
        assert row[col["τ = VQ/(Ib)"]] == sci(c.tau_formula_hand)
        assert row[col["V/A"]] == sci(c.tau_avg_hand)
        assert row[col["A"]] == sci(c.A) and row[col["I"]] == sci(c.I)
    assert "N" not in col   # no axial force in the demo: no N column


def test_the_written_out_cut_is_the_one_with_the_largest_ratio(run):
    """Of the fixture's two cuts, the one through the hole (x = 100) has the larger FE/hand
    ratio, so it is written out and highlighted, not the first; with no ratio at all, the
    largest hand stress governs."""
    res, _, _ = run
    cuts = res.result.cuts
    worst = max(range(len(cuts)), key=lambda k: cuts[k].ratio)
    assert worst != 0 and cuts[worst].x == 100.0
    assert governing_cut(cuts) == worst
    sec = _hand_section(design_note(res, []))
    block = next(b for b in sec.items if getattr(b, "style", "") == "formula")
    assert block.text.startswith(f"Cut {worst + 1} (governs: largest FE/hand ratio), "
                                 f"x = {cuts[worst].x:g} mm")
    assert f"Cut {worst + 1} (governs: largest FE/hand ratio) is written out" in \
        sec.items[0].text
    table = next(t for t in sec.items if isinstance(t, Table))
    assert table.marked == {worst}
    unrated = [replace(c, ratio=None) for c in cuts]
    assert governing_cut(unrated) == max(range(len(cuts)),
                                         key=lambda k: cuts[k].tau_max_hand)
    tension = [replace(c, ratio=None, tau_max_hand=0.0, sigma_x_max_hand=s)
               for c, s in zip(cuts, (50.0, 80.0), strict=True)]
    assert governing_cut(tension) == 1   # no shear anywhere: the largest normal stress


def _pdf_pages(path: Path) -> list[str]:
    from pypdf import PdfReader

    return [re.sub(r"\s+", " ", pg.extract_text() or "") for pg in PdfReader(path).pages]


def test_pdf_pages_carry_title_block_page_numbers_and_caution(run):
    """Every page: the title block in its header (a field left out stays blank), "page N
    of M" and the caution in its footer; the first page is the summary."""
    res, out, _ = run
    pdf = (out / "report.pdf").read_bytes()
    assert pdf.startswith(b"%PDF") and pdf.rstrip().endswith(b"%%EOF")
    pages = _pdf_pages(out / "report.pdf")
    n = len(pages)
    assert 4 <= n <= 6
    assert n == _pages(pdf)
    for k, text in enumerate(pages, start=1):
        assert f"page {k} of {n}" in text
        for field in ("Dock 4 crane rail upgrade", "J-2291", "Bracket B3", "A. Engineer",
                      "2026-03-14", "CHECKED BY", "PROJECT", "REVISION"):
            assert field in text, (k, field)
        assert "licensed engineer" in text and "verification aid" in text
    first = pages[0]
    assert "Summary" in first and res.result.verdict.upper() in first
    assert "Peak stresses at each cut" in first
    assert "Plate checked for the new rail bearing." in first
    assert "checked_by" not in res.data["project"] and res.data["project"]["job"] == "J-2291"


def _captions(path: Path) -> list[dict[int, tuple[float, float]]]:
    """Per page: figure number -> (x, y) in points where its caption "Figure N." starts."""
    from pypdf import PdfReader

    pages = []
    for pg in PdfReader(path).pages:
        found: dict[int, tuple[float, float]] = {}

        def visit(text, cm, tm, _font, _size, found=found):
            m = re.match(r"Figure (\d+)\.", text)
            if m:
                found[int(m[1])] = (cm[4] + tm[4], cm[5] + tm[5])

        pg.extract_text(visitor_text=visit)
        pages.append(found)
    return pages


def test_pdf_figures_two_rows_a_page_upright_ones_side_by_side(run):
    """Every figure once; no page holds more than two rows of figures; the model and the
    mesh (both about as tall as wide) share a row, side by side, and so do the two
    contour plots; the wide convergence figure has a row of its own."""
    res, out, files = run
    pages = _captions(out / "report.pdf")
    where = {n: (k, xy) for k, page in enumerate(pages) for n, xy in page.items()}
    assert sorted(where) == list(range(1, len(_note_pngs(files)) + 1))
    for page in pages:
        assert len({round(y) for _, y in page.values()}) <= 2   # rows: caption levels
    number = {f.path.stem: k for k, f in enumerate(design_note(res, files).figures, start=1)}

    def side_by_side(a: str, b: str) -> bool:
        (pa, (xa, ya)), (pb, (xb, yb)) = where[number[a]], where[number[b]]
        return pa == pb and abs(ya - yb) < 1 and xb - xa > 200   # half the page over

    assert number["mesh"] == number["model"] + 1
    assert side_by_side("model", "mesh")
    assert side_by_side("shear-contour", "von-mises-contour")
    conv = where[number["convergence"]]
    assert not any(k == conv[0] and abs(xy[1] - conv[1][1]) < 1
                   for n, (k, xy) in where.items() if n != number["convergence"])


def test_figure_rows_pair_consecutive_upright_figures():
    """Two consecutive figures each at most 1.3 times as wide as tall share a row; a wide
    one, or an upright one with no upright neighbour left, has a row of its own."""
    assert figure_rows([0.87, 1.12, 0.84, 0.84, 1.19, 2.5]) == [[0, 1], [2, 3], [4], [5]]
    assert figure_rows([2.5, 0.9, 0.9]) == [[0], [1, 2]]
    assert figure_rows([0.9, 2.5, 0.9]) == [[0], [1], [2]]   # not across a wide figure
    assert figure_rows([0.9, 0.9, 0.9]) == [[0, 1], [2]]
    assert figure_rows([1.3, 1.3]) == [[0, 1]] and figure_rows([1.31, 1.0]) == [[0], [1]]
    assert figure_rows([]) == []
    assert figure_rows([1.5, 1.5], limit=2.0) == [[0, 1]]


def test_the_demo_note_is_four_to_six_pages(tmp_path):
    """The bundled demo as `shearcheck demo` runs it (three levels, six cuts): a note of
    4 to 6 A4 pages, the hand calculation with one cut written out (the governing cut 4,
    through the hole) and six rows in its table."""
    res = fem.check(load_case(DEMO))
    write_outputs(res, tmp_path)
    n = len(_pdf_pages(tmp_path / "report.pdf"))
    assert 4 <= n <= 6, n
    sec = _hand_section(design_note(res, []))
    assert [getattr(b, "style", "") for b in sec.items].count("formula") == 1
    assert governing_cut(res.result.cuts) == 3
    assert len(next(t for t in sec.items if isinstance(t, Table)).rows) == 6


def test_provenance_and_no_machine_paths(run):
    """results.json names the case file (not where it lives) with its SHA-256, and neither
    results.json, report.html nor the PDF's text holds the case's folder or the output's."""
    import hashlib
    import json

    res, out, _ = run
    case_path = Path(res.case.file)
    d = json.loads((out / "results.json").read_text(encoding="utf-8"))
    prov = d["provenance"]
    assert prov["case_file"] == "stub-bracket.toml"
    assert prov["case_sha256"] == hashlib.sha256(case_path.read_bytes()).hexdigest()
    for key in ("numpy", "scipy", "scikit-fem", "gmsh", "meshio"):
        assert prov["packages"][key] not in ("", None)
    html = (out / "report.html").read_text(encoding="utf-8")
    pdf_text = " ".join(_pdf_pages(out / "report.pdf"))
    for folder in {str(case_path.parent), str(out), str(Path.home())} - {"/"}:
        for where, text in (("results.json", json.dumps(d)), ("report.html", html),
                            ("report.pdf", pdf_text)):
            assert folder not in text, (folder, where)
    assert prov["case_sha256"] in html and prov["case_sha256"][:16] in pdf_text.replace(" ", "")
    import html as html_lib

    assert 'job = "J-2291"' in html_lib.unescape(html)  # the case text in the appendix


def test_pdf_skipped_with_a_reason_when_reportlab_is_missing(run, tmp_path, monkeypatch):
    """ReportLab unimportable: report.html still written, no report.pdf, and results.json
    and the console summary say why."""
    import sys

    res = run[0]
    for name in [m for m in sys.modules if m == "reportlab" or m.startswith("reportlab.")]:
        monkeypatch.delitem(sys.modules, name)
    monkeypatch.setitem(sys.modules, "reportlab", None)
    monkeypatch.delitem(sys.modules, "fem.report.pdf", raising=False)
    files = {f.name for f in write_outputs(res, tmp_path / "nopdf")}
    assert "report.html" in files and "report.pdf" not in files
    assert not (tmp_path / "nopdf" / "report.pdf").exists()
    import json

    d = json.loads((tmp_path / "nopdf" / "results.json").read_text())
    assert "report.pdf not written" in d["pdf_skipped"] and "reportlab" in d["pdf_skipped"]
    assert "report.pdf not written" in res.summary()
    monkeypatch.undo()
    files = {f.name for f in write_outputs(res, tmp_path / "withpdf")}
    assert "report.pdf" in files and res.result.pdf_skipped is None


def test_no_report_writes_results_json_only(run, tmp_path):
    res, _, _ = run
    files = write_outputs(res, tmp_path / "bare", report=False)
    assert [f.name for f in files] == ["results.json"]
    assert sorted(p.name for p in (tmp_path / "bare").iterdir()) == ["manifest.json",
                                                                     "results.json"]


def test_notebook_methods_draw_and_write(run, tmp_path):
    res = run[0]
    for name, draw in (("vm.png", res.plot_von_mises), ("conv.png", res.plot_convergence),
                       ("shear.png", res.plot_shear)):
        p = draw(tmp_path / name)
        assert p.read_bytes()[:8] == PNG_MAGIC and p.stat().st_size > 20_000
    assert res.plot_profile(0, tmp_path / "p.png").stat().st_size > 20_000


def test_one_level_run_writes_its_note_without_a_convergence_figure(tmp_path):
    from conftest import CANTILEVER

    res = fem.check(parse_case(CANTILEVER.format(length=200.0, size=25.0, levels=1,
                                                 cuts="[100.0]"), "c.toml"))
    with pytest.raises(ValueError, match="two or more"):
        res.plot_convergence(tmp_path / "c.png")
    names = {f.name for f in res.write_report(tmp_path / "one")}
    assert {"report.html", "report.pdf", "fields.vtu", "results.json"} <= names
    assert "convergence.png" not in names
    text = (tmp_path / "one" / "report.html").read_text(encoding="utf-8")
    assert "One mesh only" in text


def test_numbers_for_documents():
    """Four significant figures, trailing zeros dropped, a true minus, powers of ten."""
    assert sci(1.3824e7) == "1.382×10⁷"
    assert sci(-1.013e-6) == "−1.013×10⁻⁶"
    assert sci(240.0) == "240" and sci(12.0) == "12" and sci(0.3) == "0.3"
    assert sci(-90000.0) == "−90000" and sci(46.875) == "46.88"
    assert sci(None) == "–" and sci(float("nan")) == "–" and sci(0.0) == "0"


def test_section_check_gets_its_own_note(tmp_path):
    """A section case (the bundled wide rectangle, coarse and two levels for speed): both
    documents with the section's own tables, its figures, fields.vtu and profiles.csv."""
    case = load_case(ROOT / "cases" / "rectangle-wide-section.toml").with_mesh(levels=2,
                                                                              size=8.0)
    res = fem.check(case)
    names = {f.name for f in write_outputs(res, tmp_path)}
    assert {"report.html", "report.pdf", "fields.vtu", "profiles.csv", "results.json",
            "convergence.png"} <= names
    doc = _parse((tmp_path / "report.html").read_text(encoding="utf-8"))
    assert doc.errors == [] and doc.stack == []
    text = re.sub(r"\s+", " ", " ".join(doc.text))
    sec = res.result.section
    assert CAUTION in text and "Cuts parallel to the neutral axis" in text
    assert f"the FE peak {sci(sec['tau_max_fe'])} MPa is {sec['ratio']:.3f} times" in text
    assert f"V/A = 10000 N / {sci(sec['A'])} mm² = {sci(sec['tau_avg_hand'])} MPa" in text
    imgs = [a["src"] for t, a in doc.tags if t == "img"]
    assert len(imgs) == len([n for n in names if n.endswith(".png")])
    assert "Prepared by" in text and "Checked by" in text  # the title block, left blank
    rows = (tmp_path / "profiles.csv").read_text().splitlines()
    assert rows[0] == ("line,offset [mm],s [mm],x [mm],y [mm],tau_fe [MPa],tau_hand [MPa]")
    lines = [r.split(",")[0] for r in rows[1:]]
    assert lines[0] == "neutral-axis"
    assert {n for n in lines if n != "neutral-axis"} == {
        f"cut-{k}" for k in range(1, len(sec["cuts"]) + 1)}


CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")


@pytest.mark.skipif(CHROMIUM is None, reason="chromium is not installed")
def test_html_renders_in_a_browser(run, tmp_path):
    """Headless Chromium draws the page: a large, varied screenshot with the verdict badge
    in its colour (so the inline styles took effect) and the figures drawn."""
    _, out, _ = run
    shot = tmp_path / "page.png"
    subprocess.run([CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu",
                    "--disable-background-networking", "--disable-component-update",
                    "--disable-sync", "--no-first-run", f"--user-data-dir={tempfile.mkdtemp()}",
                    f"--screenshot={shot}", "--window-size=1200,3000",
                    (out / "report.html").as_uri()], capture_output=True, timeout=120,
                   check=False)
    assert shot.exists() and shot.stat().st_size > 50_000
    import matplotlib.image as mpimg

    img = mpimg.imread(shot)[:, :, :3]
    assert img.shape[:2] == (3000, 1200)
    ink = (img < 0.9).any(axis=2).mean()
    assert 0.03 < ink < 0.9
    badge = np.abs(img - np.array([0xA5, 0x1D, 0x2D]) / 255.0).max(axis=2) < 0.04
    assert badge.sum() > 500


def test_peaks_table_uses_the_von_mises_shear_yield():
    """fy = 250 MPa: the von Mises shear yield is fy/√3 = 144.3 MPa (von Mises criterion in
    pure shear, common practice), so a shear peak of 71 MPa uses 71/144.3 = 49 % of it,
    not 71/250 = 28 %; the von Mises peak 150 MPa uses 150/250 = 60 % of fy."""
    from fem.report.note import _peaks_table
    from fem.results import Peak

    p = Peak(tau_max=71.0, tau_at=[1.0, 2.0], von_mises_max=150.0, von_mises_at=[3.0, 4.0],
             principal_max=160.0, principal_at=[5.0, 6.0])
    t = _peaks_table(p, 250.0, "mm", "MPa")
    assert t.rows[0][-1] == "τ/(fy/√3) = 49%"
    assert t.rows[1][-1] == "σvm/fy = 60%"
    assert "28%" not in str(t.rows)
    assert "von Mises shear yield fy/√3 = 144.3 MPa" in t.caption
    assert len(_peaks_table(p, None, "mm", "MPa").rows[0]) == 3
