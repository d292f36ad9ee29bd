"""Run the limit searches of a study: bracket on the stored sweep, refine with flames.

Every search (search.py) is a generator that asks for the flames of its open intervals.
The driver collects the requests of every open search, solves them together on the run's backend
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
from collections.abc import Callable, Generator, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from scipy.optimize import brentq

from ..columns import LIMIT_COLUMNS
from ..design import Ladders, core_flashback_basis, fuel_gas, not_assessed, port_flow, sweep_ladders
from ..results import point_rows
from ..sweep.points import Point, points
from .search import (
    CRITERIA,
    NOT_ASSESSED,
    WOBBE,
    Answer,
    Window,
    apply_band,
    band_at,
    limit_parts,
    unassessed_reason,
    window_search,
)
from .words import burner_and_limits, fixed_ratio_note

if TYPE_CHECKING:
    from ..config import Study
    from ..store import Store

#: Fractions at which the Wobbe index is scanned before each crossing of a band edge is
#: refined (it needs no flame).
WOBBE_SCAN = 100


@dataclass
class LimitsProgress:
    """What a progress callback receives after each round of limit flames."""

    round: int
    open_searches: int
    searches: int
    flames_solved: int
    elapsed_s: float
    flames_left: int = 0   # about how many flames the open searches can still ask for (:func:`flames_left`)


@dataclass
class _Search:
    axis: str              # blend_fraction | equivalence_ratio: the column the search moves along
    cond: dict             # fuel, oxidizer, blend_fraction, equivalence_ratio, pressure_bar, unburned_temperature_K
    gen: Generator[list[float], list[dict], Answer] | None
    band: list[tuple[float, float]] | None = None   # Wobbe band intervals of the blend axis (None: not a criterion)
    answer: Answer | None = None
    request: list[float] | None = None
    missing: str = ""      # a flame the search needs is not in the store (read-only)
    unassessed: str = ""   # the criteria not assessed at swept points, and why (limits.csv criteria_not_assessed)
    nothing: bool = False  # no criterion of the search is assessed at any swept flame: no search
    cellular: tuple[float, ...] = ()  # swept values whose flames are thermodiffusively unstable ([flame_response])
    nowhere: frozenset[str] = frozenset()  # its criteria assessed at none of its burning swept flames
    budget: int = 0        # about how many flames it needs, judged as ``check`` judges it (:func:`search_budget`)
    asked: int = 0         # flames it asked for so far


def point_at(study: Study, cond: dict, axis: str, x: float, index: int = 0) -> tuple[Study, Point]:
    """The one-point study and its Point at ``cond`` with ``axis`` set to ``x`` (its key is
    the key a swept point of the same mixture would have)."""
    c = {**cond, axis: x}
    sub = dataclasses.replace(study, sweep_fuels=(c["fuel"],), sweep_oxidizers=(c["oxidizer"],),
                              blend_fractions=(c["blend_fraction"],), equivalence_ratios=(c["equivalence_ratio"],),
                              pressures_bar=(c["pressure_bar"],), unburned_temperatures_K=(c["unburned_temperature_K"],))
    return sub, dataclasses.replace(points(sub)[0], index=index)


def wobbe_margin(study: Study, fuel: str, ox: str, refs: dict) -> Callable[[float], float] | None:
    """Distance [MJ/m^3] of the blend's Wobbe index inside the band at blend fraction x
    (negative outside), closed form by ISO 6976 (design.fuel_gas); None without a band."""
    if fuel_gas(study, fuel, 0.0, ox, refs).row["wobbe_band_low_MJ_m3"] is None:
        return None
    col = "higher_wobbe_index_MJ_m3" if study.gas_quality.wobbe == "higher" else "lower_wobbe_index_MJ_m3"

    def margin(x: float) -> float:
        row = fuel_gas(study, fuel, x, ox, refs).row
        W = row[col]
        return min(W - row["wobbe_band_low_MJ_m3"], row["wobbe_band_high_MJ_m3"] - W)
    return margin


def band_intervals(margin: Callable[[float], float], scan: int = WOBBE_SCAN) -> list[tuple[float, float]]:
    """The blend-fraction intervals of [0, 1] inside the Wobbe band: ``margin`` scanned at
    ``scan`` + 1 fractions, each change of sign refined by Brent's method
    (scipy.optimize.brentq) to 1e-6.

    >>> band_intervals(lambda x: 0.404 - x)
    [(0.0, 0.404)]
    >>> [(round(a, 6), round(b, 6)) for a, b in band_intervals(lambda x: 0.01 - (x - 0.5) ** 2)]
    [(0.4, 0.6)]
    """
    xs = [i / scan for i in range(scan + 1)]
    ms = [margin(x) for x in xs]
    out: list[tuple[float, float]] = []
    start = 0.0 if ms[0] >= 0 else None
    for (x0, m0), (x1, m1) in zip(zip(xs, ms), zip(xs[1:], ms[1:])):
        if (m0 >= 0) == (m1 >= 0):
            continue
        edge = brentq(margin, x0, x1, xtol=1e-6)
        if m0 >= 0:
            assert start is not None  # inside the band since its last entry
            out.append((start, edge))
            start = None
        else:
            start = edge
    if start is not None:
        out.append((start, 1.0))
    return out


def uses_wobbe(study: Study) -> bool:
    """Whether the Wobbe band is one of the study's limit criteria (blend and phi searches)."""
    return "wobbe" in burner_and_limits(study)[1].criteria


