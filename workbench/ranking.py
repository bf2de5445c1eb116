"""Trade-offs between candidates: Pareto fronts, hard limits, material indices, scores.

Pure numeric core (numpy only). Every function takes plain arrays with one row
per candidate and one column per criterion; nothing here knows about tables or
widgets.

Contents
--------
- :func:`pareto_front` -- exact non-dominated mask, all objectives minimised.
- :func:`oriented` -- turn mixed minimise/maximise columns into "all minimised".
- hard limits -- :class:`Limit`, :func:`check_limit`, :func:`check_service_range`,
  :func:`screen_candidates`, :func:`combine_constraints`, all returning a
  :class:`ConstraintResult` (keep-mask plus a reason for every removed row).
- :class:`Criterion` -- name, unit label and direction of one criterion.
- :func:`material_indices`, :func:`wall_for_resistance` -- the classic indices
  for a wall of given thermal resistance (Ashby method).
- :func:`normalise_criteria`, :func:`weighted_scores` -- min-max scores, 0 = best.
- :func:`simplex_weights`, :func:`rank_stability`, :func:`simplex_winner` --
  how the best candidate depends on the weights.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from math import comb

import numpy as np

from workbench._checks import (
    absolute_temperature,
    broadcast_shape,
    finite,
    finite_result,
    integer,
    nonnegative,
    positive,
    scalar,
)

__all__ = [
    "pareto_front",
    "oriented",
    "Criterion",
    "Limit",
    "ConstraintResult",
    "check_limit",
    "check_service_range",
    "combine_constraints",
    "screen_candidates",
    "MaterialIndices",
    "material_indices",
    "wall_for_resistance",
    "normalise_criteria",
    "weighted_scores",
    "simplex_weights",
    "RankStability",
    "rank_stability",
    "SimplexWinner",
    "simplex_winner",
]

_DIRECTIONS = ("minimise", "maximise")
_DIRECTION_ALIASES = {
    "minimise": "minimise",
    "minimize": "minimise",
    "min": "minimise",
    "maximise": "maximise",
    "maximize": "maximise",
    "max": "maximise",
}


def _direction(value: str, name: str = "direction") -> str:
    try:
        return _DIRECTION_ALIASES[str(value).lower()]
    except KeyError:
        raise ValueError(
            f"{name}: unknown direction {value!r}; valid: {sorted(_DIRECTION_ALIASES)}"
        ) from None


# ---------------------------------------------------------------------------
# Pareto front
# ---------------------------------------------------------------------------

_CELL_BUDGET = 1 << 16  # cells of the pre-filter grid
_CHUNK_ROWS = 1 << 15  # rows per chunk of the pivot pass (fits in L2 cache)
_SMALL = 4096  # below this many points the exact sieve runs directly


def pareto_front(objectives) -> np.ndarray:
    """Boolean mask of the non-dominated rows; every objective is minimised.

    Parameters
    ----------
    objectives : array_like, shape (n_points, n_objectives)
        Objective values, one row per point, any number of columns, all to be
        minimised (negate a column to maximise it, see :func:`oriented`).
        Units are those of each column [any]; only the order within a column
        matters.

    Returns
    -------
    numpy.ndarray of bool, shape (n_points,)
        ``True`` for the points of the Pareto front [-].

    Raises
    ------
    ValueError
        If ``objectives`` is not 2-D, has no column, or holds NaN or infinity.

    Notes
    -----
    Point :math:`a` dominates point :math:`b` when

    .. math:: a_j \\le b_j \\;\\forall j \\quad\\text{and}\\quad a_j < b_j
              \\;\\text{for some } j .

    The mask is exact (no tolerance): a point is kept if and only if no other
    point dominates it. Points equal in every objective do not dominate each
    other, so all duplicates of a non-dominated point are kept.

    Method (all steps vectorised numpy, no compiled extension):

    1. an exact pivot pass, used when a sample shows that it pays (weakly
       correlated objectives): the point of least range-normalised sum
       dominates most points, which are dropped in one cache-friendly sweep;
       with three or more objectives the survivors are split into the regions
       ``x_j < pivot_j``, each closed under domination, and each region is
       pre-filtered as in step 2 with its own bin ranges;
    2. an exact grid pre-filter: the first ``d - 1`` objectives are binned
       with a monotone map (so a lower bin means a strictly lower value), the
       minimum of the last objective is taken per cell, and a point is dropped
       when some cell strictly below it in every binned objective holds a
       value of the last objective no larger than its own;
    3. an exact sieve on the survivors after sorting the distinct points
       lexicographically (a dominator always sorts first): a running minimum
       for two objectives, a divide-and-conquer sweep over the sorted order
       (offline two-dimensional dominance, :math:`O(n \\log n)` with one pass
       per level) for three, and for four or more a divide and conquer over
       the sorted order that checks the front of the second half against
       the front of the first.

    The pre-filters only remove points that are dominated, so the result is
    the same as the :math:`O(n^2)` definition.

    References
    ----------
    ``kung-1975``: Kung H. T., Luccio F., Preparata F. P., "On finding the
    maxima of a set of vectors", Journal of the ACM 22(4), 1975, 469-476
    (dominance, lexicographic sweep, divide and conquer).

    Examples
    --------
    >>> pareto_front([[1.0, 4.0], [2.0, 2.0], [3.0, 3.0], [2.0, 2.0], [4.0, 1.0]])
    array([ True,  True, False,  True,  True])
    """
    x = finite("objectives", objectives) if _is_small(objectives) else _as_float("objectives", objectives)
    if x.ndim != 2:
        raise ValueError(
            f"objectives: expected a 2-D array (n_points, n_objectives), got shape {x.shape}"
        )
    n, d = x.shape
    if d == 0:
        raise ValueError("objectives: need at least one objective column")
    mask = np.zeros(n, dtype=bool)
    if n == 0:
        return mask
    if n <= _SMALL or d == 1:
        _check_finite(x)
        return _exact(x)
    idx = None
    pivot = _sample_pivot(x)
    if pivot is None:
        _check_finite(x)
    else:
        idx, p = _pivot_pass(x, *pivot)
        if d >= 3 and _SMALL < idx.shape[0] <= n // 4:
            idx = _region_filter(x, idx, p)
    y = x if idx is None else x.take(idx, axis=0)
    if y.shape[0] > _SMALL and (d == 2 or y.shape[0] > n // 4):
        keep = _grid_min_filter(y)
        idx = keep if idx is None else idx[keep]
        y = y.take(keep, axis=0)
    keep = _exact(y)
    mask[keep.nonzero()[0] if idx is None else idx[keep]] = True
    return mask


def _is_small(value) -> bool:
    """Lists, scalars and small arrays take the full check; large arrays are checked lazily."""
    return not isinstance(value, np.ndarray) or value.size <= _SMALL


def _as_float(name: str, value) -> np.ndarray:
    if value.dtype.kind == "b":
        raise ValueError(f"{name}: expected numbers, got a boolean array")
    try:
        return np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise ValueError(f"{name}: expected numbers, got an array of {value.dtype}") from None


def _check_finite(x: np.ndarray) -> None:
    with np.errstate(over="ignore", invalid="ignore"):
        total = x.sum()
    if not np.isfinite(total) and not np.isfinite(x).all():
        raise ValueError("objectives: must be finite (got NaN or infinity)")


def _sample_ranges(x: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    smp = x[:: max(1, x.shape[0] // 4096)]
    cols = [np.ascontiguousarray(smp[:, j]) for j in range(x.shape[1])]
    return np.array([c.min() for c in cols]), np.array([c.max() for c in cols])


def _sample_pivot(x: np.ndarray) -> tuple[np.ndarray, np.ndarray] | None:
    """(pivot, weights) if a sample shows the pivot dominates most points, else None.

    The pivot is the sample point of least range-normalised sum.
    """
    n = x.shape[0]
    smp = x[:: max(1, n // 8192)]
    lo, hi = _sample_ranges(smp)
    with np.errstate(over="ignore", invalid="ignore", divide="ignore"):
        span = hi - lo
        w = 1.0 / np.where(np.isfinite(span) & (span > 0), span, 1.0)
        ss = smp @ w
    if not np.isfinite(ss).all():
        return None
    p = smp[int(np.argmin(ss))]
    dominated = (smp >= p).all(axis=1) & (smp > p).any(axis=1)
    if dominated.mean() < 0.75:
        return None
    return p.copy(), w


def _pivot_pass(x: np.ndarray, p: np.ndarray, w: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """One cache-friendly sweep: drop the rows strictly dominated by a running pivot.

    The pivot starts at ``p`` and moves to any point of smaller weighted sum
    met on the way; rows are tested against the pivot current for their chunk,
    and the survivors once more against the final pivot. Also checks that
    every value is finite.
    """
    n, d = x.shape
    dom = np.empty(n, dtype=bool)
    m = min(n, _CHUNK_ROWS)
    tmp = np.empty(m, dtype=bool)
    sc = np.empty(m)
    st = np.empty(m)
    best = float(p @ w)
    with np.errstate(over="ignore", invalid="ignore"):
        for a in range(0, n, _CHUNK_ROWS):
            c = x[a : a + _CHUNK_ROWS]
            k = c.shape[0]
            cs = sc[:k]
            np.multiply(c[:, 0], w[0], out=cs)
            for j in range(1, d):
                np.multiply(c[:, j], w[j], out=st[:k])
                cs += st[:k]
            i = int(np.argmin(cs))
            if not cs[i] >= best:  # also true for NaN
                if not np.isfinite(cs).all():
                    _check_finite(c)
                    cs[~np.isfinite(cs)] = np.inf  # finite values whose sum overflowed
                    i = int(np.argmin(cs))
                if cs[i] < best:
                    best = float(cs[i])
                    p = c[i].copy()
            elif not np.isfinite(cs[cs.argmax()]):
                _check_finite(c)
            dd = dom[a : a + _CHUNK_ROWS]
            tt = tmp[:k]
            np.greater(c[:, 0], p[0], out=dd)  # strict in one column: row != p
            for j in range(1, d):
                np.greater_equal(c[:, j], p[j], out=tt)
                dd &= tt
    np.logical_not(dom, out=dom)
    idx = np.flatnonzero(dom)
    y = x.take(idx, axis=0)
    dd = y[:, 0] > p[0]
    for j in range(1, d):
        dd &= y[:, j] >= p[j]
    return idx[~dd], p


def _region_filter(x: np.ndarray, idx: np.ndarray, p: np.ndarray) -> np.ndarray:
    """Grid-filter each region {x_0 <= p_0}, {x_j < p_j} with its own bin ranges.

    Every dominator of a member of a region lies in the same region, so a
    point found dominated inside any region it belongs to is dominated.
    """
    y = x.take(idx, axis=0)
    bad = np.zeros(idx.shape[0], dtype=bool)
    for j in range(x.shape[1]):
        col = y[:, j]
        members = np.flatnonzero(col <= p[j] if j == 0 else col < p[j])
        if members.shape[0] > 64:
            ok = np.zeros(members.shape[0], dtype=bool)
            ok[_grid_min_filter(y.take(members, axis=0))] = True
            bad[members[~ok]] = True
    return idx[~bad]


def _bins(c: np.ndarray, lo: float, hi: float, g: int) -> np.ndarray:
    """Monotone non-decreasing bin index in [0, g - 1]; values outside clip."""
    with np.errstate(over="ignore", invalid="ignore"):
        span = hi - lo
        scale = g / span if span > 0 and np.isfinite(g / span) else 0.0
        if not scale > 0:  # degenerate or overflowing range: one bin
            return np.zeros(c.shape[0], dtype=np.intp)
        t = np.subtract(c, lo)
        t *= scale
    np.minimum(t, g - 1, out=t)
    np.maximum(t, 0, out=t)
    return t.astype(np.intp)


def _grid_min_filter(x: np.ndarray) -> np.ndarray:
    """Indices of the rows that survive the exact grid pre-filter."""
    m, d = x.shape
    k = d - 1
    g = int(min(round((m / 8) ** (1.0 / k)), round(_CELL_BUDGET ** (1.0 / k))))
    if g < 2:
        return np.arange(m)
    lo, hi = _sample_ranges(x)
    lin = _bins(x[:, 0], lo[0], hi[0], g)
    for j in range(1, k):
        lin *= g
        lin += _bins(x[:, j], lo[j], hi[j], g)
    last = x[:, k]
    cmin = np.full(g**k, np.inf)
    np.minimum.at(cmin, lin, last)
    cmin = cmin.reshape((g,) * k)
    thr = np.full_like(cmin, np.inf)  # min over cells strictly lower in every axis
    thr[(slice(1, None),) * k] = cmin[(slice(None, -1),) * k]
    for j in range(k):
        np.minimum.accumulate(thr, axis=j, out=thr)
    return np.flatnonzero(last < thr.reshape(-1)[lin])


def _dense_rank(c: np.ndarray) -> tuple[np.ndarray, int]:
    o = np.argsort(c)
    s = c[o]
    g = np.empty(c.shape[0], dtype=np.int64)
    g[0] = 0
    np.cumsum(s[1:] != s[:-1], out=g[1:])
    r = np.empty(c.shape[0], dtype=np.int64)
    r[o] = g
    return r, int(g[-1]) + 1


def _unique_lex(x: np.ndarray):
    """Lexicographic order of the rows, first-of-run flags, run ids, column ranks."""
    m, d = x.shape
    ranks = [_dense_rank(x[:, j]) for j in range(d)]
    total = 1.0
    for _, nj in ranks:
        total *= nj
    new = np.empty(m, dtype=bool)
    new[0] = True
    if total < 2.0**62:
        key = ranks[0][0].copy()
        for r, nj in ranks[1:]:
            key *= nj
            key += r
        o = np.argsort(key)
        ks = key[o]
        np.not_equal(ks[1:], ks[:-1], out=new[1:])
    else:
        o = np.lexsort(tuple(r for r, _ in reversed(ranks)))
        rs = np.stack([r[o] for r, _ in ranks], axis=1)
        new[1:] = (rs[1:] != rs[:-1]).any(axis=1)
    uid = np.cumsum(new) - 1
    return o, new, uid, [r for r, _ in ranks]


def _exact(x: np.ndarray) -> np.ndarray:
    m, d = x.shape
    if m == 0:
        return np.zeros(0, dtype=bool)
    if d == 1:
        return x[:, 0] == x[:, 0].min()
    if d == 2:
        return _front_2d(x)
    if d == 3:
        return _front_3d(x)
    return _front_blocks(x)


def _front_2d(x: np.ndarray) -> np.ndarray:
    r0, _ = _dense_rank(x[:, 0])
    r1, n1 = _dense_rank(x[:, 1])
    o = np.argsort(r0 * n1 + r1)  # by first objective, ties by second
    a = r0[o]
    b = r1[o]
    m = a.shape[0]
    new = np.empty(m, dtype=bool)
    new[0] = True
    np.not_equal(a[1:], a[:-1], out=new[1:])
    start = np.flatnonzero(new)
    gid = np.cumsum(new) - 1
    run_min = np.minimum.accumulate(b)
    before = np.empty(start.shape[0], dtype=np.int64)  # min over strictly smaller first
    before[0] = n1
    before[1:] = run_min[start[1:] - 1]
    dom = (before[gid] <= b) | (b[start][gid] < b)  # equal first: smaller second wins
    keep = np.empty(m, dtype=bool)
    keep[o] = ~dom
    return keep


def _front_3d(x: np.ndarray) -> np.ndarray:
    o, new, uid, ranks = _unique_lex(x)
    rep = o[new]
    dom = _cdq_2d_dominance(ranks[1][rep], ranks[2][rep])
    keep = np.empty(x.shape[0], dtype=bool)
    keep[o] = ~dom[uid]
    return keep


def _cdq_2d_dominance(ry: np.ndarray, rz: np.ndarray) -> np.ndarray:
    """Position i is dominated if some j < i has ry[j] <= ry[i] and rz[j] <= rz[i].

    Divide and conquer over positions, top-down: at each level the points of
    every segment are kept in ``ry`` order (ties by position); the left-half
    points feed a segmented running minimum of ``rz`` (encoded as a running
    maximum with a per-segment offset) that the right-half points query; then
    each segment is split stably into its halves.
    """
    u = ry.shape[0]
    dom = np.zeros(u, dtype=bool)
    if u <= 1:
        return dom
    pos = np.arange(u, dtype=np.int64)
    cur = np.argsort(ry * u + pos)
    big = u + 1
    cl = np.zeros(u + 1, dtype=np.int64)
    for lh in range((u - 1).bit_length() - 1, -1, -1):
        seg = cur >> (lh + 1)
        left = ((cur >> lh) & 1) == 0
        thr = (seg + 1) * big + (big - 1) - rz[cur]
        v = np.where(left, thr, 0)
        np.maximum.accumulate(v, out=v)
        hit = v >= thr
        hit &= ~left
        dom[cur[hit]] = True
        if lh == 0:
            break
        np.cumsum(left, out=cl[1:])
        s0 = seg << (lh + 1)
        lb = cl[:-1] - cl[s0]
        new_idx = np.where(left, s0 + lb, s0 + (1 << lh) + (pos - s0 - lb))
        nxt = np.empty_like(cur)
        nxt[new_idx] = cur
        cur = nxt
    return dom


def _front_blocks(x: np.ndarray) -> np.ndarray:
    """Exact front for four or more objectives: divide and conquer in lexicographic order.

    The distinct points are sorted lexicographically, so a point can only be
    dominated by points before it. The front of the first half is found
    recursively, as is that of the second half; a point of the second front
    survives unless some point of the first front is <= it in every objective.
    """
    m, d = x.shape
    o, new, uid, _ = _unique_lex(x)
    u = x[o[new]]
    cols = [np.ascontiguousarray(u[:, j]) for j in range(d)]
    keep_u = _dc_front(cols, 0, u.shape[0])
    keep = np.empty(m, dtype=bool)
    keep[o] = keep_u[uid]
    return keep


def _weakly_dominated(cols, cand: np.ndarray, by: np.ndarray) -> np.ndarray:
    """For each row index in ``cand``: is some row in ``by`` <= it in every column?"""
    out = np.zeros(cand.shape[0], dtype=bool)
    if by.shape[0] == 0 or cand.shape[0] == 0:
        return out
    step = max(1, (1 << 21) // by.shape[0])
    by_cols = [c[by][None, :] for c in cols]
    for a in range(0, cand.shape[0], step):
        ci = cand[a : a + step]
        le = by_cols[0] <= cols[0][ci][:, None]
        for bc, c in zip(by_cols[1:], cols[1:], strict=True):
            le &= bc <= c[ci][:, None]
        out[a : a + step] = le.any(axis=1)
    return out


def _dc_front(cols, lo: int, hi: int) -> np.ndarray:
    """Keep-mask of rows lo..hi-1 (distinct, lexicographically sorted)."""
    n = hi - lo
    if n <= 256:
        le = np.ones((n, n), dtype=bool)
        for c in cols:
            v = c[lo:hi]
            le &= v[None, :] <= v[:, None]  # le[i, j]: row j <= row i
        le &= np.tri(n, k=-1, dtype=bool)  # only earlier rows can dominate
        return ~le.any(axis=1)
    mid = lo + n // 2
    kl = _dc_front(cols, lo, mid)
    kr = _dc_front(cols, mid, hi)
    left = np.flatnonzero(kl) + lo
    right = np.flatnonzero(kr) + mid
    kr[right - mid] = ~_weakly_dominated(cols, right, left)
    return np.concatenate([kl, kr])


def oriented(values, directions: Sequence[str]) -> np.ndarray:
    """Criteria columns turned so that every column is minimised.

    Parameters
    ----------
    values : array_like, shape (n_candidates, n_criteria)
        Criterion values [unit of each column].
    directions : sequence of str
        ``"minimise"`` or ``"maximise"`` per column (``"min"``/``"max"`` accepted).

    Returns
    -------
    numpy.ndarray, shape (n_candidates, n_criteria)
        ``values`` with the maximised columns negated [unit of each column].

    Notes
    -----
    :math:`y_j = x_j` for a minimised and :math:`y_j = -x_j` for a maximised
    criterion, so "larger is better" becomes "smaller is better".

    References
    ----------
    ``common-practice``: sign flip of maximised objectives.

    Examples
    --------
    >>> oriented([[1.0, 2.0]], ["min", "max"])
    array([[ 1., -2.]])
    """
    x = finite("values", values)
    if x.ndim != 2:
        raise ValueError(f"values: expected shape (n_candidates, n_criteria), got {x.shape}")
    dirs = [_direction(d, "directions") for d in directions]
    if len(dirs) != x.shape[1]:
        raise ValueError(
            f"directions: expected {x.shape[1]} entries (one per column), got {len(dirs)}"
        )
    sign = np.array([1.0 if d == "minimise" else -1.0 for d in dirs])
    return x * sign


# ---------------------------------------------------------------------------
# Criteria and hard limits
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Criterion:
    """One decision criterion: a name, a unit label and a direction.

    Examples
    --------
    >>> Criterion("mass per area", "kg/m²", "minimise").sign
    1.0
    """

    name: str
    unit: str
    direction: str = "minimise"

    def __post_init__(self) -> None:
        object.__setattr__(self, "direction", _direction(self.direction))

    @property
    def sign(self) -> float:
        """+1 for a minimised, -1 for a maximised criterion."""
        return 1.0 if self.direction == "minimise" else -1.0

    @property
    def label(self) -> str:
        """Axis label such as ``"mass per area [kg/m²]"``."""
        return f"{self.name} [{self.unit}]" if self.unit else self.name


@dataclass(frozen=True, eq=False)
class Limit:
    """A hard limit on one per-candidate quantity.

    ``direction="max"`` means the value must not exceed ``limit`` (e.g. a mass
    budget); ``direction="min"`` means it must reach at least ``limit`` (e.g. a
    required hold time).
    """

    name: str
    values: np.ndarray
    limit: float
    direction: str = "max"
    unit: str = ""


@dataclass(frozen=True, eq=False)
class ConstraintResult:
    """Outcome of hard limits: ``keep`` mask and one reason per candidate.

    ``reasons[i]`` is ``""`` for a kept candidate and a sentence naming every
    violated limit (joined with ``"; "``) for a removed one.
    """

    keep: np.ndarray
    reasons: tuple[str, ...]

    @property
    def removed(self) -> np.ndarray:
        """Indices of the removed candidates."""
        return np.flatnonzero(~self.keep)


def _fmt(v: float, unit: str) -> str:
    return f"{v:.4g} {unit}".rstrip()


def check_limit(limit: Limit) -> ConstraintResult:
    """Apply one :class:`Limit` to every candidate.

    Parameters
    ----------
    limit : Limit
        Values per candidate [limit.unit], the limit [limit.unit] and its
        direction (``"max"``: value <= limit; ``"min"``: value >= limit).

    Returns
    -------
    ConstraintResult
        Keep-mask and a reason for each removed candidate.

    Notes
    -----
    Keep :math:`v_i \\le v_{lim}` (``"max"``) or :math:`v_i \\ge v_{lim}`
    (``"min"``); a value equal to the limit passes.

    References
    ----------
    ``common-practice``: screening on hard limits before ranking.

    Examples
    --------
    >>> r = check_limit(Limit("thickness", [0.02, 0.08], 0.05, "max", "m"))
    >>> r.keep
    array([ True, False])
    >>> r.reasons[1]
    'thickness 0.08 m exceeds the maximum 0.05 m'
    """
    v = finite(limit.name, limit.values, limit.unit)
    v = np.atleast_1d(v)
    if v.ndim != 1 or v.size == 0:
        raise ValueError(f"{limit.name}: expected one value per candidate [{limit.unit}], got shape {v.shape}")
    lim = scalar(f"{limit.name} limit", limit.limit, limit.unit)
    direction = str(limit.direction).lower()
    if direction not in ("max", "min"):
        raise ValueError(f"direction: unknown {limit.direction!r}; valid: ['max', 'min']")
    if direction == "max":
        keep = v <= lim
        msg = "{name} {v} exceeds the maximum {lim}"
    else:
        keep = v >= lim
        msg = "{name} {v} is below the minimum {lim}"
    reasons = tuple(
        "" if k else msg.format(name=limit.name, v=_fmt(vi, limit.unit), lim=_fmt(lim, limit.unit))
        for k, vi in zip(keep.tolist(), v.tolist(), strict=True)
    )
    return ConstraintResult(keep=keep, reasons=reasons)


def check_service_range(t_service_min, t_service_max, t_face_min, t_face_max) -> ConstraintResult:
    """Keep the candidates whose service temperature range covers the face temperatures.

    Parameters
    ----------
    t_service_min, t_service_max : array_like
        Lowest and highest service temperature of each candidate material [K].
    t_face_min, t_face_max : array_like
        Coldest and hottest temperature the material will see (usually the
        cold and hot faces of its layer); broadcast against the candidates [K].

    Returns
    -------
    ConstraintResult
        Keep-mask and a reason for each removed candidate.

    Notes
    -----
    Keep :math:`T_{service,min} \\le T_{face,min}` and
    :math:`T_{face,max} \\le T_{service,max}`. Service limits in data sheets
    are indicative; fire behaviour, creep and outgassing near the limits call
    for the supplier's data, testing and the applicable codes.

    References
    ----------
    ``common-practice``: service-temperature screening of insulation materials.

    Examples
    --------
    >>> r = check_service_range([233.15, 233.15], [353.15, 523.15], 253.15, 373.15)
    >>> r.keep
    array([False,  True])
    >>> r.reasons[0]
    'hot face 373.15 K is above the service limit 353.15 K'
    """
    lo = absolute_temperature("t_service_min", t_service_min)
    hi = absolute_temperature("t_service_max", t_service_max)
    fmin = absolute_temperature("t_face_min", t_face_min)
    fmax = absolute_temperature("t_face_max", t_face_max)
    broadcast_shape(t_service_min=lo, t_service_max=hi, t_face_min=fmin, t_face_max=fmax)
    lo, hi, fmin, fmax = np.broadcast_arrays(lo, hi, fmin, fmax)
    lo, hi, fmin, fmax = (np.atleast_1d(a) for a in (lo, hi, fmin, fmax))
    if lo.ndim != 1 or lo.size == 0:
        raise ValueError(
            "t_service_min, t_service_max, t_face_min, t_face_max: expected one value per "
            f"candidate [K], got shape {lo.shape}"
        )
    too_hot = fmax > hi
    too_cold = fmin < lo
    reasons = []
    for i in range(lo.shape[0]):
        parts = []
        if too_hot[i]:
            parts.append(f"hot face {fmax[i]:.2f} K is above the service limit {hi[i]:.2f} K")
        if too_cold[i]:
            parts.append(f"cold face {fmin[i]:.2f} K is below the service limit {lo[i]:.2f} K")
        reasons.append("; ".join(parts))
    return ConstraintResult(keep=~(too_hot | too_cold), reasons=tuple(reasons))


def combine_constraints(*results: ConstraintResult) -> ConstraintResult:
    """Logical AND of several constraint results; reasons are joined with ``"; "``.

    Parameters
    ----------
    *results : ConstraintResult
        Results over the same candidates [-].

    Returns
    -------
    ConstraintResult
        Kept where every result keeps; the reasons of all violated limits.

    Notes
    -----
    :math:`keep_i = \\bigwedge_r keep_{r,i}`.

    References
    ----------
    ``common-practice``: screening on hard limits before ranking.

    Examples
    --------
    >>> a = check_limit(Limit("mass per area", [1.0, 9.0], 5.0, "max", "kg/m²"))
    >>> b = check_limit(Limit("cost per area", [30.0, 10.0], 20.0, "max", "EUR/m²"))
    >>> combine_constraints(a, b).keep
    array([False, False])
    """
    if not results:
        raise ValueError("results: need at least one ConstraintResult")
    n = results[0].keep.shape[0]
    for r in results:
        if r.keep.shape[0] != n:
            raise ValueError(
                f"results: every result must cover the same {n} candidates, got {r.keep.shape[0]}"
            )
    keep = np.logical_and.reduce([r.keep for r in results])
    reasons = tuple("; ".join(r.reasons[i] for r in results if r.reasons[i]) for i in range(n))
    return ConstraintResult(keep=keep, reasons=reasons)


def screen_candidates(
    *,
    t_service_min=None,
    t_service_max=None,
    t_hot=None,
    t_cold=None,
    thickness=None,
    max_thickness: float | None = None,
    mass_per_area=None,
    max_mass_per_area: float | None = None,
    cost_per_area=None,
    max_cost_per_area: float | None = None,
    limits: Sequence[Limit] = (),
) -> ConstraintResult:
    """Apply the usual hard limits at once; only the limits given are checked.

    Parameters
    ----------
    t_service_min, t_service_max : array_like, optional
        Service temperature range of each candidate [K].
    t_hot, t_cold : float or array_like, optional
        Hottest and coldest face temperature the candidate will see [K].
    thickness, max_thickness : array_like, float, optional
        Candidate thickness and its upper limit [m].
    mass_per_area, max_mass_per_area : array_like, float, optional
        Candidate mass per area and its upper limit [kg/m²].
    cost_per_area, max_cost_per_area : array_like, float, optional
        Candidate cost per area and its upper limit [currency/m²].
    limits : sequence of Limit
        Any further application limits (array + limit + direction).

    Returns
    -------
    ConstraintResult
        Combined keep-mask and reasons.

    Notes
    -----
    Keep :math:`T_{s,min} \\le T_{cold}`, :math:`T_{hot} \\le T_{s,max}`,
    :math:`L \\le L_{max}`, :math:`m'' \\le m''_{max}`,
    :math:`C'' \\le C''_{max}` and every extra limit.

    References
    ----------
    ``common-practice``: screening on hard limits before ranking.

    Examples
    --------
    >>> r = screen_candidates(thickness=[0.03, 0.06], max_thickness=0.05,
    ...                       mass_per_area=[2.0, 1.0], max_mass_per_area=1.5)
    >>> r.keep
    array([False, False])
    >>> r.reasons[1]
    'thickness 0.06 m exceeds the maximum 0.05 m'
    """
    parts: list[ConstraintResult] = []
    given = [("t_service_min", t_service_min), ("t_service_max", t_service_max),
             ("t_hot", t_hot), ("t_cold", t_cold)]
    if any(v is not None for _, v in given):
        missing = [n for n, v in given if v is None]
        if missing:
            raise ValueError(
                f"{', '.join(missing)}: give all of t_service_min, t_service_max, t_hot, t_cold "
                "[K] to check the service range"
            )
        checked = {n: absolute_temperature(n, v) for n, v in given}
        broadcast_shape(**checked)
        parts.append(check_service_range(t_service_min, t_service_max, t_cold, t_hot))
    pairs = [
        ("thickness", "thickness", thickness, "max_thickness", max_thickness, "m"),
        ("mass per area", "mass_per_area", mass_per_area, "max_mass_per_area", max_mass_per_area,
         "kg/m²"),
        ("cost per area", "cost_per_area", cost_per_area, "max_cost_per_area", max_cost_per_area,
         "currency/m²"),
    ]
    for label, vname, vals, lname, lim, unit in pairs:
        if (vals is None) != (lim is None):
            raise ValueError(f"{vname}, {lname}: give both the values and the limit [{unit}]")
        if vals is not None:
            v = nonnegative(vname, vals, unit)
            if np.ndim(v) > 1 or np.size(v) == 0:
                raise ValueError(f"{vname}: expected one value per candidate [{unit}], got shape {np.shape(v)}")
            lim = float(nonnegative(lname, scalar(lname, lim, unit), unit))
            parts.append(check_limit(Limit(label, v, lim, "max", unit)))
    parts.extend(check_limit(lim) for lim in limits)
    if not parts:
        raise ValueError("screen_candidates: no limit given")
    n = {p.keep.shape[0] for p in parts}
    if len(n) > 1:
        raise ValueError(
            "t_service_min, t_service_max, t_hot, t_cold, thickness, mass_per_area, "
            f"cost_per_area: the limits cover different numbers of candidates {sorted(n)}"
        )
    return combine_constraints(*parts)


# ---------------------------------------------------------------------------
# Material indices for a wall of given thermal resistance
# ---------------------------------------------------------------------------


@dataclass(frozen=True, eq=False)
class MaterialIndices:
    """Material indices for a wall of prescribed thermal resistance (all minimised).

    ``thickness_index`` = k [W/(m·K)], ``mass_index`` = ρ·k [kg·W/(m⁴·K)],
    ``cost_index`` = c_m·ρ·k [currency·W/(m⁴·K)] (``None`` without prices).
    """

    thickness_index: np.ndarray
    mass_index: np.ndarray
    cost_index: np.ndarray | None


def material_indices(conductivity, density, cost_per_kg=None) -> MaterialIndices:
    """Classic indices for a plane wall that must provide a given thermal resistance.

    Parameters
    ----------
    conductivity : array_like
        Thermal conductivity k of each material [W/(m·K)].
    density : array_like
        Density ρ [kg/m³].
    cost_per_kg : array_like, optional
        Price per mass c_m [currency/kg].

    Returns
    -------
    MaterialIndices
        ``k`` [W/(m·K)], ``ρ·k`` [kg·W/(m⁴·K)], ``c_m·ρ·k`` [currency·W/(m⁴·K)];
        smaller is better for each.

    Notes
    -----
    A slab of thickness :math:`L` has the resistance :math:`R = L/k` per unit
    area. Fixing :math:`R` (the function) leaves :math:`L` free, so

    .. math::
        L = R\\,k, \\qquad
        \\frac{m}{A} = \\rho L = R\\,(\\rho k), \\qquad
        \\frac{C}{A} = c_m \\rho L = R\\,(c_m \\rho k).

    With :math:`R` the same for every candidate, the thinnest wall has the
    least :math:`k`, the lightest the least :math:`\\rho k`, the cheapest the
    least :math:`c_m \\rho k` (equivalently maximise the reciprocals). On a
    log-log chart of :math:`\\rho` against :math:`k`, lines of equal
    :math:`\\rho k` have slope -1.

    References
    ----------
    ``ashby-2011``: Ashby M. F., Materials Selection in Mechanical Design,
    4th ed., 2011 (method of material indices).

    Examples
    --------
    >>> ix = material_indices([0.04, 0.2], [30.0, 1200.0], [4.0, 2.0])
    >>> ix.mass_index
    array([  1.2, 240. ])
    >>> ix.cost_index
    array([  4.8, 480. ])
    """
    k = positive("conductivity", conductivity, "W/(m·K)")
    rho = positive("density", density, "kg/m³")
    broadcast_shape(conductivity=k, density=rho)
    k, rho = np.broadcast_arrays(k, rho)
    mass = rho * k
    cost = None
    if cost_per_kg is not None:
        cm = nonnegative("cost_per_kg", cost_per_kg, "currency/kg")
        broadcast_shape(conductivity=k, cost_per_kg=cm)
        cost = cm * mass
    finite_result("material_indices", (mass, cost), "conductivity", "density", "cost_per_kg")
    return MaterialIndices(thickness_index=k.copy(), mass_index=mass, cost_index=cost)


def wall_for_resistance(resistance, conductivity, density, cost_per_kg=None):
    """Thickness, mass and cost per area of a single-material wall of resistance ``R``.

    Parameters
    ----------
    resistance : float or array_like
        Required thermal resistance of the slab [m²·K/W].
    conductivity : array_like
        Thermal conductivity [W/(m·K)].
    density : array_like
        Density [kg/m³].
    cost_per_kg : array_like, optional
        Price per mass [currency/kg].

    Returns
    -------
    tuple of numpy.ndarray
        ``(thickness [m], mass_per_area [kg/m²], cost_per_area [currency/m²])``;
        the last is ``None`` without prices.

    Notes
    -----
    :math:`L = R k`, :math:`m/A = \\rho R k`, :math:`C/A = c_m \\rho R k`
    (see :func:`material_indices`).

    References
    ----------
    ``ashby-2011``: Ashby M. F., Materials Selection in Mechanical Design,
    4th ed., 2011 (method of material indices).

    Examples
    --------
    >>> L, m, c = wall_for_resistance(2.0, [0.04, 0.2], [30.0, 1200.0], [4.0, 2.0])
    >>> L
    array([0.08, 0.4 ])
    >>> m
    array([  2.4, 480. ])
    """
    r = positive("resistance", resistance, "m²·K/W")
    ix = material_indices(conductivity, density, cost_per_kg)
    broadcast_shape(resistance=r, conductivity=ix.thickness_index)
    cost = None if ix.cost_index is None else r * ix.cost_index
    return finite_result(
        "wall_for_resistance", (r * ix.thickness_index, r * ix.mass_index, cost),
        "resistance", "conductivity", "density", "cost_per_kg",
    )


# ---------------------------------------------------------------------------
# Weighted scores and rank stability
# ---------------------------------------------------------------------------


def _values_and_signs(values, directions) -> tuple[np.ndarray, np.ndarray]:
    x = finite("values", values)
    if x.ndim != 2 or x.shape[0] == 0 or x.shape[1] == 0:
        raise ValueError(
            f"values: expected shape (n_candidates, n_criteria) with both > 0, got {x.shape}"
        )
    dirs = [
        _direction(d.direction if isinstance(d, Criterion) else d, "directions") for d in directions
    ]
    if len(dirs) != x.shape[1]:
        raise ValueError(
            f"directions: expected {x.shape[1]} entries (one per criterion), got {len(dirs)}"
        )
    return x, np.array([1.0 if d == "minimise" else -1.0 for d in dirs])


def normalise_criteria(values, directions) -> np.ndarray:
    """Min-max normalised criteria, direction-aware: 0 = best, 1 = worst candidate.

    Parameters
    ----------
    values : array_like, shape (n_candidates, n_criteria)
        Criterion values [unit of each column].
    directions : sequence of str or Criterion
        ``"minimise"`` / ``"maximise"`` per column.

    Returns
    -------
    numpy.ndarray, shape (n_candidates, n_criteria)
        Normalised values in [0, 1] [-].

    Notes
    -----
    For a minimised criterion :math:`s_{ij} = (x_{ij} - \\min_i x_{ij}) /
    (\\max_i x_{ij} - \\min_i x_{ij})`; for a maximised one
    :math:`s_{ij} = (\\max_i x_{ij} - x_{ij}) / (\\max_i x_{ij} - \\min_i x_{ij})`.
    The range is taken over the candidates given (so adding or removing a
    candidate can change the scores); a criterion on which all candidates
    are equal scores 0 for all.

    References
    ----------
    ``common-practice``: min-max normalisation of criteria.

    Examples
    --------
    >>> normalise_criteria([[1.0, 10.0], [3.0, 30.0], [2.0, 20.0]], ["min", "max"])
    array([[0. , 1. ],
           [1. , 0. ],
           [0.5, 0.5]])
    """
    x, sign = _values_and_signs(values, directions)
    y = x * sign
    lo = y.min(axis=0)
    span = y.max(axis=0) - lo
    with np.errstate(invalid="ignore", divide="ignore"):
        out = np.where(span > 0, (y - lo) / np.where(span > 0, span, 1.0), 0.0)
    return out


def _weights(weights, n_criteria: int) -> np.ndarray:
    w = nonnegative("weights", weights)
    if w.ndim == 0 or w.shape[-1] != n_criteria:
        raise ValueError(f"weights: expected {n_criteria} per weighting, got {w.shape[-1]}")
    total = w.sum(axis=-1, keepdims=True)
    if np.any(total <= 0):
        raise ValueError("weights: each weighting needs a positive sum")
    return w / total


def weighted_scores(values, directions, weights) -> np.ndarray:
    """Weighted sum of the normalised criteria; lower is better (0 = best on all).

    Parameters
    ----------
    values : array_like, shape (n_candidates, n_criteria)
        Criterion values [unit of each column].
    directions : sequence of str or Criterion
        ``"minimise"`` / ``"maximise"`` per column.
    weights : array_like, shape (n_criteria,) or (n_weightings, n_criteria)
        Non-negative weights; each weighting is divided by its sum [-].

    Returns
    -------
    numpy.ndarray, shape (n_candidates,) or (n_weightings, n_candidates)
        Scores in [0, 1] [-].

    Notes
    -----
    :math:`S_i = \\sum_j w_j s_{ij} / \\sum_j w_j` with :math:`s_{ij}` from
    :func:`normalise_criteria`.

    References
    ----------
    ``common-practice``: weighted-sum scoring of normalised criteria.

    Examples
    --------
    >>> weighted_scores([[1.0, 10.0], [3.0, 30.0], [2.0, 20.0]], ["min", "max"], [3, 1])
    array([0.25, 0.75, 0.5 ])
    """
    s = normalise_criteria(values, directions)
    w = _weights(weights, s.shape[1])
    return w @ s.T


def simplex_weights(n_criteria: int, resolution: int = 10) -> np.ndarray:
    """All weightings on the simplex whose components are multiples of ``1/resolution``.

    Parameters
    ----------
    n_criteria : int
        Number of criteria (>= 1).
    resolution : int
        Number of steps per unit weight (>= 1).

    Returns
    -------
    numpy.ndarray, shape (C(resolution + n_criteria - 1, n_criteria - 1), n_criteria)
        Weights summing to 1 per row [-].

    Notes
    -----
    Stars and bars: the rows are the compositions :math:`w = a/r` with
    :math:`a_j \\in \\mathbb{N}_0`, :math:`\\sum_j a_j = r`.

    References
    ----------
    ``common-practice``: simplex-lattice design of weightings (stars and bars).

    Examples
    --------
    >>> simplex_weights(2, 2)
    array([[0. , 1. ],
           [0.5, 0.5],
           [1. , 0. ]])
    >>> simplex_weights(3, 10).shape
    (66, 3)
    """
    c = integer("n_criteria", n_criteria, minimum=1)
    r = integer("resolution", resolution, minimum=1, maximum=10**9)
    total = comb(r + c - 1, c - 1)
    if total > 5_000_000:
        raise ValueError(
            f"resolution: {total} weightings for {c} criteria at resolution {r}; "
            "use n_samples for a random sample instead"
        )
    rows = np.zeros((1, 0), dtype=np.int64)
    for _ in range(c - 1):
        used = rows.sum(axis=1)
        reps = r - used + 1
        base = np.repeat(rows, reps, axis=0)
        nxt = np.concatenate([np.arange(k) for k in reps])
        rows = np.column_stack([base, nxt])
    last = r - rows.sum(axis=1)
    a = np.column_stack([rows, last])
    return a / r


@dataclass(frozen=True, eq=False)
class RankStability:
    """How often each candidate ranks first as the weights sweep the simplex.

    ``share_first`` sums to 1 over the candidates; ``best_rank`` and
    ``worst_rank`` are 1-based competition ranks (ties share the better rank).
    """

    weights: np.ndarray
    share_first: np.ndarray
    best_rank: np.ndarray
    worst_rank: np.ndarray
    winner: np.ndarray
    n_tied: np.ndarray


def _ranks(scores: np.ndarray, tol: float) -> np.ndarray:
    """Competition ranks per row: 1 + number of candidates better by more than tol."""
    srt = np.sort(scores, axis=1)
    out = np.empty(scores.shape, dtype=np.int64)
    for i in range(scores.shape[0]):
        out[i] = np.searchsorted(srt[i], scores[i] - tol, side="left") + 1
    return out


def rank_stability(
    values,
    directions,
    resolution: int = 10,
    n_samples: int | None = None,
    seed: int = 0,
    tol: float = 1e-12,
) -> RankStability:
    """Share of weightings under which each candidate ranks first, and its rank range.

    Parameters
    ----------
    values : array_like, shape (n_candidates, n_criteria)
        Criterion values [unit of each column].
    directions : sequence of str or Criterion
        ``"minimise"`` / ``"maximise"`` per column.
    resolution : int
        Simplex grid step ``1/resolution`` used when ``n_samples`` is None.
    n_samples : int, optional
        If given, use this many weightings drawn uniformly on the simplex
        (flat Dirichlet) from ``numpy.random.default_rng(seed)`` instead of
        the grid.
    seed : int
        Seed of the random sample.
    tol : float
        Scores closer than ``tol`` count as tied [-].

    Returns
    -------
    RankStability
        ``weights`` (n_weightings, n_criteria), ``share_first``
        (n_candidates,), ``best_rank``/``worst_rank`` (n_candidates,),
        ``winner`` per weighting (lowest index among the tied best),
        ``n_tied`` per weighting (candidates sharing first place).

    Notes
    -----
    Each weighting :math:`w` scores the candidates with
    :func:`weighted_scores`; the candidates within ``tol`` of the lowest
    score share first place and each receives :math:`1/(n_{tied} N_w)` of the
    share, so the shares sum to 1. Ranks are competition ranks:
    :math:`1 + \\#\\{k: S_k < S_i - tol\\}`. The grid covers the simplex
    evenly including its edges (a criterion with weight 0).

    References
    ----------
    ``common-practice``: weight-sensitivity analysis of weighted-sum rankings.

    Examples
    --------
    >>> rs = rank_stability([[1.0, 3.0], [3.0, 1.0], [1.8, 1.8]], ["min", "min"], 4)
    >>> rs.share_first
    array([0.4, 0.4, 0.2])
    >>> rs.best_rank, rs.worst_rank
    (array([1, 1, 1]), array([3, 3, 2]))
    """
    s = normalise_criteria(values, directions)
    tol = float(nonnegative("tol", scalar("tol", tol), "-"))
    resolution = integer("resolution", resolution, minimum=1)
    seed = integer("seed", seed, minimum=0)
    nc = s.shape[1]
    if n_samples is None:
        w = simplex_weights(nc, resolution)
    else:
        ns = integer("n_samples", n_samples, minimum=1, maximum=5_000_000)
        w = np.random.default_rng(integer("seed", seed, minimum=0)).dirichlet(np.ones(nc), size=ns)
    n = s.shape[0]
    share = np.zeros(n)
    best = np.full(n, n + 1, dtype=np.int64)
    worst = np.zeros(n, dtype=np.int64)
    winner = np.empty(w.shape[0], dtype=np.int64)
    n_tied = np.empty(w.shape[0], dtype=np.int64)
    step = max(1, 4_000_000 // max(n, 1))
    for a in range(0, w.shape[0], step):
        sc = w[a : a + step] @ s.T
        ranks = _ranks(sc, tol)
        first = ranks == 1
        cnt = first.sum(axis=1)
        share += (first / cnt[:, None]).sum(axis=0)
        best = np.minimum(best, ranks.min(axis=0))
        worst = np.maximum(worst, ranks.max(axis=0))
        winner[a : a + step] = first.argmax(axis=1)
        n_tied[a : a + step] = cnt
    return RankStability(
        weights=w,
        share_first=share / w.shape[0],
        best_rank=best,
        worst_rank=worst,
        winner=winner,
        n_tied=n_tied,
    )


@dataclass(frozen=True, eq=False)
class SimplexWinner:
    """Winner at every point of a simplex grid of weights (for a winner-region chart).

    ``weights`` (n_points, n_criteria); ``winner`` index of the best candidate
    (lowest index among tied); ``tied`` True where two or more share first place.
    """

    weights: np.ndarray
    winner: np.ndarray
    tied: np.ndarray


def simplex_winner(values, directions, resolution: int = 50, tol: float = 1e-12) -> SimplexWinner:
    """Best candidate over a simplex grid of weights, for two or three criteria.

    Parameters
    ----------
    values : array_like, shape (n_candidates, 2 or 3)
        Criterion values [unit of each column].
    directions : sequence of str or Criterion
        ``"minimise"`` / ``"maximise"`` per column.
    resolution : int
        Grid step ``1/resolution`` of the weights.
    tol : float
        Scores closer than ``tol`` count as tied [-].

    Returns
    -------
    SimplexWinner
        Weights, winner index and tie flag per grid point; a chart draws the
        regions where the winner changes (ternary plot for three criteria,
        a line for two).

    Notes
    -----
    Winner :math:`\\arg\\min_i \\sum_j w_j s_{ij}` with :math:`s_{ij}` from
    :func:`normalise_criteria`.

    References
    ----------
    ``common-practice``: weight-sensitivity analysis of weighted-sum rankings.

    Examples
    --------
    >>> sw = simplex_winner([[1.0, 3.0], [3.0, 1.0]], ["min", "min"], 4)
    >>> sw.winner
    array([1, 1, 0, 0, 0])
    >>> sw.tied
    array([False, False,  True, False, False])
    """
    s = normalise_criteria(values, directions)
    tol = float(nonnegative("tol", scalar("tol", tol), "-"))
    if s.shape[1] not in (2, 3):
        raise ValueError(f"values: expected 2 or 3 criteria, got {s.shape[1]}")
    rs = rank_stability(values, directions, resolution=resolution, tol=tol)
    return SimplexWinner(weights=rs.weights, winner=rs.winner, tied=rs.n_tied > 1)
