"""Design indicators from a flame's speed and unburned properties: one pure function per method.

chemical_time                   tau_c = alpha_u / S_L^2
blint_thickness                 2 (alpha_u / S_L)(T_b / T_u)^0.7
flashback_critical_gradient     g_F = S_L^2 / (Pe_F alpha_u)
blowoff_critical_gradient       g_B = Ka_B S_L^2 / alpha_u
quenching_distance              d_q = Pe_q alpha_u / S_L (parallel plates)
tube_quenching_diameter         d_T = k_T d_q
bluff_body_blowoff_velocity     U_BO = C_BO D / tau_c (past the body's edge)
edge_velocity                   U / (1 - blockage)
wall_velocity_gradient_round    g = 8 U / D (fully developed laminar round port)
wall_velocity_gradient_slot     g = 6 U / h (fully developed laminar slot of gap h)
wall_velocity_gradient_turbulent  Blasius's wall shear over mu (turbulent smooth duct)
port_velocity_at_thermal_input  bulk port velocity for a thermal input

All inputs and outputs in SI units. All but edge_velocity take and give numbers or NumPy arrays
alike (design.annotate computes them for every point at once; powers through elementwise.power,
so an array gives each element the bits of a number). Constants that are not universal are parameters
with documented defaults (DEFAULTS); the study config may override each of them. Where
each constant holds (the data it was fitted on) is physics.validity's.
"""
from __future__ import annotations

from typing import Any

from .elementwise import Real, power

#: Default settings, each overridable in the study's [indicators] table.
#: Values are floats, or None where a setting has no default (Any: the defaults of the functions
#: below read them as floats).
DEFAULTS: dict[str, Any] = {
    # Flashback Peclet number of the critical-gradient model. Derived: for stoichiometric
    # methane-air this tool computes S_L^2/alpha_u = 6.3e3 1/s and for hydrogen-air
    # 1.2e5 1/s (GRI-Mech 3.0 / h2o2, 298 K, 1 atm); Lewis & von Elbe report critical
    # flashback gradients of about 400 1/s and of order 1e4 1/s for these mixtures (from
    # memory), which give Pe_F of 16 and about 12; 13 is their geometric mean, within 25 %
    # of both.
    "flashback_peclet": 13.0,
    # Reed (1967): g_B alpha_u / S_L^2 = 0.23 at blowoff of lean-to-stoichiometric port flames.
    "blowoff_karlovitz": 0.23,
    # Quench Peclet number d_q S_L / alpha_u between plates: about 40 (textbook practice,
    # e.g. Turns 2012; data 30-50).
    "quench_peclet": 40.0,
    # Tube quenching diameter / plate quenching distance: about 1.3-1.5 (Lewis & von Elbe;
    # from memory). 1.4 is the middle of that range.
    "tube_quench_factor": 1.4,
    # Bluff-body blowoff constant C_BO in U_BO = C_BO D / tau_c, U_BO the velocity past the body's
    # edge. There is no universal value: it depends on stabilizer shape, blockage, confinement and
    # turbulence (Shanbhogue, Husain & Lieuwen 2009). None: not set, and then no stabilizer
    # margin is assessed (physics.validity); set it from a blowoff test of your own stabilizer.
    "bluff_body_constant": None,
}


def chemical_time(alpha_u: Real, S_L: Real) -> Real:
    """Chemical (flame) time tau_c = alpha_u / S_L^2 [s].

    The transit time of the flame through its own diffusive thickness (Poinsot &
    Veynante, Theoretical and Numerical Combustion, 2nd ed., 2005, sec. 2.5); the
    time scale of Damkoehler-number blowoff correlations.

    Parameters
    ----------
    alpha_u : thermal diffusivity of the unburned mixture [m^2/s]
    S_L : laminar flame speed [m/s]

    Examples
    --------
    >>> round(chemical_time(2.2e-5, 0.37) * 1e3, 4)
    0.1607
    """
    return alpha_u / power(S_L, 2)


