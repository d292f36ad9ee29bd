"""Dask cluster backend on small hydrogen studies: same answers as local processes, a worker
killed mid-run, a client stopped mid-run, other versions on a worker, no scheduler."""
import logging
import os
import shutil
import signal
import subprocess
import sys
from pathlib import Path

import pytest
from distributed import Client, LocalCluster

import flamecharts
from flamecharts import load_study, run_study
from flamecharts.chemistry.mechanism import mechanism_text
from flamecharts.pipeline import solve_study
from flamecharts.results import rows_from_dir
from flamecharts.store import DB_NAME, Store
from flamecharts.sweep.dask_backend import ClusterError, local_versions, run_on_worker
from flamecharts.sweep.worker import solve_task

from conftest import run_cli, write_h2_study


@pytest.fixture(scope="module")
def dask_cluster():
    """Two single-threaded worker processes, as `--cluster local:2` starts them."""
    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=":0",
                      silence_logs=logging.ERROR) as cluster:
        yield cluster


def _speeds(rows):
    return [(r["status"], r["laminar_flame_speed_m_s"]) for r in rows]


def test_local_cluster_run_matches_the_local_process_run(tmp_path):
    config = write_h2_study(tmp_path)
    local = run_study(load_study(config), out_dir=tmp_path / "local", jobs=2)
    r = run_cli("run", config, "--out", tmp_path / "dask", "--cluster", "local:2", "--no-charts", "--quiet")
    assert r.returncode == 0, r.stderr
    assert "solved 6 now, 0 from the store" in r.stdout and "2 workers" in r.stdout and "% busy" in r.stdout
    _, rows = rows_from_dir(tmp_path / "dask")
    assert [s for s, _ in _speeds(rows)] == [s for s, _ in _speeds(local.rows)] == ["ok"] * 6
    for (_, a), (_, b) in zip(_speeds(rows), _speeds(local.rows)):
        assert a == pytest.approx(b, rel=1e-6)
    assert 0 < local.worker_utilisation <= 1.0 and local.workers == 2


def test_a_worker_killed_mid_run_loses_nothing_and_nothing_is_committed_twice(tmp_path, dask_cluster, monkeypatch):
    study = load_study(write_h2_study(tmp_path, phis="[0.6, 0.8, 1.0, 1.2, 1.4]"))
    commits = []
    original = Store.commit_point
    monkeypatch.setattr(Store, "commit_point", lambda self, p, res, run_id: (commits.append(p.key),
                                                                               original(self, p, res, run_id))[1])
    killed = []
    with Client(dask_cluster, set_as_default=False) as client:
        def progress(pr):
            if pr.done >= 2 and not killed:
                busy = [w for w, tasks in client.processing().items() if tasks]
                if busy:
                    pid = client.run(os.getpid, workers=busy[:1])[busy[0]]
                    os.kill(pid, signal.SIGKILL)
                    killed.append(pid)

        s = run_study(study, out_dir=tmp_path / "o", cluster=dask_cluster.scheduler_address, progress=progress)
    assert killed, "no worker was busy when the test meant to kill one"
    assert s.solved == 10 and s.reused == 0 and s.failed == 0
    assert all(r["status"] == "ok" for r in s.rows)
    assert sorted(commits) == sorted(set(commits)) and len(commits) == 10  # each point committed once
    with Store(tmp_path / "o" / DB_NAME) as st:
        stored = st.rows()
        assert st.integrity_ok()
    assert len(stored) == 10 and len({r["run_id"] for r in stored.values()}) == 1


def test_a_stopped_cluster_run_resumes_solving_only_the_missing_points(tmp_path, dask_cluster):
    study = load_study(write_h2_study(tmp_path, phis="[0.6, 0.8, 1.0, 1.2]"))
    address = dask_cluster.scheduler_address
    part = solve_study(study, out_dir=tmp_path / "o", cluster=address, stop_after=3)
    assert part.solved == 3
    with Store(tmp_path / "o" / DB_NAME) as st:
        first = st.rows()
    rest = run_study(study, out_dir=tmp_path / "o", cluster=address)
    assert rest.reused == 3 and rest.solved == 8 - 3
    assert rest.workers == 2 and 0 < rest.worker_utilisation <= 1.0
    with Store(tmp_path / "o" / DB_NAME) as st:
        after = st.rows()
    assert len(after) == 8
    for key, row in first.items():  # nothing that had finished was solved again
        assert after[key]["finished_at"] == row["finished_at"]


