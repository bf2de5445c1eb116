"""Enclosure geometry beyond the flat wall: boxes, cylinders, vacuum-panel edges.

A box is not six flat walls: heat also leaves through its twelve edges and
eight corners, which the inner-area estimate misses and the outer-area
estimate overstates. A pipe's insulation works on a growing area. A vacuum
insulation panel (VIP) leaks along its envelope at the panel edges. This
module puts these effects into numbers:

- :func:`box_conductance` and :func:`box_conductance_breakdown` (faces +
  edges + corners, conduction shape factors), :func:`layered_box_conductance`
  for a layered wall with films,
- :func:`cylinder_resistance_per_length`, :func:`cylinder_conductance` and
  :func:`critical_insulation_radius`,
- :func:`vacuum_panel_effective_conductivity` and the :class:`VacuumPanel`
  layer for :func:`workbench.conduction.solve_wall`.

Pure numeric core: SI floats and numpy arrays that broadcast.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np

from workbench._checks import (
    ValidityWarning,
    broadcast,
    broadcast_shape,
    finite_result,
    layers,
    nonnegative,
    positive,
    scalar,
    scalar_or_array,
)
from workbench.conduction import ArrayLike

__all__ = [
    "EDGE_SHAPE_FACTOR",
    "CORNER_SHAPE_FACTOR",
    "BoxConductance",
    "box_conductance",
    "box_conductance_breakdown",
    "layered_box_conductance",
    "cylinder_resistance_per_length",
    "cylinder_conductance",
    "critical_insulation_radius",
    "vacuum_panel_effective_conductivity",
    "VacuumPanel",
]

#: Shape factor per unit edge length of two adjoining walls, S = 0.54 D
#: (Incropera 7th ed., Table 4.1, case 8; from memory). [-]
EDGE_SHAPE_FACTOR: float = 0.54
#: Shape factor of the corner of three adjoining walls over the wall
#: thickness, S = 0.15 L (Incropera 7th ed., Table 4.1, case 9; from memory). [-]
CORNER_SHAPE_FACTOR: float = 0.15


@dataclass(frozen=True)
class BoxConductance:
    """Conductance of a closed box wall split by path (arrays broadcast over the inputs).

    Attributes
    ----------
    faces : array
        Through the six faces (plane walls of the inner face areas). [W/K]
    edges : array
        Through the twelve edges. [W/K]
    corners : array
        Through the eight corners. [W/K]
    """

    faces: np.ndarray
    edges: np.ndarray
    corners: np.ndarray

    @property
    def total(self) -> np.ndarray:
        """Faces + edges + corners. [W/K]"""
        return self.faces + self.edges + self.corners

    @property
    def edge_corner_share(self) -> np.ndarray:
        """Fraction of the heat through edges and corners. [-]"""
        return (self.edges + self.corners) / self.total


def _box_dims(length, width, height, wall_thickness):
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    c = positive("height", height, "m")
    t = positive("wall_thickness", wall_thickness, "m")
    a, b, c, t = broadcast(length=a, width=b, height=c, wall_thickness=t)
    short = np.minimum(np.minimum(a, b), c)
    if np.any(short <= t / 5.0):
        warnings.warn(
            "box conductance: an inner dimension is not larger than wall_thickness/5; "
            "the edge shape factor S = 0.54 D (Incropera Table 4.1, case 8) is stated "
            "for D > L/5 only",
            ValidityWarning,
            stacklevel=3,
        )
    return a, b, c, t


def _shape_factors(a, b, c, t):
    s_faces = 2.0 * (a * b + a * c + b * c) / t
    s_edges = EDGE_SHAPE_FACTOR * 4.0 * (a + b + c)
    s_corners = 8.0 * CORNER_SHAPE_FACTOR * t
    return s_faces, s_edges, s_corners


def box_conductance_breakdown(
    length: ArrayLike, width: ArrayLike, height: ArrayLike, wall_thickness: ArrayLike, k: ArrayLike
) -> BoxConductance:
    """Conductance of a rectangular box wall of one material, split into faces, edges and corners.

    Parameters
    ----------
    length, width, height : float or array
        Inner dimensions of the box. [m]
    wall_thickness : float or array
        Uniform wall thickness. [m]
    k : float or array
        Conductivity of the wall. [W/(m·K)]

    Returns
    -------
    BoxConductance
        faces, edges, corners [W/K] (and ``total``, ``edge_corner_share``).

    Notes
    -----
    Inner-surface to outer-surface conductance :math:`G = k\\,(S_f + S_e + S_c)`:

    .. math:: S_f = \\frac{2(ab + ac + bc)}{L}, \\quad
              S_e = 0.54 \\cdot 4(a + b + c), \\quad S_c = 8 \\cdot 0.15 L

    with a, b, c the inner dimensions and L the wall thickness: the plane
    walls of the inner face areas, twelve edges of two adjoining walls
    (S = 0.54 D per edge of inner length D, valid for D > L/5, a
    :class:`~workbench._checks.ValidityWarning` otherwise) and eight corners
    of three walls (S = 0.15 L each, for L small compared with the wall's
    length and width). Isothermal inner and outer surfaces are assumed.

    References
    ----------
    ``incropera7``: 7th ed., §4.3 and Table 4.1, cases 8 and 9 (from memory).

    Examples
    --------
    >>> g = box_conductance_breakdown(0.3, 0.3, 0.3, 0.05, 0.03)
    >>> round(float(g.total), 4), round(float(g.edge_corner_share), 3)
    (0.3841, 0.157)
    """
    a, b, c, t = _box_dims(length, width, height, wall_thickness)
    kk = positive("k", k, "W/(m·K)")
    s_f, s_e, s_c = _shape_factors(a, b, c, t)
    broadcast_shape(length=a, k=kk)
    s_f, s_e, s_c, kk = broadcast(faces=s_f, edges=s_e, corners=s_c, k=kk)
    out = BoxConductance(faces=kk * s_f, edges=kk * s_e, corners=kk * s_c)
    finite_result(
        "box_conductance", (out.faces, out.edges, out.corners),
        "length", "width", "height", "wall_thickness", "k",
    )
    return out


def box_conductance(
    length: ArrayLike, width: ArrayLike, height: ArrayLike, wall_thickness: ArrayLike, k: ArrayLike
) -> float | np.ndarray:
    """Conductance of a closed box wall: faces + edges + corners.

    Parameters
    ----------
    length, width, height : float or array
        Inner dimensions of the box. [m]
    wall_thickness : float or array
        Uniform wall thickness. [m]
    k : float or array
        Conductivity of the wall. [W/(m·K)]

    Returns
    -------
    float or array
        Surface-to-surface conductance. [W/K]

    Notes
    -----
    .. math:: G = k\\left[\\frac{2(ab+ac+bc)}{L} + 0.54\\cdot 4(a+b+c) + 8\\cdot 0.15 L\\right]

    See :func:`box_conductance_breakdown` for the split and the validity
    conditions. For a box that is small compared with its wall thickness
    (inner dimensions below L/5) the shape factors do not apply.

    References
    ----------
    ``incropera7``: 7th ed., Table 4.1, cases 8 and 9 (from memory).

    Examples
    --------
    >>> round(box_conductance(0.3, 0.3, 0.3, 0.05, 0.03), 4)
    0.384
    """
    return scalar_or_array(
        box_conductance_breakdown(length, width, height, wall_thickness, k).total
    )


def layered_box_conductance(
    length: ArrayLike,
    width: ArrayLike,
    height: ArrayLike,
    thicknesses: ArrayLike,
    conductivities: ArrayLike,
    r_si: ArrayLike = 0.0,
    r_se: ArrayLike = 0.0,
) -> BoxConductance:
    """Conductance of a box whose wall is a stack of layers, with surface films.

    Parameters
    ----------
    length, width, height : float or array
        Inner dimensions of the box. [m]
    thicknesses : array
        Layer thicknesses, inside to outside, layers on the last axis. [m]
    conductivities : array
        Layer conductivities, layers on the last axis. [W/(m·K)]
    r_si, r_se : float or array
        Inside and outside surface resistances. [m²·K/W]

    Returns
    -------
    BoxConductance
        Air-to-air faces; surface-to-surface edges and corners. [W/K]

    Notes
    -----
    Faces: plane walls of the inner face areas with the full resistance

    .. math:: G_f = \\frac{2(ab+ac+bc)}{R_{si} + \\sum_j L_j/k_j + R_{se}}

    Edges and corners (approximation): the stack is replaced by one material
    of the total thickness :math:`L = \\sum_j L_j` and the equivalent
    conductivity :math:`k_{eq} = L / \\sum_j (L_j/k_j)`, and the films are
    neglected there, so :math:`G_e = 0.54\\cdot4(a+b+c)\\,k_{eq}`,
    :math:`G_c = 8\\cdot0.15\\,L\\,k_{eq}`. Neglecting the films on the
    edges and corners overstates their share slightly (conservative for heat
    gain). A highly conductive skin spreads heat along the wall and is not
    captured by k_eq; use a numerical model where the skin dominates.

    References
    ----------
    ``incropera7``: 7th ed., Table 4.1, cases 8 and 9 (from memory);
    ``iso6946-2017`` clause 6.7.1 (series sum).

    Examples
    --------
    >>> g = layered_box_conductance(0.3, 0.3, 0.3, [0.002, 0.05], [0.2, 0.03],
    ...                             r_si=0.13, r_se=0.04)
    >>> round(float(g.total), 4)
    0.3546
    """
    l_ = layers("thicknesses", positive("thicknesses", thicknesses, "m"), "m")
    k_ = layers("conductivities", positive("conductivities", conductivities, "W/(m·K)"), "W/(m·K)")
    l_, k_ = broadcast(thicknesses=l_, conductivities=k_)
    rsi = nonnegative("r_si", r_si, "m²·K/W")
    rse = nonnegative("r_se", r_se, "m²·K/W")
    broadcast_shape(
        length=positive("length", length, "m"),
        layers=l_[..., 0], r_si=rsi, r_se=rse,
    )
    total_l = l_.sum(axis=-1)
    r_layers = (l_ / k_).sum(axis=-1)
    a, b, c, t = _box_dims(length, width, height, total_l)
    k_eq = total_l / r_layers
    s_f, s_e, s_c = _shape_factors(a, b, c, t)
    faces = s_f * t / (rsi + r_layers + rse)
    faces, edges, corners = broadcast(faces=faces, edges=k_eq * s_e, corners=k_eq * s_c)
    finite_result(
        "layered_box_conductance", (faces, edges, corners),
        "length", "width", "height", "thicknesses", "conductivities", "r_si", "r_se",
    )
    return BoxConductance(faces=faces, edges=edges, corners=corners)


def _cylinder(inner_radius, thicknesses, conductivities, r_si, r_se):
    r0 = positive("inner_radius", inner_radius, "m")
    l_ = layers("thicknesses", positive("thicknesses", thicknesses, "m"), "m")
    k_ = layers("conductivities", positive("conductivities", conductivities, "W/(m·K)"), "W/(m·K)")
    l_, k_ = broadcast(thicknesses=l_, conductivities=k_)
    rsi = nonnegative("r_si", r_si, "m²·K/W")
    rse = nonnegative("r_se", r_se, "m²·K/W")
    broadcast_shape(inner_radius=r0, layers=l_[..., 0], r_si=rsi, r_se=rse)
    radii = np.asarray(r0)[..., None] + np.concatenate(
        [np.zeros(l_.shape[:-1] + (1,)), np.cumsum(l_, axis=-1)], axis=-1
    )
    r_out = radii[..., -1]
    r_cond = (np.log(radii[..., 1:] / radii[..., :-1]) / (2.0 * np.pi * k_)).sum(axis=-1)
    total = rsi / (2.0 * np.pi * r0) + r_cond + rse / (2.0 * np.pi * r_out)
    finite_result(
        "cylinder_resistance_per_length", total,
        "inner_radius", "thicknesses", "conductivities", "r_si", "r_se",
    )
    critical = k_[..., -1] * rse  # k/h with h = 1/r_se
    if np.any((rse > 0) & (r_out < critical)):
        warnings.warn(
            "cylinder: the outer radius is below the critical insulation radius k/h of the "
            "outermost layer; there, adding that insulation increases the heat loss",
            ValidityWarning,
            stacklevel=3,
        )
    return total


def cylinder_resistance_per_length(
    inner_radius: ArrayLike,
    thicknesses: ArrayLike,
    conductivities: ArrayLike,
    r_si: ArrayLike = 0.0,
    r_se: ArrayLike = 0.0,
) -> float | np.ndarray:
    """Thermal resistance per unit length of a layered cylindrical wall (pipe, tube, can).

    Parameters
    ----------
    inner_radius : float or array
        Inner radius of the first layer. [m]
    thicknesses : array
        Layer thicknesses, inside to outside, layers on the last axis. [m]
    conductivities : array
        Layer conductivities, layers on the last axis. [W/(m·K)]
    r_si, r_se : float or array
        Surface resistances per unit area at the inner and outer surface
        (1/h). [m²·K/W]

    Returns
    -------
    float or array
        R'. [m·K/W]

    Notes
    -----
    With :math:`r_0` the inner radius and :math:`r_j = r_0 + \\sum_{i \\le j} L_i`:

    .. math:: R' = \\frac{R_{si}}{2\\pi r_0} + \\sum_j \\frac{\\ln(r_j/r_{j-1})}{2\\pi k_j}
              + \\frac{R_{se}}{2\\pi r_n}

    A :class:`~workbench._checks.ValidityWarning` flags an outer radius below
    the critical insulation radius of the outermost layer (see
    :func:`critical_insulation_radius`).

    References
    ----------
    ``incropera7``: 7th ed., §3.3.1, Eqs. 3.33 and 3.34 (from memory).

    Examples
    --------
    >>> round(cylinder_resistance_per_length(0.01, [0.02], [0.04]), 4)
    4.3713
    """
    return scalar_or_array(_cylinder(inner_radius, thicknesses, conductivities, r_si, r_se))


def cylinder_conductance(
    inner_radius: ArrayLike,
    thicknesses: ArrayLike,
    conductivities: ArrayLike,
    length: ArrayLike,
    r_si: ArrayLike = 0.0,
    r_se: ArrayLike = 0.0,
) -> float | np.ndarray:
    """Conductance of a layered cylindrical wall of a given length (end effects neglected).

    Parameters
    ----------
    inner_radius : float or array
        Inner radius. [m]
    thicknesses, conductivities : array
        Layers on the last axis. [m], [W/(m·K)]
    length : float or array
        Axial length. [m]
    r_si, r_se : float or array
        Inner and outer surface resistances per area. [m²·K/W]

    Returns
    -------
    float or array
        G = length / R'. [W/K]

    Notes
    -----
    .. math:: G = \\ell / R'

    with R' from :func:`cylinder_resistance_per_length`; the ends are not
    included (add them as plane walls).

    References
    ----------
    ``incropera7``: 7th ed., §3.3.1 (from memory).

    Examples
    --------
    >>> round(cylinder_conductance(0.01, [0.02], [0.04], 2.0), 4)
    0.4575
    """
    ell = positive("length", length, "m")
    r = _cylinder(inner_radius, thicknesses, conductivities, r_si, r_se)
    broadcast_shape(length=ell, inner_radius=r)
    return finite_result(
        "cylinder_conductance", scalar_or_array(ell / r),
        "inner_radius", "thicknesses", "conductivities", "length", "r_si", "r_se",
    )


def critical_insulation_radius(k: ArrayLike, h: ArrayLike) -> float | np.ndarray:
    """Critical radius of insulation on a cylinder.

    Parameters
    ----------
    k : float or array
        Conductivity of the insulation. [W/(m·K)]
    h : float or array
        Outer surface coefficient (convection + radiation). [W/(m²·K)]

    Returns
    -------
    float or array
        r_cr = k/h; below it, adding insulation increases heat loss. [m]

    Notes
    -----
    .. math:: r_{cr} = k / h

    From :math:`dR'/dr = 0` for :math:`R' = \\ln(r/r_i)/(2\\pi k) + 1/(2\\pi r h)`.

    References
    ----------
    ``incropera7``: 7th ed., Example 3.5 (from memory).

    Examples
    --------
    >>> round(critical_insulation_radius(0.055, 5.0), 4)
    0.011
    """
    kk = positive("k", k, "W/(m·K)")
    hh = positive("h", h, "W/(m²·K)")
    kk, hh = broadcast(k=kk, h=hh)
    return finite_result("critical_insulation_radius", scalar_or_array(kk / hh), "k", "h")


def vacuum_panel_effective_conductivity(
    centre_conductivity: ArrayLike,
    thickness: ArrayLike,
    length: ArrayLike,
    width: ArrayLike,
    psi_edge: ArrayLike,
) -> float | np.ndarray:
    """Effective conductivity of a vacuum insulation panel including its edge leakage.

    Parameters
    ----------
    centre_conductivity : float or array
        Centre-of-panel conductivity (core in its envelope, away from the
        edges). [W/(m·K)]
    thickness : float or array
        Panel thickness. [m]
    length, width : float or array
        Panel size in the plane of the wall. [m]
    psi_edge : float or array
        Linear thermal transmittance of the panel edge, >= 0. [W/(m·K)]

    Returns
    -------
    float or array
        Effective conductivity of the panel as a whole. [W/(m·K)]

    Notes
    -----
    .. math:: k_{eff} = k_{cop} + \\psi \\frac{P}{A} d, \\quad P = 2(l + w),\\ A = l\\,w

    The edge conductance ψP is spread over the panel area. ψ depends mostly
    on the envelope foil and on what touches the edges: of the order of
    0.005–0.01 W/(m·K) for metallised multilayer films and several times
    more for aluminium-foil laminates (orders of magnitude from memory of the
    IEA/ECBCS Annex 39 reports; use measured values). Caution: a VIP that is
    punctured or aged loses its vacuum and k_cop rises towards that of the
    bare core (around 0.02 W/(m·K) for fumed silica, from memory); for cold
    chain use, qualify the shipper by test.

    References
    ----------
    ``iea-annex39``: IEA/ECBCS Annex 39, *Vacuum Insulation Panels — Study
    on VIP-components and Panels for Service Life Prediction* and the
    related reports (2005), approach from memory.

    Examples
    --------
    >>> round(vacuum_panel_effective_conductivity(0.004, 0.02, 0.5, 0.5, 0.008), 5)
    0.00528
    """
    k0 = positive("centre_conductivity", centre_conductivity, "W/(m·K)")
    d = positive("thickness", thickness, "m")
    a = positive("length", length, "m")
    b = positive("width", width, "m")
    psi = nonnegative("psi_edge", psi_edge, "W/(m·K)")
    k0, d, a, b, psi = broadcast(
        centre_conductivity=k0, thickness=d, length=a, width=b, psi_edge=psi
    )
    with np.errstate(over="ignore"):
        out = k0 + psi * 2.0 * (1.0 / a + 1.0 / b) * d
    return finite_result(
        "vacuum_panel_effective_conductivity", scalar_or_array(out),
        "centre_conductivity", "thickness", "length", "width", "psi_edge",
    )


@dataclass(frozen=True)
class VacuumPanel:
    """A vacuum insulation panel as a layer of a plane wall (for ``solve_wall``).

    Parameters
    ----------
    thickness : float
        Panel thickness. [m]
    centre_conductivity : float
        Centre-of-panel conductivity. [W/(m·K)]
    length, width : float
        Panel size. [m]
    psi_edge : float
        Linear thermal transmittance of the panel edge. [W/(m·K)]
    name : str
        Label for reports.

    The layer's resistance uses :func:`vacuum_panel_effective_conductivity`,
    so a panel is never compared at its centre-of-panel value alone.
    """

    thickness: float
    centre_conductivity: float
    length: float
    width: float
    psi_edge: float
    name: str = "vacuum panel"

    def __post_init__(self):
        # validates every field (ValueError naming the argument)
        for name in ("thickness", "centre_conductivity", "length", "width", "psi_edge"):
            scalar(name, getattr(self, name), "m or W/(m·K)")
        vacuum_panel_effective_conductivity(
            self.centre_conductivity, self.thickness, self.length, self.width, self.psi_edge
        )

    @property
    def conductivity(self) -> float:
        """Effective conductivity including the edges. [W/(m·K)]"""
        return float(
            vacuum_panel_effective_conductivity(
                self.centre_conductivity, self.thickness, self.length, self.width, self.psi_edge
            )
        )

    def resistance(self, t_a, t_b):
        """Resistance between the face temperatures (independent of them). [m²·K/W]"""
        shape = np.broadcast_shapes(np.shape(t_a), np.shape(t_b))
        return scalar_or_array(np.full(shape, self.thickness / self.conductivity))
