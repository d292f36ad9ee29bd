"""Extra flames of finished points, solved after the sweep: the Zeldovich pair, the strained ladder.

Record         what the store's commit needs of an extra (key, family, phi, p, T_u, inputs)
derived_key    an extra's store key: the point's inputs, minus what does not change it, and its settings
solve_extras   one task per extra the store lacks, on the run's backend; each committed as it finishes

Extras are stored in the points table under their own keys (family '<kind>:<point family>',
no profile, so never a warm-start source). A point's own key does not depend on them, so
asking for an extra, or changing its settings, never solves the sweep again.
"""
from __future__ import annotations

import hashlib
import json
import time
import uuid
from collections.abc import Callable
from concurrent.futures import FIRST_COMPLETED, wait
from dataclasses import dataclass
from typing import TYPE_CHECKING, Protocol

from ..outcome import RETRIED_REASONS, worker_error
from ..store import Store
from .points import Point

if TYPE_CHECKING:
    from ..config import Study
    from .backends import Backend


#: While extras run and none finishes, a report every this many seconds (a strained-flame ladder of
#: GRI-Mech 3.0 takes 9-15 min: without it the run says nothing all that time).
HEARTBEAT_S = 30.0


class PartProgress(Protocol):
    """How an extra solve reports: ``done`` of ``total`` finished, and the estimated wall time of
    all of them when the analysis has one (pipeline makes it the run's one progress event,
    sweep.run.Progress)."""

    def __call__(self, done: int, total: int, estimate_s: float | None = None) -> None: ...


@dataclass(frozen=True)
class Record:
    """What the store's commit needs of an extra (a point's key fields)."""

    key: str
    family: str
    phi: float
    pressure_bar: float
    T_u: float
    inputs: dict


def derived_key(kind: str, p: Point, settings: dict) -> str:
    """Store key of the ``kind`` extra of point ``p``: its inputs (mechanism hash, Cantera
    version, transport, numerics, compositions, phi, p, T_u) and ``settings``."""
    text = json.dumps({kind: settings, "inputs": p.inputs}, sort_keys=True)
    return hashlib.sha256(text.encode()).hexdigest()[:32]


def record(kind: str, key: str, p: Point) -> Record:
    return Record(key=key, family=f"{kind}:{p.family}", phi=p.phi, pressure_bar=p.pressure_bar, T_u=p.T_u,
                  inputs={f"{kind}_of": p.key})


def done_keys(store: Store, keys: list[str]) -> set[str]:
    """Those of ``keys`` the store holds with an answer to keep (not a failure the next run
    solves again, as for points: sweep.run.RETRIED_REASONS)."""
    return {k for k, r in store.rows(keys).items() if r["reason"] not in RETRIED_REASONS}


def task_function(task_name: str) -> Callable[[dict], dict]:
    """The worker function ``task_name``: a function of sweep.worker, or 'module:function' (an
    analysis's task part, flamecharts.analyses), imported here, on the solve side only."""
    from importlib import import_module

    from . import worker

    if ":" in task_name:
        module, name = task_name.split(":")
        return getattr(import_module(module), name)
    return getattr(worker, task_name)


def solve_extras(study: Study, store: Store, todo: list[tuple[Record, dict]], task_name: str, backend: Backend,
                 progress: PartProgress | None = None, estimate_s: float | None = None) -> tuple[int, float]:
    """Solve ``task(task)`` for every (record, task) on the backend, ``task`` being the function
    ``task_name`` (:func:`task_function`, imported here, on the solve side only: the read side of an
    extra needs no Cantera), commit each result under its record as it finishes (a worker that
    dies leaves a failed row: the next run tries again). Returns (extras solved, their summed seconds).

    ``progress`` hears of the start (0 done, with ``estimate_s``, the analysis's estimate of them
    all), of every finished extra, and every :data:`HEARTBEAT_S` while none finishes."""
    if not todo:
        return 0, 0.0
    fn = task_function(task_name)
    executor = backend.executor(study)
    run_id = uuid.uuid4().hex[:12]
    in_flight = {executor.submit(fn, task): rec for rec, task in todo}
    done_n, seconds = 0, 0.0
    if progress is not None:
        progress(0, len(todo), estimate_s)
    said = time.monotonic()
    while in_flight:
        done, _ = wait(list(in_flight), timeout=0.5, return_when=FIRST_COMPLETED)
        if not done and progress is not None and time.monotonic() - said >= HEARTBEAT_S:
            progress(done_n, len(todo), estimate_s)
            said = time.monotonic()
        for fut in done:
            rec = in_flight.pop(fut)
            try:
                result = fut.result()
            except Exception as exc:  # noqa: BLE001 - the worker died: record it, the next run tries again
                result = worker_error(exc)
            store.commit_point(rec, {**result, "inputs": rec.inputs}, run_id)
            done_n += 1
            seconds += float(result.get("solve_seconds") or 0.0)
            if progress is not None:
                progress(done_n, len(todo), estimate_s)
                said = time.monotonic()
    return done_n, seconds
