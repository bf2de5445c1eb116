"""Evaluate a scenario: build its study, compute its results, rank them, collect the sources.

:func:`evaluate` is what every consumer of a scenario's numbers shares: the report
(:mod:`workbench.report`) renders an :class:`Evaluation`, the review
(:mod:`workbench.review`) compares two of them, the command line prints one. It
holds no rendering and no file output, so the comparison and the report depend on it
and not on each other.
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import pandas as pd

from workbench import ranking, units
from workbench.scenario import (
    ConstraintSpec,
    CriterionSpec,
    Scenario,
    StudyKind,
    constraint_limit,
    located_error,
    materials_for,
    parse_inputs,
    scenario_hash,
    study_from_scenario,
    study_kind,
)
from workbench.studies._chart_parts import _currency
from workbench.studykind import column_label as _label

__all__ = ["Evaluation", "evaluate", "rank_results", "engineering"]


def _tool_version() -> str:
    import workbench

    return getattr(workbench, "__version__", "unknown")


# ---------------------------------------------------------------------------
# Evaluation
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class Evaluation:
    """Everything a report shows, computed once from a scenario.

    Attributes
    ----------
    scenario : Scenario
    kind : StudyKind
    study : object
        The study object (e.g. :class:`~workbench.studies.wall.WallStudy`).
    results : DataFrame
        ``study.results()``: one row per candidate, SI values, units in ``attrs``.
    ranking : DataFrame
        One row per candidate: criterion values [SI], ``feasible``,
        ``excluded_because``, ``pareto``, ``score`` (0 best), ``rank``
        (1 best, feasible only), ``share_first`` (share of weightings over
        the simplex under which it ranks first).
    criteria : tuple of CriterionSpec
        The criteria used (the scenario's, or the kind's defaults).
    warnings : tuple of str
        Every warning raised while computing, once each.
    sources : DataFrame
        Index ``key``; ``citation`` (resolved) and ``used_for``.
    assumptions, cautions : tuple of str
    inputs_si : dict
        The parsed inputs.
    raw : object
        The study's own result object (e.g. a ``ShipperResults`` with the sweep).
    scenario_hash, tool_version : str
    """

    scenario: Scenario
    kind: StudyKind
    study: Any
    results: pd.DataFrame
    ranking: pd.DataFrame
    criteria: tuple[CriterionSpec, ...]
    warnings: tuple[str, ...]
    sources: pd.DataFrame
    assumptions: tuple[str, ...]
    cautions: tuple[str, ...]
    inputs_si: dict
    raw: Any
    scenario_hash: str
    tool_version: str

    @property
    def chosen(self) -> str | None:
        """The decided candidate, if any."""
        d = self.scenario.decision
        return d.chosen if d is not None and d.chosen else None

    @property
    def system(self) -> str:
        return self.scenario.display_system


def evaluate(scenario: Scenario, progress=None) -> Evaluation:
    """Run the scenario's job and collect what the report needs.

    Parameters
    ----------
    scenario : Scenario
    progress : callable, optional
        ``progress(message)`` for long runs (the command line prints to stderr).

    Returns
    -------
    Evaluation
    """
    say = progress or (lambda _msg: None)
    kind = study_kind(scenario.kind)
    criteria = scenario.criteria or kind.default_criteria
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        say("building the study")
        inputs_si = parse_inputs(scenario)
        study = study_from_scenario(scenario)
        say("computing results")
        try:
            results, raw = kind.compute(study)
        except (ValueError, TypeError) as exc:  # a study's refusal, at the key it concerns
            raise located_error(scenario, exc) from None
        say("ranking")
        table = rank_results(results, kind, criteria, scenario.constraints, scenario.display_system)
    messages = [f"{w.category.__name__}: {w.message}" for w in caught]
    messages += [
        str(m)
        for m in results.attrs.get("validity_warnings", ())
        if not any(str(m) in x for x in messages)
    ]
    say("collecting sources")
    sources = _sources_used(scenario, kind, study, results)
    cautions = tuple(dict.fromkeys((*kind.cautions, *results.attrs.get("cautions", ()))))
    return Evaluation(
        scenario=scenario,
        kind=kind,
        study=study,
        results=results,
        ranking=table,
        criteria=tuple(criteria),
        warnings=tuple(dict.fromkeys(messages)),
        sources=sources,
        assumptions=tuple(results.attrs.get("assumptions", ())),
        cautions=cautions,
        inputs_si=inputs_si,
        raw=raw,
        scenario_hash=scenario_hash(scenario),
        tool_version=_tool_version(),
    )


def rank_results(
    results: pd.DataFrame,
    kind: StudyKind,
    criteria: Sequence[CriterionSpec],
    constraints: Sequence[ConstraintSpec] = (),
    system: str = "SI",
) -> pd.DataFrame:
    """Hard limits, Pareto front and weighted ranking of a study's results.

    Parameters
    ----------
    results : DataFrame
        One row per candidate, SI values.
    kind : StudyKind
        For the quantity kind of each column.
    criteria : sequence of CriterionSpec
        Columns to rank on, with direction and weight.
    constraints : sequence of ConstraintSpec
        Hard limits; a candidate failing any is excluded from front and ranking.
    system : {"SI", "US"}
        Units used in the exclusion reasons.

    Returns
    -------
    DataFrame
        See :attr:`Evaluation.ranking`. Candidates without a value for a
        criterion (NaN, e.g. no cost known) are excluded and say so.
    """
    n = len(results)
    keep = np.ones(n, bool)
    reasons: list[list[str]] = [[] for _ in range(n)]
    for c in constraints:
        if c.bound == "require":
            ok = results[c.quantity].astype(bool).to_numpy()
            for i in np.flatnonzero(~ok):
                extra = ""
                for col in kind.flag_reasons.get(c.quantity, ()):
                    if col in results and str(results[col].iloc[i]):
                        extra = f" ({results[col].iloc[i]})"
                        break
                reasons[i].append(f"{_label(c.quantity, kind)}: no{extra}")
        else:
            limit = constraint_limit(kind, c)
            values = _values(results, kind, c.quantity)
            qkind = kind.column_kinds[c.quantity]
            res = ranking.check_limit(ranking.Limit(c.quantity, values, limit, c.bound))
            ok = res.keep
            word = "above the maximum" if c.bound == "max" else "below the minimum"
            for i in np.flatnonzero(~ok):
                reasons[i].append(
                    f"{_label(c.quantity, kind)} {_fmt(values[i], qkind, system, results)} {word} "
                    f"{_fmt(limit, qkind, system, results)}"
                )
        keep &= ok
    names = [c.quantity for c in criteria]
    values = (
        np.column_stack([_values(results, kind, q) for q in names]) if names else np.zeros((n, 0))
    )
    for j, q in enumerate(names):
        for i in np.flatnonzero(~np.isfinite(values[:, j])):
            reasons[i].append(f"no value for {_label(q, kind)}")
            keep[i] = False
    table = pd.DataFrame(index=results.index.copy())
    for j, q in enumerate(names):
        table[q] = values[:, j]
    table["feasible"] = keep
    table["excluded_because"] = ["; ".join(r) for r in reasons]
    pareto = np.zeros(n, bool)
    score = np.full(n, np.nan)
    rank = np.full(n, np.nan)
    share = np.full(n, np.nan)
    idx = np.flatnonzero(keep)
    if idx.size and names:
        dirs = [c.direction for c in criteria]
        v = values[idx]
        pareto[idx] = ranking.pareto_front(ranking.oriented(v, dirs))
        weights = np.array([c.weight for c in criteria], float)
        if weights.sum() <= 0:
            weights = np.ones(len(names))
        s = ranking.weighted_scores(v, dirs, weights)
        score[idx] = s
        order = np.sort(s)
        rank[idx] = np.searchsorted(order, s - 1e-12, side="left") + 1
        if len(names) >= 2 and idx.size >= 2:
            share[idx] = ranking.rank_stability(v, dirs, resolution=20).share_first
        elif idx.size >= 1:
            share[idx] = (rank[idx] == 1) / max(1, int(np.sum(rank[idx] == 1)))
    table["pareto"] = pareto
    table["score"] = score
    table["rank"] = pd.array([None if math.isnan(r) else int(r) for r in rank], dtype="Int64")
    table["share_first"] = share
    table.attrs["units"] = {q: results.attrs.get("units", {}).get(q, "") for q in names}
    table.attrs["units"].update({"score": "-", "share_first": "-"})
    table.attrs["criteria"] = tuple(criteria)
    return table


def _values(results: pd.DataFrame, kind: StudyKind, column: str) -> np.ndarray:
    v = results[column].to_numpy(float)
    return np.abs(v) if column in kind.magnitude_columns else v


# ---------------------------------------------------------------------------
# Sources
# ---------------------------------------------------------------------------
def _materials_used(kind: StudyKind, study) -> list[str]:
    used: list[str] = []
    for c in getattr(study, "candidates", ()):
        layers = getattr(c, "layers", None)
        if layers is not None:
            used += [lay.material for lay in layers]
        elif getattr(c, "material", None) is not None:
            used.append(c.material)
        elif isinstance(c, str):
            used.append(c)
    return list(dict.fromkeys(used))


_PROPERTY_NAMES = {
    "t_service_source": "service temperature limits",
    "conductivity_tolerance_source": "conductivity tolerance",
    "specific_heat_source": "specific heat",
}


def _sources_used(
    scenario: Scenario, kind: StudyKind, study, results: pd.DataFrame
) -> pd.DataFrame:
    from workbench.materials import MARKERS, conductivity_curve_sources, load_sources

    entries: dict[str, dict[str, Any]] = {}

    def add(key: str, citation: str, use: str) -> None:
        citation = MARKERS.get(citation, citation)
        e = entries.setdefault(citation, {"key": key, "citation": citation, "used_for": []})
        if use not in e["used_for"]:
            e["used_for"].append(use)

    try:
        table = load_sources()
    except Exception:  # pragma: no cover - tables are checked by their own tests
        table = pd.DataFrame(columns=["resolved"])
    for key in kind.formula_sources:
        if key in table.index:
            add(key, str(table.loc[key, "resolved"]), "method")
    materials = getattr(study, "materials", None)
    if materials is None:
        materials, _, _ = materials_for(scenario)
    curves = getattr(study, "k_curves", None) or {}
    curve_keys = conductivity_curve_sources() if curves else {}
    for mid in _materials_used(kind, study):
        if mid not in materials.index:
            continue
        row = materials.loc[mid]
        for col in kind.property_sources:
            if col not in materials.columns:
                continue
            citation = row[col]
            if not isinstance(citation, str) or not citation:
                continue
            key = row.get(f"{col}_key", "")
            prop = _PROPERTY_NAMES.get(col, col.removesuffix("_source").replace("_", " "))
            add(str(key) if isinstance(key, str) else "", citation, f"{prop} of {mid}")
        if mid in curves:
            for key in curve_keys.get(mid, ()):
                if key in table.index:
                    add(key, str(table.loc[key, "resolved"]), f"k(T) curve of {mid}")
    # sources named in the results themselves (e.g. a finish's emissivity)
    resolved_to_key = {str(v): k for k, v in table["resolved"].items()} if len(table) else {}
    for col in results.columns:
        if not col.endswith("_source") or col in kind.property_sources:
            continue
        prop = col.removesuffix("_source").replace("_", " ")
        for cand, citation in results[col].items():
            if isinstance(citation, str) and citation:
                add(resolved_to_key.get(citation, ""), citation, f"{prop} of {cand}")
    for key in results.attrs.get("source_keys", ()):
        if key in table.index:
            add(key, str(table.loc[key, "resolved"]), "method")
    frame = pd.DataFrame(
        [
            {"key": e["key"], "citation": e["citation"], "used_for": "; ".join(e["used_for"])}
            for e in entries.values()
        ],
        columns=["key", "citation", "used_for"],
    )
    return frame


# ---------------------------------------------------------------------------
# Formatting
# ---------------------------------------------------------------------------
def engineering(value: float, sig: int = 3) -> str:
    """Round for display: ``sig`` significant figures, no exponent between 1e-4 and 1e6.

    Examples
    --------
    >>> engineering(1234.5), engineering(0.0123456), engineering(-0.5), engineering(float("nan"))
    ('1230', '0.0123', '-0.5', 'n/a')
    """
    try:
        v = float(value)
    except (TypeError, ValueError):
        return str(value)
    if math.isnan(v):
        return "n/a"
    if math.isinf(v):
        return "∞" if v > 0 else "-∞"
    if v == 0:
        return "0"
    r = float(f"{v:.{sig - 1}e}")
    e = math.floor(math.log10(abs(r)))
    if -4 <= e < 6:
        d = max(sig - 1 - e, 0)
        t = f"{r:.{d}f}"
        return t.rstrip("0").rstrip(".") if "." in t else t
    m, x = f"{r:.{sig - 1}e}".split("e")
    return f"{m.rstrip('0').rstrip('.') if '.' in m else m}e{int(x)}"


def _unit_label(qkind: str, system: str, results: pd.DataFrame) -> str:
    return units.display_unit(
        qkind, system, currency=_currency(results) if units.check_kind(qkind).is_cost else None
    )


def _fmt(value: float, qkind: str | None, system: str, results: pd.DataFrame) -> str:
    if qkind is None:
        return engineering(value)
    shown = float(units.from_si(value, qkind, system))
    number = f"{shown:.1f}" if qkind == "temperature" else engineering(shown)
    label = _unit_label(qkind, system, results)
    return f"{number} {label}".strip()
