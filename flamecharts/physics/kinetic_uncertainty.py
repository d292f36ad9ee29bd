"""First-order kinetic uncertainty of the laminar flame speed from rate-constant uncertainty factors.

reaction_key        an equation reduced to the reaction it describes (collision partners,
                    (+M), coefficients and direction do not matter), for matching tables
grouped             sensitivities summed per reaction_key (duplicates and the third-body
                    variants of a reaction share one rate constant: fully correlated)
flame_speed_band    sigma of ln S_L = sqrt(sum_i (s_i ln f_i / k)^2)

The band is the first-order (linear) propagation of independent log-normal rate-constant
uncertainties through the normalized sensitivities s_i = d ln S_L / d ln k_i (Turanyi,
J. Math. Chem. 5 (1990) 203; Sheen & Wang, Combust. Flame 158 (2011) 2358). It leaves
out transport and thermochemistry, correlations between rate constants, and second-order
terms, so it is a lower estimate of the whole model's uncertainty.
"""
from __future__ import annotations

import math
import re
from collections import Counter
from collections.abc import Iterable

_ARROW = re.compile(r"\s*(<=>|=>|=)\s*")
_FALLOFF = re.compile(r"\(\s*\+\s*[A-Za-z0-9()]+\s*\)")
_TERM = re.compile(r"^(\d+(?:\.\d+)?)\s*(\S+)$")


def _side(text: str) -> Counter:
    c: Counter = Counter()
    for term in text.split(" + "):
        term = term.strip()
        if not term:
            continue
        m = _TERM.match(term)
        n, name = (int(float(m.group(1))), m.group(2)) if m else (1, term)
        if name != "M":
            c[name] += n
    return c


def reaction_key(equation: str) -> str:
    """The reaction an equation describes, written one way: falloff '(+M)' and third bodies
    'M' dropped, collision partners that appear on both sides cancelled, species sorted,
    the two sides in sorted order, '<=>' between them.

    Parameters
    ----------
    equation : Cantera reaction equation

    Returns
    -------
    canonical text; two equations of the same elementary reaction give the same text

    Examples
    --------
    >>> reaction_key("H + 2 O2 <=> HO2 + O2") == reaction_key("HO2 (+M) <=> H + O2 (+M)")
    True
    >>> reaction_key("H + O2 + N2 <=> HO2 + N2")
    'H + O2 <=> HO2'
    """
    parts = _ARROW.split(_FALLOFF.sub("", equation))
    if len(parts) != 3:
        raise ValueError(f"not a reaction equation: {equation!r}")
    left, right = _side(parts[0]), _side(parts[2])
    common = left & right
    left, right = left - common, right - common
    sides = sorted(" + ".join(sorted(name for name, n in side.items() for _ in range(n))) for side in (left, right))
    return f"{sides[0]} <=> {sides[1]}"


def grouped(equations: Iterable[str], sensitivities: Iterable[float]) -> dict[str, float]:
    """Sensitivities summed per :func:`reaction_key`, largest magnitude first.

    Duplicate expressions of one reaction, and the variants of a third-body reaction with
    named collision partners, describe one rate constant; their uncertainties are taken as
    fully correlated, so their sensitivities add before they are weighted.

    >>> grouped(["H + O2 <=> O + OH", "H + O2 + M <=> HO2 + M", "H + O2 + N2 <=> HO2 + N2"], [0.2, -0.05, -0.1])
    {'H + O2 <=> O + OH': 0.2, 'H + O2 <=> HO2': -0.15000000000000002}
    """
    out: dict[str, float] = {}
    for eq, s in zip(equations, sensitivities):
        k = reaction_key(eq)
        out[k] = out.get(k, 0.0) + float(s)
    return dict(sorted(out.items(), key=lambda kv: -abs(kv[1])))


def flame_speed_band(sensitivities: Iterable[float], factors: Iterable[float], sigmas_per_factor: float) -> float:
    """Standard deviation of ln S_L from independent rate-constant uncertainties, first order.

    sigma_ln_S = sqrt(sum_i (s_i ln f_i / k)^2), where f_i is reaction i's uncertainty factor
    (k_i lies within [k_i / f_i, k_i f_i] at the confidence the source states) and k the
    number of standard deviations that bound stands for (Turanyi 1990; Sheen & Wang 2011).

    Parameters
    ----------
    sensitivities : s_i = d ln S_L / d ln k_i [-]
    factors : f_i [-], >= 1, same length
    sigmas_per_factor : k, standard deviations of ln k_i that ln f_i stands for [-]

    Returns
    -------
    sigma of ln S_L [-] (about the relative 1-sigma uncertainty of S_L)

    Examples
    --------
    One reaction with s = 0.5 and f = 2 read as a 2-sigma bound: 0.5 ln 2 / 2 = 0.173.

    >>> round(flame_speed_band([0.5], [2.0], 2.0), 3)
    0.173
    """
    return math.sqrt(sum((s * math.log(f) / sigmas_per_factor) ** 2 for s, f in zip(sensitivities, factors)))
