"""Study config (TOML) -> a validated, typed :class:`Study`.

Every error names the offending key, value or species and what is allowed, and is
raised as :class:`~flamecharts.errors.ConfigError` (or MechanismError for the
mechanism). Nothing is written while a config is read.

Config keys (units in the names where the value has one)
--------------------------------------------------------
title                     str, shown on every chart and report
mechanism                 any file Cantera can load; default "gri30.yaml" (ships with Cantera).
                          A relative path is looked up beside the config, then in Cantera's data folders.
                          A list of 2 to MAX_MECHANISMS files solves the whole study under each (the
                          first is the reference the design charts and margins use; every table gets
                          the mechanism column and a comparison chart shows their difference).
transport                 "mixture-averaged" (default), "multicomponent" or "unity-Lewis-number"
thermal_diffusion         bool, Soret effect; default false
resolution                "standard" (default, meets the accuracy in docs/benchmarks.md), "fine", or
                          "coarse" (faster, less accurate; labelled in every output)
max_points                guard against runaway sweeps; default 10000
flame_time_limit_s        give up a flame after this much of its own CPU time [s] (its thread's, so a
                          loaded machine does not fail it; recorded as failed, reason "time limit",
                          solved again by the next run); default 20 times the estimated cost of a
                          flame from scratch, at least 60 s (sweep.schedule.flame_time_limit)
cluster                   "tcp://HOST:PORT" of a running Dask scheduler, or "local:N" (N local Dask
                          worker processes); default: none, local processes (--jobs)
[fuels] / [oxidizers]     name = { SPECIES = amount, ... }, normalised to mole fractions
[sweep]
  fuel, oxidizer          lists of names from [fuels] / [oxidizers]
  blend                   { with = fuel name, fraction = [mole fractions of the fuel stream] }
  equivalence_ratio       list, number, or { from, to, step }
  pressure_bar            list, number, or { from, to, step }
  unburned_temperature_K  list, number, or { from, to, step }
"""
from __future__ import annotations

import difflib
import json
import math
import os
import stat
import tomllib
from collections import Counter
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

from .analyses import parts
from .errors import ConfigError, MechanismError, first_line, show
from .facts import MechanismFacts, ReducedMechanism, file_sha256
from .physics import lumping, mixtures
from .physics.gasprops import ISO6976_2016
from .physics.indicators import DEFAULTS as INDICATOR_DEFAULTS
from .physics.premixer import BLOWOUT_CRITICAL_DAMKOHLER

TRANSPORT_MODELS = ("mixture-averaged", "multicomponent", "unity-Lewis-number")
RESOLUTIONS = ("standard", "fine", "coarse")
#: Mechanisms one study may compare (each solves the whole sweep).
MAX_MECHANISMS = 4

TOP_KEYS = ("title", "mechanism", "transport", "thermal_diffusion", "resolution", "max_points", "flame_time_limit_s",
            "reference_fuel", "fuels", "oxidizers", "sweep", "burner", "gas_quality", "indicators", "cluster",
            "limits", "premixer", "keep_profiles", "uncertainty", "reduction")
BURNER_KEYS = ("name", "port", "port_diameter_mm", "port_gap_mm", "port_velocity_m_s", "thermal_input_kW",
               "port_area_mm2", "input_follows_wobbe", "min_flashback_margin", "min_blowoff_margin",
               "stabilizer_size_mm", "approach_velocity_m_s", "stabilizer_blockage", "min_stabilizer_margin", "layout")
#: How the ports sit: apart (each flame on its own, as in the port stability data) or as a
#: deck (a perforated plate or mesh of closely spaced ports whose flames merge).
PORT_LAYOUTS = ("separate", "deck")
GAS_QUALITY_KEYS = ("combustion_temperature_C", "metering_temperature_C", "wobbe", "wobbe_band_MJ_m3",
                    "wobbe_tolerance_percent")
#: Default minimum margins of the burner verdict (common practice without source: set your own).
DEFAULT_MIN_MARGIN = 1.5
LIMITS_KEYS = ("find", "criteria", "blend_fraction_tolerance", "equivalence_ratio_tolerance",
               "max_flames_per_search")
#: What a [limits] table may ask for: the largest admissible blend fraction at every other
#: sweep setting, and the lean and rich edges of the equivalence-ratio window at every blend.
LIMIT_KINDS = ("blend_fraction", "equivalence_ratio")
#: What a limit may keep: burner margins (the stabilizer one only where the burner has a
#: stabilizer), a premixer's core-flow flashback margin and extinction-strain blowout margin
#: (with [premixer]; the blowout with a stabilizer and the analysis table that enables it, whose
#: ladders give the extinction strain rate: AnalysisTable.enables) and, along the blend axis, the
#: Wobbe band of [gas_quality].
LIMIT_CRITERIA = ("flashback", "blowoff", "stabilizer", "core_flashback", "extinction_blowout", "wobbe")
#: Default tolerances of a limit search: the width of the final bracket (0.5 percentage
#: points of blend fraction; 0.005 in equivalence ratio).
DEFAULT_LIMIT_TOLERANCE = {"blend_fraction": 0.005, "equivalence_ratio": 0.005}
#: Flames one limit search may solve before it stops and reports its bracket.
DEFAULT_MAX_FLAMES_PER_SEARCH = 12
PREMIXER_KEYS = ("residence_time_ms", "min_autoignition_margin", "turbulence_intensity_percent", "integral_length_mm",
                 "turbulent_flashback_peclet", "blowout_damkohler")
REDUCTION_KEYS = ("flame_speed_error_percent", "ignition_delay_error_percent", "species", "species_error_percent",
                  "validation_flames")
#: [reduction]'s default targets [%]: the largest flame-speed, ignition-delay and target-species
#: error of the skeletal mechanism against the detailed one on the validation points.
DEFAULT_REDUCTION_TARGETS_PERCENT = {"flame_speed_error_percent": 1.0, "ignition_delay_error_percent": 10.0,
                                     "species_error_percent": 10.0}
#: Allowed range of each target [%].
REDUCTION_TARGET_RANGES = {"flame_speed_error_percent": (0.1, 20.0), "ignition_delay_error_percent": (1.0, 100.0),
                           "species_error_percent": (1.0, 100.0)}
#: Validation flames (each solved with the detailed mechanism once and with every candidate that
#: passes the ignition check) by default, where the detailed mechanism has at most
#: FLAME_VALIDATION_MAX_SPECIES species (GRI-Mech 3.0 has 53: a flame from scratch in 10-20 s);
#: a larger one is validated on ignition delays only unless the table asks for flames.
DEFAULT_VALIDATION_FLAMES = 4
FLAME_VALIDATION_MAX_SPECIES = 60
MAX_VALIDATION_FLAMES = 12
UNCERTAINTY_KEYS = ("kinetics", "factors", "default_factor", "factor_sigmas", "error_bars")
#: Default step of the inert's mole fraction for the Zeldovich flames.
from .physics.kinetic_uncertainty import reaction_key  # noqa: E402
from .physics.rate_factors import DEFAULT_RATE_FACTOR, MAX_RATE_FACTOR, SIGMAS_PER_FACTOR  # noqa: E402

#: Default required autoignition margin (ignition delay over premixer residence time;
#: common practice without source: set your own).
DEFAULT_MIN_AUTOIGNITION_MARGIN = 3.0
SWEEP_KEYS = ("fuel", "oxidizer", "blend", "equivalence_ratio", "pressure_bar", "unburned_temperature_K")
BLEND_KEYS = ("with", "fraction")
RANGE_KEYS = ("from", "to", "step")

#: Allowed open/closed ranges of the sweep axes: (low, high) with low exclusive for the
#: quantities that must be positive. The upper limits only catch typing errors.
AXIS_LIMITS = {
    "equivalence_ratio": (0.0, 10.0),
    "pressure_bar": (0.0, 500.0),
    "unburned_temperature_K": (0.0, 2000.0),
}
#: Lowest unburned temperature [K]: colder premixed gas is not met in burners, and a
#: value below it is almost always degrees Celsius typed as kelvin (27 for 300 K).
MIN_UNBURNED_TEMPERATURE_K = 200.0

#: A study config is a short text file; anything larger is refused before it is read.
MAX_CONFIG_BYTES = 1_000_000
#: Least O2 a fuel stream may need to burn [mol O2 / mol fuel stream]; below it the
#: stream is inert for every practical purpose (and its mixtures underflow).
MIN_O2_NEED = 1e-6
#: Most values one sweep axis may have (max_points guards the whole sweep).
MAX_AXIS_VALUES = 1_000_000


