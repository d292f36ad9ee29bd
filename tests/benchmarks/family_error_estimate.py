"""A per-family grid error estimate, evaluated offline (issue 32: "work done once per family
instead of per point"). Nothing in flamecharts uses it; this script only measures the rule.

Run:  python tests/benchmarks/family_error_estimate.py --csv OUT/results.csv
      python tests/benchmarks/family_error_estimate.py --validation [--jobs 2] [--out FILE]

The rule: along each warm-start chain in phi (same fuel, blend, pressure and unburned
temperature), only every second flame carries its own three-grid estimate
(chemistry.flame.grid_error, 0.79-0.84 floors a flame, docs/benchmarks.md); a flame in between
gets the larger of its neighbours' bands, each scaled by N_neighbour / N_self (a first-order
error scales as 1/N), and never less than physics.grid_error.placement_floor(N_self). Two
placements are evaluated on chains of n flames: ``even`` (the 1st, 3rd, ... flame estimated;
the ends always are) and ``odd`` (the 2nd, 4th, ...; an end then has one neighbour).

``--csv``: a flamecharts run's results.csv (``flame_speed_numerical_error_percent``,
``grid_points``; the sweep benchmark's full study, tests/benchmarks/sweep_speed.py, writes one
through its command-line rerun). Prints, per placement, every derived flame (its own band, the
derived band, their ratio), how many derived bands are at least the flame's own, the median,
smallest and largest ratio, and the estimates it saves; then the same with every flame derived
from its neighbours (leave one out). No solve; a second.

``--validation``: the 22 flames of tests/benchmarks/error_bar_validation.py, whose true error
against a grid-converged reference is stored in error_bar_validation.jsonl. For each, the
standard setting's chain of three: phi + 0.1 from scratch, the flame at phi warm-started from it
(as error_bar_validation.py's ``standard warm``, reproduced to the stored flame speed) and phi -
0.1 warm-started from the flame at phi, each with its own estimate. Results are appended to
``--out`` (default family_error_estimate.jsonl beside this script) case by case; a rerun
solves only the missing cases (``--stored-only``: none). Prints, per flame, the true error, its own band and the derived
band (both neighbours, and each alone), then how many true errors each band holds and the
median band over the true error. About 10 minutes on 2 cores.

Last line printed: one JSON object with the figures.
"""
from __future__ import annotations

import argparse
import csv
import json
import statistics
import sys
import time
from collections import defaultdict
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path[:0] = [str(HERE.parents[1]), str(HERE)]

from flamecharts.physics.grid_error import placement_floor  # noqa: E402

#: CPU cost of the three-grid estimate in floors per flame (docs/benchmarks.md, "Sweep speed:
#: the grid error estimate on two grids", grid_error_cost.py at 1 bar, 15 % H2, phi 1.0-1.3).
ESTIMATE_FLOORS = (0.79, 0.84)


def derived_band(neighbours: list[tuple[float, int]], n_self: int) -> float | None:
    """The band [-] a flame gets from its neighbours' (band [-], grid points): the larger band
    scaled by N_neighbour / n_self, never below placement_floor(n_self); None without one."""
    scaled = [band * n / n_self for band, n in neighbours if band is not None and n]
    return max(max(scaled), placement_floor(n_self)) if scaled else None


def chains(rows: list[dict]) -> dict[tuple, list[dict]]:
    """The solved flames of a results.csv grouped by chain, each sorted by phi."""
    out: dict[tuple, list[dict]] = defaultdict(list)
    for r in rows:
        if r["status"] != "ok" or not r["flame_speed_numerical_error_percent"]:
            continue
        out[(r["fuel"], r["blend_fraction"], r["pressure_bar"], r["unburned_temperature_K"])].append(
            {"phi": float(r["equivalence_ratio"]), "band": float(r["flame_speed_numerical_error_percent"]) / 100,
             "N": int(float(r["grid_points"]))})
    return {k: sorted(v, key=lambda f: f["phi"]) for k, v in out.items()}


