"""One self-contained HTML report per study: job, study definition, charts, key numbers, provenance.

write_report(study, rows, out_dir) -> out_dir/report.html

The charts are inlined as SVG from out_dir/charts (draw them first), so the file opens
from disk with no network access and prints to PDF from a browser with its charts.
"""
from __future__ import annotations

import math
import time
from collections.abc import Sequence
from pathlib import Path
from statistics import median
from typing import TYPE_CHECKING, TypeVar

import xarray as xr

from .._version import __version__, installed_cantera_version
from ..admissible.words import band_alone, fixed_ratio_note, limit_sentence, search_flames, unassessed
from ..analyses import parts as _analyses
from ..columns import CAUTION, gas_label
from ..config import detailed_path, lumping_note, reduction_note, resolution_label
from ..design import (
    burner_flow_words,
    error_bar_sentence,
    extinction_leave_one_out,
    fuel_gas_table,
    injection_end,
    inside_kinetic_band,
    largest_differences,
    mechanism_differences,
    not_assessed_summary,
    turbulent_speeds,
    verdict_tally,
)
from ..numerics import NUMERICS
from ..physics.indicators import edge_velocity
from ..physics.limits import ignition_check, mechanism_scope
from ..results import (
    core_flashback_sentences,
    margin_sentences,
    margin_summary,
    premixer_summary,
    to_dataset,
)
from .charts import CAPTIONS
from .charts.registry import not_drawn
from .html_blocks import escape, first_rows, html_table, optional
from .tables import uncertainty_settings, write_atomic

if TYPE_CHECKING:
    from ..config import Study
    from ..results import Comparison

T = TypeVar("T")

CSS = """
body { font-family: system-ui, -apple-system, "Segoe UI", Roboto, Arial, sans-serif; color: #1d1d1d;
       max-width: 1180px; margin: 2em auto; padding: 0 1.2em; line-height: 1.45; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; } h2 { font-size: 1.2em; margin-top: 1.8em;
     border-bottom: 1px solid #ccc; padding-bottom: 0.2em; }
.caution { border-left: 5px solid #b35900; background: #fff4e8; padding: 0.7em 1em; margin: 1em 0; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.92em; }
th, td { border: 1px solid #d0d0d0; padding: 0.25em 0.6em; text-align: left; vertical-align: top; }
th { background: #f2f2f2; } td.num { text-align: right; font-variant-numeric: tabular-nums; }
figure { margin: 1.2em 0; break-inside: avoid; page-break-inside: avoid; }
figure svg { max-width: 100%; height: auto; display: block; }
figcaption { font-size: 0.92em; color: #333; margin-top: 0.3em; }
.muted { color: #666; font-size: 0.9em; }
table.points { font-size: 0.8em; } table.points td, table.points th { padding: 0.1em 0.4em; }
@page { size: A4; margin: 12mm 11mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 10pt; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  table, .keep { break-inside: avoid; page-break-inside: avoid; }
  table.points { break-inside: auto; page-break-inside: auto; }
  table.points tr { break-inside: avoid; page-break-inside: avoid; }
  table.points thead { display: table-header-group; }
  figure { break-inside: avoid; page-break-inside: avoid; }
  figure svg { width: 100%; max-height: 24cm; }
  .appendix { break-before: page; page-break-before: always; }
}
"""

#: Most points the report's appendix lists (the rest are in results.csv, which it names).
MAX_POINT_ROWS = 2000


def _inline_svg(path: Path) -> str:
    import re

    text = path.read_text(encoding="utf-8")
    text = text[text.index("<svg"):]
    return re.sub(r"<metadata>.*?</metadata>", "", text, flags=re.S)  # drop the RDF block matplotlib writes


def key_numbers(study: Study, rows: list[dict]) -> list[list[str]]:
    """The few numbers a design review asks for first, as table rows."""
    ok = [r for r in rows if r["status"] == "ok"]
    out = []
    if ok:
        top = max(ok, key=lambda r: r["laminar_flame_speed_m_s"])
        out.append(["Highest laminar flame speed", f"{100 * top['laminar_flame_speed_m_s']:.1f} cm/s",
                    f"{gas_label(top)}, φ {top['equivalence_ratio']:g}, {top['pressure_bar']:g} bar, "
                    f"{top['unburned_temperature_K']:g} K"])
        thin = min(ok, key=lambda r: r["thermal_thickness_mm"])
        out.append(["Thinnest flame (thermal thickness)", f"{thin['thermal_thickness_mm']:.3f} mm",
                    f"{gas_label(thin)}, φ {thin['equivalence_ratio']:g}, {thin['pressure_bar']:g} bar"])
        est = [r for r in ok if r.get("flame_speed_numerical_error_percent") is not None]
        if est:
            worst = max(est, key=lambda r: r["flame_speed_numerical_error_percent"])
            out.append(["Largest numerical (grid) error band of S_L", f"±{worst['flame_speed_numerical_error_percent']:.2g} %",
                        f"{gas_label(worst)}, φ {worst['equivalence_ratio']:g}, {worst['pressure_bar']:g} bar; "
                        f"median of all flames ±{median(r['flame_speed_numerical_error_percent'] for r in est):.2g} %"])
    if study.burner is not None and ok:
        col, need, name = study.burner.blowoff
        for c, head, minimum in (("flashback_margin", "flashback margin g_wall/g_F", study.burner.min_flashback_margin),
                                 (col, f"{name} margin " + ("U_BO/U_edge" if name == "stabilizer" else "g_B/g_wall"),
                                  need)):
            have = [r for r in ok if r.get(c) is not None]
            if have:
                w = min(have, key=lambda r: r[c])
                out.append([f"Smallest {head}", f"{w[c]:.2f}",
                            f"{gas_label(w)}, φ {w['equivalence_ratio']:g} (minimum set: {minimum:g})"
                            + (f"; not assessed at {len(ok) - len(have)} of {len(ok)} flames" if len(have) < len(ok)
                               else "")])
            else:
                out.append([f"Smallest {head}", "not assessed", f"assessed at none of the {len(ok)} flames (see Criteria "
                                                                "not assessed)"])
        out.append(["Points ok, and on what (verdicts)", verdict_tally([r["verdict"] for r in ok]), study.burner.name])
    for analysis in _analyses("report"):  # the registered analyses' key numbers (flamecharts.analyses)
        out += analysis.KEY_NUMBERS(study, ok) if hasattr(analysis, "KEY_NUMBERS") else []
    bad = [r for r in rows if r["status"] != "ok"]
    out.append(["Points without a flame", f"{len(bad)} of {len(rows)}",
                "; ".join(f"{gas_label(r)} φ {r['equivalence_ratio']:g}: {r['status']}" for r in bad[:6])
                + (" ..." if len(bad) > 6 else "")])
    return out


