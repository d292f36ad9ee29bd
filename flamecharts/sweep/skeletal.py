"""[reduction]: a skeletal mechanism made for the study once, before its sweep, stored and reused.

plan      what the reduction trains and validates on, from the study alone (no Cantera): autoignition
          from the study's fuel streams, equivalence ratios and pressures at its preheats raised to
          the flame zone's temperatures (training), the ignition delays half-way between them, and
          validation flames at points of the study the training leaves out; with the inputs whose
          change makes it again
stored    the stored reduction of an output folder, when it was made for this study's plan (else why not)
applied   the study with the stored reduction of its folder applied (the read side and `check`)
prepare   the solve side: reuse the stored reduction, or make it again (chemistry.skeletal) and write
          the skeletal YAML and reduction.json atomically; the study to solve and a sentence on what happened
estimate  what `check` says the reduction will do and about how long it takes

The skeletal mechanism's content hash becomes the study's mechanism hash (config.with_reduction), so
it enters every point's key: a new mechanism is a new key and its flames are solved again.
"""
from __future__ import annotations

import json
import math
import os
import time
from collections.abc import Callable, Sequence
from dataclasses import asdict, dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any

from .._version import installed_cantera_version
from ..columns import gas_label
from ..config import flame_stream, fuel_stream, with_reduction
from ..errors import FlamechartsError, first_line
from ..facts import ReducedMechanism, file_sha256
from ..numerics import NUMERICS
from ..physics.sampling import Conditions, between, composition
from .points import Point, condition_key, point_at_phi, points
from .schedule import default_flame_seconds, flame_time_limit

if TYPE_CHECKING:
    from ..config import Study
    from ..physics.sampling import Point as StatePoint

#: Changes of the method that change the skeletal mechanism (part of the stored inputs).
REDUCTION_VERSION = 1
#: The skeletal mechanism's file, named by the first 12 hex digits of its sha256: a file name never
#: holds two contents, so the mechanism caches of a long-lived process (chemistry.mechanism.solution,
#: keyed by path) and of reused worker processes never serve an earlier skeletal mechanism.
SKELETAL_FILE = "reduced_mechanism_{sha12}.yaml"
SKELETAL_GLOB = "reduced_mechanism_*.yaml"
RECORD_FILE = "reduction.json"
#: Training autoignition starts at each end of the study's preheat range raised by these [K]: a
#: premixed flame releases its heat between roughly 1000 K and its burned temperature, and the
#: radical pool that sets its speed is the one an autoignition from there builds up (for T_u 300 K:
#: 1300 and 1700 K, the range the reduction core was measured on, docs/benchmarks.md). Colder starts
#: would rank the low-temperature (peroxy) chemistry a flame's preheat zone crosses too fast to use;
#: what the preheat zone does need is checked on the validation flames, which decide the choice.
TRAINING_RISES_K = (1000.0, 1400.0)
#: Most values of each training axis (evenly spaced, the ends kept) and most ignition validation points.
MOST_TRAINING = {"phi": 5, "blend": 3, "pressure": 3}
MOST_IGNITION_POINTS = 24
#: A study with one equivalence ratio trains this far either side of it (relative), so that its own
#: points are held out.
SINGLE_PHI_SPREAD = 0.15
#: Seconds of one training autoignition (sampled and ranked) and of one ignition delay, per species
#: to the power 1.5: measured 0.075 and 0.035 s with GRI-Mech 3.0 (53 species), 4.2 and 3.7 s with
#: the n-hexane mechanism (1268 species; docs/benchmarks.md, "Mechanism reduction"), within a
#: factor 2 of both.
AUTOIGNITION_SECONDS_PER_SPECIES_1_5 = 1.5e-4
DELAY_SECONDS_PER_SPECIES_1_5 = 1.0e-4


def _spread(items: Sequence[Any], n: int) -> list[Any]:
    """At most ``n`` of ``items``, evenly spaced, the first and the last kept.

    >>> _spread([1, 2, 3, 4, 5, 6, 7], 3), _spread([1, 2], 3)
    ([1, 4, 7], [1, 2])
    """
    if len(items) <= n:
        return list(items)
    if n == 1:
        return [items[0]]
    return [items[round(i * (len(items) - 1) / (n - 1))] for i in range(n)]


