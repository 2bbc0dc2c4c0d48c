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
from fem.report.blocks import sci
from fem.report.note import design_note
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
        assert f"= {sci(c.tau_formula_hand)} MPa" in text
    for heading in ("Inputs", "Hand calculation", "Finite-element model", "FE against hand",
                    "Convergence study", "Assumptions and limits"):
        assert heading in text
    assert "plane stress" in text and "small strain" in text


def test_hand_calculation_substitutes_its_own_numbers(run):
    """Each written-out line tau = V Q/(I b) = numbers = result holds to the printed digits
    (four significant figures), and V/A likewise: the note's arithmetic can be redone."""
    res, out, _ = run
    note = design_note(res, [])
    lines = [ln for s in note.sections if s.title == "Hand calculation" for b in s.items
             for ln in getattr(b, "text", "").splitlines()]

    def val(t: str) -> float:
        t = t.replace("−", "-")
        m = re.fullmatch(r"(-?[\d.]+)×10([⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+)", t)
        if m:
            exp = m[2].translate(str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-"))
            return float(m[1]) * 10 ** int(exp)
        return float(t)

    num = r"(−?[\d.]+(?:×10[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+)?)"
    taus = [re.search(rf"VQ/\(Ib\) = {num} × {num} / \({num} × {num}\) = {num}", ln)
            for ln in lines]
    taus = [m for m in taus if m]
    assert len(taus) == len(res.result.cuts)
    for m, c in zip(taus, res.result.cuts, strict=True):
        V, Q, I, b, tau = (val(m[k]) for k in range(1, 6))  # noqa: E741
        assert V * Q / (I * b) == pytest.approx(tau, rel=2e-3)
        assert tau == pytest.approx(c.tau_formula_hand, rel=1e-3)
    avgs = [re.search(rf"V/A = {num} / {num} = {num}", ln) for ln in lines]
    avgs = [m for m in avgs if m]
    assert len(avgs) == len(res.result.cuts)
    for m in avgs:
        assert val(m[1]) / val(m[2]) == pytest.approx(val(m[3]), rel=2e-3)


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
    assert 4 <= n <= 9
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


def test_pdf_figures_two_to_a_page(run):
    """The figures section: never more than two figures on a page, and at least one page
    holds two."""
    _, out, files = run
    pages = _pdf_pages(out / "report.pdf")
    per_page = [len(re.findall(r"Figure \d+\.", t)) for t in pages]
    assert sum(per_page) == len(_note_pngs(files))
    assert max(per_page) == 2


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
