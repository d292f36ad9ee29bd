"""One pipeline, the same from Python and the command line: plan, solve, store, read out, write.

run            solve every missing point, store it, write every output file -> Results
open_results   the Results of a finished run folder, read from its store alone
solve_study    solve and store only (no output files) -> RunSummary
run_study      the same as solve_study, kept for one release
"""
from __future__ import annotations

import os
import time
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import TYPE_CHECKING

from .admissible import LimitsProgress, find_limits
from .config import Study, by_mechanism, load_study, save_config_copy
from .errors import FlamechartsError
from .results import (
    RecordAccess,
    Results,
    point_rows,
    rows_from_dir,
    rows_of,
    stored_with_extras,
    to_dataset,
    with_mechanism,
)
from .store import DB_NAME, RunLock, Store
from .sweep.analyses import per_point, per_study
from .sweep.backends import open_backend
from .sweep.extras import PartProgress
from .sweep.points import points
from .sweep.run import Progress, RunInterrupted, solve_points
from .sweep.skeletal import prepare as prepare_reduction
from .sweep.upgrade import upgrade_store

if TYPE_CHECKING:
    from .sweep.backends import Backend
    from .sweep.points import Point


@dataclass
class RunSummary(RecordAccess):
    """Outcome of :func:`run_study`. The analyses' record tables are ``records`` (file name ->
    rows) and their solves in this run ``records_solved``; each analysis also names them
    (results.RecordAccess: ``.stretch``, the ladders' rows, and ``.stretch_ladders``, how many
    were solved in this run)."""

    out_dir: Path
    rows: list[dict]
    solved: int     # flames solved in this run (any status)
    reused: int     # points taken from the store
    failed: int
    no_flame: int
    wall_seconds: float
    autoignition: int = 0  # points whose mixture ignites before a flame can cross it (no flame speed)
    failures: list[dict] = field(default_factory=list)
    solve_seconds: float = 0.0  # summed over the flames solved in this run, as measured by the workers
    workers: int = 1            # worker processes (local) or worker threads (cluster) that solved them
    limits: list[dict] = field(default_factory=list)  # limits.csv rows (the study's [limits] table)
    limit_flames: int = 0       # flames the limit searches solved in this run (stored ones not counted)
    records: dict[str, list[dict]] = field(default_factory=dict)  # the analyses' record tables: file -> rows
    records_solved: dict[str, int] = field(default_factory=dict)  # their solves in this run: file -> count
    study: Study | None = None  # the study as solved: with its skeletal mechanism under [reduction]
    reduction_note: str = ""    # [reduction]: what happened to the skeletal mechanism (made, reused, why)

    @property
    def worker_utilisation(self) -> float | None:
        """Share of the workers' wall time spent solving flames: solve seconds / (workers x wall seconds)."""
        if not self.solved or self.wall_seconds <= 0:
            return None
        return self.solve_seconds / (self.workers * self.wall_seconds)


def _part(progress: Callable[[Progress], None] | None, what: str) -> PartProgress | None:
    """The (done, total, estimate) callback an extras loop calls, as the run's one progress event
    (:class:`Progress` with ``what``), timed from now: its time left is the estimate less the time
    elapsed until the first finishes, then follows the share done."""
    if progress is None:
        return None
    t0 = time.perf_counter()

    def report(done: int, total: int, estimate_s: float | None = None) -> None:
        progress(Progress(done=done, total=total, failed=0, no_flame=0, reused=0, elapsed_s=time.perf_counter() - t0,
                          what=what, estimate_s=estimate_s, done_share=done / total if total else 1.0))
    return report


def _relabelled(progress: Callable[[Progress], None] | None, what: str) -> Callable[[Progress], None] | None:
    """``progress`` with each flame report labelled ``what`` (the limit searches' own flames)."""
    return None if progress is None else (lambda pr: progress(replace(pr, what=what)))


