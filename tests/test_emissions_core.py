"""Emissions core: dry basis, reference O2, mg/m3 and mg/kWh (physics.emissions) and a flame's
burned gas after a residence time (chemistry.emissions). Each check names its source.

The conversions are checked against their definitions with the arithmetic shown, against the US
EPA's published constants (Method 19: the ppm-to-mass factor K and the F-factor of natural gas)
and against the Quebec regulation's written-out 15 % O2 formula; the burned-gas history against
itself (the plug flow continues the flame's profile), the extended Zeldovich rate, the
equilibrium it must tend to, and published NOx of lean premixed methane. The flames are
GRI-Mech 3.0 methane-air at 1 atm, 300 K, solved once on the coarse setting (slow).
"""
import math

import cantera as ct
import numpy as np
import pytest

from flamecharts.chemistry import flame
from flamecharts.chemistry.emissions import (
    FLAME_ZONE_RISE_SHARE,
    EmissionsIntegrationError,
    burned_gas_history,
    has_nitrogen_chemistry,
)
from flamecharts.chemistry.mechanism import solution
from flamecharts.physics import emissions as em, mixtures
from flamecharts.physics.gasprops import fuel_gas_properties
from flamecharts.store import profiles

AIR = {"O2": 1.0, "N2": 3.76}
#: Air of 20.9 % O2 (the O2 correction's air) for the hand calculations.
AIR_209 = {"O2": 20.9, "N2": 79.1}
LB_PER_KG, FT3_PER_M3, KWH_PER_MMBTU = 2.20462262, 35.3146667, 293.07107
#: ISO 6976:2016 Table 3 (physics.gasprops): methane at 25 degC, MJ/kg gross and net.
CH4 = fuel_gas_properties({"CH4": 1.0}, combustion_T_C=25)
CH4_GROSS_J_KG, CH4_NET_J_KG = CH4.higher_heating_value_MJ_kg * 1e6, CH4.lower_heating_value_MJ_kg * 1e6


def _complete_combustion(phi: float, air: dict) -> tuple[dict, float]:
    """Products of CH4 burned completely at phi in ``air`` (mole fractions) and the fuel's mass fraction
    in the fresh mixture: CH4 + (2/phi) O2 + inert -> CO2 + 2 H2O + (2/phi - 2) O2 + inert."""
    o2 = 2.0 / phi
    inert = o2 * air["N2"] / air["O2"]
    moles = {"CO2": 1.0, "H2O": 2.0, "O2": o2 - 2.0, "N2": inert}
    total = sum(moles.values())
    fresh_mass = 16.04246 + o2 * 31.9988 + inert * 28.0134
    return {k: v / total for k, v in moles.items()}, 16.04246 / fresh_mass


def _mean_molar_mass(X: dict) -> float:
    M = {"CO2": 44.0095, "H2O": 18.01528, "O2": 31.9988, "N2": 28.0134}
    return sum(x * M[k] for k, x in X.items())


# ---- dry basis and the O2 reference (pure)
def test_o2_correction_is_the_quebec_regulations_15_percent_formula():
    # Quebec Clean Air Regulation (Q-2, r. 4.1), s. 71: E = Ea x 5.9 / (20.9 - A), A the dry O2 in %
    for A in (0.0, 3.0, 10.0, 15.0, 18.5):
        assert em.corrected_to_reference_O2(25e-6, A, 15.0) == pytest.approx(25e-6 * 5.9 / (20.9 - A), rel=1e-12)
    # EU texts write 21 (Flemish VLAREM II annex: W = (21 - g)/(21 - Y) M): a parameter
    assert em.corrected_to_reference_O2(1.0, 10.0, 3.0, oxidizer_O2_percent=21.0) == pytest.approx(18.0 / 11.0)


def test_o2_correction_refuses_air_and_oxygen_richer_gases():
    for O2 in (20.9, 21.0, 35.0):
        with pytest.raises(ValueError, match="20.9 % of the air"):
            em.corrected_to_reference_O2(10e-6, O2, 15.0)
    with pytest.raises(ValueError, match="reference O2"):
        em.corrected_to_reference_O2(10e-6, 5.0, 20.9)
    # an oxygen-enriched oxidizer (30 % O2) given as such: 25 % O2 in its flue gas is allowed
    assert em.corrected_to_reference_O2(10e-6, 25.0, 3.0, oxidizer_O2_percent=30.0) == pytest.approx(10e-6 * 27.0 / 5.0)


