"""How a premixed flame responds to stretch: thermodiffusive numbers, one pure function per method.

lewis_number                      Le_k = alpha / D_k
blend_lewis_number_heat_release   fuel Lewis number of a blend, heat-release weighted (Law et al. 2005)
effective_lewis_number            two-reactant Le_eff (Matalon, Cui & Bechtold 2003)
zeldovich_number                  Ze from the mass burning rate against T_ad (Egolfopoulos & Law 1990)
markstein_number_unburned         Ma_u of the hydrodynamic theory (Clavin & Williams 1982)
thermodiffusive_regime            cellular / stable / pulsating by Ze (Le_eff - 1) (Sivashinsky 1977)

Why it matters for a burner: a lean hydrogen-rich flame (Le_eff < 1, Ma < 0) burns faster
where it is stretched or curved than its unstretched S_L says; it wrinkles into cells on
its own and flashes back earlier than the thermal critical-gradient model predicts. These
numbers flag where the unstretched flame speed understates the risk; they do not correct it.

All inputs and outputs dimensionless or SI, as each docstring states. The last three take and
give numbers or NumPy arrays alike (design.annotate reads them out for every point at once).
"""
from __future__ import annotations

import math

import numpy as np
import numpy.typing as npt

from .elementwise import Real, log

#: Cellular (thermodiffusive) instability for Ze (Le_eff - 1) below this (Sivashinsky 1977).
CELLULAR_THRESHOLD = -2.0
#: Pulsating instability for Ze (Le_eff - 1) above this: 4 (1 + sqrt 3) (Sivashinsky 1977).
PULSATING_THRESHOLD = 4.0 * (1.0 + math.sqrt(3.0))

#: Universal gas constant [J/(mol K)]
R_GAS = 8.314462618

#: Default step of the inert's mole fraction for the Zeldovich flames (chemistry.response):
#: each step moves T_ad by about 20 K in methane-air (0.015 moved it 60 K, a span of
#: 120-140 K for one derivative).
DEFAULT_INERT_STEP = 0.005


def lewis_number(thermal_diffusivity_m2_s: float, diffusion_coefficient_m2_s: float) -> float:
    """Lewis number of a species, Le_k = alpha / D_k [-].

    Parameters
    ----------
    thermal_diffusivity_m2_s : alpha = lambda / (rho c_p) of the mixture [m^2/s]
    diffusion_coefficient_m2_s : D_k of the species into the mixture [m^2/s]
        (mixture-averaged, as Cantera's ``mix_diff_coeffs``)

    Notes
    -----
    Evaluated in the fresh mixture (the state the asymptotic theories assume constant);
    a modelling choice, since both properties vary through the flame.

    >>> round(lewis_number(2.2e-5, 7.3e-5), 3)   # hydrogen in air at 300 K, about 0.3
    0.301
    """
    return thermal_diffusivity_m2_s / diffusion_coefficient_m2_s


def blend_lewis_number_heat_release(lewis_numbers: npt.ArrayLike, heat_release_weights: npt.ArrayLike) -> float:
    """Fuel Lewis number of a fuel blend, weighted by each fuel's share of the heat release [-].

    Le_F = 1 + sum_i q_i (Le_i - 1) / sum_i q_i

    Parameters
    ----------
    lewis_numbers : Lewis number of each combustible species of the fuel [-]
    heat_release_weights : q_i, proportional to the heat each releases: mole fraction x
        lower heating value [any consistent unit]

    Notes
    -----
    The heat-release weighting of Law & Kwon (2004) and Law, Jomaas & Bechtold (2005).
    Others in use: by volume, Le_V = sum x_i Le_i (Muppala et al. 2009), and by
    diffusivity, Le_D = alpha / sum x_i D_i (Dinkelacker, Manickam & Muppala 2011). We
    take the heat-release weighting because the thermodiffusive response is set where the
    heat is released, and because a few percent of hydrogen by volume releases only a
    small share of the heat, so it moves Le_F by its real weight; the volume weighting
    lets a small hydrogen addition dominate.

    References
    ----------
    Law, C.K., Kwon, O.C., "Effects of hydrocarbon substitution on atmospheric hydrogen-air
    flame propagation", Int. J. Hydrogen Energy 29 (2004) 867-879.
    Law, C.K., Jomaas, G., Bechtold, J.K., "Cellular instabilities of expanding hydrogen/propane
    spherical flames at elevated pressures", Proc. Combust. Inst. 30 (2005) 159-167.

    >>> round(blend_lewis_number_heat_release([0.3, 0.96], [1.0, 3.0]), 3)
    0.795
    """
    le = np.asarray(lewis_numbers, dtype=float)
    q = np.asarray(heat_release_weights, dtype=float)
    return float(1.0 + np.sum(q * (le - 1.0)) / np.sum(q))


