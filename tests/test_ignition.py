"""Ignition delay of the premixer check against shock-tube measurements, and the premixer columns.

Shock-tube ignition delays scatter by about +/-20-30 % within one facility and differ by
more between facilities and ignition definitions (factor-2 bands are common practice
without source); GRI-Mech 3.0 was not built for hydrogen near the second explosion limit
(about 1050-1100 K at these pressures), where delays rise steeply. The checks hold the
computed delay (time of max dT/dt, constant volume as behind a reflected shock) within a
factor 2 of each measurement.
"""
from __future__ import annotations

import html
import math

import pytest

import flamecharts
from flamecharts.chemistry.ignition import ignition_delay_peak
from flamecharts.chemistry.mechanism import find_mechanism
from flamecharts.errors import ConfigError
from tests.conftest import write_h2_study

ATM = 101325.0
#: Stoichiometric hydrogen-air, 29.58 % H2 (O2:N2 = 21:79).
H2_AIR = (("H2", 0.2958), ("N2", 0.7042 * 0.79), ("O2", 0.7042 * 0.21))

#: (T [K], p [atm], measured delay [us], source)
H2_SHOCK_TUBE = [
    (1184.0, 2.0, 22.3, "Slack 1977, Combust. Flame 28:241 (OH emission)"),
    (1102.0, 2.0, 36.6, "Slack 1977, Combust. Flame 28:241 (OH emission)"),
    (1200.0, 2.5, 18.1, "Bhaskaran, Gupta & Just 1973, Combust. Flame 21:45 (pressure rise)"),
    (1098.0, 2.5, 44.9, "Bhaskaran, Gupta & Just 1973, Combust. Flame 21:45 (pressure rise)"),
    (1323.0, 2.5, 10.1, "Bhaskaran, Gupta & Just 1973, Combust. Flame 21:45 (pressure rise)"),
]


@pytest.mark.parametrize("mech", ["h2o2.yaml", "gri30.yaml"])  # h2o2.yaml is GRI-Mech 3.0's H2/O2 part
@pytest.mark.parametrize("T, p_atm, measured_us, source", H2_SHOCK_TUBE)
def test_hydrogen_air_ignition_delay_within_a_factor_2_of_shock_tube_data(mech, T, p_atm, measured_us, source):
    tau = ignition_delay_peak(str(find_mechanism(mech, None)), H2_AIR, T, p_atm * ATM, 0.1, "volume") * 1e6
    assert measured_us / 2 <= tau <= measured_us * 2, f"{tau:.1f} us vs {measured_us} us ({source})"


#: Methane-air near gas-turbine pressures: Huang, Hill, Bushe & Munshi, Combust. Flame 136
#: (2004) 25-42, shock tube, ignition at the extrapolated onset of the pressure rise; read
#: from the ChemKED database files methane/Huang_2004/x10004132_1.yaml (A, phi 0.99),
#: x10004133_1.yaml and Huang_2004_st_p16atm.yaml (B, phi 0.69). The files give a relative
#: standard deviation of 0.32-0.38 (scatter and stated uncertainty combined), so two
#: standard deviations are a factor of about 2.1; GRI-Mech 3.0 adds its own error at
#: these pressures. The check: within a factor 2.5 from 1175 K up to 1305 K. Below about
#: 1150 K GRI-Mech 3.0 gives delays 2-7 times LONGER than measured (an overstated
#: autoignition margin: docs/premixers.md says so); at 1370 K (B, 39 atm) it gives 0.31 x.
METHANE_A = (("CH4", 0.095), ("O2", 0.192), ("N2", 0.715))
METHANE_B = (("CH4", 0.068), ("O2", 0.196), ("N2", 0.736))
METHANE_SHOCK_TUBE = [
    (METHANE_A, 1175.0, 39.9, 612.0),
    (METHANE_A, 1295.0, 36.5, 395.0),
    (METHANE_B, 1233.0, 38.8, 798.0),
    (METHANE_B, 1213.0, 14.9, 984.0),
    (METHANE_B, 1304.0, 15.7, 690.0),
]


@pytest.mark.parametrize("X, T, p_atm, measured_us", METHANE_SHOCK_TUBE)
def test_methane_air_ignition_delay_at_gas_turbine_pressures(X, T, p_atm, measured_us):
    """Huang, Hill, Bushe & Munshi 2004 (see above): factor 2.5."""
    tau = ignition_delay_peak(str(find_mechanism("gri30.yaml", None)), X, T, p_atm * ATM, 0.1, "volume") * 1e6
    assert measured_us / 2.5 <= tau <= measured_us * 2.5, f"{tau:.0f} us vs {measured_us} us at {T} K, {p_atm} atm"