@pytest.mark.parametrize("oxidizer", [AIR_209, {"O2": 30.0, "N2": 70.0}])
def test_o2_correction_is_dilution_with_the_oxidizer(oxidizer):
    # Definition, arithmetic shown: a fixed amount of NO per mole of CH4 burned completely at
    # phi 0.7 and at phi 1.0. Corrected to 0 % O2 with the oxidizer's own O2 share, the lean
    # flue gas gives the stoichiometric one's dry concentration exactly.
    lean, _ = _complete_combustion(0.7, oxidizer)
    stoich, _ = _complete_combustion(1.0, oxidizer)
    no_per_fuel = 5e-5  # mol NO per mol CH4

    def dry(X):  # dry NO mole fraction and dry O2 % of a product gas
        moles_dry = sum(v for k, v in X.items() if k != "H2O") / X["CO2"]  # dry moles per mol CH4
        return no_per_fuel / moles_dry, 100.0 * X["O2"] / (1.0 - X["H2O"])

    (no_lean, o2_lean), (no_stoich, o2_stoich) = dry(lean), dry(stoich)
    assert o2_stoich == 0.0 and o2_lean > 0.0
    corrected = em.corrected_to_reference_O2(no_lean, o2_lean, 0.0, oxidizer_O2_percent=oxidizer["O2"])
    assert corrected == pytest.approx(no_stoich, rel=1e-12)
    if oxidizer["O2"] != 20.9:  # with air's 20.9 the regulatory figure is another (module docstring)
        assert em.corrected_to_reference_O2(no_lean, o2_lean, 0.0) != pytest.approx(no_stoich, rel=1e-3)


def test_dry_basis_hand_calculation():
    # Definition: X_dry = X_wet / (1 - X_H2O). Stoichiometric methane-air products: 2 of 10.52 moles water
    assert em.dry_mole_fraction(10e-6, 2 / 10.52) == pytest.approx(10e-6 * 10.52 / 8.52)
    with pytest.raises(ValueError):
        em.dry_mole_fraction(1e-6, 1.0)


# ---- mg/m3 and mg/kWh (pure)
def test_mass_concentration_matches_method_19_K_factor():
    # US EPA 40 CFR 60 Appendix A, Method 19, Table 19-1 (as quoted in 30 TAC 117.3142(b)(1)):
    # K = 1.194e-7 lb/scf per ppm NOx (as NO2), at 20 degC and 760 mm Hg
    mg_m3 = float(em.mass_concentration_mg_m3(1e-6, em.MOLAR_MASS_KG_KMOL["NO2"], T_K=293.15))
    assert mg_m3 * 1e-6 * LB_PER_KG / FT3_PER_M3 == pytest.approx(1.194e-7, rel=1e-3)
    # normal conditions (273.15 K, 101.325 kPa): 46.0055 / 22.414 = 2.0525 mg/m3 per ppm
    assert em.mass_concentration_mg_m3(1e-6, em.MOLAR_MASS_KG_KMOL["NO2"]) == pytest.approx(2.0525, abs=1e-4)


def test_specific_emission_hand_calculation():
    # Arithmetic shown: stoichiometric CH4-air (1:2:7.52), 10 ppm NO wet. M_mean = 27.633 kg/kmol
    # (fresh and burned: moles are conserved), Y_CH4 = 16.04246 / 290.70 = 0.055185; NOx as NO2
    # 10e-6 x 46.0055 / 27.633 = 1.6649e-5 kg/kg; heat input 0.055185 x 55.51 MJ/kg = 3.0635 MJ/kg
    # (ISO 6976 gross, 25 degC): 1.6649e-5 / 3.0635e6 x 3.6e12 = 19.56 mg/kWh.
    X, Y_fuel = _complete_combustion(1.0, AIR)
    M = _mean_molar_mass(X)
    assert M == pytest.approx(27.633, abs=1e-3) and Y_fuel == pytest.approx(0.055185, abs=1e-5)
    y = em.nox_as_no2_mass_fraction(10e-6, 0.0, M)
    gross = em.specific_emission_mg_kWh(y, Y_fuel, CH4_GROSS_J_KG, CH4_NET_J_KG, "gross")
    assert gross == pytest.approx(19.56, abs=0.01)
    # net basis: more mg per kWh by the ratio of the heating values (890.58 / 802.56 = 1.110)
    net = em.specific_emission_mg_kWh(y, Y_fuel, CH4_GROSS_J_KG, CH4_NET_J_KG, "net")
    assert net / gross == pytest.approx(890.58 / 802.56, rel=1e-4)
    with pytest.raises(ValueError, match="gross"):
        em.specific_emission_mg_kWh(y, Y_fuel, CH4_GROSS_J_KG, CH4_NET_J_KG, "higher")


