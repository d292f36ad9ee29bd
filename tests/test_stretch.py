"""Strained flames ([stretch]): twin counterflow ladders to extinction, stored, charted, reported.

Checks against outside facts: an unstrained flame's consumption speed is its S_L (energy
balance); the sign of the measured Markstein number follows the Lewis number of the
deficient reactant (negative for lean hydrogen-air, positive rich: Law, Combustion Physics
2006, ch. 10, from memory) and agrees with the theoretical one; extinction strain rates of
hydrogen-air peak near stoichiometric and fall to the lean side (Law & Sung 2000, counterflow
extinction of hydrogen-air, from memory). h2o2.yaml throughout; GRI-Mech 3.0 methane in the
benchmark (tests/benchmarks/stretch_validation.py: the methane extinction check).
"""
import numpy as np
import pytest

from flamecharts import load_study
from flamecharts.analyses.strain_ladders.solve import stretch_key, stretch_points
from flamecharts.pipeline import open_results, run, solve_study
from flamecharts.sweep.points import points

from conftest import run_cli, write_h2_study

STRETCH = "\n[flame_response]\n\n[stretch]\nequivalence_ratio = [0.5, 1.0, 2.0]\n"
#: The fixture's study is also a premixer (its leading-point flame speed reads the ladders): a
#: 20 mm duct at 30 m/s. Neither table changes a flame or a ladder.
PREMIXER = ('\n[premixer]\nresidence_time_ms = 2.0\n\n[burner]\nname = "test tube"\nport = "round"\n'
            'port_diameter_mm = 20.0\nport_velocity_m_s = 30.0\n')


@pytest.fixture(scope="module")
def ladders(tmp_path_factory):
    folder = tmp_path_factory.mktemp("stretch")
    config = write_h2_study(folder, fractions="[1.0]", phis="[0.5, 1.0, 2.0]")
    config.write_text(config.read_text() + STRETCH + PREMIXER)
    res = run(config, out=folder / "o", jobs=2)
    return load_study(config), res, folder


def _by_phi(rows):
    return {r["equivalence_ratio"]: r for r in rows}


def test_every_ladder_burns_then_goes_out(ladders):
    _, res, _ = ladders
    rows = _by_phi(res.stretch)
    assert set(rows) == {0.5, 1.0, 2.0}
    for r in rows.values():
        assert r["status"] == "ok", r["message"]
        K = r["strain_rates_1_s"]
        assert len(K) >= 4 and K == sorted(K)  # a ladder up in strain
        assert r["extinction_strain_rate_1_s"] == pytest.approx(K[-1], rel=1e-5)
        assert r["extinguished_above_1_s"] <= 1.03 * r["extinction_strain_rate_1_s"]  # bracket within ~2 %


def test_consumption_speed_tends_to_the_free_flame_speed_without_strain(ladders):
    """Energy balance: heat released over the heat the fresh mixture carries = S_L for an
    unstrained adiabatic flame. The two weakest steps, extrapolated linearly to K = 0, land
    within 4 % of the free flame's S_L where the response is nearly linear (phi 1: 3.3 %,
    phi 2: 0.2 %, measured)."""
    _, res, _ = ladders
    for phi in (1.0, 2.0):
        r = _by_phi(res.stretch)[phi]
        K, S = np.array(r["strain_rates_1_s"][:2]), np.array(r["consumption_speeds_m_s"][:2])
        S0 = S[0] - K[0] * (S[1] - S[0]) / (K[1] - K[0])
        assert S0 == pytest.approx(r["laminar_flame_speed_m_s"], rel=0.04)


def test_markstein_numbers_measured_and_theoretical_agree_in_sign_and_trend(ladders):
    """In the hydrodynamic theory the consumption speed responds to stretch through the
    thermodiffusive term alone (Matalon, Cui & Bechtold 2003; from memory), so the measured
    (consumption-speed) Markstein number has the sign of Le_eff - 1; both it and the theoretical
    unburned-gas number rise from lean to rich."""
    _, res, _ = ladders
    rows = _by_phi(res.stretch)
    assert rows[0.5]["markstein_number_strain"] < 0 < rows[1.0]["markstein_number_strain"]
    assert rows[2.0]["markstein_number_strain"] > 0
    for r in rows.values():
        assert np.sign(r["markstein_number_strain"]) == np.sign(r["effective_lewis_number"] - 1.0)
    for col in ("markstein_number_strain", "markstein_number_unburned"):
        assert rows[0.5][col] < rows[1.0][col] < rows[2.0][col]


