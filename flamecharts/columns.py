"""Every column a result leaves the code under, declared once: name, unit, meaning.

results.csv, results.nc, fuel_gases.csv, the design read-out and the charts all take
their column names from here. Names carry their unit (``pressure_bar``,
``laminar_flame_speed_m_s``); thickness columns are in mm because that is how burner
designers read them, every other quantity is SI.
"""
from __future__ import annotations

from .analyses import parts

#: The caution every output carries (README, report, charts, about.txt, results.nc).
CAUTION = ("Screening estimates from 1D laminar flame computations, not certification: follow local "
           "codes, the applicable appliance or gas-turbine standards and licensed engineering practice, "
           "and confirm every margin by test on the real hardware.")

#: The sweep axes, in the order of the study's cartesian product (outermost first)
#: and of the dimensions of results.nc.
AXES = ("fuel", "oxidizer", "blend_fraction", "pressure_bar", "unburned_temperature_K", "equivalence_ratio")

#: name -> (unit, long name). Unit "1" = dimensionless, "" = text or flag.
UNITS: dict[str, tuple[str, str]] = {
    "fuel": ("", "fuel (name in the study's [fuels])"),
    "oxidizer": ("", "oxidizer (name in the study's [oxidizers])"),
    "blend_with": ("", "blended gas (name in the study's [fuels])"),
    "blend_fraction": ("1", "mole fraction of the blended gas in the fuel stream"),
    "equivalence_ratio": ("1", "equivalence ratio"),
    "pressure_bar": ("bar", "pressure"),
    "unburned_temperature_K": ("K", "unburned (preheat) temperature"),
    "status": ("", "ok, no_flame, failed or pending"),
    "reason": ("", "why a point failed or gave no flame"),
    "laminar_flame_speed_m_s": ("m/s", "laminar flame speed"),
    "thermal_thickness_mm": ("mm", "thermal thickness (T_b - T_u) / max|dT/dx|"),
    "diffusive_thickness_mm": ("mm", "diffusive thickness lambda_u / (rho_u c_p,u S_L)"),
    "reaction_zone_thickness_mm": ("mm", "reaction-zone thickness (heat-release full width at half maximum)"),
    "adiabatic_flame_temperature_K": ("K", "burned temperature at the end of the domain"),
    "equilibrium_temperature_K": ("K", "HP equilibrium temperature of the unburned mixture"),
    "expansion_ratio": ("1", "unburned over burned density"),
    "unburned_density_kg_m3": ("kg/m3", "unburned density"),
    "unburned_thermal_diffusivity_m2_s": ("m2/s", "unburned thermal diffusivity"),
    "grid_points": ("1", "grid points of the final flame"),
    "flame_speed_numerical_error_percent": ("%", "grid error band of the flame speed: Roache's grid convergence "
                                                 "index from the flame on its grid, every 2nd and every 4th point"),
    "thermal_thickness_numerical_error_percent": ("%", "grid error band of the thermal thickness (same method)"),
    "grid_convergence": ("", "how the three grids converged: monotone, oscillating or two grids"),
    "solve_seconds": ("s", "wall time of the flame's solve"),
    "mechanism": ("", "reaction mechanism"),
    "mechanism_reduction": ("", "[reduction]: the skeletal mechanism the flames burn (species and reactions kept, "
                                "file) and its largest measured errors; empty without [reduction]"),
    "flame_speed_reduction_error_percent": ("%", "[reduction]: flame-speed error of the skeletal mechanism against "
                                                 "the detailed one, measured at this point where it was a "
                                                 "validation flame, else the largest over the validation flames"),
    "reduction_error_source": ("", "where the reduction band comes from: measured at this point, the largest of the "
                                   "validation flames, or not measured (ignition delays only)"),
    "reference_mechanism": ("", "the mechanism a comparison is made against (the first of the study's list)"),
    "reference_laminar_flame_speed_m_s": ("m/s", "laminar flame speed under the reference mechanism"),
    "reference_thermal_thickness_mm": ("mm", "thermal thickness under the reference mechanism"),
    "flame_speed_difference_percent": ("%", "flame speed under this mechanism over the reference's, minus 1"),
    "thermal_thickness_difference_percent": ("%", "thermal thickness under this mechanism over the reference's, "
                                                  "minus 1"),
    "flame_speed_difference_numerical_error_percent": ("%", "numerical error of the flame-speed difference: both "
                                                            "flames' grid bands combined in quadrature"),
    "reference_kinetic_uncertainty_percent": ("%", "the reference mechanism's kinetic band of the flame speed "
                                                   "(1 sigma) at the point"),
    "transport": ("", "transport model"),
    "thermal_diffusion": ("", "thermal diffusion (Soret effect) on"),
    "resolution": ("", "numerical resolution setting"),
    "start": ("", "warm (from a neighbour's profile) or fresh"),
    "message": ("", "solver message"),
    "fuel_mole_fractions": ("", "fuel-stream composition (JSON, mole fractions)"),
    "point_key": ("", "store key of the point"),
    "chemical_time_s": ("s", "chemical time alpha_u / S_L^2"),
    "blint_thickness_mm": ("mm", "Blint thickness 2 (alpha_u / S_L) (T_b / T_u)^0.7"),
    "flashback_critical_gradient_1_s": ("1/s", "critical velocity gradient for flashback"),
    "blowoff_critical_gradient_1_s": ("1/s", "critical velocity gradient for blowoff"),
    "quenching_distance_mm": ("mm", "parallel-plate quenching distance"),
    "tube_quenching_diameter_mm": ("mm", "tube quenching diameter"),
    "flame_speed_ratio": ("1", "flame speed over the reference fuel's"),
    "flashback_gradient_ratio": ("1", "flashback gradient over the reference fuel's"),
    "blowoff_gradient_ratio": ("1", "blowoff gradient over the reference fuel's"),
    "quenching_distance_ratio": ("1", "quenching distance over the reference fuel's"),
    "chemical_time_ratio": ("1", "chemical time over the reference fuel's"),
    "reference": ("", "reference fuel of the ratios"),
    "higher_heating_value_MJ_kg": ("MJ/kg", "higher (superior) heating value, ISO 6976"),
    "lower_heating_value_MJ_kg": ("MJ/kg", "lower (inferior) heating value, ISO 6976"),
    "higher_heating_value_MJ_m3": ("MJ/m3", "higher (superior) heating value per metered volume, ISO 6976"),
    "lower_heating_value_MJ_m3": ("MJ/m3", "lower (inferior) heating value per metered volume, ISO 6976"),
    "relative_density": ("1", "relative density to air, ISO 6976"),
    "higher_wobbe_index_MJ_m3": ("MJ/m3", "higher (superior) Wobbe index, ISO 6976"),
    "lower_wobbe_index_MJ_m3": ("MJ/m3", "lower (inferior) Wobbe index, ISO 6976"),
    "wobbe_change_percent": ("%", "Wobbe index change against the reference gas"),
    "wobbe_in_band": ("", "Wobbe index inside the allowed band"),
    "wobbe_band_low_MJ_m3": ("MJ/m3", "lower edge of the Wobbe band"),
    "wobbe_band_high_MJ_m3": ("MJ/m3", "upper edge of the Wobbe band"),
    "stoich_oxidizer_volume_m3_m3": ("1", "stoichiometric oxidizer volume per fuel volume"),
    "stoich_oxidizer_mass_kg_kg": ("1", "stoichiometric oxidizer mass per fuel mass"),
    "stoich_fuel_mole_fraction": ("1", "fuel mole fraction of the stoichiometric mixture"),
    "reference_gas": ("", "reference gas of the Wobbe change"),
    "conditions": ("", "reference conditions of the gas properties"),
    "method": ("", "method of the gas properties"),
    "port_velocity_m_s": ("m/s", "mean port velocity"),
    "thermal_input_kW": ("kW", "thermal input"),
    "wall_velocity_gradient_1_s": ("1/s", "velocity gradient at the port wall (laminar, or Blasius turbulent "
                                           "above Re 2300)"),
    "port_reynolds_number": ("1", "port Reynolds number U D_h / nu of the fresh mixture"),
    "flashback_margin": ("1", "wall gradient over critical flashback gradient"),
    "blowoff_margin": ("1", "critical blowoff gradient over wall gradient"),
    "quench_ratio": ("1", "quenching size over port size"),
    "bluff_body_blowoff_velocity_m_s": ("m/s", "blowoff velocity of the bluff-body stabilizer"),
    "stabilizer_margin": ("1", "stabilizer blowoff velocity over the velocity past the body's edge"),
    "verdict": ("", "burner verdict: ok or the risks found, and the criteria not assessed (a premixer's: on its "
                    "core-flow and boundary-layer flashback and extinction-strain blowout margins)"),
    "criteria_not_assessed": ("", "criteria outside the range of their data at this point, and why (blank margin)"),
    "warnings": ("", "inputs outside the range the method or mechanism covers"),
    "ignition_delay_ms": ("ms", "constant-pressure ignition delay of the fresh mixture (time of max dT/dt)"),
    "autoignition_margin": ("1", "ignition delay over premixer residence time"),
    "injection_ignition_delay_ms": ("ms", "shortest ignition delay of the fuel-oxidizer mixtures near the fuel "
                                          "injection (phi 0.25-4 at the premixer's temperature and pressure)"),
    "injection_equivalence_ratio": ("1", "equivalence ratio of the most reactive mixture near the fuel injection"),
    "injection_autoignition_margin": ("1", "shortest ignition delay near the fuel injection over residence time"),
    "autoignition_verdict": ("", "ok or autoignition risk (margin below the premixer's minimum)"),
    "flame_speed_kinetic_uncertainty_percent": ("%", "1-sigma kinetic uncertainty of the flame speed, first order "
                                                     "from adjoint sensitivities and rate-constant uncertainty "
                                                     "factors ([uncertainty])"),
    "most_sensitive_reaction": ("", "reaction whose rate constant the flame speed is most sensitive to"),
    "most_sensitive_reaction_sensitivity": ("1", "its normalized sensitivity d ln S_L / d ln k"),
    "reactions_default_factor": ("1", "reactions with |sensitivity| >= 0.005 that took the default uncertainty "
                                      "factor"),
    "default_factor_variance_percent": ("%", "share of the kinetic band's variance from those reactions"),
    "lewis_number_fuel": ("1", "Lewis number of the fuel in the fresh mixture (blends: heat-release weighted, "
                               "Law et al. 2005)"),
    "lewis_number_oxygen": ("1", "Lewis number of O2 in the fresh mixture"),
    "zeldovich_number": ("1", "Zeldovich number from the mass burning rate against T_ad by inert dilution "
                              "(Egolfopoulos & Law 1990; [flame_response])"),
    "effective_lewis_number": ("1", "effective Lewis number of the two reactants (Matalon, Cui & Bechtold 2003)"),
    "markstein_number_unburned": ("1", "Markstein number relative to the unburned gas, hydrodynamic theory "
                                       "(Clavin & Williams 1982)"),
    "markstein_length_mm": ("mm", "Markstein length Ma_u alpha_u / S_L"),
    "instability": ("", "thermodiffusive regime by Ze (Le_eff - 1) (Sivashinsky 1977): cellular, pulsating or "
                        "stable; every flame is also hydrodynamically unstable"),
    "rank": ("1", "rank of the reaction by |sensitivity| at this point"),
    "reaction": ("", "reaction equation as the mechanism writes it (duplicates and third-body variants summed)"),
    "sensitivity": ("1", "normalized sensitivity of the flame speed d ln S_L / d ln k (adjoint)"),
    "uncertainty_factor": ("1", "rate-constant uncertainty factor f used for the band"),
    "factor_source": ("", "where f comes from: the study, the packaged table's source, or default"),
    "variance_share_percent": ("%", "share of the kinetic band's variance from this reaction"),
    "axis": ("", "the axis the search moves along: blend_fraction or equivalence_ratio"),
    "window": ("1", "number of the admissible window along the axis (1, 2, ...; 0: none found)"),
    "outcome": ("", "window, none admissible or stopped"),
    "lower_edge": ("1", "low end of the admissible window (blend fraction or equivalence ratio; its admissible "
                        "side)"),
    "lower_kind": ("", "how the low end was settled: found, Wobbe band, swept end, range end or stopped"),
    "lower_binding": ("", "criterion failing just below the low end (flashback, blowoff, stabilizer, Wobbe band)"),
    "lower_margin": ("1", "that criterion's margin at the low end"),
    "lower_bracket_failing": ("1", "failing end of the low edge's final bracket"),
    "upper_edge": ("1", "high end of the admissible window (its admissible side)"),
    "upper_kind": ("", "how the high end was settled: found, Wobbe band, swept end, range end or stopped"),
    "upper_binding": ("", "criterion failing just above the high end"),
    "upper_margin": ("1", "that criterion's margin at the high end"),
    "upper_bracket_failing": ("1", "failing end of the high edge's final bracket"),
    "flame_lower_edge": ("1", "low end of the window the flame criteria alone allow (blend searches with the "
                              "Wobbe band)"),
    "flame_lower_kind": ("", "how that end was settled"),
    "flame_lower_binding": ("", "flame criterion failing below it"),
    "flame_upper_edge": ("1", "high end of the window the flame criteria alone allow"),
    "flame_upper_kind": ("", "how that end was settled"),
    "flame_upper_binding": ("", "flame criterion failing above it"),
    "wobbe_band_from": ("1", "lowest blend fraction of the Wobbe band interval holding the window"),
    "wobbe_band_to": ("1", "highest blend fraction of that interval"),
    "closest_miss_at": ("1", "where no window exists: the axis value closest to admissible"),
    "closest_miss_binding": ("", "the criterion failing most there"),
    "closest_miss_margin": ("1", "its margin there"),
    "closest_miss_margins": ("", "every criterion's margin there"),
    "swept_failures": ("", "which criterion fails at each swept point that fails"),
    "tolerance": ("1", "width of the final bracket the edges were refined to"),
    "core_flashback_basis": ("", "where core_flashback binds: the turbulent flame speed its margin rests on (the "
                             "largest), and whether outside its correlation's fitted range"),
    "flames_evaluated": ("1", "flames the search asked for beyond the sweep (stored ones count)"),
    "evaluated_at": ("", "where the search asked for flames, in order"),
    "note": ("", "how the search ended: edges not settled, failing intervals searched without a window, "
                 "the Wobbe band"),
    "rms_velocity_m_s": ("m/s", "turbulent velocity fluctuation u' at the flame ([premixer]: the study's intensity "
                                "times the port velocity, or the duct estimate)"),
    "integral_length_mm": ("mm", "integral length scale l_t of the turbulence at the flame"),
    "turbulence_source": ("", "where u' and l_t come from: study, duct estimate (common practice), or both"),
    "turbulent_reynolds_number": ("1", "Re_t = u' l_t / (S_L l_F), l_F = alpha_u / S_L (Peters 2000)"),
    "damkohler_number": ("1", "Da = (l_t / u') / (l_F / S_L): large-eddy time over flame time"),
    "karlovitz_number": ("1", "Ka = (u'/S_L)^1.5 (l_t/l_F)^-0.5: flame time over Kolmogorov time"),
    "combustion_regime": ("", "regime of Peters' diagram: laminar, wrinkled or corrugated flamelets, thin or broken "
                              "reaction zones"),
    "strained_consumption_speed_max_m_s": ("m/s", "strongest strained-flame consumption speed S_c,max of the "
                                                  "leading-point speed: its [stretch] ladder's, else interpolated "
                                                  "(linear in its logarithm) between the ladder points of its gas, "
                                                  "pressure and preheat"),
    "strained_consumption_speed_source": ("", "at a ladder point, interpolated, nearest ladder point (beyond the "
                                              "ladders' span), or no ladder at this condition"),
    "turbulent_flame_speed_zimont_m_s": ("m/s", "turbulent flame speed S_T = 0.52 u' Da^(1/4) of Zimont's closure "
                                                "(no Lewis number; Zimont 2000)"),
    "turbulent_flame_speed_muppala_m_s": ("m/s", "turbulent flame speed S_T = S_L (1 + (0.46/Le) Re_t^0.25 "
                                                 "(u'/S_L)^0.3 (p/0.1 MPa)^0.2) with the deficient reactant's Lewis "
                                                 "number (Muppala et al. 2005)"),
    "turbulent_flame_speed_leading_point_m_s": ("m/s", "turbulent flame speed on the leading points: Schmid's "
                                                       "S_L + u' (1 + Da^-2)^(-1/4) with S_L -> S_c,max (Kuznetsov & "
                                                       "Sabelnikov 1990; where a [stretch] ladder burned at the "
                                                       "point's gas, pressure and preheat)"),
    "turbulent_flame_speed_outside_range": ("", "which correlation is outside the range of its fitted data here, and "
                                                "why ('' where all are inside)"),
    "core_flashback_margin": ("1", "bulk (port) velocity over the largest turbulent flame speed of the correlations "
                                   "at the point: below 1 the flame can travel upstream through the core"),
    "core_flashback_correlation": ("", "the correlation that gave the largest turbulent flame speed (the margin's)"),
    "premixer_wall_velocity_gradient_1_s": ("1/s", "wall velocity gradient of the premixer's fully developed duct "
                                                   "flow, laminar through turbulent (Churchill 1977's friction "
                                                   "factor)"),
    "wall_friction_velocity_m_s": ("m/s", "friction velocity u_tau = U (f/8)^(1/2) of the premixer's duct flow"),
    "boundary_layer_flame_speed_m_s": ("m/s", "flame speed of the critical-gradient model: S_L, or the strained "
                                              "flames' S_c,max where a [stretch] ladder burned and it is larger"),
    "boundary_layer_critical_gradient_1_s": ("1/s", "critical wall gradient S^2 / (Pe_F alpha_u) (Lewis & von Elbe; "
                                                    "Putnam & Jensen), Pe_F laminar, turbulent or blended in Re"),
    "boundary_layer_flashback_margin": ("1", "wall velocity gradient over the critical one: below 1 the flame can "
                                             "enter the duct's boundary layer (blank where not assessed)"),
    "boundary_layer_flashback_status": ("", "assessed (with which Pe_F and flame speed), or not assessed and why"),
    "extinction_karlovitz_number": ("1", "C = kappa_ext alpha_u / S_L^2: the extinction strain rate in units of the "
                                         "flame's own strain scale S_L^2 / alpha_u"),
    "blowout_extinction_strain_rate_1_s": ("1/s", "extinction strain rate at the point: its [stretch] ladder's, else "
                                                  "interpolated (linear in its logarithm) between the ladder points "
                                                  "of its gas, pressure and preheat"),
    "extinction_strain_source": ("", "at a ladder point, interpolated, nearest ladder point (beyond the ladders' "
                                     "span), or not assessed: no ladder at this condition"),
    "stabilizer_edge_velocity_m_s": ("m/s", "velocity past the stabilizer's edge, U_approach / (1 - blockage)"),
    "extinction_damkohler_number": ("1", "Da_ext = kappa_ext d / U_edge: shear-layer flow time over the extinction "
                                         "time (Shanbhogue, Husain & Lieuwen 2009; Zhang et al. 2007)"),
    "extinction_blowout_margin": ("1", "Da_ext over its critical value ([premixer] blowout_damkohler): below 1, "
                                       "lean blowout"),
}
for _analysis in parts("columns"):  # each registered analysis declares its own (flamecharts.analyses)
    UNITS.update(_analysis.UNITS)

