"""Shipper trace, named profiles and the trace chart.

Outside references:
- The two-node model's equations (workbench.transient.simulate_hold, Notes)
  integrated independently by scipy.integrate.solve_ivp (adaptive Runge-Kutta,
  tight tolerances): the trace must follow it.
- Energy balance with phase change (Bergman, Lavine, Incropera, DeWitt,
  Fundamentals of Heat and Mass Transfer, 7th ed., 2011, §1.3.1).
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from scipy.integrate import solve_ivp

from workbench.materials import load_materials
from workbench.studies.shipper import (
    SINGLE_PROFILE,
    TRACE_CAUTION,
    ShipperCandidate,
    ShipperStudy,
    trace_figure,
)
from workbench.studies.wall import Layer
from workbench.widgets.charts import shipper_trace_figure

T0 = 273.15
SUMMER = (np.array([0.0, 8.0, 14.0, 24.0, 32.0]) * 3600.0, np.array([24.0, 32.0, 27.0, 24.0, 31.0]) + T0)
WINTER = (np.array([0.0, 10.0, 20.0, 30.0]) * 3600.0, np.array([6.0, -6.0, 4.0, -4.0]) + T0)


@pytest.fixture(scope="module")
def study():
    cands = [
        ShipperCandidate("EPS", (Layer("eps_20"), Layer("corrugated_single_wall", 0.004))),
        ShipperCandidate("PIR", (Layer("pir_32"), Layer("corrugated_single_wall", 0.004))),
    ]
    return ShipperStudy(
        cands,
        load_materials(),
        ambient_profiles={"summer": SUMMER, "winter": WINTER},
        duration=36 * 3600.0,
        thicknesses=np.array([0.02, 0.04, 0.06, 0.08]),
    )


@pytest.fixture(scope="module")
def results(study):
    return study.results()


def test_single_profile_api_is_one_named_profile():
    s = ShipperStudy(
        [ShipperCandidate("EPS", (Layer("eps_20"),))], load_materials(), t_ambient=SUMMER,
        duration=24 * 3600.0, thicknesses=np.array([0.03, 0.05]),
    )
    assert list(s.profiles) == [SINGLE_PROFILE]
    r = s.results()
    assert set(r.by_profile["profile"]) == {SINGLE_PROFILE}
    np.testing.assert_array_equal(r.sweep["meets_target"], r.by_profile["meets_target"])


def test_both_t_ambient_and_profiles_refused():
    with pytest.raises(ValueError, match="t_ambient: give either"):
        ShipperStudy([ShipperCandidate("EPS", (Layer("eps_20"),))], load_materials(),
                     t_ambient=300.0, ambient_profiles={"summer": SUMMER})


def test_a_design_passes_only_if_it_passes_every_profile(results):
    bp, sw = results.by_profile, results.sweep
    assert set(bp["profile"]) == {"summer", "winter"}
    every = bp.groupby(["candidate", "thickness"], sort=False)["meets_target"].all()
    got = sw.set_index(["candidate", "thickness"])["meets_target"]
    pd.testing.assert_series_equal(got.loc[every.index], every, check_names=False)
    shortest = bp.groupby(["candidate", "thickness"], sort=False)["hold_time_simulated"].min()
    np.testing.assert_array_equal(sw.set_index(["candidate", "thickness"])["hold_time_simulated"].loc[shortest.index],
                                  shortest)
    # the cheapest design of each candidate holds under every profile
    for name, row in results.optimum.iterrows():
        if bool(row["meets_target"]):
            sub = bp[(bp["candidate"] == name) & np.isclose(bp["thickness"], row["thickness"])]
            assert sub["meets_target"].all()


def test_winter_freezing_is_reported_like_coolant_spent(results):
    bp = results.by_profile
    cold = bp[(bp["profile"] == "winter") & (bp["end_reason"] == "payload too cold")]
    assert len(cold) > 0  # a +5 °C PCM through -6 °C spells chills a 2-8 °C payload of thin boxes
    assert any(c.startswith("PAYLOAD TOO COLD under the 'winter' profile") for c in results.cautions)


def test_trace_follows_solve_ivp(study):
    tr = study.trace([("PIR", 0.04)], profiles=["winter"], duration=30 * 3600.0)
    mk = tr.attrs["markers"].iloc[0]
    # rebuild the design's conductance and coolant mass independently of the trace
    lay = study._layers(study.candidates[1], np.array([0.04]))
    mass, box = study._size(lay)
    assert mk["coolant_mass"] == pytest.approx(float(mass[0]))
    row = study.coolant_row
    lat, tpc = float(row["latent_heat"]), float(row["t_phase_change"])
    cs, cl = float(row["specific_heat_solid"]), float(row["specific_heat_liquid"])
    cp, g, phi = study.payload_heat_capacity, study.coupling_conductance, study.coolant_wall_fraction
    ua, m = float(box["conductance"][0]), float(mass[0])
    times, temps = WINTER

    def tc_of(h):
        return tpc + h / cs if h < 0 else (tpc if h <= lat else tpc + (h - lat) / cl)

    y = np.array([study.t_payload_start, 0.0])
    t_check = tr["time"].to_numpy()
    want = np.empty_like(t_check)
    edges = [0.0, *times[1:][times[1:] < 30 * 3600.0], 30 * 3600.0]
    for k in range(len(edges) - 1):
        ta = temps[k]

        def rhs(_t, v, ta=ta):
            tp, h = v
            tc = tc_of(h)
            return [((1 - phi) * ua * (ta - tp) + g * (tc - tp)) / cp,
                    (phi * ua * (ta - tc) + g * (tp - tc)) / m]

        sol = solve_ivp(rhs, (edges[k], edges[k + 1]), y, method="LSODA", rtol=1e-10, atol=1e-8,
                        dense_output=True, max_step=300.0)
        sel = (t_check >= edges[k]) & (t_check <= edges[k + 1])
        want[sel] = sol.sol(t_check[sel])[0]
        y = sol.y[:, -1]
    # 300-s steps with step-start coolant capacity: agreement to 0.05 K (tolerance: common practice
    # for a design estimate; the model's own tests bound the stepping error)
    np.testing.assert_allclose(tr["payload_temperature"], want, atol=0.05)


def test_trace_frame_markers_and_units(study):
    tr = study.trace([("EPS", 0.02), ("PIR", 0.06)])
    assert set(tr["profile"]) == {"summer", "winter"}
    assert tr.attrs["units"]["time"] == "s" and tr.attrs["units"]["payload_temperature"] == "K"
    mk = tr.attrs["markers"]
    assert len(mk) == 4
    assert set(mk["end_reason"]) <= {"coolant spent", "payload too warm", "payload too cold",
                                     "held for the whole run"}
    for _, r in mk.iterrows():
        if r["end_reason"] == "coolant spent":
            assert r["hold_time"] == pytest.approx(r["time_coolant_spent"])
        elif r["end_reason"].startswith("payload"):
            assert r["hold_time"] == pytest.approx(r["time_out_of_range"])
    assert tr.attrs["band"] == (study.t_payload_min, study.t_payload_max)
    assert TRACE_CAUTION in tr.attrs["cautions"]


def test_trace_figure_hover_units_markers_and_cautions(study):
    tr = study.trace([("EPS", 0.02), ("PIR", 0.06)])
    fig = shipper_trace_figure(tr)
    names = [t.name for t in fig.data]
    assert "ambient (summer)" in names and "ambient (winter)" in names
    lines = [t for t in fig.data if t.mode == "lines"]
    assert all(" h<br>" in t.hovertemplate and "°C" in t.hovertemplate for t in lines)
    ends = [t for t in fig.data if "end of hold" in (t.name or "")]
    assert len(ends) == 4
    text = " ".join(a.text for a in fig.layout.annotations)
    assert "does not qualify a shipper" in text
    assert "medicines" in text
    assert fig.layout.xaxis.title.text == "time [h]"
    us = trace_figure(tr, system="US")
    assert us.layout.yaxis.title.text == "temperature [°F]"
    # payload in °F = 1.8 °C + 32 (NIST SP 811 (2008), Appendix B.9)
    np.testing.assert_allclose(np.asarray(us.data[2].y), np.asarray(fig.data[2].y) * 1.8 + 32, atol=1e-9)


def test_trace_refuses_unknown_design_or_profile(study):
    with pytest.raises(ValueError, match="unknown candidate"):
        study.trace([("XPS", 0.04)])
    with pytest.raises(ValueError, match="profile: unknown"):
        study.trace([("EPS", 0.04)], profiles=["autumn"])
