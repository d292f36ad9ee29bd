"""Scale: studies of 10,000 to 100,000 points, in one process, nothing solved.

Run:  python tests/benchmarks/scale.py [--sections planning] [--sizes 10k,30k,100k] [--old-at 10k]

Sections (one function each, ``SECTIONS``; a section returns a dict of figures):

- planning: h2o2.yaml studies of two oxidizers (two families) x 10 blend fractions x
  pressures x preheats x equivalence ratios. Per size: the points (``sweep.points``),
  the warm-start tree (``warm_tree``: time and the peak of memory it allocates, by
  tracemalloc, in a second run), and ``flamecharts check`` end to end in this process
  (``cli.check.cmd_check``, output thrown away) and as a command (``python -m
  flamecharts check``, start-up included). The old all-pairs tree
  (``_warm_tree_dense``) is timed at the ``--old-at`` sizes for the ratio, and the two
  trees compared there; on the studies of tests/benchmarks/sweep_speed.py (small and
  full, planning only) the total warm-start distance of the new tree over the old one.

- store: bytes per stored profile in the compact encoding (store.profiles, schema 3) and
  results.db bytes per flame, for a small h2o2 study and three GRI-Mech 3.0 methane-air
  flames (solved here, about a minute); beside them the old encoding (float64 npz) of the
  same decoded profiles, which understates the old size (rounded values compress better
  than the solver's own: the demo store's real old profiles took 343 KB, not ~157 KB).

- outputs: per size of ``--sizes``, a store of the planning study (with a cooktop-like
  burner, so the margin charts are drawn too) filled with real h2o2 flames (12 solved
  here, then copied under every point's key: no 100,000 flames are solved). Commits
  as the run loop makes them (``Store.commit_point`` of a worker's encoded profile, then
  its decoding for the in-run warm starts) are timed on the empty store and again on the
  full one; the rest is filled in one transaction. Then, in a child
  process (its peak memory is the figure), each step of the read-out: the rows
  (``results.rows_from_dir``), the dataset, results.csv, results.nc, the charts and
  report.html, with the report's size.

The last line printed is one JSON object with every figure (times in seconds, memory
in MB); progress goes to stderr.
"""
from __future__ import annotations

import argparse
import contextlib
import io
import json
import math
import subprocess
import sys
import tempfile
import textwrap
import time
import tracemalloc
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
sys.path[:0] = [str(ROOT), str(HERE)]  # this checkout's package; sweep_speed beside this file

from flamecharts.cli.check import cmd_check  # noqa: E402
from flamecharts.config import load_study  # noqa: E402
from flamecharts.sweep import points as plan_points, warm_tree as plan_tree  # noqa: E402

#: (equivalence ratios, pressures, preheats) per size; 2 oxidizers x 10 blend fractions each.
SIZES = {"10k": (25, 5, 4), "30k": (50, 5, 6), "100k": (50, 10, 10)}

TEMPLATE = """
title = "Scale benchmark: {n} points"
mechanism = "h2o2.yaml"
max_points = 1000000

[fuels]
diluted = {{ H2 = 0.6, N2 = 0.4 }}
hydrogen = {{ H2 = 1.0 }}

[oxidizers]
air = {{ O2 = 1.0, N2 = 3.76 }}
enriched_air = {{ O2 = 1.0, N2 = 2.5 }}

[sweep]
fuel = ["diluted"]
oxidizer = ["air", "enriched_air"]
blend = {{ with = "hydrogen", fraction = {fractions} }}
equivalence_ratio = {phis}
pressure_bar = {pressures}
unburned_temperature_K = {temperatures}
"""


def log(msg: str) -> None:
    print(msg, file=sys.stderr, flush=True)


def write_scale_study(folder: Path, size: str) -> Path:
    """A config of SIZES[size]: phi from 0.5 in steps of 0.02, pressures from 1 bar in
    steps of x1.25, preheats from 300 K in steps of 25 K, blend fractions 0 to 1 in ninths."""
    n_phi, n_p, n_T = SIZES[size]
    text = TEMPLATE.format(
        n=2 * 10 * n_phi * n_p * n_T,
        fractions=[round(k / 9, 4) for k in range(10)],
        phis=[round(0.5 + 0.02 * k, 4) for k in range(n_phi)],
        pressures=[round(1.25 ** k, 4) for k in range(n_p)],
        temperatures=[300.0 + 25 * k for k in range(n_T)])
    path = folder / f"scale_{size}.toml"
    path.write_text(textwrap.dedent(text))
    return path


def timed(fn, *args):
    """(result, wall seconds) of fn(*args)."""
    t0 = time.perf_counter()
    out = fn(*args)
    return out, time.perf_counter() - t0


