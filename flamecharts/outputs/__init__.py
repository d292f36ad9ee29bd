"""Output files of a run folder: tables (CSV, about.txt), charts, report.html."""
from .write import write_outputs

__all__ = ["write_outputs"]