def test_specific_emission_is_independent_of_dilution_and_agrees_with_the_concentration_route():
    # Definitions: the same NO per mole of fuel at phi 1.0 and 0.7 is the same mg/kWh; and mg/kWh =
    # (mg/m3, dry, at a reference O2) x (m3 of dry flue gas at that O2 per kWh), at every reference.
    results = []
    for phi in (1.0, 0.7):
        X, Y_fuel = _complete_combustion(phi, AIR_209)
        X_NO = 5e-5 * X["CO2"]  # 5e-5 mol NO per mol CH4
        M = _mean_molar_mass(X)
        by_mass = float(em.specific_emission_mg_kWh(em.nox_as_no2_mass_fraction(X_NO, 0.0, M), Y_fuel,
                                                     CH4_GROSS_J_KG, CH4_NET_J_KG, "gross"))
        O2_dry = 100 * X["O2"] / (1 - X["H2O"])
        heat = em.heat_input_J_kg(Y_fuel, CH4_GROSS_J_KG, CH4_NET_J_KG, "gross")
        for ref in (0.0, 3.0, 15.0):
            dry_ref = em.corrected_to_reference_O2(em.dry_mole_fraction(X_NO, X["H2O"]), O2_dry, ref)
            by_volume = em.mass_concentration_mg_m3(dry_ref, em.MOLAR_MASS_KG_KMOL["NO2"]) * em.dry_flue_gas_m3_kWh(
                M, X["H2O"], O2_dry, heat, ref)
            assert by_volume == pytest.approx(by_mass, rel=1e-12)
        results.append(by_mass)
    assert results[0] == pytest.approx(results[1], rel=1e-12)


def test_dry_flue_gas_volume_is_method_19_F_factor():
    # US EPA 40 CFR 60 Appendix A, Method 19, Table 19-2 (and 40 CFR 75 Appendix F): F_d = 8710 dscf
    # per 1e6 Btu (higher heating value, 20 degC, 29.92 inHg) for natural gas. Pure methane has a
    # little less dry gas per heat than pipeline gas with its ethane and CO2 (arithmetic: 8.569 mol
    # dry per 890.58 kJ -> 8624 dscf/MMBtu), so within 2 %.
    X, Y_fuel = _complete_combustion(1.0, AIR_209)
    heat = em.heat_input_J_kg(Y_fuel, CH4_GROSS_J_KG, CH4_NET_J_KG, "gross")
    m3_kWh = em.dry_flue_gas_m3_kWh(_mean_molar_mass(X), X["H2O"], 0.0, heat, 0.0, T_K=293.15)
    dscf_MMBtu = m3_kWh * KWH_PER_MMBTU * FT3_PER_M3
    assert dscf_MMBtu == pytest.approx(8624, rel=2e-3)
    assert dscf_MMBtu == pytest.approx(8710, rel=0.02)


def test_method_19_emission_rate_agrees_with_the_first_principles_mg_kWh():
    # US EPA Method 19, eq. 19-1 form: E = K C_d F_d 20.9 / (20.9 - %O2_d) [lb/MMBtu], with K
    # (Table 19-1) and F_d = 8710 (Table 19-2). 30 ppm dry NOx at 3 % O2 from methane: within the
    # F-factor's 1 % (pipeline gas against pure methane) of the mass route on the gross basis.
    # phi of 3 % dry O2, from O2_dry = (a - 2) / (a (1 + N2/O2) - 1) with a = 2 / phi mol O2 per mol CH4
    r, n2 = 0.03, AIR_209["N2"] / AIR_209["O2"]
    lean, Y_fuel = _complete_combustion(2.0 / ((2.0 - r) / (1.0 - r * (1.0 + n2))), AIR_209)
    O2_dry = 100 * lean["O2"] / (1 - lean["H2O"])
    assert O2_dry == pytest.approx(3.0, abs=1e-9)
    C_dry = 30e-6
    epa_lb_MMBtu = 1.194e-7 * 30 * 8710 * 20.9 / (20.9 - O2_dry)
    X_NO = C_dry * (1 - lean["H2O"])
    ours = em.specific_emission_mg_kWh(em.nox_as_no2_mass_fraction(X_NO, 0.0, _mean_molar_mass(lean)), Y_fuel,
                                       CH4_GROSS_J_KG, CH4_NET_J_KG, "gross")
    ours_lb_MMBtu = ours * 1e-6 * LB_PER_KG * KWH_PER_MMBTU
    assert ours_lb_MMBtu == pytest.approx(epa_lb_MMBtu, rel=0.015)
    assert epa_lb_MMBtu == pytest.approx(0.0365, abs=5e-4)


