"""Checks of the plane-wall conduction core against sources outside the project.

Each published check names its source beside it. Where a value is recalled
rather than re-read here, the comment says "from memory".
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy import integrate, optimize

import workbench as wb
from workbench import ValidityWarning

# ---------------------------------------------------------------------------
# Published checks
# ---------------------------------------------------------------------------


def test_multilayer_u_value_iso6946_hand_worked():
    """A masonry cavity-insulated wall worked by hand per ISO 6946:2017.

    Method: ISO 6946:2017, clause 6.7.1 (R_T = Rsi + sum(d/lambda) + Rse) and
    clause 7 (U = 1/R_T); surface resistances from ISO 6946:2017 Table 7 for
    horizontal heat flow: Rsi = 0.13, Rse = 0.04 m²K/W. Layer design values
    are typical ISO 10456:2007 Table 3 values (from memory): gypsum plaster
    board 0.25, mineral wool 0.035, clay brick 0.77 W/(m·K). The expected value
    is the hand arithmetic written out below, step by step, as a practitioner
    would on paper.
    """
    # R of each layer, by hand:
    r_board = 0.0125 / 0.25  # 0.050 m²K/W
    r_wool = 0.100 / 0.035  # 2.857142857 m²K/W
    r_brick = 0.105 / 0.77  # 0.136363636 m²K/W
    r_total = 0.13 + 0.050 + 2.857142857 + 0.136363636 + 0.04  # 3.213506493
    assert_allclose(r_board + r_wool + r_brick + 0.17, r_total, rtol=1e-9)
    u_expected = 1.0 / 3.213506493  # 0.3112 W/(m²K), as ISO 6946 clause 10 rounds to 2 s.f.: 0.31
    got = wb.u_value([0.0125, 0.100, 0.105], [0.25, 0.035, 0.77], r_si=0.13, r_se=0.04)
    assert_allclose(got, u_expected, rtol=1e-9)
    assert round(got, 2) == 0.31


def test_layer_resistance_against_ht_package():
    """Layer resistance d/k against the `ht` package (ht.conduction.k_to_R, test-only oracle)."""
    from ht.conduction import k_to_R

    ks = np.array([0.035, 0.25, 0.77, 16.0])
    ds = np.array([0.1, 0.0125, 0.105, 0.002])
    expected = sum(k_to_R(k, d) for k, d in zip(ks, ds, strict=True))
    assert_allclose(wb.series_resistance(ds, ks), expected, rtol=1e-12)


def test_r_value_per_inch_against_ht_package():
    """US 'R-5 per inch' board: k from ht.conduction.R_value_to_k (VDI Heat Atlas, 2nd ed.).

    A 2 in board at R-5/in has R = 10 h·ft²·°F/Btu = 1.761102 m²·K/W
    (NIST SP 811, 2008, Appendix B.8: 1 h·ft²·°F/Btu = 0.1761102 m²·K/W).
    """
    from ht.conduction import R_value_to_k

    k = R_value_to_k(5.0, SI=False)
    r = wb.series_resistance([2 * 0.0254], [k])
    assert_allclose(r, 10 * 0.1761102, rtol=1e-5)


def test_fourier_law_textbook_slab():
    """Plane slab, Fourier's law q = k ΔT / L.

    Bergman, Lavine, Incropera & DeWitt, Fundamentals of Heat and Mass Transfer,
    7th ed., Example 1.1 (from memory): a 0.15 m industrial furnace wall with
    k = 1.7 W/(m·K), inner 1400 K, outer 1150 K → q'' = 2833 W/m², and through a
    0.5 m × 1.2 m wall 1700 W.
    """
    q = wb.heat_flux(1.7, 0.15, 1400.0 - 1150.0)
    assert_allclose(q, 2833.0, rtol=2e-4)
    assert_allclose(q * 0.5 * 1.2, 1700.0, rtol=2e-4)


# ---------------------------------------------------------------------------
# Temperature-dependent conductivity
# ---------------------------------------------------------------------------


def test_mean_conductivity_against_numerical_quadrature():
    """Integral mean of a piecewise-linear table against scipy.integrate.quad."""
    tt = np.array([200.0, 250.0, 300.0, 400.0])
    kk = np.array([0.018, 0.021, 0.026, 0.033])
    for t1, t2 in [(210.0, 390.0), (260.0, 270.0), (400.0, 200.0), (255.0, 301.0)]:
        lo, hi = sorted((t1, t2))
        ref = integrate.quad(lambda t: np.interp(t, tt, kk), lo, hi, points=tt[1:-1])[0] / (hi - lo)
        assert_allclose(wb.mean_conductivity(tt, kk, t1, t2), ref, rtol=1e-10)


def test_mean_conductivity_air_against_coolprop():
    """The integral mean of air's k(T) sampled from CoolProp (test-only oracle).

    A fine table of CoolProp's dry-air conductivity at 1 atm; the tool's mean
    over 260–360 K must equal CoolProp's own integral mean to 1e-5.
    """
    from CoolProp.CoolProp import PropsSI

    tt = np.linspace(250.0, 370.0, 121)
    kk = np.array([PropsSI("L", "T", t, "P", 101325.0, "Air") for t in tt])
    ref = integrate.quad(lambda t: PropsSI("L", "T", t, "P", 101325.0, "Air"), 260.0, 360.0)[0] / 100.0
    assert_allclose(wb.mean_conductivity(tt, kk, 260.0, 360.0), ref, rtol=1e-5)


def test_mean_conductivity_warns_beyond_table():
    with pytest.warns(ValidityWarning, match="beyond the k"):
        wb.mean_conductivity([250.0, 300.0], [0.02, 0.03], 240.0, 290.0)


def test_linear_k_wall_matches_kirchhoff_closed_form():
    """k = k0 (1 + b (T - T0)): q = k0/L [ΔT + b/2 ((T1-T0)² - (T2-T0)²)].

    Closed form of the Kirchhoff transform for linear k(T) (e.g. Incropera,
    7th ed., §3.1 discussion of variable conductivity; common textbook result).
    """
    k0, b, t0, length = 0.030, 0.004, 273.15, 0.08
    tt = np.array([150.0, 500.0])
    kk = k0 * (1 + b * (tt - t0))
    t1, t2 = 363.15, 253.15
    q_ref = k0 / length * ((t1 - t2) + b / 2 * ((t1 - t0) ** 2 - (t2 - t0) ** 2))
    sol = wb.solve_wall([wb.SolidLayer(length, k_table=(tt, kk))], t1, t2)
    assert_allclose(sol.heat_flux, q_ref, rtol=1e-10)


def test_two_layer_k_of_t_wall_against_root_finding():
    """Two k(T) layers: interface temperature found independently with scipy brentq."""
    foam = (np.array([233.15, 273.15, 323.15]), np.array([0.019, 0.022, 0.026]))
    steel = (np.array([200.0, 400.0, 600.0]), np.array([14.0, 16.5, 19.0]))
    l_foam, l_steel = 0.06, 0.003
    t_hot, t_cold = 318.15, 243.15

    def flux(tt, kk, a, b, length):
        return wb.mean_conductivity(tt, kk, a, b) * (a - b) / length

    ti = optimize.brentq(
        lambda x: flux(*foam, t_hot, x, l_foam) - flux(*steel, x, t_cold, l_steel), t_cold, t_hot, xtol=1e-13
    )
    q_ref = flux(*foam, t_hot, ti, l_foam)
    sol = wb.solve_wall([wb.SolidLayer(l_foam, k_table=foam), wb.SolidLayer(l_steel, k_table=steel)], t_hot, t_cold)
    assert_allclose(sol.heat_flux, q_ref, rtol=1e-9)
    assert_allclose(sol.temperatures[1], ti, atol=1e-7)


def test_solve_wall_vectorised_over_conditions_and_films():
    layers = [wb.SolidLayer(0.003, 0.2), wb.SolidLayer(0.04, k_table=([250.0, 350.0], [0.02, 0.03]))]
    ti = np.array([[293.15], [303.15]])
    te = np.array([263.15, 273.15, 283.15])
    sol = wb.solve_wall(layers, ti, te, r_si=0.13, r_se=lambda ts, ta: 0.04 + 0 * ts)
    assert sol.heat_flux.shape == (2, 3)
    assert sol.temperatures.shape == (2, 3, 3)
    # energy balance: the flux through each element equals the total flux
    drops = -np.diff(sol.temperatures, axis=-1)
    assert_allclose(drops / sol.resistances, np.broadcast_to(sol.heat_flux[..., None], drops.shape), rtol=1e-9)
    assert_allclose((ti - sol.temperatures[..., 0]) / 0.13, sol.heat_flux, rtol=1e-9)


def test_solve_wall_reports_non_convergence():
    with pytest.raises(RuntimeError, match="no convergence"):
        wb.solve_wall([wb.SolidLayer(0.05, k_table=([250.0, 350.0], [0.02, 0.03]))], 340.0, 260.0, max_iter=1)


# ---------------------------------------------------------------------------
# Invariants (hypothesis)
# ---------------------------------------------------------------------------

pos_k = st.floats(0.005, 400.0)
pos_l = st.floats(1e-4, 0.5)
temps = st.floats(200.0, 600.0)


@settings(max_examples=150, deadline=None)
@given(
    st.lists(st.tuples(pos_l, pos_k), min_size=1, max_size=5),
    temps,
    temps,
    st.floats(0.0, 0.3),
    st.floats(0.0, 0.3),
)
def test_flux_is_the_same_through_every_layer(layers, ti, te, rsi, rse):
    ls, ks = np.array(layers).T
    t = wb.wall_temperatures(ls, ks, ti, te, r_si=rsi, r_se=rse)
    q = (ti - te) / wb.series_resistance(ls, ks, rsi, rse)
    # temperature drop over each layer equals q·L/k (absolute tolerance in K:
    # a drop of 1e-7 K on a 250 K level is at the limit of float resolution)
    assert_allclose(-np.diff(t), q * ls / ks, rtol=1e-9, atol=1e-9)
    assert_allclose(t[-1] - q * rse, te, atol=1e-8)


@settings(max_examples=200, deadline=None)
@given(pos_k, st.floats(0.1, 200.0), st.floats(0.1, 500.0), st.floats(0.0, 2.0))
def test_required_thickness_inverts_heat_flux(k, dt, q_max, r_other):
    length = wb.required_thickness(k, dt, q_max, other_resistance=r_other)
    if length == 0.0:
        assert dt / r_other <= q_max * (1 + 1e-12)
    else:
        assert_allclose(dt / (r_other + length / k), q_max, rtol=1e-9)
        if r_other == 0.0:
            assert_allclose(wb.heat_flux(k, length, dt), q_max, rtol=1e-9)


@settings(max_examples=100, deadline=None)
@given(pos_k, st.lists(pos_l, min_size=2, max_size=20, unique=True), st.floats(0.1, 100.0))
def test_flux_falls_as_thickness_rises(k, lengths, dt):
    lengths = np.sort(lengths)
    q = wb.heat_flux(k, lengths, dt)
    # strictly falling, except where two lengths are a rounding step apart (equal flux)
    assert np.all(np.diff(q) <= 0)
    apart = np.diff(lengths) > 1e-12 * lengths[1:]
    assert np.all(np.diff(q)[apart] < 0)


def test_sweep_broadcasts_materials_by_thickness_by_delta_t():
    k = np.array([0.03, 0.2, 200.0])[:, None, None]
    length = np.linspace(0.001, 0.1, 4)[None, :, None]
    dt = np.array([5.0, 20.0])[None, None, :]
    q = wb.heat_flux(k, length, dt)
    assert q.shape == (3, 4, 2)
    assert_allclose(q[1, 2, 1], 0.2 * 20.0 / length[0, 2, 0])


def test_mass_and_cost_per_area():
    # Aluminium sheet 2 mm (2700 kg/m³) + EPS 50 mm (30 kg/m³), common-practice densities.
    assert_allclose(wb.mass_per_area([2700.0, 30.0], [0.002, 0.05]), 5.4 + 1.5)
    # 3 per kg aluminium, 120 per m³ EPS (demo prices): 3*5.4 + 120*0.05 = 22.2
    got = wb.cost_per_area([3.0, 120.0], [0.002, 0.05], [2700.0, 30.0], basis=["per_kg", "per_m3"])
    assert_allclose(got, 22.2)
    assert_allclose(wb.cost_per_area([120.0], [0.05], basis="per_m3"), 6.0)


# ---------------------------------------------------------------------------
# Bad input gives a clear error naming the argument
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "call, name",
    [
        (lambda: wb.heat_flux(np.nan, 0.1, 10), "k"),
        (lambda: wb.heat_flux(0.04, np.inf, 10), "thickness"),
        (lambda: wb.heat_flux(0.04, 0.0, 10), "thickness"),
        (lambda: wb.heat_flux(-0.04, 0.1, 10), "k"),
        (lambda: wb.heat_flux(0.04, 0.1, np.nan), "delta_t"),
        (lambda: wb.heat_flux([0.04, 0.03], [0.1, 0.2, 0.3], 10), "shapes do not broadcast"),
        (lambda: wb.series_resistance([0.1, 0.0], [0.04, 0.04]), "thicknesses"),
        (lambda: wb.series_resistance([0.1], [0.04], r_si=-0.1), "r_si"),
        (lambda: wb.series_resistance([0.1, 0.2], [0.04, 0.03, 0.02]), "shapes do not broadcast"),
        (lambda: wb.required_thickness(0.04, 20, 0.0), "max_flux"),
        (lambda: wb.required_thickness(0.04, 20, -5.0), "max_flux"),
        (lambda: wb.required_thickness(0.0, 20, 5.0), "k"),
        (lambda: wb.wall_temperatures([0.1], [0.04], np.nan, 270.0), "t_inside"),
        (lambda: wb.mass_per_area([-30.0], [0.1]), "densities"),
        (lambda: wb.cost_per_area([3.0], [0.1], basis="per_tonne"), "basis"),
        (lambda: wb.cost_per_area([3.0], [0.1], basis="per_kg"), "densities"),
        (lambda: wb.mean_conductivity([300.0, 250.0], [0.02, 0.03], 260, 270), "strictly increasing"),
        (lambda: wb.heat_flux("thick", 0.1, 10), "k"),
        (lambda: wb.solve_wall([], 300.0, 280.0), "layers"),
        (lambda: wb.SolidLayer(0.0, 0.04), "thickness"),
    ],
)
def test_bad_input_names_the_argument(call, name):
    with pytest.raises(ValueError, match=name):
        call()


def test_error_message_names_the_unit():
    with pytest.raises(ValueError, match=r"thickness: must be > 0 in m"):
        wb.heat_flux(0.04, -0.01, 10)


def test_no_warning_inside_table():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        wb.mean_conductivity([250.0, 300.0], [0.02, 0.03], 260.0, 290.0)
