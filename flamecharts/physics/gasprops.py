"""Fuel-gas properties by the ISO 6976:2016 method: heating values, density, Wobbe index.

molar_mass            M = sum x_j M_j
compression_factor    Z = 1 - (sum x_j s_j)^2
ideal_volume_cv       molar heating value -> per cubic metre at the metering state
relative_density      d = (M / M_air) (Z_air / Z)
wobbe_index           W = H_v / sqrt(d)
fuel_gas_properties   all of the above for a composition, with the reference state stated

Data: ISO 6976:2016, Natural gas - Calculation of calorific values, density, relative
density and Wobbe indices from composition, Table 1 (molar masses), Table 2
(summation factors) and Table 3 (molar superior calorific values), for the species
below (the sources of each row are given beside the table); the inferior value by
the standard's equation, superior minus (n_H/2) times the molar enthalpy of
vaporisation of water at the combustion temperature. Species outside the table fall
back to ideal-gas values from the mechanism's thermodynamic data (summation factor
0), and the result is flagged.

Reference states: combustion at 0, 15 or 25 degC; metering at 0 or 15 degC; both at
101.325 kPa. "15/15" is the European base for appliance test gases (EN 437).
"""
from __future__ import annotations

import math
from collections.abc import Mapping
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
#:
#: Sources. CH4 to CO2 (the first seven rows): ISO 6976:2016, Tables 1-3, as read from open
#: implementations of the standard (the worked examples of Annex D check them: tests/test_gasprops.py).
#: All other rows: ISO 6976:2016 Table 1 (M), Table 2 (s at 15 and 0 degC) and Table 3
#: (superior value at 25, 15 and 0 degC), as copied into the open R package
#: ISO6976.2016, R. Forster, version 0.1-0, 2026 (GPL-3; src/iso6976.cpp, arrays TAB_M,
#: TAB_S, TAB_HC, which it labels Tables A.2-A.4), and identically in E. van der Werff's
#: Python port of that package, iso6976-py_2016, 2026 (src/iso6976/_tables.py). That
#: copy holds every value of the first seven rows as written here, and with it
#: this module reproduces ISO 6976:2016 Annex D example 3 (C4-C6 alkanes) to the printed
#: digits (tests/test_gasprops.py). Cross-checks, not copied from: the superior values
#: and molar masses of the alkanes, C3H6, H2S and H2O equal those of the gross
#: calorific-value table (2016 form: five temperatures with 15.55 degC, and
#: uncertainties) hard-coded in VSL's Met4H2 (met4h2.py); the alkane summation factors
#: equal those of Equinor's NeqSim (src/main/resources/data/ISO6976constants2016.csv).
#: For C3H6, H2S, H2O, O2, He and Ar the summation factors rest on the Forster
#: copy alone: NeqSim's file has other values for them (and H2 0, CO
#: 0.0224, against the 2016 -0.0100 and 0.0217 above), so it was not used for them.
#: Molar masses: each equals the sum of the IUPAC atomic weights the standard uses
#: (C 12.0107, H 1.00794, O 15.9994, N 14.0067, S 32.065, He 4.002602, Ar 39.948;
#: derived from the first seven rows for C, H, O, N; checked in tests/test_gasprops.py).
#: Water's superior value is the enthalpy of vaporisation of water (inferior value 0),
#: as in the standard's Table 3; O2, He and Ar have no heating value.
ISO6976_2016 = {
    "CH4": (16.04246, 4, {25: 890.58, 15: 891.51, 0: 892.92}, {15: 0.04452, 0: 0.04886}),
    "C2H6": (30.06904, 6, {25: 1560.69, 15: 1562.14, 0: 1564.35}, {15: 0.0919, 0: 0.0997}),
    "C3H8": (44.09562, 8, {25: 2219.17, 15: 2221.10, 0: 2224.03}, {15: 0.1344, 0: 0.1465}),
    "H2": (2.01588, 2, {25: 285.83, 15: 286.15, 0: 286.64}, {15: -0.0100, 0: -0.0100}),
    "CO": (28.0101, 0, {25: 282.98, 15: 282.91}, {15: 0.0217, 0: 0.0258}),
    "N2": (28.0134, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: 0.0170, 0: 0.0214}),
    "CO2": (44.0095, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: 0.0752, 0: 0.0821}),
    # Alkanes (the standard's names: n-butane, 2-methylpropane, n-pentane, 2-methylbutane,
    # 2,2-dimethylpropane, n-hexane, n-heptane, n-octane)
    "n-C4H10": (58.1222, 10, {25: 2877.40, 15: 2879.76, 0: 2883.35}, {15: 0.1840, 0: 0.2022}),
    "i-C4H10": (58.1222, 10, {25: 2868.20, 15: 2870.58, 0: 2874.21}, {15: 0.1722, 0: 0.1885}),
    "n-C5H12": (72.14878, 12, {25: 3535.77, 15: 3538.60, 0: 3542.91}, {15: 0.2361, 0: 0.2586}),
    "i-C5H12": (72.14878, 12, {25: 3528.83, 15: 3531.68, 0: 3536.01}, {15: 0.2251, 0: 0.2458}),
    "neo-C5H12": (72.14878, 12, {25: 3514.61, 15: 3517.44, 0: 3521.75}, {15: 0.2040, 0: 0.2245}),
    "n-C6H14": (86.17536, 14, {25: 4194.95, 15: 4198.24, 0: 4203.24}, {15: 0.3001, 0: 0.3319}),
    "n-C7H16": (100.20194, 16, {25: 4853.43, 15: 4857.18, 0: 4862.88}, {15: 0.3668, 0: 0.4076}),
    "n-C8H18": (114.22852, 18, {25: 5511.80, 15: 5516.01, 0: 5522.41}, {15: 0.4346, 0: 0.4845}),
    # Alkene
    "C3H6": (42.07974, 6, {25: 2058.02, 15: 2059.43, 0: 2061.57}, {15: 0.1267, 0: 0.1381}),
    # Other gases
    "H2S": (34.08088, 2, {25: 562.01, 15: 562.38, 0: 562.93}, {15: 0.0923, 0: 0.1006}),
    "H2O": (18.01528, 2, {25: 44.013, 15: 44.431, 0: 45.064}, {15: 0.2562, 0: 0.3093}),
    "O2": (31.9988, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: 0.0276, 0: 0.0311}),
    "He": (4.002602, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: -0.0100, 0: -0.0100}),
    "Ar": (39.948, 0, {25: 0.0, 15: 0.0, 0: 0.0}, {15: 0.0273, 0: 0.0307}),
}
COMBUSTION_TEMPERATURES_C = (0, 15, 25)
METERING_TEMPERATURES_C = (0, 15)


def molar_mass(X: Mapping[str, float], M: Mapping[str, float]) -> float:
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


def compression_factor(X: Mapping[str, float], s: Mapping[str, float]) -> float:
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


def ideal_volume_cv(H_molar_kJ_mol: float, Z: float, T_meter_K: float, P: float = P_ISO) -> float:
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


def relative_density(M: float, Z: float, Z_air: float, M_air: float = M_AIR) -> float:
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


def wobbe_index(H_v: float, d: float) -> float:
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


def fuel_gas_properties(X: Mapping[str, float], combustion_T_C: int = 15, metering_T_C: int = 15,
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
