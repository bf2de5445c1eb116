"""A small TOML writer: the subset scenario files use (the standard library only reads TOML).

Strings, integers, floats (``nan``/``inf`` included), booleans, inline tables,
arrays, tables and arrays of tables. :func:`dumps_toml` is the entry point.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping, Sequence
from typing import Any

__all__ = ["dumps_toml"]

_BARE_KEY = re.compile(r"^[A-Za-z0-9_-]+$")
_ESCAPES = {
    '"': '\\"',
    "\\": "\\\\",
    "\b": "\\b",
    "\t": "\\t",
    "\n": "\\n",
    "\f": "\\f",
    "\r": "\\r",
}


def _key(k: str) -> str:
    return k if _BARE_KEY.match(k) else _string(k)


def _escape_char(c: str, keep_newline: bool = False) -> str:
    if keep_newline and c == "\n":
        return c
    if c in _ESCAPES:
        return _ESCAPES[c]
    if ord(c) < 0x20 or ord(c) == 0x7F:
        return f"\\u{ord(c):04X}"
    return c


def _string(s: str) -> str:
    if "\n" in s and len(s) > 40:
        body = "".join(_escape_char(c, keep_newline=True) for c in s)
        return '"""\n' + body + '"""'
    return '"' + "".join(_escape_char(c) for c in s) + '"'


def _value(v: Any) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return _string(v)
    if isinstance(v, Mapping):
        inner = ", ".join(f"{_key(k)} = {_inline(x)}" for k, x in v.items())
        return "{ " + inner + " }" if inner else "{}"
    if isinstance(v, (list, tuple)):
        if any(isinstance(x, Mapping) for x in v) or len(v) > 4:
            return "[\n" + "".join(f"  {_inline(x)},\n" for x in v) + "]"
        return "[" + ", ".join(_inline(x) for x in v) + "]"
    raise TypeError(f"cannot write {type(v).__name__} to TOML: {v!r}")


def _inline(v: Any) -> str:
    """A value inside an inline table or array (no multi-line strings there)."""
    if isinstance(v, str):
        return '"' + "".join(_escape_char(c) for c in v) + '"'
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_inline(x) for x in v) + "]"
    return _value(v)


def _is_table_array(v: Any) -> bool:
    return isinstance(v, (list, tuple)) and len(v) > 0 and all(isinstance(x, Mapping) for x in v)


def _write_table(
    lines: list[str], prefix: tuple[str, ...], table: Mapping[str, Any], array: bool = False
) -> None:
    header = ".".join(_key(p) for p in prefix)
    scalars = {
        k: v
        for k, v in table.items()
        if not isinstance(v, Mapping) and not (_is_table_array(v) and prefix)
    }
    if prefix:
        lines.append("")
        lines.append(f"[[{header}]]" if array else f"[{header}]")
    for k, v in scalars.items():
        lines.append(f"{_key(k)} = {_value(v)}")
    for k, v in table.items():
        if k in scalars:
            continue
        if isinstance(v, Mapping):
            _write_table(lines, (*prefix, k), v)
        else:
            for item in v:
                _write_table(lines, (*prefix, k), item, array=True)


def dumps_toml(data: Mapping[str, Any], array_tables: Sequence[str] = ("criteria", "constraints")) -> str:
    """TOML text for nested dicts/lists of str, int, float and bool.

    Top-level lists of dicts are written as inline multi-line arrays (as
    ``candidates``); lists of dicts inside tables, and the top-level keys
    named in ``array_tables`` (a scenario's ``criteria`` and ``constraints``),
    as arrays of tables.

    Examples
    --------
    >>> print(dumps_toml({"a": 1, "t": {"x": "25 mm"}}))
    a = 1
    <BLANKLINE>
    [t]
    x = "25 mm"
    <BLANKLINE>
    """
    lines: list[str] = []
    top = {
        k: v
        for k, v in data.items()
        if not isinstance(v, Mapping) and not (_is_table_array(v) and k in array_tables)
    }
    for k, v in top.items():
        lines.append(f"{_key(k)} = {_value(v)}")
    for k, v in data.items():
        if k in top:
            continue
        if isinstance(v, Mapping):
            _write_table(lines, (k,), v)
        else:
            for item in v:
                _write_table(lines, (k,), item, array=True)
    return "\n".join(lines) + "\n"


_ARRAY_TABLES = ("criteria", "constraints")
