"""The output reference (docs/outputs.md) from the code's own tables.

Every column, its order, unit and meaning come from flamecharts/columns.py (COLUMNS,
LIMIT_COLUMNS, ..., UNITS), the status values from outcome.Status, the layout of results.nc
from results.py (AXES, STUDY_WIDE, DATASET_EXTRA), the optional tables from
outputs/write.py (OPTIONAL_TABLES), and the charts with their captions from the chart
registry. Written here by hand: one line per file, per column group and per chart condition;
a file, group or condition the code has and this script does not describe stops it with a
message naming it.

Run ``python3 docs/gen_pages.py`` after changing the outputs; tests/test_docs.py checks the page.
"""
from __future__ import annotations

import sys

import numpy as np
import xarray as xr

from flamecharts import columns as K
from flamecharts.analyses import parts
from flamecharts.config import STUDY_COPY
from flamecharts.outcome import Status
from flamecharts.outputs.charts import CHARTS
from flamecharts.outputs.write import OPTIONAL_TABLES
from flamecharts.results import DATASET_EXTRA, STUDY_WIDE, exponent_table
from flamecharts.store import DB_NAME, LOCK_NAME
from flamecharts.sweep.skeletal import RECORD_FILE, SKELETAL_FILE

PAGE = "outputs.md"

#: Every file of a run folder: name -> (written when, what it holds).
FILES = {
    "results.csv": ("always", "one row per point (per point and mechanism when the study compares several): the "
                              "columns [below](#resultscsv)"),
    "results.nc": ("always", "the same table as a labelled netCDF-3 array over the sweep axes ([below](#resultsnc))"),
    "about.txt": ("always", "provenance (versions, mechanism, settings, what was lumped) and the cautions"),
    "fuel_gases.csv": ("always", "the ISO 6976 properties of every fuel gas ([below](#fuel_gasescsv))"),
    "power_law_exponents.csv": ("when the study varies pressure or preheat",
                                "S_L ~ p^β and S_L ~ T_u^α fitted one axis at a time ([below](#power_law_exponentscsv))"),
    "limits.csv": ("with [limits]", "one row per admissible window of every limit search ([below](#limitscsv))"),
    "stretch.csv": ("with [stretch]", "one row per strained-flame ladder ([below](#stretchcsv))"),
    "sensitivities.csv": ("with [uncertainty]", "each point's largest flame-speed sensitivities ([below](#sensitivitiescsv))"),
    "emissions.csv": ("with [emissions]", "every residence time of every burning point ([below](#emissionscsv))"),
    "mechanism_comparison.csv": ("with several mechanisms",
                                 "each point under each other mechanism against the reference "
                                 "([below](#mechanism_comparisoncsv))"),
    "charts/NAME.png, charts/NAME.svg": ("unless `--no-charts`", "the design charts ([below](#charts)); every chart "
                                                                 "carries the caution in its footer"),
    "report.html": ("unless `--no-charts` or `--no-report`", "a self-contained report for a design review: key numbers, "
                                                             "every chart with its caption, tables, cautions"),
    DB_NAME: ("always", "the store (SQLite): every finished flame, committed the moment it finishes; a rerun solves only "
                        "what it lacks. Never edit it; `flamecharts compact` gives its free space back"),
    SKELETAL_FILE.format(sha12="HASH"): ("with [reduction], where a skeletal mechanism met the targets",
                                         "the skeletal mechanism the flames burn (Cantera YAML), named by the first "
                                         "12 digits of its sha256, which is in every point's key ([Mechanism "
                                         "reduction](reduction.md))"),
    RECORD_FILE: ("with [reduction]", "the reduction's record: what it was made from (a rerun of the same study "
                                      "reuses it), the species kept, every candidate tried and the errors measured "
                                      "on each validation point"),
    STUDY_COPY: ("always", "the study as the run read it, so `charts`, `report` and `open_results` need the folder "
                           "alone"),
    LOCK_NAME: ("while a run writes the folder", "the lock that refuses a second run on the same folder"),
}

