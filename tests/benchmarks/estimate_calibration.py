"""What `check`'s run-time estimate is built from: flames by resolution and pressure, strained-flame ladders.

Run:  python tests/benchmarks/estimate_calibration.py [--sections flames,steps,ladders] [--mechanism h2o2.yaml]
      [--pressures 1,10] [--resolutions coarse,standard] [--step-sizes 0.05,0.1,0.2,0.3]
      [--ladder-phis 0.5,0.7,1.0] [--jobs 1]

- ``flames``: one small study (hydrogen and a nitrogen-diluted hydrogen, blends 0 and 0.5, phi
  0.6-1.4 in steps of 0.2: 10 points) solved by ``pipeline.solve_study`` into a fresh folder at
  every pressure and resolution, ``--jobs`` workers (1: one flame at a time, so a flame's time is
  its own). Per setting: the flames from scratch and warm-started, their median seconds and grid
  points, their CPU seconds (``sweep.schedule.FLAME_SECONDS``, ``RESOLUTION_COST``, ``PRESSURE_COST_PER_DECADE``).
- ``steps``: chains of 4 flames of one fuel at steps of ``--step-sizes`` in phi, one at a time: each warm
  start's distance to its source and its seconds (``sweep.schedule.WARM_DISTANCE_COST``).
- ``ladders``: hydrogen-air ladders (``analyses.strain_ladders.task.stretch_task``, what a [stretch] table runs)
  at ``--ladder-phis`` and every pressure, one at a time, after their free flame: strained flames,
  seconds, CPU seconds, seconds per strained flame.

Time is wall time of one process; CPU seconds are given beside it because the project's machine
is shared (a busy machine stretches the wall time, less the CPU time). The last line printed is
one JSON object; progress goes to stderr.
"""
from __future__ import annotations

import argparse
import json
import sqlite3
import statistics
import sys
import tempfile
import textwrap
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from flamecharts.config import load_study  # noqa: E402
from flamecharts.pipeline import solve_study  # noqa: E402
from flamecharts.store import DB_NAME  # noqa: E402
from flamecharts.sweep import worker  # noqa: E402

STUDY = """
title = "estimate calibration"
mechanism = "{mechanism}"
resolution = "{resolution}"
[fuels]
diluted = {{ H2 = 0.6, N2 = 0.4 }}
hydrogen = {{ H2 = 1.0 }}
[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}
[sweep]
fuel = ["diluted"]
oxidizer = ["air"]
blend = {{ with = "hydrogen", fraction = [0.0, 0.5] }}
equivalence_ratio = [0.6, 0.8, 1.0, 1.2, 1.4]
pressure_bar = [{pressure}]
unburned_temperature_K = [300.0]
"""
GRI_STUDY = STUDY.replace("diluted = {{ H2 = 0.6, N2 = 0.4 }}", "methane = {{ CH4 = 1.0 }}").replace(
    '["diluted"]', '["methane"]')


def _med(v: list[float]) -> float | None:
    return round(statistics.median(v), 3) if v else None


def flames(mechanism: str, resolution: str, pressure: float, jobs: int) -> dict:
    with tempfile.TemporaryDirectory() as tmp:
        cfg = Path(tmp) / "s.toml"
        text = GRI_STUDY if "gri" in mechanism else STUDY
        cfg.write_text(textwrap.dedent(text.format(mechanism=mechanism, resolution=resolution, pressure=pressure)))
        study = load_study(cfg)
        cpu: dict[str, float] = {}
        solve = worker.solve_task

        def timed(task: dict) -> dict:  # with --jobs 1 the flames are solved in this process: their CPU time
            r = solve(task)
            cpu[r["key"]] = r["cpu_seconds"]
            return r
        worker.solve_task = timed
        t0 = time.perf_counter()
        try:
            solve_study(study, Path(tmp) / "out", jobs=jobs)
        finally:
            worker.solve_task = solve
        wall = time.perf_counter() - t0
        with sqlite3.connect(Path(tmp) / "out" / DB_NAME) as db:
            rows = [(st, s, {**json.loads(m), "cpu_seconds": cpu.get(k)}) for k, st, s, m in db.execute(
                "SELECT key, start, solve_seconds, metrics FROM points WHERE status = 'ok'")]
    nv2 = (len(study.atoms) + 4) ** 2
    out: dict = {"wall_s": round(wall, 2), "flames": len(rows), "species": len(study.atoms)}
    for start in ("fresh", "warm"):
        mine = [(s, m) for st, s, m in rows if st == start]
        secs = [s for s, _ in mine]
        cpus = [m["cpu_seconds"] for _, m in mine if m["cpu_seconds"] is not None]
        out[start] = {"n": len(mine), "median_s": _med(secs), "mean_s": round(statistics.mean(secs), 3) if secs else None,
                      "mean_cpu_s": round(statistics.mean(cpus), 3) if cpus else None,
                      "range_s": [round(min(secs), 3), round(max(secs), 3)] if secs else None,
                      "median_grid_points": _med([m.get("grid_points", 0) for _, m in mine]),
                      "mean_s_per_variable_squared": round(statistics.mean(secs) / nv2, 5) if secs else None}
    return out


