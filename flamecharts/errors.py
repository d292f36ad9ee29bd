"""One family of errors a user can act on.

Every exception raised for bad input, a missing mechanism or an unusable store
derives from :class:`FlamechartsError`. The command line catches this family in
one place, prints its message as one line and exits with code 2. Anything else
is a bug and keeps its traceback.
"""


class FlamechartsError(Exception):
    """An error the user can fix: the message names the key or value and what is allowed."""


class ConfigError(FlamechartsError):
    """The study config cannot be read or does not describe a valid study."""


class MechanismError(FlamechartsError):
    """The reaction mechanism cannot be found or loaded, or lacks a species the study needs."""


class StoreError(FlamechartsError):
    """The results store cannot be opened, is corrupt, or belongs to another version."""


def first_line(exc: BaseException, limit: int = 300) -> str:
    """The first informative line of an exception's message (Cantera wraps its own in banners)."""
    for line in str(exc).splitlines():
        t = line.strip()
        if t and not set(t) <= set("*-=") and not t.startswith("CanteraError thrown by"):
            return t[:limit]
    return type(exc).__name__
