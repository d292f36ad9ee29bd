"""[stretch]'s solves: which points get a ladder, its store key, solving and storing it, its rows.

stretch_points   the swept points a [stretch] table selects
stretch_key      a ladder's store key: the point's inputs and the ladder's settings (sweep.extras)
solve_stretch    solve every selected ladder the store lacks on the run's backend, commit each (its
                 progress starts with ``check``'s estimate of them and beats while they run)
stretch_rows     one row per ladder (columns.STRETCH_COLUMNS), from the store
with_ladders     stored rows with each burned ladder's strongest consumption speed and extinction
                 strain rate merged into its point's metrics (the premixer's leading-point flame
                 speed and extinction-strain blowout read them)
ladder_seconds   the measured cost of one ladder, for ``check``

A ladder needs its mixture's unstretched S_L and T_ad, so it runs after the sweep and its
per-point extras (PER_STUDY: sweep.analyses.PerStudy), one task per ladder on the same workers
(local or Dask), stored in the same table as the free flames under its own key (family
'stretch:...', no profile: never a warm-start source). The keys are those the ladders had when
they were solved in the core (sweep/stretch.py), so stored ladders are reused.
"""
from __future__ import annotations

import math
from collections.abc import Callable
from typing import TYPE_CHECKING, Any

from ... import numerics as strained
from ...sweep.analyses import Budget, PerStudy
from ...sweep.extras import PartProgress, derived_key, done_keys, record, solve_extras
from ...sweep.schedule import REFERENCE_VARIABLES, flame_time_limit, parallel_seconds
from .table import of

if TYPE_CHECKING:
    from ...config import Study
    from ...store import Store
    from ...sweep.backends import Backend
    from ...sweep.points import Point

#: Where the worker finds the task (sweep.extras.task_function).
TASK = "flamecharts.analyses.strain_ladders.task:stretch_task"

#: Everything of chemistry.strained that changes a ladder's answer (part of its key).
LADDER_SETTINGS = {
    "version": 1, "half_separation_thicknesses": strained.HALF_SEPARATION_THICKNESSES,
    "half_separation_bounds_m": list(strained.HALF_SEPARATION_BOUNDS_M),
    "first_velocity_factor": strained.FIRST_VELOCITY_FACTOR, "ladder_factor": strained.LADDER_FACTOR,
    "extinction_resolution": strained.EXTINCTION_RESOLUTION, "burning_share": strained.BURNING_SHARE,
    "refine": strained.REFINE, "max_solves": strained.MAX_SOLVES,
    "first_strain_retry_factor": strained.FIRST_STRAIN_RETRY_FACTOR,
    "first_strain_retries": strained.FIRST_STRAIN_RETRIES,
    "first_solve_max_time_steps": strained.FIRST_SOLVE_MAX_TIME_STEPS,
}

#: Time limit of one ladder, in time limits of one free flame of the mechanism.
LADDER_TIME_LIMITS = 4.0

#: One strained-flame ladder to extinction at 1 bar on one core [s] with a mechanism of 53 species
#: (57 variables), other mechanisms as ((species + 4) / 57)^LADDER_SPECIES_POWER, and the ladder's
#: share more per decade of pressure above 1 bar. A ladder is 13-22 strained flames whatever the
#: mechanism. Measured (docs/benchmarks.md, "Run-time estimate calibration"): GRI-Mech 3.0 methane
#: and methane-hydrogen ladders 521-898 s (tests/benchmarks/stretch_validation.py, two at a time on
#: 2 cores, 2026-12-03); h2o2.yaml hydrogen-air at phi 0.5, 0.7, 1.0 15-60 CPU seconds at 1 bar and
#: 1.8-3.6 times that at 10 bar (estimate_calibration.py; at 10 bar the twin-flame domain reaches its
#: 2 mm floor, tens of flame thicknesses more than at 1 bar). Not measured at pressure with GRI-Mech 3.0.
LADDER_SECONDS, LADDER_SPECIES_POWER, LADDER_PRESSURE_PER_DECADE = 680.0, 2.2, 1.0


def stretch_points(study: Study, pts: list[Point]) -> list[Point]:
    """The points of ``pts`` that the study's [stretch] table selects (none without one)."""
    st = of(study)
    if st is None:
        return []
    return [p for p in pts if p.fuel in st.fuels and p.oxidizer in st.oxidizers
            and p.blend_fraction in st.blend_fractions and p.phi in st.equivalence_ratios
            and p.pressure_bar in st.pressures_bar and p.T_u in st.unburned_temperatures_K]


