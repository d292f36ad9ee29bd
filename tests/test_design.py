"""Indicators, reference ratios, gas properties and burner margins on solved hydrogen studies."""
import pytest

from flamecharts import load_study, run_study
from flamecharts.design import fuel_gas, fuel_gas_table, port_flow
from flamecharts.physics.gasprops import ISO6976_2016, L_WATER
from flamecharts.sweep.points import points
from flamecharts.sweep.worker import fresh_mixture

from conftest import write_h2_study

BURNER_INPUT = """
[burner]
name = "test slot burner"
port = "round"
port_diameter_mm = 1.0
port_area_mm2 = 50.0
thermal_input_kW = 0.5
min_flashback_margin = 1.5
min_blowoff_margin = 1.2
"""


def _rows(tmp_path, burner, **kw):
    config = write_h2_study(tmp_path, **kw)
    config.write_text(config.read_text() + burner)
    study = load_study(config)
    return study, run_study(study, out_dir=tmp_path / "o", jobs=2).rows


def _rerun(tmp_path, old: str, new: str):
    """The study of ``_rows`` read again with its burner changed (``old`` replaced by ``new``):
    every flame comes from the store, only the design read-out is new."""
    config = next(tmp_path.glob("*.toml"))
    config.write_text(config.read_text().replace(old, new))
    summary = run_study(load_study(config), out_dir=tmp_path / "o", jobs=1)
    assert summary.solved == 0
    return summary.rows


@pytest.fixture(scope="module")
def fixed_input_dir(tmp_path_factory):
    path = tmp_path_factory.mktemp("fi")
    return path, _rows(path, BURNER_INPUT, phis="[0.8, 1.0]")


@pytest.fixture(scope="module")
def fixed_input(fixed_input_dir):
    return fixed_input_dir[1]


def test_fixed_thermal_input_port_velocity_by_hand(fixed_input):
    study, rows = fixed_input
    # Energy balance, independent of how the code gets the velocity: the hydrogen carried through
    # the port at the stated velocity must release the stated 0.5 kW at its lower heating value,
    # rho_u U A Y_H2 LHV_H2 = 500 W. Mixture by Cantera's set_equivalence_ratio; LHV of H2 at
    # 15 degC from ISO 6976:2016 (superior value 286.15 kJ/mol, less the latent heat of
    # the water it forms); the diluted fuel is 0.6 H2 + 0.4 N2 in air.
    import cantera as ct

    g = ct.Solution("h2o2.yaml")
    M_H2 = ISO6976_2016["H2"][0]
    lhv_J_kg = (ISO6976_2016["H2"][2][15] - L_WATER[15]) / M_H2 * 1e6
    for r in (r for r in rows if r["blend_fraction"] == 0.0):
        g.TP = 300.0, 1e5  # the study sweeps 1.0 bar
        g.set_equivalence_ratio(r["equivalence_ratio"], {"H2": 0.6, "N2": 0.4}, {"O2": 1.0, "N2": 3.76})
        heat_W = g.density * r["port_velocity_m_s"] * 50e-6 * g["H2"].Y[0] * lhv_J_kg
        assert heat_W == pytest.approx(500.0, rel=2e-3), r["equivalence_ratio"]
        assert r["thermal_input_kW"] == pytest.approx(0.5)


def test_adding_hydrogen_to_methane_at_fixed_input_raises_port_velocity(tmp_path):
    # Hydrogen carries about a third of methane's heating value per m3 (ISO 6976), so at a
    # fixed thermal input the fuel and mixture volume flows, and so the port velocity, rise.
    # The port flow needs no flame (design.port_flow on the fresh mixture, as `check` reads it);
    # that hydrogen's faster flame raises the flashback gradient at the same velocity is checked on
    # GRI-Mech 3.0 flames in tests/test_validation.py and on the rig above (flashback_gradient_ratio).
    config = tmp_path / "ng.toml"
    config.write_text("""
mechanism = "gri30.yaml"
resolution = "coarse"
[fuels]
methane = { CH4 = 1.0 }
hydrogen = { H2 = 1.0 }
[oxidizers]
air = { O2 = 1.0, N2 = 3.76 }
[sweep]
fuel = ["methane"]
oxidizer = ["air"]
blend = { with = "hydrogen", fraction = [0.0, 0.3] }
equivalence_ratio = [1.0]
""" + BURNER_INPUT)
    study = load_study(config)
    flows = []
    for p in points(study):
        r = {"equivalence_ratio": p.phi, **fresh_mixture(study.mechanism_path, study.mechanism_sha256, p.X_unburned,
                                                        p.T_u, p.P)}
        flows.append(port_flow(study, r, fuel_gas(study, p.fuel, p.blend_fraction, p.oxidizer)))
    (u0, q0, _), (u3, q3, _) = flows
    assert u3 > u0 and q0 == q3 == pytest.approx(500.0)  # W, the burner's 0.5 kW


