"""Hostile input: a corpus of bad case files through the real CLI, and the guards behind it.

`tests/bad_cases/` holds one small TOML per bad case and `expected.toml` with, for each, the
exit code and the message fragments the one line on stderr must contain. The corpus runs
through `fem.cli.main` exactly as `python -m fem.cli run FILE --out DIR` does, all files in
one subprocess (one interpreter start for ~80 files); a few of them also run as separate
`python -m fem.cli` processes to show the two agree. The rest of the file checks the guards
the corpus relies on: the size guard refuses before gmsh starts and its estimate is within
a factor 1.5 of real dof counts, mechanisms are told apart from stable layouts, gmsh and
solver failures are explained, internal errors exit 1 with a log, outputs stay inside the
output folder and case files are data, never code.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
import tomllib
from pathlib import Path

import pytest
from conftest import ROOT

from fem.case import parse_case
from fem.errors import CaseError, SolveError

CORPUS = Path(__file__).parent / "bad_cases"
EXPECTED = tomllib.loads((CORPUS / "expected.toml").read_text(encoding="utf-8"))
ENV = {"PYTHONPATH": str(ROOT), "PATH": "/usr/bin:/bin", "MPLBACKEND": "Agg"}

DRIVER = """
import contextlib, io, json, sys
from fem.cli import main
out = {}
for stem, path, folder in json.load(sys.stdin):
    err = io.StringIO()
    with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
        try:
            rc = main(["run", path, "--out", folder, "--quiet"])
        except SystemExit as exc:
            rc = exc.code
    out[stem] = {"rc": rc, "stderr": err.getvalue()}
print(json.dumps(out))
"""

GOOD = """
schema = 1
name = "good"
title = "{title}"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = 300.0
depth = 100.0
{extra}
[[supports]]
{support}
[[loads]]
edge = "right"
force = [0.0, -10000.0]
[mesh]
size = {size}
levels = 1
"""


def good(title: str = "ok", extra: str = "", size: float = 50.0,
         support: str = 'edge = "left"\nfix = "xy"') -> str:
    return GOOD.format(title=title, extra=extra, size=size, support=support)


@pytest.fixture(scope="module")
def corpus_runs(tmp_path_factory) -> dict[str, dict]:
    """Every corpus file through the CLI's main, in one subprocess."""
    outs = tmp_path_factory.mktemp("corpus-out")
    jobs = [(stem, str(CORPUS / f"{stem}.toml"), str(outs / stem)) for stem in EXPECTED]
    r = subprocess.run([sys.executable, "-c", DRIVER], input=json.dumps(jobs), text=True,
                       capture_output=True, env=ENV, cwd=outs, timeout=600)
    assert r.returncode == 0, r.stderr[-3000:]
    runs = json.loads(r.stdout)
    for stem, _, folder in jobs:
        runs[stem]["wrote"] = sorted(str(p.relative_to(folder)) for p in Path(folder).rglob("*")
                                     ) if Path(folder).exists() else []
    return runs


def test_corpus_lists_every_file_and_is_large_enough():
    files = {p.stem for p in CORPUS.glob("*.toml") if p.name != "expected.toml"}
    assert files == set(EXPECTED), files ^ set(EXPECTED)
    assert len(files) >= 30
    for stem, e in EXPECTED.items():
        assert e["exit"] in (1, 2) and e["message"], stem


@pytest.mark.parametrize("stem", sorted(EXPECTED))
def test_bad_case(stem: str, corpus_runs):
    """Exit code as expected, one line on stderr naming the file and the fragments, no
    traceback, and nothing written to the output folder."""
    run, want = corpus_runs[stem], EXPECTED[stem]
    lines = run["stderr"].strip().splitlines()
    assert run["rc"] == want["exit"], run["stderr"]
    assert len(lines) == 1, run["stderr"]
    assert "Traceback" not in run["stderr"]
    assert f"{stem}.toml" in lines[0]
    for fragment in want["message"]:
        assert fragment in lines[0], (fragment, lines[0])
    assert run["wrote"] == [], run["wrote"]


