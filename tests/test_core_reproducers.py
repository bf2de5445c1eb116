"""Frozen reproducers of silent wrong answers in the numeric core (each one fixed).

Each test names the call that used to return a wrong number (or crash with an
unrelated error) and checks that it now raises ``ValueError``/``TypeError``
naming the argument and its unit, or returns the correct finite value. The
domains are common practice (a layer list is not empty, an absolute temperature
is above 0 K); the overflow limits are this project's documented domains
(``workbench._checks.MAX_TEMPERATURE``, ``workbench.air_properties.AIR_TEMPERATURE_LIMITS``).
"""

from __future__ import annotations

import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI

import workbench as wb
from workbench._checks import MAX_TEMPERATURE
from workbench.air_properties import AIR_TEMPERATURE_LIMITS

# --- empty layer lists (were: inf, [nan], 0.0, IndexError) -------------------------------


def test_u_value_of_no_layers_is_refused():
    # was: inf
    with pytest.raises(ValueError, match=r"thicknesses: need at least one layer in m"):
        wb.u_value([], [])


def test_wall_temperatures_of_no_layers_is_refused():
    # was: array([nan])
    with pytest.raises(ValueError, match=r"thicknesses: need at least one layer in m"):
        wb.wall_temperatures([], [], 293.15, 273.15)


def test_series_resistance_of_no_layers_is_refused():
    # was: 0.0
    with pytest.raises(ValueError, match=r"thicknesses: need at least one layer in m"):
        wb.series_resistance([], [])


def test_cylinder_conductance_of_no_layers_is_refused():
    # was: IndexError
    with pytest.raises(ValueError, match=r"thicknesses: need at least one layer in m"):
        wb.cylinder_conductance(0.05, [], [], 1.0)


def test_one_empty_side_of_the_layers_is_refused():
    with pytest.raises(ValueError, match=r"conductivities: need at least one layer in W/\(m·K\)"):
        wb.series_resistance(0.1, [])


# --- absolute temperatures <= 0 K (were accepted) ----------------------------------------


@pytest.mark.parametrize("t_bad", [0.0, -5.0, -273.15])
def test_wall_temperatures_refuse_non_positive_kelvin(t_bad):
    with pytest.raises(ValueError, match=r"t_outside: an absolute temperature must be > 0 in K"):
        wb.wall_temperatures([0.1], [0.04], 293.15, t_bad)
    with pytest.raises(ValueError, match=r"t_inside: an absolute temperature must be > 0 in K"):
        wb.wall_temperatures([0.1], [0.04], t_bad, 273.15)


@pytest.mark.parametrize("t_bad", [0.0, -5.0])
def test_touch_margin_refuses_non_positive_kelvin(t_bad):
    with pytest.raises(ValueError, match=r"limit: an absolute temperature must be > 0 in K"):
        wb.touch_margin(318.15, t_bad)
    with pytest.raises(ValueError, match=r"t_surface: an absolute temperature must be > 0 in K"):
        wb.touch_margin(t_bad, 321.15)


def test_a_celsius_value_given_as_kelvin_is_refused_where_it_is_impossible():
    with pytest.raises(ValueError, match="give kelvin, not °C"):
        wb.mean_conductivity([250.0, 350.0], [0.02, 0.03], -20.0, 20.0)


# --- booleans (heat_flux(True, 0.05, 20.0) gave 400) ---------------------------------------


@pytest.mark.parametrize(
    "call, name",
    [
        (lambda: wb.heat_flux(True, 0.05, 20.0), "k"),
        (lambda: wb.u_value([0.1, True], [1.0, 0.04]), "thicknesses"),
        (lambda: wb.radiation_coefficient(False, 300.0, 280.0), "emissivity"),
        (lambda: wb.billable_mass(0.3, 0.45, 0.65, True, 0.006), "actual_mass"),
        (lambda: wb.solve_housing(0.2, 0.1, 0.05, 0.002, 167.0, 0.82, 5.0, 298.15,
                                  max_iterations=True), "max_iterations"),
        (lambda: wb.enumerate_stacks([0.04], [30.0], [100.0], [0.01], n_layers=True), "n_layers"),
    ],
)
def test_booleans_are_refused(call, name):
    with pytest.raises((ValueError, TypeError), match=name):
        call()


# --- overflow and results that are not finite -------------------------------------------


def test_radiation_coefficient_refuses_temperatures_beyond_the_domain():
    # was: inf (σ T³ overflows)
    with pytest.raises(ValueError, match=rf"t_surface: must be <= {MAX_TEMPERATURE:g} in K"):
        wb.radiation_coefficient(0.9, 1e300, 298.15)


