"""What changed between two scenario files: inputs, candidates, criteria, ranking, results, decision.

:func:`diff_scenarios` compares an earlier :class:`~workbench.scenario.Scenario`
(the previous review) with a later one and lists, in plain words with units:

- inputs changed (old → new), compared on their parsed SI values, so ``"2 °C"``
  and ``"275.15 K"`` are the same input;
- candidates added or removed, and build-ups whose layers changed;
- criteria (direction, weight) and constraints (limits) changed, compared on the
  criteria each scenario actually ranks on (its own, or its kind's defaults);
- the ranking's movements and the key results that moved by more than a
  relative tolerance (default 1 %), from both scenarios evaluated exactly as the
  report evaluates them (:func:`workbench.report.evaluate`: study, hard limits,
  weighted ranking);
- whether the decision changed.

The result, a :class:`ScenarioDiff`, renders as text lines (``heatpath diff``),
as a dict (``--format json``), as a pandas table (the workbench's "Compare
with…") and as an HTML section (the report's "Changes since the previous
review"). Two scenarios with nothing to report give ``"no differences"``.

Temperatures in the results are compared on a difference scale, not as
absolute temperatures: a surface temperature "moved" when it changed by more
than ``tolerance`` × the largest spread between the temperature inputs of the
two scenarios (for a wall, |t_outside − t_inside|), or 1 K when they give none.
A relative change of an absolute temperature in kelvin would hide every change
that matters here.
"""

from __future__ import annotations

import html
import math
import os
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import pandas as pd

from workbench import units

__all__ = [
    "Change",
    "ScenarioDiff",
    "diff_scenarios",
    "diff_files",
    "parse_tolerance",
    "changes_since_html",
    "SECTIONS",
]

SECTIONS: tuple[str, ...] = (
    "scenario",
    "inputs",
    "candidates",
    "criteria",
    "constraints",
    "ranking",
    "results",
    "decision",
)
"""Order of the sections in every rendering."""

_SECTION_TITLES = {
    "scenario": "Scenario",
    "inputs": "Inputs changed",
    "candidates": "Candidates",
    "criteria": "Criteria and weights",
    "constraints": "Constraints",
    "ranking": "Ranking",
    "results": "Key results",
    "decision": "Decision",
}
_BUDGET_KINDS = {"flux": "heat_flux", "power": "power", "u_value": "u_value"}
_DECISION_FIELDS = ("chosen", "rationale", "decided_by", "attendees", "date")
_DECISION_WORDS = {
    "chosen": "chosen candidate",
    "rationale": "why",
    "decided_by": "decided by",
    "attendees": "attendees",
    "date": "date",
}


@dataclass(frozen=True)
class Change:
    """One difference between two scenarios.

    Attributes
    ----------
    section : str
        One of :data:`SECTIONS`.
    item : str
        What changed: an input name, a candidate, a criterion, ``"candidate: column"``.
    old, new : str
        The value before and after, as text with units (``""`` when absent).
    text : str
        The whole change in plain words.
    """

    section: str
    item: str
    old: str
    new: str
    text: str


