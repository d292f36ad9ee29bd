"""Studies comparing mechanisms: the same flames under each, side by side, and how far apart they are.

mechanism_comparison_chart  flame speed and thermal thickness against phi under each mechanism, and
                            their difference from the reference mechanism's (with its kinetic band)
limits_by_mechanism_chart   each limit search's answer under each mechanism, one row per search
"""
from __future__ import annotations

from dataclasses import replace
from pathlib import Path
from typing import TYPE_CHECKING

from matplotlib.lines import Line2D
from matplotlib.patches import Patch

from ...columns import gas_label
from ...design import mechanism_differences
from .registry import MAX_CURVES, MAX_LEVELS, ChartData, chart, spread, thinned_note
from .style import LINESTYLES, MARKERS, colour_scale, curves, figure, finish, ok_rows, panels

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ...config import Study

#: Limit searches one panel of the limits comparison draws, at most.
MAX_SEARCHES = 16


def _names(data) -> list[str]:
    return data.comparison.names if data.comparison is not None else []


def compares_flames(data: ChartData, study: Study) -> bool:
    return data.comparison is not None and bool(ok_rows(data.comparison.rows))


def compares_limits(data: ChartData, study: Study) -> bool:
    return data.comparison is not None and any(r["outcome"] in ("window", "none admissible")
                                                for r in data.comparison.limits)


def _short(name: str) -> str:
    """A mechanism as a chart names it: its file name without folders."""
    return Path(name).name


def _style(names: list[str]) -> dict[str, tuple[str, str]]:
    """Mechanism -> (line style, marker): the reference solid with circles."""
    return {m: (LINESTYLES[i % len(LINESTYLES)], MARKERS[i % len(MARKERS)]) for i, m in enumerate(names)}


@chart("mechanism_comparison",
       "The same flames under each mechanism the study compares (line style per mechanism, colour per gas): "
       "flame speed and thermal thickness against equivalence ratio; right, their difference from the reference "
       "(first) mechanism's in % (solid: flame speed with the numerical error of the difference as bars, dotted: "
       "thickness); shaded: the reference's kinetic band of the flame speed (1σ) where the study asks for one. "
       "A flame-speed difference outside the band says the mechanisms disagree by more than their rate "
       "constants' stated uncertainty.",
       compares_flames)
