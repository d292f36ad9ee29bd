"""Range checks: inputs outside what a freely propagating 1D flame or the mechanism covers.

Warnings are derived from the inputs and the stored results each time rows are read
(like design.annotate), never stored, so a threshold or a table here can change
without solving a flame again. Each warning is one short sentence; a row's
``warnings`` column joins them with "; ".

- autoignition: the unburned mixture ignites on its own within AUTOIGNITION_FACTOR
  flame transit times delta_T/S_L (constant-pressure ignition delay at T_u, p, computed
  with Cantera's IdealGasConstPressureReactor over a bounded time). A freely
  propagating flame assumes the unburned gas stays chemically frozen while it crosses
  the flame, i.e. an ignition delay much longer than the flame transit time (common
  practice); when it is not, the computed "flame speed" measures autoignition in the
  domain, not a deflagration.
- pressure outside the range a known mechanism states it was optimised for
  (MECHANISM_RANGES, by file name; nothing for unknown mechanisms).
- equivalence ratio outside the flammability range in air of every combustible in the
  fuel (FLAMMABILITY_PHI; 1 atm, room temperature).
"""
from __future__ import annotations

import math
from functools import lru_cache
from pathlib import Path


#: Warn when the ignition delay is shorter than this many flame transit times (common
#: practice: "much longer" taken as two orders of magnitude).
AUTOIGNITION_FACTOR = 100.0
#: The ignition delay is integrated for at most this long [s]; longer delays never warn.
AUTOIGNITION_MAX_TIME_S = 1.0
#: Below this preheat the ignition check is skipped: it lies below the autoignition
#: temperature of common fuel gases (hydrogen about 800 K, methane about 810 K in air;
#: the lowest common liquid fuel vapours, e.g. n-heptane, about 490 K; from memory).
AUTOIGNITION_MIN_T_K = 450.0
#: Ignition = temperature rise of this much [K] in the reactor (or half the rise to the
#: flame's adiabatic temperature, if smaller).
IGNITION_RISE_K = 400.0

#: Pressure range [bar] a mechanism states it was optimised for, by file name.
MECHANISM_RANGES = {
    "gri30.yaml": (10 * 101325 / 760 / 1e5, 10 * 1.01325,
                   "GRI-Mech 3.0 is optimised for about 10 Torr to 10 atm (Smith et al., GRI-Mech 3.0 "
                   "web documentation, 1999)"),
}

#: Flammability limits in air at 1 atm and room temperature as equivalence ratios
#: (Coward & Jones, US Bureau of Mines Bulletin 503, 1952: methane 5-15 %, hydrogen
#: 4-75 % by volume).
FLAMMABILITY_PHI = {"CH4": (0.5, 1.67), "H2": (0.1, 7.1)}
#: Species of a fuel stream that do not burn (they only narrow the flammable range).
INERTS = {"N2", "CO2", "H2O", "AR", "Ar", "HE", "He"}
#: Oxidizers with at most this O2 mole fraction count as air or leaner than air (air: 0.21).
AIR_O2_MAX = 0.22


@lru_cache(maxsize=4)
def _reactor_gas(mechanism_path: str):
    import cantera as ct

    return ct.Solution(mechanism_path, transport_model=None)


@lru_cache(maxsize=4096)
def ignition_delay(mechanism_path: str, X: tuple, T: float, P: float, t_max: float, rise_K: float) -> float:
    """Constant-pressure ignition delay [s] of mixture X (tuple of (species, mole fraction))
    at T [K], P [Pa]: the time the temperature takes to rise by ``rise_K`` in an
    adiabatic IdealGasConstPressureReactor; inf if it does not within ``t_max``.
    """
    import cantera as ct

    gas = _reactor_gas(mechanism_path)
    gas.TPX = T, P, dict(X)
    try:
        reactor = ct.IdealGasConstPressureReactor(gas, clone=True)  # Cantera >= 3.2
    except TypeError:
        reactor = ct.IdealGasConstPressureReactor(gas)
    net = ct.ReactorNet([reactor])
    for _ in range(100000):
        if net.time >= t_max:
            break
        net.step()
        if reactor.T >= T + rise_K:
            return float(net.time)
    return math.inf