def _alternate(values: Sequence[float]) -> list[float]:
    """Every other value from the first, and the last: the training values of an axis (the
    others are held out).

    >>> _alternate([0.6, 0.7, 0.8, 0.9]), _alternate([0.8, 1.0])
    ([0.6, 0.8, 0.9], [0.8, 1.0])
    """
    v = sorted(values)
    if len(v) <= 2:
        return v
    keep = v[::2]
    return keep if keep[-1] == v[-1] else keep + [v[-1]]


def _num(x: float) -> str:
    return f"{x:.12g}"


@dataclass(frozen=True)
class Plan:
    """What a study's reduction trains and validates on (:func:`plan`)."""

    training: Conditions
    ignition: tuple[StatePoint, ...]
    flames: tuple[Point, ...]      # validation flames: points of the study (held_out) or beside it
    held_out: bool
    inputs: dict                   # what the stored reduction must have been made from (JSON data)


def _training(study: Study) -> tuple[Conditions, set[float], set[float]]:
    """The training grid, and the equivalence ratios and blend fractions it trains on."""
    phis = sorted(study.equivalence_ratios)
    if len(phis) == 1:
        train_phis = [round(phis[0] * (1 - SINGLE_PHI_SPREAD), 9), round(phis[0] * (1 + SINGLE_PHI_SPREAD), 9)]
    else:
        train_phis = _spread(_alternate(phis), MOST_TRAINING["phi"])
    fracs = _spread(_alternate(study.blend_fractions), MOST_TRAINING["blend"])
    fuels: dict[tuple, dict[str, float]] = {}
    for fuel in study.sweep_fuels:
        for f in fracs:
            X = flame_stream(study, fuel_stream(study, fuel, f))[0]
            fuels.setdefault(composition(X), X)
    ends = sorted({min(study.unburned_temperatures_K), max(study.unburned_temperatures_K)})
    temps = tuple(sorted({t + rise for t in ends for rise in TRAINING_RISES_K}))
    pressures = tuple(1e5 * p for p in _spread(sorted(study.pressures_bar), MOST_TRAINING["pressure"]))
    training = Conditions(tuple(fuels.values()), tuple(study.oxidizers[o] for o in study.sweep_oxidizers),
                          tuple(train_phis), temps, pressures)
    return training, set(train_phis), set(fracs)


def _validation_flames(study: Study, train_phis: set[float], train_fracs: set[float], n: int
                       ) -> tuple[tuple[Point, ...], bool]:
    """Up to ``n`` points of the study at an equivalence ratio or blend the training left out
    (held out: True), spread over phi first (:func:`_phi_first`); where there are none (two values
    or fewer on both axes), points beside the study at the midpoints of its training equivalence
    ratios (False)."""
    if n == 0:
        return (), True
    pts = points(study)
    held = [p for p in pts if p.phi not in train_phis or p.blend_fraction not in train_fracs]
    held_out = bool(held)
    if not held:
        mids = [0.5 * (a + b) for a, b in zip(sorted(train_phis), sorted(train_phis)[1:])]
        base = {(p.fuel, p.oxidizer, p.blend_fraction, p.pressure_bar, p.T_u): p for p in pts}
        held = [point_at_phi(study, p, m) for p in base.values() for m in mids]
    unique = {condition_key(p): p for p in held}
    return tuple(_phi_first(list(unique.values()), n)), held_out


def _others(p: Point) -> tuple:
    """A point's place on the axes other than phi, in the order validation flames spread over them."""
    return p.pressure_bar, p.T_u, p.blend_fraction, p.fuel, p.oxidizer