def test_g20_ppm_to_mg_kWh_factor_from_memory():
    # From memory: the European appliance standards' factor for G20 (methane), 1 ppm NOx at 0 % O2
    # dry = 1.764 mg/kWh, i.e. 2.054 mg/m3 x 0.859 m3 of dry stoichiometric flue gas per kWh. The
    # arithmetic gives 0.859 m3/kWh only on the net (lower) heating value, so the factor recalled is
    # on the net basis; on the gross basis, which Regulation 813/2013's 56 mg/kWh uses, it is 1.59.
    X, Y_fuel = _complete_combustion(1.0, {"O2": 20.95, "N2": 79.05})
    M = _mean_molar_mass(X)

    def per_ppm(basis):
        return float(em.specific_emission_mg_kWh(em.nox_as_no2_mass_fraction(1e-6 * (1 - X["H2O"]), 0.0, M), Y_fuel,
                                                 CH4_GROSS_J_KG, CH4_NET_J_KG, basis))
    assert per_ppm("net") == pytest.approx(1.764, rel=0.005)
    assert per_ppm("gross") == pytest.approx(1.59, abs=0.01)


def test_residence_time_is_exact_for_a_linear_velocity():
    # Kinematics: u = u0 + b z gives t(z) = ln(u/u0) / b, whatever the grid
    z = np.array([0.0, 0.001, 0.004, 0.01, 0.02])
    u = 0.4 + 150.0 * z
    assert em.residence_time_s(z, u) == pytest.approx(np.log(u / 0.4) / 150.0, rel=1e-12)
    with pytest.raises(ValueError):
        em.residence_time_s(z, -u)


# ---- nitrogen chemistry of a mechanism
def test_nitrogen_chemistry_of_mechanisms():
    assert has_nitrogen_chemistry(solution("gri30.yaml"))
    assert not has_nitrogen_chemistry(solution("h2o2.yaml"))  # N2 only inert or a collision partner
    gri = solution("gri30.yaml")
    # GRI-Mech 3.0 without the reactions of nitrogen-bearing species other than N2: NO has no source
    keep = [r for r in gri.reactions() if not any(gri.species(s).composition.get("N", 0) and s != "N2"
                                                  for s in {**r.reactants, **r.products})]
    stripped = ct.Solution(thermo="ideal-gas", kinetics="gas", species=gri.species(), reactions=keep)
    assert "NO" in stripped.species_names and not has_nitrogen_chemistry(stripped)
    with pytest.raises(ValueError, match="gri30.yaml"):
        burned_gas_history({"grid": [0, 1, 2], "T": [300] * 3, "velocity": [1] * 3, "Y": [[1, 1, 1]], "species": ["H2"],
                            "P": 1e5}, solution("h2o2.yaml"), [0.01])


# ---- the burned gas of GRI-Mech 3.0 methane-air flames (slow: two flames, the second warm-started)
@pytest.fixture(scope="module")
def flames():
    """phi -> (raw profile, profile as the store keeps it), methane-air, 1 atm, 300 K, coarse; phi 1
    warm-started from phi 0.7, as a sweep solves it (about half the cost of a fresh solve)."""
    gas = solution("gri30.yaml", "mixture-averaged")
    out: dict = {}
    for phi in (0.7, 1.0):
        X = mixtures.unburned_mixture({"CH4": 1.0}, AIR, phi, 2.0)
        warm = out[0.7][0] if out else None
        r = flame.solve_flame(gas, 300.0, ct.one_atm, X, "mixture-averaged", False, flame.NUMERICS["coarse"], warm=warm)
        assert r["status"] == "ok" and r["start"] == ("warm" if warm else "fresh")
        out[phi] = (r["profile"], profiles.decode(profiles.encode(r["profile"])))
    return out


