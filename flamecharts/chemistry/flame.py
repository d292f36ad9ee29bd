"""One freely propagating premixed flame: set up, solve (fresh or warm start), measure.

This is the only module that drives Cantera's 1D solver. It takes plain inputs
(composition, temperature, pressure, settings, optionally a neighbour's profile)
and returns plain data (numbers and numpy arrays), so it runs the same in this
process, in a joblib worker or on a cluster worker.

Numerical settings
------------------
Cantera's free-flame solver discretises convection with a first-order upwind
scheme, so the flame speed converges slowly with the number of grid points; the
thermal thickness converges much faster. The curvature criterion sets the flame-speed
error and the slope criterion mostly adds points, so the settings refine on curvature
(tests/benchmarks/grid_convergence.py; figures in docs/benchmarks.md). Each setting
solves on a coarse grid first (robust, cheap) and then refines to its final criteria.
"""
from __future__ import annotations

import contextlib
import dataclasses
import io
import threading
import time
import warnings

import cantera as ct
import numpy as np
import numpy.typing as npt

from ..errors import first_line
from ..numerics import NUMERICS, Numerics  # noqa: F401 - NUMERICS re-exported (the grid settings live below the chemistry)
from ..outcome import Reason, Status
from ..physics import flame_measures as profiles
from ..physics.grid_error import grid_convergence_index, placement_floor

#: Flames whose burned-side temperature rise is below this share of the equilibrium
#: rise, or whose speed is below MIN_FLAME_SPEED, did not burn (solver found the cold branch).
MIN_RISE_SHARE = 0.5
#: 1 cm/s: slower flames are carried by buoyancy and do not propagate as planar flames
#: (common practice); the limit mixtures of methane and hydrogen burn at about 2-5 cm/s.
MIN_FLAME_SPEED = 0.01  # m/s

#: Mixtures whose equilibrium temperature rise is below this are not solved: even the
#: leanest flammable hydrogen-air mixture (4 % H2, Coward & Jones, US Bureau of Mines
#: Bulletin 503, 1952) rises about 330 K (computed, HP equilibrium), and methane at its
#: 5 % lower limit about 1180 K (computed). Such points are recorded as "no_flame" at once.
MIN_EQUILIBRIUM_RISE_K = 300.0

#: Relative mismatch between the end-of-domain temperature and HP equilibrium that is
#: reported in the point's message (the domain may be too short for slow recombination).
T_EQ_WARN_SHARE = 0.01


#: Smallest refinement pass that is always skipped at the end (see Numerics.tail_share).
TAIL_MIN_POINTS = 3

#: Steady and time-stepping Jacobian ages for warm starts: a finite-difference Jacobian
#: of a detailed mechanism costs as much as ~170 residual evaluations, so a stale
#: Jacobian that needs more Newton steps is cheaper than a fresh one (docs/benchmarks.md).
WARM_JACOBIAN_AGE = (40, 40)

#: Pressure exponent used only to rescale a neighbour's profile to a new pressure
#: before solving (S_L ~ p^beta; beta about -0.4 to -0.5 for methane-air, Gu et al.,
#: Combust. Flame 121 (2000) 41). The solver corrects the rest.
GUESS_PRESSURE_EXPONENT = -0.45


def robust_numerics(numerics: Numerics) -> Numerics:
    """Settings of the last retry of a point that failed warm and fresh: a domain three
    times wider (room for thick, slow flames and for Cantera's domain growth) and a
    coarser first grid stage before the setting's own stages, so the first Newton
    solves are small and forgiving. The final grid criteria are the setting's own.

    >>> robust_numerics(NUMERICS["standard"]).stages[0], robust_numerics(NUMERICS["standard"]).width_m
    ((5.0, 0.3, 0.5), 0.09)
    """
    return dataclasses.replace(numerics, width_m=round(3 * numerics.width_m, 12),
                               stages=((5.0, 0.3, 0.5),) + tuple(numerics.stages))


ROBUST_RETRY = "robust retry (3x wider domain, coarser first grid)"


