"""Scenario files: everything needed to reproduce a study, in a readable TOML file.

A *scenario* is what a review meeting decides on: the job kind, its inputs
written as text with units (``"25 mm"``, ``"4 °C"``), the candidates, the
user's materials, the criteria with their weights, the hard limits, the
display system, notes and the decision taken. :func:`save_scenario` writes it,
:func:`load_scenario` reads it back (the two round-trip exactly),
:func:`study_from_scenario` builds the study object and
:func:`scenario_from_study` goes the other way.

File format, version 1
----------------------
UTF-8 TOML (read with the standard library's :mod:`tomllib`)::

    format = "heatpath-scenario"      # fixed marker
    version = 1                       # format version (see migrations below)
    kind = "wall"                     # job kind: one of STUDY_KINDS
    title = "Cold-room wall (demo)"
    display_system = "SI"             # "SI" or "US"
    notes = "free text"
    candidates = [                    # material ids, or build-ups (kind-specific keys)
      "pir_32",
      { name = "steel/PIR/steel", layers = [{ material = "carbon_steel", thickness = "0.6 mm" },
                                            { material = "pir_32" }] },
    ]

    [inputs]                          # kind-specific; every quantity as text with a unit
    t_inside = "4 °C"
    budget = "8 W/m²"

    [materials]                       # optional: the user's own materials
    path = "my_materials.csv"         # relative to the scenario file
    sha256 = "..."                    # of the file's bytes; checked on load
    sources_sha256 = "..."            # of NAME.sources.csv, when it exists
    kt_sha256 = "..."                 # of NAME.kt.csv, when it exists

    [[materials.rows]]                # ... or rows inline, same columns as tables/materials.csv;
    id = "demo_foam"                  # numbers in the table's units, or text with a unit
    conductivity = "0.030 W/(m·K)"

    [[materials.sources]]             # source keys the inline rows cite
    key = "demo-sheet"
    citation = "..."

    [[criteria]]                      # ranking criteria (results columns), all optional
    quantity = "cost_per_area"
    direction = "minimise"            # or "maximise"
    weight = 2.0

    [[constraints]]                   # hard limits on results columns
    quantity = "total_thickness"
    max = "150 mm"                    # or min = "..." ; or require = true for a yes/no column

    [decision]
    chosen = "pir_32"                 # a candidate name
    rationale = "..."
    decided_by = "..."
    attendees = "..."                 # optional: who was in the room
    date = "2026-12-01"               # YYYY-MM-DD

    [limits]                          # optional: raise the work limits deliberately
    max_list_entries = 1000           # entries of a list input (thicknesses, ambient_profile)
    max_candidates = 200              # entries of candidates
    max_sweep_cells = 100000000       # candidates × thicknesses × time steps

Errors (syntax, a wrong type, an unknown key, with a "did you mean" where one
is close, an unknown id, a unit of the wrong dimension, a value outside its
physical domain, a money input in another currency than the scenario's costs,
work beyond the limits, a file from a newer format version, a changed
materials file, and anything the study's own constructor refuses) raise
:class:`ScenarioError` as ``file:line:column: key: why``. :func:`check_scenario`
(``heatpath scenario check``) builds the study exactly as
:func:`study_from_scenario` (``heatpath rank`` and ``report``) does, so it
refuses the same files with the same messages.

Currencies: costs are never converted. The candidates' materials (and a
shipper's coolant) fix the scenario's currency; every money input
(``rate_per_kg``, ``fixed_fee``) and every cost limit must be written in it, or
as a bare number, which takes it.

Work limits (:data:`DEFAULT_LIMITS`) are checked before anything is computed;
the error names the key, the count and how to coarsen, and a ``[limits]``
table raises a limit deliberately.

Version 0 (the layout before the ``format`` marker) had ``job`` instead of
``kind``, ``units`` instead of ``display_system``, ``candidates`` as a list of
material ids only, a ``[weights]`` table ``quantity = weight`` (all minimised)
and ``materials_file = "path"`` without a hash. :func:`migrate` upgrades it;
the hash of the materials file is taken at migration time and a note says so.

Writes are atomic (a temporary file in the same folder, then
:func:`os.replace`) and never overwrite silently: an existing file raises
:class:`FileExistsError` unless ``overwrite=True``, which keeps the old file
as ``NAME.toml.bak``.

Study kinds plug in through :class:`StudyKind` (see :data:`STUDY_KINDS` and
:func:`register_study_kind`): input specifications, how to build the study,
how to read the inputs back from a study, and the columns its results carry.
"""

from __future__ import annotations

import csv
import hashlib
import math
import os
import re
import tempfile
import tomllib
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field, replace
from pathlib import Path
from types import MappingProxyType
from typing import Any

from workbench import units

__all__ = [
    "FORMAT",
    "FORMAT_VERSION",
    "ScenarioError",
    "MaterialsSource",
    "CriterionSpec",
    "ConstraintSpec",
    "Decision",
    "Scenario",
    "InputSpec",
    "StudyKind",
    "STUDY_KINDS",
    "register_study_kind",
    "study_kind",
    "scenario_to_text",
    "scenario_from_text",
    "scenario_hash",
    "save_scenario",
    "load_scenario",
    "migrate",
    "parse_inputs",
    "materials_for",
    "study_from_scenario",
    "scenario_from_study",
    "snapshot",
    "open_scenario",
    "starter_text",
    "state_dir",
    "autosave",
    "recover_last",
    "file_sha256",
    "check_output_path",
    "check_scenario",
    "located_error",
    "DEFAULT_LIMITS",
]

FORMAT = "heatpath-scenario"
"""Value of the ``format`` key that marks a scenario file."""

FORMAT_VERSION = 1
"""Current format version; older versions load through :func:`migrate`."""

_TOP_KEYS = (
    "format",
    "version",
    "kind",
    "title",
    "display_system",
    "notes",
    "candidates",
    "inputs",
    "materials",
    "criteria",
    "constraints",
    "decision",
    "limits",
)

DEFAULT_LIMITS: Mapping[str, int] = MappingProxyType(
    {
        "max_list_entries": 1000,
        "max_candidates": 200,
        "max_sweep_cells": 10**8,
    }
)
"""Work limits checked before anything is computed (override in a ``[limits]`` table).

``max_list_entries``: entries of any list input (``thicknesses``, ``ambient_profile``);
``max_candidates``: entries of ``candidates``; ``max_sweep_cells``: the cells a study
evaluates, candidates × swept thicknesses × simulated time steps (shipper:
``ceil(duration / time_step)`` steps; wall and housing: one cell per candidate).
"""


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


# ---------------------------------------------------------------------------
# The scenario objects
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class MaterialsSource:
    """The user's materials: a CSV file pinned by its hash, or rows inline.

    ``path`` is kept as written (relative paths resolve against the scenario
    file's folder). ``rows`` and ``sources`` are tuples of dicts with the
    columns of ``tables/materials.csv`` and ``tables/sources.csv``.
    """

    path: str | None = None
    sha256: str | None = None
    sources_sha256: str | None = None
    kt_sha256: str | None = None
    rows: tuple[Mapping[str, Any], ...] = ()
    sources: tuple[Mapping[str, Any], ...] = ()


@dataclass(frozen=True)
class CriterionSpec:
    """One ranking criterion: a results column, a direction and a weight [-]."""

    quantity: str
    direction: str = "minimise"
    weight: float = 1.0


@dataclass(frozen=True)
class ConstraintSpec:
    """A hard limit on a results column.

    ``bound`` is ``"max"`` (value must not exceed ``limit``), ``"min"`` (must
    reach it) or ``"require"`` (a yes/no column must be true; ``limit`` unused).
    ``limit`` is text with a unit, e.g. ``"150 mm"``.
    """

    quantity: str
    bound: str = "max"
    limit: str = ""


@dataclass(frozen=True)
class Decision:
    """What the meeting chose and why."""

    chosen: str = ""
    rationale: str = ""
    decided_by: str = ""
    date: str = ""
    attendees: str = ""


@dataclass(frozen=True)
class Scenario:
    """Everything needed to reproduce one study. See the module docstring for the file.

    ``candidates`` holds material ids (str) or kind-specific dicts (a wall
    build-up: ``{"name": ..., "layers": [{"material": ..., "thickness": "0.6 mm"}, ...]}``).
    ``inputs`` maps input names to text with units (booleans and plain
    choices as TOML values). ``base_dir`` (not compared) is the folder that
    relative paths resolve against. ``limits`` overrides :data:`DEFAULT_LIMITS`.
    ``origin`` and ``source_text`` (not compared) are the file name and text it
    was read from, so that later errors (building the study, computing) name
    the file, line and column of the key concerned.
    """

    kind: str
    inputs: Mapping[str, Any] = field(default_factory=dict)
    candidates: tuple[Any, ...] = ()
    materials: MaterialsSource | None = None
    criteria: tuple[CriterionSpec, ...] = ()
    constraints: tuple[ConstraintSpec, ...] = ()
    display_system: str = "SI"
    title: str = ""
    notes: str = ""
    decision: Decision | None = None
    base_dir: Path | None = field(default=None, compare=False, repr=False)
    limits: Mapping[str, int] = field(default_factory=dict)
    origin: str | None = field(default=None, compare=False, repr=False)
    source_text: str | None = field(default=None, compare=False, repr=False)

    def with_decision(
        self, chosen: str, rationale: str = "", decided_by: str = "", date: str = "",
        attendees: str = "",
    ) -> Scenario:
        """A copy with the decision set."""
        return replace(self, decision=Decision(chosen, rationale, decided_by, date, attendees))


# ---------------------------------------------------------------------------
# Study kinds
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class InputSpec:
    """One input of a study kind.

    ``kind`` is a quantity kind of :data:`workbench.units.KINDS`, or
    ``"bool"``, ``"choice"`` (one of ``choices``), ``"text"``, or
    ``"budget"`` (a heat flux, power or U-value). ``default`` is the
    starter-file value (``None``: optional and omitted). ``bounds`` are
    inclusive SI bounds on top of the quantity kind's own domain (e.g. ``(0, 1)``
    for a fraction).
    """

    name: str
    kind: str
    default: Any
    doc: str
    required: bool = True
    choices: tuple[str, ...] = ()
    bounds: tuple[float | None, float | None] | None = None


@dataclass(frozen=True)
class StudyKind:
    """How one job kind plugs into scenarios, reports and the command line.

    Attributes
    ----------
    name, title : str
        Identifier (``"wall"``) and readable title.
    job : str
        The job paragraph shown at the top of a report.
    inputs : tuple of InputSpec
        Inputs, in starter-file order.
    column_kinds : Mapping[str, str]
        Numeric results columns -> quantity kind (for display units and for
        parsing constraint limits).
    flag_columns : tuple of str
        Yes/no results columns usable with ``require = true``.
    build : callable
        ``build(scenario, inputs_si, materials, curves) -> study``.
    read_back : callable
        ``read_back(study) -> (inputs dict of text, candidates tuple)``.
    default_criteria : tuple of CriterionSpec
        Used when a scenario names none.
    formula_sources : tuple of str
        Source keys (``tables/sources.csv``) of the methods the study uses.
    property_sources : tuple of str
        Materials-frame source columns of the properties the study uses.
    cautions : tuple of str
        Job-specific cautions (besides the general ones in every report).
    starter_candidates : tuple
        Candidates written into a starter file.
    check_candidates : callable
        ``check(candidates, materials) -> [(index, key, why), ...]``.
    charts : callable or None
        ``charts(evaluation) -> [plotly figures]`` for job-specific charts.
    results : callable or None
        ``results(study) -> (frame, raw)``: the per-candidate DataFrame (units,
        assumptions and cautions in ``attrs``) and the study's own result
        object; default ``study.results()`` for both.
    magnitude_columns : tuple of str
        Signed columns (a heat flux whose sign says its direction) that
        criteria and limits take by magnitude.
    """

    name: str
    title: str
    job: str
    inputs: tuple[InputSpec, ...]
    column_kinds: Mapping[str, str]
    flag_columns: tuple[str, ...]
    build: Callable[..., Any]
    read_back: Callable[[Any], tuple[dict, tuple]]
    default_criteria: tuple[CriterionSpec, ...]
    formula_sources: tuple[str, ...]
    property_sources: tuple[str, ...]
    cautions: tuple[str, ...]
    starter_candidates: tuple[Any, ...]
    check_candidates: Callable[[Sequence[Any], Any], list[tuple[int, str, str]]]
    study_type: type | None = None
    charts: Callable[[Any], list] | None = None
    magnitude_columns: tuple[str, ...] = ()
    results: Callable[[Any], tuple[Any, Any]] | None = None
    candidate_name: Callable[[Any], str] | None = None

    def name_of(self, candidate: Any) -> str:
        """The name a candidate entry gets in the study (and in ``decision.chosen``)."""
        if self.candidate_name is not None:
            try:
                return self.candidate_name(candidate)
            except (ValueError, KeyError, TypeError, AttributeError):
                pass
        return _candidate_name(candidate)

    def compute(self, study) -> tuple[Any, Any]:
        """``(per-candidate DataFrame, raw results)`` of a study."""
        if self.results is not None:
            return self.results(study)
        frame = study.results()
        return frame, frame

    def input_spec(self, name: str) -> InputSpec:
        for spec in self.inputs:
            if spec.name == name:
                return spec
        raise ValueError(
            f"inputs: unknown {name!r} for a {self.name} study; valid: {[s.name for s in self.inputs]}"
        )


