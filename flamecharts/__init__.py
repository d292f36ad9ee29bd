"""flamecharts: laminar flame speed and thickness design charts from detailed chemistry.

Public entry points
-------------------
run(study_or_path, out=None, jobs=None, cluster=None, progress=None) -> Results
                        solve every missing point, store it, write every output file
open_results(dir)       the Results of a finished run folder, from its store alone
Results                 .dataset (xarray), .to_dataframe() (pandas), .summary, .files
load_study(path)        read and validate a study config (TOML) into a :class:`Study`
run_study(study, ...)   solve and store only, no output files (kept for one release; use run)
FlamechartsError        base class of every error a user can act on
"""
from importlib import import_module
from typing import Any

from ._version import __version__
from .errors import ConfigError, FlamechartsError, MechanismError, StoreError

#: Public names and the module that defines each. They are imported on first use (PEP 562):
#: a worker process that imports flamecharts.sweep.worker, or ``flamecharts check``, then
#: never loads matplotlib, xarray or pandas (about 1.5 s and tens of MB per process).
_LAZY = {"Study": "config", "load_study": "config", "run": "pipeline", "open_results": "pipeline",
         "run_study": "pipeline", "RunSummary": "pipeline", "Results": "results", "RunInterrupted": "sweep.run"}


def __getattr__(name: str) -> Any:
    if name in _LAZY:
        value = getattr(import_module(f".{_LAZY[name]}", __name__), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module 'flamecharts' has no attribute {name!r}")

__all__ = [
    "__version__", "FlamechartsError", "ConfigError", "MechanismError", "StoreError",
    "Study", "load_study", "run", "open_results", "Results", "run_study", "RunSummary", "RunInterrupted",
]
