"""The extra solves of an analysis, one shape for all: what a study's table asks of every point.

PerPoint      one analysis's per-point extra solve: whether the study wants it, the solve (on
              the run's backend, stored under its own keys: sweep.extras), how its stored rows
              merge into each point's metrics, and what ``check`` estimates for it
Budget        what an estimate knows: points still to solve, workers, a warm flame's seconds,
              the mechanism's size
per_point     the registered analyses' extra solves (flamecharts.analyses: each one's ``solve``
              part declares its PER_POINT), in the order a run solves them (after the sweep)

The pipeline solves every wanted extra of per_point() after the sweep, ``results`` merges
them into the rows, and ``flamecharts check`` prints their estimates; none of them is named
anywhere else. A new analysis declares its extra solves in its own package (DEVELOPERS.md, recipe).
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


def per_point() -> tuple[PerPoint, ...]:
    """Every per-point extra solve, in the order a run solves them: those of the registered
    analyses (flamecharts.analyses: each one's ``solve`` part's PER_POINT), in ANALYSES order."""
    return tuple(a for m in parts("solve") for a in m.PER_POINT)
