"""The fast warm-start tree (sparse greedy order) gives exactly the plan of its definition
(the greedy step over all pairs, ``_warm_tree_dense``), at any input order."""
from __future__ import annotations

import random

import pytest

from flamecharts.config import study_from_dict
from flamecharts.sweep import points as plan_points, warm_tree as plan_tree


def _study(rng: random.Random, n_phi=10, n_frac=5, n_p=4, n_T=5, regular=False, fuels=("diluted",)):
    """An h2o2 study of two oxidizers (two families) on random (or evenly spaced) axes."""
    def axis(lo, hi, n, nd):
        if regular:
            return [round(lo + (hi - lo) * k / (n - 1), nd) for k in range(n)]
        return sorted({round(rng.uniform(lo, hi), nd) for _ in range(n)})

    data = {
        "title": "random", "mechanism": "h2o2.yaml", "max_points": 10**6,
        "fuels": {"diluted": {"H2": 0.6, "N2": 0.4}, "wet": {"H2": 0.7, "H2O": 0.3},
                  "hydrogen": {"H2": 1.0}},
        "oxidizers": {"air": {"O2": 1.0, "N2": 3.76}, "enriched": {"O2": 1.0, "N2": 2.5}},
        "sweep": {"fuel": list(fuels), "oxidizer": ["air", "enriched"],
                  "blend": {"with": "hydrogen", "fraction": axis(0.0, 1.0, n_frac, 3)},
                  "equivalence_ratio": axis(0.5, 2.0, n_phi, 3), "pressure_bar": axis(0.5, 8.0, n_p, 2),
                  "unburned_temperature_K": axis(280.0, 600.0, n_T, 0)},
    }
    return plan_points.points(study_from_dict(data))


def _stored(rng: random.Random, pts, n: int) -> list:
    """Stored flames near the study's points: copies of some, shifted others, a foreign family."""
    out = []
    for k, p in enumerate(rng.sample(pts, n)):
        shift = 0.0 if k % 3 == 0 else rng.uniform(-0.2, 0.2)
        out.append(plan_tree.StoredFlame(key=f"s{k:04d}", family=p.family if k % 7 else "foreign",
                                         phi=p.phi + shift, pressure_bar=p.pressure_bar * (1 + abs(shift)),
                                         T_u=p.T_u + 100 * shift, X_flame=p.X_flame))
    return out


def _same(a, b):
    assert a.parent == b.parent
    assert a.stored == b.stored
    assert a.roots == b.roots
    assert a.distance == b.distance
    assert a.height == b.height


def test_a_random_2000_point_study_gets_exactly_the_plan_of_the_definition():
    rng = random.Random(7)
    pts = _study(rng)
    assert len(pts) == 2000
    stored = _stored(rng, [p for p in pts if p.oxidizer == "air"], 60)  # the other family has none
    fast = plan_tree.warm_tree(pts, stored)
    _same(fast, plan_tree._warm_tree_dense(pts, stored))
    assert fast.stored and fast.roots  # the test means something: stored sources and roots


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_evenly_spaced_grids_with_many_ties_get_exactly_the_plan_of_the_definition(seed):
    rng = random.Random(seed)
    pts = _study(rng, n_phi=8, n_frac=4, n_p=3, n_T=3, regular=True, fuels=("diluted", "wet"))
    stored = _stored(rng, pts, 20) if seed != 1 else []
    _same(plan_tree.warm_tree(pts, stored), plan_tree._warm_tree_dense(pts, stored))


def test_points_that_are_not_a_full_grid_get_exactly_the_plan_of_the_definition():
    # a subset (some points dropped) and repeated points (two fuels blended to pure hydrogen)
    rng = random.Random(11)
    pts = _study(rng, n_phi=6, n_frac=3, n_p=3, n_T=3, fuels=("diluted", "wet"))
    kept = [p for p in pts if rng.random() > 0.2]
    stored = _stored(rng, pts, 15)
    _same(plan_tree.warm_tree(kept, stored), plan_tree._warm_tree_dense(kept, stored))
    blended = _study(rng, n_phi=5, n_frac=2, n_p=2, n_T=2, regular=True, fuels=("diluted", "wet"))
    assert len({p.key for p in blended}) < len(blended)  # fraction 1.0 of both fuels is the same flame
    _same(plan_tree.warm_tree(blended), plan_tree._warm_tree_dense(blended))


def test_the_plan_does_not_depend_on_the_order_of_the_points():
    rng = random.Random(5)
    pts = _study(rng, n_phi=8, n_frac=4, n_p=3, n_T=4)
    stored = _stored(rng, pts, 40)
    a = plan_tree.warm_tree(pts, stored)
    shuffled = list(pts)
    rng.shuffle(shuffled)
    _same(a, plan_tree.warm_tree(shuffled, stored))
    _same(a, plan_tree.warm_tree(list(reversed(pts)), stored))
