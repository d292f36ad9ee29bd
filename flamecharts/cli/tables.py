"""Terminal tables the commands print: fuel gases, the burner, per-point lines, margins."""
from __future__ import annotations

from typing import TYPE_CHECKING

import xarray as xr

from ..columns import gas_label
from ..design import burner_flow_words, fuel_gas_table, injection_end
from ..physics.indicators import edge_velocity
from ..results import first_flashback_fraction, margin_summary, premixer_summary

if TYPE_CHECKING:
    from ..config import Study


def print_gases(study: Study) -> None:
    table = fuel_gas_table(study)
    print(f"Fuel gases ({table[0]['conditions']}; {table[0]['method']}):")
    print(f"  {'gas':38s} {'HHV':>7s} {'LHV':>7s} {'d':>6s} {'W_s':>7s} {'W_i':>7s} {'dW':>7s}  band")
    print(f"  {'':38s} {'MJ/m³':>7s} {'MJ/m³':>7s} {'-':>6s} {'MJ/m³':>7s} {'MJ/m³':>7s} {'%':>7s}")
    for g in table:
        band = "" if g["wobbe_in_band"] is None else ("inside" if g["wobbe_in_band"] else "OUTSIDE")
        print(f"  {gas_label(g) + ' in ' + g['oxidizer']:38s} {g['higher_heating_value_MJ_m3']:7.3f} "
              f"{g['lower_heating_value_MJ_m3']:7.3f} {g['relative_density']:6.4f} "
              f"{g['higher_wobbe_index_MJ_m3']:7.3f} {g['lower_wobbe_index_MJ_m3']:7.3f} "
              f"{g['wobbe_change_percent']:+7.2f}  {band}")


def print_burner(study: Study) -> None:
    b = study.burner
    if b is None:
        print("Burner: none given (add a [burner] table for flashback and blowoff margins)")
        return
    size = f"{'diameter' if b.port == 'round' else 'gap'} {b.port_size_m * 1e3:g} mm"
    how = burner_flow_words(b)
    _, bo_min, bo_name = b.blowoff
    held = ""
    if b.on_stabilizer:
        assert b.stabilizer_size_m is not None and b.approach_velocity_m_s is not None  # config sets both
        held = (f" (flame held by a {b.stabilizer_size_m * 1e3:g} mm bluff body blocking "
                f"{100 * b.stabilizer_blockage:g} % of the duct: "
                f"{edge_velocity(b.approach_velocity_m_s, b.stabilizer_blockage):.3g} m/s past its edge)")
    print(f"Burner: {b.name}: {b.port} ports{' (a deck: merged port flames)' if b.layout == 'deck' else ''}, "
          f"{size}; {how}; minimum margins flashback {b.min_flashback_margin:g}, {bo_name} {bo_min:g}" + held)


def print_margins(study: Study, ds: xr.Dataset) -> None:
    """Smallest margins per gas and condition, read from the results Dataset."""
    summary = margin_summary(ds, study.burner)
    if not summary:
        return
    b = study.burner
    assert b is not None  # margin_summary is empty without a burner
    _, bo_min, bo_name = b.blowoff
    print(f"Burner margins ({b.name}; minimum flashback {b.min_flashback_margin:g}, {bo_name} {bo_min:g}):")
    core = study.premixer is not None  # a premixer's own flashback criterion, on which its verdict rests
    for s in summary:
        print(f"  {gas_label({**s, 'blend_with': study.blend_with})}, {s['pressure_bar']:g} bar, "
              f"{s['unburned_temperature_K']:g} K: "
              + (f"{_lowest_words(s, 'core_flashback', 'core-flow flashback')}, " if core else "")
              + f"{_lowest_words(s, 'flashback', 'laminar flashback' if core else 'flashback')}, "
              f"{_lowest_words(s, 'blowoff', bo_name)}; {s['points_words']}")
    judged = {(s["fuel"], s["oxidizer"], s["pressure_bar"], s["unburned_temperature_K"]) for s in summary
              if s["min_flashback_margin"] is not None}
    for (fuel, ox, p, T), frac in first_flashback_fraction(ds, study).items():
        if (fuel, ox, p, T) not in judged:
            continue
        print(f"  {fuel} in {ox}, {p:g} bar, {T:g} K: " + _first_flashback_words(study, b.min_flashback_margin, frac))


def _first_flashback_words(study: Study, minimum: float, frac: float | None) -> str:
    """The smallest blend fraction whose flashback margin falls below the minimum at some swept phi.

    >>> from types import SimpleNamespace
    >>> s = SimpleNamespace(blend_with="purge_gas")
    >>> _first_flashback_words(s, 1.5, 0.0)
    'smallest purge_gas fraction with a flashback margin below 1.5 (at some swept phi): 0 %'
    >>> _first_flashback_words(s, 1.5, None)
    'flashback margin at least 1.5 at every purge_gas fraction of the study (wherever assessed)'
    """
    if frac is None:
        return f"flashback margin at least {minimum:g} at every {study.blend_with} fraction of the study (wherever assessed)"
    return (f"smallest {study.blend_with} fraction with a flashback margin below {minimum:g} (at some swept phi): "
            f"{100 * frac:g} %")