#: Conditions listed in the key numbers' admissible ranges (the rest: limits.csv).
MAX_KEY_LIMITS = 8


def _span(r: dict) -> str:
    """'15.2–18.4 %' or 'φ 0.689–0.731' of one window row (an edge left open at the last swept
    value marked ≤ or ≥)."""
    if r["lower_edge"] == r["upper_edge"]:  # one swept value, admissible, with no neighbour to search towards
        only = _number(r, r["lower_edge"])
        return f"{only} % (the only value swept)" if r["axis"] == "blend_fraction" else f"φ {only} (the only value swept)"
    lo = ("≤" if r["lower_kind"] == "swept end" else "") + _number(r, r["lower_edge"])
    hi = ("≥" if r["upper_kind"] == "swept end" else "") + _number(r, r["upper_edge"])
    return f"{lo}–{hi} %" if r["axis"] == "blend_fraction" else f"φ {lo}–{hi}"


def _number(r: dict, v: float) -> str:
    return f"{100 * v:.1f}" if r["axis"] == "blend_fraction" else f"{v:.3f}"


def _axis_value(r: dict, v: float) -> str:
    return f"{_number(r, v)} %" if r["axis"] == "blend_fraction" else f"φ {_number(r, v)}"


def limit_key_numbers(study: Study, limits: Sequence[dict]) -> list[list[str]]:
    """The admissible range of every searched condition, first of the key numbers: the
    blend fractions the burner takes (else the phi windows), with what binds at each edge."""
    out = []
    for axis in ("blend_fraction", "equivalence_ratio"):
        out += _key_limits(study, [r for r in limits if r["axis"] == axis], axis)
    return out


def _key_limits(study: Study, mine: list[dict], axis: str) -> list[list[str]]:
    """Key-number rows of one axis's searches: one per condition, at most MAX_KEY_LIMITS."""
    groups: dict[tuple, list[dict]] = {}
    for r in mine:
        groups.setdefault((r["fuel"], r["oxidizer"], r["blend_fraction"], r["equivalence_ratio"], r["pressure_bar"],
                           r["unburned_temperature_K"]), []).append(r)
    what = (f"Admissible {study.blend_with} fraction" if axis == "blend_fraction" else "Admissible φ window")
    out = []
    for _key, rs in list(groups.items())[:MAX_KEY_LIMITS]:
        r0 = rs[0]
        where = (f"{r0['fuel']}, φ {r0['equivalence_ratio']:g}" if axis == "blend_fraction" else gas_label(r0)) + \
            f", {r0['pressure_bar']:g} bar, {r0['unburned_temperature_K']:g} K"
        wins = [r for r in rs if r["outcome"] == "window"]
        if wins:
            value = "; ".join(_span(r) for r in wins)
            binds = sorted({r[f"{s}_binding"] for r in wins for s in ("lower", "upper") if r[f"{s}_binding"]})
            where += f" ({', '.join(binds)} bind{'s' if len(binds) == 1 else ''})" if binds else " (nothing binds)"
            gaps = sorted({c for r in wins for c, _ in unassessed(r)})
            if gaps:
                where += f"; {' and '.join(gaps)} not assessed"
        elif r0["outcome"] == "none admissible":
            value = "none"
            if r0.get("flame_lower_edge") is not None:
                where += (f" (outside the Wobbe band; the flames alone allow "
                          f"{_axis_value(r0, r0['flame_lower_edge'])} to {_axis_value(r0, r0['flame_upper_edge'])})")
            elif r0.get("closest_miss_at") is not None:
                where += f" (closest at {_axis_value(r0, r0['closest_miss_at'])}: {r0['closest_miss_margins']})"
        elif r0["outcome"] == "not assessed":
            value = "not assessed"
            band = band_alone(r0, study)
            where += " (no criterion in its range: see Criteria not assessed" + (f"; {band})" if band else ")")
        else:
            value = "not settled"
        out.append([what, value, where])
    if len(groups) > MAX_KEY_LIMITS:
        out.append([what, "...", f"{len(groups) - MAX_KEY_LIMITS} more conditions in limits.csv and under Limits"])
    return out


def _lowest_cell(s: dict, name: str) -> str:
    """'1.62 (1)': a margin_summary row's smallest margin and its phi, or 'not assessed'."""
    v = s[f"min_{name}_margin"]
    return "not assessed" if v is None else f"{v:.2f} ({s[f'at_phi_{name}']:g})"


def _points_appendix(study: Study, rows: list[dict], comparison: Comparison | None = None) -> str:
    """Appendix at the end of the report: one line per point (the first MAX_POINT_ROWS), printed on pages of its own."""
    burner = study.burner is not None
    # the blowoff margin that decides the verdict: the rim's, or the bluff body's (SM) where the flame sits on one
    bo_col, bo_head = ((study.burner.blowoff[0], "SM" if study.burner.on_stabilizer else "BO")
                       if study.burner is not None else ("", ""))
    head = ["gas", "φ", "p [bar]", "T_u [K]", "status", "S_L [cm/s]", "δ_T [mm]", "T_ad [K]", "g_F [1/s]",
            "d_q [mm]"] + (["U [m/s]", "FB", bo_head, "verdict"] if burner else []) + ["warning"]
    lines = []
    for r in rows[:MAX_POINT_ROWS]:
        S = r["laminar_flame_speed_m_s"]
        line = [gas_label(r), f"{r['equivalence_ratio']:g}", f"{r['pressure_bar']:g}",
                f"{r['unburned_temperature_K']:g}", r["status"], optional(None if S is None else 100 * S, ".2f"),
                optional(r["thermal_thickness_mm"], ".3f"), optional(r["adiabatic_flame_temperature_K"], ".0f"),
                optional(r["flashback_critical_gradient_1_s"], ".0f"), optional(r["quenching_distance_mm"], ".2f")]
        if burner:
            line += [optional(r["port_velocity_m_s"], ".3f"), optional(r["flashback_margin"], ".2f"),
                     optional(r[bo_col], ".2f"), r["verdict"] or ""]
        lines.append(line + ["yes" if r.get("warnings") else ""])
    more = (f" The first {MAX_POINT_ROWS} of {len(rows)} points are listed; all are in results.csv."
            if len(rows) > MAX_POINT_ROWS else " Every column of every point is in results.csv.")
    numeric = set(range(1, 4)) | set(range(5, 10)) | ({10, 11, 12} if burner else set())
    return ("<section class='appendix'><h2 id='points'>Appendix: every point"
            + (f" under {escape(study.mechanism)}, the reference (every mechanism's in results.csv)"
               if comparison is not None else "") + "</h2>"
            f"<p class='muted'>{len(rows)} points.{escape(more)}</p>"
            f"{html_table(head, lines, numeric, 'points')}"
            "</section>")


