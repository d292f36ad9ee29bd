"""Lumping a gas analysis onto the species a reaction mechanism has.

A pipeline analysis names components a mechanism built for natural gas may lack
(GRI-Mech 3.0 stops at propane: no butanes, pentanes, hexane, helium). The gas
properties use the full analysis (ISO 6976); the flame gets a lumped composition:

- a hydrocarbon CnHm the mechanism lacks -> the mechanism's heaviest n-alkane
  CkH2k+2 with k <= n, at equal carbon (n/k mol per mol), so the carbon flow, and
  nearly the oxygen demand and heat release, are kept: the lumping of the heavier
  hydrocarbons of a natural gas into a single representative alkane that kinetic
  studies of natural gas commonly use (common practice; no single published rule);
- an inert gas the mechanism lacks (He, Ar, Ne) -> N2 at equal moles (a diluent
  for a diluent; its heat capacity differs);
- a trace of H2S the mechanism lacks -> left out (no sulphur chemistry), the rest
  renormalised.

The result is renormalised to mole fractions; the notes say what was lumped, and
every output carries them as a warning.
"""
from __future__ import annotations

import re
from collections.abc import Mapping
from fractions import Fraction

#: Inert gases that stand in as N2 when the mechanism lacks them.
INERT_TO_N2 = ("He", "Ar", "Ne", "HE", "AR", "NE")
#: Components left out of the flame when the mechanism lacks them (traces without their chemistry).
DROPPED = ("H2S",)

_PREFIX = re.compile(r"^(?:n-|i-|neo-|iso-)")
_ELEMENT = re.compile(r"([A-Z][a-z]?)(\d*)")


def formula_atoms(name: str) -> dict[str, int]:
    """Atoms of a species named by its formula, with an optional isomer prefix.

    >>> formula_atoms("neo-C5H12"), formula_atoms("He")
    ({'C': 5, 'H': 12}, {'He': 1})
    """
    body = _PREFIX.sub("", name)
    parts = _ELEMENT.findall(body)
    if not parts or "".join(e + n for e, n in parts) != body:
        raise ValueError(f"{name!r} is not a chemical formula")
    out: dict[str, int] = {}
    for element, count in parts:
        out[element] = out.get(element, 0) + (int(count) if count else 1)
    return out


def heaviest_alkane(mechanism_atoms: Mapping[str, Mapping[str, float]], max_carbon: int) -> tuple[str, int] | None:
    """The mechanism's n-alkane CkH2k+2 with the most carbon atoms k <= max_carbon, as (name, k).

    >>> heaviest_alkane({"CH4": {"C": 1, "H": 4}, "C3H8": {"C": 3, "H": 8}, "C2H4": {"C": 2, "H": 4}}, 5)
    ('C3H8', 3)
    """
    best = None
    for sp, a in mechanism_atoms.items():
        c, h = a.get("C", 0), a.get("H", 0)
        if c >= 1 and set(a) <= {"C", "H"} and h == 2 * c + 2 and c <= max_carbon and (best is None or c > best[1]):
            best = (sp, int(c))
    return best


def lump(X: Mapping[str, float], mechanism_atoms: Mapping[str, Mapping[str, float]]) -> tuple[dict[str, float], list[str]]:
    """The composition X (mole fractions) on the mechanism's species, and a note per lumped component.

    Species the mechanism has pass unchanged; see the module docstring for the rest. Raises
    ValueError for a species it cannot place (no formula, or no alkane in the mechanism).

    >>> X, notes = lump({"CH4": 0.9, "n-C4H10": 0.06, "He": 0.04},
    ...                 {"CH4": {"C": 1, "H": 4}, "C3H8": {"C": 3, "H": 8}, "N2": {"N": 2}})
    >>> {k: round(v, 4) for k, v in X.items()}, notes
    ({'CH4': 0.8824, 'C3H8': 0.0784, 'N2': 0.0392}, ['n-C4H10 as 4/3 C3H8 (equal carbon)', 'He as N2'])
    """
    out: dict[str, float] = {}
    notes = []
    for sp, x in X.items():
        same = sp if sp in mechanism_atoms else next((m for m in mechanism_atoms if m.upper() == sp.upper()), None)
        if same is not None:  # the mechanism's own species, maybe spelled in other case (Ar / AR)
            out[same] = out.get(same, 0.0) + x
            continue
        if sp in DROPPED:
            notes.append(f"{sp} left out (no sulphur chemistry)")
            continue
        if sp in INERT_TO_N2 and "N2" in mechanism_atoms:
            out["N2"] = out.get("N2", 0.0) + x
            notes.append(f"{sp} as N2")
            continue
        atoms = formula_atoms(sp)
        n = atoms.get("C", 0)
        if n < 1 or set(atoms) - {"C", "H"}:
            raise ValueError(f"no rule lumps {sp!r} onto the mechanism's species")
        alkane = heaviest_alkane(mechanism_atoms, n)
        if alkane is None:
            raise ValueError(f"the mechanism has no alkane to stand for {sp!r}")
        name, k = alkane
        out[name] = out.get(name, 0.0) + x * n / k
        notes.append(f"{sp} as {Fraction(n, k)} {name} (equal carbon)" if n != k else f"{sp} as {name} (equal carbon)")
    if not notes and set(out) == set(X):
        return dict(X), []  # nothing lumped: the composition exactly as given
    total = sum(out.values())
    return {k: v / total for k, v in out.items()}, notes
