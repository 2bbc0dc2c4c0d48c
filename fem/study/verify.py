"""`shearcheck verify`: the installed copy against published solutions, as a filed report.

Each ``cases/verification/NAME.toml`` (`fem.study.benchmark`) states a quantity, its
published value, the source and a tolerance. A case benchmark is run as a convergence study
on its own mesh levels: level k (k = 1..N) is the finest mesh of the same case run with
``mesh.levels = k``, so every level is exactly the mesh the N-level study uses, and any
quantity of results.json can be followed through the levels. The value compared is the
finest level's; its discretisation uncertainty is the GCI of Celik et al. (2008)
(`fem.convergence.gci_study`) over the levels. A hand-library benchmark calls one
``classical.`` function.

The pass rule, one row per outcome (first that applies):

===========================================================  ======
the benchmark could not be run (error while meshing, ...)    fails
error = |computed - value| / max(|value|, scale) > tolerance  fails
GCI x |computed| / max(|value|, scale) > tolerance            fails
otherwise                                                     passes
===========================================================  ======

The second row is the comparison itself; the third says a pass must not rest on a mesh
whose own uncertainty is larger than the band it claims (no GCI: a hand-library call, a
``growth`` measure or one mesh level, the row does not apply). Benchmarks run in worker
processes (`fem.study.pool`). Outputs: ``verification.json`` (`Verification`),
``verification.html`` and ``verification.pdf`` (a `fem.report.blocks.Note`).
"""

from __future__ import annotations

import hashlib
import json
import math
import os
import platform
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from fem.api import check
from fem.convergence import ConvergenceInputError, acceptance, gci_study, growth_exponent
from fem.errors import CaseError
from fem.provenance import provenance as note_provenance
from fem.results import CAUTION, atomic_write, to_jsonable
from fem.study.benchmark import Benchmark, call_function, load_benchmark, returned_fields
from fem.study.pool import POINT_LOCK, process_pool, progress_bar
from fem.study.quantity import resolve, resolve_values

__all__ = ["BenchmarkResult", "Verification", "benchmark_paths", "run_benchmark",
           "run_verification", "write_verification", "verification_note", "format_summary",
           "provenance", "DEFAULT_FOLDER"]

DEFAULT_FOLDER = Path("cases") / "verification"


@dataclass
class BenchmarkResult:
    """One benchmark's outcome: what verification.json lists per benchmark."""

    name: str
    kind: str
    source: str
    quantity: str
    measure: str
    reference: float
    computed: float | None
    error: float | None          # relative: |computed - reference| / max(|reference|, scale)
    tolerance: float
    gci: float | None            # Celik GCI of the finest level (fraction), None if none
    passed: bool
    note: str
    unit: str = ""
    scale: float = 0.0
    levels: list[dict[str, float]] = field(default_factory=list)   # [{"size", "value"}]
    convergence: str = ""        # the acceptance rule's words on the study
    verdict: str | None = None   # the case's own verdict at the finest level
    reason: str = ""             # why it failed, in words; empty when it passed
    seconds: float = 0.0
    file_sha256: str = ""


@dataclass
class Verification:
    provenance: dict[str, Any]
    benchmarks: list[BenchmarkResult]
    passed: bool
    quick: bool
    statement: str
    wall: float = 0.0

    @property
    def failed(self) -> list[BenchmarkResult]:
        return [b for b in self.benchmarks if not b.passed]

    def to_dict(self) -> dict[str, Any]:
        return to_jsonable(self)


# --------------------------------------------------------------------------- running

def provenance() -> dict[str, Any]:
    """Versions, platform and UTC time of this run (no paths of the machine): the design
    note's provenance (`fem.provenance`) without a case file, the platform in full."""
    d = note_provenance()
    d.pop("case_file", None)
    d.pop("case_sha256", None)
    d["platform"] = platform.platform()
    return d


