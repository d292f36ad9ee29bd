"""[stretch]'s part of report.html: the strained flames, one row per ladder.

Shown with the core's record tables, after the mechanisms compared and before the limits
(RECORDS_SECTION: the report's hook for an analysis's record tables).
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...columns import gas_label
from ...outputs.html_blocks import first_rows, html_table, optional
from .dataset import FILE

if TYPE_CHECKING:
    from ...config import Study


def records_section(study: Study, records: dict[str, list[dict]]) -> list[str]:
    """The [stretch] ladders (stretch.csv's rows in ``records``): extinction strain rate and the
    measured Markstein number per mixture; [] without ladders."""
    stretch = records.get(FILE, [])
    if not stretch:
        return []
    table = [[gas_label(r) + f" in {r['oxidizer']}", f"{r['equivalence_ratio']:g}", f"{r['pressure_bar']:g}",
              f"{r['unburned_temperature_K']:g}", r["status"],
              optional(None if r["laminar_flame_speed_m_s"] is None else 100 * r["laminar_flame_speed_m_s"], ".1f"),
              optional(r["extinction_strain_rate_1_s"], ".4g") or (r["message"] if r["status"] == "ok" else ""),
              optional(r["markstein_number_strain"], "+.2f"), optional(r["effective_lewis_number"], ".2f"),
              optional(r["markstein_number_unburned"], "+.2f"), optional(r["extinction_strain_margin"], ".3g"),
              optional(r["strained_flames"], "d"), optional(r["ladder_seconds"], ".0f")] for r in stretch]
    table, more = first_rows(table, "stretch.csv")
    return ["<h2 id='stretch'>Strained flames</h2>",
            "<p>Twin premixed counterflow flames (Cantera), nozzle to symmetry plane 400 flame thicknesses (2-30 mm) "
            "α_u/S_L, from a weakly strained flame (nozzle velocity 2 S_L) up by factors of 1.6 in nozzle velocity "
            "until the flame goes out, then the last step halved (in log) until it is below 2 %. Strain rate: the "
            "largest axial velocity gradient ahead of the flame (Law's reference strain rate); other definitions "
            "(global 2U/L, at the flame) give other numbers. Consumption speed: heat released by one flame over "
            "the fresh mixture's heat of combustion (equals S_L unstrained). Markstein number (strain): -dS_c/dK "
            "α_u/S_L² fitted through S_L and the steps below Karlovitz 0.05. In the weak-stretch limit a consumption "
            "speed answers stretch through the thermodiffusive term alone, so its Markstein number has the sign of "
            "Le_eff - 1; lean hydrogen flames are not linear down to the weakest step (15 % above S_L at Karlovitz "
            "0.01), so the fit is a secant, and near Le_eff 0.7-0.8 its sign is not reliable. The theoretical Ma_u "
            "([flame_response]) refers to the unburned gas and adds an expansion term: compare signs and trends, "
            "not values. Extinction strain rates of a burner's stabilization zone "
            "are not these numbers: read them as a ranking of mixtures. With a [burner], K_ext is set against the "
            "strain the burner imposes where its flame is held (the wall velocity gradient at the rim, or approach "
            "velocity over bluff-body size): a blowoff indicator beside the Karlovitz and Damköhler ones; a "
            "margin near or below a few means the flame base is strained toward extinction.</p>",
            html_table(["gas", "φ", "p [bar]", "T_u [K]", "status", "S_L [cm/s]", "K_ext [1/s]", "Ma (strain)",
                    "Le_eff", "Ma_u (theory)", "K_ext / burner strain", "flames", "time [s]"], table,
                   {1, 2, 3, 5, 6, 7, 8, 9, 10, 11, 12}) + more]


RECORDS_SECTION = records_section
