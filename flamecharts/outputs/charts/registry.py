"""The one list of charts: each declared once with its file name, caption and when it applies.

A chart is a function ``draw(data, study) -> matplotlib Figure`` registered with
:func:`chart`; ``data`` is a :class:`ChartData` (the rows of every point and the
fuel-gas table), so charts read results only and can be redrawn without solving.
To add a chart: write the function in the family module it belongs to, decorate it
with ``@chart(name, caption, when)`` (``when`` one of the conditions below, or your
own); draw_all and the report pick it up, in the order the charts are registered.
"""
from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from functools import cached_property
from typing import TYPE_CHECKING, Any

import xarray as xr

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ...config import Study
    from ...results import Comparison

# ---- the rule for big studies: what one figure shows (docs/sweeps.md, "Charts of big studies")
#: Pressures, and preheats, a figure draws as panels or curves: lowest, middle, highest.
MAX_LEVELS = 3
#: Curves of one panel (fuel x oxidizer x blend fraction); blend fractions are thinned to fit,
#: keeping at least the first and the last.
MAX_CURVES = 12
#: Blend fractions drawn as curves, at most.
MAX_BLEND_CURVES = 6
#: Panels of one figure, at most.
MAX_PANELS = 9

#: Axis -> (name in a chart's note, unit)
_AXIS_WORDS = {"pressure_bar": ("pressures", "bar"), "unburned_temperature_K": ("preheats", "K"),
               "blend_fraction": ("blend fractions", ""), "equivalence_ratio": ("equivalence ratios", "")}


def spread(values: Iterable[Any], k: int) -> list:
    """At most ``k`` of ``values``, evenly spread over their order, first and last included.

    >>> spread([1, 2, 3, 4, 5, 6, 7, 8, 9, 10], 3)
    [1, 6, 10]
    >>> spread([1, 2], 3)
    [1, 2]
    """
    values = list(values)
    if len(values) <= k:
        return values
    if k <= 1:
        return values[:1]
    return [values[i] for i in sorted({int(j * (len(values) - 1) / (k - 1) + 0.5) for j in range(k)})]


def thinned_note(shown: dict[str, list], every: dict[str, list], also: tuple[str, ...] = ()) -> str:
    """One line naming the levels a chart leaves out ('' when it draws them all); ``also``:
    phrases of its own for what else it leaves out (e.g. '2 of 4 fuel/condition blocks'). Not
    wrapped here: style.title_text wraps it to the width the figure leaves beside its legend."""
    parts = [a for a in also if a]
    for axis, values in shown.items():
        if len(values) < len(every[axis]):
            name, unit = _AXIS_WORDS[axis]
            parts.append(f"{len(values)} of {len(every[axis])} {name} ({', '.join(f'{v:g}' for v in values)}"
                         f"{' ' + unit if unit else ''})")
    if not parts:
        return ""
    return "\nShown: " + "; ".join(parts) + "; every point is in results.csv and results.nc"


def conditions_note(drawn: list[tuple[float, float]], n_every: int) -> str:
    """One line naming the (pressure, preheat) conditions a chart draws when it leaves some out."""
    if len(drawn) >= n_every:
        return ""
    return thinned_note({}, {}, (f"{len(drawn)} of {n_every} conditions (p, T_u): "
                                 + ", ".join(f"{P:g} bar {T:g} K" for P, T in drawn),))


