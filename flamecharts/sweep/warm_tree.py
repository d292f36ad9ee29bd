"""The warm-start tree: which stored or planned flame each point of a study starts from.

Every point starts from its nearest neighbour in a normalised (phi, fuel composition,
log p, T_u) distance, among the points of the study and the flames stored by earlier
runs (:func:`warm_tree`). Points farther than MAX_WARM_DISTANCE from everything are
solved from scratch, starting with the one nearest SEED_PHI (hot, fast flames converge
most reliably from scratch). The tree depends on the points and the store only, never
on timing or worker count, so answers do not depend on the backend.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .points import Point

#: Flames solved from scratch are chosen nearest this equivalence ratio.
SEED_PHI = 1.05

#: One unit of the normalised distance between two flames, per coordinate, fitted to
#: measured warm-start costs so that one unit costs about the same solver time on every
#: axis (figures in docs/benchmarks.md). The fuel coordinate is the total-variation
#: distance of the fuel-stream mole fractions (0.15 for a blend-fraction step of 0.15);
#: a quarter of the fuel replaced is one unit, so the tree steps across blends (cheap)
#: before it steps along phi (dearer).
DISTANCE_SCALES = {"phi": 0.1, "fuel": 0.25, "ln_p": math.log(1.6), "T_u": 50.0}

#: A point farther than this (in units of DISTANCE_SCALES) from every solved or stored
#: flame is solved from scratch: a factor-5 pressure jump (3.4 units) warm-starts more
#: slowly than a fresh solve (docs/benchmarks.md).
MAX_WARM_DISTANCE = 3.0


@dataclass(frozen=True)
class StoredFlame:
    """A burning flame in the store that may warm-start a point of this study."""

    key: str
    family: str
    phi: float
    pressure_bar: float
    T_u: float
    X_flame: dict  # the fuel stream the flame burned


@dataclass
class WarmPlan:
    """Which flame each point warm-starts from.

    parent : point index -> index of the point of this plan it starts from (None: none)
    stored : point index -> key of the stored flame it starts from (earlier runs)
    roots : points solved from scratch, in the order they were chosen
    height : point index -> number of points on the longest warm-start path below it,
        itself included (hand out the highest first to keep every worker busy to the end)
    distance : point index -> normalised distance to its source (inf for roots)
    """

    parent: dict[int, int | None]
    stored: dict[int, str]
    roots: list[int]
    height: dict[int, int]
    distance: dict[int, float]

    @property
    def depth(self) -> int:
        """Points on the longest warm-start path of the plan."""
        return max(self.height.values(), default=0)

    def pending(self, todo: set[int], keys: dict[int, str]) -> "WarmPlan":
        """The part of this plan still to solve: the points in ``todo``, where a point whose
        source is already solved (outside ``todo``; ``keys`` gives its store key) starts
        from that stored flame.

        >>> p = WarmPlan(parent={0: None, 1: 0, 2: 1}, stored={}, roots=[0],
        ...              height={0: 3, 1: 2, 2: 1}, distance={0: math.inf, 1: 1.0, 2: 1.0})
        >>> q = p.pending({1, 2}, {0: "k0"})
        >>> q.parent, q.stored, q.roots
        ({1: None, 2: 1}, {1: 'k0'}, [])
        """
        parent, stored = {}, {}
        for i in todo:
            par = self.parent[i]
            parent[i] = par if par in todo else None
            if par is not None and par not in todo:
                stored[i] = keys[par]
            elif par is None and i in self.stored:
                stored[i] = self.stored[i]
        return WarmPlan(parent=parent, stored=stored, roots=[i for i in self.roots if i in todo],
                        height={i: self.height[i] for i in todo},
                        distance={i: self.distance[i] for i in todo})


def _coordinates(items, species: list[str]) -> tuple[np.ndarray, np.ndarray]:
    """(phi, ln p, T) scaled to DISTANCE_SCALES, and fuel mole fractions scaled likewise."""
    s = DISTANCE_SCALES
    scal = np.array([[it.phi / s["phi"], math.log(it.pressure_bar) / s["ln_p"], it.T_u / s["T_u"]]
                     for it in items], dtype=float).reshape(-1, 3)
    fuel = np.array([[float(it.X_flame.get(k, 0.0)) for k in species] for it in items],
                    dtype=float).reshape(-1, len(species))
    return scal, fuel / s["fuel"]


def warm_distance(scal_a: np.ndarray, fuel_a: np.ndarray, scal_b: np.ndarray, fuel_b: np.ndarray) -> np.ndarray:
    """Normalised distance from one flame (a: 1-D coordinates) to many (b: rows).

    Euclidean in (phi, ln p, T_u) and the total-variation distance of the fuel stream,
    each divided by its scale in DISTANCE_SCALES.

    >>> a = np.array([10.0, 0.0, 6.0]); b = np.array([[9.0, 0.0, 6.0], [10.0, 1.0, 6.0]])
    >>> fa = np.array([10.0, 0.0]); fb = np.array([[10.0, 0.0], [7.0, 3.0]])
    >>> [round(float(v), 3) for v in warm_distance(a, fa, b, fb)]
    [1.0, 3.162]
    """
    d2 = ((scal_b - scal_a) ** 2).sum(axis=1) + (0.5 * np.abs(fuel_b - fuel_a).sum(axis=1)) ** 2
    return np.sqrt(d2)


def warm_tree(pts: list[Point], stored: list[StoredFlame] = ()) -> WarmPlan:
    """Plan the warm starts of ``pts``: each point starts from its nearest neighbour.

    A greedy spanning tree (Prim's order): repeatedly take the unsolved point nearest to
    any flame already solved or planned (stored flames of earlier runs included) and
    warm-start it from that flame; when every remaining point is farther than
    MAX_WARM_DISTANCE, the one nearest SEED_PHI (then lowest pressure, highest preheat)
    becomes a new root, solved from scratch. Points only warm-start from flames of the
    same family (settings and oxidizer). The plan depends only on the points and the
    stored flames, never on timing, so a run gives the same answers however many
    workers it has.
    """
    pts = sorted(pts, key=lambda p: p.index)  # ties go to the earlier point of the study
    n = len(pts)
    if n == 0:
        return WarmPlan(parent={}, stored={}, roots=[], height={}, distance={})
    species = sorted({k for p in pts for k in p.X_flame} | {k for f in stored for k in f.X_flame})
    scal, fuel = _coordinates(pts, species)
    fam = np.array([p.family for p in pts], dtype=object)
    best = np.full(n, np.inf)
    src: list[tuple[str, int | str] | None] = [None] * n

    def relax(s_scal, s_fuel, s_family, label) -> None:
        d = warm_distance(s_scal, s_fuel, scal, fuel)
        d[fam != s_family] = np.inf
        better = d < best
        best[better] = d[better]
        for i in np.flatnonzero(better):
            src[i] = label

    if stored:
        st_scal, st_fuel = _coordinates(stored, species)
        for j, f in enumerate(stored):
            relax(st_scal[j], st_fuel[j], f.family, ("stored", f.key))
    open_ = np.ones(n, dtype=bool)
    parent: dict[int, int | None] = {}
    stored_of: dict[int, str] = {}
    roots: list[int] = []
    distance: dict[int, float] = {}
    order: list[int] = []
    for _ in range(n):
        cand = np.where(open_, best, np.nan)
        i = int(np.nanargmin(cand))
        if best[i] > MAX_WARM_DISTANCE:
            i = min(np.flatnonzero(open_), key=lambda k: (abs(pts[k].phi - SEED_PHI), pts[k].phi,
                                                          pts[k].pressure_bar, -pts[k].T_u, k))
            parent[i] = None
            roots.append(i)
            distance[i] = math.inf
        else:
            kind, ref = src[i]
            parent[i] = ref if kind == "point" else None
            if kind == "stored":
                stored_of[i] = ref
            distance[i] = float(best[i])
        open_[i] = False
        best[i] = np.inf
        order.append(i)
        relax(scal[i], fuel[i], fam[i], ("point", i))
        best[~open_] = np.inf
    height = {i: 1 for i in range(n)}
    for i in reversed(order):
        if parent[i] is not None:
            height[parent[i]] = max(height[parent[i]], height[i] + 1)
    ix = [p.index for p in pts]  # positions in pts -> point indices
    return WarmPlan(parent={ix[i]: (None if parent[i] is None else ix[parent[i]]) for i in range(n)},
                    stored={ix[i]: k for i, k in stored_of.items()}, roots=[ix[i] for i in roots],
                    height={ix[i]: h for i, h in height.items()}, distance={ix[i]: d for i, d in distance.items()})
