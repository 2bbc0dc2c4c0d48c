"""The optional ``[project]`` table of a case file: the title block of the design note.

Every field is an optional string (CASE-FORMAT.md): ``project``, ``job``, ``member``,
``prepared_by``, ``checked_by``, ``date``, ``revision``, ``notes``. A field not given stays
blank in the note: nothing is invented. ``date`` may also be written as a TOML date
(``date = 2026-03-14``); it is kept as its ISO text. An unknown key is an error naming it.
"""

from __future__ import annotations

import datetime as dt
from dataclasses import dataclass, fields
from typing import Any

from fem.case.reader import Table

__all__ = ["Project", "PROJECT_FIELDS", "PROJECT_LABELS", "read_project", "MAX_FIELD",
           "MAX_NOTES"]

MAX_FIELD = 200    # characters of a one-line field (it is printed in every page header)
MAX_NOTES = 2000   # characters of `notes`


@dataclass(frozen=True)
class Project:
    """The title block as given; blank strings where a field was left out."""

    project: str = ""
    job: str = ""
    member: str = ""
    prepared_by: str = ""
    checked_by: str = ""
    date: str = ""
    revision: str = ""
    notes: str = ""

    def given(self) -> dict[str, str]:
        """The fields written in the case file, in the table's order (for results.json)."""
        return {f.name: getattr(self, f.name) for f in fields(self) if getattr(self, f.name)}


PROJECT_FIELDS = tuple(f.name for f in fields(Project))
PROJECT_LABELS = {"project": "Project", "job": "Job no.", "member": "Member",
                  "prepared_by": "Prepared by", "checked_by": "Checked by", "date": "Date",
                  "revision": "Revision", "notes": "Notes"}


def _field(t: Table, name: str) -> str:
    v: Any = t.raw(name, "")
    if isinstance(v, dt.date | dt.datetime | dt.time) and name == "date":
        v = v.isoformat()
    if not isinstance(v, str):
        raise t.error(name, f"must be a string (text in quotes), got {type(v).__name__}")
    v = v.strip()
    limit = MAX_NOTES if name == "notes" else MAX_FIELD
    if len(v) > limit:
        raise t.error(name, f"is {len(v)} characters long; at most {limit}")
    if name != "notes" and ("\n" in v or "\r" in v):
        raise t.error(name, "must be one line (it is printed in the page header); put longer "
                            "text in project.notes")
    if any(ord(c) < 32 and c not in "\n\t" for c in v):
        raise t.error(name, "holds a control character; use plain text")
    return v


def read_project(top: Table) -> Project | None:
    """The ``[project]`` table of the case's top level, or None when the case has none."""
    t = top.table("project", None)
    if t is None:
        return None
    p = Project(**{name: _field(t, name) for name in PROJECT_FIELDS})
    t.close()
    return p
