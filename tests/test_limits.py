"""Admissible limits by warm-started root finding (the [limits] table).

The root finder is checked against SciPy's Brent implementation (scipy.optimize.brentq;
Brent 1973, ch. 4); the searches against synthetic margins whose crossing is known in
closed form; the whole pipeline against the crossing read from a fine blend sweep of
the same burner (h2o2.yaml, seconds per flame).
"""
from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy.optimize import brentq

import flamecharts
from flamecharts.admissible.brent import brent_steps, drive
from flamecharts.errors import ConfigError
from flamecharts.physics import validity
from tests.conftest import write_h2_study


@pytest.fixture(autouse=True, scope="module")
def reed_on_hydrogen():
    """These tests check the searches, not the physics: on hydrogen flames (h2o2.yaml, seconds
    each) they need two criteria that cross, so Reed's blowoff constant is applied here beyond
    its range (Lewis number of hydrogen about 0.3; physics.validity leaves it not assessed below
    0.8). The searches and read-out run in this process, so the patched range is the one used;
    tests/test_validity.py checks the ranges themselves."""
    with pytest.MonkeyPatch.context() as mp:
        mp.setitem(validity.DOMAINS, "blowoff", dataclasses.replace(validity.DOMAINS["blowoff"],
                                                                    min_deficient_lewis=None))
        yield


BURNER = """
[burner]
name = "test rig port"
port = "round"
port_diameter_mm = 3.0
port_velocity_m_s = 2.5
"""


@pytest.mark.parametrize("f, a, b", [
    (lambda x: 0.3 - x, 0.0, 1.0),
    (lambda x: math.exp(-3 * x) - 0.4, 0.0, 1.0),        # margins fall like power laws
    (lambda x: math.log(2.0 / (1.0 + 8 * x ** 2)), 0.0, 1.0),
    (lambda x: np.tanh(20 * (0.61 - x)), 0.0, 1.0),      # steep: bisection has to take over
])
def test_brent_finds_the_root_of_scipy_brentq_within_the_tolerance(f, a, b):
    tol = 0.005
    counted = []
    res = drive(brent_steps(a, f(a), b, f(b), tol), lambda x: counted.append(x) or f(x))
    ref = brentq(f, a, b, xtol=1e-12)
    assert res.converged and res.width <= tol + 1e-12
    assert min(res.good, res.bad) - 1e-12 <= ref <= max(res.good, res.bad) + 1e-12
    assert f(res.good) >= 0 > f(res.bad)
    # never much worse than bisection on the same bracket (Brent 1973: at most about
    # twice... in practice a few more); 8 bisections narrow 1.0 to 0.004
    assert len(counted) <= math.ceil(math.log2((b - a) / tol)) + 4


def test_brent_refuses_a_bracket_without_a_sign_change():
    with pytest.raises(ValueError, match="same sign"):
        next(brent_steps(0.0, 1.0, 1.0, 2.0, 0.01))


def test_maximum_finder_matches_scipy_fminbound():
    """Brent's minimiser (Brent 1973, ch. 5) as a generator against scipy.optimize.fminbound, the
    same algorithm: the same abscissae to rounding."""
    from scipy.optimize import fminbound

    from flamecharts.admissible.brent import maximum_steps
    for f in (lambda x: -(x - 0.3) ** 2, lambda x: math.sin(3 * x), lambda x: -abs(x - 0.71),
              lambda x: min(3 * x, 2 - 2 * x)):
        gen = maximum_steps(0.0, 1.0, 1e-3)
        x = next(gen)
        try:
            while True:
                x = gen.send(f(x))
        except StopIteration as stop:
            peak = stop.value
        x_ref = fminbound(lambda t, f=f: -f(t), 0.0, 1.0, xtol=1e-3)
        assert peak.converged and peak.x == pytest.approx(x_ref, abs=1e-9)


# ---- searches on synthetic margins with closed-form edges
from types import SimpleNamespace as NS  # noqa: E402

from flamecharts.admissible.search import limit_parts, window_search, within_band  # noqa: E402

RIG = NS(min_flashback_margin=1.5, min_blowoff_margin=1.5)


def PARTS(r):
    return limit_parts(r, RIG, ("flashback", "blowoff"))


def _margins(fb, bo):
    """Row factory from two log-margin functions g_c(x) = ln(margin / 1.5)."""
    return lambda x: {"status": "ok", "flashback_margin": 1.5 * math.exp(fb(x)), "blowoff_margin": 1.5 * math.exp(bo(x))}


