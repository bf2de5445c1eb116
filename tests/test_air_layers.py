"""Air layers: ISO 6946 method, enclosure correlations against ht, solve_wall use."""

import ht
import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy import constants

from workbench._checks import ValidityWarning
from workbench.air_layers import (
    AirLayer,
    air_layer_resistance,
    air_layer_resistance_detailed,
    convection_onset_width,
    effective_emissivity,
    gap_equivalent_conductivity,
    nusselt_horizontal_layer,
    nusselt_tilted_layer,
    nusselt_vertical_cavity,
    parallel_plate_radiation_coefficient,
    ventilated_component_resistance,
    ventilation_class,
)
from workbench.conduction import SolidLayer, solve_wall
from workbench.geometry import VacuumPanel
from workbench.surfaces import surface_film

SIGMA = constants.Stefan_Boltzmann
G = constants.g
P_ATM = 101325.0


def coolprop(name, t):
    # test-only oracle for air properties
    return PropsSI(name, "T", t, "P", P_ATM, "Air")


# ISO 6946:2017 Table 8 (thermal resistance of unventilated air layers with
# high-emissivity surfaces, m²·K/W), recalled from memory: width [mm] -> (up, horizontal, down)
ISO6946_TABLE8 = {
    5: (0.11, 0.11, 0.11),
    7: (0.13, 0.13, 0.13),
    10: (0.15, 0.15, 0.15),
    15: (0.16, 0.17, 0.17),
    25: (0.16, 0.18, 0.19),
    50: (0.16, 0.18, 0.21),
    100: (0.16, 0.18, 0.22),
    300: (0.16, 0.18, 0.23),
}


@pytest.mark.parametrize("width_mm", sorted(ISO6946_TABLE8))
@pytest.mark.parametrize(("index", "direction"), [(0, "up"), (1, "horizontal"), (2, "down")])
def test_iso6946_reproduces_table8(width_mm, index, direction):
    # the table is computed with eps = 0.9 both faces, T_m = 10 °C, dT <= 5 K
    r = air_layer_resistance(width_mm / 1000.0, direction)
    assert round(r, 2) == pytest.approx(ISO6946_TABLE8[width_mm][index])


def test_iso6946_low_emissivity_face():
    # ISO 6946:2017 Annex D (from memory): E = 1/(1/eps1 + 1/eps2 - 1), h_r = E h_r0,
    # h_r0 = 5.1 W/(m²·K) at 10 °C (ISO table value), h_a = 1.25 (horizontal, 25 mm).
    # By hand: E = 1/(20 + 1.111 - 1) = 0.04972; R = 1/(1.25 + 0.04972·5.1) = 0.664
    r = air_layer_resistance(0.025, "horizontal", emissivity_1=0.05, emissivity_2=0.9)
    assert_allclose(r, 0.664, rtol=0.005)
    # a foil face multiplies the resistance of a 25 mm vertical cavity by about 3.6
    assert r / air_layer_resistance(0.025, "horizontal") > 3.5


def test_effective_emissivity_formula():
    # infinite parallel grey planes (Incropera 7th ed., Table 13.3, from memory)
    assert_allclose(effective_emissivity(0.05, 0.9), 1 / (1 / 0.05 + 1 / 0.9 - 1))
    assert effective_emissivity(0.0, 0.9) == 0.0


def test_zero_emissivity_leaves_convection_only():
    # ISO 6946 h_a values (from memory): 1.95 up, 1.25 horizontal for d >= 25 mm
    assert_allclose(air_layer_resistance(0.05, "up", 0.0, 0.9), 1 / 1.95)
    assert_allclose(air_layer_resistance(0.05, "horizontal", 0.9, 0.0), 1 / 1.25)
    # detailed model, heat flow down: still air, R = d / k_air
    d = 0.03
    assert_allclose(
        air_layer_resistance_detailed(d, "down", 0.0, 0.0, 283.15, 5.0),
        d / coolprop("L", 283.15),
        rtol=0.02,
    )