def _phi_first(candidates: list[Point], n: int) -> list[Point]:
    """``n`` of ``candidates``: evenly spaced equivalence ratios (the leanest and richest kept), the
    i-th of them at the i-th of evenly spaced places on the other axes (pressure, preheat, blend),
    then, past the number of distinct ratios, the rest spread over every axis.

    A skeletal mechanism's flame-speed error varies most with phi (0.03 % lean to 0.27 % rich on the
    sweep benchmark's 54 GRI-Mech 3.0 flames, docs/benchmarks.md): a set spread over pressure first
    held phi 0.8 and 1.4 only and stated 0.16 % where the rich middle was off by 0.27 %.
    """
    phis = _spread(sorted({p.phi for p in candidates}), n)
    others = sorted({_others(p) for p in candidates})
    places = [others[round(i * (len(others) - 1) / max(len(phis) - 1, 1))] for i in range(len(phis))]
    chosen = []
    for phi, place in zip(phis, places):
        at_phi = sorted((p for p in candidates if p.phi == phi), key=_others)
        chosen.append(at_phi[_rank(at_phi, place)])
    rest = sorted((p for p in candidates if p not in chosen), key=lambda p: (*_others(p), p.phi))
    return chosen + _spread(rest, n - len(chosen))


def _rank(at_phi: list[Point], place: tuple) -> int:
    """Index of the first of ``at_phi`` (sorted by :func:`_others`) at or past ``place``."""
    return next((i for i, p in enumerate(at_phi) if _others(p) >= place), len(at_phi) - 1)


def _text(X: dict[str, float]) -> dict[str, str]:
    return {k: _num(v) for k, v in sorted(X.items())}


def plan(study: Study) -> Plan:
    """The reduction plan of a [reduction] study (its detailed mechanism, before config.with_reduction)."""
    r = study.reduction
    assert r is not None and study.reduced is None, "a plan is made for a [reduction] study's detailed mechanism"
    training, train_phis, train_fracs = _training(study)
    ignition = tuple(_spread(between(training).points(), MOST_IGNITION_POINTS))
    flames, held_out = _validation_flames(study, train_phis, train_fracs, r.validation_flames)
    inputs = {
        "version": REDUCTION_VERSION, "detailed_sha256": study.mechanism_sha256, "cantera": installed_cantera_version(),
        "targets": {"flame_speed_error_percent": _num(100 * r.flame_speed_error),
                    "ignition_delay_error_percent": _num(100 * r.ignition_delay_error),
                    "species_error_percent": _num(100 * r.species_error), "species": list(r.species)},
        "training": {"fuels": [_text(dict(f)) for f in training.fuels],
                     "oxidizers": [_text(dict(o)) for o in training.oxidizers],
                     "phis": [_num(v) for v in training.phis], "temperatures_K": [_num(v) for v in training.temperatures_K],
                     "pressures_Pa": [_num(v) for v in training.pressures_Pa]},
        "ignition_points": [[_text(dict(f)), _text(dict(o)), _num(phi), _num(T), _num(P)]
                            for f, o, phi, T, P in ignition],
        "flames": {"transport": study.transport, "thermal_diffusion": study.thermal_diffusion,
                   "numerics": NUMERICS[study.resolution].as_dict(), "points": [condition_key(p) for p in flames]},
    }
    return Plan(training, ignition, flames, held_out, json.loads(json.dumps(inputs)))


#: Why a stored reduction is not this study's, by the part of its inputs that differs.
_CHANGED = {"version": "flamecharts' reduction method changed", "detailed_sha256": "the mechanism file changed",
            "cantera": "the Cantera version changed",
            "training": "the study's range changed (its fuels, equivalence ratios, pressures or preheats)",
            "ignition_points": "the study's range changed (its ignition validation points)",
            "flames": "the validation flames changed (their points, transport or grid settings)"}


def _why(old: dict, new: dict) -> str:
    """Why the stored reduction's inputs ``old`` are not ``new``, in words."""
    reasons = []
    if old.get("targets") != new["targets"]:
        was, now = old.get("targets") or {}, new["targets"]
        changes = [f"{k} {was.get(k)} -> {now[k]}" for k in now if was.get(k) != now[k]]
        reasons.append("the targets changed (" + "; ".join(changes) + ")")
    reasons += list(dict.fromkeys(text for k, text in _CHANGED.items() if old.get(k) != new[k]))
    return ", and ".join(reasons) or "its inputs changed"


