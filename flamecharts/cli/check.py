"""flamecharts check CONFIG: validate a config and print the plan and its estimated run time."""
from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

from ..admissible.driver import planned_searches
from ..admissible.words import kept
from ..chemistry.flame import NUMERICS
from ..chemistry.strained import MAX_SOLVES
from ..config import by_mechanism, load_study, lumping_note
from ..pipeline import default_out_dir
from ..results import point_rows, stored_with_extras
from ..store import DB_NAME, Store, stored_keys
from ..sweep.backends import resolve_jobs
from ..sweep.points import points
from ..sweep.run import unique_points, warm_plan
from ..sweep.schedule import estimate_run_seconds, flame_seconds
from ..sweep.warm_tree import warm_tree
from .progress import plural
from .tables import print_burner, print_gases, print_points

if TYPE_CHECKING:
    from ..config import Study
    from ..sweep.warm_tree import WarmPlan

#: Measured wall time of one GRI-Mech 3.0 ladder (docs/benchmarks.md).
GRI_LADDER_NOTE = "30-60 s a strained flame, stoichiometric methane-air 15 flames in 11 min"


def cmd_check(args: argparse.Namespace) -> int:
    study = load_study(args.config)
    out = Path(args.out) if args.out else default_out_dir(study)
    keys = stored_keys(out / DB_NAME)  # a damaged or foreign store is reported here, before a run meets it
    n = NUMERICS[study.resolution]
    print(f"Study: {study.title}")
    print(f"Transport: {study.transport}, thermal diffusion {'on' if study.thermal_diffusion else 'off'}; "
          f"resolution {study.resolution} (final grid ratio/slope/curve {n.stages[-1]})")
    print(f"Fuels: {', '.join(study.sweep_fuels)}"
          + (f"; blended with {study.blend_with} at {', '.join(f'{f:g}' for f in study.blend_fractions)}"
             if study.blend_with else ""))
    print(f"Oxidizers: {', '.join(study.sweep_oxidizers)}")
    print(f"Equivalence ratio: {', '.join(f'{v:g}' for v in study.equivalence_ratios)}")
    print(f"Pressure [bar]: {', '.join(f'{v:g}' for v in study.pressures_bar)}")
    print(f"Unburned temperature [K]: {', '.join(f'{v:g}' for v in study.unburned_temperatures_K)}")
    print_gases(study)
    print_burner(study)
    subs = by_mechanism(study)
    if len(subs) > 1:
        print(f"Mechanisms compared: {len(subs)}, each solving the whole sweep ({study.n_points} flames in all); "
              f"the first, {subs[0].mechanism}, is the reference of the design charts")
    seconds = [_plan(sub, out, keys, args.jobs) for sub in subs]
    t = sum(seconds)
    if len(subs) > 1 and t:
        print(f"Estimated run time of the sweeps under all {len(subs)} mechanisms: about "
              + (f"{t / 60:.0f} min" if t >= 120 else f"{t:.0f} s"))
    return 0


def _plan(study: Study, out: Path, keys: set, jobs: int | None) -> float:
    """Print one mechanism's plan (its stored points, what is left, the extras asked for); return
    the estimated seconds of its sweep (0 when nothing is left)."""
    pts = points(study)
    stored = sum(p.key in keys for p in pts)
    unique = unique_points(pts)
    todo = {p.index for p in unique if p.key not in keys}
    rows, timings = [], {}
    if keys:
        with Store(out / DB_NAME, readonly=True) as st:
            tree = warm_plan(st, unique).pending(todo, {p.index: p.key for p in unique})
            timings = st.timings({p.family for p in pts})
            done = [p for p in pts if p.key in keys]  # only stored points are printed
            rows = point_rows(study, done, stored_with_extras(study, done, st))
    else:
        tree = warm_tree(unique)
    print(f"Mechanism: {study.mechanism} -> {study.mechanism_path}")
    note = lumping_note(study)
    if note:
        print(note)
    if stored:
        print_points(study, [r for r in rows if r["status"] != "pending"])
    print(f"Plan: {len(pts)} points; {stored} already stored in {out}, {len(todo)} to solve: "
          f"{len(tree.roots)} from scratch, {len(todo) - len(tree.roots)} warm-started from a neighbour "
          f"(longest warm-start path {tree.depth})")
    seconds = 0.0
    if todo:
        line, seconds = _estimate_line(study, tree, timings, jobs)
        print(line)
    _extras_lines(study, timings, jobs, len(unique))
    return seconds


