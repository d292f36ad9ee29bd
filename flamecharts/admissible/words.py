"""The answers of limits.csv in plain sentences (CLI and report), and what the limits keep.

Every sentence says what it rests on: the criterion that fails past each edge with its
margin there, the Wobbe band where it binds (and what the flame margins alone would
allow), and, where no window exists, the criterion that fails at each swept point and
the closest miss.
"""
from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

from ..columns import gas_label
from ..physics.indicators import DEFAULTS as INDICATOR_DEFAULTS
from .search import CRITERIA, FOUND, NOT_ASSESSED, RANGE_END, SWEPT_END, WOBBE_EDGE

if TYPE_CHECKING:
    from ..config import Burner, Limits, Study


def burner_and_limits(study: Study) -> tuple[Burner, Limits]:
    """The burner and the [limits] of a study with limits (config: [limits] needs a [burner])."""
    assert study.burner is not None and study.limits is not None
    return study.burner, study.limits


def band_words(study: Study) -> str:
    """'the ±10 % Wobbe band' or 'the Wobbe band 45.7-54.7 MJ/m³' of the study's [gas_quality]."""
    gq = study.gas_quality
    if gq.tolerance_percent is not None:
        return f"the ±{gq.tolerance_percent:g} % Wobbe band"
    if gq.band_MJ_m3 is not None:
        return f"the Wobbe band {gq.band_MJ_m3[0]:g}-{gq.band_MJ_m3[1]:g} MJ/m³"
    return "the Wobbe band"


def kept(study: Study) -> str:
    """What the study's limits keep, in words: 'flashback >= 1.5, blowoff >= 1.5 and the ±10 % Wobbe band'."""
    b, lim = burner_and_limits(study)
    words = [f"{c} >= {getattr(b, CRITERIA[c][1]):g}" for c in lim.criteria if c in CRITERIA]
    if "wobbe" in lim.criteria:
        words.append(band_words(study))
    return ", ".join(words[:-1]) + " and " + words[-1] if len(words) > 1 else words[0]


def fixed_ratio_note(study: Study) -> str:
    """'' or the warning that a port's flashback and blowoff margins multiply to a constant:
    both critical gradients are S_L^2/alpha_u times a constant (physics.indicators), so where
    both are criteria the band they allow is the same whatever the mixture. Not checked
    against published stability data (flashback and blowoff velocities of the same ports
    across phi): said wherever an answer rests on it."""
    b, lim = burner_and_limits(study)
    crit = [c for c in lim.criteria if c in CRITERIA]
    if "flashback" not in crit or "blowoff" not in crit:
        return ""
    s = study.indicator_settings
    product = s["flashback_peclet"] * s["blowoff_karlovitz"]
    top = product / b.min_blowoff_margin
    band = (f"flashback margins {b.min_flashback_margin:g}-{top:.2f}" if top >= b.min_flashback_margin
            else "no flashback margin at all")
    default = (s["flashback_peclet"], s["blowoff_karlovitz"]) == (INDICATOR_DEFAULTS["flashback_peclet"],
                                                                  INDICATOR_DEFAULTS["blowoff_karlovitz"])
    return (f"rests on two fixed constants: flashback x blowoff margin = Pe_F Ka_B = {product:.3g} at every point, so "
            f"the two allow {band} whatever the mixture" + (" (flamecharts' defaults, not checked against "
                                                             "published port stability data)" if default else ""))


def _where(r: dict) -> str:
    return f"{r['pressure_bar']:g} bar, {r['unburned_temperature_K']:g} K"


def _minimum(study: Study, criterion: str | None) -> float | None:
    return getattr(study.burner, CRITERIA[criterion][1], None) if criterion in CRITERIA else None


