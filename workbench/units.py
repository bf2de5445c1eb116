"""The unit boundary: text with units in, SI floats out, display units back.

This is the only module that imports :mod:`pint` and the only place that
creates a unit registry. Everything behind it (the numeric core, the study
objects) works in SI floats and numpy arrays: m, K, W, kg, J, s.

Each input belongs to a quantity *kind* (``"thickness"``, ``"conductivity"``,
``"temperature"``, ...). A kind fixes the SI unit the core uses, the unit shown
in the SI and in the US-customary display, and the dimension an input must
have. :func:`parse` turns ``"25 mm"`` into ``0.025``; :func:`to_si` does the
same for a magnitude (or an array of them) and a unit string; :func:`from_si`,
:func:`display_unit`, :func:`axis_label` and :func:`format_quantity` go back
for tables, axes and reports.

Temperatures
------------
An absolute temperature (kind ``"temperature"``) and a temperature difference
(kind ``"temperature_difference"``) are different kinds. ``"77 °F"`` as a
temperature is 298.15 K; ``"9 °F"`` as a difference is 5 K and ``"10 °C"`` as a
difference is 10 K. Inside compound units (``"Btu·in/(h·ft²·°F)"``) a degree
always means a difference.

British thermal unit
--------------------
``Btu`` here is the International Table Btu, 1055.05585262 J, the unit that
the US-customary factors of NIST SP 811 (Appendix B.8) are given for. Pint's
default ``Btu`` is the ISO value 1055.056 J; this registry redefines ``Btu``,
``BTU`` and ``british_thermal_unit`` to the IT value and keeps the ISO value
under ``Btu_iso``.

Currencies
----------
Costs are indicative and never converted between currencies (no exchange
rates). The registry has one base dimension ``[currency]`` with one unit,
``currency``. A currency code in the text (``"2.5 EUR/kg"``, ``"€"``, ``"£"``)
is read as a label: it is replaced by ``currency`` for the dimension check and
returned by :func:`parse_cost`, and a code that differs from the expected one
raises :class:`UnitError`. The codes are deliberately *not* pint units, so
``Q_(1, "EUR")`` fails loudly instead of converting EUR to USD at 1:1.

References
----------
.. [NIST811] A. Thompson and B. N. Taylor, *Guide for the Use of the
   International System of Units (SI)*, NIST Special Publication 811, 2008
   edition, Appendix B.8 (factors) and B.9 (temperature).
"""

from __future__ import annotations

import functools
import math
import re
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType
from typing import TYPE_CHECKING, Any

import numpy as np

from workbench._checks import scalar_or_array

if TYPE_CHECKING:
    import pint

__all__ = [
    "registry",
    "ureg",  # noqa: F822 (module __getattr__, created on first use)
    "Q_",  # noqa: F822 (module __getattr__, created on first use)
    "UnitError",
    "SYSTEMS",
    "CURRENCIES",
    "KINDS",
    "EMISSIVITY",
    "FRACTION",
    "Kind",
    "check_system",
    "check_kind",
    "parse",
    "parse_cost",
    "to_si",
    "from_si",
    "display_unit",
    "axis_label",
    "format_quantity",
]


# ---------------------------------------------------------------------------
# The registry
# ---------------------------------------------------------------------------
# The registry is created on first use (``registry()``, or the module attributes
# ``ureg`` and ``Q_``), so ``import workbench`` does not pay for importing pint
# and parsing its definitions file. It is still one instance for the process.
@functools.lru_cache(maxsize=1)
def registry() -> pint.UnitRegistry:
    """The project's single pint unit registry, created on the first call.

    ``on_redefinition="ignore"`` lets the definitions below replace pint's ISO
    Btu; no other module defines units, so nothing else can be redefined by
    accident. The registry is also made pint's application registry.

    Returns
    -------
    pint.UnitRegistry
        The same object on every call; ``units.ureg`` and ``units.Q_`` (the
        registry's ``Quantity``) resolve to it.

    Examples
    --------
    >>> registry() is registry()
    True
    >>> registry().Quantity(1, "Btu").m_as("J")
    1055.05585262
    """
    import pint

    ureg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True, on_redefinition="ignore")
    ureg.define("british_thermal_unit = international_british_thermal_unit = Btu = BTU")
    ureg.define("iso_british_thermal_unit = 1055.056 * joule = Btu_iso")
    ureg.define("currency = [currency]")
    pint.set_application_registry(ureg)
    return ureg


def __getattr__(name: str) -> Any:
    """``ureg`` and ``Q_``: the registry and its ``Quantity``, created on first use (PEP 562)."""
    if name == "ureg":
        return registry()
    if name == "Q_":
        return registry().Quantity
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


SYSTEMS: tuple[str, ...] = ("SI", "US")
"""Display systems: ``"SI"`` and ``"US"`` (US customary)."""

CURRENCIES: tuple[str, ...] = (
    "EUR",
    "USD",
    "GBP",
    "CHF",
    "JPY",
    "CNY",
    "CAD",
    "AUD",
    "SEK",
    "NOK",
    "DKK",
    "PLN",
    "INR",
)
"""ISO 4217 codes accepted in cost inputs (``€`` and ``£`` are read as EUR and GBP)."""

_CURRENCY_PLACEHOLDER = "¤"


