"""A real gas analysis: species the mechanism lacks are lumped for the flame, the gas properties use them all."""
import pytest

import flamecharts
from flamecharts import load_study, run_study
from flamecharts.config import all_atoms, lumping_note
from flamecharts.design import fuel_gas_table, point_warnings
from flamecharts.errors import MechanismError
from flamecharts.physics import mixtures
from flamecharts.physics.lumping import formula_atoms, lump
from flamecharts.sweep.points import points

from conftest import write_h2_study

# ISO 6976:2016, Annex D, example 3: an 11-component natural gas (mole fractions)
EXAMPLE_3 = {"CH4": 0.922393, "C2H6": 0.025358, "C3H8": 0.015190, "n-C4H10": 0.000523, "i-C4H10": 0.001512,
             "n-C5H12": 0.002846, "i-C5H12": 0.002832, "neo-C5H12": 0.001015, "n-C6H14": 0.002865,
             "N2": 0.010230, "CO2": 0.015236}
GRI_LIKE = {"CH4": {"C": 1, "H": 4}, "C2H6": {"C": 2, "H": 6}, "C3H8": {"C": 3, "H": 8}, "N2": {"N": 2},
            "CO2": {"C": 1, "O": 2}, "H2": {"H": 2}}


def test_formulas_and_a_species_without_one():
    assert formula_atoms("n-C6H14") == {"C": 6, "H": 14} and formula_atoms("H2S") == {"H": 2, "S": 1}
    with pytest.raises(ValueError, match="not a chemical formula"):
        formula_atoms("natural-gas")


def test_lumping_keeps_the_carbon_and_nearly_the_oxygen_demand():
    X, notes = lump(EXAMPLE_3, GRI_LIKE)
    assert set(X) <= set(GRI_LIKE) and sum(X.values()) == pytest.approx(1.0)
    atoms_all = {**GRI_LIKE, **{sp: formula_atoms(sp) for sp in EXAMPLE_3 if sp not in GRI_LIKE}}

    def carbon_per_inert(comp):  # carbon against N2 + CO2, which lumping leaves alone
        c = sum(x * atoms_all[sp].get("C", 0) for sp, x in comp.items() if sp != "CO2")
        return c / (comp["N2"] + comp["CO2"])
    assert carbon_per_inert(X) == pytest.approx(carbon_per_inert(EXAMPLE_3), rel=1e-12)
    def o2_per_carbon(comp, atoms):
        return mixtures.stoich_o2_per_fuel(atoms, comp) / sum(x * atoms[sp].get("C", 0) for sp, x in comp.items())
    # the lumped alkane carries a little more hydrogen per carbon: the oxygen demand moves 0.19 % here
    assert o2_per_carbon(X, GRI_LIKE) == pytest.approx(o2_per_carbon(EXAMPLE_3, atoms_all), rel=5e-3)
    assert "n-C6H14 as 2 C3H8 (equal carbon)" in notes and "n-C4H10 as 4/3 C3H8 (equal carbon)" in notes


def test_nothing_to_lump_gives_the_composition_exactly():
    X = {"CH4": 0.9, "C2H6": 0.1}
    assert lump(X, GRI_LIKE) == (X, [])


def test_an_analysis_loads_on_gri30_with_its_gas_properties_and_lumped_flames(tmp_path):
    fuels = ", ".join(f'{k} = {v}' for k, v in EXAMPLE_3.items())
    (tmp_path / "a.toml").write_text(f"""
title = "analysis"
mechanism = "gri30.yaml"
[fuels]
network = {{ {fuels} }}
[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}
[sweep]
fuel = ["network"]
oxidizer = ["air"]
equivalence_ratio = [1.0]
pressure_bar = [1.0]
unburned_temperature_K = [300.0]
""")
    study = load_study(tmp_path / "a.toml")
    assert set(study.analysis_atoms) == {"n-C4H10", "i-C4H10", "n-C5H12", "i-C5H12", "neo-C5H12", "n-C6H14"}
    gas = fuel_gas_table(study)[0]
    # ISO 6976:2016, Annex D, example 3, 15 degC / 15 degC: the full analysis, printed digits
    assert gas["higher_heating_value_MJ_m3"] == pytest.approx(39.73351, abs=1e-5)
    assert gas["higher_wobbe_index_MJ_m3"] == pytest.approx(50.30318, abs=1e-5)
    (p,) = points(study)
    assert set(p.X_flame) <= set(study.atoms) and "n-C4H10" in p.X_fuel
    assert set(p.X_unburned) <= set(study.atoms)
    note = lumping_note(study)
    assert note.startswith("Fuel lumped for the flames (gri30.yaml lacks these species") and "neo-C5H12 as 5/3 C3H8" in note
    assert point_warnings(study, p, {}) == ""  # a note for the study, not a range warning on each point
    assert mixtures.stoich_o2_per_fuel(all_atoms(study), p.X_fuel) > 2.0


def test_an_inert_the_mechanism_lacks_burns_as_nitrogen_end_to_end(tmp_path):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    config.write_text(config.read_text().replace("diluted = { H2 = 0.6, N2 = 0.4 }", "diluted = { H2 = 0.6, He = 0.4 }"))
    study = load_study(config)
    res = flamecharts.run(study, out=tmp_path / "o", jobs=1, charts=False)
    rows = res.rows
    assert rows[0]["status"] == "ok" and "He as N2" in lumping_note(study)
    assert "He as N2" in (tmp_path / "o" / "about.txt").read_text() and "He as N2" in res.dataset.attrs["lumped_fuel"]
    (tmp_path / "n2").mkdir()
    with_n2 = write_h2_study(tmp_path / "n2", fractions="[0.0]", phis="[1.0]")
    ref = run_study(load_study(with_n2), out_dir=tmp_path / "o2", jobs=1).rows
    assert rows[0]["laminar_flame_speed_m_s"] == ref[0]["laminar_flame_speed_m_s"]  # the same flame


def test_a_species_nobody_can_place_is_refused_with_the_rule(tmp_path):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    config.write_text(config.read_text().replace("diluted = { H2 = 0.6, N2 = 0.4 }", "diluted = { H2 = 0.6, C4H10 = 0.4 }"))
    with pytest.raises(MechanismError, match="species 'C4H10' in 'fuels.diluted' is not in mechanism h2o2.yaml"):
        load_study(config)


def test_argon_the_mechanism_spells_in_capitals_is_not_lumped():
    X, notes = lump({"CH4": 0.9, "Ar": 0.1}, {"CH4": {"C": 1, "H": 4}, "AR": {"Ar": 1}, "N2": {"N": 2}})
    assert X == {"CH4": 0.9, "AR": 0.1} and notes == []


def test_a_propane_butane_fuel_on_gri30_is_warned():
    from flamecharts.physics.limits import heavy_hydrocarbon_warning

    atoms = {**GRI_LIKE, "n-C4H10": formula_atoms("n-C4H10"), "i-C4H10": formula_atoms("i-C4H10")}
    lpg = {"C3H8": 0.3, "n-C4H10": 0.5, "i-C4H10": 0.2}
    assert "100 % C3+ hydrocarbons" in heavy_hydrocarbon_warning("gri30.yaml", lpg, atoms)
    assert heavy_hydrocarbon_warning("gri30.yaml", EXAMPLE_3, {**atoms, **{sp: formula_atoms(sp) for sp in EXAMPLE_3
                                                                           if sp not in atoms}}) == ""
    assert heavy_hydrocarbon_warning("my_propane_mechanism.yaml", lpg, atoms) == ""
