"""Mechanism files: find, fingerprint, load (one Solution cache), and what a study needs from them.

The only place besides the flame solver and the ignition reactor that imports
Cantera. Everything here returns plain data or a ``cantera.Solution`` from the one
cache, :func:`solution`.

find_mechanism         a mechanism name -> a file (beside the config, then Cantera's data folders)
check_mechanism        whether Cantera loads a mechanism with the transport data a study needs
solution               the cached ``cantera.Solution`` of a file and transport model
cantera_model          the transport model Cantera loads for one of the study's models
mechanism_text         the mechanism as one YAML text (for cluster workers)
fallback_data          ideal-gas heating data for species outside the ISO 6976 table
mechanism_facts        what the read side needs of a mechanism (facts.MechanismFacts), kept with a run
"""
from __future__ import annotations

import re
import tempfile
from collections.abc import Iterable, Mapping
from functools import lru_cache
from pathlib import Path

import cantera as ct

from ..errors import MechanismError, first_line
from ..facts import MechanismFacts
from ..physics.gasprops import L_WATER, P_ISO
from .emissions import has_nitrogen_chemistry

#: A mechanism that names another file's species, reactions or phases (``other.yaml/species``).
_FILE_REFERENCE = re.compile(r"[\w./\\-]+\.ya?ml/\w+")


def cantera_version() -> str:
    return ct.__version__


def cantera_model(transport: str | None) -> str | None:
    """Transport model Cantera loads for the study's ``transport`` setting.

    Unity Lewis number is a setting of the flame, not a transport model of the
    phase: the phase loads mixture-averaged data and the flame switches.

    >>> cantera_model("unity-Lewis-number")
    'mixture-averaged'
    """
    return "mixture-averaged" if transport == "unity-Lewis-number" else transport


@lru_cache(maxsize=4)
def solution(path: str, transport: str | None = None, sha256: str = "") -> ct.Solution:
    """The cached ``cantera.Solution`` of mechanism ``path`` with the study's transport
    setting (None: no transport data). ``sha256`` of the file keeps a changed file from
    being served from the cache. Callers set the state they need before every use."""
    return ct.Solution(str(path), transport_model=cantera_model(transport))


@lru_cache(maxsize=8)
def reaction_equations(path: str) -> tuple[str, ...]:
    """Reaction equations of the mechanism at ``path``, in its order (the order of Cantera's
    reaction sensitivities, chemistry.sensitivity)."""
    return tuple(solution(path).reaction_equations())


def find_mechanism(mechanism: str, base_dir: Path | None) -> Path:
    """Resolve a mechanism name to a file: beside the config first, then Cantera's data folders."""
    candidates = []
    if not mechanism.strip() or "\0" in mechanism:
        raise MechanismError(f"'mechanism' {mechanism!r} is not a file name; give a Cantera mechanism file, "
                             "e.g. gri30.yaml")
    try:
        p = Path(mechanism).expanduser()
    except RuntimeError:  # ~user that does not exist
        p = Path(mechanism)
    if p.is_absolute():
        candidates.append(p)
    else:
        if base_dir is not None:
            candidates.append(base_dir / p)
        candidates.append(Path.cwd() / p)
        candidates += [Path(d) / p for d in ct.get_data_directories()]
    for c in candidates:
        try:
            if c.is_file():
                return c.resolve()
            is_dir = c.is_dir()
        except OSError:  # a name too long, a folder we may not enter: not this candidate
            continue
        if is_dir:
            raise MechanismError(f"'mechanism' {mechanism!r} is a folder ({c}); give a mechanism file, e.g. gri30.yaml")
    raise MechanismError(
        f"'mechanism' file {mechanism!r} not found beside the config or in Cantera's data folders; "
        "give a path to a Cantera mechanism file (YAML), e.g. gri30.yaml")


def check_mechanism(path: Path, transport: str, sha256: str) -> None:
    """Raise MechanismError unless Cantera loads the mechanism, with the transport data
    ``transport`` needs; both phases stay in the :func:`solution` cache (the facts and an
    in-process run use them)."""
    try:
        solution(str(path), None, sha256)
    except Exception as exc:  # Cantera raises CanteraError or YAML errors
        raise MechanismError(f"'mechanism' {path} cannot be loaded by Cantera ({first_line(exc, 200).rstrip(':')}); "
                             "give a Cantera mechanism file (YAML), e.g. gri30.yaml") from None
    try:
        solution(str(path), transport, sha256)
    except Exception as exc:
        raise MechanismError(f"'mechanism' {path} has no usable {transport} transport data "
                             f"({first_line(exc, 160)}); a flame needs a mechanism with transport data") from None


