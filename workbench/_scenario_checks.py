"""Checks of a scenario against its kind: currencies, limits on results, and error keys.

Costs are never converted: :func:`_check_money` requires every money input and
cost limit in the one currency of the costs the study adds up.
:func:`constraint_limit` reads a ``[[constraints]]`` limit in SI, and
:func:`_path_for_message` finds the scenario key a study's own error concerns.
"""

from __future__ import annotations

import re
from collections.abc import Mapping
from typing import TYPE_CHECKING, Any

from workbench import units
from workbench._scenario_inputs import _money
from workbench._scenario_problems import _Problems

if TYPE_CHECKING:
    from workbench._scenario_objects import ConstraintSpec, Scenario
    from workbench.studykind import StudyKind

__all__ = ["constraint_limit"]


_CODE = re.compile(
    r"(?<![A-Za-z])(" + "|".join(units.CURRENCIES) + r")(?![A-Za-z])|([€£$])", re.IGNORECASE
)


def _codes_in(value: Any) -> set[str]:
    """Currency codes written in a money or cost input (``€``/``£`` read as EUR/GBP)."""
    if not isinstance(value, str):
        return set()
    out = set()
    for m in _CODE.finditer(value):
        out.add(
            m.group(1).upper() if m.group(1) else {"€": "EUR", "£": "GBP", "$": "$"}[m.group(2)]
        )
    return out


def _candidate_ids(c: Any) -> list[str]:
    if isinstance(c, str):
        return [c]
    if not isinstance(c, Mapping):
        return []
    ids = [c["material"]] if isinstance(c.get("material"), str) else []
    for lay in c.get("layers") or []:
        if isinstance(lay, Mapping) and isinstance(lay.get("material"), str):
            ids.append(lay["material"])
    return ids


def _scenario_currency(s: Scenario, kind: StudyKind, materials, p: _Problems) -> str | None:
    """The one currency of the costs a study adds up, or None when no cost is known.

    The candidates' materials with a cost, and (shipper) the coolant, must all be
    in one currency; several raise a problem (costs are never converted).
    """
    import numpy as np

    found: dict[str, list[str]] = {}
    if "currency" in getattr(materials, "columns", ()):
        for c in s.candidates:
            for mid in _candidate_ids(c):
                if mid not in materials.index:
                    continue
                row = materials.loc[mid]
                cost = row.get("cost_per_volume", np.nan)
                code = row.get("currency")
                if isinstance(code, str) and code.strip() and np.isfinite(float(cost)):
                    found.setdefault(code.strip(), []).append(f"material {mid!r}")
    if kind.cost_sources is not None:
        for code, what in kind.cost_sources(s):
            found.setdefault(code, []).append(what)
    if len(found) > 1:
        detail = "; ".join(f"{code}: {', '.join(sorted(set(w)))}" for code, w in found.items())
        p.add(
            ("candidates",),
            f"the costs this study adds up are in several currencies ({detail}); costs are "
            "never converted between currencies: give every cost in one currency",
        )
        return None
    return next(iter(found), None)


def _check_money(s: Scenario, kind: StudyKind, materials, p: _Problems) -> None:
    """Every money input and cost limit must be in the scenario's currency (no conversion)."""
    code = _scenario_currency(s, kind, materials, p)
    money: list[tuple[tuple, Any]] = []
    for spec in kind.inputs:
        if spec.name in s.inputs and (
            spec.kind == "money"
            or (spec.kind in units.KINDS and units.check_kind(spec.kind).is_cost)
        ):
            money.append((("inputs", spec.name), s.inputs[spec.name]))
    for i, c in enumerate(s.constraints):
        if c.bound in ("max", "min") and c.quantity in kind.column_kinds:
            qk = kind.column_kinds[c.quantity]
            if qk is None or units.check_kind(qk).is_cost:
                money.append((("constraints", i, c.bound), c.limit))
    for path, value in money:
        codes = _codes_in(value)
        if "$" in codes:
            p.add(path, f'"{value}": "$" is ambiguous; write a currency code such as USD')
            continue
        if len(codes) > 1:
            p.add(path, f'"{value}" mixes currencies {sorted(codes)}; costs are not converted')
            continue
        if code is not None and codes and codes != {code}:
            p.add(
                path,
                f'"{value}" is in {codes.pop()}, but this scenario\'s costs ({kind.costs_from})'
                f" are in {code}; costs are "
                f"never converted between currencies: give this amount in {code}",
            )


def _check_constraint(kind: StudyKind, spec: ConstraintSpec, path: tuple, p: _Problems) -> None:
    if spec.bound == "require":
        if spec.quantity not in kind.flag_columns:
            p.add(
                (*path, "quantity"),
                f"unknown yes/no quantity {spec.quantity!r}; valid: {', '.join(kind.flag_columns)}",
            )
        return
    if spec.quantity not in kind.column_kinds:
        p.add(
            (*path, "quantity"), f"unknown {spec.quantity!r}; valid: {', '.join(kind.column_kinds)}"
        )
        return
    try:
        constraint_limit(kind, spec)
    except ValueError as exc:
        p.add((*path, spec.bound), str(exc))


def constraint_limit(kind: StudyKind, spec: ConstraintSpec) -> float:
    """The limit of a max/min constraint in SI [SI unit of the column's kind]."""
    qkind = kind.column_kinds[spec.quantity]
    name = f"constraints.{spec.quantity}.{spec.bound}"
    if qkind is None:
        return _money(spec.limit, name)
    if units.check_kind(qkind).is_cost:
        return units.parse_cost(spec.limit, qkind, name)[0]
    return units.parse(spec.limit, qkind, name)


def _is_iso_date(text: str) -> bool:
    import datetime

    if not re.fullmatch(r"\d{4}-\d{2}-\d{2}", text):
        return False
    try:
        datetime.date.fromisoformat(text)
    except ValueError:
        return False
    return True


def _path_for_message(s: Scenario, kind: StudyKind, message: str) -> tuple:
    """The scenario key a study's ``ValueError`` concerns (its message starts with the name)."""
    inputs = [spec.name for spec in kind.inputs]
    head = message.split(":", 1)[0] if ":" in message else message
    quoted = re.findall(r"'([^']*)'", head)

    def candidate_path() -> tuple:
        names = [kind.name_of(c) for c in s.candidates]
        for q in quoted:
            for i, c in enumerate(s.candidates):
                if q == names[i] or q in _candidate_ids(c):
                    return ("candidates", i)
        return ("candidates",)

    for part in re.split(r",\s*", head):
        word = part.strip()
        key = re.sub(r"\s+", "_", word.split(" (")[0])
        first = key.split("_times")[0].split("_temperatures")[0]
        if word.startswith(kind.candidate_words):
            return candidate_path()
        for prefix, target in kind.message_inputs.items():
            if word.startswith(prefix) and target in inputs:
                return ("inputs", target)
        for name in (key, first, word.split(" ")[0]):
            if name in inputs:
                alternatives = kind.input_alternatives.get(name)
                if alternatives is not None and name not in s.inputs:
                    given = [a for a in alternatives if a in s.inputs]
                    return ("inputs", given[0]) if given else ("inputs",)
                return ("inputs", name)
    for name in inputs:
        if re.search(rf"(?<![A-Za-z_]){re.escape(name)}(?![A-Za-z_])", message):
            return ("inputs", name)
    return ("inputs",)
