"""A document (`fem.report.blocks.Note`) as PDF, typeset with ReportLab's page layout engine.

ReportLab (platypus) flows the note's paragraphs, tables and figures over A4 pages: tables
split across pages with their header row repeated, a heading stays with the first item
under it, a short section (at most `SHORT` of a page) is never split, and a figure stays
with its caption. In a `pair` section the figures go in the rows `figure_rows` decides:
two upright figures side by side at half the width, a wide one across the full width,
each row at most half a page high, so a page holds two rows; a row short of room shrinks
a little to fit the page before it moves on. White borders a figure's canvas leaves
around its drawing are trimmed (`TRIM`) so it fills its width. Every page carries the
title block in its header and the caution and "page N of M" in its footer. The fonts
are the DejaVu faces that matplotlib ships (Greek letters, sub- and superscripts, the
true minus), embedded as subsets.

`write_pdf(note, path)` is the entry point; `fem.report.note.write_report` skips the PDF
with a stated reason where ReportLab cannot be imported.
"""

from __future__ import annotations

import functools
import io
from pathlib import Path
from typing import Any
from xml.sax.saxutils import escape

from PIL import Image  # Pillow: ReportLab's own image library
from reportlab.lib import colors
from reportlab.lib.enums import TA_LEFT, TA_RIGHT
from reportlab.lib.pagesizes import A4
from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm
from reportlab.lib.utils import ImageReader
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont
from reportlab.pdfgen import canvas as rl_canvas
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Flowable,
    Frame,
    HRFlowable,
    KeepTogether,
    PageBreak,
    PageTemplate,
    Paragraph,
    Preformatted,
    Spacer,
    TableStyle,
)
from reportlab.platypus import Table as RLTable
from reportlab.platypus.flowables import BalancedColumns

from fem.report.blocks import (
    Block,
    Figure,
    Note,
    Section,
    Table,
    figure_rows,
    figure_runs,
    numeric_columns,
)
from fem.results import atomic_write

__all__ = ["write_pdf", "MARGIN", "HEADER", "FOOTER"]

MARGIN = 15 * mm      # left, right
HEADER = 27 * mm      # top band: title line and title block
FOOTER = 13 * mm      # bottom band: caution, page N of M
INK = colors.HexColor("#1d2327")
MUTE = colors.HexColor("#5b6770")
RULE = colors.HexColor("#c9d0d5")
SOFT = colors.HexColor("#f1f3f5")
MARK = colors.HexColor("#fbeaea")
VERDICT = {"unsafe": "#a51d2d", "holds": "#26734d", "inconclusive": "#8a5a00",
           "failed": "#a51d2d", "passed": "#26734d"}   # the last two: verification reports
CAUTION_INK = colors.HexColor("#7a4e00")


@functools.lru_cache(maxsize=1)
def _fonts() -> dict[str, str]:
    """Register the DejaVu faces matplotlib ships; fall back to the PDF base fonts."""
    names = {"sans": "Helvetica", "bold": "Helvetica-Bold", "italic": "Helvetica-Oblique",
             "mono": "Courier", "mono-bold": "Courier-Bold"}
    try:
        from matplotlib import get_data_path

        ttf = Path(get_data_path()) / "fonts" / "ttf"
        faces = {"sans": "DejaVuSans.ttf", "bold": "DejaVuSans-Bold.ttf",
                 "italic": "DejaVuSans-Oblique.ttf", "mono": "DejaVuSansMono.ttf",
                 "mono-bold": "DejaVuSansMono-Bold.ttf"}
        for key, file in faces.items():
            name = f"SC-{file.removesuffix('.ttf')}"
            if name not in pdfmetrics.getRegisteredFontNames():
                pdfmetrics.registerFont(TTFont(name, str(ttf / file)))
            names[key] = name
        pdfmetrics.registerFontFamily(names["sans"], normal=names["sans"], bold=names["bold"],
                                      italic=names["italic"], boldItalic=names["bold"])
    except Exception:  # noqa: BLE001 - any missing face: the base fonts still typeset
        pass
    return names


