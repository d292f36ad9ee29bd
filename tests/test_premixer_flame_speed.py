"""A premixer's turbulent flame speeds and core-flow flashback margin per burning point
(design.turbulent_speed_columns; issue 30, items 3 and 4): read-side columns on stored values,
their report lines and chart.

The correlations themselves are checked in tests/test_premixer_physics.py; here, that each column
is its correlation evaluated on the point's stored inputs, the margin's convention, the fitted
ranges reported, and the report's sentences. The leading-point speed, which needs a [stretch]
ladder, is checked on tests/test_stretch.py's ladders (no ladder is solved here).
"""
import csv
import math

import numpy as np
import pytest
import xarray as xr

import flamecharts
from flamecharts.columns import COLUMNS, TURBULENT_SPEED_COLUMNS
from flamecharts.design import turbulent_speed_columns as speed_table
from flamecharts.physics import premixer as pm

from conftest import write_h2_study


def turbulent_speed_columns(row: dict) -> dict:
    """design.turbulent_speed_columns of one row (it takes every row of a sweep at once)."""
    return {c: v[0] for c, v in speed_table([row]).items()}


#: A burning point with the premixer's turbulence (design.turbulence_columns): the inputs of the
#: doctests of physics/premixer.py (u' 2 m/s, l_t 10 mm, S_L 0.4 m/s, alpha_u 2e-5 and
#: nu_u 1.5e-5 m^2/s, 5 bar), a methane-like Lewis number, 40 m/s in the duct.
ROW = {"status": "ok", "rms_velocity_m_s": 2.0, "integral_length_mm": 10.0, "laminar_flame_speed_m_s": 0.4,
       "unburned_thermal_diffusivity_m2_s": 2.0e-5, "unburned_viscosity_Pa_s": 1.5e-5 * 4.0,
       "unburned_density_kg_m3": 4.0, "lewis_number_fuel": 1.0, "lewis_number_oxygen": 1.1,
       "equivalence_ratio": 0.7, "pressure_bar": 5.0, "port_velocity_m_s": 40.0}


def test_each_column_is_its_correlation_on_the_stored_inputs():
    # Zimont 2000 (S_T = 0.52 u' Da^1/4), Muppala et al. 2005 (1/Le of the deficient reactant: the
    # fuel on the lean side), the leading-point idea (Kuznetsov & Sabelnikov 1990: Schmid et al.
    # 1998's form on S_c,max of the ladder)
    out = turbulent_speed_columns({**ROW, "ladder_consumption_speed_max_m_s": 0.8})
    assert out["turbulent_flame_speed_zimont_m_s"] == pm.zimont_flame_speed(2.0, 0.01, 0.4, 2.0e-5).S_T_m_s
    assert out["turbulent_flame_speed_muppala_m_s"] == pytest.approx(
        pm.muppala_flame_speed(2.0, 0.01, 0.4, 1.5e-5, 1.0, 5.0e5).S_T_m_s, rel=1e-12)
    assert out["turbulent_flame_speed_leading_point_m_s"] == pm.leading_point_flame_speed(2.0, 0.01, 0.8, 2.0e-5).S_T_m_s
    assert out["strained_consumption_speed_max_m_s"] == 0.8
    # the numbers of physics/premixer.py's doctests
    assert [round(out[c], 3) for c in ("turbulent_flame_speed_zimont_m_s", "turbulent_flame_speed_muppala_m_s",
                                       "turbulent_flame_speed_leading_point_m_s")] == [2.615, 2.886, 2.8]
    # rich: oxygen is the deficient reactant (Muppala et al. 2005: the deficient reactant's Le)
    rich = turbulent_speed_columns({**ROW, "equivalence_ratio": 1.3})
    assert rich["turbulent_flame_speed_muppala_m_s"] == pytest.approx(
        pm.muppala_flame_speed(2.0, 0.01, 0.4, 1.5e-5, 1.1, 5.0e5).S_T_m_s, rel=1e-12)
    # no ladder: no leading-point speed, and nothing said of it
    assert out.keys() == rich.keys() == set(TURBULENT_SPEED_COLUMNS)
    assert rich["turbulent_flame_speed_leading_point_m_s"] is None and "leading" not in rich[
        "turbulent_flame_speed_outside_range"]


