"""A lean premixer's turbulent answers: turbulent flame speed, core and boundary-layer flashback, blowout.

duct_turbulence              u', integral length and Reynolds number of a duct when the user gives none
zimont_flame_speed           S_T = A u' Da^(1/4) (Zimont's turbulent flame speed closure)
schmid_flame_speed           S_T = S_L + u' (1 + Da^-2)^(-1/4) (Schmid, Habisreuther & Leuckel)
muppala_flame_speed          S_T/S_L = 1 + (0.46/Le) Re_t^0.25 (u'/S_L)^0.3 (p/p0)^0.2 (Muppala et al.)
bradley_flame_speed          S_T/u' = 0.88 (K Le)^-0.3 (Bradley, Lau & Lawes)
leading_point_flame_speed    a correlation evaluated on the strongest strained-flame consumption speed
core_flashback_margin        bulk (core) velocity over S_T
darcy_friction_factor        Churchill's friction factor, laminar through turbulent in one formula
wall_velocity_gradient       tau_w / mu of a fully developed duct flow, laminar through turbulent
boundary_layer_flashback     wall gradient over the critical-gradient model's g_c, and where it holds
extinction_damkohler         Da_ext = kappa_ext d / U_edge (blowout of a stabilized flame)
lean_blowout_margin          Da_ext over its critical value

Every correlation returns its value together with whether the point lies inside the range of
the data its constants were fitted on, and if not, why (``FlameSpeed``, ``Margin``): outside
its range a correlation still gives a number (for charts and trends), never silently.

Where the constants come from: the working note docs/research/premixer-sources.md says for
each whether it was read in a source, checked against a public implementation, derived, or is
from memory; the docstrings say the same in short. Turbulent correlations are fits with wide
scatter; a premixer fails at local features no one-dimensional model sees (wakes, recirculation,
hot spots), and is judged finally by test.

Pure functions of SI inputs; scalars (``float``) unless a docstring says it broadcasts. The
flame-speed correlations design reads out have a form for arrays too (``zimont_flame_speeds``,
``muppala_flame_speeds``, ``leading_point_flame_speeds``: ``FlameSpeeds``, one value and reason
per element, the scalar form one element of it). A study with [premixer] and a [burner] reads
them out in design.turbulent_speed_columns (all points at once) and design.premixer_margins
(issue 30).
"""
from __future__ import annotations

import math
from typing import Literal, NamedTuple

import numpy as np
import numpy.typing as npt

from .elementwise import Real, exp, power
from .turbulence import BROKEN_REACTION_ZONES_KA, damkohler, karlovitz
from .validity import LAMINAR_REYNOLDS, TURBULENT_REYNOLDS


class FlameSpeed(NamedTuple):
    """A turbulent flame speed and whether its correlation was fitted on data like this point."""

    S_T_m_s: float
    in_range: bool
    why: str  # '' in range; else each reason, '; '-joined


class FlameSpeeds(NamedTuple):
    """Turbulent flame speeds of many points (arrays in, arrays out) and, per point, why its
    correlation was not fitted on data like it ('' in range; else each reason, '; '-joined)."""

    S_T_m_s: np.ndarray
    why: list[str]


def _one(speeds: FlameSpeeds) -> FlameSpeed:
    """The :class:`FlameSpeed` of a one-element :class:`FlameSpeeds`."""
    return FlameSpeed(float(speeds.S_T_m_s[0]), not speeds.why[0], speeds.why[0])


def _arrays(*values: npt.ArrayLike) -> list[np.ndarray]:
    """Numbers or arrays as float arrays of one common shape, at least one-dimensional."""
    return list(np.broadcast_arrays(*(np.atleast_1d(np.asarray(v, dtype=float)) for v in values)))


def _reasons(n: int, checks: list[tuple[np.ndarray, list[str]]]) -> list[str]:
    """Per element of ``n``, the '; '-joined texts of the checks that fail there: each check is
    (where it fails, its text per element)."""
    out: list[list[str]] = [[] for _ in range(n)]
    for fails, texts in checks:
        for i in np.flatnonzero(fails).tolist():
            out[i].append(texts[i])
    return ["; ".join(parts) for parts in out]


class Margin(NamedTuple):
    """A margin (the quantity over its critical value, >1 safe) and whether its model holds here."""

    value: float
    in_range: bool
    why: str


class DuctTurbulence(NamedTuple):
    u_prime_m_s: Real
    integral_length_m: float
    reynolds: Real


def _speed(value: float, reasons: list[str]) -> FlameSpeed:
    return FlameSpeed(float(value), not reasons, "; ".join(reasons))