INDICATOR_COLUMNS = (
    "chemical_time_s", "blint_thickness_mm", "flashback_critical_gradient_1_s",
    "blowoff_critical_gradient_1_s", "quenching_distance_mm", "tube_quenching_diameter_mm",
    "flame_speed_ratio", "flashback_gradient_ratio", "blowoff_gradient_ratio",
    "quenching_distance_ratio", "chemical_time_ratio", "reference",
)
GAS_COLUMNS = (
    "higher_heating_value_MJ_m3", "lower_heating_value_MJ_m3", "higher_wobbe_index_MJ_m3",
    "lower_wobbe_index_MJ_m3", "wobbe_change_percent", "wobbe_in_band",
)
BURNER_COLUMNS = (
    "port_velocity_m_s", "thermal_input_kW", "port_reynolds_number", "wall_velocity_gradient_1_s", "flashback_margin",
    "blowoff_margin", "quench_ratio", "bluff_body_blowoff_velocity_m_s", "stabilizer_margin", "verdict",
    "criteria_not_assessed",
)

#: Premixer autoignition columns (empty unless the study has a [premixer] table).
PREMIXER_COLUMNS = ("ignition_delay_ms", "autoignition_margin", "injection_ignition_delay_ms",
                    "injection_equivalence_ratio", "injection_autoignition_margin", "autoignition_verdict")
