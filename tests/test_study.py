"""Config loading: the demo config, axes, and every bad input named in one line."""
import copy
from pathlib import Path

import pytest

from flamecharts import ConfigError, MechanismError, load_study
from flamecharts.config import study_from_dict

ROOT = Path(__file__).resolve().parents[1]

BASE = {
    "title": "t",
    "mechanism": "h2o2.yaml",
    "fuels": {"hydrogen": {"H2": 1.0}, "diluted": {"H2": 0.5, "N2": 0.5}},
    "oxidizers": {"air": {"O2": 1.0, "N2": 3.76}},
    "sweep": {"fuel": ["hydrogen"], "oxidizer": ["air"], "equivalence_ratio": [0.8, 1.0],
              "pressure_bar": [1.0], "unburned_temperature_K": [300.0]},
}


def cfg(**changes):
    d = copy.deepcopy(BASE)
    for path, value in changes.items():
        node = d
        keys = path.split("__")
        for k in keys[:-1]:
            node = node[k]
        if value is KeyError:
            del node[keys[-1]]
        else:
            node[keys[-1]] = value
    return d


def test_demo_config_loads_with_its_axes():
    s = load_study(ROOT / "configs" / "district_hydrogen_demo.toml")
    assert s.equivalence_ratios == (0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3)
    assert s.blend_with == "hydrogen" and s.blend_fractions == (0.0, 0.1, 0.2, 0.3)
    assert s.n_points == 28 and s.burner.mode == "supply pressure"
    assert sum(s.fuels["district_gas"].values()) == pytest.approx(1.0)
    assert s.transport == "mixture-averaged" and s.mechanism_path.endswith("gri30.yaml")


def test_range_axis_includes_both_ends_and_lists_work():
    s = study_from_dict(cfg(sweep__equivalence_ratio={"from": 0.6, "to": 1.4, "step": 0.2},
                            sweep__pressure_bar=2.0))
    assert s.equivalence_ratios == (0.6, 0.8, 1.0, 1.2, 1.4)
    assert s.pressures_bar == (2.0,)


def test_defaults():
    d = cfg(sweep__pressure_bar=KeyError, sweep__unburned_temperature_K=KeyError)
    d.pop("mechanism")
    s = study_from_dict(d)
    assert s.mechanism == "gri30.yaml" and s.transport == "mixture-averaged"
    assert s.resolution == "standard" and s.thermal_diffusion is False
    assert s.pressures_bar == (1.01325,) and s.unburned_temperatures_K == (298.15,)


