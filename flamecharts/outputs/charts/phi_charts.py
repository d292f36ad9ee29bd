"""Flame speed, thickness and adiabatic flame temperature against equivalence ratio.

flame_speed_chart        laminar flame speed vs equivalence ratio
thermal_thickness_chart  thermal flame thickness vs equivalence ratio
flame_temperature_chart  adiabatic flame temperature vs equivalence ratio

Layout: one panel per (pressure, unburned temperature), one curve per fuel,
oxidizer and blend fraction (big studies: the levels of registry.py's chart rule). Points that
did not give a flame are not dropped: they are marked at the floor with their status (zero, or the panel's unburned
temperature for the flame temperature chart: no flame, no temperature rise).
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import matplotlib.pyplot as plt
import numpy as np
from matplotlib.lines import Line2D

from ...columns import gas_label
from .registry import ChartData, any_flame, chart
from .style import (
    CMAP,
    LINESTYLES,
    MARKERS,
    NOT_BURNING,
    curves as curve_keys,
    finish,
    panels as panel_keys,
    sparse_log_yticks,
)

if TYPE_CHECKING:
    from matplotlib.artist import Artist
    from matplotlib.figure import Figure

    from ...config import Study


def _error_bands(ax, good: list[dict], column: str, scale: float, colour, band: str | None,
                 error_bars: str | None) -> set[str]:
    """Draw a curve's kinetic band (shaded, column ``band`` in percent) and numerical band
    (error bars, column ``error_bars``); returns which of 'band', 'bars' were drawn."""
    drawn = set()
    banded = [r for r in good if band and r.get(band) is not None]
    if banded:
        y = np.array([r[column] * scale for r in banded])
        w = np.array([r[band] / 100.0 for r in banded])
        x = [r["equivalence_ratio"] for r in banded]
        if len(set(x)) > 1:
            ax.fill_between(x, y * (1 - w), y * (1 + w), color=colour, alpha=0.18, lw=0)
        else:  # one equivalence ratio: a shaded area has no width, so the band is a broad translucent bar
            ax.errorbar(x, y, yerr=y * w, fmt="none", ecolor=colour, elinewidth=9, alpha=0.25)
        drawn.add("band")
    bars = [r for r in good if error_bars and r.get(error_bars) is not None]
    if bars:
        ax.errorbar([r["equivalence_ratio"] for r in bars], [r[column] * scale for r in bars],
                    yerr=[r[column] * scale * r[error_bars] / 100.0 for r in bars], fmt="none", ecolor=colour,
                    elinewidth=1.0, capsize=2.5)
        drawn.add("bars")
    return drawn


def _legend_extras(handles: dict, shown: set[str], companion, largest_bar: float | None = None) -> None:
    """Legend entries for what a phi chart drew beyond its curves (axis markers, rings, bands, companion);
    ``largest_bar``: the largest numerical band drawn [%], named since bars under about 1 % hide
    under the markers."""
    for status, marker in NOT_BURNING:
        if status in shown:
            text = ("no flame (at the floor, colour of its curve)" if status == "no_flame"
                    else "solver failed or not solved yet (at the floor)")
            handles[text] = Line2D([], [], color="0.35", marker=marker, markerfacecolor="none" if marker == "v" else "0.35",
                                   linestyle="none", markersize=7)
    if "warned" in shown:  # a ring round every burning point with a warning (design.point_warnings)
        handles["red ring: a warning in results.csv: outside a range\nthe method or mechanism covers, or the flame may\n"
                "be thermodiffusively unstable (Lewis number)"] = Line2D(
            [], [], marker="o", markersize=9, markerfacecolor="none", markeredgecolor="#b2182b", linestyle="none")
    if "band" in shown:
        handles["shaded: kinetic uncertainty, 1 sigma\n(first order, rate-constant factors)"] = plt.Rectangle(
            (0, 0), 1, 1, color="0.35", alpha=0.25, lw=0)
    if "bars" in shown:
        handles["bars: numerical (grid) error band" + (f"\n(largest ±{largest_bar:.2g} %)" if largest_bar is not None
                                                       else "")] = Line2D([], [], color="0.35", marker="|", markersize=9,
                                                              linestyle="none")
    if companion is not None:
        handles[companion[1]] = Line2D([], [], color="0.35", linestyle=":", marker="o", markerfacecolor="none",
                                       markersize=4)


def phi_chart(data: ChartData, study: Study, column: str, scale: float, ylabel: str, title: tuple[str, str],
              companion: tuple[str, str] | None = None, floor_at_preheat: bool = False,
              band: str | None = None, error_bars: str | None = None, log_y: bool = False) -> Figure:
    """One panel per (pressure, preheat), one curve per gas. ``band``: a column of percent
    drawn as a shaded band around each curve (the kinetic 1-sigma band); ``error_bars``: a
    column of percent drawn as error bars (the numerical band). ``log_y``: a logarithmic axis
    (quantities spanning decades), the points without a flame then at half its smallest value."""
    rows = data.shown_rows  # big studies: the chart rule of registry.py picks the levels drawn
    panels = panel_keys(rows)
    curves = curve_keys(rows)
    oxidizers = {c[1] for c in curves}
    n = len(panels)
    ncols = min(3, int(np.ceil(np.sqrt(n))))
    nrows = int(np.ceil(n / ncols))
    fig, axes = plt.subplots(nrows, ncols, figsize=(max(10.0, 4.4 * ncols + 3.5), 3.5 * nrows + 2.0),
                             squeeze=False, layout="constrained", sharey=True)  # one scale: panels compare
    colours = plt.get_cmap(CMAP)(np.linspace(0.0, 0.85, max(len(curves), 1)))
    handles: dict[str, Artist] = {}
    shown: set[str] = set()
    positive = [r[column] * scale for r in rows if r["status"] == "ok" and r.get(column) and r[column] > 0]
    for ax, (P, T) in zip(axes.flat, panels):
        floor = T * scale if floor_at_preheat else 0.5 * min(positive) if log_y and positive else 0.0
        for ci, ck in enumerate(curves):
            sel = data.series.get(ck + (P, T), [])
            good = [r for r in sel if r["status"] == "ok" and r[column] is not None]
            label = gas_label(sel[0]) if sel else ck[0]
            if len(oxidizers) > 1:
                label += f" in {ck[1]}"
            style = dict(color=colours[ci], marker=MARKERS[ci % len(MARKERS)],
                         linestyle=LINESTYLES[(ci // len(MARKERS)) % len(LINESTYLES)], markersize=5, lw=1.6)
            h, = ax.plot([r["equivalence_ratio"] for r in good], [r[column] * scale for r in good],
                         label=label, **style)
            handles.setdefault(label, h)  # a curve with no flame at all still has its legend entry
            shown |= _error_bands(ax, good, column, scale, colours[ci], band, error_bars)
            warned = [r for r in good if r.get("warnings")]
            if warned:
                ax.scatter([r["equivalence_ratio"] for r in warned], [r[column] * scale for r in warned],
                           marker="o", s=110, facecolors="none", edgecolors="#b2182b", linewidths=1.3, zorder=6)
                shown.add("warned")
            if companion is not None:
                ax.plot([r["equivalence_ratio"] for r in good], [r[companion[0]] * scale for r in good],
                        color=colours[ci], marker=MARKERS[ci % len(MARKERS)], markerfacecolor="none",
                        linestyle=":", markersize=4, lw=1.2)
            for status, marker in NOT_BURNING:
                bad = [r for r in sel if r["status"] == status or (status == "failed" and r["status"] == "pending")]
                if bad:
                    ax.scatter([r["equivalence_ratio"] for r in bad], np.full(len(bad), floor), marker=marker,
                               edgecolors=colours[ci], facecolors="none" if marker == "v" else colours[ci],
                               s=40, zorder=5)
                    shown.add(status)
        ax.set_title(f"p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.set_xlabel("Equivalence ratio φ [-]")
        ax.set_ylabel(ylabel)
        ax.tick_params(labelleft=True)  # shared scale, but every panel keeps its numbers
        ax.grid(True, color="0.88", lw=0.7)
    if log_y and positive:
        for ax in axes.flat:
            ax.set_yscale("log")
            sparse_log_yticks(ax)  # 20, 50, 100 ppm rather than 2 x 10^1
        axes.flat[0].set_ylim(bottom=0.4 * min(positive))
    elif not floor_at_preheat:
        axes.flat[0].set_ylim(bottom=0.0)
    elif shown & {"no_flame", "failed"}:  # points without a flame sit at the preheat: show it
        axes.flat[0].set_ylim(bottom=min(T for _, T in panels) * scale)
    for ax in list(axes.flat)[n:]:
        ax.set_visible(False)
    bars = [r[error_bars] for r in rows if error_bars and r["status"] == "ok" and r.get(error_bars) is not None]
    _legend_extras(handles, shown, companion, max(bars) if bars else None)
    return finish(fig, study, (title[0], title[1] + data.note()), handles, "Fuel (blend as mole fraction of fuel gas)")


@chart("flame_speed_vs_equivalence_ratio",
       "Laminar flame speed of each fuel and blend against equivalence ratio, a panel per pressure and "
       "preheat. Higher curves flash back more easily at the same port velocity.")
def flame_speed_chart(data: ChartData, study: Study) -> Figure:
    """Laminar flame speed [cm/s] vs equivalence ratio: what each mixture's flame runs at; with
    [uncertainty], the kinetic band shaded and (error_bars = true) the numerical band as bars."""
    u = study.uncertainty
    return phi_chart(data, study, "laminar_flame_speed_m_s", 100.0, "Laminar flame speed S_L [cm/s]",
                      ("Laminar flame speed vs equivalence ratio",
                       "How fast does each mixture's flame run? (flashback: compare with port velocity)"),
                      band="flame_speed_kinetic_uncertainty_percent" if u is not None else None,
                      error_bars="flame_speed_numerical_error_percent" if u is not None and u.error_bars else None)


@chart("thermal_thickness_vs_equivalence_ratio",
       "Thermal thickness (solid) and reaction-zone thickness (dotted). Thinner flames quench in narrower "
       "gaps and need finer grids in CFD.")
def thermal_thickness_chart(data: ChartData, study: Study) -> Figure:
    """Thermal thickness [mm] vs equivalence ratio: how thick the flame is."""
    return phi_chart(data, study, "thermal_thickness_mm", 1.0, "Flame thickness [mm]",
                      ("Flame thickness vs equivalence ratio",
                       "How thick is each flame? Solid: thermal δ_T; dotted: reaction zone"),
                      companion=("reaction_zone_thickness_mm",
                                 "dotted: reaction zone thickness\n(heat-release full width at half maximum);\n"
                                 "solid: thermal thickness (T_b − T_u)/max|dT/dx|"))


@chart("adiabatic_flame_temperature_vs_equivalence_ratio",
       "Adiabatic flame temperature (burned gas of the free flame) of each fuel and blend against equivalence "
       "ratio, a panel per pressure and preheat; points without a flame sit at the preheat temperature. Hotter flames make more "
       "thermal NOx and heat the burner more.",
       any_flame)
def flame_temperature_chart(data: ChartData, study: Study) -> Figure:
    """Adiabatic flame temperature [K] vs equivalence ratio: how hot each mixture burns."""
    return phi_chart(data, study, "adiabatic_flame_temperature_K", 1.0, "Adiabatic flame temperature T_ad [K]",
                      ("Adiabatic flame temperature vs equivalence ratio",
                       "How hot does each mixture burn? (no flame: marked at the preheat temperature)"),
                      floor_at_preheat=True)