@functools.lru_cache(maxsize=1)
def _styles() -> dict[str, ParagraphStyle]:
    f = _fonts()
    base = ParagraphStyle("body", fontName=f["sans"], fontSize=8.2, leading=10.8,
                          textColor=INK, spaceAfter=4)
    return {
        "body": base,
        "kicker": ParagraphStyle("kicker", base, fontSize=7.5, textColor=MUTE, spaceAfter=1),
        "title": ParagraphStyle("title", base, fontName=f["bold"], fontSize=15, leading=18,
                                spaceAfter=2),
        "sub": ParagraphStyle("sub", base, textColor=MUTE, spaceAfter=5),
        "h2": ParagraphStyle("h2", base, fontName=f["bold"], fontSize=10.5, leading=13,
                             spaceBefore=7, spaceAfter=1, keepWithNext=1),
        "small": ParagraphStyle("small", base, fontSize=7, leading=9, textColor=MUTE),
        "caption": ParagraphStyle("caption", base, fontSize=7.5, leading=9.5, textColor=MUTE,
                                  spaceBefore=2, spaceAfter=8),
        "tcaption": ParagraphStyle("tcaption", base, fontName=f["bold"], fontSize=7.5,
                                   leading=9.5, textColor=MUTE, spaceBefore=3, spaceAfter=2,
                                   keepWithNext=1),
        "finding": ParagraphStyle("finding", base, fontSize=7.6, leading=9.7, leftIndent=9,
                                  bulletIndent=0, spaceAfter=3),
        "bullet": ParagraphStyle("bullet", base, leftIndent=9, bulletIndent=0, spaceAfter=2),
        "caution": ParagraphStyle("caution", base, fontName=f["italic"], fontSize=8,
                                  textColor=CAUTION_INK),
        "cell": ParagraphStyle("cell", base, fontSize=6.9, leading=8.3, spaceAfter=0),
        "cell-r": ParagraphStyle("cell-r", base, fontSize=6.9, leading=8.3, spaceAfter=0,
                                 alignment=TA_RIGHT),
        "head": ParagraphStyle("head", base, fontName=f["bold"], fontSize=6.9, leading=8.3,
                               spaceAfter=0),
        "head-r": ParagraphStyle("head-r", base, fontName=f["bold"], fontSize=7.2,
                                 leading=8.8, spaceAfter=0, alignment=TA_RIGHT),
        "verdict": ParagraphStyle("verdict", base, fontName=f["bold"], fontSize=9,
                                  leading=12, textColor=colors.white, alignment=TA_LEFT,
                                  spaceAfter=0),
        "mono": ParagraphStyle("mono", base, fontName=f["mono"], fontSize=6.5, leading=8.0,
                               spaceAfter=6),
        "code": ParagraphStyle("code", base, fontName=f["mono"], fontSize=5.5, leading=6.6,
                               spaceAfter=4),
        "mono-head": ParagraphStyle("mono-head", base, fontName=f["mono-bold"], fontSize=6.5,
                                    leading=8.0, spaceAfter=0, keepWithNext=1),
    }


def _p(text: str, style: str) -> Paragraph:
    return Paragraph(escape(text).replace("\n", "<br/>"), _styles()[style])


def _pre(text: str, style: str, width: float) -> Preformatted:
    st = _styles()[style]
    per_line = max(20, int(width / (0.602 * st.fontSize)))  # DejaVu Sans Mono advance
    return Preformatted(text, st, maxLineLength=per_line, newLineChars="    ")


# ------------------------------------------------------------------------------ tables

