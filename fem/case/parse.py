"""Case files: TOML in, frozen dataclasses out (the contract in CASE-FORMAT.md).

`load_case(path)` reads and validates every key before anything is meshed; geometric
checks that need the outline (holes inside, patches on the boundary) live in `fem.case.outline`
and run from `validate_geometry`, called here too.
"""

from __future__ import annotations

import re
import tomllib
from dataclasses import replace
from pathlib import Path
from typing import Any

from classical.units import (
    FORCE_UNITS,
    LENGTH_UNITS,
    OUTPUT_STRESS_UNITS,
)
from fem.case.arcs import read_ring
from fem.case.drawing import Drawing, read_drawing
from fem.case.limits import (
    MAX_CUTOUTS,
    MAX_CUTS,
    MAX_FILE_BYTES,
    MAX_HOLES,
    MAX_NESTING,
    MAX_PLACEMENTS,
    MAX_POINTS,
    MAX_REFINE,
    MAX_TITLE,
    MAX_ZONES,
)
from fem.case.model import (
    DISTRIBUTIONS,
    EDGES,
    FIXES,
    MAX_NAME,
    MAX_NU_STRAIN,
    METHODS,
    SCHEMA,
    SECTION_METHODS,
    SECTION_SHAPES,
    BeamGeometry,
    Case,
    Check,
    Cutout,
    Hole,
    Load,
    Material,
    MeshSpec,
    Placement,
    Refine,
    SectionGeometry,
    Support,
    Units,
    Zone,
)
from fem.case.outline import validate_geometry
from fem.case.plates import read_joints, read_plates, validate_planes
from fem.case.project import read_project
from fem.case.reader import Table, line_of
from fem.case.section_rules import validate_section
from fem.case.sizing import check_scale, check_size
from fem.errors import CaseError

__all__ = ["load_case", "parse_case", "decode_case", "read_case_text"]


def _check_nesting(text: str, file: str) -> None:
    """Refuse brackets nested deeper than `MAX_NESTING` before the TOML parser recurses
    into them (strings and comments skipped; a rough count is enough for a limit)."""
    if text.count("[") + text.count("{") <= MAX_NESTING:
        return
    depth = 0
    for line in text.splitlines():
        code = re.sub(r'"(?:[^"\\]|\\.)*"|\'[^\']*\'', "", line).split("#")[0]
        for ch in re.findall(r"[\[\]{}]", code):
            if ch in "[{":
                depth += 1
                if depth > MAX_NESTING:
                    raise CaseError(file, "", f"arrays or tables nested more than "
                                              f"{MAX_NESTING} deep; a case file needs a few")
            elif ch in "]}":
                depth = max(0, depth - 1)


def _at_most(t: Table, key: str, items: Any, limit: int, what: str) -> None:
    """Refuse more than `limit` entries under `key` (a stated limit, fem.case.limits)."""
    if isinstance(items, list | tuple) and len(items) > limit:
        raise t.error(key, f"has {len(items):,} {what}; at most {limit:,} (a stated limit "
                           "that keeps one check within minutes)")


def load_case(path: str | Path) -> Case:
    """Read and validate a case file; raise `CaseError` on anything wrong."""
    return parse_case(read_case_text(path), str(path))


def read_case_text(path: str | Path) -> str:
    """The text of a case file, read with a cap (`MAX_FILE_BYTES`: `/dev/zero` or a huge
    file is refused after a few MB, not read without end); a UTF-8 byte-order mark is
    accepted."""
    path = Path(path)
    name = str(path)
    try:
        with open(path, "rb") as fh:
            raw = fh.read(MAX_FILE_BYTES + 1)
    except FileNotFoundError:
        raise CaseError(name, "", "file not found") from None
    except IsADirectoryError:
        raise CaseError(name, "", "is a folder, not a case file") from None
    except OSError as exc:
        raise CaseError(name, "", f"cannot read the file ({exc.__class__.__name__})") from None
    if len(raw) > MAX_FILE_BYTES:
        raise CaseError(name, "", f"is larger than {MAX_FILE_BYTES // 2**20} MB, the limit "
                                  "for a case file; a case needs a few kB")
    return decode_case(raw, name)


def decode_case(raw: bytes, name: str) -> str:
    """Case file bytes as text: UTF-8, with or without a byte-order mark."""
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise CaseError(name, "", "cannot read the file: it is not UTF-8 text") from None