def _read(out: Path) -> tuple[dict, ReducedMechanism] | None:
    """(inputs, record) of the folder's reduction.json; None when it is missing or damaged."""
    try:
        data = json.loads((out / RECORD_FILE).read_text(encoding="utf-8"))
        return dict(data["inputs"]), ReducedMechanism.from_json(data["outcome"], out)
    except (OSError, ValueError, KeyError, TypeError, AttributeError, IndexError):
        return None


def stored(study: Study, out: str | os.PathLike, the_plan: Plan | None = None) -> tuple[ReducedMechanism | None, str]:
    """The reduction stored in ``out`` when it was made from ``study``'s plan, else None and why not."""
    found = _read(Path(out))
    if found is None:
        return None, ("no reduction is stored in the output folder yet" if not (Path(out) / RECORD_FILE).exists()
                      else f"the stored {RECORD_FILE} cannot be read")
    inputs, record = found
    new = (the_plan or plan(study)).inputs
    return (record, "") if inputs == new else (None, _why(inputs, new))


def applied(study: Study, out: str | os.PathLike) -> Study:
    """``study`` as its run in ``out`` solved it: with the stored reduction applied when it asks for one
    and the folder holds its reduction (the study itself otherwise; nothing is solved)."""
    if study.reduction is None or study.reduced is not None:
        return study
    record, _ = stored(study, out)
    return study if record is None else with_reduction(study, record)


def _effective_sha(study: Study, record: ReducedMechanism) -> str:
    return record.sha256 if record.reduced else study.mechanism_sha256


def _summary(r: ReducedMechanism) -> str:
    if not r.reduced:  # nothing smaller to try, every candidate refused on its delays, or none met every target
        return f"{r.why_detailed}; {r.validation_words}; the detailed mechanism is used"
    speed = r.flame_speed_error
    return (f"{len(r.species)} of {r.detailed_size[0]} species, {r.reactions} of {r.detailed_size[1]} reactions; "
            + (f"flame speed within {100 * speed:.2g} % on {sum(f.get('error') is not None for f in r.flames)} "
               "validation flame(s), " if speed is not None else "flame speed not measured, ")
            + f"ignition delays within {100 * r.ignition_delay_error:.2g} %")


def prepare(study: Study, out: Path, store_keys: set[str], say: Callable[[str], None] | None = None
            ) -> tuple[Study, str]:
    """The study to solve and a sentence on its reduction ('' without [reduction]): the stored
    reduction when it was made from this study's plan (its skeletal file rewritten when missing),
    else a new one (chemistry.skeletal.reduce_for_study), its skeletal YAML and reduction.json
    written atomically to ``out``. ``store_keys``: the keys of the flames the store holds (the
    sentence says how many of the study's it keeps); ``say`` receives progress lines."""
    if study.reduction is None:
        return study, ""
    report = say or (lambda _: None)
    the_plan = plan(study)
    record, why = stored(study, out, the_plan)
    if record is not None:
        if _skeletal_file_ok(study, record, out):
            return (with_reduction(study, record),
                    f"Mechanism reduction: the stored skeletal mechanism is reused ({_summary(record)}).")
        why = f"its skeletal file {record.file} is missing and came out otherwise when rewritten"
    old = _read(out)
    report(f"reducing {Path(study.mechanism).name} for the study's conditions: {why}")
    t0 = time.perf_counter()
    record = _reduce(study, the_plan, out, report)
    report(f"done in {time.perf_counter() - t0:.0f} s: {_summary(record)}")
    solved = with_reduction(study, record)
    note = (f"Mechanism reduction: {_summary(record)}; made in {time.perf_counter() - t0:.0f} s"
            + (f", again because {why}" if old is not None else ""))
    before = _effective_sha(study, old[1]) if old is not None else (study.mechanism_sha256 if store_keys else None)
    if before is not None and before == solved.mechanism_sha256:
        note += "; the flames burn the same mechanism as before: stored flames are reused"
    elif before is not None:
        keys = {p.key for p in points(solved)}
        kept = len(keys & store_keys)
        note += ("; the mechanism the flames burn changed, and a new mechanism is a new key: "
                 + ("every flame of the study is solved again" if not kept else
                    f"{kept} of its {len(keys)} flames were stored under it by an earlier run, the others are solved "
                    "again"))
    return solved, note + "."


