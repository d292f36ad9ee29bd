"""The compact profile encoding of the store: precision, size, migration of old stores, resume."""
from __future__ import annotations

import io
import sqlite3

import numpy as np

import flamecharts
from flamecharts.store import DB_NAME, Store
from flamecharts.store.profiles import MAGIC, Y_FLOOR, Y_MANTISSA_BITS, bitround, decode, encode
from tests.conftest import write_h2_study


def _profile(n=400, k=9, seed=1):
    rng = np.random.default_rng(seed)
    Y = 10.0 ** rng.uniform(-20, 0, size=(k, n))
    Y[3] = 0.0
    return {"grid": np.sort(rng.uniform(0, 0.02, n)), "T": rng.uniform(300, 2300, n),
            "velocity": rng.uniform(0.3, 3, n), "Y": Y, "species": [f"S{i}" for i in range(k)], "P": 101325.0}


def test_round_trip_keeps_the_grid_exactly_and_the_mass_fractions_to_the_kept_bits():
    p = _profile()
    q = decode(encode(p))
    assert np.array_equal(q["grid"], p["grid"]) and q["species"] == p["species"] and q["P"] == p["P"]
    assert np.allclose(q["T"], p["T"], rtol=1e-7) and np.allclose(q["velocity"], p["velocity"], rtol=1e-7)
    kept = p["Y"] >= Y_FLOOR
    rel = np.abs(q["Y"] - p["Y"])[kept] / p["Y"][kept]
    assert rel.max() <= 2.0 ** -(Y_MANTISSA_BITS + 1) * (1 + 1e-6)  # round to nearest: half a unit
    assert np.all(q["Y"][~kept] == 0.0) and np.all(q["Y"][3] == 0.0)  # trace values below the floor: 0


def test_bitround_is_round_to_nearest_even():
    # with 1 mantissa bit kept, 1.25 lies halfway between 1.0 and 1.5: ties go to the even 1.0
    assert bitround(np.array([1.25, 1.26, 1.75]), 1).tolist() == [1.0, 1.5, 2.0]


def test_decoding_is_stable_so_a_resumed_warm_start_equals_an_in_run_one():
    blob = encode(_profile())
    assert encode(decode(blob)) == blob


def _old_npz(profile) -> bytes:
    buf = io.BytesIO()
    np.savez_compressed(buf, grid=profile["grid"], T=profile["T"], velocity=profile["velocity"], Y=profile["Y"],
                        species=np.array(profile["species"]), P=np.array(profile["P"]))
    return buf.getvalue()


def test_an_old_store_is_migrated_after_a_backup_and_resumes(tmp_path):
    cfg = write_h2_study(tmp_path, phis="[0.8, 1.0, 1.2]", fractions="[0.0]")
    out = tmp_path / "out"
    first = flamecharts.run(cfg, out=out, jobs=1, charts=False)
    # turn it into a store as the previous version wrote it: schema 2, float64 npz profiles
    con = sqlite3.connect(out / DB_NAME)
    for key, blob in con.execute("SELECT key, profile FROM points WHERE profile IS NOT NULL").fetchall():
        con.execute("UPDATE points SET profile = ? WHERE key = ?", (_old_npz(decode(blob)), key))
    con.execute("PRAGMA user_version = 2")
    con.commit()
    con.close()
    with Store(out / DB_NAME) as st:
        assert st.migrated_from == 2 and st.backup_path.is_file()
        blobs = [r[0] for r in st.db.execute("SELECT profile FROM points")]
    assert all(b[:4] == MAGIC for b in blobs)
    again = flamecharts.run(cfg, out=out, jobs=1, charts=False)
    assert again.summary.solved == 0
    assert [r["laminar_flame_speed_m_s"] for r in again.rows] == [r["laminar_flame_speed_m_s"] for r in first.rows]
    # an extension warm-starts from the migrated profiles
    cfg.write_text(cfg.read_text().replace("[0.8, 1.0, 1.2]", "[0.8, 0.9, 1.0, 1.2]"))
    ext = flamecharts.run(cfg, out=out, jobs=1, charts=False)
    assert ext.summary.solved == 1 and all(r["status"] == "ok" for r in ext.rows)
    assert next(r for r in ext.rows if r["equivalence_ratio"] == 0.9)["start"] == "warm"


def test_keep_profiles_false_stores_none_and_still_solves(tmp_path):
    cfg = write_h2_study(tmp_path, phis="[0.8, 1.0]", fractions="[0.0]", extra="keep_profiles = false")
    res = flamecharts.run(cfg, out=tmp_path / "out", jobs=1, charts=False)
    assert all(r["status"] == "ok" for r in res.rows) and all(r["start"] == "fresh" for r in res.rows)
    with Store(tmp_path / "out" / DB_NAME, readonly=True) as st:
        assert st.db.execute("SELECT COUNT(*) FROM points WHERE profile IS NOT NULL").fetchone()[0] == 0


def test_compact_command_shrinks_a_migrated_store_and_refuses_a_locked_folder(tmp_path, cli):
    cfg = write_h2_study(tmp_path, phis="[0.8, 1.0]", fractions="[0.0]")
    out = tmp_path / "out"
    flamecharts.run(cfg, out=out, jobs=1, charts=False)
    r = cli("compact", out)
    assert r.returncode == 0 and "MB ->" in r.stdout, r.stderr
    from flamecharts.store import RunLock
    with RunLock(out):
        r = cli("compact", out)
    assert r.returncode == 2 and "error" in r.stderr and "Traceback" not in r.stderr
