"""What regress and sweep share to run many checks: worker processes, a lock, a bar.

gmsh is not thread-safe and keeps global state, so a process runs one check at a time
(`POINT_LOCK`, taken around each check in a worker); parallelism comes from processes.
"""

from __future__ import annotations

import os
import signal
import sys
import threading
import time
from collections.abc import Iterator
from contextlib import contextmanager
from typing import Any

__all__ = ["POINT_LOCK", "progress_bar", "process_pool", "end_workers", "terminate_as_interrupt",
           "PARENT_POLL"]

PARENT_POLL = 1.0   # seconds between a worker's checks that the main process still lives

POINT_LOCK = threading.Lock()   # one check at a time per process: gmsh is not thread-safe

def progress_bar(total: int, desc: str, quiet: bool = False, unit: str = "point") -> Any:
    """A tqdm bar on stderr; silent (disabled) when quiet or when stderr is not a terminal."""
    from tqdm import tqdm

    return tqdm(total=total, desc=desc, unit=unit, file=sys.stderr, dynamic_ncols=True,
                leave=False, disable=quiet or not sys.stderr.isatty())


def _watch_parent(parent: int) -> None:
    """In each worker: end this process once the main process is gone (killed outright,
    even by SIGKILL, which no handler sees), so no worker outlives its sweep."""
    def watch() -> None:
        while True:
            time.sleep(PARENT_POLL)
            if os.getppid() != parent:
                os._exit(3)

    threading.Thread(target=watch, name="shearcheck-parent-watch", daemon=True).start()


def process_pool(workers: int | None):
    """A process pool (spawn: every worker a fresh interpreter with its own gmsh); each
    worker ends itself when the main process is gone (`_watch_parent`)."""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor

    n = max(1, workers or os.cpu_count() or 1)
    return ProcessPoolExecutor(max_workers=n, mp_context=multiprocessing.get_context("spawn"),
                               initializer=_watch_parent, initargs=(os.getpid(),))


def end_workers(pool: Any) -> None:
    """Stop a pool now: cancel what has not started and terminate the running workers."""
    procs = list((getattr(pool, "_processes", None) or {}).values())
    pool.shutdown(wait=False, cancel_futures=True)
    for p in procs:
        if p.is_alive():
            p.terminate()
    for p in procs:
        p.join(timeout=5)
        if p.is_alive():
            p.kill()


@contextmanager
def terminate_as_interrupt() -> Iterator[None]:
    """While inside: SIGTERM to the main process raises KeyboardInterrupt (as SIGINT does),
    so the code that stops the workers runs. Only in the main thread; restored after."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return

    def interrupt(signum, frame):
        raise KeyboardInterrupt

    old = signal.signal(signal.SIGTERM, interrupt)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, old)
