"""Fault hardening: kills at any moment, Ctrl-C, solver failures, physical range checks.

The kill and Ctrl-C tests drive the CLI in subprocesses (started in their own session so
a signal reaches only the process it is sent to) on a 12-point h2o2.yaml study, and
compare the final table with an uninterrupted run of the same study. Resumed runs
reproduce uninterrupted ones exactly: the runner plans warm starts over all points of the
study, stored ones included, and starts each point from the same neighbour's profile
(read from the store when that neighbour was solved by an earlier run), so the flame
speeds are compared to 1e-6 relative.
"""
from __future__ import annotations

import contextlib
import csv
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import cantera as ct
import psutil
import pytest

from flamecharts import load_study, run_study
from flamecharts.chemistry import flame
from flamecharts.physics.limits import flammability_warning, pressure_warning
from flamecharts.pipeline import solve_study
from flamecharts.store import DB_NAME, Store
from flamecharts.sweep.points import points
from flamecharts.sweep.run import unique_points, warm_plan
from flamecharts.sweep.warm_tree import warm_tree

from conftest import run_cli, run_workers as _workers, write_h2_study

STUDY = dict(fractions="[0.0, 0.5]", phis="[0.6, 0.8, 1.0, 1.2, 1.5, 2.0]")  # 12 points
N_POINTS = 12
POLL_S = 0.02
PATIENCE_S = 600  # a bound against hanging, never a timing assertion


def _rows_ro(db: Path) -> dict[str, tuple]:
    """key -> (status, run_id, finished_at, flame speed) read with a read-only connection."""
    import json

    try:
        con = sqlite3.connect(f"file:{db}?mode=ro", uri=True, timeout=5)
        rows = con.execute("SELECT key, status, run_id, finished_at, metrics, message FROM points").fetchall()
        con.close()
    except sqlite3.Error:
        return {}
    return {k: (s, run, fin, json.loads(m)["laminar_flame_speed_m_s"] if m else None, msg)
            for k, s, run, fin, m, msg in rows}


def _count(db: Path) -> int:
    return len(_rows_ro(db))


def _start(config: Path, out: Path, *extra) -> subprocess.Popen:
    return subprocess.Popen([sys.executable, "-m", "flamecharts", "run", str(config), "--out", str(out),
                             "--jobs", "2", "--quiet", *extra], start_new_session=True,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)


def _wait_for(cond, proc) -> bool:
    """Poll until cond() holds while proc runs; False if proc ended first."""
    deadline = time.time() + PATIENCE_S
    while time.time() < deadline:
        if proc.poll() is not None:
            return False
        if cond():
            return True
        time.sleep(POLL_S)
    raise AssertionError("the run neither reached the kill moment nor ended")


def _integrity(db: Path) -> None:
    with Store(db) as st:
        assert st.integrity_ok()


def _assert_same_table(db: Path, reference: dict, loose: set[str] = frozenset()) -> None:
    """Statuses equal and flame speeds equal to 1e-6; for the keys in ``loose``, which
    started from another neighbour than in the reference, within the 0.5 % grid-history
    spread of lean hydrogen (docs/benchmarks.md, Accuracy of the numerical settings)."""
    rows = _rows_ro(db)
    assert set(rows) == set(reference)
    for key, (status, _, _, speed, msg) in rows.items():
        assert status == reference[key][0], msg
        if speed is not None:
            assert speed == pytest.approx(reference[key][3], rel=5e-3 if key in loose else 1e-6)


def _below(config: Path, db: Path, keys: list[str]) -> set[str]:
    """Keys of the points whose warm-start path up the run's own tree passes through one
    of ``keys`` (a failed point passes its own source on to the points below it)."""
    pts = unique_points(points(load_study(config)))
    with Store(db, readonly=True) as store:
        tree = warm_plan(store, pts)
    key_of = {p.index: p.key for p in pts}
    out = set()
    for p in pts:
        i = tree.parent[p.index]
        while i is not None:
            if key_of[i] in keys:
                out.add(p.key)
                break
            i = tree.parent[i]
    return out


