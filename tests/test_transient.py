"""Hold-time models against hand calculations and published formulas.

Sources: the energy balance with phase change and the lumped-capacitance
solution T(t) = T_inf + (T_i - T_inf) exp(-t hA / (rho V c)) (Bergman,
Lavine, Incropera, DeWitt, Fundamentals of Heat and Mass Transfer, 7th ed.,
Wiley 2011, §5.2, Eq. 5.6 — equation number from memory); the closed form
t = m L / (UA ΔT) follows from it. Latent heat of ice from the chemicals
package (CRC enthalpy of fusion) used as a test oracle.
"""

from __future__ import annotations

import math

import chemicals
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbench import transient
from workbench._checks import Cancelled
from workbench.geometry import box_conductance
from workbench.transient import (
    PAYLOAD_RANGES,
    REASONS,
    ambient_profile,
    coolant_mass_for_duration,
    hold_time,
    max_conductance_for_duration,
    mean_ambient,
    simulate_hold,
    thickness_for_duration,
)

# latent heat of ice: chemicals (CRC) 6010 J/mol over 18.015 g/mol
L_ICE = chemicals.Hfus(CASRN="7732-18-5") / (chemicals.MW("7732-18-5") / 1000.0)
T0 = 273.15


# --- closed form ------------------------------------------------------------
def test_closed_form_constant_ambient():
    # t = m L / (UA ΔT): 2 kg ice, UA 0.5 W/K, 30 K -> 2*L/15 s
    t = hold_time(0.5, T0 + 30, 2.0, L_ICE, T0)
    assert t == pytest.approx(2.0 * L_ICE / (0.5 * 30.0), rel=1e-12)


def test_closed_form_payload_limit_adds_lumped_warming():
    # after the coolant is spent the payload warms as a lumped capacitance
    # (Incropera 7th ed. Eq. 5.6): extra time (C/UA) ln((Ta-Tpc)/(Ta-Tmax))
    c, ua, ta, tmax = 20000.0, 0.5, T0 + 30, T0 + 8
    t_spent = 2.0 * L_ICE / (ua * 30.0)
    expected = t_spent + c / ua * math.log(30.0 / 22.0)
    assert hold_time(ua, ta, 2.0, L_ICE, T0, c, t_payload_max=tmax) == pytest.approx(
        expected, rel=1e-12
    )


def test_step_profile_solved_by_hand():
    # 10 h at 30 °C (15 W: 540 000 J melted), then 20 °C (10 W):
    # the rest of 2 kg x 333 550 J/kg = 667 100 J lasts 127 100 J / 10 W = 12 710 s.
    profile = ([0.0, 36000.0], [T0 + 30, T0 + 20])
    assert hold_time(0.5, profile, 2.0, 333550.0, T0) == pytest.approx(48710.0, rel=1e-12)
    # then the payload (20 kJ/K) warms to 8 °C: 40 000 s x ln(20/12) (lumped, Eq. 5.6)
    t = hold_time(0.5, profile, 2.0, 333550.0, T0, 20000.0, t_payload_max=T0 + 8)
    assert t == pytest.approx(48710.0 + 40000.0 * math.log(20.0 / 12.0), rel=1e-12)


def test_refreezing_segment_by_hand():
    # 5 h at +30 °C melts 15 W x 18 000 s = 270 000 J; 5 h at -10 °C refreezes
    # 5 W x 18 000 s = 90 000 J; the remaining 487 100 J then last 32 473.3 s at 15 W.
    profile = ([0.0, 18000.0, 36000.0], [T0 + 30, T0 - 10, T0 + 30])
    assert hold_time(0.5, profile, 2.0, 333550.0, T0) == pytest.approx(
        36000.0 + 487100.0 / 15.0, rel=1e-12
    )


def test_warm_payload_uses_coolant_first():
    # payload packed 10 K above the phase change: C x 10 K of latent heat goes at once
    c = 20000.0
    t = hold_time(0.5, T0 + 30, 2.0, 333550.0, T0, c, t_payload_start=T0 + 10)
    assert t == pytest.approx((667100.0 - c * 10.0) / 15.0, rel=1e-12)


