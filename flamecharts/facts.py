"""What a run keeps of its mechanism, so that its results are read without it.

MechanismFacts   a mechanism's species (element counts, molar masses), reaction equations
                 and the heating data of species outside ISO 6976: everything the read
                 side (config checks, gas properties, kinetic bands) asks of a mechanism
ReducedMechanism the skeletal mechanism a [reduction] study solved its flames with (its facts,
                 file and hash) and the errors measured against the detailed one

A run writes them beside the config copy (config.save_config_copy); ``open_results``,
``flamecharts charts`` and ``flamecharts report`` read them back, so a run folder redraws
and reports without the mechanism file and without importing Cantera. They are made from
the file by chemistry.mechanism.mechanism_facts.
"""
from __future__ import annotations

import hashlib
from dataclasses import dataclass, field, replace
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


@dataclass(frozen=True)
class ReducedMechanism:
    """What a run keeps of its [reduction] (sweep.skeletal; written to reduction.json beside the
    store): the skeletal mechanism a study's flames were solved with, and its measured error.

    ``reduced`` False: no candidate met every target and the flames used the detailed mechanism
    (``file``, ``sha256`` and ``facts`` empty). Errors are relative (0.01 = 1 %). ``flames`` are
    the validation flames, each a dict: ``condition`` (sweep.points.condition_key of the point),
    ``label``, ``held_out`` (a point of the study), the detailed and skeletal flame speeds [m/s]
    and the relative ``error`` and ``thickness_error`` (None where a flame did not burn).
    ``targets``: ``flame_speed``, ``ignition_delay``, ``species_error`` (fractions) and
    ``species`` (the target species). ``cpu_s``: CPU seconds of each step of the reduction.
    """

    reduced: bool
    file: str
    sha256: str
    detailed_name: str
    detailed_path: str
    detailed_sha256: str
    detailed_size: tuple[int, int]            # species, reactions
    species: tuple[str, ...]
    reactions: int
    epsilon: float
    targets: dict
    ignition_errors: tuple[float, ...]
    flames: tuple[dict, ...]
    species_errors: dict[str, float | None]
    tried: tuple[dict, ...]
    n_states: int
    training_runs: int
    cpu_s: dict[str, float]
    facts: MechanismFacts | None = field(default=None, repr=False)

    @property
    def flame_speed_error(self) -> float | None:
        """The largest measured flame-speed error over the validation flames (None: none measured)."""
        errs = [f["error"] for f in self.flames if f.get("error") is not None]
        return max(errs) if errs else None

    @property
    def thickness_error(self) -> float | None:
        errs = [f["thickness_error"] for f in self.flames if f.get("thickness_error") is not None]
        return max(errs) if errs else None

    @property
    def ignition_delay_error(self) -> float:
        return max(self.ignition_errors, default=0.0)

    @property
    def why_detailed(self) -> str:
        """Why the flames burn the detailed mechanism ('' when they burn a skeletal one): no smaller
        candidate to try, every candidate refused on its ignition delays, or none met every target."""
        if self.reduced:
            return ""
        if not self.tried:
            return ("no smaller mechanism to try: every candidate of the threshold ladder kept all the species the "
                    "targets need")
        if all(str(t.get("refused", "")).startswith("ignition delay") for t in self.tried):
            return f"each of the {len(self.tried)} smaller candidates was refused on its ignition delays"
        return "no skeletal mechanism met every target"

    @property
    def validation_words(self) -> str:
        """How many validation flames were solved, and why none was when none was (a candidate's
        flames are solved only once its ignition delays hold; none asked for: ignition delays only)."""
        n = sum(f.get("detailed_m_s") is not None for f in self.flames)
        if n:
            return f"{n} validation flame(s) solved with the detailed mechanism"
        if self.flames:
            return "no validation flame burned with the detailed mechanism"
        if not self.tried and not self.reduced:
            return "no validation flame solved (no smaller candidate to check)"
        if not self.reduced:
            return "no validation flame solved (no candidate kept its ignition delays within the target)"
        return "no validation flame solved (none asked for: ignition delays only)"

    def error_at(self, condition: str) -> float | None:
        """The measured flame-speed error of the validation flame at ``condition`` (None: not one)."""
        return next((f["error"] for f in self.flames if f["condition"] == condition and f.get("error") is not None),
                    None)

    def to_json(self) -> dict:
        """Plain JSON data (:meth:`from_json` reads it back; ``facts`` without its path, which is
        the output folder's)."""
        out = {k: getattr(self, k) for k in ("reduced", "file", "sha256", "detailed_name", "detailed_path",
                                             "detailed_sha256", "reactions", "epsilon", "targets",
                                             "species_errors", "n_states", "training_runs", "cpu_s")}
        return {**out, "detailed_size": list(self.detailed_size), "species": list(self.species),
                "ignition_errors": list(self.ignition_errors), "flames": list(self.flames), "tried": list(self.tried),
                "facts": None if self.facts is None else self.facts.to_json()}

    @classmethod
    def from_json(cls, data: dict, folder: str | Path) -> ReducedMechanism:
        """The record :meth:`to_json` wrote, its skeletal file in ``folder`` (KeyError, TypeError or
        ValueError when it is not that)."""
        facts = MechanismFacts.from_json(data["facts"]) if data.get("facts") else None
        if facts is not None:
            facts = replace(facts, path=str(Path(folder) / str(data["file"])))
        return cls(reduced=bool(data["reduced"]), file=str(data["file"]), sha256=str(data["sha256"]),
                   detailed_name=str(data["detailed_name"]), detailed_path=str(data["detailed_path"]),
                   detailed_sha256=str(data["detailed_sha256"]),
                   detailed_size=(int(data["detailed_size"][0]), int(data["detailed_size"][1])),
                   species=tuple(str(s) for s in data["species"]), reactions=int(data["reactions"]),
                   epsilon=float(data["epsilon"]), targets=dict(data["targets"]),
                   ignition_errors=tuple(float(e) for e in data["ignition_errors"]),
                   flames=tuple(dict(f) for f in data["flames"]),
                   species_errors={str(k): None if v is None else float(v) for k, v in data["species_errors"].items()},
                   tried=tuple(dict(t) for t in data["tried"]), n_states=int(data["n_states"]),
                   training_runs=int(data["training_runs"]),
                   cpu_s={str(k): float(v) for k, v in data["cpu_s"].items()}, facts=facts)
