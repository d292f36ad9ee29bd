"""`check`'s run-time estimate (sweep.schedule, admissible.driver.planned_searches, cli.check): its
parts and its lines, without solving a flame."""
from __future__ import annotations

from pathlib import Path

import pytest

from flamecharts import cli
from flamecharts.admissible.driver import SPEED_SIGN, edges_possible, planned_searches
from flamecharts.admissible.search import CRITERIA
from flamecharts.analyses.strain_ladders.solve import ladder_seconds, ladder_time_limit, ladders_estimate
from flamecharts.cli import check
from flamecharts.cli.progress import duration
from flamecharts.config import load_study
from flamecharts.sweep.analyses import Budget
from flamecharts.sweep.points import points
from flamecharts.sweep.schedule import (
    CLUSTER_ADVICE_S,
    RESOLUTION_COST,
    default_flame_seconds,
    estimate_run_seconds,
    parallel_seconds,
    pressure_cost,
)
from flamecharts.sweep.warm_tree import WarmPlan
from flamecharts.sweep.worker import fresh_mixture

from conftest import write_h2_study

CONFIGS = Path(__file__).resolve().parents[1] / "configs"

#: A burner and limits for the small hydrogen rig of conftest: laminar round ports at 1 bar.
LAMINAR = """
[burner]
name = "test port"
port = "round"
port_diameter_mm = 3.0
port_velocity_m_s = 2.0

[limits]
find = ["equivalence_ratio"]
criteria = ["flashback", "blowoff"]
"""


def _check(capsys, *argv) -> list[str]:
    assert cli.main([str(a) for a in argv]) == 0
    return capsys.readouterr().out.splitlines()


def test_a_flame_costs_more_with_resolution_and_pressure():
    """The issue's newcomer saw the same 74 s for a coarse 15-20 bar study and a standard 1 bar one."""
    coarse, standard, fine = (default_flame_seconds(53, r) for r in ("coarse", "standard", "fine"))
    for start in ("fresh", "warm"):
        assert coarse[start] < standard[start] < fine[start]
        assert standard[start] / coarse[start] == pytest.approx(1.0 / RESOLUTION_COST["coarse"][start])
    assert pressure_cost(0.5) == pressure_cost(1.0) == 1.0
    assert 1.0 < pressure_cost(5.0) < pressure_cost(10.0) < pressure_cost(20.0)


def test_the_sweep_simulation_scales_each_point_by_its_own_factor():
    plan = WarmPlan(parent={0: None, 1: 0, 2: 0}, stored={}, roots=[0], height={0: 2, 1: 1, 2: 1}, distance={})
    plain = estimate_run_seconds(plan, 1, 10.0, 2.0)
    assert estimate_run_seconds(plan, 1, 10.0, 2.0, {0: 1.0, 1: 3.0, 2: 1.0}) == pytest.approx(plain + 4.0)
    assert estimate_run_seconds(plan, 1, 10.0, 2.0, {i: 2.0 for i in range(3)}) - 2.0 == pytest.approx(
        2 * (plain - 2.0))


def test_ladders_cost_by_mechanism_and_pressure_spread_over_the_workers_and_stop_at_their_limit():
    assert ladder_seconds(53) > 10 * ladder_seconds(10)
    assert ladder_seconds(10) < ladder_seconds(10, 5.0) < ladder_seconds(10, 10.0)
    assert ladder_seconds(53, 1.0, 100.0) == 100.0
    assert parallel_seconds([3.0, 3.0, 3.0], 2) == 6.0  # three equal ladders on two workers: two rounds
    assert parallel_seconds([5.0, 3.0, 2.0], 2) == 5.0
    assert parallel_seconds([4.0], 8) == 4.0


def _laminar_criteria_demo(folder: Path) -> Path:
    """The gas-turbine demo with the laminar port criteria only (as it was before its limits used the
    premixer's core-flow criterion), written into ``folder``."""
    text = (CONFIGS / "gas_turbine_premixer_demo.toml").read_text()
    old = 'criteria = ["core_flashback", "flashback", "stabilizer", "wobbe"]'
    assert old in text
    path = folder / "turbine_laminar_criteria.toml"
    path.write_text(text.replace(old, 'criteria = ["flashback", "stabilizer", "wobbe"]'))
    return path


