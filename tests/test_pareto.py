"""Tests of workbench.ranking.pareto_front.

Oracles outside the project:
- the definition of Pareto dominance (a <= b in every objective and a < b in
  at least one), implemented here as an independent O(n^2) brute force;
- the ``paretoset`` package (PyPI, v1.2; test-only oracle) with
  ``distinct=False``, which keeps every duplicate of a non-dominated point.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays
from paretoset import paretoset

from workbench.ranking import pareto_front


def brute_force_front(x: np.ndarray) -> np.ndarray:
    """O(n^2) definition: keep i unless some j has x_j <= x_i everywhere, < somewhere."""
    x = np.asarray(x, dtype=float)
    n = x.shape[0]
    keep = np.ones(n, dtype=bool)
    step = max(1, 2_000_000 // max(1, n * x.shape[1]))
    for a in range(0, n, step):
        blk = x[a : a + step]
        le = (x[None, :, :] <= blk[:, None, :]).all(axis=2)
        lt = (x[None, :, :] < blk[:, None, :]).any(axis=2)
        keep[a : a + step] = ~(le & lt).any(axis=1)
    return keep


def _dominated_by(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """For each row of a: is it dominated by some row of b?"""
    le = (b[None, :, :] <= a[:, None, :]).all(axis=2)
    lt = (b[None, :, :] < a[:, None, :]).any(axis=2)
    return (le & lt).any(axis=1)


def _anti(rng, n, d, noise):
    return rng.dirichlet(np.ones(d), size=n) + rng.normal(0.0, noise, size=(n, d))


@pytest.mark.parametrize("d", [1, 2, 3, 4, 5])
def test_matches_brute_force_with_ties_and_duplicates(d):
    # Definition of Pareto dominance (brute force above).
    rng = np.random.default_rng(d)
    for trial in range(25):
        n = int(rng.integers(1, 150))
        x = rng.integers(0, 4, size=(n, d)).astype(float)  # many ties and duplicates
        x[rng.integers(0, n, size=n // 3)] = x[0]  # extra duplicates of one point
        np.testing.assert_array_equal(pareto_front(x), brute_force_front(x), err_msg=f"{trial}")
        y = rng.random((n, d))
        np.testing.assert_array_equal(pareto_front(y), brute_force_front(y))


@pytest.mark.parametrize("d", [2, 3, 4])
def test_large_sets_use_prefilters_and_stay_exact(d):
    # n > 4096 runs the pivot/grid pre-filters; brute force by definition.
    rng = np.random.default_rng(10 + d)
    n = 6000 if d < 4 else 4500
    cases = [
        rng.random((n, d)),
        np.round(rng.random((n, d)), 2),  # ties in every column
        _anti(rng, n, d, 0.05),
        np.round(_anti(rng, n, d, 0.05), 2),
    ]
    for x in cases:
        x = np.concatenate([x, x[:500]])  # exact duplicates
        mask = pareto_front(x)
        # Equivalent to the definition: kept points are dominated by none,
        # dropped points are dominated by some kept point.
        assert not _dominated_by(x[mask], x).any()
        assert _dominated_by(x[~mask], x[mask]).all()


@pytest.mark.parametrize("d", [2, 3, 4])
@pytest.mark.parametrize("kind", ["uniform", "anti", "rounded"])
def test_matches_paretoset(d, kind):
    # Oracle: paretoset 1.2 (PyPI), distinct=False keeps all duplicates.
    rng = np.random.default_rng(100 + d)
    n = 30_000 if d < 4 else 8000
    if kind == "uniform":
        x = rng.random((n, d))
    elif kind == "anti":
        x = _anti(rng, n, d, 0.03)
    else:
        x = np.round(_anti(rng, n, d, 0.03), 2)
    x = np.concatenate([x, x[::7]])
    ref = paretoset(x, sense=["min"] * d, distinct=False)
    np.testing.assert_array_equal(pareto_front(x), ref)


def test_mixed_scales_and_negative_values():
    # Objectives of very different magnitude (R [m²K/W] vs cost) and sign.
    rng = np.random.default_rng(7)
    x = np.column_stack([-rng.random(7000) * 5.0, rng.random(7000) * 1e4, rng.random(7000) * 1e-3])
    np.testing.assert_array_equal(pareto_front(x), paretoset(x, distinct=False))


def test_two_objective_ties_on_first_column():
    # Hand example: equal first objective, the smaller second one dominates.
    x = [[1.0, 5.0], [1.0, 3.0], [1.0, 3.0], [2.0, 1.0], [2.0, 1.0], [3.0, 1.0]]
    np.testing.assert_array_equal(pareto_front(x), [False, True, True, True, True, False])


def test_input_not_modified_and_list_input():
    rng = np.random.default_rng(3)
    x = rng.random((5000, 3))
    before = x.copy()
    pareto_front(x)
    np.testing.assert_array_equal(x, before)
    assert pareto_front([[1.0, 2.0]]).tolist() == [True]


def test_empty_and_single_objective():
    assert pareto_front(np.zeros((0, 3))).shape == (0,)
    np.testing.assert_array_equal(
        pareto_front([[2.0], [1.0], [1.0], [3.0]]), [False, True, True, False]
    )


def test_huge_finite_values_do_not_overflow_checks():
    rng = np.random.default_rng(4)
    x = rng.random((6000, 3)) * 1.7e308
    np.testing.assert_array_equal(pareto_front(x), paretoset(x, distinct=False))
    y = rng.random((6000, 2)) * 1.7e308 * rng.choice([-1.0, 1.0], (6000, 2))  # span overflows
    np.testing.assert_array_equal(pareto_front(y), paretoset(y, distinct=False))


@pytest.mark.parametrize("bad", [np.nan, np.inf, -np.inf])
@pytest.mark.parametrize("n", [10, 6000])
def test_non_finite_raises_naming_objectives(bad, n):
    rng = np.random.default_rng(5)
    for d in (2, 3):
        x = rng.random((n, d))
        x[n // 2, d - 1] = bad
        with pytest.raises(ValueError, match="objectives"):
            pareto_front(x)


@pytest.mark.parametrize("shape", [(5,), (2, 3, 4), (4, 0)])
def test_bad_shapes_raise(shape):
    with pytest.raises(ValueError, match="objectives"):
        pareto_front(np.ones(shape))


@settings(max_examples=150, deadline=None)
@given(
    arrays(
        np.float64,
        st.tuples(st.integers(1, 40), st.integers(1, 4)),
        elements=st.sampled_from([0.0, 1.0, 2.0, 2.5, -1.0, 1e-9]),
    )
)
def test_property_front_is_exactly_the_non_dominated_set(x):
    # Invariants from the definition: no kept point is dominated by any point;
    # every dropped point is dominated by some kept point.
    mask = pareto_front(x)
    assert mask.any()
    assert not _dominated_by(x[mask], x).any()
    if (~mask).any():
        assert _dominated_by(x[~mask], x[mask]).all()
