"""A premixer's boundary-layer flashback, extinction-strain blowout and verdict (design.premixer_margins;
issue 30, items 5-7): read-side columns on stored values, checked here on hand-made rows (no flame).

The physics functions are checked in tests/test_premixer_physics.py; here, that each column is its
model on the point's stored inputs, where each is "not assessed" and why, the interpolation of the
extinction ratio C = kappa_ext alpha_u / S_L^2 across the sweep, and the premixer's verdict. The
leave-one-out error of the interpolation on real ladders is measured on tests/test_stretch.py's
ladders; the report's lines on tests/test_premixer_flame_speed.py's run.
"""
import math
from types import SimpleNamespace as NS

import pytest

from flamecharts.columns import COLUMNS, PREMIXER_MARGIN_COLUMNS, UNITS
from flamecharts.config import Burner, Premixer
from flamecharts.design import (
    NO_LADDER,
    blowout_columns,
    boundary_layer_columns,
    extinction_leave_one_out,
    interpolated_extinction,
    ladder_points,
    premixer_margins,
    premixer_verdict,
)


def _study(pe: float | None = None, stabilizer: bool = False, port_mm: float = 10.0):
    stab = dict(stabilizer_size_m=0.01, approach_velocity_m_s=30.0, stabilizer_blockage=0.25) if stabilizer else {}
    b = Burner(name="tube", port="round", port_size_m=port_mm / 1e3, port_velocity_m_s=1.0, **stab)
    return NS(premixer=Premixer(residence_time_s=2e-3, turbulent_flashback_peclet=pe), burner=b,
              indicator_settings={"flashback_peclet": 13.0})


#: A burning laminar premixer point: 1 m/s in a 10 mm tube, nu 1.5e-5 m^2/s (Re 667), a methane-like
#: flame (S_L 0.37 m/s, alpha_u 2.2e-5 m^2/s): the doctest of physics.premixer.boundary_layer_flashback.
ROW = {"status": "ok", "fuel": "f", "oxidizer": "air", "blend_with": "", "blend_fraction": 0.0,
       "equivalence_ratio": 0.8, "pressure_bar": 1.0, "unburned_temperature_K": 300.0, "port_velocity_m_s": 1.0,
       "unburned_viscosity_Pa_s": 1.5e-5, "unburned_density_kg_m3": 1.0, "laminar_flame_speed_m_s": 0.37,
       "unburned_thermal_diffusivity_m2_s": 2.2e-5, "rms_velocity_m_s": 0.05, "core_flashback_margin": 2.0}


def test_every_new_column_is_declared_with_its_unit():
    assert set(PREMIXER_MARGIN_COLUMNS) <= set(COLUMNS) and all(c in UNITS for c in PREMIXER_MARGIN_COLUMNS)


def test_laminar_duct_margin_is_the_wall_gradient_over_the_critical_one():
    # Hagen-Poiseuille (textbook): g = 8 U / D in laminar pipe flow; critical gradient S_L^2 / (Pe_F alpha_u)
    # with Pe_F = 13 (Putnam & Jensen 1949's Peclet form of Lewis & von Elbe's critical gradient)
    out = boundary_layer_columns(_study(), ROW)
    assert out["premixer_wall_velocity_gradient_1_s"] == pytest.approx(800.0, rel=1e-9)
    assert out["boundary_layer_critical_gradient_1_s"] == pytest.approx(0.37 ** 2 / (13.0 * 2.2e-5), rel=1e-9)
    assert out["boundary_layer_flashback_margin"] == pytest.approx(1.67, abs=0.005)  # the doctest's number
    assert out["wall_friction_velocity_m_s"] == pytest.approx(math.sqrt(800.0 * 1.5e-5), rel=1e-9)  # u_tau^2 = nu g
    assert out["boundary_layer_flashback_status"] == "assessed (laminar Pe_F 13, on S_L)"
    # the laminar Pe_F's data lie near 1 atm (Lewis & von Elbe 1987, from memory; physics.validity)
    hot = boundary_layer_columns(_study(), {**ROW, "pressure_bar": 10.0})
    assert hot["boundary_layer_flashback_margin"] is None
    assert hot["boundary_layer_flashback_status"] == "not assessed: 10 bar outside 0.5-2 bar"


def test_a_stretch_sensitive_flame_is_judged_on_its_strongest_strained_speed():
    # the leading-point reading of physics.premixer.boundary_layer_flashback: S_c,max where it exceeds S_L
    out = boundary_layer_columns(_study(), {**ROW, "ladder_consumption_speed_max_m_s": 0.74})
    assert out["boundary_layer_flame_speed_m_s"] == 0.74
    assert out["boundary_layer_flashback_margin"] == pytest.approx(1.67 / 4.0, abs=0.002)  # g_c ~ S^2
    assert out["boundary_layer_flashback_status"] == "assessed (laminar Pe_F 13, on S_c,max)"
    slower = boundary_layer_columns(_study(), {**ROW, "ladder_consumption_speed_max_m_s": 0.3})  # Le > 1
    assert slower["boundary_layer_flame_speed_m_s"] == 0.37


