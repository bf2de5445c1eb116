"""No silent wrong answer from the hold-time models: reproducers, work limits, bad inputs.

Outside references used here:

- Energy balance of a coolant at its phase change behind a wall of conductance
  UA: m L = UA ∫ (T_a − T_pc) dt while the coolant is melting (Bergman, Lavine,
  Incropera, DeWitt, Fundamentals of Heat and Mass Transfer, 7th ed., Wiley
  2011, §1.3.1, the energy balance; common practice for hold-time estimates).
  Worked by hand below where no refreezing occurs.
- The two-node model integrated independently with ``scipy.integrate.solve_ivp``
  (an adaptive Runge-Kutta solver) from the model's differential equations.
- Specific heats of ice and liquid water from the coolants table, which
  tests/test_coolants.py re-reads from IAPWS R10-06 and CoolProp (IAPWS-95).
"""

from __future__ import annotations

import math
import time

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import solve_ivp

import workbench as wb
from workbench import coolants, transient
from workbench.geometry import box_conductance
from workbench.transient import (
    MAX_STEPS,
    REASONS,
    ambient_profile,
    coolant_mass_for_duration,
    hold_time,
    max_conductance_for_duration,
    mean_ambient,
    simulate_hold,
    thickness_for_duration,
)

T0 = 273.15
L_ICE = 333550.0


# --- reproducer 1: a two-row profile --------------------------------------------
# By hand (energy balance, Incropera 7th ed. §1.3.1): 1 h at 30 K above the phase
# change melts 0.5 × 30 × 3600 = 54 000 J; the remaining 2 × 333 550 − 54 000 =
# 613 100 J last 613 100 / (0.5 × 20) = 61 310 s at 20 K: 3600 + 61 310 = 64 910 s.
HAND_64910 = 3600.0 + (2 * L_ICE - 0.5 * 30 * 3600) / (0.5 * 20)


@pytest.mark.parametrize(
    "profile",
    [
        pytest.param([[0.0, 303.15], [3600.0, 293.15]], id="list-of-rows"),
        pytest.param(np.array([[0.0, 303.15], [3600.0, 293.15]]), id="ndarray-rows"),
        pytest.param(([0.0, 3600.0], [303.15, 293.15]), id="tuple-of-columns"),
        pytest.param((np.array([0.0, 3600.0]), np.array([303.15, 293.15])), id="tuple-of-arrays"),
    ],
)
def test_two_row_profile_read_as_documented(profile):
    assert HAND_64910 == pytest.approx(64910.0)
    assert wb.hold_time(0.5, profile, 2.0, L_ICE, T0) == pytest.approx(HAND_64910, rel=1e-12)


def test_reproducer_1_exact_call():
    assert wb.hold_time(0.5, [[0.0, 303.15], [3600.0, 293.15]], 2.0, 333550.0, 273.15) == (
        pytest.approx(64910.0, rel=1e-12)
    )


def test_three_row_profile_as_rows_and_columns_agree():
    rows = [[0.0, 303.15], [3600.0, 293.15], [7200.0, 298.15]]
    cols = ([0.0, 3600.0, 7200.0], [303.15, 293.15, 298.15])
    # by hand: 54 000 J in hour 1, 36 000 J in hour 2, the rest 577 100 J at 12.5 W
    expected = 7200.0 + (2 * L_ICE - 54000.0 - 36000.0) / (0.5 * 25.0)
    assert hold_time(0.5, rows, 2.0, L_ICE, T0) == pytest.approx(expected, rel=1e-12)
    assert hold_time(0.5, cols, 2.0, L_ICE, T0) == pytest.approx(expected, rel=1e-12)


def test_constant_ambient_stays_accepted():
    # t = m L / (UA ΔT)
    for ta in (303.15, np.float64(303.15), np.array(303.15)):
        assert hold_time(0.5, ta, 2.0, L_ICE, T0) == pytest.approx(2 * L_ICE / 15.0, rel=1e-12)


def test_tuple_of_two_rows_is_columns_and_is_caught_by_the_range():
    # a tuple is (times, temps): two rows given as a tuple are read as columns, and
    # the "temperatures" (3600, 293.15) fail the ambient range with a hint
    with pytest.raises(ValueError, match=r"t_ambient temperatures_K: row 0 .*3600 K.*tuple"):
        hold_time(0.5, ((0.0, 303.15), (3600.0, 293.15)), 2.0, L_ICE, T0)


