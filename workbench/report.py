"""The review-meeting report: evaluate a scenario and write one standalone HTML file.

:func:`evaluate` runs the whole job of a :class:`~workbench.scenario.Scenario`
(build the study, compute the results, apply the hard limits, rank on the
criteria) while recording every warning raised, and collects the sources of
every property and method used. :func:`render_html` turns that into one HTML
page that opens offline (plotly.js is inlined once), and :func:`write_report`
writes it atomically.

Everything a user typed (titles, notes, candidate and material names) is
escaped with :func:`html.escape`; nothing user-supplied reaches the page as
markup.
"""

from __future__ import annotations

import datetime as _dt
import html
import math
import os
import warnings
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from workbench import ranking, units
from workbench.scenario import (
    ConstraintSpec,
    CriterionSpec,
    Scenario,
    StudyKind,
    _atomic_write,
    constraint_limit,
    located_error,
    materials_for,
    parse_inputs,
    scenario_hash,
    study_from_scenario,
    study_kind,
)
from workbench.studies._chart_parts import _currency  # noqa: F401  (exports and review import it here)

__all__ = [
    "GENERAL_CAUTIONS",
    "Evaluation",
    "evaluate",
    "rank_results",
    "render_html",
    "write_report",
    "engineering",
    "display_frame",
]

GENERAL_CAUTIONS: tuple[str, ...] = (
    "These are first-order engineering estimates: steady or lumped models, published "
    "correlations and typical table values with the tolerances and sources shown. Real products "
    "differ (grades, moisture, ageing, joints, edges, workmanship).",
    "This report is not a substitute for testing the actual product, for the codes and "
    "regulations that apply where it is used, or for licensed professional practice. A decision "
    "that affects safety must be confirmed by those means.",
)
"""Cautions printed in every report, before the job-specific ones."""


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


#: Readable names of the ranking's own columns (every kind); a kind's ``column_labels`` add its own.
_RANKING_LABELS = {"pareto": "Pareto-optimal"}


def _label(col: str, kind: StudyKind | None = None) -> str:
    """A readable column name: the kind's label, else derived from the column name.

    Examples
    --------
    >>> _label("t_surface_inside"), _label("u_value"), _label("pareto")
    ('Surface temperature inside', 'U-value', 'Pareto-optimal')
    """
    if kind is not None and col in kind.column_labels:
        return kind.column_labels[col]
    if col in _RANKING_LABELS:
        return _RANKING_LABELS[col]
    if col.startswith("t_") and col not in ("t_surface_inside", "t_surface_outside"):
        col = col[2:] + "_temperature"
    text = col.replace("_", " ")
    for a, b in (("t surface", "surface temperature"), ("u value", "U-value"), ("degC", "°C")):
        text = text.replace(a, b)
    return text[:1].upper() + text[1:]


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


def display_frame(
    frame: pd.DataFrame,
    kind: StudyKind,
    system: str = "SI",
    results: pd.DataFrame | None = None,
    text: bool = True,
) -> pd.DataFrame:
    """A copy for people: known quantities converted to ``system``, units in the headers.

    ``text=True`` also rounds numbers (:func:`engineering`) and writes yes/no.
    Columns ending ``_source`` or ``_key`` are dropped (the report lists sources apart).
    """
    results = frame if results is None else results
    out = pd.DataFrame(index=frame.index.copy())
    si_units = frame.attrs.get("units", {})
    for col in frame.columns:
        if col.endswith("_source") or col.endswith("_key"):
            continue
        s = frame[col]
        qkind = kind.column_kinds.get(col)
        if qkind is not None:
            vals = np.asarray(units.from_si(s.to_numpy(float), qkind, system), float).reshape(-1)
            head = f"{_label(col, kind)} [{_unit_label(qkind, system, results) or '–'}]"
            if text:
                out[head] = [
                    f"{v:.1f}" if qkind == "temperature" and math.isfinite(v) else engineering(v)
                    for v in vals
                ]
            else:
                out[head] = vals
        elif s.dtype == bool or (
            s.dtype == object and s.map(lambda x: isinstance(x, bool)).all() and len(s)
        ):
            out[_label(col, kind)] = s.map(lambda b: "yes" if b else "no") if text else s
        elif pd.api.types.is_numeric_dtype(s):
            unit = str(si_units.get(col, "")).lstrip("/")
            head = f"{_label(col, kind)} [{unit}]" if unit and unit != "-" else _label(col, kind)
            if col == "rank":
                out[head] = [("" if pd.isna(v) else str(int(v))) for v in s] if text else s
            else:
                out[head] = [engineering(v) for v in s] if text else s
        else:
            out[_label(col, kind)] = s.astype(object).where(s.notna(), "")
    out.index.name = frame.index.name or "candidate"
    return out