def parse_case(text: str, file: str = "<case>", folder: str | Path | None = None) -> Case:
    """Parse TOML text into a validated `Case`; a `CaseError` names the line where it can.

    `folder` is where files the case names (`geometry.file`) are found; by default the
    case file's own folder. A sweep point, named after its case.toml in the sweep folder,
    passes the base case's folder."""
    try:
        return _parse(text, file, folder)
    except CaseError as exc:
        if exc.line is not None or not exc.key:
            raise
        line = line_of(text, exc.key)
        if line is None:
            raise
        raise CaseError(exc.file, exc.key, exc.message, line) from None


def _parse(text: str, file: str, folder: str | Path | None = None) -> Case:
    text = text.removeprefix("\ufeff")   # a byte-order mark read as text
    if len(text) > MAX_FILE_BYTES:
        raise CaseError(file, "", f"is larger than {MAX_FILE_BYTES // 2**20} MB, the limit "
                                  "for a case file; a case needs a few kB")
    _check_nesting(text, file)
    try:
        data = tomllib.loads(text)
    except RecursionError:
        raise CaseError(file, "", f"arrays or tables nested too deeply (at most "
                                  f"{MAX_NESTING} levels)") from None
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"line (\d+)", str(exc))
        raise CaseError(file, "", f"not valid TOML: {exc}",
                        line=int(m.group(1)) if m else None) from None
    top = Table(data, file)
    schema = top.number("schema", SCHEMA, integer=True)
    if schema != SCHEMA:
        raise top.error("schema", f"version {schema} is not known; this release reads "
                                  f"schema = {SCHEMA}")
    case_name = top.text("name", pattern=lambda s: re.fullmatch(r"[a-z0-9-]+", s) is not None,
                         describe="use lower-case letters, digits and '-' only")
    if len(case_name) > MAX_NAME:
        raise top.error("name", f"is {len(case_name)} characters long; at most {MAX_NAME} "
                                "(it names the output folder)")
    title = top.text("title", case_name)
    if len(title) > MAX_TITLE:
        raise top.error("title", f"is {len(title):,} characters long; at most {MAX_TITLE} "
                                 "(it heads every report)")
    kind = top.text("kind", allowed=("beam", "section"))
    units = _units(top.table("units", None), top)
    material = _material(top.table("material"), kind)
    mesh = _mesh(top.table("mesh"))
    if mesh.adaptive and kind != "beam":
        raise CaseError(file, "mesh.adaptive", "adaptive refinement is for beam cases; "
                                               "sections refine uniformly")
    check = _check(top.table("check", None), kind)
    if kind == "beam":
        geometry = _beam_geometry(top.table("geometry"), units, folder)
        _at_most(top, "supports", top.data.get("supports"), MAX_PLACEMENTS, "entries")
        _at_most(top, "loads", top.data.get("loads"), MAX_PLACEMENTS, "entries")
        supports = tuple(_support(t) for t in top.tables("supports"))
        loads = tuple(_load(t) for t in top.tables("loads"))
        if not supports:
            raise top.error("supports", "at least one [[supports]] entry is required")
        if not loads:
            raise top.error("loads", "at least one [[loads]] entry is required")
        if all(ld.force == (0.0, 0.0) for ld in loads):
            raise top.error("loads", "every load is zero; give at least one non-zero force")
        shear = (0.0, 0.0)
    else:
        geometry = _section_geometry(top.table("geometry"), units, folder)
        lt = top.table("loads")
        shear = _force(lt, "shear")
        lt.close()
        if shear == (0.0, 0.0):
            raise lt.error("shear", "is zero; give a non-zero [Vx, Vy]")
        supports, loads = (), ()
    project = read_project(top)  # the optional title block
    top.close()
    case = Case(name=case_name, title=title, kind=kind, units=units, material=material,
                geometry=geometry, mesh=mesh, check=check, supports=supports, loads=loads,
                shear=shear, file=file, schema=schema, project=project, text=text)
    case = _working_forces(case)
    check_scale(case)
    if kind == "beam":
        validate_geometry(case)
        validate_planes(case)
    else:
        validate_section(case)
    check_size(case)
    return case


