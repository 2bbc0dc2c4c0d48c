"""A verification benchmark file: an ordinary case plus a `[reference]` table.

``cases/verification/NAME.toml`` is either

* a **case** (every key of a case file, checked as any case is) followed by ``[reference]``,
  the table that states the published value; the case is run with its own mesh levels as a
  convergence study and the quantity is read from its results.json; or
* a **hand-library call**: no case keys, only ``[reference]`` with ``function`` (a public
  function of a ``classical.`` module) and ``[reference.args]`` (its keyword arguments; an
  argument given as a table with a ``function`` key is itself such a call, e.g. an outline
  from ``classical.shapes.rectangle``). The quantity is a path into the returned value: a
  number is ``value``, a dataclass or named tuple by its field names.

``[reference]`` must be the last table of the file (with its ``[reference.args]``), so that
the case part above it is an ordinary case file, line numbers and all. Its keys:

============  ====================================================================
source        the published work: author, title, edition, section/table/equation;
              or "common practice"; "from memory" where the value is recalled
quantity      a path into results.json (`fem.study.quantity`), or into the return value
value         the reference value, in the case's units
tolerance     allowed relative error |computed - value| / max(|value|, scale)
note          one paragraph: what the benchmark exercises and how `value` follows
unit          optional: the unit of `value` as printed in the report (e.g. "MPa", "mm^4")
scale         optional: the floor of the error's denominator (for values near zero)
measure       optional: "value" (default) or "growth": the slope d ln|q| / d ln h over
              the mesh levels (`fem.convergence.growth_exponent`) of a quantity that
              names the list of its values per level in the study's results.json
quick         optional: true puts the benchmark in ``shearcheck verify --quick``
function      hand-library benchmarks: "classical.MODULE.NAME"
args          hand-library benchmarks: the keyword arguments
============  ====================================================================
"""

from __future__ import annotations

import importlib
import math
import re
import tomllib
from dataclasses import asdict, dataclass, field, is_dataclass
from pathlib import Path
from typing import Any

from fem.case.model import Case
from fem.case.parse import parse_case
from fem.errors import CaseError
from fem.study.quantity import QuantityError, parse_path

__all__ = ["Benchmark", "load_benchmark", "call_function", "returned_fields", "MEASURES",
           "REFERENCE_KEYS"]

MEASURES = ("value", "growth")
REFERENCE_KEYS = ("source", "quantity", "value", "tolerance", "note", "unit", "scale",
                  "measure", "quick", "function", "args")
_REQUIRED = ("source", "quantity", "value", "tolerance", "note")
_HEADER = re.compile(r"^[ \t]*\[[ \t]*reference[ \t]*\][ \t]*(#.*)?$", re.MULTILINE)
_FUNCTION = re.compile(r"classical\.[a-z_][a-z0-9_]*\.[A-Za-z_][A-Za-z0-9_]*")


@dataclass(frozen=True)
class Benchmark:
    """One benchmark, loaded and checked; `case` is None for a hand-library call."""

    name: str
    file: str
    source: str
    quantity: str
    value: float
    tolerance: float
    note: str
    unit: str = ""
    scale: float = 0.0
    measure: str = "value"
    quick: bool = False
    function: str | None = None
    args: dict[str, Any] = field(default_factory=dict)
    case: Case | None = None

    @property
    def kind(self) -> str:
        return "hand library" if self.case is None else f"FE {self.case.kind}"


def _number(ref: dict[str, Any], key: str, file: str, low: float | None = None) -> float:
    v = ref[key]
    if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v):
        raise CaseError(file, f"reference.{key}", f"must be a finite number, got {v!r}")
    if low is not None and not v > low:
        raise CaseError(file, f"reference.{key}", f"must be > {low:g}, got {v!r}")
    return float(v)


def _text(ref: dict[str, Any], key: str, file: str) -> str:
    v = ref[key]
    if not isinstance(v, str) or not v.strip():
        raise CaseError(file, f"reference.{key}", "must be a non-empty string")
    return " ".join(v.split())