@dataclass(frozen=True)
class Burner:
    """The user's burner: port geometry, how its port velocity is set, minimum margins (SI)."""

    name: str
    port: str                      # "round" or "slot"
    port_size_m: float             # diameter (round) or gap (slot)
    port_velocity_m_s: float | None = None
    thermal_input_W: float | None = None
    port_area_m2: float | None = None
    input_follows_wobbe: bool = False
    min_flashback_margin: float = DEFAULT_MIN_MARGIN
    min_blowoff_margin: float = DEFAULT_MIN_MARGIN
    stabilizer_size_m: float | None = None
    approach_velocity_m_s: float | None = None
    stabilizer_blockage: float = 0.0   # area fraction of the duct the bluff body blocks
    layout: str = "separate"           # PORT_LAYOUTS
    min_stabilizer_margin: float = DEFAULT_MIN_MARGIN

    @property
    def on_stabilizer(self) -> bool:
        """The flame is held by a bluff body: its blowoff is the stabilizer's (Zukoski-Marble
        velocity), not the port rim's critical gradient."""
        return self.stabilizer_size_m is not None

    @property
    def blowoff(self) -> tuple[str, float, str]:
        """(margin column, minimum, name) of the blowoff criterion that applies to this burner."""
        if self.on_stabilizer:
            return "stabilizer_margin", self.min_stabilizer_margin, "stabilizer"
        return "blowoff_margin", self.min_blowoff_margin, "blowoff"

    @property
    def mode(self) -> str:
        """'velocity', 'thermal input' or 'supply pressure' (thermal input follows the Wobbe index)."""
        if self.port_velocity_m_s is not None:
            return "velocity"
        return "supply pressure" if self.input_follows_wobbe else "thermal input"


@dataclass(frozen=True)
class Limits:
    """What a [limits] table asks for: which limits, kept by which burner margins, how fine."""

    find: tuple[str, ...]               # members of LIMIT_KINDS
    criteria: tuple[str, ...]           # members of LIMIT_CRITERIA
    tolerance: dict                     # kind -> width of the final bracket (blend fraction 0..1, phi)
    max_flames_per_search: int = DEFAULT_MAX_FLAMES_PER_SEARCH


@dataclass(frozen=True)
class Premixer:
    """A premixer ahead of the flame: how long the fresh mixture stays in it, and the
    autoignition margin (ignition delay / residence time) the verdict requires."""

    residence_time_s: float
    min_autoignition_margin: float = DEFAULT_MIN_AUTOIGNITION_MARGIN
    #: The flow's turbulence where the flame sits: u' as a share of the bulk (port) velocity, and
    #: the integral length [m]; None: estimated from the burner's duct (physics.premixer.duct_turbulence).
    turbulence_intensity: float | None = None
    integral_length_m: float | None = None
    #: Pe_F of turbulent boundary-layer flashback, calibrated by the user (None: not set, and the
    #: boundary-layer margin is not assessed in turbulent duct flow; physics.premixer.boundary_layer_flashback).
    turbulent_flashback_peclet: float | None = None
    #: Critical extinction Damkohler number of lean blowout (physics.premixer.BLOWOUT_CRITICAL_DAMKOHLER).
    blowout_damkohler: float = BLOWOUT_CRITICAL_DAMKOHLER


@dataclass(frozen=True)
class Uncertainty:
    """The [uncertainty] request: flame-speed sensitivities to every rate constant of each
    burning point (``kinetics``, one adjoint solve each after the sweep), combined with
    rate-constant uncertainty factors into a kinetic band (physics.kinetic_uncertainty).
    ``factors`` are the user's (reaction_key -> f), over the packaged table
    (chemistry.rate_factors); ``default_factor`` is f of reactions neither names.
    ``factor_sigmas``: how many standard deviations of ln k a factor's bound stands for.
    ``error_bars`` draws each flame's numerical error band on the flame-speed chart."""

    kinetics: bool = True
    factors: tuple[tuple[str, float], ...] = ()
    default_factor: float = DEFAULT_RATE_FACTOR
    factor_sigmas: float = SIGMAS_PER_FACTOR
    error_bars: bool = False


@dataclass(frozen=True)
class Reduction:
    """The [reduction] request: a skeletal mechanism for the study's own conditions (sweep.skeletal),
    the smallest whose errors against the detailed mechanism stay within these targets (fractions,
    0.01 = 1 %) on validation points it was not trained on: the flame speed of ``validation_flames``
    flames of the study, the ignition delays, and the target ``species`` (the table's and those an
    analysis reads: its table's kept_species, NO, NO2, N2O and CO with [emissions]) at the flames' outlets."""

    flame_speed_error: float
    ignition_delay_error: float
    species_error: float
    species: tuple[str, ...] = ()
    validation_flames: int = DEFAULT_VALIDATION_FLAMES


@dataclass(frozen=True)
class TableContext:
    """What an analysis's table may be checked against: the study's mechanisms, whether flame
    profiles are stored, the sweep's axes (name -> values as swept, for a table that picks swept
    mixtures)."""

    mechanisms: tuple[MechanismFacts, ...]
    keep_profiles: bool
    axes: dict[str, tuple] = field(default_factory=dict)


@dataclass(frozen=True)
class AnalysisTable:
    """The study table of an analysis (flamecharts.analyses: its ``table`` part's TABLE): its name,
    its keys, ``parse(value, context)`` -> its frozen dataclass (raising a one-line ConfigError),
    the species a [reduction] must keep for it, and the [limits] criteria that read its values
    (``enables``: a study without the table may not ask for them)."""

    name: str
    keys: tuple[str, ...]
    parse: Callable[[Any, TableContext], Any]
    kept_species: Callable[[Any], tuple[str, ...]] = lambda table: ()
    enables: tuple[str, ...] = ()


def analysis_tables() -> list[AnalysisTable]:
    """The registered analyses' tables, in flamecharts.analyses.ANALYSES order."""
    return [m.TABLE for m in parts("table")]


def top_keys() -> tuple[str, ...]:
    """Every top-level key a study file may have: TOP_KEYS and the analyses' table names."""
    return TOP_KEYS + tuple(spec.name for spec in analysis_tables())


@dataclass(frozen=True)
class GasQuality:
    """Reference state of the fuel-gas properties and the allowed Wobbe band."""

    combustion_T_C: int = 15
    metering_T_C: int = 15
    wobbe: str = "higher"                       # which Wobbe index the band applies to
    band_MJ_m3: tuple[float, float] | None = None
    tolerance_percent: float | None = None      # +/- around the reference fuel


@dataclass(frozen=True)
class MechanismChoice:
    """One mechanism of a study that compares several: the name as written, its file, its content
    hash, its species' element counts and those of the gas-analysis species it lacks."""

    name: str
    path: str
    sha256: str
    atoms: dict[str, dict[str, float]] = field(repr=False)
    analysis_atoms: dict[str, dict[str, float]] = field(repr=False)
    facts: MechanismFacts = field(repr=False, compare=False)


@dataclass(frozen=True)
class Study:
    """A validated study: the cartesian product of its sweep axes.

    Compositions are normalised mole fractions; pressures are in bar as written by the
    user (converted to Pa where the physics needs it), temperatures in K.
    """

    title: str
    name: str
    mechanism: str
    mechanism_path: str
    mechanism_sha256: str
    transport: str
    thermal_diffusion: bool
    resolution: str
    fuels: dict[str, dict[str, float]]
    oxidizers: dict[str, dict[str, float]]
    sweep_fuels: tuple[str, ...]
    sweep_oxidizers: tuple[str, ...]
    blend_with: str | None
    blend_fractions: tuple[float, ...]
    equivalence_ratios: tuple[float, ...]
    pressures_bar: tuple[float, ...]
    unburned_temperatures_K: tuple[float, ...]
    atoms: dict[str, dict[str, float]] = field(repr=False)   # the mechanism's species -> element counts
    analysis_atoms: dict[str, dict[str, float]] = field(default_factory=dict, repr=False)  # fuel species it lacks
    max_points: int = 10000
    flame_time_limit_s: float | None = None  # None: sweep.schedule.flame_time_limit of the mechanism
    config_path: str | None = None
    raw: dict = field(default_factory=dict, repr=False, compare=False)
    reference_fuel: str | None = None
    burner: Burner | None = None
    gas_quality: GasQuality = None  # type: ignore[assignment]  # study_from_dict always sets it (_design_tables)
    indicator_settings: dict = field(default_factory=dict)
    cluster: str | None = None   # Dask scheduler address or "local:N"; None: local processes
    limits: Limits | None = None
    premixer: Premixer | None = None
    keep_profiles: bool = True   # False: the store keeps no flame profiles (every flame then starts fresh)
    uncertainty: Uncertainty | None = None
    #: The registered analyses' tables (flamecharts.analyses), by table name; each analysis reads its own
    #: through its table part's ``of(study)``.
    tables: dict[str, Any] = field(default_factory=dict)
    reduction: Reduction | None = None
    #: The skeletal mechanism a run made for [reduction] (sweep.skeletal; config.with_reduction), None before.
    reduced: ReducedMechanism | None = field(default=None, repr=False, compare=False)
    #: Several mechanisms to compare (the first is the one above); () when the study has one.
    mechanisms: tuple[MechanismChoice, ...] = ()
    #: What the read side needs of the mechanism above (kept with a run: facts.MechanismFacts).
    facts: MechanismFacts | None = field(default=None, repr=False, compare=False)

    @property
    def n_points(self) -> int:
        """Points of the sweep, times the mechanisms it compares: the flames of the whole study."""
        return (len(self.sweep_fuels) * len(self.sweep_oxidizers) * len(self.blend_fractions)
                * len(self.equivalence_ratios) * len(self.pressures_bar) * len(self.unburned_temperatures_K)
                * max(1, len(self.mechanisms)))


