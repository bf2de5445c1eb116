"""Inputs of a scenario: text with units read into SI, checked against a kind's declaration.

Each input of a :class:`~workbench.studykind.StudyKind` is declared by an
:class:`~workbench.studykind.InputSpec`; :func:`_check_inputs` collects every
problem of a scenario's ``[inputs]`` table and :func:`_parse_input` reads one
value: quantities (``"25 mm"``), sums of money (``"5 EUR"``), lists of
thicknesses, heat budgets, and ambient profiles written inline or as a logger
file pinned by its SHA-256.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Mapping
from pathlib import Path
from typing import TYPE_CHECKING, Any

from workbench import units
from workbench._files import _resolve_path, file_sha256
from workbench._scenario_limits import DEFAULT_LIMITS, _limit_why
from workbench._scenario_problems import _describe, _did_you_mean, _Problems
from workbench._tomlwrite import _inline

if TYPE_CHECKING:
    from workbench.studykind import InputSpec, StudyKind


def _money(text: Any, field_name: str) -> float:
    """A sum of money: a number, or text ``"5 EUR"`` (the code is a label) [currency]."""
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        value = float(text)
    elif isinstance(text, str):
        m = re.match(r"^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*([A-Za-z€£]*)\s*$", text)
        if not m or (m.group(2) and m.group(2).upper() not in (*units.CURRENCIES, "€", "£")):
            raise ValueError(f'{field_name}: "{text}" is not a sum of money; expected e.g. "5 EUR"')
        value = float(m.group(1))
    else:
        raise ValueError(
            f'{field_name}: expected a sum of money such as "5 EUR", got {_describe(text)}'
        )
    if not math.isfinite(value):
        raise ValueError(f"{field_name}: must be finite")
    if value < 0:
        raise ValueError(f'{field_name}: "{text}" is negative; a sum of money must be >= 0')
    return value


def _quantity(
    value: Any, qkind: str, field_name: str, bounds: tuple[float | None, float | None] | None = None
) -> float:
    if qkind == "money":
        return _money(value, field_name)
    if qkind == "dimensionless" and isinstance(value, (int, float)) and not isinstance(value, bool):
        return units.parse(float(value), "dimensionless", field_name, bounds=bounds)
    if not isinstance(value, str):
        raise ValueError(f"{field_name}: expected text with a unit, got {_describe(value)}")
    if units.check_kind(qkind).is_cost:
        return units.parse_cost(value, qkind, field_name)[0]
    return units.parse(value, qkind, field_name, bounds=bounds)


def _si_text(value: float, unit: str) -> str:
    return f"{float(value)!r} {unit}".strip()


def _starter_value(spec: InputSpec) -> str:
    if spec.kind == "bool":
        return "true" if spec.default else "false"
    return _inline(spec.default if spec.default is not None else "")


def _check_inputs(
    kind: StudyKind,
    inputs: dict,
    p: _Problems,
    limits: Mapping[str, int] = DEFAULT_LIMITS,
    base_dir: Path | None = None,
) -> None:
    valid = [s.name for s in kind.inputs]
    for name in inputs:
        if name not in valid:
            p.add(
                ("inputs", name),
                f"unknown input for a {kind.name} study{_did_you_mean(name, valid)}; "
                f"valid: {', '.join(valid)}",
            )
    for spec in kind.inputs:
        if spec.name not in inputs:
            if spec.required:
                p.add(
                    ("inputs", spec.name),
                    f"missing required input ({spec.doc}; e.g. {_starter_value(spec)})",
                )
            continue
        try:
            _parse_input(spec, inputs[spec.name], limits, base_dir)
        except _ElementError as exc:
            p.add(("inputs", spec.name, *exc.path), str(exc))
        except (ValueError, TypeError) as exc:
            p.add(("inputs", spec.name), str(exc))


class _ElementError(ValueError):
    """A problem with one element of a list input (``path`` below the input's key)."""

    def __init__(self, path: tuple, message: str):
        super().__init__(message)
        self.path = path


def _element(path: tuple, fn: Callable[[], Any]) -> Any:
    try:
        return fn()
    except (ValueError, TypeError) as exc:
        raise _ElementError(path, str(exc)) from None


def _profile_file(value: dict, field_name: str, base_dir: Path | None):
    """A logger file named in a scenario: ``{ file = "route.csv", sha256 = "..." }``.

    The path resolves against the scenario's folder; a ``sha256`` that no longer
    matches the file's bytes is refused (the file changed since the scenario
    recorded it). Returns ``(times [s], temperatures [K])`` as lists.
    """
    from workbench.logger import load_ambient_profile

    extra = sorted(set(value) - {"file", "sha256"})
    if extra:
        raise ValueError(f"{field_name}: unknown key {extra[0]!r}; valid: file, sha256")
    name = value.get("file")
    if not isinstance(name, str) or not name.strip():
        raise ValueError(f'{field_name}.file: expected the logger file\'s name, e.g. "route.csv"')
    target = _resolve_path(name, base_dir)
    if not target.is_file():
        raise ValueError(f"{field_name}.file: no such logger file {str(target)!r}")
    recorded = value.get("sha256")
    if recorded is not None:
        if not isinstance(recorded, str):
            raise ValueError(f"{field_name}.sha256: expected text, got {_describe(recorded)}")
        actual = file_sha256(target)
        if recorded != actual:
            raise ValueError(
                f"{field_name}.sha256: {name} has changed since this scenario recorded it "
                f"(recorded {recorded[:12]}…, now {actual[:12]}…); check the file, then remove "
                "the sha256 line or save the scenario again to record the new one"
            )
    times, temps = load_ambient_profile(target)
    return [float(t) for t in times], [float(t) for t in temps]


def _parse_profile(value: Any, field_name: str, base_dir: Path | None):
    """One ambient profile: a list of [time, temperature] rows, or a logger file table."""
    if isinstance(value, dict):
        return _profile_file(value, field_name, base_dir)
    if (
        not isinstance(value, list)
        or len(value) < 1
        or not all(isinstance(v, list) and len(v) == 2 for v in value)
    ):
        raise ValueError(
            "expected a list of [time, temperature] pairs such as "
            '[["0 h", "25 °C"], ["12 h", "30 °C"]], or a logger file: { file = "route.csv" }'
        )
    times = [
        _element((i, 0), lambda v=v, i=i: _quantity(v[0], "time", f"{field_name}[{i}][0]"))
        for i, v in enumerate(value)
    ]
    temps = [
        _element((i, 1), lambda v=v, i=i: _quantity(v[1], "temperature", f"{field_name}[{i}][1]"))
        for i, v in enumerate(value)
    ]
    for i in range(1, len(times)):
        if not times[i] > times[i - 1]:
            raise _ElementError(
                (i, 0),
                f"{field_name}[{i}][0]: times must increase strictly from row to row "
                f"(row {i} is not after row {i - 1}); sort the rows and remove duplicates",
            )
    if times[0] != 0.0:
        raise _ElementError(
            (0, 0), f'{field_name}[0][0]: the profile must start at "0 h" (the packing time)'
        )
    return (times, temps)


def _parse_input(
    spec: InputSpec,
    value: Any,
    limits: Mapping[str, int] = DEFAULT_LIMITS,
    base_dir: Path | None = None,
):
    field_name = f"inputs.{spec.name}"
    if isinstance(value, list) and len(value) > limits["max_list_entries"]:
        raise ValueError(_limit_why(len(value), "entries", "max_list_entries", limits))
    if spec.kind == "bool":
        if not isinstance(value, bool):
            raise ValueError(f"expected true/false, got {_describe(value)}")
        return value
    if spec.kind in ("choice", "text"):
        if not isinstance(value, str):
            raise ValueError(f"expected text, got {_describe(value)}")
        if spec.kind == "choice" and value not in spec.choices:
            raise ValueError(f"unknown {value!r}; valid: {', '.join(spec.choices)}")
        return value
    if spec.kind == "thickness_list":
        if not isinstance(value, list) or not value:
            raise ValueError(
                f'expected a list of thicknesses such as ["10 mm", "20 mm"], got {_describe(value)}'
            )
        return [
            _element((i,), lambda v=v, i=i: _quantity(v, "thickness", f"{field_name}[{i}]"))
            for i, v in enumerate(value)
        ]
    if spec.kind == "profile":
        return _parse_profile(value, field_name, base_dir)
    if spec.kind == "profiles":
        if not isinstance(value, dict) or not value:
            raise ValueError(
                'expected named profiles such as { summer = { file = "summer.csv" }, '
                'winter = [["0 h", "-5 °C"], ["12 h", "0 °C"]] }'
            )
        if len(value) > limits["max_list_entries"]:
            raise ValueError(_limit_why(len(value), "entries", "max_list_entries", limits))
        out = {}
        for name, prof in value.items():
            try:
                out[name] = _parse_profile(prof, f"{field_name}.{name}", base_dir)
            except _ElementError as exc:
                raise _ElementError((name, *exc.path), str(exc)) from None
            except (ValueError, TypeError) as exc:
                raise _ElementError((name,), str(exc)) from None
        return out
    if spec.kind in ("money", "dimensionless"):
        return _quantity(value, spec.kind, field_name, spec.bounds)
    if not isinstance(value, str):
        raise ValueError(
            f"expected text with a unit (e.g. {_starter_value(spec)}), got {_describe(value)}"
        )
    if spec.kind == "budget":
        for kind_name, budget_kind in (
            ("heat_flux", "flux"),
            ("power", "power"),
            ("u_value", "u_value"),
        ):
            try:
                budget = units.parse(value, kind_name, field_name)
            except units.UnitError:
                continue
            if not budget > 0:
                raise ValueError(
                    f'"{value}": a heat budget must be > 0 {units.display_unit(kind_name)}'
                )
            return budget_kind, budget
        raise ValueError(
            f'"{value}" is not a heat budget; expected a heat flux such as "8 W/m²", '
            'a power such as "20 W" or a U-value such as "0.25 W/(m²·K)"'
        )
    if units.check_kind(spec.kind).is_cost:
        return units.parse_cost(value, spec.kind, field_name)[0]
    return units.parse(value, spec.kind, field_name, bounds=spec.bounds)
