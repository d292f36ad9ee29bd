"""Power-law fits of flame speed against pressure and preheat temperature.

fit_power_law   y = a x^b by least squares in log-log
"""
from __future__ import annotations

import numpy as np
import numpy.typing as npt


def fit_power_law(x: npt.ArrayLike, y: npt.ArrayLike) -> tuple[float, float]:
    """Fit y = a x^b by linear least squares on (ln x, ln y).

    The form of Metghalchi & Keck, Combust. Flame 48 (1982) 191, for the pressure
    and temperature dependence of the laminar burning velocity,
    S_L = S_L0 (T_u/T_0)^alpha (p/p_0)^beta, fitted one variable at a time.

    Parameters
    ----------
    x : positive abscissae (pressure [bar] or temperature [K]); at least two distinct values
    y : positive ordinates (flame speed [m/s])

    Returns
    -------
    (b, a): exponent [-] and prefactor [unit of y / unit of x^b]

    Examples
    --------
    >>> b, a = fit_power_law([1.0, 2.0, 4.0], [0.4, 0.4 * 2 ** -0.5, 0.4 * 4 ** -0.5])
    >>> round(b, 6), round(a, 6)
    (-0.5, 0.4)
    """
    lx, ly = np.log(np.asarray(x, dtype=float)), np.log(np.asarray(y, dtype=float))
    if len(set(lx)) < 2:
        raise ValueError("a power-law fit needs at least two distinct x values")
    b, ln_a = np.polyfit(lx, ly, 1)
    return float(b), float(np.exp(ln_a))
