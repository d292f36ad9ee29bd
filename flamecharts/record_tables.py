"""Record tables of a study (one row per limit search, per analysis solve) as labelled xarray Datasets.

limits.csv holds one row per limit search; :class:`~flamecharts.results.Results` gives it as a
Dataset beside the points' (``Results.dataset``): ``Results.limits_dataset`` over a ``search``
dimension. An analysis's record table (stretch.csv, say) is made into a Dataset by its own
``dataset`` part with :func:`table_dataset`. Units and long names come from columns.UNITS, as in
results.nc; numbers are float64 with NaN where empty, text is str.
"""
from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import xarray as xr

from .columns import CAUTION, LIMIT_COLUMNS, UNITS


def column_attrs(col: str) -> dict[str, str]:
    """A variable's ``units`` (where it has one) and ``long_name``, from columns.UNITS."""
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
    data = {c: (dim, _column([r.get(c) for r in rows], c), column_attrs(c)) for c in columns}
    ds = xr.Dataset(data, coords={dim: np.arange(len(rows))})
    ds.attrs["caution"] = CAUTION
    return ds


def limits_dataset(rows: Sequence[dict]) -> xr.Dataset:
    """limits.csv's rows (columns.LIMIT_COLUMNS) over the dimension ``search``."""
    return table_dataset(rows, LIMIT_COLUMNS, "search")
