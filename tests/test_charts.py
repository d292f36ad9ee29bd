"""Every chart type renders from stored rows, for a full hydrogen study and one with failed points."""
import numpy as np
import pytest
import xarray as xr

from flamecharts import load_study, run_study
from flamecharts.design import fuel_gas_table
from flamecharts.outputs.charts import CAPTIONS, draw_all
from flamecharts.physics.fits import fit_power_law
from flamecharts.pipeline import read_limits
from flamecharts.results import exponent_table, to_dataset

from conftest import write_h2_study

BURNER = """
[gas_quality]
wobbe_tolerance_percent = 5.0

[burner]
name = "test burner"
port = "round"
port_diameter_mm = 1.0
port_velocity_m_s = 4.0
"""

ALL = ("flame_speed_vs_equivalence_ratio", "thermal_thickness_vs_equivalence_ratio",
       "adiabatic_flame_temperature_vs_equivalence_ratio", "pressure_and_preheat_dependence", "blend_comparison",
       "flashback_chart", "operating_window", "fuel_interchangeability", "admissible_limits")


@pytest.fixture(scope="module")
def study_rows(tmp_path_factory):
    folder = tmp_path_factory.mktemp("charts")
    # coarse: the charts' tests check drawing, not flame speeds (about half the solve time)
    config = write_h2_study(folder, phis="[0.08, 0.7, 1.0, 1.3]", pressures="[1.0, 3.0]", extra='resolution = "coarse"')
    config.write_text(config.read_text().replace("unburned_temperature_K = [300.0]",
                                                 "unburned_temperature_K = [300.0, 400.0]") + BURNER
                      + "\n[limits]\ncriteria = ['flashback']\nblend_fraction_tolerance = 0.02\n"
                        "equivalence_ratio_tolerance = 0.02\n")
    study = load_study(config)
    return study, run_study(study, out_dir=folder / "o", jobs=2).rows, folder


def test_every_chart_renders_with_units_and_is_not_blank(study_rows):
    import matplotlib.image as mpimg

    study, rows, folder = study_rows
    assert any(r["status"] == "no_flame" for r in rows)  # phi 0.08 is below any flammable limit
    files = draw_all(rows, fuel_gas_table(study), study, folder / "o", limits=read_limits(study, rows, folder / "o"))
    names = {f.stem for f in files}
    assert names == set(ALL) == set(CAPTIONS) - {"consumption_speed_vs_strain", "flame_speed_sensitivity",
                                                 "mechanism_comparison", "limits_by_mechanism",
                                                 "nox_vs_equivalence_ratio", "nox_vs_blend_fraction", "co_burnout",
                                                 "turbulent_regime_diagram", "core_flashback_vs_blend_fraction",
                                                 "turbulent_flame_speed_vs_phi"}
    # [stretch]: tests/test_stretch.py; [uncertainty]: tests/test_uncertainty.py; [emissions]: tests/test_emissions.py;
    # the regime diagram: tests/test_ignition.py; the core-flow margin and the turbulent flame speeds:
    # tests/test_premixer_flame_speed.py
    for name in ALL:
        png, svg = folder / "o" / "charts" / f"{name}.png", folder / "o" / "charts" / f"{name}.svg"
        assert np.asarray(mpimg.imread(png)).std() > 0.05, name
        text = svg.read_text()
        assert text.count("[") >= 2, f"{name}: axis labels carry units in brackets"
        assert "not certification" in text


def test_charts_render_when_every_flame_failed(tmp_path):
    study = load_study(write_h2_study(tmp_path, phis="[0.05, 0.08]"))
    rows = run_study(study, out_dir=tmp_path / "o", jobs=1).rows
    assert all(r["status"] == "no_flame" for r in rows)
    files = draw_all(rows, fuel_gas_table(study), study, tmp_path / "o")
    assert {f.stem for f in files} >= {"flame_speed_vs_equivalence_ratio", "fuel_interchangeability"}
    assert "adiabatic_flame_temperature_vs_equivalence_ratio" not in {f.stem for f in files}  # needs a flame
    # no [gas_quality] band: the interchangeability chart says so rather than promising one
    assert "no Wobbe band drawn" in (tmp_path / "o" / "charts" / "fuel_interchangeability.svg").read_text()


