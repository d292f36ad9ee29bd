"""What every chart shares: colours, markers, figure frame, footer with the cautions, selections of rows."""
from __future__ import annotations

import textwrap
from typing import TYPE_CHECKING

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.layout_engine import ConstrainedLayoutEngine  # noqa: E402
from matplotlib.ticker import FuncFormatter  # noqa: E402

from ..._version import __version__  # noqa: E402
from ...config import lumped_species, resolution_label  # noqa: E402

if TYPE_CHECKING:
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

    from ...config import Study

MARKERS = ("o", "s", "^", "D", "v", "P", "X", "h")
LINESTYLES = ("-", "--", "-.", ":")
NOT_BURNING = (("no_flame", "v"), ("failed", "x"))
CMAP = "viridis"  # perceptually uniform, readable with colour-vision deficiency


def curves(rows: list[dict]) -> list[tuple]:
    """(fuel, oxidizer, blend_with, blend_fraction) of the rows, in first-seen order."""
    return list(dict.fromkeys((r["fuel"], r["oxidizer"], r["blend_with"], r["blend_fraction"]) for r in rows))


def panels(rows: list[dict]) -> list[tuple[float, float]]:
    return sorted({(r["pressure_bar"], r["unburned_temperature_K"]) for r in rows})


def _reduced_words(study: Study) -> str:
    """' (skeletal: 31 of 53 species, S_L within 0.36 %)' under [reduction] ('' otherwise)."""
    r = study.reduced
    if r is None or not r.reduced:
        return ""
    speed = r.flame_speed_error
    return (f" (skeletal: {len(r.species)} of {r.detailed_size[0]} species, "
            + (f"S_L within {100 * speed:.2g} %)" if speed is not None else "S_L error not measured)"))


def footer(fig: Figure, study: Study) -> None:
    fig.text(0.01, 0.01,
             f"{study.title} | mechanism {study.mechanism}{_reduced_words(study)} | transport {study.transport}"
             f"{' + thermal diffusion' if study.thermal_diffusion else ''} | resolution "
             f"{resolution_label(study)} | flamecharts {__version__}\n"
             + (f"Flames burn a lumped fuel: {', '.join(lumped_species(study))} stand in as mechanism species "
                "(see about.txt)\n" if study.analysis_atoms and lumped_species(study) else "")
             + "Screening estimate, not certification: follow local codes and standards, confirm by test.",
             fontsize=7, color="0.3", ha="left", va="bottom")


def ok_rows(rows: list[dict]) -> list[dict]:
    return [r for r in rows if r["status"] == "ok"]


def figure(ncols: int, nrows: int = 1, width: float = 5.0, height: float = 4.0) -> tuple[Figure, np.ndarray]:
    return plt.subplots(nrows, ncols, figsize=(max(width * ncols + 3.5, 11.0), height * nrows + 1.8), squeeze=False,
                        layout="constrained")


#: Width [in] the figure legend takes on the right, and characters of an 11.5 pt title per inch.
LEGEND_WIDTH_IN, TITLE_CHARS_PER_IN = 4.2, 10.5


def title_text(fig: Figure, title: tuple[str, str]) -> str:
    """A chart's two-line title, each line wrapped to the width left of the legend (a long
    subtitle over a one-panel figure would otherwise run under the legend)."""
    width = max(40, int((fig.get_figwidth() - LEGEND_WIDTH_IN) * TITLE_CHARS_PER_IN))
    return "\n".join(textwrap.fill(line, width) if len(line) > width else line
                     for part in title for line in part.split("\n"))


def finish(fig: Figure, study: Study, title: tuple[str, str], handles: dict, legend_title: str) -> Figure:
    fig.suptitle(title_text(fig, title), fontsize=11.5, x=0.02, ha="left")
    if handles:
        fig.legend(list(handles.values()), list(handles.keys()), loc="outside right upper", fontsize=8.5,
                   frameon=False, title=legend_title, title_fontsize=8.5)
    footer(fig, study)
    engine = fig.get_layout_engine()
    assert isinstance(engine, ConstrainedLayoutEngine)  # figure() makes every chart's layout constrained
    engine.set(rect=(0, 0.07, 1, 0.93))
    return fig


#: How a panel with nothing to show starts its note (tests look for it).
EMPTY_NOTE = "Nothing to show here"


def empty_note(ax: Axes, reason: str) -> None:
    """Say in the panel's own frame why it is empty (instead of an empty frame with a
    meaningless axis): its ticks go, the reason is written across the middle."""
    ax.set_xticks([])
    ax.set_yticks([])
    ax.text(0.5, 0.5, textwrap.fill(f"{EMPTY_NOTE}: {reason}", 48), transform=ax.transAxes, ha="center",
            va="center", fontsize=9, color="0.35", wrap=True)


def shows_data(ax: Axes) -> bool:
    """Whether a panel draws any data: a line or marker with a finite point in data
    coordinates, a filled or scattered collection, a bar, or an image. Reference lines across
    the panel (axhline, axvline, spans) do not count: they mark the axes, not results."""
    for line in ax.get_lines():
        xy = np.asarray(line.get_xydata(), dtype=float)
        if line.get_transform() == ax.transData and xy.size and np.isfinite(xy).all(axis=1).any():
            return True
    for c in ax.collections:
        offsets = np.asarray(c.get_offsets())
        if c.get_transform() == ax.transData and (offsets.size or any(np.asarray(p.vertices).size for p in c.get_paths())):
            return True
    return bool(ax.images) or any(p.get_data_transform() == ax.transData for p in ax.patches)


def has_empty_note(ax: Axes) -> bool:
    return any(t.get_text().startswith(EMPTY_NOTE) for t in ax.texts)


def note_empty_panels(fig: Figure, reason: str) -> int:
    """Give every visible panel of ``fig`` that shows no data and has no note yet a note with
    ``reason`` (the last guard of draw_all: no chart leaves an empty frame unexplained);
    returns how many it noted. Legend-only and hidden axes are left alone."""
    n = 0
    for ax in fig.axes:
        if ax.get_visible() and ax.axison and not shows_data(ax) and not has_empty_note(ax):
            empty_note(ax, reason)
            n += 1
    return n


def colour_scale(n: int) -> np.ndarray:
    return plt.get_cmap(CMAP)(np.linspace(0.0, 0.85, max(n, 1)))


def plain_log_ticks(ax: Axes) -> None:
    """Log axes labelled 2, 3, 400 rather than 2x10^0, 3x10^0, 4x10^2."""
    fmt = FuncFormatter(lambda v, _: f"{v:g}")
    for axis in (ax.xaxis, ax.yaxis):
        axis.set_major_formatter(fmt)
        axis.set_minor_formatter(fmt)


def sparse_log_yticks(ax: Axes) -> None:
    """A log y axis labelled in plain numbers at 1, 2, 5, 10, 20, 50... (every minor tick labelled
    crowds a tall range), or at every tick where the axis spans less than a decade (40, 50, 60...)."""
    def label(v: float, _: object) -> str:
        if v <= 0:
            return ""
        lo, hi = ax.get_ylim()
        lead = round(v / 10 ** np.floor(np.log10(v)), 6)
        return f"{v:g}" if lead in (1.0, 2.0, 5.0) or (lo > 0 and hi / lo < 10) else ""
    ax.yaxis.set_major_formatter(FuncFormatter(label))
    ax.yaxis.set_minor_formatter(FuncFormatter(label))


def phi_near_one(rows: list[dict]) -> float:
    phis = sorted({r["equivalence_ratio"] for r in rows})
    return min(phis, key=lambda p: (abs(p - 1.0), p))


