"""Design read-out: stored flames + fuel-gas properties + the burner -> indicators, margins, verdict.

Runs on flat rows (results.flat_row) after they are read from the store, so changing an
indicator setting or the burner never needs a flame to be solved again. The indicators, the
flame-response columns, the burner's numbers and a premixer's turbulence and turbulent flame
speeds are computed once for all rows on arrays (indicator_columns, response_columns,
burner_columns, turbulence_columns, turbulent_speed_columns: column -> one value per row);
verdicts, the kinetic band and the premixer's boundary-layer and blowout margins row by row.

fuel_gas_table            ISO 6976 properties and stoichiometric air of every fuel and blend
annotate                  adds indicator, ratio, gas-property and burner-margin columns to rows
indicator_columns         the indicators and reference ratios of all rows at once (response_columns: Le_eff, Markstein)
burner_columns            port flow, wall gradient, margins and verdict of all rows (turbulence_columns: a premixer's)
premixer_margins          a premixer's boundary-layer flashback, extinction-strain blowout and verdict
point_warnings            inputs outside the range the method or the mechanism covers
mechanism_differences     flame speed and thickness of each mechanism a study compares against the reference's
"""
from __future__ import annotations

import math
import re
from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np
import numpy.typing as npt

from .analyses import parts
from .columns import (
    BURNER_COLUMNS,
    GAS_COLUMNS,
    INDICATOR_COLUMNS,
    KINETIC_COLUMNS,
    PREMIXER_COLUMNS,
    PREMIXER_MARGIN_COLUMNS,
    REDUCTION_COLUMNS,
    TURBULENCE_COLUMNS,
    TURBULENT_SPEED_COLUMNS,
)
from .config import all_atoms, detailed_path, fuel_stream
from .errors import ConfigError
from .physics import (
    flame_response as fr,
    indicators as ind,
    kinetic_uncertainty as ku,
    mixtures,
    turbulence as turb,
    validity as val,
)
from .physics.autoignition import INJECTION_PHIS, injection_end
from .physics.gasprops import ISO6976_2016, fuel_gas_properties
from .physics.limits import (
    autoignition_verdict,
    flammability_warning,
    heavy_hydrocarbon_warning,
    pressure_warning,
    unsolved_autoignition_warning,
)
from .physics.premixer import (
    FlameSpeed,
    boundary_layer_flashback,
    core_flashback_margin,
    duct_turbulence,
    extinction_damkohler,
    leading_point_flame_speed,
    leading_point_flame_speeds,
    lean_blowout_margin,
    muppala_flame_speed,
    muppala_flame_speeds,
    wall_velocity_gradient as premixer_wall_gradient,
    zimont_flame_speed,
    zimont_flame_speeds,
)
from .physics.rate_factors import RATE_FACTORS
from .sweep.points import condition_key

if TYPE_CHECKING:
    from .config import Burner, Study
    from .facts import MechanismFacts
    from .sweep.points import Point


def _facts(study: Study) -> MechanismFacts:
    assert study.facts is not None, "config.study_from_dict always sets the mechanism's facts"
    return study.facts


def gas_record(study: Study, X_fuel: dict, oxidizer: str) -> dict:
    """ISO 6976 properties of a fuel gas plus its stoichiometric need of ``oxidizer``."""
    gq = study.gas_quality
    outside = [sp for sp in X_fuel if sp not in ISO6976_2016]
    try:
        fb = _facts(study).fallback(outside, gq.combustion_T_C) if outside else None
        props = fuel_gas_properties(X_fuel, gq.combustion_T_C, gq.metering_T_C, fallback=fb)
    except ValueError as exc:
        raise ConfigError(f"fuel-gas properties of {', '.join(sorted(X_fuel))} cannot be computed: {exc}") from None
    X_ox = study.oxidizers[oxidizer]
    n_ox = mixtures.stoich_o2_per_fuel(all_atoms(study), X_fuel) / X_ox["O2"]
    if not n_ox > 0 or not props.lower_wobbe_index_MJ_m3 > 0:
        raise ConfigError(f"fuel gas {', '.join(sorted(X_fuel))} has no heating value (it needs no oxygen to "
                          "burn); a fuel or reference gas must contain combustible species")
    in_mech = (set(X_fuel) | set(X_ox)) & set(study.atoms)
    M = {**{sp: ISO6976_2016[sp][0] for sp in X_fuel if sp not in study.atoms},  # analysis species: ISO 6976
         **{sp: _facts(study).molar_masses_kg_kmol[sp] for sp in in_mech}}
    M_fuel = sum(x * M[k] for k, x in X_fuel.items())
    M_ox = sum(x * M[k] for k, x in X_ox.items())
    return {"props": props, "stoich_oxidizer_volume_m3_m3": n_ox,
            "stoich_oxidizer_mass_kg_kg": n_ox * M_ox / M_fuel,
            "stoich_fuel_mole_fraction": 1.0 / (1.0 + n_ox)}


def _reference_fuel(study: Study, fuel: str) -> str:
    return study.reference_fuel or fuel


@dataclass(frozen=True)
class FuelGas:
    """One fuel gas of the study: its public row (columns.GAS_TABLE_COLUMNS) and the
    numbers the burner read-out needs besides."""

    row: dict
    input_ratio: float        # lower Wobbe index over the reference gas's: the thermal input (on the lower
                              # heating value) through a fixed nozzle at fixed supply pressure scales with it
    lhv_J_kg: float           # lower heating value [J/kg]
    wobbe_MJ_m3: float        # the Wobbe index the study's band applies to (higher or lower) [MJ/m^3]


def fuel_gas(study: Study, fuel: str, frac: float, ox: str, refs: dict | None = None) -> FuelGas:
    """:class:`FuelGas` of ``fuel`` with ``frac`` of the study's blend gas, burned in ``ox``
    (any fraction, swept or not: the limit searches ask between the swept ones). ``refs``
    caches the reference gases' records across calls."""
    gq = study.gas_quality
    refs = {} if refs is None else refs
    rec = gas_record(study, fuel_stream(study, fuel, frac), ox)
    ref_name = _reference_fuel(study, fuel)
    if (ref_name, ox) not in refs:
        refs[(ref_name, ox)] = gas_record(study, dict(study.fuels[ref_name]), ox)
    ref = refs[(ref_name, ox)]
    p = rec["props"]
    W = p.higher_wobbe_index_MJ_m3 if gq.wobbe == "higher" else p.lower_wobbe_index_MJ_m3
    W_ref = ref["props"].higher_wobbe_index_MJ_m3 if gq.wobbe == "higher" else ref["props"].lower_wobbe_index_MJ_m3
    lo: float | None
    hi: float | None
    if gq.band_MJ_m3 is not None:
        lo, hi = gq.band_MJ_m3
    elif gq.tolerance_percent is not None:
        lo, hi = W_ref * (1 - gq.tolerance_percent / 100), W_ref * (1 + gq.tolerance_percent / 100)
    else:
        lo = hi = None
    row = {
        "fuel": fuel, "blend_with": study.blend_with or "", "blend_fraction": frac, "oxidizer": ox,
        "higher_heating_value_MJ_kg": p.higher_heating_value_MJ_kg,
        "lower_heating_value_MJ_kg": p.lower_heating_value_MJ_kg,
        "higher_heating_value_MJ_m3": p.higher_heating_value_MJ_m3,
        "lower_heating_value_MJ_m3": p.lower_heating_value_MJ_m3,
        "relative_density": p.relative_density,
        "higher_wobbe_index_MJ_m3": p.higher_wobbe_index_MJ_m3,
        "lower_wobbe_index_MJ_m3": p.lower_wobbe_index_MJ_m3,
        "wobbe_change_percent": 100.0 * (W / W_ref - 1.0),
        "wobbe_band_low_MJ_m3": lo, "wobbe_band_high_MJ_m3": hi,
        "wobbe_in_band": None if lo is None else bool(lo <= W <= hi),
        "stoich_oxidizer_volume_m3_m3": rec["stoich_oxidizer_volume_m3_m3"],
        "stoich_oxidizer_mass_kg_kg": rec["stoich_oxidizer_mass_kg_kg"],
        "stoich_fuel_mole_fraction": rec["stoich_fuel_mole_fraction"],
        "reference_gas": ref_name,
        "conditions": p.conditions, "method": p.method,
    }
    return FuelGas(row, p.lower_wobbe_index_MJ_m3 / ref["props"].lower_wobbe_index_MJ_m3,
                   p.lower_heating_value_MJ_kg * 1e6, W)


def fuel_gases(study: Study) -> dict[tuple[str, float, str], FuelGas]:
    """(fuel, blend fraction, oxidizer) -> :class:`FuelGas`, in the study's order."""
    refs: dict = {}
    return {(fuel, frac, ox): fuel_gas(study, fuel, frac, ox, refs)
            for ox in study.sweep_oxidizers for fuel in study.sweep_fuels for frac in study.blend_fractions}


def fuel_gas_table(study: Study) -> list[dict]:
    """One row per (fuel, blend fraction, oxidizer) with ISO 6976 properties, air need and Wobbe band."""
    return [g.row for g in fuel_gases(study).values()]


def _floats(rows: list[dict], col: str) -> np.ndarray:
    """Column ``col`` of ``rows`` as float64 (NaN where a row has no value)."""
    return np.array([np.nan if (v := r.get(col)) is None else v for r in rows], dtype=float)


