"""Skeletal mechanisms for ignition (issue 32, the reduction core): size, error, cost.

Run:  nice -n 10 python tests/benchmarks/reduction_ignition.py [--skip-hexane]

Each case is one call of chemistry.reduction.reduce_for_ignition (DRGEP, 10 % target on the
largest relative ignition-delay error, constant pressure, time of peak dT/dt), trained on
autoignition from one grid and validated on the points half-way between its values
(reduction.between: the phi, T and p between, the blend between):

- GRI-Mech 3.0, methane/hydrogen: fuels CH4 and 60/40 CH4/H2 (validated on 80/20), air,
  phi 0.6, 0.9, 1.2, 1300, 1500, 1700 K, 5 and 20 bar (validated at 0.75 and 1.05,
  1400 and 1600 K, 10 bar); three variants: plain, with the emission species NO, NO2, N2O
  and CO as targets, and with the target scaling of reduction.target_scaling.
- The n-hexane C0-C6 mechanism bundled with Cantera (example_data/n-hexane-NUIG-2015.yaml,
  1268 species, no transport data: ignition only): n-hexane-air, phi 0.7 and 1.3,
  1100 and 1400 K, 10 and 30 bar, validated at phi 0.85, 1.0 and 1.15, 1175, 1250 and
  1325 K, 17.3 bar (9 points, the one of reduction.between among them).

Prints, per case: species and reactions kept of the detailed counts, epsilon, the largest
delay error on validation, every candidate tried, the CPU time of each step, and the CPU
time of the validation delays with the skeletal against the detailed mechanism. Last line:
one JSON object. CPU times (time.process_time), as the machine is shared.
"""
from __future__ import annotations

import argparse
import json
import subprocess
import sys
import time
import warnings
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from flamecharts.chemistry import reduction as rd  # noqa: E402
from flamecharts.chemistry.mechanism import find_mechanism  # noqa: E402

BAR = 1e5
AIR = {"O2": 0.21, "N2": 0.79}
GRI_TRAINING = rd.Conditions(({"CH4": 1.0}, {"CH4": 0.6, "H2": 0.4}), (AIR,), (0.6, 0.9, 1.2),
                             (1300.0, 1500.0, 1700.0), (5 * BAR, 20 * BAR))
HEXANE_TRAINING = rd.Conditions(({"NC6H14": 1.0},), (AIR,), (0.7, 1.3), (1100.0, 1400.0), (10 * BAR, 30 * BAR))
HEXANE_VALIDATION = rd.Conditions(({"NC6H14": 1.0},), (AIR,), (0.85, 1.0, 1.15), (1175.0, 1250.0, 1325.0),
                                  (17.320508 * BAR,))


def commit() -> str:
    try:
        out = subprocess.run(["git", "rev-parse", "--short", "HEAD"], cwd=ROOT, capture_output=True, text=True)
        return out.stdout.strip()
    except OSError:
        return "unknown"


def case(name: str, mechanism: str, training: rd.Conditions, **kw) -> dict:
    t0 = time.perf_counter()
    red = rd.reduce_for_ignition(str(find_mechanism(mechanism, None)), training, **kw)
    wall = time.perf_counter() - t0
    c = red.chosen
    n_sp, n_rx = red.detailed
    print(f"\n{name}: {red.n_states} training states, {len(red.validation)} validation points")
    print(f"  chosen: {len(c.species)} of {n_sp} species, {c.n_reactions} of {n_rx} reactions, "
          f"epsilon {c.epsilon:.3g}, largest delay error {100 * c.max_error:.2f} %")
    for t in red.tried:
        print(f"    tried epsilon {t.epsilon:.3g}: {len(t.species)} species, {t.n_reactions} reactions, "
              f"error {100 * t.max_error:.1f} %")
    print("  CPU s: " + ", ".join(f"{k} {v:.1f}" for k, v in red.cpu_s.items()) + f"; wall {wall:.1f} s")
    ratio = red.cpu_s["detailed delays"] / c.cpu_s if c.cpu_s > 0 else float("nan")
    print(f"  validation delays: detailed {red.cpu_s['detailed delays']:.2f} s CPU, skeletal {c.cpu_s:.2f} s "
          f"({ratio:.1f} times faster); delays {', '.join(f'{1e6 * t:.1f}' for t in red.detailed_delays_s)} us")
    return {"case": name, "species": len(c.species), "reactions": c.n_reactions, "detailed": [n_sp, n_rx],
            "epsilon": c.epsilon, "max_error": c.max_error, "errors": list(c.errors), "states": red.n_states,
            "validation_points": len(red.validation), "tried": [[t.epsilon, len(t.species), t.max_error] for t in red.tried],
            "cpu_s": red.cpu_s, "wall_s": wall, "delay_cpu_ratio": ratio, "kept": list(c.species)}


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--skip-hexane", action="store_true", help="GRI-Mech 3.0 cases only (about a minute)")
    args = ap.parse_args()
    out = {"commit": commit(), "cases": []}
    out["cases"].append(case("GRI-Mech 3.0, CH4/H2", "gri30.yaml", GRI_TRAINING))
    out["cases"].append(case("GRI-Mech 3.0, CH4/H2, emission targets", "gri30.yaml", GRI_TRAINING,
                             targets=("NO", "NO2", "N2O", "CO")))
    out["cases"].append(case("GRI-Mech 3.0, CH4/H2, target scaling", "gri30.yaml", GRI_TRAINING, scaled=True))
    if not args.skip_hexane:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", UserWarning)  # two species' thermo discontinuities, noted by Cantera
            hexane = "example_data/n-hexane-NUIG-2015.yaml"
            out["cases"].append(case("n-hexane C0-C6", hexane, HEXANE_TRAINING, validation=HEXANE_VALIDATION))
    print(json.dumps(out))


if __name__ == "__main__":
    main()
