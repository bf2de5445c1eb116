"""Steady one-dimensional conduction through plane walls of layers in series.

Pure numeric core: SI floats and numpy arrays that broadcast. Layers sit on the
last axis of ``thicknesses`` / ``conductivities``; every other axis is free for
sweeps (materials x thicknesses x temperature differences in one call).

Sign convention: a positive heat flux flows from the inside (first layer) to
the outside (last layer), i.e. ``delta_t = t_inside - t_outside``.
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import numpy as np

from workbench._checks import (
    ValidityWarning,
    absolute_temperature,
    broadcast,
    broadcast_shape,
    finite,
    finite_product,
    finite_result,
    integer,
    layers,
    nonnegative,
    positive,
    scalar,
    scalar_or_array,
)

__all__ = [
    "heat_flux",
    "series_resistance",
    "u_value",
    "wall_temperatures",
    "required_thickness",
    "mass_per_area",
    "cost_per_area",
    "mean_conductivity",
    "SolidLayer",
    "WallSolution",
    "solve_wall",
]

ArrayLike = float | Sequence[float] | np.ndarray


def heat_flux(k: ArrayLike, thickness: ArrayLike, delta_t: ArrayLike):
    """Heat flux through one plane slab by Fourier's law.

    Parameters
    ----------
    k : float or array
        Thermal conductivity of the slab. [W/(m·K)]
    thickness : float or array
        Slab thickness in the direction of heat flow. [m]
    delta_t : float or array
        Temperature difference across the slab, hot face minus cold face. [K]

    Returns
    -------
    float or array
        Heat flux, positive from the first face to the second. [W/m²]

    Notes
    -----
    .. math:: q = k \\, \\Delta T / L

    Steady state, constant conductivity, one-dimensional flow. For a sweep the
    two arguments whose broadcast is smallest are combined first, so the full
    grid is made once: :math:`k (\\Delta T/L)`, :math:`(k/L) \\Delta T` or
    :math:`(k \\Delta T)/L`, in this order of preference on ties (a final
    multiplication is faster than a division). The forms agree to within
    rounding (a unit or two in the last place).

    References
    ----------
    ``fourier``: Fourier's law of conduction (Bergman, Lavine, Incropera,
    DeWitt, *Fundamentals of Heat and Mass Transfer*, 7th ed., Eq. 1.2).

    Examples
    --------
    >>> heat_flux(0.04, 0.05, 20.0)
    16.0
    >>> heat_flux([0.04, 200.0], 0.01, 1.0)
    array([4.e+00, 2.e+04])
    """
    k_ = positive("k", k, "W/(m·K)")
    l_ = positive("thickness", thickness, "m")
    dt = finite("delta_t", delta_t, "K")
    broadcast_shape(k=k_, thickness=l_, delta_t=dt)
    return scalar_or_array(_fourier(k_, l_, dt))


def _size(*arrays: np.ndarray) -> int:
    return math.prod(np.broadcast_shapes(*(a.shape for a in arrays)))


def _fourier(k_: np.ndarray, l_: np.ndarray, dt: np.ndarray) -> np.ndarray:
    """k·ΔT/L of checked arrays, the smallest pair first (see :func:`heat_flux`). [W/m²]

    Ties go to a form whose last (largest) step is a multiplication, which is
    faster than a division over a large grid.
    """
    names = ("k", "thickness", "delta_t")

    def times(a: np.ndarray, b: np.ndarray) -> np.ndarray:
        return finite_product("heat_flux", a, b, *names)

    def over(a: np.ndarray, b: np.ndarray) -> np.ndarray:
        return finite_product("heat_flux", a, b, *names, divide=True)

    sizes = (_size(dt, l_), _size(k_, l_), _size(k_, dt))
    first = sizes.index(min(sizes))  # ties keep this order
    if first == 0:
        return times(k_, over(dt, l_))  # k·(ΔT/L)
    if first == 1:
        return times(over(k_, l_), dt)  # (k/L)·ΔT
    return over(times(k_, dt), l_)  # (k·ΔT)/L


def _layer_resistances(thicknesses, conductivities) -> np.ndarray:
    l_ = layers("thicknesses", positive("thicknesses", thicknesses, "m"), "m")
    k_ = layers("conductivities", positive("conductivities", conductivities, "W/(m·K)"), "W/(m·K)")
    broadcast_shape(thicknesses=l_, conductivities=k_)
    return finite_product("layer resistances", l_, k_, "thicknesses", "conductivities", divide=True)


def series_resistance(
    thicknesses: ArrayLike,
    conductivities: ArrayLike,
    r_si: ArrayLike = 0.0,
    r_se: ArrayLike = 0.0,
):
    """Total thermal resistance of plane layers in series, surface to surface.

    Parameters
    ----------
    thicknesses : array
        Layer thicknesses, layers on the last axis. [m]
    conductivities : array
        Layer conductivities, layers on the last axis. [W/(m·K)]
    r_si, r_se : float or array
        Inside and outside surface resistances (0 for surface-to-surface). [m²·K/W]

    Returns
    -------
    float or array
        Total resistance, the layer axis summed away. [m²·K/W]

    Notes
    -----
    .. math:: R_T = R_{si} + \\sum_j L_j / k_j + R_{se}

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, clause 6.7.1 (thermally homogeneous layers);
    ``incropera7``: 7th ed., §3.1.2 (the composite wall).

    Examples
    --------
    >>> round(series_resistance([0.1, 0.05], [1.0, 0.04], r_si=0.13, r_se=0.04), 4)
    1.52
    """
    r_layers = _layer_resistances(thicknesses, conductivities)
    rsi = nonnegative("r_si", r_si, "m²·K/W")
    rse = nonnegative("r_se", r_se, "m²·K/W")
    total = r_layers.sum(axis=-1)
    broadcast_shape(layers=total, r_si=rsi, r_se=rse)
    return finite_result(
        "series_resistance", scalar_or_array(total + rsi + rse),
        "thicknesses", "conductivities", "r_si", "r_se",
    )


def u_value(
    thicknesses: ArrayLike,
    conductivities: ArrayLike,
    r_si: ArrayLike = 0.0,
    r_se: ArrayLike = 0.0,
):
    """Thermal transmittance (U-value) of plane layers in series.

    Parameters
    ----------
    thicknesses, conductivities, r_si, r_se
        As for :func:`series_resistance`. [m], [W/(m·K)], [m²·K/W]

    Returns
    -------
    float or array
        U-value. [W/(m²·K)]

    Notes
    -----
    .. math:: U = 1 / R_T

    References
    ----------
    ``iso6946-2017``: ISO 6946:2017, clause 6.7.1 and 7.

    Examples
    --------
    >>> round(u_value([0.1, 0.05], [1.0, 0.04], r_si=0.13, r_se=0.04), 4)
    0.6579
    """
    r_total = np.asarray(series_resistance(thicknesses, conductivities, r_si, r_se))
    with np.errstate(divide="ignore", over="ignore"):
        u = 1.0 / r_total
    return finite_result(
        "u_value", scalar_or_array(u), "thicknesses", "conductivities", "r_si", "r_se"
    )


def wall_temperatures(
    thicknesses: ArrayLike,
    conductivities: ArrayLike,
    t_inside: ArrayLike,
    t_outside: ArrayLike,
    r_si: ArrayLike = 0.0,
    r_se: ArrayLike = 0.0,
) -> np.ndarray:
    """Temperatures at the surfaces and interfaces of a layered plane wall.

    Parameters
    ----------
    thicknesses, conductivities : array
        Layers on the last axis. [m], [W/(m·K)]
    t_inside, t_outside : float or array
        Air (environment) temperatures on each side; with zero surface
        resistances they are the surface temperatures. [K]
    r_si, r_se : float or array
        Surface resistances. [m²·K/W]

    Returns
    -------
    array
        ``n_layers + 1`` temperatures on the last axis: inner surface, each
        interface, outer surface. [K]

    Notes
    -----
    The flux is the same through every layer:

    .. math:: q = (T_i - T_e)/R_T, \\quad
              T_0 = T_i - q R_{si}, \\quad T_j = T_{j-1} - q L_j/k_j

    References
    ----------
    ``incropera7``: 7th ed., §3.1.2, Eq. 3.14.

    Examples
    --------
    >>> wall_temperatures([0.2, 0.05], [1.0, 0.0625], 293.15, 273.15)
    array([293.15, 289.15, 273.15])
    """
    r_layers = _layer_resistances(thicknesses, conductivities)
    ti = absolute_temperature("t_inside", t_inside)
    te = absolute_temperature("t_outside", t_outside)
    rsi = nonnegative("r_si", r_si, "m²·K/W")
    rse = nonnegative("r_se", r_se, "m²·K/W")
    r_sum = r_layers.sum(axis=-1)
    lead = broadcast_shape(layers=r_sum, t_inside=ti, t_outside=te, r_si=rsi, r_se=rse)
    q = (ti - te) / (r_sum + rsi + rse)
    q = np.broadcast_to(q, lead)[..., None]
    t_surface_in = np.broadcast_to(ti - q[..., 0] * rsi, lead)[..., None]
    r_layers = np.broadcast_to(r_layers, lead + r_layers.shape[-1:])
    drops = np.cumsum(q * r_layers, axis=-1)
    return finite_result(
        "wall_temperatures",
        np.concatenate([t_surface_in, t_surface_in - drops], axis=-1),
        "thicknesses", "conductivities", "t_inside", "t_outside", "r_si", "r_se",
    )


def required_thickness(
    k: ArrayLike,
    delta_t: ArrayLike,
    max_flux: ArrayLike,
    other_resistance: ArrayLike = 0.0,
):
    """Thickness of one material that keeps the heat flux within a budget.

    Parameters
    ----------
    k : float or array
        Conductivity of the material to be sized. [W/(m·K)]
    delta_t : float or array
        Temperature difference across the whole wall; its sign is ignored. [K]
    max_flux : float or array
        Largest acceptable heat flux (the heat budget per area), > 0. [W/m²]
    other_resistance : float or array
        Resistance of everything else in series (films, other layers). [m²·K/W]

    Returns
    -------
    float or array
        Least thickness; 0.0 where ``other_resistance`` alone meets the budget. [m]

    Notes
    -----
    From :math:`q = |\\Delta T| / (R_o + L/k) \\le q_{max}`:

    .. math:: L = \\max\\left(0,\\; k \\left(|\\Delta T|/q_{max} - R_o\\right)\\right)

    References
    ----------
    ``fourier``; ``iso6946-2017`` clause 6.7.1 for the series sum.

    Examples
    --------
    >>> round(required_thickness(0.035, 40.0, 10.0), 6)
    0.14
    >>> required_thickness(0.035, 40.0, 10.0, other_resistance=5.0)
    0.0
    """
    k_ = positive("k", k, "W/(m·K)")
    dt = np.abs(finite("delta_t", delta_t, "K"))
    q = positive("max_flux", max_flux, "W/m²")
    ro = nonnegative("other_resistance", other_resistance, "m²·K/W")
    broadcast_shape(k=k_, delta_t=dt, max_flux=q, other_resistance=ro)
    names = ("k", "delta_t", "max_flux", "other_resistance")
    # k > 0, so max(0, k·x) = k·max(0, x): clip the small factor, then make the grid once
    with np.errstate(over="ignore"):
        excess = np.maximum(0.0, dt / q - ro)  # [m²·K/W]
    finite_result("required_thickness", excess, *names)
    return scalar_or_array(finite_product("required_thickness", k_, excess, *names))


def mass_per_area(densities: ArrayLike, thicknesses: ArrayLike):
    """Mass per unit wall area of layers in series.

    Parameters
    ----------
    densities : array
        Layer densities, layers on the last axis. [kg/m³]
    thicknesses : array
        Layer thicknesses, layers on the last axis. [m]

    Returns
    -------
    float or array
        Mass per area, the layer axis summed away. [kg/m²]

    Notes
    -----
    .. math:: m'' = \\sum_j \\rho_j L_j

    References
    ----------
    Definition (common practice).

    Examples
    --------
    >>> round(mass_per_area([2700.0, 30.0], [0.002, 0.05]), 6)
    6.9
    """
    rho = layers("densities", positive("densities", densities, "kg/m³"), "kg/m³")
    l_ = layers("thicknesses", positive("thicknesses", thicknesses, "m"), "m")
    broadcast_shape(densities=rho, thicknesses=l_)
    per_layer = finite_product("mass_per_area", rho, l_, "densities", "thicknesses")
    return finite_result(
        "mass_per_area", scalar_or_array(per_layer.sum(axis=-1)), "densities", "thicknesses"
    )


_COST_BASES = ("per_kg", "per_m3")


def cost_per_area(
    unit_costs: ArrayLike,
    thicknesses: ArrayLike,
    densities: ArrayLike | None = None,
    basis: str | Sequence[str] = "per_kg",
):
    """Material cost per unit wall area of layers in series.

    Parameters
    ----------
    unit_costs : array
        Cost of each layer's material per kg or per m³ (see ``basis``),
        layers on the last axis. [currency/kg] or [currency/m³]
    thicknesses : array
        Layer thicknesses, layers on the last axis. [m]
    densities : array, optional
        Layer densities, needed where the basis is ``"per_kg"``. [kg/m³]
    basis : str or sequence of str
        ``"per_kg"`` or ``"per_m3"``, one for all layers or one per layer.

    Returns
    -------
    float or array
        Cost per area. [currency/m²]

    Notes
    -----
    .. math:: C'' = \\sum_j c_{m,j} \\rho_j L_j \\quad\\text{or}\\quad \\sum_j c_{V,j} L_j

    References
    ----------
    Definition (common practice).

    Examples
    --------
    >>> round(cost_per_area([3.0, 120.0], [0.002, 0.05], [2700.0, 30.0],
    ...                     basis=["per_kg", "per_m3"]), 4)
    22.2
    """
    c = layers(
        "unit_costs",
        nonnegative("unit_costs", unit_costs, "currency/kg or currency/m³"),
        "currency/kg or currency/m³",
    )
    l_ = layers("thicknesses", positive("thicknesses", thicknesses, "m"), "m")
    if isinstance(basis, bool | np.bool_) or basis is None:
        raise TypeError(f"basis: expected 'per_kg' or 'per_m3' (or one per layer), got {basis!r}")
    bases = np.atleast_1d(np.asarray(basis, dtype=object))
    unknown = sorted({str(b) for b in bases.ravel()} - set(_COST_BASES))
    if unknown:
        raise ValueError(f"basis: unknown cost basis {unknown}; valid: {list(_COST_BASES)}")
    per_kg = (bases == "per_kg").astype(float)
    if np.any(per_kg):
        if densities is None:
            raise ValueError("densities: needed in kg/m³ where basis is 'per_kg'")
        rho = layers("densities", positive("densities", densities, "kg/m³"), "kg/m³")
    else:
        rho = np.ones(1)
    broadcast_shape(unit_costs=c, thicknesses=l_, densities=rho, basis=per_kg)
    factor = per_kg * rho + (1.0 - per_kg)
    return finite_result(
        "cost_per_area", scalar_or_array(np.atleast_1d(c * factor * l_).sum(axis=-1)),
        "unit_costs", "thicknesses", "densities",
    )


def _check_table(temperatures, conductivities) -> tuple[np.ndarray, np.ndarray]:
    tt = absolute_temperature("temperatures", temperatures)
    kk = positive("conductivities", conductivities, "W/(m·K)")
    if tt.ndim != 1 or kk.shape != tt.shape:
        raise ValueError(
            "temperatures, conductivities: need two 1-D tables of equal length "
            f"(got {tt.shape} and {kk.shape})"
        )
    if tt.size == 0:
        raise ValueError("temperatures: the k(T) table is empty")
    if tt.size > 1 and np.any(np.diff(tt) <= 0):
        raise ValueError("temperatures: must be strictly increasing (K)")
    return tt, kk


def _k_integral(tt: np.ndarray, kk: np.ndarray, t: np.ndarray) -> np.ndarray:
    """Integral of piecewise-linear k(T) from tt[0] to t (constant beyond the ends)."""
    if tt.size == 1:
        return kk[0] * (t - tt[0])
    seg = np.diff(tt)
    cum = np.concatenate([[0.0], np.cumsum(0.5 * (kk[1:] + kk[:-1]) * seg)])
    slope = np.diff(kk) / seg
    i = np.clip(np.searchsorted(tt, t, side="right") - 1, 0, tt.size - 2)
    inside = np.clip(t, tt[0], tt[-1])
    d = inside - tt[i]
    f = cum[i] + kk[i] * d + 0.5 * slope[i] * d * d
    # constant extrapolation beyond the table ends
    f = f + np.where(t < tt[0], kk[0] * (t - tt[0]), 0.0)
    f = f + np.where(t > tt[-1], kk[-1] * (t - tt[-1]), 0.0)
    return f


def mean_conductivity(
    temperatures: ArrayLike,
    conductivities: ArrayLike,
    t1: ArrayLike,
    t2: ArrayLike,
):
    """Effective conductivity between two face temperatures from a k(T) table.

    Parameters
    ----------
    temperatures : array, 1-D, strictly increasing
        Table temperatures. [K]
    conductivities : array, 1-D
        Conductivity at each table temperature; linear in between. [W/(m·K)]
    t1, t2 : float or array
        The two face temperatures. [K]

    Returns
    -------
    float or array
        Integral-mean conductivity between ``t1`` and ``t2`` (the value at
        ``t1`` where ``t1 == t2``). [W/(m·K)]

    Notes
    -----
    With the Kirchhoff transform, steady 1-D conduction with k(T) carries

    .. math:: q = \\frac{1}{L}\\int_{T_2}^{T_1} k(T)\\,dT = \\bar k \\,(T_1 - T_2)/L,
              \\quad \\bar k = \\frac{1}{T_1 - T_2}\\int_{T_2}^{T_1} k(T)\\,dT

    exact for piecewise-linear k(T). Beyond the table, k is held at the end
    value and a :class:`~workbench._checks.ValidityWarning` is issued.

    References
    ----------
    ``incropera7``: 7th ed., §3.1 and Problem 3.x on variable conductivity;
    the Kirchhoff transformation (common practice).

    Examples
    --------
    >>> round(mean_conductivity([250.0, 350.0], [0.020, 0.030], 280.0, 320.0), 6)
    0.025
    """
    tt, kk = _check_table(temperatures, conductivities)
    a = absolute_temperature("t1", t1)
    b = absolute_temperature("t2", t2)
    broadcast_shape(t1=a, t2=b)
    lo, hi = np.minimum(a, b), np.maximum(a, b)
    if np.any(lo < tt[0] - 1e-9) or np.any(hi > tt[-1] + 1e-9):
        warnings.warn(
            f"mean_conductivity: face temperatures {lo.min():.2f}–{hi.max():.2f} K "
            f"reach beyond the k(T) table {tt[0]:.2f}–{tt[-1]:.2f} K; "
            "k is held at the end value there",
            ValidityWarning,
            stacklevel=2,
        )
    span = hi - lo
    same = span <= 1e-9 * np.maximum(1.0, hi)
    safe = np.where(same, 1.0, span)
    kbar = (_k_integral(tt, kk, hi) - _k_integral(tt, kk, lo)) / safe
    k_at = np.interp(a, tt, kk)
    return finite_result(
        "mean_conductivity", scalar_or_array(np.where(same, k_at, kbar)),
        "temperatures", "conductivities", "t1", "t2",
    )


# ---------------------------------------------------------------------------
# Wall evaluation with temperature-dependent layers and films
# ---------------------------------------------------------------------------

#: A surface film: a constant resistance [m²·K/W] or a callable
#: ``film(t_surface, t_air) -> resistance`` evaluated at the current iterate.
Film = float | Callable[[np.ndarray, np.ndarray], np.ndarray]


@dataclass(frozen=True)
class SolidLayer:
    """A homogeneous solid layer of a plane wall.

    Parameters
    ----------
    thickness : float
        Layer thickness. [m]
    conductivity : float
        Constant conductivity, used when no k(T) table is given. [W/(m·K)]
    k_table : tuple of two arrays, optional
        ``(temperatures [K], conductivities [W/(m·K)])``; when given, the layer's
        conductivity is the integral mean between its own face temperatures.
    name : str
        Label for reports.

    Any object with a ``thickness`` attribute and a
    ``resistance(t_a, t_b) -> [m²·K/W]`` method can stand in a wall (air layers
    and vacuum panels do so in their own modules).
    """

    thickness: float
    conductivity: float | None = None
    k_table: tuple[np.ndarray, np.ndarray] | None = None
    name: str = ""

    def __post_init__(self):
        positive("thickness", scalar("thickness", self.thickness, "m"), "m")
        if self.k_table is None:
            if self.conductivity is None:
                raise ValueError("conductivity: give a value in W/(m·K) or a k_table")
            positive("conductivity", scalar("conductivity", self.conductivity, "W/(m·K)"), "W/(m·K)")
        else:
            if (
                isinstance(self.k_table, str | bytes)
                or not isinstance(self.k_table, Sequence | np.ndarray)
                or len(self.k_table) != 2
            ):
                raise ValueError(
                    "k_table: expected (temperatures [K], conductivities [W/(m·K)])"
                )
            tt, kk = _check_table(*self.k_table)
            object.__setattr__(self, "k_table", (tt, kk))

    def conductivity_between(self, t_a, t_b):
        """Effective conductivity between the face temperatures. [W/(m·K)]"""
        if self.k_table is None:
            return np.broadcast_to(float(self.conductivity), np.broadcast_shapes(np.shape(t_a), np.shape(t_b)))
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            return np.asarray(mean_conductivity(*self.k_table, t_a, t_b))

    def resistance(self, t_a, t_b):
        """Resistance of the layer between face temperatures ``t_a``, ``t_b``. [m²·K/W]"""
        return self.thickness / self.conductivity_between(t_a, t_b)


@dataclass(frozen=True)
class WallSolution:
    """Converged state of a layered wall (all arrays broadcast over the inputs).

    Attributes
    ----------
    heat_flux : array
        Flux from inside to outside. [W/m²]
    temperatures : array
        Inner surface, interfaces, outer surface on the last axis. [K]
    resistances : array
        Resistance of each layer at the solution, layers on the last axis. [m²·K/W]
    r_si, r_se : array
        Surface resistances at the solution. [m²·K/W]
    iterations : int
        Fixed-point iterations used.
    """

    heat_flux: np.ndarray
    temperatures: np.ndarray
    resistances: np.ndarray
    r_si: np.ndarray
    r_se: np.ndarray
    iterations: int
    warnings: tuple[str, ...] = field(default=())

    @property
    def total_resistance(self) -> np.ndarray:
        """Air-to-air resistance at the solution. [m²·K/W]"""
        return self.resistances.sum(axis=-1) + self.r_si + self.r_se

    @property
    def u_value(self) -> np.ndarray:
        """Air-to-air U-value at the solution. [W/(m²·K)]"""
        return 1.0 / self.total_resistance


def _film(name: str, film: Film, t_surface, t_air, shape) -> np.ndarray:
    r = nonnegative(name, film(t_surface, t_air) if callable(film) else film, "m²·K/W")
    try:
        return np.broadcast_to(r, shape)
    except ValueError:
        raise ValueError(
            f"{name}: shape {r.shape} does not broadcast to the temperatures' shape {shape}"
        ) from None


def solve_wall(
    layers: Sequence,
    t_inside: ArrayLike,
    t_outside: ArrayLike,
    r_si: Film = 0.0,
    r_se: Film = 0.0,
    rtol: float = 1e-10,
    max_iter: int = 200,
) -> WallSolution:
    """Steady state of a plane wall whose layers and films depend on temperature.

    Parameters
    ----------
    layers : sequence
        Inside to outside; each has ``resistance(t_a, t_b)`` [m²·K/W] given its
        two face temperatures [K] (e.g. :class:`SolidLayer`).
    t_inside, t_outside : float or array
        Environment temperatures on each side; they broadcast. [K]
    r_si, r_se : float or callable
        Surface resistances, constant [m²·K/W] or ``f(t_surface, t_air)``.
    rtol : float
        Convergence tolerance on the largest relative change of any resistance.
    max_iter : int
        Iteration limit; not converging raises ``RuntimeError`` (never a
        silent, unconverged answer).

    Returns
    -------
    WallSolution

    Notes
    -----
    Fixed-point iteration: start from constant resistances at the mean
    temperature, compute the temperatures with the flux the same through every
    layer (:math:`q = \\Delta T / \\sum R`), re-evaluate each layer's and film's
    resistance at its own face temperatures, repeat until the resistances
    change by less than ``rtol``.

    References
    ----------
    ``incropera7``: 7th ed., §3.1 (thermal circuits, variable conductivity).

    Examples
    --------
    >>> foam = SolidLayer(0.05, k_table=([250.0, 350.0], [0.020, 0.030]))
    >>> sol = solve_wall([foam], 320.0, 280.0)
    >>> round(float(sol.heat_flux), 6)
    20.0
    """
    if isinstance(layers, str | bytes) or not isinstance(layers, Sequence | np.ndarray):
        raise TypeError(f"layers: expected a sequence of layers, got {type(layers).__name__}")
    if len(layers) == 0:
        raise ValueError("layers: a wall needs at least one layer")
    for j, layer in enumerate(layers):
        if not callable(getattr(layer, "resistance", None)):
            raise TypeError(
                f"layers: item {j} ({type(layer).__name__}) has no resistance(t_a, t_b) method"
            )
    ti = absolute_temperature("t_inside", t_inside)
    te = absolute_temperature("t_outside", t_outside)
    rtol = float(positive("rtol", scalar("rtol", rtol), "-"))
    max_iter = integer("max_iter", max_iter, minimum=1)
    shape = broadcast_shape(t_inside=ti, t_outside=te)
    if 0 in shape:
        raise ValueError(f"t_inside, t_outside: no temperatures given (K), shape {shape}")
    ti, te = broadcast(t_inside=np.broadcast_to(ti, shape), t_outside=np.broadcast_to(te, shape))
    n = len(layers)
    # initial guess: linear temperature profile between the two air temperatures
    frac = np.linspace(0.0, 1.0, n + 1)
    temps = ti[..., None] + (te - ti)[..., None] * frac
    r_prev = None
    change = np.inf
    for it in range(1, max_iter + 1):
        rs = np.stack(
            [np.broadcast_to(np.asarray(layer.resistance(temps[..., j], temps[..., j + 1]), float), shape)
             for j, layer in enumerate(layers)],
            axis=-1,
        )
        positive("layers", rs, "m²·K/W (layer resistance)")
        rsi = _film("r_si", r_si, temps[..., 0], ti, shape)
        rse = _film("r_se", r_se, temps[..., -1], te, shape)
        r_all = np.concatenate([rsi[..., None], rs, rse[..., None]], axis=-1)
        q = (ti - te) / r_all.sum(axis=-1)
        drops = np.cumsum(q[..., None] * r_all, axis=-1)
        temps = ti[..., None] - drops[..., :-1]
        if r_prev is not None:
            change = np.max(np.abs(r_all - r_prev) / np.maximum(np.abs(r_all), 1e-300))
            if change <= rtol:
                finite_result("solve_wall", (q, temps), "layers", "t_inside", "t_outside", "r_si", "r_se")
                return WallSolution(q, temps, rs, rsi, rse, it)
        r_prev = r_all
    raise RuntimeError(
        f"solve_wall: no convergence in {max_iter} iterations "
        f"(largest relative change of a resistance {change:.3g} > rtol {rtol:g})"
    )