@pytest.mark.parametrize(
    ("profile", "pattern"),
    [
        ([[0.0, 300.0], [7200.0, 290.0], [3600.0, 280.0]], r"row 2 .*3600 s is earlier than row 1"),
        ([[0.0, 300.0], [3600.0, 290.0], [3600.0, 280.0]], r"row 2 .*3600 s repeats row 1"),
        (([0.0, 0.0], [300.0, 290.0]), r"row 1 .*0 s repeats row 0"),
        (([0.0, 20.0, 10.0], [300.0, 290.0, 280.0]), r"row 2 .*10 s is earlier than row 1"),
        ([[10.0, 300.0], [20.0, 290.0]], r"row 0 must be at 0 s"),
        ([[0.0, 300.0, 1.0], [10.0, 290.0, 1.0]], r"rows .*shape N×2.*\(2, 3\)"),
        ([0.0, 300.0], r"rows .*shape N×2.*\(2,\)"),
        ([[0.0, 300.0], [10.0]], r"t_ambient"),
        ((1.0, 2.0, 3.0), r"tuple must be \(times_s, temperatures_K\)"),
        ((300.0, 290.0), r"1-D sequences"),
        ([[0.0, 25.0]], r"row 0 .*25 K.*kelvin"),
        (25.0, r"t_ambient: must lie in .*kelvin"),
        ([], r"t_ambient"),
    ],
)
def test_bad_profiles_name_the_profile_and_row(profile, pattern):
    with pytest.raises(ValueError, match=pattern):
        ambient_profile(profile)
    with pytest.raises(ValueError, match="t_ambient"):
        hold_time(0.5, profile, 2.0, L_ICE, T0)


def test_profile_point_limit():
    n = transient.MAX_PROFILE_POINTS + 1
    with pytest.raises(ValueError, match="MAX_PROFILE_POINTS"):
        ambient_profile((np.arange(n) * 60.0, np.full(n, 300.0)))


# --- reproducer 2: below the phase change -----------------------------------------
def test_reproducer_2_no_nan_and_a_real_coolant_temperature():
    sim = wb.simulate_hold(0.5, 270.0, 2.0, 333550.0, 278.15, 48 * 3600.0)
    for series in (sim.payload_temperature, sim.coolant_temperature, sim.stored_energy):
        assert np.all(np.isfinite(series))
    # the coolant refreezes and then cools towards the ambient, never below it
    assert sim.coolant_temperature.min() >= 270.0 - 1e-6
    assert sim.coolant_temperature.max() <= 278.15 + 1e-9
    # no payload limits given: held is the right answer here
    assert sim.reason == "held for the whole run"


def test_default_specific_heats_come_from_the_coolants_table():
    cs, cl = coolants.specific_heats_for(T0, L_ICE)
    table = coolants.load_coolants()
    assert float(cs) == table.loc["water_ice", "specific_heat_solid"] > 0
    assert float(cl) == table.loc["water_ice", "specific_heat_liquid"] > 0
    # dry ice: no liquid (the gas leaves), no solid value in the table
    cs, cl = coolants.specific_heats_for(T0 - 78.5, 571000.0)
    assert float(cs) == 0.0 and float(cl) == 0.0
    # an untabled coolant gets ice and water values
    cs, cl = coolants.specific_heats_for(278.15, L_ICE)
    assert (float(cs), float(cl)) == (
        table.loc["water_ice", "specific_heat_solid"],
        table.loc["water_ice", "specific_heat_liquid"],
    )


PROFILE_20_M20_20 = ([0.0, 6 * 3600.0, 30 * 3600.0], [T0 + 20, T0 - 20, T0 + 20])


def test_cold_spell_default_agrees_with_a_real_specific_heat():
    kw = dict(t_payload_min=T0 + 2, t_payload_start=T0 + 5)
    default = simulate_hold(0.5, PROFILE_20_M20_20, 2.0, L_ICE, 278.15, 48 * 3600.0, 300.0, **kw)
    real = simulate_hold(
        0.5,
        PROFILE_20_M20_20,
        2.0,
        L_ICE,
        278.15,
        48 * 3600.0,
        300.0,
        specific_heat_solid=2023.0,
        specific_heat_liquid=4191.0,
        **kw,
    )
    assert default.reason == real.reason == "payload too cold"
    assert default.hold_time == pytest.approx(real.hold_time, rel=1e-12)
    assert 9.5 * 3600 < float(default.hold_time) < 10.5 * 3600


