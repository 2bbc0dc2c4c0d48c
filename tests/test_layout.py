"""The layout of `fem/`: every import points down the floors, and no module imports itself
back through others (issue: the house).

Floors, lowest first (a module may import its own floor's modules and any lower floor):

0. core: `fem.errors`, `fem.progress`, `fem.results`, `fem.convergence`, `fem.verdict`,
   `fem.output_folder`, `fem.gmsh_session`, `fem.linear_solver` (anything directly under
   `fem/` but the entry points)
1. `fem.case`      the case file in
2. `fem.member`, `fem.section`   the two kinds (neither imports the other)
3. `fem.report`    figures, field files, the design note
4. `fem.api`       the Python entry point
5. `fem.study`     regression suite and sweeps (run checks through `fem.api`)
6. `fem.cli`, `fem` (the package itself)

Every import counts, at module level or inside a function; imports under
``if TYPE_CHECKING:`` count too, except that they may point up (they never run).
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

FEM = Path(__file__).resolve().parents[1] / "fem"
FLOORS = {"case": 1, "member": 2, "section": 2, "report": 3, "api": 4, "study": 5, "cli": 6}
PACKAGE_FLOOR = 6   # fem/__init__.py re-exports the API


def module_name(path: Path) -> str:
    parts = path.relative_to(FEM.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def floor_of(name: str) -> tuple[int, str]:
    """(floor, room) of a dotted fem module name; room tells member from section."""
    parts = name.split(".")
    if len(parts) == 1:
        return PACKAGE_FLOOR, "fem"
    room = parts[1]
    return FLOORS.get(room, 0), room


def _type_checking_lines(tree: ast.Module) -> set[int]:
    lines: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            for sub in node.body:
                lines.update(range(sub.lineno, (sub.end_lineno or sub.lineno) + 1))
    return lines


def fem_imports(path: Path) -> list[tuple[str, int, bool]]:
    """(imported fem module, line, only for type checking) for every import in `path`."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    here = module_name(path)
    package = here if path.name == "__init__.py" else here.rsplit(".", 1)[0]
    typing_only = _type_checking_lines(tree)
    out = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names = [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package.split(".")
                base = base[: len(base) - node.level + 1]
                mod = ".".join(base + ([node.module] if node.module else []))
            else:
                mod = node.module or ""
            # `from fem.report import member_figures` imports the submodule
            names = [f"{mod}.{a.name}" if (FEM.parent / f"{mod}.{a.name}".replace(".", "/")
                                           ).with_suffix(".py").exists() else mod
                     for a in node.names]
        else:
            continue
        for n in names:
            if n == "fem" or n.startswith("fem."):
                out.append((n, node.lineno, node.lineno in typing_only))
    return out


def all_modules() -> dict[str, Path]:
    return {module_name(p): p for p in sorted(FEM.rglob("*.py"))}


def test_every_module_has_a_floor():
    """A new folder under fem/ must be given its floor here, not fall to the core."""
    rooms = {p.name for p in FEM.iterdir() if p.is_dir() and (p / "__init__.py").exists()}
    assert rooms <= set(FLOORS), f"folders without a floor: {sorted(rooms - set(FLOORS))}"


@pytest.mark.parametrize("name", sorted(all_modules()))
def test_imports_point_down(name):
    """No import of a higher floor, nor across between the two kinds."""
    mods = all_modules()
    f_here, room_here = floor_of(name)
    bad = []
    for target, line, typing_only in fem_imports(mods[name]):
        if typing_only:
            continue
        f_to, room_to = floor_of(target)
        if f_to > f_here or (f_to == f_here == 2 and room_to != room_here):
            bad.append(f"line {line}: {target} (floor {f_to} from floor {f_here})")
    assert not bad, f"{name} imports upward: " + "; ".join(bad)


def test_no_import_circles():
    """The module graph (every import, also inside functions) has no cycle."""
    mods = all_modules()
    graph = {m: {t for t, _, typing_only in fem_imports(p) if not typing_only and t in mods
                 and t != m} for m, p in mods.items()}
    # a package's __init__ is run by importing any of its submodules: not an edge of ours
    graph = {m: {t for t in ts if not m.startswith(t + ".") and t != "fem"}
             for m, ts in graph.items()}
    state: dict[str, int] = {}
    stack: list[str] = []

    def visit(m: str) -> list[str] | None:
        state[m] = 1
        stack.append(m)
        for t in sorted(graph[m]):
            if state.get(t) == 1:
                return stack[stack.index(t):] + [t]
            if t not in state and (cyc := visit(t)):
                return cyc
        stack.pop()
        state[m] = 2
        return None

    for m in sorted(graph):
        if m not in state and (cyc := visit(m)):
            pytest.fail("import circle: " + " -> ".join(cyc))


def test_the_checker_catches_an_upward_import(tmp_path):
    """The rule itself: an import of fem.report from a member module is reported upward."""
    assert floor_of("fem.report.note") > floor_of("fem.member.check")
    assert floor_of("fem.member.check")[0] == floor_of("fem.section.check")[0]
    assert floor_of("fem.results")[0] == 0 and floor_of("fem")[0] == PACKAGE_FLOOR
    assert floor_of("fem.linear_solver")[0] == 0   # both kinds solve through it


def test_the_installed_package_holds_every_sub_package():
    """A plain (non-editable) install must carry every folder of fem/: the package list in
    pyproject.toml is found by pattern, and each package folder matches it."""
    import fnmatch
    import tomllib

    conf = tomllib.loads((FEM.parent / "pyproject.toml").read_text(encoding="utf-8"))
    include = conf["tool"]["setuptools"]["packages"]["find"]["include"]
    for init in FEM.rglob("__init__.py"):
        name = module_name(init)
        assert any(fnmatch.fnmatch(name, pat) for pat in include), f"{name} not installed"
