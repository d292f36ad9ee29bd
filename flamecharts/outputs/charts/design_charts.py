"""Design charts beyond flame speed and thickness: scaling, blends, flashback, window, gas quality.

pressure_preheat_chart   S_L vs p and vs T_u on log axes with fitted exponents
blend_chart              S_L, delta_T, T_ad vs blend fraction; S_L at fixed T_ad
flashback_chart          g_F vs phi with the burner's wall gradient; quenching size vs port size
window_chart             (blend, phi) map of flashback and blowoff margins, acceptable region shaded
gas_quality_chart        Wobbe index and heating value vs blend fraction with the allowed band

Drawn from flat rows only (see design.annotate), like every chart; each registered with its caption.
"""
from __future__ import annotations

import numpy as np
from matplotlib.lines import Line2D
from matplotlib.patches import Patch

from ...columns import gas_label
from ...physics.fits import fit_power_law
from .registry import burning_blends, chart, has_margins, has_window, several_blends, varies_p_or_T
from .style import MARKERS, colour_scale, curves as fuel_keys, figure, finish, of, ok_rows, phi_near_one, plain_log_ticks


@chart("pressure_and_preheat_dependence",
       "Flame speed against pressure and against unburned temperature on log "
       "axes; the legend gives the fitted power-law exponent of each curve.",
       varies_p_or_T)