def _units(t: Table | None, top: Table) -> Units:
    if t is None:
        return Units()
    u = Units(length=t.text("length", "mm", allowed=tuple(LENGTH_UNITS)),
              force=t.text("force", "N", allowed=tuple(FORCE_UNITS)))
    name = t.text("stress", None, allowed=tuple(OUTPUT_STRESS_UNITS))
    if name is not None:
        u = replace(u, stress_name=name)
    t.close()
    return u


def _working_forces(case: Case) -> Case:
    """The case with every force of the file (loads, the section's shear, fastener
    capacities) in working units: stress unit × length² (`Units.force_scale`), so the
    mechanics needs no unit factor; the reports divide by it again (`Units.user_force`)."""
    c = case.units.force_scale
    if c == 1.0:
        return case
    loads = tuple(replace(ld, force=(ld.force[0] * c, ld.force[1] * c)) for ld in case.loads)
    joints = tuple(replace(j, capacity=None if j.capacity is None else j.capacity * c)
                   for j in case.check.joints)
    return replace(case, loads=loads, shear=(case.shear[0] * c, case.shear[1] * c),
                   check=replace(case.check, joints=joints))


def _material(t: Table, kind: str) -> Material:
    E = t.number("E", low=0.0, low_open=True)
    nu = t.number("nu", low=-1.0, high=0.5, low_open=True, high_open=True)
    if kind == "beam":
        thickness = t.number("thickness", low=0.0, low_open=True)
        model = t.text("model", "plane-stress", allowed=("plane-stress", "plane-strain"))
        if model == "plane-strain" and nu > MAX_NU_STRAIN:
            raise t.error("nu", f"{nu:g} is nearly incompressible in plane strain: the "
                                "displacement elements lock and the stiffness is ill-"
                                f"conditioned; use nu <= {MAX_NU_STRAIN:g}")
    else:
        thickness = t.number("thickness", 1.0, low=0.0, low_open=True)
        model = "section"
    ys = t.number("yield", None, low=0.0, low_open=True)
    t.close()
    return Material(E=E, nu=nu, thickness=thickness, model=model, yield_stress=ys)


def _mesh(t: Table) -> MeshSpec:
    size = t.number("size", low=0.0, low_open=True)
    order = t.number("order", 2, integer=True)
    if order not in (1, 2):
        raise t.error("order", f"must be 1 or 2, got {order}")
    levels = t.number("levels", 1, integer=True, low=1, high=8)
    max_dofs = t.number("max_dofs", 2_000_000, integer=True, low=1)
    adaptive = t.flag("adaptive", False)
    refine = []
    _at_most(t, "refine", t.data.get("refine"), MAX_REFINE, "entries")
    for r in t.tables("refine"):
        refine.append(Refine(at=r.point("at"), radius=r.number("radius", low=0.0, low_open=True),
                             size=r.number("size", low=0.0, low_open=True)))
        r.close()
    t.close()
    return MeshSpec(size=size, order=order, levels=levels, max_dofs=max_dofs,
                    refine=tuple(refine), adaptive=adaptive)


def _check(t: Table | None, kind: str) -> Check:
    beam = kind == "beam"
    if t is None:
        return Check() if beam else Check(method="auto")
    method = t.text("method", "shear-formula" if beam else "auto",
                    allowed=METHODS if beam else SECTION_METHODS)
    cuts = t.numbers("cuts", None) if kind == "beam" else None
    if cuts is not None and not cuts:
        raise t.error("cuts", "is empty; leave it out for the automatic set")
    if cuts is not None:
        _at_most(t, "cuts", cuts, MAX_CUTS, "stations")
        cuts = _distinct_cuts(t, cuts)
    tol = t.number("tolerance", 0.05, low=0.0, high=1.0)
    hv = t.number("hand_value", None, low=0.0, low_open=True)
    joints = read_joints(t) if kind == "section" else ()
    planes = t.numbers("planes", ()) if beam else ()
    t.close()
    return Check(method=method, cuts=cuts, tolerance=tol, hand_value=hv, joints=joints,
                 planes=planes)


def _distinct_cuts(t: Table, cuts: tuple[float, ...]) -> tuple[float, ...]:
    """Refuse a station given twice (or within round-off of another): it would be reported
    twice as if it were two checks."""
    scale = max(abs(x) for x in cuts) or 1.0
    order = sorted(range(len(cuts)), key=lambda i: cuts[i])
    for a, b in zip(order[:-1], order[1:], strict=True):
        if cuts[b] - cuts[a] <= 1e-9 * scale:
            raise t.error(f"cuts.{b}", f"{cuts[b]:g} is given twice (also cuts.{a}); give "
                                       "each station once")
    return cuts