def _search(gen, rowf):
    asked = []
    try:
        xs = next(gen)
        while True:
            asked += xs
            xs = gen.send([rowf(x) for x in xs])
    except StopIteration as stop:
        return stop.value, asked


def _edges(answer):
    return [(w.lower.value, w.lower.kind, w.lower.binding, w.upper.value, w.upper.kind, w.upper.binding)
            for w in answer.windows]


def test_window_between_two_swept_points_failing_by_different_criteria():
    # blowoff holds from x = 0.15 up, flashback up to 0.18 (closed form); swept 0, 0.3, 0.6 all fail
    rowf = _margins(lambda x: 8 * (0.18 - x), lambda x: 9 * (x - 0.15))
    answer, asked = _search(window_search([(x, rowf(x)) for x in (0.0, 0.3, 0.6)], PARTS, 0.005, 12, (0.0, 1.0)),
                            rowf)
    ((lo, lk, lb, hi, hk, hb),) = _edges(answer)
    assert (lk, lb, hk, hb) == ("found", "blowoff", "found", "flashback")
    assert 0.15 - 1e-9 <= lo <= 0.155 and 0.175 <= hi <= 0.18 + 1e-9   # admissible ends, within the tolerance
    assert answer.failures == [(0.0, "blowoff"), (0.3, "flashback"), (0.6, "flashback"), (1.0, "flashback")]
    assert asked[0] == 1.0 and all(0.0 < x < 0.3 for x in asked[1:])  # nothing searched where no window can be


def test_no_window_between_them_reports_the_closest_miss_where_the_margins_cross():
    # blowoff needs x >= 0.18, flashback allows x <= 0.15: the best point is where both margins are equal
    rowf = _margins(lambda x: 8 * (0.15 - x), lambda x: 9 * (x - 0.18))
    answer, _ = _search(window_search([(x, rowf(x)) for x in (0.0, 0.3, 0.6)], PARTS, 0.005, 12, (0.0, 1.0)), rowf)
    assert answer.windows == []
    x_cross = (8 * 0.15 + 9 * 0.18) / 17
    m = answer.miss
    assert m.at == pytest.approx(x_cross, abs=0.005)
    assert m.row["flashback_margin"] == pytest.approx(m.row["blowoff_margin"], rel=0.05)
    assert m.g == pytest.approx(-8 * 9 * 0.03 / 17, abs=0.01)


def test_one_criterion_failing_everywhere_but_near_its_peak_is_maximised_only_there():
    # along phi: a blowoff margin with one maximum at phi 1.07, admissible only from 1.036 to 1.105
    def peak(p):
        return 0.05 - 40 * (p - 1.07) ** 2

    rowf = _margins(lambda p: 2.0, peak)
    swept = [(p, rowf(p)) for p in (0.6, 0.8, 1.0, 1.2, 1.4)]
    answer, asked = _search(window_search(swept, PARTS, 0.005, 12), rowf)
    ((lo, lk, lb, hi, hk, hb),) = _edges(answer)
    edge = math.sqrt(0.05 / 40)
    assert lo == pytest.approx(1.07 - edge, abs=0.005) and hi == pytest.approx(1.07 + edge, abs=0.005)
    assert lb == hb == "blowoff"
    assert all(0.8 < x < 1.2 for x in asked)  # the intervals away from the swept maximum cost no flame


def test_two_windows_where_a_flashback_margin_dips_near_stoichiometric():
    # flashback margin lowest near phi 1.05 (S_L peaks there), blowoff margin highest: admissible lean
    # (0.8-0.95) and rich (1.15-1.3), not in between
    rowf = _margins(lambda p: 10 * abs(p - 1.05) - 1.0, lambda p: 0.25 - 11.111 * (p - 1.05) ** 2)
    swept = [(p, rowf(p)) for p in (0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3, 1.4, 1.5)]
    answer, _ = _search(window_search(swept, PARTS, 0.005, 12), rowf)
    got = _edges(answer)
    assert len(got) == 2
    (l1, _, b1, h1, _, c1), (l2, _, b2, h2, _, c2) = got
    assert (b1, c1, b2, c2) == ("blowoff", "flashback", "flashback", "blowoff")
    assert l1 == pytest.approx(0.9, abs=0.006) and h1 == pytest.approx(0.95, abs=0.006)
    assert l2 == pytest.approx(1.15, abs=0.006) and h2 == pytest.approx(1.2, abs=0.006)