def by_mechanism(study: Study) -> list[Study]:
    """The study once per mechanism it compares, the reference (first) mechanism first; each
    is an ordinary one-mechanism study (points, warm starts, extras, read-out run on it
    unchanged). A one-mechanism study gives itself."""
    if len(study.mechanisms) <= 1:
        return [study]
    return [replace(study, mechanism=m.name, mechanism_path=m.path, mechanism_sha256=m.sha256, atoms=m.atoms,
                    analysis_atoms=m.analysis_atoms, mechanisms=(), facts=m.facts) for m in study.mechanisms]


def with_reduction(study: Study, reduced: ReducedMechanism) -> Study:
    """The study as its flames are solved under [reduction]: its mechanism the skeletal one (file,
    hash, so every point's key; species; facts), ``reduced`` the record of it. When no skeletal
    mechanism met the targets (``reduced.reduced`` False), the detailed mechanism with the record."""
    if not reduced.reduced or reduced.facts is None:
        return replace(study, reduced=reduced)
    return replace(study, mechanism_path=reduced.facts.path, mechanism_sha256=reduced.sha256,
                   atoms=reduced.facts.atoms, facts=reduced.facts, reduced=reduced)


def detailed_path(study: Study) -> str:
    """The file of the mechanism the study names (the detailed one, also under [reduction]): what
    the tables of mechanism scopes look up."""
    return study.reduced.detailed_path if study.reduced is not None else study.mechanism_path


def reduction_note(study: Study) -> str:
    """One sentence on the skeletal mechanism the flames burn and its measured error ('' without
    [reduction] or before it is made); every output carries it."""
    r = study.reduced
    if r is None:
        return ""
    name = Path(study.mechanism).name
    if not r.reduced:
        return (f"Mechanism reduction asked for ({_targets_words(r.targets)}), but none made of {name}: "
                f"{r.why_detailed}; {r.validation_words}. The flames burn the detailed mechanism, so there is "
                "no reduction band.")
    speed = r.flame_speed_error
    measured = (f"flame speed within {100 * speed:.2g} % of the detailed mechanism on "
                f"{sum(f.get('error') is not None for f in r.flames)} validation flame(s)" if speed is not None else
                "flame speed not measured (no validation flame burned or none asked for)")
    return (f"The flames burn a skeletal {name} of {len(r.species)} of {r.detailed_size[0]} species "
            f"and {r.reactions} of {r.detailed_size[1]} reactions ({r.file}, DRGEP), {measured}; ignition delays "
            f"within {100 * r.ignition_delay_error:.2g} % at {len(r.ignition_errors)} point(s); targets "
            f"{_targets_words(r.targets)}.")


def _targets_words(t: dict) -> str:
    return (f"flame speed {100 * t['flame_speed']:g} %, ignition delay {100 * t['ignition_delay']:g} %"
            + (f", {', '.join(t['species'])} {100 * t['species_error']:g} %" if t.get("species") else ""))


def suggest_allowed(key: str, allowed: tuple[str, ...] | list[str]) -> str:
    close = difflib.get_close_matches(key, list(allowed), n=1, cutoff=0.6)
    hint = f" (did you mean '{close[0]}'?)" if close else ""
    return f"{hint}; allowed: {', '.join(allowed)}"


def _suggest_species(name: str, species: list[str]) -> str:
    by_lower = {s.lower(): s for s in species}
    close = difflib.get_close_matches(name.lower(), list(by_lower), n=1, cutoff=0.6)
    hint = f" (did you mean '{by_lower[close[0]]}'?)" if close else ""
    listed = ", ".join(species[:15]) + (f", ... ({len(species)} species)" if len(species) > 15 else "")
    return f"{hint}; it has {listed}"


def check_keys(table: dict, allowed: tuple[str, ...], where: str) -> None:
    for key in table:
        if not isinstance(key, str):
            raise ConfigError(f"key {show(key)} in '{where or 'config'}' is not a name; allowed: {', '.join(allowed)}")
        if key not in allowed:
            raise ConfigError(f"unknown key '{where}{key}'{suggest_allowed(key, allowed)}")