def test_a_one_phi_study_draws_every_chart_with_data_or_a_note_saying_why_not(tmp_path):
    """One equivalence ratio, three blends, two pressures, with a burner and a blend-fraction
    search: every panel of every chart drawn shows data or says in its frame why it cannot
    (checked on each chart's own figure, before draw_all's last guard notes leftover empty
    panels); the charts that need two equivalence ratios are not drawn at all."""
    from flamecharts.outputs.charts.registry import CHARTS, ChartData
    from flamecharts.outputs.charts.style import has_empty_note, shows_data

    config = write_h2_study(tmp_path, fractions="[0.0, 0.5, 1.0]", phis="[0.8]", pressures="[1.0, 2.0]")
    config.write_text(config.read_text() + BURNER.replace("5.0", "40.0") + "\n[limits]\ncriteria = ['flashback']\n"
                      + "\n[uncertainty]\n")  # a kinetic band at one phi (a broad bar) and the sensitivity chart
    study = load_study(config)
    rows = run_study(study, out_dir=tmp_path / "o", jobs=2).rows
    limits = read_limits(study, rows, tmp_path / "o")
    data = ChartData(rows=rows, gases=fuel_gas_table(study), dataset=to_dataset(study, rows), limits=limits)
    drawn = set()
    for c in CHARTS:
        if not c.when(data, study):
            continue
        fig = c.draw(data, study)
        drawn.add(c.name)
        panels = [ax for ax in fig.axes if ax.get_visible() and ax.axison]
        assert panels, c.name
        for ax in panels:
            assert shows_data(ax) or has_empty_note(ax), f"{c.name}: '{ax.get_title()}' is an empty frame"
        assert_inside_the_frame(fig, c.name)
        assert_legend_names_drawn_artists(fig, c.name)
    assert {"blend_comparison", "admissible_limits", "flashback_chart", "flame_speed_vs_equivalence_ratio",
            "flame_speed_sensitivity"} <= drawn
    assert "operating_window" not in drawn  # a map over phi needs two of them
    notes = [t.get_text() for t in plt_figure_texts(CHARTS, data, study, "blend_comparison")]
    assert any("this study sweeps one equivalence ratio" in t for t in notes)
    # the sensitivity chart shows 3 of the 6 points (one per gas at the lowest pressure) and says where the rest are
    fig = next(c for c in CHARTS if c.name == "flame_speed_sensitivity").draw(data, study)
    assert "Shown: 3 of 6 points with sensitivities" in fig._suptitle.get_text().replace("\n", " ")
    assert "sensitivities.csv" in fig._suptitle.get_text().replace("\n", " ")
    # the report says which charts it leaves out, and why
    from flamecharts.outputs.report import write_report

    draw_all(rows, fuel_gas_table(study), study, tmp_path / "o", limits=limits)
    html = write_report(study, rows, tmp_path / "o").read_text()
    assert "Not drawn for this study: " in html and "operating_window (it maps two axes" in html


def plt_figure_texts(charts, data, study, name):
    fig = next(c for c in charts if c.name == name).draw(data, study)
    return [t for ax in fig.axes for t in ax.texts]