def blint_thickness(alpha_u: Real, S_L: Real, T_b: Real, T_u: Real) -> Real:
    """Blint's flame-thickness estimate 2 (alpha_u/S_L)(T_b/T_u)^0.7 [m].

    Blint, Combust. Sci. Technol. 49 (1986) 79, as given by Poinsot & Veynante 2005,
    eq. 2.75; an estimate of the thermal thickness from the diffusive one, within
    about 20 % for hydrocarbon-air flames.

    Parameters
    ----------
    alpha_u : unburned thermal diffusivity [m^2/s]
    S_L : laminar flame speed [m/s]
    T_b, T_u : burned and unburned temperatures [K]

    Examples
    --------
    >>> round(blint_thickness(2.2e-5, 0.37, 2220.0, 298.0) * 1e3, 3)
    0.485
    """
    return 2.0 * (alpha_u / S_L) * power(T_b / T_u, 0.7)


def flashback_critical_gradient(S_L: Real, alpha_u: Real, Pe_F: float = DEFAULTS["flashback_peclet"]) -> Real:
    """Critical wall velocity gradient for boundary-layer flashback g_F = S_L^2/(Pe_F alpha_u) [1/s].

    Lewis & von Elbe's critical-gradient concept (Combustion, Flames and Explosions of
    Gases, 3rd ed., 1987): a flame flashes back into a port when the flow's velocity
    gradient at the wall falls below g_F. The Peclet scaling g_F = S_L / d_p with the
    penetration distance d_p = Pe_F alpha_u / S_L is the form of Putnam & Jensen
    (Proc. 3rd Symp. on Combustion, 1949). Pe_F is a setting; its default is derived
    from critical-gradient data for methane-air and hydrogen-air (see DEFAULTS).

    Parameters
    ----------
    S_L : laminar flame speed [m/s]
    alpha_u : unburned thermal diffusivity [m^2/s]
    Pe_F : flashback Peclet number [-]

    Examples
    --------
    >>> round(flashback_critical_gradient(0.37, 2.2e-5))
    479
    """
    return power(S_L, 2) / (Pe_F * alpha_u)


def blowoff_critical_gradient(S_L: Real, alpha_u: Real, Ka_B: float = DEFAULTS["blowoff_karlovitz"]) -> Real:
    """Critical wall velocity gradient for blowoff of a port flame g_B = Ka_B S_L^2 / alpha_u [1/s].

    The flame-stretch (Karlovitz) criterion of Reed, Combust. Flame 11 (1967) 177:
    blowoff when g_B alpha_u / S_L^2 reaches about 0.23, for lean to stoichiometric
    mixtures. Rich port flames burn with secondary air and blow off later than this
    predicts: read it as a lower bound there.

    Parameters
    ----------
    S_L : laminar flame speed [m/s]
    alpha_u : unburned thermal diffusivity [m^2/s]
    Ka_B : critical Karlovitz number [-]

    Examples
    --------
    >>> round(blowoff_critical_gradient(0.37, 2.2e-5))
    1431
    """
    return Ka_B * power(S_L, 2) / alpha_u


def quenching_distance(alpha_u: Real, S_L: Real, Pe_q: float = DEFAULTS["quench_peclet"]) -> Real:
    """Quenching distance between parallel plates d_q = Pe_q alpha_u / S_L [m].

    A flame does not pass a gap narrower than d_q; the quench Peclet number is about 40
    (textbook practice: Turns, An Introduction to Combustion, 3rd ed., 2012, ch. 8;
    data 30-50).

    Examples
    --------
    >>> round(quenching_distance(2.2e-5, 0.37) * 1e3, 2)
    2.38
    """
    return Pe_q * alpha_u / S_L


def tube_quenching_diameter(d_q: Real, factor: float = DEFAULTS["tube_quench_factor"]) -> Real:
    """Quenching diameter of a round tube from the plate quenching distance, d_T = k d_q [m].

    Examples
    --------
    >>> round(tube_quenching_diameter(2.0e-3) * 1e3, 2)
    2.8
    """
    return factor * d_q


def bluff_body_blowoff_velocity(D: float, tau_c: Real, C_BO: float) -> Real:
    """Bluff-body blowoff velocity past the body's edge from Damkoehler scaling, U_BO = C_BO D / tau_c [m/s].

    Blowoff when the residence time in the recirculation zone (about D/U, U the velocity
    past the body's edge) falls to a fixed multiple of the chemical time (Zukoski & Marble, Proc. Gas Dynamics Symp.,
    1956; review: Shanbhogue, Husain & Lieuwen, Prog. Energy Combust. Sci. 35 (2009) 98).
    C_BO has no universal value; calibrate it for your stabilizer.

    Parameters
    ----------
    D : stabilizer size [m]
    tau_c : chemical time [s]
    C_BO : blowoff constant [-]

    Examples
    --------
    >>> round(bluff_body_blowoff_velocity(0.02, 1.6e-4, 1.0), 1)
    125.0
    """
    return C_BO * D / tau_c


