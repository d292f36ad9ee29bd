"""The results of a study: one flat row per point, read from the store, with the design read-out.

flat_row      a point's stored flame -> its row (columns.COLUMNS, units in the names)
point_rows    every point of a study, in study order, annotated (indicators, gas, burner, warnings)
rows_from_dir the study of a finished run folder and its rows, read from the store alone
to_dataset    the rows as a labelled N-dimensional table (xarray) over the sweep axes
dataset_table its points back as results.csv's columns (what results.csv is written from)
exponent_table pressure and temperature exponents of the flame speed, fitted along the table's axes
margin_summary smallest burner margins over phi per fuel gas and condition, read along the table's phi axis
first_flashback_fraction  first blend fraction whose flashback margin falls below the minimum
Results       what a run gives back: rows, dataset, pandas frame, summary, output files

The sweep is a cartesian product, so its results are an array over the six axes of
columns.AXES (fuel, oxidizer, blend fraction, pressure, preheat, equivalence ratio):
every quantity is a variable over them with ``units`` and ``long_name`` attributes;
failed and no-flame points are NaN, with their status and reason beside them.
"""
from __future__ import annotations

import itertools
import json
import re
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd
import xarray as xr

from ._version import __version__
from .analyses import parts
from .columns import (
    AXES,
    CAUTION,
    COLUMNS,
    COMPARISON_COLUMNS,
    FROM_METRICS,
    UNITS,
    gas_label,
)
from .config import Burner, Study, by_mechanism, load_config_copy, lumping_note, reduction_note, resolution_label
from .design import (
    Ladders,
    annotate,
    mechanism_differences,
    point_warnings,
    premixer_columns,
    reduction_columns,
    verdict_tally,
)
from .errors import StoreError
from .outcome import Reason, Status
from .physics.autoignition import not_a_flame_reason
from .physics.fits import fit_power_law
from .record_tables import limits_dataset
from .store import DB_NAME, Store
from .sweep.analyses import per_point, per_study
from .sweep.points import Point, points
from .sweep.skeletal import applied
from .sweep.upgrade import lacks_readout


def flat_row(study: Study, p: Point, stored: dict | None) -> dict:
    """One results.csv row for point ``p`` from its stored result (None: not solved yet)."""
    row = {
        "fuel": p.fuel, "oxidizer": p.oxidizer, "blend_with": p.blend_with or "",
        "blend_fraction": p.blend_fraction, "equivalence_ratio": p.phi,
        "pressure_bar": p.pressure_bar, "unburned_temperature_K": p.T_u,
        "status": Status(stored["status"]) if stored else Status.PENDING,
        "reason": Reason(stored["reason"]) if stored else Reason.NONE,
        "solve_seconds": round(stored["solve_seconds"], 3) if stored else None,
        "mechanism": study.mechanism, "mechanism_reduction": reduction_note(study), "transport": study.transport,
        "thermal_diffusion": study.thermal_diffusion, "resolution": resolution_label(study),
        "start": stored["start"] if stored else "",
        "message": stored["message"] if stored else "not solved yet",
        "fuel_mole_fractions": json.dumps({k: round(v, 8) for k, v in p.X_fuel.items()}),
        "point_key": p.key,
    }
    metrics = (stored or {}).get("metrics") or {}
    for name, (col, scale) in FROM_METRICS.items():
        v = metrics.get(name)
        row[col] = None if v is None else v * scale
    row["grid_convergence"] = metrics.get("grid_convergence", "")
    row.update(reduction_columns(study, p, row))
    for name in ("autoignition_screen_delay_s", "premixer_ignition_delay_s", "injection_ignition_delays_s",
                 "premixer_horizon_s", "unburned_viscosity_Pa_s", "reaction_sensitivities",
                 "ladder_consumption_speed_max_m_s", "ladder_extinction_strain_rate_1_s",
                 *(k for m in parts("readout") for k in m.METRICS)):
        if name in metrics:  # computed by the worker for the read-out (not columns)
            row[name] = metrics[name]
    return row


#: Columns a solution that is autoignition, not a deflagration, does not have (the mixture's
#: own properties, its equilibrium and Lewis numbers stay).
FLAME_ONLY_COLUMNS = ("laminar_flame_speed_m_s", "thermal_thickness_mm", "diffusive_thickness_mm",
                      "reaction_zone_thickness_mm", "expansion_ratio", "flame_speed_numerical_error_percent",
                      "thermal_thickness_numerical_error_percent", "zeldovich_number",
                      "flame_speed_reduction_error_percent", "reduction_error_source")


