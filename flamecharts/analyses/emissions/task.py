"""[emissions]' worker tasks: a stored flame's burned-gas history, a blend's phi at equal flame temperature.

Run in a worker (this process, loky, Dask) from plain task dicts, like sweep.worker's; each returns
a plain result dict in the store's form. solve.py makes the tasks and stores their results.
"""
from __future__ import annotations

from ...chemistry.emissions import burned_gas_history, equilibrium_temperature_K, phi_at_flame_temperature
from ...chemistry.mechanism import solution
from ...physics.mixtures import unburned_mixture
from ...sweep.worker import extra_result, plain_json

#: The package files (relative to flamecharts/) these tasks' answers depend on besides this one:
#: part of the worker's code fingerprint (sweep.worker.code_fingerprint).
CODE = ("chemistry/emissions.py", "physics/emissions.py")


def emissions_task(task: dict) -> dict:
    """The burned gas of a stored flame after the study's residence times
    (chemistry.emissions.burned_gas_history, from the peak heat release), as plain lists; a
    plain result dict in the store's form (runs in a worker)."""
    gas = solution(task["mechanism_path"], None, task["mechanism_sha256"])
    return extra_result(task, "warm", lambda: ({k: plain_json(v) for k, v in
                                          burned_gas_history(task["profile"], gas, task["times_s"]).items()}, ""))


def equal_tad_task(task: dict) -> dict:
    """The equivalence ratio at which a blend's adiabatic flame temperature equals its unblended
    reference's (chemistry.emissions.phi_at_flame_temperature); a plain result dict in the
    store's form, phi None where the blend never reaches it on that branch."""
    gas = solution(task["mechanism_path"], None, task["mechanism_sha256"])

    def match() -> tuple[dict, str]:
        target = equilibrium_temperature_K(gas, task["X_reference"], task["T_u"], task["P"])
        phi = phi_at_flame_temperature(
            gas, lambda f: unburned_mixture(task["X_fuel"], task["X_oxidizer"], f, task["o2_per_fuel"]),
            task["T_u"], task["P"], target, task["lean"])
        return {"phi": phi, "target_T_K": target}, ("" if phi is not None else
                                                    f"the blend does not reach {target:.0f} K on this side of "
                                                    "stoichiometric")
    return extra_result(task, "fresh", match)
