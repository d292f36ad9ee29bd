"""Where each burner criterion holds: the range of the data its constant was fitted on.

A criterion outside its range gives no margin: the margin is blank, the reason is said
(results.csv column ``criteria_not_assessed``, limits.csv, the report), and neither a
verdict nor a limit rests on it. Every range comes from the source of the constant:

==========  ==========================================  =======================================
criterion   constant (physics.indicators)               fitted on
==========  ==========================================  =======================================
flashback   Pe_F = 13 (critical gradient)               laminar port flow, cold walls, ~1 atm,
                                                        room temperature; methane and hydrogen
blowoff     Ka_B = 0.23 (Reed 1967)                     laminar single port flames of lean to
                                                        stoichiometric hydrocarbon-air mixtures,
                                                        ~1 atm, room temperature
stabilizer  C_BO (Zukoski-Marble Damkoehler scaling)    no universal value: the user's own rig
==========  ==========================================  =======================================

The pressure and preheat ranges allow a factor 2 on the ~1 atm of the data and 250-400 K
around its room temperature: common practice without source (the constants are
ratios that carry pressure and temperature through S_L and alpha_u, which is why some
room is given at all; how much is a judgement). Wall temperature cannot be checked
(flamecharts has no wall temperature): every constant is from cold-wall data, and a hot
port rim flashes back earlier.

domain_reasons   why a criterion is not assessed at a point ('' reasons: assessed)
transition_gradient  the wall velocity gradient between laminar and turbulent port flow
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .elementwise import Real

#: Port Reynolds number below which the port flow is laminar (common practice for pipe
#: flow), and above which the turbulent (Blasius) wall gradient holds (Blasius's law is
#: fitted on about 4e3-1e5; common practice for the end of transition).
LAMINAR_REYNOLDS = 2300.0
TURBULENT_REYNOLDS = 4000.0


@dataclass(frozen=True)
class Domain:
    """The range of the data a criterion's constant was fitted on."""

    laminar_only: bool                        # port Reynolds number at most LAMINAR_REYNOLDS
    pressure_bar: tuple[float, float]
    unburned_temperature_K: tuple[float, float]
    max_equivalence_ratio: float | None       # None: any
    min_deficient_lewis: float | None         # Lewis number of the deficient reactant; None: any
    source: str
    separate_ports_only: bool = False         # single port flames, not a deck of merged flames


#: Criterion -> its domain. Sources beside each.
DOMAINS = {
    # Lewis & von Elbe, Combustion, Flames and Explosions of Gases (3rd ed., 1987): critical
    # gradients measured in laminar flow through cooled tubes at about 1 atm and room
    # temperature, methane and hydrogen among them (from memory); Pe_F is derived from both
    # (physics.indicators.DEFAULTS). Turbulent boundary-layer flashback is not predicted by
    # the laminar critical gradients (Eichler, Baumgartner & Sattelmayer, J. Eng. Gas
    # Turbines Power 134 (2012) 011502; from memory).
    "flashback": Domain(True, (0.5, 2.0), (250.0, 400.0), None, None,
                        "laminar cold-wall tube data near 1 atm and room temperature (Lewis & von Elbe 1987)"),
    # Reed, Combust. Flame 11 (1967) 177: fitted on lean to stoichiometric hydrocarbon port
    # flames. Edmondson & Heap (Combust. Flame 16, 1971, 161; volume from memory): the
    # Karlovitz number at blowoff "increases rapidly" as rich primary mixtures get richer
    # (secondary air feeds the flame base). Hydrogen's stretched flame base strengthens
    # (Lewis number of the deficient reactant well below 1): this tool's own extinction
    # Karlovitz numbers K_ext alpha_u / S_L^2 are 0.65 and 3.8 for hydrogen-air at phi 0.7
    # and 0.5 against 0.34 for stoichiometric methane (docs/flame-response.md, [stretch]). 0.8 keeps the
    # hydrocarbons (Le of lean methane about 0.96) and blends up to about half hydrogen by
    # volume (heat-release weighted Le about 0.82): common practice without source.
    # Reed's data are flames on single tubes in open air; on a deck of closely spaced ports
    # (perforated plate) the flames merge and hold each other (common practice without source).
    "blowoff": Domain(True, (0.5, 2.0), (250.0, 400.0), 1.0, 0.8,
                      "lean to stoichiometric hydrocarbon port flames near 1 atm and room temperature "
                      "(Reed 1967; Edmondson & Heap 1971)", separate_ports_only=True),
    # The Damkoehler scaling U_BO = C_BO D / tau_c (Zukoski & Marble 1956; Shanbhogue, Husain &
    # Lieuwen 2009) holds with a constant of the user's own stabilizer only.
    "stabilizer": Domain(False, (0.0, float("inf")), (0.0, float("inf")), None, None,
                         "C_BO of the user's own stabilizer (Shanbhogue, Husain & Lieuwen 2009)"),
}


