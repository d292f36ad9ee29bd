"""Admissible windows along one sweep axis (blend fraction or equivalence ratio), both edges.

A point is admissible when every margin the [limits] criteria name is at or above the
burner's minimum. The searches work on the *limit function* of a flame row,

    g = min over criteria c of g_c,   g_c = ln(margin_c / required margin_c)   (>= 0: admissible),

whose sign changes are the edges of the admissible windows; the logarithm makes the
power-law-like margins nearly linear in the swept quantity, which suits Brent's method.

One search covers one condition (every other axis fixed). It classifies the stored swept
points, then works on every interval between neighbours at once:

- admissible on one side only: an edge, refined by Brent's root finding on g
  (:func:`crossing`);
- failing on both sides by *different* criteria (blowoff below, flashback above): g may
  have a positive maximum inside, where the two limiting margins cross. The crossing is a
  root of g_a - g_b (Brent again); a flame there that keeps every margin opens a window
  whose two edges are then refined; otherwise the interval reports its closest miss;
- failing on both sides by the *same* criterion: that criterion's log-margin could only
  rise above both ends inside the interval if its maximum along the axis lies there. The
  burner margins are monotone functions of S_L^2/alpha_u (critical velocity gradients,
  Lewis & von Elbe 1987), which is monotone in hydrogen fraction and has a single maximum
  in phi, so each g_c is quasi-concave or quasi-convex along either axis: a maximum
  inside an interval can only sit next to the swept point where g_c is largest. Those
  intervals get a bounded maximisation (Brent's minimiser on -g, :func:`brent.maximum_steps`);
  the others cannot hold a window and cost no flame (a premixer's core-flow flashback and
  extinction-strain blowout margins, on turbulent flame speeds and on kappa_ext interpolated
  between ladder points, rise and fall at most once too: docs/premixers.md);
- a criterion that holds at both ends of an interval may still fail inside it if its margin
  is quasi-convex (the flashback margin along phi is lowest where the flame is fastest), but
  only next to the swept point where that margin is lowest. Before the intervals are worked
  on, a bounded minimisation of that margin there looks for a flame that breaks it; such a
  flame is added to the points, splitting its interval. The search is left out where the
  parabola through the three swept values nearest the lowest keeps the margin DIP_HEADROOM
  above its minimum (S_L is smooth, its peak in phi parabolic);
- admissible on both sides otherwise: admissible throughout.

Every search is a generator that yields the list of axis values it needs flames at and
is sent their annotated rows in the same order, so the driver can solve the flames of
all searches (and of all intervals of one search) together on the run's backend.
"""
from __future__ import annotations

import math
from collections.abc import Callable, Generator
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, overload

import numpy as np

from .brent import Bracket, brent_steps, maximum_steps

if TYPE_CHECKING:
    from ..config import Burner

#: criterion -> (margin column of the annotated row, the burner's minimum attribute). The last two
#: are a premixer's (design.turbulent_speed_columns, design.blowout_columns): the bulk velocity over
#: the largest turbulent flame speed, and Da_ext = kappa_ext d / U_edge over its critical value, both
#: against the minima the premixer's verdict uses (design.PREMIXER_CRITERIA).
CRITERIA = {
    "flashback": ("flashback_margin", "min_flashback_margin"),
    "blowoff": ("blowoff_margin", "min_blowoff_margin"),
    "stabilizer": ("stabilizer_margin", "min_stabilizer_margin"),
    "core_flashback": ("core_flashback_margin", "min_flashback_margin"),
    "extinction_blowout": ("extinction_blowout_margin", "min_stabilizer_margin"),
}
#: Criteria whose reason for not being assessed a row keeps under another name (the premixer's
#: verdict's, design.premixer_unassessed); the others under their own.
ASSESSED_AS = {"core_flashback": "core-flow flashback", "extinction_blowout": "blowout"}


def unassessed_reason(row: dict, criterion: str) -> str | None:
    """Why ``criterion`` is not assessed at an annotated row (design.not_assessed,
    design.premixer_unassessed), or None where it is.

    >>> unassessed_reason({"not_assessed": {"blowout": "no ladder at this gas"}}, "extinction_blowout")
    'no ladder at this gas'
    """
    return (row.get("not_assessed") or {}).get(ASSESSED_AS.get(criterion, criterion))


#: The closed-form criterion of the blend axis: the fuel gas's Wobbe index inside the band.
WOBBE = "Wobbe band"

