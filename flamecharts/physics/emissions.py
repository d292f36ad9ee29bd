"""Emissions from a burned gas's composition: dry basis, reference O2, mg/m3 and mg/kWh.

dry_mole_fraction            X_dry = X_wet / (1 - X_H2O)
corrected_to_reference_O2    X_ref = X_dry (20.9 - O2_ref) / (20.9 - O2_dry)
molar_volume_m3_kmol         V_m = R T / p at the normal conditions (273.15 K, 101.325 kPa)
mass_concentration_mg_m3     mole fraction (dry, at reference O2) -> mg per normal m3
mass_fraction                X M_k / M_mean
nox_as_no2_mass_fraction     NO and NO2 counted as NO2, per kg of burned gas
heat_input_J_kg              fuel heat input per kg of fresh mixture, gross or net basis
specific_emission_mg_kWh     pollutant mass per kWh of fuel heat input
dry_flue_gas_m3_kWh          normal m3 of dry flue gas (at a reference O2) per kWh of heat input
residence_time_s             t(z) = integral of dz/u along a flame's grid

Conventions (each with its source; the checks are in tests/test_emissions_core.py; "found" means
read in a stored public copy of the text, "from memory" that it was not):

- Concentrations for limits are dry: the water the analyser's cooler removes does not count.
- O2 reference: X_ref = X_dry (20.9 - O2_ref) / (20.9 - O2_dry), O2 in per cent of the dry gas,
  20.9 % being the O2 of dry air. US EPA practice: the fuel factor F_o = (20.9 - %O2)/%CO2 that
  checks O2 and CO2 analysers, "20.9 the percent O2 by volume in ambient air" (found; its method
  number, 3B, from memory) and Method 19's F-factor equations, 20.9/(20.9 - %O2) (40 CFR Part 60,
  Appendix A; from memory); the Quebec Clean Air Regulation (Q-2, r. 4.1, s. 71) writes the 15 % correction as
  E = Ea 5.9/(20.9 - A) (found). Other texts write 21: 40 CFR 60.284 (kraft pulp mills) and a
  Flemish regulation's annex on units, W = (21 - g)/(21 - Y) M (both found), and the EU's
  Directive 2010/75/EU (from memory); pass ``oxidizer_O2_percent=21`` to follow them (the two
  differ by at most about 1 % for flue gases of 0-14 % O2 at references of 3 and 15 %).
  What it means: the concentration after dry air is added to the flue gas (or taken out of it)
  until its O2 is the reference; for a fuel burned completely in air that is exactly the flue gas
  at another excess air. For another oxidizer (oxygen-enriched or vitiated air) the default 20.9
  keeps the regulatory formula, which then no longer describes another excess of that oxidizer;
  ``oxidizer_O2_percent`` set to the oxidizer's own dry O2 share gives the concentration at
  another excess of it. A flue gas with at least that much O2 cannot be brought to the reference
  by adding that oxidizer: refused (ValueError).
- Normal conditions 273.15 K and 101.325 kPa, ideal gas (the EU's reference state for mg/Nm3,
  from memory). US "standard" conditions are 20 degC (68 degF) and 29.92 inHg (Method 19, found).
- NOx is NO + NO2 counted as NO2 (molar mass of NO2): EU Regulation 2015/1188 ("exprimées en
  dioxyde d'azote", found) and Regulation 813/2013 (from memory); US EPA Method 19's K factor for
  NOx is NO2's (found: 1.194e-7 lb/scf per ppm, Table 19-1).
- mg/kWh: pollutant mass per kWh of fuel heat input. EU gas appliances are limited on the gross
  calorific value: Regulation 813/2013, Annex II 4(a), 56 mg/kWh of fuel input "in terms of GCV"
  for gas-fired boilers, and Regulation 2015/1188 for local space heaters ("sur la base du PCS")
  (both found); the EN 15502-1 NOx classes use the gross value too (from memory). US lb/MMBtu
  figures are on the higher heating value (Method 19's F-factors; found in a stored copy of
  40 CFR 75 Appendix F's table). The net basis gives 11 % more mg/kWh for methane (the ratio of
  its heating values), so the basis is an explicit argument with no default.
"""
from __future__ import annotations