def test_flame_temperature_chart_plots_stored_temperatures_above_the_preheat(study_rows):
    import matplotlib.pyplot as plt

    from flamecharts.outputs.charts import CHARTS, ChartData

    study, rows, _ = study_rows
    c = next(c for c in CHARTS if c.name == "adiabatic_flame_temperature_vs_equivalence_ratio")
    data = ChartData(rows=rows, gases=fuel_gas_table(study), dataset=to_dataset(study, rows))
    assert c.when(data, study) and "equivalence ratio" in CAPTIONS[c.name]
    fig = c.draw(data, study)
    axes = [ax for ax in fig.axes if ax.get_visible() and ax.get_title()]
    assert len(axes) == 4  # p in (1, 3) bar x T_u in (300, 400) K
    plotted = {round(float(y), 6) for ax in axes for line in ax.get_lines() for y in line.get_ydata()}
    stored = {round(r["adiabatic_flame_temperature_K"], 6) for r in rows if r["status"] == "ok"}
    assert plotted == stored
    lowest = min(float(ax.get_title().split("T_u = ")[1].split(" K")[0]) for ax in axes)
    for ax in axes:  # one shared scale whose floor is just under the lowest preheat (no flame is marked at its own)
        bottom, top = ax.get_ylim()
        assert ax.get_ylim() == axes[0].get_ylim() and lowest - 0.1 * (top - lowest) < bottom < lowest
    plt.close(fig)


def test_power_law_fit_reproduces_known_exponents():
    # synthetic data with known exponents: S = 0.4 (p)^-0.45 (T/300)^1.8
    rng_p = np.array([1.0, 2.0, 5.0, 10.0])
    b, a = fit_power_law(rng_p, 0.4 * rng_p ** -0.45)
    assert b == pytest.approx(-0.45, abs=1e-12) and a == pytest.approx(0.4, rel=1e-12)
    P, T = np.array([1.0, 4.0]), np.array([300.0, 450.0, 600.0])
    S = 0.4 * P[:, None] ** -0.45 * (T[None, :] / 300) ** 1.8
    ds = xr.Dataset({"laminar_flame_speed_m_s": (("fuel", "oxidizer", "blend_fraction", "pressure_bar",
                                                  "unburned_temperature_K", "equivalence_ratio"),
                                                 S[None, None, None, :, :, None])},
                    coords={"fuel": ["f"], "oxidizer": ["air"], "blend_fraction": [0.0], "pressure_bar": P,
                            "unburned_temperature_K": T, "equivalence_ratio": [1.0]})
    table = exponent_table(ds)
    betas = [t["value"] for t in table if t["exponent"] == "pressure_exponent_beta"]
    alphas = [t["value"] for t in table if t["exponent"] == "temperature_exponent_alpha"]
    assert betas == pytest.approx([-0.45] * 3) and alphas == pytest.approx([1.8] * 2)


# ---- what a new user found misleading (each test fails on the charts as they were)
def _chart(name):
    from flamecharts.outputs.charts import CHARTS

    return next(c for c in CHARTS if c.name == name)


def _data(study, rows):
    from flamecharts.outputs.charts import ChartData

    return ChartData(rows=rows, gases=fuel_gas_table(study), dataset=to_dataset(study, rows))


def _green_of_window(fb, bo, need: float) -> list:
    """The green (admissible) patches of the operating-window chart drawn for a 2 x 2 grid of
    flashback and blowoff margins over (blend fraction 0, 0.2; phi 0.9, 1.1), minimum ``need``."""
    ax = _window_figure(fb, bo, need).axes[0]
    return [c for c in ax.collections if hasattr(c, "get_paths") and len(c.get_facecolor())
            and np.allclose(c.get_facecolor()[0][:3], (0xbf / 255, 0xe3 / 255, 0xbf / 255))]