class UnitError(ValueError):
    """A text or unit input that cannot be read as the expected kind of quantity.

    The message names the field and the expected dimension with an example,
    e.g. ``thickness: "25 kg" has the wrong dimension; expected a length such
    as "25 mm" or "1 in"``.
    """


# ---------------------------------------------------------------------------
# Kinds
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class Kind:
    """One kind of quantity at the boundary.

    Attributes
    ----------
    name : str
        Identifier, e.g. ``"conductivity"``.
    si_unit : str
        Pint unit of the SI magnitude the core uses.
    display : Mapping[str, tuple[str, str]]
        Per system, the pint unit and the readable label shown on axes and
        in tables.
    noun : str
        Phrase for error messages, e.g. ``"a thermal conductivity"``.
    examples : tuple[str, str]
        An SI and a US-customary input example.
    title : str
        Default axis title, e.g. ``"Thermal conductivity"``.
    domain : str
        Physical domain of an input of this kind, enforced by :func:`parse`:
        ``"positive"`` (> 0 in SI), ``"nonnegative"`` (>= 0 in SI) or ``"any"``
        (signed, e.g. a temperature difference). An absolute temperature is
        ``"positive"``: above 0 K.
    """

    name: str
    si_unit: str
    display: Mapping[str, tuple[str, str]]
    noun: str
    examples: tuple[str, str]
    title: str
    domain: str = "any"

    @property
    def dimensionality(self) -> pint.util.UnitsContainer:
        """Pint dimensionality of the kind, e.g. ``[length]``."""
        return registry().get_dimensionality(self.si_unit)

    @property
    def is_cost(self) -> bool:
        """True for the cost kinds (which carry a currency label)."""
        return self.name.startswith("cost_per_")


def _kind(
    name: str,
    si_unit: str,
    si_display: tuple[str, str],
    us_display: tuple[str, str],
    noun: str,
    examples: tuple[str, str],
    title: str,
) -> Kind:
    return Kind(
        name=name,
        si_unit=si_unit,
        display=MappingProxyType({"SI": si_display, "US": us_display}),
        noun=noun,
        examples=examples,
        title=title,
        domain=_DOMAINS.get(name, "any"),
    )


# Physical domain of each kind (see Kind.domain); kinds not named here are signed ("any").
# A heat flux, a power, an energy and a temperature difference carry a sign (direction);
# the studies bound them where a sign is meaningless (a heat budget must be > 0).
_DOMAINS = {
    "length": "positive",
    "thickness": "positive",
    "temperature": "positive",
    "conductivity": "positive",
    "resistance": "nonnegative",
    "u_value": "positive",
    "heat_transfer_coefficient": "positive",
    "area": "positive",
    "volume": "positive",
    "mass": "nonnegative",
    "density": "positive",
    "specific_heat": "positive",
    "latent_heat": "positive",
    "mass_per_area": "nonnegative",
    "velocity": "nonnegative",
    "time": "nonnegative",
    "volume_per_mass": "positive",
    "heat_capacity": "nonnegative",
    "conductance": "nonnegative",
    "cost_per_mass": "nonnegative",
    "cost_per_volume": "nonnegative",
    "cost_per_area": "nonnegative",
}

EMISSIVITY: tuple[float, float] = (0.0, 1.0)
"""Bounds of an emissivity [-] (inclusive), for the ``bounds`` argument of :func:`parse`."""

FRACTION: tuple[float, float] = (0.0, 1.0)
"""Bounds of a share or fraction [-] (inclusive), for the ``bounds`` argument of :func:`parse`."""


