"""The burned gas of a stored flame after a residence time: NO, NO2, N2O, CO, fuel, O2, H2O.

burned_gas_history       composition and temperature at given residence times after a stated
                         position of the flame (default: the peak heat release rate)
has_nitrogen_chemistry   whether a mechanism forms NO from N2
phi_at_flame_temperature the equivalence ratio at which a fuel burns at a given adiabatic
                         flame temperature (blends compared at equal T_ad)
heat_release_rate_W_m3   heat release rate at each point of a stored profile

Time is the time of flight of the gas, t(z) = integral of dz/u from the start position
(physics.emissions.residence_time_s). A free flame's own domain already holds several to
tens of milliseconds of burned gas after the flame (lean methane-air at 1 atm: about 22 ms,
docs/benchmarks.md), so times inside it are read from the flame's own profile (linear in t
between grid points). Only times beyond continue in an adiabatic constant-pressure plug flow
on the same mechanism: Cantera's IdealGasConstPressureReactor started from the state at the
domain end. There diffusion has no gradients left to act on, so the reactor carries on what
the profile did: one started 2-5 ms after the peak heat release reaches the profile's NO at
the domain end within 0.1-1.1 % (measured on methane-air; tests/test_emissions_core.py allows 2 %).

The domain end is the last grid point but one. Cantera's outlet holds the last point's
temperature and composition equal to the point before it (zero gradient; measured: temperature
equal to the last digit, mass fractions within 4e-9), so the last cell, often the longest
(10 ms of a coarse lean methane flame), carries no chemistry: read as part of the flame, its
NO would stay frozen while a reactor's rises by several per cent.

A laminar flame followed by a plug flow is a screening estimate: real combustors have
unmixedness, recirculation and heat loss, which dominate their NOx.

Everything returned is a mole fraction of the wet gas as burned; physics.emissions takes it
to dry, reference-O2, mg/m3 and mg/kWh values.
"""
from __future__ import annotations

import time
from collections.abc import Callable, Sequence

import cantera as ct
import numpy as np
import numpy.typing as npt

from ..physics.emissions import residence_time_s

#: Species reported at every time (those the mechanism has), besides the fuel species.
REPORTED_SPECIES = ("NO", "NO2", "N2O", "CO", "O2", "H2O", "CO2")
#: Not fuel, even when present in the fresh mixture (oxidizer, inerts, diluents).
NOT_FUEL = frozenset({"O2", "N2", "AR", "Ar", "HE", "He", "H2O", "CO2"})
#: A fresh-mixture species counts as fuel above this mole fraction [-].
MIN_FUEL_MOLE_FRACTION = 1e-6
#: The flame zone ends where the temperature has risen by this share of its rise from the
#: inlet to the domain end (our convention, common practice without source: past it the
#: heat release is over and what remains is CO burnout and radical recombination, whose NO is
#: post-flame NO; 95 % keeps the slow final rise of lean flames out of the flame zone). A share
#: of each flame's own rise rather than a fixed time after the peak: flame times change by
#: orders of magnitude with pressure and fuel, so a fixed time would cut different flames at
#: different stages. Measured on methane-air at 1 atm: 0.7 ms after the peak at phi 0.7, 1.05 ms
#: at phi 1.0 (docs/benchmarks.md).
FLAME_ZONE_RISE_SHARE = 0.95
#: The plug flow takes at most this many internal steps to reach each requested time
#: (Cantera's ReactorNet.max_steps); a stiff state that needs more raises EmissionsIntegrationError.
MAX_REACTOR_STEPS = 20000
#: CPU time of the calling thread [s] the plug flow may use in all (checked between requested times).
REACTOR_TIME_LIMIT_S = 60.0
PEAK_HEAT_RELEASE = "peak heat release"


class EmissionsIntegrationError(RuntimeError):
    """The post-flame plug flow or the equilibrium state could not be computed within its bounds."""


def has_nitrogen_chemistry(gas: ct.Solution) -> bool:
    """True when the mechanism has NO and a chain of reactions that makes it from N2.

    Reactions are read as edges from every nitrogen-bearing reactant to every
    nitrogen-bearing product (both ways for reversible ones); N2 as a collision partner
    only (third body, or on both sides) builds no edge. So h2o2.yaml (N2 inert) is False,
    gri30.yaml (Zeldovich, N2O, NNH and prompt routes) True.

    Parameters
    ----------
    gas : the mechanism (its state is not touched)
    """
    names = set(gas.species_names)
    if "NO" not in names or "N2" not in names:
        return False
    nitrogen = {s.name for s in gas.species() if s.composition.get("N", 0) > 0}
    edges: dict[str, set[str]] = {}
    for r in gas.reactions():
        sides = [(r.reactants, r.products)] + ([(r.products, r.reactants)] if r.reversible else [])
        for src, dst in sides:
            for a in nitrogen.intersection(src):
                edges.setdefault(a, set()).update(b for b in nitrogen.intersection(dst) if b != a)
    seen, todo = {"N2"}, ["N2"]
    while todo:
        for b in edges.get(todo.pop(), ()):
            if b not in seen:
                seen.add(b)
                todo.append(b)
    return "NO" in seen