def flame_criteria(study: Study) -> tuple[str, ...]:
    """The study's limit criteria that a flame decides (all but the Wobbe band)."""
    return tuple(c for c in burner_and_limits(study)[1].criteria if c in CRITERIA)


#: The columns that fix a search's condition (the searched axis among them is left blank).
CONDITION = ("fuel", "oxidizer", "blend_fraction", "equivalence_ratio", "pressure_bar", "unburned_temperature_K")


def _searches(study: Study, rows: list[dict]) -> list[_Search]:
    """One search per condition and axis the [limits] table asks for: blend searches first
    (over the axis from 0 to 1, looking for windows only where the Wobbe band lets one count),
    then phi searches (over the swept range)."""
    b, lim = burner_and_limits(study)
    crit = flame_criteria(study)

    def parts(r: dict) -> tuple[dict[str, float] | None, str]:
        return limit_parts(r, b, crit)
    bands = _bands(study)
    out: list[_Search] = []
    for axis in ("blend_fraction", "equivalence_ratio"):
        if axis not in lim.find:
            continue
        groups: defaultdict[tuple, list[tuple[float, dict]]] = defaultdict(list)
        for r in rows:
            groups[tuple(None if c == axis else r[c] for c in CONDITION)].append((r[axis], r))
        for key, swept in groups.items():
            cond = dict(zip(CONDITION, key))
            band = bands[(cond["fuel"], cond["oxidizer"])]
            blend = axis == "blend_fraction"
            burning = [r for _, r in swept if r.get("status") == "ok"]
            assessed = [frozenset(c for c in crit if unassessed_reason(r, c) is None) for r in burning]
            nothing = bool(burning) and all(parts(r)[1].startswith(NOT_ASSESSED) for r in burning)
            gen = None if nothing else window_search(swept, parts, lim.tolerance[axis], lim.max_flames_per_search,
                                                     (0.0, 1.0) if blend else None,
                                                     look_inside=band if blend else None)
            out.append(_Search(axis, cond, gen, band=band, nothing=nothing,
                               unassessed=unassessed_words(sorted(swept, key=lambda t: t[0]), crit, axis),
                               cellular=tuple(sorted(x for x, r in swept if r.get("instability") == "cellular")),
                               nowhere=frozenset(crit) - frozenset().union(*assessed) if burning else frozenset(),
                               budget=search_budget(study, axis, [x for x, _ in swept], assessed)))
    return out


def search_budget(study: Study, axis: str, values: Sequence[float], assessed: Sequence[frozenset[str]]) -> int:
    """About how many flames one search needs, as ``check`` counts them (:func:`planned_searches`):
    the edges that can exist (:func:`edges_possible`) times the flames of one edge
    (:func:`flames_per_search`), one more for a blend search's pure blend gas."""
    lim = study.limits
    assert lim is not None  # a search runs only under [limits]
    if not any(assessed):
        return 0
    per_edge = flames_per_search(getattr(study, f"{axis}s"), lim.tolerance[axis], lim.max_flames_per_search)
    return (edges_possible(axis, values, assessed) * per_edge
            + (axis == "blend_fraction" and max(values) < 1.0))


