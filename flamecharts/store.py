"""SQLite store of finished flames, one transaction per point; resume; lock.

The store lives in the study's output folder (results.db). Each row is keyed by
the point's key (see plan.py), so a rerun, or another study that overlaps this
one, solves only what is missing. Rows are committed one at a time with
synchronous=FULL in WAL mode: a killed run loses nothing that had been committed.

The schema version is kept in SQLite's ``user_version``; a store written by a
newer, unknown schema is refused rather than changed.
"""
from __future__ import annotations

import fcntl
import io
import json
import os
import sqlite3
import time
from pathlib import Path

import numpy as np

from .errors import StoreError

SCHEMA_VERSION = 1
DB_NAME = "results.db"
LOCK_NAME = ".flamecharts.lock"

_SCHEMA = """
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


def _schema_columns() -> list[str]:
    """Columns of the points table as _SCHEMA defines them (the layout an existing store must have)."""
    con = sqlite3.connect(":memory:")
    con.executescript(_SCHEMA)
    cols = [r[1] for r in con.execute("PRAGMA table_info(points)")]
    con.close()
    return cols


_POINT_COLUMNS = _schema_columns()


def pack_profile(profile: dict | None) -> bytes | None:
    """Profile dict -> compressed npz bytes (None stays None)."""
    if profile is None:
        return None
    buf = io.BytesIO()
    np.savez_compressed(buf, grid=profile["grid"], T=profile["T"], velocity=profile["velocity"],
                        Y=profile["Y"], species=np.array(profile["species"]), P=np.array(profile["P"]))
    return buf.getvalue()


def unpack_profile(blob: bytes | None) -> dict | None:
    if blob is None:
        return None
    with np.load(io.BytesIO(blob)) as z:
        return {"grid": z["grid"], "T": z["T"], "velocity": z["velocity"], "Y": z["Y"],
                "species": [str(s) for s in z["species"]], "P": float(z["P"])}


class RunLock:
    """An exclusive lock on an output folder, so two runs never write one store at once."""

    def __init__(self, folder: Path):
        self.path = Path(folder) / LOCK_NAME
        self._fh = None

    def acquire(self) -> "RunLock":
        try:
            fh = open(self.path, "a+")
        except OSError as exc:
            raise StoreError(f"output folder {self.path.parent} is not writable ({exc.strerror}); "
                             "choose another --out") from None
        try:
            fcntl.flock(fh, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            fh.seek(0)
            holder = fh.read().strip() or "unknown"
            fh.close()
            raise StoreError(f"output folder {self.path.parent} is in use by another run ({holder}); "
                             "wait for it to finish or choose another --out") from None
        fh.seek(0)
        fh.truncate()
        fh.write(f"pid {os.getpid()} since {time.strftime('%Y-%m-%d %H:%M:%S')}")
        fh.flush()
        self._fh = fh
        return self

    def release(self) -> None:
        if self._fh is not None:
            fcntl.flock(self._fh, fcntl.LOCK_UN)
            self._fh.close()
            self._fh = None

    def __enter__(self):
        return self.acquire()

    def __exit__(self, *exc):
        self.release()


class Store:
    """Results of finished flames in one SQLite file."""

    def __init__(self, path: Path, readonly: bool = False):
        self.path = Path(path)
        if readonly and not self.path.is_file():
            raise StoreError(f"no results store at {self.path}; run the study first (flamecharts run CONFIG)")
        try:
            uri = f"file:{self.path}?mode=ro" if readonly else f"file:{self.path}"
            self.db = sqlite3.connect(uri, uri=True, timeout=30.0)
            version = self.db.execute("PRAGMA user_version").fetchone()[0]
            tables = {r[0] for r in self.db.execute("SELECT name FROM sqlite_master WHERE type='table'")}
            # every check comes before the first write, so a foreign file is never changed
            if version > SCHEMA_VERSION:
                raise StoreError(f"results store {self.path} has schema version {version}, newer than this "
                                 f"flamecharts ({SCHEMA_VERSION}); upgrade flamecharts or use another --out")
            if tables and (version == 0 or "points" not in tables):
                raise StoreError(f"{self.path} is not a flamecharts results store; it is left untouched: "
                                 "move it away or choose another --out")
            if tables:
                cols = [r[1] for r in self.db.execute("PRAGMA table_info(points)")]
                if cols != _POINT_COLUMNS:
                    raise StoreError(f"results store {self.path} has a points table of another layout; it is "
                                     "left untouched: move it away or choose another --out")
            if readonly and not tables:
                raise StoreError(f"{self.path} is empty; run the study first (flamecharts run CONFIG)")
            if not readonly:
                self.db.execute("PRAGMA journal_mode=WAL")
                self.db.execute("PRAGMA synchronous=FULL")
                self.db.executescript(_SCHEMA)
                self.db.execute(f"PRAGMA user_version = {SCHEMA_VERSION}")
                self.db.commit()
        except sqlite3.DatabaseError as exc:
            raise StoreError(f"results store {self.path} is unreadable ({exc}); it is left untouched: "
                             "move it away to start afresh, or choose another --out") from None

    def close(self) -> None:
        self.db.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    def keys(self) -> set[str]:
        return {r[0] for r in self.db.execute("SELECT key FROM points")}

    def commit_point(self, point, result: dict, run_id: str) -> None:
        """Write one finished point (ok, no_flame or failed) in its own transaction."""
        with self.db:
            self.db.execute(
                "INSERT OR REPLACE INTO points VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?)",
                (point.key, point.family, json.dumps(result["inputs"], sort_keys=True), point.phi,
                 point.pressure_bar, point.T_u, result["status"], result["message"], result["start"],
                 json.dumps(result["metrics"]) if result["metrics"] is not None else None,
                 float(result["solve_seconds"]), time.time(), run_id, pack_profile(result["profile"])))

    def rows(self, keys=None) -> dict[str, dict]:
        """key -> stored row (without profile) for the given keys, or all."""
        cur = self.db.execute(
            "SELECT key, status, message, start, metrics, solve_seconds, finished_at, run_id FROM points")
        wanted = set(keys) if keys is not None else None
        out = {}
        for key, status, message, start, metrics, secs, fin, run_id in cur:
            if wanted is not None and key not in wanted:
                continue
            out[key] = {"status": status, "message": message, "start": start,
                        "metrics": json.loads(metrics) if metrics else None,
                        "solve_seconds": secs, "finished_at": fin, "run_id": run_id}
        return out

    def profile(self, key: str) -> dict | None:
        row = self.db.execute("SELECT profile FROM points WHERE key = ?", (key,)).fetchone()
        return unpack_profile(row[0]) if row else None

    def warm_sources(self, families: set[str]) -> list[dict]:
        """Burning flames with a stored profile in the given families: key, family, phi,
        pressure_bar, T_u and the fuel-stream composition, for planning warm starts."""
        out = []
        for fam in sorted(families):
            for key, p_phi, p_bar, T_u, inputs in self.db.execute(
                    "SELECT key, phi, pressure_bar, unburned_temperature_K, inputs FROM points "
                    "WHERE family = ? AND status = 'ok' AND profile IS NOT NULL ORDER BY key", (fam,)):
                fuel = {k: float(v) for k, v in json.loads(inputs)["fuel"].items()}
                out.append({"key": key, "family": fam, "phi": p_phi, "pressure_bar": p_bar, "T_u": T_u,
                            "X_fuel": fuel})
        return out

    def timings(self, families: set[str]) -> dict[str, list[float]]:
        """Solve seconds of the burning flames of these families, by start ('fresh', 'warm')."""
        out: dict[str, list[float]] = {"fresh": [], "warm": []}
        for fam in sorted(families):
            for start, secs in self.db.execute(
                    "SELECT start, solve_seconds FROM points WHERE family = ? AND status = 'ok'", (fam,)):
                out.setdefault(start, []).append(float(secs))
        return out

    def integrity_ok(self) -> bool:
        return self.db.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
