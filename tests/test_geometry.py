"""Enclosure geometry: box shape factors, cylinders, vacuum-panel edges."""

import warnings

import ht
import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy.optimize import minimize_scalar

from workbench._checks import ValidityWarning
from workbench.geometry import (
    VacuumPanel,
    box_conductance,
    box_conductance_breakdown,
    critical_insulation_radius,
    cylinder_conductance,
    cylinder_resistance_per_length,
    layered_box_conductance,
    vacuum_panel_effective_conductivity,
)

# --- box ----------------------------------------------------------------------------


def test_cubical_furnace_worked_example():
    # Holman, Heat Transfer, 10th ed., Ch. 3 worked example "cubical furnace" (from memory):
    # 50 cm inner cube, 10 cm fireclay brick k = 1.04 W/(m·°C), 500 °C inside, 50 °C outside;
    # S = 6·2.5 + 12·0.27 + 8·0.015 = 18.36 m, q = 8.592 kW
    g = box_conductance(0.5, 0.5, 0.5, 0.1, 1.04)
    assert_allclose(g * 450.0, 8592.0, rtol=1e-3)
    parts = box_conductance_breakdown(0.5, 0.5, 0.5, 0.1, 1.04)
    assert_allclose(
        [parts.faces, parts.edges, parts.corners], np.array([15.0, 3.24, 0.12]) * 1.04, rtol=1e-12
    )


@given(
    st.floats(0.05, 2.0),
    st.floats(0.05, 2.0),
    st.floats(0.05, 2.0),
    st.floats(0.005, 0.1),
    st.floats(0.01, 1.0),
)
def test_box_between_inner_and_outer_area_estimates(a, b, c, t, k):
    # the naive estimates bracket the true conduction (common practice: inner area
    # misses the edges and corners, outer area overstates them)
    if min(a, b, c) <= t / 5:
        return
    inner = k * 2 * (a * b + a * c + b * c) / t
    outer = (
        k
        * 2
        * ((a + 2 * t) * (b + 2 * t) + (a + 2 * t) * (c + 2 * t) + (b + 2 * t) * (c + 2 * t))
        / t
    )
    g = box_conductance(a, b, c, t, k)
    assert inner < g < outer


def test_typical_shipper_edge_share():
    # 30 cm inner cube, 5 cm foam: edges and corners carry about a sixth of the heat,
    # which the inner-area estimate misses (Incropera 7th ed. Table 4.1 cases 8, 9)
    parts = box_conductance_breakdown(0.3, 0.3, 0.3, 0.05, 0.03)
    assert 0.1 < float(parts.edge_corner_share) < 0.2
    assert_allclose(parts.total, parts.faces + parts.edges + parts.corners)


def test_box_broadcasts_over_thicknesses():
    t = np.array([0.02, 0.04, 0.08])
    g = box_conductance(0.4, 0.3, 0.2, t, 0.035)
    assert g.shape == (3,)
    assert np.all(np.diff(g) < 0)


def test_box_validity_warning_for_tiny_inner_dimension():
    # Incropera 7th ed. Table 4.1 case 8: S = 0.54 D for D > L/5 only
    with pytest.warns(ValidityWarning, match="L/5"):
        box_conductance(0.01, 0.3, 0.3, 0.1, 0.03)


@pytest.mark.parametrize("name", ["length", "width", "height", "wall_thickness", "k"])
def test_box_invalid_inputs(name):
    kwargs = {"length": 0.3, "width": 0.3, "height": 0.3, "wall_thickness": 0.05, "k": 0.03}
    kwargs[name] = -1.0
    with pytest.raises(ValueError, match=name):
        box_conductance(**kwargs)


def test_layered_box_single_layer_without_films_equals_box():
    g = layered_box_conductance(0.4, 0.3, 0.2, [0.05], [0.035])
    assert_allclose(g.total, box_conductance(0.4, 0.3, 0.2, 0.05, 0.035), rtol=1e-12)


