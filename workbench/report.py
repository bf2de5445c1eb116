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
from collections.abc import Mapping
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from workbench import units
from workbench.evaluation import (  # noqa: F401  (re-exported: report users import them from here)
    Evaluation,
    _fmt,
    _sources_used,
    _unit_label,
    _values,
    engineering,
    evaluate,
    rank_results,
)
from workbench.scenario import (
    Scenario,
    StudyKind,
    _atomic_write,
)
from workbench.studies._chart_parts import _currency  # noqa: F401  (exports import it here)
from workbench.studykind import column_label as _label

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
