"""The pieces of a document: paragraphs, tables, figures, sections, the note itself.

A `Note` is any document shearcheck writes (the design note of a check, a verification
report, ...): a title, a title block, sections of `Block`, `Table` and `Figure` items.
`fem.report.html.render_html` and `fem.report.pdf.write_pdf` render the same `Note`, so
both documents always carry the same content; neither knows what a check is.
`fem.report.note` fills a `Note` from a finished check.

`figure_rows` is the one layout decision both renderers share: in a `pair` section, two
consecutive figures that are each not much wider than tall sit side by side in one row.
"""

from __future__ import annotations

import math
import struct
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path

from fem.report.member_figures import number

__all__ = ["Table", "Block", "Figure", "Section", "Note", "sci", "numeric_columns",
           "png_size", "figure_rows", "figure_runs", "SIDE_BY_SIDE"]

_SUP = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


def sci(v: float | None, digits: int = 4, ref: float = 0.0) -> str:
    """A number for a document: plain between 1e-3 and 1e6, else 1.234×10⁷.

    Values below 1e-9 × |ref| (round-off beside a quantity of size `ref`) print as 0.
    """
    if v is None or not math.isfinite(v):
        return "–"
    if abs(v) < 1e-9 * abs(ref):
        v = 0.0
    if v == 0 or 1e-3 <= abs(v) < 1e6:
        t = number(v, digits)
        t = t.rstrip("0").rstrip(".") if "." in t else t
        return t.replace("-", "−")
    m, e = f"{v:.{digits - 1}e}".split("e")
    return f"{m.replace('-', '−')}×10{str(int(e)).translate(_SUP)}"


@dataclass
class Table:
    header: list[str]
    rows: list[list[str]]
    caption: str = ""
    marked: set[int] = field(default_factory=set)   # rows to highlight


_NUMERIC = set("0123456789.−-+×⁰¹²³⁴⁵⁶⁷⁸⁹⁻%–, ()[]")


def numeric_columns(t: Table) -> list[bool]:
    """Which columns hold numbers only (to be right-aligned); blanks and dashes allowed."""
    def num(c: str) -> bool:
        return c in ("", "–") or (any(ch.isdigit() for ch in c) and set(c) <= _NUMERIC)

    return [any(j < len(r) and r[j] not in ("", "–") for r in t.rows)
            and all(num(r[j]) for r in t.rows if j < len(r)) for j in range(len(t.header))]


@dataclass
class Block:
    """A paragraph; `style` is '', 'bullet', 'formula' (first line names what follows),
    'code' (verbatim, monospace), 'finding' ('kind: message'), 'small', 'caution' or
    'verdict-<verdict>'."""

    text: str
    style: str = ""


@dataclass
class Figure:
    """A PNG with its caption; numbered in order of appearance by the renderers."""

    path: Path
    caption: str

    @property
    def aspect(self) -> float:
        """Width over height of the image."""
        w, h = png_size(self.path)
        return w / h


def png_size(path: Path) -> tuple[int, int]:
    """(width, height) in pixels of a PNG, read from its header (IHDR, the first chunk)."""
    with open(path, "rb") as f:
        head = f.read(24)
    if head[:8] != b"\x89PNG\r\n\x1a\n" or head[12:16] != b"IHDR":
        raise ValueError(f"{Path(path).name} is not a PNG file")
    w, h = struct.unpack(">II", head[16:24])
    return w, h


SIDE_BY_SIDE = 1.3   # a figure at most this much wider than tall can go beside another


def figure_rows(aspects: Sequence[float], limit: float = SIDE_BY_SIDE) -> list[list[int]]:
    """Rows of figures from their width/height ratios, in order: two consecutive figures
    that are each at most `limit` wide per unit height share a row (side by side, each at
    half the width); any other figure has a row of its own (the full width). Taken
    greedily from the first, so the note's figure order decides the pairs."""
    rows: list[list[int]] = []
    k = 0
    while k < len(aspects):
        if k + 1 < len(aspects) and aspects[k] <= limit and aspects[k + 1] <= limit:
            rows.append([k, k + 1])
            k += 2
        else:
            rows.append([k])
            k += 1
    return rows


def figure_runs(items: Sequence[Block | Table | Figure],
                pair: bool) -> list[Block | Table | Figure | list[Figure]]:
    """The items of a section as the renderers take them: in a `pair` section each run of
    consecutive figures gathered in one list (to be set out in `figure_rows`)."""
    out: list[Block | Table | Figure | list[Figure]] = []
    for it in items:
        if not (pair and isinstance(it, Figure)):
            out.append(it)
        elif out and isinstance(out[-1], list):
            out[-1].append(it)
        else:
            out.append([it])
    return out


@dataclass
class Section:
    """A titled part; `new_page` starts it on a new page in print (PDF); in a `pair`
    section consecutive figures go in rows (`figure_rows`), two rows to a printed page."""

    title: str
    items: list[Block | Table | Figure] = field(default_factory=list)
    new_page: bool = False
    pair: bool = False


@dataclass
class Note:
    """A document: its title, a title block and the sections in order.

    `title_block` is (label, value) pairs shown on the first HTML page and in every PDF
    page header (a blank value stays blank); `remarks` is shown under it on the first
    page only; `verdict` ('holds', 'unsafe', 'inconclusive' or '' for none) colours the
    badge; `caution` goes in the header of the HTML and the footer of every PDF page.
    """

    title: str
    subtitle: str
    sections: list[Section]
    verdict: str = ""
    title_block: list[tuple[str, str]] = field(default_factory=list)
    remarks: str = ""
    kicker: str = "Design note · shear verification"
    caution: str = ""

    @property
    def figures(self) -> list[Figure]:
        """Every figure of the note, in order."""
        return [it for s in self.sections for it in s.items if isinstance(it, Figure)]