def test_separate_processes_agree_with_the_batch(corpus_runs, tmp_path: Path):
    """`python -m fem.cli run` as its own process gives the same exit code and line."""
    stems = ["toml-syntax", "unknown-top-key", "mechanism-one-point", "too-many-dofs",
             "section-tube-wall"]
    procs = {s: subprocess.Popen([sys.executable, "-m", "fem.cli", "run",
                                  str(CORPUS / f"{s}.toml"), "--out", str(tmp_path / s)],
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                                 env=ENV, cwd=tmp_path) for s in stems}
    for s, p in procs.items():
        out, err = p.communicate(timeout=120)
        assert p.returncode == corpus_runs[s]["rc"], err
        assert err == corpus_runs[s]["stderr"]
        assert out == ""


# --- the size guard ---------------------------------------------------------------------------

def test_huge_model_is_refused_before_gmsh_starts(monkeypatch):
    """The estimate runs while the case is read: gmsh is never started."""
    import gmsh

    def refuse(*args, **kwargs):
        raise AssertionError("gmsh must not start for a refused model")

    monkeypatch.setattr(gmsh, "initialize", refuse)
    with pytest.raises(CaseError) as err:
        parse_case(good(size=0.01), "huge.toml")
    msg = str(err.value)
    assert "mesh.max_dofs" in msg and "2,000,000" in msg and "dofs" in msg
    estimate = int(msg.split("about ")[1].split(" dofs")[0].replace(",", ""))
    assert estimate > 2_000_000
    # a finer size asked for later (one level of a study) is refused by the mesher's guard
    from fem.api import check

    case = parse_case(good(), "later.toml")
    with pytest.raises(CaseError, match="max_dofs"):
        check(case.with_mesh(size=0.01))


def test_refused_levels_name_the_finest_mesh():
    with pytest.raises(CaseError, match=r"finest mesh \(level 6"):
        parse_case(good(size=2.0).replace("levels = 1", "levels = 6"), "levels.toml")


@pytest.mark.parametrize("extra, support, size, order", [
    ("", 'edge = "left"\nfix = "xy"', 10.0, 2),
    ("[[geometry.holes]]\ncenter = [150.0, 50.0]\nradius = 20.0", 'edge = "left"\nfix = "xy"',
     10.0, 2),
    ("[[geometry.cutouts]]\ncorner = [0.0, 70.0]\nsize = [60.0, 40.0]\nfillet = 8.0",
     'edge = "left"\nfix = "xy"', 10.0, 2),
    ("", 'at = [0.0, 0.0]\nfix = "xy"\n[[supports]]\nat = [0.0, 100.0]\nfix = "x"', 10.0, 1),
])
def test_dof_estimate_is_within_a_factor_of_the_real_count(extra, support, size, order):
    """Estimate against the dofs of the real mesh: within a factor 1.5 (measured 0.9-1.2)."""
    from fem.case.sizing import estimate_dofs
    from fem.member.mesh import mesh_member

    text = good(extra=extra, size=size, support=support).replace(
        "levels = 1", f"levels = 1\norder = {order}")
    if "[[geometry.holes]]" in extra:
        text += "[[mesh.refine]]\nat = [300.0, 100.0]\nradius = 15.0\nsize = 2.0\n"
    case = parse_case(text, "est.toml")
    mm = mesh_member(case)
    m = mm.finder_mesh
    real = 2 * (m.nvertices + (m.facets.shape[1] if order == 2 else 0))
    assert 1 / 1.5 < estimate_dofs(case, size) / real < 1.5


SECTION = """
schema = 1
name = "sec"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[geometry]
{geo}
[loads]
shear = [0.0, 1000.0]
[mesh]
size = {size}
"""


