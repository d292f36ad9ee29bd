"""flamecharts: laminar flame speed and thickness design charts from detailed chemistry.

Public entry points
-------------------
load_study(path)        read and validate a study config (TOML) into a :class:`Study`
run_study(study, ...)   solve every missing point, store it, return the rows
FlamechartsError        base class of every error a user can act on
"""
__version__ = "0.1.0"

from .errors import FlamechartsError, ConfigError, MechanismError, StoreError  # noqa: E402
from .study import Study, load_study  # noqa: E402
from .runner import run_study, RunSummary, RunInterrupted  # noqa: E402

__all__ = [
    "__version__", "FlamechartsError", "ConfigError", "MechanismError", "StoreError",
    "Study", "load_study", "run_study", "RunSummary", "RunInterrupted",
]
