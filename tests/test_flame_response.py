"""How a flame responds to stretch: Lewis, Zeldovich and Markstein numbers, the thermodiffusive regime.

Pure functions of physics/flame_response.py checked against their limits and a general
reference library (SciPy's dilogarithm); the stored numbers of real flames checked against
textbook facts and published trends, each named beside its check.
"""
import csv
import math

import pytest
from scipy.special import spence

from flamecharts import load_study, run_study
from flamecharts.chemistry.mechanism import solution
from flamecharts.chemistry.response import diluted, inert_steps, lewis_numbers, lower_heating_value
from flamecharts.physics import flame_response as fr
from flamecharts.sweep.points import points, settings_of

from conftest import run_cli, write_h2_study


# ---- pure functions
def test_markstein_integral_is_the_dilogarithm():
    """int_0^(s-1) ln(1+x)/x dx = -Li2(1 - s) = -spence(s) (SciPy: spence(z) = Li2(1 - z))."""
    for sigma in (3.0, 5.0, 7.5):
        assert fr._expansion_integral(sigma) == pytest.approx(-spence(sigma), rel=1e-9)


def test_markstein_number_limits():
    # Le_eff = 1: only the expansion term sigma ln sigma / (sigma - 1) (Clavin & Williams 1982)
    assert fr.markstein_number_unburned(6.0, 10.0, 1.0) == pytest.approx(6 * math.log(6) / 5)
    # a low enough Le_eff turns it negative, a high one raises it
    assert fr.markstein_number_unburned(6.0, 12.0, 0.3) < 0 < fr.markstein_number_unburned(6.0, 12.0, 1.0) \
        < fr.markstein_number_unburned(6.0, 12.0, 1.5)


def test_effective_lewis_number_weights_the_deficient_reactant():
    """Matalon, Cui & Bechtold (2003): the mean of the two at phi = 1, the deficient reactant's
    far from it (A = 1 + Ze (Phi - 1) large)."""
    assert fr.effective_lewis_number(1.2, 0.4, 10.0, 1.0) == pytest.approx(0.8)
    assert fr.effective_lewis_number(1.2, 0.4, 10.0, 100.0) == pytest.approx(0.4, abs=0.01)


def test_blend_lewis_number_by_heat_release():
    assert fr.blend_lewis_number_heat_release([0.9, 0.9], [1.0, 5.0]) == pytest.approx(0.9)
    # 10 % of the heat from hydrogen moves the fuel Lewis number a tenth of the way
    assert fr.blend_lewis_number_heat_release([0.3, 1.0], [1.0, 9.0]) == pytest.approx(0.93)


def test_zeldovich_number_recovers_an_arrhenius_activation_temperature():
    """m ~ exp(-E/(2 R T_ad)) (large-activation-energy theory): the fit returns E/R exactly."""
    T = [2000.0, 2030.0, 2060.0]
    m = [0.4 * math.exp(-15000.0 / t) for t in T]  # E/R = 30,000 K
    assert fr.zeldovich_number(m, T, 300.0, 2030.0) == pytest.approx(30000.0 * 1730.0 / 2030.0 ** 2)


def test_sivashinsky_thresholds():
    """Cellular below Ze (Le - 1) = -2, pulsating above 4 (1 + sqrt 3) (Sivashinsky 1977)."""
    assert fr.PULSATING_THRESHOLD == pytest.approx(10.928, abs=1e-3)
    assert fr.thermodiffusive_regime(10.0, 0.79) == "cellular"   # -2.1
    assert fr.thermodiffusive_regime(10.0, 0.81) == "stable"     # -1.9
    assert fr.thermodiffusive_regime(10.0, 2.08) == "stable"     # 10.8
    assert fr.thermodiffusive_regime(10.0, 2.1) == "pulsating"   # 11.0


def test_dilution_keeps_the_equivalence_ratio_and_steps_both_ways_when_it_can():
    X = {"CH4": 0.095, "O2": 0.19, "N2": 0.715}
    d = diluted(X, "N2", -0.015)
    assert d["CH4"] / d["O2"] == pytest.approx(0.5) and sum(d.values()) == pytest.approx(1.0)
    assert inert_steps(X, ["CH4", "O2", "N2"], 0.015) == ("N2", (-0.015, 0.015))
    # oxy-fuel: no N2 in the mixture, so it is only added
    assert inert_steps({"CH4": 1 / 3, "O2": 2 / 3}, ["CH4", "O2", "N2"], 0.015) == ("N2", (0.015, 0.03))


