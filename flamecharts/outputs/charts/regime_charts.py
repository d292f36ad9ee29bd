"""The regime diagram of premixed turbulent combustion ([premixer] with a [burner]).

regime_chart   u'/S_L against l_t/l_F (log-log) with the usual boundary lines (Re_t = 1, Da = 1,
               Ka = 1, Ka = 100; Peters 2000, Borghi 1985), every burning point of the study on
               it, one colour per gas and one marker per pressure

Where a premixer's flames sit decides which models apply: laminar flame criteria do not (the
port is turbulent), flamelet turbulent flame speed correlations fit the corrugated-flamelet and
thin-reaction-zone regimes, and beyond Ka = 100 the reaction zone itself is disturbed.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np
from matplotlib.lines import Line2D

from ...columns import gas_label
from ...physics.turbulence import regime_lines
from .registry import ChartData, chart
from .style import MARKERS, colour_scale, figure, finish

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ...config import Study

#: The diagram's regions: label, (x, y) in the data coordinates of l_t/l_F and u'/S_L.
REGION_LABELS = (("laminar", (0.3, 0.3)), ("wrinkled\nflamelets", (30.0, 0.35)),
                 ("corrugated\nflamelets", (3e3, 3.0)), ("thin reaction zones", (30.0, 15.0)),
                 ("broken reaction zones", (3.0, 300.0)))


def has_regimes(data: ChartData, study: Study) -> bool:
    return any(r.get("karlovitz_number") is not None for r in data.rows)


def _xy(r: dict) -> tuple[float, float]:
    l_F = r["unburned_thermal_diffusivity_m2_s"] / r["laminar_flame_speed_m_s"]
    return 1e-3 * r["integral_length_mm"] / l_F, r["rms_velocity_m_s"] / r["laminar_flame_speed_m_s"]


@chart("turbulent_regime_diagram",
       "Where each burning point's flame sits among the regimes of premixed turbulent combustion: u'/S_L against "
       "l_t/l_F (l_F = alpha_u/S_L) with the lines Re_t = 1, Da = 1, Ka = 1 and Ka = 100 (Peters 2000). Laminar "
       "flame criteria do not apply in a turbulent premixer; flamelet turbulent flame speed correlations fit the "
       "corrugated flamelets and thin reaction zones.",
       has_regimes)
def regime_chart(data: ChartData, study: Study) -> Figure:
    rows = [r for r in data.rows if r.get("karlovitz_number") is not None]
    fig, axes = figure(1, width=7.0, height=5.6)
    ax = axes[0, 0]
    x = np.logspace(-1, 5, 200)
    label_at = {"Re_t = 1": 0.4, "Da = 1": 300.0, "Ka = 1": 1e4, "Ka = 100": 1e4}
    for name, y in regime_lines(x).items():
        ax.plot(x, y, color="0.25", lw=1.0, ls="-" if name != "Re_t = 1" else ":")
        at = label_at[name]
        ax.annotate(name, (at, float(regime_lines(at)[name])), fontsize=8, color="0.25", xytext=(3, 3),
                    textcoords="offset points")
    ax.axhline(1.0, color="0.25", lw=1.0, ls="--")
    for text, (tx, ty) in REGION_LABELS:
        ax.text(tx, ty, text, fontsize=8, color="0.45", ha="center", va="center", style="italic")
    gases = sorted({(r["fuel"], r["oxidizer"], r["blend_fraction"]) for r in rows})
    pressures = sorted({r["pressure_bar"] for r in rows})
    colours = colour_scale(len(gases))
    handles: dict = {}
    for r in rows:
        gi, pi = gases.index((r["fuel"], r["oxidizer"], r["blend_fraction"])), pressures.index(r["pressure_bar"])
        px, py = _xy(r)
        ax.scatter([px], [py], color=colours[gi], marker=MARKERS[pi % len(MARKERS)], s=36, zorder=5,
                   edgecolors="0.2", linewidths=0.5)
        handles.setdefault(gas_label(r), Line2D([], [], color=colours[gi], marker="o", linestyle="none"))
    for pi, P in enumerate(pressures):
        handles[f"{P:g} bar"] = Line2D([], [], color="0.4", marker=MARKERS[pi % len(MARKERS)], linestyle="none")
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlim(0.1, 1e5)
    ax.set_ylim(0.1, 1e3)
    ax.set_xlabel("Integral length over flame thickness l_t/l_F [-]")
    ax.set_ylabel("Velocity fluctuation over flame speed u'/S_L [-]")
    ax.grid(True, which="major", color="0.9", lw=0.6)
    source = sorted({r["turbulence_source"] for r in rows})
    return finish(fig, study, ("Regimes of premixed turbulent combustion (Peters' diagram)",
                               "Where do the premixer's flames sit? (u' and l_t: " + ", ".join(source)
                               + "; dashed u' = S_L, dotted Re_t = 1)"), handles, "Gas; pressure")
