"""Admissible limits by warm-started root finding (the [limits] table).

The root finder is checked against SciPy's Brent implementation (scipy.optimize.brentq;
Brent 1973, ch. 4); the searches against synthetic margins whose crossing is known in
closed form; the whole pipeline against the crossing read from a fine blend sweep of
the same burner (h2o2.yaml, seconds per flame).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq

import flamecharts
from flamecharts.admissible.brent import brent_steps, drive
from flamecharts.admissible.search import blend_search, crossing, window_searches
from flamecharts.errors import ConfigError
from tests.conftest import write_h2_study

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


# ---- searches on synthetic margins: margin(x) = 3 exp(-4 x), flashback minimum 1.5 -> limit ln 2 / 4
def _row(m):
    return {"status": "ok", "flashback_margin": m}


def _value(row):
    if row["status"] != "ok":
        return None, f"{row['status']}: no flame"
    return math.log(row["flashback_margin"] / 1.5), "flashback"


def _run(gen, rowf):
    asked = []
    try:
        x = next(gen)
        while True:
            asked.append(x)
            x = gen.send(rowf(x))
    except StopIteration as stop:
        return stop.value, asked


MARGIN = (lambda x: _row(3.0 * math.exp(-4.0 * x)))
LIMIT = math.log(2.0) / 4.0  # 0.17329


def test_blend_limit_within_tolerance_in_few_flames():
    swept = [(x, MARGIN(x)) for x in (0.0, 0.1, 0.2, 0.3)]
    found, asked = _run(blend_search(swept, 1.0, "", 0.005, 12, _value), MARGIN)
    assert found.outcome == "found" and found.binding == "flashback"
    assert found.value <= LIMIT <= found.bracket[1] and found.bracket[1] - found.value <= 0.005
    assert 0.1 <= min(asked) and max(asked) <= 0.2 and len(asked) <= 4  # bracketed on the sweep


def test_wobbe_bound_narrows_the_search_and_binds_when_lower():
    swept = [(x, MARGIN(x)) for x in (0.0, 0.1)]
    found, asked = _run(blend_search(swept, 0.12, "low", 0.005, 12, _value), MARGIN)
    assert (found.outcome, found.binding, asked) == ("found", "Wobbe band", [0.12])
    assert found.value == 0.12


def test_limit_outside_the_range_says_so():
    safe = (lambda x: _row(10.0))
    found, asked = _run(blend_search([(0.0, safe(0)), (0.3, safe(0.3))], 1.0, "", 0.005, 12, _value), safe)
    assert (found.outcome, found.binding, found.value, asked) == ("whole range", "none in range", 1.0, [1.0])
    bad = (lambda x: _row(1.0))
    found, asked = _run(blend_search([(0.0, bad(0)), (0.3, bad(0.3))], 1.0, "", 0.005, 12, _value), bad)
    assert found.outcome == "none admissible" and found.value is None and asked == []


def test_a_flame_that_fails_inside_the_bracket_stops_the_search_with_the_known_bracket():
    def rowf(x):
        return {"status": "failed"} if 0.12 < x < 0.2 else MARGIN(x)
    swept = [(x, MARGIN(x)) for x in (0.0, 0.1, 0.2)]
    found, asked = _run(blend_search(swept, 1.0, "", 0.005, 12, _value), rowf)
    assert found.outcome == "stopped" and "no burning flame" in found.note
    assert found.value <= LIMIT  # the admissible end: never a number past the limit
    assert found.bracket[0] <= LIMIT <= found.bracket[1]


def test_window_edges_on_both_sides():
    # admissible between phi 0.75 and 1.12: blowoff fails lean, flashback rich
    def rowf(phi):
        return {"status": "ok", "flashback_margin": 1.5 * math.exp(3 * (1.12 - phi)),
                "blowoff_margin": 1.5 * math.exp(2 * (phi - 0.75))}

    def value(r):
        g = {c: math.log(r[c + "_margin"] / 1.5) for c in ("flashback", "blowoff")}
        c = min(g, key=g.get)
        return g[c], c
    swept = [(p, rowf(p)) for p in (0.6, 0.8, 1.0, 1.2, 1.4)]
    pairs, ends, kinds = window_searches(swept, value)
    assert ends == [] and [k for k, *_ in pairs] == ["lean edge", "rich edge"]
    got = {}
    for kind, xg, rg, xb, rb in pairs:
        found, _ = _run(crossing(xg, rg, xb, rb, 0.005, 12, value), rowf)
        got[kind] = found
    assert abs(got["lean edge"].value - 0.75) <= 0.005 and got["lean edge"].binding == "blowoff"
    assert abs(got["rich edge"].value - 1.12) <= 0.005 and got["rich edge"].binding == "flashback"
    assert got["lean edge"].value >= 0.75 - 1e-9 and got["rich edge"].value <= 1.12 + 1e-9  # admissible ends


# ---- config
@pytest.mark.parametrize("extra, message", [
    ("[limits]\n", r"needs a \[burner\]"),
    (BURNER + "[limits]\nblend_fraction_tolerance = 0.5\n", "0.5 percentage points is 0.005"),
    (BURNER + "[limits]\ncriteria = ['flashbak']\n", "did you mean 'flashback'"),
    (BURNER + "[limits]\ncriteria = ['stabilizer']\n", "no 'stabilizer_size_mm'"),
    (BURNER + "[limits]\nfind = 'window'\n", "limits.find"),
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
    assert lim["outcome"] == "found" and lim["binding"] == "flashback"
    assert lim["tolerance_reached"] <= 0.005 and 1 <= lim["flames_evaluated"] <= 6
    assert res.summary.limit_flames == lim["flames_evaluated"]
    assert (tmp_path / "out" / "limits.csv").is_file()

    fine = write_h2_study(tmp_path, name="fine", phis="[1.0]",
                          fractions="[" + ", ".join(f"{x:.2f}" for x in np.arange(0.0, 0.161, 0.02)) + "]",
                          extra=BURNER)
    fine_rows = flamecharts.run(fine, out=tmp_path / "fine", jobs=1, charts=False).rows
    assert abs(lim["limit_value"] - _crossing_of_sweep(fine_rows)) <= 0.005

    again = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    assert again.summary.solved == 0 and again.summary.limit_flames == 0
    assert again.limits[0]["limit_value"] == lim["limit_value"]
    assert flamecharts.open_results(tmp_path / "out").limits[0]["limit_value"] == lim["limit_value"]

    # a stricter minimum margin: only the flames its new search asks for
    cfg.write_text(cfg.read_text().replace('port_velocity_m_s = 2.5', 'port_velocity_m_s = 2.5\nmin_flashback_margin = 1.3'))
    stricter = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    (lim2,) = stricter.limits
    assert stricter.summary.solved == 0 and 0 < stricter.summary.limit_flames <= lim2["flames_evaluated"]
    assert lim2["limit_value"] > lim["limit_value"]