#: The premixer's turbulence and the flame's regime (empty unless [premixer] and [burner]).
TURBULENCE_COLUMNS = ("rms_velocity_m_s", "integral_length_mm", "turbulence_source", "turbulent_reynolds_number",
                      "damkohler_number", "karlovitz_number", "combustion_regime")
#: The premixer's turbulent flame speeds and core-flow flashback margin (empty unless [premixer] and
#: [burner]; the leading-point speed only where a [stretch] ladder burned at the point's gas, pressure
#: and preheat).
TURBULENT_SPEED_COLUMNS = ("strained_consumption_speed_max_m_s", "strained_consumption_speed_source",
                           "turbulent_flame_speed_zimont_m_s",
                           "turbulent_flame_speed_muppala_m_s", "turbulent_flame_speed_leading_point_m_s",
                           "turbulent_flame_speed_outside_range", "core_flashback_margin", "core_flashback_correlation")
#: The premixer's boundary-layer flashback and extinction-strain blowout (empty unless [premixer] and
#: [burner]; the blowout only where a [stretch] ladder burned at the point's gas, pressure and preheat).
PREMIXER_MARGIN_COLUMNS = ("premixer_wall_velocity_gradient_1_s", "wall_friction_velocity_m_s",
                           "boundary_layer_flame_speed_m_s", "boundary_layer_critical_gradient_1_s",
                           "boundary_layer_flashback_margin", "boundary_layer_flashback_status",
                           "extinction_karlovitz_number", "blowout_extinction_strain_rate_1_s",
                           "extinction_strain_source", "stabilizer_edge_velocity_m_s", "extinction_damkohler_number",
                           "extinction_blowout_margin")
