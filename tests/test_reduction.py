"""Mechanism reduction core (chemistry.reduction): DRGEP coefficients, skeletal mechanisms, their
ignition-delay error on states they were not trained on.

The coefficients are checked on a hand-built four-species example against the definitions of
Pepiot-Desjardins & Pitsch, Combust. Flame 154 (2008) 67-81 (worked out below); the reduction
of GRI-Mech 3.0 methane-air against the detailed mechanism's own ignition delays at 10 atm,
1450-1550 K (trained at phi 0.7 and 1.3, 1500 K; validated at phi 1.0, 1450 and 1550 K).
DRGEP skeletal mechanisms of GRI-Mech 3.0 for methane ignition at about 10 % error are
commonly reported at roughly 30 species (from memory); the check here is loose: fewer species
than the 53 of the detailed mechanism and at most 40.
"""
from __future__ import annotations

import math

import cantera as ct
import numpy as np
import pytest
from scipy import sparse

from flamecharts.chemistry import reduction as rd
from flamecharts.chemistry.ignition import ignition_delay_peak
from flamecharts.chemistry.mechanism import find_mechanism

ATM = 101325.0
FUEL, AIR = {"CH4": 1.0}, {"O2": 0.21, "N2": 0.79}
TRAINING = rd.Conditions((FUEL,), (AIR,), (0.7, 1.3), (1500.0,), (10 * ATM,))
VALIDATION = rd.Conditions((FUEL,), (AIR,), (1.0,), (1450.0, 1550.0), (10 * ATM,))

# The hand-built example: species A, B, C, D (indices 0-3) and three reactions with net rates
#   R1: A -> B      w1 = 2
#   R2: A + C -> D  w2 = 1
#   R3: B -> C      w3 = 4
# nu_A w = (-2, -1, 0): P_A = 0, C_A = 3.  B is in R1, R3: r_AB = |-2| / 3 = 2/3; C in R2, R3:
# r_AC = |-1| / 3 = 1/3; D in R2: r_AD = 1/3.
# nu_B w = (2, 0, -4): P_B = 2, C_B = 4.  r_BA (R1, R2) = 2/4; r_BC (R2, R3) = 4/4; r_BD (R2) = 0.
# nu_C w = (0, -1, 4): P_C = 4, C_C = 1.  r_CA (R1, R2) = 1/4; r_CB (R1, R3) = 4/4; r_CD (R2) = 1/4.
# nu_D w = (0, 1, 0): P_D = 1.            r_DA (R1, R2) = 1; r_DB (R1, R3) = 0; r_DC (R2, R3) = 1.
# From target A, the strongest paths: R_AB = 2/3 (direct); R_AC = max(1/3 direct, 2/3 * 1 via B)
# = 2/3; R_AD = max(1/3 direct, 2/3 * 1 * 1/4 via B and C, 1/3 * 1/4 via C) = 1/3.
HAND_NU = sparse.csr_matrix(np.array([[-1, -1, 0], [1, 0, -1], [0, -1, 1], [0, 1, 0]], dtype=float))
HAND_RATES = [2.0, 1.0, 4.0]
HAND_R = np.array([[0, 2 / 3, 1 / 3, 1 / 3], [1 / 2, 0, 1, 0], [1 / 4, 1, 0, 1 / 4], [1, 0, 1, 0]])


def test_direct_interaction_coefficients_of_the_hand_built_example():
    r = rd.direct_interactions(HAND_NU, abs(HAND_NU), HAND_RATES).toarray()
    assert r == pytest.approx(HAND_R, abs=1e-12)


def test_path_coefficients_are_the_strongest_product_over_paths():
    r = sparse.csr_matrix(HAND_R)
    assert rd.path_coefficients(r, [0])[0] == pytest.approx([1.0, 2 / 3, 2 / 3, 1 / 3], abs=1e-12)
    # from D: D -> A (1), D -> C (1), then C -> B (1): every species at 1
    assert rd.path_coefficients(r, [3])[0] == pytest.approx([1.0, 1.0, 1.0, 1.0], abs=1e-12)
    # the kept set at epsilon 0.5 for target A drops D, and with it reaction R2 (A + C -> D)
    importance = dict(zip("ABCD", rd.path_coefficients(r, [0])[0]))
    assert rd.kept_species(importance, 0.5, ["A"]) == ("A", "B", "C")


def test_path_coefficients_do_not_depend_on_species_order():
    """Niemeyer & Sung 2011: a Dijkstra search gives the same coefficients whatever the order."""
    order = [2, 0, 3, 1]
    shuffled = sparse.csr_matrix(HAND_R[np.ix_(order, order)])
    R = rd.path_coefficients(shuffled, [order.index(0)])[0]
    assert R[np.argsort(order)] == pytest.approx([1.0, 2 / 3, 2 / 3, 1 / 3], abs=1e-12)


