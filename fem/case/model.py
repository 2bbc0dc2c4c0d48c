"""What a case file describes: frozen dataclasses (the contract in CASE-FORMAT.md).

Nothing here reads files or validates: `fem.case.parse` builds these from TOML and checks
every key; `fem.case.outline` and `fem.case.section_rules` check the geometry.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Any

from classical.units import force_scale, stress_unit
from fem.case.project import Project

__all__ = [
    "Case", "Units", "Material", "Hole", "Cutout", "Zone", "Placement", "Support", "Load",
    "Refine", "MeshSpec", "Check", "Joint", "BeamGeometry", "SectionGeometry", "SCHEMA", "EDGES",
    "METHODS", "SECTION_METHODS", "THIN_WALL_SHAPES", "SECTION_SHAPES", "FIXES",
    "DISTRIBUTIONS", "MAX_NAME", "MAX_NU_STRAIN",
]

SCHEMA = 1
MAX_NAME = 64  # characters in a case name (it becomes a folder name)
MAX_NU_STRAIN = 0.499  # plane strain above this: volumetric locking, ill-conditioned stiffness
EDGES = ("left", "right", "top", "bottom")
METHODS = ("shear-formula", "average", "single-shear", "double-shear")
# sections: "auto" (the default) picks thin-wall or shear-formula (fem.section.hand_method)
SECTION_METHODS = ("auto", "shear-formula", "thin-wall", "average", "single-shear",
                   "double-shear")
THIN_WALL_SHAPES = ("i", "channel", "tee", "angle", "tube", "box")  # with a centre-line model
FIXES = ("xy", "x", "y")
DISTRIBUTIONS = ("uniform", "parabolic", "cosine")
SECTION_SHAPES: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {
    # shape: (required parameters, optional parameters)
    "rectangle": (("width", "depth"), ()),
    "circle": (("diameter",), ()),
    "tube": (("diameter", "wall"), ()),
    "box": (("width", "depth", "wall"), ()),
    "i": (("depth", "flange_width", "flange_thickness", "web_thickness"), ("root_radius",)),
    "channel": (("depth", "flange_width", "flange_thickness", "web_thickness"),
                ("root_radius",)),
    "tee": (("depth", "flange_width", "flange_thickness", "web_thickness"), ("root_radius",)),
    "angle": (("leg_x", "leg_y", "thickness"), ()),
    "polygon": (("points",), ("holes",)),
    "built-up": (("plates",), ()),  # [[geometry.plates]], unioned (fem.case.plates)
}


@dataclass(frozen=True)
class Units:
    """Length, force and stress units of the case.

    ``stress_name`` is the optional ``[units] stress`` key; without it the stress unit is
    force/length² (N & mm → MPa). Every stress of the case file (E, yield, hand_value) and
    of the outputs is in `stress`; every force (loads, shear, capacities) is read and
    reported in `force`.

    Inside, a case is computed in consistent working units: lengths in `length`, stresses
    in `stress`, forces in stress × length² (`classical.units.force_scale`). `fem.case.parse`
    multiplies every force of the file by `force_scale` on reading, so the mechanics never
    sees a unit factor; whatever reports a force divides by it again (`user_force`). With
    the default stress unit `force_scale` is exactly 1.
    """

    length: str = "mm"
    force: str = "N"
    stress_name: str | None = None

    @property
    def stress(self) -> str:
        return self.stress_name or stress_unit(self.length, self.force)

    @property
    def force_scale(self) -> float:
        """Working force units per unit of `force` (1 unless [units] stress says so)."""
        return force_scale(self.length, self.force, self.stress)

    def user_force(self, value: float) -> float:
        """A force, moment (force × length) or shear flow (force / length) of the working
        units in the case's `force` unit."""
        c = self.force_scale
        return value if c == 1.0 else value / c


@dataclass(frozen=True)
class Material:
    E: float
    nu: float
    thickness: float = 1.0
    model: str = "plane-stress"
    yield_stress: float | None = None


@dataclass(frozen=True)
class Hole:
    center: tuple[float, float]
    radius: float


@dataclass(frozen=True)
class Cutout:
    corner: tuple[float, float]
    size: tuple[float, float]
    fillet: float = 0.0


@dataclass(frozen=True)
class Zone:
    corner: tuple[float, float]
    size: tuple[float, float]
    thickness: float


