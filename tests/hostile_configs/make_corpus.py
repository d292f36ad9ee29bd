#!/usr/bin/env python3
"""Write the hostile-config corpus: one malformed study per file, named by what is wrong.

Run it from anywhere (python3 tests/hostile_configs/make_corpus.py) after adding a case;
it rewrites every *.toml here.

Each file starts with '# expect: TEXT' lines: words the one-line error must contain.
"""
from pathlib import Path

HERE = Path(__file__).resolve().parent

BASE = {
    "head": 'title = "hostile corpus base"\nmechanism = "h2o2.yaml"\n',
    "fuels": '[fuels]\nhydrogen = { H2 = 1.0 }\ndiluted = { H2 = 0.6, N2 = 0.4 }\n',
    "oxidizers": '[oxidizers]\nair = { O2 = 1.0, N2 = 3.76 }\n',
    "sweep": ('[sweep]\nfuel = ["hydrogen"]\noxidizer = ["air"]\nequivalence_ratio = [0.8, 1.0]\n'
              'pressure_bar = [1.0]\nunburned_temperature_K = [300.0]\n'),
}


def config(head=None, fuels=None, oxidizers=None, sweep=None, tail=""):
    parts = [BASE["head"] if head is None else head, BASE["fuels"] if fuels is None else fuels,
             BASE["oxidizers"] if oxidizers is None else oxidizers, BASE["sweep"] if sweep is None else sweep]
    return "\n".join(parts) + tail


def sweep_with(**lines):
    """The base [sweep] with some lines replaced (value None drops the line)."""
    out = []
    keys = ["fuel", "oxidizer", "equivalence_ratio", "pressure_bar", "unburned_temperature_K"]
    base = dict(line.split(" = ", 1) for line in BASE["sweep"].splitlines()[1:])
    for k in keys + [k for k in lines if k not in keys]:
        v = lines.get(k, base.get(k))
        if v is not None:
            out.append(f"{k} = {v}")
    return "[sweep]\n" + "\n".join(out) + "\n"


