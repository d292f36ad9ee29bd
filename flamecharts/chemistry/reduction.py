"""Skeletal mechanisms reduced for a study's own conditions, with their ignition-delay error measured.

Conditions           a grid of equivalence ratios, temperatures and pressures (the sampled states;
                     physics.sampling, with between: the conditions half-way between neighbouring
                     grid values, a validation set)
ignition_states      reacting states along constant-pressure autoignition trajectories
stoichiometry        net stoichiometric and participation matrices of a mechanism (sparse)
direct_interactions  DRGEP's direct interaction coefficients r_AB at one state
path_coefficients    DRGEP's overall coefficients R_TB: the strongest path from each target
target_scaling       the share of an element's net flux a target carries (optional scaling)
species_importance   max over states and targets of R_TB (optionally scaled)
always_kept          fuel, oxidizer, inert and target species: never removed
kept_species         the species of a skeletal mechanism at threshold epsilon
skeletal_solution    the skeletal mechanism as a Cantera Solution (transport data kept)
write_mechanism      its Cantera YAML, written deterministically; mechanism_sha256 its hash
ignition_delays      constant-pressure ignition delays (peak dT/dt)
candidates           the distinct skeletal species sets of a threshold ladder, smallest first
reduce_for_ignition  the smallest skeletal mechanism on an epsilon ladder whose largest
                     ignition-delay error on a validation set stays within a target

The method is the directed relation graph with error propagation (DRGEP) of
Pepiot-Desjardins & Pitsch, "An efficient error-propagation-based reduction method for
large chemical kinetic mechanisms", Combust. Flame 154 (2008) 67-81: the direct
interaction coefficient

    r_AB = |sum_i nu_A,i w_i delta_B,i| / max(P_A, C_A),
    P_A = sum_i max(0, nu_A,i w_i),  C_A = sum_i max(0, -nu_A,i w_i),

(w_i the net rate of progress of reaction i, nu_A,i the net stoichiometric coefficient of
A in it, delta_B,i = 1 if B is a reactant or product of reaction i, else 0) measures the
error made in A's production or consumption rate by removing B; along a path the errors
multiply, and the overall coefficient R_TB of species B for target T is the largest
product over all paths from T to B. The largest product is found by Dijkstra's algorithm
on weights -ln r (Niemeyer & Sung, Combust. Flame 158 (2011) 1439-1443, show that a
Dijkstra search gives results independent of species order, where depth-first searches
do not). A species' importance is the largest R_TB over the sampled states and targets;
the skeletal mechanism at threshold epsilon keeps the species of importance >= epsilon
and the reactions all of whose reactants and products are kept.
"""
from __future__ import annotations

import hashlib
import json
import math
import os
import tempfile
import time
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import cantera as ct
import numpy as np
import numpy.typing as npt
from scipy import sparse
from scipy.sparse.csgraph import dijkstra

from ..physics import mixtures
from ..physics.sampling import Composition, Conditions, Point, between, composition  # noqa: F401 - re-exported
from .ignition import peak_ignition_delay

#: Species kept whatever their coefficients: the usual inert diluents, where present.
INERTS = ("N2", "AR", "HE")
#: Temperature rises [K] at which the induction period is sampled, before the regular steps.
EARLY_RISES_K = (1.0, 3.0, 10.0, 30.0)
#: Before the first of EARLY_RISES_K, where the radical pool builds up at nearly constant
#: temperature, a state is also taken at every time of this ladder [s] (4 per decade from
#: 10 ns): on the n-hexane mechanism it cut the largest delay error of the skeletal
#: mechanisms of one threshold by a fifth (docs/benchmarks.md, "Mechanism reduction").
INDUCTION_TIMES_S = tuple(1e-8 * 10 ** (k / 4) for k in range(41))
#: Chain carriers that are targets besides the fuel and O2 by default: the H atom of the
#: branching step H + O2 -> O + OH, which controls high-temperature ignition. A choice made
#: here on measurements (docs/benchmarks.md, "Mechanism reduction"), not the paper's.
CHAIN_CARRIERS = ("H",)
#: Temperature rises beyond this [K] are not sampled on the regular steps (no mixture rises further).
MAX_RISE_K = 4000.0

