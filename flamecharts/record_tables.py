"""The limits and the strained-flame ladders of a study as labelled xarray Datasets.

limits.csv and stretch.csv hold one row per limit search and per ladder; :class:`~flamecharts.results.Results`
gives them as Datasets beside the points' (``Results.dataset``): ``Results.limits_dataset``
over a ``search`` dimension, ``Results.ladders_dataset`` over ``ladder`` and, for the steps of
each ladder, ``strain_step`` (NaN past a ladder's last burning step). Units and long names come
from columns.UNITS, as in results.nc; numbers are float64 with NaN where empty, text is str.
"""
from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import xarray as xr

from .columns import CAUTION, LIMIT_COLUMNS, STRETCH_COLUMNS, UNITS

#: stretch.csv columns that hold one value per burning step of a ladder (space-separated there).
LADDER_STEPS = ("strain_rates_1_s", "consumption_speeds_m_s")


def _attrs(col: str) -> dict[str, str]:
    unit, long_name = UNITS[col]
    return {"units": unit, "long_name": long_name} if unit else {"long_name": long_name}


def _column(values: list, col: str) -> np.ndarray:
    """One column as str (text: UNITS' unit is "") or float64 with NaN for None; flags as in the CSVs."""
    if UNITS[col][0] == "":
        return np.array(["" if v is None else ("true" if v is True else "false" if v is False else str(v))
                         for v in values], dtype=str)
    return np.array([np.nan if v is None or v == "" else float(v) for v in values], dtype=float)


def table_dataset(rows: Sequence[dict], columns: Sequence[str], dim: str) -> xr.Dataset:
    """``rows`` as a Dataset over one dimension ``dim`` (0..n-1), a variable per column."""
    data = {c: (dim, _column([r.get(c) for r in rows], c), _attrs(c)) for c in columns}
    ds = xr.Dataset(data, coords={dim: np.arange(len(rows))})
    ds.attrs["caution"] = CAUTION
    return ds


def _steps(value: Sequence[float] | str | None) -> list[float]:
    """A ladder's steps: a list as the run gives it, or stretch.csv's space-separated text."""
    if isinstance(value, str):
        return [float(v) for v in value.split()]
    return [float(v) for v in (value or [])]


def limits_dataset(rows: Sequence[dict]) -> xr.Dataset:
    """limits.csv's rows (columns.LIMIT_COLUMNS) over the dimension ``search``."""
    return table_dataset(rows, LIMIT_COLUMNS, "search")


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
        ds[c] = (("ladder", "strain_step"), arr, _attrs(c))
    return ds.assign_coords(strain_step=np.arange(n))
