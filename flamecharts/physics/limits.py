"""Range checks from tables: inputs outside what the mechanism or the flammability limits cover.

Warnings are derived from the inputs and the stored results each time rows are read
(see design.point_warnings), never stored, so a threshold or a table here can change
without solving a flame again. Each warning is one short sentence; a row's
``warnings`` column joins them with "; ".

- pressure outside the range a known mechanism states it was optimised for
  (MECHANISM_RANGES, by file name; nothing for unknown mechanisms); what a mechanism was
  built for (MECHANISM_SCOPE, mechanism_scope).
- equivalence ratio outside the flammability range in air of the fuel's combustibles by Le
  Chatelier's rule (FLAMMABILITY_VOL; 1 atm, room temperature).
"""
from __future__ import annotations

import math
from functools import lru_cache
from pathlib import Path

#: Pressure range [bar] a mechanism states it was optimised for, by file name.
MECHANISM_RANGES = {
    "gri30.yaml": (10 * 101325 / 760 / 1e5, 10 * 1.01325,
                   "GRI-Mech 3.0 is optimised for about 10 Torr to 10 atm (Smith et al., GRI-Mech 3.0 "
                   "web documentation, 1999)"),
}

#: What a mechanism that ships with Cantera was built and validated for, by file name (the report
#: states it; a mechanism not listed is described as such). Sources: each file's own description
#: (read from Cantera 3.2's data folder) and the papers it names; ranges marked from memory.
MECHANISM_SCOPE = {
    "gri30.yaml": "GRI-Mech 3.0 (Smith et al. 1999): natural gas (methane with some ethane and propane) flames "
                  "and ignition, with NO formation; optimised for about 1000-2500 K, 10 Torr-10 atm and "
                  "equivalence ratios 0.1-5 in premixed systems (GRI-Mech 3.0 web documentation; from memory)",
    "h2o2.yaml": "the hydrogen-oxygen reactions of GRI-Mech 3.0 with N2 added (Cantera's h2o2.yaml): hydrogen "
                 "flames, inheriting GRI-Mech 3.0's ranges; not optimised for hydrogen flames on their own",
    "ammonia-CO-H2-Alzueta-2023.yaml": "Alzueta, Salas, Hashemi & Glarborg 2023 (Combust. Flame 257, 112438), "
                                       "ammonia, CO and hydrogen oxidation, six pressure-dependent reactions on "
                                       "the reduced-pressure linear mixture rule (Singal et al. 2024); built "
                                       "from flow-reactor work near 1 bar, 700-1500 K (from memory)",
}


#: How far a mechanism's constant-pressure/volume ignition delays were found from shock-tube
#: data (docs/premixers.md, "How far the delays hold"; tests/test_ignition.py), by file name.
IGNITION_CHECKS = {
    "gri30.yaml": "GRI-Mech 3.0's delays lie within a factor 2-2.5 of shock-tube measurements above about 1150 K "
                  "(methane at 15-40 atm, Huang et al. 2004; hydrogen at 2-2.5 atm, Slack 1977), but below it they "
                  "run 2 to 7 times longer than measured: at premixer temperatures the margin can be overstated "
                  "several times",
    "h2o2.yaml": "h2o2.yaml's hydrogen delays lie within a factor 2 of shock-tube measurements at 1098-1323 K and "
                 "2-2.5 atm (Slack 1977; Bhaskaran, Gupta & Just 1973), but run several times longer than measured "
                 "near hydrogen's second explosion limit, below about 1080 K: at premixer temperatures the margin "
                 "can be overstated several times",
}


#: Below this preheat [K] a mechanism's delays were found longer than measured, and by how much
#: at most, by file name (the ignition checks of docs/premixers.md; GRI-Mech 3.0:
#: 2-7 times for methane at 37 atm and hydrogen near its second explosion limit; h2o2.yaml
#: carries GRI-Mech 3.0's hydrogen-oxygen reactions, so its hydrogen delays are the same).
IGNITION_LOW_T = {"gri30.yaml": (1150.0, 7.0), "h2o2.yaml": (1080.0, 7.0)}