def _profile_Y(profile: dict, gas: ct.Solution) -> np.ndarray:
    """The profile's mass fractions in the gas's species order, shape (n_points, n_species)."""
    Y_src = np.asarray(profile["Y"], dtype=float)
    index = {name: k for k, name in enumerate(profile["species"])}
    unknown = set(index) - set(gas.species_names)
    if unknown:
        raise ValueError(f"the profile has species the mechanism lacks ({', '.join(sorted(unknown)[:5])}): "
                         "it was solved with another mechanism")
    Y = np.zeros((Y_src.shape[1], gas.n_species))
    for k, name in enumerate(gas.species_names):
        if name in index:
            Y[:, k] = Y_src[index[name]]
    return np.clip(Y, 0.0, None)


def heat_release_rate_W_m3(profile: dict, gas: ct.Solution) -> np.ndarray:
    """Heat release rate [W/m3] at each grid point of a stored profile, -sum_k h_k w_k of the
    point's own state (T, P, Y) on the mechanism ``gas`` (Cantera's ``heat_release_rate``),
    point by point. The gas's state is overwritten.

    Parameters
    ----------
    profile : the stored flame (chemistry.flame.profile_of or store.profiles.decode)
    gas : the mechanism the flame was solved with
    """
    T, P, Y = np.asarray(profile["T"], dtype=float), float(profile["P"]), _profile_Y(profile, gas)
    out = np.empty(len(T))
    for k in range(len(T)):
        gas.TPY = T[k], P, Y[k]
        out[k] = gas.heat_release_rate
    return out


def _mole_fractions(Y: np.ndarray, gas: ct.Solution) -> tuple[np.ndarray, np.ndarray]:
    """Mole fractions (rows of states) and mean molar masses [kg/kmol] of mass fractions Y (n_states, n_species)."""
    moles = Y / gas.molecular_weights
    mean_M = 1.0 / moles.sum(axis=1)
    return moles * mean_M[:, None], mean_M


def _fuel_species(gas: ct.Solution, Y_inlet: np.ndarray) -> list[str]:
    """Species of the fresh mixture (the profile's first point) that are not oxidizer or inert."""
    moles = Y_inlet / gas.molecular_weights
    X = moles / moles.sum()
    return [name for k, name in enumerate(gas.species_names) if X[k] > MIN_FUEL_MOLE_FRACTION and name not in NOT_FUEL]


def _reactor_states(gas: ct.Solution, T: float, P: float, Y: np.ndarray, times_s: Sequence[float],
                    max_steps: int, time_limit_s: float) -> list[tuple[float, np.ndarray]]:
    """(T [K], mass fractions) of an adiabatic constant-pressure reactor started at (T, P, Y)
    at each of ``times_s`` [s] (increasing). Bounded: at most ``max_steps`` internal steps to
    each time, and ``time_limit_s`` of this thread's CPU time in all."""
    gas.TPY = T, P, Y
    try:
        reactor = ct.IdealGasConstPressureReactor(gas, clone=True)  # Cantera >= 3.2
    except TypeError:
        reactor = ct.IdealGasConstPressureReactor(gas)
    state = reactor.phase if hasattr(reactor, "phase") else reactor.thermo  # 'thermo' before Cantera 3.2
    net = ct.ReactorNet([reactor])
    net.max_steps = max_steps
    deadline = time.thread_time() + time_limit_s
    out = []
    for t in times_s:
        if time.thread_time() > deadline:
            raise EmissionsIntegrationError(f"post-flame plug flow stopped at {net.time * 1e3:.3g} ms of "
                                            f"{times_s[-1] * 1e3:.3g} ms: over its {time_limit_s:g} s CPU limit")
        try:
            if t > 0.0:
                net.advance(t)
        except ct.CanteraError as exc:
            raise EmissionsIntegrationError(f"post-flame plug flow failed before {t * 1e3:.3g} ms (more than {max_steps} "
                                            f"steps, or {type(exc).__name__})") from None
        out.append((float(state.T), np.array(state.Y)))
    return out


