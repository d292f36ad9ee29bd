"""The burned gas of [emissions]: NO, NO2, N2O, CO and fuel of every burning flame after its residence times.

emissions_key     the history's store key: the point's inputs, the residence times, the method
solve_emissions   one task per burning point the store lacks, from the point's stored profile, on
                  the run's backend (chemistry.emissions.burned_gas_history: read from the flame's
                  own profile inside its domain, a constant-pressure plug flow beyond)
with_emissions    the stored rows of the points with their history merged in (``emissions_history``)

Stored apart from the point (sweep.extras), so asking for emissions, or other residence
times, never solves the sweep again; the reference O2, the heating-value basis and mg/kWh are
applied at read-out (design.emission_columns), so changing them integrates nothing.
"""
from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING

from ..store import Store
from .extras import derived_key, done_keys, record, solve_extras
from .points import Point

if TYPE_CHECKING:
    from ..config import Study
    from .backends import Backend

#: Changes of the method that change the stored answer (part of the key).
EMISSIONS_VERSION = 2  # 2: the equilibrium's CO, O2 and water stored too


def wants_emissions(study: Study) -> bool:
    return getattr(study, "emissions", None) is not None


def emissions_key(study: Study, p: Point) -> str:
    assert study.emissions is not None  # asked only with [emissions]
    return derived_key("emissions", p, {"version": EMISSIONS_VERSION, "start": "peak heat release",
                                        "residence_times_s": list(study.emissions.residence_times_s)})


def _task(study: Study, p: Point, profile: dict) -> dict:
    assert study.emissions is not None
    return {"key": emissions_key(study, p), "mechanism_path": study.mechanism_path,
            "mechanism_sha256": study.mechanism_sha256, "profile": profile,
            "times_s": list(study.emissions.residence_times_s)}


def solve_emissions(study: Study, store: Store, pts: list[Point], stored: dict[str, dict], backend: Backend,
                    progress: Callable[[int, int], None] | None = None) -> tuple[int, float]:
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
            todo.append((record("emissions", emissions_key(study, p), p), _task(study, p, profile)))
    return solve_extras(study, store, todo, "emissions_task", backend, progress)


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