def test_limits_need_no_flame_where_no_criterion_is_in_range(tmp_path):
    """The gas-turbine demo's tube on the laminar criteria (issue 33: its limits line counted 84
    flames, none was solved): every flame criterion is out of range, by pressure and preheat alone
    and by the port's Reynolds number, so no search needs a flame; the Wobbe band needs none."""
    study = load_study(_laminar_criteria_demo(tmp_path))
    plan = planned_searches(study)
    assert plan.searches == {"blend_fraction": 6, "equivalence_ratio": 6}
    assert plan.idle == plan.searches and plan.flames == 0
    assert "5 bar outside 0.5-2 bar" in plan.why and "C_BO not calibrated" in plan.why


def test_a_laminar_burner_at_one_bar_needs_limit_flames(tmp_path):
    study = load_study(write_h2_study(tmp_path, extra=LAMINAR))
    plan = planned_searches(study, lambda p: fresh_mixture(study.mechanism_path, study.mechanism_sha256,
                                                          p.X_unburned, p.T_u, p.P))
    assert plan.searches["equivalence_ratio"] == 2 and plan.idle["equivalence_ratio"] == 0
    assert plan.flames == 2 * 2 * 5 and plan.flames_at == {1.0: 20}  # two edges of log2(0.3 / 0.005) - 1 flames each
    assert plan.why == ""


def test_the_turbine_demo_counts_one_edge_a_search_on_its_core_flow_criterion():
    """Issue 33: with the premixer's core-flow flashback criterion `check` counted 84 limit flames (two
    bisected edges a search) where the run solved 15. Its only criterion in range fails where the flame
    is fast, and the flame speed rises along both axes here (hydrogen fraction; phi 0.5-0.7, lean of the
    fastest flame), so each search can find one edge: Brent's steps over a sweep step (blend 0.25 to
    0.01: 4; phi 0.1 to 0.01: 3), a blend search one flame more for the pure hydrogen."""
    study = load_study(CONFIGS / "gas_turbine_premixer_demo.toml")
    plan = planned_searches(study, lambda p: fresh_mixture(study.mechanism_path, study.mechanism_sha256,
                                                          p.X_unburned, p.T_u, p.P))
    assert plan.idle == {"blend_fraction": 0, "equivalence_ratio": 0}
    assert plan.flames_at == {5.0: 3 * (1 + 4) + 3 * 3, 10.0: 3 * (1 + 4) + 3 * 3} and plan.longest == 5


def test_two_edges_where_the_margin_can_turn_or_the_criteria_pull_both_ways():
    core, both = frozenset({"core_flashback"}), frozenset({"flashback", "blowoff"})
    assert edges_possible("equivalence_ratio", [0.6, 0.8, 1.0], [core] * 3) == 1
    assert edges_possible("equivalence_ratio", [0.8, 1.0, 1.2], [core] * 3) == 2  # the fastest flame may lie inside
    assert edges_possible("equivalence_ratio", [0.6, 0.8, 1.0], [both] * 3) == 2  # blowoff lean, flashback rich
    assert edges_possible("blend_fraction", [0.0, 0.5], [both] * 2) == 2
    # a criterion that leaves its range inside the sweep can bind on one side only
    assert edges_possible("blend_fraction", [0.0, 0.5], [core, frozenset()]) == 2
    assert edges_possible("equivalence_ratio", [0.7, 0.8], [core] * 2) == 1  # one interval, one edge
    assert edges_possible("equivalence_ratio", [0.7], [both]) == 0  # one phi: no interval to search
    assert edges_possible("blend_fraction", [0.0, 0.5, 1.0], [core] * 3) == 1