_STUDY_KINDS: dict[str, StudyKind | Callable[[], StudyKind]] = {}
STUDY_KINDS: Mapping[str, StudyKind | Callable[[], StudyKind]] = MappingProxyType(_STUDY_KINDS)
"""Registered job kinds (``name -> StudyKind`` or a factory building it on first use)."""


def register_study_kind(name: str, kind: StudyKind | Callable[[], StudyKind]) -> None:
    """Register a job kind (or a zero-argument factory that imports its study lazily)."""
    _STUDY_KINDS[name] = kind


def study_kind(name: str) -> StudyKind:
    """The :class:`StudyKind` called ``name``; unknown names raise listing the valid ones.

    Examples
    --------
    >>> study_kind("wall").title
    'Wall comparison'
    >>> study_kind("walls")
    Traceback (most recent call last):
    ...
    ValueError: kind: unknown 'walls'; valid kinds: ...
    """
    entry = _STUDY_KINDS.get(name) if isinstance(name, str) else None
    if entry is None:
        raise ValueError(f"kind: unknown {name!r}; valid kinds: {available_kinds()}")
    if not isinstance(entry, StudyKind):
        entry = entry()
        _STUDY_KINDS[name] = entry
    return entry


def available_kinds() -> list[str]:
    """Names of the job kinds whose study module is importable."""
    out = []
    for name in list(_STUDY_KINDS):
        try:
            study_kind(name)
        except ImportError:
            continue
        out.append(name)
    return out


# ---------------------------------------------------------------------------
# A small TOML writer (the subset scenarios use)
# ---------------------------------------------------------------------------
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


def dumps_toml(data: Mapping[str, Any]) -> str:
    """TOML text for nested dicts/lists of str, int, float and bool.

    Top-level lists of dicts are written as inline multi-line arrays (as
    ``candidates``); lists of dicts inside tables, and the top-level keys
    ``criteria`` and ``constraints``, as arrays of tables.

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
        if not isinstance(v, Mapping) and not (_is_table_array(v) and k in _ARRAY_TABLES)
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


# ---------------------------------------------------------------------------
# Scenario <-> TOML data
# ---------------------------------------------------------------------------
def _clean_mapping(m: Mapping[str, Any]) -> dict[str, Any]:
    return {k: (list(v) if isinstance(v, tuple) else v) for k, v in m.items() if v is not None}


def _candidate_data(c: Any) -> Any:
    if isinstance(c, Mapping):
        out = {}
        for k, v in c.items():
            if isinstance(v, (list, tuple)):
                out[k] = [dict(x) if isinstance(x, Mapping) else x for x in v]
            elif v is not None:
                out[k] = v
        return out
    return c


def _scenario_data(s: Scenario) -> dict[str, Any]:
    data: dict[str, Any] = {
        "format": FORMAT,
        "version": FORMAT_VERSION,
        "kind": s.kind,
        "title": s.title,
        "display_system": s.display_system,
        "notes": s.notes,
        "candidates": [_candidate_data(c) for c in s.candidates],
        "inputs": _clean_mapping(s.inputs),
    }
    if s.materials is not None:
        m = s.materials
        mat: dict[str, Any] = {}
        for name in ("path", "sha256", "sources_sha256", "kt_sha256"):
            if getattr(m, name) is not None:
                mat[name] = getattr(m, name)
        if m.rows:
            mat["rows"] = [_clean_mapping(r) for r in m.rows]
        if m.sources:
            mat["sources"] = [_clean_mapping(r) for r in m.sources]
        data["materials"] = mat
    if s.criteria:
        data["criteria"] = [
            {"quantity": c.quantity, "direction": c.direction, "weight": float(c.weight)}
            for c in s.criteria
        ]
    if s.constraints:
        cons = []
        for c in s.constraints:
            if c.bound == "require":
                cons.append({"quantity": c.quantity, "require": True})
            else:
                cons.append({"quantity": c.quantity, c.bound: c.limit})
        data["constraints"] = cons
    if s.limits:
        data["limits"] = {k: int(v) for k, v in s.limits.items()}
    if s.decision is not None:
        data["decision"] = {
            "chosen": s.decision.chosen,
            "rationale": s.decision.rationale,
            "decided_by": s.decision.decided_by,
            "date": s.decision.date,
        }
        if s.decision.attendees:  # written only when set: older files keep their hash
            data["decision"]["attendees"] = s.decision.attendees
    return data


_HEADER_COMMENT = (
    "# heatpath scenario file (format version {v}); format described in workbench/scenario.py.\n"
    "# Reproduce with: heatpath report THIS_FILE -o report.html\n"
)


def scenario_to_text(scenario: Scenario, header: bool = True) -> str:
    """The TOML text of a scenario (with a short comment header unless ``header=False``).

    Examples
    --------
    >>> s = scenario_from_text(starter_text("wall"))
    >>> s2 = replace(s, notes='two lines,' + chr(10) + 'with "quotes" and a backslash ' + chr(92))
    >>> scenario_from_text(scenario_to_text(s2)) == s2
    True
    """
    _check_scenario_object(scenario)
    body = dumps_toml(_scenario_data(scenario))
    return (_HEADER_COMMENT.format(v=FORMAT_VERSION) + body) if header else body


def scenario_hash(scenario: Scenario) -> str:
    """SHA-256 (hex) of the scenario's canonical text: equal scenarios, equal hashes."""
    return hashlib.sha256(scenario_to_text(scenario, header=False).encode("utf-8")).hexdigest()


def file_sha256(path: str | os.PathLike) -> str:
    """SHA-256 (hex) of a file's bytes."""
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 16), b""):
            h.update(chunk)
    return h.hexdigest()


# ---------------------------------------------------------------------------
# Locating keys in the text (for error messages)
# ---------------------------------------------------------------------------
_HEADER_LINE = re.compile(r"^\s*(\[\[?)\s*([^\[\]]+?)\s*\]\]?\s*(#.*)?$")
_KEY_LINE = re.compile(r"""^\s*(?:"([^"]+)"|'([^']+)'|([A-Za-z0-9_-]+))\s*=""")


def _split_dotted(name: str) -> tuple[str, ...]:
    return tuple(p.strip().strip('"').strip("'") for p in name.split("."))


def _line_of(text: str | None, path: Sequence[str | int]) -> int | None:
    """Line (1-based) where the key ``path`` is written, or its closest enclosing line."""
    if not text:
        return None
    path = tuple(path)
    lines = text.split("\n")
    section: tuple = ()
    counts: dict[tuple, int] = {}
    best: int | None = None
    for no, raw in enumerate(lines, 1):
        m = _HEADER_LINE.match(raw)
        if m and not raw.lstrip().startswith("#"):
            name = _split_dotted(m.group(2))
            if m.group(1) == "[[":
                counts[name] = counts.get(name, -1) + 1
                section = (*_with_parent_index(name, counts), counts[name])
            else:
                section = _with_parent_index(name, counts)
            if path[: len(section)] == section:
                best = no
            continue
        k = _KEY_LINE.match(raw)
        if not k:
            continue
        key = k.group(1) or k.group(2) or k.group(3)
        full = (*section, *_split_dotted(key))
        n = len(full)
        if path[:n] == full:
            if len(path) > n and isinstance(path[n], int) and raw.rstrip().endswith("["):
                return _element_line(lines, no, path[n])
            return no
    return best


class _Scanner:
    """Positions of every key and array element of a TOML text (for error messages).

    A small reader for text that :mod:`tomllib` has already accepted: it skips
    values and records where each key path (``("inputs", "t_inside")``,
    ``("candidates", 2, "layers", 0, "thickness")``) starts, as 1-based
    ``(line, column)``. It never decides what the text means.
    """

    _BARE = re.compile(r"[A-Za-z0-9_-]+")

    def __init__(self, text: str):
        self.text = text
        self.i = 0
        self.pos: dict[tuple, tuple[int, int]] = {}
        self.starts = [0] + [m.end() for m in re.finditer("\n", text)]
        self.counts: dict[tuple, int] = {}

    def at(self, i: int) -> tuple[int, int]:
        import bisect

        line = bisect.bisect_right(self.starts, i)
        return line, i - self.starts[line - 1] + 1

    def record(self, path: tuple, i: int) -> None:
        self.pos.setdefault(path, self.at(i))

    def skip_ws(self, newlines: bool) -> None:
        t, n = self.text, len(self.text)
        while self.i < n:
            c = t[self.i]
            if c in " \t\r" or (newlines and c == "\n"):
                self.i += 1
            elif c == "#":
                j = t.find("\n", self.i)
                self.i = n if j < 0 else j
            else:
                break

    def key(self) -> list[tuple[str, int]]:
        """A (dotted) key: its parts with their start indices."""
        parts = []
        t = self.text
        while True:
            self.skip_ws(False)
            start = self.i
            c = t[self.i] if self.i < len(t) else ""
            if c == '"' or c == "'":
                end = self.string_end()
                raw = t[start:end]
                try:
                    name = tomllib.loads(f"x = {raw}")["x"]
                except tomllib.TOMLDecodeError:
                    name = raw.strip("\"'")
                self.i = end
            else:
                m = self._BARE.match(t, self.i)
                if not m:
                    break
                name = m.group(0)
                self.i = m.end()
            parts.append((name, start))
            self.skip_ws(False)
            if self.i < len(t) and t[self.i] == ".":
                self.i += 1
                continue
            break
        return parts

    def string_end(self) -> int:
        t, i = self.text, self.i
        q = t[i]
        if t.startswith(q * 3, i):
            j = i + 3
            while True:
                k = t.find(q * 3, j)
                if k < 0:
                    return len(t)
                if q == '"':
                    b = k - 1
                    nb = 0
                    while b >= j and t[b] == "\\":
                        nb += 1
                        b -= 1
                    if nb % 2:
                        j = k + 1
                        continue
                end = k + 3
                while end < len(t) and t[end] == q:  # up to two quotes may end the content
                    end += 1
                return end
        j = i + 1
        while j < len(t):
            c = t[j]
            if q == '"' and c == "\\":
                j += 2
                continue
            if c == q or c == "\n":
                return j + 1
            j += 1
        return j

    def value(self, path: tuple) -> None:
        t = self.text
        self.skip_ws(False)
        if self.i >= len(t):
            return
        c = t[self.i]
        if c in "\"'":
            self.i = self.string_end()
        elif c == "[":
            self.i += 1
            idx = 0
            while True:
                self.skip_ws(True)
                if self.i >= len(t) or t[self.i] == "]":
                    self.i += 1
                    return
                if t[self.i] == ",":
                    self.i += 1
                    continue
                self.record((*path, idx), self.i)
                self.value((*path, idx))
                idx += 1
        elif c == "{":
            self.i += 1
            while True:
                self.skip_ws(True)
                if self.i >= len(t) or t[self.i] == "}":
                    self.i += 1
                    return
                if t[self.i] == ",":
                    self.i += 1
                    continue
                self.keyval(path)
        else:
            m = re.compile(r"[^,\]\}#\s]+(?:[ T][0-9:.+Z-]+)?").match(t, self.i)
            self.i = m.end() if m else self.i + 1

    def keyval(self, section: tuple) -> None:
        parts = self.key()
        if not parts:
            self.i += 1
            return
        path = section
        for name, start in parts:
            path = (*path, name)
            self.record(path, start)
        self.skip_ws(False)
        if self.i < len(self.text) and self.text[self.i] == "=":
            self.i += 1
        self.value(path)

    def run(self) -> dict[tuple, tuple[int, int]]:
        t = self.text
        section: tuple = ()
        while True:
            self.skip_ws(True)
            if self.i >= len(t):
                return self.pos
            if t[self.i] == "[":
                start = self.i
                array = t.startswith("[[", self.i)
                self.i += 2 if array else 1
                names = [n for n, _ in self.key()]
                j = t.find("\n", self.i)
                self.i = len(t) if j < 0 else j
                name = tuple(names)
                if array:
                    self.counts[name] = self.counts.get(name, -1) + 1
                    section = (*_with_parent_index(name, self.counts), self.counts[name])
                else:
                    section = _with_parent_index(name, self.counts)
                self.record(section, start)
                continue
            self.keyval(section)


