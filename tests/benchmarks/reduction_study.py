"""A study with [reduction] against the same study without it (issue 32 items 1-3): what the
skeletal mechanism costs to make, what it saves per flame, and its error on EVERY point of the
study, not only on the validation flames it was chosen by.

Run:  nice -n 10 python tests/benchmarks/reduction_study.py [--resolution coarse] [--pressures 1 10]

The study: methane-air on GRI-Mech 3.0, phi 0.7 to 1.3 in steps of 0.1 at the given pressures,
298.15 K; [reduction] with its defaults (flame speed 1 %, ignition delay 10 %, 4 validation
flames). Both runs go to fresh folders in one process (--jobs 1), the detailed one first.

Prints: the species and reactions kept, the reduction's steps (CPU) and wall time, the largest
flame-speed and thermal-thickness deviation of the reduced study from the detailed one over all
points (and at the validation flames' points alone, against the reduction band the outputs
state), the mean solve time per flame of each run and their ratio, and the process CPU of
each run. Last line: one JSON object. Timings on a shared machine: CPU, and ratios within a run.
"""
from __future__ import annotations

import argparse
import json
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

import flamecharts  # noqa: E402

STUDY = """
title = "methane-air, {label}"
mechanism = "gri30.yaml"
resolution = "{resolution}"
{reduction}
[fuels]
methane = {{ CH4 = 1.0 }}

[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}

[sweep]
fuel = ["methane"]
oxidizer = ["air"]
equivalence_ratio = {{ from = 0.7, to = 1.3, step = 0.1 }}
pressure_bar = {pressures}
unburned_temperature_K = [298.15]
"""


def _run(folder: Path, resolution: str, pressures: list[float], reduced: bool) -> tuple[flamecharts.Results, float]:
    label = "reduced" if reduced else "detailed"
    config = folder / f"{label}.toml"
    config.write_text(STUDY.format(label=label, resolution=resolution, pressures=pressures,
                                   reduction="\n[reduction]\n" if reduced else ""))
    cpu = time.process_time()
    res = flamecharts.run(config, out=folder / label, jobs=1, charts=False, report=False)
    return res, time.process_time() - cpu


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--resolution", default="coarse")
    ap.add_argument("--pressures", type=float, nargs="+", default=[1.0, 10.0])
    args = ap.parse_args()
    commit = subprocess.run(["git", "rev-parse", "--short", "HEAD"], cwd=ROOT, capture_output=True,
                            text=True).stdout.strip()
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        detailed, cpu_detailed = _run(folder, args.resolution, args.pressures, False)
        reduced, cpu_reduced = _run(folder, args.resolution, args.pressures, True)
    r = reduced.study.reduced
    assert r is not None
    by_point = {(row["equivalence_ratio"], row["pressure_bar"]): row for row in detailed.rows}
    speed, thick, at_validation = [], [], []
    for row in reduced.rows:
        ref = by_point[(row["equivalence_ratio"], row["pressure_bar"])]
        if row["status"] != "ok" or ref["status"] != "ok":
            continue
        ds = abs(row["laminar_flame_speed_m_s"] / ref["laminar_flame_speed_m_s"] - 1)
        speed.append(ds)
        thick.append(abs(row["thermal_thickness_mm"] / ref["thermal_thickness_mm"] - 1))
        if row["reduction_error_source"] == "measured at this point":
            at_validation.append((row["equivalence_ratio"], row["pressure_bar"], 100 * ds,
                                  row["flame_speed_reduction_error_percent"]))
    per_flame = {name: sum(x["solve_seconds"] for x in res.rows if x["status"] == "ok")
                 / max(1, sum(x["status"] == "ok" for x in res.rows)) for name, res in
                 (("detailed", detailed), ("reduced", reduced))}
    out = {"commit": commit, "resolution": args.resolution, "pressures_bar": args.pressures,
           "species": [len(r.species), r.detailed_size[0]], "reactions": [r.reactions, r.detailed_size[1]],
           "reduction_cpu_s": {k: round(v, 2) for k, v in r.cpu_s.items()},
           "validation_flames": [(f["label"], round(100 * f["error"], 3)) for f in r.flames if f["error"] is not None],
           "ignition_delay_error_percent": round(100 * r.ignition_delay_error, 3),
           "largest_speed_deviation_percent_all_points": round(100 * max(speed), 3),
           "largest_thickness_deviation_percent_all_points": round(100 * max(thick), 3),
           "band_stated_largest_percent": round(100 * (r.flame_speed_error or 0), 3),
           "at_validation_points": at_validation,
           "mean_solve_s_per_flame": {k: round(v, 2) for k, v in per_flame.items()},
           "per_flame_time_ratio": round(per_flame["detailed"] / per_flame["reduced"], 2),
           "process_cpu_s": {"detailed": round(cpu_detailed, 1), "reduced_with_reduction": round(cpu_reduced, 1)}}
    for k, v in out.items():
        print(f"{k}: {v}")
    print(json.dumps(out))


if __name__ == "__main__":
    main()
