"""Tests for the unit boundary (workbench.units).

Reference values come from outside the project:

* NIST Special Publication 811, *Guide for the Use of the International System
  of Units (SI)*, 2008 edition, Appendix B.8 (factors for units listed
  alphabetically) and Appendix B.9 (temperature). Factors are checked to the
  digits NIST prints (relative 1e-6); factors NIST marks as exact are checked
  to float precision.
* ``scipy.constants`` (CODATA / definitions) used only as an independent oracle.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.constants as sc
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from workbench import units
from workbench.units import (
    CURRENCIES,
    KINDS,
    Q_,
    SYSTEMS,
    UnitError,
    axis_label,
    check_kind,
    check_system,
    display_unit,
    format_quantity,
    from_si,
    parse,
    parse_cost,
    to_si,
    ureg,
)

REL = 1e-6  # NIST SP 811 prints 7 significant digits

# ---------------------------------------------------------------------------
# NIST SP 811 (2008), Appendix B.8 -- conversion factors
# ---------------------------------------------------------------------------
# (text, kind, factor to SI as printed in NIST SP 811 App. B.8)
NIST_811_B8 = [
    # "British thermal unit_IT inch per hour square foot degree Fahrenheit" -> W/(m·K)
    ("1 Btu*in/(h*ft^2*degF)", "conductivity", 0.1442279),
    ("1 Btu·in/(h·ft²·°F)", "conductivity", 0.1442279),
    # "British thermal unit_IT per hour foot degree Fahrenheit" -> W/(m·K)
    ("1 Btu/(h·ft·°F)", "conductivity", 1.730735),
    # "degree Fahrenheit hour square foot per British thermal unit_IT" -> m²·K/W
    ("1 h·ft²·°F/Btu", "resistance", 0.1761102),
    # "British thermal unit_IT per hour square foot degree Fahrenheit" -> W/(m²·K)
    ("1 Btu/(h·ft²·°F)", "u_value", 5.678263),
    # "British thermal unit_IT per hour" -> W
    ("1 Btu/h", "power", 0.2930711),
    # "pound per cubic foot" -> kg/m³
    ("1 lb/ft^3", "density", 16.01846),
    # "British thermal unit_IT per pound degree Fahrenheit" -> J/(kg·K), exact
    ("1 Btu/(lb·°F)", "specific_heat", 4186.8),
    # "British thermal unit_IT" -> J
    ("1 Btu", "energy", 1055.056),
]

# Further App. B.8 entries, from memory of NIST SP 811 (2008) App. B.8; each is
# also re-derived below from the exact inch, pound and IT-calorie definitions.
NIST_811_B8_FROM_MEMORY = [
    ("1 Btu/(h·ft²)", "heat_flux", 3.154591),  # Btu_IT/(h·ft²) -> W/m²
    ("1 lb/ft²", "mass_per_area", 4.882428),  # pound per square foot -> kg/m²
    ("1 ft³", "volume", 2.831685e-2),  # cubic foot -> m³
    ("1 ft²", "area", 9.290304e-2),  # square foot -> m², exact
    ("1 ft/min", "velocity", 5.08e-3),  # foot per minute -> m/s, exact
    ("1 Btu/lb", "latent_heat", 2326.0),  # Btu_IT per pound -> J/kg, exact
    ("1 Btu/°F", "heat_capacity", 1899.101),  # Btu_IT per degree Fahrenheit -> J/K
]


@pytest.mark.parametrize(("text", "kind", "factor"), NIST_811_B8)
def test_nist_sp811_factors(text, kind, factor):
    # NIST SP 811 (2008 ed.), Appendix B.8, factors for Btu_IT-based units.
    assert parse(text, kind, "value") == pytest.approx(factor, rel=REL)


@pytest.mark.parametrize(("text", "kind", "factor"), NIST_811_B8_FROM_MEMORY)
def test_nist_sp811_factors_from_memory(text, kind, factor):
    # From memory of NIST SP 811 (2008 ed.), Appendix B.8.
    assert parse(text, kind, "value") == pytest.approx(factor, rel=REL)


def test_inch_and_pound_are_exact():
    # NIST SP 811 (2008 ed.), App. B.8: 1 in = 2.54 E-02 m and
    # 1 lb (avoirdupois) = 4.5359237 E-01 kg, both exact by definition.
    assert parse("1 in", "length", "length") == 0.0254
    assert parse("1 lb", "mass", "mass") == pytest.approx(0.45359237, rel=1e-15)
    assert parse("1 ft", "length", "length") == pytest.approx(0.3048, rel=1e-15)


def test_btu_is_the_international_table_btu():
    # NIST SP 811 (2008 ed.), App. B.8: Btu_IT = 1.055056 E+03 J,
    # Btu_th = 1.054350 E+03 J. The IT Btu is exactly
    # 4.1868 J/(g·K) (IT calorie) x 453.59237 g x 5/9 K = 1055.05585262 J.
    btu_it_exact = 4.1868 * 453.59237 * 5.0 / 9.0
    assert parse("1 Btu", "energy", "energy") == pytest.approx(btu_it_exact, rel=1e-13)
    assert parse("1 BTU", "energy", "energy") == pytest.approx(btu_it_exact, rel=1e-13)
    assert Q_(1, "british_thermal_unit").m_as("J") == pytest.approx(btu_it_exact, rel=1e-13)
    # The ISO Btu (1055.056 J) stays available under its own name, not as "Btu".
    assert Q_(1, "Btu_iso").m_as("J") == pytest.approx(1055.056, rel=1e-13)
    # The thermochemical Btu differs at the 7th digit; make sure we are not using it.
    assert parse("1 Btu", "energy", "energy") != pytest.approx(1054.350, rel=REL)
    # 1 Btu/(lb·°F) is exactly 4186.8 J/(kg·K) only for the IT Btu (NIST SP 811,
    # App. B.8 prints 4.1868 E+03 as exact); the ISO Btu would be 1.4e-7 off.
    assert parse("1 Btu/(lb*degF)", "specific_heat", "c") == pytest.approx(4186.8, rel=1e-12)


# ---------------------------------------------------------------------------
# scipy.constants as an independent oracle
# ---------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("text", "kind", "expected"),
    [
        ("1 in", "length", sc.inch),
        ("1 ft", "length", sc.foot),
        ("1 lb", "mass", sc.pound),
        ("1 Btu", "energy", sc.Btu_IT),
        ("1 h", "time", sc.hour),
        ("1 day", "time", sc.day),
        ("1 Btu/h", "power", sc.Btu_IT / sc.hour),
        (
            "1 Btu*in/(h*ft^2*degF)",
            "conductivity",
            sc.Btu_IT * sc.inch / (sc.hour * sc.foot**2 * sc.degree_Fahrenheit),
        ),
        ("1 Btu/(lb*degF)", "specific_heat", sc.Btu_IT / (sc.pound * sc.degree_Fahrenheit)),
        ("1 lb/ft^3", "density", sc.pound / sc.foot**3),
        ("1 ft/min", "velocity", sc.foot / sc.minute),
        ("139 in^3/lb", "volume_per_mass", 139 * sc.inch**3 / sc.pound),
        ("1 °F", "temperature_difference", sc.degree_Fahrenheit),
        ("0 °C", "temperature", sc.zero_Celsius),
    ],
)
def test_against_scipy_constants(text, kind, expected):
    # scipy.constants (definitions: inch, foot, pound, Btu_IT, hour, degree_Fahrenheit).
    assert parse(text, kind, "value") == pytest.approx(expected, rel=1e-12)


def test_temperature_array_against_scipy_convert_temperature():
    # scipy.constants.convert_temperature as an independent oracle for the offsets.
    fahrenheit = np.array([-459.67, -40.0, 32.0, 77.0, 212.0, 1000.0])
    expected = sc.convert_temperature(fahrenheit, "Fahrenheit", "Kelvin")
    assert_allclose(to_si(fahrenheit, "°F", "temperature", "t"), expected, rtol=1e-13, atol=1e-10)
    celsius = np.array([-273.15, -40.0, 0.0, 20.0, 100.0])
    expected = sc.convert_temperature(celsius, "Celsius", "Kelvin")
    assert_allclose(to_si(celsius, "degC", "temperature", "t"), expected, rtol=1e-13, atol=1e-10)
    back = from_si(expected, "temperature", "US")
    assert_allclose(back, sc.convert_temperature(celsius, "Celsius", "Fahrenheit"), atol=1e-10)


# ---------------------------------------------------------------------------
# Temperature: absolute vs difference
# ---------------------------------------------------------------------------
# NIST SP 811 (2008 ed.), App. B.9: T/K = t/°C + 273.15; T/K = (t/°F + 459.67)/1.8;
# a difference of 1 °F is 5/9 K and 1 °C is 1 K (ITS-90 keeps the same relation).
@pytest.mark.parametrize(
    ("text", "kind", "expected"),
    [
        ("77 °F", "temperature", 298.15),
        ("77 degF", "temperature", 298.15),
        ("77 ℉", "temperature", 298.15),
        ("0 °C", "temperature", 273.15),
        ("20 °C", "temperature", 293.15),
        ("20 degC", "temperature", 293.15),
        ("293.15 K", "temperature", 293.15),
        ("-40 °C", "temperature", 233.15),
        ("−40 °F", "temperature", 233.15),  # unicode minus sign
        ("491.67 degR", "temperature", 273.15),
        ("5 K", "temperature_difference", 5.0),
        ("9 °F", "temperature_difference", 5.0),
        ("9 delta_degF", "temperature_difference", 5.0),
        ("10 °C", "temperature_difference", 10.0),
        ("10 delta_degC", "temperature_difference", 10.0),
        ("-18 °F", "temperature_difference", -10.0),
    ],
)
def test_temperature_offsets(text, kind, expected):
    assert parse(text, kind, "t") == pytest.approx(expected, rel=1e-12)


def test_minus_forty_is_the_same_in_celsius_and_fahrenheit():
    # Common-practice fact following from NIST SP 811 App. B.9 relations.
    assert parse("-40 °C", "temperature", "t") == pytest.approx(
        parse("-40 °F", "temperature", "t"), rel=1e-13
    )
    assert from_si(233.15, "temperature", "US") == pytest.approx(-40.0, abs=1e-10)
    assert from_si(233.15, "temperature", "SI") == pytest.approx(-40.0, abs=1e-10)


def test_degrees_inside_compound_units_are_differences():
    # 1 Btu/(lb·°F) must not pick up the 255.37 K offset of an absolute °F.
    assert parse("1 Btu/(lb*degF)", "specific_heat", "c") == pytest.approx(
        parse("1 Btu/(lb*delta_degF)", "specific_heat", "c"), rel=1e-14
    )
    # W/(m·°C) equals W/(m·K): a 1 °C difference is 1 K (NIST SP 811 App. B.9).
    assert parse("1 W/(m·°C)", "conductivity", "k") == pytest.approx(1.0, rel=1e-14)


def test_difference_unit_rejected_for_absolute_temperature():
    with pytest.raises(
        UnitError, match=r"t_inside: .*temperature difference.*absolute temperature"
    ):
        parse("5 delta_degF", "temperature", "t_inside")


def test_below_absolute_zero_rejected():
    with pytest.raises(UnitError, match=r"t_outside: .*below absolute zero"):
        parse("-300 °C", "temperature", "t_outside")
    with pytest.raises(UnitError, match="t_outside"):
        to_si([20.0, -500.0], "°F", "temperature", "t_outside")


# ---------------------------------------------------------------------------
# Input syntax
# ---------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("text", "kind", "expected"),
    [
        # exact inch and foot, NIST SP 811 (2008 ed.) App. B.8
        ("25 mm", "thickness", 0.025),
        ("1 in", "thickness", 0.0254),
        ("1in", "thickness", 0.0254),
        ("0.5 ft", "length", 0.1524),
        (".5 in", "thickness", 0.0127),
        ("1e-3 m", "thickness", 1e-3),
        ("2 µm", "thickness", 2e-6),
        ("0.035 W/(m·K)", "conductivity", 0.035),
        ("0.035 W/m/K", "conductivity", 0.035),
        ("0.035 W m^-1 K^-1", "conductivity", 0.035),
        ("0.035 W·m⁻¹·K⁻¹", "conductivity", 0.035),
        ("0.035 W/(m*K)", "conductivity", 0.035),
        ("2.5 m²·K/W", "resistance", 2.5),
        ("2.5 m2K/W", "resistance", 2.5),
        ("0.3 W/m2K", "u_value", 0.3),
        ("0.3 W/(m²·K)", "u_value", 0.3),
        ("30 kg/m³", "density", 30.0),
        ("30 kg/m3", "density", 30.0),
        ("30 kg/m**3", "density", 30.0),
        ("334 kJ/kg", "latent_heat", 334e3),
        ("48 h", "time", 48 * 3600.0),
        ("90 %", "dimensionless", 0.9),
        ("0.9", "dimensionless", 0.9),
        # common-practice dimensional-weight divisors of parcel carriers
        ("6000 cm^3/kg", "volume_per_mass", 6e-3),
        ("5000 cm³/kg", "volume_per_mass", 5e-3),
    ],
)
def test_parse_syntax(text, kind, expected):
    assert parse(text, kind, "value") == pytest.approx(expected, rel=1e-12)


def test_bare_number_uses_default_unit():
    assert parse("25", "thickness", "thickness", default_unit="mm") == pytest.approx(0.025)
    assert parse(25, "thickness", "thickness", default_unit="mm") == pytest.approx(0.025)
    assert parse("68", "temperature", "t", default_unit="°F") == pytest.approx(293.15)
    # an explicit unit wins over the default
    assert parse("1 in", "thickness", "thickness", default_unit="mm") == pytest.approx(0.0254)


def test_us_and_si_inputs_give_the_same_si_value():
    # Unit invariance: 1 in = 25.4 mm exactly (NIST SP 811 App. B.8).
    assert parse("1 in", "thickness", "t") == pytest.approx(parse("25.4 mm", "thickness", "t"))
    # 1 Btu·in/(h·ft²·°F) is 1/12 Btu/(h·ft·°F) (12 in = 1 ft).
    assert parse("12 Btu*in/(h*ft^2*degF)", "conductivity", "k") == pytest.approx(
        parse("1 Btu/(h*ft*degF)", "conductivity", "k"), rel=1e-13
    )


# ---------------------------------------------------------------------------
# Errors: the message names the field and the expected dimension
# ---------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("text", "kind", "field", "fragments"),
    [
        (
            "25 kg",
            "thickness",
            "thickness",
            [
                'thickness: "25 kg" has the wrong dimension',
                'expected a length such as "25 mm" or "1 in"',
            ],
        ),
        (
            "0.035 W/m^2",
            "conductivity",
            "k_insulation",
            ["k_insulation:", "wrong dimension", "expected a thermal conductivity", "W/(m·K)"],
        ),
        (
            "5 m",
            "temperature",
            "t_outside",
            ["t_outside:", "wrong dimension", "expected an absolute temperature", "°C"],
        ),
        (
            "25 furlongz",
            "length",
            "box_length",
            ['box_length: unknown unit "furlongz"', "expected a length"],
        ),
        ("3 blorps/m", "density", "rho", ["rho: unknown unit", "expected a density", "kg/m³"]),
        ("", "thickness", "thickness", ["thickness: no value given", "expected a length"]),
        ("   ", "u_value", "u_target", ["u_target: no value given", "expected a U-value"]),
        (
            "abc",
            "thickness",
            "thickness",
            ["thickness:", "does not start with a number", "expected a length"],
        ),
        ("nan mm", "thickness", "thickness", ["thickness:", "not a finite number"]),
        (
            "inf W/(m·K)",
            "conductivity",
            "k",
            ["k:", "not a finite number", "expected a thermal conductivity"],
        ),
        ("25", "thickness", "thickness", ['thickness: "25" has no unit', "expected a length"]),
        ("0.04", "conductivity", "k", ["k:", "has no unit", "expected a thermal conductivity"]),
        ("20 C", "temperature", "t", ["t:", "wrong dimension", "°C"]),
        ("0.035 W/mK", "conductivity", "k", ["k:", "millikelvin", "W/(m·K)"]),
        ("1,5 mm", "thickness", "thickness", ["thickness:", "decimal separator"]),
        ("2 EUR/kg", "density", "rho", ["rho:", "wrong dimension", "expected a density"]),
    ],
)
def test_error_messages_name_field_and_expected_dimension(text, kind, field, fragments):
    with pytest.raises(UnitError) as info:
        parse(text, kind, field)
    message = str(info.value)
    for fragment in fragments:
        assert fragment in message, (fragment, message)


def test_unit_error_is_a_value_error():
    with pytest.raises(ValueError):
        parse("25 kg", "thickness", "thickness")


def test_unknown_kind_and_system_list_valid_names():
    with pytest.raises(ValueError, match=r"unknown quantity kind 'thicknes'.*'thickness'"):
        parse("25 mm", "thicknes", "t")
    with pytest.raises(ValueError, match=r"unknown unit system 'SI units'.*'SI', 'US'"):
        from_si(1.0, "thickness", "SI units")
    with pytest.raises(ValueError, match="'SI', 'US'"):
        check_system("metric")
    assert check_system("US") == "US"
    assert check_kind("u_value").name == "u_value"


def test_to_si_errors():
    with pytest.raises(UnitError, match=r"k: .*wrong dimension.*thermal conductivity"):
        to_si([0.03, 0.04], "W/m^2", "conductivity", "k")
    with pytest.raises(UnitError, match=r"thickness: no unit given.*expected a length"):
        to_si(1.0, "", "thickness", "thickness")
    with pytest.raises(UnitError, match=r"thickness: values must be finite"):
        to_si([1.0, np.nan], "mm", "thickness", "thickness")
    with pytest.raises(UnitError, match=r"thickness: values must be finite"):
        to_si([1.0, np.inf], "mm", "thickness", "thickness", allow_nan=True)


def test_to_si_is_vectorised_and_keeps_shape():
    x = np.array([[1.0, 2.0], [3.0, 4.0]])
    out = to_si(x, "in", "thickness", "thickness")
    assert out.shape == (2, 2)
    assert_allclose(out, x * 0.0254, rtol=1e-15)  # exact inch, NIST SP 811 App. B.8
    assert isinstance(to_si(1.0, "in", "thickness", "thickness"), float)
    with_gap = to_si([1.0, np.nan], "mm", "thickness", "thickness", allow_nan=True)
    assert with_gap[0] == pytest.approx(1e-3) and math.isnan(with_gap[1])


# ---------------------------------------------------------------------------
# Costs and currencies
# ---------------------------------------------------------------------------
def test_costs_convert_only_the_physical_part():
    # 1 USD/lb = 1/0.45359237 USD/kg (exact pound, NIST SP 811 App. B.8).
    value, code = parse_cost("1 USD/lb", "cost_per_mass", "cost")
    assert code == "USD" and value == pytest.approx(1 / 0.45359237, rel=1e-14)
    value, code = parse_cost("120 €/m³", "cost_per_volume", "cost")
    assert (value, code) == (pytest.approx(120.0), "EUR")
    value, code = parse_cost("1 GBP/ft^2", "cost_per_area", "cost")
    assert code == "GBP" and value == pytest.approx(1 / 0.09290304, rel=1e-13)
    assert parse("3 USD/m^3", "cost_per_volume", "cost") == pytest.approx(3.0)
    # A bare unit without a code takes the expected currency.
    assert parse_cost("2", "cost_per_mass", "cost", default_unit="/kg", currency="EUR") == (
        pytest.approx(2.0),
        "EUR",
    )


def test_currency_errors():
    with pytest.raises(UnitError, match=r"cost: .*GBP but EUR is expected"):
        parse("2 GBP/kg", "cost_per_mass", "cost", currency="EUR")
    with pytest.raises(UnitError, match=r"cost: .*no currency code.*cost per mass"):
        parse("2 /kg", "cost_per_mass", "cost")
    with pytest.raises(UnitError, match=r"cost: .*ambiguous"):
        parse("2 $/kg", "cost_per_mass", "cost")
    with pytest.raises(UnitError, match=r"cost: .*mixes currencies"):
        parse("2 EUR/USD", "cost_per_mass", "cost")
    with pytest.raises(UnitError, match=r"cost: .*wrong dimension.*cost per volume"):
        parse("2 EUR/kg", "cost_per_volume", "cost")
    with pytest.raises(ValueError, match="valid codes"):
        parse("2 EUR/kg", "cost_per_mass", "cost", currency="XYZ")


def test_currencies_are_not_registry_units():
    # No exchange rates: a currency code must never convert silently.
    with pytest.raises(Exception, match="EUR"):
        Q_(1, "EUR").to("USD")
    assert "currency" in str(ureg.get_dimensionality("currency"))
    assert set(CURRENCIES) >= {"EUR", "USD", "GBP"}


# ---------------------------------------------------------------------------
# Display
# ---------------------------------------------------------------------------
def test_display_units_and_labels():
    assert display_unit("conductivity", "SI") == "W/(m·K)"
    assert display_unit("conductivity", "US") == "Btu·in/(h·ft²·°F)"
    assert display_unit("resistance", "SI") == "m²·K/W"
    assert display_unit("resistance", "US") == "h·ft²·°F/Btu"
    assert display_unit("temperature", "SI") == "°C"
    assert display_unit("temperature", "US") == "°F"
    assert display_unit("thickness", "SI") == "mm"
    assert display_unit("thickness", "US") == "in"
    assert display_unit("cost_per_mass", "US", currency="USD") == "USD/lb"
    assert axis_label("temperature_difference", "SI") == "ΔT [K]"
    assert axis_label("temperature_difference", "US") == "ΔT [°F]"
    assert axis_label("dimensionless", name="Emissivity") == "Emissivity [–]"


def test_format_quantity():
    assert format_quantity(0.025, "thickness") == "25 mm"
    assert format_quantity(0.0254, "thickness", "US") == "1 in"
    assert format_quantity(0.035, "conductivity") == "0.035 W/(m·K)"
    assert format_quantity(293.15, "temperature") == "20.0 °C"
    assert format_quantity(298.15, "temperature", "US") == "77.0 °F"
    assert format_quantity(5.0, "temperature_difference", "US") == "9 °F"
    assert format_quantity(48 * 3600.0, "time") == "48 h"
    assert format_quantity(1234.0, "power", sig=2) == "1200 W"
    assert format_quantity(0.1442279, "conductivity", "US") == "1 Btu·in/(h·ft²·°F)"
    assert format_quantity(2.0, "cost_per_mass", currency="EUR") == "2 EUR/kg"
    assert format_quantity(0.9, "dimensionless") == "0.9"
    assert format_quantity(float("nan"), "power") == "n/a W"
    with pytest.raises(ValueError, match="sig"):
        format_quantity(1.0, "power", sig=0)


def test_from_si_with_explicit_unit():
    assert from_si(0.025, "thickness", unit="cm") == pytest.approx(2.5)
    assert from_si(293.15, "temperature", unit="K") == pytest.approx(293.15)
    with pytest.raises(UnitError, match="wrong dimension"):
        from_si(0.025, "thickness", unit="kg")


@pytest.mark.parametrize("kind", sorted(KINDS))
def test_kind_examples_parse(kind):
    # The examples quoted in error messages must themselves be valid input.
    si_example, us_example = KINDS[kind].examples
    for example in (si_example, us_example):
        assert math.isfinite(parse(example, kind, "example"))


# ---------------------------------------------------------------------------
# Round trips (hypothesis)
# ---------------------------------------------------------------------------
def _display_range(kind: str, system: str) -> tuple[float, float]:
    if kind == "temperature":
        return (-250.0, 1500.0) if system == "SI" else (-400.0, 2500.0)
    if kind == "temperature_difference":
        return (-500.0, 500.0)
    return (1e-6, 1e7)


@settings(max_examples=300, deadline=None)
@given(
    kind=st.sampled_from(sorted(KINDS)),
    system=st.sampled_from(SYSTEMS),
    fraction=st.floats(min_value=0.0, max_value=1.0),
)
def test_round_trip_display_to_si_and_back(kind, system, fraction):
    low, high = _display_range(kind, system)
    x = low + fraction * (high - low)
    currency = "EUR" if KINDS[kind].is_cost else None
    label = display_unit(kind, system, currency=currency)
    si = to_si(x, label, kind, "value")
    assert from_si(si, kind, system) == pytest.approx(x, rel=1e-12, abs=1e-9)
    # the text form goes the same way
    if label:
        assert parse(f"{x!r} {label}", kind, "value") == pytest.approx(si, rel=1e-12, abs=1e-9)


@settings(max_examples=200, deadline=None)
@given(
    kind=st.sampled_from(sorted(k for k in KINDS if k != "temperature")),
    system=st.sampled_from(SYSTEMS),
    values=st.lists(st.floats(min_value=-1e6, max_value=1e6), min_size=1, max_size=5),
)
def test_round_trip_si_to_display_and_back_arrays(kind, system, values):
    si = np.array(values)
    shown = from_si(si, kind, system)
    currency = "EUR" if KINDS[kind].is_cost else None
    back = to_si(shown, display_unit(kind, system, currency=currency), kind, "value")
    assert_allclose(back, si, rtol=1e-12, atol=1e-9)


def test_module_is_the_only_registry():
    # The registry is a single instance; Q_ belongs to it.
    assert Q_ is ureg.Quantity
    assert units.ureg is ureg