# ---------------------------------------------------------------------------
# HTML
# ---------------------------------------------------------------------------
_CSS = """
body{font-family:system-ui,-apple-system,'Segoe UI',sans-serif;margin:2rem auto;max-width:72rem;
color:#1d2433;line-height:1.45;padding:0 1rem}
h1{font-size:1.6rem;border-bottom:3px solid #2f6f62;padding-bottom:.3rem}
h2{font-size:1.2rem;color:#2f6f62;margin-top:2rem}
.table-scroll{overflow-x:auto;max-width:100%}
table{border-collapse:collapse;margin:.5rem 0 1rem;font-size:.88rem}
th,td{border:1px solid #c9d2cf;padding:.25rem .5rem;text-align:left;vertical-align:top}
th{background:#eef3f1}
td.num{text-align:right;font-variant-numeric:tabular-nums}
tr.chosen td{background:#fff3d6;font-weight:600}
.meta{color:#55606e;font-size:.85rem}
.caution{border-left:4px solid #b5452b;background:#fbefec;padding:.5rem .8rem;margin:.4rem 0}
.warn{border-left:4px solid #c28a12;background:#fdf6e3;padding:.4rem .8rem;margin:.3rem 0}
.notes{white-space:pre-wrap;background:#f5f7f6;padding:.6rem;border:1px solid #dde4e1}
.decision{border:2px solid #2f6f62;padding:.6rem .9rem;background:#f1f8f5}
"""


def _e(x: Any) -> str:
    return html.escape(str(x), quote=True)


def _table(frame: pd.DataFrame, chosen: str | None = None, index: bool = True) -> str:
    head = "".join(
        f"<th>{_e(c)}</th>"
        for c in ([frame.index.name or ""] if index else []) + list(frame.columns)
    )
    rows = []
    for idx, row in frame.iterrows():
        cls = ' class="chosen"' if chosen is not None and idx == chosen else ""
        cells = [f"<th>{_e(idx)}</th>"] if index else []
        for v in row:
            num = isinstance(v, str) and _looks_numeric(v)
            cells.append(f'<td class="num">{_e(v)}</td>' if num else f"<td>{_e(v)}</td>")
        rows.append(f"<tr{cls}>{''.join(cells)}</tr>")
    return (f"<div class=\"table-scroll\"><table><thead><tr>{head}</tr></thead>"
            f"<tbody>{''.join(rows)}</tbody></table></div>")


def _looks_numeric(s: str) -> bool:
    try:
        float(s)
        return True
    except ValueError:
        return s in ("n/a", "∞", "-∞")


def _profile_texts(raw, si, ev: Evaluation) -> tuple[str, str]:
    """How an ambient profile was given (steps, or a logger file with its sha256) and its SI reading."""
    times, temps = (np.asarray(v, float) for v in si)
    if isinstance(raw, Mapping):
        from workbench.scenario import _resolve_path, file_sha256

        target = _resolve_path(raw["file"], ev.scenario.base_dir)
        digest = raw.get("sha256") or file_sha256(target)
        shown = f"logger file {raw['file']} (sha256 {digest[:16]}…)"
        si_text = (
            f"{times.size} readings over {units.format_quantity(times[-1], 'time', ev.system)}, "
            f"{units.format_quantity(temps.min(), 'temperature', ev.system)} to "
            f"{units.format_quantity(temps.max(), 'temperature', ev.system)}"
        )
        return shown, si_text
    shown = "; ".join(f"{a} → {b}" for a, b in raw)
    si_text = "; ".join(
        f"{units.format_quantity(a, 'time', ev.system)} → "
        f"{units.format_quantity(b, 'temperature', ev.system)}"
        for a, b in zip(times, temps, strict=True)
    )
    return shown, si_text