@dataclass(frozen=True)
class States:
    """Reacting states of one mechanism: temperature ``T`` [K] and pressure ``P`` [Pa]
    (shape n), mass fractions ``Y`` (n x species, in the mechanism's order)."""
    species: tuple[str, ...]
    T: np.ndarray
    P: np.ndarray
    Y: np.ndarray

    def __len__(self) -> int:
        return len(self.T)


def unburned(gas: ct.Solution, fuel: Mapping[str, float], oxidizer: Mapping[str, float], phi: float) -> dict[str, float]:
    """Mole fractions of fuel + oxidizer at equivalence ratio ``phi`` (physics.mixtures, with
    the mechanism's atom counts)."""
    atoms = {name: gas.species(name).composition for name in fuel}
    return mixtures.unburned_mixture(fuel, oxidizer, phi, mixtures.stoich_o2_per_fuel(atoms, fuel))


def _mixture(gas: ct.Solution, point: Point) -> tuple[dict[str, float], float, float]:
    fuel, oxidizer, phi, T, p = point
    return unburned(gas, dict(fuel), dict(oxidizer), phi), T, p


def _autoignite(gas: ct.Solution, X: Mapping[str, float], T0: float, P: float, t_max_s: float,
                rises_K: Sequence[float] = ()) -> tuple[float, list[tuple[float, float, np.ndarray]]]:
    """Integrate one autoignition from (T0 [K], P [Pa], X) for at most ``t_max_s`` [s]
    (chemistry.ignition.peak_ignition_delay, constant pressure).

    Returns the ignition delay [s] (time of the largest dT/dt, inf without a rise of
    MIN_IGNITION_RISE_K) and, when ``rises_K`` is given, the states (T, P, Y) taken at the
    start, at the times of INDUCTION_TIMES_S until the temperature rose by ``rises_K[0]``,
    when it first rose by each of ``rises_K`` [K] (ascending), and at the end. The run ends
    once ignited and dT/dt fell below 1 % of its peak.
    """
    gas.TPX = T0, P, dict(X)
    states = [(T0, P, gas.Y.copy())] if rises_K else []
    marks = {"rise": 0, "time": 0}

    def sample(t: float, T: float) -> None:
        passed, marked = marks["rise"], marks["time"]
        while marks["rise"] < len(rises_K) and T - T0 >= rises_K[marks["rise"]]:
            marks["rise"] += 1
        while marks["rise"] == 0 and marks["time"] < len(INDUCTION_TIMES_S) and t >= INDUCTION_TIMES_S[marks["time"]]:
            marks["time"] += 1
        if marks["rise"] > passed or marks["time"] > marked:
            states.append((T, P, gas.Y.copy()))

    tau = peak_ignition_delay(gas, X, T0, P, t_max_s, "pressure", sample if rises_K else None)
    if rises_K and states[-1][0] != gas.T:
        states.append((gas.T, P, gas.Y.copy()))
    return tau, states


def _rise_ladder(rise_step_K: float) -> list[float]:
    """EARLY_RISES_K, then every ``rise_step_K`` [K] up to a rise of MAX_RISE_K (rises
    beyond what a mixture reaches are never met)."""
    regular = [k * rise_step_K for k in range(1, int(MAX_RISE_K / rise_step_K) + 1)]
    return list(EARLY_RISES_K) + [r for r in regular if r > EARLY_RISES_K[-1]]


def ignition_states(gas: ct.Solution, conditions: Conditions, rise_step_K: float = 50.0, t_max_s: float = 1.0) -> States:
    """Reacting states sampled along adiabatic constant-pressure autoignition from every
    point of ``conditions``: the initial state, states at the times of INDUCTION_TIMES_S
    and at temperature rises of EARLY_RISES_K (the induction period), then every
    ``rise_step_K`` [K], and the last state (dT/dt below 1 % of its peak after ignition,
    or ``t_max_s`` [s]). Deterministic: the same inputs give the same states.

    Sampling autoignition over the conditions of use is the usual training set of graph-based
    reduction (Pepiot-Desjardins & Pitsch 2008; Lu & Law, Proc. Combust. Inst. 30 (2005) 1333).
    """
    T, P, Y = [], [], []
    ladder = _rise_ladder(rise_step_K)
    for point in conditions.points():
        X, T0, p = _mixture(gas, point)
        _, states = _autoignite(gas, X, T0, p, t_max_s, ladder)
        for s in states:
            T.append(s[0])
            P.append(s[1])
            Y.append(s[2])
    return States(tuple(gas.species_names), np.array(T), np.array(P), np.array(Y))


