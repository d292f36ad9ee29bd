"""Text outputs of a run folder: results.csv (and other tables), about.txt; files replaced whole.

write_atomic   a text file a reader never sees half of
write_csv      a table of rows with given columns (results.csv's by default: columns.COLUMNS)
write_columns  a table of columns (results.csv, from the Dataset: results.dataset_table)
write_about    about.txt: what produced the results, with the cautions
"""
from __future__ import annotations

import csv
import io
import os
import tempfile
import time
from collections.abc import Sequence
from pathlib import Path

from .._version import __version__, installed_cantera_version
from ..columns import CAUTION, COLUMNS
from ..config import Study, Uncertainty, lumping_note, reduction_note, resolution_label
from ..numerics import NUMERICS


def write_atomic(path: Path, text: str) -> None:
    """Write a text file so a reader never sees half of it."""
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=path.name + ".")
    umask = os.umask(0)
    os.umask(umask)
    os.chmod(tmp, 0o666 & ~umask)  # like any file the user writes, not mkstemp's 0600
    try:
        with os.fdopen(fd, "w", newline="") as fh:
            fh.write(text)
        os.replace(tmp, path)
    except BaseException:
        os.unlink(tmp)
        raise


def _fmt(v) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, float):
        return f"{v:.6g}"
    if isinstance(v, (list, tuple)):  # a ladder's steps (stretch.csv): space-separated
        return " ".join(f"{x:.6g}" for x in v)
    return str(v)


def write_csv(rows: list[dict], path: Path, columns: Sequence[str] = COLUMNS) -> Path:
    """A CSV of ``rows`` with ``columns`` (results.csv by default: one row per point)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(columns)
    for r in rows:
        w.writerow([_fmt(r.get(c)) for c in columns])
    write_atomic(Path(path), buf.getvalue())
    return Path(path)


def write_columns(table: dict[str, list], path: Path) -> Path:
    """A CSV of a table of columns (column -> one value per row, all of one length), in its
    columns' order: results.csv from the Dataset (results.dataset_table)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(list(table))
    for values in zip(*table.values()):
        w.writerow([_fmt(v) for v in values])
    write_atomic(Path(path), buf.getvalue())
    return Path(path)


def uncertainty_settings(u: Uncertainty) -> str:
    """The [uncertainty] table as the run used it, in one line (the study's own factors named)."""
    own = "; ".join(f"{eq} f = {f:g}" for eq, f in u.factors)
    return (f"kinetic band {'on' if u.kinetics else 'off'}; a factor's bound read as {u.factor_sigmas:g} sigma; "
            f"factor {u.default_factor:g} for reactions without one; numerical error bars drawn "
            f"{'yes' if u.error_bars else 'no'}; the study's own factors: {own or 'none'}")


def _mechanism_line(study: Study) -> str:
    """'Mechanism: NAME (file, sha256 ...)'; under [reduction] the skeletal file and the detailed one."""
    r = study.reduced
    if r is not None and r.reduced:
        return (f"Mechanism: {study.mechanism}, reduced to {study.mechanism_path} (sha256 {study.mechanism_sha256}) "
                f"from {r.detailed_path} (sha256 {r.detailed_sha256})")
    return f"Mechanism: {study.mechanism} ({study.mechanism_path}, sha256 {study.mechanism_sha256})"


def write_about(study: Study, path: Path) -> Path:
    """about.txt beside the CSV: what produced it, with the cautions."""
    n = NUMERICS[study.resolution]
    lines = [
        f"Study: {study.title}",
        f"Config: {study.config_path or '(from Python)'}",
        *([_mechanism_line(study)] if not study.mechanisms else
          [f"Mechanisms compared ({len(study.mechanisms)}; the first is the reference of the design charts):"]
          + [f"  {m.name} ({m.path}, sha256 {m.sha256})" for m in study.mechanisms]),
        f"Transport: {study.transport}; thermal diffusion: {'on' if study.thermal_diffusion else 'off'}",
        *([f"Uncertainty: {uncertainty_settings(study.uncertainty)}"] if study.uncertainty else []),
        f"Resolution: {resolution_label(study)}; refinement stages (ratio, slope, curve): {list(n.stages)}",
        f"flamecharts {__version__}, Cantera {installed_cantera_version()}; written {time.strftime('%Y-%m-%d %H:%M:%S %Z')}",
        "",
        *([note, ""] if (note := lumping_note(study)) else []),
        *([reduction_note(study), ""] if study.reduced is not None else []),
        "CAUTION: " + CAUTION,
        "",
    ]
    write_atomic(Path(path), "\n".join(lines))
    return Path(path)