def _col_widths(t: Table, width: float, font: str, size: float) -> list[float]:
    """Natural widths of the cells, the widest columns capped so the table fits `width`."""
    pad = 12.0   # cell padding (3 + 3) and a margin for the line breaker
    n = len(t.header)
    nat = []
    for j in range(n):
        cells = [r[j] for r in t.rows if j < len(r)]
        body = max([pdfmetrics.stringWidth(c, font, size) for c in cells] or [0.0])
        word = max([pdfmetrics.stringWidth(w, _fonts()["bold"], size)
                    for w in t.header[j].split()] or [0.0])
        nat.append(max(body, word) + pad)   # a header wraps between words, never inside
    if n == 2:  # an item / value list: the value column takes the rest of the line
        first = min(nat[0], 0.34 * width)
        return [first, width - first]
    if sum(nat) <= width:
        return nat
    lo, hi = 0.0, max(nat)
    for _ in range(40):  # the cap c with sum(min(nat, c)) = width
        c = 0.5 * (lo + hi)
        lo, hi = (c, hi) if sum(min(w, c) for w in nat) < width else (lo, c)
    return [min(w, lo) for w in nat]


def _table(t: Table, width: float) -> list[Flowable]:
    st = _styles()
    kv = len(t.header) == 2
    right = [not kv and c for c in numeric_columns(t)]
    widths = _col_widths(t, width, _fonts()["sans"], st["cell"].fontSize)
    head = [Paragraph(escape(h), st["head-r" if right[j] else "head"])
            for j, h in enumerate(t.header)]
    rows = [head] + [[Paragraph(escape(c), st["cell-r" if j < len(right) and right[j]
                                            else "cell"]) for j, c in enumerate(r)]
                     for r in t.rows]
    tbl = RLTable(rows, colWidths=widths, repeatRows=1, hAlign="LEFT")
    cmds: list[tuple[Any, ...]] = [
        ("BACKGROUND", (0, 0), (-1, 0), SOFT),
        ("LINEBELOW", (0, 0), (-1, 0), 0.6, MUTE),
        ("LINEBELOW", (0, 1), (-1, -1), 0.3, RULE),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("TOPPADDING", (0, 0), (-1, -1), 1.6),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 1.8),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
    ]
    cmds += [("BACKGROUND", (0, k + 1), (-1, k + 1), MARK) for k in sorted(t.marked)]
    tbl.setStyle(TableStyle(cmds))
    out: list[Flowable] = []
    if t.caption:
        out.append(_p(t.caption, "tcaption"))
    out += [tbl, Spacer(1, 5)]
    return out


# ------------------------------------------------------------------------------ blocks

def _verdict(text: str, verdict: str, width: float) -> Flowable:
    tbl = RLTable([[_p(text, "verdict")]], colWidths=[width])
    tbl.setStyle(TableStyle([
        ("BACKGROUND", (0, 0), (-1, -1), colors.HexColor(VERDICT.get(verdict, "#444444"))),
        ("LEFTPADDING", (0, 0), (-1, -1), 8), ("RIGHTPADDING", (0, 0), (-1, -1), 8),
        ("TOPPADDING", (0, 0), (-1, -1), 5), ("BOTTOMPADDING", (0, 0), (-1, -1), 6)]))
    return KeepTogether([tbl, Spacer(1, 5)])


def _block(b: Block, width: float) -> list[Flowable]:
    if b.style == "formula":
        head, _, rest = b.text.partition("\n")
        return [_pre(head, "mono-head", width), _pre(rest, "mono", width)]
    if b.style == "code":  # verbatim text in balanced columns
        n = 4   # long lines wrap within their column (Preformatted's maxLineLength)
        col = width / n - 8
        return [BalancedColumns([_pre(b.text, "code", col)], nCols=n, spaceBefore=2,
                                innerPadding=8)]
    if b.style == "finding":
        kind, _, msg = b.text.partition(": ")
        return [Paragraph(f"<b>{escape(kind)}</b> — {escape(msg)}", _styles()["finding"],
                          bulletText="•")]
    if b.style == "bullet":
        return [Paragraph(escape(b.text), _styles()["bullet"], bulletText="•")]
    if b.style == "caution":
        return [Paragraph(f"<b>Caution.</b> {escape(b.text)}", _styles()["caution"])]
    if b.style.startswith("verdict-"):
        return [_verdict(b.text, b.style.removeprefix("verdict-"), width)]
    return [_p(b.text, "small" if b.style == "small" else "body")]


