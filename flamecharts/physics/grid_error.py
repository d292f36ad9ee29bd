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
#: Bounds on the observed order. Cantera's convection is first-order upwind (its diffusion
#: second-order central), so the scheme's formal order is 1: an observed order above it is
#: not credited (Roache, J. Fluids Eng. 133 (2011) 115501: where the observed order is not
#: reasonable "revert to using p_th"), and one below 0.5 is not trusted either (Roache 1998,
#: ch. 5). Checked on flames the estimator was not tuned on: an order of up to 2 gave bands
#: too narrow in 4 of 22 warm-started flames (docs/benchmarks.md, issue 27).
ORDER_BOUNDS = (0.5, 1.0)
#: Roache's factors of safety: 1.25 when three grids converge monotonically, 3 otherwise.
SAFETY_THREE_GRIDS = 1.25
SAFETY_UNCONFIRMED = 3.0
#: Smallest band claimed on any grid [-].
MIN_INDEX = 1e-3
#: What the three solves on one grid cannot see: two valid grids of the same refinement
#: criteria differ by up to a factor 2 in local spacing, and their flame speeds by up to
#: 0.3 % at the standard setting (measured on the sweep benchmark, docs/benchmarks.md),
#: whose grids have a median of 942 points (the tuning half of
#: tests/benchmarks/error_bar_validation.py). The band is never below that spread, scaled
#: to the flame's own grid as a first-order error is (1/N).
PLACEMENT_SPREAD = 3e-3
PLACEMENT_POINTS = 942


def placement_floor(n_points: int) -> float:
    """Smallest band [-] a flame solved on ``n_points`` grid points is given:
    PLACEMENT_SPREAD x PLACEMENT_POINTS / n_points, and never below :data:`MIN_INDEX`.

    >>> round(100 * placement_floor(942), 3), round(100 * placement_floor(1884), 3), round(100 * placement_floor(10**5), 3)
    (0.3, 0.15, 0.1)
    """
    return max(MIN_INDEX, PLACEMENT_SPREAD * PLACEMENT_POINTS / max(int(n_points), 1))


def grid_convergence_index(fine: float, medium: float, coarse: float | None, ratio: float = GRID_RATIO, *,
                           order_bounds: tuple[float, float] = ORDER_BOUNDS, safety: float = SAFETY_THREE_GRIDS,
                           floor: float = MIN_INDEX) -> dict:
    """Grid convergence index of a quantity from its values on three systematically
    refined grids (Roache 1998, ch. 5; procedure of Celik et al. 2008).

    With monotone convergence the observed order p = ln((coarse - medium) / (medium - fine)) / ln r
    is bounded to :data:`ORDER_BOUNDS`, the fine-grid error is estimated by Richardson's
    (medium - fine) / (r^p - 1) and the index is that error times the factor of safety 1.25.
    Oscillating values, or a missing coarse value, are not in the asymptotic range: the
    index is then 3 times the largest change over r - 1 (first order), with no extrapolation.
    The index is never below ``floor`` (:data:`MIN_INDEX` unless given; a flame's own estimate
    passes :func:`placement_floor` of its grid).

    Parameters
    ----------
    fine, medium, coarse : the quantity on grids of spacing h, 2h, 4h (any unit, same for all;
        coarse None when that solve failed)
    ratio : refinement ratio r [-]
    order_bounds, safety, floor : the estimator's settings (defaults :data:`ORDER_BOUNDS`,
        :data:`SAFETY_THREE_GRIDS`, :data:`MIN_INDEX`); tests/benchmarks/error_bar_validation.py
        evaluates others with them

    Returns
    -------
    dict: ``index`` the error band relative to ``fine`` [-] (a fraction, at least ``floor``); ``extrapolated``
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
        return {"index": max(floor, SAFETY_UNCONFIRMED * abs(d_fm) / (ratio - 1.0) / scale), "extrapolated": None,
                "order": None, "convergence": "two grids"}
    d_mc = coarse - medium
    if d_fm * d_mc > 0.0:
        lo, hi = order_bounds
        order = min(hi, max(lo, math.log(d_mc / d_fm) / math.log(ratio)))
        error = d_fm / (ratio ** order - 1.0)
        return {"index": max(floor, safety * abs(error) / scale), "extrapolated": fine - error,
                "order": order,
                "convergence": "monotone"}
    return {"index": max(floor, SAFETY_UNCONFIRMED * max(abs(d_fm), abs(d_mc)) / (ratio - 1.0) / scale),
            "extrapolated": None,
            "order": None, "convergence": "oscillating"}