def _positions(text: str | None) -> dict[tuple, tuple[int, int]]:
    if not text:
        return {}
    try:
        return _Scanner(text).run()
    except Exception:  # a locator must never hide the real error; fall back to lines
        return {}


def _locate(text: str | None, path: Sequence[str | int]) -> tuple[int | None, int | None]:
    """``(line, column)`` where ``path`` is written, or where its closest parent is."""
    if not text:
        return None, None
    pos = _positions(text)
    path = tuple(path)
    for n in range(len(path), 0, -1):
        if path[:n] in pos:
            return pos[path[:n]]
    line = _line_of(text, path)
    return line, (1 if line is not None else None)


def _key_at_line(text: str, line: int) -> str | None:
    """Dotted key written on ``line`` (or the table opened there), for syntax errors."""
    section: tuple = ()
    counts: dict[tuple, int] = {}
    for no, raw in enumerate(text.split("\n"), 1):
        m = _HEADER_LINE.match(raw)
        if m and not raw.lstrip().startswith("#"):
            name = _split_dotted(m.group(2))
            if m.group(1) == "[[":
                counts[name] = counts.get(name, -1) + 1
                section = (*_with_parent_index(name, counts), counts[name])
            else:
                section = _with_parent_index(name, counts)
            if no == line:
                return _dotted(section)
            continue
        if no == line:
            k = _KEY_LINE.match(raw)
            if k:
                return _dotted((*section, *_split_dotted(k.group(1) or k.group(2) or k.group(3))))
            return _dotted(section) or None
    return None


def _with_parent_index(name: tuple, counts: dict[tuple, int]) -> tuple:
    out: list = []
    for i, part in enumerate(name):
        out.append(part)
        parent = name[: i + 1]
        if i < len(name) - 1 and parent in counts:
            out.append(counts[parent])
    return tuple(out)


def _element_line(lines: list[str], start: int, index: int) -> int:
    seen = -1
    for no in range(start + 1, len(lines) + 1):
        s = lines[no - 1].strip()
        if not s or s.startswith("#"):
            continue
        if s.startswith("]"):
            break
        seen += 1
        if seen == index:
            return no
    return start


def _dotted(path: Sequence[str | int]) -> str:
    out = ""
    for p in path:
        out += f"[{p}]" if isinstance(p, int) else (f".{p}" if out else str(p))
    return out


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


# ---------------------------------------------------------------------------
# Reading
# ---------------------------------------------------------------------------
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


def migrate(data: dict[str, Any], version: int) -> dict[str, Any]:
    """Upgrade the data of a version-``version`` file to the current version.

    Parameters
    ----------
    data : dict
        Parsed TOML of an older file.
    version : int
        Its format version (0 for files without a ``format`` marker).

    Returns
    -------
    dict
        Data in the current layout.

    Examples
    --------
    >>> new = migrate({"job": "wall", "units": "US", "candidates": ["eps_20"],
    ...                "inputs": {"t_inside": "20 °C"}, "weights": {"heat_flux": 2}}, 0)
    >>> new["kind"], new["display_system"], new["criteria"]
    ('wall', 'US', [{'quantity': 'heat_flux', 'direction': 'minimise', 'weight': 2}])
    """
    while version < FORMAT_VERSION:
        data = _MIGRATIONS[version](data)
        version += 1
    return data


def _migrate_0_to_1(old: dict[str, Any]) -> dict[str, Any]:
    new: dict[str, Any] = {"format": FORMAT, "version": 1}
    rename = {"job": "kind", "units": "display_system"}
    for k, v in old.items():
        if k in ("weights", "materials_file", "version", "format"):
            continue
        new[rename.get(k, k)] = v
    weights = old.get("weights")
    if isinstance(weights, dict):
        new["criteria"] = [
            {"quantity": q, "direction": "minimise", "weight": w} for q, w in weights.items()
        ]
    mfile = old.get("materials_file")
    if isinstance(mfile, str):
        new["materials"] = {"path": mfile, "_v0_unpinned": True}
    return new


_MIGRATIONS: dict[int, Callable[[dict], dict]] = {0: _migrate_0_to_1}


def scenario_from_text(
    text: str, origin: str = "<scenario>", base_dir: Path | None = None
) -> Scenario:
    """Parse scenario text (any supported version); see :func:`load_scenario`."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        m = re.search(r"\(at line (\d+), column (\d+)\)", str(exc))
        n_lines = len(text.rstrip("\n").split("\n"))
        line = int(m.group(1)) if m else None
        col = f", column {m.group(2)}" if m else ""
        msg = re.sub(r"\s*\(at (line \d+, column \d+|end of document)\)", "", str(exc))
        if "end of document" in str(exc):
            line = max(n_lines, 1)
        hint = ""
        if line is not None and line >= n_lines:
            hint = " (at the end of the file: is it truncated?)"
        key = _key_at_line(text, line) if line is not None else None
        where = f"{key}: " if key else ""
        raise ScenarioError(
            [
                f"{origin}:{line if line is not None else '-'}: {where}invalid TOML{col}: {msg}{hint}"
            ],
            key=key,
            line=line,
        ) from None
    p = _Problems(text, origin)
    fmt = data.get("format")
    if "format" in data or "version" in data:
        if fmt != FORMAT:
            p.add(("format",), f"expected {FORMAT!r}, got {_describe(fmt)}")
            p.raise_if_any()
        version = data.get("version")
        if not isinstance(version, int) or isinstance(version, bool) or version < 0:
            p.add(
                ("version",),
                f"expected a non-negative integer, got {_describe(version)}",
                line=_line_of(text, ("version",)) or _line_of(text, ("format",)),
            )
            p.raise_if_any()
        if version > FORMAT_VERSION:
            p.add(
                ("version",),
                f"file is format version {version}, newer than this tool "
                f"understands (up to {FORMAT_VERSION}); update heatpath-workbench to read it",
            )
            p.raise_if_any()
    else:
        version = 0
    notes_extra = ""
    if version < FORMAT_VERSION:
        data = migrate(data, version)
        mat = data.get("materials")
        if isinstance(mat, dict) and mat.pop("_v0_unpinned", False):
            target = Path(mat["path"])
            if not target.is_absolute() and base_dir is not None:
                target = base_dir / target
            if target.is_file():
                mat.update(_pin(target))
                notes_extra = (
                    f"[migrated from format version {version}: the hash of "
                    f"{mat['path']} was taken at migration]"
                )
    return _build(data, p, base_dir, notes_extra)


def _pin(target: Path) -> dict[str, str]:
    out = {"sha256": file_sha256(target)}
    for suffix, key in (("sources", "sources_sha256"), ("kt", "kt_sha256")):
        side = target.with_name(f"{target.stem}.{suffix}{target.suffix}")
        if side.is_file():
            out[key] = file_sha256(side)
    return out


def _build(data: dict, p: _Problems, base_dir: Path | None, notes_extra: str = "") -> Scenario:
    _unknown_keys(data, _TOP_KEYS, (), p)
    kind_name = _get(data, "kind", str, (), p, required=True)
    kind = None
    if kind_name is not None:
        try:
            kind = study_kind(kind_name)
        except ValueError as exc:
            p.add(("kind",), str(exc).removeprefix("kind: "))
    title = _get(data, "title", str, (), p, default="")
    system = _get(data, "display_system", str, (), p, default="SI")
    if system is not None and system not in units.SYSTEMS:
        p.add(("display_system",), f"unknown {system!r}; valid: {', '.join(units.SYSTEMS)}")
    notes = _get(data, "notes", str, (), p, default="")
    if notes_extra:
        notes = f"{notes}\n{notes_extra}".strip()
    limits = _read_limits(data.get("limits"), p)
    lim = {**DEFAULT_LIMITS, **limits}
    raw_inputs = _get(data, "inputs", dict, (), p, required=True, default={})
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
    inputs = dict(raw_inputs or {})
    if kind is not None and isinstance(raw_inputs, dict) and "inputs" in data:
        _check_inputs(kind, inputs, p, lim, base_dir)
    materials = _read_materials(data.get("materials"), p, base_dir)
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
    p.raise_if_any()
    scenario = Scenario(
        kind=kind_name,
        inputs=inputs,
        candidates=tuple(candidates),
        materials=materials,
        criteria=tuple(criteria),
        constraints=tuple(constraints),
        display_system=system,
        title=title,
        notes=notes,
        decision=decision,
        base_dir=base_dir,
        limits=limits,
        origin=p.origin,
        source_text=p.text,
    )
    _check_against_materials(scenario, kind, p)
    p.raise_if_any()
    return scenario


def _read_limits(raw: Any, p: _Problems) -> dict[str, int]:
    if raw is None:
        return {}
    if not isinstance(raw, Mapping):
        p.add(("limits",), f"expected a table, got {_describe(raw)}")
        return {}
    _unknown_keys(raw, tuple(DEFAULT_LIMITS), ("limits",), p)
    out = {}
    for k, v in raw.items():
        if k not in DEFAULT_LIMITS:
            continue
        if not isinstance(v, int) or isinstance(v, bool) or v < 1:
            p.add(("limits", k), f"expected a whole number >= 1, got {_describe(v)}")
            continue
        out[k] = v
    return out


def _limits_of(scenario: Scenario) -> dict[str, int]:
    """Effective limits of a scenario (its overrides over :data:`DEFAULT_LIMITS`)."""
    p = _Problems(scenario.source_text, scenario.origin or "<scenario>")
    limits = _read_limits(dict(scenario.limits or {}), p)
    p.raise_if_any()
    return {**DEFAULT_LIMITS, **limits}


def _limit_why(count: int | float, what: str, name: str, lim: Mapping[str, int]) -> str:
    hint = {
        "max_list_entries": "use fewer, wider-spaced entries",
        "max_candidates": "compare fewer candidates at a time",
        "max_sweep_cells": "use fewer candidates or thicknesses, or a coarser time_step or a "
        "shorter duration",
    }[name]

    def num(x: int | float) -> str:
        return f"{int(x)}" if float(x).is_integer() and abs(x) < 1e9 else f"{float(x):.3g}"

    return (
        f"{num(count)} {what} exceed the limit of {num(lim[name])} ({name}); {hint}, or raise "
        f"the limit deliberately with [limits] {name} = N in the scenario file"
    )


def _is_iso_date(text: str) -> bool:
    import datetime

    if not re.fullmatch(r"\d{4}-\d{2}-\d{2}", text):
        return False
    try:
        datetime.date.fromisoformat(text)
    except ValueError:
        return False
    return True


def _renamed_ids(c: Any, path: tuple, p: _Problems) -> Any:
    """A candidate with every renamed (deprecated) material id replaced by its new id.

    :func:`workbench.materials.resolve_material_id` warns, naming the new id and the
    file:line:column, so a saved scenario still opens and the next save writes the new id.
    """
    from workbench.materials import DEPRECATED_IDS, resolve_material_id

    def where(sub: tuple) -> str:
        line, col = p.locate((*path, *sub))
        return f"{p.origin}:{line}:{col}" if line is not None else p.origin

    if isinstance(c, str):
        return resolve_material_id(c, where=where(())) if c in DEPRECATED_IDS else c
    if not isinstance(c, dict):
        return c
    out = dict(c)
    if isinstance(out.get("material"), str) and out["material"] in DEPRECATED_IDS:
        out["material"] = resolve_material_id(out["material"], where=where(("material",)))
    if isinstance(out.get("layers"), list):
        layers = []
        for j, lay in enumerate(out["layers"]):
            if isinstance(lay, dict) and isinstance(lay.get("material"), str) \
                    and lay["material"] in DEPRECATED_IDS:
                lay = {**lay, "material": resolve_material_id(
                    lay["material"], where=where(("layers", j, "material")))}
            layers.append(lay)
        out["layers"] = layers
    return out


def _freeze_candidate(c: dict) -> dict:
    return {
        k: ([dict(x) if isinstance(x, dict) else x for x in v] if isinstance(v, list) else v)
        for k, v in c.items()
    }


def _check_inputs(
    kind: StudyKind, inputs: dict, p: _Problems, limits: Mapping[str, int] = DEFAULT_LIMITS,
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
        _element(
            (i, 1), lambda v=v, i=i: _quantity(v[1], "temperature", f"{field_name}[{i}][1]")
        )
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


def _parse_input(spec: InputSpec, value: Any, limits: Mapping[str, int] = DEFAULT_LIMITS,
                 base_dir: Path | None = None):
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


def parse_inputs(scenario: Scenario) -> dict[str, Any]:
    """The scenario's inputs in SI (floats [SI unit of each kind]), booleans and choices.

    A budget input becomes ``(budget_kind, value)``. Missing optional inputs
    are ``None``; missing required ones raise :class:`ScenarioError`.
    """
    kind = study_kind(scenario.kind)
    limits = _limits_of(scenario)
    p = _problems_of(scenario)
    _check_inputs(kind, dict(scenario.inputs), p, limits, scenario.base_dir)
    p.raise_if_any()
    return {
        s.name: (
            _parse_input(s, scenario.inputs[s.name], limits, scenario.base_dir)
            if s.name in scenario.inputs
            else None
        )
        for s in kind.inputs
    }


def _problems_of(scenario: Scenario) -> _Problems:
    """A problem collector that names the scenario's file, line and column."""
    return _Problems(scenario.source_text, scenario.origin or "<scenario>")


