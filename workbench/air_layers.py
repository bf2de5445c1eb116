"""Air layers (gaps, cavities) inside a wall: convection and radiation across them.

An air gap is not a slab of 0.026 W/(m·K): radiation between its faces
usually carries as much heat as conduction, and beyond a few centimetres the
air starts to circulate. This module gives

- the unventilated air-layer method of ISO 6946:2017 (Annex D),
- a detailed model from enclosure natural-convection correlations
  (Hollands et al. 1975/1976 for horizontal and tilted layers heated from
  below, ElSherbiny, Raithby & Hollands 1982 for vertical cavities, pure
  conduction for layers heated from above) plus grey-body radiation
  between the two faces,
- the equivalent conductivity of a gap (so a gap ranks beside a foam) and
  the width at which convection sets in ("foam or air gap?"),
- the ISO 6946 ventilation classes,
- :class:`AirLayer`, usable as a layer in :func:`workbench.conduction.solve_wall`.

Pure numeric core: SI floats and numpy arrays; temperatures in K, angles in
degrees.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np

from workbench._checks import (
    ValidityWarning,
    absolute_temperature,
    broadcast,
    finite,
    finite_result,
    in_range,
    nonnegative,
    positive,
    scalar,
    scalar_or_array,
)
from workbench.air_properties import _air_properties
from workbench.conduction import ArrayLike
from workbench.surfaces import DIRECTIONS, STANDARD_GRAVITY, STEFAN_BOLTZMANN, _choice

__all__ = [
    "METHODS",
    "VENTILATION_CLASSES",
    "effective_emissivity",
    "parallel_plate_radiation_coefficient",
    "air_layer_resistance",
    "nusselt_horizontal_layer",
    "nusselt_tilted_layer",
    "nusselt_vertical_cavity",
    "air_layer_resistance_detailed",
    "gap_equivalent_conductivity",
    "convection_onset_width",
    "ventilation_class",
    "ventilated_component_resistance",
    "AirLayer",
]

#: Calculation methods for an air layer.
METHODS: tuple[str, ...] = ("iso6946", "detailed")

#: ISO 6946 ventilation classes, in order of increasing opening area.
VENTILATION_CLASSES: tuple[str, ...] = ("unventilated", "slightly-ventilated", "well-ventilated")

_SIGMA = STEFAN_BOLTZMANN  # CODATA 2018 [W/(m²·K⁴)], see workbench.surfaces
_G = STANDARD_GRAVITY  # [m/s²], see workbench.surfaces
_RA_CRITICAL = 1708.0  # horizontal layer heated from below, rigid boundaries

# ISO 6946:2017 Annex D (Table B.1 of the 2007 edition), convective coefficient
# h_a of an unventilated air layer [W/(m²·K)], recalled from memory.
# Each is compared with the still-air conduction term 0.025/d, the larger used.
_ISO_HA_SMALL_DT = MappingProxyType({"up": 1.95, "horizontal": 1.25})  # ΔT <= 5 K
_ISO_HA_LARGE_DT = MappingProxyType({"up": 1.14, "horizontal": 0.73})  # × ΔT^(1/3), ΔT > 5 K


def _warn(message: str) -> None:
    warnings.warn(message, ValidityWarning, stacklevel=3)


def _emissivities(emissivity_1, emissivity_2):
    e1 = in_range("emissivity_1", emissivity_1, 0.0, 1.0, "-")
    e2 = in_range("emissivity_2", emissivity_2, 0.0, 1.0, "-")
    broadcast(emissivity_1=e1, emissivity_2=e2)
    return e1, e2


def _effective(e1: np.ndarray, e2: np.ndarray) -> np.ndarray:
    den = e1 + e2 - e1 * e2
    return np.where(den > 0, e1 * e2 / np.where(den > 0, den, 1.0), 0.0)


def effective_emissivity(emissivity_1: ArrayLike, emissivity_2: ArrayLike) -> float | np.ndarray:
    """Effective emissivity of two parallel grey surfaces facing each other.

    Parameters
    ----------
    emissivity_1, emissivity_2 : float or array
        Hemispherical emissivities of the two faces, 0–1. [-]

    Returns
    -------
    float or array
        E (the intersurface emittance of ISO 6946). [-]

    Notes
    -----
    .. math:: E = \\frac{1}{1/\\varepsilon_1 + 1/\\varepsilon_2 - 1}
              = \\frac{\\varepsilon_1\\varepsilon_2}{\\varepsilon_1 + \\varepsilon_2 - \\varepsilon_1\\varepsilon_2}

    (the second form is used, so a zero emissivity gives E = 0).

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, Annex D (from memory);
    ``incropera7``: 7th ed., Table 13.3, infinite parallel planes (from memory).

    Examples
    --------
    >>> round(effective_emissivity(0.9, 0.9), 4)
    0.8182
    """
    e1, e2 = _emissivities(emissivity_1, emissivity_2)
    return scalar_or_array(_effective(e1, e2))


def parallel_plate_radiation_coefficient(
    emissivity_1: ArrayLike, emissivity_2: ArrayLike, t_1: ArrayLike, t_2: ArrayLike
) -> float | np.ndarray:
    """Exact linearised radiation coefficient between two large parallel grey plates.

    Parameters
    ----------
    emissivity_1, emissivity_2 : float or array
        Emissivities of the two faces, 0–1. [-]
    t_1, t_2 : float or array
        Face temperatures. [K]

    Returns
    -------
    float or array
        h_r with q = h_r (T_1 − T_2). [W/(m²·K)]

    Notes
    -----
    .. math:: h_r = E\\sigma(T_1^2 + T_2^2)(T_1 + T_2), \\quad
              q = \\frac{\\sigma(T_1^4 - T_2^4)}{1/\\varepsilon_1 + 1/\\varepsilon_2 - 1}

    References
    ----------
    ``incropera7``: 7th ed., Eq. 13.24 / Table 13.3 (from memory).

    Examples
    --------
    >>> round(parallel_plate_radiation_coefficient(0.9, 0.9, 285.65, 280.65), 3)
    4.213
    """
    e1, e2 = _emissivities(emissivity_1, emissivity_2)
    t1 = absolute_temperature("t_1", t_1)
    t2 = absolute_temperature("t_2", t_2)
    broadcast(emissivity_1=e1, emissivity_2=e2, t_1=t1, t_2=t2)
    return scalar_or_array(_effective(e1, e2) * _SIGMA * (t1 * t1 + t2 * t2) * (t1 + t2))


def _common(width, emissivity_1, emissivity_2, t_mean, delta_t):
    d = positive("width", width, "m")
    e1, e2 = _emissivities(emissivity_1, emissivity_2)
    tm = absolute_temperature("t_mean", t_mean)
    dt = np.abs(finite("delta_t", delta_t, "K"))
    out = broadcast(width=d, emissivity_1=e1, emissivity_2=e2, t_mean=tm, delta_t=dt)
    if np.any(dt >= 2 * tm):
        raise ValueError("delta_t: must be smaller than 2·t_mean in K (face temperatures > 0 K)")
    return out


def air_layer_resistance(
    width: ArrayLike,
    direction: str,
    emissivity_1: ArrayLike = 0.9,
    emissivity_2: ArrayLike = 0.9,
    t_mean: ArrayLike = 283.15,
    delta_t: ArrayLike = 5.0,
) -> float | np.ndarray:
    """Thermal resistance of an unventilated air layer by the ISO 6946 method.

    Parameters
    ----------
    width : float or array
        Thickness of the air layer in the direction of heat flow, <= 0.3 m. [m]
    direction : str
        Direction of the heat flow: ``"up"``, ``"horizontal"`` (within ±30°
        of the horizontal plane) or ``"down"``.
    emissivity_1, emissivity_2 : float or array
        Hemispherical emissivities of the faces bounding the layer, 0–1. [-]
    t_mean : float or array
        Mean temperature of the layer, for h_r0; 283.15 K is the conventional
        value. [K]
    delta_t : float or array
        Temperature difference across the layer; ISO 6946's tabulated values
        assume ΔT <= 5 K. [K]

    Returns
    -------
    float or array
        R_g. [m²·K/W]

    Notes
    -----
    .. math:: R_g = \\frac{1}{h_a + h_r}, \\quad h_r = E\\,h_{r0} = E\\cdot 4\\sigma T_m^3,
              \\quad E = \\frac{1}{1/\\varepsilon_1 + 1/\\varepsilon_2 - 1}

    with :math:`h_a` the larger of :math:`0.025/d` (still-air conduction)
    and, for ΔT <= 5 K: 1.95 (up), 1.25 (horizontal), :math:`0.12\\,d^{-0.44}`
    (down); for ΔT > 5 K: :math:`1.14\\,\\Delta T^{1/3}` (up),
    :math:`0.73\\,\\Delta T^{1/3}` (horizontal),
    :math:`0.09\\,\\Delta T^{0.187} d^{-0.44}` (down). [W/(m²·K)], d in m.
    These expressions are recalled from memory of ISO 6946:2017 Annex D
    (Table B.1 of ISO 6946:2007); with ε = 0.9 they reproduce the
    standard's Table 8 to its two decimals (checked in the tests).

    Validity (ISO 6946): the layer is bounded by two parallel faces
    perpendicular to the heat flow, with emissivities not degraded by dust
    or condensation; its thickness is less than 0.1 of each of its other
    two dimensions and not more than 0.3 m; it has no air exchange with the
    indoor environment. A :class:`~workbench._checks.ValidityWarning` is
    issued for width > 0.3 m. For thicker layers or strong temperature
    differences see :func:`air_layer_resistance_detailed`.

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, Annex D (unventilated air layers) and
    Table 8 (from memory).

    Examples
    --------
    >>> round(air_layer_resistance(0.025, "horizontal"), 3)
    0.183
    >>> round(air_layer_resistance(0.025, "horizontal", emissivity_1=0.05), 3)
    0.664
    """
    _choice("direction", direction, DIRECTIONS)
    d, e1, e2, tm, dt = _common(width, emissivity_1, emissivity_2, t_mean, delta_t)
    if np.any(d > 0.3):
        _warn(
            f"air_layer_resistance: width up to {d.max():g} m exceeds the 0.3 m limit of ISO 6946"
        )
    small = dt <= 5.0
    if direction == "down":
        ha = np.where(small, 0.12, 0.09 * dt**0.187) * d**-0.44
    else:
        ha = np.where(small, _ISO_HA_SMALL_DT[direction], _ISO_HA_LARGE_DT[direction] * np.cbrt(dt))
    ha = np.maximum(ha, 0.025 / d)
    hr = _effective(e1, e2) * 4.0 * _SIGMA * tm**3
    return finite_result(
        "air_layer_resistance", scalar_or_array(1.0 / (ha + hr)),
        "width", "emissivity_1", "emissivity_2", "t_mean", "delta_t",
    )


def nusselt_horizontal_layer(rayleigh: ArrayLike) -> float | np.ndarray:
    """Nusselt number of a horizontal air layer heated from below (Hollands et al.).

    Parameters
    ----------
    rayleigh : float or array
        Rayleigh number based on the layer thickness, >= 0. [-]

    Returns
    -------
    float or array
        Nu = h d / k (1 in the conduction regime). [-]

    Notes
    -----
    .. math:: \\mathrm{Nu} = 1 + 1.44\\left[1 - \\frac{1708}{\\mathrm{Ra}}\\right]^+
              + \\left[\\left(\\frac{\\mathrm{Ra}}{5830}\\right)^{1/3} - 1\\right]^+

    :math:`[x]^+ = \\max(x, 0)`. For air, stated up to Ra = 1e8 for layers
    of large extent (a :class:`~workbench._checks.ValidityWarning` above).
    Below the critical Rayleigh number 1708 the air is still: Nu = 1.

    References
    ----------
    ``hollands-1975``: Hollands, K. G. T., Raithby, G. D., Konicek, L.,
    Int. J. Heat Mass Transfer 18 (1975) 879–884 (from memory).

    Examples
    --------
    >>> nusselt_horizontal_layer(1000.0)
    1.0
    >>> round(nusselt_horizontal_layer(1e5), 3)
    3.994
    """
    ra = nonnegative("rayleigh", rayleigh, "-")
    if np.any(ra > 1e8):
        _warn(f"nusselt_horizontal_layer: Ra up to {ra.max():.3g} > 1e8 (stated range)")
    safe = np.where(ra > 0, ra, 1.0)
    nu = 1.0 + 1.44 * np.maximum(0.0, 1.0 - _RA_CRITICAL / safe) * (ra > 0)
    nu = nu + np.maximum(0.0, np.cbrt(ra / 5830.0) - 1.0)
    return scalar_or_array(nu)


def nusselt_tilted_layer(rayleigh: ArrayLike, tilt: ArrayLike) -> float | np.ndarray:
    """Nusselt number of an inclined air layer heated from below (Hollands et al. 1976).

    Parameters
    ----------
    rayleigh : float or array
        Rayleigh number based on the layer thickness, >= 0. [-]
    tilt : float or array
        Inclination of the layer from the horizontal, the lower face being
        the hot one; 0 = horizontal heated from below, stated for 0–60. [deg]

    Returns
    -------
    float or array
        Nu = h d / k. [-]

    Notes
    -----
    .. math:: \\mathrm{Nu} = 1 + 1.44\\left[1 - \\frac{1708}{\\mathrm{Ra}\\cos\\theta}\\right]^+
              \\left(1 - \\frac{1708(\\sin 1.8\\theta)^{1.6}}{\\mathrm{Ra}\\cos\\theta}\\right)
              + \\left[\\left(\\frac{\\mathrm{Ra}\\cos\\theta}{5830}\\right)^{1/3} - 1\\right]^+

    Stated for 0 <= θ <= 60° and Ra < 1e5 (tilted layers of large aspect
    ratio); a :class:`~workbench._checks.ValidityWarning` outside. At
    θ = 0 it equals :func:`nusselt_horizontal_layer`.

    References
    ----------
    ``hollands-1976``: Hollands, K. G. T., Unny, T. E., Raithby, G. D.,
    Konicek, L., J. Heat Transfer 98 (1976) 189–193; ``incropera7``:
    7th ed., Eq. 9.54 (from memory).

    Examples
    --------
    >>> round(nusselt_tilted_layer(1e4, 45.0), 3)
    1.9
    """
    ra = nonnegative("rayleigh", rayleigh, "-")
    th = finite("tilt", tilt, "deg")
    ra, th = broadcast(rayleigh=ra, tilt=th)
    if np.any((th < 0) | (th > 60)):
        _warn("nusselt_tilted_layer: tilt outside the stated 0–60 deg")
    if np.any((ra > 1e5) & (th > 0)):
        _warn(f"nusselt_tilted_layer: Ra up to {ra.max():.3g} > 1e5 (stated range)")
    rad = np.radians(th)
    rac = ra * np.cos(rad)
    safe = np.where(rac > 0, rac, 1.0)
    t1 = np.maximum(0.0, 1.0 - _RA_CRITICAL / safe) * (rac > 0)
    t2 = 1.0 - _RA_CRITICAL * np.abs(np.sin(np.radians(1.8 * th))) ** 1.6 / safe
    t3 = np.maximum(0.0, np.cbrt(np.maximum(rac, 0.0) / 5830.0) - 1.0)
    return scalar_or_array(1.0 + 1.44 * t1 * t2 + t3)


def nusselt_vertical_cavity(rayleigh: ArrayLike, aspect_ratio: ArrayLike) -> float | np.ndarray:
    """Nusselt number of a vertical air cavity (ElSherbiny, Raithby & Hollands 1982).

    Parameters
    ----------
    rayleigh : float or array
        Rayleigh number based on the cavity width (face to face), >= 0. [-]
    aspect_ratio : float or array
        Height over width, H/d; stated for 5–110. [-]

    Returns
    -------
    float or array
        Nu = h d / k. [-]

    Notes
    -----
    .. math:: \\mathrm{Nu} = \\max(\\mathrm{Nu}_1, \\mathrm{Nu}_2, \\mathrm{Nu}_3),\\quad
              \\mathrm{Nu}_1 = 0.0605\\,\\mathrm{Ra}^{1/3}

    .. math:: \\mathrm{Nu}_2 = \\left[1 + \\left(\\frac{0.104\\,\\mathrm{Ra}^{0.293}}
              {1 + (6310/\\mathrm{Ra})^{1.36}}\\right)^3\\right]^{1/3},\\quad
              \\mathrm{Nu}_3 = 0.242\\left(\\frac{\\mathrm{Ra}}{A}\\right)^{0.272}

    Stated for 5 <= A <= 110 and Ra <= 2e7 (air, isothermal faces);
    a :class:`~workbench._checks.ValidityWarning` outside, except for slender
    cavities (A > 110) in the conduction regime (Ra <= 1e3), where Nu = 1
    within 0.1 % whatever the aspect ratio. Nu → 1 as Ra → 0.

    References
    ----------
    ``elsherbiny-1982``: ElSherbiny, S. M., Raithby, G. D., Hollands, K. G.
    T., J. Heat Transfer 104 (1982) 96–102 (from memory).

    Examples
    --------
    >>> round(nusselt_vertical_cavity(1e5, 20.0), 3)
    3.002
    """
    ra = nonnegative("rayleigh", rayleigh, "-")
    a = positive("aspect_ratio", aspect_ratio, "-")
    ra, a = broadcast(rayleigh=ra, aspect_ratio=a)
    # a slender cavity (A > 110) in the conduction regime (Ra <= 1e3) has Nu = 1
    if np.any((a < 5) | ((a > 110) & (ra > 1e3))):
        _warn(
            f"nusselt_vertical_cavity: aspect ratio {a.min():.3g}–{a.max():.3g} outside the stated 5–110"
        )
    if np.any(ra > 2e7):
        _warn(f"nusselt_vertical_cavity: Ra up to {ra.max():.3g} > 2e7 (stated range)")
    return scalar_or_array(_nu_vertical(ra, a))


def _nu_vertical(ra: np.ndarray, a: np.ndarray) -> np.ndarray:
    nu1 = 0.0605 * np.cbrt(ra)
    safe = np.where(ra > 0, ra, 1.0)
    with np.errstate(over="ignore"):  # (6310/Ra)^1.36 -> inf for a tiny Ra: the term -> 0
        inner = np.where(ra > 0, 0.104 * safe**0.293 / (1.0 + (6310.0 / safe) ** 1.36), 0.0)
    nu2 = np.cbrt(1.0 + inner**3)
    nu3 = 0.242 * (ra / a) ** 0.272
    return np.maximum(np.maximum(nu1, nu2), nu3)


def _gap_rayleigh(props, dt, d):
    with np.errstate(over="ignore"):
        ra = _G * props.expansion_coefficient * dt * d**3 / (props.kinematic_viscosity * props.diffusivity)
    if not np.all(np.isfinite(ra)):
        raise ValueError(
            "width: the Rayleigh number of the gap overflows (width in m, delta_t in K); "
            "no enclosure correlation covers it"
        )
    return ra


def _nusselt(direction: str, ra, d, height):
    if direction == "down":
        return np.ones_like(ra)
    if direction == "up":
        return np.asarray(nusselt_horizontal_layer(ra))
    return np.asarray(nusselt_vertical_cavity(ra, height / d))


def _height(direction: str, height):
    if direction != "horizontal":
        return None
    if height is None:
        raise ValueError("height: the cavity height in m is needed for direction 'horizontal'")
    return positive("height", height, "m")


def air_layer_resistance_detailed(
    width: ArrayLike,
    direction: str,
    emissivity_1: ArrayLike = 0.9,
    emissivity_2: ArrayLike = 0.9,
    t_mean: ArrayLike = 283.15,
    delta_t: ArrayLike = 5.0,
    height: ArrayLike | None = None,
    tilt: ArrayLike | None = None,
) -> float | np.ndarray:
    """Resistance of a sealed air layer from enclosure convection and grey-body radiation.

    Parameters
    ----------
    width : float or array
        Face-to-face width of the layer. [m]
    direction : str
        Direction of the heat flow: ``"up"`` (horizontal layer heated from
        below), ``"horizontal"`` (vertical cavity) or ``"down"`` (horizontal
        layer heated from above).
    emissivity_1, emissivity_2 : float or array
        Emissivities of the two faces, 0–1. [-]
    t_mean : float or array
        Mean temperature of the two faces. [K]
    delta_t : float or array
        Temperature difference between the faces (sign ignored). [K]
    height : float or array, optional
        Cavity height, needed for ``"horizontal"`` (aspect ratio H/d). [m]
    tilt : float or array, optional
        For ``"up"`` only: inclination of the layer from the horizontal
        (heated from below), 0–60; uses :func:`nusselt_tilted_layer`. [deg]

    Returns
    -------
    float or array
        R_g. [m²·K/W]

    Notes
    -----
    Faces at :math:`T_{1,2} = T_m \\pm \\Delta T/2`, air properties at
    :math:`T_m`, :math:`\\mathrm{Ra} = g\\beta\\Delta T d^3/(\\nu\\alpha)`:

    .. math:: R_g = \\frac{1}{\\mathrm{Nu}\\,k/d + E\\sigma(T_1^2+T_2^2)(T_1+T_2)}

    Nu from :func:`nusselt_horizontal_layer` (up; :func:`nusselt_tilted_layer`
    where ``tilt`` is given), :func:`nusselt_vertical_cavity`
    (horizontal heat flow) and Nu = 1 (down: a layer heated from above is
    stable, pure conduction). Their validity warnings apply.

    References
    ----------
    ``hollands-1975``, ``elsherbiny-1982`` (from memory); ``incropera7``:
    7th ed., §9.8 and §13.3 (from memory).

    Examples
    --------
    >>> round(air_layer_resistance_detailed(0.025, "horizontal", height=1.0), 3)
    0.182
    """
    _choice("direction", direction, DIRECTIONS)
    d, e1, e2, tm, dt = _common(width, emissivity_1, emissivity_2, t_mean, delta_t)
    h = _height(direction, height)
    if h is not None:
        d, h = broadcast(width=d, height=h)
    props = _air_properties(tm, name="t_mean")
    ra = _gap_rayleigh(props, dt, d)
    if tilt is not None:
        if direction != "up":
            raise ValueError("tilt: only for direction 'up' (a layer heated from below), in deg")
        nu = np.asarray(nusselt_tilted_layer(ra, tilt))
    else:
        nu = _nusselt(direction, ra, d, h)
    t1, t2 = tm + 0.5 * dt, tm - 0.5 * dt
    hr = _effective(e1, e2) * _SIGMA * (t1 * t1 + t2 * t2) * (t1 + t2)
    return finite_result(
        "air_layer_resistance_detailed",
        scalar_or_array(1.0 / (nu * props.conductivity / d + hr)),
        "width", "emissivity_1", "emissivity_2", "t_mean", "delta_t", "height", "tilt",
    )


def gap_equivalent_conductivity(
    width: ArrayLike,
    direction: str,
    emissivity_1: ArrayLike = 0.9,
    emissivity_2: ArrayLike = 0.9,
    t_mean: ArrayLike = 283.15,
    delta_t: ArrayLike = 5.0,
    method: str = "detailed",
    height: ArrayLike | None = None,
) -> float | np.ndarray:
    """Equivalent conductivity of an air gap, so it can be ranked beside a solid.

    Parameters
    ----------
    width : float or array
        Gap width. [m]
    direction : str
        Heat-flow direction ``"up"``, ``"horizontal"`` or ``"down"``.
    emissivity_1, emissivity_2 : float or array
        Face emissivities, 0–1. [-]
    t_mean : float or array
        Mean temperature. [K]
    delta_t : float or array
        Temperature difference across the gap. [K]
    method : str
        ``"detailed"`` (:func:`air_layer_resistance_detailed`) or
        ``"iso6946"`` (:func:`air_layer_resistance`).
    height : float or array, optional
        Cavity height for ``"horizontal"`` with the detailed method. [m]

    Returns
    -------
    float or array
        :math:`k_{eq} = d / R_g`. [W/(m·K)]

    Notes
    -----
    .. math:: k_{eq} = d / R_g

    Unlike a solid's k, k_eq grows with the width (radiation and convection
    do not scale with 1/d): compare at the actual width.

    References
    ----------
    Definition (common practice); see the two resistance functions.

    Examples
    --------
    >>> round(gap_equivalent_conductivity(0.01, "down", emissivity_1=0.0), 4)
    0.0249
    """
    _choice("method", method, METHODS)
    if method == "iso6946":
        r = air_layer_resistance(width, direction, emissivity_1, emissivity_2, t_mean, delta_t)
    else:
        r = air_layer_resistance_detailed(
            width, direction, emissivity_1, emissivity_2, t_mean, delta_t, height
        )
    return finite_result(
        "gap_equivalent_conductivity",
        scalar_or_array(positive("width", width, "m") / np.asarray(r)),
        "width", "t_mean", "delta_t",
    )


def convection_onset_width(
    direction: str,
    delta_t: ArrayLike,
    t_mean: ArrayLike = 283.15,
    height: ArrayLike | None = None,
    nusselt_excess: float = 0.05,
) -> float | np.ndarray:
    """Gap width beyond which the air circulates, so widening helps less.

    Parameters
    ----------
    direction : str
        Heat-flow direction ``"up"``, ``"horizontal"`` or ``"down"``.
    delta_t : float or array
        Temperature difference across the gap, > 0. [K]
    t_mean : float or array
        Mean temperature. [K]
    height : float or array, optional
        Cavity height for ``"horizontal"``; ``None`` = a tall cavity (the
        aspect-ratio term of ElSherbiny et al. ignored). [m]
    nusselt_excess : float
        For ``"horizontal"``: the width returned is where Nu reaches
        ``1 + nusselt_excess``. [-]

    Returns
    -------
    float or array
        Width. ``inf`` for ``"down"`` (a layer heated from above stays
        conductive at any width). [m]

    Notes
    -----
    Up (heated from below): the onset of Rayleigh–Bénard convection at the
    critical Rayleigh number 1708,

    .. math:: d_c = \\left(\\frac{1708\\,\\nu\\alpha}{g\\beta\\Delta T}\\right)^{1/3}

    Horizontal heat flow (vertical cavity): there is no sharp onset (a slow
    circulation exists at any ΔT); the width where the ElSherbiny et al.
    (1982) Nu reaches :math:`1 + \\epsilon`, found by bisection. Below this
    width a still-air gap beats no foam of k > k_air; beyond it the gap's
    convective resistance grows ever more slowly with width, while a foam's
    grows linearly.

    References
    ----------
    ``hollands-1975`` (Ra_c = 1708); ``elsherbiny-1982``; ``incropera7``:
    7th ed., §9.8 (from memory).

    Examples
    --------
    >>> round(convection_onset_width("up", 10.0, 293.15) * 1000, 1)
    11.8
    """
    _choice("direction", direction, DIRECTIONS)
    dt = positive("delta_t", np.abs(finite("delta_t", delta_t, "K")), "K")
    tm = absolute_temperature("t_mean", t_mean)
    eps = float(positive("nusselt_excess", scalar("nusselt_excess", nusselt_excess, "-"), "-"))
    h = None if height is None else positive("height", height, "m")
    if h is None:
        dt, tm = broadcast(delta_t=dt, t_mean=tm)
    else:
        dt, tm, h = broadcast(delta_t=dt, t_mean=tm, height=h)
    if direction == "down":
        return scalar_or_array(np.full(dt.shape, np.inf))
    if np.any(dt >= 2 * tm):
        raise ValueError("delta_t: must be smaller than 2·t_mean in K (face temperatures > 0 K)")
    props = _air_properties(tm, name="t_mean")
    g_ratio = (
        _G * props.expansion_coefficient * dt / (props.kinematic_viscosity * props.diffusivity)
    )
    if direction == "up":
        return finite_result(
            "convection_onset_width", scalar_or_array(np.cbrt(_RA_CRITICAL / g_ratio)),
            "delta_t", "t_mean",
        )
    log_lo, log_hi = np.log(1e-5), np.log(10.0)
    lo = np.full(dt.shape, log_lo)
    hi = np.full(dt.shape, log_hi)
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        d = np.exp(mid)
        ra = g_ratio * d**3
        a = np.inf if h is None else h / d
        nu = _nu_vertical(ra, np.asarray(a, dtype=float))
        above = nu > 1.0 + eps
        hi = np.where(above, mid, hi)
        lo = np.where(above, lo, mid)
    if np.any(hi >= log_hi - 1e-9) or np.any(lo <= log_lo + 1e-9):
        raise ValueError(
            "delta_t, t_mean, height, nusselt_excess: the onset width lies outside the "
            "0.01 mm – 10 m searched "
            "(delta_t in K, t_mean in K, height in m); check the magnitudes"
        )
    return scalar_or_array(np.exp(0.5 * (lo + hi)))


def ventilation_class(opening_area: ArrayLike) -> str | np.ndarray:
    """ISO 6946 ventilation class of an air layer from its openings to the outside.

    Parameters
    ----------
    opening_area : float or array
        Area of openings: per metre of length (vertical layers) or per square
        metre of surface (horizontal layers), >= 0. [m²/m] or [m²/m²]

    Returns
    -------
    str or array of str
        ``"unventilated"`` (<= 500 mm² per m or m²), ``"slightly-ventilated"``
        (500–1500), ``"well-ventilated"`` (> 1500).

    Notes
    -----
    .. math:: A_v \\le 500\\,\\mathrm{mm^2};\\quad 500 < A_v \\le 1500;\\quad A_v > 1500

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, clause 6.9 (air layers; from memory).

    Examples
    --------
    >>> ventilation_class(800e-6)
    'slightly-ventilated'
    """
    av = nonnegative("opening_area", opening_area, "m²/m or m²/m²") * 1e6  # mm²
    out = np.where(
        av <= 500.0,
        VENTILATION_CLASSES[0],
        np.where(av <= 1500.0, VENTILATION_CLASSES[1], VENTILATION_CLASSES[2]),
    )
    return str(out) if out.ndim == 0 else out


def ventilated_component_resistance(
    opening_area: ArrayLike, r_total_unventilated: ArrayLike, r_total_ventilated: ArrayLike
) -> float | np.ndarray:
    """Total resistance of a component with an air layer of any ISO 6946 ventilation class.

    Parameters
    ----------
    opening_area : float or array
        Opening area per m (vertical) or per m² (horizontal), >= 0. [m²/m]
    r_total_unventilated : float or array
        Total resistance with the layer treated as unventilated. [m²·K/W]
    r_total_ventilated : float or array
        Total resistance with the layer treated as well ventilated: the
        layer and everything outside it disregarded, and an external surface
        resistance equal to R_si used. [m²·K/W]

    Returns
    -------
    float or array
        R_T. [m²·K/W]

    Notes
    -----
    With :math:`A_v` in mm²/m, clipped to [500, 1500]:

    .. math:: R_T = \\frac{1500 - A_v}{1000} R_{T,u} + \\frac{A_v - 500}{1000} R_{T,v}

    which gives :math:`R_{T,u}` for unventilated and :math:`R_{T,v}` for well
    ventilated layers.

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, clause 6.9 (from memory).

    Examples
    --------
    >>> round(ventilated_component_resistance(1000e-6, 2.0, 1.5), 3)
    1.75
    """
    av = np.clip(nonnegative("opening_area", opening_area, "m²/m or m²/m²") * 1e6, 500.0, 1500.0)
    ru = positive("r_total_unventilated", r_total_unventilated, "m²·K/W")
    rv = positive("r_total_ventilated", r_total_ventilated, "m²·K/W")
    av, ru, rv = broadcast(opening_area=av, r_total_unventilated=ru, r_total_ventilated=rv)
    return scalar_or_array((1500.0 - av) / 1000.0 * ru + (av - 500.0) / 1000.0 * rv)


_REVERSED = MappingProxyType({"up": "down", "down": "up", "horizontal": "horizontal"})


@dataclass(frozen=True)
class AirLayer:
    """An unventilated air layer as a layer of a plane wall (for ``solve_wall``).

    Parameters
    ----------
    thickness : float
        Face-to-face width. [m]
    direction : str
        Heat-flow direction when the first face (the inside, ``t_a``) is the
        warmer: ``"up"``, ``"horizontal"`` or ``"down"``. Where the heat flows
        the other way at the solution, ``"up"`` and ``"down"`` swap.
    emissivity_1, emissivity_2 : float
        Emissivities of the first and second face, 0–1. [-]
    method : str
        ``"iso6946"`` or ``"detailed"``.
    height : float, optional
        Cavity height, needed for ``"horizontal"`` with the detailed method. [m]
    name : str
        Label for reports.
    """

    thickness: float
    direction: str
    emissivity_1: float = 0.9
    emissivity_2: float = 0.9
    method: str = "iso6946"
    height: float | None = None
    name: str = "air layer"

    def __post_init__(self):
        positive("thickness", scalar("thickness", self.thickness, "m"), "m")
        _choice("direction", self.direction, DIRECTIONS)
        _choice("method", self.method, METHODS)
        _emissivities(
            scalar("emissivity_1", self.emissivity_1, "-"),
            scalar("emissivity_2", self.emissivity_2, "-"),
        )
        if self.height is not None:
            positive("height", scalar("height", self.height, "m"), "m")
        if self.method == "detailed":
            _height(self.direction, self.height)

    def resistance(self, t_a, t_b):
        """Resistance between the face temperatures ``t_a`` (first) and ``t_b``. [m²·K/W]"""
        ta = absolute_temperature("t_a", t_a)
        tb = absolute_temperature("t_b", t_b)
        ta, tb = broadcast(t_a=ta, t_b=tb)
        try:
            return self._resistance(ta, tb)
        except ValueError as exc:
            raise ValueError(f"t_a, t_b (face temperatures, K): {exc}") from None

    def _resistance(self, ta, tb):
        tm = 0.5 * (ta + tb)
        dt = np.abs(ta - tb)
        out = np.empty(tm.shape)
        forward = ta >= tb
        for mask, direction in ((forward, self.direction), (~forward, _REVERSED[self.direction])):
            if not np.any(mask):
                continue
            if self.method == "iso6946":
                r = air_layer_resistance(
                    self.thickness,
                    direction,
                    self.emissivity_1,
                    self.emissivity_2,
                    tm[mask],
                    dt[mask],
                )
            else:
                r = air_layer_resistance_detailed(
                    self.thickness,
                    direction,
                    self.emissivity_1,
                    self.emissivity_2,
                    tm[mask],
                    dt[mask],
                    self.height,
                )
            out[mask] = r
        return scalar_or_array(out)
