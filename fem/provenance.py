"""What produced a result: software versions, the case file by name and hash, the run time.

`provenance(case_file, case_text)` is the ``provenance`` object of results.json (and of any
other document, e.g. a verification report): enough for a checker to reproduce the run.
The case file is named by its file name only, never by where it lives on the machine that
ran it; ``case_sha256`` is the SHA-256 of the file's bytes as read (`fem.case.parse` reads
them without newline translation, so the hash equals that of the file).
"""

from __future__ import annotations

import datetime as dt
import hashlib
import platform
from importlib.metadata import PackageNotFoundError, version
from pathlib import PurePath
from typing import Any

__all__ = ["provenance", "PACKAGES", "package_version", "case_file_name"]

PACKAGES = ("numpy", "scipy", "scikit-fem", "gmsh", "meshio", "matplotlib", "shapely",
            "reportlab")


def package_version(name: str) -> str:
    """The installed version of a distribution, read from its metadata (nothing imported)."""
    try:
        return version(name)
    except PackageNotFoundError:
        return "not installed"


def case_file_name(file: str) -> str:
    """The case file's own name, without any folder ("<case>" stays as it is)."""
    name = PurePath(file.replace("\\", "/")).name
    return name or file


def provenance(case_file: str | None = None, case_text: str | None = None) -> dict[str, Any]:
    """The provenance object (CASE-FORMAT.md): versions, case name and SHA-256, UTC time."""
    d: dict[str, Any] = {
        "shearcheck": package_version("shearcheck"),
        "python": platform.python_version(),
        "packages": {n: package_version(n) for n in PACKAGES},
        "case_file": case_file_name(case_file) if case_file is not None else None,
        "case_sha256": (hashlib.sha256(case_text.encode("utf-8")).hexdigest()
                        if case_text else None),
        "run_utc": dt.datetime.now(dt.UTC).replace(microsecond=0).isoformat()
                   .replace("+00:00", "Z"),
        "platform": f"{platform.system()} {platform.machine()}".strip(),
    }
    return d