def test_extinction_strain_peaks_near_stoichiometric(ladders):
    _, res, _ = ladders
    rows = _by_phi(res.stretch)
    assert rows[1.0]["extinction_strain_rate_1_s"] > 1.5 * rows[0.5]["extinction_strain_rate_1_s"]
    assert rows[1.0]["extinction_strain_rate_1_s"] > rows[2.0]["extinction_strain_rate_1_s"]


def test_a_changed_flame_response_request_keeps_the_ladders(ladders, tmp_path):
    """The Zeldovich flames are extra flames of a point: asking for other ones re-solves
    neither the points nor the ladders."""
    study, res, folder = ladders
    config = folder / "h2rig.toml"
    config.write_text(config.read_text().replace("[flame_response]\n", "[flame_response]\ninert_step = 0.01\n"))
    again = solve_study(load_study(config), folder / "o", jobs=2)
    assert again.stretch_ladders == 0 and again.solved == 0
    assert [r["extinction_strain_rate_1_s"] for r in again.stretch] == [
        r["extinction_strain_rate_1_s"] for r in res.stretch]
    config.write_text(config.read_text().replace("inert_step = 0.01\n", ""))
    solve_study(study, folder / "o", jobs=1)  # the folder's study copy back to the fixture's (nothing solved)


def test_ladders_are_stored_and_read_back_without_solving(ladders):
    study, res, folder = ladders
    again = solve_study(study, folder / "o", jobs=1)
    assert again.solved == 0 and again.stretch_ladders == 0
    assert again.stretch == res.stretch
    assert open_results(folder / "o").stretch == res.stretch
    keys = {stretch_key(p) for p in stretch_points(study, points(study))}
    assert len(keys) == 3


def test_ladders_dataset_has_a_strain_step_dimension_equal_to_stretch_csv(ladders):
    """Results.ladders_dataset: one ladder per stretch.csv row, its steps over strain_step (NaN
    past a ladder's last step), the same numbers as stretch.csv's space-separated columns."""
    import csv
    _, res, folder = ladders
    ds = res.ladders_dataset
    assert ds["strain_rates_1_s"].dims == ("ladder", "strain_step") and ds["strain_rates_1_s"].attrs["units"] == "1/s"
    with open(folder / "o" / "stretch.csv") as fh:
        table = list(csv.DictReader(fh))
    assert ds.sizes["ladder"] == len(table) == 3
    for i, row in enumerate(table):
        K = [float(v) for v in row["strain_rates_1_s"].split()]
        got = ds["strain_rates_1_s"].isel(ladder=i).values
        assert np.allclose(got[:len(K)], K, rtol=1e-5) and np.isnan(got[len(K):]).all()
        assert float(ds["extinction_strain_rate_1_s"][i]) == pytest.approx(float(row["extinction_strain_rate_1_s"]), rel=1e-5)
        assert str(ds["status"].values[i]) == row["status"]
    assert open_results(folder / "o").ladders_dataset.identical(ds)


def test_stretch_csv_chart_and_report(ladders):
    _, res, folder = ladders
    out = folder / "o"
    assert (out / "stretch.csv").read_text().count("\n") == 4
    assert (out / "charts" / "consumption_speed_vs_strain.png").is_file()
    html = (out / "report.html").read_text()
    assert "Strained flames" in html and "K_ext [1/s]" in html
    r = run_cli("report", out)
    assert r.returncode == 0, r.stderr
    assert "Strained flames" in (out / "report.html").read_text()