def _extras_lines(study: Study, timings: dict, jobs: int | None, n_unique: int) -> None:
    """What the study's [limits], [stretch], [uncertainty] and [flame_response] tables add."""
    if study.limits is not None:
        print(_limits_line(study, timings, jobs))
    if study.stretch is not None:
        st = study.stretch
        print(f"Strained flames: {st.n_ladders} twin counterflow ladder(s) to extinction (phi "
              f"{', '.join(f'{v:g}' for v in st.equivalence_ratios)}), each 10-{MAX_SOLVES} flames after the sweep "
              f"(measured on 2 cores: 7-35 s a ladder with h2o2.yaml, {GRI_LADDER_NOTE} with GRI-Mech 3.0; "
              "not in the estimate above); stored ladders are not solved again")
    u = study.uncertainty
    if u is not None and u.kinetics:
        print(f"Kinetic uncertainty: flame-speed sensitivities to every rate constant of each burning point (up to "
              f"{n_unique} adjoint solves after the sweep, each the stored flame solved again on its grid; "
              "measured 0.4-0.5 s a flame with h2o2.yaml, about 18 s with GRI-Mech 3.0; not in the estimate "
              "above); stored ones are not solved again, and changing a factor solves nothing")
    fr = study.flame_response
    if fr is not None and fr.zeldovich:
        print(f"Flame response: Lewis numbers of every point, and the Zeldovich number from 2 more flames per "
              f"burning point (up to {2 * n_unique} flames, the inert moved {fr.inert_step:g} either way, "
              "warm-started from the point's stored flame after the sweep: measured +55-100 % of the sweep's "
              "time, not in the estimate above); pairs already stored are not solved again")


def _limits_line(study: Study, timings: dict, jobs: int | None) -> str:
    """What the [limits] table asks for and about how many flames beyond the sweep it needs."""
    plan = planned_searches(study)
    lim = study.limits
    assert lim is not None  # asked only of a study with [limits]
    asks = []
    if plan["blend_fraction"]:
        asks.append(f"the admissible {study.blend_with} fractions (both edges of every window) at "
                    f"{plural(plan['blend_fraction'], 'setting')} (to {lim.tolerance['blend_fraction']:g})")
    if plan["equivalence_ratio"]:
        asks.append(f"the admissible equivalence-ratio windows at {plural(plan['equivalence_ratio'], 'setting')} "
                    f"(to {lim.tolerance['equivalence_ratio']:g})"
                    + (f"; the sweep has one phi ({study.equivalence_ratios[0]:g}): that search can only say whether "
                       "it is admissible, sweep more to find the window's edges"
                       if len(study.equivalence_ratios) == 1 else ""))
    secs, _ = flame_seconds(len(study.atoms), timings)
    t = plan["flames"] * secs["warm"] / resolve_jobs(jobs)
    keep = kept(study)
    return (f"Limits: {' and '.join(asks)}, keeping {keep}: about {plan['flames']} flames beyond the sweep "
            f"(warm-started, about {t / 60:.0f} min; stored flames are not solved again)" if t >= 120 else
            f"Limits: {' and '.join(asks)}, keeping {keep}: about {plan['flames']} flames beyond the sweep "
            f"(warm-started, about {t:.0f} s; stored flames are not solved again)")


def _estimate_line(study: Study, tree: WarmPlan, timings: dict, jobs: int | None) -> tuple[str, float]:
    """'Estimated run time ...' from stored timings of the same settings, else from the mechanism
    size, and the estimate [s]."""
    jobs = resolve_jobs(jobs)
    secs, basis = flame_seconds(len(study.atoms), timings)
    t = estimate_run_seconds(tree, jobs, secs["fresh"], secs["warm"])
    when = f"{t / 60:.0f} min" if t >= 120 else f"{t:.0f} s"
    return (f"Estimated run time: about {when} on {jobs} worker{'s' if jobs > 1 else ''} ({basis}; "
            f"{secs['fresh']:.1f} s per flame from scratch, {secs['warm']:.1f} s warm; good to a factor 2)"), t