def test_no_ignition_within_the_horizon_is_inf():
    # stoichiometric hydrogen-air at 600 K, 1 atm does not ignite within 10 ms (second-limit
    # behaviour: far below the ~850-900 K crossover at 1 atm; textbook fact, e.g. Law 2006 ch. 8)
    tau = ignition_delay_peak(str(find_mechanism("h2o2.yaml", None)), H2_AIR, 600.0, ATM, 0.01)
    assert math.isinf(tau)


def test_premixer_columns_and_verdict(tmp_path):
    extra = "[premixer]\nresidence_time_ms = 5.0\nmin_autoignition_margin = 3.0\n"
    cfg = write_h2_study(tmp_path, phis="[1.0]", fractions="[0.0]", extra=extra)
    cfg.write_text(cfg.read_text().replace("unburned_temperature_K = [300.0]", "unburned_temperature_K = [300.0, 1000.0]"))
    res = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    cold, hot = sorted(res.rows, key=lambda r: r["unburned_temperature_K"])
    assert math.isinf(cold["ignition_delay_ms"]) and cold["autoignition_verdict"] == "ok"
    # 1000 K, 1 bar diluted hydrogen-air ignites within a fraction of a millisecond: a 5 ms
    # premixer would hold an autoigniting mixture
    assert hot["ignition_delay_ms"] < 5.0 and hot["autoignition_verdict"] == "autoignition risk"
    assert "autoignition_margin" in (tmp_path / "out" / "results.csv").read_text().splitlines()[0]
    # the report's caveat is the one of the mechanism used (it printed GRI-Mech 3.0's whatever was used)
    from flamecharts.outputs.report import _premixer_section
    section = html.unescape("".join(_premixer_section(res.study, res.rows)))
    assert "h2o2.yaml's hydrogen delays" in section and "GRI-Mech 3.0's delays" not in section
    # the reactor is integrated well past what the verdict needs: min margin x residence time
    assert hot["premixer_horizon_s"] >= 3.0 * 5e-3
    for r in (cold, hot):  # a risk exactly where the nearer of the two delays falls inside 3 residence times
        near = min(r["autoignition_margin"], r["injection_autoignition_margin"])
        assert (r["autoignition_verdict"] == "autoignition risk") == (near < 3.0), r
    # near the fuel injection: the shortest delay of phi 0.25-4 at the same T and p, never longer than
    # the premixed mixture's (phi 1 is among those scanned), and inf where nothing ignites
    from flamecharts.physics.autoignition import INJECTION_PHIS

    assert hot["injection_ignition_delay_ms"] <= hot["ignition_delay_ms"]
    assert hot["injection_equivalence_ratio"] in INJECTION_PHIS
    assert math.isinf(cold["injection_ignition_delay_ms"])


@pytest.mark.parametrize("extra, message", [
    ("[premixer]\n", "needs 'residence_time_ms'"),
    ("[premixer]\nresidence_time_ms = 20000\n", "in milliseconds"),
    ("[premixer]\nresidence_time_ms = 2\nsafety = 3\n", "unknown key 'premixer.safety'"),
])
def test_premixer_errors_name_the_key(tmp_path, extra, message):
    with pytest.raises(ConfigError, match=message):
        flamecharts.load_study(write_h2_study(tmp_path, extra=extra))


def test_premixer_delays_are_stored_apart_and_reread_at_another_horizon(tmp_path):
    """The premixer's delays are an extra of their own (analyses/premixer_ignition): a shorter residence
    time reads the stored delays (a delay over a longer horizon answers a shorter one); a
    longer one integrates again only the points that had not ignited; no flame is solved again."""
    from flamecharts.analyses.premixer_ignition.solve import premixer_key
    from flamecharts.store import Store
    from flamecharts.sweep.points import points

    def study(residence_ms):
        cfg = write_h2_study(tmp_path, phis="[1.0]", fractions="[0.0]",
                             extra=f"[premixer]\nresidence_time_ms = {residence_ms}\nmin_autoignition_margin = 3.0\n")
        cfg.write_text(cfg.read_text().replace("unburned_temperature_K = [300.0]",
                                               "unburned_temperature_K = [300.0, 1000.0]"))
        return cfg

    def stored(res):
        with Store(tmp_path / "out" / "results.db", readonly=True) as store:
            rows = store.rows([premixer_key(p) for p in points(res.study)])
        return {p.T_u: rows[premixer_key(p)] for p in points(res.study)}

    first = flamecharts.run(study(2.0), out=tmp_path / "out", jobs=1, charts=False)
    before = stored(first)
    assert before[300.0]["metrics"]["premixer_horizon_s"] == 1.0  # max(1 s, 100 x 3 x 2 ms)
    shorter = flamecharts.run(study(1.0), out=tmp_path / "out", jobs=1, charts=False)
    assert shorter.summary.solved == 0 and stored(shorter) == before
    hot = {r["unburned_temperature_K"]: r for r in shorter.rows}[1000.0]
    assert hot["autoignition_margin"] == pytest.approx(first.rows[1]["ignition_delay_ms"] / 1.0, rel=1e-12)
    longer = flamecharts.run(study(50.0), out=tmp_path / "out", jobs=1, charts=False)  # horizon 15 s
    after = stored(longer)
    assert longer.summary.solved == 0
    assert after[1000.0] == before[1000.0]  # ignited within 1 s: answers any horizon
    assert after[300.0]["metrics"]["premixer_horizon_s"] == 15.0  # integrated again over the longer horizon
    assert {r["unburned_temperature_K"]: r for r in longer.rows}[300.0]["autoignition_verdict"] == "ok"


