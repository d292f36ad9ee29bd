"""A skeletal mechanism for a study: the smallest DRGEP candidate whose ignition delays and flames
stay within their targets, each error measured on points it was not trained on.

FlameCase        one validation flame: unburned mixture, T_u [K], p [Pa]
FlameResult      what a validation flame gives: its speed, thickness and target species at its outlet
Targets          the largest relative errors allowed (ignition delay, flame speed, target species)
Tried            one candidate tried: its size and the errors that decided it
StudyReduction   the chosen candidate (or the detailed mechanism when none met every target),
                 its measured errors, every candidate tried and the CPU time of each step
reduce_for_study the search: rank species on autoignition states of the training conditions
                 (chemistry.reduction, DRGEP of Pepiot-Desjardins & Pitsch 2008), then try the
                 skeletal mechanisms of the threshold ladder from the smallest up; each must keep
                 its ignition delays at the validation points within their target and, where
                 flames are given, every flame's speed (and target species at its outlet) within
                 theirs: the flames of the detailed and of the skeletal mechanism solved alike,
                 from scratch on the study's grid settings
outlet_mole_fractions  the mole fractions of some species at a flame profile's burned end
detached         the species of an element's chemistry no candidate keeps (nitrogen's, unless a
                 stream or a target holds nitrogen besides N2)

Plain inputs and outputs (no Study): sweep.skeletal builds them from a study and stores the outcome.
"""
from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import cantera as ct
import numpy as np

from ..numerics import Numerics
from .flame import solve_flame
from .mechanism import solution
from .reduction import (
    CHAIN_CARRIERS,
    Conditions,
    Point,
    always_kept,
    candidates,
    delay_errors,
    epsilon_ladder,
    ignition_delays,
    ignition_states,
    skeletal_solution,
    species_importance,
)

#: Elements whose chemistry a flame-speed reduction may drop whole when no stream species (other
#: than the inert N2) and no target holds them: NO formation barely feeds back on the heat
#: release, and GRI-Mech 3.0 without its nitrogen species (N2 kept) gives methane-air flame
#: speeds within 0.05 % (measured, issue 32; docs/benchmarks.md), while the graph search ranks
#: them from the flame zone's radicals (CH + N2 -> HCN + N) above species the flame needs.
DETACHABLE = {"N": ("N2",)}

#: A candidate's warm-started screen refuses it only when its flame-speed error exceeds the target by
#: more than the first of these, or a target species' error by more than the second (fractions): the
#: screen compares warm-started flames of both mechanisms, the candidate that passes is judged on
#: flames from scratch, and the screen should not refuse what that judgement would pass.
SCREEN_MARGIN = (0.002, 0.02)

#: A target species is compared at a flame's outlet only where the detailed mechanism gives it at
#: least this mole fraction (1 ppm): the relative error of a trace is noise, not a finding.
SPECIES_FLOOR = 1e-6


@dataclass(frozen=True)
class FlameCase:
    """One validation flame: the unburned mixture (mole fractions), T_u [K] and p [Pa]."""
    X: dict[str, float]
    T_u: float
    P: float


@dataclass(frozen=True)
class FlameResult:
    """A solved validation flame: status ('ok' or why not), S_L [m/s], thermal thickness [m], and
    the target species' mole fractions at its burned end."""
    status: str
    speed_m_s: float | None = None
    thickness_m: float | None = None
    outlet: dict[str, float] = field(default_factory=dict)
    cpu_s: float = 0.0
    profile: dict | None = field(default=None, repr=False, compare=False)  # the converged flame (a warm start)


@dataclass(frozen=True)
class Targets:
    """Largest relative errors allowed: ignition delay, flame speed, target species at the flames'
    outlets (fractions, 0.1 = 10 %), and the target species."""
    ignition_delay: float = 0.10
    flame_speed: float = 0.01
    species_error: float = 0.10
    species: tuple[str, ...] = ()


@dataclass(frozen=True)
class Tried:
    """One candidate: threshold, species and reactions kept, the largest ignition-delay error, the
    flame-speed errors of the flames solved (a flame that failed: inf; None: not solved, the
    candidate was refused before), the largest target-species error, and why it was refused ('')."""
    epsilon: float
    n_species: int
    n_reactions: int
    ignition_error: float
    flame_errors: tuple[float | None, ...] = ()
    species_error: float | None = None
    refused: str = ""


