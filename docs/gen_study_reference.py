"""The study-file reference (docs/study-file.md) from flamecharts/config.py.

The keys of every table come from the validator's own lists of allowed keys (TOP_KEYS,
SWEEP_KEYS, BURNER_KEYS, ...), the allowed values from its tuples (TRANSPORT_MODELS, ...),
and each default from what the validator fills in: a minimal study is validated and the
default read off the result (or off the constant the validator uses). Only the one-line
meaning of each key is written here. A key the code allows that has no meaning below, or a
meaning for a key the code no longer allows, stops the generator with a message naming it.

Run ``python3 docs/gen_pages.py`` after changing config.py; tests/test_docs.py checks the page.
"""
from __future__ import annotations

import sys
from collections.abc import Callable
from dataclasses import dataclass
from types import SimpleNamespace
from typing import Any

from flamecharts import config as C
from flamecharts.analyses.emissions import table as EM
from flamecharts.analyses.flame_response import table as FR
from flamecharts.analyses.strain_ladders import table as ST
from flamecharts.physics.gasprops import ISO6976_2016
from flamecharts.physics.rate_factors import MAX_RATE_FACTOR
from flamecharts.sweep.schedule import MIN_TIME_LIMIT_S, TIME_LIMIT_FACTOR

PAGE = "study-file.md"

#: A study with every optional table, each with as few keys as it allows: the defaults are read
#: off its validated Study. No mechanism key: the default mechanism is loaded.
MINIMAL = {
    "fuels": {"gas": {"H2": 0.5, "N2": 0.5}, "hydrogen": {"H2": 1.0}},
    "oxidizers": {"air": {"O2": 1.0, "N2": 3.76}},
    "sweep": {"fuel": ["gas"], "oxidizer": ["air"], "equivalence_ratio": [1.0],
              "blend": {"with": "hydrogen", "fraction": [0.0, 0.5]}},
    "burner": {"port_diameter_mm": 1.0, "port_velocity_m_s": 1.0},
    "limits": {},
    "premixer": {"residence_time_ms": 1.0},
    "flame_response": {},
    "stretch": {"equivalence_ratio": [1.0]},
    "uncertainty": {},
    "emissions": {},
    "reduction": {},
}


def defaults() -> SimpleNamespace:
    """The validated minimal study and its tables."""
    s = C.study_from_dict(MINIMAL, name="my_study")
    return SimpleNamespace(study=s, burner=s.burner, gas=s.gas_quality, limits=s.limits, premixer=s.premixer,
                           response=FR.of(s), uncertainty=s.uncertainty, indicators=s.indicator_settings,
                           emissions=EM.of(s), reduction=s.reduction)


def toml(v: Any) -> str:
    """A value as it is written in the study file."""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, str):
        return f'"{v}"'
    if isinstance(v, float):
        return f"{v:g}"
    if isinstance(v, (tuple, list)):
        return "[" + ", ".join(toml(x) for x in v) + "]"
    return str(v)


def one_of(values: tuple) -> str:
    return ", ".join(f"`{toml(v)}`" for v in values)


Default = str | Callable[[SimpleNamespace], str] | None


@dataclass(frozen=True)
class Key:
    """One key of a table: what it takes, its default (text, or read off the validated minimal
    study; None: required) and what it means."""

    takes: str
    default: Default
    meaning: str


def code(f: Callable[[SimpleNamespace], Any]) -> Callable[[SimpleNamespace], str]:
    """A default read off the validated minimal study, written as in the study file."""
    return lambda d: f"`{toml(f(d))}`"


NAMES = "a list of names (or one name)"
AXIS = "a list of numbers, one number, or `{ from, to, step }` (both ends included)"


