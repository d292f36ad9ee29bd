"""[emissions] from the study file to the outputs: the table's checks, the extra solve, the read-out.

The burned-gas history and the conventions are checked against their sources in
tests/test_emissions_core.py; here: the study's table is refused where it cannot work, the
burned gas is integrated once per burning flame and stored apart from it (other residence
times never solve the sweep again; another reference O2 integrates nothing), and the columns,
emissions.csv, results.nc, charts, report and run lines carry it.
"""
from __future__ import annotations

import math

import pytest
import xarray as xr

import flamecharts
from flamecharts.analyses.emissions.solve import emissions_key
from flamecharts.analyses.emissions.table import of
from flamecharts.config import study_from_toml
from flamecharts.errors import ConfigError
from flamecharts.store import Store
from flamecharts.sweep.points import point_at_phi, points

from conftest import run_cli, write_h2_study

STUDY = """
title = "Emissions test: an invented pipeline gas with hydrogen"
mechanism = "gri30.yaml"
resolution = "coarse"

[fuels]
pipeline = {{ CH4 = 0.92, C2H6 = 0.05, N2 = 0.02, CO2 = 0.01 }}
hydrogen = {{ H2 = 1.0 }}

[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}

[sweep]
fuel = ["pipeline"]
oxidizer = ["air"]
blend = {{ with = "hydrogen", fraction = [0.0, 0.3] }}
equivalence_ratio = [0.7, 0.9]
pressure_bar = [1.0]
unburned_temperature_K = [300.0]

[emissions]
{emissions}
"""


def _study(tmp_path, emissions: str = "residence_times_ms = [5, 20, 50]"):
    path = tmp_path / "em.toml"
    path.write_text(STUDY.format(emissions=emissions))
    return path


@pytest.mark.parametrize("emissions, message", [
    ("residence_times_ms = [0, 20]", "residence_times_ms' must list 1 to 12 times above 0"),
    ("residence_times_ms = [5, 20]\ndesign_residence_time_ms = 10", "one of residence_times_ms (5, 20)"),
    ("reference_oxygen_percent = 21", "reference_oxygen_percent' is 21; allowed: 0 to below 20.9"),
    ("heating_value = \"upper\"", "'emissions.heating_value' is 'upper'"),
    ("specific = 1", "'emissions.specific' must be true or false"),
    ("equal_flame_temperature = \"yes\"", "'emissions.equal_flame_temperature' must be true or false"),
    ("minutes = 3", "unknown key 'emissions.minutes'"),
])
def test_the_table_names_the_offending_key(tmp_path, emissions, message):
    with pytest.raises(ConfigError, match=message.replace("(", r"\(").replace(")", r"\)")):
        flamecharts.load_study(_study(tmp_path, emissions))


def test_a_mechanism_without_nitrogen_chemistry_is_refused_naming_one_that_has_it(tmp_path):
    with pytest.raises(ConfigError, match="h2o2.yaml has no nitrogen chemistry; use e.g. gri30.yaml"):
        flamecharts.load_study(write_h2_study(tmp_path, extra="[emissions]\n"))


def test_emissions_without_stored_profiles_is_refused(tmp_path):
    path = _study(tmp_path)
    path.write_text("keep_profiles = false\n" + path.read_text())
    with pytest.raises(ConfigError, match="keep_profiles = false stores none"):
        flamecharts.load_study(path)


def test_defaults_and_the_design_time():
    em = of(study_from_toml(STUDY.format(emissions="")))
    assert em is not None and em.residence_times_s == (0.002, 0.005, 0.01, 0.02, 0.05)
    assert em.design_residence_time_s == 0.02 and em.reference_oxygen_percent == 15.0 and em.heating_value == "gross"
    em = of(study_from_toml(STUDY.format(emissions="residence_times_ms = [30, 5]")))
    assert em is not None and em.residence_times_s == (0.005, 0.03) and em.design_residence_time_s == 0.03


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("emissions")
    res = flamecharts.run(_study(folder), out=folder / "out", jobs=2)
    return folder, res


