"""flamecharts run CONFIG: solve, store, write every output, print the outcome."""
from __future__ import annotations

import argparse
import signal
import sys
from collections import Counter
from pathlib import Path
from typing import TYPE_CHECKING

from ..admissible.words import kept, limit_sentence, search_flames
from ..analyses import parts
from ..columns import gas_label
from ..config import by_mechanism, check_cluster_spec, load_study, lumping_note, reduction_note
from ..design import error_bar_sentence, inside_kinetic_band, largest_differences, mechanism_differences, not_assessed_summary
from ..outcome import Status
from ..pipeline import RunSummary, default_out_dir, run
from ..results import comparison_of, mechanism_dataset, rows_of
from ..sweep.run import RunInterrupted
from .progress import ProgressDisplay, plural
from .tables import print_margins, print_points, print_premixer

if TYPE_CHECKING:
    from ..config import Study
    from ..results import Results


def _display(args: argparse.Namespace, study: Study, out: Path) -> ProgressDisplay:
    """The run's progress display, which says with its first report what `check` estimates for
    the whole run (sweep, limit searches and extra solves)."""
    if args.quiet:
        return ProgressDisplay(quiet=True)
    from .check import whole_run_seconds

    return ProgressDisplay(whole_run_s=whole_run_seconds(study, out, args.jobs))


def cmd_run(args: argparse.Namespace) -> int:
    cluster = check_cluster_spec(args.cluster, "--cluster") if args.cluster is not None else None
    study = load_study(args.config)
    out = Path(args.out) if args.out else default_out_dir(study)
    progress = _display(args, study, out)

    try:
        results = run(study, out=out, jobs=args.jobs, cluster=cluster, progress=progress,
                      charts=not args.no_charts, report=not args.no_report)
        summary = results.summary
        assert isinstance(summary, RunSummary)  # run() gives the summary of the run
    except KeyboardInterrupt as exc:
        signal.signal(signal.SIGINT, signal.SIG_IGN)  # a further Ctrl-C cannot cut the message short
        progress.close()
        what = ""
        if isinstance(exc, RunInterrupted):
            what = (f" {exc.solved} flames solved in this run, {exc.remaining} points left"
                    + (" (running flames abandoned)" if exc.at_once else "") + ".")
        print(f"\nInterrupted.{what} Every finished flame is stored in {out}; run the same command "
              "again to resume.", file=sys.stderr)
        return 130
    progress.close()
    ok = sum(r["status"] == "ok" for r in summary.rows)
    print(f"{study.title}: {plural(len(summary.rows), 'point')}, {plural(ok, 'flame')}, {summary.no_flame} no flame, "
          + (f"{summary.autoignition} autoigniting, " if summary.autoignition else "")
          + f"{summary.failed} failed; solved {summary.solved} now, {summary.reused} from the store; "
          f"all solving (sweep, extra solves, limits) {summary.wall_seconds:.1f} s" + _utilisation(summary) + ".")
    _print_reduction(summary)
    if summary.failed:
        reasons = Counter(r["reason"] for r in summary.rows if r["status"] == Status.FAILED)
        print(f"{summary.failed} failed: " + ", ".join(f"{n} {why}" for why, n in sorted(reasons.items())))
    for r in summary.failures[:20]:
        print(f"  {r['status']}: {gas_label(r)}, phi {r['equivalence_ratio']:g}, {r['pressure_bar']:g} bar, "
              f"{r['unburned_temperature_K']:g} K: {r['message']}")
    if len(summary.failures) > 20:
        print(f"  ... and {len(summary.failures) - 20} more (see results.csv)")
    warned = [r for r in summary.rows if r.get("warnings")]
    if warned:
        print(f"{len(warned)} points with warnings: outside the range the method or mechanism covers, or "
              "thermodiffusively unstable (column 'warnings'):")
        for r in warned[:20]:
            print(f"  {gas_label(r)}, phi {r['equivalence_ratio']:g}, {r['pressure_bar']:g} bar, "
                  f"{r['unburned_temperature_K']:g} K: {r['warnings']}")
        if len(warned) > 20:
            print(f"  ... and {len(warned) - 20} more (see results.csv)")
    gaps = not_assessed_summary(summary.rows)
    if gaps:
        print("Criteria not assessed (outside the range of their data: no margin, and no verdict or limit rests on "
              "them; column 'criteria_not_assessed'):")
        for g in gaps:
            print(f"  {g['criterion']} at {g['points']} of {g['of']} flames, e.g. {g['example']}")
    if note := lumping_note(study):
        print(note)
    study = summary.study or study  # under [reduction]: with the skeletal mechanism the flames burn
    subs = by_mechanism(study)
    for i, sub in enumerate(subs):  # a study comparing mechanisms: each one's read-out in turn
        if len(subs) > 1 and (not args.quiet or study.burner or study.premixer or study.uncertainty):
            print(f"Under {sub.mechanism}{' (reference)' if i == 0 else ''}:")
        _print_read_out(sub, rows_of(sub, summary.rows), results, args.quiet)
    _print_limits(study, summary)
    _print_records(summary, len(subs) > 1)
    _print_mechanisms(study, summary.rows)
    print(f"Results: {out / 'results.csv'} and {out / 'results.nc'} (fuel-gas properties: {out / 'fuel_gases.csv'}"
          + (f"; limits: {out / 'limits.csv'}" if summary.limits else "")
          + "".join(f"; {label}: {out / name}" for m in parts("console")
                    for name, label in getattr(m, "RECORD_LABELS", {}).items() if summary.records.get(name))
          + (f"; sensitivities: {out / 'sensitivities.csv'}" if (out / 'sensitivities.csv').is_file() else "")
          + "".join(f"; {Path(name).stem}: {out / name}" for m in parts("columns") for name in m.TABLES
                    if (out / name).is_file())
          + (f"; mechanisms compared: {out / 'mechanism_comparison.csv'}" if study.mechanisms else "") + ")")
    if not args.no_charts:
        print(f"Charts: {out / 'charts'}/")
        if not args.no_report:
            print(f"Report: {out / 'report.html'}")
    print("Screening estimates, not certification: follow local codes and the applicable standards; "
          "confirm by test.")
    return 0