# -- currencies ----------------------------------------------------------------
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
    if kind.name == "shipper" and isinstance(s.inputs.get("coolant"), str):
        from workbench.coolants import load_coolants

        cool = load_coolants()
        cid = s.inputs["coolant"]
        if cid in cool.index and isinstance(cool.loc[cid].get("currency"), str):
            found.setdefault(str(cool.loc[cid, "currency"]).strip(), []).append(f"coolant {cid!r}")
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
                f'"{value}" is in {codes.pop()}, but this scenario\'s costs (materials'
                f"{', coolant' if kind.name == 'shipper' else ''}) are in {code}; costs are "
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


# -- materials ---------------------------------------------------------------
_MATERIAL_KEYS = ("path", "sha256", "sources_sha256", "kt_sha256", "rows", "sources")
# numeric columns of a materials row -> (quantity kind, unit of the curated table)
_ROW_UNITS = {
    "conductivity": ("conductivity", "W/(m*K)"),
    "conductivity_temperature": ("temperature", "K"),
    "conductivity_tolerance": ("dimensionless", ""),
    "density": ("density", "kg/m^3"),
    "specific_heat": ("specific_heat", "J/(kg*K)"),
    "emissivity": ("dimensionless", ""),
    "t_service_min": ("temperature", "degC"),
    "t_service_max": ("temperature", "degC"),
}


def _read_materials(raw: Any, p: _Problems, base_dir: Path | None) -> MaterialsSource | None:
    if raw is None:
        return None
    path = ("materials",)
    if not isinstance(raw, dict):
        p.add(path, f"expected a table, got {_describe(raw)}")
        return None
    _unknown_keys(raw, _MATERIAL_KEYS, path, p)
    fpath = _get(raw, "path", str, path, p)
    hashes = {k: _get(raw, k, str, path, p) for k in ("sha256", "sources_sha256", "kt_sha256")}
    rows = _get(raw, "rows", list, path, p, default=[]) or []
    sources = _get(raw, "sources", list, path, p, default=[]) or []
    for name, items in (("rows", rows), ("sources", sources)):
        for i, r in enumerate(items):
            if not isinstance(r, dict):
                p.add((*path, name, i), f"expected a table, got {_describe(r)}")
                continue
            for k, v in r.items():
                if isinstance(v, (dict, list)):
                    p.add((*path, name, i, k), f"expected text or a number, got {_describe(v)}")
    if fpath is not None and rows:
        p.add(path, "give either path (a materials file) or rows (inline), not both")
    if fpath is None and not rows:
        p.add(path, "give path (a materials CSV file) or rows (inline materials)")
    if fpath is not None:
        if not hashes["sha256"]:
            p.add(
                (*path, "sha256"),
                "missing: a materials file is pinned by its SHA-256 "
                "(heatpath writes it when saving)",
                line=_line_of(p.text, (*path, "path")),
            )
        else:
            target = _resolve_path(fpath, base_dir)
            if not target.is_file():
                p.add((*path, "path"), f"materials file not found: {target}")
            else:
                _check_hashes(target, hashes, path, p)
    return MaterialsSource(path=fpath, rows=tuple(rows), sources=tuple(sources), **hashes)


def _check_hashes(target: Path, hashes: dict, path: tuple, p: _Problems) -> None:
    found = _pin(target)
    for key, label in (
        ("sha256", target.name),
        ("sources_sha256", "its .sources.csv"),
        ("kt_sha256", "its .kt.csv"),
    ):
        want, got = hashes.get(key), found.get(key)
        if want is None and got is None:
            continue
        if want is None:
            p.add(
                (*path, key),
                f"missing, but {label} exists beside {target.name}; it would "
                "change the results unnoticed",
                line=_line_of(p.text, (*path, "path")),
            )
        elif got is None:
            p.add((*path, key), f"{label} is pinned but no longer exists")
        elif want.lower() != got:
            p.add(
                (*path, key),
                f"{label} has changed since the scenario was saved "
                f"(SHA-256 {got[:12]}…, expected {want[:12]}…); check the file, then save "
                "the scenario again to pin the new content",
            )


def _resolve_path(fpath: str, base_dir: Path | None) -> Path:
    target = Path(fpath).expanduser()
    if not target.is_absolute() and base_dir is not None:
        target = base_dir / target
    return target


def _row_cell(col: str, value: Any, field_name: str) -> str:
    if isinstance(value, bool):
        raise ValueError(f"{field_name}: expected text or a number, got {_describe(value)}")
    if col in _ROW_UNITS and isinstance(value, str) and re.search(r"[A-Za-z°%]", value):
        qkind, table_unit = _ROW_UNITS[col]
        si = units.parse(value, qkind, field_name)
        return repr(float(units.from_si(si, qkind, unit=table_unit))) if table_unit else repr(si)
    if isinstance(value, float):
        return repr(value)
    return str(value)


def materials_for(scenario: Scenario):
    """The materials frame and k(T) curves a scenario uses.

    Returns
    -------
    (materials, curves, sources_path)
        :func:`workbench.materials.load_materials` merged with the user's
        file or inline rows; :func:`workbench.materials.load_conductivity_curves`;
        the path of the user's sources file (or None).

    Raises
    ------
    ScenarioError
        Problems of the inline rows, named by key (``materials.rows[i].column``).
    """
    from workbench.materials import MaterialsFileError, load_conductivity_curves, load_materials

    m = scenario.materials
    if m is None:
        return load_materials(), load_conductivity_curves(), None
    if m.path is not None:
        target = _resolve_path(m.path, scenario.base_dir)
        p = _Problems(None, "<scenario>")
        _check_hashes(
            target,
            {"sha256": m.sha256, "sources_sha256": m.sources_sha256, "kt_sha256": m.kt_sha256},
            ("materials",),
            p,
        )
        p.raise_if_any()
        side = target.with_name(f"{target.stem}.sources{target.suffix}")
        return (
            load_materials(target),
            load_conductivity_curves(target),
            side if side.is_file() else None,
        )
    with tempfile.TemporaryDirectory(prefix="heatpath-") as tmp:
        csv_path = Path(tmp) / "inline.csv"
        cols: list[str] = []
        for r in m.rows:
            cols += [c for c in r if c not in cols]
        p = _Problems(None, "<scenario>")
        table = []
        for i, r in enumerate(m.rows):
            row = []
            for c in cols:
                try:
                    row.append("" if c not in r else _row_cell(c, r[c], f"materials.rows[{i}].{c}"))
                except ValueError as exc:
                    p.add(("materials", "rows", i, c), str(exc).split(": ", 1)[-1])
                    row.append("")
            table.append(row)
        p.raise_if_any()
        with open(csv_path, "w", newline="", encoding="utf-8") as fh:
            w = csv.writer(fh)
            w.writerow(cols)
            w.writerows(table)
        sources_path = None
        if m.sources:
            sources_path = Path(tmp) / "inline.sources.csv"
            with open(sources_path, "w", newline="", encoding="utf-8") as fh:
                w = csv.writer(fh)
                scols = ["key", "citation", "locator", "kind", "note"]
                w.writerow(scols)
                for r in m.sources:
                    w.writerow([str(r.get(c, "")) for c in scols])
        try:
            frame = load_materials(csv_path)
            curves = load_conductivity_curves(csv_path)
            sources = None
            if sources_path is not None:
                from workbench.materials import load_sources

                sources = load_sources(sources_path)
        except MaterialsFileError as exc:
            raise ScenarioError(_inline_problems(exc.problems, cols, csv_path)) from None
    if sources is not None:
        frame.attrs["inline_sources"] = sources
    return frame, curves, None


def _inline_problems(problems: list[str], cols: list[str], csv_path: Path) -> list[str]:
    out = []
    for prob in problems:
        m = re.match(r"^(.*?):(\d+|-):([^:]*): (.*)$", prob)
        if m and m.group(1).endswith("inline.csv") and m.group(2).isdigit():
            row = int(m.group(2)) - 2
            out.append(f"<scenario>:-: materials.rows[{row}].{m.group(3)}: {m.group(4)}")
        elif m and m.group(1).endswith("inline.sources.csv") and m.group(2).isdigit():
            out.append(
                f"<scenario>:-: materials.sources[{int(m.group(2)) - 2}].{m.group(3)}: {m.group(4)}"
            )
        else:
            out.append(prob.replace(str(csv_path.parent), "<inline>"))
    return out


def _check_against_materials(s: Scenario, kind: StudyKind | None, p: _Problems) -> None:
    """Check material ids and inline rows (needs the merged materials table)."""
    if kind is None:
        return
    try:
        materials, _, _ = materials_for(s)
    except ScenarioError as exc:
        for prob in exc.problems:
            m = re.match(r"^<scenario>:-: (\S+): (.*)$", prob)
            if m:
                path = _undotted(m.group(1))
                p.add(path, m.group(2))
            else:
                p.add(("materials",), prob)
        return
    except (OSError, ValueError) as exc:
        p.add(("materials",), str(exc))
        return
    for i, key, why in kind.check_candidates(s.candidates, materials):
        path: tuple = ("candidates", i) if not key else ("candidates", i, *_undotted(key))
        p.add(path, why)
    _check_money(s, kind, materials, p)
    if s.decision is not None and s.decision.chosen:
        names = [kind.name_of(c) for c in s.candidates]
        if s.decision.chosen not in names:
            p.add(
                ("decision", "chosen"), f"unknown candidate {s.decision.chosen!r}; valid: {names}"
            )


def _undotted(key: str) -> tuple:
    out: list = []
    for part in re.findall(r"[^.\[\]]+|\[\d+\]", key):
        out.append(int(part[1:-1]) if part.startswith("[") else part)
    return tuple(out)


def _candidate_name(c: Any) -> str:
    if isinstance(c, str):
        return c
    return str(c.get("name") or c.get("material") or "")


def _check_scenario_object(s: Scenario) -> None:
    if not isinstance(s, Scenario):
        raise TypeError(f"scenario: expected a Scenario, got {type(s).__name__}")


# ---------------------------------------------------------------------------
# Files
# ---------------------------------------------------------------------------
def check_output_path(path: str | os.PathLike, overwrite: bool, option: str = "") -> Path:
    """Check that ``path`` may be written: absent, or a regular file and ``overwrite``.

    A FIFO, a device node, a socket, a directory or a symbolic link is refused
    even with ``overwrite`` (replacing it would replace the special file itself,
    or write somewhere else than named); so is a path whose folder does not exist.

    Raises
    ------
    FileExistsError
        A regular file exists and ``overwrite`` is false.
    ValueError
        Not a regular file, or no such folder; the message names ``option``.
    """
    import stat

    path = Path(path)
    where = f"{option}: " if option else ""
    try:
        st = os.lstat(path)
    except FileNotFoundError:
        folder = path.parent if str(path.parent) else Path(".")
        if not folder.is_dir():
            raise ValueError(f"{where}{path}: folder {folder} does not exist") from None
        return path
    mode = st.st_mode
    if stat.S_ISLNK(mode):
        what = "a symbolic link"
    elif stat.S_ISDIR(mode):
        what = "a directory"
    elif stat.S_ISFIFO(mode):
        what = "a FIFO (named pipe)"
    elif stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        what = "a device node"
    elif stat.S_ISSOCK(mode):
        what = "a socket"
    elif stat.S_ISREG(mode):
        if not overwrite:
            raise FileExistsError(
                f"{where}{path} exists; use --force (overwrite=True) to replace it"
            )
        return path
    else:  # pragma: no cover - no other file types on POSIX
        what = "not a regular file"
    raise ValueError(
        f"{where}{path} is {what}; heatpath writes only regular files and never replaces "
        "a special file or a link, even with --force; choose another output name"
    )