def test_iso6946_large_delta_t_forms_meet_small_delta_t_values_at_5k():
    # the dT > 5 K expressions of ISO 6946 (1.14 dT^1/3, 0.73 dT^1/3, 0.09 dT^0.187 d^-0.44,
    # from memory) continue the dT <= 5 K constants at 5 K within rounding
    for direction in ("up", "horizontal", "down"):
        r5 = air_layer_resistance(0.1, direction, delta_t=5.0)
        r5p = air_layer_resistance(0.1, direction, delta_t=5.0001)
        assert_allclose(r5p, r5, rtol=0.005)
        assert air_layer_resistance(0.1, direction, delta_t=30.0) < r5


@pytest.mark.parametrize("direction", ["up", "horizontal", "down"])
def test_thin_gaps_approach_still_air_conduction(direction):
    # d -> 0: conduction k/d dominates convection and radiation (Incropera 7th ed. §9.8:
    # Nu -> 1 below the critical Rayleigh number)
    d = 2e-4
    k_air = coolprop("L", 283.15)
    k_iso = gap_equivalent_conductivity(d, direction, method="iso6946")
    k_det = gap_equivalent_conductivity(d, "down" if direction == "horizontal" else direction)
    assert_allclose(k_det, k_air, rtol=0.05)
    assert_allclose(k_iso, k_air, rtol=0.06)  # ISO uses 0.025 W/(m·K) for still air


@settings(max_examples=50, deadline=None)
@given(
    st.floats(1e-3, 0.2),
    st.sampled_from(["up", "horizontal", "down"]),
    st.floats(0.0, 1.0),
    st.floats(0.5, 20.0),
)
def test_gap_never_beats_still_air(width, direction, eps, delta_t):
    # conduction through still air is a lower bound: radiation and convection only add
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        k_eq = gap_equivalent_conductivity(width, direction, eps, eps, 283.15, delta_t, height=1.0)
    assert k_eq >= coolprop("L", 283.15) * 0.97  # 3 %: our k fit vs CoolProp


def test_parallel_plate_radiation_matches_direct_exchange():
    # q = sigma (T1^4 - T2^4) / (1/eps1 + 1/eps2 - 1) (Incropera 7th ed. Eq. 13.24, from memory)
    t1, t2, e1, e2 = 300.0, 280.0, 0.8, 0.3
    direct = SIGMA * (t1**4 - t2**4) / (1 / e1 + 1 / e2 - 1) / (t1 - t2)
    assert_allclose(parallel_plate_radiation_coefficient(e1, e2, t1, t2), direct, rtol=1e-12)


# --- enclosure correlations against ht ---------------------------------------------


@pytest.mark.parametrize("ra", [2e3, 5e3, 1e4, 3e4, 1e5, 1e6])
def test_horizontal_layer_against_ht_hollands(ra):
    # ht.Nu_Nusselt_Rayleigh_Hollands: Hollands (1984) multi-Prandtl form (VDI Heat
    # Atlas, 2nd ed.); for air (Pr = 0.71) it reduces to the 1975 air correlation
    # within 3 % up to Ra = 1e6
    pr = 0.71
    assert_allclose(
        nusselt_horizontal_layer(ra), ht.Nu_Nusselt_Rayleigh_Hollands(pr, ra / pr), rtol=0.03
    )


@pytest.mark.parametrize("ra", [1e7, 1e8])
def test_horizontal_layer_against_ht_at_high_rayleigh(ra):
    pr = 0.71
    assert_allclose(
        nusselt_horizontal_layer(ra), ht.Nu_Nusselt_Rayleigh_Hollands(pr, ra / pr), rtol=0.08
    )
    # Hölling & Herwig (2006) asymptotic theory (ht), stated for 1e5 < Ra < 1e15: within 16 %
    assert_allclose(
        nusselt_horizontal_layer(ra), ht.Nu_Nusselt_Rayleigh_Holling_Herwig(pr, ra / pr), rtol=0.16
    )


def test_horizontal_layer_below_critical_rayleigh_is_conduction():
    # Rayleigh–Bénard onset at Ra_c = 1708 (Hollands et al. 1975; ht returns Nu = 1 too)
    assert_allclose(nusselt_horizontal_layer([0.0, 100.0, 1707.0]), 1.0)
    assert ht.Nu_Nusselt_Rayleigh_Hollands(0.71, 1707.0 / 0.71) == 1.0


