"""Surface films: ISO 6946 values, convection correlations against ht, radiation."""

import warnings

import ht
import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy import constants

from workbench._checks import ValidityWarning
from workbench.air_properties import air_properties
from workbench.conduction import SolidLayer, solve_wall
from workbench.surfaces import (
    SURFACE_RESISTANCES,
    SurfaceFilm,
    blackbody_radiation_coefficient,
    combined_film_resistance,
    conventional_surface_resistance,
    flat_plate_convection_coefficient,
    iso6946_convection_coefficient,
    iso6946_surface_resistance,
    natural_convection_coefficient,
    radiation_coefficient,
    surface_film,
)

SIGMA = constants.Stefan_Boltzmann  # CODATA via scipy.constants
G = constants.g


def _pr_gr(t_surface, t_ambient, length):
    """Pr and Gr of air at the film temperature, for the ht oracles."""
    p = air_properties(0.5 * (t_surface + t_ambient))
    gr = (
        G
        * p.expansion_coefficient
        * abs(t_surface - t_ambient)
        * length**3
        / p.kinematic_viscosity**2
    )
    return float(p.prandtl), float(gr), float(p.conductivity)


# --- ISO 6946 conventional values -------------------------------------------

# ISO 6946:2017, Table 7 (conventional surface resistances, m²·K/W)
ISO6946_TABLE7 = [
    ("inside", "up", 0.10),
    ("inside", "horizontal", 0.13),
    ("inside", "down", 0.17),
    ("outside", "up", 0.04),
    ("outside", "horizontal", 0.04),
    ("outside", "down", 0.04),
]


@pytest.mark.parametrize(("side", "direction", "expected"), ISO6946_TABLE7)
def test_conventional_surface_resistances(side, direction, expected):
    assert conventional_surface_resistance(side, direction) == expected
    assert SURFACE_RESISTANCES[side][direction] == expected


@pytest.mark.parametrize(("side", "direction", "expected"), ISO6946_TABLE7)
def test_annex_formulas_reproduce_table7(side, direction, expected):
    # ISO 6946:2017 Annex C (from memory): Rs = 1/(hc + eps*hr0), eps = 0.9,
    # hr0 at 20 °C inside / 0 °C outside, wind 4 m/s; Table 7 is rounded to 2 decimals
    assert round(iso6946_surface_resistance(side, direction), 2) == pytest.approx(expected)


def test_iso6946_external_convection_formula():
    # ISO 6946:2017 Annex C (from memory): h_ce = 4 + 4 v
    assert_allclose(
        iso6946_convection_coefficient("outside", "up", [0.0, 1.0, 4.0]), [4.0, 8.0, 20.0]
    )


@pytest.mark.parametrize(
    ("t_celsius", "hr0"), [(-10, 4.1), (0, 4.6), (10, 5.1), (20, 5.7), (30, 6.3)]
)
def test_blackbody_coefficient_against_iso6946_values(t_celsius, hr0):
    # ISO 6946:2017 Annex C, table of h_r0 against mean temperature (from memory), 1 decimal
    assert round(blackbody_radiation_coefficient(t_celsius + 273.15), 1) == pytest.approx(hr0)


@pytest.mark.parametrize(
    ("call", "valid"),
    [
        (lambda: conventional_surface_resistance("inner", "up"), "inside"),
        (lambda: conventional_surface_resistance("inside", "upwards"), "horizontal"),
        (lambda: natural_convection_coefficient(300.0, 290.0, 0.1, "tilted"), "horizontal-down"),
        (lambda: SurfaceFilm(0.1, "sideways"), "vertical"),
    ],
)
def test_unknown_names_list_the_valid_ones(call, valid):
    with pytest.raises(ValueError, match=valid):
        call()


# --- radiation ----------------------------------------------------------------


@given(
    st.floats(0.01, 1.0),
    st.floats(200.0, 600.0),
    st.floats(200.0, 600.0),
)
def test_radiation_coefficient_equals_direct_exchange(eps, ts, ta):
    # Stefan–Boltzmann exchange of a small grey body with large surroundings
    # (Incropera 7th ed., Eq. 1.7, from memory): q = eps sigma (Ts^4 - Ta^4)
    if abs(ts - ta) < 1e-3:
        return
    direct = eps * SIGMA * (ts**4 - ta**4) / (ts - ta)
    assert_allclose(radiation_coefficient(eps, ts, ta), direct, rtol=1e-9)