def test_explicit_zero_solid_specific_heat_is_refused_when_needed():
    with pytest.raises(ValueError, match=r"specific_heat_solid: 0 .*cools below its phase change"):
        simulate_hold(
            0.5,
            PROFILE_20_M20_20,
            2.0,
            L_ICE,
            278.15,
            48 * 3600.0,
            300.0,
            specific_heat_solid=0.0,
            t_payload_min=T0 + 2,
            t_payload_start=T0 + 5,
        )
    # but fine while the coolant stays at or above its phase change (dry ice, warm ambient)
    sim = simulate_hold(
        0.4,
        T0 + 25,
        3.0,
        571000.0,
        T0 - 78.5,
        24 * 3600.0,
        300.0,
        specific_heat_solid=0.0,
        specific_heat_liquid=0.0,
    )
    assert np.all(np.isfinite(sim.payload_temperature))


# --- the two-node model against solve_ivp --------------------------------------------
def _two_node_ivp(ua, profile, m, lat, tpc, cs, cl, cp, g, phi, tc0, tp0, t_end, t_min=None):
    """The model's equations, integrated by scipy (independent of the stepping scheme)."""

    def tc_of(h):
        if h < 0:
            return tpc + h / cs
        if h > lat:
            return tpc + (h - lat) / cl
        return tpc

    def rhs_for(ta):
        def rhs(_t, y):
            tp, h = y
            tc = tc_of(h)
            return [
                ((1 - phi) * ua * (ta - tp) + g * (tc - tp)) / cp,
                (phi * ua * (ta - tc) + g * (tp - tc)) / m,
            ]

        return rhs

    spent = lambda _t, y: y[1] - lat  # noqa: E731
    cold = lambda _t, y: y[0] - (t_min if t_min is not None else -1.0)  # noqa: E731
    h0 = cs * (tc0 - tpc) if tc0 < tpc else (lat + cl * (tc0 - tpc) if tc0 > tpc else 0.0)
    y = [tp0, h0]
    times = list(profile[0]) + [t_end]
    t_spent = t_cold = math.inf
    samples = {}
    for i, ta in enumerate(profile[1]):
        a, b = times[i], min(times[i + 1], t_end)
        if b <= a:
            break
        sol = solve_ivp(
            rhs_for(ta),
            (a, b),
            y,
            rtol=1e-10,
            atol=1e-8,
            max_step=120.0,
            events=(spent, cold),
            dense_output=True,
        )
        if sol.t_events[0].size and math.isinf(t_spent):
            t_spent = float(sol.t_events[0][0])
        if sol.t_events[1].size and math.isinf(t_cold) and t_min is not None:
            t_cold = float(sol.t_events[1][0])
        for t in np.arange(math.ceil(a / 3600), math.floor(b / 3600) + 1) * 3600.0:
            samples[t] = sol.sol(t)[0]
        y = sol.y[:, -1]
    return t_spent, t_cold, samples


def test_simulate_hold_against_solve_ivp_frozen_coolant_warm_ambient():
    kw = dict(
        ua=0.5,
        m=2.0,
        lat=L_ICE,
        tpc=T0,
        cs=2023.0,
        cl=4191.0,
        cp=5000.0,
        g=3.0,
        phi=0.6,
        tc0=T0 - 15,
        tp0=T0 + 5,
    )
    profile = ([0.0], [T0 + 30])
    t_spent, _, samples = _two_node_ivp(profile=profile, t_end=40 * 3600.0, **kw)
    sim = simulate_hold(
        kw["ua"],
        T0 + 30,
        kw["m"],
        kw["lat"],
        kw["tpc"],
        40 * 3600.0,
        60.0,
        specific_heat_solid=kw["cs"],
        specific_heat_liquid=kw["cl"],
        payload_heat_capacity=kw["cp"],
        coupling_conductance=kw["g"],
        coolant_wall_fraction=kw["phi"],
        t_coolant_start=kw["tc0"],
        t_payload_start=kw["tp0"],
    )
    assert float(sim.time_coolant_spent) == pytest.approx(t_spent, rel=2e-3)
    for t, tp in samples.items():
        i = int(np.searchsorted(sim.times, t))
        assert sim.times[i] == t
        assert sim.payload_temperature[i] == pytest.approx(tp, abs=0.05)


