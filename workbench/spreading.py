"""Spreading (constriction) resistance: how far a wall spreads a local heat source.

A component pressed against a housing wall puts its heat into a small patch.
A wall of high in-plane conductance (aluminium) spreads it over a large area
before the surface films take it away; a thin plastic wall does not, and the
patch runs hot. This module gives

- :func:`equivalent_radius` of a rectangular footprint (circle of equal area),
- :func:`spreading_length` :math:`\\sqrt{k t / h}`, the distance over which a
  thin wall cooled on one face carries heat sideways,
- :func:`wall_biot_number` :math:`h t / k`, through-thickness Biot number,
- :func:`spreading_resistance`, the exact Fourier–Bessel series solution for a
  circular isoflux source on a circular plate with an adiabatic rim, cooled by
  a film on the opposite face (average and maximum source temperature),
  truncated with a stated error estimate,
- :func:`spreading_resistance_closed_form`, the closed-form approximation of
  Lee, Song, Au & Moran (1995) for the same problem (kept as a quick estimate
  and a cross-check; off by tens of per cent for thin walls),
- :func:`plate_resistance`, the one-dimensional part of the same model.

Pure numeric core: SI floats and numpy arrays that broadcast.

Caution: these are first-order estimates of a steady local temperature
rise. Where a touch temperature or a component limit matters, measure on the
product and follow the applicable product-safety standard.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from workbench._checks import (
    ValidityWarning,
    broadcast,
    finite_result,
    in_range,
    positive,
    scalar_or_array,
)

__all__ = [
    "equivalent_radius",
    "spreading_length",
    "wall_biot_number",
    "plate_resistance",
    "SpreadingResistance",
    "spreading_resistance",
    "spreading_resistance_closed_form",
    "SERIES_TERMS_MIN",
    "SERIES_TERMS_MAX",
    "SERIES_TOLERANCE",
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
    with np.errstate(over="ignore", under="ignore"):
        # t/(k π b²) + 1/(h π b²), divided by b twice so one extreme radius cannot overflow π b²
        r = (t / (k_ * np.pi * b) + 1.0 / (h_ * np.pi * b)) / b
    return finite_result(
        "plate_resistance", scalar_or_array(r), "plate_radius", "thickness", "k", "h"
    )


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
    truncation_error : float or array
        Estimated relative error of ``average`` and ``maximum`` from cutting the
        series (the larger of the two); 0 for the closed form, which has no
        truncation but a model error of its own. [-]
    """

    average: float | np.ndarray
    maximum: float | np.ndarray
    one_dimensional: float | np.ndarray
    psi_average: float | np.ndarray
    psi_maximum: float | np.ndarray
    relative_radius: float | np.ndarray
    relative_thickness: float | np.ndarray
    biot: float | np.ndarray
    truncation_error: float | np.ndarray = 0.0

    @property
    def total_maximum(self):
        """Source-centre temperature rise above the fluid per watt, R_1D + R_c,max. [K/W]"""
        return self.one_dimensional + self.maximum

    @property
    def total_average(self):
        """Mean source temperature rise above the fluid per watt, R_1D + R_c,avg. [K/W]"""
        return self.one_dimensional + self.average


#: Fewest and most terms of the series; the count in between follows the source and the wall.
SERIES_TERMS_MIN = 4_000
SERIES_TERMS_MAX = 200_000
#: Estimated relative truncation error above which a ValidityWarning is raised.
SERIES_TOLERANCE = 1e-3
_ROOTS: dict[str, np.ndarray] = {}


def _j1_roots(n: int) -> np.ndarray:
    """The first ``n`` positive roots of J1 (computed once, grown by doubling)."""
    roots = _ROOTS.get("j1")
    if roots is None or roots.size < n:
        size = max(n, 2 * (0 if roots is None else roots.size), SERIES_TERMS_MIN)
        from scipy import special  # imported on first use: keeps `import workbench` light

        roots = special.jn_zeros(1, size)
        _ROOTS["j1"] = roots
    return roots[:n]


