"""The extra solves of an analysis, one shape for all: what a study's table asks of every point.

PerPoint      one analysis's per-point extra solve: whether the study wants it, the solve (on
              the run's backend, stored under its own keys: sweep.extras), how its stored rows
              merge into each point's metrics, and what ``check`` estimates for it
Budget        what an estimate knows: points still to solve, workers, a warm flame's seconds,
              the mechanism's size
PER_POINT     the core extra solves (sensitivities, the premixer's delays)
per_point     those and the registered analyses' (flamecharts.analyses: each one's ``solve`` part
              declares its PER_POINT), in the order a run solves them (after the sweep)

The pipeline solves every wanted extra of per_point() after the sweep, ``results`` merges
them into the rows, and ``flamecharts check`` prints their estimates; none of them is named
anywhere else. A new analysis declares its extra solves in its own package (DEVELOPERS.md, recipe).
"""
from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING

from ..analyses import parts
from .kinetics import solve_sensitivities, wants_sensitivities, with_sensitivities
from .premixer import horizon_of, solve_premixer, with_premixer
from .schedule import sensitivity_seconds

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


def _sensitivity_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    t = b.points_to_solve * sensitivity_seconds(b.species, b.reactions, study.resolution) / b.workers
    return (f"Kinetic uncertainty: flame-speed sensitivities to every rate constant of each burning point (up to "
            f"{b.points_to_solve} adjoint solves after the sweep, each the stored flame solved again on its grid)",
            t, "measured 0.4-0.5 s a flame with h2o2.yaml, about 18 s with GRI-Mech 3.0; stored ones are not solved "
            "again, and changing a factor solves nothing")


#: A premixer's ignition delays of one point (the fresh mixture and five near the injection, over
#: a 1 s horizon) per species of the mechanism [s]: measured on 2 busy cores at 10 bar, 300-800 K,
#: 0.007-0.015 s with h2o2.yaml (10 species) and 0.07-0.09 s with GRI-Mech 3.0 (53), 2026-12-05.
PREMIXER_SECONDS_PER_SPECIES = 0.0017


def _premixer_estimate(study: Study, b: Budget) -> tuple[str, float, str]:
    horizon = horizon_of(study)
    t = b.points_to_solve * PREMIXER_SECONDS_PER_SPECIES * b.species / b.workers
    return (f"Premixer: ignition delays of every point's mixture and of 5 mixtures near the fuel injection "
            f"(constant-pressure reactors over {horizon:g} s, after the sweep)", t,
            "stored delays are reread for a shorter residence time")


#: The core per-point extra solves, in the order a run solves them after the sweep.
PER_POINT: tuple[PerPoint, ...] = (
    PerPoint("sensitivity", "flame-speed sensitivities", wants_sensitivities, solve_sensitivities, with_sensitivities,
             _sensitivity_estimate),
    PerPoint("premixer", "premixer ignition delays", lambda s: s.premixer is not None, solve_premixer, with_premixer,
             _premixer_estimate),
)


def per_point() -> tuple[PerPoint, ...]:
    """Every per-point extra solve, in the order a run solves them: the core ones above, then
    those of the registered analyses (flamecharts.analyses: each one's ``solve`` part's PER_POINT)."""
    return PER_POINT + tuple(a for m in parts("solve") for a in m.PER_POINT)
