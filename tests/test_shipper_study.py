"""Shipper study: sizing, box, cost and cautions, checked against the core
functions and hand calculations (not against the study's own output)."""

from __future__ import annotations

import numpy as np
import pytest

from workbench.air_layers import AirLayer
from workbench.freight import billable_mass, round_up_mass
from workbench.geometry import VacuumPanel, layered_box_conductance
from workbench.materials import load_materials
from workbench.studies.shipper import (
    GENERAL_CAUTIONS,
    ShipperCandidate,
    ShipperStudy,
    cost_figure,
    hold_figure,
)
from workbench.studies.wall import Layer
from workbench.transient import hold_time

T0 = 273.15
PROFILE = (
    np.array([0.0, 8.0, 14.0, 24.0, 32.0, 38.0]) * 3600.0,
    np.array([24.0, 31.0, 27.0, 24.0, 31.0, 27.0]) + T0,
)


@pytest.fixture(scope="module")
def materials():
    return load_materials()


def _cands():
    return [
        ShipperCandidate("EPS", (Layer("eps_20"), Layer("corrugated_single_wall", 0.004))),
        ShipperCandidate("PIR", (Layer("pir_32"), Layer("corrugated_single_wall", 0.004))),
        ShipperCandidate(
            "EPS + foil gap", (Layer("eps_20"), AirLayer(0.01, "horizontal", 0.05, 0.05))
        ),
        ShipperCandidate(
            "VIP + EPS", (VacuumPanel(0.02, 0.0042, 0.4, 0.3, 0.008), Layer("eps_20"))
        ),
    ]


@pytest.fixture(scope="module")
def study(materials):
    return ShipperStudy(
        _cands(),
        materials,
        t_ambient=PROFILE,
        duration=36 * 3600.0,
        thicknesses=np.array([0.02, 0.04, 0.06, 0.08]),
    )


@pytest.fixture(scope="module")
def results(study):
    return study.results()


def test_sweep_shape_and_units(results):
    sw = results.sweep
    assert len(sw) == 16
    assert sw.attrs["units"]["landed_cost"] == "EUR"
    assert sw.attrs["units"]["hold_time_simulated"] == "s"


def test_coolant_sized_to_the_target_with_safety_factor(study, results):
    # hold_time (closed form) of each sized design = safety factor x duration
    sw = results.sweep
    row = study.coolant_row
    t = hold_time(
        sw["conductance"].to_numpy(),
        PROFILE,
        sw["coolant_mass"].to_numpy() / 1.2,
        row["latent_heat"],
        row["t_phase_change"],
        study.payload_heat_capacity,
        study.t_payload_start,
    )
    np.testing.assert_allclose(t, 36 * 3600.0, rtol=1e-6)


def test_conductance_from_geometry(study, results):
    # EPS at 40 mm: inner box = payload + 2 x coolant layer; films 0.13 both sides
    r = results.sweep.set_index(["candidate", "thickness"]).loc[("EPS", 0.04)]
    a = study.payload_length + 2 * r["coolant_layer"]
    b = study.payload_width + 2 * r["coolant_layer"]
    c = study.payload_height + 2 * r["coolant_layer"]
    k = study.materials.loc[["eps_20", "corrugated_single_wall"], "conductivity"].to_numpy()
    g = layered_box_conductance(a, b, c, [0.04, 0.004], k, 0.13, 0.13).total
    assert r["conductance"] == pytest.approx(float(g), rel=1e-9)
    # outer dims and billable mass by hand
    lo = study.payload_length + 2 * (r["coolant_layer"] + 0.044)
    assert r["outer_length"] == pytest.approx(lo, rel=1e-12)
    bill = round_up_mass(
        billable_mass(
            r["outer_length"], r["outer_width"], r["outer_height"], r["actual_mass"], study.divisor
        ),
        study.mass_increment,
    )
    assert r["billable_mass"] == pytest.approx(bill)
    assert r["landed_cost"] == pytest.approx(
        r["packaging_cost"]
        + r["coolant_cost"]
        + study.rate_per_kg * r["billable_mass"]
        + study.fixed_fee
    )


def test_more_insulation_less_coolant(results):
    for _, grp in results.sweep.groupby("candidate"):
        assert np.all(np.diff(grp["coolant_mass"].to_numpy()) < 0)
        assert np.all(np.diff(grp["conductance"].to_numpy()) < 0)


