"""The labelled results table: results.nc against results.csv, open_results against the run,
the CLI against the Python pipeline (flamecharts.run) on the same study."""
import csv
import math

import numpy as np
import pytest
import xarray as xr

import flamecharts
from flamecharts.columns import AXES, COLUMNS, GAS_TABLE_COLUMNS, UNITS
from flamecharts.results import STUDY_WIDE

from conftest import run_cli, write_h2_study


@pytest.fixture(scope="module")
def finished(tmp_path_factory):
    """One small h2o2 study with two pressures and a no-flame point, run through the CLI."""
    folder = tmp_path_factory.mktemp("results")
    config = write_h2_study(folder, phis="[0.05, 0.7, 1.3]", pressures="[1.0, 2.0]")
    out = folder / "out"
    r = run_cli("run", config, "--out", out, "--jobs", "2", "--no-charts", "--quiet")
    assert r.returncode == 0, r.stderr
    return config, out


def _csv(path):
    with open(path, newline="") as fh:
        return list(csv.DictReader(fh))


def test_every_column_has_a_unit_and_a_meaning():
    assert set(COLUMNS) | set(GAS_TABLE_COLUMNS) | set(AXES) <= set(UNITS)
    assert all(long for _, long in UNITS.values())


def test_results_nc_holds_every_csv_value_with_units(finished):
    _, out = finished
    rows = _csv(out / "results.csv")
    ds = xr.open_dataset(out / "results.nc")
    assert tuple(ds.laminar_flame_speed_m_s.dims) == AXES
    assert ds.laminar_flame_speed_m_s.attrs["units"] == "m/s"
    assert ds.pressure_bar.attrs["units"] == "bar"
    assert "not certification" in ds.attrs["caution"]
    assert int(np.prod([ds.sizes[a] for a in AXES])) == len(rows) == 12
    for row in rows:
        at = ds.sel(fuel=row["fuel"], oxidizer=row["oxidizer"], blend_fraction=float(row["blend_fraction"]),
                    pressure_bar=float(row["pressure_bar"]),
                    unburned_temperature_K=float(row["unburned_temperature_K"]),
                    equivalence_ratio=float(row["equivalence_ratio"]))
        for col in COLUMNS:
            if col in AXES:
                continue
            text = row[col]
            if col in STUDY_WIDE:
                assert ds.attrs[col] == text, col
            elif UNITS[col][0] == "":
                assert str(at[col].values) == text, col
            elif text == "":
                assert math.isnan(float(at[col])), col
            else:  # the CSV prints 6 significant digits
                assert float(at[col]) == pytest.approx(float(text), rel=5e-6, abs=1e-300), col
    no_flame = ds.status.sel(equivalence_ratio=0.05)
    assert set(np.unique(no_flame.values)) <= {"no_flame", "failed"}
    assert np.isnan(ds.laminar_flame_speed_m_s.sel(equivalence_ratio=0.05)).all()


def test_results_csv_written_from_the_dataset_is_the_rows_table(finished, tmp_path):
    # results.csv is written from the Dataset (results.dataset_table), as results.nc is: the same
    # text as the rows give, string for string, a no-flame point included
    from flamecharts.outputs.tables import write_columns, write_csv
    from flamecharts.results import dataset_table

    res = flamecharts.open_results(finished[1])
    from_rows = write_csv(res.rows, tmp_path / "rows.csv").read_text()
    assert write_columns(dataset_table(res.dataset), tmp_path / "ds.csv").read_text() == from_rows
    assert (finished[1] / "results.csv").read_text() == from_rows


def test_open_results_gives_the_run_s_dataset(finished):
    config, out = finished
    opened = flamecharts.open_results(out)
    assert opened.dataset.identical(xr.open_dataset(out / "results.nc"))
    assert opened.counts()["ok"] == 8
    frame = opened.to_dataframe()
    assert list(frame.columns) == list(COLUMNS) and len(frame) == 12
    at5 = opened.dataset.laminar_flame_speed_m_s.sel(pressure_bar=2.0, blend_fraction=0.5).squeeze()
    assert at5.dims == ("equivalence_ratio",) and np.isfinite(at5.sel(equivalence_ratio=1.3))


def test_cli_and_python_run_write_the_same_files(finished, tmp_path):
    config, out_cli = finished
    out_py = tmp_path / "py"
    res = flamecharts.run(config, out=out_py, jobs=2, charts=False)
    assert res.summary.solved == 12 and res.files[0] == out_py / "results.csv"
    assert {p.name for p in res.files} == {"results.csv", "results.nc", "about.txt", "fuel_gases.csv",
                                           "power_law_exponents.csv"}
    for name in ("results.csv", "fuel_gases.csv", "power_law_exponents.csv"):
        a, b = _csv(out_cli / name), _csv(out_py / name)
        for ra, rb in zip(a, b, strict=True):
            ra.pop("solve_seconds", None), rb.pop("solve_seconds", None)
            assert ra == rb, name
    a, b = xr.open_dataset(out_cli / "results.nc"), xr.open_dataset(out_py / "results.nc")
    assert a.drop_vars("solve_seconds").identical(b.drop_vars("solve_seconds"))
    # a second run solves nothing and rewrites the same table
    again = flamecharts.run(config, out=out_py, jobs=1, charts=False)
    assert again.summary.solved == 0 and again.dataset.identical(res.dataset)
