"""The housing study: results frame, verdicts, sensitivity, finishes and their sources."""

from __future__ import annotations

import warnings

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from workbench._checks import ValidityWarning
from workbench.housing import solve_housing
from workbench.materials import load_materials
from workbench.studies.housing import (
    HOUSING_CAUTIONS,
    Component,
    HousingCandidate,
    HousingStudy,
    load_finishes,
)
from workbench.touch import load_touch_limits

C = HousingCandidate


@pytest.fixture(scope="module")
def materials():
    return load_materials()


def make(materials, **kw):
    # demo enclosure: 180 × 120 × 50 mm, 4 W, on a table in a 35 °C room
    args = dict(
        candidates=[
            C("aluminium_6063_t6", 0.002, "aluminium_bare"),
            C("aluminium_6063_t6", 0.002, "aluminium_anodised"),
            C("carbon_steel", 0.001, "paint"),
            C("abs", 0.0025, "plastic_matte"),
            C("pc", 0.0025, "plastic_metallised"),
            C("pa6_tc_filled", 0.0025, "plastic_matte"),
        ],
        materials=materials,
        length=0.18,
        width=0.12,
        height=0.05,
        power=4.0,
        t_ambient=308.15,
        mounting="on-table",
        t_inside_max=343.15,
        component=Component(0.03, 0.03, 1.0),
        contact_duration=600.0,
    )
    args.update(kw)
    return HousingStudy(**args)


@pytest.fixture(scope="module")
def results(materials):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        return make(materials).results()


def test_results_carry_units_sources_and_cautions(results):
    units = results.attrs["units"]
    for col in (
        "t_air_inside",
        "t_surface",
        "t_hot_spot",
        "mass",
        "cost",
        "margin_hot_spot",
        "dt_surface_d_emissivity",
    ):
        assert col in results.columns and col in units
    assert units["t_surface"] == "K" and units["mass"] == "kg"
    assert results["emissivity_source"].str.len().min() > 0
    assert results["touch_limit_source"].str.contains("13732").all()
    assert results.attrs["cautions"] == HOUSING_CAUTIONS
    text = " ".join(results.attrs["cautions"]).lower()
    assert "product standard" in text and "testing" in text and "first-order" in text


def test_same_emissivity_same_mean_surface_whatever_the_conductivity(materials):
    # The outer balance depends on area, films and emissivity only: ABS and
    # aluminium painted alike (ε 0.90) have the same mean surface temperature,
    # but very different hot spots.
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        r = make(
            materials, candidates=[C("aluminium_6063_t6", 0.002, "paint"), C("abs", 0.002, "paint")]
        ).results()
    assert_allclose(r["t_surface"].iloc[0], r["t_surface"].iloc[1], atol=1e-6)
    assert r["hot_spot_rise"].iloc[1] > 30 * r["hot_spot_rise"].iloc[0]
    assert r["spreading_length"].iloc[1] < 0.01 < r["spreading_length"].iloc[0]


def test_verdicts_follow_margins_and_limits(results):
    for name, row in results.iterrows():
        fails = (
            row["margin_surface"] < 0 or row["margin_hot_spot"] < 0 or row["t_air_inside"] > 343.15
        )
        if row["passes"]:
            assert not fails and row["why_not"] == "", name
        else:
            assert row["why_not"], name
    # the bare plastics cannot take a bonded 1 W component (hot spot far above 48 °C)
    assert not results.loc["abs 2.5 mm plastic_matte", "passes"]
    assert "hot spot" in results.loc["abs 2.5 mm plastic_matte", "why_not"]
    assert results.loc["aluminium_6063_t6 2 mm aluminium_anodised", "passes"]


def test_touch_limit_is_the_iso_value_for_the_class(results):
    # ISO 13732-1:2006 Table 2 (from memory): 10 min contact, 48 °C for all materials
    assert_allclose(results["touch_limit_degC"], 48.0)
    assert set(results["touch_class"]) == {"metal-uncoated", "metal-coated", "plastic"}
    assert_allclose(results["margin_surface"], results["touch_limit"] - results["t_surface"])


def test_product_standard_limit_changes_the_verdict(materials):
    lim = load_touch_limits().with_limit("plastic", 600.0, 200.0 + 273.15, "demo product limit")
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        r = make(
            materials, touch_limits=lim, candidates=[C("pa6_tc_filled", 0.0025, "plastic_matte")]
        ).results()
    assert_allclose(r["touch_limit_degC"], 200.0)
    assert r["touch_limit_source"].iloc[0] == "demo product limit"


