"""Design charts beyond flame speed and thickness: scaling, blends, flashback, window, gas quality.

pressure_preheat_chart   S_L vs p and vs T_u on log axes with fitted exponents
blend_chart              S_L, delta_T, T_ad vs blend fraction; S_L at fixed T_ad
flashback_chart          g_F vs phi with the burner's wall gradient; quenching size vs port size
window_chart             (blend, phi) map of flashback and blowoff margins, acceptable region shaded
gas_quality_chart        Wobbe index and heating value vs blend fraction with the allowed band

Drawn from flat rows only (see design.annotate), like every chart; each registered with its caption.
"""
from __future__ import annotations

import textwrap
from typing import TYPE_CHECKING

import numpy as np
from matplotlib.lines import Line2D
from matplotlib.patches import Patch
from scipy.interpolate import RegularGridInterpolator

from ...admissible.words import burner_and_limits, kept
from ...columns import gas_label
from ...physics.fits import fit_power_law
from .registry import (
    MAX_PANELS,
    ChartData,
    burning_blends,
    chart,
    conditions_note,
    has_margins,
    has_window,
    several_blends,
    spread,
    thinned_note,
    varies_p_or_T,
)
from .style import (
    MARKERS,
    colour_scale,
    curves as fuel_keys,
    empty_note,
    figure,
    finish,
    frame_note,
    ok_rows,
    phi_near_one,
    plain_log_ticks,
    sparse_log_yticks,
    unassessed_reasons,
)

if TYPE_CHECKING:
    import xarray as xr
    from matplotlib.artist import Artist
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

    from ...config import Burner, Study


@chart("pressure_and_preheat_dependence",
       "Flame speed against pressure and against unburned temperature on log "
       "axes; the legend gives the fitted power-law exponent of each curve.",
       varies_p_or_T)
def pressure_preheat_chart(data: ChartData, study: Study) -> Figure:
    """Flame speed vs pressure and vs unburned temperature (log axes), exponents in the legend."""
    ok = ok_rows(data.rows)
    phi = phi_near_one(ok)
    blends = set(data.shown["blend_fraction"])
    sel = [r for r in ok if r["equivalence_ratio"] == phi and r["blend_fraction"] in blends]
    keys = fuel_keys(sel)
    colours = colour_scale(len(keys))
    varied = [axis for axis in (("pressure_bar", "unburned_temperature_K", "β", "bar"),
                                ("unburned_temperature_K", "pressure_bar", "α", "K"))
              if len({r[axis[0]] for r in ok}) > 1]  # draw only what the study varies
    fig, axes = figure(len(varied))
    handles = {}
    for ai, (along, fixed, sym, _unit) in enumerate(varied):
        ax = axes[0, ai]
        is_p = along == "pressure_bar"
        fixed_values = [v for v in data.shown[fixed] if any(r[fixed] == v for r in sel)]
        lines: dict[tuple, list[dict]] = {}
        for r in sel:
            lines.setdefault((r["fuel"], r["oxidizer"], r["blend_with"], r["blend_fraction"], r[fixed]), []).append(r)
        for ci, key in enumerate(keys):
            for fi, fv in enumerate(fixed_values):
                rs = sorted(lines.get(key + (fv,), []), key=lambda r: r[along])
                if len(rs) < 2:
                    continue
                x = [r[along] for r in rs]
                y = [100 * r["laminar_flame_speed_m_s"] for r in rs]
                b, _ = fit_power_law(x, y)
                label = (f"{gas_label(rs[0])}, {'p' if not is_p else 'T_u'} = {fv:g} "
                         f"{'bar' if not is_p else 'K'}: {sym} = {b:+.2f}"
                         + (" (through 2 points only)" if len(rs) == 2 else f" ({len(rs)} points)"))
                h, = ax.plot(x, y, color=colours[ci], marker=MARKERS[fi % len(MARKERS)],
                             linestyle="-" if is_p else "--", lw=1.5, label=label)
                handles[label] = h
        ax.set_xscale("log")
        ax.set_yscale("log")
        plain_log_ticks(ax)
        ax.set_xlabel("Pressure p [bar]" if is_p else "Unburned temperature T_u [K]")
        ax.set_ylabel("Laminar flame speed S_L [cm/s]")
        ax.set_title(f"S_L ∝ {'p^β' if is_p else 'T_u^α'} (φ = {phi:g})", fontsize=10)
        ax.grid(True, which="both", color="0.9", lw=0.6)
    return finish(fig, study, ("Pressure and preheat dependence of the flame speed",
                                "How does S_L scale? Exponents fitted per curve (Metghalchi & Keck);\n"
                                "every φ in power_law_exponents.csv" + data.note("blend_fraction", *(
                                    ax[1] for ax in varied))),
                   handles, "Fuel and fitted exponent")


def _interp_at_fixed_tad(rs, targets):
    """S_L at given adiabatic temperatures, interpolated along the lean branch of one blend."""
    rs = sorted(rs, key=lambda r: r["equivalence_ratio"])
    if not rs:
        return [np.nan] * len(targets)
    peak = int(np.argmax([r["adiabatic_flame_temperature_K"] for r in rs]))
    lean = rs[:peak + 1]
    T = np.array([r["adiabatic_flame_temperature_K"] for r in lean])
    S = np.array([r["laminar_flame_speed_m_s"] for r in lean])
    if len(lean) < 2 or np.any(np.diff(T) <= 0):
        return [np.nan] * len(targets)
    return [float(np.interp(t, T, S, left=np.nan, right=np.nan)) for t in targets]