import numpy as np
import numpy.typing as npt

#: O2 share of dry air [% by volume] in the O2 correction (US EPA Method 19; see above).
AIR_O2_PERCENT = 20.9
#: Normal conditions of emission concentrations [K], [Pa].
NORMAL_T_K = 273.15
NORMAL_P_PA = 101325.0
#: Molar gas constant [J/(kmol K)] (CODATA 2018, exact since the 2019 SI).
R_J_KMOL_K = 8314.462618
#: Molar masses [kg/kmol] from the IUPAC atomic weights ISO 6976:2016 uses (physics.gasprops):
#: N 14.0067, O 15.9994, C 12.0107.
MOLAR_MASS_KG_KMOL = {"NO": 30.0061, "NO2": 46.0055, "N2O": 44.0128, "CO": 28.0101}
J_PER_KWH = 3.6e6
MG_PER_KG = 1e6
#: Heating value bases: gross = higher = superior (water condensed), net = lower = inferior.
BASES = ("gross", "net")
#: The basis of the mg/kWh classes of EU gas appliances (Regulation 813/2013; see above).
APPLIANCE_BASIS = "gross"


def dry_mole_fraction(X_wet: npt.ArrayLike, X_H2O: npt.ArrayLike) -> np.ndarray:
    """Mole fraction on a dry basis, X_dry = X_wet / (1 - X_H2O) [-].

    The share of the species once the water is condensed out, as an analyser behind a
    cooler reads it (the definition of a dry basis, e.g. US EPA Method 19).

    Parameters
    ----------
    X_wet : mole fraction in the wet gas [-]
    X_H2O : water mole fraction of the wet gas [-], 0 <= X_H2O < 1

    Examples
    --------
    Stoichiometric methane-air burned completely (CO2 + 2 H2O + 7.52 N2): 10 ppm wet is

    >>> round(float(dry_mole_fraction(10e-6, 2 / 10.52)) * 1e6, 3)
    12.347
    """
    X_H2O = np.asarray(X_H2O, dtype=float)
    if np.any(X_H2O < 0) or np.any(X_H2O >= 1):
        raise ValueError(f"water mole fraction must be in [0, 1), got {X_H2O}")
    return np.asarray(X_wet, dtype=float) / (1.0 - X_H2O)


def corrected_to_reference_O2(X_dry: npt.ArrayLike, O2_dry_percent: npt.ArrayLike, reference_O2_percent: float,
                              oxidizer_O2_percent: float = AIR_O2_PERCENT) -> np.ndarray:
    """Dry mole fraction corrected to a reference O2, X_dry (20.9 - O2_ref) / (20.9 - O2_dry) [-].

    The concentration after dry air (``oxidizer_O2_percent`` of O2) is added to or taken out
    of the flue gas until its O2 is the reference, so that flue gases diluted differently
    compare (US EPA 40 CFR 60 Method 19 and Quebec Q-2, r. 4.1, s. 71 with 20.9; EU texts
    with 21; module docstring). Gas turbines report at 15 % O2, boilers at 3 %, the mg/kWh
    of appliances follow from 0 %.

    Parameters
    ----------
    X_dry : mole fraction on a dry basis [-]
    O2_dry_percent : O2 of the dry flue gas [% by volume], below ``oxidizer_O2_percent``
    reference_O2_percent : the reference O2 [% by volume, dry], 0 <= it < ``oxidizer_O2_percent``
    oxidizer_O2_percent : O2 of the dry air the formula dilutes with [%]: 20.9 (US EPA; the
        default), 21 (EU), or an enriched oxidizer's own share (see the module docstring)

    Raises
    ------
    ValueError : a flue gas with at least ``oxidizer_O2_percent`` O2 (air or an oxygen-richer
        gas: no dilution with air brings it to the reference), or a reference outside [0, it)

    Examples
    --------
    25 ppm dry at 10 % O2 is, at 15 % O2 (Quebec's form: 25 x 5.9 / 10.9),

    >>> round(float(corrected_to_reference_O2(25e-6, 10.0, 15.0)) * 1e6, 4)
    13.5321
    """
    O2 = np.asarray(O2_dry_percent, dtype=float)
    if not 0.0 <= reference_O2_percent < oxidizer_O2_percent:
        raise ValueError(f"reference O2 {reference_O2_percent:g} % must be in [0, {oxidizer_O2_percent:g}) %")
    if np.any(O2 < 0):
        raise ValueError(f"flue gas O2 {np.min(O2):g} % (dry) must be >= 0 %")
    if np.any(O2 >= oxidizer_O2_percent):
        raise ValueError(f"flue gas O2 {np.max(O2):g} % (dry) is not below the {oxidizer_O2_percent:g} % of the air in the "
                         "O2 correction: it is air or an oxygen-richer gas, not a flue gas diluted by air, so no "
                         "concentration at a reference O2 exists; report it uncorrected, or give the oxidizer's own "
                         "O2 share as oxidizer_O2_percent")
    return np.asarray(X_dry, dtype=float) * (oxidizer_O2_percent - reference_O2_percent) / (oxidizer_O2_percent - O2)


