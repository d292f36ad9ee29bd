"""Grid settings of a flame solve (coarse, standard, fine) and of the strained-flame ladder:
plain data, no Cantera.

They decide every flame's answer and are named in every output (results.csv's resolution,
the report's numerics), so the read side needs them without the chemistry layer; the solver
(chemistry.flame) uses them.
"""
from __future__ import annotations

from dataclasses import asdict, dataclass


@dataclass(frozen=True)
class Numerics:
    """Grid settings of one flame solve.

    stages : successive (ratio, slope, curve) refinement criteria of Cantera's
        ``set_refine_criteria``; the last one is the final grid.
    prune : Cantera's prune criterion [-]
    width_m : initial domain width at 1 bar [m]; scaled as 1/sqrt(p) and widened by
        Cantera's automatic solve when the flame needs it
    max_grid_points : ceiling on grid points
    tail_share : a settled grid (of any stage after the first: Cantera's refiner run to
        its end on the converged solution, chemistry.flame._settle) that would add no more than
        this share of the grid's points (at least TAIL_MIN_POINTS) is not taken; the
        flame converged on the grid before it is kept (see chemistry.flame._refine_loop)
    warm_share : the same for the first settled grid after the full-grid solve of a
        warm start, whose grid was already refined at the final criteria on a converged
        profile of the new flame (see chemistry.flame._solve_warm; its effect on S_L is in
        docs/benchmarks.md)
    warm_stride : a warm start first solves on every warm_stride-th point of the
        neighbour's grid (fewer for small neighbours, chemistry.flame.warm_stride; see
        chemistry.flame._solve_warm)
    """

    label: str
    stages: tuple[tuple[float, float, float], ...]
    prune: float = 0.0
    width_m: float = 0.03
    max_grid_points: int = 5000
    tail_share: float = 0.01
    warm_share: float = 0.08
    warm_stride: int = 4

    def as_dict(self) -> dict:
        d = asdict(self)
        d["stages"] = [list(s) for s in self.stages]
        return d


NUMERICS = {
    "coarse": Numerics("coarse", ((3.0, 0.1, 0.2), (2.0, 0.3, 0.04))),
    "standard": Numerics("standard", ((3.0, 0.1, 0.2), (2.0, 0.2, 0.01))),
    "fine": Numerics("fine", ((3.0, 0.1, 0.2), (2.0, 0.2, 0.01), (2.0, 0.1, 0.004))),
}


# Settings of the strained-flame ladder (chemistry.strained; part of a ladder's store key, analyses.strain_ladders.solve).

#: Half the nozzle separation (nozzle to symmetry plane) in flame thicknesses alpha_u / S_L:
#: the same geometry in flame units for every mixture (methane-air at phi 1: about 24 mm;
#: hydrogen-air: about 8 mm), within HALF_SEPARATION_BOUNDS_M.
HALF_SEPARATION_THICKNESSES = 400.0
HALF_SEPARATION_BOUNDS_M = (0.002, 0.03)
#: First nozzle velocity as a multiple of S_L: the flame off the nozzle, weakly strained
#: (Karlovitz number about 2 x 2 / 400 = 0.01).
FIRST_VELOCITY_FACTOR = 2.0
#: Factor of the nozzle velocity between ladder steps while the flame burns.
LADDER_FACTOR = 1.6
#: When the first nozzle velocity gives no burning flame, the ladder starts again from a nozzle
#: velocity this many times higher, at most FIRST_STRAIN_RETRIES times. Lean hydrogen-air at
#: 10 bar (h2o2.yaml, phi 0.5) fails from Cantera's initial guess at Karlovitz 0.01-0.04, is not
#: done within 60-90 s of CPU at 0.16-0.3, and converges in 26 s near 0.6 (docs/benchmarks.md).
FIRST_STRAIN_RETRY_FACTOR = LADDER_FACTOR ** 3
FIRST_STRAIN_RETRIES = 4
#: Time steps a first-rung solve may take before it counts as finding no burning flame: a count,
#: not a clock, so the answer does not depend on the machine (hydrogen-air at 1 bar takes 550).
FIRST_SOLVE_MAX_TIME_STEPS = 2500
#: The continuation stops refining the extinction bracket when the velocity step is below this
#: ratio (the extinction strain rate is then known to about 2 %).
EXTINCTION_RESOLUTION = 1.02
#: A flame counts as burning while its peak temperature rises above T_u by at least this share
#: of T_ad - T_u.
BURNING_SHARE = 0.5
#: Grid refinement of the strained flames (Cantera's ratio, slope, curve, prune).
REFINE = dict(ratio=3.0, slope=0.1, curve=0.2, prune=0.03)
#: Most solves one ladder may make (burning steps and refinement of the extinction bracket).
MAX_SOLVES = 40