#: Numerical error of every flame (physics.grid_error), right after its grid points.
#: (Richardson's extrapolated S_L is stored with each flame but not a column: on the benchmark's
#: grid-converged flames it was further off than the flame's own value, docs/benchmarks.md.)
NUMERICAL_COLUMNS = ("flame_speed_numerical_error_percent", "thermal_thickness_numerical_error_percent",
                     "grid_convergence")
#: Kinetic uncertainty of the flame speed (empty unless the study has an [uncertainty] table).
KINETIC_COLUMNS = ("flame_speed_kinetic_uncertainty_percent", "most_sensitive_reaction",
                   "most_sensitive_reaction_sensitivity", "reactions_default_factor", "default_factor_variance_percent")
#: The skeletal mechanism's error band of the flame speed (empty unless the study has [reduction]).
REDUCTION_COLUMNS = ("flame_speed_reduction_error_percent", "reduction_error_source")
#: sensitivities.csv: the largest sensitivities of each point, one row per reaction.
SENSITIVITY_COLUMNS = ("fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
                       "unburned_temperature_K", "rank", "reaction", "sensitivity", "uncertainty_factor",
                       "factor_source", "variance_share_percent", "mechanism")
#: How the flame responds to stretch (physics.flame_response); Ze and what needs it with [flame_response].
RESPONSE_COLUMNS = ("lewis_number_fuel", "lewis_number_oxygen", "zeldovich_number", "effective_lewis_number",
                    "markstein_number_unburned", "markstein_length_mm", "instability")

