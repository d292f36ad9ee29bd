"""NOx at equal adiabatic flame temperature ([emissions] with a blend axis): each blend burned at
the equivalence ratio that gives the unblended gas's flame temperature.

equal_tad_key    store key of a blended point's matched phi: the point's inputs and its reference's
solve_equal_tad  the matched phi of every blended point (worker: HP equilibrium and Brent's method,
                 chemistry.emissions.phi_at_flame_temperature), then the flames at those phi
                 (warm-started from the sweep's, stored as points: a resumed run agrees) and
                 their burned gas (sweep.emissions)
with_equal_tad   each blended point's matched phi, its flame's status and burned-gas history

At equal phi a hydrogen blend burns hotter, and thermal NO follows the flame temperature; at
equal flame temperature the comparison shows what the blend does besides heating the flame.
Everything is stored under keys of its own: asking for it never solves the sweep again.
"""
from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from typing import TYPE_CHECKING

from ..physics import mixtures
from ..store import Store
from .emissions import emissions_key, solve_emissions
from .extras import derived_key, done_keys, record, solve_extras
from .points import Point, point_at_phi, points

if TYPE_CHECKING:
    from ..config import Study
    from .backends import Backend

#: Changes of the method that change the stored answer (part of the key).
EQUAL_TAD_VERSION = 1


def wants_equal_tad(study: Study) -> bool:
    em = getattr(study, "emissions", None)
    return em is not None and em.equal_flame_temperature and study.blend_with is not None \
        and 0.0 in study.blend_fractions and len(study.blend_fractions) > 1


def equal_tad_key(p: Point, ref: Point) -> str:
    return derived_key("equal_tad", p, {"version": EQUAL_TAD_VERSION, "reference": ref.key})


def _task(study: Study, p: Point, ref: Point) -> dict:
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
                    progress: Callable[[int, int], None] | None = None) -> tuple[int, float]:
    """Matched phi, flame and burned gas of every blended point of ``pts`` the store lacks.
    Returns (matched phi and flames done, their summed seconds)."""
    from .run import solve_points  # the solve side only

    if not wants_equal_tad(study):
        return 0, 0.0
    blended = _blended(study, pts)
    done = done_keys(store, [equal_tad_key(p, ref) for p, ref in blended])
    todo = [(record("equal_tad", equal_tad_key(p, ref), p), _task(study, p, ref)) for p, ref in blended
            if equal_tad_key(p, ref) not in done]
    n, seconds = solve_extras(study, store, todo, "equal_tad_task", backend, progress)
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