def _beam_geometry(t: Table, units: Units, folder: str | Path | None = None) -> BeamGeometry:
    shape = t.text("shape", allowed=("rectangle", "polygon", "drawing"))
    length = depth = 0.0
    points: tuple[tuple[float, float], ...] = ()
    bulges: tuple[float, ...] = ()
    source = ""
    holes = []
    openings = _openings(t)
    if shape == "rectangle":
        length = t.number("length", low=0.0, low_open=True)
        depth = t.number("depth", low=0.0, low_open=True)
    else:
        if shape == "drawing":
            d = _drawing(t, units, folder)
            ring, source = d.outline, d.source
            holes = [Hole(center=(x, y), radius=r) for x, y, r in d.circles]
            openings = d.openings + openings
        else:
            raw = t.raw("points")
            if isinstance(raw, list):
                _at_most(t, "points", raw, MAX_POINTS, "points")
            ring = read_ring(raw, t.file, t.key("points"))
        points = tuple((x, y) for x, y, _ in ring)
        bulges = tuple(b for _, _, b in ring) if any(b for _, _, b in ring) else ()
        for i in range(1, len(points)):
            if points[i] == points[i - 1]:
                raise t.error(f"points.{i}", f"{list(points[i])} repeats the point before it; "
                                             "give each corner once")
    _at_most(t, "holes", t.data.get("holes"), MAX_HOLES, "holes")
    _at_most(t, "cutouts", t.data.get("cutouts"), MAX_CUTOUTS, "cut-outs")
    _at_most(t, "zones", t.data.get("zones"), MAX_ZONES, "zones")
    for h in t.tables("holes"):
        holes.append(Hole(center=h.point("center"),
                          radius=h.number("radius", low=0.0, low_open=True)))
        h.close()
    cutouts = []
    for c in t.tables("cutouts"):
        size = c.point("size")
        if min(size) <= 0:
            raise c.error("size", f"width and height must be > 0, got {list(size)}")
        fillet = c.number("fillet", 0.0, low=0.0)
        if fillet > 0 and fillet >= 0.5 * min(size):
            raise c.error("fillet", f"{fillet:g} must be smaller than half the cut-out's "
                                    f"smaller side ({0.5 * min(size):g})")
        cutouts.append(Cutout(corner=c.point("corner"), size=size, fillet=fillet))
        c.close()
    zones = []
    for z in t.tables("zones"):
        size = z.point("size")
        if min(size) <= 0:
            raise z.error("size", f"width and height must be > 0, got {list(size)}")
        zones.append(Zone(corner=z.point("corner"), size=size,
                          thickness=z.number("thickness", low=0.0, low_open=True)))
        z.close()
    t.close()
    return BeamGeometry(shape=shape, length=length, depth=depth, points=points,
                        holes=tuple(holes), cutouts=tuple(cutouts), zones=tuple(zones),
                        bulges=bulges, openings=openings, drawing=source)


def _drawing(t: Table, units: Units, folder: str | Path | None = None) -> Drawing:
    """geometry.file (relative to `folder`, by default the case file's folder) and the
    optional layer."""
    name = t.text("file")
    layer = t.text("layer", None)
    if folder is None:
        folder = Path(t.file).parent if t.file and not t.file.startswith("<") else Path(".")
    return read_drawing(Path(folder) / name, name, layer, units.length, t.file)


def _openings(t: Table) -> tuple[tuple[tuple[float, float, float], ...], ...]:
    """geometry.openings: holes of any outline, each a ring of [x, y(, bulge)] vertices."""
    raw = t.raw("openings", [])
    if not isinstance(raw, list):
        raise t.error("openings", "must be a list of rings, each a list of [x, y] or "
                                  "[x, y, bulge] vertices")
    return tuple(read_ring(r, t.file, f"{t.key('openings')}.{j}") for j, r in enumerate(raw))


