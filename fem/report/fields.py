"""Field files of a run: the FE stress field as VTU, the cut profiles as CSV.

Beam check: `fields.vtu` (meshio) holds the finest mesh as linear triangles on its corner
vertices, with the smooth nodal fields there (`fem.member.recovery.StressField.nodal`, the
element-vertex stresses averaged at each vertex) as point data: ``displacement``
(3 components, z = 0), ``sigma_xx``, ``sigma_yy``, ``tau_xy``, ``von_mises``,
``principal_max`` (σ1), ``principal_min`` (σ2) and the principal directions
``direction_max`` and ``direction_min`` (unit vectors, z = 0; a direction has no sign), in
the case's length and stress units. `profiles.csv` has one row per sampled point of every
cut, one block per cut, columns ``cut,x [L],y [L],tau_fe [S],tau_hand [S],sigma_x_fe [S],
sigma_x_hand [S]`` with the case's units written in the header (``cut`` numbered from 1 as
in the report).

Section check: `fields.vtu` holds the finest section mesh with the flexure shear stress
under the case's shear, averaged at the vertices (`fem.section.solve.SectionSolution`):
``tau`` (vector [tau_zx, tau_zy, 0]), ``tau_zx``, ``tau_zy`` and ``tau_magnitude``.
`profiles.csv` holds the neutral-axis profile and every cut of ``result.section``, columns
``line,offset [L],s [L],x [L],y [L],tau_fe [S],tau_hand [S]`` (``line`` is
``neutral-axis`` or ``cut-k``).

Any VTU viewer opens the field files.
"""

from __future__ import annotations

import csv
import io
import math
import tempfile
from pathlib import Path
from typing import Any

import meshio
import numpy as np

from classical.bending import principal_stresses
from fem.results import Result, atomic_write

__all__ = ["VTU_FIELDS", "SECTION_VTU_FIELDS", "PROFILE_COLUMNS", "SECTION_PROFILE_COLUMNS",
           "write_fields", "write_vtu", "write_section_vtu", "write_profiles_csv",
           "profiles_csv_text", "header_with_units", "PRINCIPAL_VTU_FIELDS", "UNITS_OF"]

VTU_FIELDS = {"sigma_xx": "sxx", "sigma_yy": "syy", "tau_xy": "txy",
              "von_mises": "von_mises", "principal_max": "principal_max"}
PROFILE_COLUMNS = ("cut", "x", "y", "tau_fe", "tau_hand", "sigma_x_fe", "sigma_x_hand")
SECTION_PROFILE_COLUMNS = ("line", "offset", "s", "x", "y", "tau_fe", "tau_hand")
SECTION_VTU_FIELDS = ("tau", "tau_zx", "tau_zy", "tau_magnitude")
PRINCIPAL_VTU_FIELDS = ("principal_min", "direction_max", "direction_min")
UNITS_OF = {"x": "length", "y": "length", "s": "length", "offset": "length",
            "tau_fe": "stress", "tau_hand": "stress", "sigma_x_fe": "stress",
            "sigma_x_hand": "stress"}


def header_with_units(columns: tuple[str, ...], units: dict[str, str]) -> list[str]:
    """Column names with their unit in brackets: ``x [mm]``, ``tau_fe [MPa]``."""
    return [f"{c} [{units[UNITS_OF[c]]}]" if c in UNITS_OF else c for c in columns]


def _write_mesh(p: np.ndarray, t: np.ndarray, data: dict[str, np.ndarray], path: Path) -> Path:
    points = np.column_stack([p[0], p[1], np.zeros(p.shape[1])])
    mesh = meshio.Mesh(points, [("triangle", np.asarray(t[:3], np.int64).T)], point_data=data)
    # meshio writes to a path; write beside the target and rename (never half a file)
    path = Path(path)
    with tempfile.TemporaryDirectory(dir=path.parent, prefix=".vtu-") as tmp:
        tmp_path = Path(tmp) / path.name
        meshio.write(tmp_path, mesh, file_format="vtu")
        atomic_write(path, tmp_path.read_bytes())
    return path


def _xyz(v: np.ndarray) -> np.ndarray:
    """(n, 2) planar vectors as (n, 3) with z = 0."""
    v = np.asarray(v, float)
    return np.column_stack([v[:, 0], v[:, 1], np.zeros(len(v))])


def write_vtu(field: Any, path: Path) -> Path:
    """A beam `StressField` (p, t, nodal, displacement) as a VTU file of linear triangles."""
    data = {"displacement": _xyz(np.asarray(field.displacement).T)}
    for name, key in VTU_FIELDS.items():
        data[name] = np.asarray(field.nodal[key], float)
    n = field.nodal
    ps = principal_stresses(n["sxx"], n["syy"], n["txy"])
    theta = np.asarray(ps.angle, float)  # of sigma_1 from x; sigma_2 at 90 degrees to it
    data["principal_min"] = np.asarray(ps.s2, float)
    data["direction_max"] = _xyz(np.column_stack([np.cos(theta), np.sin(theta)]))
    data["direction_min"] = _xyz(np.column_stack([-np.sin(theta), np.cos(theta)]))
    return _write_mesh(np.asarray(field.p, float), field.t, data, path)


def write_section_vtu(check: Any, path: Path) -> Path:
    """The finest `fem.section.level.SectionCheck`'s shear stress field as VTU."""
    sol = check.solution
    tau = sol.nodal(sol.stress(*check.V_solved))  # (nv, 2) [tau_zx, tau_zy]
    data = {"tau": _xyz(tau), "tau_zx": tau[:, 0].copy(), "tau_zy": tau[:, 1].copy(),
            "tau_magnitude": np.linalg.norm(tau, axis=1)}
    m = sol.mesh.finder
    return _write_mesh(np.asarray(m.p, float), m.t, data, path)


def profiles_csv_text(result: Result) -> str:
    """The CSV text of the cut profiles (beam) or the neutral-axis profile (section)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    if result.kind == "section":
        sec = result.section or {}
        w.writerow(header_with_units(SECTION_PROFILE_COLUMNS, result.units))
        lines = [("neutral-axis", sec.get("neutral_axis") or {})]
        lines += [(f"cut-{k}", c) for k, c in enumerate(sec.get("cuts") or [], start=1)]
        for name, ln in lines:
            s = list(ln.get("s", []))
            n = len(s)
            hand = ln.get("tau_hand", [])
            hand = [hand] * n if isinstance(hand, int | float) else list(hand)
            cols = [[ln.get("offset", 0.0)] * n, s, list(ln.get("x", [math.nan] * n)),
                    list(ln.get("y", [math.nan] * n)), list(ln.get("tau_fe", [])), hand]
            for row in zip(*cols, strict=True):
                w.writerow([name, *(f"{float(v):.9g}" for v in row)])
        return buf.getvalue()
    w.writerow(header_with_units(PROFILE_COLUMNS, result.units))
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
    """fields.vtu and profiles.csv of a finished check; return the files written.

    `res.run` is a `fem.member.check.BeamRun` (beam) or the list of `SectionCheck` levels
    (`fem.section.check`); without it (a result built by hand) only profiles.csv is written.
    """
    folder = Path(folder)
    out = []
    if res.case.kind == "beam" and res.run is not None:
        out.append(write_vtu(res.run.finest.field, folder / "fields.vtu"))
    elif res.run is not None and getattr(res.run.finest, "solution", None) is not None:
        out.append(write_section_vtu(res.run.finest, folder / "fields.vtu"))
    out.append(write_profiles_csv(res.result, folder / "profiles.csv"))
    return out
