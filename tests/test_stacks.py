"""Tests of workbench.stacks (layer-stack search).

Oracles: per-layer resistance L/k from the ``ht`` library (test-only
reference, ``ht.conduction.k_to_R``); resistances in series add (Incropera et
al., Fundamentals of Heat and Mass Transfer, 6th ed. 2007, Sec. 3.1); the
front of an independent brute-force enumeration written here, sieved with
``paretoset`` (PyPI, test-only oracle).
"""

from __future__ import annotations

from itertools import combinations, combinations_with_replacement, product

import numpy as np
import pytest
from ht.conduction import k_to_R
from paretoset import paretoset

from workbench.stacks import (
    check_service_limits,
    enumerate_stacks,
    stack_catalogue,
    stack_front,
)


def synthetic(n_materials, n_thick, seed):
    """Synthetic (demo) candidates spanning realistic ranges: k 0.02-50, rho 20-8000."""
    rng = np.random.default_rng(seed)
    k = 10 ** rng.uniform(np.log10(0.02), np.log10(50), n_materials)
    rho = 10 ** rng.uniform(np.log10(20), np.log10(8000), n_materials)
    cost_v = 10 ** rng.uniform(0, 2, n_materials) * rho  # price per kg x density
    thick = np.sort(rng.uniform(0.002, 0.1, (n_materials, n_thick)), axis=1)
    return k, rho, cost_v, thick


def brute_force(k, rho, cv, thick, max_layers, allow_repeat=False):
    """All unordered stacks, enumerated independently of the search.

    Returns (mats, opts, values): material and option per layer (-1 = unused)
    and the columns R = sum L/k (resistances in series), m, c, L per stack.
    """
    nm, nt = thick.shape
    mats_all, ts_all, cols = [], [], []
    for n in range(1, max_layers + 1):
        if allow_repeat:
            combos = np.array(list(combinations_with_replacement(range(nm * nt), n)))
            mats, ts = combos // nt, combos % nt
        else:
            mm = np.array(list(combinations(range(nm), n)))
            tt = np.array(list(product(range(nt), repeat=n)))
            mats = np.repeat(mm, len(tt), axis=0)
            ts = np.tile(tt, (len(mm), 1))
        L = thick[mats, ts]
        cols.append(
            np.column_stack(
                [(L / k[mats]).sum(1), (rho[mats] * L).sum(1), (cv[mats] * L).sum(1), L.sum(1)]
            )
        )
        pad = np.full((len(mats), max_layers - n), -1)
        mats_all.append(np.hstack([mats, pad]))
        ts_all.append(np.hstack([ts, pad]))
    return np.concatenate(mats_all), np.concatenate(ts_all), np.concatenate(cols)


def front_of(bf, names=("R", "m", "c"), budget=None):
    mats, ts, v = bf
    if budget is not None:
        ok = v[:, 3] <= budget
        mats, ts, v = mats[ok], ts[ok], v[ok]
    col = {"R": 0, "m": 1, "c": 2, "L": 3}
    obj = np.column_stack([-v[:, 0] if n == "R" else v[:, col[n]] for n in names])
    mask = paretoset(obj, sense=["min"] * len(names), distinct=False)
    return {
        tuple(sorted((a, b) for a, b in zip(m, t, strict=True) if a >= 0))
        for m, t in zip(mats[mask].tolist(), ts[mask].tolist(), strict=True)
    }


def as_set(s):
    out = set()
    for m, o in zip(s.material.tolist(), s.option.tolist(), strict=True):
        out.add(tuple(sorted((a, b) for a, b in zip(m, o, strict=True) if a >= 0)))
    return out


@pytest.fixture(scope="module")
def case20():
    k, rho, cv, thick = synthetic(20, 10, seed=1)
    return k, rho, cv, thick, brute_force(k, rho, cv, thick, 3)


def test_pruned_search_equals_brute_force_3_layers(case20):
    k, rho, cv, thick, rows = case20
    got = stack_front(k, rho, cv, thick, max_layers=3)
    assert as_set(got) == front_of(rows)
    assert len(got) == len(as_set(got))  # no stack listed twice