_DF = "delta_degF"
_KIND_LIST = [
    _kind("length", "m", ("mm", "mm"), ("in", "in"), "a length", ("250 mm", "10 in"), "Length"),
    _kind("thickness", "m", ("mm", "mm"), ("in", "in"), "a length", ("25 mm", "1 in"), "Thickness"),
    _kind(
        "temperature",
        "K",
        ("degC", "°C"),
        ("degF", "°F"),
        "an absolute temperature",
        ("20 °C", "68 °F"),
        "Temperature",
    ),
    _kind(
        "temperature_difference",
        "K",
        ("K", "K"),
        (_DF, "°F"),
        "a temperature difference",
        ("10 K", "18 °F"),
        "ΔT",
    ),
    _kind(
        "conductivity",
        "W/(m*K)",
        ("W/(m*K)", "W/(m·K)"),
        (f"Btu*in/(h*ft^2*{_DF})", "Btu·in/(h·ft²·°F)"),
        "a thermal conductivity",
        ("0.035 W/(m·K)", "0.24 Btu·in/(h·ft²·°F)"),
        "Thermal conductivity",
    ),
    _kind(
        "resistance",
        "m^2*K/W",
        ("m^2*K/W", "m²·K/W"),
        (f"h*ft^2*{_DF}/Btu", "h·ft²·°F/Btu"),
        "a thermal resistance (R-value)",
        ("2.5 m²·K/W", "14 h·ft²·°F/Btu"),
        "Thermal resistance",
    ),
    _kind(
        "u_value",
        "W/(m^2*K)",
        ("W/(m^2*K)", "W/(m²·K)"),
        (f"Btu/(h*ft^2*{_DF})", "Btu/(h·ft²·°F)"),
        "a U-value (thermal transmittance)",
        ("0.4 W/(m²·K)", "0.07 Btu/(h·ft²·°F)"),
        "U-value",
    ),
    _kind(
        "heat_transfer_coefficient",
        "W/(m^2*K)",
        ("W/(m^2*K)", "W/(m²·K)"),
        (f"Btu/(h*ft^2*{_DF})", "Btu/(h·ft²·°F)"),
        "a heat transfer coefficient",
        ("8 W/(m²·K)", "1.4 Btu/(h·ft²·°F)"),
        "Heat transfer coefficient",
    ),
    _kind(
        "heat_flux",
        "W/m^2",
        ("W/m^2", "W/m²"),
        ("Btu/(h*ft^2)", "Btu/(h·ft²)"),
        "a heat flux",
        ("20 W/m²", "6 Btu/(h·ft²)"),
        "Heat flux",
    ),
    _kind(
        "power",
        "W",
        ("W", "W"),
        ("Btu/h", "Btu/h"),
        "a power (heat flow)",
        ("15 W", "50 Btu/h"),
        "Heat flow",
    ),
    _kind("area", "m^2", ("m^2", "m²"), ("ft^2", "ft²"), "an area", ("1.2 m²", "13 ft²"), "Area"),
    _kind(
        "volume", "m^3", ("m^3", "m³"), ("ft^3", "ft³"), "a volume", ("0.03 m³", "1 ft³"), "Volume"
    ),
    _kind("mass", "kg", ("kg", "kg"), ("lb", "lb"), "a mass", ("2.5 kg", "5.5 lb"), "Mass"),
    _kind(
        "density",
        "kg/m^3",
        ("kg/m^3", "kg/m³"),
        ("lb/ft^3", "lb/ft³"),
        "a density",
        ("30 kg/m³", "1.9 lb/ft³"),
        "Density",
    ),
    _kind(
        "specific_heat",
        "J/(kg*K)",
        ("J/(kg*K)", "J/(kg·K)"),
        (f"Btu/(lb*{_DF})", "Btu/(lb·°F)"),
        "a specific heat capacity",
        ("1300 J/(kg·K)", "0.31 Btu/(lb·°F)"),
        "Specific heat",
    ),
    _kind(
        "latent_heat",
        "J/kg",
        ("kJ/kg", "kJ/kg"),
        ("Btu/lb", "Btu/lb"),
        "a specific latent heat",
        ("334 kJ/kg", "144 Btu/lb"),
        "Latent heat",
    ),
    _kind(
        "mass_per_area",
        "kg/m^2",
        ("kg/m^2", "kg/m²"),
        ("lb/ft^2", "lb/ft²"),
        "a mass per area",
        ("4 kg/m²", "0.8 lb/ft²"),
        "Mass per area",
    ),
    _kind(
        "velocity",
        "m/s",
        ("m/s", "m/s"),
        ("ft/min", "ft/min"),
        "a velocity",
        ("2 m/s", "400 ft/min"),
        "Air speed",
    ),
    _kind("time", "s", ("h", "h"), ("h", "h"), "a duration", ("48 h", "2 day"), "Time"),
    _kind(
        "energy", "J", ("kJ", "kJ"), ("Btu", "Btu"), "an energy", ("500 kJ", "470 Btu"), "Energy"
    ),
    _kind(
        "volume_per_mass",
        "m^3/kg",
        ("cm^3/kg", "cm³/kg"),
        ("in^3/lb", "in³/lb"),
        "a volume per mass (dimensional-weight divisor)",
        ("5000 cm³/kg", "139 in³/lb"),
        "Dimensional-weight divisor",
    ),
    _kind(
        "heat_capacity",
        "J/K",
        ("J/K", "J/K"),
        (f"Btu/{_DF}", "Btu/°F"),
        "a heat capacity",
        ("4200 J/K", "2 Btu/°F"),
        "Heat capacity",
    ),
    _kind(
        "conductance",
        "W/K",
        ("W/K", "W/K"),
        (f"Btu/(h*{_DF})", "Btu/(h·°F)"),
        "a thermal conductance",
        ("0.5 W/K", "1 Btu/(h·°F)"),
        "Thermal conductance",
    ),
    _kind(
        "dimensionless",
        "",
        ("", ""),
        ("", ""),
        "a dimensionless number",
        ("0.9", "90 %"),
        "Value",
    ),
    _kind(
        "cost_per_mass",
        "currency/kg",
        ("currency/kg", "¤/kg"),
        ("currency/lb", "¤/lb"),
        "a cost per mass",
        ("2.5 EUR/kg", "1.1 USD/lb"),
        "Cost per mass",
    ),
    _kind(
        "cost_per_volume",
        "currency/m^3",
        ("currency/m^3", "¤/m³"),
        ("currency/ft^3", "¤/ft³"),
        "a cost per volume",
        ("120 EUR/m³", "3.4 USD/ft³"),
        "Cost per volume",
    ),
    _kind(
        "cost_per_area",
        "currency/m^2",
        ("currency/m^2", "¤/m²"),
        ("currency/ft^2", "¤/ft²"),
        "a cost per area",
        ("15 EUR/m²", "1.4 USD/ft²"),
        "Cost per area",
    ),
]

KINDS: Mapping[str, Kind] = MappingProxyType({k.name: k for k in _KIND_LIST})
"""All quantity kinds, by name."""