def flames_left(searches: Sequence[_Search]) -> int:
    """About how many flames the open searches can still ask for: each its budget less the flames
    it asked for so far, and at least the flames of its next request (a search past its budget
    still needs those). Falls as the searches advance and close."""
    return sum(max(s.budget - s.asked, len(s.request or ())) for s in searches if s.request is not None)


def unassessed_words(swept: list[tuple[float, dict]], criteria: tuple[str, ...], axis: str) -> str:
    """'flashback at 3 of 3 swept flames (at phi 0.5: turbulent port flow (Re 3.7e+05 > 2300))':
    for each criterion of a search, how many swept burning flames it is not assessed at, and
    why at the first of them ('' when every criterion is assessed everywhere)."""
    burning = [(x, r) for x, r in swept if r.get("status") == "ok"]
    out = []
    for c in criteria:
        off = [(x, why) for x, r in burning if (why := unassessed_reason(r, c)) is not None]
        if off:
            at = f"{100 * off[0][0]:g} %" if axis == "blend_fraction" else f"phi {off[0][0]:g}"
            out.append(f"{c} at {len(off)} of {len(burning)} swept flames (at {at}: {off[0][1]})")
    return "; ".join(out)


def _bands(study: Study) -> dict[tuple[str, str], list[tuple[float, float]] | None]:
    """(fuel, oxidizer) -> the blend-fraction intervals inside the Wobbe band (None: the band
    is not a criterion); without a blend, [(0, 0)] or [] as the fuel itself is in or out."""
    refs: dict = {}
    out: dict[tuple[str, str], list[tuple[float, float]] | None] = {}
    for f in study.sweep_fuels:
        for o in study.sweep_oxidizers:
            m = wobbe_margin(study, f, o, refs) if uses_wobbe(study) else None
            out[(f, o)] = (None if m is None else band_intervals(m) if study.blend_with
                           else [(0.0, 0.0)] if m(0.0) >= 0 else [])
    return out


def _advance(s: _Search, rows: list[dict] | None) -> None:
    """Send the search its flames (None: start it); keep its next requests or its answer."""
    gen = s.gen
    assert gen is not None  # only a search with a generator runs
    try:
        s.request = next(gen) if rows is None else gen.send(rows)
    except StopIteration as stop:
        s.answer, s.request = stop.value, None
        if s.band is not None and s.axis == "blend_fraction":
            apply_band(s.answer, s.band)
        elif s.band is not None:
            band_at(s.answer, s.band, s.cond["blend_fraction"] or 0.0)


def find_limits(study: Study, rows: list[dict], store: Store, solve: Callable[[list[Point]], int] | None,
                on_round: Callable[[LimitsProgress], None] | None = None) -> list[dict]:
    """The limits the study's [limits] table asks for: limits.csv rows, one per admissible
    window of each search (one row for a search without a window).

    ``rows``: the annotated rows of the sweep (results.point_rows); ``store``: where the
    flames are read; ``solve(points) -> flames solved``: solves and stores the points the
    store lacks (None: read only; a search whose flame is not stored stops and says so).
    """
    t0 = time.perf_counter()
    ladders = sweep_ladders(rows) if study.premixer is not None else None
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
        asked = [(s, point_at(study, s.cond, s.axis, x)) for s in open_ for x in s.request or ()]
        for s in open_:
            s.asked += len(s.request or ())
        asked = [(s, (sub, dataclasses.replace(p, index=i))) for i, (s, (sub, p)) in enumerate(asked)]
        if solve is not None:
            solved += solve([p for _, (_, p) in asked])
        stored = store.rows([p.key for _, (_, p) in asked])
        for s in open_:
            mine = [(sub, p) for t, (sub, p) in asked if t is s]
            lacking = [p for _, p in mine if p.key not in stored]
            if lacking:
                assert s.gen is not None and s.request is not None  # an open search
                s.gen.close()
                x = s.request[[p.key for _, p in mine].index(lacking[0].key)]
                s.missing = (f"the flame at {s.axis.replace('_', ' ')} {x:.4g} is not in the store: run the study "
                             "again to finish this search")
                s.request = None
                continue
            _advance(s, [search_row(sub, p, stored, ladders) for sub, p in mine])
        if on_round is not None:
            on_round(LimitsProgress(rnd, sum(s.request is not None for s in searches), len(searches), solved,
                                    time.perf_counter() - t0, flames_left(searches)))
    return [{c: r.get(c) for c in LIMIT_COLUMNS if c != "mechanism"} for s in searches for r in limit_rows(study, s)]