def test_ambient_below_phase_change_never_spends():
    assert hold_time(0.5, T0 - 5, 2.0, 333550.0, T0) == math.inf


def test_hold_time_broadcasts():
    t = hold_time(np.array([0.25, 0.5, 1.0])[:, None], T0 + 30, np.array([1.0, 2.0]), 333550.0, T0)
    assert t.shape == (3, 2)
    np.testing.assert_allclose(
        t, np.array([1.0, 2.0]) * 333550.0 / (np.array([0.25, 0.5, 1.0])[:, None] * 30.0)
    )


def test_mean_ambient_by_hand():
    # 5 s at 300 K and 5 s at 280 K
    assert mean_ambient(([0.0, 10.0], [300.0, 280.0]), 5.0, 15.0) == pytest.approx(290.0)


# --- simulation ---------------------------------------------------------------
def _sim(**kw):
    base = dict(
        conductance=0.5,
        t_ambient=T0 + 30,
        coolant_mass=2.0,
        latent_heat=L_ICE,
        t_phase_change=T0,
        duration=30 * 3600.0,
        time_step=300.0,
        specific_heat_liquid=4210.0,
        specific_heat_solid=2100.0,
        payload_heat_capacity=5000.0,
        coupling_conductance=200.0,
    )
    base.update(kw)
    return simulate_hold(**base)


def test_simulation_matches_closed_form():
    # strong coupling and packs lining the walls: the two-node model tends to
    # t = m L / (UA ΔT) (within 0.1 %)
    sim = _sim()
    assert sim.time_coolant_spent == pytest.approx(2.0 * L_ICE / 15.0, rel=1e-3)
    assert sim.reason == "coolant spent"


def test_progress_and_cancel_leave_the_result_unchanged():
    # the hooks only observe: same hold as without them (closed form t = m L / (UA ΔT) as above)
    seen = []
    sim = _sim(progress=seen.append, cancel=lambda: False)
    assert sim.time_coolant_spent == pytest.approx(2.0 * L_ICE / 15.0, rel=1e-3)
    assert sim.time_coolant_spent == _sim().time_coolant_spent
    assert seen == sorted(seen) and seen[-1] == 1.0 and 40 <= len(seen) <= 60
    calls = []
    with pytest.raises(Cancelled, match="cancelled at"):
        _sim(cancel=lambda: calls.append(1) or len(calls) >= 3)
    assert len(calls) == 3


def test_simulation_step_profile_by_hand():
    sim = _sim(t_ambient=([0.0, 36000.0], [T0 + 30, T0 + 20]), latent_heat=333550.0, time_step=60.0)
    assert sim.time_coolant_spent == pytest.approx(48710.0, rel=1e-3)


def test_lumped_payload_warming_after_dry_ice_is_gone():
    # dry ice (no liquid): once sublimed, the payload node alone warms with
    # T = Ta - (Ta - T1) exp(-UA t / C) (Incropera 7th ed. Eq. 5.6)
    ua, c, ta, tpc, lat, m = 0.4, 30000.0, T0 + 25, T0 - 78.5, 571000.0, 1.0
    sim = simulate_hold(
        ua,
        ta,
        m,
        lat,
        tpc,
        40 * 3600.0,
        60.0,
        payload_heat_capacity=c,
        coupling_conductance=500.0,
        t_payload_start=tpc,
    )
    ts = float(sim.time_coolant_spent)
    # during sublimation the payload sits within 0.1 K of the phase change
    assert ts == pytest.approx(m * lat / (ua * (ta - tpc)), rel=2e-3)
    i = np.searchsorted(sim.times, ts) + 5
    t1 = sim.times[i]
    tp1 = sim.payload_temperature[i]
    j = i + 200
    expected = ta - (ta - tp1) * math.exp(-ua * (sim.times[j] - t1) / c)
    assert sim.payload_temperature[j] == pytest.approx(expected, abs=0.05)


