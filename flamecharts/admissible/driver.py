"""Run the limit searches of a study: bracket on the stored sweep, refine with flames.

Every search (search.py) is a generator that asks for one flame at a time. The driver
collects one request from every open search, solves them together on the run's backend
through the same run loop as the sweep (sweep.run.solve_points: stored like any point,
warm-started from the nearest stored flame, resumable), sends each search its flame
and goes round again until every search has its answer. A rerun finds every flame in
the store and solves nothing; a changed minimum margin solves only the flames its new
searches ask for.
"""
from __future__ import annotations

import dataclasses
import math
import time
from collections import defaultdict
from dataclasses import dataclass
from typing import Callable, Generator

from scipy.optimize import brentq

from ..columns import gas_label
from ..design import fuel_gas
from ..results import point_rows
from ..sweep.points import Point, points
from .search import CRITERIA, Found, blend_search, crossing, limit_value, window_searches

#: Fractions at which the Wobbe index is scanned before its band edge is refined (it
#: needs no flame; the scan only finds the first interval that leaves the band).
WOBBE_SCAN = 100


@dataclass
class LimitsProgress:
    """What a progress callback receives after each round of limit flames."""

    round: int
    open_searches: int
    searches: int
    flames_solved: int
    elapsed_s: float


@dataclass
class _Search:
    limit: str             # max_blend_fraction | lean_edge_equivalence_ratio | rich_edge_equivalence_ratio
    cond: dict             # fuel, oxidizer, blend_fraction, equivalence_ratio, pressure_bar, unburned_temperature_K
    axis: str              # the column the search moves along
    gen: Generator | None  # None: answered without flames
    x_wobbe: float | None = None
    found: Found | None = None
    request: float | None = None


def point_at(study, cond: dict, axis: str, x: float, index: int = 0) -> tuple[object, Point]:
    """The one-point study and its Point at ``cond`` with ``axis`` set to ``x`` (its key is
    the key a swept point of the same mixture would have)."""
    c = {**cond, axis: x}
    sub = dataclasses.replace(study, sweep_fuels=(c["fuel"],), sweep_oxidizers=(c["oxidizer"],),
                              blend_fractions=(c["blend_fraction"],), equivalence_ratios=(c["equivalence_ratio"],),
                              pressures_bar=(c["pressure_bar"],), unburned_temperatures_K=(c["unburned_temperature_K"],))
    return sub, dataclasses.replace(points(sub)[0], index=index)


def wobbe_bound(study, fuel: str, ox: str, refs: dict) -> tuple[float, str]:
    """(largest blend fraction up to which the Wobbe index stays in the band, the side it
    leaves by): 1.0 when it never leaves, -1.0 when the unblended gas is outside already.
    Closed form per fraction (ISO 6976 via design.fuel_gas); the edge by Brent's method
    (scipy.optimize.brentq) to 1e-6."""
    def margin(x: float) -> tuple[float, str]:
        row = fuel_gas(study, fuel, x, ox, refs).row
        lo, hi = row["wobbe_band_low_MJ_m3"], row["wobbe_band_high_MJ_m3"]
        W = row["higher_wobbe_index_MJ_m3" if study.gas_quality.wobbe == "higher" else "lower_wobbe_index_MJ_m3"]
        return (W - lo, "low") if W - lo < hi - W else (hi - W, "high")

    if fuel_gas(study, fuel, 0.0, ox, refs).row["wobbe_band_low_MJ_m3"] is None:
        return 1.0, ""
    m0, side = margin(0.0)
    if m0 < 0:
        return -1.0, side
    prev = 0.0
    for i in range(1, WOBBE_SCAN + 1):
        x = i / WOBBE_SCAN
        m, side = margin(x)
        if m < 0:
            return brentq(lambda t: margin(t)[0], prev, x, xtol=1e-6), side
        prev = x
    return 1.0, ""


def _searches(study, rows: list[dict]) -> list[_Search]:
    lim, b = study.limits, study.burner
    value = (lambda r: limit_value(r, b, lim.criteria))
    out: list[_Search] = []
    if "blend_fraction" in lim.find:
        groups = defaultdict(list)
        for r in rows:
            groups[(r["fuel"], r["oxidizer"], r["equivalence_ratio"], r["pressure_bar"],
                    r["unburned_temperature_K"])].append((r["blend_fraction"], r))
        refs: dict = {}
        bounds = {(f, o): wobbe_bound(study, f, o, refs) for f in study.sweep_fuels for o in study.sweep_oxidizers}
        for (fuel, ox, phi, P, T), swept in groups.items():
            xw, side = bounds[(fuel, ox)]
            cond = dict(fuel=fuel, oxidizer=ox, blend_fraction=None, equivalence_ratio=phi, pressure_bar=P,
                        unburned_temperature_K=T)
            gen = blend_search(swept, xw, side, lim.tolerance["blend_fraction"], lim.max_flames_per_search, value)
            out.append(_Search("max_blend_fraction", cond, "blend_fraction", gen, x_wobbe=xw))
    if "equivalence_ratio" in lim.find:
        groups = defaultdict(list)
        for r in rows:
            groups[(r["fuel"], r["oxidizer"], r["blend_fraction"], r["pressure_bar"],
                    r["unburned_temperature_K"])].append((r["equivalence_ratio"], r))
        for (fuel, ox, frac, P, T), swept in groups.items():
            cond = dict(fuel=fuel, oxidizer=ox, blend_fraction=frac, equivalence_ratio=None, pressure_bar=P,
                        unburned_temperature_K=T)
            pairs, ends, kinds = window_searches(swept, value)
            edges = []  # (phi where the edge lies, search), to list a window's edges lean to rich
            for (kind, xg, rg, xb, rb) in pairs:
                gen = crossing(xg, rg, xb, rb, lim.tolerance["equivalence_ratio"], lim.max_flames_per_search, value)
                edges.append((0.5 * (xg + xb), _Search(kind.replace(" ", "_") + "_equivalence_ratio", cond,
                                                   "equivalence_ratio", gen)))
            for kind, found in zip(kinds, ends):
                at = found.value if found.value is not None else -1.0
                edges.append((at, _Search(kind.replace(" ", "_") + "_equivalence_ratio", cond, "equivalence_ratio",
                                          None, found=found)))
            out += [s for _, s in sorted(edges, key=lambda e: e[0])]
    return out