def test_edges_at_the_ends_of_the_axis_and_of_the_sweep():
    safe = _margins(lambda x: 1.0, lambda x: 1.0)
    answer, asked = _search(window_search([(0.0, safe(0)), (0.3, safe(0.3))], PARTS, 0.005, 12, (0.0, 1.0)), safe)
    assert _edges(answer) == [(0.0, "range end", "", 1.0, "range end", "")] and asked == [1.0]
    answer, asked = _search(window_search([(0.7, safe(0.7)), (1.0, safe(1.0))], PARTS, 0.005, 12), safe)
    assert _edges(answer) == [(0.7, "swept end", "", 1.0, "swept end", "")] and asked == []


def test_a_flame_that_does_not_burn_inside_the_bracket_stops_that_edge_with_the_known_bracket():
    base = _margins(lambda x: 4 * (0.17 - x), lambda x: 1.0)

    def rowf(x):
        return {"status": "failed"} if 0.12 < x < 0.2 else base(x)
    swept = [(x, base(x)) for x in (0.0, 0.1, 0.2)]
    answer, _ = _search(window_search(swept, PARTS, 0.005, 12, (0.0, 1.0)), rowf)
    (w,) = answer.windows
    assert w.upper.kind == "stopped" and "no burning flame" in w.upper.note
    assert w.upper.value <= 0.17 <= w.upper.failing  # the admissible end: never a number past the edge


def test_the_wobbe_band_cuts_a_window_and_keeps_what_the_flames_alone_allow():
    from flamecharts.admissible.search import Edge, Window
    flame = Window(Edge(0.0, "range end"), Edge(0.6, "found", "flashback"))
    (w,) = within_band([flame], [(0.0, 0.404)])
    assert (w.lower.value, w.upper.value, w.upper.kind, w.upper.binding) == (0.0, 0.404, "Wobbe band", "Wobbe band")
    assert w.flame is flame
    assert within_band([flame], []) == []  # the band holds no blend: no window, whatever the flames allow
    (w,) = within_band([flame], [(0.0, 0.9)])
    assert w.upper is flame.upper  # the band wider than the flame window: the flame criterion binds


def test_band_intervals_of_a_wobbe_index_rising_then_falling():
    from flamecharts.admissible.driver import band_intervals
    assert band_intervals(lambda x: 0.404 - x) == [(0.0, pytest.approx(0.404, abs=1e-6))]
    assert band_intervals(lambda x: -1.0) == []
    (a, b), (c, d) = band_intervals(lambda x: (x - 0.5) ** 2 - 0.01)   # leaves the band in the middle
    assert (a, b, c, d) == (0.0, pytest.approx(0.4, abs=1e-6), pytest.approx(0.6, abs=1e-6), 1.0)


# ---- config
@pytest.mark.parametrize("extra, message", [
    ("[limits]\n", r"needs a \[burner\]"),
    (BURNER + "[limits]\nblend_fraction_tolerance = 0.5\n", "0.5 percentage points is 0.005"),
    (BURNER + "[limits]\ncriteria = ['flashbak']\n", "did you mean 'flashback'"),
    (BURNER + "[limits]\ncriteria = ['stabilizer']\n", "no 'stabilizer_size_mm'"),
    (BURNER + "[limits]\nfind = 'window'\n", "limits.find"),
    (BURNER + "[limits]\ncriteria = ['flashback', 'wobbe']\n", "sets no band"),
    (BURNER + "[gas_quality]\nwobbe_tolerance_percent = 5\n[limits]\ncriteria = ['wobbe']\n", "at least one burner"),
])
def test_limits_table_errors_name_the_key(tmp_path, extra, message):
    cfg = write_h2_study(tmp_path, extra=extra)
    with pytest.raises(ConfigError, match=message):
        flamecharts.load_study(cfg)


def test_blend_limit_needs_a_blend(tmp_path):
    cfg = write_h2_study(tmp_path, extra=BURNER + "[limits]\nfind = ['blend_fraction']\n")
    text = cfg.read_text().replace('blend = { with = "hydrogen", fraction = [0.0, 0.5] }\n', "")
    cfg.write_text(text)
    with pytest.raises(ConfigError, match="blends nothing"):
        flamecharts.load_study(cfg)


