"""`shearcheck show` speed: the preview of every bundled case against one solved level.

For each case in cases/, in one process with the imports already loaded: the wall and CPU
time of `fem.report.model_figure.preview` (load the case, mesh the first level, draw
model.png) and of `fem.api.check` at one level (mesh, solve, compare: what `show` spares),
and their ratio. CPU time is the steadier figure when other work shares the machine.

    python bench/bench_show.py [--no-solve]
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from fem.api import check  # noqa: E402
from fem.case.parse import load_case  # noqa: E402
from fem.report.model_figure import preview  # noqa: E402

CASES = Path(__file__).resolve().parents[1] / "cases"


def timed(fn):
    w, c = time.perf_counter(), time.process_time()
    fn()
    return time.perf_counter() - w, time.process_time() - c


def main() -> None:
    solve = "--no-solve" not in sys.argv
    out = Path(tempfile.mkdtemp())
    first = sorted(CASES.glob("*.toml"))[0]
    preview(load_case(first), out / "warm")    # fonts, caches: not part of any figure
    print(f"{'case':32s} {'show wall':>9s} {'show cpu':>9s} {'1-level cpu':>11s} {'ratio':>6s}")
    rows = []
    for f in sorted(CASES.glob("*.toml")):
        case = load_case(f)
        w, c = timed(lambda case=case, f=f: preview(load_case(f), out / case.name))
        if solve:
            _, sc = timed(lambda case=case: check(case.with_mesh(levels=1)))
        else:
            sc = float("nan")
        rows.append((w, c, sc))
        print(f"{case.name:32s} {w:9.3f} {c:9.3f} {sc:11.3f} {c / sc:6.3f}")
    ws, cs = sorted(r[0] for r in rows), sorted(r[1] for r in rows)
    print(f"show: median wall {ws[len(ws) // 2]:.3f} s, max {ws[-1]:.3f} s; median CPU "
          f"{cs[len(cs) // 2]:.3f} s, max {cs[-1]:.3f} s")


if __name__ == "__main__":
    main()
