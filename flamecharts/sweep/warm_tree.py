"""The warm-start tree: which stored or planned flame each point of a study starts from.

Every point starts from its nearest neighbour in a normalised (phi, fuel composition,
log p, T_u) distance, among the points of the study and the flames stored by earlier
runs (:func:`warm_tree`). Points farther than MAX_WARM_DISTANCE from everything are
solved from scratch, starting with the one nearest SEED_PHI (hot, fast flames converge
most reliably from scratch). The tree depends on the points and the store only, never
on timing or worker count, so answers do not depend on the backend.
"""
from __future__ import annotations

import heapq
import math
from collections.abc import Sequence
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

    def pending(self, todo: set[int], keys: dict[int, str]) -> WarmPlan:
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
    scal = np.column_stack([np.array([it.phi for it in items], dtype=float) / s["phi"],
                            np.array([math.log(it.pressure_bar) for it in items], dtype=float) / s["ln_p"],
                            np.array([it.T_u for it in items], dtype=float) / s["T_u"]]).reshape(-1, 3)
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


def warm_tree(pts: list[Point], stored: Sequence[StoredFlame] = ()) -> WarmPlan:
    """Plan the warm starts of ``pts``: each point starts from its nearest neighbour.

    A greedy spanning tree (Prim's order, Prim 1957): repeatedly take the unsolved point
    nearest to any flame already solved or planned (stored flames of earlier runs
    included; ties: the earlier point of the study, then the source solved first, stored
    flames before points) and warm-start it from that flame; when every remaining point
    is farther than MAX_WARM_DISTANCE, the one nearest SEED_PHI (then lowest pressure,
    highest preheat) becomes a new root, solved from scratch. Points only warm-start from
    flames of the same family (settings and oxidizer). The plan depends only on the points
    and the stored flames, never on timing or their order, so a run gives the same answers
    however many workers it has.

    The greedy order is run over a sparse graph that holds every pair the greedy step can
    pick (:func:`_candidate_pairs`) with a heap, so a study of N points costs
    O(N log N) rather than the O(N^2) of the greedy step over all pairs
    (:func:`_warm_tree_dense`, the definition, gives the same plan).
    """
    if not pts:
        return WarmPlan(parent={}, stored={}, roots=[], height={}, distance={})
    pts, species, scal, fuel, fam = _prepare(pts, stored)
    n = len(pts)
    best, src = _stored_sources(scal, fuel, fam, stored, species)
    u, v, w = _candidate_pairs(scal, fuel, fam)
    seed = _seed_order(pts)
    return _as_plan(pts, *_greedy_tree(best, src, _adjacency(n, u, v, w), seed))


def _prepare(pts, stored) -> tuple[list[Point], list[str], np.ndarray, np.ndarray, np.ndarray]:
    """The points by index (ties go to the earlier point of the study), the fuel species of
    points and stored flames, the points' scaled coordinates and their families."""
    pts = sorted(pts, key=lambda p: p.index)
    species = sorted({k for p in pts for k in p.X_flame} | {k for f in stored for k in f.X_flame})
    scal, fuel = _coordinates(pts, species)
    return pts, species, scal, fuel, np.array([p.family for p in pts], dtype=object)


def _as_plan(pts: list[Point], parent: dict, stored_of: dict, roots: list, distance: dict, order: list) -> WarmPlan:
    """The WarmPlan of a tree over positions in ``pts`` (taken in ``order``), by point index."""
    ix = [p.index for p in pts]
    height = _heights(parent, order)
    return WarmPlan(parent={ix[i]: (None if parent[i] is None else ix[parent[i]]) for i in range(len(pts))},
                    stored={ix[i]: k for i, k in stored_of.items()}, roots=[ix[i] for i in roots],
                    height={ix[i]: h for i, h in height.items()}, distance={ix[i]: d for i, d in distance.items()})


#: Axis gaps (in units of DISTANCE_SCALES) below this are too close for the grid shortcut
#: of :func:`_grid_pairs` to hold in floating point; such a family takes every pair in range.
MIN_GRID_GAP = 1e-6

#: Slack for comparing distances computed in different ways (k-d tree against exact).
_SLACK = 1e-9

#: A family with more distinct fuel streams than this takes every pair in range (the
#: fuel-neighbour test of :func:`_fuel_pairs` costs the cube of their number).
MAX_GRID_FUELS = 200