def _study_section(study: Study, rows: list[dict], gases: list[dict] | None) -> list[str]:
    """The study's definition: fuels, oxidizers, sweep axes, lumping, burner, fuel-gas table."""
    parts: list[str] = []
    parts.append("<h2>Study</h2>")
    parts.append(html_table(["fuel", "composition (mole fractions)"],
                        [[n, ", ".join(f"{k} {v:.4g}" for k, v in c.items())] for n, c in study.fuels.items()]))
    parts.append(html_table(["oxidizer", "composition (mole fractions)"],
                        [[n, ", ".join(f"{k} {v:.4g}" for k, v in c.items())] for n, c in study.oxidizers.items()]))
    window = [["fuels swept", ", ".join(study.sweep_fuels)], ["oxidizers", ", ".join(study.sweep_oxidizers)]]
    if study.blend_with:
        window.append([f"{study.blend_with} in the fuel gas [mol %]",
                       ", ".join(f"{100 * f:g}" for f in study.blend_fractions)])
    window += [["equivalence ratio", ", ".join(f"{v:g}" for v in study.equivalence_ratios)],
               ["pressure [bar]", ", ".join(f"{v:g}" for v in study.pressures_bar)],
               ["unburned temperature [K]", ", ".join(f"{v:g}" for v in study.unburned_temperatures_K)],
               ["points", str(len(rows))]]
    parts.append(html_table(["axis", "values"], window))
    note = lumping_note(study)
    if note:
        parts.append(f"<div class='caution'><b>Lumped fuel.</b> {escape(note)}</div>")
    if study.reduced is not None:
        parts.append(f"<div class='caution'><b>{'Reduced mechanism' if study.reduced.reduced else 'Mechanism reduction'}"
                     f".</b> {escape(reduction_note(study))}{escape(_band_where(rows))}</div>")
    b = study.burner
    if b is not None:
        how = burner_flow_words(b)
        brows = [["name", b.name], ["port", f"{b.port}, {'diameter' if b.port == 'round' else 'gap'} "
                                            f"{b.port_size_m * 1e3:g} mm"
                                            + ("; a deck of merged port flames" if b.layout == "deck" else "")],
                 ["port velocity set by", how],
                 ["minimum margins", f"flashback {b.min_flashback_margin:g}, {b.blowoff[2]} {b.blowoff[1]:g}"]]
        if b.stabilizer_size_m is not None:
            assert b.approach_velocity_m_s is not None  # config sets it with the stabilizer size
            brows.append(["bluff-body stabilizer", f"{b.stabilizer_size_m * 1e3:g} mm at "
                                                   f"{b.approach_velocity_m_s:g} m/s approach, blocking "
                                                   f"{100 * b.stabilizer_blockage:g} % of the duct: "
                                                   f"{edge_velocity(b.approach_velocity_m_s, b.stabilizer_blockage):.3g} m/s "
                                                   "past its edge"])
        parts.append("<div class='keep'><h3>Burner</h3>" + html_table(["", ""], brows) + "</div>")
    gases = fuel_gas_table(study) if gases is None else gases
    parts.append(f"<div class='keep'><h3>Fuel gases</h3><p class='muted'>{escape(gases[0]['conditions'])}; "
                 f"{escape(gases[0]['method'])}</p>")
    parts.append(html_table(["gas", "HHV [MJ/m³]", "LHV [MJ/m³]", "relative density", "Wobbe (higher) [MJ/m³]",
                         "Wobbe change [%]", "in band"],
                        [[gas_label(g) + f" in {g['oxidizer']}", f"{g['higher_heating_value_MJ_m3']:.3f}",
                          f"{g['lower_heating_value_MJ_m3']:.3f}", f"{g['relative_density']:.4f}",
                          f"{g['higher_wobbe_index_MJ_m3']:.3f}", f"{g['wobbe_change_percent']:+.2f}",
                          "" if g["wobbe_in_band"] is None else ("yes" if g["wobbe_in_band"] else "NO")]
                         for g in gases], num_cols={1, 2, 3, 4, 5}) + "</div>")

    return parts


def _premixer_section(study: Study, rows: list[dict]) -> list[str]:
    """Autoignition in the premixer: the shortest delay per gas and condition, its margin and verdict."""
    summary = premixer_summary(study, rows)
    if not summary:
        return []
    summary, more = first_rows(summary, "results.csv", order=lambda s: s["autoignition_margin"])
    pm = study.premixer
    assert pm is not None  # premixer_summary is empty without [premixer]
    inf = float("inf")
    return ["<h2 id='premixer'>Premixer autoignition</h2>",
            f"<p>Ignition delay of the fresh mixture at the preheat and pressure of each point: the time of the "
            f"largest temperature rise rate in an adiabatic constant-pressure reactor (Cantera). Margin = delay / "
            f"residence time ({pm.residence_time_s * 1e3:g} ms); required at least {pm.min_autoignition_margin:g}. "
            f"{escape(ignition_check(study.mechanism))}. Near the fuel injection the fuel meets the oxidizer before it is "
            f"mixed: the shortest delay over φ 0.25-4 at the same temperature and pressure (fuel as hot as the "
            f"oxidizer: conservative) is given beside; where it falls at an end of that range, mixtures beyond it "
            f"may ignite sooner still. A mean residence time also hides the slowest fluid in "
            f"wakes and recirculation: keep a wide margin and confirm by test.</p>",
            html_table(["gas", "p [bar]", "T_u [K]", "shortest delay [ms] (φ)", "margin", "near injection [ms] (φ)",
                    "points ok", "verdicts"],
                   [[gas_label(s), f"{s['pressure_bar']:g}", f"{s['unburned_temperature_K']:g}",
                     "no ignition" if s["ignition_delay_ms"] == inf else f"{s['ignition_delay_ms']:.3g} ({s['at_phi']:g})",
                     "> horizon" if s["autoignition_margin"] == inf else f"{s['autoignition_margin']:.3g}",
                     _injection_cell(s), f"{s['points'] - s['risky_points']} of {s['points']}",
                     "; ".join(s["verdicts"])] for s in summary], {1, 2, 4}) + more] + _regime_lines(rows) \
        + _turbulent_speed_lines(study, rows) + _premixer_margin_lines(study, rows)