# ---- the whole pipeline on real flames (h2o2.yaml)
def _crossing_of_sweep(rows, col="flashback_margin", need=1.5):
    """Where a finely swept margin crosses its minimum, by linear interpolation of ln(margin)."""
    pts = sorted((r["blend_fraction"], math.log(r[col] / need)) for r in rows)
    for (x0, g0), (x1, g1) in zip(pts, pts[1:]):
        if g0 >= 0 > g1:
            return x0 + g0 * (x1 - x0) / (g0 - g1)
    raise AssertionError(f"no crossing in {pts}")


def test_limit_matches_a_fine_sweep_and_reruns_cost_nothing(tmp_path):
    limits = BURNER + "[limits]\nfind = ['blend_fraction']\ncriteria = ['flashback']\n"
    cfg = write_h2_study(tmp_path, phis="[1.0]", fractions="[0.0, 0.3]", extra=limits)
    res = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    (lim,) = res.limits
    assert (lim["outcome"], lim["lower_kind"], lim["upper_kind"], lim["upper_binding"]) == (
        "window", "range end", "found", "flashback")
    assert lim["lower_edge"] == 0.0 and abs(lim["upper_bracket_failing"] - lim["upper_edge"]) <= 0.005
    assert 2 <= lim["flames_evaluated"] <= 7   # the pure blend gas, then the edge
    assert res.summary.limit_flames == lim["flames_evaluated"]
    assert (tmp_path / "out" / "limits.csv").is_file()
    ds = res.limits_dataset  # limits.csv as a Dataset over `search`, units as in results.nc
    assert ds.sizes["search"] == 1 and float(ds["upper_edge"][0]) == lim["upper_edge"]
    assert str(ds["upper_binding"].values[0]) == "flashback" and ds["flames_evaluated"].attrs["units"] == "1"

    fine = write_h2_study(tmp_path, name="fine", phis="[1.0]",
                          fractions="[" + ", ".join(f"{x:.2f}" for x in np.arange(0.0, 0.161, 0.02)) + "]",
                          extra=BURNER)
    fine_rows = flamecharts.run(fine, out=tmp_path / "fine", jobs=1, charts=False).rows
    assert abs(lim["upper_edge"] - _crossing_of_sweep(fine_rows)) <= 0.005

    again = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    assert again.summary.solved == 0 and again.summary.limit_flames == 0
    assert again.limits[0]["upper_edge"] == lim["upper_edge"]
    assert flamecharts.open_results(tmp_path / "out").limits[0]["upper_edge"] == lim["upper_edge"]

    # a stricter minimum margin: only the flames its new search asks for
    cfg.write_text(cfg.read_text().replace('port_velocity_m_s = 2.5', 'port_velocity_m_s = 2.5\nmin_flashback_margin = 1.3'))
    stricter = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    (lim2,) = stricter.limits
    assert stricter.summary.solved == 0 and 0 < stricter.summary.limit_flames <= lim2["flames_evaluated"]
    assert lim2["upper_edge"] > lim["upper_edge"]


# ---- a window between two swept blends (h2o2 flames): a gas of 30 % hydrogen in nitrogen on a 4 mm
# round port at 0.6 m/s blended with hydrogen; at phi 0.8 the swept fractions 0, 0.3 and 0.6 all fail
# (blowoff at 0, flashback above), the window lies between 0 and 0.3 (invented burner).
WINDOW_STUDY = """
title = "Window between swept blends: diluted hydrogen on a 4 mm port"
mechanism = "h2o2.yaml"

[fuels]
lean_h2 = {{ H2 = 0.3, N2 = 0.7 }}
hydrogen = {{ H2 = 1.0 }}

[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}

[sweep]
fuel = ["lean_h2"]
oxidizer = ["air"]
blend = {{ with = "hydrogen", fraction = {fractions} }}
equivalence_ratio = [0.8]
pressure_bar = [1.0]
unburned_temperature_K = [300.0]

[burner]
name = "4 mm round port"
port = "round"
port_diameter_mm = {diameter}
port_velocity_m_s = {velocity}
min_flashback_margin = {min_fb}
min_blowoff_margin = {min_bo}
{limits}
"""