def test_margins_verdict_and_reference_ratios(fixed_input_dir):
    path, (study, rows) = fixed_input_dir
    # the same flow through a port of twice the diameter (same area, so the same velocity):
    # the wall gradient 8U/D halves (Poiseuille), so the flashback margin and the quench
    # ratio (quenching diameter over port diameter) halve with it
    wide = {(r["blend_fraction"], r["equivalence_ratio"]): r
            for r in _rerun(path, "port_diameter_mm = 1.0", "port_diameter_mm = 2.0")}
    _rerun(path, "port_diameter_mm = 2.0", "port_diameter_mm = 1.0")
    for r in rows:
        w = wide[(r["blend_fraction"], r["equivalence_ratio"])]
        assert w["port_velocity_m_s"] == pytest.approx(r["port_velocity_m_s"], rel=1e-12)
        assert w["flashback_margin"] == pytest.approx(r["flashback_margin"] / 2, rel=1e-9)
        assert w["quench_ratio"] == pytest.approx(r["quench_ratio"] / 2, rel=1e-9)
        # the verdict turns on min_flashback_margin = 1.5 of the study, for either port
        for row in (r, w):
            assert ("flashback risk" in row["verdict"]) == (row["flashback_margin"] < 1.5), row["verdict"]
        # hydrogen-air (Le of the fuel about 0.3): Reed's constant is not assessed (physics.validity)
        assert r["lewis_number_fuel"] < 0.8 and r["blowoff_margin"] is None
        assert r["criteria_not_assessed"].startswith("blowoff: Lewis number 0.")
        assert r["verdict"].endswith("blowoff not assessed")
        assert r["reference"] == "diluted"
        # each ratio is taken against the undiluted-blend row of the same phi, not any other row
        ref = next(x for x in rows if x["blend_fraction"] == 0.0 and x["equivalence_ratio"] == r["equivalence_ratio"])
        assert r["flame_speed_ratio"] == pytest.approx(r["laminar_flame_speed_m_s"] / ref["laminar_flame_speed_m_s"])
        if r["blend_fraction"] > 0.0:  # more hydrogen: faster flame, steeper flashback gradient, shorter quench distance
            assert r["flame_speed_ratio"] > 1.0 and r["flashback_gradient_ratio"] > 1.0
            assert r["quenching_distance_ratio"] < 1.0
    assert {r["verdict"] for r in rows} | {w["verdict"] for w in wide.values()} >= {"ok on flashback only; blowoff not assessed"}


def test_input_follows_wobbe_at_fixed_supply_pressure(tmp_path):
    burner = BURNER_INPUT + "input_follows_wobbe = true\n"
    study, rows = _rows(tmp_path, burner.replace("[burner]", "[gas_quality]\nwobbe_tolerance_percent = 5.0\n\n[burner]"),
                        phis="[1.0]")
    gases = {g["blend_fraction"]: g for g in fuel_gas_table(study)}
    for r in rows:
        g = gases[r["blend_fraction"]]
        # orifice flow at a fixed supply pressure: the input follows the Wobbe index (the ratio
        # itself is checked against the standard's test gases below)
        assert (r["thermal_input_kW"] == pytest.approx(0.5)) == (r["blend_fraction"] == 0.0)
        assert r["wobbe_in_band"] == (abs(g["wobbe_change_percent"]) <= 5.0)


def test_input_through_a_fixed_nozzle_follows_the_lower_wobbe_index_of_the_test_gases():
    """EN 437 test gases (15 degC, 1013.25 mbar; values from memory): G20 (methane) Wi 45.67,
    Ws 50.72 MJ/m3; G222 (77 % methane, 23 % hydrogen) Wi 42.87, Ws 47.87 MJ/m3. A nozzle at a
    fixed supply pressure passes a thermal input on the lower heating value proportional to
    the lower Wobbe index: 42.87/45.67 = 0.9387 (the higher index's ratio would be 0.9438)."""
    from flamecharts.config import study_from_dict
    from flamecharts.design import fuel_gas

    study = study_from_dict({
        "mechanism": "gri30.yaml", "fuels": {"methane": {"CH4": 1.0}, "hydrogen": {"H2": 1.0}},
        "oxidizers": {"air": {"O2": 1.0, "N2": 3.76}},
        "sweep": {"fuel": ["methane"], "oxidizer": ["air"], "equivalence_ratio": [1.0],
                  "blend": {"with": "hydrogen", "fraction": [0.0, 0.23]}},
        "burner": {"port": "round", "port_diameter_mm": 1.0, "port_area_mm2": 50.0, "thermal_input_kW": 0.5,
                   "input_follows_wobbe": True}})
    g20, g222 = (fuel_gas(study, "methane", f, "air") for f in (0.0, 0.23))
    for gas, wi, ws in ((g20, 45.67, 50.72), (g222, 42.87, 47.87)):
        assert gas.row["lower_wobbe_index_MJ_m3"] == pytest.approx(wi, abs=0.02)
        assert gas.row["higher_wobbe_index_MJ_m3"] == pytest.approx(ws, abs=0.02)
    assert g222.input_ratio == pytest.approx(0.9387, abs=5e-4)