def _window_figure(fb, bo, need: float, why: str = ""):
    """The operating-window chart of a 2 x 2 grid of margins (see _green_of_window); ``why``: every
    point's criteria_not_assessed."""
    from types import SimpleNamespace

    from flamecharts.outputs.charts.design_charts import window_chart
    from flamecharts.outputs.charts.registry import ChartData

    dims = ("fuel", "oxidizer", "blend_fraction", "pressure_bar", "unburned_temperature_K", "equivalence_ratio")

    def var(a):
        return (dims, a[None, None, :, None, None, :])
    ds = xr.Dataset({"flashback_margin": var(fb), "blowoff_margin": var(bo), "warnings": var(np.full((2, 2), "")),
                     "criteria_not_assessed": var(np.full((2, 2), why))},
                    coords={"fuel": ["gas"], "oxidizer": ["air"], "blend_fraction": [0.0, 0.2], "pressure_bar": [1.0],
                            "unburned_temperature_K": [300.0], "equivalence_ratio": [0.9, 1.1]})
    burner = SimpleNamespace(min_flashback_margin=need, min_blowoff_margin=need, name="test burner",
                             on_stabilizer=False, blowoff=("blowoff_margin", need, "blowoff"))
    study = SimpleNamespace(burner=burner, blend_with="hydrogen", title="t", mechanism="m", transport="tr",
                            thermal_diffusion=False, resolution="standard", analysis_atoms={}, reduced=None)
    return window_chart(ChartData(dataset=ds, rows=[], gases=[]), study)


def test_the_window_fill_and_its_edge_lines_come_from_one_field():
    """A cell whose corners each break one margin, while both margins hold at its centre
    (bilinear in the logarithms): the centre is green. Filling the corner-wise minimum, as the
    chart once did, left the whole cell white between the two lines."""
    fb = 1.5 * np.array([[2.0, 0.6], [0.6, 2.0]])  # (blend fraction, phi); at the centre 1.5 sqrt(1.2)
    bo = 1.5 * np.array([[0.6, 2.0], [2.0, 0.6]])
    green = _green_of_window(fb, bo, 1.5)
    assert green and any(p.contains_point((10.0, 1.0)) for c in green for p in c.get_paths())
    assert not any(p.contains_point((1.0, 0.91)) for c in green for p in c.get_paths())  # corner: FB fails


def test_panels_share_one_flame_speed_scale_and_warned_points_are_ringed(study_rows):
    import matplotlib.pyplot as plt

    study, rows, _ = study_rows
    rows = [dict(r, warnings="") for r in rows]  # only the two warned here (lean hydrogen points carry a Lewis warning)
    burning = [r for r in rows if r["status"] == "ok"]
    burning[0]["warnings"] = burning[3]["warnings"] = "pressure outside the mechanism's range (test)"
    fig = _chart("flame_speed_vs_equivalence_ratio").draw(_data(study, rows), study)
    axes = [ax for ax in fig.axes if ax.get_visible() and ax.get_title()]
    assert len(axes) == 4 and len({ax.get_ylim() for ax in axes}) == 1
    red = (0xb2 / 255, 0x18 / 255, 0x2b / 255)
    rings = sum(len(c.get_offsets()) for ax in axes for c in ax.collections
                if len(c.get_edgecolor()) and np.allclose(c.get_edgecolor()[0][:3], red))
    assert rings == 2
    plt.close(fig)


def test_only_the_varied_axis_is_drawn_and_two_point_fits_say_so(tmp_path):
    import matplotlib.pyplot as plt

    study = load_study(write_h2_study(tmp_path, fractions="[0.0]", phis="[1.0]", pressures="[1.0, 2.0]"))
    rows = run_study(study, out_dir=tmp_path / "o", jobs=1).rows
    c = _chart("pressure_and_preheat_dependence")
    fig = c.draw(_data(study, rows), study)
    titles = [ax.get_title() for ax in fig.axes if ax.get_visible() and ax.get_title()]
    assert titles == ["S_L ∝ p^β (φ = 1)"]  # one preheat: no empty T_u panel
    assert all("through 2 points only" in t.get_text() for t in fig.legends[0].get_texts())
    plt.close(fig)