#: results.csv, one row per point, in this order.
COLUMNS = ((
    "fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
    "unburned_temperature_K", "status", "laminar_flame_speed_m_s", "thermal_thickness_mm",
    "diffusive_thickness_mm", "reaction_zone_thickness_mm", "adiabatic_flame_temperature_K",
    "equilibrium_temperature_K", "expansion_ratio", "unburned_density_kg_m3",
    "unburned_thermal_diffusivity_m2_s", "grid_points", *NUMERICAL_COLUMNS, "solve_seconds", "mechanism",
    "mechanism_reduction", "transport",
    "thermal_diffusion", "resolution", "start", "message", "fuel_mole_fractions", "point_key",
) + INDICATOR_COLUMNS + KINETIC_COLUMNS + REDUCTION_COLUMNS + RESPONSE_COLUMNS + GAS_COLUMNS + BURNER_COLUMNS + PREMIXER_COLUMNS
  + TURBULENCE_COLUMNS + TURBULENT_SPEED_COLUMNS + PREMIXER_MARGIN_COLUMNS
  + tuple(c for m in parts("columns") for c in m.POINT_COLUMNS) + ("warnings",))

#: mechanism_comparison.csv (studies comparing mechanisms): each point burning under the reference
#: mechanism and another, one row per other mechanism (design.mechanism_differences).
COMPARISON_COLUMNS = ("mechanism", "reference_mechanism", "fuel", "oxidizer", "blend_with", "blend_fraction",
                      "equivalence_ratio", "pressure_bar", "unburned_temperature_K", "laminar_flame_speed_m_s",
                      "reference_laminar_flame_speed_m_s", "flame_speed_difference_percent",
                      "flame_speed_difference_numerical_error_percent", "thermal_thickness_mm",
                      "reference_thermal_thickness_mm", "thermal_thickness_difference_percent",
                      "reference_kinetic_uncertainty_percent")

