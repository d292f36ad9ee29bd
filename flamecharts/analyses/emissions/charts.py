"""Emissions ([emissions]): NOx against equivalence ratio and blend, CO burnout against residence time.

nox_phi_chart     NOx (dry, at the reference O2) after the design residence time against phi,
                  a panel per pressure and preheat, a curve per gas
nox_blend_chart   the same against the blend fraction at equal phi: what the blend gas costs in NOx
co_burnout_chart  CO against residence time at each gas's leanest burning phi: how long the
                  burned gas needs to burn its CO out near the lean limit

Every value is the burned gas of a laminar flame followed by an adiabatic plug flow
(chemistry.emissions): a screening estimate without the unmixedness, recirculation and heat
loss of a real combustor, which the charts' subtitles say.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np
from matplotlib.lines import Line2D

from ...columns import gas_label
from ...outputs.charts.phi_charts import phi_chart
from ...outputs.charts.registry import MAX_CURVES, ChartData, chart, spread
from ...outputs.charts.style import MARKERS, colour_scale, empty_note, figure, finish, panels as panel_keys, sparse_log_yticks
from .table import of

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ...config import Study

#: What every emissions chart says of its numbers.
SCREENING = "laminar flame + adiabatic plug flow: no unmixedness, recirculation or heat loss"


def has_emissions(data: ChartData, study: Study) -> bool:
    return of(study) is not None and any(r.get("nox_ppmvd_at_reference_o2") is not None for r in data.rows)


def several_blends_with_emissions(data: ChartData, study: Study) -> bool:
    return has_emissions(data, study) and len(study.blend_fractions) > 1


def _reference(study: Study) -> tuple[float, float]:
    em = of(study)
    assert em is not None  # drawn only with [emissions]
    return em.reference_oxygen_percent, 1e3 * em.design_residence_time_s


@chart("nox_vs_equivalence_ratio",
       "NOx (NO + NO2, dry, at the study's reference O2) after the design residence time against equivalence "
       "ratio, a panel per pressure and preheat, on a logarithmic axis: thermal NO grows steeply with flame "
       "temperature, so the curves peak near stoichiometric and fall by decades on the lean side.",
       has_emissions)
def nox_phi_chart(data: ChartData, study: Study) -> Figure:
    ref, t = _reference(study)
    return phi_chart(data, study, "nox_ppmvd_at_reference_o2", 1.0, f"NOx at {ref:g} % O2, dry [ppm]",
                      ("NOx vs equivalence ratio",
                       f"How much NOx after {t:g} ms of burned gas? ({SCREENING}; log scale)"), log_y=True)


@chart("nox_vs_blend_fraction",
       "NOx after the design residence time against the blend fraction, one colour per equivalence ratio: solid at "
       "equal equivalence ratio (the burner's air setting stays), dashed at the unblended gas's adiabatic flame "
       "temperature (the blend burned leaner to match it), which separates the blend's chemistry from its hotter "
       "flame.",
       several_blends_with_emissions)
def nox_blend_chart(data: ChartData, study: Study) -> Figure:
    ref, t = _reference(study)
    rows = [r for r in data.shown_rows if r["status"] == "ok" and r.get("nox_ppmvd_at_reference_o2") is not None]
    panels = panel_keys(data.shown_rows)
    phis = spread(sorted({r["equivalence_ratio"] for r in rows}), MAX_CURVES)
    gases = sorted({(r["fuel"], r["oxidizer"]) for r in rows})
    ncols = min(3, len(panels))
    fig, axes = figure(ncols, int(np.ceil(len(panels) / ncols)), width=4.6, height=3.6)
    colours = colour_scale(len(phis))
    handles: dict = {}
    dashed = False
    for ax, (P, T) in zip(axes.flat, panels):
        at = [r for r in rows if r["pressure_bar"] == P and r["unburned_temperature_K"] == T]
        for ci, phi in enumerate(phis):
            for gi, gas in enumerate(gases):
                sel = sorted((r for r in at if r["equivalence_ratio"] == phi and (r["fuel"], r["oxidizer"]) == gas),
                             key=lambda r: r["blend_fraction"])
                if not sel:
                    continue
                label = f"φ {phi:g}" + (f", {gas[0]} in {gas[1]}" if len(gases) > 1 else "")
                h, = ax.plot([100 * r["blend_fraction"] for r in sel], [r["nox_ppmvd_at_reference_o2"] for r in sel],
                             color=colours[ci], marker=MARKERS[gi % len(MARKERS)], lw=1.6, markersize=5)
                handles.setdefault(label, h)
                equal = [r for r in sel if r.get("nox_ppmvd_at_reference_o2_equal_flame_temperature") is not None]
                if len(equal) > 1:
                    ax.plot([100 * r["blend_fraction"] for r in equal],
                            [r["nox_ppmvd_at_reference_o2_equal_flame_temperature"] for r in equal], color=colours[ci],
                            marker=MARKERS[gi % len(MARKERS)], markerfacecolor="none", lw=1.3, ls="--", markersize=5)
                    dashed = True
        if not at:
            empty_note(ax, "no burning point with emissions at this pressure and preheat")
        ax.set_title(f"p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel(f"NOx at {ref:g} % O2, dry [ppm]")
        ax.set_ylim(bottom=0.0)
        ax.grid(True, color="0.88", lw=0.7)
    for ax in list(axes.flat)[len(panels):]:
        ax.set_visible(False)
    handles["solid: at equal φ"] = Line2D([], [], color="0.35", lw=1.6)
    if dashed:
        handles["dashed: at the unblended gas's flame temperature\n(the blend at its matched, leaner φ)"] = Line2D(
            [], [], color="0.35", lw=1.3, ls="--", marker="o", markerfacecolor="none")
    return finish(fig, study, ("NOx vs blend fraction at equal equivalence ratio" + (" and equal flame temperature"
                                                                                     if dashed else ""),
                               f"What does the blend gas cost in NOx after {t:g} ms? ({SCREENING})" + data.note()),
                  handles, "Equivalence ratio")


def _leanest(rows: list[dict]) -> list[dict]:
    """Per gas, pressure and preheat, the burning point of lowest phi that has emissions."""
    best: dict[tuple, dict] = {}
    for r in rows:
        if r["status"] != "ok" or not r.get("emissions_by_time"):
            continue
        k = (r["fuel"], r["oxidizer"], r["blend_fraction"], r["pressure_bar"], r["unburned_temperature_K"])
        if k not in best or r["equivalence_ratio"] < best[k]["equivalence_ratio"]:
            best[k] = r
    return list(best.values())


@chart("co_burnout",
       "CO (dry, at the reference O2) against residence time at each gas's leanest burning swept equivalence ratio, "
       "a panel per pressure and preheat: the leaner and cooler the burned gas, the slower its CO burns out; open "
       "markers lie beyond the flame's own domain (adiabatic plug flow), the dotted line is the hot gas's "
       "equilibrium CO where the plug flow levels off (not a stack value: a cooling flue gas burns most of it).",
       has_emissions)
def co_burnout_chart(data: ChartData, study: Study) -> Figure:
    ref, _ = _reference(study)
    lean = _leanest(data.shown_rows)
    panels = panel_keys(data.shown_rows)
    ncols = min(3, len(panels))
    fig, axes = figure(ncols, int(np.ceil(len(panels) / ncols)), width=4.6, height=3.6)
    gases = sorted({(r["fuel"], r["oxidizer"], r["blend_fraction"]) for r in lean})
    colours = colour_scale(len(gases))
    handles: dict = {}
    dotted = False
    for ax, (P, T) in zip(axes.flat, panels):
        drawn = False
        for gi, gas in enumerate(gases):
            r = next((r for r in lean if (r["fuel"], r["oxidizer"], r["blend_fraction"]) == gas
                      and r["pressure_bar"] == P and r["unburned_temperature_K"] == T), None)
            if r is None:
                continue
            pts = [e for e in r["emissions_by_time"] if e.get("co_ppmvd_at_reference_o2") is not None]
            if not pts:
                continue
            x, y = [e["residence_time_ms"] for e in pts], [max(e["co_ppmvd_at_reference_o2"], 1e-3) for e in pts]
            h, = ax.plot(x, y, color=colours[gi], lw=1.6)
            open_ = [e["beyond_flame_domain"] for e in pts]
            ax.scatter(x, y, s=30, zorder=5, edgecolors=colours[gi],
                       facecolors=["none" if b else colours[gi] for b in open_])
            handles.setdefault(f"{gas_label(r)}, φ {r['equivalence_ratio']:g}", h)
            eq = r.get("equilibrium_co_ppmvd_at_reference_o2")
            if eq:
                ax.axhline(max(eq, 1e-3), color=colours[gi], ls=":", lw=1.1)
                dotted = True
            drawn = True
        if not drawn:
            empty_note(ax, "no burning point with emissions at this pressure and preheat")
        ax.set_yscale("log")
        sparse_log_yticks(ax)
        ax.set_title(f"p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.set_xlabel("Residence time after the peak heat release [ms]")
        ax.set_ylabel(f"CO at {ref:g} % O2, dry [ppm]")
        ax.grid(True, which="both", color="0.9", lw=0.6)
    for ax in list(axes.flat)[len(panels):]:
        ax.set_visible(False)
    handles["open marker: beyond the flame's domain (adiabatic plug flow)"] = Line2D(
        [], [], marker="o", markerfacecolor="none", markeredgecolor="0.35", linestyle="none")
    if dotted:
        handles["dotted: equilibrium CO of the hot burned gas\n(where the adiabatic plug flow levels off;\nnot a stack value)"] \
            = Line2D([], [], color="0.35", ls=":", lw=1.1)
    return finish(fig, study, ("CO burnout at the leanest burning equivalence ratio swept",
                               f"How long until the CO of the leanest flames burns out? ({SCREENING})" + data.note()),
                  handles, "Gas, leanest burning φ")
