"""[stretch]'s worker task: one strained-flame ladder of a point whose free flame burns.

Run in a worker (this process, loky, Dask) from a plain task dict, like sweep.worker's; returns a
plain result dict in the store's form. solve.py makes the tasks and stores their results.
"""
from __future__ import annotations

import time

from ...chemistry.mechanism import solution
from ...chemistry.strained import markstein_number_from_strain, twin_flame_ladder

#: The package files (relative to flamecharts/) this task's answer depends on besides this one:
#: part of the worker's code fingerprint (sweep.worker.code_fingerprint).
CODE = ("chemistry/strained.py",)


def stretch_task(task: dict) -> dict:
    """One strained-flame ladder (chemistry.strained.twin_flame_ladder) from a plain task dict;
    a plain result dict in the store's form (runs in a worker, like sweep.worker.solve_task)."""
    cpu0, t0 = time.process_time(), time.perf_counter()
    gas = solution(task["mechanism_path"], task["transport"], task["mechanism_sha256"])
    try:
        ladder = twin_flame_ladder(gas, task["T_u"], task["P"], task["X"], task["S_L"], task["T_ad"],
                                   task.get("time_limit_s"))
    except Exception as exc:  # noqa: BLE001 - a ladder that breaks is recorded with its reason
        ladder, message = None, f"not converged: {type(exc).__name__}: {str(exc).splitlines()[0] if str(exc) else ''}"
    burning = bool(ladder and ladder["strain_rates_1_s"])
    if ladder is not None and burning:
        ladder["markstein_number_strain"] = markstein_number_from_strain(
            ladder["strain_rates_1_s"], ladder["consumption_speeds_m_s"], task["S_L"],
            ladder["unburned_thermal_diffusivity_m2_s"])
        message = "; ".join(m for m in (ladder["message"], "extinguished" if ladder["extinction_strain_rate_1_s"] else "")
                            if m)
    elif ladder is not None:
        message = f"not converged: {ladder['message']}"
    return {"key": task["key"], "status": "ok" if burning else "failed",
            "reason": "" if burning else "not converged", "message": message, "start": "fresh",
            "metrics": ladder if burning else None, "profile_blob": None,
            "solve_seconds": time.perf_counter() - t0, "cpu_seconds": time.process_time() - cpu0}