def check_system(system: str) -> str:
    """Return ``system`` if it is a known display system, else raise ``ValueError``.

    Parameters
    ----------
    system : str
        ``"SI"`` or ``"US"`` (exact spelling).

    Returns
    -------
    str
        The same name.

    Examples
    --------
    >>> check_system("US")
    'US'
    >>> check_system("imperial")
    Traceback (most recent call last):
    ...
    ValueError: unknown unit system 'imperial'; valid systems: 'SI', 'US'
    """
    if not isinstance(system, str) or system not in SYSTEMS:
        valid = ", ".join(repr(s) for s in SYSTEMS)
        raise ValueError(f"unknown unit system {system!r}; valid systems: {valid}")
    return system


def check_kind(kind: str) -> Kind:
    """Return the :class:`Kind` named ``kind``, or raise ``ValueError`` listing valid names.

    Parameters
    ----------
    kind : str
        A key of :data:`KINDS`, e.g. ``"thickness"`` (exact spelling; no fuzzy match).

    Returns
    -------
    Kind
        Its SI unit, display units, dimensionality and examples.

    Examples
    --------
    >>> check_kind("thickness").si_unit
    'm'
    >>> check_kind("thicknes")
    Traceback (most recent call last):
    ...
    ValueError: unknown quantity kind 'thicknes'; valid kinds: 'length', ...
    """
    try:
        return KINDS[kind]
    except (KeyError, TypeError):
        valid = ", ".join(repr(k) for k in KINDS)
        raise ValueError(f"unknown quantity kind {kind!r}; valid kinds: {valid}") from None


def _expected(kind: Kind) -> str:
    si, us = kind.examples
    return f'expected {kind.noun} such as "{si}" or "{us}"'


# ---------------------------------------------------------------------------
# Text normalisation
# ---------------------------------------------------------------------------
_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")
_SUPERSCRIPT_RUN = re.compile("[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+")
_SIMPLE_REPLACEMENTS = (
    ("\u00a0", " "),  # no-break space
    ("\u202f", " "),  # narrow no-break space
    ("\u2212", "-"),  # minus sign
    ("·", "*"),
    ("⋅", "*"),
    ("•", "*"),
    ("×", "*"),
    ("℃", "°C"),
    ("℉", "°F"),
    ("º", "°"),  # masculine ordinal, often typed for a degree sign
    ("μ", "u"),  # Greek mu
    ("µ", "u"),  # micro sign
    ("**", "^"),
    ("%", " percent "),
)
_DEGREE = re.compile(r"°\s*([CFKR])\b")
_DEGREE_NAMES = {"C": "degC", "F": "degF", "K": "K", "R": "degR"}
_ABSOLUTE_TEMPERATURE = re.compile(
    r"(?<![A-Za-z0-9_])(degC|degF|celsius|fahrenheit|degree_Celsius|degree_Fahrenheit"
    r"|degrees_Celsius|degrees_Fahrenheit)(?![A-Za-z0-9_])"
)
_CURRENCY_CODE = re.compile(
    r"(?<![A-Za-z0-9_])(" + "|".join(CURRENCIES) + r")(?![A-Za-z0-9_])", re.IGNORECASE
)
_CURRENCY_SYMBOLS = {"€": "EUR", "£": "GBP"}
_NUMBER = re.compile(
    r"^\s*([+-]?(?:(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?|(?:nan|inf(?:inity)?)(?![A-Za-z])))",
    re.IGNORECASE,
)
_POWER_DIGIT = re.compile(r"(?<=[A-Za-z])([23])(?![\d.^])")
_POWER_THEN_NAME = re.compile(r"(\^-?\d+)(?=[A-Za-z])")
_SLASH_RUN = re.compile(r"/([A-Za-z]+\^-?\d+(?:\*[A-Za-z]+(?:\^-?\d+)?)+)$")


def _clean(text: str) -> str:
    """Unicode to ASCII unit syntax (``·`` ``²`` ``°C`` ...), whitespace trimmed."""
    for old, new in _SIMPLE_REPLACEMENTS:
        text = text.replace(old, new)
    text = _SUPERSCRIPT_RUN.sub(lambda m: "^" + m.group(0).translate(_SUPERSCRIPTS), text)
    return text.strip()


def _temperature_units(unit: str, kind: Kind, field: str, original: str) -> str:
    """Degree signs to pint names; degrees become differences except for ``temperature``."""
    unit = _DEGREE.sub(lambda m: _DEGREE_NAMES[m.group(1)], unit)
    if kind.name == "temperature":
        if "delta_" in unit:
            raise UnitError(f'{field}: "{original}" is a temperature difference; {_expected(kind)}')
        return unit

    def to_delta(m: re.Match) -> str:
        word = m.group(1).lower()
        return "delta_degF" if word.endswith(("f", "fahrenheit")) else "delta_degC"

    return _ABSOLUTE_TEMPERATURE.sub(to_delta, unit)


