"""Command line: the only place that prints, draws progress and picks exit codes.

flamecharts run CONFIG [--out DIR] [--jobs N] [--cluster ADDRESS|local:N]
                                                solve, store, write results.csv and charts
flamecharts check CONFIG [--out DIR]            validate a config and print the plan
flamecharts charts DIR                          redraw results.csv and charts from the store
flamecharts report DIR                          the same, plus DIR/report.html
flamecharts compact DIR                         migrate the store, then shrink the file (VACUUM)

Exit codes: 0 done (also when some flames failed; they are listed), 2 bad input or
unusable store (one line on stderr), 130 interrupted (what finished is kept).
"""
from __future__ import annotations

import argparse
import sys
from importlib import import_module

from .._version import __version__
from ..errors import FlamechartsError

#: command -> (module of this package, function): a command's module is imported when it runs,
#: so ``check`` never loads the chart and table libraries that ``run`` needs.
COMMANDS = {"run": ("run", "cmd_run"), "check": ("check", "cmd_check"), "charts": ("redraw", "cmd_charts"),
            "report": ("redraw", "cmd_report"), "compact": ("compact", "cmd_compact")}


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
    cp = sub.add_parser("compact", help="migrate a run folder's store to the compact profile format and "
                                        "give its free space back (SQLite VACUUM)")
    cp.add_argument("dir", help="output folder of a run")
    return ap


def err(msg: str) -> None:
    print(f"flamecharts: error: {msg}", file=sys.stderr)


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    try:
        module, function = COMMANDS[args.command]
        return getattr(import_module(f".{module}", __package__), function)(args)
    except FlamechartsError as exc:
        err(str(exc))
        return 2
    except KeyboardInterrupt:  # Ctrl-C outside a run's solving (reading the config, drawing charts)
        print("\nInterrupted; nothing half-written is left (files are replaced whole).", file=sys.stderr)
        return 130


if __name__ == "__main__":
    sys.exit(main())