def _inputs_frame(ev: Evaluation) -> pd.DataFrame:
    rows = []
    for spec in ev.kind.inputs:
        raw = ev.scenario.inputs.get(spec.name)
        si = ev.inputs_si.get(spec.name)
        if raw is None:
            shown, si_text = "(not set)", ""
        elif spec.kind == "bool":
            shown, si_text = ("yes" if raw else "no"), ""
        elif spec.kind in ("choice", "text"):
            shown, si_text = str(raw), ""
        elif spec.kind == "thickness_list":
            shown = ", ".join(map(str, raw))
            si_text = ", ".join(units.format_quantity(v, "thickness", ev.system) for v in si)
        elif spec.kind == "profile":
            shown, si_text = _profile_texts(raw, si, ev)
        elif spec.kind == "profiles":
            pairs = [(name, _profile_texts(raw[name], si[name], ev)) for name in raw]
            shown = " | ".join(f"{name}: {s}" for name, (s, _) in pairs)
            si_text = " | ".join(f"{name}: {t}" for name, (_, t) in pairs)
        elif spec.kind in ("money", "dimensionless"):
            shown, si_text = str(raw), engineering(si)
        elif spec.kind == "budget":
            bkind, val = si
            qk = {"flux": "heat_flux", "power": "power", "u_value": "u_value"}[bkind]
            shown, si_text = str(raw), f"{bkind}: {units.format_quantity(val, qk, ev.system)}"
        else:
            shown = str(raw)
            si_text = (
                units.format_quantity(si, spec.kind, ev.system)
                if not units.check_kind(spec.kind).is_cost
                else engineering(si)
            )
        rows.append(
            {
                "input": spec.name,
                "as entered": shown,
                f"value ({ev.system})": si_text,
                "meaning": spec.doc,
            }
        )
    return pd.DataFrame(rows).set_index("input")


def _materials_note(s: Scenario) -> str:
    m = s.materials
    if m is None:
        return "<p>Materials: the curated tables shipped with the tool.</p>"
    if m.path is not None:
        return (
            f"<p>Materials: the curated tables with the user's file <code>{_e(m.path)}</code> "
            f"merged over them (SHA-256 <code>{_e(m.sha256)}</code>, checked on load).</p>"
        )
    return (
        f"<p>Materials: the curated tables with {len(m.rows)} user row(s) written inline in "
        "the scenario merged over them.</p>"
    )


def _candidates_frame(ev: Evaluation) -> pd.DataFrame:
    materials = getattr(ev.study, "materials", None)
    rows = []
    for c in ev.scenario.candidates:
        if isinstance(c, str):
            name = c
            desc = _material_name(materials, c)
        else:
            name = str(c.get("name") or "")
            parts = []
            for lay in c.get("layers", ()):
                t = lay.get("thickness")
                parts.append(
                    f"{_material_name(materials, lay['material'])}"
                    f" ({t if t is not None else 'sized'})"
                )
            if "material" in c:
                parts.append(_material_name(materials, c["material"]))
            extra = [f"{k} = {v}" for k, v in c.items() if k not in ("name", "layers", "material")]
            desc = " | ".join(parts + extra)
        rows.append({"candidate": name, "build-up (inside to outside)": desc})
    return pd.DataFrame(rows).set_index("candidate")


def _material_name(materials, mid: str) -> str:
    if materials is not None and mid in materials.index:
        return f"{materials.loc[mid, 'name']} [{mid}]"
    return mid


def _criteria_frame(ev: Evaluation) -> pd.DataFrame:
    rows = [
        {"criterion": _label(c.quantity, ev.kind), "direction": c.direction, "weight": engineering(c.weight)}
        for c in ev.criteria
    ]
    for c in ev.scenario.constraints:
        rows.append(
            {
                "criterion": _label(c.quantity, ev.kind),
                "direction": "must be yes" if c.bound == "require" else c.bound,
                "weight": "hard limit" + ("" if c.bound == "require" else f": {c.limit}"),
            }
        )
    return pd.DataFrame(rows).set_index("criterion")


