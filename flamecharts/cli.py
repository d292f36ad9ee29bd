"""Command line: the only place that prints, draws progress and picks exit codes.

flamecharts run CONFIG [--out DIR] [--jobs N] [--cluster ADDRESS|local:N]
                                                solve, store, write results.csv and charts
flamecharts check CONFIG [--out DIR]            validate a config and print the plan
flamecharts charts DIR                          redraw results.csv and charts from the store
flamecharts report DIR                          the same, plus DIR/report.html

Exit codes: 0 done (also when some flames failed; they are listed), 2 bad input or
unusable store (one line on stderr), 130 interrupted (what finished is kept).
"""
from __future__ import annotations

import argparse
import signal
from collections import Counter
import sys
from pathlib import Path

from . import __version__


def _parser() -> argparse.ArgumentParser:
    ap = argparse.ArgumentParser(
        prog="flamecharts",
        description="Laminar flame speed and thickness over an operating window, from detailed chemistry.")
    ap.add_argument("--version", action="version", version=f"flamecharts {__version__}")
    sub = ap.add_subparsers(dest="command", required=True, metavar="COMMAND")
    run = sub.add_parser("run", help="solve every point of a study, store it, write CSV and charts")
    run.add_argument("config", help="study config (TOML)")
    run.add_argument("--out", help="output folder (default output/<config name>/)")
    run.add_argument("--jobs", type=int, default=None, help="worker processes (default: all cores)")
    run.add_argument("--cluster", metavar="ADDRESS",
                     help="solve on a Dask cluster: tcp://HOST:PORT of a running scheduler, or local:N "
                          "to start N local Dask workers (default: the config's 'cluster', else --jobs)")
    run.add_argument("--no-charts", action="store_true", help="skip drawing charts (and the report)")
    run.add_argument("--no-report", action="store_true", help="skip writing report.html")
    run.add_argument("--quiet", action="store_true", help="no progress bar")
    chk = sub.add_parser("check", help="validate a config and print the plan without solving")
    chk.add_argument("config", help="study config (TOML)")
    chk.add_argument("--out", help="output folder to compare with (default output/<config name>/)")
    chk.add_argument("--jobs", type=int, default=None, help="workers to estimate the run time for (default: all cores)")
    ch = sub.add_parser("charts", help="redraw results.csv and the charts of a finished run from its store")
    ch.add_argument("dir", help="output folder of a run")
    rp = sub.add_parser("report", help="write report.html of a finished run (redraws its charts from the store)")
    rp.add_argument("dir", help="output folder of a run")
    return ap


def _err(msg: str) -> None:
    print(f"flamecharts: error: {msg}", file=sys.stderr)


def _cmd_check(args) -> int:
    from . import plan
    from .flame import NUMERICS
    from .runner import default_out_dir, study_rows, unique_points, warm_plan
    from .store import DB_NAME, Store, stored_keys
    from .study import load_study

    study = load_study(args.config)
    pts = plan.points(study)
    out = Path(args.out) if args.out else default_out_dir(study)
    keys = stored_keys(out / DB_NAME)  # a damaged or foreign store is reported here, before a run meets it
    stored = sum(p.key in keys for p in pts)
    unique = unique_points(pts)
    todo = {p.index for p in unique if p.key not in keys}
    rows, timings = [], {}
    if keys:
        with Store(out / DB_NAME, readonly=True) as st:
            tree = warm_plan(st, unique).pending(todo, {p.index: p.key for p in unique})
            timings = st.timings({p.family for p in pts})
            rows = study_rows(study, pts, st.rows([p.key for p in pts]))
    else:
        tree = plan.warm_tree(unique)
    n = NUMERICS[study.resolution]
    print(f"Study: {study.title}")
    print(f"Mechanism: {study.mechanism} -> {study.mechanism_path}")
    print(f"Transport: {study.transport}, thermal diffusion {'on' if study.thermal_diffusion else 'off'}; "
          f"resolution {study.resolution} (final grid ratio/slope/curve {n.stages[-1]})")
    print(f"Fuels: {', '.join(study.sweep_fuels)}"
          + (f"; blended with {study.blend_with} at {', '.join(f'{f:g}' for f in study.blend_fractions)}"
             if study.blend_with else ""))
    print(f"Oxidizers: {', '.join(study.sweep_oxidizers)}")
    print(f"Equivalence ratio: {', '.join(f'{v:g}' for v in study.equivalence_ratios)}")
    print(f"Pressure [bar]: {', '.join(f'{v:g}' for v in study.pressures_bar)}")
    print(f"Unburned temperature [K]: {', '.join(f'{v:g}' for v in study.unburned_temperatures_K)}")
    _print_gases(study)
    _print_burner(study)
    if stored:
        _print_points(study, [r for r in rows if r["status"] != "pending"])
    print(f"Plan: {len(pts)} points; {stored} already stored in {out}, {len(todo)} to solve: "
          f"{len(tree.roots)} from scratch, {len(todo) - len(tree.roots)} warm-started from a neighbour "
          f"(longest warm-start path {tree.depth})")
    if todo:
        print(_estimate_line(study, tree, timings, args.jobs))
    return 0