def test_foil_faced_gap_and_vip_help(results):
    sw = results.sweep.set_index(["candidate", "thickness"])
    assert sw.loc[("EPS + foil gap", 0.04), "conductance"] < sw.loc[("EPS", 0.04), "conductance"]
    assert sw.loc[("VIP + EPS", 0.04), "conductance"] < sw.loc[("EPS", 0.04), "conductance"]


def test_optimum_is_cheapest_that_meets_target(results):
    sw, opt = results.sweep, results.optimum
    for name in opt.index:
        ok = sw[(sw["candidate"] == name) & sw["meets_target"]]
        if ok.empty:
            assert not opt.loc[name, "meets_target"]
            continue
        assert opt.loc[name, "landed_cost"] == pytest.approx(ok["landed_cost"].min())
        assert opt.loc[name, "hold_time_simulated"] >= 36 * 3600.0 * (1 - 1e-9)


def test_cautions_always_include_testing(results):
    assert GENERAL_CAUTIONS[0] in results.cautions
    assert any("demo" in c for c in results.cautions)


def test_ice_with_2_8_payload_warns_of_freezing(materials):
    s = ShipperStudy(
        _cands()[:1],
        materials,
        coolant="water_ice",
        t_ambient=PROFILE,
        thicknesses=np.array([0.04]),
        duration=24 * 3600.0,
    )
    r = s.results()
    assert any("risk of freezing the payload" in c for c in r.cautions)
    # with the packs at 0 °C, the 2 °C limit is crossed in the simulation
    assert r.sweep["end_reason"].iloc[0] == "payload too cold"


def test_dry_ice_warns_of_gas_and_dangerous_goods(materials):
    s = ShipperStudy(
        _cands()[:1],
        materials,
        coolant="dry_ice",
        t_payload_min=None,
        t_payload_max=T0 - 15,
        t_payload_start=T0 - 25,
        t_ambient=PROFILE,
        thicknesses=np.array([0.05]),
        duration=24 * 3600.0,
    )
    text = " ".join(s.results().cautions)
    assert "gas-tight" in text and "UN 1845" in text


def test_hold_curve_monotone_and_thickness_for_target(study):
    curve = study.hold_curve(coolant_mass=3.0)
    for _, grp in curve.groupby("candidate"):
        assert np.all(np.diff(grp["hold_time_closed_form"].to_numpy()) > 0)
    th = study.thickness_for_target(coolant_mass=3.0)
    assert set(th.index) == set(study.names)
    # at the found thickness the closed-form hold equals the target (where found)
    eps = th["EPS"]
    if np.isfinite(eps):
        one = ShipperStudy(
            _cands()[:1],
            study.materials,
            t_ambient=PROFILE,
            duration=36 * 3600.0,
            thicknesses=np.array([eps]),
        )
        assert float(one.hold_curve(3.0)["hold_time_closed_form"].iloc[0]) == pytest.approx(
            36 * 3600.0, rel=1e-4
        )


def test_design_run_and_figures(study, results):
    run = study.design_run("PIR", 0.04)
    assert {"time", "payload_temperature", "coolant_fraction_left"} <= set(run.columns)
    assert run.attrs["end_reason"] in (
        "coolant spent",
        "payload too warm",
        "payload too cold",
        "held for the whole run",
    )
    fig = cost_figure(results)
    assert any(tr.name == "cheapest that holds" for tr in fig.data)
    assert "[mm]" in fig.layout.xaxis.title.text
    hold_figure(run, study.t_payload_min, study.t_payload_max)


@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"coolant": "snow"}, "coolant"),
        ({"t_payload_min": T0 + 8, "t_payload_max": T0 + 2}, "t_payload_min"),
        ({"payload_mass": -1.0}, "payload_mass"),
        ({"thicknesses": np.array([0.0, 0.02])}, "thicknesses"),
        ({"safety_factor": 0.8}, "safety_factor"),
        ({"t_ambient": ([0.0, 10.0, 5.0], [300.0, 300.0, 300.0])}, "times_s"),
    ],
)
def test_bad_inputs_name_the_field(materials, kwargs, field):
    with pytest.raises(ValueError, match=field):
        ShipperStudy(_cands(), materials, **kwargs)