#: Conditions (fuel, oxidizer, pressure, preheat) the blend comparison draws at most (evenly
#: spread, first and last); the rest are named on the chart and are in results.csv.
MAX_BLEND_CONDITIONS = MAX_PANELS // 4  # four panels each
#: Equivalence ratios (and fixed flame temperatures) it draws as curves, at most.
MAX_PHI_CURVES = 8


@chart("blend_comparison",
       "Flame speed, thickness and adiabatic temperature against blend fraction at fixed equivalence ratio, and "
       "flame speed at fixed adiabatic flame temperature, a block of four panels per fuel and condition.",
       burning_blends)
def blend_chart(data: ChartData, study: Study) -> Figure:
    """S_L, thermal thickness and T_ad vs blend fraction per phi; S_L at fixed T_ad; per fuel and condition."""
    ok_all = ok_rows(data.rows)
    conditions = sorted({(r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]) for r in ok_all},
                        key=lambda c: (study.sweep_fuels.index(c[0]), study.sweep_oxidizers.index(c[1]), c[2], c[3]))
    shown = spread(conditions, MAX_BLEND_CONDITIONS)
    by_condition: dict[tuple, list[dict]] = {}
    for r in ok_all:
        by_condition.setdefault((r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]), []).append(r)
    all_phis = sorted({r["equivalence_ratio"] for r in ok_all})
    phis = spread(all_phis, MAX_PHI_CURVES)
    colours = colour_scale(len(phis))
    fig, axes = figure(2, nrows=2 * len(shown), width=5.0, height=3.3)
    handles = {}
    at_equal_T = 0  # panels with an equal-temperature curve
    for k, (fuel, ox, P, T) in enumerate(shown):
        ok = by_condition[(fuel, ox, P, T)]
        fracs = sorted({r["blend_fraction"] for r in ok})
        where = f"{fuel} in {ox}, {P:g} bar, {T:g} K"
        for ai, (col, scale, ylabel) in enumerate((("laminar_flame_speed_m_s", 100, "S_L [cm/s]"),
                                                   ("thermal_thickness_mm", 1, "Thermal thickness δ_T [mm]"),
                                                   ("adiabatic_flame_temperature_K", 1, "Adiabatic flame T [K]"))):
            ax = axes[2 * k + ai // 2, ai % 2]
            for pi, phi in enumerate(phis):
                rs = sorted((r for r in ok if r["equivalence_ratio"] == phi), key=lambda r: r["blend_fraction"])
                if not rs:
                    continue
                h, = ax.plot([100 * r["blend_fraction"] for r in rs], [scale * r[col] for r in rs],
                             color=colours[pi], marker=MARKERS[pi % len(MARKERS)], lw=1.4, markersize=4)
                handles[f"φ = {phi:g}"] = h
            ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
            ax.set_ylabel(ylabel)
            ax.set_title(where, fontsize=9)
            ax.grid(True, color="0.9", lw=0.6)
        ax = axes[2 * k + 1, 1]
        base = sorted((r for r in ok if r["blend_fraction"] == fracs[0]), key=lambda r: r["equivalence_ratio"])
        peak = int(np.argmax([r["adiabatic_flame_temperature_K"] for r in base])) if base else 0
        targets = spread([r["adiabatic_flame_temperature_K"] for r in base[:peak + 1]], MAX_PHI_CURVES)
        greys = [str(g) for g in np.linspace(0.0, 0.6, max(len(targets), 1))]
        drawn = 0
        for ti, t in enumerate(targets):
            S = np.array([_interp_at_fixed_tad([r for r in ok if r["blend_fraction"] == f], [t])[0] for f in fracs])
            if np.isfinite(S).sum() < 2:
                continue  # one blend reaches this temperature on its lean side: no comparison to draw
            ax.plot([100 * f for f in fracs], 100 * S, color=greys[ti], marker="s", lw=1.4, markersize=4,
                    linestyle="--")
            drawn += 1
            ax.annotate(f"{t:.0f} K", (100 * fracs[np.flatnonzero(np.isfinite(S))[-1]], 100 * S[np.isfinite(S)][-1]),
                        textcoords="offset points", xytext=(4, 0), fontsize=7, color=greys[ti], va="center")
        ax.set_title(f"{where}: at equal flame temperature", fontsize=9)
        if not drawn:
            empty_note(ax, "S_L at equal flame temperature is read between the equivalence ratios of each blend, "
                       "so it needs at least two blends reaching the same T_ad on their lean side"
                       + (" (this study sweeps one equivalence ratio)" if len(all_phis) < 2 else ""))
            continue
        at_equal_T += 1
        ax.margins(x=0.14)  # room for the temperature labels at the right end
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel("S_L at fixed T_ad [cm/s]")
        ax.grid(True, color="0.9", lw=0.6)
    if at_equal_T:
        handles["S_L at a fixed T_ad (grey, dashed;\nT_ad of the unblended gas on its lean side)"] = Line2D(
            [], [], color="0.3", marker="s", linestyle="--")
    blocks = ("" if len(conditions) == len(shown) else
              f"{len(shown)} of {len(conditions)} fuel/condition blocks (evenly spread, first and last)")
    note = thinned_note({"equivalence_ratio": phis}, {"equivalence_ratio": all_phis}, (blocks,))
    return finish(fig, study, (f"Blend comparison: {study.blend_with} blended in",
                                "What does blending change? At fixed φ, and S_L at equal adiabatic flame "
                                f"temperature{note}"),
                   handles, "Equivalence ratio / flame temperature")


#: Flashback margins spanning more than this factor are drawn on a log axis.
LOG_MARGIN_SPAN = 20.0


@chart("flashback_chart",
       "Flashback margin g_wall/g_F of each blend against equivalence ratio, one panel per pressure and preheat: "
       "a curve in the red zone under the minimum-margin line is a flashback risk. Right: quenching size "
       "against the port size.",
       has_margins)
def flashback_chart(data: ChartData, study: Study) -> Figure:
    """Flashback margin vs phi per blend with the required minimum; quench size vs port size."""
    b = study.burner
    assert b is not None  # drawn only with a burner (registry.has_margins)
    ok = [r for r in ok_rows(data.shown_rows) if r["flashback_margin"] is not None]
    panels = spread(sorted({(r["pressure_bar"], r["unburned_temperature_K"]) for r in ok}),
                    MAX_PANELS // 2)  # two panels per condition
    n_every = len(data.every["pressure_bar"]) * len(data.every["unburned_temperature_K"])
    left, why = _unassessed_conditions(data)  # no panel: flashback not assessed there
    keys = fuel_keys(ok)
    lowest: dict[tuple, dict] = {}  # per curve, over every pressure and preheat (also those not drawn)
    for r in ok_rows(data.rows):
        k = (r["fuel"], r["oxidizer"], r["blend_with"], r["blend_fraction"])
        if r["flashback_margin"] is not None and (k not in lowest or r["flashback_margin"] < lowest[k]["flashback_margin"]):
            lowest[k] = r
    colours = colour_scale(len(keys))
    fig, axes = figure(2, nrows=len(panels))
    handles = {}
    top = max(r["flashback_margin"] for r in ok)
    low = min(min(r["flashback_margin"] for r in ok), b.min_flashback_margin)
    log = top / low > LOG_MARGIN_SPAN  # lean hydrogen: margins from below 1 to over 100 on one chart
    floor = low / 1.5 if log else 0.0
    for pi, (P, T) in enumerate(panels):
        ax, axq = axes[pi, 0], axes[pi, 1]
        ax.axhspan(floor, b.min_flashback_margin, color="#f4cccc", lw=0, zorder=0)
        ax.axhline(b.min_flashback_margin, color="#b2182b", lw=1.4, zorder=1)
        for ci, key in enumerate(keys):
            rs = [r for r in data.series.get(key + (P, T), []) if r["status"] == "ok" and r["flashback_margin"] is not None]
            if not rs:
                continue
            phi = [r["equivalence_ratio"] for r in rs]
            low = lowest[key]
            where = f", {low['pressure_bar']:g} bar, {low['unburned_temperature_K']:g} K" if n_every > 1 else ""
            label = f"{gas_label(rs[0])}\n(lowest {low['flashback_margin']:.2f} at φ {low['equivalence_ratio']:g}{where})"
            h, = ax.plot(phi, [r["flashback_margin"] for r in rs], color=colours[ci],
                         marker=MARKERS[ci % len(MARKERS)], lw=1.8, label=label, zorder=3)
            handles[label] = h
            q = "tube_quenching_diameter_mm" if b.port == "round" else "quenching_distance_mm"
            axq.plot(phi, [r[q] for r in rs], color=colours[ci], marker=MARKERS[ci % len(MARKERS)], lw=1.4)
        if log:
            ax.set_yscale("log")
            ax.set_ylim(floor, 1.5 * top)
            sparse_log_yticks(ax)
        else:
            ax.set_ylim(0, 1.08 * max(top, 1.2 * b.min_flashback_margin))
        ax.set_xlabel("Equivalence ratio φ [-]")
        ax.set_ylabel("Flashback margin g_wall / g_F [-]" + (" (log scale)" if log else ""))
        ax.set_title(f"Flashback margin, p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.grid(True, color="0.9", lw=0.6)
        axq.axhline(b.port_size_m * 1e3, color="0.2", lw=1.4, linestyle="-.")
        axq.set_xlabel("Equivalence ratio φ [-]")
        axq.set_ylabel(("Tube quenching diameter" if b.port == "round" else "Plate quenching distance") + " [mm]")
        axq.set_title("Quenching size vs port size (dash-dot)\nbelow the port line a flame fits into the port",
                      fontsize=9)
        axq.set_ylim(bottom=0)
        axq.grid(True, color="0.9", lw=0.6)
    handles[f"minimum flashback margin {b.min_flashback_margin:g} (red line);\nunder it: flashback risk"] = Patch(
        facecolor="#f4cccc", edgecolor="#b2182b")
    handles[f"port {'diameter' if b.port == 'round' else 'gap'} {b.port_size_m * 1e3:g} mm"] = Line2D(
        [], [], color="0.2", lw=1.4, linestyle="-.")
    return finish(fig, study, (f"Flashback check: {b.name}",
                                "Will the flame flash back? A blend keeps the required margin where its curve stays "
                                "above the red line (a screening margin, not a proof of safety)"
                                + data.note("blend_fraction") + conditions_note(panels, n_every - len(left))
                                + _unassessed_note(left, why)),
                   handles, "Fuel and burner")


def _unassessed_conditions(data: ChartData) -> tuple[list[tuple[float, float]], list[str]]:
    """The (pressure, preheat) conditions that burn but have no flashback margin at any point
    (flashback not assessed there: outside its criterion's range), and why."""
    margins = {(r["pressure_bar"], r["unburned_temperature_K"]) for r in data.rows if r["flashback_margin"] is not None}
    burning = [r for r in ok_rows(data.rows) if (r["pressure_bar"], r["unburned_temperature_K"]) not in margins]
    return sorted({(r["pressure_bar"], r["unburned_temperature_K"]) for r in burning}), unassessed_reasons(
        burning, "flashback")


def _unassessed_note(left: list[tuple[float, float]], why: list[str]) -> str:
    """A line naming the conditions a flashback chart has no panel for, and why ('' when none)."""
    if not left:
        return ""
    return (f"\nNo panel for {', '.join(f'{P:g} bar {T:g} K' for P, T in left)}: flashback is not assessed there"
            + (f" ({'; '.join(why)})" if why else "") + "; every point is in results.csv")


#: Points per axis of the fine grid the window's margins are interpolated on.
WINDOW_GRID_POINTS = 241


def _fine_field(values: np.ndarray, fracs: np.ndarray, phis: np.ndarray, xf: np.ndarray, yf: np.ndarray):
    """A margin on the solved (blend fraction, phi) grid read onto the fine grid (xf, yf),
    bilinearly in its logarithm (margins are power laws of S_L^2/alpha_u: the product of the
    flashback and blowoff margins, constant at the solved points, stays constant between
    them); NaN wherever a corner of its cell has no flame."""
    with np.errstate(divide="ignore", invalid="ignore"):
        logs = np.where(values > 0, np.log(values), np.nan)
    return np.exp(RegularGridInterpolator((fracs, phis), logs, method="linear", bounds_error=False)(
        np.stack(np.meshgrid(xf, yf, indexing="ij"), axis=-1)))


def _limit_overlay(ax, limits: list[dict]) -> None:
    """The windows of the limit searches of one panel as black segments: blend windows at their
    phi (horizontal), phi windows at their blend (vertical)."""
    for r in limits:
        if r["outcome"] != "window":
            continue
        if r["axis"] == "blend_fraction":
            ax.plot([100 * r["lower_edge"], 100 * r["upper_edge"]], [r["equivalence_ratio"]] * 2, color="k", lw=2.5,
                    solid_capstyle="butt", zorder=5)
        else:
            ax.plot([100 * (r["blend_fraction"] or 0)] * 2, [r["lower_edge"], r["upper_edge"]], color="k", lw=2.5,
                    solid_capstyle="butt", zorder=5)


@chart("operating_window",
       "Map over blend fraction and equivalence ratio: the flashback and blowoff margins read between the "
       "solved points (dots; bilinear in their logarithms); the green region keeps the minimum margins assessed "
       "and is bounded by the lines drawn (a margin assessed at no point has no line, and the frame says why); "
       "hatched: no flame, failed, or no margin assessed (outside the range "
       "of the criteria: see the report). With [limits], black segments are "
       "the windows the limit searches found with flames: where they and the shading differ, the segments are "
       "the answer.",
       has_window)
def window_chart(data: ChartData, study: Study) -> Figure:
    """Operating window over (blend fraction, phi): one interpolated field per margin, the fill and
    both edge lines drawn from it, so the two can never disagree. The legend names what is drawn
    only; a margin assessed nowhere in a panel is said so in its frame."""
    ds, b = data.dataset, study.burner
    assert b is not None  # drawn only with a burner (registry.has_window)
    every = [(f, o, p, t) for f in ds.fuel.values for o in ds.oxidizer.values for p in data.shown["pressure_bar"]
             for t in data.shown["unburned_temperature_K"]]
    panels = spread(every, MAX_PANELS)
    fig, axes = figure(min(len(panels), 3), nrows=int(np.ceil(len(panels) / 3)), width=6.0, height=4.4)
    products: list[np.ndarray] = []
    drawn: set[str] = set()
    for ax, (fuel, ox, P, T) in zip(axes.flat, panels):
        at = ds.sel(fuel=fuel, oxidizer=ox, pressure_bar=P, unburned_temperature_K=T).sortby(
            ["blend_fraction", "equivalence_ratio"])
        drawn |= _window_panel(ax, at, b, products)
        _limit_overlay(ax, [r for r in data.limits if (r["fuel"], r["oxidizer"], r["pressure_bar"],
                                                       r["unburned_temperature_K"]) == (fuel, ox, P, T)])
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel("Equivalence ratio φ [-]")
        ax.set_title(f"{fuel} in {ox}, p = {P:g} bar, T_u = {T:g} K", fontsize=10)
    for ax in list(axes.flat)[len(panels):]:
        ax.set_visible(False)
    handles = _window_legend(b, drawn)
    if any(r["outcome"] == "window" for r in data.limits):
        handles["admissible windows the limit searches found\nwith flames (limits.csv): the answer"] = Line2D(
            [], [], color="k", lw=2.5)
    if any((ds.warnings.values != "").ravel()):
        handles["solved point with a warning: outside a range, or\nthermodiffusively unstable (results.csv, warnings)"] = Line2D(
            [], [], color="#b2182b", marker="x", linestyle="none")
    allp = np.concatenate(products) if products else np.array([])
    if allp.size and np.ptp(allp) <= 0.01 * np.median(allp):
        handles[f"FB × BO = g_B/g_F = {np.median(allp):.2f} at every point:\nboth edges are one quantity, "
                "S_L²/α_u against\nthe wall gradient (indicator constants)"] = Line2D([], [], linestyle="none")
    return finish(fig, study, (f"Operating window: {b.name}",
                                "Where can it run? Blend fraction and equivalence ratio that keep the margins assessed"
                                + conditions_note(sorted({(p[2], p[3]) for p in panels}),
                                                  len(data.every["pressure_bar"]) * len(data.every["unburned_temperature_K"]))
                                + (f"\nShown: {len(panels)} of {len(every)} fuel/oxidizer/condition panels"
                                   if len(panels) < len(every) else "")),
                   handles, "Margins")


def _window_panel(ax: Axes, at: xr.Dataset, b: Burner, products: list) -> set[str]:
    """One (fuel, oxidizer, p, T_u) panel of the operating window; returns what it drew ('green',
    'hatched', 'flashback', 'blowoff', 'points', 'warned'). A margin that is assessed at no point
    of the panel gets a note in its frame (the green region then keeps the other margin only)."""
    bo_col, bo_min, _ = b.blowoff
    fracs, phis = at.blend_fraction.values, at.equivalence_ratio.values
    fb = at.flashback_margin.transpose("blend_fraction", "equivalence_ratio").values
    bo = at[bo_col].transpose("blend_fraction", "equivalence_ratio").values
    products.append((fb * bo)[np.isfinite(fb * bo)])
    xf = np.linspace(fracs[0], fracs[-1], WINDOW_GRID_POINTS)
    yf = np.linspace(phis[0], phis[-1], WINDOW_GRID_POINTS)
    fbf, bof = _fine_field(fb, fracs, phis, xf, yf), _fine_field(bo, fracs, phis, xf, yf)
    X, Y = np.meshgrid(100 * xf, yf, indexing="ij")
    worst = np.fmin(fbf / b.min_flashback_margin, bof / bo_min)
    drawn = set()
    if np.nanmax(worst, initial=-np.inf) >= 1.0:
        ax.contourf(X, Y, worst, levels=[1.0, np.inf], colors=["#bfe3bf"])
        drawn.add("green")
    if np.isnan(worst).any():
        ax.contourf(X, Y, np.isnan(worst).astype(float), levels=[0.5, 1.5], colors=["0.85"], hatches=["//"])
        drawn.add("hatched")
    for name, grid, level, colour, style in (("flashback", fbf, b.min_flashback_margin, "#7b2d8e", "-"),
                                             ("blowoff", bof, bo_min, "#1f6f6f", "--")):
        if np.nanmin(grid, initial=np.inf) < level < np.nanmax(grid, initial=-np.inf):
            ax.contour(X, Y, grid, levels=[level], colors=colour, linewidths=1.8, linestyles=style)
            drawn.add(name)
    criteria = (("flashback", fb), (b.blowoff[2], bo))
    drawn |= {f"assessed {n}" for n, m in criteria if np.isfinite(m).any()}
    unassessed = [n for n, m in criteria if not np.isfinite(m).any()]
    Xs, Ys = np.meshgrid(100 * fracs, phis, indexing="ij")
    warned = at.warnings.transpose("blend_fraction", "equivalence_ratio").values != ""
    ax.plot(Xs[~warned], Ys[~warned], "k.", markersize=4, zorder=6)
    if warned.any():
        ax.plot(Xs[warned], Ys[warned], "x", color="#b2182b", markersize=6, zorder=6)
    if unassessed:  # after the points: the note goes to the corner they leave free
        rows = [{"criteria_not_assessed": str(v)} for v in at.criteria_not_assessed.values.ravel()] \
            if "criteria_not_assessed" in at else []
        why = {n: unassessed_reasons(rows, n) for n in unassessed}
        frame_note(ax, "; ".join(f"{n} margin not assessed at any point" + (f" ({'; '.join(why[n])})" if why[n] else "")
                                 for n in unassessed)
                   + ("" if len(unassessed) == 2 else ": no line for it, the green region keeps the other margin only"))
    return drawn | {"points"} if (~warned).any() else drawn


def _window_legend(b: Burner, drawn: set[str]) -> dict:
    """The operating window's legend: only what a panel drew."""
    _, bo_min, _ = b.blowoff
    bo_short = "SM" if b.on_stabilizer else "BO"
    both = {"assessed flashback", f"assessed {b.blowoff[2]}"} <= drawn
    entries = (
        ("green", f"keeps both minimum margins (FB ≥ {b.min_flashback_margin:g}, {bo_short} ≥ {bo_min:g}),\nor the one "
                  "assessed" if both else "keeps the one minimum margin assessed\n"
                  f"(FB ≥ {b.min_flashback_margin:g}, {bo_short} ≥ {bo_min:g}: the other is not assessed, note in the frame)",
         Patch(color="#bfe3bf")),
        ("flashback", f"flashback margin g_wall/g_F = {b.min_flashback_margin:g}\n(a faster flame, higher S_L²/α_u, "
                      "lowers it)", Line2D([], [], color="#7b2d8e", lw=1.8)),
        ("blowoff", (f"stabilizer margin U_BO/U = {bo_min:g}" if b.on_stabilizer
                     else f"blowoff margin g_B/g_wall = {bo_min:g}") + "\n(a slower flame lowers it)",
         Line2D([], [], color="#1f6f6f", lw=1.8, linestyle="--")),
        ("hatched", "no flame, failed, or no margin assessed (hatched)", Patch(facecolor="0.85", hatch="//")),
        ("points", "solved point", Line2D([], [], color="k", marker=".", linestyle="none")),
    )
    return {text: h for key, text, h in entries if key in drawn}


@chart("fuel_interchangeability",
       "Wobbe index and heating value of the blends against blend fraction, with the "
       "allowed Wobbe band where [gas_quality] sets one (wobbe_tolerance_percent).",
       several_blends)
def gas_quality_chart(data: ChartData, study: Study) -> Figure:
    """Wobbe index and heating value of the blends vs blend fraction, with the allowed band."""
    table = data.gases
    fig, axes = figure(2)
    keys = []
    for g in table:
        k = (g["fuel"], g["oxidizer"])
        if k not in keys:
            keys.append(k)
    colours = colour_scale(len(keys))
    handles: dict[str, Artist] = {}
    for ci, k in enumerate(keys):
        gs = sorted((g for g in table if (g["fuel"], g["oxidizer"]) == k), key=lambda g: g["blend_fraction"])
        x = [100 * g["blend_fraction"] for g in gs]
        for ax, cols in ((axes[0, 0], ("higher_wobbe_index_MJ_m3", "lower_wobbe_index_MJ_m3")),
                         (axes[0, 1], ("higher_heating_value_MJ_m3", "lower_heating_value_MJ_m3"))):
            for li, col in enumerate(cols):
                h, = ax.plot(x, [g[col] for g in gs], color=colours[ci], marker=MARKERS[ci % len(MARKERS)],
                             linestyle="-" if li == 0 else "--", lw=1.5)
        handles[k[0]] = Line2D([], [], color=colours[ci], marker=MARKERS[ci % len(MARKERS)])
        lo, hi = gs[0]["wobbe_band_low_MJ_m3"], gs[0]["wobbe_band_high_MJ_m3"]
        if lo is not None:
            axes[0, 0].axhspan(lo, hi, color=colours[ci], alpha=0.12)
            handles[f"allowed {study.gas_quality.wobbe} Wobbe band {lo:.2f}-{hi:.2f} MJ/m³"] = Patch(
                color=colours[ci], alpha=0.25)
    handles["higher (superior) value (solid)"] = Line2D([], [], color="0.35")
    handles["lower (inferior) value (dashed)"] = Line2D([], [], color="0.35", linestyle="--")
    for ax, yl in ((axes[0, 0], "Wobbe index [MJ/m³]"), (axes[0, 1], "Heating value [MJ/m³]")):
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel(yl)
        ax.grid(True, color="0.9", lw=0.6)
    gq = study.gas_quality
    if not any(k.startswith("allowed") for k in handles):
        handles["no Wobbe band drawn: set [gas_quality]\nwobbe_tolerance_percent for one"] = Line2D([], [], linestyle="none")
    return finish(fig, study, ("Fuel interchangeability: Wobbe index and heating value",
                                f"Is the blend interchangeable? ISO 6976:2016, combustion {gq.combustion_T_C} °C, "
                                f"metering {gq.metering_T_C} °C, 101.325 kPa"), handles, "Fuel gas")


#: How the limits chart marks the criterion that binds past each edge of a window.
BINDING_MARKERS = {"flashback": ("v", "flashback binds"), "blowoff": ("^", "blowoff binds"),
                   "stabilizer": ("s", "stabilizer blowoff binds"), "Wobbe band": ("D", "Wobbe band binds"),
                   "core_flashback": ("<", "core-flow flashback binds (premixer)"),
                   "extinction_blowout": (">", "extinction-strain blowout binds (premixer)"),
                   "no flame": ("P", "no flame beyond (does not burn)"),
                   "autoignition": ("*", "autoignites beyond (no flame)"),
                   "not assessed": ("h", "no criterion in its range beyond (not assessed)")}
#: Edges that leave the window open (drawn hollow): admissible at the last swept value, or not settled.
OPEN_KINDS = ("swept end", "stopped")


def has_limits(data: ChartData, study: Study) -> bool:
    return any(r["outcome"] in ("window", "none admissible") for r in data.limits)


def _limit_groups(rows: list[dict], along: str) -> dict[tuple, list[dict]]:
    """Limit rows grouped into one series per (fuel, oxidizer, p, T_u[, blend]), sorted along ``along``."""
    out: dict[tuple, list[dict]] = {}
    for r in rows:
        key = (r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]) + (
            (r["blend_fraction"],) if along == "blend_fraction" else ())
        out.setdefault(key, []).append(r)
    return {k: sorted(v, key=lambda r: (r[along], r["window"] or 0)) for k, v in out.items()}


def _edge_marker(ax, x, y, r, side, col, handles, scale=1.0):
    """The marker of one window edge: the criterion binding past it, hollow where the window stays open."""
    kind, binding = r[f"{side}_kind"], r[f"{side}_binding"]
    if kind == "range end":
        return
    if kind in OPEN_KINDS:
        ax.plot(x, y, "o", color=col, ms=6, mec="k", mfc="white", zorder=4)
        handles.setdefault("hollow: window open (swept end or edge not settled)",
                           Line2D([], [], ls="", marker="o", mfc="white", mec="k"))
        return
    _binding_marker(ax, x, y, binding, col, handles)


def _binding_marker(ax, x, y, binding: str, col, handles) -> None:
    """The marker of the criterion that binds past an edge (BINDING_MARKERS), named in the legend."""
    mk, text = BINDING_MARKERS.get(binding, ("o", binding))
    ax.plot(x, y, mk, color=col, ms=8, mec="k", zorder=4)
    handles.setdefault(text, Line2D([], [], ls="", marker=mk, color="0.6", mec="k"))


def _miss_marker(ax, x, y, handles):
    ax.plot(x, y, "x", color="crimson", ms=9, mew=2, zorder=4)
    handles.setdefault("no window: closest miss", Line2D([], [], ls="", marker="x", color="crimson"))


def _bar(ax, x, lo, hi, col, width, vertical=True):
    """One admissible window as a thick translucent bar from its low to its high edge."""
    if vertical:
        ax.plot([x, x], [lo, hi], color=col, lw=width, alpha=0.45, solid_capstyle="butt", zorder=2)
    else:
        ax.plot([lo, hi], [x, x], color=col, lw=width, alpha=0.45, solid_capstyle="butt", zorder=2)


def _offsets(n: int, span: float) -> list[float]:
    """Side-by-side offsets of n series, ``span`` wide in all, so that equal answers stay apart (ticks
    mark the swept values the bars stand for)."""
    return [0.0] if n == 1 else [span * (i / (n - 1) - 0.5) for i in range(n)]


def _draw_search_row(ax, x: float, r: dict, col, handles, scale: float) -> None:
    """One limits.csv row drawn at ``x`` along a vertical axis of its search (blend fraction x ``scale``,
    or phi): the window as a bar with its edge markers, or the closest miss, or the window the flames
    alone allow outside the Wobbe band (dotted); the flames the search solved as dots."""
    asked = [float(v) for v in str(r.get("evaluated_at") or "").split()]
    if (r["window"] or 0) <= 1 and asked:
        # on top of the bars and edge markers: an edge lies where the search's last flames were
        ax.plot([x] * len(asked), [scale * v for v in asked], ".", color="0.15", ms=3.5, mec="white", mew=0.4,
                zorder=8)
        handles.setdefault("flames solved by the search", Line2D([], [], ls="", marker=".", color="0.35"))
    if r["outcome"] == "window":
        _bar(ax, x, scale * r["lower_edge"], scale * r["upper_edge"], col, 7)
        _unassessed_stripes(ax, x, scale * r["lower_edge"], scale * r["upper_edge"], r, handles)
        _edge_marker(ax, x, scale * r["lower_edge"], r, "lower", col, handles)
        _edge_marker(ax, x, scale * r["upper_edge"], r, "upper", col, handles)
        fu = r.get("flame_upper_edge")
        if fu is not None and r["upper_kind"] == "Wobbe band" and r["flame_upper_kind"] != "range end":
            ax.plot([x, x], [scale * r["upper_edge"], scale * fu], ":", color=col, lw=1.4)
            handles.setdefault("dotted: what the flame margins alone would allow\n(beyond the Wobbe band)",
                               Line2D([], [], ls=":", color="0.4"))
            if r["flame_upper_kind"] == "found":  # the criterion that ends it, marked like any edge's
                _binding_marker(ax, x, scale * fu, r["flame_upper_binding"], col, handles)
            else:
                ax.plot(x, scale * fu, "_", color=col, ms=12, mew=2)
    elif r["outcome"] == "none admissible" and r.get("flame_lower_edge") is not None:
        ax.plot([x, x], [scale * r["flame_lower_edge"], scale * r["flame_upper_edge"]], ":", color=col, lw=2.2)
        handles.setdefault("dotted: what the flame margins alone would allow\n(beyond the Wobbe band)",
                           Line2D([], [], ls=":", marker="_", color="0.4"))
    elif r["outcome"] == "none admissible" and r["closest_miss_at"] is not None:
        _miss_marker(ax, x, scale * r["closest_miss_at"], handles)


def _unassessed_stripes(ax, at: float, lo: float, hi: float, r: dict, handles, vertical: bool = True) -> None:
    """White stripes down a window's bar where a criterion of its search is not assessed at some
    swept flames (physics.validity): the window rests on the other criteria only."""
    if not r.get("criteria_not_assessed"):
        return
    xs, ys = ([at, at], [lo, hi]) if vertical else ([lo, hi], [at, at])
    ax.plot(xs, ys, color="white", lw=2.0, ls=(0, (2, 2)), zorder=3.5)
    handles.setdefault("striped bar: a criterion not assessed there\n(outside its range; see the report)",
                       Line2D([], [], color="0.55", lw=4, ls=(0, (2, 2))))


def _shade_outside_band(ax, rows, handles, span) -> None:
    """Shade the blend fractions outside the Wobbe band (``span``: ax.axhspan or ax.axvspan), where
    the rows name one band for every curve."""
    bands = {(r["wobbe_band_from"], r["wobbe_band_to"]) for r in rows if r.get("wobbe_band_to") is not None}
    if len(bands) != 1:
        return
    lo, hi = bands.pop()
    for a, b in ((-100.0, 100 * lo), (100 * hi, 200.0)):
        if (a < 0 and lo > 0) or (a > 0 and hi < 1):
            span(a, b, color="0.88", zorder=0)
    handles["grey: outside the Wobbe band"] = Patch(color="0.88")


def _in_colour(rows: list[dict]) -> bool:
    """Whether a series of limits.csv rows draws anything in its own colour (a window, or the
    window the flames alone allow): its legend entry names only what is drawn."""
    return any(r["outcome"] == "window" or (r["outcome"] == "none admissible" and r.get("flame_lower_edge") is not None)
               for r in rows)


def _note_unassessed_searches(ax: Axes, groups: dict[tuple, list[dict]]) -> None:
    """Name in the panel's title the conditions that draw nothing of their own because their
    searches are not assessed (no criterion in its range at the swept flames): no legend entry
    for them, and no silent gap."""
    left = list(dict.fromkeys(f"{k[2]:g} bar {k[3]:g} K" for k, rs in groups.items()
                              if not _in_colour(rs) and any(r["outcome"] == "not assessed" for r in rs)))
    if left:
        ax.set_title(textwrap.fill(f"not assessed, nothing drawn: {', '.join(left)} (no criterion in its range at "
                                   "the swept flames; limits.csv)", 70), fontsize=8.5, color="0.25")


def _draw_blend_windows(ax: Axes, rows: list[dict], study: Study, colours: np.ndarray, handles: dict) -> None:
    """Blend axis against phi: each window a vertical bar from its low to its high blend fraction."""
    groups = _limit_groups(rows, "equivalence_ratio")
    phis = sorted({r["equivalence_ratio"] for r in rows})
    step = min((b - a for a, b in zip(phis, phis[1:])), default=0.1)
    _shade_outside_band(ax, rows, handles, ax.axhspan)
    for (key, rs), col, dx in zip(groups.items(), colours, _offsets(len(groups), 0.25 * step)):
        if _in_colour(rs):
            handles[f"{key[0]}, {key[2]:g} bar, {key[3]:g} K"] = Line2D([], [], color=col, lw=6, alpha=0.45)
        for r in rs:
            _draw_search_row(ax, r["equivalence_ratio"] + dx, r, col, handles, 100.0)
    _note_unassessed_searches(ax, groups)
    ax.set_xlim(phis[0] - 0.6 * step, phis[-1] + 0.6 * step)
    if len(phis) <= 12:
        ax.set_xticks(phis, [f"{v:g}" for v in phis])
    ax.set_xlabel("equivalence ratio φ")
    ax.set_ylabel(f"admissible {study.blend_with} fraction [%]")
    ax.set_ylim(-4, 104)
    ax.grid(alpha=0.3)


def _draw_window_spans(ax, rows, colours, handles):
    """A study without a blend: each condition's admissible phi windows as horizontal spans (one line
    per fuel, pressure and preheat), the binding criterion at each end."""
    conds = list(dict.fromkeys((r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"])
                               for r in rows))
    for y, key in enumerate(conds):
        col = colours[y % len(colours)]
        for r in rows:
            if (r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]) != key:
                continue
            if r["outcome"] == "none admissible" and r.get("flame_lower_edge") is not None:
                ax.plot([r["flame_lower_edge"], r["flame_upper_edge"]], [y, y], ":", color=col, lw=2.2)
            elif r["outcome"] == "none admissible" and r["closest_miss_at"] is not None:
                _miss_marker(ax, r["closest_miss_at"], y, handles)
            if r["outcome"] != "window":
                continue
            _bar(ax, y, r["lower_edge"], r["upper_edge"], col, 7, vertical=False)
            _unassessed_stripes(ax, y, r["lower_edge"], r["upper_edge"], r, handles, vertical=False)
            _edge_marker(ax, r["lower_edge"], y, r, "lower", col, handles)
            _edge_marker(ax, r["upper_edge"], y, r, "upper", col, handles)
    ax.set_yticks(range(len(conds)), [f"{f}, {P:g} bar, {T:g} K" for f, _, P, T in conds], fontsize=8)
    ax.set_ylim(len(conds) - 0.5, -0.5)
    handles.setdefault("bar: an admissible φ window", Line2D([], [], color="0.5", lw=6, alpha=0.45))
    ax.set_xlabel("equivalence ratio φ")
    ax.grid(alpha=0.3, axis="x")


def _draw_phi_windows(ax: Axes, rows: list[dict], study: Study, colours: np.ndarray, handles: dict) -> None:
    """Phi axis against blend fraction: each window a vertical bar from its lean to its rich edge."""
    if not study.blend_with:  # nothing to plot the windows against: the window itself per condition
        _draw_window_spans(ax, rows, colours, handles)
        return
    groups: dict[tuple, list[dict]] = {}
    for r in rows:
        groups.setdefault((r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]), []).append(r)
    fracs = sorted({100 * r["blend_fraction"] for r in rows})
    step = min((b - a for a, b in zip(fracs, fracs[1:])), default=10.0)
    _shade_outside_band(ax, rows, handles, ax.axvspan)
    for (key, rs), col, dx in zip(groups.items(), colours, _offsets(len(groups), 0.25 * step)):
        if _in_colour(rs):
            handles.setdefault(f"{key[0]}, {key[2]:g} bar, {key[3]:g} K", Line2D([], [], color=col, lw=6, alpha=0.45))
        for r in rs:
            _draw_search_row(ax, 100 * r["blend_fraction"] + dx, r, col, handles, 1.0)
    _note_unassessed_searches(ax, groups)
    ax.set_xlim(fracs[0] - 0.6 * step, fracs[-1] + 0.6 * step)
    if len(fracs) <= 12:
        ax.set_xticks(fracs, [f"{v:g}" for v in fracs])
    ax.set_xlabel(f"{study.blend_with} fraction [%]")
    ax.set_ylabel("admissible equivalence ratio φ")
    ax.grid(alpha=0.3)


@chart("admissible_limits",
       "The burner's admissible windows, both edges found by root finding between the solved points (and, "
       "between two failing points, by a search for a window inside): left, the admissible blend fractions at "
       "each equivalence ratio; right, the admissible equivalence ratios at each swept blend. Bar: a window; "
       "marker: the criterion that fails past that edge (hollow: the window stays open at the last swept value "
       "or the edge was not settled); red cross: no window, drawn where the margins came closest; grey dots: "
       "flames the searches solved; dotted: what the flame margins alone would allow where the Wobbe band binds.",
       has_limits)
def limits_chart(data: ChartData, study: Study) -> Figure:
    """Admissible blend-fraction windows vs phi and phi windows vs blend fraction (limits.csv)."""
    P_shown, T_shown = set(data.shown["pressure_bar"]), set(data.shown["unburned_temperature_K"])
    drawn = [r for r in data.limits if r["pressure_bar"] in P_shown and r["unburned_temperature_K"] in T_shown]
    blend = [r for r in drawn if r["axis"] == "blend_fraction"]
    window = [r for r in drawn if r["axis"] == "equivalence_ratio"]
    parts = [p for p in (("blend", blend), ("window", window)) if p[1]]
    fig, axes = figure(len(parts))
    handles: dict = {}
    n = max(len(_limit_groups(blend, "equivalence_ratio")), len({(r["fuel"], r["pressure_bar"],
                                                                   r["unburned_temperature_K"]) for r in window}))
    colours = colour_scale(n)
    for ax, (kind, rows) in zip(axes[0], parts):
        (_draw_blend_windows if kind == "blend" else _draw_phi_windows)(ax, rows, study, colours, handles)
    b, lim = burner_and_limits(study)
    return finish(fig, study, (f"Admissible windows: {b.name}",
                               f"keeping {kept(study).replace('>=', '≥')};\ntolerance "
                               + ", ".join(f"{lim.tolerance[a]:g} in {'blend fraction' if a == 'blend_fraction' else 'φ'}"
                                           for a in lim.find)
                               + data.note("pressure_bar", "unburned_temperature_K").replace("results.nc", "limits.csv")),
                   handles, "")