def _scatter(n: int, where: np.ndarray, values: npt.ArrayLike | list) -> list:
    """``values``, computed for the rows at the indices ``where``, as one Python value per row of ``n``
    (None at the others): a column to write back into the rows."""
    out: list = [None] * n
    for i, v in zip(where.tolist(), values if isinstance(values, list) else np.asarray(values).tolist()):
        out[i] = v
    return out


def _or_none(values: npt.ArrayLike) -> list:
    """An array of numbers as Python floats, None for NaN (a value the row does not have)."""
    return [None if math.isnan(v) else v for v in np.asarray(values, dtype=float).tolist()]


def indicator_columns(study: Study, rows: list[dict]) -> dict[str, list]:
    """The indicators of every burning point (columns.INDICATOR_COLUMNS: the chemical time,
    Blint thickness, critical gradients and quenching distances of physics.indicators with the
    study's [indicators] settings, and the reference ratios), computed once for all rows on
    arrays: column -> one value per row, None where a point has no flame."""
    s, n = study.indicator_settings, len(rows)
    where = np.flatnonzero([r["status"] == "ok" for r in rows])
    burning = [rows[i] for i in where.tolist()]
    S_L, a = _floats(burning, "laminar_flame_speed_m_s"), _floats(burning, "unburned_thermal_diffusivity_m2_s")
    d_q = ind.quenching_distance(a, S_L, s["quench_peclet"])
    own = {
        "chemical_time_s": ind.chemical_time(a, S_L),
        "blint_thickness_mm": 1e3 * ind.blint_thickness(a, S_L, _floats(burning, "adiabatic_flame_temperature_K"),
                                                        _floats(burning, "unburned_temperature_K")),
        "flashback_critical_gradient_1_s": ind.flashback_critical_gradient(S_L, a, s["flashback_peclet"]),
        "blowoff_critical_gradient_1_s": ind.blowoff_critical_gradient(S_L, a, s["blowoff_karlovitz"]),
        "quenching_distance_mm": 1e3 * d_q,
        "tube_quenching_diameter_mm": 1e3 * ind.tube_quenching_diameter(d_q, s["tube_quench_factor"]),
    }
    full = {c: np.full(n, np.nan) for c in own}
    for c, v in own.items():
        full[c][where] = v
    full["laminar_flame_speed_m_s"] = _floats(rows, "laminar_flame_speed_m_s")
    table = {c: _scatter(n, where, v) for c, v in own.items()} | _reference_ratios(study, rows, full)
    return {c: table[c] for c in INDICATOR_COLUMNS}


def _reference_ratios(study: Study, rows: list[dict], values: dict[str, np.ndarray]) -> dict[str, list]:
    """RATIOS of every point whose reference point (the reference gas unblended, same oxidizer,
    phi, p and T_u: a point of the study when it sweeps blend fraction 0) is among ``rows`` and
    both burn, from ``values`` (column -> array over ``rows``), and the reference gas's name:
    column -> one value per row."""
    n = len(rows)
    reference: list = [None] * n
    pairs: list[tuple[int, int]] = []
    if 0.0 in study.blend_fractions:
        index = {(r["fuel"], r["oxidizer"], r["blend_fraction"], r["equivalence_ratio"], r["pressure_bar"],
                  r["unburned_temperature_K"]): i for i, r in enumerate(rows)}
        for i, r in enumerate(rows):
            ref_fuel = _reference_fuel(study, r["fuel"])
            j = index.get((ref_fuel, r["oxidizer"], 0.0, r["equivalence_ratio"], r["pressure_bar"],
                           r["unburned_temperature_K"]))
            if j is not None:
                reference[i] = ref_fuel
                if r["status"] == "ok" and rows[j]["status"] == "ok":
                    pairs.append((i, j))
    mine, ref = (np.array([p[k] for p in pairs], dtype=int) for k in (0, 1))
    return {col: _scatter(n, mine, values[src][mine] / values[src][ref]) for col, src in RATIOS} | \
        {"reference": reference}


RATIOS = (("flame_speed_ratio", "laminar_flame_speed_m_s"),
          ("flashback_gradient_ratio", "flashback_critical_gradient_1_s"),
          ("blowoff_gradient_ratio", "blowoff_critical_gradient_1_s"),
          ("quenching_distance_ratio", "quenching_distance_mm"),
          ("chemical_time_ratio", "chemical_time_s"))


def port_flows(study: Study, rows: list[dict], gases: list[FuelGas]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(bulk port velocity [m/s], thermal input [W], port Reynolds number) of each mixture of
    ``rows`` (``gases``: the fuel gas of each) through the study's burner, on arrays: NaN for the
    thermal input of a burner set by its velocity, and for the Reynolds number of a row without
    unburned_viscosity_Pa_s. A row needs only the fresh mixture's equivalence_ratio,
    unburned_density_kg_m3 and viscosity, never its flame."""
    b = study.burner
    assert b is not None  # asked only of a study with a [burner]
    n = len(rows)
    rho, mu = _floats(rows, "unburned_density_kg_m3"), _floats(rows, "unburned_viscosity_Pa_s")
    if b.port_velocity_m_s is not None:
        U, Q = np.full(n, b.port_velocity_m_s), np.full(n, np.nan)
    else:
        assert b.thermal_input_W is not None and b.port_area_m2 is not None  # config: a velocity, or an input and an area
        Q = b.thermal_input_W * np.array([g.input_ratio if b.input_follows_wobbe else 1.0 for g in gases], dtype=float)
        U = np.asarray(ind.port_velocity_at_thermal_input(
            Q, np.array([g.lhv_J_kg for g in gases], dtype=float),
            np.array([g.row["stoich_oxidizer_mass_kg_kg"] for g in gases], dtype=float),
            _floats(rows, "equivalence_ratio"), rho, b.port_area_m2))
    known = ~np.isnan(mu) & (mu != 0.0)
    Re = np.full(n, np.nan)
    Re[known] = U[known] * hydraulic_diameter(b) * rho[known] / mu[known]
    return U, Q, Re


def port_flow(study: Study, r: dict, gas: FuelGas) -> tuple[float, float | None, float | None]:
    """(bulk port velocity [m/s], thermal input [W] or None, port Reynolds number or None) of a
    mixture of the study's burner (:func:`port_flows` of one row). ``r`` needs only the fresh
    mixture's equivalence_ratio, unburned_density_kg_m3 and unburned_viscosity_Pa_s (None: no
    Reynolds number), never its flame: ``check`` predicts from it which criteria a limit search
    can assess."""
    U, Q, Re = (float(v[0]) for v in port_flows(study, [r], [gas]))
    return U, None if math.isnan(Q) else Q, None if math.isnan(Re) else Re


def burner_flow_words(b: Burner) -> str:
    """How the burner's flow is set, in words: 'port velocity 3 m/s', or 'thermal input 0.41 kW over
    301.6 mm² of ports, following the Wobbe index (fixed supply pressure)' (check and the report)."""
    if b.mode == "velocity":
        return f"port velocity {b.port_velocity_m_s:g} m/s"
    assert b.thermal_input_W is not None and b.port_area_m2 is not None  # config: an input and an area
    return (f"thermal input {b.thermal_input_W / 1e3:g} kW over {b.port_area_m2 * 1e6:g} mm² of ports"
            + (", following the Wobbe index (fixed supply pressure)" if b.input_follows_wobbe else ""))


def hydraulic_diameter(b: Burner) -> float:
    """Hydraulic diameter of a port [m]: its diameter (round), twice its gap (slot)."""
    return b.port_size_m if b.port == "round" else 2.0 * b.port_size_m


def wall_gradients(b: Burner, U: np.ndarray, Re: np.ndarray, nu: np.ndarray) -> np.ndarray:
    """Wall velocity gradient of the port flow [1/s] at each bulk velocity ``U`` (with its port
    Reynolds number ``Re``, NaN where unknown, and kinematic viscosity ``nu``): laminar fully
    developed (8U/D, 6U/h) up to Re 2300 and where Re is unknown, Blasius's turbulent gradient
    from Re 4000, linear in Re between the two (physics.validity.transition_gradient): no step
    for a limit search to land on."""
    def laminar(u: np.ndarray) -> np.ndarray:
        return np.asarray(ind.wall_velocity_gradient_round(u, b.port_size_m) if b.port == "round"
                          else ind.wall_velocity_gradient_slot(u, b.port_size_m))
    D_h = hydraulic_diameter(b)
    g = laminar(U)
    turbulent = Re >= val.TURBULENT_REYNOLDS
    g[turbulent] = ind.wall_velocity_gradient_turbulent(U[turbulent], D_h, nu[turbulent])
    mid = (Re > val.LAMINAR_REYNOLDS) & ~turbulent
    Re_m, U_m = Re[mid], U[mid]
    g[mid] = val.transition_gradient(Re_m, laminar(U_m * val.LAMINAR_REYNOLDS / Re_m),
                                     ind.wall_velocity_gradient_turbulent(U_m * val.TURBULENT_REYNOLDS / Re_m, D_h,
                                                                          nu[mid]))
    return g


