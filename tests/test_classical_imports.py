"""The hand-method library stands alone: no finite-element code is pulled in."""

from __future__ import annotations

import importlib
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
MODULES = ["units", "geometry", "shapes", "sections", "thinwall", "shear", "bending",
           "statics", "pins", "coefficients"]


def test_no_fem_imports() -> None:
    """Importing every classical module in a fresh interpreter loads none of fem, gmsh
    or skfem (design rule of the package: pure numpy/scipy hand methods)."""
    names = ", ".join(f"classical.{m}" for m in MODULES)
    code = (f"import {names}; import sys; "
            "bad = sorted(m for m in sys.modules if m.split('.')[0] in {'fem', 'gmsh', 'skfem'}); "
            "assert not bad, bad")
    res = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True,
                         timeout=60)
    assert res.returncode == 0, res.stderr


@pytest.mark.parametrize("name", MODULES)
def test_all_lists_exist(name: str) -> None:
    """Every name in a module's __all__ is defined there (the export list is true)."""
    mod = importlib.import_module(f"classical.{name}")
    missing = [n for n in mod.__all__ if not hasattr(mod, n)]
    assert not missing and len(set(mod.__all__)) == len(mod.__all__)
