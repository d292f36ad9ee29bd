"""One flame: invariants, agreement with an independent plain Cantera solve, warm start, no-flame."""
import cantera as ct
import numpy as np
import pytest

from flamecharts.chemistry import flame
from flamecharts.physics import mixtures

AIR = {"O2": 1.0, "N2": 3.76}


@pytest.fixture(scope="module")
def gas():
    return ct.Solution("h2o2.yaml")


def h2_air(phi):
    return mixtures.unburned_mixture({"H2": 1}, AIR, phi, 0.5)


@pytest.fixture(scope="module")
def stoich(gas):
    return flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(1.0), "mixture-averaged", False,
                             flame.NUMERICS["standard"])


def test_standard_flame_is_ok_and_plain(stoich):
    assert stoich["status"] == "ok" and stoich["start"] == "fresh"
    m = stoich["metrics"]
    assert all(isinstance(v, (int, float, type(None))) for k, v in m.items() if k != "grid_convergence")
    assert m["grid_convergence"] in ("monotone", "oscillating", "two grids")  # plain text, JSON-ready
    assert set(stoich["profile"]) == {"grid", "T", "velocity", "Y", "species", "P"}


def test_agrees_with_an_independent_plain_cantera_solve(gas, stoich):
    # Reference: Cantera's FreeFlame driven directly, as its documentation shows
    # (automatic solve), at a grid twice as fine as the tool's standard setting.
    # The tool must agree within its stated accuracy (1 % flame speed, 3 % thickness).
    gas.TPX = 300.0, ct.one_atm, h2_air(1.0)
    f = ct.FreeFlame(gas, width=0.03)
    f.transport_model = "mixture-averaged"
    f.set_refine_criteria(ratio=2, slope=0.01, curve=0.02)
    f.solve(loglevel=0, auto=True)
    m = stoich["metrics"]
    assert m["laminar_flame_speed_m_s"] == pytest.approx(f.velocity[0], rel=0.01)
    dT = (f.T[-1] - f.T[0]) / np.max(np.abs(np.diff(f.T) / np.diff(f.grid)))
    assert m["thermal_thickness_m"] == pytest.approx(dT, rel=0.03)


def test_mass_flux_is_constant_through_the_flame(gas):
    # Invariant of the steady 1D equations: rho*u is the same at every grid point.
    gas.TPX = 300.0, ct.one_atm, h2_air(0.8)
    f = flame._solve_fresh(ct, gas, 300.0, ct.one_atm, h2_air(0.8), "mixture-averaged", False,
                           flame.NUMERICS["coarse"])
    mdot = f.density * f.velocity
    assert np.ptp(mdot) / mdot.mean() < 1e-6


def test_burned_temperature_matches_hp_equilibrium(stoich):
    m = stoich["metrics"]
    assert m["adiabatic_flame_temperature_K"] == pytest.approx(m["equilibrium_temperature_K"], rel=0.01)
    # Stoichiometric H2-air, 298 K: 2383 K (Turns, An Introduction to Combustion, table of
    # adiabatic flame temperatures; from memory); we start at 300 K, so +2 K, and allow 15 K.
    assert m["equilibrium_temperature_K"] == pytest.approx(2385, abs=15)


def test_thickness_measures_are_ordered(stoich):
    m = stoich["metrics"]
    # diffusive < reaction zone < thermal thickness (Poinsot & Veynante 2005, sec. 2.5)
    assert m["diffusive_thickness_m"] < m["reaction_zone_thickness_m"] < m["thermal_thickness_m"]


def test_expansion_ratio_is_the_equilibrium_density_ratio(gas, stoich):
    # Cantera's HP equilibrium of the same mixture (a reference computation apart from the
    # flame solver): stoichiometric H2-air, 300 K, 1 atm, h2o2.yaml gives rho_u/rho_b = 6.86.
    # The flame's burned end lies within 1 % of the equilibrium temperature (test above).
    gas.TPX = 300.0, ct.one_atm, h2_air(1.0)
    rho_u = gas.density
    gas.equilibrate("HP")
    assert stoich["metrics"]["expansion_ratio"] == pytest.approx(rho_u / gas.density, rel=0.015)