def _window_study(folder, name, fractions, diameter=4.0, velocity=0.6, min_fb=1.5, min_bo=1.5, limits=True):
    path = folder / f"{name}.toml"
    path.write_text(WINDOW_STUDY.format(fractions=fractions, diameter=diameter, velocity=velocity, min_fb=min_fb,
                                        min_bo=min_bo, limits="[limits]\nfind = ['blend_fraction']" if limits else ""))
    return path


FINE = "[" + ", ".join(f"{x:.2f}" for x in np.arange(0.0, 0.605, 0.01)) + "]"


@pytest.fixture(scope="module")
def fine_store(tmp_path_factory):
    """One store holding a 0.01-step blend sweep (0 to 0.6) at phi 0.8: every burner below is judged
    on these flames without solving them again (a changed burner re-solves nothing)."""
    folder = tmp_path_factory.mktemp("window")
    flamecharts.run(_window_study(folder, "fine", FINE, limits=False), out=folder / "out", jobs=2, charts=False,
                    report=False)
    return folder


def _fine_truth(folder, **burner):
    """Admissible flags of the fine sweep under ``burner`` (no flame solved: all stored)."""
    res = flamecharts.run(_window_study(folder, "fine", FINE, limits=False, **burner), out=folder / "out", jobs=1,
                          charts=False, report=False)
    assert res.summary.solved == 0
    need = (burner.get("min_fb", 1.5), burner.get("min_bo", 1.5))
    return sorted((r["blend_fraction"], r["flashback_margin"] >= need[0] and r["blowoff_margin"] >= need[1])
                  for r in res.rows)


def _check_windows_against_fine_sweep(limits, truth, tol=0.005, step=0.01):
    """Every admissible fine point lies in a reported window; every found edge lies within the tolerance
    plus the fine step of where the fine sweep changes (a window narrower than the fine step, which the
    fine sweep cannot see, must fit between two of its points)."""
    wins = [r for r in limits if r["outcome"] == "window"]
    for x, ok in truth:
        inside = any(r["lower_edge"] - tol - 1e-9 <= x <= r["upper_edge"] + tol + 1e-9 for r in wins)
        if ok:
            assert inside, (f"fine point {x:g} keeps every margin but lies in no window "
                            f"{[(r['lower_edge'], r['upper_edge']) for r in wins]}")
    changes = [0.5 * (a[0] + b[0]) for a, b in zip(truth, truth[1:]) if a[1] != b[1]]
    for r in wins:
        if not any(r["lower_edge"] <= x <= r["upper_edge"] for x, _ in truth):
            # narrower than the fine step: the fine sweep cannot see it; it must fit between two fine points
            assert r["upper_edge"] - r["lower_edge"] <= step + 2 * tol
            continue
        for side in ("lower", "upper"):
            if r[f"{side}_kind"] == "found" and r[f"{side}_edge"] <= truth[-1][0]:
                v = r[f"{side}_edge"]
                assert changes and min(abs(v - c) for c in changes) <= tol + step, (side, v, changes)


def test_the_window_between_swept_blends_matches_a_fine_sweep(fine_store):
    coarse = _window_study(fine_store, "coarse", "[0.0, 0.3, 0.6]")
    res = flamecharts.run(coarse, out=fine_store / "out", jobs=2, charts=False, report=False)
    truth = _fine_truth(fine_store)
    (lim,) = res.limits
    assert lim["outcome"] == "window" and (lim["lower_binding"], lim["upper_binding"]) == ("blowoff", "flashback")
    assert 0.0 < lim["lower_edge"] < lim["upper_edge"] < 0.3   # strictly between two swept fractions
    _check_windows_against_fine_sweep(res.limits, truth)
    assert "blowoff at 0; flashback at 0.3, 0.6, 1" == lim["swept_failures"]


from hypothesis import HealthCheck, example, given, settings, strategies as st  # noqa: E402


