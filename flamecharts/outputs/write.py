"""Every output file of a run folder, written from the rows of a study (results.csv and results.nc
from its Dataset)."""
from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

import xarray as xr

from ..analyses import parts
from ..columns import (
    COMPARISON_COLUMNS,
    GAS_TABLE_COLUMNS,
    LIMIT_COLUMNS,
    SENSITIVITY_COLUMNS,
)
from ..config import by_mechanism
from ..design import fuel_gas_table, mechanism_differences
from ..results import (
    comparison_of,
    dataset_table,
    exponent_table,
    extra_tables,
    mechanism_dataset,
    rows_of,
    sensitivity_rows,
    to_dataset,
)
from .charts import CAPTIONS, draw_all
from .netcdf import write_netcdf
from .report import write_report
from .tables import write_about, write_columns, write_csv

if TYPE_CHECKING:
    from ..config import Study


def write_outputs(study: Study, rows: list[dict], out: Path, charts: bool = True, report: bool = True,
                  dataset: xr.Dataset | None = None, limits: list[dict] | None = None,
                  records: dict[str, list[dict]] | None = None) -> list[Path]:
    """results.csv, results.nc, about.txt, fuel_gases.csv, power_law_exponents.csv (when the study
    varies pressure or preheat), the charts (unless ``charts`` is False) and report.html
    (with the charts, unless ``report`` is False). ``dataset`` is results.to_dataset of the
    rows when the caller has it; ``limits`` the rows of limits.csv (studies with [limits]),
    ``records`` the analyses' record tables (file -> rows: stretch.csv with [stretch]);
    sensitivities.csv with [uncertainty]; the registered analyses' files (results.extra_tables:
    emissions.csv with [emissions]).

    A study comparing mechanisms writes every mechanism's rows to the tables; the design
    charts and the report's design sections read the reference (first) mechanism, and the
    comparison chart and section all of them. Returns the files written, results.csv first."""
    out = Path(out)
    gases = fuel_gas_table(study)
    ds = to_dataset(study, rows) if dataset is None else dataset
    limits, records = limits or [], records or {}
    files = [write_columns(dataset_table(ds), out / "results.csv"), write_netcdf(ds, out / "results.nc"),
             write_about(study, out / "about.txt"), write_csv(gases, out / "fuel_gases.csv", GAS_TABLE_COLUMNS)]
    exponents = exponent_table(ds)
    if exponents:
        files.append(write_csv(exponents, out / "power_law_exponents.csv", tuple(exponents[0])))
    if limits:
        files.append(write_csv(limits, out / "limits.csv", LIMIT_COLUMNS))
    files += [write_csv(records[name], out / name, columns) for name, columns in record_columns().items()
              if records.get(name)]
    for name, (extra, columns) in extra_tables(study, rows).items():  # the analyses' files (flamecharts.analyses)
        if extra:
            files.append(write_csv(extra, out / name, columns))
    sensitivities = sensitivity_rows(rows)
    if sensitivities:
        files.append(write_csv(sensitivities, out / "sensitivities.csv", SENSITIVITY_COLUMNS))
    if comparison := comparison_of(study, rows, limits):
        files.append(write_csv(mechanism_differences(rows, comparison.names), out / "mechanism_comparison.csv",
                               COMPARISON_COLUMNS))
    ref = by_mechanism(study)[0]
    ref_rows, ref_ds = rows_of(ref, rows), mechanism_dataset(ds)
    ref_limits, ref_records = rows_of(ref, limits), {name: rows_of(ref, r) for name, r in records.items()}
    if charts:
        files += draw_all(ref_rows, gases, ref, out, ref_ds, ref_limits, ref_records, comparison)
    remove_stale(out, files, charts)  # before the report, which embeds every chart it finds
    if charts and report:
        files.append(write_report(ref, ref_rows, out, gases, ref_ds, ref_limits, ref_records, comparison))
    return files


def record_columns() -> dict[str, tuple[str, ...]]:
    """The registered analyses' record tables (each ``columns`` part's RECORDS): file -> columns."""
    return {name: cols for m in parts("columns") for name, cols in getattr(m, "RECORDS", {}).items()}


#: Tables a run writes only when the study asks for them.
OPTIONAL_TABLES = ("power_law_exponents.csv", "limits.csv", *record_columns(), "sensitivities.csv",
                   "mechanism_comparison.csv", *(name for m in parts("columns") for name in m.TABLES))


def remove_stale(out: Path, written: list[Path], charts: bool) -> list[Path]:
    """Remove the optional tables and (when charts were drawn) the charts an earlier run of the
    folder wrote and this one did not: a study that no longer asks for them must not show
    them, nor its report embed them. Files flamecharts does not write are left alone.
    Returns the files removed."""
    keep = {Path(f).resolve() for f in written}
    candidates = [out / name for name in OPTIONAL_TABLES]
    if charts:
        candidates += [out / "charts" / f"{name}.{ext}" for name in CAPTIONS for ext in ("png", "svg")]
    removed = []
    for path in candidates:
        if path.is_file() and path.resolve() not in keep:
            path.unlink()
            removed.append(path)
    return removed
