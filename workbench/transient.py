"""Hold time of an insulated shipper: coolant, payload and box wall over time.

Two models, one energy balance:

- :func:`hold_time` — the closed-form cases: one lumped inside node (coolant
  at its phase-change temperature plus the payload's heat capacity) behind a
  box conductance, ambient constant or a step profile. Solved exactly segment
  by segment (linear while the coolant changes phase, exponential otherwise).
- :func:`simulate_hold` — the general case, time-stepped and vectorised over
  design variants (numpy over variants, a loop over time steps): a coolant
  node (sensible solid → latent → sensible liquid, by its specific enthalpy)
  and a payload node (payload + inside air + inner packaging) joined by a
  coupling conductance, with the box conductance split between them. Each
  step is the exact solution of the linear two-node system with the
  coolant's capacity of its current state (infinite while it changes phase),
  so the step is stable for any step length and conserves energy to
  round-off.
- Sizing: :func:`coolant_mass_for_duration`, :func:`max_conductance_for_duration`,
  :func:`thickness_for_duration` (vectorised monotone bisection).

Ambient input ``t_ambient``: a temperature [K] or a step profile, either a
tuple of columns ``(times_s, temperatures_K)`` or rows ``[[time_s,
temperature_K], ...]`` (a list of lists or an N×2 array); see
:func:`ambient_profile`. Times start at 0 and increase strictly;
``temperatures_K[i]`` holds from ``times_s[i]`` to ``times_s[i+1]`` and the
last value holds for ever.

Work limits (checked before computing, raised as ``ValueError`` with the way
out): :data:`MAX_STEPS` time steps per variant, :data:`MAX_CELLS` variants ×
steps and :data:`MAX_STORED` stored values per series in
:func:`simulate_hold`; :data:`MAX_PROFILE_POINTS` profile points. Each can be
raised for one call by a keyword argument.

Caution: a hold time from these models is a design estimate. Packaging for
medicines and other temperature-sensitive goods is qualified by testing
(thermal chamber and field trials) under the applicable distribution rules;
frozen water-based packs can freeze a 2–8 °C payload; dry ice gives off CO2
gas (never a gas-tight box; ventilate; dangerous goods for air transport).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np

from workbench._checks import (
    Cancelled,
    broadcast,
    broadcast_shape,
    finite,
    in_range,
    nonnegative,
    positive,
    scalar_or_array,
)

__all__ = [
    "REASONS",
    "PAYLOAD_RANGES",
    "MAX_STEPS",
    "MAX_CELLS",
    "MAX_STORED",
    "MAX_PROFILE_POINTS",
    "AMBIENT_RANGE",
    "TEMPERATURE_RANGE",
    "ambient_profile",
    "mean_ambient",
    "hold_time",
    "HoldSimulation",
    "simulate_hold",
    "coolant_mass_for_duration",
    "max_conductance_for_duration",
    "thickness_for_duration",
]

#: A float, a sequence of floats or an array (broadcasting).
ArrayLike = float | Sequence[float] | np.ndarray
#: A constant temperature [K] or a step profile: columns (times_s [s],
#: temperatures_K [K]) as a tuple, or rows [[time_s, temperature_K], ...].
AmbientLike = (
    float
    | tuple[Sequence[float] | np.ndarray, Sequence[float] | np.ndarray]
    | Sequence[Sequence[float]]
    | np.ndarray
)

#: Usual payload temperature ranges (min, max) [K]; ``None``: no limit on that
#: side. Common-practice labels of the cold chain; the product's own labelling
#: and the applicable distribution rules decide.
PAYLOAD_RANGES = MappingProxyType(
    {
        "2-8 °C (refrigerated)": (275.15, 281.15),
        "15-25 °C (controlled room temperature)": (288.15, 298.15),
        "frozen, -15 °C or colder": (None, 258.15),
        "deep frozen, -60 °C or colder": (None, 213.15),
    }
)

#: Most time steps per variant in one :func:`simulate_hold` call (``max_steps=`` raises it).
MAX_STEPS = 1_000_000
#: Most variants × time steps in one :func:`simulate_hold` call (``max_cells=`` raises it).
MAX_CELLS = 100_000_000
#: Most stored values per series (variants × stored times) in one
#: :func:`simulate_hold` call, about 80 MB each (``max_stored=`` raises it).
MAX_STORED = 10_000_000
#: Most points of an ambient profile.
MAX_PROFILE_POINTS = 100_000
#: Plausible ambient temperatures around a shipper, −100 … +100 °C. [K]
AMBIENT_RANGE = (173.15, 373.15)
#: Plausible temperatures of coolant and payload (liquid nitrogen at 77 K to
#: well above any payload); catches °C given as K. [K]
TEMPERATURE_RANGE = (50.0, 1000.0)

#: Why a simulated hold ended.
REASONS: tuple[str, ...] = (
    "coolant spent",
    "payload too warm",
    "payload too cold",
    "held for the whole run",
)


# ---------------------------------------------------------------------------
# Ambient profiles
# ---------------------------------------------------------------------------
def _values(name: str, value, unit: str, check=positive) -> np.ndarray:
    """``check`` (positive, nonnegative, finite) and refuse an empty array."""
    arr = check(name, value, unit)
    if arr.size == 0:
        raise ValueError(f"{name}: empty; give at least one value [{unit}]")
    return arr


def _scalar(name: str, value, unit: str, check=positive) -> float:
    """One number: ``check`` it and refuse arrays of other than one element."""
    arr = check(name, value, unit)
    if arr.size != 1:
        raise ValueError(f"{name}: expected one number [{unit}], got an array of shape {arr.shape}")
    return float(arr.reshape(()))


def _count(name: str, value, what: str) -> int:
    """A positive integer (not a boolean)."""
    if isinstance(value, bool | np.bool_) or not isinstance(value, int | np.integer) or value < 1:
        raise ValueError(f"{name}: expected a positive whole number ({what}), got {value!r:.60}")
    return int(value)


def _temperature(name: str, value, limits: tuple[float, float] = TEMPERATURE_RANGE) -> np.ndarray:
    """Absolute temperatures [K] within ``limits``; the message names the first bad element."""
    arr = _values(name, value, "K", finite)
    lo, hi = limits
    bad = (arr < lo) | (arr > hi)
    if np.any(bad):
        idx = np.argwhere(np.atleast_1d(bad))[0]
        where = f" at index {tuple(int(i) for i in idx)}" if arr.ndim else ""
        got = float(np.atleast_1d(arr)[tuple(idx)])
        raise ValueError(
            f"{name}: must lie in [{lo:g}, {hi:g}] K, got {got:g} K{where}; temperatures are "
            "absolute, in kelvin (°C + 273.15)"
        )
    return arr


def ambient_profile(t_ambient: AmbientLike) -> tuple[np.ndarray, np.ndarray]:
    """Validate an ambient temperature or step profile.

    Parameters
    ----------
    t_ambient : float, tuple of two sequences, list of rows or N×2 array
        A constant temperature [K]; or a step profile given either as a
        **tuple of columns** ``(times_s, temperatures_K)`` (two 1-D
        sequences of equal length) or as **rows** ``[[time_s,
        temperature_K], ...]`` (a list of lists, or an ndarray of shape
        (N, 2)). A 2×2 input is read by its type: a tuple is columns, a
        list or ndarray is rows. Times [s] start at 0 and increase strictly
        (sorted, no repeated time); each temperature [K] holds from its time
        to the next (the last one for ever). Temperatures lie in
        :data:`AMBIENT_RANGE`; at most :data:`MAX_PROFILE_POINTS` points.

    Returns
    -------
    (ndarray, ndarray)
        Times [s] and temperatures [K], equal lengths, at least one point.

    Notes
    -----
    Step (zero-order hold) profile: :math:`T_a(t) = T_i` for
    :math:`t_i \\le t < t_{i+1}`.

    References
    ----------
    Definition of this module (``demo`` profiles in the notebooks).

    Examples
    --------
    >>> ambient_profile(300.0)
    (array([0.]), array([300.]))
    >>> ambient_profile(([0, 3600], [303.15, 293.15]))[1]
    array([303.15, 293.15])

    The same profile as rows:

    >>> ambient_profile([[0, 303.15], [3600, 293.15]])[1]
    array([303.15, 293.15])
    """
    if isinstance(t_ambient, tuple):
        if len(t_ambient) != 2:
            raise ValueError(
                f"t_ambient: a tuple must be (times_s, temperatures_K), two sequences; got "
                f"{len(t_ambient)} items (for rows [[time_s, temperature_K], ...] give a list)"
            )
        times = finite("t_ambient times_s", t_ambient[0], "s")
        temps = finite("t_ambient temperatures_K", t_ambient[1], "K")
        if times.ndim != 1 or temps.ndim != 1:
            raise ValueError(
                "t_ambient: a tuple (times_s, temperatures_K) needs two 1-D sequences [s], [K]; got "
                f"shapes {times.shape} and {temps.shape} (for rows [[time_s, temperature_K], ...] "
                "give a list)"
            )
        if times.size != temps.size:
            raise ValueError(
                f"t_ambient: times_s has {times.size} values, temperatures_K {temps.size}; they must match"
            )
    elif isinstance(t_ambient, list) or (isinstance(t_ambient, np.ndarray) and t_ambient.ndim != 0):
        rows = finite("t_ambient", t_ambient, "rows [time s, temperature K]")
        if rows.ndim != 2 or rows.shape[1] != 2:
            raise ValueError(
                "t_ambient: a list or array is read as rows [[time_s, temperature_K], ...] "
                f"(shape N×2); got shape {rows.shape} (for columns give a tuple (times_s, temperatures_K))"
            )
        times, temps = rows[:, 0].copy(), rows[:, 1].copy()
    else:
        temp = _temperature("t_ambient", t_ambient, AMBIENT_RANGE)
        if temp.ndim != 0:
            raise ValueError(
                "t_ambient: expected a temperature [K] or a step profile: a tuple (times_s, "
                "temperatures_K) or rows [[time_s, temperature_K], ...]"
            )
        return np.zeros(1), temp.reshape(1)
    if times.size == 0:
        raise ValueError("t_ambient times_s: the profile is empty; give at least one point [s]")
    if times.size > MAX_PROFILE_POINTS:
        raise ValueError(
            f"t_ambient: {times.size} profile points; the limit is {MAX_PROFILE_POINTS} "
            "(MAX_PROFILE_POINTS): merge steps of equal temperature or resample the profile coarser"
        )
    if times[0] != 0.0:
        raise ValueError(f"t_ambient times_s: row 0 must be at 0 s (got {times[0]:g} s)")
    step = np.diff(times)
    if np.any(step <= 0):
        i = int(np.argmax(step <= 0)) + 1
        what = "repeats" if step[i - 1] == 0 else "is earlier than"
        raise ValueError(
            f"t_ambient times_s: row {i} (counting from 0) at {times[i]:g} s {what} row {i - 1} "
            f"at {times[i - 1]:g} s; the profile's times must increase strictly (sorted, no "
            "repeated time) [s]"
        )
    bad = (temps < AMBIENT_RANGE[0]) | (temps > AMBIENT_RANGE[1])
    if np.any(bad):
        i = int(np.argmax(bad))
        raise ValueError(
            f"t_ambient temperatures_K: row {i} (counting from 0) is {temps[i]:g} K, outside "
            f"[{AMBIENT_RANGE[0]:g}, {AMBIENT_RANGE[1]:g}] K (−100 … +100 °C); temperatures are "
            "absolute, in kelvin; columns go in a tuple (times_s, temperatures_K), rows in a list "
            "[[time_s, temperature_K], ...]"
        )
    return times, temps


def _integral(times: np.ndarray, temps: np.ndarray, t) -> np.ndarray:
    """∫_0^t T_a dt' of a step profile. [K·s]"""
    t = np.asarray(t, float)
    cum = np.concatenate([[0.0], np.cumsum(temps[:-1] * np.diff(times))])
    i = np.clip(np.searchsorted(times, t, side="right") - 1, 0, None)
    return cum[i] + temps[i] * (t - times[i])