@dataclass(frozen=True)
class Placement:
    """Where a support or load acts: exactly one of edge, start/end, at(+width), hole."""

    edge: str | None = None
    start: tuple[float, float] | None = None
    end: tuple[float, float] | None = None
    at: tuple[float, float] | None = None
    width: float = 0.0
    hole: int | None = None

    @property
    def is_point(self) -> bool:
        return self.at is not None and self.width == 0.0


@dataclass(frozen=True)
class Support:
    where: Placement
    fix: str
    key: str = ""


@dataclass(frozen=True)
class Load:
    where: Placement
    force: tuple[float, float]
    distribution: str = "uniform"
    key: str = ""


@dataclass(frozen=True)
class Refine:
    at: tuple[float, float]
    radius: float
    size: float


@dataclass(frozen=True)
class MeshSpec:
    size: float
    order: int = 2
    levels: int = 1
    max_dofs: int = 2_000_000
    refine: tuple[Refine, ...] = ()
    adaptive: bool = False   # levels after the first refined by the error estimate (beams)


@dataclass(frozen=True)
class Joint:
    """A straight joint line across a section (weld throat, bolt row, glue line).

    ``capacity`` is per fastener [force], ``spacing`` along the member [length],
    ``throat`` the weld throat [length] of each of ``welds`` welds.
    """

    name: str
    start: tuple[float, float]
    end: tuple[float, float]
    capacity: float | None = None
    spacing: float | None = None
    throat: float | None = None
    welds: int = 1
    key: str = ""


@dataclass(frozen=True)
class Check:
    method: str = "shear-formula"
    cuts: tuple[float, ...] | None = None
    tolerance: float = 0.05
    hand_value: float | None = None
    joints: tuple[Joint, ...] = ()   # sections: [[check.joints]] (fem.case.plates)
    planes: tuple[float, ...] = ()   # beams: horizontal planes y (fem.member.planes)


@dataclass(frozen=True)
class BeamGeometry:
    shape: str
    length: float = 0.0
    depth: float = 0.0
    points: tuple[tuple[float, float], ...] = ()
    holes: tuple[Hole, ...] = ()
    cutouts: tuple[Cutout, ...] = ()
    zones: tuple[Zone, ...] = ()
    # arcs (fem.case.arcs): bulges[k] for the edge from points[k] to the next (empty: all
    # straight); openings: holes of any outline, rings of (x, y, bulge); drawing: the DXF
    # file (and layer) the outline was read from, for the reports
    bulges: tuple[float, ...] = ()
    openings: tuple[tuple[tuple[float, float, float], ...], ...] = ()
    drawing: str = ""

    @property
    def ring(self) -> tuple[tuple[float, float, float], ...]:
        """The outline as vertices (x, y, bulge) (polygon and drawing shapes)."""
        b = self.bulges or (0.0,) * len(self.points)
        return tuple((x, y, bk) for (x, y), bk in zip(self.points, b, strict=True))


@dataclass(frozen=True)
class SectionGeometry:
    shape: str
    params: dict[str, Any] = field(default_factory=dict)


@dataclass(frozen=True)
class Case:
    name: str
    title: str
    kind: str
    units: Units
    material: Material
    geometry: BeamGeometry | SectionGeometry
    mesh: MeshSpec
    check: Check
    supports: tuple[Support, ...] = ()
    loads: tuple[Load, ...] = ()
    shear: tuple[float, float] = (0.0, 0.0)
    file: str = "<case>"
    schema: int = SCHEMA
    project: Project | None = None   # the optional [project] title block (fem.case.project)
    text: str = field(default="", repr=False, compare=False)  # the case file as read

    @property
    def beam(self) -> BeamGeometry:
        """The member's geometry, for code that only runs on beam cases."""
        if not isinstance(self.geometry, BeamGeometry):
            raise TypeError(f"{self.name}: a {self.kind} case has no member geometry")
        return self.geometry

    @property
    def section(self) -> SectionGeometry:
        """The cross-section's geometry, for code that only runs on section cases."""
        if not isinstance(self.geometry, SectionGeometry):
            raise TypeError(f"{self.name}: a {self.kind} case has no section geometry")
        return self.geometry

    def with_mesh(self, **changes: Any) -> Case:
        return replace(self, mesh=replace(self.mesh, **changes))