@pytest.mark.parametrize("geo, size", [
    ('shape = "circle"\ndiameter = 40.0', 2.0),
    ('shape = "i"\ndepth = 40.0\nflange_width = 20.0\nflange_thickness = 3.0\n'
     'web_thickness = 2.0', 1.0),
    ('shape = "channel"\ndepth = 40.0\nflange_width = 15.0\nflange_thickness = 3.0\n'
     'web_thickness = 3.0\nroot_radius = 2.0', 1.0),
])
def test_section_dof_estimate_is_within_a_factor_of_the_real_count(geo, size):
    from fem.case.sizing import estimate_dofs
    from fem.section.mesh import mesh_section, section_shape

    case = parse_case(SECTION.format(geo=geo, size=size), "sec.toml")
    g = case.geometry
    real = mesh_section(section_shape(g.shape, **g.params), size, 2).mesh.doflocs.shape[1]
    assert 1 / 1.5 < estimate_dofs(case, size) / real < 1.5


# --- mechanisms -------------------------------------------------------------------------------

@pytest.mark.parametrize("support, free", [
    ('at = [0.0, 0.0]\nfix = "y"\n[[supports]]\nat = [300.0, 0.0]\nfix = "y"\n'
     '[[supports]]\nat = [0.0, 100.0]\nfix = "x"', None),
    ('edge = "left"\nfix = "x"\n[[supports]]\nat = [0.0, 0.0]\nfix = "y"', None),
    ('edge = "bottom"\nfix = "xy"', None),
    ('edge = "bottom"\nfix = "y"', "x"),
    ('at = [0.0, 50.0]\nfix = "xy"', "rotation"),
    ('edge = "left"\nfix = "x"', "y"),
    ('edge = "left"\nfix = "y"', r"x \(no support fixes x\) and rotation"),
])
def test_mechanism_check_tells_stable_from_free(support, free):
    """Restraints along x act on horizontal lines, along y on vertical ones: the member can
    turn only if every line meets in one point; it slides if a direction has none."""
    from fem.case.outline import check_mechanism, patches

    case = parse_case(good(support=support), "m.toml")
    sup, _ = patches(case)
    if free is None:
        check_mechanism(case, sup)
    else:
        with pytest.raises(CaseError, match=f"rigid motion in {free}"):
            check_mechanism(case, sup)


def test_singular_solve_is_caught(monkeypatch):
    """With the mechanism check bypassed, a free member gives a solve that does not satisfy
    K u = f (SuperLU does not always see the singularity): the residual check explains it."""
    import fem.member.mesh
    import fem.member.solve

    monkeypatch.setattr(fem.member.mesh, "check_mechanism", lambda *a: None)
    monkeypatch.setattr(fem.member.solve, "check_mechanism", lambda *a: None)
    case = parse_case(good(support='at = [0.0, 50.0]\nfix = "xy"'), "s.toml")
    with pytest.raises(SolveError, match="singular"):
        fem.member.solve.solve_member(case, fem.member.mesh.mesh_member(case))


def test_non_finite_solve_is_caught(monkeypatch):
    import numpy as np

    import fem.member.mesh
    import fem.member.solve

    def nan_solver(A, b, modes=None, method="auto"):
        return np.full_like(b, np.nan), [fem.member.solve.Attempt("superlu", "answer")]

    monkeypatch.setattr(fem.member.solve, "solve_spd", nan_solver)
    case = parse_case(good(), "n.toml")
    with pytest.raises(SolveError, match="non-finite"):
        fem.member.solve.solve_member(case, fem.member.mesh.mesh_member(case))


# --- gmsh failures ----------------------------------------------------------------------------

def test_gmsh_failure_is_explained_and_other_errors_are_not_hidden(monkeypatch):
    import gmsh

    from fem.member.mesh import mesh_member

    case = parse_case(good(), "g.toml")

    def gmsh_fails(dim):
        raise Exception("Unable to recover the edge 12 (1/2)")  # how gmsh raises

    monkeypatch.setattr(gmsh.model.mesh, "generate", gmsh_fails)
    with pytest.raises(SolveError, match="gmsh could not build or mesh.*recover the edge"):
        mesh_member(case)

    def our_bug(dim):
        raise KeyError("not a gmsh error")

    monkeypatch.setattr(gmsh.model.mesh, "generate", our_bug)
    with pytest.raises(KeyError):
        mesh_member(case)


