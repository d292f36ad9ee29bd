"""`check`'s whole-run estimate against the wall time of `flamecharts run`, study by study.

Run:  python tests/benchmarks/estimate_vs_actual.py CONFIG [CONFIG ...] [--jobs 2] [--keep DIR]

For each study: the estimate `check` prints as its total (cli.check.whole_run_seconds, fresh
output folder), then `python -m flamecharts run CONFIG --out DIR --jobs N` of this source tree in a
fresh folder (charts and report included, as a user runs it), timed from outside: its wall time,
the CPU seconds of the run and its workers (getrusage of the children), and the load average
before and after (the machine may be shared: a busy machine stretches the wall time, not the
estimate). The last line printed is one JSON object; progress goes to stderr.
"""
from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from flamecharts.cli.check import whole_run_seconds  # noqa: E402
from flamecharts.config import load_study  # noqa: E402


def _load() -> float:
    return float(Path("/proc/loadavg").read_text().split()[0])


def measure(config: Path, jobs: int, folder: Path) -> dict:
    out = folder / config.stem
    study = load_study(config)
    estimate = whole_run_seconds(study, out, jobs)
    before, cpu0 = _load(), resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    done = subprocess.run([sys.executable, "-m", "flamecharts", "run", str(config), "--out", str(out), "--jobs",
                           str(jobs)], capture_output=True, text=True, env={**os.environ, "PYTHONPATH": str(ROOT)})
    wall = time.perf_counter() - t0
    cpu1 = resource.getrusage(resource.RUSAGE_CHILDREN)
    if done.returncode != 0:
        raise SystemExit(f"{config}: run failed\n{done.stderr[-2000:]}")
    row = {"study": config.name, "estimate_s": round(estimate, 1), "actual_s": round(wall, 1),
           "actual_over_estimate": round(wall / estimate, 2),
           "cpu_s": round(cpu1.ru_utime + cpu1.ru_stime - cpu0.ru_utime - cpu0.ru_stime, 1),
           "load_before": before, "load_after": _load()}
    print(row, file=sys.stderr, flush=True)
    return row


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("configs", nargs="+", type=Path)
    ap.add_argument("--jobs", type=int, default=2)
    ap.add_argument("--keep", type=Path, help="run folders here (default: a temporary folder, removed)")
    args = ap.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        folder = args.keep or Path(tmp)
        rows = [measure(c.resolve(), args.jobs, folder) for c in args.configs]
    print(json.dumps({"jobs": args.jobs, "cpus": os.cpu_count(), "rows": rows}))
    return 0


if __name__ == "__main__":
    sys.exit(main())