def mean_ambient(
    t_ambient: AmbientLike, t_start: ArrayLike, t_end: ArrayLike
) -> float | np.ndarray:
    """Time-mean ambient temperature of a step profile between two times.

    Parameters
    ----------
    t_ambient : float or (array, array)
        Temperature [K] or step profile, see :func:`ambient_profile`.
    t_start, t_end : float or array
        Interval, ``t_end > t_start >= 0``. [s]

    Returns
    -------
    float or array
        :math:`\\frac{1}{t_1 - t_0}\\int_{t_0}^{t_1} T_a\\,dt`. [K]

    Notes
    -----
    Exact for the step profile (sum of rectangles).

    References
    ----------
    Definition (common practice).

    Examples
    --------
    >>> mean_ambient(([0.0, 10.0], [300.0, 280.0]), 5.0, 15.0)
    290.0
    """
    times, temps = ambient_profile(t_ambient)
    t0 = _values("t_start", t_start, "s", nonnegative)
    t1 = _values("t_end", t_end, "s")
    t0, t1 = broadcast(t_start=t0, t_end=t1)
    if np.any(t1 <= t0):
        raise ValueError("t_end: must be later than t_start [s]")
    return scalar_or_array((_integral(times, temps, t1) - _integral(times, temps, t0)) / (t1 - t0))


# ---------------------------------------------------------------------------
# Closed form: one lumped node
# ---------------------------------------------------------------------------
def _safe_log_ratio(num: np.ndarray, den: np.ndarray, ok: np.ndarray) -> np.ndarray:
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(ok, num / np.where(ok, den, 1.0), 1.0)
        return np.log(np.where(ok & (r > 0), r, 1.0))


def hold_time(
    conductance: ArrayLike,
    t_ambient: AmbientLike,
    coolant_mass: ArrayLike,
    latent_heat: ArrayLike,
    t_phase_change: ArrayLike,
    payload_heat_capacity: ArrayLike = 0.0,
    t_payload_start: ArrayLike | None = None,
    t_payload_max: ArrayLike | None = None,
) -> float | np.ndarray:
    """Hold time of a shipper with one lumped inside node (closed form).

    Parameters
    ----------
    conductance : float or array
        Box conductance, ambient to inside (:func:`workbench.geometry.box_conductance`). [W/K]
    t_ambient : float or (array, array)
        Ambient temperature [K] or step profile ``(times_s [s], temperatures_K [K])``.
    coolant_mass : float or array
        Coolant mass, >= 0. [kg]
    latent_heat : float or array
        Latent heat of melting or sublimation of the coolant. [J/kg]
    t_phase_change : float or array
        Phase-change temperature of the coolant. [K]
    payload_heat_capacity : float or array
        Heat capacity of payload + inside air + inner packaging, >= 0. [J/K]
    t_payload_start : float or array, optional
        Payload temperature when packed; default the phase-change
        temperature. It mixes with the coolant at once (lumped node). [K]
    t_payload_max : float or array, optional
        Highest allowed payload temperature. [K]

    Returns
    -------
    float or array
        Time until the coolant is spent [s] or, where ``t_payload_max`` is
        given, until the payload (the node) first rises above it; ``inf``
        where that never happens.

    Notes
    -----
    Energy balance of the inside node (coolant sensible heat neglected):

    .. math:: \\frac{dH}{dt} = UA\\,[T_a(t) - T(H)]

    with :math:`T = T_{pc}` while :math:`0 \\le H \\le mL` (phase change) and
    :math:`T = T_{pc} + (H - mL)/C` above, :math:`T_{pc} + H/C` below. For a
    constant ambient above :math:`T_{pc}` and a payload packed at
    :math:`T_{pc}`,

    .. math:: t_{spent} = \\frac{m L}{UA\\,(T_a - T_{pc})}, \\qquad
              t_{max} = t_{spent} + \\frac{C}{UA}\\ln\\frac{T_a - T_{pc}}{T_a - T_{max}}

    A step profile is solved exactly segment by segment (coolant that has
    melted refreezes while the ambient is below :math:`T_{pc}`). Caution:
    an estimate; a shipper is qualified by test.

    References
    ----------
    ``incropera7``: 7th ed., §5.3 (lumped capacitance) and §1.3 (energy
    balance with phase change).

    Examples
    --------
    >>> round(hold_time(0.5, 303.15, 2.0, 333550.0, 273.15) / 3600, 3)
    12.354
    >>> round(hold_time(0.5, 303.15, 2.0, 333550.0, 273.15, 20000.0,
    ...                 t_payload_max=281.15) / 3600, 3)
    15.8
    """
    ua = _values("conductance", conductance, "W/K")
    times, temps = ambient_profile(t_ambient)
    m = _values("coolant_mass", coolant_mass, "kg", nonnegative)
    lat = _values("latent_heat", latent_heat, "J/kg")
    tpc = _temperature("t_phase_change", t_phase_change)
    cap_c = _values("payload_heat_capacity", payload_heat_capacity, "J/K", nonnegative)
    ts = tpc if t_payload_start is None else _temperature("t_payload_start", t_payload_start)
    want_max = t_payload_max is not None
    tmax = _temperature("t_payload_max", t_payload_max) if want_max else np.inf
    ua, m, lat, tpc, cap_c, ts, tmax = (
        np.array(a, float)
        for a in broadcast(
            conductance=ua,
            coolant_mass=m,
            latent_heat=lat,
            t_phase_change=tpc,
            payload_heat_capacity=cap_c,
            t_payload_start=ts,
            t_payload_max=tmax,
        )
    )
    with np.errstate(all="ignore"):
        result, state = _hold_scan(ua, times, temps, m * lat, tpc, cap_c, ts, tmax, want_max)
    if np.any(np.isnan(result) | np.isnan(state)):
        raise ValueError(
            "hold_time: conductance, coolant_mass, latent_heat or payload_heat_capacity are too "
            "large or too small for this closed form to compute (overflow); check their magnitudes "
            "and units"
        )
    return scalar_or_array(result)


def _start_state(cap, tpc, cap_c, ts, tmax):
    """Inside node when packed: energy above solid-at-phase-change, temperature, region."""
    e0 = cap_c * (ts - tpc)
    energy = np.clip(e0, 0.0, cap)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        temp = np.where(
            e0 < 0, ts, np.where(e0 > cap, tpc + (e0 - cap) / np.where(cap_c > 0, cap_c, 1.0), tpc)
        )
    region = np.where(e0 < 0, -1, np.where(e0 >= cap, 1, 0))
    t_spent = np.where(e0 >= cap, 0.0, np.inf)
    t_over = np.where(temp > tmax, 0.0, np.inf)
    return e0, energy, temp, region, t_spent, t_over