def _currency_units(unit: str, field: str, original: str, kind: Kind) -> tuple[str, str | None]:
    """Replace currency codes/symbols by the ``currency`` unit; return the code found."""
    if "$" in unit:
        raise UnitError(
            f'{field}: "$" in "{original}" is ambiguous; write a currency code such as '
            f"USD, CAD or AUD ({_expected(kind)})"
        )
    for symbol, code in _CURRENCY_SYMBOLS.items():
        unit = unit.replace(symbol, f" {code} ")
    codes = {m.group(1).upper() for m in _CURRENCY_CODE.finditer(unit)}
    if len(codes) > 1:
        raise UnitError(
            f'{field}: "{original}" mixes currencies {sorted(codes)}; costs are not converted '
            f"between currencies"
        )
    unit = _CURRENCY_CODE.sub("currency", unit)
    unit = re.sub(r"\s+", " ", unit).strip()
    return unit, (codes.pop() if codes else None)


def _hint(unit: str, kind: Kind) -> str:
    if kind.name in ("temperature", "temperature_difference") and unit in ("C", "F"):
        return f' ("{unit}" is a unit of charge or capacitance; write "°{unit}" or "deg{unit}")'
    if re.search(r"/\s*mK\b", unit):
        return ' ("mK" is a millikelvin; write "W/(m·K)" or "W/m/K")'
    return ""


def _convert(values, unit: str, target: str):
    """Magnitudes in pint ``unit`` expressed in pint ``target`` (offsets handled by pint)."""
    return registry().Quantity(values, unit).m_as(target)


def _parse_unit(
    unit_text: str,
    kind: Kind,
    field: str,
    original: str,
    currency: str | None,
    require_currency: bool = True,
) -> tuple[str, str | None]:
    """Normalise and check a unit string for ``kind``; return ``(pint_unit, currency)``."""
    unit = _temperature_units(_clean(unit_text), kind, field, original)
    unit, code = _currency_units(unit, field, original, kind)
    if currency is not None:
        currency = _check_currency(currency)
    if kind.is_cost:
        if code is None and currency is None and require_currency:
            raise UnitError(f'{field}: "{original}" has no currency code; {_expected(kind)}')
        if code is not None and currency is not None and code != currency:
            raise UnitError(
                f'{field}: "{original}" is in {code} but {currency} is expected; costs are '
                f"not converted between currencies"
            )
        if code is None:  # "/kg" with the expected currency implied
            unit = "currency" + unit if unit.startswith("/") else f"currency*({unit})"
        code = code or currency
    parsed = False
    for candidate in _candidates(unit):
        try:
            dims = registry().get_dimensionality(candidate)
        except Exception:  # pint raises many types (UndefinedUnitError, TokenError, ...)
            continue
        parsed = True
        if dims == kind.dimensionality:
            return candidate, code
    if not parsed:
        raise UnitError(
            f'{field}: unknown unit "{unit_text.strip()}" in "{original}"; {_expected(kind)}'
        )
    raise UnitError(
        f'{field}: "{original}" has the wrong dimension{_hint(unit, kind)}; {_expected(kind)}'
    )


def _candidates(unit: str) -> list[str]:
    """``unit`` and, if different, readings of the engineering shorthand ``kg/m3``, ``W/m2K``."""
    powered = _POWER_DIGIT.sub(r"^\1", unit)  # "kg/m3" -> "kg/m^3", "m2K" -> "m^2K"
    powered = _POWER_THEN_NAME.sub(r"\1*", powered)  # "m^2K" -> "m^2*K"
    grouped = _SLASH_RUN.sub(r"/(\1)", powered)  # "W/m^2*K" -> "W/(m^2*K)"
    return list(dict.fromkeys([unit, powered, grouped]))


def _check_currency(currency: str) -> str:
    if currency not in CURRENCIES:
        raise ValueError(f"unknown currency {currency!r}; valid codes: {', '.join(CURRENCIES)}")
    return currency


# ---------------------------------------------------------------------------
# Input
# ---------------------------------------------------------------------------
def parse_cost(
    text: str | float,
    kind: str,
    field: str,
    default_unit: str | None = None,
    currency: str | None = None,
) -> tuple[float, str]:
    """Read a cost with its currency code, e.g. ``"2.5 EUR/kg"``.

    Parameters
    ----------
    text : str or float
        Number and unit, e.g. ``"2.5 EUR/kg"``, ``"120 €/m³"``, ``"1.1 USD/lb"``.
    kind : str
        ``"cost_per_mass"``, ``"cost_per_volume"`` or ``"cost_per_area"``.
    field : str
        Name of the input, used in error messages.
    default_unit : str, optional
        Unit for a bare number, e.g. ``"EUR/kg"``.
    currency : str, optional
        Expected currency code; a different code in ``text`` raises
        :class:`UnitError`, and a unit without a code takes this one.

    Returns
    -------
    value : float
        Cost per SI unit [currency/kg], [currency/m³] or [currency/m²].
    currency : str
        The ISO 4217 code, e.g. ``"EUR"``.

    Notes
    -----
    Only the mass, volume or area part is converted (e.g. per lb to per kg);
    currencies are labels, never converted.

    References
    ----------
    [NIST811]_ Appendix B.8 for the lb and ft factors.

    Examples
    --------
    >>> parse_cost("1 USD/lb", "cost_per_mass", "cost")
    (2.2046..., 'USD')
    >>> parse_cost("120 €/m³", "cost_per_volume", "cost", currency="EUR")
    (120.0, 'EUR')
    """
    k = check_kind(kind)
    if not k.is_cost:
        raise ValueError(f"parse_cost needs a cost kind, got {kind!r}")
    value, code = _parse(text, k, field, default_unit, currency)
    assert code is not None  # guaranteed for cost kinds by _parse_unit
    return value, code


