"""The order in which a warm-start plan is solved, shared by the run and its time estimate.

A point is ready once the flame it warm-starts from has finished; among the ready
points the one with the longest warm-start path below it goes first (it keeps every
worker busy to the end). :class:`Scheduler` holds that rule; the run loop
(run.py) and :func:`estimate_run_seconds` both drive it, so the estimate simulates
exactly what a run does.
"""
from __future__ import annotations

import heapq
import math
import statistics
from collections.abc import Iterable, Mapping, Sequence

from .warm_tree import WarmPlan


class Scheduler:
    """Ready points of a warm-start plan, longest path below first.

    ``todo`` are the point indices still to solve; a point whose source is not in
    ``todo`` (a root, or one whose source is already stored) is ready at once.

    >>> p = WarmPlan(parent={0: None, 1: 0, 2: 0}, stored={}, roots=[0],
    ...              height={0: 2, 1: 1, 2: 1}, distance={})
    >>> s = Scheduler(p, [0, 1, 2]); s.pop(), s.pop()
    (0, None)
    >>> s.finished(0); s.pop(), s.pop(), s.remaining
    (1, 2, 2)
    """

    def __init__(self, plan: WarmPlan, todo: Iterable[int]) -> None:
        self._height = plan.height
        self._pending = set(todo)
        self._children: dict[int, list[int]] = {}
        self._ready: list[tuple[int, int]] = []
        for i in sorted(self._pending):
            par = plan.parent[i]
            if par is None or par not in self._pending:
                self.push(i)
            else:
                self._children.setdefault(par, []).append(i)

    def push(self, i: int) -> None:
        """Make point ``i`` ready (again, after a worker died on it)."""
        heapq.heappush(self._ready, (-self._height[i], i))

    def pop(self) -> int | None:
        """The next ready point (None: none is ready now)."""
        return heapq.heappop(self._ready)[1] if self._ready else None

    def has_ready(self) -> bool:
        return bool(self._ready)

    def finished(self, i: int) -> None:
        """Point ``i`` is solved (any status): the points that start from it become ready."""
        self._pending.discard(i)
        for c in self._children.get(i, []):
            self.push(c)

    @property
    def remaining(self) -> int:
        """Points not finished yet (ready, waiting or in flight)."""
        return len(self._pending)


#: Default seconds of one flame at 1 bar on one core, standard resolution, with a mechanism of
#: 53 species (GRI-Mech 3.0: 57 variables per grid point), solved from scratch and warm-started
#: one step away (one unit of sweep.warm_tree.DISTANCE_SCALES, e.g. 0.1 in phi), where the store
#: has no timings yet; other mechanisms as ((species + 4) / 57)^SPECIES_POWER. CPU seconds of
#: tests/benchmarks/estimate_calibration.py (one flame at a time; a busy machine stretches the wall
#: time, not these): GRI-Mech 3.0 15.5-26 s from scratch, 6.4-7.2 s a step of 0.1 in phi;
#: h2o2.yaml 0.5-0.6 s and 0.25-0.31 s (docs/benchmarks.md, "Run-time estimate calibration").
FLAME_SECONDS = {"fresh": 25.0, "warm": 6.8}
REFERENCE_VARIABLES = 57
#: The power of (species + 4) a flame's cost grows with: a Jacobian costs (grid points) x
#: (variables)^2, and bigger mechanisms take more Newton and time steps: 2.6 and 2.3 join the
#: two mechanisms measured above.
SPECIES_POWER = {"fresh": 2.6, "warm": 2.3}

#: Cost of a flame at each resolution relative to the standard one, solved from scratch and
#: warm-started, where the store has no timings of the study's settings. From scratch: medians of
#: the 22 flames of tests/benchmarks/error_bar_validation.py solved at every setting (coarse 0.48,
#: range 0.29-1.28; fine 1.40, range 1.09-2.96; 2026-12-05). Warm-started on the coarse grid:
#: 0.37-0.39 of the standard grid's warm starts (estimate_calibration.py, GRI-Mech 3.0 and
#: h2o2.yaml alike); fine as from scratch (not measured warm).
RESOLUTION_COST = {"coarse": {"fresh": 0.5, "warm": 0.38}, "standard": {"fresh": 1.0, "warm": 1.0},
                   "fine": {"fresh": 1.4, "warm": 1.4}}