def _regime_lines(rows: list[dict]) -> list[str]:
    """One paragraph on where the premixer's flames sit among the turbulent regimes (design.turbulence_columns)."""
    have = [r for r in rows if r.get("combustion_regime")]
    if not have:
        return []
    counts: dict[str, int] = {}
    for r in have:
        counts[r["combustion_regime"]] = counts.get(r["combustion_regime"], 0) + 1
    ka = [r["karlovitz_number"] for r in have]
    return [f"<p><b>Turbulent flame regime</b> (Peters 2000; u' {min(r['rms_velocity_m_s'] for r in have):.3g}-"
            f"{max(r['rms_velocity_m_s'] for r in have):.3g} m/s and l_t {have[0]['integral_length_mm']:.3g} mm, "
            f"{escape(have[0]['turbulence_source'])}): "
            + ", ".join(f"{escape(k)} at {n} of {len(have)} points" for k, n in sorted(counts.items(), key=lambda t: -t[1]))
            + f"; Karlovitz number {min(ka):.2g}-{max(ka):.2g}. Laminar flame criteria do not apply in a turbulent "
            "premixer; see the regime diagram. The duct estimate (u'/U = 0.16 Re^-1/8, l_t = 0.07 D_h) is common "
            "practice without source: give the premixer's own turbulence where it is known.</p>"]


#: The turbulent flame speed correlations of the premixer section: what each is and carries, with
#: its source and the scatter its source states (physics/premixer.py and its working note
#: docs/research/premixer-sources.md: none of the sources read states one).
TURBULENT_CORRELATIONS = (
    ("zimont", "Zimont", "Zimont's closure 0.52 u' Da^1/4 (Zimont 2000; no Lewis number)"),
    ("muppala", "Muppala", "Muppala et al.'s algebraic closure with 1/Le of the deficient reactant (Muppala et al. "
                           "2005; fitted on methane, ethylene and propane at 0.1-1 MPa, Le 0.9-2 from memory)"),
    ("leading point", "leading point", "Schmid et al.'s S_L + u' (1 + Da^-2)^-1/4 with S_L replaced by the strongest "
                                       "consumption speed S_c,max of the point's strained-flame ladder (the leading-"
                                       "point idea, Kuznetsov &amp; Sabelnikov 1990; Venkateswaran et al. 2015), "
                                       "where a [stretch] ladder burned at the gas, pressure and preheat: S_c,max "
                                       "interpolated between the ladder points like κ_ext below"),
)


def _speed_cell(r: dict, name: str) -> str:
    """A turbulent flame speed [m/s] with * where the correlation is outside its fitted range."""
    s = turbulent_speeds(r).get(name)
    return "" if s is None else f"{s.S_T_m_s:.3g}" + ("" if s.in_range else " *")


def _turbulent_speed_lines(study: Study, rows: list[dict]) -> list[str]:
    """The premixer's turbulent flame speeds side by side per point, the core-flow flashback
    margin and one sentence per gas and condition (design.turbulent_speed_columns)."""
    have = [r for r in rows if r.get("core_flashback_margin") is not None]
    if not have:
        return []
    shown = [c for c in TURBULENT_CORRELATIONS if any(r.get(f"turbulent_flame_speed_{c[0].replace(' ', '_')}_m_s")
                                                      is not None for r in have)]
    listed, more = first_rows(have, "results.csv", order=lambda r: r["core_flashback_margin"])
    table = [[gas_label(r), f"{r['pressure_bar']:g}", f"{r['unburned_temperature_K']:g}", f"{r['equivalence_ratio']:g}",
              f"{r['laminar_flame_speed_m_s']:.3g}"] + [_speed_cell(r, c[0]) for c in shown]
             + [f"{r['port_velocity_m_s']:.3g}", f"{r['core_flashback_margin']:.3g} ({r['core_flashback_correlation']})"]
             for r in listed]
    return ["<h3>Turbulent flame speed and core-flow flashback</h3>",
            "<p>Turbulent flame speed S_T of each burning point by correlation (physics/premixer.py), from the "
            "stored flame and the turbulence above: " + "; ".join(f"<b>{label}</b>: {what}, scatter not stated in its "
                                                                   "source" for _, label, what in shown)
            + ". Core-flow flashback margin = bulk (port) velocity / the largest S_T of the correlations at the point, "
            "in or out of their fitted range (the correlation named beside it): below 1 the turbulent flame can travel "
            "upstream through the premixer's core. It does not see combustion-induced vortex breakdown of swirl "
            "flames; the premixer's verdict counts it (below), and [limits] as core_flashback. * marks a correlation "
            "outside the range of its fitted data (results.csv, turbulent_flame_speed_outside_range, says why). "
            "Turbulent correlations are fits with wide scatter and disagree with one another by more; a premixer "
            "fails at local features no one-dimensional model sees (wakes, recirculation, hot spots), and is judged "
            "finally by test under the applicable gas-turbine standards.</p>",
            html_table(["gas", "p [bar]", "T_u [K]", "φ", "S_L [m/s]"] + [f"S_T {label} [m/s]" for _, label, _ in shown]
                   + ["bulk velocity [m/s]", "core-flow margin (largest S_T)"], table,
                   set(range(1, 7 + len(shown)))) + more,
            "<ul>" + "".join(f"<li>{escape(t)}</li>" for t in core_flashback_sentences(study, have)) + "</ul>"]


def _leave_one_out_words(rows: list[dict]) -> str:
    """How far the interpolated extinction strain rate may be off: the leave-one-out check over the
    ladder points (design.extinction_leave_one_out), in one sentence."""
    loo = extinction_leave_one_out(rows)
    if not loo:
        return ("No gas and condition has two ladder points, so the interpolation's error cannot be measured on "
                "this study (docs/premixers.md gives the figure measured on hydrogen-air ladders).")
    def worst(kind: str) -> str:
        mine = [d for d in loo if d["how"].startswith(kind)]
        if not mine:
            return ""
        d = max(mine, key=lambda d: abs(d["error_percent"]))
        return f"up to {d['error_percent']:+.0f} % where {kind} (φ {d['equivalence_ratio']:g} of {gas_label(d)})"
    parts = [w for w in (worst("interpolated"), worst("nearest ladder point")) if w]
    return (f"Leave-one-out check over the {len(loo)} ladder points (each predicted from the other ladders of its "
            f"gas, pressure and preheat): κ_ext off by " + "; by ".join(parts)
            + ". Read interpolated blowout margins with that error.")


def _margin_cell(r: dict, column: str) -> str:
    v = r.get(column)
    return "not assessed" if v is None else f"{v:.3g}"