def effective_lewis_number(lewis_excess: Real, lewis_deficient: Real, zeldovich: Real,
                           mixture_strength: Real) -> Real:
    """Effective Lewis number of a two-reactant premixed flame [-].

    Le_eff = 1 + ((Le_E - 1) + (Le_D - 1) A) / (1 + A),   A = 1 + Ze (Phi - 1)

    Parameters
    ----------
    lewis_excess, lewis_deficient : Lewis numbers of the excess and the deficient reactant
        [-] (lean: oxygen and fuel; rich: fuel and oxygen)
    zeldovich : Zeldovich number Ze [-]
    mixture_strength : Phi >= 1, the mass ratio of excess to deficient reactant over its
        stoichiometric value: 1/phi lean, phi rich

    Notes
    -----
    Away from stoichiometry the deficient reactant dominates (A grows with Ze (Phi - 1));
    at phi = 1 Le_eff is the mean of the two. Large-activation-energy theory of
    Matalon, Cui & Bechtold (2003) and Bechtold & Matalon (2001); restated here from
    memory and from two public implementations, not from the papers' pages.

    References
    ----------
    Matalon, M., Cui, C., Bechtold, J.K., "Hydrodynamic theory of premixed flames: effects of
    stoichiometry, variable transport coefficients and arbitrary reaction orders", J. Fluid
    Mech. 487 (2003) 179-210.
    Bechtold, J.K., Matalon, M., "The dependence of the Markstein length on stoichiometry",
    Combust. Flame 127 (2001) 1906-1913.

    >>> round(effective_lewis_number(1.1, 0.3, 10.0, 1.0), 3)      # phi = 1: the mean
    0.7
    >>> round(effective_lewis_number(1.1, 0.3, 10.0, 2.0), 3)   # phi = 0.5: near Le_fuel
    0.367
    """
    A = 1.0 + zeldovich * (mixture_strength - 1.0)
    return 1.0 + ((lewis_excess - 1.0) + (lewis_deficient - 1.0) * A) / (1.0 + A)


def zeldovich_number(mass_burning_rates_kg_m2_s: npt.ArrayLike, flame_temperatures_K: npt.ArrayLike,
                     unburned_temperature_K: float,
                     flame_temperature_K: float) -> float:
    """Zeldovich number from how the mass burning rate follows the flame temperature [-].

    E_a / R = -2 d ln(m) / d(1/T_ad),   Ze = (E_a / R) (T_ad - T_u) / T_ad^2

    Parameters
    ----------
    mass_burning_rates_kg_m2_s : m = rho_u S_L of two or more flames at the same phi, p
        and T_u, their T_ad moved by a small change of inert dilution [kg/(m^2 s)]
    flame_temperatures_K : their adiabatic flame temperatures [K]
    unburned_temperature_K : T_u [K]
    flame_temperature_K : T_ad of the flame Ze is wanted for [K]

    Notes
    -----
    The slope d ln m / d(1/T_ad) is the least-squares slope through the flames (with two
    flames either side of the base flame it is the central difference). The factor 2
    comes from m ~ exp(-E_a / (2 R T_ad)) of large-activation-energy theory. Method of
    Egolfopoulos & Law (1990) as used by Sun, Sung, He & Law (1999).

    References
    ----------
    Egolfopoulos, F.N., Law, C.K., "Chain mechanisms in the overall reaction orders in laminar
    flame propagation", Combust. Flame 80 (1990) 7-16.
    Sun, C.J., Sung, C.J., He, L., Law, C.K., "Dynamics of weakly stretched flames: quantitative
    description and extraction of global flame parameters", Combust. Flame 118 (1999) 108-128.

    >>> m = [0.3 * math.exp(-10000 / x) for x in (2100.0, 2150.0)]   # E_a/R = 20,000 K
    >>> round(zeldovich_number(m, [2100.0, 2150.0], 300.0, 2125.0), 2)
    8.08
    """
    y = np.log(np.asarray(mass_burning_rates_kg_m2_s, dtype=float))
    x = 1.0 / np.asarray(flame_temperatures_K, dtype=float)
    slope = np.polyfit(x, y, 1)[0]
    activation_K = -2.0 * slope
    return float(activation_K * (flame_temperature_K - unburned_temperature_K) / flame_temperature_K ** 2)


