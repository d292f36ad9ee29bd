"""[emissions]' extra solves: every burning flame's burned gas, and each blend at equal flame temperature.

emissions_key     the history's store key: the point's inputs, the residence times, the method
solve_emissions   one task per burning point the store lacks, from the point's stored profile, on
                  the run's backend (task.emissions_task: chemistry.emissions.burned_gas_history,
                  read from the flame's own profile inside its domain, a constant-pressure plug flow beyond)
with_emissions    the stored rows of the points with their history merged in (``emissions_history``)
equal_tad_key     store key of a blended point's matched phi: the point's inputs and its reference's
solve_equal_tad   the matched phi of every blended point (task.equal_tad_task: HP equilibrium and
                  Brent's method, chemistry.emissions.phi_at_flame_temperature), then the flames at
                  those phi (warm-started from the sweep's, stored as points: a resumed run agrees)
                  and their burned gas
with_equal_tad    each blended point's matched phi, its flame's status and burned-gas history
PER_POINT         both, in sweep.analyses' shape, with their ``check`` estimates

Stored apart from the point (sweep.extras), so asking for emissions, or other residence
times, never solves the sweep again; the reference O2, the heating-value basis and mg/kWh are
applied at read-out (readout.emission_columns), so changing them integrates nothing.
At equal phi a hydrogen blend burns hotter, and thermal NO follows the flame temperature; at
equal flame temperature the comparison shows what the blend does besides heating the flame.
"""
from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING

from ...physics import mixtures
from ...store import Store
from ...sweep.analyses import Budget, PerPoint
from ...sweep.extras import PartProgress, derived_key, done_keys, record, solve_extras
from ...sweep.points import Point, point_at_phi, points
from .table import of

if TYPE_CHECKING:
    from ...config import Study
    from ...sweep.backends import Backend

#: The worker functions of these solves (task.py), as sweep.extras.task_function finds them.
TASKS = "flamecharts.analyses.emissions.task:"

#: Changes of the method that change the stored answer (part of the key).
EMISSIONS_VERSION = 2  # 2: the equilibrium's CO, O2 and water stored too


def wants_emissions(study: Study) -> bool:
    return of(study) is not None


def emissions_key(study: Study, p: Point) -> str:
    em = of(study)
    assert em is not None  # asked only with [emissions]
    return derived_key("emissions", p, {"version": EMISSIONS_VERSION, "start": "peak heat release",
                                        "residence_times_s": list(em.residence_times_s)})


def _emissions_task(study: Study, p: Point, profile: dict) -> dict:
    em = of(study)
    assert em is not None
    return {"key": emissions_key(study, p), "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "profile": profile,
            "times_s": list(em.residence_times_s)}


def solve_emissions(study: Study, store: Store, pts: list[Point], stored: dict[str, dict], backend: Backend,
                    progress: PartProgress | None = None) -> tuple[int, float]:
    """The burned-gas history of every burning point of ``pts`` (``stored``: the store's rows by
    key) that the store lacks. Returns (histories done, their summed seconds)."""
    if not wants_emissions(study):
        return 0, 0.0
    burning = list({p.key: p for p in pts if (stored.get(p.key) or {}).get("status") == "ok"}.values())
    done = done_keys(store, [emissions_key(study, p) for p in burning])
    todo = []
    for p in burning:
        if emissions_key(study, p) in done:
            continue
        profile = store.profile(p.key)
        if profile is not None:
            todo.append((record("emissions", emissions_key(study, p), p), _emissions_task(study, p, profile)))
    return solve_extras(study, store, todo, TASKS + "emissions_task", backend, progress)


def with_emissions(study: Study, pts: list[Point], stored: dict[str, dict], store: Store) -> dict[str, dict]:
    """``stored`` with each point's burned-gas history merged into its metrics under
    'emissions_history' (when asked for and integrated), or its failure under
    'emissions_message'; a new dict, the store's rows untouched."""
    if not wants_emissions(study):
        return stored
    found = store.rows([emissions_key(study, p) for p in pts])
    out = dict(stored)
    for p in pts:
        hist, row = found.get(emissions_key(study, p)), stored.get(p.key)
        if hist and row and row.get("metrics"):
            extra = ({"emissions_history": hist["metrics"]} if hist.get("metrics") else
                     {"emissions_message": hist.get("message") or "not computed"})
            out[p.key] = {**row, "metrics": {**row["metrics"], **extra}}
    return out


#: Changes of the matching that change its stored answer (part of its key).
EQUAL_TAD_VERSION = 1


def wants_equal_tad(study: Study) -> bool:
    em = of(study)
    return em is not None and em.equal_flame_temperature and study.blend_with is not None \
        and 0.0 in study.blend_fractions and len(study.blend_fractions) > 1


def equal_tad_key(p: Point, ref: Point) -> str:
    return derived_key("equal_tad", p, {"version": EQUAL_TAD_VERSION, "reference": ref.key})


def _equal_tad_task(study: Study, p: Point, ref: Point) -> dict:
    o2 = mixtures.stoich_o2_per_fuel(study.atoms, p.X_flame)
    return {"key": equal_tad_key(p, ref), "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "T_u": p.T_u, "P": p.P, "X_reference": ref.X_unburned,
            "X_fuel": p.X_flame, "X_oxidizer": p.X_oxidizer, "o2_per_fuel": o2, "lean": p.phi <= 1.0}