def peak_mb(fn, *args) -> float:
    """Peak of the memory fn(*args) allocates above what is allocated before [MB] (tracemalloc)."""
    tracemalloc.start()
    try:
        base = tracemalloc.get_traced_memory()[0]
        fn(*args)
        return (tracemalloc.get_traced_memory()[1] - base) / 2**20
    finally:
        tracemalloc.stop()


def total_distance(plan) -> float:
    """Sum of the warm-start distances of a plan (roots excluded), in DISTANCE_SCALES units."""
    return sum(d for d in plan.distance.values() if math.isfinite(d))


def check_in_process(config: Path, out: Path) -> float:
    """Wall seconds of ``flamecharts check`` in this process (modules already loaded), printout discarded."""
    args = argparse.Namespace(config=str(config), out=str(out), jobs=2)
    with contextlib.redirect_stdout(io.StringIO()):
        _, secs = timed(cmd_check, args)
    return secs


def check_command(config: Path, out: Path) -> float:
    """Wall seconds of ``python -m flamecharts check`` (start-up and imports included)."""
    t0 = time.perf_counter()
    subprocess.run([sys.executable, "-m", "flamecharts", "check", str(config), "--out", str(out), "--jobs", "2"],
                   cwd=ROOT, check=True, capture_output=True)
    return time.perf_counter() - t0


def plan_size(tmp: Path, size: str, old: bool) -> dict:
    """Planning figures of one size (see the module docstring)."""
    config = write_scale_study(tmp, size)
    study = load_study(config)
    pts, t_points = timed(plan_points.points, study)
    tree, t_tree = timed(plan_tree.warm_tree, pts)
    fig = {"points": len(pts), "points_s": t_points, "tree_s": t_tree, "roots": len(tree.roots),
           "depth": tree.depth, "tree_peak_mb": peak_mb(plan_tree.warm_tree, pts),
           "check_s": check_in_process(config, tmp / f"out_{size}"),
           "check_command_s": check_command(config, tmp / f"out_{size}")}
    log(f"{size}: {len(pts)} points in {t_points:.2f} s, tree {t_tree:.2f} s "
        f"({fig['tree_peak_mb']:.0f} MB), check {fig['check_s']:.2f} s, as a command {fig['check_command_s']:.2f} s")
    if old:
        ref, t_old = timed(plan_tree._warm_tree_dense, pts)
        fig.update(old_tree_s=t_old, old_over_new=t_old / t_tree, same_as_old=_same_plan(tree, ref))
        log(f"{size}: old tree {t_old:.1f} s ({t_old / t_tree:.0f}x), same plan: {fig['same_as_old']}")
    return fig


def _same_plan(a, b) -> bool:
    return (a.parent, a.stored, a.roots, a.distance, a.height) == (b.parent, b.stored, b.roots, b.distance, b.height)


def sweep_speed_distances(tmp: Path) -> dict:
    """Total warm-start distance, new tree over old, on sweep_speed.py's studies (planning only)."""
    import sweep_speed

    out = {}
    for size in ("small", "full"):
        pts = plan_points.points(load_study(sweep_speed.write_study(tmp, size, name=f"speed_{size}")))
        new, old = plan_tree.warm_tree(pts), plan_tree._warm_tree_dense(pts)
        out[f"sweep_speed_{size}_distance_new"] = total_distance(new)
        out[f"sweep_speed_{size}_distance_old"] = total_distance(old)
        out[f"sweep_speed_{size}_distance_ratio"] = total_distance(new) / total_distance(old)
        out[f"sweep_speed_{size}_same_plan"] = _same_plan(new, old)
        log(f"sweep_speed {size}: distance new/old {out[f'sweep_speed_{size}_distance_ratio']:.4f}, "
            f"same plan: {out[f'sweep_speed_{size}_same_plan']}")
    return out


def planning(tmp: Path, args) -> dict:
    """The planning section: every size of ``--sizes``, then the sweep_speed studies."""
    figures = {}
    for size in args.sizes:
        for k, v in plan_size(tmp, size, size in args.old_at).items():
            figures[f"plan_{size}_{k}"] = v
    figures.update(sweep_speed_distances(tmp))
    return figures


def _store_figures(tmp: Path, name: str, text: str) -> dict:
    import io as _io
    import sqlite3

    import numpy as np

    import flamecharts
    from flamecharts.store import DB_NAME
    from flamecharts.store.profiles import decode

    cfg = tmp / f"{name}.toml"
    cfg.write_text(textwrap.dedent(text))
    out = tmp / f"store_{name}"
    flamecharts.run(cfg, out=out, jobs=2, charts=False)
    con = sqlite3.connect(out / DB_NAME)
    blobs = [b for (b,) in con.execute("SELECT profile FROM points WHERE profile IS NOT NULL")]
    con.close()
    old = []
    for b in blobs:
        prof, buf = decode(b), _io.BytesIO()
        np.savez_compressed(buf, grid=prof["grid"], T=prof["T"], velocity=prof["velocity"], Y=prof["Y"],
                            species=np.array(prof["species"]), P=np.array(prof["P"]))
        old.append(len(buf.getvalue()))
    new = [len(b) for b in blobs]
    figures = {f"store_{name}_flames": len(blobs), f"store_{name}_old_bytes_per_profile": sum(old) / len(old),
               f"store_{name}_bytes_per_profile": sum(new) / len(new),
               f"store_{name}_db_bytes_per_flame": (out / DB_NAME).stat().st_size / len(blobs)}
    log(f"store {name}: {figures}")
    return figures