def stretch_key(p: Point) -> str:
    """Store key of the ladder of point ``p``: its inputs and the ladder's settings."""
    return derived_key("stretch", p, LADDER_SETTINGS)


def _task(study: Study, p: Point, row: dict) -> dict:
    return {"key": stretch_key(p), "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "transport": study.transport, "T_u": p.T_u, "P": p.P,
            "X": p.X_unburned, "S_L": row["laminar_flame_speed_m_s"], "T_ad": row["adiabatic_flame_temperature_K"],
            "time_limit_s": ladder_time_limit(study)}


def ladder_time_limit(study: Study) -> float:
    """Time limit of one ladder [s]: LADDER_TIME_LIMITS of the study's flame time limit."""
    return LADDER_TIME_LIMITS * (study.flame_time_limit_s or flame_time_limit(len(study.atoms)))


def solve_stretch(study: Study, store: Store, pts: list[Point], rows_by_key: dict[str, dict], backend: Backend,
                  progress: PartProgress | None = None) -> tuple[int, float]:
    """Solve the ladder of every selected point whose free flame burns and whose ladder the
    store lacks (or lost to a dead worker); commit each as it finishes. Returns (ladders
    solved, their summed seconds)."""
    chosen = [p for p in stretch_points(study, pts) if rows_by_key.get(p.key, {}).get("status") == "ok"]
    done = done_keys(store, [stretch_key(p) for p in chosen])
    todo = [(record("stretch", stretch_key(p), p), _task(study, p, rows_by_key[p.key]))
            for p in chosen if stretch_key(p) not in done]
    estimate = parallel_seconds([ladder_seconds(len(study.atoms), r.pressure_bar, ladder_time_limit(study))
                                 for r, _ in todo], max(1, backend.slots))  # as `check` estimates them
    return solve_extras(study, store, todo, TASK, backend, progress, estimate)


def characteristic_strain(study: Study, row: dict) -> float | None:
    """Strain rate the burner imposes where its flame is held [1/s]: the wall velocity gradient
    at the port rim, or U/D of a bluff-body stabilizer (the order of its shear-layer strain);
    None without a [burner]. An order of magnitude, not the local strain of a real flame base."""
    b = study.burner
    if b is None:
        return None
    if b.on_stabilizer:
        assert b.approach_velocity_m_s is not None and b.stabilizer_size_m is not None  # config sets both
        return b.approach_velocity_m_s / b.stabilizer_size_m
    return row.get("wall_velocity_gradient_1_s")


def _row(study: Study, p: Point, free: dict, s: dict | None) -> dict[str, Any]:
    """stretch.csv's row of the ladder of point ``p`` (``free``: its free flame's row, ``s``: the
    stored ladder or None)."""
    m = (s or {}).get("metrics") or {}
    return {
        "fuel": p.fuel, "oxidizer": p.oxidizer, "blend_with": p.blend_with or "", "blend_fraction": p.blend_fraction,
        "equivalence_ratio": p.phi, "pressure_bar": p.pressure_bar, "unburned_temperature_K": p.T_u,
        "status": s["status"] if s else ("pending" if free.get("status") == "ok" else "no free flame"),
        "laminar_flame_speed_m_s": free.get("laminar_flame_speed_m_s"),
        "extinction_strain_rate_1_s": m.get("extinction_strain_rate_1_s"),
        "extinguished_above_1_s": m.get("extinguished_above_1_s"),
        "markstein_number_strain": m.get("markstein_number_strain"),
        "effective_lewis_number": free.get("effective_lewis_number"),
        "markstein_number_unburned": free.get("markstein_number_unburned"),
        "characteristic_strain_1_s": characteristic_strain(study, free),
        "half_separation_mm": 1e3 * m["half_separation_m"] if m.get("half_separation_m") else None,
        "strained_flames": m.get("solves"), "ladder_seconds": round(s["solve_seconds"], 2) if s else None,
        "strain_rates_1_s": [float(k) for k in m.get("strain_rates_1_s", [])],
        "consumption_speeds_m_s": [float(v) for v in m.get("consumption_speeds_m_s", [])],
        "message": s["message"] if s else "",
    }