def stoichiometry(gas: ct.Solution) -> tuple[sparse.csr_matrix, sparse.csr_matrix]:
    """Net stoichiometric coefficients nu (products minus reactants, species x reactions)
    and the participation matrix delta (1 where the species is a reactant or product;
    third-body efficiencies do not count), both sparse."""
    index = {name: k for k, name in enumerate(gas.species_names)}
    rows, cols, nu, seen_r, seen_c = [], [], [], [], []
    for i, r in enumerate(gas.reactions()):
        net: dict[int, float] = {}
        for name, coeff in r.reactants.items():
            net[index[name]] = net.get(index[name], 0.0) - coeff
        for name, coeff in r.products.items():
            net[index[name]] = net.get(index[name], 0.0) + coeff
        for k, v in net.items():
            seen_r.append(k)
            seen_c.append(i)
            if v != 0.0:
                rows.append(k)
                cols.append(i)
                nu.append(v)
    shape = (gas.n_species, gas.n_reactions)
    nu_m = sparse.csr_matrix((nu, (rows, cols)), shape=shape)
    delta = sparse.csr_matrix((np.ones(len(seen_r)), (seen_r, seen_c)), shape=shape)
    return nu_m, delta


def direct_interactions(nu: sparse.spmatrix, delta: sparse.spmatrix, rates: npt.ArrayLike) -> sparse.csr_matrix:
    """DRGEP direct interaction coefficients (Pepiot-Desjardins & Pitsch 2008, eq. for r_AB):
    r_AB = |sum_i nu_A,i w_i delta_B,i| / max(P_A, C_A), with P_A and C_A the production
    and consumption rates of A (sums of the positive and negative nu_A,i w_i). Dimensionless,
    0 <= r_AB <= 1; r_AA and rows of species neither produced nor consumed are 0.

    Parameters
    ----------
    nu : net stoichiometric coefficients, species x reactions (:func:`stoichiometry`)
    delta : participation, species x reactions (1 where the species is a reactant or product)
    rates : net rates of progress w_i of the reactions [kmol/m3/s; any common unit]

    Returns
    -------
    sparse species x species matrix r_AB (row A depends on column B).

    Examples
    --------
    A -> B (w = 2), A + C -> D (w = 1), B -> C (w = 4): A is consumed at 3, of which 2
    through the reaction with B, so r_AB = 2/3.

    >>> nu = sparse.csr_matrix([[-1, -1, 0], [1, 0, -1], [0, -1, 1], [0, 1, 0]])
    >>> r = direct_interactions(nu, abs(nu), [2.0, 1.0, 4.0])
    >>> [round(float(r[a, b]), 6) for a, b in ((0, 1), (1, 2), (3, 1))]
    [0.666667, 1.0, 0.0]
    """
    flux = sparse.csr_matrix(nu, dtype=float) @ sparse.diags(np.asarray(rates, dtype=float))
    flux = sparse.csr_matrix(flux)
    produced = np.asarray(flux.maximum(0).sum(axis=1)).ravel()
    consumed = np.asarray((-flux).maximum(0).sum(axis=1)).ravel()
    scale = np.maximum(produced, consumed)
    inverse = np.divide(1.0, scale, out=np.zeros_like(scale), where=scale > 0)
    r = sparse.csr_matrix(abs(flux @ sparse.csr_matrix(delta, dtype=float).T))
    r = sparse.csr_matrix(sparse.diags(inverse) @ r)
    r.setdiag(0.0)
    r.data = np.minimum(r.data, 1.0)  # |partial sum| <= max(P_A, C_A); rounding only
    r.eliminate_zeros()
    return r


