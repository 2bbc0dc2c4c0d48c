"""The output folder: staged writing, so a failed run never spoils an earlier result.

Every file of a run is first written into a hidden staging folder beside the outputs;
only when all of them exist are they moved into place, `results.json` last (each move an
atomic rename). A run that fails midway leaves the previous complete result untouched.
A run killed outright (SIGKILL, power loss) leaves its staging folder behind; the next run
into the same folder removes staging folders whose process is gone (the folder name
carries the process id).
"""

from __future__ import annotations

import os
import shutil
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

__all__ = ["staged_output"]


@contextmanager
def staged_output(out: Path) -> Iterator[Path]:
    """Yield a staging folder; on success move its files into `out` (results.json last)."""
    out = Path(out)
    out.mkdir(parents=True, exist_ok=True)
    _sweep_stale(out)
    stage = Path(tempfile.mkdtemp(prefix=f".staging-{os.getpid()}-", dir=out))
    try:
        yield stage
        files = sorted(stage.iterdir(), key=lambda p: p.name == "results.json")
        for f in files:
            os.replace(f, out / f.name)
    finally:
        shutil.rmtree(stage, ignore_errors=True)


def _sweep_stale(out: Path) -> None:
    """Remove staging folders left by runs whose process no longer exists (POSIX only:
    elsewhere signal 0 is not a harmless probe)."""
    if os.name != "posix":
        return
    for stage in out.glob(".staging-*"):
        pid = stage.name.split("-")[1]
        if not pid.isdigit() or int(pid) == os.getpid():
            continue
        try:
            os.kill(int(pid), 0)
        except ProcessLookupError:
            shutil.rmtree(stage, ignore_errors=True)
        except OSError:
            pass  # alive (or not ours to signal): leave it