#: limits.csv, one row per limit search.
LIMIT_COLUMNS = (
    "axis", "window", "fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
    "unburned_temperature_K", "outcome", "lower_edge", "lower_kind", "lower_binding", "lower_margin",
    "lower_bracket_failing", "upper_edge", "upper_kind", "upper_binding", "upper_margin", "upper_bracket_failing",
    "flame_lower_edge", "flame_lower_kind", "flame_lower_binding", "flame_upper_edge", "flame_upper_kind",
    "flame_upper_binding", "wobbe_band_from", "wobbe_band_to", "closest_miss_at", "closest_miss_binding",
    "closest_miss_margin", "closest_miss_margins", "swept_failures", "criteria_not_assessed", "tolerance",
    "flames_evaluated", "evaluated_at", "core_flashback_basis", "note", "mechanism",
)

#: fuel_gases.csv, one row per fuel gas (fuel, blend fraction, oxidizer).
GAS_TABLE_COLUMNS = (
    "fuel", "blend_with", "blend_fraction", "oxidizer", "higher_heating_value_MJ_kg", "lower_heating_value_MJ_kg",
    "higher_heating_value_MJ_m3", "lower_heating_value_MJ_m3", "relative_density", "higher_wobbe_index_MJ_m3",
    "lower_wobbe_index_MJ_m3", "wobbe_change_percent", "wobbe_band_low_MJ_m3", "wobbe_band_high_MJ_m3",
    "wobbe_in_band", "stoich_oxidizer_volume_m3_m3", "stoich_oxidizer_mass_kg_kg", "stoich_fuel_mole_fraction",
    "reference_gas", "conditions", "method",
)

