"""The user's materials of a scenario: a CSV file pinned by its hash, or rows inline.

:func:`_read_materials` reads the ``[materials]`` table and checks the pinned
hashes; :func:`materials_for` (re-exported by :mod:`workbench.scenario`) merges
the user's materials with the curated table; :func:`_check_against_materials`
checks a scenario's material ids, inline rows and currencies against that
merged table; :func:`_renamed_ids` replaces renamed material ids with a warning.
"""

from __future__ import annotations

import csv
import re
import tempfile
from pathlib import Path
from typing import TYPE_CHECKING, Any

from workbench import units
from workbench._files import _resolve_path, file_sha256
from workbench._scenario_checks import _check_money
from workbench._scenario_objects import MaterialsSource, Scenario
from workbench._scenario_problems import (
    ScenarioError,
    _describe,
    _get,
    _Problems,
    _undotted,
    _unknown_keys,
)
from workbench._tomlpos import _line_of

if TYPE_CHECKING:
    from workbench.studykind import StudyKind

__all__ = ["materials_for"]

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


def _pin(target: Path) -> dict[str, str]:
    out = {"sha256": file_sha256(target)}
    for suffix, key in (("sources", "sources_sha256"), ("kt", "kt_sha256")):
        side = target.with_name(f"{target.stem}.{suffix}{target.suffix}")
        if side.is_file():
            out[key] = file_sha256(side)
    return out


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
            if (
                isinstance(lay, dict)
                and isinstance(lay.get("material"), str)
                and lay["material"] in DEPRECATED_IDS
            ):
                lay = {
                    **lay,
                    "material": resolve_material_id(
                        lay["material"], where=where(("layers", j, "material"))
                    ),
                }
            layers.append(lay)
        out["layers"] = layers
    return out
