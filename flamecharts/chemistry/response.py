"""What a flame's response to stretch needs from the mechanism: Lewis numbers and the Zeldovich flames.

lewis_numbers         Lewis numbers of the fuel (blends: heat-release weighted) and of O2 in the fresh mixture
lower_heating_value   J/mol of a species burned to CO2, H2O (gas) and N2, from the mechanism's thermo
diluted               the same mixture with the inert's mole fraction moved by a step, at fixed phi
zeldovich_flames      two extra flames either side of a converged one, warm-started from it -> Ze

The physics (formulas, sources) lives in physics/flame_response.py; this module only
feeds it from Cantera, in the worker, so the numbers are stored with each flame.
"""
from __future__ import annotations

from collections.abc import Callable, Mapping
from typing import TYPE_CHECKING, Any

from ..physics import flame_response as fr

if TYPE_CHECKING:
    import cantera as ct

#: Inerts whose mole fraction is moved to change T_ad at fixed phi, in order of preference.
INERTS = ("N2", "AR", "Ar", "HE", "He", "CO2")



#: Products a combustible is burned to for its heating value.
_PRODUCTS = {"C": "CO2", "H": "H2O", "N": "N2"}


def is_combustible(atoms: Mapping[str, float]) -> bool:
    """Carries C or H with less O than full oxidation (so H2O and CO2 are not, CO is).

    >>> is_combustible({"C": 1, "H": 4}), is_combustible({"C": 1, "O": 2}), is_combustible({"C": 1, "O": 1})
    (True, False, True)
    """
    c, h, o = atoms.get("C", 0.0), atoms.get("H", 0.0), atoms.get("O", 0.0)
    return (c > 0 or h > 0) and o < 2 * c + h / 2


def lower_heating_value(gas: ct.Solution, species: str) -> float | None:
    """Lower heating value [J/mol] of ``species`` burned to CO2, H2O (gas) and N2 at 298.15 K,
    from the mechanism's standard enthalpies; None when a product is missing from it."""
    n = {e: gas.n_atoms(species, e) for e in ("C", "H", "O", "N") if e in gas.element_names}
    need = {_PRODUCTS["C"]: n.get("C", 0.0), _PRODUCTS["H"]: n.get("H", 0.0) / 2, _PRODUCTS["N"]: n.get("N", 0.0) / 2}
    need = {k: v for k, v in need.items() if v > 0}
    o2 = n.get("C", 0.0) + n.get("H", 0.0) / 4 - n.get("O", 0.0) / 2
    if any(p not in gas.species_names for p in need) or "O2" not in gas.species_names:
        return None
    gas.TP = 298.15, 101325.0
    h = dict(zip(gas.species_names, gas.standard_enthalpies_RT * 8.314462618 * 298.15))
    return h[species] + o2 * h["O2"] - sum(v * h[p] for p, v in need.items())


def lewis_numbers(gas: ct.Solution, X: dict, T: float, P: float) -> tuple[float | None, float | None]:
    """(Le of the fuel, Le of O2) in the fresh mixture X at T [K], P [Pa], mixture-averaged
    diffusion coefficients; a fuel of several combustibles is weighted by heat release
    (physics.flame_response.blend_lewis_number_heat_release). None where absent."""
    gas.TPX = T, P, X
    alpha = gas.thermal_conductivity / (gas.density * gas.cp_mass)
    D = dict(zip(gas.species_names, gas.mix_diff_coeffs))
    atoms = {k: {e: gas.n_atoms(k, e) for e in gas.element_names} for k in X if X[k] > 0}
    fuels = [k for k in sorted(atoms) if k != "O2" and is_combustible(atoms[k])]
    le_o2 = fr.lewis_number(alpha, D["O2"]) if X.get("O2", 0.0) > 0 else None
    if not fuels:
        return None, le_o2
    le = [fr.lewis_number(alpha, D[k]) for k in fuels]
    if len(fuels) == 1:
        return le[0], le_o2
    lhv = [lower_heating_value(gas, k) for k in fuels]
    q = [X[k] * (v if v is not None else 0.0) for k, v in zip(fuels, lhv)]
    if sum(q) <= 0 or any(v is None for v in lhv):
        q = [X[k] for k in fuels]  # no heating values from this mechanism: by mole fraction
    return fr.blend_lewis_number_heat_release(le, q), le_o2


def diluted(X: dict, inert: str, step: float) -> dict:
    """X with the inert's mole fraction moved by ``step`` (negative: removed), the other
    species scaled together, so fuel-to-oxidizer ratios (phi) stay as they were.

    >>> d = diluted({"H2": 0.3, "O2": 0.15, "N2": 0.55}, "N2", 0.05)
    >>> round(d["N2"], 4), round(d["H2"] / d["O2"], 4)
    (0.6, 2.0)
    """
    x_in = X.get(inert, 0.0)
    new_in = x_in + step
    if not 0.0 <= new_in < 1.0:
        raise ValueError(f"{inert} mole fraction {x_in:g} cannot move by {step:g}")
    scale = (1.0 - new_in) / (1.0 - x_in)
    out = {k: v * scale for k, v in X.items() if k != inert}
    out[inert] = new_in
    return out


def inert_steps(X: dict, species: list[str], step: float) -> tuple[str, tuple[float, float]] | None:
    """The inert to move and its two steps: (-step, +step) when the mixture has enough of
    it, else (+step, +2 step); None when the mechanism has none of INERTS."""
    present = [s for s in INERTS if s in species]
    if not present:
        return None
    with_enough = [s for s in present if X.get(s, 0.0) >= 2 * step]
    if with_enough:
        return with_enough[0], (-step, step)
    return present[0], (step, 2 * step)


def zeldovich_flames(solve: Callable[[dict, dict | None], dict], X: dict, species: list[str], T_u: float, base: dict,
                     step: float) -> dict:
    """Ze of a converged flame from two more flames at the same phi, p and T_u with the
    inert moved by ``step`` either way (Egolfopoulos & Law 1990), each warm-started from it.

    ``solve(X, warm)`` solves one flame (chemistry.flame.solve_flame with everything else
    fixed); ``base`` is the converged flame's result. Returns metrics to store:
    zeldovich_number (None when an extra flame failed), the T_ad span of the three flames,
    and the extra flames' solve seconds.
    """
    m0 = base["metrics"]
    out: dict[str, Any] = {"zeldovich_number": None, "zeldovich_seconds": 0.0}
    chosen = inert_steps(X, species, step)
    if chosen is None:
        out["zeldovich_message"] = "no inert (N2, Ar, He, CO2) in the mechanism"
        return out
    inert, steps = chosen
    m = [m0["unburned_density_kg_m3"] * m0["laminar_flame_speed_m_s"]]
    T = [m0["adiabatic_flame_temperature_K"]]
    for s in steps:
        r = solve(diluted(X, inert, s), base.get("profile"))
        out["zeldovich_seconds"] += r.get("solve_seconds", 0.0)
        if r["status"] != "ok":
            out["zeldovich_message"] = f"{inert} {s:+g}: {r['message']}"
            return out
        m.append(r["metrics"]["unburned_density_kg_m3"] * r["metrics"]["laminar_flame_speed_m_s"])
        T.append(r["metrics"]["adiabatic_flame_temperature_K"])
    out["zeldovich_number"] = fr.zeldovich_number(m, T, T_u, T[0])
    out["zeldovich_T_ad_span_K"] = max(T) - min(T)
    return out
