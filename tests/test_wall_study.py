"""The wall-comparison study on the curated tables.

Expected values are computed here independently of the study code, from the
table values and the published relations named beside each check.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from workbench import units
from workbench.materials import load_conductivity_curves, load_materials
from workbench.studies.wall import Candidate, HeatBudget, Layer, WallStudy


@pytest.fixture(scope="module")
def materials():
    return load_materials()


@pytest.fixture(scope="module")
def curves():
    return load_conductivity_curves()


FOAMS = ["eps_20", "xps_35", "pir_32", "glass_wool_32", "cork_board_120", "vip_effective"]


def test_required_thickness_matches_iso6946_hand_sizing(materials):
    """Size each insulant for U = 0.25 W/(m²K), horizontal heat flow.

    ISO 6946:2017 clause 6.7.1/7: R_T = Rsi + d/λ + Rse = 1/U, so
    d = λ (1/U − Rsi − Rse), with Rsi = 0.13 and Rse = 0.04 (Table 7).
    """
    study = WallStudy(FOAMS, materials, t_inside=293.15, t_outside=263.15,
                      budget=HeatBudget("u_value", 0.25))
    got = study.required_thickness()
    lam = materials.loc[FOAMS, "conductivity"].to_numpy()
    assert_allclose(got, lam * (1 / 0.25 - 0.13 - 0.04), rtol=1e-12)
    res = study.results()
    assert_allclose(res["u_value"], 0.25, rtol=1e-12)
    assert res["meets_budget"].all()


def test_power_budget_is_spread_over_the_area(materials):
    a = WallStudy(["pir_32"], materials, t_inside=278.15, t_outside=308.15, area=2.5,
                  budget=HeatBudget("power", 20.0))
    b = WallStudy(["pir_32"], materials, t_inside=278.15, t_outside=308.15,
                  budget=HeatBudget("flux", 8.0))
    assert_allclose(a.required_thickness(), b.required_thickness())
    assert_allclose(abs(a.results()["heat_flow"].iloc[0]), 20.0, rtol=1e-9)


def test_build_up_with_fixed_skins(materials):
    """A steel-skinned foam panel: the skins add resistance, mass and cost (common practice)."""
    panel = Candidate("steel/PIR/steel", (Layer("carbon_steel", 0.0006), Layer("pir_32"),
                                          Layer("carbon_steel", 0.0006)))
    study = WallStudy([panel, "pir_32"], materials, t_inside=293.15, t_outside=263.15,
                      budget=HeatBudget("flux", 6.0))
    res = study.results()
    k_st, k_pir = materials.loc["carbon_steel", "conductivity"], materials.loc["pir_32", "conductivity"]
    r_needed = 30.0 / 6.0
    expected = k_pir * (r_needed - 0.13 - 0.04 - 2 * 0.0006 / k_st)
    assert_allclose(res.loc["steel/PIR/steel", "sized_thickness"], expected, rtol=1e-12)
    rho_st, rho_pir = materials.loc["carbon_steel", "density"], materials.loc["pir_32", "density"]
    assert_allclose(res.loc["steel/PIR/steel", "mass_per_area"], 2 * 0.0006 * rho_st + expected * rho_pir)
    assert res.loc["steel/PIR/steel", "total_thickness"] > res.loc["steel/PIR/steel", "sized_thickness"]


def test_sweep_shape_and_monotonicity(materials):
    study = WallStudy(FOAMS, materials, t_inside=293.15, t_outside=263.15)
    thk = np.linspace(0.005, 0.3, 40)
    dts = np.array([5.0, 20.0, 40.0])
    q = study.sweep(thk, dts)
    assert q.shape == (len(FOAMS), 40, 3)
    assert np.all(np.diff(q, axis=1) < 0)  # more thickness, less flux
    assert np.all(np.diff(q, axis=2) > 0)  # more ΔT, more flux
    # air to air: q = ΔT / (Rsi + L/k + Rse)
    k = materials.loc[FOAMS, "conductivity"].to_numpy()
    assert_allclose(q[:, 7, 1], 20.0 / (0.17 + thk[7] / k), rtol=1e-12)


def test_k_of_t_uses_the_layer_mean_temperature(materials, curves):
    """With a k(T) curve the sized layer's k is the integral mean between its faces.

    Checked against the curve evaluated independently with numpy (trapezoid on a
    fine grid of the piecewise-linear table).
    """
    study = WallStudy(["eps_20"], materials, t_inside=333.15, t_outside=263.15,
                      thickness=0.1, k_curves=curves)
    res = study.results()
    prof = study.temperature_profile("eps_20")
    t_a, t_b = prof["temperature"].iloc[1], prof["temperature"].iloc[2]
    tt, kk = curves["eps_20"]
    grid = np.linspace(t_b, t_a, 20001)
    k_ref = np.trapezoid(np.interp(grid, tt, kk), grid) / (t_a - t_b)
    assert_allclose(res.loc["eps_20", "conductivity"], k_ref, rtol=1e-6)
    assert res.loc["eps_20", "conductivity"] != materials.loc["eps_20", "conductivity"]


def test_service_limit_flags_a_hot_face(materials):
    """EPS is commonly limited to about 75–80 °C continuous (common practice); 120 °C inside fails."""
    study = WallStudy(["eps_20", "stone_wool_140"], materials, t_inside=393.15, t_outside=293.15,
                      thickness=0.05)
    res = study.results()
    assert not res.loc["eps_20", "within_service_limits"]
    assert "above its limit" in res.loc["eps_20", "service_problems"]
    assert res.loc["stone_wool_140", "within_service_limits"]


def test_results_carry_units_and_sources(materials):
    res = WallStudy(FOAMS, materials, budget=HeatBudget("flux", 10.0)).results()
    units_ = res.attrs["units"]
    for col in ("sized_thickness", "conductivity", "u_value", "heat_flux", "mass_per_area", "cost_per_area"):
        assert col in units_
    assert res["conductivity_source"].str.len().min() > 3
    assert res.attrs["assumptions"]


@settings(max_examples=40, deadline=None)
@given(
    st.floats(-20.0, 60.0), st.floats(-30.0, 50.0), st.floats(0.5, 30.0), st.floats(0.2, 5.0),
)
def test_us_customary_inputs_give_the_same_si_answer(t_in_c, t_out_c, budget_si, area_si):
    """The same wall entered in US customary units gives the same SI answer to 1e-9.

    Conversion factors are those of NIST SP 811 (2008), Appendix B.8/B.9.
    """
    if abs(t_in_c - t_out_c) < 0.5:
        return
    materials = load_materials()
    si = WallStudy(FOAMS, materials, t_inside=t_in_c + 273.15, t_outside=t_out_c + 273.15,
                   area=area_si, budget=HeatBudget("flux", budget_si))
    f = lambda c: c * 9 / 5 + 32  # noqa: E731  (°F from °C)
    # 1 Btu_IT/(h·ft²) = 1055.05585262 J / 3600 s / 0.09290304 m² (exact definitions of the
    # IT Btu, the hour and the foot: NIST SP 811, 2008, Appendix B.8 gives 3.154591 W/m²)
    w_per_m2_per_btu_h_ft2 = 1055.05585262 / 3600.0 / 0.09290304
    assert abs(w_per_m2_per_btu_h_ft2 - 3.154591) < 5e-7
    budget_us = budget_si / w_per_m2_per_btu_h_ft2
    us = WallStudy(
        FOAMS, materials,
        t_inside=units.parse(f"{f(t_in_c)!r} °F", "temperature", "inside temperature"),
        t_outside=units.parse(f"{f(t_out_c)!r} degF", "temperature", "outside temperature"),
        area=units.parse(f"{area_si / 0.09290304!r} ft^2", "area", "area"),
        budget=HeatBudget("flux", units.parse(f"{budget_us!r} Btu/(h*ft^2)", "heat_flux", "heat budget")),
    )
    assert_allclose(us.required_thickness(), si.required_thickness(), rtol=1e-9)
    assert_allclose(us.results()["heat_flow"], si.results()["heat_flow"], rtol=1e-9)


@pytest.mark.parametrize(
    "kwargs, match",
    [
        (dict(candidates=[]), "candidates"),
        (dict(candidates=["unobtainium"]), "unknown material"),
        (dict(candidates=["eps_20"], area=0.0), "area"),
        (dict(candidates=["eps_20"], t_inside=float("nan")), "t_inside"),
        (dict(candidates=["eps_20"], thickness=-0.01), "thickness"),
        (dict(candidates=["eps_20", "eps_20"]), "duplicate"),
    ],
)
def test_bad_study_input(materials, kwargs, match):
    with pytest.raises(ValueError, match=match):
        WallStudy(materials=materials, **kwargs)


def test_candidate_needs_exactly_one_sized_layer():
    with pytest.raises(ValueError, match="exactly one"):
        Candidate("two sized", (Layer("eps_20"), Layer("pir_32")))


def test_bad_budget():
    with pytest.raises(ValueError, match="budget kind"):
        HeatBudget("watts", 3.0)
    with pytest.raises(ValueError, match="heat budget"):
        HeatBudget("flux", -1.0)


# ---------------------------------------------------------------------------
# Trade-offs at the study level
# ---------------------------------------------------------------------------


def _brute_front(values):
    """O(n²) dominance check (all minimised), written independently of the engine."""
    n = len(values)
    keep = np.ones(n, bool)
    for i in range(n):
        for j in range(n):
            if np.all(values[j] <= values[i]) and np.any(values[j] < values[i]):
                keep[i] = False
    return keep


@pytest.fixture(scope="module")
def sized(materials, curves):
    return WallStudy(FOAMS,
                     materials, t_inside=277.15, t_outside=305.15, budget=HeatBudget("flux", 8.0),
                     max_thickness=0.125, k_curves=curves)


def test_ranking_front_matches_brute_force_and_shares_sum_to_one(sized):
    table = sized.ranking()
    feasible = table[table["feasible"]]
    values = feasible[["total_thickness", "mass_per_area", "cost_per_area"]].to_numpy()
    assert_allclose(feasible["pareto"].to_numpy(), _brute_front(values))
    assert feasible["share_first"].sum() == pytest.approx(1.0)
    excluded = table[~table["feasible"]]
    assert "cork_board_120" in excluded.index
    assert "exceeds the maximum" in excluded.loc["cork_board_120", "excluded_because"]
    assert table.attrs["units"]["mass_per_area"] == "kg/m²"
    assert (feasible["best_rank"] <= feasible["rank"]).all() and (feasible["rank"] <= feasible["worst_rank"]).all()


def test_mass_index_orders_candidates_like_their_mass(sized):
    """Ashby, Materials Selection in Mechanical Design, 4th ed.: for a wall of prescribed
    resistance, m/A = ρ·R·k, so ranking by ρ·k ranks by mass (here with films in series the
    sized layer's R is the same for every candidate, so the order is preserved exactly)."""
    idx = sized.material_indices()
    res = sized.results()
    assert list(idx["mass_index"].sort_values().index) == list(res["mass_per_area"].sort_values().index)
    k = res["conductivity"].to_numpy()
    assert_allclose(idx["thickness_index"], k)


def test_monte_carlo_with_zero_tolerance_equals_the_deterministic_answer(sized):
    mc = sized.uncertainty(n_samples=200, seed=3, tolerance_override=0.0)
    res = sized.results()
    for p in ("p10", "p50", "p90"):
        assert_allclose(mc[f"total_thickness_{p}"], res["total_thickness"], rtol=1e-12)
        assert_allclose(mc[f"mass_per_area_{p}"], res["mass_per_area"], rtol=1e-12)


def test_monte_carlo_is_seeded_and_states_its_sample(sized):
    a = sized.uncertainty(n_samples=500, seed=7)
    b = sized.uncertainty(n_samples=500, seed=7)
    assert a.equals(b)
    assert a.attrs["n_samples"] == 500
    # sized exactly to the budget, the nominal design meets it about half the time
    assert ((a["p_meets_budget"] - 0.5).abs() < 4 * a["p_meets_budget_se"] + 0.02).all()
    assert_allclose(a[["p_thinnest", "p_lightest", "p_cheapest"]].sum(), 1.0)


def test_ranking_rejects_unknown_criteria(sized):
    with pytest.raises(ValueError, match="criteria"):
        sized.ranking({"sparkle": "maximise"})
    with pytest.raises(ValueError, match="weights"):
        sized.ranking(weights=[1.0, 2.0])