def top_keys() -> dict[str, Key]:
    return {
        "title": Key("text", lambda d: "the config file's name" if d.study.title == d.study.name else toml(d.study.title),
                     "shown on every chart, the report and about.txt"),
        "mechanism": Key(f"a file name, or a list of 2 to {C.MAX_MECHANISMS} of them", code(lambda d: d.study.mechanism),
                         "any mechanism file Cantera can load, looked up beside the study file, then in Cantera's data. "
                         "A list solves the whole study under each mechanism; the first is the reference the design "
                         "charts and margins use"),
        "transport": Key(one_of(C.TRANSPORT_MODELS), code(lambda d: d.study.transport), "transport model of the flames"),
        "thermal_diffusion": Key("`true` or `false`", code(lambda d: d.study.thermal_diffusion),
                                 "thermal diffusion (Soret effect)"),
        "resolution": Key(one_of(C.RESOLUTIONS), code(lambda d: d.study.resolution),
                          "grid setting of every flame; `coarse` is faster and less accurate and labelled so in every "
                          "output (accuracy of each: [benchmarks](benchmarks.md))"),
        "max_points": Key("a whole number, 1 or more", code(lambda d: d.study.max_points),
                          "a study with more points (times the mechanisms it compares) is refused: raise it if you "
                          "mean it"),
        "flame_time_limit_s": Key("a number above 0 [s]",
                                  f"{TIME_LIMIT_FACTOR:g} times the estimated cost of a flame from scratch, at least "
                                  f"{MIN_TIME_LIMIT_S:g} s",
                                  "give up one flame after this much of its own CPU time: recorded as failed (reason "
                                  "`time limit`) and solved again by the next run; the run goes on"),
        "reference_fuel": Key("a name from `sweep.fuel`", "blend fraction 0 of each fuel",
                              "the fuel that the `*_ratio` columns and the Wobbe band refer to"),
        "cluster": Key(" or ".join(f'`"{s}HOST:PORT"`' for s in C.CLUSTER_SCHEMES) + ' or `"local:N"`',
                       "none: local processes (`--jobs`)",
                       "solve on a running Dask scheduler, or on N local Dask workers; `--cluster` wins"),
        "keep_profiles": Key("`true` or `false`", code(lambda d: d.study.keep_profiles),
                             "keep each flame's profile in the store as a warm start for its neighbours; `false` keeps "
                             "none (a smaller store), and every flame then starts from scratch"),
    }


