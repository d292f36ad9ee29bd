"""[flame_response]' worker task: the Zeldovich pair of a stored flame.

Runs in a worker (this process, loky, Dask) from a plain task dict, like sweep.worker's, and returns
a plain result dict in the store's form; solve.py makes the tasks and stores their results.
"""
from __future__ import annotations

import time

from ...chemistry.flame import NUMERICS, solve_flame
from ...chemistry.mechanism import solution
from ...chemistry.response import zeldovich_flames

#: The package files (relative to flamecharts/) the task's answer depends on besides this one
#: (sweep.worker.code_fingerprint).
CODE = ("chemistry/response.py", "physics/flame_response.py")


def zeldovich_task(task: dict) -> dict:
    """The Zeldovich pair of a stored flame (chemistry.response.zeldovich_flames), warm-started
    from its profile; a plain result dict in the store's form (runs in a worker)."""
    t0 = time.perf_counter()
    gas = solution(task["mechanism_path"], task["transport"], task["mechanism_sha256"])

    def solve(X: dict, warm: dict | None) -> dict:
        return solve_flame(gas, task["T_u"], task["P"], X, task["transport"], task["thermal_diffusion"],
                           NUMERICS[task["resolution"]], warm, task.get("time_limit_s"))

    base = {"metrics": task["base_metrics"], "profile": task["warm"]}
    m = zeldovich_flames(solve, task["X"], list(gas.species_names), task["T_u"], base, task["zeldovich_step"])
    ok = m["zeldovich_number"] is not None
    return {"key": task["key"], "status": "ok" if ok else "failed", "reason": "" if ok else "not converged",
            "message": m.get("zeldovich_message", ""), "start": "warm", "metrics": m, "profile_blob": None,
            "solve_seconds": time.perf_counter() - t0}
