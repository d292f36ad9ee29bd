"""SQLite store of finished flames, one transaction per point; resume; lock; schema migrations.

The store lives in the study's output folder (results.db). Each row is keyed by
the point's key (see plan.py), so a rerun, or another study that overlaps this
one, solves only what is missing. Rows are committed one at a time with
synchronous=FULL in WAL mode: a killed run loses nothing that had been committed.

A file that is not a healthy store of this flamecharts is refused with one line
saying what is wrong and what to do, and is never changed: every check below runs
before the first write.

- not a regular file (a folder), unreadable, or unwritable for a run;
- not an SQLite database (garbage, a file cut short before its header);
- truncated (shorter than the page count its header records) or damaged
  (``PRAGMA quick_check`` fails);
- a write-ahead log (results.db-wal) that is not one (its -shm index file is
  rebuilt by SQLite and needs no check);
- an SQLite database of another application (tables but no flamecharts schema);
- a schema version newer than this flamecharts knows, or an older one with no
  registered migration path.

An empty (0-byte) results.db is what SQLite itself leaves when a run is killed
before its first write: it holds nothing, so ``run`` takes it as a new store, and
``check`` counts nothing stored in it; ``charts`` and ``report`` say to run first.

Schema versions and migrations
------------------------------
The schema version is kept in SQLite's ``user_version`` (0 = a new, empty file).
:data:`MIGRATIONS` maps a version to the function that upgrades a store from that
version to the next. Opening an older store for a run copies it first to
``results.db.v<old>-<time>.bak`` (SQLite's backup API, so the copy is consistent),
then applies every step up to :data:`SCHEMA_VERSION` in one transaction: either
all steps land or none does. To change the schema: bump SCHEMA_VERSION, register
``MIGRATIONS[old] = fn`` (a new store runs every step from 0).
"""
from __future__ import annotations

import json
import os
import sqlite3
import stat
import struct
import time
from collections.abc import Callable, Iterable
from pathlib import Path
from typing import Protocol

from ..errors import StoreError
from . import profiles

SCHEMA_VERSION = 3
DB_NAME = "results.db"
#: How long a write waits for another program's lock on the store before giving up [s].
BUSY_TIMEOUT_S = 30.0

#: The tables of schema version 1 (a new store is made by running every migration from 0).
_SCHEMA_V1 = """
CREATE TABLE IF NOT EXISTS meta (name TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS points (
    key TEXT PRIMARY KEY,
    family TEXT NOT NULL,
    inputs TEXT NOT NULL,
    phi REAL NOT NULL,
    pressure_bar REAL NOT NULL,
    unburned_temperature_K REAL NOT NULL,
    status TEXT NOT NULL,
    message TEXT NOT NULL,
    start TEXT NOT NULL,
    metrics TEXT,
    solve_seconds REAL NOT NULL,
    finished_at REAL NOT NULL,
    run_id TEXT NOT NULL,
    profile BLOB
);
CREATE INDEX IF NOT EXISTS points_family ON points (family);
"""


def _create_v1(db: sqlite3.Connection) -> None:
    """Version 0 (a new, empty file) -> 1: the tables of _SCHEMA_V1."""
    for statement in _SCHEMA_V1.split(";"):
        if statement.strip():
            db.execute(statement)


def _add_reason(db: sqlite3.Connection) -> None:
    """Version 1 -> 2: a ``reason`` column (outcome.Reason), filled from the message prefix
    that version 1 wrote ("mechanism error: ...", "worker error: ...", "no flame: ...";
    any other failure, including the oldest stores' wording, is "not converged")."""
    db.execute("ALTER TABLE points ADD COLUMN reason TEXT NOT NULL DEFAULT ''")
    db.execute("""UPDATE points SET reason = CASE
                    WHEN status = 'no_flame' THEN 'no flame'
                    WHEN message LIKE 'mechanism error:%' THEN 'mechanism error'
                    WHEN message LIKE 'worker error:%' THEN 'worker error'
                    ELSE 'not converged' END
                  WHERE status != 'ok'""")


#: Schema version -> function that upgrades a store from that version to the next,
#: called inside the migration transaction (it must not commit).
def _compact_profiles(db: sqlite3.Connection) -> None:
    """Version 2 -> 3: every stored profile re-encoded compactly (store.profiles; float64
    npz before). The file keeps its size until `flamecharts compact DIR` (SQLite VACUUM)."""
    keys = [r[0] for r in db.execute("SELECT key FROM points WHERE profile IS NOT NULL")]
    for key in keys:
        (blob,) = db.execute("SELECT profile FROM points WHERE key = ?", (key,)).fetchone()
        db.execute("UPDATE points SET profile = ? WHERE key = ?", (profiles.encode(profiles.decode(blob)), key))


