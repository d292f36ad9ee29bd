"""Flame-speed sensitivities of [uncertainty]: one adjoint solve per burning point, after the sweep.

sensitivity_key     the store key of a point's sensitivities: the point's inputs and the method
solve_sensitivities one task per burning point the store lacks, from the point's stored profile,
                    on the run's backend (task.sensitivity_task)
with_sensitivities  the stored rows of the points with their sensitivity vectors merged in
PER_POINT           the sensitivities in sweep.analyses' shape, with their ``check`` estimate

Stored apart from the point (sweep.extras), so asking for them never solves the sweep again;
the uncertainty factors are applied at read-out (design.kinetic_columns), so changing them
solves nothing.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...store import Store
from ...sweep.analyses import Budget, PerPoint
from ...sweep.extras import PartProgress, derived_key, done_keys, record, solve_extras
from ...sweep.points import Point
from ...sweep.schedule import flame_time_limit, sensitivity_seconds

if TYPE_CHECKING:
    from ...config import Study
    from ...sweep.backends import Backend

#: The worker function of these solves (task.py), as sweep.extras.task_function finds it.
TASKS = "flamecharts.analyses.kinetic_sensitivity.task:"

#: Changes of the method that change the stored answer (part of the key).
SENSITIVITY_VERSION = 1


def wants_sensitivities(study: Study) -> bool:
    """Whether the study asks for the sensitivities ([uncertainty] with ``kinetics = true``)."""
    u = getattr(study, "uncertainty", None)
    return u is not None and u.kinetics


def sensitivity_key(p: Point) -> str:
    """Store key of point ``p``'s sensitivities (sweep.extras.derived_key: its inputs and the version)."""
    return derived_key("sensitivity", p, {"version": SENSITIVITY_VERSION})


def _task(study: Study, p: Point, warm: dict | None) -> dict:
    return {"key": sensitivity_key(p), "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "transport": study.transport,
            "thermal_diffusion": study.thermal_diffusion, "resolution": study.resolution, "T_u": p.T_u,
            "P": p.P, "X": p.X_unburned, "warm": warm,
            "time_limit_s": 2 * (study.flame_time_limit_s or flame_time_limit(len(study.atoms)))}


def solve_sensitivities(study: Study, store: Store, pts: list[Point], stored: dict[str, dict], backend: Backend,
                        progress: PartProgress | None = None) -> tuple[int, float]:
    """Solve the sensitivities of every burning point of ``pts`` (``stored``: the store's rows by
    key) that the store lacks and whose profile it keeps. Returns (solved, their summed seconds)."""
    if not wants_sensitivities(study):
        return 0, 0.0
    burning = list({p.key: p for p in pts if (stored.get(p.key) or {}).get("status") == "ok"}.values())
    done = done_keys(store, [sensitivity_key(p) for p in burning])
    todo = []
    for p in burning:
        if sensitivity_key(p) in done:
            continue
        profile = store.profile(p.key)
        if profile is not None:  # keep_profiles = false: nothing to start from (the read-out says so)
            todo.append((record("sensitivity", sensitivity_key(p), p), _task(study, p, profile)))
    return solve_extras(study, store, todo, TASKS + "sensitivity_task", backend, progress)


def with_sensitivities(study: Study, pts: list[Point], stored: dict[str, dict], store: Store) -> dict[str, dict]:
    """``stored`` with each point's sensitivity vector merged into its metrics under
    'reaction_sensitivities' (when asked for and solved); a new dict, the store's rows untouched."""
    if not wants_sensitivities(study):
        return stored
    found = store.rows([sensitivity_key(p) for p in pts])
    out = dict(stored)
    for p in pts:
        sens = found.get(sensitivity_key(p))
        row = stored.get(p.key)
        if sens and row and sens.get("metrics") and row.get("metrics"):
            out[p.key] = {**row, "metrics": {**row["metrics"],
                                             "reaction_sensitivities": sens["metrics"]["sensitivities"]}}
    return out


def _sensitivity_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    t = b.points_to_solve * sensitivity_seconds(b.species, b.reactions, study.resolution) / b.workers
    return (f"Kinetic uncertainty: flame-speed sensitivities to every rate constant of each burning point (up to "
            f"{b.points_to_solve} adjoint solves after the sweep, each the stored flame solved again on its grid)",
            t, "measured 0.4-0.5 s a flame with h2o2.yaml, about 18 s with GRI-Mech 3.0; stored ones are not solved "
            "again, and changing a factor solves nothing")


PER_POINT = (PerPoint("rate_sensitivities", "flame-speed sensitivities", wants_sensitivities, solve_sensitivities,
                      with_sensitivities, _sensitivity_estimate),)
