"""The run loop: solve every point of a study that the store lacks, commit each as it finishes.

The loop walks the warm-start tree (warm_tree.py) with the shared :class:`Scheduler`:
a point is handed to the backend once the flame it warm-starts from has finished,
with that flame's profile in the task. Each task is one flame, so every finished
flame comes back, and is committed, at once. Workers return plain data; only this
process writes the store.

The tree spans every point of the study, stored ones included, so a resumed run starts
each point from the same neighbour as an uninterrupted one (its stored profile) and
gives the same flames. A worker that dies costs its point up to MAX_RETRIES retries;
then the point is recorded as failed (reason: worker error) and solved again by the
next run, as is a flame that ran out of its time limit (reason: time limit). Ctrl-C: the
first stops handing out work and lets running flames finish and be stored (then
:class:`RunInterrupted`), a second stops at once.
"""
from __future__ import annotations

import signal
import threading
import time
import uuid
from collections import OrderedDict
from collections.abc import Callable
from concurrent.futures import FIRST_COMPLETED, BrokenExecutor, Future, wait
from dataclasses import dataclass
from types import FrameType
from typing import TYPE_CHECKING, Any

from ..errors import FlamechartsError
from ..outcome import RETRIED_REASONS, Status, worker_error
from ..store import Store
from ..store.db import unpack_profile
from .points import Point
from .schedule import Scheduler, estimate_run_seconds, flame_cost, flame_seconds
from .warm_tree import StoredFlame, WarmPlan, warm_tree

if TYPE_CHECKING:
    from ..config import Study
    from .backends import Backend

#: A worker that dies (killed, out of memory) costs its point this many retries.
MAX_RETRIES = 2

#: Profiles of the last finished flames kept in memory for the warm starts that follow them;
#: older ones are read back from the store (the same bytes), so a 100,000-flame run
#: holds at most this many (a GRI-Mech 3.0 profile is about 130 KB decoded).
RECENT_PROFILES = 64


@dataclass
class Progress:
    """The one event a run's progress callback receives: after every finished flame of the
    sweep (``what`` 'flames'), after every finished extra solve (its progress label: 'Zeldovich
    pairs', 'flame-speed sensitivities', 'premixer ignition delays', 'burned-gas emissions',
    'flames at equal flame temperature', 'strained-flame ladders'), every flame of a round of the limit
    searches ('limit flames') and every round ('limits', ``done``/``total`` counting the
    searches answered, ``detail`` the round and its flames; its time left is the flames the open
    searches can still ask for at the measured cost per limit flame). An extra solve also reports
    its start (``done`` 0, ``estimate_s`` the analysis's estimate where it has one) and, while none
    finishes, a heartbeat every sweep.extras.HEARTBEAT_S.
    Every kind carries its elapsed time and, once something finished (or from an estimate), the time left."""

    done: int
    total: int
    failed: int
    no_flame: int
    reused: int
    elapsed_s: float
    last: dict | None = None
    stopping: bool = False  # a first Ctrl-C arrived: no new work, running flames finish
    estimate_s: float | None = None  # the plan's estimate of this run's wall time (as check prints it)
    done_share: float = 0.0          # share of the plan's estimated flame cost finished so far
    stage: str = ""                  # which part of the study, when it has several (one per mechanism)
    what: str = "flames"             # which part of the run reports: the sweep's flames, or an extra
    detail: str = ""                 # more words on it (the limit searches' round)

    @property
    def remaining_s(self) -> float | None:
        """Seconds still to go: the plan's estimate before the first flame finishes, then the
        elapsed time scaled by the cost share done (fresh flames, dear, come first: a count of
        flames would overstate what is left)."""
        if self.done_share <= 0:
            return None if self.estimate_s is None else max(self.estimate_s - self.elapsed_s, 0.0)
        return self.elapsed_s * (1.0 - self.done_share) / self.done_share


class RunInterrupted(KeyboardInterrupt):
    """The run was stopped by Ctrl-C (SIGINT); every flame that finished is stored.

    ``solved`` flames were committed by this run, ``remaining`` points of the study are
    still unsolved; ``at_once`` is True when a second Ctrl-C abandoned running flames.
    """

    def __init__(self, solved: int = 0, remaining: int = 0, at_once: bool = False) -> None:
        super().__init__("interrupted")
        self.solved, self.remaining, self.at_once = solved, remaining, at_once