def test_objective_values_match_series_resistance(case20):
    k, rho, cv, thick, _ = case20
    got = stack_front(k, rho, cv, thick, max_layers=3)
    # per-layer resistance from the ht library (k_to_R = thickness / k)
    m0, o0 = got.material[0, 0], got.option[0, 0]
    assert got.layer_thickness[0, 0] / k[m0] == pytest.approx(k_to_R(k[m0], thick[m0, o0]))
    L = got.layer_thickness
    used = got.material >= 0
    R = np.where(used, L / k[np.where(used, got.material, 0)], 0.0).sum(axis=1)
    np.testing.assert_allclose(got.resistance, R, rtol=1e-12)
    np.testing.assert_allclose(got.thickness, L.sum(axis=1), rtol=1e-12)
    np.testing.assert_allclose(got.u_value(0.13, 0.04), 1.0 / (0.17 + R), rtol=1e-12)


@pytest.mark.parametrize("budget", [0.04, 0.09, 0.15])
def test_thickness_budget_direct_and_catalogue(case20, budget):
    k, rho, cv, thick, rows = case20
    want = front_of(rows, budget=budget)
    assert as_set(stack_front(k, rho, cv, thick, 3, max_total_thickness=budget)) == want
    cat = stack_catalogue(k, rho, cv, thick, 3, max_total_thickness=0.15)
    assert as_set(cat.front(budget)) == want


def test_four_objectives_with_thickness():
    k, rho, cv, thick = synthetic(10, 5, seed=2)
    rows = brute_force(k, rho, cv, thick, 3)
    names = ("resistance", "mass_per_area", "cost_per_area", "thickness")
    got = stack_front(k, rho, cv, thick, 3, objectives=names)
    assert as_set(got) == front_of(rows, ("R", "m", "c", "L"))


def test_two_objectives_and_fewer_layers():
    k, rho, cv, thick = synthetic(12, 6, seed=3)
    rows = brute_force(k, rho, cv, thick, 2)
    got = stack_front(k, rho, cv, thick, 2, objectives=("resistance", "cost_per_area"))
    assert as_set(got) == front_of(rows, ("R", "c"))


def test_allow_repeat_matches_multiset_brute_force():
    k, rho, cv, thick = synthetic(6, 4, seed=4)
    rows = brute_force(k, rho, cv, thick, 3, allow_repeat=True)
    got = stack_front(k, rho, cv, thick, 3, allow_repeat=True)
    assert as_set(got) == front_of(rows)


def test_enumerate_counts_and_values():
    k, rho, cv, thick = synthetic(5, 3, seed=5)
    s = enumerate_stacks(k, rho, cv, thick, n_layers=2)
    assert len(s) == 15**2
    i = 37
    (m0, m1), (o0, o1) = s.material[i], s.option[i]
    R = k_to_R(k[m0], thick[m0, o0]) + k_to_R(k[m1], thick[m1, o1])
    assert s.resistance[i] == pytest.approx(R, rel=1e-12)
    d = enumerate_stacks(k, rho, cv, thick, n_layers=3, distinct=True)
    assert len(d) == 15 * 12 * 9
    assert (d.material[:, 0] != d.material[:, 1]).all()


def test_ragged_thickness_lists_and_bad_input():
    k = [0.04, 0.2]
    s = stack_front(k, [30.0, 1200.0], [100.0, 900.0], [[0.01, 0.02, 0.03], [0.005]], 2)
    assert np.nanmax(s.thickness_table) == 0.03
    with pytest.raises(ValueError, match="conductivity"):
        stack_front([0.0, 0.1], [1.0, 1.0], [1.0, 1.0], [0.01])
    with pytest.raises(ValueError, match="objectives"):
        stack_front(k, [1.0, 1.0], [1.0, 1.0], [0.01], objectives=("u",))
    with pytest.raises(ValueError, match="max_layers"):
        stack_front(k, [1.0, 1.0], [1.0, 1.0], [0.01], max_layers=4)


def test_service_limits_per_layer():
    # Demo data: a foam limited to 348.15 K (75 °C) and a mineral wool to
    # 873.15 K; temperatures across the layers of a chosen order.
    t_min = np.array([223.15, 223.15])
    t_max = np.array([348.15, 873.15])
    faces = [473.15, 373.15, 293.15]  # hot side first
    bad = check_service_limits([0, 1], faces, t_min, t_max)
    assert bad.ok.tolist() == [False, True]
    assert bad.reasons[0] == "layer 0 (material 0): 473.15 K is above its service limit 348.15 K"
    good = check_service_limits([1, 0], [473.15, 333.15, 293.15], t_min, t_max)
    assert good.all_ok
    cold = check_service_limits([0], [200.0, 260.0], t_min, t_max)
    assert cold.too_cold.tolist() == [True]
    with pytest.raises(ValueError, match="face_temperatures"):
        check_service_limits([0, 1], [300.0, 290.0], t_min, t_max)
