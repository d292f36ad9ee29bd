"""[emissions]' read-out: a point's emission columns from its stored burned-gas history.

emissions_at      the burned gas at one residence time: ppm dry at the reference O2, mg/kWh
emission_columns  results.csv's columns at the design residence time, every time for emissions.csv
READ_OUT          what design.annotate calls for every point (flamecharts.analyses)

Read-out only: the reference O2, the heating-value basis and mg/kWh are applied here, so
changing them integrates nothing.
"""
from __future__ import annotations

from typing import TYPE_CHECKING, Any

from ...physics import emissions as em_phys
from .columns import POINT_COLUMNS
from .table import Emissions, of

if TYPE_CHECKING:
    from ...config import Study

#: Species of the burned gas reported in ppm (dry, at the reference O2), by column stem.
PPM_SPECIES = (("no", ("NO",)), ("no2", ("NO2",)), ("nox", ("NO", "NO2")), ("n2o", ("N2O",)), ("co", ("CO",)))


def emissions_at(em: Emissions, gas_row: dict, phi: float, hist: dict, i: int,
                 hydrocarbons: frozenset[str] = frozenset()) -> dict:
    """The burned gas of a stored history (chemistry.emissions.burned_gas_history) at its
    ``i``-th residence time: ppm by volume on the dry gas corrected to the study's reference
    O2 (physics.emissions.corrected_to_reference_O2, 20.9 % air) of NO, NO2, NOx (NO + NO2),
    N2O, CO and the unburned fuel hydrocarbons (``hydrocarbons``: the fuel's species with carbon;
    H2 is not counted, as the hot gas holds equilibrium H2 whatever the fuel), the equilibrium NO
    and CO of the burned state (an adiabatic plug flow's CO tends to that hot-gas value, not to a
    stack value), and NOx (as NO2) and CO in mg/kWh of the fuel gas's
    heat input on the study's heating-value basis (physics.emissions.specific_emission_mg_kWh;
    the fuel gas's mass fraction in the fresh mixture is 1 / (1 + AFR_st / phi)).
    Concentrations are None where the burned gas holds 20.9 % O2 or more (no reference exists)."""
    X = {s: float(v[i]) for s, v in hist["mole_fractions"].items()}
    h2o = X.get("H2O", 0.0)
    o2_dry = 100.0 * float(em_phys.dry_mole_fraction(X.get("O2", 0.0), h2o))
    out: dict[str, Any] = {"residence_time_ms": 1e3 * float(hist["times_s"][i]),
                           "burned_gas_temperature_K": float(hist["T_K"][i]), "burned_gas_dry_o2_percent": o2_dry,
                           "beyond_flame_domain": bool(hist["from_reactor"][i]),
                           "emissions_reference_o2_percent": em.reference_oxygen_percent,
                           "emissions_heating_value": em.heating_value if em.specific else ""}

    def ppm(x_wet: float) -> float | None:
        if o2_dry >= em_phys.AIR_O2_PERCENT:
            return None
        return 1e6 * float(em_phys.corrected_to_reference_O2(em_phys.dry_mole_fraction(x_wet, h2o), o2_dry,
                                                             em.reference_oxygen_percent))
    for stem, species in PPM_SPECIES:
        out[f"{stem}_ppmvd_at_reference_o2"] = ppm(sum(X.get(s, 0.0) for s in species))
    out["unburned_hydrocarbons_ppmvd_at_reference_o2"] = ppm(sum(X.get(s, 0.0) for s in hist["fuel_species"]
                                                                 if s in hydrocarbons))
    out["flame_zone_no_ppmvd_at_reference_o2"] = ppm(float(hist["flame_zone_NO_mole_fraction"]))
    eq = hist["equilibrium_mole_fractions"]
    eq_o2 = 100.0 * float(em_phys.dry_mole_fraction(eq.get("O2", 0.0), eq.get("H2O", 0.0)))
    for stem, species in (("no", ("NO",)), ("co", ("CO",))):
        out[f"equilibrium_{stem}_ppmvd_at_reference_o2"] = None if eq_o2 >= em_phys.AIR_O2_PERCENT else 1e6 * float(
            em_phys.corrected_to_reference_O2(em_phys.dry_mole_fraction(sum(eq.get(s, 0.0) for s in species),
                                                                        eq.get("H2O", 0.0)), eq_o2,
                                              em.reference_oxygen_percent))
    out["nox_mg_kwh"] = out["co_mg_kwh"] = None
    if em.specific:
        y_fuel = 1.0 / (1.0 + gas_row["stoich_oxidizer_mass_kg_kg"] / phi)
        heat = (1e6 * gas_row["higher_heating_value_MJ_kg"], 1e6 * gas_row["lower_heating_value_MJ_kg"])
        M = float(hist["mean_molar_mass_kg_kmol"][i])
        y = {"nox": em_phys.nox_as_no2_mass_fraction(X.get("NO", 0.0), X.get("NO2", 0.0), M),
             "co": em_phys.mass_fraction(X.get("CO", 0.0), em_phys.MOLAR_MASS_KG_KMOL["CO"], M)}
        for stem, y_k in y.items():
            out[f"{stem}_mg_kwh"] = float(em_phys.specific_emission_mg_kWh(y_k, y_fuel, *heat, em.heating_value))
    return out