def edge_velocity(U_approach: float, blockage: float) -> float:
    """Velocity past the edge of a bluff body [m/s]: the approach velocity over the open
    area fraction, U / (1 - B), B the area fraction of the duct the body blocks (continuity;
    the velocity of Zukoski-Marble blowoff correlations, Shanbhogue, Husain & Lieuwen 2009).

    >>> round(edge_velocity(45.0, 0.36), 2)
    70.31
    """
    return U_approach / (1.0 - blockage)


def wall_velocity_gradient_round(U: Real, D: float) -> Real:
    """Wall velocity gradient of fully developed laminar flow in a round port, g = 8 U / D [1/s].

    Exact for Poiseuille flow, u(r) = 2U(1 - (2r/D)^2).

    Examples
    --------
    >>> wall_velocity_gradient_round(2.0, 0.004)
    4000.0
    """
    return 8.0 * U / D


def wall_velocity_gradient_turbulent(U: Real, D_h: float, nu: Real) -> Real:
    """Wall velocity gradient of fully developed turbulent flow in a smooth duct [1/s].

    g = tau_w / mu = lambda U^2 / (8 nu) with Blasius's friction factor
    lambda = 0.3164 Re^-0.25, Re = U D_h / nu (Blasius 1913, Mitt. Forschungsarb.
    Ing.-Wes. 131; smooth pipes, within a few per cent of the Prandtl-Karman law for
    4e3 < Re < 1e5, about 10 % low at 1e6). U [m/s], hydraulic diameter D_h [m] (the
    diameter of a round port, twice the gap of a slot), nu [m^2/s]. Reported for turbulent
    ports; the laminar critical gradients are not assessed against it (physics.validity).

    Examples
    --------
    >>> round(wall_velocity_gradient_turbulent(40.0, 0.025, 6e-6))  # Re = 1.67e5
    521979
    """
    Re = U * D_h / nu
    return 0.3164 * power(Re, -0.25) * U * U / (8.0 * nu)


def wall_velocity_gradient_slot(U: Real, h: float) -> Real:
    """Wall velocity gradient of fully developed laminar flow in a slot of gap h, g = 6 U / h [1/s].

    Exact for plane Poiseuille flow, u(y) = 1.5U(1 - (2y/h)^2).

    Examples
    --------
    >>> wall_velocity_gradient_slot(1.0, 0.002)
    3000.0
    """
    return 6.0 * U / h


def port_velocity_at_thermal_input(Q: Real, LHV_mass: Real, afr_stoich_mass: Real, phi: Real, rho_u: Real,
                                   A_port: float) -> Real:
    """Bulk port velocity of a premixed burner at a given thermal input [m/s].

    Fuel mass flow Q / LHV; mixture mass flow fuel x (1 + AFR_st / phi); volume flow
    at the unburned state divided by the total port area. Adding hydrogen at fixed
    input lowers the mixture's heating value per volume, so the port velocity rises.

    Parameters
    ----------
    Q : thermal input on the lower heating value [W]
    LHV_mass : lower heating value of the fuel [J/kg]
    afr_stoich_mass : stoichiometric oxidizer-to-fuel mass ratio [-]
    phi : equivalence ratio [-]
    rho_u : density of the unburned mixture at the port [kg/m^3]
    A_port : total port area [m^2]

    Examples
    --------
    10 kW of methane (50.0 MJ/kg, AFR 17.1) at phi 1, rho 1.13 kg/m^3, 20 cm^2 of ports:

    >>> round(port_velocity_at_thermal_input(10e3, 50.0e6, 17.1, 1.0, 1.13, 2e-3), 3)
    1.602
    """
    m_fuel = Q / LHV_mass
    m_mix = m_fuel * (1.0 + afr_stoich_mass / phi)
    return m_mix / rho_u / A_port
