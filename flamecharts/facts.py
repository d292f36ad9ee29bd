"""What a run keeps of its mechanism, so that its results are read without it.

MechanismFacts   a mechanism's species (element counts, molar masses), reaction equations
                 and the heating data of species outside ISO 6976: everything the read
                 side (config checks, gas properties, kinetic bands) asks of a mechanism

A run writes them beside the config copy (config.save_config_copy); ``open_results``,
``flamecharts charts`` and ``flamecharts report`` read them back, so a run folder redraws
and reports without the mechanism file and without importing Cantera. They are made from
the file by chemistry.mechanism.mechanism_facts.
"""
from __future__ import annotations

import hashlib
from dataclasses import dataclass, field
from pathlib import Path


def file_sha256(path: str | Path) -> str:
    """sha256 of a file's content, hex (a mechanism's fingerprint: part of every point's key)."""
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


@dataclass(frozen=True)
class MechanismFacts:
    """A mechanism, as the read side needs it.

    ``heating_fallback`` holds, per ISO 6976 combustion reference temperature [degC], each
    species' ideal-gas (molar mass g/mol, hydrogen atoms, superior heating value kJ/mol),
    or the reason it has none from this mechanism (a string: e.g. its combustion products
    are not in the mechanism); see chemistry.mechanism.fallback_data.
    """

    name: str
    path: str
    sha256: str
    atoms: dict[str, dict[str, float]] = field(repr=False)
    molar_masses_kg_kmol: dict[str, float] = field(repr=False)
    reaction_equations: tuple[str, ...] = field(repr=False)
    heating_fallback: dict[int, dict[str, tuple[float, float, float] | str]] = field(repr=False)
    nitrogen_chemistry: bool = False   # NO formed from N2 (chemistry.emissions.has_nitrogen_chemistry)

    def to_json(self) -> dict:
        """Plain JSON data (:meth:`from_json` reads it back)."""
        return {"name": self.name, "path": self.path, "sha256": self.sha256, "atoms": self.atoms,
                "molar_masses_kg_kmol": self.molar_masses_kg_kmol, "reaction_equations": list(self.reaction_equations),
                "heating_fallback": {str(t): v for t, v in self.heating_fallback.items()},
                "nitrogen_chemistry": self.nitrogen_chemistry}

    @classmethod
    def from_json(cls, data: dict) -> MechanismFacts:
        """The facts :meth:`to_json` wrote (KeyError or TypeError when they are not that)."""
        return cls(name=str(data["name"]), path=str(data["path"]), sha256=str(data["sha256"]),
                   atoms={sp: {e: float(n) for e, n in c.items()} for sp, c in data["atoms"].items()},
                   molar_masses_kg_kmol={sp: float(m) for sp, m in data["molar_masses_kg_kmol"].items()},
                   reaction_equations=tuple(data["reaction_equations"]),
                   heating_fallback={int(t): {sp: v if isinstance(v, str) else (float(v[0]), float(v[1]), float(v[2]))
                                              for sp, v in by_sp.items()}
                                     for t, by_sp in data["heating_fallback"].items()},
                   nitrogen_chemistry=bool(data.get("nitrogen_chemistry", False)))

    def fallback(self, species: list[str], combustion_T_C: int) -> dict[str, tuple[float, float, float]]:
        """Heating data of ``species`` at a combustion temperature (ValueError naming the first
        species without one, as chemistry.mechanism.fallback_data raises)."""
        table = self.heating_fallback.get(combustion_T_C, {})
        out = {}
        for sp in species:
            v = table.get(sp)
            if v is None:
                raise ValueError(f"mechanism {self.name} has no species {sp}")
            if isinstance(v, str):
                raise ValueError(v)
            out[sp] = v
        return out

    def file_changed(self) -> bool:
        """Whether the mechanism file at ``path`` now differs from the one the run used (False
        when it is gone: the run folder does not need it)."""
        try:
            return file_sha256(self.path) != self.sha256
        except OSError:
            return False