# --- the premixer's turbulence -------------------------------------------------------------------

#: Turbulence intensity u'/U of fully developed duct flow, I = 0.16 Re^(-1/8): the usual
#: estimate of a CFD inlet (common practice without source). It knows nothing of swirlers or
#: grids upstream: give measured values where there are any.
DUCT_INTENSITY_COEFFICIENT = 0.16
DUCT_INTENSITY_EXPONENT = -0.125
#: Integral length of fully developed duct flow, 0.07 D_h (the mixing length's largest value
#: over the radius, taken as the energy-containing eddy size; common practice without source).
DUCT_LENGTH_FRACTION = 0.07


def duct_turbulence(U_bulk_m_s: Real, D_h_m: float, nu_u_m2_s: Real) -> DuctTurbulence:
    """Turbulence of a premixer's duct when the user gives none: u', l_t and Re.

    Re = U D_h / nu, u' = 0.16 Re^(-1/8) U, l_t = 0.07 D_h: both fractions are common
    practice without source (the usual estimates for a CFD inlet in fully developed duct
    flow), not measurements; they say nothing of a swirler's turbulence. Numbers or arrays of
    velocities and viscosities alike.

    Parameters
    ----------
    U_bulk_m_s : bulk velocity in the duct [m/s]
    D_h_m : hydraulic diameter (4 area / wetted perimeter; the gap's double for an annulus) [m]
    nu_u_m2_s : kinematic viscosity of the fresh mixture [m^2/s]

    Returns
    -------
    DuctTurbulence(u_prime_m_s, integral_length_m, reynolds)

    >>> t = duct_turbulence(40.0, 0.025, 4.0e-5)   # 700 K fresh mixture: Re = 25,000
    >>> round(t.u_prime_m_s, 2), round(t.integral_length_m * 1e3, 2), round(t.reynolds)
    (1.8, 1.75, 25000)
    """
    Re = U_bulk_m_s * D_h_m / nu_u_m2_s
    intensity = DUCT_INTENSITY_COEFFICIENT * power(Re, DUCT_INTENSITY_EXPONENT)
    return DuctTurbulence(intensity * U_bulk_m_s, DUCT_LENGTH_FRACTION * D_h_m, Re)


# --- turbulent flame speed -----------------------------------------------------------------------

#: Zimont's constant A (Zimont & Lipatnikov 1995, from memory; the default of a public
#: implementation's example, flameFoam, read 2026-12-05). Some use 0.5.
ZIMONT_A = 0.52


def zimont_flame_speed(u_prime_m_s: float, l_t_m: float, S_L_m_s: float, alpha_u_m2_s: float,
                       A: float = ZIMONT_A) -> FlameSpeed:
    """Turbulent flame speed of Zimont's closure, S_T = A u' Da^(1/4) [m/s].

    S_T = A u'^(3/4) S_L^(1/2) alpha_u^(-1/4) l_t^(1/4), i.e. A u' Da^(1/4) with
    Da = (l_t/u') / (alpha_u/S_L^2). No Lewis number: it does not carry hydrogen's
    response to stretch (use ``leading_point_flame_speed`` for that).

    Parameters
    ----------
    u_prime_m_s : rms velocity fluctuation u' [m/s]
    l_t_m : integral length l_t [m] (from k-epsilon, Zimont's l_t = 0.37 u'^3/epsilon)
    S_L_m_s : laminar flame speed [m/s]
    alpha_u_m2_s : thermal diffusivity of the fresh mixture [m^2/s]
    A : the model constant [-]

    Notes
    -----
    Range (Zimont 2000, from memory; a secondary text read 2026-12-05 states the same
    conditions): intense turbulence, u' > S_L; large eddies slower than the flame, Da > 1;
    the smallest eddies inside the preheat zone, Ka > 1 (thin reaction zones). Outside, the
    value is given with ``in_range`` False.

    References
    ----------
    Zimont, V.L., "Gas premixed combustion at high turbulence. Turbulent flame closure
    combustion model", Exp. Therm. Fluid Sci. 21 (2000) 179-186 (from memory).
    Zimont, V., Polifke, W., Bettelini, M., Weisenstein, W., "An efficient computational
    model for premixed turbulent combustion at high Reynolds numbers based on a turbulent
    flame speed closure", J. Eng. Gas Turbines Power 120 (1998) 526-532 (from memory).

    >>> r = zimont_flame_speed(2.0, 0.01, 0.4, 2.0e-5)   # Da = 40, Ka = 0.79: corrugated flamelets
    >>> round(r.S_T_m_s, 3), r.in_range, r.why
    (2.615, False, 'Ka 0.791 < 1 (small eddies outside the flame)')
    """
    return _one(zimont_flame_speeds(u_prime_m_s, l_t_m, S_L_m_s, alpha_u_m2_s, A))