def store(tmp: Path, args) -> dict:
    """The store section: profile bytes per flame, old and compact encoding."""
    h2 = """
        title = "scale store h2o2"
        mechanism = "h2o2.yaml"
        [fuels]
        hydrogen = { H2 = 1.0 }
        [oxidizers]
        air = { O2 = 1.0, N2 = 3.76 }
        [sweep]
        fuel = ["hydrogen"]
        oxidizer = ["air"]
        equivalence_ratio = [0.6, 0.8, 1.0, 1.2, 1.4, 1.6]
        """
    gri = """
        title = "scale store gri30"
        mechanism = "gri30.yaml"
        [fuels]
        methane = { CH4 = 1.0 }
        [oxidizers]
        air = { O2 = 1.0, N2 = 3.76 }
        [sweep]
        fuel = ["methane"]
        oxidizer = ["air"]
        equivalence_ratio = [0.8, 1.0, 1.2]
        """
    return {**_store_figures(tmp, "h2o2", h2), **_store_figures(tmp, "gri30", gri)}


BURNER = """
[burner]
name = "scale benchmark burner"
port = "round"
port_diameter_mm = 4.0
port_velocity_m_s = 1.0
min_flashback_margin = 1.5
min_blowoff_margin = 1.5
"""

#: Commits timed at each end of the fill (on the empty and on the full store).
TIMED_COMMITS = 1000


def _source_flames(tmp: Path) -> list[dict]:
    """12 real flames of the scale study's families (2 oxidizers x 2 blends x 3 phi), as stored rows."""
    import sqlite3

    import flamecharts
    from flamecharts.store import DB_NAME

    text = TEMPLATE.format(n=12, fractions=[0.0, 1.0], phis=[0.6, 1.0, 1.4], pressures=[1.0], temperatures=[300.0])
    cfg = tmp / "outputs_sources.toml"
    cfg.write_text(textwrap.dedent(text))
    out = tmp / "outputs_sources"
    flamecharts.run(cfg, out=out, jobs=2, charts=False)
    con = sqlite3.connect(out / DB_NAME)
    con.row_factory = sqlite3.Row
    rows = [dict(r) for r in con.execute("SELECT * FROM points WHERE status = 'ok' ORDER BY phi")]
    con.close()
    return rows


def _fill(out: Path, study, sources: list[dict]) -> dict:
    """The store of ``study`` in ``out`` with every point a copy of a source flame (nearest
    phi, same oxidizer); commit_point timed at both ends, the middle in one transaction."""
    import json as _json
    import uuid

    from flamecharts.config import save_config_copy
    from flamecharts.store import DB_NAME, Store
    from flamecharts.store.db import unpack_profile

    out.mkdir(parents=True, exist_ok=True)
    save_config_copy(study, out)
    pts = plan_points.points(study)
    pool = sources

    def source_of(p):
        return min(pool, key=lambda r: (r["family"] != p.family, abs(r["phi"] - p.phi)))

    def result_of(p, src):  # as a worker sends it: the profile already encoded
        return {"inputs": p.inputs, "status": src["status"], "message": src["message"], "start": src["start"],
                "metrics": _json.loads(src["metrics"]), "solve_seconds": src["solve_seconds"],
                "reason": src["reason"], "profile_blob": src["profile"]}

    run_id = uuid.uuid4().hex[:12]
    n = len(pts)
    first, last = pts[:TIMED_COMMITS], pts[max(TIMED_COMMITS, n - TIMED_COMMITS):]
    middle = pts[TIMED_COMMITS:max(TIMED_COMMITS, n - TIMED_COMMITS)]
    with Store(out / DB_NAME) as store:
        t0 = time.perf_counter()
        for p in first:
            src = source_of(p)
            unpack_profile(store.commit_point(p, result_of(p, src), run_id))  # what the run loop does
        t_first = time.perf_counter() - t0
        with store.db:
            store.db.executemany("INSERT OR REPLACE INTO points VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?,?)", (
                (p.key, p.family, _json.dumps(p.inputs, sort_keys=True), p.phi, p.pressure_bar, p.T_u, src["status"],
                 src["message"], src["start"], src["metrics"], src["solve_seconds"], time.time(), run_id,
                 src["profile"], src["reason"]) for p in middle for src in (source_of(p),)))
        t0 = time.perf_counter()
        for p in last:
            src = source_of(p)
            unpack_profile(store.commit_point(p, result_of(p, src), run_id))  # what the run loop does
        t_last = time.perf_counter() - t0
    return {"points": n, "commit_ms_empty_store": 1e3 * t_first / max(len(first), 1),
            "commit_ms_full_store": 1e3 * t_last / max(len(last), 1),
            "db_mb": (out / DB_NAME).stat().st_size / 2**20}


