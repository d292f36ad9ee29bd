"""Strained premixed flames: the twin counterflow flame along a ladder of strain rates, to extinction.

twin_flame_ladder   consumption speed against strain from low strain up to extinction (one task)
strain_rate         the largest axial velocity gradient ahead of the flame [1/s]
consumption_speed   integral of the heat release over the fresh mixture's heat of combustion [m/s]
heat_of_combustion  J/kg of fresh mixture: burned to its HP equilibrium, cooled back to T_u

Two identical premixed flames face each other across a symmetry plane (Cantera's
CounterflowTwinPremixedFlame: fresh mixture from one nozzle, the plane half a nozzle
separation away). Raising the nozzle velocity strains the flames until they go out. The
ladder is one continuation: each step starts from the last converged flame; the step in
nozzle velocity is cut when a step loses the burning branch, until it is below
EXTINCTION_RESOLUTION, so the extinction strain rate is bracketed to that resolution. A first
step that finds no burning flame (within FIRST_SOLVE_MAX_TIME_STEPS time steps) starts the ladder
again from a FIRST_STRAIN_RETRY_FACTOR times stronger strain, at most FIRST_STRAIN_RETRIES times:
lean hydrogen at elevated pressure converges from Cantera's initial guess only well above the
weakest strain (docs/benchmarks.md).
"""
from __future__ import annotations

import math
import time
from dataclasses import dataclass
from typing import Any

import cantera as ct
import numpy as np
import numpy.typing as npt

from ..numerics import (  # the ladder's settings (part of its store key, analyses.strain_ladders.solve)
    BURNING_SHARE,
    EXTINCTION_RESOLUTION,
    FIRST_SOLVE_MAX_TIME_STEPS,
    FIRST_STRAIN_RETRIES,
    FIRST_STRAIN_RETRY_FACTOR,
    FIRST_VELOCITY_FACTOR,
    HALF_SEPARATION_BOUNDS_M,
    HALF_SEPARATION_THICKNESSES,
    LADDER_FACTOR,
    MAX_SOLVES,
    REFINE,
)


def heat_of_combustion(gas: ct.Solution, T_u: float, P: float, X: dict[str, float]) -> float:
    """Heat released per kg of fresh mixture [J/kg]: h of the fresh mixture minus h of its HP
    equilibrium products brought back to T_u at frozen composition."""
    gas.TPX = T_u, P, X
    h_u = gas.enthalpy_mass
    gas.equilibrate("HP")
    Y_b = gas.Y
    gas.TPY = T_u, P, Y_b
    return float(h_u - gas.enthalpy_mass)


def strain_rate(z: npt.ArrayLike, u: npt.ArrayLike, T: npt.ArrayLike) -> float:
    """Largest axial velocity gradient |du/dz| ahead of the flame [1/s]: between the nozzle
    and the axial-velocity minimum that the flame's dilatation makes just ahead of its
    preheat zone (Law's "reference strain rate"; the flow behind the flame, decelerating to
    the symmetry plane, is not counted).

    >>> z = np.linspace(0, 1, 11); u = 1 - 0.5 * z; u[6:] = 0.7 + z[6:]; T = np.where(z > 0.55, 2000, 300)
    >>> round(strain_rate(z, u, T), 3)
    0.5
    """
    z, u, T = np.asarray(z), np.asarray(u), np.asarray(T)
    rise = T.min() + 0.05 * (T.max() - T.min())
    front = int(np.argmax(T > rise)) or len(T) - 1   # first point of the temperature rise
    i_min = int(np.argmin(u[:front + 1]))
    grad = np.abs(np.diff(u[:i_min + 1]) / np.diff(z[:i_min + 1]))
    return float(grad.max()) if grad.size else float("nan")


def consumption_speed(z: np.ndarray, heat_release_W_m3: np.ndarray, rho_u: float, q_J_kg: float) -> float:
    """Consumption speed [m/s]: int q_dot dz / (rho_u q), heat released by one of the twin
    flames over the heat the fresh mixture carries. Equals S_L for an unstrained flame."""
    return float(np.trapezoid(heat_release_W_m3, z) / (rho_u * q_J_kg))


class _TooManySteps(Exception):
    """A first-step solve took more than FIRST_SOLVE_MAX_TIME_STEPS time steps."""


