"""Tests of workbench.uncertainty (Monte Carlo over candidates).

Oracles: the deterministic model itself (zero tolerance), normal-distribution
theory through scipy.stats (test-only reference library), and the binomial
standard error sqrt(p(1-p)/n) (JCGM 101:2008, GUM Supplement 1, 7.9 on the
number of trials; cited from memory).
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import stats

from workbench.uncertainty import monte_carlo, sample_truncated_normal

DELTA_T = 30.0  # K


def flux_model(s):
    """Fourier's law for one slab, q = k dT / L, and mass per area rho L (criteria)."""
    q = s["k"] * DELTA_T / s["L"]
    m = s["rho"] * s["L"]
    return np.stack([q, m], axis=-1)


NOMINAL = {
    "k": np.array([0.035, 0.040, 0.022]),  # demo values [W/(m·K)]
    "rho": np.array([25.0, 30.0, 35.0]),  # demo [kg/m³]
    "L": np.array([0.05, 0.06, 0.04]),  # demo [m]
}


def test_zero_tolerance_reproduces_deterministic_answer_exactly():
    det = flux_model({k: v[None, :] for k, v in NOMINAL.items()})[0]
    r = monte_carlo(
        flux_model,
        NOMINAL,
        {"k": 0.0, "rho": 0.0},
        n_samples=500,
        rng=3,
        limit=20.0,
        chunk_size=128,
    )
    for arr in (r.p10, r.p50, r.p90):
        np.testing.assert_array_equal(arr, det)
    np.testing.assert_allclose(r.mean, det, rtol=1e-12)  # a sum of n equal values rounds
    # deterministic limit check and winner: q = 21, 20, 16.5 W/m²
    np.testing.assert_array_equal(r.prob_meets, det[:, 0] <= 20.0)
    np.testing.assert_array_equal(r.prob_meets_se, 0.0)
    np.testing.assert_array_equal(r.prob_best[:, 0], [0.0, 0.0, 1.0])
    np.testing.assert_array_equal(r.prob_best[:, 1], det[:, 1] == det[:, 1].min())


def test_linear_model_median_converges_to_nominal():
    # For a model linear in one normal input the output is normal with the
    # same relative sigma: q = k dT/L. The sample median's standard error is
    # sqrt(pi/2) sigma / sqrt(n) (asymptotic variance of the median of a
    # normal sample; common statistics fact, from memory).
    n = 20000
    tol = 0.05
    r = monte_carlo(flux_model, NOMINAL, {"k": tol}, n_samples=n, rng=11)
    q0 = NOMINAL["k"] * DELTA_T / NOMINAL["L"]
    se_median = np.sqrt(np.pi / 2) * tol * q0 / np.sqrt(n)
    assert np.all(np.abs(r.p50[:, 0] - q0) < 4 * se_median)
    # P10/P90 against the normal quantiles (scipy.stats as oracle)
    z90 = stats.norm.ppf(0.9)
    np.testing.assert_allclose(r.p90[:, 0], q0 * (1 + tol * z90), rtol=0.01)
    np.testing.assert_allclose(r.p10[:, 0], q0 * (1 - tol * z90), rtol=0.01)
    # the untoleranced criterion (mass) stays exact
    np.testing.assert_array_equal(r.p50[:, 1], NOMINAL["rho"] * NOMINAL["L"])


def test_probability_of_meeting_limit_and_its_standard_error():
    n = 8000
    tol = 0.1
    limit = 21.0
    r = monte_carlo(flux_model, NOMINAL, {"k": tol}, n_samples=n, rng=5, limit=limit)
    q0 = NOMINAL["k"] * DELTA_T / NOMINAL["L"]
    p_theory = stats.norm.cdf((limit / q0 - 1.0) / tol)  # truncation negligible at 10 %
    np.testing.assert_allclose(r.prob_meets_se, np.sqrt(r.prob_meets * (1 - r.prob_meets) / n))
    assert np.all(np.abs(r.prob_meets - p_theory) < 4 * np.maximum(r.prob_meets_se, 1e-3))


def test_hold_time_limit_direction_min():
    def hold(s):  # a stand-in criterion that grows with thickness
        return s["L"] * 1e6

    r = monte_carlo(
        hold,
        {"L": [0.05, 0.02]},
        {"L": 0.0},
        n_samples=10,
        rng=0,
        limit=40000.0,
        limit_direction="min",
    )
    np.testing.assert_array_equal(r.prob_meets, [1.0, 0.0])


