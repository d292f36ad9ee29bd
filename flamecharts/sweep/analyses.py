"""The extra solves of an analysis, one shape for all: what a study's table asks of every point.

PerPoint      one analysis's per-point extra solve: whether the study wants it, the solve (on
              the run's backend, stored under its own keys: sweep.extras), how its stored rows
              merge into each point's metrics, and what ``check`` estimates for it
Budget        what an estimate knows: points still to solve, workers, a warm flame's seconds,
              the mechanism's size
PerStudy      one analysis's solves that read the points' rows (a strained-flame ladder needs its
              free flame's S_L): solved after every PerPoint and before the limits, merged into
              the points' metrics like a PerPoint's, and a record table of their own (a CSV file
              of one row per solve, read from the store)
Budget        what an estimate knows: points still to solve, workers, a warm flame's seconds,
              the mechanism's size, the study's points and the keys the store holds
per_point     the registered analyses' extra solves (flamecharts.analyses: each one's ``solve``
              part declares its PER_POINT), in the order a run solves them (after the sweep)
per_study     the registered analyses' PerStudy solves (each ``solve`` part's PER_STUDY)

The pipeline solves every wanted extra of per_point() after the sweep, then those of
per_study(), ``results`` merges them into the rows, and ``flamecharts check`` prints their
estimates; none of them is named anywhere else. A new analysis declares its extra solves in its
own package (DEVELOPERS.md, recipe).
"""
from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING

from ..analyses import parts

if TYPE_CHECKING:
    from ..config import Study
    from ..store import Store
    from .points import Point


@dataclass(frozen=True)
class Budget:
    """What an estimate of extra solves knows of the run."""

    points_to_solve: int      # points of the sweep not stored yet (their extras are not either)
    workers: int
    warm_flame_s: float       # a warm-started flame of this mechanism and resolution [s]
    species: int
    reactions: int
    points: tuple[Point, ...] = ()                 # every point of the study (one mechanism's)
    stored_keys: frozenset[str] = frozenset()     # the keys the store holds (what is not solved again)


@dataclass(frozen=True)
class PerPoint:
    """One analysis's extra solve of the points of a study.

    ``estimate(study, budget)`` -> (what it does, seconds, a note after the time) for ``check``.
    """

    name: str
    what: str                 # the progress label ('Zeldovich pairs')
    wanted: Callable[[Study], bool]
    solve: Callable[..., tuple[int, float]]   # (study, store, points, stored rows, backend, progress) -> (n, s)
    merge: Callable[[Study, list[Point], dict[str, dict], Store], dict[str, dict]]
    estimate: Callable[[Study, Budget], tuple[str, float, str]]


@dataclass(frozen=True)
class PerStudy:
    """One analysis's solves that read the points' rows, after every PerPoint and before the limits.

    ``solve(study, store, points, rows by point key, backend, progress)`` -> (solved, seconds);
    ``merge`` as PerPoint's (the values the points' read-out reads); ``rows(study, points, rows by
    point key, store)`` -> the rows of its record table ``file`` (one per solve, solved or not);
    ``reread(study)``: whether the points' read-out reads the merged values (new solves then mean
    the rows are read again, so a first run and a rerun agree); ``estimate(study, budget,
    duration)`` -> (its line of ``check``, seconds), ``duration`` formatting seconds as the line does.
    """

    name: str
    what: str                 # the progress label ('strained-flame ladders')
    file: str                 # its record table ('stretch.csv')
    wanted: Callable[[Study], bool]
    solve: Callable[..., tuple[int, float]]
    merge: Callable[[Study, list[Point], dict[str, dict], Store], dict[str, dict]]
    rows: Callable[[Study, list[Point], dict[str, dict], Store], list[dict]]
    reread: Callable[[Study], bool]
    estimate: Callable[[Study, Budget, Callable[[float], str]], tuple[str, float]]


def per_point() -> tuple[PerPoint, ...]:
    """Every per-point extra solve, in the order a run solves them: those of the registered
    analyses (flamecharts.analyses: each one's ``solve`` part's PER_POINT), in ANALYSES order."""
    return tuple(a for m in parts("solve") for a in getattr(m, "PER_POINT", ()))


def per_study() -> tuple[PerStudy, ...]:
    """Every PerStudy solve of the registered analyses (each ``solve`` part's PER_STUDY), in
    ANALYSES order: what a run solves after the per-point extras, before the limits."""
    return tuple(a for m in parts("solve") for a in getattr(m, "PER_STUDY", ()))