def stretch_rows(study: Study, pts: list[Point], rows_by_key: dict[str, dict], store: Store) -> list[dict]:
    """One row per selected ladder (columns.STRETCH_COLUMNS but 'mechanism'), in study order;
    ladders not solved yet (or whose free flame does not burn) have status 'pending' or the free
    flame's status."""
    selected = stretch_points(study, pts)
    stored = store.rows([stretch_key(p) for p in selected])
    out = [_row(study, p, rows_by_key.get(p.key, {}), stored.get(stretch_key(p))) for p in selected]
    for r in out:
        K, c = r["extinction_strain_rate_1_s"], r["characteristic_strain_1_s"]
        r["extinction_strain_margin"] = K / c if K and c else None
    return out


def with_ladders(study: Study, pts: list[Point], stored: dict[str, dict], store: Store) -> dict[str, dict]:
    """``stored`` with the strongest consumption speed and the extinction strain rate of each
    selected point's burned ladder merged into its metrics as ``ladder_consumption_speed_max_m_s``
    and ``ladder_extinction_strain_rate_1_s`` (a ladder that failed gives neither: a partial ladder
    may stop short of the peak and of extinction); a new dict, the store's rows untouched."""
    selected = stretch_points(study, pts)
    ladders = store.rows([stretch_key(p) for p in selected])
    out = dict(stored)
    for p in selected:
        s, row = ladders.get(stretch_key(p)), stored.get(p.key)
        m = (s or {}).get("metrics") or {}
        speeds = m.get("consumption_speeds_m_s")
        if s and s["status"] == "ok" and speeds and row and row.get("metrics"):
            out[p.key] = {**row, "metrics": {**row["metrics"], "ladder_consumption_speed_max_m_s": max(speeds),
                                             "ladder_extinction_strain_rate_1_s": m.get("extinction_strain_rate_1_s")}}
    return out


def ladder_seconds(n_species: int, pressure_bar: float = 1.0, limit_s: float | None = None) -> float:
    """Seconds of one strained-flame ladder to extinction on one core, at most ``limit_s`` (the
    ladder's time limit, :func:`ladder_time_limit`). The ladder's grid is its own (not the
    study's resolution).

    >>> round(ladder_seconds(10)), round(ladder_seconds(53)), round(ladder_seconds(10, 10.0))
    (31, 680, 62)
    >>> ladder_seconds(53, limit_s=240.0)
    240.0
    """
    t = (LADDER_SECONDS * ((n_species + 4) / REFERENCE_VARIABLES) ** LADDER_SPECIES_POWER
         * (1.0 + LADDER_PRESSURE_PER_DECADE * max(0.0, math.log10(pressure_bar))))
    return t if limit_s is None else min(t, limit_s)


def ladders_estimate(study: Study, b: Budget, duration: Callable[[float], str]) -> tuple[str, float]:
    """``check``'s line of the ladders still to solve and their estimated wall time: each ladder's
    measured cost (:func:`ladder_seconds`: species, pressure), spread over the workers longest first."""
    st = of(study)
    assert st is not None  # asked only of a study with [stretch]
    chosen = stretch_points(study, list(b.points))
    todo = [p for p in chosen if stretch_key(p) not in b.stored_keys]
    each = [ladder_seconds(b.species, p.pressure_bar, ladder_time_limit(study)) for p in todo]
    t = parallel_seconds(each, b.workers)
    stored = f"; {len(chosen) - len(todo)} stored, not solved again" if len(todo) < len(chosen) else ""
    return (f"Strained flames: {len(todo)} twin counterflow ladder(s) to extinction (phi "
            f"{', '.join(f'{v:g}' for v in st.equivalence_ratios)}), each 10-{strained.MAX_SOLVES} strained flames "
            f"after the sweep: about {duration(t)} ({duration(max(each, default=0.0))} the longest ladder, "
            f"{min(b.workers, max(len(todo), 1))} at a time; measured 15-70 s a ladder with h2o2.yaml at 1 bar, "
            f"9-15 min with GRI-Mech 3.0{stored})", t)


def _reread(study: Study) -> bool:
    """A premixer's margins (and its limits) read the ladders' values: new ladders, rows read again."""
    return study.premixer is not None


PER_STUDY = (
    PerStudy("stretch", "strained-flame ladders", "stretch.csv", lambda study: of(study) is not None, solve_stretch,
             with_ladders, stretch_rows, _reread, ladders_estimate),
)
