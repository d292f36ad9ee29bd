"""[stretch]'s lines in ``flamecharts run``'s summary: one per ladder, after the limits.

RECORDS_CONSOLE is the summary's hook for an analysis's record tables (printed after the limits,
over every mechanism of the study); RECORD_LABELS names each file in the summary's "Results:" line.
"""
from __future__ import annotations

from ...cli.progress import plural
from ...columns import gas_label
from .dataset import FILE

#: How the "Results:" line names each record table.
RECORD_LABELS = {FILE: "strained flames"}


def ladder_lines(records: dict[str, list[dict]], solved: dict[str, int], by_mechanism: bool = False) -> list[str]:
    """The [stretch] ladders of ``records`` (stretch.csv's rows), one line each (each with its
    mechanism when the study compares several); ``solved``: the ladders solved in this run."""
    ladders = records.get(FILE, [])
    if not ladders:
        return []
    out = [f"Strained flames ({plural(len(ladders), 'ladder')}, {solved.get(FILE, 0)} solved in this run; "
           "strain = largest |du/dz| ahead of the flame):"]
    for r in ladders:
        where = ((f"{r['mechanism']}: " if by_mechanism else "") + f"{gas_label(r)}, phi {r['equivalence_ratio']:g}, "
                 f"{r['pressure_bar']:g} bar, {r['unburned_temperature_K']:g} K")
        if r["status"] != "ok":
            out.append(f"  {where}: {r['status']} {r['message']}".rstrip())
            continue
        ext = (f"goes out above {r['extinction_strain_rate_1_s']:.4g} 1/s" if r["extinction_strain_rate_1_s"]
               else f"no extinction found ({r['message']})")
        ma, margin = r["markstein_number_strain"], r["extinction_strain_margin"]
        out.append(f"  {where}: {ext}" + (f"; Markstein number (strain) {ma:+.2f}" if ma is not None else "")
                   + (f"; {margin:.3g} times the burner's strain" if margin is not None else ""))
    return out


RECORDS_CONSOLE = ladder_lines
