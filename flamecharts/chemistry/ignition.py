"""Ignition delays of a mixture (Cantera reactors): the autoignition screens stored with each
flame, and the premixer's delays.

A point is not a flame (status autoignition, results.point_rows) when the unburned
mixture ignites on its own within AUTOIGNITION_FACTOR flame transit times delta_T/S_L
(physics.autoignition.not_a_flame_reason, from the delay the worker stores: constant-pressure
ignition delay at T_u, p, computed with Cantera's IdealGasConstPressureReactor over a
bounded time).
"""
from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from functools import lru_cache

import cantera as ct

from ..physics.autoignition import AUTOIGNITION_FACTOR, AUTOIGNITION_MAX_TIME_S, AUTOIGNITION_MIN_T_K
from .mechanism import mixture_key, solution

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
        return ignition_delay(mechanism_path, mixture_key(X), float(T_u), float(P), t_max, float(rise))
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


#: A reactor counts as ignited when its temperature rose by at least this much [K].
MIN_IGNITION_RISE_K = 100.0
#: At most this many reactor steps per integration.
MAX_STEPS = 200000


def _reactor_net(gas: ct.Solution, constant: str) -> ct.ReactorNet:
    """An adiabatic reactor at constant ``constant`` ('pressure' or 'volume') on ``gas`` itself (its
    state follows the reactor), in moles, integrated with Cantera's sparse preconditioned solver:
    4 times faster than the dense one on the 1268-species n-hexane mechanism, equal delays on
    GRI-Mech 3.0 (measured, docs/benchmarks.md, "Mechanism reduction")."""
    cls = ct.IdealGasConstPressureMoleReactor if constant == "pressure" else ct.IdealGasMoleReactor
    try:
        reactor = cls(gas, clone=False)  # Cantera >= 3.2
    except TypeError:
        reactor = cls(gas)
    net = ct.ReactorNet([reactor])
    net.preconditioner = ct.AdaptivePreconditioner()
    return net


def peak_ignition_delay(gas: ct.Solution, X: Mapping[str, float], T0: float, P: float, t_max_s: float,
                        constant: str = "pressure", on_step: Callable[[float, float], None] | None = None) -> float:
    """Ignition delay [s] of mixture ``X`` (mole fractions) from ``T0`` [K], ``P`` [Pa]: the time of
    the largest temperature rise rate dT/dt in an adiabatic reactor at constant ``constant``
    ('pressure': a premixer's gas, a flame's autoignition; 'volume': the usual model of a
    reflected-shock experiment), integrated on ``gas`` itself for at most ``t_max_s`` [s]; inf
    when the temperature has not risen by MIN_IGNITION_RISE_K by then. ``on_step(t [s], T [K])``
    is called after every step, ``gas`` then holding the reactor's state (how the reduction
    samples states); the run ends once ignited and dT/dt fell below 1 % of its peak. ``gas``'s
    state is left at the last step.

    The maximum of dT/dt is one of the usual definitions of an ignition delay in shock-tube
    work (beside the OH* emission peak and the pressure rise; they differ by a few per cent for
    fast ignition), and needs no threshold that depends on the mixture.
    """
    gas.TPX = T0, P, dict(X)
    net = _reactor_net(gas, constant)
    t_prev, T_prev, best_rate, best_t = 0.0, T0, 0.0, math.inf
    for _ in range(MAX_STEPS):
        if net.time >= t_max_s:
            break
        net.step()
        t, T = net.time, gas.T
        if on_step is not None:
            on_step(t, T)
        rate = (T - T_prev) / (t - t_prev) if t > t_prev else 0.0
        if rate > best_rate:
            best_rate, best_t = rate, 0.5 * (t + t_prev)
        t_prev, T_prev = t, T
        if T > T0 + MIN_IGNITION_RISE_K and rate < 0.01 * best_rate:
            break
    return best_t if T_prev >= T0 + MIN_IGNITION_RISE_K else math.inf


@lru_cache(maxsize=4096)
def ignition_delay_peak(mechanism_path: str, X: tuple, T: float, P: float, t_max: float,
                        constant: str = "pressure") -> float:
    """:func:`peak_ignition_delay` of mixture X (tuple of (species, mole fraction)) at T [K], P [Pa]
    within ``t_max`` [s], on the mechanism at ``mechanism_path`` (its cached Solution, whose state
    is restored afterwards), cached by its arguments."""
    gas = solution(mechanism_path)
    state = gas.state
    try:
        return peak_ignition_delay(gas, dict(X), T, P, t_max, constant)
    finally:
        gas.state = state