def not_a_flame(row: dict, why: str) -> None:
    """Mark a stored solution as autoignition (status and reason autoignition, ``why`` as its
    message) and blank every flame quantity, so no chart, fit, margin or limit reads it."""
    row.update(status=Status.AUTOIGNITION, reason=Reason.AUTOIGNITION, message=why, grid_convergence="")
    row.update(dict.fromkeys(FLAME_ONLY_COLUMNS))


def point_rows(study: Study, pts: list[Point], stored: dict[str, dict], ladders: Ladders | None = None) -> list[dict]:
    """One flat row per point, in study order, from stored results (missing -> 'pending'),
    with the design indicators, fuel-gas properties and burner margins added, and the
    range warnings of each point (column 'warnings', see design.point_warnings). A store written
    before the flames carried what the read-out needs of their mixture (sweep.upgrade) is a
    StoreError naming the commands that upgrade it. ``ladders``: what a premixer's margins
    interpolate between the [stretch] ladder points (design.annotate; None: those of ``pts``)."""
    if any(lacks_readout(r) for r in stored.values()):
        raise StoreError("the results store was written by an earlier flamecharts: some flames lack the mixture "
                         "properties the read-out now takes from the store; 'flamecharts compact DIR' or 'flamecharts "
                         "run' adds them (no flame is solved again; a backup copy is kept)")
    flat = [flat_row(study, p, stored.get(p.key)) for p in pts]
    for p, r in zip(pts, flat):  # a mixture that ignites before a flame can cross it is not a flame
        if r["status"] == "ok" and (why := not_a_flame_reason(r.get("autoignition_screen_delay_s"),
                                                              r["laminar_flame_speed_m_s"], r["thermal_thickness_mm"],
                                                              p.T_u)):
            not_a_flame(r, why)
    rows = annotate(study, flat, ladders)
    for p, r in zip(pts, rows):
        r["warnings"] = point_warnings(study, p, r)
        if study.premixer is not None:
            r.update(premixer_columns(study, p, r))
    return rows


def stored_with_extras(study: Study, pts: list[Point], store: Store, stored: dict | None = None) -> dict[str, dict]:
    """The store's rows of ``pts`` (or ``stored``, already read) with the extras of each point
    merged into its metrics: each analysis of sweep.analyses.per_point the study wants (the
    Zeldovich pair, the flame-speed sensitivities, the premixer's ignition delays...), then each
    of per_study (solved after the points' rows: the strongest consumption speed of a ladder)."""
    stored = store.rows([p.key for p in pts]) if stored is None else stored
    merges = [a.merge for a in per_point() if a.wanted(study)] + [a.merge for a in per_study() if a.wanted(study)]
    for merge in merges:
        stored = merge(study, pts, stored, store)
    return stored


def sensitivity_rows(rows: list[dict]) -> list[dict]:
    """sensitivities.csv: the largest sensitivities of each burning point (design.kinetic_columns),
    one row per reaction (columns.SENSITIVITY_COLUMNS)."""
    out = []
    for r in rows:
        for rank, t in enumerate(r.get("top_reactions") or (), start=1):
            out.append({**{a: r[a] for a in ("fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio",
                                             "pressure_bar", "unburned_temperature_K")}, "rank": rank, **t,
                        "mechanism": r["mechanism"]})
    return out



def rows_from_dir(out_dir: Path) -> tuple[Study, list[dict]]:
    """The study of a finished run folder and its rows (every mechanism's), read from the store alone."""
    study = applied(load_config_copy(out_dir), out_dir)  # under [reduction]: the skeletal mechanism it stored
    subs = by_mechanism(study)
    rows, unmatched = [], []
    with Store(Path(out_dir) / DB_NAME, readonly=True) as store:
        n_stored = len(store.keys())
        for sub in subs:
            pts = points(sub)
            stored = stored_with_extras(sub, pts, store)
            if not stored:
                unmatched.append(sub.mechanism)
            rows += point_rows(sub, pts, stored)
    if n_stored and unmatched:
        which = ("the study any more" if len(unmatched) == len(subs)
                 else f"mechanism {', '.join(unmatched)} of the study (the run may also have stopped before it)")
        raise StoreError(f"none of the {n_stored} flames stored in {out_dir} matches {which}: the "
                         "mechanism file or the Cantera version changed since the run; rerun the study "
                         "(flamecharts run CONFIG --out DIR) to solve it with what is installed now")
    return study, rows


