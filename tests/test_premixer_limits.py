"""[limits] on a premixer's own margins (issue 30, item 7): the core-flow flashback margin
(``core_flashback``) and the extinction-strain blowout margin (``extinction_blowout``) as limit
criteria, found between swept blends by the same root finding as the laminar criteria.

One cheap study (h2o2.yaml): tests/test_premixer_flame_speed.py's diluted hydrogen
(60 % H2, 40 % N2) blended with hydrogen, here at phi 0.6 in a 20 mm duct at 5 m/s (Re about 6e3,
turbulent) with a 10 mm bluff body (invented premixer). The [stretch] ladders at 0 and 50 % hydrogen
(1 bar) are not solved here (one costs tens of seconds): the worker's ladder task is replaced by
one that returns the values tests/benchmarks/extinction_interpolation.py measured for these flames
(docs/benchmarks.md: kappa_ext 12,709 and 16,901 1/s, S_c,max 0.865 and 0.995 m/s), so everything
after the ladder (store, keys, interpolation, limits, report) runs as in a real study. At 2 bar no
ladder is selected: the blowout criterion is not assessed there. Standard flames, not coarse: the
core-flow margin changes little with the blend fraction, and the 1 % scatter of coarse flame speeds
between differently warm-started flames moved its crossing by 0.017 (measured), more than the
search's tolerance; standard flames scatter about 0.15 %.
"""
import math
import shutil
import sqlite3

import pytest

import flamecharts
from flamecharts import load_study
from flamecharts.admissible.driver import point_at, search_row
from flamecharts.admissible.words import limit_sentence
from flamecharts.analyses.strain_ladders import task as ladder_task
from flamecharts.analyses.strain_ladders.solve import stretch_key, stretch_points
from flamecharts.design import sweep_ladders
from flamecharts.store import DB_NAME, Store
from flamecharts.sweep.points import points

from conftest import write_h2_study

#: Measured ladders (tests/benchmarks/extinction_interpolation.py, h2o2.yaml, coarse, 1 bar, 300 K,
#: phi 0.6): blend fraction -> (kappa_ext [1/s], S_c,max [m/s]).
LADDERS = {0.0: (12709.4, 0.8649), 0.5: (16901.5, 0.9952)}
MIN_FLASHBACK, MIN_STABILIZER, BLOWOUT_DA, STABILIZER_MM, BLOCKAGE, U = 2.8, 2.1, 10.0, 10.0, 0.25, 5.0

PREMIXER = f"""resolution = "standard"

[premixer]
residence_time_ms = 2.0
blowout_damkohler = {BLOWOUT_DA}

[burner]
name = "test premixer"
port = "round"
port_diameter_mm = 20.0
port_velocity_m_s = {U}
stabilizer_size_mm = {STABILIZER_MM}
approach_velocity_m_s = {U}
stabilizer_blockage = {BLOCKAGE}
min_flashback_margin = {MIN_FLASHBACK}
min_stabilizer_margin = {MIN_STABILIZER}

[stretch]
equivalence_ratio = [0.6]
blend_fraction = [0.0, 0.5]
pressure_bar = [1.0]
"""


def _measured_ladder(blend_of):
    """A stand-in for the ladder task (strain_ladders.task.stretch_task): the measured ladder of the point's blend."""
    def task(t):
        K, S_c = LADDERS[blend_of[t["key"]]]
        m = {"strain_rates_1_s": [50.0, K / 3, K], "consumption_speeds_m_s": [t["S_L"], S_c, 0.9 * S_c],
             "extinction_strain_rate_1_s": K, "extinguished_above_1_s": 1.02 * K, "half_separation_m": 0.004,
             "solves": 3, "markstein_number_strain": None, "message": ""}
        return {"key": t["key"], "status": "ok", "reason": "", "message": "extinguished", "start": "fresh",
                "metrics": m, "profile_blob": None, "solve_seconds": 0.0, "cpu_seconds": 0.0}
    return task