def _start_position(grid: np.ndarray, hrr: np.ndarray, start: str | float) -> float:
    if isinstance(start, str):
        if start != PEAK_HEAT_RELEASE:
            raise ValueError(f"start {start!r}: allowed {PEAK_HEAT_RELEASE!r} or a position in m")
        return float(grid[int(np.argmax(hrr))])
    if not grid[0] <= start <= grid[-1]:
        raise ValueError(f"start position {start:g} m is outside the domain [{grid[0]:g}, {grid[-1]:g}] m")
    return float(start)


def _flame_zone(tau: np.ndarray, tau0: float, grid: np.ndarray, T: np.ndarray, X_NO: np.ndarray) -> dict:
    """Time, position, T and NO where T first reaches FLAME_ZONE_RISE_SHARE of its rise (inlet to domain
    end), not before the start."""
    rise = T[0] + FLAME_ZONE_RISE_SHARE * (T[-1] - T[0])
    after = tau >= tau0
    k = int(np.argmax(after & (T >= rise)))
    return {"flame_zone_time_s": float(tau[k] - tau0), "flame_zone_position_m": float(grid[k]),
            "flame_zone_T_K": float(T[k]), "flame_zone_NO_mole_fraction": float(X_NO[k])}


def _equilibrium(gas: ct.Solution, T: float, P: float, Y: np.ndarray) -> dict:
    """HP equilibrium of the state at the domain end: same enthalpy, pressure and elements."""
    gas.TPY = T, P, Y
    try:
        gas.equilibrate("HP")
    except ct.CanteraError:
        raise EmissionsIntegrationError("HP equilibrium of the burned gas failed") from None
    return {"equilibrium_T_K": float(gas.T), "equilibrium_NO_mole_fraction": float(gas["NO"].X[0]),
            "equilibrium_mole_fractions": {s: float(gas[s].X[0]) for s in ("NO", "NO2", "CO", "O2", "H2O")
                                           if s in gas.species_names}}


