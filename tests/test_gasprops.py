"""Fuel-gas properties against ISO 6976 (2016 edition, with 1995 cross-checks) and EN 437."""
import pytest

from flamecharts.chemistry.mechanism import fallback_data
from flamecharts.physics.gasprops import ISO6976_2016, fuel_gas_properties

EXAMPLE_1 = {"CH4": 0.933212, "C2H6": 0.025656, "C3H8": 0.015368, "N2": 0.010350, "CO2": 0.015414}


def test_iso6976_2016_annex_d_example_1():
    # ISO 6976:2016 Annex D, example 1, 15 degC combustion, 15 degC / 101.325 kPa metering,
    # as printed: M 17.3884301 g/mol, Z 0.99776224, superior 906.1799588 kJ/mol,
    # 52.113961 MJ/kg, 38.410611 MJ/m3. Tolerances at the last printed digit.
    p = fuel_gas_properties(EXAMPLE_1, 15, 15)
    assert p.molar_mass_g_mol == pytest.approx(17.3884301, abs=1e-7)
    assert p.compression_factor == pytest.approx(0.99776224, abs=1e-8)
    assert p.superior_molar_kJ_mol == pytest.approx(906.1799588, abs=1e-7)
    assert p.higher_heating_value_MJ_kg == pytest.approx(52.113961, abs=1e-6)
    assert p.higher_heating_value_MJ_m3 == pytest.approx(38.410611, abs=1e-6)
    assert p.method == "ISO 6976:2016"


EXAMPLE_3 = {"CH4": 0.922393, "C2H6": 0.025358, "C3H8": 0.015190, "n-C4H10": 0.000523, "i-C4H10": 0.001512,
             "n-C5H12": 0.002846, "i-C5H12": 0.002832, "neo-C5H12": 0.001015, "n-C6H14": 0.002865,
             "N2": 0.010230, "CO2": 0.015236}


def test_iso6976_2016_annex_d_example_3():
    # ISO 6976:2016, Annex D, example 3 (11 components, with the C4-C6 alkanes), 15 degC
    # combustion, 15 degC / 101.325 kPa metering, as printed: superior 39.73351, inferior
    # 35.86811 MJ/m3, relative density 0.62391, superior Wobbe 50.30318, inferior Wobbe
    # 45.40954 MJ/m3 (ISO 6976:2016, Annex D). Tolerances at the last printed digit.
    p = fuel_gas_properties(EXAMPLE_3, 15, 15)
    assert p.higher_heating_value_MJ_m3 == pytest.approx(39.73351, abs=1e-5)
    assert p.lower_heating_value_MJ_m3 == pytest.approx(35.86811, abs=1e-5)
    assert p.relative_density == pytest.approx(0.62391, abs=1e-5)
    assert p.higher_wobbe_index_MJ_m3 == pytest.approx(50.30318, abs=1e-5)
    assert p.lower_wobbe_index_MJ_m3 == pytest.approx(45.40954, abs=1e-5)
    assert p.method == "ISO 6976:2016" and p.fallback_species == ()


def test_iso6976_2016_annex_d_example_3_at_25_0():
    # ISO 6976:2016, Annex D, example 3 at 25 degC combustion, 0 degC / 101.325 kPa
    # metering: superior 41.89360, inferior 37.85228 MJ/m3, relative density 0.62411,
    # superior Wobbe 53.02930, inferior Wobbe 47.91376 MJ/m3, as printed in the standard
    # and copied into the test suite of the open R package ISO6976.2016 (R. Forster,
    # 2026, tests/testthat/test_iso6976.R). Checks the
    # 25 degC superior values and 0 degC summation factors of the added alkanes.
    p = fuel_gas_properties(EXAMPLE_3, 25, 0)
    assert p.higher_heating_value_MJ_m3 == pytest.approx(41.89360, abs=1e-5)
    assert p.lower_heating_value_MJ_m3 == pytest.approx(37.85228, abs=1e-5)
    assert p.relative_density == pytest.approx(0.62411, abs=1e-5)
    assert p.higher_wobbe_index_MJ_m3 == pytest.approx(53.02930, abs=1e-5)
    assert p.lower_wobbe_index_MJ_m3 == pytest.approx(47.91376, abs=1e-5)


