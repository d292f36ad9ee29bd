"""Strained-flame ladders of the [stretch] request: which, their keys, solving and storing them.

stretch_points   the swept points a [stretch] table selects
stretch_key      a ladder's store key: the point's inputs and the ladder's settings (sweep.extras)
solve_stretch    solve every selected ladder the store lacks on the run's backend, commit each
stretch_rows     one row per ladder (STRETCH_COLUMNS), from the store
with_ladders     stored rows with each burned ladder's strongest consumption speed and extinction
                 strain rate merged into its point's metrics (the premixer's leading-point flame
                 speed and extinction-strain blowout read them)

A ladder needs its mixture's unstretched S_L and T_ad, so it runs after the sweep, one task
per ladder on the same workers (local or Dask), stored in the same table as the free flames
under its own key (family 'stretch:...', no profile: never a warm-start source).
"""
from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING, Any

from .. import numerics as strained
from ..store import Store
from .extras import derived_key, done_keys, record, solve_extras
from .points import Point
from .schedule import flame_time_limit

if TYPE_CHECKING:
    from ..config import Study
    from .backends import Backend

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


def stretch_points(study: Study, pts: list[Point]) -> list[Point]:
    """The points of ``pts`` that the study's [stretch] table selects (none without one)."""
    st = study.stretch
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
                  progress: Callable[[int, int], None] | None = None) -> tuple[int, float]:
    """Solve the ladder of every selected point whose free flame burns and whose ladder the
    store lacks (or lost to a dead worker); commit each as it finishes. Returns (ladders
    solved, their summed seconds)."""
    chosen = [p for p in stretch_points(study, pts) if rows_by_key.get(p.key, {}).get("status") == "ok"]
    done = done_keys(store, [stretch_key(p) for p in chosen])
    todo = [(record("stretch", stretch_key(p), p), _task(study, p, rows_by_key[p.key]))
            for p in chosen if stretch_key(p) not in done]
    return solve_extras(study, store, todo, "stretch_task", backend, progress)


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


def stretch_rows(study: Study, pts: list[Point], rows_by_key: dict[str, dict], store: Store) -> list[dict]:
    """One row per selected ladder (STRETCH_COLUMNS), in study order; ladders not solved yet
    (or whose free flame does not burn) have status 'pending' or the free flame's status."""
    selected = stretch_points(study, pts)
    stored = store.rows([stretch_key(p) for p in selected])
    out: list[dict[str, Any]] = []
    for p in selected:
        free = rows_by_key.get(p.key, {})
        s = stored.get(stretch_key(p))
        m = (s or {}).get("metrics") or {}
        S_L = free.get("laminar_flame_speed_m_s")
        out.append({
            "fuel": p.fuel, "oxidizer": p.oxidizer, "blend_with": p.blend_with or "", "blend_fraction": p.blend_fraction,
            "equivalence_ratio": p.phi, "pressure_bar": p.pressure_bar, "unburned_temperature_K": p.T_u,
            "status": s["status"] if s else ("pending" if free.get("status") == "ok" else "no free flame"),
            "laminar_flame_speed_m_s": S_L,
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
        })
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