def test_check_estimates_the_premixer_delays(tmp_path):
    """`check` prints one line per extra solve a study asks for (sweep.analyses.per_point): the
    premixer's delays with their horizon and time, inside the total."""
    from conftest import run_cli

    cfg = write_h2_study(tmp_path, extra="[premixer]\nresidence_time_ms = 2.0\n")
    done = run_cli("check", cfg, "--out", tmp_path / "none")
    assert done.returncode == 0, done.stderr
    line = next(t for t in done.stdout.splitlines() if t.startswith("Premixer:"))
    assert "5 mixtures near the fuel injection" in line and "over 1 s" in line
    assert "under a second" in line or "about " in line
    assert "Estimated total" in done.stdout


def test_a_premixers_turbulence_places_each_flame_in_peters_regimes(tmp_path):
    """[premixer] with a [burner]: u' and l_t (the study's, else the duct estimate) and Peters'
    numbers per burning point, consistent with their definitions (Peters 2000, sec. 2.3:
    Re_t = Da^2 Ka^2; the regime from Re_t, u'/S_L and Ka), and the regime diagram drawn."""
    from flamecharts.physics.turbulence import regime

    burner = ('[burner]\nname = "test tube"\nport = "round"\nport_diameter_mm = 20.0\nport_velocity_m_s = 30.0\n')
    cfg = write_h2_study(tmp_path, phis="[0.5, 1.0]", fractions="[0.0]",
                         extra="[premixer]\nresidence_time_ms = 2.0\n\n" + burner)
    res = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, report=False)
    ok = [r for r in res.rows if r["status"] == "ok"]
    assert ok and all(r["turbulence_source"] == "duct estimate" for r in ok)
    for r in ok:
        nu = r["unburned_viscosity_Pa_s"] / r["unburned_density_kg_m3"]
        Re = 30.0 * 0.02 / nu  # the duct estimate: u'/U = 0.16 Re^-1/8, l_t = 0.07 D (common practice)
        assert r["rms_velocity_m_s"] == pytest.approx(30.0 * 0.16 * Re ** -0.125, rel=1e-9)
        assert r["integral_length_mm"] == pytest.approx(1.4, rel=1e-12)
        assert r["turbulent_reynolds_number"] == pytest.approx(r["damkohler_number"] ** 2 * r["karlovitz_number"] ** 2,
                                                               rel=1e-9)
        l_F = r["unburned_thermal_diffusivity_m2_s"] / r["laminar_flame_speed_m_s"]
        assert r["combustion_regime"] == regime(r["rms_velocity_m_s"], 1.4e-3, r["laminar_flame_speed_m_s"], l_F)
    assert (tmp_path / "out" / "charts" / "turbulent_regime_diagram.png").stat().st_size > 15_000
    # the study's own turbulence replaces the estimate
    cfg.write_text(cfg.read_text().replace("residence_time_ms = 2.0", "residence_time_ms = 2.0\n"
                                           "turbulence_intensity_percent = 10\nintegral_length_mm = 3"))
    again = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False, report=False)
    r = next(r for r in again.rows if r["status"] == "ok")
    assert again.summary.solved == 0 and r["turbulence_source"] == "study"
    assert r["rms_velocity_m_s"] == pytest.approx(3.0) and r["integral_length_mm"] == pytest.approx(3.0)


@pytest.mark.parametrize("extra, message", [
    ("turbulence_intensity_percent = 150", "'premixer.turbulence_intensity_percent' is 150; allowed: 0.1 to 100"),
    ("integral_length_mm = 5000", "'premixer.integral_length_mm' is 5000 mm, more than 1 m"),
    ("integral_length_mm = 0", "'premixer.integral_length_mm' must be > 0"),
])
def test_premixer_turbulence_keys_name_the_key(tmp_path, extra, message):
    with pytest.raises(ConfigError, match=message):
        flamecharts.load_study(write_h2_study(tmp_path, extra=f"[premixer]\nresidence_time_ms = 2\n{extra}\n"))