# Atoms of each tabulated species, and the IUPAC atomic weights ISO 6976:2016 uses [g/mol]
# (C, H, O, N are those the methane, hydrogen, carbon dioxide and nitrogen rows imply).
ATOMIC_WEIGHT = {"C": 12.0107, "H": 1.00794, "O": 15.9994, "N": 14.0067, "S": 32.065, "He": 4.002602, "Ar": 39.948}
ATOMS = {"CH4": {"C": 1, "H": 4}, "C2H6": {"C": 2, "H": 6}, "C3H8": {"C": 3, "H": 8}, "H2": {"H": 2},
         "CO": {"C": 1, "O": 1}, "N2": {"N": 2}, "CO2": {"C": 1, "O": 2},
         "n-C4H10": {"C": 4, "H": 10}, "i-C4H10": {"C": 4, "H": 10}, "n-C5H12": {"C": 5, "H": 12},
         "i-C5H12": {"C": 5, "H": 12}, "neo-C5H12": {"C": 5, "H": 12}, "n-C6H14": {"C": 6, "H": 14},
         "n-C7H16": {"C": 7, "H": 16}, "n-C8H18": {"C": 8, "H": 18}, "C3H6": {"C": 3, "H": 6},
         "H2S": {"H": 2, "S": 1}, "H2O": {"H": 2, "O": 1}, "O2": {"O": 2}, "He": {"He": 1}, "Ar": {"Ar": 1}}


@pytest.mark.parametrize("sp", sorted(ISO6976_2016))
def test_table_rows_agree_with_their_formula(sp):
    # Molar mass = sum of the atomic weights (ISO 6976:2016 Table 1 is built that way), the
    # hydrogen count is the formula's, and every added row covers all reference temperatures.
    M, n_H, Hs, s = ISO6976_2016[sp]
    assert M == pytest.approx(sum(n * ATOMIC_WEIGHT[e] for e, n in ATOMS[sp].items()), abs=1e-5)
    assert n_H == ATOMS[sp].get("H", 0)
    assert set(s) == {0, 15}
    if sp != "CO":  # the CO row has no 0 degC value yet
        assert set(Hs) == {0, 15, 25}


def test_added_species_heating_values_follow_the_standard():
    # Water's superior value is its enthalpy of vaporisation, so its inferior value is zero;
    # hydrogen sulphide's inferior value at 15 degC is 562.38 - 44.431 = 517.95 kJ/mol;
    # O2, He and Ar carry no heating value but count in M and Z.
    for T in (0, 15, 25):
        assert fuel_gas_properties({"H2O": 1.0}, T, 15).inferior_molar_kJ_mol == pytest.approx(0.0, abs=1e-12)
    assert fuel_gas_properties({"H2S": 1.0}, 15, 15).inferior_molar_kJ_mol == pytest.approx(517.95, abs=0.01)
    base = fuel_gas_properties({"CH4": 0.9, "N2": 0.1})
    for inert in ("O2", "He", "Ar"):
        p = fuel_gas_properties({"CH4": 0.9, inert: 0.1})
        assert p.superior_molar_kJ_mol == pytest.approx(base.superior_molar_kJ_mol)
        assert p.method == "ISO 6976:2016"


@pytest.mark.parametrize("gas,Hs,Hi,d,Ws,Wi", [
    # Single gases at 15/15, real gas, computed with the ISO 6976:1995 tables (compiled
    # from open implementations of the standard; not printed in it). The 2016 data used
    # here differ from 1995 by less than 0.02 %, so 0.05 % is the check.
    ("CH4", 37.782, 34.016, 0.55480, 50.724, 45.668),
    ("H2", 12.102, 10.223, 0.06957, 45.881, 38.757),
])
def test_single_gases_at_15_15(gas, Hs, Hi, d, Ws, Wi):
    p = fuel_gas_properties({gas: 1.0}, 15, 15)
    assert p.higher_heating_value_MJ_m3 == pytest.approx(Hs, rel=5e-4)
    assert p.lower_heating_value_MJ_m3 == pytest.approx(Hi, rel=5e-4)
    assert p.relative_density == pytest.approx(d, rel=5e-4)
    assert p.higher_wobbe_index_MJ_m3 == pytest.approx(Ws, rel=5e-4)
    assert p.lower_wobbe_index_MJ_m3 == pytest.approx(Wi, rel=5e-4)