def mechanism_text(path: str, transport: str) -> str:
    """The mechanism as one YAML text a worker can load without any other file.

    The file's own text when it is self-contained (the usual case, and the exact input
    of a local run); otherwise Cantera's own serialisation of the loaded phase
    (species, reactions, transport data), which inlines what the file pulled from others.
    """
    text = Path(path).read_text(encoding="utf-8")
    if not _FILE_REFERENCE.search(re.sub(r"#.*", "", text)):
        return text
    model = cantera_model(transport)
    try:
        gas = ct.Solution(path, transport_model=model)
        with tempfile.TemporaryDirectory() as tmp:
            out = Path(tmp) / "mechanism.yaml"
            gas.write_yaml(str(out))
            merged = out.read_text(encoding="utf-8")
        ct.Solution(yaml=merged, transport_model=model)
    except Exception as exc:  # noqa: BLE001 - Cantera raises CanteraError or YAML errors
        raise MechanismError(f"'mechanism' {path} refers to other files and cannot be sent to cluster workers "
                             f"as one text ({first_line(exc, 160)}); merge it into one YAML file") from None
    return merged



def fallback_data(gas: ct.Solution, species: Iterable[str], combustion_T_C: int = 15) -> dict:
    """Ideal-gas (M, n_H, superior kJ/mol) from a Cantera mechanism for species outside ISO 6976.

    The inferior value is the enthalpy of complete combustion to CO2, H2O (vapour), N2
    and SO2 at the combustion temperature, from the mechanism's NASA polynomials; the
    superior value adds (n_H/2) L_water (ISO 6976:2016 eq. 4 applied to ideal gases).
    Species whose products are not in the mechanism raise ValueError.
    """
    T = 273.15 + combustion_T_C
    out: dict[str, tuple[float, float, float]] = {}
    names = gas.species_names

    def h(name: str) -> float:  # molar enthalpy [kJ/mol] at T
        gas.TPX = T, P_ISO, {name: 1.0}
        return gas.enthalpy_mole / 1e6

    for sp in species:
        comp = gas.species(sp).composition
        c, hh, o, n = (comp.get(e, 0.0) for e in ("C", "H", "O", "N"))
        if c == 0 and hh == 0:  # inert or oxidant: no heating value
            out[sp] = (gas.molecular_weights[gas.species_index(sp)], 0.0, 0.0)
            continue
        need = {"CO2": c, "H2O": hh / 2.0, "N2": n / 2.0}
        o2 = c + hh / 4.0 - o / 2.0
        for prod in [k for k, v in need.items() if v] + (["O2"] if o2 else []):
            if prod not in names:
                raise ValueError(f"mechanism lacks {prod} to burn {sp}")
        inferior = h(sp) + o2 * (h("O2") if o2 else 0.0) - sum(v * h(k) for k, v in need.items() if v)
        out[sp] = (gas.molecular_weights[gas.species_index(sp)], hh,
                   inferior + hh / 2.0 * L_WATER[combustion_T_C])
    return out


def mixture_key(X: Mapping[str, float]) -> tuple[tuple[str, float], ...]:
    """A mixture as a hashable key of the reactor caches: (species, mole fraction) pairs,
    sorted, absent species dropped.

    >>> mixture_key({"N2": 0.79, "O2": 0.21, "H2": 0.0})
    (('N2', 0.79), ('O2', 0.21))
    """
    return tuple(sorted((k, float(v)) for k, v in X.items() if v > 0))


@lru_cache(maxsize=8)
def mechanism_facts(name: str, path: str, sha256: str) -> MechanismFacts:
    """The read side's facts of mechanism ``path`` (named ``name`` in the study, content hash
    ``sha256``): element counts and molar masses of every species, the reaction equations,
    and :func:`fallback_data` of every species at every ISO 6976 combustion temperature
    (L_WATER's), or why a species has none."""
    gas = solution(path, None, sha256)
    fallback: dict[int, dict[str, tuple[float, float, float] | str]] = {}
    for T_C in sorted(L_WATER):
        fallback[T_C] = {}
        for sp in gas.species_names:
            try:
                fallback[T_C][sp] = fallback_data(gas, [sp], T_C)[sp]
            except ValueError as exc:
                fallback[T_C][sp] = str(exc)
    return MechanismFacts(name=name, path=str(path), sha256=sha256,
                          atoms={sp.name: dict(sp.composition) for sp in gas.species()},
                          molar_masses_kg_kmol=dict(zip(gas.species_names, map(float, gas.molecular_weights))),
                          reaction_equations=reaction_equations(path), heating_fallback=fallback,
                          nitrogen_chemistry=has_nitrogen_chemistry(gas))
