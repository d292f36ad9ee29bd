"""Stored results -> flat rows with units in every column name -> results.csv.

COLUMNS lists the CSV columns in order; thickness columns are in mm because that is
how burner designers read them, every other quantity is SI.
"""
from __future__ import annotations

import csv
import json
import os
import tempfile
import time
from pathlib import Path

from . import __version__
from .design import BURNER_COLUMNS, GAS_COLUMNS, INDICATOR_COLUMNS
from .flame import NUMERICS
from .study import Study

COLUMNS = (
    "fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
    "unburned_temperature_K", "status", "laminar_flame_speed_m_s", "thermal_thickness_mm",
    "diffusive_thickness_mm", "reaction_zone_thickness_mm", "adiabatic_flame_temperature_K",
    "equilibrium_temperature_K", "expansion_ratio", "unburned_density_kg_m3",
    "unburned_thermal_diffusivity_m2_s", "grid_points", "solve_seconds", "mechanism", "transport",
    "thermal_diffusion", "resolution", "start", "message", "fuel_mole_fractions", "point_key",
) + INDICATOR_COLUMNS + GAS_COLUMNS + BURNER_COLUMNS + ("warnings",)

GAS_TABLE_COLUMNS = (
    "fuel", "blend_with", "blend_fraction", "oxidizer", "higher_heating_value_MJ_kg", "lower_heating_value_MJ_kg",
    "higher_heating_value_MJ_m3", "lower_heating_value_MJ_m3", "relative_density", "higher_wobbe_index_MJ_m3",
    "lower_wobbe_index_MJ_m3", "wobbe_change_percent", "wobbe_band_low_MJ_m3", "wobbe_band_high_MJ_m3",
    "wobbe_in_band", "stoich_oxidizer_volume_m3_m3", "stoich_oxidizer_mass_kg_kg", "stoich_fuel_mole_fraction",
    "reference_gas", "conditions", "method",
)

_FROM_METRICS = {
    "laminar_flame_speed_m_s": ("laminar_flame_speed_m_s", 1.0),
    "thermal_thickness_mm": ("thermal_thickness_m", 1e3),
    "diffusive_thickness_mm": ("diffusive_thickness_m", 1e3),
    "reaction_zone_thickness_mm": ("reaction_zone_thickness_m", 1e3),
    "adiabatic_flame_temperature_K": ("adiabatic_flame_temperature_K", 1.0),
    "equilibrium_temperature_K": ("equilibrium_temperature_K", 1.0),
    "expansion_ratio": ("expansion_ratio", 1.0),
    "unburned_density_kg_m3": ("unburned_density_kg_m3", 1.0),
    "unburned_thermal_diffusivity_m2_s": ("unburned_thermal_diffusivity_m2_s", 1.0),
    "grid_points": ("grid_points", 1),
}

CAUTION = ("Screening estimates from 1D laminar flame computations, not certification: follow local "
           "codes, the applicable appliance or gas-turbine standards and licensed engineering practice, "
           "and confirm every margin by test on the real hardware.")


def resolution_label(study: Study) -> str:
    """'standard', 'fine', or 'coarse (faster, less accurate)'."""
    return "coarse (faster, less accurate)" if study.resolution == "coarse" else study.resolution


def flat_row(study: Study, p, stored: dict | None) -> dict:
    """One CSV row for point ``p`` from its stored result (None: not solved yet)."""
    row = {
        "fuel": p.fuel, "oxidizer": p.oxidizer, "blend_with": p.blend_with or "",
        "blend_fraction": p.blend_fraction, "equivalence_ratio": p.phi,
        "pressure_bar": p.pressure_bar, "unburned_temperature_K": p.T_u,
        "status": stored["status"] if stored else "pending",
        "solve_seconds": round(stored["solve_seconds"], 3) if stored else None,
        "mechanism": study.mechanism, "transport": study.transport,
        "thermal_diffusion": study.thermal_diffusion, "resolution": resolution_label(study),
        "start": stored["start"] if stored else "",
        "message": stored["message"] if stored else "not solved yet",
        "fuel_mole_fractions": json.dumps({k: round(v, 8) for k, v in p.X_fuel.items()}),
        "point_key": p.key,
    }
    metrics = (stored or {}).get("metrics") or {}
    for col, (name, scale) in _FROM_METRICS.items():
        v = metrics.get(name)
        row[col] = None if v is None else v * scale
    return row


def write_atomic(path: Path, text: str) -> None:
    """Write a text file so a reader never sees half of it."""
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=path.name + ".")
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp, 0o666 & ~umask)  # like any file the user writes, not mkstemp's 0600
    try:
        with os.fdopen(fd, "w", newline="") as fh:
            fh.write(text)
        os.replace(tmp, path)
    except BaseException:
        os.unlink(tmp)
        raise


def _fmt(v) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, float):
        return f"{v:.6g}"
    return str(v)


def write_csv(rows: list[dict], path: Path, columns=COLUMNS) -> Path:
    """A CSV of ``rows`` with ``columns`` (results.csv by default: one row per point)."""
    import io

    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(columns)
    for r in rows:
        w.writerow([_fmt(r.get(c)) for c in columns])
    write_atomic(Path(path), buf.getvalue())
    return Path(path)


def cantera_version() -> str:
    import cantera

    return cantera.__version__


def write_about(study: Study, path: Path) -> Path:
    """about.txt beside the CSV: what produced it, with the cautions."""
    n = NUMERICS[study.resolution]
    lines = [
        f"Study: {study.title}",
        f"Config: {study.config_path or '(from Python)'}",
        f"Mechanism: {study.mechanism} ({study.mechanism_path}, sha256 {study.mechanism_sha256[:16]})",
        f"Transport: {study.transport}; thermal diffusion: {'on' if study.thermal_diffusion else 'off'}",
        f"Resolution: {resolution_label(study)}; refinement stages (ratio, slope, curve): {list(n.stages)}",
        f"flamecharts {__version__}, Cantera {cantera_version()}; written {time.strftime('%Y-%m-%d %H:%M:%S %Z')}",
        "",
        "CAUTION: " + CAUTION,
        "",
    ]
    write_atomic(Path(path), "\n".join(lines))
    return Path(path)