def burned_gas_history(profile: dict, gas: ct.Solution, times_s: npt.ArrayLike, start: str | float = PEAK_HEAT_RELEASE,
                       fuel_species: Sequence[str] | None = None, max_steps: int = MAX_REACTOR_STEPS,
                       time_limit_s: float = REACTOR_TIME_LIMIT_S) -> dict:
    """Composition and temperature of a flame's burned gas at residence times after ``start``.

    Parameters
    ----------
    profile : a converged free flame as stored: dict with grid [m], T [K], velocity [m/s],
        Y [n_species x n_points], species, P [Pa] (chemistry.flame.profile_of, store.profiles.decode)
    gas : the mechanism it was solved with; must form NO from N2 (:func:`has_nitrogen_chemistry`).
        Its state is overwritten.
    times_s : residence times [s] after the start position, >= 0, any order
    start : 'peak heat release' (the grid point of the largest heat release rate,
        :func:`heat_release_rate_W_m3`) or a position on the grid [m], before the domain end
    fuel_species : the fuel's species; default: those of the fresh mixture (first grid point)
        that are not O2, N2, noble gases, H2O or CO2
    max_steps, time_limit_s : bounds of the plug flow (MAX_REACTOR_STEPS, REACTOR_TIME_LIMIT_S);
        beyond them EmissionsIntegrationError

    Returns
    -------
    dict of plain data: ``times_s``, ``T_K`` and ``mean_molar_mass_kg_kmol`` (arrays in the
    order given), ``mole_fractions`` (species -> array; REPORTED_SPECIES the mechanism has and
    the fuel species; wet), ``from_reactor`` (bool array: beyond the domain), ``fuel_species``,
    ``start_position_m``, ``domain_time_s`` (time from the start to the domain end, the last
    grid point but one; module docstring), the flame
    zone (``flame_zone_time_s``, ``_position_m``, ``_T_K``, ``_NO_mole_fraction``: where T
    first reaches FLAME_ZONE_RISE_SHARE of its rise, at or after the start) and the HP
    equilibrium of the domain-end state (``equilibrium_T_K``, ``equilibrium_NO_mole_fraction``;
    the state an adiabatic constant-pressure plug flow tends to, so the reactor's NO approaches it;
    ``equilibrium_mole_fractions`` of NO, NO2, CO, O2 and H2O there: an adiabatic plug flow keeps
    its gas at flame temperature, so its CO tends to this hot-gas equilibrium, not to a stack value).
    """
    if not has_nitrogen_chemistry(gas):
        raise ValueError("the mechanism has no nitrogen chemistry (no NO formed from N2); use one that has, e.g. gri30.yaml")
    times = np.asarray(times_s, dtype=float).ravel()
    if times.size == 0 or not np.all(np.isfinite(times)) or np.any(times < 0):
        raise ValueError("residence times must be finite and >= 0 s")
    if len(profile["grid"]) < 3:
        raise ValueError("a flame profile needs at least three grid points")
    hrr = heat_release_rate_W_m3(profile, gas)[:-1]  # the last point is the outlet's copy (module docstring)
    grid, T = np.asarray(profile["grid"], dtype=float)[:-1], np.asarray(profile["T"], dtype=float)[:-1]
    P, Y = float(profile["P"]), _profile_Y(profile, gas)[:-1]
    tau = residence_time_s(grid, np.asarray(profile["velocity"], dtype=float)[:-1])
    z0 = _start_position(grid, hrr, start)
    tau0 = float(np.interp(z0, grid, tau))
    domain_time = float(tau[-1] - tau0)
    fuels = list(fuel_species) if fuel_species is not None else _fuel_species(gas, Y[0])
    states_T = np.empty(times.size)
    states_Y = np.empty((times.size, gas.n_species))
    inside = times <= domain_time
    states_T[inside] = np.interp(tau0 + times[inside], tau, T)
    for k in range(gas.n_species):
        states_Y[inside, k] = np.interp(tau0 + times[inside], tau, Y[:, k])
    beyond = np.flatnonzero(~inside)
    order = beyond[np.argsort(times[beyond])]
    if order.size:
        later = _reactor_states(gas, T[-1], P, Y[-1], list(times[order] - domain_time), max_steps, time_limit_s)
        for i, (T_i, Y_i) in zip(order, later):
            states_T[i], states_Y[i] = T_i, Y_i
    X, mean_M = _mole_fractions(states_Y, gas)
    reported = [s for s in REPORTED_SPECIES if s in gas.species_names] + [s for s in fuels if s not in REPORTED_SPECIES]
    X_NO_profile = _mole_fractions(Y, gas)[0][:, gas.species_index("NO")]
    return {"times_s": times, "T_K": states_T, "mean_molar_mass_kg_kmol": mean_M,
            "mole_fractions": {s: X[:, gas.species_index(s)] for s in reported}, "from_reactor": ~inside,
            "fuel_species": fuels, "start_position_m": z0, "domain_time_s": domain_time,
            **_flame_zone(tau, tau0, grid, T, X_NO_profile), **_equilibrium(gas, T[-1], P, Y[-1])}


#: Equivalence ratios the equal-flame-temperature search brackets within: a lean branch up to the
#: hottest phi (found on PEAK_SCAN first) and a rich branch beyond it.
PHI_RANGE = (0.05, 5.0)
PEAK_SCAN = (0.9, 0.95, 1.0, 1.05, 1.1, 1.15)


def equilibrium_temperature_K(gas: ct.Solution, X: dict[str, float], T_u: float, P: float) -> float:
    """Adiabatic flame temperature [K]: the HP equilibrium of the fresh mixture X at T_u [K], P [Pa]."""
    gas.TPX = T_u, P, X
    gas.equilibrate("HP")
    return float(gas.T)


def phi_at_flame_temperature(gas: ct.Solution, mixture_at: Callable[[float], dict[str, float]], T_u: float, P: float,
                             target_K: float, lean: bool) -> float | None:
    """The equivalence ratio at which a fuel's adiabatic flame temperature (HP equilibrium,
    :func:`equilibrium_temperature_K`) equals ``target_K``, on the lean branch (up to the hottest
    phi) or the rich one; None where the fuel never reaches it on that branch within PHI_RANGE.
    Brent's method (scipy.optimize.brentq) to 1e-6 in phi: T_ad is monotone on each branch.

    ``mixture_at(phi)`` gives the fresh mixture at phi (physics.mixtures.unburned_mixture)."""
    from scipy.optimize import brentq  # here: a worker that solves flames only never loads SciPy

    def excess(phi: float) -> float:
        return equilibrium_temperature_K(gas, mixture_at(phi), T_u, P) - target_K

    peak = max(PEAK_SCAN, key=excess)
    lo, hi = (PHI_RANGE[0], peak) if lean else (peak, PHI_RANGE[1])
    f_lo, f_hi = excess(lo), excess(hi)
    if f_lo * f_hi > 0:
        return None
    return float(brentq(excess, lo, hi, xtol=1e-6))
