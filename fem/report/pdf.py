"""The design note (`fem.report.blocks.Note`) as PDF, drawn with matplotlib on A4 pages.

The text pages are laid out top to bottom: headings, paragraphs wrapped by measured text
width, tables with columns sized to their widest cell (the font shrinks, down to 5 pt, until
a table fits the page; its header repeats on a new page). Then one page per figure with its
caption. Every page carries the caution in its footer.
"""

from __future__ import annotations

import functools
from pathlib import Path
from typing import Any

import matplotlib.image as mpimg
import matplotlib.pyplot as plt
import numpy as np
from matplotlib.backends.backend_pdf import PdfPages
from matplotlib.font_manager import FontProperties, findfont, get_font
from matplotlib.lines import Line2D

from fem.report import member_figures  # noqa: F401  (selects the Agg backend)
from fem.report.blocks import Note, Table, numeric_columns
from fem.results import CAUTION, atomic_write

__all__ = ["write_pdf", "PAGE", "MARGIN"]

PAGE = (8.27, 11.69)      # A4, inches
MARGIN = 0.7
_W = PAGE[0] - 2 * MARGIN
_COLOUR = {"unsafe": "#a51d2d", "holds": "#26734d", "inconclusive": "#8a5a00"}
INK, MUTE = "#1d2327", "#5b6770"


@functools.lru_cache(maxsize=8)
def _font(mono: bool, bold: bool) -> Any:
    fp = FontProperties(family="monospace" if mono else "sans-serif",
                        weight="bold" if bold else "normal")
    return get_font(findfont(fp))


@functools.lru_cache(maxsize=4096)
def _advance(ch: str, mono: bool, bold: bool) -> float:
    """Advance width of one character at 100 pt, in points."""
    font = _font(mono, bold)
    font.set_size(100.0, 72)
    font.set_text(ch, 0.0)
    return font.get_width_height()[0] / 64


def _width(s: str, size: float, mono: bool = False, bold: bool = False) -> float:
    """Drawn width of `s` in inches: the sum of the font's advances (kerning ignored)."""
    return sum(_advance(ch, mono, bold) for ch in s) * size / 100 / 72


def _wrap(text: str, size: float, width: float, mono: bool, bold: bool,
          hang: str) -> list[str]:
    lines: list[str] = []
    for raw in text.split("\n"):
        if _width(raw, size, mono, bold) <= width:
            lines.append(raw)  # fits: keep its spacing
            continue
        lead = raw[: len(raw) - len(raw.lstrip())]
        words, line = raw.split(), lead
        for w in words:
            trial = f"{line} {w}" if line.strip() else f"{line}{w}"
            if line.strip() and _width(trial, size, mono, bold) > width:
                lines.append(line)
                line = f"{lead}{hang}{w}"
            else:
                line = trial
        lines.append(line)
    return lines


class _Pages:
    """A top-to-bottom text layout on A4 matplotlib figures."""

    def __init__(self, pdf: PdfPages, footer: str) -> None:
        self.pdf, self.footer, self.count = pdf, footer, 0
        self.fig: Any = None
        self.y = 0.0
        self.new()

    def new(self) -> None:
        self.flush()
        self.fig = plt.figure(figsize=PAGE)
        self.count += 1
        self.y = PAGE[1] - MARGIN
        _footer(self.fig, f"{self.footer}   ·   page {self.count}")

    def flush(self) -> None:
        if self.fig is not None:
            self.pdf.savefig(self.fig)
            plt.close(self.fig)
            self.fig = None

    def need(self, inches: float) -> None:
        if self.y - inches < MARGIN:
            self.new()

    def put(self, x: float, s: str, size: float, **kw: Any) -> None:
        self.fig.text(x / PAGE[0], self.y / PAGE[1], s, fontsize=size, va="baseline",
                      parse_math=False, **kw)

    def para(self, text: str, size: float = 9.0, mono: bool = False, bold: bool = False,
             hang: str = "", gap: float = 0.5, keep: float = 0.0, **kw: Any) -> None:
        """Wrapped text; `keep` inches more must fit on the page, or a new page begins."""
        step = size * 1.45 / 72
        lines = _wrap(text, size, _W, mono, bold, hang)
        self.need(len(lines) * step + keep)
        for line in lines:
            self.need(step)
            self.y -= step
            self.put(MARGIN, line, size, family="monospace" if mono else "sans-serif",
                     fontweight="bold" if bold else "normal", **kw)
        self.y -= size * gap / 72

    def rule(self, width: float = _W, dy: float = 0.05) -> None:
        y = (self.y - dy) / PAGE[1]
        self.fig.add_artist(Line2D([MARGIN / PAGE[0], (MARGIN + width) / PAGE[0]], [y, y],
                                   lw=0.6, color="#999999"))

    def table(self, t: Table) -> None:
        heads = [h.replace(" [", "\n[").split("\n") for h in t.header]
        size = 8.0
        while True:
            pad = 0.12 * size / 8.0
            colw = [max([_width(x, size, bold=True) for x in hd]
                        + [_width(r[j], size) for r in t.rows if j < len(r)]) + pad
                    for j, hd in enumerate(heads)]
            if sum(colw) <= _W or size <= 5.0:
                break
            size -= 0.5
        row_h = size * 1.55 / 72
        n_head = max(len(h) for h in heads)
        right = numeric_columns(t) if len(t.header) > 2 else [False] * len(t.header)
        gap = 0.12 * size / 8.0

        def header() -> None:
            for k in range(n_head):
                self.y -= row_h
                x = MARGIN
                for j, hd in enumerate(heads):
                    if k < len(hd):
                        self._cell(x, colw[j] - gap, right[j], hd[k], size, fontweight="bold")
                    x += colw[j]
            self.rule(sum(colw), 0.05)
            self.y -= 0.07

        if t.caption:
            self.need(row_h * (n_head + 3) + 0.2)
            self.para(t.caption, 7.5, color=MUTE, gap=0.2)
        self.need(row_h * (n_head + 2))
        header()
        for k, r in enumerate(t.rows):
            if self.y - row_h < MARGIN:
                self.new()
                header()
            self.y -= row_h
            x = MARGIN
            for j, c in enumerate(r[: len(colw)]):
                self._cell(x, colw[j] - gap, right[j], c, size,
                           color=_COLOUR["unsafe"] if k in t.marked else INK)
                x += colw[j]
        self.y -= 0.15

    def _cell(self, x: float, w: float, right: bool, s: str, size: float, **kw: Any) -> None:
        if right:
            self.put(x + w, s, size, ha="right", **kw)
        else:
            self.put(x, s, size, **kw)