def _atomic_write(path: Path, text: str, overwrite: bool, backup: bool = True) -> None:
    path = Path(path)
    if os.path.lexists(path) and not overwrite:
        raise FileExistsError(f"{path} exists; pass overwrite=True to replace it (a .bak is kept)")
    check_output_path(path, overwrite)
    folder = path.parent if str(path.parent) else Path(".")
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.chmod(tmp, _file_mode(path))
        if path.exists() and backup:
            bak = path.with_name(path.name + ".bak")
            with open(path, "rb") as src:
                old = src.read()
            _replace_bytes(bak, old)
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def _file_mode(path: Path) -> int:
    """Mode for a new file: the old file's, else 0o666 less the process umask."""
    try:
        return os.stat(path).st_mode & 0o777
    except FileNotFoundError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask


def _replace_bytes(path: Path, data: bytes) -> None:
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.chmod(tmp, _file_mode(path))
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def _pin_profile_files(scenario: Scenario) -> Scenario:
    """Record the sha256 of every logger file an ambient profile names (where not yet recorded)."""

    def pinned(prof):
        if isinstance(prof, Mapping) and "file" in prof and "sha256" not in prof:
            target = _resolve_path(str(prof["file"]), scenario.base_dir)
            if target.is_file():
                return {**prof, "sha256": file_sha256(target)}
        return prof

    inputs = dict(scenario.inputs)
    if "ambient_profile" in inputs:
        inputs["ambient_profile"] = pinned(inputs["ambient_profile"])
    if isinstance(inputs.get("ambient_profiles"), Mapping):
        inputs["ambient_profiles"] = {k: pinned(v) for k, v in inputs["ambient_profiles"].items()}
    return scenario if inputs == dict(scenario.inputs) else replace(scenario, inputs=inputs)


def save_scenario(scenario: Scenario, path: str | os.PathLike, overwrite: bool = False) -> Path:
    """Write a scenario file atomically.

    Parameters
    ----------
    scenario : Scenario
        What to save.
    path : str or Path
        Target file (``.toml``).
    overwrite : bool, default False
        Replace an existing file, keeping the old one as ``NAME.toml.bak``;
        without it an existing file raises :class:`FileExistsError`.

    Returns
    -------
    Path
        The file written.
    """
    path = Path(path)
    scenario = _pin_profile_files(scenario)
    text = scenario_to_text(scenario)
    # the written file must load back to the same scenario; check before touching the disk
    back = scenario_from_text(text, str(path), scenario.base_dir)
    if back != scenario:
        raise ScenarioError(
            [f"{path}:-: scenario: does not survive a round trip (a value TOML cannot hold?)"]
        )
    if scenario.materials is not None and scenario.materials.path is not None:
        m = scenario.materials
        src = _resolve_path(m.path, scenario.base_dir).resolve()
        if src != _resolve_path(m.path, path.resolve().parent).resolve():
            raise ScenarioError(
                [
                    f"{path}:-: materials.path: {m.path!r} is relative to "
                    f"{scenario.base_dir}; save next to it or use an absolute path"
                    f" ({src})"
                ]
            )
    _atomic_write(path, text, overwrite)
    return path


def load_scenario(path: str | os.PathLike) -> Scenario:
    """Read a scenario file (any supported version) and check it.

    Raises
    ------
    ScenarioError
        Invalid TOML, a wrong type, an unknown key, kind or material id, a
        unit of the wrong dimension, a newer format version, or a changed
        materials file; the message names the key and the line.
    FileNotFoundError
        No such file.
    """
    path = Path(path)
    raw = path.read_bytes()
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise ScenarioError([f"{path}:{line}: not UTF-8 text ({exc.reason})"], line=line) from None
    return scenario_from_text(text, str(path), path.resolve().parent)


# ---------------------------------------------------------------------------
# Study <-> scenario
# ---------------------------------------------------------------------------
def study_from_scenario(scenario: Scenario):
    """Build the study object a scenario describes (a :class:`WallStudy`, ...)."""
    _check_scenario_object(scenario)
    kind = study_kind(scenario.kind)
    limits = _limits_of(scenario)
    inputs_si = parse_inputs(scenario)
    materials, curves, _ = materials_for(scenario)
    p = _problems_of(scenario)
    if len(scenario.candidates) > limits["max_candidates"]:
        p.add(
            ("candidates",),
            _limit_why(len(scenario.candidates), "entries", "max_candidates", limits),
        )
        p.raise_if_any()
    for i, key, why in kind.check_candidates(scenario.candidates, materials):
        p.add(("candidates", i) if not key else ("candidates", i, *_undotted(key)), why)
    _check_money(scenario, kind, materials, p)
    p.raise_if_any()
    _check_work(scenario, kind, inputs_si, limits, p)
    p.raise_if_any()
    try:
        return kind.build(scenario, inputs_si, materials, curves)
    except ScenarioError:
        raise
    except (ValueError, TypeError) as exc:
        raise located_error(scenario, exc) from None


def check_scenario(scenario: Scenario):
    """Check a scenario as fully as running it would, without computing: build its study.

    Everything :func:`study_from_scenario` (and so ``heatpath rank`` and
    ``heatpath report``) would refuse is refused here with the same message:
    keys, units, physical domains, currencies, materials, work limits and the
    study's own input checks, each named with the file, line and column of the
    key concerned. Returns the study.
    """
    return study_from_scenario(scenario)


def _check_work(
    s: Scenario, kind: StudyKind, x: Mapping[str, Any], limits: Mapping[str, int], p: _Problems
) -> None:
    """Refuse, before computing, a study larger than ``limits["max_sweep_cells"]``."""
    n_cand = len(s.candidates)
    if kind.name != "shipper":
        cells, detail, path = n_cand, f"{n_cand} candidates", ("candidates",)
    else:
        thk = x.get("thicknesses") or []
        duration, step = x.get("duration"), x.get("time_step")
        if duration is None or step is None or not step > 0 or not duration > 0:
            return  # the study's own checks name these
        steps = math.ceil(duration / step)
        cells = n_cand * len(thk) * steps
        detail = (
            f"{n_cand} candidates × {len(thk)} thicknesses × {steps:.3g} time steps "
            f"(duration / time_step) = {cells:.3g} cells"
        )
        path = ("inputs", "duration")
    if cells > limits["max_sweep_cells"]:
        p.add(path, _limit_why(cells, "cells", "max_sweep_cells", limits) + f" [{detail}]")


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
        if word.startswith(("candidate", "thickness of", "finish", "layers")):
            return candidate_path()
        if word.startswith(("heat budget", "budget")) and "budget" in inputs:
            return ("inputs", "budget")
        for name in (key, first, word.split(" ")[0]):
            if name in inputs:
                if (
                    name == "t_ambient"
                    and "t_ambient" not in s.inputs
                    and "ambient_profile" in s.inputs
                ):
                    return ("inputs", "ambient_profile")
                if name not in s.inputs and name == "t_ambient":
                    return ("inputs",)
                return ("inputs", name)
    for name in inputs:
        if re.search(rf"(?<![A-Za-z_]){re.escape(name)}(?![A-Za-z_])", message):
            return ("inputs", name)
    return ("inputs",)


def located_error(scenario: Scenario, exc: BaseException) -> ScenarioError:
    """A study's ``ValueError``/``TypeError`` as a :class:`ScenarioError` at the key concerned.

    The message is kept; the key is the input (or candidate) its message names,
    located in the scenario's file (``file:line:column: key: message``).
    """
    if isinstance(exc, ScenarioError):
        return exc
    kind = study_kind(scenario.kind)
    p = _problems_of(scenario)
    path = _path_for_message(scenario, kind, str(exc))
    p.add(path, str(exc))
    try:
        p.raise_if_any()
    except ScenarioError as err:
        return err
    raise AssertionError("unreachable")  # pragma: no cover


def scenario_from_study(
    study,
    *,
    title: str = "",
    notes: str = "",
    display_system: str = "SI",
    criteria: Sequence[CriterionSpec] = (),
    constraints: Sequence[ConstraintSpec] = (),
    decision: Decision | None = None,
    base_dir: str | os.PathLike | None = None,
) -> Scenario:
    """The scenario that rebuilds ``study`` (inputs written in SI with full precision).

    User materials in the study's table (rows whose ``origin`` is a file) are
    pinned by path and SHA-256.
    """
    kind = _kind_of(study)
    inputs, candidates = kind.read_back(study)
    materials = None
    frame = getattr(study, "materials", None)
    if frame is not None and "origin" in getattr(frame, "columns", ()):
        origins = sorted({o for o in frame["origin"] if isinstance(o, str) and o != "curated"})
        if len(origins) > 1:
            raise ValueError(
                f"materials: rows from several user files {origins}; merge them into one file"
            )
        if origins:
            target = Path(origins[0]).resolve()
            materials = MaterialsSource(path=str(target), **_pin(target))
    units.check_system(display_system)
    return Scenario(
        kind=kind.name,
        inputs=inputs,
        candidates=tuple(candidates),
        materials=materials,
        criteria=tuple(criteria),
        constraints=tuple(constraints),
        display_system=display_system,
        title=title,
        notes=notes,
        decision=decision,
        base_dir=Path(base_dir) if base_dir is not None else None,
    )


def _kind_of(study) -> StudyKind:
    for name in list(_STUDY_KINDS):
        try:
            k = study_kind(name)
        except ImportError:
            continue
        if k.study_type is not None and isinstance(study, k.study_type):
            return k
    raise ValueError(
        f"study: no scenario kind for {type(study).__name__}; valid kinds: {available_kinds()}"
    )


def _si_text(value: float, unit: str) -> str:
    return f"{float(value)!r} {unit}".strip()


def snapshot(
    study,
    *,
    system: str = "SI",
    chosen: str | None = None,
    title: str = "",
    notes: str = "",
    criteria: Sequence[CriterionSpec] = (),
    constraints: Sequence[ConstraintSpec] = (),
    rationale: str = "",
    decided_by: str = "",
    date: str = "",
    attendees: str = "",
) -> Scenario:
    """The scenario of a study as shown in the workbench (for its Save button and autosave).

    ``chosen`` (a candidate name) becomes the decision; criteria and limits
    are kept as given.
    """
    decision = None
    if chosen is not None:
        names = [str(n) for n in getattr(study, "names", [])]
        if names and chosen not in names:
            raise ValueError(f"chosen: unknown candidate {chosen!r}; valid: {names}")
        decision = Decision(chosen, rationale, decided_by, date, attendees)
    return scenario_from_study(
        study,
        title=title,
        notes=notes,
        display_system=system,
        criteria=criteria,
        constraints=constraints,
        decision=decision,
    )


def open_scenario(path: str | os.PathLike):
    """Load a scenario file and build its study: ``(study, scenario)`` (for a Load button).

    Raises :class:`ScenarioError` (a ``ValueError`` naming key and line) on any problem.
    """
    s = load_scenario(path)
    return study_from_scenario(s), s


# ---------------------------------------------------------------------------
# Starter files
# ---------------------------------------------------------------------------
def _starter_value(spec: InputSpec) -> str:
    if spec.kind == "bool":
        return "true" if spec.default else "false"
    return _inline(spec.default if spec.default is not None else "")


def starter_text(kind_name: str) -> str:
    """A commented starter scenario for ``kind_name`` that loads as it is (demo values).

    Examples
    --------
    >>> s = scenario_from_text(starter_text("wall"))
    >>> s.kind
    'wall'
    """
    kind = study_kind(kind_name)
    out = [
        f"# heatpath scenario: {kind.title} -- starter file with DEMO values; edit every line.",
        "# Format: workbench/scenario.py (module docstring). Quantities are text with a unit:",
        '# "25 mm", "1 in", "4 °C", "77 °F", "0.25 W/(m²·K)". Run: heatpath report THIS_FILE',
        f'format = "{FORMAT}"',
        f"version = {FORMAT_VERSION}",
        f'kind = "{kind.name}"',
        f'title = "{kind.title} (demo)"',
        'display_system = "SI"   # or "US"',
        'notes = "Demo starter scenario; replace with the job\'s real inputs."',
        "",
        "# Candidates to compare (heatpath materials list):",
        f"candidates = {_value(list(kind.starter_candidates))}",
        "",
        "[inputs]",
    ]
    for spec in kind.inputs:
        out.append(f"# {spec.doc}" + ("" if spec.required else " (optional)"))
        line = f"{spec.name} = {_starter_value(spec)}"
        out.append(line if spec.default is not None else f"# {spec.name} = ")
    out += ["", "# Ranking criteria (results columns); direction minimise/maximise; weight >= 0."]
    for c in kind.default_criteria:
        out += [
            "[[criteria]]",
            f'quantity = "{c.quantity}"',
            f'direction = "{c.direction}"',
            f"weight = {float(c.weight)!r}",
            "",
        ]
    out += [
        "# Hard limits, e.g.:",
        "# [[constraints]]",
        f'# quantity = "{next(iter(kind.column_kinds))}"',
        '# max = "..."',
        "",
        "# Your own materials (same columns as tables/materials.csv), pinned by hash:",
        "# [materials]",
        '# path = "my_materials.csv"',
        '# sha256 = "..."   # heatpath writes it when it saves the scenario',
        "",
        "# The decision, once taken:",
        "# [decision]",
        f'# chosen = "{kind.name_of(kind.starter_candidates[0])}"',
        '# rationale = "..."',
        '# decided_by = "..."',
        '# attendees = "..."',
        '# date = "YYYY-MM-DD"',
    ]
    return "\n".join(out) + "\n"


