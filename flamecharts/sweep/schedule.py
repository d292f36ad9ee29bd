"""The order in which a warm-start plan is solved, shared by the run and its time estimate.

A point is ready once the flame it warm-starts from has finished; among the ready
points the one with the longest warm-start path below it goes first (it keeps every
worker busy to the end). :class:`Scheduler` holds that rule; the run loop
(run.py) and :func:`estimate_run_seconds` both drive it, so the estimate simulates
exactly what a run does.
"""
from __future__ import annotations

import heapq
import statistics
from collections.abc import Iterable

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


#: Default seconds per flame on one core, per (mechanism species + 4)^2, when the store
#: has no timings yet: a Jacobian of the 1D problem costs about (grid points) x
#: (variables per point) x (residual cost per point ~ variables). Calibrated on GRI-Mech
#: 3.0 flames on the slower of the project's two 2-core machines, under two workers, so
#: that a faster machine sees an overestimate rather than a surprise (docs/benchmarks.md).
SECONDS_PER_VARIABLE_SQUARED = {"fresh": 9.0e-3, "warm": 2.2e-3}

#: Cost of a flame at each resolution relative to the standard one, where the store has no
#: timings of the study's settings: medians of the 22 flames of
#: tests/benchmarks/error_bar_validation.py solved at every setting from scratch (coarse 0.48,
#: range 0.29-1.28; fine 1.40, range 1.09-2.96; 2026-12-05, docs/benchmarks.md).
RESOLUTION_COST = {"coarse": 0.5, "standard": 1.0, "fine": 1.4}
#: Worker start-up and mechanism parsing per run [s] (an allowance; docs/benchmarks.md).
START_UP_SECONDS = 2.0


def default_flame_seconds(n_species: int, resolution: str = "standard") -> dict[str, float]:
    """Seconds per flame solved fresh and warm on one core, from the mechanism size and the
    resolution (:data:`RESOLUTION_COST`).

    >>> {k: round(v, 1) for k, v in default_flame_seconds(53).items()}
    {'fresh': 29.2, 'warm': 7.1}
    >>> {k: round(v, 1) for k, v in default_flame_seconds(53, "coarse").items()}
    {'fresh': 14.6, 'warm': 3.6}
    """
    nv2 = (n_species + 4) ** 2 * RESOLUTION_COST.get(resolution, 1.0)
    return {k: c * nv2 for k, c in SECONDS_PER_VARIABLE_SQUARED.items()}


def flame_seconds(n_species: int, timings: dict[str, list[float]],
                  resolution: str = "standard") -> tuple[dict[str, float], str]:
    """Seconds per flame ('fresh', 'warm') on one core and where they come from: the median of
    the store's timings of the same settings where it holds at least 3 of a kind, else
    :func:`default_flame_seconds` of the mechanism size.

    >>> secs, basis = flame_seconds(10, {"fresh": [1.0, 2.0, 3.0], "warm": [0.1]})
    >>> secs["fresh"], basis
    (2.0, 'from 4 stored timings')
    """
    secs = default_flame_seconds(n_species, resolution)
    measured = {k: statistics.median(v) for k, v in timings.items() if len(v) >= 3}
    if not measured:
        return secs, f"from the mechanism size, {n_species} species, and the {resolution} resolution"
    secs.update(measured)
    return secs, f"from {sum(len(v) for v in timings.values())} stored timings"


def flame_cost(plan: WarmPlan, i: int, secs: dict[str, float]) -> float:
    """Estimated seconds of point ``i`` of ``plan``: from scratch for a root without a stored source."""
    return secs["fresh"] if (plan.parent[i] is None and i not in plan.stored) else secs["warm"]


#: Cost of one sensitivity task (the stored flame solved again on its grid, then Cantera's
#: adjoint, whose cost is the residual evaluated twice per reaction) per reaction and per
#: variable of a grid point [s]: measured 0.37-0.48 s with h2o2.yaml (29 reactions, 10
#: species), 17.6 s with GRI-Mech 3.0 (325, 53), 13.9-16.9 s with Alzueta et al. 2023 (281,
#: 42) on 2 cores (docs/benchmarks.md, "Kinetic sensitivities").
SENSITIVITY_SECONDS = 1.1e-3
#: One strained flame of a [stretch] ladder [s] with h2o2.yaml (20 flames in 18 s), and the
#: power of (species + 4) that reaches GRI-Mech 3.0's 44 s a flame (15 in 11 min) from it
#: (docs/benchmarks.md, "Flame response and strained flames"); a ladder is about
#: LADDER_FLAMES flames.
STRAINED_FLAME_SECONDS, STRAINED_FLAME_POWER, LADDER_FLAMES = 0.9, 2.77, 20


def sensitivity_seconds(n_species: int, n_reactions: int, resolution: str = "standard") -> float:
    """Seconds of one point's flame-speed sensitivities (adjoint) on one core, on the grid of
    the study's resolution (:data:`RESOLUTION_COST`).

    >>> round(sensitivity_seconds(10, 29), 2), round(sensitivity_seconds(53, 325), 1)
    (0.45, 20.4)
    """
    return SENSITIVITY_SECONDS * n_reactions * (n_species + 4) * RESOLUTION_COST.get(resolution, 1.0)


def ladder_seconds(n_species: int) -> float:
    """Seconds of one strained-flame ladder to extinction on one core.

    >>> round(ladder_seconds(10)), round(ladder_seconds(53))
    (18, 880)
    """
    return LADDER_FLAMES * STRAINED_FLAME_SECONDS * ((n_species + 4) / 14.0) ** STRAINED_FLAME_POWER


#: Above this much estimated wall time, `check` says the study is a job for a cluster [s].
CLUSTER_ADVICE_S = 8 * 3600.0


#: A flame gets this many times its estimated cost from scratch before it is given up ...
TIME_LIMIT_FACTOR = 20.0
#: ... and never less than this [s] (a loaded machine, a robust retry).
MIN_TIME_LIMIT_S = 60.0


def flame_time_limit(n_species: int) -> float:
    """Default time limit of one flame [s]: TIME_LIMIT_FACTOR times the estimated cost of a
    flame from scratch, at least MIN_TIME_LIMIT_S (a generous bound: only a flame that
    time-steps or iterates without end reaches it).

    >>> round(flame_time_limit(53)), flame_time_limit(10)
    (585, 60.0)
    """
    return max(MIN_TIME_LIMIT_S, TIME_LIMIT_FACTOR * default_flame_seconds(n_species)["fresh"])


def estimate_run_seconds(plan: WarmPlan, jobs: int, fresh_s: float, warm_s: float) -> float:
    """Wall time [s] of running ``plan`` on ``jobs`` workers, roots taking ``fresh_s`` and
    the other points ``warm_s``: a list-scheduling simulation with the run's own
    :class:`Scheduler`, plus START_UP_SECONDS.

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
            heapq.heappush(running, (now + flame_cost(plan, i, {"fresh": fresh_s, "warm": warm_s}), i))
        now, i = heapq.heappop(running)
        sched.finished(i)
    return now + START_UP_SECONDS