def not_assessed(study: Study, r: dict, Re: float | None) -> dict[str, str]:
    """Criterion -> why its constant does not hold at this burning point (physics.validity),
    for the criteria the burner has: flashback, blowoff, and the stabilizer with a bluff body
    (not assessed until the study sets [indicators] bluff_body_constant)."""
    b, phi = study.burner, r["equivalence_ratio"]
    assert b is not None  # asked only of a study with a [burner]
    le = r.get("lewis_number_fuel") if phi <= 1.0 else r.get("lewis_number_oxygen")
    where = dict(reynolds=Re, pressure_bar=r["pressure_bar"], unburned_temperature_K=r["unburned_temperature_K"],
                 equivalence_ratio=phi, deficient_lewis=le, layout=b.layout)
    out = {}
    for c in ("flashback", "blowoff") + (("stabilizer",) if b.on_stabilizer else ()):
        why = val.domain_reasons(val.DOMAINS[c], **where)
        if c == "stabilizer" and study.indicator_settings.get("bluff_body_constant") is None:
            why.insert(0, "C_BO not calibrated (set [indicators] bluff_body_constant from a test of this stabilizer)")
        if why:
            out[c] = ", ".join(why)
    return out


def not_assessed_summary(rows: list[dict]) -> list[dict]:
    """The criteria not assessed over a study's burning points, once per criterion: criterion,
    points (at how many), of (burning points), example (the reason at the first such point; with
    several kinds of reason, each kind's first with its count: 'Lewis number 0.42 < 0.8
    (hydrogen-rich) at 6; 4 bar outside 0.5-2 bar at 2'), in the order first met. Kinds of
    reason differ in their words, numbers left out.

    >>> rows = [{"status": "ok", "not_assessed": {"blowoff": why}} for why in ("Le 0.4 < 0.8", "Le 0.4 < 0.8, 4 bar")]
    >>> not_assessed_summary(rows)
    [{'criterion': 'blowoff', 'points': 2, 'of': 2, 'example': 'Le 0.4 < 0.8 at 2; 4 bar at 1'}]
    """
    burning = [r for r in rows if r.get("status") == "ok" and r.get("not_assessed") is not None]
    kinds: dict[str, dict[str, list]] = {}  # criterion -> kind of reason -> [its first words, count]
    points: dict[str, int] = {}
    for r in burning:
        for c, why in r["not_assessed"].items():
            points[c] = points.get(c, 0) + 1
            for part in why.split(", "):
                kinds.setdefault(c, {}).setdefault(re.sub(r"\d[\d.e+\-]*", "#", part), [part, 0])[1] += 1
    out = []
    for c, by_kind in kinds.items():
        example = (next(iter(by_kind.values()))[0] if len(by_kind) == 1
                   else "; ".join(f"{part} at {n}" for part, n in by_kind.values()))
        out.append({"criterion": c, "points": points[c], "of": len(burning), "example": example})
    return out


def _verdict(b: Burner, margins: dict[str, float | None], unassessed: dict[str, str], cellular: bool) -> str:
    """'ok', the risks, and what is not assessed: from the criteria that decide this burner's
    verdict (flashback, and the rim's blowoff or the stabilizer's)."""
    decide = ("flashback", b.blowoff[2])
    need = {"flashback": b.min_flashback_margin, "blowoff": b.min_blowoff_margin,
            "stabilizer": b.min_stabilizer_margin}
    risks = []
    for c in decide:
        if c not in unassessed:
            m = margins[c]
            assert m is not None  # an assessed criterion has its margin
            if m < need[c]:
                risks.append(f"{'stabilizer blowoff' if c == 'stabilizer' else c} risk")
    if cellular and "flashback" not in unassessed:  # [flame_response]: the thermal criterion is optimistic here
        risks.append("flashback risk underestimated (thermodiffusively unstable)")
    missing = [c for c in decide if c in unassessed]
    if not missing:
        return " and ".join(risks) if risks else "ok"
    gap = f"{' and '.join(missing)} not assessed"
    if len(missing) == len(decide):
        return gap
    (assessed,) = (c for c in decide if c not in missing)
    return f"{' and '.join(risks)}; {gap}" if risks else f"ok on {assessed} only; {gap}"


def verdict_tally(verdicts: list[str]) -> str:
    """How many of a condition's burning points are ok, and on what, in the verdicts' own words
    (``_verdict``, ``premixer_verdict``): ok on every criterion, ok on the criteria assessed
    (grouped by what was and was not assessed), at risk, nothing assessed. A parenthesis of a
    verdict (what a criterion rests on) is left out.

    >>> verdict_tally(["ok on core-flow flashback only; blowout not assessed"] * 2 + ["blowout risk"])
    '2 of 3 points ok on core-flow flashback only (blowout not assessed), 1 at risk'
    >>> verdict_tally(["ok", "ok (core-flow flashback judged on the leading-point S_T)"])
    '2 of 2 points ok on every criterion'
    """
    groups: dict[str, int] = {}
    for v in verdicts:
        v = re.sub(r" \([^()]*\)", "", v)
        if v == "ok":
            words = "ok on every criterion"
        elif v.startswith("ok on ") and "; " in v:
            on, gap = v.split("; ", 1)
            words = f"{on} ({gap})"
        elif "risk" in v:
            words = "at risk"
        else:
            words = f"with no criterion assessed ({v})"
        groups[words] = groups.get(words, 0) + 1
    if not any(w.startswith("ok") for w in groups):
        groups = {"ok": 0, **groups}
    order = sorted(groups, key=lambda w: (not w.startswith("ok on every"), not w.startswith("ok"), w == "at risk"))
    parts = [f"{groups[w]} {w}" for w in order]
    return f"{groups[order[0]]} of {len(verdicts)} points {order[0]}" + "".join(", " + p for p in parts[1:])


def burner_columns(study: Study, rows: list[dict], gases: list[FuelGas]) -> dict[str, list]:
    """The burner's port flow, wall gradient, margins and quench ratio of every burning point
    (columns.BURNER_COLUMNS; ``gases``: each row's fuel gas) computed once for all rows on
    arrays, then each point's criteria not assessed (:func:`not_assessed`, also as the column
    'not_assessed': criterion -> why) and verdict: column -> one value per row, None (and no
    criterion not assessed) where a point has no flame or the study no [burner]."""
    b, s, n = study.burner, study.indicator_settings, len(rows)
    where = np.flatnonzero([b is not None and r["status"] == "ok" for r in rows])
    out: dict[str, list] = {c: [None] * n for c in BURNER_COLUMNS}
    out["not_assessed"] = [{} for _ in rows]
    if b is None or not len(where):
        return out
    mine = [rows[i] for i in where.tolist()]
    U, Q, Re = port_flows(study, mine, [gases[i] for i in where.tolist()])
    g = wall_gradients(b, U, Re, _floats(mine, "unburned_viscosity_Pa_s") / _floats(mine, "unburned_density_kg_m3"))
    margins = {"flashback": g / _floats(mine, "flashback_critical_gradient_1_s"),
               "blowoff": _floats(mine, "blowoff_critical_gradient_1_s") / g, "stabilizer": np.full(len(mine), np.nan)}
    quench = _floats(mine, "tube_quenching_diameter_mm" if b.port == "round" else "quenching_distance_mm")
    numbers: dict[str, np.ndarray | list] = {
        "port_velocity_m_s": U, "thermal_input_kW": _or_none(Q / 1e3), "port_reynolds_number": _or_none(Re),
        "wall_velocity_gradient_1_s": g, "quench_ratio": quench / (1e3 * b.port_size_m)}
    if b.stabilizer_size_m is not None and s.get("bluff_body_constant") is not None:
        assert b.approach_velocity_m_s is not None  # config sets it with the stabilizer size
        U_bo = np.asarray(ind.bluff_body_blowoff_velocity(b.stabilizer_size_m, _floats(mine, "chemical_time_s"),
                                                          s["bluff_body_constant"]))
        numbers["bluff_body_blowoff_velocity_m_s"] = U_bo
        margins["stabilizer"] = U_bo / ind.edge_velocity(b.approach_velocity_m_s, b.stabilizer_blockage)
    for c, v in numbers.items():
        out[c] = _scatter(n, where, v)
    _burner_words(study, mine, where, out, {c: _or_none(m) for c, m in margins.items()})
    return out


def _burner_words(study: Study, mine: list[dict], where: np.ndarray, out: dict[str, list],
                  margins: dict[str, list]) -> None:
    """Fill ``out``'s shown margins, criteria not assessed and verdict of the burning rows ``mine`` (at
    ``where`` in the table; ``margins``: criterion -> one margin per burning row)."""
    b = study.burner
    assert b is not None  # asked only of a study with a [burner]
    for k, (i, r) in enumerate(zip(where.tolist(), mine)):
        unassessed = not_assessed(study, r, out["port_reynolds_number"][i])
        mine_m = {c: m[k] for c, m in margins.items()}
        out["flashback_margin"][i], out["blowoff_margin"][i], out["stabilizer_margin"][i] = (
            None if c in unassessed else mine_m[c] for c in ("flashback", "blowoff", "stabilizer"))
        out["not_assessed"][i] = unassessed
        out["criteria_not_assessed"][i] = "; ".join(f"{c}: {why}" for c, why in unassessed.items())
        out["verdict"][i] = _verdict(b, mine_m, unassessed, r.get("instability") == "cellular")


def _into_rows(rows: list[dict], columns: dict[str, list]) -> None:
    """Write a table of columns (column -> one value per row) into the rows."""
    names = list(columns)
    for r, values in zip(rows, zip(*columns.values())):
        r.update(zip(names, values))


