"""The scenario objects: what a scenario file holds, as frozen dataclasses.

:mod:`workbench.scenario` reads and writes them (the file format is described
there) and re-exports every name; import them from there.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

__all__ = ["MaterialsSource", "CriterionSpec", "ConstraintSpec", "Decision", "Scenario"]


FORMAT = "heatpath-scenario"
"""Value of the ``format`` key that marks a scenario file."""

FORMAT_VERSION = 1
"""Current format version; older versions load through :func:`workbench.scenario.migrate`."""


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
        self,
        chosen: str,
        rationale: str = "",
        decided_by: str = "",
        date: str = "",
        attendees: str = "",
    ) -> Scenario:
        """A copy with the decision set."""
        return replace(self, decision=Decision(chosen, rationale, decided_by, date, attendees))