def mechanism_fault(gas: ct.Solution, T_u: float, P: float, X: dict[str, float], T_eq: float) -> str:
    """'' if the mechanism gives finite thermodynamics and reaction rates along the way
    from the unburned mixture (T_u) to the burned one (T_eq), else what is wrong.

    Checks the unburned composition at five temperatures from T_u to T_eq and the
    equilibrium composition at T_eq: a rate or a cp that is inf or NaN there would
    break every solve of this mixture, so the point is recorded as a mechanism error at
    once instead of being retried.
    """
    gas.TP = T_eq, P
    Y_eq = gas.Y
    states: list[tuple[float, dict[str, float] | None, str]] = [(T, X, "unburned mixture") for T in np.linspace(T_u, T_eq, 5)]
    states.append((T_eq, None, "equilibrium products"))
    for T, comp, what in states:
        if comp is None:
            gas.TPY = T, P, Y_eq
        else:
            gas.TPX = T, P, comp
        if not (np.all(np.isfinite(gas.net_production_rates)) and np.isfinite(gas.cp_mass)):
            return f"non-finite reaction rates or heat capacity for the {what} at {T:.0f} K"
    return ""


class FlameTimeLimit(Exception):
    """The flame being solved has used up its time limit (raised from Cantera's callbacks)."""


#: The deadline of the flame this thread is solving, if any, on this thread's CPU clock
#: (time.thread_time): a loaded machine or a shared cluster node slows the wall clock, not
#: the flame's own CPU time, so it does not fail healthy flames.
_LIMIT = threading.local()


def _check_deadline(*_args) -> int:
    """Raise FlameTimeLimit once the flame's deadline has passed. Installed as Cantera's
    time-step and steady callbacks, so a flame that time-steps or iterates without end
    stops at its limit; an exception raised there ends Cantera's solve."""
    deadline = getattr(_LIMIT, "deadline", None)
    if deadline is not None and time.thread_time() > deadline:
        raise FlameTimeLimit()
    return 0


def _make_flame(ct, gas, width: float, transport: str, soret: bool, numerics: Numerics):
    f = ct.FreeFlame(gas, width=width)
    f.set_max_grid_points(f.flame, numerics.max_grid_points)
    f.transport_model = transport
    if soret:
        f.soret_enabled = True
    f.set_time_step_callback(_check_deadline)
    f.set_steady_callback(_check_deadline)
    return f


def _set_criteria(f, stage, prune):
    ratio, slope, curve = stage
    f.set_refine_criteria(ratio=ratio, slope=slope, curve=curve, prune=min(prune, 0.5 * slope))


def scaled_profile(grid_m: npt.ArrayLike, velocity_m_s: npt.ArrayLike, T_K: npt.ArrayLike, P_from: float, P_to: float,
                   beta: float = GUESS_PRESSURE_EXPONENT) -> tuple[np.ndarray, np.ndarray]:
    """Grid and velocity of a converged flame stretched to another pressure.

    A premixed flame's thickness scales as delta ~ alpha_u/S_L ~ p^-(1+beta) and all its
    velocities as S_L ~ p^beta (Law, Combustion Physics, 2006, ch. 7), so the profile is
    stretched about the point where T = 0.75 T_u + 0.25 T_b (where Cantera pins the free
    flame) and its velocities scaled; temperature and composition keep their shape.

    Parameters
    ----------
    grid_m, velocity_m_s, T_K : profile [m], [m/s], [K]
    P_from, P_to : pressure of the profile and of the new flame [Pa]
    beta : pressure exponent of the flame speed [-]

    Returns
    -------
    (grid [m] starting at 0, velocity [m/s])

    Examples
    --------
    >>> g, u = scaled_profile([0.0, 0.01, 0.02], [0.4, 1.0, 2.8], [300.0, 1200.0, 2200.0], 1e5, 4e5, -0.5)
    >>> [round(float(v), 4) for v in g], [round(float(v), 2) for v in u]
    ([0.0, 0.005, 0.01], [0.2, 0.5, 1.4])
    """
    x = np.asarray(grid_m, dtype=float)
    u = np.asarray(velocity_m_s, dtype=float)
    if P_from == P_to:
        return x, u
    T = np.asarray(T_K, dtype=float)
    T_mid = 0.75 * T[0] + 0.25 * T[-1]
    rising = int(np.argmax(T)) + 1
    x_mid = float(np.interp(T_mid, T[:rising], x[:rising]))
    stretch = (P_to / P_from) ** (-(1.0 + beta))
    x_new = x_mid + (x - x_mid) * stretch
    return x_new - x_new[0], u * (P_to / P_from) ** beta


