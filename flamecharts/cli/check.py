"""flamecharts check CONFIG: validate a config and print the plan and its estimated run time."""
from __future__ import annotations

import argparse
from pathlib import Path
from typing import TYPE_CHECKING

from ..admissible.driver import LimitsPlan, Mixture, planned_searches
from ..admissible.words import kept
from ..chemistry.flame import NUMERICS
from ..config import by_mechanism, load_study, lumping_note, reduction_note, with_reduction
from ..pipeline import default_out_dir
from ..results import point_rows, stored_with_extras
from ..store import DB_NAME, Store, stored_keys
from ..sweep.analyses import Budget, per_point, per_study
from ..sweep.backends import resolve_jobs
from ..sweep.points import points
from ..sweep.run import unique_points, warm_plan
from ..sweep.schedule import (
    CLUSTER_ADVICE_S,
    WORKING_DAY_S,
    estimate_run_seconds,
    flame_seconds,
    output_seconds,
    point_scales,
    pressure_cost,
)
from ..sweep.skeletal import estimate as reduction_estimate, stored as stored_reduction
from ..sweep.warm_tree import warm_tree
from .progress import duration, plural
from .tables import print_burner, print_gases, print_points

if TYPE_CHECKING:
    from ..config import Study
    from ..sweep.points import Point
    from ..sweep.warm_tree import WarmPlan

#: Measured cost of a reduction (docs/benchmarks.md, "Mechanism reduction").
REDUCTION_MEASURED = ("measured on 2 busy cores (methane-air, GRI-Mech 3.0, 16 autoignitions, 4 validation flames): 61 s "
                      "at coarse and 157 s at standard resolution, nearly all of it the validation flames; then each "
                      "flame 2.4-2.8 times faster")


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
    study, reduction_s, keys = _reduction(study, out, keys, args.jobs)
    subs = by_mechanism(study)
    if len(subs) > 1:
        print(f"Mechanisms compared: {len(subs)}, each solving the whole sweep ({study.n_points} flames in all); "
              f"the first, {subs[0].mechanism}, is the reference of the design charts")
    seconds = [_plan(sub, out, keys, args.jobs) for sub in subs]
    writing = output_seconds(study.n_points * len(subs))
    print(f"Writing the outputs (CSV, netCDF, charts, report): about {duration(writing)}")
    print(_total_line(sum(seconds) + writing + reduction_s, resolve_jobs(args.jobs), len(subs)))
    return 0


def whole_run_seconds(study: Study, out: Path, jobs: int | None) -> float:
    """The estimate `check` prints as its total (sweep, limits and extra solves of every
    mechanism, writing the outputs), without its printing or the read-out of the stored points:
    `run` announces it."""
    keys = stored_keys(out / DB_NAME)
    study, reduction_s, keys = _reduction(study, out, keys, jobs, quiet=True)
    subs = by_mechanism(study)
    total = reduction_s + output_seconds(study.n_points * len(subs))
    for sub in subs:
        pts, todo, tree, timings = _sweep_plan(sub, out, keys)
        total += (_estimate_line(sub, pts, tree, timings, jobs)[1] if todo else 0.0)
        total += sum(t for _, t in _extras(sub, pts, keys, timings, jobs, todo))
    return total


def _reduction(study: Study, out: Path, keys: set, jobs: int | None, quiet: bool = False) -> tuple[Study, float, set]:
    """[reduction]: the study with the stored skeletal mechanism when the folder holds the one this
    study asks for (then nothing to estimate), else the reduction's estimate line and seconds, and
    no stored flame (a new mechanism is a new key: every flame is solved again)."""
    if study.reduction is None:
        return study, 0.0, keys
    record, why = stored_reduction(study, out)
    if record is not None:
        if not quiet:
            print(f"Mechanism reduction: stored in {out}, reused. {reduction_note(with_reduction(study, record))}")
        return with_reduction(study, record), 0.0, keys
    what, t = reduction_estimate(study)
    if not quiet:
        print(f"{what}: about {duration(t)} in one process ({why}); {REDUCTION_MEASURED}. The skeletal mechanism's "
              "size is known only once it is made: the sweep below is estimated with the detailed mechanism's (an "
              "upper bound), and every point is to solve, since a new mechanism is a new key")
    return study, t, set()