def mechanism_comparison_chart(data: ChartData, study: Study) -> Figure:
    names = _names(data)
    assert data.comparison is not None  # drawn only for a study comparing mechanisms (compares_flames)
    rows = data.comparison.rows
    ok = ok_rows(rows)
    every = panels(ok)
    conds = [c for c in every if c[0] in spread(sorted({p for p, _ in every}), MAX_LEVELS)
             and c[1] in spread(sorted({T for _, T in every}), MAX_LEVELS)]
    gases = curves(ok)[:max(1, MAX_CURVES // len(names))]
    colours = colour_scale(len(gases))
    style = _style(names)
    diffs = mechanism_differences(rows, names)
    fig, axes = figure(3, len(conds), width=4.3, height=3.3)
    handles: dict = {}
    for (P, T), ax_row in zip(conds, axes):
        for gi, gas in enumerate(gases):
            col = colours[gi]
            for m in names:
                sel = sorted((r for r in ok if r["mechanism"] == m and (r["fuel"], r["oxidizer"], r["blend_with"],
                              r["blend_fraction"]) == gas and (r["pressure_bar"], r["unburned_temperature_K"])
                              == (P, T)), key=lambda r: r["equivalence_ratio"])
                if not sel:
                    continue
                phi = [r["equivalence_ratio"] for r in sel]
                ls, mk = style[m]
                ax_row[0].plot(phi, [100 * r["laminar_flame_speed_m_s"] for r in sel], ls=ls, marker=mk, ms=4,
                               color=col, lw=1.4)
                ax_row[1].plot(phi, [r["thermal_thickness_mm"] for r in sel], ls=ls, marker=mk, ms=4, color=col,
                               lw=1.4)
            _difference_panel(ax_row[2], diffs, gas, (P, T), names, style, col)
            handles.setdefault(gas_label({"fuel": gas[0], "blend_with": gas[2], "blend_fraction": gas[3]})
                               + (f" / {gas[1]}" if len({g[1] for g in gases}) > 1 else ""),
                               Line2D([], [], color=col, lw=2))
        ax_row[0].set_ylabel("laminar flame speed S_L [cm/s]")
        ax_row[1].set_ylabel("thermal thickness [mm]")
        ax_row[2].set_ylabel("difference from the reference [%]")
        ax_row[2].axhline(0.0, color="0.3", lw=0.8)
        for ax in ax_row:
            ax.set_xlabel("equivalence ratio φ")
            ax.grid(alpha=0.3)
            ax.set_title(f"{P:g} bar, {T:g} K", fontsize=9)
    for i, m in enumerate(names):
        ls, mk = style[m]
        handles[_short(m) + (" (reference)" if i == 0 else "")] = Line2D([], [], ls=ls, marker=mk, color="0.2")
    handles["difference panel: S_L (solid, bars: both\nflames' grid error), thickness (dotted)"] = Line2D(
        [], [], color="0.5", marker="|", markersize=8)
    if any(d["reference_kinetic_uncertainty_percent"] is not None for d in diffs):
        handles["reference's kinetic band of S_L (1σ)"] = Patch(color="0.5", alpha=0.2)
    note = thinned_note({}, {}, (f"{len(conds)} of {len(every)} conditions (p, T_u)" if len(conds) < len(every)
                                 else "", f"{len(gases)} of {len(curves(ok))} gases"
                                 if len(gases) < len(curves(ok)) else ""))
    return finish(fig, replace(study, mechanism=" vs ".join(names)),
                  ("Mechanisms compared: " + " vs ".join(_short(m) for m in names),
                               "How much does the answer depend on the chemistry?" + note.replace("results.nc",
                                                                                              "mechanism_comparison.csv")),
                  handles, "mechanism / gas")


def _difference_panel(ax, diffs, gas, cond, names, style, col) -> None:
    """The other mechanisms' differences of one gas and condition, with the reference's kinetic band."""
    mine = [d for d in diffs if (d["fuel"], d["oxidizer"], d["blend_with"], d["blend_fraction"]) == gas
            and (d["pressure_bar"], d["unburned_temperature_K"]) == cond]
    for m in names[1:]:
        sel = sorted((d for d in mine if d["mechanism"] == m), key=lambda d: d["equivalence_ratio"])
        if not sel:
            continue
        phi = [d["equivalence_ratio"] for d in sel]
        ls, mk = style[m]
        ax.errorbar(phi, [d["flame_speed_difference_percent"] for d in sel], ls="-", marker=mk, ms=4, color=col,
                    lw=1.4, capsize=3, elinewidth=1.0,
                    yerr=[d["flame_speed_difference_numerical_error_percent"] or 0.0 for d in sel])
        th = [(d["equivalence_ratio"], d["thermal_thickness_difference_percent"]) for d in sel
              if d["thermal_thickness_difference_percent"] is not None]
        if th:
            ax.plot(*zip(*th), ls=":", marker=mk, ms=3, mfc="white", color=col, lw=1.2)
    band = sorted({(d["equivalence_ratio"], d["reference_kinetic_uncertainty_percent"]) for d in mine
                   if d["reference_kinetic_uncertainty_percent"] is not None})
    if band:
        band_phi, b = zip(*band)
        ax.fill_between(band_phi, [-v for v in b], b, color=col, alpha=0.15, lw=0)


@chart("limits_by_mechanism",
       "Each limit search of the study answered under each mechanism (one thin bar per mechanism and window, "
       "from its low to its high edge; cross: no window, where the margins came closest). Bars that do not "
       "overlap by more than the tolerance: the limit depends on the chemistry; keep the more cautious one.",
       compares_limits)
def limits_by_mechanism_chart(data: ChartData, study: Study) -> Figure:
    names = _names(data)
    style = _style(names)
    assert data.comparison is not None  # drawn only for a study comparing mechanisms (compares_limits)
    found = [r for r in data.comparison.limits if r["outcome"] in ("window", "none admissible")]
    several_ox = len({r["oxidizer"] for r in found}) > 1
    parts = [(kind, [r for r in found if (r["axis"] == "blend_fraction") == (kind == "blend")])
             for kind in ("blend", "window")]
    parts = [p for p in parts if p[1]]
    n_rows = max(len({(r["axis"], gas_label(r), r["oxidizer"], r["equivalence_ratio"], r["blend_fraction"],
                       r["pressure_bar"], r["unburned_temperature_K"]) for r in rows}) for _, rows in parts)
    fig, axes = figure(len(parts), width=5.5, height=max(1.6, 0.35 * min(n_rows, MAX_SEARCHES) + 0.8))
    colours = colour_scale(len(names))
    for ax, (kind, rows) in zip(axes[0], parts):
        scale = 100 if kind == "blend" else 1
        searches: dict[tuple, dict[str, list[dict]]] = {}
        for r in rows:
            key = (r["axis"], gas_label(r) + (f" / {r['oxidizer']}" if several_ox else ""),
                   r["equivalence_ratio"] if kind == "blend" else r["blend_fraction"],
                   r["pressure_bar"], r["unburned_temperature_K"])
            searches.setdefault(key, {}).setdefault(r["mechanism"], []).append(r)
        keys = list(searches)[:MAX_SEARCHES]
        for y, key in enumerate(keys):
            for i, m in enumerate(names):
                offset = 0.14 * (i - (len(names) - 1) / 2)  # mechanisms side by side, not on top of each other
                for r in searches[key].get(m, []):
                    if r["outcome"] == "none admissible":
                        if r["closest_miss_at"] is not None:
                            ax.plot(r["closest_miss_at"] * scale, y + offset, "x", color=colours[i], ms=7, mew=2)
                        continue
                    lo, hi = r["lower_edge"] * scale, r["upper_edge"] * scale
                    ax.plot([lo, hi], [y + offset] * 2, color=colours[i], lw=3, alpha=0.7, solid_capstyle="butt")
                    for v, side in ((lo, "lower"), (hi, "upper")):
                        if r[f"{side}_kind"] != "range end":
                            ax.plot(v, y + offset, style[m][1], color=colours[i], ms=6, mec="k", zorder=2,
                                    mfc=colours[i] if r[f"{side}_kind"] not in ("swept end", "stopped") else "white")
        ax.set_yticks(range(len(keys)), [_search_label(k, kind) for k in keys], fontsize=7.5)
        ax.set_ylim(len(keys) - 0.5, -0.5)  # first search on top
        ax.set_xlabel(f"admissible {study.blend_with} fraction [%]" if kind == "blend"
                      else "admissible equivalence ratio φ")
        ax.grid(alpha=0.3, axis="x")
        if len(searches) > len(keys):
            ax.set_title(f"first {len(keys)} of {len(searches)} searches (every one in limits.csv)", fontsize=8.5)
    handles = {_short(m) + (" (reference)" if i == 0 else ""): Line2D([], [], marker=style[m][1], color=colours[i],
                                                                      mec="k", lw=3) for i, m in enumerate(names)}
    handles["hollow: edge at the last swept value or not settled"] = Line2D([], [], ls="", marker="o", mfc="white",
                                                                            mec="k")
    assert study.burner is not None  # a study with limits has a burner
    return finish(fig, replace(study, mechanism=" vs ".join(names)), ("Admissible windows under each mechanism",
                               f"{study.burner.name}: the same searches, the same burner, different chemistry"),
                  handles, "mechanism")


def _search_label(key: tuple, kind: str) -> str:
    axis, gas, at, P, T = key
    where = f"φ {at:g}" if kind == "blend" else "φ window"
    return f"{gas}, {where}, {P:g} bar, {T:g} K"