def preheated_profile(T_K: npt.ArrayLike, T_u_new: float) -> np.ndarray:
    """A converged temperature profile moved to another unburned temperature.

    The inlet temperature is fixed by the new mixture, so a neighbour's profile that starts
    at another temperature would leave a jump at the first grid point, which the grid
    refiner tries to resolve without end. The profile is shifted by the change of inlet
    temperature, fully at the inlet and fading linearly in T to nothing at the peak (the
    burned side is set by chemistry; the solver corrects it).

    Parameters
    ----------
    T_K : temperature profile [K], inlet first
    T_u_new : unburned temperature of the new flame [K]

    Returns
    -------
    temperature profile [K] starting at T_u_new, with the same peak

    Examples
    --------
    >>> [float(t) for t in preheated_profile([300.0, 1300.0, 2300.0], 400.0)]
    [400.0, 1350.0, 2300.0]
    """
    T = np.asarray(T_K, dtype=float)
    T_max = float(T.max())
    if T_max <= T[0]:
        return np.full_like(T, T_u_new)
    weight = np.clip((T_max - T) / (T_max - T[0]), 0.0, 1.0)
    return T + (T_u_new - T[0]) * weight


def _initial_guess(ct, gas, warm: dict, P: float, T_u: float | None = None):
    """A neighbour's converged profile as a Cantera SolutionArray at pressure P (stretched
    to P when it was solved at another pressure) and, when given, unburned temperature
    T_u (see :func:`preheated_profile`)."""
    x, velocity = scaled_profile(warm["grid"], warm["velocity"], warm["T"], float(warm.get("P", P)), P)
    T = np.asarray(warm["T"], dtype=float)
    if T_u is not None:
        T = preheated_profile(T, T_u)
    Y_src = np.asarray(warm["Y"], dtype=float)
    index = {n: i for i, n in enumerate(warm["species"])}
    Y = np.zeros((len(x), gas.n_species))
    for k, name in enumerate(gas.species_names):
        if name in index:
            Y[:, k] = Y_src[index[name]]
    arr = ct.SolutionArray(gas, shape=len(x), extra={"grid": x, "velocity": velocity})
    arr.TPY = T, P, Y
    return arr


def tail_points(n_points: int, share: float) -> int:
    """Largest refinement pass [points] that is not taken at the end of the final stage.

    >>> tail_points(750, 0.01), tail_points(120, 0.01)
    (7, 3)
    """
    return max(TAIL_MIN_POINTS, int(share * n_points))


def _refine_loop(f, numerics: Numerics, first_share: float | None = None) -> None:
    """Refine a converged flame to the final criteria, one solve at a time.

    Each solve on a new grid costs a new Jacobian. Before each solve the grid is settled
    on the converged solution (:func:`_settle`: Cantera's refiner applied pass after
    pass to that solution read through a monotone cubic, no solve in between), so one
    solve takes what used to be several refine-and-solve passes (each pass of Cantera's
    refiner exposes the next: ratio criterion cascades, new points read linearly).
    A settled grid that adds at most :func:`tail_points` points is undone and the flame
    converged on the grid before it is kept: a 1 % denser grid moves S_L by far less
    than the setting's own error (figures in docs/benchmarks.md).
    ``first_share``, when given, replaces ``numerics.tail_share`` for the first pass only.
    """
    share = numerics.tail_share if first_share is None else first_share
    while True:
        _check_deadline()
        before = f.to_array()
        n = len(f.grid)
        _settle(f, np.array(f.grid), _solution_table(f))
        added = len(f.grid) - n
        if added == 0:
            return
        if added <= tail_points(n, share):
            f.from_array(before)
            return
        f.solve(loglevel=0, refine_grid=False, auto=False)
        share = numerics.tail_share