@pytest.mark.slow
def test_nox_of_every_burning_flame_in_every_output(run):
    folder, res = run
    out = folder / "out"
    ok = [r for r in res.rows if r["status"] == "ok"]
    assert len(ok) == 4 and all(r["nox_ppmvd_at_reference_o2"] > 0 and r["emissions_note"] == "" for r in ok)
    by = {(r["blend_fraction"], r["equivalence_ratio"]): r for r in ok}
    # hydrogen raises the flame temperature at equal phi, and with it thermal NO (common practice,
    # from memory: the reason blends are compared at equal flame temperature as well)
    for phi in (0.7, 0.9):
        assert by[(0.3, phi)]["adiabatic_flame_temperature_K"] > by[(0.0, phi)]["adiabatic_flame_temperature_K"]
        assert by[(0.3, phi)]["nox_ppmvd_at_reference_o2"] > by[(0.0, phi)]["nox_ppmvd_at_reference_o2"]
    # thermal NO grows with residence time in the hot burned gas, and stays below equilibrium
    hot = by[(0.0, 0.9)]["emissions_by_time"]
    assert [e["residence_time_ms"] for e in hot] == [5.0, 20.0, 50.0]
    assert hot[0]["nox_ppmvd_at_reference_o2"] < hot[1]["nox_ppmvd_at_reference_o2"] < hot[2]["nox_ppmvd_at_reference_o2"]
    assert hot[2]["nox_ppmvd_at_reference_o2"] < by[(0.0, 0.9)]["equilibrium_no_ppmvd_at_reference_o2"]
    assert by[(0.0, 0.9)]["emissions_residence_time_ms"] == 20.0
    assert all(r["emissions_reference_o2_percent"] == 15.0 and r["emissions_heating_value"] == "gross" for r in ok)
    # the adiabatic plug flow keeps its gas at flame temperature: its CO levels off at the hot gas's
    # equilibrium CO (a property of the model, which the report states), far above a cooled flue gas's
    assert hot[2]["co_ppmvd_at_reference_o2"] == pytest.approx(by[(0.0, 0.9)]["equilibrium_co_ppmvd_at_reference_o2"],
                                                               rel=0.1)
    # hydrogen in the hot gas is equilibrium H2, not fuel left: unburned hydrocarbons only
    assert by[(0.3, 0.9)]["unburned_hydrocarbons_ppmvd_at_reference_o2"] < 1.0
    # at the unblended gas's flame temperature the blend burns leaner, and its NOx falls back close to the
    # unblended gas's (thermal NO follows the flame temperature; common practice, from memory)
    study = res.study
    for phi in (0.7, 0.9):
        b, a = by[(0.3, phi)], by[(0.0, phi)]
        assert b["equal_flame_temperature_equivalence_ratio"] < phi
        assert b["nox_ppmvd_at_reference_o2_equal_flame_temperature"] < b["nox_ppmvd_at_reference_o2"]
        assert b["nox_ppmvd_at_reference_o2_equal_flame_temperature"] == pytest.approx(
            a["nox_ppmvd_at_reference_o2"], rel=0.15)
        # the matched flame, solved by the flame solver, ends at the reference's HP equilibrium temperature
        p = next(q for q in points(study) if q.blend_fraction == 0.3 and q.phi == phi)
        matched = point_at_phi(study, p, b["equal_flame_temperature_equivalence_ratio"])
        with Store(out / "results.db", readonly=True) as store:
            m = store.rows([matched.key])[matched.key]["metrics"]
        assert m["equilibrium_temperature_K"] == pytest.approx(a["equilibrium_temperature_K"], abs=1.0)
    assert (out / "emissions.csv").read_text().count("\n") == 1 + 4 * 3
    with xr.open_dataset(out / "results.nc") as ds:
        var = ds["nox_ppmvd_at_reference_o2_by_time"]
        assert var.dims[-1] == "residence_time_ms" and var.attrs["units"] == "ppm"
        assert var.attrs["reference_oxygen_percent"] == 15.0 and ds["nox_mg_kwh"].attrs["units"] == "mg/kWh"
    for chart in ("nox_vs_equivalence_ratio", "nox_vs_blend_fraction", "co_burnout"):
        assert (out / "charts" / f"{chart}.png").stat().st_size > 15_000, chart
    html = (out / "report.html").read_text()
    assert "id='emissions'" in html and "With 30 % hydrogen in pipeline at 1 bar and 300 K, NOx at 15 % O2" in html
    assert "GRI-Mech 3.0&#x27;s nitrogen chemistry" in html
    assert "Highest NOx after 20 ms (dry, 15 % O2)" in html  # a key number of the design review