def search_row(sub: Study, p: Point, stored: dict[str, dict], ladders: Ladders | None) -> dict:
    """The annotated row of a flame a search solved (``sub``, ``p``: :func:`point_at`): the same read-out
    as a swept point's, with the sweep's [stretch] ladders (``ladders``: design.sweep_ladders of the
    sweep's rows) for a premixer's margins, which interpolate between the ladder points: so the
    core-flow flashback and blowout margins are the same function of a flame at a swept point and
    between two. The search's flames carry no ladder, ignition delays or other extras of their own."""
    return point_rows(sub, [p], stored, ladders)[0]


def limit_rows(study: Study, s: _Search) -> list[dict]:
    """The limits.csv rows (columns.LIMIT_COLUMNS) of one finished search."""
    base = {"axis": s.axis, "fuel": s.cond["fuel"], "oxidizer": s.cond["oxidizer"],
            "blend_with": study.blend_with or "", "blend_fraction": s.cond["blend_fraction"],
            "equivalence_ratio": s.cond["equivalence_ratio"], "pressure_bar": s.cond["pressure_bar"],
            "unburned_temperature_K": s.cond["unburned_temperature_K"],
            "tolerance": burner_and_limits(study)[1].tolerance[s.axis]}
    base["criteria_not_assessed"] = s.unassessed
    a = s.answer
    if s.nothing:
        row = {**base, "window": 0, "outcome": NOT_ASSESSED, "flames_evaluated": 0, "evaluated_at": "",
               "note": "no criterion of this search is in its range at these flames, so no limit is given"}
        if s.band:
            near = _nearest(s.band, None, s.cond["blend_fraction"])
            row.update(wobbe_band_from=near[0], wobbe_band_to=near[1])
        return [row]
    if a is None:
        return [{**base, "window": 0, "outcome": "stopped", "flames_evaluated": 0, "evaluated_at": "",
                 "note": s.missing}]
    common = {**base, "flames_evaluated": len(a.evaluated),
              "evaluated_at": " ".join(f"{x:.6g}" for x, _ in a.evaluated),
              "swept_failures": _failures(a.failures)}
    crit = flame_criteria(study)
    if not a.windows:
        m = a.miss
        outcome = "stopped" if a.stopped and m is None and not a.flame_windows else "none admissible"
        if a.flame_windows:
            common.update(_flame_columns(a.flame_windows[0]))
        if s.band:
            near = _nearest(s.band, a.flame_windows[0] if a.flame_windows else None, s.cond["blend_fraction"])
            common.update(wobbe_band_from=near[0], wobbe_band_to=near[1])
        ends = [] if m is None or s.axis != "equivalence_ratio" or m.at not in (a.first, a.last) else [
            "the closest miss is at the end of the swept range: a window may lie beyond it"]
        row = {**common, "window": 0, "outcome": outcome,
               "note": "; ".join(a.stopped + _band_words(a, s.band) + ends)}
        if m is not None:
            row.update(core_flashback_basis=_core_basis([(m.binding, m.row)]))
            row.update(closest_miss_at=m.at, closest_miss_binding=m.binding,
                       closest_miss_margin=_margin(m.row, m.binding),
                       closest_miss_margins=", ".join(f"{c} {_margin(m.row, c):.3g}" for c in crit
                                                      if _margin(m.row, c) is not None))
        return [row]
    out = []
    ratio = fixed_ratio_note(study)
    for n, w in enumerate(a.windows, 1):
        # the fixed ratio of the two critical gradients bounds a window only where both are assessed
        rests = [ratio] if ratio and {w.lower.binding, w.upper.binding} & {"flashback", "blowoff"} \
            and not s.nowhere & {"flashback", "blowoff"} else []
        rests += _cellular_words(s, w)
        row = {**common, "window": n, "outcome": "window", "note": "; ".join(
            [e.note for e in (w.lower, w.upper) if e.note] + _misses(a) + _skipped(a) + rests)}
        for side, e in (("lower", w.lower), ("upper", w.upper)):
            row.update({f"{side}_edge": e.value, f"{side}_kind": e.kind, f"{side}_binding": e.binding,
                        f"{side}_margin": _margin(e.row, e.binding), f"{side}_bracket_failing": e.failing})
        edges = [w.lower, w.upper] + ([w.flame.lower, w.flame.upper] if w.flame is not None else [])
        row["core_flashback_basis"] = _core_basis([(e.binding, e.row) for e in edges])
        if w.flame is not None:
            row.update(_flame_columns(w.flame))
            assert s.band is not None  # a window keeps its flame window only under the Wobbe band
            inside = [(b0, b1) for b0, b1 in s.band if b0 <= w.upper.value + 1e-9 and b1 >= w.lower.value - 1e-9]
            if inside:
                row.update(wobbe_band_from=inside[0][0], wobbe_band_to=inside[0][1])
        out.append(row)
    return out