TRIM = 0.9   # a figure whose drawing spans less of its canvas's width or height is trimmed


def _trimmed(path: Path) -> ImageReader:
    """The figure's image; where the drawing leaves a white border wider than `TRIM`
    says (an equal-aspect plot on a fixed canvas), without it but for a small margin,
    so the figure fills the width it is given. Others are embedded whole."""
    im = Image.open(path)
    if im.mode != "RGB":
        im = im.convert("RGBA")
        alpha = im.getchannel("A")
        if alpha.getextrema()[0] < 255:   # see-through parts: on white paper
            flat = Image.new("RGB", im.size, (255, 255, 255))
            flat.paste(im, mask=alpha)
            im = flat
        else:
            im = im.convert("RGB")
    k = 4   # the border found on a quarter-size copy, to a few pixels
    ink = im.reduce(k).convert("L").point(lambda v: 255 if v < 245 else 0).getbbox()
    box = None if ink is None else (k * ink[0], k * ink[1], min(im.width, k * ink[2]),
                                    min(im.height, k * ink[3]))
    if box is None or (box[2] - box[0] > TRIM * im.width and box[3] - box[1] > TRIM * im.height):
        return ImageReader(im)   # the decoded image: ReportLab need not decode it again
    pad = max(4, round(0.012 * max(im.size)))
    x0, y0, x1, y1 = box
    return ImageReader(im.crop((max(0, x0 - pad), max(0, y0 - pad), min(im.width, x1 + pad),
                                min(im.height, y1 + pad))))


class _FigureBlock(Flowable):
    """A figure and its caption as one piece: the image as large as `max_h` allows, shrunk
    to the room left on the page down to `min_h`; below that it goes whole to the next page
    (a figure is never parted from its caption)."""

    GAP = 3.0

    def __init__(self, path: Path, caption: Paragraph, max_h: float, min_h: float) -> None:
        super().__init__()
        self.image = _trimmed(path)
        self.iw, self.ih = self.image.getSize()
        self.caption, self.max_h, self.min_h = caption, max_h, min_h
        self.w = self.h = self.cap_h = 0.0

    def _fit(self, avail_w: float, h: float) -> float:
        scale = min(avail_w / self.iw, h / self.ih)
        self.w, self.h = self.iw * scale, self.ih * scale
        self.cap_h = self.caption.wrap(avail_w, 1e6)[1]
        return self.h + self.GAP + self.cap_h + self.caption.style.spaceAfter

    def wrap(self, avail_w: float, avail_h: float) -> tuple[float, float]:
        self.avail_w = avail_w
        need = self._fit(avail_w, self.max_h)
        if need > avail_h:
            extra = self.GAP + self.cap_h + self.caption.style.spaceAfter
            if avail_h - extra >= self.min_h:
                need = self._fit(avail_w, min(self.max_h, avail_h - extra))
        return avail_w, need

    def split(self, avail_w: float, avail_h: float) -> list[Flowable]:
        return []   # whole on the next page

    def draw(self) -> None:
        total = self.h + self.GAP + self.cap_h + self.caption.style.spaceAfter
        x = 0.5 * (self.avail_w - self.w)
        self.canv.drawImage(self.image, x, total - self.h, self.w, self.h)
        self.caption.drawOn(self.canv, 0, self.caption.style.spaceAfter)


def _figure(f: Figure, number: int, width: float, max_h: float, min_h: float) -> Flowable:
    return _FigureBlock(f.path, _p(f"Figure {number}. {f.caption}", "caption"), max_h, min_h)