def benchmark_paths(folder: str | Path = DEFAULT_FOLDER, only: list[str] | None = None,
                    quick: bool = False) -> list[Path]:
    """The benchmark files of `folder`: all, the named ones, or the quick subset."""
    folder = Path(folder)
    if not folder.is_dir():
        raise CaseError(str(folder), "", "is not a folder of verification benchmarks (run "
                                         "from the shearcheck folder, or name the folder)")
    paths = sorted(folder.glob("*.toml"))
    if only:
        names = {p.name.removesuffix(".toml"): p for p in paths}
        unknown = [n for n in only if n.removesuffix(".toml") not in names]
        if unknown:
            raise CaseError(str(folder.name), "--only", f"no benchmark {unknown[0]!r}; the "
                                                        f"folder has: {', '.join(names)}")
        paths = [names[n.removesuffix(".toml")] for n in only]
    if quick:
        paths = [p for p in paths if load_benchmark(p).quick]
    if not paths:
        raise CaseError(str(folder.name), "", "holds no benchmark to run"
                                              + (" in the quick subset" if quick else ""))
    return paths


def _measure_case(b: Benchmark) -> tuple[float, float | None, list[dict[str, float]], str,
                                         str]:
    """(computed, gci, levels, convergence words, verdict) of a case benchmark."""
    assert b.case is not None
    n = b.case.mesh.levels
    if b.measure == "growth":   # one N-level study; the quantity is its list of level values
        if n < 2:
            raise CaseError(b.file, "mesh.levels", "a growth measure needs 2 or more levels")
        data = check(b.case).data
        values = resolve_values(data, b.quantity)
        sizes = [float(h) for h in data["convergence"]["sizes"]]
        if len(values) != len(sizes):
            raise CaseError(b.file, "reference.quantity", "must name one value per mesh level")
        slope = growth_exponent(sizes, values)
        levels = [{"size": h, "value": v} for h, v in zip(sizes, values, strict=True)]
        return slope, None, levels, (f"slope of ln|q| against ln h over {n} levels: "
                                     f"{slope:.4g}"), data["verdict"]
    levels: list[dict[str, float]] = []
    verdict = ""
    for k in range(1, n + 1):
        data = check(b.case.with_mesh(levels=k)).data
        levels.append({"size": float(data["mesh"]["size"]), "value": resolve(data, b.quantity),
                       "dofs": int(data["mesh"]["dofs"])})
        verdict = data["verdict"]
    sizes = [lv["size"] for lv in levels]
    values = [lv["value"] for lv in levels]
    if n < 2:
        return values[-1], None, levels, "one mesh level: no convergence study", verdict
    try:
        est = gci_study(sizes, values)
    except ConvergenceInputError as exc:
        return values[-1], None, levels, f"no estimate ({exc})", verdict
    return values[-1], est.gci, levels, acceptance(est).reason, verdict


def _verdict_of(b: Benchmark, computed: float | None, gci: float | None) -> tuple[
        float | None, bool, str]:
    """(error, passed, reason) by the pass rule of the module docstring."""
    if computed is None:
        return None, False, "not run"
    den = max(abs(b.value), b.scale)
    error = abs(computed - b.value) / den if den > 0 else (0.0 if computed == 0 else math.inf)
    if error > b.tolerance:
        return error, False, (f"error {error:.3%} is above the {b.tolerance:.3%} tolerance")
    if gci is not None and gci * abs(computed) / den > b.tolerance:
        return error, False, (f"the mesh's own uncertainty (GCI {gci:.3%}) is above the "
                              f"{b.tolerance:.3%} tolerance")
    return error, True, ""


def run_benchmark(path: str | Path) -> BenchmarkResult:
    """Run one benchmark file (in this process) and judge it."""
    t0 = time.perf_counter()
    path = Path(path)
    b = load_benchmark(path)
    sha = hashlib.sha256(path.read_bytes()).hexdigest()
    computed, gci, levels, words, verdict, reason = None, None, [], "", None, ""
    try:
        with POINT_LOCK:
            if b.case is None:
                computed = resolve(returned_fields(call_function(b.function or "", b.args)),
                                   b.quantity)
                words = "exact: a hand-library function (no mesh)"
            else:
                computed, gci, levels, words, verdict = _measure_case(b)
    except Exception as exc:  # a benchmark that cannot run fails, it does not stop the rest
        reason = f"could not run: {exc.__class__.__name__}: {exc}"
    error, passed, why = _verdict_of(b, computed, gci)
    return BenchmarkResult(
        name=b.name, kind=b.kind, source=b.source, quantity=b.quantity, measure=b.measure,
        reference=b.value, computed=computed, error=error, tolerance=b.tolerance, gci=gci,
        passed=passed, note=b.note, unit=b.unit, scale=b.scale, levels=levels, convergence=words,
        verdict=verdict, reason=reason or why, seconds=time.perf_counter() - t0,
        file_sha256=sha)