def test_tilted_layer():
    ra = np.array([3e3, 1e4, 5e4])
    assert_allclose(nusselt_tilted_layer(ra, 0.0), nusselt_horizontal_layer(ra))
    # tilting a layer heated from below away from horizontal weakens the convection
    nu = nusselt_tilted_layer(1e4, np.array([0.0, 15.0, 30.0, 45.0, 60.0]))
    assert np.all(np.diff(nu) < 0)
    with pytest.warns(ValidityWarning, match="tilt"):
        nusselt_tilted_layer(1e4, 75.0)


def wright_iso15099(ra, aspect_ratio):
    """Vertical-cavity Nu of ISO 15099:2003 §5.3.3.4 (Wright 1996), from memory; an
    independent published fit used here as a test oracle."""
    if ra > 5e4:
        nu1 = 0.0673838 * ra ** (1 / 3)
    elif ra > 1e4:
        nu1 = 0.028154 * ra**0.4134
    else:
        nu1 = 1 + 1.7596678e-10 * ra**2.2984755
    nu2 = 0.242 * (ra / aspect_ratio) ** 0.272
    return max(nu1, nu2)


@pytest.mark.parametrize("aspect_ratio", [10.0, 20.0, 40.0, 80.0])
@pytest.mark.parametrize("ra", [1e3, 5e3, 1e4, 3e4, 1e5, 1e6])
def test_vertical_cavity_against_iso15099(ra, aspect_ratio):
    # ElSherbiny et al. (1982) and Wright (1996) fit overlapping data: within 12 %
    assert_allclose(
        nusselt_vertical_cavity(ra, aspect_ratio), wright_iso15099(ra, aspect_ratio), rtol=0.12
    )


def test_vertical_cavity_against_ht_thess_roughly():
    # ht.Nu_Nusselt_vertical_Thess (VDI Heat Atlas form, 1e4 < Ra < 1e7, H/L < 80) is a
    # rougher fit; agreement within 35 % over its range
    for ra in (1e4, 1e5, 1e6):
        for a in (10.0, 20.0, 40.0):
            assert_allclose(
                nusselt_vertical_cavity(ra, a),
                ht.Nu_Nusselt_vertical_Thess(0.71, ra / 0.71, H=a, L=1.0),
                rtol=0.35,
            )


def test_vertical_cavity_warnings():
    with pytest.warns(ValidityWarning, match="aspect ratio"):
        nusselt_vertical_cavity(1e4, 2.0)
    with pytest.warns(ValidityWarning, match="Ra"):
        nusselt_vertical_cavity(1e8, 20.0)
    assert_allclose(nusselt_vertical_cavity(0.0, 20.0), 1.0)


@pytest.mark.parametrize("width", [0.005, 0.01, 0.015, 0.025, 0.05, 0.1])
@pytest.mark.parametrize("direction", ["up", "horizontal", "down"])
def test_detailed_model_against_iso6946(width, direction):
    # two published methods (ISO 6946:2017 Annex D and the enclosure correlations)
    # agree within 10 % for high-emissivity layers, dT = 5 K, T_m = 10 °C
    r_iso = air_layer_resistance(width, direction)
    r_det = air_layer_resistance_detailed(width, direction, height=1.0)
    assert_allclose(r_det, r_iso, rtol=0.1)


def test_detailed_needs_height_for_vertical_cavity():
    with pytest.raises(ValueError, match="height"):
        air_layer_resistance_detailed(0.02, "horizontal")


def test_convection_onset_width_up_is_critical_rayleigh():
    # Ra_c = 1708 (Hollands et al. 1975; Incropera 7th ed. §9.8), with CoolProp properties
    dt, tm = 10.0, 293.15
    d = convection_onset_width("up", dt, tm)
    nu_ = coolprop("V", tm) / coolprop("D", tm)
    alpha = coolprop("L", tm) / (coolprop("D", tm) * coolprop("C", tm))
    ra = G * dt * d**3 / (tm * nu_ * alpha)
    assert_allclose(ra, 1708.0, rtol=0.05)
    # wider gaps lose resistance to convection relative to still air
    still = 1 / (coolprop("L", tm) / (2 * d))
    assert air_layer_resistance_detailed(2 * d, "up", 0.0, 0.0, tm, dt) < 0.9 * still


