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

This module holds the file-level steps (text in and out, migration, saving,
loading, study <-> scenario, autosave); their parts live in small modules and
every public name is re-exported here: :mod:`workbench.studykind` (kinds and
their registry), ``_scenario_objects`` (the dataclasses), ``_scenario_problems``
(errors and typed reads), ``_scenario_tables`` (candidates, criteria,
constraints, decision), ``_scenario_inputs`` (inputs with units),
``_scenario_materials`` (the user's materials), ``_scenario_checks``
(currencies, constraint limits), ``_scenario_limits`` (work limits),
``_scenario_keys`` (key reference and starter files), ``_tomlwrite``,
``_tomlpos`` and ``_files``.
"""

from __future__ import annotations

import hashlib
import os
import re
import tomllib
from collections.abc import Callable, Mapping, Sequence
from dataclasses import replace
from pathlib import Path
from typing import Any

from workbench import units

# The parts of this layer live in small modules; every name that code elsewhere
# imports from here is re-exported (noqa: F401).
from workbench._files import (  # noqa: F401
    _atomic_write,
    _file_mode,
    _replace_bytes,
    _resolve_path,
    check_output_path,
    file_sha256,
)
from workbench._scenario_checks import (  # noqa: F401
    _check_money,
    _path_for_message,
    constraint_limit,
)
from workbench._scenario_inputs import (  # noqa: F401
    _check_inputs,
    _money,
    _parse_input,
    _quantity,
    _si_text,
)
from workbench._scenario_limits import (  # noqa: F401
    DEFAULT_LIMITS,
    _check_work,
    _limit_why,
    _limits_of,
    _read_limits,
)
from workbench._scenario_materials import (  # noqa: F401
    _check_against_materials,
    _pin,
    _read_materials,
    materials_for,
)
from workbench._scenario_objects import (
    FORMAT,
    FORMAT_VERSION,
    ConstraintSpec,
    CriterionSpec,
    Decision,
    MaterialsSource,
    Scenario,
)
from workbench._scenario_problems import (  # noqa: F401
    ScenarioError,
    _describe,
    _get,
    _Problems,
    _undotted,
    _unknown_key_why,
    _unknown_keys,
)
from workbench._scenario_tables import (
    _read_candidates,
    _read_constraints,
    _read_criteria,
    _read_decision,
)
from workbench._tomlpos import (  # noqa: F401
    _dotted,
    _key_at_line,
    _line_of,
    _locate,
    _positions,
)
from workbench._tomlwrite import _inline, _value, dumps_toml  # noqa: F401
from workbench.studykind import (  # noqa: F401
    _BUILTIN_KINDS,
    STUDY_KINDS,
    InputSpec,
    StudyKind,
    _kind_of,
    available_kinds,
    register_study_kind,
    study_kind,
    unregister_study_kind,
)

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
    "unregister_study_kind",
    "available_kinds",
    "scenario_keys_text",
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


# ---------------------------------------------------------------------------
# Scenario -> TOML text
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


# ---------------------------------------------------------------------------
# Reading
# ---------------------------------------------------------------------------
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
    candidates = _read_candidates(data, p, lim)
    inputs = dict(raw_inputs or {})
    if kind is not None and isinstance(raw_inputs, dict) and "inputs" in data:
        _check_inputs(kind, inputs, p, lim, base_dir)
    materials = _read_materials(data.get("materials"), p, base_dir)
    criteria = _read_criteria(data, kind, p)
    constraints = _read_constraints(data, kind, p)
    decision = _read_decision(data, p)
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


# ---------------------------------------------------------------------------
# Saving and loading
# ---------------------------------------------------------------------------
def _check_scenario_object(s: Scenario) -> None:
    if not isinstance(s, Scenario):
        raise TypeError(f"scenario: expected a Scenario, got {type(s).__name__}")


def _pin_profile_files(scenario: Scenario) -> Scenario:
    """Record the sha256 of every logger file a profile input names (where not yet recorded)."""

    def pinned(prof):
        if isinstance(prof, Mapping) and "file" in prof and "sha256" not in prof:
            target = _resolve_path(str(prof["file"]), scenario.base_dir)
            if target.is_file():
                return {**prof, "sha256": file_sha256(target)}
        return prof

    try:
        specs = study_kind(scenario.kind).inputs
    except (ValueError, ImportError):
        return scenario  # reading the text back names the unknown kind
    inputs = dict(scenario.inputs)
    for spec in specs:
        if spec.kind == "profile" and spec.name in inputs:
            inputs[spec.name] = pinned(inputs[spec.name])
        elif spec.kind == "profiles" and isinstance(inputs.get(spec.name), Mapping):
            inputs[spec.name] = {k: pinned(v) for k, v in inputs[spec.name].items()}
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
# Starter files and the key reference
# ---------------------------------------------------------------------------
def starter_text(kind_name: str) -> str:
    """A commented starter scenario for ``kind_name`` that loads as it is (demo values).

    Examples
    --------
    >>> s = scenario_from_text(starter_text("wall"))
    >>> s.kind
    'wall'
    """
    from workbench._scenario_keys import starter_text as text

    return text(kind_name)


def scenario_keys_text(kind_name: str | None = None, fmt: str = "text") -> str:
    """The key reference of a kind's scenario files (every built-in kind when None).

    Generated from the kinds' declarations: the generic keys, then per kind its
    candidate forms, inputs (quantity kind, SI unit, default, bounds, meaning),
    results columns and yes/no columns. ``fmt``: ``"text"`` or ``"markdown"``
    (``docs/scenario-keys.md``). ``heatpath scenario keys KIND`` prints it.

    Examples
    --------
    >>> "coolant" in scenario_keys_text("shipper")
    True
    """
    from workbench._scenario_keys import keys_text

    return keys_text(kind_name, fmt)


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
