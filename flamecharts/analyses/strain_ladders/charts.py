"""[stretch]'s chart: consumption speed against strain, extinction strain rate.

stretch_chart   left: S_c / S_L against strain rate per ladder, extinction marked; right:
                extinction strain rate against equivalence ratio per gas and condition

Placed right after the core's design charts (registry.chart's after), where the report has
always shown it; it reads stretch.csv's rows (the chart data's record tables).
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np
from matplotlib.lines import Line2D

from ...columns import gas_label
from ...outputs.charts.registry import MAX_CURVES, ChartData, chart, spread
from ...outputs.charts.style import MARKERS, colour_scale, figure, finish
from .dataset import FILE

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ...config import Study


def has_stretch(data: ChartData, study: Study) -> bool:
    return any(r["status"] == "ok" for r in data.records.get(FILE, []))


def _numbers(steps: list[float] | str) -> np.ndarray:
    """A ladder's steps: the run's list, or stretch.csv's space-separated text."""
    return np.array([float(v) for v in (steps.split() if isinstance(steps, str) else steps or [])])


def _where(r: dict) -> str:
    return f"{r['pressure_bar']:g} bar, {r['unburned_temperature_K']:g} K"


@chart("consumption_speed_vs_strain",
       "Twin counterflow flames: consumption speed over the unstretched S_L against strain rate (largest "
       "|du/dz| ahead of the flame), from low strain to extinction (×). Rising curves (Markstein number below "
       "0) burn faster when stretched. Right: extinction strain rate against equivalence ratio.",
       has_stretch, after="admissible_limits")
def stretch_chart(data: ChartData, study: Study) -> Figure:
    """S_c/S_L vs strain per ladder with the extinction point; K_ext vs phi per gas and condition."""
    ladders = [r for r in data.records.get(FILE, []) if r["status"] == "ok"]
    shown = spread(ladders, MAX_CURVES)
    fig, axes = figure(2)
    ax, axk = axes[0, 0], axes[0, 1]
    colours = colour_scale(len(shown))
    handles = {}
    for i, r in enumerate(shown):
        K, S = _numbers(r["strain_rates_1_s"]), _numbers(r["consumption_speeds_m_s"])
        label = f"{gas_label(r)}, φ {r['equivalence_ratio']:g}, {_where(r)}"
        h, = ax.plot(K, S / r["laminar_flame_speed_m_s"], color=colours[i], marker=MARKERS[i % len(MARKERS)],
                     markersize=4, lw=1.5)
        handles[label] = h
        if r["extinction_strain_rate_1_s"] is not None:
            ax.plot(K[-1], S[-1] / r["laminar_flame_speed_m_s"], "x", color="crimson", ms=10, mew=2, zorder=6)
    ax.axhline(1.0, color="0.4", lw=1.0, linestyle=":")
    burner_strain = sorted({r["characteristic_strain_1_s"] for r in ladders if r.get("characteristic_strain_1_s")})
    for c in burner_strain[:3]:
        ax.axvline(c, color="#b35900", lw=1.3, linestyle="-.")
    if burner_strain:
        handles["strain the burner imposes (dash-dot: wall\nvelocity gradient, or U/D of the bluff body)"] = Line2D(
            [], [], color="#b35900", lw=1.3, linestyle="-.")
    ax.set_xscale("log")
    ax.set_xlabel("Strain rate K [1/s]")
    ax.set_ylabel("Consumption speed / unstretched S_L [-]")
    ax.grid(True, which="both", color="0.9", lw=0.6)
    handles["extinction: last burning step (×)"] = Line2D([], [], ls="", marker="x", color="crimson", mew=2)
    curves: dict[tuple, list[dict]] = {}
    for r in ladders:
        if r["extinction_strain_rate_1_s"] is not None:
            curves.setdefault((gas_label(r), r["oxidizer"], _where(r)), []).append(r)
    kc = ["#1b6f9a", "#b2182b", "#4d9221", "#7b2d8e", "#b35900", "#555555"]
    for i, (key, rs) in enumerate(curves.items()):
        rs = sorted(rs, key=lambda r: r["equivalence_ratio"])
        axk.plot([r["equivalence_ratio"] for r in rs], [r["extinction_strain_rate_1_s"] for r in rs], color=kc[i % len(kc)],
                 marker=MARKERS[i % len(MARKERS)], lw=1.5, label=f"{key[0]} in {key[1]}, {key[2]}")
    axk.set_ylim(bottom=0)
    axk.set_xlabel("Equivalence ratio φ [-] (the ladders' values only)")
    axk.set_ylabel("Extinction strain rate K_ext [1/s]")
    axk.grid(True, color="0.9", lw=0.6)
    if curves:
        axk.legend(fontsize=7.5, frameon=False)
    note = "" if len(shown) == len(ladders) else f"\nShown: {len(shown)} of {len(ladders)} ladders; all in stretch.csv"
    return finish(fig, study, ("Strained flames: consumption speed and extinction",
                               "How does stretch change the flame? Twin premixed counterflow flames, "
                               "one ladder of strain rates per mixture" + note), handles, "Ladder")