def test_probability_best_sums_to_one_and_matches_normal_theory():
    nominal = {"k": [0.040, 0.036], "L": [0.05, 0.05], "rho": [30.0, 30.0]}
    r = monte_carlo(
        flux_model,
        nominal,
        {"k": 0.08},
        n_samples=10000,
        rng=9,
        directions=["min", "min"],
    )
    np.testing.assert_allclose(r.prob_best.sum(axis=0), 1.0)
    # q_i ~ N(q0_i, (0.08 q0_i)^2); P(q_0 < q_1) from the difference (scipy.stats)
    q0 = np.array(nominal["k"]) * DELTA_T / 0.05
    sd = np.hypot(0.08 * q0[0], 0.08 * q0[1])
    p0 = stats.norm.cdf((q0[1] - q0[0]) / sd)
    assert abs(r.prob_best[0, 0] - p0) < 4 * np.sqrt(p0 * (1 - p0) / 10000)
    # equal masses: the tie is split evenly
    np.testing.assert_allclose(r.prob_best[:, 1], [0.5, 0.5])


def test_maximised_criterion_direction():
    r = monte_carlo(
        lambda s: s["L"] / s["k"],
        {"k": [0.04, 0.03], "L": [0.05, 0.05]},
        {},
        n_samples=5,
        directions=["max"],
    )
    np.testing.assert_array_equal(r.prob_best[:, 0], [0.0, 1.0])


def test_truncated_normal_stays_positive_and_is_reproducible():
    a = sample_truncated_normal([1.0, 2.0], [0.8, 0.0], 20000, np.random.default_rng(1))
    b = sample_truncated_normal([1.0, 2.0], [0.8, 0.0], 20000, np.random.default_rng(1))
    np.testing.assert_array_equal(a, b)
    assert (a[:, 0] > 0).all()
    np.testing.assert_array_equal(a[:, 1], 2.0)
    # truncation at zero of N(1, 0.8²) raises the mean above 1 (scipy.stats truncnorm)
    expected = stats.truncnorm.mean(-1 / 0.8, np.inf, loc=1.0, scale=0.8)
    assert abs(a[:, 0].mean() - expected) < 4 * 0.8 / np.sqrt(20000)
    with pytest.raises(ValueError, match="nominal"):
        sample_truncated_normal([0.0], [0.1], 5, np.random.default_rng(0))


def test_progress_cancel_and_reproducibility():
    seen = []
    calls = {"n": 0}

    def cancel():
        calls["n"] += 1
        return calls["n"] > 3  # stop before the 4th chunk

    r = monte_carlo(
        flux_model,
        NOMINAL,
        {"k": 0.05},
        n_samples=1000,
        chunk_size=100,
        rng=1,
        progress=seen.append,
        cancel=cancel,
    )
    assert r.cancelled and r.n_samples == 300
    assert seen == pytest.approx([0.1, 0.2, 0.3])
    full1 = monte_carlo(flux_model, NOMINAL, {"k": 0.05}, n_samples=400, rng=7)
    full2 = monte_carlo(
        flux_model, NOMINAL, {"k": 0.05}, n_samples=400, rng=np.random.default_rng(7)
    )
    np.testing.assert_array_equal(full1.p50, full2.p50)
    none = monte_carlo(flux_model, NOMINAL, {}, n_samples=10, cancel=lambda: True)
    assert none.n_samples == 0 and np.isnan(none.p50).all()
    assert none.p50.shape == (3, 2) and none.prob_best.shape == (3, 2)  # one column per criterion


def test_bad_inputs():
    with pytest.raises(ValueError, match="unknown property"):
        monte_carlo(flux_model, NOMINAL, {"cp": 0.1})
    with pytest.raises(ValueError, match="n_samples"):
        monte_carlo(flux_model, NOMINAL, {}, n_samples=0)
    with pytest.raises(ValueError, match="model"):
        monte_carlo(lambda s: s["k"][:, :1], NOMINAL, {}, n_samples=3)
    with pytest.raises(ValueError, match="max_bytes"):
        monte_carlo(flux_model, NOMINAL, {}, n_samples=10**6, max_bytes=1000)
    with pytest.raises(ValueError, match="k"):
        monte_carlo(flux_model, {**NOMINAL, "k": [np.nan, 1.0, 1.0]}, {})