def _latent_scan(times, temps, p, e0, ua, cap):
    """Cumulative-energy scan of variants that start melting at one phase-change temperature.

    While the coolant changes phase the node stays at ``p`` and its melted
    energy is :math:`H(t) = H_0 + UA\\,S(t)` with the one cumulative sum
    :math:`S(t_i) = \\sum_{j<i} (T_j - p)\\,\\Delta t_j` over the profile, the
    same for every variant. The first segment where :math:`H` reaches the
    latent capacity (spent) or 0 (fully refrozen) follows from running
    maxima and minima of :math:`S` by binary search.

    Returns the spent time (``inf`` if not in a finite segment nor the last
    one), the segment index of the spent and refrozen events (``n_seg`` if
    none), and the energies at every segment start ``H_0 + UA S_i`` as a
    function.
    """
    n_seg = times.size
    s = np.zeros(n_seg)
    if n_seg > 1:
        s[1:] = np.cumsum((temps[:-1] - p) * np.diff(times))
    run_max = np.maximum.accumulate(s[1:])  # over the segment ends only
    run_min = np.minimum.accumulate(s[1:])
    thr_spent = (cap - e0) / ua  # S at which H = cap, > 0
    thr_frozen = -e0 / ua  # S at which H = 0, <= 0
    # boundary index j >= 1 where the event has happened by times[j]: segment j - 1
    j_sp = np.searchsorted(run_max, thr_spent, side="left") + 1
    j_fr = np.searchsorted(-run_min, -thr_frozen, side="left") + 1
    seg_sp = np.where(j_sp < n_seg, j_sp - 1, n_seg)
    seg_fr = np.where(j_fr < n_seg, j_fr - 1, n_seg)
    # the last (endless) segment: spent there if it warms, frozen if it cools
    rate_last = temps[-1] - p
    seg_sp = np.where((seg_sp == n_seg) & (seg_fr == n_seg) & (rate_last > 0), n_seg - 1, seg_sp)
    seg_fr = np.where((seg_sp == n_seg) & (seg_fr == n_seg) & (rate_last < 0), n_seg - 1, seg_fr)
    k = np.minimum(seg_sp, n_seg - 1)
    h_k = e0 + ua * s[k]
    with np.errstate(divide="ignore", invalid="ignore"):
        t_sp = times[k] + (cap - h_k) / (ua * (temps[k] - p))
    t_sp = np.where(seg_sp < seg_fr, t_sp, np.inf)
    return t_sp, seg_sp, seg_fr, s


def _warm_after_spent(times, temps, t_spent, seg_spent, tpc, tau, tmax):
    """First time the lumped node passes ``tmax`` after the coolant is spent.

    From the spent time the node (at ``tpc``) relaxes towards each
    segment's ambient, :math:`T_{end} = T_a + (T - T_a)\\,e^{-\\Delta t/\\tau}`,
    and passes ``tmax`` at :math:`\\tau \\ln\\frac{T_a - T}{T_a - T_{max}}`. This
    holds until a segment colder than ``tpc`` (the coolant could refreeze).

    Returns the crossing time (``inf`` if none before a cold segment or for
    ever), the index of that cold segment (``n_seg`` if none) and the node
    temperature at its start.
    """
    n_seg = times.size
    cold_idx = np.flatnonzero(temps < tpc)
    # first cold segment after each variant's spent segment
    k = np.searchsorted(cold_idx, seg_spent, side="right")
    padded = np.append(cold_idx, n_seg)
    seg_cold = padded[k]
    temp = np.full(t_spent.shape, float(tpc))
    t_x = np.full(t_spent.shape, np.inf)
    ends = np.append(times[1:], np.inf)
    order = np.argsort(seg_spent, kind="stable")  # variants join as their coolant is spent
    joined = 0
    rem = np.empty(0, dtype=np.int64)
    for i in range(int(seg_spent.min()), n_seg):
        n_join = int(np.searchsorted(seg_spent[order], i, side="right"))
        if n_join > joined:
            new = order[joined:n_join]
            rem = np.concatenate([rem, new[seg_cold[new] > i]])
            joined = n_join
        rem = rem[seg_cold[rem] > i]
        if rem.size == 0:
            if joined == order.size:
                break
            continue
        ta = temps[i]
        tr, tm, tt = tau[rem], tmax[rem], temp[rem]
        t0 = np.maximum(times[i], t_spent[rem])
        with np.errstate(all="ignore"):
            if ta > tm.min():
                tx = t0 + tr * np.log((ta - tt) / (ta - tm))
                hit = (ta > tm) & (tx <= ends[i])
                if hit.any():
                    t_x[rem[hit]] = np.maximum(tx[hit], t0[hit])
            decay = np.where(tr > 0, np.exp(-(ends[i] - t0) / np.where(tr > 0, tr, 1.0)), 0.0)
            temp[rem] = ta + (tt - ta) * decay
        if ta > tm.min() and hit.any():
            rem = rem[~hit]
    return t_x, seg_cold, temp


def _hold_scan(ua, times, temps, cap, tpc, cap_c, ts, tmax, want_max):
    """Hold time of :func:`hold_time`: the scan where it is exact, else the segment solution.

    A variant packed within its phase change (``0 <= C (T_s - T_pc) < m L``)
    is solved by :func:`_latent_scan` up to its first event. Spent before
    any full refreezing: done (for the coolant-spent time). Otherwise, and
    for the payload limit (exponential warming after the coolant is spent),
    :func:`_hold_segments` carries on from the segment of the first event,
    starting from the scanned state. Variants packed outside the phase
    change start the segment solution at 0.
    """
    shape = ua.shape
    ua, cap, tpc, cap_c, ts, tmax = (np.ravel(x) for x in (ua, cap, tpc, cap_c, ts, tmax))
    e0, energy, temp, region, t_spent, t_over = _start_state(cap, tpc, cap_c, ts, tmax)
    n_seg = times.size
    result = np.full(ua.size, np.inf)
    state = temp + energy
    start_seg = np.zeros(ua.size, dtype=np.int64)
    latent = region == 0
    scans = []
    for p in np.unique(tpc[latent]):
        sel = np.flatnonzero(latent & (tpc == p))
        t_sp, seg_sp, seg_fr, s = _latent_scan(times, temps, p, e0[sel], ua[sel], cap[sel])
        first = np.minimum(seg_sp, seg_fr)
        start_seg[sel] = np.minimum(first, n_seg - 1)
        result[sel] = t_sp
        if want_max:
            done = first >= n_seg  # never spent nor refrozen: stays at p for ever
            spent = seg_sp < seg_fr
            if spent.any():
                # warming after the coolant is spent, up to the next cold segment
                w = sel[spent]
                t_x, seg_c, temp_c = _warm_after_spent(
                    times, temps, t_sp[spent], seg_sp[spent], p, cap_c[w] / ua[w], tmax[w]
                )
                found = np.isfinite(t_x) | (seg_c >= n_seg)
                t_over[w] = np.minimum(t_over[w], t_x)
                done[spent] = found
                # not found before a cold segment: the segment solution carries on there
                again = ~found
                start_seg[w[again]] = -2 - seg_c[again]  # marked; handled below
                temp[w[again]] = temp_c[again]
        else:
            done = (seg_sp < seg_fr) | (first >= n_seg)
        start_seg[sel[done]] = -1
        scans.append((sel, s))
    warm = start_seg <= -2  # spent and warming when a cold segment begins
    if warm.any():
        seg_w = -2 - start_seg[warm]
        region[warm], energy[warm], t_spent[warm] = 1, cap[warm], result[warm]
        start_seg[warm] = seg_w
    slow = start_seg >= 0
    if want_max:
        result = np.where(slow, result, t_over)
    if not slow.any():
        return result.reshape(shape), state.reshape(shape)
    # one segment solution for all the others, from the earliest segment any of
    # them needs; a scanned variant is still melting there, at the scanned energy
    i0 = 0 if np.any(slow & ~latent) else int(start_seg[slow].min())
    if np.any(warm & (start_seg > i0)):
        # a warming variant joins at its own cold segment only: run it separately
        late = warm & (start_seg > i0)
        for j in np.unique(start_seg[late]):
            sel = np.flatnonzero(late & (start_seg == j))
            r, _ = _hold_segments(
                ua[sel], times, temps, cap[sel], energy[sel], temp[sel], region[sel],
                t_spent[sel], t_over[sel], cap_c[sel] / ua[sel], tpc[sel], tmax[sel],
                cap_c[sel], want_max, first=int(j),
            )
            result[sel] = r
        slow = slow & ~late
        if not slow.any():
            return result.reshape(shape), state.reshape(shape)
        i0 = 0 if np.any(slow & ~latent) else int(start_seg[slow].min())
    for sel, s in scans:
        keep = ~warm[sel]
        energy[sel[keep]] = e0[sel[keep]] + ua[sel[keep]] * s[i0]
    idx = np.flatnonzero(slow)
    r, st = _hold_segments(
        ua[idx],
        times,
        temps,
        cap[idx],
        energy[idx],
        temp[idx],
        region[idx],
        t_spent[idx],
        t_over[idx],
        cap_c[idx] / ua[idx],
        tpc[idx],
        tmax[idx],
        cap_c[idx],
        want_max,
        first=i0,
    )
    result[idx] = r
    state[idx] = st
    return result.reshape(shape), state.reshape(shape)