def domain_reasons(domain: Domain, *, reynolds: float | None, pressure_bar: float, unburned_temperature_K: float,
                   equivalence_ratio: float, deficient_lewis: float | None, layout: str = "separate") -> list[str]:
    """Why a criterion of ``domain`` is not assessed at a point: [] inside its range, else
    one short reason per quantity outside it (SI units but pressure in bar).

    >>> d = DOMAINS["blowoff"]
    >>> domain_reasons(d, reynolds=800.0, pressure_bar=1.0, unburned_temperature_K=300.0,
    ...                equivalence_ratio=0.9, deficient_lewis=0.97)
    []
    >>> domain_reasons(d, reynolds=3.7e5, pressure_bar=10.0, unburned_temperature_K=650.0,
    ...                equivalence_ratio=1.2, deficient_lewis=0.4)  # doctest: +NORMALIZE_WHITESPACE
    ['turbulent port flow (Re 3.7e+05 > 2300)', '10 bar outside 0.5-2 bar',
     '650 K preheat outside 250-400 K', 'rich (phi 1.2 > 1)', 'Lewis number 0.4 < 0.8 (hydrogen-rich)']
    """
    out = []
    if domain.separate_ports_only and layout != "separate":
        out.append("a deck of merged port flames (the data are single port flames)")
    if domain.laminar_only and reynolds is not None and reynolds > LAMINAR_REYNOLDS:
        out.append(f"{'turbulent' if reynolds >= TURBULENT_REYNOLDS else 'transitional'} port flow "
                   f"(Re {reynolds:.3g} > {LAMINAR_REYNOLDS:g})")
    lo, hi = domain.pressure_bar
    if not lo <= pressure_bar <= hi:
        out.append(f"{pressure_bar:g} bar outside {lo:g}-{hi:g} bar")
    lo, hi = domain.unburned_temperature_K
    if not lo <= unburned_temperature_K <= hi:
        out.append(f"{unburned_temperature_K:g} K preheat outside {lo:g}-{hi:g} K")
    if domain.max_equivalence_ratio is not None and equivalence_ratio > domain.max_equivalence_ratio + 1e-9:
        out.append(f"rich (phi {equivalence_ratio:g} > {domain.max_equivalence_ratio:g})")
    if (domain.min_deficient_lewis is not None and deficient_lewis is not None
            and deficient_lewis < domain.min_deficient_lewis):
        out.append(f"Lewis number {deficient_lewis:.2g} < {domain.min_deficient_lewis:g} (hydrogen-rich)")
    return out


def transition_gradient(Re: Real, laminar: Real, turbulent_at: Real) -> Real:
    """Wall velocity gradient [1/s] in transitional port flow, LAMINAR_REYNOLDS < Re <
    TURBULENT_REYNOLDS: linear in Re between the laminar gradient at LAMINAR_REYNOLDS
    (``laminar``, which at fixed port and gas scales with Re) and the turbulent one at
    TURBULENT_REYNOLDS (``turbulent_at``), so the gradient has no step at a limit search's
    bracket (common practice without source: neither law holds in transition, and no
    criterion is assessed there). Outside the interval, the law that holds there. Numbers or
    arrays alike.

    >>> transition_gradient(2300.0, 1000.0, 3000.0), transition_gradient(4000.0, 1000.0, 3000.0)
    (1000.0, 3000.0)
    >>> transition_gradient(3150.0, 1000.0, 3000.0)
    2000.0
    """
    w = np.minimum(np.maximum((Re - LAMINAR_REYNOLDS) / (TURBULENT_REYNOLDS - LAMINAR_REYNOLDS), 0.0), 1.0)
    out = (1.0 - w) * laminar + w * turbulent_at
    return float(out) if np.ndim(out) == 0 else out