class _FigureRow(Flowable):
    """One row of a `pair` section: one figure at the full width, or two side by side at
    half the width each, every image with its own caption under it (the captions start at
    one level, under the taller image). The row is at most `max_h` high, so two rows fill
    a page; short of room it shrinks to `min_scale` of that size, below that it goes whole
    to the next page."""

    GAP = 3.0        # image to caption
    GUTTER = 5 * mm  # between the two figures of a row

    def __init__(self, figs: list[tuple[Path, Paragraph]], max_h: float,
                 min_scale: float = 0.7) -> None:
        super().__init__()
        self.figs = [(img, cap, *img.getSize()) for img, cap in
                     ((_trimmed(p), cap) for p, cap in figs)]
        self.max_h, self.min_scale = max_h, min_scale
        self.sizes: list[tuple[float, float]] = []
        self.col_w = self.cap_h = 0.0
        self.avail_w = 0.0

    def _extra(self) -> float:
        return self.GAP + self.cap_h + self.figs[0][1].style.spaceAfter

    def _layout(self, avail_w: float, img_h: float) -> float:
        n = len(self.figs)
        self.col_w = (avail_w - self.GUTTER * (n - 1)) / n
        self.cap_h = max(cap.wrap(self.col_w, 1e6)[1] for _, cap, _, _ in self.figs)
        self.sizes = []
        for _, _, iw, ih in self.figs:
            scale = min(self.col_w / iw, img_h / ih)
            self.sizes.append((iw * scale, ih * scale))
        return max(h for _, h in self.sizes) + self._extra()

    def wrap(self, avail_w: float, avail_h: float) -> tuple[float, float]:
        self.avail_w = avail_w
        self._layout(avail_w, 1e6)
        need = self._layout(avail_w, self.max_h - self._extra())
        if need > avail_h:
            tallest = max(h for _, h in self.sizes)
            room = avail_h - self._extra()
            if room >= self.min_scale * tallest:
                need = self._layout(avail_w, room)
        return avail_w, need

    def split(self, avail_w: float, avail_h: float) -> list[Flowable]:
        return []   # whole on the next page

    def draw(self) -> None:
        tallest = max(h for _, h in self.sizes)
        total = tallest + self._extra()
        for k, ((img, cap, _, _), (w, h)) in enumerate(zip(self.figs, self.sizes,
                                                          strict=True)):
            x0 = k * (self.col_w + self.GUTTER)
            width = self.col_w if len(self.figs) > 1 else self.avail_w
            self.canv.drawImage(img, x0 + 0.5 * (width - w), total - tallest, w, h)
            cap.wrap(width, 1e6)
            cap.drawOn(self.canv, x0, total - tallest - self.GAP - cap.height)


# ------------------------------------------------------------------------------- pages