#: results.csv's column groups (columns.py's tuples, in the table's order) -> (heading, when filled).
GROUPS = {
    "NUMERICAL_COLUMNS": ("Numerical error", "every flame: its grid error band (Roache's grid convergence index)"),
    "INDICATOR_COLUMNS": ("Design indicators", "every burning point; the `*_ratio` columns against the reference fuel "
                                               "at the same φ, p and T"),
    "KINETIC_COLUMNS": ("Kinetic uncertainty", "empty unless the study has [uncertainty]"),
    "REDUCTION_COLUMNS": ("Reduction band", "burning points of a study with [reduction] whose skeletal mechanism met "
                                            "the targets: the skeletal mechanism's flame-speed error, beside the "
                                            "numerical and kinetic bands ([Mechanism reduction](reduction.md))"),
    "RESPONSE_COLUMNS": ("Flame response", "the Lewis numbers for every point; the others with [flame_response]"),
    "GAS_COLUMNS": ("Fuel gas", "every point: the ISO 6976 properties of its fuel gas"),
    "BURNER_COLUMNS": ("Burner", "empty unless the study has a [burner]"),
    "PREMIXER_COLUMNS": ("Premixer", "empty unless the study has a [premixer]"),
    "TURBULENCE_COLUMNS": ("Premixer turbulence", "burning points of a study with [premixer] and a [burner]: u', l_t "
                                                  "and Peters' regime numbers"),
    "TURBULENT_SPEED_COLUMNS": ("Premixer flame speed and core flashback",
                                "burning points of a study with [premixer] and a [burner]: the turbulent flame speed "
                                "of each correlation and the core-flow flashback margin on the largest (the "
                                "leading-point speed and S_c,max only where a [stretch] ladder burned; see "
                                "[Gas-turbine premixers](premixers.md#turbulent-flame-speed-and-core-flow-flashback))"),
    "PREMIXER_MARGIN_COLUMNS": ("Premixer boundary-layer flashback and blowout",
                                "burning points of a study with [premixer] and a [burner]: the critical-gradient "
                                "boundary-layer margin (assessed in turbulent duct flow only with a calibrated "
                                "turbulent Pe_F) and the extinction-strain Damköhler number of lean blowout (where a "
                                "[stretch] ladder burned at the point's gas, pressure and preheat, and with a "
                                "stabilizer; see [Gas-turbine premixers](premixers.md#flashback-and-blowoff-in-a-"
                                "premixer-tube))"),
}
#: The registered analyses' columns parts (flamecharts.analyses): their groups and files come with them.
ANALYSIS_COLUMNS = parts("columns")
#: The columns that belong to no group, in the chunks they come in (the numerical error sits between two).
BASE = [("The point and its flame", "every point; the flame quantities blank where it did not burn"),
        ("How it was solved", "every point: settings, solver message and store key")]
LAST = ("Warnings", "every point: empty when it lies inside what the method and the mechanism cover")

#: The other tables: file -> its columns.py tuple.
TABLES = {
    "limits.csv": "LIMIT_COLUMNS",
    "sensitivities.csv": "SENSITIVITY_COLUMNS",
    "mechanism_comparison.csv": "COMPARISON_COLUMNS",
    "fuel_gases.csv": "GAS_TABLE_COLUMNS",
}

#: power_law_exponents.csv's own columns (results.exponent_table; not in columns.py).
EXPONENT_MEANINGS = {
    "exponent": ("", "which fit: beta (pressure) or alpha (preheat temperature)"),
    "value": ("1", "the fitted exponent"),
    "held_fixed": ("", "the other axis, held fixed for the fit"),
    "held_value": ("bar or K", "its value"),
    "range_low": ("bar or K", "lowest value of the fitted axis with a burning flame"),
    "range_high": ("bar or K", "highest value of the fitted axis with a burning flame"),
    "points": ("1", "burning points the fit went through"),
}