#: The tables of the study file: (key in TOP_KEYS, heading, the code's allowed keys, intro, keys).
def tables() -> list[tuple[str, str, tuple[str, ...], str, dict[str, Key]]]:
    iso = ", ".join(f"`{n}`" for n in ISO6976_2016)
    axis_range = {name: f"above {lo:g}, at most {hi:g}" for name, (lo, hi) in C.AXIS_LIMITS.items()}
    axis_range["unburned_temperature_K"] = (f"at least {C.MIN_UNBURNED_TEMPERATURE_K:g}, at most "
                                            f"{C.AXIS_LIMITS['unburned_temperature_K'][1]:g}")
    ind = C.INDICATOR_DEFAULTS
    return [
        ("fuels", "[fuels] and [oxidizers]", (), (
            "Named compositions, `NAME = { SPECIES = amount, ... }`, normalised to mole fractions for you. Both tables "
            "are required. A species must be the mechanism's, except that a fuel may also name the components of a "
            f"gas analysis by their ISO 6976 names ({iso}): the gas properties use the full analysis, and a "
            "component the mechanism lacks is lumped onto its species for the flame (every output says what was "
            "lumped). An oxidizer must hold O2 and nothing combustible."), {}),
        ("sweep", "[sweep]", C.SWEEP_KEYS, (
            f"The study is the cartesian product of these axes (at most `max_points` points). An axis is {AXIS}; a "
            "value listed twice is refused."), {
            "fuel": Key(f"{NAMES} from [fuels]", None, "fuels to sweep"),
            "oxidizer": Key(f"{NAMES} from [oxidizers]", None, "oxidizers to sweep"),
            "blend": Key("`{ with = FUEL, fraction = [...] }`", "none: each fuel alone",
                         "blend a gas of [fuels] into each swept fuel: `fraction` is its mole fraction in the fuel "
                         "stream, 0 to 1 (an axis); `with` names it"),
            "equivalence_ratio": Key(f"an axis, {axis_range['equivalence_ratio']}", None, "equivalence ratio φ"),
            "pressure_bar": Key(f"an axis, {axis_range['pressure_bar']} [bar]", code(lambda d: d.study.pressures_bar),
                                "absolute pressure"),
            "unburned_temperature_K": Key(f"an axis, {axis_range['unburned_temperature_K']} [K]",
                                          code(lambda d: d.study.unburned_temperatures_K),
                                          "preheat (unburned) temperature; a value below "
                                          f"{C.MIN_UNBURNED_TEMPERATURE_K:g} K is refused (almost always °C typed as "
                                          "K)"),
        }),
        ("burner", "[burner]", C.BURNER_KEYS, (
            "The user's burner: for every point flamecharts then gives the port velocity, the wall velocity gradient, "
            "the flashback and blowoff margins, the quench ratio and a verdict against the minimum margins. The port "
            "velocity is set one of three ways: `port_velocity_m_s`; or `thermal_input_kW` over `port_area_mm2`; or "
            "those two with `input_follows_wobbe = true`. Each criterion is assessed only inside the range of its "
            "data ([Admissible limits](limits.md))."), {
            "name": Key("text", code(lambda d: d.burner.name), "shown in the outputs"),
            "port": Key('`"round"` or `"slot"`', code(lambda d: d.burner.port), "port shape"),
            "layout": Key(one_of(C.PORT_LAYOUTS), code(lambda d: d.burner.layout),
                          "ports apart (each flame on its own, as in the port stability data) or a deck (a perforated "
                          "plate or mesh whose port flames merge: no single-port blowoff margin)"),
            "port_diameter_mm": Key("a number above 0 [mm]", "required for a round port", "port diameter"),
            "port_gap_mm": Key("a number above 0 [mm]", "required for a slot", "slot width"),
            "port_velocity_m_s": Key("a number above 0 [m/s]", "none", "(a) fixed bulk port velocity"),
            "thermal_input_kW": Key("a number above 0 [kW]", "none",
                                    "(b) fixed thermal input on the lower heating value; needs `port_area_mm2`"),
            "port_area_mm2": Key("a number above 0 [mm²]", "none", "total port area the thermal input flows through"),
            "input_follows_wobbe": Key("`true` or `false`", code(lambda d: d.burner.input_follows_wobbe),
                                       "(c) fixed nozzle and supply pressure: the input scales with each gas's lower "
                                       "Wobbe index"),
            "min_flashback_margin": Key("a number, 1 or more", code(lambda d: d.burner.min_flashback_margin),
                                        "required flashback margin g_wall/g_F (common practice, set your own)"),
            "min_blowoff_margin": Key("a number, 1 or more", code(lambda d: d.burner.min_blowoff_margin),
                                      "required blowoff margin g_B/g_wall at the port rim"),
            "stabilizer_size_mm": Key("a number above 0 [mm]", "none: the flame sits on the port rim",
                                      "bluff-body size: the flame is held there and its blowoff is the stabilizer's; "
                                      "needs `approach_velocity_m_s` and `[indicators] bluff_body_constant` to be "
                                      "assessed"),
            "approach_velocity_m_s": Key("a number above 0 [m/s]", "none", "velocity approaching the bluff body"),
            "stabilizer_blockage": Key("a number, 0 to 0.9", code(lambda d: d.burner.stabilizer_blockage),
                                       "area fraction of the duct the bluff body blocks (the velocity past its edge is "
                                       "approach / (1 - blockage))"),
            "min_stabilizer_margin": Key("a number, 1 or more", code(lambda d: d.burner.min_stabilizer_margin),
                                         "required stabilizer margin (blowoff velocity over the velocity past the "
                                         "body's edge)"),
        }),
        ("gas_quality", "[gas_quality]", C.GAS_QUALITY_KEYS, (
            "Reference state of the fuel-gas properties (ISO 6976:2016, real gas, 101.325 kPa) and the allowed Wobbe "
            "band. Optional: without it the properties use the defaults and no band is checked."), {
            "combustion_temperature_C": Key("`0`, `15` or `25`", code(lambda d: d.gas.combustion_T_C),
                                            "combustion reference temperature [°C]"),
            "metering_temperature_C": Key("`0` or `15`", code(lambda d: d.gas.metering_T_C),
                                          "metering reference temperature [°C]"),
            "wobbe": Key('`"higher"` or `"lower"`', code(lambda d: d.gas.wobbe), "which Wobbe index the band applies to"),
            "wobbe_tolerance_percent": Key("a number above 0 [%]", "none",
                                           "band of ± this much around the reference gas (appliance practice: about "
                                           "5 %)"),
            "wobbe_band_MJ_m3": Key("`[low, high]` [MJ/m³]", "none",
                                    "an absolute band instead of a tolerance (give one of the two)"),
        }),
        ("indicators", "[indicators]", tuple(ind), (
            "The constants of the design indicators that are not universal. Changing one re-solves no flame: the "
            "indicators are computed from the stored flames each time the tables are written."), {
            "flashback_peclet": Key("a number above 0", code(lambda d: d.indicators["flashback_peclet"]),
                                    "Pe_F of the critical flashback gradient g_F = S_L² / (Pe_F α_u)"),
            "blowoff_karlovitz": Key("a number above 0", code(lambda d: d.indicators["blowoff_karlovitz"]),
                                     "Ka_B of the critical blowoff gradient g_B = Ka_B S_L² / α_u (Reed 1967)"),
            "quench_peclet": Key("a number above 0", code(lambda d: d.indicators["quench_peclet"]),
                                 "Pe_q of the quenching distance d_q = Pe_q α_u / S_L between plates"),
            "tube_quench_factor": Key("a number above 0", code(lambda d: d.indicators["tube_quench_factor"]),
                                      "tube quenching diameter over the plate quenching distance"),
            "bluff_body_constant": Key(
                "a number above 0",
                lambda d: "none" if d.indicators["bluff_body_constant"] is None else toml(d.indicators["bluff_body_constant"]),
                "C_BO of the bluff-body blowoff velocity U_BO = C_BO D / τ_c; it has no universal value: until you set "
                "it from a blowoff test of your stabilizer, the stabilizer margin is not assessed"),
        }),
        ("limits", "[limits]", C.LIMITS_KEYS, (
            "The design answers: the admissible windows of blend fraction and of equivalence ratio, both edges found "
            "by root finding between the swept points. Needs a [burner]. How they are found and read: "
            "[Admissible limits](limits.md)."), {
            "find": Key(f"a list of {one_of(C.LIMIT_KINDS)}", "both when the sweep blends, else `[\"equivalence_ratio\"]`",
                        "which limits to search"),
            "criteria": Key(f"a list of {one_of(C.LIMIT_CRITERIA)}",
                            "flashback, the blowoff that applies (the rim's, or the stabilizer's with a bluff body), "
                            "with [premixer] core_flashback, with [premixer], [stretch] and a stabilizer "
                            "extinction_blowout, and the Wobbe band when [gas_quality] sets one",
                            "the criteria a window keeps; at least one burner margin besides the Wobbe band; "
                            "core_flashback and extinction_blowout are a premixer's "
                            "([Gas-turbine premixers](premixers.md#admissible-limits-of-a-premixer))"),
            "blend_fraction_tolerance": Key("a number above 0, at most 0.1",
                                            code(lambda d: d.limits.tolerance["blend_fraction"]),
                                            "width of each blend edge's final bracket (a mole fraction: 0.005 is 0.5 "
                                            "percentage points)"),
            "equivalence_ratio_tolerance": Key("a number above 0, at most 0.1",
                                               code(lambda d: d.limits.tolerance["equivalence_ratio"]),
                                               "width of each φ edge's final bracket"),
            "max_flames_per_search": Key("a whole number, 1 to 100", code(lambda d: d.limits.max_flames_per_search),
                                         "an edge (or an interval's search) that needs more flames stops and gives its "
                                         "bracket"),
        }),
        ("premixer", "[premixer]", C.PREMIXER_KEYS, (
            "The autoignition check of a premixer's fresh mixture (and of the mixtures near the fuel injection): "
            "ignition delay over residence time against a minimum."), {
            "residence_time_ms": Key("a number above 0, at most 10000 [ms]", None,
                                     "mean residence time of the fresh mixture"),
            "min_autoignition_margin": Key("a number, 1 or more", code(lambda d: d.premixer.min_autoignition_margin),
                                           "required ignition delay over residence time (common practice, set your "
                                           "own)"),
            "turbulence_intensity_percent": Key("a number, 0.1 to 100 [%]", "the duct estimate",
                                                "u' at the flame in per cent of the burner's port velocity; without "
                                                "it, 16 Re^-1/8 % of a fully developed duct flow (common practice)"),
            "integral_length_mm": Key("a number above 0, at most 1000 [mm]", "the duct estimate",
                                      "integral length of the turbulence; without it, 0.07 of the port's hydraulic "
                                      "diameter (common practice)"),
            "turbulent_flashback_peclet": Key("a number above 0, at most 10000", "not set",
                                              "Pe_F of boundary-layer flashback in turbulent duct flow, calibrated on "
                                              "your own premixer; without it the boundary-layer margin is not assessed "
                                              "above Re 2300"),
            "blowout_damkohler": Key("a number, 0.01 to 100", code(lambda d: d.premixer.blowout_damkohler),
                                     "critical extinction Damköhler number κ_ext d / U_edge of lean blowout (of "
                                     "order one, from memory: calibrate it on your own stabilizer)"),
        }),
        ("flame_response", "[flame_response]", FR.KEYS, (
            "Zeldovich, effective Lewis and Markstein numbers and the thermodiffusive instability flag: two more "
            "flames per burning point, solved after the sweep and stored apart (the Lewis numbers of every point come "
            "without it)."), {
            "zeldovich": Key("`true` or `false`", code(lambda d: d.response.zeldovich),
                             "solve the two Zeldovich flames of every burning point"),
            "inert_step": Key("a number above 0, at most 0.1", code(lambda d: d.response.inert_step),
                              "mole fraction of the inert (N2) moved either way for the Zeldovich flames"),
        }),
        ("stretch", "[stretch]", ST.KEYS, (
            "Strained twin counterflow flames from low strain to extinction (a ladder) for chosen swept mixtures: "
            "each key a subset of its sweep axis, at most "
            f"{ST.MAX_LADDERS} ladders (each is 10-40 flames)."), {
            "equivalence_ratio": Key("swept values", None, "the equivalence ratios that get a ladder"),
            "fuel": Key("swept names", "all swept", "fuels that get a ladder"),
            "oxidizer": Key("swept names", "all swept", "oxidizers that get a ladder"),
            "blend_fraction": Key("swept values", "all swept", "blend fractions that get a ladder"),
            "pressure_bar": Key("swept values [bar]", "all swept", "pressures that get a ladder"),
            "unburned_temperature_K": Key("swept values [K]", "all swept", "preheat temperatures that get a ladder"),
        }),
        ("emissions", "[emissions]", EM.KEYS, (
            "NO, NO2, N2O, CO and unburned fuel of every burning flame's burned gas after stated residence times from "
            "its peak heat release (the flame's own profile, then an adiabatic plug flow), dry at a reference O2 and "
            "in mg/kWh. Needs a mechanism with nitrogen chemistry (e.g. gri30.yaml) and the stored profiles."), {
            "residence_times_ms": Key(f"1 to {EM.MAX_RESIDENCE_TIMES} numbers above 0, at most 10000 [ms]",
                                      code(lambda d: [round(1e3 * t, 9) for t in d.emissions.residence_times_s]),
                                      "times after the peak heat release the burned gas is read at"),
            "design_residence_time_ms": Key("one of residence_times_ms [ms]", "20 if listed, else the longest",
                                            "the time results.csv, the charts and the sentences read"),
            "reference_oxygen_percent": Key("a number, 0 to below 20.9 [%]",
                                            code(lambda d: d.emissions.reference_oxygen_percent),
                                            "dry O2 the ppm are corrected to: 15 for gas turbines, 3 or 0 for "
                                            "appliances"),
            "heating_value": Key('`"gross"` or `"net"`', code(lambda d: d.emissions.heating_value),
                                 "heat input of mg/kWh: gross (higher) as EU appliance NOx classes use, or net"),
            "specific": Key("`true` or `false`", code(lambda d: d.emissions.specific), "report NOx and CO in mg/kWh"),
            "equal_flame_temperature": Key("`true` or `false`", code(lambda d: d.emissions.equal_flame_temperature),
                                           "with a blend axis from 0: also burn each blend at the unblended gas's "
                                           "adiabatic flame temperature (one more flame per blended point)"),
        }),
        ("reduction", "[reduction]", C.REDUCTION_KEYS, (
            "A skeletal mechanism made for the study's own conditions before its sweep (DRGEP), the smallest whose "
            "errors against the detailed mechanism stay within the targets on points it was not trained on; written "
            "to the output folder, its hash in every point's key, reused by a rerun of the same study and made again "
            "(every flame then solved again) when a target or the study's range changes. One mechanism only. See "
            "[Mechanism reduction](reduction.md)."), {
            "flame_speed_error_percent": Key("a number, {:g} to {:g} [%]".format(
                *C.REDUCTION_TARGET_RANGES["flame_speed_error_percent"]),
                code(lambda d: round(100 * d.reduction.flame_speed_error, 9)),
                "largest flame-speed error on the validation flames"),
            "ignition_delay_error_percent": Key("a number, {:g} to {:g} [%]".format(
                *C.REDUCTION_TARGET_RANGES["ignition_delay_error_percent"]),
                code(lambda d: round(100 * d.reduction.ignition_delay_error, 9)),
                "largest ignition-delay error at the validation points between the training conditions"),
            "species": Key(f"{NAMES}: species of the mechanism", "none (with [emissions]: "
                           + ", ".join(EM.EMISSION_SPECIES) + ")",
                           "more target species: always kept, ranked from, and their mole fractions at the "
                           "validation flames' outlets held within species_error_percent; [emissions] adds its "
                           "own"),
            "species_error_percent": Key("a number, {:g} to {:g} [%]".format(
                *C.REDUCTION_TARGET_RANGES["species_error_percent"]),
                code(lambda d: round(100 * d.reduction.species_error, 9)),
                "largest error of a target species at the validation flames' outlets (where above 1 ppm)"),
            "validation_flames": Key(f"a whole number, 0 to {C.MAX_VALIDATION_FLAMES}",
                                     f"{C.DEFAULT_VALIDATION_FLAMES}; 0 above {C.FLAME_VALIDATION_MAX_SPECIES} species",
                                     "flames of the study it does not train on, solved with the detailed mechanism "
                                     "and each candidate; 0: ignition delays only"),
        }),
        ("uncertainty", "[uncertainty]", C.UNCERTAINTY_KEYS, (
            "Error bars on every flame speed: adjoint sensitivities to every rate constant and the kinetic band (1σ) "
            "they give with the rate constants' uncertainty factors. An empty table asks for the kinetic band alone."), {
            "kinetics": Key("`true` or `false`", code(lambda d: d.uncertainty.kinetics),
                            "solve the sensitivities of every burning point and give the kinetic band"),
            "factors": Key(f'a table `"EQUATION" = f`, f from 1 to {MAX_RATE_FACTOR:g}', "the packaged table",
                           "your own uncertainty factors over the packaged table (the rate constant lies between k/f "
                           "and k·f); the equation as the mechanism writes it"),
            "default_factor": Key(f"a number, 1 to {MAX_RATE_FACTOR:g}", code(lambda d: d.uncertainty.default_factor),
                                  "f of the reactions neither the packaged table nor `factors` names"),
            "factor_sigmas": Key("a number, 1 to 4", code(lambda d: d.uncertainty.factor_sigmas),
                                 "how many standard deviations of ln k a factor's bound stands for"),
            "error_bars": Key("`true` or `false`", code(lambda d: d.uncertainty.error_bars),
                              "draw each flame's numerical (grid) band on the flame-speed chart"),
        }),
    ]


