"""Result dataclasses and the one place they become results.json (written atomically).

The field names are the contract's (CASE-FORMAT.md); extras are additions the contract
allows. `write_json` writes to a temporary file in the same folder and renames it over
the old one, so a crash never leaves half a file and a complete earlier result survives
until a complete new one replaces it.
"""

from __future__ import annotations

import json
import math
import os
import tempfile
from dataclasses import asdict, dataclass, field, is_dataclass
from pathlib import Path
from typing import Any

import numpy as np

__all__ = [
    "MeshInfo", "Equilibrium", "Profile", "CutResult", "Peak", "ConvergenceResult",
    "Finding", "Timings", "EnvelopePoint", "Envelope", "Result", "write_json", "to_jsonable",
    "CAUTION", "atomic_write", "significant", "forces_to_case_unit",
]

CAUTION = ("This is a verification aid. Design remains subject to the governing code and the "
           "judgement of a licensed engineer.")


@dataclass
class MeshInfo:
    nodes: int
    elements: int
    dofs: int
    size: float
    order: int
    curved: bool = False
    # the solver that produced the finest level's answer: "pardiso" (MKL), "superlu" or
    # "amg-cg" (fem.linear_solver); iterations: its CG iterations (0 for a direct solve)
    solver: str = "superlu"
    iterations: int = 0
    # every solver tried on the finest level, in order, the answer's last: {"solver",
    # "outcome", "iterations", "residual", "seconds", "note"} (fem.linear_solver.Attempt)
    solve_attempts: list[dict] = field(default_factory=list)


@dataclass
class Equilibrium:
    applied: list[float]
    reactions: list[float]
    relative_error: float


@dataclass
class Profile:
    y: list[float]
    tau_fe: list[float]
    tau_hand: list[float]
    sigma_x_fe: list[float] = field(default_factory=list)
    sigma_x_hand: list[float] = field(default_factory=list)


@dataclass
class CutResult:
    x: float
    V_fe: float
    V_hand: float
    M_fe: float
    M_hand: float
    tau_max_fe: float
    y_at_tau_max_fe: float
    tau_max_hand: float
    tau_avg_hand: float
    ratio: float
    sigma_x_max_fe: float
    sigma_x_max_hand: float
    profile: Profile
    N_fe: float = 0.0
    N_hand: float = 0.0
    A: float = 0.0
    I: float = 0.0  # noqa: E741  (second moment of area, the trade name)
    centroid_y: float = 0.0
    tau_formula_hand: float = 0.0
    von_mises_max_fe: float = 0.0
    von_mises_max_hand: float = 0.0


@dataclass
class Peak:
    tau_max: float
    tau_at: list[float]
    von_mises_max: float
    von_mises_at: list[float]
    principal_max: float
    principal_at: list[float]


@dataclass
class ConvergenceResult:
    sizes: list[float]
    tau_max: list[float]
    observed_order: float | None
    extrapolated: float | None
    gci: float | None
    singular: bool
    converged: bool = True
    quantity: str = ""
    dofs: list[int] = field(default_factory=list)
    quantities: dict[str, dict[str, Any]] = field(default_factory=dict)


@dataclass
class Finding:
    kind: str
    at: list[float]
    ratio: float | None
    message: str


@dataclass
class Timings:
    mesh: float = 0.0
    assemble: float = 0.0
    solve: float = 0.0
    post: float = 0.0


@dataclass
class EnvelopePoint:
    """One station of the envelope: where FE and hand were compared and what they gave."""

    x: float
    ratio: float
    tau_fe: float
    tau_hand: float
    y: float = 0.0   # height of the FE peak |tau_xy| in that section


@dataclass
class Envelope:
    """FE peak |tau_xy| against the hand value at stations all along the member.

    Lists run over the stations `x`; `None` where a section lies wholly in an excluded zone
    (`tau_fe`, `ratio`) or the hand shear vanishes (`ratio`). `excluded` and `unsafe` are
    [x0, x1] stretches: excluded idealisation zones, and ratio > 1 + tolerance.
    """

    x: list[float]
    tau_fe: list[float | None]
    tau_hand: list[float | None]
    ratio: list[float | None]
    worst: EnvelopePoint | None
    excluded: list[list[float]] = field(default_factory=list)
    unsafe: list[list[float]] = field(default_factory=list)
    tolerance: float = 0.05


