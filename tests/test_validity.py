"""Criteria that know where they hold (physics.validity, design.not_assessed): a point inside
and a point outside each criterion's range, the reason columns, the wall gradient without a
step, and a limit that no criterion in range can bind.

The ranges are those of the data each constant was fitted on: Lewis & von Elbe 1987 (laminar
cold-wall critical gradients near 1 atm, room temperature), Reed 1967 and Edmondson & Heap
1971 (lean to stoichiometric hydrocarbon port flames); the pressure and preheat allowances
and the Lewis-number cut are common practice without source (physics.validity).
"""
from types import SimpleNamespace as NS

import numpy as np
import pytest

import flamecharts
from flamecharts.admissible.words import limit_sentence
from flamecharts.design import not_assessed, wall_gradients
from flamecharts.physics import indicators as ind, validity as val

from conftest import write_h2_study

INSIDE = dict(reynolds=900.0, pressure_bar=1.0, unburned_temperature_K=300.0, equivalence_ratio=0.9,
              deficient_lewis=0.96)


@pytest.mark.parametrize("criterion", ["flashback", "blowoff"])
@pytest.mark.parametrize("change, words", [
    (dict(reynolds=3000.0), "transitional port flow (Re 3e+03 > 2300)"),
    (dict(reynolds=3.7e5), "turbulent port flow (Re 3.7e+05 > 2300)"),
    (dict(pressure_bar=10.0), "10 bar outside 0.5-2 bar"),
    (dict(pressure_bar=0.3), "0.3 bar outside 0.5-2 bar"),
    (dict(unburned_temperature_K=650.0), "650 K preheat outside 250-400 K"),
])
def test_port_criteria_hold_for_laminar_flow_near_room_conditions(criterion, change, words):
    assert val.domain_reasons(val.DOMAINS[criterion], **INSIDE) == []
    assert val.domain_reasons(val.DOMAINS[criterion], **{**INSIDE, **change}) == [words]


def test_reed_constant_only_for_lean_to_stoichiometric_hydrocarbon_like_flames():
    d = val.DOMAINS["blowoff"]
    assert val.domain_reasons(d, **{**INSIDE, "equivalence_ratio": 1.0}) == []
    assert val.domain_reasons(d, **{**INSIDE, "equivalence_ratio": 1.3}) == ["rich (phi 1.3 > 1)"]
    assert val.domain_reasons(d, **{**INSIDE, "deficient_lewis": 0.35}) == ["Lewis number 0.35 < 0.8 (hydrogen-rich)"]
    # the flashback constant is derived from methane and hydrogen data: any phi, any Lewis number
    f = val.DOMAINS["flashback"]
    assert val.domain_reasons(f, **{**INSIDE, "equivalence_ratio": 1.3, "deficient_lewis": 0.35}) == []


def test_reed_constant_is_for_single_port_flames_not_a_deck():
    """A perforated deck of 1 mm holes was judged by the single-port blowoff correlation, and every
    point was a blowoff risk: on a deck the merged flames hold each other, so no blowoff margin."""
    d = val.DOMAINS["blowoff"]
    assert val.domain_reasons(d, **INSIDE, layout="separate") == []
    assert val.domain_reasons(d, **INSIDE, layout="deck") == ["a deck of merged port flames (the data are single "
                                                             "port flames)"]
    assert val.domain_reasons(val.DOMAINS["flashback"], **INSIDE, layout="deck") == []


def test_wall_gradient_has_no_step_between_laminar_and_turbulent_port_flow():
    """The laminar 8U/D at Re 2300 and Blasius's gradient at Re 4000 are joined linearly: the
    gradient is continuous (the old switch at 2300 jumped by a factor 1.64: Blasius at Re 2300 is
    0.3164 x 2300^0.75 / 64 = 1.64 times 8U/D)."""
    b = NS(port="round", port_size_m=0.004)
    nu = 1.6e-5
    Re = np.array([2299.0, 2300.0, 2301.0, 3999.0, 4000.0, 4001.0])
    grad = (wall_gradients(b, Re * nu / b.port_size_m, Re, np.full(6, nu)) / (Re * nu / b.port_size_m)).tolist()
    # per unit velocity: smooth in Re
    assert grad[1] == pytest.approx(8.0 / 0.004) and grad[0] == pytest.approx(grad[1], rel=1e-3)
    assert grad[2] == pytest.approx(grad[1], rel=2e-3)
    assert grad[3] == pytest.approx(grad[4], rel=1e-3) and grad[5] == pytest.approx(grad[4], rel=1e-3)
    U = 4000.0 * nu / 0.004
    assert grad[4] == pytest.approx(ind.wall_velocity_gradient_turbulent(U, 0.004, nu) / U)
    # the step a hard switch at Re 2300 would make: Blasius's gradient over Poiseuille's there
    # is 0.3164 Re^0.75 / 64 = 1.64 (both laws in Schlichting, Boundary-Layer Theory, ch. 1 and 20)
    U = 2300.0 * nu / 0.004
    step = ind.wall_velocity_gradient_turbulent(U, 0.004, nu) / ind.wall_velocity_gradient_round(U, 0.004)
    assert step == pytest.approx(1.64, abs=0.005)