def _estimate_line(study, tree, timings: dict, jobs) -> str:
    """'Estimated run time ...' from stored timings of the same settings, else from the mechanism size."""
    import statistics

    from . import plan
    from .runner import resolve_jobs

    jobs = resolve_jobs(jobs)
    secs = plan.default_flame_seconds(len(study.atoms))
    basis = f"from the mechanism size, {len(study.atoms)} species"
    measured = {k: statistics.median(v) for k, v in timings.items() if len(v) >= 3}
    if measured:
        secs.update(measured)
        basis = f"from {sum(len(v) for v in timings.values())} stored timings"
    t = plan.estimate_run_seconds(tree, jobs, secs["fresh"], secs["warm"])
    when = f"{t / 60:.0f} min" if t >= 120 else f"{t:.0f} s"
    return (f"Estimated run time: about {when} on {jobs} worker{'s' if jobs > 1 else ''} ({basis}; "
            f"{secs['fresh']:.1f} s per flame from scratch, {secs['warm']:.1f} s warm; good to a factor 2)")


def _blend_label(r) -> str:
    return r["fuel"] + (f" + {100 * r['blend_fraction']:g} % {r['blend_with'] or ''}".rstrip()
                        if r.get("blend_with") else "")


def _print_gases(study) -> None:
    from .design import fuel_gas_table

    table = fuel_gas_table(study)
    print(f"Fuel gases ({table[0]['conditions']}; {table[0]['method']}):")
    print(f"  {'gas':38s} {'HHV':>7s} {'LHV':>7s} {'d':>6s} {'W_s':>7s} {'W_i':>7s} {'dW':>7s}  band")
    print(f"  {'':38s} {'MJ/m3':>7s} {'MJ/m3':>7s} {'-':>6s} {'MJ/m3':>7s} {'MJ/m3':>7s} {'%':>7s}")
    for g in table:
        band = "" if g["wobbe_in_band"] is None else ("inside" if g["wobbe_in_band"] else "OUTSIDE")
        print(f"  {_blend_label(g) + ' in ' + g['oxidizer']:38s} {g['higher_heating_value_MJ_m3']:7.3f} "
              f"{g['lower_heating_value_MJ_m3']:7.3f} {g['relative_density']:6.4f} "
              f"{g['higher_wobbe_index_MJ_m3']:7.3f} {g['lower_wobbe_index_MJ_m3']:7.3f} "
              f"{g['wobbe_change_percent']:+7.2f}  {band}")


def _print_burner(study) -> None:
    b = study.burner
    if b is None:
        print("Burner: none given (add a [burner] table for flashback and blowoff margins)")
        return
    size = f"{'diameter' if b.port == 'round' else 'gap'} {b.port_size_m * 1e3:g} mm"
    how = (f"port velocity {b.port_velocity_m_s:g} m/s" if b.mode == "velocity" else
           f"thermal input {b.thermal_input_W / 1e3:g} kW over {b.port_area_m2 * 1e6:g} mm2 of ports"
           + (", following the Wobbe index (fixed supply pressure)" if b.input_follows_wobbe else ""))
    print(f"Burner: {b.name}: {b.port} ports, {size}; {how}; minimum margins flashback "
          f"{b.min_flashback_margin:g}, blowoff {b.min_blowoff_margin:g}")