def _cost(path: Path) -> float:
    """A rough cost to start the dearest benchmarks first (dofs of the finest level)."""
    from fem.case.sizing import estimate_dofs, level_size

    b = load_benchmark(path)
    if b.case is None:
        return 0.0
    return float(estimate_dofs(b.case, level_size(b.case, b.case.mesh.levels - 1)))


def _statement(results: list[BenchmarkResult], quick: bool) -> str:
    n = len(results)
    bad = [r for r in results if not r.passed]
    scope = "the quick subset of " if quick else ""
    if not bad:
        return (f"All {n} benchmarks of {scope}the verification set pass: on this "
                "installation shearcheck reproduces each published value within its stated "
                "tolerance, on a mesh whose own uncertainty (GCI) is inside that tolerance.")
    return (f"{len(bad)} of {n} benchmarks of {scope}the verification set FAIL: "
            f"{', '.join(r.name for r in bad)}. Do not rely on this installation for those "
            "checks until the cause is found.")


def run_verification(folder: str | Path = DEFAULT_FOLDER, only: list[str] | None = None,
                     quick: bool = False, workers: int | None = None,
                     quiet: bool = False) -> Verification:
    """Run the benchmarks of `folder` in worker processes; every file is checked first."""
    from concurrent.futures import as_completed

    t0 = time.perf_counter()
    paths = benchmark_paths(folder, only, quick)
    for p in paths:
        load_benchmark(p)            # a bad file stops the run before anything is solved
    order = sorted(paths, key=_cost, reverse=True)
    done: dict[str, BenchmarkResult] = {}
    bar = progress_bar(len(order), "verify", quiet, unit="benchmark")
    pool = process_pool(min(workers or os.cpu_count() or 1, len(order)))
    try:
        futs = {pool.submit(run_benchmark, str(p)): p for p in order}
        for fut in as_completed(futs):
            r = fut.result()
            done[r.name] = r
            bar.set_postfix_str(r.name)
            bar.update(1)
    except BaseException:
        pool.shutdown(wait=False, cancel_futures=True)
        raise
    finally:
        bar.close()
    pool.shutdown()
    results = [done[p.name.removesuffix(".toml")] for p in paths]
    return Verification(provenance=provenance(), benchmarks=results,
                        passed=all(r.passed for r in results), quick=quick,
                        statement=_statement(results, quick), wall=time.perf_counter() - t0)


# --------------------------------------------------------------------------- outputs

def _g(v: float | None, digits: int = 6) -> str:
    return "–" if v is None else f"{v:.{digits}g}"


def _pct(v: float | None) -> str:
    return "–" if v is None else f"{100 * v:.3g} %"


