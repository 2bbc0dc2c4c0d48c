"""Every command the README shows works as written after the Quick start (issue: a README a
new user can follow).

The commands are read from the README itself: shell lines of ```bash blocks (backslash
continuations joined, comments dropped) and inline code spans that start with
``.venv/bin/``. The Quick start's lines (make the venv, install, run the demo or the tests)
are checked by form; every ``.venv/bin/shearcheck`` command is parsed by the real command
line; the cheap ones (all but the demo, a sweep of more than `MAX_POINTS` points and
one needing a cluster) are run in a scratch folder holding copies of the cases they name
(placeholders such as CASE.toml and DIR filled in, optional [--flags] left out, --quiet
added; regress and sweep at one mesh level). The ```python block
runs as written in the scratch folder.
"""

from __future__ import annotations

import math
import re
import shlex
import shutil
import time
from pathlib import Path

import pytest
from conftest import ROOT

from fem.cli import _parser, main

README = (ROOT / "README.md").read_text(encoding="utf-8")
PLACEHOLDERS = {"CASE.toml": "cases/stub-cantilever.toml", "DIR": "out/readme",
                "NAME": "stub-cantilever"}


def _blocks(lang: str) -> list[str]:
    return re.findall(rf"```{lang}\n(.*?)```", README, flags=re.S)


def commands() -> list[str]:
    """The shell commands the README shows, in order."""
    out: list[str] = []
    for block in _blocks("bash"):
        text = block.replace("\\\n", " ")
        for line in text.splitlines():
            line = re.sub(r"\s+#.*$", "", line).strip()
            if line:
                out.append(" ".join(line.split()))
    for span in re.findall(r"`([^`\n]+)`", README):
        if span.startswith(".venv/bin/") and "…" not in span and span not in out:
            out.append(" ".join(span.split()))
    return out


QUICK = [c for c in commands() if c.startswith("python3 -m venv")]
SHEARCHECK = [c for c in commands() if c.startswith(".venv/bin/shearcheck")]


def _argv(command: str) -> list[str]:
    """The arguments of a `.venv/bin/shearcheck` command, placeholders filled in."""
    command = re.sub(r"\s*\[[^\]]*\]", "", command)   # optional parts of a syntax line
    argv = shlex.split(command)[1:]
    return [PLACEHOLDERS.get(a, a) for a in argv]


def test_readme_shows_the_commands_this_test_covers():
    assert len(QUICK) == 2 and len(SHEARCHECK) >= 9
    bare = [c for c in commands() if c.startswith("shearcheck ")]
    assert bare == [], f"bare `shearcheck` needs an activated venv: {bare}"
    assert "`. .venv/bin/activate`" in README


def test_quick_start_by_form():
    """Make the venv, install, then run through .venv/bin (nothing else on the PATH needed)."""
    demo, tests = QUICK
    assert demo.split(" && ") == ["python3 -m venv .venv", ".venv/bin/pip install -q .",
                                  ".venv/bin/shearcheck demo --out out/demo"]
    assert tests.split(" && ") == ["python3 -m venv .venv",
                                   '.venv/bin/pip install -q ".[test]"',
                                   ".venv/bin/python -m pytest"]
    args = _parser().parse_args(_argv(demo.split(" && ")[-1]))
    assert args.command == "demo" and args.out == Path("out/demo")


@pytest.mark.parametrize("command", SHEARCHECK)
def test_every_shearcheck_command_parses(command):
    args = _parser().parse_args(_argv(command))
    assert args.command in ("run", "demo", "hand", "show", "regress", "sweep", "verify")


MAX_POINTS = 4   # larger sweeps are checked by form only (the same code, more points)
CASES_NAMED = ("stub-cantilever", "lug-pin-load", "plate-hole-shear", "coped-beam-fillet")


@pytest.fixture
def scratch(tmp_path: Path, monkeypatch) -> Path:
    (tmp_path / "cases").mkdir()
    for name in CASES_NAMED:
        for suffix in (".toml", ".baseline.json"):
            shutil.copy(ROOT / "cases" / f"{name}{suffix}", tmp_path / "cases")
    monkeypatch.chdir(tmp_path)
    return tmp_path


def _cheap(argv: list[str]) -> list[str] | None:
    """The command to run for a README command, or None to check it by form only."""
    if "--scheduler" in argv or argv[0] == "demo":   # a cluster; the demo is the Quick start
        return None
    if argv[0] == "verify":   # minutes for the full set; `verify --quick` is its own test
        return None
    ranges = [argv[i + 1] for i, a in enumerate(argv) if a == "--vary"]
    if math.prod(int(v.rsplit(":", 1)[1]) for v in ranges) > MAX_POINTS:
        return None   # the same route as the smaller sweep, many more points
    if argv[0] in ("regress", "sweep") and "--levels" not in argv:
        argv = [*argv, "--levels", "1"]
    if argv[0] == "regress" and "--only" not in argv:   # the scratch folder's own cases
        argv = [*argv, "--only", "stub-cantilever"]
    if argv[0] == "show":   # one screen of summary is what it is for: it has no --quiet
        return argv
    return [*argv, "--quiet"] if "--quiet" not in argv else argv


def test_cheap_commands_run_as_written(scratch, capsys):
    ran = []
    for command in SHEARCHECK:
        argv = _cheap(_argv(command))
        if argv is None:
            continue
        t0 = time.perf_counter()
        code = main(argv)
        assert code == 0, (command, capsys.readouterr())
        ran.append(argv[0])
        print(f"{time.perf_counter() - t0:6.1f} s  {' '.join(argv)}")  # in -s runs
    assert {"run", "hand", "show", "regress", "sweep"} <= set(ran)
    assert (scratch / "out" / "stub-cantilever" / "report.pdf").exists()       # run CASE
    assert (scratch / "out" / "stub-cantilever-hand" / "results.json").exists()  # hand CASE
    assert (scratch / "out" / "depth" / "sweep.csv").exists()


def test_python_block_runs_as_written(scratch):
    (block,) = _blocks("python")
    exec(compile(block, "README.md", "exec"), {})  # noqa: S102 - the README's own example
    for name in ("shear.png", "von-mises.png", "cut1.png", "convergence.png"):
        assert (scratch / name).stat().st_size > 10_000
    assert (scratch / "out" / "stub" / "report.html").exists()
