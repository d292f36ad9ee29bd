"""Sweep speed: flamecharts against solving every flame alone, in one process tree.

Run:  python tests/benchmarks/sweep_speed.py [--size small|full] [--jobs 2] [--sample 8] [--reduction]

One study is solved two ways:

- baseline: what a user writes by hand with the library: every point alone, from
  scratch, serially, with Cantera's automatic solve and the same final refinement
  criteria as flamecharts' default setting. To keep the benchmark short it is timed on
  a random sample of the study's points (seeded; the points are printed) and compared
  point by point on those;
- flamecharts: ``run_study`` on a fresh output folder with ``--jobs`` workers.

Then, on the finished study: the floor (re-solving a converged flame on its own grid,
the least work that proves a solution, timed on the same sample), a rerun (everything
from the store; ``rerun_s`` through the library, ``rerun_cli_with_charts_s`` through
the command line with CSV, charts and report), and an extension by one new pressure level (new points warm-start
from the stored flames of the first run). Worker memory is polled all along; the
run-time estimate that ``flamecharts check`` prints is compared with the real wall
time. Sizes:

- small: h2o2.yaml, diluted hydrogen blended with 0/25/50 % hydrogen x 9 equivalence
  ratios x 2 pressures (54 points; about 2 minutes on 2 cores)
- full: gri30.yaml, a natural gas blended with 0/15/30 % hydrogen x 9 equivalence
  ratios x 1 and 5 bar (54 points; about 10 minutes on 2 cores)

``--reduction`` (issue 32): after the baseline, the same study with a ``[reduction]`` table (its
defaults: flame speed 1 %) is solved in a second fresh folder, the reduction included in its wall
time; its figures (``reduced_*``) sit beside the detailed run's, against the same solo
detailed-mechanism solves and the same floor, plus the floor of the skeletal mechanism (its
flames re-solved on their own grids) and the largest flame-speed deviation of the reduced sweep
from the detailed one over the points both solved. The extension is left out in this mode (a new
pressure would re-reduce).

The last line printed is one JSON object with every figure (times in seconds; CPU
times are per-process CPU, wall times are elapsed).
"""
from __future__ import annotations

import argparse
import json
import random
import statistics
import subprocess
import sys
import tempfile
import textwrap
import threading
import time
from pathlib import Path

import cantera as ct
import psutil

from flamecharts.chemistry.flame import NUMERICS, _initial_guess, _make_flame, _set_criteria
from flamecharts.config import load_study
from flamecharts.pipeline import run_study
from flamecharts.store import DB_NAME, Store
from flamecharts.sweep import points as plan_points, schedule as plan_schedule, warm_tree as plan_tree
from flamecharts.sweep.backends import resolve_jobs

STUDIES = {
    "small": dict(mechanism="h2o2.yaml", base='diluted_hydrogen = { H2 = 0.5, N2 = 0.5 }',
                  base_name="diluted_hydrogen", fractions="[0.0, 0.25, 0.5]",
                  phis="{ from = 0.6, to = 1.4, step = 0.1 }", pressures="[1.0, 5.0]", extend_bar=2.5),
    "full": dict(mechanism="gri30.yaml",
                 base='natural_gas = { CH4 = 0.91, C2H6 = 0.05, C3H8 = 0.01, N2 = 0.02, CO2 = 0.01 }',
                 base_name="natural_gas", fractions="[0.0, 0.15, 0.3]",
                 phis="{ from = 0.7, to = 1.5, step = 0.1 }", pressures="[1.0, 5.0]", extend_bar=2.5),
}

TEMPLATE = """
title = "Benchmark: {size} sweep"
mechanism = "{mechanism}"
transport = "mixture-averaged"

[fuels]
{base}
hydrogen = {{ H2 = 1.0 }}

[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}

[sweep]
fuel = ["{base_name}"]
oxidizer = ["air"]
blend = {{ with = "hydrogen", fraction = {fractions} }}
equivalence_ratio = {phis}
pressure_bar = {pressures}
unburned_temperature_K = [300.0]
"""


def write_study(folder: Path, size: str, pressures: str | None = None, name: str = "bench",
                reduction: bool = False) -> Path:
    spec = dict(STUDIES[size])
    if pressures is not None:
        spec["pressures"] = pressures
    path = folder / f"{name}.toml"
    path.write_text(textwrap.dedent(TEMPLATE.format(size=size, **spec)) + ("\n[reduction]\n" if reduction else ""))
    return path