@pytest.fixture(scope="module")
def gri():
    return solution("gri30.yaml")


TIMES_S = [0.0, 0.001, 0.002, 0.005, 0.01, 0.02, 0.03, 0.05, 0.1]


@pytest.mark.slow
def test_times_grow_and_the_domain_holds_about_twenty_ms_of_lean_burned_gas(flames, gri):
    raw, stored = flames[0.7]
    assert np.all(np.diff(em.residence_time_s(stored["grid"], stored["velocity"])) > 0)
    h = burned_gas_history(stored, gri, TIMES_S)
    # measured (docs/benchmarks.md): 22.2 ms coarse, 22.4 ms standard, to the last grid point but one
    assert 0.015 < h["domain_time_s"] < 0.03
    assert list(h["from_reactor"]) == [t > h["domain_time_s"] for t in TIMES_S]
    assert np.all(np.diff(h["mole_fractions"]["NO"]) > 0) and h["fuel_species"] == ["CH4"]
    # the store's rounded profile gives the same history as the solver's own
    h_raw = burned_gas_history(raw, gri, TIMES_S)
    assert h["mole_fractions"]["NO"] == pytest.approx(h_raw["mole_fractions"]["NO"], rel=1e-4)


@pytest.mark.slow
def test_outlet_point_is_a_copy_of_the_one_before(flames, gri):
    # Why the domain ends at the last point but one (chemistry.emissions docstring): Cantera's
    # outlet sets zero gradients, so the last point repeats the one before it
    for raw, _ in flames.values():
        assert raw["T"][-1] == pytest.approx(raw["T"][-2], rel=1e-9)
        assert np.allclose(raw["Y"][:, -1], raw["Y"][:, -2], rtol=0.0, atol=1e-8)  # the solver's tolerance


@pytest.mark.slow
@pytest.mark.parametrize("phi", [0.7, 1.0])
def test_the_plug_flow_continues_the_flame(flames, gri, phi):
    _, stored = flames[phi]
    d = burned_gas_history(stored, gri, [0.0])["domain_time_s"]
    h = burned_gas_history(stored, gri, [d - 1e-3, d * (1 - 1e-9), d * (1 + 1e-9), d + 1e-3])
    NO = h["mole_fractions"]["NO"]
    assert list(h["from_reactor"]) == [False, False, True, True]
    assert NO[2] == pytest.approx(NO[1], rel=1e-6)  # continuous at the domain end
    # and continues the profile's slope there (the profile's last millisecond, the reactor's first)
    assert (NO[3] - NO[2]) == pytest.approx(NO[1] - NO[0], rel=0.25)
    # A reactor started 5 ms after the peak heat release from the profile's own state reaches the
    # profile's NO at the domain end within 2 %: diffusion no longer matters there, and the
    # plug flow beyond the domain is the same model as the domain's burned gas.
    Y = np.asarray(stored["Y"])[:, :-1]
    t_grid = em.residence_time_s(stored["grid"][:-1], stored["velocity"][:-1])
    t_grid -= t_grid[-1] - d
    k = int(np.searchsorted(t_grid, 0.005))
    gri.TPY = stored["T"][k], stored["P"], dict(zip(stored["species"], Y[:, k]))
    reactor = ct.IdealGasConstPressureReactor(gri, clone=True)
    ct.ReactorNet([reactor]).advance(d - t_grid[k])
    assert reactor.phase["NO"].X[0] == pytest.approx(NO[1], rel=0.02)


@pytest.mark.slow
def test_thermal_no_grows_at_the_zeldovich_rate_in_hot_stoichiometric_gas(flames, gri):
    _, stored = flames[1.0]
    h = burned_gas_history(stored, gri, TIMES_S)
    NO = h["mole_fractions"]["NO"]
    assert np.all(np.diff(NO) > 0) and NO[TIMES_S.index(0.1)] > 3 * NO[TIMES_S.index(0.02)] > 0
    # Extended Zeldovich, early (NO far below equilibrium): dX_NO/dt = 2 k1 [O] X_N2, k1 = 1.8e14
    # exp(-38370/T) cm3/(mol s) (Hanson & Salimian 1984, as tabulated in Turns, An Introduction to
    # Combustion, 3rd ed., 2012, ch. 5; from memory), with the burned gas's own O atoms at the
    # domain end. Within a factor 2.
    d = h["domain_time_s"]
    end = burned_gas_history(stored, gri, [d, d + 2e-4])
    rate = float(np.diff(end["mole_fractions"]["NO"])[0]) / 2e-4
    Y = np.asarray(stored["Y"])[:, -2]
    gri.TPY = stored["T"][-2], stored["P"], dict(zip(stored["species"], Y))
    k1 = 1.8e14 * math.exp(-38370.0 / gri.T) * 1e-3  # m3/(kmol s)
    zeldovich = 2 * k1 * gri.concentrations[gri.species_index("O")] * gri["N2"].X[0]
    assert 0.5 < rate / zeldovich < 2.0