def zimont_flame_speeds(u_prime_m_s: npt.ArrayLike, l_t_m: npt.ArrayLike, S_L_m_s: npt.ArrayLike,
                        alpha_u_m2_s: npt.ArrayLike, A: float = ZIMONT_A) -> FlameSpeeds:
    """:func:`zimont_flame_speed` of many points at once (arrays broadcast).

    >>> r = zimont_flame_speeds([2.0, 8.0], 0.01, 0.4, 2.0e-5)
    >>> r.S_T_m_s.round(3).tolist(), r.why[1]
    ([2.615, 7.398], '')
    """
    u, l_t, S_L, alpha = _arrays(u_prime_m_s, l_t_m, S_L_m_s, alpha_u_m2_s)
    l_F = alpha / S_L
    Da, Ka = damkohler(u, l_t, S_L, l_F), karlovitz(u, l_t, S_L, l_F)
    ratio = u / S_L
    why = _reasons(len(u), [(u < S_L, [f"u'/S_L {x:.3g} < 1 (weak turbulence)" for x in ratio.tolist()]),
                            (Da < 1.0, [f"Da {x:.3g} < 1 (distributed burning)" for x in Da.tolist()]),
                            (Ka < 1.0, [f"Ka {x:.3g} < 1 (small eddies outside the flame)" for x in Ka.tolist()])])
    return FlameSpeeds(A * u * power(Da, 0.25), why)


def schmid_flame_speed(u_prime_m_s: float, l_t_m: float, S_L_m_s: float, alpha_u_m2_s: float) -> FlameSpeed:
    """Turbulent flame speed of Schmid, Habisreuther & Leuckel, S_T = S_L + u' (1 + Da^-2)^(-1/4) [m/s].

    Joins Damkoehler's two limits: for Da >> 1, S_T - S_L -> u' (wrinkled flamelets); for
    Da << 1, S_T - S_L -> u' Da^(1/2) = (u' l_t S_L / l_F)^(1/2) (distributed burning).
    Da = (l_t/u') / (l_F/S_L), l_F = alpha_u/S_L. No Lewis number.

    Parameters
    ----------
    u_prime_m_s, l_t_m, S_L_m_s, alpha_u_m2_s : as ``zimont_flame_speed``

    Notes
    -----
    Form and Da definition from memory (not checked against the paper). The paper's fitted
    range was not read: ``in_range`` is True where the flamelet picture the form assumes
    holds, turbulence present (Re_t >= 1) and below broken reaction zones (Ka < 100) - a
    range we set, not the paper's.

    References
    ----------
    Schmid, H.-P., Habisreuther, P., Leuckel, W., "A model for calculating heat release in
    premixed turbulent flames", Combust. Flame 113 (1998) 79-91 (from memory).

    >>> r = schmid_flame_speed(2.0, 0.01, 0.4, 2.0e-5)
    >>> round(r.S_T_m_s, 3), r.in_range
    (2.4, True)
    """
    return _one(schmid_flame_speeds(u_prime_m_s, l_t_m, S_L_m_s, alpha_u_m2_s))


def schmid_flame_speeds(u_prime_m_s: npt.ArrayLike, l_t_m: npt.ArrayLike, S_L_m_s: npt.ArrayLike,
                        alpha_u_m2_s: npt.ArrayLike) -> FlameSpeeds:
    """:func:`schmid_flame_speed` of many points at once (arrays broadcast).

    >>> schmid_flame_speeds([2.0, 4.0], 0.01, 0.4, 2.0e-5).S_T_m_s.round(3).tolist()
    [2.4, 4.398]
    """
    u, l_t, S_L, alpha = _arrays(u_prime_m_s, l_t_m, S_L_m_s, alpha_u_m2_s)
    l_F = alpha / S_L
    Da, Ka = damkohler(u, l_t, S_L, l_F), karlovitz(u, l_t, S_L, l_F)
    Re_t = u * l_t / (S_L * l_F)
    why = _reasons(len(u), [(u * l_t < S_L * l_F, [f"Re_t {x:.3g} < 1 (no turbulence)" for x in Re_t.tolist()]),
                            (Ka >= BROKEN_REACTION_ZONES_KA,
                             [f"Ka {x:.3g} >= {BROKEN_REACTION_ZONES_KA:g} (broken reaction zones)" for x in Ka.tolist()])])
    return FlameSpeeds(S_L + u * power(1.0 + power(Da, -2), -0.25), why)


