"""The case file in: what it describes (`model`), how it is read (`reader`, `parse`), and the
checks made before anything is meshed (`outline` for a member's geometry, `section_rules`
for a section's dimensions, `sizing` for the size guard).

The member outline model lives here, not in `fem.member`, because validating a case needs
it: holes inside the outline, supports and loads on its boundary, a stable support layout.
"""

from __future__ import annotations

from fem.case.model import *  # noqa: F403  (the dataclasses and their allowed values)
from fem.case.model import __all__ as _model_names
from fem.case.parse import load_case, parse_case

__all__ = [*_model_names, "load_case", "parse_case"]
