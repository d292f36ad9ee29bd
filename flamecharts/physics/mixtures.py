"""Fuels, blends, oxidizers and equivalence ratio: pure functions on compositions.

A composition is a mapping of species name to mole fraction (dimensionless).

normalize            scale a composition so its mole fractions sum to one
blend                mix a second fuel into a fuel stream at a mole fraction of the stream
stoich_o2_per_fuel   moles of O2 for complete combustion of one mole of a fuel stream
unburned_mixture     fuel + oxidizer composition at an equivalence ratio
equivalence_ratio    the equivalence ratio of a fuel + oxidizer mixture (inverse of unburned_mixture)

Every function returns mole fractions that are finite, >= 0 and sum to one, or
raises :class:`~flamecharts.errors.MixtureError` (a ConfigError and a ValueError)
naming the species or value that describes no real mixture.
"""
from __future__ import annotations

import math
from collections.abc import Mapping
from numbers import Real

from ..errors import MixtureError, show

Composition = Mapping[str, float]


def _real(x, what: str) -> float:
    """``x`` as a finite float, or MixtureError naming ``what``."""
    if isinstance(x, bool) or not isinstance(x, Real):
        raise MixtureError(f"{what} must be a number, got {show(x)}")
    try:
        x = float(x)
    except (OverflowError, ValueError):
        raise MixtureError(f"{what} is {show(x)}; it must be a finite number") from None
    if not math.isfinite(x):
        raise MixtureError(f"{what} is {x}; it must be a finite number")
    return x


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
    MixtureError
        If a name is not a string, an amount is negative, not a number or not
        finite, or no amount is positive.

    Examples
    --------
    >>> normalize({"O2": 1.0, "N2": 3.76})
    {'N2': 0.7899159663865546, 'O2': 0.21008403361344538}
    """
    if not isinstance(X, Mapping):
        raise MixtureError(f"a composition must be a table of species = amount, got {show(X)}")
    amounts = {}
    for name, x in X.items():
        if not isinstance(name, str) or not name:
            raise MixtureError(f"species name {show(name)} must be a non-empty string")
        x = _real(x, f"amount of {name}")
        if x < 0:
            raise MixtureError(f"amount of {name} is {x:g}; amounts must be >= 0")
        amounts[name] = x
    biggest = max(amounts.values(), default=0.0)
    if not biggest > 0:
        raise MixtureError("no species has a positive amount")
    total = sum(amounts.values())
    if not math.isfinite(total):  # huge amounts: scale by the largest first so the sum cannot overflow
        amounts = {name: x / biggest for name, x in amounts.items()}
        total = sum(amounts.values())
    out = {name: amounts[name] / total for name in sorted(amounts)}
    return {name: x for name, x in out.items() if x > 0}


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
    fraction = _real(fraction, "blend fraction")
    if not 0.0 <= fraction <= 1.0:
        raise MixtureError(f"blend fraction {fraction:g} is outside 0 to 1")
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
    float: mol O2 per mol fuel stream [-]; <= 0 for a stream with nothing to burn.

    Raises
    ------
    MixtureError
        If the composition is invalid or a species has no atom counts.

    Examples
    --------
    >>> round(stoich_o2_per_fuel({"CH4": {"C": 1, "H": 4}}, {"CH4": 1.0}), 6)
    2.0
    """
    X = normalize(X_fuel)
    need = 0.0
    for name, x in X.items():
        atoms = atoms_per_species.get(name)
        if atoms is None:
            raise MixtureError(f"species {name!r} has no atom counts (not in the mechanism)")
        counts = {el: _real(atoms.get(el, 0), f"atoms of {el} in {name}") for el in ("C", "H", "S", "O")}
        need += x * (counts["C"] + counts["H"] / 4.0 + counts["S"] - counts["O"] / 2.0)
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
    phi = _real(phi, "equivalence ratio")
    if not phi > 0:
        raise MixtureError(f"equivalence ratio {phi:g} must be > 0")
    o2_per_fuel = _real(o2_per_fuel, "O2 need of the fuel stream")
    Xf, Xo = normalize(X_fuel), normalize(X_oxidizer)
    x_o2 = Xo.get("O2", 0.0)
    if x_o2 <= 0:
        raise MixtureError("oxidizer has no O2")
    if o2_per_fuel <= 0:
        raise MixtureError("fuel stream needs no oxygen to burn (no combustible species)")
    # one mole of fuel stream and n_ox moles of oxidizer; at extreme phi one stream
    # would shrink below what a float holds next to the other: no real mixture is left
    with_ox = phi * x_o2
    n_ox = o2_per_fuel / with_ox if with_ox > 0 else math.inf
    if not (math.isfinite(n_ox) and min(Xf.values()) / (1.0 + n_ox) > 1e-300
            and n_ox * min(Xo.values()) / (1.0 + n_ox) > 1e-300):
        raise MixtureError(f"equivalence ratio {phi:g} leaves no {'fuel' if n_ox > 1 else 'oxidizer'} in the "
                           "mixture (fractions below what a float holds); give a value between 1e-6 and 1e6")
    out: dict[str, float] = {}
    for name, x in Xf.items():
        out[name] = out.get(name, 0.0) + x
    for name, x in Xo.items():
        out[name] = out.get(name, 0.0) + n_ox * x
    return normalize(out)


