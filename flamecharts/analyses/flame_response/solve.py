"""The Zeldovich pair of [flame_response]: two more flames per burning point, after the sweep.

zeldovich_key     the pair's store key: the point's inputs and the inert step
solve_zeldovich   one task per burning point whose pair the store lacks, warm-started from the
                  point's stored profile, on the run's backend (task.zeldovich_task)
with_zeldovich    the stored rows of the points with their pair's metrics merged in
PER_POINT         the pair in sweep.analyses' shape, with its ``check`` estimate

Stored apart from the point (sweep.extras), so asking for the pair, or another inert step,
never solves the sweep again.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...store import Store
from ...sweep.analyses import Budget, PerPoint
from ...sweep.extras import PartProgress, derived_key, done_keys, record, solve_extras
from ...sweep.points import Point
from ...sweep.schedule import flame_time_limit
from .table import of, zeldovich_step

if TYPE_CHECKING:
    from ...config import Study
    from ...sweep.backends import Backend

#: The worker function of the pair (task.py), as sweep.extras.task_function finds it.
TASKS = "flamecharts.analyses.flame_response.task:"

#: Changes of the method that change the stored answer (part of the key).
ZELDOVICH_VERSION = 1


def zeldovich_key(p: Point, step: float) -> str:
    return derived_key("zeldovich", p, {"version": ZELDOVICH_VERSION, "inert_step": step})


def _task(study: Study, p: Point, stored: dict, warm: dict | None, step: float) -> dict:
    return {"key": zeldovich_key(p, step), "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "transport": study.transport,
            "thermal_diffusion": study.thermal_diffusion, "resolution": study.resolution, "T_u": p.T_u,
            "P": p.P, "X": p.X_unburned, "base_metrics": stored["metrics"], "warm": warm, "zeldovich_step": step,
            "time_limit_s": 2 * (study.flame_time_limit_s or flame_time_limit(len(study.atoms)))}


def solve_zeldovich(study: Study, store: Store, pts: list[Point], stored: dict[str, dict], backend: Backend,
                    progress: PartProgress | None = None) -> tuple[int, float]:
    """Solve the pair of every burning point of ``pts`` (``stored``: the store's rows by key)
    that the store lacks. Returns (pairs solved, their summed seconds)."""
    step = zeldovich_step(study)
    if step is None:
        return 0, 0.0
    burning = list({p.key: p for p in pts if (stored.get(p.key) or {}).get("status") == "ok"}.values())
    done = done_keys(store, [zeldovich_key(p, step) for p in burning])
    todo = [(record("zeldovich", zeldovich_key(p, step), p),
             _task(study, p, stored[p.key], store.profile(p.key), step))
            for p in burning if zeldovich_key(p, step) not in done]
    return solve_extras(study, store, todo, TASKS + "zeldovich_task", backend, progress)


def with_zeldovich(study: Study, pts: list[Point], stored: dict[str, dict], store: Store) -> dict[str, dict]:
    """``stored`` with each point's Zeldovich metrics merged into its metrics (when asked for
    and solved); a new dict, the store's rows untouched."""
    step = zeldovich_step(study)
    if step is None:
        return stored
    pairs = store.rows([zeldovich_key(p, step) for p in pts])
    out = dict(stored)
    for p in pts:
        pair = pairs.get(zeldovich_key(p, step))
        row = stored.get(p.key)
        if pair and row and pair.get("metrics") and row.get("metrics"):
            out[p.key] = {**row, "metrics": {**row["metrics"], **pair["metrics"]}}
    return out


def _zeldovich_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    fr = of(study)
    assert fr is not None  # wanted only with [flame_response]
    return (f"Flame response: Lewis numbers of every point, and the Zeldovich number from 2 more flames per "
            f"burning point (up to {2 * b.points_to_solve} flames, the inert moved {fr.inert_step:g} either way, "
            "warm-started from the point's stored flame after the sweep)",
            2 * b.points_to_solve * b.warm_flame_s / b.workers, "pairs already stored are not solved again")


PER_POINT = (PerPoint("zeldovich", "Zeldovich pairs", lambda s: zeldovich_step(s) is not None, solve_zeldovich,
                      with_zeldovich, _zeldovich_estimate),)