def rows_of(study: Study, rows: list[dict]) -> list[dict]:
    """The rows of ``study``'s mechanism among the rows of a study comparing several (all of
    them for a one-mechanism study)."""
    return [r for r in rows if r.get("mechanism", study.mechanism) == study.mechanism]


def with_mechanism(study: Study, rows: list[dict]) -> list[dict]:
    """``rows`` (of limits, ladders...) each with the study's mechanism in column 'mechanism'."""
    return [{**r, "mechanism": study.mechanism} for r in rows]


@dataclass(frozen=True)
class Comparison:
    """What outputs of a study comparing mechanisms read beside the reference mechanism's:
    one study per mechanism (config.by_mechanism, reference first) and every row, limit and
    ladder of all of them (column 'mechanism')."""

    studies: tuple[Study, ...]
    rows: list[dict]
    limits: list[dict] = field(default_factory=list)

    @property
    def names(self) -> list[str]:
        return [s.mechanism for s in self.studies]


def comparison_of(study: Study, rows: list[dict], limits: Sequence[dict] = ()) -> Comparison | None:
    """The :class:`Comparison` of a study comparing mechanisms; None for a one-mechanism study."""
    subs = by_mechanism(study)
    return Comparison(tuple(subs), list(rows), list(limits)) if len(subs) > 1 else None


#: Variables of the dataset beyond results.csv's columns.
DATASET_EXTRA = ("reason",)

#: Columns that hold one value for the whole study: global attributes of the dataset.
STUDY_WIDE = ("blend_with", "mechanism", "mechanism_reduction", "transport", "thermal_diffusion", "resolution")


def _is_text(col: str) -> bool:
    return UNITS[col][0] == ""


def _axis_values(study: Study) -> dict[str, list]:
    return {"fuel": list(study.sweep_fuels), "oxidizer": list(study.sweep_oxidizers),
            "blend_fraction": list(study.blend_fractions), "pressure_bar": list(study.pressures_bar),
            "unburned_temperature_K": list(study.unburned_temperatures_K),
            "equivalence_ratio": list(study.equivalence_ratios)}


def _text(v) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "true" if v else "false"
    return str(v)


def to_dataset(study: Study, rows: list[dict]) -> xr.Dataset:
    """The rows of a study (in study order, see point_rows) as an xarray Dataset over columns.AXES.

    Numbers are float64 with NaN where a point has no value; text and flags are strings
    ("" where empty, "true"/"false" for flags, as in results.csv). Columns with one value
    for the whole study (STUDY_WIDE) are global attributes. A study comparing mechanisms
    gets a leading ``mechanism`` dimension (its names as written, the reference first);
    :func:`mechanism_dataset` takes one of them out.
    """
    subs = by_mechanism(study)
    if len(subs) == 1:
        return _one_dataset(study, rows)
    parts = [_one_dataset(sub, rows_of(sub, rows)) for sub in subs]
    ds = xr.concat(parts, dim=pd.Index([s.mechanism for s in subs], name="mechanism"), combine_attrs="override")
    ds.attrs = {k: v for k, v in parts[0].attrs.items() if k != "mechanism"}  # units stay on every variable
    ds.attrs["mechanisms"] = ", ".join(s.mechanism for s in subs)
    ds["mechanism"].attrs["long_name"] = UNITS["mechanism"][1] + " (the first is the reference)"
    return ds


def extra_tables(study: Study, rows: list[dict]) -> dict[str, tuple[list[dict], tuple[str, ...]]]:
    """The registered analyses' extra CSV files (flamecharts.analyses): file name -> (its rows,
    its columns), for the files the study asks for ([] rows: asked for, none to write)."""
    fill = {name: f for data in parts("dataset") for name, f in getattr(data, "TABLE_ROWS", {}).items()}
    return {name: (fill[name](study, rows), columns) for cols in parts("columns") for name, columns in cols.TABLES.items()}


