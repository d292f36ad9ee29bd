"""Error bars of every flame: the numerical (grid) estimate and the kinetic band.

The grid estimate is checked against grid-converged flames (tests/benchmarks/grid_convergence.py:
each flame refined to 4000-5000 points and extrapolated, docs/benchmarks.md); the adjoint
sensitivities against brute-force finite differences of the same flame; the ranking of
reactions against textbook facts; the study-level outputs on small h2o2 studies.
"""
import csv
import math

import cantera as ct
import numpy as np
import pytest

from flamecharts import load_study, open_results, run
from flamecharts.chemistry import flame
from flamecharts.chemistry.mechanism import reaction_equations, solution
from flamecharts.chemistry.sensitivity import flame_speed_sensitivities
from flamecharts.errors import ConfigError
from flamecharts.physics import kinetic_uncertainty as ku, mixtures
from flamecharts.physics.grid_error import MIN_INDEX, grid_convergence_index, placement_floor
from flamecharts.physics.rate_factors import RATE_FACTORS, SIGMAS_PER_FACTOR

from conftest import write_h2_study

AIR = {"O2": 1.0, "N2": 3.76}


def _air_mixture(mech: str, fuel: dict, phi: float) -> dict:
    gas = solution(mech)
    atoms = {s.name: s.composition for s in gas.species()}
    return mixtures.unburned_mixture(fuel, AIR, phi, mixtures.stoich_o2_per_fuel(atoms, fuel))


def _flame(mech: str, fuel: dict, phi: float, resolution: str = "standard", P: float = 1e5, T_u: float = 300.0):
    gas = solution(mech, "mixture-averaged")
    X = _air_mixture(mech, fuel, phi)
    return gas, X, flame.solve_flame(gas, T_u, P, X, "mixture-averaged", False, flame.NUMERICS[resolution])


# ---- the grid convergence index (pure)
def test_gci_oscillating_and_two_grids_give_no_extrapolation():
    """Roache (1998, ch. 5): outside monotone convergence no Richardson value, factor of safety 3."""
    osc = grid_convergence_index(100.0, 100.2, 99.9)
    assert osc["convergence"] == "oscillating" and osc["extrapolated"] is None
    assert osc["index"] == pytest.approx(3 * 0.3 / 100.0)
    two = grid_convergence_index(100.0, 100.4, None)
    assert two["convergence"] == "two grids" and two["index"] == pytest.approx(3 * 0.4 / 100.0)


def test_gci_bounds_the_order_and_never_claims_less_than_its_floor():
    # a ratio of changes of 16 would be order 4: bounded to the scheme's formal order 1
    # (Roache 2011: do not credit an observed order above it), so the band is wider, not narrower
    g = grid_convergence_index(100.0, 100.01, 100.17)
    assert g["order"] == 1.0 and g["index"] == pytest.approx(MIN_INDEX)
    g = grid_convergence_index(50.0, 50.5, 52.0)  # observed order log2(3) = 1.58, credited as 1
    assert g["order"] == 1.0 and g["index"] == pytest.approx(1.25 * 0.5 / 50.0)
    g = grid_convergence_index(100.0, 100.2, 100.3)  # changes shrink by half the wrong way: order -1, bounded to 0.5
    assert g["order"] == 0.5 and g["index"] == pytest.approx(1.25 * 0.2 / (2 ** 0.5 - 1) / 100.0)
    # and never below the spread two valid grids of this size can have: 0.3 % at 942 points, as 1/N
    g = grid_convergence_index(100.0, 100.01, 100.02, floor=placement_floor(471))
    assert g["index"] == pytest.approx(0.006)


# ---- the per-flame estimate against grid-converged flames
#: Grid-converged S_L [cm/s] of h2o2 hydrogen-air at 1 bar, 300 K: tests/benchmarks/grid_convergence.py,
#: reference grids of 4000-4700 points extrapolated with the observed order (docs/benchmarks.md).
GRID_CONVERGED_CM_S = {0.4: 16.584, 0.5: 44.011, 2.0: 301.145}


@pytest.mark.parametrize("phi", sorted(GRID_CONVERGED_CM_S))
def test_numerical_estimate_bounds_the_true_error(phi):
    _, _, r = _flame("h2o2.yaml", {"H2": 1.0}, phi)
    m = r["metrics"]
    true = abs(m["laminar_flame_speed_m_s"] * 100 / GRID_CONVERGED_CM_S[phi] - 1)
    est = m["flame_speed_numerical_error"]
    assert true <= est <= max(8 * true, 5 * MIN_INDEX), (phi, true, est)
    assert m["grid_convergence"] in ("monotone", "oscillating")
    assert 0 < m["thermal_thickness_numerical_error"] < 0.03