@dataclass(frozen=True)
class StudyReduction:
    """The outcome of :func:`reduce_for_study`. ``species`` and ``n_reactions`` are the chosen
    mechanism's (the detailed one's when ``reduced`` is False: no candidate met every target).
    Errors are relative (0.01 = 1 %), per ignition validation point and per flame (None where a
    flame of the detailed mechanism did not burn); ``species_errors`` the largest per target
    species over the flames (None: below SPECIES_FLOOR at every flame)."""
    reduced: bool
    epsilon: float
    species: tuple[str, ...]
    n_reactions: int
    ignition_errors: tuple[float, ...]
    flame_errors: tuple[float | None, ...]
    thickness_errors: tuple[float | None, ...]
    species_errors: dict[str, float | None]
    detailed_flames: tuple[FlameResult, ...]
    skeletal_flames: tuple[FlameResult, ...]
    detailed_delays_s: tuple[float, ...]
    tried: tuple[Tried, ...]
    n_states: int
    detailed: tuple[int, int]  # species, reactions
    cpu_s: dict[str, float]


def outlet_mole_fractions(gas: ct.Solution, profile: dict, species: Sequence[str]) -> dict[str, float]:
    """Mole fractions of ``species`` (those ``gas`` has) at the burned end of a flame ``profile``
    (chemistry.flame.profile_of: grid, T, Y of its own species)."""
    names = list(profile["species"])
    Y = np.zeros(gas.n_species)
    last = np.asarray(profile["Y"], dtype=float)[:, -1]
    for k, name in enumerate(gas.species_names):
        if name in names:
            Y[k] = last[names.index(name)]
    gas.TPY = float(profile["T"][-1]), float(profile["P"]), Y
    return {s: float(gas[s].X[0]) for s in species if s in gas.species_names}


@dataclass(frozen=True)
class FlameSettings:
    """How every validation flame is solved: the study's transport, thermal diffusion, grid
    settings, and a CPU time limit [s] per flame (None: none)."""
    transport: str
    soret: bool
    numerics: Numerics
    time_limit_s: float | None = None


def _flame(gas: ct.Solution, case: FlameCase, how: FlameSettings, species: Sequence[str],
           warm: dict | None = None) -> FlameResult:
    """One validation flame of ``gas``: from scratch, or from the profile ``warm`` (a screen)."""
    start = time.process_time()
    r = solve_flame(gas, case.T_u, case.P, dict(case.X), how.transport, how.soret, how.numerics, warm,
                    how.time_limit_s)
    spent = time.process_time() - start
    if r["status"] != "ok":
        return FlameResult(status=str(r["message"]) or str(r["status"]), cpu_s=spent)
    m = r["metrics"]
    return FlameResult("ok", float(m["laminar_flame_speed_m_s"]), float(m["thermal_thickness_m"]),
                       outlet_mole_fractions(gas, r["profile"], species), spent, r["profile"])


def detached(gas: ct.Solution, kept: Sequence[str]) -> tuple[str, ...]:
    """Species of the DETACHABLE elements' chemistry that no skeletal mechanism keeps: those with
    such an element, when none of ``kept`` (streams and targets) holds it besides the listed inert."""
    out: list[str] = []
    for element, inert in DETACHABLE.items():
        if element not in gas.element_names:
            continue
        if any(gas.species(s).composition.get(element, 0) and s not in inert for s in kept):
            continue
        out += [s for s in gas.species_names if gas.species(s).composition.get(element, 0) and s not in inert]
    return tuple(out)


def _relative(value: float | None, reference: float | None) -> float | None:
    if reference is None or value is None:
        return None
    return abs(value / reference - 1.0)


def _species_errors(detailed: Sequence[FlameResult], skeletal: Sequence[FlameResult | None],
                    species: Sequence[str]) -> dict[str, float | None]:
    """The largest relative error of each target species at the flames' outlets, where the detailed
    mechanism gives at least SPECIES_FLOOR (None where it never does)."""
    out: dict[str, float | None] = {}
    for s in species:
        errs = [abs(sk.outlet.get(s, 0.0) / d.outlet[s] - 1.0) for d, sk in zip(detailed, skeletal)
                if sk is not None and d.status == "ok" and sk.status == "ok" and d.outlet.get(s, 0.0) >= SPECIES_FLOOR]
        out[s] = max(errs) if errs else None
    return out