def _core_basis(bound: list[tuple[str, dict | None]]) -> str | None:
    """Which turbulent flame speed the core_flashback edges (binding, flame row) rest on, and whether
    outside its fitted range (design.core_flashback_basis); None where core_flashback binds nowhere."""
    words = sorted({core_flashback_basis(row) for c, row in bound if c == "core_flashback" and row is not None} - {""})
    return "; ".join(words) or None


def _cellular_words(s: _Search, w: Window) -> list[str]:
    """The note of a window holding swept flames that are thermodiffusively unstable: the
    thermal flashback criterion counts them admissible, and understates their risk."""
    inside = [x for x in s.cellular if w.lower.value - 1e-12 <= x <= w.upper.value + 1e-12]
    if not inside:
        return []
    return [f"{len(inside)} swept flame{'s' if len(inside) > 1 else ''} inside this window "
            f"({', '.join(f'{x:g}' for x in inside)}) {'are' if len(inside) > 1 else 'is'} thermodiffusively unstable "
            "(cellular): admissible on the thermal flashback criterion alone, which understates their risk"]


def _nearest(band: list[tuple[float, float]], w: Window | None, x: float | None) -> tuple[float, float]:
    """The band interval nearest a flame window (blend search) or a blend fraction (phi search)."""
    lo, hi = (w.lower.value, w.upper.value) if w is not None else (x or 0.0, x or 0.0)
    return min(band, key=lambda b: max(b[0] - hi, lo - b[1], 0.0))


def _skipped(a: Answer) -> list[str]:
    return [f"between {_pct(lo)} and {_pct(hi)} % (outside the Wobbe band) no window of the flame margins "
            "alone was looked for" for lo, hi in a.skipped]


def _flame_columns(w: Window) -> dict:
    """The flame_* columns of a window the flame criteria alone allow."""
    return {f"flame_{side}_{what}": getattr(getattr(w, side), attr) for side in ("lower", "upper")
            for what, attr in (("edge", "value"), ("kind", "kind"), ("binding", "binding"))}


def _margin(row: dict | None, criterion: str) -> float | None:
    return None if row is None or criterion not in CRITERIA else row.get(CRITERIA[criterion][0])


def _failures(failures: list[tuple[float, str]]) -> str:
    """'blowoff at 0; flashback at 0.3, 0.6' from (swept value, criterion or reason) pairs."""
    by: dict[str, list[str]] = {}
    for x, why in failures:
        kind = (why if why in CRITERIA or why == WOBBE else NOT_ASSESSED if why.startswith(NOT_ASSESSED)
                else "no flame")
        by.setdefault(kind, []).append(f"{x:g}")
    return "; ".join(f"{why} at {', '.join(xs)}" for why, xs in by.items())


def _misses(a: Answer) -> list[str]:
    return [f"no admissible mixture between {lo:.4g} and {hi:.4g} (at best {m.at:.4g}, {m.binding} margin "
            f"{_margin(m.row, m.binding):.3g})" for lo, hi, m in a.misses if _margin(m.row, m.binding) is not None]


def _band_words(a: Answer, band: list[tuple[float, float]] | None) -> list[str]:
    if band is None:
        return []
    if not band:
        return ["every blend fraction from 0 to 100 % lies outside the Wobbe band"]
    if a.flame_windows:
        more = "; ".join(f"{_pct(w.lower.value)}-{_pct(w.upper.value)} %" for w in a.flame_windows[1:])
        out = [f"the flame margins also allow {more}"] if more else []
    else:
        out = []
    return out + _skipped(a)


def _pct(x: float) -> str:
    return f"{100 * x:.1f}"


#: The fresh mixture of a point as ``check`` computes it before any flame (sweep.worker.fresh_mixture):
#: unburned_density_kg_m3, unburned_viscosity_Pa_s, lewis_number_fuel, lewis_number_oxygen.
Mixture = Callable[[Point], dict]


