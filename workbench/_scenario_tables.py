"""Readers of a scenario file's tables: candidates, criteria, constraints, the decision.

Each reader takes the parsed TOML data, adds every problem it finds to the
collector at the key concerned (in file order), and returns the objects of
:mod:`workbench._scenario_objects`; :func:`workbench.scenario.scenario_from_text`
calls them in turn.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from workbench._scenario_checks import _check_constraint, _is_iso_date
from workbench._scenario_limits import _limit_why
from workbench._scenario_materials import _renamed_ids
from workbench._scenario_objects import ConstraintSpec, CriterionSpec, Decision
from workbench._scenario_problems import _describe, _get, _Problems, _unknown_keys

if TYPE_CHECKING:
    from workbench.studykind import StudyKind


def _read_candidates(data: Mapping, p: _Problems, lim: Mapping[str, int]) -> list[Any]:
    """The ``candidates`` list: material ids, or kind-specific tables (the kind checks them)."""
    raw_cands = _get(data, "candidates", list, (), p, required=True, default=[])
    candidates = []
    if raw_cands and len(raw_cands) > lim["max_candidates"]:
        p.add(("candidates",), _limit_why(len(raw_cands), "entries", "max_candidates", lim))
        p.raise_if_any()
    for i, c in enumerate(raw_cands or []):
        c = _renamed_ids(c, ("candidates", i), p)
        if isinstance(c, str):
            candidates.append(c)
        elif isinstance(c, dict):
            for k in ("name", "material", "finish"):
                if k in c and not isinstance(c[k], str):
                    p.add(("candidates", i, k), f"expected text, got {_describe(c[k])}")
            if "layers" in c and not isinstance(c["layers"], list):
                p.add(
                    ("candidates", i, "layers"),
                    f"expected a list of layers, got {_describe(c['layers'])}",
                )
            candidates.append(_freeze_candidate(c))
        else:
            p.add(
                ("candidates", i), f"expected a material id (text) or a table, got {_describe(c)}"
            )
    if not raw_cands and "candidates" in data:
        p.add(("candidates",), "choose at least one candidate")
    return candidates


def _read_criteria(data: Mapping, kind: StudyKind | None, p: _Problems) -> list[CriterionSpec]:
    """The ``[[criteria]]`` tables: a known results column, a direction and a weight >= 0."""
    criteria = []
    for i, c in enumerate(_get(data, "criteria", list, (), p, default=[]) or []):
        path = ("criteria", i)
        if not isinstance(c, dict):
            p.add(path, f"expected a table, got {_describe(c)}")
            continue
        _unknown_keys(c, ("quantity", "direction", "weight"), path, p)
        q = _get(c, "quantity", str, path, p, required=True)
        d = _get(c, "direction", str, path, p, default="minimise")
        w = _get(c, "weight", float, path, p, default=1.0)
        if d is not None and d not in ("minimise", "maximise"):
            p.add((*path, "direction"), f"unknown {d!r}; valid: minimise, maximise")
        if w is not None and not (math.isfinite(w) and w >= 0):
            p.add((*path, "weight"), f"must be a finite number >= 0, got {w!r}")
        if kind is not None and q is not None and q not in kind.column_kinds:
            p.add((*path, "quantity"), f"unknown {q!r}; valid: {', '.join(kind.column_kinds)}")
        if q is not None:
            criteria.append(CriterionSpec(q, d or "minimise", 1.0 if w is None else w))
    return criteria


def _read_constraints(data: Mapping, kind: StudyKind | None, p: _Problems) -> list[ConstraintSpec]:
    """The ``[[constraints]]`` tables: exactly one of max, min (text with a unit) or require."""
    constraints = []
    for i, c in enumerate(_get(data, "constraints", list, (), p, default=[]) or []):
        path = ("constraints", i)
        if not isinstance(c, dict):
            p.add(path, f"expected a table, got {_describe(c)}")
            continue
        _unknown_keys(c, ("quantity", "max", "min", "require"), path, p)
        q = _get(c, "quantity", str, path, p, required=True)
        bounds = [b for b in ("max", "min", "require") if b in c]
        if len(bounds) != 1:
            p.add(path, "give exactly one of max, min or require")
            continue
        b = bounds[0]
        if b == "require":
            if _get(c, "require", bool, path, p) is not True:
                p.add((*path, "require"), "only 'require = true' is meaningful")
            spec = ConstraintSpec(q or "", "require", "")
        else:
            spec = ConstraintSpec(q or "", b, _get(c, b, str, path, p, default="") or "")
        if kind is not None and q is not None:
            _check_constraint(kind, spec, path, p)
        constraints.append(spec)
    return constraints


def _read_decision(data: Mapping, p: _Problems) -> Decision | None:
    """The ``[decision]`` table (renamed material ids replaced, the date checked)."""
    decision = None
    d = _get(data, "decision", dict, (), p)
    if d is not None:
        keys = ("chosen", "rationale", "decided_by", "date", "attendees")
        _unknown_keys(d, keys, ("decision",), p)
        decision = Decision(*(_get(d, k, str, ("decision",), p, default="") or "" for k in keys))
        if decision.chosen:
            renamed = _renamed_ids(decision.chosen, ("decision", "chosen"), p)
            decision = replace(decision, chosen=renamed)
        if decision.date and not _is_iso_date(decision.date):
            p.add(("decision", "date"), f"expected a date YYYY-MM-DD, got {decision.date!r}")
    return decision


def _freeze_candidate(c: dict) -> dict:
    return {
        k: ([dict(x) if isinstance(x, dict) else x for x in v] if isinstance(v, list) else v)
        for k, v in c.items()
    }
