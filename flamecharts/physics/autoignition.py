"""When a mixture's own ignition matters: the rules, without the reactor (chemistry.ignition).

not_a_flame_reason  '' or why a solved flame is autoignition, from the stored ignition delay
premixer_horizon    how long a premixer's ignition delay is integrated
delay_at_horizon    a stored delay read at another horizon (or None: it must be integrated again)
injection_end       the note on a most reactive injection mixture at an end of INJECTION_PHIS

A freely propagating flame assumes the unburned gas stays chemically frozen while it crosses
the flame, i.e. an ignition delay much longer than the flame transit time delta_T/S_L
(common practice); when it is not, the computed "flame speed" measures autoignition in the
domain, not a deflagration. Times in s, temperatures in K.
"""
from __future__ import annotations

import math

#: Not a flame when the ignition delay is shorter than this many flame transit times
#: (common practice: "much longer" taken as two orders of magnitude).
AUTOIGNITION_FACTOR = 100.0
#: The ignition delay is integrated for at most this long [s]; longer delays never warn.
AUTOIGNITION_MAX_TIME_S = 1.0
#: Below this preheat the ignition check is skipped: it lies below the autoignition
#: temperature of common fuel gases (hydrogen about 800 K, methane about 810 K in air;
#: the lowest common liquid fuel vapours, e.g. n-heptane, about 490 K; from memory).
AUTOIGNITION_MIN_T_K = 450.0

#: A premixer's ignition delay is integrated for at least this long [s], and at least
#: this many times the residence time the margin requires: a mixture that has not ignited
#: by then is reported as not igniting (delay inf).
PREMIXER_HORIZON_S = 1.0
PREMIXER_HORIZON_FACTOR = 100.0

#: Equivalence ratios scanned for the most reactive mixture near the fuel injection, where the
#: fuel meets the oxidizer before it is mixed to the premixed phi (common practice without
#: source: a geometric spread around stoichiometric).
INJECTION_PHIS = (0.25, 0.5, 1.0, 2.0, 4.0)


def not_a_flame_reason(delay_s: float | None, S_L_m_s: float | None, thickness_mm: float | None,
                       unburned_temperature_K: float) -> str:
    """'' or why a solved flame is not a deflagration: its unburned mixture ignites (delay
    ``delay_s``, chemistry.ignition.autoignition_screen) within AUTOIGNITION_FACTOR flame transit
    times thickness / S_L (and within AUTOIGNITION_MAX_TIME_S).

    >>> not_a_flame_reason(1e-4, 1.0, 0.5, 1000.0)[:40]
    'autoignition: ignites in 0.1 ms at 1000 '
    >>> not_a_flame_reason(1.0, 1.0, 0.5, 1000.0), not_a_flame_reason(None, 1.0, 0.5, 1000.0)
    ('', '')
    """
    if delay_s is None or not S_L_m_s or not thickness_mm:
        return ""
    transit = thickness_mm * 1e-3 / S_L_m_s
    if delay_s < min(AUTOIGNITION_FACTOR * transit, AUTOIGNITION_MAX_TIME_S):
        return (f"autoignition: ignites in {delay_s * 1e3:.2g} ms at {unburned_temperature_K:g} K, within "
                f"{delay_s / transit:.0f} flame transit times (limit {AUTOIGNITION_FACTOR:g}): the mixture ignites "
                "before a flame can cross it, so it has no flame speed or thickness")
    return ""


def premixer_horizon(residence_time_s: float, min_margin: float) -> float:
    """How long a premixer's ignition delay is integrated [s]: max(PREMIXER_HORIZON_S,
    PREMIXER_HORIZON_FACTOR x required margin x residence time).

    >>> premixer_horizon(0.002, 3.0), premixer_horizon(0.01, 3.0)
    (1.0, 3.0)
    """
    return max(PREMIXER_HORIZON_S, PREMIXER_HORIZON_FACTOR * min_margin * residence_time_s)


def delay_at_horizon(delay_s: float, integrated_s: float, horizon_s: float) -> float | None:
    """A delay integrated over ``integrated_s`` (inf: no ignition by then) read over another
    ``horizon_s``: the delay itself when it ignited within both, inf when it ignited after the
    new horizon or did not ignite over a horizon at least as long; None when it did not ignite
    over a shorter horizon (it must be integrated again).

    >>> delay_at_horizon(0.5, 1.0, 3.0), delay_at_horizon(2.0, 3.0, 1.0), delay_at_horizon(math.inf, 3.0, 1.0)
    (0.5, inf, inf)
    >>> delay_at_horizon(math.inf, 1.0, 3.0) is None
    True
    """
    if math.isfinite(delay_s):
        return delay_s if delay_s <= horizon_s else math.inf
    return math.inf if integrated_s >= horizon_s else None


def injection_end(phi: float) -> str:
    """', the end of the range scanned' where the most reactive mixture near the injection lies at an
    end of INJECTION_PHIS (mixtures beyond may ignite sooner), else ''.

    >>> injection_end(4.0), injection_end(1.0)
    (', the end of the range scanned', '')
    """
    return ", the end of the range scanned" if phi in (INJECTION_PHIS[0], INJECTION_PHIS[-1]) else ""
