"""The ignition delays of [premixer]: the fresh mixture's and those near the fuel injection, per point.

premixer_key      the delays' store key: the point's inputs and the injection mixtures
solve_premixer    one task per point whose delays the store lacks or holds over too short a
                  horizon, on the run's backend (task.premixer_task)
with_premixer     the stored rows of the points with their delays, read at the study's horizon
PER_POINT         the delays in sweep.analyses' shape, with their ``check`` estimate

Stored apart from the point (sweep.extras), so asking for them never solves the sweep again.
A delay integrated over a longer horizon answers a shorter one
(physics.autoignition.delay_at_horizon): a shorter residence time integrates nothing, a
longer one only the delays that had not ignited, whose row is replaced by the longer one.
Every point gets them, burning or not: a mixture that ignites in the premixer is a finding
whatever its flame did.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...physics import mixtures
from ...physics.autoignition import INJECTION_PHIS, delay_at_horizon, premixer_horizon
from ...store import Store
from ...sweep.analyses import Budget, PerPoint
from ...sweep.extras import PartProgress, derived_key, done_keys, record, solve_extras
from ...sweep.points import Point

if TYPE_CHECKING:
    from ...config import Study
    from ...sweep.backends import Backend

#: The worker function of these solves (task.py), as sweep.extras.task_function finds it.
TASKS = "flamecharts.analyses.premixer_ignition.task:"

#: Changes of the method that change the stored answer (part of the key).
PREMIXER_VERSION = 1


def horizon_of(study: Study) -> float | None:
    """How long the study's premixer delays are integrated [s] (None without [premixer])."""
    pm = study.premixer
    return None if pm is None else premixer_horizon(pm.residence_time_s, pm.min_autoignition_margin)


def premixer_key(p: Point) -> str:
    """Store key of point ``p``'s ignition delays (sweep.extras.derived_key: its inputs, the version
    and the injection mixtures' equivalence ratios; not the horizon, which read_delays handles)."""
    return derived_key("premixer", p, {"version": PREMIXER_VERSION, "injection_phis": list(INJECTION_PHIS)})


def injection_mixtures(study: Study, p: Point) -> list[dict[str, float]]:
    """The fuel-oxidizer mixtures near the fuel injection, one per INJECTION_PHIS, at the
    point's preheat: the fuel taken as hot as the oxidizer, which makes the rich mixtures more
    reactive than a cooler fuel jet would (conservative)."""
    o2 = mixtures.stoich_o2_per_fuel(study.atoms, p.X_flame)
    return [mixtures.unburned_mixture(p.X_flame, p.X_oxidizer, phi, o2) for phi in INJECTION_PHIS]


def _task(study: Study, p: Point, horizon_s: float) -> dict:
    return {"key": premixer_key(p), "mechanism_path": study.mechanism_path, "T_u": p.T_u, "P": p.P,
            "X": p.X_unburned, "injection": injection_mixtures(study, p), "horizon_s": horizon_s}


def read_delays(metrics: dict | None, horizon_s: float) -> dict | None:
    """Stored delays read at ``horizon_s`` (physics.autoignition.delay_at_horizon): the metrics
    with every delay replaced by its value at that horizon, or None when any must be integrated
    again (over a longer horizon) or none are stored."""
    if not metrics or "premixer_ignition_delay_s" not in metrics:
        return None
    integrated = float(metrics["premixer_horizon_s"])
    fresh = delay_at_horizon(float(metrics["premixer_ignition_delay_s"]), integrated, horizon_s)
    injection = [delay_at_horizon(float(t), integrated, horizon_s) for t in metrics["injection_ignition_delays_s"]]
    if fresh is None or any(t is None for t in injection):
        return None
    return {**metrics, "premixer_ignition_delay_s": fresh, "injection_ignition_delays_s": injection,
            "premixer_horizon_s": horizon_s}


def solve_premixer(study: Study, store: Store, pts: list[Point], stored: dict[str, dict], backend: Backend,
                   progress: PartProgress | None = None) -> tuple[int, float]:
    """Integrate the delays of every point of ``pts`` whose row the store lacks, or holds over a
    horizon too short for the study's (every point, whatever its flame: ``stored`` is not needed).
    Returns (points done, their summed seconds)."""
    horizon = horizon_of(study)
    if horizon is None:
        return 0, 0.0
    unique = list({p.key: p for p in pts}.values())
    done = done_keys(store, [premixer_key(p) for p in unique])
    rows = store.rows(done)
    todo = [(record("premixer", premixer_key(p), p), _task(study, p, horizon)) for p in unique
            if premixer_key(p) not in done or (rows[premixer_key(p)]["status"] == "ok"
                                               and read_delays(rows[premixer_key(p)]["metrics"], horizon) is None)]
    return solve_extras(study, store, todo, TASKS + "premixer_task", backend, progress)


def with_premixer(study: Study, pts: list[Point], stored: dict[str, dict], store: Store) -> dict[str, dict]:
    """``stored`` with each point's premixer delays, read at the study's horizon, merged into its
    metrics (when asked for and integrated); a new dict, the store's rows untouched."""
    horizon = horizon_of(study)
    if horizon is None:
        return stored
    found = store.rows([premixer_key(p) for p in pts])
    out = dict(stored)
    for p in pts:
        row, have = found.get(premixer_key(p)), stored.get(p.key)
        delays = read_delays(row["metrics"], horizon) if row else None
        if delays is not None and have is not None:
            out[p.key] = {**have, "metrics": {**(have.get("metrics") or {}), **delays}}
    return out


#: A premixer's ignition delays of one point (the fresh mixture and five near the injection, over
#: a 1 s horizon) per species of the mechanism [s]: measured on 2 busy cores at 10 bar, 300-800 K,
#: 0.007-0.015 s with h2o2.yaml (10 species) and 0.07-0.09 s with GRI-Mech 3.0 (53), 2026-12-05.
PREMIXER_SECONDS_PER_SPECIES = 0.0017


def _premixer_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    horizon = horizon_of(study)
    t = b.points_to_solve * PREMIXER_SECONDS_PER_SPECIES * b.species / b.workers
    return (f"Premixer: ignition delays of every point's mixture and of 5 mixtures near the fuel injection "
            f"(constant-pressure reactors over {horizon:g} s, after the sweep)", t,
            "stored delays are reread for a shorter residence time")


PER_POINT = (PerPoint("premixer_delays", "premixer ignition delays", lambda s: s.premixer is not None, solve_premixer,
                      with_premixer, _premixer_estimate),)