def _advance(s: _Search, row: dict | None) -> None:
    """Send the search its flame (None: start it); keep its next request or its answer."""
    try:
        s.request = next(s.gen) if row is None else s.gen.send(row)
    except StopIteration as stop:
        s.found, s.request = stop.value, None


def find_limits(study, rows: list[dict], store, solve: Callable[[list[Point]], int] | None,
                on_round: Callable[[LimitsProgress], None] | None = None) -> list[dict]:
    """The limits the study's [limits] table asks for, one limits.csv row per search.

    ``rows``: the annotated rows of the sweep (results.point_rows); ``store``: where the
    flames are read; ``solve(points) -> flames solved``: solves and stores the points the
    store lacks (None: read only; a search whose flame is not stored stops and says so).
    """
    t0 = time.perf_counter()
    searches = _searches(study, rows)
    for s in searches:
        if s.gen is not None:
            _advance(s, None)
    solved, rnd = 0, 0
    while True:
        open_ = [s for s in searches if s.request is not None]
        if not open_:
            break
        rnd += 1
        asked = [point_at(study, s.cond, s.axis, s.request, i) for i, s in enumerate(open_)]
        if solve is not None:
            solved += solve([p for _, p in asked])
        stored = store.rows([p.key for _, p in asked])
        for s, (sub, p) in zip(open_, asked):
            if p.key in stored:
                _advance(s, point_rows(sub, [p], stored)[0])
            else:
                s.gen.close()
                s.found = Found("stopped", None, "", None, note=f"the flame at {s.axis.replace('_', ' ')} "
                                f"{s.request:.4g} is not in the store: run the study again to finish this limit")
                s.request = None
        if on_round is not None:
            on_round(LimitsProgress(rnd, sum(s.request is not None for s in searches), len(searches), solved,
                                    time.perf_counter() - t0))
    return [limit_row(study, s) for s in searches]


def limit_row(study, s: _Search) -> dict:
    """One limits.csv row (columns.LIMIT_COLUMNS) from a finished search."""
    f = s.found
    r = f.row or {}
    margins = {c: r.get(CRITERIA[c][0]) for c in CRITERIA}
    binding = f.binding
    margin_at = margins.get(binding) if binding in CRITERIA else None
    return {
        "limit": s.limit, "fuel": s.cond["fuel"], "oxidizer": s.cond["oxidizer"],
        "blend_with": study.blend_with or "", "blend_fraction": s.cond["blend_fraction"],
        "equivalence_ratio": s.cond["equivalence_ratio"], "pressure_bar": s.cond["pressure_bar"],
        "unburned_temperature_K": s.cond["unburned_temperature_K"],
        "limit_value": f.value, "outcome": f.outcome, "binding": binding, "margin_at_limit": margin_at,
        "flashback_margin_at_limit": margins["flashback"], "blowoff_margin_at_limit": margins["blowoff"],
        "stabilizer_margin_at_limit": margins["stabilizer"],
        "wobbe_limit_blend_fraction": None if s.x_wobbe is None else max(s.x_wobbe, 0.0),
        "bracket_admissible": f.bracket[0] if f.bracket else None,
        "bracket_failing": f.bracket[1] if f.bracket else None,
        "tolerance_reached": abs(f.bracket[1] - f.bracket[0]) if f.bracket else None,
        "flames_evaluated": f.evaluations,
        "evaluated_at": " ".join(f"{x:.6g}" for x, _ in f.evaluated),
        "note": f.note,
    }


def kept(study) -> str:
    """What the study's limits keep, in words: 'flashback >= 1.5, blowoff >= 1.5 and the Wobbe band'."""
    b, lim, gq = study.burner, study.limits, study.gas_quality
    words = [f"{c} >= {getattr(b, CRITERIA[c][1]):g}" for c in lim.criteria]
    if "blend_fraction" in lim.find and (gq.band_MJ_m3 is not None or gq.tolerance_percent is not None):
        words.append("the Wobbe band")
    return ", ".join(words[:-1]) + " and " + words[-1] if len(words) > 1 else words[0]