def _hold_segments(
    ua, times, temps, cap, energy, temp, region, t_spent, t_over, tau, tpc, tmax, cap_c, want_max,
    first=0,
):
    """The segment-by-segment solution of :func:`hold_time` (result, final state).

    Starts at segment ``first`` from the given state (the state at ``times[first]``).
    """
    n_seg = times.size
    for i in range(first, n_seg):
        t_now = np.full(ua.shape, times[i])
        left = np.full(ua.shape, times[i + 1] - times[i] if i + 1 < n_seg else np.inf)
        ta = temps[i]
        for _ in range(3):
            active = left > 0
            if not np.any(active):
                break
            expo = region != 0
            # exponential regions: time to reach t_phase_change (if heading there)
            heading = ((region == -1) & (ta > tpc)) | ((region == 1) & (ta < tpc))
            ok = expo & heading
            tb_e = np.where(ok, tau * _safe_log_ratio(ta - temp, ta - tpc, ok), np.inf)
            # linear region: time to fully melted or fully frozen
            rate = ua * (ta - tpc)
            with np.errstate(divide="ignore", invalid="ignore"):
                tb_l = np.where(
                    rate > 0, (cap - energy) / rate, np.where(rate < 0, energy / -rate, np.inf)
                )
            tb = np.where(expo, tb_e, tb_l)
            step = np.minimum(left, tb)
            hit = active & (tb <= left)
            # payload crossing t_payload_max inside an exponential stretch
            if want_max:
                ok_x = active & expo & (temp <= tmax) & (ta > tmax) & (np.isinf(t_over))
                t_x = np.where(ok_x, tau * _safe_log_ratio(ta - temp, ta - tmax, ok_x), np.inf)
                crossed = ok_x & (t_x <= step) & ((step > 0) | (t_x == 0) & (left > 0))
                t_over = np.where(crossed, t_now + t_x, t_over)
            # advance
            with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
                decay = np.where(
                    tau > 0,
                    np.exp(-step / np.where(tau > 0, tau, 1.0)),
                    np.where(step > 0, 0.0, 1.0),
                )
            temp_e = ta + (temp - ta) * decay
            energy_l = np.where(
                np.isfinite(step), energy + rate * np.where(np.isfinite(step), step, 0.0), energy
            )
            new_temp = np.where(active & expo, temp_e, temp)
            new_energy = np.where(active & ~expo, energy_l, energy)
            # region changes at boundaries
            to_lin = hit & expo
            new_temp = np.where(to_lin, tpc, new_temp)
            melted = hit & ~expo & (rate > 0)
            frozen = hit & ~expo & (rate < 0)
            new_energy = np.where(melted, cap, np.where(frozen, 0.0, new_energy))
            t_spent = np.where(melted & np.isinf(t_spent), t_now + step, t_spent)
            region = np.where(to_lin, 0, np.where(melted, 1, np.where(frozen, -1, region)))
            temp, energy = new_temp, new_energy
            fin = np.isfinite(step)
            t_now = np.where(active, t_now + np.where(fin, step, 0.0), t_now)
            left = np.where(active, np.where(fin, left - np.where(fin, step, 0.0), 0.0), left)
            # with no heat capacity the node jumps to the ambient in an exponential region
            if want_max:
                jump = (region == 1) & (cap_c == 0) & (ta > tmax) & np.isinf(t_over) & (left > 0)
                t_over = np.where(jump, t_now, t_over)
        # every variant has its first event: later segments cannot change it
        if np.all(np.isfinite(t_over if want_max else t_spent)):
            break
    return (t_over if want_max else t_spent), temp + energy


# ---------------------------------------------------------------------------
# General case: two nodes, time-stepped
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class HoldSimulation:
    """Result of :func:`simulate_hold` (arrays over the variant shape, time on the last axis).

    Attributes
    ----------
    times : ndarray
        Stored times, shape ``(n_t,)``. [s]
    ambient : ndarray
        Step-mean ambient temperature ending at each stored time (first value
        the ambient at 0), shape ``(n_t,)``. [K]
    payload_temperature, coolant_temperature : ndarray
        Node temperatures, shape ``variants + (n_t,)``; once a coolant
        without a liquid phase (dry ice) is gone, the coolant column repeats
        the payload temperature. [K]
    coolant_fraction_left : ndarray
        Fraction of the latent capacity not yet used, 0–1. [-]
    heat_in : ndarray
        Cumulative heat through the box wall into the inside. [J]
    stored_energy : ndarray
        Energy stored in both nodes relative to the start. [J]
    time_coolant_spent : ndarray
        First time the coolant is fully melted (sublimed); ``inf`` if not in
        the run. [s]
    time_out_of_range : ndarray
        First time the payload leaves its range (step-end samples, linear
        interpolation); ``inf`` if not in the run. [s]
    hold_time : ndarray
        The earlier of the two, capped at ``duration``. [s]
    reason : ndarray of str
        One of :data:`REASONS` per variant.
    duration : float
        Length of the run. [s]
    """

    times: np.ndarray
    ambient: np.ndarray
    payload_temperature: np.ndarray
    coolant_temperature: np.ndarray
    coolant_fraction_left: np.ndarray
    heat_in: np.ndarray
    stored_energy: np.ndarray
    time_coolant_spent: np.ndarray
    time_out_of_range: np.ndarray
    hold_time: np.ndarray
    reason: np.ndarray
    duration: float


def _limit(name: str, value, default: float) -> np.ndarray:
    return np.asarray(default) if value is None else _temperature(name, value)


def _check_state(h_new, tp_new, cs, t_end, shape) -> None:
    """Stop with a named error rather than return NaN or an unphysical coolant state."""
    cold = (h_new < 0) & (cs == 0)
    if np.any(cold):
        i = int(np.argmax(cold))
        where = f"variant {np.unravel_index(i, shape)}" if shape else "the run"
        raise ValueError(
            f"specific_heat_solid: 0 J/(kg·K) in {where}, but its coolant cools below its phase "
            f"change by {t_end / 3600:.2f} h (the ambient or the payload is colder); give the "
            "solid's specific heat > 0 [J/(kg·K)], or None for the coolants table's value"
        )
    bad = ~(np.isfinite(h_new) & np.isfinite(tp_new))
    if np.any(bad):
        i = int(np.argmax(bad))
        where = f"variant {np.unravel_index(i, shape)}" if shape else "the run"
        raise ValueError(
            f"simulate_hold: the state of {where} is no longer finite at {t_end / 3600:.2f} h; "
            "the inputs (conductance, coolant_mass, payload_heat_capacity, coupling_conductance, "
            "specific heats) are outside the range this model can compute"
        )


@dataclass(frozen=True)
class _HoldInputs:
    """Checked inputs of :func:`simulate_hold`, broadcast and flattened to one axis.

    Temperatures [K], conductances [W/K], mass [kg], latent heat [J/kg],
    specific heats [J/(kg·K)], heat capacity [J/K]; ``shape`` is the variants'
    broadcast shape, ``n_steps`` the number of time steps, ``record_every`` the
    stride of the stored times.
    """

    shape: tuple[int, ...]
    duration: float
    time_step: float
    n_steps: int
    record_every: int
    ua: np.ndarray
    m: np.ndarray
    lat: np.ndarray
    tpc: np.ndarray
    cs: np.ndarray
    cl: np.ndarray
    cp: np.ndarray
    g: np.ndarray
    phi: np.ndarray
    tc0: np.ndarray
    tp0: np.ndarray
    tmin: np.ndarray
    tmax: np.ndarray
    ua_w_c: np.ndarray  # share of the wall reaching the coolant, φ·UA [W/K]
    ua_w_p: np.ndarray  # share reaching the payload node, (1 − φ)·UA [W/K]


def _specific_heats(tpc, lat, specific_heat_solid, specific_heat_liquid):
    """Coolant specific heats [J/(kg·K)]: the given values, else the coolants table's."""
    cs_table = cl_table = None
    if specific_heat_solid is None or specific_heat_liquid is None:
        from workbench.coolants import specific_heats_for

        cs_table, cl_table = specific_heats_for(tpc, lat)
    cs = (
        cs_table
        if specific_heat_solid is None
        else _values("specific_heat_solid", specific_heat_solid, "J/(kg·K)", nonnegative)
    )
    cl = (
        cl_table
        if specific_heat_liquid is None
        else _values("specific_heat_liquid", specific_heat_liquid, "J/(kg·K)", nonnegative)
    )
    return cs, cl