def _matched(study: Study, store: Store, blended: list[tuple[Point, Point]]) -> dict[str, Point]:
    """Blended point key -> the point at its matched phi (where one was found)."""
    rows = store.rows([equal_tad_key(p, ref) for p, ref in blended])
    out = {}
    for i, (p, ref) in enumerate(blended):
        m = (rows.get(equal_tad_key(p, ref)) or {}).get("metrics") or {}
        if m.get("phi") is not None:
            out[p.key] = point_at_phi(study, p, float(m["phi"]), index=i)  # indices of one solve_points call
    return out


def _blended(study: Study, pts: list[Point]) -> list[tuple[Point, Point]]:
    """(blended point, the unblended gas's point at its oxidizer, phi, pressure and preheat)."""
    refs = {(q.fuel, q.oxidizer, q.phi, q.pressure_bar, q.T_u): q for q in points(replace(study, blend_fractions=(0.0,)))}
    unique = list({p.key: p for p in pts if p.blend_fraction > 0}.values())
    return [(p, refs[(p.fuel, p.oxidizer, p.phi, p.pressure_bar, p.T_u)]) for p in unique]


def solve_equal_tad(study: Study, store: Store, pts: list[Point], stored: dict[str, dict], backend: Backend,
                    progress: PartProgress | None = None) -> tuple[int, float]:
    """Matched phi, flame and burned gas of every blended point of ``pts`` the store lacks.
    Returns (matched phi and flames done, their summed seconds)."""
    from ...sweep.run import solve_points  # the solve side only

    if not wants_equal_tad(study):
        return 0, 0.0
    blended = _blended(study, pts)
    done = done_keys(store, [equal_tad_key(p, ref) for p, ref in blended])
    todo = [(record("equal_tad", equal_tad_key(p, ref), p), _equal_tad_task(study, p, ref)) for p, ref in blended
            if equal_tad_key(p, ref) not in done]
    n, seconds = solve_extras(study, store, todo, TASKS + "equal_tad_task", backend, progress)
    matched = list(_matched(study, store, blended).values())
    flames = solve_points(study, store, matched, backend, None if progress is None else (
        lambda pr: progress(pr.done, pr.total)), sources={p.key for p in pts})
    n_em, s_em = solve_emissions(study, store, matched, store.rows([q.key for q in matched]), backend, progress)
    return n + flames.solved + n_em, seconds + flames.solve_seconds + s_em


def with_equal_tad(study: Study, pts: list[Point], stored: dict[str, dict], store: Store) -> dict[str, dict]:
    """``stored`` with each blended point's ``equal_tad`` merged into its metrics: the matched
    phi, the status of its flame and its burned-gas history (None until solved); a new dict."""
    if not wants_equal_tad(study):
        return stored
    blended = [(p, ref) for p, ref in _blended(study, pts) if p.key in stored]
    matched = _matched(study, store, blended)
    flames = store.rows([q.key for q in matched.values()])
    hist = store.rows([emissions_key(study, q) for q in matched.values()])
    out = dict(stored)
    for p, _ in blended:
        row, q = stored[p.key], matched.get(p.key)
        if not row.get("metrics"):
            continue
        info = {"phi": None if q is None else q.phi, "status": None, "history": None}
        if q is not None:
            info["status"] = (flames.get(q.key) or {}).get("status")
            info["history"] = (hist.get(emissions_key(study, q)) or {}).get("metrics")
        out[p.key] = {**row, "metrics": {**row["metrics"], "equal_tad": info}}
    return out


#: The burned-gas history of one flame per species of the mechanism [s]: measured on 2 busy cores,
#: 18-26 ms a GRI-Mech 3.0 (53 species) flame at six residence times, 2026-12-05.
EMISSIONS_SECONDS_PER_SPECIES = 0.0005


def _emissions_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    em = of(study)
    assert em is not None  # wanted only with [emissions]
    return (f"Emissions: the burned gas of each burning point after {len(em.residence_times_s)} residence time(s) "
            f"up to {1e3 * max(em.residence_times_s):g} ms (read from the stored flame, a plug flow beyond its "
            "domain)", b.points_to_solve * EMISSIONS_SECONDS_PER_SPECIES * b.species / b.workers,
            "other residence times integrate again, a new reference O2 or basis integrates nothing")


def _equal_tad_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    n = study.n_points * (len(study.blend_fractions) - 1) // len(study.blend_fractions)
    return (f"Emissions at equal flame temperature: each blended point's equivalence ratio matched to the unblended "
            f"gas's adiabatic flame temperature (HP equilibrium), then up to {n} more flames (warm-started) and their "
            "burned gas", n * (b.warm_flame_s + EMISSIONS_SECONDS_PER_SPECIES * b.species) / b.workers,
            "those already stored are not solved again; equal_flame_temperature = false in [emissions] skips them")

PER_POINT = (
    PerPoint("emissions", "burned-gas emissions", wants_emissions, solve_emissions, with_emissions, _emissions_estimate),
    PerPoint("equal_tad", "flames at equal flame temperature", wants_equal_tad, solve_equal_tad, with_equal_tad,
             _equal_tad_estimate),
)