def parse(
    text: str | float,
    kind: str,
    field: str,
    default_unit: str | None = None,
    *,
    currency: str | None = None,
    bounds: tuple[float | None, float | None] | None = None,
) -> float:
    """Read a number with a unit and return its SI magnitude.

    Parameters
    ----------
    text : str or float
        Number followed by a unit, e.g. ``"25 mm"``, ``"1in"``, ``"77 °F"``,
        ``"0.035 W/(m·K)"``, ``"0.24 Btu*in/(h*ft^2*degF)"``. Unicode ``·``,
        ``²``, ``³``, ``°`` and ``µ`` are accepted, as are ``kg/m3`` style powers.
        A bare number (or a Python number) takes ``default_unit``.
    kind : str
        Quantity kind, a key of :data:`KINDS`.
    field : str
        Name of the input, used in error messages.
    default_unit : str, optional
        Unit of a bare number; without it a bare number raises (except for
        ``"dimensionless"``).
    currency : str, optional
        For cost kinds: the expected currency code (see :func:`parse_cost`).
    bounds : (low, high), optional
        Inclusive bounds in SI on top of the kind's domain (``None`` for an
        open side), e.g. :data:`EMISSIVITY` ``(0, 1)`` for an emissivity.

    Returns
    -------
    float
        Magnitude in the kind's SI unit [m, K, W/(m·K), ...].

    Raises
    ------
    UnitError
        Empty or non-numeric text, NaN or infinity, unknown unit, wrong
        dimension, missing unit, a value outside the kind's physical domain
        (:attr:`Kind.domain`: a thickness, length, area or volume must be
        > 0, a mass, a time or a surface resistance >= 0, an absolute
        temperature above 0 K) or outside ``bounds``, or a temperature
        difference given for an absolute temperature. The message names
        ``field``, the domain and gives an example of the expected input.

    Notes
    -----
    Linear units: :math:`x_{SI} = a\\,x`. Absolute temperatures are affine,
    :math:`T/\\mathrm{K} = t/{}^\\circ\\mathrm{C} + 273.15` and
    :math:`T/\\mathrm{K} = (t/{}^\\circ\\mathrm{F} + 459.67)\\cdot 5/9`; for a
    temperature difference (and inside compound units) a degree is a
    difference, :math:`1\\,{}^\\circ\\mathrm{F} = 5/9\\,\\mathrm{K}`.

    References
    ----------
    [NIST811]_ Appendix B.8 (factors), B.9 (temperature).

    Examples
    --------
    >>> parse("25 mm", "thickness", "thickness")
    0.025
    >>> parse("77 °F", "temperature", "t_outside")
    298.15
    >>> parse("9 °F", "temperature_difference", "delta_t")
    5.0
    >>> parse("0.24 Btu·in/(h·ft²·°F)", "conductivity", "k")
    0.0346...
    >>> parse("25", "thickness", "thickness", default_unit="mm")
    0.025
    >>> parse("25 kg", "thickness", "thickness")
    Traceback (most recent call last):
    ...
    workbench.units.UnitError: thickness: "25 kg" has the wrong dimension; expected a length such as "25 mm" or "1 in"
    >>> parse("-5 mm", "thickness", "thickness")
    Traceback (most recent call last):
    ...
    workbench.units.UnitError: thickness: "-5 mm" is -0.005 m; a thickness must be > 0 m; expected a length such as "25 mm" or "1 in"
    >>> parse("1.2", "dimensionless", "emissivity", bounds=EMISSIVITY)
    Traceback (most recent call last):
    ...
    workbench.units.UnitError: emissivity: "1.2" is outside [0, 1] [-]
    """
    k = check_kind(kind)
    value = _parse(text, k, field, default_unit, currency)[0]
    _check_bounds(value, k, field, text, bounds)
    return value


def _check_bounds(value: float, kind: Kind, field: str, text, bounds) -> None:
    if bounds is None:
        return
    low, high = bounds
    if (low is not None and value < low) or (high is not None and value > high):
        unit = kind.si_unit or "-"
        lo = "-inf" if low is None else f"{low:g}"
        hi = "inf" if high is None else f"{high:g}"
        shown = text.strip() if isinstance(text, str) else repr(text)
        raise UnitError(f'{field}: "{shown}" is outside [{lo}, {hi}] [{unit}]')


def _parse(
    text: str | float,
    kind: Kind,
    field: str,
    default_unit: str | None,
    currency: str | None,
) -> tuple[float, str | None]:
    if isinstance(text, bool):
        raise UnitError(f"{field}: got {text!r}; {_expected(kind)}")
    if isinstance(text, (int, float, np.integer, np.floating)):
        number, unit_text, original = float(text), "", repr(text)
    elif isinstance(text, str):
        original = text.strip()
        if not original:
            raise UnitError(f"{field}: no value given; {_expected(kind)}")
        cleaned = _clean(original)
        match = _NUMBER.match(cleaned)
        if match is None:
            raise UnitError(
                f'{field}: "{original}" does not start with a number; {_expected(kind)}'
            )
        number = float(match.group(1))
        unit_text = cleaned[match.end() :].strip()
        if unit_text.startswith(","):
            raise UnitError(
                f'{field}: "{original}": write the decimal separator as "."; {_expected(kind)}'
            )
    else:
        raise UnitError(f"{field}: expected text such as a string, got {type(text).__name__}")
    if not math.isfinite(number):
        raise UnitError(f'{field}: "{original}" is not a finite number; {_expected(kind)}')
    if not unit_text:
        if default_unit is not None:
            unit_text = default_unit
        elif kind.name != "dimensionless":
            raise UnitError(f'{field}: "{original}" has no unit; {_expected(kind)}')
    unit, code = _parse_unit(unit_text, kind, field, original, currency)
    value = _convert(number, unit, kind.si_unit)
    _check_absolute(value, kind, field, original)
    _check_domain(float(value), kind, field, original)
    return float(value), code