def _reference(ref: Any, file: str) -> dict[str, Any]:
    if not isinstance(ref, dict):
        raise CaseError(file, "reference", "must be a table")
    for k in ref:
        if k not in REFERENCE_KEYS:
            raise CaseError(file, f"reference.{k}", "unknown key; allowed: "
                                                    + ", ".join(REFERENCE_KEYS))
    for k in _REQUIRED:
        if k not in ref:
            raise CaseError(file, f"reference.{k}", "is missing; a benchmark states "
                                                    + ", ".join(_REQUIRED))
    out = {k: _text(ref, k, file) for k in ("source", "quantity", "note")}
    try:
        parse_path(out["quantity"])
    except QuantityError as exc:
        raise CaseError(file, "reference.quantity", str(exc)) from None
    out["value"] = _number(ref, "value", file)
    out["tolerance"] = _number(ref, "tolerance", file, low=0.0)
    if "unit" in ref:
        if not isinstance(ref["unit"], str):
            raise CaseError(file, "reference.unit", "must be a string, e.g. \"MPa\"")
        out["unit"] = ref["unit"].strip()
    if "scale" in ref:
        out["scale"] = _number(ref, "scale", file, low=0.0)
    if "measure" in ref:
        if ref["measure"] not in MEASURES:
            raise CaseError(file, "reference.measure", f"must be one of {', '.join(MEASURES)}"
                                                       f", got {ref['measure']!r}")
        out["measure"] = ref["measure"]
    if "quick" in ref:
        if not isinstance(ref["quick"], bool):
            raise CaseError(file, "reference.quick", "must be true or false")
        out["quick"] = ref["quick"]
    if "function" in ref:
        f = ref["function"]
        if not isinstance(f, str) or not _FUNCTION.fullmatch(f):
            raise CaseError(file, "reference.function", "must name a hand-library function "
                                                        "as classical.MODULE.NAME")
        out["function"] = f
        args = ref.get("args", {})
        if not isinstance(args, dict):
            raise CaseError(file, "reference.args", "must be a table of keyword arguments")
        out["args"] = args
    elif "args" in ref:
        raise CaseError(file, "reference.args", "belongs to a hand-library benchmark; give "
                                                "reference.function too")
    return out


def load_benchmark(path: str | Path) -> Benchmark:
    """Read and check a benchmark file; `CaseError` naming the file and key otherwise."""
    path = Path(path)
    file = path.name
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise CaseError(file, "", f"cannot read the benchmark ({exc.__class__.__name__})") \
            from None
    try:
        whole = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise CaseError(file, "", f"not valid TOML ({exc})") from None
    if "reference" not in whole:
        raise CaseError(file, "reference", "is missing: a benchmark file ends with a "
                                           "[reference] table")
    heads = list(_HEADER.finditer(text))
    if len(heads) != 1:
        raise CaseError(file, "reference", "write it once, as a [reference] table header")
    head, tail = text[:heads[0].start()], text[heads[0].start():]
    if set(tomllib.loads(tail)) != {"reference"}:
        raise CaseError(file, "reference", "must be the last table of the file (only "
                                           "[reference.args] may follow it)")
    ref = _reference(whole["reference"], file)
    name = path.name.removesuffix(".toml")
    case_keys = set(tomllib.loads(head))
    if "function" in ref:
        if case_keys:
            raise CaseError(file, "reference.function", "a benchmark either runs a case or "
                                                        "calls a function, not both; found "
                                                        f"case keys {sorted(case_keys)}")
        return Benchmark(name=name, file=file, **ref)
    case = parse_case(head, file)
    return Benchmark(name=name, file=file, case=case, **ref)


def call_function(spec: str, args: dict[str, Any]) -> Any:
    """Call a public hand-library function ("classical.MODULE.NAME") with keyword `args`;
    an argument that is a table with a ``function`` key is called first (nested)."""
    if not _FUNCTION.fullmatch(spec):
        raise CaseError(spec, "function", "must be classical.MODULE.NAME")
    mod_name, _, fn_name = spec.rpartition(".")
    try:
        mod = importlib.import_module(mod_name)
    except ImportError:
        raise CaseError(spec, "function", f"no hand-library module {mod_name!r}") from None
    if fn_name not in getattr(mod, "__all__", ()):
        raise CaseError(spec, "function", f"{mod_name} has no public function {fn_name!r}")
    kw = {}
    for k, v in args.items():
        if isinstance(v, dict) and "function" in v:
            inner = {a: b for a, b in v.items() if a != "function"}
            kw[k] = call_function(v["function"], inner.get("args", inner))
        else:
            kw[k] = v
    return getattr(mod, fn_name)(**kw)


def returned_fields(value: Any) -> dict[str, Any]:
    """What a quantity path reads from a function's return: {"value": x} for a number,
    the fields of a dataclass or named tuple otherwise."""
    if isinstance(value, int | float) and not isinstance(value, bool):
        return {"value": float(value)}
    if is_dataclass(value) and not isinstance(value, type):
        return asdict(value)
    if hasattr(value, "_asdict"):
        return dict(value._asdict())
    raise QuantityError(f"the function returned {type(value).__name__}, which has no fields")
