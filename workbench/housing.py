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
from scipy import constants

from workbench._checks import (
    ValidityWarning,
    broadcast,
    finite,
    in_range,
    nonnegative,
    positive,
    scalar_or_array,
)
from workbench.spreading import (
    equivalent_radius,
    spreading_length,
    spreading_resistance,
    wall_biot_number,
)
from workbench.surfaces import natural_convection_coefficient, radiation_coefficient

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
]

_SIGMA = constants.Stefan_Boltzmann

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
    "Hot spot: Lee et al. (1995) spreading estimate on a disc of the exchanging area, component "
    "bonded to the wall, uniform film on the outer face; the value is the wall temperature under "
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
    """Convective coefficients of every face, faces on axis 0. [W/(m²·K)]"""
    return np.array(
        [
            np.asarray(natural_convection_coefficient(t_surface, t_air, lengths[i], o))
            for i, o in enumerate(orientations)
        ]
    )


def _bisect(residual, low, step, tolerance, max_iterations, what, max_rise=5000.0):
    """Vectorised bracketed root search for an increasing residual with residual(low) <= 0.

    The bracket is widened by doubling up to ``max_rise`` [K] above ``low``; a
    residual that is not finite, or no sign change within that range, raises
    ``RuntimeError`` naming the candidates (flat indices).
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
        hi = np.where(grow & room, lo + np.minimum(2.0 * (hi - lo), max_rise), hi)
        grow = checked(hi) < 0
    if np.any(grow):
        bad = np.flatnonzero(grow.ravel()).tolist()
        raise RuntimeError(
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
    ta = positive("t_ambient", t_ambient, "K")
    rx = nonnegative("extra_resistance", extra_resistance, "m²·K/W")
    tol = float(positive("tolerance", tolerance, "K"))
    if not isinstance(max_iterations, int | np.integer) or max_iterations < 1:
        raise ValueError(f"max_iterations: must be a positive integer, got {max_iterations!r}")
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
    hi_user = None
    if h_inside is not None:
        hi_user = np.broadcast_to(positive("h_inside", h_inside, "W/(m²·K)"), p.shape)
    faces = enclosure_faces(lx, ly, lz, t, mounting)
    a_out = faces.area_outside
    area = a_out.sum(axis=0)

    def outer(ts):
        hc = _face_h(ts, ta, faces.length_outside, faces.orientation_outside)
        hr = eps * _SIGMA * (ts * ts + ta * ta) * (ts + ta)
        return ((hc + hr) * a_out).sum(axis=0) * (ts - ta) - p

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        step = np.maximum(p / (5.0 * area), 1.0)
        ts, iterations = _bisect(outer, ta, step, tol, max_iterations, "surface balance")

    # final evaluation with validity warnings enabled
    hc = _face_h(ts, ta, faces.length_outside, faces.orientation_outside)
    hr = np.asarray(radiation_coefficient(eps, ts, ta))
    dts = ts - ta
    face_conv = hc * a_out * dts
    face_rad = hr * a_out * dts
    conv = face_conv.sum(axis=0)
    rad = face_rad.sum(axis=0)

    a_mean = np.sqrt(a_out * faces.area_inside).sum(axis=0)
    r_wall = t / k_ + rx
    twi = ts + p * r_wall / a_mean

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
            tai, _ = _bisect(inner, twi, step_i, tol, max_iterations, "inside-air balance")
        h_faces = _face_h(twi, tai, faces.length_inside, faces.orientation_inside)
        hin = (h_faces * a_in).sum(axis=0) / area_in

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

    with :math:`R_{c,max}` of Lee et al. (1995) (:func:`~workbench.spreading.spreading_resistance`).
    The spreading length :math:`\\sqrt{kt/h}` and Biot number :math:`ht/k`
    explain the result: a wall whose spreading length is well below the
    footprint radius cannot spread the heat.

    References
    ----------
    ``lee-song-au-moran-1995`` (equations from memory).

    Examples
    --------
    >>> s = solve_housing(0.2, 0.1, 0.05, 0.002, [167.0, 0.2], 0.85, 5.0, 298.15, "on-table")
    >>> hs = hot_spot(s, 0.02 * 0.02, 2.0)
    >>> [round(float(x), 1) for x in hs.rise]
    [2.1, 331.4]
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