def _print_margins(study, rows) -> None:
    from .design import first_flashback_fraction, margin_summary

    summary = margin_summary(study, rows)
    if not summary:
        return
    b = study.burner
    print(f"Burner margins ({b.name}; minimum flashback {b.min_flashback_margin:g}, "
          f"blowoff {b.min_blowoff_margin:g}):")
    for s in summary:
        print(f"  {_blend_label({**s, 'blend_with': study.blend_with})}, {s['pressure_bar']:g} bar, "
              f"{s['unburned_temperature_K']:g} K: flashback margin >= {s['min_flashback_margin']:.2f} "
              f"(phi {s['at_phi_flashback']:g}), blowoff margin >= {s['min_blowoff_margin']:.2f} "
              f"(phi {s['at_phi_blowoff']:g}); {s['points_ok']} of {s['points']} points ok")
    for (fuel, ox, p, T), frac in first_flashback_fraction(study, rows).items():
        what = (f"from {100 * frac:g} % {study.blend_with}" if frac is not None
                else f"at no {study.blend_with} fraction of the study")
        print(f"  {fuel} in {ox}, {p:g} bar, {T:g} K: flashback margin below {b.min_flashback_margin:g} {what}")


MAX_POINT_LINES = 60


def _print_points(study, rows) -> None:
    """One line per point with the flame, its indicators and, with a burner, its margins."""
    burner = study.burner is not None
    head = (f"  {'gas':30s} {'phi':>5s} {'p':>6s} {'T_u':>6s} {'S_L':>7s} {'d_T':>6s} {'g_F':>7s} {'d_q':>5s}"
            + (f" {'U':>6s} {'g_wall':>7s} {'FB':>5s} {'BO':>5s}  verdict" if burner else ""))
    unit = (f"  {'':30s} {'-':>5s} {'bar':>6s} {'K':>6s} {'cm/s':>7s} {'mm':>6s} {'1/s':>7s} {'mm':>5s}"
            + (f" {'m/s':>6s} {'1/s':>7s} {'-':>5s} {'-':>5s}" if burner else ""))
    print("Points (indicators per point; every column in results.csv):")
    print(head)
    print(unit)
    for r in rows[:MAX_POINT_LINES]:
        line = f"  {_blend_label(r):30s} {r['equivalence_ratio']:5.2f} {r['pressure_bar']:6g} {r['unburned_temperature_K']:6g} "
        if r["status"] != "ok":
            print(line + f"{r['status']}: {r['message'][:70]}")
            continue
        line += (f"{100 * r['laminar_flame_speed_m_s']:7.2f} {r['thermal_thickness_mm']:6.3f} "
                 f"{r['flashback_critical_gradient_1_s']:7.0f} {r['quenching_distance_mm']:5.2f}")
        if burner:
            line += (f" {r['port_velocity_m_s']:6.3f} {r['wall_velocity_gradient_1_s']:7.0f} "
                     f"{r['flashback_margin']:5.2f} {r['blowoff_margin']:5.2f}  {r['verdict']}")
        print(line)
    if len(rows) > MAX_POINT_LINES:
        print(f"  ... and {len(rows) - MAX_POINT_LINES} more points in results.csv")


def _finish_outputs(study, rows, out: Path, charts: bool, report: bool = False) -> list[Path]:
    from .charts import draw_all
    from .design import fuel_gas_table
    from .export import GAS_TABLE_COLUMNS, write_about, write_csv

    from .fits import exponent_table

    files = [write_csv(rows, out / "results.csv"), write_about(study, out / "about.txt"),
             write_csv(fuel_gas_table(study), out / "fuel_gases.csv", GAS_TABLE_COLUMNS)]
    exponents = exponent_table(rows)
    if exponents:
        files.append(write_csv(exponents, out / "power_law_exponents.csv", tuple(exponents[0])))
    if charts:
        files += draw_all(rows, study, out)
    if charts and report:
        from .report import write_report

        files.append(write_report(study, rows, out))
    return files


