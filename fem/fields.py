"""Field files of a run: the FE stress field as VTU, the cut profiles as CSV.

`fields.vtu` (meshio) holds the finest mesh of a beam check as linear triangles on its
corner vertices, with the smooth nodal fields there (`fem.recovery.StressField.nodal`,
the element-vertex stresses averaged at each vertex) as point data: ``displacement``
(3 components, z = 0), ``sigma_xx``, ``sigma_yy``, ``tau_xy``, ``von_mises`` and
``principal_max``, in the case's length and stress units. Any VTU viewer opens it.

`profiles.csv` has one row per sampled point of every cut, one block per cut, columns
``cut,x,y,tau_fe,tau_hand,sigma_x_fe,sigma_x_hand`` (``cut`` numbered from 1 as in the
report). For a section check it holds the neutral-axis profile of ``result.section``,
columns ``line,s,tau_fe,tau_hand``.
"""

from __future__ import annotations

import csv
import io
import tempfile
from pathlib import Path
from typing import Any

import meshio
import numpy as np

from .results import Result, atomic_write

__all__ = ["VTU_FIELDS", "PROFILE_COLUMNS", "SECTION_PROFILE_COLUMNS", "write_fields",
           "write_vtu", "write_profiles_csv", "profiles_csv_text"]

VTU_FIELDS = {"sigma_xx": "sxx", "sigma_yy": "syy", "tau_xy": "txy",
              "von_mises": "von_mises", "principal_max": "principal_max"}
PROFILE_COLUMNS = ("cut", "x", "y", "tau_fe", "tau_hand", "sigma_x_fe", "sigma_x_hand")
SECTION_PROFILE_COLUMNS = ("line", "s", "tau_fe", "tau_hand")


def write_vtu(field: Any, path: Path) -> Path:
    """A `StressField` (p, t, nodal, displacement) as a VTU file of linear triangles."""
    p = np.asarray(field.p, float)
    points = np.column_stack([p[0], p[1], np.zeros(p.shape[1])])
    u = np.asarray(field.displacement, float)
    data = {"displacement": np.column_stack([u[0], u[1], np.zeros(u.shape[1])])}
    for name, key in VTU_FIELDS.items():
        data[name] = np.asarray(field.nodal[key], float)
    mesh = meshio.Mesh(points, [("triangle", np.asarray(field.t[:3], np.int64).T)],
                       point_data=data)
    # meshio writes to a path; write beside the target and rename (never half a file)
    path = Path(path)
    with tempfile.TemporaryDirectory(dir=path.parent, prefix=".vtu-") as tmp:
        tmp_path = Path(tmp) / path.name
        meshio.write(tmp_path, mesh, file_format="vtu")
        atomic_write(path, tmp_path.read_bytes())
    return path


def profiles_csv_text(result: Result) -> str:
    """The CSV text of the cut profiles (beam) or the neutral-axis profile (section)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    if result.kind == "section":
        na = (result.section or {}).get("neutral_axis") or {}
        w.writerow(SECTION_PROFILE_COLUMNS)
        for row in zip(na.get("s", []), na.get("tau_fe", []), na.get("tau_hand", []),
                       strict=True):
            w.writerow(["neutral-axis", *(f"{v:.9g}" for v in row)])
        return buf.getvalue()
    w.writerow(PROFILE_COLUMNS)
    for i, c in enumerate(result.cuts or [], start=1):
        pr = c.profile
        n = len(pr.y)
        sx_fe = pr.sigma_x_fe or [float("nan")] * n
        sx_hd = pr.sigma_x_hand or [float("nan")] * n
        for row in zip(pr.y, pr.tau_fe, pr.tau_hand, sx_fe, sx_hd, strict=True):
            w.writerow([i, f"{c.x:.9g}", *(f"{v:.9g}" for v in row)])
    return buf.getvalue()


def write_profiles_csv(result: Result, path: Path) -> Path:
    atomic_write(Path(path), profiles_csv_text(result).encode("utf-8"))
    return Path(path)


def write_fields(res: Any, folder: Path) -> list[Path]:
    """fields.vtu (beam) and profiles.csv for a finished check; return the files written.

    A section check gets profiles.csv only: its run object (`fem.section_run`) is not a
    member mesh with a `StressField`, and its field output belongs with it.
    """
    folder = Path(folder)
    out = [write_profiles_csv(res.result, folder / "profiles.csv")]
    if res.case.kind == "beam" and res.run is not None:
        out.insert(0, write_vtu(res.run.finest.field, folder / "fields.vtu"))
    return out
