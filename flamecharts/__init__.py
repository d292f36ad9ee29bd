"""flamecharts: laminar flame speed and thickness design charts from detailed chemistry.

Public entry points
-------------------
load_study(path)        read and validate a study config (TOML) into a :class:`Study`
run_study(study, ...)   solve every missing point, store it, return the rows (no output files)
FlamechartsError        base class of every error a user can act on
"""
from ._version import __version__
from .config import Study, load_study
from .errors import ConfigError, FlamechartsError, MechanismError, StoreError
from .pipeline import RunSummary, run_study
from .sweep.run import RunInterrupted

__all__ = [
    "__version__", "FlamechartsError", "ConfigError", "MechanismError", "StoreError",
    "Study", "load_study", "run_study", "RunSummary", "RunInterrupted",
]