def test_the_core_margin_is_the_bulk_velocity_over_the_largest_speed_in_range_or_not():
    # the convention of design.turbulent_speed_columns: U / max S_T over the correlations; the
    # criterion itself is the definition of S_T as a propagation speed (Lieuwen 2012, from memory)
    out = turbulent_speed_columns(ROW)
    assert out["core_flashback_correlation"] == "muppala"  # 2.886 > Zimont's 2.615
    assert out["core_flashback_margin"] == pytest.approx(40.0 / out["turbulent_flame_speed_muppala_m_s"], rel=1e-12)
    with_ladder = turbulent_speed_columns({**ROW, "ladder_consumption_speed_max_m_s": 1.6})
    assert with_ladder["core_flashback_correlation"] == "leading point"
    assert with_ladder["core_flashback_margin"] == pytest.approx(
        40.0 / with_ladder["turbulent_flame_speed_leading_point_m_s"], rel=1e-12)
    # a hydrogen-like Lewis number puts Muppala's correlation outside its hydrocarbon data (Muppala
    # et al. 2005: methane, ethylene, propane), and its faster flame still sets the margin
    h2 = turbulent_speed_columns({**ROW, "lewis_number_fuel": 0.4})
    assert h2["core_flashback_correlation"] == "muppala"
    assert h2["core_flashback_margin"] == pytest.approx(40.0 / h2["turbulent_flame_speed_muppala_m_s"], rel=1e-12)
    assert h2["core_flashback_margin"] < out["core_flashback_margin"]


def test_a_correlation_outside_its_fitted_range_says_which_and_why():
    # Zimont 2000 (from memory): Ka > 1; Muppala et al. 2005: Le 0.9-2 (from memory)
    inside = turbulent_speed_columns({**ROW, "rms_velocity_m_s": 6.0})  # Ka 4.1, u'/S_L 15
    assert inside["turbulent_flame_speed_outside_range"] == ""
    out = turbulent_speed_columns({**ROW, "lewis_number_fuel": 0.4})
    assert out["turbulent_flame_speed_outside_range"] == ("zimont: Ka 0.791 < 1 (small eddies outside the flame); "
                                                          "muppala: Le 0.4 outside 0.9-2 (methane, ethylene, propane)")


def test_without_the_premixers_turbulence_every_column_is_empty():
    bare = {k: v for k, v in ROW.items() if k != "rms_velocity_m_s"}
    assert turbulent_speed_columns(bare) == dict.fromkeys(TURBULENT_SPEED_COLUMNS)


BURNER = '[burner]\nname = "test tube"\nport = "round"\nport_diameter_mm = 20.0\nport_velocity_m_s = 30.0\n'


@pytest.fixture(scope="module")
def premixer_run(tmp_path_factory):
    """Diluted hydrogen and 50 % more hydrogen in it, φ 0.5 and 0.7, in a 20 mm duct at 30 m/s
    (4 coarse flames, a few seconds)."""
    folder = tmp_path_factory.mktemp("premixer_speed")
    cfg = write_h2_study(folder, phis="[0.5, 0.7]", fractions="[0.0, 0.5]",
                         extra='resolution = "coarse"\n[premixer]\nresidence_time_ms = 2.0\n\n' + BURNER)
    return flamecharts.run(cfg, out=folder / "out", jobs=1), folder / "out"


def _by_point(rows):
    return {(r["blend_fraction"], r["equivalence_ratio"]): r for r in rows}