def test_convection_onset_width_other_directions():
    assert convection_onset_width("down", 10.0) == np.inf
    d = convection_onset_width("horizontal", 5.0, 283.15, height=1.0)
    # Nu has reached 1.05 there (ElSherbiny et al. 1982), and the larger temperature
    # difference brings the onset closer
    assert 0.01 < d < 0.04
    assert convection_onset_width("horizontal", 20.0, 283.15, height=1.0) < d


def test_foam_or_air_gap():
    # a 20 mm vertical cavity with ordinary faces conducts like ~0.1 W/(m·K), far worse
    # than a foam at ~0.035; with both faces foil-faced (eps = 0.05) it beats the foam
    high_e = gap_equivalent_conductivity(0.02, "horizontal", height=0.5)
    low_e = gap_equivalent_conductivity(0.02, "horizontal", 0.05, 0.05, height=0.5)
    assert high_e > 0.08
    assert low_e < 0.035


def test_ventilation_classes():
    # ISO 6946:2017 clause 6.9 (from memory): <= 500 mm²/m unventilated,
    # 500–1500 slightly ventilated, > 1500 well ventilated
    classes = ventilation_class(np.array([0.0, 500e-6, 501e-6, 1500e-6, 1501e-6]))
    assert list(classes) == [
        "unventilated",
        "unventilated",
        "slightly-ventilated",
        "slightly-ventilated",
        "well-ventilated",
    ]
    assert ventilation_class(0.0) == "unventilated"
    # linear interpolation between the unventilated and the well ventilated totals
    assert_allclose(
        ventilated_component_resistance([500e-6, 1000e-6, 1500e-6, 3000e-6], 2.0, 1.0),
        [2.0, 1.5, 1.0, 1.0],
    )


def test_invalid_arguments():
    with pytest.raises(ValueError, match="horizontal"):
        air_layer_resistance(0.02, "sideways")
    with pytest.raises(ValueError, match="width"):
        air_layer_resistance(0.0, "up")
    with pytest.raises(ValueError, match="emissivity_2"):
        air_layer_resistance(0.02, "up", emissivity_2=1.5)
    with pytest.raises(ValueError, match="iso6946"):
        AirLayer(0.02, "up", method="exact")
    with pytest.warns(ValidityWarning, match="0.3 m"):
        air_layer_resistance(0.5, "up")


# --- AirLayer in solve_wall ----------------------------------------------------------


def test_air_layer_direction_swaps_when_heat_flows_back():
    layer = AirLayer(0.05, "up")
    # first face colder: heat flows down through a layer declared "up"
    assert_allclose(
        layer.resistance(280.0, 285.0),
        air_layer_resistance(0.05, "down", t_mean=282.5, delta_t=5.0),
    )
    assert_allclose(
        layer.resistance(285.0, 280.0), air_layer_resistance(0.05, "up", t_mean=282.5, delta_t=5.0)
    )
    both = layer.resistance(np.array([280.0, 285.0]), np.array([285.0, 280.0]))
    assert both[0] > both[1]


@pytest.mark.parametrize("method", ["iso6946", "detailed"])
def test_plastic_air_foam_wall_converges_with_equal_flux(method):
    plastic = SolidLayer(0.003, 0.2, name="plastic")
    gap = AirLayer(
        0.02, "horizontal", emissivity_1=0.9, emissivity_2=0.9, method=method, height=0.4
    )
    foam = SolidLayer(0.03, k_table=([250.0, 300.0, 350.0], [0.031, 0.035, 0.040]), name="foam")
    film_in = surface_film(0.4, "vertical", emissivity=0.9)
    film_out = surface_film(0.4, "vertical", emissivity=0.9)
    layers = [plastic, gap, foam]
    sol = solve_wall(layers, np.array([318.15, 303.15]), 288.15, r_si=film_in, r_se=film_out)
    temps = sol.temperatures
    for j, layer in enumerate(layers):
        q_j = (temps[..., j] - temps[..., j + 1]) / layer.resistance(
            temps[..., j], temps[..., j + 1]
        )
        assert_allclose(q_j, sol.heat_flux, rtol=1e-8)
    q_in = (np.array([318.15, 303.15]) - temps[..., 0]) / film_in(
        temps[..., 0], np.array([318.15, 303.15])
    )
    assert_allclose(q_in, sol.heat_flux, rtol=1e-8)
    # the gap's resistance at the solution is the ISO/detailed value at its own temperatures
    assert np.all(sol.resistances[..., 1] > 0.1)