def test_folded_curved_elements_are_unfolded_or_explained(monkeypatch):
    """A hole far smaller than the elements once folded a curved P2 element (negative
    Jacobian; found by the fuzzer) and skfem's inverse map failed. A folded mesh goes
    through gmsh's high-order optimisation; if it stays folded the run stops in words."""
    import gmsh

    import fem.member.mesh

    case = parse_case(good(extra="[[geometry.holes]]\ncenter = [150.0, 50.0]\nradius = 5.0"),
                      "fold.toml")
    calls: list[str] = []
    optimize = gmsh.model.mesh.optimize
    monkeypatch.setattr(gmsh.model.mesh, "optimize",
                        lambda how: calls.append(how) or optimize(how))
    seq = iter([-0.5, 0.2])
    monkeypatch.setattr(fem.member.mesh, "_min_jacobian", lambda: next(seq))
    assert fem.member.mesh.mesh_member(case).curved and calls == ["HighOrder"]
    seq = iter([-0.5, -0.1])
    with pytest.raises(SolveError, match="folded elements"):
        fem.member.mesh.mesh_member(case)


# --- exit codes, logs, output folder ----------------------------------------------------------

def test_internal_error_exits_1_with_a_log_and_keeps_results(tmp_path: Path, monkeypatch,
                                                             capsys):
    import fem.api
    from fem.cli import main

    case = tmp_path / "good.toml"
    case.write_text(good(), encoding="utf-8")
    out = tmp_path / "out"
    out.mkdir()
    (out / "results.json").write_text('{"earlier": true}', encoding="utf-8")

    def boom(*a, **k):
        raise RuntimeError("kaboom in the middle")

    monkeypatch.setattr(fem.api, "check", boom)
    assert main(["run", str(case), "--out", str(out)]) == 1
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "internal error" in err[0] and "shearcheck-error.log" in err[0]
    log = (out / "shearcheck-error.log").read_text(encoding="utf-8")
    assert "Traceback" in log and "kaboom in the middle" in log
    assert (out / "results.json").read_text(encoding="utf-8") == '{"earlier": true}'


def test_internal_error_while_reading_is_logged_too(tmp_path: Path, monkeypatch, capsys):
    import fem.case.parse
    from fem.cli import main

    def boom(path):
        raise RuntimeError("reader broke")

    monkeypatch.setattr(fem.case.parse, "load_case", boom)
    assert main(["run", str(tmp_path / "any.toml"), "--out", str(tmp_path / "o")]) == 1
    assert "reader broke" in (tmp_path / "o" / "shearcheck-error.log").read_text()
    assert len(capsys.readouterr().err.strip().splitlines()) == 1


def test_default_output_folder_is_out_slash_name_and_nothing_leaks(tmp_path: Path,
                                                                    monkeypatch):
    """Without --out the outputs go to ./out/<name>; the name cannot hold a path (the corpus
    refuses '../../etc' and 'a/b'), so nothing is written anywhere else."""
    from fem.cli import main

    monkeypatch.chdir(tmp_path)
    (tmp_path / "c.toml").write_text(good(), encoding="utf-8")
    assert main(["run", "c.toml", "--no-report", "--quiet"]) == 0
    written = sorted(str(p.relative_to(tmp_path)) for p in tmp_path.rglob("*") if p.is_file())
    assert written == ["c.toml", os.path.join("out", "good", "manifest.json"),
                       os.path.join("out", "good", "results.json")]


def test_case_file_is_data_not_code(tmp_path: Path, monkeypatch):
    """Strings that look like code stay strings: nothing is evaluated or run."""
    from fem.cli import main

    monkeypatch.chdir(tmp_path)
    title = "__import__('os').system('touch pwned') $(touch pwned2) {{0.__class__}}"
    (tmp_path / "c.toml").write_text(good(title=title), encoding="utf-8")
    assert main(["run", "c.toml", "--out", "o", "--no-report", "--quiet"]) == 0
    d = json.loads((tmp_path / "o" / "results.json").read_text(encoding="utf-8"))
    assert d["title"] == title
    assert not (tmp_path / "pwned").exists() and not (tmp_path / "pwned2").exists()