def _charts(ev: Evaluation) -> list:
    import plotly.graph_objects as go

    figs = []
    r, t = ev.results, ev.ranking
    crit = list(ev.criteria)
    names = [str(i) for i in t.index]
    hover_src = (
        r["conductivity_source"].astype(str).tolist()
        if "conductivity_source" in r.columns
        else [""] * len(names)
    )
    if len(crit) >= 2:
        qx, qy = crit[0].quantity, crit[1].quantity
        x, ux = _shown(t[qx].to_numpy(float), qx, ev)
        y, uy = _shown(t[qy].to_numpy(float), qy, ev)
        fig = go.Figure()
        groups = (
            (
                "Pareto front",
                t["pareto"].to_numpy() & t["feasible"].to_numpy(),
                dict(symbol="circle", size=11, color="#2f6f62"),
            ),
            (
                "dominated",
                ~t["pareto"].to_numpy() & t["feasible"].to_numpy(),
                dict(symbol="circle-open", size=10, color="#2f6f62"),
            ),
            (
                "excluded by a limit",
                ~t["feasible"].to_numpy(),
                dict(symbol="x", size=9, color="#9aa3ad"),
            ),
        )
        for label, mask, marker in groups:
            i = np.flatnonzero(mask)
            if not i.size:
                continue
            fig.add_trace(
                go.Scatter(
                    x=x[i],
                    y=y[i],
                    mode="markers+text",
                    name=label,
                    marker=marker,
                    text=[names[k] for k in i],
                    textposition="top center",
                    customdata=[[hover_src[k]] for k in i],
                    hovertemplate=(
                        f"%{{text}}<br>{_e(_label(qx, ev.kind))}: %{{x:.3g}} {_e(ux)}"
                        f"<br>{_e(_label(qy, ev.kind))}: %{{y:.3g}} {_e(uy)}"
                        "<br>k source: %{customdata[0]}<extra></extra>"
                    ),
                )
            )
        if ev.chosen in names:
            k = names.index(ev.chosen)
            fig.add_trace(
                go.Scatter(
                    x=[x[k]],
                    y=[y[k]],
                    mode="markers",
                    name="chosen",
                    marker=dict(
                        symbol="star",
                        size=20,
                        color="#d9952b",
                        line=dict(width=1.5, color="#1d2433"),
                    ),
                    hovertemplate=f"chosen: {_e(ev.chosen)}<extra></extra>",
                )
            )
        fig.update_layout(
            title=f"Trade-off: {_label(qx, ev.kind)} against {_label(qy, ev.kind)}",
            xaxis_title=f"{_label(qx, ev.kind)} [{ux or '–'}]",
            yaxis_title=f"{_label(qy, ev.kind)} [{uy or '–'}]",
        )
        _log_if_spans(fig, x, y)
        figs.append(fig)
    score = t["score"].to_numpy(float)
    ok = np.isfinite(score)
    if ok.any():
        order = np.argsort(score[ok])
        nm = [names[i] for i in np.flatnonzero(ok)[order]]
        colors = ["#d9952b" if n == ev.chosen else "#2f6f62" for n in nm]
        fig = go.Figure(
            go.Bar(
                x=score[ok][order],
                y=nm,
                orientation="h",
                marker_color=colors,
                hovertemplate="%{y}: score %{x:.3f}<extra></extra>",
            )
        )
        fig.update_layout(
            title="Weighted score (0 = best on every criterion)",
            xaxis_title="Weighted score [–]",
            yaxis=dict(autorange="reversed"),
        )
        figs.append(fig)
    if ev.kind.charts is not None:
        figs += ev.kind.charts(ev)
    for f in figs:
        f.update_layout(
            template="plotly_white",
            height=420,
            margin=dict(l=60, r=20, t=50, b=50),
            font=dict(family="system-ui, sans-serif", size=12),
        )
    return figs


def _shown(values: np.ndarray, column: str, ev: Evaluation) -> tuple[np.ndarray, str]:
    """Values of a results column in the display system, and the unit label."""
    qkind = ev.kind.column_kinds.get(column)
    if qkind is None:
        unit = str(ev.results.attrs.get("units", {}).get(column, "")).lstrip("/")
        return np.asarray(values, float).reshape(-1), ("" if unit == "-" else unit)
    shown = np.asarray(units.from_si(values, qkind, ev.system), float).reshape(-1)
    return shown, _unit_label(qkind, ev.system, ev.results)


def _log_if_spans(fig, x: np.ndarray, y: np.ndarray) -> None:
    for arr, axis in ((x, "xaxis"), (y, "yaxis")):
        a = arr[np.isfinite(arr)]
        if a.size and np.all(a > 0) and a.max() / a.min() > 100:
            fig.update_layout(**{axis: dict(type="log")})


def _chart_html(figs: list) -> str:
    parts = []
    for i, fig in enumerate(figs):
        parts.append(
            fig.to_html(
                full_html=False,
                include_plotlyjs=(i == 0),
                config={"displaylogo": False, "responsive": True},
                div_id=f"chart-{i}",
            )
        )
    return "\n".join(parts)