def _cmd_run(args) -> int:
    from tqdm import tqdm

    from .runner import default_out_dir, run_study
    from .study import check_cluster_spec, load_study

    cluster = check_cluster_spec(args.cluster, "--cluster") if args.cluster is not None else None
    study = load_study(args.config)
    out = Path(args.out) if args.out else default_out_dir(study)
    bar = None
    told = False

    def progress(pr) -> None:
        nonlocal bar, told
        if pr.stopping and not told:
            told = True
            print("\nCtrl-C: no new flames are started; the running ones finish and are stored "
                  "(Ctrl-C again to stop at once).", file=sys.stderr)
        if args.quiet:
            return
        if bar is None:
            bar = tqdm(total=pr.total, unit="flame", file=sys.stderr, dynamic_ncols=True,
                       desc=f"flames ({pr.reused} from the store)", disable=None)
        bar.set_postfix(no_flame=pr.no_flame, failed=pr.failed, refresh=False)
        bar.update(pr.done - bar.n)

    try:
        summary = run_study(study, out_dir=out, jobs=args.jobs, progress=progress, cluster=cluster)
        files = _finish_outputs(study, summary.rows, out, charts=not args.no_charts, report=not args.no_report)
    except KeyboardInterrupt as exc:
        signal.signal(signal.SIGINT, signal.SIG_IGN)  # a further Ctrl-C cannot cut the message short
        if bar is not None:
            bar.close()
        from .runner import RunInterrupted

        what = ""
        if isinstance(exc, RunInterrupted):
            what = (f" {exc.solved} flames solved in this run, {exc.remaining} points left"
                    + (" (running flames abandoned)" if exc.at_once else "") + ".")
        print(f"\nInterrupted.{what} Every finished flame is stored in {out}; run the same command "
              "again to resume.", file=sys.stderr)
        return 130
    if bar is not None:
        bar.close()
    ok = sum(r["status"] == "ok" for r in summary.rows)
    print(f"{study.title}: {len(summary.rows)} points, {ok} flames, {summary.no_flame} no flame, "
          f"{summary.failed} failed; solved {summary.solved} now, {summary.reused} from the store, "
          f"{summary.wall_seconds:.1f} s" + _utilisation(summary) + ".")
    if summary.failed:
        from .flame import failure_reason

        reasons = Counter(failure_reason(r["message"]) for r in summary.rows if r["status"] == "failed")
        print(f"{summary.failed} failed: " + ", ".join(f"{n} {why}" for why, n in sorted(reasons.items())))
    for r in summary.failures[:20]:
        print(f"  {r['status']}: {r['fuel']}"
              + (f" + {r['blend_fraction']:g} {r['blend_with']}" if r["blend_with"] else "")
              + f", phi {r['equivalence_ratio']:g}, {r['pressure_bar']:g} bar, "
                f"{r['unburned_temperature_K']:g} K: {r['message']}")
    if len(summary.failures) > 20:
        print(f"  ... and {len(summary.failures) - 20} more (see results.csv)")
    warned = [r for r in summary.rows if r.get("warnings")]
    if warned:
        print(f"{len(warned)} points outside the range the method or mechanism covers (column 'warnings'):")
        for r in warned[:20]:
            print(f"  {_blend_label(r)}, phi {r['equivalence_ratio']:g}, {r['pressure_bar']:g} bar, "
                  f"{r['unburned_temperature_K']:g} K: {r['warnings']}")
        if len(warned) > 20:
            print(f"  ... and {len(warned) - 20} more (see results.csv)")
    if not args.quiet:
        _print_points(study, summary.rows)
    _print_margins(study, summary.rows)
    print(f"Results: {files[0]} (fuel-gas properties: {files[2]})")
    if not args.no_charts:
        print(f"Charts: {out / 'charts'}/")
        if not args.no_report:
            print(f"Report: {out / 'report.html'}")
    print("Screening estimates, not certification: follow local codes and the applicable standards; "
          "confirm by test.")
    return 0


def _utilisation(summary) -> str:
    """', 2 workers 87 % busy' (empty when nothing was solved)."""
    u = summary.worker_utilisation
    if u is None:
        return ""
    return f", {summary.workers} worker{'s' if summary.workers != 1 else ''} {100 * u:.0f} % busy"


def _cmd_charts(args, report: bool = False) -> int:
    from .runner import rows_from_dir

    study, rows = rows_from_dir(Path(args.dir))
    files = _finish_outputs(study, rows, Path(args.dir), charts=True, report=report)
    print(f"Wrote {len(files)} files in {args.dir}" + (f"; report: {files[-1]}" if report else ""))
    return 0


def main(argv: list[str] | None = None) -> int:
    from .errors import FlamechartsError

    args = _parser().parse_args(argv)
    handlers = {"run": _cmd_run, "check": _cmd_check, "charts": _cmd_charts,
                "report": lambda a: _cmd_charts(a, report=True)}
    try:
        return handlers[args.command](args)
    except FlamechartsError as exc:
        _err(str(exc))
        return 2
    except KeyboardInterrupt:  # Ctrl-C outside a run's solving (reading the config, drawing charts)
        print("\nInterrupted; nothing half-written is left (files are replaced whole).", file=sys.stderr)
        return 130


if __name__ == "__main__":
    sys.exit(main())