def test_turbulent_duct_flow_needs_a_calibrated_peclet_number():
    # Eichler, Baumgartner & Sattelmayer 2012 (from memory): the laminar Pe_F does not predict turbulent
    # boundary-layer flashback; Churchill 1977: g = f U^2 / (8 nu) of turbulent duct flow
    row = {**ROW, "port_velocity_m_s": 40.0, "pressure_bar": 10.0}  # Re 2.7e4
    out = boundary_layer_columns(_study(port_mm=10.0), row)
    assert out["boundary_layer_flashback_margin"] is None
    assert out["boundary_layer_flashback_status"].startswith("not assessed: Re 2.67e+04 > 2300 and no turbulent Pe_F")
    assert out["premixer_wall_velocity_gradient_1_s"] > 8 * 40.0 / 0.01  # turbulent: steeper than laminar
    calibrated = boundary_layer_columns(_study(pe=40.0, port_mm=10.0), row)  # the pressure range is the user's
    g, g_c = calibrated["premixer_wall_velocity_gradient_1_s"], 0.37 ** 2 / (40.0 * 2.2e-5)
    assert calibrated["boundary_layer_flashback_margin"] == pytest.approx(g / g_c, rel=1e-9)
    assert calibrated["boundary_layer_flashback_status"] == "assessed (turbulent Pe_F 40 of [premixer], on S_L)"


def test_no_premixer_or_no_flame_leaves_the_columns_empty():
    assert boundary_layer_columns(NS(premixer=None, burner=None), ROW) == dict.fromkeys(PREMIXER_MARGIN_COLUMNS[:6])
    assert boundary_layer_columns(_study(), {**ROW, "status": "no_flame"})["boundary_layer_flashback_status"] is None


#: kappa_ext = 1e4 exp(1 - 2 phi + blend) [1/s] at a 2 x 3 grid of ladder points: ln kappa_ext is
#: linear, so interpolating it linearly gives it back exactly inside the grid (closed form).
GRID = {(x, y): 1e4 * math.exp(1.0 - 2.0 * y + x) for x in (0.0, 0.5) for y in (0.6, 0.8, 1.0)}


def test_the_extinction_strain_is_interpolated_inside_and_held_beyond_never_extrapolated():
    K, how = interpolated_extinction(GRID, 0.25, 0.7)
    assert K == pytest.approx(1e4 * math.exp(1.0 - 1.4 + 0.25), rel=1e-12) and how == "interpolated"
    assert interpolated_extinction(GRID, 0.5, 0.8) == (GRID[(0.5, 0.8)], "at a ladder point")
    K, how = interpolated_extinction(GRID, 1.0, 0.7)  # beyond the ladders' blend fractions: 0.5's value held
    assert K == pytest.approx(1e4 * math.exp(1.0 - 1.4 + 0.5), rel=1e-12)
    assert how == "interpolated (beyond the ladders' blend fraction 0-0.5)"
    K, how = interpolated_extinction(GRID, 0.0, 1.3)
    assert K == pytest.approx(GRID[(0.0, 1.0)], rel=1e-12) and how == "nearest ladder point (beyond the ladders' phi 0.6-1)"


def _ladder_rows():
    """Rows of a blend sweep with ladders at blend 0 and 0.5 (phi 0.6-1)."""
    return [{**ROW, "blend_fraction": x, "equivalence_ratio": y, "laminar_flame_speed_m_s": 0.3 + 0.4 * x,
             "unburned_thermal_diffusivity_m2_s": 2.0e-5, "ladder_extinction_strain_rate_1_s": K}
            for (x, y), K in GRID.items()]


def test_blowout_damkohler_number_on_the_interpolated_extinction_strain():
    # Da_ext = kappa_ext d / U_edge, U_edge = U / (1 - blockage) (Shanbhogue, Husain & Lieuwen 2009; the
    # extinction strain rate as the chemical time's inverse: Zhang et al. 2007, from memory)
    ladders = ladder_points(_ladder_rows())
    row = {**ROW, "blend_fraction": 0.25, "equivalence_ratio": 0.7, "laminar_flame_speed_m_s": 0.4}
    out = blowout_columns(_study(stabilizer=True), row, ladders)
    K = 1e4 * math.exp(1.0 - 1.4 + 0.25)
    assert out["blowout_extinction_strain_rate_1_s"] == pytest.approx(K, rel=1e-12)
    assert out["extinction_karlovitz_number"] == pytest.approx(K * 2.2e-5 / 0.4 ** 2, rel=1e-12)
    assert out["extinction_strain_source"] == "interpolated"
    assert out["stabilizer_edge_velocity_m_s"] == pytest.approx(40.0)
    assert out["extinction_damkohler_number"] == pytest.approx(K * 0.01 / 40.0, rel=1e-12)
    assert out["extinction_blowout_margin"] == out["extinction_damkohler_number"]  # critical Da_ext 1
    elsewhere = blowout_columns(_study(stabilizer=True), {**row, "pressure_bar": 5.0}, ladders)
    assert elsewhere["extinction_strain_source"] == NO_LADDER and elsewhere["extinction_blowout_margin"] is None
    no_stabilizer = blowout_columns(_study(), row, ladders)
    assert no_stabilizer["blowout_extinction_strain_rate_1_s"] == pytest.approx(K, rel=1e-12)
    assert no_stabilizer["extinction_damkohler_number"] is None


