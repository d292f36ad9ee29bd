"""What every chart shares: colours, markers, figure frame, footer with the cautions, selections of rows."""
from __future__ import annotations

import re
import textwrap
from typing import TYPE_CHECKING, Any

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402
from matplotlib.collections import PathCollection  # noqa: E402
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
    """Title, legend, footer and layout of a chart, and every panel's frame fitted round its data
    (:func:`fit_frames`): the last call of every chart's ``draw``."""
    fit_frames(fig)
    fig.suptitle(title_text(fig, title), fontsize=11.5, x=0.02, ha="left")
    if handles:
        fig.legend(list(handles.values()), list(handles.keys()), loc="outside right upper", fontsize=8.5,
                   frameon=False, title=legend_title, title_fontsize=8.5)
    footer(fig, study)
    engine = fig.get_layout_engine()
    assert isinstance(engine, ConstrainedLayoutEngine)  # figure() makes every chart's layout constrained
    engine.set(rect=(0, 0.07, 1, 0.93))
    return fig


#: gid of a line drawn across the frame on purpose (a regime boundary from edge to edge):
#: :func:`fit_frames` does not fit the frame round it.
GUIDE = "guide"
#: Room left between the frame and the outermost marker, ring or line, as a fraction of the axis
#: (at least; more where a marker's radius needs it): :func:`fit_frames`.
FRAME_MARGIN = 0.06


def _marker_radius_pt(artist: object) -> float:
    """Half the size of an artist's markers [pt] (0 for a plain line or an area)."""
    from matplotlib.lines import Line2D

    if isinstance(artist, Line2D):
        return 0.5 * float(artist.get_markersize()) + float(artist.get_markeredgewidth()) \
            if artist.get_marker() not in (None, "None", "none", "", " ") else 0.5 * float(artist.get_linewidth())
    if isinstance(artist, PathCollection):
        sizes = np.asarray(artist.get_sizes(), dtype=float)
        return 0.5 * float(np.sqrt(sizes.max())) + 1.0 if sizes.size else 0.0
    return 0.0


def drawn_points(ax: Axes) -> list[tuple[np.ndarray, np.ndarray, float]]:
    """What a panel draws in data coordinates, as (x, y, marker radius [pt]) per artist: the points
    of lines and markers, scatter offsets, the vertices of error bars, bands and contours, and the
    data coordinate of reference lines across the panel (axhline: y, x NaN; axvline: x, y NaN).
    Lines marked :data:`GUIDE`, areas (patches: spans, bars) and invisible artists are left out."""
    out = []
    artists: list[Any] = [*ax.get_lines(), *ax.collections]
    for a in artists:
        if not a.get_visible() or a.get_gid() == GUIDE:
            continue
        t, r = a.get_transform(), _marker_radius_pt(a)
        if hasattr(a, "get_xydata"):  # a line
            xy = np.asarray(a.get_xydata(), dtype=np.float64).reshape(-1, 2)
        else:
            offsets = np.asarray(a.get_offsets(), dtype=np.float64).reshape(-1, 2)
            if offsets.size and a.get_offset_transform() == ax.transData:
                out.append((offsets[:, 0], offsets[:, 1], r))
                continue
            paths = a.get_paths()
            xy = np.concatenate([p.vertices for p in paths]) if paths else np.empty((0, 2))
        if t == ax.transData:
            out.append((xy[:, 0], xy[:, 1], r))
        elif t == ax.get_yaxis_transform():  # axhline: y in data, x across the panel
            out.append((np.full(len(xy), np.nan), xy[:, 1], r))
        elif t == ax.get_xaxis_transform():  # axvline
            out.append((xy[:, 0], np.full(len(xy), np.nan), r))
    return out


