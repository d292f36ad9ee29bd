"""The premixer's turbulent flames ([premixer] with a [burner]): their regimes and core-flow flashback.

regime_chart          u'/S_L against l_t/l_F (log-log) with the usual boundary lines (Re_t = 1,
                      Da = 1, Ka = 1, Ka = 100; Peters 2000, Borghi 1985), every burning point of
                      the study on it, one colour per gas and one marker per pressure
speed_chart           each correlation's turbulent flame speed (top) and the core-flow flashback
                      margin it gives (bulk velocity over it, below) against phi, one colour per
                      gas and one line style per correlation: every premixer study, one blend too
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
from .style import GUIDE, LINESTYLES, MARKERS, colour_scale, curves, empty_note, figure, finish, panels as panel_keys

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
        ax.plot(x, y, color="0.25", lw=1.0, ls="-" if name != "Re_t = 1" else ":", gid=GUIDE)  # edge to edge
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


#: The end of both core-flow margin charts' captions.
MARGIN_WORDS = (" and one line style per correlation; open markers lie outside the correlation's fitted range. The "
                "lowest margin at an abscissa is the one results.csv gives (the largest S_T); below the red line at 1 "
                "the turbulent flame can travel upstream through the premixer's core; the dotted orange line is the "
                "burner's minimum flashback margin, which the verdict and [limits] use.")


def _curve(ax: Axes, pts: list[tuple[float, float, bool]], colour: np.ndarray, li: int, styles: dict) -> None:
    """One correlation's curve (x, y, inside its fitted range): the line style and marker of
    CORRELATIONS[li] (its legend entry into ``styles``), open markers outside the range."""
    styles.setdefault(CORRELATIONS[li][2], Line2D([], [], color="0.35", ls=LINESTYLES[li], marker=MARKERS[li]))
    ax.plot([x for x, _, _ in pts], [y for _, y, _ in pts], color=colour, ls=LINESTYLES[li], lw=1.4)
    for x, y, inside in pts:
        ax.plot([x], [y], marker=MARKERS[li], color=colour, markersize=5, markerfacecolor=colour if inside else "none")


def _with_speeds(data: ChartData) -> tuple[list[dict], list[tuple[float, float]]]:
    """The rows drawn that have turbulent flame speeds, and the (pressure, preheat) panels."""
    return [r for r in data.shown_rows if r.get("core_flashback_margin") is not None], panel_keys(data.shown_rows)


def _margin_lines(ax: Axes, study: Study) -> None:
    """The core-flow margin 1 (red, dashed) and the burner's minimum flashback margin (orange, dotted),
    which the verdict and [limits] use."""
    ax.axhline(1.0, color="tab:red", lw=1.2, ls="--")
    if study.burner is not None:
        ax.axhline(study.burner.min_flashback_margin, color="tab:orange", lw=1.2, ls=":")


def _margin_legend(handles: dict, styles: dict, study: Study) -> None:
    """Into ``handles``: the correlations' line styles (``styles``) in CORRELATIONS' order, the open
    marker and the lines of :func:`_margin_lines`."""
    handles.update(sorted(styles.items(), key=lambda kv: [c[2] for c in CORRELATIONS].index(kv[0])))
    handles["open marker: outside the fitted range"] = Line2D([], [], color="0.35", marker="o", markerfacecolor="none",
                                                              linestyle="none")
    handles["margin 1: core flashback"] = Line2D([], [], color="tab:red", lw=1.2, ls="--")
    if study.burner is not None:
        handles[f"margin {study.burner.min_flashback_margin:g}: the burner's minimum"] = Line2D(
            [], [], color="tab:orange", lw=1.2, ls=":")


def has_turbulent_speeds(data: ChartData, study: Study) -> bool:
    return any(r.get("core_flashback_margin") is not None for r in data.rows)


def _speed_panels(top: Axes, low: Axes, at: list[dict], gases: list[tuple], colours: np.ndarray,
                  handles: dict, styles: dict) -> None:
    """One pressure and preheat: each correlation's S_T (``top``) and U / S_T (``low``) against phi,
    a colour per gas (its legend entry into ``handles``) and a line style per correlation (``styles``)."""
    for gi, gas in enumerate(gases):
        sel = sorted((r for r in at if curves([r])[0] == gas), key=lambda r: r["equivalence_ratio"])
        for li, (name, col, _) in enumerate(CORRELATIONS):
            pts = [(r["equivalence_ratio"], r[col], r["port_velocity_m_s"] / r[col], turbulent_speeds(r)[name].in_range)
                   for r in sel if r.get(col) is not None]
            if not pts:
                continue
            for ax, k in ((top, 1), (low, 2)):
                _curve(ax, [(q[0], q[k], q[3]) for q in pts], colours[gi], li, styles)
            handles.setdefault(gas_label(sel[0]), Line2D([], [], color=colours[gi], lw=1.6))


@chart("turbulent_flame_speed_vs_phi",
       "Turbulent flame speed S_T of each correlation (top) and the core-flow flashback margin it gives, bulk velocity "
       "over S_T (below), against the equivalence ratio, one colour per gas" + MARGIN_WORDS, has_turbulent_speeds)
def speed_chart(data: ChartData, study: Study) -> Figure:
    rows, panels = _with_speeds(data)
    gases = spread(curves(rows), MAX_CURVES // len(CORRELATIONS))
    ncols = min(3, len(panels))
    nrows = int(np.ceil(len(panels) / ncols))
    fig, axes = figure(ncols, 2 * nrows, width=4.6, height=3.0)
    colours = colour_scale(len(gases))
    handles: dict = {}
    styles: dict = {}
    for i, (P, T) in enumerate(panels):
        top, low = axes[2 * (i // ncols), i % ncols], axes[2 * (i // ncols) + 1, i % ncols]
        at = [r for r in rows if r["pressure_bar"] == P and r["unburned_temperature_K"] == T]
        _speed_panels(top, low, at, gases, colours, handles, styles)
        if not at:
            empty_note(top, "no burning point with turbulent flame speeds at this pressure and preheat")
        _margin_lines(low, study)
        top.set_title(f"p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        top.set_ylabel("Turbulent flame speed S_T [m/s]")
        low.set_ylabel("Bulk velocity / S_T [-]")
        low.set_xlabel("Equivalence ratio φ [-]")
        for ax in (top, low):
            ax.set_ylim(bottom=0.0)
            ax.grid(True, color="0.88", lw=0.7)
    for i in range(len(panels), nrows * ncols):
        axes[2 * (i // ncols), i % ncols].set_visible(False)
        axes[2 * (i // ncols) + 1, i % ncols].set_visible(False)
    _margin_legend(handles, styles, study)
    source = sorted({r["turbulence_source"] for r in rows})
    left = len(curves(rows)) - len(gases)
    thinned = f"; {len(gases)} of {len(gases) + left} gases shown" if left else ""
    return finish(fig, study, ("Turbulent flame speed and core-flow flashback margin vs equivalence ratio",
                               "How fast does the premixer's turbulent flame burn, and how far is its bulk flow from "
                               "it? (correlations are fits with wide scatter; u' and l_t: " + ", ".join(source) + thinned
                               + ")" + data.note()), handles, "Gas; correlation")


def has_core_margins(data: ChartData, study: Study) -> bool:
    return several_blends(data, study) and any(r.get("core_flashback_margin") is not None for r in data.rows)


def _margin_panel(ax: Axes, at: list[dict], phis: list[float], colours: np.ndarray, handles: dict,
                  styles: dict) -> None:
    """One pressure and preheat: U / S_T of each correlation against the blend fraction, a colour per
    phi (its legend entry into ``handles``) and a line style per correlation (into ``styles``)."""
    for ci, phi in enumerate(phis):
        sel = sorted((r for r in at if r["equivalence_ratio"] == phi), key=lambda r: r["blend_fraction"])
        for li, (name, col, _) in enumerate(CORRELATIONS):
            pts = [(100 * r["blend_fraction"], r["port_velocity_m_s"] / r[col], turbulent_speeds(r)[name].in_range)
                   for r in sel if r.get(col) is not None]
            if not pts:
                continue
            _curve(ax, pts, colours[ci], li, styles)
            handles.setdefault(f"φ {phi:g}", Line2D([], [], color=colours[ci], lw=1.6))


@chart("core_flashback_vs_blend_fraction",
       "Core-flow flashback margin (bulk velocity over the turbulent flame speed) of each correlation against the "
       "blend fraction, one colour per equivalence ratio" + MARGIN_WORDS, has_core_margins)
def core_flashback_chart(data: ChartData, study: Study) -> Figure:
    rows, panels = _with_speeds(data)
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
        _margin_lines(ax, study)
        ax.set_title(f"p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel("Bulk velocity / S_T [-]")
        ax.set_ylim(bottom=0.0)
        ax.grid(True, color="0.88", lw=0.7)
    for ax in list(axes.flat)[len(panels):]:
        ax.set_visible(False)
    _margin_legend(handles, styles, study)
    source = sorted({r["turbulence_source"] for r in rows})
    return finish(fig, study, ("Core-flow flashback margin vs blend fraction",
                               "How far is the premixer's bulk flow from the turbulent flame speed? (correlations are "
                               "fits with wide scatter; u' and l_t: " + ", ".join(source) + ")" + data.note()),
                  handles, "Equivalence ratio; correlation")