def test_warm_start_gives_the_fresh_answer(gas, stoich):
    fresh = flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(1.2), "mixture-averaged", False,
                              flame.NUMERICS["standard"])
    warm = flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(1.2), "mixture-averaged", False,
                             flame.NUMERICS["standard"], warm=stoich["profile"])
    assert warm["start"] == "warm" and warm["status"] == "ok"
    assert warm["metrics"]["laminar_flame_speed_m_s"] == pytest.approx(
        fresh["metrics"]["laminar_flame_speed_m_s"], rel=3e-3)


def test_warm_start_across_pressure_and_temperature(gas, stoich):
    r = flame.solve_flame(gas, 400.0, 2 * ct.one_atm, h2_air(1.0), "mixture-averaged", False,
                          flame.NUMERICS["standard"], warm=stoich["profile"])
    fresh = flame.solve_flame(gas, 400.0, 2 * ct.one_atm, h2_air(1.0), "mixture-averaged", False,
                              flame.NUMERICS["standard"])
    # the neighbour's profile is moved to the new preheat: it stays a warm start (a profile
    # left at 300 K against a 400 K inlet made the grid refiner run away to its ceiling)
    assert r["status"] == "ok" and r["start"] == "warm"
    assert r["metrics"]["laminar_flame_speed_m_s"] == pytest.approx(
        fresh["metrics"]["laminar_flame_speed_m_s"], rel=3e-3)


def test_warm_start_solves_on_a_coarse_grid_first(gas, stoich):
    # flame._solve_warm: the first Newton solve runs on about a quarter of the points (the
    # neighbour's grid at stride Numerics.warm_stride, refined at the first-stage criteria),
    # the last on the full grid settled on that coarse solution
    num = flame.NUMERICS["standard"]
    f = flame._solve_warm(ct, gas, 300.0, ct.one_atm, h2_air(1.2), "mixture-averaged", False, num,
                          stoich["profile"])
    grids = list(f.grid_size_stats)
    assert len(grids) >= 2
    assert grids[0] < 0.5 * len(stoich["profile"]["grid"]) and grids[0] < 0.5 * grids[-1]


def test_warm_start_from_a_neighbour_with_few_points(gas, stoich):
    # an 8-point neighbour: the coarse first grid keeps all of it (flame.warm_stride); at
    # stride 4 only three points were left, the fixed-temperature point fell on the inlet
    # and the warm start failed into a fresh solve (checked: "warm start failed, solved fresh")
    nb = dict(stoich["profile"])
    pick = np.unique(np.r_[np.linspace(0, len(nb["grid"]) - 1, 8).astype(int)])
    for k in ("grid", "T", "velocity"):
        nb[k] = np.asarray(nb[k])[pick]
    nb["Y"] = np.asarray(nb["Y"])[:, pick]
    r = flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(1.1), "mixture-averaged", False,
                          flame.NUMERICS["standard"], warm=nb)
    assert r["status"] == "ok" and r["start"] == "warm"


def test_regridded_profile_meets_the_criteria_and_keeps_the_neighbours_values(gas, stoich):
    # flame._regrid / flame._settle: Cantera's refiner, run again on the settled grid, adds no
    # point, and at the neighbour's own grid points the guess is the neighbour's value
    num = flame.NUMERICS["standard"]
    gas.TPX = 300.0, ct.one_atm, h2_air(1.0)
    f = flame._make_flame(ct, gas, num.width_m, "mixture-averaged", False, num)
    flame._set_criteria(f, num.stages[-1], num.prune)
    flame._regrid(f, flame._initial_guess(ct, gas, stoich["profile"], ct.one_atm), stride=4)
    n = len(f.grid)
    f.refine(loglevel=0)
    assert len(f.grid) == n
    x_nb, T_nb = stoich["profile"]["grid"], stoich["profile"]["T"]
    common = np.isin(np.round(f.grid, 12), np.round(x_nb, 12))
    assert common.sum() >= len(x_nb) // 4
    assert np.allclose(f.T[common], np.interp(f.grid[common], x_nb, T_nb), rtol=1e-9)