def _print_reduction(summary: RunSummary) -> None:
    """[reduction]: what happened to the skeletal mechanism (made, reused, why, whether the flames are
    solved again), what it is, and its measured error at each validation flame."""
    study = summary.study
    if study is None or study.reduced is None:
        return
    print(summary.reduction_note)
    print(reduction_note(study))
    r = study.reduced
    measured = [f for f in r.flames if f.get("error") is not None]
    if r.reduced and measured:
        print("Reduction band of S_L (results.csv flame_speed_reduction_error_percent; the largest where a point was "
              "not a validation flame), measured against the detailed mechanism at:")
        for f in measured[:12]:
            print(f"  {f['label']}{'' if f['held_out'] else ' (beside the sweep)'}: "
                  f"{100 * f['detailed_m_s']:.4g} cm/s detailed, {100 * f['skeletal_m_s']:.4g} skeletal, "
                  f"{100 * f['error']:.2g} %")


def _print_limits(study: Study, summary: RunSummary) -> None:
    """The [limits] answers, one sentence each."""
    if not summary.limits:
        return
    assert study.burner is not None  # a study with limits has a burner
    print(f"Limits ({study.burner.name}; keeping {kept(study)}"
          + f"; {plural(search_flames(summary.limits), 'flame')} beyond the sweep, "
          f"{summary.limit_flames} solved in this run):")
    for r in summary.limits:
        print("  " + (f"{r['mechanism']}: " if study.mechanisms else "") + limit_sentence(r, study))


def _print_records(summary: RunSummary, by_mechanism: bool = False) -> None:
    """The analyses' record tables (the [stretch] ladders), each analysis's lines (its console
    part's RECORDS_CONSOLE), with the mechanism of each row when the study compares several."""
    for analysis in parts("console"):
        if hasattr(analysis, "RECORDS_CONSOLE"):
            for line in analysis.RECORDS_CONSOLE(summary.records, summary.records_solved, by_mechanism):
                print(line)