class _Layout:
    """Page geometry and the header/footer drawn on every page."""

    def __init__(self, note: Note) -> None:
        self.note = note
        self.page_w, self.page_h = A4
        self.width = self.page_w - 2 * MARGIN
        self.height = self.page_h - HEADER - FOOTER - 6 * mm
        self.frame_h = self.page_h - HEADER - FOOTER - 4 * mm   # the body frame's height

    def header(self, c: rl_canvas.Canvas) -> None:
        f, note = _fonts(), self.note
        top = self.page_h - 9 * mm
        c.saveState()
        c.setFillColor(INK)
        c.setFont(f["bold"], 8.5)
        c.drawString(MARGIN, top, _fit(note.title, f["bold"], 8.5, 0.68 * self.width))
        c.setFont(f["sans"], 7)
        c.setFillColor(MUTE)
        c.drawRightString(self.page_w - MARGIN, top, note.kicker)
        pairs = note.title_block
        if pairs:
            cols = 4
            cw = self.width / cols
            rows = (len(pairs) + cols - 1) // cols
            y0 = top - 4 * mm
            rh = 6.6 * mm
            c.setStrokeColor(RULE)
            c.setLineWidth(0.5)
            for k, (label, value) in enumerate(pairs):
                r, q = divmod(k, cols)
                x, y = MARGIN + q * cw, y0 - (r + 1) * rh
                c.rect(x, y, cw, rh, stroke=1, fill=0)
                c.setFillColor(MUTE)
                c.setFont(f["sans"], 5.6)
                c.drawString(x + 2.2, y + rh - 7.2, label.upper())
                c.setFillColor(INK)
                c.setFont(f["sans"], 7.6)
                c.drawString(x + 2.2, y + 3.2, _fit(value, f["sans"], 7.6, cw - 5))
            for k in range(len(pairs), rows * cols):  # blank cells keep the grid
                r, q = divmod(k, cols)
                c.rect(MARGIN + q * cw, y0 - (r + 1) * rh, cw, rh, stroke=1, fill=0)
        c.restoreState()

    def footer(self, c: rl_canvas.Canvas, page: int, pages: int) -> None:
        f = _fonts()
        c.saveState()
        c.setStrokeColor(RULE)
        c.setLineWidth(0.5)
        y = FOOTER
        c.line(MARGIN, y, self.page_w - MARGIN, y)
        c.setFont(f["italic"], 6.4)
        c.setFillColor(CAUTION_INK)
        c.drawString(MARGIN, y - 9, _fit(self.note.caution, f["italic"], 6.4,
                                         self.width - 60))
        c.setFont(f["sans"], 7)
        c.setFillColor(INK)
        c.drawRightString(self.page_w - MARGIN, y - 9, f"page {page} of {pages}")
        c.setFont(f["sans"], 6.2)
        c.setFillColor(MUTE)
        c.drawString(MARGIN, y - 18, _fit(self.note.subtitle, f["sans"], 6.2, self.width))
        c.restoreState()


def _fit(text: str, font: str, size: float, width: float) -> str:
    """`text` on one line within `width` points, shortened with an ellipsis if need be."""
    text = " ".join(text.split())
    if pdfmetrics.stringWidth(text, font, size) <= width:
        return text
    while text and pdfmetrics.stringWidth(text + "…", font, size) > width:
        text = text[:-1]
    return text.rstrip() + "…"


def _canvas_class(layout: _Layout, count: list[int]) -> type:
    """A canvas that holds its pages back until the end, to write "page N of M"."""

    class _Numbered(rl_canvas.Canvas):
        def __init__(self, *args: Any, **kwargs: Any) -> None:
            super().__init__(*args, **kwargs)
            self._held: list[dict[str, Any]] = []

        def showPage(self) -> None:  # noqa: N802 - ReportLab's name
            self._held.append(dict(self.__dict__))
            self._startPage()

        def save(self) -> None:
            count[0] = len(self._held)
            for k, state in enumerate(self._held, start=1):
                self.__dict__.update(state)
                layout.footer(self, k, count[0])
                super().showPage()
            super().save()

    return _Numbered


SHORT = 0.2   # a section at most this part of a page high is never split over two pages


class _Together(KeepTogether):
    """ReportLab's KeepTogether (a heading with what follows it), measured as placed:
    each item gets the height left under those above it, so a figure row that would
    shrink to fit the rest of the page is measured shrunk, not at its full size. (Our
    documents generate no content while wrapping, so the frame copy ReportLab's own
    measure makes for that is not needed.)"""

    def wrap(self, avail_w: float, avail_h: float) -> tuple[float, float]:
        used = first = 0.0
        for k, f in enumerate(self._content):
            if k:
                used += f.getSpaceBefore()
            h = f.wrapOn(self.canv, avail_w, max(avail_h - used, 0.0))[1]
            first = first if k else h
            used += h + f.getSpaceAfter()
        self._H, self._H0, self._wrapInfo = used, first, (avail_w, avail_h)
        return avail_w, 0xffffff   # as KeepTogether: always asked to split