MIGRATIONS: dict[int, Callable[[sqlite3.Connection], None]] = {
    0: _create_v1,
    1: _add_reason,
    2: _compact_profiles,
}


def _schema_columns() -> list[str]:
    """Columns of the points table at SCHEMA_VERSION (the layout an existing store must have)."""
    con = sqlite3.connect(":memory:")
    for v in range(SCHEMA_VERSION):
        MIGRATIONS[v](con)
    cols = [r[1] for r in con.execute("PRAGMA table_info(points)")]
    con.close()
    return cols


_POINT_COLUMNS = _schema_columns()

_SQLITE_MAGIC = b"SQLite format 3\x00"
_WAL_MAGICS = (0x377F0682, 0x377F0683)
_WHAT_TO_DO = "it is left untouched: move it away (or restore a copy) and run again, or choose another --out"


def _header_problem(path: Path, size: int) -> str | None:
    """What is wrong with the file's SQLite header and length (None: looks like a whole database)."""
    with open(path, "rb") as fh:
        head = fh.read(100)
    if len(head) < 100 or not head.startswith(_SQLITE_MAGIC):
        return "is unreadable: it is not an SQLite database (no SQLite header)"
    page_size = struct.unpack(">H", head[16:18])[0]
    page_size = 65536 if page_size == 1 else page_size
    change_counter, n_pages = struct.unpack(">II", head[24:32])
    valid_for = struct.unpack(">I", head[92:96])[0]
    if n_pages and valid_for == change_counter and size < n_pages * page_size:
        return (f"is truncated: it holds {size} bytes of the {n_pages * page_size} its header records "
                "(cut short by a full disk or an interrupted copy?)")
    return None


def _wal_problem(path: Path) -> str | None:
    wal = path.with_name(path.name + "-wal")
    try:
        if not wal.is_file() or wal.stat().st_size == 0:
            return None
        with open(wal, "rb") as fh:
            head = fh.read(4)
    except OSError as exc:
        return f"has a write-ahead log {wal.name} that cannot be read ({exc.strerror})"
    if len(head) < 4 or struct.unpack(">I", head)[0] not in _WAL_MAGICS:
        return (f"has a write-ahead log {wal.name} that is not one (damaged); it is left untouched: move "
                f"{wal.name} away (results.db alone holds every flame written back to it) and run again")
    return None


def stored_keys(path: Path) -> set[str]:
    """Keys of the points stored at ``path``; empty when there is no store or an empty (0-byte) one.

    Raises StoreError for a file that is not a healthy store (see the module docstring).
    """
    path = Path(path)
    try:
        st = path.stat()
    except FileNotFoundError:
        return set()
    except OSError as exc:
        raise StoreError(f"results store {path} cannot be examined ({exc.strerror})") from None
    if stat.S_ISREG(st.st_mode) and st.st_size == 0:
        return set()
    with Store(path, readonly=True) as store:
        return store.keys()


def pack_profile(profile: dict | None) -> bytes | None:
    """Profile dict -> the stored bytes (store.profiles; None stays None)."""
    return None if profile is None else profiles.encode(profile)


def unpack_profile(blob: bytes | None) -> dict | None:
    """Stored bytes -> profile dict (either encoding: older stores may hold float64 npz)."""
    return None if blob is None else profiles.decode(blob)


class StoredPoint(Protocol):
    """What the store keeps of a point besides its result (sweep.points.Point, sweep.extras.Record)."""

    @property
    def key(self) -> str: ...
    @property
    def family(self) -> str: ...
    @property
    def phi(self) -> float: ...
    @property
    def pressure_bar(self) -> float: ...
    @property
    def T_u(self) -> float: ...