def test_the_leading_point_flame_speed_reads_each_ladders_strongest_consumption_speed(ladders):
    """The leading-point idea (Kuznetsov & Sabelnikov 1990; Venkateswaran et al. 2015 for fuels of
    negative Markstein length): S_T of Schmid et al. (1998) with S_L replaced by the strongest
    consumption speed of the strained flames, S_c,max, read from the point's ladder - on the run
    that solved the ladders and on the read side alike. Lean hydrogen (Le_eff < 1) burns faster
    strained than unstrained, so S_c,max > S_L there (Law, Combustion Physics 2006, ch. 10, from memory)."""
    from flamecharts.physics import premixer as pm

    _, res, folder = ladders
    rows, ladder = _by_phi(res.rows), _by_phi(res.stretch)
    for phi, r in rows.items():
        S_c = max(ladder[phi]["consumption_speeds_m_s"])
        assert r["strained_consumption_speed_max_m_s"] == pytest.approx(S_c, rel=1e-12)
        lp = pm.leading_point_flame_speed(r["rms_velocity_m_s"], 1e-3 * r["integral_length_mm"],
                                          r["strained_consumption_speed_max_m_s"], r["unburned_thermal_diffusivity_m2_s"])
        assert r["turbulent_flame_speed_leading_point_m_s"] == pytest.approx(lp.S_T_m_s, rel=1e-12)
        assert ("leading point:" in r["turbulent_flame_speed_outside_range"]) == (not lp.in_range)
    assert rows[0.5]["strained_consumption_speed_max_m_s"] > 1.2 * rows[0.5]["laminar_flame_speed_m_s"]
    read = _by_phi(open_results(folder / "o").rows)
    assert [read[phi]["turbulent_flame_speed_leading_point_m_s"] for phi in rows] == [
        rows[phi]["turbulent_flame_speed_leading_point_m_s"] for phi in rows]
    assert "S_T leading point [m/s]" in (folder / "o" / "report.html").read_text()


def test_extinction_strain_blowout_and_the_interpolations_leave_one_out_error(ladders):
    """Lean blowout on the extinction strain rate (Da_ext = kappa_ext d / U_edge: Shanbhogue, Husain &
    Lieuwen 2009; Zhang et al. 2007 for hydrogen blends, from memory) at each ladder point, and the
    error of interpolating kappa_ext between ladders, measured by leaving each ladder out
    (design.extinction_leave_one_out; read side only, no flame or ladder solved)."""
    import dataclasses

    from flamecharts.design import extinction_leave_one_out, premixer_margins

    study, res, folder = ladders
    rows, ladder = _by_phi(res.rows), _by_phi(res.stretch)
    for phi, r in rows.items():
        assert r["extinction_strain_source"] == "at a ladder point"
        assert r["blowout_extinction_strain_rate_1_s"] == pytest.approx(ladder[phi]["extinction_strain_rate_1_s"],
                                                                         rel=1e-12)
        assert r["extinction_blowout_margin"] is None and "blowout: no stabilizer" in r["criteria_not_assessed"]
    # lean hydrogen (Le_eff < 1) resists extinction far beyond its own strain scale S_L^2/alpha_u (Law,
    # Combustion Physics 2006, ch. 10, from memory): C at phi 0.5 is many times C at phi 1
    assert rows[0.5]["extinction_karlovitz_number"] > 5 * rows[1.0]["extinction_karlovitz_number"]
    loo = {d["equivalence_ratio"]: d for d in extinction_leave_one_out(res.rows)}
    assert loo[1.0]["how"] == "interpolated" and loo[0.5]["how"].startswith("nearest ladder point")
    # kappa_ext peaks near phi 1 (Law & Sung 2000, from memory): interpolated between phi 0.5 and 2 it
    # misses the peak by about half (-46 % measured) - ladders that far apart do not interpolate
    # (docs/premixers.md gives this figure and the one of ladders 0.1 apart in phi)
    assert loo[1.0]["error_percent"] < -30.0
    html = (folder / "o" / "report.html").read_text()
    assert f"up to {loo[1.0]['error_percent']:+.0f} % where interpolated" in html
    # a stabilizer in the tube (10 mm, 30 m/s past it): the blowout margin and the verdict that counts it
    stab = dataclasses.replace(study, burner=dataclasses.replace(study.burner, stabilizer_size_m=0.01,
                                                                 approach_velocity_m_s=30.0))
    again = [dict(r) for r in res.rows]
    premixer_margins(stab, again)
    for r in again:
        Da = r["blowout_extinction_strain_rate_1_s"] * 0.01 / 30.0
        assert r["extinction_damkohler_number"] == pytest.approx(Da, rel=1e-12)
        assert r["extinction_blowout_margin"] == pytest.approx(Da, rel=1e-12)  # critical Da_ext 1
        assert "blowout not assessed" not in r["verdict"] and "blowout: " not in r["criteria_not_assessed"]


