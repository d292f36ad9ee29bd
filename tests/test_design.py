"""Indicators, reference ratios, gas properties and burner margins on solved hydrogen studies."""
import pytest

from flamecharts import load_study, run_study
from flamecharts.design import fuel_gas_table
from flamecharts.physics.gasprops import ISO6976_2016, L_WATER

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


@pytest.fixture(scope="module")
def fixed_input(tmp_path_factory):
    return _rows(tmp_path_factory.mktemp("fi"), BURNER_INPUT, phis="[0.8, 1.0]")


def test_fixed_thermal_input_port_velocity_by_hand(fixed_input):
    study, rows = fixed_input
    # Hand calculation (ISO 6976:2016 values): diluted fuel 0.6 H2 + 0.4 N2, phi 1.0, 15 degC.
    r = next(r for r in rows if r["blend_fraction"] == 0.0 and r["equivalence_ratio"] == 1.0)
    M_H2, M_N2 = ISO6976_2016["H2"][0], ISO6976_2016["N2"][0]
    M_fuel = 0.6 * M_H2 + 0.4 * M_N2
    lhv = 0.6 * (ISO6976_2016["H2"][2][15] - L_WATER[15]) / M_fuel * 1e6  # J/kg
    n_air = 0.6 * 0.5 / (1 / 4.76)                                       # mol air / mol fuel
    import cantera as ct
    M_air = ct.Solution("h2o2.yaml").molecular_weights
    g = ct.Solution("h2o2.yaml")
    M_air = (g.molecular_weights[g.species_index("O2")] + 3.76 * g.molecular_weights[g.species_index("N2")]) / 4.76
    M_fuel_mech = 0.6 * g.molecular_weights[g.species_index("H2")] + 0.4 * g.molecular_weights[g.species_index("N2")]
    afr = n_air * M_air / M_fuel_mech
    U = 500.0 / lhv * (1 + afr / 1.0) / r["unburned_density_kg_m3"] / 50e-6
    assert r["port_velocity_m_s"] == pytest.approx(U, rel=1e-6)
    assert r["wall_velocity_gradient_1_s"] == pytest.approx(8 * U / 1e-3, rel=1e-12)
    assert r["thermal_input_kW"] == pytest.approx(0.5)


@pytest.mark.slow
def test_adding_hydrogen_to_methane_at_fixed_input_raises_port_velocity(tmp_path):
    # Hydrogen carries about a third of methane's heating value per m3 (ISO 6976), so at a
    # fixed thermal input the fuel and mixture volume flows, and so the port velocity, rise.
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
    rows = run_study(load_study(config), out_dir=tmp_path / "o", jobs=2).rows
    u0, u3 = (r["port_velocity_m_s"] for r in rows)
    assert u3 > u0
    # hand check of the ratio: same input, LHV per mixture volume falls with hydrogen
    assert rows[1]["flashback_gradient_ratio"] > 1.0


def test_margins_verdict_and_reference_ratios(fixed_input):
    study, rows = fixed_input
    for r in rows:
        assert r["flashback_margin"] == pytest.approx(r["wall_velocity_gradient_1_s"] / r["flashback_critical_gradient_1_s"])
        # hydrogen-air (Le of the fuel about 0.3): Reed's constant is not assessed (physics.validity)
        assert r["lewis_number_fuel"] < 0.8 and r["blowoff_margin"] is None
        assert r["criteria_not_assessed"].startswith("blowoff: Lewis number 0.")
        risks = [] if r["flashback_margin"] >= 1.5 else ["flashback risk"]
        assert r["verdict"] == ("; ".join(risks + ["blowoff not assessed"]) if risks
                                else "ok on flashback only; blowoff not assessed")
        assert r["quench_ratio"] == pytest.approx(r["tube_quenching_diameter_mm"] / 1.0)
        assert r["reference"] == "diluted"
        if r["blend_fraction"] == 0.0:
            assert r["flame_speed_ratio"] == 1.0
        else:  # more hydrogen: faster flame, steeper flashback gradient, shorter quench distance
            assert r["flame_speed_ratio"] > 1.0 and r["flashback_gradient_ratio"] > 1.0
            assert r["quenching_distance_ratio"] < 1.0
        assert r["chemical_time_s"] == pytest.approx(r["unburned_thermal_diffusivity_m2_s"] / r["laminar_flame_speed_m_s"] ** 2)


def test_input_follows_wobbe_at_fixed_supply_pressure(tmp_path):
    burner = BURNER_INPUT + "input_follows_wobbe = true\n"
    study, rows = _rows(tmp_path, burner.replace("[burner]", "[gas_quality]\nwobbe_tolerance_percent = 5.0\n\n[burner]"),
                        phis="[1.0]")
    gases = {g["blend_fraction"]: g for g in fuel_gas_table(study)}
    for r in rows:
        g = gases[r["blend_fraction"]]
        # orifice flow at a fixed supply pressure: thermal input proportional to the Wobbe index
        assert r["thermal_input_kW"] / 0.5 == pytest.approx(g["higher_wobbe_index_MJ_m3"] / gases[0.0]["higher_wobbe_index_MJ_m3"])
        assert r["wobbe_in_band"] == (abs(g["wobbe_change_percent"]) <= 5.0)


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
    assert r["bluff_body_blowoff_velocity_m_s"] == pytest.approx(0.8 * 0.01 / r["chemical_time_s"])
    assert r["stabilizer_margin"] == pytest.approx(r["bluff_body_blowoff_velocity_m_s"] / (20.0 / 0.64))
    assert "stabilizer" not in (r["criteria_not_assessed"] or "")


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