def test_the_columns_are_the_correlations_on_each_flames_stored_values(premixer_run):
    res, out = premixer_run
    rows = _by_point(res.rows)
    assert len(rows) == 4 and all(r["status"] == "ok" for r in rows.values())
    for r in rows.values():
        u, l_t, S_L = r["rms_velocity_m_s"], 1e-3 * r["integral_length_mm"], r["laminar_flame_speed_m_s"]
        alpha, nu = r["unburned_thermal_diffusivity_m2_s"], r["unburned_viscosity_Pa_s"] / r["unburned_density_kg_m3"]
        zimont = pm.zimont_flame_speed(u, l_t, S_L, alpha)  # Zimont 2000
        muppala = pm.muppala_flame_speed(u, l_t, S_L, nu, r["lewis_number_fuel"], 1e5 * r["pressure_bar"])  # 2005
        assert r["turbulent_flame_speed_zimont_m_s"] == pytest.approx(zimont.S_T_m_s, rel=1e-12)
        assert r["turbulent_flame_speed_muppala_m_s"] == pytest.approx(muppala.S_T_m_s, rel=1e-12)
        assert r["turbulent_flame_speed_leading_point_m_s"] is None  # no [stretch]: no ladder
        assert r["core_flashback_margin"] == pytest.approx(30.0 / max(zimont.S_T_m_s, muppala.S_T_m_s), rel=1e-12)
        # hydrogen's Lewis number (about 0.4) lies outside Muppala et al.'s hydrocarbon data
        assert f"muppala: Le {r['lewis_number_fuel']:.3g} outside 0.9-2" in r["turbulent_flame_speed_outside_range"]
    # trend (issue 30's checks; Dinkelacker et al. 2011's methane-hydrogen flames, from memory): more
    # hydrogen at the same φ burns faster, so the core-flow margin falls
    for phi in (0.5, 0.7):
        lean, rich_h2 = rows[(0.0, phi)], rows[(0.5, phi)]
        for col in ("turbulent_flame_speed_zimont_m_s", "turbulent_flame_speed_muppala_m_s"):
            assert rich_h2[col] > lean[col]
        assert rich_h2["core_flashback_margin"] < lean["core_flashback_margin"]
    with open(out / "results.csv", newline="") as f:
        table = list(csv.DictReader(f))
    assert set(TURBULENT_SPEED_COLUMNS) <= set(table[0]) and list(table[0]) == list(COLUMNS)
    assert {t["core_flashback_correlation"] for t in table} == {"muppala"}
    with xr.open_dataset(out / "results.nc") as ds:
        v = ds["core_flashback_margin"].values.ravel()
        assert np.allclose(sorted(v[np.isfinite(v)]), sorted(r["core_flashback_margin"] for r in rows.values()))
    again = flamecharts.open_results(out)  # the read side gives the same, without solving
    assert [[r[c] for c in TURBULENT_SPEED_COLUMNS] for r in again.rows] == [
        [r[c] for c in TURBULENT_SPEED_COLUMNS] for r in res.rows]


def test_the_report_puts_the_speeds_side_by_side_and_says_how_the_margin_falls(premixer_run):
    res, out = premixer_run
    rows = _by_point(res.rows)
    html = (out / "report.html").read_text()
    assert "Turbulent flame speed and core-flow flashback" in html
    assert "S_T Zimont [m/s]" in html and "S_T Muppala [m/s]" in html and "S_T leading point" not in html
    assert html.count("scatter not stated in its source") == 2  # neither source read states one
    assert "judged finally by test" in html and "not certification" in html
    a5, b5 = rows[(0.0, 0.5)]["core_flashback_margin"], rows[(0.5, 0.5)]["core_flashback_margin"]
    a7, b7 = rows[(0.0, 0.7)]["core_flashback_margin"], rows[(0.5, 0.7)]["core_flashback_margin"]
    assert (f"At 50 % hydrogen in diluted (1 bar and 300 K) the core-flow flashback margin falls from {a5:.3g} to "
            f"{b5:.3g} at φ 0.5 and from {a7:.3g} to {b7:.3g} at φ 0.7 (largest S_T: muppala).") in html
    cell = f"{rows[(0.5, 0.7)]['turbulent_flame_speed_muppala_m_s']:.3g} *"  # outside its range: marked
    assert cell in html


def test_the_core_margin_chart_is_drawn_with_its_caution(premixer_run):
    import matplotlib.image as mpimg

    _, out = premixer_run
    png, svg = out / "charts" / "core_flashback_vs_blend_fraction.png", out / "charts" / "core_flashback_vs_blend_fraction.svg"
    assert np.asarray(mpimg.imread(png)).std() > 0.05
    text = svg.read_text()
    assert "not certification" in text and text.count("[") >= 2
    assert "core_flashback_vs_blend_fraction" in (out / "report.html").read_text()


def test_a_study_without_blends_gets_one_sentence_per_gas_and_condition():
    from flamecharts.results import core_flashback_sentences

    class Plain:  # a study without a blend axis, one oxidizer
        blend_with = None
        sweep_oxidizers = ("air",)

    rows = [{**ROW, **turbulent_speed_columns(ROW), "fuel": "methane", "oxidizer": "air", "blend_fraction": 0.0,
             "unburned_temperature_K": 700.0, "blend_with": ""}]
    margin = rows[0]["core_flashback_margin"]
    assert not math.isclose(margin, 1.0)
    assert core_flashback_sentences(Plain(), rows) == [  # type: ignore[arg-type]
        f"For methane at 5 bar and 700 K the core-flow flashback margin is {margin:.3g} at its lowest "
        "(φ 0.7; largest S_T: muppala)."]