def _solve_fresh(ct, gas, T_u, P, X, transport, soret, numerics):
    width = numerics.width_m / np.sqrt(max(P / 1e5, 1e-3))
    gas.TPX = T_u, P, X
    f = _make_flame(ct, gas, width, transport, soret, numerics)
    _set_criteria(f, numerics.stages[0], numerics.prune)
    f.solve(loglevel=0, auto=True)
    for stage in numerics.stages[1:]:
        _set_criteria(f, stage, numerics.prune)
        _refine_loop(f, numerics)
    return f


def monotone_cubic(x: npt.ArrayLike, table: npt.ArrayLike, x_new: npt.ArrayLike) -> np.ndarray:
    """Piecewise-cubic Hermite interpolation that keeps the data's monotonicity (PCHIP).

    Slopes are the weighted harmonic mean of the neighbouring secant slopes, zero at
    local extrema (Fritsch & Butland, SIAM J. Sci. Stat. Comput. 5 (1984) 300), and a
    shape-preserving three-point formula at the ends (Moler, Numerical Computing with
    MATLAB, 2004, sec. 3.4); the same construction as ``scipy.interpolate.PchipInterpolator``
    (checked against it in tests/test_flame.py), written out here because importing
    scipy.interpolate adds to every worker's memory (docs/benchmarks.md).
    The slope is continuous and the curve never overshoots the data, so interpolated
    mass fractions stay within the range of the neighbour's own values (their sum may
    drift by ~1e-6, which the solver corrects).

    Parameters
    ----------
    x : strictly increasing abscissae, shape (n,), n >= 2
    table : values, shape (n,) or (n, m) (columns interpolated independently)
    x_new : where to interpolate, inside [x[0], x[-1]]

    Returns
    -------
    interpolated values, shape (len(x_new),) or (len(x_new), m)

    Examples
    --------
    >>> [round(float(v), 4) for v in monotone_cubic([0.0, 1.0, 2.0, 3.0], [0.0, 0.0, 1.0, 1.0], [0.5, 1.5, 2.5])]
    [0.0, 0.5, 1.0]
    """
    x = np.asarray(x, dtype=float)
    y = np.asarray(table, dtype=float)
    if x.ndim != 1 or len(x) < 2 or not np.all(np.diff(x) > 0.0):
        raise ValueError("monotone_cubic needs at least two strictly increasing abscissae")
    flat = y.ndim == 1
    if flat:
        y = y[:, None]
    h = np.diff(x)[:, None]
    delta = np.diff(y, axis=0) / h
    d = np.zeros_like(y)
    if len(x) == 2:
        d[:] = delta[0]
    else:
        w1 = 2.0 * h[1:] + h[:-1]
        w2 = h[1:] + 2.0 * h[:-1]
        same = (np.sign(delta[:-1]) * np.sign(delta[1:])) > 0.0
        with np.errstate(divide="ignore", invalid="ignore"):
            mean = (w1 + w2) / (w1 / delta[:-1] + w2 / delta[1:])
        d[1:-1] = np.where(same, mean, 0.0)
        for end, (h0, h1, d0, d1) in ((0, (h[0], h[1], delta[0], delta[1])),
                                      (-1, (h[-1], h[-2], delta[-1], delta[-2]))):
            s = ((2.0 * h0 + h1) * d0 - h0 * d1) / (h0 + h1)
            s = np.where(np.sign(s) != np.sign(d0), 0.0, s)
            s = np.where((np.sign(d0) != np.sign(d1)) & (np.abs(s) > 3.0 * np.abs(d0)), 3.0 * d0, s)
            d[end] = s
    xn = np.atleast_1d(np.asarray(x_new, dtype=float))
    k = np.clip(np.searchsorted(x, xn, side="right") - 1, 0, len(x) - 2)
    hk = h[k]
    t = ((xn - x[k]) / hk[:, 0])[:, None]
    t2, t3 = t * t, t * t * t
    out = ((2 * t3 - 3 * t2 + 1) * y[k] + (t3 - 2 * t2 + t) * hk * d[k]
           + (-2 * t3 + 3 * t2) * y[k + 1] + (t3 - t2) * hk * d[k + 1])
    return out[:, 0] if flat else out


