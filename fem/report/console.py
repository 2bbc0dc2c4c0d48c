"""The short console summary of a finished check, printed by `shearcheck run`."""

from __future__ import annotations

__all__ = ["summary_table"]


def _fmt(v: float | None, w: int = 10) -> str:
    return f"{'-':>{w}}" if v is None else f"{v:>{w}.4g}"


def summary_table(d: dict) -> str:
    """A short console summary of results.json content."""
    u = d["units"]
    lines = [f"{d['title']}  ({d['case']}, {d['kind']})"]
    if d["kind"] == "beam":
        lines.append(f"{'x':>8} {'V_fe':>10} {'V_hand':>10} {'tau_fe':>10} {'tau_hand':>10} "
                     f"{'ratio':>7}   [{u['length']}, {u['force']}, {u['stress']}]")
        for c in d["cuts"]:
            lines.append(f"{c['x']:>8g} {_fmt(c['V_fe'])} {_fmt(c['V_hand'])} "
                         f"{_fmt(c['tau_max_fe'])} {_fmt(c['tau_max_hand'])} "
                         f"{_fmt(c['ratio'], 7)}")
    else:
        s = d["section"]
        lines.append(f"tau_max FE {_fmt(s['tau_max_fe'])} {u['stress']}   hand "
                     f"{_fmt(s['tau_max_hand'])}   V/A {_fmt(s['tau_avg_hand'])}   ratio "
                     f"{_fmt(s['ratio'], 7)}")
    c = d.get("convergence") or {}
    if c.get("gci") is not None:
        lines.append(f"convergence: {len(c['sizes'])} levels, GCI {c['gci']:.2%}, "
                     f"observed order {_fmt(c['observed_order'], 5).strip()}")
    df = d.get("deflection") or {}
    if df.get("max_fe") is not None:
        hand = (f", hand {_fmt(df['hand']).strip()} beside FE {_fmt(df['fe_at_hand']).strip()}"
                if df.get("hand") is not None else "")
        lines.append(f"deflection (informative): max |u| {_fmt(df['max_fe']).strip()} "
                     f"{u['length']}{hand}")
    lines.append(f"verdict: {d['verdict'].upper()}")
    for f in d["findings"]:
        if f["kind"] != "excluded":
            lines.append(f"  - [{f['kind']}] {f['message']}")
    n_ex = sum(1 for f in d["findings"] if f["kind"] == "excluded")
    if n_ex:
        lines.append(f"  ({n_ex} boundary-idealisation zones left out of the peaks; "
                     "see results.json)")
    if d.get("pdf_skipped"):
        lines.append(d["pdf_skipped"])
    return "\n".join(lines)
