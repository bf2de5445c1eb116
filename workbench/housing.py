"""Sealed device housings: dissipated power to surface and inside temperatures.

A sealed enclosure of given outer dimensions loses the power dissipated inside
it through the faces that see the room: natural convection on each face
(vertical sides, a top facing up, a bottom facing down) plus radiation to
surroundings at the air temperature. Which faces exchange heat depends on the
mounting: free-standing (all six), on a table (bottom adiabatic) or on a wall
(back adiabatic). Inside, the heat reaches the wall through the inside air
(natural convection on the inner faces) and crosses the wall by conduction.

For a thin wall the through-wall conductivity barely matters: the surface
films and the emissivity of the finish decide the mean surface temperature.
The conductivity matters for a *local* heat source pressed against the wall:
:func:`hot_spot` applies the spreading-resistance estimate of
:mod:`workbench.spreading` to show why a plastic wall has a hot spot where an
aluminium wall has none.

Pure numeric core: SI floats and numpy arrays that broadcast over candidates;
temperatures absolute in K.

Caution: first-order estimates (correlations for isolated flat plates, a wall
taken as isothermal over its outer surface, all heat through the inside air).
Touch safety and component limits are decided by the applicable product
standard and by testing the product.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from workbench._checks import (
    ValidityWarning,
    absolute_temperature,
    broadcast,
    finite,
    finite_result,
    in_range,
    integer,
    nonnegative,
    positive,
    scalar,
    scalar_or_array,
)
from workbench.air_properties import AIR_TEMPERATURE_LIMITS
from workbench.spreading import (
    equivalent_radius,
    spreading_length,
    spreading_resistance,
    wall_biot_number,
)
from workbench.surfaces import (
    STEFAN_BOLTZMANN,
    natural_convection_coefficient,
    radiation_coefficient,
)

__all__ = [
    "MOUNTINGS",
    "FACES",
    "HOUSING_ASSUMPTIONS",
    "EnclosureFaces",
    "enclosure_faces",
    "HousingSolution",
    "solve_housing",
    "HotSpot",
    "hot_spot",
    "WARM_UP_ASSUMPTIONS",
    "WarmUp",
    "housing_warm_up",
    "housing_heat_capacity",
]

_SIGMA = STEFAN_BOLTZMANN  # CODATA 2018 [W/(m²·K⁴)], see workbench.surfaces

#: The six faces of a box enclosure.
FACES: tuple[str, ...] = ("top", "bottom", "front", "back", "left", "right")

#: Mountings and the faces that exchange heat with the room in each.
MOUNTINGS: dict[str, tuple[str, ...]] = {
    "free-standing": FACES,
    "on-table": ("top", "front", "back", "left", "right"),
    "wall-mounted": ("top", "bottom", "front", "left", "right"),
}

_OUTSIDE_ORIENTATION = {
    "top": "horizontal-up",
    "bottom": "horizontal-down",
    "front": "vertical",
    "back": "vertical",
    "left": "vertical",
    "right": "vertical",
}
# The inner face of the lid faces down, the inner face of the floor faces up.
_INSIDE_ORIENTATION = {
    "top": "horizontal-down",
    "bottom": "horizontal-up",
    "front": "vertical",
    "back": "vertical",
    "left": "vertical",
    "right": "vertical",
}

#: Assumptions every housing result rests on (shown in reports and notebooks).
HOUSING_ASSUMPTIONS: tuple[str, ...] = (
    "Steady state; the outer surface is taken as isothermal (one mean surface temperature).",
    "Natural convection per face from correlations for isolated flat plates in still air "
    "(Churchill–Chu vertical; Lloyd–Moran/McAdams hot side up; Incropera Eq. 9.32 hot side down).",
    "Radiation to large surroundings at the air temperature (grey surface, exact linearisation).",
    "Adiabatic faces (table, wall) exchange nothing; heat reaches the room only through the "
    "exchanging faces.",
    "All dissipation passes through the inside air to the inner faces of the exchanging walls "
    "(free-plate correlations applied inside; an upper estimate of the inside air temperature).",
    "Wall conduction through the geometric-mean area of each face; edges and corners ignored.",
    "Hot spot: series solution of the spreading resistance (isoflux disc source) on a disc of the "
    "exchanging area, component bonded to the wall, uniform film on the outer face; the value is the wall temperature under "
    "the component, an upper bound for the outer face there.",
    "First-order estimates: touch safety and component limits are decided by the product "
    "standard and by testing.",
)


def _choice(name: str, value: str, valid) -> str:
    if not isinstance(value, str) or value not in valid:
        raise ValueError(f"{name}: unknown value {value!r}; valid: {list(valid)}")
    return value


@dataclass(frozen=True)
class EnclosureFaces:
    """Faces of a box enclosure that exchange heat, outside and inside.

    Arrays have the faces on the first axis and the broadcast candidate shape
    after it.

    Attributes
    ----------
    names : tuple of str
        Exchanging faces (subset of :data:`FACES`).
    orientation_outside, orientation_inside : tuple of str
        Orientation of each face for :func:`~workbench.surfaces.natural_convection_coefficient`.
    area_outside, area_inside : ndarray
        Face areas. [m²]
    length_outside, length_inside : ndarray
        Characteristic lengths: height for vertical faces, area/perimeter
        for horizontal ones. [m]
    """

    names: tuple[str, ...]
    orientation_outside: tuple[str, ...]
    orientation_inside: tuple[str, ...]
    area_outside: np.ndarray
    area_inside: np.ndarray
    length_outside: np.ndarray
    length_inside: np.ndarray


def _face_geometry(face: str, lx, ly, lz):
    """Area and characteristic length of one face of a box lx × ly × lz (lz vertical)."""
    if face in ("top", "bottom"):
        area = lx * ly
        return area, area / (2.0 * (lx + ly))
    if face in ("front", "back"):
        return lx * lz, lz
    return ly * lz, lz


def enclosure_faces(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    wall_thickness: ArrayLike,
    mounting: str = "free-standing",
) -> EnclosureFaces:
    """Exchanging faces of a box enclosure with their areas and characteristic lengths.

    Parameters
    ----------
    length : float or array
        Outer length (front face width). [m]
    width : float or array
        Outer depth (front to back). [m]
    height : float or array
        Outer height (vertical). [m]
    wall_thickness : float or array
        Total wall thickness; inner dimensions are outer minus twice this. [m]
    mounting : str
        ``"free-standing"`` (all six faces exchange), ``"on-table"`` (bottom
        adiabatic) or ``"wall-mounted"`` (back adiabatic).

    Returns
    -------
    EnclosureFaces

    Notes
    -----
    Vertical faces use their height as characteristic length; horizontal
    faces use :math:`L = A/P` (Incropera 7th ed. §9.6.3, from memory).

    References
    ----------
    ``incropera7``: 7th ed., §9.6 (characteristic lengths, from memory).

    Examples
    --------
    >>> f = enclosure_faces(0.2, 0.1, 0.05, 0.002, "on-table")
    >>> f.names
    ('top', 'front', 'back', 'left', 'right')
    >>> round(float(f.area_outside.sum()), 4)
    0.05
    """
    mounting = _choice("mounting", mounting, MOUNTINGS)
    lx = positive("length", length, "m")
    ly = positive("width", width, "m")
    lz = positive("height", height, "m")
    t = positive("wall_thickness", wall_thickness, "m")
    lx, ly, lz, t = broadcast(length=lx, width=ly, height=lz, wall_thickness=t)
    inner = [(lx - 2 * t, "length"), (ly - 2 * t, "width"), (lz - 2 * t, "height")]
    for dim, name in inner:
        if np.any(dim <= 0):
            raise ValueError(
                f"wall_thickness: twice the wall thickness must be less than the outer {name} (m)"
            )
    ix, iy, iz = (d for d, _ in inner)
    names = MOUNTINGS[mounting]
    ao, lo_, ai, li = [], [], [], []
    for face in names:
        a, el = _face_geometry(face, lx, ly, lz)
        ao.append(a)
        lo_.append(el)
        a, el = _face_geometry(face, ix, iy, iz)
        ai.append(a)
        li.append(el)
    return EnclosureFaces(
        names=names,
        orientation_outside=tuple(_OUTSIDE_ORIENTATION[f] for f in names),
        orientation_inside=tuple(_INSIDE_ORIENTATION[f] for f in names),
        area_outside=np.array(ao),
        area_inside=np.array(ai),
        length_outside=np.array(lo_),
        length_inside=np.array(li),
    )


def _face_h(t_surface, t_air, lengths, orientations):
    """Convective coefficients of every face, faces on axis 0. [W/(m²·K)]

    Faces of one orientation go through the correlation together (one call per
    orientation, not per face).
    """
    lengths = np.asarray(lengths, float)
    shape = np.broadcast_shapes(np.shape(t_surface), np.shape(t_air), lengths.shape[1:])
    out = np.empty((len(orientations), *shape))
    for o in dict.fromkeys(orientations):
        idx = [i for i, oi in enumerate(orientations) if oi == o]
        out[idx] = np.asarray(natural_convection_coefficient(t_surface, t_air, lengths[idx], o))
    return out


def _bisect(residual, low, step, tolerance, max_iterations, what, max_rise=5000.0):
    """Vectorised bracketed root search for an increasing residual with residual(low) <= 0.

    The bracket is widened by doubling up to ``max_rise`` [K] above ``low``; a
    residual that is not finite raises ``RuntimeError``, no sign change within
    that range ``ValueError`` (no steady state in the model's range: an input
    matter), both naming the candidates (flat indices).
    """
    lo = np.array(low, dtype=float)
    hi = lo + np.minimum(step, max_rise)

    def checked(x):
        r = np.asarray(residual(x), dtype=float)
        bad = ~np.isfinite(r)
        if np.any(bad):
            idx = np.flatnonzero(bad.ravel()).tolist()
            raise RuntimeError(f"{what}: heat balance not finite for candidates {idx}")
        return r

    grow = checked(hi) < 0
    while np.any(grow):
        room = (hi - lo) < max_rise
        if not np.any(grow & room):
            break
        new_hi = np.where(grow & room, lo + np.minimum(2.0 * (hi - lo), max_rise), hi)
        if np.array_equal(new_hi, hi):  # rounding: lo + max_rise - lo may stay below max_rise
            break
        hi = new_hi
        grow = checked(hi) < 0
    if np.any(grow):
        bad = np.flatnonzero(grow.ravel()).tolist()
        raise ValueError(
            f"{what}: no solution within {max_rise:g} K of the start for candidates {bad}"
        )
    # Illinois regula falsi: the bracket stays valid every step (so the answer is
    # as safe as bisection's), but the end kept twice in a row has its residual
    # halved, which makes convergence superlinear; a step closer than a quarter
    # tolerance to an end steps over it so the bracket closes.
    rlo = np.minimum(checked(lo), 0.0)
    rhi = np.maximum(checked(hi), 0.0)
    kept = np.zeros(np.shape(lo), dtype=int)  # -1: lo kept last step, +1: hi kept
    it = 0
    while it < max_iterations and np.any(hi - lo > tolerance):
        active = hi - lo > tolerance
        denom = rhi - rlo
        with np.errstate(divide="ignore", invalid="ignore"):
            x = np.where(denom > 0, lo - rlo * (hi - lo) / denom, 0.5 * (lo + hi))
        eps = 0.25 * tolerance
        x = np.clip(x, lo + eps, hi - eps)
        x = np.where(np.isfinite(x), x, 0.5 * (lo + hi))
        rx = checked(x)
        neg = rx < 0
        move_lo = active & neg
        move_hi = active & ~neg
        lo, rlo = np.where(move_lo, x, lo), np.where(move_lo, rx, rlo)
        hi, rhi = np.where(move_hi, x, hi), np.where(move_hi, rx, rhi)
        rhi = np.where(move_lo & (kept == 1), 0.5 * rhi, rhi)  # hi kept again: halve its residual
        rlo = np.where(move_hi & (kept == -1), 0.5 * rlo, rlo)
        kept = np.where(move_lo, 1, np.where(move_hi, -1, kept))
        it += 1
    width = hi - lo
    if np.any(width > tolerance):
        bad = np.flatnonzero((width > tolerance).ravel()).tolist()
        raise RuntimeError(
            f"{what}: not converged to {tolerance:g} K in {max_iterations} iterations for "
            f"candidates {bad}"
        )
    return 0.5 * (lo + hi), it


@dataclass(frozen=True)
class HousingSolution:
    """Steady temperatures of a sealed enclosure (arrays over the candidate shape).

    Attributes
    ----------
    t_surface : float or array
        Mean outer surface temperature. [K]
    t_wall_inside : float or array
        Mean inner surface temperature of the exchanging walls. [K]
    t_air_inside : float or array
        Inside air temperature. [K]
    t_ambient : float or array
        Room air (and surroundings) temperature. [K]
    power : float or array
        Dissipated power. [W]
    h_convection : float or array
        Area-weighted mean outside convective coefficient. [W/(m²·K)]
    h_radiation : float or array
        Outside radiation coefficient. [W/(m²·K)]
    h_inside : float or array
        Area-weighted mean inside convective coefficient. [W/(m²·K)]
    convection_power, radiation_power : float or array
        Heat leaving by outside convection and by radiation. [W]
    exchange_area : float or array
        Outer area of the exchanging faces. [m²]
    area_inside : float or array
        Inner area of the exchanging faces. [m²]
    wall_thickness : float or array
        Wall thickness. [m]
    k : float or array
        Wall conductivity. [W/(m·K)]
    emissivity : float or array
        Outer surface emissivity. [-]
    face_names : tuple of str
        The exchanging faces.
    face_convection_coefficients : ndarray
        Outside convective coefficient per face (faces on axis 0). [W/(m²·K)]
    face_power : ndarray
        Heat leaving each face (convection + radiation), faces on axis 0. [W]
    mounting : str
    iterations : int
        Bisection steps used for the outer balance.
    """

    t_surface: float | np.ndarray
    t_wall_inside: float | np.ndarray
    t_air_inside: float | np.ndarray
    t_ambient: float | np.ndarray
    power: float | np.ndarray
    h_convection: float | np.ndarray
    h_radiation: float | np.ndarray
    h_inside: float | np.ndarray
    convection_power: float | np.ndarray
    radiation_power: float | np.ndarray
    exchange_area: float | np.ndarray
    area_inside: float | np.ndarray
    wall_thickness: float | np.ndarray
    k: float | np.ndarray
    emissivity: float | np.ndarray
    face_names: tuple[str, ...]
    face_convection_coefficients: np.ndarray
    face_power: np.ndarray
    mounting: str
    iterations: int

    @property
    def h_outside(self):
        """Combined outside coefficient, convection + radiation. [W/(m²·K)]"""
        return self.h_convection + self.h_radiation

    @property
    def balance_residual(self):
        """Dissipation minus heat leaving (convection + radiation). [W]"""
        return self.power - self.convection_power - self.radiation_power


def solve_housing(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    wall_thickness: ArrayLike,
    k: ArrayLike,
    emissivity: ArrayLike,
    power: ArrayLike,
    t_ambient: ArrayLike,
    mounting: str = "free-standing",
    *,
    extra_resistance: ArrayLike = 0.0,
    h_inside: ArrayLike | None = None,
    tolerance: float = 1e-6,
    max_iterations: int = 200,
) -> HousingSolution:
    """Mean surface and inside temperatures of a sealed enclosure dissipating a power.

    Parameters
    ----------
    length, width, height : float or array
        Outer dimensions; ``height`` is vertical, ``length`` × ``height`` is
        the front face. [m]
    wall_thickness : float or array
        Thickness of the structural wall. [m]
    k : float or array
        Conductivity of the structural wall. [W/(m·K)]
    emissivity : float or array
        Emissivity of the outer finish, 0–1. [-]
    power : float or array
        Power dissipated inside, >= 0. [W]
    t_ambient : float or array
        Room air temperature, also that of the surroundings. [K]
    mounting : str
        ``"free-standing"``, ``"on-table"`` (bottom adiabatic) or
        ``"wall-mounted"`` (back adiabatic).
    extra_resistance : float or array
        Further layers in series with the wall (liner, coating, gap pads),
        per unit area. [m²·K/W]
    h_inside : float or array, optional
        Inside convective coefficient; default from the natural-convection
        correlations on the inner faces. [W/(m²·K)]
    tolerance : float
        Temperature tolerance of the bisections. [K]
    max_iterations : int
        Bisection steps allowed per balance.

    Returns
    -------
    HousingSolution

    Raises
    ------
    RuntimeError
        If a balance does not converge; names the candidates (flat indices).

    Notes
    -----
    Outer balance, solved for the mean surface temperature :math:`T_s` by
    vectorised bracketed bisection:

    .. math:: P = \\sum_f A_f \\left[h_{c,f}(T_s, T_a) + h_r(T_s, T_a)\\right](T_s - T_a),
              \\quad h_r = \\varepsilon\\sigma(T_s^2+T_a^2)(T_s+T_a)

    Wall, with :math:`A_{m,f} = \\sqrt{A_{out,f} A_{in,f}}`:

    .. math:: T_{wi} = T_s + P \\Big/ \\sum_f \\frac{A_{m,f}}{t/k + R_{extra}}

    Inside air, solved for :math:`T_i`:

    .. math:: P = \\sum_f A_{in,f}\\, h_{i,f}(T_{wi}, T_i)\\,(T_i - T_{wi})

    References
    ----------
    ``churchill-chu-1975``, ``lloyd-moran-1974``, ``incropera7``: 7th ed.,
    Eqs. 1.9, 9.26, 9.30–9.32 (through :mod:`workbench.surfaces`);
    ``fourier`` for the wall.

    Examples
    --------
    >>> s = solve_housing(0.2, 0.1, 0.05, 0.002, 167.0, 0.82, 5.0, 298.15, "on-table")
    >>> round(s.t_surface - 273.15, 1)
    34.6
    >>> abs(s.balance_residual) < 1e-4
    True
    """
    mounting = _choice("mounting", mounting, MOUNTINGS)
    t = positive("wall_thickness", wall_thickness, "m")
    k_ = positive("k", k, "W/(m·K)")
    eps = in_range("emissivity", emissivity, 0.0, 1.0, "-")
    p = nonnegative("power", power, "W")
    ta = absolute_temperature("t_ambient", t_ambient)
    rx = nonnegative("extra_resistance", extra_resistance, "m²·K/W")
    tol = float(positive("tolerance", scalar("tolerance", tolerance, "K"), "K"))
    if tol < _MIN_TOLERANCE:
        raise ValueError(
            f"tolerance: must be >= {_MIN_TOLERANCE:g} K (got {tol:g}); finer than that the "
            "bisection cannot converge in floating point"
        )
    max_iterations = integer("max_iterations", max_iterations, minimum=1)
    lx = positive("length", length, "m")
    ly = positive("width", width, "m")
    lz = positive("height", height, "m")
    lx, ly, lz, t, k_, eps, p, ta, rx = broadcast(
        length=lx,
        width=ly,
        height=lz,
        wall_thickness=t,
        k=k_,
        emissivity=eps,
        power=p,
        t_ambient=ta,
        extra_resistance=rx,
    )
    if p.size == 0:
        raise ValueError(
            "length, width, height, wall_thickness, k, emissivity, power, t_ambient, "
            f"extra_resistance: no candidates given (broadcast shape {p.shape})"
        )
    hi_user = None
    if h_inside is not None:
        hi_user = positive("h_inside", h_inside, "W/(m²·K)")
        try:
            hi_user = np.broadcast_to(hi_user, p.shape)
        except ValueError:
            raise ValueError(
                f"h_inside: shape {hi_user.shape} does not broadcast to the candidates' "
                f"shape {p.shape}"
            ) from None
    faces = enclosure_faces(lx, ly, lz, t, mounting)
    try:
        return _solve_housing(
            faces, lx, ly, lz, t, k_, eps, p, ta, rx, hi_user, tol, max_iterations, mounting
        )
    except ValueError as exc:
        raise ValueError(
            "length, width, height, wall_thickness, k, emissivity, power, t_ambient, "
            f"extra_resistance: no steady state within the range of the air correlations ({exc})"
        ) from None


#: Finest temperature tolerance of the housing balances. [K]
_MIN_TOLERANCE = 1e-9


def _solve_housing(
    faces, lx, ly, lz, t, k_, eps, p, ta, rx, hi_user, tol, max_iterations, mounting
):
    """The balances of :func:`solve_housing` on checked, broadcast inputs."""
    # the air fits hold for film temperatures up to AIR_TEMPERATURE_LIMITS[1]
    max_rise = np.maximum(2.0 * AIR_TEMPERATURE_LIMITS[1] - 2.0 * ta - 1.0, 1.0)
    a_out = faces.area_outside
    area = a_out.sum(axis=0)

    def outer(ts):
        hc = _face_h(ts, ta, faces.length_outside, faces.orientation_outside)
        hr = eps * _SIGMA * (ts * ts + ta * ta) * (ts + ta)
        return ((hc + hr) * a_out).sum(axis=0) * (ts - ta) - p

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        step = np.maximum(p / (5.0 * area), 1.0)
        ts, iterations = _bisect(
            outer, ta, step, tol, max_iterations, "surface balance", float(np.min(max_rise))
        )

    # final evaluation with validity warnings enabled
    hc = _face_h(ts, ta, faces.length_outside, faces.orientation_outside)
    hr = np.asarray(radiation_coefficient(eps, ts, ta))
    dts = ts - ta
    face_conv = hc * a_out * dts
    face_rad = hr * a_out * dts
    conv = face_conv.sum(axis=0)
    rad = face_rad.sum(axis=0)

    a_mean = (np.sqrt(a_out) * np.sqrt(faces.area_inside)).sum(axis=0)
    r_wall = t / k_ + rx
    twi = ts + p * r_wall / a_mean
    if np.any(twi > 2.0 * AIR_TEMPERATURE_LIMITS[1] - ta) or not np.all(np.isfinite(twi)):
        raise ValueError(
            "the inner wall temperature leaves the range of the air correlations "
            "(k, wall_thickness, extra_resistance, power)"
        )

    a_in = faces.area_inside
    area_in = a_in.sum(axis=0)
    if hi_user is not None:
        hin = np.asarray(hi_user, float)
        tai = twi + p / (hin * area_in)
    else:

        def inner(ti):
            h = _face_h(twi, ti, faces.length_inside, faces.orientation_inside)
            return (h * a_in).sum(axis=0) * (ti - twi) - p

        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            step_i = np.maximum(p / (2.0 * area_in), 1.0)
            rise_i = float(
                np.min(np.maximum(2.0 * AIR_TEMPERATURE_LIMITS[1] - 2.0 * twi - 1.0, 1.0))
            )
            tai, _ = _bisect(inner, twi, step_i, tol, max_iterations, "inside-air balance", rise_i)
        h_faces = _face_h(twi, tai, faces.length_inside, faces.orientation_inside)
        hin = (h_faces * a_in).sum(axis=0) / area_in

    finite_result("solve_housing", (ts, twi, tai, hin, conv, rad, area, area_in), "power")
    return HousingSolution(
        t_surface=scalar_or_array(ts),
        t_wall_inside=scalar_or_array(twi),
        t_air_inside=scalar_or_array(tai),
        t_ambient=scalar_or_array(ta),
        power=scalar_or_array(p),
        h_convection=scalar_or_array((hc * a_out).sum(axis=0) / area),
        h_radiation=scalar_or_array(hr),
        h_inside=scalar_or_array(hin),
        convection_power=scalar_or_array(conv),
        radiation_power=scalar_or_array(rad),
        exchange_area=scalar_or_array(area),
        area_inside=scalar_or_array(area_in),
        wall_thickness=scalar_or_array(t),
        k=scalar_or_array(k_),
        emissivity=scalar_or_array(eps),
        face_names=faces.names,
        face_convection_coefficients=hc,
        face_power=face_conv + face_rad,
        mounting=mounting,
        iterations=int(iterations),
    )


def _emissivity_sensitivity(solution: HousingSolution, length, width, height) -> np.ndarray:
    """∂T_s/∂ε of a solved enclosure at its own emissivity, from the balance itself. [K]

    Differentiating :math:`G(T_s, \\varepsilon) = \\sum_f A_f h_{c,f}(T_s)(T_s - T_a)
    + \\varepsilon\\sigma A (T_s^4 - T_a^4) = P` at constant P (implicit function theorem):

    .. math:: \\frac{\\partial T_s}{\\partial\\varepsilon} =
              -\\frac{\\sigma A (T_s^4 - T_a^4)}
                     {\\partial_T\\big[\\sum_f A_f h_{c,f}(T)(T - T_a)\\big]
                      + 4\\varepsilon\\sigma A T_s^3}

    the convective slope by a central difference of ±0.01 K on the same
    correlations (no new balance is solved).
    """
    faces = enclosure_faces(length, width, height, solution.wall_thickness, solution.mounting)
    ts = np.asarray(solution.t_surface, float)
    ta = np.asarray(solution.t_ambient, float)
    eps = np.asarray(solution.emissivity, float)
    a_out = faces.area_outside
    area = a_out.sum(axis=0)

    def convected(t):
        hc = _face_h(t, ta, faces.length_outside, faces.orientation_outside)
        return (hc * a_out).sum(axis=0) * (t - ta)

    d = 0.01
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        slope_c = (convected(ts + d) - convected(np.maximum(ts - d, ta + 1e-9))) / (
            ts + d - np.maximum(ts - d, ta + 1e-9))
    num = _SIGMA * area * (ts**4 - ta**4)
    den = slope_c + 4.0 * eps * _SIGMA * area * ts**3
    return -num / den


@dataclass(frozen=True)
class HotSpot:
    """Local wall temperature under a component pressed against the wall.

    Attributes
    ----------
    t_hot_spot : float or array
        Wall temperature under the centre of the component (inner face); the
        outer face there is at most this hot. [K]
    rise : float or array
        Rise above the mean inner wall temperature. [K]
    resistance : float or array
        Constriction resistance to the source maximum, R_c,max. [K/W]
    source_radius : float or array
        Equivalent radius of the footprint. [m]
    plate_radius : float or array
        Radius of the disc with the exchanging area. [m]
    spreading_length : float or array
        :math:`\\sqrt{k t / h}`. [m]
    biot_number : float or array
        Through-thickness :math:`h t / k`. [-]
    """

    t_hot_spot: float | np.ndarray
    rise: float | np.ndarray
    resistance: float | np.ndarray
    source_radius: float | np.ndarray
    plate_radius: float | np.ndarray
    spreading_length: float | np.ndarray
    biot_number: float | np.ndarray

    @property
    def spread_ratio(self):
        """Spreading length over source radius: well above 1 = the wall spreads the heat. [-]"""
        return self.spreading_length / self.source_radius


def hot_spot(solution: HousingSolution, source_area: ArrayLike, source_power: ArrayLike) -> HotSpot:
    """Hot spot on a housing wall from a component bonded to its inner face.

    Parameters
    ----------
    solution : HousingSolution
        The enclosure's mean temperatures (:func:`solve_housing`).
    source_area : float or array
        Footprint of the component on the wall (length × width). [m²]
    source_power : float or array
        Part of the dissipation that enters the wall through that footprint,
        0 <= source_power <= the enclosure's power. [W]

    Returns
    -------
    HotSpot

    Notes
    -----
    The wall is a disc of the exchanging area, :math:`b = \\sqrt{A/\\pi}`,
    thickness t, conductivity k, cooled on its outer face by the combined
    coefficient :math:`h = h_c + h_r` of the solution; the footprint is the
    circle of equal area, :math:`a = \\sqrt{A_s/\\pi}`. Its one-dimensional
    part is already in the mean wall temperature, so

    .. math:: T_{hot} = T_{wi} + Q_s R_{c,max}(a, b, t, k, h)

    with :math:`R_{c,max}` of the series solution for an isoflux disc source
    (:func:`~workbench.spreading.spreading_resistance`).
    The spreading length :math:`\\sqrt{kt/h}` and Biot number :math:`ht/k`
    explain the result: a wall whose spreading length is well below the
    footprint radius cannot spread the heat.

    References
    ----------
    ``yovanovich-culham-teertstra-1998`` (the series, through
    :mod:`workbench.spreading`).

    Examples
    --------
    >>> s = solve_housing(0.2, 0.1, 0.05, 0.002, [167.0, 0.2], 0.85, 5.0, 298.15, "on-table")
    >>> hs = hot_spot(s, 0.02 * 0.02, 2.0)
    >>> [round(float(x), 1) for x in hs.rise]
    [2.1, 351.9]
    """
    sa = positive("source_area", source_area, "m²")
    q = nonnegative("source_power", source_power, "W")
    p = np.asarray(solution.power, float)
    area = np.asarray(solution.exchange_area, float)
    sa, q, p, area = broadcast(source_area=sa, source_power=q, power=p, exchange_area=area)
    if np.any(q > p * (1 + 1e-12)):
        raise ValueError("source_power: must not exceed the enclosure's dissipated power (W)")
    if np.any(sa > area):
        raise ValueError("source_area: must not exceed the exchanging area of the enclosure (m²)")
    if np.any(sa < 1e-10 * area):
        raise ValueError(
            "source_area: smaller than 1e-10 of the exchanging area; a footprint that small is "
            "a point, not a component (m²)"
        )
    finite("t_wall_inside", solution.t_wall_inside, "K")
    a = np.asarray(equivalent_radius(sa))
    b = np.sqrt(area / np.pi)
    h = np.asarray(solution.h_outside, float)
    t = np.asarray(solution.wall_thickness, float)
    k_ = np.asarray(solution.k, float)
    r = spreading_resistance(a, b, t, k_, h)
    rise = q * np.asarray(r.maximum)
    return HotSpot(
        t_hot_spot=scalar_or_array(np.asarray(solution.t_wall_inside) + rise),
        rise=scalar_or_array(rise),
        resistance=r.maximum,
        source_radius=scalar_or_array(a),
        plate_radius=scalar_or_array(b),
        spreading_length=spreading_length(k_, t, h),
        biot_number=wall_biot_number(h, t, k_),
    )


# ---------------------------------------------------------------------------
# Warm-up over a use session (lumped transient)
# ---------------------------------------------------------------------------

#: Assumptions of :func:`housing_warm_up` (shown beside its results).
WARM_UP_ASSUMPTIONS: tuple[str, ...] = (
    "Warm-up: housing and contents as one heat capacity at the mean surface temperature "
    "(lumped; the wall and contents have no internal temperature differences).",
    "Warm-up: the same outside convection and radiation films as the steady state, evaluated at "
    "the current surface temperature.",
    "Warm-up: the inside air is quasi-steady over the surface, with the whole current dissipation "
    "crossing the inside air and the wall (an upper estimate; the steady relations of "
    "solve_housing).",
    "Warm-up: the time to the touch limit is that of the mean surface; the hot spot over a bonded "
    "component gets there sooner.",
)

#: Largest number of time steps :func:`housing_warm_up` takes.
MAX_WARM_UP_STEPS = 200_000
#: Largest number of (candidate × time point) values :func:`housing_warm_up` stores.
MAX_WARM_UP_VALUES = 5_000_000
#: Largest number of entries of a power profile.
MAX_PROFILE_ENTRIES = 1000
#: Time steps when ``time_step`` is not given.
DEFAULT_WARM_UP_STEPS = 400
#: Nodes of the tabulated outer heat loss per candidate.
_LOSS_NODES = 161
#: Nodes of the tabulated inside-air rise per candidate and power level.
_INSIDE_NODES = 17


def housing_heat_capacity(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    wall_thickness: ArrayLike,
    density: ArrayLike,
    specific_heat: ArrayLike,
    content_capacity: ArrayLike = 0.0,
) -> float | np.ndarray:
    """Heat capacity of a box housing's shell plus its contents.

    Parameters
    ----------
    length, width, height : float or array
        Outer dimensions. [m]
    wall_thickness : float or array
        Wall thickness (all six faces). [m]
    density : float or array
        Wall material density. [kg/m³]
    specific_heat : float or array
        Wall material specific heat capacity. [J/(kg·K)]
    content_capacity : float or array
        Heat capacity of the contents (boards, battery, brackets), given by
        the user, >= 0. [J/K]

    Returns
    -------
    float or array
        Total heat capacity. [J/K]

    Notes
    -----
    .. math:: C = \\rho\\, c_p \\left[L W H - (L-2t)(W-2t)(H-2t)\\right] + C_{contents}

    The shell volume counts all six walls whatever the mounting.

    References
    ----------
    Definition of heat capacity, :math:`C = m c_p` (``incropera7``: 7th ed.,
    §5.2, lumped capacitance, from memory).

    Examples
    --------
    A 200 × 100 × 50 mm aluminium box, 2 mm wall, 2690 kg/m³, 900 J/(kg·K):

    >>> round(housing_heat_capacity(0.2, 0.1, 0.05, 0.002, 2690.0, 900.0), 1)
    325.5
    >>> round(housing_heat_capacity(0.2, 0.1, 0.05, 0.002, 2690.0, 900.0, 100.0), 1)
    425.5
    """
    lx = positive("length", length, "m")
    ly = positive("width", width, "m")
    lz = positive("height", height, "m")
    t = positive("wall_thickness", wall_thickness, "m")
    rho = positive("density", density, "kg/m³")
    cp = positive("specific_heat", specific_heat, "J/(kg·K)")
    cc = nonnegative("content_capacity", content_capacity, "J/K")
    lx, ly, lz, t, rho, cp, cc = broadcast(
        length=lx,
        width=ly,
        height=lz,
        wall_thickness=t,
        density=rho,
        specific_heat=cp,
        content_capacity=cc,
    )
    for dim, name in ((lx, "length"), (ly, "width"), (lz, "height")):
        if np.any(dim - 2.0 * t <= 0):
            raise ValueError(
                f"wall_thickness: twice the wall thickness must be less than the outer {name} (m)"
            )
    shell = lx * ly * lz - (lx - 2 * t) * (ly - 2 * t) * (lz - 2 * t)
    return scalar_or_array(rho * cp * shell + cc)


@dataclass(frozen=True)
class WarmUp:
    """Temperatures of a housing over a use session (:func:`housing_warm_up`).

    Candidates are on the leading axes, time on the last axis.

    Attributes
    ----------
    time : ndarray
        Time points from 0 to the duration, shape (n_t,). [s]
    t_surface : ndarray
        Mean outer surface temperature, shape (*candidates, n_t). [K]
    t_air_inside : ndarray
        Quasi-steady inside air temperature, shape (*candidates, n_t). [K]
    power : ndarray
        Dissipation applying from each time point on, shape (*candidates, n_t). [W]
    t_ambient : float or array
        Room temperature. [K]
    heat_capacity : float or array
        Lumped heat capacity. [J/K]
    steps : int
        Time steps taken.
    """

    time: np.ndarray
    t_surface: np.ndarray
    t_air_inside: np.ndarray
    power: np.ndarray
    t_ambient: float | np.ndarray
    heat_capacity: float | np.ndarray
    steps: int

    def time_to_limit(self, limit: ArrayLike) -> float | np.ndarray:
        """Time at which the mean surface first reaches ``limit``.

        Parameters
        ----------
        limit : float or array
            Surface temperature limit (e.g. a touch limit), broadcasting to
            the candidate shape. [K]

        Returns
        -------
        float or array
            First time with :math:`T_s \\ge T_{limit}`, linearly interpolated
            between time points; 0 if the start is already at or above it;
            ``inf`` if it is not reached within the duration. [s]

        Examples
        --------
        >>> w = housing_warm_up(0.2, 0.1, 0.05, 0.002, 0.2, 0.9, 5.0, 298.15, 300.0, 3600.0,
        ...                     "on-table")
        >>> round(w.time_to_limit(303.15) / 60.0, 1)
        6.8
        >>> w.time_to_limit(400.0)
        inf
        """
        lim = absolute_temperature("limit", limit)
        ts = self.t_surface
        cand = ts.shape[:-1]
        try:
            shape = np.broadcast_shapes(cand, lim.shape)
        except ValueError:
            raise ValueError(
                f"limit: shape {lim.shape} does not broadcast to the candidates' shape {cand}"
            ) from None
        ts = np.broadcast_to(ts, shape + ts.shape[-1:])
        lim = np.broadcast_to(lim, shape)[..., None]
        above = ts >= lim
        reached = above.any(axis=-1)
        j = np.argmax(above, axis=-1)  # first index at or above
        jm = np.maximum(j - 1, 0)
        t = self.time
        y1 = np.take_along_axis(ts, j[..., None], -1)[..., 0]
        y0 = np.take_along_axis(ts, jm[..., None], -1)[..., 0]
        lim = lim[..., 0]
        with np.errstate(divide="ignore", invalid="ignore"):
            frac = np.where(y1 > y0, (lim - y0) / (y1 - y0), 1.0)
        out = np.where(j == 0, 0.0, t[jm] + np.clip(frac, 0.0, 1.0) * (t[j] - t[jm]))
        return scalar_or_array(np.where(reached, out, np.inf))


def _power_steps(power_profile, times):
    """Power of each step [t_i, t_{i+1}) from a step profile (times [s], powers [W])."""
    pt, pp = power_profile
    idx = np.searchsorted(pt, times[:-1], side="right") - 1
    return pp[idx]


def _read_profile(power_profile, duration):
    try:
        pt, pp = power_profile
    except (TypeError, ValueError):
        raise ValueError(
            "power_profile: expected (times [s], powers [W]), two sequences of equal length"
        ) from None
    pt = finite("power_profile times", pt, "s")
    pp = nonnegative("power_profile powers", pp, "W")
    if pt.ndim != 1 or pp.ndim != 1 or pt.size != pp.size or pt.size == 0:
        raise ValueError(
            "power_profile: times [s] and powers [W] must be one-dimensional, non-empty and of "
            f"equal length (got shapes {pt.shape} and {pp.shape})"
        )
    if pt.size > MAX_PROFILE_ENTRIES:
        raise ValueError(
            f"power_profile: {pt.size} entries; at most {MAX_PROFILE_ENTRIES} (merge short steps "
            "into their mean power)"
        )
    if pt[0] != 0.0:
        raise ValueError(f"power_profile times: must start at 0 s (got {pt[0]:g} s)")
    if np.any(np.diff(pt) <= 0):
        raise ValueError("power_profile times: must increase strictly (s)")
    keep = pt < duration
    return pt[keep], pp[keep]


@dataclass(frozen=True)
class _WarmUpInputs:
    """Checked, broadcast inputs of :func:`housing_warm_up` (its names and units).

    ``p_const`` is the constant power [W] (zeros with a profile); ``prof_t``
    [s] and ``prof_p`` [W] the profile or ``None``; ``cand`` the candidates'
    shape and ``n_cand`` their number.
    """

    mounting: str
    dur: float
    lx: np.ndarray
    ly: np.ndarray
    lz: np.ndarray
    t: np.ndarray
    k: np.ndarray
    eps: np.ndarray
    ta: np.ndarray
    cap: np.ndarray
    rx: np.ndarray
    p_const: np.ndarray
    t0: np.ndarray
    prof_t: np.ndarray | None
    prof_p: np.ndarray | None
    hi_user: np.ndarray | None
    cand: tuple[int, ...]
    n_cand: int


def _warm_up_power(power, power_profile, dur: float):
    """``(p_const, prof_t, prof_p)``: the constant power [W] or the profile [s], [W]."""
    if power_profile is not None:
        if power is not None:
            raise ValueError(
                "power: give None when power_profile is given (the profile replaces the "
                "constant power) [W]"
            )
        prof_t, prof_p = _read_profile(power_profile, dur)
        return np.zeros(()), prof_t, prof_p
    if power is None:
        raise ValueError("power: expected a number in W (or give power_profile)")
    return nonnegative("power", power, "W"), None, None


def _warm_up_inputs(
    length, width, height, wall_thickness, k, emissivity, power, t_ambient, heat_capacity,
    duration, mounting, power_profile, t_start, h_inside, extra_resistance,
) -> _WarmUpInputs:
    """Check and broadcast the inputs of :func:`housing_warm_up` (errors name its arguments)."""
    mounting = _choice("mounting", mounting, MOUNTINGS)
    dur = float(positive("duration", scalar("duration", duration, "s"), "s"))
    lx = positive("length", length, "m")
    ly = positive("width", width, "m")
    lz = positive("height", height, "m")
    t = positive("wall_thickness", wall_thickness, "m")
    k_ = positive("k", k, "W/(m·K)")
    eps = in_range("emissivity", emissivity, 0.0, 1.0, "-")
    ta = absolute_temperature("t_ambient", t_ambient)
    cap = positive("heat_capacity", heat_capacity, "J/K")
    rx = nonnegative("extra_resistance", extra_resistance, "m²·K/W")
    p_const, prof_t, prof_p = _warm_up_power(power, power_profile, dur)
    t0 = ta if t_start is None else absolute_temperature("t_start", t_start)
    if np.any(np.asarray(t0) < AIR_TEMPERATURE_LIMITS[0]):
        raise ValueError(
            f"t_start: {float(np.min(t0)):g} K is below the range of the air correlations "
            f"({AIR_TEMPERATURE_LIMITS[0]:g} K: air condenses below it at 1 atm) [K]"
        )
    hi_user = None if h_inside is None else positive("h_inside", h_inside, "W/(m²·K)")
    named = dict(length=lx, width=ly, height=lz, wall_thickness=t, k=k_, emissivity=eps,
                 t_ambient=ta, heat_capacity=cap, power=p_const, t_start=t0)
    empty = [n for n, v in named.items() if np.size(v) == 0]
    if empty:
        raise ValueError(f"{', '.join(empty)}: empty; give one value per candidate (or one for all)")
    lx, ly, lz, t, k_, eps, ta, cap, rx, p_const, t0 = broadcast(
        length=lx,
        width=ly,
        height=lz,
        wall_thickness=t,
        k=k_,
        emissivity=eps,
        t_ambient=ta,
        heat_capacity=cap,
        extra_resistance=rx,
        power=p_const,
        t_start=t0,
    )
    cand = ta.shape
    n_cand = int(np.prod(cand, dtype=np.int64))
    if n_cand == 0:
        raise ValueError(f"housing_warm_up: no candidates given (broadcast shape {cand})")
    if hi_user is not None:
        try:
            hi_user = np.broadcast_to(hi_user, cand)
        except ValueError:
            raise ValueError(
                f"h_inside: shape {hi_user.shape} does not broadcast to the candidates' shape {cand}"
            ) from None
    return _WarmUpInputs(
        mounting, dur, lx, ly, lz, t, k_, eps, ta, cap, rx, p_const, t0, prof_t, prof_p,
        hi_user, cand, n_cand,
    )


def _warm_up_times(w: _WarmUpInputs, time_step) -> tuple[np.ndarray, int]:
    """Time points [s] (uniform steps plus the profile's switching times) and the step count.

    Too many steps or stored values is refused here, before any work.
    """
    dur = w.dur
    if time_step is None:
        n_steps = DEFAULT_WARM_UP_STEPS
    else:
        dt_max = float(positive("time_step", scalar("time_step", time_step, "s"), "s"))
        n_float = np.ceil(dur / dt_max)
        if n_float > MAX_WARM_UP_STEPS:
            raise ValueError(
                f"duration, time_step: {dur:g} s in steps of {dt_max:g} s is {n_float:.3g} steps; "
                f"at most {MAX_WARM_UP_STEPS} (choose time_step >= {dur / MAX_WARM_UP_STEPS:.3g} s "
                "or a shorter duration)"
            )
        n_steps = max(int(n_float), 1)
    times = np.linspace(0.0, dur, n_steps + 1)
    if w.prof_t is not None:
        times = np.union1d(times, w.prof_t)
    n_t = times.size
    if n_t - 1 > MAX_WARM_UP_STEPS:
        raise ValueError(
            f"power_profile: the profile adds its switching times to the {n_steps} steps, "
            f"{n_t - 1} in all; at most {MAX_WARM_UP_STEPS} (use a larger time_step or fewer "
            "profile entries)"
        )
    if w.n_cand * n_t > MAX_WARM_UP_VALUES:
        raise ValueError(
            f"time_step: {w.n_cand} candidates × {n_t} time points = {w.n_cand * n_t} values; at "
            f"most {MAX_WARM_UP_VALUES} (use a larger time_step or fewer candidates)"
        )
    return times, n_steps


def _loss_table(w: _WarmUpInputs, faces, p_max: np.ndarray):
    """Heat loss [W] tabulated over surface temperature [K], per candidate.

    Returns ``(lo, hi, q_tab)``: the table runs from ``lo`` (the lowest start)
    to ``hi`` (above the steady state at the highest power ``p_max`` [W]) in
    :data:`_LOSS_NODES` uniform nodes; ``q_tab`` has shape ``(*cand, nodes)``.
    """
    eps, ta, t0 = w.eps, w.ta, w.t0
    a_out = faces.area_outside
    area = a_out.sum(axis=0)
    lengths_out = faces.length_outside[..., None]

    def loss(ts, ta_):
        """Heat leaving through the exchanging faces at surface temperature ts. [W]"""
        hc = _face_h(ts, ta_, lengths_out, faces.orientation_outside)
        hr = eps[..., None] * _SIGMA * (ts * ts + ta_ * ta_) * (ts + ta_)
        return ((hc + hr) * a_out[..., None]).sum(axis=0) * (ts - ta_)

    # upper end of the table: above the steady state at the highest power
    t_film_max = AIR_TEMPERATURE_LIMITS[1]
    rise_max = np.maximum(2.0 * t_film_max - 2.0 * ta - 1.0, 1.0)
    rise = np.minimum(np.maximum(p_max / (5.0 * area), 1.0), rise_max)
    tai = ta[..., None]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        for _ in range(40):
            short = loss((ta + rise)[..., None], tai)[..., 0] < p_max
            if not np.any(short):
                break
            if np.any(short & (rise >= rise_max)):
                bad = np.flatnonzero((short & (rise >= rise_max)).ravel()).tolist()
                raise ValueError(
                    "power, emissivity, length, width, height: no steady state within the range "
                    f"of the air correlations for candidates {bad}"
                )
            rise = np.where(short, np.minimum(2.0 * rise, rise_max), rise)
        lo = np.minimum(ta, t0)
        hi = np.maximum(ta + 1.02 * rise, t0)
        if np.any(hi > 2.0 * t_film_max - ta):
            raise ValueError(
                "t_start: above the range of the air correlations (film temperature up to "
                f"{t_film_max:g} K)"
            )
        grid = lo[..., None] + (hi - lo)[..., None] * np.linspace(0.0, 1.0, _LOSS_NODES)
        q_tab = loss(grid, tai)  # (*cand, nodes)
    return lo, hi, q_tab


def _march_surface(w: _WarmUpInputs, faces, times, p_step, p_max) -> np.ndarray:
    """Surface temperature [K] at each time point, shape ``(n_cand, n_t)``.

    Exact exponential update of :math:`C\\,dT/dt = P - Q(T)` with :math:`Q`
    piecewise linear from :func:`_loss_table` (see :func:`housing_warm_up`, Notes).
    """
    n_cand, n_t = w.n_cand, times.size
    dts = np.diff(times)
    lo, hi, q_tab = _loss_table(w, faces, p_max)
    h_grid = ((hi - lo) / (_LOSS_NODES - 1)).ravel()
    lo_f = lo.ravel()
    q_f = q_tab.reshape(n_cand, _LOSS_NODES)
    g_f = np.diff(q_f, axis=1) / h_grid[:, None]  # slope of each cell [W/K]
    q_nodes = q_f[:, :-1]
    base = np.arange(n_cand) * (_LOSS_NODES - 1)
    q_flat, g_flat = q_nodes.ravel(), g_f.ravel()
    c_f = w.cap.ravel()
    p_f = w.p_const.ravel()

    ts_out = np.empty((n_cand, n_t))
    ts_out[:, 0] = T = w.t0.ravel().copy()
    for n in range(n_t - 1):
        j = np.clip(((T - lo_f) / h_grid).astype(np.int64), 0, _LOSS_NODES - 2)
        i = base + j
        g = g_flat[i]
        q = q_flat[i] + g * (T - (lo_f + j * h_grid))
        x = g * (dts[n] / c_f)
        phi = np.where(x > 1e-8, -np.expm1(-x) / np.where(x > 1e-8, x, 1.0), 1.0 - 0.5 * x)
        p_n = p_f if p_step is None else p_step[n]
        T = T + (p_n - q) * (dts[n] / c_f) * phi
        ts_out[:, n + 1] = T
    return ts_out


def _inside_air_table(w: _WarmUpInputs, faces, ts_out, levels, r_over_a, a_in):
    """Inside-air rise over the inner wall [K], tabulated per power level and candidate.

    Returns ``(w_lo, w_hi, rise_tab)``: the inner-wall temperature range [K]
    of each (level, candidate) and the rise at :data:`_INSIDE_NODES` nodes across it.
    """
    n_cand = w.n_cand
    t_film_max = AIR_TEMPERATURE_LIMITS[1]
    area_in = a_in.sum(axis=0)
    n_lv = levels.shape[0]
    # twi range per candidate and level over the session
    w_lo = ts_out.min(axis=1)[None, :] + levels * r_over_a[None, :]
    w_hi = ts_out.max(axis=1)[None, :] + levels * r_over_a[None, :]
    w_hi = np.maximum(w_hi, w_lo + 1e-6)
    wg = w_lo[..., None] + (w_hi - w_lo)[..., None] * np.linspace(0.0, 1.0, _INSIDE_NODES)
    pl = np.broadcast_to(levels[..., None], wg.shape)
    li = faces.length_inside.reshape(len(faces.names), n_cand)[:, None, :, None]
    ai = a_in[:, None, :, None]

    def inner(ti):
        h = _face_h(wg, ti, li, faces.orientation_inside)
        return (h * ai).sum(axis=0) * (ti - wg) - pl

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        step_i = np.maximum(pl / (2.0 * area_in[None, :, None]), 1.0)
        rise_i = float(np.min(np.maximum(2.0 * t_film_max - 2.0 * wg - 1.0, 1.0)))
        try:
            t_i_tab, _ = _bisect(inner, wg, step_i, 1e-6, 200, "inside-air balance", rise_i)
        except ValueError as exc:
            raise ValueError(
                f"power, k, wall_thickness: no inside-air balance within the range of the air "
                f"correlations ({exc})"
            ) from None
    return w_lo, w_hi, (t_i_tab - wg).reshape(n_lv * n_cand, _INSIDE_NODES)


def _inside_air(w: _WarmUpInputs, faces, ts_out, p_at, levels, level_at) -> np.ndarray:
    """Inside-air temperature [K] at each time point, quasi-steady over the surface.

    :math:`T_{wi} = T_s + P\\,(t/k + R_{extra})/A_m`, then the inside films
    (a given ``h_inside`` or the correlations, tabulated and interpolated).
    """
    n_cand = w.n_cand
    t_film_max = AIR_TEMPERATURE_LIMITS[1]
    a_out = faces.area_outside
    a_mean = (np.sqrt(a_out) * np.sqrt(faces.area_inside)).sum(axis=0).ravel()
    r_wall = (w.t / w.k + w.rx).ravel()
    twi = ts_out + p_at * (r_wall / a_mean)[:, None]
    if np.any(twi > 2.0 * t_film_max - w.ta.ravel()[:, None]) or not np.all(np.isfinite(twi)):
        raise ValueError(
            "k, wall_thickness, extra_resistance, power: the inner wall temperature leaves the "
            "range of the air correlations"
        )
    a_in = faces.area_inside.reshape(len(faces.names), n_cand)
    if w.hi_user is not None:
        return twi + p_at / (w.hi_user.ravel() * a_in.sum(axis=0))[:, None]
    w_lo, w_hi, rise_tab = _inside_air_table(w, faces, ts_out, levels, r_wall / a_mean, a_in)
    ci = np.arange(n_cand)[:, None]
    row = level_at[None, :] * n_cand + ci  # (n_cand, n_t)
    wl = w_lo.ravel()[row]
    wh = (w_hi - w_lo).ravel()[row] / (_INSIDE_NODES - 1)
    xf = np.clip((twi - wl) / wh, 0.0, _INSIDE_NODES - 1)
    j0 = np.minimum(xf.astype(np.int64), _INSIDE_NODES - 2)
    fr = xf - j0
    r0 = rise_tab[row, j0]
    r1 = rise_tab[row, j0 + 1]
    return twi + r0 + fr * (r1 - r0)


def housing_warm_up(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    wall_thickness: ArrayLike,
    k: ArrayLike,
    emissivity: ArrayLike,
    power: ArrayLike | None,
    t_ambient: ArrayLike,
    heat_capacity: ArrayLike,
    duration: float,
    mounting: str = "free-standing",
    *,
    power_profile=None,
    t_start: ArrayLike | None = None,
    time_step: float | None = None,
    h_inside: ArrayLike | None = None,
    extra_resistance: ArrayLike = 0.0,
) -> WarmUp:
    """Surface and inside-air temperatures of a sealed housing warming up over a session.

    Parameters
    ----------
    length, width, height : float or array
        Outer dimensions; ``height`` is vertical. [m]
    wall_thickness : float or array
        Thickness of the structural wall. [m]
    k : float or array
        Conductivity of the wall. [W/(m·K)]
    emissivity : float or array
        Emissivity of the outer finish, 0–1. [-]
    power : float or array or None
        Constant dissipation from time 0, >= 0. Must be ``None`` when
        ``power_profile`` is given (the profile replaces it). [W]
    t_ambient : float or array
        Room air and surroundings temperature. [K]
    heat_capacity : float or array
        Heat capacity of housing and contents (:func:`housing_heat_capacity`). [J/K]
    duration : float
        Length of the session. [s]
    mounting : str
        ``"free-standing"``, ``"on-table"`` or ``"wall-mounted"``.
    power_profile : (times, powers), optional
        Step profile, the same for all candidates: ``powers[i]`` [W] applies
        from ``times[i]`` [s] to the next time (the last to the end);
        ``times`` start at 0 and increase. Entries at or after the duration
        are ignored. At most :data:`MAX_PROFILE_ENTRIES` entries.
    t_start : float or array, optional
        Temperature of housing and contents at time 0; default ``t_ambient``. [K]
    time_step : float, optional
        Largest time step; default ``duration / 400``. Profile times are
        added to the time grid, so each step has one power. At most
        :data:`MAX_WARM_UP_STEPS` steps and :data:`MAX_WARM_UP_VALUES`
        stored values (candidates × time points); more is refused. [s]
    h_inside : float or array, optional
        Inside convective coefficient; default the correlations, as in
        :func:`solve_housing`. [W/(m²·K)]
    extra_resistance : float or array
        Further layers in series with the wall, per unit area. [m²·K/W]

    Returns
    -------
    WarmUp
        ``time`` [s], ``t_surface`` and ``t_air_inside`` [K] with time on
        the last axis, and :meth:`WarmUp.time_to_limit`.

    Raises
    ------
    ValueError
        Bad input (naming the argument and unit), too much work (naming the
        step count and the way out), or no steady state within the range of
        the air correlations.

    Notes
    -----
    One node: housing and contents at the mean surface temperature
    :math:`T_s` (lumped capacitance),

    .. math:: C \\frac{dT_s}{dt} = P(t) - Q(T_s), \\qquad
              Q(T) = \\sum_f A_f \\left[h_{c,f}(T, T_a) + h_r(T, T_a)\\right](T - T_a)

    with the faces, correlations and radiation coefficient of
    :func:`solve_housing`, so a long session ends at its steady state and
    the initial slope is :math:`P/C`.

    Method: :math:`Q` is tabulated once per candidate on a uniform grid of
    :math:`T_s` from the lowest start to above the steady state at the
    highest power (:data:`_LOSS_NODES` nodes) and taken piecewise linear,
    :math:`Q \\approx Q_j + G_j (T - T_j)`. Each step uses the exact
    solution of that linear equation (exponential update; stable for any
    step, exact while the step stays in one table cell):

    .. math:: T_{n+1} = T_n + \\frac{P_n - Q(T_n)}{C}\\,\\Delta t\\,
              \\frac{1 - e^{-x}}{x}, \\qquad x = \\frac{G_j \\Delta t}{C}

    Inside air, quasi-steady over the surface (the assumption: the whole
    current dissipation crosses the wall and the inside air, as in the
    steady state; an upper estimate while the contents still store heat):
    :math:`T_{wi} = T_s + P\\,(t/k + R_{extra}) / \\sum_f A_{m,f}`, and
    :math:`T_i` from :math:`P = \\sum_f A_{in,f} h_{i,f}(T_{wi}, T_i)(T_i - T_{wi})`,
    tabulated over :math:`T_{wi}` per power level and interpolated.

    Limits: a lumped model holds while the wall and contents are nearly
    isothermal (Biot number of the wall well below 0.1); a plastic wall's
    local hot spot is not in it.

    References
    ----------
    ``incropera7``: 7th ed., §5.2–5.3 (lumped capacitance, from memory);
    ``churchill-chu-1975``, ``lloyd-moran-1974`` (films, through
    :mod:`workbench.surfaces`).

    Examples
    --------
    >>> w = housing_warm_up(0.2, 0.1, 0.05, 0.002, 167.0, 0.82, 5.0, 298.15, 300.0, 20 * 60.0,
    ...                     "on-table")
    >>> round(float(w.t_surface[-1]) - 273.15, 1)
    33.6
    >>> s = solve_housing(0.2, 0.1, 0.05, 0.002, 167.0, 0.82, 5.0, 298.15, "on-table")
    >>> round(s.t_surface - 273.15, 1)
    34.6
    """
    w = _warm_up_inputs(
        length, width, height, wall_thickness, k, emissivity, power, t_ambient, heat_capacity,
        duration, mounting, power_profile, t_start, h_inside, extra_resistance,
    )
    cand, n_cand = w.cand, w.n_cand
    times, _ = _warm_up_times(w, time_step)
    n_t = times.size
    if w.prof_t is not None:
        p_step = _power_steps((w.prof_t, w.prof_p), times)  # (n_steps,)
        p_levels = np.unique(w.prof_p)
        p_max = np.full(cand, float(w.prof_p.max()))
    else:
        p_step = None
        p_levels = None
        p_max = w.p_const

    faces = enclosure_faces(w.lx, w.ly, w.lz, w.t, w.mounting)
    ts_out = _march_surface(w, faces, times, p_step, p_max)

    # power applying from each time point on (the last point keeps the last step's)
    if p_step is None:
        p_f = w.p_const.ravel()
        p_at = np.broadcast_to(p_f[:, None], (n_cand, n_t))
        level_at = np.zeros(n_t, dtype=np.int64)
        levels = p_f[None, :]  # (L=1, n_cand)
    else:
        p_pt = np.append(p_step, p_step[-1])
        p_at = np.broadcast_to(p_pt[None, :], (n_cand, n_t))
        level_at = np.searchsorted(p_levels, p_pt)
        levels = np.broadcast_to(p_levels[:, None], (p_levels.size, n_cand))
    t_in = _inside_air(w, faces, ts_out, p_at, levels, level_at)

    # validity warnings once, at the hottest surface reached
    ts_max = ts_out.max(axis=1).reshape(cand)
    _face_h(ts_max, w.ta, faces.length_outside, faces.orientation_outside)
    finite_result("housing_warm_up", (ts_out, t_in), "power", "heat_capacity")
    return WarmUp(
        time=times,
        t_surface=ts_out.reshape(cand + (n_t,)),
        t_air_inside=t_in.reshape(cand + (n_t,)),
        power=np.array(p_at).reshape(cand + (n_t,)),
        t_ambient=scalar_or_array(w.ta),
        heat_capacity=scalar_or_array(w.cap),
        steps=n_t - 1,
    )