def dataset_table(ds: xr.Dataset, columns: Sequence[str] = COLUMNS) -> dict[str, list]:
    """results.csv's columns of a Dataset of :func:`to_dataset`: column -> one value per point, in
    study order (a study comparing mechanisms: each mechanism's points in turn), the inverse of
    its reshaping. Numbers as floats (None where NaN: a point without the value), text as the
    Dataset holds it, the axes from its coordinates and the study-wide columns from its
    attributes."""
    if "mechanism" in ds.dims:
        parts = [dataset_table(mechanism_dataset(ds, str(m)), columns) for m in ds["mechanism"].values]
        return {c: [v for part in parts for v in part[c]] for c in columns}
    grid = list(zip(*itertools.product(*(ds[a].values.tolist() for a in AXES))))  # C order: the rows' order
    n = len(grid[0]) if grid else 0
    out: dict[str, list] = {}
    for c in columns:
        if c in AXES:
            out[c] = list(grid[AXES.index(c)]) if grid else []
        elif c in STUDY_WIDE:
            out[c] = [ds.attrs.get(c, "")] * n
        else:
            values = ds[c].transpose(*AXES).values.ravel()
            if not _is_text(c):
                blank = np.isnan(values)
                values = values.astype(object)
                values[blank] = None
            out[c] = values.tolist()
    return out


def mechanism_dataset(ds: xr.Dataset, mechanism: str | None = None) -> xr.Dataset:
    """One mechanism's table out of a dataset comparing several (the reference when
    ``mechanism`` is None), with the one-mechanism layout; a one-mechanism dataset as it is."""
    if "mechanism" not in ds.dims:
        return ds
    name = str(ds["mechanism"].values[0]) if mechanism is None else mechanism
    one = ds.sel(mechanism=name, drop=True)
    one.attrs = {**{k: v for k, v in ds.attrs.items() if k != "mechanisms"}, "mechanism": name}
    return one


def _one_dataset(study: Study, rows: list[dict]) -> xr.Dataset:
    """:func:`to_dataset` of a one-mechanism study."""
    coords = _axis_values(study)
    shape = tuple(len(coords[a]) for a in AXES)
    n = int(np.prod(shape))
    if len(rows) != n:
        raise ValueError(f"{len(rows)} rows for a sweep of {n} points")
    data_vars = {}
    for col in COLUMNS + DATASET_EXTRA:
        if col in AXES or col in STUDY_WIDE:
            continue
        values = [r.get(col) for r in rows]
        if _is_text(col):
            arr = np.array([_text(v) for v in values], dtype=str)
        else:
            arr = np.array([np.nan if v is None else float(v) for v in values], dtype=float)
        unit, long_name = UNITS[col]
        data_vars[col] = (AXES, arr.reshape(shape), {"units": unit, "long_name": long_name} if unit
                          else {"long_name": long_name})
    ds = xr.Dataset(data_vars, coords={a: (a, np.array(coords[a], dtype=str if a in ("fuel", "oxidizer") else float))
                                       for a in AXES})
    for a in AXES:
        unit, long_name = UNITS[a]
        ds[a].attrs.update({"long_name": long_name, **({"units": unit} if unit else {})})
    for analysis in parts("dataset"):  # the registered analyses' variables (flamecharts.analyses)
        if hasattr(analysis, "DATASET"):
            ds = analysis.DATASET(study, rows, shape, ds)
    first = rows[0] if rows else {}
    ds.attrs.update({"title": study.title, "study": study.name, "flamecharts_version": __version__,
                     **{c: _text(first.get(c)) for c in STUDY_WIDE}, "caution": CAUTION})
    note = lumping_note(study)
    if note:
        ds.attrs["lumped_fuel"] = note
    ds.attrs.update(reduction_attributes(study))
    return ds


def reduction_attributes(study: Study) -> dict:
    """results.nc's global attributes of a [reduction] study: the skeletal mechanism's size and hash,
    and its largest measured errors [%] (those not measured left out); {} without [reduction]."""
    r = study.reduced
    if r is None:
        return {}
    out: dict = {"reduction_applied": "true" if r.reduced else f"false ({r.why_detailed})",
                 "reduction_detailed_sha256": r.detailed_sha256, "reduction_detailed_species": r.detailed_size[0],
                 "reduction_detailed_reactions": r.detailed_size[1],
                 "reduction_ignition_delay_error_percent": 100.0 * r.ignition_delay_error,
                 "reduction_ignition_points": len(r.ignition_errors),
                 "reduction_validation_flames": sum(f.get("error") is not None for f in r.flames),
                 "reduction_flame_speed_target_percent": 100.0 * r.targets["flame_speed"],
                 "reduction_ignition_delay_target_percent": 100.0 * r.targets["ignition_delay"]}
    if r.reduced:
        out.update(reduction_skeletal_species=len(r.species), reduction_skeletal_reactions=r.reactions,
                   reduction_skeletal_sha256=r.sha256, reduction_skeletal_file=r.file)
    if r.flame_speed_error is not None:
        out["reduction_flame_speed_error_percent"] = 100.0 * r.flame_speed_error
    if r.thickness_error is not None:
        out["reduction_thermal_thickness_error_percent"] = 100.0 * r.thickness_error
    for sp, e in r.species_errors.items():
        if e is not None:
            out[f"reduction_{re.sub(r'[^A-Za-z0-9_]', '_', sp)}_error_percent"] = 100.0 * e
    return out


