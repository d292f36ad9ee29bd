"""Autoignition of the unburned mixture ahead of a flame (Cantera reactor).

A point is not a flame (status autoignition, results.point_rows) when the unburned
mixture ignites on its own within AUTOIGNITION_FACTOR flame transit times delta_T/S_L (constant-pressure ignition delay
at T_u, p, computed with Cantera's IdealGasConstPressureReactor over a bounded time).
A freely propagating flame assumes the unburned gas stays chemically frozen while it
crosses the flame, i.e. an ignition delay much longer than the flame transit time
(common practice); when it is not, the computed "flame speed" measures autoignition
in the domain, not a deflagration.
"""
from __future__ import annotations

import math
from collections.abc import Callable
from functools import lru_cache

import cantera as ct

from .mechanism import solution

#: Not a flame when the ignition delay is shorter than this many flame transit times
#: (common practice: "much longer" taken as two orders of magnitude).
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


@lru_cache(maxsize=4096)
def ignition_delay(mechanism_path: str, X: tuple, T: float, P: float, t_max: float, rise_K: float) -> float:
    """Constant-pressure ignition delay [s] of mixture X (tuple of (species, mole fraction))
    at T [K], P [Pa]: the time the temperature takes to rise by ``rise_K`` in an
    adiabatic IdealGasConstPressureReactor; inf if it does not within ``t_max``.
    """
    gas = solution(mechanism_path)
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


def autoignition_screen(mechanism_path: str, X: dict, T_u: float, P: float, S_L: float | None,
                        thickness_m: float | None, T_ad: float | None) -> float | None:
    """Ignition delay [s] of the unburned mixture over the window the warning looks at:
    min(AUTOIGNITION_FACTOR flame transit times delta_T/S_L, AUTOIGNITION_MAX_TIME_S),
    inf beyond it; None where the check does not apply (no flame, T_u below
    AUTOIGNITION_MIN_T_K) or cannot be made. Workers store it with each flame (metric
    ``autoignition_screen_delay_s``), so a read-out of 100,000 points integrates no reactor."""
    if T_u < AUTOIGNITION_MIN_T_K or not S_L or not thickness_m:
        return None
    t_max = min(AUTOIGNITION_FACTOR * thickness_m / S_L, AUTOIGNITION_MAX_TIME_S)
    return _screen_delay(mechanism_path, X, T_u, P, float(f"{t_max:.6g}"), lambda: T_ad or T_u)


def _screen_delay(mechanism_path: str, X: dict, T_u: float, P: float, t_max: float,
                  flame_temperature: Callable[[], float]) -> float | None:
    """Ignition delay [s] of mixture X at T_u, P within ``t_max``, ignition being a rise of
    min(IGNITION_RISE_K, half the rise to ``flame_temperature()`` [K]); None when the check
    cannot be made (both screens above)."""
    try:
        rise = min(IGNITION_RISE_K, 0.5 * max(flame_temperature() - T_u, 1.0))
        X_key = tuple(sorted((k, float(v)) for k, v in X.items() if v > 0))
        return ignition_delay(mechanism_path, X_key, float(T_u), float(P), t_max, float(rise))
    except Exception:  # noqa: BLE001 - a check that cannot be made gives no warning, never a crash
        return None


def autoignition_screen_without_flame(mechanism_path: str, X: dict, T_u: float, P: float) -> float | None:
    """Ignition delay [s] of the unburned mixture of a point whose flame gave no answer (failed:
    time limit, not converged; or no flame), over AUTOIGNITION_MAX_TIME_S: without a flame
    there is no transit time to compare with, and a mixture that ignites on its own is a
    safety finding whatever the flame solve did. The rise that counts as ignition is
    min(IGNITION_RISE_K, half the rise to HP equilibrium). inf beyond the window; None below
    AUTOIGNITION_MIN_T_K or when it cannot be made. Workers store it with such points (metric
    ``autoignition_screen_delay_s``)."""
    if T_u < AUTOIGNITION_MIN_T_K:
        return None

    def equilibrium_temperature() -> float:
        gas = solution(mechanism_path)
        gas.TPX = T_u, P, dict(X)
        gas.equilibrate("HP")
        return float(gas.T)
    return _screen_delay(mechanism_path, X, T_u, P, AUTOIGNITION_MAX_TIME_S, equilibrium_temperature)


