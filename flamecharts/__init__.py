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
from ._version import __version__
from .config import Study, load_study
from .errors import ConfigError, FlamechartsError, MechanismError, StoreError
from .pipeline import RunSummary, open_results, run, run_study
from .results import Results
from .sweep.run import RunInterrupted

__all__ = [
    "__version__", "FlamechartsError", "ConfigError", "MechanismError", "StoreError",
    "Study", "load_study", "run", "open_results", "Results", "run_study", "RunSummary", "RunInterrupted",
]