def _pair_distance(scal: np.ndarray, fuel: np.ndarray, u: np.ndarray, v: np.ndarray,
                   scal_v: np.ndarray | None = None, fuel_v: np.ndarray | None = None) -> np.ndarray:
    """:func:`warm_distance` of the pairs (u[k], v[k]), row by row, with the same
    floating-point operations (the same numbers to the last bit); v indexes ``scal_v``
    and ``fuel_v`` when they are given (stored flames), else ``scal`` and ``fuel``.

    >>> s = np.array([[10.0, 0.0, 6.0], [9.0, 0.0, 6.0]]); f = np.array([[4.0, 0.0], [2.0, 2.0]])
    >>> [round(float(x), 3) for x in _pair_distance(s, f, np.array([0]), np.array([1]))]
    [2.236]
    """
    sv = scal if scal_v is None else scal_v
    fv = fuel if fuel_v is None else fuel_v
    d2 = ((sv[v] - scal[u]) ** 2).sum(axis=1) + (0.5 * np.abs(fv[v] - fuel[u]).sum(axis=1)) ** 2
    return np.sqrt(d2)


def _embedding(scal: np.ndarray, fuel: np.ndarray) -> np.ndarray:
    """Euclidean coordinates whose distance never exceeds :func:`warm_distance`: the fuel
    term's L1 norm is bounded below by its L2 norm, so a k-d tree (Bentley 1975) on these
    finds every flame within a radius, and a few more to check exactly."""
    return np.hstack([scal, 0.5 * fuel])


def _stored_sources(scal: np.ndarray, fuel: np.ndarray, fam: np.ndarray, stored, species: list[str]):
    """For each point (rows of ``scal``/``fuel``), the nearest stored flame of its family
    within MAX_WARM_DISTANCE: (distance array, inf where none; list of stored keys or None).
    Ties go to the flame listed first. The k nearest in :func:`_embedding` are checked
    exactly, doubling k until the k-th is farther than the nearest found (exact, since the
    embedding never overestimates).
    """
    n = len(scal)
    best = np.full(n, np.inf)
    src: list[str | None] = [None] * n
    if not stored:
        return best, src
    st_scal, st_fuel = _coordinates(stored, species)
    st_fam = np.array([f.family for f in stored], dtype=object)
    for family in sorted(set(fam.tolist()) & set(st_fam.tolist())):
        rows = np.flatnonzero(fam == family)
        cols = np.flatnonzero(st_fam == family)  # in listed order
        d, j = _nearest_stored(scal[rows], fuel[rows], st_scal[cols], st_fuel[cols])
        best[rows] = d
        for r, jj in zip(rows[np.isfinite(d)].tolist(), j[np.isfinite(d)].tolist()):
            src[r] = stored[cols[jj]].key
    return best, src


def _nearest_stored(p_scal, p_fuel, s_scal, s_fuel) -> tuple[np.ndarray, np.ndarray]:
    """Nearest of the flames s to each point p, within MAX_WARM_DISTANCE: (distance, inf
    where none; position among s, lowest on ties)."""
    from scipy.spatial import cKDTree

    n, ns = len(p_scal), len(s_scal)
    tree = cKDTree(_embedding(s_scal, s_fuel))
    p_emb = _embedding(p_scal, p_fuel)
    best, which = np.full(n, np.inf), np.zeros(n, dtype=np.int64)
    todo, k = np.arange(n), min(8, ns)
    while todo.size:
        d_emb, idx = tree.query(p_emb[todo], k=k, distance_upper_bound=MAX_WARM_DISTANCE + _SLACK)
        d_emb, idx = d_emb.reshape(len(todo), k), idx.reshape(len(todo), k)
        r, c = np.nonzero(idx < ns)
        d = _pair_distance(p_scal, p_fuel, todo[r], idx[r, c], s_scal, s_fuel)
        keep = d <= MAX_WARM_DISTANCE
        r, j, d = r[keep], idx[r, c][keep], d[keep]
        first = np.lexsort((j, d, r))  # per row: nearest, then listed first
        r, j, d = r[first], j[first], d[first]
        head = np.ones(len(r), dtype=bool)
        head[1:] = r[1:] != r[:-1]
        row_best = np.full(len(todo), np.inf)
        row_best[r[head]] = d[head]
        which[todo[r[head]]] = j[head]
        best[todo] = row_best
        done = (k >= ns) | ~np.isfinite(d_emb[:, -1]) | (d_emb[:, -1] > row_best + _SLACK)
        todo, k = todo[~done], min(4 * k, ns)
    return best, which