def _fit_axis(lo: float, hi: float, values: np.ndarray, margin: float, log: bool) -> tuple[float, float]:
    """Limits (lo, hi), widened only where ``values`` come closer to an end than ``margin`` of the
    axis, so that they do not any more (on a log axis, in the logarithm)."""
    f, inv = (np.log10, lambda v: 10.0 ** v) if log else (lambda v: v, lambda v: v)
    values = values[np.isfinite(values) & ((values > 0) if log else True)]
    if not values.size or (log and (lo <= 0 or hi <= 0)):
        return lo, hi
    a, b = f(lo), f(hi)
    dmin, dmax = float(f(values.min())), float(f(values.max()))
    span = b - a
    low_ok, high_ok = dmin - a >= 0.5 * margin * span, b - dmax >= 0.5 * margin * span
    if low_ok and high_ok:
        return lo, hi
    if not low_ok and not high_ok:
        width = (dmax - dmin) / (1 - 2 * margin) if dmax > dmin else max(abs(dmin) * 0.2, span, 1e-9)
        a, b = min(a, dmin - margin * width), max(b, dmax + margin * width)
    elif not low_ok:
        a = min(a, (dmin - margin * b) / (1 - margin))
    else:
        b = max(b, (dmax - margin * a) / (1 - margin))
    return float(inv(a)), float(inv(b))


def fit_frames(fig: Figure) -> None:
    """Fit every panel's limits round what it draws, on both axes: no marker, ring, error bar or
    reference line on or outside the frame (a one-value axis included, whose autoscaled limits
    sit exactly at the value). A limit a chart set stays where it leaves room (a flame-speed axis
    from 0); one that cuts a marker is moved out, by :data:`FRAME_MARGIN` of the axis or the
    largest marker's radius if more. Panels that share an axis are fitted together."""
    for ax in fig.axes:
        if not ax.get_visible() or not ax.axison:
            continue
        pts = drawn_points(ax)
        bbox = ax.get_position()
        size_pt = (72 * fig.get_figwidth() * bbox.width, 72 * fig.get_figheight() * bbox.height)
        for k, axis in enumerate("xy"):
            scale = getattr(ax, f"get_{axis}scale")()
            if scale not in ("linear", "log"):
                continue
            shared = getattr(ax, f"get_shared_{axis}_axes")().get_siblings(ax)
            group = [pts] + [drawn_points(s) for s in shared if s is not ax]
            values = np.concatenate([p[k] for g in group for p in g] or [np.empty(0)])
            radius = max((p[2] for g in group for p in g if np.isfinite(p[k]).any()), default=0.0)
            margin = min(0.2, max(FRAME_MARGIN, 1.5 * (radius + 2.0) / max(size_pt[k], 1.0)))
            lo, hi = getattr(ax, f"get_{axis}lim")()
            new = _fit_axis(min(lo, hi), max(lo, hi), values, margin, scale == "log")
            if new != (min(lo, hi), max(lo, hi)):
                getattr(ax, f"set_{axis}lim")(new[::-1] if lo > hi else new)


#: How a panel with nothing to show starts its note (tests look for it).
EMPTY_NOTE = "Nothing to show here"


def empty_note(ax: Axes, reason: str) -> None:
    """Say in the panel's own frame why it is empty (instead of an empty frame with a
    meaningless axis): its ticks go, the reason is written across the middle."""
    ax.set_xticks([])
    ax.set_yticks([])
    ax.text(0.5, 0.5, textwrap.fill(f"{EMPTY_NOTE}: {reason}", 48), transform=ax.transAxes, ha="center",
            va="center", fontsize=9, color="0.35", wrap=True)