#: Muppala et al. (2005): fitted on the high-pressure Bunsen flames of Kobayashi et al.
#: (methane, ethylene, propane; 0.1-1.0 MPa, the title's "pressures up to 1.0 MPa"). The Lewis
#: numbers of those fuels (deficient reactant, about 0.9-2) and the span of u'/S_L (about 1-30)
#: are from memory.
MUPPALA_PRESSURE_PA = (1.0e5, 1.0e6)
MUPPALA_LEWIS = (0.9, 2.0)
MUPPALA_TURBULENCE_RATIO = (1.0, 30.0)
#: The reference pressure p0 = 0.1 MPa of the (p/p0)^0.2 factor.
MUPPALA_REFERENCE_PRESSURE_PA = 1.0e5


def muppala_flame_speed(u_prime_m_s: float, l_t_m: float, S_L_m_s: float, nu_u_m2_s: float, lewis: float,
                        pressure_Pa: float, lewis_form: Literal["inverse", "exponential"] = "inverse") -> FlameSpeed:
    """Turbulent flame speed of Muppala et al.'s algebraic closure, with the Lewis number [m/s].

    S_T / S_L = 1 + (0.46 / Le) Re_t^0.25 (u'/S_L)^0.3 (p/p0)^0.2,  Re_t = u' l_t / nu_u,
    p0 = 0.1 MPa. With ``lewis_form="exponential"`` the factor 1/Le becomes exp(-(Le - 1)),
    the effective-Lewis-number form of Dinkelacker, Manickam & Muppala (2011) for
    methane-hydrogen blends (from memory). A Lewis number below one (hydrogen) raises S_T:
    this correlation carries hydrogen's response to stretch, coarsely.

    Parameters
    ----------
    u_prime_m_s, l_t_m, S_L_m_s : as ``zimont_flame_speed``
    nu_u_m2_s : kinematic viscosity of the fresh mixture [m^2/s]
    lewis : Lewis number of the deficient reactant (Muppala 2005) or the effective Lewis
        number (Dinkelacker et al. 2011) [-]
    pressure_Pa : pressure [Pa]
    lewis_form : "inverse" (1/Le, Muppala 2005) or "exponential" (exp(1 - Le), Dinkelacker 2011)

    Notes
    -----
    Constants 0.46, 0.25, 0.3, 0.2 and p0 = 0.1 MPa: from memory, and the same in a public
    implementation read 2026-12-05 (a test case of the SU2 suite). Range: MUPPALA_PRESSURE_PA,
    MUPPALA_LEWIS (for both forms: the range of Dinkelacker et al.'s blends was not read),
    MUPPALA_TURBULENCE_RATIO.

    References
    ----------
    Muppala, S.P.R., Aluri, N.K., Dinkelacker, F., Leipertz, A., "Development of an algebraic
    reaction rate closure for the numerical calculation of turbulent premixed methane, ethylene,
    and propane/air flames for pressures up to 1.0 MPa", Combust. Flame 140 (2005) 257-266.
    Dinkelacker, F., Manickam, B., Muppala, S.P.R., "Modelling and simulation of lean premixed
    turbulent methane/hydrogen/air flames with an effective Lewis number approach", Combust.
    Flame 158 (2011) 1742-1749.

    >>> r = muppala_flame_speed(2.0, 0.01, 0.4, 1.5e-5, 1.0, 5.0e5)   # Re_t = 1333
    >>> round(r.S_T_m_s, 3), r.in_range
    (2.886, True)
    """
    return _one(muppala_flame_speeds(u_prime_m_s, l_t_m, S_L_m_s, nu_u_m2_s, lewis, pressure_Pa, lewis_form))