def test_stabilizer_needs_a_calibrated_constant():
    row = {"equivalence_ratio": 0.6, "pressure_bar": 1.0, "unburned_temperature_K": 300.0,
           "lewis_number_fuel": 0.97, "lewis_number_oxygen": 1.0}
    burner = NS(on_stabilizer=True, layout="separate")
    raw = not_assessed(NS(burner=burner, indicator_settings={"bluff_body_constant": None}), row, 800.0)
    assert raw["stabilizer"].startswith("C_BO not calibrated")
    assert "flashback" not in raw and "blowoff" not in raw
    done = not_assessed(NS(burner=burner, indicator_settings={"bluff_body_constant": 0.8}), row, 800.0)
    assert done == {}


PREMIXER = """
[burner]                 # invented: a hydrogen premixer tube, turbulent at 10 bar
port = "round"
port_diameter_mm = 30.0
port_velocity_m_s = 45.0
min_flashback_margin = 1.5

[limits]
find = ["equivalence_ratio"]
criteria = ["flashback"]
"""


def test_a_turbulent_high_pressure_premixer_gets_no_laminar_verdict_nor_limit(tmp_path):
    """The case of the criteria-range issue: a turbulent premixer tube at 10 bar judged by the
    laminar critical gradient kept 'every margin'. Now the margin is blank, the verdict and the
    limit say not assessed, and no limit flame is solved."""
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.5, 0.6]", pressures="[10.0]")
    config.write_text(config.read_text() + PREMIXER)
    res = flamecharts.run(config, out=tmp_path / "o", jobs=2, charts=False)
    for r in res.rows:
        assert r["status"] == "ok" and r["port_reynolds_number"] > 1e5
        assert r["flashback_margin"] is None and r["wall_velocity_gradient_1_s"] > 0
        assert r["verdict"] == "flashback and blowoff not assessed"
        assert "flashback: turbulent port flow" in r["criteria_not_assessed"]
        assert "10 bar outside 0.5-2 bar" in r["criteria_not_assessed"]
    (limit,) = res.limits
    assert limit["outcome"] == "not assessed" and limit["flames_evaluated"] == 0
    assert limit["criteria_not_assessed"].startswith("flashback at 2 of 2 swept flames (at phi 0.5: turbulent")
    assert "not assessed" in (tmp_path / "o" / "limits.csv").read_text()
    sentence = limit_sentence(limit, res.study)
    assert "no limit, no criterion of the search is assessed" in sentence and "keeps every margin" not in sentence


def test_a_window_says_which_of_its_flames_are_cellular_and_that_two_constants_fix_the_port_band():
    from flamecharts.admissible.driver import _cellular_words, _Search
    from flamecharts.admissible.search import Edge, Window
    from flamecharts.admissible.words import fixed_ratio_note
    from flamecharts.physics.indicators import DEFAULTS

    s = _Search("equivalence_ratio", {}, None, cellular=(0.5, 0.6, 0.9))
    w = Window(Edge(0.45, "found", "blowoff"), Edge(0.7, "found", "flashback"))
    (note,) = _cellular_words(s, w)
    assert note.startswith("2 swept flames inside this window (0.5, 0.6) are thermodiffusively unstable")
    assert _cellular_words(_Search("equivalence_ratio", {}, None), w) == []
    # Pe_F Ka_B = 13 x 0.23 = 2.99: with both minima 1.5 the band is flashback margins 1.5 to 2.99/1.5
    study = NS(limits=NS(criteria=("flashback", "blowoff")), burner=NS(min_flashback_margin=1.5, min_blowoff_margin=1.5),
               indicator_settings=dict(DEFAULTS))
    assert "= 2.99 at every point" in fixed_ratio_note(study)
    assert "flashback margins 1.5-1.99 whatever the mixture" in fixed_ratio_note(study)
    assert "not checked against published port stability data" in fixed_ratio_note(study)
    study.limits.criteria = ("flashback", "stabilizer")
    assert fixed_ratio_note(study) == ""


