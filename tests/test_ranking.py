"""Tests of workbench.ranking: limits, criteria, material indices, scores, rank stability."""

from __future__ import annotations

from math import comb

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from workbench.ranking import (
    Criterion,
    Limit,
    check_limit,
    check_service_range,
    combine_constraints,
    material_indices,
    normalise_criteria,
    oriented,
    rank_stability,
    screen_candidates,
    simplex_weights,
    simplex_winner,
    wall_for_resistance,
    weighted_scores,
)

# Demo candidates (values of the right order of magnitude, labelled demo; the
# tests below check the method, not these data).
K = np.array([0.035, 0.040, 0.022, 0.17])  # W/(m·K)
RHO = np.array([25.0, 30.0, 35.0, 700.0])  # kg/m³
PRICE = np.array([4.0, 2.0, 9.0, 1.0])  # currency/kg


# --- material indices ------------------------------------------------------


def test_material_indices_hand_example():
    # Ashby, Materials Selection in Mechanical Design, 4th ed. 2011 (method of
    # material indices): wall of fixed resistance R -> L = R k, m/A = rho R k,
    # C/A = c_m rho R k. Hand calculation for R = 2.5 m²K/W:
    #   material 0: L = 2.5*0.035 = 0.0875 m, m/A = 25*0.0875 = 2.1875 kg/m²,
    #               C/A = 4*2.1875 = 8.75
    #   material 3: L = 2.5*0.17 = 0.425 m, m/A = 700*0.425 = 297.5 kg/m²,
    #               C/A = 1*297.5 = 297.5
    L, m, c = wall_for_resistance(2.5, K, RHO, PRICE)
    np.testing.assert_allclose(L[[0, 3]], [0.0875, 0.425], rtol=1e-12)
    np.testing.assert_allclose(m[[0, 3]], [2.1875, 297.5], rtol=1e-12)
    np.testing.assert_allclose(c[[0, 3]], [8.75, 297.5], rtol=1e-12)
    ix = material_indices(K, RHO, PRICE)
    np.testing.assert_allclose(ix.mass_index[[0, 3]], [0.875, 119.0], rtol=1e-12)


def test_index_ranking_equals_ranking_of_required_walls():
    # The index orders the candidates exactly as the wall they need does
    # (Ashby 2011: the performance equation separates into R x index).
    rng = np.random.default_rng(0)
    k = 10 ** rng.uniform(-1.7, 1.7, 50)
    rho = 10 ** rng.uniform(1.3, 3.9, 50)
    price = 10 ** rng.uniform(0, 2, 50)
    ix = material_indices(k, rho, price)
    for r in (0.5, 3.0):
        L, m, c = wall_for_resistance(r, k, rho, price)
        # thickness from the slab law R = L/k solved directly
        np.testing.assert_allclose(L / k, r, rtol=1e-12)
        assert np.array_equal(np.argsort(m), np.argsort(ix.mass_index))
        assert np.array_equal(np.argsort(c), np.argsort(ix.cost_index))


def test_material_indices_reject_bad_input():
    with pytest.raises(ValueError, match="conductivity"):
        material_indices([0.0, 0.1], [10.0, 10.0])
    with pytest.raises(ValueError, match="density"):
        material_indices([0.1], [np.nan])
    assert material_indices(K, RHO).cost_index is None


# --- limits ---------------------------------------------------------------


def test_service_range_reasons():
    # Common practice: a material is usable where its service range covers
    # both face temperatures.
    r = check_service_range(
        t_service_min=[223.15, 273.15, 173.15],
        t_service_max=[348.15, 523.15, 373.15],
        t_face_min=253.15,
        t_face_max=358.15,
    )
    assert r.keep.tolist() == [False, False, True]
    assert r.reasons[0] == "hot face 358.15 K is above the service limit 348.15 K"
    assert r.reasons[1] == "cold face 253.15 K is below the service limit 273.15 K"
    assert r.reasons[2] == ""
    assert r.removed.tolist() == [0, 1]