def test_check_says_what_a_stretch_request_costs(tmp_path):
    config = write_h2_study(tmp_path, fractions="[1.0]", phis="[0.5, 1.0, 2.0]")
    config.write_text(config.read_text() + STRETCH)
    r = run_cli("check", config, "--out", tmp_path / "none")
    assert r.returncode == 0, r.stderr
    assert "Strained flames: 3 twin counterflow ladder(s)" in r.stdout


def test_a_stretch_value_outside_the_sweep_is_refused(tmp_path):
    config = write_h2_study(tmp_path, fractions="[1.0]", phis="[0.5, 1.0]")
    config.write_text(config.read_text() + "\n[stretch]\nequivalence_ratio = [0.7]\n")
    r = run_cli("check", config)
    assert r.returncode == 2
    assert "'stretch.equivalence_ratio' lists 0.7, which the sweep does not have; allowed: 0.5, 1" in r.stderr



def test_a_lean_hydrogen_ladder_at_10_bar_starts_again_from_a_stronger_strain(monkeypatch):
    """Hydrogen-air at φ 0.5, 300 K and 10 bar (h2o2.yaml), a gas turbine premixer's lean
    hydrogen: from Cantera's initial guess no twin flame converges at the first nozzle velocities
    (2 S_L to 33.6 S_L, Karlovitz 0.01 to 0.2); the ladder used to end at the first ("no burning
    twin flame at the first strain rate"). It now starts again from a 1.6³ times stronger strain.
    Here only that start (from 33.6 S_L, two solves: about 30 s of CPU); the whole ladder goes
    out at 1.03e5 1/s (docs/benchmarks.md). Physics: lean hydrogen (Le_eff well below 1) burns
    faster when strained, so the strained consumption speed lies above S_L (Law, Combustion
    Physics 2006, ch. 10, from memory)."""
    import cantera as ct

    from flamecharts.chemistry import strained
    from flamecharts.numerics import FIRST_STRAIN_RETRY_FACTOR, FIRST_VELOCITY_FACTOR

    gas = ct.Solution("h2o2.yaml")
    gas.set_equivalence_ratio(0.5, "H2:1", "O2:1, N2:3.76")
    gas.TP = 300.0, 10e5
    X = gas.mole_fraction_dict()
    free = ct.FreeFlame(gas, width=0.003)
    free.set_refine_criteria(ratio=3, slope=0.1, curve=0.2)
    free.solve(loglevel=0, auto=True)
    S_L, T_ad = float(free.velocity[0]), float(free.T[-1])
    monkeypatch.setattr(strained, "MAX_SOLVES", 2)
    # the first solve fails after 1,790 time steps within the run's budget of 2,500 (49 CPU s);
    # 1,000 ends it sooner (18 s) the same way: no burning flame, so the ladder starts again
    monkeypatch.setattr(strained, "FIRST_SOLVE_MAX_TIME_STEPS", 1000)
    start = FIRST_VELOCITY_FACTOR * FIRST_STRAIN_RETRY_FACTOR ** 2
    out = strained.twin_flame_ladder(gas, 300.0, 10e5, X, S_L, T_ad, first_velocity_factor=start)
    assert out["first_strain_retries"] == 1
    assert out["first_velocity_factor"] == pytest.approx(start * FIRST_STRAIN_RETRY_FACTOR)
    assert out["message"] == "started at 137 S_L: no burning flame at 33.6 S_L and below; still burning after 2 solves"
    assert len(out["strain_rates_1_s"]) == 1 and out["consumption_speeds_m_s"][0] > 2 * S_L