class MemoryWatch:
    """Polls the resident memory of this process's children (the workers) every 0.2 s."""

    def __init__(self):
        self.peak_mb = 0.0
        self._stop = threading.Event()
        self._thread = threading.Thread(target=self._poll, daemon=True)

    def _poll(self):
        me = psutil.Process()
        while not self._stop.is_set():
            for child in me.children(recursive=True):
                try:
                    self.peak_mb = max(self.peak_mb, child.memory_info().rss / 2**20)
                except psutil.Error:
                    pass
            self._stop.wait(0.2)

    def __enter__(self):
        self._thread.start()
        return self

    def __exit__(self, *exc):
        self._stop.set()
        self._thread.join()


def baseline_flame(gas, p: plan_points.Point) -> tuple[float, float, float]:
    """(S_L [m/s], wall [s], CPU [s]) of one flame solved alone from scratch, as a user would."""
    final = NUMERICS["standard"].stages[-1]
    w0, c0 = time.perf_counter(), time.process_time()
    gas.TPX = p.T_u, p.P, p.X_unburned
    f = ct.FreeFlame(gas, width=0.03)
    f.transport_model = "mixture-averaged"
    f.set_refine_criteria(ratio=final[0], slope=final[1], curve=final[2])
    f.solve(loglevel=0, auto=True)
    return float(f.velocity[0]), time.perf_counter() - w0, time.process_time() - c0


def floor_flame(gas, p: plan_points.Point, profile: dict) -> float:
    """CPU seconds to re-solve a converged flame on its own grid (no refinement)."""
    num = NUMERICS["standard"]
    gas.TPX = p.T_u, p.P, p.X_unburned
    f = _make_flame(ct, gas, num.width_m, "mixture-averaged", False, num)
    f.set_initial_guess(data=_initial_guess(ct, gas, profile, p.P))
    f.P, f.inlet.T, f.inlet.X = p.P, p.T_u, p.X_unburned
    _set_criteria(f, num.stages[-1], num.prune)
    c0 = time.process_time()
    f.solve(loglevel=0, refine_grid=False, auto=False)
    return time.process_time() - c0


def timed_run(study, out: Path, jobs: int) -> tuple[object, float, list[dict]]:
    finished: list[dict] = []

    def progress(pr):
        if pr.last is not None:
            finished.append(pr.last)

    t0 = time.perf_counter()
    summary = run_study(study, out_dir=out, jobs=jobs, progress=progress)
    return summary, time.perf_counter() - t0, finished


def _condition(row: dict) -> tuple:
    return row["blend_fraction"], row["equivalence_ratio"], row["pressure_bar"], row["unburned_temperature_K"]