def _footer(fig: Any, text: str) -> None:
    fig.text(0.5, 0.3 / PAGE[1], text, ha="center", fontsize=6.5, color="#666666",
             parse_math=False)


def _text_pages(note: Note, pdf: PdfPages) -> int:
    pg = _Pages(pdf, f"{note.subtitle}   ·   {CAUTION}")
    pg.para("DESIGN NOTE · SHEAR VERIFICATION", 8.0, color=MUTE, gap=0.2)
    pg.para(note.title, 16.0, bold=True, gap=0.2)
    pg.para(note.subtitle, 9.0, color=MUTE)
    pg.para(note.verdict.upper(), 13.0, bold=True, color=_COLOUR.get(note.verdict, INK))
    pg.para("Caution. " + CAUTION, 8.5, color="#8a5a00", style="italic")
    for s in note.sections:
        pg.need(1.0)
        pg.y -= 0.15
        pg.para(s.title, 12.0, bold=True, gap=0.0)
        pg.rule()
        pg.y -= 0.1
        for it in s.items:
            if isinstance(it, Table):
                pg.table(it)
            elif it.style == "formula":
                head, _, rest = it.text.partition("\n")  # a block stays on one page
                body = len(_wrap(rest, 7.5, _W, True, False, "    ")) * 7.5 * 1.45 / 72
                pg.para(head, 7.5, mono=True, bold=True, hang="    ", gap=0.0, keep=body)
                pg.para(rest, 7.5, mono=True, hang="    ", gap=1.6)
            elif it.style.startswith("verdict"):
                pg.para(it.text, 10.0, bold=True, color=_COLOUR.get(note.verdict, INK))
            elif it.style in ("finding", "bullet"):
                pg.para("• " + it.text, 8.5, hang="  ")
            elif it.style == "caution":
                pg.para("Caution. " + it.text, 8.5, color="#8a5a00", style="italic")
            elif it.style == "small":
                pg.para(it.text, 7.5, color=MUTE)
            else:
                pg.para(it.text, 9.0)
    pg.flush()
    return pg.count


def _figure_page(pdf: PdfPages, p: Path, caption: str, title: str, footer: str) -> None:
    fig = plt.figure(figsize=PAGE)
    img = (np.clip(mpimg.imread(p), 0.0, 1.0) * 255).round().astype(np.uint8)  # as stored
    h, w = img.shape[:2]
    scale = min(_W / w, (PAGE[1] - 2 * MARGIN - 1.2) / h)
    top = PAGE[1] - MARGIN - 0.45
    ax = fig.add_axes(((PAGE[0] - w * scale) / 2 / PAGE[0], (top - h * scale) / PAGE[1],
                       w * scale / PAGE[0], h * scale / PAGE[1]))
    ax.imshow(img, interpolation="none")  # embedded at its own resolution, not resampled
    ax.set_axis_off()
    fig.text(MARGIN / PAGE[0], (PAGE[1] - MARGIN) / PAGE[1], title, fontsize=12,
             fontweight="bold", va="top", parse_math=False)
    lines = _wrap(caption, 8.5, _W, False, False, "")
    fig.text(MARGIN / PAGE[0], (top - h * scale - 0.2) / PAGE[1], "\n".join(lines),
             fontsize=8.5, va="top", color="#333333", parse_math=False)
    _footer(fig, footer)
    pdf.savefig(fig)
    plt.close(fig)


def write_pdf(note: Note, path: Path) -> int:
    """Write the note as PDF (text pages, then one page per figure); return the page count."""
    path = Path(path)
    tmp = path.with_name(f".{path.name}.part")
    try:
        with PdfPages(tmp, metadata={"Title": f"{note.title} — design note",
                                     "Subject": CAUTION, "Creator": "shearcheck"}) as pdf:
            pages = _text_pages(note, pdf)
            for j, (p, cap) in enumerate(note.figures, start=1):
                pages += 1
                _figure_page(pdf, p, cap, f"Figure {j}",
                             f"{note.subtitle}   ·   {CAUTION}   ·   page {pages}")
        atomic_write(path, tmp.read_bytes())
    finally:
        tmp.unlink(missing_ok=True)
    return pages