def test_radiation_coefficient_equal_temperatures_is_blackbody_times_eps():
    assert_allclose(radiation_coefficient(0.9, 293.15, 293.15), 0.9 * 4 * SIGMA * 293.15**3)
    assert_allclose(
        radiation_coefficient(0.5, 300.0, 300.0), 0.5 * blackbody_radiation_coefficient(300.0)
    )


def test_radiation_coefficient_rejects_bad_emissivity():
    with pytest.raises(ValueError, match="emissivity"):
        radiation_coefficient(1.2, 300.0, 290.0)


# --- natural convection --------------------------------------------------------

VERTICAL_CASES = [
    (303.15, 293.15, 0.3),
    (333.15, 293.15, 1.0),
    (283.15, 298.15, 0.5),
    (373.15, 293.15, 2.5),
]


@pytest.mark.parametrize(("ts", "ta", "length"), VERTICAL_CASES)
def test_vertical_matches_ht_churchill_chu(ts, ta, length):
    # ht.Nu_vertical_plate_Churchill: Churchill & Chu (1975) full-range correlation
    pr, gr, k = _pr_gr(ts, ta, length)
    expected = ht.Nu_vertical_plate_Churchill(pr, gr) * k / length
    assert_allclose(
        natural_convection_coefficient(ts, ta, length, "vertical"), expected, rtol=1e-10
    )


@pytest.mark.parametrize("delta_t", [5.0, 10.0, 20.0, 40.0])
@pytest.mark.parametrize("length", [0.1, 0.2, 0.5])
def test_vertical_against_simplified_air_correlation(delta_t, length):
    # ASHRAE Handbook—Fundamentals, Ch. 4, simplified free-convection equations for
    # air, vertical surface, laminar: h = 1.42 (dT/L)^(1/4) (from memory). The
    # simplified form is a laminar fit; up to Ra ~ 2e8 the full-range Churchill–Chu
    # lies within 20 % of it (near Ra = 1e9 the full-range form runs 20–35 % higher,
    # as it already bends towards the turbulent Ra^(1/3) trend).
    h = natural_convection_coefficient(293.15 + delta_t, 293.15, length, "vertical")
    assert_allclose(h, 1.42 * (delta_t / length) ** 0.25, rtol=0.2)


@pytest.mark.parametrize(
    ("ts", "ta", "length"), [(313.15, 293.15, 0.1), (353.15, 293.15, 0.5), (273.15, 293.15, 0.25)]
)
def test_horizontal_buoyant_side_matches_ht_mcadams(ts, ta, length):
    # hot surface facing up / cold surface facing down: Lloyd & Moran / McAdams,
    # ht.Nu_horizontal_plate_McAdams(buoyancy=True) (0.54 Ra^1/4, 0.15 Ra^1/3)
    orientation = "horizontal-up" if ts > ta else "horizontal-down"
    pr, gr, k = _pr_gr(ts, ta, length)
    expected = ht.Nu_horizontal_plate_McAdams(pr, gr, buoyancy=True) * k / length
    assert_allclose(
        natural_convection_coefficient(ts, ta, length, orientation), expected, rtol=1e-10
    )


@pytest.mark.parametrize(
    ("ts", "ta", "length"), [(313.15, 293.15, 0.1), (353.15, 293.15, 0.3), (333.15, 293.15, 0.05)]
)
def test_horizontal_stable_side_against_ht_vdi(ts, ta, length):
    # hot surface facing down: 0.52 Ra^1/5 (Incropera 7th ed. Eq. 9.32, from memory)
    # against the VDI Heat Atlas form in ht.Nu_horizontal_plate_VDI(buoyancy=False),
    # 0.6 (Ra f1)^1/5; the two published fits agree within ~10 % for air.
    pr, gr, k = _pr_gr(ts, ta, length)
    expected = ht.Nu_horizontal_plate_VDI(pr, gr, buoyancy=False) * k / length
    assert_allclose(
        natural_convection_coefficient(ts, ta, length, "horizontal-down"), expected, rtol=0.1
    )