@pytest.mark.slow
def test_other_times_and_references_never_solve_the_sweep_again(run, tmp_path):
    folder, res = run
    study_path = folder / "em.toml"
    before = {(r["blend_fraction"], r["equivalence_ratio"]): r for r in res.rows if r["status"] == "ok"}
    # another reference O2 and basis: read-out only, nothing integrated (the stored history is the same)
    study_path.write_text(STUDY.format(emissions="residence_times_ms = [5, 20, 50]\nreference_oxygen_percent = 3.0\n"
                                                 "heating_value = \"net\""))
    again = flamecharts.run(study_path, out=folder / "out", jobs=1, charts=False, report=False)
    assert again.summary.solved == 0
    for r in again.rows:
        if r["status"] != "ok":
            continue
        b = before[(r["blend_fraction"], r["equivalence_ratio"])]
        o2 = b["burned_gas_dry_o2_percent"]
        # the reference-O2 correction (20.9 - ref) / (20.9 - O2) taken back and forth (US EPA Method 19's form)
        assert r["nox_ppmvd_at_reference_o2"] == pytest.approx(
            b["nox_ppmvd_at_reference_o2"] * (20.9 - 3.0) / (20.9 - 15.0), rel=1e-9)
        assert o2 == pytest.approx(r["burned_gas_dry_o2_percent"], rel=1e-12)
        # a mass per heat input does not change with dilution; net basis: larger by the ratio of heating values
        ratio = r["higher_heating_value_MJ_m3"] / r["lower_heating_value_MJ_m3"]
        assert r["nox_mg_kwh"] == pytest.approx(b["nox_mg_kwh"] * ratio, rel=1e-9)
    # other residence times: the burned gas integrated again, no flame solved
    study_path.write_text(STUDY.format(emissions="residence_times_ms = [10, 20]"))
    third = flamecharts.run(study_path, out=folder / "out", jobs=1, charts=False, report=False)
    assert third.summary.solved == 0
    study = third.study
    with Store(folder / "out" / "results.db", readonly=True) as store:
        stored = store.rows([emissions_key(study, p) for p in points(study)])
    assert len(stored) == 4 and all(r["metrics"]["times_s"] == [0.01, 0.02] for r in stored.values())
    r = next(r for r in third.rows if r["status"] == "ok" and r["equivalence_ratio"] == 0.9 and r["blend_fraction"] == 0)
    assert r["nox_ppmvd_at_reference_o2"] == pytest.approx(before[(0.0, 0.9)]["nox_ppmvd_at_reference_o2"], rel=1e-9)
    assert not math.isnan(r["co_mg_kwh"])


@pytest.mark.slow
def test_run_prints_the_emissions_and_check_estimates_them(run, tmp_path):
    folder, _ = run
    study_path = _study(tmp_path)
    done = run_cli("check", study_path, "--out", folder / "out")
    assert done.returncode == 0, done.stderr
    assert "Emissions: the burned gas of each burning point after 3 residence time(s) up to 50 ms" in done.stdout
    done = run_cli("run", study_path, "--out", folder / "out", "--jobs", "1", "--no-charts")
    assert done.returncode == 0, done.stderr
    assert "Emissions after 20 ms (dry, at 15 % O2" in done.stdout
    assert "With 30 % hydrogen in pipeline at 1 bar and 300 K, NOx at 15 % O2 (dry) after 20 ms rises from" in done.stdout
    assert "at the unblended gas's flame temperature, " in done.stdout
