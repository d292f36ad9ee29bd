"""[stretch]'s read side: stretch.csv's rows as a Dataset over (``ladder``, ``strain_step``).

ACCESSORS are the public names ``Results`` and ``RunSummary`` give its record table
(results.RecordAccess): ``.stretch`` (stretch.csv's rows), ``.ladders_dataset`` and, on a
``RunSummary``, ``.stretch_ladders`` (the ladders solved in that run).
"""
from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np
import xarray as xr

from ...record_tables import column_attrs, table_dataset
from .columns import STRETCH_COLUMNS

#: stretch.csv columns that hold one value per burning step of a ladder (space-separated there).
LADDER_STEPS = ("strain_rates_1_s", "consumption_speeds_m_s")
#: The record table's file (columns.RECORDS).
FILE = "stretch.csv"


def _steps(value: Sequence[float] | str | None) -> list[float]:
    """A ladder's steps: a list as the run gives it, or stretch.csv's space-separated text."""
    if isinstance(value, str):
        return [float(v) for v in value.split()]
    return [float(v) for v in (value or [])]


def ladders_dataset(rows: Sequence[dict]) -> xr.Dataset:
    """stretch.csv's rows over ``ladder``; each ladder's strain rates [1/s] and consumption speeds
    [m/s] over (``ladder``, ``strain_step``), NaN past its last burning step."""
    ds = table_dataset(rows, [c for c in STRETCH_COLUMNS if c not in LADDER_STEPS], "ladder")
    steps = {c: [_steps(r.get(c)) for r in rows] for c in LADDER_STEPS}
    n = max((len(s) for s in steps[LADDER_STEPS[0]]), default=0)
    for c, per_ladder in steps.items():
        arr = np.full((len(rows), n), np.nan)
        for i, s in enumerate(per_ladder):
            arr[i, :len(s)] = s
        ds[c] = (("ladder", "strain_step"), arr, column_attrs(c))
    return ds.assign_coords(strain_step=np.arange(n))


def stretch(results: Any) -> list[dict]:
    """stretch.csv's rows, one per strained-flame ladder ([] without [stretch])."""
    return results.records.get(FILE, [])


def ladders(results: Any) -> xr.Dataset:
    """stretch.csv as a Dataset over ``ladder``, each ladder's strain rates and consumption
    speeds over (``ladder``, ``strain_step``), NaN past its last burning step (empty without
    [stretch])."""
    return ladders_dataset(stretch(results))


def solved_ladders(results: Any) -> int:
    """Strained-flame ladders solved in the run (a RunSummary's; 0 for results read from a folder)."""
    return getattr(results, "records_solved", {}).get(FILE, 0)


#: Public names of the record table on Results and RunSummary: name -> function of the object.
ACCESSORS = {"stretch": stretch, "ladders_dataset": ladders, "stretch_ladders": solved_ladders}