class _Flames:
    """The validation flames of one search: the detailed mechanism's, solved once when a first
    candidate needs them, and the check of a candidate's. A candidate's flames are first screened:
    warm-started from the detailed flame's profile (a fraction of the cost), against the detailed
    flame warm-started from its own profile (the warm path moved a coarse methane flame by 0.6 %
    against its solve from scratch: only like and like compare), the flame that refused the last
    candidate first (a refusal then costs one warm flame); a candidate the screen passes is judged
    on its flames solved from scratch like the detailed ones (SCREEN_MARGIN)."""

    def __init__(self, gas: ct.Solution, cases: Sequence[FlameCase], how: FlameSettings, targets: Targets) -> None:
        self.gas, self.cases, self.how, self.targets = gas, list(cases), how, targets
        self.detailed: list[FlameResult] | None = None
        self.screens: list[FlameResult] = []
        self.order = list(range(len(cases)))
        self.cpu = 0.0

    def reference(self) -> list[FlameResult]:
        """The detailed mechanism's flames from scratch (and, for the screens, each solved again
        warm-started from its own profile: the same path as a candidate's screen)."""
        if self.detailed is None:
            self.detailed = [_flame(self.gas, c, self.how, self.targets.species) for c in self.cases]
            self.screens = [_flame(self.gas, c, self.how, self.targets.species, d.profile) if d.status == "ok" else d
                            for c, d in zip(self.cases, self.detailed)]
            self.cpu += sum(f.cpu_s for f in self.detailed) + sum(f.cpu_s for f in self.screens)
        return self.detailed

    def _refusal(self, ref: FlameResult, mine: FlameResult, margin: tuple[float, float]) -> str:
        """Why ``mine`` is refused against ``ref`` with the targets widened by ``margin`` (flame
        speed, species); '' when it is not."""
        t = self.targets
        err = _relative(mine.speed_m_s, ref.speed_m_s) or 0.0
        worst = max((e for e in _species_errors([ref], [mine], t.species).values() if e is not None), default=0.0)
        return ("a flame did not burn" if mine.status != "ok" else
                f"flame speed {100 * err:.2g} %" if err > t.flame_speed + margin[0] else
                f"species at the outlet {100 * worst:.2g} %" if worst > t.species_error + margin[1] else "")

    def _solve(self, skeletal: ct.Solution, i: int, warm: dict | None) -> FlameResult:
        mine = _flame(skeletal, self.cases[i], self.how, self.targets.species, warm)
        self.cpu += mine.cpu_s
        return mine

    def check(self, skeletal: ct.Solution) -> tuple[list[FlameResult | None], str]:
        """The candidate's flames from scratch (None: not solved; its screen refused it first) and why
        it is refused ('' when it is not)."""
        ref = self.reference()
        out: list[FlameResult | None] = [None] * len(self.cases)
        burning = [i for i in self.order if ref[i].status == "ok" and self.screens[i].status == "ok"]
        for fresh in (False, True):
            for i in burning:
                mine = self._solve(skeletal, i, None if fresh else ref[i].profile)
                why = self._refusal(ref[i] if fresh else self.screens[i], mine, (0.0, 0.0) if fresh else SCREEN_MARGIN)
                if fresh:
                    out[i] = mine
                if why:
                    self.order.remove(i)
                    self.order.insert(0, i)
                    return out, why + ("" if fresh else " on a warm-started screen")
        return out, ""


def _tried(eps: float, species: Sequence[str], skeletal: ct.Solution, ign: Sequence[float],
           flames: Sequence[FlameResult | None], ref: Sequence[FlameResult] | None, targets: Targets,
           refused: str) -> Tried:
    errs: tuple[float | None, ...] = ()
    if ref is not None:
        errs = tuple(None if f is None else (math.inf if f.status != "ok" else _relative(f.speed_m_s, r.speed_m_s))
                     for f, r in zip(flames, ref))
    worst = [e for e in _species_errors(ref or [], flames, targets.species).values() if e is not None] if ref else []
    return Tried(eps, len(species), skeletal.n_reactions, max(ign, default=0.0), errs,
                 max(worst) if worst else None, refused)


def _search(gas: ct.Solution, importance: dict[str, float], always: Sequence[str], ladder: Sequence[float],
            points: Sequence[Point], reference: np.ndarray, flames: _Flames | None, targets: Targets,
            report: Callable[[str], None]) -> tuple[tuple | None, list[Tried]]:
    """The first candidate of the ladder, smallest first, within every target: (epsilon, species,
    its Solution, its flames, its ignition-delay errors); None when none is. And every candidate tried."""
    tried: list[Tried] = []
    checking = flames if flames is not None and flames.cases else None  # flames to check candidates on
    for eps, species in candidates(importance, always, ladder):
        skeletal = skeletal_solution(gas, species)
        ign = list(delay_errors(skeletal, points, reference))
        report(f"{len(species)} species: ignition delays within {100 * max(ign, default=0):.2g} %")
        if max(ign, default=0.0) > targets.ignition_delay:
            tried.append(_tried(eps, species, skeletal, ign, [], None, targets,
                                f"ignition delay {100 * max(ign):.2g} %"))
            continue
        mine, why = checking.check(skeletal) if checking else ([], "")
        ref = checking.reference() if checking else None
        tried.append(_tried(eps, species, skeletal, ign, mine, ref, targets, why))
        if checking:
            report(f"{len(species)} species: flames " + (f"refused ({why})" if why else "within the targets"))
        if not why:
            return (eps, species, skeletal, mine, ign), tried
    return None, tried