@dataclass
class SolveOutcome:
    """What one pass of the run loop did."""

    solved: int = 0          # flames solved in this run (any status)
    reused: int = 0          # points taken from the store
    failed: int = 0          # of the solved ones
    no_flame: int = 0        # of the solved ones
    solve_seconds: float = 0.0


def unique_points(pts: list[Point]) -> list[Point]:
    """One point per distinct key, in study order: two points of a study may be the same flame."""
    return list({p.key: p for p in pts}.values())


def warm_plan(store: Store, unique: list[Point], only: set[str] | None = None) -> WarmPlan:
    """The warm-start tree of a study's distinct points against its store.

    The tree spans ALL points of the study, stored ones included, and takes as extra
    sources only stored flames of other studies: a resumed run then starts every point
    from the same neighbour's profile as an uninterrupted run would (read from the store
    when that neighbour is stored), so it gives the same answers. ``only`` restricts those
    extra sources to the given keys (the limit searches take the sweep's flames only, so
    that their answers do not depend on which other limit flames a store holds).
    """
    own = {p.key for p in unique}
    sources = [StoredFlame(**s) for s in store.warm_sources({p.family for p in unique})
               if s["key"] not in own and (only is None or s["key"] in only)]
    return warm_tree(unique, sources)


class _CtrlC:
    """First Ctrl-C: ``requested`` (hand out nothing new); second: RunInterrupted at once.
    Installed only in the main thread (a signal handler cannot be set elsewhere)."""

    def __init__(self, count_solved: Callable[[], tuple[int, int]]) -> None:
        self.requested = False
        self._counts = count_solved
        self._old: Callable[[int, FrameType | None], Any] | int | None = None
        self._installed = False

    def _on_sigint(self, signum: int, frame: FrameType | None) -> None:
        if self.requested:
            raise RunInterrupted(*self._counts(), at_once=True)
        self.requested = True

    def __enter__(self) -> _CtrlC:
        if threading.current_thread() is threading.main_thread():
            self._old = signal.signal(signal.SIGINT, self._on_sigint)
            self._installed = True
        return self

    def __exit__(self, *exc: object) -> None:
        if self._installed:
            signal.signal(signal.SIGINT, self._old if self._old is not None else signal.SIG_DFL)


class _Loop:
    """State of one pass: the scheduler, the flames finished in it, the executor."""

    def __init__(self, study: Study, store: Store, unique: list[Point], todo: list[Point], backend: Backend, run_id: str,
                 sources: set[str] | None = None) -> None:
        self.study, self.store, self.backend, self.run_id = study, store, backend, run_id
        self.tree = warm_plan(store, unique, sources)
        self.by_index = {p.index: p for p in unique}
        self.sched = Scheduler(self.tree, [p.index for p in todo])
        self.recent: OrderedDict[int, dict | None] = OrderedDict()  # profiles of the last finished flames
        self.retries: dict[int, int] = {}
        self.in_flight: dict[Future[dict], Point] = {}
        self.executor = backend.executor(study)

    def warm_for(self, p: Point) -> dict | None:
        """Profile of the nearest burning flame up the point's warm-start path, finished
        in this run or stored by an earlier one (a failed flame passes its own source
        on), else of the stored flame of another study the path starts from (None:
        solve fresh)."""
        parent, cur = self.tree.parent, p.index
        while (up := parent[cur]) is not None:
            cur = up
            prof = self.recent[cur] if cur in self.recent else self.store.profile(self.by_index[cur].key)
            if prof is not None:
                return prof
        return self.store.profile(self.tree.stored[cur]) if cur in self.tree.stored else None

    def keep(self, i: int, profile: dict | None) -> None:
        """Remember a finished flame's profile (as the store gives it back) for the warm starts
        that follow soon; older ones are read back from the store, so memory stays bounded."""
        self.recent[i] = profile
        while len(self.recent) > RECENT_PROFILES:
            self.recent.popitem(last=False)

    def submit(self, i: int) -> None:
        from .worker import make_task, solve_task  # the solver, here: importing the run loop loads no Cantera

        p = self.by_index[i]
        task = make_task(self.study, p, self.warm_for(p))
        try:
            fut = self.executor.submit(solve_task, task)
        except BrokenExecutor:  # a worker died since the last wait: the pool must be renewed first
            self.executor = self.backend.renew(self.study)
            fut = self.executor.submit(solve_task, task)
        self.in_flight[fut] = p

    def result_of(self, fut: Future[dict], p: Point) -> dict | None:
        """The finished flame, or None when the point goes back to the queue (worker died)."""
        try:
            return fut.result()
        except FlamechartsError:
            raise  # a worker refused the task (other versions): stop the run
        except Exception as exc:  # the worker died or the task raised: retry, then record
            self.retries[p.index] = self.retries.get(p.index, 0) + 1
            if self.retries[p.index] <= MAX_RETRIES:
                self.sched.push(p.index)
                self.executor = self.backend.renew(self.study)
                return None
            return worker_error(exc)


