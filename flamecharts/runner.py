"""Run a study: solve every point the store lacks, in parallel, commit each as it finishes.

The parent process walks the warm-start tree of the plan (plan.warm_tree): a point
is handed to a worker once the flame it warm-starts from has finished, with that
flame's profile in the task. Each task is one flame, so every finished flame comes
back, and is committed, at once; an idle worker takes the ready point with the
longest warm-start path below it. Workers are joblib's loky processes (the executor
behind ``joblib.Parallel``), used through its futures interface because the tree
hands work on point by point. With ``jobs=1`` everything runs in this process.

Workers return plain data; only the parent writes the store. With ``cluster`` the
same loop submits to Dask workers instead (see cluster.py).

The tree spans every point of the study, stored ones included, so a resumed run starts
each point from the same neighbour as an uninterrupted one (its stored profile) and
gives the same flames. Ctrl-C: the first stops handing out work and lets running
flames finish and be stored (then :class:`RunInterrupted`), a second stops at once.
"""
from __future__ import annotations

import heapq
import os
import signal
import threading
import time
import uuid
from concurrent.futures import FIRST_COMPLETED, wait
from dataclasses import dataclass, field
from pathlib import Path
from typing import Callable

from . import plan as planmod
from .errors import FlamechartsError, StoreError, first_line
from .flame import NUMERICS, solve_flame
from .store import DB_NAME, RunLock, Store
from .study import Study, save_config_copy

#: A worker that dies (killed, out of memory) costs its point this many retries.
MAX_RETRIES = 2


@dataclass
class Progress:
    """What a progress callback receives after every finished point."""

    done: int
    total: int
    failed: int
    no_flame: int
    reused: int
    elapsed_s: float
    last: dict | None = None
    stopping: bool = False  # a first Ctrl-C arrived: no new work, running flames finish


@dataclass
class RunSummary:
    """Outcome of :func:`run_study`."""

    out_dir: Path
    rows: list[dict]
    solved: int     # flames solved in this run (any status)
    reused: int     # points taken from the store
    failed: int
    no_flame: int
    wall_seconds: float
    failures: list[dict] = field(default_factory=list)
    solve_seconds: float = 0.0  # summed over the flames solved in this run, as measured by the workers
    workers: int = 1            # worker processes (local) or worker threads (cluster) that solved them

    @property
    def worker_utilisation(self) -> float | None:
        """Share of the workers' wall time spent solving flames: solve seconds / (workers x wall seconds)."""
        if not self.solved or self.wall_seconds <= 0:
            return None
        return self.solve_seconds / (self.workers * self.wall_seconds)


class RunInterrupted(KeyboardInterrupt):
    """The run was stopped by Ctrl-C (SIGINT); every flame that finished is stored.

    ``solved`` flames were committed by this run, ``remaining`` points of the study are
    still unsolved; ``at_once`` is True when a second Ctrl-C abandoned running flames.
    """

    def __init__(self, solved: int = 0, remaining: int = 0, at_once: bool = False):
        super().__init__("interrupted")
        self.solved, self.remaining, self.at_once = solved, remaining, at_once


# ---------------------------------------------------------------- worker side
_GAS_CACHE: dict = {}


def _quiet_worker() -> None:
    """Keep Cantera's C++ log output and warnings away from the user's terminal, and
    leave Ctrl-C to the parent: a terminal sends SIGINT to the whole process group, and
    the parent decides whether running flames finish (first Ctrl-C) or are abandoned.
    A Dask worker runs tasks in a thread, where signals cannot be set (and its nanny
    process handles them); there only the log is silenced."""
    if threading.current_thread() is threading.main_thread():
        signal.signal(signal.SIGINT, signal.SIG_IGN)
    devnull = os.open(os.devnull, os.O_WRONLY)
    os.dup2(devnull, 1)
    os.close(devnull)


def _gas(mechanism_path: str, sha: str, transport: str):
    import cantera as ct

    key = (mechanism_path, sha, transport)
    if key not in _GAS_CACHE:
        _GAS_CACHE.clear()
        model = "mixture-averaged" if transport == "unity-Lewis-number" else transport
        _GAS_CACHE[key] = ct.Solution(mechanism_path, transport_model=model)
    return _GAS_CACHE[key]