def _placement(t: Table, allow_hole: bool) -> Placement:
    given = [k for k in ("edge", "from", "at", "hole") if t.has(k)]
    if t.has("to") and not t.has("from"):
        raise t.error("to", "needs a matching 'from'")
    if len(given) != 1 or (given == ["hole"] and not allow_hole):
        ways = "edge | from/to | at + width" + (" | hole" if allow_hole else "")
        raise CaseError(t.file, t.path, f"give exactly one placement ({ways}); got "
                                        f"{', '.join(given) or 'none'}")
    how = given[0]
    if how == "edge":
        return Placement(edge=t.text("edge", allowed=EDGES))
    if how == "from":
        start, end = t.point("from"), t.point("to")
        if start == end:
            raise t.error("to", "equals 'from'; a stretch needs two different points")
        return Placement(start=start, end=end)
    if how == "at":
        return Placement(at=t.point("at"), width=t.number("width", 0.0, low=0.0))
    return Placement(hole=t.number("hole", integer=True, low=0))


def _support(t: Table) -> Support:
    s = Support(where=_placement(t, allow_hole=False), fix=t.text("fix", allowed=FIXES),
                key=t.path)
    t.close()
    return s


def _load(t: Table) -> Load:
    where = _placement(t, allow_hole=True)
    force = _force(t, "force")
    dist = t.text("distribution", "cosine" if where.hole is not None else "uniform",
                  allowed=DISTRIBUTIONS)
    if where.hole is not None and dist != "cosine":
        raise t.error("distribution", "a pin load on a hole uses 'cosine'")
    if where.hole is None and dist == "cosine":
        raise t.error("distribution", "'cosine' is for a pin load on a hole (hole = N)")
    if where.is_point and dist == "parabolic":
        raise t.error("distribution", "a point load (width 0) has no distribution; "
                                      "give a width")
    t.close()
    return Load(where=where, force=force, distribution=dist, key=t.path)


MIN_FORCE = 1e-30  # smaller non-zero force components are round-off, not loads


def _force(t: Table, key: str) -> tuple[float, float]:
    """A force pair [Fx, Fy]; components are 0 or at least MIN_FORCE in magnitude."""
    f = t.point(key)
    if any(0.0 < abs(v) < MIN_FORCE for v in f):
        raise t.error(key, f"{list(f)}: a non-zero component must be at least {MIN_FORCE:g} "
                           "in magnitude (smaller is round-off); use 0 for none")
    return f


def _section_geometry(t: Table, units: Units,
                      folder: str | Path | None = None) -> SectionGeometry:
    shape = t.text("shape", allowed=(*SECTION_SHAPES, "drawing"))
    if shape == "drawing":   # a drawn section is a polygon of arcs and lines, with holes
        d = _drawing(t, units, folder)
        t.close()
        holes = [_vertices(o) for o in d.openings]
        holes += [[(x + r, y, 1.0), (x - r, y, 1.0)] for x, y, r in d.circles]
        return SectionGeometry(shape="polygon", params={"points": _vertices(d.outline),
                                                        "holes": holes})
    required, optional = SECTION_SHAPES[shape]
    params: dict[str, Any] = {}
    for k in required + optional:
        if k not in required and not t.has(k):
            continue
        if k == "plates":
            params[k] = read_plates(t)
        elif k in ("points", "holes"):
            params[k] = _rings(t, k)
        else:
            params[k] = t.number(k, low=0.0, low_open=(k != "root_radius"))
    t.close()
    return SectionGeometry(shape=shape, params=params)


def _rings(t: Table, k: str) -> Any:
    raw = t.raw(k)
    if k == "points":
        if isinstance(raw, list):
            _at_most(t, k, raw, MAX_POINTS, "points")
        return _vertices(read_ring(raw, t.file, t.key(k)))
    if not isinstance(raw, list):
        raise t.error(k, "must be a list of rings, each a list of [x, y] or [x, y, bulge] "
                         "vertices")
    _at_most(t, k, raw, MAX_HOLES, "holes")
    outer = t.data.get("points")
    total = sum(len(r) for r in raw if isinstance(r, list)) + (
        len(outer) if isinstance(outer, list) else 0)
    if total > MAX_POINTS:
        raise t.error(k, f"the outline and its holes have {total:,} points together; at most "
                         f"{MAX_POINTS:,} (a stated limit that keeps one check within "
                         "minutes)")
    return [_vertices(read_ring(r, t.file, f"{t.key(k)}.{j}")) for j, r in enumerate(raw)]


def _vertices(ring: tuple[tuple[float, float, float], ...]) -> list[tuple[float, ...]]:
    """Section vertices: (x, y) where straight, (x, y, bulge) where an arc starts."""
    return [(x, y, b) if b else (x, y) for x, y, b in ring]