def _hold_steps(n: int, dur: float, dt: float, record_every: int, limits: tuple[int, int, int]) -> int:
    """Time steps of a run; work beyond the limits is refused before any allocation."""
    max_steps, max_cells, max_stored = limits
    steps_f = dur / dt
    if not steps_f - 1e-9 <= max_steps:
        raise ValueError(
            f"time_step: duration {dur:g} s / time_step {dt:g} s = {steps_f:,.0f} time steps asked; "
            f"the limit is {max_steps:,} per variant (MAX_STEPS). Coarsen: a time_step of at least "
            f"{dur / max_steps:.4g} s or a shorter duration; or raise the limit on purpose with "
            "max_steps=..."
        )
    steps_asked = max(1, math.ceil(steps_f - 1e-9))
    if n * steps_asked > max_cells:
        raise ValueError(
            f"conductance, coolant_mass, ...: {n:,} variants × {steps_asked:,} time steps = "
            f"{n * steps_asked:,} cells asked; the limit is {max_cells:,} (MAX_CELLS). Split the "
            "variants over several calls, use a larger time_step or a shorter duration; or raise "
            "the limit on purpose with max_cells=..."
        )
    stored_asked = n * (steps_asked // record_every + 2)
    if stored_asked > max_stored:
        raise ValueError(
            f"record_every: {n:,} variants × {steps_asked // record_every + 2:,} stored times = "
            f"{stored_asked:,} values per series; the limit is {max_stored:,} (MAX_STORED). Store "
            f"fewer times (record_every={max(1, -(-stored_asked // max_stored)) * record_every} or "
            "more; events are still found on every step) or raise the limit on purpose with "
            "max_stored=..."
        )
    return steps_asked


def _check_hold_states(p: _HoldInputs) -> None:
    """Refuse a payload range that is empty and a start the coolant's phases cannot hold."""
    if np.any(p.tmin >= p.tmax):
        raise ValueError(
            "t_payload_min, t_payload_max: the payload range is inverted or empty (min must be below max) [K]"
        )
    if np.any((p.tc0 < p.tpc) & (p.cs == 0)):
        raise ValueError(
            "t_coolant_start: below the phase change needs specific_heat_solid > 0 [J/(kg·K)]"
        )
    if np.any((p.tc0 > p.tpc) & (p.cl == 0)):
        raise ValueError(
            "t_coolant_start: above the phase change needs specific_heat_liquid > 0 [J/(kg·K)]"
        )


def _hold_inputs(
    conductance, coolant_mass, latent_heat, t_phase_change, duration, time_step,
    specific_heat_solid, specific_heat_liquid, payload_heat_capacity, coupling_conductance,
    coolant_wall_fraction, t_coolant_start, t_payload_start, t_payload_min, t_payload_max,
    record_every, limits,
) -> _HoldInputs:
    """Check, broadcast and flatten the inputs of :func:`simulate_hold` (its argument names)."""
    dur = _scalar("duration", duration, "s")
    dt = _scalar("time_step", time_step, "s")
    record_every = _count("record_every", record_every, "store every n-th step")
    limits = (
        _count("max_steps", limits[0], "time steps per variant"),
        _count("max_cells", limits[1], "variants × time steps"),
        _count("max_stored", limits[2], "variants × stored times"),
    )
    ua = _values("conductance", conductance, "W/K")
    m = _values("coolant_mass", coolant_mass, "kg")
    lat = _values("latent_heat", latent_heat, "J/kg")
    tpc = _temperature("t_phase_change", t_phase_change)
    cs, cl = _specific_heats(tpc, lat, specific_heat_solid, specific_heat_liquid)
    cp_ = _values("payload_heat_capacity", payload_heat_capacity, "J/K")
    g = _values("coupling_conductance", coupling_conductance, "W/K")
    phi = in_range("coolant_wall_fraction", coolant_wall_fraction, 0.0, 1.0, "-")
    if phi.size == 0:
        raise ValueError("coolant_wall_fraction: empty; give at least one value [-]")
    tc0 = tpc if t_coolant_start is None else _temperature("t_coolant_start", t_coolant_start)
    tp0 = tpc if t_payload_start is None else _temperature("t_payload_start", t_payload_start)
    tmin = _limit("t_payload_min", t_payload_min, -np.inf)
    tmax = _limit("t_payload_max", t_payload_max, np.inf)
    arrays = broadcast(
        conductance=ua,
        coolant_mass=m,
        latent_heat=lat,
        t_phase_change=tpc,
        specific_heat_solid=cs,
        specific_heat_liquid=cl,
        payload_heat_capacity=cp_,
        coupling_conductance=g,
        coolant_wall_fraction=phi,
        t_coolant_start=tc0,
        t_payload_start=tp0,
        t_payload_min=tmin,
        t_payload_max=tmax,
    )
    shape = arrays[0].shape
    n_steps = _hold_steps(int(np.prod(shape, dtype=np.int64)), dur, dt, record_every, limits)
    ua, m, lat, tpc, cs, cl, cp_, g, phi, tc0, tp0, tmin, tmax = (
        np.array(a, float).ravel() for a in arrays
    )
    p = _HoldInputs(
        shape, dur, dt, n_steps, record_every, ua, m, lat, tpc, cs, cl, cp_, g, phi, tc0, tp0, tmin, tmax,
        ua_w_c=phi * ua, ua_w_p=(1.0 - phi) * ua,
    )
    _check_hold_states(p)
    return p


def _coolant_temperature(p: _HoldInputs, h: np.ndarray, tp: np.ndarray) -> np.ndarray:
    """Coolant temperature [K] from its specific enthalpy ``h`` [J/kg] (payload's once gone)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        below = p.tpc + h / np.where(p.cs > 0, p.cs, 1.0)
        above = p.tpc + (h - p.lat) / np.where(p.cl > 0, p.cl, 1.0)
    return np.where(h < 0, below, np.where(h > p.lat, np.where(p.cl > 0, above, tp), p.tpc))


class _HoldSeries:
    """The stored time series of :func:`simulate_hold`: every ``record_every``-th step and the last."""

    def __init__(self, p: _HoldInputs, h: np.ndarray, tp: np.ndarray):
        self.index = list(range(0, p.n_steps + 1, p.record_every))
        if self.index[-1] != p.n_steps:
            self.index.append(p.n_steps)
        n, n_rec = p.ua.size, len(self.index)
        self.tp, self.tc, self.fraction, self.heat_in, self.energy = (
            np.empty((n, n_rec)) for _ in range(5)
        )
        self.p, self.h_start, self.tp_start, self.pos = p, h.copy(), tp.copy(), 0

    def store_if_due(self, step_end: int, h, tp, tc, heat_in) -> None:
        """Store the state at the end of step ``step_end`` (0: the start) if it is a stored time."""
        if self.pos >= len(self.index) or self.index[self.pos] != step_end:
            return
        j, p = self.pos, self.p
        self.tp[:, j] = tp
        self.tc[:, j] = tc
        self.fraction[:, j] = 1.0 - np.clip(h / p.lat, 0.0, 1.0)
        self.heat_in[:, j] = heat_in
        self.energy[:, j] = p.cp * (tp - self.tp_start) + p.m * (h - self.h_start)
        self.pos += 1


class _HoldEvents:
    """First coolant-spent and out-of-range times of each variant, and the end reasons."""

    def __init__(self, p: _HoldInputs, h: np.ndarray, tp: np.ndarray):
        self.t_spent = np.where(h >= p.lat, 0.0, np.inf)
        self.t_out = np.where((tp < p.tmin) | (tp > p.tmax), 0.0, np.inf)
        self.why_out = np.where(tp > p.tmax, 1, np.where(tp < p.tmin, 2, 0))

    def update(self, p: _HoldInputs, h, h_new, tp, tp1, t0: float, step: float) -> None:
        """Events inside the step from ``t0`` [s] of length ``step`` [s], linearly interpolated."""
        crossed = np.isinf(self.t_spent) & (h < p.lat) & (h_new >= p.lat)
        with np.errstate(divide="ignore", invalid="ignore"):
            frac = np.clip((p.lat - h) / (h_new - h), 0.0, 1.0)
        self.t_spent = np.where(crossed, t0 + frac * step, self.t_spent)
        hot = np.isinf(self.t_out) & (tp1 > p.tmax)
        cold = np.isinf(self.t_out) & (tp1 < p.tmin)
        with np.errstate(divide="ignore", invalid="ignore"):
            f_hot = np.clip((p.tmax - tp) / (tp1 - tp), 0.0, 1.0)
            f_cold = np.clip((p.tmin - tp) / (tp1 - tp), 0.0, 1.0)
        self.t_out = np.where(
            hot, t0 + f_hot * step, np.where(cold, t0 + f_cold * step, self.t_out)
        )
        self.why_out = np.where(hot, 1, np.where(cold, 2, self.why_out))

    def end(self, duration: float) -> tuple[np.ndarray, np.ndarray]:
        """Hold time [s] (the earlier event, capped at ``duration``) and the reason of each variant."""
        hold = np.minimum(np.minimum(self.t_spent, self.t_out), duration)
        reason_idx = np.where(
            self.t_spent <= self.t_out, np.where(np.isfinite(self.t_spent), 0, 3), self.why_out
        )
        return hold, np.array(REASONS, dtype=object)[reason_idx]


def _sensible_step(sens, c_c, a, b, g_eff, wp, wc, cp_, ta, tp, tc, step):
    """Exact two-node step while the coolant is sensible (solid below or liquid above).

    Solves :math:`\\dot x = M x + f` for ``x = (T_p, T_c)`` over the step:
    :math:`x(t) = x^* + e^{Mt}(x_0 - x^*)`, with the step means from
    :math:`M^{-1}(e^{Mt} - I)`. Returns end temperatures, coolant heat [J/kg·kg]
    and step-mean temperatures ``(tp1, q_c, tpbar, tcbar)`` where ``sens``.
    """
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        c_cs = np.where(sens, c_c, 1.0)
        m11, m12 = -a / cp_, g_eff / cp_
        m21, m22 = g_eff / c_cs, -b / c_cs
        det = m11 * m22 - m12 * m21
        f1 = wp * ta / cp_
        f2 = wc * ta / c_cs
        # steady state x* = -M^-1 f
        xs1 = -(m22 * f1 - m12 * f2) / det
        xs2 = -(-m21 * f1 + m11 * f2) / det
        y1, y2 = tp - xs1, tc - xs2
        s = 0.5 * (m11 + m22)
        q = np.sqrt(np.maximum(s * s - det, 0.0))
        l1, l2 = s + q, s - q
        e1, e2 = np.exp(l1 * step), np.exp(l2 * step)
        small = q * step < 1e-8
        qs = np.where(small, 1.0, q)
        sh = np.where(small, step * np.exp(s * step), (e1 - e2) / (2 * qs))  # e^{st} sinh(qt)/q
        ch = 0.5 * (e1 + e2)  # e^{st} cosh(qt)
        # E = e^{M t} = (ch - s*sh) I + sh M
        d0 = ch - s * sh
        e11, e12, e21, e22 = d0 + sh * m11, sh * m12, sh * m21, d0 + sh * m22
        z1 = e11 * y1 + e12 * y2
        z2 = e21 * y1 + e22 * y2
        # integral of y: M^-1 (E - I) y
        w1, w2 = z1 - y1, z2 - y2
        iy1 = (m22 * w1 - m12 * w2) / det
        iy2 = (-m21 * w1 + m11 * w2) / det
        tp1_s = xs1 + z1
        tc1_s = xs2 + z2
        tpbar_s = xs1 + iy1 / step
        tcbar_s = xs2 + iy2 / step
        q_c_s = c_cs * (tc1_s - tc)
    return tp1_s, q_c_s, tpbar_s, tcbar_s


def _two_node_step(p: _HoldInputs, h, tp, tc, ta: float, step: float):
    """One time step of the two-node balance (see :func:`simulate_hold`, Notes).

    Returns the payload temperature at the step end [K], the heat into the
    coolant [J] and the heat through the wall [J] over the step.
    """
    latent = (h >= 0) & (h <= p.lat)
    gone = (h > p.lat) & (p.cl == 0)
    c_c = p.m * np.where(h < 0, p.cs, p.cl)
    # coolant gone (sublimed): the payload node alone takes the whole wall
    g_eff = np.where(gone, 0.0, p.g)
    wc = np.where(gone, 0.0, p.ua_w_c)
    wp = np.where(gone, p.ua, p.ua_w_p)
    a = wp + g_eff
    b = wc + g_eff
    # (1) coolant at fixed temperature (phase change, or gone): payload alone, exact
    tc_fix = np.where(gone, tp, p.tpc)
    teq = (wp * ta + g_eff * tc_fix) / a
    decay = np.exp(-a * step / p.cp)
    tp1_fix = teq + (tp - teq) * decay
    tpbar_fix = teq + (tp - teq) * (1.0 - decay) * p.cp / (a * step)
    q_c_fix = wc * (ta - tc_fix) * step + g_eff * (tpbar_fix - tc_fix) * step
    # (2) sensible coolant: exact two-node solution
    sens = ~(latent | gone)
    if np.any(sens):
        tp1_s, q_c_s, tpbar_s, tcbar_s = _sensible_step(
            sens, c_c, a, b, g_eff, wp, wc, p.cp, ta, tp, tc, step
        )
        tp1 = np.where(sens, tp1_s, tp1_fix)
        q_c = np.where(sens, q_c_s, q_c_fix)
        tpbar = np.where(sens, tpbar_s, tpbar_fix)
        tcbar = np.where(sens, tcbar_s, tc_fix)
    else:
        tp1, q_c, tpbar, tcbar = tp1_fix, q_c_fix, tpbar_fix, tc_fix
    # heat through the wall from the step-mean node temperatures (booked
    # independently of the stored energy, so a conservation check can fail)
    q_wall = (wp * (ta - tpbar) + wc * (ta - tcbar)) * step
    return tp1, q_c, q_wall


def _poll(k: int, n_steps: int, t_now: float, duration: float, progress, cancel) -> None:
    """Report progress and honour a cancel request between steps."""
    if cancel is not None and cancel():
        raise Cancelled(f"hold-time run cancelled at {t_now / 3600:.1f} h of {duration / 3600:.1f} h")
    if progress is not None:
        progress(k / n_steps)


def simulate_hold(
    conductance: ArrayLike,
    t_ambient: AmbientLike,
    coolant_mass: ArrayLike,
    latent_heat: ArrayLike,
    t_phase_change: ArrayLike,
    duration: float,
    time_step: float = 300.0,
    *,
    specific_heat_solid: ArrayLike | None = None,
    specific_heat_liquid: ArrayLike | None = None,
    payload_heat_capacity: ArrayLike = 1000.0,
    coupling_conductance: ArrayLike = 5.0,
    coolant_wall_fraction: ArrayLike = 1.0,
    t_coolant_start: ArrayLike | None = None,
    t_payload_start: ArrayLike | None = None,
    t_payload_min: ArrayLike | None = None,
    t_payload_max: ArrayLike | None = None,
    record_every: int = 1,
    progress: Callable[[float], None] | None = None,
    cancel: Callable[[], bool] | None = None,
    max_steps: int = MAX_STEPS,
    max_cells: int = MAX_CELLS,
    max_stored: int = MAX_STORED,
) -> HoldSimulation:
    """Time-stepped hold of many shipper variants at once (two-node energy balance).

    Parameters
    ----------
    conductance : float or array
        Box conductance, ambient to inside. [W/K]
    t_ambient : float or (array, array)
        Ambient temperature [K] or step profile ``(times_s, temperatures_K)``.
    coolant_mass : float or array
        Coolant mass. [kg]
    latent_heat : float or array
        Latent heat of melting or sublimation. [J/kg]
    t_phase_change : float or array
        Phase-change temperature. [K]
    duration : float
        Length of the run. [s]
    time_step : float
        Step length; the step is stable for any length, accuracy wants it
        short against the payload node's time constant. [s]
    specific_heat_solid, specific_heat_liquid : float or array, optional
        Coolant specific heats below and above the phase change. ``None``
        (default): the coolants table's values for this coolant
        (:func:`workbench.coolants.specific_heats_for`: the row with the same
        phase-change temperature and latent heat, else ice and liquid water).
        A liquid specific heat of 0 means no liquid (dry ice: the gas leaves,
        the coolant node disappears once spent; give 0 for a subliming
        coolant that is not in the table). A solid specific heat of 0 is
        refused once a coolant would cool below its phase change (the run
        stops with a ``ValueError`` naming the variant and time).
        [J/(kg·K)]
    payload_heat_capacity : float or array
        Heat capacity of payload + inside air + inner packaging, > 0. [J/K]
    coupling_conductance : float or array
        Conductance between the payload node and the coolant, > 0 (of the
        order of a film coefficient times the contact area). [W/K]
    coolant_wall_fraction : float or array
        Share of the box conductance that reaches the coolant directly
        (packs lining the walls: 1; packs on top only: about 1/6), 0–1. [-]
    t_coolant_start : float or array, optional
        Coolant temperature when packed; at or below the phase change it is
        fully solid, above it fully liquid. Default: the phase-change
        temperature, solid ("conditioned"). [K]
    t_payload_start : float or array, optional
        Payload temperature when packed; default the phase-change temperature. [K]
    t_payload_min, t_payload_max : float or array, optional
        Allowed payload range (e.g. 275.15 and 281.15 for 2–8 °C); ``None``
        for no limit on that side. [K]
    record_every : int
        Store every n-th step (events are found on every step).
    progress : callable, optional
        Called with the fraction of the duration simulated (0..1], about every
        2 % of the steps.
    cancel : callable, optional
        Checked as often; when it returns True the run raises
        :class:`workbench._checks.Cancelled`.
    max_steps, max_cells, max_stored : int
        Work limits, checked before computing: time steps per variant
        (default :data:`MAX_STEPS`), variants × time steps
        (:data:`MAX_CELLS`) and variants × stored times per series
        (:data:`MAX_STORED`). Beyond them the call raises ``ValueError``
        saying how to coarsen (a larger ``time_step``, a shorter
        ``duration``, fewer variants per call, a larger ``record_every``);
        raise a limit here only on purpose.

    Returns
    -------
    HoldSimulation
        Time series, event times and reasons.

    Notes
    -----
    Nodes: payload (capacity :math:`C_p`) and coolant (specific enthalpy
    :math:`h`, zero for solid at :math:`T_{pc}`):

    .. math::
        C_p \\dot T_p = (1-\\phi)\\,UA\\,(T_a - T_p) + G\\,(T_c - T_p) \\\\
        m \\dot h = \\phi\\,UA\\,(T_a - T_c) + G\\,(T_p - T_c)

    with :math:`T_c = T_{pc} + h/c_s` for :math:`h < 0`, :math:`T_{pc}` for
    :math:`0 \\le h \\le L`, :math:`T_{pc} + (h-L)/c_l` above. Each step
    solves the linear system exactly with the ambient's step mean and the
    coolant capacity of its state at the start of the step (infinite during
    the phase change), books the exact heat flows and updates :math:`h`, so
    energy is conserved to round-off and no step length is unstable. With a
    large :math:`G`, :math:`\\phi = 1` and the coolant conditioned at
    :math:`T_{pc}` the spent time tends to :math:`mL/(UA\\,\\Delta T)`
    (:func:`hold_time`). Range exits are detected at step ends.

    Caution: an estimate. Packaging for medicines is qualified by testing
    under the applicable distribution rules; frozen water-based packs can
    freeze a 2–8 °C payload (condition them, no direct contact); dry ice
    needs a vented box and dangerous-goods handling for air transport.

    References
    ----------
    ``incropera7``: 7th ed., §5.3 (lumped capacitance), §5.9 (multiple
    lumped nodes); enthalpy formulation of phase change (common practice).

    Examples
    --------
    >>> sim = simulate_hold([0.4, 0.5], 303.15, 2.0, 333550.0, 273.15, 48 * 3600.0,
    ...                     coupling_conductance=50.0, specific_heat_liquid=4210.0)

    The closed form m L / (UA ΔT) gives 15.44 h and 12.35 h:

    >>> (sim.time_coolant_spent / 3600).round(2)
    array([15.44, 12.35])
    >>> list(sim.reason)
    ['coolant spent', 'coolant spent']
    """
    times_p, temps_p = ambient_profile(t_ambient)
    p = _hold_inputs(
        conductance, coolant_mass, latent_heat, t_phase_change, duration, time_step,
        specific_heat_solid, specific_heat_liquid, payload_heat_capacity, coupling_conductance,
        coolant_wall_fraction, t_coolant_start, t_payload_start, t_payload_min, t_payload_max,
        record_every, (max_steps, max_cells, max_stored),
    )
    n_steps = p.n_steps
    edges = np.minimum(np.arange(n_steps + 1) * p.time_step, p.duration)
    integ = _integral(times_p, temps_p, edges)
    ta_steps = np.diff(integ) / np.diff(edges)

    h = np.where(
        p.tc0 < p.tpc,
        p.cs * (p.tc0 - p.tpc),
        np.where(p.tc0 > p.tpc, p.lat + p.cl * (p.tc0 - p.tpc), 0.0),
    )
    tp = p.tp0.copy()
    series = _HoldSeries(p, h, tp)
    events = _HoldEvents(p, h, tp)
    heat_in = np.zeros(p.ua.size)
    tc = _coolant_temperature(p, h, tp)
    series.store_if_due(0, h, tp, tc, heat_in)
    every = max(1, n_steps // 50)
    for k in range(n_steps):
        if k % every == 0 and k:
            _poll(k, n_steps, edges[k], p.duration, progress, cancel)
        step = edges[k + 1] - edges[k]
        tp1, q_c, q_wall = _two_node_step(p, h, tp, tc, ta_steps[k], step)
        h_new = h + q_c / p.m
        _check_state(h_new, tp1, p.cs, edges[k + 1], p.shape)
        events.update(p, h, h_new, tp, tp1, edges[k], step)
        h, tp = h_new, tp1
        heat_in = heat_in + q_wall
        tc = _coolant_temperature(p, h, tp)
        series.store_if_due(k + 1, h, tp, tc, heat_in)

    hold, reason = events.end(p.duration)

    def shp(x):
        return x.reshape(p.shape + x.shape[1:])

    if progress is not None:
        progress(1.0)
    return HoldSimulation(
        times=edges[series.index],
        ambient=np.concatenate([[temps_p[0]], ta_steps])[series.index],
        payload_temperature=shp(series.tp),
        coolant_temperature=shp(series.tc),
        coolant_fraction_left=shp(series.fraction),
        heat_in=shp(series.heat_in),
        stored_energy=shp(series.energy),
        time_coolant_spent=shp(events.t_spent),
        time_out_of_range=shp(events.t_out),
        hold_time=shp(hold),
        reason=shp(reason),
        duration=p.duration,
    )


# ---------------------------------------------------------------------------
# Sizing (vectorised monotone bisection on the closed-form model)
# ---------------------------------------------------------------------------
def _bisect(
    fn, lo: np.ndarray, hi: np.ndarray, increasing: bool, iterations: int = 60
) -> np.ndarray:
    """Smallest x in [lo, hi] with fn(x) true, for fn monotone in x (geometric steps)."""
    lo, hi = lo.copy(), hi.copy()
    for _ in range(iterations):
        mid = np.sqrt(lo * hi)
        good = fn(mid)
        if increasing:
            hi = np.where(good, mid, hi)
            lo = np.where(good, lo, mid)
        else:
            lo = np.where(good, mid, lo)
            hi = np.where(good, hi, mid)
    return hi if increasing else lo


#: Bracket of the conductance search. [W/K]
_UA_MIN, _UA_MAX = 1e-9, 1e12


def _impossible(
    bad: np.ndarray, result: np.ndarray, on_impossible: str, message: str
) -> np.ndarray:
    if on_impossible not in ("raise", "nan"):
        raise ValueError(f"on_impossible: unknown {on_impossible!r}; valid: ['raise', 'nan']")
    if np.any(bad):
        if on_impossible == "raise":
            raise ValueError(message)
        result = np.where(bad, np.nan, result)
    return result


def _max_melted_energy(ua, times, temps, tpc, cap_c, ts, duration) -> np.ndarray:
    """Largest melted energy over [0, duration] of the lumped model with unlimited coolant. [J]

    Before the coolant is spent the process does not depend on the coolant
    mass, so the mass that just lasts is this maximum over the latent heat.
    """
    e = np.maximum(cap_c * (ts - tpc), 0.0)
    temp = np.where(ts < tpc, ts, tpc)
    below = ts < tpc
    e_max = e.copy()
    tau = cap_c / ua
    n_seg = times.size
    for i in range(n_seg):
        t0 = times[i]
        t1 = times[i + 1] if i + 1 < n_seg else np.inf
        left = np.clip(np.minimum(t1, duration) - t0, 0.0, None)
        if not np.any(left > 0):
            break
        ta = temps[i]
        for _ in range(2):
            heading = below & (ta > tpc)
            tb_e = np.where(heading, tau * _safe_log_ratio(ta - temp, ta - tpc, heading), np.inf)
            rate = ua * (ta - tpc)
            with np.errstate(divide="ignore", invalid="ignore"):
                tb_l = np.where(rate < 0, e / np.where(rate < 0, -rate, 1.0), np.inf)
            tb = np.where(below, tb_e, tb_l)
            step = np.minimum(left, tb)
            hit = (tb <= left) & (left > 0)
            with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
                decay = np.where(
                    tau > 0,
                    np.exp(-step / np.where(tau > 0, tau, 1.0)),
                    np.where(step > 0, 0.0, 1.0),
                )
            temp = np.where(below, np.where(hit, tpc, ta + (temp - ta) * decay), temp)
            e = np.where(below, e, np.where(hit & (rate < 0), 0.0, e + rate * step))
            e_max = np.maximum(e_max, e)
            below = np.where(hit, ~below, below)
            left = np.where(hit, left - step, 0.0)
    return e_max


def _safety_factor(value) -> np.ndarray:
    sf = _values("safety_factor", value, "-", finite)
    bad = (sf < 1.0) | (sf > 10.0)
    if np.any(bad):
        raise ValueError(
            f"safety_factor: must lie in [1, 10] [-] (a multiplier: 1.2 for 20 % extra), got "
            f"{float(np.atleast_1d(sf)[np.atleast_1d(bad)][0]):g}"
        )
    return sf


def coolant_mass_for_duration(
    duration: ArrayLike,
    conductance: ArrayLike,
    t_ambient: AmbientLike,
    latent_heat: ArrayLike,
    t_phase_change: ArrayLike,
    payload_heat_capacity: ArrayLike = 0.0,
    t_payload_start: ArrayLike | None = None,
    safety_factor: ArrayLike = 1.0,
    on_impossible: str = "raise",
) -> float | np.ndarray:
    """Coolant mass that lasts a target duration, times a safety factor.

    Parameters
    ----------
    duration : float or array
        Target hold time. [s]
    conductance : float or array
        Box conductance. [W/K]
    t_ambient : float or (array, array)
        Ambient temperature [K] or step profile.
    latent_heat : float or array
        Latent heat of the coolant. [J/kg]
    t_phase_change : float or array
        Phase-change temperature. [K]
    payload_heat_capacity : float or array
        Heat capacity of the inside node. [J/K]
    t_payload_start : float or array, optional
        Payload temperature when packed (default: phase change). [K]
    safety_factor : float or array
        Multiplier on the mass, 1–10 (common practice: 1.1–1.5; 1.2 for 20 %
        extra, so a percentage typed as 20 is refused). [-]
    on_impossible : str
        ``"raise"`` or ``"nan"``; kept for symmetry with the other sizing
        functions (some mass always lasts for the spent-coolant criterion).

    Returns
    -------
    float or array
        Coolant mass [kg] that holds the duration when fed back:
        ``hold_time(conductance, t_ambient, mass, ...) >= duration``. 0.0
        where no coolant melts within the duration (no coolant needed).

    Notes
    -----
    Until the coolant is spent, the lumped model of :func:`hold_time` does
    not depend on the coolant mass, so the mass that just lasts is the
    largest melted energy over the duration divided by the latent heat
    (exact, segment by segment), times the safety factor. For a constant
    ambient and a payload packed at :math:`T_{pc}`:

    .. math:: m = f_s\\, UA\\,(T_a - T_{pc})\\,t / L

    Where the coolant would be spent exactly at the end of a warm spell (a
    tie) or round-off puts the closed form a hair short, the mass is raised
    by a few units in the last place until it holds.

    References
    ----------
    Energy balance (``incropera7``, §1.3); safety factor: common practice.

    Examples
    --------
    >>> round(coolant_mass_for_duration(48 * 3600.0, 0.5, 303.15, 333550.0, 273.15), 4)
    7.7709
    """
    t = _values("duration", duration, "s")
    ua = _values("conductance", conductance, "W/K")
    lat = _values("latent_heat", latent_heat, "J/kg")
    tpc = _temperature("t_phase_change", t_phase_change)
    cap_c = _values("payload_heat_capacity", payload_heat_capacity, "J/K", nonnegative)
    ts = tpc if t_payload_start is None else _temperature("t_payload_start", t_payload_start)
    sf = _safety_factor(safety_factor)
    if on_impossible not in ("raise", "nan"):
        raise ValueError(f"on_impossible: unknown {on_impossible!r}; valid: ['raise', 'nan']")
    t, ua, lat, tpc, cap_c, ts, sf = (
        np.array(x, float)
        for x in broadcast(
            duration=t,
            conductance=ua,
            latent_heat=lat,
            t_phase_change=tpc,
            payload_heat_capacity=cap_c,
            t_payload_start=ts,
            safety_factor=sf,
        )
    )
    times, temps = ambient_profile(t_ambient)
    with np.errstate(all="ignore"):
        e_max = _max_melted_energy(ua, times, temps, tpc, cap_c, ts, t)
        m = e_max / lat
    if not np.all(np.isfinite(m * sf)):
        raise ValueError(
            "coolant_mass_for_duration: duration, conductance or payload_heat_capacity are too "
            "large for a finite coolant mass (overflow); check their magnitudes and units"
        )

    # The exact mass melts completely at the moment of the largest melted
    # energy: fed back it may be "spent" there (a tie, or round-off). Raise it
    # by a few ulps at a time until the closed form holds the duration.
    def holds(mass):
        return (mass == 0) | (
            np.asarray(hold_time(ua, (times, temps), mass, lat, tpc, cap_c, ts), float) >= t
        )

    good = holds(m * sf)
    bump = 4.0 * np.finfo(float).eps
    while not np.all(good):
        if bump > 1e-6:
            raise ArithmeticError(
                "coolant_mass_for_duration: the sized mass does not hold the duration when fed back "
                "to hold_time (internal inconsistency; please report the inputs)"
            )
        m = np.where(good, m, m * (1.0 + bump))
        good = holds(m * sf)
        bump *= 4.0
    return scalar_or_array(m * sf)


def max_conductance_for_duration(
    duration: ArrayLike,
    t_ambient: AmbientLike,
    coolant_mass: ArrayLike,
    latent_heat: ArrayLike,
    t_phase_change: ArrayLike,
    payload_heat_capacity: ArrayLike = 0.0,
    t_payload_start: ArrayLike | None = None,
    t_payload_max: ArrayLike | None = None,
    on_impossible: str = "raise",
) -> float | np.ndarray:
    """Largest box conductance that still holds for the target duration.

    Parameters
    ----------
    duration : float or array
        Target hold time. [s]
    t_ambient : float or (array, array)
        Ambient temperature [K] or step profile.
    coolant_mass, latent_heat, t_phase_change, payload_heat_capacity,
    t_payload_start, t_payload_max
        As for :func:`hold_time`. [kg], [J/kg], [K], [J/K], [K], [K]
    on_impossible : str
        ``"raise"`` (default) or ``"nan"`` where even a nearly perfect
        insulation (1e-9 W/K) does not reach the duration.

    Returns
    -------
    float or array
        Conductance [W/K] that holds the duration when fed back
        (``hold_time(conductance, ...) >= duration``); ``inf`` where any
        conductance up to 1e12 W/K holds (the coolant is not spent within
        the duration, e.g. an ambient below the phase change).

    Notes
    -----
    :func:`hold_time` decreases monotonically with UA; bisection in log
    space. For a constant ambient: :math:`UA = mL / (\\Delta T\\,t)`.

    References
    ----------
    Energy balance (``incropera7``, §1.3).

    Examples
    --------
    >>> round(max_conductance_for_duration(48 * 3600.0, 303.15, 2.0, 333550.0, 273.15), 5)
    0.12868
    """
    t = _values("duration", duration, "s")
    times, temps = ambient_profile(t_ambient)
    m = _values("coolant_mass", coolant_mass, "kg")
    if on_impossible not in ("raise", "nan"):
        raise ValueError(f"on_impossible: unknown {on_impossible!r}; valid: ['raise', 'nan']")

    def hold(ua):
        return hold_time(
            ua,
            (times, temps),
            m,
            latent_heat,
            t_phase_change,
            payload_heat_capacity,
            t_payload_start,
            t_payload_max,
        )

    # validates the other arguments and gives the broadcast shape
    hold_lo = np.asarray(hold(_UA_MIN))
    shape = broadcast_shape(
        duration=t, **{"coolant_mass, latent_heat, t_phase_change, ...": hold_lo}
    )

    def ok(ua):
        return hold(ua) >= t

    ok_lo = np.broadcast_to(hold_lo >= t, shape)
    lo = np.full(shape, _UA_MIN)
    # bracket: widen the upper end while it still holds; holding at
    # _UA_MAX means no limit (the coolant is never spent in the duration)
    hi = np.full(shape, 1e4)
    ok_hi = np.broadcast_to(ok(hi), shape)
    while np.any(ok_hi & (hi < _UA_MAX)):
        hi = np.where(ok_hi, np.minimum(hi * 1e4, _UA_MAX), hi)
        ok_hi = np.broadcast_to(ok(hi), shape)
    g = _bisect(ok, lo, hi, increasing=False)
    g = np.where(ok_hi, np.inf, g)
    g = _impossible(
        ~ok_lo,
        g,
        on_impossible,
        "duration: not reachable with this coolant even with near-perfect insulation "
        "(too little coolant for the payload's start temperature, or the payload limit "
        "lies below the phase-change temperature)",
    )
    return scalar_or_array(g)


def thickness_for_duration(
    duration: ArrayLike,
    conductance_of_thickness: Callable[[np.ndarray], ArrayLike],
    t_ambient: AmbientLike,
    coolant_mass: ArrayLike,
    latent_heat: ArrayLike,
    t_phase_change: ArrayLike,
    thickness_max: float = 0.3,
    thickness_min: float = 1e-4,
    payload_heat_capacity: ArrayLike = 0.0,
    t_payload_start: ArrayLike | None = None,
    t_payload_max: ArrayLike | None = None,
    on_impossible: str = "raise",
) -> float | np.ndarray:
    """Insulation thickness that holds for a target duration with a given coolant mass.

    Parameters
    ----------
    duration : float or array
        Target hold time. [s]
    conductance_of_thickness : callable
        ``f(thickness [m] array) -> conductance [W/K] array`` of the same
        shape, decreasing with thickness (e.g. a wrapper of
        :func:`workbench.geometry.box_conductance` for one wall build-up per
        element).
    t_ambient : float or (array, array)
        Ambient temperature [K] or step profile.
    coolant_mass, latent_heat, t_phase_change : float or array
        Coolant. [kg], [J/kg], [K]
    thickness_max, thickness_min : float
        Search bounds. [m]
    payload_heat_capacity, t_payload_start, t_payload_max
        As for :func:`hold_time`. [J/K], [K], [K]
    on_impossible : str
        ``"raise"`` (default) or ``"nan"`` where ``thickness_max`` is not enough.

    Returns
    -------
    float or array
        Smallest thickness meeting the duration (``thickness_min`` where
        that already suffices). [m]

    Notes
    -----
    Two monotone bisections: the largest UA (:func:`max_conductance_for_duration`),
    then the thickness with :math:`UA(d) \\le UA_{max}`.

    References
    ----------
    Energy balance (``incropera7``, §1.3); shape factors of the box in
    ``conductance_of_thickness``.

    Examples
    --------
    >>> from workbench.geometry import box_conductance
    >>> f = lambda d: box_conductance(0.3, 0.25, 0.2, d, 0.033)
    >>> round(thickness_for_duration(48 * 3600.0, f, 303.15, 4.0, 333550.0, 273.15), 4)
    0.0606
    """
    ua_max = np.asarray(
        max_conductance_for_duration(
            duration,
            t_ambient,
            coolant_mass,
            latent_heat,
            t_phase_change,
            payload_heat_capacity,
            t_payload_start,
            t_payload_max,
            on_impossible=on_impossible,
        )
    )
    d_hi = _scalar("thickness_max", thickness_max, "m")
    d_lo = _scalar("thickness_min", thickness_min, "m")
    if d_hi > 10.0:
        raise ValueError(f"thickness_max: at most 10 m of insulation [m], got {d_hi:g} m")
    if d_lo >= d_hi:
        raise ValueError("thickness_min: must be below thickness_max [m]")
    if not callable(conductance_of_thickness):
        raise TypeError(
            "conductance_of_thickness: expected a function of the thickness [m] giving the "
            f"conductance [W/K], got {conductance_of_thickness!r:.60}"
        )
    lo = np.full(ua_max.shape, d_lo)
    hi = np.full(ua_max.shape, d_hi)

    def ua_of(d):
        ua = conductance_of_thickness(d)
        try:
            ua = np.broadcast_to(np.asarray(ua, float), d.shape)
        except (TypeError, ValueError):
            raise ValueError(
                f"conductance_of_thickness: must return one conductance [W/K] per thickness "
                f"(shape {d.shape}), got {ua!r:.60}"
            ) from None
        if not np.all(np.isfinite(ua) & (ua > 0)):
            raise ValueError(
                "conductance_of_thickness: returned a conductance that is not finite and > 0 [W/K] "
                f"for thicknesses in [{d.min():g}, {d.max():g}] m"
            )
        return ua

    if np.any(ua_of(lo) < ua_of(hi)):
        raise ValueError(
            "conductance_of_thickness: the conductance must decrease with the thickness (it "
            f"rises from {d_lo:g} m to {d_hi:g} m)"
        )

    def ok(d):
        return ua_of(d) <= ua_max

    d = _bisect(ok, lo, hi, increasing=True)
    d = np.where(ok(lo), d_lo, d)
    d = _impossible(
        ~ok(hi) | np.isnan(ua_max),
        d,
        on_impossible,
        "duration: thickness_max is not enough insulation for it with this coolant mass",
    )
    return scalar_or_array(d)
