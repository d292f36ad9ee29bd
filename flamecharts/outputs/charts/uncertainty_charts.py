"""Kinetic uncertainty ([uncertainty]): which rate constants the flame speed hangs on.

sensitivity_chart   horizontal bars of d ln S_L / d ln k for the most sensitive reactions of
                    selected points (per gas: the point nearest phi 1; one gas: also its
                    leanest and richest burning point), each with its uncertainty factor
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ...columns import gas_label
from .registry import MAX_PANELS, ChartData, chart
from .style import figure, finish

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ...config import Study

#: Bars per panel.
BARS = 8


def has_sensitivities(data: ChartData, study: Study) -> bool:
    return study.uncertainty is not None and any(r.get("top_reactions") for r in data.rows)


def chosen_points(rows: list[dict]) -> list[dict]:
    """The points the chart shows: per gas and oxidizer, at the lowest pressure and preheat that
    has sensitivities, the one nearest phi 1; with a single gas also the leanest and richest."""
    have = [r for r in rows if r.get("top_reactions")]
    if not have:
        return []
    P = min(r["pressure_bar"] for r in have)
    T = min(r["unburned_temperature_K"] for r in have if r["pressure_bar"] == P)
    at = [r for r in have if r["pressure_bar"] == P and r["unburned_temperature_K"] == T]
    by_gas: dict[tuple, list[dict]] = {}
    for r in at:
        by_gas.setdefault((r["fuel"], r["oxidizer"], r["blend_fraction"]), []).append(r)
    chosen = []
    for sel in by_gas.values():
        sel = sorted(sel, key=lambda r: r["equivalence_ratio"])
        near = min(sel, key=lambda r: (abs(r["equivalence_ratio"] - 1.0), r["equivalence_ratio"]))
        picks = [sel[0], near, sel[-1]] if len(by_gas) == 1 else [near]
        chosen += [r for i, r in enumerate(picks) if r not in picks[:i]]
    return chosen[:MAX_PANELS]


@chart("flame_speed_sensitivity",
       "Sensitivity of the laminar flame speed to each rate constant (adjoint, d ln S_L / d ln k): the "
       "reactions that matter most, with their uncertainty factor f. Long bars with large f dominate the "
       "kinetic band.",
       has_sensitivities)
def sensitivity_chart(data: ChartData, study: Study) -> Figure:
    """Horizontal bars of the largest sensitivities of the chosen points (:func:`chosen_points`)."""
    chosen = chosen_points(data.rows)
    ncols = min(3, len(chosen))
    nrows = int(np.ceil(len(chosen) / ncols))
    fig, axes = figure(ncols, nrows, width=4.6, height=3.6)
    for ax, r in zip(axes.flat, chosen):
        top = r["top_reactions"][:BARS][::-1]
        s = [t["sensitivity"] for t in top]
        ax.barh(range(len(top)), s, color=["#2166ac" if v > 0 else "#b2182b" for v in s], height=0.65)
        ax.set_yticks(range(len(top)), [f"{t['reaction']}  (f {t['uncertainty_factor']:.3g}"
                                        + (", the study's" if t.get("factor_source") == "study" else "") + ")"
                                        for t in top],
                      fontsize=7.5)
        ax.axvline(0.0, color="0.3", lw=0.8)
        ax.set_xlabel("d ln S_L / d ln k [-]")
        ax.grid(True, axis="x", color="0.88", lw=0.7)
        band = r.get("flame_speed_kinetic_uncertainty_percent")
        ax.set_title(f"{gas_label(r)}, φ {r['equivalence_ratio']:g}, {r['pressure_bar']:g} bar, "
                     f"{r['unburned_temperature_K']:g} K\nS_L {100 * r['laminar_flame_speed_m_s']:.3g} cm/s"
                     + (f" ± {band:.2g} % (kinetics, 1σ)" if band is not None else ""), fontsize=9)
    for ax in list(axes.flat)[len(chosen):]:
        ax.set_visible(False)
    n_have = sum(1 for r in data.rows if r.get("top_reactions"))
    left = (f"\nShown: {len(chosen)} of {n_have} points with sensitivities (per gas the one nearest φ 1 at the lowest "
            "pressure and preheat; one gas: also its leanest and richest); every point's are in sensitivities.csv"
            if len(chosen) < n_have else "")
    return finish(fig, study, ("Flame-speed sensitivity to rate constants",
                               "Which reactions set S_L, and how uncertain are they? (blue: faster when k rises; "
                               "red: slower)" + left), {}, "")
