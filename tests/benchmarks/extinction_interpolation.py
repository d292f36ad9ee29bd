"""How well the extinction strain rate, and the leading-point speed's S_c,max, interpolate between
[stretch] ladders (issue 30, items 6 and 7).

Run:  python tests/benchmarks/extinction_interpolation.py [--out DIR] [--jobs N]

A lean hydrogen study (h2o2.yaml, coarse flames): diluted hydrogen (60 % H2, 40 % N2) with 0, 50
and 100 % hydrogen, phi 0.5-0.8 in steps of 0.1, 1 bar, 300 K, a ladder at each of the 12 points
(about 8 minutes on one core of the project's 2-core machine; a folder given with --out is reused,
so a second call solves nothing). Each ladder point is then predicted from the others, three ways:
ln kappa_ext linear (what design.interpolated_extinction does), ln C linear and C linear, with
C = kappa_ext alpha_u / S_L^2 (the ratio to the flame's own strain scale): along phi (from the
neighbours 0.1 away on either side: 0.2 apart), across the blend fraction (50 % from 0 and 100 %),
and held from the nearest neighbour beyond (phi 0.5 from 0.6, 0.8 from 0.7). The same for the
strongest consumption speed S_c,max of the leading-point flame speed, three ways: ln(S_c,max / S_L)
linear, times the point's own S_L (what design.strained_speed does), ln S_c,max linear and
S_c,max / S_L linear. Prints the error ranges in per cent and, last, one JSON object.

It also checks the trend issue 30 asks for, "lean blowout moves leaner with hydrogen": at every phi
kappa_ext rises with the hydrogen fraction (0 -> 50 -> 100 %), so the extinction Damkohler number
kappa_ext d / U_edge of design.blowout_columns rises, and the blowout margin reaches its minimum at a
leaner phi. The expectation: lean blowout of H2/CO/CH4 blends collapses on an extinction-strain
Damkohler number and moves leaner with hydrogen (Zhang, Noble, Meyers, Xu & Lieuwen 2007, from
memory). Exit code 1 when it fails (too dear for the test suite: the 12 ladders take about 5 minutes
of CPU time, about 25 s a ladder, and the check needs at least two).
"""
from __future__ import annotations

import argparse
import json
import math
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

import flamecharts  # noqa: E402

STUDY = """title = "extinction strain interpolation"
mechanism = "h2o2.yaml"
resolution = "coarse"

[fuels]
diluted = { H2 = 0.6, N2 = 0.4 }
hydrogen = { H2 = 1.0 }

[oxidizers]
air = { O2 = 1.0, N2 = 3.76 }

[sweep]
fuel = ["diluted"]
oxidizer = ["air"]
blend = { with = "hydrogen", fraction = [0.0, 0.5, 1.0] }
equivalence_ratio = [0.5, 0.6, 0.7, 0.8]
pressure_bar = [1.0]
unburned_temperature_K = [300.0]

[stretch]
equivalence_ratio = [0.5, 0.6, 0.7, 0.8]
"""
BLENDS, PHIS = (0.0, 0.5, 1.0), (0.5, 0.6, 0.7, 0.8)


def _errors(value: dict, how: str) -> dict[str, list[float]]:
    """Per cent errors of the three cases for one quantity (``value``: (blend, phi) -> ladder value),
    interpolated ``how``: 'ln' (geometric) or 'lin'."""
    def mid(a: float, b: float) -> float:
        return math.sqrt(a * b) if how == "ln" else 0.5 * (a + b)
    out: dict[str, list[float]] = {"along phi": [], "across blends": [], "held": []}
    for x in BLENDS:
        for y in (0.6, 0.7):
            out["along phi"].append(100 * (mid(value[(x, round(y - 0.1, 1))], value[(x, round(y + 0.1, 1))])
                                           / value[(x, y)] - 1))
        out["held"] += [100 * (value[(x, 0.6)] / value[(x, 0.5)] - 1), 100 * (value[(x, 0.7)] / value[(x, 0.8)] - 1)]
    for y in PHIS:
        out["across blends"].append(100 * (mid(value[(0.0, y)], value[(1.0, y)]) / value[(0.5, y)] - 1))
    return out


def hydrogen_trend_failures(kappa: dict[tuple[float, float], float]) -> list[str]:
    """Where kappa_ext does not rise with the hydrogen fraction at a phi (Zhang et al. 2007, from
    memory: lean blowout moves leaner with hydrogen): one line per failure, empty when it holds."""
    out = []
    for y in PHIS:
        ladder = [kappa[(x, y)] for x in BLENDS]
        if not all(a < b for a, b in zip(ladder, ladder[1:])):
            out.append(f"phi {y:g}: kappa_ext " + " -> ".join(f"{k:,.0f}" for k in ladder)
                       + " 1/s at " + "/".join(f"{100 * x:g}" for x in BLENDS) + " % hydrogen does not rise")
    return out


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--out", type=Path, default=None)
    ap.add_argument("--jobs", type=int, default=1)
    args = ap.parse_args()
    folder = args.out or Path(tempfile.mkdtemp(prefix="extinction_"))
    folder.mkdir(parents=True, exist_ok=True)
    (folder / "study.toml").write_text(STUDY)
    res = flamecharts.run(folder / "study.toml", out=folder / "out", jobs=args.jobs, charts=False, report=False)
    rows = {(r["blend_fraction"], r["equivalence_ratio"]): r for r in res.rows}
    kappa = {k: float(r["ladder_extinction_strain_rate_1_s"]) for k, r in rows.items()}
    C = {k: K * rows[k]["unburned_thermal_diffusivity_m2_s"] / rows[k]["laminar_flame_speed_m_s"] ** 2
         for k, K in kappa.items()}
    S_c = {k: float(r["ladder_consumption_speed_max_m_s"]) for k, r in rows.items()}
    ratio = {k: v / rows[k]["laminar_flame_speed_m_s"] for k, v in S_c.items()}
    S_L = {k: r["laminar_flame_speed_m_s"] for k, r in rows.items()}
    result = {"ln kappa_ext": _errors(kappa, "ln"), "ln C": _errors(C, "ln"), "C": _errors(C, "lin"),
              # S_c,max predicted: the ratio's error is S_c,max's, the point's own S_L being known
              "ln S_c,max/S_L": _errors(ratio, "ln"), "ln S_c,max": _errors(S_c, "ln"),
              "S_c,max/S_L": _errors(ratio, "lin")}
    for name, cases in result.items():
        print(name + ": " + "; ".join(f"{case} {min(v):+.1f} to {max(v):+.1f} %" for case, v in cases.items()))
    print(json.dumps({"kappa_ext_1_s": {f"{k[0]:g},{k[1]:g}": v for k, v in kappa.items()},
                      "C": {f"{k[0]:g},{k[1]:g}": v for k, v in C.items()},
                      "S_c_max_m_s": {f"{k[0]:g},{k[1]:g}": v for k, v in S_c.items()},
                      "S_L_m_s": {f"{k[0]:g},{k[1]:g}": v for k, v in S_L.items()}, "errors_percent": result}))
    failures = hydrogen_trend_failures(kappa)
    for line in failures:
        print("FAILED: " + line)
    if failures:
        sys.exit(1)
    print("held: kappa_ext rises with hydrogen at every phi (lean blowout moves leaner; Zhang et al. 2007, from memory)")


if __name__ == "__main__":
    main()
