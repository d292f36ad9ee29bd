"""End to end on small hydrogen studies: CLI, CSV, charts, store, resume after stop and kill -9."""
import csv
import os
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pytest

from flamecharts import load_study, run_study
from flamecharts.columns import COLUMNS
from flamecharts.pipeline import solve_study
from flamecharts.store import DB_NAME, Store

from conftest import write_h2_study

REQUIRED = ["fuel", "oxidizer", "blend_with", "blend_fraction", "equivalence_ratio", "pressure_bar",
            "unburned_temperature_K", "status", "laminar_flame_speed_m_s", "thermal_thickness_mm",
            "diffusive_thickness_mm", "reaction_zone_thickness_mm", "adiabatic_flame_temperature_K",
            "expansion_ratio", "unburned_density_kg_m3", "unburned_thermal_diffusivity_m2_s",
            "grid_points", "solve_seconds", "mechanism", "transport", "message"]


def read_csv(path):
    with open(path, newline="") as fh:
        return list(csv.DictReader(fh))


def test_cli_run_writes_csv_and_charts(tmp_path, cli):
    config = write_h2_study(tmp_path, pressures="[1.0, 2.0]")
    out = tmp_path / "out"
    r = cli("run", config, "--out", out, "--jobs", "2")
    assert r.returncode == 0, r.stderr
    rows = read_csv(out / "results.csv")
    assert len(rows) == 12  # 2 blends x 3 phi x 2 pressures
    assert set(REQUIRED) <= set(rows[0]) and list(rows[0]) == list(COLUMNS)
    assert all(row["status"] == "ok" for row in rows)
    speeds = {(row["blend_fraction"], row["equivalence_ratio"], row["pressure_bar"]):
              float(row["laminar_flame_speed_m_s"]) for row in rows}
    # more hydrogen in the fuel gas burns faster (trend of the trade)
    assert speeds[("0.5", "1", "1")] > speeds[("0", "1", "1")]
    for name in ("flame_speed_vs_equivalence_ratio", "thermal_thickness_vs_equivalence_ratio"):
        png = out / "charts" / f"{name}.png"
        svg = out / "charts" / f"{name}.svg"
        assert png.stat().st_size > 10_000 and svg.stat().st_size > 10_000
        import matplotlib.image as mpimg
        assert np.asarray(mpimg.imread(png)).std() > 0.05  # not blank
        text = svg.read_text()
        assert "[cm/s]" in text or "[mm]" in text
        assert "Equivalence ratio" in text
    # Cantera's own solver log never reaches the user
    assert "Newton" not in r.stdout + r.stderr and "Attempt" not in r.stdout + r.stderr
    assert "not certification" in r.stdout
    assert "not certification" in (out / "about.txt").read_text()
    assert "not certification" in (out / "report.html").read_text()


def test_charts_command_redraws_from_the_store(tmp_path, cli):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    out = tmp_path / "out"
    assert cli("run", config, "--out", out, "--jobs", "1", "--no-charts").returncode == 0
    assert not (out / "charts").exists()
    config.unlink()  # the folder alone is enough
    r = cli("charts", out)
    assert r.returncode == 0, r.stderr
    assert (out / "charts" / "flame_speed_vs_equivalence_ratio.png").is_file()


def test_python_api_returns_rows(tmp_path):
    study = load_study(write_h2_study(tmp_path, fractions="[0.0]", phis="[0.8, 1.0]"))
    s = run_study(study, out_dir=tmp_path / "o", jobs=1)
    assert [r["equivalence_ratio"] for r in s.rows] == [0.8, 1.0]
    assert s.solved == 2 and s.reused == 0
    again = run_study(study, out_dir=tmp_path / "o", jobs=1)
    assert again.solved == 0 and again.reused == 2
    assert [r["laminar_flame_speed_m_s"] for r in again.rows] == [r["laminar_flame_speed_m_s"] for r in s.rows]


def test_interrupted_run_resumes_and_matches_an_uninterrupted_one(tmp_path):
    study = load_study(write_h2_study(tmp_path, phis="[0.6, 0.8, 1.0, 1.2]"))
    part = solve_study(study, out_dir=tmp_path / "a", jobs=2, stop_after=3)
    assert part.solved == 3
    with Store(tmp_path / "a" / DB_NAME) as st:
        first = st.rows()
    rest = run_study(study, out_dir=tmp_path / "a", jobs=2)
    assert rest.reused == 3 and rest.solved == 5
    with Store(tmp_path / "a" / DB_NAME) as st:
        after = st.rows()
    for key, row in first.items():  # nothing that had finished was solved again
        assert after[key]["finished_at"] == row["finished_at"]
    whole = run_study(study, out_dir=tmp_path / "b", jobs=2)
    for r1, r2 in zip(rest.rows, whole.rows):
        assert r1["status"] == r2["status"] == "ok"
        # the same warm-start source as an uninterrupted run (its stored profile): the same flame
        assert r1["laminar_flame_speed_m_s"] == pytest.approx(r2["laminar_flame_speed_m_s"], rel=1e-6)


