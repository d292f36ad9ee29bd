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
from dataclasses import dataclass, field, replace
from itertools import product

from .._version import installed_cantera_version
from ..config import Study, flame_stream, fuel_stream
from ..numerics import NUMERICS
from ..physics import mixtures

#: Bump when the measurements taken from a converged flame change meaning.
MEASURE_VERSION = 2  # 2: the grid error estimate of every flame (chemistry.flame.grid_error)


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
    """Everything study-wide that changes a flame's answer (extra flames of a point, such as
    the Zeldovich pair, are stored under keys of their own: sweep.extras)."""
    return {
        "mechanism_sha256": study.mechanism_sha256,
        "cantera": installed_cantera_version(),
        "transport": study.transport,
        "thermal_diffusion": study.thermal_diffusion,
        "numerics": NUMERICS[study.resolution].as_dict(),
        "measure_version": MEASURE_VERSION,
    }


def _hash(obj) -> str:
    return hashlib.sha256(json.dumps(obj, sort_keys=True).encode()).hexdigest()[:32]


def point_inputs(settings: dict, X_fuel: dict, X_ox: dict, phi: float, P_bar: float, T_u: float) -> dict:
    return _inputs(settings, _comp(X_fuel), _comp(X_ox), phi, P_bar, T_u)


def _inputs(settings: dict, fuel: dict, oxidizer: dict, phi: float, P_bar: float, T_u: float) -> dict:
    """:func:`point_inputs` from compositions already written as text (:func:`_comp`)."""
    return {**settings, "fuel": dict(fuel), "oxidizer": dict(oxidizer), "phi": _num(phi),
            "pressure_bar": _num(P_bar), "T_u": _num(T_u)}


#: The inputs of a point that vary within one fuel stream and oxidizer.
PER_POINT = ("phi", "pressure_bar", "T_u")


def key_template(inputs: dict) -> str | None:
    """The text :func:`_hash` hashes for ``inputs``, with a slot for each PER_POINT value
    (None if a slot's mark occurs elsewhere in the text): :func:`fill_key` then makes a
    point's key without encoding the whole table again.

    >>> t = key_template({"fuel": {"H2": "1"}, "phi": "0.8", "pressure_bar": "1", "T_u": "300"})
    >>> fill_key(t, {"phi": "0.8", "pressure_bar": "1", "T_u": "300"}) == _hash(
    ...     {"fuel": {"H2": "1"}, "phi": "0.8", "pressure_bar": "1", "T_u": "300"})
    True
    """
    slots = {k: f"@@{k}@@" for k in PER_POINT}
    text = json.dumps({**inputs, **slots}, sort_keys=True)
    return text if all(text.count(json.dumps(v)) == 1 for v in slots.values()) else None


def fill_key(template: str, inputs: dict) -> str:
    """The key of ``inputs`` from its :func:`key_template`: the same as ``_hash(inputs)``."""
    for k in PER_POINT:
        template = template.replace(f'"@@{k}@@"', json.dumps(inputs[k]), 1)
    return hashlib.sha256(template.encode()).hexdigest()[:32]


def points(study: Study) -> list[Point]:
    """Cartesian product of the sweep axes, in a stable order.

    The fuel stream, its family, its mixtures and the text of its keys are made once per
    fuel, oxidizer and blend fraction (and equivalence ratio), not once per point
    (timings at 100,000 points in docs/benchmarks.md).
    """
    settings = settings_of(study)
    out: list[Point] = []
    for fuel, ox, frac in product(study.sweep_fuels, study.sweep_oxidizers, study.blend_fractions):
        X_fuel = fuel_stream(study, fuel, frac)
        X_flame, _ = flame_stream(study, X_fuel)  # lumped onto the mechanism's species where it lacks some
        X_ox = study.oxidizers[ox]
        o2 = mixtures.stoich_o2_per_fuel(study.atoms, X_flame)
        unburned = {phi: mixtures.unburned_mixture(X_flame, X_ox, phi, o2) for phi in study.equivalence_ratios}
        family = template = None
        comp_fuel, comp_ox = _comp(X_flame), _comp(X_ox)
        for P_bar, T_u, phi in product(study.pressures_bar, study.unburned_temperatures_K, study.equivalence_ratios):
            inputs = _inputs(settings, comp_fuel, comp_ox, phi, P_bar, T_u)
            if family is None:
                family = _hash({k: v for k, v in inputs.items() if k not in PER_POINT + ("fuel",)})
                template = key_template(inputs)
            key = _hash(inputs) if template is None else fill_key(template, inputs)
            out.append(Point(
                index=len(out), fuel=fuel, oxidizer=ox, blend_with=study.blend_with,
                blend_fraction=frac, phi=phi, pressure_bar=P_bar, T_u=T_u, X_fuel=dict(X_fuel),
                X_oxidizer=dict(X_ox), X_unburned=dict(unburned[phi]),
                key=key, family=family, inputs=inputs, X_flame=dict(X_flame)))
    return out


def condition_key(p: Point) -> str:
    """The point's mixture and state alone (fuel stream, oxidizer, phi, p, T_u; no mechanism, no
    settings, no names): the same under the detailed and a skeletal mechanism, so a [reduction]'s
    validation flame is found among the study's points (sweep.skeletal)."""
    return _hash({k: p.inputs[k] for k in ("fuel", "oxidizer", "phi", "pressure_bar", "T_u")})


def point_at_phi(study: Study, p: Point, phi: float, index: int = 0) -> Point:
    """The point of ``p``'s gas, oxidizer, pressure and preheat at another equivalence ratio
    (its key is the one a swept point of that mixture would have)."""
    sub = replace(study, sweep_fuels=(p.fuel,), sweep_oxidizers=(p.oxidizer,), blend_fractions=(p.blend_fraction,),
                  equivalence_ratios=(phi,), pressures_bar=(p.pressure_bar,), unburned_temperatures_K=(p.T_u,))
    return replace(points(sub)[0], index=index)
