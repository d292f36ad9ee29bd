"""What became of a point: its status and, when it has no flame speed, why.

Both are ``StrEnum``s, so they compare equal to, and are stored and printed as, their
plain text ("ok", "not converged"): results.csv and the store hold the text.
"""
from __future__ import annotations

from enum import StrEnum

from .errors import first_line


class Status(StrEnum):
    OK = "ok"                # a burning flame was solved and measured
    NO_FLAME = "no_flame"    # the mixture does not burn (too lean, too diluted, cold branch)
    FAILED = "failed"        # no solution: see the Reason
    AUTOIGNITION = "autoignition"  # the fresh mixture ignites before a flame can cross it: no flame speed
    PENDING = "pending"      # not solved yet


class Reason(StrEnum):
    NONE = ""                           # a burning flame
    NO_FLAME = "no flame"               # status no_flame
    NOT_CONVERGED = "not converged"     # warm, fresh and robust solves found no solution
    MECHANISM_ERROR = "mechanism error" # non-finite rates or thermodynamics, or Cantera failed outside the solver
    WORKER_ERROR = "worker error"       # the worker process died on the point: solved again by the next run
    TIME_LIMIT = "time limit"           # the flame took longer than the run's per-flame time limit
    AUTOIGNITION = "autoignition"       # status autoignition (decided at read-out from the stored screen)


#: Failures the next run solves again (the point's answer was never reached, not refused).
RETRIED_REASONS = (Reason.WORKER_ERROR, Reason.TIME_LIMIT)


def worker_error(exc: BaseException) -> dict:
    """The failed result of a task whose worker died or raised (the next run solves it again)."""
    return {"status": Status.FAILED, "reason": Reason.WORKER_ERROR, "start": "fresh", "metrics": None, "profile": None,
            "message": f"{Reason.WORKER_ERROR}: {type(exc).__name__}: {first_line(exc)}", "solve_seconds": 0.0}