def test_blend_comparison_covers_every_condition_and_flashback_plots_the_margin(study_rows):
    import matplotlib.pyplot as plt

    study, rows, _ = study_rows
    fig = _chart("blend_comparison").draw(_data(study, rows), study)
    titles = " ".join(ax.get_title() for ax in fig.axes)
    # 4 conditions, 2 drawn (the chart rule: at most 9 panels, four per block): first and last, the rest named
    assert "1 bar, 300 K" in titles and "3 bar, 400 K" in titles
    assert "Shown: 2 of 4 fuel/condition blocks" in fig._suptitle.get_text().replace("\n", " ")
    plt.close(fig)
    fig = _chart("flashback_chart").draw(_data(study, rows), study)
    plotted = {round(float(y), 9) for ax in fig.axes[::2] for line in ax.get_lines() for y in line.get_ydata()}
    margins = {round(r["flashback_margin"], 9) for r in rows if r["flashback_margin"] is not None}
    assert margins <= plotted  # the verdict's own number, one curve per blend
    plt.close(fig)


def test_a_big_study_keeps_every_chart_readable(study_rows, tmp_path):
    """The chart rule of registry.py (docs/sweeps.md, 'Charts of big studies'): 5 pressures x 4 preheats
    x 10 blend fractions draw at most 9 panels and 12 curves a figure, and each figure names
    the levels it leaves out. Rows: the solved flames of the small study copied to every point."""
    import matplotlib.pyplot as plt

    from flamecharts.outputs.charts.registry import MAX_CURVES, MAX_PANELS, ChartData
    from flamecharts.results import point_rows
    from flamecharts.store import DB_NAME, Store
    from flamecharts.sweep.points import points

    small, _, folder = study_rows
    with Store(folder / "o" / DB_NAME, readonly=True) as store:
        solved = [r for r in store.rows().values() if r["status"] == "ok"]
    config = write_h2_study(tmp_path, name="big", fractions=str([k / 9 for k in range(10)]), phis="[0.7, 1.0, 1.3]",
                            pressures="[1.0, 2.0, 3.0, 5.0, 8.0]")
    config.write_text(config.read_text().replace("unburned_temperature_K = [300.0]",
                                                 "unburned_temperature_K = [300.0, 350.0, 400.0, 450.0]") + BURNER)
    big = load_study(config)
    pts = points(big)
    rows = point_rows(big, pts, {p.key: solved[i % len(solved)] for i, p in enumerate(pts)})
    data = ChartData(rows=rows, gases=fuel_gas_table(big), dataset=to_dataset(big, rows))
    assert data.shown["pressure_bar"] == [1.0, 3.0, 8.0] and data.shown["unburned_temperature_K"] == [300.0, 400.0, 450.0]
    assert len(data.shown["blend_fraction"]) == 6 and data.shown["blend_fraction"][::5] == [0.0, 1.0]
    for name in ("flame_speed_vs_equivalence_ratio", "flashback_chart", "operating_window", "blend_comparison",
                 "pressure_and_preheat_dependence"):
        fig = _chart(name).draw(data, big)
        panels = [ax for ax in fig.axes if ax.get_visible()]
        assert len(panels) <= MAX_PANELS, name
        assert max(len(ax.get_lines()) for ax in panels) <= 3 * MAX_CURVES, name  # curves (+ companions, rings)
        assert "Shown:" in fig._suptitle.get_text(), name
        plt.close(fig)
    fig = _chart("flame_speed_vs_equivalence_ratio").draw(data, big)
    assert "3 of 5 pressures (1, 3, 8 bar)" in fig._suptitle.get_text().replace("\n", " ")
    assert max(len(ax.get_lines()) for ax in fig.axes) <= MAX_CURVES
    plt.close(fig)


def test_the_window_keeps_the_margin_product_between_the_solved_points():
    """Where flashback x blowoff margin is the same at every solved point (both are S_L^2/alpha_u
    against the wall gradient), minimum margins whose product is above it can be met nowhere: the
    window is empty between the points too (margins read in their logarithms; read linearly, a
    false green band appeared between them)."""
    fb = np.array([[4.0, 1.2], [1.0, 3.0]])   # (blend fraction, phi)
    assert not _green_of_window(fb, 2.99 / fb, 2.0)