def _limits_part(progress: Callable[[Progress], None] | None) -> Callable[[LimitsProgress], None] | None:
    """The limit searches' round report as the run's one progress event ('limits': searches
    answered of all; the round and its flames in ``detail``). Its time left is the flames the open
    searches can still ask for (``flames_left``) at the measured wall time per limit flame so far:
    the share done is of flames, not of searches (a search answered late is not a search left
    with all of its work: counting searches made the time left climb while the work shrank)."""
    if progress is None:
        return None

    def report(p: LimitsProgress) -> None:
        answered = p.searches - p.open_searches
        share = (1.0 if not p.open_searches else
                 p.flames_solved / (p.flames_solved + p.flames_left) if p.flames_solved else 0.0)
        progress(Progress(done=answered, total=p.searches, failed=0, no_flame=0, reused=0, elapsed_s=p.elapsed_s,
                          what="limits",
                          detail=f"round {p.round}, {p.flames_solved} flame{'s' if p.flames_solved != 1 else ''} solved",
                          done_share=share))
    return report


def default_out_dir(study: Study) -> Path:
    """output/<config name>/ in the current folder."""
    return Path("output") / study.name


def _out_folder(study: Study, out_dir: str | os.PathLike | None) -> Path:
    out = Path(out_dir) if out_dir is not None else default_out_dir(study)
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise FlamechartsError(f"output folder {out} cannot be created: {exc.strerror}") from None
    return out


def solve_study(study: Study, out_dir: str | os.PathLike | None = None, jobs: int | None = None,
                progress: Callable[[Progress], None] | None = None, cluster: str | None = None,
                stop_after: int | None = None) -> RunSummary:
    """Solve every point of ``study`` that the store in ``out_dir`` lacks; return every row.

    Then the extra solves the study's analyses ask for (sweep.analyses: per point, then those
    that read the points' rows, as a strained-flame ladder) and, when it has a [limits] table,
    its limit searches (after those, whose values a premixer's margins read): each
    asks for flames between the swept ones, solved on the same backend and stored like any point.
    ``progress`` receives one :class:`Progress` event after every finished flame, extra solve
    and round of limit flames (``what`` says which).

    A study that compares mechanisms is solved once per mechanism, the reference first,
    into the same store (config.by_mechanism): rows, limits and ladders of all of them
    follow one another, each with its mechanism; progress reports carry the mechanism
    as their ``stage``.

    ``cluster`` (a Dask scheduler address or 'local:N', default the study's own) solves
    on Dask workers instead of ``jobs`` local processes. ``stop_after`` hands out at most
    that many new points (tests simulate an interruption with it). Raises
    :class:`~flamecharts.sweep.run.RunInterrupted` after Ctrl-C, once the finished
    flames are stored.
    """
    t0 = time.perf_counter()
    cluster = study.cluster if cluster is None else cluster
    with open_backend(jobs, cluster) as backend:  # an unreachable cluster leaves no folder behind
        out = _out_folder(study, out_dir)
        with RunLock(out), Store(out / DB_NAME) as store:
            solved, note = prepare_reduction(study, out, store.keys() if study.reduction else set(),
                                             _reduction_part(progress))
            save_config_copy(study, out)  # the folder alone can redraw its charts, even if this run is killed
            subs = by_mechanism(solved)
            upgrade_store(store, {s.mechanism_sha256: (s.mechanism_path, s.atoms) for s in subs})
            parts = []
            for i, sub in enumerate(subs):
                stage = f"{sub.mechanism} ({i + 1} of {len(subs)})" if len(subs) > 1 else ""
                try:
                    parts.append(_solve_one(sub, store, backend, _staged(progress, stage), stop_after,
                                            t0 if i == 0 else None))
                except RunInterrupted as exc:  # counted over the whole study, not the mechanism it stopped in
                    exc.solved += sum(p["solved"] for p in parts)
                    exc.remaining += sum(s.n_points for s in subs[i + 1:])
                    raise
                if stop_after is not None:
                    stop_after = max(0, stop_after - parts[-1]["solved"])
        workers = max(1, backend.workers())
    rows = [r for part in parts for r in part["rows"]]
    return RunSummary(out_dir=out, rows=rows, solved=sum(p["solved"] for p in parts),
                      reused=sum(p["reused"] for p in parts),
                      failed=sum(1 for r in rows if r["status"] == "failed"),
                      no_flame=sum(1 for r in rows if r["status"] == "no_flame"),
                      wall_seconds=time.perf_counter() - t0,
                      autoignition=sum(1 for r in rows if r["status"] == "autoignition"),
                      failures=[r for r in rows if r["status"] in ("failed", "no_flame", "autoignition")],
                      solve_seconds=sum(p["solve_seconds"] for p in parts), workers=workers,
                      limits=[r for p in parts for r in p["limits"]],
                      limit_flames=sum(p["limit_flames"] for p in parts),
                      records=_merged(p["records"] for p in parts),
                      records_solved=_summed(p["records_solved"] for p in parts), study=solved, reduction_note=note)