def test_vacuum_panel_in_solve_wall():
    vip = VacuumPanel(0.02, 0.004, 0.5, 0.5, 0.008)
    wall = [SolidLayer(0.002, 0.2), vip, SolidLayer(0.002, 0.2)]
    sol = solve_wall(wall, 298.15, 278.15, r_si=0.13, r_se=0.13)
    r_expected = 0.13 + 0.01 + 0.02 / vip.conductivity + 0.01 + 0.13
    assert_allclose(sol.heat_flux, 20.0 / r_expected, rtol=1e-10)


def test_slender_cavity_in_conduction_regime_does_not_warn():
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("error")
        assert_allclose(nusselt_vertical_cavity(500.0, 300.0), 1.0, rtol=1e-3)
    with pytest.warns(ValidityWarning, match="aspect ratio"):
        nusselt_vertical_cavity(1e4, 300.0)


def test_cold_shipper_lid_with_horizontal_films_converges():
    # lid of a shipper: layers listed inside (bottom) to outside (top), so heat leaving a
    # warm inside would flow "up"; with dry ice inside (194.65 K, common practice value of
    # CO2 sublimation at 1 atm) the heat flows down and the layer swaps to "down"
    lid = [
        SolidLayer(0.003, 0.2),
        AirLayer(0.03, "up", method="detailed"),
        SolidLayer(0.05, 0.033),
    ]
    t_in = np.array([194.65, 278.15])
    film_in = surface_film(0.1, "horizontal-down")  # inner face of the lid faces down
    film_out = surface_film(0.1, "horizontal-up", wind_speed=2.0)
    sol = solve_wall(lid, t_in, 308.15, r_si=film_in, r_se=film_out)
    assert np.all(sol.heat_flux < 0)  # heat flows in
    temps = sol.temperatures
    for j, layer in enumerate(lid):
        q_j = (temps[..., j] - temps[..., j + 1]) / layer.resistance(
            temps[..., j], temps[..., j + 1]
        )
        assert_allclose(q_j, sol.heat_flux, rtol=1e-8)
    # heated from above the gap conducts only: R = 1/(k/d + h_r), about 0.2 m²·K/W
    assert_allclose(
        sol.resistances[..., 1],
        air_layer_resistance_detailed(
            0.03,
            "down",
            t_mean=0.5 * (temps[..., 1] + temps[..., 2]),
            delta_t=temps[..., 2] - temps[..., 1],
        ),
    )


def test_wall_at_uniform_temperature_has_zero_flux():
    wall = [SolidLayer(0.003, 0.2), AirLayer(0.02, "horizontal"), SolidLayer(0.03, 0.035)]
    film = surface_film(0.3, "horizontal-up", emissivity=0.05)
    sol = solve_wall(wall, 300.0, 300.0, r_si=0.13, r_se=film)
    assert sol.heat_flux == 0.0
    # a horizontal film with neither radiation nor wind has no exchange at equal temperatures
    with pytest.raises(ValueError, match="emissivity"):
        surface_film(0.3, "horizontal-up", emissivity=0.0)
    surface_film(0.3, "horizontal-up", emissivity=0.0, wind_speed=1.0)  # forced convection: fine


def test_tilted_layer_resistance():
    # Hollands et al. (1976): tilting a layer heated from below weakens convection,
    # so the resistance rises with tilt; tilt 0 is the horizontal layer
    d, dt = 0.04, 10.0
    flat = air_layer_resistance_detailed(d, "up", delta_t=dt)
    assert_allclose(air_layer_resistance_detailed(d, "up", delta_t=dt, tilt=0.0), flat)
    assert air_layer_resistance_detailed(d, "up", delta_t=dt, tilt=45.0) > flat
    with pytest.raises(ValueError, match="tilt"):
        air_layer_resistance_detailed(d, "down", tilt=30.0)