@dataclass
class _StepBudget:
    """Time steps of the twin-flame solve under way, and the most it may take (None: no limit)."""

    limit: int | None
    steps: int = 0

    def count(self, dt: float) -> int:
        """Cantera's time-step callback: count the step, raise _TooManySteps past the limit."""
        self.steps += 1
        if self.limit is not None and self.steps > self.limit:
            raise _TooManySteps
        return 0


def _twin_flame(gas: ct.Solution, width: float, refine: dict, budget: _StepBudget) -> ct.CounterflowTwinPremixedFlame:
    """A fresh twin flame on [0, width] whose time stepping counts against ``budget``."""
    flame = ct.CounterflowTwinPremixedFlame(gas, width=width)
    flame.set_refine_criteria(**refine)
    flame.set_time_step_callback(budget.count)
    return flame


def _burns(flame: ct.CounterflowTwinPremixedFlame, fresh: bool, budget: _StepBudget, T_burning: float) -> bool:
    """Solve ``flame`` (from Cantera's initial guess when ``fresh``, else from its state); whether
    its peak temperature passes ``T_burning`` [K] (False when the solve fails)."""
    budget.steps = 0
    try:
        flame.solve(loglevel=0, auto=fresh)
    except (ct.CanteraError, _TooManySteps):
        return False
    return bool(flame.T.max() > T_burning)


def _record(out: dict[str, Any], flame: ct.CounterflowTwinPremixedFlame, rho_u: float, q: float) -> None:
    """Append a burning step's strain rate, consumption speed and peak temperature to ``out``."""
    out["strain_rates_1_s"].append(strain_rate(flame.grid, flame.velocity, flame.T))
    out["consumption_speeds_m_s"].append(consumption_speed(flame.grid, flame.heat_release_rate, rho_u, q))
    out["peak_temperatures_K"].append(float(flame.T.max()))


def _empty_ladder(width: float, alpha_u: float, first_velocity_factor: float) -> dict[str, Any]:
    """The result of a ladder before its first solve (see twin_flame_ladder's Returns)."""
    return {"strain_rates_1_s": [], "consumption_speeds_m_s": [], "peak_temperatures_K": [],
            "extinction_strain_rate_1_s": None, "extinguished_above_1_s": None, "solves": 0, "message": "",
            "half_separation_m": width, "unburned_thermal_diffusivity_m2_s": alpha_u,
            "first_velocity_factor": first_velocity_factor, "first_strain_retries": 0}


def _note(out: dict[str, Any], text: str) -> None:
    """Add ``text`` to the ladder's message ('; ' between notes)."""
    out["message"] = "; ".join(m for m in (out["message"], text) if m)