def test_simulate_hold_against_solve_ivp_cold_spell():
    # PCM-like coolant at +5 °C through a 20 → −20 → 20 °C day: refreezes, sub-cools
    # and chills the payload below 2 °C
    kw = dict(
        ua=0.5,
        m=2.0,
        lat=190000.0,
        tpc=278.15,
        cs=2000.0,
        cl=2200.0,
        cp=8000.0,
        g=4.0,
        phi=0.8,
        tc0=278.15,
        tp0=T0 + 5,
    )
    _, t_cold, samples = _two_node_ivp(
        profile=PROFILE_20_M20_20, t_end=30 * 3600.0, t_min=T0 + 2, **kw
    )
    sim = simulate_hold(
        kw["ua"],
        PROFILE_20_M20_20,
        kw["m"],
        kw["lat"],
        kw["tpc"],
        30 * 3600.0,
        60.0,
        specific_heat_solid=kw["cs"],
        specific_heat_liquid=kw["cl"],
        payload_heat_capacity=kw["cp"],
        coupling_conductance=kw["g"],
        coolant_wall_fraction=kw["phi"],
        t_coolant_start=kw["tc0"],
        t_payload_start=kw["tp0"],
        t_payload_min=T0 + 2,
    )
    assert sim.reason == "payload too cold"
    assert math.isfinite(t_cold)
    assert float(sim.time_out_of_range) == pytest.approx(t_cold, rel=2e-3)
    for t, tp in samples.items():
        i = int(np.searchsorted(sim.times, t))
        assert sim.payload_temperature[i] == pytest.approx(tp, abs=0.05)


# --- reproducer 10: sizing that holds only exactly ---------------------------------------
def test_reproducer_10_tie_is_not_an_answer():
    prof = ([0.0, 600.0], [279.0, 250.0])
    m = coolant_mass_for_duration(3600.0, 1.0, prof, L_ICE, T0)
    # by hand: the largest melted energy is 1 × (279 − 273.15) × 600 = 3510 J
    assert m == pytest.approx(3510.0 / L_ICE, rel=1e-12)
    assert hold_time(1.0, prof, m, L_ICE, T0) >= 3600.0


@settings(max_examples=80, deadline=None)
@given(
    ua=st.floats(0.05, 3.0),
    temps=st.lists(st.floats(240.0, 320.0), min_size=1, max_size=5),
    step_h=st.sampled_from([0.1, 1.0, 6.0]),
    duration_h=st.floats(0.5, 100.0),
    cap=st.sampled_from([0.0, 2e4]),
    start=st.sampled_from([None, T0 + 5.0, T0 - 5.0]),
    sf=st.sampled_from([1.0, 1.2]),
)
def test_sized_coolant_holds_when_fed_back(ua, temps, step_h, duration_h, cap, start, sf):
    prof = (np.arange(len(temps)) * step_h * 3600.0, np.array(temps))
    dur = duration_h * 3600.0
    m = coolant_mass_for_duration(dur, ua, prof, L_ICE, T0, cap, start, safety_factor=sf)
    assert math.isfinite(m) and m >= 0
    if m == 0:
        # nothing melts within the duration: any coolant at all holds
        assert hold_time(ua, prof, 1e-9, L_ICE, T0, cap, start) >= dur
    else:
        assert hold_time(ua, prof, m, L_ICE, T0, cap, start) >= dur
        # and it is the least such mass, up to round-off (safety factor 1)
        if sf == 1.0:
            assert hold_time(ua, prof, m * (1 - 1e-6), L_ICE, T0, cap, start) < dur