@pytest.mark.parametrize(
    ("kwargs", "pattern"),
    [
        ({"duration": 0.0}, r"duration: must be > 0 in s"),
        ({"duration": float("nan")}, r"duration: must be finite in s"),
        ({"duration": [3600.0, 7200.0]}, r"duration: expected one number \[s\]"),
        ({"duration": True}, r"duration: expected a number in s, got a boolean"),
        ({"safety_factor": float("inf")}, r"safety_factor: must be finite"),
        ({"safety_factor": 20.0}, r"safety_factor: must lie in \[1, 10\] \[-\]"),
        ({"coolant_packing_fraction": 0.0}, r"coolant_packing_fraction: must lie in \(0, 1\]"),
        ({"coolant_packing_fraction": 1.5}, r"coolant_packing_fraction: must lie in \(0, 1\]"),
        ({"time_step": 0.0}, r"time_step: must be > 0 in s"),
        ({"time_step": -60.0}, r"time_step: must be > 0 in s"),
        ({"t_payload_min": T0 + 8, "t_payload_max": T0 + 8}, r"t_payload_min, t_payload_max"),
        ({"t_payload_min": 2.0, "t_payload_max": 8.0}, r"t_payload_min: must lie in .*kelvin"),
        ({"t_coolant_start": "5 °C"}, r"t_coolant_start: expected a number in K, got the text"),
        (
            {"t_ambient": ([0.0, 3600.0, 3600.0], [300.0, 290.0, 295.0])},
            r"t_ambient times_s: row 2 .*repeats row 1",
        ),
        (
            {"t_ambient": [[0.0, 300.0], [7200.0, 290.0], [3600.0, 295.0]]},
            r"t_ambient times_s: row 2 .*earlier than row 1",
        ),
        ({"rate_per_kg": -1.0}, r"rate_per_kg: must be >= 0 in currency/kg"),
        ({"fixed_fee": float("nan")}, r"fixed_fee: must be finite in currency"),
        ({"fixed_fee": None}, r"fixed_fee: expected a number in currency, got None"),
        ({"thicknesses": []}, r"thicknesses: expected a list of one or more"),
        ({"time_step": 0.1}, r"time_step: the study simulates up to 2 × duration .*MAX_STEPS"),
        (
            {"thicknesses": np.linspace(0.01, 0.1, 60_000), "time_step": 60.0},
            r"thicknesses: 4 candidates × 60000 thicknesses .*MAX_CELLS",
        ),
        ({"t_ambient": T0 + 2.0}, r"t_ambient: never above the coolant's phase change"),
    ],
)
def test_constructor_refuses_before_computing(materials, kwargs, pattern):
    import time

    t0 = time.perf_counter()
    with pytest.raises((ValueError, TypeError), match=pattern):
        ShipperStudy(_cands(), materials, **kwargs)
    assert time.perf_counter() - t0 < 2.0


def test_constructor_reads_rows_and_columns_alike(materials):
    rows = ShipperStudy(_cands(), materials, t_ambient=[[0.0, 303.15], [3600.0, 293.15]])
    cols = ShipperStudy(_cands(), materials, t_ambient=([0.0, 3600.0], [303.15, 293.15]))
    assert rows.t_ambient == cols.t_ambient == ([0.0, 3600.0], [303.15, 293.15])
    assert ShipperStudy(_cands(), materials, t_ambient=300.0).t_ambient == 300.0


def test_candidate_needs_one_sized_layer():
    with pytest.raises(ValueError, match="exactly one"):
        ShipperCandidate("bad", (Layer("eps_20", 0.03),))
    with pytest.raises(ValueError, match="unknown material"):
        ShipperStudy([ShipperCandidate("x", (Layer("unobtainium"),))], load_materials())


def test_unit_invariance_us_customary_inputs(materials):
    # the same scenario typed in inches, pounds and °F gives the same SI answer
    from workbench.units import parse

    si = ShipperStudy(
        _cands()[:2],
        materials,
        t_ambient=303.15,
        duration=24 * 3600.0,
        payload_length=0.3048,
        payload_width=0.2032,
        payload_height=0.1524,
        payload_mass=2.0,
        thicknesses=np.array([0.0254, 0.0508]),
    )
    us = ShipperStudy(
        _cands()[:2],
        materials,
        t_ambient=parse("86 °F", "temperature", "ambient"),
        duration=parse("24 h", "time", "duration"),
        payload_length=parse("12 in", "length", "payload length"),
        payload_width=parse("8 in", "length", "payload width"),
        payload_height=parse("6 in", "length", "payload height"),
        payload_mass=parse("4.40925 lb", "mass", "payload mass"),
        thicknesses=np.array([parse("1 in", "length", "t"), parse("2 in", "length", "t")]),
    )
    a, b = si.sweep(), us.sweep()
    np.testing.assert_allclose(a["landed_cost"], b["landed_cost"], rtol=1e-5)
    np.testing.assert_allclose(a["coolant_mass"], b["coolant_mass"], rtol=1e-5)
