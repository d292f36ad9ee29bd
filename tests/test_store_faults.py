"""Corrupt, foreign and old stores; two runs on one folder; a stale lock.

A store that is not healthy gets one line (what is wrong, where, what to do) and exit
code 2 from `run`, `check`, `charts` and `report`, and its bytes stay as they were;
random bytes overwritten anywhere in a real store (hypothesis) give a usable store
or a StoreError, never another exception. Migrations
are explicit: a registered one runs in a transaction after a backup copy; a missing
one is refused. Two runs started together on one folder: one solves, the other is
refused naming the first (pid, host, start time); nothing is lost or corrupted.
"""
from __future__ import annotations

import json
import os
import random
import shutil
import socket
import sqlite3
import subprocess
import sys
from pathlib import Path

import pytest
from hypothesis import HealthCheck, event, given, settings, strategies as st

from flamecharts import cli, load_study, run_study
from flamecharts.errors import StoreError
from flamecharts.store import DB_NAME, LOCK_NAME, SCHEMA_VERSION, Store, db as store_module

from conftest import write_h2_study

PREFIX = "flamecharts: error: "


@pytest.fixture(scope="module")
def finished_run(tmp_path_factory):
    """A finished two-flame run: (config, output folder); copy it before changing it."""
    base = tmp_path_factory.mktemp("finished")
    config = write_h2_study(base, fractions="[0.0]", phis="[0.8, 1.0]")
    out = base / "out"
    assert cli.main(["run", str(config), "--out", str(out), "--jobs", "1", "--no-charts", "--quiet"]) == 0
    assert not (out / (DB_NAME + "-wal")).exists()  # closed cleanly: everything is in results.db
    return config, out


@pytest.fixture
def run_copy(finished_run, tmp_path):
    config, out = finished_run
    copy = tmp_path / "out"
    shutil.copytree(out, copy, ignore=shutil.ignore_patterns(LOCK_NAME))
    return config, copy


def call(capsys, *argv):
    rc = cli.main([str(a) for a in argv])
    cap = capsys.readouterr()
    return rc, cap.out, cap.err


def assert_refused(rc, out, err, words):
    assert rc == 2, err
    assert err.startswith(PREFIX) and err.count("\n") == 1 and "Traceback" not in err, repr(err)
    for w in words:
        assert w in err, f"{w!r} not in {err!r}"


def snapshot(folder: Path) -> dict:
    """Bytes of the store files: results.db (a folder there as its listing) and a non-empty -wal.

    An empty -wal (and the -shm index) is what SQLite creates for any reader of a WAL
    database, also a read-only one: it holds no data and is not compared.
    """
    snap = {}
    for name in (DB_NAME, DB_NAME + "-wal"):
        p = folder / name
        if p.is_dir():
            snap[name] = ("dir", sorted(os.listdir(p)))
        elif p.exists() and (name == DB_NAME or p.stat().st_size):
            snap[name] = p.read_bytes()
    return snap