def _premixer_margin_lines(study: Study, rows: list[dict]) -> list[str]:
    """The premixer's boundary-layer flashback and extinction-strain blowout margins per burning
    point and one sentence per gas and condition on each (design.premixer_margins)."""
    have = [r for r in rows if r.get("boundary_layer_flashback_status")]
    if not have:
        return []
    pm = study.premixer
    assert pm is not None  # the columns exist only with [premixer]
    listed, more = first_rows(have, "results.csv", order=lambda r: r.get("extinction_blowout_margin") or float("inf"))
    table = [[gas_label(r), f"{r['pressure_bar']:g}", f"{r['unburned_temperature_K']:g}", f"{r['equivalence_ratio']:g}",
              _margin_cell(r, "boundary_layer_flashback_margin"),
              "" if r.get("blowout_extinction_strain_rate_1_s") is None
              else f"{r['blowout_extinction_strain_rate_1_s']:.3g}",
              str(r.get("extinction_strain_source") or "").replace("not assessed: ", ""),
              _margin_cell(r, "extinction_damkohler_number"), _margin_cell(r, "extinction_blowout_margin"),
              r["verdict"]] for r in listed]
    def bl_why(r: dict) -> str:
        return str(r["boundary_layer_flashback_status"]).removeprefix("not assessed: ")

    def blow_why(r: dict) -> str:
        return str((r.get("not_assessed") or {}).get("blowout", ""))

    def sources(mine: list[dict]) -> str:
        return "κ_ext " + ", ".join(sorted({str(r["extinction_strain_source"]).split(" (")[0] for r in mine}))
    sentences = (margin_sentences(study, have, "boundary_layer_flashback_margin", "boundary-layer flashback margin",
                                  "the flame can enter the duct's boundary layer", why=bl_why)
                 + margin_sentences(study, have, "extinction_blowout_margin", "extinction-strain blowout margin",
                                    "lean blowout", sources, why=blow_why))
    return ["<h3>Boundary-layer flashback and lean blowout</h3>",
            "<p><b>Boundary-layer flashback</b>: the critical-gradient model (Lewis &amp; von Elbe; Putnam &amp; "
            "Jensen 1949): the duct's wall velocity gradient, laminar through turbulent by Churchill's (1977) friction "
            "factor, over S²/(Pe_F α_u), with S the strained flames' S_c,max where a ladder burned and it exceeds S_L. "
            "Pe_F is fitted on laminar tube flashback: in transitional and turbulent duct flow the margin is assessed "
            f"only with a turbulent Pe_F calibrated on your own premixer ([premixer] turbulent_flashback_peclet"
            f"{', here ' + format(pm.turbulent_flashback_peclet, 'g') if pm.turbulent_flashback_peclet else ', not set'}"
            "; published models of confined turbulent flashback could not be implemented from what was read). "
            "<b>Lean blowout</b>: the Damköhler number Da_ext = κ_ext d / U_edge on the extinction strain rate of the "
            "strained flames and the stabilizer's size and edge velocity (Shanbhogue, Husain &amp; Lieuwen 2009; lean "
            "blowout of hydrogen blends collapses on it, Zhang et al. 2007, from memory), margin = Da_ext / "
            f"{pm.blowout_damkohler:g} ([premixer] blowout_damkohler; of order one, scatter a factor 2-3 between data "
            "sets, from memory). κ_ext is a [stretch] ladder's at its points; elsewhere interpolated, linearly in ln "
            "κ_ext along φ and then along the blend fraction, between the ladder points of the same gas, pressure and "
            "preheat, held at the nearest one beyond them, never extrapolated. "
            + escape(_leave_one_out_words(rows)) + " The verdict of a premixer point counts the core-flow and "
            "boundary-layer flashback margins against the burner's minimum flashback margin and the blowout margin "
            "against its minimum stabilizer margin, where each is assessed. Neither sees wall temperature, wakes, "
            "recirculation or hot spots; a premixer is judged finally by test under the applicable gas-turbine "
            "standards.</p>",
            html_table(["gas", "p [bar]", "T_u [K]", "φ", "boundary-layer margin", "κ_ext [1/s]", "κ_ext from", "Da_ext",
                    "blowout margin", "verdict"], table, {1, 2, 3, 4, 5, 7, 8}) + more,
            "<ul>" + "".join(f"<li>{escape(t)}</li>" for t in sentences) + "</ul>"]


def _injection_cell(s: dict) -> str:
    """'0.41 (4)' or 'no ignition': the shortest delay near the fuel injection and its phi."""
    tau = s.get("injection_ignition_delay_ms")
    if tau is None:
        return ""
    phi = s["injection_equivalence_ratio"]
    return "no ignition" if tau == float("inf") else f"{tau:.3g} ({phi:g}{injection_end(phi)})"


def by_gas_and_condition(rows: list[dict]) -> dict[tuple, list[dict]]:
    """(gas label, oxidizer, pressure, preheat) -> its rows, in first-seen order."""
    groups: dict[tuple, list[dict]] = {}
    for r in rows:
        groups.setdefault((gas_label(r), r["oxidizer"], r["pressure_bar"], r["unburned_temperature_K"]), []).append(r)
    return groups


def _mechanisms_section(study: Study, comparison: Comparison | None) -> list[str]:
    """A study comparing mechanisms: what each was built for, and per gas and condition the largest
    difference of its flame speed from the reference's, beside the reference's kinetic band."""
    if comparison is None:
        return []
    names = comparison.names
    diffs = mechanism_differences(comparison.rows, names)
    table = []
    for d in largest_differences(diffs):
        band = d["reference_kinetic_uncertainty_percent"]
        dth = d["thermal_thickness_difference_percent"]
        num = d["flame_speed_difference_numerical_error_percent"]
        table.append([d["mechanism"], f"{gas_label(d)} in {d['oxidizer']}", f"{d['pressure_bar']:g}",
                      f"{d['unburned_temperature_K']:g}", f"{d['flame_speed_difference_percent']:+.1f}"
                      + ("" if num is None else f" ± {num:.2g}") + " (φ "
                      f"{d['equivalence_ratio']:g}: {100 * d['laminar_flame_speed_m_s']:.3g} vs "
                      f"{100 * d['reference_laminar_flame_speed_m_s']:.3g} cm/s)",
                      "" if dth is None else f"{dth:+.1f}",
                      "" if band is None else f"{band:.2g} ({'inside' if inside_kinetic_band(d) else 'outside'})",
                      str(d["points"])])
    table, more = first_rows(table, "mechanism_comparison.csv")
    parts = ["<h2 id='mechanisms'>Mechanisms compared</h2>",
             "<p>The whole sweep was solved under each mechanism, the same flames with the same numerics; "
             f"differences are in % of the reference, {escape(names[0])}, with the numerical error of the difference "
             "(both flames' grid bands combined): a smaller difference is not resolved. "
             + ("Where the difference is larger than the reference's kinetic band, the mechanisms disagree by more "
                "than their rate constants' stated uncertainty: trust neither without measurements for that mixture. "
                if any(d["reference_kinetic_uncertainty_percent"] is not None for d in diffs) else
                "Add an [uncertainty] table to compare each difference with the reference's kinetic band. ")
             + "Every point is in mechanism_comparison.csv and, with its mechanism, in results.csv.</p>",
             html_table(["mechanism", "gas", "p [bar]", "T_u [K]", "largest S_L difference ± numerics [%]",
                     "thickness difference there [%]", "reference's kinetic band, 1σ [%]", "points compared"],
                    table, {2, 3, 5, 7}) + more,
             "<div class='keep'><h3>What each mechanism was built for</h3>"
             + html_table(["mechanism", "built and validated for"],
                      [[s.mechanism, mechanism_scope(s.mechanism_path)] for s in comparison.studies]) + "</div>"]
    searches: dict[tuple, dict[str, str]] = {}
    for r in comparison.limits:
        key = (r["axis"], f"{gas_label(r)} in {r['oxidizer']}", r["equivalence_ratio"], r["pressure_bar"],
               r["unburned_temperature_K"])
        text = _span(r) if r["outcome"] == "window" else r["outcome"]
        got = searches.setdefault(key, {})
        got[r["mechanism"]] = f"{got[r['mechanism']]}; {text}" if r["mechanism"] in got else text
    if searches:
        rows_l, more_l = first_rows([[k[0].replace("_", " "), k[1], f"{k[2]:g}" if k[0] == "blend_fraction" else "",
                                  f"{k[3]:g}", f"{k[4]:g}", *(v.get(m, "") for m in names)]
                                 for k, v in searches.items()], "limits.csv")
        parts.append("<div class='keep'><h3>Limits under each mechanism</h3>"
                     + html_table(["admissible window along", "gas", "at φ", "p [bar]", "T_u [K]", *names], rows_l, {2, 3, 4})
                     + more_l
                     + "</div>")
    return parts