def test_estimate_leaves_the_flame_as_it_was():
    """The coarsened solves must not change the flame that is measured and stored."""
    gas, X, r = _flame("h2o2.yaml", {"H2": 1.0}, 0.8)
    assert len(r["profile"]["grid"]) == r["metrics"]["grid_points"]
    assert r["profile"]["velocity"][0] == pytest.approx(r["metrics"]["laminar_flame_speed_m_s"], rel=1e-12)


# ---- adjoint sensitivities
def test_adjoint_sensitivities_match_finite_differences():
    """Each of the five largest s_i = d ln S_L / d ln k_i against central differences of the
    same flame on the same grid (k_i scaled by 1.005 and 1/1.005, solved again with tolerances
    tight enough that the solver's own error stays below 1 % of the difference; 1.02 gives the
    same to 4 digits). Measured: the adjoint is 2.3-5.2 % larger in magnitude than the converged
    differences (H2 + OH 0.2237 / 0.2187, H + O2 0.1662 / 0.1580), "within a few percent"."""
    gas, X, r = _flame("h2o2.yaml", {"H2": 1.0}, 1.0)
    num = flame.NUMERICS["standard"]
    s = np.array(flame_speed_sensitivities(gas, 300.0, 1e5, X, "mixture-averaged", False, r["profile"],
                                           num)["sensitivities"])
    gas.TPX = 300.0, 1e5, X
    f = flame._make_flame(ct, gas, 0.01, "mixture-averaged", False, num)
    f.set_initial_guess(data=flame._initial_guess(ct, gas, r["profile"], 1e5, 300.0))
    f.P = 1e5
    f.flame.set_steady_tolerances(default=(1e-9, 1e-15))
    f.solve(loglevel=0, refine_grid=False, auto=False)
    base = f.to_array()
    for i in np.argsort(-np.abs(s))[:5]:
        speeds = []
        for m in (1.005, 1 / 1.005):
            gas.set_multiplier(m, i)
            f.from_array(base)
            f.solve(loglevel=0, refine_grid=False, auto=False)
            speeds.append(f.velocity[0])
        gas.set_multiplier(1.0, i)
        fd = math.log(speeds[0] / speeds[1]) / (2 * math.log(1.005))
        assert s[i] == pytest.approx(fd, rel=0.06), reaction_equations("h2o2.yaml")[i]


def test_hydrogen_air_ranks_the_branching_reaction_high():
    """H + O2 <=> O + OH, the chain-branching step, is among the three reactions the flame speed
    of stoichiometric hydrogen-air is most sensitive to, with a positive sign (Law, Combustion
    Physics, 2006, ch. 7; from memory). Measured here: both hydrogen mechanisms that ship with
    Cantera (h2o2, Alzueta 2023) rank OH + H2 <=> H + H2O first at phi 1, so 'the most
    sensitive' is asked of methane only (test below)."""
    gas, X, r = _flame("h2o2.yaml", {"H2": 1.0}, 1.0)
    s = flame_speed_sensitivities(gas, 300.0, 1e5, X, "mixture-averaged", False, r["profile"],
                                  flame.NUMERICS["standard"])["sensitivities"]
    groups = ku.grouped(reaction_equations("h2o2.yaml"), s)
    assert list(groups)[:3].count("H + O2 <=> O + OH") == 1 and groups["H + O2 <=> O + OH"] > 0


@pytest.mark.slow
def test_methane_air_is_most_sensitive_to_h_plus_o2():
    """Stoichiometric methane-air: H + O2 <=> O + OH first, CH3 + H (+M) <=> CH4 (+M) negative
    (chain terminating) among the top three (Law, Combustion Physics, 2006, ch. 7; Warnatz, Maas &
    Dibble, Combustion, 4th ed., 2006; from memory). The band is of the order of the spread of
    published mechanisms' S_L near stoichiometric (a few percent; see docs/error-bars.md)."""
    gas, X, r = _flame("gri30.yaml", {"CH4": 1.0}, 1.0, resolution="coarse")
    s = flame_speed_sensitivities(gas, 300.0, 1e5, X, "mixture-averaged", False, r["profile"],
                                  flame.NUMERICS["coarse"])["sensitivities"]
    groups = ku.grouped(reaction_equations("gri30.yaml"), s)
    top = list(groups)
    assert top[0] == "H + O2 <=> O + OH" and groups[top[0]] > 0.15
    assert ku.reaction_key("CH3 + H (+M) <=> CH4 (+M)") in top[:3] and groups[ku.reaction_key("CH3 + H (+M) <=> CH4 (+M)")] < 0
    factors = [RATE_FACTORS.get(k, (2.0,))[0] for k in groups]
    band = ku.flame_speed_band(list(groups.values()), factors, SIGMAS_PER_FACTOR)
    assert 0.02 < band < 0.15