#: Chart conditions (registry.py and the chart modules) -> when the chart is drawn.
WHEN = {
    "always": "always",
    "any_flame": "a point burns",
    "varies_p_or_T": "flames at two or more pressures or preheats",
    "burning_blends": "a blend axis of two or more fractions, and a flame",
    "several_blends": "a blend axis of two or more fractions",
    "has_margins": "a [burner], and a point with a flashback margin",
    "has_window": "a [burner] with margins, two or more blend fractions and two or more φ",
    "has_limits": "[limits]",
    "has_stretch": "[stretch]",
    "has_sensitivities": "[uncertainty]",
    "has_emissions": "[emissions], a burning point with emissions",
    "has_regimes": "[premixer] and a [burner] with a port velocity, and a burning point",
    "has_turbulent_speeds": "[premixer] and a [burner] with a port velocity, and a burning point",
    "has_core_margins": "[premixer] and a [burner] with a port velocity, several blend fractions and a burning point",
    "several_blends_with_emissions": "[emissions] and several blend fractions",
    "compares_flames": "several mechanisms",
    "compares_limits": "several mechanisms and [limits]",
}


def _missing(what: str, names) -> None:
    if names:
        raise SystemExit(f"docs/gen_outputs_reference.py does not describe {what}: {', '.join(names)}")


def unit(u: str) -> str:
    return {"": "text", "1": "1"}.get(u, u)


def cell(text: str) -> str:
    return text.replace("|", "\\|")


def meaning(col: str) -> str:
    text = K.UNITS[col][1]
    if col == "status":  # the values come from the enum, so a new status cannot go unlisted
        text = "one of " + ", ".join(f"`{s.value}`" for s in Status)
    return cell(text)


def column_table(cols: tuple[str, ...], extra: dict | None = None) -> list[str]:
    extra = extra or {}
    _missing("these columns in flamecharts/columns.py UNITS", [c for c in cols if c not in K.UNITS and c not in extra])
    rows = []
    for c in cols:
        u, m = extra[c] if c in extra else (K.UNITS[c][0], meaning(c))
        rows.append(f"| `{c}` | {unit(u)} | {m} |")
    return ["| column | unit | meaning |", "|---|---|---|", *rows]


def exponent_columns() -> tuple[str, ...]:
    """power_law_exponents.csv's columns, as results.exponent_table makes them (from a two-pressure table)."""
    dims = K.AXES
    ds = xr.Dataset({"laminar_flame_speed_m_s": (dims, np.array([0.3, 0.2]).reshape(1, 1, 1, 2, 1, 1))},
                    coords={"fuel": ["f"], "oxidizer": ["air"], "blend_fraction": [0.0], "pressure_bar": [1.0, 2.0],
                            "unburned_temperature_K": [300.0], "equivalence_ratio": [1.0]})
    return tuple(exponent_table(ds)[0])


