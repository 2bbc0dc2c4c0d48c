"""What regress and sweep share to run many checks: worker processes, a lock, a bar.

gmsh is not thread-safe and keeps global state, so a process runs one check at a time
(`POINT_LOCK`, taken around each check in a worker); parallelism comes from processes.
"""

from __future__ import annotations

import os
import sys
import threading
from typing import Any

__all__ = ["POINT_LOCK", "progress_bar", "process_pool"]

POINT_LOCK = threading.Lock()   # one check at a time per process: gmsh is not thread-safe

def progress_bar(total: int, desc: str, quiet: bool = False, unit: str = "point") -> Any:
    """A tqdm bar on stderr; silent (disabled) when quiet or when stderr is not a terminal."""
    from tqdm import tqdm

    return tqdm(total=total, desc=desc, unit=unit, file=sys.stderr, dynamic_ncols=True,
                leave=False, disable=quiet or not sys.stderr.isatty())


def process_pool(workers: int | None):
    """A process pool (spawn: every worker a fresh interpreter with its own gmsh)."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    n = max(1, workers or os.cpu_count() or 1)
    return ProcessPoolExecutor(max_workers=n, mp_context=multiprocessing.get_context("spawn"))
