"""Send a study's flames to a Dask cluster (dask.distributed) instead of local processes.

``open_cluster(spec, study)`` connects to a running Dask scheduler (``tcp://HOST:PORT``,
``tls://HOST:PORT``) or starts a local one (``local:N``: N worker processes, one thread
each), checks that every worker runs the same flamecharts, Cantera and Python as this
process, and returns a :class:`ClusterSession`. Its :meth:`ClusterSession.executor`
looks like the local process pool to the run loop (backends.py) (``submit``/``shutdown``, futures that
``concurrent.futures.wait`` understands), so the run loop's warm-start logic, retries and
one-commit-per-point store are the same for both.

Workers may not share a filesystem with this process: each task carries the mechanism
file's text, and the worker writes it to its own temporary folder (once per worker and
mechanism) before it solves. A mechanism that pulls species or reactions from other
files is sent as one self-contained YAML text written by Cantera. Workers return plain
data; only the process that called :func:`flamecharts.run` writes the store.

Dask's scheduler reruns a task whose worker died (up to its ``allowed-failures``
setting, 3 by default) before the run loop sees an error; it then retries the
point MAX_RETRIES more times before recording it as failed. A point is committed once,
when its future first completes.
"""
from __future__ import annotations

import hashlib
import logging
import os
import sys
import tempfile
import uuid
from collections.abc import Callable
from concurrent.futures import Future
from pathlib import Path
from typing import TYPE_CHECKING

from .._version import __version__
from ..chemistry.mechanism import cantera_version, mechanism_text
from ..errors import FlamechartsError, first_line
from .worker import code_fingerprint, local_worker

if TYPE_CHECKING:
    from distributed import Client, LocalCluster

    from ..config import Study

#: Seconds to wait for a scheduler to answer before giving up.
CONNECT_TIMEOUT_S = 10

class ClusterError(FlamechartsError):
    """The Dask cluster cannot be reached, started, or runs other versions than this process."""


# ------------------------------------------------------------------ both sides
def local_versions() -> dict[str, str]:
    """Versions a worker must share with the client: flamecharts, the worker's code
    (sweep.worker.code_fingerprint), Cantera, Python."""
    return {"flamecharts": __version__, "flamecharts code": code_fingerprint(),
            "Cantera": cantera_version(), "Python": f"{sys.version_info[0]}.{sys.version_info[1]}"}


def version_mismatch(expected: dict[str, str], found: dict[str, str], worker: str) -> str | None:
    """One-line description of the first version that differs (None: all agree)."""
    for name, want in expected.items():
        have = found.get(name)
        if have != want:
            return (f"Dask worker {worker} runs {name} {have}, this process {want}; install the same "
                    "flamecharts and Cantera on every worker (docs/cluster.md)")
    return None


# ---------------------------------------------------------------- worker side
_CHECKED: dict = {}


def _worker_name() -> str:
    try:
        from distributed import get_worker

        return get_worker().address
    except (ImportError, ValueError):
        return f"pid {os.getpid()}"


def _mechanism_file(text: str, sha: str) -> str:
    """Write the mechanism text once per worker into its temporary folder; return the path."""
    path = Path(tempfile.gettempdir()) / f"flamecharts-mechanism-{sha[:16]}.yaml"
    if not path.is_file():
        tmp = path.with_suffix(f".{uuid.uuid4().hex}.tmp")
        tmp.write_text(text, encoding="utf-8")
        os.replace(tmp, path)
    return str(path)


def run_on_worker(fn: Callable[[dict], dict], task: dict, expected: dict[str, str], parent: int | None) -> dict:
    """Worker entry of every cluster task: check versions (first task of this worker),
    write the mechanism locally, then run ``fn(task)`` exactly as a local process would.
    ``parent`` is the pid of the run's process when it started the cluster itself
    (``local:N``): the worker is then quiet and ends when that process dies
    (worker.local_worker); None for a cluster started elsewhere."""
    if "versions" not in _CHECKED:
        problem = version_mismatch(expected, local_versions(), _worker_name())
        if problem:
            raise ClusterError(problem)
        if parent is not None:
            local_worker(parent)
        _CHECKED["versions"] = True
    task = dict(task)
    task["mechanism_path"] = _mechanism_file(task.pop("mechanism_yaml"), task["mechanism_text_sha256"])
    return fn(task)


# ---------------------------------------------------------------- client side
def parse_spec(spec: str) -> tuple[str, int | None]:
    """'local:N' -> ('local', N); a scheduler address -> (address, None)."""
    if spec.startswith("local:"):
        return "local", int(spec.split(":", 1)[1])
    return spec, None