def twin_flame_ladder(gas: ct.Solution, T_u: float, P: float, X: dict[str, float], S_L: float, T_ad: float,
                      time_limit_s: float | None = None, refine: dict | None = None,
                      first_velocity_factor: float = FIRST_VELOCITY_FACTOR, ladder_factor: float = LADDER_FACTOR,
                      resolution: float = EXTINCTION_RESOLUTION) -> dict:
    """Consumption speed against strain rate of the twin premixed flame, to extinction.

    Parameters
    ----------
    gas : cantera.Solution of the mechanism with the study's transport (state overwritten)
    T_u, P, X : fresh mixture [K], [Pa], mole fractions
    S_L, T_ad : the unstretched flame's speed [m/s] and adiabatic temperature [K] (first
        velocity and the burning test)
    time_limit_s : stop refining after this much CPU time of the calling thread [s] (the bracket
        found so far is kept); CPU time, like the free flame's limit, so that a loaded machine
        does not cut a healthy ladder short
    refine, first_velocity_factor, ladder_factor, resolution : the ladder's grid criteria
        (default REFINE), first nozzle velocity over S_L, step factor and extinction bracket
        ratio; the defaults are what a [stretch] request runs. A screening search (coarser grid,
        a start nearer extinction, a 20 % bracket) costs a third: tests/benchmarks/stretch_validation.py.

    Returns
    -------
    dict: strain_rates_1_s, consumption_speeds_m_s, peak_temperatures_K (burning steps, in
    order), extinction_strain_rate_1_s (the last burning step's strain; None when the flame
    never went out), extinguished_above_1_s (strain of the nozzle velocity that lost it),
    solves, message, half_separation_m, unburned_thermal_diffusivity_m2_s, first_velocity_factor
    (over S_L, of the first burning step's start) and first_strain_retries.
    """
    t0 = time.thread_time()
    gas.TPX = T_u, P, X
    rho_u = gas.density
    alpha_u = gas.thermal_conductivity / (rho_u * gas.cp_mass)
    q = heat_of_combustion(gas, T_u, P, X)
    gas.TPX = T_u, P, X
    lo, hi = HALF_SEPARATION_BOUNDS_M
    width = min(max(HALF_SEPARATION_THICKNESSES * alpha_u / S_L, lo), hi)
    refine = REFINE if refine is None else refine
    budget = _StepBudget(FIRST_SOLVE_MAX_TIME_STEPS)
    flame = _twin_flame(gas, width, refine, budget)
    U = first_velocity_factor * S_L
    factor = ladder_factor
    out = _empty_ladder(width, alpha_u, first_velocity_factor)
    saved = None
    while out["solves"] < MAX_SOLVES:
        if time_limit_s is not None and time.thread_time() - t0 > time_limit_s:
            _note(out, "time limit: bracket so far")
            break
        flame.reactants.mdot = rho_u * U
        out["solves"] += 1
        if _burns(flame, saved is None, budget, T_u + BURNING_SHARE * (T_ad - T_u)):
            if saved is None and out["first_strain_retries"]:
                _note(out, f"started at {U / S_L:.3g} S_L: no burning flame at "
                           f"{U / S_L / FIRST_STRAIN_RETRY_FACTOR:.3g} S_L and below")
            budget.limit = None   # the continuation's steps start from a converged flame
            saved = flame.to_array()
            _record(out, flame, rho_u, q)
            U *= factor
            continue
        if saved is None:
            if out["first_strain_retries"] < FIRST_STRAIN_RETRIES:   # again, fresh, from a stronger strain
                out["first_strain_retries"] += 1
                U *= FIRST_STRAIN_RETRY_FACTOR
                out["first_velocity_factor"] = U / S_L
                gas.TPX = T_u, P, X   # the failed solve left its own state in gas
                flame = _twin_flame(gas, width, refine, budget)
                continue
            _note(out, f"no burning twin flame at the first strain rate (nozzle velocity "
                       f"{first_velocity_factor:.3g} to {U / S_L:.3g} S_L)")
            break
        out["extinguished_above_1_s"] = out["strain_rates_1_s"][-1] * factor
        if factor < resolution:
            out["extinction_strain_rate_1_s"] = out["strain_rates_1_s"][-1]
            break
        U /= factor
        factor = math.sqrt(factor)
        U *= factor
        flame.from_array(saved)
    else:
        _note(out, f"still burning after {MAX_SOLVES} solves")
    return out


def markstein_number_from_strain(strain_rates_1_s: npt.ArrayLike, consumption_speeds_m_s: npt.ArrayLike, S_L: float,
                                 alpha_u: float,
                                 max_karlovitz: float = 0.05) -> float | None:
    """Markstein number of the consumption speed against strain, from the low-strain slope [-].

    S_c = S_L - L K with L fitted through the unstretched S_L (K = 0) and the ladder points
    with Karlovitz number K alpha_u / S_L^2 below ``max_karlovitz`` (linear-response regime);
    Ma = L / delta with delta = alpha_u / S_L. None with fewer than two such points.
    Consumption-speed Markstein numbers differ in value from displacement-speed and
    spherical-flame ones (the reference surface differs); compare signs and trends. Lean
    hydrogen flames are not linear down to the weakest step solved (hydrogen-air at phi 0.5
    burns 15 % above S_L at Karlovitz 0.013, on grids from 258 to 621 points alike): the fit
    is then a secant from the unstretched flame, and near Le_eff of 0.7-0.8, where the
    response turns over, its sign is not reliable.
    """
    K = np.asarray(strain_rates_1_s, dtype=float)
    S = np.asarray(consumption_speeds_m_s, dtype=float)
    low = K * alpha_u / S_L ** 2 < max_karlovitz
    if low.sum() < 2:
        return None
    Kf, Sf = np.concatenate([[0.0], K[low]]), np.concatenate([[S_L], S[low]])
    slope = np.polyfit(Kf, Sf, 1)[0]
    return float(-slope * S_L / alpha_u)