def evaluate(families: dict[tuple, list[dict]], derived_at, leave_one_out: bool = False) -> dict:
    """Derived band against the flame's own at the chain positions ``derived_at(i, n)`` says,
    from the neighbours that are estimated (``leave_one_out``: from both neighbours' own bands)."""
    pairs, estimated, lines = [], 0, []
    for key, chain in sorted(families.items()):
        n = len(chain)
        for i, f in enumerate(chain):
            if not derived_at(i, n):
                estimated += 1
                continue
            nbs = [(chain[j]["band"], chain[j]["N"]) for j in (i - 1, i + 1)
                   if 0 <= j < n and (leave_one_out or not derived_at(j, n))]
            d = derived_band(nbs, f["N"])
            if d is None:
                estimated += 1
                continue
            pairs.append(d / f["band"])
            lines.append(f"  {key[1]:>5s} H2 {key[2]:>4s} bar phi {f['phi']:.1f}: N {f['N']}, own {100 * f['band']:.3f} %, "
                         f"derived {100 * d:.3f} % ({d / f['band']:.2f})")
    total = estimated + len(pairs)
    return {"flames": total, "derived": len(pairs), "estimated": estimated,
            "derived_at_least_own": sum(1 for r in pairs if r >= 1.0),
            "median_ratio": statistics.median(pairs) if pairs else None,
            "smallest_ratio": min(pairs) if pairs else None, "largest_ratio": max(pairs) if pairs else None,
            "floors_saved_per_flame": [round(len(pairs) / total * c, 3) for c in ESTIMATE_FLOORS] if total else None,
            "lines": lines}


def even(i: int, n: int) -> bool:
    """Derived at the 2nd, 4th, ... flame: the 1st, 3rd, ... and both ends are estimated."""
    return i % 2 == 1 and i != n - 1


def odd(i: int, n: int) -> bool:
    """Derived at the 1st, 3rd, ... flame (the ends from their one neighbour)."""
    return i % 2 == 0


def everyone(i: int, n: int) -> bool:
    """Every flame derived from its neighbours' own estimates (leave one out)."""
    return True


def sweep_section(path: Path) -> dict:
    families = chains(list(csv.DictReader(path.open())))
    out = {}
    for rule in (even, odd, everyone):
        res = evaluate(families, rule, leave_one_out=rule is everyone)
        print(f"{rule.__name__}: {rule.__doc__}", file=sys.stderr)
        for line in res.pop("lines"):
            print(line, file=sys.stderr)
        print(f"  {res['derived']} of {res['flames']} derived; derived >= own in {res['derived_at_least_own']}; "
              f"ratio median {res['median_ratio']:.2f}, smallest {res['smallest_ratio']:.2f}, largest "
              f"{res['largest_ratio']:.2f}; floors saved per flame {res['floors_saved_per_flame']}", file=sys.stderr)
        out[rule.__name__] = res
    return out


def _chain_case(case) -> dict:
    """The standard setting's chain of three around one validation case (module docstring)."""
    import cantera as ct
    from error_bar_validation import TRANSPORT, _mixture

    from flamecharts.chemistry import flame
    from flamecharts.chemistry.mechanism import find_mechanism

    from grid_convergence import WARM_STEP

    label, mech, fuel, phi, p_bar, T_u, held_out = case
    gas = ct.Solution(str(find_mechanism(mech, None)))
    P, num, t0 = p_bar * 1e5, flame.NUMERICS["standard"], time.perf_counter()

    def entry(res: dict) -> dict | None:
        if res["status"] != "ok":
            return {"status": str(res["status"]), "message": res["message"]}
        m = res["metrics"]
        return {"status": "ok", "S_L": m["laminar_flame_speed_m_s"], "N": m["grid_points"],
                "band": m["flame_speed_numerical_error"]}

    upper = flame.solve_flame(gas, T_u, P, _mixture(gas, fuel, phi + WARM_STEP), TRANSPORT, False, num)
    middle = flame.solve_flame(gas, T_u, P, _mixture(gas, fuel, phi), TRANSPORT, False, num, warm=upper["profile"])
    lower = flame.solve_flame(gas, T_u, P, _mixture(gas, fuel, phi - WARM_STEP), TRANSPORT, False, num,
                              warm=middle["profile"]) if middle["status"] == "ok" else {"status": "skipped",
                                                                                        "message": "no middle flame"}
    return {"case": label, "held_out": held_out, "upper": entry(upper), "middle": entry(middle), "lower": entry(lower),
            "seconds": round(time.perf_counter() - t0, 1)}


