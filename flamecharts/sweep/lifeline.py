"""Worker processes that die with the run's process: no orphans, however the run ends.

The worker processes a run starts itself (the loky pool; the workers of
``--cluster local:N``) are children of the run's process. When that process is killed
outright (SIGKILL, an out-of-memory killer, a terminal that dies without signalling the
process group), nothing tells them: loky workers were found still alive as orphans more
than ten minutes later. :func:`exit_with` binds a worker to the run's process in two ways:

- on Linux the kernel sends the worker SIGKILL the moment its parent dies
  (``prctl(PR_SET_PDEATHSIG)``), even in the middle of a Cantera call. The kernel watches
  the parent *thread* that forked the worker and the worker *thread* that asked, so this
  is set only when both are main threads, which live as long as their processes;
  otherwise (Dask forks its workers from helper threads; a run started from a thread)
  the worker keeps only the watch below, and never dies while its parent lives;
- everywhere, a daemon thread checks every :data:`WATCH_INTERVAL_S` whether the run's
  process is still the worker's parent and ends the worker at once if not. Being a
  Python thread, it acts when the solver returns to Python at Cantera's time-step and
  steady callbacks: the longest wait measured was 0.12 s on h2o2, 1.6 s on a fresh
  GRI-Mech 3.0 flame (docs/benchmarks.md, Orphan workers).

Workers never write the store (only the run's process commits, one transaction per
flame), so a worker ended at any moment loses nothing but the flame it held, which the
next run solves. This module does not change any answer: it is not part of the worker
code fingerprint (``worker.WORKER_CODE``).
"""
from __future__ import annotations

import os
import signal
import sys
import threading
import time

#: Seconds between two looks of the watch thread at the worker's parent.
WATCH_INTERVAL_S = 0.5

#: Exit status of a worker that ended because the run's process was gone.
ORPHAN_EXIT = 70

#: linux/prctl.h: set the signal the calling thread gets when its parent thread dies.
_PR_SET_PDEATHSIG = 1


def exit_with(parent: int) -> None:
    """Make this worker process end as soon as the process ``parent`` (its parent, the
    run's process) dies, however it dies: the kernel's parent-death signal where it is
    safe (Linux, see the module docstring), a watch thread everywhere. A worker whose
    parent is already gone ends here."""
    if _is_main_thread() and _forked_by_main_thread(parent):
        _kill_me_when_parent_dies()
    if _orphaned(parent):  # gone before the signal was set: the kernel will not send it
        os._exit(ORPHAN_EXIT)
    threading.Thread(target=_watch, args=(parent,), name="flamecharts-lifeline", daemon=True).start()


def _orphaned(parent: int) -> bool:
    """True once ``parent`` is no longer this process's parent: it died, and the
    process was handed to init or a subreaper, whose pid differs."""
    return os.getppid() != parent


def _watch(parent: int) -> None:
    """The watch thread: end the worker at once (no cleanup, no more solving) when the
    run's process is gone."""
    while not _orphaned(parent):
        time.sleep(WATCH_INTERVAL_S)
    os._exit(ORPHAN_EXIT)


def _is_main_thread() -> bool:
    """The parent-death signal belongs to the thread that sets it and is lost when that
    thread ends: only the worker's main thread lives as long as the worker."""
    return threading.current_thread() is threading.main_thread()


def _forked_by_main_thread(parent: int) -> bool:
    """True if the main thread of ``parent`` forked this process (Linux: the process is
    listed in /proc/PARENT/task/PARENT/children). The kernel sends the parent-death
    signal when the forking *thread* ends; a helper thread can end while the run goes
    on, the main thread cannot. False where /proc does not say (other systems, kernels
    without that file): the watch thread alone then guards the worker."""
    if not sys.platform.startswith("linux"):
        return False
    try:
        with open(f"/proc/{parent}/task/{parent}/children", encoding="ascii") as fh:
            return str(os.getpid()) in fh.read().split()
    except OSError:
        return False


def _kill_me_when_parent_dies() -> bool:
    """Ask the Linux kernel for SIGKILL when the parent thread dies (prctl
    PR_SET_PDEATHSIG): immediate, and it works while the solver holds the interpreter.
    True if the kernel agreed."""
    import ctypes  # Linux only: callers check the platform first

    try:
        libc = ctypes.CDLL(None, use_errno=True)
        return libc.prctl(_PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0) == 0
    except (OSError, AttributeError):
        return False