# ---------------------------------------------------------------------------
# Last-used recovery
# ---------------------------------------------------------------------------
def state_dir() -> Path:
    """Per-user state folder: ``$HEATPATH_STATE_DIR``, else ``~/.local/state/heatpath``
    (``$XDG_STATE_HOME/heatpath`` when that is set)."""
    env = os.environ.get("HEATPATH_STATE_DIR")
    if env:
        return Path(env).expanduser()
    xdg = os.environ.get("XDG_STATE_HOME")
    base = Path(xdg).expanduser() if xdg else Path.home() / ".local" / "state"
    return base / "heatpath"


_LAST = "last-scenario.toml"


def autosave(scenario: Scenario, folder: str | Path | None = None) -> Path:
    """Save ``scenario`` as the last-used scenario (atomic; no backup kept).

    ``folder`` is the state folder to write to; by default :func:`state_dir` now.
    """
    folder = state_dir() if folder is None else Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    s = scenario
    if s.materials is not None and s.materials.path is not None:
        target = _resolve_path(s.materials.path, s.base_dir).resolve()
        s = replace(s, materials=replace(s.materials, path=str(target)))
    path = folder / _LAST
    _atomic_write(path, scenario_to_text(s), overwrite=True, backup=False)
    return path


def recover_last() -> Scenario | None:
    """The last autosaved scenario, or None when there is none.

    Raises
    ------
    ScenarioError
        The saved file exists but cannot be used (the message says why).
    """
    path = state_dir() / _LAST
    if not path.is_file():
        return None
    return load_scenario(path)


# ---------------------------------------------------------------------------
# The wall kind
# ---------------------------------------------------------------------------
def _wall_kind() -> StudyKind:
    from workbench.studies.wall import WALL_ASSUMPTIONS, Candidate, HeatBudget, Layer, WallStudy

    del WALL_ASSUMPTIONS

    def to_candidate(c: Any) -> Candidate:
        if isinstance(c, str):
            return Candidate.single(c)
        layers = []
        for j, lay in enumerate(c["layers"]):
            t = lay.get("thickness")
            layers.append(
                Layer(
                    lay["material"],
                    None
                    if t is None
                    else units.parse(t, "thickness", f"candidates.layers[{j}].thickness"),
                )
            )
        return Candidate(
            c.get("name") or "/".join(x["material"] for x in c["layers"]), tuple(layers)
        )

    def build(scenario: Scenario, x: dict, materials, curves):
        budget = None if x["budget"] is None else HeatBudget(*x["budget"])
        if budget is not None and x["t_inside"] == x["t_outside"]:
            raise ValueError(
                "t_outside: equal to t_inside; equal temperatures carry no heat, so a heat "
                "budget sizes nothing (remove the budget or change a temperature)"
            )
        return WallStudy(
            [to_candidate(c) for c in scenario.candidates],
            materials,
            t_inside=x["t_inside"],
            t_outside=x["t_outside"],
            area=x["area"],
            r_si=x["r_si"],
            r_se=x["r_se"],
            budget=budget,
            max_thickness=x["max_thickness"],
            thickness=x["thickness"],
            k_curves=curves if x["conductivity_vs_temperature"] else {},
        )

    def read_back(study) -> tuple[dict, tuple]:
        inputs: dict[str, Any] = {
            "t_inside": _si_text(study.t_inside, "K"),
            "t_outside": _si_text(study.t_outside, "K"),
            "area": _si_text(study.area, "m^2"),
            "r_si": _si_text(study.r_si, "m^2*K/W"),
            "r_se": _si_text(study.r_se, "m^2*K/W"),
            "thickness": _si_text(study.thickness, "m"),
            "conductivity_vs_temperature": bool(study.k_curves),
        }
        if study.budget is not None:
            unit = {"flux": "W/m^2", "power": "W", "u_value": "W/(m^2*K)"}[study.budget.kind]
            inputs["budget"] = _si_text(study.budget.value, unit)
        if study.max_thickness is not None:
            inputs["max_thickness"] = _si_text(study.max_thickness, "m")
        cands: list[Any] = []
        for c in study.candidates:
            if len(c.layers) == 1 and c.name == c.layers[0].material:
                cands.append(c.name)
            else:
                cands.append(
                    {
                        "name": c.name,
                        "layers": [
                            {"material": lay.material}
                            if lay.thickness is None
                            else {
                                "material": lay.material,
                                "thickness": _si_text(lay.thickness, "m"),
                            }
                            for lay in c.layers
                        ],
                    }
                )
        return inputs, tuple(cands)

    def check(cands: Sequence[Any], materials) -> list[tuple[int, str, str]]:
        problems = []
        known = set(materials.index)
        names: list[str] = []
        for i, c in enumerate(cands):
            if isinstance(c, str):
                ids = [("", c)]
                names.append(c)
            else:
                for k in c:
                    if k not in ("name", "layers"):
                        problems.append((i, k, _unknown_key_why(k, ("name", "layers"))))
                layers = c.get("layers")
                if not isinstance(layers, list) or not layers:
                    problems.append((i, "layers", "expected a list of {material, thickness}"))
                    continue
                ids = []
                sized = 0
                for j, lay in enumerate(layers):
                    for k in lay if isinstance(lay, dict) else ():
                        if k not in ("material", "thickness"):
                            problems.append(
                                (
                                    i,
                                    f"layers[{j}].{k}",
                                    _unknown_key_why(k, ("material", "thickness")),
                                )
                            )
                    if not isinstance(lay, dict) or not isinstance(lay.get("material"), str):
                        problems.append(
                            (
                                i,
                                f"layers[{j}]",
                                'expected { material = "id", '
                                'thickness = "25 mm" } (thickness omitted for the '
                                "sized layer)",
                            )
                        )
                        continue
                    ids.append((f"layers[{j}].material", lay["material"]))
                    if "thickness" not in lay:
                        sized += 1
                    else:
                        try:
                            _quantity(lay["thickness"], "thickness", "thickness")
                        except ValueError as exc:
                            problems.append((i, f"layers[{j}].thickness", str(exc)))
                if sized != 1:
                    problems.append(
                        (
                            i,
                            "layers",
                            "needs exactly one layer without a thickness "
                            f"(the layer to size), found {sized}",
                        )
                    )
                names.append(str(c.get("name") or "/".join(x for _, x in ids)))
            for key, mid in ids:
                if mid not in known:
                    problems.append(
                        (
                            i,
                            key,
                            f"unknown material id {mid!r}; see "
                            "'heatpath materials list' for valid ids",
                        )
                    )
        dup = sorted({n for n in names if names.count(n) > 1})
        if dup:
            problems.append((0, "", f"duplicate candidate names {dup}"))
        return problems

    return StudyKind(
        name="wall",
        title="Wall comparison",
        job=(
            "Choose the material and thickness of a plane wall between a warm and a cold side: "
            "each candidate build-up is sized (or evaluated at a set thickness) against a heat "
            "budget, and compared on thickness, mass, cost and heat flow."
        ),
        inputs=(
            InputSpec(
                "t_inside", "temperature", "20 °C", "Air temperature on the first-layer side"
            ),
            InputSpec(
                "t_outside", "temperature", "-10 °C", "Air temperature on the last-layer side"
            ),
            InputSpec(
                "area", "area", "10 m²", "Wall area (for total heat flow and a power budget)"
            ),
            InputSpec(
                "r_si",
                "resistance",
                "0.13 m²·K/W",
                "Inside surface resistance (ISO 6946:2017 Table 7: 0.13 horizontal flow)",
            ),
            InputSpec("r_se", "resistance", "0.04 m²·K/W", "Outside surface resistance"),
            InputSpec(
                "budget",
                "budget",
                "0.25 W/(m²·K)",
                "Heat budget: a flux (W/m²), a power (W) or a U-value (W/(m²·K))",
                required=False,
            ),
            InputSpec(
                "max_thickness",
                "thickness",
                "200 mm",
                "Largest acceptable thickness of the sized layer",
                required=False,
            ),
            InputSpec(
                "thickness",
                "thickness",
                "50 mm",
                "Sized-layer thickness where no budget is set; current sweep point",
            ),
            InputSpec(
                "conductivity_vs_temperature",
                "bool",
                True,
                "Use tabulated k(T) curves (integral mean over the layer) where available",
            ),
        ),
        column_kinds=MappingProxyType(
            {
                "sized_thickness": "thickness",
                "total_thickness": "thickness",
                "conductivity": "conductivity",
                "density": "density",
                "u_value": "u_value",
                "heat_flux": "heat_flux",
                "heat_flow": "power",
                "mass_per_area": "mass_per_area",
                "cost_per_area": "cost_per_area",
                "t_surface_inside": "temperature",
                "t_surface_outside": "temperature",
            }
        ),
        flag_columns=("within_service_limits", "meets_budget", "within_max_thickness"),
        build=build,
        read_back=read_back,
        default_criteria=(
            CriterionSpec("total_thickness", "minimise", 1.0),
            CriterionSpec("mass_per_area", "minimise", 1.0),
            CriterionSpec("cost_per_area", "minimise", 1.0),
        ),
        formula_sources=("fourier", "iso6946-2017"),
        property_sources=(
            "conductivity_source",
            "density_source",
            "t_service_source",
            "cost_source",
        ),
        cautions=(
            "Foam insulants (EPS, XPS, PIR/PUR, phenolic, PE foam) burn and may give off toxic "
            "smoke; their fire behaviour, and the facings and fire barriers they need, are set by "
            "local building and fire codes and product tests, not by this comparison.",
        ),
        starter_candidates=("eps_20", "xps_35", "pir_32", "glass_wool_32"),
        check_candidates=check,
        candidate_name=lambda c: to_candidate(c).name,
        study_type=WallStudy,
        magnitude_columns=("heat_flux", "heat_flow"),
    )


register_study_kind("wall", _wall_kind)


# ---------------------------------------------------------------------------
# Shared candidate helpers for the box-like kinds
# ---------------------------------------------------------------------------
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


_AIR_KEYS = ("air_layer", "direction", "emissivity_1", "emissivity_2", "method", "height", "name")
_VIP_KEYS = ("vacuum_panel", "centre_conductivity", "length", "width", "psi_edge", "name")


def _check_layer_list(i: int, c: Mapping, known: set, problems: list, allow_special: bool) -> list:
    layers = c.get("layers")
    if not isinstance(layers, list) or not layers:
        problems.append(
            (
                i,
                "layers",
                "expected a list of layers such as "
                '{ material = "eps_20" } (the sized layer) and '
                '{ material = "carbon_steel", thickness = "0.6 mm" }',
            )
        )
        return []
    sized = 0
    ids = []
    for j, lay in enumerate(layers):
        key = f"layers[{j}]"
        if not isinstance(lay, dict):
            problems.append((i, key, f"expected a table, got {_describe(lay)}"))
            continue
        if allow_special and "air_layer" in lay:
            spec = {"air_layer": "thickness", "height": "length"}
            for k, v in lay.items():
                if k not in _AIR_KEYS:
                    problems.append((i, f"{key}.{k}", _unknown_key_why(k, _AIR_KEYS)))
                elif k in spec:
                    _collect(
                        problems, i, f"{key}.{k}", lambda v=v, k=k, q=spec[k]: _quantity(v, q, k)
                    )
                elif k in ("emissivity_1", "emissivity_2"):
                    _collect(
                        problems,
                        i,
                        f"{key}.{k}",
                        lambda v=v, k=k: _quantity(v, "dimensionless", k, units.EMISSIVITY),
                    )
            if "direction" not in lay:
                problems.append((i, f"{key}.direction", 'missing: "up", "horizontal" or "down"'))
            continue
        if allow_special and "vacuum_panel" in lay:
            spec = {
                "vacuum_panel": "thickness",
                "centre_conductivity": "conductivity",
                "length": "length",
                "width": "length",
                "psi_edge": "conductivity",
            }
            for k, v in lay.items():
                if k not in _VIP_KEYS:
                    problems.append((i, f"{key}.{k}", _unknown_key_why(k, _VIP_KEYS)))
                elif k in spec:
                    _collect(
                        problems, i, f"{key}.{k}", lambda v=v, k=k, q=spec[k]: _quantity(v, q, k)
                    )
            for k in _VIP_KEYS[1:5]:
                if k not in lay:
                    problems.append(
                        (
                            i,
                            f"{key}.{k}",
                            "missing (a vacuum panel needs "
                            "centre_conductivity, length, width and psi_edge)",
                        )
                    )
            continue
        for k in lay:
            if k not in ("material", "thickness"):
                why = _unknown_key_why(k, ("material", "thickness"))
                if allow_special:
                    why += " (or an air_layer or vacuum_panel table)"
                problems.append((i, f"{key}.{k}", why))
        if not isinstance(lay.get("material"), str):
            problems.append(
                (
                    i,
                    key,
                    'expected { material = "id", thickness = "25 mm" } '
                    "(thickness omitted for the sized layer)",
                )
            )
            continue
        ids.append((f"{key}.material", lay["material"]))
        if "thickness" not in lay:
            sized += 1
        else:
            _collect(
                problems,
                i,
                f"{key}.thickness",
                lambda lay=lay: _quantity(lay["thickness"], "thickness", "thickness"),
            )
    if sized != 1:
        problems.append(
            (
                i,
                "layers",
                "needs exactly one material layer without a thickness "
                f"(the layer to size), found {sized}",
            )
        )
    for key, mid in ids:
        if mid not in known:
            problems.append((i, key, f"unknown material id {mid!r}; see 'heatpath materials list'"))
    return ids