@pytest.mark.slow
def test_the_plug_flow_tends_to_the_equilibrium_of_the_burned_gas(flames, gri):
    # Thermodynamics: an adiabatic constant-pressure reactor tends to the HP equilibrium of its
    # start state; stoichiometric methane-air at 2230 K gets there within 2 s (measured: 0.0001 %)
    _, stored = flames[1.0]
    h = burned_gas_history(stored, gri, [2.0])
    assert h["mole_fractions"]["NO"][0] == pytest.approx(h["equilibrium_NO_mole_fraction"], rel=1e-3)
    assert h["T_K"][0] == pytest.approx(h["equilibrium_T_K"], abs=1.0)
    # equilibrium NO of stoichiometric methane-air products near 2200 K: about 0.2 % (from memory)
    assert 1500e-6 < h["equilibrium_NO_mole_fraction"] < 2500e-6


@pytest.mark.slow
def test_lean_methane_no_after_20_ms_is_in_the_published_range(flames, gri):
    _, stored = flames[0.7]
    h = burned_gas_history(stored, gri, [0.02])
    X = {k: float(v[0]) for k, v in h["mole_fractions"].items()}
    nox_dry = em.dry_mole_fraction(X["NO"] + X["NO2"], X["H2O"])
    O2_dry = 100 * X["O2"] / (1 - X["H2O"])
    at_15 = float(em.corrected_to_reference_O2(nox_dry, O2_dry, 15.0)) * 1e6
    at_3 = float(em.corrected_to_reference_O2(nox_dry, O2_dry, 3.0)) * 1e6
    # Measured: Rørtveit, Zepter, Skreiberg, Fossum & Hustad, Proc. Combust. Inst. 29 (2002)
    # 1123-1129, abstract: lean premixed CH4 (and CH4-H2) in porous, swirl and fiber burners,
    # excess air ratio 1.0-1.9 (phi 0.7 is 1.43), flame temperatures up to 1830 K: NOx below
    # 25 ppm at 3 % O2 in all but the fiber burner. Our adiabatic 1840 K flame after 20 ms (10.6 ppm):
    assert 3.0 < at_3 < 25.0
    # From memory: lean premixed methane near 1800-1850 K gives single-digit ppm at 15 % O2 at
    # combustor residence times (Leonard & Stegmaier, J. Eng. Gas Turbines Power 116 (1994) 542;
    # Correa, Combust. Sci. Technol. 87 (1992) 329; both from memory). Wide band (3.5 ppm here):
    assert 1.0 < at_15 < 10.0
    # flame-zone NO (at FLAME_ZONE_RISE_SHARE of the temperature rise) is most of it in a lean
    # flame: the N2O and NNH routes of the flame front, little thermal NO at 1840 K
    assert FLAME_ZONE_RISE_SHARE == 0.95 and 0.0 < h["flame_zone_time_s"] < 0.002
    assert 0.4 * X["NO"] < h["flame_zone_NO_mole_fraction"] < X["NO"]
    # NO2 and N2O are small beside NO here
    assert X["NO2"] < 0.01 * X["NO"] and X["N2O"] < 0.1 * X["NO"]


@pytest.mark.slow
def test_the_plug_flow_never_hangs(flames, gri):
    _, stored = flames[1.0]
    with pytest.raises(EmissionsIntegrationError, match="more than 1 steps"):
        burned_gas_history(stored, gri, [0.5], max_steps=1)
    with pytest.raises(EmissionsIntegrationError, match="CPU limit"):
        burned_gas_history(stored, gri, [0.5, 1.0], time_limit_s=0.0)
    with pytest.raises(ValueError, match=">= 0"):
        burned_gas_history(stored, gri, [-0.001])