@pytest.fixture(scope="module")
def reference(tmp_path_factory):
    """The study solved by one uninterrupted run: (config path, key -> row)."""
    folder = tmp_path_factory.mktemp("reference")
    config = write_h2_study(folder, **STUDY)
    r = run_cli("run", config, "--out", folder / "out", "--jobs", "2", "--no-charts", "--quiet")
    assert r.returncode == 0, r.stderr
    rows = _rows_ro(folder / "out" / DB_NAME)
    assert len(rows) == N_POINTS and all(v[0] == "ok" for v in rows.values())
    return config, rows


@pytest.mark.slow
def test_kill_9_of_the_parent_at_five_moments_then_resume_exactly(tmp_path, reference):
    """SIGKILL to the CLI process before the first commit, after 2, 5 and 8 committed points
    and while it writes results.csv and the charts; each rerun resumes where the last one
    stopped, and the last one completes the study with the same table as an uninterrupted run."""
    config, ref = reference
    out = tmp_path / "out"
    db = out / DB_NAME
    committed: dict[str, tuple] = {}
    for moment in ("before the first commit", 2, 5, 8, "while writing outputs"):
        proc = _start(config, out, "--no-report")
        base = len(committed)
        if moment == "before the first commit":
            reached = _wait_for(lambda proc=proc: db.exists() and _workers(proc.pid), proc)
            assert _count(db) == 0
        elif moment == "while writing outputs":
            reached = _wait_for(lambda: _count(db) == N_POINTS, proc)
        else:
            reached = _wait_for(lambda moment=moment: _count(db) >= moment, proc)
        assert reached, f"the run ended before the kill moment {moment}: {proc.communicate()}"
        os.kill(proc.pid, signal.SIGKILL)
        proc.wait()
        assert proc.returncode == -signal.SIGKILL
        with contextlib.suppress(ProcessLookupError):  # workers end with the run (test_orphans.py)
            os.killpg(proc.pid, signal.SIGKILL)  # anything left of the run; it never writes the store
        _integrity(db)
        now = _rows_ro(db)
        for key, row in committed.items():  # nothing committed was solved again
            assert now[key][1:3] == row[1:3]
        assert len(now) >= base
        committed = now
        if moment == "while writing outputs" and (out / "results.csv").exists():
            with open(out / "results.csv", newline="") as fh:  # written atomically: whole or absent
                assert len(list(csv.DictReader(fh))) == N_POINTS
    r = run_cli("run", config, "--out", out, "--jobs", "2", "--no-report")
    assert r.returncode == 0, r.stderr
    assert f"solved 0 now, {N_POINTS} from the store" in r.stdout
    _integrity(db)
    final = _rows_ro(db)
    for key, row in committed.items():
        assert final[key][1:3] == row[1:3]
    _assert_same_table(db, ref)
    with open(out / "results.csv", newline="") as fh:
        assert len(list(csv.DictReader(fh))) == N_POINTS
    assert (out / "charts" / "flame_speed_vs_equivalence_ratio.png").is_file()


@pytest.mark.slow
def test_kill_9_of_a_worker_at_five_moments_loses_nothing(tmp_path, reference):
    """SIGKILL to one worker process before the first commit and after 1, 3, 6 and 9
    committed points of one run: the run retries the flames the dead worker held and
    carries on; the table equals an uninterrupted run's."""
    config, ref = reference
    out = tmp_path / "out"
    db = out / DB_NAME
    proc = _start(config, out, "--no-charts")
    kills = 0
    for moment in (0, 1, 3, 6, 9):
        if not _wait_for(lambda moment=moment: _count(db) >= moment and _workers(proc.pid), proc):
            break
        snapshot = _rows_ro(db)
        victims = _workers(proc.pid)
        try:
            victims[0].kill()
            kills += 1
        except psutil.NoSuchProcess:
            pass
        _wait_for(lambda snapshot=snapshot: _count(db) > len(snapshot) or not _workers(proc.pid), proc)
    stdout, stderr = proc.communicate(timeout=PATIENCE_S)
    assert proc.returncode == 0, stderr
    assert kills >= 3  # the run is long enough for most moments (each flame takes ~1 s)
    _integrity(db)
    rows = _rows_ro(db)
    # a point whose worker died three times is recorded as a worker error; the next run solves it again
    again = [k for k, v in rows.items() if v[4].startswith("worker error")]
    r = run_cli("run", config, "--out", out, "--jobs", "2", "--no-charts")
    assert r.returncode == 0, r.stderr
    assert f"solved {len(again)} now" in r.stdout
    final = _rows_ro(db)
    for key, row in rows.items():
        if key not in again:
            assert final[key][1:3] == row[1:3]
    # a flame in flight when its worker died more than MAX_RETRIES times (loky breaks every
    # flame in flight at each kill) is a worker error: the points below it started from
    # the flame above it, as in a run where it failed, and keep that answer
    _assert_same_table(db, ref, loose=_below(config, db, again))