def annotate(study: Study, rows: list[dict], ladders: Ladders | None = None) -> list[dict]:
    """Add indicator, reference-ratio, fuel-gas and burner columns to flat rows (in place).

    ``ladders``: what a premixer's margins interpolate between the [stretch] ladder points
    (:class:`Ladders`); None: those of ``rows`` themselves (a whole sweep). A limit search gives
    its flames the sweep's (admissible.driver)."""
    by_name = fuel_gases(study)
    if ladders is None:
        ladders = sweep_ladders(rows) if study.premixer is not None else NO_LADDERS
    _into_rows(rows, indicator_columns(study, rows) | response_columns(rows))  # column-wise, then into the rows
    if study.uncertainty is not None:
        for r in rows:
            r.update(kinetic_columns(study, r))
    gases = [by_name[(r["fuel"], r["blend_fraction"], r["oxidizer"])] for r in rows]
    for r, gas in zip(rows, gases):
        for col in GAS_COLUMNS:
            r[col] = gas.row[col]
    _into_rows(rows, burner_columns(study, rows, gases))
    _into_rows(rows, turbulence_columns(study, rows))
    _into_rows(rows, turbulent_speed_columns(rows, [strained_speed(r, ladders.consumption) for r in rows]))
    for r, gas in zip(rows, gases):
        for analysis in parts("readout"):  # the registered analyses' columns (flamecharts.analyses)
            r.update(analysis.READ_OUT(study, r, gas.row))
    premixer_margins(study, rows, ladders)
    return rows


def response_columns(rows: list[dict]) -> dict[str, list]:
    """Effective Lewis number, Markstein number and length, and the thermodiffusive regime of
    every burning point from its stored Lewis and Zeldovich numbers (physics.flame_response),
    computed once for all rows on arrays: column -> one value per row, None where one of the
    three is missing (Ze is there only with [flame_response]) or Ze is not positive."""
    n = len(rows)
    where = np.flatnonzero([r["status"] == "ok" and r.get("lewis_number_fuel") is not None
                            and r.get("lewis_number_oxygen") is not None and r.get("zeldovich_number") is not None
                            and r["zeldovich_number"] > 0 for r in rows])
    mine = [rows[i] for i in where.tolist()]
    ze, le_f, le_o, phi = (_floats(mine, c) for c in ("zeldovich_number", "lewis_number_fuel", "lewis_number_oxygen",
                                                       "equivalence_ratio"))
    lean = phi <= 1.0  # the fuel is the deficient reactant
    le_eff = fr.effective_lewis_number(np.where(lean, le_o, le_f), np.where(lean, le_f, le_o), ze,
                                       np.where(lean, 1.0 / phi, phi))
    ma = fr.markstein_number_unburned(_floats(mine, "expansion_ratio"), ze, le_eff)
    delta_mm = 1e3 * _floats(mine, "unburned_thermal_diffusivity_m2_s") / _floats(mine, "laminar_flame_speed_m_s")
    return {"effective_lewis_number": _scatter(n, where, le_eff), "markstein_number_unburned": _scatter(n, where, ma),
            "markstein_length_mm": _scatter(n, where, ma * delta_mm),
            "instability": _scatter(n, where, fr.thermodiffusive_regime(ze, le_eff))}


#: Reactions kept per point for sensitivities.csv, the report and the sensitivity chart.
TOP_REACTIONS = 10
#: Reactions (grouped) whose |sensitivity| is below this are not counted as lacking a factor.
COUNTED_SENSITIVITY = 0.005


def rate_factor(study: Study, key: str) -> tuple[float, str]:
    """Uncertainty factor of reaction ``key`` (physics.kinetic_uncertainty.reaction_key) and
    where it comes from: the study's [uncertainty] factors, the packaged table, or the default."""
    u = study.uncertainty
    assert u is not None  # asked only of a study with [uncertainty]
    mine = dict(u.factors)
    if key in mine:
        return mine[key], "study"
    if key in RATE_FACTORS:
        return RATE_FACTORS[key][0], RATE_FACTORS[key][1]
    return u.default_factor, "default"


def reduction_columns(study: Study, point: Point, row: dict) -> dict:
    """The reduction band of a burning point's flame speed under [reduction] (columns.REDUCTION_COLUMNS):
    the skeletal mechanism's error measured at this point where it was a validation flame, else the
    largest over the validation flames; not measured where no validation flame burned (ignition
    delays only). Empty without [reduction], for a point that did not burn, and where no skeletal
    mechanism met the targets (the flames then burn the detailed mechanism)."""
    out: dict[str, Any] = dict.fromkeys(REDUCTION_COLUMNS)
    r = study.reduced
    if r is None or not r.reduced or row.get("status") != "ok":
        return out
    here = r.error_at(condition_key(point))
    largest = r.flame_speed_error
    n = sum(f.get("error") is not None for f in r.flames)
    if here is not None:
        out.update(flame_speed_reduction_error_percent=100.0 * here, reduction_error_source="measured at this point")
    elif largest is not None:
        out.update(flame_speed_reduction_error_percent=100.0 * largest,
                   reduction_error_source=f"largest of {n} validation flame{'s' if n != 1 else ''}")
    else:
        out["reduction_error_source"] = (f"not measured: ignition delays only (within "
                                         f"{100 * r.ignition_delay_error:.2g} %)")
    return out


def kinetic_columns(study: Study, row: dict) -> dict:
    """Kinetic uncertainty band of a point's flame speed from its stored sensitivities
    (physics.kinetic_uncertainty, first order), the most sensitive reaction, and how much of
    the band rests on the default factor; ``top_reactions`` (not a column) lists the
    :data:`TOP_REACTIONS` largest with factor and share of the variance. The sensitivity
    vector is dropped from the row once used (a GRI-Mech 3.0 vector is 325 numbers)."""
    out: dict[str, Any] = dict.fromkeys(KINETIC_COLUMNS)
    out["top_reactions"] = []
    sens = row.pop("reaction_sensitivities", None)
    if row["status"] != "ok" or not sens:
        return out
    u = study.uncertainty
    assert u is not None  # annotate() asks only with [uncertainty]
    equations = _facts(study).reaction_equations
    first: dict[str, str] = {}
    for eq in equations:
        first.setdefault(ku.reaction_key(eq), eq)
    groups = ku.grouped(equations, sens)
    factors = {k: rate_factor(study, k) for k in groups}
    parts = {k: (s * math.log(factors[k][0]) / u.factor_sigmas) ** 2 for k, s in groups.items()}
    variance = sum(parts.values())
    sigma = ku.flame_speed_band(list(groups.values()), [factors[k][0] for k in groups],
                                u.factor_sigmas)
    defaulted = [k for k, s in groups.items() if factors[k][1] == "default" and abs(s) >= COUNTED_SENSITIVITY]
    top = next(iter(groups))
    out.update(flame_speed_kinetic_uncertainty_percent=100.0 * sigma, most_sensitive_reaction=first[top],
               most_sensitive_reaction_sensitivity=groups[top], reactions_default_factor=len(defaulted),
               default_factor_variance_percent=100.0 * sum(parts[k] for k in defaulted) / variance if variance else 0.0)
    out["top_reactions"] = [{"reaction": first[k], "sensitivity": s, "uncertainty_factor": factors[k][0],
                             "factor_source": factors[k][1],
                             "variance_share_percent": 100.0 * parts[k] / variance if variance else 0.0}
                            for k, s in list(groups.items())[:TOP_REACTIONS]]
    return out


def error_bar_sentence(r: dict) -> str:
    """How sure a burning point's S_L is, in one line: 'S_L at φ 1 = 37.8 cm/s ± 0.89 % numerics,
    ± 0.4 % reduction, ± 6 % kinetics (1σ), most sensitive to H + O2 <=> O + OH' (the reduction with
    [reduction], kinetics with [uncertainty] only)."""
    text = (f"S_L at φ {r['equivalence_ratio']:g} = {100 * r['laminar_flame_speed_m_s']:.3g} cm/s "
            f"± {r['flame_speed_numerical_error_percent']:.2g} % numerics")
    if r.get("flame_speed_reduction_error_percent") is not None:
        text += f", ± {r['flame_speed_reduction_error_percent']:.2g} % reduction"
    if r.get("flame_speed_kinetic_uncertainty_percent") is not None:
        text += (f", ± {r['flame_speed_kinetic_uncertainty_percent']:.2g} % kinetics (1σ), most sensitive to "
                 f"{r['most_sensitive_reaction']}")
    return text


def instability_warning(row: dict) -> str:
    """'' or a warning where the flame is thermodiffusively unstable (cellular): it burns
    faster than its S_L, so every S_L-based indicator understates the risk."""
    if row.get("instability") != "cellular":
        return ""
    reduced = row["zeldovich_number"] * (row["effective_lewis_number"] - 1.0)
    return (f"thermodiffusively unstable: Ze (Le_eff - 1) = {reduced:.1f} < {fr.CELLULAR_THRESHOLD:g} (cellular, "
            "Sivashinsky 1977): the real flame wrinkles and runs faster than S_L; flashback risk underestimated "
            "by the S_L-based indicators")