def test_out_that_is_a_file_is_bad_input(tmp_path: Path, capsys):
    from fem.cli import main

    (tmp_path / "c.toml").write_text(good(), encoding="utf-8")
    (tmp_path / "f").write_text("not a folder", encoding="utf-8")
    assert main(["run", str(tmp_path / "c.toml"), "--out", str(tmp_path / "f")]) == 2
    assert "not a folder" in capsys.readouterr().err
    assert (tmp_path / "f").read_text(encoding="utf-8") == "not a folder"


# --- messages ---------------------------------------------------------------------------------

def test_messages_point_at_the_line():
    """Bad values name the line they are written on, missing keys the line of their table."""
    text = good(extra="[[geometry.holes]]\ncenter = [150.0, 50.0]\nradius = -3.0")
    with pytest.raises(CaseError) as err:
        parse_case(text, "l.toml")
    line = next(i for i, s in enumerate(text.splitlines(), 1) if s.startswith("radius"))
    assert err.value.line == line and f"l.toml:{line}: geometry.holes.0.radius" in str(err.value)
    with pytest.raises(CaseError) as err:
        parse_case(text.replace("radius = -3.0", "diameter = 6.0"), "l.toml")
    header = next(i for i, s in enumerate(text.splitlines(), 1) if s == "[[geometry.holes]]")
    assert err.value.line == header and "not known: diameter" in err.value.message


def test_key_lines_follow_tables_arrays_and_multiline_values():
    from fem.case.reader import key_lines

    text = ('a = 1\npoints = [\n  [0.0, 1.0],\n  [2.0, 3.0]\n]\n[geometry]\nb = "x = ["\n'
            '[[geometry.holes]]\nc = 1\n[[geometry.holes]]\nc = 2\n[mesh]\nsize = 1\n')
    lines = key_lines(text)
    assert lines["points"] == 2 and lines["geometry.b"] == 7
    assert lines["geometry.holes.0.c"] == 9 and lines["geometry.holes.1.c"] == 11
    assert lines["mesh.size"] == 13 and "0.0, 1.0" not in "".join(lines)


# --- second round: stated limits, each just under and just over --------------------------------

def _rect_with_bottom_points(n: int) -> str:
    """The 300 x 100 rectangle drawn with n points, the extra ones along the bottom edge."""
    bottom = [(300.0 * i / (n - 3), 0.0) for i in range(n - 2)]
    pts = bottom + [(300.0, 100.0), (0.0, 100.0)]
    return ('[geometry]\nshape = "polygon"\npoints = ['
            + ", ".join(f"[{x!r}, {y!r}]" for x, y in pts) + "]\n")


def _holes(n: int) -> str:
    return "".join(f"[[geometry.holes]]\ncenter = [{12.0 + 11.0 * (i % 25)}, "
                   f"{20.0 + 20.0 * (i // 25)}]\nradius = 1.0\n" for i in range(n))


@pytest.mark.parametrize("key, under, over", [
    ("title", lambda n: good(title="T" * n), 200),
    ("check.cuts", lambda n: good() + "[check]\ncuts = ["
     + ", ".join(f"{5.0 + 5.0 * i}" for i in range(n)) + "]\n", 50),
    ("geometry.holes", lambda n: good(extra=_holes(n)), 100),
    ("geometry.points", lambda n: good(
        support='from = [0.0, 0.0]\nto = [0.0, 100.0]\nfix = "xy"').replace(
        '[geometry]\nshape = "rectangle"\nlength = 300.0\ndepth = 100.0\n',
        _rect_with_bottom_points(n)).replace(
        'edge = "right"', 'from = [300.0, 0.0]\nto = [300.0, 100.0]'), 2000),
])
def test_stated_limits_just_under_and_just_over(key, under, over):
    """At the limit the case is read; one more is refused naming the key and the limit."""
    parse_case(under(over), "limit.toml")
    with pytest.raises(CaseError) as err:
        parse_case(under(over + 1), "limit.toml")
    assert err.value.key == key and f"at most {over:,}" in str(err.value)