def render() -> str:
    files = set(FILES)
    _missing("these optional tables of outputs/write.py", [t for t in OPTIONAL_TABLES if t not in files])
    out = ["## Files of a run folder", "", "| file | written | what it holds |", "|---|---|---|"]
    out += [f"| `{name}` | {when} | {what} |" for name, (when, what) in FILES.items()]

    _missing("these columns in flamecharts/columns.py UNITS", [c for c in K.COLUMNS if c not in K.UNITS])
    _missing("these column groups of flamecharts/columns.py",
             [n for n in dir(K) if n.endswith("_COLUMNS") and n not in GROUPS and n not in TABLES.values()])
    grouped = [m for m in ANALYSIS_COLUMNS if m.POINT_COLUMNS]  # an analysis without columns of results.csv has no group
    groups = {name: getattr(K, name) for name in GROUPS} | {m.__name__: m.POINT_COLUMNS for m in grouped}
    headings = GROUPS | {m.__name__: m.GROUP for m in grouped}
    out += ["", "## results.csv", "",
            f"One row per point, {len(K.COLUMNS)} columns in this order (`flamecharts.columns.COLUMNS`). Units: `1` "
            "is dimensionless, `text` a text or a flag (`true`/`false`). A number the point does not have is an empty "
            "cell. `Results.to_dataframe()` gives the same columns."]
    current, base = None, iter(BASE)
    for i, col in enumerate(K.COLUMNS, 1):
        group = next((g for g, cols in groups.items() if col in cols), "LAST" if col == "warnings" else "BASE")
        if group != current:
            if group == "BASE":
                chunk = next(base, None)
                if chunk is None:
                    raise SystemExit("docs/gen_outputs_reference.py: results.csv has more ungrouped chunks of columns "
                                     f"than BASE describes (at {col})")
            heading, note = headings[group] if group in headings else (chunk if group == "BASE" else LAST)
            out += ["", f"### {heading}", "", f"Filled: {note}.", "", "| # | column | unit | meaning |",
                    "|---|---|---|---|"]
            current = group
        out.append(f"| {i} | `{col}` | {unit(K.UNITS[col][0])} | {meaning(col)} |")

    variables = [c for c in K.COLUMNS + DATASET_EXTRA if c not in K.AXES and c not in STUDY_WIDE]
    out += ["", "## results.nc", "",
            "The table of results.csv as an xarray Dataset written to netCDF-3 (`xarray.open_dataset`, or "
            "`Results.dataset` from Python). Dimensions, outermost first: "
            + ", ".join(f"`{a}`" for a in K.AXES)
            + ", and a leading `mechanism` when the study compares several. Global attributes hold the columns with "
            "one value for the whole study (" + ", ".join(f"`{c}`" for c in STUDY_WIDE)
            + "). Every other column is a variable with its `units` and `long_name` as in the tables above, plus "
            + ", ".join(f"`{c}`" for c in DATASET_EXTRA) + f" ({K.UNITS[DATASET_EXTRA[0]][1]}); {len(variables)} "
            "variables in all. Numbers are float64 with NaN where a point has no value."]

    records = {name: (cols, m.TABLE_NOTES[name]) for m in ANALYSIS_COLUMNS
               for name, cols in getattr(m, "RECORDS", {}).items()}
    tables: dict[str, tuple] = {}
    for name, tuple_name in TABLES.items():
        tables[name] = (getattr(K, tuple_name), None)
        if name == "limits.csv":  # the analyses' record tables (stretch.csv) follow the limits, as write.py's
            tables |= records
    tables |= {name: (cols, m.TABLE_NOTES[name]) for m in ANALYSIS_COLUMNS for name, cols in m.TABLES.items()}
    for name, (cols, note) in tables.items():
        anchor_note = {"fuel_gases.csv": "One row per fuel gas (fuel, blend fraction, oxidizer).",
                       "limits.csv": "One row per admissible window of each limit search (window 0: none found); "
                                     "how to read it: [Admissible limits](limits.md).",
                       "sensitivities.csv": "The largest sensitivities of each burning point, one row per reaction.",
                       "mechanism_comparison.csv": "Each point burning under the reference and another mechanism, one "
                                                   "row per other mechanism."}.get(name, note)
        out += ["", f"## {name}", "", anchor_note, "", *column_table(cols)]

    exp = exponent_columns()
    out += ["", "## power_law_exponents.csv", "",
            "One row per fit, wherever at least two values of the axis burn (Metghalchi & Keck's power law, fitted one "
            "axis at a time).", "", *column_table(exp, extra=EXPONENT_MEANINGS)]

    _missing("these chart conditions", sorted({c.when.__name__ for c in CHARTS} - set(WHEN)))
    out += ["", "## Charts", "",
            "Each chart is written as `charts/NAME.png` and `charts/NAME.svg`, in this order (the report's). The "
            "report lists the charts the sweep's shape leaves out, and why.", "",
            "| chart | drawn with | caption |", "|---|---|---|"]
    out += [f"| `{c.name}` | {WHEN[c.when.__name__]} | {cell(' '.join(c.caption.split()))} |" for c in CHARTS]
    return "\n".join(out)


if __name__ == "__main__":
    import gen_pages

    sys.exit(gen_pages.main(sys.argv[1:]))
