"""Command line: `shearcheck run | demo | hand`.

Exit codes: 0 the check ran (any verdict), 2 bad input (one line on stderr, no traceback),
1 internal error (short message; the traceback goes to `shearcheck-error.log` in the
output folder).
"""

from __future__ import annotations

import argparse
import sys
import traceback
from importlib import resources
from pathlib import Path

from .errors import CaseError, SolveError

__all__ = ["main", "DEMO_CASE"]

DEMO_CASE = "stub-bracket.toml"


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="shearcheck", description=(
        "Check hand shear calculations of stubby members and sections with finite elements."))
    sub = p.add_subparsers(dest="command", required=True)
    r = sub.add_parser("run", help="run a case file: mesh, solve, compare, verdict")
    r.add_argument("case", type=Path)
    r.add_argument("--out", type=Path, default=None,
                   help="output folder (default: out/<case name>)")
    r.add_argument("--no-report", action="store_true", help="results.json only")
    r.add_argument("--quiet", action="store_true", help="no progress or summary")
    d = sub.add_parser("demo", help="run the bundled demonstration case")
    d.add_argument("--out", type=Path, default=Path("out/demo"))
    d.add_argument("--no-report", action="store_true")
    d.add_argument("--quiet", action="store_true")
    h = sub.add_parser("hand", help="the hand calculation only: no mesh, no solve")
    h.add_argument("case", type=Path)
    h.add_argument("--out", type=Path, default=None)
    h.add_argument("--quiet", action="store_true")
    return p


def _progress(quiet: bool):
    if quiet or not sys.stderr.isatty():
        return None
    return lambda msg: print(f"  {msg}", file=sys.stderr, flush=True)


def _run(case_path: Path, out: Path | None, report: bool, quiet: bool) -> int:
    from .api import check, write_outputs
    from .case import load_case

    case = load_case(case_path)
    out = out if out is not None else Path("out") / case.name
    try:
        res = check(case, progress=_progress(quiet))
        write_outputs(res, out, report=report)
    except (CaseError, SolveError):
        raise
    except Exception:
        _log_internal(out)
        raise
    if not quiet:
        print(res.summary())
        print(f"outputs: {out}")
    return 0


def _hand(case_path: Path, out: Path | None, quiet: bool) -> int:
    from .case import load_case
    from .hand_only import hand_check

    case = load_case(case_path)
    out = out if out is not None else Path("out") / case.name
    text = hand_check(case, out)
    if not quiet:
        print(text)
        print(f"outputs: {out}")
    return 0


def _log_internal(out: Path) -> None:
    try:
        out.mkdir(parents=True, exist_ok=True)
        (out / "shearcheck-error.log").write_text(traceback.format_exc(), encoding="utf-8")
    except OSError:
        pass


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        if args.command == "run":
            return _run(args.case, args.out, not args.no_report, args.quiet)
        if args.command == "demo":
            with resources.as_file(resources.files("fem") / "data" / DEMO_CASE) as p:
                return _run(p, args.out, not args.no_report, args.quiet)
        if args.command == "hand":
            return _hand(args.case, args.out, args.quiet)
    except CaseError as exc:
        print(f"shearcheck: {exc}", file=sys.stderr)
        return 2
    except SolveError as exc:
        print(f"shearcheck: cannot solve: {exc}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print("shearcheck: interrupted; earlier results are untouched", file=sys.stderr)
        return 130
    except Exception as exc:
        print(f"shearcheck: internal error ({exc.__class__.__name__}: {exc}); the traceback "
              "is in shearcheck-error.log in the output folder", file=sys.stderr)
        return 1
    return 2


if __name__ == "__main__":
    sys.exit(main())
