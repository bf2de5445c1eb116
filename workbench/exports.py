"""Take the result away: CSV for spreadsheets, JSON for machines.

CSV (:func:`frame_to_csv`, :func:`results_csv`, :func:`ranking_csv`) has the
unit of every quantity in its header, in the chosen display system. Against
formula injection it follows the OWASP "CSV Injection" guidance: every field
is quoted (:data:`csv.QUOTE_ALL`, so a carriage return or a line break inside a
name stays inside its cell), and a text cell whose first non-blank character
(also after leading quote characters) is one of :data:`FORMULA_PREFIXES`
(``=``, ``+``, ``-``, ``@``, ``|``, a tab, a carriage return, or the full-width
``＝ ＋ － ＠``), or that starts a ``DDE(`` call, is prefixed with a single
quote. Numbers stay numbers, so a real negative value is written as ``-5.2``,
not as text.

JSON (:func:`evaluation_to_json`) keeps every value in SI at full precision,
with a ``units`` map per table, the scenario hash and the tool version.
"""

from __future__ import annotations

import csv
import io
import json
import math
import os
from pathlib import Path
from typing import Any

import numpy as np
import pandas as pd

from workbench.report import Evaluation, _currency, display_frame
from workbench.scenario import _atomic_write, scenario_to_text

__all__ = [
    "FORMULA_PREFIXES",
    "neutralise_cell",
    "frame_to_csv",
    "results_csv",
    "ranking_csv",
    "evaluation_to_dict",
    "evaluation_to_json",
    "write_text",
    "text_table",
]

FORMULA_PREFIXES = ("=", "+", "-", "@", "|", "\t", "\r", "＝", "＋", "－", "＠")
"""First characters (after blanks and quote characters) that make a spreadsheet
treat a text cell as a formula (OWASP "CSV Injection")."""

# Blanks a spreadsheet skips before a formula; the tab and the carriage return are
# formula prefixes themselves and are not skipped.
_BLANKS = " \n\f\v\u00a0\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007\u2008\u2009\u200a\u202f\u205f\u3000\ufeff"
_QUOTES = "'\"`‘’“”"


def _formula_like(text: str) -> bool:
    """True when a spreadsheet could read ``text`` as a formula or a DDE call."""
    rest = text.lstrip(_BLANKS)
    while rest and rest[0] in _QUOTES:
        rest = rest[1:].lstrip(_BLANKS)
    return rest.startswith(FORMULA_PREFIXES) or rest[:4].upper() == "DDE("


def neutralise_cell(value: Any) -> Any:
    """A CSV cell safe to open in a spreadsheet.

    Text whose first non-blank character (after any leading quote
    characters) is one of :data:`FORMULA_PREFIXES`, or that starts a ``DDE(``
    call, gets a leading single quote; numbers (including negative ones) and
    other text are unchanged.

    Examples
    --------
    >>> neutralise_cell("=HYPERLINK(\\"http://x\\")")
    '\\'=HYPERLINK("http://x")'
    >>> neutralise_cell(-5.2), neutralise_cell("PIR 32"), neutralise_cell("-")
    (-5.2, 'PIR 32', "'-")
    >>> neutralise_cell("  =1+1"), neutralise_cell("＝1+1"), neutralise_cell("|cmd")
    ("'  =1+1", "'＝1+1", "'|cmd")
    >>> neutralise_cell("dde(\\"cmd\\")"), neutralise_cell("\\"=1"), neutralise_cell("\\r=1")
    ('\\'dde("cmd")', '\\'"=1', "'\\r=1")
    """
    if isinstance(value, str) and _formula_like(value):
        return "'" + value
    return value


def _cell(v: Any) -> Any:
    if isinstance(v, (bool, np.bool_)):
        return "yes" if v else "no"
    if isinstance(v, (int, np.integer)):
        return int(v)
    if isinstance(v, (float, np.floating)):
        f = float(v)
        return "" if math.isnan(f) else repr(f)
    if v is None or v is pd.NA:
        return ""
    return neutralise_cell(str(v))


def frame_to_csv(frame: pd.DataFrame, index: bool = True) -> str:
    """CSV text of a table, every text cell neutralised (see :func:`neutralise_cell`).

    Every field is quoted (:data:`csv.QUOTE_ALL`). Numbers are written with full
    precision (``repr``) and never prefixed; NaN as an empty cell.

    Examples
    --------
    >>> frame_to_csv(pd.DataFrame({"x": [-5.2]}, index=pd.Index(["\\r=1+1"], name="n")))
    '"n","x"\\n"\\'\\r=1+1","-5.2"\\n'
    """
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n", quoting=csv.QUOTE_ALL)
    cols = list(frame.columns)
    w.writerow([_cell(frame.index.name or "")] * index + [_cell(c) for c in cols])
    for idx, row in zip(frame.index, frame.itertuples(index=False), strict=True):
        w.writerow([_cell(idx)] * index + [_cell(v) for v in row])
    return buf.getvalue()


def results_csv(ev: Evaluation, system: str | None = None) -> str:
    """The results table as CSV, units in the headers (``system``: default the scenario's)."""
    shown = display_frame(ev.results, ev.kind, system or ev.system, text=False)
    return frame_to_csv(shown)


def ranking_csv(ev: Evaluation, system: str | None = None) -> str:
    """The ranking table as CSV (best first), units in the headers."""
    rk = ev.ranking.sort_values(["rank"], na_position="last")
    shown = display_frame(rk, ev.kind, system or ev.system, results=ev.results, text=False)
    return frame_to_csv(shown)