# ---- Lewis numbers from the mechanism's transport data (no flame needed)
def _le(mech, fuel, phi, o2_per_fuel):
    gas = solution(mech, "mixture-averaged")
    n_air = o2_per_fuel / phi
    total = 1 + n_air * 4.76
    X = {fuel: 1 / total, "O2": n_air / total, "N2": 3.76 * n_air / total}
    return lewis_numbers(gas, X, 300.0, 101325.0)


def test_lewis_numbers_of_common_fuels():
    """Textbook facts (e.g. Law, Combustion Physics 2006, ch. 10; values from memory): the
    Lewis number of the deficient reactant is about 0.3-0.4 for lean hydrogen-air, about 1
    (0.9-1.0) for lean methane-air and about 1.8-2 for lean propane-air."""
    le_h2, le_o2 = _le("h2o2.yaml", "H2", 0.5, 0.5)
    assert 0.25 < le_h2 < 0.45 and le_o2 > 1.0
    le_ch4, _ = _le("gri30.yaml", "CH4", 0.7, 2.0)
    assert 0.9 < le_ch4 < 1.05
    le_c3h8, _ = _le("gri30.yaml", "C3H8", 0.7, 5.0)
    assert 1.6 < le_c3h8 < 2.2


def test_blend_lewis_number_of_hydrogen_in_methane_follows_the_heat_release():
    """30 % hydrogen by volume releases about 12 % of the blend's heat (LHV 241.8 vs 802.3
    kJ/mol, NIST-JANAF): the fuel Lewis number moves about an eighth of the way to hydrogen's."""
    gas = solution("gri30.yaml", "mixture-averaged")
    assert lower_heating_value(gas, "H2") == pytest.approx(241.8e6 / 1e3, rel=0.01)   # J/mol
    assert lower_heating_value(gas, "CH4") == pytest.approx(802.3e6 / 1e3, rel=0.01)
    fuel = {"CH4": 0.7, "H2": 0.3}
    o2 = 0.7 * 2 + 0.3 * 0.5
    n_air = o2 / 0.7
    total = 1 + n_air * 4.76
    X = {**{k: v / total for k, v in fuel.items()}, "O2": n_air / total, "N2": 3.76 * n_air / total}
    le_blend, _ = lewis_numbers(gas, X, 300.0, 101325.0)
    gas.TPX = 300.0, 101325.0, X  # each fuel's own Lewis number in this mixture
    alpha = gas.thermal_conductivity / (gas.density * gas.cp_mass)
    D = dict(zip(gas.species_names, gas.mix_diff_coeffs))
    le_ch4, le_h2 = alpha / D["CH4"], alpha / D["H2"]
    share = (le_ch4 - le_blend) / (le_ch4 - le_h2)
    heat_share = 0.3 * 241.8 / (0.3 * 241.8 + 0.7 * 802.3)   # NIST-JANAF lower heats of combustion
    assert share == pytest.approx(heat_share, abs=0.005)


# ---- stored with each flame
def test_asking_for_the_zeldovich_pair_keeps_every_point_key(tmp_path):
    """The Zeldovich pair is stored apart from its point (sweep.extras): flames stored before
    [flame_response] was added keep their keys, whatever the inert step."""
    plain = write_h2_study(tmp_path, name="plain")
    off = write_h2_study(tmp_path, name="off")
    off.write_text(off.read_text() + "\n[flame_response]\nzeldovich = false\n")
    on = write_h2_study(tmp_path, name="on")
    on.write_text(on.read_text() + "\n[flame_response]\ninert_step = 0.02\n")
    keys = {name: [p.key for p in points(load_study(c))] for name, c in (("plain", plain), ("off", off), ("on", on))}
    assert keys["plain"] == keys["off"] == keys["on"]
    assert "zeldovich_inert_step" not in settings_of(load_study(on))


@pytest.fixture(scope="module")
def hydrogen(tmp_path_factory):
    folder = tmp_path_factory.mktemp("response")
    config = write_h2_study(folder, fractions="[1.0]", phis="[0.4, 1.0, 2.0]")
    config.write_text(config.read_text() + "\n[flame_response]\n")
    study = load_study(config)
    return study, {r["equivalence_ratio"]: r for r in run_study(study, out_dir=folder / "o", jobs=2).rows}, folder