@pytest.mark.slow
def test_first_ctrl_c_finishes_running_flames_exits_130_and_leaves_no_workers(tmp_path, reference):
    config, ref = reference
    out = tmp_path / "out"
    db = out / DB_NAME
    proc = _start(config, out, "--no-charts")
    assert _wait_for(lambda: _count(db) >= 1 and len(_workers(proc.pid)) == 2, proc)
    workers = _workers(proc.pid)
    os.kill(proc.pid, signal.SIGINT)
    stdout, stderr = proc.communicate(timeout=PATIENCE_S)
    assert proc.returncode == 130, stderr
    assert "no new flames are started" in stderr
    assert "run the same command again to resume" in stderr and "Traceback" not in stderr
    gone, alive = psutil.wait_procs(workers, timeout=30)
    assert not alive, f"orphan workers: {alive}"
    _integrity(db)
    before = _rows_ro(db)
    assert 1 <= len(before) < N_POINTS
    assert all(v[0] == "ok" for v in before.values())  # running flames finished, nothing abandoned
    r = run_cli("run", config, "--out", out, "--jobs", "2", "--no-charts")
    assert r.returncode == 0, r.stderr
    assert f"solved {N_POINTS - len(before)} now, {len(before)} from the store" in r.stdout
    for key, row in before.items():
        assert _rows_ro(db)[key][1:3] == row[1:3]
    _assert_same_table(db, ref)


@pytest.mark.slow
def test_second_ctrl_c_stops_at_once_and_stores_nothing_partial(tmp_path, reference):
    config, _ = reference
    out = tmp_path / "out"
    db = out / DB_NAME
    proc = _start(config, out, "--no-charts")
    assert _wait_for(lambda: db.exists() and len(_workers(proc.pid)) == 2, proc)
    workers = _workers(proc.pid)
    os.kill(proc.pid, signal.SIGINT)
    time.sleep(0.2)
    os.kill(proc.pid, signal.SIGINT)
    stdout, stderr = proc.communicate(timeout=PATIENCE_S)
    assert proc.returncode == 130, stderr
    assert "Interrupted." in stderr and "Traceback" not in stderr
    gone, alive = psutil.wait_procs(workers, timeout=30)
    assert not alive, f"orphan workers: {alive}"
    _integrity(db)
    for status, *_ in _rows_ro(db).values():  # every stored row is a finished flame
        assert status in ("ok", "no_flame", "failed")


# ---------------------------------------------------------------- solver failures
def _fail_for(monkeypatch, X_target: dict, fresh_too: bool = True, only_width: float | None = None):
    """Make Cantera's solver raise for one mixture (an injected non-convergence)."""
    real_fresh, real_warm = flame._solve_fresh, flame._solve_warm

    def same(X):
        return X_target is None or all(abs(X.get(k, 0) - v) < 1e-12 for k, v in X_target.items())

    def fresh(ct_, gas, T_u, P, X, transport, soret, numerics):
        if same(X) and fresh_too and (only_width is None or numerics.width_m == only_width):
            raise ct.CanteraError("injected: Could not find a solution for the 1D problem")
        return real_fresh(ct_, gas, T_u, P, X, transport, soret, numerics)

    def warm(ct_, gas, T_u, P, X, transport, soret, numerics, w):
        if same(X):
            raise ct.CanteraError("injected: Time integration failed")
        return real_warm(ct_, gas, T_u, P, X, transport, soret, numerics, w)

    monkeypatch.setattr(flame, "_solve_fresh", fresh)
    monkeypatch.setattr(flame, "_solve_warm", warm)