def test_horizontal_side_selected_by_sign_of_delta_t():
    # Incropera 7th ed. §9.6.3: a hot plate facing up convects more than facing down;
    # a cold plate the other way round
    up_hot = natural_convection_coefficient(313.15, 293.15, 0.1, "horizontal-up")
    down_hot = natural_convection_coefficient(313.15, 293.15, 0.1, "horizontal-down")
    up_cold = natural_convection_coefficient(273.15, 293.15, 0.1, "horizontal-up")
    down_cold = natural_convection_coefficient(273.15, 293.15, 0.1, "horizontal-down")
    assert up_hot > down_hot
    assert down_cold > up_cold


def test_equal_temperatures_have_finite_limits_without_warning():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert natural_convection_coefficient(300.0, 300.0, 0.2, "horizontal-up") == 0.0
        assert natural_convection_coefficient(300.0, 300.0, 0.2, "horizontal-down") == 0.0
        h_v = natural_convection_coefficient(300.0, 300.0, 0.2, "vertical")
    k = float(air_properties(300.0).conductivity)
    assert_allclose(h_v, 0.825**2 * k / 0.2)  # Churchill–Chu at Ra -> 0


def test_natural_convection_broadcasts():
    ts = np.array([[300.0], [310.0], [320.0]])
    h = natural_convection_coefficient(ts, 290.0, np.array([0.2, 0.5]), "vertical")
    assert h.shape == (3, 2)
    assert np.all(np.diff(h, axis=0) > 0)


def test_outside_rayleigh_range_warns():
    with pytest.warns(ValidityWarning, match="Ra_L"):
        natural_convection_coefficient(400.0, 290.0, 30.0, "vertical")  # Ra > 1e12
    with pytest.warns(ValidityWarning, match="Ra_L"):
        natural_convection_coefficient(294.0, 293.0, 0.005, "horizontal-up")  # Ra < 1e4


@pytest.mark.parametrize(
    ("name", "value"), [("t_surface", -1.0), ("length", 0.0), ("t_ambient", np.nan)]
)
def test_natural_convection_invalid_inputs(name, value):
    kwargs = {"t_surface": 300.0, "t_ambient": 290.0, "length": 0.1}
    kwargs[name] = value
    with pytest.raises(ValueError, match=name):
        natural_convection_coefficient(orientation="vertical", **kwargs)


# --- forced convection ---------------------------------------------------------


@pytest.mark.parametrize(("velocity", "length"), [(0.5, 0.3), (2.0, 0.5), (5.0, 1.0)])
def test_flat_plate_laminar_matches_ht(velocity, length):
    # laminar flat plate 0.664 Re^1/2 Pr^1/3 (Incropera 7th ed. Eq. 7.30), as in
    # ht.Nu_horizontal_plate_laminar_Baehr for 0.6 < Pr < 10
    p = air_properties(300.0)
    re = velocity * length / float(p.kinematic_viscosity)
    assert re < 5e5
    expected = (
        ht.Nu_horizontal_plate_laminar_Baehr(re, float(p.prandtl)) * float(p.conductivity) / length
    )
    assert_allclose(
        flat_plate_convection_coefficient(velocity, length, 300.0, 300.0), expected, rtol=1e-10
    )


def test_flat_plate_mixed_against_incropera_constant_and_ht_turbulent():
    p = air_properties(300.0)
    length, velocity = 2.0, 40.0
    re = velocity * length / float(p.kinematic_viscosity)
    pr = float(p.prandtl)
    h = flat_plate_convection_coefficient(velocity, length, 300.0, 300.0)
    # Incropera 7th ed. Eqs. 7.38/7.39 with Re_c = 5e5: A = 871 (from memory)
    assert_allclose(
        h, (0.037 * re**0.8 - 871.0) * pr ** (1 / 3) * float(p.conductivity) / length, rtol=1e-3
    )
    # fully turbulent Schlichting form in ht (no laminar leading edge) lies within 15 %
    h_t = ht.Nu_horizontal_plate_turbulent_Schlichting(re, pr) * float(p.conductivity) / length
    assert_allclose(h, h_t, rtol=0.15)


