"""gmsh, shared by both kinds: one session at a time per process, and the background size field.

gmsh is not thread-safe and keeps global state, so every use goes through `gmsh_session`
(one user at a time, no SIGINT handler, always finalised; ../shared/FEM-NOTES.md).
"""

from __future__ import annotations

import threading
from collections.abc import Iterator
from contextlib import contextmanager

import gmsh

__all__ = ["gmsh_session", "set_background"]

_GMSH_LOCK = threading.Lock()


@contextmanager
def gmsh_session(name: str = "member") -> Iterator[None]:
    """One gmsh user at a time in this process (gmsh is not thread-safe); no SIGINT
    handler, so it is safe in worker threads; always finalised."""
    with _GMSH_LOCK:
        if gmsh.isInitialized():
            raise RuntimeError("gmsh is already in use in this process (one user at a time)")
        gmsh.initialize(interruptible=False)
        try:
            gmsh.option.setNumber("General.Terminal", 0)
            gmsh.option.setNumber("General.Verbosity", 1)
            gmsh.model.add(name)
            yield
        finally:
            gmsh.finalize()


def set_background(fields: list[int], size: float) -> None:
    """The minimum of the given size fields as the background mesh, nothing else sizing."""
    f = gmsh.model.mesh.field
    if fields:
        m = f.add("Min")
        f.setNumbers(m, "FieldsList", fields)
        f.setAsBackgroundMesh(m)
    for opt in ("MeshSizeExtendFromBoundary", "MeshSizeFromPoints", "MeshSizeFromCurvature"):
        gmsh.option.setNumber(f"Mesh.{opt}", 0)
    gmsh.option.setNumber("Mesh.MeshSizeMax", size)