def test_a_failed_point_does_not_poison_the_warm_start_below_it(tmp_path, monkeypatch):
    study = load_study(write_h2_study(tmp_path, fractions="[0.0]", phis="[0.6, 0.8, 1.0]"))
    pts = points(study)
    tree = warm_tree(pts)
    by_phi = {p.phi: p for p in pts}
    # the plan: 1.0 from scratch -> 0.8 -> 0.6
    assert tree.parent[by_phi[0.8].index] == by_phi[1.0].index
    assert tree.parent[by_phi[0.6].index] == by_phi[0.8].index
    clean = {r["equivalence_ratio"]: r for r in run_study(study, out_dir=tmp_path / "clean", jobs=1).rows}
    _fail_for(monkeypatch, by_phi[0.8].X_unburned)
    s = run_study(study, out_dir=tmp_path / "faulty", jobs=1)
    rows = {r["equivalence_ratio"]: r for r in s.rows}
    bad = rows[0.8]
    assert bad["status"] == "failed" and bad["message"].startswith("not converged:")
    assert "warm start" in bad["message"] and "fresh start" in bad["message"]
    assert flame.ROBUST_RETRY in bad["message"]  # one retry with robust settings before giving up
    below = rows[0.6]
    assert below["status"] == "ok" and below["start"] == "warm"  # from 1.0's flame, not the failed one
    # a different warm-start source changes only the grid history: lean hydrogen moves by up to
    # 0.5 % at the standard setting (measured, docs/benchmarks.md "Accuracy of the numerical settings")
    assert below["laminar_flame_speed_m_s"] == pytest.approx(clean[0.6]["laminar_flame_speed_m_s"], rel=5e-3)
    assert s.failed == 1
    # interrupted after 1.0 and the failed 0.8 were stored: the resumed run still starts 0.6 from
    # 1.0's stored flame, as the uninterrupted run did (0.6 lies 4 distance units from 1.0, beyond
    # plan_tree.MAX_WARM_DISTANCE, so planning only the unsolved points would have solved it fresh)
    part = solve_study(study, out_dir=tmp_path / "resumed", jobs=1, stop_after=2)
    assert part.solved == 2 and {r["equivalence_ratio"]: r["status"] for r in part.rows}[0.6] == "pending"
    resumed = {r["equivalence_ratio"]: r for r in run_study(study, out_dir=tmp_path / "resumed", jobs=1).rows}
    assert resumed[0.6]["start"] == "warm"
    assert resumed[0.6]["laminar_flame_speed_m_s"] == pytest.approx(below["laminar_flame_speed_m_s"], rel=1e-6)


def test_a_failed_fresh_solve_is_retried_with_robust_settings(tmp_path, monkeypatch):
    study = load_study(write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]"))
    clean = run_study(study, out_dir=tmp_path / "clean", jobs=1).rows[0]
    _fail_for(monkeypatch, None, only_width=flame.NUMERICS["standard"].width_m)
    row = run_study(study, out_dir=tmp_path / "retry", jobs=1).rows[0]
    assert row["status"] == "ok" and flame.ROBUST_RETRY in row["message"], row["message"]
    # the retry ends on the same final grid criteria: within the setting's 1 % (docs/error-bars.md, "Accuracy and scope")
    assert row["laminar_flame_speed_m_s"] == pytest.approx(clean["laminar_flame_speed_m_s"], rel=0.01)


def test_a_flame_over_its_time_limit_fails_with_that_reason_and_the_run_goes_on(tmp_path, cli):
    """No single flame may hang a run: with a limit no flame can meet, every point is recorded
    as failed (reason: time limit), the run ends with exit 0, and the next run (normal limit)
    solves them all."""
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.8, 1.0]", extra="flame_time_limit_s = 0.001")
    out = tmp_path / "out"
    r = cli("run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet")
    assert r.returncode == 0, r.stderr
    assert "2 failed: 2 time limit" in r.stdout
    rows = list(csv.DictReader(open(out / "results.csv")))
    assert all(row["status"] == "failed" and row["message"].startswith("time limit: gave up after") for row in rows)
    config.write_text(config.read_text().replace("flame_time_limit_s = 0.001", ""))
    r = cli("run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet")
    assert r.returncode == 0 and "solved 2 now, 0 from the store" in r.stdout, r.stdout + r.stderr
    assert all(row["status"] == "ok" for row in csv.DictReader(open(out / "results.csv")))