def _band_where(rows: list[dict]) -> str:
    """Where a reduced study's reduction band is ('' when no point has one: the note says why)."""
    if not any(r.get("flame_speed_reduction_error_percent") is not None for r in rows):
        return ""
    return (" Each flame's reduction band is in results.csv (flame_speed_reduction_error_percent) and under How "
            "sure, below.")


def _reduction_paragraph(study: Study, banded: bool) -> list[str]:
    """How sure's paragraph on the reduction: what the band is, or why there is none ([] without
    [reduction])."""
    if study.reduced is None:
        return []
    if banded:
        why = (" The band of a point is its own measured error where it was a validation flame, else the largest "
               "over them; it is the skeletal mechanism's difference from the detailed one, beside (not inside) "
               "the detailed mechanism's kinetic band.")
    elif study.reduced.reduced:
        why = (" No point has a reduction band: no validation flame measured the skeletal mechanism's flame-speed "
               "error (results.csv reduction_error_source says why).")
    else:
        why = ""  # the note says that the detailed mechanism is used and that there is no band
    return [f"<p><b>Reduction.</b> {escape(reduction_note(study))}{escape(why)}</p>"]


def _span_text(values: list[float]) -> str:
    """'0.3-1.2' (one value when both ends print alike; '' when there is none)."""
    if not values:
        return ""
    lo, hi = f"{min(values):.2g}", f"{max(values):.2g}"
    return lo if lo == hi else f"{lo}-{hi}"


def _uncertainty_section(study: Study, rows: list[dict], comparison: Comparison | None = None) -> list[str]:
    """How sure the flame speeds are: per gas and condition the point nearest φ 1 with its
    numerical band and, with [uncertainty], its kinetic band and most sensitive reaction."""
    ok = [r for r in rows if r["status"] == "ok" and r.get("flame_speed_numerical_error_percent") is not None]
    if not ok:
        return []
    groups = by_gas_and_condition(ok)
    table = []
    for (gas, ox, P, T), rs in groups.items():
        near = min(rs, key=lambda r: (abs(r["equivalence_ratio"] - 1.0), r["equivalence_ratio"]))
        kin = [r["flame_speed_kinetic_uncertainty_percent"] for r in rs
               if r.get("flame_speed_kinetic_uncertainty_percent") is not None]
        red = [r["flame_speed_reduction_error_percent"] for r in rs
               if r.get("flame_speed_reduction_error_percent") is not None]
        table.append([f"{gas} in {ox}", f"{P:g}", f"{T:g}", error_bar_sentence(near),
                      f"{max(r['flame_speed_numerical_error_percent'] for r in rs):.2g}",
                      _span_text(red), _span_text(kin)])
    banded = any(row[5] for row in table)  # the reduction band's column only where a point has one
    if not banded:
        table = [row[:5] + row[6:] for row in table]
    table, more = first_rows(table, "results.csv")
    u = study.uncertainty
    kinetics = u is not None and u.kinetics
    defaulted = max((r.get("reactions_default_factor") or 0 for r in ok), default=0)
    return ["<h2 id='error-bars'>How sure: error bars of the flame speed"
            + (f" ({escape(study.mechanism)}, the reference)" if comparison is not None else "") + "</h2>",
            "<p><b>Numerics.</b> Every flame is solved again on every second and every fourth point of its final "
            "grid; the three flame speeds give Roache's grid convergence index (factor of safety 1.25 with the "
            "observed order bounded to 0.5-1, the scheme's formal order, else 3), never below 0.3 % × 942 / N on a "
            "grid of N points: the spread two valid grids of the same criteria can have, which coarsening one grid "
            "cannot see. Checked on 22 flames it was not tuned on (methane, hydrogen, blends, a heavier natural gas, "
            "1-20 bar, 300-700 K, three mechanisms; chosen on one half, checked on the other): the standard "
            "setting's true error lay inside the band in 22 of 22 flames solved from scratch and 22 of 22 "
            "warm-started, the band a median 1.7-2.1 times the true error (docs/benchmarks.md).</p>"
            + ("<p><b>Kinetics.</b> Sensitivities of S_L to every rate constant by Cantera's adjoint solve, "
               "combined with rate-constant uncertainty factors (packaged table with sources; the study's own "
               f"factors; {u.default_factor:g} for reactions neither names: "
               + (f"at most {defaulted} reaction(s) of a point with |s| of 0.005 or more took it" if defaulted else
                  "no reaction with |s| of 0.005 or more took it") + ") into a first-order 1σ band, sqrt(Σ (s_i ln f_i / "
               f"{u.factor_sigmas:g})², a factor's bound read as {u.factor_sigmas:g}σ). "
               "It leaves out transport and thermochemistry, correlations and "
               "second-order terms: a lower estimate of the model's uncertainty. The mechanism's own spread "
               "against measurements is the better check.</p>"
               if kinetics and u is not None else
               "<p>Add an [uncertainty] table to the study for the kinetic band (one adjoint solve per point).</p>"),
            *_reduction_paragraph(study, banded),
            html_table(["gas", "p [bar]", "T_u [K]", "nearest φ 1", "largest numerical band [%]",
                    *(["reduction band [%]"] if banded else []), "kinetic band, 1σ [%]"], table,
                   {1, 2, 4, 5, 6} if banded else {1, 2, 4, 5}) + more]