def _where(r: dict) -> str:
    return f"{r['pressure_bar']:g} bar, {r['unburned_temperature_K']:g} K"


def limit_sentence(r: dict, study) -> str:
    """The answer of one limits.csv row in one sentence (CLI and report).

    >>> r = dict(limit="max_blend_fraction", fuel="town gas", oxidizer="air", blend_with="hydrogen",
    ...          blend_fraction=None, equivalence_ratio=1.1, pressure_bar=1.0, unburned_temperature_K=300.0,
    ...          limit_value=0.2345, outcome="found", binding="flashback", margin_at_limit=1.503,
    ...          wobbe_limit_blend_fraction=0.41, tolerance_reached=0.004, note="")
    >>> from types import SimpleNamespace as NS
    >>> limit_sentence(r, NS(burner=NS(name="rig", min_flashback_margin=1.5), blend_with="hydrogen"))
    'town gas at phi 1.1, 1 bar, 300 K: rig takes at most 23.4 % hydrogen (flashback binds: margin 1.50 there, minimum 1.5); the Wobbe band allows 41.0 %'
    """
    b, blend = study.burner, study.blend_with or "blend gas"
    v, why = r["limit_value"], r["binding"]
    req = getattr(b, CRITERIA[why][1], None) if why in CRITERIA else None
    margin = (f"margin {r['margin_at_limit']:.2f} there, minimum {req:g}"
              if r.get("margin_at_limit") is not None and req is not None else "")
    if r["limit"] == "max_blend_fraction":
        head = f"{r['fuel']} at phi {r['equivalence_ratio']:g}, {_where(r)}: {b.name}"
        wob = r.get("wobbe_limit_blend_fraction")
        wob_txt = f"; the Wobbe band allows {100 * wob:.1f} %" if wob is not None and wob < 1.0 and why != "Wobbe band" else ""
        note = r["note"] or ""
        low = note[:note.index("); ") + 1] + " and" if note.startswith("needs more than") and "); " in note else ""
        low = low.replace("needs more than", f"needs more than {blend} fraction", 1)
        if r["outcome"] == "found" and why == "Wobbe band":
            return f"{head} {low + ' ' if low else ''}takes {100 * v:.1f} % {blend}, where the Wobbe index leaves the band (binding)"
        if r["outcome"] == "found":
            return f"{head} {low + ' ' if low else ''}takes at most {100 * v:.1f} % {blend} ({why} binds: {margin}){wob_txt}"
        if r["outcome"] == "whole range":
            return f"{head} {low + ' ' if low else ''}keeps every margin up to 100 % {blend}"
        if r["outcome"] == "none admissible":
            return f"{head}: not admissible ({r['note']})"
        return f"{head}: search stopped ({r['note']})"
    head = f"{gas_label(r)}, {_where(r)}: {b.name}"
    side = "leanest" if r["limit"].startswith("lean") else "richest"
    past = "leaner" if side == "leanest" else "richer"
    if r["outcome"] == "found":
        return f"{head}: {side} admissible phi {v:.3f} ({why} binds {past}: {margin})"
    if r["outcome"] == "beyond swept range":
        return f"{head}: admissible at the {side} swept phi {v:g}; the window may reach further"
    if r["outcome"] == "none admissible":
        return f"{head}: no swept phi keeps every margin ({why} misses most narrowly)"
    return f"{head}: {side} edge not found ({r['note']})"


def planned_searches(study) -> dict[str, int]:
    """How many limit searches the study's [limits] table starts, by kind, and the flames
    they may need (for `check`): a blend search per (fuel, oxidizer, phi, p, T_u), up to
    two window edges per (fuel, oxidizer, blend, p, T_u); each refines a bracket of one
    sweep step to the tolerance, which takes about log2(step / tolerance) flames by
    bisection and usually fewer by Brent's method (one more where the Wobbe bound or the
    pure blend gas is tried)."""
    lim = study.limits
    if lim is None:
        return {}
    others = len(study.sweep_fuels) * len(study.sweep_oxidizers) * len(study.pressures_bar) * len(
        study.unburned_temperatures_K)
    out = {"blend_fraction": 0, "equivalence_ratio": 0, "flames": 0}

    def flames(values, tol) -> int:
        v = sorted(values)
        step = max((b - a for a, b in zip(v, v[1:])), default=0.0)
        return max(1, math.ceil(math.log2(step / tol))) if step > tol else 1

    if "blend_fraction" in lim.find:
        out["blend_fraction"] = others * len(study.equivalence_ratios)
        out["flames"] += out["blend_fraction"] * (flames(study.blend_fractions, lim.tolerance["blend_fraction"]) + 1)
    if "equivalence_ratio" in lim.find:
        out["equivalence_ratio"] = 2 * others * len(study.blend_fractions)
        out["flames"] += out["equivalence_ratio"] * flames(study.equivalence_ratios, lim.tolerance["equivalence_ratio"])
    return out