def peak_rss_mb() -> float:
    """This process's peak resident memory so far [MB] (Linux VmHWM; unlike ru_maxrss it does
    not inherit the parent's peak across fork and exec)."""
    for line in Path("/proc/self/status").read_text().splitlines():
        if line.startswith("VmHWM:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def outputs_child(out: Path) -> dict:
    """Each read-out step on the store in ``out`` (run in a child process): seconds and the
    process's peak resident memory after it [MB]."""
    from flamecharts.design import fuel_gas_table
    from flamecharts.outputs.charts import draw_all
    from flamecharts.outputs.netcdf import write_netcdf
    from flamecharts.outputs.report import write_report
    from flamecharts.outputs.tables import write_columns
    from flamecharts.results import dataset_table, rows_from_dir, to_dataset

    figures = {}

    def step(name, fn, *a):
        value, secs = timed(fn, *a)
        figures[f"{name}_s"] = secs
        figures[f"{name}_peak_rss_mb"] = peak_rss_mb()
        return value

    figures["start_peak_rss_mb"] = peak_rss_mb()
    study, rows = step("read_rows", rows_from_dir, out)
    ds = step("dataset", to_dataset, study, rows)
    step("csv", lambda: write_columns(dataset_table(ds), out / "results.csv"))  # as write_outputs: from the Dataset
    step("netcdf", write_netcdf, ds, out / "results.nc")
    gases = fuel_gas_table(study)
    charts = step("charts", draw_all, rows, gases, study, out, ds)
    report = step("report", write_report, study, rows, out, gases, ds)
    figures.update(charts=len(charts) // 2, report_mb=report.stat().st_size / 2**20,
                   csv_mb=(out / "results.csv").stat().st_size / 2**20,
                   netcdf_mb=(out / "results.nc").stat().st_size / 2**20,
                   largest_chart_png_kb=max(c.stat().st_size for c in charts if c.suffix == ".png") / 1024)
    return figures


def outputs(tmp: Path, args) -> dict:
    """The outputs section (see the module docstring)."""
    from flamecharts.config import load_study as _load

    sources = _source_flames(tmp)
    figures = {}
    for size in args.sizes:
        config = write_scale_study(tmp, size)
        config.write_text(config.read_text() + textwrap.dedent(BURNER))
        out = tmp / f"outputs_{size}"
        fill = _fill(out, _load(config), sources)
        log(f"outputs {size}: filled {fill}")
        child = subprocess.run([sys.executable, __file__, "--outputs-child", str(out)], cwd=ROOT, check=True,
                               capture_output=True, text=True)
        got = {**fill, **json.loads(child.stdout.strip().splitlines()[-1])}
        log(f"outputs {size}: {got}")
        figures.update({f"outputs_{size}_{k}": v for k, v in got.items()})
    return figures


SECTIONS = {"planning": planning, "store": store, "outputs": outputs}


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sections", default=",".join(SECTIONS),
                    help=f"comma-separated sections to run (of {', '.join(SECTIONS)})")
    ap.add_argument("--sizes", default=",".join(SIZES), help=f"planning sizes (of {', '.join(SIZES)})")
    ap.add_argument("--old-at", default="10k", help="sizes at which the old all-pairs tree is timed too ('' for none)")
    ap.add_argument("--outputs-child", help=argparse.SUPPRESS)  # the outputs section's child process
    args = ap.parse_args(argv)
    if args.outputs_child:
        print(json.dumps(outputs_child(Path(args.outputs_child))))
        return 0
    args.sizes = [s for s in args.sizes.split(",") if s]
    args.old_at = {s for s in args.old_at.split(",") if s}
    unknown = [s for s in args.sections.split(",") if s not in SECTIONS] + [s for s in args.sizes if s not in SIZES]
    if unknown:
        ap.error(f"unknown section or size: {', '.join(unknown)}")
    tmp = Path(tempfile.mkdtemp(prefix="flamecharts-scale-"))
    figures = {}
    for name in args.sections.split(","):
        figures.update(SECTIONS[name](tmp, args))
    print(json.dumps({k: (round(v, 4) if isinstance(v, float) else v) for k, v in figures.items()}))
    return 0


if __name__ == "__main__":
    sys.exit(main())