def _broken_mechanism(folder: Path) -> Path:
    """h2o2.yaml with one absurd rate (A = 1e300, b = 30): it loads, but its rates overflow."""
    src = next(Path(d) / "h2o2.yaml" for d in ct.get_data_directories() if (Path(d) / "h2o2.yaml").exists())
    text = src.read_text()
    good = "rate-constant: {A: 3.87e+04, b: 2.7, Ea: 6260.0}"
    assert good in text
    (folder / "broken.yaml").write_text(text.replace(good, "rate-constant: {A: 1.0e+300, b: 30.0, Ea: 0.0}"))
    return folder / "broken.yaml"


def test_a_mechanism_that_throws_is_a_mechanism_error_and_the_run_exits_0(tmp_path, cli):
    _broken_mechanism(tmp_path)
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[0.8, 1.0]")
    config.write_text(config.read_text().replace('"h2o2.yaml"', '"broken.yaml"'))
    out = tmp_path / "out"
    r = cli("run", config, "--out", out, "--jobs", "1", "--no-charts")
    assert r.returncode == 0, r.stderr
    assert "2 failed: 2 mechanism error" in r.stdout
    with open(out / "results.csv", newline="") as fh:
        rows = list(csv.DictReader(fh))
    assert all(row["status"] == "failed" and row["message"].startswith("mechanism error:") for row in rows)


def test_cli_groups_failures_by_reason(tmp_path, monkeypatch, capsys):
    from flamecharts import cli as climod

    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0, 1.2]")
    study = load_study(config)
    target = next(p for p in points(study) if p.phi == 1.2)
    _fail_for(monkeypatch, target.X_unburned)
    code = climod.main(["run", str(config), "--out", str(tmp_path / "out"), "--jobs", "1", "--no-charts", "--quiet"])
    assert code == 0
    out = capsys.readouterr().out
    assert "1 failed: 1 not converged" in out and "phi 1.2" in out


# ---------------------------------------------------------------- physical range checks
def test_pressure_outside_the_mechanism_range_warns_only_for_known_mechanisms():
    # GRI-Mech 3.0: optimised for about 10 Torr to 10 atm (Smith et al., GRI-Mech 3.0 web documentation, 1999)
    assert "GRI-Mech 3.0" in pressure_warning("gri30.yaml", 20.0)
    assert pressure_warning("gri30.yaml", 5.0) == ""
    assert "outside" in pressure_warning("/some/dir/gri30.yaml", 0.005)
    assert pressure_warning("h2o2.yaml", 50.0) == ""  # no stated range: no warning


def test_equivalence_ratio_outside_the_flammable_range_warns():
    # flammability limits in air, 1 atm (Coward & Jones, US Bureau of Mines Bulletin 503, 1952):
    # methane 5-15 % (phi 0.50-1.68), hydrogen 4-75 % (phi 0.10-7.14) in air (O2 + 3.76 N2)
    air = {"O2": 1.0, "N2": 3.76}
    assert "Coward & Jones" in flammability_warning({"CH4": 1.0}, air, 0.45)
    assert flammability_warning({"CH4": 1.0}, air, 1.8) != ""
    assert flammability_warning({"CH4": 0.9, "N2": 0.1}, air, 1.0) == ""
    assert flammability_warning({"H2": 0.6, "N2": 0.4}, air, 0.05) != ""
    # a blend by Le Chatelier's rule (Le Chatelier 1891; Coward & Jones 1952): 70/30 methane/hydrogen
    # has a lower limit of 1/(0.7/5 + 0.3/4) = 4.65 % by volume, phi 0.36 (not hydrogen's 0.1)
    assert flammability_warning({"CH4": 0.7, "H2": 0.3}, air, 0.3) != ""
    assert flammability_warning({"CH4": 0.7, "H2": 0.3}, air, 0.4) == ""
    assert flammability_warning({"CH4": 0.7, "H2": 0.3}, air, 0.05) != ""
    # a pipeline gas with ethane and propane (it had no warning at all)
    pipeline = {"CH4": 0.90, "C2H6": 0.05, "C3H8": 0.02, "N2": 0.02, "CO2": 0.01}
    assert "0.3 outside" in flammability_warning(pipeline, air, 0.3) and flammability_warning(pipeline, air, 0.8) == ""
    # propane alone: 2.1 % by volume is phi 0.51 (Coward & Jones 1952)
    assert flammability_warning({"C3H8": 1.0}, air, 0.45) != "" and flammability_warning({"C3H8": 1.0}, air, 0.55) == ""
    # unknown combustibles or oxygen-enriched oxidizers: no table, no warning
    assert flammability_warning({"NH3": 1.0}, air, 0.2) == ""
    assert flammability_warning({"CH4": 1.0}, {"O2": 1.0}, 0.3) == ""


