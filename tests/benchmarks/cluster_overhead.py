"""Overhead of the Dask path: one study solved by local processes and by a local Dask cluster.

Run:  python tests/benchmarks/cluster_overhead.py [CONFIG] [--workers N] [--noop 100]

Solves CONFIG (default: a 16-point h2o2 study) twice into fresh temporary folders,
once with local joblib processes (jobs=N) and once with ``cluster="local:N"`` (the
Dask cluster's start-up included in its wall time), checks that both give the same
statuses and flame speeds, and prints the wall-time ratio and the worker utilisation
of each. Then it times the round trip of no-op tasks through ``Client.get_executor()``
(what the runner uses) and through ``Client.submit`` + ``distributed.wait``. The last
line printed is one JSON object with every figure.
"""
from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from flamecharts import load_study, run_study  # noqa: E402

from conftest import write_h2_study  # noqa: E402


def _noop(x):
    return x


def noop_round_trips(workers: int, n: int) -> dict:
    """Seconds per no-op task, one at a time, through the executor wrapper and through submit."""
    import logging
    from concurrent.futures import wait as cf_wait

    from distributed import Client, LocalCluster, wait

    with LocalCluster(n_workers=workers, threads_per_worker=1, processes=True, dashboard_address=":0",
                      silence_logs=logging.ERROR) as cluster, Client(cluster) as client:
        client.submit(_noop, 0, pure=False).result()  # warm up
        ex = client.get_executor(pure=False)
        t = time.perf_counter()
        for i in range(n):
            cf_wait([ex.submit(_noop, i)])
        per_executor = (time.perf_counter() - t) / n
        t = time.perf_counter()
        for i in range(n):
            wait([client.submit(_noop, i, pure=False)])
        per_submit = (time.perf_counter() - t) / n
    return {"noop_executor_s": per_executor, "noop_submit_s": per_submit}


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("config", nargs="?", help="study config (default: a 16-point h2o2 study)")
    ap.add_argument("--workers", type=int, default=2)
    ap.add_argument("--noop", type=int, default=100, help="no-op tasks to time (0: skip)")
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        config = args.config or write_h2_study(Path(tmp), fractions="[0.0, 0.5]",
                                               phis="[0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3]")
        study = load_study(config)
        local = run_study(study, out_dir=Path(tmp) / "local", jobs=args.workers)
        dask = run_study(study, out_dir=Path(tmp) / "dask", cluster=f"local:{args.workers}")
    worst = 0.0
    for a, b in zip(local.rows, dask.rows):
        assert a["status"] == b["status"], (a, b)
        if a["status"] == "ok":
            worst = max(worst, abs(a["laminar_flame_speed_m_s"] / b["laminar_flame_speed_m_s"] - 1))
    figures = {"study": study.title, "points": len(local.rows), "workers": args.workers,
               "local_wall_s": local.wall_seconds, "dask_wall_s": dask.wall_seconds,
               "wall_ratio_dask_over_local": dask.wall_seconds / local.wall_seconds,
               "local_utilisation": local.worker_utilisation, "dask_utilisation": dask.worker_utilisation,
               "local_solve_s": local.solve_seconds, "dask_solve_s": dask.solve_seconds,
               "largest_flame_speed_difference_rel": worst}
    print(f"{study.title}: {len(local.rows)} points on {args.workers} workers")
    print(f"  local processes: {local.wall_seconds:7.1f} s, {100 * local.worker_utilisation:.0f} % busy")
    print(f"  Dask local:{args.workers}:   {dask.wall_seconds:7.1f} s, {100 * dask.worker_utilisation:.0f} % busy "
          f"(ratio {figures['wall_ratio_dask_over_local']:.2f}); largest flame speed difference {worst:.1e}")
    if args.noop:
        figures.update(noop_round_trips(args.workers, args.noop))
        print(f"  no-op round trip: executor {1e3 * figures['noop_executor_s']:.1f} ms, "
              f"submit+wait {1e3 * figures['noop_submit_s']:.1f} ms")
    print(json.dumps(figures))


if __name__ == "__main__":
    main()
