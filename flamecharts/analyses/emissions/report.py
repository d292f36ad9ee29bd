"""[emissions]' part of report.html: its key number and its section."""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...columns import gas_label
from ...outputs.html_blocks import escape, first_rows, html_table
from ...physics.limits import nox_scope
from .dataset import emission_sentences
from .table import of

if TYPE_CHECKING:
    from ...config import Study


def key_numbers(study: Study, ok: list[dict]) -> list[list[str]]:
    """The report's key numbers of [emissions]: the highest NOx at the design residence time among
    the burning points ``ok``; [] without [emissions] or values."""
    out: list[list[str]] = []
    em = of(study)
    have = [r for r in ok if r.get("nox_ppmvd_at_reference_o2") is not None]
    if em is not None and have:
        w = max(have, key=lambda r: r["nox_ppmvd_at_reference_o2"])
        out.append([f"Highest NOx after {1e3 * em.design_residence_time_s:g} ms (dry, {em.reference_oxygen_percent:g} % O2)",
                    f"{w['nox_ppmvd_at_reference_o2']:.3g} ppm", f"{gas_label(w)}, φ {w['equivalence_ratio']:g}, "
                    f"{w['pressure_bar']:g} bar, {w['unburned_temperature_K']:g} K (laminar flame and plug flow: a "
                    "screening estimate)"])
    return out


def emissions_section(study: Study, rows: list[dict]) -> list[str]:
    """[emissions]: how they are computed and reported, one sentence per blended gas and condition,
    and the design-time values of every burning point (emissions.csv has every time)."""
    em = of(study)
    if em is None:
        return []
    t, ref = 1e3 * em.design_residence_time_s, em.reference_oxygen_percent
    have = [r for r in rows if r["status"] == "ok" and r.get("nox_ppmvd_at_reference_o2") is not None]
    missing = [r for r in rows if r["status"] == "ok" and r.get("emissions_note")]
    table, more = first_rows(have, "results.csv and emissions.csv")
    basis = "gross (higher)" if em.heating_value == "gross" else "net (lower)"
    parts = ["<h2 id='emissions'>Emissions</h2>",
             f"<p>The burned gas of each burning flame after {', '.join(f'{1e3 * v:g}' for v in em.residence_times_s)} "
             f"ms from its peak heat release: read from the flame's own profile while the time lies inside its "
             f"domain, then an adiabatic constant-pressure plug flow on the same mechanism (Cantera's reactor). "
             f"Concentrations are ppm by volume of the dry gas corrected to {ref:g} % O2 (X (20.9 − {ref:g}) / "
             f"(20.9 − O2), US EPA Method 19's form); NOx is NO + NO2, counted as NO2 for mass"
             + (f"; mg/kWh are per kWh of the fuel gas's heat input on its {basis} heating value (EU gas appliances "
                "are limited on the gross value, Regulation 813/2013)" if em.specific else "")
             + f". The tables and charts read {t:g} ms. The plug flow stays adiabatic, so its gas stays at flame "
             "temperature: its NO grows toward the burned state's equilibrium NO (given for scale, far above any "
             "real exhaust), and its CO levels off at the hot gas's equilibrium CO, which is not a stack value: "
             "a flue gas that cools burns most of that CO out. Hydrogen is not counted as unburned fuel (the hot "
             "gas holds equilibrium H2 whatever the fuel). "
             f"Mechanism: {escape(nox_scope(study.mechanism))}. A laminar flame with a plug flow has no unmixedness, "
             "recirculation or heat loss, which set a real combustor's NOx: compare blends and settings with these "
             "numbers, and confirm absolute values by measurement.</p>"]
    sentences = emission_sentences(study, rows)
    if sentences:
        parts.append("<ul>" + "".join(f"<li>{escape(x)}</li>" for x in sentences) + "</ul>")
    if missing:
        parts.append(f"<p>{len(missing)} burning point(s) have no emissions: {escape(missing[0]['emissions_note'])}.</p>")

    def num(v: float | None) -> str:
        return "" if v is None else f"{v:,.0f}" if abs(v) >= 1000 else f"{v:.3g}"
    at = f" [ppm @{ref:g} % O2]"
    header = ["gas", "φ", "p [bar]", "T_u [K]", "NOx" + at, "CO" + at, "flame-zone NO" + at, "equilibrium NO" + at,
              "equilibrium CO" + at, "read from"] + (["NOx [mg/kWh]", "CO [mg/kWh]"] if em.specific else [])
    parts.append(more + html_table(header, [
        [gas_label(r), f"{r['equivalence_ratio']:g}", f"{r['pressure_bar']:g}", f"{r['unburned_temperature_K']:g}",
         num(r["nox_ppmvd_at_reference_o2"]), num(r["co_ppmvd_at_reference_o2"]),
         num(r["flame_zone_no_ppmvd_at_reference_o2"]), num(r["equilibrium_no_ppmvd_at_reference_o2"]),
         num(r["equilibrium_co_ppmvd_at_reference_o2"]), "plug flow" if r["beyond_flame_domain"] else "flame profile"]
        + ([num(r["nox_mg_kwh"]), num(r["co_mg_kwh"])] if em.specific else []) for r in table],
        set(range(1, 9)) | ({10, 11} if em.specific else set())))
    return parts


SECTION = emissions_section
KEY_NUMBERS = key_numbers