def _collect(problems: list, i: int, key: str, fn: Callable[[], Any]) -> None:
    try:
        fn()
    except ValueError as exc:
        problems.append((i, key, str(exc)))


def _duplicates(names: list[str], problems: list) -> None:
    dup = sorted({n for n in names if names.count(n) > 1})
    if dup:
        problems.append((0, "", f"duplicate candidate names {dup}"))


# ---------------------------------------------------------------------------
# The shipper kind
# ---------------------------------------------------------------------------
def _shipper_kind() -> StudyKind:
    import numpy as np

    from workbench.air_layers import AirLayer
    from workbench.coolants import load_coolants
    from workbench.geometry import VacuumPanel
    from workbench.studies.shipper import ShipperCandidate, ShipperStudy
    from workbench.studies.wall import Layer

    coolants = tuple(load_coolants().index)
    quantities = {
        "payload_length": "length",
        "payload_width": "length",
        "payload_height": "length",
        "payload_mass": "mass",
        "payload_specific_heat": "specific_heat",
        "t_payload_min": "temperature",
        "t_payload_max": "temperature",
        "t_payload_start": "temperature",
        "t_ambient": "temperature",
        "duration": "time",
        "safety_factor": "dimensionless",
        "coolant_packing_fraction": "dimensionless",
        "t_coolant_start": "temperature",
        "r_si": "resistance",
        "r_se": "resistance",
        "coupling_coefficient": "heat_transfer_coefficient",
        "coolant_wall_fraction": "dimensionless",
        "divisor": "volume_per_mass",
        "mass_increment": "mass",
        "rate_per_kg": "cost_per_mass",
        "fixed_fee": "money",
        "time_step": "time",
    }
    si_units = {
        "length": "m",
        "mass": "kg",
        "specific_heat": "J/(kg*K)",
        "temperature": "K",
        "time": "s",
        "dimensionless": "",
        "resistance": "m^2*K/W",
        "heat_transfer_coefficient": "W/(m^2*K)",
        "volume_per_mass": "m^3/kg",
        "cost_per_mass": "currency/kg",
        "money": "",
    }

    def layer_from(lay: Mapping):
        if "air_layer" in lay:
            kw = {
                "thickness": _quantity(lay["air_layer"], "thickness", "air_layer"),
                "direction": lay["direction"],
            }
            for k in ("emissivity_1", "emissivity_2"):
                if k in lay:
                    kw[k] = _quantity(lay[k], "dimensionless", k, units.EMISSIVITY)
            if "method" in lay:
                kw["method"] = lay["method"]
            if "height" in lay:
                kw["height"] = _quantity(lay["height"], "length", "height")
            if "name" in lay:
                kw["name"] = lay["name"]
            return AirLayer(**kw)
        if "vacuum_panel" in lay:
            kw = {
                "thickness": _quantity(lay["vacuum_panel"], "thickness", "vacuum_panel"),
                "centre_conductivity": _quantity(
                    lay["centre_conductivity"], "conductivity", "centre_conductivity"
                ),
                "length": _quantity(lay["length"], "length", "length"),
                "width": _quantity(lay["width"], "length", "width"),
                "psi_edge": _quantity(lay["psi_edge"], "conductivity", "psi_edge"),
            }
            if "name" in lay:
                kw["name"] = lay["name"]
            return VacuumPanel(**kw)
        t = lay.get("thickness")
        return Layer(lay["material"], None if t is None else _quantity(t, "thickness", "thickness"))

    def to_candidate(c: Any) -> ShipperCandidate:
        if isinstance(c, str):
            return ShipperCandidate(c, (Layer(c),))
        return ShipperCandidate(
            c.get("name") or _layers_name(c["layers"]), tuple(layer_from(x) for x in c["layers"])
        )

    def build(scenario: Scenario, x: dict, materials, curves):
        kw = {k: x[k] for k in quantities if x.get(k) is not None}
        kw["t_payload_min"] = x.get("t_payload_min")
        kw["t_payload_max"] = x.get("t_payload_max")
        kw["t_coolant_start"] = x.get("t_coolant_start")
        given = [k for k in ("t_ambient", "ambient_profile", "ambient_profiles")
                 if x.get(k) is not None]
        if len(given) != 1:
            raise ValueError(
                "t_ambient: give exactly one of t_ambient (a constant), ambient_profile (steps "
                "or a logger file) or ambient_profiles (several named), "
                + (f"not {' and '.join(given)}" if given else "none is given")
            )
        if x.get("ambient_profile") is not None:
            kw["t_ambient"] = x["ambient_profile"]
        if x.get("ambient_profiles") is not None:
            kw.pop("t_ambient", None)
            kw["ambient_profiles"] = x["ambient_profiles"]
        return ShipperStudy(
            [to_candidate(c) for c in scenario.candidates],
            materials,
            coolant=x["coolant"],
            thicknesses=np.asarray(x["thicknesses"]),
            **kw,
        )

    def read_back(study) -> tuple[dict, tuple]:
        inputs: dict[str, Any] = {"coolant": study.coolant}
        code = str(study.coolant_row.get("currency", "EUR"))
        code = code if code in units.CURRENCIES else "EUR"
        def rows(profile):
            times, temps = profile
            return [
                [_si_text(t, "s"), _si_text(tk, "K")]
                for t, tk in zip(np.asarray(times, float), np.asarray(temps, float), strict=True)
            ]

        named = getattr(study, "ambient_profiles", None)
        if named:
            inputs["ambient_profiles"] = {
                n: (rows(v) if isinstance(v, tuple | list) else [["0 s", _si_text(v, "K")]])
                for n, v in named.items()
            }
        for name, q in quantities.items():
            v = getattr(study, name)
            if name == "t_ambient" and named:
                continue
            if name == "t_ambient" and not np.isscalar(v) and not isinstance(v, float):
                inputs["ambient_profile"] = rows(v)
                continue
            if v is None:
                continue
            unit = si_units[q].replace("currency", code)
            inputs[name] = (
                f"{float(v)!r} {code}"
                if q == "money"
                else float(v)
                if q == "dimensionless"
                else _si_text(v, unit)
            )
        inputs["thicknesses"] = [_si_text(t, "m") for t in np.asarray(study.thicknesses, float)]
        cands = []
        for c in study.candidates:
            if (
                len(c.layers) == 1
                and isinstance(c.layers[0], Layer)
                and c.name == c.layers[0].material
            ):
                cands.append(c.name)
                continue
            layers = []
            for lay in c.layers:
                if isinstance(lay, Layer):
                    layers.append(
                        {"material": lay.material}
                        if lay.thickness is None
                        else {"material": lay.material, "thickness": _si_text(lay.thickness, "m")}
                    )
                elif isinstance(lay, AirLayer):
                    d = {
                        "air_layer": _si_text(lay.thickness, "m"),
                        "direction": lay.direction,
                        "emissivity_1": float(lay.emissivity_1),
                        "emissivity_2": float(lay.emissivity_2),
                        "method": lay.method,
                        "name": lay.name,
                    }
                    if lay.height is not None:
                        d["height"] = _si_text(lay.height, "m")
                    layers.append(d)
                else:
                    layers.append(
                        {
                            "vacuum_panel": _si_text(lay.thickness, "m"),
                            "centre_conductivity": _si_text(lay.centre_conductivity, "W/(m*K)"),
                            "length": _si_text(lay.length, "m"),
                            "width": _si_text(lay.width, "m"),
                            "psi_edge": _si_text(lay.psi_edge, "W/(m*K)"),
                            "name": lay.name,
                        }
                    )
            cands.append({"name": c.name, "layers": layers})
        return inputs, tuple(cands)

    def check(cands: Sequence[Any], materials) -> list[tuple[int, str, str]]:
        problems: list = []
        known = set(materials.index)
        names = []
        for i, c in enumerate(cands):
            if isinstance(c, str):
                if c not in known:
                    problems.append(
                        (i, "", f"unknown material id {c!r}; see 'heatpath materials list'")
                    )
                names.append(c)
                continue
            for k in c:
                if k not in ("name", "layers"):
                    problems.append((i, k, _unknown_key_why(k, ("name", "layers"))))
            _check_layer_list(i, c, known, problems, allow_special=True)
            names.append(str(c.get("name") or _layers_name(c.get("layers") or [])))
        _duplicates(names, problems)
        return problems

    def results(study):
        raw = study.results()
        frame = raw.optimum.copy()
        frame.attrs["units"] = dict(raw.optimum.attrs.get("units", {}))
        frame.attrs["assumptions"] = tuple(raw.assumptions)
        frame.attrs["cautions"] = tuple(raw.cautions)
        return frame, raw

    mk = InputSpec
    inputs = (
        mk(
            "coolant",
            "choice",
            "pcm_plus5",
            "Coolant id (heatpath: see tables/coolants.csv)",
            choices=coolants,
        ),
        mk("payload_length", "length", "300 mm", "Payload space length"),
        mk("payload_width", "length", "200 mm", "Payload space width"),
        mk("payload_height", "length", "150 mm", "Payload space height"),
        mk("payload_mass", "mass", "3 kg", "Payload mass with its inner packaging"),
        mk("payload_specific_heat", "specific_heat", "3500 J/(kg·K)", "Mean payload specific heat"),
        mk(
            "t_payload_min",
            "temperature",
            "2 °C",
            "Lowest allowed payload temperature",
            required=False,
        ),
        mk(
            "t_payload_max",
            "temperature",
            "8 °C",
            "Highest allowed payload temperature",
            required=False,
        ),
        mk("t_payload_start", "temperature", "5 °C", "Payload temperature when packed"),
        mk(
            "t_ambient",
            "temperature",
            "25 °C",
            "Ambient temperature (constant), or give ambient_profile instead",
            required=False,
        ),
        mk(
            "ambient_profile",
            "profile",
            None,
            'Ambient step profile instead: [["0 h", "25 °C"], ["12 h", "30 °C"], ...], '
            'or a temperature logger\'s CSV: { file = "route.csv" } (heatpath records its sha256)',
            required=False,
        ),
        mk(
            "ambient_profiles",
            "profiles",
            None,
            "Several named ambient profiles instead, each a step list or a logger file: "
            '{ summer = { file = "summer.csv" }, winter = { file = "winter.csv" } }; '
            "a design passes only if it holds under every one",
            required=False,
        ),
        mk("duration", "time", "48 h", "Required hold time"),
        mk(
            "thicknesses",
            "thickness_list",
            ["10 mm", "20 mm", "30 mm", "40 mm", "50 mm", "60 mm", "80 mm", "100 mm"],
            "Sized-layer thicknesses to sweep",
        ),
        mk(
            "safety_factor",
            "dimensionless",
            1.2,
            "Multiplier on the sized coolant mass (>= 1)",
            bounds=(1.0, None),
        ),
        mk(
            "coolant_packing_fraction",
            "dimensionless",
            0.8,
            "Share of the coolant space filled by coolant (0.001 to 1)",
            bounds=(1e-3, 1.0),
        ),
        mk(
            "t_coolant_start",
            "temperature",
            None,
            "Coolant temperature when packed (default: at its phase change)",
            required=False,
        ),
        mk("r_si", "resistance", "0.13 m²·K/W", "Inside surface resistance"),
        mk("r_se", "resistance", "0.13 m²·K/W", "Outside surface resistance"),
        mk(
            "coupling_coefficient",
            "heat_transfer_coefficient",
            "5 W/(m²·K)",
            "Payload-to-coolant heat-transfer coefficient",
        ),
        mk(
            "coolant_wall_fraction",
            "dimensionless",
            0.8,
            "Share of the box conductance reaching the coolant directly (0 to 1)",
            bounds=units.FRACTION,
        ),
        mk(
            "divisor",
            "volume_per_mass",
            "5000 cm³/kg",
            "Dimensional-weight divisor of the contract",
        ),
        mk("mass_increment", "mass", "0.5 kg", "Carrier's rounding step for billable mass"),
        mk("rate_per_kg", "cost_per_mass", "1.5 EUR/kg", "Freight rate per billable kg (demo)"),
        mk("fixed_fee", "money", "5 EUR", "Fixed freight charge per shipment (demo)"),
        mk("time_step", "time", "300 s", "Time step of the hold simulation"),
    )
    money = None
    return StudyKind(
        name="shipper",
        title="Insulated shipper",
        job=(
            "Choose the wall build-up and insulation thickness of an insulated shipper that keeps "
            "its payload within range for the whole trip at the lowest landed cost per shipment: "
            "coolant sized for the hold time, box and billable mass, packaging, coolant and "
            "freight cost, each design checked by a time-stepped simulation."
        ),
        inputs=inputs,
        column_kinds=MappingProxyType(
            {
                "thickness": "thickness",
                "wall_thickness": "thickness",
                "conductance": "conductance",
                "coolant_mass": "mass",
                "coolant_layer": "thickness",
                "outer_length": "length",
                "outer_width": "length",
                "outer_height": "length",
                "outer_volume": "volume",
                "wall_mass": "mass",
                "actual_mass": "mass",
                "dimensional_mass": "mass",
                "billable_mass": "mass",
                "packaging_cost": money,
                "coolant_cost": money,
                "freight_cost": money,
                "landed_cost": money,
                "hold_time_closed_form": "time",
                "hold_time_simulated": "time",
                "time_coolant_spent": "time",
                "time_out_of_range": "time",
                "min_payload_temperature": "temperature",
                "max_payload_temperature": "temperature",
            }
        ),
        flag_columns=("meets_target",),
        build=build,
        read_back=read_back,
        default_criteria=(
            CriterionSpec("landed_cost", "minimise", 2.0),
            CriterionSpec("actual_mass", "minimise", 1.0),
            CriterionSpec("outer_volume", "minimise", 1.0),
        ),
        formula_sources=("fourier", "iso6946-2017", "incropera7"),
        property_sources=("conductivity_source", "density_source", "cost_source"),
        cautions=(
            "Medicines and other temperature-sensitive goods: a shipper is qualified by testing "
            "(thermal chamber and field trials) under the applicable distribution rules before use; "
            "this estimate does not qualify a shipper.",
            "Dry ice (solid CO2) sublimes to gas: never seal it gas-tight, ventilate vehicles and "
            "rooms (asphyxiation risk), handle it with insulated gloves; it is dangerous goods for "
            "air transport (UN 1845, Class 9: from common knowledge of the IATA rules; check the "
            "carrier's current rules).",
            "Foam boxes (EPS, PUR) burn; their fire behaviour in storage and transport is set by "
            "local codes and carriers' rules, not by this comparison.",
        ),
        starter_candidates=("eps_20", "pir_32", "epp_45"),
        check_candidates=check,
        study_type=ShipperStudy,
        results=results,
        candidate_name=lambda c: to_candidate(c).name,
    )