def _binds(r: dict, side: str, study: Study, past: str) -> str:
    """'flashback binds richer: margin 1.50 there, minimum 1.5'."""
    c, m = r.get(f"{side}_binding"), r.get(f"{side}_margin")
    if c == "no flame":
        return f"the mixture does not burn{past}"
    if c == "autoignition":
        return f"the mixture autoignites{past}"
    if c == NOT_ASSESSED:
        return f"no criterion is assessed{past}"
    need = _minimum(study, c)
    there = f": margin {m:.2f} there, minimum {need:g}" if m is not None and need is not None else ""
    return f"{c} binds{past}{_on(r, c)}{there}"


def _on(r: dict, criterion: str | None) -> str:
    """' on Muppala et al.'s S_T, outside its fitted range' where core_flashback binds: what its margin
    rests on (limits.csv core_flashback_basis); '' for the other criteria."""
    basis = r.get("core_flashback_basis")
    return f" on {basis}" if criterion == "core_flashback" and basis else ""


def _blend_edge(r: dict, side: str, study: Study, blend: str) -> str:
    v, kind = r[f"{side}_edge"], r[f"{side}_kind"]
    pct = f"{100 * v:.1f} %"
    if kind == FOUND:
        return f"{pct} ({_binds(r, side, study, ' below' if side == 'lower' else '')})"
    if kind == WOBBE_EDGE:
        verb = "enters" if side == "lower" else "leaves"
        alone = ""
        if side == "upper":
            fk = r.get("flame_upper_kind")
            if fk == FOUND:
                alone = (f"; the flame margins alone would allow {100 * r['flame_upper_edge']:.1f} % "
                         f"({r['flame_upper_binding']} binds{_on(r, r['flame_upper_binding'])})")
            elif fk == RANGE_END:
                alone = f"; no {'assessed ' if r.get('criteria_not_assessed') else ''}flame criterion binds up to 100 % {blend}"
            elif fk is not None:
                alone = f"; the flame margins alone hold up to at least {100 * r['flame_upper_edge']:.1f} %"
        return f"{pct}, where the Wobbe index {verb} {band_words(study)}{alone}"
    if kind == RANGE_END:
        holds = "every assessed margin holds" if r.get("criteria_not_assessed") else "every margin holds"
        return f"100 %, the pure blend gas ({holds})" if side == "upper" else "0 %"
    if kind == SWEPT_END:
        return f"{pct} (the lowest swept fraction; the window may reach lower)"
    return f"{'at least' if side == 'upper' else 'about'} {pct} (edge not settled: {r.get('note', '')})"


def _phi_edge(r: dict, side: str, study: Study) -> str:
    v, kind = r[f"{side}_edge"], r[f"{side}_kind"]
    past = " leaner" if side == "lower" else " richer"
    if kind == FOUND:
        return f"phi {v:.3f} ({_binds(r, side, study, past)})"
    if kind == SWEPT_END:
        return f"phi {v:g} (the {'leanest' if side == 'lower' else 'richest'} swept; the window may reach{past})"
    return f"phi {v:.3f} (edge not settled: {r.get('note', '')})"


def _outside_band(r: dict, study: Study) -> str | None:
    """The sentence of a search whose flame margins allow a window that the Wobbe band excludes."""
    if r.get("flame_lower_edge") is None:
        return None
    band = (f"{band_words(study)} ({100 * r['wobbe_band_from']:.1f}-{100 * r['wobbe_band_to']:.1f} %)"
            if r.get("wobbe_band_from") is not None else band_words(study))
    blend = study.blend_with or "blend gas"
    if r["axis"] == "blend_fraction":
        alone = f"{100 * r['flame_lower_edge']:.1f}-{100 * r['flame_upper_edge']:.1f} %"
        head = f"no {blend} fraction inside {band} keeps every margin"
    else:
        lean = " or leaner" if r.get("flame_lower_kind") == SWEPT_END else ""
        rich = " or richer" if r.get("flame_upper_kind") == SWEPT_END else ""
        alone = f"phi {r['flame_lower_edge']:.3f}{lean} to {r['flame_upper_edge']:.3f}{rich}"
        head = (f"this blend ({100 * (r['blend_fraction'] or 0):.1f} % {blend}) lies outside {band}"
                if study.blend_with else f"this fuel lies outside {band}")
    note = f"; {r['note']}" if r.get("note") else ""
    return f"not admissible: {head}; the flame margins alone would allow {alone}{note}"


