"""Per-flame time limit on a loaded machine: does it fail healthy flames?

Run:  python tests/benchmarks/time_limit_under_load.py [--factor 2.5] [--hogs 4] [--jobs 2]

A small hydrogen study (h2o2.yaml, 18 points) is solved twice in fresh folders:

1. alone, to measure each flame's solve time (wall time = CPU time on an idle machine);
2. with ``flame_time_limit_s`` set to ``--factor`` times the slowest flame of step 1, while
   ``--hogs`` busy-loop processes (more than there are cores) compete for the CPU.

A limit that counts wall time fails flames in step 2 (each worker gets a share of a core,
so a flame's wall time stretches by about (hogs + jobs) / cores); a limit that counts the
flame's own CPU time fails none. The last line printed is a JSON object: flames failed by
the time limit in step 2, the limit, the slowest flame alone, the slowest under load.
Run it against two versions of flamecharts from their own trees to compare.
"""
from __future__ import annotations

import argparse
import json
import multiprocessing as mp
import os
import tempfile
import textwrap
from pathlib import Path

STUDY = textwrap.dedent("""
    title = "Time limit under load: diluted hydrogen"
    mechanism = "h2o2.yaml"
    {limit}

    [fuels]
    diluted = {{ H2 = 0.5, N2 = 0.5 }}
    hydrogen = {{ H2 = 1.0 }}

    [oxidizers]
    air = {{ O2 = 1.0, N2 = 3.76 }}

    [sweep]
    fuel = ["diluted"]
    oxidizer = ["air"]
    blend = {{ with = "hydrogen", fraction = [0.0, 0.5] }}
    equivalence_ratio = [0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.2, 1.4, 1.6]
    pressure_bar = [1.0]
    unburned_temperature_K = [300.0]
""")


def _hog(stop) -> None:
    x = 0
    while not stop.is_set():
        for _ in range(100_000):
            x += 1


def _solve(folder: Path, limit_s: float | None, jobs: int) -> list[dict]:
    import flamecharts
    folder.mkdir(parents=True, exist_ok=True)
    cfg = folder / "study.toml"
    cfg.write_text(STUDY.format(limit="" if limit_s is None else f"flame_time_limit_s = {limit_s:.3f}"))
    return flamecharts.run(cfg, out=folder / "out", jobs=jobs, charts=False, report=False).rows


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--factor", type=float, default=2.5, help="limit = factor x the slowest flame alone")
    ap.add_argument("--hogs", type=int, default=2 * (os.cpu_count() or 2), help="busy-loop processes")
    ap.add_argument("--jobs", type=int, default=2)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        alone = _solve(Path(tmp) / "alone", None, args.jobs)
        slowest = max(r["solve_seconds"] for r in alone if r["solve_seconds"] is not None)
        limit = args.factor * slowest
        stop = mp.Event()
        hogs = [mp.Process(target=_hog, args=(stop,), daemon=True) for _ in range(args.hogs)]
        for h in hogs:
            h.start()
        try:
            loaded = _solve(Path(tmp) / "loaded", limit, args.jobs)
        finally:
            stop.set()
            for h in hogs:
                h.join(5)
    failed = [r for r in loaded if r["status"] == "failed" and "time limit" in (r["message"] or "")]
    for r in failed:
        print(f"failed: phi {r['equivalence_ratio']:g}, blend {r['blend_fraction']:g}: {r['message']}")
    print(json.dumps({"flames": len(loaded), "failed_by_time_limit": len(failed), "limit_s": round(limit, 2),
                      "slowest_alone_s": round(slowest, 2),
                      "slowest_loaded_wall_s": round(max(r["solve_seconds"] or 0 for r in loaded), 2),
                      "hogs": args.hogs, "jobs": args.jobs}))


if __name__ == "__main__":
    main()