def frame_note(ax: Axes, text: str) -> None:
    """A note inside a panel that does show data, on what it cannot show (a criterion assessed at
    no point): on a white box, wrapped to the panel, in the corner whose box covers none of the
    panel's marks drawn so far (top left first); where every corner would, top left with the upper
    limit raised to leave it room (a linear axis). Call it after the marks."""
    wrapped = textwrap.fill(text, 60)
    height, width = min(0.05 * (wrapped.count("\n") + 1) + 0.04, 0.6), 0.62
    marks = _marks_in_axes(ax)

    def covered(corner: tuple[float, float, str, str]) -> int:
        """Marks in the corner's box, measured from the frame's edge (a mark on the frame now moves
        inside it when finish fits the frame)."""
        _, _, ha, va = corner
        x0, y0 = (-0.01 if ha == "left" else 0.97 - width), (0.97 - height if va == "top" else -0.01)
        return int(((marks[:, 0] >= x0) & (marks[:, 0] <= x0 + width + 0.04) & (marks[:, 1] >= y0)
                    & (marks[:, 1] <= y0 + height + 0.04)).sum())
    x, y, ha, va = min(NOTE_CORNERS, key=covered)
    if covered((x, y, ha, va)) and ax.get_yscale() == "linear" and len(marks):
        x, y, ha, va = NOTE_CORNERS[0]   # every corner holds marks: room made above them for the note
        lo, hi = ax.get_ylim()
        top = lo + (hi - lo) * float(marks[:, 1].max())
        ax.set_ylim(lo, lo + (top - lo) / max(1.0 - height - 0.06, 0.2))
    ax.text(x, y, wrapped, transform=ax.transAxes, ha=ha, va=va, fontsize=8, color="0.25", zorder=10,
            bbox=dict(facecolor="white", edgecolor="0.6", alpha=0.8, boxstyle="round,pad=0.3"))


#: Where a frame note may sit (axes fraction x, y, alignment), in order of preference.
NOTE_CORNERS = ((0.02, 0.97, "left", "top"), (0.98, 0.97, "right", "top"),
                (0.02, 0.03, "left", "bottom"), (0.98, 0.03, "right", "bottom"))


def _marks_in_axes(ax: Axes) -> np.ndarray:
    """Every finite point of the panel's lines and markers so far (:func:`drawn_points` less its
    areas, contours and reference lines), in axes fractions (n x 2; the limits as they stand now)."""
    ax.get_xlim()  # settle the autoscaled limits before transforming
    pts = [np.column_stack([x, y]) for x, y, radius in drawn_points(ax) if radius > 0]
    xy = np.concatenate(pts) if pts else np.empty((0, 2))
    xy = xy[np.isfinite(xy).all(axis=1)]
    if not len(xy):
        return xy
    return ax.transAxes.inverted().transform(ax.transData.transform(xy))


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


def unassessed_reasons(rows: list[dict], criterion: str) -> list[str]:
    """Why ``criterion`` ('flashback', 'blowoff', ...) is not assessed at the burning ``rows``
    (results.csv ``criteria_not_assessed``: 'flashback: 4 bar outside 0.5-2 bar; blowoff: ...'),
    each reason once in first-seen order; reasons that differ in their numbers only are merged,
    each differing number given as its range.

    >>> unassessed_reasons([{"criteria_not_assessed": "blowoff: Lewis number 0.39 < 0.8"},
    ...                     {"criteria_not_assessed": "flashback: 4 bar outside 0.5-2 bar; blowoff: Lewis number 0.43 < 0.8"}],
    ...                    "blowoff")
    ['Lewis number 0.39-0.43 < 0.8']
    """
    number = re.compile(r"\d+(?:\.\d+)?")
    out: dict[str, list[list[float]]] = {}
    for r in rows:
        for part in (r.get("criteria_not_assessed") or "").split("; "):
            if part.startswith(f"{criterion}: "):
                text = part[len(criterion) + 2:]
                out.setdefault(number.sub("#", text), []).append([float(v) for v in number.findall(text)])
    merged = []
    for template, values in out.items():
        spans = [f"{min(col):g}" if min(col) == max(col) else f"{min(col):g}-{max(col):g}" for col in zip(*values)]
        pieces = template.split("#")
        merged.append("".join(piece + (spans[i] if i < len(spans) else "") for i, piece in enumerate(pieces)))
    return merged


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