def emission_columns(study: Study, row: dict, gas_row: dict) -> dict:
    """POINT_COLUMNS of a point at the study's design residence time (:func:`emissions_at`),
    and ``emissions_by_time`` (not a column: every residence time, for emissions.csv and the
    netCDF's residence-time dimension). Empty without [emissions] or for a point without a
    burning flame; ``emissions_note`` says why a burning point has none."""
    em = of(study)
    out: dict[str, Any] = dict.fromkeys(POINT_COLUMNS)
    out["emissions_by_time"] = []
    hist = row.pop("emissions_history", None)
    message = row.pop("emissions_message", None)
    equal = row.pop("equal_tad", None)
    if em is None or row["status"] != "ok":
        return out
    if hist is None:
        out["emissions_note"] = (f"not computed: {message}" if message else "not computed yet: run the study again "
                                 "(flamecharts run) to integrate the burned gas, no flame is solved again")
        return out
    carbon = frozenset(s for s in hist["fuel_species"] if study.atoms.get(s, {}).get("C", 0) > 0)
    by_time = [emissions_at(em, gas_row, row["equivalence_ratio"], hist, i, carbon) for i in range(len(hist["times_s"]))]
    i_design = min(range(len(by_time)),
                   key=lambda i: abs(by_time[i]["residence_time_ms"] - 1e3 * em.design_residence_time_s))
    design = by_time[i_design]
    out.update({k: v for k, v in design.items() if k in out})
    out.update(emissions_residence_time_ms=design["residence_time_ms"],
               emissions_reference_o2_percent=em.reference_oxygen_percent,
               emissions_heating_value=em.heating_value if em.specific else "")
    if row["blend_fraction"] == 0.0 and em.equal_flame_temperature:  # the reference burns at its own temperature
        out.update(equal_flame_temperature_equivalence_ratio=row["equivalence_ratio"],
                   nox_ppmvd_at_reference_o2_equal_flame_temperature=design["nox_ppmvd_at_reference_o2"])
    elif equal and equal.get("history") and equal.get("status") == "ok":
        at = emissions_at(em, gas_row, equal["phi"], equal["history"], i_design, carbon)
        out.update(equal_flame_temperature_equivalence_ratio=equal["phi"],
                   nox_ppmvd_at_reference_o2_equal_flame_temperature=at["nox_ppmvd_at_reference_o2"])
    out["emissions_note"] = ""
    out["emissions_by_time"] = by_time
    return out


READ_OUT = emission_columns
#: The stored values READ_OUT takes from each row (merged in by solve.with_emissions and
#: solve.with_equal_tad; results.py carries them from the metrics to the row).
METRICS = ("emissions_history", "emissions_message", "equal_tad")