BAD = [
    # (changes, error type, words the one-line message must contain)
    ({"temperature": 300}, ConfigError, ["unknown key 'temperature'", "allowed"]),
    ({"sweep__equivalance_ratio": [1.0]}, ConfigError, ["sweep.equivalance_ratio", "did you mean 'equivalence_ratio'"]),
    ({"transport": "mixture_averaged"}, ConfigError, ["transport", "mixture-averaged"]),
    ({"resolution": "ultra"}, ConfigError, ["resolution", "standard"]),
    ({"sweep__pressure_bar": [1.0, -2.0]}, ConfigError, ["sweep.pressure_bar", "-2", "> 0"]),
    ({"sweep__pressure_bar": [0.0]}, ConfigError, ["sweep.pressure_bar", "> 0"]),
    ({"sweep__unburned_temperature_K": [-5.0]}, ConfigError, ["sweep.unburned_temperature_K", "> 0"]),
    ({"sweep__equivalence_ratio": [0.0, 1.0]}, ConfigError, ["sweep.equivalence_ratio", "> 0"]),
    ({"sweep__equivalence_ratio": []}, ConfigError, ["sweep.equivalence_ratio", "empty"]),
    ({"sweep__pressure_bar": "high"}, ConfigError, ["sweep.pressure_bar", "number"]),
    ({"sweep__equivalence_ratio": [1.0, True]}, ConfigError, ["sweep.equivalence_ratio[1]", "number"]),
    ({"sweep__equivalence_ratio": {"from": 1.0, "to": 0.5, "step": 0.1}}, ConfigError, ["sweep.equivalence_ratio.to"]),
    ({"sweep__equivalence_ratio": {"from": 0.5, "to": 1.0, "step": 0}}, ConfigError, ["sweep.equivalence_ratio.step", "> 0"]),
    ({"sweep__equivalence_ratio": {"from": 0.5, "to": 1.0}}, ConfigError, ["'step' is missing"]),
    ({"sweep__equivalence_ratio": [1.0, 1.0]}, ConfigError, ["more than once"]),
    ({"fuels__hydrogen": {"H2": 0.0}}, ConfigError, ["fuels.hydrogen", "no species with a positive amount"]),
    ({"fuels__hydrogen": {"H2": -1.0}}, ConfigError, ["fuels.hydrogen.H2", ">= 0"]),
    ({"fuels__hydrogen": {}}, ConfigError, ["fuels.hydrogen", "empty"]),
    ({"fuels__hydrogen": {"H2": float("nan")}}, ConfigError, ["fuels.hydrogen.H2", "finite"]),
    ({"fuels__hydrogen": {"CH4": 1.0}}, MechanismError, ["species 'CH4'", "fuels.hydrogen", "h2o2.yaml"]),
    ({"oxidizers__air": {"O2": 1.0, "NN2": 3.76}}, MechanismError, ["species 'NN2'", "did you mean 'N2'"]),
    ({"oxidizers__air": {"N2": 1.0}}, ConfigError, ["oxidizers.air", "no O2"]),
    ({"fuels__inert": {"N2": 1.0}, "sweep__fuel": ["inert"]}, ConfigError, ["fuels.inert", "no combustible"]),
    ({"sweep__fuel": ["hydrogn"]}, ConfigError, ["unknown fuel 'hydrogn'", "did you mean 'hydrogen'"]),
    ({"sweep__oxidizer": ["oxygen"]}, ConfigError, ["unknown oxidizer 'oxygen'", "air"]),
    ({"sweep__fuel": []}, ConfigError, ["sweep.fuel", "non-empty"]),
    ({"sweep__fuel": KeyError}, ConfigError, ["[sweep] has no 'fuel'"]),
    ({"sweep": KeyError}, ConfigError, ["[sweep]", "required"]),
    ({"sweep__blend": {"with": "methane", "fraction": [0.1]}}, ConfigError, ["sweep.blend.with", "unknown fuel 'methane'"]),
    ({"sweep__blend": {"with": "hydrogen", "fraction": [1.5]}}, ConfigError, ["sweep.blend.fraction", "0 to 1"]),
    ({"sweep__blend": {"with": "hydrogen"}}, ConfigError, ["sweep.blend", "fraction"]),
    ({"mechanism": "no_such_mechanism.yaml"}, MechanismError, ["no_such_mechanism.yaml", "not found"]),
    ({"thermal_diffusion": "yes"}, ConfigError, ["thermal_diffusion", "true or false"]),
    ({"max_points": 1}, ConfigError, ["max_points", "2 points"]),
    ({"burner": {"port": "square", "port_diameter_mm": 2.0, "port_velocity_m_s": 1.0}}, ConfigError,
     ["burner.port", "round"]),
    ({"burner": {"port": "round", "port_velocity_m_s": 1.0}}, ConfigError, ["port_diameter_mm"]),
    ({"burner": {"port": "slot", "port_diameter_mm": 2.0, "port_velocity_m_s": 1.0}}, ConfigError,
     ["burner.port_diameter_mm", "port_gap_mm"]),
    ({"burner": {"port_diameter_mm": 2.0}}, ConfigError, ["port_velocity_m_s", "thermal_input_kW"]),
    ({"burner": {"port_diameter_mm": 2.0, "thermal_input_kW": 1.0}}, ConfigError, ["port_area_mm2"]),
    ({"burner": {"port_diameter_mm": -2.0, "port_velocity_m_s": 1.0}}, ConfigError, ["burner.port_diameter_mm", "> 0"]),
    ({"burner": {"port_diameter_mm": 2.0, "port_velocity_m_s": 1.0, "stabilizer_size_mm": 5.0}}, ConfigError,
     ["approach_velocity_m_s"]),
    ({"burner": {"port_diameter_mm": 2.0, "port_velocity_m_s": 1.0, "port_speed": 1}}, ConfigError,
     ["unknown key 'burner.port_speed'"]),
    ({"gas_quality": {"combustion_temperature_C": 20}}, ConfigError, ["combustion_temperature_C", "0, 15, 25"]),
    ({"gas_quality": {"wobbe_band_MJ_m3": [50.0, 45.0]}}, ConfigError, ["wobbe_band_MJ_m3", "low < high"]),
    ({"gas_quality": {"wobbe_band_MJ_m3": [45.0, 50.0], "wobbe_tolerance_percent": 5}}, ConfigError, ["not both"]),
    ({"indicators": {"flashback_peclet": 0}}, ConfigError, ["indicators.flashback_peclet", "> 0"]),
    ({"indicators": {"flash_peclet": 10}}, ConfigError, ["did you mean 'flashback_peclet'"]),
    ({"reference_fuel": "diluted"}, ConfigError, ["reference_fuel", "sweep.fuel"]),
]


@pytest.mark.parametrize("changes,exc,words", BAD, ids=[str(list(c)[0]) + f"-{i}" for i, (c, _, _) in enumerate(BAD)])
def test_bad_input_names_the_key_and_what_is_allowed(changes, exc, words):
    with pytest.raises(exc) as info:
        study_from_dict(cfg(**changes))
    msg = str(info.value)
    assert "\n" not in msg
    for w in words:
        assert w in msg


