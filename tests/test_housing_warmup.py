"""The housing warm-up over a use session (workbench.housing.housing_warm_up)."""

from __future__ import annotations

import time
import warnings

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants
from scipy.integrate import solve_ivp

from workbench import housing_heat_capacity, housing_warm_up, solve_housing
from workbench._checks import ValidityWarning
from workbench.housing import MAX_WARM_UP_STEPS, enclosure_faces
from workbench.surfaces import natural_convection_coefficient

# demo enclosure (invented): 160 × 85 × 35 mm on a table in a 35 °C room, 3 W
DIMS = (0.16, 0.085, 0.035)
TA = 308.15
K = np.array([167.0, 0.2, 16.0])
EPS = np.array([0.82, 0.9, 0.17])
CAP = np.array([150.0, 250.0, 80.0])


@pytest.fixture(autouse=True)
def _quiet():
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        yield


def q_exact(T, t, eps, ta, mounting="on-table", dims=DIMS):
    """Heat leaving at surface temperature T, films evaluated afresh (no table). [W]"""
    f = enclosure_faces(*dims, t, mounting)
    q = 0.0
    for i, o in enumerate(f.orientation_outside):
        hc = (
            0.0
            if T == ta
            else float(natural_convection_coefficient(T, ta, float(f.length_outside[i]), o))
        )
        hr = eps * constants.Stefan_Boltzmann * (T * T + ta * ta) * (T + ta)
        q += float(f.area_outside[i]) * (hc + hr) * (T - ta)
    return q


def ivp(t, eps, cap, segments, ta=TA, t0=None, mounting="on-table"):
    """scipy's LSODA on the same one-node model, segment by segment (a, b, power, times)."""
    T = ta if t0 is None else t0
    out = []
    for a, b, p, teval in segments:
        sol = solve_ivp(
            lambda _, y, p=p: [(p - q_exact(y[0], t, eps, ta, mounting)) / cap],
            (a, b),
            [T],
            method="LSODA",
            rtol=1e-10,
            atol=1e-9,
            t_eval=teval,
        )
        assert sol.success
        T = sol.y[0, -1]
        out.append(sol.y[0])
    return np.concatenate(out)


def test_initial_slope_is_power_over_capacity():
    # at t = 0 the surface is at the room temperature: no loss, dT/dt = P/C exactly
    w = housing_warm_up(*DIMS, 0.002, K, EPS, 3.0, TA, CAP, 1.0, "on-table", time_step=0.01)
    slope = (w.t_surface[:, 1] - w.t_surface[:, 0]) / (w.time[1] - w.time[0])
    assert_allclose(slope, 3.0 / CAP, rtol=1e-3)


@pytest.mark.parametrize("mounting", ["free-standing", "on-table", "wall-mounted"])
def test_long_session_ends_at_the_steady_state(mounting):
    # twenty days (many time constants): the lumped model must land on solve_housing
    w = housing_warm_up(*DIMS, 0.002, K, EPS, 3.0, TA, CAP, 20 * 86400.0, mounting)
    s = solve_housing(*DIMS, 0.002, K, EPS, 3.0, TA, mounting)
    assert_allclose(w.t_surface[:, -1], s.t_surface, atol=0.01)
    assert_allclose(w.t_air_inside[:, -1], s.t_air_inside, atol=0.01)


def test_matches_scipy_solve_ivp_with_the_full_films():
    # outside oracle for the integration: LSODA (rtol 1e-10) on dT/dt = (P - Q(T))/C with the
    # films recomputed at every call. Tolerance 0.005 K (the table and the step error are ~1e-4 K).
    w = housing_warm_up(*DIMS, 0.002, K, EPS, 3.0, TA, CAP, 1200.0, "on-table")
    for i in range(len(K)):
        ref = ivp(0.002, EPS[i], CAP[i], [(0.0, 1200.0, 3.0, w.time)])
        assert np.abs(w.t_surface[i] - ref).max() < 0.005


def test_large_steps_stay_close_to_the_oracle():
    # the exponential update is stable for steps beyond the time constant; a minute step: 0.1 K
    w = housing_warm_up(*DIMS, 0.002, K, EPS, 3.0, TA, CAP, 3600.0, "on-table", time_step=60.0)
    for i in range(len(K)):
        ref = ivp(0.002, EPS[i], CAP[i], [(0.0, 3600.0, 3.0, w.time)])
        assert np.abs(w.t_surface[i] - ref).max() < 0.1


