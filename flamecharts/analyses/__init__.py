"""Analyses: what an optional study table adds to a run, each declared in one package.

An analysis (``[emissions]``, say) lives in ``flamecharts/analyses/NAME/``, one module per part it
has, each in the layer its file name says (tests/test_layers.py holds the map, PART_LAYERS):

=============  ==========  =====================================================================
part (file)    layer       what it declares
=============  ==========  =====================================================================
columns.py     bottom      UNITS (name -> unit, long name), POINT_COLUMNS (results.csv), TABLES
                           (extra CSV files made from the points' rows: file name -> columns);
                           RECORDS (optional): its record tables (one row per solve of a
                           PerStudy, read from the store: file name -> columns)
table.py       config      TABLE: the study table (a frozen dataclass, its keys, its parser with
                           one-line errors, the species a [reduction] must keep for it, the
                           [limits] criteria it enables)
solve.py       sweep       PER_POINT: its extra solves of every point (sweep.analyses.PerPoint:
                           the store key, the worker task, the merge, the ``check`` estimate);
                           PER_STUDY (optional): solves that read the points' rows, after every
                           PER_POINT and before the limits (sweep.analyses.PerStudy: also its
                           record table's rows and whether the rows are read again after it)
task.py        sweep       the worker's side of those solves (may import chemistry; it is part
                           of the worker's code fingerprint)
readout.py     design      READ_OUT: its columns of one point from the stored values
dataset.py     results     DATASET (optional): variables it adds to results.nc; TABLE_ROWS: rows
                           of its extra CSV files; ACCESSORS (optional): public names of its
                           record tables on Results and RunSummary (results.RecordAccess)
report.py      outputs     SECTION (optional): its section of report.html; KEY_NUMBERS (optional):
                           its rows of the report's key numbers; RECORDS_SECTION (optional): its
                           section on its record tables, before the limits
charts.py      outputs     its charts (registered with outputs.charts.registry.chart on import;
                           ``after`` places one beside a core chart)
console.py     cli         CONSOLE (optional): the lines ``flamecharts run`` prints for it per
                           mechanism; RECORDS_CONSOLE and RECORD_LABELS (optional): its lines
                           on its record tables, after the limits, and their names in the
                           summary's "Results:" line
=============  ==========  =====================================================================

Each layer's own code iterates :func:`parts` and never names an analysis, so adding one is its
package and one line in :data:`ANALYSES`. A part is imported by the layer that uses it (a worker
loads ``task`` and ``solve``, never ``charts``), so the layers' rule holds: nothing imports upward.
"""
from __future__ import annotations

from functools import cache
from importlib import import_module
from importlib.util import find_spec
from types import ModuleType

#: The registered analyses (their package names under flamecharts.analyses), in the order a run
#: solves their extras and the report shows their sections: [uncertainty]'s sensitivities, then
#: [premixer]'s ignition delays (the order both had as the core's extras, before the others);
#: [stretch]'s ladders last (their PerStudy solves run after every analysis's per-point extras).
ANALYSES: tuple[str, ...] = ("kinetic_sensitivity", "premixer_ignition", "flame_response", "emissions",
                             "strain_ladders")


def parts(part: str) -> list[ModuleType]:
    """The ``part`` module (file name without .py) of every registered analysis that has one, in
    :data:`ANALYSES` order. Looked up once per part (the read-out asks for every point)."""
    return list(_parts(part, ANALYSES))


@cache
def _parts(part: str, names: tuple[str, ...]) -> tuple[ModuleType, ...]:
    dotted = (f"{__name__}.{name}.{part}" for name in names)
    return tuple(import_module(d) for d in dotted if find_spec(d) is not None)
