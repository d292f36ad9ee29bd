"""What a warm-started flame's grid error estimate costs, against the re-solve floor, in one process.

Run:  python tests/benchmarks/grid_error_cost.py [--pressure-bar 1] [--flames 5]

The full study of sweep_speed.py (GRI-Mech 3.0, a natural gas with 15 % hydrogen, standard
setting): one flame from scratch at phi 0.9, then a chain of warm starts in steps of 0.1 in phi.
For each warm flame, CPU seconds of: the warm solve (chemistry.flame._solve_warm), the
three-grid estimate as it was until issue 32 (every 2nd and every 4th point of the final grid,
two Newton solves; reproduced here), the estimate in the code (chemistry.flame.grid_error: every
4th point), and the floor (the converged flame solved again on its own grid; sweep_speed.py's
floor_flame). Ratios to the floor: (solve + estimate) / floor, with each estimate. One JSON
line per flame.
"""
from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

import cantera as ct
import numpy as np

from flamecharts.chemistry import flame as fl
from flamecharts.config import load_study
from flamecharts.sweep.points import points

sys.path.insert(0, str(Path(__file__).parent))
from sweep_speed import floor_flame, write_study  # noqa: E402


def three_grid_solves(f) -> None:
    """The two coarsened solves of the three-grid estimate (every 2nd, every 4th point), f left as it was."""
    final = f.to_array()
    n = len(final)
    try:
        for stride in (2, 4):
            fl._speed_and_thickness_on(f, final, np.unique(np.r_[0:n:stride, n - 1]))
    finally:
        f.from_array(final)


def cpu(fn, *args):
    c = time.process_time()
    out = fn(*args)
    return out, time.process_time() - c


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--pressure-bar", type=float, default=1.0)
    ap.add_argument("--flames", type=int, default=5)
    args = ap.parse_args(argv)
    study = load_study(write_study(Path(tempfile.mkdtemp(prefix="flamecharts-gridcost-")), "full"))
    chain = sorted((p for p in points(study) if p.blend_fraction == 0.15 and p.pressure_bar == args.pressure_bar),
                   key=lambda p: p.phi)
    gas = ct.Solution(study.mechanism_path, transport_model="mixture-averaged")
    num = fl.NUMERICS["standard"]
    first = chain[2]
    warm = fl.solve_flame(gas, first.T_u, first.P, first.X_unburned, "mixture-averaged", False, num)["profile"]
    for p in chain[3:3 + args.flames]:
        f, solve = cpu(fl._solve_warm, ct, gas, p.T_u, p.P, p.X_unburned, "mixture-averaged", False, num, warm)
        _, three = cpu(three_grid_solves, f)
        m, two = cpu(fl.grid_error, f)
        warm = fl.profile_of(f, p.P)
        floor = floor_flame(gas, p, warm)
        print(json.dumps({"phi": p.phi, "pressure_bar": p.pressure_bar, "grid_points": len(f.grid),
                          "solve_s": round(solve, 2), "floor_s": round(floor, 2), "three_grid_s": round(three, 2),
                          "two_grid_s": round(two, 2), "ratio_three_grid": round((solve + three) / floor, 2),
                          "ratio_two_grid": round((solve + two) / floor, 2),
                          "band_percent": round(100 * m["flame_speed_numerical_error"], 3)}), flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
