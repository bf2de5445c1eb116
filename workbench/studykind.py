"""Study kinds: how a job kind plugs into scenario files, reports and the command line.

A :class:`StudyKind` declares a kind's inputs (:class:`InputSpec`), how to
build its study from a scenario and read the inputs back, and the columns its
results carry. The registry (:data:`STUDY_KINDS`, :func:`register_study_kind`,
:func:`study_kind`) holds the built-in kinds as factories that import their
study on first use, so importing this module loads no study.
:mod:`workbench.scenario` re-exports every public name.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Any

from workbench._scenario_objects import CriterionSpec

__all__ = [
    "InputSpec",
    "StudyKind",
    "STUDY_KINDS",
    "register_study_kind",
    "unregister_study_kind",
    "study_kind",
    "available_kinds",
    "column_label",
]


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
    label: str = ""

    @property
    def title(self) -> str:
        """The readable label (a panel's field name), else the key itself."""
        return self.label or self.name


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
    candidate_name : callable or None
        ``candidate_name(entry) -> str``: the name a candidate entry gets.
    column_labels : Mapping[str, str]
        Readable names of results columns (reports, the key reference); others
        are derived from the column name.
    flag_reasons : Mapping[str, tuple of str]
        Yes/no column -> text columns that say why a candidate fails it.
    candidate_forms : tuple of str
        The forms a ``candidates`` entry may take, as TOML examples with a
        short explanation (the key reference).
    cost_sources : callable or None
        ``cost_sources(scenario) -> [(currency code, what), ...]``: costs the
        study adds up besides the candidates' materials (all must share one
        currency); ``costs_from`` names them in messages.
    work : callable or None
        ``work(scenario, inputs_si, n_candidates) -> (cells, detail, key path)``
        or None (the study's own checks name the inputs): the cells a study
        evaluates, checked against ``max_sweep_cells``; default one cell per
        candidate.
    candidate_words : tuple of str
        Beginnings of a study error message that concern a candidate.
    message_inputs : Mapping[str, str]
        Beginnings of a study error message -> the input it concerns.
    input_alternatives : Mapping[str, tuple of str]
        Input -> the inputs a scenario may give instead (an error about the
        first is placed at the alternative written in the file).
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
    column_labels: Mapping[str, str] = field(default_factory=dict)
    flag_reasons: Mapping[str, tuple[str, ...]] = field(default_factory=dict)
    candidate_forms: tuple[str, ...] = ()
    cost_sources: Callable[[Any], list[tuple[str, str]]] | None = None
    costs_from: str = "materials"
    work: Callable[..., tuple[float, str, tuple] | None] | None = None
    candidate_words: tuple[str, ...] = ("candidate",)
    message_inputs: Mapping[str, str] = field(default_factory=dict)
    input_alternatives: Mapping[str, tuple[str, ...]] = field(default_factory=dict)

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
    if not isinstance(name, str) or not re.match(r"^[a-z][a-z0-9_]*$", name):
        raise ValueError(f"name: expected a lower-case identifier such as 'wall', got {name!r}")
    _STUDY_KINDS[name] = kind


def unregister_study_kind(name: str) -> None:
    """Remove a registered job kind (e.g. one a test added); unknown names raise."""
    if name not in _STUDY_KINDS:
        raise ValueError(f"kind: unknown {name!r}; valid kinds: {list(_STUDY_KINDS)}")
    del _STUDY_KINDS[name]


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


#: The built-in kinds: name -> module whose ``study_kind()`` declares it (imported on first use,
#: so that importing this module or ``workbench.scenario`` loads no study). A new built-in
#: kind adds one line here.
_BUILTIN_KINDS = {
    "wall": "workbench.studies.wall.kind",
    "shipper": "workbench.studies.shipper.kind",
    "housing": "workbench.studies.housing.kind",
}


def _lazy_kind(module: str) -> Callable[[], StudyKind]:
    def factory() -> StudyKind:
        import importlib

        return importlib.import_module(module).study_kind()

    return factory


for _name, _module in _BUILTIN_KINDS.items():
    register_study_kind(_name, _lazy_kind(_module))


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


def _candidate_name(c: Any) -> str:
    if isinstance(c, str):
        return c
    return str(c.get("name") or c.get("material") or "")


#: Readable names of the ranking's own columns (every kind); a kind's ``column_labels`` add its own.
_RANKING_LABELS = {"pareto": "Pareto-optimal"}


def column_label(col: str, kind: StudyKind | None = None) -> str:
    """A readable column name: the kind's label, else derived from the column name.

    Examples
    --------
    >>> column_label("t_surface_inside"), column_label("u_value"), column_label("pareto")
    ('Surface temperature inside', 'U-value', 'Pareto-optimal')
    """
    if kind is not None and col in kind.column_labels:
        return kind.column_labels[col]
    if col in _RANKING_LABELS:
        return _RANKING_LABELS[col]
    if col.startswith("t_") and col not in ("t_surface_inside", "t_surface_outside"):
        col = col[2:] + "_temperature"
    text = col.replace("_", " ")
    for a, b in (("t surface", "surface temperature"), ("u value", "U-value"), ("degC", "°C")):
        text = text.replace(a, b)
    return text[:1].upper() + text[1:]