CASES = {
    # --- unknown or misspelled keys
    "unknown_top_key": (["unknown key 'temperature'", "allowed: title"], config(tail="temperature = 300\n")
                        .replace('mechanism = "h2o2.yaml"\n', 'mechanism = "h2o2.yaml"\ntemperature = 300\n', 1)
                        .replace("\ntemperature = 300\n", "\n", 1) if False else
                        'temperature = 300\n' + config()),
    "misspelled_sweep_key": (["sweep.equivalance_ratio", "did you mean 'equivalence_ratio'"],
                             config(sweep=sweep_with(equivalence_ratio=None, equivalance_ratio="[1.0]"))),
    "unknown_range_key": (["unknown key 'sweep.equivalence_ratio.stride'", "allowed: from, to, step"],
                          config(sweep=sweep_with(equivalence_ratio="{ from = 0.5, to = 1.0, stride = 0.1 }"))),
    "unknown_burner_key": (["unknown key 'burner.port_speed'", "allowed"],
                           config(tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\nport_speed = 3\n')),
    "control_character_in_key": (["unknown key 'temp\\terature'", "allowed"], '"temp\\terature" = 300\n' + config()),
    "very_long_key": (["unknown key", "allowed"], f'{"k" * 5000} = 1\n' + config()),
    # --- numbers that are not physical
    "phi_nan": (["sweep.equivalence_ratio[0]", "finite number"], config(sweep=sweep_with(equivalence_ratio="[nan]"))),
    "phi_inf": (["sweep.equivalence_ratio[1]", "finite number"], config(sweep=sweep_with(equivalence_ratio="[1.0, inf]"))),
    "phi_zero": (["sweep.equivalence_ratio", "allowed: > 0"], config(sweep=sweep_with(equivalence_ratio="[0.0, 1.0]"))),
    "phi_negative": (["sweep.equivalence_ratio", "-0.5", "allowed: > 0"],
                     config(sweep=sweep_with(equivalence_ratio="[-0.5]"))),
    "phi_too_large": (["sweep.equivalence_ratio", "50", "<= 10"], config(sweep=sweep_with(equivalence_ratio="[50.0]"))),
    "pressure_negative": (["sweep.pressure_bar", "-1", "allowed: > 0"], config(sweep=sweep_with(pressure_bar="[-1.0]"))),
    "pressure_zero": (["sweep.pressure_bar", "allowed: > 0"], config(sweep=sweep_with(pressure_bar="0"))),
    "pressure_inf": (["sweep.pressure_bar[0]", "finite number"], config(sweep=sweep_with(pressure_bar="[inf]"))),
    "pressure_nan_single": (["sweep.pressure_bar", "finite number"], config(sweep=sweep_with(pressure_bar="nan"))),
    "temperature_zero": (["sweep.unburned_temperature_K", "allowed: > 0"],
                         config(sweep=sweep_with(unburned_temperature_K="[0.0]"))),
    "temperature_negative": (["sweep.unburned_temperature_K", "-300", "allowed: > 0"],
                             config(sweep=sweep_with(unburned_temperature_K="[-300]"))),
    "temperature_in_celsius": (["sweep.unburned_temperature_K", "value 27 is below 200 K", "in kelvin",
                                "27 degC is 300.15 K"],
                               config(sweep=sweep_with(unburned_temperature_K="[27.0]"))),
    "pressure_in_pascal": (["sweep.pressure_bar", "101325 Pa is 1.01325 bar", "allowed: > 0 and <= 500"],
                           config(sweep=sweep_with(pressure_bar="[101325.0]"))),
    "flame_time_limit_negative": (["'flame_time_limit_s' must be > 0 seconds", "-5"],
                                  'flame_time_limit_s = -5\n' + config()),
    "huge_exponent": (["sweep.pressure_bar[0]", "finite number"], config(sweep=sweep_with(pressure_bar="[1e400]"))),
    "huge_integer": (["sweep.pressure_bar[0]", "finite number", "about 401 digits"],
                     config(sweep=sweep_with(pressure_bar="[1" + "0" * 400 + "]"))),
    "integer_with_5000_digits": (["not valid TOML", "5001 digits", "numbers must fit a float"],
                                 config(sweep=sweep_with(pressure_bar="[1" + "0" * 5000 + "]"))),
    "negative_mole_fraction": (["fuels.hydrogen.H2", "-1", ">= 0"],
                               config(fuels='[fuels]\nhydrogen = { H2 = -1.0, N2 = 2.0 }\n')),
    "mole_fraction_inf": (["fuels.hydrogen.H2", "finite number"], config(fuels='[fuels]\nhydrogen = { H2 = inf }\n')),
    "no_positive_entry": (["fuels.hydrogen", "no species with a positive amount"],
                          config(fuels='[fuels]\nhydrogen = { H2 = 0.0, N2 = 0.0 }\n')),
    # --- empty or oversized sweeps
    "empty_phi_list": (["sweep.equivalence_ratio", "empty", "at least one value"],
                       config(sweep=sweep_with(equivalence_ratio="[]"))),
    "empty_fuel_list": (["sweep.fuel", "non-empty list"], config(sweep=sweep_with(fuel="[]"))),
    "ten_million_points": (["10000000 points", "max_points", "raise 'max_points'"],
                           config(sweep=sweep_with(equivalence_ratio="{ from = 0.01, to = 10.0, step = 0.01 }",
                                                   pressure_bar="{ from = 1.0, to = 100.0, step = 1.0 }",
                                                   unburned_temperature_K="{ from = 300.0, to = 399.0, step = 1.0 }"))),
    "range_too_many_values": (["sweep.equivalence_ratio", "at most 1000000"],
                              config(sweep=sweep_with(equivalence_ratio="{ from = 0.1, to = 10.0, step = 1e-9 }"))),
    "range_overflows_a_float": (["sweep.pressure_bar", "too many values", "at most 1000000"],
                                config(sweep=sweep_with(pressure_bar="{ from = -1.7e308, to = 1.7e308, step = 1.0 }"))),
    "range_step_too_small_to_round": (["sweep.equivalence_ratio.step", "too small"],
                                      config(sweep=sweep_with(
                                          equivalence_ratio="{ from = 0.5, to = 0.500005, step = 1e-11 }"))),
    "step_zero_range": (["sweep.equivalence_ratio.step", "> 0"],
                        config(sweep=sweep_with(equivalence_ratio="{ from = 0.5, to = 1.0, step = 0.0 }"))),
    "step_negative_range": (["sweep.pressure_bar.step", "> 0"],
                            config(sweep=sweep_with(pressure_bar="{ from = 1.0, to = 5.0, step = -1.0 }"))),
    "from_greater_than_to": (["sweep.equivalence_ratio.to", "must not be below", "sweep.equivalence_ratio.from"],
                             config(sweep=sweep_with(equivalence_ratio="{ from = 1.2, to = 0.6, step = 0.1 }"))),
    "range_missing_step": (["sweep.equivalence_ratio", "'step' is missing"],
                           config(sweep=sweep_with(equivalence_ratio="{ from = 0.5, to = 1.0 }"))),
    "duplicate_phi_values": (["sweep.equivalence_ratio", "lists 1 more than once"],
                             config(sweep=sweep_with(equivalence_ratio="[1.0, 0.8, 1.0]"))),
    "duplicate_fuel_in_sweep": (["sweep.fuel", "'hydrogen' more than once"],
                                config(sweep=sweep_with(fuel='["hydrogen", "hydrogen"]'))),
    "max_points_zero": (["max_points", "whole number >= 1"], "max_points = 0\n" + config()),
    # --- TOML itself
    "duplicate_fuel_name": (["not valid TOML", "given twice"],
                            config(fuels='[fuels]\nhydrogen = { H2 = 1.0 }\nhydrogen = { H2 = 0.5, N2 = 0.5 }\n')),
    "duplicate_table": (["not valid TOML", "given twice"], config() + '\n[fuels]\nmethane = { CH4 = 1.0 }\n'),
    "duplicate_inline_key": (["not valid TOML", "given twice"],
                             config(fuels='[fuels]\nhydrogen = { H2 = 1.0, H2 = 2.0 }\n')),
    "not_toml": (["not valid TOML", "at line 4"], 'title = "x"\n[sweep\n'),
    "unterminated_string": (["not valid TOML"], 'title = "never closed\n' + config()),
    "deeply_nested": (["nests arrays or tables too deeply"], "x = " + "[" * 5000 + "]" * 5000 + "\n" + config()),
    # --- wrong types
    "wrong_type_phi_string": (["sweep.equivalence_ratio", "must be a number, a list of numbers or {from, to, step}",
                               "'lean'"],
                              config(sweep=sweep_with(equivalence_ratio='"lean"'))),
    "string_where_number": (["sweep.unburned_temperature_K[0]", "must be a number", "'300'"],
                            config(sweep=sweep_with(unburned_temperature_K='["300"]'))),
    "boolean_where_number": (["sweep.pressure_bar[0]", "must be a number", "True"],
                             config(sweep=sweep_with(pressure_bar="[true]"))),
    "wrong_type_date": (["sweep.pressure_bar", "must be a number, a list of numbers or {from, to, step}", "datetime.date"],
                        config(sweep=sweep_with(pressure_bar="2024-01-01"))),
    "wrong_type_fuels_list": (["'fuels' must be a table"], config(fuels='fuels = ["H2"]\n').replace(
        BASE["head"], BASE["head"], 1)),
    "wrong_type_fuels_array_of_tables": (["'fuels' must be a table"], config(fuels='[[fuels]]\nH2 = 1.0\n')),
    "wrong_type_sweep_array": (["'sweep' must be a table"], config(sweep="sweep = [1, 2]\n").replace(
        "[oxidizers]", "sweep = [1, 2]\n[oxidizers]", 1).replace("\nsweep = [1, 2]\n", "\n", 2)
        if False else BASE["head"] + "sweep = [1, 2]\n" + BASE["fuels"] + BASE["oxidizers"]),
    "wrong_type_sweep_fuel_number": (["sweep.fuel", "non-empty list of fuel names"], config(sweep=sweep_with(fuel="3"))),
    "wrong_type_title_number": (["'title' must be a string", "5"], config(head='title = 5\nmechanism = "h2o2.yaml"\n')),
    "wrong_type_thermal_diffusion": (["thermal_diffusion", "true or false", "'yes'"],
                                     'thermal_diffusion = "yes"\n' + config()),
    "wrong_type_max_points_float": (["max_points", "whole number", "10.5"], "max_points = 10.5\n" + config()),
    "wrong_type_composition_string": (["fuels.hydrogen", "table of species"],
                                      config(fuels='[fuels]\nhydrogen = "H2"\n')),
    "wrong_type_amount_string": (["fuels.hydrogen.H2", "must be a number", "'one'"],
                                 config(fuels='[fuels]\nhydrogen = { H2 = "one" }\n')),
    "wrong_type_mechanism_number": (["'mechanism' must be a file name or a list", "3"],
                                    config(head='mechanism = 3\n')),
    "mechanism_list_empty": (["'mechanism' must be a file name or a list", "[]"], config(head='mechanism = []\n')),
    "mechanism_listed_twice": (["'mechanism' lists 'h2o2.yaml' twice"],
                               config(head='mechanism = ["h2o2.yaml", "h2o2.yaml"]\n')),
    "mechanism_list_too_long": (["lists 5 mechanisms", "at most 4"],
                                config(head='mechanism = ["a.yaml", "b.yaml", "c.yaml", "d.yaml", "e.yaml"]\n')),
    "mechanism_list_not_strings": (["'mechanism[1]' must be a string", "2"],
                                   config(head='mechanism = ["h2o2.yaml", 2]\n')),
    # a species one compared mechanism lacks: both are named (GRI-Mech 3.0 has CH4, h2o2.yaml not)
    "mechanism_lacks_species_of_other": (["species 'CH4'", "fuels.hydrogen", "not in mechanism h2o2.yaml",
                                          "lists beside gri30.yaml", "gri30.yaml has it"],
                                         config(head='mechanism = ["gri30.yaml", "h2o2.yaml"]\n',
                                                fuels='[fuels]\nhydrogen = { CH4 = 1.0 }\n')),
    # --- species and mechanisms
    "unknown_species": (["species 'CH4'", "fuels.hydrogen", "not in mechanism h2o2.yaml", "it has"],
                        config(fuels='[fuels]\nhydrogen = { CH4 = 1.0 }\n')),
    "species_wrong_case": (["species 'h2'", "did you mean 'H2'"], config(fuels='[fuels]\nhydrogen = { h2 = 1.0 }\n')),
    "empty_species_name": (["fuels.hydrogen", "species named ''"], config(fuels='[fuels]\nhydrogen = { "" = 1.0 }\n')),
    "species_name_with_newline": (["species 'H2\\n'", "not in mechanism"],
                                  config(fuels='[fuels]\nhydrogen = { "H2\\n" = 1.0 }\n')),
    "mechanism_is_directory": (["'mechanism'", "is a folder", "give a mechanism file"],
                               config(head='title = "t"\nmechanism = "."\n')),
    "mechanism_missing": (["'mechanism' file 'no_such_mechanism.yaml' not found", "Cantera mechanism file"],
                          config(head='mechanism = "no_such_mechanism.yaml"\n')),
    "mechanism_not_a_mechanism": (["'mechanism'", "cannot be loaded by Cantera"],
                                  config(head='mechanism = "not_toml.toml"\n')),
    "mechanism_empty_string": (["'mechanism' ''", "not a file name"], config(head='mechanism = ""\n')),
    "mechanism_with_nul": (["'mechanism'", "not a file name"], config(head='mechanism = "h2o2\\u0000.yaml"\n')),
    "transport_unknown": (["'transport' is 'mixture_averaged'", "did you mean 'mixture-averaged'", "allowed"],
                          'transport = "mixture_averaged"\n' + config()),
    "resolution_unknown": (["'resolution' is 'ultra'", "allowed: standard, fine, coarse"],
                           'resolution = "ultra"\n' + config()),
    # --- fuels, oxidizers and blends
    "empty_fuels_table": (["[fuels] is empty", "define at least one fuel"], config(fuels="[fuels]\n")),
    "missing_sweep": (["config has no [sweep] table", "required"], BASE["head"] + BASE["fuels"] + BASE["oxidizers"]),
    "unknown_fuel_in_sweep": (["sweep.fuel", "unknown fuel 'methane'", "allowed: hydrogen, diluted"],
                              config(sweep=sweep_with(fuel='["methane"]'))),
    "unknown_oxidizer": (["sweep.oxidizer", "unknown oxidizer 'oxygen'", "allowed: air"],
                         config(sweep=sweep_with(oxidizer='["oxygen"]'))),
    "oxidizer_without_o2": (["oxidizers.air", "no O2", "must contain O2"],
                            config(oxidizers='[oxidizers]\nair = { N2 = 1.0 }\n')),
    "oxidizer_with_fuel": (["oxidizers.air", "contains combustible H2"],
                           config(oxidizers='[oxidizers]\nair = { O2 = 1.0, N2 = 3.76, H2 = 0.1 }\n')),
    "fuel_not_combustible": (["fuels.inert", "no combustible species"],
                             config(fuels='[fuels]\ninert = { N2 = 1.0 }\n', sweep=sweep_with(fuel='["inert"]'))),
    "fuel_almost_inert": (["fuels.hydrogen", "almost no combustible species", "at least 1e-06"],
                          config(fuels='[fuels]\nhydrogen = { H2 = 1e-300, N2 = 1.0 }\n')),
    "blend_fraction_above_one": (["sweep.blend.fraction", "1.5", "allowed: 0 to 1"],
                                 config(sweep=sweep_with(blend='{ with = "hydrogen", fraction = [0.0, 1.5] }',
                                                         fuel='["diluted"]'))),
    "blend_fraction_in_percent": (["sweep.blend.fraction", "not per cent: 20 % is 0.2", "allowed: 0 to 1"],
                                  config(sweep=sweep_with(blend='{ with = "hydrogen", fraction = [0, 20, 50] }',
                                                          fuel='["diluted"]'))),
    "blend_fraction_negative": (["sweep.blend.fraction", "-0.1", "allowed: 0 to 1"],
                                config(sweep=sweep_with(blend='{ with = "hydrogen", fraction = [-0.1] }',
                                                        fuel='["diluted"]'))),
    "blend_with_unknown_fuel": (["sweep.blend.with", "unknown fuel 'methane'", "allowed: hydrogen, diluted"],
                                config(sweep=sweep_with(blend='{ with = "methane", fraction = [0.1] }'))),
    "blend_missing_fraction": (["sweep.blend", "needs both 'with'", "'fraction'"],
                               config(sweep=sweep_with(blend='{ with = "hydrogen" }'))),
    "blend_not_a_table": (["sweep.blend", "must be a table"], config(sweep=sweep_with(blend='"hydrogen"'))),
    "reference_fuel_not_swept": (["reference_fuel", "must be one of sweep.fuel"], 'reference_fuel = "diluted"\n' + config()),
    # --- burner, gas quality, indicators
    "burner_negative_diameter": (["burner.port_diameter_mm", "> 0"],
                                 config(tail='\n[burner]\nport_diameter_mm = -2.0\nport_velocity_m_s = 1.0\n')),
    "burner_unknown_port": (["'burner.port' is 'square'", "allowed: round, slot"],
                            config(tail='\n[burner]\nport = "square"\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n')),
    "gas_quality_bad_temperature": (["gas_quality.combustion_temperature_C", "allowed: 0, 15, 25"],
                                    config(tail='\n[gas_quality]\ncombustion_temperature_C = 20\n')),
    "indicators_zero": (["indicators.flashback_peclet", "> 0"], config(tail='\n[indicators]\nflashback_peclet = 0\n')),
    "limits_without_burner": (["[limits]", "needs a [burner]"], config(tail='\n[limits]\n')),
    "limits_unknown_criterion": (["limits.criteria", "'quench'", "allowed"],
                                 config(tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n'
                                             '\n[limits]\ncriteria = ["quench"]\n')),
    "limits_tolerance_in_percent": (["limits.equivalence_ratio_tolerance", "at most 0.1"],
                                    config(tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n'
                                                '\n[limits]\nequivalence_ratio_tolerance = 1\n')),
    "burner_margin_below_one": (["burner.min_flashback_margin", "0.5", "1 or more"],
                                config(tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n'
                                            'min_flashback_margin = 0.5\n')),
    "burner_stabilizer_margin_without_body": (["burner.min_stabilizer_margin", "needs a bluff body"],
                                              config(tail='\n[burner]\nport_diameter_mm = 2.0\n'
                                                          'port_velocity_m_s = 1.0\nmin_stabilizer_margin = 2\n')),
    "premixer_margin_below_one": (["premixer.min_autoignition_margin", "0.5", "1 or more"],
                                  config(tail='\n[premixer]\nresidence_time_ms = 4\nmin_autoignition_margin = 0.5\n')),
    "burner_unknown_layout": (["burner.layout", "'plate'", "allowed: separate, deck"],
                              config(tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n'
                                          'layout = "plate"\n')),
    "burner_blockage_too_large": (["burner.stabilizer_blockage", "1.2", "0 to 0.9"],
                                  config(tail='\n[burner]\nport_diameter_mm = 20.0\nport_velocity_m_s = 20.0\n'
                                              'stabilizer_size_mm = 8.0\napproach_velocity_m_s = 20.0\n'
                                              'stabilizer_blockage = 1.2\n')),
    "limits_wobbe_without_band": (["limits.criteria", "'wobbe'", "no band", "wobbe_tolerance_percent"],
                                  config(tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n'
                                              '\n[limits]\ncriteria = ["flashback", "wobbe"]\n')),
    "limits_only_wobbe": (["limits.criteria", "at least one burner margin"],
                          config(sweep=sweep_with(blend='{ with = "diluted", fraction = [0.0, 0.5] }'),
                                 tail='\n[burner]\nport_diameter_mm = 2.0\nport_velocity_m_s = 1.0\n'
                                      '\n[gas_quality]\nwobbe_tolerance_percent = 5\n'
                                      '\n[limits]\ncriteria = ["wobbe"]\n')),
    "limits_core_flashback_without_premixer": (["limits.criteria", "'core_flashback'", "no [premixer]"],
                                               config(tail='\n[burner]\nport_diameter_mm = 20.0\n'
                                                           'port_velocity_m_s = 30.0\n'
                                                           '\n[limits]\ncriteria = ["core_flashback"]\n')),
    "keep_profiles_not_a_flag": (["'keep_profiles'", "true or false"], 'keep_profiles = "no"\n' + config()),
    "premixer_residence_in_seconds": (["premixer.residence_time_ms", "milliseconds"],
                                      config(tail='\n[premixer]\nresidence_time_ms = 40000\n')),
    "premixer_peclet_negative": (["premixer.turbulent_flashback_peclet", "must be > 0"],
                                 config(tail='\n[premixer]\nresidence_time_ms = 4\nturbulent_flashback_peclet = -5\n')),
    "premixer_blowout_damkohler_huge": (["premixer.blowout_damkohler", "0.01 to 100"],
                                        config(tail='\n[premixer]\nresidence_time_ms = 4\nblowout_damkohler = 1e6\n')),
    "flame_response_step_in_percent": (["flame_response.inert_step", "at most 0.1"],
                                       config(tail='\n[flame_response]\ninert_step = 0.5\n')),
    "uncertainty_unknown_reaction": (["uncertainty.factors", "H + O2 <=> HO2 + OH"],
                                     config(tail='\n[uncertainty]\nfactors = { "H + O2 <=> HO2 + OH" = 1.5 }\n')),
    "uncertainty_factor_below_one": (["uncertainty.factors", "from 1"],
                                     config(tail='\n[uncertainty]\nfactors = { "H + O2 <=> O + OH" = 0.3 }\n')),
    "uncertainty_sigmas_out_of_range": (["uncertainty.factor_sigmas", "1 to 4"],
                                        config(tail='\n[uncertainty]\nfactor_sigmas = 10\n')),
    "uncertainty_factors_not_a_table": (["uncertainty.factors", "must be a table"],
                                        config(tail='\n[uncertainty]\nfactors = 2.0\n')),
    "flame_response_unknown_key": (["flame_response.markstein"],
                                   config(tail='\n[flame_response]\nmarkstein = true\n')),
    "flame_response_not_a_flag": (["flame_response.zeldovich", "true or false"],
                                  config(tail='\n[flame_response]\nzeldovich = "yes"\n')),
    "stretch_without_equivalence_ratio": (["[stretch] needs 'equivalence_ratio'", "allowed: 0.8, 1"],
                                          config(tail='\n[stretch]\npressure_bar = [1.0]\n')),
    "stretch_fuel_not_swept": (["stretch.fuel", "'diluted'"],
                               config(tail='\n[stretch]\nequivalence_ratio = [1.0]\nfuel = ["diluted"]\n')),
    "reduction_target_out_of_range": (["reduction.flame_speed_error_percent", "0.1 to 20"],
                                      config(tail='\n[reduction]\nflame_speed_error_percent = 50\n')),
    "reduction_unknown_species": (["reduction.species", "'CH4'", "h2o2.yaml"],
                                  config(tail='\n[reduction]\nspecies = ["CH4"]\n')),
    "reduction_unknown_key": (["reduction.target", "allowed"], config(tail='\n[reduction]\ntarget = 1\n')),
    "reduction_validation_flames_negative": (["reduction.validation_flames", "0 to 12"],
                                             config(tail='\n[reduction]\nvalidation_flames = -1\n')),
    "reduction_with_two_mechanisms": (["[reduction] reduces one mechanism", "lists 2"],
                                      config(head='title = "two"\nmechanism = ["h2o2.yaml", "gri30.yaml"]\n',
                                             tail='\n[reduction]\n')),
    "reduction_not_a_table": (["'reduction' must be a table"],
                              config(head=BASE["head"] + 'reduction = 1\n')),
}


def main():
    for old in HERE.glob("*.toml"):
        old.unlink()
    for name, (expect, text) in CASES.items():
        head = "".join(f"# expect: {e}\n" for e in expect)
        (HERE / f"{name}.toml").write_text(head + text, encoding="utf-8")
    # bytes that are not UTF-8 (a Latin-1 editor's degree sign)
    (HERE / "non_utf8.toml").write_bytes(b"# expect: not UTF-8 text\n# expect: position\n"
                                         + config(head='title = "Preheat 300 \xb0C"\nmechanism = "h2o2.yaml"\n')
                                         .encode("utf-8").replace(b"\xc2\xb0", b"\xb0"))
    print(len(list(HERE.glob("*.toml"))), "files")


if __name__ == "__main__":
    main()
