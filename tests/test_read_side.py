"""The read side works from a run folder alone: no mechanism file, no Cantera (issue 29, item 2).

A run keeps what the read-out needs of its mechanism beside the config copy (facts.MechanismFacts)
and of every flame's mixture in the store (sweep.worker.mixture_properties, the autoignition
screen, the premixer's delays); ``open_results``, ``flamecharts charts`` and ``flamecharts report``
then run with the mechanism moved away, without importing Cantera. A store written before is
refused by the read side and upgraded once by ``flamecharts compact`` (nothing solved again).
"""
from __future__ import annotations

import json
import shutil
import sqlite3
import subprocess
import sys
from pathlib import Path

import cantera as ct
import pytest

import flamecharts
from flamecharts.errors import StoreError
from flamecharts.sweep.upgrade import BURNING_FIELDS, READOUT_MARK

from conftest import run_cli, write_h2_study

EXTRA = """
[gas_quality]
wobbe_tolerance_percent = 5.0

[burner]
name = "test burner"
port = "round"
port_diameter_mm = 1.0
port_velocity_m_s = 4.0

[premixer]
residence_time_ms = 2.0

[uncertainty]
kinetics = true
"""

#: Columns compared before and after (what the read-out computes from the stored fields).
COMPARED = ("status", "laminar_flame_speed_m_s", "flashback_margin", "port_reynolds_number", "lewis_number_fuel",
            "autoignition_margin", "injection_ignition_delay_ms", "flame_speed_kinetic_uncertainty_percent",
            "lower_wobbe_index_MJ_m3", "warnings")


@pytest.fixture(scope="module")
def finished(tmp_path_factory):
    """A run whose mechanism file sits beside its config (so it can be moved away)."""
    folder = tmp_path_factory.mktemp("readside")
    shutil.copy(Path(ct.__file__).parent / "data" / "h2o2.yaml", folder / "h2o2.yaml")
    config = write_h2_study(folder, phis="[0.7, 1.0]", fractions="[0.0, 0.5]", extra=EXTRA)
    res = flamecharts.run(config, out=folder / "out", jobs=1, charts=False, report=False)
    assert Path(res.study.mechanism_path) == folder / "h2o2.yaml"
    return folder, res


def _compared(rows):
    return [{c: r.get(c) for c in COMPARED} for r in rows]


def test_charts_and_report_without_the_mechanism_and_without_cantera(finished, tmp_path):
    folder, res = finished
    out = tmp_path / "out"
    shutil.copytree(folder / "out", out)
    moved = folder / "h2o2.yaml.away"
    (folder / "h2o2.yaml").rename(moved)
    try:
        code = ("import sys, json\n"
                "from flamecharts.pipeline import open_results\n"
                "from flamecharts.cli.main import main\n"
                f"r = open_results({str(out)!r})\n"
                f"rc = main(['report', {str(out)!r}])\n"
                "print(json.dumps({'rc': rc, 'cantera': 'cantera' in sys.modules, 'n': len(r.rows)}))\n")
        done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=600)
        assert done.returncode == 0, done.stderr
        answer = json.loads(done.stdout.strip().splitlines()[-1])
        assert answer == {"rc": 0, "cantera": False, "n": len(res.rows)}
        assert (out / "report.html").is_file() and (out / "results.nc").is_file()
        again = flamecharts.open_results(out)  # the same answers as the run gave, read without the mechanism
        assert _compared(again.rows) == _compared(res.rows)
    finally:
        moved.rename(folder / "h2o2.yaml")


def test_every_burning_flame_carries_its_read_out_fields(finished):
    folder, res = finished
    from flamecharts.store import Store
    with Store(folder / "out" / "results.db", readonly=True) as store:
        rows = {r["point_key"]: r for r in res.rows}
        stored = store.rows(rows)
    burning = [k for k, r in stored.items() if r["status"] == "ok"]
    assert burning and all(f in stored[k]["metrics"] for k in burning for f in BURNING_FIELDS)
    # the viscosity the port's Reynolds number uses: hydrogen-air near 1.9e-5 Pa s at 300 K (air alone
    # 1.85e-5 Pa s at 300 K, Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table A.4)
    mu = [stored[k]["metrics"]["unburned_viscosity_Pa_s"] for k in burning]
    assert all(1.5e-5 < m < 2.3e-5 for m in mu), mu


def test_an_old_store_is_refused_then_upgraded_by_compact_after_a_backup(finished, tmp_path):
    folder, res = finished
    out = tmp_path / "out"
    shutil.copytree(folder / "out", out)
    con = sqlite3.connect(out / "results.db")  # as a store written before the fields were stored: no mark
    con.execute("DELETE FROM meta WHERE name = ?", (READOUT_MARK,))
    for key, metrics in con.execute("SELECT key, metrics FROM points WHERE status = 'ok'").fetchall():
        m = json.loads(metrics)
        if "laminar_flame_speed_m_s" in m:
            for f in BURNING_FIELDS:
                m.pop(f, None)
            con.execute("UPDATE points SET metrics = ? WHERE key = ?", (json.dumps(m), key))
    con.commit()
    con.close()
    with pytest.raises(StoreError, match="flamecharts compact DIR"):
        flamecharts.open_results(out)
    done = run_cli("compact", out)
    assert done.returncode == 0, done.stderr
    assert "given their read-out fields" in done.stdout
    assert list(out.glob("results.db.readout-*.bak"))
    # the same answers: the mixture is rebuilt from the stored inputs (12 significant digits)
    for a, b in zip(_compared(flamecharts.open_results(out).rows), _compared(res.rows)):
        assert a == {k: pytest.approx(v, rel=1e-9) if isinstance(v, float) else v for k, v in b.items()}