@dataclass(frozen=True)
class LimitsPlan:
    """What ``check`` expects of a study's limit searches before any flame is solved."""

    searches: dict[str, int]   # axis -> searches the [limits] table starts along it
    idle: dict[str, int]       # axis -> those of them that need no flame (no flame criterion in range)
    flames_at: dict[float, int]  # pressure [bar] -> about how many flames beyond the sweep the others need
    longest: int = 0           # the most flames one search needs (its rounds come one after another)
    why: str = ""              # why the idle ones need none, at the first of them ('' without any)

    @property
    def flames(self) -> int:
        return sum(self.flames_at.values())


#: Flames Brent's method saves on an edge against bisection: its interpolation steps land near the
#: root of the nearly linear log-margin (search.py). Measured: 3-4 flames where bisection takes 5
#: (0.1 in blend fraction to 0.0025-0.005), 14 for the four edges of the mechanism comparison demo
#: (20 by bisection), 4-5 for the gas-turbine demo's blend edges (6): docs/benchmarks.md, "Limit searches"
#: (under "Earlier measurements").
BRENT_SAVES = 1


def flames_per_search(values: Sequence[float], tol: float, max_flames: int) -> int:
    """About how many flames one edge of a search costs: Brent's method on a bracket of the widest
    sweep step down to the tolerance, :data:`BRENT_SAVES` fewer than bisection (at least one), at
    most ``max_flames``.

    >>> flames_per_search([0.6, 0.8, 1.0], 0.01, 20), flames_per_search([1.0], 0.01, 20)
    (4, 1)
    """
    v = sorted(values)
    step = max((b - a for a, b in zip(v, v[1:])), default=0.0)
    bisection = math.ceil(math.log2(step / tol)) if step > tol else 1
    return min(max_flames, max(1, bisection - BRENT_SAVES))


def _not_assessed(study: Study, p: Point, mixture: Mixture | None, refs: dict, crit: tuple[str, ...],
                  every: bool = False) -> dict[str, str]:
    """criterion -> why it is not assessed at swept point ``p``, by the run's rules (design.not_assessed
    on physics.validity) on what is known before its flame: pressure, preheat, phi and the port
    layout; then, where a criterion of ``crit`` is still in range (or ``every``: for the words) and
    ``mixture`` is given, the fresh mixture's port Reynolds number and Lewis numbers too."""
    r: dict = {"equivalence_ratio": p.phi, "pressure_bar": p.pressure_bar, "unburned_temperature_K": p.T_u}
    why = not_assessed(study, r, None)
    if mixture is None or all(c in why for c in crit) and not every:
        return why
    r.update(mixture(p))
    return not_assessed(study, r, port_flow(study, r, fuel_gas(study, p.fuel, p.blend_fraction, p.oxidizer, refs))[2])


def _assessed(study: Study, swept: list[Point], crit: tuple[str, ...], mixture: Mixture | None,
              refs: dict) -> list[frozenset[str]]:
    """The flame criteria of ``crit`` assessed at each swept point of a search, judged as
    :func:`_not_assessed` judges them before any flame (a criterion whose range ``mixture`` would be
    needed to judge, without it, counts as assessed)."""
    return [frozenset(c for c in crit if c not in _not_assessed(study, p, mixture, refs, crit)) for p in swept]


#: How a flame criterion's margin moves as the flame gets faster (S_L, and with it the turbulent flame
#: speed and the extinction strain rate): -1, it falls (the criterion fails where flames are fast:
#: flashback, the core flow's flashback); +1, it rises (fails where they are slow: blowoff, the
#: stabilizer, extinction-strain blowout). Each margin is a monotone function of the flame's speed
#: (critical velocity gradients, Lewis & von Elbe 1987; docs/limits.md, docs/premixers.md).
SPEED_SIGN = {"flashback": -1, "core_flashback": -1, "blowoff": 1, "stabilizer": 1, "extinction_blowout": 1}

#: Every swept equivalence ratio at or below this lies lean of the fastest flame, where S_L rises with
#: phi: the laminar flame speed of hydrocarbon and hydrogen fuels in air peaks rich of stoichiometric
#: (phi about 1.05-1.1 for hydrocarbons, about 1.8 for hydrogen; Law 2006, ch. 7, from memory).
LEAN_OF_PEAK_PHI = 1.0