def path_coefficients(r: sparse.spmatrix, sources: Sequence[int]) -> np.ndarray:
    """DRGEP overall interaction coefficients R_TB = max over paths from T to B of the
    product of r along the path (Pepiot-Desjardins & Pitsch 2008), for each T in ``sources``
    (rows) and every species B (columns); R_TT = 1, 0 where no path leads.

    The largest product is the shortest path on weights -ln r >= 0 (r <= 1), found by
    Dijkstra's algorithm (Niemeyer & Sung 2011).

    >>> r = sparse.csr_matrix([[0, 2/3, 1/3, 1/3], [1/2, 0, 1, 0], [1/4, 1, 0, 1/4], [1, 0, 1, 0]])
    >>> path_coefficients(r, [0]).round(6).tolist()
    [[1.0, 0.666667, 0.666667, 0.333333]]
    """
    w = sparse.csr_matrix(r, dtype=float, copy=True)
    w.eliminate_zeros()
    # an edge of r = 1 weighs 0, which a sparse graph would read as no edge: the smallest
    # positive float instead (changes no product by a representable amount)
    w.data = np.maximum(-np.log(w.data), np.finfo(float).tiny)
    dist = dijkstra(w, directed=True, indices=list(sources))
    return np.exp(-np.atleast_2d(dist))


def target_scaling(atoms: np.ndarray, net_production: npt.ArrayLike, targets: Sequence[int]) -> np.ndarray:
    """Weight of each target at one state: alpha_T = max over elements e of
    N_e,T |wdot_T| / (1/2 sum_S N_e,S |wdot_S|), the share of element e's net flux carried by
    target T (0 <= alpha_T <= 1: by element conservation the half-sum is the element's total
    production, which equals its consumption). This is the target scaling of DRGEP
    (Pepiot-Desjardins & Pitsch 2008) as implemented here, written from the method's idea
    (a target that has burned out at a state weighs little there), not transcribed from the
    paper's equations.

    Parameters
    ----------
    atoms : atoms of each element in each species, species x elements
    net_production : net production rates wdot of the species [kmol/m3/s]
    targets : indices of the target species

    >>> target_scaling(np.array([[1.0], [2.0]]), [-2.0, 1.0], [0, 1]).tolist()
    [1.0, 1.0]
    """
    flux = np.asarray(atoms, dtype=float) * np.abs(np.asarray(net_production, dtype=float))[:, None]
    total = 0.5 * flux.sum(axis=0)
    share = np.divide(flux[list(targets)], total, out=np.zeros((len(targets), flux.shape[1])), where=total > 0)
    return np.asarray(np.minimum(share.max(axis=1), 1.0))


def species_importance(gas: ct.Solution, states: States, targets: Sequence[str], scaled: bool = False) -> dict[str, float]:
    """Importance of every species of ``gas``: the largest overall coefficient R_TB over the
    ``states`` and ``targets`` (DRGEP, Pepiot-Desjardins & Pitsch 2008), each target's
    coefficients multiplied by :func:`target_scaling` at the state when ``scaled``
    (default: not scaled, every target weighs 1 at every state). Targets themselves have 1
    unscaled. Dimensionless, in [0, 1], in the mechanism's order."""
    if tuple(states.species) != tuple(gas.species_names):
        raise ValueError("the states were sampled on another mechanism's species")
    unknown = [t for t in targets if t not in gas.species_names]
    if unknown:
        raise ValueError(f"target species not in the mechanism: {', '.join(unknown)}")
    idx = [gas.species_index(t) for t in targets]
    nu, delta = stoichiometry(gas)
    atoms = np.array([[gas.n_atoms(k, e) for e in range(gas.n_elements)] for k in range(gas.n_species)])
    best = np.zeros(gas.n_species)
    for T, P, Y in zip(states.T, states.P, states.Y):
        gas.TPY = T, P, Y
        R = path_coefficients(direct_interactions(nu, delta, gas.net_rates_of_progress), idx)
        if scaled:
            R = R * target_scaling(atoms, gas.net_production_rates, idx)[:, None]
        best = np.maximum(best, R.max(axis=0))
    if not scaled:
        best[idx] = 1.0
    return dict(zip(gas.species_names, best.tolist()))