def test_boundary_layer_and_blowout_margins_say_why_they_are_not_assessed_in_a_turbulent_duct(premixer_run):
    """The 20 mm duct at 30 m/s is turbulent (Re about 3e4): the laminar Pe_F of the critical-gradient
    model (Lewis & von Elbe; Putnam & Jensen 1949) does not hold there (Eichler, Baumgartner &
    Sattelmayer 2012, from memory) and the study sets no turbulent one; no [stretch] ladder gives an
    extinction strain rate. The premixer's verdict then rests on the core-flow margin alone, and says so."""
    res, out = premixer_run
    for r in res.rows:
        assert r["boundary_layer_flashback_margin"] is None
        assert r["boundary_layer_flashback_status"].startswith("not assessed: Re ")
        assert r["premixer_wall_velocity_gradient_1_s"] > 8 * 30.0 / 0.02  # turbulent: above laminar 8 U / D
        assert r["extinction_strain_source"] == "not assessed: no ladder at this condition"
        # the verdict names the speed it rests on: hydrogen's Lewis number (about 0.4) lies outside Muppala et
        # al. 2005's hydrocarbon data (Le 0.9-2, from memory), so an ok must not read as a fitted answer
        assert r["verdict"] == ("ok on core-flow flashback only; boundary-layer flashback and blowout not assessed "
                                "(core-flow flashback judged on Muppala et al.'s S_T, outside its fitted range)")
    html = (out / "report.html").read_text()
    assert "Boundary-layer flashback and lean blowout" in html and "No gas and condition has two ladder points" in html
    assert ("For diluted with 0 and 50 % hydrogen at 1 bar and 300 K the boundary-layer flashback margin is not "
            "assessed (Re "
            in html.replace("&#x27;", "'"))


def test_the_summaries_say_what_the_points_are_ok_on_and_the_console_shows_the_turbulent_answers(premixer_run, capsys):
    """A newcomer trial found '0 of 4 points ok on every criterion' beside verdicts 'ok on core-flow
    flashback only; ...': the summary (console and report) now counts the verdicts in their own words,
    and the console's point table shows the largest S_T and the core-flow margin of a premixer."""
    from flamecharts.cli.tables import print_margins, print_points
    from flamecharts.results import to_dataset

    res, out = premixer_run
    print_margins(res.study, to_dataset(res.study, res.rows))
    print_points(res.study, res.rows)
    text = capsys.readouterr().out
    words = "2 of 2 points ok on core-flow flashback only (boundary-layer flashback and blowout not assessed)"
    assert text.count(words) == 2 and "on every criterion" not in text  # one line per gas at 1 bar, 300 K
    lowest = min((r for r in res.rows if r["blend_fraction"] == 0.5), key=lambda r: r["core_flashback_margin"])
    assert (f"core-flow flashback margin >= {lowest['core_flashback_margin']:.2f} "
            f"(phi {lowest['equivalence_ratio']:g})") in text
    assert " S_T   FBc  verdict" in text
    for r in res.rows:  # S_T = U / FBc, the largest of the correlations
        S_T = max(r["turbulent_flame_speed_zimont_m_s"], r["turbulent_flame_speed_muppala_m_s"])
        assert f" {S_T:5.2f} {r['core_flashback_margin']:5.2f}  ok on core-flow" in text
    html = (out / "report.html").read_text().replace("&#x27;", "'")
    assert html.count(words) == 2 and "min core-flow flashback margin (φ)" in html


def test_the_turbulent_flame_speeds_are_drawn_against_phi_and_a_one_blend_study_is_told_why_it_has_no_blend_chart(
        premixer_run):
    import matplotlib.image as mpimg

    from flamecharts.outputs.charts.registry import not_drawn

    _, out = premixer_run
    png, svg = out / "charts" / "turbulent_flame_speed_vs_phi.png", out / "charts" / "turbulent_flame_speed_vs_phi.svg"
    assert np.asarray(mpimg.imread(png)).std() > 0.05
    text = svg.read_text()
    assert "not certification" in text and "S_T [m/s]" in text and "Bulk velocity / S_T" in text
    # a study without a blend axis draws the speeds against phi, and the report says why it has no blend chart
    why = dict(not_drawn({"turbulent_flame_speed_vs_phi", "flame_speed_vs_equivalence_ratio"}))
    assert why["core_flashback_vs_blend_fraction"].startswith("it needs a blend axis with two or more fractions")
    # a study without [premixer] draws neither, and is not told about a premixer's chart
    assert "core_flashback_vs_blend_fraction" not in dict(not_drawn({"flame_speed_vs_equivalence_ratio"}))