# How an edge of a window was settled.
FOUND = "found"            # refined by root finding to the tolerance (a flame criterion binds past it)
WOBBE_EDGE = "Wobbe band"  # where the Wobbe index leaves the band (closed form, to 1e-6)
SWEPT_END = "swept end"    # admissible at the first or last swept value: the window may reach further
RANGE_END = "range end"    # admissible at the end of the axis itself (blend fraction 0 or 1)
STOPPED = "stopped"        # no burning flame inside the bracket, or the flame budget ran out

#: Per-criterion log-margins of a row: ({criterion: g_c}, '') or (None, why it has none).
Parts = Callable[[dict], tuple["dict[str, float] | None", str]]
#: What binds past an edge beyond which the mixture does not burn, and the limit function
#: given there to the root finder (any clearly failing value: the step is then bisection-like).
NO_FLAME = "no flame"
NO_FLAME_G = -5.0


#: Statuses that make a mixture inadmissible whatever the margins: what binds there.
NOT_FLAMES = {"no_flame": NO_FLAME, "autoignition": "autoignition"}


#: What binds past an edge beyond which no criterion of the search is assessed (physics.validity).
NOT_ASSESSED = "not assessed"
#: The log-margin a criterion that is not assessed at a point stands at in the searches: holds by
#: far (e^10 times its minimum), so that only the criteria assessed there bind, and an edge
#: where a failing criterion leaves its range is found like any other (root finding steps to
#: the end of the range; limits.csv names the criteria not assessed).
UNASSESSED_G = 10.0


def burning_or_not(parts: Parts) -> Parts:
    """``parts`` that counts a mixture without a flame (status no_flame: too lean, rich or
    diluted to burn; or autoignition: it ignites before a flame can cross it), or a flame
    that no criterion of the search is assessed for, as failing, so that an edge toward it
    can be refined like any other; a flame that failed to solve still has no value."""
    def counted(r: dict) -> tuple[dict[str, float] | None, str]:
        if r.get("status") in NOT_FLAMES:
            return {NOT_FLAMES[r["status"]]: NO_FLAME_G}, ""
        P, why = parts(r)
        return ({NOT_ASSESSED: NO_FLAME_G}, "") if P is None and why.startswith(NOT_ASSESSED) else (P, why)
    return counted


def refinable(row: dict, why: str) -> bool:
    """Whether an edge toward ``row``, which has no value (``why``: the reason :func:`limit_parts`
    gave), can be refined: it does not burn, autoignites, or burns but no criterion of the
    search is assessed there."""
    return row.get("status") in NOT_FLAMES or why.startswith(NOT_ASSESSED)


def limit_parts(row: dict, burner: Burner, criteria: tuple[str, ...]) -> tuple[dict[str, float] | None, str]:
    """g_c = ln(margin_c / required_c) of every criterion of one annotated row; UNASSESSED_G for
    a criterion not assessed there (row key ``not_assessed``, design.not_assessed); (None, why)
    when the row has no burning flame, lacks a margin, or has no criterion assessed (why
    starts NOT_ASSESSED).

    >>> from types import SimpleNamespace as NS
    >>> b = NS(min_flashback_margin=1.5, min_blowoff_margin=1.5)
    >>> parts, _ = limit_parts({"status": "ok", "flashback_margin": 3.0, "blowoff_margin": 1.2}, b,
    ...                        ("flashback", "blowoff"))
    >>> {c: round(g, 4) for c, g in parts.items()}
    {'flashback': 0.6931, 'blowoff': -0.2231}
    >>> limit_parts({"status": "ok", "flashback_margin": 3.0, "blowoff_margin": None,
    ...              "not_assessed": {"blowoff": "rich (phi 1.2 > 1)"}}, b, ("flashback", "blowoff"))[0]
    {'flashback': 0.6931471805599453, 'blowoff': 10.0}
    >>> limit_parts({"status": "ok", "blowoff_margin": None, "not_assessed": {"blowoff": "rich (phi 1.2 > 1)"}},
    ...             b, ("blowoff",))
    (None, 'not assessed: blowoff (rich (phi 1.2 > 1))')
    """
    if row.get("status") != "ok":
        return None, f"{row.get('status')}: {row.get('message', '')}"
    out: dict[str, float] = {}
    skipped = {c: why for c in criteria if (why := unassessed_reason(row, c)) is not None}
    for c in criteria:
        if c in skipped:
            out[c] = UNASSESSED_G
            continue
        col, attr = CRITERIA[c]
        m = row.get(col)
        if m is None or not m > 0:
            return None, f"no {col.replace('_', ' ')}"
        out[c] = math.log(m / getattr(burner, attr))
    if all(c in skipped for c in criteria):
        return None, f"{NOT_ASSESSED}: " + "; ".join(f"{c} ({skipped[c]})" for c in criteria)
    return out, ""


