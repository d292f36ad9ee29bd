"""The one list of charts: each declared once with its file name, caption and when it applies.

A chart is a function ``draw(data, study) -> matplotlib Figure`` registered with
:func:`chart`; ``data`` is a :class:`ChartData` (the rows of every point and the
fuel-gas table), so charts read results only and can be redrawn without solving.
To add a chart: write the function in the family module it belongs to, decorate it
with ``@chart(name, caption, when)``; draw_all and the report pick it up.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import Callable


@dataclass(frozen=True)
class ChartData:
    """What charts read: one row per point (columns.COLUMNS) and one per fuel gas (GAS_TABLE_COLUMNS)."""

    rows: list[dict]
    gases: list[dict]


@dataclass(frozen=True)
class Chart:
    name: str          # file name without extension
    draw: Callable     # (ChartData, Study) -> Figure
    caption: str       # one line on how to read it (the report prints it under the chart)
    when: Callable     # (ChartData, Study) -> bool: does this study's sweep support the chart?


#: Every chart, in the order the report shows them.
CHARTS: list[Chart] = []


def always(data: ChartData, study) -> bool:
    return True


def chart(name: str, caption: str, when: Callable = always):
    """Register the decorated ``draw(data, study)`` as chart ``name``."""
    def register(draw):
        CHARTS.append(Chart(name, draw, caption, when))
        return draw
    return register