def test_answers_that_rest_on_fewer_criteria_say_so_before_their_numbers():
    from flamecharts.admissible.driver import _failures
    from flamecharts.design import lewis_warning

    st = NS(burner=NS(name="rig", min_flashback_margin=1.5), blend_with="hydrogen",
            limits=NS(criteria=("flashback", "blowoff")), gas_quality=NS(tolerance_percent=None, band_MJ_m3=None))
    r = dict(axis="blend_fraction", window=1, fuel="town gas", oxidizer="air", blend_with="hydrogen",
             blend_fraction=None, equivalence_ratio=1.2, pressure_bar=1.0, unburned_temperature_K=300.0,
             outcome="window", lower_edge=0.0, lower_kind="range end", upper_edge=0.16, upper_kind="found",
             upper_binding="flashback", upper_margin=1.5, note="",
             criteria_not_assessed="blowoff at 4 of 4 swept flames (at 0 %: rich (phi 1.2 > 1))")
    text = limit_sentence(r, st)
    assert "rig takes, on the assessed criteria, up to 16.0 % hydrogen (flashback binds" in text
    assert text.endswith("not assessed: blowoff at 4 of 4 swept flames (why: limits.csv, criteria_not_assessed)")
    # a swept flame where nothing is in range fails as 'not assessed', not as 'no flame'
    assert _failures([(0.5, "not assessed: flashback (turbulent)"), (0.8, "no_flame: x"), (1.2, "flashback")]) == \
        "not assessed at 0.5; no flame at 0.8; flashback at 1.2"
    # lean hydrogen without [flame_response]: the flashback margin may be optimistic, and the warning says so
    lean_h2 = {"status": "ok", "equivalence_ratio": 0.5, "lewis_number_fuel": 0.39, "instability": None}
    assert lewis_warning(lean_h2).startswith("Lewis number of the fuel 0.39 < 0.8 on the lean side")
    assert lewis_warning({**lean_h2, "instability": "stable"}) == ""  # [flame_response] judged it
    assert lewis_warning({**lean_h2, "lewis_number_fuel": 0.96}) == ""  # lean methane


CELLULAR = """
resolution = "coarse"

[burner]
name = "test plate"
port = "round"
port_diameter_mm = 1.5
port_velocity_m_s = 1.0
min_flashback_margin = 1.5

[limits]
find = ["equivalence_ratio"]

[flame_response]
zeldovich = true
"""


def test_a_window_holding_cellular_flames_says_so_in_its_sentence(tmp_path):
    """Lean hydrogen-air is thermodiffusively unstable (cellular: effective Lewis number well below
    1, Markstein number negative; Law, Combustion Physics 2006, ch. 10, from memory), and the thermal
    flashback criterion understates its risk: limits.csv's note said so, the sentence the console and
    the report print did not (a newcomer read "admissible from phi 0.5" beside "at risk" margins)."""

    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.5, 0.7, 1.0]", extra=CELLULAR)
    res = flamecharts.run(config, out=tmp_path / "out", jobs=1, charts=False, report=False)
    cellular = [r["equivalence_ratio"] for r in res.rows if r.get("instability") == "cellular"]
    windows = [r for r in res.limits if r["outcome"] == "window"]
    assert cellular and windows, [(r["outcome"], r["note"]) for r in res.limits]
    held = [r for r in windows if r["lower_edge"] <= min(cellular) <= r["upper_edge"]]
    assert held, (cellular, windows)
    for r in held:
        assert "thermodiffusively unstable (cellular)" in r["note"]
        assert "understates their risk" in limit_sentence(r, res.study)
    # blowoff is assessed at none of these flames (Lewis number below 0.8): the fixed ratio of the two
    # critical gradients bounds nothing here, and neither limits.csv nor the report says it does
    from flamecharts.admissible.words import fixed_ratio_note
    ratio = fixed_ratio_note(res.study)
    assert ratio and all("blowoff at 3 of 3" in r["criteria_not_assessed"] for r in held)
    assert not any(ratio in r["note"] for r in res.limits)