def autoignition_reason(mechanism_path: str, X: dict, T_u: float, P: float, row: dict) -> str:
    """'' or why the mixture is not a flame: it autoignites within AUTOIGNITION_FACTOR flame
    transit times delta_T/S_L of the row's flame (only for burning flames, T_u >= AUTOIGNITION_MIN_T_K);
    results.point_rows then gives the point status autoignition and no flame quantities.
    Uses the delay the worker stored with the flame (row key ``autoignition_screen_delay_s``)
    when there is one, else computes it (stores written before it was stored)."""
    if row.get("status") != "ok":
        return ""
    S_L, d_mm = row.get("laminar_flame_speed_m_s"), row.get("thermal_thickness_mm")
    if "autoignition_screen_delay_s" in row:
        tau = row["autoignition_screen_delay_s"]
    else:
        tau = autoignition_screen(mechanism_path, X, T_u, P, S_L, d_mm * 1e-3 if d_mm else None,
                                  row.get("adiabatic_flame_temperature_K"))
    if tau is None or not S_L or not d_mm:
        return ""
    transit = d_mm * 1e-3 / S_L
    if tau < min(AUTOIGNITION_FACTOR * transit, AUTOIGNITION_MAX_TIME_S):
        return (f"autoignition: ignites in {tau * 1e3:.2g} ms at {T_u:g} K, within {tau / transit:.0f} flame transit "
                f"times (limit {AUTOIGNITION_FACTOR:g}): the mixture ignites before a flame can cross it, so it has "
                "no flame speed or thickness")
    return ""


#: A reactor counts as ignited when its temperature rose by at least this much [K].
MIN_IGNITION_RISE_K = 100.0


#: A premixer's ignition delay is integrated for at least this long [s], and at least
#: this many times the residence time the margin requires: a mixture that has not ignited
#: by then is reported as not igniting (delay inf).
PREMIXER_HORIZON_S = 1.0
PREMIXER_HORIZON_FACTOR = 100.0


def premixer_horizon(residence_time_s: float, min_margin: float) -> float:
    """How long a premixer's ignition delay is integrated [s]: max(PREMIXER_HORIZON_S,
    PREMIXER_HORIZON_FACTOR x required margin x residence time).

    >>> premixer_horizon(0.002, 3.0), premixer_horizon(0.01, 3.0)
    (1.0, 3.0)
    """
    return max(PREMIXER_HORIZON_S, PREMIXER_HORIZON_FACTOR * min_margin * residence_time_s)


@lru_cache(maxsize=4096)
def ignition_delay_peak(mechanism_path: str, X: tuple, T: float, P: float, t_max: float,
                        constant: str = "pressure") -> float:
    """Ignition delay [s] of mixture X (tuple of (species, mole fraction)) at T [K], P [Pa]:
    the time of the largest temperature rise rate dT/dt in an adiabatic reactor at constant
    ``constant`` ('pressure': IdealGasConstPressureReactor, a premixer's gas; 'volume':
    IdealGasReactor, the usual model of a reflected-shock experiment). inf when the
    temperature has not risen by MIN_IGNITION_RISE_K within ``t_max``.

    The maximum of dT/dt is one of the usual definitions of an ignition delay in
    shock-tube work (beside the OH* emission peak and the pressure rise; they differ by a
    few per cent for fast ignition), and needs no threshold that depends on the mixture.
    """
    gas = solution(mechanism_path)
    gas.TPX = T, P, dict(X)
    cls = ct.IdealGasConstPressureReactor if constant == "pressure" else ct.IdealGasReactor
    try:
        reactor = cls(gas, clone=True)  # Cantera >= 3.2
    except TypeError:
        reactor = cls(gas)
    net = ct.ReactorNet([reactor])
    t_prev, T_prev = 0.0, T
    best_rate, best_t = 0.0, math.inf
    for _ in range(200000):
        if net.time >= t_max:
            break
        net.step()
        t, Tn = net.time, reactor.T
        if t > t_prev:
            rate = (Tn - T_prev) / (t - t_prev)
            if rate > best_rate:
                best_rate, best_t = rate, 0.5 * (t + t_prev)
        t_prev, T_prev = t, Tn
        if Tn > T + MIN_IGNITION_RISE_K and best_rate > 0 and (Tn - T_prev) <= 0 and rate < 0.01 * best_rate:
            break
    return best_t if T_prev >= T + MIN_IGNITION_RISE_K else math.inf
