"""Where flames are solved: this process, local worker processes, or a Dask cluster.

Every backend gives the run loop the same four things: ``slots`` (flames in flight at
once), ``executor(study)`` (``submit(fn, task) -> Future``, ``shutdown``), ``renew(study)``
(the executor again after a worker died) and ``workers()`` (how many solve at once).
The local one is joblib's loky process pool, used through its futures interface
because the warm-start tree hands work on point by point; the cluster one is
dask_backend.ClusterSession.
"""
from __future__ import annotations

import contextlib
import os
import time
from collections.abc import Callable, Iterator
from concurrent.futures import Future
from typing import TYPE_CHECKING, Protocol

from joblib.externals.loky import get_reusable_executor

from ..config import check_cluster_spec

if TYPE_CHECKING:
    from ..config import Study


class Executor(Protocol):
    """What the run loop asks of an executor (concurrent.futures-like)."""

    def submit(self, fn: Callable[[dict], dict], task: dict, /) -> Future[dict]: ...

    def shutdown(self, wait: bool = True, kill_workers: bool = False) -> None: ...


class Backend(Protocol):
    """What the run loop asks of a backend (LocalBackend, dask_backend.ClusterSession)."""

    slots: int

    def executor(self, study: Study) -> Executor: ...

    def renew(self, study: Study) -> Executor: ...

    def workers(self) -> int: ...


class InProcess:
    """A one-worker executor that runs tasks in this process (jobs=1)."""

    def submit(self, fn: Callable[[dict], dict], arg: dict) -> Future[dict]:
        fut: Future[dict] = Future()
        try:
            fut.set_result(fn(arg))
        except BaseException as exc:  # noqa: BLE001 - handed to the caller like a pool would
            fut.set_exception(exc)
        return fut

    def shutdown(self, wait: bool = True, kill_workers: bool = False) -> None:
        pass


def resolve_jobs(jobs: int | None) -> int:
    """Worker processes for ``jobs``: None or 0 = all cores, negative = all but |jobs|-1."""
    n = os.cpu_count() or 1
    if jobs is None or jobs == 0:
        return n
    if jobs < 0:
        return max(1, n + 1 + jobs)
    return jobs


class LocalBackend:
    """``jobs`` local worker processes (loky), or this process alone for ``jobs=1``."""

    #: Attempts at starting the pool again after a worker died.
    RENEW_ATTEMPTS = 3

    def __init__(self, jobs: int | None) -> None:
        self.slots = resolve_jobs(jobs)

    def executor(self, study: Study | None = None) -> Executor:
        if self.slots == 1:
            return InProcess()
        from .worker import local_worker  # the solver, here: importing the backends loads no Cantera

        return get_reusable_executor(max_workers=self.slots, initializer=local_worker, initargs=(os.getpid(),),
                                     timeout=60)

    def renew(self, study: Study | None = None) -> Executor:
        """The executor after a worker died: loky replaces a broken pool; starting its helper
        processes again can hit a pipe that died with them, so try a few times."""
        for i in range(self.RENEW_ATTEMPTS):
            try:
                return self.executor(study)
            except OSError:
                if i == self.RENEW_ATTEMPTS - 1:
                    raise
                time.sleep(0.5)
        raise AssertionError("not reached: the last attempt returns or raises")

    def workers(self) -> int:
        return self.slots


@contextlib.contextmanager
def open_backend(jobs: int | None = None, cluster: str | None = None) -> Iterator[Backend]:
    """The backend of a run: a Dask cluster for ``cluster`` ('tcp://HOST:PORT' or
    'local:N', checked), else ``jobs`` local processes. Dask is imported only here,
    when a cluster is asked for: it adds about a second to start-up."""
    if cluster is None:
        yield LocalBackend(jobs)
        return
    from .dask_backend import open_cluster

    with open_cluster(check_cluster_spec(cluster, "cluster")) as session:
        yield session