@settings(max_examples=60, deadline=None)
@given(
    mass=st.floats(0.2, 8.0),
    temps=st.lists(st.floats(240.0, 320.0), min_size=1, max_size=4),
    step_h=st.sampled_from([0.1, 1.0, 6.0]),
    duration_h=st.floats(1.0, 100.0),
    tmax=st.sampled_from([None, T0 + 8.0]),
)
def test_sized_conductance_and_thickness_hold_when_fed_back(mass, temps, step_h, duration_h, tmax):
    prof = (np.arange(len(temps)) * step_h * 3600.0, np.array(temps))
    dur = duration_h * 3600.0
    kw = dict(payload_heat_capacity=1e4, t_payload_max=tmax)
    ua = max_conductance_for_duration(dur, prof, mass, L_ICE, T0, on_impossible="nan", **kw)
    if math.isnan(ua):
        return
    if math.isinf(ua):
        assert hold_time(1e6, prof, mass, L_ICE, T0, **kw) >= dur
    else:
        assert hold_time(ua, prof, mass, L_ICE, T0, **kw) >= dur

    def f(d):
        return box_conductance(0.3, 0.25, 0.2, d, 0.033)

    d = thickness_for_duration(
        dur, f, prof, mass, L_ICE, T0, thickness_max=1.0, on_impossible="nan", **kw
    )
    if not math.isnan(d):
        assert hold_time(f(d), prof, mass, L_ICE, T0, **kw) >= dur


def test_conductance_that_never_limits_is_infinite():
    # ambient below the phase change: the coolant is never spent, whatever the wall
    assert max_conductance_for_duration(3600.0, T0 - 5, 1.0, L_ICE, T0) == math.inf


def test_thickness_function_must_be_sane():
    with pytest.raises(ValueError, match="conductance_of_thickness: .*decrease"):
        thickness_for_duration(3600.0, lambda d: d * 10.0, T0 + 30, 1.0, L_ICE, T0)
    with pytest.raises(ValueError, match="conductance_of_thickness: .*finite"):
        thickness_for_duration(3600.0, lambda d: d * np.nan, T0 + 30, 1.0, L_ICE, T0)
    with pytest.raises(TypeError, match="conductance_of_thickness"):
        thickness_for_duration(3600.0, 0.5, T0 + 30, 1.0, L_ICE, T0)


# --- work limits, refused before computing -----------------------------------------------
def test_too_many_time_steps_refused_at_once():
    t0 = time.perf_counter()
    with pytest.raises(
        ValueError, match=r"time_step: .*17,280,000 time steps asked.*1,000,000.*max_steps="
    ):
        simulate_hold(0.5, 303.15, 2.0, L_ICE, T0, 48 * 3600.0, 0.01)
    with pytest.raises(ValueError, match=r"time steps asked.*MAX_STEPS"):
        simulate_hold(0.5, 303.15, 2.0, L_ICE, T0, 1e9 * 3600.0)
    assert time.perf_counter() - t0 < 1.0
    assert MAX_STEPS == 1_000_000


def test_limits_can_be_raised_on_purpose():
    kw = dict(specific_heat_liquid=4191.0)
    with pytest.raises(ValueError, match="max_steps"):
        simulate_hold(0.5, 303.15, 2.0, L_ICE, T0, 3600.0, 60.0, max_steps=59, **kw)
    sim = simulate_hold(0.5, 303.15, 2.0, L_ICE, T0, 3600.0, 60.0, max_steps=60, **kw)
    assert sim.times.size == 61
    with pytest.raises(ValueError, match=r"10 variants × 60 time steps = 600 cells.*max_cells="):
        simulate_hold(np.full(10, 0.5), 303.15, 2.0, L_ICE, T0, 3600.0, 60.0, max_cells=599, **kw)
    with pytest.raises(ValueError, match=r"record_every: .*max_stored="):
        simulate_hold(np.full(10, 0.5), 303.15, 2.0, L_ICE, T0, 3600.0, 60.0, max_stored=100, **kw)
    ok = simulate_hold(
        np.full(10, 0.5),
        303.15,
        2.0,
        L_ICE,
        T0,
        3600.0,
        60.0,
        max_stored=100,
        record_every=10,
        **kw,
    )
    assert ok.payload_temperature.shape == (10, 7)


def test_cells_limit_default():
    with pytest.raises(ValueError, match=r"cells asked; the limit is 100,000,000 \(MAX_CELLS\)"):
        simulate_hold(np.full(200_000, 0.5), 303.15, 2.0, L_ICE, T0, 48 * 3600.0, 300.0)


# --- bad-input matrix -------------------------------------------------------------------
BAD = {
    "nan": float("nan"),
    "inf": float("inf"),
    "-inf": float("-inf"),
    "zero": 0.0,
    "negative": -1.0,
    "empty": [],
    "bool": True,
    "text": "300 K",
    "none": None,
    "huge": 1e300,
    "wrong-shape": "WRONG_SHAPE",
}

