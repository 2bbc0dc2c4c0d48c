"""A document (`fem.report.blocks.Note`) as one self-contained HTML page.

Styles are inline in one <style> element, figures are PNG data URIs, the font is the
reader's system sans-serif: the file opens anywhere, offline, and can be mailed or
archived on its own. Internal links (#section) only; no script, no external resource.
"""

from __future__ import annotations

import base64
import html
from pathlib import Path

from fem.report.blocks import (
    Block,
    Figure,
    Note,
    Table,
    figure_rows,
    figure_runs,
    numeric_columns,
)

__all__ = ["render_html", "title_block_html", "CSS"]

CSS = """
:root{--ink:#1d2327;--mute:#5b6770;--rule:#d9dee2;--soft:#f4f6f7;--accent:#2a5d84}
*{box-sizing:border-box}
body{margin:0;background:#fff;color:var(--ink);font:15px/1.55 system-ui,-apple-system,
"Segoe UI",Roboto,"Helvetica Neue",Arial,sans-serif}
main{max-width:1040px;margin:0 auto;padding:40px 32px 64px}
header{border-bottom:3px solid var(--ink);padding-bottom:16px;margin-bottom:20px}
.kicker{text-transform:uppercase;letter-spacing:.12em;font-size:12px;color:var(--mute);margin:0}
h1{font-size:30px;line-height:1.2;margin:6px 0 4px}
.sub{color:var(--mute);margin:0 0 12px}
.badge{display:inline-block;font-weight:700;letter-spacing:.08em;padding:4px 14px;
border-radius:4px;color:#fff}
.verdict-unsafe{background:#a51d2d}.verdict-holds{background:#26734d}
.verdict-inconclusive{background:#8a5a00}
.verdict-failed{background:#a51d2d}.verdict-passed{background:#26734d}
p.verdict-unsafe,p.verdict-holds,p.verdict-inconclusive{color:#fff;padding:12px 16px;
border-radius:6px;font-size:16px}
.caution{border-left:4px solid #c77700;background:#fff6e5;padding:10px 14px;margin:16px 0;
font-size:14px}
nav{font-size:14px;margin:8px 0 24px;line-height:2}
nav a{color:var(--accent);text-decoration:none;margin-right:16px;white-space:nowrap}
h2{font-size:21px;margin:40px 0 12px;padding-bottom:4px;border-bottom:1px solid var(--rule)}
.finding{border-left:3px solid #a51d2d;padding:4px 0 4px 12px;margin:10px 0}
.finding b{font-variant:small-caps;letter-spacing:.03em}
.small{font-size:13px;color:var(--mute)}
ul{padding-left:22px}li{margin:4px 0}
pre.formula{font:13px/1.65 ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;
background:var(--soft);border:1px solid var(--rule);border-radius:6px;padding:10px 14px;
white-space:pre-wrap;margin:10px 0}
.scroll{overflow-x:auto;margin:8px 0 18px}
table{border-collapse:collapse;font-size:13px;font-variant-numeric:tabular-nums;min-width:66%}
caption{caption-side:top;text-align:left;font-weight:600;color:var(--mute);padding:0 0 6px}
th,td{padding:5px 9px;border-bottom:1px solid var(--rule);vertical-align:top}
th{background:var(--soft);text-align:left;font-weight:600}
td.num{text-align:right;white-space:nowrap}th.num{text-align:right}
table.kv td:first-child{width:30%;color:var(--mute)}
tr.mark td{background:#fbeaea}
figure{margin:18px 0 30px}
figure img{display:block;max-width:100%;height:auto;margin:0 auto;border:1px solid var(--rule)}
figcaption{font-size:13px;color:var(--mute);margin-top:6px}
.pair{display:grid;grid-template-columns:1fr 1fr;gap:24px;align-items:start}
@media (max-width:700px){.pair{grid-template-columns:1fr}}
table.tb{width:100%;min-width:0;margin:0 0 14px;font-size:13px}
table.tb td{border:1px solid var(--rule);padding:4px 8px;width:25%}
table.tb .k{display:block;font-size:10px;text-transform:uppercase;letter-spacing:.08em;
color:var(--mute)}
table.tb .v{display:block;min-height:1.3em}
p.remarks{white-space:pre-wrap;font-size:14px;margin:4px 0 14px}
pre.code{font:12px/1.5 ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;
background:var(--soft);border:1px solid var(--rule);border-radius:6px;padding:10px 14px;
white-space:pre-wrap;overflow-wrap:anywhere}
footer{margin-top:40px;border-top:1px solid var(--rule);padding-top:12px;font-size:13px;
color:var(--mute)}
@media print{main{padding:0}h2{break-after:avoid}figure,tr{break-inside:avoid}}
"""

def _anchor(title: str) -> str:
    return "".join(ch if ch.isalnum() else "-" for ch in title.lower()).strip("-")