def test_hydrogen_air_response(hydrogen):
    """Hydrogen-air (h2o2.yaml): Le_fuel well below 1; Ze larger toward the lean limit;
    Markstein number negative lean and positive rich, and lean flames cellular: the sign change
    of hydrogen-air Markstein numbers measured on spherical flames (Aung, Hassan & Faeth 1997,
    negative below about phi 0.7 at 1 atm, positive rich; from memory) and the cellular lean
    hydrogen flames they and Law's group photographed."""
    study, rows, _ = hydrogen
    lean, stoich, rich = rows[0.4], rows[1.0], rows[2.0]
    assert all(r["status"] == "ok" for r in (lean, stoich, rich))
    assert lean["lewis_number_fuel"] < 0.5
    assert lean["zeldovich_number"] > stoich["zeldovich_number"] > 0
    assert lean["effective_lewis_number"] < 0.6 < rich["effective_lewis_number"]
    assert lean["markstein_number_unburned"] < 0 < stoich["markstein_number_unburned"] < rich["markstein_number_unburned"]
    assert lean["instability"] == "cellular" and rich["instability"] == "stable"
    assert "thermodiffusively unstable" in lean["warnings"] and "thermodiffusively" not in rich["warnings"]
    # Markstein lengths of hydrogen-air at 1 atm are a fraction of a millimetre, negative when
    # lean (Aung, Hassan & Faeth 1997, above: about -0.3 to +0.6 mm over phi 0.3-5)
    for r in (lean, stoich, rich):
        assert math.copysign(1.0, r["markstein_length_mm"]) == math.copysign(1.0, r["markstein_number_unburned"])
        assert abs(r["markstein_length_mm"]) < 1.0


def test_a_new_inert_step_solves_only_the_pairs(hydrogen):
    """Another inert step: the sweep comes from the store, only the Zeldovich pairs are solved,
    and Ze moves by a few per cent at most (hydrogen-air, 0.005 -> 0.01: 2.3 % at phi 1,
    measured; methane-air 0.005 -> 0.015: under 1 %)."""
    study, rows, folder = hydrogen
    config = folder / "h2rig.toml"
    text = config.read_text()
    config.write_text(text.replace("[flame_response]\n", "[flame_response]\ninert_step = 0.01\n"))
    try:
        again = run_study(load_study(config), out_dir=folder / "o", jobs=2)
    finally:
        config.write_text(text)
        run_study(study, out_dir=folder / "o", jobs=1)  # the folder's study copy back (nothing solved)
    assert again.solved == 0
    for r in again.rows:
        assert r["zeldovich_number"] == pytest.approx(rows[r["equivalence_ratio"]]["zeldovich_number"], rel=0.05)


def test_the_response_columns_reach_the_csv(hydrogen):
    study, _, folder = hydrogen
    r = run_cli("charts", folder / "o")
    assert r.returncode == 0, r.stderr
    from flamecharts.outputs.tables import write_csv
    from flamecharts.results import rows_from_dir

    _, rows = rows_from_dir(folder / "o")
    path = write_csv(rows, folder / "o" / "results.csv")
    with open(path, newline="") as fh:
        got = list(csv.DictReader(fh))
    assert {"zeldovich_number", "effective_lewis_number", "markstein_number_unburned", "instability"} <= set(got[0])
    assert sorted(r["instability"] for r in got) == ["cellular", "stable", "stable"]


@pytest.mark.slow
def test_methane_air_zeldovich_numbers(tmp_path):
    """GRI-Mech 3.0 methane-air: Ze near stoichiometric in the published range of about 8-12
    (from memory; e.g. Law, Combustion Physics 2006, ch. 7), rising toward the lean limit; lean
    methane-air is thermodiffusively stable with a positive Markstein number (Tseng, Ismail &
    Faeth 1993; Gu et al. 2000: positive Markstein numbers of lean methane-air, from memory)."""
    config = tmp_path / "ch4.toml"
    # coarse grids: Ze is a difference quotient of two flames on like grids, and the bands are wide
    config.write_text('title = "methane response"\nmechanism = "gri30.yaml"\nresolution = "coarse"\n'
                      '[fuels]\nmethane = { CH4 = 1.0 }\n'
                      '[oxidizers]\nair = { O2 = 1.0, N2 = 3.76 }\n[sweep]\nfuel = ["methane"]\noxidizer = ["air"]\n'
                      'equivalence_ratio = [0.6, 1.0]\n[flame_response]\n')
    study = load_study(config)
    rows = {r["equivalence_ratio"]: r for r in run_study(study, out_dir=tmp_path / "o", jobs=2).rows}
    assert 8.0 < rows[1.0]["zeldovich_number"] < 12.0
    assert rows[0.6]["zeldovich_number"] > rows[1.0]["zeldovich_number"]
    assert rows[0.6]["markstein_number_unburned"] > 0 and rows[0.6]["instability"] == "stable"
    assert len(points(study)) == 2