def test_overlapping_study_reuses_shared_points(tmp_path):
    a = load_study(write_h2_study(tmp_path, name="a", fractions="[0.0]", phis="[0.8, 1.0]"))
    b = load_study(write_h2_study(tmp_path, name="b", fractions="[0.0]", phis="[1.0, 1.2]"))
    run_study(a, out_dir=tmp_path / "o", jobs=1)
    s = run_study(b, out_dir=tmp_path / "o", jobs=1)
    assert s.reused == 1 and s.solved == 1


def _count(db):
    try:
        con = sqlite3.connect(f"file:{db}?mode=ro", uri=True, timeout=1)
        n = con.execute("SELECT COUNT(*) FROM points").fetchone()[0]
        con.close()
        return n
    except sqlite3.Error:
        return 0


def test_kill_9_mid_run_loses_nothing_finished(tmp_path, cli):
    config = write_h2_study(tmp_path, fractions="[0.0, 0.25, 0.5]", phis="[0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2]",
                            pressures="[1.0, 3.0]")
    out = tmp_path / "out"
    db = out / DB_NAME
    proc = subprocess.Popen([sys.executable, "-m", "flamecharts", "run", str(config), "--out", str(out),
                             "--jobs", "2", "--quiet"], start_new_session=True,
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    deadline = time.time() + 300
    while _count(db) < 5 and time.time() < deadline and proc.poll() is None:
        time.sleep(0.05)
    os.killpg(proc.pid, signal.SIGKILL)
    proc.wait()
    time.sleep(0.5)
    with Store(db) as st:
        assert st.integrity_ok()
        before = st.rows()
    assert 5 <= len(before) < 42
    r = cli("run", config, "--out", out, "--jobs", "2", "--no-charts")
    assert r.returncode == 0, r.stderr
    assert f"solved {42 - len(before)} now, {len(before)} from the store" in r.stdout
    with Store(db) as st:
        after = st.rows()
    assert len(after) == 42
    for key, row in before.items():
        assert after[key]["finished_at"] == row["finished_at"]


def test_check_prints_the_plan_and_writes_nothing(tmp_path, cli):
    config = write_h2_study(tmp_path)
    r = cli("check", config, cwd=tmp_path)
    assert r.returncode == 0, r.stderr
    # blend fractions 0 and 0.5 lie 5 distance units apart: one flame from scratch for each
    assert "Plan: 6 points; 0 already stored" in r.stdout
    assert "6 to solve: 2 from scratch, 4 warm-started from a neighbour" in r.stdout
    assert "Estimated sweep: about" in r.stdout
    assert "Estimated total: about" in r.stdout and "free cores: a busy machine takes longer" in r.stdout
    assert not (tmp_path / "output").exists()


def test_check_totals_a_big_study_and_says_it_is_a_job_for_a_cluster(tmp_path, cli):
    """8,080 GRI-Mech 3.0 flames at the fine resolution: the estimate gives one total with what it
    assumes, and says it is more than a workstation's day (a new user's study printed three
    partial figures and no total)."""
    config = tmp_path / "big.toml"
    config.write_text("""
mechanism = "gri30.yaml"
resolution = "fine"
[fuels]
methane = { CH4 = 1.0 }
[oxidizers]
air = { O2 = 1.0, N2 = 3.76 }
[sweep]
fuel = ["methane"]
oxidizer = ["air"]
equivalence_ratio = { from = 0.5, to = 1.5, step = 0.01 }
pressure_bar = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20]
unburned_temperature_K = [300, 400, 500, 600]
[uncertainty]
""")
    r = cli("check", config, "--jobs", "2", cwd=tmp_path)
    assert r.returncode == 0, r.stderr
    assert "Plan: 8080 points" in r.stdout
    total = next(line for line in r.stdout.splitlines() if line.startswith("Estimated total: about"))
    assert "(assumes 2 free cores" in total and "run it on a cluster" in total, total
    days = float(total.split("That is ")[1].split(" working days of 8 h on this machine")[0])
    assert days > 1.0, total  # days of work, not minutes


def test_a_second_run_on_the_same_folder_is_refused(tmp_path):
    from flamecharts import StoreError
    from flamecharts.store import RunLock

    out = tmp_path / "o"
    out.mkdir()
    with RunLock(out):
        study = load_study(write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]"))
        with pytest.raises(StoreError, match="in use by another run"):
            run_study(study, out_dir=out, jobs=1)


def test_garbage_store_is_refused_and_left_untouched(tmp_path, cli):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    out = tmp_path / "out"
    out.mkdir()
    (out / DB_NAME).write_bytes(b"this is not a database" * 100)
    r = cli("run", config, "--out", out)
    assert r.returncode == 2
    assert r.stderr.count("\n") == 1 and "unreadable" in r.stderr and "Traceback" not in r.stderr
    assert (out / DB_NAME).read_bytes() == b"this is not a database" * 100


BAD_CONFIGS = {
    "unknown_key": ("title = 'x'\nmechanizm = 'h2o2.yaml'\n", "did you mean 'mechanism'"),
    "wrong_type": ("mechanism = 'h2o2.yaml'\n[fuels]\nh = { H2 = 1 }\n[oxidizers]\nair = { O2 = 1, N2 = 3.76 }\n"
                   "[sweep]\nfuel = ['h']\noxidizer = ['air']\nequivalence_ratio = 'lean'\n", "sweep.equivalence_ratio"),
    "negative_pressure": ("mechanism = 'h2o2.yaml'\n[fuels]\nh = { H2 = 1 }\n[oxidizers]\nair = { O2 = 1, N2 = 3.76 }\n"
                          "[sweep]\nfuel = ['h']\noxidizer = ['air']\nequivalence_ratio = [1.0]\npressure_bar = [-1]\n",
                          "sweep.pressure_bar"),
    "unknown_species": ("mechanism = 'h2o2.yaml'\n[fuels]\nh = { CH4 = 1 }\n[oxidizers]\nair = { O2 = 1, N2 = 3.76 }\n"
                        "[sweep]\nfuel = ['h']\noxidizer = ['air']\nequivalence_ratio = [1.0]\n", "species 'CH4'"),
    "missing_mechanism": ("mechanism = 'nowhere.yaml'\n[fuels]\nh = { H2 = 1 }\n[oxidizers]\nair = { O2 = 1, N2 = 3.76 }\n"
                          "[sweep]\nfuel = ['h']\noxidizer = ['air']\nequivalence_ratio = [1.0]\n", "nowhere.yaml"),
    "unknown_fuel": ("mechanism = 'h2o2.yaml'\n[fuels]\nh = { H2 = 1 }\n[oxidizers]\nair = { O2 = 1, N2 = 3.76 }\n"
                     "[sweep]\nfuel = ['methane']\noxidizer = ['air']\nequivalence_ratio = [1.0]\n", "unknown fuel 'methane'"),
    "not_toml": ("title = \n", "not valid TOML"),
}


@pytest.mark.parametrize("name", list(BAD_CONFIGS))
def test_cli_bad_input_is_one_line_exit_2_nothing_written(tmp_path, cli, name):
    text, words = BAD_CONFIGS[name]
    config = tmp_path / f"{name}.toml"
    config.write_text(text)
    for cmd in ("run", "check"):
        r = cli(cmd, config, cwd=tmp_path)
        assert r.returncode == 2
        assert r.stderr.count("\n") == 1, r.stderr
        assert words in r.stderr and "Traceback" not in r.stderr
        assert r.stdout == ""
    assert sorted(p.name for p in tmp_path.iterdir()) == [config.name]


def test_foreign_sqlite_file_is_refused_and_left_untouched(tmp_path, cli):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    out = tmp_path / "out"
    out.mkdir()
    con = sqlite3.connect(out / DB_NAME)
    con.execute("CREATE TABLE customers (name TEXT)")
    con.commit()
    con.close()
    before = (out / DB_NAME).read_bytes()
    r = cli("run", config, "--out", out)
    assert r.returncode == 2 and "not a flamecharts results store" in r.stderr
    assert (out / DB_NAME).read_bytes() == before


def test_unwritable_output_folder_is_one_line(tmp_path, cli):
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    r = cli("run", config, "--out", "/proc/self")
    assert r.returncode == 2 and r.stderr.count("\n") == 1 and "Traceback" not in r.stderr


def test_charts_redraw_the_runs_own_results_when_the_mechanism_changed_since(tmp_path, cli):
    """The run folder keeps what the read side needs of its mechanism (study.json): an edited
    file changes nothing it draws, and the command says the file changed since."""
    import shutil

    import cantera as ct

    src = next(Path(d) / "h2o2.yaml" for d in ct.get_data_directories() if (Path(d) / "h2o2.yaml").exists())
    shutil.copy(src, tmp_path / "mech.yaml")
    config = write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]")
    config.write_text(config.read_text().replace('"h2o2.yaml"', '"mech.yaml"'))
    out = tmp_path / "out"
    assert cli("run", config, "--out", out, "--jobs", "1", "--no-charts").returncode == 0
    good = (out / "results.csv").read_text()
    with open(tmp_path / "mech.yaml", "a") as fh:
        fh.write("\n# edited\n")
    r = cli("charts", out)
    assert r.returncode == 0 and "mech.yaml has changed since the run; these are the run's results" in r.stdout
    assert (out / "results.csv").read_text() == good


def test_a_later_run_warm_starts_from_stored_neighbours_and_files_are_readable(tmp_path):
    a = load_study(write_h2_study(tmp_path, name="a", fractions="[0.0]", phis="[1.0]"))
    b = load_study(write_h2_study(tmp_path, name="b", fractions="[0.0]", phis="[1.0, 1.2]"))
    run_study(a, out_dir=tmp_path / "o", jobs=1)
    s = run_study(b, out_dir=tmp_path / "o", jobs=1)
    new = next(r for r in s.rows if r["equivalence_ratio"] == 1.2)
    assert new["start"] == "warm"
    from flamecharts.outputs.tables import write_csv
    path = write_csv(s.rows, tmp_path / "o" / "results.csv")
    assert path.stat().st_mode & 0o044 == 0o044  # group and others may read it