SUB_KEYS = {"sweep.blend": (C.BLEND_KEYS, {"with": "a fuel name from [fuels]", "fraction": "an axis, 0 to 1"}),
            "a range": (C.RANGE_KEYS, {"from": "first value", "to": "last value (included)", "step": "a number above 0"})}


def _check(where: str, allowed: tuple[str, ...], documented: dict) -> None:
    missing = [k for k in allowed if k not in documented]
    extra = [k for k in documented if k not in allowed]
    if missing or extra:
        raise SystemExit(f"docs/gen_study_reference.py is out of step with flamecharts/config.py at {where}: "
                         + (f"describe {', '.join(missing)}" if missing else "")
                         + ("; " if missing and extra else "")
                         + (f"the code no longer allows {', '.join(extra)}" if extra else ""))


def _row(name: str, key: Key, d: SimpleNamespace) -> str:
    if key.default is None:
        default = "**required**"
    elif callable(key.default):
        default = key.default(d)
    else:
        default = key.default
    return f"| `{name}` | {key.takes} | {default} | {key.meaning} |"


HEADER = "| key | takes | default | meaning |\n|---|---|---|---|"


def render() -> str:
    d = defaults()
    top, sections = top_keys(), tables()
    _check("the top level", tuple(k for k in C.TOP_KEYS if k not in {t[0] for t in sections} | {"oxidizers"}), top)
    out = ["## Top level", "", "Keys before the first table.", "", HEADER]
    out += [_row(k, top[k], d) for k in C.TOP_KEYS if k in top]
    for name, heading, allowed, intro, keys in sections:
        _check(f"[{name}]", allowed, keys)
        out += ["", f"## {heading}", "", intro]
        if keys:
            out += ["", HEADER] + [_row(k, keys[k], d) for k in allowed]
        if name == "sweep":
            for where, (allowed_sub, meanings) in SUB_KEYS.items():
                _check(where, allowed_sub, meanings)
                out += ["", f"Keys of {where}: " + "; ".join(f"`{k}`: {meanings[k]}" for k in allowed_sub) + "."]
    return "\n".join(out)


if __name__ == "__main__":
    import gen_pages

    sys.exit(gen_pages.main(sys.argv[1:]))