def test_leave_one_out_predicts_each_ladder_from_the_others():
    # closed form: ln kappa_ext linear, so every interior ladder point is predicted exactly; the grid's
    # ends are held from their nearest neighbour: off by exp(-2 * 0.2) - 1 at phi 0.6, exp(0.4) - 1 at phi 1
    loo = {(d["blend_fraction"], d["equivalence_ratio"]): d for d in extinction_leave_one_out(_ladder_rows())}
    assert len(loo) == 6
    assert loo[(0.0, 0.8)]["error_percent"] == pytest.approx(0.0, abs=1e-9) and loo[(0.0, 0.8)]["how"] == "interpolated"
    assert loo[(0.5, 0.6)]["error_percent"] == pytest.approx(100 * (math.exp(-0.4) - 1), rel=1e-9)
    assert loo[(0.5, 1.0)]["error_percent"] == pytest.approx(100 * (math.exp(0.4) - 1), rel=1e-9)
    assert loo[(0.5, 1.0)]["predicted_1_s"] == pytest.approx(loo[(0.5, 1.0)]["ladder_1_s"] * math.exp(0.4), rel=1e-9)


def test_the_premixers_verdict_counts_its_own_criteria_where_assessed():
    # minimum margins of the burner (config.DEFAULT_MIN_MARGIN 1.5, common practice)
    study = _study(stabilizer=True)
    rows = _ladder_rows()
    premixer_margins(study, rows)
    r = rows[0]
    assert r["boundary_layer_flashback_margin"] is not None and r["extinction_blowout_margin"] is not None
    expect_risks = [c for c, col in (("core-flow flashback", "core_flashback_margin"),
                                     ("boundary-layer flashback", "boundary_layer_flashback_margin"),
                                     ("blowout", "extinction_blowout_margin")) if r[col] < 1.5]
    assert r["verdict"] == (" and ".join(f"{c} risk" for c in expect_risks) or "ok")
    # turbulent duct without a calibrated Pe_F, no ladder: the core-flow margin alone decides
    turbulent = {**ROW, "port_velocity_m_s": 40.0, "core_flashback_margin": 1.2}
    premixer_margins(_study(), [turbulent])
    assert turbulent["verdict"] == ("core-flow flashback risk; boundary-layer flashback and blowout not assessed")
    # both reasons named, without a comma (summaries split a list of reasons at commas)
    assert ("blowout: no stabilizer in [burner] (stabilizer_size_mm and approach_velocity_m_s give d and U_edge) and "
            "no ladder at this gas and pressure and preheat: [stretch] selects none") in turbulent["criteria_not_assessed"]
    turbulent["core_flashback_margin"] = 3.0
    assert premixer_verdict(_study(), turbulent) == ("ok on core-flow flashback only; boundary-layer flashback and "
                                                     "blowout not assessed")


def test_a_cellular_point_without_a_ladder_is_not_ok_on_core_flow_flashback():
    """Found by a newcomer trial: a thermodiffusively unstable point read "ok on core-flow flashback
    only" while its warning said the S_L-based margins are optimistic. The turbulent flame speeds
    scale S_L (or S_L with a Lewis-number factor); a cellular lean hydrogen flame burns several times
    faster than S_L where it is curved (Berger, Attili & Pitsch 2022, from memory), which only the
    leading-point speed on a [stretch] ladder's strongest consumption speed covers. So the verdict
    names the risk as underestimated, and a ladder at the point's gas and condition lifts it."""
    turbulent = {**ROW, "port_velocity_m_s": 40.0, "core_flashback_margin": 3.0, "instability": "cellular"}
    premixer_margins(_study(), [turbulent])
    assert turbulent["verdict"].startswith("core-flow flashback risk underestimated (thermodiffusively unstable, no "
                                           "[stretch] ladder); boundary-layer flashback and blowout not assessed")
    stable = {**ROW, "port_velocity_m_s": 40.0, "core_flashback_margin": 3.0, "instability": "stable"}
    premixer_margins(_study(), [stable])
    assert stable["verdict"].startswith("ok on core-flow flashback only")
    laddered = {**turbulent, "strained_consumption_speed_max_m_s": 2.0}
    assert not premixer_verdict(_study(), laddered).startswith("core-flow flashback risk underestimated")