def test_screen_candidates_every_removed_one_has_a_reason():
    thickness = np.array([0.05, 0.12, 0.08, 0.02])
    mass = RHO * thickness
    cost = PRICE * mass
    hold = np.array([30.0, 50.0, 20.0, 60.0]) * 3600.0
    r = screen_candidates(
        thickness=thickness,
        max_thickness=0.1,
        mass_per_area=mass,
        max_mass_per_area=5.0,
        cost_per_area=cost,
        max_cost_per_area=20.0,
        limits=[Limit("hold time", hold, 24 * 3600.0, "min", "s")],
    )
    # by hand: candidate 1 too thick (0.12 > 0.1); 2 too short (20 h < 24 h);
    # 3: mass 700*0.02 = 14 kg/m² > 5; candidate 0: m = 1.25, cost = 5 -> kept
    assert r.keep.tolist() == [True, False, False, False]
    assert r.reasons[0] == ""
    assert "thickness 0.12 m exceeds the maximum 0.1 m" in r.reasons[1]
    assert "hold time 7.2e+04 s is below the minimum 8.64e+04 s" in r.reasons[2]
    assert "mass per area 14 kg/m² exceeds the maximum 5 kg/m²" in r.reasons[3]
    for keep, why in zip(r.keep, r.reasons, strict=True):
        assert keep == (why == "")


def test_limit_at_the_boundary_passes_and_combine_joins_reasons():
    a = check_limit(Limit("cost per area", [10.0, 10.5], 10.0, "max", "EUR/m²"))
    b = check_limit(Limit("R", [1.0, 0.5], 1.0, "min", "m²K/W"))
    c = combine_constraints(a, b)
    assert c.keep.tolist() == [True, False]
    assert c.reasons[1].count(";") == 1
    with pytest.raises(ValueError, match="direction"):
        check_limit(Limit("x", [1.0], 1.0, "below"))
    with pytest.raises(ValueError, match="same"):
        combine_constraints(a, check_limit(Limit("x", [1.0], 1.0)))


def test_screen_requires_pairs():
    with pytest.raises(ValueError, match="thickness"):
        screen_candidates(thickness=[0.1])
    with pytest.raises(ValueError, match="t_hot"):
        screen_candidates(t_service_min=[200.0], t_service_max=[300.0])


# --- criteria, normalisation, scores ---------------------------------------


def test_criterion_direction_and_unknown_names():
    c = Criterion("thermal resistance", "m²·K/W", "maximize")
    assert c.direction == "maximise" and c.sign == -1.0
    assert c.label == "thermal resistance [m²·K/W]"
    with pytest.raises(ValueError, match="valid"):
        Criterion("x", "", "smallest")


def test_normalisation_and_weighted_scores_hand_example():
    # Min-max normalisation, 0 = best (hand calculation):
    # col 0 minimised: (2, 4, 3) -> (0, 1, 0.5); col 1 maximised: (1, 3, 2) -> (1, 0, 0.5)
    v = [[2.0, 1.0], [4.0, 3.0], [3.0, 2.0]]
    crit = [Criterion("mass", "kg/m²"), Criterion("R", "m²K/W", "max")]
    np.testing.assert_allclose(normalise_criteria(v, crit), [[0, 1], [1, 0], [0.5, 0.5]])
    # weights 1:3 -> w = (0.25, 0.75): scores 0.75, 0.25, 0.5
    np.testing.assert_allclose(weighted_scores(v, crit, [1, 3]), [0.75, 0.25, 0.5])
    np.testing.assert_allclose(oriented(v, ["min", "max"])[:, 1], [-1, -3, -2])
    with pytest.raises(ValueError, match="weights"):
        weighted_scores(v, crit, [0, 0])
    with pytest.raises(ValueError, match="directions"):
        normalise_criteria(v, ["min"])


# --- weight sweeps ------------------------------------------------------------


@pytest.mark.parametrize("c,r", [(2, 7), (3, 10), (4, 6), (5, 4)])
def test_simplex_grid_is_complete(c, r):
    # Stars and bars: C(r + c - 1, c - 1) compositions of r into c parts.
    w = simplex_weights(c, r)
    assert w.shape == (comb(r + c - 1, c - 1), c)
    np.testing.assert_allclose(w.sum(axis=1), 1.0)
    assert len({tuple(np.round(row * r).astype(int)) for row in w}) == w.shape[0]
    assert (w >= 0).all()


