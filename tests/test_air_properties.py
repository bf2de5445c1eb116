"""Dry-air property fits checked against CoolProp and handbook values."""

import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI
from hypothesis import given
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from workbench._checks import ValidityWarning
from workbench.air_properties import (
    air_conductivity,
    air_density,
    air_properties,
    air_specific_heat,
    air_viscosity,
)

P_ATM = 101325.0
TEMPS = np.array([150.0, 175.0, 200.0, 250.0, 273.15, 300.0, 350.0, 400.0, 450.0, 500.0])


def coolprop(name, temps, pressure=P_ATM):
    # test-only oracle: CoolProp pseudo-pure "Air" (Lemmon et al. 2000/2004)
    return np.array([PropsSI(name, "T", t, "P", pressure, "Air") for t in temps])


@pytest.mark.parametrize(
    ("attribute", "coolprop_name", "rtol"),
    [
        # tolerances stated in the module docstring (largest gaps at 150 K)
        ("density", "D", 0.007),
        ("specific_heat", "C", 0.003),
        ("viscosity", "V", 0.015),
        ("conductivity", "L", 0.035),
        ("prandtl", "Prandtl", 0.035),
    ],
)
def test_properties_against_coolprop(attribute, coolprop_name, rtol):
    props = air_properties(TEMPS)
    assert_allclose(getattr(props, attribute), coolprop(coolprop_name, TEMPS), rtol=rtol)


def test_properties_closer_to_coolprop_near_room_temperature():
    t = np.array([260.0, 280.0, 300.0, 320.0, 340.0])
    props = air_properties(t)
    assert_allclose(props.conductivity, coolprop("L", t), rtol=0.012)
    assert_allclose(props.viscosity, coolprop("V", t), rtol=0.006)
    assert_allclose(props.prandtl, coolprop("Prandtl", t), rtol=0.012)


def test_derived_properties_against_coolprop():
    t = np.array([200.0, 300.0, 400.0])
    props = air_properties(t)
    nu = coolprop("V", t) / coolprop("D", t)
    alpha = coolprop("L", t) / (coolprop("D", t) * coolprop("C", t))
    assert_allclose(props.kinematic_viscosity, nu, rtol=0.02)
    assert_allclose(props.diffusivity, alpha, rtol=0.035)
    # ideal gas: beta = 1/T; CoolProp's isobaric expansion coefficient agrees closely at 1 atm
    assert_allclose(
        props.expansion_coefficient, coolprop("isobaric_expansion_coefficient", t), rtol=0.01
    )


def test_against_incropera_table_a4_at_300k():
    # Incropera 7th ed., Table A.4, air at 300 K (values from memory):
    # k = 26.3e-3 W/(m·K), mu = 184.6e-7 N·s/m², cp = 1.007 kJ/(kg·K), Pr = 0.707
    assert_allclose(air_conductivity(300.0), 26.3e-3, rtol=0.01)
    assert_allclose(air_viscosity(300.0), 184.6e-7, rtol=0.01)
    assert_allclose(air_specific_heat(300.0), 1007.0, rtol=0.002)
    assert_allclose(air_properties(300.0).prandtl, 0.707, rtol=0.01)


def test_density_scales_with_pressure():
    # ideal gas law (common practice): rho proportional to p at fixed T
    assert_allclose(air_density(300.0, 2 * P_ATM), 2 * air_density(300.0), rtol=1e-12)
    assert_allclose(air_density(300.0, 50e3), coolprop("D", [300.0], 50e3), rtol=0.002)


def test_broadcasting():
    props = air_properties(np.array([[250.0], [300.0]]), np.array([90e3, 101325.0, 110e3]))
    assert props.density.shape == (2, 3)
    assert air_conductivity(TEMPS).shape == TEMPS.shape


def test_outside_fitted_range_warns():
    with pytest.warns(ValidityWarning, match="outside the fitted range"):
        air_conductivity(120.0)
    with pytest.warns(ValidityWarning):
        air_properties(np.array([300.0, 600.0]))


@pytest.mark.parametrize("bad", [0.0, -5.0, np.nan, np.inf])
def test_invalid_temperature_raises(bad):
    with pytest.raises(ValueError, match="t: .*K"):
        air_viscosity(bad)


def test_shape_mismatch_raises():
    with pytest.raises(ValueError, match="do not broadcast"):
        air_properties(np.ones(3) * 300, np.ones(2) * P_ATM)


@given(st.floats(min_value=150.0, max_value=499.0))
def test_conductivity_and_viscosity_increase_with_temperature(t):
    # kinetic theory of gases (common practice): k and mu rise with T for a gas
    assert air_conductivity(t + 1.0) > air_conductivity(t)
    assert air_viscosity(t + 1.0) > air_viscosity(t)