#: Lewis number of the deficient reactant below which a lean flame is taken as prone to
#: thermodiffusive (cellular) instability when [flame_response] has not checked it: hydrogen's
#: is about 0.3-0.4, lean methane's about 0.96 (the cut of physics.validity's blowoff range;
#: common practice without source).
PREFERENTIAL_DIFFUSION_LEWIS = 0.8


def lewis_warning(row: dict) -> str:
    """'' or a warning where a lean burning point has a deficient-reactant Lewis number below
    PREFERENTIAL_DIFFUSION_LEWIS and [flame_response] has not judged its stability: such flames
    tend to wrinkle into cells and run faster than S_L, so the S_L-based flashback margin may be
    optimistic (Sivashinsky 1977; Matalon 2007, for the mechanism)."""
    le = row.get("lewis_number_fuel")
    if (row.get("status") != "ok" or row.get("instability") is not None or row.get("equivalence_ratio", 1.0) >= 1.0
            or le is None or le >= PREFERENTIAL_DIFFUSION_LEWIS):
        return ""
    return (f"Lewis number of the fuel {le:.2g} < {PREFERENTIAL_DIFFUSION_LEWIS:g} on the lean side: the flame may be "
            "thermodiffusively unstable (cellular) and run faster than S_L, so the flashback margin may be optimistic; "
            "add a [flame_response] table to check")


def point_warnings(study: Study, point: Point, row: dict) -> str:
    """All warnings of one point, joined by '; ' ('' when it is inside every range). A flame that
    turns out to be autoignition is not warned of here: it is a status of its own
    (results.not_a_flame); a point whose flame failed is, when its mixture ignites on its own."""
    out = [unsolved_autoignition_warning(row.get("status", ""), row.get("autoignition_screen_delay_s"), point.T_u),
           pressure_warning(study.mechanism, point.pressure_bar),
           flammability_warning(point.X_fuel, point.X_oxidizer, point.phi),
           heavy_hydrocarbon_warning(study.mechanism, point.X_fuel, all_atoms(study)),
           instability_warning(row), lewis_warning(row)]
    return "; ".join(w for w in out if w)


def turbulence_columns(study: Study, rows: list[dict]) -> dict[str, list]:
    """Where each burning point's flame sits in the regimes of premixed turbulent combustion
    ([premixer] with a [burner] that sets the bulk velocity; columns.TURBULENCE_COLUMNS), on
    arrays over all rows: u' and l_t from the study, or estimated from the burner's duct
    (physics.premixer.duct_turbulence: u'/U = 0.16 Re^-1/8, l_t = 0.07 D_h, common practice
    without source), and Peters' turbulent Reynolds, Damkohler and Karlovitz numbers with
    l_F = alpha_u / S_L and the regime (physics.turbulence; Peters 2000). Column -> one value per
    row, None where a point has no flame, port velocity or viscosity."""
    n = len(rows)
    out: dict[str, list] = {c: [None] * n for c in TURBULENCE_COLUMNS}
    pm, b = study.premixer, study.burner
    if pm is None or b is None:
        return out
    where = np.flatnonzero([r["status"] == "ok" and bool(r.get("port_velocity_m_s"))
                            and bool(r.get("unburned_viscosity_Pa_s")) for r in rows])
    mine = [rows[i] for i in where.tolist()]
    U = _floats(mine, "port_velocity_m_s")
    duct = duct_turbulence(U, hydraulic_diameter(b), _floats(mine, "unburned_viscosity_Pa_s")
                           / _floats(mine, "unburned_density_kg_m3"))
    u_p = U * pm.turbulence_intensity if pm.turbulence_intensity is not None else duct.u_prime_m_s
    l_t = pm.integral_length_m if pm.integral_length_m is not None else duct.integral_length_m
    S_L = _floats(mine, "laminar_flame_speed_m_s")
    l_F = turb.diffusive_thickness(_floats(mine, "unburned_thermal_diffusivity_m2_s"), S_L)
    given = (pm.turbulence_intensity is not None, pm.integral_length_m is not None)
    source = "study" if all(given) else "duct estimate" if not any(given) else "study and duct estimate"
    columns = {"rms_velocity_m_s": u_p, "integral_length_mm": np.full(len(mine), 1e3 * l_t),
               "turbulence_source": np.full(len(mine), source),
               "turbulent_reynolds_number": turb.turbulent_reynolds(u_p, l_t, S_L, l_F),
               "damkohler_number": turb.damkohler(u_p, l_t, S_L, l_F),
               "karlovitz_number": turb.karlovitz(u_p, l_t, S_L, l_F),
               "combustion_regime": turb.regime(u_p, l_t, S_L, l_F)}
    return {c: _scatter(n, where, columns[c]) for c in TURBULENCE_COLUMNS}


def turbulent_speeds(row: dict) -> dict[str, FlameSpeed]:
    """The turbulent flame speeds of an annotated burning point (:func:`speeds_at` on its
    ``strained_consumption_speed_max_m_s``): what the report and charts read."""
    return speeds_at(row, row.get("strained_consumption_speed_max_m_s"))


def speeds_at(row: dict, S_c: float | None) -> dict[str, FlameSpeed]:
    """The turbulent flame speeds of a burning point whose turbulence is known
    (``turbulence_columns``), by correlation (physics.premixer), each with its fitted range:

    zimont         Zimont's closure, 0.52 u' Da^(1/4): no Lewis number
    muppala        Muppala et al. (2005), 1/Le on the Lewis number of the deficient reactant (the
                   fuel's, heat-release weighted over a blend's fuels, on the lean side; oxygen's
                   on the rich side): carries a Lewis number below one (hydrogen), coarsely
    leading point  Schmid's S_L + u' (1 + Da^-2)^(-1/4) with S_L -> S_c,max (``S_c``), the strongest
                   consumption speed of the strained-flame ladders (Kuznetsov & Sabelnikov; where
                   a [stretch] ladder burned at the point's gas, pressure and preheat:
                   :func:`strained_speed`): carries hydrogen's response to stretch as the
                   mechanism gives it, pressure included

    Empty where the point has no turbulence columns; a correlation without its input (a Lewis
    number, S_c,max) is left out."""
    u_p = row.get("rms_velocity_m_s")
    if u_p is None:
        return {}
    l_t = 1e-3 * row["integral_length_mm"]
    S_L, alpha = row["laminar_flame_speed_m_s"], row["unburned_thermal_diffusivity_m2_s"]
    nu = row["unburned_viscosity_Pa_s"] / row["unburned_density_kg_m3"]
    out = {"zimont": zimont_flame_speed(u_p, l_t, S_L, alpha)}
    lewis = row.get("lewis_number_fuel" if row["equivalence_ratio"] <= 1.0 else "lewis_number_oxygen")
    if lewis:
        out["muppala"] = muppala_flame_speed(u_p, l_t, S_L, nu, lewis, 1e5 * row["pressure_bar"])
    if S_c:
        out["leading point"] = leading_point_flame_speed(u_p, l_t, S_c, alpha)
    return out


def turbulent_speed_columns(rows: list[dict], strained: list[tuple[float | None, str | None]] | None = None
                            ) -> dict[str, list]:
    """A premixer's turbulent flame speeds (:func:`speeds_at`'s correlations, on arrays over every
    point whose turbulence is known: physics.premixer's ``*_flame_speeds``), which of them lie
    outside the range of their fitted data and why, and the core-flow flashback margin
    (columns.TURBULENT_SPEED_COLUMNS): column -> one value per row. ``strained``: (S_c,max, how it
    was found) at each point (:func:`strained_speed`, what ``annotate`` gives every point); None:
    each point's own ladder's.

    Core-flow margin (physics.premixer.core_flashback_margin): the bulk (port) velocity over
    the LARGEST turbulent flame speed of the correlations computed at the point, in or out of
    their fitted range, and which correlation that was (the first of zimont, muppala, leading
    point on a tie). The largest, because the correlations disagree by more than their scatter
    and the fastest flame is the one that flashes back; out of range too, because hydrogen
    blends are exactly where the Lewis-number correlation leaves its data
    (``turbulent_flame_speed_outside_range`` says so). The bulk velocity, not the core's (about
    1.2 times the bulk in turbulent duct flow, common practice), errs on the safe side."""
    n = len(rows)
    if strained is None:
        strained = [(own, "at a ladder point") if (own := r.get("ladder_consumption_speed_max_m_s")) else (None, None)
                    for r in rows]
    out: dict[str, list] = {c: [None] * n for c in TURBULENT_SPEED_COLUMNS}
    where = np.flatnonzero([r.get("rms_velocity_m_s") is not None for r in rows])
    if not len(where):
        return out
    mine = [rows[i] for i in where.tolist()]
    u_p, S_L, alpha = (_floats(mine, c) for c in ("rms_velocity_m_s", "laminar_flame_speed_m_s",
                                                   "unburned_thermal_diffusivity_m2_s"))
    l_t = 1e-3 * _floats(mine, "integral_length_mm")
    speeds = {"zimont": (np.arange(len(mine)), zimont_flame_speeds(u_p, l_t, S_L, alpha))}
    lewis = [r.get("lewis_number_fuel" if r["equivalence_ratio"] <= 1.0 else "lewis_number_oxygen") for r in mine]
    has = np.flatnonzero([bool(le) for le in lewis])
    speeds["muppala"] = (has, muppala_flame_speeds(
        u_p[has], l_t[has], S_L[has], _floats(mine, "unburned_viscosity_Pa_s")[has]
        / _floats(mine, "unburned_density_kg_m3")[has], np.array([lewis[k] for k in has.tolist()], dtype=float),
        1e5 * _floats(mine, "pressure_bar")[has]))
    S_c = [strained[i][0] for i in where.tolist()]
    has = np.flatnonzero([bool(s) for s in S_c])
    speeds["leading point"] = (has, leading_point_flame_speeds(u_p[has], l_t[has], np.array(
        [S_c[k] for k in has.tolist()], dtype=float), alpha[has]))
    S_T = np.full((len(mine), len(speeds)), np.nan)
    why = [[""] * len(speeds) for _ in mine]
    for j, (at, s) in enumerate(speeds.values()):
        S_T[at, j] = s.S_T_m_s
        for k, w in zip(at.tolist(), s.why):
            why[k][j] = w
    names = list(speeds)
    fastest = np.nanargmax(S_T, axis=1)  # the first largest
    for k, i in enumerate(where.tolist()):
        got = {name: S_T[k, j] for j, name in enumerate(names) if not math.isnan(S_T[k, j])}
        out["strained_consumption_speed_max_m_s"][i], out["strained_consumption_speed_source"][i] = strained[i]
        out["turbulent_flame_speed_outside_range"][i] = "; ".join(f"{name}: {why[k][j]}" for j, name in enumerate(names)
                                                                  if name in got and why[k][j])
        out["core_flashback_correlation"][i] = names[fastest[k]]
    for j, col in enumerate(("turbulent_flame_speed_zimont_m_s", "turbulent_flame_speed_muppala_m_s",
                             "turbulent_flame_speed_leading_point_m_s")):
        out[col] = _scatter(n, where, _or_none(S_T[:, j]))
    out["core_flashback_margin"] = _scatter(n, where, core_flashback_margin(
        _floats(mine, "port_velocity_m_s"), S_T[np.arange(len(mine)), fastest]))
    return out