def muppala_flame_speeds(u_prime_m_s: npt.ArrayLike, l_t_m: npt.ArrayLike, S_L_m_s: npt.ArrayLike,
                         nu_u_m2_s: npt.ArrayLike, lewis: npt.ArrayLike, pressure_Pa: npt.ArrayLike,
                         lewis_form: Literal["inverse", "exponential"] = "inverse") -> FlameSpeeds:
    """:func:`muppala_flame_speed` of many points at once (arrays broadcast).

    >>> muppala_flame_speeds(2.0, 0.01, 0.4, 1.5e-5, [1.0, 0.5], 5.0e5).S_T_m_s.round(3).tolist()
    [2.886, 5.372]
    """
    u, l_t, S_L, nu, le, p = _arrays(u_prime_m_s, l_t_m, S_L_m_s, nu_u_m2_s, lewis, pressure_Pa)
    Re_t = u * l_t / nu
    ratio = u / S_L
    factor = 1.0 / le if lewis_form == "inverse" else exp(-(le - 1.0))
    growth = 0.46 * factor * power(Re_t, 0.25) * power(ratio, 0.3) * power(p / MUPPALA_REFERENCE_PRESSURE_PA, 0.2)
    (p_lo, p_hi), (le_lo, le_hi), (r_lo, r_hi) = MUPPALA_PRESSURE_PA, MUPPALA_LEWIS, MUPPALA_TURBULENCE_RATIO
    why = _reasons(len(u), [
        (~((p_lo <= p) & (p <= p_hi)),
         [f"p {x / 1e6:.3g} MPa outside {p_lo / 1e6:g}-{p_hi / 1e6:g} MPa" for x in p.tolist()]),
        (~((le_lo <= le) & (le <= le_hi)),
         [f"Le {x:.3g} outside {le_lo:g}-{le_hi:g} (methane, ethylene, propane)" for x in le.tolist()]),
        (~((r_lo <= ratio) & (ratio <= r_hi)), [f"u'/S_L {x:.3g} outside {r_lo:g}-{r_hi:g}" for x in ratio.tolist()])])
    return FlameSpeeds(S_L * (1.0 + growth), why)


#: Bradley, Lau & Lawes (1992): fitted on fan-stirred bomb explosions (about 1650 burning
#: velocities of many fuels including hydrogen, Abdel-Gayed et al. 1987) over
#: 0.01 <= K Le <= 0.63 (from memory).
BRADLEY_KLE = (0.01, 0.63)


def bradley_flame_speed(u_prime_m_s: float, l_t_m: float, S_L_m_s: float, nu_u_m2_s: float,
                        lewis: float) -> FlameSpeed:
    """Turbulent burning velocity of Bradley, Lau & Lawes, S_T = 0.88 u' (K Le)^-0.3 [m/s].

    K = 0.157 (u'/S_L)^2 R_l^(-1/2) is their Karlovitz stretch factor, R_l = u' l_t / nu_u the
    turbulent Reynolds number on the integral length. Le < 1 (hydrogen) raises S_T: a
    Lewis-number correlation fitted on data that include hydrogen (from memory).

    Parameters
    ----------
    u_prime_m_s, l_t_m, S_L_m_s, nu_u_m2_s : as ``muppala_flame_speed``
    lewis : Lewis number of the mixture (of the deficient reactant) [-]

    Notes
    -----
    Constants 0.88, 0.157 and -0.3 from memory, and the same in a public implementation read
    2026-12-05 (flameFoam's Bradley model). Range BRADLEY_KLE (from memory); for K Le above it
    flames quench locally and S_T falls below the fit.

    References
    ----------
    Bradley, D., Lau, A.K.C., Lawes, M., "Flame stretch rate as a determinant of turbulent
    burning velocity", Phil. Trans. R. Soc. Lond. A 338 (1992) 359-387 (from memory).
    Abdel-Gayed, R.G., Bradley, D., Lawes, M., "Turbulent burning velocities: a general
    correlation in terms of straining rates", Proc. R. Soc. Lond. A 414 (1987) 389-413 (from memory).

    >>> r = bradley_flame_speed(2.0, 0.01, 0.4, 1.5e-5, 1.0)   # K = 0.107
    >>> round(r.S_T_m_s, 3), r.in_range
    (3.436, True)
    """
    R_l = u_prime_m_s * l_t_m / nu_u_m2_s
    K = 0.157 * (u_prime_m_s / S_L_m_s) ** 2 / math.sqrt(R_l)
    lo, hi = BRADLEY_KLE
    reasons = [] if lo <= K * lewis <= hi else [f"K Le {K * lewis:.3g} outside {lo:g}-{hi:g}"]
    return _speed(0.88 * u_prime_m_s * (K * lewis) ** -0.3, reasons)