@overload
def lowest(parts: dict[str, float], why: str = "") -> tuple[float, str]: ...
@overload
def lowest(parts: dict[str, float] | None, why: str = "") -> tuple[float | None, str]: ...
def lowest(parts: dict[str, float] | None, why: str = "") -> tuple[float | None, str]:
    """(g, the criterion giving it) from per-criterion log-margins; (None, why) without them."""
    if parts is None:
        return None, why
    c = min(parts, key=parts.__getitem__)
    return parts[c], c


def limit_value(row: dict, burner: Burner, criteria: tuple[str, ...]) -> tuple[float | None, str]:
    """(g, criterion giving it) of one annotated row (>= 0: admissible); (None, why) without a flame.

    >>> from types import SimpleNamespace as NS
    >>> b = NS(min_flashback_margin=1.5, min_blowoff_margin=1.5)
    >>> g, which = limit_value({"status": "ok", "flashback_margin": 3.0, "blowoff_margin": 1.2}, b,
    ...                        ("flashback", "blowoff"))
    >>> round(g, 4), which
    (-0.2231, 'blowoff')
    """
    return lowest(*limit_parts(row, burner, criteria))


@dataclass
class Edge:
    """One edge of an admissible window."""

    value: float                 # the admissible end of the final bracket
    kind: str                    # FOUND, WOBBE_EDGE, SWEPT_END, RANGE_END or STOPPED
    binding: str = ""            # the criterion failing just past the edge ('' at a swept or range end)
    row: dict | None = None      # the flame row at ``value`` (None at a Wobbe edge)
    failing: float | None = None  # the failing end of the final bracket
    note: str = ""
    evaluated: list[tuple[float, float | None]] = field(default_factory=list)   # of the flames asked for: (x, g or None)


@dataclass
class Miss:
    """The best point of an interval (or a whole search) that keeps no window: where g is largest."""

    at: float
    g: float
    binding: str
    row: dict


@dataclass
class Window:
    lower: Edge
    upper: Edge
    flame: Window | None = None   # the window of the flame criteria alone that holds it (blend axis)


@dataclass
class Answer:
    """What one search ends with: its windows (lean/low to rich/high), or the closest miss."""

    windows: list[Window]
    miss: Miss | None                        # the best point searched, where no window was found
    misses: list[tuple[float, float, Miss]]  # (a, b, best) of failing intervals searched without a window
    failures: list[tuple[float, str]]        # (swept value, criterion or reason) of every swept point that fails
    evaluated: list = field(default_factory=list)
    stopped: list[str] = field(default_factory=list)  # notes of intervals that could not be settled
    flame_windows: list[Window] = field(default_factory=list)  # before the Wobbe band (blend axis)
    first: float | None = None                                  # the ends of the values searched
    last: float | None = None
    values: list[tuple[float, float | None, str]] = field(default_factory=list)  # (x, g, binding) swept and ends
    skipped: list[tuple[float, float]] = field(default_factory=list)  # failing intervals not searched (outside)


# ---- one interval ---------------------------------------------------------------------------------------
def crossing(x_good: float, row_good: dict, x_bad: float, row_bad: dict, tol: float, max_flames: int,
             parts: Parts) -> Generator[float, dict, Edge]:
    """Refine a sign change of g between an admissible ``x_good`` and a failing ``x_bad``
    (either order) to a bracket at most ``tol`` wide. Yields x, is sent the flame row at x.
    A flame that does not burn stops the search: the edge keeps the bracket known so far and
    says why (never an interpolated number)."""
    def value(r: dict) -> tuple[float | None, str]:
        return lowest(*parts(r))
    g_good, _ = value(row_good)
    g_bad, why_bad = value(row_bad)
    assert g_good is not None and g_bad is not None  # the caller classified both ends by their values
    rows = {x_good: row_good, x_bad: row_bad}
    seen: list[tuple[float, float | None]] = []
    # g exactly 0 at the good end (on the other edge of a narrow window) must not end the search there
    gen = brent_steps(x_good, max(g_good, 1e-300), x_bad, g_bad, tol, max_flames)
    good, bad = x_good, x_bad
    try:
        x = next(gen)
        while True:
            row = yield x
            g, why = value(row)
            seen.append((x, g))
            if g is None:
                return Edge(good, STOPPED, why_bad, rows[good], bad,
                            f"no burning flame at {x:.4g} ({why}): the edge lies between {good:.4g} and {bad:.4g}", seen)
            rows[x] = row
            if g >= 0:
                good = x
            else:
                bad, why_bad = x, why
            x = gen.send(g)
    except StopIteration as stop:
        br: Bracket = stop.value
    binding = value(rows[br.bad])[1]
    if not br.converged:
        return Edge(br.good, STOPPED, binding, rows[br.good], br.bad,
                    f"stopped after {max_flames} flames with the bracket {br.width:.3g} wide "
                    "(limits.max_flames_per_search)", seen)
    return Edge(br.good, FOUND, binding, rows[br.good], br.good if br.width == 0 else br.bad, "", seen)


