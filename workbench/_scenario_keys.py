"""The scenario-file key reference and starter files, generated from the kinds' declarations.

``heatpath scenario keys KIND`` prints the reference; ``docs/scenario-keys.md`` is
the same text for every built-in kind (:func:`keys_text` with ``kind_name=None``),
and a test checks that the committed page equals the generated one.
``heatpath scenario new KIND`` writes :func:`starter_text`, a commented scenario
file with the kind's demo values.
"""

from __future__ import annotations

from typing import Any

from workbench import units
from workbench._scenario_inputs import _starter_value
from workbench._scenario_objects import FORMAT, FORMAT_VERSION
from workbench._tomlwrite import _value
from workbench.studykind import _BUILTIN_KINDS, study_kind

__all__ = ["keys_text", "starter_text", "GENERIC_KEYS"]

#: Top-level keys every scenario file may hold (key, meaning).
GENERIC_KEYS: tuple[tuple[str, str], ...] = (
    ("format", 'fixed marker "heatpath-scenario"'),
    ("version", "format version (1; older files are migrated on load)"),
    ("kind", "the job kind (below)"),
    ("title", "readable title (text)"),
    ("display_system", '"SI" or "US": units shown in reports (inputs take any unit)'),
    ("notes", "free text"),
    ("candidates", "what to compare: a list of the kind's candidate forms (below)"),
    ("inputs", "table of the kind's inputs (below); quantities as text with a unit"),
    ("materials", "optional: the user's materials, path = a CSV pinned by sha256 "
     "(sources_sha256, kt_sha256 for its companions), or [[materials.rows]] and "
     "[[materials.sources]] inline, columns as tables/materials.csv"),
    ("criteria", "[[criteria]] quantity = a results column, direction = "
     '"minimise" or "maximise", weight >= 0; default: the kind\'s default criteria'),
    ("constraints", '[[constraints]] quantity = a results column with max = "..." or '
     'min = "..." (text with a unit), or a yes/no column with require = true'),
    ("decision", "chosen = a candidate name, rationale, decided_by, attendees, date (YYYY-MM-DD)"),
    ("limits", "optional work limits: max_list_entries, max_candidates, max_sweep_cells"),
)

_SPECIAL_KINDS = {
    "bool": ("true / false", ""),
    "choice": ("one of the choices", ""),
    "text": ("text", ""),
    "budget": ("a heat flux, a power or a U-value", "W/m², W or W/(m²·K)"),
    "money": ("a sum of money", "the scenario's currency"),
    "thickness_list": ("a list of thicknesses", "m"),
    "profile": ('[[time, temperature], ...] steps, or { file = "logger.csv" }', "s, K"),
    "profiles": ("named profiles: { NAME = steps or { file = ... }, ... }", "s, K"),
}


def _quantity_text(qkind: str | None) -> tuple[str, str]:
    """``(what, SI unit)`` of an input or column kind."""
    if qkind is None:
        return "number or sum of money", "-"
    if qkind in _SPECIAL_KINDS:
        return _SPECIAL_KINDS[qkind]
    units.check_kind(qkind)
    return qkind, units.display_unit(qkind, "SI") or "-"


def _default_text(value: Any) -> str:
    if value is None:
        return "(none)"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_default_text(v) for v in value) + "]"
    return f'"{value}"' if isinstance(value, str) else repr(value)


def _bounds_text(bounds) -> str:
    if not bounds:
        return ""
    lo, hi = bounds
    if lo is not None and hi is not None:
        return f"{lo:g} to {hi:g} (SI)"
    return f">= {lo:g} (SI)" if lo is not None else f"<= {hi:g} (SI)"


