"""A flame the tool solves in a sweep against Cantera's own automatic solve of the same mixture.

Run:  python tests/benchmarks/cantera_agreement.py [--limit-percent 0.5]

Methane-air with GRI-Mech 3.0 at 1 atm and 298 K, standard resolution: the tool solves the study of
`tests/test_validation.py`'s methane checks (phi 0.7 to 1.3; phi 0.9 with its own grid history, warm
or from scratch as the tree has it, and the few-point refinement passes it skips), and plain Cantera
solves phi 0.9 from scratch (FreeFlame, auto=True) at the standard setting's final refinement
criteria. Reference library, not a published measurement: the two may differ by the grid history
only. The check: S_L within --limit-percent (0.5 %). It was
`tests/test_validation.py::test_agrees_with_plain_cantera_solve` (a from-scratch GRI-Mech 3.0 solve
that no other test reuses) and moved here when the suite had to fit in 8 minutes with room to spare;
`sweep_speed.py` compares every sampled point of its studies the same way.

The exit code is 1 when the check fails. The last line printed is one JSON object.
"""
from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

import cantera as ct

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from flamecharts import run_study  # noqa: E402
from flamecharts.chemistry.flame import NUMERICS  # noqa: E402
from flamecharts.config import study_from_dict  # noqa: E402

#: test_validation.py's methane study: GRI-Mech 3.0, standard, 1 atm, 298 K.
STUDY = {"title": "Cantera agreement", "mechanism": "gri30.yaml", "resolution": "standard",
         "fuels": {"methane": {"CH4": 1.0}}, "oxidizers": {"air": {"O2": 1.0, "N2": 3.76}},
         "sweep": {"fuel": ["methane"], "oxidizer": ["air"], "equivalence_ratio": [0.7, 0.9, 1.0, 1.1, 1.2, 1.3],
                   "pressure_bar": [1.01325], "unburned_temperature_K": [298.0]}}


def plain_cantera_m_s(phi: float) -> float:
    """S_L [m/s] of Cantera's automatic solve from scratch at the standard setting's final criteria."""
    gas = ct.Solution("gri30.yaml")
    gas.set_equivalence_ratio(phi, "CH4", {"O2": 1.0, "N2": 3.76})
    gas.TP = 298.0, 1.01325e5
    f = ct.FreeFlame(gas, width=0.03)
    ratio, slope, curve = NUMERICS["standard"].stages[-1]
    f.set_refine_criteria(ratio=ratio, slope=slope, curve=curve)
    f.solve(loglevel=0, auto=True)
    return float(f.velocity[0])


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--limit-percent", type=float, default=0.5)
    args = ap.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        t0 = time.perf_counter()
        rows = run_study(study_from_dict(STUDY), out_dir=Path(tmp) / "out", jobs=2).rows
        tool_s = time.perf_counter() - t0
    row = next(r for r in rows if r["equivalence_ratio"] == 0.9)
    assert row["status"] == "ok", row["message"]
    t0 = time.perf_counter()
    plain = plain_cantera_m_s(0.9)
    plain_s = time.perf_counter() - t0
    dev = 100.0 * (row["laminar_flame_speed_m_s"] / plain - 1.0)
    ok = abs(dev) <= args.limit_percent
    print(f"phi 0.9: tool {100 * row['laminar_flame_speed_m_s']:.3f} cm/s ({row['start']}), plain Cantera "
          f"{100 * plain:.3f} cm/s: {dev:+.3f} % (limit {args.limit_percent:g} %) {'held' if ok else 'FAILED'}; "
          f"tool {tool_s:.0f} s for six flames on two processes, Cantera {plain_s:.0f} s", file=sys.stderr)
    print(json.dumps({"tool_cm_s": 100 * row["laminar_flame_speed_m_s"], "plain_cm_s": 100 * plain,
                      "deviation_percent": round(dev, 4), "held": ok}))
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