PROF = ([0.0, 3600.0], [T0 + 30, T0 + 20])


def _fn_of(thk):
    return box_conductance(0.3, 0.25, 0.2, thk, 0.033)


# function, base keyword arguments, numeric arguments to spoil, closed-form oracle or None
CASES = {
    "hold_time": (
        hold_time,
        dict(
            conductance=0.5,
            t_ambient=T0 + 30,
            coolant_mass=2.0,
            latent_heat=L_ICE,
            t_phase_change=T0,
            payload_heat_capacity=1e4,
            t_payload_start=None,
            t_payload_max=T0 + 8,
        ),
        [
            "conductance",
            "t_ambient",
            "coolant_mass",
            "latent_heat",
            "t_phase_change",
            "payload_heat_capacity",
            "t_payload_start",
            "t_payload_max",
        ],
    ),
    "mean_ambient": (
        mean_ambient,
        dict(t_ambient=PROF, t_start=0.0, t_end=7200.0),
        ["t_ambient", "t_start", "t_end"],
    ),
    "simulate_hold": (
        simulate_hold,
        dict(
            conductance=0.5,
            t_ambient=T0 + 30,
            coolant_mass=2.0,
            latent_heat=L_ICE,
            t_phase_change=T0,
            duration=24 * 3600.0,
            time_step=600.0,
            specific_heat_solid=2023.0,
            specific_heat_liquid=4191.0,
            payload_heat_capacity=1e4,
            coupling_conductance=5.0,
            coolant_wall_fraction=0.8,
            t_coolant_start=T0,
            t_payload_start=T0 + 5,
            t_payload_min=T0 + 2,
            t_payload_max=T0 + 8,
            record_every=1,
        ),
        [
            "conductance",
            "t_ambient",
            "coolant_mass",
            "latent_heat",
            "t_phase_change",
            "duration",
            "time_step",
            "specific_heat_solid",
            "specific_heat_liquid",
            "payload_heat_capacity",
            "coupling_conductance",
            "coolant_wall_fraction",
            "t_coolant_start",
            "t_payload_start",
            "t_payload_min",
            "t_payload_max",
            "record_every",
            "max_steps",
            "max_cells",
            "max_stored",
        ],
    ),
    "coolant_mass_for_duration": (
        coolant_mass_for_duration,
        dict(
            duration=24 * 3600.0,
            conductance=0.5,
            t_ambient=PROF,
            latent_heat=L_ICE,
            t_phase_change=T0,
            payload_heat_capacity=1e4,
            t_payload_start=T0 + 5,
            safety_factor=1.2,
        ),
        [
            "duration",
            "conductance",
            "t_ambient",
            "latent_heat",
            "t_phase_change",
            "payload_heat_capacity",
            "t_payload_start",
            "safety_factor",
        ],
    ),
    "max_conductance_for_duration": (
        max_conductance_for_duration,
        dict(
            duration=24 * 3600.0,
            t_ambient=PROF,
            coolant_mass=3.0,
            latent_heat=L_ICE,
            t_phase_change=T0,
            payload_heat_capacity=1e4,
            t_payload_start=T0 + 5,
            t_payload_max=T0 + 8,
        ),
        [
            "duration",
            "t_ambient",
            "coolant_mass",
            "latent_heat",
            "t_phase_change",
            "payload_heat_capacity",
            "t_payload_start",
            "t_payload_max",
        ],
    ),
    "thickness_for_duration": (
        thickness_for_duration,
        dict(
            duration=24 * 3600.0,
            conductance_of_thickness=_fn_of,
            t_ambient=PROF,
            coolant_mass=3.0,
            latent_heat=L_ICE,
            t_phase_change=T0,
            thickness_max=0.3,
            thickness_min=1e-4,
            payload_heat_capacity=1e4,
            t_payload_start=T0 + 5,
            t_payload_max=T0 + 8,
        ),
        [
            "duration",
            "t_ambient",
            "coolant_mass",
            "latent_heat",
            "t_phase_change",
            "thickness_max",
            "thickness_min",
            "payload_heat_capacity",
            "t_payload_start",
            "t_payload_max",
        ],
    ),
    "specific_heats_for": (
        coolants.specific_heats_for,
        dict(t_phase_change=T0, latent_heat=L_ICE),
        ["t_phase_change", "latent_heat"],
    ),
    "coolant": (coolants.coolant, dict(coolant_id="water_ice"), ["coolant_id"]),
}