def test_power_profile_on_off_against_the_oracle():
    prof = ([0.0, 600.0, 900.0], [5.0, 0.0, 5.0])
    w = housing_warm_up(
        *DIMS,
        0.002,
        167.0,
        0.82,
        None,
        TA,
        150.0,
        1500.0,
        "on-table",
        power_profile=prof,
        time_step=7.0,
    )
    for edge in prof[0]:
        assert edge in w.time  # switching times are grid points
    segs = []
    for a, b, p in ((0.0, 600.0, 5.0), (600.0, 900.0, 0.0), (900.0, 1500.0, 5.0)):
        teval = w.time[(w.time >= a) & (w.time <= b)]
        segs.append((a, b, p, teval if a == 0.0 else teval[1:]))
    ref = ivp(0.002, 0.82, 150.0, segs)
    assert np.abs(w.t_surface - ref).max() < 0.005
    off = (w.time > 600.0) & (w.time <= 900.0)
    assert np.all(np.diff(w.t_surface[off]) < 0)  # cools while off
    assert_allclose(w.power[w.time < 600.0], 5.0)
    assert_allclose(w.power[off & (w.time < 900.0)], 0.0)
    # the inside air is quasi-steady: with no dissipation it sits at the surface temperature
    assert_allclose(
        w.t_air_inside[off & (w.time < 900.0)], w.t_surface[off & (w.time < 900.0)], atol=1e-9
    )


def test_constant_profile_equals_constant_power():
    a = housing_warm_up(*DIMS, 0.002, K, EPS, 3.0, TA, CAP, 1200.0, "on-table")
    b = housing_warm_up(
        *DIMS, 0.002, K, EPS, None, TA, CAP, 1200.0, "on-table", power_profile=([0.0], [3.0])
    )
    assert_allclose(a.t_surface, b.t_surface, atol=1e-12)
    assert_allclose(a.t_air_inside, b.t_air_inside, atol=1e-6)


def test_start_above_room_cools_without_power():
    w = housing_warm_up(
        *DIMS, 0.002, 167.0, 0.82, 0.0, TA, 150.0, 600.0, "on-table", t_start=TA + 20.0
    )
    ref = ivp(0.002, 0.82, 150.0, [(0.0, 600.0, 0.0, w.time)], t0=TA + 20.0)
    assert np.abs(w.t_surface - ref).max() < 0.005
    assert np.all(np.diff(w.t_surface) < 0)


def test_more_capacity_warms_more_slowly():
    caps = np.array([50.0, 100.0, 200.0, 400.0])
    w = housing_warm_up(*DIMS, 0.002, 167.0, 0.82, 3.0, TA, caps, 3600.0, "on-table")
    t_hit = w.time_to_limit(TA + 5.0)
    assert np.all(np.isfinite(t_hit))
    assert np.all(np.diff(t_hit) > 0)


def test_time_to_limit_interpolates_linearly():
    w = housing_warm_up(*DIMS, 0.002, K, EPS, 3.0, TA, CAP, 1200.0, "on-table", time_step=30.0)
    lim = TA + 5.0
    got = w.time_to_limit(lim)
    for i in range(len(K)):
        ts = w.t_surface[i]
        j = int(np.argmax(ts >= lim))
        expect = np.interp(lim, ts[j - 1 : j + 1], w.time[j - 1 : j + 1])
        assert got[i] == pytest.approx(expect, rel=1e-12)
    assert np.all(np.isinf(w.time_to_limit(TA + 500.0)))  # never reached
    assert np.all(w.time_to_limit(TA) == 0.0)  # at the start already
    per = w.time_to_limit(TA + np.array([1.0, 2.0, 3.0]))
    assert per.shape == (3,)
    with pytest.raises(ValueError, match="limit"):
        w.time_to_limit(np.array([300.0, 310.0]))


def test_candidates_on_leading_axes():
    w = housing_warm_up(
        *DIMS,
        np.array([0.0015, 0.0025])[:, None],
        K[None, :],
        0.9,
        3.0,
        TA,
        200.0,
        600.0,
        "on-table",
    )
    assert w.t_surface.shape == (2, 3, w.time.size)
    assert w.t_air_inside.shape == w.t_surface.shape
    assert np.all(w.t_air_inside >= w.t_surface - 1e-9)


def test_fast_enough_for_a_live_panel():
    k = np.linspace(0.2, 200.0, 10)
    eps = np.linspace(0.1, 0.9, 10)
    caps = np.linspace(80.0, 400.0, 10)
    best = np.inf
    for _ in range(3):
        t0 = time.perf_counter()
        housing_warm_up(*DIMS, 0.002, k, eps, 3.0, TA, caps, 1200.0, "on-table")
        best = min(best, time.perf_counter() - t0)
    assert best < 0.1  # measured about 15 ms on the development machine


