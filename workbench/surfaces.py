"""Heat transfer at wall surfaces: convection and radiation films.

A wall exchanges heat with the air and the surroundings through a surface
film. This module gives

- the conventional ISO 6946:2017 surface resistances (building practice),
- the ISO 6946 surface-coefficient formulas behind them,
- natural-convection coefficients for air from published correlations
  (Churchill–Chu for vertical plates, Lloyd–Moran / McAdams and the
  Incropera 7th ed. Eq. 9.32 form for horizontal plates),
- forced convection (ISO 6946 wind formula, flat-plate boundary layer),
- the linearised radiation coefficient,
- a combined film usable as ``r_si`` / ``r_se`` in
  :func:`workbench.conduction.solve_wall`.

Pure numeric core: SI floats and numpy arrays that broadcast; temperatures
absolute in K.

Caution: surface temperatures computed with these films are estimates
(correlations scatter by ±20 % or more); where a touch temperature or a
cold-chain limit matters, confirm by measurement and follow the applicable
safety standards and local codes.
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
    finite_result,
    in_range,
    nonnegative,
    positive,
    scalar,
    scalar_or_array,
)
from workbench.air_properties import air_properties
from workbench.conduction import ArrayLike

__all__ = [
    "SURFACE_RESISTANCES",
    "DIRECTIONS",
    "ORIENTATIONS",
    "conventional_surface_resistance",
    "iso6946_convection_coefficient",
    "iso6946_surface_resistance",
    "plate_characteristic_length",
    "natural_convection_coefficient",
    "flat_plate_convection_coefficient",
    "radiation_coefficient",
    "blackbody_radiation_coefficient",
    "combined_film_resistance",
    "SurfaceFilm",
    "surface_film",
]

#: Heat-flow directions used by ISO 6946 (direction of the heat flow, not of
#: the surface): ``"up"``, ``"horizontal"`` (within ±30° of the horizontal
#: plane), ``"down"``.
DIRECTIONS: tuple[str, ...] = ("up", "horizontal", "down")

#: Orientations for natural convection: the way the exposed surface faces.
ORIENTATIONS: tuple[str, ...] = ("vertical", "horizontal-up", "horizontal-down")

_SIDES: tuple[str, ...] = ("inside", "outside")

#: Conventional surface resistances [m²·K/W], ISO 6946:2017 Table 7:
#: ``SURFACE_RESISTANCES[side][direction]``; side ``"inside"`` (R_si) or
#: ``"outside"`` (R_se), direction of heat flow ``"up"``, ``"horizontal"``,
#: ``"down"``.
SURFACE_RESISTANCES = MappingProxyType(
    {
        "inside": MappingProxyType({"up": 0.10, "horizontal": 0.13, "down": 0.17}),
        "outside": MappingProxyType({"up": 0.04, "horizontal": 0.04, "down": 0.04}),
    }
)

# ISO 6946:2017 Annex C (Annex A in the 2007 edition), from memory:
# internal convective coefficients h_ci by heat-flow direction [W/(m²·K)].
_H_CI = MappingProxyType({"up": 5.0, "horizontal": 2.5, "down": 0.7})

#: Stefan–Boltzmann constant σ = 2π⁵k⁴/(15h³c²). [W/(m²·K⁴)]
#: CODATA 2018 recommended values (``codata-2018``): 5.670 374 419... × 10⁻⁸,
#: exact in the 2019 SI (derived from the exact h, k and c); here to double
#: precision. Written out so that importing the core does not import scipy;
#: tests/test_import_light.py checks it against ``scipy.constants``.
STEFAN_BOLTZMANN: float = 5.6703744191844314e-8

#: Standard acceleration of gravity g_n. [m/s²]
#: 9.80665 exactly, by definition (3rd CGPM, 1901, from memory); CODATA 2018 lists it.
STANDARD_GRAVITY: float = 9.80665

_SIGMA = STEFAN_BOLTZMANN
_G = STANDARD_GRAVITY


def _choice(name: str, value: str, valid: tuple[str, ...]) -> str:
    if not isinstance(value, str) or value not in valid:
        raise ValueError(f"{name}: unknown value {value!r}; valid: {list(valid)}")
    return value


def _warn_outside(what: str, values: np.ndarray, mask: np.ndarray, stated: str) -> None:
    if np.any(mask):
        bad = np.asarray(values)[mask]
        warnings.warn(
            f"{what} = {bad.min():.3g}–{bad.max():.3g} lies outside the stated range "
            f"{stated}; the correlation is extrapolated there",
            ValidityWarning,
            stacklevel=3,
        )


def conventional_surface_resistance(side: str, direction: str) -> float:
    """Conventional surface resistance of ISO 6946 for design calculations.

    Parameters
    ----------
    side : str
        ``"inside"`` (R_si) or ``"outside"`` (R_se).
    direction : str
        Direction of the heat flow: ``"up"``, ``"horizontal"`` (within ±30°
        of the horizontal plane) or ``"down"``.

    Returns
    -------
    float
        Surface resistance. [m²·K/W]

    Notes
    -----
    Plane surfaces, emissivity 0.9, internal h_r0 at 20 °C, external wind
    4 m/s (the conditions behind the table):

    ======  ====  ==========  ====
    side    up    horizontal  down
    ======  ====  ==========  ====
    R_si    0.10  0.13        0.17
    R_se    0.04  0.04        0.04
    ======  ====  ==========  ====

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, Table 7 (conventional surface resistances).

    Examples
    --------
    >>> conventional_surface_resistance("inside", "horizontal")
    0.13
    """
    _choice("side", side, _SIDES)
    _choice("direction", direction, DIRECTIONS)
    return SURFACE_RESISTANCES[side][direction]


def iso6946_convection_coefficient(
    side: str, direction: str, wind_speed: ArrayLike = 4.0
) -> float | np.ndarray:
    """Convective surface coefficient of ISO 6946 (annex formulas).

    Parameters
    ----------
    side : str
        ``"inside"`` or ``"outside"``.
    direction : str
        Heat-flow direction ``"up"``, ``"horizontal"`` or ``"down"`` (used
        for the inside only).
    wind_speed : float or array
        Wind speed next to the outside surface (outside only), >= 0. [m/s]

    Returns
    -------
    float or array
        Convective coefficient. [W/(m²·K)]

    Notes
    -----
    Inside: :math:`h_{ci}` = 5.0 (up), 2.5 (horizontal), 0.7 (down).
    Outside:

    .. math:: h_{ce} = 4 + 4 v

    Conventional values for building surfaces, not a correlation for a
    particular geometry.

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, Annex C (Annex A in the 2007 edition),
    from memory.

    Examples
    --------
    >>> iso6946_convection_coefficient("outside", "horizontal", wind_speed=4.0)
    20.0
    >>> iso6946_convection_coefficient("inside", "down")
    0.7
    """
    _choice("side", side, _SIDES)
    _choice("direction", direction, DIRECTIONS)
    v = nonnegative("wind_speed", wind_speed, "m/s")
    if side == "inside":
        return scalar_or_array(np.full_like(v, _H_CI[direction]))
    return scalar_or_array(4.0 + 4.0 * v)


def blackbody_radiation_coefficient(t_mean: ArrayLike) -> float | np.ndarray:
    """Radiative coefficient of a black body, h_r0 of ISO 6946.

    Parameters
    ----------
    t_mean : float or array
        Mean of the surface and surroundings temperatures. [K]

    Returns
    -------
    float or array
        h_r0. [W/(m²·K)]

    Notes
    -----
    .. math:: h_{r0} = 4 \\sigma T_m^3

    with σ the Stefan–Boltzmann constant (CODATA 2018, :data:`STEFAN_BOLTZMANN`). The
    exact linearisation (:func:`radiation_coefficient`) differs from ε·h_r0
    by a factor :math:`1 + (\\Delta T / 2T_m)^2`.

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, Annex C (and Annex D for air layers),
    from memory; ``codata-2018``: CODATA 2018 recommended values (σ).

    Examples
    --------
    >>> round(blackbody_radiation_coefficient(283.15), 2)
    5.15
    """
    tm = absolute_temperature("t_mean", t_mean)
    return scalar_or_array(4.0 * _SIGMA * tm**3)


def radiation_coefficient(
    emissivity: ArrayLike, t_surface: ArrayLike, t_ambient: ArrayLike
) -> float | np.ndarray:
    """Linearised radiation coefficient between a small grey surface and large surroundings.

    Parameters
    ----------
    emissivity : float or array
        Hemispherical emissivity of the surface, 0–1. [-]
    t_surface : float or array
        Surface temperature. [K]
    t_ambient : float or array
        Temperature of the surroundings (taken equal to the air). [K]

    Returns
    -------
    float or array
        h_r such that q = h_r (T_s − T_a) exactly. [W/(m²·K)]

    Notes
    -----
    .. math:: h_r = \\varepsilon\\sigma (T_s^2 + T_a^2)(T_s + T_a)
              = \\varepsilon\\sigma \\frac{T_s^4 - T_a^4}{T_s - T_a}

    exact for any temperatures (no division, so equal temperatures give
    :math:`4\\varepsilon\\sigma T^3`).

    References
    ----------
    ``incropera7``: 7th ed., Eq. 1.9 (from memory).

    Examples
    --------
    >>> round(radiation_coefficient(0.9, 300.0, 280.0), 3)
    4.985
    """
    eps = in_range("emissivity", emissivity, 0.0, 1.0, "-")
    ts = absolute_temperature("t_surface", t_surface)
    ta = absolute_temperature("t_ambient", t_ambient)
    broadcast(emissivity=eps, t_surface=ts, t_ambient=ta)
    return scalar_or_array(eps * _SIGMA * (ts * ts + ta * ta) * (ts + ta))


def iso6946_surface_resistance(
    side: str,
    direction: str,
    emissivity: ArrayLike = 0.9,
    t_mean: ArrayLike | None = None,
    wind_speed: ArrayLike = 4.0,
) -> float | np.ndarray:
    """Surface resistance from the ISO 6946 annex formulas.

    Parameters
    ----------
    side : str
        ``"inside"`` or ``"outside"``.
    direction : str
        Heat-flow direction ``"up"``, ``"horizontal"`` or ``"down"``.
    emissivity : float or array
        Surface emissivity, 0–1. [-]
    t_mean : float or array, optional
        Mean radiant temperature for h_r0; default 293.15 K inside and
        273.15 K outside (the conventional conditions). [K]
    wind_speed : float or array
        Outside wind speed, >= 0. [m/s]

    Returns
    -------
    float or array
        R_s. [m²·K/W]

    Notes
    -----
    .. math:: R_s = \\frac{1}{h_c + \\varepsilon h_{r0}}

    With the defaults this reproduces the conventional values of
    :func:`conventional_surface_resistance` to their two decimals.

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, Annex C (from memory).

    Examples
    --------
    >>> round(iso6946_surface_resistance("inside", "down"), 2)
    0.17
    """
    _choice("side", side, _SIDES)
    if t_mean is None:
        t_mean = 293.15 if side == "inside" else 273.15
    hc = np.asarray(iso6946_convection_coefficient(side, direction, wind_speed))
    eps = in_range("emissivity", emissivity, 0.0, 1.0, "-")
    tm = absolute_temperature("t_mean", t_mean)
    broadcast(emissivity=eps, t_mean=tm, wind_speed=hc)
    hr = eps * np.asarray(blackbody_radiation_coefficient(tm))
    return scalar_or_array(1.0 / (hc + hr))


def plate_characteristic_length(length: ArrayLike, width: ArrayLike) -> float | np.ndarray:
    """Characteristic length A/P of a horizontal rectangular plate for natural convection.

    Parameters
    ----------
    length, width : float or array
        Plate sides. [m]

    Returns
    -------
    float or array
        :math:`L = A/P = lw / (2(l + w))`. [m]

    Notes
    -----
    .. math:: L = \\frac{A_s}{P} = \\frac{l\\,w}{2(l + w)}

    The length used by the horizontal-plate correlations of
    :func:`natural_convection_coefficient` (Goldstein, Sparrow & Jones 1973).

    References
    ----------
    ``incropera7``: 7th ed., Eq. 9.29 (from memory).

    Examples
    --------
    >>> plate_characteristic_length(0.4, 0.4)
    0.1
    """
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    a, b = broadcast(length=a, width=b)
    return scalar_or_array(a * b / (2.0 * (a + b)))


def _rayleigh(props, delta_t, length):
    return (
        _G
        * props.expansion_coefficient
        * delta_t
        * length**3
        / (props.kinematic_viscosity * props.diffusivity)
    )


def natural_convection_coefficient(
    t_surface: ArrayLike, t_ambient: ArrayLike, length: ArrayLike, orientation: str
) -> float | np.ndarray:
    """Natural-convection coefficient of a flat isothermal surface in still air.

    Parameters
    ----------
    t_surface : float or array
        Surface temperature. [K]
    t_ambient : float or array
        Quiescent air temperature far from the surface. [K]
    length : float or array
        Characteristic length: the plate height for ``"vertical"``; area over
        perimeter, A/P, for the horizontal orientations. [m]
    orientation : str
        How the exposed surface faces: ``"vertical"``, ``"horizontal-up"``
        (the upper face of a horizontal plate, e.g. a lid) or
        ``"horizontal-down"`` (the lower face, e.g. the underside of a
        shelf).

    Returns
    -------
    float or array
        Mean convective coefficient h = Nu k / L. [W/(m²·K)]

    Notes
    -----
    Properties of dry air at 1 atm at the film temperature
    :math:`T_f = (T_s + T_a)/2`, :math:`\\beta = 1/T_f`, and

    .. math:: \\mathrm{Ra}_L = \\frac{g\\beta|T_s - T_a|L^3}{\\nu\\alpha}

    Vertical plate, Churchill & Chu full-range correlation (Incropera 7th
    ed. Eq. 9.26), stated for :math:`10^{-1} \\le \\mathrm{Ra}_L \\le 10^{12}`:

    .. math:: \\mathrm{Nu}_L = \\left\\{0.825 + \\frac{0.387\\,\\mathrm{Ra}_L^{1/6}}
              {[1 + (0.492/\\mathrm{Pr})^{9/16}]^{8/27}}\\right\\}^2

    Horizontal plates: which correlation applies follows from the sign of
    :math:`T_s - T_a` as in Incropera 7th ed. §9.6.3. A hot surface facing up
    or a cold surface facing down (buoyancy drives the flow away from the
    plate; Lloyd & Moran 1974 / McAdams, Eqs. 9.30–9.31):

    .. math:: \\mathrm{Nu}_L = 0.54\\,\\mathrm{Ra}_L^{1/4}\\ (10^4 \\le \\mathrm{Ra}_L \\le 10^7),\\quad
              0.15\\,\\mathrm{Ra}_L^{1/3}\\ (10^7 < \\mathrm{Ra}_L \\le 10^{11})

    A hot surface facing down or a cold surface facing up (stable layer;
    Eq. 9.32 of the 7th edition):

    .. math:: \\mathrm{Nu}_L = 0.52\\,\\mathrm{Ra}_L^{1/5}\\ (10^4 \\le \\mathrm{Ra}_L \\le 10^9)

    Outside these Rayleigh ranges a :class:`~workbench._checks.ValidityWarning`
    is issued (not for exactly equal temperatures). Equal temperatures are
    the ΔT → 0 limit of each correlation, without any division by ΔT: h → 0
    for the horizontal forms (Nu ∝ Ra^n), h → 0.825² k/L for the vertical
    full-range form; the heat flux h·ΔT is zero either way.

    References
    ----------
    ``churchill-chu-1975``: Churchill, S. W., Chu, H. H. S., Int. J. Heat
    Mass Transfer 18 (1975) 1323–1329; ``lloyd-moran-1974``: Lloyd, J. R.,
    Moran, W. R., J. Heat Transfer 96 (1974) 443–447; ``incropera7``:
    7th ed., §9.6, Eqs. 9.26, 9.30–9.32 (from memory).

    Examples
    --------
    >>> round(natural_convection_coefficient(313.15, 293.15, 0.5, "vertical"), 2)
    4.12
    >>> natural_convection_coefficient(293.15, 293.15, 0.1, "horizontal-up")
    0.0
    """
    _choice("orientation", orientation, ORIENTATIONS)
    ts = absolute_temperature("t_surface", t_surface)
    ta = absolute_temperature("t_ambient", t_ambient)
    el = positive("length", length, "m")
    ts, ta, el = broadcast(t_surface=ts, t_ambient=ta, length=el)
    props = _film_properties(ts, ta)
    dt = np.abs(ts - ta)
    moving = dt > 0
    with np.errstate(over="ignore", under="ignore"):
        ra = _rayleigh(props, dt, el)
    if np.any(~np.isfinite(ra) | (moving & (ra <= 0))):
        raise ValueError(
            "length: the Rayleigh number over- or underflows for this characteristic length "
            "(m) and t_surface, t_ambient (K); no correlation covers it"
        )
    pr = props.prandtl
    if orientation == "vertical":
        nu = (0.825 + 0.387 * ra ** (1 / 6) / (1 + (0.492 / pr) ** (9 / 16)) ** (8 / 27)) ** 2
        _warn_outside(
            "natural_convection_coefficient: vertical Ra_L",
            ra,
            moving & ((ra < 0.1) | (ra > 1e12)),
            "0.1–1e12 (Churchill–Chu)",
        )
    else:
        faces_up = orientation == "horizontal-up"
        unstable = (ts > ta) if faces_up else (ts < ta)
        nu_unstable = np.where(ra <= 1e7, 0.54 * ra**0.25, 0.15 * np.cbrt(ra))
        nu_stable = 0.52 * ra**0.2
        nu = np.where(unstable, nu_unstable, nu_stable)
        _warn_outside(
            f"natural_convection_coefficient: {orientation} (buoyancy away from the plate) Ra_L",
            ra,
            moving & unstable & ((ra < 1e4) | (ra > 1e11)),
            "1e4–1e11 (Lloyd–Moran/McAdams)",
        )
        _warn_outside(
            f"natural_convection_coefficient: {orientation} (stable side) Ra_L",
            ra,
            moving & ~unstable & ((ra < 1e4) | (ra > 1e9)),
            "1e4–1e9 (Incropera Eq. 9.32)",
        )
    return finite_result(
        "natural_convection_coefficient",
        scalar_or_array(nu * props.conductivity / el),
        "t_surface", "t_ambient", "length",
    )


def _film_properties(ts, ta, names=("t_surface", "t_ambient")):
    """Air properties at the film temperature; a film outside the fits names both temperatures."""
    try:
        return air_properties(0.5 * (ts + ta))
    except ValueError as exc:
        raise ValueError(f"{names[0]}, {names[1]}: film temperature: {exc}") from None


def flat_plate_convection_coefficient(
    velocity: ArrayLike,
    length: ArrayLike,
    t_surface: ArrayLike,
    t_air: ArrayLike,
    re_transition: float = 5e5,
) -> float | np.ndarray:
    """Forced-convection coefficient of a flat plate in parallel flow of air.

    Parameters
    ----------
    velocity : float or array
        Free-stream air speed, >= 0. [m/s]
    length : float or array
        Plate length in the flow direction. [m]
    t_surface, t_air : float or array
        Surface and free-stream temperatures. [K]
    re_transition : float
        Critical Reynolds number of laminar–turbulent transition; 5e5 is the
        usual representative value. [-]

    Returns
    -------
    float or array
        Mean coefficient over the plate. [W/(m²·K)]

    Notes
    -----
    Properties at the film temperature, :math:`\\mathrm{Re}_L = u L/\\nu`.
    Laminar, :math:`\\mathrm{Re}_L \\le \\mathrm{Re}_{x,c}` (Incropera 7th ed.
    Eq. 7.30, Pr ≥ 0.6):

    .. math:: \\overline{\\mathrm{Nu}}_L = 0.664\\,\\mathrm{Re}_L^{1/2}\\mathrm{Pr}^{1/3}

    Mixed laminar–turbulent, :math:`\\mathrm{Re}_{x,c} < \\mathrm{Re}_L \\le 10^8`
    (Eqs. 7.38–7.39, 0.6 ≤ Pr ≤ 60):

    .. math:: \\overline{\\mathrm{Nu}}_L = (0.037\\,\\mathrm{Re}_L^{4/5} - A)\\mathrm{Pr}^{1/3},\\quad
              A = 0.037\\,\\mathrm{Re}_{x,c}^{4/5} - 0.664\\,\\mathrm{Re}_{x,c}^{1/2}

    A :class:`~workbench._checks.ValidityWarning` is issued for Re_L > 1e8.
    Zero velocity gives h = 0 (no forced convection; combine with natural
    convection, see :func:`combined_film_resistance`).

    References
    ----------
    ``incropera7``: 7th ed., §7.2, Eqs. 7.30, 7.38, 7.39 (from memory).

    Examples
    --------
    >>> round(flat_plate_convection_coefficient(2.0, 0.5, 293.15, 293.15), 2)
    7.85
    """
    u = nonnegative("velocity", velocity, "m/s")
    el = positive("length", length, "m")
    ts = absolute_temperature("t_surface", t_surface)
    ta = absolute_temperature("t_air", t_air)
    rec = float(positive("re_transition", scalar("re_transition", re_transition, "-"), "-"))
    u, el, ts, ta = broadcast(velocity=u, length=el, t_surface=ts, t_air=ta)
    props = _film_properties(ts, ta, ("t_surface", "t_air"))
    with np.errstate(over="ignore"):
        re = u * el / props.kinematic_viscosity
    if not np.all(np.isfinite(re)):
        raise ValueError("velocity, length: the Reynolds number overflows (m/s, m)")
    pr13 = np.cbrt(props.prandtl)
    a = 0.037 * rec**0.8 - 0.664 * rec**0.5
    nu = np.where(re <= rec, 0.664 * np.sqrt(re) * pr13, (0.037 * re**0.8 - a) * pr13)
    _warn_outside("flat_plate_convection_coefficient: Re_L", re, re > 1e8, "<= 1e8")
    return finite_result(
        "flat_plate_convection_coefficient",
        scalar_or_array(nu * props.conductivity / el),
        "velocity", "length", "t_surface", "t_air", "re_transition",
    )


def _convective(t_surface, t_air, length, orientation, wind_speed):
    hn = np.asarray(natural_convection_coefficient(t_surface, t_air, length, orientation))
    v = np.asarray(wind_speed, dtype=float)
    if not np.any(v > 0):
        return hn
    hf = np.asarray(flat_plate_convection_coefficient(v, length, t_surface, t_air))
    # (hn³ + hf³)^(1/3) scaled by the larger term, so large coefficients do not overflow
    big = np.maximum(hn, hf)
    safe = np.where(big > 0, big, 1.0)
    return big * np.cbrt((hn / safe) ** 3 + (hf / safe) ** 3)


def combined_film_resistance(
    t_surface: ArrayLike,
    t_air: ArrayLike,
    length: ArrayLike,
    orientation: str,
    emissivity: ArrayLike = 0.9,
    wind_speed: ArrayLike = 0.0,
) -> float | np.ndarray:
    """Resistance of a surface film: convection and radiation in parallel.

    Parameters
    ----------
    t_surface : float or array
        Surface temperature. [K]
    t_air : float or array
        Air temperature, also taken as the temperature of the surroundings
        the surface radiates to. [K]
    length : float or array
        Characteristic length (height for vertical, A/P for horizontal; the
        flow length for wind). [m]
    orientation : str
        ``"vertical"``, ``"horizontal-up"`` or ``"horizontal-down"``.
    emissivity : float or array
        Surface emissivity, 0–1. [-]
    wind_speed : float or array
        Air speed along the surface, >= 0; 0 = still air. [m/s]

    Returns
    -------
    float or array
        Film resistance :math:`1/(h_c + h_r)`; ``inf`` where both are zero
        (ε = 0 and a horizontal surface at the air temperature). [m²·K/W]

    Notes
    -----
    .. math:: R_s = \\frac{1}{h_c + h_r}, \\quad
              h_c = \\left(h_{nat}^3 + h_{forced}^3\\right)^{1/3}

    :math:`h_{nat}` from :func:`natural_convection_coefficient`,
    :math:`h_{forced}` from :func:`flat_plate_convection_coefficient` (only
    where ``wind_speed > 0``), combined with the exponent 3 commonly used for
    assisting and transverse mixed convection (Incropera 7th ed. Eq. 9.64;
    common practice for a wall in wind); :math:`h_r` from
    :func:`radiation_coefficient` with the surroundings at the air
    temperature.

    References
    ----------
    ``incropera7``: 7th ed., Eqs. 1.9, 9.26, 9.30–9.32, 9.64 (from memory).

    Examples
    --------
    >>> round(combined_film_resistance(303.15, 293.15, 0.5, "vertical"), 3)
    0.114
    """
    _choice("orientation", orientation, ORIENTATIONS)
    ts = absolute_temperature("t_surface", t_surface)
    ta = absolute_temperature("t_air", t_air)
    el = positive("length", length, "m")
    eps = in_range("emissivity", emissivity, 0.0, 1.0, "-")
    v = nonnegative("wind_speed", wind_speed, "m/s")
    ts, ta, el, eps, v = broadcast(
        t_surface=ts, t_air=ta, length=el, emissivity=eps, wind_speed=v
    )
    try:
        hc = _convective(ts, ta, el, orientation, v)
    except ValueError as exc:  # the correlations name t_ambient for the air temperature
        raise ValueError(str(exc).replace("t_ambient", "t_air")) from None
    hr = np.asarray(radiation_coefficient(eps, ts, ta))
    h = hc + hr
    with np.errstate(divide="ignore"):
        return scalar_or_array(np.where(h > 0, 1.0 / np.where(h > 0, h, 1.0), np.inf))


@dataclass(frozen=True)
class SurfaceFilm:
    """A surface film usable as ``r_si`` / ``r_se`` in :func:`~workbench.conduction.solve_wall`.

    Calling ``film(t_surface, t_air)`` returns the film resistance [m²·K/W]
    from :func:`combined_film_resistance` at the current temperatures.

    Parameters
    ----------
    length : float
        Characteristic length (height for vertical, A/P for horizontal). [m]
    orientation : str
        ``"vertical"``, ``"horizontal-up"`` or ``"horizontal-down"``: the way
        this surface faces (the inside face of a ceiling faces down).
    emissivity : float
        Surface emissivity, 0–1. [-]
    wind_speed : float
        Air speed along the surface, >= 0. [m/s]

    A horizontal film needs ``emissivity > 0`` or ``wind_speed > 0``:
    natural convection from a horizontal plate vanishes as ΔT → 0
    (Nu ∝ Ra^n), and ``solve_wall`` starts from surfaces at the air
    temperatures.
    """

    length: float
    orientation: str
    emissivity: float = 0.9
    wind_speed: float = 0.0

    def __post_init__(self):
        positive("length", scalar("length", self.length, "m"), "m")
        _choice("orientation", self.orientation, ORIENTATIONS)
        in_range("emissivity", scalar("emissivity", self.emissivity, "-"), 0.0, 1.0, "-")
        nonnegative("wind_speed", scalar("wind_speed", self.wind_speed, "m/s"), "m/s")
        if self.orientation != "vertical" and self.emissivity == 0 and self.wind_speed == 0:
            raise ValueError(
                "emissivity: must be > 0 (or wind_speed > 0 m/s) for a horizontal film; with "
                "neither, the horizontal correlations give no exchange at all where the surface "
                "reaches the air temperature (an infinite resistance)"
            )

    def __call__(self, t_surface, t_air):
        """Film resistance at the given surface and air temperatures. [m²·K/W]"""
        return combined_film_resistance(
            t_surface, t_air, self.length, self.orientation, self.emissivity, self.wind_speed
        )


def surface_film(
    length: float, orientation: str, emissivity: float = 0.9, wind_speed: float = 0.0
) -> SurfaceFilm:
    """Make a temperature-dependent film ``film(t_surface, t_air) -> R`` for solve_wall.

    Parameters
    ----------
    length : float
        Characteristic length (height for vertical, A/P for horizontal). [m]
    orientation : str
        ``"vertical"``, ``"horizontal-up"`` or ``"horizontal-down"``.
    emissivity : float
        Surface emissivity, 0–1. [-]
    wind_speed : float
        Air speed along the surface, >= 0. [m/s]

    Returns
    -------
    SurfaceFilm
        Callable ``(t_surface [K], t_air [K]) -> resistance [m²·K/W]``.

    Notes
    -----
    .. math:: R_s(T_s, T_a) = 1 / (h_c(T_s, T_a) + h_r(T_s, T_a))

    See :func:`combined_film_resistance`.

    References
    ----------
    ``incropera7``: 7th ed., §1.2.3 and §9.6 (from memory).

    Examples
    --------
    >>> film = surface_film(0.3, "vertical", emissivity=0.9)
    >>> round(film(300.0, 290.0), 3)
    0.113
    """
    return SurfaceFilm(length, orientation, emissivity, wind_speed)
