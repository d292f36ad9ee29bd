"""Grids of initial states a mechanism is sampled on, and the validation points between them.

composition   a fuel or oxidizer as a sorted, normalised, hashable tuple
Conditions    a grid of fuels, oxidizers, equivalence ratios, temperatures and pressures
between       the conditions half-way between neighbouring grid values: validation points that
              are never training points (chemistry.reduction trains on the grid, validates between)

Plain data, no Cantera: a study's reduction plan (sweep.skeletal) is made, and compared with a
stored one, without loading the mechanism.
"""
from __future__ import annotations

import itertools
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from . import mixtures

Composition = tuple[tuple[str, float], ...]  # (species, mole fraction), sorted by name
Point = tuple[Composition, Composition, float, float, float]  # fuel, oxidizer, phi [-], T [K], p [Pa]


def composition(X: Mapping[str, float]) -> Composition:
    """A fuel or oxidizer as a sorted tuple of (species, mole fraction), normalised (hashable).

    >>> composition({"O2": 1.0, "N2": 3.0})
    (('N2', 0.75), ('O2', 0.25))
    """
    return tuple(sorted(mixtures.normalize(X).items()))


@dataclass(frozen=True)
class Conditions:
    """A grid of initial states: every combination of ``fuels`` and ``oxidizers`` (mole
    fractions), ``phis`` [-], ``temperatures_K`` [K] and ``pressures_Pa`` [Pa]."""
    fuels: tuple[Mapping[str, float], ...]
    oxidizers: tuple[Mapping[str, float], ...]
    phis: tuple[float, ...]
    temperatures_K: tuple[float, ...]
    pressures_Pa: tuple[float, ...]

    def points(self) -> list[Point]:
        """The grid's (fuel, oxidizer, phi, T [K], p [Pa]) points, fuel slowest."""
        return list(itertools.product([composition(f) for f in self.fuels], [composition(o) for o in self.oxidizers],
                                      self.phis, self.temperatures_K, self.pressures_Pa))


def _midpoints(values: Sequence[float], geometric: bool) -> tuple[float, ...]:
    v = sorted(set(float(x) for x in values))
    if len(v) == 1:
        return (v[0],)
    if geometric:
        return tuple(math.sqrt(a * b) for a, b in zip(v, v[1:]))
    return tuple(0.5 * (a + b) for a, b in zip(v, v[1:]))


def _mean(a: Mapping[str, float], b: Mapping[str, float]) -> dict[str, float]:
    """The fuel half-way between two (the equimolar mix of the two streams)."""
    A, B = dict(composition(a)), dict(composition(b))
    return {k: 0.5 * (A.get(k, 0.0) + B.get(k, 0.0)) for k in sorted(set(A) | set(B))}


def between(training: Conditions) -> Conditions:
    """Validation conditions half-way between neighbouring training values: arithmetic
    means of equivalence ratios and temperatures, geometric means of pressures (delays
    scale as a power of p), equimolar mixes of neighbouring fuels in their given order
    (a blend ladder gives the blends between). Oxidizers and an axis with one value are
    kept; at least one axis must have two values, so that no validation point is a
    training point.

    >>> c = between(Conditions(({"CH4": 1},), ({"O2": 1, "N2": 3.76},), (0.7, 1.3), (1400.0,), (1e5, 1e6)))
    >>> [p[2:] for p in c.points()]
    [(1.0, 1400.0, 316227.7660168379)]
    """
    if len(training.fuels) < 2 and all(len(set(v)) < 2 for v in (training.phis, training.temperatures_K,
                                                                  training.pressures_Pa)):
        raise ValueError("the training conditions have one value on every axis: nothing lies between them")
    fuels = tuple(_mean(a, b) for a, b in zip(training.fuels, training.fuels[1:])) or training.fuels
    return Conditions(fuels, training.oxidizers, _midpoints(training.phis, False),
                      _midpoints(training.temperatures_K, False), _midpoints(training.pressures_Pa, True))