def pressure_preheat_chart(data, study):
    """Flame speed vs pressure and vs unburned temperature (log axes), exponents in the legend."""
    rows = data.rows
    ok = ok_rows(rows)
    phi = phi_near_one(ok)
    sel = [r for r in ok if r["equivalence_ratio"] == phi]
    keys = fuel_keys(sel)
    colours = colour_scale(len(keys))
    fig, axes = figure(2)
    handles = {}
    for ai, (along, fixed, sym, unit) in enumerate((("pressure_bar", "unburned_temperature_K", "β", "bar"),
                                                     ("unburned_temperature_K", "pressure_bar", "α", "K"))):
        ax = axes[0, ai]
        fixed_values = sorted({r[fixed] for r in sel})
        for ci, key in enumerate(keys):
            for fi, fv in enumerate(fixed_values):
                rs = sorted((r for r in of(sel, key) if r[fixed] == fv), key=lambda r: r[along])
                if len(rs) < 2:
                    continue
                x = [r[along] for r in rs]
                y = [100 * r["laminar_flame_speed_m_s"] for r in rs]
                b, _ = fit_power_law(x, y)
                label = (f"{gas_label(rs[0])}, {'T_u' if fixed.startswith('unburned') else 'p'} = {fv:g} "
                         f"{'K' if fixed.startswith('unburned') else 'bar'}: {sym} = {b:+.2f}")
                h, = ax.plot(x, y, color=colours[ci], marker=MARKERS[fi % len(MARKERS)],
                             linestyle="-" if ai == 0 else "--", lw=1.5, label=label)
                handles[label] = h
        ax.set_xscale("log")
        ax.set_yscale("log")
        plain_log_ticks(ax)
        ax.set_xlabel("Pressure p [bar]" if ai == 0 else "Unburned temperature T_u [K]")
        ax.set_ylabel("Laminar flame speed S_L [cm/s]")
        ax.set_title(f"S_L ∝ {'p^β' if ai == 0 else 'T_u^α'} (φ = {phi:g})", fontsize=10)
        ax.grid(True, which="both", color="0.9", lw=0.6)
    return finish(fig, study, ("Pressure and preheat dependence of the flame speed",
                                "How does S_L scale? Power-law exponents fitted per curve "
                                "(Metghalchi & Keck form); all φ in power_law_exponents.csv"),
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


@chart("blend_comparison",
       "Flame speed, thickness and adiabatic temperature against blend fraction at fixed "
       "equivalence ratio, and flame speed at fixed adiabatic flame temperature.",
       burning_blends)
def blend_chart(data, study):
    """S_L, thermal thickness and T_ad vs blend fraction per phi; S_L at fixed T_ad."""
    rows = data.rows
    ok = ok_rows(rows)
    P, T = sorted({(r["pressure_bar"], r["unburned_temperature_K"]) for r in ok})[0]
    ok = [r for r in ok if r["pressure_bar"] == P and r["unburned_temperature_K"] == T]
    fuel, ox = ok[0]["fuel"], ok[0]["oxidizer"]
    ok = [r for r in ok if r["fuel"] == fuel and r["oxidizer"] == ox]
    phis = sorted({r["equivalence_ratio"] for r in ok})
    fracs = sorted({r["blend_fraction"] for r in ok})
    colours = colour_scale(len(phis))
    fig, axes = figure(4, width=3.6)
    handles = {}
    for ai, (col, scale, ylabel) in enumerate((("laminar_flame_speed_m_s", 100, "S_L [cm/s]"),
                                               ("thermal_thickness_mm", 1, "Thermal thickness δ_T [mm]"),
                                               ("adiabatic_flame_temperature_K", 1, "Adiabatic flame T [K]"))):
        ax = axes[0, ai]
        for pi, phi in enumerate(phis):
            rs = sorted((r for r in ok if r["equivalence_ratio"] == phi), key=lambda r: r["blend_fraction"])
            h, = ax.plot([100 * r["blend_fraction"] for r in rs], [scale * r[col] for r in rs],
                         color=colours[pi], marker=MARKERS[pi % len(MARKERS)], lw=1.4, markersize=4)
            handles[f"φ = {phi:g}"] = h
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel(ylabel)
        ax.grid(True, color="0.9", lw=0.6)
    ax = axes[0, 3]
    base = sorted((r for r in ok if r["blend_fraction"] == fracs[0]), key=lambda r: r["equivalence_ratio"])
    peak = int(np.argmax([r["adiabatic_flame_temperature_K"] for r in base])) if base else 0
    targets = [r["adiabatic_flame_temperature_K"] for r in base[:peak + 1]]
    tcol = colour_scale(len(targets))
    for ti, t in enumerate(targets):
        S = [_interp_at_fixed_tad([r for r in ok if r["blend_fraction"] == f], [t])[0] for f in fracs]
        h, = ax.plot([100 * f for f in fracs], [100 * s for s in S], color=tcol[ti], marker="s", lw=1.4,
                     markersize=4, linestyle="--")
        handles[f"T_ad = {t:.0f} K (dashed, right panel)"] = h
    ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
    ax.set_ylabel("S_L at fixed T_ad [cm/s]")
    ax.set_title("at equal flame temperature", fontsize=9)
    ax.grid(True, color="0.9", lw=0.6)
    return finish(fig, study, (f"Blend comparison: {fuel} with {study.blend_with}, p = {P:g} bar, T_u = {T:g} K",
                                "What does blending change? Left three panels at fixed φ; right: S_L at fixed "
                                "adiabatic flame temperature (interpolated along the lean side)"),
                   handles, "Equivalence ratio / flame temperature")


@chart("flashback_chart",
       "Critical flashback gradient (solid) against the burner's wall velocity gradient "
       "(dashed); the shaded band is the required margin: a dashed line inside or below it is a flashback risk.",
       has_margins)
def flashback_chart(data, study):
    """Critical flashback gradient vs phi per blend, with the burner's wall gradient; quench size vs port."""
    rows = data.rows
    b = study.burner
    ok = [r for r in ok_rows(rows) if r["flashback_margin"] is not None]
    panels = sorted({(r["pressure_bar"], r["unburned_temperature_K"]) for r in ok})
    keys = fuel_keys(ok)
    colours = colour_scale(len(keys))
    fig, axes = figure(2, nrows=len(panels))
    handles = {}
    for pi, (P, T) in enumerate(panels):
        ax, axq = axes[pi, 0], axes[pi, 1]
        for ci, key in enumerate(keys):
            rs = sorted((r for r in of(ok, key) if r["pressure_bar"] == P and r["unburned_temperature_K"] == T),
                        key=lambda r: r["equivalence_ratio"])
            if not rs:
                continue
            phi = [r["equivalence_ratio"] for r in rs]
            gF = np.array([r["flashback_critical_gradient_1_s"] for r in rs])
            gw = [r["wall_velocity_gradient_1_s"] for r in rs]
            label = gas_label(rs[0])
            h, = ax.plot(phi, gF, color=colours[ci], marker=MARKERS[ci % len(MARKERS)], lw=1.6, label=label)
            ax.fill_between(phi, gF, gF * b.min_flashback_margin, color=colours[ci], alpha=0.15, lw=0)
            ax.plot(phi, gw, color=colours[ci], linestyle="--", lw=1.4)
            handles[label] = h
            q = "tube_quenching_diameter_mm" if b.port == "round" else "quenching_distance_mm"
            axq.plot(phi, [r[q] for r in rs], color=colours[ci], marker=MARKERS[ci % len(MARKERS)], lw=1.4)
        ax.set_yscale("log")
        ax.set_xlabel("Equivalence ratio φ [-]")
        ax.set_ylabel("Velocity gradient [1/s]")
        ax.set_title(f"Flashback, p = {P:g} bar, T_u = {T:g} K", fontsize=10)
        ax.grid(True, which="both", color="0.9", lw=0.6)
        axq.axhline(b.port_size_m * 1e3, color="0.2", lw=1.4, linestyle="-.")
        axq.set_xlabel("Equivalence ratio φ [-]")
        axq.set_ylabel(("Tube quenching diameter" if b.port == "round" else "Plate quenching distance") + " [mm]")
        axq.set_title("Quenching size vs port size (dash-dot)\nbelow the port line a flame fits into the port",
                      fontsize=9)
        axq.set_ylim(bottom=0)
        axq.grid(True, color="0.9", lw=0.6)
    handles["critical gradient g_F (solid)"] = Line2D([], [], color="0.35", lw=1.6)
    handles[f"burner wall gradient, {b.name} (dashed)"] = Line2D([], [], color="0.35", lw=1.4, linestyle="--")
    handles[f"required margin x{b.min_flashback_margin:g} (band)"] = Patch(color="0.35", alpha=0.2)
    handles[f"port {'diameter' if b.port == 'round' else 'gap'} {b.port_size_m * 1e3:g} mm"] = Line2D(
        [], [], color="0.2", lw=1.4, linestyle="-.")
    return finish(fig, study, (f"Flashback check: {b.name}",
                                "Will the flame flash back? Safe where the dashed wall gradient stays above the "
                                "shaded band of its own colour"), handles, "Fuel and burner")


@chart("operating_window",
       "Map over blend fraction and equivalence ratio: contours of flashback and blowoff "
       "margin; the shaded region meets both minimum margins; dots are solved points.",
       has_window)
def window_chart(data, study):
    """Operating window over (blend fraction, phi): flashback and blowoff margin contours."""
    rows = data.rows
    b = study.burner
    rs_all = [r for r in rows if r["flashback_margin"] is not None or r["status"] != "ok"]
    panels = sorted({(r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]) for r in rows})
    fig, axes = figure(min(len(panels), 3), nrows=int(np.ceil(len(panels) / 3)), width=6.0, height=4.4)
    fracs = sorted({r["blend_fraction"] for r in rows})
    phis = sorted({r["equivalence_ratio"] for r in rows})
    for ax, (fuel, ox, P, T) in zip(axes.flat, panels):
        fb = np.full((len(phis), len(fracs)), np.nan)
        bo = np.full_like(fb, np.nan)
        for r in rs_all:
            if (r["fuel"], r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]) != (fuel, ox, P, T):
                continue
            i, j = phis.index(r["equivalence_ratio"]), fracs.index(r["blend_fraction"])
            if r["flashback_margin"] is not None:
                fb[i, j], bo[i, j] = r["flashback_margin"], r["blowoff_margin"]
        X, Y = np.meshgrid([100 * f for f in fracs], phis)
        # the acceptable region is where the smaller of the two margin ratios is at least 1
        worst = np.fmin(fb / b.min_flashback_margin, bo / b.min_blowoff_margin)
        if np.nanmax(worst) >= 1.0:
            ax.contourf(X, Y, worst, levels=[1.0, np.inf], colors=["#bfe3bf"])
        if np.isnan(fb).any():
            ax.contourf(X, Y, np.isnan(fb).astype(float), levels=[0.5, 1.5], colors=["0.85"], hatches=["//"])
        for grid, level, colour, style, tag in ((fb, b.min_flashback_margin, "#7b2d8e", "-", "flashback"),
                                                (bo, b.min_blowoff_margin, "#1f6f6f", "--", "blowoff")):
            if np.nanmin(grid) < level < np.nanmax(grid):
                cs = ax.contour(X, Y, grid, levels=[level], colors=colour, linewidths=1.6, linestyles=style)
                ax.clabel(cs, fmt=f"{tag} %.1f", fontsize=7.5)
        ax.plot(X.ravel(), Y.ravel(), "k.", markersize=3)
        ax.set_xlabel(f"{study.blend_with} in the fuel gas [mol %]")
        ax.set_ylabel("Equivalence ratio φ [-]")
        ax.set_title(f"{fuel} in {ox}, p = {P:g} bar, T_u = {T:g} K", fontsize=10)
    for ax in list(axes.flat)[len(panels):]:
        ax.set_visible(False)
    handles = {
        f"meets both minimum margins (FB ≥ {b.min_flashback_margin:g}, BO ≥ {b.min_blowoff_margin:g})":
            Patch(color="#cfe8cf"),
        f"flashback margin g_wall/g_F = {b.min_flashback_margin:g}\n(more hydrogen or φ nearer 1.1 lowers it)":
            Line2D([], [], color="#7b2d8e", lw=1.6),
        f"blowoff margin g_B/g_wall = {b.min_blowoff_margin:g}\n(leaner or richer lowers it)":
            Line2D([], [], color="#1f6f6f", lw=1.6, linestyle="--"),
        "no flame or failed (hatched)": Patch(facecolor="0.85", hatch="//"),
        "solved point": Line2D([], [], color="k", marker=".", linestyle="none"),
    }
    return finish(fig, study, (f"Operating window: {b.name}",
                                "Where can it run? Blend fraction and equivalence ratio that keep both margins"),
                   handles, "Margins")


@chart("fuel_interchangeability",
       "Wobbe index and heating value of the blends against blend fraction, with the "
       "allowed Wobbe band.",
       several_blends)
def gas_quality_chart(data, study):
    """Wobbe index and heating value of the blends vs blend fraction, with the allowed band."""
    table = data.gases
    fig, axes = figure(2)
    keys = []
    for g in table:
        k = (g["fuel"], g["oxidizer"])
        if k not in keys:
            keys.append(k)
    colours = colour_scale(len(keys))
    handles = {}
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
    return finish(fig, study, ("Fuel interchangeability: Wobbe index and heating value",
                                f"Is the blend interchangeable? ISO 6976:2016, combustion {gq.combustion_T_C} °C, "
                                f"metering {gq.metering_T_C} °C, 101.325 kPa"), handles, "Fuel gas")