def reduce_for_study(mechanism_path: str, sha256: str, training: Conditions, ignition_points: Sequence[Point],
                     flame_cases: Sequence[FlameCase], how: FlameSettings, targets: Targets,
                     ladder: Sequence[float] | None = None, report: Callable[[str], None] | None = None
                     ) -> StudyReduction:
    """The smallest DRGEP skeletal mechanism of ``mechanism_path`` (content hash ``sha256``) whose
    ignition delays at ``ignition_points`` and flames at ``flame_cases`` (solved as ``how`` says,
    with both mechanisms) stay within ``targets``; the detailed mechanism itself when no
    candidate of the ``ladder`` (default chemistry.reduction.epsilon_ladder) does.

    Trains on autoignition states of ``training`` (chemistry.reduction.ignition_states); the
    targets of the graph search are the fuel species, O2, the chain carriers the mechanism has
    (chemistry.reduction.CHAIN_CARRIERS) and ``targets.species``, all of them always kept with the
    oxidizer species and inerts. A DETACHABLE element's chemistry (nitrogen's, N2 kept) is left out
    of every candidate when no stream species and no target holds the element (:func:`detached`).
    No validation point may be a training point (ValueError). ``report`` receives a line after
    each step (progress)."""
    say = report or (lambda _: None)
    overlap = set(ignition_points) & set(training.points())
    if overlap:
        raise ValueError(f"validation points that are training points: {sorted(overlap)}")
    gas = solution(str(mechanism_path), how.transport if flame_cases else None, sha256)
    carriers = [s for s in CHAIN_CARRIERS if s in gas.species_names]
    fuel_species = [s for X in training.fuels for s, x in X.items() if x > 0]
    always = always_kept(gas, training.fuels + training.oxidizers + tuple(dict(p[0]) for p in ignition_points)
                         + tuple(c.X for c in flame_cases), list(targets.species) + carriers)
    goals = list(dict.fromkeys(fuel_species + ["O2"] + carriers + list(targets.species)))
    cpu = {"start": time.process_time()}
    states = ignition_states(gas, training)
    cpu["sampling"] = time.process_time()
    say(f"{len(states)} reacting states sampled from {len(training.points())} autoignitions")
    importance = species_importance(gas, states, goals)
    cpu["importance"] = time.process_time()
    dropped = detached(gas, always)
    importance = {s: (0.0 if s in dropped else v) for s, v in importance.items()}
    reference = ignition_delays(gas, ignition_points)
    cpu["detailed delays"] = time.process_time()
    if not np.all(np.isfinite(reference)):
        bad = [p for p, tau in zip(ignition_points, reference) if not math.isfinite(tau)]
        raise ValueError(f"the detailed mechanism does not ignite within 1 s at {bad}")
    flames = _Flames(gas, flame_cases, how, targets) if flame_cases else None
    found, tried = _search(gas, importance, always, ladder or epsilon_ladder(), ignition_points, reference, flames,
                           targets, say)
    cpu["candidates"] = time.process_time()
    steps = list(cpu)
    spent = {b: cpu[b] - cpu[a] for a, b in zip(steps, steps[1:])}
    if flames is not None:  # the flames' share of the candidates' time, apart
        spent["flames"] = flames.cpu
        spent["candidates"] -= flames.cpu
    ref = (flames.detailed or []) if flames is not None else []  # solved once a candidate needed them
    if found is None:  # no candidate met every target: the detailed mechanism itself, no error
        return StudyReduction(False, 0.0, tuple(gas.species_names), gas.n_reactions, (0.0,) * len(ignition_points),
                              tuple(0.0 if f.status == "ok" else None for f in ref),
                              tuple(0.0 if f.status == "ok" else None for f in ref),
                              {s: None for s in targets.species}, tuple(ref), tuple(ref),
                              tuple(float(t) for t in reference), tuple(tried), len(states),
                              (gas.n_species, gas.n_reactions), spent)
    eps, species, skeletal, mine, ign = found
    mine = list(mine) + [None] * (len(ref) - len(mine))
    return StudyReduction(
        True, eps, tuple(species), skeletal.n_reactions, tuple(ign),
        tuple(None if f is None or d.status != "ok" else _relative(f.speed_m_s, d.speed_m_s) for f, d in zip(mine, ref)),
        tuple(None if f is None or d.status != "ok" else _relative(f.thickness_m, d.thickness_m)
              for f, d in zip(mine, ref)),
        _species_errors(ref, mine, targets.species), tuple(ref), tuple(f or FlameResult("not solved") for f in mine),
        tuple(float(t) for t in reference), tuple(tried), len(states), (gas.n_species, gas.n_reactions), spent)