def test_a_failed_flame_keeps_the_autoignition_warning_of_its_mixture(tmp_path):
    """A safety warning must not vanish with the flame: when the flame of an autoigniting
    mixture gives no answer (here every flame runs out of a 0.05 s CPU-time limit), the
    worker still screens the fresh mixture's ignition. Stoichiometric hydrogen-air at
    1000 K, 1 bar ignites in about 0.3 ms (h2o2.yaml, constant-pressure reactor); 300 K
    is below the screen's range."""
    config = write_h2_study(tmp_path, fractions="[1.0]", phis="[1.0]", extra="flame_time_limit_s = 0.05")
    config.write_text(config.read_text().replace("unburned_temperature_K = [300.0]",
                                                 "unburned_temperature_K = [300.0, 1000.0]"))
    study = load_study(config)
    rows = {r["unburned_temperature_K"]: r for r in run_study(study, out_dir=tmp_path / "out", jobs=1).rows}
    hot, cold = rows[1000.0], rows[300.0]
    assert (hot["status"], hot["reason"]) == ("failed", "time limit") and cold["status"] == "failed"
    assert hot["warnings"].startswith("autoignition: the fresh mixture ignites on its own in 0.")
    assert 1e-4 < hot["autoignition_screen_delay_s"] < 1e-3 and "autoignition" not in cold["warnings"]
    from flamecharts.outputs.report import write_report

    html = write_report(study, list(rows.values()), tmp_path / "out").read_text()
    assert "ignites on its own in" in html


@pytest.mark.slow
def test_an_autoigniting_mixture_is_not_a_flame_in_csv_and_report(tmp_path):
    """Stoichiometric hydrogen-air preheated to 1000 K ignites on its own in about 0.3 ms at
    1 bar (constant-pressure reactor, h2o2.yaml), far less than 100 flame transit times:
    the computed 'flame' is autoignition in the domain. At 300 K nothing ignites."""
    config = write_h2_study(tmp_path, fractions="[1.0]", phis="[1.0]")
    config.write_text(config.read_text().replace("unburned_temperature_K = [300.0]",
                                                 "unburned_temperature_K = [300.0, 1000.0]"))
    study = load_study(config)
    s = run_study(study, out_dir=tmp_path / "out", jobs=1)
    rows = {r["unburned_temperature_K"]: r for r in s.rows}
    assert rows[300.0]["warnings"] == "" and rows[300.0]["status"] == "ok"
    # not a flame: its own status, no flame speed or thickness, no indicator (issue: it was stored as a
    # 161,536 m/s "flame" 5 m thick)
    hot = rows[1000.0]
    assert (hot["status"], hot["reason"]) == ("autoignition", "autoignition")
    assert hot["message"].startswith("autoignition: ignites in") and "(limit 100)" in hot["message"]
    assert hot["laminar_flame_speed_m_s"] is None and hot["thermal_thickness_mm"] is None
    assert hot["flashback_critical_gradient_1_s"] is None and hot["adiabatic_flame_temperature_K"] > 2000
    # the worker stored the delay with the flame (the read-out integrates no reactor)
    assert 0 < rows[1000.0]["autoignition_screen_delay_s"] < 1e-3
    from flamecharts.outputs.report import write_report
    from flamecharts.outputs.tables import write_csv

    write_csv(s.rows, tmp_path / "out" / "results.csv")
    with open(tmp_path / "out" / "results.csv", newline="") as fh:
        csv_rows = list(csv.DictReader(fh))
    assert any(r["status"] == "autoignition" and r["laminar_flame_speed_m_s"] == "" for r in csv_rows)
    html = write_report(study, s.rows, tmp_path / "out").read_text()
    assert "Points without a flame" in html and "autoignition: ignites in" in html