def verification_note(ver: Verification) -> Any:
    """The verification report as a `fem.report.blocks.Note` (rendered as the design note)."""
    from fem.report.blocks import Block, Note, Section, Table

    prov = ver.provenance
    n, bad = len(ver.benchmarks), ver.failed
    rows = [[r.name, r.quantity, r.unit or "–", _g(r.reference), _g(r.computed), _pct(r.error),
             _pct(r.gci), _pct(r.tolerance), "pass" if r.passed else "FAIL"]
            for r in ver.benchmarks]
    table = Table(["benchmark", "quantity", "unit", "reference", "computed", "error", "GCI",
                   "tolerance", "result"], rows,
                  caption="Error = |computed − reference| / max(|reference|, scale); GCI of "
                          "the finest mesh (Celik et al. 2008); – where none applies.",
                  marked={k for k, r in enumerate(ver.benchmarks) if not r.passed})
    outcome = Section("Outcome", [
        Block(ver.statement, "verdict-" + ("passed" if ver.passed else "failed")),
        Block(f"{n} benchmarks run" + (" (the quick subset: those marked quick in their "
                                       "files)" if ver.quick else "")
              + f" in {ver.wall:.0f} s.", "small")])
    read = Section("How to read this report", [
        Block("Each benchmark is a case file (or a call of one hand-library function) with the "
              "published value of one result beside it. The case is run on its own mesh "
              "levels, each halving the element size; the value on the finest mesh is "
              "compared with the published one.", ""),
        Block("error: the relative difference from the published value. tolerance: the "
              "band the benchmark allows, chosen for what the source supports (tight for "
              "exact closed forms, wider for fitted or recalled table values).", "bullet"),
        Block("GCI: the grid convergence index of the finest mesh, an estimate of how far it "
              "is from the mesh-independent value. A benchmark passes only when both the "
              "error and the GCI are inside its tolerance.", "bullet"),
        Block("\"from memory\" in a source means the value was recalled, not re-read from "
              "the book; such benchmarks carry wider tolerances.", "bullet")])
    detail = Section("Benchmarks", [table] + [
        Block(f"{r.name} — {r.reason}", "finding") for r in bad])
    sources = Section("Sources and what each benchmark exercises", [
        Block(f"{r.name} ({r.kind}): {r.source}. {r.note}", "bullet")
        for r in ver.benchmarks])
    conv_rows = [[r.name, ", ".join(_g(lv["size"], 4) for lv in r.levels),
                  ", ".join(_g(lv["value"], 6) for lv in r.levels), r.convergence]
                 for r in ver.benchmarks if r.levels]
    conv = Section("Convergence studies", [Table(
        ["benchmark", "element sizes", "values", "study"], conv_rows,
        caption="The quantity on each mesh level, coarsest first.")] if conv_rows else [
        Block("No benchmark in this run has mesh levels.", "small")])
    pk = prov.get("packages", {})
    prov_rows = [["shearcheck", prov.get("shearcheck", "")], ["Python", prov.get("python", "")]]
    prov_rows += [[k, v] for k, v in pk.items()]
    prov_rows += [["platform", prov.get("platform", "")], ["run (UTC)", prov.get("run_utc", "")]]
    prov_rows += [["benchmark files", f"{n}; SHA-256 of each in verification.json"]]
    provenance_s = Section("Provenance", [Table(["item", "value"], prov_rows)])
    caution = Section("Caution", [
        Block("The benchmarks show that this installation reproduces the stated published "
              "solutions; they do not show that a model of a real member is adequate.", ""),
        Block(CAUTION, "caution")])
    return Note(title="Verification against published solutions",
                subtitle=f"shearcheck {prov.get('shearcheck', '')} · {n} benchmarks · "
                         f"{prov.get('run_utc', '')[:10]}",
                verdict="passed" if ver.passed else "failed",
                sections=[outcome, detail, read, sources, conv, provenance_s, caution],
                kicker="Verification report · shearcheck", caution=CAUTION)


def write_verification(ver: Verification, out: str | Path, report: bool = True) -> list[Path]:
    """verification.html and .pdf (unless `report` is False), then verification.json."""
    from fem.report.html import render_html
    from fem.report.pdf import write_pdf

    out = Path(out)
    if out.exists() and not out.is_dir():
        raise CaseError(str(out), "--out", "exists and is not a folder")
    out.mkdir(parents=True, exist_ok=True)
    written = []
    if report:
        note = verification_note(ver)
        atomic_write(out / "verification.html", render_html(note).encode("utf-8"))
        write_pdf(note, out / "verification.pdf")
        written += [out / "verification.html", out / "verification.pdf"]
    atomic_write(out / "verification.json",
                 (json.dumps(ver.to_dict(), indent=1, allow_nan=False) + "\n").encode("utf-8"))
    return [*written, out / "verification.json"]


def format_summary(ver: Verification) -> str:
    """One row per benchmark, then the last line: all pass, or which fail."""
    head = ("benchmark", "unit", "reference", "computed", "error", "GCI", "tol", "result")
    cells = [head] + [(r.name, r.unit or "-", _g(r.reference), _g(r.computed), _pct(r.error),
                       _pct(r.gci), _pct(r.tolerance), "pass" if r.passed else "FAIL")
                      for r in ver.benchmarks]
    w = [max(len(c[i]) for c in cells) for i in range(len(head))]
    lines = ["  ".join(c[i].ljust(w[i]) for i in range(len(head))).rstrip() for c in cells]
    for r in ver.failed:
        lines.append(f"  {r.name}: {r.reason}")
    n = len(ver.benchmarks)
    lines.append(f"all {n} benchmark{'s' if n != 1 else ''} pass ({ver.wall:.1f} s)"
                 if ver.passed else
                 f"FAILED {len(ver.failed)} of {n}: {', '.join(r.name for r in ver.failed)}")
    return "\n".join(lines)