@dataclass
class Result:
    case: str
    kind: str
    title: str
    units: dict[str, str]
    mesh: MeshInfo | None
    verdict: str
    findings: list[Finding]
    timings: Timings
    convergence: ConvergenceResult | None
    cuts: list[CutResult] | None = None
    peak: Peak | None = None
    equilibrium: Equilibrium | None = None
    section: dict[str, Any] | None = None
    hand_method: str = "shear-formula"
    tolerance: float = 0.05
    hand_calculation: list[str] = field(default_factory=list)
    caution: str = CAUTION
    schema: int = 1
    envelope: Envelope | None = None
    joints: list[dict[str, Any]] | None = None   # sections with joint lines (fem.section.joints)
    planes: list[dict[str, Any]] | None = None   # beams with check.planes (fem.member.planes)
    provenance: dict[str, Any] | None = None   # fem.provenance: versions, case hash, time
    project: dict[str, str] | None = None      # the [project] title block as given
    deflection: dict[str, Any] | None = None   # informative: FE and hand displacements
    pdf_skipped: str | None = None             # why report.pdf was not written, if it wasn't

    def to_dict(self) -> dict[str, Any]:
        d = to_jsonable(self)
        if self.kind == "section":
            d.pop("cuts", None)
            d.pop("peak", None)
            d.pop("equilibrium", None)
        else:
            d.pop("section", None)
        if self.kind == "section" or self.envelope is None:
            d.pop("envelope", None)  # no key rather than null: outputs stay as they were
        if self.joints is None:
            d.pop("joints", None)
        if self.planes is None:
            d.pop("planes", None)
        for key in ("provenance", "project", "deflection", "pdf_skipped"):
            if d.get(key) is None:
                d.pop(key, None)
        return d


_CUT_FORCES = ("V_fe", "V_hand", "M_fe", "M_hand", "N_fe", "N_hand")
_SECTION_FORCES = ("V", "V_solved", "GJ", "torsion_stress_per_torque")
_JOINT_FORCES = ("q_hand", "q_fe", "q_fe_line", "capacity", "demand")
_PLANE_FORCES = ("q_fe", "q_hand", "total_fe")


def _scaled(v: Any, k: float) -> Any:
    if v is None:
        return None
    if isinstance(v, list | tuple):
        return [_scaled(w, k) for w in v]
    return v * k


def forces_to_case_unit(result: Result, scale: float) -> None:
    """Turn, in place, every force-valued field of a finished `result` from the working
    force unit into the case's force unit (`fem.case.model.Units`).

    A case is computed with forces in stress unit × length² so that stresses come out in
    the case's stress unit with no factor; `scale` is that unit's size in case force units
    per working unit (1 / `Units.force_scale`). Forces, moments (force × length) and shear
    flows (force / length) take the factor; the torsion stress per unit torque takes
    its inverse. Stresses, lengths and ratios are untouched. With scale 1 nothing changes.
    """
    if scale == 1.0:
        return
    for c in result.cuts or []:
        for name in _CUT_FORCES:
            setattr(c, name, _scaled(getattr(c, name), scale))
    if result.equilibrium is not None:
        e = result.equilibrium
        e.applied, e.reactions = _scaled(e.applied, scale), _scaled(e.reactions, scale)
    sec = result.section
    if sec is not None:
        for name in _SECTION_FORCES:
            if name in sec:
                per = 1.0 / scale if name == "torsion_stress_per_torque" else scale
                sec[name] = _scaled(sec[name], per)
        if "resultant" in sec:
            sec["resultant"] = {k: _scaled(v, scale) if k != "relative_error" else v
                                for k, v in sec["resultant"].items()}
    for j in result.joints or []:
        for name in _JOINT_FORCES:
            if name in j:
                j[name] = _scaled(j[name], scale)
    for p in result.planes or []:
        for name in _PLANE_FORCES:
            if name in p:
                p[name] = _scaled(p[name], scale)
    if result.convergence is not None:
        for name, q in result.convergence.quantities.items():
            if name.endswith(" q_fe"):   # a joint's shear flow, tracked over the levels
                for key in ("values", "extrapolated"):
                    if key in q:
                        q[key] = _scaled(q[key], scale)


def significant(v: float, digits: int = 6) -> float:
    """`v` kept to `digits` significant figures: how ratios and stations are reported."""
    return float(f"{v:.{digits}g}")


def to_jsonable(obj: Any) -> Any:
    """Dataclasses, numpy values and non-finite floats into plain JSON values."""
    if is_dataclass(obj) and not isinstance(obj, type):
        return {k: to_jsonable(v) for k, v in asdict(obj).items()}
    if isinstance(obj, dict):
        return {str(k): to_jsonable(v) for k, v in obj.items()}
    if isinstance(obj, list | tuple):
        return [to_jsonable(v) for v in obj]
    if isinstance(obj, np.ndarray):
        return [to_jsonable(v) for v in obj.tolist()]
    if isinstance(obj, np.bool_ | bool):
        return bool(obj)
    if isinstance(obj, np.integer):
        return int(obj)
    if isinstance(obj, float | np.floating):
        v = float(obj)
        return v if math.isfinite(v) else None
    return obj


def atomic_write(path: Path, data: bytes) -> None:
    """Write bytes to `path` via a temporary file in the same folder and a rename."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    umask = os.umask(0)
    os.umask(umask)
    try:
        os.chmod(tmp, 0o666 & ~umask)  # mkstemp makes 0600; results are for everyone to read
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def write_json(result: Result | dict[str, Any], path: Path) -> Path:
    d = result.to_dict() if isinstance(result, Result) else to_jsonable(result)
    atomic_write(Path(path), json.dumps(d, indent=1, allow_nan=False).encode("utf-8"))
    return Path(path)
