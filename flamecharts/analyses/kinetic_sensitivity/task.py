"""[uncertainty]'s worker task: the flame-speed sensitivities of a stored flame.

Runs in a worker (this process, loky, Dask) from a plain task dict, like sweep.worker's, and returns
a plain result dict in the store's form; solve.py makes the tasks and stores their results.
"""
from __future__ import annotations

from ...chemistry.flame import NUMERICS
from ...chemistry.mechanism import solution
from ...chemistry.sensitivity import flame_speed_sensitivities
from ...sweep.worker import extra_result

#: The package files (relative to flamecharts/) the task's answer depends on besides this one:
#: part of the worker's code fingerprint (sweep.worker.code_fingerprint).
CODE = ("chemistry/sensitivity.py",)


def sensitivity_task(task: dict) -> dict:
    """Flame-speed sensitivities to every rate constant of a stored flame (chemistry.sensitivity,
    adjoint; dimensionless, d ln S_L / d ln k); a plain result dict in the store's form (runs in a
    worker)."""
    gas = solution(task["mechanism_path"], task["transport"], task["mechanism_sha256"])
    return extra_result(task, "warm", lambda: (flame_speed_sensitivities(
        gas, task["T_u"], task["P"], task["X"], task["transport"], task["thermal_diffusion"], task["warm"],
        NUMERICS[task["resolution"]]), ""))