def equivalence_ratio(X_mix: Composition, X_fuel: Composition, X_oxidizer: Composition,
                      o2_per_fuel: float) -> float:
    """Equivalence ratio of a mixture of a fuel stream and an oxidizer (inverse of :func:`unburned_mixture`).

    The mixture is split into a moles of fuel stream and b moles of oxidizer by least
    squares over the species (exact for a mixture of the two, each species weighted
    by 1/x_mix); then
    phi = a o2_per_fuel / (b x_O2,ox) (Turns 2012, eq. 2.32).

    Parameters
    ----------
    X_mix : mixture composition [mole fractions]
    X_fuel, X_oxidizer : fuel-stream and oxidizer compositions [mole fractions]
    o2_per_fuel : O2 for complete combustion of one mole of fuel stream [mol/mol], > 0

    Returns
    -------
    float: equivalence ratio [-]

    Raises
    ------
    MixtureError
        If the fuel and oxidizer cannot be told apart (same composition) or the
        mixture holds no oxidizer.

    Examples
    --------
    >>> X = unburned_mixture({"CH4": 1}, {"O2": 1, "N2": 3.76}, 0.8, 2.0)
    >>> round(equivalence_ratio(X, {"CH4": 1}, {"O2": 1, "N2": 3.76}, 2.0), 12)
    0.8
    """
    o2_per_fuel = _real(o2_per_fuel, "O2 need of the fuel stream")
    if o2_per_fuel <= 0:
        raise MixtureError("fuel stream needs no oxygen to burn (no combustible species)")
    m, f, o = normalize(X_mix), normalize(X_fuel), normalize(X_oxidizer)
    x_o2 = o.get("O2", 0.0)
    if x_o2 <= 0:
        raise MixtureError("oxidizer has no O2")
    stray = sorted(set(m) - set(f) - set(o))
    if stray:
        raise MixtureError(f"the mixture holds {', '.join(stray)}, which neither the fuel stream nor the "
                           "oxidizer has")
    # least squares on a x_fuel,i + b x_ox,i = x_mix,i with each species' equation divided
    # by x_mix,i (every fraction is known to the same relative precision) and both
    # unknowns scaled to order one: well conditioned also when a trace species alone
    # tells the two streams apart
    rows = []
    for k in set(f) | set(o):
        mk = m.get(k, 0.0)
        if not mk > 0:
            raise MixtureError(f"the mixture has no {k}, which the {'fuel stream' if k in f else 'oxidizer'} holds")
        rows.append((f.get(k, 0.0) / mk, o.get(k, 0.0) / mk))
    cf, co = max(r[0] for r in rows), max(r[1] for r in rows)
    if not (math.isfinite(cf) and math.isfinite(co)):
        raise MixtureError("the mixture holds fractions too small to tell the fuel stream and oxidizer apart")
    rows = [(r0 / cf, r1 / co) for r0, r1 in rows]
    ff = math.fsum(r0 * r0 for r0, _ in rows)
    oo = math.fsum(r1 * r1 for _, r1 in rows)
    fo = math.fsum(r0 * r1 for r0, r1 in rows)
    f1 = math.fsum(r0 for r0, _ in rows)
    o1 = math.fsum(r1 for _, r1 in rows)
    det = ff * oo - fo * fo
    if not det > 1e-9 * ff * oo:
        raise MixtureError("fuel stream and oxidizer have (nearly) the same composition; "
                           "the equivalence ratio is undefined")
    a = (f1 * oo - o1 * fo) / det / cf
    b = (o1 * ff - f1 * fo) / det / co
    if not b > 0 or not a > 0:
        raise MixtureError("the mixture is not made of this fuel stream and oxidizer")
    phi = a * o2_per_fuel / (b * x_o2)
    if not math.isfinite(phi):
        raise MixtureError("the equivalence ratio of this mixture is too large to represent")
    return phi