def _print_read_out(study: Study, rows: list[dict], results: Results, quiet: bool) -> None:
    """One mechanism's read-out: the points (unless ``quiet``), the burner's margins, the premixer,
    the error bars and the registered analyses' lines (flamecharts.analyses: each one's ``console``)."""
    if not quiet:
        print_points(study, rows)
    print_margins(study, mechanism_dataset(results.dataset, study.mechanism))
    print_premixer(study, rows)
    _print_error_bars(study, rows)
    for analysis in parts("console"):
        for line in analysis.CONSOLE(study, rows) if hasattr(analysis, "CONSOLE") else ():
            print(line)


def _print_error_bars(study: Study, rows: list[dict]) -> None:
    """How sure the flame speeds are: per gas and condition, the point nearest phi 1 (with
    [uncertainty]; every flame's numerical band is in results.csv either way)."""
    if study.uncertainty is None:
        return
    ok = [r for r in rows if r["status"] == "ok" and r.get("flame_speed_numerical_error_percent") is not None]
    groups: dict[tuple, list] = {}
    for r in ok:
        groups.setdefault((gas_label(r), r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]), []).append(r)
    print("Error bars of S_L (numerics: grid convergence index" + ("; kinetics: 1 sigma, first order, rate-constant "
                                                                   "factors; sensitivities.csv):"
                                                                   if study.uncertainty.kinetics else "):"))
    for (gas, _ox, P, T), rs in list(groups.items())[:20]:
        near = min(rs, key=lambda r: (abs(r["equivalence_ratio"] - 1.0), r["equivalence_ratio"]))
        print(f"  {gas}, {P:g} bar, {T:g} K: " + error_bar_sentence(near).replace("φ", "phi").replace("σ", " sigma"))
    if len(groups) > 20:
        print(f"  ... and {len(groups) - 20} more (report.html, results.csv)")


def _print_mechanisms(study: Study, rows: list[dict]) -> None:
    """A study comparing mechanisms: per other mechanism, gas and condition, the largest flame-speed
    difference from the reference's and whether it lies inside the reference's kinetic band."""
    comparison = comparison_of(study, rows)
    if comparison is None:
        return
    ref = comparison.names[0]
    print(f"Mechanisms compared (difference from {ref}, the reference; mechanism_comparison.csv, chart "
          "mechanism_comparison):")
    lines = largest_differences(mechanism_differences(rows, comparison.names))
    for d in lines[:20]:
        band, dth = d["reference_kinetic_uncertainty_percent"], d["thermal_thickness_difference_percent"]
        num = d["flame_speed_difference_numerical_error_percent"]
        print(f"  {d['mechanism']}: {gas_label(d)} in {d['oxidizer']}, {d['pressure_bar']:g} bar, "
              f"{d['unburned_temperature_K']:g} K: S_L "
              f"differs by up to {d['flame_speed_difference_percent']:+.1f}"
              + ("" if num is None else f" ± {num:.2g}") + f" % (phi {d['equivalence_ratio']:g}: "
              f"{100 * d['laminar_flame_speed_m_s']:.3g} vs {100 * d['reference_laminar_flame_speed_m_s']:.3g} cm/s)"
              + ("" if dth is None else f", thickness {dth:+.1f} %")
              + ("" if band is None else f"; {'inside' if inside_kinetic_band(d) else 'OUTSIDE'}"
                                         f" the reference's kinetic band ({band:.2g} %, 1 sigma)"))
    if len(lines) > 20:
        print(f"  ... and {len(lines) - 20} more (report.html, mechanism_comparison.csv)")


def _utilisation(summary: RunSummary) -> str:
    """', 2 workers 87 % busy' (empty when nothing was solved)."""
    u = summary.worker_utilisation
    if u is None:
        return ""
    return f", {summary.workers} worker{'s' if summary.workers != 1 else ''} {100 * u:.0f} % busy"