@pytest.mark.parametrize("gas,Hs_1995,Hi_1995", [
    # ISO 6976:1995 Table 3 molar calorific values at 15 degC [kJ/mol]: the 2016 superior
    # values with the 2016 equation for the inferior value must reproduce them within 0.05 %.
    ("CH4", 891.56, 802.69), ("C2H6", 1562.14, 1428.84), ("C3H8", 2221.10, 2043.37),
    ("H2", 286.15, 241.72),
])
def test_molar_values_of_methane_ethane_propane_hydrogen(gas, Hs_1995, Hi_1995):
    p = fuel_gas_properties({gas: 1.0}, 15, 15)
    assert p.superior_molar_kJ_mol == pytest.approx(Hs_1995, rel=5e-4)
    assert p.inferior_molar_kJ_mol == pytest.approx(Hi_1995, rel=5e-4)


def test_en437_test_gas_g222():
    # EN 437 appliance test gas G222 (77 % CH4, 23 % H2), dry, 15 degC, 1013.25 mbar:
    # Wi 42.87, Hi 28.53, Ws 47.87, Hs 31.86 MJ/m3, d 0.443 (derived from ISO 6976).
    # The table rounds to 0.01 MJ/m3: allow 0.1 % (0.05 MJ/m3) and 0.001 in d.
    p = fuel_gas_properties({"CH4": 0.77, "H2": 0.23}, 15, 15)
    assert p.lower_wobbe_index_MJ_m3 == pytest.approx(42.87, rel=1e-3)
    assert p.higher_wobbe_index_MJ_m3 == pytest.approx(47.87, rel=1e-3)
    assert p.lower_heating_value_MJ_m3 == pytest.approx(28.53, rel=1e-3)
    assert p.higher_heating_value_MJ_m3 == pytest.approx(31.86, rel=1e-3)
    assert p.relative_density == pytest.approx(0.443, abs=1e-3)


def test_hydrogen_injection_lowers_the_wobbe_index():
    # Common practice: hydrogen (Ws 45.9) blended into natural gas (Ws ~50) lowers the
    # Wobbe index roughly in proportion, and the heating value per m3 much more.
    base = fuel_gas_properties({"CH4": 1.0})
    blend = fuel_gas_properties({"CH4": 0.8, "H2": 0.2})
    assert blend.higher_wobbe_index_MJ_m3 < base.higher_wobbe_index_MJ_m3
    drop_w = 1 - blend.higher_wobbe_index_MJ_m3 / base.higher_wobbe_index_MJ_m3
    drop_h = 1 - blend.higher_heating_value_MJ_m3 / base.higher_heating_value_MJ_m3
    assert drop_h > 2 * drop_w


def test_reference_temperatures_change_the_values_as_the_standard_orders_them():
    # Superior CV rises as the combustion temperature falls (ISO 6976 tables); the
    # volumetric value at 0 degC metering exceeds that at 15 degC by 288.15/273.15, plus
    # the 0.04 % by which Z falls (ISO 6976:2016 summation factors).
    p25 = fuel_gas_properties({"CH4": 1.0}, 25, 0)
    p15 = fuel_gas_properties({"CH4": 1.0}, 15, 0)
    assert p25.superior_molar_kJ_mol < p15.superior_molar_kJ_mol
    m15 = fuel_gas_properties({"CH4": 1.0}, 15, 15)
    assert p15.higher_heating_value_MJ_m3 / m15.higher_heating_value_MJ_m3 == pytest.approx(288.15 / 273.15, rel=6e-4)
    with pytest.raises(ValueError, match="allowed"):
        fuel_gas_properties({"CH4": 1.0}, 20, 15)


def test_ideal_gas_fallback_for_species_outside_the_table_is_flagged():
    # Ethylene is not in this table: its value comes from GRI-Mech 3.0 thermodynamics.
    # Handbook superior value of ethylene at 25 degC: 1411 kJ/mol (NIST webbook enthalpy of
    # combustion, -1411 kJ/mol; from memory), within 0.5 %.
    import cantera as ct

    gas = ct.Solution("gri30.yaml", transport_model=None)
    fb = fallback_data(gas, ["C2H4"], 25)
    p = fuel_gas_properties({"CH4": 0.9, "C2H4": 0.1}, 25, 15, fallback=fb)
    assert "fallback for C2H4" in p.method and p.fallback_species == ("C2H4",)
    assert fb["C2H4"][2] == pytest.approx(1411.0, rel=5e-3)
    # the same route reproduces methane's tabulated value, so the fallback is consistent
    assert fallback_data(gas, ["CH4"], 25)["CH4"][2] == pytest.approx(ISO6976_2016["CH4"][2][25], rel=2e-3)
