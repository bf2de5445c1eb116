"""Box size, mass and freight cost of an insulated shipper.

Thicker insulation needs less coolant but makes the box bigger, and parcel
carriers bill the larger of the actual and the dimensional (volumetric) mass.
This module turns a build-up into outer dimensions, actual mass, billable mass
and a landed cost per shipment:

- :func:`shell_volume`, :func:`coolant_layer_thickness`, :func:`outer_dimensions`
- :func:`wall_mass` (layers nested around the inner box)
- :func:`billable_mass` (unrounded, per DESIGN) and :func:`round_up_mass`
  (the carrier's rounding rule, a separate option)
- :func:`landed_cost`

Pure numeric core: SI floats and numpy arrays (m, kg, m³/kg); costs in the
user's currency. Divisors and rates differ between carriers and contracts
(common practice: 5000 or 6000 cm³/kg for parcels, i.e. 0.005 or 0.006
m³/kg); use the figures of the contract.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from workbench._checks import (
    broadcast,
    broadcast_shape,
    finite_result,
    layers,
    nonnegative,
    positive,
    scalar_or_array,
)

#: A float, a sequence of floats or an array (broadcasting).
ArrayLike = float | Sequence[float] | np.ndarray

__all__ = [
    "shell_volume",
    "coolant_layer_thickness",
    "outer_dimensions",
    "wall_mass",
    "billable_mass",
    "round_up_mass",
    "landed_cost",
]


def shell_volume(
    length: ArrayLike, width: ArrayLike, height: ArrayLike, thickness: ArrayLike
) -> float | np.ndarray:
    """Volume of a uniform shell of a given thickness around a rectangular box.

    Parameters
    ----------
    length, width, height : float or array
        Inner dimensions. [m]
    thickness : float or array
        Shell thickness, >= 0. [m]

    Returns
    -------
    float or array
        Shell volume. [m³]

    Notes
    -----
    .. math:: V = (a + 2t)(b + 2t)(c + 2t) - abc

    Square outer corners (a box of boards), not rounded ones.

    References
    ----------
    Geometry (common practice).

    Examples
    --------
    >>> round(shell_volume(0.3, 0.2, 0.1, 0.05), 6)
    0.018
    """
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    c = positive("height", height, "m")
    t = nonnegative("thickness", thickness, "m")
    a, b, c, t = broadcast(length=a, width=b, height=c, thickness=t)
    with np.errstate(over="ignore", invalid="ignore"):
        v = (a + 2 * t) * (b + 2 * t) * (c + 2 * t) - a * b * c
    return finite_result("shell_volume", scalar_or_array(v), "length", "width", "height", "thickness")


def coolant_layer_thickness(
    length: ArrayLike, width: ArrayLike, height: ArrayLike, coolant_volume: ArrayLike
) -> float | np.ndarray:
    """Thickness of a uniform coolant layer that surrounds a payload space.

    Parameters
    ----------
    length, width, height : float or array
        Payload space. [m]
    coolant_volume : float or array
        Volume of the coolant packs, >= 0. [m³]

    Returns
    -------
    float or array
        Layer thickness t with :func:`shell_volume` (payload, t) equal to the
        coolant volume. [m]

    Notes
    -----
    Solves :math:`(a+2t)(b+2t)(c+2t) - abc = V` (monotone in t) by
    bisection. Packs on all six faces; real packs come in fixed sizes, so
    round up to the packs you use.

    References
    ----------
    Geometry (common practice).

    Examples
    --------
    >>> round(coolant_layer_thickness(0.3, 0.2, 0.1, 0.018), 6)
    0.05
    """
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    c = positive("height", height, "m")
    v = nonnegative("coolant_volume", coolant_volume, "m³")
    a, b, c, v = broadcast(length=a, width=b, height=c, coolant_volume=v)
    lo = np.zeros(a.shape)
    # the shell is at least as large as 2t times the largest face area
    hi = v / (2.0 * np.maximum(np.maximum(a * b, a * c), b * c)) + 1e-12
    for _ in range(80):
        mid = 0.5 * (lo + hi)
        with np.errstate(over="ignore", invalid="ignore"):
            big = (a + 2 * mid) * (b + 2 * mid) * (c + 2 * mid) - a * b * c >= v
        hi = np.where(big, mid, hi)
        lo = np.where(big, lo, mid)
    return scalar_or_array(np.where(v == 0, 0.0, 0.5 * (lo + hi)))


def outer_dimensions(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    coolant_thickness: ArrayLike,
    wall_thickness: ArrayLike,
) -> float | np.ndarray:
    """Outer dimensions of a shipper: payload space + coolant layer + wall.

    Parameters
    ----------
    length, width, height : float or array
        Payload space. [m]
    coolant_thickness : float or array
        Coolant layer on each side (:func:`coolant_layer_thickness`). [m]
    wall_thickness : float or array
        Total wall build-up on each side (insulation + liners + carton). [m]

    Returns
    -------
    ndarray
        Outer length, width, height on the last axis. [m]

    Notes
    -----
    .. math:: L_o = L + 2(t_c + t_w)

    References
    ----------
    Geometry (common practice).

    Examples
    --------
    >>> outer_dimensions(0.3, 0.2, 0.1, 0.02, 0.05)
    array([0.44, 0.34, 0.24])
    """
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    c = positive("height", height, "m")
    tc = nonnegative("coolant_thickness", coolant_thickness, "m")
    tw = nonnegative("wall_thickness", wall_thickness, "m")
    a, b, c, tc, tw = broadcast(
        length=a, width=b, height=c, coolant_thickness=tc, wall_thickness=tw
    )
    add = 2.0 * (tc + tw)
    return np.stack([a + add, b + add, c + add], axis=-1)


def wall_mass(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    thicknesses: ArrayLike,
    densities: ArrayLike,
) -> float | np.ndarray:
    """Mass of a box wall of layers nested around an inner box.

    Parameters
    ----------
    length, width, height : float or array
        Inner dimensions (inside the first layer). [m]
    thicknesses : array
        Layer thicknesses, inside to outside, layers on the last axis. [m]
    densities : array
        Layer densities, layers on the last axis. [kg/m³]

    Returns
    -------
    float or array
        Mass of all layers. [kg]

    Notes
    -----
    Layer j is a shell of thickness :math:`t_j` around the box grown by the
    layers inside it:

    .. math:: M = \\sum_j \\rho_j \\, V_{shell}(a + 2s_j, b + 2s_j, c + 2s_j, t_j),
              \\quad s_j = \\sum_{i<j} t_i

    References
    ----------
    Geometry (common practice).

    Examples
    --------
    >>> round(wall_mass(0.3, 0.2, 0.1, [0.05], [30.0]), 4)
    0.54
    """
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    c = positive("height", height, "m")
    t = layers("thicknesses", nonnegative("thicknesses", thicknesses, "m"), "m")
    rho = layers("densities", nonnegative("densities", densities, "kg/m³"), "kg/m³")
    t, rho = broadcast(thicknesses=t, densities=rho)
    broadcast_shape(length=a, width=b, height=c, layers=t[..., 0])
    inner = np.cumsum(t, axis=-1) - t
    a_, b_, c_ = (x[..., None] for x in (a, b, c))
    try:
        with np.errstate(over="ignore", invalid="ignore"):
                vol = (a_ + 2 * (inner + t)) * (b_ + 2 * (inner + t)) * (c_ + 2 * (inner + t)) - (
                (a_ + 2 * inner) * (b_ + 2 * inner) * (c_ + 2 * inner)
            )
    except ValueError:
        raise ValueError(
            f"shapes do not broadcast: length {np.shape(a)}, thicknesses {np.shape(t)}"
        ) from None
    return finite_result(
        "wall_mass", scalar_or_array((rho * vol).sum(axis=-1)),
        "length", "width", "height", "thicknesses", "densities",
    )


def billable_mass(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    actual_mass: ArrayLike,
    divisor: ArrayLike,
) -> float | np.ndarray:
    """Billable (chargeable) mass: the larger of actual and dimensional mass.

    Parameters
    ----------
    length, width, height : float or array
        Outer dimensions of the package. [m]
    actual_mass : float or array
        Gross mass of the package, >= 0. [kg]
    divisor : float or array
        Dimensional divisor of the contract, e.g. 0.005 or 0.006 m³/kg
        (5000 or 6000 cm³/kg, common practice for parcels). [m³/kg]

    Returns
    -------
    float or array
        :math:`\\max(M, LWH/D)`, unrounded. [kg]

    Notes
    -----
    .. math:: M_{bill} = \\max\\left(M_{actual},\\ \\frac{L\\,W\\,H}{D}\\right)

    Carriers round the dimensions and the result by their own rules (per
    contract); apply :func:`round_up_mass` separately.

    References
    ----------
    Dimensional-weight billing: common carrier practice (rules per contract).

    Examples
    --------
    30 × 45 × 65 cm at 6000 cm³/kg:

    >>> round(billable_mass(0.30, 0.45, 0.65, 8.0, 0.006), 3)
    14.625
    """
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    c = positive("height", height, "m")
    m = nonnegative("actual_mass", actual_mass, "kg")
    d = positive("divisor", divisor, "m³/kg")
    a, b, c, m, d = broadcast(length=a, width=b, height=c, actual_mass=m, divisor=d)
    return scalar_or_array(np.maximum(m, a * b * c / d))


def round_up_mass(mass: ArrayLike, increment: ArrayLike = 0.5) -> float | np.ndarray:
    """Round a billable mass up to the carrier's increment.

    Parameters
    ----------
    mass : float or array
        Mass, >= 0. [kg]
    increment : float or array
        Step, > 0: common carrier practice is 0.5 kg or 1 kg (per contract). [kg]

    Returns
    -------
    float or array
        :math:`\\lceil M / s \\rceil s` (values within 1e-9 kg of a step stay). [kg]

    Notes
    -----
    .. math:: M_r = s \\lceil M/s \\rceil

    References
    ----------
    Common carrier practice (rules per contract).

    Examples
    --------
    >>> round_up_mass(14.625, 0.5), round_up_mass(14.625, 1.0), round_up_mass(14.5, 0.5)
    (15.0, 15.0, 14.5)
    """
    m = nonnegative("mass", mass, "kg")
    s = positive("increment", increment, "kg")
    m, s = broadcast(mass=m, increment=s)
    return scalar_or_array(np.ceil(m / s - 1e-9 / s) * s)


def landed_cost(
    packaging_cost: ArrayLike,
    coolant_cost: ArrayLike,
    billable: ArrayLike,
    rate_per_kg: ArrayLike,
    fixed_fee: ArrayLike = 0.0,
) -> float | np.ndarray:
    """Landed cost per shipment: packaging + coolant + freight.

    Parameters
    ----------
    packaging_cost : float or array
        Material cost of the box (all wall layers), >= 0. [currency]
    coolant_cost : float or array
        Cost of the coolant, >= 0. [currency]
    billable : float or array
        Billable mass, rounded as the contract says. [kg]
    rate_per_kg : float or array
        Freight rate per billable kg, >= 0 (user input). [currency/kg]
    fixed_fee : float or array
        Fixed freight charge per shipment, >= 0. [currency]

    Returns
    -------
    float or array
        Cost per shipment. [currency]

    Notes
    -----
    .. math:: C = C_{pack} + C_{cool} + r\\,M_{bill} + C_0

    References
    ----------
    Definition (common practice).

    Examples
    --------
    >>> landed_cost(6.0, 1.5, 15.0, 1.2, 4.0)
    29.5
    """
    p = nonnegative("packaging_cost", packaging_cost, "currency")
    c = nonnegative("coolant_cost", coolant_cost, "currency")
    b = nonnegative("billable", billable, "kg")
    r = nonnegative("rate_per_kg", rate_per_kg, "currency/kg")
    f = nonnegative("fixed_fee", fixed_fee, "currency")
    p, c, b, r, f = broadcast(
        packaging_cost=p, coolant_cost=c, billable=b, rate_per_kg=r, fixed_fee=f
    )
    return scalar_or_array(p + c + r * b + f)
