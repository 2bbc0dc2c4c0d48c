"""Command line: `shearcheck run | demo | hand | show | regress | sweep | verify`.

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

from fem.errors import CaseError, SolveError

__all__ = ["main", "DEMO_CASE"]

DEMO_CASE = "stub-bracket.toml"
_LOGGED: set[int] = set()   # ids of exceptions whose traceback went to shearcheck-error.log


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
    h.add_argument("--out", type=Path, default=None,
                   help="output folder (default: out/<case name>-hand)")
    h.add_argument("--quiet", action="store_true")
    s = sub.add_parser("show", help="draw the model (outline, supports, loads, cuts, mesh) "
                                    "without solving: model.png and a summary")
    s.add_argument("case", type=Path)
    s.add_argument("--out", type=Path, default=None, help="default: out/<case name>")
    _suite_parsers(sub)
    _verify_parser(sub)
    return p


def _show(case_path: Path, out: Path | None) -> int:
    """`shearcheck show`: mesh the first level and draw it; nothing is solved."""
    from fem.report.model_figure import preview

    case, out = _load(case_path, out)
    try:
        pv = preview(case, out)
    except (CaseError, SolveError):
        raise
    except Exception:
        _log_internal(out)
        raise
    print(pv.summary())
    print(f"model: {out / pv.figure.name}")
    return 0


def _verify_parser(sub) -> None:
    v = sub.add_parser("verify", help="run the verification benchmarks against published "
                                      "values and write a report")
    v.add_argument("folder", type=Path, nargs="?", default=None,
                   help="folder of benchmark files (default: cases/verification)")
    v.add_argument("--quick", action="store_true",
                   help="only the quick subset (the benchmarks marked quick = true)")
    v.add_argument("--only", nargs="+", metavar="NAME", help="only these benchmarks")
    v.add_argument("--out", type=Path, default=Path("out/verify"),
                   help="output folder (default: out/verify)")
    v.add_argument("--workers", type=int, default=None, help="processes (default: the cores)")
    v.add_argument("--quiet", action="store_true", help="no progress bar; the last line only")


def _verify(args: argparse.Namespace) -> int:
    from fem.study.verify import (
        DEFAULT_FOLDER,
        format_summary,
        run_verification,
        write_verification,
    )

    if args.workers is not None and args.workers < 1:
        raise CaseError("command line", "--workers", f"must be >= 1, got {args.workers}")
    if args.out.exists() and not args.out.is_dir():
        raise CaseError(str(args.out), "--out", "exists and is not a folder")
    try:
        ver = run_verification(args.folder or DEFAULT_FOLDER, only=args.only, quick=args.quick,
                               workers=args.workers, quiet=args.quiet)
        write_verification(ver, args.out)
    except (CaseError, SolveError):
        raise
    except Exception:
        _log_internal(args.out)
        raise
    text = format_summary(ver)
    print(text if not args.quiet else text.splitlines()[-1])
    return 0 if ver.passed else 1


def _suite_parsers(sub) -> None:
    g = sub.add_parser("regress", help="run the bundled cases against their baselines")
    g.add_argument("folder", type=Path, nargs="?", default=Path("cases"),
                   help="folder of NAME.toml cases with NAME.baseline.json (default: cases)")
    g.add_argument("--only", nargs="+", metavar="NAME", help="only these cases")
    g.add_argument("--update", action="store_true", help="rewrite the baselines")
    g.add_argument("--levels", type=int, default=None,
                   help="mesh levels (default: those the baselines were made with)")
    g.add_argument("--workers", type=int, default=None, help="processes (default: the cores)")
    g.add_argument("--quiet", action="store_true", help="no progress bar; drifts only")
    w = sub.add_parser("sweep", help="run a case over ranges of its keys")
    w.add_argument("case", type=Path)
    w.add_argument("--vary", action="append", required=True, metavar="KEY=START:STOP:N",
                   help="a dotted key of the case file and its range (repeat for a product)")
    w.add_argument("--out", type=Path, default=None, help="default: out/sweep-<case name>")
    w.add_argument("--workers", type=int, default=None, help="processes (default: the cores)")
    w.add_argument("--scheduler", default=None, metavar="ADDRESS",
                   help="a running Dask scheduler, e.g. tcp://10.0.0.5:8786, instead of "
                        "local processes")
    w.add_argument("--levels", type=int, default=None, help="set mesh.levels of every point")
    w.add_argument("--quiet", action="store_true", help="no progress bar or summary")


def _progress(quiet: bool):
    """A progress bar on stderr (tqdm), or None with --quiet or when stderr is no terminal."""
    from fem.progress import console_progress

    return console_progress(quiet)


def _run(case_path: Path, out: Path | None, report: bool, quiet: bool) -> int:
    from fem.api import check, write_outputs

    case, out = _load(case_path, out)
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
    from fem.api import hand_check

    case, out = _load(case_path, out, suffix="-hand")  # its own folder: never beside a run
    text = hand_check(case, out)
    if not quiet:
        print(text)
        print(f"outputs: {out}")
    return 0


def _regress(args: argparse.Namespace) -> int:
    from fem.study.regress import format_table, run_suite

    for n in (args.levels, args.workers):
        if n is not None and n < 1:
            raise CaseError("command line", "--levels/--workers", f"must be >= 1, got {n}")
    try:
        rep = run_suite(args.folder, only=args.only, update=args.update, levels=args.levels,
                        workers=args.workers, quiet=args.quiet)
    except (CaseError, SolveError):
        raise
    except Exception:
        _log_internal(Path("out"))
        raise
    print(format_table(rep, all_rows=args.update or not args.quiet))
    return 0 if rep.holds else 1   # drift, a missing baseline or a case that fails


def _sweep(args: argparse.Namespace) -> int:
    from fem.case.parse import load_case
    from fem.study.sweep import parse_vary, run_sweep

    varies = [parse_vary(v) for v in args.vary]
    out = args.out if args.out is not None else Path("out") / f"sweep-{load_case(args.case).name}"
    if args.workers is not None and args.workers < 1:
        raise CaseError("command line", "--workers", f"must be >= 1, got {args.workers}")
    if args.levels is not None and not 1 <= args.levels <= 8:
        raise CaseError("command line", "--levels", f"must be 1 to 8, got {args.levels}")
    try:
        rep = run_sweep(args.case, varies, out, workers=args.workers,
                        scheduler=args.scheduler, levels=args.levels, quiet=args.quiet)
    except (CaseError, SolveError):
        raise
    except Exception:
        _log_internal(out)
        raise
    if not args.quiet:
        s = rep.summary
        print(f"{s['points']} points ({rep.ran} run now, {rep.skipped} already done): "
              f"{s['ok']} ok, {s['failed']} failed")
        for f in s["failures"]:
            print(f"  failed {f['id']} {f['params']}: {f['message']}")
        if len(varies) == 1:
            th = s["threshold"]
            print(f"max ratio crosses 1 + tolerance = {s['level']:g} at "
                  f"{varies[0].key} = {th:.4g}" if th is not None else
                  f"max ratio never crosses 1 + tolerance = {s['level']:g} in this range")
        print(f"outputs: {out} (sweep.csv, summary.json, ratio.png)")
    return _sweep_exit(rep.summary)


def _sweep_exit(s: dict) -> int:
    """0 when every point ran; 1 when some failed, 2 when all did (the input is bad); the
    count goes to stderr even with --quiet."""
    if not s["failed"]:
        return 0
    first = s["failures"][0]["message"] if s["failures"] else ""
    print(f"shearcheck: {s['failed']} of {s['points']} sweep points failed (see summary.json)"
          + (f"; the first: {first}" if first else ""), file=sys.stderr)
    return 2 if s["failed"] == s["points"] else 1


def _load(case_path: Path, out: Path | None, suffix: str = ""):
    """The case and its output folder (default out/<name><suffix>: the name cannot hold a
    path)."""
    from fem.case.parse import load_case

    try:
        case = load_case(case_path)
    except (CaseError, SolveError):
        raise
    except Exception:
        _log_internal(out if out is not None else Path("out"))
        raise
    out = out if out is not None else Path("out") / f"{case.name}{suffix}"
    if out.exists() and not out.is_dir():
        raise CaseError(str(out), "--out", "exists and is not a folder; give a folder for the "
                                           "outputs")
    from fem.output_folder import check_writable

    check_writable(out)   # before the solve: a folder we cannot write is found at once
    return case, out


def _log_internal(out: Path) -> None:
    """The traceback to out/shearcheck-error.log, never through a planted symbolic link;
    `_LOGGED` remembers which exceptions have their log (for the one-line message)."""
    import os

    exc = sys.exc_info()[1]
    try:
        out.mkdir(parents=True, exist_ok=True)
        fd = os.open(out / "shearcheck-error.log", os.O_WRONLY | os.O_CREAT | os.O_TRUNC
                     | getattr(os, "O_NOFOLLOW", 0), 0o644)
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(traceback.format_exc())
        if exc is not None:
            _LOGGED.add(id(exc))
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
        if args.command == "show":
            return _show(args.case, args.out)
        if args.command == "regress":
            return _regress(args)
        if args.command == "sweep":
            return _sweep(args)
        if args.command == "verify":
            return _verify(args)
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
        where = ("the traceback is in shearcheck-error.log in the output folder"
                 if id(exc) in _LOGGED else
                 "no log could be written (the output folder is not writable)")
        print(f"shearcheck: internal error ({exc.__class__.__name__}: {exc}); {where}",
              file=sys.stderr)
        return 1
    return 2


if __name__ == "__main__":
    sys.exit(main())