def _regrid(f, guess, stride: int, max_passes: int = 40) -> None:
    """Set a neighbour's profile as the initial guess on a grid refined afresh for it.

    Carrying the neighbour's own grid from flame to flame only ever adds points (Cantera's
    pruning removes almost none with a detailed mechanism), and every point costs
    Jacobian time. Instead every ``stride``-th point of the neighbour's grid is kept and
    Cantera's refiner, at f's current criteria, adds points back where the neighbour's
    profile needs them, each pass re-reading the profile at the new points (no solve
    happens here, see :func:`_settle`).

    The profile is read through a monotone piecewise-cubic interpolant
    (:func:`monotone_cubic`), whose slope is continuous and which never overshoots the
    neighbour's values. A piecewise-linear read of a neighbour whose last refinement pass
    was skipped leaves slope kinks that the curvature criterion can never resolve: the
    refiner then piles points around them (measured: 815 -> 1229 points before the
    solve, and 1823 after, 82 s instead of 16 s).
    """
    x = np.asarray(guess.grid)
    keep = np.unique(np.r_[0:len(x):stride, len(x) - 1])
    f.set_initial_guess(data=guess[keep])
    table = np.column_stack([np.asarray(guess.velocity), np.asarray(guess.T), np.asarray(guess.Y)])
    _settle(f, x, table, max_passes)


def _solution_table(f) -> np.ndarray:
    """The flame's velocity [m/s], temperature [K] and mass fractions as one table, one
    row per grid point (columns in the order :func:`_settle` writes them back)."""
    return np.column_stack([np.array(f.velocity), np.array(f.T), np.array(f.Y).T])


def _settle(f, x, table, max_passes: int = 40) -> None:
    """Refine f's grid at its criteria until Cantera's refiner adds no point, reading the
    profile (x [m], table from :func:`_solution_table`) through :func:`monotone_cubic`
    at every new grid after each pass. No solve happens here."""
    names = ["velocity", "T", *f.gas.species_names]
    for _ in range(max_passes):
        n = len(f.grid)
        f.refine(loglevel=0)
        if len(f.grid) == n:
            return
        values = monotone_cubic(x, table, np.asarray(f.grid))
        for k, name in enumerate(names):
            f.flame.set_values(name, values[:, k])


#: Fewest neighbour points a warm start's coarse first grid keeps (before refinement): a
#: handful would leave Cantera's fixed-temperature point at the inlet.
MIN_COARSE_POINTS = 32


