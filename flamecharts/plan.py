"""A Study -> its points (each with a key for the store) -> chains of warm-starting neighbours.

A point's key is a hash of everything that changes its answer: mechanism file
content, Cantera version, transport model, thermal diffusion, numerical settings,
the blended fuel and the oxidizer compositions, equivalence ratio, pressure and
unburned temperature. Names given in the config are not part of the key, so a
renamed fuel with the same composition reuses stored flames.

Chains: points that differ only in equivalence ratio form a group. Each group is
seeded at the equivalence ratio nearest SEED_PHI (hot, fast flames converge most
reliably from scratch) and runs outward from there in two chains, leaner and
richer, each flame warm-starting the next.
"""
from __future__ import annotations

import hashlib
import json
from dataclasses import dataclass, field
from itertools import product

import cantera

from . import mixtures
from .flame import NUMERICS
from .study import Study

#: Bump when the measurements taken from a converged flame change meaning.
MEASURE_VERSION = 1

#: Groups start at the equivalence ratio nearest this value.
SEED_PHI = 1.05


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
    X_fuel: dict = field(compare=False, repr=False)
    X_oxidizer: dict = field(compare=False, repr=False)
    X_unburned: dict = field(compare=False, repr=False)
    key: str = ""
    family: str = ""
    inputs: dict = field(default_factory=dict, compare=False, repr=False)  # what the key hashes

    @property
    def P(self) -> float:
        """Pressure [Pa]."""
        return self.pressure_bar * 1e5

    @property
    def group(self) -> tuple:
        return (self.fuel, self.oxidizer, self.blend_fraction, self.pressure_bar, self.T_u)


def settings_of(study: Study) -> dict:
    """Everything study-wide that changes a flame's answer."""
    return {
        "mechanism_sha256": study.mechanism_sha256,
        "cantera": cantera.__version__,
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
        X_fuel = (mixtures.blend(study.fuels[fuel], study.fuels[study.blend_with], frac)
                  if study.blend_with else dict(study.fuels[fuel]))
        X_ox = study.oxidizers[ox]
        o2 = mixtures.stoich_o2_per_fuel(study.atoms, X_fuel)
        inputs = point_inputs(settings, X_fuel, X_ox, phi, P_bar, T_u)
        fam = {k: v for k, v in inputs.items() if k not in ("phi", "pressure_bar", "T_u", "fuel")}
        out.append(Point(
            index=len(out), fuel=fuel, oxidizer=ox, blend_with=study.blend_with,
            blend_fraction=frac, phi=phi, pressure_bar=P_bar, T_u=T_u, X_fuel=X_fuel,
            X_oxidizer=dict(X_ox), X_unburned=mixtures.unburned_mixture(X_fuel, X_ox, phi, o2),
            key=_hash(inputs), family=_hash(fam), inputs=inputs))
    return out


@dataclass
class Chain:
    """Points solved in order, each warm-starting from the one before.

    after : index of the point whose result seeds the first point of this chain
        (None: the first point starts from a stored neighbour or from scratch).
    """

    points: list[Point]
    after: int | None = None


def chains(pts: list[Point]) -> list[Chain]:
    """Group points by everything but equivalence ratio; split each group at its seed."""
    groups: dict[tuple, list[Point]] = {}
    for p in pts:
        groups.setdefault(p.group, []).append(p)
    out: list[Chain] = []
    for members in groups.values():
        members = sorted(members, key=lambda p: p.phi)
        seed = min(range(len(members)), key=lambda i: (abs(members[i].phi - SEED_PHI), members[i].phi))
        out.append(Chain(members[seed:]))
        if seed > 0:
            out.append(Chain(members[:seed][::-1], after=members[seed].index))
    return out


def predecessors(chain_list: list[Chain]) -> dict[int, int | None]:
    """Point index -> index of the point it warm-starts from (None for chain seeds)."""
    pred: dict[int, int | None] = {}
    for c in chain_list:
        prev = c.after
        for p in c.points:
            pred[p.index] = prev
            prev = p.index
    return pred