def always_kept(gas: ct.Solution, streams: Iterable[Mapping[str, float]], targets: Iterable[str] = ()) -> tuple[str, ...]:
    """Species no threshold removes: those of the fuels and oxidizers (``streams``), the
    inerts of INERTS the mechanism has (any case), and ``targets``; in the mechanism's order."""
    want = {name for X in streams for name, x in X.items() if x > 0} | set(targets)
    unknown = sorted(want - set(gas.species_names))
    if unknown:
        raise ValueError(f"species not in the mechanism: {', '.join(unknown)}")
    return tuple(s for s in gas.species_names if s in want or s.upper() in INERTS)


def kept_species(importance: Mapping[str, float], epsilon: float, keep: Iterable[str]) -> tuple[str, ...]:
    """Species of the skeletal mechanism at threshold ``epsilon``: importance >= epsilon, or
    in ``keep``; in the order of ``importance``.

    >>> kept_species({"A": 1.0, "B": 0.2, "C": 0.01, "N2": 0.0}, 0.1, ["N2"])
    ('A', 'B', 'N2')
    """
    always = set(keep)
    return tuple(s for s, v in importance.items() if v >= epsilon or s in always)


def _reaction_data(gas: ct.Solution, kept: set[str]) -> list[dict]:
    """Input data of the reactions whose reactants, products, explicit collider and orders
    are all kept; third-body efficiencies of removed species dropped, a duplicate mark kept
    only where its duplicate is."""
    out = []
    for r in gas.reactions():
        if not (set(r.reactants) | set(r.products)) <= kept:
            continue
        d: dict[str, Any] = dict(r.input_data)
        if not set(d.get("orders", {})) <= kept:
            continue
        if r.third_body is not None and r.third_body.name != "M" and r.third_body.name not in kept:
            continue
        if "efficiencies" in d:
            d["efficiencies"] = {k: v for k, v in d["efficiencies"].items() if k in kept}
        sides = frozenset((frozenset(r.reactants.items()), frozenset(r.products.items())))  # either direction
        out.append((sides, d))
    count: dict[frozenset, int] = {}
    for key, _ in out:
        count[key] = count.get(key, 0) + 1
    for key, d in out:
        if d.get("duplicate") and count[key] < 2:
            del d["duplicate"]
    return [d for _, d in out]


def skeletal_solution(gas: ct.Solution, species: Iterable[str]) -> ct.Solution:
    """The mechanism of ``gas`` cut to ``species``: their thermodynamic and transport data
    (mixture-averaged transport when every kept species has transport data), and the
    reactions all of whose species are kept. Loaded at 300 K, 1 atm, the first species."""
    kept = set(species)
    names = [s for s in gas.species_names if s in kept]
    missing = sorted(kept - set(names))
    if missing:
        raise ValueError(f"species not in the mechanism: {', '.join(missing)}")
    data = [gas.species(s).input_data for s in names]
    phase = {k: v for k, v in gas.input_data.items() if k not in ("species", "reactions", "state", "transport")}
    phase["species"] = names
    if all("transport" in d for d in data):
        phase["transport"] = "mixture-averaged"
    doc = {"phases": [phase], "species": data, "reactions": _reaction_data(gas, kept)}
    return ct.Solution(yaml=json.dumps(doc))


def mechanism_sha256(text: str) -> str:
    """sha256 (hex) of a mechanism's YAML text, the text :func:`write_mechanism` writes.

    >>> mechanism_sha256("phases: []")[:12]
    '9c0aadce6780'
    """
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def mechanism_yaml(solution: ct.Solution, note: str = "") -> str:
    """Cantera's YAML of ``solution``, made deterministic (its ``date:`` line removed), after
    ``note`` as comment lines."""
    text = solution.write_yaml(None)
    body = "".join(line for line in text.splitlines(keepends=True) if not line.startswith("date:"))
    head = "".join(f"# {line}\n" for line in note.splitlines())
    return head + body