def molar_volume_m3_kmol(T_K: float = NORMAL_T_K, P_Pa: float = NORMAL_P_PA) -> float:
    """Ideal-gas molar volume V_m = R T / p [m3/kmol].

    Examples
    --------
    >>> round(molar_volume_m3_kmol(), 4), round(molar_volume_m3_kmol(293.15), 4)
    (22.414, 24.0551)
    """
    return R_J_KMOL_K * T_K / P_Pa


def mass_concentration_mg_m3(mole_fraction: npt.ArrayLike, molar_mass_kg_kmol: float,
                             T_K: float = NORMAL_T_K, P_Pa: float = NORMAL_P_PA) -> np.ndarray:
    """Mass concentration [mg per m3 of gas at T_K, P_Pa] of a species at a mole fraction.

    c = X M / V_m (ideal gas). With a dry mole fraction at a reference O2 it is the mg/m3
    (dry, at the reference O2, normal conditions) of emission limits.

    Parameters
    ----------
    mole_fraction : mole fraction [-] (1 ppm = 1e-6)
    molar_mass_kg_kmol : molar mass of the species as counted [kg/kmol] (NOx: NO2's)
    T_K, P_Pa : the conditions the volume is stated at [K], [Pa]; normal by default

    Examples
    --------
    1 ppm of NOx as NO2 and of CO at 273.15 K and 101.325 kPa [mg/m3]:

    >>> round(float(mass_concentration_mg_m3(1e-6, MOLAR_MASS_KG_KMOL["NO2"])), 4)
    2.0525
    >>> round(float(mass_concentration_mg_m3(1e-6, MOLAR_MASS_KG_KMOL["CO"])), 4)
    1.2497
    """
    return np.asarray(mole_fraction, dtype=float) * molar_mass_kg_kmol / molar_volume_m3_kmol(T_K, P_Pa) * MG_PER_KG


def mass_fraction(X: npt.ArrayLike, molar_mass_kg_kmol: float, mean_molar_mass_kg_kmol: npt.ArrayLike) -> np.ndarray:
    """Mass fraction Y = X M / M_mean [-] of a species at mole fraction X in a gas of mean molar mass M_mean.

    Examples
    --------
    >>> round(float(mass_fraction(10e-6, MOLAR_MASS_KG_KMOL["CO"], 27.633)) * 1e6, 4)
    10.1365
    """
    return np.asarray(X, dtype=float) * molar_mass_kg_kmol / np.asarray(mean_molar_mass_kg_kmol, dtype=float)