def test_no_scheduler_at_the_address_is_one_line_exit_2_and_the_flag_beats_the_config(tmp_path):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]", extra='cluster = "tcp://127.0.0.1:1"')
    out = tmp_path / "out"
    r = run_cli("run", config, "--out", out, "--cluster", "tcp://127.0.0.1:2")
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1 and "Traceback" not in r.stderr, r.stderr
    assert "no Dask scheduler answers at 'tcp://127.0.0.1:2'" in r.stderr
    assert not out.exists()


def test_cluster_without_dask_names_the_extra_to_install(tmp_path):
    """Dask is an optional extra: without it, --cluster is one line naming the extra, exit 2."""
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    hide = ("import sys, runpy; sys.modules['distributed'] = None; "  # an import of it now fails
            f"sys.argv = ['flamecharts', 'run', {str(config)!r}, '--out', {str(tmp_path / 'out')!r}, "
            "'--cluster', 'local:1']; runpy.run_module('flamecharts', run_name='__main__')")
    r = subprocess.run([sys.executable, "-c", hide], capture_output=True, text=True, timeout=300)
    assert r.returncode == 2 and r.stderr.count("\n") == 1 and "Traceback" not in r.stderr, r.stderr
    assert "pip install 'flamecharts[cluster]'" in r.stderr


@pytest.mark.parametrize("value, words", [("tcp://nohost", "host and port"), ("local:zero", "local:N"),
                                          ("slurm", "allowed: tcp://HOST:PORT")])
def test_a_bad_cluster_key_is_one_line_exit_2(tmp_path, value, words):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]", extra=f'cluster = "{value}"')
    r = run_cli("check", config, cwd=tmp_path)
    assert r.returncode == 2 and r.stderr.count("\n") == 1 and words in r.stderr and "'cluster'" in r.stderr


def test_a_worker_with_another_flamecharts_version_is_refused_with_one_line(tmp_path):
    fake = tmp_path / "fake"
    shutil.copytree(Path(flamecharts.__file__).parent, fake / "flamecharts",
                    ignore=shutil.ignore_patterns("__pycache__"))
    init = fake / "flamecharts" / "_version.py"
    init.write_text(init.read_text().replace(f'__version__ = "{flamecharts.__version__}"', '__version__ = "0.0.1"'))
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    with LocalCluster(n_workers=0, processes=True, dashboard_address=":0", silence_logs=logging.ERROR) as cluster, \
            Client(cluster, set_as_default=False) as client:
        worker = subprocess.Popen(
            [sys.executable, "-m", "distributed.cli.dask_worker", cluster.scheduler_address, "--nworkers", "1",
             "--nthreads", "1", "--no-dashboard"], env={**os.environ, "PYTHONPATH": str(fake)}, cwd=fake,
            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, start_new_session=True)
        try:
            client.wait_for_workers(1, timeout=120)
            r = run_cli("run", config, "--out", tmp_path / "out", "--cluster", cluster.scheduler_address)
        finally:
            os.killpg(worker.pid, signal.SIGTERM)
            worker.wait(timeout=60)
    assert r.returncode == 2, r.stdout + r.stderr
    assert r.stderr.count("\n") == 1 and "Traceback" not in r.stderr, r.stderr
    assert f"runs flamecharts 0.0.1, this process {flamecharts.__version__}" in r.stderr


def test_a_worker_checks_versions_on_its_first_task(monkeypatch):
    import flamecharts.sweep.dask_backend as cl

    monkeypatch.setattr(cl, "_CHECKED", {})
    expected = {**local_versions(), "Cantera": "0.0.0"}
    with pytest.raises(ClusterError, match="runs Cantera .*, this process 0.0.0"):
        run_on_worker(solve_task, {}, expected, parent=None)