#: (axis fitted along, axis held fixed, name of the exponent) of power_law_exponents.csv
EXPONENTS = (("pressure_bar", "unburned_temperature_K", "pressure_exponent_beta"),
             ("unburned_temperature_K", "pressure_bar", "temperature_exponent_alpha"))


def exponent_table(ds: xr.Dataset) -> list[dict]:
    """Pressure exponent beta (at each T_u) and temperature exponent alpha (at each p) of the
    flame speed, S_L ~ p^beta and S_L ~ T_u^alpha (Metghalchi & Keck, Combust. Flame 48
    (1982) 191, fitted one variable at a time by :func:`~flamecharts.physics.fits.fit_power_law`),
    per fuel, oxidizer, blend fraction and equivalence ratio, wherever at least two values
    of the axis burn. One row per fit, in the order of the table's axes (each mechanism's in
    turn, column 'mechanism')."""
    if "mechanism" in ds.dims:
        return [r for m in ds["mechanism"].values for r in exponent_table(mechanism_dataset(ds, str(m)))]
    S = ds["laminar_flame_speed_m_s"]
    out = []
    for along, fixed, name in EXPONENTS:
        others = ("fuel", "oxidizer", "blend_fraction", fixed, "equivalence_ratio")
        table = S.transpose(*others, along)
        x = np.asarray(S[along].values, dtype=float)
        for key, y in zip(itertools.product(*(table[d].values for d in others)), table.values.reshape(-1, len(x))):
            burning = np.isfinite(y)
            if len(set(x[burning])) < 2:
                continue
            b, _ = fit_power_law(x[burning], y[burning])
            out.append({"fuel": str(key[0]), "oxidizer": str(key[1]), "blend_with": ds.attrs.get("blend_with", ""),
                        "blend_fraction": float(key[2]), "equivalence_ratio": float(key[4]), "exponent": name,
                        "value": b, "held_fixed": fixed, "held_value": float(key[3]),
                        "range_low": float(x[burning].min()), "range_high": float(x[burning].max()),
                        "points": int(burning.sum()), "mechanism": ds.attrs.get("mechanism", "")})
    return out


#: The axes a margin summary groups by (the minimum is taken along equivalence_ratio).
CONDITION_AXES = ("fuel", "oxidizer", "blend_fraction", "pressure_bar", "unburned_temperature_K")


def margin_summary(ds: xr.Dataset, burner: Burner | None) -> list[dict]:
    """Per fuel, oxidizer, blend fraction, pressure and preheat with a burning flame: the smallest
    flashback and blowoff margins along equivalence ratio and the phi where each occurs (the
    first in the study's order on a tie; None where the margin is not assessed at any phi), and
    how many burning points have the verdict ok and, in words, on what they are ok and what was
    not assessed (``points_words``: design.verdict_tally). The blowoff margin is the one that applies
    (config.Burner.blowoff: the stabilizer's when a bluff body holds the flame); a premixer's
    lowest core-flow flashback margin comes too (``min_core_flashback_margin``)."""
    if burner is None:
        return []
    if "mechanism" in ds.dims:
        return [r for m in ds["mechanism"].values for r in margin_summary(mechanism_dataset(ds, str(m)), burner)]
    bo_col = burner.blowoff[0]
    phis = ds.equivalence_ratio.values

    def along_phi(name: str) -> np.ndarray:
        return ds[name].transpose(*CONDITION_AXES, "equivalence_ratio").values.reshape(-1, len(phis))
    out = []
    keys = itertools.product(*(ds[d].values for d in CONDITION_AXES))
    for key, fb, bo, verdict in zip(keys, along_phi("flashback_margin"), along_phi(bo_col),
                                    along_phi("verdict")):
        burning = verdict != ""
        if not burning.any():
            continue
        out.append({"fuel": str(key[0]), "oxidizer": str(key[1]), "blend_fraction": float(key[2]),
                    "pressure_bar": float(key[3]), "unburned_temperature_K": float(key[4]),
                    **_lowest(fb, phis, "flashback"), **_lowest(bo, phis, "blowoff"),
                    "points_ok": int((verdict[burning] == "ok").sum()), "points": int(burning.sum()),
                    "points_words": verdict_tally([str(v) for v in verdict[burning]]),
                    "mechanism": ds.attrs.get("mechanism", "")})
    if "core_flashback_margin" in ds:  # a premixer's own flashback criterion
        for s, core in zip(out, [m for m, v in zip(along_phi("core_flashback_margin"), along_phi("verdict"))
                                 if (v != "").any()]):
            s.update(_lowest(core, phis, "core_flashback"))
    return out