def test_layered_box_with_films():
    # faces: inner area over (R_si + sum L/k + R_se); edges/corners: k_eq of the stack
    thick, cond = np.array([0.002, 0.05]), np.array([0.2, 0.03])
    g = layered_box_conductance(0.3, 0.3, 0.3, thick, cond, r_si=0.13, r_se=0.04)
    r_stack = 0.002 / 0.2 + 0.05 / 0.03
    assert_allclose(g.faces, 0.54 / (0.13 + r_stack + 0.04))
    k_eq = 0.052 / r_stack
    assert_allclose(g.edges, k_eq * 0.54 * 12 * 0.3)
    assert_allclose(g.corners, k_eq * 0.15 * 0.052 * 8)
    # films lower the total against the film-less wall
    assert g.total < layered_box_conductance(0.3, 0.3, 0.3, thick, cond).total


# --- cylinders -----------------------------------------------------------------------


def test_cylinder_against_ht():
    # ht.cylindrical_heat_transfer: layered cylinder with inner and outer films
    # (Incropera 7th ed. Eq. 3.32–3.34)
    ri, ts, ks, hi, ho = 0.025, [0.003, 0.04], [45.0, 0.035], 500.0, 8.0
    res = ht.cylindrical_heat_transfer(Ti=350.0, To=290.0, hi=hi, ho=ho, Di=2 * ri, ts=ts, ks=ks)
    g = cylinder_conductance(ri, ts, ks, 1.0, r_si=1 / hi, r_se=1 / ho)
    assert_allclose(g * 60.0, res["Q"], rtol=1e-9)
    assert_allclose(
        cylinder_resistance_per_length(ri, ts, ks, 1 / hi, 1 / ho), 60.0 / res["Q"], rtol=1e-9
    )


def test_cylinder_thin_wall_tends_to_plane_wall():
    # ln(1 + t/r) -> t/r: a thin shell conducts like a plane wall of area 2 pi r
    r, t, k = 1.0, 1e-4, 0.04
    assert_allclose(cylinder_resistance_per_length(r, [t], [k]), t / k / (2 * np.pi * r), rtol=1e-4)


def test_critical_radius_worked_example():
    # Incropera 7th ed., Example 3.5 (from memory): k = 0.055 W/(m·K), h = 5 W/(m²·K),
    # r_cr = k/h = 0.011 m
    assert_allclose(critical_insulation_radius(0.055, 5.0), 0.011)


def test_resistance_is_least_at_the_critical_radius():
    k, h, ri = 0.055, 5.0, 0.005

    def r_prime(r_out):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            return cylinder_resistance_per_length(ri, [r_out - ri], [k], r_se=1 / h)

    best = minimize_scalar(
        r_prime, bounds=(ri * 1.01, 0.1), method="bounded", options={"xatol": 1e-7}
    )
    assert_allclose(best.x, critical_insulation_radius(k, h), rtol=1e-3)


def test_thin_insulation_below_critical_radius_warns():
    with pytest.warns(ValidityWarning, match="critical insulation radius"):
        cylinder_resistance_per_length(0.003, [0.002], [0.055], r_se=1 / 5.0)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        cylinder_resistance_per_length(0.003, [0.03], [0.055], r_se=1 / 5.0)


# --- vacuum panels -------------------------------------------------------------------


def test_vip_effective_conductivity_by_hand():
    # k_eff = k_cop + psi (P/A) d (IEA/ECBCS Annex 39 approach, from memory):
    # 1.0 m × 0.5 m × 20 mm, k_cop = 0.004, psi = 0.008: 0.004 + 0.008·6·0.02 = 0.00496
    assert_allclose(vacuum_panel_effective_conductivity(0.004, 0.02, 1.0, 0.5, 0.008), 0.00496)


@given(st.floats(0.1, 2.0), st.floats(0.1, 2.0), st.floats(0.0, 0.05))
def test_vip_effective_not_below_centre_value(length, width, psi):
    k_eff = vacuum_panel_effective_conductivity(0.0045, 0.025, length, width, psi)
    assert k_eff >= 0.0045
    # bigger panels have relatively less edge
    assert vacuum_panel_effective_conductivity(0.0045, 0.025, 2 * length, 2 * width, psi) <= k_eff


def test_vacuum_panel_layer():
    vip = VacuumPanel(0.02, 0.004, 0.5, 0.5, 0.008)
    assert vip.conductivity > 0.004
    assert_allclose(vip.resistance(290.0, 280.0), 0.02 / vip.conductivity)
    assert vip.resistance(np.ones(3) * 290.0, 280.0).shape == (3,)
    with pytest.raises(ValueError, match="psi_edge"):
        VacuumPanel(0.02, 0.004, 0.5, 0.5, -0.01)