def steps(mechanism: str, resolution: str, sizes: list[float], pressure: float = 1.0) -> list[dict]:
    """Warm starts against their step: per step size in phi, a chain of 4 flames of one fuel (phi
    0.7, 0.7 + step, ...), one at a time; per warm flame its distance to its source (units of
    sweep.warm_tree.DISTANCE_SCALES) and its seconds (wall and CPU)."""
    from flamecharts.sweep.points import points as points_of
    from flamecharts.sweep.run import unique_points
    from flamecharts.sweep.warm_tree import warm_tree

    out = []
    for size in sizes:
        with tempfile.TemporaryDirectory() as tmp:
            cfg = Path(tmp) / "s.toml"
            text = (GRI_STUDY if "gri" in mechanism else STUDY).replace(
                "equivalence_ratio = [0.6, 0.8, 1.0, 1.2, 1.4]",
                f"equivalence_ratio = [{', '.join(f'{0.7 + k * size:.4g}' for k in range(4))}]").replace(
                "fraction = [0.0, 0.5]", "fraction = [1.0]")
            cfg.write_text(textwrap.dedent(text.format(mechanism=mechanism, resolution=resolution, pressure=pressure)))
            study = load_study(cfg)
            unique = unique_points(points_of(study))
            tree = warm_tree(unique)
            cpu: dict[str, float] = {}
            solve = worker.solve_task

            def timed(task: dict, solve=solve, cpu=cpu) -> dict:
                r = solve(task)
                cpu[r["key"]] = r["cpu_seconds"]
                return r
            worker.solve_task = timed
            try:
                solve_study(study, Path(tmp) / "out", jobs=1)
            finally:
                worker.solve_task = solve
            with sqlite3.connect(Path(tmp) / "out" / DB_NAME) as db:
                secs = dict(db.execute("SELECT key, solve_seconds FROM points"))
                starts = dict(db.execute("SELECT key, start FROM points"))
        for p in unique:
            row = {"step": size, "phi": p.phi, "start": starts[p.key], "distance": round(tree.distance[p.index], 3),
                   "seconds": round(secs[p.key], 3), "cpu_seconds": round(cpu[p.key], 3)}
            print(row, file=sys.stderr, flush=True)
            out.append(row)
    return out


def ladders(mechanism: str, phis: list[float], pressure: float) -> list[dict]:
    import cantera as ct

    from flamecharts.analyses.strain_ladders.task import stretch_task
    from flamecharts.chemistry.flame import solve_flame
    from flamecharts.chemistry.mechanism import solution
    from flamecharts.numerics import NUMERICS

    out = []
    for phi in phis:
        gas = ct.Solution(mechanism)
        gas.set_equivalence_ratio(phi, {"H2": 1.0}, {"O2": 1.0, "N2": 3.76})
        X = gas.mole_fraction_dict()
        free = solve_flame(solution(mechanism, "mixture-averaged"), 300.0, pressure * 1e5, X, "mixture-averaged",
                           False, NUMERICS["standard"])
        m = free["metrics"]
        task = {"key": "x", "mechanism_path": mechanism, "mechanism_sha256": "", "transport": "mixture-averaged",
                "T_u": 300.0, "P": pressure * 1e5, "X": X, "S_L": m["laminar_flame_speed_m_s"],
                "T_ad": m["adiabatic_flame_temperature_K"], "time_limit_s": 3600.0}
        r = stretch_task(task)
        n = (r["metrics"] or {}).get("solves", 0)
        row = {"phi": phi, "pressure_bar": pressure, "strained_flames": n, "seconds": round(r["solve_seconds"], 2),
               "cpu_seconds": round(r["cpu_seconds"], 2),
               "seconds_per_flame": round(r["solve_seconds"] / n, 3) if n else None, "message": r["message"]}
        print(row, file=sys.stderr, flush=True)
        out.append(row)
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sections", default="flames,steps,ladders")
    ap.add_argument("--mechanism", default="h2o2.yaml")
    ap.add_argument("--pressures", default="1,10")
    ap.add_argument("--resolutions", default="coarse,standard")
    ap.add_argument("--ladder-phis", default="0.5,0.7,1.0")
    ap.add_argument("--step-sizes", default="0.05,0.1,0.2,0.3")
    ap.add_argument("--jobs", type=int, default=1)
    args = ap.parse_args(argv)
    pressures = [float(p) for p in args.pressures.split(",")]
    figures: dict = {"mechanism": args.mechanism}
    if "flames" in args.sections:
        for res in args.resolutions.split(","):
            for p in pressures:
                figures[f"flames_{res}_{p:g}bar"] = f = flames(args.mechanism, res, p, args.jobs)
                print(f"{res} {p:g} bar: {f}", file=sys.stderr, flush=True)
    if "steps" in args.sections:
        figures["steps"] = {res: steps(args.mechanism, res, [float(x) for x in args.step_sizes.split(",")])
                            for res in args.resolutions.split(",")}
    if "ladders" in args.sections:
        figures["ladders"] = [row for p in pressures
                              for row in ladders(args.mechanism, [float(x) for x in args.ladder_phis.split(",")], p)]
    print(json.dumps(figures))
    return 0


if __name__ == "__main__":
    sys.exit(main())