def _lowest(margins: np.ndarray, phis: np.ndarray, name: str) -> dict:
    """min_<name>_margin and at_phi_<name> of margins along phi (None where no margin is assessed)."""
    if not np.isfinite(margins).any():
        return {f"min_{name}_margin": None, f"at_phi_{name}": None}
    i = int(np.nanargmin(margins))
    return {f"min_{name}_margin": float(margins[i]), f"at_phi_{name}": float(phis[i])}


def firmly_ok(verdict: str) -> bool:
    """Whether an autoignition verdict is ok even at the mechanism's worst known error
    (physics.limits.autoignition_verdict).

    >>> firmly_ok("ok"), firmly_ok("ok (also with delays 7 times shorter, as measured below 1150 K)")
    (True, True)
    >>> firmly_ok("ok by the mechanism, but at risk if its delays are 7 times too long"), firmly_ok("autoignition risk")
    (False, False)
    """
    return verdict == "ok" or verdict.startswith("ok (also")


def premixer_summary(study: Study, rows: list[dict]) -> list[dict]:
    """Per gas and condition: the shortest ignition delay of the fresh mixture over phi, its
    autoignition margin, the shortest delay near the fuel injection (the same for every phi),
    the verdicts met, and how many points are not plainly ok (studies with a [premixer] table;
    [] otherwise)."""
    if study.premixer is None:
        return []
    groups: dict[tuple, list[dict]] = {}
    for r in rows:
        if r.get("ignition_delay_ms") is not None:
            groups.setdefault((r["fuel"], r["oxidizer"], r["blend_fraction"], r["pressure_bar"],
                               r["unburned_temperature_K"]), []).append(r)
    out = []
    for (fuel, ox, frac, p, T), rs in groups.items():
        worst = min(rs, key=lambda r: r["ignition_delay_ms"])
        out.append({"fuel": fuel, "oxidizer": ox, "blend_with": study.blend_with or "", "blend_fraction": frac,
                    "pressure_bar": p, "unburned_temperature_K": T, "ignition_delay_ms": worst["ignition_delay_ms"],
                    "autoignition_margin": worst["autoignition_margin"], "at_phi": worst["equivalence_ratio"],
                    "injection_ignition_delay_ms": rs[0].get("injection_ignition_delay_ms"),
                    "injection_equivalence_ratio": rs[0].get("injection_equivalence_ratio"),
                    "verdicts": sorted({r["autoignition_verdict"] for r in rs}),
                    "risky_points": sum(not firmly_ok(r["autoignition_verdict"]) for r in rs), "points": len(rs)})
    return out


def first_flashback_fraction(ds: xr.Dataset, study: Study) -> dict[tuple, float | None]:
    """Smallest blend fraction at which the flashback margin falls below the burner's minimum,
    per (fuel, oxidizer, p, T); None where it never does in the study."""
    if study.burner is None or not study.blend_with:
        return {}
    ds = mechanism_dataset(ds)  # a study comparing mechanisms: the reference's
    out: dict[tuple, float | None] = {}
    for s in sorted(margin_summary(ds, study.burner), key=lambda s: s["blend_fraction"]):
        key = (s["fuel"], s["oxidizer"], s["pressure_bar"], s["unburned_temperature_K"])
        out.setdefault(key, None)
        m = s["min_flashback_margin"]
        if out[key] is None and m is not None and m < study.burner.min_flashback_margin:
            out[key] = s["blend_fraction"]
    return out


