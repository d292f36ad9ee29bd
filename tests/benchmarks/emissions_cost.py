"""The emissions step's cost against the flame it follows (issue 31: target at most 10 %).

Run:  python tests/benchmarks/emissions_cost.py

For each case, one free flame is solved from scratch with the project's solver (standard
resolution) and timed; then the worker's emissions task (analyses.emissions.task.emissions_task: the
burned gas read from the flame's profile, a plug flow beyond its domain) runs on the stored
form of its profile at the default residence times (2, 5, 10, 20, 50 ms) and is timed in the
same process. Printed: each case's flame seconds, emissions seconds and their ratio; the
last line is one JSON object. Cases: lean methane-air and a 30 % hydrogen blend with
GRI-Mech 3.0 at 1 atm, and lean hydrogen-air with the hydrogen-ammonia mechanism that
ships with Cantera (Alzueta et al. 2023).
"""
from __future__ import annotations

import json
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from flamecharts.analyses.emissions.task import emissions_task  # noqa: E402
from flamecharts.chemistry.flame import NUMERICS, solve_flame  # noqa: E402
from flamecharts.chemistry.mechanism import find_mechanism, solution  # noqa: E402
from flamecharts.physics import mixtures  # noqa: E402
from flamecharts.store.db import pack_profile, unpack_profile  # noqa: E402

AIR = {"O2": 1.0, "N2": 3.76}
#: name -> (mechanism, fuel, phi)
CASES = {
    "methane_phi0.7_gri30": ("gri30.yaml", {"CH4": 1.0}, 0.7),
    "methane_h2_30_phi0.7_gri30": ("gri30.yaml", {"CH4": 0.7, "H2": 0.3}, 0.7),
    "hydrogen_phi0.5_alzueta2023": ("example_data/ammonia-CO-H2-Alzueta-2023.yaml", {"H2": 1.0}, 0.5),
}
TIMES_S = [0.002, 0.005, 0.01, 0.02, 0.05]


def main() -> None:
    out = {}
    for name, (mech, fuel, phi) in CASES.items():
        path = str(find_mechanism(mech, None))
        gas = solution(path, "mixture-averaged")
        atoms = {s.name: dict(s.composition) for s in gas.species()}
        X = mixtures.unburned_mixture(fuel, AIR, phi, mixtures.stoich_o2_per_fuel(atoms, fuel))
        t0 = time.perf_counter()
        flame = solve_flame(gas, 300.0, 101325.0, X, "mixture-averaged", False, NUMERICS["standard"])
        t_flame = time.perf_counter() - t0
        profile = unpack_profile(pack_profile(flame["profile"]))  # the stored form a worker gets
        t0 = time.perf_counter()
        res = emissions_task({"key": name, "mechanism_path": path, "mechanism_sha256": "", "profile": profile,
                              "times_s": TIMES_S})
        t_em = time.perf_counter() - t0
        m = res["metrics"] or {}
        out[name] = {"flame_s": round(t_flame, 2), "emissions_s": round(t_em, 3), "ratio": round(t_em / t_flame, 4),
                     "domain_time_ms": round(1e3 * m.get("domain_time_s", float("nan")), 1), "status": res["status"]}
        print(f"{name}: flame {t_flame:.1f} s, emissions {t_em:.3f} s ({100 * t_em / t_flame:.2f} % of the flame); "
              f"burned gas in the domain {out[name]['domain_time_ms']} ms", file=sys.stderr)
    print(json.dumps(out))


if __name__ == "__main__":
    main()