def warm_stride(n_points: int, stride: int) -> int:
    """Stride of a warm start's coarse first grid over a neighbour of n_points points:
    ``stride``, reduced so that at least MIN_COARSE_POINTS points are kept.

    >>> warm_stride(800, 4), warm_stride(100, 4), warm_stride(9, 4)
    (4, 3, 1)
    """
    return max(1, min(stride, (n_points - 1) // MIN_COARSE_POINTS))


def _solve_warm(ct, gas, T_u, P, X, transport, soret, numerics, warm):
    """Solve a flame from a neighbour's converged profile, coarse grid first.

    1. The neighbour's profile (stretched to the new pressure and preheat by
       :func:`_initial_guess`) is read onto every ``warm_stride``-th point of its grid,
       refined at the first-stage criteria (:func:`_regrid`), and solved there: Newton's
       hard part, and any time stepping, happen on about a quarter of the points, where
       a Jacobian costs a quarter.
    2. The grid is settled at the final criteria on that converged coarse solution of
       the new flame (:func:`_settle`) and solved once more: the guess is close, one
       Jacobian on the full grid.
    3. Refined to the final criteria (:func:`_refine_loop`, first pass skipped up to
       ``warm_share``).

    The grid history, coarse then fine, is that of a fresh solve, so a warm-started
    flame agrees with the same flame solved from scratch within the setting's error
    (cost and agreement measured in docs/benchmarks.md).
    """
    gas.TPX = T_u, P, X
    f = _make_flame(ct, gas, numerics.width_m, transport, soret, numerics)
    _set_criteria(f, numerics.stages[0], numerics.prune)
    _regrid(f, _initial_guess(ct, gas, warm, P, T_u), stride=warm_stride(len(warm["grid"]), numerics.warm_stride))
    f.P = P
    f.inlet.T = T_u
    f.inlet.X = X
    f.set_max_jac_age(*WARM_JACOBIAN_AGE)
    f.solve(loglevel=0, refine_grid=False, auto=False)
    _set_criteria(f, numerics.stages[-1], numerics.prune)
    _settle(f, np.array(f.grid), _solution_table(f))
    f.solve(loglevel=0, refine_grid=False, auto=False)
    _refine_loop(f, numerics, first_share=numerics.warm_share)
    return f


def measure(f: ct.FreeFlame, gas: ct.Solution, T_u: float, P: float, X: dict[str, float], T_eq: float) -> dict:
    """Measured quantities of a converged flame (SI units, plain floats); T_eq is the HP
    equilibrium temperature of the unburned mixture [K]."""
    # the flame's array properties set the shared gas object point by point, so read
    # them all before the gas is set to the inlet and equilibrium states below
    x = f.grid
    T = f.T
    S_L = float(f.velocity[0])
    lam_u = float(f.thermal_conductivity[0])
    rho = f.density
    q = f.heat_release_rate
    gas.TPX = T_u, P, X
    rho_u, cp_u = gas.density, gas.cp_mass
    return {
        "laminar_flame_speed_m_s": S_L,
        "thermal_thickness_m": profiles.thermal_thickness(x, T),
        "diffusive_thickness_m": profiles.diffusive_thickness(lam_u, rho_u, cp_u, S_L),
        "reaction_zone_thickness_m": profiles.reaction_zone_thickness(x, q),
        "adiabatic_flame_temperature_K": float(T[-1]),
        "equilibrium_temperature_K": float(T_eq),
        "max_temperature_K": float(T.max()),
        "expansion_ratio": profiles.expansion_ratio(rho[0], rho[-1]),
        "unburned_density_kg_m3": float(rho_u),
        "unburned_thermal_diffusivity_m2_s": profiles.thermal_diffusivity(lam_u, rho_u, cp_u),
        "unburned_thermal_conductivity_W_m_K": lam_u,
        "unburned_cp_J_kg_K": float(cp_u),
        "grid_points": int(len(x)),
        "domain_width_m": float(x[-1] - x[0]),
    }


def _speed_and_thickness_on(f, final, keep) -> tuple[float, float]:
    """S_L [m/s] and thermal thickness [m] of f solved again on the points ``keep`` of its
    converged solution ``final`` (a SolutionArray), from that solution (no refinement)."""
    f.set_initial_guess(data=final[keep])
    f.solve(loglevel=0, refine_grid=False, auto=False)
    return float(f.velocity[0]), profiles.thermal_thickness(f.grid, f.T)


def grid_error(f: ct.FreeFlame) -> dict:
    """Error estimate of a converged flame's speed and thermal thickness: the flame solved
    again on every second and every fourth point of its final grid (a systematic
    coarsening, ratio 2), and the three values combined into Roache's grid convergence index
    (physics.grid_error), never below the spread two valid grids of this size can have
    (physics.grid_error.placement_floor). Costs two Newton solves on a half and a quarter of the points,
    about 0.75 of one Jacobian on the final grid; f is left as it was.

    Returns the metrics ``flame_speed_numerical_error`` and
    ``thermal_thickness_numerical_error`` (fractions), ``laminar_flame_speed_extrapolated_m_s``
    (None outside the asymptotic range), ``grid_convergence`` and ``grid_convergence_order``.
    """
    final = f.to_array()
    n = len(final)
    S, d = float(f.velocity[0]), profiles.thermal_thickness(f.grid, f.T)
    values = []
    try:
        for stride in (2, 4):
            values.append(_speed_and_thickness_on(f, final, np.unique(np.r_[0:n:stride, n - 1])))
    except ct.CanteraError:
        pass  # a coarse grid too coarse to converge: fewer grids, a wider band (or none)
    finally:
        f.from_array(final)
    if not values:
        return {"flame_speed_numerical_error": None, "thermal_thickness_numerical_error": None,
                "laminar_flame_speed_extrapolated_m_s": None, "grid_convergence": "not estimated",
                "grid_convergence_order": None}
    coarse = values[1] if len(values) > 1 else (None, None)
    floor = placement_floor(n)
    speed = grid_convergence_index(S, values[0][0], coarse[0], floor=floor)
    thickness = grid_convergence_index(d, values[0][1], coarse[1], floor=floor)
    return {"flame_speed_numerical_error": speed["index"], "thermal_thickness_numerical_error": thickness["index"],
            "laminar_flame_speed_extrapolated_m_s": speed["extrapolated"], "grid_convergence": speed["convergence"],
            "grid_convergence_order": speed["order"]}


def profile_of(f: ct.FreeFlame, P: float) -> dict:
    """Plain-array profile of a converged flame, enough to warm-start a neighbour."""
    return {
        "grid": np.array(f.grid),
        "T": np.array(f.T),
        "velocity": np.array(f.velocity),
        "Y": np.array(f.Y),
        "species": list(f.gas.species_names),
        "P": float(P),
    }


def classify(metrics: dict, T_u: float) -> tuple[Status, str]:
    """Status of a converged solution: ('ok', '') or ('no_flame', reason)."""
    rise = metrics["max_temperature_K"] - T_u
    eq_rise = metrics["equilibrium_temperature_K"] - T_u
    if metrics["laminar_flame_speed_m_s"] < MIN_FLAME_SPEED or rise < MIN_RISE_SHARE * max(eq_rise, 1.0):
        return Status.NO_FLAME, (f"no flame: solver converged to a non-burning state (temperature rise {rise:.0f} K of "
                            f"{eq_rise:.0f} K at equilibrium, speed {metrics['laminar_flame_speed_m_s']:.2g} m/s)")
    notes = []
    mismatch = abs(metrics["adiabatic_flame_temperature_K"] - metrics["equilibrium_temperature_K"])
    if mismatch > T_EQ_WARN_SHARE * metrics["equilibrium_temperature_K"]:
        notes.append(f"end-of-domain temperature differs from HP equilibrium by {mismatch:.0f} K")
    return Status.OK, "; ".join(notes)


def solve_flame(gas: ct.Solution, T_u: float, P: float, X: dict[str, float], transport: str, soret: bool, numerics: Numerics,
                warm: dict | None = None, time_limit_s: float | None = None) -> dict:
    """Solve one freely propagating flame and measure it.

    Parameters
    ----------
    gas : cantera.Solution of the mechanism (its state is overwritten)
    T_u : unburned temperature [K]
    P : pressure [Pa]
    X : unburned mixture, species -> mole fraction
    transport : 'mixture-averaged', 'multicomponent' or 'unity-Lewis-number'
    soret : thermal diffusion on or off
    numerics : grid settings
    warm : profile of a converged neighbour (from :func:`profile_of`), or None
    time_limit_s : give up after this much CPU time of the calling thread [s] (status failed,
        reason time limit); None: no limit

    Returns
    -------
    dict with 'status' ('ok', 'no_flame' or 'failed'), 'message', 'start' ('warm' or
    'fresh'), 'metrics' (dict or None), 'profile' (dict or None), 'solve_seconds'.
    Cantera's log output is suppressed; this function never prints.
    """
    t0 = time.perf_counter()
    _LIMIT.deadline = None if time_limit_s is None else time.thread_time() + time_limit_s
    try:
        return _solve_flame(gas, T_u, P, X, transport, soret, numerics, warm, time_limit_s, t0)
    finally:
        _LIMIT.deadline = None


def _solve_flame(gas, T_u, P, X, transport, soret, numerics, warm, time_limit_s, t0) -> dict:

    def failed(reason: Reason, text: str) -> dict:
        return {"status": Status.FAILED, "reason": reason, "message": f"{reason}: {text}", "start": "fresh",
                "metrics": None, "profile": None, "solve_seconds": time.perf_counter() - t0}

    try:
        gas.TPX = T_u, P, X
        gas.equilibrate("HP")
        rise = gas.T - T_u
        fault = mechanism_fault(gas, T_u, P, X, gas.T) if np.isfinite(rise) else "non-finite equilibrium"
    except ct.CanteraError as exc:
        return failed(Reason.MECHANISM_ERROR, f"HP equilibrium of the mixture failed: {first_line(exc)}")
    if fault:
        return failed(Reason.MECHANISM_ERROR, fault + "; not solved (no retry can help: check the mechanism file)")
    if rise < MIN_EQUILIBRIUM_RISE_K:
        return {"status": Status.NO_FLAME, "reason": Reason.NO_FLAME, "start": "fresh", "metrics": None,
                "profile": None,
                "message": (f"no flame: not solved, equilibrium temperature rise {rise:.0f} K is below "
                            f"{MIN_EQUILIBRIUM_RISE_K:.0f} K; too lean or too diluted to burn"),
                "solve_seconds": time.perf_counter() - t0}
    # warm start (when a neighbour is given), then fresh, then a fresh retry with robust settings
    attempts = [("warm", warm, numerics)] if warm is not None else []
    attempts += [("fresh", None, numerics), ("robust", None, robust_numerics(numerics))]
    errors = []
    for start, w, num in attempts:
        label = ROBUST_RETRY if start == "robust" else f"{start} start"
        try:
            with warnings.catch_warnings(), contextlib.redirect_stdout(io.StringIO()):
                warnings.simplefilter("ignore")
                if w is None:
                    f = _solve_fresh(ct, gas, T_u, P, X, transport, soret, num)
                else:
                    f = _solve_warm(ct, gas, T_u, P, X, transport, soret, num, w)
                metrics = measure(f, gas, T_u, P, X, T_u + rise)
                if classify(metrics, T_u)[0] == Status.OK:
                    metrics.update(grid_error(f))
        except FlameTimeLimit:
            return failed(Reason.TIME_LIMIT, f"gave up after {time_limit_s:.0f} s of CPU time on the {label} "
                          f"(flame_time_limit_s {time_limit_s:g}); the next run tries it again: raise "
                          "flame_time_limit_s if it needs longer")
        except ct.CanteraError as exc:
            errors.append(f"{label}: {first_line(exc)}")
            continue
        except (ValueError, IndexError, FloatingPointError) as exc:
            if start != "warm":
                raise
            errors.append(f"warm start: unusable neighbour profile ({type(exc).__name__})")
            continue
        status, message = classify(metrics, T_u)
        if status != "ok" and start == "warm":
            errors.append(f"warm start: {message}")
            continue  # a warm start may land on the cold branch; confirm with a fresh solve
        if errors and status == "ok":
            tried = " and ".join(e.split(":", 1)[0] for e in errors)
            how = f"{tried} failed, solved on the {ROBUST_RETRY}" if start == "robust" else f"{tried} failed, solved fresh"
            message = "; ".join(filter(None, [message, how]))
        return {
            "status": status, "reason": Reason.NONE if status == Status.OK else Reason.NO_FLAME, "message": message,
            "start": "fresh" if start == "robust" else start,
            "metrics": metrics, "profile": profile_of(f, P) if status == "ok" else None,
            "solve_seconds": time.perf_counter() - t0,
        }
    return failed(Reason.NOT_CONVERGED, f"no solution (HP equilibrium {T_u + rise:.0f} K); " + "; ".join(errors))