def test_energy_conservation_over_a_run():
    # heat in through the wall (booked from the step-mean temperatures) equals
    # the energy stored in payload + coolant, and an independent trapezoid
    # integral of UA (Ta - T) over the stored series agrees within 0.5 %.
    profile = (np.array([0, 6, 12, 18, 24]) * 3600.0, np.array([30, 10, -5, 25, 35]) + T0)
    sim = _sim(
        t_ambient=profile,
        coolant_wall_fraction=0.6,
        coupling_conductance=3.0,
        t_coolant_start=T0 - 15,
        t_payload_start=T0 + 6,
        duration=40 * 3600.0,
        time_step=120.0,
    )
    np.testing.assert_allclose(sim.heat_in, sim.stored_energy, rtol=1e-9, atol=1e-3)
    ta = np.array([mean_ambient(profile, max(t - 120.0, 0.0), max(t, 120.0)) for t in sim.times])
    flow = 0.5 * (0.6 * (ta - sim.coolant_temperature) + 0.4 * (ta - sim.payload_temperature))
    trapz = float(np.sum(0.5 * (flow[1:] + flow[:-1]) * np.diff(sim.times)))
    assert trapz == pytest.approx(float(sim.heat_in[-1]), rel=5e-3)
    # and the stored energy matches the two nodes' state independently
    tc_end = sim.coolant_temperature[-1]
    if sim.coolant_fraction_left[-1] == 0:
        h_end = L_ICE + 4210.0 * (tc_end - T0)
    elif tc_end < T0:
        h_end = 2100.0 * (tc_end - T0)
    else:
        h_end = (1.0 - sim.coolant_fraction_left[-1]) * L_ICE
    stored = 5000.0 * (sim.payload_temperature[-1] - (T0 + 6)) + 2.0 * (h_end - 2100.0 * (-15.0))
    assert stored == pytest.approx(float(sim.stored_energy[-1]), rel=1e-9)


def test_stable_for_long_steps():
    # exact two-node step: no blow-up even with 2 h steps and time constants of
    # seconds; the temperatures stay within the start and ambient values (up to
    # the one-step error where the coolant changes state inside a step)
    sim = _sim(
        time_step=7200.0,
        coupling_conductance=50.0,
        payload_heat_capacity=100.0,
        coolant_mass=0.05,
        t_coolant_start=T0 - 20,
        duration=100 * 3600.0,
    )
    tp = sim.payload_temperature
    assert np.all(np.isfinite(tp))
    assert tp.min() >= T0 - 20 - 0.05 and tp.max() <= T0 + 30 + 0.05
    assert abs(tp[-1] - (T0 + 30)) < 1e-6
    fine = _sim(time_step=60.0)
    coarse = _sim(time_step=1800.0)
    assert coarse.time_coolant_spent == pytest.approx(fine.time_coolant_spent, rel=5e-3)


def test_vectorised_equals_per_variant_runs():
    ua = np.array([0.3, 0.6, 0.9])
    mass = np.array([1.0, 2.0, 3.0])
    sim = _sim(
        conductance=ua,
        coolant_mass=mass,
        t_payload_min=T0 + 2,
        t_payload_max=T0 + 8,
        t_payload_start=T0 + 5,
        coupling_conductance=2.0,
        coolant_wall_fraction=0.7,
    )
    for i in range(3):
        one = _sim(
            conductance=ua[i],
            coolant_mass=mass[i],
            t_payload_min=T0 + 2,
            t_payload_max=T0 + 8,
            t_payload_start=T0 + 5,
            coupling_conductance=2.0,
            coolant_wall_fraction=0.7,
        )
        np.testing.assert_allclose(sim.payload_temperature[i], one.payload_temperature, rtol=1e-12)
        assert sim.reason[i] == one.reason


def test_frozen_ice_chills_a_2_8_payload():
    # common practice: unconditioned ice packs straight from a -20 °C freezer
    # freeze a 2-8 °C payload; the model must report it
    sim = _sim(
        t_coolant_start=T0 - 20,
        t_payload_start=T0 + 5,
        t_payload_min=T0 + 2,
        t_payload_max=T0 + 8,
        coupling_conductance=3.0,
    )
    assert sim.reason == "payload too cold"
    assert sim.time_out_of_range < sim.time_coolant_spent