def _none(r: dict, study: Study, what: str) -> str:
    outside = _outside_band(r, study)
    if outside is not None:
        return outside
    miss = ""
    if r.get("closest_miss_at") is not None:
        at = r["closest_miss_at"]
        where = f"{100 * at:.1f} %" if r["axis"] == "blend_fraction" else f"phi {at:.3f}"
        miss = f"; at best {where}, where the margins are {r.get('closest_miss_margins') or '-'}"
        b, lim = burner_and_limits(study)
        need = sorted({getattr(b, CRITERIA[c][1]) for c in lim.criteria if c in CRITERIA})
        miss += f" (minimum {', '.join(f'{n:g}' for n in need)})"
        if r.get("closest_miss_binding") == "core_flashback" and r.get("core_flashback_basis"):
            miss += f", core_flashback on {r['core_flashback_basis']}"
    fails = f"; fails by {r['swept_failures']}" if r.get("swept_failures") else ""
    note = f"; {r['note']}" if r.get("note") else ""
    return f"not admissible: no {what} keeps every margin{fails}{miss}{note}"


def limit_sentence(r: dict, study: Study) -> str:
    """The answer of one limits.csv row in one sentence.

    >>> from types import SimpleNamespace as NS
    >>> st = NS(burner=NS(name="rig", min_flashback_margin=1.5), blend_with="hydrogen",
    ...         limits=NS(criteria=("flashback",)), gas_quality=NS(tolerance_percent=None, band_MJ_m3=None))
    >>> r = dict(axis="blend_fraction", window=1, fuel="town gas", oxidizer="air", blend_with="hydrogen",
    ...          blend_fraction=None, equivalence_ratio=1.1, pressure_bar=1.0, unburned_temperature_K=300.0,
    ...          outcome="window", lower_edge=0.0, lower_kind="range end", upper_edge=0.2345, upper_kind="found",
    ...          upper_binding="flashback", upper_margin=1.503, note="")
    >>> limit_sentence(r, st)
    'town gas at phi 1.1, 1 bar, 300 K: rig takes up to 23.4 % hydrogen (flashback binds: margin 1.50 there, minimum 1.5)'

    A window that holds thermodiffusively unstable flames says so (limits.csv's note has why):

    >>> r["note"] = ("1 swept flame inside this window (0.1) is thermodiffusively unstable (cellular): admissible "
    ...              "on the thermal flashback criterion alone, which understates their risk")
    >>> limit_sentence(r, st).endswith("minimum 1.5); 1 swept flame inside this window (0.1) is thermodiffusively "
    ...                                "unstable (cellular): admissible on the thermal flashback criterion alone, "
    ...                                "which understates their risk")
    True
    """
    b, blend = burner_and_limits(study)[0], study.blend_with or "blend gas"
    nth = f" (window {r['window']})" if (r.get("window") or 0) > 1 else ""
    gaps = [f"{c} at {n}" for c, n in unassessed(r)]
    gap = f"; not assessed: {', '.join(gaps)} (why: limits.csv, criteria_not_assessed)" if gaps else ""
    text = _sentence(r, study, b, blend, nth)
    if gaps:  # what the window rests on comes before its numbers
        text = text.replace(" keeps every margin from ", " keeps every assessed margin from ", 1).replace(
            " takes up to ", " takes, on the assessed criteria, up to ", 1).replace(
            ": admissible from ", ": admissible on the assessed criteria from ", 1)
    # a window holding cellular flames is admissible on the thermal criterion alone (driver._cellular_words)
    gap += "".join(f"; {part}" for part in (r.get("note") or "").split("; ") if "thermodiffusively unstable" in part)
    if getattr(study, "premixer", None) is not None:  # a premixer's answer never reads as flashback-proof
        gap += ("; boundary-layer flashback is not among these criteria (the report's premixer section says "
                "where it is assessed)")
    return text + gap


