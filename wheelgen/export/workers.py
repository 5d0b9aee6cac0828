"""Worker processes that make parts in parallel, and stop with the build.

A worker stops when the build sets its stop event (an interrupted or failed build) and
by itself when its parent dies; Ctrl-C is the parent's to decide on.
"""

from __future__ import annotations

import multiprocessing
import os
import signal
import sys
import threading
from collections.abc import Callable
from concurrent.futures import ProcessPoolExecutor, as_completed
from pathlib import Path
from typing import Any

from ..layout.part_kinds import (
    Part,
)
from .build_options import BuildOptions

__all__ = ["build_parallel"]

_WATCH_S = 0.5  # how often a worker looks for a stop or for its parent's death


def _worker_start(stop: Any) -> None:
    """Initializer of every worker: follow the parent, ignore Ctrl-C.

    A worker stops when the build sets ``stop`` (an interrupted or failed build) and
    when its parent dies (killed outright: it can clean up nothing); Ctrl-C reaches
    the whole process group, but only the parent decides what happens then.
    """
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    signal.signal(signal.SIGTERM, signal.SIG_DFL)
    parent = os.getppid()
    _die_with_parent()

    def watch() -> None:
        while not stop.wait(_WATCH_S):
            if os.getppid() != parent:
                break
        os._exit(1)  # nothing of a stopped part is kept: its entry is temporary

    threading.Thread(target=watch, name="wheelgen-watch", daemon=True).start()


def _die_with_parent() -> None:
    """On Linux, have the kernel end this process when its parent ends (at once,
    even inside a long kernel call that holds the interpreter)."""
    if not sys.platform.startswith("linux"):
        return
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        pr_set_pdeathsig = 1  # from <sys/prctl.h>
        libc.prctl(pr_set_pdeathsig, signal.SIGKILL, 0, 0, 0)
    except (OSError, AttributeError):
        pass  # the watching thread still ends the worker, a little later


def build_parallel(
    build_one: Callable[[Part, BuildOptions, Path], str],
    todo: dict[str, Part],
    options: BuildOptions,
    cache_root: Path,
    progress: Callable[[str], None] | None,
) -> None:
    """Make the parts of ``todo`` with ``build_one(part, options, cache_root)`` in up
    to ``options.jobs`` processes; report each part's name to ``progress`` when done.

    ``build_one`` must be a module-level function (the workers import it by name).
    An interruption or a failed part stops every worker before this returns.
    """
    # fork is the fastest start (no re-import of the kernel, notes §7), but a parent
    # that already ran the kernel has its thread pools, and a forked child can hang on
    # their locks: then start clean processes instead
    kernel_loaded = "OCP" in sys.modules
    ctx = multiprocessing.get_context("forkserver" if kernel_loaded else "fork")
    stop = ctx.Event()
    pool = ProcessPoolExecutor(
        min(options.jobs, len(todo)),
        mp_context=ctx,
        initializer=_worker_start,
        initargs=(stop,),
    )
    try:
        futures = {
            pool.submit(build_one, p, options, cache_root): p for p in todo.values()
        }
        for fut in as_completed(futures):
            fut.result()
            if progress is not None:
                progress(futures[fut].name)
    except BaseException:
        # interrupted (Ctrl-C, SIGTERM) or a part failed: the workers stop now
        stop.set()
        pool.shutdown(wait=True, cancel_futures=True)
        raise
    pool.shutdown(wait=True)