def leading_point_flame_speed(u_prime_m_s: float, l_t_m: float, S_c_max_m_s: float, alpha_u_m2_s: float,
                              base: Literal["schmid", "zimont"] = "schmid") -> FlameSpeed:
    """A turbulent flame speed on the leading points: ``base`` evaluated with S_L -> S_c,max [m/s].

    The leading-point idea (Kuznetsov & Sabelnikov; reviewed by Lipatnikov & Chomiak 2005):
    a turbulent flame is pulled by its most advanced, most strongly stretched bulges, so its
    speed scales with the largest consumption speed a strained laminar flame of the mixture
    reaches, S_c,max, not with S_L. For Le_eff < 1 (lean hydrogen) S_c,max exceeds S_L by
    a factor that grows with pressure; for Le_eff >= 1, S_c,max is about S_L and this is the
    base correlation. The base's flame thickness is taken as alpha_u / S_c,max too.

    Parameters
    ----------
    u_prime_m_s, l_t_m, alpha_u_m2_s : as ``zimont_flame_speed``
    S_c_max_m_s : the strongest consumption speed along the strained-flame ladder [m/s]
    base : "schmid" or "zimont" (correlations without a Lewis number; one with a Lewis number
        would count the stretch response twice)

    Notes
    -----
    The substitution is the published idea; that it holds with these base correlations, and
    with flamecharts' twin counterflow flames (Venkateswaran et al. took S_L,max from a
    differently configured strained flame, from memory), is not verified. Range: the base's,
    at S_c,max.

    References
    ----------
    Kuznetsov, V.R., Sabelnikov, V.A., Turbulence and Combustion, Hemisphere, New York, 1990
    (from memory).
    Lipatnikov, A.N., Chomiak, J., "Molecular transport effects on turbulent flame propagation
    and structure", Prog. Energy Combust. Sci. 31 (2005) 1-73 (from memory).
    Venkateswaran, P., Marshall, A., Seitzman, J., Lieuwen, T., "Scaling turbulent flame speeds
    of negative Markstein length fuel blends using leading points concepts", Combust. Flame
    162 (2015) 375-387 (from memory).

    >>> r = leading_point_flame_speed(2.0, 0.01, 0.8, 2.0e-5)   # S_c,max twice an S_L of 0.4
    >>> round(r.S_T_m_s, 3), r.in_range
    (2.8, True)
    """
    return _one(leading_point_flame_speeds(u_prime_m_s, l_t_m, S_c_max_m_s, alpha_u_m2_s, base))


def leading_point_flame_speeds(u_prime_m_s: npt.ArrayLike, l_t_m: npt.ArrayLike, S_c_max_m_s: npt.ArrayLike,
                               alpha_u_m2_s: npt.ArrayLike,
                               base: Literal["schmid", "zimont"] = "schmid") -> FlameSpeeds:
    """:func:`leading_point_flame_speed` of many points at once (arrays broadcast).

    >>> leading_point_flame_speeds(2.0, 0.01, [0.8, 0.4], 2.0e-5).S_T_m_s.round(3).tolist()
    [2.8, 2.4]
    """
    speeds = schmid_flame_speeds if base == "schmid" else zimont_flame_speeds
    return speeds(u_prime_m_s, l_t_m, S_c_max_m_s, alpha_u_m2_s)