def _json_value(v: Any) -> Any:
    if isinstance(v, (bool, np.bool_)):
        return bool(v)
    if isinstance(v, (int, np.integer)):
        return int(v)
    if isinstance(v, (float, np.floating)):
        f = float(v)
        return None if not math.isfinite(f) else f
    if v is None or v is pd.NA:
        return None
    if isinstance(v, (tuple, list)):
        return [_json_value(x) for x in v]
    return str(v)


def _records(frame: pd.DataFrame, index_name: str = "candidate") -> list[dict[str, Any]]:
    out = []
    for idx, row in frame.iterrows():
        rec = {index_name: _json_value(idx)}
        rec.update({str(k): _json_value(v) for k, v in row.items()})
        out.append(rec)
    return out


def _units_map(frame: pd.DataFrame, kind_columns, results: pd.DataFrame) -> dict[str, str]:
    from workbench import units

    out = {}
    attrs = frame.attrs.get("units", {})
    for col in frame.columns:
        qkind = kind_columns.get(col)
        if qkind is not None and units.check_kind(qkind).is_cost:
            out[col] = units.display_unit(qkind, "SI", currency=_currency(results))
        elif col in attrs:
            out[col] = attrs[col]
        elif qkind is not None:
            out[col] = units.check_kind(qkind).si_unit
    return out


def evaluation_to_dict(ev: Evaluation) -> dict[str, Any]:
    """Plain data for JSON: SI values, a units map per table, provenance."""
    s = ev.scenario
    return {
        "format": "heatpath-results",
        "version": 1,
        "tool_version": ev.tool_version,
        "scenario_hash": ev.scenario_hash,
        "kind": ev.kind.name,
        "title": s.title,
        "units_note": "all values in SI; 'units' maps each column to its SI unit",
        "results": {
            "units": _units_map(ev.results, ev.kind.column_kinds, ev.results),
            "rows": _records(ev.results),
        },
        "ranking": {
            "units": _units_map(ev.ranking, ev.kind.column_kinds, ev.results),
            "criteria": [
                {"quantity": c.quantity, "direction": c.direction, "weight": c.weight}
                for c in ev.criteria
            ],
            "constraints": [
                {"quantity": c.quantity, "bound": c.bound, "limit": c.limit} for c in s.constraints
            ],
            "rows": _records(ev.ranking.sort_values(["rank"], na_position="last")),
        },
        "decision": None
        if s.decision is None
        else {
            "chosen": s.decision.chosen,
            "rationale": s.decision.rationale,
            "decided_by": s.decision.decided_by,
            "date": s.decision.date,
        },
        "assumptions": list(ev.assumptions),
        "cautions": list(ev.cautions),
        "warnings": list(ev.warnings),
        "sources": _records(ev.sources.set_index("key"), "key") if len(ev.sources) else [],
        "scenario": scenario_to_text(s, header=False),
    }


def evaluation_to_json(ev: Evaluation, indent: int = 2) -> str:
    """JSON text of :func:`evaluation_to_dict` (NaN and infinity become null)."""
    return (
        json.dumps(evaluation_to_dict(ev), indent=indent, ensure_ascii=False, allow_nan=False)
        + "\n"
    )


def write_text(text: str, path: str | os.PathLike, overwrite: bool = False) -> Path:
    """Write an export atomically; an existing file needs ``overwrite=True``."""
    path = Path(path)
    _atomic_write(path, text, overwrite=overwrite, backup=False)
    return path


def _text_cell(value: Any, fmt: str) -> str:
    if value is None or (isinstance(value, float | np.floating) and math.isnan(value)):
        return "NaN"
    if isinstance(value, bool | np.bool_):
        return "True" if value else "False"
    if isinstance(value, int | np.integer):
        return str(int(value))
    if isinstance(value, float | np.floating):
        return format(float(value), fmt)
    return str(value)


def text_table(frame: pd.DataFrame | pd.Series, fmt: str = ".3f", *, index: bool = True,
               formats: dict[str, str] | None = None) -> str:
    """A fixed-width text table whose layout is ours, not a library's default.

    Numbers are right-aligned and formatted with ``fmt`` (a format spec such as
    ``".2f"``), or per column with ``formats``; text is left-aligned; columns are
    separated by two spaces; NaN is written ``NaN``. The same table prints the same
    on every pandas version, so a notebook can compare it.

    >>> df = pd.DataFrame({"k [W/(m·K)]": [0.035, 0.0221], "ok": [True, False]},
    ...                   index=pd.Index(["eps", "pir"], name="candidate"))
    >>> print(text_table(df, ".3f"))
    candidate  k [W/(m·K)]     ok
    eps              0.035   True
    pir              0.022  False
    """
    if isinstance(frame, pd.Series):
        frame = frame.to_frame()
    formats = dict(formats or {})
    columns = [str(c) for c in frame.columns]
    cells = [[_text_cell(v, formats.get(str(c), fmt)) for v in frame[c].tolist()]
             for c in frame.columns]
    numeric = [pd.api.types.is_numeric_dtype(frame[c]) or pd.api.types.is_bool_dtype(frame[c])
               for c in frame.columns]
    if index:
        name = frame.index.name if frame.index.name is not None else ""
        columns.insert(0, str(name))
        cells.insert(0, [_text_cell(v, fmt) for v in frame.index.tolist()])
        numeric.insert(0, False)
    widths = [max([len(h)] + [len(s) for s in col]) for h, col in zip(columns, cells, strict=True)]

    def line(parts: list[str]) -> str:
        out = [s.rjust(w) if num else s.ljust(w)
               for s, w, num in zip(parts, widths, numeric, strict=True)]
        return "  ".join(out).rstrip()

    rows = [line(columns)]
    rows += [line([col[i] for col in cells]) for i in range(len(frame))]
    return "\n".join(rows)