def _expansion_integral(sigma: Real) -> Real:
    """int_0^(sigma-1) ln(1 + x) / x dx [-], which is -Li2(1 - sigma), the dilogarithm; SciPy's
    ``spence(z)`` is Li2(1 - z), so the integral is -spence(sigma).

    >>> round(_expansion_integral(7.5), 6)   # the integral by quadrature: 3.248454
    3.248454
    """
    from scipy.special import spence  # here, not at import: workers load this module without SciPy

    out = -spence(sigma)
    return float(out) if np.ndim(out) == 0 else out


def markstein_number_unburned(expansion_ratio: Real, zeldovich: Real, lewis_effective: Real) -> Real:
    """Markstein number relative to the unburned gas, of the hydrodynamic theory [-].

    Ma_u = sigma ln(sigma) / (sigma - 1)
           + Ze (Le_eff - 1) / (2 (sigma - 1)) * int_0^(sigma-1) ln(1 + x) / x dx

    Parameters
    ----------
    expansion_ratio : sigma = rho_u / rho_b [-]
    zeldovich : Ze [-]
    lewis_effective : Le_eff [-]

    Notes
    -----
    Flame speed relative to the unburned gas S_u = S_L - L_u K with Markstein length
    L_u = Ma_u delta and delta = alpha_u / S_L (thermal conductivity taken constant
    through the flame). Ma_u < 0 (possible only with Le_eff < 1): stretch speeds the flame
    up, the flame is thermodiffusively unstable. Clavin & Williams (1982), Matalon &
    Matkowsky (1982); the form restated in Poinsot & Veynante (2005), eq. 2.110 (from
    memory). Measured Markstein numbers depend on the flame geometry and the reference
    surface: compare signs and trends, not values.

    References
    ----------
    Clavin, P., Williams, F.A., "Effects of molecular diffusion and of thermal expansion on
    the structure and dynamics of premixed flames in turbulent flows of large scale and low
    intensity", J. Fluid Mech. 116 (1982) 251-282.
    Matalon, M., Matkowsky, B.J., "Flames as gasdynamic discontinuities", J. Fluid Mech. 124
    (1982) 239-259.

    >>> round(markstein_number_unburned(7.0, 0.0, 1.0), 3)    # sigma ln sigma / (sigma - 1)
    2.27
    """
    s = expansion_ratio
    return s * log(s) / (s - 1.0) + zeldovich * (lewis_effective - 1.0) / (2.0 * (s - 1.0)) * \
        _expansion_integral(s)


def thermodiffusive_regime(zeldovich: Real, lewis_effective: Real) -> str | np.ndarray:
    """'cellular', 'stable' or 'pulsating' by the reduced Lewis number l = Ze (Le_eff - 1) (an
    array of them for arrays).

    Cellular (thermodiffusive) instability for l < -2, pulsating for l > 4 (1 + sqrt 3),
    Sivashinsky (1977), near-equidiffusional constant-density limit. Thermal expansion adds
    the hydrodynamic (Darrieus-Landau) instability to every flame; it wrinkles large flames
    regardless of l and grows with the expansion ratio and with pressure (thinner flames).

    References
    ----------
    Sivashinsky, G.I., "Diffusional-thermal theory of cellular flames", Combust. Sci. Technol.
    15 (1977) 137-146.

    >>> thermodiffusive_regime(10.0, 0.5), thermodiffusive_regime(10.0, 1.0), thermodiffusive_regime(10.0, 2.2)
    ('cellular', 'stable', 'pulsating')
    """
    reduced = zeldovich * (lewis_effective - 1.0)
    out = np.where(reduced < CELLULAR_THRESHOLD, "cellular", np.where(reduced > PULSATING_THRESHOLD, "pulsating",
                                                                        "stable"))
    return str(out) if out.ndim == 0 else out