def core_flashback_margin(U_core_m_s: npt.ArrayLike, S_T_m_s: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """Core-flow flashback margin U_core / S_T [-]; broadcasts.

    A turbulent flame can propagate upstream through the premixer's core where the flow is
    slower than it burns: margin < 1 means possible core flashback. The criterion is the
    definition of S_T as a propagation speed (textbook statement, e.g. Lieuwen, Unsteady
    Combustor Physics, 2012, from memory); its uncertainty is the S_T correlation's scatter.
    It does not see combustion-induced vortex breakdown of swirl flames, a separate mechanism.

    Parameters
    ----------
    U_core_m_s : bulk or core axial velocity [m/s]
    S_T_m_s : turbulent flame speed [m/s]

    >>> core_flashback_margin(40.0, [4.0, 16.0])
    array([10. ,  2.5])
    """
    return np.asarray(U_core_m_s, dtype=float) / np.asarray(S_T_m_s, dtype=float)


# --- boundary-layer flashback ----------------------------------------------------------------------

def darcy_friction_factor(reynolds: npt.ArrayLike, relative_roughness: float = 0.0) -> npt.NDArray[np.float64]:
    """Darcy friction factor of fully developed duct flow at any Reynolds number (Churchill 1977) [-].

    f = 8 [(8/Re)^12 + (A + B)^(-3/2)]^(1/12),
    A = [2.457 ln(1 / ((7/Re)^0.9 + 0.27 eps/D))]^16,  B = (37530/Re)^16.

    One smooth formula: 64/Re in laminar flow, within about 2 % of Colebrook's turbulent law
    from Re 4e3 upward (tests/test_premixer_physics.py), and an interpolation between them
    through transition (Re about 2300-4000, where no law holds: stated as such). Broadcasts.

    Parameters
    ----------
    reynolds : U D_h / nu [-]
    relative_roughness : wall roughness over hydraulic diameter eps/D [-] (0: smooth)

    Notes
    -----
    The formula as printed in three public implementations read 2026-12-05 (the original
    paper not read).

    References
    ----------
    Churchill, S.W., "Friction-factor equation spans all fluid-flow regimes", Chem. Eng.
    84(24) (1977) 91-92.

    >>> darcy_friction_factor([1000.0, 1.0e5]).round(5)
    array([0.064  , 0.01787])
    """
    Re = np.asarray(reynolds, dtype=float)
    A = (2.457 * np.log(1.0 / ((7.0 / Re) ** 0.9 + 0.27 * relative_roughness))) ** 16
    B = (37530.0 / Re) ** 16
    return 8.0 * ((8.0 / Re) ** 12 + (A + B) ** -1.5) ** (1.0 / 12.0)


def wall_velocity_gradient(U_bulk_m_s: npt.ArrayLike, D_h_m: float, nu_u_m2_s: float,
                           relative_roughness: float = 0.0) -> npt.NDArray[np.float64]:
    """Wall velocity gradient of fully developed duct flow, laminar through turbulent [1/s].

    g = tau_w / mu = u_tau^2 / nu = f U^2 / (8 nu), f from ``darcy_friction_factor``: exactly
    8 U / D in laminar round-pipe flow (f = 64/Re), the turbulent wall shear above Re about
    4000, and a smooth blend between (Churchill's interpolation of transition). The friction
    velocity is u_tau = U (f/8)^(1/2). Broadcasts over U.

    Parameters
    ----------
    U_bulk_m_s : bulk velocity [m/s]
    D_h_m : hydraulic diameter [m]
    nu_u_m2_s : kinematic viscosity of the fresh mixture [m^2/s]
    relative_roughness : eps/D_h [-]

    >>> round(float(wall_velocity_gradient(1.0, 0.01, 1.5e-5)))   # Re 667: laminar, 8 U / D
    800
    >>> round(float(wall_velocity_gradient(40.0, 0.025, 1.5e-5)) / 1e5, 2)   # Re 6.7e4: turbulent
    2.6
    """
    U = np.asarray(U_bulk_m_s, dtype=float)
    f = darcy_friction_factor(U * D_h_m / nu_u_m2_s, relative_roughness)
    return f * U * U / (8.0 * nu_u_m2_s)


def _transition_weight(reynolds: float) -> float:
    """0 below LAMINAR_REYNOLDS, 1 above TURBULENT_REYNOLDS, linear between (common practice
    without source, as physics.validity.transition_gradient)."""
    w = (reynolds - LAMINAR_REYNOLDS) / (TURBULENT_REYNOLDS - LAMINAR_REYNOLDS)
    return min(max(w, 0.0), 1.0)


def boundary_layer_flashback(U_bulk_m_s: float, D_h_m: float, nu_u_m2_s: float, S_m_s: float, alpha_u_m2_s: float,
                             flashback_peclet: float = 13.0, turbulent_flashback_peclet: float | None = None,
                             relative_roughness: float = 0.0) -> Margin:
    """Boundary-layer flashback margin of a duct: wall velocity gradient over the critical one [-].

    Critical-gradient model (Lewis & von Elbe; Peclet form of Putnam & Jensen): the flame
    enters the boundary layer where the flow at its penetration distance d_p = Pe_F alpha_u/S
    is slower than the flame, i.e. when g < g_c = S^2 / (Pe_F alpha_u). The wall gradient g is
    ``wall_velocity_gradient`` (u_tau^2 / nu, laminar through turbulent). Margin = g / g_c;
    below 1, flashback.

    Parameters
    ----------
    U_bulk_m_s, D_h_m, nu_u_m2_s, relative_roughness : the duct flow (``wall_velocity_gradient``)
    S_m_s : the flame speed of the model: S_L for the classical thermal model; the strongest
        strained consumption speed S_c,max for a stretch-sensitive mixture (Le_eff < 1: the
        leading-point reading, not validated against flashback data)
    alpha_u_m2_s : thermal diffusivity of the fresh mixture [m^2/s]
    flashback_peclet : Pe_F of laminar flow (default: physics.indicators' 13, derived from
        Lewis & von Elbe's laminar tube data)
    turbulent_flashback_peclet : Pe_F of turbulent flow, calibrated on your own premixer or
        a published turbulent data set; None: not set, and above Re 2300 the margin is given
        but not assessed. When set, g_c blends linearly in Re from the laminar to the turbulent
        value between Re 2300 and 4000 (common practice without source).

    Notes
    -----
    Turbulent, and above all confined, boundary-layer flashback (hydrogen flames in premixer
    ducts) happens at wall gradients the laminar Pe_F does not predict (Eichler, Baumgartner &
    Sattelmayer 2012, from memory); published models of it (Hoferichter, Hirsch & Sattelmayer
    2017: boundary-layer separation ahead of the flame tip) were not implementable from what
    could be read (docs/research/premixer-sources.md). Wall temperature is not seen: hot walls
    flash back earlier.

    >>> m = boundary_layer_flashback(1.0, 0.01, 1.5e-5, 0.37, 2.2e-5)   # laminar, methane-like
    >>> round(m.value, 2), m.in_range
    (1.67, True)
    >>> boundary_layer_flashback(40.0, 0.025, 1.5e-5, 0.37, 2.2e-5).why
    'Re 6.67e+04 > 2300 and no turbulent Pe_F given: Pe_F is fitted on laminar tube flashback'
    """
    g = float(wall_velocity_gradient(U_bulk_m_s, D_h_m, nu_u_m2_s, relative_roughness))
    Re = U_bulk_m_s * D_h_m / nu_u_m2_s
    g_laminar = S_m_s ** 2 / (flashback_peclet * alpha_u_m2_s)
    reasons = []
    if turbulent_flashback_peclet is None:
        g_c = g_laminar
        if Re > LAMINAR_REYNOLDS:
            reasons.append(f"Re {Re:.3g} > {LAMINAR_REYNOLDS:g} and no turbulent Pe_F given: "
                           "Pe_F is fitted on laminar tube flashback")
    else:
        w = _transition_weight(Re)
        g_c = (1.0 - w) * g_laminar + w * S_m_s ** 2 / (turbulent_flashback_peclet * alpha_u_m2_s)
    return Margin(g / g_c, not reasons, "; ".join(reasons))


# --- lean blowout ------------------------------------------------------------------------------

#: Critical extinction Damkoehler number of blowout: of order one (Shanbhogue, Husain & Lieuwen
#: 2009 review the Damkoehler correlations of bluff-body blowoff; from memory, with a scatter of
#: a factor 2-3 between data sets). Calibrate it on your own stabilizer where you can.
BLOWOUT_CRITICAL_DAMKOHLER = 1.0


def extinction_damkohler(kappa_ext_1_s: npt.ArrayLike, d_m: float, U_edge_m_s: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """Damkoehler number of blowout on the extinction strain rate, Da_ext = kappa_ext d / U_edge [-].

    The flow time d / U_edge of the shear layer behind a stabilizer of size d over the
    chemical time 1 / kappa_ext of a flame strained to extinction. Near blowoff the shear
    layers strain the flame beyond its extinction rate (Chaudhuri et al. 2010); lean blowout
    of hydrogen blends collapses on a Damkoehler number built on kappa_ext better than on
    S_L (Zhang et al. 2007, from memory), which is why hydrogen, whose kappa_ext is many times
    methane's at the same S_L, resists blowout. Broadcasts.

    Parameters
    ----------
    kappa_ext_1_s : extinction strain rate of the mixture [1/s] (flamecharts' twin flame)
    d_m : stabilizer size (bluff-body width) or a swirl flame's chosen length [m]
    U_edge_m_s : velocity past the stabilizer's edge [m/s] (physics.indicators.edge_velocity)

    References
    ----------
    Shanbhogue, S.J., Husain, S., Lieuwen, T., "Lean blowoff of bluff body stabilized flames:
    scaling and dynamics", Prog. Energy Combust. Sci. 35 (2009) 98-120.
    Chaudhuri, S., Kostka, S., Renfro, M.W., Cetegen, B.M., "Blowoff dynamics of bluff body
    stabilized turbulent premixed flames", Combust. Flame 157 (2010) 790-802.
    Zhang, Q., Noble, D.R., Meyers, A., Xu, K., Lieuwen, T., "Characterization of fuel
    composition effects in H2/CO/CH4 mixtures upon lean blowout", J. Eng. Gas Turbines Power
    129 (2007) 688-694 (from memory).

    >>> float(extinction_damkohler(2500.0, 0.02, 50.0))   # methane-like kappa_ext, 20 mm, 50 m/s
    1.0
    """
    return np.asarray(kappa_ext_1_s, dtype=float) * d_m / np.asarray(U_edge_m_s, dtype=float)


def lean_blowout_margin(damkohler_ext: npt.ArrayLike,
                        critical: float = BLOWOUT_CRITICAL_DAMKOHLER) -> npt.NDArray[np.float64]:
    """Lean blowout margin Da_ext / Da_ext,crit [-]: below 1, blowout. Broadcasts.

    ``critical`` defaults to BLOWOUT_CRITICAL_DAMKOHLER, of order one from memory: a margin
    near 1 says "near blowout" to within the factor 2-3 the reviewed data scatter by, no finer.

    >>> lean_blowout_margin([0.5, 4.0])
    array([0.5, 4. ])
    """
    return np.asarray(damkohler_ext, dtype=float) / critical