def test_far_beyond_the_lean_limit_is_recorded_not_raised(gas):
    # Hydrogen-air below about 4 % H2 does not propagate upward (Coward & Jones, US Bureau
    # of Mines Bulletin 503, 1952); phi 0.05 is 2 % H2.
    r = flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(0.05), "mixture-averaged", False,
                          flame.NUMERICS["coarse"])
    assert r["status"] in ("no_flame", "failed")
    assert r["metrics"] is None or r["status"] == "no_flame"
    assert r["message"]


def test_warm_start_that_fails_falls_back_to_fresh(gas, stoich):
    bad = dict(stoich["profile"])
    bad["T"] = np.full_like(bad["T"], 300.0)  # a cold "neighbour": no flame to continue from
    bad["velocity"] = np.full_like(bad["velocity"], 1e-6)
    r = flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(1.0), "mixture-averaged", False,
                          flame.NUMERICS["standard"], warm=bad)
    assert r["status"] == "ok"
    assert r["metrics"]["laminar_flame_speed_m_s"] == pytest.approx(
        stoich["metrics"]["laminar_flame_speed_m_s"], rel=3e-3)


def test_classify_no_flame():
    status, msg = flame.classify({"laminar_flame_speed_m_s": 1e-5, "max_temperature_K": 310.0,
                                  "equilibrium_temperature_K": 1500.0,
                                  "adiabatic_flame_temperature_K": 310.0}, 300.0)
    assert status == "no_flame" and "non-burning" in msg


@pytest.mark.parametrize("transport,soret", [("multicomponent", True), ("unity-Lewis-number", False)])
def test_other_transport_models_solve(transport, soret):
    gas = ct.Solution("h2o2.yaml", transport_model="mixture-averaged")
    r = flame.solve_flame(gas, 300.0, ct.one_atm, h2_air(1.0), transport, soret, flame.NUMERICS["coarse"])
    assert r["status"] == "ok"
    assert 1.5 < r["metrics"]["laminar_flame_speed_m_s"] < 3.0


def test_monotone_cubic_matches_scipy_pchip():
    # Reference: scipy.interpolate.PchipInterpolator (Fritsch & Butland 1984 slopes, the
    # three-point shape-preserving end slopes), a general reference library.
    PchipInterpolator = pytest.importorskip("scipy.interpolate").PchipInterpolator

    rng = np.random.default_rng(7)
    x = np.cumsum(rng.uniform(0.01, 1.0, 40))
    table = np.column_stack([np.tanh(x - x.mean()), rng.uniform(0, 1, 40), np.full(40, 0.3),
                             np.r_[np.zeros(20), np.ones(20)]])
    x_new = np.linspace(x[0], x[-1], 997)
    ours = flame.monotone_cubic(x, table, x_new)
    assert ours == pytest.approx(PchipInterpolator(x, table, axis=0)(x_new), abs=1e-12)
    # no overshoot: a step stays inside [0, 1]
    assert ours[:, 3].min() >= 0.0 and ours[:, 3].max() <= 1.0
    two = flame.monotone_cubic([0.0, 2.0], [1.0, 3.0], [0.5, 2.0])
    assert two == pytest.approx([1.5, 3.0])
    # tiny slopes (product underflows) still take the harmonic mean, as scipy does
    tiny = np.array([1.0, 2.0, 4.0, 8.0, 16.0]) * 1e-200
    assert flame.monotone_cubic(np.arange(5.0), tiny, [1.5])[0] == pytest.approx(
        float(PchipInterpolator(np.arange(5.0), tiny)(1.5)), rel=1e-12)
    with pytest.raises(ValueError):
        flame.monotone_cubic([0.0, 1.0, 1.0], [0.0, 1.0, 2.0], [0.5])
