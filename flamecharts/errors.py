"""One family of errors a user can act on.

Every exception raised for bad input, a missing mechanism or an unusable store
derives from :class:`FlamechartsError`. The command line catches this family in
one place, prints its message as one line and exits with code 2. Anything else
is a bug and keeps its traceback.

A message is always one printable line: control characters that came in with
user data (a key or species name holding a newline, say) are shown escaped, and
an overlong message (a huge value quoted in it) is shortened in the middle.
"""
from __future__ import annotations

import reprlib

#: Longest message, in characters; longer ones keep their start and end.
MAX_MESSAGE_CHARS = 1200


def one_line(text: str, limit: int = MAX_MESSAGE_CHARS) -> str:
    """``text`` as one printable line: non-printable characters escaped, long text cut in the middle.

    >>> one_line("unknown key 'a\\nb'")
    "unknown key 'a\\\\nb'"
    """
    text = "".join(ch if ch.isprintable() else ch.encode("unicode_escape").decode("ascii") for ch in text)
    if len(text) > limit:
        half = (limit - 5) // 2
        text = text[:half] + " ... " + text[-half:]
    return text


_SHOW = reprlib.Repr()
_SHOW.maxlevel = 3
_SHOW.maxstring = 60
_SHOW.maxother = 60
_SHOW.maxlist = _SHOW.maxtuple = _SHOW.maxdict = _SHOW.maxset = 6
_SHOW.maxlong = 40


def show(value: object) -> str:
    """A short repr of a user-given value for an error message (depth and length bounded)."""
    try:
        return _SHOW.repr(value)
    except Exception:  # noqa: BLE001 - a value whose repr fails still gets named by its type
        return f"<{type(value).__name__}>"


class FlamechartsError(Exception):
    """An error the user can fix: the message names the key or value and what is allowed."""

    def __str__(self) -> str:
        return one_line(super().__str__())


class ConfigError(FlamechartsError):
    """The study config cannot be read or does not describe a valid study."""


class MixtureError(ConfigError, ValueError):
    """A composition, blend fraction or equivalence ratio that describes no real mixture.

    Also a ValueError, so callers that guard the pure mixture functions with
    ``except ValueError`` keep working.
    """


class MechanismError(FlamechartsError):
    """The reaction mechanism cannot be found or loaded, or lacks a species the study needs."""

    #: Set (with ``where``) only on the error of a species a mechanism lacks (config._missing).
    species: str
    where: str


class StoreError(FlamechartsError):
    """The results store cannot be opened, is corrupt, or belongs to another version."""


def first_line(exc: BaseException, limit: int = 300) -> str:
    """The first informative line of an exception's message (Cantera wraps its own in banners)."""
    for line in str(exc).splitlines():
        t = line.strip()
        if t and not set(t) <= set("*-=") and not t.startswith("CanteraError thrown by"):
            return t[:limit]
    return type(exc).__name__