def test_section_polygon_points_are_limited_with_their_holes():
    from fem.case.limits import MAX_POINTS

    ring = [[float(i), 0.0] for i in range(MAX_POINTS - 2)] + [[0.0, 5.0]]
    ok = SECTION.format(geo=f'shape = "polygon"\npoints = {ring}', size=100.0)
    with pytest.raises(CaseError) as err:
        parse_case(ok.replace("points = ", "holes = [[[1.0, 1.0], [2.0, 1.0], [2.0, 2.0]]]\n"
                                           "points = "), "sec.toml")
    assert err.value.key == "geometry.holes" and f"at most {MAX_POINTS:,}" in str(err.value)


def test_case_file_is_read_with_a_cap(tmp_path: Path):
    """At the cap a (padded) case is read; one byte more, or /dev/zero, is refused quickly."""
    import time

    from fem.case.limits import MAX_FILE_BYTES
    from fem.case.parse import load_case

    text = good().encode("utf-8")
    at = tmp_path / "at.toml"
    at.write_bytes(text + b"#" * (MAX_FILE_BYTES - len(text) - 1) + b"\n")
    assert at.stat().st_size == MAX_FILE_BYTES and load_case(at).name == "good"
    over = tmp_path / "over.toml"
    over.write_bytes(text + b"#" * (MAX_FILE_BYTES - len(text)) + b"\n")
    with pytest.raises(CaseError, match="larger than 4 MB"):
        load_case(over)
    if os.path.exists("/dev/zero"):
        t0 = time.perf_counter()
        with pytest.raises(CaseError, match="larger than 4 MB"):
            load_case("/dev/zero")
        assert time.perf_counter() - t0 < 10


def test_byte_order_mark_is_accepted(tmp_path: Path):
    from fem.case.parse import load_case

    p = tmp_path / "bom.toml"
    p.write_bytes(b"\xef\xbb\xbf" + good().encode("utf-8"))
    assert load_case(p).name == "good"
    assert parse_case("\ufeff" + good(), "bom.toml").name == "good"


def test_nesting_just_under_the_limit_reaches_the_key_check():
    """20 levels is read as TOML (and refused as an unknown key); 21 is refused as nesting,
    and 5000 never reaches the recursive parser."""
    from fem.case.limits import MAX_NESTING

    def nested(n: int) -> str:
        return good() + "[extra]\nx = " + "[" * n + "]" * n + "\n"

    with pytest.raises(CaseError, match="unknown key"):
        parse_case(nested(MAX_NESTING), "n.toml")
    for n in (MAX_NESTING + 1, 5000):
        with pytest.raises(CaseError, match="nested more than"):
            parse_case(nested(n), "n.toml")


def test_load_partly_on_a_support_is_still_allowed():
    """Only a load wholly on a stretch fixed in its directions is refused: one that reaches
    past the clamp, or pushes along a direction the support leaves free, is a load."""
    parse_case(good(support='from = [0.0, 0.0]\nto = [0.0, 50.0]\nfix = "xy"').replace(
        'edge = "right"', 'edge = "left"'), "part.toml")
    with pytest.raises(CaseError, match="lies wholly on a support fixed in y"):
        parse_case(good().replace('edge = "right"', 'from = [0.0, 20.0]\nto = [0.0, 60.0]'),
                   "on.toml")


def test_error_log_is_never_written_through_a_planted_link(tmp_path: Path, monkeypatch,
                                                            capsys):
    """A symbolic link named shearcheck-error.log in the output folder is not followed: the
    file it points at keeps its content and the message says no log was written."""
    import fem.api
    from fem.cli import main

    case = tmp_path / "good.toml"
    case.write_text(good(), encoding="utf-8")
    out = tmp_path / "out"
    out.mkdir()
    victim = tmp_path / "victim.txt"
    victim.write_text("precious", encoding="utf-8")
    (out / "shearcheck-error.log").symlink_to(victim)
    monkeypatch.setattr(fem.api, "check", lambda *a, **k: 1 / 0)
    assert main(["run", str(case), "--out", str(out)]) == 1
    assert victim.read_text(encoding="utf-8") == "precious"
    assert "no log could be written" in capsys.readouterr().err