class Store:
    """Results of finished flames in one SQLite file.

    ``readonly`` opens an existing store for reading (charts, check) and never
    migrates; without it the store is created or migrated to SCHEMA_VERSION.
    """

    def __init__(self, path: Path, readonly: bool = False) -> None:
        self.path = Path(path)
        self.db: sqlite3.Connection | None = None   # open from here until close()
        self.migrated_from: int | None = None   # schema version this open migrated from
        self.backup_path: Path | None = None    # the copy kept before that migration
        self._examine_file(readonly)
        try:
            uri = f"file:{self.path}?mode=ro" if readonly else f"file:{self.path}"
            self.db = sqlite3.connect(uri, uri=True, timeout=BUSY_TIMEOUT_S)
            self._check_and_migrate(readonly)
        except (sqlite3.DatabaseError, UnicodeDecodeError) as exc:  # text that is not UTF-8: damaged too
            self._close_quietly()
            raise StoreError(f"results store {self.path} is damaged or unreadable ({exc}); {_WHAT_TO_DO}") from None
        except BaseException:
            self._close_quietly()
            raise

    @property
    def _db(self) -> sqlite3.Connection:
        """The open connection (every method but close() runs on an open store)."""
        assert self.db is not None, "the results store is closed"
        return self.db

    def _close_quietly(self) -> None:
        if self.db is not None:
            try:
                self.db.close()
            except sqlite3.Error:
                pass
            self.db = None

    def _examine_file(self, readonly: bool) -> None:
        """Refuse what is not a store file, before SQLite opens it."""
        path = self.path
        try:
            st = path.stat()
        except FileNotFoundError:
            if readonly:
                raise StoreError(f"no results store at {path}; run the study first (flamecharts run CONFIG)") from None
            return
        except OSError as exc:
            raise StoreError(f"results store {path} cannot be examined ({exc.strerror})") from None
        if stat.S_ISDIR(st.st_mode):
            raise StoreError(f"results store {path} is a folder, not a file; {_WHAT_TO_DO}")
        if not stat.S_ISREG(st.st_mode):
            raise StoreError(f"results store {path} is not a regular file; {_WHAT_TO_DO}")
        need = os.R_OK | (0 if readonly else os.W_OK)
        if not os.access(path, need):
            raise StoreError(f"results store {path} cannot be {'read' if readonly else 'read and written'} "
                             "(permission denied): give yourself access (chmod/chown) or choose another --out")
        if st.st_size == 0:
            if readonly:
                raise StoreError(f"{path} is empty (0 bytes); run the study first (flamecharts run CONFIG)")
        else:
            try:
                problem = _header_problem(path, st.st_size)
            except OSError as exc:
                raise StoreError(f"results store {path} cannot be read ({exc.strerror})") from None
            if problem:
                raise StoreError(f"results store {path} {problem}; {_WHAT_TO_DO}")
        problem = _wal_problem(path)
        if problem:
            raise StoreError(f"results store {path} {problem}")

    def _check_and_migrate(self, readonly: bool) -> None:
        db = self._db
        path = self.path
        # every check comes before the first write, so a foreign or damaged file is never changed
        check = [r[0] for r in db.execute("PRAGMA quick_check")]
        if check != ["ok"]:
            found = [t.strip() for row in check for t in str(row).splitlines()
                     if t.strip() and not t.startswith("***")] or ["unknown damage"]
            more = f" and {len(found) - 1} more problems" if len(found) > 1 else ""
            raise StoreError(f"results store {path} is damaged (SQLite check: {found[0]}{more}); {_WHAT_TO_DO}")
        version = db.execute("PRAGMA user_version").fetchone()[0]
        tables = {r[0] for r in db.execute("SELECT name FROM sqlite_master WHERE type='table'")}
        if version > SCHEMA_VERSION:
            raise StoreError(f"results store {path} has schema version {version}, newer than this "
                             f"flamecharts knows ({SCHEMA_VERSION}); it is left untouched: upgrade flamecharts "
                             "or choose another --out")
        if version < 0 or (tables and (version == 0 or "points" not in tables)) or (version > 0 and not tables):
            raise StoreError(f"{path} is not a flamecharts results store (an SQLite database of another "
                             f"application?); {_WHAT_TO_DO}")
        if readonly and not tables:
            raise StoreError(f"{path} is empty; run the study first (flamecharts run CONFIG)")
        if version < SCHEMA_VERSION:
            missing = [v for v in range(version, SCHEMA_VERSION) if v not in MIGRATIONS]
            if missing:
                raise StoreError(f"results store {path} has schema version {version}, and this flamecharts "
                                 f"has no migration from version {missing[0]} to {missing[0] + 1}; it is left "
                                 "untouched: open it with the flamecharts that wrote it, or choose another --out")
            if readonly:
                raise StoreError(f"results store {path} has the older schema version {version} (this "
                                 f"flamecharts uses {SCHEMA_VERSION}); 'flamecharts compact DIR' or 'flamecharts "
                                 "run' migrates it, keeping a backup copy")
        if not readonly:
            db.execute("PRAGMA journal_mode=WAL")
            db.execute("PRAGMA synchronous=FULL")
            if version < SCHEMA_VERSION:
                self._migrate(version, backup=bool(tables))
        cols = [r[1] for r in db.execute("PRAGMA table_info(points)")]
        if cols != _POINT_COLUMNS:
            raise StoreError(f"results store {path} has a points table of another layout; {_WHAT_TO_DO}")

    def _migrate(self, version: int, backup: bool) -> Path | None:
        """Upgrade from ``version`` to SCHEMA_VERSION in one transaction, after a backup copy."""
        db = self._db
        copy = self.backup(f"v{version}") if backup else None
        previous = db.isolation_level
        db.isolation_level = None  # explicit BEGIN/COMMIT: DDL and user_version inside one transaction
        try:
            db.execute("BEGIN IMMEDIATE")
            try:
                for v in range(version, SCHEMA_VERSION):
                    MIGRATIONS[v](db)
                    db.execute(f"PRAGMA user_version = {v + 1}")
                db.execute("INSERT OR REPLACE INTO meta VALUES (?, ?)",
                           (f"schema_v{SCHEMA_VERSION}_from_v{version}",
                            json.dumps({"at": time.time(), "backup": copy.name if copy else None})))
                db.execute("COMMIT")
            except BaseException as exc:
                db.execute("ROLLBACK")
                if isinstance(exc, sqlite3.Error):
                    raise StoreError(f"results store {self.path} could not be migrated from schema version "
                                     f"{version} to {SCHEMA_VERSION} ({exc}); it is unchanged"
                                     + (f" and copied to {copy.name}" if copy else "")) from None
                raise
        finally:
            db.isolation_level = previous
        self.migrated_from = version
        self.backup_path = copy
        return copy

    def backup(self, tag: str) -> Path:
        """A consistent copy of the store beside it, ``<name>.<tag>-<date>-<time>.bak`` (SQLite's
        online backup), made before a migration or an upgrade rewrites rows. Returns its path."""
        stamp = time.strftime('%Y%m%d-%H%M%S')
        copy = self.path.with_name(f"{self.path.name}.{tag}-{stamp}.bak")
        n = 1
        while copy.exists():
            copy = copy.with_name(f"{self.path.name}.{tag}-{stamp}-{n}.bak")
            n += 1
        dst = sqlite3.connect(copy)
        try:
            self._db.backup(dst)
        finally:
            dst.close()
        return copy

    def inputs(self, keys: Iterable[str] | None = None) -> dict[str, dict]:
        """key -> the inputs a stored row was solved for (what its key hashes), for the given keys, or all."""
        wanted = set(keys) if keys is not None else None
        out = {}
        for key, text in self._query("SELECT key, inputs FROM points"):
            if wanted is None or key in wanted:
                try:
                    out[key] = json.loads(text)
                except ValueError as exc:
                    raise self._damaged(key, "inputs", exc) from None
        return out

    def has_mark(self, name: str) -> bool:
        """Whether :meth:`update_metrics` left the mark ``name`` (a row of the meta table)."""
        return bool(self._query("SELECT 1 FROM meta WHERE name = ?", (name,)))

    def update_metrics(self, metrics: dict[str, dict], mark: str | None = None) -> None:
        """Replace the metrics of stored rows (key -> new metrics) and, with ``mark``, note in the
        meta table that this upgrade is complete, in one transaction: all or none."""
        try:
            with self._db:
                self._db.executemany("UPDATE points SET metrics = ? WHERE key = ?",
                                     [(json.dumps(m), k) for k, m in metrics.items()])
                if mark is not None:
                    self._db.execute("INSERT OR REPLACE INTO meta VALUES (?, ?)", (mark, json.dumps({"at": time.time()})))
        except sqlite3.DatabaseError as exc:
            raise StoreError(f"results store {self.path} cannot be written ({exc}); every flame stored "
                             "before is kept unchanged") from None

    def close(self) -> None:
        self._close_quietly()

    def __enter__(self) -> Store:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    def _damaged(self, key: str, what: str, exc: BaseException) -> StoreError:
        return StoreError(f"results store {self.path} is damaged: the {what} of point {key} cannot be read "
                          f"({type(exc).__name__}); {_WHAT_TO_DO}")

    def _query(self, sql: str, args: tuple = ()) -> list[tuple]:
        """All rows of a query; SQLite finding damage on the way is a StoreError."""
        try:
            return self._db.execute(sql, args).fetchall()
        except (sqlite3.DatabaseError, UnicodeDecodeError) as exc:
            raise StoreError(f"results store {self.path} is damaged ({exc}); {_WHAT_TO_DO}") from None

    def keys(self) -> set[str]:
        return {r[0] for r in self._query("SELECT key FROM points")}

    def commit_point(self, point: StoredPoint, result: dict, run_id: str) -> bytes | None:
        """Write one finished point (ok, no_flame or failed) in its own transaction.

        A write SQLite refuses (another program holds the file locked for longer than
        BUSY_TIMEOUT_S, a full disk) is a StoreError; the transaction is rolled back, so
        every point committed before stays. The profile comes encoded (``profile_blob``,
        as workers send it) or as arrays (``profile``). Returns the stored bytes (None: none).
        """
        blob = result["profile_blob"] if "profile_blob" in result else pack_profile(result.get("profile"))
        row = (point.key, point.family, json.dumps(result["inputs"], sort_keys=True), point.phi,
               point.pressure_bar, point.T_u, str(result["status"]), result["message"], result["start"],
               json.dumps(result["metrics"]) if result["metrics"] is not None else None,
               float(result["solve_seconds"]), time.time(), run_id, blob,
               str(result["reason"]))
        try:
            with self._db:
                self._db.execute("INSERT OR REPLACE INTO points VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?,?)", row)
        except sqlite3.DatabaseError as exc:
            text = str(exc)
            why = ("another program holds it locked for writing: close that program" if "locked" in text or
                   "busy" in text else "free some disk space" if "full" in text else "check the disk")
            raise StoreError(f"results store {self.path} cannot be written ({text}): {why}, then run the same "
                             "command again; every flame stored before is kept") from None
        return blob

    def compact(self) -> tuple[int, int]:
        """SQLite VACUUM: the file rewritten without the free pages a migration or deletes left.
        Returns (bytes before, bytes after)."""
        before = self.path.stat().st_size
        self._db.execute("PRAGMA wal_checkpoint(TRUNCATE)")
        self._db.execute("VACUUM")
        self._db.execute("PRAGMA wal_checkpoint(TRUNCATE)")
        return before, self.path.stat().st_size

    def rows(self, keys: Iterable[str] | None = None) -> dict[str, dict]:
        """key -> stored row (without profile) for the given keys, or all."""
        cur = self._query(
            "SELECT key, status, reason, message, start, metrics, solve_seconds, finished_at, run_id FROM points")
        wanted = set(keys) if keys is not None else None
        out = {}
        for key, status, reason, message, start, metrics, secs, fin, run_id in cur:
            if wanted is not None and key not in wanted:
                continue
            try:
                metrics = json.loads(metrics) if metrics else None
                if metrics is not None and not isinstance(metrics, dict):
                    raise ValueError("not a table")
            except ValueError as exc:
                raise self._damaged(key, "metrics", exc) from None
            out[key] = {"status": status, "reason": reason, "message": message, "start": start, "metrics": metrics,
                        "solve_seconds": secs, "finished_at": fin, "run_id": run_id}
        return out

    def profile(self, key: str) -> dict | None:
        row = self._query("SELECT profile FROM points WHERE key = ?", (key,))
        if not row:
            return None
        try:
            return unpack_profile(row[0][0])
        except Exception as exc:  # noqa: BLE001 - zip, zlib, numpy and key errors of a damaged blob
            raise self._damaged(key, "flame profile", exc) from None

    def warm_sources(self, families: set[str]) -> list[dict]:
        """Burning flames with a stored profile in the given families: key, family, phi,
        pressure_bar, T_u and the fuel-stream composition, for planning warm starts."""
        out = []
        for fam in sorted(families):
            for key, p_phi, p_bar, T_u, inputs in self._query(
                    "SELECT key, phi, pressure_bar, unburned_temperature_K, inputs FROM points "
                    "WHERE family = ? AND status = 'ok' AND profile IS NOT NULL ORDER BY key", (fam,)):
                try:
                    fuel = {k: float(v) for k, v in json.loads(inputs)["fuel"].items()}
                except (ValueError, KeyError, TypeError, AttributeError) as exc:
                    raise self._damaged(key, "inputs", exc) from None
                out.append({"key": key, "family": fam, "phi": p_phi, "pressure_bar": p_bar, "T_u": T_u,
                            "X_flame": fuel})
        return out

    def timings(self, families: set[str]) -> dict[str, list[float]]:
        """Solve seconds of the burning flames of these families, by start ('fresh', 'warm')."""
        out: dict[str, list[float]] = {"fresh": [], "warm": []}
        for fam in sorted(families):
            for start, secs in self._query(
                    "SELECT start, solve_seconds FROM points WHERE family = ? AND status = 'ok'", (fam,)):
                out.setdefault(start, []).append(float(secs))
        return out

    def integrity_ok(self) -> bool:
        return self._db.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
