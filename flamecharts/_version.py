"""The package version (its own module, so every layer can name it without importing the package),
and the installed Cantera's, read from the package metadata without importing Cantera."""
from __future__ import annotations

from importlib.metadata import PackageNotFoundError, version

__version__ = "0.1.0"


def installed_cantera_version() -> str:
    """The installed Cantera's version, as its package metadata gives it ('' when it is not installed)."""
    try:
        return version("cantera")
    except PackageNotFoundError:
        return ""