def _merged(parts: Iterable[dict[str, list[dict]]]) -> dict[str, list[dict]]:
    """Each mechanism's record tables (file -> rows) as one: their rows one after another."""
    out: dict[str, list[dict]] = {}
    for part in parts:
        for name, rows in part.items():
            out.setdefault(name, []).extend(rows)
    return out


def _summed(parts: Iterable[dict[str, int]]) -> dict[str, int]:
    """Each mechanism's counts per record table (file -> count) as one."""
    out: dict[str, int] = {}
    for part in parts:
        for name, n in part.items():
            out[name] = out.get(name, 0) + n
    return out


def _reduction_part(progress: Callable[[Progress], None] | None) -> Callable[[str], None] | None:
    """The reduction's progress lines as the run's one progress event ('mechanism reduction', the
    line in ``detail``)."""
    if progress is None:
        return None
    t0 = time.perf_counter()
    return lambda line: progress(Progress(done=0, total=1, failed=0, no_flame=0, reused=0,
                                          elapsed_s=time.perf_counter() - t0, what="mechanism reduction", detail=line))


def _staged(progress: Callable[[Progress], None] | None, stage: str) -> Callable[[Progress], None] | None:
    """``progress`` with each report labelled by ``stage`` (the mechanism being solved)."""
    if progress is None or not stage:
        return progress
    return lambda pr: progress(replace(pr, stage=stage))


def _solve_one(study: Study, store: Store, backend: Backend, progress: Callable[[Progress], None] | None,
               stop_after: int | None, t0: float | None) -> dict:
    """Solve one mechanism's study: the sweep, then the extras, limits and ladders it asks for."""
    pts = points(study)
    done = solve_points(study, store, pts, backend, progress, stop_after, t0)
    stored = store.rows([p.key for p in pts])
    extra_seconds = 0.0
    for analysis in per_point() if stop_after is None else ():  # the extra solves the study's tables ask for
        if analysis.wanted(study):
            extra_seconds += analysis.solve(study, store, pts, stored, backend, _part(progress, analysis.what))[1]
    rows = point_rows(study, pts, stored_with_extras(study, pts, store, stored))
    records, records_solved, record_seconds = {}, {}, 0.0
    for stage in per_study() if stop_after is None else ():  # solves that read the points' rows (the ladders)
        if not stage.wanted(study):
            continue
        by_key = {r["point_key"]: r for r in rows}
        n, seconds = stage.solve(study, store, pts, by_key, backend, _part(progress, stage.what))
        records[stage.file] = with_mechanism(study, stage.rows(study, pts, by_key, store))
        records_solved[stage.file], record_seconds = n, record_seconds + seconds
        if n and stage.reread(study):  # a premixer's margins, and its limits, read the new values
            rows = point_rows(study, pts, stored_with_extras(study, pts, store, stored))
    limits, limit_solved = [], [0]
    if study.limits is not None and stop_after is None:  # after per_study: a first run and a rerun agree
        swept = {p.key for p in pts}

        def solve(new_points: list[Point]) -> int:  # warm-started from the sweep's flames only: resumed runs agree
            n = solve_points(study, store, new_points, backend, _relabelled(progress, "limit flames"),
                             sources=swept).solved
            limit_solved[0] += n
            return n
        limits = with_mechanism(study, find_limits(study, rows, store, solve, _limits_part(progress)))
    return {"rows": rows, "solved": done.solved, "reused": done.reused, "limits": limits,
            "limit_flames": limit_solved[0], "records": records, "records_solved": records_solved,
            "solve_seconds": done.solve_seconds + record_seconds + extra_seconds}