@dataclass(frozen=True)
class ScenarioDiff:
    """The differences between an earlier and a later scenario (see the module docstring).

    Attributes
    ----------
    old_label, new_label : str
        Names of the two scenarios (file names, or titles).
    tolerance : float
        Relative tolerance used for the results [-] (0.01 = 1 %).
    changes : tuple of Change
        In :data:`SECTIONS` order.
    decision_changed : bool
        Whether any field of the decision differs.
    decision : str
        The later scenario's chosen candidate ("" when none).
    """

    old_label: str
    new_label: str
    tolerance: float
    changes: tuple[Change, ...] = field(default_factory=tuple)
    decision_changed: bool = False
    decision: str = ""

    @property
    def same(self) -> bool:
        """True when there is nothing to report."""
        return not self.changes

    def __bool__(self) -> bool:
        return bool(self.changes)

    def by_section(self) -> dict[str, list[Change]]:
        """Changes grouped by section, in :data:`SECTIONS` order (empty sections left out)."""
        out: dict[str, list[Change]] = {}
        for s in SECTIONS:
            found = [c for c in self.changes if c.section == s]
            if found:
                out[s] = found
        return out

    def lines(self) -> list[str]:
        """Plain-text lines: a heading per section, one line per change."""
        head = f"Changes from {self.old_label} to {self.new_label}"
        if self.same:
            return [head, "no differences"]
        out = [head]
        for s, found in self.by_section().items():
            out.append(f"{_SECTION_TITLES[s]}:")
            out += [f"  - {c.text}" for c in found]
        if not self.decision_changed:
            kept = f" ({self.decision})" if self.decision else " (none recorded)"
            out.append(f"Decision: unchanged{kept}")
        tol = f"{100 * self.tolerance:g} %"
        out.append(f"(results compared with a relative tolerance of {tol})")
        return out

    def to_text(self) -> str:
        """:meth:`lines` joined, with a final newline."""
        return "\n".join(self.lines()) + "\n"

    def to_dict(self) -> dict[str, Any]:
        """A JSON-ready dict: labels, tolerance, ``same``, ``decision_changed`` and the changes."""
        return {
            "old": self.old_label,
            "new": self.new_label,
            "tolerance": self.tolerance,
            "same": self.same,
            "summary": "no differences" if self.same else f"{len(self.changes)} differences",
            "decision_changed": self.decision_changed,
            "decision": self.decision,
            "changes": [
                {"section": c.section, "item": c.item, "old": c.old, "new": c.new, "text": c.text}
                for c in self.changes
            ],
        }

    def to_frame(self) -> pd.DataFrame:
        """One row per change: ``section``, ``item``, ``old``, ``new``, ``change`` (plain words)."""
        cols = ["section", "item", "old", "new", "change"]
        rows = [[_SECTION_TITLES[c.section], c.item, c.old, c.new, c.text] for c in self.changes]
        frame = pd.DataFrame(rows, columns=cols)
        frame.attrs["summary"] = "no differences" if self.same else f"{len(rows)} differences"
        return frame

    def to_html(self, heading: str = "Changes since the previous review", level: int = 2) -> str:
        """An HTML section (heading, a table per section); all text escaped."""
        e = html.escape
        h = f"h{int(level)}"
        parts = [
            f'<section class="changes-since"><{h}>{e(heading)}</{h}>',
            f'<p class="meta">Earlier scenario: <code>{e(self.old_label)}</code>; this one: '
            f"<code>{e(self.new_label)}</code>. Results compared with a relative tolerance of "
            f"{e(f'{100 * self.tolerance:g}')} %.</p>",
        ]
        if self.same:
            parts.append("<p>No differences.</p></section>")
            return "\n".join(parts)
        for s, found in self.by_section().items():
            rows = "".join(
                f"<tr><td>{e(c.item)}</td><td>{e(c.old)}</td><td>{e(c.new)}</td><td>{e(c.text)}</td></tr>"
                for c in found
            )
            parts.append(
                f"<h{int(level) + 1}>{e(_SECTION_TITLES[s])}</h{int(level) + 1}>"
                "<table><thead><tr><th>What</th><th>Before</th><th>Now</th><th>Change</th></tr>"
                f"</thead><tbody>{rows}</tbody></table>"
            )
        if not self.decision_changed:
            kept = e(self.decision) if self.decision else "none recorded"
            parts.append(f"<p>Decision unchanged ({kept}).</p>")
        parts.append("</section>")
        return "\n".join(parts)


# ---------------------------------------------------------------------------
# Tolerance
# ---------------------------------------------------------------------------
_TOL = re.compile(r"^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(%?)\s*$")


def parse_tolerance(text: str | float) -> float:
    """A relative tolerance from ``"1%"``, ``"0.5 %"`` or a fraction (``0.01``) [-].

    Examples
    --------
    >>> parse_tolerance("1%"), parse_tolerance("0.5 %"), parse_tolerance("0.02")
    (0.01, 0.005, 0.02)
    >>> parse_tolerance("-1%")
    Traceback (most recent call last):
    ...
    ValueError: --tolerance: must be >= 0, got '-1%'
    """
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        value, shown = float(text), repr(text)
    elif isinstance(text, str):
        m = _TOL.match(text)
        if not m:
            raise ValueError(
                f"--tolerance: expected a percentage such as 1% or a fraction such as 0.01, got {text!r}"
            )
        value = float(m.group(1)) / (100.0 if m.group(2) else 1.0)
        shown = repr(text)
    else:
        raise TypeError(f"--tolerance: expected text such as '1%' or a number, got {type(text).__name__}")
    if not math.isfinite(value):
        raise ValueError(f"--tolerance: must be a finite number, got {shown}")
    if value < 0:
        raise ValueError(f"--tolerance: must be >= 0, got {shown}")
    return value