def reduced_run(tmp: Path, size: str, jobs: int, sample: list, detailed_rows: list[dict], baseline_s: float,
                floor_s: float) -> dict:
    """The study with [reduction] in a fresh folder: its figures against the detailed run's baseline
    (mean wall of a solo detailed solve) and floor, the skeletal floor on the same sample, and its
    flame-speed deviation from the detailed sweep over the points both solved."""
    study = load_study(write_study(tmp, size, name="bench_reduced", reduction=True))
    events: list[float] = []

    def progress(pr):
        if pr.what == "mechanism reduction":
            events.append(pr.elapsed_s)
        elif pr.last is not None:
            finished.append(pr.last)

    finished: list[dict] = []
    t0 = time.perf_counter()
    with MemoryWatch() as mem:
        summary = run_study(study, out_dir=tmp / "out_reduced", jobs=jobs, progress=progress)
    wall = time.perf_counter() - t0
    reduction_s = max(events, default=0.0)
    r = summary.study.reduced
    n = len(summary.rows)
    log(f"reduced: {wall:.1f} s wall (reduction {reduction_s:.1f} s), {summary.solved} solved, {summary.failed} "
        f"failed; {summary.reduction_note}")
    detailed = {_condition(row): row for row in detailed_rows if row["status"] == "ok"}
    deviations = sorted(((abs(row["laminar_flame_speed_m_s"] / detailed[_condition(row)]["laminar_flame_speed_m_s"]
                               - 1.0), _condition(row)) for row in summary.rows
                         if row["status"] == "ok" and _condition(row) in detailed), reverse=True)
    gas = ct.Solution(str(summary.study.mechanism_path), transport_model="mixture-averaged")
    by_condition = {(p.blend_fraction, p.phi, p.pressure_bar, p.T_u): p for p in plan_points.points(summary.study)}
    with Store(tmp / "out_reduced" / DB_NAME, readonly=True) as store:
        pairs = [(p, store.profile(p.key)) for p in
                 (by_condition[(q.blend_fraction, q.phi, q.pressure_bar, q.T_u)] for q in sample)]
    skeletal_floors = [floor_flame(gas, p, profile) for p, profile in pairs]
    cpu = [f["cpu_seconds"] for f in finished]
    solve_wall = wall - reduction_s
    return {
        "reduced": bool(r and r.reduced),
        "reduced_species": [len(r.species), r.detailed_size[0]] if r and r.reduced else None,
        "reduced_reactions": [r.reactions, r.detailed_size[1]] if r and r.reduced else None,
        "reduced_stated_flame_speed_error": r.flame_speed_error if r else None,
        "reduced_reduction_s": reduction_s,
        "reduced_reduction_cpu_s": dict(r.cpu_s) if r else None,
        "reduced_tool_wall_s": wall,
        "reduced_tool_s_per_point": wall / n,
        "reduced_speedup": baseline_s / (wall / n),
        "reduced_speedup_without_reduction": baseline_s / (solve_wall / n),
        "reduced_tool_cpu_s_per_point": statistics.median(cpu),
        "reduced_tool_cpu_s_fresh": [f["cpu_seconds"] for f in finished if f["start"] == "fresh"],
        "reduced_ratio_to_floor": statistics.median(cpu) / floor_s,
        "reduced_floor_s_per_point": statistics.median(skeletal_floors),
        "reduced_ratio_to_own_floor": statistics.median(cpu) / statistics.median(skeletal_floors),
        "reduced_max_rel_diff_from_detailed": deviations[0][0] if deviations else None,
        "reduced_max_rel_diff_at": list(deviations[0][1]) if deviations else None,
        "reduced_points_compared": len(deviations),
        "reduced_failed": summary.failed, "reduced_no_flame": summary.no_flame,
        "reduced_peak_rss_mb_per_worker": mem.peak_mb,
    }