# --- second round: the guard on the real model ------------------------------------------------

def _arched(n: int, size: float) -> str:
    """A 300 mm member whose top is an arch drawn with n points (outline detail)."""
    import math

    top = [(300.0 - 300.0 * i / (n - 1), 100.0 + 40.0 * math.sin(math.pi * i / (n - 1)))
           for i in range(n)]
    pts = [(0.0, 0.0), (300.0, 0.0)] + top
    return good(size=size, support='from = [0.0, 0.0]\nto = [0.0, 100.0]\nfix = "xy"').replace(
        '[geometry]\nshape = "rectangle"\nlength = 300.0\ndepth = 100.0\n',
        '[geometry]\nshape = "polygon"\npoints = ['
        + ", ".join(f"[{x!r}, {y!r}]" for x, y in pts) + "]\n").replace(
        'edge = "right"', 'from = [300.0, 0.0]\nto = [300.0, 100.0]')


@pytest.mark.parametrize("n, size", [(200, 50.0), (1998, 50.0), (1998, 10.0)])
def test_dof_estimate_counts_outline_detail(n, size):
    """Many short outline segments (once estimated at 0.02 of the real count): within 1.5."""
    from fem.case.sizing import estimate_dofs
    from fem.member.mesh import mesh_member

    case = parse_case(_arched(n, size), "arch.toml")
    m = mesh_member(case).finder_mesh
    real = 2 * (m.nvertices + m.facets.shape[1])
    assert 1 / 1.5 < estimate_dofs(case, size) / real < 1.5


def test_section_dof_estimate_counts_polygon_points():
    import math

    from fem.case.sizing import estimate_dofs
    from fem.section.mesh import mesh_section, section_shape

    ring = [[round(50 * math.cos(2 * math.pi * i / 1998), 9),
             round(50 * math.sin(2 * math.pi * i / 1998), 9)] for i in range(1998)]
    case = parse_case(SECTION.format(geo=f'shape = "polygon"\npoints = {ring}', size=20.0),
                      "sec.toml")
    g = case.geometry
    real = mesh_section(section_shape(g.shape, **g.params), 20.0, 2).mesh.doflocs.shape[1]
    assert 1 / 1.5 < estimate_dofs(case, 20.0) / real < 1.5