class RecordAccess:
    """The registered analyses' public names for their record tables (each ``dataset`` part's
    ACCESSORS: name -> function of the object; ``.stretch`` and ``.ladders_dataset`` of the
    strained-flame ladders, say), on an object with ``records`` (file name -> rows)."""

    def __getattr__(self, name: str) -> Any:
        if not name.startswith("_"):
            for analysis in parts("dataset"):
                accessor = getattr(analysis, "ACCESSORS", {}).get(name)
                if accessor is not None:
                    return accessor(self)
        raise AttributeError(f"{type(self).__name__!r} object has no attribute {name!r}")


@dataclass
class Results(RecordAccess):
    """The results of a study: one row per point, as an xarray Dataset or a pandas DataFrame;
    the limit searches and the analyses' record tables (the strained-flame ladders: ``.stretch``,
    ``.ladders_dataset``) as tables of their own.

    ``summary`` is the :class:`~flamecharts.pipeline.RunSummary` of the run that gave them
    (None when read from a folder with :func:`flamecharts.open_results`); ``files`` are
    the output files written, results.csv first.
    """

    study: Study
    rows: list[dict]
    out_dir: Path
    files: list[Path] = field(default_factory=list)
    summary: object | None = None
    table: xr.Dataset | None = field(default=None, repr=False)  # the dataset, when already made
    limits: list[dict] = field(default_factory=list)  # limits.csv rows (studies with a [limits] table)
    #: The analyses' record tables (sweep.analyses.PerStudy): file name -> rows ('stretch.csv': one per ladder).
    records: dict[str, list[dict]] = field(default_factory=dict)

    @property
    def dataset(self) -> xr.Dataset:
        """Every quantity over the sweep axes (see :func:`to_dataset`), made once."""
        if self.table is None:
            self.table = to_dataset(self.study, self.rows)
        return self.table

    @property
    def limits_dataset(self) -> xr.Dataset:
        """limits.csv as a Dataset over ``search`` (one per limit search and window; empty
        without [limits]); units and long names as in results.nc (record_tables.limits_dataset)."""
        return limits_dataset(self.limits)

    def to_dataframe(self) -> pd.DataFrame:
        """A pandas DataFrame with results.csv's columns, one row per point, in study order."""
        return pd.DataFrame([[r.get(c) for c in COLUMNS] for r in self.rows], columns=list(COLUMNS))

    def mechanism_comparison(self) -> pd.DataFrame:
        """A pandas DataFrame of mechanism_comparison.csv (design.mechanism_differences: each point
        under each other mechanism against the reference); empty for a one-mechanism study."""
        comparison = comparison_of(self.study, self.rows)
        rows = mechanism_differences(self.rows, comparison.names) if comparison else []
        return pd.DataFrame([[r.get(c) for c in COMPARISON_COLUMNS] for r in rows], columns=list(COMPARISON_COLUMNS))

    def extra_table(self, file_name: str) -> pd.DataFrame:
        """A pandas DataFrame of an analysis's extra CSV file (``'emissions.csv'``: every residence
        time of every burning point), empty when the study does not ask for it."""
        rows, columns = extra_tables(self.study, self.rows).get(file_name, ([], ()))
        return pd.DataFrame([[r.get(c) for c in columns] for r in rows], columns=list(columns))

    def counts(self) -> dict[str, int]:
        """Points by status: ok, no_flame, failed, autoignition, pending."""
        out = {"ok": 0, "no_flame": 0, "failed": 0, "pending": 0}
        for r in self.rows:
            out[r["status"]] = out.get(r["status"], 0) + 1
        return out


def _margin_words(shown: list[tuple[float, float, float]]) -> str:
    """'falls from 16.4 to 13 at φ 0.5 and from 7.66 to 6.06 at φ 0.7' of (phi, unblended, blended) margins."""
    moves = ["falls" if b < a else "rises" if b > a else "stays" for _, a, b in shown]
    parts = [f"from {a:.3g} to {b:.3g} at φ {phi:g}" for phi, a, b in shown]
    if len(set(moves)) == 1:
        return f"{moves[0]} " + " and ".join(parts)
    return "; ".join(f"{m} {t}" for m, t in zip(moves, parts))


def core_flashback_sentences(study: Study, rows: list[dict], most_phis: int = 3) -> list[str]:
    """One plain sentence per gas and condition ([premixer] with a [burner]) on its core-flow
    flashback margin (design.turbulent_speed_columns): :func:`margin_sentences` naming the
    correlation of the largest S_T. [] without margins."""
    def largest(mine: list[dict]) -> str:
        return "largest S_T: " + ", ".join(sorted({r["core_flashback_correlation"] for r in mine}))
    return margin_sentences(study, rows, "core_flashback_margin", "core-flow flashback margin",
                            "the turbulent flame can travel upstream through the core", largest, most_phis=most_phis)