# ---- the packaged table
def test_rate_factor_table_names_real_reactions():
    """Every packaged reaction is one GRI-Mech 3.0 has, with f between 1 and 10 and a source."""
    keys = {ku.reaction_key(e) for e in reaction_equations("gri30.yaml")}
    for key, (f, source) in RATE_FACTORS.items():
        assert key in keys, key
        assert 1.0 < f <= 10.0 and source


# ---- a study with [uncertainty]
UNCERTAINTY = """
[uncertainty]
factors = { "H + O2 <=> O + OH" = 1.5 }
default_factor = 2.0
error_bars = true
"""


def test_study_with_uncertainty_writes_bands_sensitivities_and_chart(tmp_path):
    cfg = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.6, 1.0]", extra=UNCERTAINTY)
    res = run(cfg, out=tmp_path / "out", jobs=1)
    rows = [r for r in res.rows if r["status"] == "ok"]
    assert rows and all(r["flame_speed_kinetic_uncertainty_percent"] > 0 for r in rows)
    assert all(r["flame_speed_numerical_error_percent"] > 0 for r in rows)
    with open(tmp_path / "out" / "sensitivities.csv") as fh:
        sens = list(csv.DictReader(fh))
    h_o2 = [s for s in sens if s["reaction"] == "H + O2 <=> O + OH"]
    assert h_o2 and all(s["uncertainty_factor"] == "1.5" and s["factor_source"] == "study" for s in h_o2)
    import matplotlib.image as mpimg
    for name in ("flame_speed_sensitivity", "flame_speed_vs_equivalence_ratio"):
        png = tmp_path / "out" / "charts" / f"{name}.png"
        assert np.asarray(mpimg.imread(png)).std() > 0.05, name
        svg = png.with_suffix(".svg").read_text()
        assert "not certification" in svg and svg.count("[") >= 2
    assert "kinetic uncertainty, 1 sigma" in (tmp_path / "out" / "charts" / "flame_speed_vs_equivalence_ratio.svg").read_text()
    report = (tmp_path / "out" / "report.html").read_text()
    assert "± " in report and "kinetics (1σ)" in report and "numerics" in report
    # the variance shares of one point (s ln f / k)^2 over their sum: the ten largest carry most
    r = rows[0]
    mine = [s for s in sens if float(s["equivalence_ratio"]) == r["equivalence_ratio"]]
    share = sum(float(s["variance_share_percent"]) for s in mine)
    assert 80 < share <= 100.0 + 1e-6  # the top ten carry most of the variance
    # read back without solving: same band; asking again solves no sensitivity
    again = open_results(tmp_path / "out")
    assert [x["flame_speed_kinetic_uncertainty_percent"] for x in again.rows if x["status"] == "ok"] == \
        [x["flame_speed_kinetic_uncertainty_percent"] for x in rows]
    res2 = run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    assert res2.summary.solved == 0 and res2.summary.solve_seconds == 0.0
    # the study no longer asks for the band: its table, chart and report section go with it
    cfg.write_text(cfg.read_text().replace(UNCERTAINTY.strip(), ""))
    run(cfg, out=tmp_path / "out", jobs=1)
    assert not (tmp_path / "out" / "sensitivities.csv").exists()
    assert not (tmp_path / "out" / "charts" / "flame_speed_sensitivity.png").exists()
    assert "flame_speed_sensitivity" not in (tmp_path / "out" / "report.html").read_text()


def test_changing_a_factor_solves_nothing_and_moves_the_band(tmp_path):
    cfg = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]", extra=UNCERTAINTY)
    first = run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    cfg.write_text(cfg.read_text().replace('= 1.5 }', '= 3.0 }'))
    second = run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    assert second.summary.solve_seconds == 0.0
    a, b = (r.rows[0]["flame_speed_kinetic_uncertainty_percent"] for r in (first, second))
    assert b > a


@pytest.mark.parametrize("table, message", [
    ('[uncertainty]\nfactors = { "H + O2 <=> HO2 + OH" = 1.5 }', "H + O2 <=> HO2 + OH"),
    ('[uncertainty]\nfactors = { "H + O2 <=> O + OH" = 0.5 }', "allowed: a number from 1"),
    ('[uncertainty]\ndefault_factor = 500', "uncertainty.default_factor"),
    ('[uncertainty]\nkinetic = true', "uncertainty.kinetic"),
    ('[uncertainty]\nfactors = { "H + O2 <=> O + OH" = 1.3, "O + OH <=> H + O2" = 2.0 }', "same reaction twice"),
    ('[uncertainty]\ndefault_factor = 0', "allowed: 1 to 100"),
])
def test_bad_uncertainty_tables_are_refused_in_one_line(tmp_path, table, message):
    cfg = write_h2_study(tmp_path, extra=table)
    with pytest.raises(ConfigError, match=None) as err:
        load_study(cfg)
    assert message in str(err.value) and "\n" not in str(err.value)