def solve_task(task: dict) -> dict:
    """Solve one point from a plain task dict; returns a plain result dict (runs in a worker)."""
    cpu0 = time.process_time()
    gas = _gas(task["mechanism_path"], task["mechanism_sha256"], task["transport"])
    result = solve_flame(gas, task["T_u"], task["P"], task["X"], task["transport"],
                         task["thermal_diffusion"], NUMERICS[task["resolution"]], task.get("warm"))
    result["key"] = task["key"]
    result["cpu_seconds"] = time.process_time() - cpu0
    return result


# ---------------------------------------------------------------- parent side
def default_out_dir(study: Study) -> Path:
    return Path("output") / study.name


def _task(study: Study, p: planmod.Point, warm: dict | None) -> dict:
    return {"key": p.key, "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "transport": study.transport,
            "thermal_diffusion": study.thermal_diffusion, "resolution": study.resolution,
            "T_u": p.T_u, "P": p.P, "X": p.X_unburned, "warm": warm}


class _InProcess:
    """A one-worker executor that runs tasks in this process (jobs=1)."""

    def submit(self, fn, arg):
        from concurrent.futures import Future

        fut = Future()
        try:
            fut.set_result(fn(arg))
        except BaseException as exc:  # noqa: BLE001 - handed to the caller like a pool would
            fut.set_exception(exc)
        return fut

    def shutdown(self, wait=True, kill_workers=False):
        pass


def _executor(jobs: int, cluster=None, study: Study | None = None):
    if cluster is not None:
        return cluster.executor(study)
    if jobs == 1:
        return _InProcess()
    from joblib.externals.loky import get_reusable_executor

    return get_reusable_executor(max_workers=jobs, initializer=_quiet_worker, timeout=60)


def _fresh_executor(jobs: int, cluster=None, study: Study | None = None, attempts: int = 3):
    """The executor after a worker died: loky replaces a broken pool; starting its helper
    processes again can hit a pipe that died with them, so try a few times."""
    for i in range(attempts):
        try:
            return _executor(jobs, cluster, study)
        except OSError:
            if i == attempts - 1:
                raise
            time.sleep(0.5)


def resolve_jobs(jobs: int | None) -> int:
    n = os.cpu_count() or 1
    if jobs is None or jobs == 0:
        return n
    if jobs < 0:
        return max(1, n + 1 + jobs)
    return jobs


def study_rows(study: Study, pts: list[planmod.Point], stored: dict[str, dict]) -> list[dict]:
    """One flat row per point, in study order, from stored results (missing -> 'pending'),
    with the design indicators, fuel-gas properties and burner margins added, and the
    range warnings of each point (column 'warnings', see ranges.py)."""
    from .design import annotate
    from .export import flat_row
    from .ranges import point_warnings

    rows = annotate(study, [flat_row(study, p, stored.get(p.key)) for p in pts])
    for p, r in zip(pts, rows):
        r["warnings"] = point_warnings(study, p, r)
    return rows


def warm_plan(store: Store, unique: list[planmod.Point]) -> planmod.WarmPlan:
    """The warm-start tree of a study's distinct points against its store.

    The tree spans ALL points of the study, stored ones included, and takes as extra
    sources only stored flames of other studies: a resumed run then starts every point
    from the same neighbour's profile as an uninterrupted run would (read from the store
    when that neighbour is stored), so it gives the same answers.
    """
    own = {p.key for p in unique}
    sources = [planmod.StoredFlame(**s) for s in store.warm_sources({p.family for p in unique})
               if s["key"] not in own]
    return planmod.warm_tree(unique, sources)


def unique_points(pts: list[planmod.Point]) -> list[planmod.Point]:
    """One point per distinct key, in study order: two points of a study may be the same flame."""
    return list({p.key: p for p in pts}.values())