def render_html(ev: Evaluation, generated: str | None = None, since: str = "") -> str:
    """The report page for an :class:`Evaluation` (standalone HTML, opens offline).

    Parameters
    ----------
    ev : Evaluation
    generated : str, optional
        Time stamp text; default: now (UTC).
    since : str, optional
        The "Changes since the previous review" section
        (:func:`workbench.review.changes_since_html`), placed after the decision.
    """
    s = ev.scenario
    when = generated or _dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M UTC")
    chosen = ev.chosen
    title = s.title or f"{ev.kind.title} study"
    res = display_frame(ev.results, ev.kind, ev.system)
    rk = ev.ranking.copy()
    rk = rk.sort_values(["rank"], na_position="last")
    rk_shown = display_frame(rk, ev.kind, ev.system, results=ev.results)
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en"><head><meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>{_e(title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{_e(title)}</h1>",
        f'<p class="meta">{_e(ev.kind.title)} · heatpath-workbench {_e(ev.tool_version)} · '
        f"scenario hash <code>{_e(ev.scenario_hash)}</code> · generated {_e(when)} · "
        f"units: {_e(ev.system)}</p>",
        "<h2>The job</h2>",
        f"<p>{_e(ev.kind.job)}</p>",
    ]
    if chosen:
        d = s.decision
        parts.append(
            f'<div class="decision"><strong>Decision:</strong> {_e(chosen)}'
            + (f"<br><strong>Why:</strong> {_e(d.rationale)}" if d.rationale else "")
            + (f"<br><strong>By:</strong> {_e(d.decided_by)}" if d.decided_by else "")
            + (f"<br><strong>Attendees:</strong> {_e(d.attendees)}" if d.attendees else "")
            + (f"<br><strong>Date:</strong> {_e(d.date)}" if d.date else "")
            + "</div>"
        )
    if since:
        parts.append(since)
    parts += [
        "<h2>Cautions</h2>",
        *(f'<div class="caution">{_e(c)}</div>' for c in (*GENERAL_CAUTIONS, *ev.cautions)),
        "<h2>Inputs</h2>",
        _table(_inputs_frame(ev)),
        _materials_note(s),
        "<h2>Candidates</h2>",
        _table(_candidates_frame(ev), chosen),
        "<h2>Assumptions</h2>",
        "<ul>" + "".join(f"<li>{_e(a)}</li>" for a in ev.assumptions) + "</ul>",
        "<h2>Results</h2>",
        "<p>One row per candidate at its design point; values rounded to three significant "
        "figures for reading (the JSON export keeps full precision in SI).</p>",
        _table(res, chosen),
        "<h2>Ranking</h2>",
        "<p>Hard limits first; the Pareto front and the weighted score are taken over the "
        "candidates that pass them. Score 0 is best on every criterion; “share first” is the "
        "share of all weightings (a grid over the weight simplex) under which the candidate "
        "ranks first.</p>",
        _table(_criteria_frame(ev)),
        _table(rk_shown, chosen),
        "<h2>Charts</h2>",
        _chart_html(_charts(ev)),
        "<h2>Warnings raised during the computation</h2>",
    ]
    if ev.warnings:
        parts += [f'<div class="warn">{_e(w)}</div>' for w in ev.warnings]
    else:
        parts.append("<p>None.</p>")
    src = ev.sources.rename(columns={"key": "key", "citation": "source", "used_for": "used for"})
    parts += [
        "<h2>Sources of the properties and methods used</h2>",
        _table(src.set_index("key") if len(src) else src, index=bool(len(src))),
    ]
    if s.notes:
        parts += ["<h2>Notes</h2>", f'<div class="notes">{_e(s.notes)}</div>']
    parts += [
        '<h2>Reproduce</h2><p class="meta">Save the scenario file next to this report and run '
        "<code>heatpath report SCENARIO.toml -o report.html</code>; the scenario hash above "
        f"identifies the inputs (tool version {_e(ev.tool_version)}).</p>",
        "</body></html>",
    ]
    return "\n".join(parts)


def write_report(
    scenario_or_eval: Scenario | Evaluation,
    path: str | os.PathLike,
    overwrite: bool = False,
    progress=None,
    since: str | os.PathLike | None = None,
    tolerance: float | str = 0.01,
) -> Path:
    """Evaluate (if needed), render and write the HTML report atomically.

    An existing file raises :class:`FileExistsError` unless ``overwrite=True``.
    ``since`` (an earlier scenario file) adds the "Changes since the previous
    review" section, with results compared at ``tolerance`` (relative).
    """
    ev = (
        scenario_or_eval
        if isinstance(scenario_or_eval, Evaluation)
        else evaluate(scenario_or_eval, progress)
    )
    since_html = ""
    if since is not None:
        from workbench.review import changes_since_html

        if progress:
            progress(f"comparing with {since}")
        since_html = changes_since_html(since, ev, tolerance)
    if progress:
        progress("rendering the report")
    text = render_html(ev, since=since_html)
    path = Path(path)
    _atomic_write(path, text, overwrite=overwrite, backup=False)
    return path
