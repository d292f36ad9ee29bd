"""[premixer]'s worker task: the ignition delays of a point's fresh mixture and of those near the injection.

Runs in a worker (this process, loky, Dask) from a plain task dict, like sweep.worker's, and returns
a plain result dict in the store's form; solve.py makes the tasks and stores their results.
"""
from __future__ import annotations

from ...chemistry.ignition import ignition_delay_peak
from ...chemistry.mechanism import mixture_key
from ...sweep.worker import extra_result

#: The package files (relative to flamecharts/) the task's answer depends on besides this one:
#: part of the worker's code fingerprint (sweep.worker.code_fingerprint).
CODE = ("chemistry/ignition.py",)


def premixer_task(task: dict) -> dict:
    """Ignition delays of [premixer] (chemistry.ignition.ignition_delay_peak, constant pressure,
    over ``horizon_s`` [s]): the fresh mixture's and those of the ``injection`` mixtures (one per
    physics.autoignition.INJECTION_PHIS), in s (inf where none ignites within the horizon); a plain
    result dict in the store's form (runs in a worker)."""
    def delay(X: dict) -> float:
        return ignition_delay_peak(task["mechanism_path"], mixture_key(X), float(task["T_u"]), float(task["P"]),
                                   float(task["horizon_s"]))
    return extra_result(task, "fresh", lambda: ({"premixer_ignition_delay_s": delay(task["X"]),
                                           "premixer_horizon_s": task["horizon_s"],
                                           "injection_ignition_delays_s": [delay(X) for X in task["injection"]]}, ""))