def _lowest_words(s: dict, key: str, name: str) -> str:
    """'flashback margin >= 1.62 (phi 1)' or 'flashback not assessed' from a margin_summary row."""
    if s[f"min_{key}_margin"] is None:
        return f"{name} not assessed"
    return f"{name} margin >= {s[f'min_{key}_margin']:.2f} (phi {s[f'at_phi_{key}']:g})"


def _m(v: float | None) -> str:
    """A margin in 5 characters, '  n/a' where it is not assessed."""
    return "  n/a" if v is None else f"{v:5.2f}"


def print_premixer(study: Study, rows: list[dict]) -> None:
    """Shortest ignition delay and smallest autoignition margin per gas and condition."""
    summary = premixer_summary(study, rows)
    if not summary:
        return
    pm = study.premixer
    assert pm is not None  # premixer_summary is empty without [premixer]
    print(f"Premixer autoignition (residence time {pm.residence_time_s * 1e3:g} ms, minimum margin "
          f"{pm.min_autoignition_margin:g}; delay = time of max dT/dt at constant pressure):")
    for s in summary:
        delay = ("no ignition within the horizon" if s["ignition_delay_ms"] == float("inf")
                 else f"shortest ignition delay {s['ignition_delay_ms']:.3g} ms (phi {s['at_phi']:g}), "
                      f"margin {s['autoignition_margin']:.3g}")
        tau = s.get("injection_ignition_delay_ms")
        near = ("" if tau is None else "; near the fuel injection no ignition" if tau == float("inf")
                else f"; near the fuel injection {tau:.3g} ms (phi {s['injection_equivalence_ratio']:g}"
                     f"{injection_end(s['injection_equivalence_ratio'])})")
        risks = [v for v in s["verdicts"] if v != "ok"]  # the autoignition verdicts other than a plain ok
        print(f"  {gas_label(s)}, {s['pressure_bar']:g} bar, {s['unburned_temperature_K']:g} K: {delay}{near}; "
              f"{s['points'] - s['risky_points']} of {s['points']} points ok"
              + (f" ({'; '.join(risks)})" if risks else ""))


MAX_POINT_LINES = 60


def _turbulent(r: dict) -> str:
    """A premixer point's largest turbulent flame speed (the core-flow margin's) and core-flow
    flashback margin, 12 characters; blank where the point has none."""
    m = r.get("core_flashback_margin")
    if m is None:
        return f" {'':>5s} {'':>5s}"
    return f" {r['port_velocity_m_s'] / m:5.2f} {m:5.2f}"


def print_points(study: Study, rows: list[dict]) -> None:
    """One line per point with the flame, its indicators and, with a burner, its margins; a
    premixer's also with its largest turbulent flame speed S_T and core-flow flashback margin FBc."""
    burner = study.burner is not None
    turbulent = burner and study.premixer is not None
    # the blowoff margin that decides the verdict: the rim's, or the bluff body's (SM) where the flame sits on one
    bo_col, bo_head = ((study.burner.blowoff[0], "SM" if study.burner.on_stabilizer else "BO")
                       if study.burner is not None else ("", ""))
    head = (f"  {'gas':30s} {'phi':>5s} {'p':>6s} {'T_u':>6s} {'S_L':>7s} {'d_T':>6s} {'g_F':>7s} {'d_q':>5s}"
            + (f" {'U':>6s} {'g_wall':>7s} {'FB':>5s} {bo_head:>5s}" if burner else "")
            + (f" {'S_T':>5s} {'FBc':>5s}" if turbulent else "") + ("  verdict" if burner else ""))
    unit = (f"  {'':30s} {'-':>5s} {'bar':>6s} {'K':>6s} {'cm/s':>7s} {'mm':>6s} {'1/s':>7s} {'mm':>5s}"
            + (f" {'m/s':>6s} {'1/s':>7s} {'-':>5s} {'-':>5s}" if burner else "")
            + (f" {'m/s':>5s} {'-':>5s}" if turbulent else ""))
    print("Points (indicators per point; every column in results.csv"
          + ("; S_T the largest turbulent flame speed, FBc = U / S_T the core-flow flashback margin" if turbulent
             else "") + "):")
    print(head)
    print(unit)
    for r in rows[:MAX_POINT_LINES]:
        line = f"  {gas_label(r):30s} {r['equivalence_ratio']:5.2f} {r['pressure_bar']:6g} {r['unburned_temperature_K']:6g} "
        if r["status"] != "ok":
            print(line + f"{r['status']}: {r['message'][:70]}")
            continue
        line += (f"{100 * r['laminar_flame_speed_m_s']:7.2f} {r['thermal_thickness_mm']:6.3f} "
                 f"{r['flashback_critical_gradient_1_s']:7.0f} {r['quenching_distance_mm']:5.2f}")
        if burner:
            line += (f" {r['port_velocity_m_s']:6.3f} {r['wall_velocity_gradient_1_s']:7.0f} "
                     f"{_m(r['flashback_margin'])} {_m(r[bo_col])}" + (_turbulent(r) if turbulent else "")
                     + f"  {r['verdict']}")
        print(line)
    if len(rows) > MAX_POINT_LINES:
        print(f"  ... and {len(rows) - MAX_POINT_LINES} more points in results.csv")