def autoignition_verdict(mechanism: str, unburned_temperature_K: float, margin: float, minimum: float) -> str:
    """Verdict on a premixer's autoignition margin (ignition delay / residence time) that says
    how far the mechanism's delays can be trusted at this preheat: 'ok' only where the margin
    holds even with the delays as much shorter as flamecharts found them too long there
    (IGNITION_LOW_T), or where nothing ignites within the horizon (margin inf).

    >>> autoignition_verdict("gri30.yaml", 700.0, 50.0, 3.0)
    'ok (also with delays 7 times shorter, as measured below 1150 K)'
    >>> autoignition_verdict("gri30.yaml", 700.0, 10.0, 3.0)[:60]
    'ok by the mechanism, but at risk if its delays are 7 times t'
    >>> autoignition_verdict("h2o2.yaml", 700.0, 30.0, 3.0)
    'ok (also with delays 7 times shorter, as measured below 1080 K)'
    >>> autoignition_verdict("my.yaml", 700.0, 30.0, 3.0)[:40]
    "ok by the mechanism's delays (not checke"
    >>> autoignition_verdict("gri30.yaml", 700.0, 2.0, 3.0), autoignition_verdict("gri30.yaml", 700.0, float("inf"), 3.0)
    ('autoignition risk', 'ok')
    """
    if margin < minimum:
        return "autoignition risk"
    name = _file_name(mechanism)
    if margin == float("inf"):
        return "ok"
    if name not in IGNITION_LOW_T:
        return "ok by the mechanism's delays (not checked against shock-tube data by flamecharts)"
    bound, factor = IGNITION_LOW_T[name]
    if unburned_temperature_K >= bound:
        return "ok"
    if margin / factor >= minimum:
        return f"ok (also with delays {factor:g} times shorter, as measured below {bound:g} K)"
    return (f"ok by the mechanism, but at risk if its delays are {factor:g} times too long, as measured below "
            f"{bound:g} K (margin {margin / factor:.2g} then)")


def ignition_check(mechanism: str) -> str:
    """What flamecharts found of a mechanism's ignition delays against shock-tube data, or
    that it did not check them.

    >>> ignition_check("gri30.yaml")[:30]
    "GRI-Mech 3.0's delays lie with"
    >>> ignition_check("my.yaml")[:38]
    "my.yaml's ignition delays have not bee"
    """
    name = _file_name(mechanism)
    return IGNITION_CHECKS.get(name, f"{name}'s ignition delays have not been checked against shock-tube data by "
                                     "flamecharts: check what its authors validated it for")


#: How far a mechanism's nitrogen chemistry was checked against NO data (for [emissions]).
NOX_SCOPE = {
    "gri30.yaml": "GRI-Mech 3.0's nitrogen chemistry (thermal, prompt, N2O and NNH routes) was optimised together "
                  "with the rest against flame and reactor NO data up to about 10 atm (GRI-Mech 3.0 web "
                  "documentation; from memory); above that, and for NO2 and N2O, read its NOx as indicative",
    "ammonia-CO-H2-Alzueta-2023.yaml": "built for ammonia, CO and hydrogen oxidation and the NO they form, from "
                                       "flow-reactor work near 1 bar (from memory); thermal NO of hydrocarbon "
                                       "flames is outside it",
}


def nox_scope(mechanism: str) -> str:
    """What the mechanism's NOx chemistry was checked against, or a line saying it is not in the table.

    >>> nox_scope("gri30.yaml")[:40]
    "GRI-Mech 3.0's nitrogen chemistry (therm"
    >>> nox_scope("my.yaml").startswith("not in flamecharts")
    True
    """
    return NOX_SCOPE.get(_file_name(mechanism), "not in flamecharts' table: check what its authors validated its "
                                                "NO chemistry against before reading its NOx")


def mechanism_scope(mechanism: str) -> str:
    """What the mechanism was built and validated for, or a line saying it is not in the table.

    >>> mechanism_scope("h2o2.yaml")[:40]
    'the hydrogen-oxygen reactions of GRI-Mec'
    >>> print(mechanism_scope("/data/my_mech.yaml"))
    not in flamecharts' table of mechanisms: check what its authors validated it for
    """
    return MECHANISM_SCOPE.get(_file_name(mechanism),
                               "not in flamecharts' table of mechanisms: check what its authors validated it for")