# ---------------------------------------------------------------------------
# Formatting
# ---------------------------------------------------------------------------
def _fmt_quantity(value: float, kind: str | None, system: str, currency: str | None,
                  unit_si: str = "", other: float | None = None) -> str:
    """Text with unit; more digits when 3 significant figures would hide the difference from ``other``."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "n/a"
    for sig in (3, 4, 6, 8):
        text = _fmt_one(value, kind, system, currency, unit_si, sig)
        if other is None or other == value:
            return text
        if text != _fmt_one(other, kind, system, currency, unit_si, sig):
            return text
    return text


def _fmt_one(value: float, kind: str | None, system: str, currency: str | None, unit_si: str,
             sig: int) -> str:
    if kind is None or kind not in units.KINDS:
        from workbench.evaluation import engineering

        return f"{engineering(value, sig)} {unit_si}".strip()
    cur = currency if units.KINDS[kind].is_cost else None
    return units.format_quantity(float(value), kind, system, sig=sig, currency=cur)


def _plain(value: Any) -> str:
    """A raw scenario value (text, number, list) as short text."""
    if value is None:
        return "not set"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_plain(v) for v in value) + "]"
    if isinstance(value, Mapping):
        return "{" + ", ".join(f"{k} = {_plain(v)}" for k, v in value.items()) + "}"
    return str(value)


def _same_value(a: Any, b: Any) -> bool:
    """Equal parsed values (floats to 1e-12 relative; lists and tuples element by element)."""
    if isinstance(a, bool) or isinstance(b, bool):
        return a is b or a == b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        if math.isnan(a) and math.isnan(b):
            return True
        return math.isclose(float(a), float(b), rel_tol=1e-12, abs_tol=0.0)
    if isinstance(a, (list, tuple)) and isinstance(b, (list, tuple)):
        return len(a) == len(b) and all(_same_value(x, y) for x, y in zip(a, b, strict=True))
    return a == b


def _input_text(spec, parsed: Any, raw: Any, system: str, other: Any = None) -> str:
    """One input as text with its unit, in ``system`` (raw text when it is not a single number)."""
    if parsed is None and raw is None:
        return "not set"
    try:
        if spec.kind == "budget" and isinstance(parsed, tuple) and len(parsed) == 2:
            o = other[1] if isinstance(other, tuple) and other[0] == parsed[0] else None
            return _fmt_quantity(parsed[1], _BUDGET_KINDS[parsed[0]], system, None, other=o)
        if spec.kind == "bool":
            return "yes" if parsed else "no"
        if spec.kind in units.KINDS and isinstance(parsed, (int, float)) and not isinstance(parsed, bool):
            if units.KINDS[spec.kind].is_cost:
                return _plain(raw)
            o = other if isinstance(other, (int, float)) and not isinstance(other, bool) else None
            return _fmt_quantity(float(parsed), spec.kind, system, None, other=o)
    except (ValueError, TypeError, KeyError):
        pass
    return _plain(raw if raw is not None else parsed)


def _label(scenario, fallback: str) -> str:
    if getattr(scenario, "origin", None):
        return str(scenario.origin)
    return scenario.title or fallback


# ---------------------------------------------------------------------------
# The comparison
# ---------------------------------------------------------------------------
def diff_scenarios(old, new, tolerance: float = 0.01, *, old_evaluation=None, new_evaluation=None,
                   old_label: str | None = None, new_label: str | None = None) -> ScenarioDiff:
    """Compare an earlier scenario with a later one (see the module docstring).

    Parameters
    ----------
    old, new : Scenario
        The earlier (previous review) and the later scenario.
    tolerance : float, default 0.01
        Relative change of a result above which it is listed [-] (0.01 = 1 %).
    old_evaluation, new_evaluation : Evaluation, optional
        Already computed :func:`workbench.report.evaluate` results (the report
        passes its own to avoid computing twice).
    old_label, new_label : str, optional
        Names shown for the two scenarios; default: their file names, else titles.

    Returns
    -------
    ScenarioDiff

    Raises
    ------
    ScenarioError
        Either scenario cannot be evaluated (the message names file, line and key).
    TypeError, ValueError
        Not two scenarios, or a bad tolerance.
    """
    from workbench.scenario import Scenario, study_kind

    for name, s in (("old", old), ("new", new)):
        if not isinstance(s, Scenario):
            raise TypeError(f"{name}: expected a Scenario, got {type(s).__name__}")
    tolerance = parse_tolerance(tolerance)
    changes: list[Change] = []
    system = new.display_system
    o_lab = old_label or _label(old, "earlier scenario")
    n_lab = new_label or _label(new, "this scenario")

    # whole-scenario facts
    if old.kind != new.kind:
        changes.append(Change("scenario", "kind", old.kind, new.kind,
                              f"job kind changed: {old.kind} → {new.kind}; nothing else can be compared"))
        return _finish(o_lab, n_lab, tolerance, changes, old, new)
    for attr, word in (("title", "title"), ("display_system", "display units")):
        a, b = getattr(old, attr), getattr(new, attr)
        if a != b:
            changes.append(Change("scenario", word, a, b, f"{word}: {a!r} → {b!r}"))
    if old.materials != new.materials:
        changes.append(Change("scenario", "materials", _materials_text(old), _materials_text(new),
                              f"user materials: {_materials_text(old)} → {_materials_text(new)}"))
    if (old.notes or "").strip() != (new.notes or "").strip():
        changes.append(Change("scenario", "notes", "", "", "the notes were edited"))

    kind = study_kind(new.kind)
    _diff_inputs(old, new, kind, system, changes)
    _diff_candidates(old, new, kind, changes)
    _diff_criteria(old, new, kind, changes)
    _diff_constraints(old, new, kind, system, changes)

    from workbench.evaluation import evaluate

    ev_old = old_evaluation if old_evaluation is not None else evaluate(old)
    ev_new = new_evaluation if new_evaluation is not None else evaluate(new)
    _diff_ranking(ev_old, ev_new, changes)
    _diff_results(ev_old, ev_new, kind, system, tolerance, changes)
    return _finish(o_lab, n_lab, tolerance, changes, old, new)


def _finish(o_lab, n_lab, tolerance, changes, old, new) -> ScenarioDiff:
    dchanges = _diff_decision(old, new)
    changes = changes + dchanges
    order = {s: i for i, s in enumerate(SECTIONS)}
    changes.sort(key=lambda c: order[c.section])  # stable: keeps the order within a section
    chosen = new.decision.chosen if new.decision is not None else ""
    return ScenarioDiff(o_lab, n_lab, tolerance, tuple(changes), bool(dchanges), chosen)


def _materials_text(s) -> str:
    m = s.materials
    if m is None:
        return "curated tables only"
    if m.path:
        return f"file {m.path} (sha256 {str(m.sha256 or '')[:12]})"
    return f"{len(m.rows)} rows inline"


def _diff_inputs(old, new, kind, system, changes) -> None:
    from workbench.scenario import parse_inputs

    a, b = parse_inputs(old), parse_inputs(new)
    for spec in kind.inputs:
        pa, pb = a.get(spec.name), b.get(spec.name)
        ra, rb = old.inputs.get(spec.name), new.inputs.get(spec.name)
        if _same_value(pa, pb):
            continue
        ta = _input_text(spec, pa, ra, system, pb)
        tb = _input_text(spec, pb, rb, system, pa)
        if pa is None and ra is None:
            text = f"{spec.name}: added, {tb}"
        elif pb is None and rb is None:
            text = f"{spec.name}: removed (was {ta})"
        else:
            text = f"{spec.name}: {ta} → {tb}"
        changes.append(Change("inputs", spec.name, ta, tb, text))


def _candidate_text(c) -> str:
    if isinstance(c, str):
        return c
    layers = c.get("layers", ()) if isinstance(c, Mapping) else ()
    parts = []
    for lay in layers:
        t = lay.get("thickness")
        parts.append(f"{lay.get('material')}" + (f" {t}" if t else " (sized)"))
    return " + ".join(parts) if parts else _plain(c)


def _candidate_key(c) -> Any:
    """A comparable form of a candidate: thicknesses as SI floats (``"0.6 mm"`` = ``"0.0006 m"``)."""
    if isinstance(c, str):
        return c
    if isinstance(c, Mapping):
        out = []
        for k, v in sorted(c.items()):
            if isinstance(v, (list, tuple)):
                out.append((k, tuple(_candidate_key(x) for x in v)))
            elif k in ("thickness",) and isinstance(v, str):
                try:
                    out.append((k, round(float(units.parse(v, "thickness", k)), 12)))
                except ValueError:
                    out.append((k, v))
            else:
                out.append((k, v))
        return tuple(out)
    return c


def _diff_candidates(old, new, kind, changes) -> None:
    a = {kind.name_of(c): c for c in old.candidates}
    b = {kind.name_of(c): c for c in new.candidates}
    for name in b:
        if name not in a:
            t = _candidate_text(b[name])
            what = "" if t == name else f" ({t})"
            changes.append(Change("candidates", name, "", t, f"added: {name}{what}"))
    for name in a:
        if name not in b:
            t = _candidate_text(a[name])
            what = "" if t == name else f" ({t})"
            changes.append(Change("candidates", name, t, "", f"removed: {name}{what}"))
    for name in b:
        if name in a and _candidate_key(a[name]) != _candidate_key(b[name]):
            ta, tb = _candidate_text(a[name]), _candidate_text(b[name])
            changes.append(Change("candidates", name, ta, tb, f"{name}: build-up changed, {ta} → {tb}"))


def _criteria_of(s, kind) -> tuple[dict, bool]:
    crit = s.criteria or kind.default_criteria
    return {c.quantity: c for c in crit}, not s.criteria


def _diff_criteria(old, new, kind, changes) -> None:
    a, a_default = _criteria_of(old, kind)
    b, b_default = _criteria_of(new, kind)
    if a_default != b_default:
        which = "the kind's default criteria" if b_default else "its own criteria"
        changes.append(Change("criteria", "criteria", "", "", f"the later scenario ranks on {which}"))
    for q, c in b.items():
        if q not in a:
            t = f"{c.direction}, weight {c.weight:g}"
            changes.append(Change("criteria", q, "", t, f"criterion added: {q} ({t})"))
    for q, c in a.items():
        if q not in b:
            t = f"{c.direction}, weight {c.weight:g}"
            changes.append(Change("criteria", q, t, "", f"criterion removed: {q} (was {t})"))
    for q, c in b.items():
        if q in a:
            o = a[q]
            if o.direction != c.direction:
                changes.append(Change("criteria", f"{q} direction", o.direction, c.direction,
                                      f"{q}: {o.direction} → {c.direction}"))
            if not math.isclose(o.weight, c.weight, rel_tol=1e-12, abs_tol=0.0):
                changes.append(Change("criteria", f"{q} weight", f"{o.weight:g}", f"{c.weight:g}",
                                      f"{q}: weight {o.weight:g} → {c.weight:g}"))


def _constraint_text(c) -> str:
    if c.bound == "require":
        return "required"
    return f"{c.bound} {c.limit}"


def _diff_constraints(old, new, kind, system, changes) -> None:
    from workbench.scenario import constraint_limit

    def table(s):
        return {(c.quantity, c.bound): c for c in s.constraints}

    a, b = table(old), table(new)
    for key, c in b.items():
        if key not in a:
            changes.append(Change("constraints", c.quantity, "", _constraint_text(c),
                                  f"constraint added: {c.quantity} {_constraint_text(c)}"))
    for key, c in a.items():
        if key not in b:
            changes.append(Change("constraints", c.quantity, _constraint_text(c), "",
                                  f"constraint removed: {c.quantity} {_constraint_text(c)}"))
    for key, c in b.items():
        if key in a and c.bound != "require":
            o = a[key]
            try:
                same = _same_value(constraint_limit(kind, o), constraint_limit(kind, c))
            except ValueError:
                same = o.limit == c.limit
            if not same:
                qk = kind.column_kinds.get(c.quantity)
                ta, tb = o.limit, c.limit
                if qk is not None:
                    try:
                        la, lb = constraint_limit(kind, o), constraint_limit(kind, c)
                        ta = _fmt_quantity(la, qk, system, None, other=lb)
                        tb = _fmt_quantity(lb, qk, system, None, other=la)
                    except ValueError:
                        pass
                changes.append(Change("constraints", f"{c.quantity} {c.bound}", ta, tb,
                                      f"{c.quantity}: {c.bound} {ta} → {tb}"))


def _rank_of(table: pd.DataFrame, name: str) -> int | None:
    r = table.loc[name, "rank"]
    return None if pd.isna(r) else int(r)


def _best(table: pd.DataFrame) -> list[str]:
    r = table["rank"]
    return [str(n) for n in table.index[(r == 1).fillna(False).to_numpy(bool)]]


def _diff_ranking(ev_old, ev_new, changes) -> None:
    a, b = ev_old.ranking, ev_new.ranking
    best_a, best_b = _best(a), _best(b)
    if best_a != best_b:
        ta, tb = ", ".join(best_a) or "none", ", ".join(best_b) or "none"
        changes.append(Change("ranking", "best ranked", ta, tb, f"best ranked: {ta} → {tb}"))
    for name in b.index:
        if name not in a.index:
            continue
        ra, rb = _rank_of(a, name), _rank_of(b, name)
        if ra == rb:
            continue
        if rb is None:
            why = str(b.loc[name, "excluded_because"]) or "no rank"
            text = f"{name}: rank {ra} → excluded ({why})"
        elif ra is None:
            text = f"{name}: excluded → rank {rb}"
        else:
            moved = "up" if rb < ra else "down"
            n = abs(rb - ra)
            text = f"{name}: rank {ra} → {rb} ({moved} {n} place{'s' if n > 1 else ''})"
        changes.append(Change("ranking", name, "excluded" if ra is None else str(ra),
                              "excluded" if rb is None else str(rb), text))


def _temperature_scale(ev_old, ev_new) -> float:
    """Largest spread between the temperature inputs of both scenarios [K] (1 K if none)."""
    spread = 0.0
    for ev in (ev_old, ev_new):
        temps = []
        for spec in ev.kind.inputs:
            v = ev.inputs_si.get(spec.name)
            if spec.kind == "temperature" and isinstance(v, (int, float)) and math.isfinite(v):
                temps.append(float(v))
            elif spec.kind == "profile" and isinstance(v, tuple) and len(v) == 2:
                temps += [float(t) for t in v[1]]
        if len(temps) >= 2:
            spread = max(spread, max(temps) - min(temps))
    return spread if spread > 0 else 1.0


def _diff_results(ev_old, ev_new, kind, system, tolerance, changes) -> None:
    from workbench.studies._chart_parts import _currency
    from workbench.studykind import column_label

    a, b = ev_old.results, ev_new.results
    cur = _currency(b) or _currency(a)
    unit_si = b.attrs.get("units", {})
    t_scale = _temperature_scale(ev_old, ev_new)
    cols = [c for c in kind.column_kinds if c in a.columns and c in b.columns]
    flags = [c for c in kind.flag_columns if c in a.columns and c in b.columns]
    for name in b.index:
        if name not in a.index:
            continue
        for col in cols:
            try:
                va, vb = float(a.loc[name, col]), float(b.loc[name, col])
            except (TypeError, ValueError):
                continue
            if col in kind.magnitude_columns:
                va, vb = abs(va), abs(vb)
            if math.isnan(va) and math.isnan(vb):
                continue
            qk = kind.column_kinds[col]
            if math.isnan(va) or math.isnan(vb):
                moved = True
            elif qk == "temperature":
                moved = abs(vb - va) > tolerance * t_scale
            else:
                scale = max(abs(va), abs(vb))
                moved = abs(vb - va) > tolerance * scale if scale > 0 else False
            if not moved:
                continue
            ta = _fmt_quantity(va, qk, system, cur, unit_si.get(col, ""), other=vb)
            tb = _fmt_quantity(vb, qk, system, cur, unit_si.get(col, ""), other=va)
            if qk != "temperature" and va != 0 and math.isfinite(va) and math.isfinite(vb):
                rel = f" ({100 * (vb - va) / abs(va):+.1f} %)"
            else:
                rel = ""
            changes.append(Change("results", f"{name}: {col}", ta, tb, f"{name}: {column_label(col, kind)} {ta} → {tb}{rel}"))
        for col in flags:
            fa, fb = bool(a.loc[name, col]), bool(b.loc[name, col])
            if fa != fb:
                ta, tb = ("yes" if fa else "no"), ("yes" if fb else "no")
                changes.append(Change("results", f"{name}: {col}", ta, tb,
                                      f"{name}: {column_label(col, kind)} {ta} → {tb}"))


def _decision_value(d, name: str) -> str:
    return "" if d is None else str(getattr(d, name, "") or "")


def _diff_decision(old, new) -> list[Change]:
    a, b = old.decision, new.decision
    out: list[Change] = []
    if a is None and b is None:
        return out
    if a is None or not a.chosen:
        if b is not None and b.chosen:
            out.append(Change("decision", "chosen candidate", "", b.chosen, f"decision recorded: {b.chosen}"))
    elif b is None or not b.chosen:
        out.append(Change("decision", "chosen candidate", a.chosen, "", f"decision removed (was {a.chosen})"))
    elif a.chosen != b.chosen:
        out.append(Change("decision", "chosen candidate", a.chosen, b.chosen,
                          f"decision changed: {a.chosen} → {b.chosen}"))
    for f in _DECISION_FIELDS[1:]:
        va, vb = _decision_value(a, f), _decision_value(b, f)
        if va != vb:
            word = _DECISION_WORDS[f]
            if f == "rationale":
                text = f"{word}: {_short(va)!r} → {_short(vb)!r}"
            else:
                text = f"{word}: {va or 'not recorded'} → {vb or 'not recorded'}"
            out.append(Change("decision", word, va, vb, text))
    return out


def _short(text: str, n: int = 80) -> str:
    text = " ".join(text.split())
    return text if len(text) <= n else text[: n - 1] + "…"


# ---------------------------------------------------------------------------
# Files and the report section
# ---------------------------------------------------------------------------
def diff_files(old_path: str | os.PathLike, new_path: str | os.PathLike,
               tolerance: float | str = 0.01) -> ScenarioDiff:
    """:func:`diff_scenarios` of two scenario files (``heatpath diff OLD.toml NEW.toml``).

    Raises
    ------
    ScenarioError
        A broken file: the message starts with ``file:line:column``.
    FileNotFoundError
        A missing file (the message names it).
    """
    from workbench.scenario import load_scenario

    tol = parse_tolerance(tolerance)
    olds, news = (_load(load_scenario, p) for p in (old_path, new_path))
    return diff_scenarios(olds, news, tol, old_label=str(old_path), new_label=str(new_path))


def _load(load, path):
    p = Path(path)
    if not p.exists():
        raise FileNotFoundError(f"{p}: no such scenario file")
    if p.is_dir():
        raise IsADirectoryError(f"{p}: is a folder, not a scenario file")
    return load(p)


def changes_since_html(previous, current, tolerance: float | str = 0.01) -> str:
    """The report's "Changes since the previous review" section (HTML).

    Parameters
    ----------
    previous : str, PathLike or Scenario
        The scenario file (or scenario) of the previous review.
    current : Evaluation or Scenario
        What the report shows now (an :class:`~workbench.report.Evaluation` is
        reused, so nothing is computed twice).
    tolerance : float or str
        Relative tolerance for the results (``0.01`` or ``"1%"``).
    """
    from workbench.evaluation import Evaluation
    from workbench.scenario import Scenario, load_scenario

    old = previous if isinstance(previous, Scenario) else _load(load_scenario, previous)
    if isinstance(current, Evaluation):
        d = diff_scenarios(old, current.scenario, tolerance, new_evaluation=current)
    else:
        d = diff_scenarios(old, current, tolerance)
    return d.to_html()