_WHAT = {"temperature": "absolute temperature", "time": "time or duration"}


def _check_domain(value: float, kind: Kind, field: str, original: str) -> None:
    """Refuse a value outside the kind's physical domain (names field, value and SI unit)."""
    if kind.domain == "positive":
        bad, rule = value <= 0.0, "> 0"
    elif kind.domain == "nonnegative":
        bad, rule = value < 0.0, ">= 0"
    else:
        return
    if bad:
        unit = kind.si_unit.replace("^2", "²").replace("^3", "³").replace("*", "·")
        what = _WHAT.get(kind.name, kind.name.replace("_", " "))
        article = "an" if what[0] in "aeiou" else "a"
        raise UnitError(
            f'{field}: "{original}" is {value:g} {unit}; {article} {what} must be {rule} {unit}; '
            f"{_expected(kind)}"
        )


def _check_absolute(value_si, kind: Kind, field: str, original: str) -> None:
    if kind.name == "temperature" and np.any(np.asarray(value_si) < 0.0):
        raise UnitError(f"{field}: {original} is below absolute zero; {_expected(kind)}")


def to_si(
    magnitude,
    unit: str,
    kind: str,
    field: str,
    *,
    currency: str | None = None,
    allow_nan: bool = False,
):
    """Convert magnitudes in ``unit`` to the kind's SI unit (vectorised).

    Parameters
    ----------
    magnitude : float or array_like
        Values in ``unit`` (e.g. a column read from a file).
    unit : str
        Unit of ``magnitude``, same syntax as in :func:`parse`
        (``"mm"``, ``"°F"``, ``"Btu/(h·ft·°F)"``); ``""`` only for
        ``"dimensionless"``.
    kind : str
        Quantity kind, a key of :data:`KINDS`.
    field : str
        Name of the input, used in error messages.
    currency : str, optional
        For cost kinds: expected currency code.
    allow_nan : bool, default False
        Let NaN through (missing values in a table); infinity always raises.

    Returns
    -------
    float or numpy.ndarray
        Values in the kind's SI unit [m, K, W/(m·K), ...], a float for a scalar input.

    Notes
    -----
    :math:`x_{SI} = a\\,x + b`, with :math:`b \\ne 0` only for absolute
    temperatures in °C or °F.

    References
    ----------
    [NIST811]_ Appendix B.8, B.9.

    Examples
    --------
    >>> to_si([68.0, 77.0], "°F", "temperature", "t_outside")
    array([293.15, 298.15])
    >>> to_si(1.0, "Btu/(h·ft·°F)", "conductivity", "k")
    1.7307...
    """
    k = check_kind(kind)
    original = f"{unit}"
    if not isinstance(unit, str):
        raise UnitError(f"{field}: unit must be text, got {type(unit).__name__}")
    if not unit.strip() and k.name != "dimensionless":
        raise UnitError(f"{field}: no unit given; {_expected(k)}")
    try:
        values = np.asarray(magnitude, dtype=float)
    except (TypeError, ValueError):
        raise UnitError(f"{field}: expected numbers, got {magnitude!r}") from None
    bad = np.isinf(values) if allow_nan else ~np.isfinite(values)
    if np.any(bad):
        raise UnitError(f"{field}: values must be finite (got NaN or infinity); {_expected(k)}")
    pint_unit, _ = _parse_unit(unit, k, field, original, currency)
    result = _convert(values, pint_unit, k.si_unit)
    _check_absolute(np.nan_to_num(result, nan=1.0), k, field, "a value")
    return scalar_or_array(result)


# ---------------------------------------------------------------------------
# Output
# ---------------------------------------------------------------------------
def from_si(value_si, kind: str, system: str = "SI", unit: str | None = None):
    """Convert SI magnitudes to the display unit of ``system`` (or to ``unit``).

    Parameters
    ----------
    value_si : float or array_like
        Values in the kind's SI unit [m, K, W/(m·K), ...].
    kind : str
        Quantity kind, a key of :data:`KINDS`.
    system : {"SI", "US"}
        Display system; its unit is :func:`display_unit` ``(kind, system)``.
    unit : str, optional
        Any unit of the right dimension instead, e.g. ``"cm"``.

    Returns
    -------
    float or numpy.ndarray
        Display magnitudes [display unit].

    Notes
    -----
    Inverse of :func:`to_si`: :math:`x = (x_{SI} - b)/a`.

    References
    ----------
    [NIST811]_ Appendix B.8, B.9.

    Examples
    --------
    >>> from_si(0.025, "thickness")
    25.0
    >>> from_si(298.15, "temperature", "US")
    77.0
    >>> from_si(5.0, "temperature_difference", "US")
    9.0
    >>> from_si(0.0346, "conductivity", "US")
    0.2399...
    """
    k = check_kind(kind)
    check_system(system)
    if unit is None:
        pint_unit = k.display[system][0]
    else:
        pint_unit, _ = _parse_unit(unit, k, "unit", unit, None, require_currency=False)
    values = np.asarray(value_si, dtype=float)
    return scalar_or_array(_convert(values, k.si_unit, pint_unit))