def test_every_limit_criterion_says_which_way_it_fails():
    """A new criterion in search.CRITERIA needs its direction (DEVELOPERS.md, 'A limit criterion')."""
    assert set(SPEED_SIGN) == set(CRITERIA) and set(SPEED_SIGN.values()) == {-1, 1}


def test_a_turbulent_port_flow_is_told_by_the_fresh_mixture_before_any_flame(tmp_path):
    """At 1 bar and 300 K only the port's Reynolds number (its velocity, diameter and the fresh
    mixture's density and viscosity, no flame speed) rules the laminar criteria out. Without the
    mixture the estimate keeps the flames (an overestimate, never a surprise)."""
    fast = LAMINAR.replace("port_diameter_mm = 3.0", "port_diameter_mm = 30.0").replace(
        "port_velocity_m_s = 2.0", "port_velocity_m_s = 40.0")
    study = load_study(write_h2_study(tmp_path, extra=fast))
    assert planned_searches(study).flames > 0
    plan = planned_searches(study, lambda p: fresh_mixture(study.mechanism_path, study.mechanism_sha256,
                                                          p.X_unburned, p.T_u, p.P))
    assert plan.flames == 0 and plan.idle == plan.searches
    assert "turbulent port flow (Re" in plan.why


def test_check_says_why_the_turbine_demo_limits_need_no_flames_and_totals_everything(capsys, tmp_path):
    out = _check(capsys, "check", _laminar_criteria_demo(tmp_path), "--out", tmp_path / "o", "--jobs", "2")
    limits = next(line for line in out if line.startswith("Limits:"))
    assert "no flames beyond the sweep: every flame criterion is outside its range" in limits
    assert "turbulent port flow (Re" in limits and "about 0" not in limits
    total = next(line for line in out if line.startswith("Estimated total"))
    assert "everything above included (assumes 2 free cores" in total and "cluster" not in total
    assert "1.5 times that at 10 bar" in next(line for line in out if line.startswith("Estimated sweep"))


def test_check_estimates_each_ladder_and_spreads_them_over_the_workers(capsys, tmp_path):
    study = load_study(CONFIGS / "hydrogen_boiler_demo.toml")
    budget = Budget(points_to_solve=0, workers=2, warm_flame_s=1.0, species=len(study.atoms), reactions=0,
                    points=tuple(points(study)))
    line, t = ladders_estimate(study, budget, duration)
    each = ladder_seconds(10, 1.0, ladder_time_limit(study))
    assert t == pytest.approx(2 * each)  # three ladders on two workers
    assert line.startswith("Strained flames: 3 twin counterflow ladder(s) to extinction (phi 0.5, 0.7, 1)")
    assert "2 at a time" in line
    out = _check(capsys, "check", CONFIGS / "hydrogen_boiler_demo.toml", "--out", tmp_path / "o", "--jobs", "2")
    assert any(line.startswith("Strained flames: 3 twin") for line in out)
    assert check.whole_run_seconds(study, tmp_path / "o", 2) > t


def test_the_whole_estimate_follows_resolution_and_pressure(tmp_path):
    def total(resolution: str, pressure: str) -> float:
        cfg = write_h2_study(tmp_path, name=f"{resolution}{pressure}", pressures=f"[{pressure}]",
                             extra=f'resolution = "{resolution}"')
        return check.whole_run_seconds(load_study(cfg), tmp_path / "none", 2)
    assert total("coarse", "1.0") < total("standard", "1.0") < total("fine", "1.0")
    assert total("standard", "1.0") < total("standard", "10.0") < total("standard", "20.0")


def test_the_total_says_what_it_assumes_and_when_it_is_days_of_work():
    short = check._total_line(600.0, 2, 1)
    assert short == ("Estimated total: about 10 min, everything above included "
                     "(assumes 2 free cores: a busy machine takes longer)")
    long = check._total_line(3 * CLUSTER_ADVICE_S, 1, 2)
    assert "under all 2 mechanisms" in long and "(assumes 1 free core:" in long
    assert "That is 3.0 working days of 8 h on this machine (1.0 days round the clock): run it on a cluster" in long
