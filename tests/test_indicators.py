"""Design indicators: exact relations, and the published constants they rest on."""
import numpy as np
import pytest

from flamecharts.physics import indicators as ind


def test_round_port_wall_gradient_is_poiseuille_exact():
    # Fully developed laminar pipe flow u(r) = 2U(1 - (2r/D)^2): du/dr at the wall = 8U/D.
    U, D = 1.7, 3.1e-3
    r = np.linspace(0.0, D / 2, 4001)
    u = 2 * U * (1 - (2 * r / D) ** 2)
    assert np.trapezoid(u * 2 * np.pi * r, r) / (np.pi * D ** 2 / 4) == pytest.approx(U, rel=1e-6)  # bulk is U
    assert ind.wall_velocity_gradient_round(U, D) == pytest.approx(abs(np.gradient(u, r)[-1]), rel=1e-3)


def test_slot_wall_gradient_is_plane_poiseuille_exact():
    # Plane Poiseuille flow of gap h: u(y) = 1.5U(1 - (2y/h)^2), du/dy at the wall = 6U/h.
    U, h = 0.9, 1.2e-3
    y = np.linspace(-h / 2, h / 2, 2001)
    u = 1.5 * U * (1 - (2 * y / h) ** 2)
    assert np.trapezoid(u, y) / h == pytest.approx(U, rel=1e-6)  # bulk velocity is U
    assert ind.wall_velocity_gradient_slot(U, h) == pytest.approx(abs(1.5 * U * (-8 * (h / 2) / h ** 2)), rel=1e-15)


def test_reed_blowoff_criterion_round_trips():
    # Reed (1967): Ka_B = g_B alpha_u / S_L^2 = 0.23.
    g = ind.blowoff_critical_gradient(0.4, 2.2e-5)
    assert g * 2.2e-5 / 0.4 ** 2 == pytest.approx(0.23, rel=1e-12)


def test_quench_and_tube_diameters():
    # stoichiometric methane-air, 300 K, 1 atm (alpha_u 2.2e-5 m2/s, S_L 0.37 m/s): the plate
    # quenching distance is about 2.0-2.5 mm (Lewis & von Elbe, Combustion, Flames and Explosions
    # of Gases, 3rd ed. 1987; from memory)
    d = ind.quenching_distance(2.2e-5, 0.37)
    assert 2.0e-3 <= d <= 2.5e-3
    assert 1.3 <= ind.tube_quenching_diameter(d) / d <= 1.5  # Lewis & von Elbe (from memory)


def test_blowoff_exceeds_flashback_gradient_with_the_defaults():
    # Lewis & von Elbe: blowoff gradients are several times the flashback ones (from memory).
    ratio = ind.blowoff_critical_gradient(0.37, 2.2e-5) / ind.flashback_critical_gradient(0.37, 2.2e-5)
    assert 2.0 <= ratio <= 5.0


def test_port_velocity_hand_calculation():
    # 1 kW of hydrogen (LHV 119.96 MJ/kg), AFR 34.3, phi 1, rho 0.85 kg/m3, 1 cm2 ports:
    # fuel 8.336e-6 kg/s, mixture x 35.3 -> 2.943e-4 kg/s, 3.462e-4 m3/s, 3.462 m/s (by hand).
    assert ind.port_velocity_at_thermal_input(1e3, 119.96e6, 34.3, 1.0, 0.85, 1e-4) == pytest.approx(3.462, rel=1e-3)


def test_bluff_body_velocity_scales_with_size_over_chemical_time():
    tau = ind.chemical_time(2.2e-5, 0.37)
    assert ind.bluff_body_blowoff_velocity(0.04, tau, 1.0) == pytest.approx(2 * ind.bluff_body_blowoff_velocity(0.02, tau, 1.0))


def test_powers_and_logarithms_of_arrays_are_those_of_python_floats_bit_for_bit():
    # The read-out computes its columns on arrays over all points (design.indicator_columns,
    # design.response_columns); each element must carry the bits Python's ** and math.log give one
    # number (results written row by row before, a flame computed alone). NumPy's own x ** y and
    # np.log differ from them in the last bit of a few per cent of values on AVX-512 processors.
    import math

    from flamecharts.physics import elementwise, flame_response as fr

    x = np.random.default_rng(29).uniform(0.01, 20.0, 20000)
    for y in (2, 0.7, 1.5, -0.25):
        assert elementwise.power(x, y).tolist() == [v ** y for v in x.tolist()]
    assert elementwise.log(x).tolist() == [math.log(v) for v in x.tolist()]
    S_L, a = x[:1000] / 10.0, x[1000:2000] * 1e-5
    assert ind.blint_thickness(a, S_L, 2000.0, 300.0).tolist() == [
        2.0 * (ai / s) * (2000.0 / 300.0) ** 0.7 for ai, s in zip(a.tolist(), S_L.tolist())]
    sigma, le = 1.0 + x[:1000], x[1000:2000] / 10.0
    assert fr.markstein_number_unburned(sigma, 8.0, le).tolist() == [
        fr.markstein_number_unburned(s, 8.0, v) for s, v in zip(sigma.tolist(), le.tolist())]