#: Flammability limits in air at 1 atm and room temperature, % of the mixture by volume
#: (lower, upper), and the moles of O2 one mole burns to CO2 and H2O (Coward & Jones, US
#: Bureau of Mines Bulletin 503, 1952; the values as usually tabulated from it, from memory).
FLAMMABILITY_VOL = {"CH4": (5.0, 15.0, 2.0), "C2H6": (3.0, 12.4, 3.5), "C3H8": (2.1, 9.5, 5.0),
                    "n-C4H10": (1.8, 8.4, 6.5), "i-C4H10": (1.8, 8.4, 6.5), "H2": (4.0, 75.0, 0.5),
                    "CO": (12.5, 74.0, 0.5), "C2H4": (2.7, 36.0, 3.0)}


def le_chatelier_phi(combustibles: dict[str, float]) -> tuple[float, float] | None:
    """Flammability range in air of a mixture of combustibles, as equivalence ratios: each
    limit by Le Chatelier's rule, 1/L = sum(y_i / L_i) over the combustibles' mole fractions
    y_i (Le Chatelier 1891; Coward & Jones 1952, who find it fair for the lower limit of
    these gases and rougher for the upper), converted to phi with the mixture's own oxygen
    demand. None when a combustible is not in FLAMMABILITY_VOL.

    >>> [round(v, 2) for v in le_chatelier_phi({"CH4": 1.0})]
    [0.5, 1.68]
    >>> [round(v, 2) for v in le_chatelier_phi({"CH4": 0.7, "H2": 0.3})]
    [0.36, 1.82]
    """
    total = sum(combustibles.values())
    if total <= 0 or any(k not in FLAMMABILITY_VOL for k in combustibles):
        return None
    y = {k: v / total for k, v in combustibles.items()}
    lower = 1.0 / sum(y[k] / FLAMMABILITY_VOL[k][0] for k in y) / 100.0
    upper = 1.0 / sum(y[k] / FLAMMABILITY_VOL[k][1] for k in y) / 100.0
    o2 = sum(y[k] * FLAMMABILITY_VOL[k][2] for k in y)
    stoich = 1.0 / (1.0 + o2 / 0.2095)  # fuel fraction of a stoichiometric fuel-air mixture

    def phi(x: float) -> float:
        return (x / (1.0 - x)) / (stoich / (1.0 - stoich))
    return phi(lower), phi(upper)


#: Species of a fuel stream that do not burn (they only narrow the flammable range).
INERTS = {"N2", "CO2", "H2O", "AR", "Ar", "HE", "He"}
#: Oxidizers with at most this O2 mole fraction count as air or leaner than air (air: 0.21).
AIR_O2_MAX = 0.22


@lru_cache(maxsize=64)
def _file_name(mechanism: str) -> str:
    """The file name of a mechanism path (asked once per point: kept)."""
    return Path(mechanism).name


def unsolved_autoignition_warning(status: str, delay_s: float | None, T_u: float) -> str:
    """'' or a warning for a point whose flame gave no answer (status failed or no_flame) while
    its fresh mixture ignites on its own within the screen's window (the worker's
    ``autoignition_screen_delay_s``, chemistry.ignition.autoignition_screen_without_flame): the
    failure must not hide that the mixture autoignites.

    >>> unsolved_autoignition_warning("failed", 3.1e-4, 1000.0)[:61]
    'autoignition: the fresh mixture ignites on its own in 0.31 ms'
    >>> unsolved_autoignition_warning("ok", 3.1e-4, 1000.0), unsolved_autoignition_warning("failed", None, 1000.0)
    ('', '')
    """
    if str(status) not in ("failed", "no_flame") or delay_s is None or not math.isfinite(delay_s):
        return ""
    return (f"autoignition: the fresh mixture ignites on its own in {delay_s * 1e3:.2g} ms at {T_u:g} K "
            "(constant-pressure reactor), whatever its flame solve did: treat it as autoigniting")


