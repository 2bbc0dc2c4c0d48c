"""The pieces of a design note: paragraphs, tables, sections, and how numbers are printed.

`fem.report.note` fills a `Note` from a finished check; `fem.report.html` and
`fem.report.pdf` render it. Kept apart so that the renderers and the section part of the
note depend on these pieces only, never on each other.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

from fem.report.member_figures import number

__all__ = ["Table", "Block", "Section", "Note", "sci", "numeric_columns"]

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
    """A paragraph; `style` is '', 'bullet', 'formula', 'finding', 'small', 'caution' or
    'verdict-<verdict>'."""

    text: str
    style: str = ""


@dataclass
class Section:
    title: str
    items: list[Block | Table] = field(default_factory=list)


@dataclass
class Note:
    title: str
    subtitle: str
    verdict: str
    sections: list[Section]
    figures: list[tuple[Path, str]]
