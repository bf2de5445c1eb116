"""Work limits of a scenario: checked before anything is computed.

:data:`DEFAULT_LIMITS` (re-exported by :mod:`workbench.scenario`) and a
scenario's ``[limits]`` table; the message of a refused study names the key,
the count, how to coarsen and how to raise the limit deliberately.
"""

from __future__ import annotations

from collections.abc import Mapping
from types import MappingProxyType
from typing import TYPE_CHECKING, Any

from workbench._scenario_problems import _describe, _Problems, _unknown_keys

if TYPE_CHECKING:
    from workbench._scenario_objects import Scenario
    from workbench.studykind import StudyKind

__all__ = ["DEFAULT_LIMITS"]

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


def _check_work(
    s: Scenario, kind: StudyKind, x: Mapping[str, Any], limits: Mapping[str, int], p: _Problems
) -> None:
    """Refuse, before computing, a study larger than ``limits["max_sweep_cells"]``."""
    n_cand = len(s.candidates)
    if kind.work is None:
        cells, detail, path = n_cand, f"{n_cand} candidates", ("candidates",)
    else:
        got = kind.work(s, x, n_cand)
        if got is None:
            return  # the study's own checks name the inputs concerned
        cells, detail, path = got
    if cells > limits["max_sweep_cells"]:
        p.add(path, _limit_why(cells, "cells", "max_sweep_cells", limits) + f" [{detail}]")