def _note(name: str, detailed_sha256: str, n_species: tuple[int, int], n_reactions: tuple[int, int],
          epsilon: float) -> str:
    """The comment lines of a skeletal YAML: from the record alone, so a missing file is rewritten
    to the same bytes (and hash)."""
    return (f"Skeletal mechanism of {name} (sha256 {detailed_sha256}) made by flamecharts [reduction]:\n"
            f"{n_species[0]} of {n_species[1]} species and {n_reactions[0]} of {n_reactions[1]} reactions kept by "
            f"DRGEP (Pepiot-Desjardins & Pitsch 2008) at threshold {epsilon:.6g}.\n"
            f"Its errors against the detailed mechanism, measured on the study's validation points: {RECORD_FILE}.")


def _skeletal_file_ok(study: Study, record: ReducedMechanism, out: Path) -> bool:
    """Whether the record's skeletal file is in ``out`` with its hash, rewritten from the detailed
    mechanism and the kept species when it is missing (False: it came out otherwise)."""
    if not record.reduced:
        return True
    path = out / record.file
    if path.is_file() and file_sha256(path) == record.sha256:
        return True
    from ..chemistry.mechanism import solution
    from ..chemistry.reduction import skeletal_solution

    gas = solution(study.mechanism_path, None, study.mechanism_sha256)
    note = _note(Path(study.mechanism).name, study.mechanism_sha256, (len(record.species), record.detailed_size[0]),
                 (record.reactions, record.detailed_size[1]), record.epsilon)
    return _write_skeletal(out, skeletal_solution(gas, record.species), note) == (record.file, record.sha256)


def _write_skeletal(out: Path, skeletal: Any, note: str) -> tuple[str, str]:
    """Write a skeletal mechanism (a Cantera Solution) to ``out`` under SKELETAL_FILE, atomically;
    its file name and sha256."""
    from ..chemistry.reduction import mechanism_sha256, mechanism_yaml, write_mechanism

    sha = mechanism_sha256(mechanism_yaml(skeletal, note))
    file = SKELETAL_FILE.format(sha12=sha[:12])
    written = write_mechanism(skeletal, out / file, note)
    assert written == sha, "chemistry.reduction.mechanism_yaml is deterministic"
    return file, sha


def _flame_label(p: Point) -> str:
    return (f"{gas_label({'fuel': p.fuel, 'blend_with': p.blend_with, 'blend_fraction': p.blend_fraction})} in "
            f"{p.oxidizer}, phi {p.phi:g}, {p.pressure_bar:g} bar, {p.T_u:g} K")


