"""The results of a study: one flat row per point, read from the store, with the design read-out.

flat_row      a point's stored flame -> its row (columns.COLUMNS, units in the names)
point_rows    every point of a study, in study order, annotated (indicators, gas, burner, warnings)
rows_from_dir the study of a finished run folder and its rows, read from the store alone
"""
from __future__ import annotations

import json
from pathlib import Path

from .columns import FROM_METRICS
from .config import Study, load_config_copy, resolution_label
from .design import annotate, point_warnings
from .errors import StoreError
from .store import DB_NAME, Store
from .sweep.points import Point, points


def flat_row(study: Study, p: Point, stored: dict | None) -> dict:
    """One results.csv row for point ``p`` from its stored result (None: not solved yet)."""
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
    for name, (col, scale) in FROM_METRICS.items():
        v = metrics.get(name)
        row[col] = None if v is None else v * scale
    return row


def point_rows(study: Study, pts: list[Point], stored: dict[str, dict]) -> list[dict]:
    """One flat row per point, in study order, from stored results (missing -> 'pending'),
    with the design indicators, fuel-gas properties and burner margins added, and the
    range warnings of each point (column 'warnings', see design.point_warnings)."""
    rows = annotate(study, [flat_row(study, p, stored.get(p.key)) for p in pts])
    for p, r in zip(pts, rows):
        r["warnings"] = point_warnings(study, p, r)
    return rows


def rows_from_dir(out_dir: Path) -> tuple[Study, list[dict]]:
    """The study of a finished run folder and its rows, read from the store alone."""
    study = load_config_copy(out_dir)
    pts = points(study)
    with Store(Path(out_dir) / DB_NAME, readonly=True) as store:
        stored = store.rows([p.key for p in pts])
        n_stored = len(store.keys())
    if n_stored and not stored:
        raise StoreError(f"none of the {n_stored} flames stored in {out_dir} matches the study any more: the "
                         "mechanism file or the Cantera version changed since the run; rerun the study "
                         "(flamecharts run CONFIG --out DIR) to solve it with what is installed now")
    return study, point_rows(study, pts, stored)