def _series(eps, tau, bi, n_terms: int):
    """Dimensionless sums of the exact series, per candidate (candidates on axis 0).

    Returns ``(s_avg, s_max, err_avg, err_max)``: the sums
    :math:`\\sum_n J_1^2(\\lambda_n\\varepsilon)/(\\lambda_n^3 J_0^2(\\lambda_n)\\varphi_n)` and
    :math:`\\sum_n J_1(\\lambda_n\\varepsilon)/(\\lambda_n^2 J_0^2(\\lambda_n)\\varphi_n)` (the
    second as the mean of its partial sums over the last half of the terms), and their
    estimated truncation errors.
    """
    from scipy import special  # imported on first use: keeps `import workbench` light

    lam = _j1_roots(n_terms)
    s_avg = np.empty(eps.size)
    s_max = np.empty(eps.size)
    err_avg = np.empty(eps.size)
    err_max = np.empty(eps.size)
    chunk = max(1, int(4_000_000 // n_terms))
    j0sq = special.j0(lam) ** 2
    for lo in range(0, eps.size, chunk):
        sl = slice(lo, lo + chunk)
        e, t, b = eps[sl, None], tau[sl, None], bi[sl, None]
        th = np.tanh(lam * t)
        ratio = b / lam
        phi = (th + ratio) / (1.0 + ratio * th)
        j1 = special.j1(lam * e)
        base = 1.0 / (lam * lam * j0sq * phi)
        s_avg[sl] = np.sum(j1 * j1 * base / lam, axis=1)
        partial = np.cumsum(j1 * base, axis=1)
        half, quarter = n_terms // 2, (3 * n_terms) // 4
        s_max[sl] = partial[:, half:].mean(axis=1)
        late = partial[:, quarter:].mean(axis=1)
        # tail of the average: |term| <= 1/(eps lam^3 tanh(lam tau)) asymptotically
        # (|J1(x)|^2 <= 2/(pi x), J0^2(lam_n) ~ 2/(pi lam_n), phi >= tanh(lam tau))
        err_avg[sl] = 1.0 / (2.0 * np.pi**3 * n_terms**2 * e[:, 0] * np.tanh(lam[-1] * t[:, 0]))
        err_max[sl] = 2.0 * np.abs(late - s_max[sl])
    return s_avg, s_max, err_avg, err_max


def _terms_needed(eps: np.ndarray, tau: np.ndarray) -> int:
    """Terms to well past the modes that resolve the source radius and the wall thickness."""
    need = 200.0 / (np.pi * float(np.min(np.minimum(eps, tau))))
    return int(min(max(SERIES_TERMS_MIN, np.ceil(need)), SERIES_TERMS_MAX))


def _disc_problem(source_radius, plate_radius, thickness, k, h):
    """Checked, broadcast inputs of the disc problem and its groups ε = a/b, τ = t/b, Bi = h b/k."""
    a = positive("source_radius", source_radius, "m")
    b = positive("plate_radius", plate_radius, "m")
    t = positive("thickness", thickness, "m")
    k_ = positive("k", k, "W/(m·K)")
    h_ = positive("h", h, "W/(m²·K)")
    a, b, t, k_, h_ = broadcast(source_radius=a, plate_radius=b, thickness=t, k=k_, h=h_)
    eps = a / b
    in_range("source_radius / plate_radius", eps, 0.0, 1.0 + 1e-12, "-")
    return a, b, t, k_, h_, np.minimum(eps, 1.0), t / b, h_ * b / k_


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
        one-dimensional resistance, the dimensionless groups and the
        estimated relative truncation error.

    Warns
    -----
    ValidityWarning
        When the estimated truncation error exceeds :data:`SERIES_TOLERANCE`
        (a source or a wall thinner than the largest series can resolve:
        a/b or t/b below about 10⁻³).

    Notes
    -----
    Steady conduction in a disc (radius b, thickness t, conductivity k),
    uniform flux q over r < a on the top face, the rest of that face and the
    rim adiabatic, a film h to the fluid on the bottom face. Separation of
    variables gives, with :math:`\\lambda_n` the positive roots of
    :math:`J_1(\\lambda) = 0`, :math:`\\varepsilon = a/b`, :math:`\\tau = t/b`,
    :math:`\\mathrm{Bi} = h b/k`:

    .. math::

        \\varphi_n = \\frac{\\tanh(\\lambda_n\\tau) + \\mathrm{Bi}/\\lambda_n}
                          {1 + (\\mathrm{Bi}/\\lambda_n)\\tanh(\\lambda_n\\tau)}

        R_{c,avg} = \\frac{4 b}{\\pi k a^2}\\sum_{n\\ge1}
            \\frac{J_1^2(\\lambda_n\\varepsilon)}{\\lambda_n^3 J_0^2(\\lambda_n)\\,\\varphi_n},
        \\qquad
        R_{c,max} = \\frac{2}{\\pi k a}\\sum_{n\\ge1}
            \\frac{J_1(\\lambda_n\\varepsilon)}{\\lambda_n^2 J_0^2(\\lambda_n)\\,\\varphi_n}

    the mean and the centre temperature rise of the source above the
    one-dimensional solution, per watt; the source temperature is
    :math:`T = T_f + Q (R_{1D} + R_c)` with :math:`R_{1D}` from
    :func:`plate_resistance`, and :math:`\\psi = \\sqrt{\\pi}\\,k\\,a\\,R_c`.

    Truncation: the series is summed to N terms, N from
    :data:`SERIES_TERMS_MIN` to :data:`SERIES_TERMS_MAX`, well past the modes
    that resolve the source (:math:`\\lambda\\varepsilon \\gg 1`) and the wall
    (:math:`\\lambda\\tau \\gg 1`). The terms of the average fall as
    :math:`\\lambda^{-3}`; with :math:`J_1^2(x) \\le 2/(\\pi x)`,
    :math:`J_0^2(\\lambda_n) \\approx 2/(\\pi\\lambda_n)` and
    :math:`\\varphi_n \\ge \\tanh(\\lambda_n\\tau)` its tail is at most about
    :math:`1/(2\\pi^3 N^2 \\varepsilon \\tanh(\\lambda_N\\tau))` (asymptotic
    estimate). The centre value's terms oscillate and fall only as
    :math:`\\lambda^{-3/2}`: it is taken as the mean of its partial sums over
    the last N/2 terms (a partial-sum limit that cancels the oscillation,
    10 to 100 times closer than the last partial sum), with twice the
    distance between that mean and the mean over the last N/4 terms as its
    error estimate.
    ``truncation_error`` reports the larger relative estimate.

    Limits: a thick plate (:math:`\\tau \\to \\infty`) gives the semi-infinite
    flux tube, independent of h; a small source on it gives the half-space
    values :math:`R_{c,avg} \\to 8/(3\\pi^2 k a)` and
    :math:`R_{c,max} \\to 1/(\\pi k a)` (Carslaw & Jaeger). The tests check the
    series against a published worked value for the flux tube, the
    half-space limits and a finite-volume solution of the same problem.

    References
    ----------
    ``yovanovich-culham-teertstra-1998``: Yovanovich M. M., Culham J. R.,
    Teertstra P., Analytical modeling of spreading resistance in flux tubes,
    half spaces and compound disks, IEEE Trans. CPMT-A 21(1), 1998,
    pp. 168–176 (the series solution for the isoflux disc on a disc with a
    film on its far face; derived here by separation of variables and checked
    numerically, not copied). ``carslaw-jaeger-1959`` for the half-space limits.

    Examples
    --------
    >>> r = spreading_resistance(0.002, 0.1, 0.001, 1.0, 40.0)   # thin plastic wall
    >>> round(float(r.average), 1), round(float(r.maximum), 1)
    (242.5, 280.9)
    >>> r_al = spreading_resistance(0.0028, 0.165, 0.0025, 167.0, 9.3)
    >>> round(float(r_al.average), 3)
    1.509
    >>> bool(r.truncation_error < 1e-4)
    True
    """
    a, b, t, k_, h_, eps, tau, bi = _disc_problem(source_radius, plate_radius, thickness, k, h)
    shape = eps.shape
    e1, t1, b1 = (np.ascontiguousarray(v, dtype=float).ravel() for v in (eps, tau, bi))
    n_terms = _terms_needed(e1, t1) if e1.size else SERIES_TERMS_MIN
    # far outside any physical range (a source of 1e-300 m) the sums under- or overflow;
    # finite_result below then names the arguments instead of returning inf or NaN
    with np.errstate(over="ignore", divide="ignore", invalid="ignore", under="ignore"):
        s_avg, s_max, err_avg, err_max = _series(e1, t1, b1, n_terms)
        rel = np.maximum(err_avg / np.maximum(s_avg, 1e-300),
                         err_max / np.maximum(np.abs(s_max), 1e-300))
    rel = np.where(e1 >= 1.0, 0.0, rel)  # a source over the whole plate: nothing to spread
    if np.any(rel > SERIES_TOLERANCE):
        worst = float(np.max(rel))
        warnings.warn(
            f"spreading_resistance: series truncated at {n_terms} terms leaves an estimated "
            f"relative error up to {worst:.1e} (source_radius/plate_radius or "
            f"thickness/plate_radius below about 1e-3)",
            ValidityWarning,
            stacklevel=2,
        )
    s_avg, s_max, rel = (v.reshape(shape) for v in (s_avg, s_max, rel))
    with np.errstate(over="ignore", divide="ignore", invalid="ignore", under="ignore"):
        r_avg = np.where(eps >= 1.0, 0.0, 4.0 * b * s_avg / (np.pi * k_ * a * a))
        r_max = np.where(eps >= 1.0, 0.0, 2.0 * s_max / (np.pi * k_ * a))
    scale = np.sqrt(np.pi) * k_ * a
    r_avg, r_max, bi, rel = finite_result(
        "spreading_resistance", (r_avg, r_max, bi, rel),
        "source_radius", "plate_radius", "thickness", "k", "h",
    )
    return SpreadingResistance(
        average=scalar_or_array(r_avg),
        maximum=scalar_or_array(r_max),
        one_dimensional=plate_resistance(b, t, k_, h_),
        psi_average=scalar_or_array(r_avg * scale),
        psi_maximum=scalar_or_array(r_max * scale),
        relative_radius=scalar_or_array(eps),
        relative_thickness=scalar_or_array(tau),
        biot=scalar_or_array(bi),
        truncation_error=scalar_or_array(rel),
    )


def spreading_resistance_closed_form(
    source_radius: ArrayLike,
    plate_radius: ArrayLike,
    thickness: ArrayLike,
    k: ArrayLike,
    h: ArrayLike,
) -> SpreadingResistance:
    """Closed-form approximation of :func:`spreading_resistance` (Lee et al. 1995).

    Parameters
    ----------
    source_radius, plate_radius, thickness, k, h : float or array
        As for :func:`spreading_resistance`: source radius a, plate radius b,
        thickness t [m], conductivity [W/(m·K)], film on the far face [W/(m²·K)].

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
    >>> r = spreading_resistance_closed_form(0.01, 0.05, 0.002, 0.2, 10.0)
    >>> round(r.maximum, 1)
    214.0
    >>> r_al = spreading_resistance_closed_form(0.01, 0.05, 0.002, 167.0, 10.0)
    >>> round(r_al.maximum, 2)
    0.65
    """
    a, b, t, k_, h_, eps, tau, bi = _disc_problem(source_radius, plate_radius, thickness, k, h)
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
