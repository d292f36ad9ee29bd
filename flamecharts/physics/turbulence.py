"""Premixed flames in turbulence: the numbers that place a flame on the regime diagram.

The diagram of Borghi (1985) in the form of Peters (Turbulent Combustion, Cambridge
University Press, 2000, sec. 2.3; J. Fluid Mech. 384 (1999) 107-132) compares the turbulence
with the flame on two ratios: the integral length over the flame thickness, l_t/l_F, and the
velocity fluctuation over the laminar flame speed, u'/S_L. Peters' flame thickness is the
diffusive one, l_F = alpha_u/S_L (unburned thermal diffusivity over flame speed; he takes
Sc = 1, so nu = alpha), not the thermal thickness from the temperature gradient, which is
several times larger: a diagram drawn on the thermal thickness moves every point and must say
so. The dissipation rate is taken as epsilon = u'^3/l_t.

Pure functions of SI inputs; they broadcast over NumPy arrays (design.turbulence_columns reads
them out for a premixer's points, outputs.charts.regime_charts draws the diagram).
"""
from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from .elementwise import power

#: Karlovitz number above which small eddies enter the inner reaction layer (Ka_delta = 1 with
#: a reaction layer a tenth of l_F: Peters 2000, sec. 2.3).
BROKEN_REACTION_ZONES_KA = 100.0


def diffusive_thickness(alpha_u_m2_s: ArrayLike, S_L_m_s: ArrayLike) -> np.ndarray:
    """Peters' flame thickness l_F = alpha_u / S_L [m].

    >>> round(float(diffusive_thickness(2.2e-5, 0.37)) * 1e6, 1)   # methane-air, 1 atm: 59.5 um
    59.5
    """
    return np.asarray(alpha_u_m2_s) / np.asarray(S_L_m_s)


def turbulent_reynolds(u_prime_m_s: ArrayLike, l_t_m: ArrayLike, S_L_m_s: ArrayLike, l_F_m: ArrayLike) -> np.ndarray:
    """Re_t = u' l_t / (S_L l_F) [-] (= u' l_t / nu with nu = alpha_u = S_L l_F; Peters 2000, eq. 2.9).

    >>> round(float(turbulent_reynolds(2.0, 0.01, 0.4, 5e-5)), 6)
    1000.0
    """
    return np.asarray(u_prime_m_s) * np.asarray(l_t_m) / (np.asarray(S_L_m_s) * np.asarray(l_F_m))


def damkohler(u_prime_m_s: ArrayLike, l_t_m: ArrayLike, S_L_m_s: ArrayLike, l_F_m: ArrayLike) -> np.ndarray:
    """Da = (l_t/u') / (l_F/S_L) [-]: the turnover time of the large eddies over the flame time
    (Peters 2000, eq. 2.10).

    >>> float(damkohler(2.0, 0.01, 0.4, 5e-5))
    40.0
    """
    return (np.asarray(l_t_m) / np.asarray(u_prime_m_s)) / (np.asarray(l_F_m) / np.asarray(S_L_m_s))


def karlovitz(u_prime_m_s: ArrayLike, l_t_m: ArrayLike, S_L_m_s: ArrayLike, l_F_m: ArrayLike) -> np.ndarray:
    """Ka = (l_F/eta)^2 = (u'/S_L)^(3/2) (l_t/l_F)^(-1/2) [-]: the flame time over the Kolmogorov
    time, with epsilon = u'^3/l_t and nu = S_L l_F (Peters 2000, eq. 2.11).

    >>> round(float(karlovitz(2.0, 0.01, 0.4, 5e-5)), 4)   # (5)^1.5 / 200^0.5
    0.7906
    """
    ratio_u = np.asarray(u_prime_m_s) / np.asarray(S_L_m_s)
    ratio_l = np.asarray(l_t_m) / np.asarray(l_F_m)
    return power(ratio_u, 1.5) / np.sqrt(ratio_l)


def kolmogorov_length(nu_m2_s: ArrayLike, u_prime_m_s: ArrayLike, l_t_m: ArrayLike) -> np.ndarray:
    """eta = (nu^3 / epsilon)^(1/4) with epsilon = u'^3 / l_t [m].

    >>> round(float(kolmogorov_length(1.5e-5, 2.0, 0.01)) * 1e6, 1)
    45.3
    """
    eps = np.asarray(u_prime_m_s) ** 3 / np.asarray(l_t_m)
    return (np.asarray(nu_m2_s) ** 3 / eps) ** 0.25


def regime(u_prime_m_s: ArrayLike, l_t_m: ArrayLike, S_L_m_s: ArrayLike, l_F_m: ArrayLike) -> str | np.ndarray:
    """The regime of Peters' diagram (2000, fig. 2.8) a flame falls in: 'laminar' (Re_t < 1),
    'wrinkled flamelets' (u' < S_L), 'corrugated flamelets' (Ka < 1), 'thin reaction zones'
    (1 <= Ka < 100) or 'broken reaction zones' (Ka >= 100); an array of them for arrays.

    >>> regime(0.2, 0.01, 0.4, 5e-5), regime(2.0, 0.01, 0.4, 5e-5), regime(20.0, 0.01, 0.4, 5e-5)
    ('wrinkled flamelets', 'corrugated flamelets', 'thin reaction zones')
    """
    ka = karlovitz(u_prime_m_s, l_t_m, S_L_m_s, l_F_m)
    out = np.select([turbulent_reynolds(u_prime_m_s, l_t_m, S_L_m_s, l_F_m) < 1.0,
                     np.asarray(u_prime_m_s) < np.asarray(S_L_m_s), ka < 1.0, ka < BROKEN_REACTION_ZONES_KA],
                    ["laminar", "wrinkled flamelets", "corrugated flamelets", "thin reaction zones"],
                    "broken reaction zones")
    return str(out) if out.ndim == 0 else out


def regime_lines(length_ratio: ArrayLike) -> dict[str, np.ndarray]:
    """u'/S_L of the diagram's boundary lines at l_t/l_F = ``length_ratio`` [-], from the
    definitions above: Re_t = 1 (u'/S_L = (l_t/l_F)^-1), Da = 1 (= l_t/l_F), Ka = 1
    (= (l_t/l_F)^(1/3)) and Ka = 100 (= 100^(2/3) (l_t/l_F)^(1/3)).

    >>> {k: round(float(v), 2) for k, v in regime_lines(8.0).items()}
    {'Re_t = 1': 0.12, 'Da = 1': 8.0, 'Ka = 1': 2.0, 'Ka = 100': 43.09}
    """
    x = np.asarray(length_ratio, dtype=float)
    return {"Re_t = 1": 1.0 / x, "Da = 1": x, "Ka = 1": np.cbrt(x),
            "Ka = 100": BROKEN_REACTION_ZONES_KA ** (2.0 / 3.0) * np.cbrt(x)}