def _layers_name(layers: Sequence[Any]) -> str:
    parts = []
    for x in layers:
        if isinstance(x, Mapping):
            parts.append(
                str(x.get("material") or x.get("name") or ("air" if "air_layer" in x else "vip"))
            )
    return "/".join(parts)


# ---------------------------------------------------------------------------
# The housing kind
# ---------------------------------------------------------------------------
_HOUSING_KEYS = ("material", "thickness", "finish", "name")


def _housing_kind() -> StudyKind:
    from workbench.housing import MOUNTINGS
    from workbench.studies.housing import Component, HousingCandidate, HousingStudy, load_finishes

    finishes = load_finishes()

    def to_candidate(c: Mapping) -> HousingCandidate:
        return HousingCandidate(
            c["material"],
            _quantity(c["thickness"], "thickness", "thickness"),
            c.get("finish"),
            c.get("name"),
        )

    def build(scenario: Scenario, x: dict, materials, curves):
        comp = None
        parts = ("component_length", "component_width", "component_power")
        given = [k for k in parts if x.get(k) is not None]
        if given and len(given) < 3:
            missing = [k for k in parts if k not in given]
            raise ValueError(
                f"{missing[0]}: missing; a component needs all of {', '.join(parts)} "
                f"(given: {', '.join(given)})"
            )
        if x.get("component_power") is not None:
            comp = Component(x["component_length"], x["component_width"], x["component_power"])
        kw = {}
        if x.get("h_inside") is not None:
            kw["h_inside"] = x["h_inside"]
        if x.get("session_duration") is not None:
            kw["session_duration"] = x["session_duration"]
        if x.get("content_heat_capacity") is not None:
            kw["content_heat_capacity"] = x["content_heat_capacity"]
        return HousingStudy(
            [to_candidate(c) for c in scenario.candidates],
            materials,
            length=x["length"],
            width=x["width"],
            height=x["height"],
            power=x["power"],
            t_ambient=x["t_ambient"],
            mounting=x["mounting"],
            t_inside_max=x.get("t_inside_max"),
            component=comp,
            contact_duration=x["contact_duration"],
            **kw,
        )

    def read_back(study) -> tuple[dict, tuple]:
        inputs: dict[str, Any] = {
            "length": _si_text(study.length, "m"),
            "width": _si_text(study.width, "m"),
            "height": _si_text(study.height, "m"),
            "power": _si_text(study.power, "W"),
            "t_ambient": _si_text(study.t_ambient, "K"),
            "mounting": study.mounting,
            "contact_duration": _si_text(study.contact_duration, "s"),
        }
        if study.t_inside_max is not None:
            inputs["t_inside_max"] = _si_text(study.t_inside_max, "K")
        if study.component is not None:
            inputs["component_length"] = _si_text(study.component.length, "m")
            inputs["component_width"] = _si_text(study.component.width, "m")
            inputs["component_power"] = _si_text(study.component.power, "W")
        if study.h_inside is not None:
            inputs["h_inside"] = _si_text(study.h_inside, "W/(m^2*K)")
        inputs["session_duration"] = _si_text(study.session_duration, "s")
        inputs["content_heat_capacity"] = _si_text(study.content_heat_capacity, "J/K")
        cands = []
        for c in study.candidates:
            d: dict[str, Any] = {"material": c.material, "thickness": _si_text(c.thickness, "m")}
            if c.finish is not None:
                d["finish"] = c.finish
            if c.name:
                d["name"] = c.name
            cands.append(d)
        return inputs, tuple(cands)

    def check(cands: Sequence[Any], materials) -> list[tuple[int, str, str]]:
        problems: list = []
        known = set(materials.index)
        names = []
        for i, c in enumerate(cands):
            if not isinstance(c, Mapping):
                problems.append(
                    (i, "", 'expected { material = "id", thickness = "2 mm", finish = "id" }')
                )
                continue
            for k in c:
                if k not in _HOUSING_KEYS:
                    problems.append((i, k, _unknown_key_why(k, _HOUSING_KEYS)))
            mid = c.get("material")
            if not isinstance(mid, str):
                problems.append((i, "material", "missing material id"))
                continue
            if mid not in known:
                problems.append(
                    (i, "material", f"unknown material id {mid!r}; see 'heatpath materials list'")
                )
            if "thickness" not in c:
                problems.append((i, "thickness", 'missing wall thickness, e.g. "2 mm"'))
            else:
                _collect(
                    problems,
                    i,
                    "thickness",
                    lambda c=c: _quantity(c["thickness"], "thickness", "thickness"),
                )
            fin = c.get("finish")
            if fin is not None and fin not in finishes.index:
                problems.append(
                    (i, "finish", f"unknown finish {fin!r}; valid: {', '.join(finishes.index)}")
                )
            names.append(str(c.get("name") or f"{mid} {c.get('thickness')} {fin or 'as-is'}"))
        _duplicates(names, problems)
        return problems

    def results(study):
        frame = study.results()
        frame = frame.drop(columns=[c for c in frame.columns if c.endswith("_degC")])
        return frame, frame

    mk = InputSpec
    return StudyKind(
        name="housing",
        title="Device housing",
        job=(
            "Choose the wall material, thickness and finish of a sealed device housing that "
            "dissipates a power inside: will the inside air stay below its limit, and is the "
            "outside (including the hot spot over a component bonded to the wall) safe to touch?"
        ),
        inputs=(
            mk("length", "length", "200 mm", "Outer length"),
            mk("width", "length", "120 mm", "Outer width"),
            mk("height", "length", "60 mm", "Outer height (vertical)"),
            mk("power", "power", "8 W", "Power dissipated inside"),
            mk("t_ambient", "temperature", "25 °C", "Room temperature"),
            mk("mounting", "choice", "on-table", "How it is mounted", choices=tuple(MOUNTINGS)),
            mk(
                "t_inside_max",
                "temperature",
                "60 °C",
                "Highest allowed inside air temperature",
                required=False,
            ),
            mk(
                "component_length",
                "length",
                None,
                "Footprint length of a component bonded to the wall",
                required=False,
            ),
            mk(
                "component_width",
                "length",
                None,
                "Footprint width of that component",
                required=False,
            ),
            mk("component_power", "power", None, "Power of that component", required=False),
            mk("contact_duration", "time", "10 min", "How long a user touches the housing"),
            mk(
                "h_inside",
                "heat_transfer_coefficient",
                None,
                "Inside convective coefficient (default: correlations)",
                required=False,
            ),
            mk(
                "session_duration",
                "time",
                "20 min",
                "Length of a use session for the warm-up from room temperature (default 20 min)",
                required=False,
                bounds=(1.0, 7 * 86400.0),
            ),
            mk(
                "content_heat_capacity",
                "heat_capacity",
                "100 J/K",
                "Heat capacity of the contents (boards, battery, brackets) for the warm-up; "
                "the wall's own is added (default 100 J/K)",
                required=False,
            ),
        ),
        column_kinds=MappingProxyType(
            {
                "thickness": "thickness",
                "emissivity": None,
                "conductivity": "conductivity",
                "t_air_inside": "temperature",
                "t_wall_inside": "temperature",
                "t_surface": "temperature",
                "t_hot_spot": "temperature",
                "hot_spot_rise": "temperature_difference",
                "spreading_length": "length",
                "biot_number": None,
                "h_convection": "heat_transfer_coefficient",
                "h_radiation": "heat_transfer_coefficient",
                "radiation_share": None,
                "dt_surface_d_emissivity": "temperature_difference",
                "mass": "mass",
                "cost": None,
                "heat_capacity": "heat_capacity",
                "t_surface_session_end": "temperature",
                "time_to_touch_limit": "time",
                "touch_limit": "temperature",
                "margin_surface": "temperature_difference",
                "margin_hot_spot": "temperature_difference",
            }
        ),
        flag_columns=("passes", "pareto"),
        build=build,
        read_back=read_back,
        default_criteria=(
            CriterionSpec("t_hot_spot", "minimise", 2.0),
            CriterionSpec("mass", "minimise", 1.0),
            CriterionSpec("cost", "minimise", 1.0),
        ),
        formula_sources=("fourier", "churchill-chu-1975", "incropera7", "iso13732-1-2006"),
        property_sources=(
            "conductivity_source",
            "density_source",
            "t_service_source",
            "cost_source",
        ),
        cautions=(
            "Touch temperatures: the shipped limits are skin burn thresholds (ISO 13732-1) for "
            "healthy adults; the limits that apply to a product come from its product safety "
            "standard, and surface temperatures must be measured on the product under the worst "
            "intended use.",
            "Plastic housings burn; their flammability rating and the fire enclosure rules of the "
            "applicable product standard decide, not this comparison.",
        ),
        starter_candidates=(
            {"material": "abs", "thickness": "2.5 mm"},
            {"material": "aluminium_6063_t6_anodised", "thickness": "2 mm"},
        ),
        check_candidates=check,
        study_type=HousingStudy,
        results=results,
        candidate_name=lambda c: to_candidate(c).label,
    )


register_study_kind("shipper", _shipper_kind)
register_study_kind("housing", _housing_kind)
