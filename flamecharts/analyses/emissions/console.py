"""[emissions]' lines in ``flamecharts run``'s summary."""
from __future__ import annotations

from typing import TYPE_CHECKING

from ...cli.progress import plural
from .dataset import emission_sentences
from .table import of

if TYPE_CHECKING:
    from ...config import Study


def emission_lines(study: Study, rows: list[dict]) -> list[str]:
    """What ``flamecharts run`` prints for [emissions]: the range of NOx and CO at the design
    residence time, and one sentence per blended gas and condition (dataset.emission_sentences)."""
    em = of(study)
    if em is None:
        return []
    have = [r for r in rows if r["status"] == "ok" and r.get("nox_ppmvd_at_reference_o2") is not None]
    if not have:
        return ["Emissions: none computed (see the column emissions_note in results.csv)"]
    nox = [r["nox_ppmvd_at_reference_o2"] for r in have]
    co = [r["co_ppmvd_at_reference_o2"] for r in have if r["co_ppmvd_at_reference_o2"] is not None]
    out = [f"Emissions after {1e3 * em.design_residence_time_s:g} ms (dry, at {em.reference_oxygen_percent:g} % O2; "
          f"laminar flame and plug flow, a screening estimate): NOx {min(nox):.3g}-{max(nox):.3g} ppm"
          + (f", CO {min(co):.3g}-{max(co):.3g} ppm" if co else "") + f" over {plural(len(have), 'flame')}"]
    lines = emission_sentences(study, rows)
    out += ["  " + line.replace("φ", "phi") for line in lines[:20]]
    if len(lines) > 20:
        out.append(f"  ... and {len(lines) - 20} more (report.html, emissions.csv)")
    return out


CONSOLE = emission_lines
