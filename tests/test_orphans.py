"""No orphan workers: when a run's process dies outright (SIGKILL to it alone, as an
out-of-memory killer or a crashed terminal does), every process it started ends within
seconds, having written nothing to the store, and the next run resumes (sweep/lifeline.py).

The runs are CLI subprocesses in their own session, so the signal reaches the run's
process only, never its process group (the workers).
"""
from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import psutil
import pytest

from flamecharts.store import DB_NAME, Store

from conftest import run_cli, run_workers as _workers, write_h2_study

PHIS = "[0.6, 0.8, 1.0, 1.2, 1.5, 2.0]"  # with two blends: 12 points, about 1 s each
N_POINTS = 12
PATIENCE_S = 600  # a bound against hanging, never a timing assertion
GRACE_S = 10  # the required bound: every process of a killed run is gone by then


def _gone(proc: psutil.Process) -> bool:
    """Ended: no such process any more, or a zombie nobody has reaped yet."""
    try:
        return proc.status() == psutil.STATUS_ZOMBIE
    except psutil.NoSuchProcess:
        return True


def _holds_the_store(proc: psutil.Process, out: Path) -> bool:
    """True if the process has the run's store (or its journal) open."""
    try:
        return any(Path(f.path).name.startswith(DB_NAME) and Path(f.path).parent == out
                   for f in proc.open_files())
    except psutil.Error:
        return False


def _rows(db: Path) -> dict[str, dict]:
    with Store(db, readonly=True) as store:
        assert store.integrity_ok()
        return store.rows()


@pytest.mark.parametrize("backend", [("--jobs", "2"), ("--cluster", "local:2")], ids=["loky", "dask-local"])
def test_killing_the_run_alone_ends_its_workers_and_the_next_run_resumes(tmp_path, backend):
    config = write_h2_study(tmp_path, phis=PHIS)
    out = tmp_path / "out"
    db = out / DB_NAME
    proc = subprocess.Popen([sys.executable, "-m", "flamecharts", "run", str(config), "--out", str(out), "--quiet",
                             "--no-charts", *backend], start_new_session=True,
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    deadline = time.time() + PATIENCE_S
    while not (db.exists() and len(_workers(proc.pid)) == 2 and any(w.cpu_percent(0.05) > 0
                                                                       for w in _workers(proc.pid))):
        assert proc.poll() is None, f"the run ended before its workers solved: {proc.communicate()}"
        assert time.time() < deadline, "no worker started solving"
        time.sleep(0.05)
    family = psutil.Process(proc.pid).children(recursive=True)  # workers and loky/multiprocessing helpers
    workers = _workers(proc.pid)
    assert {w.ppid() for w in workers} == {proc.pid}  # Dask's nannies live in the run's process
    assert not any(_holds_the_store(w, out) for w in workers)  # only the run's process writes the store
    before = _rows(db)
    os.kill(proc.pid, signal.SIGKILL)  # the run's process alone, not its group
    proc.wait()
    deadline = time.time() + GRACE_S
    while not all(_gone(p) for p in family) and time.time() < deadline:
        time.sleep(0.05)
    orphans = [p for p in family if not _gone(p)]
    for p in orphans:  # clean up before failing
        p.kill()
    assert not orphans, f"alive {GRACE_S} s after the run was killed: {[(p.pid, p.cmdline()) for p in orphans]}"
    after = _rows(db)
    assert set(before) <= set(after) and len(after) < N_POINTS
    assert all(row["status"] in ("ok", "no_flame", "failed") for row in after.values())
    r = run_cli("run", config, "--out", out, *backend, "--no-charts", "--quiet")
    assert r.returncode == 0, r.stderr
    assert f"solved {N_POINTS - len(after)} now, {len(after)} from the store" in r.stdout
    final = _rows(db)
    assert len(final) == N_POINTS and all(row["status"] == "ok" for row in final.values())
    for key, row in after.items():  # nothing stored before the kill was solved again
        assert final[key]["finished_at"] == row["finished_at"]


PARENT = textwrap.dedent("""
    import subprocess, sys, threading, time
    child = "import os, sys, time; from flamecharts.sweep.lifeline import exit_with; " \\
            "exit_with(int(sys.argv[1])); print('bound', flush=True); time.sleep(600)"
    def start():
        global kid
        kid = subprocess.Popen([sys.executable, "-c", child, str(__import__("os").getpid())], stdout=subprocess.PIPE,
                               text=True)
        assert kid.stdout.readline() == "bound\\n"
    helper = threading.Thread(target=start)
    helper.start()
    helper.join()
    print(kid.pid, flush=True)
    time.sleep(600)
""")


def test_a_worker_started_from_a_helper_thread_outlives_that_thread_but_not_its_process(tmp_path):
    """The kernel's parent-death signal follows the forking thread, so a worker forked by a
    thread that has ended must not be killed by it: it stays while its parent process lives,
    and its watch thread ends it once that process is killed."""
    root = Path(__file__).resolve().parent.parent
    parent = subprocess.Popen([sys.executable, "-c", PARENT], cwd=tmp_path, stdout=subprocess.PIPE, text=True,
                              env={**os.environ, "PYTHONPATH": str(root)}, start_new_session=True)
    try:
        worker = psutil.Process(int(parent.stdout.readline()))
        time.sleep(1.0)  # the helper thread has ended
        assert not _gone(worker)
    finally:
        parent.kill()
        parent.wait()
    deadline = time.time() + GRACE_S
    while not _gone(worker) and time.time() < deadline:
        time.sleep(0.05)
    alive = not _gone(worker)
    if alive:
        worker.kill()
    assert not alive, "the worker outlived its parent process"