def log(msg: str) -> None:
    print(msg, file=sys.stderr, flush=True)


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--size", choices=sorted(STUDIES), default="small")
    ap.add_argument("--jobs", type=int, default=2)
    ap.add_argument("--sample", type=int, default=8, help="points the baseline is timed on")
    ap.add_argument("--seed", type=int, default=2026)
    ap.add_argument("--reduction", action="store_true",
                    help="also solve the study with [reduction] (its defaults); no extension then")
    args = ap.parse_args(argv)
    jobs = resolve_jobs(args.jobs)
    tmp = Path(tempfile.mkdtemp(prefix="flamecharts-bench-"))
    study = load_study(write_study(tmp, args.size))
    pts = plan_points.points(study)
    out = tmp / "out"

    secs = plan_schedule.default_flame_seconds(len(study.atoms))
    estimate_s = plan_schedule.estimate_run_seconds(plan_tree.warm_tree(pts), jobs, secs["fresh"], secs["warm"])
    log(f"{len(pts)} points, {args.size}; estimate before the run {estimate_s:.0f} s on {jobs} workers; folder {tmp}")

    with MemoryWatch() as mem:
        summary, tool_wall, finished = timed_run(study, out, jobs)
    log(f"flamecharts: {tool_wall:.1f} s wall, {summary.solved} solved, {summary.failed} failed, "
        f"{summary.no_flame} no flame")
    cpu = [f["cpu_seconds"] for f in finished]
    by_start = {s: [f["cpu_seconds"] for f in finished if f["start"] == s] for s in ("fresh", "warm")}

    rng = random.Random(args.seed)
    ok_keys = {r["point_key"] for r in summary.rows if r["status"] == "ok"}
    sample = sorted(rng.sample([p for p in pts if p.key in ok_keys], min(args.sample, len(ok_keys))),
                    key=lambda p: p.index)
    gas = ct.Solution(study.mechanism_path, transport_model="mixture-averaged")
    tool_speed = {r["point_key"]: r["laminar_flame_speed_m_s"] for r in summary.rows}
    base, diffs, floors = [], [], []
    with Store(out / DB_NAME, readonly=True) as store:
        profiles = {p.key: store.profile(p.key) for p in sample}
    for p in sample:
        S_L, wall, cpu_b = baseline_flame(gas, p)
        floors.append(floor_flame(gas, p, profiles[p.key]))
        rel = abs(tool_speed[p.key] - S_L) / S_L
        base.append(wall)
        diffs.append(rel)
        log(f"  baseline {p.fuel} + {p.blend_fraction:g} H2, phi {p.phi:g}, {p.pressure_bar:g} bar: "
            f"{wall:.1f} s, S_L {100 * S_L:.3f} cm/s, flamecharts {100 * tool_speed[p.key]:.3f} cm/s "
            f"({100 * rel:.3f} %), floor {floors[-1]:.2f} s")

    t0 = time.perf_counter()
    rerun = run_study(study, out_dir=out, jobs=jobs)
    rerun_s = time.perf_counter() - t0
    assert rerun.solved == 0, "the rerun solved flames: the store lost results"
    t0 = time.perf_counter()  # the same through the command line, charts and report included
    cli = subprocess.run([sys.executable, "-m", "flamecharts", "run", str(tmp / "bench.toml"), "--out", str(out),
                          "--jobs", str(jobs), "--quiet"], capture_output=True, text=True)
    rerun_cli_s = time.perf_counter() - t0
    assert cli.returncode == 0 and "solved 0 now" in cli.stdout, cli.stderr

    reduced = reduced_run(tmp, args.size, jobs, sample, summary.rows, statistics.mean(base),
                          statistics.median(floors)) if args.reduction else {}
    new_points, ext_wall, ext_finished, mem2_peak = 0, 0.0, [], 0.0
    if not args.reduction:
        spec_p = json.loads(STUDIES[args.size]["pressures"])
        extended = load_study(write_study(tmp, args.size, json.dumps(sorted(spec_p + [STUDIES[args.size]["extend_bar"]]))))
        with MemoryWatch() as mem2:
            ext, ext_wall, ext_finished = timed_run(extended, out, jobs)
        new_points = ext.solved
        log(f"extension by {STUDIES[args.size]['extend_bar']} bar: {new_points} new points in {ext_wall:.1f} s")
        mem2_peak = mem2.peak_mb

    n = len(pts)
    floor = statistics.median(floors)
    figures = {
        "size": args.size, "mechanism": study.mechanism, "jobs": jobs, "points": n,
        "baseline_sample": [{"fuel": p.fuel, "blend_fraction": p.blend_fraction, "phi": p.phi,
                             "pressure_bar": p.pressure_bar} for p in sample],
        "baseline_s_per_point": statistics.mean(base),
        "tool_s_per_point": tool_wall / n,
        "speedup": statistics.mean(base) / (tool_wall / n),
        "max_rel_diff_flame_speed": max(diffs),
        "floor_s_per_point": floor,
        "tool_cpu_s_per_point": statistics.median(cpu),
        "tool_cpu_s_per_point_mean": statistics.mean(cpu),
        "tool_cpu_s_fresh": by_start["fresh"], "tool_cpu_s_warm_median": statistics.median(by_start["warm"] or [0]),
        "ratio_to_floor": statistics.median(cpu) / floor,
        "rerun_s": rerun_s,
        "rerun_cli_with_charts_s": rerun_cli_s,
        "extend_new_points": new_points,
        "extend_s_per_new_point": ext_wall / max(new_points, 1),
        "extend_cpu_s_per_new_point": statistics.median([f["cpu_seconds"] for f in ext_finished] or [0]),
        "extend_ratio_to_floor": ext_wall / max(new_points, 1) / floor,
        "peak_rss_mb_per_worker": max(mem.peak_mb, mem2_peak),
        "check_estimate_s": estimate_s,
        "tool_wall_s": tool_wall,
        "estimate_ratio": estimate_s / tool_wall,
        "failed": summary.failed, "no_flame": summary.no_flame,
        "cantera": ct.__version__, "cpus": psutil.cpu_count(),
        **reduced,
    }
    print(json.dumps({k: (round(v, 4) if isinstance(v, float) else v) for k, v in figures.items()}))
    return 0


if __name__ == "__main__":
    sys.exit(main())
