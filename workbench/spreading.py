"""Spreading (constriction) resistance: how far a wall spreads a local heat source.

A component pressed against a housing wall puts its heat into a small patch.
A wall of high in-plane conductance (aluminium) spreads it over a large area
before the surface films take it away; a thin plastic wall does not, and the
patch runs hot. This module gives

- :func:`equivalent_radius` of a rectangular footprint (circle of equal area),
- :func:`spreading_length` :math:`\\sqrt{k t / h}`, the distance over which a
  thin wall cooled on one face carries heat sideways,
- :func:`wall_biot_number` :math:`h t / k`, through-thickness Biot number,
- :func:`spreading_resistance`, the closed-form estimate of Lee, Song, Au &
  Moran (1995) for a circular isoflux source on a circular plate cooled by a
  film on the opposite face (average and maximum source temperature),
- :func:`plate_resistance`, the one-dimensional part of the same model.

Pure numeric core: SI floats and numpy arrays that broadcast.

Caution: these are first-order estimates of a steady local temperature
rise. Where a touch temperature or a component limit matters, measure on the
product and follow the applicable product-safety standard.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from workbench._checks import broadcast, in_range, positive, scalar_or_array

__all__ = [
    "equivalent_radius",
    "spreading_length",
    "wall_biot_number",
    "plate_resistance",
    "SpreadingResistance",
    "spreading_resistance",
]


def equivalent_radius(area: ArrayLike) -> float | np.ndarray:
    """Radius of the circle with the same area as a footprint.

    Parameters
    ----------
    area : float or array
        Footprint area (e.g. length × width of a rectangular source). [m²]

    Returns
    -------
    float or array
        :math:`a = \\sqrt{A/\\pi}`. [m]

    Notes
    -----
    .. math:: a = \\sqrt{A / \\pi}

    The equal-area circle is the usual way to apply circular spreading
    solutions to square and near-square sources; for sources with an aspect
    ratio above about 2 it underestimates the spreading less well (rectangular
    solutions exist; not used here).

    References
    ----------
    ``lee-song-au-moran-1995``: the equivalent-area circle used with their
    model (from memory).

    Examples
    --------
    >>> round(equivalent_radius(0.02 * 0.02), 5)
    0.01128
    """
    a = positive("area", area, "m²")
    return scalar_or_array(np.sqrt(a / np.pi))


def spreading_length(k: ArrayLike, thickness: ArrayLike, h: ArrayLike) -> float | np.ndarray:
    """Distance over which a thin wall cooled on one face spreads heat sideways.

    Parameters
    ----------
    k : float or array
        In-plane thermal conductivity of the wall. [W/(m·K)]
    thickness : float or array
        Wall thickness. [m]
    h : float or array
        Film coefficient on the cooled face (convection + radiation). [W/(m²·K)]

    Returns
    -------
    float or array
        :math:`L_s = \\sqrt{k t / h}`. [m]

    Notes
    -----
    .. math:: L_s = \\sqrt{\\frac{k\\,t}{h}}

    The decay length of the thin-fin equation
    :math:`k t \\nabla^2\\theta = h\\theta` (the 1/m of a fin, Incropera 7th
    ed. Eq. 3.69 with perimeter/area of a plate cooled on one face). A local
    source of radius well below :math:`L_s` is spread over a patch of about
    :math:`L_s`; a source much larger than :math:`L_s` is not spread at all.

    References
    ----------
    ``incropera7``: 7th ed., §3.6 (fin equation, from memory).

    Examples
    --------
    >>> round(spreading_length(0.2, 0.002, 10.0), 5)
    0.00632
    >>> round(spreading_length(167.0, 0.002, 10.0), 3)
    0.183
    """
    k_ = positive("k", k, "W/(m·K)")
    t = positive("thickness", thickness, "m")
    h_ = positive("h", h, "W/(m²·K)")
    broadcast(k=k_, thickness=t, h=h_)
    return scalar_or_array(np.sqrt(k_ * t / h_))


def wall_biot_number(h: ArrayLike, thickness: ArrayLike, k: ArrayLike) -> float | np.ndarray:
    """Through-thickness Biot number of a wall.

    Parameters
    ----------
    h : float or array
        Film coefficient on the cooled face. [W/(m²·K)]
    thickness : float or array
        Wall thickness. [m]
    k : float or array
        Through-thickness conductivity. [W/(m·K)]

    Returns
    -------
    float or array
        :math:`\\mathrm{Bi} = h t / k`. [-]

    Notes
    -----
    .. math:: \\mathrm{Bi} = \\frac{h\\,t}{k}

    Ratio of the wall's conduction resistance to the film resistance. Below
    about 0.1 the wall is thermally thin: its conductivity barely changes the
    mean surface temperature (the films decide).

    References
    ----------
    ``incropera7``: 7th ed., Eq. 5.9 (from memory).

    Examples
    --------
    >>> round(wall_biot_number(10.0, 0.002, 0.2), 3)
    0.1
    """
    h_ = positive("h", h, "W/(m²·K)")
    t = positive("thickness", thickness, "m")
    k_ = positive("k", k, "W/(m·K)")
    broadcast(h=h_, thickness=t, k=k_)
    return scalar_or_array(h_ * t / k_)


def plate_resistance(
    plate_radius: ArrayLike, thickness: ArrayLike, k: ArrayLike, h: ArrayLike
) -> float | np.ndarray:
    """One-dimensional resistance of a disc plate and its film.

    Parameters
    ----------
    plate_radius : float or array
        Plate radius b. [m]
    thickness : float or array
        Plate thickness t. [m]
    k : float or array
        Plate conductivity. [W/(m·K)]
    h : float or array
        Film coefficient on the cooled face. [W/(m²·K)]

    Returns
    -------
    float or array
        :math:`R_{1D} = t/(k\\pi b^2) + 1/(h\\pi b^2)`. [K/W]

    Notes
    -----
    .. math:: R_{1D} = \\frac{t}{k \\pi b^2} + \\frac{1}{h \\pi b^2}

    References
    ----------
    ``lee-song-au-moran-1995``: the one-dimensional part of their total
    resistance (from memory).

    Examples
    --------
    >>> round(plate_resistance(0.05, 0.002, 0.2, 10.0), 3)
    14.006
    """
    b = positive("plate_radius", plate_radius, "m")
    t = positive("thickness", thickness, "m")
    k_ = positive("k", k, "W/(m·K)")
    h_ = positive("h", h, "W/(m²·K)")
    broadcast(plate_radius=b, thickness=t, k=k_, h=h_)
    area = np.pi * b * b
    return scalar_or_array(t / (k_ * area) + 1.0 / (h_ * area))


@dataclass(frozen=True)
class SpreadingResistance:
    """Result of :func:`spreading_resistance` (arrays broadcast over the inputs).

    Attributes
    ----------
    average : float or array
        Constriction resistance to the mean source temperature. [K/W]
    maximum : float or array
        Constriction resistance to the maximum (centre) source temperature. [K/W]
    one_dimensional : float or array
        :func:`plate_resistance` of the same plate. [K/W]
    psi_average, psi_maximum : float or array
        Dimensionless :math:`\\psi = \\sqrt{\\pi}\\,k\\,a\\,R_c`. [-]
    relative_radius, relative_thickness, biot : float or array
        :math:`\\varepsilon = a/b`, :math:`\\tau = t/b`, :math:`\\mathrm{Bi} = h b/k`. [-]
    """

    average: float | np.ndarray
    maximum: float | np.ndarray
    one_dimensional: float | np.ndarray
    psi_average: float | np.ndarray
    psi_maximum: float | np.ndarray
    relative_radius: float | np.ndarray
    relative_thickness: float | np.ndarray
    biot: float | np.ndarray

    @property
    def total_maximum(self):
        """Source-centre temperature rise above the fluid per watt, R_1D + R_c,max. [K/W]"""
        return self.one_dimensional + self.maximum

    @property
    def total_average(self):
        """Mean source temperature rise above the fluid per watt, R_1D + R_c,avg. [K/W]"""
        return self.one_dimensional + self.average


def spreading_resistance(
    source_radius: ArrayLike,
    plate_radius: ArrayLike,
    thickness: ArrayLike,
    k: ArrayLike,
    h: ArrayLike,
) -> SpreadingResistance:
    """Constriction resistance of a circular source on a plate cooled on its far face.

    Parameters
    ----------
    source_radius : float or array
        Radius a of the heated circle (use :func:`equivalent_radius` for a
        rectangular footprint), 0 < a <= b. [m]
    plate_radius : float or array
        Radius b of the plate; its rim is adiabatic. [m]
    thickness : float or array
        Plate thickness t. [m]
    k : float or array
        Plate conductivity (isotropic). [W/(m·K)]
    h : float or array
        Uniform film coefficient on the face opposite the source; the rest of
        the source face is adiabatic. [W/(m²·K)]

    Returns
    -------
    SpreadingResistance
        ``average`` and ``maximum`` constriction resistances [K/W], the
        one-dimensional resistance and the dimensionless groups.

    Notes
    -----
    Uniform heat flux over the source. With :math:`\\varepsilon = a/b`,
    :math:`\\tau = t/b`, :math:`\\mathrm{Bi} = h b / k` (from memory of Lee,
    Song, Au & Moran 1995):

    .. math::

        \\lambda_c = \\pi + \\frac{1}{\\sqrt{\\pi}\\,\\varepsilon}, \\qquad
        \\phi_c = \\frac{\\tanh(\\lambda_c\\tau) + \\lambda_c/\\mathrm{Bi}}
                       {1 + (\\lambda_c/\\mathrm{Bi})\\tanh(\\lambda_c\\tau)}

        \\psi_{avg} = \\tfrac12 (1-\\varepsilon)^{3/2}\\phi_c, \\qquad
        \\psi_{max} = \\frac{1}{\\sqrt{\\pi}} (1-\\varepsilon)\\phi_c, \\qquad
        R_c = \\frac{\\psi}{\\sqrt{\\pi}\\,k\\,a}

    The source temperature is then
    :math:`T = T_f + Q (R_{1D} + R_c)` with :math:`R_{1D}` from
    :func:`plate_resistance`; the paper writes the maximum as
    :math:`\\psi_{max} = \\varepsilon\\tau/\\sqrt{\\pi} + (1-\\varepsilon)\\phi_c/\\sqrt{\\pi}`
    with the conduction part of :math:`R_{1D}` folded in (the same thing).
    Limits: :math:`\\varepsilon \\to 1` gives :math:`R_c \\to 0` (no
    spreading); a small source on a thick plate gives :math:`\\phi_c \\to 1`
    and :math:`R_{c,max} \\to 1/(\\pi k a)`, the centre temperature of an
    isoflux disc on a half-space (Carslaw & Jaeger), and
    :math:`R_{c,avg} \\to 1/(2\\sqrt{\\pi} k a)` (the exact isoflux mean is
    :math:`8/(3\\pi^2 k a)`, 4.5 % lower). The model approximates the
    exact Fourier–Bessel series solution of the same problem to within a few
    per cent over the range of practical interest; the tests compare it with
    that series.

    References
    ----------
    ``lee-song-au-moran-1995``: Lee S., Song S., Au V., Moran K. P.,
    Constriction/spreading resistance model for electronics packaging,
    ASME/JSME Thermal Engineering Joint Conference, 1995 (equations from
    memory).

    Examples
    --------
    >>> r = spreading_resistance(0.01, 0.05, 0.002, 0.2, 10.0)
    >>> round(r.maximum, 1)
    214.0
    >>> r_al = spreading_resistance(0.01, 0.05, 0.002, 167.0, 10.0)
    >>> round(r_al.maximum, 2)
    0.65
    """
    a = positive("source_radius", source_radius, "m")
    b = positive("plate_radius", plate_radius, "m")
    t = positive("thickness", thickness, "m")
    k_ = positive("k", k, "W/(m·K)")
    h_ = positive("h", h, "W/(m²·K)")
    a, b, t, k_, h_ = broadcast(source_radius=a, plate_radius=b, thickness=t, k=k_, h=h_)
    eps = a / b
    in_range("source_radius / plate_radius", eps, 0.0, 1.0 + 1e-12, "-")
    eps = np.minimum(eps, 1.0)
    tau = t / b
    bi = h_ * b / k_
    lam = np.pi + 1.0 / (np.sqrt(np.pi) * eps)
    th = np.tanh(lam * tau)
    lb = lam / bi
    phi = (th + lb) / (1.0 + lb * th)
    psi_avg = 0.5 * (1.0 - eps) ** 1.5 * phi
    psi_max = (1.0 - eps) * phi / np.sqrt(np.pi)
    scale = np.sqrt(np.pi) * k_ * a
    return SpreadingResistance(
        average=scalar_or_array(psi_avg / scale),
        maximum=scalar_or_array(psi_max / scale),
        one_dimensional=plate_resistance(b, t, k_, h_),
        psi_average=scalar_or_array(psi_avg),
        psi_maximum=scalar_or_array(psi_max),
        relative_radius=scalar_or_array(eps),
        relative_thickness=scalar_or_array(tau),
        biot=scalar_or_array(bi),
    )