# ---- what a newcomer found on the second try: markers on the frame, legend entries for what is not drawn
def _points_drawn(ax):
    """(x, y) arrays of what a panel draws in data coordinates, read off its artists: lines and
    markers (Line2D), scatter offsets (PathCollection); reference lines across the panel give their
    one data coordinate (axhline: y; axvline: x). Lines drawn edge to edge on purpose (gid 'guide')
    are left out."""
    from matplotlib.collections import PathCollection

    for line in ax.get_lines():
        if not line.get_visible() or line.get_gid() == "guide":
            continue
        x, y = np.asarray(line.get_xdata(), dtype=float), np.asarray(line.get_ydata(), dtype=float)
        t = line.get_transform()
        if t == ax.transData:
            yield x, y
        elif t == ax.get_yaxis_transform():
            yield np.full(len(y), np.nan), y
        elif t == ax.get_xaxis_transform():
            yield x, np.full(len(x), np.nan)
    for c in ax.collections:
        if isinstance(c, PathCollection) and c.get_visible() and c.get_offset_transform() == ax.transData:
            xy = np.asarray(c.get_offsets(), dtype=float).reshape(-1, 2)
            yield xy[:, 0], xy[:, 1]


def assert_inside_the_frame(fig, name):
    """Every marker, ring, curve point and reference line of every panel strictly inside its limits
    (on a log axis: positive and inside): none on the frame, none cut by it."""
    for ax in fig.axes:
        if not ax.get_visible() or not ax.axison:
            continue
        for x, y in _points_drawn(ax):
            for values, (lo, hi), scale, axis in ((x, ax.get_xlim(), ax.get_xscale(), "x"),
                                                  (y, ax.get_ylim(), ax.get_yscale(), "y")):
                lo, hi = min(lo, hi), max(lo, hi)
                v = values[np.isfinite(values)]
                if scale == "log":
                    assert (v > 0).all(), f"{name}: '{ax.get_title()}' {axis} <= 0 on a log axis"
                assert ((v > lo) & (v < hi)).all(), (f"{name}: '{ax.get_title()}': {axis} {v[(v <= lo) | (v >= hi)]} "
                                                     f"on or outside the frame {lo:g}..{hi:g}")


def _colours(artist):
    """The non-white RGB colours an artist (or legend handle) shows, rounded."""
    from matplotlib.colors import to_rgba_array

    out = set()
    for getter in ("get_color", "get_edgecolor", "get_facecolor", "get_markerfacecolor", "get_markeredgecolor"):
        try:
            value = getattr(artist, getter)()
        except (AttributeError, TypeError):
            continue
        try:
            rgba = to_rgba_array(value)
        except (ValueError, TypeError):
            continue
        out |= {tuple(np.round(c[:3], 2)) for c in rgba if c[3] > 0 and not np.allclose(c[:3], 1.0)}
    return out


def _has_data(artist, ax):
    if not artist.get_visible():
        return False
    if hasattr(artist, "get_xydata"):
        xy = np.asarray(artist.get_xydata(), dtype=float)
        return bool(xy.size) and bool(np.isfinite(xy).all(axis=1).any())
    if hasattr(artist, "get_offsets") and np.asarray(artist.get_offsets()).size:
        return True
    if hasattr(artist, "get_paths"):
        return any(np.asarray(p.vertices).size for p in artist.get_paths())
    return True  # a patch (span, bar) drawn in the panel


def _stands_for(handle, a) -> bool:
    """Whether legend ``handle`` can stand for drawn artist ``a``: a shared colour (and hatch, if the
    entry has one), or, for a grey entry, the same hatch, marker, or line style of a plain line."""
    marker = handle.get_marker() if hasattr(handle, "get_marker") else None
    hatch = handle.get_hatch() if hasattr(handle, "get_hatch") else None
    colours = _colours(handle)
    hatches = {getattr(a, "get_hatch", lambda: None)(), *(getattr(a, "hatches", None) or [])}
    if colours & _colours(a):
        return not hatch or hatch in hatches
    if not (colours and all(c[0] == c[1] == c[2] for c in colours)):
        return False
    if hatch:
        return hatch in hatches
    if not hasattr(handle, "get_marker"):  # a grey area: bands or bars drawn in each curve's colour
        return not hasattr(a, "get_xydata") and not hasattr(a, "get_sizes")
    if marker in ("None", "none", "", None):  # a grey line: a line style drawn in each curve's colour
        return hasattr(a, "get_xydata") and a.get_linestyle() == handle.get_linestyle()
    return getattr(a, "get_marker", lambda: None)() == marker or hasattr(a, "get_sizes")


