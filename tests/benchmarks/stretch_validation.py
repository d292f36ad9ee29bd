"""Strained methane flames with GRI-Mech 3.0: extinction strain rate against phi and hydrogen addition.

Run:  python tests/benchmarks/stretch_validation.py [--cases ch4_0.6,ch4_1.0,ch4h2_0.6]

Each case is one ladder of chemistry.strained.twin_flame_ladder (the same code a [stretch]
request runs in a worker), after its free flame: 10-20 strained flames of 30-60 s each on
this 2-core machine, so the whole script takes 20-40 minutes; too long for the test suite,
which checks the ladders with h2o2.yaml. What it checks, against published counterflow
studies (Law, Zhu & Yu 1986; Guo, Smallwood, Liu, Ju & Gülder 2005; trends from memory,
absolute values differ with the strain definition): methane-air's extinction strain rate
rises several times from phi 0.6 to 1.0, and hydrogen in the fuel raises it at equal phi.

The last line printed is one JSON object; progress goes to stderr.
"""
from __future__ import annotations

import argparse
import json
import sys
import time
from pathlib import Path

import cantera as ct

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from flamecharts.chemistry.strained import markstein_number_from_strain, twin_flame_ladder  # noqa: E402

#: name -> (fuel composition, phi)
CASES = {"ch4_0.6": ({"CH4": 1.0}, 0.6), "ch4_1.0": ({"CH4": 1.0}, 1.0), "ch4h2_0.6": ({"CH4": 0.7, "H2": 0.3}, 0.6)}


def case(name: str) -> dict:
    fuel, phi = CASES[name]
    gas = ct.Solution("gri30.yaml")
    gas.set_equivalence_ratio(phi, fuel, {"O2": 1.0, "N2": 3.76})
    gas.TP = 300.0, ct.one_atm
    X = gas.mole_fraction_dict()
    t0 = time.perf_counter()
    f = ct.FreeFlame(gas, width=0.03)
    f.set_refine_criteria(ratio=3, slope=0.06, curve=0.12)
    f.solve(loglevel=0, auto=True)
    S_L, T_ad = float(f.velocity[0]), float(f.T[-1])
    t1 = time.perf_counter()
    ladder = twin_flame_ladder(gas, 300.0, ct.one_atm, X, S_L, T_ad, time_limit_s=3600.0)  # full ladder
    out = {"S_L_m_s": S_L, "extinction_strain_rate_1_s": ladder["extinction_strain_rate_1_s"],
           "strained_flames": ladder["solves"], "ladder_s": time.perf_counter() - t1, "free_flame_s": t1 - t0,
           "markstein_number_strain": markstein_number_from_strain(
               ladder["strain_rates_1_s"], ladder["consumption_speeds_m_s"], S_L,
               ladder["unburned_thermal_diffusivity_m2_s"]), "message": ladder["message"]}
    print(f"{name}: {out}", file=sys.stderr, flush=True)
    return {f"{name}_{k}": v for k, v in out.items()}


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", default=",".join(CASES), help=f"comma-separated (of {', '.join(CASES)})")
    args = ap.parse_args(argv)
    figures = {}
    for name in args.cases.split(","):
        figures.update(case(name))
    print(json.dumps(figures))
    return 0


if __name__ == "__main__":
    sys.exit(main())
