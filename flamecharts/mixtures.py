"""Fuels, blends, oxidizers and equivalence ratio: pure functions on compositions.

A composition is a mapping of species name to mole fraction (dimensionless).

normalize            scale a composition so its mole fractions sum to one
blend                mix a second fuel into a fuel stream at a mole fraction of the stream
stoich_o2_per_fuel   moles of O2 for complete combustion of one mole of a fuel stream
unburned_mixture     fuel + oxidizer composition at an equivalence ratio
"""
from __future__ import annotations

from typing import Mapping

Composition = Mapping[str, float]


def normalize(X: Composition) -> dict[str, float]:
    """Scale mole fractions so they sum to one; zero entries are dropped.

    Parameters
    ----------
    X : mapping of species name to amount [any consistent unit: mol, mole fraction, %]

    Returns
    -------
    dict of species name to mole fraction [-], sorted by species name.

    Raises
    ------
    ValueError
        If an amount is negative or not finite, or no amount is positive.

    Examples
    --------
    >>> normalize({"O2": 1.0, "N2": 3.76})
    {'N2': 0.7899159663865546, 'O2': 0.21008403361344538}
    """
    total = 0.0
    for name, x in X.items():
        if not (x == x) or x in (float("inf"), float("-inf")) or x < 0:
            raise ValueError(f"amount of {name} is {x}; amounts must be finite and >= 0")
        total += x
    if total <= 0:
        raise ValueError("no species has a positive amount")
    return {name: X[name] / total for name in sorted(X) if X[name] > 0}


def blend(base: Composition, added: Composition, fraction: float) -> dict[str, float]:
    """Mix a second fuel into a fuel stream at a mole (volume) fraction of the stream.

    This is how hydrogen injection into gas networks is specified in the trade:
    "20 % hydrogen" means 20 mol % of the blended fuel gas is the added gas.

    Parameters
    ----------
    base : composition of the base fuel [mole fractions, any scale]
    added : composition of the added fuel [mole fractions, any scale]
    fraction : mole fraction of the added fuel in the blended stream [-], 0 to 1

    Returns
    -------
    dict of species to mole fraction [-] of the blended fuel stream.

    Examples
    --------
    >>> blend({"CH4": 1.0}, {"H2": 1.0}, 0.2)
    {'CH4': 0.8, 'H2': 0.2}
    """
    if not 0.0 <= fraction <= 1.0:
        raise ValueError(f"blend fraction {fraction} is outside 0 to 1")
    a, b = normalize(base), normalize(added)
    out: dict[str, float] = {}
    for name, x in a.items():
        out[name] = out.get(name, 0.0) + (1.0 - fraction) * x
    for name, x in b.items():
        out[name] = out.get(name, 0.0) + fraction * x
    return normalize(out)


def stoich_o2_per_fuel(atoms_per_species: Mapping[str, Mapping[str, float]], X_fuel: Composition) -> float:
    """Moles of O2 needed to burn one mole of a fuel stream completely to CO2, H2O and N2.

    Complete-combustion stoichiometry: each C takes one O2 (to CO2), each H a quarter
    O2 (to H2O), oxygen bound in the fuel is credited at half an O2 per atom, S to SO2
    one O2 (Turns, An Introduction to Combustion, 3rd ed., 2012, eq. 2.30, generalised
    to mixtures by summing over species).

    Parameters
    ----------
    atoms_per_species : mapping species -> {element: atoms per molecule}
    X_fuel : fuel-stream composition [mole fractions]

    Returns
    -------
    float: mol O2 per mol fuel stream [-]

    Examples
    --------
    >>> round(stoich_o2_per_fuel({"CH4": {"C": 1, "H": 4}}, {"CH4": 1.0}), 6)
    2.0
    """
    X = normalize(X_fuel)
    need = 0.0
    for name, x in X.items():
        atoms = atoms_per_species[name]
        need += x * (atoms.get("C", 0) + atoms.get("H", 0) / 4.0 + atoms.get("S", 0) - atoms.get("O", 0) / 2.0)
    return need


def unburned_mixture(X_fuel: Composition, X_oxidizer: Composition, phi: float,
                     o2_per_fuel: float) -> dict[str, float]:
    """Fuel-oxidizer mixture at an equivalence ratio.

    phi = (n_fuel / n_ox) / (n_fuel / n_ox)_stoich, so for one mole of fuel stream the
    oxidizer amount is o2_per_fuel / (phi * X_O2,ox) moles (Turns 2012, eq. 2.32).

    Parameters
    ----------
    X_fuel : fuel-stream composition [mole fractions]
    X_oxidizer : oxidizer composition [mole fractions]; must contain O2
    phi : equivalence ratio [-], > 0
    o2_per_fuel : O2 for complete combustion of one mole of fuel stream [mol/mol]

    Returns
    -------
    dict of species to mole fraction [-] of the unburned mixture.

    Examples
    --------
    Stoichiometric methane in 1:3.76 air is 9.51 mol % CH4 (common practice):

    >>> X = unburned_mixture({"CH4": 1}, {"O2": 1, "N2": 3.76}, 1.0, 2.0)
    >>> round(X["CH4"], 4)
    0.0951
    """
    if not phi > 0:
        raise ValueError(f"equivalence ratio {phi} must be > 0")
    Xf, Xo = normalize(X_fuel), normalize(X_oxidizer)
    x_o2 = Xo.get("O2", 0.0)
    if x_o2 <= 0:
        raise ValueError("oxidizer has no O2")
    if o2_per_fuel <= 0:
        raise ValueError("fuel stream needs no oxygen to burn (no combustible species)")
    n_ox = o2_per_fuel / (phi * x_o2)
    out: dict[str, float] = {}
    for name, x in Xf.items():
        out[name] = out.get(name, 0.0) + x
    for name, x in Xo.items():
        out[name] = out.get(name, 0.0) + n_ox * x
    return normalize(out)
