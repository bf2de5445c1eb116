"""Problems of a scenario file: the error, its collector, and typed reads of TOML keys.

:class:`ScenarioError` (re-exported by :mod:`workbench.scenario`) carries every
problem as ``file:line:column: key: why``; :class:`_Problems` collects them with
the position of each key; :func:`_get` reads a key of an expected type and
:func:`_unknown_keys` names unknown keys with a "did you mean".
"""

from __future__ import annotations

import re
from collections.abc import Mapping, Sequence
from typing import Any

from workbench._tomlpos import _dotted, _line_of, _positions

__all__ = ["ScenarioError"]


class ScenarioError(ValueError):
    """A scenario file or object that cannot be used; names the key and the line.

    Attributes
    ----------
    problems : list of str
        Every problem, each ``file:line:column: key: why`` (``file:-: key: why``
        when no line applies, e.g. a scenario built in Python).
    key : str or None
        Dotted key of the first problem, e.g. ``"inputs.t_inside"``.
    line : int or None
        Line of the first problem in the file (1-based).
    column : int or None
        Column of the first problem's key on that line (1-based).
    """

    def __init__(
        self,
        problems: Sequence[str],
        key: str | None = None,
        line: int | None = None,
        column: int | None = None,
    ):
        self.problems = list(problems)
        self.key = key
        self.line = line
        self.column = column
        if len(self.problems) == 1:
            super().__init__(self.problems[0])
        else:
            super().__init__(
                f"{len(self.problems)} problems in scenario:\n  " + "\n  ".join(self.problems)
            )


class _Problems:
    """Collects problems with their keys, lines and columns."""

    def __init__(self, text: str | None, origin: str):
        self.text = text
        self.origin = origin
        self.items: list[tuple[str, int | None, int | None, str]] = []
        self._pos: dict[tuple, tuple[int, int]] | None = None

    def locate(self, path: Sequence[str | int]) -> tuple[int | None, int | None]:
        if not self.text:
            return None, None
        if self._pos is None:
            self._pos = _positions(self.text)
        path = tuple(path)
        for n in range(len(path), 0, -1):
            if path[:n] in self._pos:
                return self._pos[path[:n]]
        line = _line_of(self.text, path)
        return (line, 1) if line is not None else (1, 1)  # a missing top-level key: the file

    def add(self, path: Sequence[str | int], why: str, line: int | None = None) -> None:
        if line is None:
            line, col = self.locate(path)
        else:
            col = 1
        key = _dotted(path)
        head, sep, rest = why.partition(": ")
        if sep and head and " " not in head and (key == head or key.endswith("." + head)):
            why = rest  # "inputs.area: inputs.area: ..." says the key once
        self.items.append((key, line, col, why))

    def raise_if_any(self) -> None:
        if not self.items:
            return
        msgs = [
            f"{self.origin}:{line}:{col}: {key}: {why}"
            if line is not None
            else f"{self.origin}:-: {key}: {why}"
            for key, line, col, why in self.items
        ]
        key, line, col, _ = self.items[0]
        raise ScenarioError(msgs, key=key, line=line, column=col)


def _type_name(t) -> str:
    names = {
        str: "text",
        bool: "true/false",
        int: "an integer",
        float: "a number",
        list: "a list",
        dict: "a table",
    }
    if isinstance(t, tuple):
        return " or ".join(names.get(x, x.__name__) for x in t)
    return names.get(t, t.__name__)


def _get(
    data: Mapping, key: str, types, path: tuple, p: _Problems, required: bool = False, default=None
):
    if key not in data:
        if required:
            n = len(p.text.splitlines()) if p.text else 0
            hint = f" (the file ends at line {n}; is it truncated?)" if p.text else ""
            p.add((*path, key), f"missing required key{hint}", line=n or None)
        return default
    v = data[key]
    if types is float and isinstance(v, int) and not isinstance(v, bool):
        return float(v)
    if not isinstance(v, types) or (isinstance(v, bool) and bool not in _as_tuple(types)):
        p.add((*path, key), f"expected {_type_name(types)}, got {_describe(v)}")
        return default
    return v


def _as_tuple(t) -> tuple:
    return t if isinstance(t, tuple) else (t,)


def _describe(v: Any) -> str:
    if isinstance(v, str):
        return f"text {v!r}"
    if isinstance(v, bool):
        return f"{str(v).lower()}"
    if isinstance(v, (int, float)):
        return f"the number {v!r}"
    if isinstance(v, dict):
        return "a table"
    if isinstance(v, list):
        return "a list"
    if v is None:
        return "nothing (the key is missing)"
    return f"{type(v).__name__} {v!s}"


def _did_you_mean(name: Any, valid: Sequence[str]) -> str:
    """``' (did you mean 'x'?)'`` for a close valid name, else ``''``."""
    import difflib

    if not isinstance(name, str):
        return ""
    close = difflib.get_close_matches(name, list(valid), n=1, cutoff=0.7)
    return f" (did you mean {close[0]!r}?)" if close else ""


def _unknown_key_why(name: Any, valid: Sequence[str]) -> str:
    return f"unknown key{_did_you_mean(name, valid)}; valid keys: {', '.join(valid)}"


def _unknown_keys(data: Mapping, valid: Sequence[str], path: tuple, p: _Problems) -> None:
    for k in data:
        if k not in valid:
            p.add((*path, k), _unknown_key_why(k, valid))


def _undotted(key: str) -> tuple:
    out: list = []
    for part in re.findall(r"[^.\[\]]+|\[\d+\]", key):
        out.append(int(part[1:-1]) if part.startswith("[") else part)
    return tuple(out)
