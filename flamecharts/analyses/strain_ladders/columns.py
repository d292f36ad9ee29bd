"""[stretch]'s columns: stretch.csv's, one row per strained-flame ladder."""
from __future__ import annotations

#: name -> (unit, long name), merged into columns.UNITS. Unit "1" = dimensionless, "" = text or flag.
UNITS: dict[str, tuple[str, str]] = {
    "extinction_strain_rate_1_s": ("1/s", "largest strain rate of the twin counterflow flame that still burned "
                                          "(largest |du/dz| ahead of the flame)"),
    "extinguished_above_1_s": ("1/s", "strain rate of the nozzle velocity at which the twin flame went out"),
    "markstein_number_strain": ("1", "Markstein number of the consumption speed against strain, low-strain slope"),
    "half_separation_mm": ("mm", "nozzle to symmetry plane of the twin counterflow flame"),
    "characteristic_strain_1_s": ("1/s", "strain the burner imposes where the flame is held: wall velocity "
                                         "gradient at the rim, or approach velocity over bluff-body size"),
    "extinction_strain_margin": ("1", "extinction strain rate over the burner's characteristic strain"),
    "strained_flames": ("1", "strained flames the ladder solved"),
    "ladder_seconds": ("s", "wall time of the ladder in its worker"),
    "strain_rates_1_s": ("1/s", "strain rates of the burning ladder steps (space-separated in stretch.csv)"),
    "consumption_speeds_m_s": ("m/s", "consumption speeds of those steps (space-separated in stretch.csv)"),
}

#: No column of results.csv: a ladder's values reach the points through the premixer's read-out.
POINT_COLUMNS: tuple[str, ...] = ()
#: stretch.csv, one row per strained-flame ladder ([stretch]), in this order.
STRETCH_COLUMNS = ("fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
                   "unburned_temperature_K", "status", "laminar_flame_speed_m_s", "extinction_strain_rate_1_s",
                   "extinguished_above_1_s", "markstein_number_strain", "effective_lewis_number",
                   "markstein_number_unburned", "characteristic_strain_1_s", "extinction_strain_margin",
                   "half_separation_mm", "strained_flames", "ladder_seconds", "strain_rates_1_s",
                   "consumption_speeds_m_s", "message", "mechanism")
#: No extra CSV file made from the points' rows.
TABLES: dict[str, tuple[str, ...]] = {}
#: Its record table (one row per solve, read from the store: solve.PER_STUDY's ``rows``): file -> columns.
RECORDS = {"stretch.csv": STRETCH_COLUMNS}
#: The documentation's "what it holds" note of each file of RECORDS (docs/outputs.md).
TABLE_NOTES = {"stretch.csv": "One row per strained-flame ladder."}