def test_emissivity_sensitivity_matches_two_independent_solves(materials, results):
    study = make(materials)
    eps = results["emissivity"].to_numpy()
    d = 0.02
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        lo = solve_housing(
            0.18, 0.12, 0.05, 0.002, 100.0, np.clip(eps - d, 0, 1), 4.0, 308.15, "on-table"
        )
        hi = solve_housing(
            0.18, 0.12, 0.05, 0.002, 100.0, np.clip(eps + d, 0, 1), 4.0, 308.15, "on-table"
        )
    expected = (hi.t_surface - lo.t_surface) / (np.clip(eps + d, 0, 1) - np.clip(eps - d, 0, 1))
    assert_allclose(results["dt_surface_d_emissivity"], expected, rtol=1e-5)
    assert (results["dt_surface_d_emissivity"] < 0).all()
    # a low-emissivity finish is much more sensitive than a painted one
    s = results["dt_surface_d_emissivity"]
    assert s["aluminium_6063_t6 2 mm aluminium_bare"] < 2 * s["carbon_steel 1 mm paint"]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        sweep = study.emissivity_sweep([0.1, 0.9])
    first = sweep[sweep["candidate"] == study.names[0]]["t_surface"].to_numpy()
    assert first[0] > first[1]


def test_mass_is_density_times_shell_volume(results, materials):
    t = 0.002
    shell = 0.18 * 0.12 * 0.05 - (0.18 - 2 * t) * (0.12 - 2 * t) * (0.05 - 2 * t)
    rho = materials.loc["aluminium_6063_t6", "density"]
    assert_allclose(results.loc["aluminium_6063_t6 2 mm aluminium_bare", "mass"], rho * shell)


def test_pareto_rows_are_not_dominated(results):
    obj = results[["t_air_inside", "t_hot_spot", "mass", "cost"]].to_numpy()
    front = results["pareto"].to_numpy()
    assert front.any()
    for i in np.flatnonzero(front):
        dominated = np.all(obj <= obj[i], axis=1) & np.any(obj < obj[i], axis=1)
        assert not dominated.any()


def test_power_sweep_is_monotonic(materials):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        sw = make(materials).power_sweep([1.0, 2.0, 4.0, 8.0])
    for _, g in sw.groupby("candidate"):
        assert np.all(np.diff(g["t_surface"]) > 0)
        assert np.all(np.diff(g["t_hot_spot"]) > 0)


def test_validity_warnings_are_reported_not_silent(materials):
    study = make(
        materials,
        length=0.03,
        width=0.03,
        height=0.015,
        power=0.02,
        component=Component(0.005, 0.005, 0.01),
    )
    with pytest.warns(ValidityWarning, match="housing study"):
        r = study.results()
    assert r.attrs["validity_warnings"]


def test_finishes_have_sources_and_recalled_values():
    f = load_finishes()
    assert f["emissivity_source"].str.len().min() > 0
    assert ((f["emissivity"] > 0) & (f["emissivity"] <= 1)).all()
    # Incropera 7th ed., Table A.11 (from memory): anodised aluminium 0.82,
    # highly polished aluminium about 0.05, non-metallic paints about 0.9
    assert f.loc["aluminium_anodised", "emissivity"] == pytest.approx(0.82)
    assert f.loc["aluminium_polished", "emissivity"] == pytest.approx(0.05, abs=0.02)
    assert f.loc["paint", "emissivity"] == pytest.approx(0.9, abs=0.05)
    assert "recalled from memory" in f.loc["aluminium_anodised", "emissivity_source"]


def test_user_finish_file_and_bad_rows(tmp_path):
    good = tmp_path / "f.csv"
    good.write_text(
        "id,name,applies_to,emissivity,emissivity_source,coated,note\n"
        "black_anodise,Black anodise (supplier sheet),metal,0.88,demo,yes,\n"
    )
    f = load_finishes(good)
    assert f.loc["black_anodise", "emissivity"] == 0.88 and "paint" in f.index
    bad = tmp_path / "b.csv"
    bad.write_text(
        "id,name,applies_to,emissivity,emissivity_source,coated,note\nx,X,metal,1.5,demo,yes,\n"
    )
    with pytest.raises(ValueError, match=r"b.csv:2.*emissivity"):
        load_finishes(bad)


@pytest.mark.parametrize(
    "kw, field",
    [
        (dict(candidates=[C("unobtainium", 0.002, "paint")]), "unknown material"),
        (dict(candidates=[C("abs", 0.002, "glitter")]), "finish.*valid"),
        (dict(candidates=[C("abs", 0.002, "aluminium_anodised")]), "finish.*applies to"),
        (dict(candidates=[]), "candidates"),
        (dict(mounting="ceiling"), "mounting"),
        (dict(power=-1.0), "power"),
        (dict(component=Component(0.03, 0.03, 9.0)), "component power"),
        (dict(contact_duration=0.0), "contact_duration"),
        (dict(candidates=[C("abs", 0.002, "paint"), C("abs", 0.002, "paint")]), "duplicate"),
    ],
)
def test_bad_study_inputs(materials, kw, field):
    with pytest.raises(ValueError, match=field):
        make(materials, **kw)


def test_bad_candidate_thickness():
    with pytest.raises(ValueError, match="thickness"):
        C("abs", -0.002, "paint")


def test_touch_limits_frame(materials):
    frame = make(materials).touch_limits_frame()
    assert isinstance(frame, pd.DataFrame)
    assert frame.attrs["units"]["limit_degC"] == "°C"
    assert len(frame) == 15
