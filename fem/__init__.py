"""shearcheck's finite-element harness: case -> mesh -> solve -> cuts -> verdict.

>>> from fem import check                       # doctest: +SKIP
>>> res = check("cases/stub-cantilever.toml")   # doctest: +SKIP
>>> res.verdict, res.data["cuts"][0]["ratio"]   # doctest: +SKIP
"""

from __future__ import annotations

from fem.api import CheckResult, check, write_outputs
from fem.case.model import Case
from fem.case.parse import load_case, parse_case
from fem.errors import CaseError, SolveError

__all__ = ["check", "write_outputs", "CheckResult", "Case", "load_case", "parse_case",
           "CaseError", "SolveError"]