def write_mechanism(solution: ct.Solution, path: str | os.PathLike, note: str = "") -> str:
    """Write ``solution`` as Cantera YAML to ``path`` (atomically: a temporary file renamed)
    and return its sha256 (:func:`mechanism_sha256`). The same mechanism and note give the
    same file and hash under one Cantera version."""
    text = mechanism_yaml(solution, note)
    target = Path(path)
    fd, tmp = tempfile.mkstemp(dir=target.parent, prefix=target.name, suffix=".tmp")
    with os.fdopen(fd, "w", encoding="utf-8") as f:
        f.write(text)
    os.replace(tmp, target)
    return mechanism_sha256(text)


def ignition_delays(gas: ct.Solution, points: Sequence[Point], t_max_s: float | npt.ArrayLike = 1.0) -> np.ndarray:
    """Constant-pressure ignition delay [s] at each point (fuel, oxidizer, phi, T [K], p [Pa]): the
    time of the largest dT/dt in an adiabatic IdealGasConstPressureMoleReactor (one of the
    usual definitions: chemistry.ignition.peak_ignition_delay, the one integrator); inf where the
    temperature has not risen by MIN_IGNITION_RISE_K within ``t_max_s`` [s] (one value, or
    one per point)."""
    limits = np.broadcast_to(np.asarray(t_max_s, dtype=float), (len(points),))
    out = [_autoignite(gas, *_mixture(gas, point), limit)[0] for point, limit in zip(points, limits.tolist())]
    return np.array(out)


def delay_errors(skeletal: ct.Solution, points: Sequence[Point], reference: np.ndarray) -> tuple[float, ...]:
    """|tau / tau_ref - 1| of a candidate's ignition delays at ``points`` against the detailed
    mechanism's ``reference`` delays [s] (each integrated up to 10 times its reference)."""
    tau = ignition_delays(skeletal, points, 10.0 * reference)
    return tuple(float(abs(t / t_ref - 1.0)) for t, t_ref in zip(tau, reference))


def epsilon_ladder(high: float = 0.5, low: float = 1e-4, per_decade: int = 6) -> tuple[float, ...]:
    """Thresholds from ``high`` down to ``low``, ``per_decade`` per factor 10 (geometric).

    >>> [round(e, 4) for e in epsilon_ladder(0.1, 0.01, 2)]
    [0.1, 0.0316, 0.01]
    """
    n = int(round(per_decade * math.log10(high / low)))
    return tuple(high * (low / high) ** (k / n) for k in range(n + 1))


@dataclass(frozen=True)
class Candidate:
    """One skeletal mechanism tried: its threshold, species, reaction count, and relative
    ignition-delay error |tau_skeletal / tau_detailed - 1| at each validation point, and the
    CPU time its validation delays took."""
    epsilon: float
    species: tuple[str, ...]
    n_reactions: int
    errors: tuple[float, ...]
    cpu_s: float = 0.0  # CPU time of its validation delays [s]

    @property
    def max_error(self) -> float:
        return max(self.errors) if self.errors else 0.0


@dataclass(frozen=True)
class Reduction:
    """The outcome of :func:`reduce_for_ignition`. ``chosen`` is the smallest candidate whose
    largest validation error is within ``target``; the detailed mechanism itself
    (epsilon 0, errors 0) when no candidate of the ladder is. ``tried`` lists every candidate
    evaluated, smallest first. ``cpu_s`` is the CPU time [s] of each step (sampling,
    importance, detailed delays, candidates), for estimates of what a reduction costs."""
    chosen: Candidate
    tried: tuple[Candidate, ...]
    target: float
    importance: dict[str, float]
    always: tuple[str, ...]
    validation: tuple[Point, ...]
    detailed_delays_s: tuple[float, ...]
    n_states: int
    detailed: tuple[int, int]  # species, reactions
    cpu_s: dict[str, float]

    @property
    def reduced(self) -> bool:
        return self.chosen.epsilon > 0


def candidates(importance: Mapping[str, float], always: Sequence[str],
               ladder: Sequence[float]) -> Iterable[tuple[float, tuple[str, ...]]]:
    """(epsilon, species) for each distinct species set of the ladder, smallest first."""
    seen: set[tuple[str, ...]] = set()
    for eps in sorted(ladder, reverse=True):
        species = kept_species(importance, eps, always)
        if species not in seen and len(species) < len(importance):
            seen.add(species)
            yield eps, species


