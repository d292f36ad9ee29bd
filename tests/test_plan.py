"""The warm-start plan: every point starts from its nearest solved or stored neighbour."""
from __future__ import annotations

import math

import pytest

from flamecharts.config import load_study
from flamecharts.sweep import points as plan_points, schedule as plan_schedule, warm_tree as plan_tree

from conftest import write_h2_study


def _points(tmp_path, **kw):
    return plan_points.points(load_study(write_h2_study(tmp_path, **kw)))


def _check_tree(tree, pts):
    """Every point is a root or has a parent of the same family; parents come first."""
    by = {p.index: p for p in pts}
    assert set(tree.parent) == set(by)
    for i, par in tree.parent.items():
        if par is None:
            assert i in tree.roots or i in tree.stored
        else:
            assert by[par].family == by[i].family
            assert tree.height[par] > tree.height[i]
    # following parents never loops
    for i in by:
        seen = set()
        while tree.parent[i] is not None:
            assert i not in seen
            seen.add(i)
            i = tree.parent[i]


def test_one_root_for_a_connected_sweep_started_near_phi_1_05(tmp_path):
    pts = _points(tmp_path, fractions="[0.0, 0.1, 0.2]", phis="{ from = 0.6, to = 1.4, step = 0.1 }",
                  pressures="[1.0, 1.5]")
    tree = plan_tree.warm_tree(pts)
    _check_tree(tree, pts)
    assert len(tree.roots) == 1
    root = next(p for p in pts if p.index == tree.roots[0])
    assert root.phi == pytest.approx(1.0) and root.pressure_bar == 1.0 and root.blend_fraction == 0.0
    # every warm start spans at most one step of one axis (the nearest neighbour)
    assert max(d for d in tree.distance.values() if math.isfinite(d)) <= 1.0 + 1e-9


def test_far_points_are_solved_from_scratch(tmp_path):
    # 1 and 5 bar lie log(5)/log(1.6) = 3.4 distance units apart: beyond MAX_WARM_DISTANCE
    pts = _points(tmp_path, fractions="[0.0]", phis="[0.9, 1.0, 1.1]", pressures="[1.0, 5.0]")
    tree = plan_tree.warm_tree(pts)
    _check_tree(tree, pts)
    assert sorted((next(p for p in pts if p.index == r).pressure_bar) for r in tree.roots) == [1.0, 5.0]


def test_the_plan_does_not_depend_on_the_order_of_the_points(tmp_path):
    pts = _points(tmp_path, fractions="[0.0, 0.5]", phis="[0.7, 0.8, 1.0, 1.3]", pressures="[1.0, 2.0]")
    a = plan_tree.warm_tree(pts)
    b = plan_tree.warm_tree(list(reversed(pts)))
    assert a.parent == b.parent and sorted(a.roots) == sorted(b.roots)


def test_stored_flames_seed_the_plan_so_nothing_is_solved_from_scratch(tmp_path):
    first = _points(tmp_path, fractions="[0.0]", phis="[0.8, 1.0]", pressures="[1.0]")
    stored = [plan_tree.StoredFlame(key=p.key, family=p.family, phi=p.phi, pressure_bar=p.pressure_bar,
                               T_u=p.T_u, X_flame=p.X_flame) for p in first]
    # a new pressure level of the same study: every new point starts from a stored flame
    # or from a new point that did
    new = _points(tmp_path, fractions="[0.0]", phis="[0.8, 1.0]", pressures="[2.0]")
    tree = plan_tree.warm_tree(new, stored)
    _check_tree(tree, new)
    assert tree.roots == []
    assert set(tree.stored.values()) <= {s.key for s in stored}
    assert tree.stored  # at least one starts from the store


def test_points_of_another_family_are_never_sources(tmp_path):
    pts = _points(tmp_path, fractions="[0.0]", phis="[0.9, 1.0]", pressures="[1.0]")
    other = [plan_tree.StoredFlame(key="x" * 32, family="another", phi=p.phi, pressure_bar=p.pressure_bar,
                              T_u=p.T_u, X_flame=p.X_flame) for p in pts]
    tree = plan_tree.warm_tree(pts, other)
    assert not tree.stored and len(tree.roots) == 1


def test_estimate_grows_with_points_and_shrinks_with_workers(tmp_path):
    pts = _points(tmp_path, fractions="[0.0, 0.1]", phis="{ from = 0.6, to = 1.4, step = 0.1 }")
    tree = plan_tree.warm_tree(pts)
    one = plan_schedule.estimate_run_seconds(tree, 1, 20.0, 4.0)
    two = plan_schedule.estimate_run_seconds(tree, 2, 20.0, 4.0)
    # one worker: everything in a row
    assert one == pytest.approx(plan_schedule.START_UP_SECONDS + 20.0 + 17 * 4.0)
    assert two < one
    # two workers cannot beat the longest warm-start path
    assert two >= plan_schedule.START_UP_SECONDS + 20.0 + (tree.depth - 1) * 4.0


def test_point_keys_are_the_hash_of_their_inputs(tmp_path):
    # points() writes the key text once per fuel stream and fills in phi, p and T_u
    pts = _points(tmp_path, fractions="[0.0, 0.5]", phis="[0.7, 1.0]", pressures="[1.0, 2.0]")
    for p in pts:
        inputs = plan_points.point_inputs(plan_points.settings_of(load_study(tmp_path / "h2rig.toml")), p.X_flame,
                                          p.X_oxidizer, p.phi, p.pressure_bar, p.T_u)
        assert p.inputs == inputs
        assert p.key == plan_points._hash(inputs)
        assert p.family == plan_points._hash({k: v for k, v in inputs.items()
                                              if k not in ("phi", "pressure_bar", "T_u", "fuel")})
    assert len({p.key for p in pts}) == len(pts)
