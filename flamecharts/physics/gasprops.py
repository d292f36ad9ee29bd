"""Fuel-gas properties by the ISO 6976:2016 method: heating values, density, Wobbe index.

molar_mass            M = sum x_j M_j
compression_factor    Z = 1 - (sum x_j s_j)^2
ideal_volume_cv       molar heating value -> per cubic metre at the metering state
relative_density      d = (M / M_air) (Z_air / Z)
wobbe_index           W = H_v / sqrt(d)
fuel_gas_properties   all of the above for a composition, with the reference state stated

Data: ISO 6976:2016, Natural gas - Calculation of calorific values, density, relative
density and Wobbe indices from composition, Table 3 (molar masses), Table 2
(summation factors) and Table 3 (molar superior calorific values), for the species
below; the inferior value by the standard's equation, superior minus (n_H/2) times
the molar enthalpy of vaporisation of water at the combustion temperature. Species
outside the table fall back to ideal-gas values from the mechanism's thermodynamic
data (summation factor 0), and the result is flagged.

Reference states: combustion at 0, 15 or 25 degC; metering at 0 or 15 degC; both at
101.325 kPa. "15/15" is the European base for appliance test gases (EN 437).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

#: Molar gas constant of ISO 6976:2016 [J/(mol K)]
R_ISO = 8.3144621
P_ISO = 101325.0  # Pa
#: Molar mass of dry air, ISO 6976:2016 [g/mol], and its compression factor by metering temperature [degC]
M_AIR = 28.96546
Z_AIR = {15: 0.999595, 0: 0.999419}
#: Molar enthalpy of vaporisation of water by combustion temperature [degC] -> kJ/mol (ISO 6976:2016)
L_WATER = {25: 44.013, 15: 44.431, 0: 45.064}

#: species -> (M g/mol, hydrogen atoms, {T_comb degC: superior kJ/mol}, {T_meter degC: summation factor})
ISO6976_2016 = {
    "CH4": (16.04246, 4, {25: 890.58, 15: 891.51, 0: 892.92}, {15: 0.04452, 0: 0.04886}),
    "C2H6": (30.06904, 6, {25: 1560.69, 15: 1562.14, 0: 1564.35}, {15: 0.0919, 0: 0.0997}),
    "C3H8": (44.09562, 8, {25: 2219.17, 15: 2221.10, 0: 2224.03}, {15: 0.1344, 0: 0.1465}),
    "H2": (2.01588, 2, {25: 285.83, 15: 286.15, 0: 286.64}, {15: -0.0100, 0: -0.0100}),
    "CO": (28.0101, 0, {25: 282.98, 15: 282.91}, {15: 0.0217, 0: 0.0258}),
    "N2": (28.0134, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: 0.0170, 0: 0.0214}),
    "CO2": (44.0095, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: 0.0752, 0: 0.0821}),
}
COMBUSTION_TEMPERATURES_C = (0, 15, 25)
METERING_TEMPERATURES_C = (0, 15)


def molar_mass(X, M):
    """Molar mass of a mixture, M = sum x_j M_j [g/mol] (ISO 6976:2016, eq. 1).

    Parameters
    ----------
    X : species -> mole fraction [-]
    M : species -> molar mass [g/mol]

    Examples
    --------
    >>> round(molar_mass({"CH4": 0.5, "H2": 0.5}, {"CH4": 16.04246, "H2": 2.01588}), 5)
    9.02917
    """
    return sum(x * M[k] for k, x in X.items())


def compression_factor(X, s):
    """Compression factor of a gas mixture, Z = 1 - (sum x_j s_j)^2 [-] (ISO 6976:2016, eq. 2).

    Parameters
    ----------
    X : species -> mole fraction [-]
    s : species -> summation factor [-] at the metering temperature

    Examples
    --------
    Methane at 15 degC (s = 0.04452, ISO 6976:2016 Table 2):

    >>> round(compression_factor({"CH4": 1.0}, {"CH4": 0.04452}), 6)
    0.998018
    """
    return 1.0 - sum(x * s[k] for k, x in X.items()) ** 2


def ideal_volume_cv(H_molar_kJ_mol, Z, T_meter_K, P=P_ISO):
    """Real-gas volumetric heating value H_v = H_m p / (Z R T) [MJ/m^3] (ISO 6976:2016, eq. 7 with 9).

    Parameters
    ----------
    H_molar_kJ_mol : molar heating value [kJ/mol]
    Z : compression factor of the gas at the metering state [-]
    T_meter_K : metering temperature [K]
    P : metering pressure [Pa]

    Examples
    --------
    ISO 6976:2016 Annex D, example 1 (15/15): 906.1799588 kJ/mol, Z 0.99776224 -> 38.410611 MJ/m^3

    >>> round(ideal_volume_cv(906.1799588, 0.99776224, 288.15), 6)
    38.410611
    """
    return H_molar_kJ_mol * P / (Z * R_ISO * T_meter_K) / 1000.0


def relative_density(M, Z, Z_air, M_air=M_AIR):
    """Real-gas relative density d = (M / M_air)(Z_air / Z) [-] (ISO 6976:2016, eq. 12).

    Parameters
    ----------
    M : molar mass of the gas [g/mol]
    Z : compression factor of the gas [-]
    Z_air : compression factor of dry air at the same state [-]
    M_air : molar mass of dry air [g/mol]

    Examples
    --------
    >>> round(relative_density(16.04246, 0.998018, 0.999595), 5)
    0.55472
    """
    return (M / M_air) * (Z_air / Z)


def wobbe_index(H_v, d):
    """Wobbe index W = H_v / sqrt(d) [MJ/m^3] (ISO 6976:2016, eq. 14).

    Gases of equal Wobbe index give the same thermal input through the same nozzle
    at the same supply pressure (orifice flow), which is why gas interchangeability
    is judged on it.

    Examples
    --------
    >>> round(wobbe_index(37.78, 0.5548), 2)
    50.72
    """
    return H_v / math.sqrt(d)


@dataclass(frozen=True)
class GasProperties:
    """Properties of a fuel gas at a stated reference state (see ``conditions``)."""

    molar_mass_g_mol: float
    compression_factor: float
    superior_molar_kJ_mol: float
    inferior_molar_kJ_mol: float
    higher_heating_value_MJ_kg: float
    lower_heating_value_MJ_kg: float
    higher_heating_value_MJ_m3: float
    lower_heating_value_MJ_m3: float
    relative_density: float
    higher_wobbe_index_MJ_m3: float
    lower_wobbe_index_MJ_m3: float
    conditions: str
    method: str            # "ISO 6976:2016" or "ISO 6976:2016 + ideal-gas fallback for ..."
    fallback_species: tuple[str, ...]


def fuel_gas_properties(X, combustion_T_C: int = 15, metering_T_C: int = 15,
                        fallback: dict | None = None) -> GasProperties:
    """ISO 6976:2016 properties of a fuel gas (real gas, 101.325 kPa).

    Parameters
    ----------
    X : species -> mole fraction [-] (normalised here)
    combustion_T_C : combustion reference temperature [degC], 0, 15 or 25
    metering_T_C : metering reference temperature [degC], 0 or 15
    fallback : species -> (M g/mol, n_H, superior kJ/mol) for species outside the ISO
        table (ideal gas: summation factor 0); see :func:`fallback_data`

    Examples
    --------
    ISO 6976:2016 Annex D, example 1, at 15/15 (printed: 52.113961 MJ/kg, 38.410611 MJ/m^3):

    >>> p = fuel_gas_properties({"CH4": 0.933212, "C2H6": 0.025656, "C3H8": 0.015368,
    ...                          "N2": 0.010350, "CO2": 0.015414})
    >>> round(p.higher_heating_value_MJ_kg, 6), round(p.higher_heating_value_MJ_m3, 6)
    (52.113961, 38.410611)
    """
    if combustion_T_C not in COMBUSTION_TEMPERATURES_C:
        raise ValueError(f"combustion temperature {combustion_T_C} degC: allowed 0, 15, 25")
    if metering_T_C not in METERING_TEMPERATURES_C:
        raise ValueError(f"metering temperature {metering_T_C} degC: allowed 0, 15")
    total = sum(X.values())
    X = {k: v / total for k, v in X.items() if v > 0}
    M, s, Hs, nH, used_fallback = {}, {}, {}, {}, []
    for sp in X:
        row = ISO6976_2016.get(sp)
        if row is not None and combustion_T_C in row[2]:
            M[sp], nH[sp], Hs[sp], s[sp] = row[0], row[1], row[2][combustion_T_C], row[3][metering_T_C]
        elif fallback is not None and sp in fallback:
            M[sp], nH[sp], Hs[sp] = fallback[sp]
            s[sp] = 0.0
            used_fallback.append(sp)
        else:
            raise ValueError(f"species {sp} is not in the ISO 6976 table and has no fallback data")
    Mm = molar_mass(X, M)
    Z = compression_factor(X, s)
    Hs_m = sum(x * Hs[k] for k, x in X.items())
    Hi_m = Hs_m - sum(x * nH[k] / 2.0 for k, x in X.items()) * L_WATER[combustion_T_C]
    T_meter = 273.15 + metering_T_C
    Hs_v = ideal_volume_cv(Hs_m, Z, T_meter)
    Hi_v = ideal_volume_cv(Hi_m, Z, T_meter)
    d = relative_density(Mm, Z, Z_AIR[metering_T_C])
    method = "ISO 6976:2016" + (f" + ideal-gas fallback for {', '.join(used_fallback)}" if used_fallback else "")
    return GasProperties(
        molar_mass_g_mol=Mm, compression_factor=Z, superior_molar_kJ_mol=Hs_m, inferior_molar_kJ_mol=Hi_m,
        higher_heating_value_MJ_kg=Hs_m / Mm, lower_heating_value_MJ_kg=Hi_m / Mm,
        higher_heating_value_MJ_m3=Hs_v, lower_heating_value_MJ_m3=Hi_v, relative_density=d,
        higher_wobbe_index_MJ_m3=wobbe_index(Hs_v, d), lower_wobbe_index_MJ_m3=wobbe_index(Hi_v, d),
        conditions=(f"combustion {combustion_T_C} degC, metering {metering_T_C} degC, 101.325 kPa, real gas"),
        method=method, fallback_species=tuple(used_fallback))