def run_study(study: Study, out_dir: str | os.PathLike | None = None, jobs: int | None = None,
              progress: Callable[[Progress], None] | None = None, cluster: str | None = None) -> RunSummary:
    """Solve and store every missing point of ``study``; return the rows. Writes no output files.

    Kept for one release: use :func:`run`, which also writes results.csv, results.nc,
    the charts and the report, and returns :class:`Results`.
    """
    return solve_study(study, out_dir, jobs, progress, cluster)


def run(study_or_path: Study | str | os.PathLike, out: str | os.PathLike | None = None, jobs: int | None = None,
        cluster: str | None = None, progress: Callable[[Progress], None] | None = None,
        charts: bool = True, report: bool = True) -> Results:
    """Solve every point of a study the store lacks, store each flame, write every output file.

    Parameters
    ----------
    study_or_path : a :class:`Study` or the path of a study config (TOML)
    out : output folder; default ``output/<config name>/`` in the current folder (give it
        explicitly from a notebook, or the run goes where the notebook runs)
    jobs : local worker processes; None or 0 = all cores, negative = all but |jobs|-1
    cluster : 'tcp://HOST:PORT' of a Dask scheduler or 'local:N'; default the study's
        ``cluster`` key, else local processes
    progress : called with one :class:`~flamecharts.sweep.run.Progress` event after every finished
        flame, extra solve (a Zeldovich pair, the sensitivities of a point, a strained-flame
        ladder) and round of limit flames; ``what`` says which, and every event carries its
        elapsed time and time left
    charts, report : draw the charts, write report.html (the report needs the charts)

    Returns
    -------
    Results: ``.dataset`` (xarray), ``.to_dataframe()`` (pandas), ``.summary``, ``.files``.
    The command ``flamecharts run`` calls exactly this.
    """
    study = study_or_path if isinstance(study_or_path, Study) else load_study(study_or_path)
    summary = solve_study(study, out, jobs, progress, cluster)
    study = summary.study or study  # under [reduction], the study with the skeletal mechanism its flames burn
    ds = to_dataset(study, summary.rows)  # made once: results.nc, charts, report and Results share it
    from .outputs import write_outputs  # here: `check` loads this module and must not load matplotlib

    files = write_outputs(study, summary.rows, summary.out_dir, charts=charts, report=report, dataset=ds,
                          limits=summary.limits, records=summary.records)
    return Results(study=study, rows=summary.rows, out_dir=summary.out_dir, files=files, summary=summary, table=ds,
                   limits=summary.limits, records=summary.records)


def read_limits(study: Study, rows: list[dict], out_dir: str | os.PathLike) -> list[dict]:
    """The study's limits from the flames stored in ``out_dir`` alone (nothing is solved; a
    search whose flame is missing says so in its row), each mechanism's in turn. [] when the
    study asks for none."""
    if study.limits is None:
        return []
    with Store(Path(out_dir) / DB_NAME, readonly=True) as store:
        return [r for sub in by_mechanism(study)
                for r in with_mechanism(sub, find_limits(sub, rows_of(sub, rows), store, solve=None))]


def read_records(study: Study, rows: list[dict], out_dir: str | os.PathLike) -> dict[str, list[dict]]:
    """The analyses' record tables (file -> rows; sweep.analyses.per_study) from the store in
    ``out_dir`` alone, each mechanism's in turn (nothing is solved; a ladder not solved yet is
    'pending'). {} when the study asks for none."""
    wanted = [stage for stage in per_study() if stage.wanted(study)]
    if not wanted:
        return {}
    by_key = {r["point_key"]: r for r in rows}
    with Store(Path(out_dir) / DB_NAME, readonly=True) as store:
        return {stage.file: [r for sub in by_mechanism(study)
                             for r in with_mechanism(sub, stage.rows(sub, points(sub), by_key, store))]
                for stage in wanted}


def open_results(out_dir: str | os.PathLike) -> Results:
    """The results of a finished run folder, read from its store and study copy alone (nothing is solved)."""
    study, rows = rows_from_dir(Path(out_dir))
    return Results(study=study, rows=rows, out_dir=Path(out_dir), limits=read_limits(study, rows, out_dir),
                   records=read_records(study, rows, out_dir))