def _reduce(study: Study, the_plan: Plan, out: Path, report: Callable[[str], None]) -> ReducedMechanism:
    """Make the study's skeletal mechanism (chemistry.skeletal.reduce_for_study) and write it and its record."""
    from ..chemistry.mechanism import mechanism_facts, solution
    from ..chemistry.reduction import skeletal_solution
    from ..chemistry.skeletal import FlameCase, FlameSettings, Targets, reduce_for_study

    r = study.reduction
    assert r is not None  # prepare() asks only for a [reduction] study
    how = FlameSettings(study.transport, study.thermal_diffusion, NUMERICS[study.resolution],
                        study.flame_time_limit_s or flame_time_limit(len(study.atoms)))
    cases = [FlameCase(dict(p.X_unburned), p.T_u, p.P) for p in the_plan.flames]
    wall = time.perf_counter()
    name = Path(study.mechanism).name
    try:
        found = reduce_for_study(study.mechanism_path, study.mechanism_sha256, the_plan.training,
                                 list(the_plan.ignition), cases, how,
                                 Targets(r.ignition_delay_error, r.flame_speed_error, r.species_error, r.species),
                                 report=report)
    except ValueError as exc:  # e.g. a mixture that does not ignite from the flame zone's temperatures
        raise FlamechartsError(f"[reduction] cannot reduce {name} for this study: {first_line(exc, 300)}; "
                               "remove [reduction] to solve with the detailed mechanism") from None
    file, sha, facts = "", "", None
    if found.reduced:
        gas = solution(study.mechanism_path, None, study.mechanism_sha256)
        file, sha = _write_skeletal(out, skeletal_solution(gas, found.species),
                                    _note(name, study.mechanism_sha256, (len(found.species), found.detailed[0]),
                                          (found.n_reactions, found.detailed[1]), found.epsilon))
        facts = mechanism_facts(study.mechanism, str(out / file), sha)
    for old in out.glob(SKELETAL_GLOB):  # earlier runs': no flame of this study burns them
        if old.name != file:
            old.unlink()
    flames = tuple({"condition": condition_key(p), "label": _flame_label(p), "held_out": the_plan.held_out,
                    "detailed_m_s": d.speed_m_s, "skeletal_m_s": s.speed_m_s, "error": e, "thickness_error": te}
                   for p, d, s, e, te in zip(the_plan.flames, found.detailed_flames, found.skeletal_flames,
                                             found.flame_errors, found.thickness_errors))
    record = ReducedMechanism(
        reduced=found.reduced, file=file, sha256=sha, detailed_name=study.mechanism,
        detailed_path=study.mechanism_path, detailed_sha256=study.mechanism_sha256, detailed_size=found.detailed,
        species=found.species, reactions=found.n_reactions, epsilon=found.epsilon,
        targets={"flame_speed": r.flame_speed_error, "ignition_delay": r.ignition_delay_error,
                 "species_error": r.species_error, "species": list(r.species)},
        ignition_errors=found.ignition_errors, flames=flames, species_errors=found.species_errors,
        tried=tuple(_finite(asdict(t)) for t in found.tried),
        n_states=found.n_states, training_runs=len(the_plan.training.points()),
        cpu_s={**found.cpu_s, "wall": time.perf_counter() - wall}, facts=facts)
    _write_record(out, the_plan.inputs, record)
    return record


def _finite(v: Any) -> Any:
    """``v`` with every infinite float (a candidate's flame that did not burn) as None: strict JSON.

    >>> _finite({"errors": [0.1, float("inf")], "n": 3})
    {'errors': [0.1, None], 'n': 3}
    """
    if isinstance(v, dict):
        return {k: _finite(x) for k, x in v.items()}
    if isinstance(v, (list, tuple)):
        return [_finite(x) for x in v]
    return None if isinstance(v, float) and not math.isfinite(v) else v


def _write_record(out: Path, inputs: dict, record: ReducedMechanism) -> None:
    """reduction.json, atomically (a temporary file renamed): a run killed while writing leaves the
    previous record or none, never half of one."""
    path = out / RECORD_FILE
    tmp = path.with_name(path.name + ".tmp")
    tmp.write_text(json.dumps({"version": REDUCTION_VERSION, "inputs": inputs, "outcome": record.to_json()},
                              indent=1, allow_nan=False), encoding="utf-8")
    os.replace(tmp, path)


def estimate(study: Study) -> tuple[str, float]:
    """What `check` prints for a reduction still to make, and its estimated seconds (one process)."""
    p = plan(study)
    n = len(study.atoms)
    runs, delays = len(p.training.points()), len(p.ignition)
    t = n ** 1.5 * (AUTOIGNITION_SECONDS_PER_SPECIES_1_5 * runs + 3 * DELAY_SECONDS_PER_SPECIES_1_5 * delays)
    fresh = default_flame_seconds(n, study.resolution)["fresh"]
    t += len(p.flames) * (fresh + 2 * default_flame_seconds(int(0.6 * n), study.resolution)["fresh"])
    what = (f"Mechanism reduction (once, before the sweep): {runs} autoignitions of {Path(study.mechanism).name} "
            f"rank its species (DRGEP), ignition delays at {delays} points between them"
            + (f" and up to {len(p.flames)} flames of the study it does not train on "
               f"({'held-out points' if p.held_out else 'beside its points'}) are solved with the detailed "
               "mechanism and with each candidate whose ignition delays hold; none when no candidate is smaller "
               "than the detailed mechanism (a small one may need every species) or none keeps its delays"
               if p.flames else ", no validation flame (ignition delays only)"))
    return what, t