def premixer_columns(study: Study, point: Point, row: dict | None = None) -> dict:
    """Ignition delay of the fresh mixture at the point's preheat and pressure, the
    autoignition margin (delay / residence time), the same for the most reactive mixture near
    the fuel injection (one of physics.autoignition.INJECTION_PHIS), and the verdict on both
    (columns.PREMIXER_COLUMNS; physics.limits.autoignition_verdict), from the delays the run
    stored (analyses/premixer_ignition: time of the largest dT/dt in an adiabatic constant-pressure
    reactor, inf when the gas has not ignited within physics.autoignition.premixer_horizon).
    Empty without [premixer]; the verdict says so when the delays are not stored.
    """
    pm = study.premixer
    out = dict.fromkeys(PREMIXER_COLUMNS)
    if pm is None:
        return out
    row = row or {}
    if row.get("premixer_ignition_delay_s") is None:
        out["autoignition_verdict"] = ("not computed: the ignition delays of this point are not stored; run the "
                                       "study again (flamecharts run) to integrate them, no flame is solved again")
        return out
    tau = float(row["premixer_ignition_delay_s"])
    tau_inj, phi_inj = math.inf, INJECTION_PHIS[-1]  # the shortest; all inf: the richest scanned
    for t, phi in zip(map(float, row["injection_ignition_delays_s"]), INJECTION_PHIS):
        if t < tau_inj:
            tau_inj, phi_inj = t, phi
    margin, margin_inj = tau / pm.residence_time_s, tau_inj / pm.residence_time_s
    verdict = autoignition_verdict(detailed_path(study), float(point.T_u), min(margin, margin_inj),
                                   pm.min_autoignition_margin)
    if margin_inj < margin and margin_inj < pm.min_autoignition_margin <= margin:
        verdict += f" near the fuel injection (phi {phi_inj:g}{injection_end(phi_inj)})"
    out.update(ignition_delay_ms=tau * 1e3, autoignition_margin=margin, injection_ignition_delay_ms=tau_inj * 1e3,
               injection_equivalence_ratio=phi_inj, injection_autoignition_margin=margin_inj,
               autoignition_verdict=verdict)
    return out


#: The columns that name a point of the sweep (without the mechanism).
POINT_AXES = ("fuel", "oxidizer", "blend_fraction", "equivalence_ratio", "pressure_bar", "unburned_temperature_K")


def mechanism_differences(rows: list[dict], names: list[str]) -> list[dict]:
    """Each point burning under the reference mechanism (``names[0]``) and under another: the
    relative difference of its flame speed and thermal thickness, in % of the reference's
    (columns.COMPARISON_COLUMNS), the numerical error of the flame-speed difference (both
    flames' grid bands in quadrature, scaled to the ratio: d(S/S0)/(S/S0) = sqrt(e^2 + e0^2)
    for independent errors) and the reference's 1-sigma kinetic band when the study asks for one. One row
    per point and other mechanism, in the study's order."""
    ref = {tuple(r[a] for a in POINT_AXES): r for r in rows
           if r.get("mechanism") == names[0] and r["status"] == "ok"}
    out = []
    for r in rows:
        base = ref.get(tuple(r[a] for a in POINT_AXES))
        if r.get("mechanism") == names[0] or r["status"] != "ok" or base is None:
            continue
        S, S0 = r["laminar_flame_speed_m_s"], base["laminar_flame_speed_m_s"]
        d, d0 = r["thermal_thickness_mm"], base["thermal_thickness_mm"]
        e, e0 = r.get("flame_speed_numerical_error_percent"), base.get("flame_speed_numerical_error_percent")
        out.append({"mechanism": r["mechanism"], "reference_mechanism": names[0],
                    **{a: r[a] for a in ("blend_with",) + POINT_AXES},
                    "laminar_flame_speed_m_s": S, "reference_laminar_flame_speed_m_s": S0,
                    "flame_speed_difference_percent": 100.0 * (S / S0 - 1.0),
                    "flame_speed_difference_numerical_error_percent":
                        None if e is None or e0 is None else math.hypot(e, e0) * S / S0,
                    "thermal_thickness_mm": d, "reference_thermal_thickness_mm": d0,
                    "thermal_thickness_difference_percent": 100.0 * (d / d0 - 1.0) if d and d0 else None,
                    "reference_kinetic_uncertainty_percent": base.get("flame_speed_kinetic_uncertainty_percent")})
    return out


def inside_kinetic_band(difference: dict) -> bool | None:
    """Whether a :func:`mechanism_differences` row's flame-speed difference lies inside the
    reference's kinetic band (None when the study asks for no band)."""
    band = difference["reference_kinetic_uncertainty_percent"]
    return None if band is None else abs(difference["flame_speed_difference_percent"]) <= band


def largest_differences(differences: list[dict]) -> list[dict]:
    """Per other mechanism, gas and condition (pressure, preheat): the point of
    :func:`mechanism_differences` with the largest flame-speed difference, and how many
    points were compared (key 'points'), in the order they first occur."""
    groups: dict[tuple, list[dict]] = {}
    for d in differences:
        groups.setdefault((d["mechanism"], d["fuel"], d["oxidizer"], d["blend_fraction"], d["pressure_bar"],
                           d["unburned_temperature_K"]), []).append(d)
    return [{**max(ds, key=lambda d: abs(d["flame_speed_difference_percent"])), "points": len(ds)}
            for ds in groups.values()]


def boundary_layer_columns(study: Study, row: dict) -> dict:
    """Boundary-layer flashback of a burning premixer point (columns.PREMIXER_MARGIN_COLUMNS, its
    first six) by the critical-gradient model (physics.premixer.boundary_layer_flashback; Lewis &
    von Elbe, Putnam & Jensen): the duct's wall velocity gradient, laminar through turbulent
    (Churchill 1977), over g_c = S^2 / (Pe_F alpha_u). S is S_L, or the strained flames' S_c,max
    where a [stretch] ladder burned at the point and it is larger (the leading-point reading for
    Le_eff < 1: not validated against flashback data). Pe_F is the [indicators] laminar value up to
    Re 2300 and, from Re 4000, [premixer] turbulent_flashback_peclet (blended between); without
    that key the margin is not assessed in transitional or turbulent flow. Where the laminar Pe_F
    counts, the laminar criterion's pressure and preheat range holds too (physics.validity).
    The margin is blank where not assessed; the status says why."""
    out: dict[str, Any] = dict.fromkeys(PREMIXER_MARGIN_COLUMNS[:6])
    pm, b = study.premixer, study.burner
    U, mu = row.get("port_velocity_m_s"), row.get("unburned_viscosity_Pa_s")
    if pm is None or b is None or row["status"] != "ok" or not U or not mu:
        return out
    D_h, nu = hydraulic_diameter(b), mu / row["unburned_density_kg_m3"]
    S_L, alpha = row["laminar_flame_speed_m_s"], row["unburned_thermal_diffusivity_m2_s"]
    S_c = row.get("ladder_consumption_speed_max_m_s")
    strained = bool(S_c and S_c > S_L)
    S = float(S_c) if S_c and strained else S_L
    Pe_lam, Pe_turb = study.indicator_settings["flashback_peclet"], pm.turbulent_flashback_peclet
    m = boundary_layer_flashback(U, D_h, nu, S, alpha, Pe_lam, Pe_turb)
    g = float(premixer_wall_gradient(U, D_h, nu))
    Re = U * D_h / nu
    why = [m.why] if m.why else []
    if Re < val.TURBULENT_REYNOLDS and not why:  # the laminar Pe_F counts: its data's range
        why = val.domain_reasons(val.DOMAINS["flashback"], reynolds=None, pressure_bar=row["pressure_bar"],
                                 unburned_temperature_K=row["unburned_temperature_K"],
                                 equivalence_ratio=row["equivalence_ratio"], deficient_lewis=None)
    pe_words = (f"laminar Pe_F {Pe_lam:g}" if Re <= val.LAMINAR_REYNOLDS or Pe_turb is None
                else f"turbulent Pe_F {Pe_turb:g} of [premixer]" if Re >= val.TURBULENT_REYNOLDS
                else f"Pe_F blended from {Pe_lam:g} to {Pe_turb:g} (transitional Re {Re:.3g})")
    out.update(premixer_wall_velocity_gradient_1_s=g, wall_friction_velocity_m_s=math.sqrt(g * nu),
               boundary_layer_flame_speed_m_s=S, boundary_layer_critical_gradient_1_s=g / m.value,
               boundary_layer_flashback_margin=None if why else m.value,
               boundary_layer_flashback_status=(f"not assessed: {'; '.join(why)}" if why else
                                                f"assessed ({pe_words}, on {'S_c,max' if strained else 'S_L'})"))
    return out