def pressure_warning(mechanism: str, pressure_bar: float) -> str:
    """'' or a warning when a known mechanism is used outside its stated pressure range.

    >>> pressure_warning("gri30.yaml", 20.0)[:40]
    'pressure 20 bar outside 0.0133-10.1 bar:'
    >>> pressure_warning("my_mechanism.yaml", 200.0)
    ''
    """
    known = MECHANISM_RANGES.get(_file_name(mechanism))
    if known is None:
        return ""
    lo, hi, source = known
    if lo <= pressure_bar <= hi:
        return ""
    return f"pressure {pressure_bar:g} bar outside {lo:.3g}-{hi:.3g} bar: {source}"


def flammability_warning(X_fuel: dict, X_oxidizer: dict, phi: float) -> str:
    """'' or a warning when phi lies outside the flammability range in air of the fuel's
    combustibles by Le Chatelier's rule (:func:`le_chatelier_phi`; only for fuels whose
    combustibles are all in FLAMMABILITY_VOL and for air or leaner oxidizers; inert diluents
    narrow the range, so a phi outside the undiluted range is outside the diluted one too).

    >>> flammability_warning({"CH4": 1.0}, {"O2": 1.0, "N2": 3.76}, 0.4)[:49]
    'equivalence ratio 0.4 outside the flammable range'
    >>> flammability_warning({"CH4": 1.0}, {"O2": 1.0, "N2": 3.76}, 0.8)
    ''
    """
    burn = {k: v for k, v in X_fuel.items() if v > 0 and k not in INERTS}
    total_ox = sum(X_oxidizer.values()) or 1.0
    if not burn or X_oxidizer.get("O2", 0.0) / total_ox > AIR_O2_MAX:
        return ""
    limits = le_chatelier_phi(burn)
    if limits is None:
        return ""
    lean, rich = limits
    if lean <= phi <= rich:
        return ""
    return (f"equivalence ratio {phi:g} outside the flammable range {lean:.2f}-{rich:.2f} in air of "
            f"{', '.join(sorted(burn))} (Le Chatelier's rule on the limits of Coward & Jones 1952; 1 atm, room "
            "temperature)")


#: Mechanisms built for natural gas, by file name: the share of C3+ hydrocarbons in the fuel's
#: combustibles above which they are used outside their validation (GRI-Mech 3.0 is optimised
#: for methane and natural gas with ethane and a little propane; it over-predicts propane-air
#: flame speeds by about 25 %, see docs/error-bars.md, "Accuracy and scope", and tests/test_validation.py).
NATURAL_GAS_MECHANISMS = {"gri30.yaml": 0.10}


def heavy_hydrocarbon_warning(mechanism: str, X_fuel: dict, atoms: dict) -> str:
    """'' or a warning when hydrocarbons with three or more carbon atoms make up more than the
    mechanism's allowance (NATURAL_GAS_MECHANISMS) of the fuel's combustibles (by moles).

    >>> atoms = {"CH4": {"C": 1, "H": 4}, "C3H8": {"C": 3, "H": 8}, "N2": {"N": 2}}
    >>> heavy_hydrocarbon_warning("gri30.yaml", {"CH4": 0.3, "C3H8": 0.7}, atoms)[:42]
    'fuel is 70 % C3+ hydrocarbons (combustible'
    >>> heavy_hydrocarbon_warning("gri30.yaml", {"CH4": 0.95, "C3H8": 0.05}, atoms)
    ''
    """
    limit = NATURAL_GAS_MECHANISMS.get(_file_name(mechanism))
    if limit is None:
        return ""
    burn = {sp: x for sp, x in X_fuel.items() if x > 0 and atoms.get(sp, {}).get("C", 0) + atoms.get(sp, {}).get("H", 0) > 0
            and sp not in INERTS and sp != "CO2" and sp != "H2O"}
    total = sum(burn.values())
    heavy = sum(x for sp, x in burn.items() if atoms[sp].get("C", 0) >= 3)
    if total <= 0 or heavy / total <= limit:
        return ""
    return (f"fuel is {100 * heavy / total:.0f} % C3+ hydrocarbons (combustibles, by moles): {Path(mechanism).name} "
            f"is built for natural gas and over-predicts propane-air flame speeds by about 25 %; use a mechanism "
            "validated for propane and butanes")