@dataclass
class _Interval:
    """What the search of one interval between two failing swept points found."""

    window: Window | None = None
    miss: Miss | None = None
    note: str = ""
    evaluated: list = field(default_factory=list)


def _walk(gen: Generator[float, float, object], a: float, b: float, parts: Parts, found: Callable[[dict[str, float]], bool],
          to_send: Callable[[dict[str, float]], float]) -> Generator[float, dict, tuple]:
    """Walk an x-proposing generator (a root or extremum finder over (a, b)), one flame per
    step, until a flame's log-margins satisfy ``found``. Returns ((x, row) of that flame or
    None, [(x, g, binding, row)] of every flame asked for, note: why it stopped early)."""
    seen: list = []
    try:
        x = next(gen)
        while True:
            row = yield x
            P, why = parts(row)
            g, c = lowest(P, why)
            seen.append((x, g, c, row))
            if P is None:
                gen.close()
                return None, seen, f"no burning flame at {x:.4g} ({why}) between {a:.4g} and {b:.4g}"
            if found(P):
                gen.close()
                return (x, row), seen, ""
            x = gen.send(to_send(P))
    except StopIteration:
        return None, seen, ""


def _probe(gen: Generator[float, float, object], xa: float, ra: dict, xb: float, rb: dict, parts: Parts,
           to_send: Callable[[dict[str, float]], float]) -> Generator[float, dict, tuple]:
    """Walk a finder between two failing points until a flame keeps every margin. Returns
    (x_ok, row_ok, best Miss, evaluated, note)."""
    hit, seen, note = yield from _walk(gen, xa, xb, parts, lambda P: lowest(P)[0] >= 0, to_send)
    ends = [_miss(x, r, parts) for x, r in ((xa, ra), (xb, rb))]
    best = max(ends + [Miss(x, g, c, r) for x, g, c, r in seen if g is not None], key=lambda m: m.g)
    x_ok, row_ok = hit if hit is not None else (None, None)
    return x_ok, row_ok, best, [(x, g) for x, g, _, _ in seen], note


def _miss(x: float, row: dict, parts: Parts) -> Miss:
    """The :class:`Miss` of a failing flame (one with a value)."""
    g, c = lowest(*parts(row))
    assert g is not None  # a failing end of an interval has a value
    return Miss(x, g, c, row)


def _just_inside(x_end: float, a: float, b: float, tol: float) -> float:
    """The value a tolerance inside the end ``x_end`` (a or b) of the interval (a, b), and no
    further than its middle: where one flame tells whether a margin still rises or falls inward.

    >>> _just_inside(0.0, 0.0, 0.3, 0.005), _just_inside(0.3, 0.0, 0.3, 0.005)
    (0.005, 0.295)
    """
    step = min(tol, 0.5 * (b - a))
    return x_end + step if x_end == a else x_end - step