def assert_legend_names_drawn_artists(fig, name):
    """Each legend entry that shows a line, marker or area stands for something drawn: an artist
    with visible data in some panel sharing its colour, or (a grey entry, standing for marks drawn
    in each curve's colour) its marker, hatch or line style. Entries without any mark are notes."""
    drawn = [(a, ax) for ax in fig.axes if ax.get_visible() for a in [*ax.get_lines(), *ax.collections, *ax.patches]
             if _has_data(a, ax)]
    for legend in fig.legends + [ax.get_legend() for ax in fig.axes if ax.get_legend()]:
        for handle, text in zip(legend.legend_handles, legend.get_texts()):
            label = text.get_text()
            marker = handle.get_marker() if hasattr(handle, "get_marker") else None
            style = handle.get_linestyle() if hasattr(handle, "get_linestyle") else None
            if hasattr(handle, "get_marker") and marker in ("None", "none", "", " ", None) and style in ("None", "none", ""):
                continue  # a note: no mark of its own
            assert any(_stands_for(handle, a) for a, _ in drawn), f"{name}: legend entry {label!r} names nothing drawn"


def test_every_chart_keeps_its_marks_inside_the_frame_and_its_legend_to_what_is_drawn(study_rows):
    """The normal study (four phi, two blends, two pressures and preheats, a burner, limits): every
    chart's marks lie strictly inside each panel's limits, and its legend names only what it draws."""
    import matplotlib.pyplot as plt

    from flamecharts.outputs.charts.registry import CHARTS, ChartData

    study, rows, folder = study_rows
    data = ChartData(rows=rows, gases=fuel_gas_table(study), dataset=to_dataset(study, rows),
                     limits=read_limits(study, rows, folder / "o"))
    drawn = []
    for c in CHARTS:
        if c.when(data, study):
            fig = c.draw(data, study)
            assert_inside_the_frame(fig, c.name)
            assert_legend_names_drawn_artists(fig, c.name)
            drawn.append(c.name)
            plt.close(fig)
    assert set(ALL) <= set(drawn)


def test_a_margin_assessed_nowhere_is_said_in_the_window_frame_and_left_out_of_its_legend():
    """Blowoff not assessed at any point (hydrogen's Lewis number): no blowoff line and no legend
    entry for one, a note in the frame saying so and why; the flashback edge stays."""
    fb = np.array([[2.0, 1.0], [2.4, 1.2]])  # (blend fraction, phi): the 1.5 edge crosses the map
    fig = _window_figure(fb, np.full((2, 2), np.nan), 1.5,
                         why="blowoff: Lewis number 0.41 < 0.8 (hydrogen-rich)")
    ax = fig.axes[0]
    notes = [t.get_text().replace("\n", " ") for t in ax.texts]
    assert any("blowoff margin not assessed at any point (Lewis number 0.41 < 0.8" in t for t in notes), notes
    labels = [t.get_text() for t in fig.legends[0].get_texts()]
    assert not any("blowoff margin" in t for t in labels) and not any("hatched" in t for t in labels), labels
    assert any(t.startswith("flashback margin g_wall/g_F = 1.5") for t in labels)
    assert_inside_the_frame(fig, "operating_window")
    assert_legend_names_drawn_artists(fig, "operating_window")
    fig = _window_figure(fb, 3.0 / fb, 1.5)  # both assessed: both lines, no note
    assert not fig.axes[0].texts
    assert any("blowoff margin" in t.get_text() for t in fig.legends[0].get_texts())