def display_unit(kind: str, system: str = "SI", currency: str | None = None) -> str:
    """Short readable unit label for axes and table headers.

    Parameters
    ----------
    kind : str
        Quantity kind, a key of :data:`KINDS`.
    system : {"SI", "US"}
        Display system.
    currency : str, optional
        Currency code shown for cost kinds (``"¤"`` when not given).

    Returns
    -------
    str
        E.g. ``"W/(m·K)"``, ``"Btu·in/(h·ft²·°F)"``, ``"mm"``, ``"°C"``;
        ``""`` for ``"dimensionless"``. The label parses back with
        :func:`to_si` for the same kind.

    Examples
    --------
    >>> display_unit("conductivity", "US")
    'Btu·in/(h·ft²·°F)'
    >>> display_unit("thickness")
    'mm'
    >>> display_unit("cost_per_mass", "SI", currency="EUR")
    'EUR/kg'
    """
    k = check_kind(kind)
    check_system(system)
    label = k.display[system][1]
    if k.is_cost:
        code = _check_currency(currency) if currency is not None else _CURRENCY_PLACEHOLDER
        label = label.replace(_CURRENCY_PLACEHOLDER, code)
    return label


def axis_label(
    kind: str, system: str = "SI", name: str | None = None, currency: str | None = None
) -> str:
    """Axis or column title with the unit in brackets, e.g. ``"ΔT [°F]"``.

    Parameters
    ----------
    kind : str
        Quantity kind, a key of :data:`KINDS`.
    system : {"SI", "US"}
        Display system.
    name : str, optional
        Quantity name; defaults to the kind's title (``"ΔT"`` for a
        temperature difference, so a difference in °F is never mistaken
        for a temperature).
    currency : str, optional
        Currency code for cost kinds.

    Returns
    -------
    str
        ``"<name> [<unit>]"``; ``[–]`` for dimensionless quantities.

    Examples
    --------
    >>> axis_label("temperature_difference", "US")
    'ΔT [°F]'
    >>> axis_label("conductivity", "SI", name="k")
    'k [W/(m·K)]'
    """
    k = check_kind(kind)
    unit = display_unit(kind, system, currency) or "–"
    return f"{name or k.title} [{unit}]"


def format_quantity(
    value_si: float,
    kind: str,
    system: str = "SI",
    sig: int = 3,
    currency: str | None = None,
) -> str:
    """Format one SI value in the display unit of ``system``, e.g. ``"25 mm"``.

    Parameters
    ----------
    value_si : float
        Value in the kind's SI unit [m, K, W/(m·K), ...].
    kind : str
        Quantity kind, a key of :data:`KINDS`.
    system : {"SI", "US"}
        Display system.
    sig : int, default 3
        Significant figures (at least 1).
    currency : str, optional
        Currency code for cost kinds.

    Returns
    -------
    str
        Number and unit. Rounded to ``sig`` significant figures with trailing
        zeros dropped, in positional notation for 1e-4 <= |x| < 1e6 and in
        exponent notation outside; absolute temperatures always with one
        decimal (``"20.0 °C"``). NaN gives ``"n/a"``.

    Notes
    -----
    Display rounding only; keep SI values for calculation.

    Examples
    --------
    >>> format_quantity(0.025, "thickness")
    '25 mm'
    >>> format_quantity(0.035, "conductivity")
    '0.035 W/(m·K)'
    >>> format_quantity(293.15, "temperature")
    '20.0 °C'
    >>> format_quantity(0.035, "conductivity", "US")
    '0.243 Btu·in/(h·ft²·°F)'
    """
    k = check_kind(kind)
    if not isinstance(sig, (int, np.integer)) or sig < 1:
        raise ValueError(f"sig: must be an integer >= 1, got {sig!r}")
    label = display_unit(kind, system, currency)
    value = float(from_si(float(value_si), kind, system))
    if math.isnan(value):
        number = "n/a"
    elif math.isinf(value):
        number = "∞" if value > 0 else "-∞"
    elif k.name == "temperature":
        number = f"{value:.1f}"
    else:
        number = _round_sig(value, int(sig))
    if number in ("-0", "-0.0"):
        number = number[1:]
    return f"{number} {label}" if label else number


def _round_sig(value: float, sig: int) -> str:
    if value == 0.0:
        return "0"
    rounded = float(f"{value:.{sig - 1}e}")
    exponent = math.floor(math.log10(abs(rounded)))
    if -4 <= exponent < 6:
        decimals = max(sig - 1 - exponent, 0)
        text = f"{rounded:.{decimals}f}"
        if "." in text:
            text = text.rstrip("0").rstrip(".")
        return text
    mantissa, exp = f"{rounded:.{sig - 1}e}".split("e")
    if "." in mantissa:
        mantissa = mantissa.rstrip("0").rstrip(".")
    return f"{mantissa}e{int(exp)}"
