"""The regime numbers of premixed turbulent flames against their published definitions
(Peters, Turbulent Combustion, Cambridge University Press, 2000, sec. 2.3; Borghi 1985)."""
import numpy as np
import pytest

from flamecharts.physics import turbulence as tb

S_L, l_F = 0.4, 5e-5  # any flame: the definitions are ratios


@pytest.mark.parametrize("u, lt", [(0.5, 1e-3), (2.0, 0.01), (40.0, 0.05), (3.0, 2e-4)])
def test_the_three_numbers_obey_peters_identity_re_t_equals_da2_ka2(u, lt):
    # Peters 2000, sec. 2.3 (from memory): Re_t = Da^2 Ka^2, which follows from his definitions
    re_t, da, ka = tb.turbulent_reynolds(u, lt, S_L, l_F), tb.damkohler(u, lt, S_L, l_F), tb.karlovitz(u, lt, S_L, l_F)
    assert re_t == pytest.approx(da ** 2 * ka ** 2, rel=1e-12)


def test_karlovitz_is_the_squared_flame_to_kolmogorov_length_ratio():
    # Ka = (l_F / eta)^2 with nu = S_L l_F (Sc = 1) and epsilon = u'^3 / l_t (Peters 2000, eq. 2.11)
    u, lt = 3.0, 0.02
    eta = tb.kolmogorov_length(S_L * l_F, u, lt)
    assert tb.karlovitz(u, lt, S_L, l_F) == pytest.approx((l_F / eta) ** 2, rel=1e-12)


def test_the_boundary_lines_are_where_their_numbers_equal_one_or_one_hundred():
    x = np.logspace(-1, 4, 11)  # l_t / l_F
    lines = tb.regime_lines(x)
    u, lt = lines["Re_t = 1"] * S_L, x * l_F
    assert np.allclose(tb.turbulent_reynolds(u, lt, S_L, l_F), 1.0)
    assert np.allclose(tb.damkohler(lines["Da = 1"] * S_L, lt, S_L, l_F), 1.0)
    assert np.allclose(tb.karlovitz(lines["Ka = 1"] * S_L, lt, S_L, l_F), 1.0)
    assert np.allclose(tb.karlovitz(lines["Ka = 100"] * S_L, lt, S_L, l_F), 100.0)
    # the diagram's corner: Re_t = 1, Da = 1 and Ka = 1 meet at l_t/l_F = u'/S_L = 1 (Peters 2000, fig. 2.8)
    one = tb.regime_lines(1.0)
    assert one["Re_t = 1"] == one["Da = 1"] == one["Ka = 1"] == 1.0


REGIMES = [
    (0.5, 0.5, "laminar"),                 # Re_t = 0.25
    (0.5, 100.0, "wrinkled flamelets"),    # u' < S_L
    (3.0, 100.0, "corrugated flamelets"),  # Ka = 0.52
    (30.0, 100.0, "thin reaction zones"),  # Ka = 16
    (300.0, 100.0, "broken reaction zones"),  # Ka = 520
]


@pytest.mark.parametrize("ratio_u, ratio_l, expected", REGIMES)
def test_regimes_fall_between_the_lines(ratio_u, ratio_l, expected):
    assert tb.regime(ratio_u * S_L, ratio_l * l_F, S_L, l_F) == expected


def test_regimes_of_an_array_are_those_of_each_point():
    # the read-out places every point at once (design.turbulence_columns)
    ratio_u, ratio_l, expected = (np.array([c[k] for c in REGIMES]) for k in range(3))
    assert tb.regime(ratio_u * S_L, ratio_l * l_F, S_L, l_F).tolist() == expected.tolist()