def test_heat_capacity_by_hand():
    # shell of plates: 2t(LW + LH + WH) - 4t²(L + W + H) + 8t³, written out independently
    L, W, H, t = 0.2, 0.1, 0.05, 0.002
    shell = 2 * t * (L * W + L * H + W * H) - 4 * t * t * (L + W + H) + 8 * t**3
    rho, cp = 2690.0, 900.0  # aluminium 6063 (ASM Handbook vol. 2, 1990, from memory)
    assert housing_heat_capacity(L, W, H, t, rho, cp) == pytest.approx(rho * cp * shell, rel=1e-12)
    assert housing_heat_capacity(L, W, H, t, rho, cp, 120.0) == pytest.approx(
        rho * cp * shell + 120.0, rel=1e-12
    )
    # hand figure: 1.34464e-4 m³ × 2690 kg/m³ × 900 J/(kg·K) = 325.5 J/K
    assert housing_heat_capacity(L, W, H, t, rho, cp) == pytest.approx(325.53, abs=0.01)
    arr = housing_heat_capacity(L, W, H, np.array([0.001, 0.002]), rho, cp)
    assert arr.shape == (2,) and arr[1] > arr[0]


GOOD = dict(
    length=0.16,
    width=0.085,
    height=0.035,
    wall_thickness=0.002,
    k=167.0,
    emissivity=0.8,
    power=3.0,
    t_ambient=TA,
    heat_capacity=150.0,
    duration=1200.0,
)


@pytest.mark.parametrize(
    "field, value",
    [
        ("length", -0.1),
        ("width", 0.0),
        ("height", float("nan")),
        ("wall_thickness", 0.02),
        ("k", 0.0),
        ("emissivity", 1.5),
        ("power", -1.0),
        ("t_ambient", -10.0),
        ("heat_capacity", 0.0),
        ("duration", 0.0),
        ("duration", [1.0, 2.0]),
        ("mounting", "on-floor"),
        ("t_start", 0.0),
        ("time_step", -1.0),
        ("h_inside", -2.0),
        ("extra_resistance", -0.1),
    ],
)
def test_bad_input_names_the_field(field, value):
    kw = dict(GOOD)
    kw[field] = value
    with pytest.raises(ValueError, match=field):
        housing_warm_up(**kw)


@pytest.mark.parametrize(
    "profile, match",
    [
        (([1.0, 2.0], [3.0, 0.0]), "must start at 0"),
        (([0.0, 5.0, 5.0], [3.0, 0.0, 1.0]), "increase strictly"),
        (([0.0, 5.0], [3.0, -1.0]), "power_profile powers"),
        (([0.0, 5.0], [3.0]), "equal length"),
        ((), "power_profile"),
        (([0.0, float("inf")], [1.0, 2.0]), "power_profile times"),
    ],
)
def test_bad_profile_names_the_field(profile, match):
    kw = dict(GOOD, power=None)
    with pytest.raises(ValueError, match=match):
        housing_warm_up(**kw, power_profile=profile)


def test_power_and_profile_together_are_refused():
    with pytest.raises(ValueError, match="power: give None"):
        housing_warm_up(**GOOD, power_profile=([0.0], [3.0]))
    with pytest.raises(ValueError, match="power"):
        housing_warm_up(**dict(GOOD, power=None))


def test_too_much_work_is_refused_with_a_way_out():
    with pytest.raises(ValueError, match=rf"at most {MAX_WARM_UP_STEPS}.*time_step >="):
        housing_warm_up(**dict(GOOD, duration=86400.0 * 30), time_step=1.0)
    with pytest.raises(ValueError, match="candidates"):
        housing_warm_up(**dict(GOOD, k=np.full(20000, 10.0)), time_step=1.0)


@pytest.mark.parametrize(
    "field, value",
    [
        ("length", 0.0),
        ("wall_thickness", 0.05),
        ("density", -1.0),
        ("specific_heat", 0.0),
        ("content_capacity", -5.0),
    ],
)
def test_heat_capacity_bad_input(field, value):
    kw = dict(
        length=0.2,
        width=0.1,
        height=0.05,
        wall_thickness=0.002,
        density=2690.0,
        specific_heat=900.0,
        content_capacity=0.0,
    )
    kw[field] = value
    with pytest.raises(ValueError, match=field):
        housing_heat_capacity(**kw)