def test_target_scaling_is_the_targets_share_of_an_element_flux():
    # one element; species 0 consumed at 2 (1 atom), species 1 produced at 1 (2 atoms): 2 atoms
    # per unit time go from 0 to 1, so each carries the whole flux; species 2 carries none
    atoms = np.array([[1.0], [2.0], [1.0]])
    assert rd.target_scaling(atoms, [-2.0, 1.0, 0.0], [0, 1, 2]).tolist() == [1.0, 1.0, 0.0]


@pytest.fixture(scope="module")
def gri():
    return ct.Solution("gri30.yaml")


def test_stoichiometry_matches_cantera(gri):
    nu, delta = rd.stoichiometry(gri)
    assert nu.toarray() == pytest.approx(gri.product_stoich_coeffs - gri.reactant_stoich_coeffs)
    involved = (gri.product_stoich_coeffs != 0) | (gri.reactant_stoich_coeffs != 0)
    assert np.array_equal(delta.toarray() != 0, involved)


@pytest.fixture(scope="module")
def states(gri):
    return rd.ignition_states(gri, TRAINING)


@pytest.fixture(scope="module")
def methane():
    return rd.reduce_for_ignition(str(find_mechanism("gri30.yaml", None)), TRAINING, VALIDATION)


@pytest.mark.slow
def test_sampling_is_deterministic_and_spans_the_ignition(gri, states):
    again = rd.ignition_states(gri, TRAINING)
    assert np.array_equal(states.Y, again.Y) and np.array_equal(states.T, again.T)
    assert states.T[0] == 1500.0 and states.T.max() > 2500.0  # initial state to burned gas
    # the induction period (the first kelvin of rise; initiation is endothermic) is sampled in time
    assert np.sum(np.abs(states.T - 1500.0) < 1.0) >= 10
    assert len(states) > 40


@pytest.mark.slow
def test_methane_skeletal_is_smaller_and_within_the_delay_target(methane):
    chosen = methane.chosen
    assert methane.reduced and methane.detailed == (53, 325)
    assert len(chosen.species) <= 40 and chosen.n_reactions < 325  # roughly 30 reported (from memory)
    assert chosen.max_error <= 0.10 and len(chosen.errors) == 2
    # the ladder was searched from the smallest mechanism up: every smaller one failed
    assert all(len(c.species) < len(chosen.species) and c.max_error > 0.10 for c in methane.tried[:-1])
    assert methane.tried[-1] is chosen


@pytest.mark.slow
def test_written_skeletal_reproduces_the_delays_with_the_other_integrator(methane, gri, tmp_path):
    """Delays of the written file by chemistry.ignition (the dense constant-pressure reactor)
    against the detailed mechanism's by the same function: within the 10 % target."""
    path = tmp_path / "skeletal.yaml"
    rd.write_mechanism(rd.skeletal_solution(gri, methane.chosen.species), path)
    detailed = str(find_mechanism("gri30.yaml", None))
    for _, _, phi, T, p in VALIDATION.points():
        X = tuple(sorted(rd.unburned(gri, FUEL, AIR, phi).items()))
        tau_d = ignition_delay_peak(detailed, X, T, p, 0.1)
        tau_s = ignition_delay_peak(str(path), X, T, p, 0.1)
        assert abs(tau_s / tau_d - 1) <= 0.10


@pytest.mark.slow
def test_targets_and_inerts_are_always_kept(gri, states):
    importance = rd.species_importance(gri, states, ["CH4", "O2"])
    assert importance["AR"] < 0.01  # AR is in the mixture of no study here: kept only as an inert
    always = rd.always_kept(gri, [{"CH4": 0.9, "H2": 0.1}, {"O2": 0.21, "N2": 0.78, "AR": 0.01}], ["NO"])
    assert set(always) == {"CH4", "H2", "O2", "N2", "AR", "NO"}
    kept = rd.kept_species(importance, 0.999, always)
    assert set(always) <= set(kept)
    with pytest.raises(ValueError, match="XY"):
        rd.always_kept(gri, [FUEL, AIR], ["XY"])


def _nitrogen_species(gri, species):
    return {s for s in species if gri.species(s).composition.get("N", 0) > 0 and s != "N2"}


@pytest.mark.slow
def test_nitrogen_chemistry_is_kept_when_no_is_a_target(gri, states, methane):
    eps = methane.chosen.epsilon
    plain = rd.kept_species(rd.species_importance(gri, states, ["CH4", "O2"]), eps, ["N2"])
    with_no = rd.kept_species(rd.species_importance(gri, states, ["CH4", "O2", "NO"]), eps, ["N2", "NO"])
    assert _nitrogen_species(gri, plain) == set()
    # the species of the thermal (N, NO) and N2O routes at least
    assert {"NO", "N", "N2O"} <= _nitrogen_species(gri, with_no)