def test_radiation_coefficient_at_the_domain_limit_is_finite():
    # exact linearisation, εσ(Ts² + Ta²)(Ts + Ta), checked against its own definition
    # q = εσ(Ts⁴ − Ta⁴) (Stefan–Boltzmann law; CODATA σ via scipy.constants)
    from scipy.constants import Stefan_Boltzmann as sigma

    ts, ta = MAX_TEMPERATURE, 298.15
    h = wb.radiation_coefficient(0.9, ts, ta)
    assert np.isfinite(h)
    assert h * (ts - ta) == pytest.approx(0.9 * sigma * (ts**4 - ta**4), rel=1e-12)


def test_air_layer_resistance_refuses_a_huge_mean_temperature():
    # was: 0.0 (h_r = 4σT³ overflowed to inf)
    with pytest.raises(ValueError, match="t_mean: must be <= 10000 in K"):
        wb.air_layer_resistance(0.025, "horizontal", t_mean=1e300)


@pytest.mark.parametrize("t", [AIR_TEMPERATURE_LIMITS[0] * 0.99, AIR_TEMPERATURE_LIMITS[1] * 1.01])
def test_air_fits_refuse_temperatures_outside_their_hard_limits(t):
    with pytest.raises(ValueError, match=r"t: the dry-air property fits hold for 85–1000 K"):
        wb.air_properties(t)


def test_air_hard_lower_limit_lies_above_the_dew_point_of_air():
    # CoolProp (pseudo-pure fluid "Air"): dew point at 1 atm, about 81.7 K
    dew = PropsSI("T", "P", 101325.0, "Q", 1, "Air")
    assert dew < AIR_TEMPERATURE_LIMITS[0] < dew + 5.0


def test_air_fits_within_six_percent_of_coolprop_up_to_the_hard_upper_limit():
    # CoolProp as the oracle at the hard limits of the fits (the 150–500 K band is
    # checked tighter in test_air_properties.py)
    import warnings

    from workbench._checks import ValidityWarning

    for t in AIR_TEMPERATURE_LIMITS:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            p = wb.air_properties(t)
        for ours, key in ((p.conductivity, "L"), (p.viscosity, "V"), (p.specific_heat, "C")):
            ref = PropsSI(key, "T", t, "P", 101325.0, "Air")
            assert float(ours) == pytest.approx(ref, rel=0.06), (t, key)


def test_natural_convection_refuses_an_overflowing_rayleigh_number():
    with pytest.raises(ValueError, match="length: the Rayleigh number"):
        wb.natural_convection_coefficient(313.15, 293.15, 1e300, "vertical")


def test_u_value_underflowing_resistance_is_refused():
    # 1e-300 m of a 1e300 W/(m·K) layer: R underflows to 0 and U would be inf
    with pytest.raises(ValueError, match="u_value: the result is not finite.*thicknesses"):
        wb.u_value([1e-300], [1e300])


# --- monte_carlo: bad limit_criterion (was IndexError), NaN from the model (was NaN percentiles)


def _flux(s):
    return s["k"] * 20.0 / s["L"]


def test_monte_carlo_bad_limit_criterion_names_the_allowed_values():
    with pytest.raises(ValueError, match=r"limit_criterion: must be one of \[0\].*got 3"):
        wb.monte_carlo(_flux, {"k": [0.04, 0.03], "L": 0.05}, {"k": 0.1}, n_samples=50,
                       limit=15.0, limit_criterion=3)


def test_monte_carlo_negative_limit_criterion_is_refused():
    with pytest.raises(ValueError, match="limit_criterion: must be >= 0"):
        wb.monte_carlo(_flux, {"k": [0.04, 0.03], "L": 0.05}, {"k": 0.1}, n_samples=50,
                       limit=15.0, limit_criterion=-1)


def test_monte_carlo_model_returning_nan_names_candidate_and_sample():
    def model(s):
        out = _flux(s).copy()
        out[:, 1] = np.nan  # candidate 1 always fails
        return out

    with pytest.raises(ValueError, match=r"model: returned nan .*candidate 1, criterion 0 at sample 0"):
        wb.monte_carlo(model, {"k": [0.04, 0.03], "L": 0.05}, {"k": 0.1}, n_samples=50)


def test_monte_carlo_model_returning_inf_is_refused():
    def model(s):
        with np.errstate(divide="ignore"):
            return s["k"] / (s["L"] - 0.05)  # L without tolerance: division by zero

    with pytest.raises(ValueError, match=r"model: returned inf .*L=0\.05"):
        wb.monte_carlo(model, {"k": [0.04], "L": 0.05}, {"k": 0.1}, n_samples=10)


# --- messages name the argument for text and None too ------------------------------------


@pytest.mark.parametrize("bad", ["0.05 m", None])
def test_text_and_none_name_the_argument_and_unit(bad):
    with pytest.raises((ValueError, TypeError), match=r"thickness: expected a number in m"):
        wb.heat_flux(0.04, bad, 20.0)