def test_real_dof_count_is_checked_after_meshing_before_assembly(monkeypatch, tmp_path,
                                                                 capsys):
    """An estimate beaten by the outline (simulated: the estimate says 1 dof) is caught on
    the real mesh: exit 2 naming mesh.max_dofs and the real count, and no solve starts."""
    import fem.case.parse
    import fem.member.check  # noqa: F401 (imported before patching: binds the real names)
    import fem.member.level
    import fem.member.mesh
    from fem.cli import main

    monkeypatch.setattr(fem.member.mesh, "estimate_dofs", lambda case, size: 1)
    monkeypatch.setattr(fem.case.parse, "check_size", lambda case: None)
    monkeypatch.setattr(fem.member.level, "solve_member",
                        lambda *a, **k: pytest.fail("assembly must not start"))
    counted = []
    real_check = fem.member.mesh.check_real_dofs
    monkeypatch.setattr(fem.member.mesh, "check_real_dofs",
                        lambda case, dofs, size: counted.append(dofs))
    fem.member.mesh.mesh_member(parse_case(good(size=10.0), "c.toml"))
    monkeypatch.setattr(fem.member.mesh, "check_real_dofs", real_check)
    (n,) = counted   # the real count of this mesh
    case = tmp_path / "c.toml"
    case.write_text(good(size=10.0).replace("levels = 1", f"levels = 1\nmax_dofs = {n - 1}"),
                    encoding="utf-8")
    assert main(["run", str(case), "--out", str(tmp_path / "o"), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "mesh.max_dofs" in err and f"has {n:,} dofs" in err and f"{n - 1:,}" in err
    # at the limit the same mesh is accepted
    case.write_text(good(size=10.0).replace("levels = 1", f"levels = 1\nmax_dofs = {n}"),
                    encoding="utf-8")
    parsed = parse_case(case.read_text(encoding="utf-8"), "c.toml")
    assert fem.member.mesh.mesh_member(parsed).finder_mesh.nvertices > 0


def test_holes_of_one_radius_share_a_size_field_and_the_mesh_is_unchanged(monkeypatch):
    """One Distance field over all holes of a radius gives the mesh one field per hole gave
    (the minimum of equal thresholds is the threshold of the minimum distance)."""
    import fem.member.mesh

    extra = "".join(f"[[geometry.holes]]\ncenter = [{x}, 50.0]\nradius = 8.0\n"
                    for x in (80.0, 150.0, 220.0))
    case = parse_case(good(extra=extra, size=20.0), "h.toml")
    shared = fem.member.mesh.mesh_member(case).mesh
    monkeypatch.setattr(fem.member.mesh, "SHARED_HOLE_FIELDS", False)
    apart = fem.member.mesh.mesh_member(case).mesh
    assert shared.p.shape == apart.p.shape and shared.t.shape == apart.t.shape


# --- second round: scale ----------------------------------------------------------------------

@pytest.mark.parametrize("length, depth, size, cuts", [
    (60000.0, 3000.0, 1000.0, "[1.0, 30000.0]"),     # a 60 m girder, a cut 1 mm from the clamp
    (300.0, 100.0, 50.0, "[0.0004, 150.0]"),         # a cut 0.0004 from the clamp
    (3e4, 1e4, 5e3, "[1.5e4]"),                      # the stub scaled by 100
])
def test_hand_statics_hold_at_any_scale(length, depth, size, cuts):
    """Once refused as 'supports cannot carry the loads by statics': V at every cut is the
    tip load (cantilever statics, common practice)."""
    from fem.member.hand_only import beam_hand_result

    text = good(size=size).replace("length = 300.0", f"length = {length}").replace(
        "depth = 100.0", f"depth = {depth}") + f"[check]\ncuts = {cuts}\n"
    res, _ = beam_hand_result(parse_case(text, "scale.toml"))
    for c in res.to_dict()["cuts"]:
        assert abs(c["V_hand"]) == pytest.approx(10000.0, rel=1e-9)


def test_hole_radii_are_banded_for_shared_size_fields():
    """Radii within RADIUS_BAND of a band's smallest share its field; others start a band."""
    from fem.case.model import Hole
    from fem.member.mesh import RADIUS_BAND, _hole_groups

    holes = [Hole((0.0, 0.0), r) for r in (3.0, 3.5, 5.0, 2.5, 3.0 * RADIUS_BAND)]
    assert _hole_groups(holes) == [[3, 0], [1, 4], [2]]   # 2.5-3.0, 3.5-3.75, 5.0
    assert _hole_groups([]) == []


def test_a_section_real_dof_count_is_checked_before_assembly(monkeypatch, tmp_path, capsys):
    """Sections too: with the estimate beaten (simulated: it says 1 dof) the real mesh of a
    polygon section is counted before the warping solve and refused over mesh.max_dofs."""
    import fem.case.parse
    import fem.section.level
    from fem.cli import main

    monkeypatch.setattr(fem.case.parse, "check_size", lambda case: None)
    monkeypatch.setattr(fem.section.level, "solve_section",
                        lambda *a, **k: pytest.fail("assembly must not start"))
    case = tmp_path / "s.toml"
    case.write_text("""
schema = 1
name = "s"
kind = "section"
[material]
E = 200000.0
nu = 0.3
[geometry]
shape = "polygon"
points = [[0.0, 0.0], [40.0, 0.0], [40.0, 5.0], [5.0, 5.0], [5.0, 60.0], [0.0, 60.0]]
[loads]
shear = [0.0, 1000.0]
[mesh]
size = 1.0
levels = 1
max_dofs = 50
""", encoding="utf-8")
    assert main(["run", str(case), "--out", str(tmp_path / "o"), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert "mesh.max_dofs" in err and "dofs (the estimate was" in err
    assert "above the limit 50" in err