def interior(xa: float, ra: dict, xb: float, rb: dict, tol: float, max_flames: int,
             parts: Parts, end: str = "") -> Generator[float, dict, _Interval]:
    """Look for a window strictly between two swept points that both fail.

    Different criteria fail at the two ends: the crossing of their log-margins (a root of
    g_a - g_b, where min(g_a, g_b) peaks); the same criterion: a bounded maximisation of g.
    If a flame there keeps every margin, both edges are refined by :func:`crossing`.

    ``end`` ('a' or 'b'): the same criterion is at its best of the whole search at that end
    of the interval, the first or last value searched. One flame ``tol`` inside it settles
    whether the criterion still rises inward: if it falls, a quasi-concave margin has no
    maximum in the rest of the interval (it would hold at least the end's value on the way
    back), so the interval holds no window wider than the tolerance."""
    Pa, Pb = parts(ra)[0], parts(rb)[0]
    assert Pa is not None and Pb is not None  # both ends fail: they have margins
    ca, cb = lowest(Pa)[1], lowest(Pb)[1]
    seen: list = []
    x_ok = None
    if end and ca == cb:
        P_end, x_in = (Pa, _just_inside(xa, xa, xb, tol)) if end == "a" else (Pb, _just_inside(xb, xa, xb, tol))
        row = yield x_in
        P, why = parts(row)
        g, c = lowest(P, why)
        seen.append((x_in, g))
        if P is None or g is None:  # together: no burning flame
            return _Interval(note=f"no burning flame at {x_in:.4g} ({why}) between {xa:.4g} and {xb:.4g}",
                             evaluated=seen)
        if g >= 0:
            x_ok, row_ok = x_in, row
        elif P[ca] < P_end[ca]:
            best = max([Miss(xa, Pa[ca], ca, ra), Miss(xb, Pb[cb], cb, rb), Miss(x_in, g, c, row)],
                       key=lambda m: m.g)
            return _Interval(miss=best, evaluated=seen)
    if ca != cb:
        ha, hb = Pa[ca] - Pa[cb], Pb[ca] - Pb[cb]
        if (ha >= 0) != (hb >= 0):
            gen: Generator[float, float, object] = brent_steps(xa, ha, xb, hb, tol, max_flames)
            x_ok, row_ok, best, seen, note = yield from _probe(gen, xa, ra, xb, rb, parts,
                                                               lambda P: P[ca] - P[cb])
            if note:
                return _Interval(miss=best, note=note, evaluated=seen)
            if x_ok is None and best.binding in (ca, cb):
                return _Interval(miss=best, evaluated=seen)
            # a third criterion binds at the crossing: the maximum of g may lie elsewhere
    if x_ok is None:
        gen = maximum_steps(xa, xb, tol, max_flames)
        x_ok, row_ok, best, more, note = yield from _probe(gen, xa, ra, xb, rb, parts, lambda P: lowest(P)[0])
        seen += more
        if x_ok is None:
            return _Interval(miss=best, note=note, evaluated=seen)
    lower = yield from crossing(x_ok, row_ok, xa, ra, tol, max_flames, parts)
    upper = yield from crossing(x_ok, row_ok, xb, rb, tol, max_flames, parts)
    return _Interval(window=Window(lower, upper), evaluated=seen + lower.evaluated + upper.evaluated)


#: A margin whose parabola through the three swept values nearest its lowest keeps it at
#: least this factor above its minimum is not searched for a dip between them (common
#: practice without source: between swept points S_L^2/alpha_u departs from that parabola by
#: a few per cent, far less than 25 %).
DIP_HEADROOM = 1.25


def parabola_low(xs: list[float], ys: list[float], lo: float, hi: float) -> float:
    """The lowest value over [lo, hi] of the parabola through three points (x, y).

    >>> round(parabola_low([0.9, 1.0, 1.1], [0.3, 0.1, 0.2], 0.9, 1.1), 4)
    0.0958
    """
    a, b, c = (float(v) for v in np.polyfit(xs, ys, 2))
    cands = [lo, hi] + ([-b / (2 * a)] if a > 0 and lo < -b / (2 * a) < hi else [])
    return min(a * x * x + b * x + c for x in cands)


def dip_spans(pts: list[tuple[float, dict]], Ps: list) -> list[tuple[str, float, float, tuple | None]]:
    """(criterion, a, b, end): where a criterion that holds at every swept point next to its
    lowest swept value may dip below its minimum in between (see the module docstring); left
    out where the parabola through the three swept values nearest the lowest keeps
    DIP_HEADROOM. ``end``: (x, log-margin) of the lowest value where it lies at the first or
    last value searched (then :func:`dip_search` first asks one flame just inside it), else None.

    >>> P = [{"flashback": 0.9}, {"flashback": 0.1}, {"flashback": 0.8}]
    >>> dip_spans([(0.9, {}), (1.0, {}), (1.1, {})], [(p, "") for p in P])
    [('flashback', 0.9, 1.1, None)]
    """
    out = []
    for c in sorted({c for P, _ in Ps if P is not None for c in P}):
        vals = [(j, P[c]) for j, (P, _) in enumerate(Ps) if P is not None]
        k, g_k = min(vals, key=lambda t: t[1])
        if g_k < 0:
            continue  # it fails at a swept point: the intervals around it are searched anyway
        span = [j for j in (k - 1, k, k + 1) if 0 <= j < len(pts) and Ps[j][0] is not None]
        if len(span) < 2:
            continue
        low = min(Ps[j][0][c] for j in span)  # two burning points: the straight line between them
        if len(vals) >= 3:
            near = sorted(sorted(vals, key=lambda t: abs(t[0] - k))[:3])
            low = parabola_low([pts[j][0] for j, _ in near], [g for _, g in near], pts[span[0]][0], pts[span[-1]][0])
        if low < math.log(DIP_HEADROOM):
            out.append((c, pts[span[0]][0], pts[span[-1]][0], (pts[k][0], g_k) if k in (0, len(pts) - 1) else None))
    return out