#: A flame's cost grows with pressure by this share per decade above 1 bar (below 1 bar: none).
#: The grid hardly grows (the domain is scaled as 1/sqrt(p), the refinement criteria are
#: relative), but a thin high-pressure flame takes more Newton and time steps: at 10 bar against
#: 1 bar, warm starts cost 1.15-1.3 times as much with GRI-Mech 3.0 and about twice with
#: h2o2.yaml (a slow lean flame near its limit far more), from scratch 0.6-0.9 and 1.7 times.
PRESSURE_COST_PER_DECADE = 0.5
#: A warm start's cost against its distance d to its source (units of DISTANCE_SCALES), relative to
#: one unit: WARM_DISTANCE_COST[0] + WARM_DISTANCE_COST[1] * d for d in 0.5-3. GRI-Mech 3.0, steps
#: in phi: 0.84-0.87, 1 and 1.47-1.5 at 0.5, 1 and 2 units (coarse and standard alike), 2.0 in a
#: study of blend and phi steps of 2 units; h2o2.yaml 1, 1, 1.4 and 1.3 at 0.5, 1, 2 and 3 units.
WARM_DISTANCE_COST = (0.55, 0.45)
#: Worker start-up and mechanism parsing per run [s] (an allowance; docs/benchmarks.md).
START_UP_SECONDS = 2.0
#: Writing a finished run's outputs (CSV, netCDF, charts, report) [s]: a base and a share per point
#: (charts and report of a small study 4-8 s; 100,000 points in about 20 s, docs/run-time.md).
OUTPUT_SECONDS = (5.0, 2e-4)


def pressure_cost(pressure_bar: float) -> float:
    """A flame's cost at ``pressure_bar`` relative to 1 bar (:data:`PRESSURE_COST_PER_DECADE`).

    >>> pressure_cost(1.0), pressure_cost(10.0), pressure_cost(0.5)
    (1.0, 1.5, 1.0)
    """
    return 1.0 + PRESSURE_COST_PER_DECADE * max(0.0, math.log10(pressure_bar))


def distance_cost(distance: float) -> float:
    """A warm start's cost at ``distance`` from its source relative to one unit (:data:`WARM_DISTANCE_COST`).

    >>> [round(distance_cost(d), 2) for d in (1.0, 0.1, 2.0, math.inf)]
    [1.0, 0.78, 1.45, 1.9]
    """
    a, b = WARM_DISTANCE_COST
    return a + b * min(max(distance, 0.5), 3.0)


def output_seconds(n_points: int) -> float:
    """Seconds of writing a run's outputs (:data:`OUTPUT_SECONDS`).

    >>> output_seconds(28), round(output_seconds(100_000))
    (5.0056, 25)
    """
    return OUTPUT_SECONDS[0] + OUTPUT_SECONDS[1] * n_points


def default_flame_seconds(n_species: int, resolution: str = "standard") -> dict[str, float]:
    """Seconds per flame at 1 bar solved fresh and warm (one step away) on one core, from the
    mechanism size and the resolution (:data:`RESOLUTION_COST`); :func:`pressure_cost` and
    :func:`distance_cost` scale them to a point.

    >>> {k: round(v, 1) for k, v in default_flame_seconds(53).items()}
    {'fresh': 25.0, 'warm': 6.8}
    >>> {k: round(v, 2) for k, v in default_flame_seconds(10, "coarse").items()}
    {'fresh': 0.32, 'warm': 0.1}
    """
    return {k: c * ((n_species + 4) / REFERENCE_VARIABLES) ** SPECIES_POWER[k] * RESOLUTION_COST[resolution][k]
            for k, c in FLAME_SECONDS.items()}


def point_scales(plan: WarmPlan, pressures_bar: dict[int, float]) -> dict[int, float]:
    """Each point's factor on the default per-flame seconds: its pressure's (:func:`pressure_cost`)
    and, warm-started, its distance's (:func:`distance_cost`)."""
    return {i: pressure_cost(pressures_bar[i]) * (1.0 if plan.parent[i] is None and i not in plan.stored
                                                  else distance_cost(plan.distance.get(i, 1.0)))
            for i in plan.parent}


def flame_seconds(n_species: int, timings: dict[str, list[float]],
                  resolution: str = "standard") -> tuple[dict[str, float], str]:
    """Seconds per flame ('fresh', 'warm') on one core and where they come from: the median of
    the store's timings of the same settings where it holds at least 3 of a kind (measured on the
    machine as it was then: a busy first run makes them long, and the basis says so), else
    :func:`default_flame_seconds` of the mechanism size.

    >>> secs, basis = flame_seconds(10, {"fresh": [1.0, 2.0, 3.0], "warm": [0.1]})
    >>> secs["fresh"], basis
    (2.0, 'from 4 stored timings, which carry the load they were measured under')
    """
    secs = default_flame_seconds(n_species, resolution)
    measured = {k: statistics.median(v) for k, v in timings.items() if len(v) >= 3}
    if not measured:
        return secs, f"from the mechanism size, {n_species} species, and the {resolution} resolution"
    secs.update(measured)
    return secs, (f"from {sum(len(v) for v in timings.values())} stored timings, which carry the load they were "
                  "measured under")


