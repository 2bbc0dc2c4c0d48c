"""Progress: the bar on a terminal, silence otherwise, and the hook in the beam run."""

from __future__ import annotations

import io
import subprocess
import sys

import pytest
from conftest import CANTILEVER, ROOT

import fem.member.check
from fem.case import parse_case
from fem.case.sizing import estimate_dofs, level_size
from fem.member.check import check_beam
from fem.progress import (
    BarProgress,
    CallbackProgress,
    NullProgress,
    Progress,
    as_progress,
    console_progress,
)


class _Tty(io.StringIO):
    def isatty(self) -> bool:
        return True


class _Recorder:
    def __init__(self) -> None:
        self.calls: list[tuple] = []

    def start(self, total: float) -> None:
        self.calls.append(("start", total))

    def step(self, message: str, work: float = 1.0) -> None:
        self.calls.append(("step", message, work))

    def close(self) -> None:
        self.calls.append(("close",))


def _case(levels: int):
    return parse_case(CANTILEVER.format(length=200.0, size=25.0, levels=levels,
                                        cuts="[100.0]"), "c.toml")


def test_bar_counts_work_and_clears_itself():
    out = _Tty()
    bar = BarProgress(out)
    bar.start(10.0)
    bar.step("level 1/2", 2.0)
    assert bar.bar is not None and bar.bar.n == 0
    bar.step("level 2/2", 8.0)
    assert bar.bar.n == 2.0  # the first level is done when the second begins
    bar.close()
    assert bar.bar is None
    text = out.getvalue()
    assert "level 1/2" in text and "level 2/2" in text and "20%" in text
    assert text.endswith("\r")  # leave=False: the line is wiped at the end


def test_bar_grows_when_work_exceeds_the_announced_total():
    bar = BarProgress(_Tty())
    bar.start(1.0)
    bar.step("a", 1.0)
    bar.step("b", 5.0)
    assert bar.bar.total == 6.0
    bar("c")  # callable like the plain hook
    assert bar.bar.n == 6.0
    bar.close()


def test_console_progress_is_silent_when_quiet_or_not_a_terminal():
    assert console_progress(True, _Tty()) is None
    assert console_progress(False, io.StringIO()) is None
    assert isinstance(console_progress(False, _Tty()), BarProgress)


def test_as_progress_adapts_every_kind():
    seen: list[str] = []
    p = as_progress(seen.append)
    assert isinstance(p, CallbackProgress)
    p.start(3)
    p.step("hello", 2.0)
    p.close()
    assert seen == ["hello"]
    assert isinstance(as_progress(None), NullProgress)
    rec = _Recorder()
    assert as_progress(rec) is rec and isinstance(rec, Progress)
    with pytest.raises(TypeError):
        as_progress(42)  # type: ignore[arg-type]


def test_check_beam_reports_each_level_weighted_by_its_size():
    case = _case(2)
    rec = _Recorder()
    check_beam(case, progress=rec)
    work = [estimate_dofs(case, level_size(case, k)) for k in range(2)]
    assert rec.calls == [("start", sum(work)),
                         ("step", "level 1/2: size 25 mm", work[0]),
                         ("step", "level 2/2: size 12.5 mm", work[1]),
                         ("close",)]
    seen: list[str] = []
    check_beam(_case(1), progress=seen.append)  # the plain callable hook still works
    assert seen == ["level 1/1: size 25 mm"]


def test_progress_is_closed_when_a_level_fails(monkeypatch):
    calls = {"n": 0}
    real = fem.member.check.run_level

    def failing(*args, **kwargs):
        calls["n"] += 1
        if calls["n"] == 2:
            raise RuntimeError("mesh failed")
        return real(*args, **kwargs)

    monkeypatch.setattr(fem.member.check, "run_level", failing)
    rec = _Recorder()
    with pytest.raises(RuntimeError, match="mesh failed"):
        check_beam(_case(2), progress=rec)
    assert rec.calls[-1] == ("close",)


def test_cli_prints_no_bar_when_stderr_is_captured(tmp_path, write_case):
    """stderr is a pipe here, not a terminal: no bar; --quiet: nothing at all."""
    p = write_case(CANTILEVER.format(length=200.0, size=25.0, levels=2, cuts="[100.0]"))
    env = {"PYTHONPATH": str(ROOT), "PATH": "/usr/bin:/bin"}
    loud = subprocess.run([sys.executable, "-m", "fem.cli", "run", str(p), "--out",
                           str(tmp_path / "a"), "--no-report"], capture_output=True, text=True,
                          env=env, cwd=tmp_path)
    assert loud.returncode == 0, loud.stderr
    assert "%|" not in loud.stderr and "verdict" in loud.stdout
    quiet = subprocess.run([sys.executable, "-m", "fem.cli", "run", str(p), "--out",
                            str(tmp_path / "b"), "--no-report", "--quiet"],
                           capture_output=True, text=True, env=env, cwd=tmp_path)
    assert quiet.returncode == 0 and quiet.stdout == "" and quiet.stderr == ""


def test_section_checks_report_progress_through_the_same_protocol():
    """fem.check adapts the section run's plain progress(message) calls to a Progress."""
    from fem.api import check
    from fem.case import load_case

    case = load_case(ROOT / "cases" / "rectangle-wide-section.toml").with_mesh(levels=2,
                                                                              size=8.0)
    rec = _Recorder()
    check(case, progress=rec)
    assert rec.calls[0] == ("start", 2) and rec.calls[-1] == ("close",)
    assert [c[1] for c in rec.calls[1:-1]] == ["level 1/2: size 8", "level 2/2: size 4"]