@pytest.fixture(scope="module")
def premixer_limits(tmp_path_factory):
    """The study (0 and 50 % hydrogen, 1 and 2 bar: 4 flames, 14 more for its limits) with [limits],
    its ladders 'solved' in the same run before the limits; then the finer sweep (0 to 50 % in steps
    of 10 %, 1 bar: 4 new flames, no limits) into the same store."""
    folder = tmp_path_factory.mktemp("premixer_limits")
    cfg = write_h2_study(folder, phis="[0.6]", fractions="[0.0, 0.5]", pressures="[1.0, 2.0]",
                         extra=PREMIXER + "\n[limits]\nfind = ['blend_fraction']\n")
    fine = write_h2_study(folder, name="fine", phis="[0.6]", pressures="[1.0]",
                          fractions="[0.0, 0.1, 0.2, 0.3, 0.4, 0.5]", extra=PREMIXER)
    study = load_study(cfg)
    blend_of = {stretch_key(p): p.blend_fraction for p in stretch_points(study, points(study))}
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(ladder_task, "stretch_task", _measured_ladder(blend_of))
        res = flamecharts.run(cfg, out=folder / "out", jobs=1, charts=False, report=False)
        shutil.copytree(folder / "out", folder / "resumed")
        fine_res = flamecharts.run(fine, out=folder / "out", jobs=1, charts=False, report=False)
    assert fine_res.summary.stretch_ladders == 0  # the same two ladder points, found in the store
    return study, res, fine_res.rows, folder


def _by(limits, p):
    (row,) = [r for r in limits if r["pressure_bar"] == p]
    return row


def _crossing(rows, col, need, falling):
    """Where a finely swept margin crosses its minimum, by linear interpolation of ln(margin)."""
    pts = sorted((r["blend_fraction"], math.log(r[col] / need)) for r in rows)
    for (x0, g0), (x1, g1) in zip(pts, pts[1:]):
        if (g0 >= 0 > g1) if falling else (g0 < 0 <= g1):
            return x0 + g0 * (x1 - x0) / (g0 - g1)
    raise AssertionError(f"no crossing in {pts}")


def test_the_defaults_are_the_premixers_criteria(premixer_limits):
    study, _, _, _ = premixer_limits
    # laminar flashback and the bluff-body constant stay (not assessed here: turbulent duct, C_BO unset)
    assert study.limits.criteria == ("flashback", "stabilizer", "core_flashback", "extinction_blowout")


def test_a_window_between_two_swept_blends_matches_the_fine_sweep_at_both_edges(premixer_limits):
    """Both swept blends fail, by different criteria: blowout at 0 % (kappa_ext rises with hydrogen:
    the measured ladders; Zhang et al. 2007, from memory, for hydrogen blends' resistance to lean
    blowout), core-flow flashback at 50 % (S_T rises with hydrogen at fixed phi: issue 30's trend
    check; Muppala et al. 2005's correlation sets the margin here): the window lies strictly between
    them. Its lower edge is where Da_ext = kappa_ext d / U_edge (Shanbhogue, Husain & Lieuwen 2009)
    over its critical value, with kappa_ext interpolated linearly in its logarithm between the two
    ladders, meets the minimum (closed form); both edges where the finer sweep's margins cross their
    minima."""
    _, res, fine, _ = premixer_limits
    lim = _by(res.limits, 1.0)
    assert (lim["outcome"], lim["lower_kind"], lim["upper_kind"]) == ("window", "found", "found")
    assert (lim["lower_binding"], lim["upper_binding"]) == ("extinction_blowout", "core_flashback")
    assert 0.0 < lim["lower_edge"] < lim["upper_edge"] < 0.5
    assert lim["swept_failures"] == "extinction_blowout at 0; core_flashback at 0.5, 1"
    (K0, _), (K1, _) = LADDERS[0.0], LADDERS[0.5]
    K_edge = MIN_STABILIZER * BLOWOUT_DA * U / (1.0 - BLOCKAGE) / (STABILIZER_MM / 1e3)
    x_blowout = 0.5 * math.log(K_edge / K0) / math.log(K1 / K0)
    tol = 0.005  # the default blend_fraction_tolerance
    assert abs(lim["lower_edge"] - x_blowout) <= tol
    assert abs(lim["lower_edge"] - _crossing(fine, "extinction_blowout_margin", MIN_STABILIZER, False)) <= tol
    # the fine sweep's 5 % steps: ln(margin) is smooth in the blend fraction, so its linear
    # interpolation errs by far less than the tolerance (second differences of about 0.03 per 25 %)
    assert abs(lim["upper_edge"] - _crossing(fine, "core_flashback_margin", MIN_FLASHBACK, True)) <= tol + 0.002
    assert lim["lower_margin"] >= MIN_STABILIZER and lim["upper_margin"] >= MIN_FLASHBACK
    assert 0 < lim["flames_evaluated"] <= 20