def test_flat_plate_zero_velocity_and_warning():
    assert flat_plate_convection_coefficient(0.0, 1.0, 300.0, 290.0) == 0.0
    with pytest.warns(ValidityWarning, match="Re_L"):
        flat_plate_convection_coefficient(200.0, 10.0, 300.0, 300.0)  # Re > 1e8


# --- combined film and solve_wall -----------------------------------------------


def test_combined_film_is_parallel_sum():
    ts, ta = 305.0, 293.15
    hc = natural_convection_coefficient(ts, ta, 0.4, "vertical")
    hr = 0.9 * SIGMA * (ts**4 - ta**4) / (ts - ta)
    assert_allclose(
        combined_film_resistance(ts, ta, 0.4, "vertical", 0.9), 1 / (hc + hr), rtol=1e-9
    )


def test_zero_emissivity_leaves_convection_only():
    ts, ta = 305.0, 293.15
    hc = natural_convection_coefficient(ts, ta, 0.4, "vertical")
    assert_allclose(combined_film_resistance(ts, ta, 0.4, "vertical", 0.0), 1 / hc)
    # horizontal surface at the air temperature with eps = 0: no exchange at all
    assert combined_film_resistance(ta, ta, 0.2, "horizontal-up", 0.0) == np.inf


def test_wind_raises_the_coefficient():
    still = combined_film_resistance(300.0, 290.0, 0.5, "vertical")
    windy = combined_film_resistance(300.0, 290.0, 0.5, "vertical", wind_speed=4.0)
    assert windy < still


def test_room_film_close_to_iso_conventional_value():
    # ISO 6946:2017 Table 7: R_si = 0.13 for horizontal heat flow; a 2.5 m high wall
    # 3 K warmer than the room air, eps = 0.9, gives a film of the same order (±25 %)
    r = surface_film(2.5, "vertical")(296.15, 293.15)
    assert_allclose(r, 0.13, rtol=0.25)


def test_surface_energy_balance_in_solve_wall():
    # energy balance closure at both surfaces: the flux through the wall equals
    # h_c (Ts - Ta) + eps sigma (Ts^4 - Ta^4) evaluated directly at the solution
    inside = surface_film(0.5, "vertical", emissivity=0.9)
    outside = surface_film(0.5, "vertical", emissivity=0.3)
    wall = [SolidLayer(0.003, 0.2), SolidLayer(0.04, 0.03)]
    sol = solve_wall(wall, 308.15, 278.15, r_si=inside, r_se=outside)
    q = float(sol.heat_flux)
    ts_in, ts_out = sol.temperatures[0], sol.temperatures[-1]
    q_in = natural_convection_coefficient(308.15, ts_in, 0.5, "vertical") * (
        308.15 - ts_in
    ) + 0.9 * SIGMA * (308.15**4 - ts_in**4)
    q_out = natural_convection_coefficient(ts_out, 278.15, 0.5, "vertical") * (
        ts_out - 278.15
    ) + 0.3 * SIGMA * (ts_out**4 - 278.15**4)
    assert_allclose([q_in, q_out], [q, q], rtol=1e-6)
    assert 0 < q < (308.15 - 278.15) / (0.003 / 0.2 + 0.04 / 0.03)


def test_surface_film_validates():
    with pytest.raises(ValueError, match="length"):
        SurfaceFilm(-1.0, "vertical")
    with pytest.raises(ValueError, match="emissivity"):
        surface_film(0.5, "vertical", emissivity=-0.1)


def test_plate_characteristic_length():
    # Incropera 7th ed. Eq. 9.29 (from memory): L = A_s / P
    from workbench.surfaces import plate_characteristic_length

    assert_allclose(plate_characteristic_length(0.5, 0.25), 0.125 / 1.5)
    assert_allclose(plate_characteristic_length([0.4, 1.0], 0.4), [0.1, 0.4 / 2.8])