# arguments where None means "not given" (a documented default)
OPTIONAL = {
    "t_payload_start",
    "t_payload_max",
    "t_payload_min",
    "t_coolant_start",
    "specific_heat_solid",
    "specific_heat_liquid",
}


def _matrix():
    for fname, (_, _, args) in CASES.items():
        for arg in args:
            for label in BAD:
                yield pytest.param(fname, arg, label, id=f"{fname}-{arg}-{label}")


def _spoil(base, arg, label):
    value = BAD[label]
    if label == "wrong-shape":
        good = base.get(arg, 1)
        if arg == "t_ambient":
            return np.full((2, 2, 2), 300.0)
        if isinstance(good, int) and not isinstance(good, bool):
            return [good, good]
        if isinstance(good, str):
            return ["water_ice"]
        # a 3-D block against the (2,)-shaped base given below: cannot broadcast
        return np.full((3, 1, 3), float(good if good is not None else T0 + 5))
    return value


def _assert_sane(fname, result, kwargs):
    if fname == "coolant":
        return
    if fname == "simulate_hold":
        for series in (
            result.payload_temperature,
            result.coolant_temperature,
            result.heat_in,
            result.stored_energy,
            result.hold_time,
        ):
            assert np.all(np.isfinite(series))
        assert set(np.atleast_1d(result.reason)) <= set(REASONS)
        return
    if fname == "specific_heats_for":
        for arr in result:
            assert np.all(np.isfinite(arr)) and np.all(np.asarray(arr) >= 0)
        return
    arr = np.asarray(result, float)
    assert not np.any(np.isnan(arr))
    assert np.all(arr >= 0)
    if fname == "hold_time":
        # closed form of this constant-ambient case (Incropera 7th ed. §1.3.1, §5.3):
        # t = (m L − C (T_s − T_pc)) / (UA ΔT) + (C / UA) ln(ΔT / (T_a − T_max))
        k = {key: np.asarray(v, float) if v is not None else None for key, v in kwargs.items()}
        ts = k["t_payload_start"] if k["t_payload_start"] is not None else k["t_phase_change"]
        dtk = k["t_ambient"] - k["t_phase_change"]
        spent = np.maximum(
            k["coolant_mass"] * k["latent_heat"]
            - k["payload_heat_capacity"] * (ts - k["t_phase_change"]),
            0.0,
        )
        expected = spent / (k["conductance"] * dtk)
        if k["t_payload_max"] is not None:
            expected = expected + k["payload_heat_capacity"] / k["conductance"] * np.log(
                dtk / (k["t_ambient"] - k["t_payload_max"])
            )
        np.testing.assert_allclose(arr, expected, rtol=1e-9)


@pytest.mark.parametrize(("fname", "arg", "label"), list(_matrix()))
def test_bad_input_matrix(fname, arg, label):
    fn, base, _ = CASES[fname]
    kwargs = dict(base)
    if (
        label == "wrong-shape"
        and fname not in ("coolant",)
        and arg != "conductance"
        and "conductance" in kwargs
    ):
        kwargs["conductance"] = np.array([0.4, 0.5])
    elif label == "wrong-shape" and "coolant_mass" in kwargs and arg != "coolant_mass":
        kwargs["coolant_mass"] = np.array([2.5, 3.0])
    elif label == "wrong-shape" and fname == "specific_heats_for":
        other = "latent_heat" if arg == "t_phase_change" else "t_phase_change"
        kwargs[other] = np.array([kwargs[other]] * 2)
    kwargs[arg] = _spoil(base, arg, label)
    try:
        result = fn(**kwargs)
    except (ValueError, TypeError) as exc:
        msg = str(exc)
        name = "t_ambient" if arg == "t_ambient" else arg
        shapes = label == "wrong-shape" and "do not broadcast" in msg
        assert name in msg or shapes, f"{fname}({arg}={label!r}) raised without naming it: {msg}"
        return
    if label == "none":
        assert arg in OPTIONAL, f"{fname}: {arg}=None accepted but it has no default"
    _assert_sane(fname, result, kwargs)


# --- the shipper's constructor finds bad inputs before computing ------------------------------
