"""Mixture arithmetic against Cantera (a general reference library) and rules of the trade."""
import cantera as ct
import pytest

from flamecharts.physics import mixtures

AIR = {"O2": 1.0, "N2": 3.76}


def _atoms(mech="gri30.yaml"):
    return {s.name: s.composition for s in ct.Solution(mech).species()}


def test_air_model_mass_fraction_and_molar_mass():
    # Common practice (no source): 1 O2 to 3.76 N2 air has an O2 mass fraction near 0.23
    # and a molar mass near 28.8-29 g/mol (28.85 for this model).
    gas = ct.Solution("gri30.yaml")
    gas.TPX = 298.15, ct.one_atm, mixtures.normalize(AIR)
    assert gas.Y[gas.species_index("O2")] == pytest.approx(0.233, abs=0.003)
    assert 28.8 <= gas.mean_molecular_weight <= 29.0


def test_stoichiometric_methane_in_air_is_9_5_percent():
    # Common practice: stoichiometric CH4 in 1:3.76 air is 9.51 mol %.
    X = mixtures.unburned_mixture({"CH4": 1}, AIR, 1.0, 2.0)
    assert X["CH4"] == pytest.approx(0.0951, abs=0.0001)


@pytest.mark.parametrize("phi", [0.6, 1.0, 1.4])
def test_equivalence_ratio_matches_cantera_for_a_natural_gas_with_inerts(phi):
    # Reference library: Cantera's set_equivalence_ratio (oxygen-balance definition)
    # must give the same mixture for a fuel with N2 and CO2 in it.
    fuel = {"CH4": 0.91, "C2H6": 0.05, "C3H8": 0.01, "N2": 0.02, "CO2": 0.01}
    atoms = _atoms()
    X = mixtures.unburned_mixture(fuel, AIR, phi, mixtures.stoich_o2_per_fuel(atoms, fuel))
    gas = ct.Solution("gri30.yaml")
    gas.set_equivalence_ratio(phi, fuel, AIR)
    for sp, x in X.items():
        assert gas[sp].X[0] == pytest.approx(x, rel=1e-9)
    gas.TPX = 300, ct.one_atm, X
    assert gas.equivalence_ratio(fuel, AIR) == pytest.approx(phi, rel=1e-9)


def test_blend_is_a_mole_fraction_of_the_fuel_stream():
    # Hydrogen injection "20 %" is 20 mol % of the blended gas (trade usage).
    b = mixtures.blend({"CH4": 0.9, "N2": 0.1}, {"H2": 1}, 0.2)
    assert b == pytest.approx({"CH4": 0.72, "N2": 0.08, "H2": 0.2})
    assert mixtures.blend({"CH4": 1}, {"H2": 1}, 0.0) == {"CH4": 1.0}
    assert mixtures.blend({"CH4": 1}, {"H2": 1}, 1.0) == {"H2": 1.0}


def test_hydrogen_needs_half_an_o2_and_inerts_none():
    atoms = _atoms()
    assert mixtures.stoich_o2_per_fuel(atoms, {"H2": 1}) == pytest.approx(0.5)
    assert mixtures.stoich_o2_per_fuel(atoms, {"CO2": 1, "N2": 1}) == pytest.approx(0.0)
    assert mixtures.stoich_o2_per_fuel(atoms, {"C3H8": 1}) == pytest.approx(5.0)


@pytest.mark.parametrize("bad", [{"CH4": -1.0}, {"CH4": 0.0}, {}, {"CH4": float("nan")}])
def test_normalize_rejects_unusable_amounts(bad):
    with pytest.raises(ValueError):
        mixtures.normalize(bad)