class _Executor:
    """The run loop's view of the cluster: submit(fn, task) -> concurrent.futures.Future."""

    def __init__(self, session: ClusterSession, study: Study) -> None:
        self._session = session
        self._inner = session.connected().get_executor(pure=False)
        self._extra = {"mechanism_yaml": mechanism_text(study.mechanism_path, study.transport)}
        self._extra["mechanism_text_sha256"] = hashlib.sha256(self._extra["mechanism_yaml"].encode()).hexdigest()

    def submit(self, fn: Callable[[dict], dict], task: dict) -> Future[dict]:
        key = f"flame-{task['key'][:10]}-{uuid.uuid4().hex[:8]}"
        return self._inner.submit(run_on_worker, fn, {**task, **self._extra}, self._session.expected,
                                  self._session.parent, key=key)

    def shutdown(self, wait: bool = True, kill_workers: bool = False) -> None:
        """Cancel what has not finished (the cluster itself stays up)."""
        self._inner.shutdown(wait=wait)


class ClusterSession:
    """A connected Dask client (and the local cluster it started, if any)."""

    def __init__(self, spec: str) -> None:
        self.spec = spec
        self.expected = local_versions()
        self.cluster: LocalCluster | None = None
        self.client: Client | None = None
        self.parent: int | None = None  # this process's pid once it has started the cluster itself (local:N)
        self._executor: _Executor | None = None
        self._executor_key: tuple[str, str] | None = None

    # -- connection
    def open(self) -> ClusterSession:
        try:
            from distributed import Client, LocalCluster
        except ImportError:
            raise ClusterError("--cluster needs Dask, which is an optional extra: pip install 'flamecharts[cluster]'") from None
        address, n = parse_spec(self.spec)
        if n is not None:
            try:
                self.cluster = LocalCluster(n_workers=n, threads_per_worker=1, processes=True,
                                            dashboard_address=":0", silence_logs=logging.ERROR)
            except Exception as exc:  # noqa: BLE001 - anything that stops a local cluster from starting
                raise ClusterError(f"a local Dask cluster of {n} workers (--cluster {self.spec}) did not "
                                   f"start: {first_line(exc, 200)}") from None
            address, self.parent = self.cluster.scheduler_address, os.getpid()
        try:
            self.client = Client(address, timeout=f"{CONNECT_TIMEOUT_S}s", set_as_default=False)
        except (OSError, TimeoutError, ValueError) as exc:
            self.close()
            raise ClusterError(f"no Dask scheduler answers at {self.spec!r} within {CONNECT_TIMEOUT_S} s "
                               f"({first_line(exc, 120)}); start one with 'dask scheduler' and give its "
                               "tcp://HOST:PORT, or use --cluster local:N") from None
        self.check_workers()
        return self

    def connected(self) -> Client:
        """The client, between open() and close()."""
        assert self.client is not None, "the cluster session is not open"
        return self.client

    def check_workers(self) -> None:
        """Compare the versions of every connected worker with this process (ClusterError if any differs)."""
        answers = self.connected().run(local_versions, on_error="return")
        for worker, found in sorted(answers.items()):
            if isinstance(found, BaseException):
                self.close()
                raise ClusterError(f"Dask worker {worker} cannot run flamecharts ({type(found).__name__}: "
                                   f"{first_line(found, 120)}); install flamecharts {self.expected['flamecharts']} "
                                   f"and Cantera {self.expected['Cantera']} on every worker")
            problem = version_mismatch(self.expected, found, worker)
            if problem:
                self.close()
                raise ClusterError(problem)

    #: Points in flight at once: every ready point is submitted and the scheduler hands it to the
    #: next idle worker, so workers that join later (adaptive clusters) find work at once.
    slots = 1_000_000

    def workers(self) -> int:
        """Threads of all workers connected now (each solves one flame at a time)."""
        workers = self.connected().scheduler_info().get("workers", {})
        return sum(w.get("nthreads", 1) for w in workers.values())

    def executor(self, study: Study) -> _Executor:
        """The executor of ``study``'s mechanism: made once per mechanism, since it carries the
        mechanism file to the workers (a study comparing mechanisms asks for each in turn)."""
        key = (study.mechanism_sha256, study.transport)
        if self._executor is None or self._executor_key != key:
            self._executor, self._executor_key = _Executor(self, study), key
        return self._executor

    def renew(self, study: Study) -> _Executor:
        """The executor after a worker died: Dask replaces workers itself, the executor stays."""
        return self.executor(study)

    def close(self) -> None:
        if self.client is not None:
            self.client.close()
            self.client = None
        if self.cluster is not None:
            self.cluster.close()
            self.cluster = None

    def __enter__(self) -> ClusterSession:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()


def open_cluster(spec: str) -> ClusterSession:
    """Connect to (or start, for 'local:N') the cluster ``spec``; check its workers' versions."""
    return ClusterSession(spec).open()