def test_payload_too_warm_reason():
    sim = _sim(
        coolant_wall_fraction=0.0,
        coupling_conductance=0.2,
        t_payload_start=T0 + 5,
        t_payload_min=T0 + 2,
        t_payload_max=T0 + 8,
        latent_heat=333550.0,
    )
    assert sim.reason == "payload too warm"
    assert set(np.atleast_1d(sim.reason)) <= set(REASONS)


def test_held_for_whole_run():
    sim = _sim(duration=3600.0)
    assert sim.reason == "held for the whole run" and sim.hold_time == pytest.approx(3600.0)


def test_benchmark_size_runs():
    # the scale: 1000 variants x 5-minute steps x 120 h in one call
    rng = np.random.default_rng(3)
    sim = simulate_hold(
        rng.uniform(0.2, 1.5, 1000),
        T0 + 25,
        rng.uniform(0.5, 5, 1000),
        333550.0,
        T0,
        120 * 3600.0,
        300.0,
        specific_heat_liquid=4210.0,
        record_every=12,
    )
    assert sim.payload_temperature.shape == (1000, 121)
    assert np.all(np.isfinite(sim.time_coolant_spent))


# --- monotonicity (hypothesis) -------------------------------------------------
profiles = st.lists(st.floats(250.0, 320.0), min_size=1, max_size=5)


@settings(max_examples=60, deadline=None)
@given(
    ua=st.floats(0.05, 3.0),
    factor=st.floats(1.0, 3.0),
    mass=st.floats(0.1, 10.0),
    temps=profiles,
    cap=st.floats(0.0, 5e4),
)
def test_more_insulation_or_coolant_never_shortens_hold(ua, factor, mass, temps, cap):
    times = np.arange(len(temps)) * 7200.0
    prof = (times, np.array(temps))
    base = hold_time(ua, prof, mass, 333550.0, T0, cap, t_payload_max=T0 + 8)
    assert hold_time(ua / factor, prof, mass, 333550.0, T0, cap, t_payload_max=T0 + 8) >= base * (
        1 - 1e-9
    )
    assert hold_time(ua, prof, mass * factor, 333550.0, T0, cap, t_payload_max=T0 + 8) >= base * (
        1 - 1e-9
    )


@settings(max_examples=15, deadline=None)
@given(
    ua=st.floats(0.1, 2.0),
    factor=st.floats(1.05, 3.0),
    mass=st.floats(0.2, 5.0),
    ta=st.floats(285.0, 315.0),
)
def test_simulation_monotone_in_insulation_and_coolant(ua, factor, mass, ta):
    kw = dict(
        t_ambient=ta,
        latent_heat=333550.0,
        t_phase_change=T0,
        duration=200 * 3600.0,
        time_step=900.0,
        specific_heat_liquid=4210.0,
        t_payload_max=T0 + 8,
    )
    sim = simulate_hold(
        np.array([ua, ua / factor, ua]), coolant_mass=np.array([mass, mass, mass * factor]), **kw
    )
    assert sim.hold_time[1] >= sim.hold_time[0] - 1.0
    assert sim.hold_time[2] >= sim.hold_time[0] - 1.0


# --- sizing -------------------------------------------------------------------
def test_coolant_mass_for_duration_closed_form_and_inverse():
    # m = f UA ΔT t / L
    m = coolant_mass_for_duration(48 * 3600.0, 0.5, T0 + 30, 333550.0, T0, safety_factor=1.25)
    assert m == pytest.approx(1.25 * 0.5 * 30 * 48 * 3600.0 / 333550.0, rel=1e-12)
    prof = ([0.0, 18000.0, 36000.0], [T0 + 30, T0 - 10, T0 + 30])
    m2 = coolant_mass_for_duration(80000.0, 0.5, prof, 333550.0, T0, 20000.0, T0 + 10)
    assert hold_time(0.5, prof, m2, 333550.0, T0, 20000.0, T0 + 10) == pytest.approx(
        80000.0, rel=1e-9
    )