def _table(t: Table) -> str:
    e = html.escape
    kv = len(t.header) == 2  # an item/value list reads best left-aligned
    num = [not kv and c for c in numeric_columns(t)]
    cls = ' class="kv"' if kv else ""
    out = [f'<div class="scroll"><table{cls}>']
    if t.caption:
        out.append(f"<caption>{e(t.caption)}</caption>")
    out.append("<thead><tr>" + "".join(f'<th class="num">{e(h)}</th>' if num[j] else
                                        f"<th>{e(h)}</th>" for j, h in enumerate(t.header))
               + "</tr></thead><tbody>")
    for k, row in enumerate(t.rows):
        cells = "".join(f'<td class="num">{e(c)}</td>' if j < len(num) and num[j] else
                        f"<td>{e(c)}</td>" for j, c in enumerate(row))
        out.append(f'<tr class="mark">{cells}</tr>' if k in t.marked else f"<tr>{cells}</tr>")
    out.append("</tbody></table></div>")
    return "\n".join(out)


def _block(b: Block) -> str:
    e = html.escape
    if b.style == "formula":  # the first line names what follows
        head, _, rest = b.text.partition("\n")
        return f'<pre class="formula"><b>{e(head)}</b>\n{e(rest)}</pre>'
    if b.style == "code":
        return f'<pre class="code">{e(b.text)}</pre>'
    if b.style == "finding":
        kind, _, msg = b.text.partition(": ")
        return f'<p class="finding"><b>{e(kind)}</b> — {e(msg)}</p>'
    if b.style == "caution":
        return f'<p class="caution"><b>Caution.</b> {e(b.text)}</p>'
    cls = f' class="{e(b.style)}"' if b.style else ""
    return f"<p{cls}>{e(b.text)}</p>"


def _figure(f: Figure, number: int) -> str:
    e = html.escape
    return (f'<figure><img src="{_data_uri(f.path)}" alt="{e(f.caption)}">'
            f"<figcaption>Figure {number}. {e(f.caption)}</figcaption></figure>")


def _items(items: list[Block | Table | Figure], count: list[int],
           pair: bool = False) -> list[str]:
    out: list[str] = []
    bullets: list[str] = []
    for it in [*figure_runs(items, pair), None]:
        if isinstance(it, Block) and it.style == "bullet":
            bullets.append(f"<li>{html.escape(it.text)}</li>")
            continue
        if bullets:
            out.append("<ul>" + "".join(bullets) + "</ul>")
            bullets = []
        if it is None:
            continue
        if isinstance(it, list):   # consecutive figures of a pair section
            out += _rows(it, count)
        elif isinstance(it, Figure):
            count[0] += 1
            out.append(_figure(it, count[0]))
        else:
            out.append(_table(it) if isinstance(it, Table) else _block(it))
    return out


def _rows(figs: list[Figure], count: list[int]) -> list[str]:
    """Figures in the rows of `figure_rows`: two side by side in a two-column grid."""
    out = []
    for row in figure_rows([f.aspect for f in figs]):
        cells = []
        for k in row:
            count[0] += 1
            cells.append(_figure(figs[k], count[0]))
        out.append(cells[0] if len(cells) == 1 else
                   '<div class="pair">' + "".join(cells) + "</div>")
    return out


def _data_uri(p: Path) -> str:
    return "data:image/png;base64," + base64.b64encode(Path(p).read_bytes()).decode("ascii")


def title_block_html(pairs: list[tuple[str, str]]) -> str:
    """The title block as a grid of four columns: label above value, blanks kept blank."""
    e = html.escape
    cells = [f'<td><span class="k">{e(k)}</span><span class="v">{e(v)}</span></td>'
             for k, v in pairs]
    cells += ["<td></td>"] * (-len(cells) % 4)
    rows = ["<tr>" + "".join(cells[i:i + 4]) + "</tr>" for i in range(0, len(cells), 4)]
    return '<table class="tb"><tbody>' + "".join(rows) + "</tbody></table>"


def render_html(note: Note) -> str:
    """The page's text: header with the title block, contents, then every section."""
    e = html.escape
    body = ['<header><p class="kicker">' + e(note.kicker) + "</p>"
            f'<h1>{e(note.title)}</h1><p class="sub">{e(note.subtitle)}</p>']
    if note.title_block:
        body.append(title_block_html(note.title_block))
    if note.remarks:
        body.append(f'<p class="remarks">{e(note.remarks)}</p>')
    if note.verdict:
        body.append(f'<span class="badge verdict-{e(note.verdict)}">'
                    f"{e(note.verdict.upper())}</span>")
    body.append("</header>")
    if note.caution:
        body.append(f'<aside class="caution"><b>Caution.</b> {e(note.caution)}</aside>')
    body.append("<nav>" + "".join(f'<a href="#{_anchor(s.title)}">{e(s.title)}</a>'
                                  for s in note.sections) + "</nav>")
    count = [0]
    for s in note.sections:
        body.append(f'<section id="{_anchor(s.title)}"><h2>{e(s.title)}</h2>')
        body += _items(s.items, count, s.pair)
        body.append("</section>")
    body.append(f"<footer>{e(note.subtitle)}." + (f" {e(note.caution)}" if note.caution
                                                  else "") + "</footer>")
    return ("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
            "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
            f"<title>{e(note.title)} — {e(note.kicker.split(' · ')[0].lower())}</title>\n"
            f"<style>{CSS}</style>\n</head>\n"
            "<body>\n<main>\n" + "\n".join(body) + "\n</main>\n</body>\n</html>\n")