def validation_section(out: Path, jobs: int, solve: bool = True) -> dict:
    from error_bar_validation import GRI, VALIDATION
    from joblib import Parallel, delayed

    stored = {r["case"]: r for r in map(json.loads, (HERE / "error_bar_validation.jsonl").read_text().splitlines())}
    done = {r["case"]: r for r in map(json.loads, out.read_text().splitlines())} if out.exists() else {}
    todo = sorted((c for c in VALIDATION if c[0] not in done and solve), key=lambda c: (c[1] == GRI, c[4]))
    for r in Parallel(n_jobs=jobs, return_as="generator_unordered")(delayed(_chain_case)(c) for c in todo):
        with out.open("a") as fh:
            fh.write(json.dumps(r) + "\n")
        done[r["case"]] = r
        print(f"  solved {r['case']} in {r['seconds']:.0f} s", file=sys.stderr)
    bands: dict[str, list[tuple[float, float]]] = defaultdict(list)  # name -> (band, |true|)
    drift = 0.0
    for case in VALIDATION:
        label = case[0]
        if label not in done or done[label]["middle"]["status"] != "ok":  # a run stopped early: the cases solved
            continue
        r, ref = done[label], stored[label]
        warm = ref["standard warm"]
        mid = r["middle"]
        drift = max(drift, abs(mid["S_L"] / warm["S_L"] - 1.0))
        true = abs(warm["S_L_rel_err"])
        nbs = {side: (r[side]["band"], r[side]["N"]) for side in ("lower", "upper") if r[side]["status"] == "ok"}
        own = mid["band"]  # the code's estimator (the stored estimate may predate it)
        both = derived_band(list(nbs.values()), mid["N"])
        single = {side: derived_band([nb], mid["N"]) for side, nb in nbs.items()}
        for name, band in (("own", own), ("derived", both), *((f"derived from {s} alone", b) for s, b in single.items())):
            if band is not None:
                bands[name].append((band, true))
        print(f"  {label:38s} true {100 * true:.3f} %, own {100 * own:.3f} %, derived {100 * both:.3f} % "
              f"({both / own:.2f} x own; neighbours " + ", ".join(
                  f"{s} {100 * b:.3f} % N {n}" for s, (b, n) in nbs.items()) + ")"
              + ("" if both >= true else " OUTSIDE"), file=sys.stderr)
    res = {"middle_reproduced_to": drift}
    for name, pairs in bands.items():
        res[name] = {"flames": len(pairs), "inside": sum(1 for b, t in pairs if t <= b),
                     "median_band_over_true": statistics.median(b / max(t, 1e-12) for b, t in pairs),
                     "median_band_percent": 100 * statistics.median(b for b, _ in pairs)}
        print(f"{name:28s} holds the true error in {res[name]['inside']} of {len(pairs)}; median band / true "
              f"{res[name]['median_band_over_true']:.2f}, median band {res[name]['median_band_percent']:.3f} %",
              file=sys.stderr)
    ratio = [b / o for (b, _), (o, _) in zip(bands["derived"], bands["own"])]
    res["derived_at_least_own"] = sum(1 for x in ratio if x >= 1.0)
    res["derived_over_own"] = {"median": statistics.median(ratio), "smallest": min(ratio), "largest": max(ratio)}
    print(f"derived >= own in {res['derived_at_least_own']} of {len(ratio)}; derived / own median "
          f"{statistics.median(ratio):.2f}, {min(ratio):.2f}-{max(ratio):.2f}; middle flames reproduced to {drift:.1e}",
          file=sys.stderr)
    return res


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--csv", type=Path, help="results.csv of a flamecharts run")
    ap.add_argument("--validation", action="store_true", help="the 22 reference flames (solves their neighbours)")
    ap.add_argument("--out", type=Path, default=HERE / "family_error_estimate.jsonl")
    ap.add_argument("--jobs", type=int, default=2)
    ap.add_argument("--stored-only", action="store_true", help="with --validation: summarise the cases in --out, solve none")
    args = ap.parse_args()
    if not args.csv and not args.validation:
        ap.error("give --csv, --validation or both")
    figures = {}
    if args.csv:
        figures["sweep"] = sweep_section(args.csv)
    if args.validation:
        figures["validation"] = validation_section(args.out, args.jobs, solve=not args.stored_only)
    print(json.dumps(figures))
    return 0


if __name__ == "__main__":
    sys.exit(main())
