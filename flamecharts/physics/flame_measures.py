"""Flame measures from converged 1D profiles: pure functions on arrays, SI units.

thermal_thickness         (T_b - T_u) / max|dT/dx|
diffusive_thickness       lambda_u / (rho_u cp_u S_L)
reaction_zone_thickness   full width at half maximum of the heat release rate
expansion_ratio           rho_u / rho_b
thermal_diffusivity       lambda / (rho cp)
"""
from __future__ import annotations

import numpy as np
import numpy.typing as npt


def thermal_thickness(x: npt.ArrayLike, T: npt.ArrayLike) -> float:
    """Thermal flame thickness from the steepest temperature gradient.

    delta_T = (T_b - T_u) / max|dT/dx|, with T_u and T_b the first and last grid
    values and the gradient taken between neighbouring grid points (Poinsot &
    Veynante, Theoretical and Numerical Combustion, 2nd ed., 2005, sec. 2.5, eq. 2.72).
    It is the measure that sets the grid a resolved flame needs.

    Parameters
    ----------
    x : grid positions [m], increasing
    T : temperature at the grid positions [K]

    Returns
    -------
    float: thermal thickness [m]

    Examples
    --------
    A linear ramp of 1500 K over 0.5 mm between flat ends:

    >>> round(thermal_thickness([0, 1e-3, 1.5e-3, 3e-3], [300, 300, 1800, 1800]) * 1e3, 6)
    0.5
    """
    x = np.asarray(x, dtype=float)
    T = np.asarray(T, dtype=float)
    grad = np.abs(np.diff(T) / np.diff(x))
    return float(abs(T[-1] - T[0]) / grad.max())


def diffusive_thickness(lambda_u: float, rho_u: float, cp_u: float, S_L: float) -> float:
    """Diffusive flame thickness lambda_u / (rho_u cp_u S_L) = alpha_u / S_L.

    The thickness from the balance of heat diffusion and convection in the
    preheat zone (Poinsot & Veynante 2005, sec. 2.5, eq. 2.70). It is several
    times thinner than the thermal thickness (about 1/5 to 1/7 for methane-air).

    Parameters
    ----------
    lambda_u : thermal conductivity of the unburned mixture [W/(m K)]
    rho_u : density of the unburned mixture [kg/m^3]
    cp_u : specific heat of the unburned mixture [J/(kg K)]
    S_L : laminar flame speed [m/s]

    Returns
    -------
    float: diffusive thickness [m]

    Examples
    --------
    >>> round(diffusive_thickness(0.026, 1.13, 1070.0, 0.37) * 1e3, 4)
    0.0581
    """
    return float(lambda_u / (rho_u * cp_u * S_L))


def thermal_diffusivity(lambda_: float, rho: float, cp: float) -> float:
    """Thermal diffusivity alpha = lambda / (rho cp) [m^2/s].

    Parameters
    ----------
    lambda_ : thermal conductivity [W/(m K)]
    rho : density [kg/m^3]
    cp : specific heat at constant pressure [J/(kg K)]

    Examples
    --------
    Air at 300 K (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table A.4:
    k 0.0263 W/(m K), rho 1.1614 kg/m^3, cp 1007 J/(kg K), alpha 22.5e-6 m^2/s; from memory):

    >>> round(thermal_diffusivity(0.0263, 1.1614, 1007.0) * 1e6, 1)
    22.5
    """
    return float(lambda_ / (rho * cp))


def reaction_zone_thickness(x: npt.ArrayLike, q: npt.ArrayLike) -> float:
    """Reaction-zone thickness as the full width at half maximum of the heat release rate.

    The contiguous region around the peak where q >= max(q)/2, with its edges
    interpolated linearly between grid points (a common definition of the
    reaction-zone thickness, e.g. Poinsot & Veynante 2005, sec. 2.5).

    Parameters
    ----------
    x : grid positions [m], increasing
    q : volumetric heat release rate at the grid positions [W/m^3]

    Returns
    -------
    float: full width at half maximum [m]; nan if the peak is not positive.

    Examples
    --------
    A triangle peaking at 1 mm with a 1 mm base has a 0.5 mm full width at half maximum:

    >>> round(reaction_zone_thickness([0, 0.5e-3, 1e-3, 1.5e-3, 2e-3], [0, 0, 1, 0, 0]) * 1e3, 6)
    0.5
    """
    x = np.asarray(x, dtype=float)
    q = np.asarray(q, dtype=float)
    i = int(np.argmax(q))
    half = q[i] / 2.0
    if not half > 0:
        return float("nan")
    lo = i
    while lo > 0 and q[lo - 1] >= half:
        lo -= 1
    hi = i
    while hi < len(q) - 1 and q[hi + 1] >= half:
        hi += 1
    left = x[lo] if lo == 0 else np.interp(half, [q[lo - 1], q[lo]], [x[lo - 1], x[lo]])
    right = x[hi] if hi == len(q) - 1 else np.interp(half, [q[hi + 1], q[hi]], [x[hi + 1], x[hi]])
    return float(right - left)


def expansion_ratio(rho_u: float, rho_b: float) -> float:
    """Expansion (density) ratio rho_u / rho_b [-] across the flame.

    Examples
    --------
    >>> expansion_ratio(1.13, 0.15)
    7.533333333333333
    """
    return float(rho_u / rho_b)