def solve_points(study: Study, store: Store, pts: list[Point], backend: Backend,
                 progress: Callable[[Progress], None] | None = None,
                 stop_after: int | None = None, t0: float | None = None,
                 sources: set[str] | None = None) -> SolveOutcome:
    """Solve the points of ``pts`` that ``store`` lacks on ``backend``; commit each as it finishes.

    ``stop_after`` hands out at most that many new points (tests simulate an
    interruption with it); ``sources`` restricts the stored flames that may warm-start
    them (:func:`warm_plan`). Raises :class:`RunInterrupted` after Ctrl-C, once the
    finished flames are stored.
    """
    t0 = time.perf_counter() if t0 is None else t0
    # points are solved again only when a worker died on them or they ran out of time
    done_keys = {k for k, r in store.rows().items() if r["reason"] not in RETRIED_REASONS}
    unique = unique_points(pts)
    todo = [p for p in unique if p.key not in done_keys]
    out = SolveOutcome(reused=len(pts) - sum(1 for p in pts if p.key not in done_keys))
    loop = _Loop(study, store, unique, todo, backend, uuid.uuid4().hex[:12], sources)
    secs, _ = flame_seconds(len(study.atoms), store.timings({p.family for p in unique}), study.resolution)
    cost = {p.index: flame_cost(loop.tree, p.index, secs) for p in todo}
    total_cost, cost_done = sum(cost.values()) or 1.0, 0.0
    estimate = estimate_run_seconds(loop.tree.pending(set(cost), {p.index: p.key for p in unique}),
                                    backend.workers(), secs["fresh"], secs["warm"])
    limit = stop_after if stop_after is not None else len(todo)
    submitted = 0
    ctrl_c = _CtrlC(lambda: (out.solved, loop.sched.remaining))

    def report(last: dict | None = None) -> None:
        if progress is not None:
            progress(Progress(done=out.solved, total=len(todo), failed=out.failed, no_flame=out.no_flame,
                              reused=out.reused, elapsed_s=time.perf_counter() - t0, last=last,
                              stopping=ctrl_c.requested, estimate_s=estimate, done_share=cost_done / total_cost))

    report()
    clean_exit, told = False, False
    with ctrl_c:
        try:
            while loop.sched.has_ready() or loop.in_flight:
                while (loop.sched.has_ready() and len(loop.in_flight) < backend.slots and submitted < limit
                       and not ctrl_c.requested):
                    i = loop.sched.pop()
                    assert i is not None  # has_ready() above
                    loop.submit(i)
                    submitted += 1
                if ctrl_c.requested and not told:
                    told = True
                    report()
                if not loop.in_flight:
                    break
                done, _ = wait(list(loop.in_flight), timeout=0.5, return_when=FIRST_COMPLETED)
                for fut in done:
                    p = loop.in_flight.pop(fut)
                    result = loop.result_of(fut, p)
                    if result is None:
                        submitted -= 1
                        continue
                    result["inputs"] = p.inputs
                    if not study.keep_profiles:
                        result["profile_blob"] = None
                    # an in-run warm start gets exactly what the store gives back to a resumed run
                    loop.keep(p.index, unpack_profile(store.commit_point(p, result, loop.run_id)))
                    loop.sched.finished(p.index)
                    cost_done += cost[p.index]
                    out.solved += 1
                    out.solve_seconds += result["solve_seconds"]
                    out.failed += result["status"] == Status.FAILED
                    out.no_flame += result["status"] == Status.NO_FLAME
                    report({"point": p, "status": result["status"], "message": result["message"],
                            "start": result["start"], "solve_seconds": result["solve_seconds"],
                            "cpu_seconds": result.get("cpu_seconds", 0.0)})
            clean_exit = not ctrl_c.requested
        finally:
            if not clean_exit:
                loop.executor.shutdown(wait=False, kill_workers=True)
    if ctrl_c.requested:
        raise RunInterrupted(out.solved, loop.sched.remaining)
    return out