#: The point axes whose ladders' extinction strain rates are interpolated along: one gas, pressure and preheat.
LADDER_GROUP = ("fuel", "oxidizer", "pressure_bar", "unburned_temperature_K")


def ladder_extinction(row: dict) -> float | None:
    """kappa_ext [1/s] of a burning point whose [stretch] ladder burned, else None."""
    K = row.get("ladder_extinction_strain_rate_1_s")
    return float(K) if row.get("status") == "ok" and K else None


def ladder_consumption_speed(row: dict) -> float | None:
    """S_c,max [m/s], the strongest strained-flame consumption speed, of a burning point whose
    [stretch] ladder burned, else None."""
    S_c = row.get("ladder_consumption_speed_max_m_s")
    return float(S_c) if row.get("status") == "ok" and S_c else None


#: A value per ladder point: (fuel, oxidizer, p, T) -> {(blend fraction, phi): value}.
LadderTable = dict[tuple, dict[tuple[float, float], float]]


def ladder_points(rows: list[dict], value: Callable[[dict], float | None] = ladder_extinction) -> LadderTable:
    """(fuel, oxidizer, p, T) -> {(blend fraction, phi): value} of every point whose ladder burned;
    ``value``: :func:`ladder_extinction` (kappa_ext, the default) or :func:`ladder_consumption_speed`."""
    out: LadderTable = {}
    for r in rows:
        v = value(r)
        if v is not None:
            out.setdefault(tuple(r[a] for a in LADDER_GROUP), {})[(r["blend_fraction"], r["equivalence_ratio"])] = v
    return out


@dataclass(frozen=True)
class Ladders:
    """What the [stretch] ladders of a sweep give every flame at their gas, pressure and preheat, by
    interpolation between the ladder points (:func:`interpolated_extinction`): kappa_ext for the
    extinction-strain blowout, S_c,max for the leading-point flame speed. The same table serves
    the swept points and the flames a [limits] search solves between them (admissible.driver), so a
    margin is the same function of the flame at both."""

    extinction: LadderTable
    consumption: LadderTable


#: A sweep without burned ladders.
NO_LADDERS = Ladders({}, {})


def sweep_ladders(rows: list[dict]) -> Ladders:
    """The :class:`Ladders` of a sweep's rows (those whose ladder burned carry its values)."""
    return Ladders(ladder_points(rows), ladder_points(rows, ladder_consumption_speed))


def _bracket(xs: list[float], v: float) -> tuple[list[tuple[int, float]], bool]:
    """(index, weight) of the sorted values ``xs`` that linear interpolation at ``v`` uses, and
    whether ``v`` lies beyond them (then the nearest one, weight 1: held, never extrapolated)."""
    if v <= xs[0] or v >= xs[-1]:
        i = 0 if v <= xs[0] else len(xs) - 1
        return [(i, 1.0)], not math.isclose(v, xs[i], rel_tol=1e-9, abs_tol=1e-12)
    j = next(k for k in range(1, len(xs)) if xs[k] >= v)
    if math.isclose(v, xs[j], rel_tol=1e-9, abs_tol=1e-12):
        return [(j, 1.0)], False
    w = (v - xs[j - 1]) / (xs[j] - xs[j - 1])
    return [(j - 1, 1.0 - w), (j, w)], False


def interpolated_extinction(ladders: dict[tuple[float, float], float], blend: float, phi: float) -> tuple[float, str]:
    """kappa_ext [1/s] at (``blend``, ``phi``) from the ladder points of one gas, pressure and
    preheat (``ladders``: {(blend fraction, phi): kappa_ext}, at least one), and how it was found
    (the same for any positive ladder value: S_c,max in :func:`strained_speed`):
    'at a ladder point'; 'interpolated' (linear in ln kappa_ext along phi at each ladder blend
    fraction, then along the blend fraction); or 'nearest ladder point (beyond the ladders' ...)'
    where the point lies outside the ladders' span on an axis, the nearest value held there,
    never extrapolated. ln kappa_ext rather than the ratio C = kappa_ext alpha_u / S_L^2 or C
    itself: on lean hydrogen-air ladders it was off by 2-6 % where C was off by 7-16 % (ln C)
    and 26-57 % (C) (tests/benchmarks/extinction_interpolation.py, docs/benchmarks.md).

    >>> K, how = interpolated_extinction({(0.0, 0.5): 4000.0, (0.0, 1.0): 1000.0}, 0.0, 0.75)
    >>> round(K, 6), how
    (2000.0, 'interpolated')
    >>> interpolated_extinction({(0.0, 0.5): 4000.0, (0.0, 1.0): 1000.0}, 0.3, 1.2)
    (1000.0, "nearest ladder point (beyond the ladders' blend fraction 0 and phi 0.5-1)")
    """
    if (blend, phi) in ladders:
        return ladders[(blend, phi)], "at a ladder point"
    by_blend: dict[float, list[tuple[float, float]]] = {}
    for (x, y), K in ladders.items():
        by_blend.setdefault(x, []).append((y, K))
    xs = sorted(by_blend)
    used, held_x = _bracket(xs, blend)
    K, mixed, held_y = 1.0, len(used) > 1, []
    for i, w in used:  # a geometric mean, weights 1 where a value is held: exact there
        ys = sorted(by_blend[xs[i]])
        along, held = _bracket([y for y, _ in ys], phi)
        K *= math.prod(ys[k][1] ** v for k, v in along) ** w
        mixed = mixed or len(along) > 1
        if held:
            held_y.append((ys[0][0], ys[-1][0]))
    beyond = ([f"blend fraction {_span(xs[0], xs[-1])}"] if held_x else []) + \
        ([f"phi {_span(min(a for a, _ in held_y), max(b for _, b in held_y))}"] if held_y else [])
    how = "interpolated" if mixed else "nearest ladder point"
    return K, how + (f" (beyond the ladders' {' and '.join(beyond)})" if beyond else "")


def _span(lo: float, hi: float) -> str:
    return f"{lo:g}" if lo == hi else f"{lo:g}-{hi:g}"


#: extinction_strain_source of a point whose gas, pressure and preheat has no burned ladder.
NO_LADDER = "not assessed: no ladder at this condition"


def strained_speed(row: dict, speeds: LadderTable) -> tuple[float | None, str | None]:
    """(S_c,max [m/s], how it was found) of a burning point: the strongest strained-flame consumption
    speed of the ladder points of its gas, pressure and preheat (``speeds``: the ``consumption`` of
    :class:`Ladders`), interpolated as kappa_ext is (:func:`interpolated_extinction`: linear in its
    logarithm along phi, then along the blend fraction; held beyond the ladders, never
    extrapolated): the ladder's own value at a ladder point. (None, None) for a point without a
    flame, (None, 'no ladder at this condition') without a ladder at its condition.

    S_c,max itself, not its ratio to the point's S_L (the first plan, carrying each point's S_L): on
    lean hydrogen ladders ln S_c,max was off by -3 to +8 % along phi and -5 to +1 % across blends,
    the ratio by +8 to +16 % and +1 to +8 % (tests/benchmarks/extinction_interpolation.py,
    docs/benchmarks.md): S_L falls steeply to the lean side while S_c,max does not, as for kappa_ext.

    >>> row = {"status": "ok", "fuel": "f", "oxidizer": "air", "pressure_bar": 1.0, "unburned_temperature_K": 300.0,
    ...        "blend_fraction": 0.0, "equivalence_ratio": 0.6, "laminar_flame_speed_m_s": 0.5}
    >>> S_c, how = strained_speed(row, {("f", "air", 1.0, 300.0): {(0.0, 0.5): 0.75, (0.0, 0.7): 0.96}})
    >>> round(S_c, 4), how
    (0.8485, 'interpolated')
    """
    if row.get("status") != "ok" or not row.get("laminar_flame_speed_m_s"):
        return None, None
    mine = speeds.get(tuple(row[a] for a in LADDER_GROUP))
    if not mine:
        return None, NO_LADDER.removeprefix("not assessed: ")
    return interpolated_extinction(mine, row["blend_fraction"], row["equivalence_ratio"])