def dip_search(a: float, b: float, criterion: str, tol: float, max_flames: int, parts: Parts,
               end: tuple[float, float] | None = None) -> Generator[float, dict, tuple]:
    """Brent's bounded minimisation of ``criterion``'s log-margin over (a, b), stopped at the
    first flame where it fails. Returns ((x, row) of that flame or None, evaluated, note).

    ``end``: (a or b, the log-margin there), where the margin is lowest of all. One flame a
    tolerance inside settles most cases: if the margin is higher there, a quasi-convex margin
    cannot dip below its value at the end further in (it would have to come back up through
    that flame's value), so the interval holds no failing stretch wider than the tolerance."""
    seen: list = []
    if end is not None:
        x_end, g_end = end
        x_in = _just_inside(x_end, a, b, tol)
        row = yield x_in
        P, why = parts(row)
        seen.append((x_in, lowest(P, why)[0]))
        if P is None:
            return None, seen, f"no burning flame at {x_in:.4g} ({why}) between {a:.4g} and {b:.4g}"
        if P[criterion] < 0:
            return (x_in, row), seen, ""
        if P[criterion] > g_end:
            return None, seen, ""
    gen = maximum_steps(a, b, tol, max_flames)   # the maximum of -g_c
    hit, walked, note = yield from _walk(gen, a, b, parts, lambda P: P[criterion] < 0, lambda P: -P[criterion])
    return hit, seen + [(x, g) for x, g, _, _ in walked], note


def _best_at(gs: list[dict[str, float] | None], criterion: str) -> int | None:
    """Index of the swept point where ``criterion``'s log-margin is largest (None: nowhere known)."""
    vals = [(j, P[criterion]) for j, P in enumerate(gs) if P is not None and criterion in P]
    return max(vals, key=lambda t: t[1])[0] if vals else None


def _end_of_peak(i: int, gs: list[dict[str, float] | None], criterion: str) -> str:
    """'a' or 'b' when ``criterion`` is largest at the first or last value searched and that is
    an end of the interval (i, i+1); '' otherwise (see :func:`interior`)."""
    k = _best_at(gs, criterion)
    return "a" if k == i == 0 else "b" if k == i + 1 == len(gs) - 1 else ""


def may_peak_inside(i: int, gs: list[dict[str, float] | None], criterion: str) -> bool:
    """Whether ``criterion``'s log-margin can rise above both ends of the interval (i, i+1):
    only next to the swept point where it is largest, given that each margin is quasi-concave
    or quasi-convex along the axis (see the module docstring).

    >>> gs = [{"blowoff": -1.0}, {"blowoff": -0.5}, {"blowoff": -0.2}, {"blowoff": -0.4}]
    >>> [may_peak_inside(i, gs, "blowoff") for i in range(3)]
    [False, True, True]
    """
    return _best_at(gs, criterion) in (i, i + 1)


# ---- one search -----------------------------------------------------------------------------------------
def lockstep(gens: list[Generator[float, dict, Any]]) -> Generator[list[float], list[dict], list]:
    """Run several one-flame-at-a-time generators side by side: yield the list of their
    open requests, be sent the rows in the same order; return their results in order."""
    results: list = [None] * len(gens)
    asks: dict[int, float] = {}
    for i, g in enumerate(gens):
        try:
            asks[i] = next(g)
        except StopIteration as stop:
            results[i] = stop.value
    while asks:
        order = list(asks)
        rows = yield [asks[i] for i in order]
        for i, row in zip(order, rows):
            try:
                asks[i] = gens[i].send(row)
            except StopIteration as stop:
                results[i] = stop.value
                del asks[i]
    return results