@pytest.mark.slow
def test_scaled_importance_never_exceeds_the_unscaled(gri, states):
    plain = rd.species_importance(gri, states, ["CH4", "O2"])
    scaled = rd.species_importance(gri, states, ["CH4", "O2"], scaled=True)
    assert all(scaled[s] <= plain[s] + 1e-12 for s in plain)
    assert any(scaled[s] < 0.5 * plain[s] for s in plain)


@pytest.mark.slow
def test_written_yaml_loads_and_its_hash_is_stable(gri, methane, tmp_path):
    skeletal = rd.skeletal_solution(gri, methane.chosen.species)
    note = "skeletal test mechanism\nfrom gri30.yaml"
    h1 = rd.write_mechanism(skeletal, tmp_path / "a.yaml", note)
    gri.TPX = 1234.0, 2 * ATM, "CH4:1, O2:1"  # the source's state must not enter the file
    h2 = rd.write_mechanism(rd.skeletal_solution(gri, methane.chosen.species), tmp_path / "b.yaml", note)
    text = (tmp_path / "a.yaml").read_text()
    assert h1 == h2 == rd.mechanism_sha256(text) and text == (tmp_path / "b.yaml").read_text()
    assert text.startswith("# skeletal test mechanism\n# from gri30.yaml\n")
    loaded = ct.Solution(str(tmp_path / "a.yaml"))
    assert loaded.species_names == skeletal.species_names and loaded.n_reactions == methane.chosen.n_reactions
    assert loaded.transport_model == "mixture-averaged"
    loaded.TPX = 300.0, ATM, "CH4:1, O2:2, N2:7.52"
    assert loaded.mix_diff_coeffs[loaded.species_index("CH4")] > 0
    points = VALIDATION.points()
    assert rd.ignition_delays(loaded, points) == pytest.approx(rd.ignition_delays(skeletal, points), rel=1e-9)


def test_validation_points_must_differ_from_training():
    with pytest.raises(ValueError, match="training points"):
        rd.reduce_for_ignition("gri30.yaml", TRAINING, TRAINING)
    with pytest.raises(ValueError, match="one value on every axis"):
        rd.between(rd.Conditions((FUEL,), (AIR,), (1.0,), (1500.0,), (ATM,)))
    assert [p[2:] for p in rd.between(TRAINING).points()] == [(1.0, 1500.0, 10 * ATM)]
    blends = rd.between(rd.Conditions(({"CH4": 1.0}, {"CH4": 0.6, "H2": 0.4}), (AIR,), (1.0,), (1500.0,), (ATM,)))
    assert [p[0] for p in blends.points()] == [(("CH4", 0.8), ("H2", 0.2))]  # the blend between


def test_skeletal_drops_efficiencies_and_duplicate_marks_of_removed_species(gri):
    kept = ["H2", "H", "O", "O2", "OH", "H2O", "HO2", "H2O2", "N2"]
    skeletal = rd.skeletal_solution(gri, kept)
    assert skeletal.n_species == 9 and skeletal.transport_model == "mixture-averaged"
    for r in skeletal.reactions():
        assert set(r.reactants) | set(r.products) <= set(kept)
        if r.third_body is not None:
            assert set(r.third_body.efficiencies) <= set(kept)
    # an explicit collider (H + O2 + AR <=> HO2 + AR) is a third body, not a reactant, to
    # Cantera: such a reaction goes with its collider
    expected = [r for r in gri.reactions() if set(r.reactants) | set(r.products) <= set(kept)
                and (r.third_body is None or r.third_body.name in ["M"] + kept)]
    assert skeletal.n_reactions == len(expected) == 28


@pytest.mark.slow
def test_a_mechanism_without_transport_data_gives_a_skeletal_without(tmp_path):
    """The n-hexane C0-C6 mechanism bundled with Cantera (Zhang et al., Combust. Flame 162
    (2015) 4194) has no transport data: its skeletal mechanisms are for the ignition path only."""
    try:
        path = find_mechanism("example_data/n-hexane-NUIG-2015.yaml", None)
    except Exception:  # noqa: BLE001 - an older Cantera without the file
        pytest.skip("n-hexane-NUIG-2015.yaml is not bundled with this Cantera")
    with pytest.warns(UserWarning):  # Cantera notes two species' thermo discontinuities
        hexane = ct.Solution(str(path))
    kept = rd.always_kept(hexane, [{"NC6H14": 1.0}, AIR]) + ("H", "O", "OH", "HO2", "H2O", "CO", "CO2", "H2")
    skeletal = rd.skeletal_solution(hexane, kept)
    assert skeletal.transport_model in ("none", None) and skeletal.n_species == len(kept)
    h = rd.write_mechanism(skeletal, tmp_path / "hexane.yaml")
    assert math.isfinite(ct.Solution(str(tmp_path / "hexane.yaml")).n_reactions) and len(h) == 64