def test_the_margin_at_a_swept_point_is_what_the_search_computes_there(premixer_limits):
    """The search's limit function at a flame between the swept points (driver.search_row, with
    the sweep's ladders) is the column results.csv gives at a swept point of the same mixture: at
    the ladder points and between them (the finer sweep's flames are swept points of its study and
    flames between swept points for the study with [limits])."""
    study, res, fine, folder = premixer_limits
    ladders = sweep_ladders(res.rows)
    cond = {"fuel": "diluted", "oxidizer": "air", "blend_fraction": None, "equivalence_ratio": 0.6,
            "pressure_bar": 1.0, "unburned_temperature_K": 300.0}
    cols = ("core_flashback_margin", "extinction_blowout_margin", "turbulent_flame_speed_leading_point_m_s",
            "strained_consumption_speed_max_m_s", "turbulent_flame_speed_muppala_m_s", "blowout_extinction_strain_rate_1_s")
    with Store(folder / "out" / DB_NAME, readonly=True) as store:
        for r in fine:
            sub, p = point_at(study, cond, "blend_fraction", r["blend_fraction"])
            mine = search_row(sub, p, store.rows([p.key]), ladders)
            assert [mine[c] for c in cols] == [r[c] for c in cols], r["blend_fraction"]
            at_ladder = r["blend_fraction"] in LADDERS
            assert r["strained_consumption_speed_source"] == ("at a ladder point" if at_ladder else "interpolated")
            assert r["extinction_strain_source"] == ("at a ladder point" if at_ladder else "interpolated")
    by_x = {r["blend_fraction"]: r for r in fine}
    assert by_x[0.5]["strained_consumption_speed_max_m_s"] == LADDERS[0.5][1]
    # ln S_c,max linear between the ladders (design.strained_speed)
    assert by_x[0.2]["strained_consumption_speed_max_m_s"] == pytest.approx(
        LADDERS[0.0][1] ** 0.6 * LADDERS[0.5][1] ** 0.4, rel=1e-12)


def test_without_a_ladder_the_blowout_is_not_assessed_and_the_core_margin_alone_decides(premixer_limits):
    _, res, _, _ = premixer_limits
    lim = _by(res.limits, 2.0)
    assert lim["criteria_not_assessed"].startswith(
        "flashback at 2 of 2 swept flames") and "extinction_blowout at 2 of 2 swept flames (at 0 %: no ladder at this " \
        "gas and pressure and preheat" in lim["criteria_not_assessed"]
    assert (lim["outcome"], lim["lower_kind"], lim["upper_binding"]) == ("window", "range end", "core_flashback")
    # without a ladder the largest S_T is Muppala et al.'s, whose hydrocarbon data (Le 0.9-2, from memory) do not
    # reach hydrogen's Lewis number: the verdict and the sentence say what the core-flow answer rests on
    muppala = "Muppala et al.'s S_T, outside its fitted range"
    assert all(r["verdict"].endswith(f"boundary-layer flashback and blowout not assessed (core-flow flashback judged "
                                     f"on {muppala})") for r in res.rows if r["pressure_bar"] == 2.0)
    assert lim["core_flashback_basis"] == muppala
    sentence = limit_sentence(lim, res.study)
    assert f"(core_flashback binds on {muppala}: margin" in sentence
    assert "not assessed: flashback at 2 of 2 swept flames, stabilizer at 2 of 2 swept flames, extinction_blowout at " \
           "2 of 2 swept flames" in sentence
    # the answer never reads as flashback-proof: boundary-layer flashback is outside these criteria
    assert sentence.endswith("boundary-layer flashback is not among these criteria (the report's premixer section "
                             "says where it is assessed)")