def _search(gas: ct.Solution, importance: Mapping[str, float], always: Sequence[str], ladder: Sequence[float],
            points: Sequence[Point], reference: np.ndarray, target: float) -> tuple[Candidate | None, tuple[Candidate, ...]]:
    """The first candidate of the ladder, smallest first, whose largest delay error at
    ``points`` (against the ``reference`` delays [s]) is within ``target``, and every
    candidate tried; None first when none is."""
    tried = []
    for eps, species in candidates(importance, always, ladder):
        skeletal = skeletal_solution(gas, species)
        start = time.process_time()
        errors = delay_errors(skeletal, points, reference)
        tried.append(Candidate(eps, species, skeletal.n_reactions, errors, time.process_time() - start))
        if tried[-1].max_error <= target:
            return tried[-1], tuple(tried)
    return None, tuple(tried)


def reduce_for_ignition(mechanism_path: str, training: Conditions, validation: Conditions | None = None,
                        targets: Sequence[str] = (), target: float = 0.10, ladder: Sequence[float] | None = None,
                        scaled: bool = False, rise_step_K: float = 50.0, t_max_s: float = 1.0,
                        carriers: Sequence[str] = CHAIN_CARRIERS) -> Reduction:
    """The smallest DRGEP skeletal mechanism whose ignition delays stay within ``target``
    (relative, default 10 %) of the detailed mechanism's at every validation point.

    Trains on autoignition states from ``training`` (:func:`ignition_states`), ranks the
    species by their importance for the fuel species, O2, the chain ``carriers`` the
    mechanism has (default CHAIN_CARRIERS) and ``targets`` (:func:`species_importance`),
    and tries the skeletal mechanisms of the ``ladder`` of
    thresholds (default :func:`epsilon_ladder`) from the smallest up, stopping at the first
    whose largest error over the ``validation`` points (default :func:`between` the training
    values; none may be a training point) is within ``target``. Fuel, oxidizer, inert,
    carrier and target species are always kept (:func:`always_kept`).

    A skeletal mechanism's delay is integrated for at most 10 times the detailed one, so a
    mechanism that no longer ignites costs little.
    """
    gas = ct.Solution(str(mechanism_path))
    validation = validation or between(training)
    points = validation.points()
    overlap = set(points) & set(training.points())
    if overlap:
        raise ValueError(f"validation points that are training points: {sorted(overlap)}")
    present = [s for s in carriers if s in gas.species_names]
    always = always_kept(gas, training.fuels + training.oxidizers + validation.fuels + validation.oxidizers,
                         list(targets) + present)
    fuel_species = [s for X in training.fuels for s, x in X.items() if x > 0]
    goals = list(dict.fromkeys(fuel_species + ["O2"] + present + list(targets)))
    cpu = {"start": time.process_time()}
    states = ignition_states(gas, training, rise_step_K, t_max_s)
    cpu["sampling"] = time.process_time()
    importance = species_importance(gas, states, goals, scaled)
    cpu["importance"] = time.process_time()
    reference = ignition_delays(gas, points, t_max_s)
    cpu["detailed delays"] = time.process_time()
    if not np.all(np.isfinite(reference)):
        bad = [p for p, tau in zip(points, reference) if not math.isfinite(tau)]
        raise ValueError(f"the detailed mechanism does not ignite within {t_max_s:g} s at {bad}")
    chosen, tried = _search(gas, importance, always, ladder or epsilon_ladder(), points, reference, target)
    if chosen is None:  # no candidate met the target: the detailed mechanism itself
        chosen = Candidate(0.0, tuple(gas.species_names), gas.n_reactions, (0.0,) * len(points),
                           cpu["detailed delays"] - cpu["importance"])
    cpu["candidates"] = time.process_time()
    steps = list(cpu)
    spent = {b: cpu[b] - cpu[a] for a, b in zip(steps, steps[1:])}
    return Reduction(chosen, tried, target, importance, always, tuple(points),
                     tuple(float(t) for t in reference), len(states), (gas.n_species, gas.n_reactions), spent)