def _candidate_pairs(scal: np.ndarray, fuel: np.ndarray, fam: np.ndarray):
    """Pairs of points (u, v, distance) within MAX_WARM_DISTANCE that the greedy step of
    :func:`warm_tree` may ever pick, per family: the neighbours on the sweep grid
    (:func:`_grid_pairs`), or every pair in range when a family's points are not a full
    cartesian grid.
    """
    us, vs = [], []
    for family in sorted(set(fam.tolist())):
        rows = np.flatnonzero(fam == family)
        pair = _grid_pairs(scal[rows], fuel[rows])
        if pair is None:
            pair = _pairs_in_range(scal[rows], fuel[rows])
        us.append(rows[pair[0]])
        vs.append(rows[pair[1]])
    u, v = np.concatenate(us), np.concatenate(vs)
    w = _pair_distance(scal, fuel, u, v)
    keep = w <= MAX_WARM_DISTANCE
    return u[keep], v[keep], w[keep]


def _pairs_in_range(scal: np.ndarray, fuel: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Every pair of points that may lie within MAX_WARM_DISTANCE (a k-d tree ball search
    in :func:`_embedding`, Bentley 1975; a superset, checked exactly by the caller)."""
    from scipy.spatial import cKDTree

    pairs = cKDTree(_embedding(scal, fuel)).query_pairs(MAX_WARM_DISTANCE + _SLACK, output_type="ndarray")
    return pairs[:, 0], pairs[:, 1]


def _grid_pairs(scal: np.ndarray, fuel: np.ndarray) -> tuple[np.ndarray, np.ndarray] | None:
    """The pairs of a cartesian grid (fuel streams x ln p x T_u x phi) that the greedy step
    may pick: neighbours along one axis (next value on phi, ln p, T_u; on the fuel axis the
    pairs of :func:`_fuel_pairs`). None when the points are not a full grid, hold a
    repeated point, or lie closer than MIN_GRID_GAP on an axis.

    Why this suffices: for a pair (a, b) that differs on two axes, or skips a value of
    one, the grid holds a point c nearer to both (change one axis; the next value), so
    whichever of c is solved or not, the greedy step picks a nearer pair than (a, b) --
    the pair is not in the relative neighbourhood graph (Toussaint 1980), which holds
    every edge a greedy spanning tree takes.
    """
    axes = [np.unique(scal[:, k], return_inverse=True) for k in range(3)]
    fuels, f_inv = np.unique(fuel, axis=0, return_inverse=True)
    shape = (len(fuels),) + tuple(len(a[0]) for a in axes)
    if len(fuels) > MAX_GRID_FUELS or int(np.prod(shape)) != len(scal):
        return None
    if any(len(a[0]) > 1 and np.diff(a[0]).min() < MIN_GRID_GAP for a in axes):
        return None
    cell = np.full(shape, -1, dtype=np.int64)
    cell[(f_inv.ravel(),) + tuple(a[1].ravel() for a in axes)] = np.arange(len(scal))
    if (cell < 0).any():
        return None  # a repeated point
    fpairs = _fuel_pairs(fuels)
    if fpairs is None:
        return None
    us, vs = [], []
    for ax in (1, 2, 3):
        m = shape[ax]
        us.append(np.take(cell, range(m - 1), axis=ax).ravel())
        vs.append(np.take(cell, range(1, m), axis=ax).ravel())
    for a, b in fpairs:
        us.append(cell[a].ravel())
        vs.append(cell[b].ravel())
    return np.concatenate(us), np.concatenate(vs)


def _fuel_pairs(fuels: np.ndarray) -> list[tuple[int, int]] | None:
    """Pairs of distinct fuel streams (rows, scaled mole fractions) with no third stream
    nearer to both (total-variation distance, with a margin of _SLACK): the relative
    neighbourhood graph of the fuel axis (Toussaint 1980). None when two streams lie
    closer than MIN_GRID_GAP.

    >>> f = np.array([[4.0, 0.0], [3.0, 1.0], [2.0, 2.0]])  # a blend at 0, 25 and 50 %
    >>> _fuel_pairs(f)
    [(0, 1), (1, 2)]
    """
    m = len(fuels)
    tv = 0.5 * np.abs(fuels[:, None, :] - fuels[None, :, :]).sum(axis=2)
    if m > 1 and tv[~np.eye(m, dtype=bool)].min() < MIN_GRID_GAP:
        return None
    out = []
    for a in range(m):
        for b in range(a + 1, m):
            lim = tv[a, b] - _SLACK
            if not np.any((tv[a] < lim) & (tv[b] < lim)):
                out.append((a, b))
    return out


def _adjacency(n: int, u: np.ndarray, v: np.ndarray, w: np.ndarray) -> tuple[list[int], list[int], list[float]]:
    """Both directions of every pair in compressed rows: the neighbours of point i are
    ``nbr[start[i]:start[i + 1]]`` at distances ``dist[...]`` (plain lists: fast to walk)."""
    a, b, d = np.concatenate([u, v]), np.concatenate([v, u]), np.concatenate([w, w])
    order = np.argsort(a, kind="stable")
    start = np.concatenate([[0], np.cumsum(np.bincount(a, minlength=n))])
    return start.tolist(), b[order].tolist(), d[order].tolist()


def _seed_order(pts: list[Point]) -> list[int]:
    """Positions of ``pts`` in the order roots are taken: nearest SEED_PHI, then the leaner,
    the lower pressure, the higher preheat, the earlier point."""
    return sorted(range(len(pts)), key=lambda k: (abs(pts[k].phi - SEED_PHI), pts[k].phi,
                                                  pts[k].pressure_bar, -pts[k].T_u, k))


def _greedy_tree(best: np.ndarray, src: list, adj: tuple, seed: list[int]):
    """Prim's greedy order (Prim 1957) over a sparse graph with a binary heap and lazy
    deletion: O(E log E) for E pairs. ``best``/``src``: each point's distance to, and key
    of, its nearest stored flame (inf/None). Returns parent (position or None), stored
    source keys, roots, distances and the order points were taken.
    """
    n = len(best)
    start, nbr, dist = adj
    key = best.tolist()
    source: list = list(src)  # a stored key (str) or a position (int)
    heap = [(d, i) for i, d in enumerate(key) if d <= MAX_WARM_DISTANCE]
    heapq.heapify(heap)
    closed = bytearray(n)
    parent: dict[int, int | None] = {}
    stored_of: dict[int, str] = {}
    roots: list[int] = []
    distance: dict[int, float] = {}
    order: list[int] = []
    next_seed = iter(seed)
    for _ in range(n):
        while heap and (closed[heap[0][1]] or heap[0][0] != key[heap[0][1]]):
            heapq.heappop(heap)  # taken already, or reached more closely since
        if heap:
            d, i = heapq.heappop(heap)
            ref = source[i]
            parent[i] = ref if isinstance(ref, int) else None
            if isinstance(ref, str):
                stored_of[i] = ref
            distance[i] = d
        else:  # nothing within MAX_WARM_DISTANCE of a solved flame: a new root
            i = next(k for k in next_seed if not closed[k])
            parent[i] = None
            roots.append(i)
            distance[i] = math.inf
        closed[i] = 1
        order.append(i)
        for j, d in zip(nbr[start[i]:start[i + 1]], dist[start[i]:start[i + 1]]):
            if d < key[j] and not closed[j]:
                key[j] = d
                source[j] = i
                heapq.heappush(heap, (d, j))
    return parent, stored_of, roots, distance, order


def _heights(parent: dict[int, int | None], order: list[int]) -> dict[int, int]:
    """Points on the longest warm-start path below each point, itself included."""
    height = {i: 1 for i in parent}
    for i in reversed(order):
        up = parent[i]
        if up is not None:
            height[up] = max(height[up], height[i] + 1)
    return height


def _warm_tree_dense(pts: list[Point], stored: Sequence[StoredFlame] = ()) -> WarmPlan:
    """The plan of :func:`warm_tree` by its definition, the greedy step over all pairs:
    O(N^2) time (tests and benchmarks check the fast plan against it).
    """
    if not pts:
        return WarmPlan(parent={}, stored={}, roots=[], height={}, distance={})
    pts, species, scal, fuel, fam = _prepare(pts, stored)
    n = len(pts)
    best = np.full(n, np.inf)
    src: list[tuple[str, int | str] | None] = [None] * n

    def relax(s_scal: np.ndarray, s_fuel: np.ndarray, s_family: str, label: tuple[str, int | str]) -> None:
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
            i = int(min(np.flatnonzero(open_), key=lambda k: (abs(pts[k].phi - SEED_PHI), pts[k].phi,
                                                          pts[k].pressure_bar, -pts[k].T_u, k)))
            parent[i] = None
            roots.append(i)
            distance[i] = math.inf
        else:
            entry = src[i]
            assert entry is not None  # best[i] is finite: relax() labelled it
            kind, ref = entry
            parent[i] = int(ref) if kind == "point" else None
            if kind == "stored":
                stored_of[i] = str(ref)
            distance[i] = float(best[i])
        open_[i] = False
        best[i] = np.inf
        order.append(i)
        relax(scal[i], fuel[i], fam[i], ("point", i))
        best[~open_] = np.inf
    return _as_plan(pts, parent, stored_of, roots, distance, order)