def _total_line(t: float, jobs: int, n_mechanisms: int) -> str:
    """The whole estimate in one line: what it assumes, and where a study is too big for this machine."""
    every = f" under all {n_mechanisms} mechanisms" if n_mechanisms > 1 else ""
    line = (f"Estimated total{every}: about {duration(t)}, everything above included "
            f"(assumes {jobs} free core{'s' if jobs > 1 else ''}: a busy machine takes longer)")
    if t > CLUSTER_ADVICE_S:
        line += (f". That is {t / WORKING_DAY_S:.1f} working days of 8 h on this machine ({t / 86400:.1f} days "
                 "round the clock): run it on a cluster (--cluster; docs/cluster.md), or plan fewer points or a "
                 "coarser resolution")
    return line


def _sweep_plan(study: Study, out: Path, keys: set) -> tuple[list[Point], set[int], WarmPlan, dict]:
    """The study's points, the indices of those still to solve, the warm-start plan of those,
    and the store's timings of the same settings."""
    pts = points(study)
    unique = unique_points(pts)
    todo = {p.index for p in unique if p.key not in keys}
    if not keys:
        return pts, todo, warm_tree(unique), {}
    with Store(out / DB_NAME, readonly=True) as st:
        return (pts, todo, warm_plan(st, unique).pending(todo, {p.index: p.key for p in unique}),
                st.timings({p.family for p in pts}))


def _plan(study: Study, out: Path, keys: set, jobs: int | None) -> float:
    """Print one mechanism's plan (its stored points, what is left, the extras asked for); return
    the estimated seconds of its sweep and extras (the sweep's 0 when nothing is left)."""
    pts, todo, tree, timings = _sweep_plan(study, out, keys)
    print(f"Mechanism: {study.mechanism} -> {study.mechanism_path}")
    note = lumping_note(study)
    if note:
        print(note)
    done = [p for p in pts if p.key in keys]  # only stored points are printed
    if done:
        with Store(out / DB_NAME, readonly=True) as st:
            rows = point_rows(study, done, stored_with_extras(study, done, st))
        print_points(study, [r for r in rows if r["status"] != "pending"])
    print(f"Plan: {len(pts)} points; {len(done)} already stored in {out}, {len(todo)} to solve: "
          f"{len(tree.roots)} from scratch, {len(todo) - len(tree.roots)} warm-started from a neighbour "
          f"(longest warm-start path {tree.depth})")
    seconds = 0.0
    if todo:
        line, seconds = _estimate_line(study, pts, tree, timings, jobs)
        print(line)
    for line, t in _extras(study, pts, keys, timings, jobs, todo):
        print(line)
        seconds += t
    return seconds


def _mean_pressure_cost(study: Study, pts: list[Point], todo: set[int], timings: dict) -> float:
    """The mean pressure factor of the points still to solve (1 where the store's timings of the
    same settings already carry it)."""
    if _measured(timings) or not todo:
        return 1.0
    return sum(pressure_cost(p.pressure_bar) for p in pts if p.index in todo) / len(todo)


def _measured(timings: dict) -> bool:
    """Whether the per-flame seconds come from the store's timings (flame_seconds' rule)."""
    return any(len(v) >= 3 for v in timings.values())


def _extras(study: Study, pts: list[Point], keys: set, timings: dict, jobs: int | None,
            todo: set[int]) -> list[tuple[str, float]]:
    """What the study's [limits] and its analyses' tables ([stretch], [uncertainty], [flame_response]...)
    add: a line each, with its estimated seconds (the limits, the analyses' PerStudy solves, their
    per-point extras). Extras of points already stored are not solved
    again, so only the points still to solve count (an upper bound: points that turn out not
    to burn need none)."""
    jobs = resolve_jobs(jobs)
    n_sp = len(study.atoms)
    secs, _ = flame_seconds(n_sp, timings, study.resolution)
    lines: list[tuple[str, float]] = []
    if study.limits is not None:
        lines.append(_limits_line(study, timings, jobs))
    budget = Budget(points_to_solve=len(todo), workers=jobs,
                    warm_flame_s=secs["warm"] * _mean_pressure_cost(study, pts, todo, timings), species=n_sp,
                    reactions=len(study.facts.reaction_equations) if study.facts else 0, points=tuple(pts),
                    stored_keys=frozenset(keys))
    lines += [stage.estimate(study, budget, duration) for stage in per_study() if stage.wanted(study)]
    for analysis in per_point():
        if analysis.wanted(study):
            what, t, note = analysis.estimate(study, budget)
            lines.append((f"{what}: {'about ' + duration(t) if t >= 0.5 else 'under a second'}; {note}", t))
    return lines