def test_a_mechanism_that_pulls_from_other_files_is_sent_as_one_text(tmp_path):
    import cantera as ct

    h2o2 = next(Path(d) / "h2o2.yaml" for d in ct.get_data_directories() if (Path(d) / "h2o2.yaml").exists())
    assert mechanism_text(str(h2o2), "mixture-averaged") == h2o2.read_text()  # self-contained: sent as it is
    shutil.copy(h2o2, tmp_path / "base.yaml")
    (tmp_path / "mech.yaml").write_text(
        "phases:\n- name: gas\n  thermo: ideal-gas\n  elements: [O, H, Ar, N]\n"
        "  species: [{base.yaml/species: all}]\n  kinetics: gas\n  reactions: [{base.yaml/reactions: all}]\n"
        "  transport: mixture-averaged\n  state: {T: 300.0, P: 1 atm}\n")
    text = mechanism_text(str(tmp_path / "mech.yaml"), "mixture-averaged")
    assert "base.yaml/" not in text
    gas = ct.Solution(yaml=text, transport_model="mixture-averaged")
    assert gas.n_species == ct.Solution(str(h2o2)).n_species
    assert gas.n_reactions == ct.Solution(str(h2o2)).n_reactions


def test_limit_searches_run_on_the_cluster_with_the_same_answers(tmp_path, dask_cluster):
    """The limit flames go through the same backend: a cluster run finds the local run's limits."""
    limits = ('\n[burner]\nname = "rig"\nport = "round"\nport_diameter_mm = 3.0\nport_velocity_m_s = 2.5\n'
              "\n[limits]\ncriteria = ['flashback']\n")
    config = write_h2_study(tmp_path, phis="[0.7, 1.0, 1.3]", fractions="[0.0, 0.5]", extra=limits)
    study = load_study(config)
    local = solve_study(study, out_dir=tmp_path / "local", jobs=1)
    remote = solve_study(study, out_dir=tmp_path / "dask", cluster=dask_cluster.scheduler_address)
    assert local.limit_flames > 0 and remote.limit_flames == local.limit_flames
    assert len(local.limits) == len(remote.limits)
    for a, b in zip(local.limits, remote.limits):
        for side in ("lower", "upper"):
            assert (a["axis"], a["outcome"], a[f"{side}_kind"], a[f"{side}_binding"]) == (
                b["axis"], b["outcome"], b[f"{side}_kind"], b[f"{side}_binding"])
            assert (a[f"{side}_edge"] is None) == (b[f"{side}_edge"] is None)
            if a[f"{side}_edge"] is not None:
                assert b[f"{side}_edge"] == pytest.approx(a[f"{side}_edge"], abs=1e-9)


def test_each_mechanism_of_a_comparison_is_sent_to_the_cluster(tmp_path, dask_cluster):
    """A study comparing mechanisms solves each under its own file on the cluster as locally:
    a copy of h2o2.yaml with H + O2 <=> O + OH 400 times slower burns far slower, on both."""
    import cantera as ct
    source = next(p for p in (Path(d) / "h2o2.yaml" for d in ct.get_data_directories()) if p.is_file())
    (tmp_path / "h2o2_slow_branching.yaml").write_text(
        source.read_text().replace("{A: 2.65e+16, b: -0.6707", "{A: 6.6e+13, b: -0.6707"))
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    config.write_text(config.read_text().replace('mechanism = "h2o2.yaml"',
                                                 'mechanism = ["h2o2.yaml", "h2o2_slow_branching.yaml"]'))
    study = load_study(config)
    local = solve_study(study, out_dir=tmp_path / "local", jobs=1)
    remote = solve_study(study, out_dir=tmp_path / "dask", cluster=dask_cluster.scheduler_address)
    speeds = {(r["mechanism"], "local"): r["laminar_flame_speed_m_s"] for r in local.rows}
    speeds.update({(r["mechanism"], "dask"): r["laminar_flame_speed_m_s"] for r in remote.rows})
    slow, ref = "h2o2_slow_branching.yaml", "h2o2.yaml"
    assert speeds[(slow, "local")] < 0.5 * speeds[(ref, "local")]
    for m in (ref, slow):
        assert speeds[(m, "dask")] == pytest.approx(speeds[(m, "local")], rel=1e-6)
