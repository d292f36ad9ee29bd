"""[flame_response]' part of report.html: the flame's response to stretch per gas and condition.

Shown for every study whose flames have Lewis numbers (all do): with [flame_response] also the
Zeldovich and Markstein numbers and the cellular flag, without it a line saying how to get them.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...outputs.html_blocks import first_rows, html_table
from ...outputs.report import by_gas_and_condition
from .table import of

if TYPE_CHECKING:
    from ...config import Study


def response_section(study: Study, rows: list[dict]) -> list[str]:
    """Flame response to stretch per gas and condition: Lewis numbers, and with [flame_response]
    the Zeldovich and Markstein numbers and where the flame is thermodiffusively unstable."""
    ok = [r for r in rows if r["status"] == "ok" and r.get("lewis_number_fuel") is not None]
    if not ok:
        return []
    groups = by_gas_and_condition(ok)
    table = []
    for (gas, ox, P, T), rs in groups.items():
        rs = sorted(rs, key=lambda r: r["equivalence_ratio"])
        cellular = [r["equivalence_ratio"] for r in rs if r.get("instability") == "cellular"]
        ze = [r["zeldovich_number"] for r in rs if r.get("zeldovich_number") is not None]
        ma = [(r["markstein_number_unburned"], r["equivalence_ratio"]) for r in rs
              if r.get("markstein_number_unburned") is not None]
        le_d = [r["lewis_number_fuel"] if r["equivalence_ratio"] <= 1 else r["lewis_number_oxygen"] for r in rs]
        table.append([f"{gas} in {ox}", f"{P:g}", f"{T:g}", f"{min(le_d):.2f}-{max(le_d):.2f}",
                      f"{min(ze):.1f}-{max(ze):.1f}" if ze else "",
                      f"{min(ma)[0]:+.2f} (φ {min(ma)[1]:g})" if ma else "",
                      ", ".join(f"{v:g}" for v in cellular) if cellular else ("none" if ze else "")])
    table, more = first_rows(table, "results.csv")
    fr = of(study)
    asked = fr is not None and fr.zeldovich
    return ["<h2 id='flame-response'>Flame response to stretch</h2>",
            "<p>Lean hydrogen-rich flames (Lewis number of the deficient reactant well below 1) burn faster where "
            "they are stretched or curved than their unstretched S_L: they wrinkle into cells and flash back earlier "
            "than the S_L-based indicators say. Lewis numbers of the fresh mixture (mixture-averaged transport; "
            "blends weighted by heat release, Law et al. 2005)"
            + ("; Zeldovich number from two extra flames per point with the inert moved "
               f"{fr.inert_step:g} either way (Egolfopoulos &amp; Law 1990); effective Lewis number "
               "(Matalon, Cui &amp; Bechtold 2003); Markstein number relative to the unburned gas (Clavin &amp; "
               "Williams 1982); cellular where Ze (Le_eff - 1) &lt; -2 (Sivashinsky 1977). Theoretical numbers: "
               "compare signs and trends with measurements, not values. A point can be cellular with Ma_u above 0: "
               "Ma_u adds the expansion term σ ln σ/(σ - 1) to the thermodiffusive one that sets the cellular "
               "instability."
               if asked and fr is not None else
               ". Add a [flame_response] table to the study for the Zeldovich and Markstein numbers "
                             "and the instability flag (two extra flames per point).") + "</p>",
            html_table(["gas", "p [bar]", "T_u [K]", "Le deficient reactant", "Ze", "lowest Ma_u (φ)", "cellular at φ"],
                   table, {1, 2})
            + more]


SECTION = response_section