def test_max_conductance_and_thickness_for_duration():
    ua = max_conductance_for_duration(48 * 3600.0, T0 + 30, 2.0, 333550.0, T0)
    assert ua == pytest.approx(667100.0 / (30 * 48 * 3600.0), rel=1e-9)

    def g(d):
        return box_conductance(0.3, 0.25, 0.2, d, 0.033)

    d = thickness_for_duration(48 * 3600.0, g, T0 + 30, 4.0, 333550.0, T0)
    assert g(d) == pytest.approx(2 * ua, rel=1e-6)
    with pytest.raises(ValueError, match="duration"):
        thickness_for_duration(400 * 3600.0, g, T0 + 30, 0.5, 333550.0, T0, thickness_max=0.05)
    assert np.isnan(
        thickness_for_duration(
            400 * 3600.0, g, T0 + 30, 0.5, 333550.0, T0, thickness_max=0.05, on_impossible="nan"
        )
    )


# --- bad inputs ---------------------------------------------------------------
@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"coolant_mass": -1.0}, "coolant_mass"),
        ({"conductance": 0.0}, "conductance"),
        ({"latent_heat": float("nan")}, "latent_heat"),
        ({"t_ambient": ([], [])}, "times_s"),
        ({"t_ambient": ([0.0, 7200.0, 3600.0], [300.0, 290.0, 280.0])}, "times_s"),
        ({"t_ambient": ([10.0, 20.0], [300.0, 290.0])}, "times_s"),
        ({"t_ambient": ([0.0, 10.0], [300.0])}, "t_ambient"),
        ({"t_payload_min": T0 + 8, "t_payload_max": T0 + 2}, "t_payload_min"),
        ({"coolant_wall_fraction": 1.5}, "coolant_wall_fraction"),
        ({"time_step": -60.0}, "time_step"),
    ],
)
def test_bad_inputs_name_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field):
        _sim(**kwargs)


def test_bad_hold_time_inputs():
    with pytest.raises(ValueError, match="coolant_mass"):
        hold_time(0.5, 300.0, -2.0, 333550.0, T0)
    with pytest.raises(ValueError, match="times_s"):
        hold_time(0.5, ([0.0, 0.0], [300.0, 300.0]), 2.0, 333550.0, T0)
    with pytest.raises(ValueError, match="safety_factor"):
        coolant_mass_for_duration(3600.0, 0.5, 300.0, 333550.0, T0, safety_factor=0.5)
    assert ambient_profile(300.0)[1][0] == 300.0


def test_dry_ice_keeps_a_frozen_payload_until_spent():
    # frozen payload (-15 °C or colder, common-practice range) packed cold on
    # dry ice at -78.5 °C: cold while the dry ice lasts (t = m L / (UA ΔT)),
    # too warm some time after it is gone
    lo, hi = PAYLOAD_RANGES["frozen, -15 °C or colder"]
    sim = simulate_hold(
        0.4,
        T0 + 25,
        3.0,
        571000.0,
        T0 - 78.5,
        120 * 3600.0,
        300.0,
        payload_heat_capacity=2e4,
        coupling_conductance=2.0,
        t_payload_start=T0 - 78.5,
        t_payload_min=lo,
        t_payload_max=hi,
    )
    assert sim.reason == "coolant spent"
    assert sim.time_coolant_spent == pytest.approx(3.0 * 571000.0 / (0.4 * 103.5), rel=1e-3)
    # packed warmer (-20 °C), the dry ice first has to cool the payload: shorter
    warm = simulate_hold(
        0.4,
        T0 + 25,
        3.0,
        571000.0,
        T0 - 78.5,
        120 * 3600.0,
        300.0,
        payload_heat_capacity=2e4,
        coupling_conductance=2.0,
        t_payload_start=T0 - 20,
    )
    assert warm.time_coolant_spent < sim.time_coolant_spent
    assert sim.time_coolant_spent < sim.time_out_of_range < math.inf
    assert PAYLOAD_RANGES["2-8 °C (refrigerated)"] == (T0 + 2, T0 + 8)


