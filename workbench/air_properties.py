"""Thermophysical properties of dry air at (near) atmospheric pressure.

Closed-form fits used by the convection and air-layer correlations
(:mod:`workbench.surfaces`, :mod:`workbench.air_layers`). Pure numeric core:
temperatures in K, results in SI, numpy broadcasting.

Sources of the fits
-------------------
- viscosity: Sutherland's law with the constants of the U.S. Standard
  Atmosphere 1976 (beta_s = 1.458e-6 kg/(m·s·K^0.5), S = 110.4 K) — from memory
  of that document;
- conductivity: the U.S. Standard Atmosphere 1976 expression
  k = 2.64638e-3 T^1.5 / (T + 245.4·10^(-12/T)) — from memory of that document;
- specific heat: a cubic fit (this module) to the 1 atm values of Incropera
  7th ed., Table A.4, 150–500 K (1.012, 1.007, 1.006, 1.007, 1.009, 1.014,
  1.021, 1.030 kJ/(kg·K)) — the table values are from memory;
- density: ideal gas with the molar mass of dry air M = 28.9644 g/mol
  (U.S. Standard Atmosphere 1976) and the CODATA gas constant;
- expansion coefficient: ideal gas, beta = 1/T.

The test suite checks each fit against CoolProp (``PropsSI(..., 'Air')``) over
150–500 K: density within 0.7 %, specific heat within 0.3 %, viscosity within
1.5 %, conductivity within 3.5 % (the largest gap is at 150 K), Prandtl
number within 3.5 %.

Domain: outside 150–500 K a :class:`~workbench._checks.ValidityWarning` is
issued (extrapolation); outside :data:`AIR_TEMPERATURE_LIMITS` (85–1000 K) a
``ValueError``: below about 82 K air condenses at 1 atm (CoolProp's dew point
of air is 81.7 K), and above 1000 K the specific-heat cubic departs from the
tabulated values (5.6 % high at 1000 K against CoolProp, growing fast beyond).
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np

from workbench._checks import (
    ValidityWarning,
    absolute_temperature,
    broadcast_shape,
    finite_result,
    positive,
    scalar_or_array,
)
from workbench.conduction import ArrayLike

__all__ = [
    "AIR_TEMPERATURE_RANGE",
    "AIR_TEMPERATURE_LIMITS",
    "AIR_MOLAR_MASS",
    "AirProperties",
    "air_properties",
    "air_conductivity",
    "air_viscosity",
    "air_specific_heat",
    "air_density",
]

#: Temperature range over which the fits are stated and tested. [K]
AIR_TEMPERATURE_RANGE: tuple[float, float] = (150.0, 500.0)

#: Hard limits of the fits: a ``ValueError`` outside (see the module notes). [K]
AIR_TEMPERATURE_LIMITS: tuple[float, float] = (85.0, 1000.0)

#: Molar mass of dry air (U.S. Standard Atmosphere 1976). [kg/mol]
AIR_MOLAR_MASS: float = 28.9644e-3

#: Molar gas constant R = N_A·k. [J/(mol·K)]
#: CODATA 2018 recommended values (``codata-2018``): 8.314 462 618... , exact in
#: the 2019 SI (N_A = 6.022 140 76 × 10²³ /mol and k = 1.380 649 × 10⁻²³ J/K
#: exactly); here to double precision. Written out so that importing the core
#: does not import scipy; tests/test_import_light.py checks it against scipy.
MOLAR_GAS_CONSTANT: float = 8.31446261815324

#: Standard atmosphere. [Pa]
#: 101 325 Pa exactly, by definition (10th CGPM, 1954, from memory); CODATA 2018 lists it.
STANDARD_ATMOSPHERE: float = 101325.0

_STANDARD_PRESSURE = STANDARD_ATMOSPHERE

# cubic fit of Incropera 7th ed. Table A.4 cp (from memory), x = (T - 300 K)/100 K
_CP_COEFFS = (-0.121212121, 4.42424242, 3.37662338, 1006.44372)


def _temperature(t, name: str = "t") -> np.ndarray:
    tt = absolute_temperature(name, t)
    lo_hard, hi_hard = AIR_TEMPERATURE_LIMITS
    if np.any(tt < lo_hard) or np.any(tt > hi_hard):
        raise ValueError(
            f"{name}: the dry-air property fits hold for {lo_hard:g}–{hi_hard:g} K "
            f"(got {tt.min():.4g}–{tt.max():.4g} K); below, air condenses at 1 atm, above, "
            "the fits depart from the tables"
        )
    lo, hi = AIR_TEMPERATURE_RANGE
    if np.any(tt < lo) or np.any(tt > hi):
        warnings.warn(
            f"air properties: {name} {tt.min():.1f}–{tt.max():.1f} K lies outside the "
            f"fitted range {lo:g}–{hi:g} K; values are extrapolated",
            ValidityWarning,
            stacklevel=3,
        )
    return tt


def _k(t: np.ndarray) -> np.ndarray:
    return 2.64638e-3 * t**1.5 / (t + 245.4 * 10.0 ** (-12.0 / t))


def _mu(t: np.ndarray) -> np.ndarray:
    return 1.458e-6 * t**1.5 / (t + 110.4)


def _cp(t: np.ndarray) -> np.ndarray:
    return np.polyval(_CP_COEFFS, (t - 300.0) / 100.0)


def _rho(t: np.ndarray, p: np.ndarray) -> np.ndarray:
    return p * AIR_MOLAR_MASS / (MOLAR_GAS_CONSTANT * t)


def air_conductivity(t: ArrayLike) -> float | np.ndarray:
    """Thermal conductivity of dry air.

    Parameters
    ----------
    t : float or array
        Temperature, 150–500 K (a :class:`~workbench._checks.ValidityWarning`
        outside). [K]

    Returns
    -------
    float or array
        Thermal conductivity. [W/(m·K)]

    Notes
    -----
    .. math:: k = \\frac{2.64638\\times10^{-3}\\,T^{3/2}}{T + 245.4\\cdot 10^{-12/T}}

    Independent of pressure near 1 atm (kinetic theory).

    References
    ----------
    ``us-std-atm-1976``: U.S. Standard Atmosphere 1976, NOAA/NASA/USAF,
    thermal conductivity expression (from memory).

    Examples
    --------
    >>> round(air_conductivity(300.0), 5)
    0.02625
    """
    return scalar_or_array(_k(_temperature(t)))


def air_viscosity(t: ArrayLike) -> float | np.ndarray:
    """Dynamic viscosity of dry air (Sutherland's law).

    Parameters
    ----------
    t : float or array
        Temperature, 150–500 K. [K]

    Returns
    -------
    float or array
        Dynamic viscosity. [Pa·s]

    Notes
    -----
    .. math:: \\mu = \\frac{\\beta_s T^{3/2}}{T + S}, \\quad
              \\beta_s = 1.458\\times10^{-6}\\ \\mathrm{kg/(m\\,s\\,K^{1/2})},\\ S = 110.4\\ \\mathrm{K}

    References
    ----------
    ``us-std-atm-1976``: U.S. Standard Atmosphere 1976, viscosity expression
    (from memory); Sutherland (1893).

    Examples
    --------
    >>> round(air_viscosity(300.0) * 1e5, 4)
    1.8459
    """
    return scalar_or_array(_mu(_temperature(t)))


def air_specific_heat(t: ArrayLike) -> float | np.ndarray:
    """Isobaric specific heat of dry air near 1 atm.

    Parameters
    ----------
    t : float or array
        Temperature, 150–500 K. [K]

    Returns
    -------
    float or array
        Specific heat at constant pressure. [J/(kg·K)]

    Notes
    -----
    Cubic fit, :math:`x = (T - 300\\,\\mathrm{K})/100\\,\\mathrm{K}`:

    .. math:: c_p = 1006.444 + 3.3766 x + 4.4242 x^2 - 0.1212 x^3

    References
    ----------
    ``incropera7``: Bergman, Lavine, Incropera, DeWitt, *Fundamentals of Heat
    and Mass Transfer*, 7th ed., Table A.4 (values from memory), fitted here.

    Examples
    --------
    >>> round(air_specific_heat(300.0), 1)
    1006.4
    """
    return scalar_or_array(_cp(_temperature(t)))


def air_density(t: ArrayLike, pressure: ArrayLike = _STANDARD_PRESSURE) -> float | np.ndarray:
    """Density of dry air as an ideal gas.

    Parameters
    ----------
    t : float or array
        Temperature, 150–500 K. [K]
    pressure : float or array
        Absolute pressure; default 1 atm. [Pa]

    Returns
    -------
    float or array
        Density. [kg/m³]

    Notes
    -----
    .. math:: \\rho = p M / (R T), \\quad M = 28.9644\\ \\mathrm{g/mol}

    References
    ----------
    ``us-std-atm-1976`` (molar mass); ``codata-2018`` (gas constant,
    :data:`MOLAR_GAS_CONSTANT`).

    Examples
    --------
    >>> round(air_density(300.0), 4)
    1.1766
    """
    tt = _temperature(t)
    p = positive("pressure", pressure, "Pa")
    broadcast_shape(t=tt, pressure=p)
    return finite_result("air_density", scalar_or_array(_rho(tt, p)), "t", "pressure")


@dataclass(frozen=True)
class AirProperties:
    """Dry-air properties at one or more temperatures (arrays broadcast).

    Attributes
    ----------
    temperature : array
        [K]
    density : array
        [kg/m³]
    specific_heat : array
        [J/(kg·K)]
    viscosity : array
        Dynamic viscosity. [Pa·s]
    conductivity : array
        [W/(m·K)]
    kinematic_viscosity : array
        ν = μ/ρ. [m²/s]
    diffusivity : array
        Thermal diffusivity α = k/(ρ c_p). [m²/s]
    prandtl : array
        Pr = c_p μ / k. [-]
    expansion_coefficient : array
        Volumetric thermal expansion β = 1/T (ideal gas). [1/K]
    """

    temperature: np.ndarray
    density: np.ndarray
    specific_heat: np.ndarray
    viscosity: np.ndarray
    conductivity: np.ndarray
    kinematic_viscosity: np.ndarray
    diffusivity: np.ndarray
    prandtl: np.ndarray
    expansion_coefficient: np.ndarray


def _props(tt: np.ndarray, p) -> AirProperties:
    """Properties without validation (callers have checked ``tt`` and ``p``)."""
    rho = _rho(tt, p)
    cp = _cp(tt)
    mu = _mu(tt)
    k = _k(tt)
    return AirProperties(
        temperature=tt,
        density=rho,
        specific_heat=cp,
        viscosity=mu,
        conductivity=k,
        kinematic_viscosity=mu / rho,
        diffusivity=k / (rho * cp),
        prandtl=cp * mu / k,
        expansion_coefficient=1.0 / tt,
    )


def air_properties(t: ArrayLike, pressure: ArrayLike = _STANDARD_PRESSURE) -> AirProperties:
    """All dry-air properties needed by convection correlations.

    Parameters
    ----------
    t : float or array
        Temperature (for convection: the film temperature), 150–500 K. [K]
    pressure : float or array
        Absolute pressure; default 1 atm. Only density, ν and α depend on it. [Pa]

    Returns
    -------
    AirProperties
        Frozen dataclass of arrays broadcast over ``t`` and ``pressure``.

    Notes
    -----
    .. math:: \\nu = \\mu/\\rho, \\quad \\alpha = k/(\\rho c_p), \\quad
              \\mathrm{Pr} = c_p\\mu/k, \\quad \\beta = 1/T

    References
    ----------
    ``us-std-atm-1976``; ``incropera7`` Table A.4 (from memory); ideal gas.

    Examples
    --------
    >>> p = air_properties(300.0)
    >>> round(float(p.prandtl), 3), round(float(p.kinematic_viscosity) * 1e5, 3)
    (0.708, 1.569)
    """
    return _air_properties(t, pressure, "t")


def _air_properties(t, pressure=_STANDARD_PRESSURE, name: str = "t") -> AirProperties:
    """:func:`air_properties` with the temperature argument called ``name`` in messages."""
    tt = _temperature(t, name)
    p = positive("pressure", pressure, "Pa")
    try:
        np.broadcast_shapes(tt.shape, p.shape)
    except ValueError:
        raise ValueError(f"shapes do not broadcast: t {tt.shape}, pressure {p.shape}") from None
    props = _props(tt, p)
    finite_result(
        "air_properties",
        (props.density, props.kinematic_viscosity, props.diffusivity),
        "t",
        "pressure",
    )
    return props