def parse_number(value: Any, where: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ConfigError(f"'{where}' must be a number, got {show(value)}")
    try:
        value = float(value)
    except OverflowError:  # an integer too large for a float
        digits = int(abs(value).bit_length() * math.log10(2)) + 1  # str() of such an int may itself be refused
        raise ConfigError(f"'{where}' must be a finite number, got an integer of about {digits} digits") from None
    if not math.isfinite(value):
        raise ConfigError(f"'{where}' must be a finite number, got {value}")
    return value


def parse_string(value: Any, where: str) -> str:
    if not isinstance(value, str):
        raise ConfigError(f"'{where}' must be a string, got {show(value)}")
    return value


def parse_axis(value: Any, where: str) -> tuple[float, ...]:
    """A sweep axis: a number, a list of numbers, or {from, to, step} (both ends included)."""
    if isinstance(value, dict):
        check_keys(value, RANGE_KEYS, f"{where}.")
        for k in RANGE_KEYS:
            if k not in value:
                raise ConfigError(f"'{where}' range needs 'from', 'to' and 'step'; '{k}' is missing")
        lo, hi, step = (parse_number(value[k], f"{where}.{k}") for k in RANGE_KEYS)
        if step <= 0:
            raise ConfigError(f"'{where}.step' must be > 0, got {step:g}")
        if hi < lo:
            raise ConfigError(f"'{where}.to' ({hi:g}) must not be below '{where}.from' ({lo:g})")
        span = (hi - lo) / step  # inf when the range overflows a float or the step is tiny
        if not span < MAX_AXIS_VALUES:
            many = f"{span + 1:.3g}" if math.isfinite(span) else "too many"
            raise ConfigError(f"'{where}' range from {lo:g} to {hi:g} in steps of {step:g} gives {many} values; "
                              f"at most {MAX_AXIS_VALUES} are allowed")
        n = int(math.floor(span + 1e-9)) + 1
        values = [round(lo + i * step, 10) for i in range(n)]
        if len(set(values)) != len(values):
            raise ConfigError(f"'{where}.step' {step:g} is too small: values repeat when rounded to 10 decimals")
    elif isinstance(value, list):
        values = [parse_number(v, f"{where}[{i}]") for i, v in enumerate(value)]
    elif isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ConfigError(f"'{where}' must be a number, a list of numbers or {{from, to, step}}, got {show(value)}")
    else:
        values = [parse_number(value, where)]
    if not values:
        raise ConfigError(f"sweep axis '{where}' is empty; give at least one value")
    if len(set(values)) != len(values):
        dup = min(v for v, k in Counter(values).items() if k > 1)
        raise ConfigError(f"sweep axis '{where}' lists {dup:g} more than once")
    return tuple(values)


def _limited_axis(value: Any, name: str) -> tuple[float, ...]:
    values = parse_axis(value, f"sweep.{name}")
    lo, hi = AXIS_LIMITS[name]
    for v in values:
        if name == "unburned_temperature_K" and lo < v < MIN_UNBURNED_TEMPERATURE_K:
            raise ConfigError(f"'sweep.{name}' value {v:g} is below {MIN_UNBURNED_TEMPERATURE_K:g} K: temperatures "
                              f"are in kelvin ({v:g} degC is {v + 273.15:g} K); allowed: >= "
                              f"{MIN_UNBURNED_TEMPERATURE_K:g} and <= {hi:g}")
        if not lo < v <= hi:
            hint = (f" (pressures are in bar: {v:g} Pa is {v / 1e5:g} bar)" if name == "pressure_bar" and v > 1000
                    else "")
            raise ConfigError(f"'sweep.{name}' value {v:g} is out of range{hint}; allowed: > {lo:g} and <= {hi:g}")
    return values


def _composition(value: Any, where: str) -> dict[str, float]:
    if not isinstance(value, dict):
        raise ConfigError(f"'{where}' must be a table of species = mole fraction, e.g. {{ CH4 = 1.0 }}")
    if not value:
        raise ConfigError(f"'{where}' is empty; give at least one species with a positive amount")
    amounts = {}
    for sp, x in value.items():
        if not isinstance(sp, str) or not sp.strip():
            raise ConfigError(f"'{where}' has a species named {show(sp)}; give species names of the mechanism")
        x = parse_number(x, f"{where}.{sp}")
        if x < 0:
            raise ConfigError(f"'{where}.{sp}' is {x:g}; amounts must be >= 0")
        amounts[sp] = x
    if not any(x > 0 for x in amounts.values()):
        raise ConfigError(f"'{where}' has no species with a positive amount")
    return mixtures.normalize(amounts)


def _names(value: Any, where: str, defined: dict, kind: str) -> tuple[str, ...]:
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or not value:
        raise ConfigError(f"'{where}' must be a non-empty list of {kind} names from [{kind}s]")
    out = []
    for name in value:
        name = parse_string(name, where)
        if name not in defined:
            raise ConfigError(f"'{where}' names unknown {kind} '{name}'{suggest_allowed(name, list(defined))}")
        if name in out:
            raise ConfigError(f"'{where}' lists {kind} '{name}' more than once")
        out.append(name)
    return tuple(out)


CLUSTER_SCHEMES = ("tcp://", "tls://")


def check_cluster_spec(value: Any, where: str = "cluster") -> str:
    """A Dask scheduler address (tcp://HOST:PORT, tls://HOST:PORT) or 'local:N' with N >= 1."""
    allowed = "tcp://HOST:PORT or tls://HOST:PORT (a running Dask scheduler), or local:N (N local workers)"
    value = parse_string(value, where)
    if value.startswith("local:"):
        n = value[len("local:"):]
        if not n.isdigit() or int(n) < 1:
            raise ConfigError(f"'{where}' is {value!r}: N in local:N must be a whole number >= 1")
        return value
    if value.startswith(CLUSTER_SCHEMES):
        host, _, port = value.split("://", 1)[1].rpartition(":")
        if host and port.isdigit() and 0 < int(port) < 65536:
            return value
        raise ConfigError(f"'{where}' is {value!r}: give the scheduler's host and port, e.g. tcp://10.0.0.5:8786")
    raise ConfigError(f"'{where}' is {value!r}; allowed: {allowed}")


def parse_positive(table: dict, key: str, where: str, scale: float = 1.0) -> float | None:
    if key not in table:
        return None
    v = parse_number(table[key], f"{where}.{key}")
    if v <= 0:
        raise ConfigError(f"'{where}.{key}' must be > 0, got {v:g}")
    return v * scale


def _burner(b: Any) -> Burner:
    if not isinstance(b, dict):
        raise ConfigError("'burner' must be a table")
    check_keys(b, BURNER_KEYS, "burner.")
    port = parse_string(b.get("port", "round"), "burner.port")
    if port not in ("round", "slot"):
        raise ConfigError(f"'burner.port' is {port!r}{suggest_allowed(port, ('round', 'slot'))}")
    layout = parse_string(b.get("layout", "separate"), "burner.layout")
    if layout not in PORT_LAYOUTS:
        raise ConfigError(f"'burner.layout' is {layout!r}{suggest_allowed(layout, PORT_LAYOUTS)}")
    size_key = "port_diameter_mm" if port == "round" else "port_gap_mm"
    other = "port_gap_mm" if port == "round" else "port_diameter_mm"
    if other in b:
        raise ConfigError(f"'burner.{other}' does not apply to a {port} port; give 'burner.{size_key}'")
    size = parse_positive(b, size_key, "burner", 1e-3)
    if size is None:
        raise ConfigError(f"[burner] with port = '{port}' needs '{size_key}'")
    velocity = parse_positive(b, "port_velocity_m_s", "burner")
    q = parse_positive(b, "thermal_input_kW", "burner", 1e3)
    area = parse_positive(b, "port_area_mm2", "burner", 1e-6)
    follows = b.get("input_follows_wobbe", False)
    if not isinstance(follows, bool):
        raise ConfigError(f"'burner.input_follows_wobbe' must be true or false, got {show(follows)}")
    if (velocity is None) == (q is None):
        raise ConfigError("[burner] sets its port velocity one way: give either 'port_velocity_m_s', or "
                          "'thermal_input_kW' with 'port_area_mm2'")
    if q is not None and area is None:
        raise ConfigError("'burner.thermal_input_kW' needs 'burner.port_area_mm2' (total port area)")
    if velocity is not None and (area is not None or follows):
        raise ConfigError("'burner.port_velocity_m_s' fixes the velocity; drop 'port_area_mm2' and "
                          "'input_follows_wobbe', which go with 'thermal_input_kW'")
    margins = {k: parse_positive(b, k, "burner") for k in ("min_flashback_margin", "min_blowoff_margin",
                                                      "min_stabilizer_margin")}
    for k, v in margins.items():
        if v is not None and v < 1.0:
            raise ConfigError(f"'burner.{k}' is {v:g}; allowed: 1 or more (a margin is the burner's "
                              "distance from the limit: below 1 the limit is already crossed)")
    stab = parse_positive(b, "stabilizer_size_mm", "burner", 1e-3)
    approach = parse_positive(b, "approach_velocity_m_s", "burner")
    if (stab is None) != (approach is None):
        raise ConfigError("a bluff-body stabilizer needs both 'burner.stabilizer_size_mm' and "
                          "'burner.approach_velocity_m_s'")
    blockage = parse_number(b["stabilizer_blockage"], "burner.stabilizer_blockage") if "stabilizer_blockage" in b else None
    for key in ("stabilizer_blockage", "min_stabilizer_margin"):
        if key in b and stab is None:
            raise ConfigError(f"'burner.{key}' needs a bluff body: add 'stabilizer_size_mm' and "
                              "'approach_velocity_m_s', or drop it")
    if blockage is not None and not 0.0 <= blockage <= 0.9:
        raise ConfigError(f"'burner.stabilizer_blockage' is {blockage:g}; allowed: 0 to 0.9 (the area fraction of "
                          "the duct the bluff body blocks)")
    return Burner(name=parse_string(b.get("name", "burner"), "burner.name"), port=port, port_size_m=size,
                  port_velocity_m_s=velocity, thermal_input_W=q, port_area_m2=area, input_follows_wobbe=follows,
                  stabilizer_size_m=stab, approach_velocity_m_s=approach, stabilizer_blockage=blockage or 0.0,
                  layout=layout,
                  **{k: v for k, v in margins.items() if v is not None})


def parse_string_list(value: Any, where: str, allowed: tuple[str, ...]) -> tuple[str, ...]:
    items = [value] if isinstance(value, str) else value
    if not isinstance(items, list) or not items:
        raise ConfigError(f"'{where}' must be a list of names; allowed: {', '.join(allowed)}")
    for v in items:
        if not isinstance(v, str) or v not in allowed:
            raise ConfigError(f"'{where}' names {show(v)}{suggest_allowed(str(v), allowed)}")
    return tuple(dict.fromkeys(items))


def _limit_criteria(t: dict, burner: Burner, has_band: bool, premixer: bool, enabled: set[str]) -> tuple[str, ...]:
    """limits.criteria, checked against what each criterion needs. Default: flashback, the burner's
    blowoff criterion (the rim's, or the stabilizer's), and with [premixer] the core-flow flashback
    margin, with a stabilizer and the table that ``enabled`` it (AnalysisTable.enables: the
    ladders' extinction strain rate) the extinction-strain blowout, and the Wobbe band where
    [gas_quality] sets one."""
    ladders = "extinction_blowout" in enabled
    default = (["flashback", burner.blowoff[2]] + (["core_flashback"] if premixer else [])
               + (["extinction_blowout"] if premixer and ladders and burner.stabilizer_size_m is not None else [])
               + (["wobbe"] if has_band else []))
    criteria = parse_string_list(t.get("criteria", default), "limits.criteria", LIMIT_CRITERIA)
    if "stabilizer" in criteria and burner.stabilizer_size_m is None:
        raise ConfigError("'limits.criteria' names 'stabilizer', but [burner] has no 'stabilizer_size_mm'")
    for c, what in (("core_flashback", "the core-flow flashback margin"), ("extinction_blowout", "the blowout margin")):
        if c in criteria and not premixer:
            raise ConfigError(f"'limits.criteria' names {c!r}, but the study has no [premixer]: {what} is a "
                              "premixer's (add [premixer] with its residence_time_ms)")
    if "extinction_blowout" in criteria and burner.stabilizer_size_m is None:
        raise ConfigError("'limits.criteria' names 'extinction_blowout', but [burner] has no 'stabilizer_size_mm' "
                          "(with 'approach_velocity_m_s'): Da_ext needs the stabilizer's size and edge velocity")
    if "extinction_blowout" in criteria and not ladders:
        raise ConfigError("'limits.criteria' names 'extinction_blowout', but the study has no "
                          f"{_enabling_table('extinction_blowout')}: the extinction strain rate comes from its "
                          "strained-flame ladders")
    if "wobbe" in criteria and not has_band:
        raise ConfigError("'limits.criteria' names 'wobbe', but [gas_quality] sets no band: add "
                          "'wobbe_tolerance_percent' or 'wobbe_band_MJ_m3'")
    if criteria == ("wobbe",):
        raise ConfigError("'limits.criteria' needs at least one burner margin besides 'wobbe': "
                          + ", ".join(c for c in LIMIT_CRITERIA if c != "wobbe"))
    return criteria


def _enabling_table(criterion: str) -> str:
    """'[NAME]' of the analysis table that enables the limit ``criterion`` (AnalysisTable.enables)."""
    names = [f"[{spec.name}]" for spec in analysis_tables() if criterion in spec.enables]
    return " or ".join(names) or "registered analysis that gives it"


def _limits(t: Any, burner: Burner | None, blend_with: str | None, gas_quality: GasQuality, premixer: bool = False,
            enabled: set[str] | None = None) -> Limits:
    """The [limits] table: checked against the burner, the sweep and the tables it needs."""
    if not isinstance(t, dict):
        raise ConfigError("'limits' must be a table")
    check_keys(t, LIMITS_KEYS, "limits.")
    if burner is None:
        raise ConfigError("[limits] keeps the burner's margins: the study needs a [burner] table")
    find = parse_string_list(t.get("find", list(LIMIT_KINDS) if blend_with else ["equivalence_ratio"]), "limits.find",
                        LIMIT_KINDS)
    if "blend_fraction" in find and not blend_with:
        raise ConfigError("'limits.find' asks for 'blend_fraction', but the sweep blends nothing: add "
                          "sweep.blend = { with = ..., fraction = [...] }")
    has_band = gas_quality.band_MJ_m3 is not None or gas_quality.tolerance_percent is not None
    criteria = _limit_criteria(t, burner, has_band, premixer, enabled or set())
    tol = dict(DEFAULT_LIMIT_TOLERANCE)
    for kind, top in (("blend_fraction", 0.1), ("equivalence_ratio", 0.1)):
        key = f"{kind}_tolerance"
        if key in t:
            v = parse_number(t[key], f"limits.{key}")
            if not 0 < v <= top:
                raise ConfigError(f"'limits.{key}' is {v:g}; allowed: above 0, at most {top:g}"
                                  + (" (a mole fraction: 0.5 percentage points is 0.005)"
                                     if kind == "blend_fraction" and v > top else ""))
            tol[kind] = v
    n = t.get("max_flames_per_search", DEFAULT_MAX_FLAMES_PER_SEARCH)
    if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= 100:
        raise ConfigError(f"'limits.max_flames_per_search' must be a whole number from 1 to 100, got {show(n)}")
    return Limits(find=find, criteria=criteria, tolerance=tol, max_flames_per_search=n)


def _premixer(t: Any) -> Premixer:
    if not isinstance(t, dict):
        raise ConfigError("'premixer' must be a table")
    check_keys(t, PREMIXER_KEYS, "premixer.")
    tau = parse_positive(t, "residence_time_ms", "premixer", 1e-3)
    if tau is None:
        raise ConfigError("[premixer] needs 'residence_time_ms' (mean residence time of the fresh mixture, ms)")
    if tau > 10.0:
        raise ConfigError(f"'premixer.residence_time_ms' is {tau * 1e3:g} ms, more than 10 s: the key is in "
                          "milliseconds (a 2 ms premixer is 2)")
    m = parse_positive(t, "min_autoignition_margin", "premixer")
    if m is not None and m < 1.0:
        raise ConfigError(f"'premixer.min_autoignition_margin' is {m:g}; allowed: 1 or more (ignition delay over "
                          "residence time: below 1 the mixture ignites inside the premixer)")
    intensity = parse_positive(t, "turbulence_intensity_percent", "premixer", 0.01)
    if intensity is not None and not 0.001 <= intensity <= 1.0:
        raise ConfigError(f"'premixer.turbulence_intensity_percent' is {100 * intensity:g}; allowed: 0.1 to 100 "
                          "(u' in per cent of the bulk velocity at the flame; ducts about 5-10, swirlers 10-30)")
    length = parse_positive(t, "integral_length_mm", "premixer", 1e-3)
    if length is not None and length > 1.0:
        raise ConfigError(f"'premixer.integral_length_mm' is {length * 1e3:g} mm, more than 1 m: the key is in mm")
    pe = parse_positive(t, "turbulent_flashback_peclet", "premixer")
    if pe is not None and pe > 1e4:
        raise ConfigError(f"'premixer.turbulent_flashback_peclet' is {pe:g}; allowed: above 0, at most 10000 (the "
                          "laminar tube value is 13; calibrate it on your own premixer)")
    da = parse_positive(t, "blowout_damkohler", "premixer")
    if da is not None and not 0.01 <= da <= 100.0:
        raise ConfigError(f"'premixer.blowout_damkohler' is {da:g}; allowed: 0.01 to 100 (critical extinction "
                          "Damkohler number of lean blowout, of order one)")
    return Premixer(residence_time_s=tau, turbulence_intensity=intensity, integral_length_m=length,
                    turbulent_flashback_peclet=pe, **({} if m is None else {"min_autoignition_margin": m}),
                    **({} if da is None else {"blowout_damkohler": da}))


def _reduction(t: Any, facts: MechanismFacts, n_mechanisms: int, kept: tuple[str, ...] = ()) -> Reduction:
    """The [reduction] table: targets in their ranges, target species the mechanism's (``kept``,
    those the study's analyses read, added first), one mechanism."""
    if not isinstance(t, dict):
        raise ConfigError("'reduction' must be a table")
    check_keys(t, REDUCTION_KEYS, "reduction.")
    if n_mechanisms > 1:
        raise ConfigError(f"[reduction] reduces one mechanism, and 'mechanism' lists {n_mechanisms}: compare "
                          "mechanisms without [reduction], or reduce one of them in a study of its own")
    targets = {}
    for key, default in DEFAULT_REDUCTION_TARGETS_PERCENT.items():
        v = parse_number(t.get(key, default), f"reduction.{key}")
        lo, hi = REDUCTION_TARGET_RANGES[key]
        if not lo <= v <= hi:
            raise ConfigError(f"'reduction.{key}' is {v:g}; allowed: {lo:g} to {hi:g} (per cent of the detailed "
                              "mechanism's value)")
        targets[key] = v / 100.0
    given = t.get("species", [])
    if isinstance(given, str):
        given = [given]
    if not isinstance(given, list):
        raise ConfigError(f"'reduction.species' must be a list of species names, got {show(given)}")
    species = list(kept)
    for sp in given:
        if not isinstance(sp, str) or sp not in facts.atoms:
            raise ConfigError(f"'reduction.species' names {show(sp)}, which mechanism {Path(facts.path).name} does "
                              f"not have{_suggest_species(str(sp), list(facts.atoms))}")
        species.append(sp)
    default_flames = DEFAULT_VALIDATION_FLAMES if len(facts.atoms) <= FLAME_VALIDATION_MAX_SPECIES else 0
    n = t.get("validation_flames", default_flames)
    if isinstance(n, bool) or not isinstance(n, int) or not 0 <= n <= MAX_VALIDATION_FLAMES:
        raise ConfigError(f"'reduction.validation_flames' must be a whole number from 0 to {MAX_VALIDATION_FLAMES} "
                          f"(flames of the study solved with both mechanisms; 0: ignition delays only), got {show(n)}")
    return Reduction(flame_speed_error=targets["flame_speed_error_percent"],
                     ignition_delay_error=targets["ignition_delay_error_percent"],
                     species_error=targets["species_error_percent"],
                     species=tuple(dict.fromkeys(s for s in species if s in facts.atoms)), validation_flames=n)


def _uncertainty(t: Any, mechs: list[MechanismFacts]) -> Uncertainty:
    """The [uncertainty] table; each reaction named in ``factors`` must be in one of the study's mechanisms
    (a factor applies in every mechanism that has the reaction)."""
    if not isinstance(t, dict):
        raise ConfigError("'uncertainty' must be a table")
    check_keys(t, UNCERTAINTY_KEYS, "uncertainty.")
    flags = {}
    for flag, unset in (("kinetics", True), ("error_bars", False)):
        flags[flag] = t.get(flag, unset)
        if not isinstance(flags[flag], bool):
            raise ConfigError(f"'uncertainty.{flag}' must be true or false, got {show(flags[flag])}")
    default = parse_number(t["default_factor"], "uncertainty.default_factor") if "default_factor" in t else None
    if default is not None and not 1.0 <= default <= MAX_RATE_FACTOR:
        raise ConfigError(f"'uncertainty.default_factor' is {default:g}; allowed: 1 to {MAX_RATE_FACTOR:g} (a "
                          "factor f: the rate constant lies between k/f and k*f)")
    sigmas = parse_number(t["factor_sigmas"], "uncertainty.factor_sigmas") if "factor_sigmas" in t else None
    if sigmas is not None and not 1.0 <= sigmas <= 4.0:
        raise ConfigError(f"'uncertainty.factor_sigmas' is {sigmas:g}; allowed: 1 to 4 (standard deviations a "
                          "factor's bound stands for: 2 or 3 in the literature)")
    given = t.get("factors", {})
    if not isinstance(given, dict):
        raise ConfigError("'uncertainty.factors' must be a table of \"reaction equation\" = factor, e.g. "
                          "factors = { \"H + O2 <=> O + OH\" = 1.3 }")
    equations = [e for m in mechs for e in m.reaction_equations]
    mech_paths = [Path(m.path) for m in mechs]
    by_key = {reaction_key(e): e for e in equations}
    names = (f"{Path(mech_paths[0]).name} does not have" if len(mech_paths) == 1 else
             "neither " + " nor ".join(Path(path).name for path in mech_paths) + " has")
    factors: list[tuple[str, float]] = []
    named: dict[str, str] = {}
    for eq, f in given.items():
        key: str | None
        try:
            key = reaction_key(eq)
        except ValueError:
            key = None
        if key not in by_key:
            close = difflib.get_close_matches(eq, list(dict.fromkeys(equations)), n=3, cutoff=0.6)
            raise ConfigError(f"'uncertainty.factors' names reaction {eq!r}, which {names}"
                              + (f" (did you mean {' or '.join(repr(c) for c in close)}?)" if close else "")
                              + "; write the equation as the mechanism does, species and '<=>' separated by "
                              "spaces, e.g. \"H + O2 <=> O + OH\"")
        if key in named:
            raise ConfigError(f"'uncertainty.factors' names the same reaction twice: {named[key]!r} and {eq!r}; "
                              "give it one factor")
        named[key] = eq
        if isinstance(f, bool) or not isinstance(f, (int, float)) or not 1.0 <= f <= MAX_RATE_FACTOR:
            raise ConfigError(f"'uncertainty.factors' gives {eq!r} the factor {show(f)}; allowed: a number from 1 to "
                              f"{MAX_RATE_FACTOR:g}")
        factors.append((key, float(f)))
    return Uncertainty(kinetics=flags["kinetics"], error_bars=flags["error_bars"], factors=tuple(factors),
                       **({} if default is None else {"default_factor": default}),
                       **({} if sigmas is None else {"factor_sigmas": sigmas}))


def _gas_quality(g: Any) -> GasQuality:
    if not isinstance(g, dict):
        raise ConfigError("'gas_quality' must be a table")
    check_keys(g, GAS_QUALITY_KEYS, "gas_quality.")
    out = {}
    for key, allowed in (("combustion_temperature_C", (0, 15, 25)), ("metering_temperature_C", (0, 15))):
        if key in g:
            v = parse_number(g[key], f"gas_quality.{key}")
            if v not in allowed:
                raise ConfigError(f"'gas_quality.{key}' is {v:g}; allowed: {', '.join(map(str, allowed))} "
                                  "(the reference temperatures of ISO 6976)")
            out["combustion_T_C" if key.startswith("comb") else "metering_T_C"] = int(v)
    wobbe = parse_string(g.get("wobbe", "higher"), "gas_quality.wobbe")
    if wobbe not in ("higher", "lower"):
        raise ConfigError(f"'gas_quality.wobbe' is {wobbe!r}; allowed: higher, lower")
    band = g.get("wobbe_band_MJ_m3")
    tol = parse_positive(g, "wobbe_tolerance_percent", "gas_quality")
    if band is not None and tol is not None:
        raise ConfigError("give either 'gas_quality.wobbe_band_MJ_m3' or 'gas_quality.wobbe_tolerance_percent', "
                          "not both")
    if band is not None:
        if not isinstance(band, list) or len(band) != 2:
            raise ConfigError("'gas_quality.wobbe_band_MJ_m3' must be [low, high] in MJ/m^3")
        lo, hi = (parse_number(v, f"gas_quality.wobbe_band_MJ_m3[{i}]") for i, v in enumerate(band))
        if not 0 < lo < hi:
            raise ConfigError(f"'gas_quality.wobbe_band_MJ_m3' must satisfy 0 < low < high, got [{lo:g}, {hi:g}]")
        band = (lo, hi)
    return GasQuality(wobbe=wobbe, band_MJ_m3=band, tolerance_percent=tol, **out)


def _indicator_settings(t: Any) -> dict:

    if not isinstance(t, dict):
        raise ConfigError("'indicators' must be a table")
    check_keys(t, tuple(INDICATOR_DEFAULTS), "indicators.")
    return {**INDICATOR_DEFAULTS, **{k: parse_positive(t, k, "indicators") for k in t}}


def _check_species(fuels: dict, oxidizers: dict, sweep_fuels, sweep_oxidizers, blend_with, atoms: dict,
                   mech_path: Path) -> dict[str, dict[str, float]]:
    """Every species the study burns is the mechanism's or, in a fuel, a gas-analysis component that
    can be lumped onto it (physics.lumping); returns the element counts of the latter."""
    used = {**{n: fuels[n] for n in sweep_fuels}, **({blend_with: fuels[blend_with]} if blend_with else {})}
    analysis_atoms: dict[str, dict[str, float]] = {}
    for kind, table in (("fuels", used), ("oxidizers", {n: oxidizers[n] for n in sweep_oxidizers})):
        for n, comp in table.items():
            for sp in comp:
                if sp in atoms:
                    continue
                if kind == "fuels" and sp in ISO6976_2016:  # a gas-analysis component: lumped for the flame
                    try:
                        lumping.lump({sp: 1.0}, atoms)
                        analysis_atoms[sp] = dict(lumping.formula_atoms(sp))
                        continue
                    except ValueError as exc:
                        raise _missing(sp, f"{kind}.{n}", f"species '{sp}' in 'fuels.{n}' is not in mechanism "
                                       f"{mech_path.name}{_suggest_species(sp, list(atoms))}; nor can it be lumped "
                                       f"onto the mechanism's species ({exc})") from None
                raise _missing(sp, f"{kind}.{n}",
                               f"species '{sp}' in '{kind}.{n}' is not in mechanism {mech_path.name}"
                               f"{_suggest_species(sp, list(atoms))}"
                               + ("; gas-analysis components (ISO 6976 names such as n-C4H10, He) are lumped onto "
                                  "the mechanism's species" if kind == "fuels" else ""))
    return analysis_atoms


def _missing(species: str, where: str, message: str) -> MechanismError:
    """The error of a species a mechanism lacks, with the species and its config table attached
    (a study comparing mechanisms names the others that have it)."""
    exc = MechanismError(message)
    exc.species, exc.where = species, where
    return exc


def _check_mixtures(fuels: dict, oxidizers: dict, sweep_fuels, sweep_oxidizers, blend_with, fractions, phis,
                    atoms_all: dict) -> None:
    """Oxidizers hold O2 and nothing combustible; every fuel stream burns and gives a usable
    mixture at the ends of the equivalence-ratio axis."""
    for n in sweep_oxidizers:
        if oxidizers[n].get("O2", 0.0) <= 0:
            raise ConfigError(f"'oxidizers.{n}' has no O2; an oxidizer must contain O2")
        burnable = [sp for sp in oxidizers[n] if sp != "O2" and mixtures.stoich_o2_per_fuel(atoms_all, {sp: 1.0}) > 0]
        if burnable:
            raise ConfigError(f"'oxidizers.{n}' contains combustible {', '.join(burnable)}; the equivalence "
                              "ratio would be wrong: put fuels in [fuels] and blend them there")
    for n in sweep_fuels:
        for f in fractions:
            comp = mixtures.blend(fuels[n], fuels[blend_with], f) if blend_with else fuels[n]
            need = mixtures.stoich_o2_per_fuel(atoms_all, comp)
            what = f"'fuels.{n}'" + (f" blended with {f:g} of '{blend_with}'" if blend_with else "")
            if need <= 0:
                raise ConfigError(f"{what} has no combustible species (it needs no oxygen to burn)")
            if need < MIN_O2_NEED:
                raise ConfigError(f"{what} has almost no combustible species (it needs {need:.3g} mol O2 per mol "
                                  f"to burn; at least {MIN_O2_NEED:g} is allowed)")
            for ox in sweep_oxidizers:
                for phi in (phis[0], phis[-1], min(phis), max(phis)):
                    try:
                        mixtures.unburned_mixture(comp, oxidizers[ox], phi, need)
                    except mixtures.MixtureError as exc:
                        raise ConfigError(f"{what} in 'oxidizers.{ox}' at equivalence ratio {phi:g} gives no "
                                          f"usable mixture: {exc}") from None
    for n in sweep_fuels:  # each sweep fuel alone is the reference gas of its blends (Wobbe index, ratios)
        if mixtures.stoich_o2_per_fuel(atoms_all, fuels[n]) < MIN_O2_NEED:
            raise ConfigError(f"'fuels.{n}' has (almost) no combustible species; it is the reference gas of its "
                              "blends (Wobbe index, ratios), so it must burn on its own")


def _run_settings(data: dict) -> tuple[float | None, bool]:
    """(flame_time_limit_s or None, keep_profiles) of the config's top level."""
    flame_time_limit_s = None
    if "flame_time_limit_s" in data:
        flame_time_limit_s = parse_number(data["flame_time_limit_s"], "flame_time_limit_s")
        if not flame_time_limit_s > 0:
            raise ConfigError(f"'flame_time_limit_s' must be > 0 seconds, got {flame_time_limit_s:g}")
    keep_profiles = data.get("keep_profiles", True)
    if not isinstance(keep_profiles, bool):
        raise ConfigError(f"'keep_profiles' must be true or false, got {show(keep_profiles)}")
    return flame_time_limit_s, keep_profiles


def _blend(b: Any, fuels: dict) -> tuple[str, tuple[float, ...]]:
    """sweep.blend = { with = FUEL, fraction = [...] } -> (fuel name, mole fractions 0..1)."""
    if not isinstance(b, dict):
        raise ConfigError("'sweep.blend' must be a table { with = fuel name, fraction = [...] }")
    check_keys(b, BLEND_KEYS, "sweep.blend.")
    if "with" not in b or "fraction" not in b:
        raise ConfigError("'sweep.blend' needs both 'with' (a fuel name) and 'fraction' (a list)")
    blend_with = parse_string(b["with"], "sweep.blend.with")
    if blend_with not in fuels:
        raise ConfigError(f"'sweep.blend.with' names unknown fuel '{blend_with}'{suggest_allowed(blend_with, list(fuels))}")
    fractions = parse_axis(b["fraction"], "sweep.blend.fraction")
    for f in fractions:
        if not 0.0 <= f <= 1.0:
            hint = f" (mole fractions, not per cent: {f:g} % is {f / 100:g})" if 1 < f <= 100 else ""
            raise ConfigError(f"'sweep.blend.fraction' value {f:g} is out of range{hint}; allowed: 0 to 1")
    return blend_with, fractions


def _design_tables(data: dict, axes: dict[str, tuple], blend_with: str | None) -> dict:
    """The optional tables beyond the sweep, validated: Study fields by name."""
    reference_fuel = None
    if "reference_fuel" in data:
        reference_fuel = parse_string(data["reference_fuel"], "reference_fuel")
        if reference_fuel not in axes["fuel"]:
            raise ConfigError(f"'reference_fuel' {reference_fuel!r} must be one of sweep.fuel "
                              f"({', '.join(axes['fuel'])}) so that its flames are solved")
    burner = _burner(data["burner"]) if "burner" in data else None
    gas_quality = _gas_quality(data.get("gas_quality", {}))
    return {
        "reference_fuel": reference_fuel, "burner": burner,
        "gas_quality": gas_quality,
        "indicator_settings": _indicator_settings(data.get("indicators", {})),
        "cluster": check_cluster_spec(data["cluster"]) if "cluster" in data else None,
        "limits": _limits(data["limits"], burner, blend_with, gas_quality, "premixer" in data,
                          {c for spec in analysis_tables() if spec.name in data for c in spec.enables})
        if "limits" in data else None,
        "premixer": _premixer(data["premixer"]) if "premixer" in data else None,
    }


def _mechanism_tables(data: dict, choices: list[MechanismChoice], keep_profiles: bool,
                      axes: dict[str, tuple]) -> dict:
    """The tables checked against the mechanisms' facts ([uncertainty], the analyses' tables,
    [reduction]), validated: Study fields by name."""
    facts = [m.facts for m in choices]
    ctx = TableContext(mechanisms=tuple(facts), keep_profiles=keep_profiles, axes=axes)
    tables = {spec.name: spec.parse(data[spec.name], ctx) for spec in analysis_tables() if spec.name in data}
    kept = tuple(s for spec in analysis_tables() if spec.name in tables for s in spec.kept_species(tables[spec.name]))
    return {"uncertainty": _uncertainty(data["uncertainty"], facts) if "uncertainty" in data else None,
            "tables": tables,
            "reduction": _reduction(data["reduction"], facts[0], len(choices), kept) if "reduction" in data else None}


def _mechanism_names(value: Any) -> tuple[str, ...]:
    """'mechanism': one file name, or a list of 2 to MAX_MECHANISMS different ones."""
    if isinstance(value, str):
        return (value,)
    if not isinstance(value, list) or not value:
        raise ConfigError(f"'mechanism' must be a file name or a list of them, got {show(value)}; e.g. "
                          "mechanism = \"gri30.yaml\" or mechanism = [\"h2o2.yaml\", "
                          "\"example_data/ammonia-CO-H2-Alzueta-2023.yaml\"]")
    names = tuple(parse_string(v, f"mechanism[{i}]") for i, v in enumerate(value))
    if len(names) > MAX_MECHANISMS:
        raise ConfigError(f"'mechanism' lists {len(names)} mechanisms; allowed: at most {MAX_MECHANISMS} (each "
                          "solves the whole sweep)")
    twice = [n for n, c in Counter(names).items() if c > 1]
    if twice:
        raise ConfigError(f"'mechanism' lists {twice[0]!r} twice; list each mechanism once")
    return names


def live_facts(name: str, base_dir: Path | None, transport: str) -> MechanismFacts:
    """The facts of mechanism ``name`` read from its file (found beside the config, then in
    Cantera's data folders; its transport data checked): the only place config loads Cantera,
    imported here so that a run folder's study (saved facts) loads without it."""
    from .chemistry.mechanism import check_mechanism, find_mechanism, mechanism_facts

    path = find_mechanism(name, base_dir)
    sha = file_sha256(path)
    check_mechanism(path, transport, sha)
    return mechanism_facts(name, str(path), sha)


def _mechanisms(names: tuple[str, ...], facts_of: Callable[[str], MechanismFacts], check_species) -> list[MechanismChoice]:
    """Each listed mechanism's facts (``facts_of``: from its file, or saved with a run) and its
    species checked: ``check_species(atoms, path)`` returns the gas-analysis species it lacks
    (raising MechanismError for a species it cannot burn; with several mechanisms the error
    also names those that have the species)."""
    out: list[MechanismChoice] = []
    for name in names:
        facts = facts_of(name)
        try:
            analysis = check_species(facts.atoms, Path(facts.path))
        except MechanismError as exc:
            if len(names) == 1 or not hasattr(exc, "species"):
                raise
            others = [n for n in names if n != name]
            have = [n for n in others if exc.species in facts_of(n).atoms]
            raise MechanismError(
                f"species '{exc.species}' in '{exc.where}' is not in mechanism {Path(facts.path).name}, which "
                f"'mechanism' lists beside {', '.join(others)}"
                + (f" ({', '.join(have)} {'has' if len(have) == 1 else 'have'} it)" if have else "")
                + ": every mechanism a study compares must have every species the study burns; drop the "
                "mechanism or the fuel") from None
        if any(m.sha256 == facts.sha256 for m in out):
            raise ConfigError(f"'mechanism' lists {name!r}, the same file as "
                              f"{next(m.name for m in out if m.sha256 == facts.sha256)!r}; list each mechanism once")
        out.append(MechanismChoice(name=name, path=facts.path, sha256=facts.sha256, atoms=facts.atoms,
                                   analysis_atoms=analysis, facts=facts))
    return out


def study_from_dict(data: dict, name: str = "study", base_dir: Path | None = None,
                    config_path: str | None = None, saved_facts: dict[str, MechanismFacts] | None = None) -> Study:
    """Validate a parsed config table and build the :class:`Study`. Its mechanisms are read
    from their files, or taken from ``saved_facts`` (by name, as a run kept them) where given."""
    if not isinstance(data, dict):
        raise ConfigError("config must be a TOML table")
    check_keys(data, top_keys(), "")
    title = parse_string(data.get("title", name), "title")
    mechanism_list = _mechanism_names(data.get("mechanism", "gri30.yaml"))
    transport = parse_string(data.get("transport", "mixture-averaged"), "transport")
    if transport not in TRANSPORT_MODELS:
        raise ConfigError(f"'transport' is {transport!r}{suggest_allowed(transport, TRANSPORT_MODELS)}")
    thermal_diffusion = data.get("thermal_diffusion", False)
    if not isinstance(thermal_diffusion, bool):
        raise ConfigError(f"'thermal_diffusion' must be true or false, got {show(thermal_diffusion)}")
    resolution = parse_string(data.get("resolution", "standard"), "resolution")
    if resolution not in RESOLUTIONS:
        raise ConfigError(f"'resolution' is {resolution!r}{suggest_allowed(resolution, RESOLUTIONS)}")
    max_points = data.get("max_points", 10000)
    if isinstance(max_points, bool) or not isinstance(max_points, int) or max_points < 1:
        raise ConfigError(f"'max_points' must be a whole number >= 1, got {show(max_points)}")
    flame_time_limit_s, keep_profiles = _run_settings(data)

    for table in ("fuels", "oxidizers", "sweep"):
        if table not in data:
            raise ConfigError(f"config has no [{table}] table; it is required")
        if not isinstance(data[table], dict):
            raise ConfigError(f"'{table}' must be a table [{table}], got {show(data[table])}; "
                              + ("its entries are name = { SPECIES = amount, ... }" if table != "sweep" else
                                 f"its keys are {', '.join(SWEEP_KEYS)}"))
    fuels = {n: _composition(c, f"fuels.{n}") for n, c in data["fuels"].items()}
    oxidizers = {n: _composition(c, f"oxidizers.{n}") for n, c in data["oxidizers"].items()}
    if not fuels:
        raise ConfigError("[fuels] is empty; define at least one fuel, e.g. methane = { CH4 = 1.0 }")
    if not oxidizers:
        raise ConfigError("[oxidizers] is empty; define at least one, e.g. air = { O2 = 1.0, N2 = 3.76 }")

    sweep = data["sweep"]
    check_keys(sweep, SWEEP_KEYS, "sweep.")
    for required in ("fuel", "oxidizer", "equivalence_ratio"):
        if required not in sweep:
            raise ConfigError(f"[sweep] has no '{required}'; it is required")
    sweep_fuels = _names(sweep["fuel"], "sweep.fuel", fuels, "fuel")
    sweep_oxidizers = _names(sweep["oxidizer"], "sweep.oxidizer", oxidizers, "oxidizer")
    blend_with, fractions = _blend(sweep["blend"], fuels) if "blend" in sweep else (None, (0.0,))
    phis = _limited_axis(sweep["equivalence_ratio"], "equivalence_ratio")
    pressures = _limited_axis(sweep.get("pressure_bar", [1.01325]), "pressure_bar")
    temperatures = _limited_axis(sweep.get("unburned_temperature_K", [298.15]), "unburned_temperature_K")
    n_points = (len(sweep_fuels) * len(sweep_oxidizers) * len(fractions) * len(phis) * len(pressures)
                * len(temperatures) * len(mechanism_list))
    if n_points > max_points:  # before the mechanism is loaded: a runaway sweep is refused at once
        raise ConfigError(f"the sweep has {n_points} points, more than 'max_points' = {max_points}; raise 'max_points' "
                          "if you mean it")
    choices = _mechanisms(mechanism_list, lambda m: (saved_facts or {}).get(m) or live_facts(m, base_dir, transport),
                          lambda atoms, path: _check_species(fuels, oxidizers, sweep_fuels, sweep_oxidizers,
                                                             blend_with, atoms, path))
    first = choices[0]
    for m in choices:
        _check_mixtures(fuels, oxidizers, sweep_fuels, sweep_oxidizers, blend_with, fractions, phis,
                        {**m.analysis_atoms, **m.atoms})
    axes = {"fuel": sweep_fuels, "oxidizer": sweep_oxidizers, "blend_fraction": fractions,
            "equivalence_ratio": phis, "pressure_bar": pressures, "unburned_temperature_K": temperatures}
    study = Study(
        title=title, name=name, mechanism=first.name, mechanism_path=first.path,
        mechanism_sha256=first.sha256, transport=transport,
        thermal_diffusion=thermal_diffusion, resolution=resolution, fuels=fuels,
        oxidizers=oxidizers, sweep_fuels=sweep_fuels, sweep_oxidizers=sweep_oxidizers,
        blend_with=blend_with, blend_fractions=fractions, equivalence_ratios=phis,
        pressures_bar=pressures, unburned_temperatures_K=temperatures, atoms=first.atoms,
        analysis_atoms=first.analysis_atoms,
        max_points=max_points, flame_time_limit_s=flame_time_limit_s, config_path=config_path, raw=data,
        keep_profiles=keep_profiles, **_design_tables(data, axes, blend_with),
        **_mechanism_tables(data, choices, keep_profiles, axes), mechanisms=tuple(choices) if len(choices) > 1 else (),
        facts=first.facts)
    if study.n_points > max_points:
        raise ConfigError(f"the sweep has {study.n_points} points, more than 'max_points' = {max_points}; "
                          "raise 'max_points' if you mean it")
    return study


def load_study(path: str | os.PathLike) -> Study:
    """Read a TOML study config and validate it. Raises ConfigError or MechanismError.

    The file must be a regular file of at most MAX_CONFIG_BYTES; its size is checked
    before anything is read, and no more than that is ever read (a device or a pipe
    given as config is refused, not read without end).
    """
    p = Path(path)
    try:
        st = p.stat()
    except FileNotFoundError:
        raise ConfigError(f"config file {str(p)!r} not found") from None
    except (OSError, ValueError) as exc:
        raise ConfigError(f"config {str(p)!r} cannot be read: {getattr(exc, 'strerror', None) or exc}") from None
    if stat.S_ISDIR(st.st_mode):
        raise ConfigError(f"config {str(p)!r} is a folder; give a .toml file")
    if not stat.S_ISREG(st.st_mode):
        raise ConfigError(f"config {str(p)!r} is not a regular file (a device, pipe or socket); give a .toml file")
    if st.st_size > MAX_CONFIG_BYTES:
        raise ConfigError(f"config {str(p)!r} is {st.st_size / 1e6:.1f} MB, larger than {MAX_CONFIG_BYTES // 1000} kB; "
                          "a study config is a short text file")
    try:
        with open(p, "rb") as fh:
            raw = fh.read(MAX_CONFIG_BYTES + 1)
    except OSError as exc:
        raise ConfigError(f"config {str(p)!r} cannot be read: {exc.strerror}") from None
    if len(raw) > MAX_CONFIG_BYTES:  # grew while we looked
        raise ConfigError(f"config {str(p)!r} is larger than {MAX_CONFIG_BYTES // 1000} kB; "
                          "a study config is a short text file")
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise ConfigError(f"config {str(p)!r} is not UTF-8 text (bad byte at position {exc.start})") from None
    data = parse_toml(text, str(p))
    return study_from_dict(data, name=p.stem, base_dir=p.resolve().parent, config_path=str(p.resolve()))


def parse_toml(text: str, where: str = "config") -> dict:
    """TOML text -> table; any syntax problem is a one-line ConfigError naming line and column."""
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        msg = str(exc)
        if msg.startswith(("Cannot overwrite a value", "Cannot declare", "Duplicate")):
            msg += " (a key or table is given twice; give each once)"
        raise ConfigError(f"config {where!r} is not valid TOML: {msg}") from None
    except RecursionError:
        raise ConfigError(f"config {where!r} nests arrays or tables too deeply to be a study config") from None
    except ValueError as exc:  # Python refuses integers of more than 4300 digits before TOML sees them
        raise ConfigError(f"config {where!r} is not valid TOML: it holds a value Python cannot read "
                          f"({first_line(exc, 200).split(';')[0]}); numbers must fit a float") from None


def study_from_toml(text: str, name: str = "study", base_dir: Path | None = None) -> Study:
    """Validate a study given as TOML text (as :func:`load_study` does for a file)."""
    return study_from_dict(parse_toml(text, name), name=name, base_dir=base_dir)


STUDY_COPY = "study.json"


def _facts_of_study(study: Study) -> list[MechanismFacts]:
    return [m.facts for m in study.mechanisms] if study.mechanisms else [study.facts] if study.facts else []


def save_config_copy(study: Study, out_dir: Path, data: dict | None = None) -> Path:
    """Keep the config a run used beside its store, with what the read side needs of its
    mechanisms (facts.MechanismFacts), so charts and report are redrawn from the folder
    alone, without the mechanism file."""
    if data is None:
        data = study.raw
    base = str(Path(study.config_path).parent) if study.config_path else str(Path.cwd())
    path = Path(out_dir) / STUDY_COPY
    tmp = path.with_suffix(".tmp")
    tmp.write_text(json.dumps({"name": study.name, "base_dir": base, "config_path": study.config_path,
                               "config": data,
                               "mechanism_facts": {f.name: f.to_json() for f in _facts_of_study(study)}}),
                   encoding="utf-8")
    os.replace(tmp, path)
    return path


def load_config_copy(out_dir: Path) -> Study:
    """The study a run in ``out_dir`` used (see :func:`save_config_copy`), its mechanisms taken
    from the facts saved with it (a folder written before they were saved reads the files)."""
    path = Path(out_dir) / STUDY_COPY
    if not path.is_file():
        raise ConfigError(f"{out_dir} holds no finished run ({STUDY_COPY} missing); "
                          "give the output folder of a 'flamecharts run'")
    try:
        saved = json.loads(path.read_text(encoding="utf-8"))
        facts = {n: MechanismFacts.from_json(f) for n, f in (saved.get("mechanism_facts") or {}).items()}
        return study_from_dict(saved["config"], name=saved["name"], base_dir=Path(saved["base_dir"]),
                               config_path=saved.get("config_path"), saved_facts=facts)
    except (ValueError, KeyError, TypeError, AttributeError, RecursionError) as exc:
        raise ConfigError(f"{path} is damaged ({type(exc).__name__}: {exc}); rerun the study to rewrite it") from None


def all_atoms(study: Study) -> dict[str, dict[str, float]]:
    """Element counts of every species a study names: the mechanism's and the gas-analysis ones it lacks."""
    return {**study.analysis_atoms, **study.atoms}


def flame_stream(study: Study, X_fuel: dict[str, float]) -> tuple[dict[str, float], list[str]]:
    """A fuel stream as the flame sees it: lumped onto the mechanism's species
    (physics.lumping), with a note per lumped component (none: X_fuel as it is)."""
    return lumping.lump(X_fuel, study.atoms)


def lumped_species(study: Study) -> list[str]:
    """The fuel species of the study the mechanism lacks (lumped for the flames), sorted."""
    used = list(study.sweep_fuels) + ([study.blend_with] if study.blend_with else [])
    upper = {m.upper() for m in study.atoms}
    return sorted({sp for fuel in used for sp in study.fuels[fuel] if sp.upper() not in upper})


def lumping_note(study: Study) -> str:
    """One sentence on what the flames of the study burn instead of the given analysis ('' when
    nothing is lumped); every output carries it (CLI, about.txt, results.nc, charts, report)."""
    used = list(study.sweep_fuels) + ([study.blend_with] if study.blend_with else [])
    notes = sorted({n for fuel in used for n in lumping.lump(study.fuels[fuel], study.atoms)[1]})
    if not notes:
        return ""
    return (f"Fuel lumped for the flames ({Path(study.mechanism).name} lacks these species; the gas properties use "
            f"the full analysis): {', '.join(notes)}.")


def fuel_stream(study: Study, fuel: str, fraction: float) -> dict[str, float]:
    """Mole fractions of the fuel stream of ``fuel`` with ``fraction`` of the study's
    blend gas (the fuel itself when the study blends nothing): the one place a blend's
    composition is made."""
    if not study.blend_with:
        return dict(study.fuels[fuel])
    return mixtures.blend(study.fuels[fuel], study.fuels[study.blend_with], fraction)


def resolution_label(study: Study) -> str:
    """'standard', 'fine', or 'coarse (faster, less accurate)': how every output names the setting."""
    return "coarse (faster, less accurate)" if study.resolution == "coarse" else study.resolution