def unassessed(r: dict) -> list[tuple[str, str]]:
    """(criterion, 'N of M swept flames') of a limits.csv row's ``criteria_not_assessed``
    (driver.unassessed_words writes it), without the reasons.

    >>> unassessed({"criteria_not_assessed": "blowoff at 4 of 4 swept flames (at 0 %: rich (phi 1.2 > 1))"})
    [('blowoff', '4 of 4 swept flames')]
    """
    parts = (r.get("criteria_not_assessed") or "").split("; ")
    return [tuple(p.split(" (at ")[0].split(" at ", 1)) for p in parts if p]


def band_alone(r: dict, study: Study) -> str:
    """What the Wobbe band says where no flame criterion of a search is assessed: the blend
    fractions it allows (blend search) or whether the blend lies inside it (phi search); ''
    without a band."""
    lo, hi = r.get("wobbe_band_from"), r.get("wobbe_band_to")
    if lo is None:
        return ""
    assert hi is not None  # written with wobbe_band_from
    span = f"{100 * lo:.1f}-{100 * hi:.1f} % {study.blend_with or 'blend gas'}"
    if r["axis"] == "blend_fraction":
        return f"{band_words(study)} alone allows {span}"
    x = r.get("blend_fraction") or 0.0
    return f"the blend lies {'inside' if lo - 1e-9 <= x <= hi + 1e-9 else 'outside'} {band_words(study)} ({span})"


def _sentence(r: dict, study: Study, b: Burner, blend: str, nth: str) -> str:
    if r["outcome"] == NOT_ASSESSED:
        where = (f"{r['fuel']} at phi {r['equivalence_ratio']:g}" if r["axis"] == "blend_fraction"
                 else gas_label(r))
        band = band_alone(r, study)
        return (f"{where}, {_where(r)}: {b.name}: no limit, no criterion of the search is assessed at these flames"
                + (f"; {band}" if band else ""))
    if r["axis"] == "blend_fraction":
        head = f"{r['fuel']} at phi {r['equivalence_ratio']:g}, {_where(r)}: {b.name}"
        if r["outcome"] == "none admissible":
            return f"{head} {_none(r, study, blend + ' fraction from 0 to 100 %')}"
        if r["outcome"] != "window":
            return f"{head}: search stopped ({r.get('note', '')})"
        upper = _blend_edge(r, "upper", study, blend)
        if r["lower_kind"] == RANGE_END:
            return f"{head} takes up to {upper.replace(' %', f' % {blend}', 1)}{nth}"
        return (f"{head} keeps every margin from {_blend_edge(r, 'lower', study, blend)} to "
                f"{upper.replace(' %', f' % {blend}', 1)}{nth}")
    head = f"{gas_label(r)}, {_where(r)}: {b.name}"
    if r["outcome"] == "none admissible":
        return f"{head} {_none(r, study, 'swept phi')}"
    if r["outcome"] != "window":
        return f"{head}: search stopped ({r.get('note', '')})"
    if r["lower_kind"] == r["upper_kind"] == SWEPT_END and r["lower_edge"] == r["upper_edge"]:
        return (f"{head}: admissible at the only swept phi {r['lower_edge']:g} (sweep more equivalence ratios to "
                "find the window's edges)")
    return f"{head}: admissible from {_phi_edge(r, 'lower', study)} to {_phi_edge(r, 'upper', study)}{nth}"


def search_flames(limits: Sequence[dict]) -> int:
    """Flames the searches asked for beyond the sweep (each search counted once, not per window)."""
    return sum(r["flames_evaluated"] or 0 for r in limits if (r.get("window") or 0) <= 1)