def nox_as_no2_mass_fraction(X_NO: npt.ArrayLike, X_NO2: npt.ArrayLike, mean_molar_mass_kg_kmol: npt.ArrayLike) -> np.ndarray:
    """Mass of NOx counted as NO2 per kg of gas, (X_NO + X_NO2) M_NO2 / M_mean [-].

    Each mole of NO counts as a mole of NO2 (the convention of NOx limits, "expressed as
    nitrogen dioxide": EU Regulation 813/2013, US EPA Method 19's K factor for NOx).
    N2O is not NOx in these limits.

    Parameters
    ----------
    X_NO, X_NO2 : mole fractions in the gas [-] (wet, as burned)
    mean_molar_mass_kg_kmol : mean molar mass of the same gas [kg/kmol]

    Examples
    --------
    >>> round(float(nox_as_no2_mass_fraction(9e-6, 1e-6, 27.633)) * 1e6, 4)
    16.6488
    """
    return mass_fraction(np.asarray(X_NO, dtype=float) + np.asarray(X_NO2, dtype=float), MOLAR_MASS_KG_KMOL["NO2"],
                         mean_molar_mass_kg_kmol)


def heat_input_J_kg(fuel_mass_fraction: float, gross_heating_value_J_kg: float, net_heating_value_J_kg: float,
                    basis: str) -> float:
    """Fuel heat input per kg of fresh mixture, Y_fuel H [J/kg], on the gross or the net basis.

    Parameters
    ----------
    fuel_mass_fraction : mass fraction of the fuel gas in the fresh mixture [-] (the whole fuel
        gas, its inerts included, when the heating values are per kg of that gas)
    gross_heating_value_J_kg, net_heating_value_J_kg : the fuel's heating values [J/kg of fuel]
        (gross = higher = superior, net = lower = inferior; physics.gasprops gives both by ISO 6976)
    basis : 'gross' or 'net', no default: EU appliance classes use 'gross' (APPLIANCE_BASIS)

    Examples
    --------
    Stoichiometric methane-air (Y_CH4 = 0.055188), ISO 6976:2016 at 25 degC: 890.58 and
    802.56 kJ/mol over 16.04246 g/mol:

    >>> round(heat_input_J_kg(0.055188, 890.58e3 / 16.04246e-3, 802.56e3 / 16.04246e-3, "gross") / 1e6, 4)
    3.0637
    """
    if basis not in BASES:
        raise ValueError(f"heating value basis {basis!r}: allowed 'gross' (higher) or 'net' (lower)")
    if not 0.0 < fuel_mass_fraction <= 1.0:
        raise ValueError(f"fuel mass fraction must be in (0, 1], got {fuel_mass_fraction}")
    return fuel_mass_fraction * (gross_heating_value_J_kg if basis == "gross" else net_heating_value_J_kg)


def specific_emission_mg_kWh(pollutant_mass_fraction: npt.ArrayLike, fuel_mass_fraction: float,
                             gross_heating_value_J_kg: float, net_heating_value_J_kg: float, basis: str) -> np.ndarray:
    """Pollutant mass per kWh of fuel heat input [mg/kWh], from first principles.

    Per kg of fresh mixture (= per kg of burned gas: mass is conserved) the pollutant mass is
    its mass fraction in the burned gas and the heat input Y_fuel H (:func:`heat_input_J_kg`):
    E = Y_pollutant / (Y_fuel H) x 3.6e6 J/kWh x 1e6 mg/kg. No dry basis or O2 reference
    enters: a mass per heat input does not change with dilution.

    Parameters
    ----------
    pollutant_mass_fraction : mass fraction of the pollutant in the burned gas [-]; NOx as
        NO2 from :func:`nox_as_no2_mass_fraction`
    fuel_mass_fraction, gross_heating_value_J_kg, net_heating_value_J_kg, basis : see
        :func:`heat_input_J_kg`

    Examples
    --------
    10 ppm NOx (wet) in stoichiometric methane-air products (hand calculation:
    1.66488e-5 / 3.0637e6 J/kg x 3.6e12):

    >>> y = nox_as_no2_mass_fraction(10e-6, 0.0, 27.633)
    >>> round(float(specific_emission_mg_kWh(y, 0.055188, 890.58e3 / 16.04246e-3, 802.56e3 / 16.04246e-3, "gross")), 2)
    19.56
    """
    heat = heat_input_J_kg(fuel_mass_fraction, gross_heating_value_J_kg, net_heating_value_J_kg, basis)
    return np.asarray(pollutant_mass_fraction, dtype=float) / heat * J_PER_KWH * MG_PER_KG