def autoignition_warning(mechanism_path: str, X: dict, T_u: float, P: float, row: dict) -> str:
    """'' or a warning when the mixture autoignites within AUTOIGNITION_FACTOR flame
    transit times delta_T/S_L of the row's flame (only for burning flames, T_u >= AUTOIGNITION_MIN_T_K)."""
    if row.get("status") != "ok" or T_u < AUTOIGNITION_MIN_T_K:
        return ""
    S_L, d_mm = row.get("laminar_flame_speed_m_s"), row.get("thermal_thickness_mm")
    if not S_L or not d_mm:
        return ""
    transit = d_mm * 1e-3 / S_L
    rise = min(IGNITION_RISE_K, 0.5 * max((row.get("adiabatic_flame_temperature_K") or T_u) - T_u, 1.0))
    t_max = min(AUTOIGNITION_FACTOR * transit, AUTOIGNITION_MAX_TIME_S)
    X_key = tuple(sorted((k, float(v)) for k, v in X.items() if v > 0))
    try:
        tau = ignition_delay(mechanism_path, X_key, float(T_u), float(P), float(f"{t_max:.6g}"), float(rise))
    except Exception:  # noqa: BLE001 - a check that cannot be made gives no warning, never a crash
        return ""
    if tau < t_max:
        return (f"autoignition: ignition delay {tau:.2g} s at {T_u:g} K is within {tau / transit:.0f} flame "
                f"transit times ({transit:.2g} s; needs >> 1): the mixture ignites before the flame arrives, "
                "a freely propagating flame does not apply")
    return ""


def pressure_warning(mechanism: str, pressure_bar: float) -> str:
    """'' or a warning when a known mechanism is used outside its stated pressure range.

    >>> pressure_warning("gri30.yaml", 20.0)[:40]
    'pressure 20 bar outside 0.0133-10.1 bar:'
    >>> pressure_warning("my_mechanism.yaml", 200.0)
    ''
    """
    known = MECHANISM_RANGES.get(Path(mechanism).name)
    if known is None:
        return ""
    lo, hi, source = known
    if lo <= pressure_bar <= hi:
        return ""
    return f"pressure {pressure_bar:g} bar outside {lo:.3g}-{hi:.3g} bar: {source}"


def flammability_warning(X_fuel: dict, X_oxidizer: dict, phi: float) -> str:
    """'' or a warning when phi lies outside the flammability range in air of every
    combustible of the fuel stream (only for fuels whose combustibles are all in
    FLAMMABILITY_PHI and for air or leaner oxidizers; inert diluents narrow the range,
    so a phi outside the pure-fuel range is outside the diluted one too).

    >>> flammability_warning({"CH4": 1.0}, {"O2": 1.0, "N2": 3.76}, 0.4)[:49]
    'equivalence ratio 0.4 outside the flammable range'
    >>> flammability_warning({"CH4": 1.0}, {"O2": 1.0, "N2": 3.76}, 0.8)
    ''
    """
    burn = [k for k, v in X_fuel.items() if v > 0 and k not in INERTS]
    total_ox = sum(X_oxidizer.values()) or 1.0
    if not burn or any(k not in FLAMMABILITY_PHI for k in burn) or X_oxidizer.get("O2", 0.0) / total_ox > AIR_O2_MAX:
        return ""
    lean = min(FLAMMABILITY_PHI[k][0] for k in burn)
    rich = max(FLAMMABILITY_PHI[k][1] for k in burn)
    if lean <= phi <= rich:
        return ""
    return (f"equivalence ratio {phi:g} outside the flammable range {lean:g}-{rich:g} in air of "
            f"{', '.join(sorted(burn))} (1 atm, room temperature; Coward & Jones 1952)")


def point_warnings(study, point, row: dict) -> str:
    """All warnings of one point, joined by '; ' ('' when it is inside every range)."""
    out = [pressure_warning(study.mechanism, point.pressure_bar),
           flammability_warning(point.X_fuel, point.X_oxidizer, point.phi),
           autoignition_warning(study.mechanism_path, point.X_unburned, point.T_u, point.P, row)]
    return "; ".join(w for w in out if w)


def warned_rows(rows: list[dict]) -> list[dict]:
    """Rows with at least one warning."""
    return [r for r in rows if r.get("warnings")]