def test_rank_stability_shares_sum_to_one_and_ranks_bracket():
    rng = np.random.default_rng(2)
    v = rng.random((12, 3))
    for kw in ({"resolution": 12}, {"n_samples": 3000, "seed": 5}):
        rs = rank_stability(v, ["min", "max", "min"], **kw)
        assert rs.share_first.sum() == pytest.approx(1.0, abs=1e-12)
        assert (rs.best_rank >= 1).all() and (rs.best_rank <= rs.worst_rank).all()
        assert (rs.worst_rank <= 12).all()
        assert (rs.share_first[rs.best_rank > 1] == 0).all()


def test_only_pareto_optimal_candidates_ever_win():
    # A weighted sum with positive weights is minimised by a Pareto-optimal
    # point (standard result of multi-objective optimisation; common
    # practice). Strictly dominated candidates never win on the grid interior.
    rng = np.random.default_rng(3)
    v = rng.random((40, 3))
    rs = rank_stability(v, ["min"] * 3, n_samples=4000, seed=1)
    le = (v[None, :, :] <= v[:, None, :]).all(axis=2)
    lt = (v[None, :, :] < v[:, None, :]).any(axis=2)
    dominated = (le & lt).any(axis=1)  # definition of Pareto dominance
    assert dominated.any()
    assert (rs.share_first[dominated] == 0).all()


def test_ties_split_evenly():
    # Two identical candidates share every first place equally.
    v = [[1.0, 2.0], [1.0, 2.0], [2.0, 3.0]]
    rs = rank_stability(v, ["min", "min"], resolution=10)
    np.testing.assert_allclose(rs.share_first, [0.5, 0.5, 0.0])
    assert rs.worst_rank.tolist() == [1, 1, 3]
    assert (rs.n_tied == 2).all()


def test_simplex_winner_switch_point_two_criteria():
    # Hand example: A = (0, 1), B = (0.3, 0.5) after normalisation over
    # (A, B, C) with C = (1, 0): score_A = w1, score_B = 0.3 w0 + 0.5 w1,
    # score_C = w0. B wins where 0.3 w0 + 0.5 w1 < min(w0, w1), i.e.
    # 0.5 - 0.2 w0 < w0 and 0.5 - 0.2 w0 < 1 - w0, i.e. 5/12 < w0 < 5/8.
    v = [[0.0, 1.0], [0.3, 0.5], [1.0, 0.0]]
    sw = simplex_winner(v, ["min", "min"], resolution=84)
    w0 = sw.weights[:, 0]
    inside = (w0 > 5 / 12 + 1e-9) & (w0 < 5 / 8 - 1e-9)
    assert (sw.winner[inside] == 1).all()
    assert (sw.winner[w0 < 5 / 12 - 1e-9] == 2).all()
    assert (sw.winner[w0 > 5 / 8 + 1e-9] == 0).all()
    assert sw.tied[np.isclose(w0, 5 / 12)].all()  # 35/84 is on the grid


def test_simplex_winner_vertices_three_criteria():
    rng = np.random.default_rng(4)
    v = rng.random((6, 3))
    sw = simplex_winner(v, ["min", "max", "min"], resolution=20)
    for j, best in enumerate([v[:, 0].argmin(), v[:, 1].argmax(), v[:, 2].argmin()]):
        vertex = np.flatnonzero(sw.weights[:, j] == 1.0)[0]
        assert sw.winner[vertex] == best
    with pytest.raises(ValueError, match="criteria"):
        simplex_winner(rng.random((3, 4)), ["min"] * 4)


@settings(max_examples=60, deadline=None)
@given(
    arrays(
        np.float64,
        st.tuples(st.integers(1, 8), st.integers(1, 4)),
        elements=st.sampled_from([0.0, 1.0, 2.0, 3.5]),
    )
)
def test_property_shares_sum_to_one(v):
    rs = rank_stability(v, ["min"] * v.shape[1], resolution=5)
    assert rs.share_first.sum() == pytest.approx(1.0, abs=1e-9)
    assert (rs.share_first >= 0).all()
