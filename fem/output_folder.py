"""The output folder: staged writing, and a run's files committed as one set.

Every file of a run is first written into a hidden staging folder beside the outputs.
When all of them exist, `manifest.json` (each file's name, size and SHA-256) is written
into the stage too, and the set is committed:

1. a journal `.commit.json` naming the stage and the files of the previous set that the
   new one no longer has is written (atomically);
2. the files are moved into place, results.json last of them (each an atomic rename);
3. the previous set's left-over files are removed; `manifest.json` moves in last;
4. the journal is removed.

A run that fails before step 1 leaves the previous set untouched. A run killed during
steps 2-4 leaves the journal: the next use of the folder (`staged_output`, `recover`,
`verify_outputs`) finishes the commit from the stage, so the folder holds either the old
set or the new one, never a mix. Readers trust the manifest (`verify_outputs`): a file
that is missing or whose hash differs is named. A run killed outright before its commit
leaves its staging folder behind; the next run into the same folder removes staging
folders whose process is gone (the folder name carries the process id). Moves replace
the names in the folder, never follow a symbolic link planted there.
"""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import tempfile
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

from fem.errors import CaseError
from fem.results import atomic_write

__all__ = ["staged_output", "check_writable", "recover", "verify_outputs", "MANIFEST",
           "JOURNAL"]

MANIFEST = "manifest.json"
JOURNAL = ".commit.json"


def check_writable(out: Path) -> None:
    """Refuse (exit 2, before any solve) an output folder that cannot be created or
    written: a probe file is made and removed."""
    out = Path(out)
    if out.exists() and not out.is_dir():
        raise CaseError(str(out), "--out", "exists and is not a folder; give a folder for the "
                                           "outputs")
    try:
        out.mkdir(parents=True, exist_ok=True)
        fd, probe = tempfile.mkstemp(prefix=".probe-", dir=out)
        os.close(fd)
        os.unlink(probe)
    except OSError as exc:
        raise CaseError(str(out), "--out", f"cannot write in the output folder "
                                           f"({exc.__class__.__name__}); give a folder you "
                                           "can write to") from None


@contextmanager
def staged_output(out: Path) -> Iterator[Path]:
    """Yield a staging folder; on success commit its files into `out` as one set."""
    out = Path(out)
    out.mkdir(parents=True, exist_ok=True)
    recover(out)
    _sweep_stale(out)
    stage = Path(tempfile.mkdtemp(prefix=f".staging-{os.getpid()}-", dir=out))
    try:
        yield stage
        _commit(out, stage)
    finally:
        if not _journal_names(out, stage):   # a commit begun and cut short stays for recover
            shutil.rmtree(stage, ignore_errors=True)


def _sha256(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def _read_json(path: Path) -> dict | None:
    try:
        d = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError, json.JSONDecodeError):
        return None
    return d if isinstance(d, dict) else None


def _manifest_files(out: Path) -> dict[str, dict]:
    m = _read_json(out / MANIFEST)
    files = m.get("files") if m else None
    return files if isinstance(files, dict) else {}


def _commit(out: Path, stage: Path) -> None:
    names = sorted((p.name for p in stage.iterdir() if p.is_file() and p.name != MANIFEST),
                   key=lambda n: (n == "results.json", n))
    files = {n: {"bytes": (stage / n).stat().st_size, "sha256": _sha256(stage / n)}
             for n in names}
    atomic_write(stage / MANIFEST, json.dumps({"schema": 1, "files": files},
                                               indent=1).encode("utf-8"))
    stale = sorted(set(_manifest_files(out)) - set(files) - {MANIFEST})
    atomic_write(out / JOURNAL, json.dumps({"stage": stage.name, "order": names,
                                             "remove": stale}).encode("utf-8"))
    _finish(out, stage, names, stale)


def _finish(out: Path, stage: Path, order: list[str], remove: list[str]) -> None:
    for n in order:
        if (stage / n).exists():
            os.replace(stage / n, out / n)
    for n in remove:
        if "/" not in n and n not in (MANIFEST, JOURNAL):
            try:
                os.unlink(out / n)
            except FileNotFoundError:
                pass
    if (stage / MANIFEST).exists():
        os.replace(stage / MANIFEST, out / MANIFEST)
    _fsync_dir(out)
    os.unlink(out / JOURNAL)
    shutil.rmtree(stage, ignore_errors=True)


def _fsync_dir(path: Path) -> None:
    if os.name != "posix":
        return
    fd = os.open(path, os.O_RDONLY)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def _journal_names(out: Path, stage: Path | None = None) -> dict | None:
    """The journal of a commit in progress (for `stage`, if given), or None."""
    j = _read_json(out / JOURNAL)
    if j is None or not isinstance(j.get("stage"), str):
        return None
    if stage is not None and j["stage"] != stage.name:
        return None
    return j


def recover(out: Path) -> bool:
    """Finish a commit that a kill cut short (roll forward from its stage); True if one
    was found. A journal whose stage is gone is removed (`verify_outputs` then tells
    whether the folder is whole)."""
    out = Path(out)
    if not (out / JOURNAL).exists():
        return False
    j = _journal_names(out)
    stage = out / j["stage"] if j and "/" not in j["stage"] else None
    if stage is None or not stage.is_dir() or stage.is_symlink():
        os.unlink(out / JOURNAL)
        return True
    order = [n for n in j.get("order", []) if isinstance(n, str) and "/" not in n]
    remove = [n for n in j.get("remove", []) if isinstance(n, str)]
    _finish(out, stage, order, remove)
    return True


def verify_outputs(out: Path) -> list[str]:
    """What is wrong with the set in `out` against its manifest (empty: whole). Finishes an
    interrupted commit first."""
    out = Path(out)
    recover(out)
    if not (out / MANIFEST).exists():
        return [f"{MANIFEST} is missing: the folder holds no committed set"]
    files = _manifest_files(out)
    if not files:
        return [f"{MANIFEST} is damaged"]
    problems = []
    for name, meta in files.items():
        p = out / name
        if "/" in name or p.is_symlink() or not p.is_file():
            problems.append(f"{name} is missing")
        elif _sha256(p) != meta.get("sha256"):
            problems.append(f"{name} is not the file of this set (its hash differs)")
    return problems


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