def _unassessed_section(rows: list[dict]) -> list[str]:
    """The criteria not assessed, once per criterion and kind of reason, right under the
    admissible ranges they do not take part in."""
    gaps = not_assessed_summary(rows)
    if not gaps:
        return []
    return ["<h3 id='not-assessed'>Criteria not assessed</h3>",
            "<p>Each burner criterion rests on a constant fitted to data of a limited range (laminar port flow, "
            "cold walls, about 1 atm and room temperature; Reed's blowoff constant on lean to stoichiometric "
            "hydrocarbon flames; the bluff-body constant on the user's own stabilizer). Outside it the margin is "
            "left blank: no verdict and no limit above rests on it, and an answer that no criterion in range "
            "binds says so. Judge these by other means (test, or the methods of the literature for the regime). A "
            "premixer's boundary-layer flashback and blowout are listed too: the premixer section says what each "
            "needs.</p>",
            html_table(["criterion", "outside its range (first such point)", "flames"],
                   [[g["criterion"], g["example"], f"{g['points']} of {g['of']}"] for g in gaps], {2})]


def _limits_section(study: Study, limits: Sequence[dict]) -> list[str]:
    """The [limits] answers: one sentence per search, then how they were found."""
    if not limits:
        return []
    lim = study.limits
    assert lim is not None  # limits.csv rows come from a [limits] table
    listed, more = first_rows(limits, "limits.csv")
    out = ["<h2 id='limits'>Limits</h2>", "<ul>"]
    out += [f"<li>{escape(limit_sentence(r, study))}.</li>" for r in listed]
    out.append("</ul>" + more)
    flames = search_flames(limits)
    out.append(f"<p>Each search runs along one axis with every other setting fixed. Between neighbouring swept "
               f"points whose admissibility differs, the edge is refined by Brent's method; between two points that "
               f"both fail by different criteria (blowoff below, flashback above), the crossing of the two margins is "
               f"looked for first, since a narrow window may hide there; where one criterion fails at both ends, "
               f"only the intervals next to that criterion's best swept point are searched, and a margin that holds "
               f"at every swept point is searched for a dip only next to its lowest one (each margin rises and falls "
               f"at most once along an axis; a dip is not looked for where the parabola through the nearest swept "
               f"margins stays 25 % above the minimum). Each step is a flame warm-started from the sweep's flames "
               f"and stored like any point ({flames} flame{'s' if flames != 1 else ''} beyond the sweep). "
               "Each edge is the admissible end "
               f"of a bracket at most {lim.tolerance['blend_fraction']:g} wide in blend fraction and "
               f"{lim.tolerance['equivalence_ratio']:g} in equivalence ratio (an edge not settled keeps the wider bracket it "
               "reached; limits.csv gives both ends of every "
               "window, what binds past each and how each search ended). The Wobbe band, where it is a criterion, "
               "needs no flame: a window it cuts says what the flame margins alone would allow. A limit inherits "
               "every uncertainty of the margins it keeps: it is a screening estimate; confirm it by test on the "
               "burner.</p>")
    out += _premixer_limit_words(study)
    ratio = fixed_ratio_note(study)
    if ratio and any(ratio in (r.get("note") or "") for r in limits):
        out.append(f"<p><b>Flashback and blowoff together.</b> The window between the port's flashback and blowoff "
                   f"margins {escape(ratio)}: both critical gradients are S_L²/α_u times a constant. Classic port "
                   "stability data show a wider band on the rich side, where secondary air holds the flame base "
                   "(Edmondson &amp; Heap 1971), and laminar hydrogen port flames hardly lift. The windows marked "
                   "so in limits.csv (column note) rest on it.</p>")
    return out


def _premixer_limit_words(study: Study) -> list[str]:
    """What a premixer's criteria in [limits] rest on (core_flashback, extinction_blowout), if used."""
    lim = study.limits
    assert lim is not None  # called for a study with [limits]
    used = [c for c in ("core_flashback", "extinction_blowout") if c in lim.criteria]
    if not used:
        return []
    words = {"core_flashback": "<b>core_flashback</b> is the premixer's core-flow flashback margin (bulk velocity over "
                               "the largest turbulent flame speed) against the burner's minimum flashback margin",
             "extinction_blowout": "<b>extinction_blowout</b> is the extinction-strain blowout margin (Da_ext over its "
                                   "critical value) against its minimum stabilizer margin, not assessed where no "
                                   "ladder burned at the gas, pressure and preheat"}
    return ["<p><b>A premixer's criteria.</b> " + "; ".join(words[c] for c in used) + ". At a flame a search solves "
            "between the swept points, S_c,max of the leading-point speed and κ_ext are interpolated between the "
            "sweep's ladder points exactly as at a swept point, so each margin is the same function of the flame at "
            "both; both inherit the interpolation's error (Boundary-layer flashback and lean blowout, above) and the "
            "turbulent correlations' wide scatter.</p>"]


def _provenance(study: Study, comparison: Comparison | None) -> list[str]:
    """Where the numbers come from: mechanism(s), transport, numerics, software, config."""
    n = NUMERICS[study.resolution]
    return ["<h2>Provenance</h2>", html_table(["", ""], [
        *([["mechanism", f"{study.mechanism} ({study.mechanism_path})"],
           ["mechanism built for", mechanism_scope(detailed_path(study))],
           *([["mechanism reduction", reduction_note(study)]] if study.reduced is not None else []),
           ["mechanism sha256", study.mechanism_sha256]] if comparison is None else
          [[f"mechanism {i + 1}" + (" (reference)" if i == 0 else ""),
            f"{s.mechanism} ({s.mechanism_path}, sha256 {s.mechanism_sha256})"] for i, s in enumerate(comparison.studies)]),
        ["transport", study.transport + (", thermal diffusion on" if study.thermal_diffusion else "")],
        ["numerical setting", f"{resolution_label(study)}; refinement stages (ratio, slope, curve) {list(n.stages)}"],
        ["indicator settings", ", ".join(f"{k} = {'not set' if v is None else format(v, 'g')}"
                                         for k, v in study.indicator_settings.items())],
        *([["uncertainty settings", uncertainty_settings(study.uncertainty)]] if study.uncertainty else []),
        ["software", f"flamecharts {__version__}, Cantera {installed_cantera_version()}"],
        ["written", time.strftime("%Y-%m-%d %H:%M:%S %Z")],
        ["config", study.config_path or "(from Python)"],
    ])]