def run_study(study: Study, out_dir: str | os.PathLike | None = None, jobs: int | None = None,
              progress: Callable[[Progress], None] | None = None,
              stop_after: int | None = None, cluster=None) -> RunSummary:
    """Solve every point of ``study`` that the store in ``out_dir`` lacks.

    Parameters
    ----------
    study : validated study (see :func:`flamecharts.study.load_study`)
    out_dir : output folder; default output/<config name>/
    jobs : worker processes; None or 0 = all cores, negative = all but |jobs|-1
    progress : called after each finished point with a :class:`Progress`
    stop_after : hand out at most this many new points, then stop (simulates an interruption)
    cluster : Dask scheduler address ('tcp://HOST:PORT') or 'local:N' to solve on a Dask
        cluster instead of local processes (``jobs`` is then ignored); default: the
        study's ``cluster`` key, else local processes

    Raises
    ------
    RunInterrupted (a KeyboardInterrupt) after Ctrl-C, once the finished flames are stored.

    Returns
    -------
    RunSummary with the rows of every point (stored ones included).
    """
    t0 = time.perf_counter()
    cluster = study.cluster if cluster is None else cluster
    if isinstance(cluster, str):
        from .cluster import open_cluster
        from .study import check_cluster_spec

        with open_cluster(check_cluster_spec(cluster, "cluster")) as session:
            summary = run_study(study, out_dir, jobs, progress, stop_after, cluster=session)
            summary.wall_seconds = time.perf_counter() - t0  # connecting (or starting the cluster) included
        return summary
    out = Path(out_dir) if out_dir is not None else default_out_dir(study)
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise FlamechartsError(f"output folder {out} cannot be created: {exc.strerror}") from None
    jobs = resolve_jobs(jobs) if cluster is None else cluster.max_in_flight
    pts = planmod.points(study)
    run_id = uuid.uuid4().hex[:12]
    with RunLock(out), Store(out / DB_NAME) as store:
        save_config_copy(study, out)  # the folder alone can redraw its charts, even if this run is killed
        # points are solved again only when a worker died on them (a transient failure)
        done_keys = {k for k, r in store.rows().items()
                     if not (r["status"] == "failed" and r["message"].startswith("worker error"))}
        unique = unique_points(pts)
        todo = [p for p in unique if p.key not in done_keys]
        reused = len(pts) - sum(1 for p in pts if p.key not in done_keys)
        tree = warm_plan(store, unique)
        by_index = {p.index: p for p in unique}
        pending = {p.index for p in todo}
        children: dict[int, list[int]] = {}
        ready: list[tuple[int, int]] = []  # heap: the longest warm-start path below first
        for p in todo:
            par = tree.parent[p.index]
            if par is None or par not in pending:
                heapq.heappush(ready, (-tree.height[p.index], p.index))
            else:
                children.setdefault(par, []).append(p.index)
        finished: dict[int, dict] = {}
        retries: dict[int, int] = {}
        in_flight: dict = {}
        limit = stop_after if stop_after is not None else len(todo)
        submitted = solved = failed = no_flame = 0
        executor = _executor(jobs, cluster, study)
        solve_seconds = 0.0

        def warm_for(p: planmod.Point) -> dict | None:
            """Profile of the nearest burning flame up the point's warm-start path, finished
            in this run or stored by an earlier one (a failed flame passes its own source
            on), else of the stored flame of another study the path starts from (None:
            solve fresh)."""
            cur = p.index
            while tree.parent[cur] is not None:
                cur = tree.parent[cur]
                if cur in finished:
                    prof = finished[cur].get("profile")
                else:
                    prof = store.profile(by_index[cur].key)
                if prof is not None:
                    return prof
            return store.profile(tree.stored[cur]) if cur in tree.stored else None

        # First Ctrl-C: hand out nothing new, let running flames finish and commit them.
        # Second Ctrl-C: stop at once (running flames are abandoned, nothing partial is stored).
        stop = {"requested": False, "reported": False}
        installed, old_handler = False, None
        if threading.current_thread() is threading.main_thread():
            def on_sigint(signum, frame):
                if stop["requested"]:
                    raise RunInterrupted(solved, len(pending), at_once=True)
                stop["requested"] = True
            old_handler = signal.signal(signal.SIGINT, on_sigint)
            installed = True

        def report(last=None) -> None:
            if progress is not None:
                progress(Progress(done=solved, total=len(todo), failed=failed, no_flame=no_flame, reused=reused,
                                  elapsed_s=time.perf_counter() - t0, last=last, stopping=stop["requested"]))

        report()
        clean_exit = False
        try:
            while ready or in_flight:
                while ready and len(in_flight) < jobs and submitted < limit and not stop["requested"]:
                    p = by_index[heapq.heappop(ready)[1]]
                    in_flight[executor.submit(solve_task, _task(study, p, warm_for(p)))] = p
                    submitted += 1
                if stop["requested"] and not stop["reported"]:
                    stop["reported"] = True
                    report()
                if not in_flight:
                    break
                done, _ = wait(list(in_flight), timeout=0.5, return_when=FIRST_COMPLETED)
                for fut in done:
                    p = in_flight.pop(fut)
                    try:
                        result = fut.result()
                    except FlamechartsError:
                        raise  # a worker refused the task (other versions): stop the run
                    except Exception as exc:  # the worker died or the task raised: retry, then record
                        retries[p.index] = retries.get(p.index, 0) + 1
                        if retries[p.index] <= MAX_RETRIES:
                            heapq.heappush(ready, (-tree.height[p.index], p.index))
                            submitted -= 1
                            executor = _fresh_executor(jobs, cluster, study)
                            continue
                        result = {"status": "failed", "start": "fresh", "metrics": None, "profile": None,
                                  "message": f"worker error: {type(exc).__name__}: {first_line(exc)}",
                                  "solve_seconds": 0.0}
                    result["inputs"] = p.inputs
                    store.commit_point(p, result, run_id)
                    finished[p.index] = result
                    pending.discard(p.index)
                    for c in children.get(p.index, []):
                        heapq.heappush(ready, (-tree.height[c], c))
                    solved += 1
                    solve_seconds += result["solve_seconds"]
                    failed += result["status"] == "failed"
                    no_flame += result["status"] == "no_flame"
                    report({"point": p, "status": result["status"], "message": result["message"],
                            "start": result["start"], "solve_seconds": result["solve_seconds"],
                            "cpu_seconds": result.get("cpu_seconds", 0.0)})
            clean_exit = not stop["requested"]
        finally:
            if installed:
                signal.signal(signal.SIGINT, old_handler if old_handler is not None else signal.SIG_DFL)
            if not clean_exit:
                executor.shutdown(wait=False, kill_workers=True)
        if stop["requested"]:
            raise RunInterrupted(solved, len(pending))
        stored = store.rows([p.key for p in pts])
    rows = study_rows(study, pts, stored)
    failures = [r for r in rows if r["status"] in ("failed", "no_flame")]
    return RunSummary(out_dir=out, rows=rows, solved=solved, reused=reused,
                      failed=sum(1 for r in rows if r["status"] == "failed"),
                      no_flame=sum(1 for r in rows if r["status"] == "no_flame"),
                      wall_seconds=time.perf_counter() - t0, failures=failures, solve_seconds=solve_seconds,
                      workers=jobs if cluster is None else max(1, cluster.worker_threads()))


def rows_from_dir(out_dir: Path) -> tuple[Study, list[dict]]:
    """The study of a finished run folder and its rows, read from the store alone."""
    from .study import load_config_copy

    study = load_config_copy(out_dir)
    pts = planmod.points(study)
    with Store(Path(out_dir) / DB_NAME, readonly=True) as store:
        stored = store.rows([p.key for p in pts])
        n_stored = len(store.keys())
    if n_stored and not stored:
        raise StoreError(f"none of the {n_stored} flames stored in {out_dir} matches the study any more: the "
                         "mechanism file or the Cantera version changed since the run; rerun the study "
                         "(flamecharts run CONFIG --out DIR) to solve it with what is installed now")
    return study, study_rows(study, pts, stored)