@settings(max_examples=4, deadline=None, derandomize=True, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(diameter=st.floats(2.5, 8.0), velocity=st.floats(0.3, 2.5), min_fb=st.floats(1.1, 2.5),
       min_bo=st.floats(1.1, 2.5))
@example(diameter=4.0, velocity=0.6, min_fb=1.5, min_bo=1.5)
def test_property_every_admissible_fine_point_lies_in_a_reported_window(fine_store, diameter, velocity, min_fb,
                                                                        min_bo):
    burner = dict(diameter=round(diameter, 3), velocity=round(velocity, 3), min_fb=round(min_fb, 3),
                  min_bo=round(min_bo, 3))
    coarse = _window_study(fine_store, "coarse", "[0.0, 0.3, 0.6]", **burner)
    res = flamecharts.run(coarse, out=fine_store / "out", jobs=2, charts=False, report=False)
    _check_windows_against_fine_sweep(res.limits, _fine_truth(fine_store, **burner))


def test_a_resumed_run_gives_the_same_limits_to_the_last_digit(tmp_path):
    """Limit flames warm-start from the sweep's flames only: a run that lost some of its limit flames
    (killed mid-search, or a flame that ran out of time) and solves them again, now with later limit
    flames in the store, gives the uninterrupted run's limits exactly."""
    import shutil
    import sqlite3

    from flamecharts.sweep.points import points
    limits = BURNER + "[limits]\n"
    cfg = write_h2_study(tmp_path, phis="[0.6, 0.9, 1.2]", fractions="[0.0, 0.5]", extra=limits)
    first = flamecharts.run(cfg, out=tmp_path / "a", jobs=2, charts=False, report=False)
    assert first.summary.limit_flames >= 6
    shutil.copytree(tmp_path / "a", tmp_path / "b")
    swept = {p.key for p in points(first.study)}
    with sqlite3.connect(tmp_path / "b" / "results.db") as db:
        extra = [k for (k,) in db.execute("SELECT key FROM points ORDER BY rowid") if k not in swept]
        lost = extra[:3]  # the earliest limit flames: later ones, stored, are nearer neighbours now
        db.executemany("DELETE FROM points WHERE key = ?", [(k,) for k in lost])
    again = flamecharts.run(cfg, out=tmp_path / "b", jobs=2, charts=False, report=False)
    assert again.summary.limit_flames == len(lost)
    assert again.limits == first.limits


def test_a_swept_blend_outside_the_wobbe_band_is_named_as_failing_by_it():
    from flamecharts.admissible.search import apply_band
    # flames alone admissible from 0.26 to 0.368; the band ends at 0.202: no window, 0.3 fails by the band
    rowf = _margins(lambda x: 3 * (0.37 - x), lambda x: 4 * (x - 0.26))
    answer, _ = _search(window_search([(x, rowf(x)) for x in (0.0, 0.1, 0.2, 0.3)], PARTS, 0.005, 12, (0.0, 1.0)),
                        rowf)
    apply_band(answer, [(0.0, 0.202)])
    assert answer.windows == [] and len(answer.flame_windows) == 1
    assert answer.failures == [(0.0, "blowoff"), (0.1, "blowoff"), (0.2, "blowoff"), (0.3, "Wobbe band"),
                               (1.0, "flashback")]


def test_a_margin_best_at_the_end_of_the_axis_costs_one_flame_unless_it_peaks_just_inside():
    # blowoff margin rising all the way to the pure blend gas, below its minimum everywhere: one flame
    # a tolerance inside the end shows it still rises there, so no window can hide before it
    rising = _margins(lambda x: 2.0, lambda x: x - 1.2)
    answer, asked = _search(window_search([(x, rising(x)) for x in (0.0, 0.3, 0.6)], PARTS, 0.005, 12, (0.0, 1.0)),
                            rising)
    assert answer.windows == [] and asked == [1.0, pytest.approx(0.995)]
    assert answer.miss.at == 1.0
    # a margin that peaks at 0.9, above its minimum from 0.85 to 0.95: found by the maximisation
    peaked = _margins(lambda x: 2.0, lambda x: 0.1 - 40 * (x - 0.9) ** 2)
    answer, _ = _search(window_search([(x, peaked(x)) for x in (0.0, 0.3, 0.6)], PARTS, 0.005, 12, (0.0, 1.0)),
                        peaked)
    ((lo, _, _, hi, _, _),) = _edges(answer)
    assert lo == pytest.approx(0.9 - math.sqrt(0.1 / 40), abs=0.005) and hi == pytest.approx(0.9 + math.sqrt(0.1 / 40), abs=0.005)


def test_no_window_is_looked_for_where_the_wobbe_band_rules_every_blend_out():
    # the flame window of the first test (0.15-0.18) lies outside a band from 0.4 to 0.5: nothing is
    # solved between the failing swept blends, and the answer says where it did not look
    rowf = _margins(lambda x: 8 * (0.18 - x), lambda x: 9 * (x - 0.15))
    swept = [(x, rowf(x)) for x in (0.0, 0.3, 0.6)]
    answer, asked = _search(window_search(swept, PARTS, 0.005, 12, (0.0, 1.0), look_inside=[(0.4, 0.5)]), rowf)
    assert answer.windows == [] and asked == [1.0]
    assert answer.skipped == [(0.0, 0.3)]


def test_a_flashback_dip_between_two_admissible_phis_splits_the_window():
    # the flashback margin is lowest where the flame is fastest (phi 1.05) and falls below its minimum
    # from 1.026 to 1.074, narrower than the sweep step: two windows, none across the dip
    rowf = _margins(lambda p: 40 * (p - 1.05) ** 2 - 0.02, lambda p: 1.0)
    swept = [(p, rowf(p)) for p in (0.8, 0.9, 1.0, 1.1, 1.2, 1.3)]
    answer, asked = _search(window_search(swept, PARTS, 0.005, 12), rowf)
    (l1, k1, _, h1, _, b1), (l2, _, b2, h2, k2, _) = _edges(answer)
    edge = math.sqrt(0.02 / 40)
    assert (k1, b1, b2, k2) == ("swept end", "flashback", "flashback", "swept end")
    assert h1 == pytest.approx(1.05 - edge, abs=0.005) and l2 == pytest.approx(1.05 + edge, abs=0.005)
    assert h1 <= 1.05 - edge + 1e-9 and l2 >= 1.05 + edge - 1e-9   # admissible ends
    assert all(0.9 < x < 1.1 for x in asked)  # between the neighbours of the lowest swept margin
    # with the margin 2.7 times its minimum at the lowest swept point the dip is not looked for
    wide = _margins(lambda p: 40 * (p - 1.05) ** 2 + 1.0, lambda p: 1.0)
    answer, asked = _search(window_search([(p, wide(p)) for p in (0.8, 0.9, 1.0, 1.1, 1.2, 1.3)], PARTS, 0.005, 12),
                            wide)
    assert asked == [] and _edges(answer) == [(0.8, "swept end", "", 1.3, "swept end", "")]


def test_a_dip_inside_an_interval_that_fails_at_one_end_is_found_with_the_window_behind_it():
    # admissible 0.9-0.95 and 1.15-1.2 (blowoff outside, flashback dip inside); swept 0.6, 0.9, 1.4
    rowf = _margins(lambda p: 10 * abs(p - 1.05) - 1.0, lambda p: 0.25 - 11.111 * (p - 1.05) ** 2)
    answer, _ = _search(window_search([(p, rowf(p)) for p in (0.6, 0.9, 1.4)], PARTS, 0.005, 12), rowf)
    (l1, _, _, h1, _, _), (l2, _, _, h2, _, _) = _edges(answer)
    assert l1 == pytest.approx(0.9, abs=0.006) and h1 == pytest.approx(0.95, abs=0.006)
    assert l2 == pytest.approx(1.15, abs=0.006) and h2 == pytest.approx(1.2, abs=0.006)


def test_an_edge_toward_a_mixture_that_does_not_burn_is_refined():
    base = _margins(lambda p: 1.0, lambda p: 1.0)

    def rowf(p):
        return {"status": "no_flame"} if p < 0.43 else base(p)
    answer, _ = _search(window_search([(p, rowf(p)) for p in (0.4, 0.5, 0.6)], PARTS, 0.005, 12), rowf)
    (w,) = answer.windows
    assert (w.lower.kind, w.lower.binding) == ("found", "no flame")
    assert 0.43 <= w.lower.value <= 0.435 and w.lower.failing < 0.43


def test_a_margin_lowest_at_the_first_swept_value_costs_one_flame_to_rule_a_dip_out():
    # blowoff margin rising with hydrogen, 10 % above its minimum on the unblended gas: one flame a
    # tolerance inside shows it rises there, so it cannot dip below its minimum further in
    rowf = _margins(lambda x: 1.0, lambda x: 0.1 + 2 * x)
    answer, asked = _search(window_search([(x, rowf(x)) for x in (0.0, 0.3, 0.6)], PARTS, 0.005, 12, (0.0, 1.0)),
                            rowf)
    assert asked == [1.0, pytest.approx(0.005)]
    assert _edges(answer) == [(0.0, "range end", "", 1.0, "range end", "")]
