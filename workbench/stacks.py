"""Layer-stack search: the best build-ups of up to three layers from a candidate list.

Pure numeric core (numpy only). Each candidate material has its own list of
thickness options; a stack takes one option from each of up to ``max_layers``
different materials (a material appears in at most one layer unless
``allow_repeat``). Every criterion is a sum over the layers,

.. math::
    R = \\sum_i L_i / k_i, \\qquad m'' = \\sum_i \\rho_i L_i, \\qquad
    C'' = \\sum_i c_{V,i} L_i, \\qquad L = \\sum_i L_i ,

so none of them depends on the order of the layers: stacks are enumerated as
unordered combinations, with the layers listed in increasing material index.
The order matters for the temperature of each layer only; choose it afterwards
and check it with :func:`check_service_limits`.

Because the criteria add up, a partial stack that is dominated by another
partial stack with the same number of layers, built from the same pool of
materials, can never complete to a better stack (the same completion added to
both keeps the domination). The exact front is therefore built material by
material, pruning the partial stacks to their Pareto front at every step.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from workbench._checks import (
    Cancelled,
    absolute_temperature,
    integer,
    nonnegative,
    positive,
    scalar,
)
from workbench.ranking import pareto_front

__all__ = [
    "StackSet",
    "StackCatalogue",
    "ServiceCheck",
    "enumerate_stacks",
    "stack_front",
    "stack_catalogue",
    "check_service_limits",
]

OBJECTIVES = ("resistance", "mass_per_area", "cost_per_area", "thickness")
_BATCH = 1 << 18  # candidates of the last layer collected before a Pareto sieve


@dataclass(frozen=True, eq=False)
class StackSet:
    """A set of layer stacks as arrays, one row per stack.

    Attributes
    ----------
    material : (n, max_layers) int
        Material index of each layer, ``-1`` for an unused layer slot.
    option : (n, max_layers) int
        Index of the thickness option of that material, ``-1`` if unused.
    resistance : (n,) float
        Conduction resistance of the layers, sum of L/k [m²·K/W].
    mass_per_area : (n,) float
        [kg/m²].
    cost_per_area : (n,) float
        [currency/m²].
    thickness : (n,) float
        Total thickness [m].
    thickness_table : (n_materials, max_options) float
        Thickness of each option [m] (NaN where a material has fewer options).
    """

    material: np.ndarray
    option: np.ndarray
    resistance: np.ndarray
    mass_per_area: np.ndarray
    cost_per_area: np.ndarray
    thickness: np.ndarray
    thickness_table: np.ndarray

    @property
    def layer_thickness(self) -> np.ndarray:
        """Thickness of each layer [m], 0 for an unused slot."""
        used = self.material >= 0
        t = self.thickness_table[np.where(used, self.material, 0), np.where(used, self.option, 0)]
        return np.where(used, t, 0.0)

    def __len__(self) -> int:
        return int(self.resistance.shape[0])

    @property
    def n_layers(self) -> np.ndarray:
        """Number of layers used by each stack."""
        return (self.material >= 0).sum(axis=1)

    def u_value(self, r_si: float = 0.0, r_se: float = 0.0) -> np.ndarray:
        """Thermal transmittance 1/(r_si + R + r_se) [W/(m²·K)]."""
        return 1.0 / (r_si + self.resistance + r_se)

    def objectives(self, names: Sequence[str] = OBJECTIVES[:3]) -> np.ndarray:
        """Columns to minimise: -R for resistance, the others as they are."""
        cols = []
        for name in _objective_names(names):
            v = getattr(self, name)
            cols.append(-v if name == "resistance" else v)
        return np.column_stack(cols)

    def subset(self, rows) -> StackSet:
        """The stacks selected by an index or mask."""
        return StackSet(
            *(getattr(self, f)[rows] for f in _FIELDS), thickness_table=self.thickness_table
        )


_FIELDS = (
    "material",
    "option",
    "resistance",
    "mass_per_area",
    "cost_per_area",
    "thickness",
)


def _objective_names(names: Sequence[str]) -> tuple[str, ...]:
    out = tuple(names)
    for n in out:
        if n not in OBJECTIVES:
            raise ValueError(f"objectives: unknown {n!r}; valid: {list(OBJECTIVES)}")
    if not out or len(set(out)) != len(out):
        raise ValueError(f"objectives: need distinct names from {list(OBJECTIVES)}")
    return out


@dataclass(frozen=True, eq=False)
class _Options:
    material: np.ndarray  # (n_opt,)
    option: np.ndarray  # (n_opt,)
    thickness: np.ndarray  # (n_opt,)
    values: np.ndarray  # (n_opt, 4): R, m, c, L
    n_materials: int
    table: np.ndarray  # (n_materials, max_options) thickness, NaN padded


def _options(conductivity, density, cost_per_volume, thicknesses) -> _Options:
    k = positive("conductivity", conductivity, "W/(m·K)")
    rho = positive("density", density, "kg/m³")
    cv = nonnegative("cost_per_volume", cost_per_volume, "currency/m³")
    if k.ndim != 1:
        raise ValueError(f"conductivity: expected one value per material, got shape {k.shape}")
    nm = k.shape[0]
    for name, a in (("density", rho), ("cost_per_volume", cv)):
        if a.shape != (nm,):
            raise ValueError(f"{name}: expected shape ({nm},) like conductivity, got {a.shape}")
    if nm == 0:
        raise ValueError("conductivity: no materials given (W/(m·K))")
    if not isinstance(thicknesses, list | tuple) or (
        len(thicknesses) > 0 and np.ndim(thicknesses[0]) == 0
    ):
        t = positive("thicknesses", thicknesses, "m")
        if t.ndim == 1:
            per = [t] * nm
        elif t.ndim == 2 and t.shape[0] == nm:
            per = list(t)
        else:
            raise ValueError(
                f"thicknesses: expected (n_options,) or ({nm}, n_options) [m], got {t.shape}"
            )
    else:
        if len(thicknesses) != nm:
            raise ValueError(f"thicknesses: expected {nm} lists (one per material) [m]")
        per = [positive("thicknesses", np.atleast_1d(positive("thicknesses", t, "m")), "m")
               for t in thicknesses]
    for t in per:
        if t.ndim != 1 or t.size == 0:
            raise ValueError(f"thicknesses: each material needs at least one option [m], got shape {t.shape}")
    mat = np.concatenate([np.full(len(t), i) for i, t in enumerate(per)])
    opt = np.concatenate([np.arange(len(t)) for t in per])
    L = np.concatenate(per).astype(float)
    vals = np.column_stack([L / k[mat], rho[mat] * L, cv[mat] * L, L])
    table = np.full((nm, max(len(t) for t in per)), np.nan)
    table[mat, opt] = L
    return _Options(mat, opt, L, vals, nm, table)


def enumerate_stacks(
    conductivity,
    density,
    cost_per_volume,
    thicknesses,
    n_layers: int = 2,
    distinct: bool = False,
) -> StackSet:
    """Every stack of exactly ``n_layers`` layers, brute force (ordered, with repeats).

    Parameters
    ----------
    conductivity : array_like, shape (n_materials,)
        Thermal conductivity of each material [W/(m·K)].
    density : array_like, shape (n_materials,)
        Density [kg/m³].
    cost_per_volume : array_like, shape (n_materials,)
        Price per volume [currency/m³].
    thicknesses : array_like
        Thickness options [m]: one list for all materials, an array
        (n_materials, n_options), or a list of lists (one per material).
    n_layers : int
        Number of layers (1 to 3).
    distinct : bool
        If True, keep only stacks whose layers are different materials.

    Returns
    -------
    StackSet
        ``n_options ** n_layers`` stacks (ordered layer sequences, layer 0 first),
        fewer with ``distinct``.

    Notes
    -----
    :math:`R = \\sum_i L_i/k_i`, :math:`m'' = \\sum_i \\rho_i L_i`,
    :math:`C'' = \\sum_i c_{V,i} L_i`, :math:`L = \\sum_i L_i`, all broadcast
    over the option grid. This is the reference the pruned search is checked
    against; memory grows as ``n_options ** n_layers``.

    References
    ----------
    ``incropera7``: 7th ed., §3.1 (plane wall, resistances in series).

    Examples
    --------
    >>> s = enumerate_stacks([0.04, 0.2], [30.0, 1200.0], [100.0, 900.0], [0.01, 0.02])
    >>> len(s), float(s.resistance.max())
    (16, 1.0)
    """
    o = _options(conductivity, density, cost_per_volume, thicknesses)
    n_layers = integer("n_layers", n_layers, minimum=1, maximum=3)
    n = o.material.shape[0]
    idt = np.int16 if max(n, o.n_materials) < 2**15 else np.int32
    shape = (n,) * n_layers
    mat = np.empty(shape + (n_layers,), dtype=idt)
    opt = np.empty(shape + (n_layers,), dtype=idt)
    v = []
    for a in range(n_layers):
        sh = [1] * n_layers
        sh[a] = n
        mat[..., a] = o.material.reshape(sh)
        opt[..., a] = o.option.reshape(sh)
    for i in range(4):
        acc = o.values[:, i].reshape((n,) + (1,) * (n_layers - 1))
        for a in range(1, n_layers):
            sh = [1] * n_layers
            sh[a] = n
            acc = acc + o.values[:, i].reshape(sh)
        v.append(acc.reshape(-1))
    mat = mat.reshape(-1, n_layers)
    opt = opt.reshape(-1, n_layers)
    if distinct and n_layers > 1:
        ok = np.ones(mat.shape[0], dtype=bool)
        for a in range(n_layers):
            for b in range(a + 1, n_layers):
                ok &= mat[:, a] != mat[:, b]
        mat, opt, v = mat[ok], opt[ok], [x[ok] for x in v]
    return StackSet(
        material=mat,
        option=opt,
        resistance=v[0],
        mass_per_area=v[1],
        cost_per_area=v[2],
        thickness=v[3],
        thickness_table=o.table,
    )


def _front_rows(vals: np.ndarray, cols: Sequence[int]) -> np.ndarray:
    obj = vals[:, list(cols)].copy()
    if 0 in cols:
        obj[:, list(cols).index(0)] *= -1.0  # maximise resistance
    return pareto_front(obj)


def _search(
    o: _Options,
    max_layers: int,
    prune_cols: Sequence[int],
    budget: float | None,
    allow_repeat: bool,
    progress: Callable[[float], None] | None = None,
    cancel: Callable[[], bool] | None = None,
):
    """Exact front of partial stacks, material by material.

    ``F[k]`` holds the non-dominated stacks of exactly ``k`` layers built from
    the materials seen so far (objective columns ``prune_cols``); adding
    material ``j`` extends ``F[k-1]`` by one of its options.
    """
    K = max_layers
    vals = [np.zeros((1, 4))] + [np.zeros((0, 4)) for _ in range(K)]
    comp = [np.zeros((1, 0), dtype=np.intp)] + [
        np.zeros((0, k), dtype=np.intp) for k in range(1, K + 1)
    ]
    order = range(K, 0, -1) if not allow_repeat else range(1, K + 1)
    starts = np.searchsorted(o.material, np.arange(o.n_materials + 1))
    # the top level feeds nothing: collect its candidates, prune in batches
    pend_v: list[np.ndarray] = []
    pend_c: list[np.ndarray] = []
    pending = 0
    for j in range(o.n_materials):
        if cancel is not None and cancel():
            raise Cancelled(f"stack search cancelled after {j} of {o.n_materials} materials")
        if progress is not None and j:
            progress(j / o.n_materials)
        oi = np.arange(starts[j], starts[j + 1])
        if oi.shape[0] == 0:
            continue
        ov = o.values[oi]
        for k in order:
            base_v, base_c = vals[k - 1], comp[k - 1]
            if base_v.shape[0] == 0:
                continue
            nv = (base_v[:, None, :] + ov[None, :, :]).reshape(-1, 4)
            nc = np.concatenate(
                [np.repeat(base_c, oi.shape[0], axis=0), np.tile(oi, base_c.shape[0])[:, None]],
                axis=1,
            )
            if budget is not None:
                fit = nv[:, 3] <= budget
                nv, nc = nv[fit], nc[fit]
            if k == K and not allow_repeat:
                pend_v.append(nv)
                pend_c.append(nc)
                pending += nv.shape[0]
                if pending < _BATCH:
                    continue
                nv, nc = np.concatenate(pend_v), np.concatenate(pend_c)
                pend_v, pend_c, pending = [], [], 0
            allv = np.concatenate([vals[k], nv])
            allc = np.concatenate([comp[k], nc])
            keep = _front_rows(allv, prune_cols)
            vals[k], comp[k] = allv[keep], allc[keep]
    if pend_v:
        allv = np.concatenate([vals[K]] + pend_v)
        allc = np.concatenate([comp[K]] + pend_c)
        keep = _front_rows(allv, prune_cols)
        vals[K], comp[K] = allv[keep], allc[keep]
    return vals, comp


def _to_stackset(o: _Options, vals, comp, max_layers: int) -> StackSet:
    rows_v = []
    rows_c = []
    for k in range(1, max_layers + 1):
        c = np.full((comp[k].shape[0], max_layers), -1, dtype=np.intp)
        c[:, :k] = comp[k]
        rows_v.append(vals[k])
        rows_c.append(c)
    v = np.concatenate(rows_v)
    c = np.concatenate(rows_c)
    used = c >= 0
    safe = np.where(used, c, 0)
    return StackSet(
        material=np.where(used, o.material[safe], -1),
        option=np.where(used, o.option[safe], -1),
        resistance=v[:, 0],
        mass_per_area=v[:, 1],
        cost_per_area=v[:, 2],
        thickness=v[:, 3],
        thickness_table=o.table,
    )


def _dedupe_repeats(s: StackSet) -> StackSet:
    """Drop permutations of the same layers (``allow_repeat`` search)."""
    key = np.where(s.material >= 0, s.material * 1_000_003 + s.option, np.iinfo(np.int64).max)
    key = np.sort(key, axis=1)
    _, first = np.unique(key, axis=0, return_index=True)
    return s.subset(np.sort(first))


def stack_front(
    conductivity,
    density,
    cost_per_volume,
    thicknesses,
    max_layers: int = 3,
    objectives: Sequence[str] = ("resistance", "mass_per_area", "cost_per_area"),
    max_total_thickness: float | None = None,
    allow_repeat: bool = False,
    progress: Callable[[float], None] | None = None,
    cancel: Callable[[], bool] | None = None,
) -> StackSet:
    """Exact Pareto front of the stacks of 1 to ``max_layers`` layers.

    Parameters
    ----------
    conductivity : array_like, shape (n_materials,)
        Thermal conductivity of each candidate material [W/(m·K)].
    density : array_like, shape (n_materials,)
        Density [kg/m³].
    cost_per_volume : array_like, shape (n_materials,)
        Price per volume [currency/m³] (price per kg times density).
    thicknesses : array_like or list of array_like
        Thickness options [m]: one list for all materials, an array
        (n_materials, n_options), or one list per material.
    max_layers : int
        Up to this many layers (1 to 3).
    objectives : sequence of str
        Criteria of the front, from ``"resistance"`` (maximised; the U-value
        and the heat flux for fixed temperatures order the stacks the same
        way, minimised), ``"mass_per_area"``, ``"cost_per_area"``,
        ``"thickness"`` (all minimised).
    max_total_thickness : float, optional
        Budget for the total thickness [m].
    allow_repeat : bool
        Allow a material in more than one layer.
    progress : callable, optional
        Called with the fraction of materials processed (0..1].
    cancel : callable, optional
        Checked before each material; when it returns True the search raises
        :class:`workbench._checks.Cancelled` (a partial front is not exact).

    Returns
    -------
    StackSet
        The non-dominated stacks (all stacks tying a non-dominated one in
        every objective are kept), layers in increasing material index.

    Notes
    -----
    With additive criteria (:math:`R = \\sum L_i/k_i`, :math:`m'' =
    \\sum \\rho_i L_i`, :math:`C'' = \\sum c_{V,i} L_i`, :math:`L = \\sum L_i`),
    the front is built material by material: :math:`F_k \\leftarrow
    \\mathrm{front}(F_k \\cup F_{k-1} \\oplus \\mathrm{options}_j)` for
    :math:`k = K \\dots 1` (descending, so material :math:`j` enters at most
    one layer), where :math:`F_k` holds the non-dominated stacks of exactly
    :math:`k` layers from the materials seen so far. Pruning is exact: the
    completions of a partial stack use only later materials, so a dominating
    partial stack admits the same completions. With a thickness budget the
    partial fronts also minimise the total thickness, so that a pruned
    stack's dominator fits wherever it fits. Surface resistances are the same
    for every stack and do not change the front.

    References
    ----------
    ``incropera7``: 7th ed., §3.1 (resistances in series);
    ``common-practice``: dynamic programming with dominance pruning for
    additive multi-objective combination problems.

    Examples
    --------
    >>> f = stack_front([0.04, 0.2], [30.0, 1200.0], [100.0, 900.0], [0.01, 0.02],
    ...                 max_layers=2)
    >>> f.material.tolist()
    [[0, -1], [0, -1], [0, 1], [0, 1]]
    >>> f.option.tolist()
    [[0, -1], [1, -1], [1, 0], [1, 1]]
    """
    o = _options(conductivity, density, cost_per_volume, thicknesses)
    max_layers = integer("max_layers", max_layers, minimum=1, maximum=3)
    names = _objective_names(objectives)
    cols = [OBJECTIVES.index(n) for n in names]
    budget = None
    if max_total_thickness is not None:
        budget = float(positive("max_total_thickness", scalar("max_total_thickness", max_total_thickness, "m"), "m"))
    prune = sorted(set(cols) | ({3} if budget is not None else set()))
    vals, comp = _search(o, max_layers, prune, budget, allow_repeat, progress, cancel)
    s = _to_stackset(o, vals, comp, max_layers)
    s = s.subset(pareto_front(s.objectives(names)))
    if allow_repeat:
        s = _dedupe_repeats(s)
    if progress is not None:
        progress(1.0)
    return s


@dataclass(frozen=True, eq=False)
class StackCatalogue:
    """Pre-computed candidates for fast re-queries of the front under a thickness budget.

    Holds the exact front of the stacks over the chosen objectives plus the
    total thickness; :meth:`front` answers a budget with one filter and one
    Pareto sieve of this (small) set.
    """

    stacks: StackSet
    objectives: tuple[str, ...]

    def front(self, max_total_thickness: float | None = None) -> StackSet:
        """Front over :attr:`objectives` of the stacks within the budget [m].

        A stack equal in every objective to a listed stack but thicker may be
        left out (it is then a duplicate in every reported criterion).
        """
        s = self.stacks
        if max_total_thickness is not None:
            b = float(positive("max_total_thickness", scalar("max_total_thickness", max_total_thickness, "m"), "m"))
            s = s.subset(s.thickness <= b)
        if len(s) == 0:
            return s
        return s.subset(pareto_front(s.objectives(self.objectives)))


def stack_catalogue(
    conductivity,
    density,
    cost_per_volume,
    thicknesses,
    max_layers: int = 3,
    objectives: Sequence[str] = ("resistance", "mass_per_area", "cost_per_area"),
    max_total_thickness: float | None = None,
    allow_repeat: bool = False,
) -> StackCatalogue:
    """One-off pre-computation for :meth:`StackCatalogue.front` under changing budgets.

    Parameters
    ----------
    conductivity, density, cost_per_volume, thicknesses, max_layers, allow_repeat
        As for :func:`stack_front` ([W/(m·K)], [kg/m³], [currency/m³], [m]).
    objectives : sequence of str
        Criteria of the fronts to be queried (total thickness is added
        internally).
    max_total_thickness : float, optional
        Largest budget that will be asked for [m] (speeds up the search).

    Returns
    -------
    StackCatalogue
        The exact front over ``objectives`` + thickness.

    Notes
    -----
    For a budget :math:`B`, a stack on the front of :math:`\\{S: L(S) \\le B\\}`
    is not dominated when thickness is added as an objective (a dominator
    would be at most as thick, hence within the budget, and better or equal in
    the other criteria), so the front with thickness contains every answer.

    References
    ----------
    ``common-practice``: pre-computed Pareto superset re-filtered under a
    changed constraint.

    Examples
    --------
    >>> cat = stack_catalogue([0.04, 0.2], [30.0, 1200.0], [100.0, 900.0],
    ...                       [0.01, 0.02], max_layers=2)
    >>> len(cat.front(0.015)), len(cat.front(0.05))
    (1, 4)
    """
    names = tuple(n for n in _objective_names(objectives) if n != "thickness")
    s = stack_front(
        conductivity,
        density,
        cost_per_volume,
        thicknesses,
        max_layers=max_layers,
        objectives=names + ("thickness",),
        max_total_thickness=max_total_thickness,
        allow_repeat=allow_repeat,
    )
    return StackCatalogue(stacks=s, objectives=tuple(_objective_names(objectives)))


@dataclass(frozen=True, eq=False)
class ServiceCheck:
    """Per-layer result of :func:`check_service_limits` (layer 0 = first face side).

    ``t_low``/``t_high`` are the coldest/hottest face of each layer [K];
    ``ok`` is False where a layer leaves its service range; ``reasons`` holds
    a sentence per failing layer and ``""`` otherwise.
    """

    ok: np.ndarray
    too_hot: np.ndarray
    too_cold: np.ndarray
    t_low: np.ndarray
    t_high: np.ndarray
    reasons: tuple[str, ...]

    @property
    def all_ok(self) -> bool:
        """True if every layer stays within its service range."""
        return bool(self.ok.all())


def check_service_limits(order, face_temperatures, t_min, t_max) -> ServiceCheck:
    """Which layer of a chosen order would leave its service temperature range.

    Parameters
    ----------
    order : array_like of int, shape (n_layers,)
        Material index of each layer, from the first face to the last.
    face_temperatures : array_like, shape (n_layers + 1,)
        Temperatures of the faces and interfaces in the same order, e.g. from
        ``workbench.wall_temperatures`` [K].
    t_min, t_max : array_like, shape (n_materials,)
        Lowest and highest service temperature of each material [K].

    Returns
    -------
    ServiceCheck
        Per layer: ok flag, too hot / too cold flags, face temperatures and a
        reason.

    Notes
    -----
    In steady conduction the temperature inside a layer is monotone between
    its two faces, so layer :math:`i` sees :math:`[\\min(T_i, T_{i+1}),
    \\max(T_i, T_{i+1})]`; it fails if :math:`\\max > T_{max}` or
    :math:`\\min < T_{min}` of its material. Putting the most
    heat-resistant material on the hot side usually cures a failure.
    Service limits in data sheets are indicative; near a limit, and for the
    fire behaviour of foams, rely on the supplier's data, testing and the
    applicable codes.

    References
    ----------
    ``incropera7``: 7th ed., §3.1 (temperature distribution in a composite
    wall).

    Examples
    --------
    >>> r = check_service_limits([1, 0], [423.15, 343.15, 293.15],
    ...                          t_min=[223.15, 223.15], t_max=[353.15, 673.15])
    >>> r.ok
    array([ True,  True])
    >>> r = check_service_limits([0, 1], [423.15, 343.15, 293.15],
    ...                          t_min=[223.15, 223.15], t_max=[353.15, 673.15])
    >>> r.reasons[0]
    'layer 0 (material 0): 423.15 K is above its service limit 353.15 K'
    """
    if isinstance(order, str | bytes) or order is None:
        raise ValueError(f"order: expected a 1-D sequence of material indices, got {order!r}")
    try:
        idx = np.asarray(order)
    except ValueError:
        raise ValueError(f"order: expected a 1-D sequence of material indices, got {order!r}") from None
    if idx.ndim != 1 or idx.shape[0] == 0 or not np.issubdtype(idx.dtype, np.integer):
        raise ValueError("order: expected a 1-D sequence of material indices")
    tf = absolute_temperature("face_temperatures", face_temperatures)
    if tf.shape != (idx.shape[0] + 1,):
        raise ValueError(
            f"face_temperatures: expected {idx.shape[0] + 1} values [K] "
            f"(n_layers + 1), got shape {tf.shape}"
        )
    lo = np.atleast_1d(absolute_temperature("t_min", t_min))
    hi = np.atleast_1d(absolute_temperature("t_max", t_max))
    if lo.shape != hi.shape or lo.ndim != 1:
        raise ValueError("t_min, t_max: expected one value per material [K], same shape")
    if idx.min() < 0 or idx.max() >= lo.shape[0]:
        raise ValueError(f"order: material indices must lie in [0, {lo.shape[0] - 1}]")
    t_low = np.minimum(tf[:-1], tf[1:])
    t_high = np.maximum(tf[:-1], tf[1:])
    too_hot = t_high > hi[idx]
    too_cold = t_low < lo[idx]
    reasons = []
    for i, m in enumerate(idx.tolist()):
        parts = []
        if too_hot[i]:
            parts.append(f"{t_high[i]:.2f} K is above its service limit {hi[m]:.2f} K")
        if too_cold[i]:
            parts.append(f"{t_low[i]:.2f} K is below its service limit {lo[m]:.2f} K")
        reasons.append(f"layer {i} (material {m}): " + "; ".join(parts) if parts else "")
    return ServiceCheck(
        ok=~(too_hot | too_cold),
        too_hot=too_hot,
        too_cold=too_cold,
        t_low=t_low,
        t_high=t_high,
        reasons=tuple(reasons),
    )
