"""[emissions]' part of the results: results.nc's residence-time variables, emissions.csv, sentences.

DATASET             results.nc: each emissions.csv quantity over the sweep axes and the residence
                    time (``<column>_by_time``), the reference O2 and basis on every emission variable
TABLE_ROWS          emissions.csv's rows: every residence time of every burning point
emission_sentences  one plain sentence per blended gas and condition (report and console)
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np
import xarray as xr

from ...columns import AXES, UNITS
from .columns import TABLE_COLUMNS
from .table import of

if TYPE_CHECKING:
    from ...config import Study


def emission_rows(study: Study, rows: list[dict]) -> list[dict]:
    """emissions.csv: every residence time of every burning point with emissions
    (readout.emission_columns), one row each (columns.TABLE_COLUMNS)."""
    keys = ("fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
            "unburned_temperature_K")
    return [{**{a: r[a] for a in keys}, **e, "mechanism": r["mechanism"]}
            for r in rows for e in r.get("emissions_by_time") or ()]


#: emissions.csv's quantities that get a residence-time dimension in the dataset.
BY_TIME = tuple(c for c in TABLE_COLUMNS if UNITS[c][0] != "" and c not in AXES + (
    "residence_time_ms", "emissions_reference_o2_percent"))


def _emissions_by_time(study: Study, rows: list[dict], shape: tuple[int, ...]) -> dict[str, xr.DataArray]:
    """[emissions]: each quantity of BY_TIME over the sweep axes and ``residence_time_ms``
    (``<column>_by_time``), NaN where a point has none; the reference O2 and heating-value
    basis in the attributes."""
    em = of(study)
    assert em is not None  # asked only with [emissions]
    times = [1e3 * t for t in em.residence_times_s]
    out = {}
    for col in BY_TIME:
        arr = np.full((len(rows), len(times)), np.nan)
        for i, r in enumerate(rows):
            for j, e in enumerate(r.get("emissions_by_time") or ()):
                arr[i, j] = np.nan if e.get(col) is None else float(e[col])
        unit, long_name = UNITS[col]
        out[f"{col}_by_time"] = xr.DataArray(
            arr.reshape(shape + (len(times),)), dims=AXES + ("residence_time_ms",),
            coords={"residence_time_ms": ("residence_time_ms", np.array(times),
                                          {"units": "ms", "long_name": UNITS["residence_time_ms"][1]})},
            attrs={"units": unit, "long_name": long_name, "reference_oxygen_percent": em.reference_oxygen_percent,
                   "heating_value_basis": em.heating_value})
    return out





def emission_sentences(study: Study, rows: list[dict], most_phis: int = 4) -> list[str]:
    """One plain sentence per blended gas and condition ([emissions] with a blend axis): its NOx
    after the design residence time against the unblended gas's at equal equivalence ratio, at
    up to ``most_phis`` equivalence ratios where both burn. [] without [emissions] or blends."""
    em = of(study)
    if em is None or not study.blend_with:
        return []
    nox = {(r["fuel"], r["oxidizer"], r["blend_fraction"], r["pressure_bar"], r["unburned_temperature_K"],
            r["equivalence_ratio"]): r["nox_ppmvd_at_reference_o2"] for r in rows
           if r["status"] == "ok" and r.get("nox_ppmvd_at_reference_o2") is not None}
    out = []
    for fuel, ox, frac, P, T in dict.fromkeys(k[:5] for k in nox if k[2] > 0):
        pairs = [(phi, nox[(fuel, ox, 0.0, P, T, phi)], v) for (f, o, b, p, t, phi), v in nox.items()
                 if (f, o, b, p, t) == (fuel, ox, frac, P, T) and (fuel, ox, 0.0, P, T, phi) in nox]
        if not pairs:
            continue
        pairs.sort()
        shown = [pairs[round(i * (len(pairs) - 1) / (most_phis - 1))] for i in range(most_phis)] \
            if len(pairs) > most_phis else pairs
        shown = list(dict.fromkeys(shown))
        parts = [f"{'rises' if b > a else 'falls' if b < a else 'stays'} from {a:.3g} to {b:.3g} ppm at φ {phi:g}"
                 for phi, a, b in shown]
        out.append(f"With {100 * frac:g} % {study.blend_with} in {fuel}"
                   + (f" (in {ox})" if len(study.sweep_oxidizers) > 1 else "")
                   + f" at {P:g} bar and {T:g} K, NOx at {em.reference_oxygen_percent:g} % O2 (dry) after "
                   f"{1e3 * em.design_residence_time_s:g} ms " + ", ".join(parts) + " (equal φ)"
                   + _at_equal_tad(rows, (fuel, ox, frac, P, T), [phi for phi, _, _ in shown], nox) + ".")
    return out


def _at_equal_tad(rows: list[dict], gas: tuple, phis: list[float], nox: dict) -> str:
    """'; at the unblended gas's flame temperature ...' for the sentence of ``gas`` (fuel,
    oxidizer, blend fraction, p, T) at ``phis``, where the matched flames are solved."""
    by_phi = {r["equivalence_ratio"]: r for r in rows if (r["fuel"], r["oxidizer"], r["blend_fraction"],
                                                         r["pressure_bar"], r["unburned_temperature_K"]) == gas}
    parts = []
    for phi in phis:
        r = by_phi.get(phi) or {}
        v, matched = r.get("nox_ppmvd_at_reference_o2_equal_flame_temperature"), \
            r.get("equal_flame_temperature_equivalence_ratio")
        ref = nox.get((gas[0], gas[1], 0.0, gas[3], gas[4], phi))
        if v is not None and matched is not None and ref is not None:
            parts.append(f"{ref:.3g} to {v:.3g} ppm (φ {phi:g} against {matched:.3g})")
    return "; at the unblended gas's flame temperature, " + ", ".join(parts) if parts else ""


def with_emission_variables(study: Study, rows: list[dict], shape: tuple[int, ...], ds: xr.Dataset) -> xr.Dataset:
    """``ds`` (one mechanism's results.nc) with the [emissions] variables over the residence time
    and the reference O2, heating-value basis and design residence time in the attributes;
    ``ds`` itself without [emissions]."""
    em = of(study)
    if em is None:
        return ds
    ds = ds.assign(_emissions_by_time(study, rows, shape))
    for name in ds.data_vars:  # the reference O2 and basis travel with every emission variable
        if "at_reference_o2" in str(name) or "mg_kwh" in str(name):
            ds[name].attrs.update(reference_oxygen_percent=em.reference_oxygen_percent,
                                  heating_value_basis=em.heating_value)
    ds.attrs.update(emissions_reference_oxygen_percent=em.reference_oxygen_percent,
                    emissions_heating_value_basis=em.heating_value,
                    emissions_design_residence_time_ms=1e3 * em.design_residence_time_s)
    return ds


DATASET = with_emission_variables
TABLE_ROWS = {"emissions.csv": emission_rows}
