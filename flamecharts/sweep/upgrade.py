"""Stores written before the read side stopped needing the mechanism, brought up to date.

lacks_readout     whether a stored flame lacks what the read-out now takes from the store
upgrade_store     those fields computed for every such flame (none solved again), after a backup;
                  the store then marked, so later runs skip the scan

Since this version every worker stores with each flame what the read-out needs of its
mixture (sweep.worker.mixture_properties, the autoignition screen): ``open_results``, the
charts and the report then run without the mechanism file. A store written before lacks
them for some flames: ``flamecharts run`` and ``flamecharts compact`` compute them once, from
each flame's stored inputs and measurements, in one transaction after a backup copy, like the
schema migrations (store.db). The read side refuses a store that still lacks them, naming
the command that upgrades it.
"""
from __future__ import annotations

from pathlib import Path

from ..errors import StoreError
from ..outcome import Reason
from ..physics import mixtures
from ..store import Store

#: What every stored flame holds for the read-out: all of them burning, the screen the others.
BURNING_FIELDS = ("autoignition_screen_delay_s", "lewis_number_fuel", "lewis_number_oxygen", "unburned_viscosity_Pa_s")
OTHER_FIELDS = ("autoignition_screen_delay_s",)


def lacks_readout(row: dict) -> bool:
    """Whether a stored point's row (store.Store.rows) lacks a field of BURNING_FIELDS (burning)
    or OTHER_FIELDS (failed, no flame); a worker that died left nothing to compute them from.

    >>> lacks_readout({"status": "failed", "reason": "not converged", "metrics": None})
    True
    >>> lacks_readout({"status": "no_flame", "reason": "no flame", "metrics": {"autoignition_screen_delay_s": None}})
    False
    """
    if row.get("reason") == Reason.WORKER_ERROR:
        return False
    need = BURNING_FIELDS if row["status"] == "ok" else OTHER_FIELDS
    metrics = row.get("metrics") or {}
    return any(f not in metrics for f in need)


def _fields(path: str, sha256: str, atoms: dict, row: dict, inputs: dict) -> dict:
    """The read-out fields of one stored flame, from its inputs and measurements."""
    from ..chemistry.ignition import autoignition_screen, autoignition_screen_without_flame
    from .worker import mixture_properties

    fuel = {k: float(v) for k, v in inputs["fuel"].items()}
    ox = {k: float(v) for k, v in inputs["oxidizer"].items()}
    T_u, P = float(inputs["T_u"]), float(inputs["pressure_bar"]) * 1e5
    X = mixtures.unburned_mixture(fuel, ox, float(inputs["phi"]), mixtures.stoich_o2_per_fuel(atoms, fuel))
    m = row.get("metrics") or {}
    if row["status"] != "ok":
        tau = autoignition_screen_without_flame(path, X, T_u, P)
        return {"autoignition_screen_delay_s": tau if tau is not None and tau != float("inf") else None}
    out = {"autoignition_screen_delay_s": autoignition_screen(
        path, X, T_u, P, m.get("laminar_flame_speed_m_s"), m.get("thermal_thickness_m"),
        m.get("adiabatic_flame_temperature_K"))} if "autoignition_screen_delay_s" not in m else {}
    return {**mixture_properties(path, sha256, X, T_u, P), **out}


#: The store's mark that every flame in it has its read-out fields: later runs skip the scan.
READOUT_MARK = "readout_fields_v1"


def upgrade_store(store: Store, mechanisms: dict[str, tuple[str, dict]]) -> tuple[int, str | None]:
    """Compute the read-out fields of every stored flame that lacks them and was solved with one
    of ``mechanisms`` (content hash -> (file path, species atoms)); flames of other mechanisms
    are left as they are. A backup copy is made first. Once no flame lacks them the store is
    marked (READOUT_MARK), so later runs do not read every row again to find out. Extra solves
    (their inputs name the point they belong to, ``<kind>_of``) have no such fields.
    Returns (flames upgraded, backup name)."""
    if store.has_mark(READOUT_MARK):
        return 0, None
    rows, inputs = store.rows(), store.inputs()
    keys = [k for k, r in rows.items() if lacks_readout(r) and not any(n.endswith("_of") for n in inputs[k])]
    todo = [k for k in keys if inputs[k].get("mechanism_sha256") in mechanisms]
    missing = sorted({mechanisms[inputs[k]["mechanism_sha256"]][0] for k in todo
                      if not Path(mechanisms[inputs[k]["mechanism_sha256"]][0]).is_file()})
    if missing:
        raise StoreError(f"results store {store.path} was written by an earlier flamecharts and {len(todo)} of its "
                         f"flames need their mixture properties computed once, from mechanism file {missing[0]}, "
                         "which is not there; put it back and run 'flamecharts compact DIR'")
    copy = store.backup("readout") if todo else None
    new = {}
    for k in todo:
        path, atoms = mechanisms[inputs[k]["mechanism_sha256"]]
        new[k] = {**(rows[k]["metrics"] or {}),
                  **_fields(path, inputs[k]["mechanism_sha256"], atoms, rows[k], inputs[k])}
    store.update_metrics(new, mark=READOUT_MARK if len(todo) == len(keys) else None)
    return len(new), copy.name if copy else None
