"""Limit searches along one sweep axis: the largest admissible blend fraction, and the lean
and rich edges of the admissible equivalence-ratio window.

A point is admissible when every margin the [limits] table names is at or above the
burner's minimum (and, along the blend axis, the Wobbe index lies inside the band).
The searches work on the *limit function* of a flame row,

    g = min over criteria of ln(margin / required margin)      (>= 0: admissible),

whose sign change is the limit; the logarithm makes the power-law-like margins nearly
linear in the swept quantity, which suits the interpolation steps of Brent's method.
Each search brackets the sign change on the stored points of the sweep, then refines it
with :func:`brent.brent_steps`; it is a generator that yields the value (blend fraction
or equivalence ratio) it needs a flame at and is sent that flame's annotated row, so the
driver can solve the flames of many searches together on the run's backend.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable, Generator

from .brent import Bracket, brent_steps

#: criterion -> (margin column of the annotated row, the burner's minimum attribute).
CRITERIA = {
    "flashback": ("flashback_margin", "min_flashback_margin"),
    "blowoff": ("blowoff_margin", "min_blowoff_margin"),
    "stabilizer": ("stabilizer_margin", "min_stabilizer_margin"),
}
#: Binding words when no burner margin binds.
WOBBE = "Wobbe band"
NONE_IN_RANGE = "none in range"


def limit_value(row: dict, burner, criteria: tuple[str, ...]) -> tuple[float | None, str]:
    """(g, criterion giving it) of one annotated row: g = min ln(margin / required) over
    ``criteria`` (>= 0: admissible); (None, why) when the row has no burning flame.

    >>> from types import SimpleNamespace as NS
    >>> b = NS(min_flashback_margin=1.5, min_blowoff_margin=1.5)
    >>> g, which = limit_value({"status": "ok", "flashback_margin": 3.0, "blowoff_margin": 1.2}, b,
    ...                        ("flashback", "blowoff"))
    >>> round(g, 4), which
    (-0.2231, 'blowoff')
    """
    if row.get("status") != "ok":
        return None, f"{row.get('status')}: {row.get('message', '')}"
    best, which = math.inf, ""
    for c in criteria:
        col, attr = CRITERIA[c]
        m = row.get(col)
        if m is None or not m > 0:
            return None, f"no {col.replace('_', ' ')}"
        g = math.log(m / getattr(burner, attr))
        if g < best:
            best, which = g, c
    return best, which


@dataclass
class Found:
    """What one search ends with (the driver turns it into a limits.csv row)."""

    outcome: str                 # found | whole range | beyond swept range | none admissible | stopped
    value: float | None          # the limit: the admissible end of the final bracket
    binding: str                 # the criterion that fails just past the limit, WOBBE or NONE_IN_RANGE
    row: dict | None             # the flame row at ``value`` (None where the Wobbe band alone decides)
    bracket: tuple[float, float] | None = None   # (admissible end, failing end)
    evaluations: int = 0         # flames asked for by the search (stored ones count)
    converged: bool = True
    note: str = ""
    evaluated: list = field(default_factory=list)   # [(x, g or None)] of the flames the search asked for


def crossing(x_good: float, row_good: dict, x_bad: float, row_bad: dict, tol: float, max_flames: int,
             value: Callable[[dict], tuple[float | None, str]]) -> Generator[float, dict, Found]:
    """Refine a sign change of the limit function between an admissible ``x_good`` and a
    failing ``x_bad`` (either order) to a bracket at most ``tol`` wide. Yields x, is sent
    the flame row at x. A flame that does not burn or fails stops the search: the row
    keeps the bracket known so far and says why (never an interpolated number)."""
    g_good, _ = value(row_good)
    g_bad, why_bad = value(row_bad)
    rows = {x_good: row_good, x_bad: row_bad}
    seen: list = []
    gen = brent_steps(x_good, g_good, x_bad, g_bad, tol, max_flames)
    good, bad = x_good, x_bad
    try:
        x = next(gen)
        while True:
            row = yield x
            g, why = value(row)
            seen.append((x, g))
            if g is None:
                return Found("stopped", good, why_bad, rows[good], (good, bad), len(seen), False,
                             f"no burning flame at {x:.4g} ({why}): the limit lies between {good:.4g} and {bad:.4g}",
                             seen)
            rows[x] = row
            if g >= 0:
                good = x
            else:
                bad, why_bad = x, value(row)[1]
            x = gen.send(g)
    except StopIteration as stop:
        br: Bracket = stop.value
    binding = value(rows[br.bad])[1]
    note = "" if br.converged else (f"stopped after {max_flames} flames with the bracket "
                                    f"{br.width:.3g} wide (limits.max_flames_per_search)")
    return Found("found" if br.converged else "stopped", br.good, binding, rows[br.good],
                 (br.good, br.good if br.width == 0 else br.bad),
                 br.evaluations, br.converged, note, seen)


def blend_search(swept: list[tuple[float, dict]], x_wobbe: float, wobbe_side: str, tol: float, max_flames: int,
                 value: Callable[[dict], tuple[float | None, str]]) -> Generator[float, dict, Found]:
    """The largest admissible blend fraction of one condition.

    ``swept``: (blend fraction, annotated row) of the stored sweep at this condition;
    ``x_wobbe``: the largest fraction whose Wobbe index stays inside the band (1.0 when
    it never leaves it; the band needs no flame, so it bounds the bracket first);
    ``wobbe_side``: 'low' or 'high', the band edge it leaves by. Walks up from the lowest
    swept fraction to the first one that fails, then :func:`crossing` refines; when every
    swept fraction holds, the Wobbe bound (or 1.0) is tried with one flame.
    """
    cands = sorted((x, r) for x, r in swept if x <= x_wobbe + 1e-12)
    if not cands:
        return Found("none admissible", None, WOBBE, None,
                     note=f"every swept fraction lies outside the Wobbe band (it leaves it on the {wobbe_side} "
                          f"side at {x_wobbe:.4g})")
    # a blend that fails at the lowest fractions and holds higher up (hydrogen raising a lean
    # flame's blowoff margin) has a lower edge too: it is named in the note, from the sweep
    start = next((i for i, (x, r) in enumerate(cands) if (value(r)[0] or -1.0) >= 0), None)
    if start is None:
        g0, why0 = value(cands[0][1])
        return Found("none admissible", None, why0, cands[0][1],
                     note=f"{why0} margin below its minimum at every swept fraction up to {cands[-1][0]:.4g}"
                     if g0 is not None else f"no burning flame at {cands[0][0]:.4g} ({why0})")
    lower = ("" if start == 0 else f"needs more than {cands[start - 1][0]:.4g} ({value(cands[start - 1][1])[1]} "
             f"margin below its minimum there; admissible from {cands[start][0]:.4g} of the swept fractions); ")
    last_good = None
    for x, row in cands[start:]:
        g, why = value(row)
        if g is None:
            return Found("stopped", last_good[0], why, last_good[1], (last_good[0], x), 0, False,
                         lower + f"no burning flame at {x:.4g} ({why}): the limit lies between {last_good[0]:.4g} "
                         f"and {x:.4g}")
        if g < 0:
            found = yield from crossing(last_good[0], last_good[1], x, row, tol, max_flames, value)
            found.note = lower + found.note
            return found
        last_good = (x, row)
    x0, row0 = last_good
    top = min(x_wobbe, 1.0)
    binding = WOBBE if x_wobbe < 1.0 else NONE_IN_RANGE
    if top <= x0 + 1e-12:
        return Found("found" if binding == WOBBE else "whole range", x0, binding, row0, None, 0, True,
                     lower + _wobbe_note(x_wobbe, wobbe_side))
    row_top = yield top
    g, why = value(row_top)
    if g is None:
        return Found("stopped", x0, why, row0, (x0, top), 1, False,
                     lower + f"no burning flame at {top:.4g} ({why}): the limit lies between {x0:.4g} and {top:.4g}", [(top, None)])
    if g >= 0:
        return Found("found" if binding == WOBBE else "whole range", top, binding, row_top, None, 1, True,
                     lower + _wobbe_note(x_wobbe, wobbe_side), [(top, g)])
    found = yield from crossing(x0, row0, top, row_top, tol, max_flames - 1, value)
    found.note = lower + found.note
    found.evaluations += 1
    found.evaluated.insert(0, (top, g))
    return found


def _wobbe_note(x_wobbe: float, side: str) -> str:
    if x_wobbe >= 1.0:
        return "every margin holds up to the pure blend gas"
    return f"the Wobbe index leaves the band on the {side} side at {x_wobbe:.4g}"


def window_searches(swept: list[tuple[float, dict]], value: Callable[[dict], tuple[float | None, str]]
                    ) -> tuple[list[tuple[str, float, dict, float, dict]], list[Found], list[str]]:
    """Where the admissible equivalence-ratio window of one blend has its edges.

    Returns (pairs, ends, kinds): ``pairs`` are (edge kind, phi admissible, its row,
    phi failing, its row) for each neighbouring pair of swept points whose admissibility
    differs (lean edge: the leaner one fails; rich edge: the richer one fails), each to
    be refined by :func:`crossing`; ``ends`` are the edges that lie beyond the swept range
    (the leanest or richest swept point is admissible) or the finding that no swept point
    is admissible; ``kinds`` names each of ``ends``.
    """
    pts = sorted(swept, key=lambda t: t[0])
    gs = [(x, r, *value(r)) for x, r in pts]
    ok = [g is not None and g >= 0 for _, _, g, _ in gs]
    pairs, ends, kinds = [], [], []
    if not any(ok):
        nearest = max((t for t in gs if t[2] is not None), key=lambda t: t[2], default=None)  # closest to holding
        ends.append(Found("none admissible", None, nearest[3] if nearest else "no burning flame",
                          nearest[1] if nearest else None, note="no swept equivalence ratio keeps every margin"))
        kinds.append("lean edge")
        return pairs, ends, kinds
    if ok[0]:
        ends.append(Found("beyond swept range", gs[0][0], NONE_IN_RANGE, gs[0][1],
                          note=f"admissible at the leanest swept equivalence ratio {gs[0][0]:g}"))
        kinds.append("lean edge")
    for (xa, ra, ga, wa), (xb, rb, gb, wb), oka, okb in zip(gs, gs[1:], ok, ok[1:]):
        if oka == okb:
            continue
        kind = "rich edge" if oka else "lean edge"
        good, bad = ((xa, ra), (xb, rb)) if oka else ((xb, rb), (xa, ra))
        if (gb if oka else ga) is None:  # the failing side has no flame: no root to refine
            why = wb if oka else wa
            ends.append(Found("stopped", good[0], why, good[1], (good[0], bad[0]), 0, False,
                              f"no burning flame at {bad[0]:g} ({why}): the edge lies between {good[0]:g} and {bad[0]:g}"))
            kinds.append(kind)
        else:
            pairs.append((kind, good[0], good[1], bad[0], bad[1]))
    if ok[-1]:
        ends.append(Found("beyond swept range", gs[-1][0], NONE_IN_RANGE, gs[-1][1],
                          note=f"admissible at the richest swept equivalence ratio {gs[-1][0]:g}"))
        kinds.append("rich edge")
    return pairs, ends, kinds