# --- the cumulative-energy scan of hold_time (closed-form piecewise, by hand) -------
# Energy balance of a melting coolant behind a conductance UA (Bergman, Lavine,
# Incropera, DeWitt, Fundamentals of Heat and Mass Transfer, 7th ed., 2011, §1.3.1):
# m L = UA ∫ (T_a − T_pc) dt while it melts; no refreezing in these profiles.
def test_scan_three_steps_by_hand():
    # 0-2 h at +25 K, 2-5 h at +5 K, then +15 K. UA = 0.6 W/K, m L = 2 kg × 200 kJ/kg.
    # melted by 2 h: 0.6·25·7200 = 108 000 J; by 5 h: + 0.6·5·10 800 = 32 400 J (140 400 J);
    # the remaining 259 600 J at 0.6·15 = 9 W take 28 844.4 s: 18 000 + 28 844.4 s
    prof = ([0.0, 7200.0, 18000.0], [298.15, 278.15, 288.15])
    expected = 18000.0 + (400000.0 - 108000.0 - 32400.0) / 9.0
    assert hold_time(0.6, prof, 2.0, 200e3, 273.15) == pytest.approx(expected, rel=1e-12)


def test_scan_spent_inside_a_finite_segment_by_hand():
    # all spent within the first 10 h at +30 K: t = m L / (UA ΔT) = 1·333 550 / (1·30) s
    prof = ([0.0, 36000.0], [303.15, 273.15 - 10])
    assert hold_time(1.0, prof, 1.0, 333550.0, 273.15) == pytest.approx(333550.0 / 30, rel=1e-12)


def test_scan_payload_limit_after_spent_by_hand():
    # spent at t_s = m L/(UA ΔT); then the lumped node warms from T_pc towards T_a:
    # t = t_s + (C/UA) ln((T_a − T_pc)/(T_a − T_max)) (Incropera 7th ed., §5.3, lumped capacitance)
    ua, m, lat, c = 0.5, 1.0, 200e3, 2.0e4
    prof = ([0.0, 1e5], [303.15, 303.15])
    t_s = m * lat / (ua * 25.0)
    expected = t_s + c / ua * math.log(25.0 / (303.15 - 281.15))
    got = hold_time(ua, prof, m, lat, 278.15, c, t_payload_max=281.15)
    assert got == pytest.approx(expected, rel=1e-12)


def test_scan_equals_segment_solution_with_refreezing():
    # The scan hands refreezing variants to the segment-by-segment solution; both
    # must agree with that solution run from the start on random profiles.
    rng = np.random.default_rng(3)
    for _ in range(40):
        n_seg = int(rng.integers(1, 25))
        times = np.concatenate([[0.0], np.cumsum(rng.uniform(600, 20000, n_seg - 1))])
        temps = 273.15 + rng.uniform(-15, 35, n_seg)
        n = 30
        ua, m = rng.uniform(0.05, 2, n), rng.uniform(0.1, 5, n)
        tpc = rng.choice([273.15, 278.15], n)
        cap_c = rng.choice([0.0, 1e3, 2e4], n)
        ts = tpc + rng.choice([0.0, -3.0, 2.0], n)
        tmax = np.full(n, 281.15)
        for want in (False, True):
            e0, en, tt, reg, tsp, tov = transient._start_state(m * 3e5, tpc, cap_c, ts, tmax)
            with np.errstate(all="ignore"):
                ref, _ = transient._hold_segments(
                    ua, times, temps, m * 3e5, en, tt, reg, tsp, tov, cap_c / ua, tpc, tmax, cap_c, want
                )
            kw = {"t_payload_max": tmax} if want else {}
            got = hold_time(ua, (times, temps), m, 3e5, tpc, cap_c, ts, **kw)
            np.testing.assert_allclose(got, ref, rtol=1e-9, atol=1e-6)
