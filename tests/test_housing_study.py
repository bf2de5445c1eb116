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
    # the code differentiates the surface balance implicitly (no extra solve); a central
    # difference of two independent solves converges to that derivative as O(d²)
    d = 1e-3
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
    # one row per material class and tabulated contact duration (every class has the same ones)
    per_class = frame.groupby("material_class")["contact_duration"].apply(frozenset)
    assert len(per_class) == 5 and len(set(per_class)) == 1
    assert {60.0, 600.0, 28800.0} <= set(per_class.iloc[0])
    assert len(frame) == 5 * len(per_class.iloc[0])


# ----------------------------------------------------------------- warm-up in the study
def test_time_to_touch_limit_matches_the_warm_up(materials):
    from workbench.housing import housing_warm_up

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        s = make(materials, power=8.0, session_duration=3600.0, content_heat_capacity=150.0)
        r = s.results()
    a = s._arrays()
    caps = s.heat_capacities()
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        w = housing_warm_up(
            s.length,
            s.width,
            s.height,
            a["t"],
            a["k"],
            a["eps"],
            s.power,
            s.t_ambient,
            caps,
            3600.0,
            s.mounting,
        )
    expect = w.time_to_limit(r["touch_limit"].to_numpy())
    assert_allclose(r["time_to_touch_limit"].to_numpy(), expect)
    # a candidate whose steady surface stays below its limit never reaches it
    below = r["t_surface"] < r["touch_limit"]
    assert np.all(np.isinf(r.loc[below, "time_to_touch_limit"]))
    assert np.isfinite(r["time_to_touch_limit"]).any()
    assert r.attrs["units"]["time_to_touch_limit"] == "s"
    assert_allclose(r["t_surface_session_end"], w.t_surface[:, -1])


def test_heat_capacity_is_shell_mass_times_specific_heat_plus_contents(materials):
    s = make(materials, content_heat_capacity=120.0)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        r = s.results()
    cp = materials.loc[[c.material for c in s.candidates], "specific_heat"].to_numpy()
    assert_allclose(r["heat_capacity"].to_numpy(), r["mass"].to_numpy() * cp + 120.0, rtol=1e-12)


def test_warm_up_frame_long_format_with_limits_and_cautions(materials):
    s = make(materials, session_duration=600.0)
    f = s.warm_up_frame()
    assert set(f["candidate"]) == set(s.names)
    assert f["time"].max() == pytest.approx(600.0) and f["time"].min() == 0.0
    assert (f["t_surface"] >= s.t_ambient - 1e-9).all()
    assert set(f.attrs["time_to_touch_limit"]) == set(s.names)
    assert any("product standard" in c for c in f.attrs["cautions"])
    assert f.attrs["units"]["time"] == "s"


@pytest.mark.parametrize(
    "field, value",
    [
        ("session_duration", 0.0),
        ("session_duration", 30 * 86400.0),
        ("content_heat_capacity", -1.0),
        ("content_heat_capacity", float("nan")),
    ],
)
def test_bad_session_inputs_name_the_field(materials, field, value):
    with pytest.raises(ValueError, match=field):
        make(materials, **{field: value})


@pytest.mark.parametrize(
    "material, finish, expected",
    [
        ("aluminium_6063_t6_anodised", None, "metal-coated"),  # anodised row, no finish set
        ("aluminium_6063_t6", "aluminium_anodised", "metal-coated"),  # finishes table: coated
        ("carbon_steel", "paint", "metal-coated"),
        ("aluminium_6063_t6", None, "metal-uncoated"),  # mill finish, untreated
        ("aluminium_6063_t6", "aluminium_bare", "metal-uncoated"),
        ("abs", None, "plastic"),  # "moulded, unpainted" is no coating, and a plastic anyway
        ("pc", "plastic_metallised", "plastic"),
    ],
)
def test_touch_class_follows_the_finish(materials, material, finish, expected):
    s = make(materials, candidates=[C(material, 0.002, finish)], component=None)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        assert s.results()["touch_class"].iloc[0] == expected


def test_finish_text_coating_words():
    from workbench.studies.housing import finish_text_is_coating

    assert finish_text_is_coating("anodised (clear or dark)")
    assert finish_text_is_coating("Anodized, black")
    assert finish_text_is_coating("powder-coated")
    assert finish_text_is_coating("painted")
    assert not finish_text_is_coating("moulded, unpainted")
    assert not finish_text_is_coating("mill finish, untreated")
    assert not finish_text_is_coating(float("nan"))


def test_scenario_round_trip_keeps_the_session_inputs(materials):
    from workbench.scenario import study_kind

    kind = study_kind("housing")
    s = make(materials, session_duration=1500.0, content_heat_capacity=250.0)
    inputs, _ = kind.read_back(s)
    from workbench.units import parse

    assert parse(inputs["session_duration"], "time", "session_duration") == pytest.approx(1500.0)
    assert parse(inputs["content_heat_capacity"], "heat_capacity", "content_heat_capacity") == (
        pytest.approx(250.0)
    )
    names = [i.name for i in kind.inputs]
    assert "session_duration" in names and "content_heat_capacity" in names
    spec = kind.input_spec("content_heat_capacity")
    assert spec.kind == "heat_capacity" and spec.default == "100 J/K"
    assert kind.input_spec("session_duration").default == "20 min"
