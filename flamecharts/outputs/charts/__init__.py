"""Design charts drawn from results (never from solver objects), as PNG and SVG.

registry.py      the one list of charts: name, caption, when it applies
style.py         what every chart shares: colours, markers, frame, footer with the cautions
phi_charts.py    flame speed, thickness and adiabatic flame temperature against equivalence ratio
design_charts.py pressure/preheat dependence, blends, flashback, operating window, gas interchangeability
uncertainty_charts.py flame-speed sensitivity to rate constants ([uncertainty])
mechanism_charts.py the same flames and limits under each mechanism a study compares
regime_charts.py the premixer's turbulent-flame regimes and core-flow margin
(the registered analyses' charts: each one's ``charts`` part, flamecharts.analyses)
"""
from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING

import matplotlib.pyplot as plt
import xarray as xr

from ...analyses import parts as _analyses
from ...results import to_dataset

# the order of these imports is the order of the charts in the report: not sorted
# isort: off
from . import phi_charts  # noqa: F401 - importing registers its charts, first in the report
from . import design_charts  # noqa: F401,I001
from . import uncertainty_charts  # noqa: F401,I001
from . import mechanism_charts  # noqa: F401,I001
_analyses("charts")  # the registered analyses' charts register on import (flamecharts.analyses)
from . import regime_charts  # noqa: E402,F401,I001
# isort: on
from .registry import CHARTS, ChartData  # noqa: E402
from .style import note_empty_panels  # noqa: E402

if TYPE_CHECKING:
    from ...config import Study
    from ...results import Comparison

#: chart file name -> one-line caption of how to read it (the report prints it)
CAPTIONS = {c.name: c.caption for c in CHARTS}


def draw_all(rows: list[dict], gases: list[dict], study: Study, out_dir: Path, dataset: xr.Dataset | None = None,
             limits: Sequence[dict] = (), records: dict[str, list[dict]] | None = None,
             comparison: Comparison | None = None) -> list[Path]:
    """Draw every chart the study supports into out_dir/charts as PNG and SVG; returns the files.
    ``dataset`` is results.to_dataset of the rows (made here when not given); ``comparison``
    the results.Comparison of a study comparing mechanisms (``rows`` then are the reference's);
    ``records`` the analyses' record tables (file -> rows: stretch.csv's ladders)."""
    data = ChartData(rows=rows, gases=gases, dataset=to_dataset(study, rows) if dataset is None else dataset,
                     limits=list(limits), records=dict(records or {}), comparison=comparison)
    charts_dir = Path(out_dir) / "charts"
    charts_dir.mkdir(parents=True, exist_ok=True)
    written = []
    for c in CHARTS:
        if not c.when(data, study):
            continue
        fig = c.draw(data, study)
        note_empty_panels(fig, "no point of the study gives a value for this panel (every point is in results.csv)")
        for ext in ("png", "svg"):
            path = charts_dir / f"{c.name}.{ext}"
            fig.savefig(path, dpi=130 if ext == "png" else None)
            written.append(path)
        plt.close(fig)
    return written
