"""A Study -> its points, each with a key for the store.

A point's key is a hash of everything that changes its answer: mechanism file
content, Cantera version, transport model, thermal diffusion, numerical settings,
the blended fuel and the oxidizer compositions, equivalence ratio, pressure and
unburned temperature. Names given in the config are not part of the key, so a
renamed fuel with the same composition reuses stored flames.

Which neighbour each point warm-starts from is planned in warm_tree.py.
"""
from __future__ import annotations

import hashlib
import json
from dataclasses import dataclass, field
from itertools import product

from ..chemistry.flame import NUMERICS
from ..chemistry.mechanism import cantera_version
from ..config import Study, flame_stream, fuel_stream
from ..physics import mixtures

#: Bump when the measurements taken from a converged flame change meaning.
MEASURE_VERSION = 1


def _num(x: float) -> str:
    return f"{x:.12g}"


def _comp(X: dict[str, float]) -> dict[str, str]:
    return {k: _num(v) for k, v in sorted(X.items())}


@dataclass(frozen=True)
class Point:
    """One operating point of a study, with everything a worker needs to solve it."""

    index: int
    fuel: str
    oxidizer: str
    blend_with: str | None
    blend_fraction: float
    phi: float
    pressure_bar: float
    T_u: float
    X_fuel: dict = field(compare=False, repr=False)       # the fuel stream as the study gives it (gas analysis)
    X_oxidizer: dict = field(compare=False, repr=False)
    X_unburned: dict = field(compare=False, repr=False)
    key: str = ""
    family: str = ""
    inputs: dict = field(default_factory=dict, compare=False, repr=False)  # what the key hashes
    X_flame: dict = field(default_factory=dict, compare=False, repr=False)  # the fuel stream the flame burns

    @property
    def P(self) -> float:
        """Pressure [Pa]."""
        return self.pressure_bar * 1e5



def settings_of(study: Study) -> dict:
    """Everything study-wide that changes a flame's answer."""
    return {
        "mechanism_sha256": study.mechanism_sha256,
        "cantera": cantera_version(),
        "transport": study.transport,
        "thermal_diffusion": study.thermal_diffusion,
        "numerics": NUMERICS[study.resolution].as_dict(),
        "measure_version": MEASURE_VERSION,
    }


def _hash(obj) -> str:
    return hashlib.sha256(json.dumps(obj, sort_keys=True).encode()).hexdigest()[:32]


def point_inputs(settings: dict, X_fuel: dict, X_ox: dict, phi: float, P_bar: float, T_u: float) -> dict:
    return {**settings, "fuel": _comp(X_fuel), "oxidizer": _comp(X_ox), "phi": _num(phi),
            "pressure_bar": _num(P_bar), "T_u": _num(T_u)}


def points(study: Study) -> list[Point]:
    """Cartesian product of the sweep axes, in a stable order."""
    settings = settings_of(study)
    out = []
    for fuel, ox, frac, P_bar, T_u, phi in product(
            study.sweep_fuels, study.sweep_oxidizers, study.blend_fractions,
            study.pressures_bar, study.unburned_temperatures_K, study.equivalence_ratios):
        X_fuel = fuel_stream(study, fuel, frac)
        X_flame, _ = flame_stream(study, X_fuel)  # lumped onto the mechanism's species where it lacks some
        X_ox = study.oxidizers[ox]
        o2 = mixtures.stoich_o2_per_fuel(study.atoms, X_flame)
        inputs = point_inputs(settings, X_flame, X_ox, phi, P_bar, T_u)
        fam = {k: v for k, v in inputs.items() if k not in ("phi", "pressure_bar", "T_u", "fuel")}
        out.append(Point(
            index=len(out), fuel=fuel, oxidizer=ox, blend_with=study.blend_with,
            blend_fraction=frac, phi=phi, pressure_bar=P_bar, T_u=T_u, X_fuel=X_fuel,
            X_oxidizer=dict(X_ox), X_unburned=mixtures.unburned_mixture(X_flame, X_ox, phi, o2),
            key=_hash(inputs), family=_hash(fam), inputs=inputs, X_flame=X_flame))
    return out