def edges_possible(axis: str, values: Sequence[float], assessed: Sequence[frozenset[str]]) -> int:
    """How many edges one search can find, judged before any flame: edges lie between neighbouring
    searched values (the swept ones; a blend search also the pure blend gas, fraction 1), at most
    one where every criterion assessed anywhere in the search is assessed at every swept point and
    all of them fail the same way (:data:`SPEED_SIGN`) along an axis where the flame's speed is
    monotone (the blend fraction; phi lean of the fastest flame, :data:`LEAN_OF_PEAK_PHI`): the
    limit function then changes sign at most once. Otherwise at most two (margins that rise and
    fall at most once; interior windows between failing points cost more and are not counted).

    >>> core = [frozenset({"core_flashback"})] * 3
    >>> (edges_possible("equivalence_ratio", [0.5, 0.6, 0.7], core), edges_possible("equivalence_ratio", [0.8, 1.0, 1.2], core),
    ...  edges_possible("equivalence_ratio", [0.7], core[:1]), edges_possible("blend_fraction", [0.0], core[:1]))
    (1, 2, 0, 1)
    >>> edges_possible("blend_fraction", [0.0, 0.5], [frozenset({"flashback", "blowoff"})] * 2)
    2
    """
    blend = axis == "blend_fraction"
    intervals = len(values) - 1 + (1 if blend and max(values) < 1.0 else 0)
    signs = {SPEED_SIGN.get(c, 0) for c in frozenset().union(*assessed)}
    one_way = len(signs) == 1 and 0 not in signs and len(set(assessed)) == 1
    monotone = one_way and (blend or max(values) <= LEAN_OF_PEAK_PHI)
    return min(intervals, 1 if monotone else 2)


def planned_searches(study: Study, mixture: Mixture | None = None) -> LimitsPlan:
    """How many limit searches the study's [limits] table starts, by axis, which of them need
    no flame, and about how many flames the others need (for `check`): a blend search per
    (fuel, oxidizer, phi, p, T_u), a phi search per (fuel, oxidizer, blend, p, T_u); each
    refines the edges that can exist (:func:`edges_possible`: one or two) from a bracket of one
    sweep step to the tolerance (:func:`flames_per_search`; a blend search tries the pure blend
    gas once more). A search whose flame criteria are all outside their range at every swept
    point needs none (the Wobbe band alone needs none either). Interior windows between failing
    swept points cost more and are not in it."""
    lim = study.limits
    assert lim is not None  # asked only of a study with [limits]
    crit = flame_criteria(study)
    searches = {"blend_fraction": 0, "equivalence_ratio": 0}
    idle = dict(searches)
    flames_at: defaultdict[float, int] = defaultdict(int)
    why, refs = "", dict[tuple, dict]()  # refs: fuel_gas's cache of reference gases
    per_edge = {a: flames_per_search(getattr(study, f"{a}s"), lim.tolerance[a], lim.max_flames_per_search)
                for a in searches}
    longest = 0
    for axis, swept in _search_points(study, lim.find):
        searches[axis] += 1
        assessed = _assessed(study, swept, crit, mixture, refs)
        if any(assessed):
            values = [p.blend_fraction if axis == "blend_fraction" else p.phi for p in swept]
            n = edges_possible(axis, values, assessed) * per_edge[axis] + (axis == "blend_fraction" and max(values) < 1.0)
            flames_at[swept[0].pressure_bar] += n
            longest = max(longest, n)
            continue
        idle[axis] += 1
        if not why and crit:  # every reason at the first point, the Reynolds number too
            off = _not_assessed(study, swept[0], mixture, refs, crit, every=True)
            why = "; ".join(f"{c}: {off[c]}" for c in crit)
    return LimitsPlan(searches, idle, dict(flames_at), longest, why)


def _search_points(study: Study, find: Sequence[str]) -> list[tuple[str, list[Point]]]:
    """(axis, its swept points in order along it) of every search the [limits] table starts."""
    out = []
    pts = points(study)
    for axis, col in (("blend_fraction", "blend_fraction"), ("equivalence_ratio", "phi")):
        if axis not in find:
            continue
        groups: defaultdict[tuple, list[Point]] = defaultdict(list)
        for p in pts:
            groups[tuple(getattr(p, a) for a in ("fuel", "oxidizer", "blend_fraction", "phi", "pressure_bar", "T_u")
                         if a != col)].append(p)
        out += [(axis, sorted(swept, key=lambda p: getattr(p, col))) for swept in groups.values()]
    return out