def blowout_columns(study: Study, row: dict, ladders: dict[tuple, dict[tuple[float, float], float]]) -> dict:
    """Lean blowout on the extinction strain rate of a burning premixer point (columns.
    PREMIXER_MARGIN_COLUMNS, the last six): kappa_ext of its ladder, or interpolated between the
    ladder points of its gas, pressure and preheat (``ladders``: :func:`ladder_points`;
    :func:`interpolated_extinction`), with C = kappa_ext alpha_u / S_L^2 beside it (the extinction
    strain in units of the flame's own strain scale); with a stabilizer in [burner], the
    Damkohler number Da_ext = kappa_ext d / U_edge (physics.premixer.extinction_damkohler;
    Shanbhogue, Husain & Lieuwen 2009; Zhang et al. 2007 for hydrogen blends, from memory) and
    its margin over [premixer] blowout_damkohler (physics.premixer.lean_blowout_margin). No
    ladder at the condition, no stabilizer: those columns blank."""
    out: dict[str, Any] = dict.fromkeys(PREMIXER_MARGIN_COLUMNS[6:])
    pm, b = study.premixer, study.burner
    if pm is None or b is None or row["status"] != "ok" or row.get("rms_velocity_m_s") is None:
        return out
    mine = ladders.get(tuple(row[a] for a in LADDER_GROUP))
    if not mine:
        out["extinction_strain_source"] = NO_LADDER
        return out
    K, how = interpolated_extinction(mine, row["blend_fraction"], row["equivalence_ratio"])
    out.update(extinction_karlovitz_number=K * row["unburned_thermal_diffusivity_m2_s"]
               / row["laminar_flame_speed_m_s"] ** 2, blowout_extinction_strain_rate_1_s=K,
               extinction_strain_source=how)
    if b.stabilizer_size_m is not None:
        assert b.approach_velocity_m_s is not None  # config sets it with the stabilizer size
        U_edge = ind.edge_velocity(b.approach_velocity_m_s, b.stabilizer_blockage)
        Da = float(extinction_damkohler(K, b.stabilizer_size_m, U_edge))
        out.update(stabilizer_edge_velocity_m_s=U_edge, extinction_damkohler_number=Da,
                   extinction_blowout_margin=float(lean_blowout_margin(Da, pm.blowout_damkohler)))
    return out


def extinction_leave_one_out(rows: list[dict]) -> list[dict]:
    """How well :func:`interpolated_extinction` stands in for a ladder: each ladder point of a gas,
    pressure and preheat with at least one other, its kappa_ext predicted from the others alone.
    One dict per such point: its axes and blend_with, kappa_ext of its ladder ('ladder_1_s'), the
    one predicted ('predicted_1_s'), 'error_percent' and 'how' (interpolated or nearest)."""
    blends = {tuple(r[a] for a in LADDER_GROUP) + (r["blend_fraction"], r["equivalence_ratio"]): r.get("blend_with", "")
              for r in rows}
    out = []
    for group, mine in ladder_points(rows).items():
        if len(mine) < 2:
            continue
        for (x, y), K in mine.items():
            K_pred, how = interpolated_extinction({k: v for k, v in mine.items() if k != (x, y)}, x, y)
            out.append({**dict(zip(LADDER_GROUP, group)), "blend_with": blends[group + (x, y)], "blend_fraction": x,
                        "equivalence_ratio": y, "ladder_1_s": K, "predicted_1_s": K_pred,
                        "error_percent": 100.0 * (K_pred / K - 1.0), "how": how})
    return out


#: The premixer's criteria in its verdict: name -> (margin column, the burner's minimum attribute).
PREMIXER_CRITERIA = {
    "core-flow flashback": ("core_flashback_margin", "min_flashback_margin"),
    "boundary-layer flashback": ("boundary_layer_flashback_margin", "min_flashback_margin"),
    "blowout": ("extinction_blowout_margin", "min_stabilizer_margin"),
}


def premixer_unassessed(study: Study, row: dict) -> dict[str, str]:
    """The premixer's criteria (PREMIXER_CRITERIA) not assessed at a burning point, and why."""
    b = study.burner
    assert b is not None  # asked only of a premixer point, which has a [burner]
    out = {}
    if row.get("boundary_layer_flashback_margin") is None:
        out["boundary-layer flashback"] = str(row.get("boundary_layer_flashback_status") or "").removeprefix(
            "not assessed: ")
    if row.get("extinction_blowout_margin") is None:
        # no comma in these reasons: summaries split a list of reasons at commas
        why = []
        if not b.on_stabilizer:
            why.append("no stabilizer in [burner] (stabilizer_size_mm and approach_velocity_m_s give d and U_edge)")
        if row.get("extinction_strain_source") in (None, NO_LADDER):
            why.append("no ladder at this gas and pressure and preheat: [stretch] selects none")
        out["blowout"] = " and ".join(why) or "no extinction strain rate at this point"
    return out


#: How a verdict or limit sentence names a correlation of ``speeds_at``.
SPEED_WORDS = {"zimont": "Zimont's S_T", "muppala": "Muppala et al.'s S_T", "leading point": "the leading-point S_T"}


def core_flashback_basis(row: dict) -> str:
    """Which turbulent flame speed a point's core-flow flashback margin rests on (the largest,
    ``core_flashback_correlation``), and whether it lies outside its correlation's fitted range
    (physics.premixer's ranges); '' without a core-flow margin.

    >>> core_flashback_basis({"core_flashback_correlation": "muppala",
    ...                       "turbulent_flame_speed_outside_range": "muppala: Le 0.4 outside 0.9-2"})
    "Muppala et al.'s S_T, outside its fitted range"
    """
    name = row.get("core_flashback_correlation")
    if not name:
        return ""
    outside = {part.split(": ", 1)[0] for part in (row.get("turbulent_flame_speed_outside_range") or "").split("; ")}
    return SPEED_WORDS.get(name, name) + (", outside its fitted range" if name in outside else "")


def premixer_verdict(study: Study, row: dict) -> str:
    """The verdict of a burning premixer point: its own criteria (the core-flow flashback margin,
    the boundary-layer one where assessed, the extinction-strain blowout margin where a ladder and a
    stabilizer give it) against the burner's minimum margins, plus the burner's laminar rim or
    stabilizer blowoff criterion where that is assessed (the laminar flashback criterion is the
    boundary-layer model's laminar end, so it is not counted twice). 'ok', the risks, and which
    of the premixer's criteria are not assessed, then which turbulent flame speed the core-flow
    criterion was judged on and whether it lies outside its fitted range (:func:`core_flashback_basis`:
    an 'ok' for a hydrogen-rich fuel may rest on a correlation fitted on hydrocarbon flames)."""
    b = study.burner
    assert b is not None  # asked only of a premixer point, which has a [burner]
    unassessed = premixer_unassessed(study, row)
    decide = {c: (row.get(col), getattr(b, attr)) for c, (col, attr) in PREMIXER_CRITERIA.items()}
    laminar = b.blowoff[2]
    if laminar not in (row.get("not_assessed") or {}) and row.get(b.blowoff[0]) is not None:
        decide[laminar if laminar == "blowoff" else "stabilizer blowoff"] = (row[b.blowoff[0]], b.blowoff[1])
    risks = [f"{c} risk" for c, (m, need) in decide.items() if c not in unassessed and m < need]
    if row.get("instability") == "cellular" and row.get("strained_consumption_speed_max_m_s") is None:
        # a cellular flame runs faster than the S_L the correlations scale: without a ladder's
        # strongest consumption speed (the leading-point speed) the flashback margins are optimistic
        risks += [f"{c} risk underestimated (thermodiffusively unstable, no [stretch] ladder)"
                  for c in ("core-flow flashback", "boundary-layer flashback") if c not in unassessed]
    basis = core_flashback_basis(row)
    judged = f" (core-flow flashback judged on {basis})" if basis else ""
    if not unassessed:
        return (" and ".join(risks) if risks else "ok") + judged
    gap = f"{' and '.join(unassessed)} not assessed"
    assessed = [c for c in decide if c not in unassessed]
    return (f"{' and '.join(risks)}; {gap}" if risks else f"ok on {' and '.join(assessed)} only; {gap}") + judged


def premixer_margins(study: Study, rows: list[dict], ladders: Ladders | None = None) -> None:
    """Add a premixer's boundary-layer flashback and extinction-strain blowout columns to every row
    (in place; after ``turbulent_speed_columns``, across the sweep: the blowout interpolates between
    the ladder points of ``ladders``, by default those of ``rows``), and give each burning premixer
    point the premixer's verdict (:func:`premixer_verdict`) and its criteria not assessed beside the
    burner's."""
    if ladders is None:
        ladders = sweep_ladders(rows) if study.premixer is not None else NO_LADDERS
    for r in rows:
        r.update(boundary_layer_columns(study, r))
        r.update(blowout_columns(study, r, ladders.extinction))
        if r["status"] == "ok" and r.get("rms_velocity_m_s") is not None:
            burner_own = {c: why for c, why in (r.get("not_assessed") or {}).items() if c not in PREMIXER_CRITERIA}
            r["not_assessed"] = {**burner_own, **premixer_unassessed(study, r)}
            r["criteria_not_assessed"] = "; ".join(f"{c}: {why}" for c, why in r["not_assessed"].items())
            r["verdict"] = premixer_verdict(study, r)
