"""The premixer's turbulent flames ([premixer] with a [burner]): their regimes and core-flow flashback.

regime_chart          u'/S_L against l_t/l_F (log-log) with the usual boundary lines (Re_t = 1,
                      Da = 1, Ka = 1, Ka = 100; Peters 2000, Borghi 1985), every burning point of
                      the study on it, one colour per gas and one marker per pressure
core_flashback_chart  bulk velocity over each correlation's turbulent flame speed against the
                      blend fraction, one colour per phi and one line style per correlation

Where a premixer's flames sit decides which models apply: laminar flame criteria do not (the
port is turbulent), flamelet turbulent flame speed correlations fit the corrugated-flamelet and
thin-reaction-zone regimes, and beyond Ka = 100 the reaction zone itself is disturbed.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np
from matplotlib.lines import Line2D

from ...columns import gas_label
from ...design import turbulent_speeds
from ...physics.turbulence import regime_lines
from .registry import MAX_CURVES, ChartData, chart, several_blends, spread
from .style import LINESTYLES, MARKERS, colour_scale, empty_note, figure, finish, panels as panel_keys

if TYPE_CHECKING:
    from matplotlib.axes import Axes
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


#: The correlations of design.turbulent_speeds: (name, its column, legend label).
CORRELATIONS = (("zimont", "turbulent_flame_speed_zimont_m_s", "Zimont (no Lewis number)"),
                ("muppala", "turbulent_flame_speed_muppala_m_s", "Muppala et al. (1/Le)"),
                ("leading point", "turbulent_flame_speed_leading_point_m_s", "leading point (S_c,max of the ladder)"))


def has_core_margins(data: ChartData, study: Study) -> bool:
    return several_blends(data, study) and any(r.get("core_flashback_margin") is not None for r in data.rows)


def _margin_panel(ax: Axes, at: list[dict], phis: list[float], colours: np.ndarray, handles: dict,
                  styles: dict) -> None:
    """One pressure and preheat: U / S_T of each correlation against the blend fraction, a colour per
    phi (its legend entry into ``handles``) and a line style per correlation (into ``styles``)."""
    for ci, phi in enumerate(phis):
        sel = sorted((r for r in at if r["equivalence_ratio"] == phi), key=lambda r: r["blend_fraction"])
        for li, (name, col, label) in enumerate(CORRELATIONS):
            pts = [(100 * r["blend_fraction"], r["port_velocity_m_s"] / r[col], turbulent_speeds(r)[name].in_range)
                   for r in sel if r.get(col) is not None]
            if not pts:
                continue
            ax.plot([x for x, _, _ in pts], [y for _, y, _ in pts], color=colours[ci], ls=LINESTYLES[li], lw=1.4)
            for x, y, inside in pts:
                ax.plot([x], [y], marker=MARKERS[li], color=colours[ci], markersize=5,
                        markerfacecolor=colours[ci] if inside else "none")
            handles.setdefault(f"φ {phi:g}", Line2D([], [], color=colours[ci], lw=1.6))
            styles.setdefault(label, Line2D([], [], color="0.35", ls=LINESTYLES[li], marker=MARKERS[li]))


@chart("core_flashback_vs_blend_fraction",
       "Core-flow flashback margin (bulk velocity over the turbulent flame speed) of each correlation against the "
       "blend fraction, one colour per equivalence ratio and one line style per correlation; open markers lie outside "
       "the correlation's fitted range. The lowest line at a blend fraction is the margin results.csv gives; below "
       "the red line at 1 the turbulent flame can travel upstream through the premixer's core; the dotted orange line is "
       "the burner's minimum flashback margin, which the verdict and [limits] use.",
       has_core_margins)
def core_flashback_chart(data: ChartData, study: Study) -> Figure:
    rows = [r for r in data.shown_rows if r.get("core_flashback_margin") is not None]
    panels = panel_keys(data.shown_rows)
    phis = spread(sorted({r["equivalence_ratio"] for r in rows}), MAX_CURVES // len(CORRELATIONS))
    ncols = min(3, len(panels))
    fig, axes = figure(ncols, int(np.ceil(len(panels) / ncols)), width=4.6, height=3.6)
    colours = colour_scale(len(phis))
    handles: dict = {}
    styles: dict = {}
    for ax, (P, T) in zip(axes.flat, panels):
        at = [r for r in rows if r["pressure_bar"] == P and r["unburned_temperature_K"] == T]
        _margin_panel(ax, at, phis, colours, handles, styles)
        if not at:
            empty_note(ax, "no burning point with a core-flow margin at this pressure and preheat")
        ax.axhline(1.0, color="tab:red", lw=1.2, ls="--")
        if study.burner is not None:  # the margin the burner asks for, which [limits] and the verdict use
            ax.axhline(study.burner.min_flashback_margin, color="tab:orange", lw=1.2, ls=":")
        ax.set_title(f"p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel("Bulk velocity / S_T [-]")
        ax.set_ylim(bottom=0.0)
        ax.grid(True, color="0.88", lw=0.7)
    for ax in list(axes.flat)[len(panels):]:
        ax.set_visible(False)
    handles.update(sorted(styles.items(), key=lambda kv: [c[2] for c in CORRELATIONS].index(kv[0])))
    handles["open marker: outside the fitted range"] = Line2D([], [], color="0.35", marker="o", markerfacecolor="none",
                                                              linestyle="none")
    handles["margin 1: core flashback"] = Line2D([], [], color="tab:red", lw=1.2, ls="--")
    if study.burner is not None:
        handles[f"margin {study.burner.min_flashback_margin:g}: the burner's minimum"] = Line2D(
            [], [], color="tab:orange", lw=1.2, ls=":")
    source = sorted({r["turbulence_source"] for r in rows})
    return finish(fig, study, ("Core-flow flashback margin vs blend fraction",
                               "How far is the premixer's bulk flow from the turbulent flame speed? (correlations are "
                               "fits with wide scatter; u' and l_t: " + ", ".join(source) + ")" + data.note()),
                  handles, "Equivalence ratio; correlation")