def _charts_section(out_dir: Path) -> list[str]:
    """Every chart drawn, with its caption, and the charts the sweep's shape left out, with why."""
    parts, drawn = ["<h2>Charts</h2>"], set()
    for name, caption in CAPTIONS.items():
        svg = out_dir / "charts" / f"{name}.svg"
        if svg.is_file():
            drawn.add(name)
            parts.append(f"<figure id='{name}'>{_inline_svg(svg)}<figcaption>{escape(caption)}</figcaption></figure>")
    if drawn and (skipped := not_drawn(drawn)):
        parts.append("<p>Not drawn for this study: " + "; ".join(f"{escape(n)} ({escape(why)})" for n, why in skipped)
                     + ".</p>")
    return parts


def _warnings_section(rows: list[dict]) -> list[str]:
    """The points that carry a warning (outside the method's or mechanism's range, or unstable), each with it."""
    parts: list[str] = []
    warned, more = first_rows([r for r in rows if r.get("warnings")], "results.csv (warnings)")
    if warned:
        parts.append("<h2 id='warnings'>Points with warnings: outside the range of the method or mechanism, or "
                     "unstable</h2>" + more)
        parts.append("<p>These numbers were computed, but each point below carries a warning: its inputs lie outside "
                     "what a freely propagating laminar flame or the mechanism covers (read its numbers as "
                     "indications only), or its flame is thermodiffusively unstable (the real flame wrinkles and "
                     "runs faster than S_L, so margins built on S_L are optimistic there). Each warning says which."
                     "</p>")
        parts.append(html_table(["gas", "φ", "p [bar]", "T_u [K]", "status", "warning"],
                            [[gas_label(r), f"{r['equivalence_ratio']:g}", f"{r['pressure_bar']:g}",
                              f"{r['unburned_temperature_K']:g}", r["status"], r["warnings"]] for r in warned]))
    return parts


def write_report(study: Study, rows: list[dict], out_dir: Path, gases: list[dict] | None = None,
                 dataset: xr.Dataset | None = None, limits: Sequence[dict] = (),
                 records: dict[str, list[dict]] | None = None, comparison: Comparison | None = None) -> Path:
    """Write out_dir/report.html from the rows and the charts already drawn in out_dir/charts.
    ``records`` are the analyses' record tables (file -> rows: stretch.csv's ladders), shown
    by their report parts' RECORDS_SECTION before the limits. ``comparison``
    (results.Comparison) adds the mechanism comparison; ``study`` and ``rows`` are then the
    reference mechanism's."""
    out_dir = Path(out_dir)
    parts = [f"<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'><title>{escape(study.title)}</title>"
             f"<style>{CSS}</style></head><body>",
             f"<h1>{escape(study.title)}</h1>",
             "<p>How fast does the premixed flame run and how thick is it, over this study's window of fuels, "
             "blends, equivalence ratios, pressures and preheat temperatures; and, where a burner is described, "
             "how close each mixture comes to flashback and blowoff. Computed with detailed chemistry "
             "(freely propagating 1D laminar flames).</p>",
             f"<div class='caution'><b>Caution.</b> {escape(CAUTION)}</div>"]

    if comparison is not None:
        parts.append(f"<p><b>{len(comparison.names)} mechanisms compared</b> ({escape(', '.join(comparison.names))}): "
                     f"the design sections below read the reference, {escape(comparison.names[0])}; "
                     "<a href='#mechanisms'>Mechanisms compared</a> shows how far the others differ.</p>")
    parts += _study_section(study, rows, gases)

    parts.append("<h2>Key numbers</h2>" + html_table(["", "value", "where"], limit_key_numbers(study, limits)
                                                 + key_numbers(study, rows), {1}))
    summary = margin_summary(to_dataset(study, rows) if dataset is None else dataset, study.burner)
    if summary:
        b = study.burner
        assert b is not None  # margin_summary is empty without a burner
        summary, more = first_rows(summary, "results.csv", order=lambda s: min(
            (s["min_flashback_margin"] or math.inf) / b.min_flashback_margin,
            (s["min_blowoff_margin"] or math.inf) / b.blowoff[1]))
        core = study.premixer is not None  # a premixer's verdict rests on its core-flow flashback margin
        parts.append(html_table(["gas", "p [bar]", "T_u [K]"] + (["min core-flow flashback margin (φ)"] if core else [])
                            + [f"min {'laminar ' if core else ''}flashback margin (φ)", f"min {b.blowoff[2]} margin (φ)",
                               "points ok (verdicts)"],
                            [[gas_label({**s, "blend_with": study.blend_with}), f"{s['pressure_bar']:g}",
                              f"{s['unburned_temperature_K']:g}"]
                             + ([_lowest_cell(s, "core_flashback")] if core else [])
                             + [_lowest_cell(s, "flashback"), _lowest_cell(s, "blowoff"), s["points_words"]]
                             for s in summary], {1, 2}) + more)
    parts += _unassessed_section(rows)

    parts += _uncertainty_section(study, rows, comparison)
    parts += _mechanisms_section(study, comparison)
    for analysis in _analyses("report"):  # the analyses' record tables (the ladders), before the limits
        parts += getattr(analysis, "RECORDS_SECTION", lambda study, records: [])(study, records or {})
    parts += _limits_section(study, limits)
    parts += _premixer_section(study, rows)
    for analysis in _analyses("report"):  # the registered analyses' sections (flamecharts.analyses)
        parts += getattr(analysis, "SECTION", lambda study, rows: [])(study, rows)

    parts += _charts_section(out_dir)

    failed, more = first_rows([r for r in rows if r["status"] != "ok"], "results.csv (status, message)")
    if failed:
        parts.append("<h2>Points without a flame</h2>" + more)
        parts.append(html_table(["gas", "φ", "p [bar]", "T_u [K]", "status", "reason"],
                            [[gas_label(r), f"{r['equivalence_ratio']:g}", f"{r['pressure_bar']:g}",
                              f"{r['unburned_temperature_K']:g}", r["status"], r["message"]] for r in failed]))

    parts += _warnings_section(rows)

    parts += _provenance(study, comparison)
    parts.append(f"<div class='caution'><b>Caution.</b> {escape(CAUTION)} Flashback, blowoff and quenching "
                 "indicators rest on correlations whose constants are known to a factor of about 1.5-2; they rank "
                 "mixtures and show trends, they do not replace certification tests.</div>")
    parts.append(_points_appendix(study, rows, comparison))
    parts.append("</body></html>")
    path = out_dir / "report.html"
    write_atomic(path, "\n".join(parts))
    return path