def margin_sentences(study: Study, rows: list[dict], column: str, what: str, below: str,
                     note: Callable[[list[dict]], str] | None = None, why: Callable[[dict], str] | None = None,
                     most_phis: int = 3) -> list[str]:
    """One plain sentence per gas and condition on the margin ``column`` (called ``what``): a
    blended gas's against the unblended gas's at equal equivalence ratio, at up to ``most_phis``
    equivalence ratios where both have one (the unblended gas then has no sentence of its own);
    otherwise the gas's lowest margin and where. ``below`` says what a margin below 1 means,
    ``note`` adds a remark on the gas's rows, and with ``why`` (a row's reason for no margin) a
    gas and condition of premixer points without any margin gets 'is not assessed (why)'."""
    have = {(r["fuel"], r["oxidizer"], r["blend_fraction"], r["pressure_bar"], r["unburned_temperature_K"],
             r["equivalence_ratio"]): r for r in rows if r.get(column) is not None}
    pairs: dict[tuple, list[tuple[float, float, float]]] = {}
    for (fuel, ox, frac, P, T, phi), r in have.items():
        ref = have.get((fuel, ox, 0.0, P, T, phi))
        if frac > 0.0 and ref is not None:
            pairs.setdefault((fuel, ox, frac, P, T), []).append((phi, ref[column], r[column]))
    compared = {(k[0], k[1], 0.0, k[3], k[4]) for k in pairs}
    out = []
    for gas in dict.fromkeys(k[:5] for k in have):
        if gas in compared:
            continue  # the unblended gas is told in its blends' sentences
        mine = sorted((k[5], r) for k, r in have.items() if k[:5] == gas)
        low_phi, low = min(mine, key=lambda t: t[1][column])
        remark = note([r for _, r in mine]) if note else ""
        where = _where(study, gas)
        tail = f" (below 1: {below})" if low[column] < 1.0 else ""
        if gas not in pairs:
            out.append(f"For {gas_label(low)} at {where} the {what} is {low[column]:.3g} at its lowest "
                       f"(φ {low_phi:g}{'; ' + remark if remark else ''}){tail}.")
            continue
        both = sorted(pairs[gas])
        shown = list(dict.fromkeys(both[round(i * (len(both) - 1) / (most_phis - 1))] for i in range(most_phis))) \
            if len(both) > most_phis else both
        told = f" ({len(shown)} of {len(both)} φ; results.csv has each)" if len(shown) < len(both) else ""
        out.append(f"At {100 * gas[2]:g} % {study.blend_with} in {gas[0]} ({where}) the {what} "
                   + _margin_words(shown) + told + (f" ({remark})" if remark else "") + f"{tail}.")
    return out + (_unassessed_sentences(study, rows, column, what, why) if why else [])


def _where(study: Study, gas: tuple) -> str:
    """'5 bar and 650 K' of a (fuel, oxidizer, blend fraction, p, T) gas and condition (', in air'
    with several oxidizers)."""
    return f"{gas[3]:g} bar and {gas[4]:g} K" + (f", in {gas[1]}" if len(study.sweep_oxidizers) > 1 else "")


def _unassessed_sentences(study: Study, rows: list[dict], column: str, what: str, why: Callable[[dict], str]) -> list[str]:
    """'For GAS (with 0 and 50 % BLEND) at P and T the WHAT is not assessed (WHY at its first point).'
    of every fuel and condition whose burning premixer points have no value of ``column`` at all."""
    groups: dict[tuple, list[dict]] = {}
    for r in rows:
        if r.get("status") == "ok" and r.get("rms_velocity_m_s") is not None:
            groups.setdefault((r["fuel"], r["oxidizer"], None, r["pressure_bar"], r["unburned_temperature_K"]),
                              []).append(r)
    out = []
    for gas, mine in groups.items():
        if any(r.get(column) is not None for r in mine):
            continue
        fracs = sorted({r["blend_fraction"] for r in mine})
        name = (f"{gas[0]} with {' and '.join(f'{100 * f:g}' for f in fracs)} % {study.blend_with}"
                if study.blend_with else gas[0])
        out.append(f"For {name} at {_where(study, gas)} the {what} is not assessed ({why(mine[0])}).")
    return out