class _KeepShort(_Together):
    """Its flowables kept on one page when together they are at most `limit` high (they
    move to the next page whole); a taller group flows and splits as if loose."""

    def __init__(self, flowables: list[Flowable], limit: float) -> None:
        super().__init__(flowables)
        self._limit = limit

    def split(self, avail_w: float, avail_h: float) -> list[Flowable]:
        if getattr(self, "_wrapInfo", None) != (avail_w, avail_h):
            self.wrap(avail_w, avail_h)
        if self._H > self._limit:   # loose; led by a no-op so that ReportLab still keeps
            return [self.NullActionFlowable(), *self._content]   # the heading with the next
        return super().split(avail_w, avail_h)


def _story(note: Note, lay: _Layout) -> list[Flowable]:
    st = _styles()
    story: list[Flowable] = [_p(note.kicker.upper(), "kicker"), _p(note.title, "title"),
                             _p(note.subtitle, "sub")]
    if note.remarks:
        story.append(_p(note.remarks, "body"))
    number = 0
    for k, s in enumerate(note.sections):
        if s.new_page and k > 0:
            story.append(PageBreak())
        elif k > 0:
            story.append(CondPageBreak(15 * mm))
        rule = HRFlowable(width="100%", thickness=0.6, color=MUTE, spaceAfter=4)
        rule.keepWithNext = 1   # the heading stays with the first item under it
        part = [Paragraph(escape(s.title), st["h2"]), rule, *_items(s, lay, number)]
        story.append(_KeepShort(part, SHORT * lay.frame_h))
        number += sum(isinstance(it, Figure) for it in s.items)
    return story


def _items(s: Section, lay: _Layout, first: int) -> list[Flowable]:
    out: list[Flowable] = []
    number = first
    for it in figure_runs(s.items, s.pair):
        if isinstance(it, list):   # consecutive figures of a pair section, set out in rows
            out += _rows(it, number, lay)
            number += len(it)
        elif isinstance(it, Figure):
            number += 1
            out.append(_figure(it, number, lay.width, 0.38 * lay.height, 0.22 * lay.height))
        elif isinstance(it, Table):
            out += _table(it, lay.width)
        else:
            out += _block(it, lay.width)
    return out


def _rows(figs: list[Figure], first: int, lay: _Layout) -> list[Flowable]:
    """Consecutive figures of a `pair` section in rows of `figure_rows`, two rows a page."""
    row_h = 0.5 * lay.frame_h - 1.0
    out: list[Flowable] = []
    for row in figure_rows([f.aspect for f in figs]):
        out.append(_FigureRow([(figs[k].path,
                                _p(f"Figure {first + k + 1}. {figs[k].caption}", "caption"))
                               for k in row], row_h))
    return out


def write_pdf(note: Note, path: Path) -> int:
    """Typeset `note` as an A4 PDF at `path` (written atomically); return the page count."""
    from reportlab import rl_config

    # figures as binary (Flate) image streams: ASCII85 text encoding took 4 of the demo's
    # 5 s of typesetting (7 figures, measured with cProfile) and makes the file larger
    rl_config.useA85 = 0
    lay = _Layout(note)
    buf = io.BytesIO()
    doc = BaseDocTemplate(buf, pagesize=A4, leftMargin=MARGIN, rightMargin=MARGIN,
                          topMargin=HEADER, bottomMargin=FOOTER + 4 * mm,
                          title=note.title, subject=note.caution, creator="shearcheck",
                          author="", producer="shearcheck (ReportLab)")
    frame = Frame(MARGIN, FOOTER + 4 * mm, lay.width, lay.frame_h,
                  leftPadding=0, rightPadding=0, topPadding=0, bottomPadding=0, id="body")
    doc.keepTogetherClass = _Together   # what a heading's keepWithNext makes
    doc.addPageTemplates([PageTemplate(id="page", frames=[frame],
                                       onPage=lambda c, _d: lay.header(c))])
    count = [0]
    doc.build(_story(note, lay), canvasmaker=_canvas_class(lay, count))
    atomic_write(Path(path), buf.getvalue())
    return count[0]
