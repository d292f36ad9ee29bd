"""The one list of charts: each declared once with its file name, caption and when it applies.

A chart is a function ``draw(data, study) -> matplotlib Figure`` registered with
:func:`chart`; ``data`` is a :class:`ChartData` (the rows of every point and the
fuel-gas table), so charts read results only and can be redrawn without solving.
To add a chart: write the function in the family module it belongs to, decorate it
with ``@chart(name, caption, when)`` (``when`` one of the conditions below, or your
own); draw_all and the report pick it up, in the order the charts are registered.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Callable

import xarray as xr


@dataclass(frozen=True)
class ChartData:
    """What charts read: one row per point (columns.COLUMNS), one per fuel gas
    (GAS_TABLE_COLUMNS), and the same points as the labelled table (results.to_dataset)."""

    rows: list[dict]
    gases: list[dict]
    dataset: xr.Dataset
    limits: list[dict] = field(default_factory=list)  # limits.csv rows (LIMIT_COLUMNS)


@dataclass(frozen=True)
class Chart:
    name: str          # file name without extension
    draw: Callable     # (ChartData, Study) -> Figure
    caption: str       # one line on how to read it (the report prints it under the chart)
    when: Callable     # (ChartData, Study) -> bool: does this study's sweep support the chart?


#: Every chart, in the order the report shows them.
CHARTS: list[Chart] = []


# ---- conditions a chart may be drawn under ("when"), shared by every chart family
def always(data: ChartData, study) -> bool:
    return True


def _burning(rows: list[dict]) -> list[dict]:
    return [r for r in rows if r["status"] == "ok"]


def any_flame(data: ChartData, study) -> bool:
    """At least one point burns."""
    return bool(_burning(data.rows))


def varies_p_or_T(data, study) -> bool:
    ok = _burning(data.rows)
    return bool(ok) and (len({r["pressure_bar"] for r in ok}) > 1 or len({r["unburned_temperature_K"] for r in ok}) > 1)


def several_blends(data, study) -> bool:
    return study.blend_with is not None and len(study.blend_fractions) > 1


def burning_blends(data, study) -> bool:
    return several_blends(data, study) and bool(_burning(data.rows))


def has_margins(data, study) -> bool:
    return study.burner is not None and any(r["flashback_margin"] is not None for r in data.rows)


def has_window(data, study) -> bool:
    return has_margins(data, study) and several_blends(data, study) and len(study.equivalence_ratios) > 1


def chart(name: str, caption: str, when: Callable = always):
    """Register the decorated ``draw(data, study)`` as chart ``name``."""
    def register(draw):
        CHARTS.append(Chart(name, draw, caption, when))
        return draw
    return register