def dry_flue_gas_m3_kWh(mean_molar_mass_kg_kmol: float, X_H2O: float, O2_dry_percent: float, heat_input_J_per_kg: float,
                        reference_O2_percent: float = 0.0, T_K: float = NORMAL_T_K, P_Pa: float = NORMAL_P_PA,
                        oxidizer_O2_percent: float = AIR_O2_PERCENT) -> float:
    """Volume of dry flue gas at T_K, P_Pa and at a reference O2 per kWh of heat input [m3/kWh].

    Per kg of burned gas (1 / M_mean kmol, of which 1 - X_H2O dry), taken to the reference O2
    (volume scales as (20.9 - O2_dry) / (20.9 - O2_ref), the inverse of the concentration
    correction), over the heat input per kg. Times a concentration in mg/m3 at the same
    reference it gives mg/kWh; at 0 % O2 and 20 degC it is US EPA Method 19's dry F-factor F_d
    in metric units (8710 dscf/MMBtu for natural gas, on the higher heating value).

    Parameters
    ----------
    mean_molar_mass_kg_kmol : of the burned (wet) gas [kg/kmol]
    X_H2O : its water mole fraction [-]
    O2_dry_percent : its O2 on a dry basis [%]
    heat_input_J_per_kg : fuel heat input per kg of fresh mixture [J/kg] (:func:`heat_input_J_kg`)
    reference_O2_percent, oxidizer_O2_percent : as :func:`corrected_to_reference_O2`
    T_K, P_Pa : conditions of the volume [K], [Pa]

    Examples
    --------
    Stoichiometric methane in air of 20.9 % O2, burned completely (1 CO2 + 2 H2O + 7.5694 N2,
    M_mean = 27.6276): 8.5694 kmol dry per 890.58 MJ (gross, 25 degC) is 0.7764 m3/kWh:

    >>> round(dry_flue_gas_m3_kWh(27.6276, 2 / 10.5694, 0.0, 890.58e6 / (10.5694 * 27.6276)), 4)
    0.7764
    """
    dry_kmol_per_kg = (1.0 - X_H2O) / mean_molar_mass_kg_kmol
    volume_m3_per_kg = dry_kmol_per_kg * molar_volume_m3_kmol(T_K, P_Pa)
    to_reference = 1.0 / float(corrected_to_reference_O2(1.0, O2_dry_percent, reference_O2_percent, oxidizer_O2_percent))
    return volume_m3_per_kg * to_reference / heat_input_J_per_kg * J_PER_KWH


def residence_time_s(grid_m: npt.ArrayLike, velocity_m_s: npt.ArrayLike) -> np.ndarray:
    """Time a fluid particle takes from the first grid point to each point, t(z) = integral of dz/u [s].

    A steady one-dimensional flow carries a particle at its local velocity u(z), so its
    time of flight is the integral of dz/u (kinematics). Integrated exactly for u linear between
    grid points: dt = dz / u_lm with u_lm the logarithmic mean of the two velocities (the plain
    mean where they are equal), so the steep rise of u through the flame adds no error of its own.

    Parameters
    ----------
    grid_m : positions [m], increasing
    velocity_m_s : axial velocity there [m/s], > 0

    Examples
    --------
    >>> [round(float(t), 6) for t in residence_time_s([0.0, 0.01, 0.02], [2.0, 2.0, 4.0])]
    [0.0, 0.005, 0.008466]
    """
    z = np.asarray(grid_m, dtype=float)
    u = np.asarray(velocity_m_s, dtype=float)
    if np.any(u <= 0) or np.any(np.diff(z) <= 0):
        raise ValueError("residence time needs increasing positions and positive velocities")
    u1, u2 = u[:-1], u[1:]
    with np.errstate(divide="ignore", invalid="ignore"):
        log_mean = np.where(np.isclose(u1, u2, rtol=1e-9, atol=0.0), 0.5 * (u1 + u2), (u2 - u1) / np.log(u2 / u1))
    return np.concatenate([[0.0], np.cumsum(np.diff(z) / log_mean)])