def _limits_line(study: Study, timings: dict, jobs: int, mixture: Mixture | None = None) -> tuple[str, float]:
    """What the [limits] table asks for, about how many flames beyond the sweep it needs and their
    estimated seconds; which searches need none (every flame criterion outside its range), and why."""
    plan = planned_searches(study, mixture if mixture is not None else _mixture(study))
    lim = study.limits
    assert lim is not None  # asked only of a study with [limits]
    asks = []
    n = plan.searches
    if n["blend_fraction"]:
        asks.append(f"the admissible {study.blend_with} fractions (both edges of every window) at "
                    f"{plural(n['blend_fraction'], 'setting')} (to {lim.tolerance['blend_fraction']:g})")
    if n["equivalence_ratio"]:
        asks.append(f"the admissible equivalence-ratio windows at {plural(n['equivalence_ratio'], 'setting')} "
                    f"(to {lim.tolerance['equivalence_ratio']:g})"
                    + (f"; the sweep has one phi ({study.equivalence_ratios[0]:g}): that search can only say whether "
                       "it is admissible, sweep more to find the window's edges"
                       if len(study.equivalence_ratios) == 1 else ""))
    head = f"Limits: {' and '.join(asks)}, keeping {kept(study)}: "
    t = _limits_seconds(study, plan, timings, jobs)
    idle, total = sum(plan.idle.values()), sum(n.values())
    why = _idle_words(plan, idle, total)
    if idle == total:
        return head + f"no flames beyond the sweep: {why}", 0.0
    return (head + f"up to about {plan.flames} flames beyond the sweep (warm-started, about {duration(t)}; an upper "
            "estimate: an edge the swept points already settle, or one that does not exist, needs none; stored "
            "flames are not solved again)" + (f"; {why}" if why else "")), t


def _idle_words(plan: LimitsPlan, idle: int, total: int) -> str:
    """Why the searches that need no flame need none ('' without such a search)."""
    if not idle:
        return ""
    if not plan.why:
        return (("no search needs" if idle == total else f"{idle} of the {total} searches need") +
                " a flame: the Wobbe band alone is a closed form")
    which = "every search" if idle == total else f"{idle} of the {total} searches"
    return (f"every flame criterion is outside its range at every swept point of {which}, so "
            f"{'none needs' if idle == total else 'those need no'} flames ({plan.why})")


def _limits_seconds(study: Study, plan: LimitsPlan, timings: dict, jobs: int) -> float:
    """Wall time of the limit flames: each round solves every open search's next flames side by
    side, so the wall time is the flames over the workers, but never less than one search's
    flames one after the other."""
    if not plan.flames:
        return 0.0
    secs, _ = flame_seconds(len(study.atoms), timings, study.resolution)
    cost = {p: secs["warm"] * (1.0 if _measured(timings) else pressure_cost(p)) for p in plan.flames_at}
    work = sum(n * cost[p] for p, n in plan.flames_at.items())
    return max(work / jobs, plan.longest * max(cost.values()))


def _mixture(study: Study) -> Mixture:
    """The fresh mixture of a point before its flame (sweep.worker.fresh_mixture), once per point."""
    from ..sweep.worker import fresh_mixture

    cache: dict[str, dict] = {}

    def mixture(p: Point) -> dict:
        if p.key not in cache:
            cache[p.key] = fresh_mixture(study.mechanism_path, study.mechanism_sha256, p.X_unburned, p.T_u, p.P)
        return cache[p.key]
    return mixture


def _estimate_line(study: Study, pts: list[Point], tree: WarmPlan, timings: dict,
                   jobs: int | None) -> tuple[str, float]:
    """'Estimated sweep ...' from stored timings of the same settings, else from the mechanism
    size, the resolution and each point's pressure, and the estimate [s]."""
    jobs = resolve_jobs(jobs)
    secs, basis = flame_seconds(len(study.atoms), timings, study.resolution)
    scale = None if _measured(timings) else point_scales(tree, {p.index: p.pressure_bar for p in pts})
    t = estimate_run_seconds(tree, jobs, secs["fresh"], secs["warm"], scale)
    top = max(study.pressures_bar)
    at = (f" at 1 bar, {pressure_cost(top):.1f} times that at {top:g} bar" if scale and pressure_cost(top) > 1.05
          else "")
    how = " one step away" if scale else ""
    return (f"Estimated sweep: about {duration(t)} on {jobs} worker{'s' if jobs > 1 else ''} ({basis}; "
            f"{secs['fresh']:.1f} s per flame from scratch, {secs['warm']:.1f} s warm{how}{at})"), t
