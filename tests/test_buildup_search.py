"""Tests of WallStudy.buildup_search and the cancel/progress hooks of stack_front.

Oracles: per-layer resistance L/k from the ``ht`` library (test-only reference,
``ht.conduction.k_to_R``); resistances in series add and U = 1/(R_si + ΣR + R_se)
(Bergman et al., Fundamentals of Heat and Mass Transfer, 7th ed. 2011, §3.1;
ISO 6946:2017 clause 6.7 — clause number from memory); the non-dominated set of an
independent brute-force enumeration written here, sieved with ``paretoset``
(PyPI, test-only oracle).
"""

from __future__ import annotations

from itertools import combinations, product

import numpy as np
import pytest
from ht.conduction import k_to_R
from numpy.testing import assert_allclose
from paretoset import paretoset

from workbench._checks import Cancelled
from workbench.materials import load_materials
from workbench.stacks import stack_front
from workbench.studies.wall import HeatBudget, WallStudy

IDS = ["eps_20", "pir_32", "glass_wool_32", "xps_35", "phenolic_35"]


@pytest.fixture(scope="module")
def study():
    return WallStudy(candidates=IDS, materials=load_materials(), t_inside=276.15, t_outside=298.15,
                     area=1.0, budget=HeatBudget("flux", 8.0), max_thickness=0.08)


def _brute(study, opts):
    m = study.materials.loc[IDS]
    k, rho, cv = (m[c].to_numpy(float) for c in ("conductivity", "density", "cost_per_volume"))
    rows = []
    for n in (1, 2, 3):
        for mats in combinations(range(len(IDS)), n):
            for ts in product(opts, repeat=n):
                if sum(ts) > study.max_thickness + 1e-12:
                    continue
                r = sum(k_to_R(k[j], t) for j, t in zip(mats, ts, strict=True))
                rows.append((tuple(IDS[j] for j in mats), tuple(round(t, 6) for t in ts), r,
                             sum(rho[j] * t for j, t in zip(mats, ts, strict=True)),
                             sum(cv[j] * t for j, t in zip(mats, ts, strict=True))))
    v = np.array([r[2:] for r in rows])
    mask = paretoset(np.column_stack([-v[:, 0], v[:, 1], v[:, 2]]), sense=["min"] * 3, distinct=False)
    return [r for r, keep in zip(rows, mask, strict=True) if keep]


def test_front_equals_brute_force_and_u_value_follows_series_resistances(study):
    opts = np.arange(1, 9) * 0.01
    frame = study.buildup_search(thickness_options=opts)
    expected = _brute(study, opts)
    got = {(mats, tuple(round(t, 6) for t in ts)) for mats, ts in zip(frame["materials"], frame["layer_thickness"],
                                                                        strict=True)}
    assert got == {(r[0], r[1]) for r in expected}
    by_key = {(r[0], r[1]): r for r in expected}
    for _, row in frame.iterrows():
        r = by_key[(row["materials"], tuple(round(t, 6) for t in row["layer_thickness"]))]
        assert_allclose([row["resistance"], row["mass_per_area"], row["cost_per_area"]], r[2:], rtol=1e-12)
        u = 1.0 / (0.13 + r[2] + 0.04)  # R_si, R_se: ISO 6946:2017 Table 7 horizontal flow (from memory)
        assert_allclose(row["u_value"], u, rtol=1e-12)
        assert_allclose(row["heat_flux"], u * 22.0, rtol=1e-12)
        assert row["meets_budget"] == (u * 22.0 <= 8.0 * (1 + 1e-9))
        assert_allclose(row["total_thickness"], sum(row["layer_thickness"]), rtol=1e-12)
        assert row["layers"] == len(row["materials"])


def test_order_puts_budget_meeting_build_ups_first_cheapest_first(study):
    frame = study.buildup_search()
    ok = frame["meets_budget"].to_numpy()
    assert ok.any() and not ok[np.argmin(ok):].any()  # all True rows before any False row
    cost = frame.loc[ok, "cost_per_area"].to_numpy()
    assert np.all(np.diff(cost) >= 0)
    assert (frame["total_thickness"] <= study.max_thickness + 1e-12).all()
    assert frame.attrs["units"]["u_value"] == "W/(m²·K)"
    # default options: 5 mm steps up to the 80 mm limit -> 16 options, 5 materials, up to 3 layers
    assert frame.attrs["n_stacks"] == 5 * 16 + 10 * 16**2 + 10 * 16**3


def test_progress_reaches_one_and_cancel_raises():
    k = np.array([0.03, 0.04, 0.2, 0.035])
    rho, cv = np.array([20.0, 30.0, 600.0, 35.0]), np.array([80.0, 120.0, 500.0, 90.0])
    seen = []
    stack_front(k, rho, cv, [0.01, 0.02, 0.03], progress=seen.append)
    assert seen == sorted(seen) and seen[-1] == 1.0 and len(seen) >= 4
    calls = []
    with pytest.raises(Cancelled, match="after 2 of 4 materials"):
        stack_front(k, rho, cv, [0.01, 0.02], cancel=lambda: calls.append(1) or len(calls) > 2)


def test_bad_input_names_the_field(study):
    with pytest.raises(ValueError, match=r"thickness_options.*m"):
        study.buildup_search(thickness_options=[0.01, -0.02])
    with pytest.raises(ValueError, match="max_layers"):
        study.buildup_search(max_layers=4)