def _cell(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def _kind_lines(kind, md: bool, label_of) -> list[str]:
    h2, h3 = ("## ", "### ") if md else ("", "")
    out = [f"{h2}kind = \"{kind.name}\": {kind.title}", "", kind.job, ""]
    out += [f"{h3}candidates", ""]
    forms = kind.candidate_forms or ('"material_id": a material id (heatpath materials list)',)
    out += [f"- {f}" if md else f"  {f}" for f in forms] + [""]
    out += [f"{h3}[inputs]", ""]
    rows = []
    for spec in kind.inputs:
        what, unit = _quantity_text(spec.kind)
        extra = []
        if spec.choices:
            extra.append("choices: " + ", ".join(spec.choices))
        if spec.bounds:
            extra.append("bounds: " + _bounds_text(spec.bounds))
        rows.append((
            spec.name, spec.title, what, unit, _default_text(spec.default),
            "yes" if spec.required else "no", "; ".join([spec.doc, *extra]),
        ))
    out += _table(("key", "label", "quantity", "unit (SI display)", "default", "required", "meaning"),
                  rows, md)
    out += ["", f"{h3}results columns (criteria and constraints: max / min)", ""]
    rows = []
    for col, qkind in kind.column_kinds.items():
        what, unit = _quantity_text(qkind)
        rows.append((col, label_of(col, kind), what, unit))
    out += _table(("column", "label", "quantity", "unit (SI display)"), rows, md)
    out += ["", f"{h3}yes/no columns (constraints: require = true)", ""]
    out += [("- " if md else "  ") + f"{c}: {label_of(c, kind)}" for c in kind.flag_columns]
    out += ["", f"{h3}default criteria", ""]
    out += [("- " if md else "  ") + f"{c.quantity}: {c.direction}, weight {c.weight:g}"
            for c in kind.default_criteria]
    return out + [""]


def _table(head: tuple[str, ...], rows: list[tuple], md: bool) -> list[str]:
    if md:
        lines = ["| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
        return lines + ["| " + " | ".join(_cell(c) for c in r) + " |" for r in rows]
    width = [max(len(str(x)) for x in col) for col in zip(head, *rows, strict=False)]
    width[-1] = 0  # the last column (meaning) is not padded
    fmt = "  ".join(f"{{:<{w}}}" for w in width)
    return [fmt.format(*head).rstrip()] + [fmt.format(*map(str, r)).rstrip() for r in rows]


def keys_text(kind_name: str | None = None, fmt: str = "text") -> str:
    """Every key a scenario file of ``kind_name`` may hold (all built-in kinds when None).

    ``fmt`` is ``"text"`` (for a terminal) or ``"markdown"`` (the docs page).

    Examples
    --------
    >>> text = keys_text("wall")
    >>> "t_inside" in text and "total_thickness" in text
    True
    >>> keys_text("wall", fmt="html")
    Traceback (most recent call last):
    ...
    ValueError: format: expected 'text' or 'markdown', got 'html'
    """
    from workbench.studykind import column_label as _label

    if fmt not in ("text", "markdown"):
        raise ValueError(f"format: expected 'text' or 'markdown', got {fmt!r}")
    md = fmt == "markdown"
    names = list(_BUILTIN_KINDS) if kind_name is None else [study_kind(kind_name).name]
    title = "Scenario file keys" + ("" if kind_name is None else f": {kind_name}")
    out = [("# " if md else "") + title, ""]
    out += [
        "Generated from the study kinds' declarations by `heatpath scenario keys KIND` "
        "(do not edit by hand). Quantities are text with a unit, e.g. \"25 mm\", \"4 °C\", "
        "\"0.25 W/(m²·K)\"; any unit of the right dimension is accepted.",
        "",
        ("## " if md else "") + "Keys of every scenario file",
        "",
    ]
    out += _table(("key", "meaning"), list(GENERIC_KEYS), md) + [""]
    for name in names:
        out += _kind_lines(study_kind(name), md, _label)
    return "\n".join(out).rstrip() + "\n"


def starter_text(kind_name: str) -> str:
    """A commented starter scenario for ``kind_name`` that loads as it is (demo values).

    Examples
    --------
    >>> from workbench.scenario import scenario_from_text
    >>> scenario_from_text(starter_text("wall")).kind
    'wall'
    """
    kind = study_kind(kind_name)
    out = [
        f"# heatpath scenario: {kind.title} -- starter file with DEMO values; edit every line.",
        f"# Every key: heatpath scenario keys {kind.name}. Quantities are text with a unit:",
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
