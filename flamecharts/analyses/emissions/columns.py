"""[emissions]' columns: results.csv's at the design residence time, emissions.csv's at every time."""
from __future__ import annotations

#: name -> (unit, long name), merged into columns.UNITS. Unit "1" = dimensionless, "" = text or flag.
UNITS: dict[str, tuple[str, str]] = {
    "residence_time_ms": ("ms", "burned-gas residence time after the flame's peak heat release"),
    "emissions_residence_time_ms": ("ms", "the design residence time the emission columns are read at"),
    "burned_gas_temperature_K": ("K", "temperature of the burned gas at the residence time"),
    "burned_gas_dry_o2_percent": ("%", "O2 of the dry burned gas at the residence time"),
    "beyond_flame_domain": ("", "true where the time lies beyond the flame's domain (adiabatic plug flow)"),
    "no_ppmvd_at_reference_o2": ("ppm", "NO, by volume of dry gas at the study's reference O2"),
    "no2_ppmvd_at_reference_o2": ("ppm", "NO2, by volume of dry gas at the study's reference O2"),
    "nox_ppmvd_at_reference_o2": ("ppm", "NOx (NO + NO2), by volume of dry gas at the study's reference O2"),
    "n2o_ppmvd_at_reference_o2": ("ppm", "N2O, by volume of dry gas at the study's reference O2"),
    "co_ppmvd_at_reference_o2": ("ppm", "CO, by volume of dry gas at the study's reference O2"),
    "unburned_hydrocarbons_ppmvd_at_reference_o2": ("ppm", "the fuel's hydrocarbon species left (each as itself, not "
                                                           "as C1), dry at the reference O2; H2 not counted: the hot "
                                                           "gas holds equilibrium H2 whatever the fuel"),
    "equilibrium_co_ppmvd_at_reference_o2": ("ppm", "CO of the burned state's HP equilibrium, dry at the reference O2: "
                                                    "where an adiabatic plug flow's CO levels off (hot gas, not a "
                                                    "cooled stack gas)"),
    "emissions_reference_o2_percent": ("%", "the dry O2 the ppm columns are corrected to ([emissions])"),
    "emissions_heating_value": ("", "heating-value basis of the mg/kWh columns: gross or net (empty: not reported)"),
    "flame_zone_no_ppmvd_at_reference_o2": ("ppm", "NO where the flame's temperature rise is 95 % complete, dry at "
                                                   "the reference O2 (with the burned gas's O2 and water)"),
    "equilibrium_no_ppmvd_at_reference_o2": ("ppm", "NO of the burned state's HP equilibrium, dry at the reference "
                                                    "O2 (the limit of a long residence time)"),
    "nox_mg_kwh": ("mg/kWh", "NOx counted as NO2 per kWh of fuel heat input (the study's heating-value basis)"),
    "co_mg_kwh": ("mg/kWh", "CO per kWh of fuel heat input (the study's heating-value basis)"),
    "emissions_note": ("", "why a burning point has no emission values"),
    "equal_flame_temperature_equivalence_ratio": ("1", "equivalence ratio at which this gas burns at the adiabatic "
                                                       "flame temperature of the unblended gas at this point's phi"),
    "nox_ppmvd_at_reference_o2_equal_flame_temperature": ("ppm", "NOx of this gas at that equivalence ratio, dry at the "
                                                                 "reference O2, after the design residence time"),
}

#: Emissions at the study's design residence time (empty unless the study has an [emissions] table).
POINT_COLUMNS = ("emissions_residence_time_ms", "burned_gas_temperature_K", "burned_gas_dry_o2_percent",
                 "nox_ppmvd_at_reference_o2", "no_ppmvd_at_reference_o2", "no2_ppmvd_at_reference_o2",
                 "n2o_ppmvd_at_reference_o2", "co_ppmvd_at_reference_o2",
                 "unburned_hydrocarbons_ppmvd_at_reference_o2", "flame_zone_no_ppmvd_at_reference_o2",
                 "equilibrium_no_ppmvd_at_reference_o2", "equilibrium_co_ppmvd_at_reference_o2",
                 "emissions_reference_o2_percent", "beyond_flame_domain", "nox_mg_kwh", "co_mg_kwh",
                 "emissions_heating_value", "equal_flame_temperature_equivalence_ratio",
                 "nox_ppmvd_at_reference_o2_equal_flame_temperature", "emissions_note")
#: emissions.csv: every residence time of every burning point ([emissions]), in this order.
TABLE_COLUMNS = ("fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
                 "unburned_temperature_K", "residence_time_ms", "beyond_flame_domain",
                 "burned_gas_temperature_K", "burned_gas_dry_o2_percent", "nox_ppmvd_at_reference_o2",
                 "no_ppmvd_at_reference_o2", "no2_ppmvd_at_reference_o2", "n2o_ppmvd_at_reference_o2",
                 "co_ppmvd_at_reference_o2", "unburned_hydrocarbons_ppmvd_at_reference_o2",
                 "equilibrium_co_ppmvd_at_reference_o2", "emissions_reference_o2_percent", "nox_mg_kwh",
                 "co_mg_kwh", "emissions_heating_value", "mechanism")
#: The extra CSV files of the analysis: file name -> its columns, in order (dataset.TABLE_ROWS fills them).
TABLES = {"emissions.csv": TABLE_COLUMNS}
#: The documentation's heading and "filled" note of POINT_COLUMNS (docs/outputs.md), and of each file of TABLES.
GROUP = ("Emissions", "empty unless the study has [emissions]: the design residence time's values")
TABLE_NOTES = {"emissions.csv": "The burned gas of each burning point at every residence time of [emissions]."}