def flame_cost(plan: WarmPlan, i: int, secs: dict[str, float], scale: float = 1.0) -> float:
    """Estimated seconds of point ``i`` of ``plan``: from scratch for a root without a stored source;
    ``scale`` its point's own factor (:func:`pressure_cost`)."""
    return scale * (secs["fresh"] if (plan.parent[i] is None and i not in plan.stored) else secs["warm"])


#: Cost of one sensitivity task (the stored flame solved again on its grid, then Cantera's
#: adjoint, whose cost is the residual evaluated twice per reaction) per reaction and per
#: variable of a grid point [s]: measured 0.37-0.48 s with h2o2.yaml (29 reactions, 10
#: species), 17.6 s with GRI-Mech 3.0 (325, 53), 13.9-16.9 s with Alzueta et al. 2023 (281,
#: 42) on 2 cores (docs/benchmarks.md, "Kinetic sensitivities").
SENSITIVITY_SECONDS = 1.1e-3


def sensitivity_seconds(n_species: int, n_reactions: int, resolution: str = "standard") -> float:
    """Seconds of one point's flame-speed sensitivities (adjoint) on one core, on the grid of
    the study's resolution (:data:`RESOLUTION_COST`, a fresh flame's grid).

    >>> round(sensitivity_seconds(10, 29), 2), round(sensitivity_seconds(53, 325), 1)
    (0.45, 20.4)
    """
    return SENSITIVITY_SECONDS * n_reactions * (n_species + 4) * RESOLUTION_COST[resolution]["fresh"]


def parallel_seconds(costs: Sequence[float], jobs: int) -> float:
    """Wall time [s] of independent tasks of these ``costs`` on ``jobs`` workers, longest first
    (the order they finish in matters little; the longest task bounds it from below).

    >>> parallel_seconds([60.0, 25.0, 20.0], 2), parallel_seconds([], 2)
    (60.0, 0.0)
    """
    load = [0.0] * max(1, jobs)
    for c in sorted(costs, reverse=True):
        i = load.index(min(load))
        load[i] += c
    return max(load)


#: Above this much estimated wall time, `check` says the study is a job for a cluster [s] ...
CLUSTER_ADVICE_S = 8 * 3600.0
#: ... and counts it in working days of this many seconds.
WORKING_DAY_S = 8 * 3600.0


#: A flame gets this many times TIME_LIMIT_BASIS x (species + 4)^2 [s] (the estimate of a flame
#: from scratch before the recalibration of 2026-12-05 (afternoon); kept so that the time limits did not move) ...
TIME_LIMIT_FACTOR, TIME_LIMIT_BASIS = 20.0, 9.0e-3
#: ... and never less than this [s] (a loaded machine, a robust retry).
MIN_TIME_LIMIT_S = 60.0


def flame_time_limit(n_species: int) -> float:
    """Default time limit of one flame [s]: TIME_LIMIT_FACTOR times about a flame's cost from
    scratch (TIME_LIMIT_BASIS), at least MIN_TIME_LIMIT_S (a generous bound: only a flame that
    time-steps or iterates without end reaches it).

    >>> round(flame_time_limit(53)), flame_time_limit(10)
    (585, 60.0)
    """
    return max(MIN_TIME_LIMIT_S, TIME_LIMIT_FACTOR * TIME_LIMIT_BASIS * (n_species + 4) ** 2)


def estimate_run_seconds(plan: WarmPlan, jobs: int, fresh_s: float, warm_s: float,
                         scale: Mapping[int, float] | None = None) -> float:
    """Wall time [s] of running ``plan`` on ``jobs`` workers, roots taking ``fresh_s`` and
    the other points ``warm_s`` (times ``scale[i]`` of point i where given: :func:`pressure_cost`):
    a list-scheduling simulation with the run's own :class:`Scheduler`, plus START_UP_SECONDS.

    >>> p = WarmPlan(parent={0: None, 1: 0, 2: 0, 3: 1}, stored={}, roots=[0],
    ...              height={0: 3, 1: 2, 2: 1, 3: 1}, distance={})
    >>> estimate_run_seconds(p, 2, 10.0, 2.0) - START_UP_SECONDS
    14.0
    """
    sched = Scheduler(plan, plan.parent)
    slots = max(1, jobs)
    running: list[tuple[float, int]] = []  # (finish time, point)
    now = 0.0
    while sched.has_ready() or running:
        while sched.has_ready() and len(running) < slots:
            i = sched.pop()
            assert i is not None  # has_ready() above
            heapq.heappush(running, (now + flame_cost(plan, i, {"fresh": fresh_s, "warm": warm_s},
                                                      scale.get(i, 1.0) if scale else 1.0), i))
        now, i = heapq.heappop(running)
        sched.finished(i)
    return now + START_UP_SECONDS