#: Stored flame measurement (SI, see chemistry.flame.measure) -> (column, scale to the column's unit).
FROM_METRICS = {
    "laminar_flame_speed_m_s": ("laminar_flame_speed_m_s", 1.0),
    "thermal_thickness_m": ("thermal_thickness_mm", 1e3),
    "diffusive_thickness_m": ("diffusive_thickness_mm", 1e3),
    "reaction_zone_thickness_m": ("reaction_zone_thickness_mm", 1e3),
    "adiabatic_flame_temperature_K": ("adiabatic_flame_temperature_K", 1.0),
    "equilibrium_temperature_K": ("equilibrium_temperature_K", 1.0),
    "expansion_ratio": ("expansion_ratio", 1.0),
    "unburned_density_kg_m3": ("unburned_density_kg_m3", 1.0),
    "unburned_thermal_diffusivity_m2_s": ("unburned_thermal_diffusivity_m2_s", 1.0),
    "grid_points": ("grid_points", 1),
    "flame_speed_numerical_error": ("flame_speed_numerical_error_percent", 100.0),
    "thermal_thickness_numerical_error": ("thermal_thickness_numerical_error_percent", 100.0),
    "lewis_number_fuel": ("lewis_number_fuel", 1.0),
    "lewis_number_oxygen": ("lewis_number_oxygen", 1.0),
    "zeldovich_number": ("zeldovich_number", 1.0),
}


def gas_label(row: dict) -> str:
    """How every output names a fuel gas: 'natural gas + 30 % hydrogen' (the fuel alone when unblended).

    >>> gas_label({"fuel": "natural gas", "blend_with": "hydrogen", "blend_fraction": 0.3})
    'natural gas + 30 % hydrogen'
    """
    if not row.get("blend_with"):
        return row["fuel"]
    return f"{row['fuel']} + {100 * row['blend_fraction']:.4g} % {row['blend_with']}"