@dataclass(frozen=True)
class ChartData:
    """What charts read: one row per point (columns.COLUMNS), one per fuel gas
    (GAS_TABLE_COLUMNS), and the same points as the labelled table (results.to_dataset).

    Big studies: ``shown`` is the rule above applied to the study's axes, ``shown_rows``
    the rows at those levels, ``series`` the same rows grouped per curve and panel (one
    pass over the rows, so a chart of 100,000 points never filters them per curve)."""

    rows: list[dict]
    gases: list[dict]
    dataset: xr.Dataset
    limits: list[dict] = field(default_factory=list)  # limits.csv rows (LIMIT_COLUMNS)
    records: dict[str, list[dict]] = field(default_factory=dict)  # the analyses' record tables: file -> rows
    comparison: Comparison | None = None  # results.Comparison of a study comparing mechanisms (rows: the reference's)

    @cached_property
    def every(self) -> dict[str, list]:
        """Every level of the axes a figure may thin."""
        ds = self.dataset
        return {a: sorted(float(v) for v in ds[a].values) for a in _AXIS_WORDS}

    @cached_property
    def shown(self) -> dict[str, list]:
        """Levels a figure draws: MAX_LEVELS pressures and preheats, blend fractions to keep
        at most MAX_CURVES curves per panel (and MAX_BLEND_CURVES)."""
        ds = self.dataset
        fuel_ox = max(1, ds.sizes["fuel"] * ds.sizes["oxidizer"])
        return {"pressure_bar": spread(self.every["pressure_bar"], MAX_LEVELS),
                "unburned_temperature_K": spread(self.every["unburned_temperature_K"], MAX_LEVELS),
                "blend_fraction": spread(self.every["blend_fraction"],
                                         max(2, min(MAX_BLEND_CURVES, MAX_CURVES // fuel_ox)))}

    def note(self, *axes: str) -> str:
        """The line naming what the chart leaves out along ``axes`` (default: pressure, preheat, blend)."""
        axes = axes or ("pressure_bar", "unburned_temperature_K", "blend_fraction")
        return thinned_note({a: self.shown[a] for a in axes}, self.every)

    @cached_property
    def shown_rows(self) -> list[dict]:
        sets = {a: set(v) for a, v in self.shown.items()}
        return [r for r in self.rows if all(float(r[a]) in s for a, s in sets.items())]

    @cached_property
    def series(self) -> dict[tuple, list[dict]]:
        """(fuel, oxidizer, blend_with, blend_fraction, pressure_bar, unburned_temperature_K) ->
        the shown rows of that curve and panel, by equivalence ratio."""
        out: dict[tuple, list[dict]] = {}
        for r in self.shown_rows:
            out.setdefault((r["fuel"], r["oxidizer"], r["blend_with"], r["blend_fraction"], r["pressure_bar"],
                            r["unburned_temperature_K"]), []).append(r)
        return {k: sorted(v, key=lambda r: r["equivalence_ratio"]) for k, v in out.items()}


#: A chart's drawing function and its condition.
Draw = Callable[["ChartData", "Study"], "Figure"]
When = Callable[["ChartData", "Study"], bool]


@dataclass(frozen=True)
class Chart:
    name: str          # file name without extension
    draw: Draw
    caption: str       # one line on how to read it (the report prints it under the chart)
    when: When         # does this study's sweep support the chart?


#: Every chart, in the order the report shows them.
CHARTS: list[Chart] = []


# ---- conditions a chart may be drawn under ("when"), shared by every chart family
def always(data: ChartData, study: Study) -> bool:
    return True


def _burning(rows: list[dict]) -> list[dict]:
    return [r for r in rows if r["status"] == "ok"]


def any_flame(data: ChartData, study: Study) -> bool:
    """At least one point burns."""
    return bool(_burning(data.rows))


def varies_p_or_T(data: ChartData, study: Study) -> bool:
    ok = _burning(data.rows)
    return bool(ok) and (len({r["pressure_bar"] for r in ok}) > 1 or len({r["unburned_temperature_K"] for r in ok}) > 1)


def several_blends(data: ChartData, study: Study) -> bool:
    return study.blend_with is not None and len(study.blend_fractions) > 1


def burning_blends(data: ChartData, study: Study) -> bool:
    return several_blends(data, study) and bool(_burning(data.rows))


def has_margins(data: ChartData, study: Study) -> bool:
    return study.burner is not None and any(r["flashback_margin"] is not None for r in data.rows)


def has_window(data: ChartData, study: Study) -> bool:
    return has_margins(data, study) and several_blends(data, study) and len(study.equivalence_ratios) > 1


#: Why a chart whose condition depends on the sweep's shape was not drawn (the report lists
#: them; charts of tables the study did not ask for, [stretch] say, are not listed).
SHAPE_WHY = {
    "any_flame": "no point of the study burns",
    "varies_p_or_T": "it needs flames at two or more pressures or preheats",
    "several_blends": "it needs a blend axis with two or more fractions",
    "burning_blends": "it needs a blend axis with two or more fractions and a burning flame",
    "has_margins": "it needs a [burner] and a point with a flashback margin",
    "has_window": "it maps two axes, so it needs a [burner] with margins, two or more blend fractions and "
                  "two or more equivalence ratios",
    # regime_charts.has_core_margins: listed only where its sibling was drawn (a premixer study)
    "has_core_margins": "it needs a blend axis with two or more fractions (turbulent_flame_speed_vs_phi shows the "
                        "turbulent flame speeds and the core-flow flashback margin against phi)",
}

#: A condition of SHAPE_WHY that also holds for studies without the table its chart reads ([premixer]):
#: its chart is listed as not drawn only where the named chart was drawn (the study has that table).
SHAPE_WHY_BESIDE = {"has_core_margins": "turbulent_flame_speed_vs_phi"}


def not_drawn(drawn: set[str]) -> list[tuple[str, str]]:
    """(chart name, why) of the charts missing from ``drawn`` because of the sweep's shape."""
    return [(c.name, SHAPE_WHY[c.when.__name__]) for c in CHARTS
            if c.name not in drawn and c.when.__name__ in SHAPE_WHY
            and SHAPE_WHY_BESIDE.get(c.when.__name__, c.name) in drawn | {c.name}]


def chart(name: str, caption: str, when: When = always, after: str | None = None) -> Callable[[Draw], Draw]:
    """Register the decorated ``draw(data, study)`` as chart ``name``: last, or right after the
    chart named ``after`` (registered before it: an analysis's chart that belongs beside a
    family of the core's, in the report's order)."""
    def register(draw: Draw) -> Draw:
        at = next((i + 1 for i, c in enumerate(CHARTS) if c.name == after), len(CHARTS))
        CHARTS.insert(at, Chart(name, draw, caption, when))
        return draw
    return register