def test_the_report_and_the_limits_chart_name_the_premixers_criteria(premixer_limits):
    """The report's Limits section and the admissible_limits chart, drawn alone (the whole report
    with its charts costs seconds more than the flames)."""
    from flamecharts.design import fuel_gas_table
    from flamecharts.outputs.charts.design_charts import limits_chart
    from flamecharts.outputs.charts.registry import ChartData
    from flamecharts.outputs.report import _limits_section

    study, res, _, _ = premixer_limits
    html = "".join(_limits_section(study, res.limits)).replace("&#x27;", "'")
    lim = _by(res.limits, 1.0)
    assert (f"keeps every assessed margin from {100 * lim['lower_edge']:.1f} % (extinction_blowout binds below: margin "
            f"{lim['lower_margin']:.2f} there, minimum {MIN_STABILIZER:g}) to {100 * lim['upper_edge']:.1f} % hydrogen "
            f"(core_flashback binds on {lim['core_flashback_basis']}: margin {lim['upper_margin']:.2f} there, minimum "
            f"{MIN_FLASHBACK:g})") in html
    # which turbulent flame speed the core_flashback edge rests on, and whether outside its fitted range
    assert lim["core_flashback_basis"] in {"the leading-point S_T", "Muppala et al.'s S_T, outside its fitted range"}
    assert "A premixer's criteria." in html and "the same function of the flame at both" in html
    fig = limits_chart(ChartData(rows=res.rows, gases=fuel_gas_table(study), dataset=res.dataset, limits=res.limits),
                       study)
    legend = {t.get_text() for leg in fig.legends + [a.get_legend() for a in fig.axes if a.get_legend()]
              for t in leg.get_texts()}
    assert {"core-flow flashback binds (premixer)", "extinction-strain blowout binds (premixer)"} <= legend


def test_a_resumed_run_and_the_read_side_give_the_same_limits(premixer_limits):
    """The ladders are solved before the limits (pipeline._solve_one), and a search's flames read the
    sweep's ladders: the run that solved the ladders, a run that lost some of its limit flames and
    solves them again, and the read side all give the same limits to the last digit."""
    study, res, _, folder = premixer_limits
    assert flamecharts.open_results(folder / "resumed").limits == res.limits
    searched = [point_at(study, {**r, "blend_fraction": None}, "blend_fraction", float(x))[1].key
                for r in res.limits for x in (r["evaluated_at"] or "").split()]
    with sqlite3.connect(folder / "resumed" / DB_NAME) as db:
        order = [k for (k,) in db.execute("SELECT key FROM points ORDER BY rowid") if k in set(searched)]
        lost = order[:3]
        db.executemany("DELETE FROM points WHERE key = ?", [(k,) for k in lost])
    again = flamecharts.run(study, out=folder / "resumed", jobs=1, charts=False, report=False)
    assert again.summary.solved == 0 and again.summary.limit_flames == len(lost) == 3
    assert again.limits == res.limits


TUBE = '[burner]\nname = "tube"\nport = "round"\nport_diameter_mm = 20.0\nport_velocity_m_s = 5.0\n'


@pytest.mark.parametrize("extra, message", [
    (TUBE + "[limits]\ncriteria = ['core_flashback']\n", r"'core_flashback', but the study has no \[premixer\]"),
    ("[premixer]\nresidence_time_ms = 2.0\n" + TUBE + "[limits]\ncriteria = ['extinction_blowout']\n",
     "no 'stabilizer_size_mm'"),
    ("[premixer]\nresidence_time_ms = 2.0\n" + TUBE + "stabilizer_size_mm = 10.0\napproach_velocity_m_s = 5.0\n"
     "[limits]\ncriteria = ['extinction_blowout']\n", r"no \[stretch\]"),
])
def test_a_premixer_criterion_needs_what_it_is_computed_from(tmp_path, extra, message):
    with pytest.raises(flamecharts.ConfigError, match=message):
        load_study(write_h2_study(tmp_path, extra=extra))


def test_without_stretch_the_default_criteria_leave_the_blowout_out(tmp_path):
    cfg = write_h2_study(tmp_path, extra="[premixer]\nresidence_time_ms = 2.0\n" + TUBE
                         + "stabilizer_size_mm = 10.0\napproach_velocity_m_s = 5.0\n[limits]\n")
    assert load_study(cfg).limits.criteria == ("flashback", "stabilizer", "core_flashback")