def window_search(swept: list[tuple[float, dict]], parts: Parts, tol: float, max_flames: int,
                  axis_range: tuple[float, float] | None = None,
                  look_inside: list[tuple[float, float]] | None = None) -> Generator[list[float], list[dict], Answer]:
    """Every admissible window of one condition along one axis, both edges refined.

    ``swept``: (axis value, annotated row) of the stored sweep at this condition;
    ``axis_range``: the ends of the axis itself (blend fraction (0, 1)), or None (phi: the
    window may reach beyond the swept range). An end of the axis that was not swept (the
    pure blend gas) is asked for first, one flame, and searched like the swept points.
    ``look_inside``: where a window can count (the Wobbe band's intervals): an interval
    between two failing points that lies wholly outside them is not searched for a window
    (it is named in the answer); edges are refined everywhere.
    """
    pts = sorted(swept, key=lambda t: t[0])
    ends = [] if axis_range is None else [x for x in axis_range if all(abs(x - p) > 1e-12 for p, _ in pts)]
    if ends:  # the axis goes beyond the swept values: its ends are part of the answer
        rows = yield ends
        pts = sorted(pts + list(zip(ends, rows)), key=lambda t: t[0])
    Ps = [parts(r) for _, r in pts]
    extra = [(x, lowest(*parts(r))[0]) for x, r in zip(ends, rows)] if ends else []
    dips = dip_spans(pts, Ps)
    found = yield from lockstep([dip_search(a, b, c, tol, max_flames, parts, end) for c, a, b, end in dips])
    extra += [e for _, seen, _ in found for e in seen]
    dip_notes = [note for _, _, note in found if note]
    inserted = sorted({hit[0]: hit for hit, _, _ in found if hit is not None}.values(), key=lambda t: t[0])
    if inserted:  # failing flames between admissible points split their intervals
        pts = sorted(pts + inserted, key=lambda t: t[0])
        Ps = [parts(r) for _, r in pts]
    gs = [lowest(*P) for P in Ps]
    logs = [P for P, _ in Ps]
    state = ["none" if g is None else "ok" if g >= 0 else "fail" for g, _ in gs]
    tasks: dict[int, Generator[float, dict, Any]] = {}
    skipped: list[tuple[float, float]] = []
    for i in range(len(pts) - 1):
        (xa, ra), (xb, rb) = pts[i], pts[i + 1]
        pair = (state[i], state[i + 1])
        if pair == ("ok", "fail"):
            tasks[i] = crossing(xa, ra, xb, rb, tol, max_flames, parts)
        elif pair == ("fail", "ok"):
            tasks[i] = crossing(xb, rb, xa, ra, tol, max_flames, parts)
        elif pair == ("ok", "none") and refinable(rb, gs[i + 1][1]):
            tasks[i] = crossing(xa, ra, xb, rb, tol, max_flames, burning_or_not(parts))
        elif pair == ("none", "ok") and refinable(ra, gs[i][1]):
            tasks[i] = crossing(xb, rb, xa, ra, tol, max_flames, burning_or_not(parts))
        elif pair == ("fail", "fail") and (gs[i][1] != gs[i + 1][1] or may_peak_inside(i, logs, gs[i][1])):
            if look_inside is not None and not any(xa <= b1 and xb >= b0 for b0, b1 in look_inside):
                skipped.append((xa, xb))
                continue
            tasks[i] = interior(xa, ra, xb, rb, tol, max_flames, parts, _end_of_peak(i, logs, gs[i][1]))
    done = yield from lockstep(list(tasks.values()))
    answer = assemble(pts, gs, state, dict(zip(tasks, done)), axis_range, extra)
    answer.skipped = skipped
    answer.stopped += dip_notes
    inside = {x for x, _ in inserted}
    answer.failures = [(x, c) for x, c in answer.failures if x not in inside]
    return answer


def _end(x: float, row: dict, axis_range: tuple[float, float] | None) -> Edge:
    at_end = axis_range is not None and min(abs(x - axis_range[0]), abs(x - axis_range[1])) < 1e-12
    return Edge(x, RANGE_END if at_end else SWEPT_END, "", row)