def test_unreadable_and_non_toml_files(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text("title = 'x'\n[sweep\n")
    with pytest.raises(ConfigError, match="not valid TOML"):
        load_study(bad)
    binary = tmp_path / "bin.toml"
    binary.write_bytes(b"title = '\xff\xfe'\n")
    with pytest.raises(ConfigError, match="not UTF-8"):
        load_study(binary)
    with pytest.raises(ConfigError, match="not found"):
        load_study(tmp_path / "missing.toml")
    with pytest.raises(ConfigError, match="is a folder"):
        load_study(tmp_path)


def test_mechanism_path_that_is_a_folder(tmp_path):
    (tmp_path / "mechs").mkdir()
    with pytest.raises(MechanismError, match="is a folder"):
        study_from_dict(cfg(mechanism="mechs"), base_dir=tmp_path)


def test_mechanism_beside_the_config_is_found(tmp_path):
    import shutil

    import cantera as ct

    src = next(Path(d) / "h2o2.yaml" for d in ct.get_data_directories() if (Path(d) / "h2o2.yaml").exists())
    shutil.copy(src, tmp_path / "my_mech.yaml")
    s = study_from_dict(cfg(mechanism="my_mech.yaml"), base_dir=tmp_path)
    assert s.mechanism_path == str((tmp_path / "my_mech.yaml").resolve())


def test_broken_mechanism_file(tmp_path):
    (tmp_path / "broken.yaml").write_text("phases: [this is not a mechanism\n")
    with pytest.raises(MechanismError, match="cannot be loaded"):
        study_from_dict(cfg(mechanism="broken.yaml"), base_dir=tmp_path)


ISSUE_EXAMPLE = """
title = "Demo district gas with hydrogen injection"
mechanism = "gri30.yaml"
transport = "mixture-averaged"

[fuels]
district_gas = { CH4 = 0.91, C2H6 = 0.05, C3H8 = 0.01, N2 = 0.02, CO2 = 0.01 }
hydrogen = { H2 = 1.0 }

[oxidizers]
air = { O2 = 1.0, N2 = 3.76 }

[sweep]
fuel = ["district_gas"]
oxidizer = ["air"]
blend = { with = "hydrogen", fraction = [0.0, 0.3] }
equivalence_ratio = { from = 0.7, to = 1.3, step = 0.1 }
pressure_bar = [1.0]
unburned_temperature_K = [300.0]
"""


def test_the_core_example_without_burner_loads_unchanged(tmp_path):
    path = tmp_path / "example.toml"
    path.write_text(ISSUE_EXAMPLE)
    s = load_study(path)
    assert s.n_points == 14 and s.burner is None and s.gas_quality.combustion_T_C == 15


def test_burner_and_gas_quality_parse_to_si():
    s = study_from_dict(cfg(burner={"port": "round", "port_diameter_mm": 2.5, "thermal_input_kW": 0.1,
                                    "port_area_mm2": 117.8, "input_follows_wobbe": True},
                            gas_quality={"wobbe_tolerance_percent": 5.0, "metering_temperature_C": 0}))
    b = s.burner
    assert b.port_size_m == pytest.approx(2.5e-3) and b.thermal_input_W == pytest.approx(100.0)
    assert b.port_area_m2 == pytest.approx(117.8e-6) and b.mode == "supply pressure"
    assert s.gas_quality.metering_T_C == 0 and s.gas_quality.tolerance_percent == 5.0


def test_oxidizer_with_fuel_in_it_is_refused():
    with pytest.raises(ConfigError, match="contains combustible H2"):
        study_from_dict(cfg(oxidizers__air={"O2": 1.0, "N2": 3.76, "H2": 0.5}))


def test_species_hint_ignores_case():
    with pytest.raises(MechanismError, match="did you mean 'H2'"):
        study_from_dict(cfg(fuels__hydrogen={"h2": 1.0}))


def test_config_with_a_byte_order_mark_loads(tmp_path):
    path = tmp_path / "bom.toml"
    path.write_bytes(b"\xef\xbb\xbf" + ISSUE_EXAMPLE.encode())
    assert load_study(path).n_points == 14


def test_mechanism_without_transport_data_is_refused_at_load(tmp_path):
    import cantera as ct

    # the h2o2 mechanism rewritten without its species' transport data
    full = ct.Solution("h2o2.yaml")
    bare = []
    for sp in full.species():
        new = ct.Species(sp.name, sp.composition)
        new.thermo = sp.thermo
        bare.append(new)
    gas = ct.Solution(thermo="ideal-gas", kinetics="gas", species=bare, reactions=full.reactions())
    gas.write_yaml(str(tmp_path / "notrans.yaml"))
    with pytest.raises(MechanismError, match="transport data"):
        study_from_dict(cfg(mechanism="notrans.yaml"), base_dir=tmp_path)
