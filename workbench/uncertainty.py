"""Monte Carlo propagation of property tolerances, over all candidates at once.

Pure numeric core (numpy only). The caller supplies nominal property arrays
(one value per candidate), relative tolerances and a vectorised model
``f(samples) -> criteria``; :func:`monte_carlo` draws the properties in
chunks, evaluates the model once per chunk and reports percentiles, the
probability of meeting a limit and the probability of each candidate being
the best.

Sampling model
--------------
Each toleranced property of each candidate is drawn independently as
:math:`x = x_0 (1 + t z)` with :math:`z \\sim N(0, 1)`, i.e. a normal
distribution with the relative tolerance :math:`t` taken as one standard
deviation, truncated to :math:`x > 0` by redrawing the non-positive draws
(a conductivity, density or thickness cannot be zero or negative). For
:math:`t \\le 0.3` the truncation removes less than 0.05 % of the draws and
has no practical effect. Correlations between properties (e.g. density and
conductivity of a foam) are not modelled. Properties with zero tolerance are
passed through unchanged, so zero tolerances reproduce the deterministic
answer exactly.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from workbench._checks import finite, integer, nonnegative, scalar

__all__ = ["MonteCarloResult", "monte_carlo", "sample_truncated_normal"]


def sample_truncated_normal(nominal, tolerance, size: int, rng: np.random.Generator) -> np.ndarray:
    """Draw ``nominal * (1 + tolerance * z)``, z standard normal, redrawn until > 0.

    Parameters
    ----------
    nominal : array_like, shape (n,)
        Nominal values, > 0 where ``tolerance`` > 0 [unit of the property].
    tolerance : float or array_like, shape (n,)
        Relative standard deviation [-], >= 0.
    size : int
        Number of samples.
    rng : numpy.random.Generator
        Source of random numbers.

    Returns
    -------
    numpy.ndarray, shape (size, n)
        Samples [unit of the property]; columns with zero tolerance equal the
        nominal exactly.

    Notes
    -----
    :math:`x = x_0 (1 + t z)`, :math:`z \\sim N(0,1)`, conditioned on
    :math:`x > 0` (rejection sampling of the non-positive draws).

    References
    ----------
    ``jcgm100-2008``: JCGM 100:2008, Evaluation of measurement data - Guide
    to the expression of uncertainty in measurement (GUM), clause 4.3
    (standard uncertainty from stated information).

    Examples
    --------
    >>> x = sample_truncated_normal([1.0, 2.0], [0.0, 0.1], 4, np.random.default_rng(1))
    >>> x[:, 0]
    array([1., 1., 1., 1.])
    >>> bool((x[:, 1] > 0).all())
    True
    """
    x0 = np.atleast_1d(finite("nominal", nominal))
    if x0.ndim != 1:
        raise ValueError(f"nominal: expected a 1-D array (n,), got shape {x0.shape}")
    t = nonnegative("tolerance", tolerance)
    try:
        t = np.broadcast_to(t, x0.shape)
    except ValueError:
        raise ValueError(
            f"tolerance: shape {t.shape} does not broadcast to nominal's shape {x0.shape}"
        ) from None
    size = integer("size", size, minimum=0, maximum=10**9)
    if not isinstance(rng, np.random.Generator):
        raise TypeError(f"rng: expected a numpy.random.Generator, got {type(rng).__name__}")
    if np.any((t > 0) & (x0 <= 0)):
        raise ValueError("nominal: must be > 0 where a tolerance is given")
    out = np.broadcast_to(x0, (size,) + x0.shape).copy()
    cols = np.flatnonzero(t > 0)
    if cols.size == 0 or size == 0:
        return out
    x = x0[cols] * (1.0 + t[cols] * rng.standard_normal((size, cols.size)))
    for _ in range(1000):
        bad = x <= 0
        if not bad.any():
            break
        r, c = np.nonzero(bad)
        x[r, c] = x0[cols][c] * (1.0 + t[cols][c] * rng.standard_normal(r.size))
    else:  # pragma: no cover - needs tolerances far beyond 100 %
        raise ValueError("tolerance: too large to keep the samples positive")
    out[:, cols] = x
    return out


@dataclass(frozen=True, eq=False)
class MonteCarloResult:
    """Outcome of :func:`monte_carlo` (arrays per candidate and criterion).

    Attributes
    ----------
    n_samples : int
        Samples actually evaluated (fewer than asked if cancelled).
    cancelled : bool
        True if the cancel check stopped the run early.
    p10, p50, p90, mean : (n_candidates, n_criteria) arrays
        Percentiles and mean of each criterion [unit of the criterion].
    prob_best : (n_candidates, n_criteria) array
        Probability of being the best candidate on each criterion; each
        column sums to 1 (ties share the sample evenly).
    prob_meets : (n_candidates,) array or None
        Probability of meeting the limit on ``limit_criterion``.
    prob_meets_se : (n_candidates,) array or None
        Its standard error :math:`\\sqrt{p(1-p)/n}`.
    """

    n_samples: int
    cancelled: bool
    p10: np.ndarray
    p50: np.ndarray
    p90: np.ndarray
    mean: np.ndarray
    prob_best: np.ndarray
    prob_meets: np.ndarray | None
    prob_meets_se: np.ndarray | None


def _candidate_values(nominal, tolerance) -> tuple[dict, dict, int]:
    """Nominal values and tolerances per property, each broadcast to ``(n_cand,)``.

    Each is a scalar or one value per candidate; a tolerance needs a nominal > 0.
    """
    nom = {k: np.atleast_1d(finite(f"nominal[{k!r}]", v)) for k, v in nominal.items()}
    for k, v in nom.items():
        if v.ndim != 1 or v.shape[0] == 0:
            raise ValueError(f"nominal[{k!r}]: expected a scalar or one value per candidate, got shape {v.shape}")
    n_cand = max(v.shape[0] for v in nom.values())
    for k, v in nom.items():
        if v.shape[0] not in (1, n_cand):
            raise ValueError(f"nominal[{k!r}]: expected a scalar or {n_cand} values, got shape {v.shape}")
    nom = {k: np.broadcast_to(v, (n_cand,)) for k, v in nom.items()}
    tol = {}
    for k, v in tolerance.items():
        t = nonnegative(f"tolerance[{k!r}]", v)
        if t.ndim > 1 or t.size not in (1, n_cand):
            raise ValueError(f"tolerance[{k!r}]: expected a scalar or {n_cand} values, got shape {t.shape}")
        tol[k] = np.broadcast_to(t, (n_cand,))
        if np.any((tol[k] > 0) & (nom[k] <= 0)):
            raise ValueError(f"nominal[{k!r}]: must be > 0 where a tolerance is given")
    return nom, tol, n_cand


def monte_carlo(
    model: Callable[[dict[str, np.ndarray]], np.ndarray],
    nominal: Mapping[str, object],
    tolerance: Mapping[str, object],
    n_samples: int = 2000,
    rng: np.random.Generator | int = 0,
    directions: Sequence[str] | None = None,
    limit: float | None = None,
    limit_criterion: int = 0,
    limit_direction: str = "max",
    chunk_size: int = 1000,
    progress: Callable[[float], None] | None = None,
    cancel: Callable[[], bool] | None = None,
    max_bytes: int = 512 * 2**20,
) -> MonteCarloResult:
    """Propagate relative property tolerances through a vectorised model, all candidates at once.

    Parameters
    ----------
    model : callable
        ``model(samples)`` where ``samples`` maps each property name to an
        array (n_chunk, n_candidates); returns the criteria as
        (n_chunk, n_candidates) or (n_chunk, n_candidates, n_criteria)
        [unit of each criterion]. Properties without tolerance are passed at
        their nominal value (broadcast to the same shape).
    nominal : mapping of str to array_like
        Nominal value of each property, scalar or (n_candidates,) [SI unit of
        the property].
    tolerance : mapping of str to float or array_like
        Relative tolerance (one standard deviation) of some of the properties
        [-]; names must appear in ``nominal``.
    n_samples : int
        Number of Monte Carlo samples.
    rng : numpy.random.Generator or int
        Generator, or a seed for ``numpy.random.default_rng``.
    directions : sequence of str, optional
        ``"minimise"``/``"maximise"`` per criterion for ``prob_best``
        (default: all minimised).
    limit : float, optional
        Limit on criterion ``limit_criterion`` (e.g. a heat budget [W] with
        ``limit_direction="max"`` or a required hold time [s] with
        ``"min"``).
    limit_criterion : int
        Column of the criterion the limit applies to.
    limit_direction : str
        ``"max"``: meets if value <= limit; ``"min"``: meets if value >= limit.
    chunk_size : int
        Samples per model call; bounds the memory of the drawn properties and
        of the model's intermediates.
    progress : callable, optional
        Called with the fraction done (0..1] after every chunk.
    cancel : callable, optional
        Checked before every chunk; returning True stops the run and the
        result covers the samples done so far (``cancelled=True``; all NaN if
        none).
    max_bytes : int
        Upper bound on the memory kept for the criteria samples (needed for
        exact percentiles: n_samples x n_candidates x n_criteria x 8 bytes).

    Returns
    -------
    MonteCarloResult

    Notes
    -----
    Percentiles use linear interpolation between order statistics
    (``numpy.percentile`` default). The probability :math:`p` of meeting the
    limit is the share of samples that meet it; its standard error is
    :math:`\\sqrt{p(1-p)/n}` (binomial). ``prob_best`` counts, per sample and
    criterion, the candidate with the lowest (minimised) or highest
    (maximised) value; a tie splits the sample evenly.

    Results on heat budgets or hold times for medicines, food or other
    temperature-sensitive goods are estimates from nominal data; qualify the
    real package by testing to the applicable standard.

    References
    ----------
    ``jcgm101-2008``: JCGM 101:2008, Supplement 1 to the GUM - Propagation
    of distributions using a Monte Carlo method.

    Examples
    --------
    >>> def flux(s):  # Fourier's law, delta T = 20 K
    ...     return s["k"] * 20.0 / s["L"]
    >>> r = monte_carlo(flux, {"k": [0.04, 0.03], "L": [0.05, 0.05]}, {"k": 0.1},
    ...                 n_samples=4000, rng=1, limit=15.0)
    >>> r.p50.round(1)
    array([[16.],
           [12.]])
    >>> r.prob_best[:, 0].round(2)  # normal theory: 1 - Phi(2) = 0.977
    array([0.02, 0.98])
    >>> r.prob_meets.round(2)  # Phi(-0.625) = 0.266, Phi(2.5) = 0.994
    array([0.27, 0.99])
    """
    if not callable(model):
        raise TypeError(f"model: expected a callable model(samples), got {type(model).__name__}")
    if not isinstance(nominal, Mapping) or not nominal:
        raise ValueError("nominal: expected a non-empty mapping of property name to values")
    if not isinstance(tolerance, Mapping):
        raise TypeError(f"tolerance: expected a mapping, got {type(tolerance).__name__}")
    names = list(nominal)
    for name in tolerance:
        if name not in nominal:
            raise ValueError(f"tolerance: unknown property {name!r}; valid: {sorted(names)}")
    n_samples = integer("n_samples", n_samples, minimum=1, maximum=10**9)
    chunk_size = integer("chunk_size", chunk_size, minimum=1, maximum=10**9)
    max_bytes = integer("max_bytes", max_bytes, minimum=1)
    limit_criterion = integer("limit_criterion", limit_criterion, minimum=0)
    if limit is not None:
        limit = scalar("limit", limit)
    if limit_direction not in ("max", "min"):
        raise ValueError(f"limit_direction: unknown {limit_direction!r}; valid: ['max', 'min']")
    if isinstance(rng, np.random.Generator):
        gen = rng
    else:
        gen = np.random.default_rng(integer("rng", rng, minimum=0))
    nom, tol, n_cand = _candidate_values(nominal, tolerance)

    stored: np.ndarray | None = None
    best_counts = None
    meets = np.zeros(n_cand)
    done = 0
    cancelled = False
    signs = None
    while done < n_samples:
        if cancel is not None and cancel():
            cancelled = True
            break
        m = min(chunk_size, n_samples - done)
        smp = {}
        for k in names:
            if k in tol and np.any(tol[k] > 0):
                smp[k] = sample_truncated_normal(nom[k], tol[k], m, gen)
            else:
                smp[k] = np.broadcast_to(nom[k], (m, n_cand))
        y = _model_output(model, smp, m, n_cand, done)
        if stored is None:
            n_crit = y.shape[2]
            need = n_samples * n_cand * n_crit * 8
            if need > max_bytes:
                raise ValueError(
                    f"n_samples: {need / 2**20:.0f} MiB of criteria samples exceed "
                    f"max_bytes {max_bytes / 2**20:.0f} MiB; use fewer samples or candidates"
                )
            stored = np.empty((n_samples, n_cand, n_crit))
            best_counts = np.zeros((n_cand, n_crit))
            dirs = directions if directions is not None else ["minimise"] * n_crit
            if len(dirs) != n_crit:
                raise ValueError(f"directions: expected {n_crit} entries, got {len(dirs)}")
            signs = np.array([_sign(d) for d in dirs])
            if limit is not None and limit_criterion >= n_crit:
                raise ValueError(
                    f"limit_criterion: must be one of {list(range(n_crit))} "
                    f"(the model returns {n_crit} criteria), got {limit_criterion}"
                )
        stored[done : done + m] = y
        oriented = y * signs
        best = oriented.min(axis=1, keepdims=True)
        is_best = oriented == best
        best_counts += (is_best / is_best.sum(axis=1, keepdims=True)).sum(axis=0)
        if limit is not None:
            v = y[:, :, limit_criterion]
            meets += (v <= limit if limit_direction == "max" else v >= limit).sum(axis=0)
        done += m
        if progress is not None:
            progress(done / n_samples)

    if done == 0:  # cancelled before the first chunk: one nominal call gives the criteria count
        y = np.asarray(model({k: np.broadcast_to(nom[k], (1, n_cand)) for k in names}), dtype=float)
        nan = np.full((n_cand, y.shape[2] if y.ndim == 3 else 1), np.nan)
        return MonteCarloResult(0, True, nan, nan, nan, nan, nan, None, None)
    ys = stored[:done]
    p10, p50, p90 = np.percentile(ys, [10, 50, 90], axis=0)
    prob_meets = se = None
    if limit is not None:
        prob_meets = meets / done
        se = np.sqrt(prob_meets * (1.0 - prob_meets) / done)
    return MonteCarloResult(
        n_samples=done,
        cancelled=cancelled,
        p10=p10,
        p50=p50,
        p90=p90,
        mean=ys.mean(axis=0),
        prob_best=best_counts / done,
        prob_meets=prob_meets,
        prob_meets_se=se,
    )


def _model_output(model, smp, m: int, n_cand: int, done: int) -> np.ndarray:
    """The model's criteria as (m, n_cand, n_criteria); NaN or infinity names the sample."""
    try:
        y = np.asarray(model(smp), dtype=float)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"model: samples {done}–{done + m - 1}: {exc}") from exc
    if y.ndim == 2:
        y = y[:, :, None]
    if y.ndim != 3 or y.shape[:2] != (m, n_cand):
        raise ValueError(f"model: expected an array ({m}, {n_cand}[, n_criteria]), got {y.shape}")
    bad = ~np.isfinite(y)
    if np.any(bad):
        s, c, k = (int(i[0]) for i in np.nonzero(bad))
        raise ValueError(
            f"model: returned {y[s, c, k]} (not finite) for candidate {c}, criterion {k} at "
            f"sample {done + s}; nominal values there: "
            + ", ".join(f"{n}={float(v[s, c]):.6g}" for n, v in smp.items())
        )
    return y


def _sign(direction: str) -> float:
    d = str(direction).lower()
    if d in ("minimise", "minimize", "min"):
        return 1.0
    if d in ("maximise", "maximize", "max"):
        return -1.0
    raise ValueError(f"directions: unknown {direction!r}; valid: ['max', 'min', ...]")