def assemble(pts: list[tuple[float, dict]], gs: list[tuple[float | None, str]], state: list[str],
             done: dict[int, Edge | _Interval], axis_range: tuple[float, float] | None, extra: list) -> Answer:
    """The windows of one search from its classified points and the results of its intervals."""
    windows: list[Window] = []
    misses: list[tuple[float, float, Miss]] = []
    stopped: list[str] = []
    evaluated = list(extra)
    lower: Edge | None = _end(*pts[0], axis_range) if state[0] == "ok" else None
    for i in range(len(pts) - 1):
        (xa, ra), (xb, rb) = pts[i], pts[i + 1]
        res = done.get(i)
        if res is not None:
            evaluated += res.evaluated
        pair = (state[i], state[i + 1])
        if pair == ("ok", "fail"):
            assert lower is not None and isinstance(res, Edge)  # an admissible stretch ends at a crossing
            windows.append(Window(lower, res))
            lower = None
        elif pair == ("fail", "ok"):
            assert isinstance(res, Edge)
            lower = res
        elif pair == ("ok", "none"):
            assert lower is not None and (res is None or isinstance(res, Edge))
            windows.append(Window(lower, res if res is not None else Edge(
                xa, STOPPED, gs[i + 1][1], ra, xb,
                f"no burning flame at {xb:.4g} ({gs[i + 1][1]}): the edge lies between {xa:.4g} and {xb:.4g}")))
            lower = None
        elif pair == ("none", "ok"):
            assert res is None or isinstance(res, Edge)
            lower = res if res is not None else Edge(
                xb, STOPPED, gs[i][1], rb, xa,
                f"no burning flame at {xa:.4g} ({gs[i][1]}): the edge lies between {xa:.4g} and {xb:.4g}")
        elif res is not None:  # an interior search between two failing points
            assert isinstance(res, _Interval)
            if res.window is not None:
                windows.append(res.window)
            elif res.miss is not None:
                misses.append((xa, xb, res.miss))
            if res.note:
                stopped.append(res.note)
    if lower is not None:
        windows.append(Window(lower, _end(*pts[-1], axis_range)))
    for w in windows:
        stopped += [e.note for e in (w.lower, w.upper) if e.kind == STOPPED and e.note]
    burning = [(x, g, c, r) for (x, r), (g, c) in zip(pts, gs) if g is not None]
    miss = None
    if not windows:
        cands = [m for _, _, m in misses] + [Miss(x, g, c, r) for x, g, c, r in burning]
        miss = max(cands, key=lambda m: m.g, default=None)
    failures = [(x, c) for (x, _), (g, c) in zip(pts, gs) if g is None or g < 0]
    return Answer(windows, miss, misses, failures, evaluated, stopped, first=pts[0][0], last=pts[-1][0],
                  values=[(x, g, c) for (x, _), (g, c) in zip(pts, gs)])


# ---- the Wobbe band as a criterion of the blend axis -----------------------------------------------------
def apply_band(a: Answer, band: list[tuple[float, float]]) -> None:
    """Make the Wobbe band a criterion of the answer of a blend search: its windows cut to the
    band (the flame windows kept apart), and swept values that keep every flame margin but lie
    outside the band counted as failing by it."""
    a.flame_windows = a.windows
    a.windows = within_band(a.windows, band)
    outside = [(x, WOBBE) for x, g, _ in a.values if g is not None and g >= 0 and not inside(x, band)]
    a.failures = sorted(a.failures + outside)


def band_at(a: Answer, band: list[tuple[float, float]], x: float) -> None:
    """Make the Wobbe band a criterion of a phi search of the blend at fraction ``x``: a blend
    outside the band has no admissible phi, whatever its flames allow (kept apart)."""
    if inside(x, band):
        return
    a.flame_windows, a.windows = a.windows, []
    a.failures = sorted(a.failures + [(v, WOBBE) for v, g, _ in a.values if g is not None and g >= 0])


def inside(x: float, band: list[tuple[float, float]]) -> bool:
    """Whether blend fraction ``x`` lies in one of the band's intervals."""
    return any(b0 - 1e-12 <= x <= b1 + 1e-12 for b0, b1 in band)


def within_band(windows: list[Window], band: list[tuple[float, float]]) -> list[Window]:
    """The parts of flame windows that also lie inside the Wobbe band intervals; an edge the
    band sets is a WOBBE_EDGE. Each result keeps the flame window it came from.

    >>> e = lambda x, k=FOUND: Edge(x, k, "flashback")
    >>> [(w.lower.value, w.upper.value, w.upper.kind) for w in within_band([Window(e(0.0, RANGE_END), e(0.6))],
    ...                                                                    [(0.0, 0.404)])]
    [(0.0, 0.404, 'Wobbe band')]
    """
    out = []
    for w in windows:
        lo, hi = w.lower.value, w.upper.value
        if lo is None or hi is None:
            continue
        for b0, b1 in band:
            a, b = max(lo, b0), min(hi, b1)
            if a > b:
                continue
            lower = w.lower if lo >= b0 else Edge(b0, WOBBE_EDGE, WOBBE)
            upper = w.upper if hi <= b1 else Edge(b1, WOBBE_EDGE, WOBBE)
            out.append(Window(lower, upper, flame=w))
    return out
