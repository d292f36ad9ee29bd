"""How far a flame's answer is from the grid-converged one: a three-grid error estimate.

A converged flame is solved again on every second and on every fourth point of its own
final grid (chemistry.flame.grid_error). Dropping every other point of an adaptive grid
doubles the local spacing everywhere, so the three solutions are a systematic refinement
with ratio r = 2, which is what Richardson extrapolation and Roache's grid convergence
index need (Roache, Verification and Validation in Computational Science and Engineering,
Hermosa, 1998, ch. 5; Celik et al., J. Fluids Eng. 130 (2008) 078001). Honesty on
grid-converged flames is measured in tests/benchmarks/grid_convergence.py
(docs/benchmarks.md).
"""
from __future__ import annotations

import math

#: Refinement ratio of the three grids (every point, every second, every fourth).
GRID_RATIO = 2.0
#: Bounds on the observed order: Cantera's convection is first-order upwind and its
#: diffusion second-order central, so an observed order outside [0.5, 2] means the three
#: grids are not in the asymptotic range and the order is not trusted beyond these bounds
#: (Roache 1998, ch. 5, bounded order; common practice).
ORDER_BOUNDS = (0.5, 2.0)
#: Roache's factors of safety: 1.25 when three grids confirm the order, 3 otherwise.
SAFETY_THREE_GRIDS = 1.25
SAFETY_UNCONFIRMED = 3.0
#: Smallest band claimed [-]: below 0.1 % the three solves differ by less than two valid
#: grids of the same criteria do (grid-history spread up to 0.3 % measured, docs/benchmarks.md),
#: so a smaller index would claim more than the grid can tell (common practice, no source).
MIN_INDEX = 1e-3


def grid_convergence_index(fine: float, medium: float, coarse: float | None,
                           ratio: float = GRID_RATIO) -> dict:
    """Grid convergence index of a quantity from its values on three systematically
    refined grids (Roache 1998, ch. 5; procedure of Celik et al. 2008).

    With monotone convergence the observed order p = ln((coarse - medium) / (medium - fine)) / ln r
    is bounded to :data:`ORDER_BOUNDS`, the fine-grid error is estimated by Richardson's
    (medium - fine) / (r^p - 1) and the index is that error times the factor of safety 1.25.
    Oscillating values, or a missing coarse value, are not in the asymptotic range: the
    index is then 3 times the largest change over r - 1 (first order), with no extrapolation.
    The index is never below :data:`MIN_INDEX`.

    Parameters
    ----------
    fine, medium, coarse : the quantity on grids of spacing h, 2h, 4h (any unit, same for all;
        coarse None when that solve failed)
    ratio : refinement ratio r [-]

    Returns
    -------
    dict: ``index`` the error band relative to ``fine`` [-] (a fraction, at least :data:`MIN_INDEX`); ``extrapolated``
    Richardson's grid-converged value (None when not in the asymptotic range); ``order`` the
    observed order (None likewise); ``convergence`` 'monotone', 'oscillating' or 'two grids'.

    Examples
    --------
    First-order convergence, error 0.5 % on the fine grid:

    >>> g = grid_convergence_index(100.5, 101.0, 102.0)
    >>> round(g["order"], 3), round(g["extrapolated"], 3), round(100 * g["index"], 3), g["convergence"]
    (1.0, 100.0, 0.622, 'monotone')
    """
    scale = abs(fine)
    d_fm = medium - fine
    if coarse is None:
        return {"index": max(MIN_INDEX, SAFETY_UNCONFIRMED * abs(d_fm) / (ratio - 1.0) / scale), "extrapolated": None,
                "order": None, "convergence": "two grids"}
    d_mc = coarse - medium
    if d_fm * d_mc > 0.0:
        lo, hi = ORDER_BOUNDS
        order = min(hi, max(lo, math.log(d_mc / d_fm) / math.log(ratio)))
        error = d_fm / (ratio ** order - 1.0)
        return {"index": max(MIN_INDEX, SAFETY_THREE_GRIDS * abs(error) / scale), "extrapolated": fine - error,
                "order": order,
                "convergence": "monotone"}
    return {"index": max(MIN_INDEX, SAFETY_UNCONFIRMED * max(abs(d_fm), abs(d_mc)) / (ratio - 1.0) / scale),
            "extrapolated": None,
            "order": None, "convergence": "oscillating"}