def test_fixed_velocity_slot_and_stabilizer(tmp_path):
    burner = """
[burner]
port = "slot"
port_gap_mm = 2.0
port_velocity_m_s = 3.0
stabilizer_size_mm = 10.0
approach_velocity_m_s = 20.0
"""
    study, rows = _rows(tmp_path, burner, fractions="[0.0]", phis="[1.0]")
    r = rows[0]
    assert r["wall_velocity_gradient_1_s"] == pytest.approx(6 * 3.0 / 2e-3)
    # no C_BO given: no stabilizer margin, and the verdict does not rest on one
    assert r["bluff_body_blowoff_velocity_m_s"] is None and r["stabilizer_margin"] is None
    assert "stabilizer: C_BO not calibrated" in r["criteria_not_assessed"]
    assert r["verdict"].endswith("stabilizer not assessed")
    assert r["quench_ratio"] == pytest.approx(r["quenching_distance_mm"] / 2.0)
    # a calibrated C_BO (invented here) and a blockage: U_BO over the velocity past the body's edge
    (tmp_path / "cal").mkdir()
    study, rows = _rows(tmp_path / "cal", burner + "stabilizer_blockage = 0.36\n\n[indicators]\nbluff_body_constant = 0.8\n",
                        fractions="[0.0]", phis="[1.0]")
    r = rows[0]
    assert "stabilizer" not in (r["criteria_not_assessed"] or "")
    # U_BO = C_BO D / tau_c is linear in the constant, and the blockage B speeds the flow past
    # the body's edge to U/(1 - B): without it the margin is (1 - 0.36) = 0.64 times larger
    rows2 = _rerun(tmp_path / "cal", "bluff_body_constant = 0.8", "bluff_body_constant = 1.6")
    assert rows2[0]["stabilizer_margin"] == pytest.approx(2 * r["stabilizer_margin"], rel=1e-9)
    rows3 = _rerun(tmp_path / "cal", "stabilizer_blockage = 0.36", "stabilizer_blockage = 0.0")
    assert r["stabilizer_margin"] / rows3[0]["stabilizer_margin"] == pytest.approx(0.64 / 2, rel=1e-9)  # C 1.6 now


def test_indicator_settings_override(tmp_path):
    study, rows = _rows(tmp_path, "\n[indicators]\nflashback_peclet = 26.0\nquench_peclet = 50.0\n",
                        fractions="[0.0]", phis="[1.0]")
    r = rows[0]
    a, S = r["unburned_thermal_diffusivity_m2_s"], r["laminar_flame_speed_m_s"]
    assert r["flashback_critical_gradient_1_s"] == pytest.approx(S ** 2 / (26.0 * a))
    assert r["quenching_distance_mm"] == pytest.approx(1e3 * 50.0 * a / S)
    assert r["verdict"] is None  # no burner, no verdict


def test_csv_carries_the_indicator_columns(tmp_path, cli):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    config.write_text(config.read_text() + BURNER_INPUT)
    r = cli("run", config, "--out", tmp_path / "o", "--jobs", "1", "--no-charts")
    assert r.returncode == 0, r.stderr
    header = (tmp_path / "o" / "results.csv").read_text().splitlines()[0].split(",")
    for col in ("chemical_time_s", "blint_thickness_mm", "flashback_critical_gradient_1_s",
                "blowoff_critical_gradient_1_s", "quenching_distance_mm", "tube_quenching_diameter_mm",
                "flame_speed_ratio", "higher_wobbe_index_MJ_m3", "port_velocity_m_s", "flashback_margin",
                "blowoff_margin", "quench_ratio", "verdict"):
        assert col in header
    assert "Burner margins (test slot burner" in r.stdout
    assert (tmp_path / "o" / "fuel_gases.csv").is_file()
    c = cli("check", config, "--out", tmp_path / "o")
    assert "Fuel gases (combustion 15 degC, metering 15 degC" in c.stdout and "Burner: test slot burner" in c.stdout
