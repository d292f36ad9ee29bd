"""flamecharts charts DIR / report DIR: redraw the outputs of a finished run from its store."""
from __future__ import annotations

import argparse
from pathlib import Path

from ..config import by_mechanism
from ..outputs import write_outputs
from ..pipeline import read_limits, read_records
from ..results import rows_from_dir


def cmd_charts(args: argparse.Namespace, report: bool = False) -> int:
    study, rows = rows_from_dir(Path(args.dir))
    for sub in by_mechanism(study):  # the folder holds the run's own results, whatever happened to the file since
        if sub.facts is not None and sub.facts.file_changed():
            print(f"Note: {sub.facts.path} has changed since the run; these are the run's results with the mechanism "
                  f"it used (sha256 {sub.facts.sha256[:12]}...); run the study again to solve with the edited file")
    files = write_outputs(study, rows, Path(args.dir), charts=True, report=report,
                          limits=read_limits(study, rows, args.dir), records=read_records(study, rows, args.dir))
    print(f"Wrote {len(files)} files in {args.dir}" + (f"; report: {files[-1]}" if report else ""))
    return 0




def cmd_report(args: argparse.Namespace) -> int:
    return cmd_charts(args, report=True)