# ------------------------------------------------------------------ the faults
def truncate_half(db: Path):
    data = db.read_bytes()
    db.write_bytes(data[: len(data) // 2])


def random_bytes(db: Path):
    db.write_bytes(random.Random(8).randbytes(db.stat().st_size))


def short_garbage(db: Path):
    db.write_bytes(b"not a database\n" * 3)


def damaged_pages(db: Path):
    data = bytearray(db.read_bytes())
    page = 4096
    data[2 * page: 4 * page] = random.Random(3).randbytes(2 * page)
    db.write_bytes(bytes(data))


def foreign_sqlite(db: Path):
    db.unlink()
    con = sqlite3.connect(db)
    con.execute("CREATE TABLE invoices (number INTEGER, amount REAL)")
    con.execute("INSERT INTO invoices VALUES (1, 99.5)")
    con.commit()
    con.close()


def newer_schema(db: Path):
    con = sqlite3.connect(db)
    con.execute(f"PRAGMA user_version = {SCHEMA_VERSION + 1}")
    con.commit()
    con.close()


def other_layout(db: Path):
    con = sqlite3.connect(db)
    con.execute("ALTER TABLE points ADD COLUMN colour TEXT")
    con.commit()
    con.close()


def garbage_wal(db: Path):
    Path(str(db) + "-wal").write_bytes(random.Random(5).randbytes(20_000))


def store_is_a_folder(db: Path):
    db.unlink()
    db.mkdir()


FAULTS = {
    "truncated_half": (truncate_half, ["results.db", "is truncated", "move it away"]),
    "random_bytes": (random_bytes, ["results.db", "not an SQLite database", "move it away"]),
    "short_garbage": (short_garbage, ["results.db", "not an SQLite database", "left untouched"]),
    "damaged_pages": (damaged_pages, ["results.db", "damaged", "move it away"]),
    "foreign_sqlite": (foreign_sqlite, ["results.db", "not a flamecharts results store", "move it away"]),
    "newer_schema": (newer_schema, ["results.db", f"schema version {SCHEMA_VERSION + 1}", "newer",
                                    "upgrade flamecharts"]),
    "other_layout": (other_layout, ["results.db", "another layout", "move it away"]),
    "garbage_wal": (garbage_wal, ["results.db-wal", "not one", "move results.db-wal away"]),
    "store_is_a_folder": (store_is_a_folder, ["results.db", "is a folder", "move it away"]),
}


@pytest.mark.parametrize("command", ["run", "check", "charts", "report"])
@pytest.mark.parametrize("fault", list(FAULTS))
def test_a_bad_store_is_refused_in_one_line_and_left_untouched(fault, command, run_copy, capsys):
    config, out = run_copy
    damage, words = FAULTS[fault]
    damage(out / DB_NAME)
    before = snapshot(out)
    csv_before = (out / "results.csv").read_bytes()
    argv = {"run": ["run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet"],
            "check": ["check", config, "--out", out],
            "charts": ["charts", out], "report": ["report", out]}[command]
    assert_refused(*call(capsys, *argv), words)
    assert snapshot(out) == before
    assert (out / "results.csv").read_bytes() == csv_before


@pytest.mark.parametrize("fault", ["truncated_half", "garbage_wal", "newer_schema"])
def test_a_bad_store_through_the_real_command_line(fault, run_copy, cli):
    config, out = run_copy
    damage, words = FAULTS[fault]
    damage(out / DB_NAME)
    before = snapshot(out)
    for argv in (["run", config, "--out", out, "--jobs", "1"], ["charts", out]):
        r = cli(*argv)
        assert_refused(r.returncode, r.stdout, r.stderr, words)
        assert r.stdout == ""
    assert snapshot(out) == before


def test_garbage_shm_index_is_rebuilt_and_nothing_is_lost(run_copy, capsys):
    """The -shm file is only an index of the WAL that SQLite rebuilds: garbage there is harmless."""
    config, out = run_copy
    Path(str(out / DB_NAME) + "-shm").write_bytes(random.Random(2).randbytes(32768))
    rc, stdout, err = call(capsys, "run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet")
    assert rc == 0, err
    assert "solved 0 now, 2 from the store" in stdout
    rc, stdout, err = call(capsys, "charts", out)
    assert rc == 0, err


def test_an_empty_store_file_is_a_new_store_for_run_and_empty_for_the_others(run_copy, capsys):
    """A 0-byte results.db is what SQLite leaves when a run dies before its first write: it holds
    nothing, so run starts it afresh, check counts nothing stored, charts says to run first."""
    config, out = run_copy
    (out / DB_NAME).write_bytes(b"")
    rc, stdout, err = call(capsys, "check", config, "--out", out)
    assert rc == 0, err
    assert "0 already stored" in stdout
    assert_refused(*call(capsys, "charts", out), ["results.db", "empty (0 bytes)", "run the study first"])
    assert (out / DB_NAME).read_bytes() == b""
    rc, stdout, err = call(capsys, "run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet")
    assert rc == 0, err
    assert "solved 2 now, 0 from the store" in stdout
    with Store(out / DB_NAME, readonly=True) as st:
        assert len(st.keys()) == 2 and st.integrity_ok()


@pytest.mark.skipif(os.geteuid() == 0, reason="runs as root here: root reads and writes a chmod 000 file, "
                                              "so an unreadable store cannot be made")
def test_an_unreadable_store(run_copy, capsys):
    config, out = run_copy
    (out / DB_NAME).chmod(0)
    for argv in (["run", config, "--out", out, "--jobs", "1", "--quiet"], ["check", config, "--out", out],
                 ["charts", out]):
        assert_refused(*call(capsys, *argv), ["results.db", "permission denied"])


def test_an_unreadable_store_as_root_is_simulated(run_copy, capsys, monkeypatch):
    """As root, chmod 000 stops nothing; make the permission check fail the way it would for a user."""
    config, out = run_copy
    monkeypatch.setattr(store_module.os, "access", lambda path, mode: False)
    before = snapshot(out)
    for argv in (["run", config, "--out", out, "--jobs", "1", "--quiet"], ["check", config, "--out", out],
                 ["charts", out]):
        assert_refused(*call(capsys, *argv), ["results.db", "permission denied", "chmod"])
    assert snapshot(out) == before


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(flips=st.lists(st.tuples(st.floats(0.0, 1.0, exclude_max=True) | st.floats(0.0, 0.05), st.integers(0, 255)),
                      min_size=1, max_size=30),
       readonly=st.booleans())
def test_flipped_bytes_give_a_usable_store_or_a_store_error(finished_run, flips, readonly):
    """Random bytes of a real store overwritten: opening it and reading every row and profile
    either works or raises StoreError, never another exception."""
    import tempfile

    data = bytearray((finished_run[1] / DB_NAME).read_bytes())
    for where, byte in flips:
        data[int(where * len(data))] = byte
    with tempfile.TemporaryDirectory() as folder:
        db = Path(folder) / DB_NAME
        db.write_bytes(bytes(data))
        try:
            with Store(db, readonly=readonly) as st_:
                rows = st_.rows()
                for key in rows:
                    st_.profile(key)
                families = _all_families(st_) | {"family"}
                st_.warm_sources(families)
                st_.timings(families)
            event("read")
        except StoreError as exc:
            assert "\n" not in str(exc) and str(exc).isprintable()
            event(f"refused: {str(exc).split(DB_NAME, 1)[-1][:40]}")


def _all_families(st_) -> set[str]:
    return {r[0] for r in st_._query("SELECT DISTINCT family FROM points")}


def test_a_store_locked_by_another_program_stops_the_run_in_one_line_and_keeps_every_flame(
        run_copy, capsys, monkeypatch):
    """Another program (a database browser, say) holds a write lock on results.db."""
    _, out = run_copy
    config = write_h2_study(out.parent, name="wider", fractions="[0.0]", phis="[0.8, 1.0, 1.2]")  # one new point
    monkeypatch.setattr(store_module, "BUSY_TIMEOUT_S", 0.2)
    other = sqlite3.connect(out / DB_NAME, isolation_level=None)
    other.execute("BEGIN IMMEDIATE")
    try:
        assert_refused(*call(capsys, "run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet"),
                       ["results.db", "cannot be written (database is locked)", "close that program",
                        "every flame stored before is kept"])
    finally:
        other.execute("ROLLBACK")
        other.close()
    with Store(out / DB_NAME, readonly=True) as st_:
        assert len(st_.keys()) == 2 and st_.integrity_ok()
    rc, stdout, err = call(capsys, "run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet")
    assert rc == 0, err
    assert "solved 1 now, 2 from the store" in stdout


# ------------------------------------------------------------------ schema versions and migrations
V1_ROW = ("k1", "fam", "{}", 1.0, 1.0, 300.0, "ok", "", "fresh", '{"laminar_flame_speed_m_s": 2.0}', 1.5,
          1.0e9, "run1", None)


def hand_made_v1_store(path: Path, rows=(V1_ROW,)) -> None:
    """A version-1 store written by hand, as flamecharts 0.1 (schema 1) left it: its SQL
    is written out here, not taken from the package, so it stays what version 1 was."""
    con = sqlite3.connect(path)
    con.executescript("""
        CREATE TABLE meta (name TEXT PRIMARY KEY, value TEXT NOT NULL);
        CREATE TABLE points (key TEXT PRIMARY KEY, family TEXT NOT NULL, inputs TEXT NOT NULL,
            phi REAL NOT NULL, pressure_bar REAL NOT NULL, unburned_temperature_K REAL NOT NULL,
            status TEXT NOT NULL, message TEXT NOT NULL, start TEXT NOT NULL, metrics TEXT,
            solve_seconds REAL NOT NULL, finished_at REAL NOT NULL, run_id TEXT NOT NULL, profile BLOB);
        CREATE INDEX points_family ON points (family);""")
    con.executemany("INSERT INTO points VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?)", rows)
    con.execute("PRAGMA user_version = 1")
    con.commit()
    con.close()


def hand_made_current_store(path: Path) -> None:
    """A store of the current schema version holding one flame (V1_ROW), migrated from version 1."""
    hand_made_v1_store(path)
    with Store(path):
        pass
    for old in path.parent.glob("results.db.v1-*.bak"):
        old.unlink()


def test_a_new_store_records_its_schema_version(tmp_path):
    with Store(tmp_path / DB_NAME) as st:
        assert st.db.execute("PRAGMA user_version").fetchone()[0] == SCHEMA_VERSION
        assert st.migrated_from == 0 and st.backup_path is None  # nothing to back up in a new file


def test_an_older_store_is_migrated_in_a_transaction_after_a_backup(tmp_path, monkeypatch):
    def to_v2(db):
        db.execute("CREATE TABLE notes (key TEXT, note TEXT)")
        db.execute("INSERT INTO notes SELECT key, 'migrated' FROM points")

    db = tmp_path / DB_NAME
    hand_made_current_store(db)
    now, nxt = SCHEMA_VERSION, SCHEMA_VERSION + 1
    monkeypatch.setattr(store_module, "SCHEMA_VERSION", nxt)
    monkeypatch.setitem(store_module.MIGRATIONS, now, to_v2)
    with Store(db) as st:
        assert st.migrated_from == now
        backup = st.backup_path
        assert st.db.execute("PRAGMA user_version").fetchone()[0] == nxt
        assert st.db.execute("SELECT note FROM notes").fetchall() == [("migrated",)]
        assert set(st.keys()) == {"k1"}
        assert st.db.execute(f"SELECT name FROM meta WHERE name = 'schema_v{nxt}_from_v{now}'").fetchone()
    assert backup.is_file() and backup.name.startswith(f"results.db.v{now}-")
    con = sqlite3.connect(backup)
    assert con.execute("PRAGMA user_version").fetchone()[0] == now
    assert con.execute("SELECT key FROM points").fetchall() == [("k1",)]
    con.close()
    with Store(db) as st:  # opened again: nothing more to do
        assert st.migrated_from is None


def test_a_version_1_store_gets_typed_reasons_and_gives_the_same_table(tmp_path):
    old = [V1_ROW,
           ("k2", "fam", "{}", 0.3, 1.0, 300.0, "no_flame", "no flame: not solved, rise 120 K", "fresh", None, 0.1,
            1.0e9, "run1", None),
           ("k3", "fam", "{}", 1.0, 1.0, 300.0, "failed", "mechanism error: non-finite rates", "fresh", None, 0.1,
            1.0e9, "run1", None),
           ("k4", "fam", "{}", 1.1, 1.0, 300.0, "failed", "worker error: TerminatedWorkerError: ...", "fresh", None,
            0.0, 1.0e9, "run1", None),
           ("k5", "fam", "{}", 1.2, 1.0, 300.0, "failed", "solver did not converge (HP equilibrium 2000 K)", "fresh",
            None, 2.0, 1.0e9, "run1", None)]
    db = tmp_path / DB_NAME
    hand_made_v1_store(db, old)
    con = sqlite3.connect(db)
    before = {r[0]: r for r in con.execute("SELECT key, status, message, start, metrics, solve_seconds FROM points")}
    con.close()
    with Store(db) as st:
        assert st.migrated_from == 1 and st.backup_path.is_file()
        rows = st.rows()
    assert {k: r["reason"] for k, r in rows.items()} == {
        "k1": "", "k2": "no flame", "k3": "mechanism error", "k4": "worker error", "k5": "not converged"}
    for key, (_, status, message, start, metrics, secs) in before.items():
        r = rows[key]
        assert (r["status"], r["message"], r["start"], r["solve_seconds"]) == (status, message, start, secs)
        assert r["metrics"] == (None if metrics is None else json.loads(metrics))


def test_a_failing_migration_changes_nothing(tmp_path, monkeypatch):
    def broken(db):
        db.execute("CREATE TABLE notes (key TEXT)")
        db.execute("INSERT INTO no_such_table VALUES (1)")

    db = tmp_path / DB_NAME
    hand_made_current_store(db)
    now = SCHEMA_VERSION
    monkeypatch.setattr(store_module, "SCHEMA_VERSION", now + 1)
    monkeypatch.setitem(store_module.MIGRATIONS, now, broken)
    with pytest.raises(StoreError, match=f"could not be migrated from schema version {now} to {now + 1}.*unchanged"):
        Store(db)
    con = sqlite3.connect(db)
    assert con.execute("PRAGMA user_version").fetchone()[0] == now
    assert "notes" not in {r[0] for r in con.execute("SELECT name FROM sqlite_master")}
    assert con.execute("SELECT key FROM points").fetchall() == [("k1",)]
    con.close()


def test_an_older_store_without_a_migration_path_is_refused(run_copy, capsys, monkeypatch):
    config, out = run_copy
    now = SCHEMA_VERSION
    monkeypatch.setattr(store_module, "SCHEMA_VERSION", now + 1)  # and no MIGRATIONS[now]
    before = snapshot(out)
    for argv in (["run", config, "--out", out, "--jobs", "1", "--quiet"], ["check", config, "--out", out],
                 ["charts", out]):
        assert_refused(*call(capsys, *argv), ["results.db", f"schema version {now}",
                                              f"no migration from version {now} to {now + 1}", "left untouched"])
    assert snapshot(out) == before


def test_an_older_store_is_migrated_by_run_and_only_run(run_copy, capsys, monkeypatch):
    config, out = run_copy
    now = SCHEMA_VERSION
    monkeypatch.setattr(store_module, "SCHEMA_VERSION", now + 1)
    monkeypatch.setitem(store_module.MIGRATIONS, now, lambda db: db.execute("CREATE INDEX points_status ON points (status)"))
    before = snapshot(out)
    assert_refused(*call(capsys, "charts", out),
                   [f"older schema version {now}", "'flamecharts run' migrates it", "flamecharts compact DIR"])
    assert snapshot(out) == before
    rc, stdout, err = call(capsys, "run", config, "--out", out, "--jobs", "1", "--no-charts", "--quiet")
    assert rc == 0, err
    assert "solved 0 now, 2 from the store" in stdout  # no flame lost in the migration
    assert len(list(out.glob(f"results.db.v{now}-*.bak"))) == 1
    rc, stdout, err = call(capsys, "charts", out)
    assert rc == 0, err


# ------------------------------------------------------------------ two runs on one folder
def test_two_runs_started_together_one_solves_the_other_is_refused(tmp_path):
    config = write_h2_study(tmp_path, fractions="[0.0, 0.25, 0.5]", phis="[0.7, 0.85, 1.0, 1.15]")
    out = tmp_path / "out"
    argv = [sys.executable, "-m", "flamecharts", "run", str(config), "--out", str(out), "--jobs", "1",
            "--no-charts", "--quiet"]
    procs = [subprocess.Popen(argv, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True) for _ in range(2)]
    results = [(p, *p.communicate(timeout=600)) for p in procs]
    codes = sorted(p.returncode for p, _, _ in results)
    assert codes == [0, 2], [(p.returncode, err) for p, _, err in results]
    (winner, w_out, _), = [r for r in results if r[0].returncode == 0]
    (loser, l_out, l_err), = [r for r in results if r[0].returncode == 2]
    assert "solved 12 now, 0 from the store" in w_out
    assert l_out == "" and l_err.count("\n") == 1 and "Traceback" not in l_err
    assert l_err.startswith(PREFIX) and "in use by another run" in l_err
    assert f"pid {winner.pid} on host {socket.gethostname()}, started " in l_err
    con = sqlite3.connect(out / DB_NAME)
    assert con.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
    assert con.execute("SELECT COUNT(*) FROM points").fetchone()[0] == 12
    con.close()
    again = run_study(load_study(config), out_dir=out, jobs=1)
    assert again.solved == 0 and again.reused == 12


def test_a_lock_left_by_a_killed_run_does_not_block_the_next(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    code = ("import os, sys; from flamecharts.store import RunLock; "
            "RunLock(sys.argv[1]).acquire(); os.kill(os.getpid(), 9)")
    dead = subprocess.Popen([sys.executable, "-c", code, str(out)])
    assert dead.wait(timeout=120) == -9
    assert (out / LOCK_NAME).read_text().startswith(f"pid {dead.pid} on host ")  # the stale lock file is there
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    s = run_study(load_study(config), out_dir=out, jobs=1)
    assert s.solved == 1
    assert not (out / LOCK_NAME).exists()  # a finished run takes its lock file away
