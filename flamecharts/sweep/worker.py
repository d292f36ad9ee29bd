"""The worker task: one flame, from plain data to plain data.

The same function runs in this process (``jobs=1``), in a loky worker process and on
a Dask worker, so a flame's answer never depends on where it was solved. The code a
worker runs is fingerprinted (:func:`code_fingerprint`): a cluster refuses workers
whose solver code differs from this process's, and only that code counts, so an edit
to the run loop, a chart or the CLI leaves cluster workers compatible.
"""
from __future__ import annotations

import hashlib
import math
import os
import signal
import threading
import time
from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING

from ..analyses import parts
from ..chemistry.flame import NUMERICS, solve_flame
from ..chemistry.ignition import autoignition_screen, autoignition_screen_without_flame
from ..chemistry.mechanism import solution
from ..chemistry.response import lewis_numbers
from ..store.db import pack_profile
from .lifeline import exit_with
from .schedule import flame_time_limit

if TYPE_CHECKING:
    from ..config import Study
    from .points import Point

#: Files (relative to the package) whose text decides a flame's answer: what a worker runs.
#: The registered analyses' tasks (flamecharts.analyses: each one's ``task`` part) and the chemistry and
#: physics modules they name in CODE count too (:func:`code_fingerprint`).
WORKER_CODE = ("chemistry/flame.py", "chemistry/mechanism.py", "chemistry/ignition.py", "chemistry/response.py",
               "physics/flame_measures.py", "physics/flame_response.py", "store/profiles.py",
               "sweep/worker.py")


def code_fingerprint() -> str:
    """12 hex digits of the sha256 of the worker's code (:data:`WORKER_CODE`)."""
    root = Path(__file__).resolve().parent.parent
    code = hashlib.sha256()
    tasks = parts("task")
    for name in WORKER_CODE + tuple(c for m in tasks for c in m.CODE):
        code.update((root / name).read_bytes())
    for m in tasks:
        code.update(Path(m.__file__ or "").read_bytes())
    return code.hexdigest()[:12]


def quiet_worker() -> None:
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


def local_worker(parent: int) -> None:
    """Start-up of every worker process a run starts itself (the loky pool, a
    ``--cluster local:N`` worker): quiet (:func:`quiet_worker`), and bound to the run's
    process ``parent``, so that it ends within seconds when that process dies, SIGKILL
    included, instead of lingering as an orphan (:func:`lifeline.exit_with`). Workers of
    a cluster started elsewhere belong to their own nannies and get neither."""
    quiet_worker()
    exit_with(parent)


def make_task(study: Study, point: Point, warm: dict | None) -> dict:
    """The plain task of one point: what :func:`solve_task` needs, nothing else."""
    return {"key": point.key, "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "transport": study.transport,
            "thermal_diffusion": study.thermal_diffusion, "resolution": study.resolution,
            "T_u": point.T_u, "P": point.P, "X": point.X_unburned, "warm": warm,
            "time_limit_s": study.flame_time_limit_s or flame_time_limit(len(study.atoms))}


def mixture_properties(mechanism_path: str, sha256: str, X: dict, T_u: float, P: float) -> dict:
    """What the read-out needs of the fresh mixture besides its flame (stored with it, so the
    read side needs no mechanism): its Lewis numbers and viscosity (mixture-averaged transport,
    whatever the study's). Keys: :data:`MIXTURE_PROPERTIES`."""
    mixed = solution(mechanism_path, "mixture-averaged", sha256)
    le_fuel, le_o2 = lewis_numbers(mixed, X, T_u, P)
    mixed.TPX = T_u, P, X  # lewis_numbers may leave the phase in another state (heating values)
    mu = float(mixed.viscosity)
    return {"lewis_number_fuel": le_fuel, "lewis_number_oxygen": le_o2, "unburned_viscosity_Pa_s": mu}


#: The stored metrics of :func:`mixture_properties` (every burning point has them).
MIXTURE_PROPERTIES = ("lewis_number_fuel", "lewis_number_oxygen", "unburned_viscosity_Pa_s")


def fresh_mixture(mechanism_path: str, sha256: str, X: dict, T_u: float, P: float) -> dict:
    """:func:`mixture_properties` and the density of the fresh mixture (``unburned_density_kg_m3``,
    ideal gas, as the flame's inlet has it): what ``check`` needs of a point, before its flame, to
    tell which limit criteria a search can assess (admissible.driver.planned_searches)."""
    gas = solution(mechanism_path, "mixture-averaged", sha256)
    gas.TPX = T_u, P, X
    rho = float(gas.density)
    return {**mixture_properties(mechanism_path, sha256, X, T_u, P), "unburned_density_kg_m3": rho}


def extra_result(task: dict, start: str, compute: Callable[[], tuple[dict, str]]) -> dict:
    """The store's result dict of an extra solve: ``compute()`` -> (metrics, message), timed (wall
    and CPU); an exception it raises is a failure recorded with its reason ('not converged' and
    the exception's first line: the read-out says why, the next run tries again)."""
    cpu0, t0 = time.process_time(), time.perf_counter()
    try:
        m, message = compute()
        status, reason = "ok", ""
    except Exception as exc:  # noqa: BLE001 - recorded with its reason, never raised
        m, status, reason = None, "failed", "not converged"
        message = f"not converged: {type(exc).__name__}: {str(exc).splitlines()[0] if str(exc) else ''}"
    return {"key": task["key"], "status": status, "reason": reason, "message": message, "start": start,
            "metrics": m, "profile_blob": None, "solve_seconds": time.perf_counter() - t0,
            "cpu_seconds": time.process_time() - cpu0}


def plain_json(v: object) -> object:
    """JSON-ready: arrays and NumPy scalars as lists and floats, dicts of them alike."""
    if isinstance(v, dict):
        return {k: plain_json(x) for k, x in v.items()}
    return v.tolist() if hasattr(v, "tolist") else v


def solve_task(task: dict) -> dict:
    """Solve one point from a plain task dict; returns a plain result dict (runs in a worker)."""
    cpu0 = time.process_time()
    gas = solution(task["mechanism_path"], task["transport"], task["mechanism_sha256"])
    result = solve_flame(gas, task["T_u"], task["P"], task["X"], task["transport"],
                         task["thermal_diffusion"], NUMERICS[task["resolution"]], task.get("warm"),
                         task.get("time_limit_s"))
    result["key"] = task["key"]
    m = result.get("metrics")
    if result.get("status") == "ok" and m:
        m["autoignition_screen_delay_s"] = autoignition_screen(
            task["mechanism_path"], task["X"], task["T_u"], task["P"], m.get("laminar_flame_speed_m_s"),
            m.get("thermal_thickness_m"), m.get("adiabatic_flame_temperature_K"))
        m.update(mixture_properties(task["mechanism_path"], task["mechanism_sha256"], task["X"], task["T_u"], task["P"]))
    else:  # no flame to answer with: the mixture's own ignition is still a finding (None: none within the window)
        tau = autoignition_screen_without_flame(task["mechanism_path"], task["X"], task["T_u"], task["P"])
        result["metrics"] = {**(m or {}), "autoignition_screen_delay_s": tau if tau is not None and math.isfinite(tau)
                             else None}
    # the worker encodes the profile for the store (lossy rounding, LZMA: ~10 ms for h2o2, more for
    # big mechanisms), so the process that commits every flame of a 100,000-point run only writes it
    result["profile_blob"] = pack_profile(result.pop("profile", None))
    result["cpu_seconds"] = time.process_time() - cpu0
    return result
