"""Curated material property tables and users' own materials files.

This module is the file boundary for material data: it reads the curated
tables shipped with the package (``tables/`` in a source checkout,
``workbench/_tables/`` inside an installed wheel), checks every value, converts
values given in other units to SI and returns one :class:`pandas.DataFrame`
with one row per material. The numeric core never imports it; studies pass
plain SI columns from the frame to the core.

Files
-----
``materials.csv``
    One row per material; every numeric value has its own ``<property>_source``
    cell holding a key of ``sources.csv`` or one of the markers
    ``common-practice``, ``from-memory``, ``demo``.
``sources.csv``
    ``key, citation, locator, kind, note``: what each key refers to.
``kt.csv``
    ``id, temperature, conductivity, source``: conductivity against
    temperature where a source tabulates it.

The columns, units and markers are described in ``tables/README.md``.

A user's dataset
----------------
A user file ``NAME.csv`` has the same columns as ``materials.csv`` (only
``id``, ``name``, ``family``, ``conductivity``, ``density`` and
``specific_heat`` are required) and may carry a unit in a numeric column's
header, e.g. ``conductivity [Btu*in/(h*ft^2*degF)]``; it is converted with
:func:`workbench.units.to_si`. Two optional companion files sit beside it:
``NAME.sources.csv`` (same columns as ``sources.csv``; new keys the user file
cites) and ``NAME.kt.csv`` (same columns as ``kt.csv``). A ``source`` column
may hold a free-text citation for every value of its row whose own
``<property>_source`` cell is empty; the ``<property>_source`` cells themselves
must hold known keys or markers (so that a typo in a key is caught).

Precedence: a user row **replaces** the curated row with the same ``id`` as a
whole (no column-by-column mixing); rows with new ids are added. A user k(T)
curve replaces the curated curve of the same id.

Renamed ids: :data:`DEPRECATED_IDS` maps old curated ids to new ones;
code that reads material ids from users' files (scenario loaders, candidate
lists) passes each id through :func:`resolve_material_id`, which returns the
new id and emits a :class:`DeprecatedMaterialIdWarning` naming it.

Every problem in a file is reported as ``file:row:column: why`` (``row`` is
the line number in the file, the header being line 1), all problems at once,
in a :class:`MaterialsFileError`; nothing is loaded when there is any problem.
"""

from __future__ import annotations

import functools
import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, field
from importlib import resources
from pathlib import Path
from types import MappingProxyType
from typing import TYPE_CHECKING

import numpy as np

from workbench._csvtext import CsvSyntaxError, csv_rows

if TYPE_CHECKING:  # pandas is imported inside the functions that build frames
    import pandas as pd

__all__ = [
    "FAMILIES",
    "PLAUSIBILITY_BANDS",
    "MARKERS",
    "MaterialsFileError",
    "DEPRECATED_IDS",
    "DeprecatedMaterialIdWarning",
    "resolve_material_id",
    "load_materials",
    "load_sources",
    "load_conductivity_curves",
    "conductivity_curve_sources",
    "check_materials_file",
    "tables_dir",
    "FRAME_COLUMNS",
]

FAMILIES: Mapping[str, str] = MappingProxyType(
    {
        "metal": "Metals and alloys",
        "polymer": "Solid polymers and rubbers",
        "polymer_conductive": "Thermally conductive filled polymers",
        "rigid_foam": "Rigid and semi-rigid foams",
        "fibrous": "Fibrous insulation",
        "high_performance": "High-performance insulation (vacuum panels, aerogel, microporous)",
        "wood_panel": "Wood, wood-based panels, cork and paper board",
        "glass_ceramic": "Glass and technical ceramics",
        "masonry_concrete": "Masonry, concrete, plaster and stone",
        "gas": "Gases (still, at 1 atm)",
    }
)
"""Material family id -> readable label."""

PLAUSIBILITY_BANDS: Mapping[str, Mapping[str, tuple[float, float]]] = MappingProxyType(
    {
        # family: conductivity [W/(m·K)], density [kg/m³], specific_heat [J/(kg·K)]
        "metal": {
            "conductivity": (5.0, 430.0),
            "density": (1500.0, 11500.0),
            "specific_heat": (100.0, 1200.0),
        },
        "polymer": {
            "conductivity": (0.1, 0.6),
            "density": (800.0, 2300.0),
            "specific_heat": (800.0, 2500.0),
        },
        "polymer_conductive": {
            "conductivity": (0.5, 25.0),
            "density": (1000.0, 2500.0),
            "specific_heat": (700.0, 2000.0),
        },
        "rigid_foam": {
            "conductivity": (0.018, 0.06),
            "density": (8.0, 200.0),
            "specific_heat": (800.0, 2500.0),
        },
        "fibrous": {
            "conductivity": (0.025, 0.07),
            "density": (5.0, 300.0),
            "specific_heat": (500.0, 2200.0),
        },
        "high_performance": {
            "conductivity": (0.002, 0.025),
            "density": (50.0, 500.0),
            "specific_heat": (500.0, 1500.0),
        },
        "wood_panel": {
            "conductivity": (0.035, 0.3),
            "density": (80.0, 1100.0),
            "specific_heat": (1200.0, 2500.0),
        },
        "glass_ceramic": {
            "conductivity": (0.8, 40.0),
            "density": (2000.0, 4000.0),
            "specific_heat": (600.0, 1100.0),
        },
        "masonry_concrete": {
            "conductivity": (0.08, 3.5),
            "density": (300.0, 2800.0),
            "specific_heat": (700.0, 1200.0),
        },
        "gas": {
            "conductivity": (0.01, 0.03),
            "density": (0.5, 2.5),
            "specific_heat": (300.0, 1100.0),
        },
    }
)
"""Plausibility band (low, high) of each property per family, in SI units.

These bands are common-practice ranges, not a published source: they exist to
catch typing errors (a cork board at 65 W/(m·K), a foam density in g/cm³) in
the curated tables and in users' files. A value outside its family's band is
rejected; a user with a genuinely unusual material chooses the family whose
band fits. The conductivity bands apply to the value at the stated
temperature; k(T) points in ``kt.csv`` may lie within half the lower and
twice the upper bound, because they span a wider temperature range.
"""

KT_BAND_FACTOR = 2.0
"""k(T) points may lie in [low / KT_BAND_FACTOR, high * KT_BAND_FACTOR] of the family band."""

MARKERS: Mapping[str, str] = MappingProxyType(
    {
        "common-practice": "common-practice (typical value from common engineering practice, no single source)",
        "from-memory": "from-memory (recalled, no specific table to cite; check before relying on it)",
        "demo": "demo (invented demonstration value)",
    }
)
"""Source markers allowed in place of a source key -> resolved text."""

DEPRECATED_IDS: Mapping[str, str] = MappingProxyType(
    {
        # renamed in issue 17: a maker's trade mark and a producer's trade name
        # gave way to a generic name and a standard designation
        "pyroceram": "glass_ceramic_cordierite",
        "zinc_zamak3": "zinc_znal4",
        # re-based on a re-read source row of another density class
        "concrete_light_1200": "concrete_light_1280",
    }
)
"""Old curated material id -> current id. Old ids keep working through
:func:`resolve_material_id`, with a :class:`DeprecatedMaterialIdWarning`."""


class DeprecatedMaterialIdWarning(FutureWarning):
    """A material id that was renamed in the curated table was used.

    A :class:`FutureWarning` (shown to end users by default), because the old
    id usually comes from a user's saved scenario file rather than from code.
    """


def resolve_material_id(material_id: str, *, where: str = "") -> str:
    """Current id of a material, mapping a renamed (deprecated) id to its new id.

    Loaders of scenario files, candidate lists and layer specifications call
    this on every material id they read before looking it up in
    :func:`load_materials`; a ``DataFrame.loc`` lookup cannot warn by itself.

    Parameters
    ----------
    material_id : str
        Id as written by the user or a saved file.
    where : str, optional
        Where the id was read (e.g. ``"wall.toml:12:3"``), placed in the
        warning so the user can fix the file.

    Returns
    -------
    str
        ``material_id`` itself, or its new id when it is a deprecated id
        (then a :class:`DeprecatedMaterialIdWarning` naming the new id is
        emitted). Ids that are unknown are returned unchanged; the lookup
        that follows reports them.

    Raises
    ------
    TypeError
        If ``material_id`` is not a string.

    Examples
    --------
    >>> resolve_material_id("eps_20")
    'eps_20'
    >>> import warnings
    >>> with warnings.catch_warnings():
    ...     warnings.simplefilter("ignore", DeprecatedMaterialIdWarning)
    ...     resolve_material_id("zinc_zamak3")
    'zinc_znal4'
    """
    if not isinstance(material_id, str):
        raise TypeError(
            f"material id must be a str (a key of the materials table), got {type(material_id).__name__}"
        )
    new = DEPRECATED_IDS.get(material_id)
    if new is None:
        return material_id
    import warnings

    prefix = f"{where}: " if where else ""
    warnings.warn(
        f"{prefix}material id {material_id!r} is deprecated; it was renamed to {new!r}. "
        f"Replace {material_id!r} by {new!r} in the file; the old id will stop working in a later version.",
        DeprecatedMaterialIdWarning,
        stacklevel=2,
    )
    return new


# property -> (source column, default unit in the curated table, units.KINDS kind)
_NUMERIC: dict[str, tuple[str, str, str]] = {
    "conductivity": ("conductivity_source", "W/(m*K)", "conductivity"),
    "conductivity_temperature": ("conductivity_source", "K", "temperature"),
    "conductivity_tolerance": ("conductivity_tolerance_source", "", "dimensionless"),
    "density": ("density_source", "kg/m^3", "density"),
    "specific_heat": ("specific_heat_source", "J/(kg*K)", "specific_heat"),
    "emissivity": ("emissivity_source", "", "dimensionless"),
    "t_service_min": ("t_service_source", "degC", "temperature"),
    "t_service_max": ("t_service_source", "degC", "temperature"),
    "cost": ("cost_source", "", "cost"),
}
_TEXT = ("id", "name", "family", "emissivity_finish", "cost_basis", "currency", "note")
_SOURCE_COLUMNS = tuple(dict.fromkeys(src for src, _, _ in _NUMERIC.values()))
_CURATED_COLUMNS = (
    "id",
    "name",
    "family",
    "conductivity",
    "conductivity_temperature",
    "conductivity_source",
    "conductivity_tolerance",
    "conductivity_tolerance_source",
    "density",
    "density_source",
    "specific_heat",
    "specific_heat_source",
    "emissivity",
    "emissivity_finish",
    "emissivity_source",
    "t_service_min",
    "t_service_max",
    "t_service_source",
    "cost",
    "cost_basis",
    "currency",
    "cost_source",
    "note",
)
_USER_REQUIRED = ("id", "name", "family", "conductivity", "density", "specific_heat")
_VALID_COLUMNS = (*_CURATED_COLUMNS, "source")
# values that may be blank in the curated table (gases have no surface; costs may be unknown)
_OPTIONAL_CURATED = ("emissivity", "cost")
_COST_BASES = ("per_kg", "per_m3")
_SOURCE_TABLE_COLUMNS = ("key", "citation", "locator", "kind", "note")
_SOURCE_KINDS = ("handbook", "standard", "library", "marker", "datasheet", "measurement", "other")
_KT_COLUMNS = ("id", "temperature", "conductivity", "source")
_ID_PATTERN = re.compile(r"^[a-z][a-z0-9_]*$")
_HEADER_PATTERN = re.compile(r"^\s*([A-Za-z_][A-Za-z0-9_]*)\s*(?:\[(.*)\])?\s*$")
_ABSOLUTE_ZERO_C = -273.15

#: Columns of the frame returned by :func:`load_materials`, in order (index: ``id``).
FRAME_COLUMNS = (
    "name",
    "family",
    "family_label",
    "conductivity",
    "conductivity_temperature",
    "conductivity_tolerance",
    "density",
    "specific_heat",
    "emissivity",
    "emissivity_finish",
    "t_service_min",
    "t_service_max",
    "cost",
    "cost_basis",
    "currency",
    "cost_per_mass",
    "cost_per_volume",
    "note",
    "origin",
)


class MaterialsFileError(ValueError):
    """A materials, sources or k(T) file has problems; nothing was loaded.

    Attributes
    ----------
    problems : list of str
        Every problem found, each ``file:row:column: why``; ``row`` is the
        physical line number in the file (the header is line 1 unless comment
        lines precede it).
    """

    def __init__(self, problems: list[str]):
        self.problems = list(problems)
        shown = "\n  ".join(self.problems[:50])
        more = f"\n  ... and {len(self.problems) - 50} more" if len(self.problems) > 50 else ""
        super().__init__(f"{len(self.problems)} problem(s) in materials data:\n  {shown}{more}")


# ---------------------------------------------------------------------------
# Locating the curated tables
# ---------------------------------------------------------------------------
def _tables_dir(package_dir: Path | None = None, repo_dir: Path | None = None) -> Path:
    """Directory holding the curated tables.

    Tries the package resource ``workbench/_tables`` first (an installed
    wheel), then the repository's ``tables/`` folder (a source checkout or an
    editable install). The arguments exist for tests.
    """
    if package_dir is None:
        try:
            package_dir = Path(str(resources.files("workbench").joinpath("_tables")))
        except (ModuleNotFoundError, TypeError):  # pragma: no cover - namespace oddities
            package_dir = None
    if repo_dir is None:
        repo_dir = Path(__file__).resolve().parent.parent / "tables"
    for candidate in (package_dir, repo_dir):
        if candidate is not None and (candidate / "materials.csv").is_file():
            return candidate
    raise FileNotFoundError(
        f"curated tables not found: looked for materials.csv in {package_dir} and {repo_dir}"
    )


def tables_dir() -> Path:
    """Directory the curated tables are read from (package resource or repo folder)."""
    return _tables_dir()


# ---------------------------------------------------------------------------
# Reading CSV with line numbers
# ---------------------------------------------------------------------------
@dataclass
class _Table:
    path: str
    header: list[str]
    rows: list[tuple[int, list[str]]]  # (line number, cells)
    problems: list[str] = field(default_factory=list)
    header_line: int = 1


def _problem(path: str, row: int | str, column: str, why: str) -> str:
    return f"{path}:{row}:{column}: {why}"


def _read_csv(path: Path) -> _Table:
    """Read a CSV file keeping the line number of every record.

    Blank lines and lines whose first cell starts with ``#`` are skipped.
    """
    name = str(path)
    try:
        text = Path(path).read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        return _Table(name, [], [], [_problem(name, 0, "-", "file not found")])
    except (OSError, UnicodeDecodeError) as exc:
        return _Table(name, [], [], [_problem(name, 0, "-", f"cannot read file ({exc})")])
    try:
        header, header_line, rows = csv_rows(text)
    except CsvSyntaxError as exc:
        return _Table(name, [], [], [_problem(name, exc.line, "-", str(exc))])
    if header is None:
        return _Table(name, [], [], [_problem(name, 1, "-", "empty file: no header row")])
    table = _Table(name, header, rows, header_line=header_line)
    for line, cells in rows:
        if len(cells) != len(header):
            table.problems.append(
                _problem(name, line, "-", f"has {len(cells)} cells, the header has {len(header)}")
            )
    return table


def _split_header(table: _Table, valid: tuple[str, ...]) -> dict[str, tuple[int, str | None]]:
    """Map column name -> (position, unit or None); record header problems."""
    columns: dict[str, tuple[int, str | None]] = {}
    for pos, raw in enumerate(table.header):
        m = _HEADER_PATTERN.match(raw)
        if not m:
            table.problems.append(
                _problem(
                    table.path,
                    table.header_line,
                    raw or f"#{pos + 1}",
                    "unreadable column header; expected name or 'name [unit]'",
                )
            )
            continue
        name, unit = m.group(1), m.group(2)
        if name not in valid:
            table.problems.append(
                _problem(
                    table.path,
                    table.header_line,
                    name,
                    f"unknown column; valid columns: {', '.join(valid)}",
                )
            )
            continue
        if name in columns:
            table.problems.append(
                _problem(table.path, table.header_line, name, "column appears twice")
            )
            continue
        columns[name] = (pos, unit.strip() if unit is not None else None)
    return columns


def _cell(cells: list[str], columns: dict[str, tuple[int, str | None]], name: str) -> str:
    if name not in columns:
        return ""
    pos = columns[name][0]
    return cells[pos] if pos < len(cells) else ""


# ---------------------------------------------------------------------------
# Sources
# ---------------------------------------------------------------------------
def _parse_sources(
    path: Path, reserved: Mapping[str, object] = MappingProxyType({})
) -> tuple[dict[str, dict[str, str]], list[str]]:
    table = _read_csv(path)
    if not table.header:
        return {}, table.problems
    columns = _split_header(table, _SOURCE_TABLE_COLUMNS)
    for required in ("key", "citation"):
        if required not in columns and not any(required in p for p in table.problems):
            table.problems.append(
                _problem(table.path, table.header_line, required, "required column is missing")
            )
    out: dict[str, dict[str, str]] = {}
    if "key" not in columns or "citation" not in columns:
        return out, table.problems
    for line, cells in table.rows:
        rec = {c: _cell(cells, columns, c) for c in _SOURCE_TABLE_COLUMNS}
        key = rec["key"]
        if not key:
            table.problems.append(_problem(table.path, line, "key", "empty source key"))
            continue
        if key in out or key in reserved:
            table.problems.append(
                _problem(table.path, line, "key", f"source key {key!r} is defined twice")
            )
            continue
        if not rec["citation"]:
            table.problems.append(_problem(table.path, line, "citation", "empty citation"))
        if rec["kind"] and rec["kind"] not in _SOURCE_KINDS:
            table.problems.append(
                _problem(
                    table.path,
                    line,
                    "kind",
                    f"unknown kind {rec['kind']!r}; valid kinds: {', '.join(_SOURCE_KINDS)}",
                )
            )
        out[key] = rec
    return out, table.problems


def _resolve(key: str, sources: Mapping[str, Mapping[str, str]]) -> str:
    """Citation text for a source key or marker."""
    if key in MARKERS:
        return key
    rec = sources[key]
    text = rec["citation"]
    if rec.get("locator") and rec["locator"] != "-":
        text = f"{text}; {rec['locator']}"
    if "recalled" in rec.get("note", "").lower():
        text = f"{text} [recalled from memory, not re-read]"
    return text


@functools.lru_cache(maxsize=1)
def _curated_sources() -> dict[str, dict[str, str]]:
    sources, problems = _parse_sources(_tables_dir() / "sources.csv")
    if problems:
        raise MaterialsFileError(problems)
    for marker in MARKERS:
        if marker not in sources:
            raise MaterialsFileError(
                [
                    _problem(
                        str(_tables_dir() / "sources.csv"),
                        "-",
                        "key",
                        f"marker {marker!r} is not documented",
                    )
                ]
            )
    return sources


def load_sources(path=None) -> pd.DataFrame:
    """The sources table: one row per key, indexed by ``key``.

    Parameters
    ----------
    path : str or Path, optional
        A user's ``NAME.sources.csv`` to append to the curated keys; ``None``
        gives the curated ``sources.csv`` only.

    Returns
    -------
    pandas.DataFrame
        Columns ``citation``, ``locator``, ``kind``, ``note`` and ``resolved``
        (the text placed in the materials frame's ``*_source`` columns).

    Examples
    --------
    >>> s = load_sources()
    >>> s.loc["iso6946-2017", "kind"]
    'standard'
    >>> s.loc["demo", "resolved"]
    'demo'
    """
    sources = dict(_curated_sources())
    if path is not None:
        extra, problems = _parse_sources(Path(path), reserved=sources)
        if problems:
            raise MaterialsFileError(problems)
        sources.update(extra)
    import pandas as pd

    frame = pd.DataFrame.from_dict(sources, orient="index")[list(_SOURCE_TABLE_COLUMNS)]
    frame["resolved"] = [_resolve(k, sources) for k in frame.index]
    return frame.drop(columns="key").rename_axis("key")


# ---------------------------------------------------------------------------
# Materials
# ---------------------------------------------------------------------------
def _to_float(text: str) -> float | None:
    try:
        value = float(text)
    except ValueError:
        return None
    return value


def _convert(
    value: float, unit: str, kind: str, field_name: str, currency: str | None = None
) -> float:
    from workbench import units  # the only pint user; imported only when a file carries units

    if kind == "dimensionless" and unit in ("", "1", "-"):
        return value
    kwargs = {"currency": currency} if currency else {}
    return float(units.to_si(value, unit, kind, field_name, **kwargs))


def _unit_problem(unit: str, kind: str, column: str) -> str | None:
    """Why a header unit cannot be used for a column, or None."""
    from workbench import units

    if kind == "cost":
        kinds = ("cost_per_mass", "cost_per_volume")
        for k in kinds:
            try:
                code = re.search(r"\b([A-Z]{3})\b", unit)
                units.to_si(1.0, unit, k, column, **({"currency": code.group(1)} if code else {}))
                return None
            except ValueError:
                continue
        return f"unit {unit!r} is not a cost per kg or per m³ such as 'EUR/kg' or 'USD/ft^3'"
    try:
        _convert(1.0, unit, kind, column)
    except ValueError as exc:
        return f"unknown or wrong unit: {exc}"
    return None


def _header_units(table: _Table, columns: dict[str, tuple[int, str | None]]) -> dict[str, str | None]:
    """Unit of each column from the header (``None``: none given; ``"?"``: a bad one, reported)."""
    name = table.path
    units: dict[str, str | None] = {}
    for col, (_, unit) in columns.items():
        if unit is None or unit == "":
            units[col] = None
            continue
        if col not in _NUMERIC:
            table.problems.append(
                _problem(name, table.header_line, col, "a unit is only allowed on numeric columns")
            )
            continue
        why = _unit_problem(unit, _NUMERIC[col][2], col)
        if why:
            table.problems.append(_problem(name, table.header_line, col, why))
            units[col] = "?"
        else:
            units[col] = unit
    return units


def _row_text(rec: dict, columns, seen: dict[str, int], name: str, line: int, p: list[str]) -> str | None:
    """Check the id, name and family of one record; return its family (``None`` if unknown)."""
    rid = rec["id"]
    if not rid:
        p.append(_problem(name, line, "id", "empty id"))
    elif not _ID_PATTERN.match(rid):
        p.append(
            _problem(
                name,
                line,
                "id",
                f"id {rid!r} is not snake_case (a-z, 0-9, _; starting with a letter)",
            )
        )
    elif rid in seen:
        p.append(
            _problem(name, line, "id", f"duplicate id {rid!r} (first on line {seen[rid]})")
        )
    else:
        seen[rid] = line
    if "name" in columns and not rec["name"]:
        p.append(_problem(name, line, "name", "empty name"))
    family: str | None = rec["family"]
    if family not in FAMILIES:
        if "family" in columns:
            p.append(
                _problem(
                    name,
                    line,
                    "family",
                    f"unknown family {family!r}; valid families: {', '.join(FAMILIES)}",
                )
            )
        family = None
    return family


def _row_value(rec: dict, col: str, raw: str, unit: str, kind: str, name: str, line: int, p: list[str]):
    """One numeric cell with a header unit, in table units; ``None`` after reporting a problem."""
    value = _to_float(raw)
    try:
        if kind == "cost":
            basis = rec["cost_basis"]
            ckind = {"per_kg": "cost_per_mass", "per_m3": "cost_per_volume"}.get(basis)
            if ckind is None:
                p.append(
                    _problem(
                        name,
                        line,
                        "cost_basis",
                        f"{basis!r} is not a cost basis; valid: {', '.join(_COST_BASES)}",
                    )
                )
                return None
            value = _convert(value, unit, ckind, col, rec["currency"] or None)
        else:
            value = _convert(value, unit, kind, col)
    except ValueError as exc:
        p.append(_problem(name, line, col, f"cannot convert {raw} {unit}: {exc}"))
        return None
    if col.startswith("t_service"):
        value -= 273.15  # the service limits are kept in °C until the end
    return value


def _row_numbers(rec: dict, cells, columns, units, curated: bool, name: str, line: int, p: list[str]) -> None:
    """The numeric values of one record (NaN where absent or bad; problems reported)."""
    for col, (_, _, kind) in _NUMERIC.items():
        raw = _cell(cells, columns, col)
        rec[col] = math.nan
        if col not in columns:
            continue
        if raw == "":
            if curated and col not in _OPTIONAL_CURATED:
                p.append(_problem(name, line, col, "empty value"))
            elif not curated and col in _USER_REQUIRED:
                p.append(_problem(name, line, col, "empty value"))
            continue
        value = _to_float(raw)
        if value is None or not math.isfinite(value):
            p.append(_problem(name, line, col, f"{raw!r} is not a finite number"))
            continue
        unit = units.get(col)
        if unit == "?":
            continue
        if unit is not None:
            value = _row_value(rec, col, raw, unit, kind, name, line, p)
            if value is None:
                continue
        rec[col] = value


def _row_sources(rec: dict, cells, columns, sources, curated: bool, name: str, line: int, p: list[str]) -> None:
    """The source key and resolved citation of each value present in one record."""
    row_source = _cell(cells, columns, "source")
    for src_col in _SOURCE_COLUMNS:
        props = [
            c for c, (s, _, _) in _NUMERIC.items() if s == src_col and not math.isnan(rec[c])
        ]
        own = _cell(cells, columns, src_col)
        rec[f"{src_col}_key"] = ""
        rec[src_col] = ""
        if not props:
            continue
        if own:
            if own in MARKERS or own in sources:
                rec[f"{src_col}_key"] = own
                rec[src_col] = _resolve(own, sources)
            else:
                p.append(
                    _problem(
                        name,
                        line,
                        src_col,
                        f"unknown source key {own!r}; use a key of sources.csv"
                        f"{'' if curated else ' or of the companion .sources.csv'}, a marker "
                        f"({', '.join(MARKERS)}) or put free text in the 'source' column",
                    )
                )
        elif row_source:
            rec[f"{src_col}_key"] = (
                row_source if (row_source in MARKERS or row_source in sources) else ""
            )
            rec[src_col] = (
                _resolve(row_source, sources) if rec[f"{src_col}_key"] else row_source
            )
        else:
            p.append(_problem(name, line, src_col, f"missing source for {', '.join(props)}"))


def _parse_materials(
    path: Path, sources: Mapping[str, Mapping[str, str]], curated: bool
) -> tuple[list[dict], list[str]]:
    """Parse and check a materials file; return (records in SI, problems)."""
    table = _read_csv(path)
    if not table.header:
        return [], table.problems
    name = table.path
    valid = _CURATED_COLUMNS if curated else _VALID_COLUMNS
    columns = _split_header(table, valid)
    required = _CURATED_COLUMNS if curated else _USER_REQUIRED
    for col in required:
        if col not in columns:
            table.problems.append(
                _problem(name, table.header_line, col, "required column is missing")
            )
    units = _header_units(table, columns)

    records: list[dict] = []
    seen: dict[str, int] = {}
    for line, cells in table.rows:
        p = table.problems
        rec: dict = {"origin": "curated" if curated else name, "_line": line}
        for col in _TEXT:
            rec[col] = _cell(cells, columns, col)
        family = _row_text(rec, columns, seen, name, line, p)
        _row_numbers(rec, cells, columns, units, curated, name, line, p)
        _row_sources(rec, cells, columns, sources, curated, name, line, p)
        _check_ranges(rec, family, name, line, p)
        records.append(rec)
    return records, table.problems


def _check_ranges(rec: dict, family: str | None, name: str, line: int, p: list[str]) -> None:
    """Physical and plausibility checks on one record (values already in table units)."""
    if family is not None:
        for prop, (low, high) in PLAUSIBILITY_BANDS[family].items():
            v = rec[prop]
            if math.isnan(v):
                continue
            if v <= 0:
                p.append(_problem(name, line, prop, f"must be > 0 (got {v:g})"))
            elif not low <= v <= high:
                unit = _NUMERIC[prop][1]
                p.append(
                    _problem(
                        name,
                        line,
                        prop,
                        f"{v:g} {unit} is implausible for family {family!r} "
                        f"(common-practice band {low:g} to {high:g} {unit}); check the value and its unit",
                    )
                )
    t = rec["conductivity_temperature"]
    if not math.isnan(t) and not 50.0 <= t <= 3000.0:
        p.append(
            _problem(
                name,
                line,
                "conductivity_temperature",
                f"{t:g} K is outside 50 to 3000 K; the default unit is K (write 'conductivity_temperature [degC]' for °C)",
            )
        )
    eps = rec["emissivity"]
    if not math.isnan(eps) and not 0.0 < eps <= 1.0:
        p.append(_problem(name, line, "emissivity", f"must lie in (0, 1] (got {eps:g})"))
    tol = rec["conductivity_tolerance"]
    if not math.isnan(tol) and not 0.0 < tol < 1.0:
        p.append(
            _problem(
                name,
                line,
                "conductivity_tolerance",
                f"relative tolerance must lie in (0, 1) (got {tol:g}); 0.05 means ±5 %",
            )
        )
    tmin, tmax = rec["t_service_min"], rec["t_service_max"]
    for col, v in (("t_service_min", tmin), ("t_service_max", tmax)):
        if not math.isnan(v) and v < _ABSOLUTE_ZERO_C:
            p.append(_problem(name, line, col, f"{v:g} °C is below absolute zero"))
    if not math.isnan(tmin) and not math.isnan(tmax) and not tmin < tmax:
        p.append(
            _problem(
                name,
                line,
                "t_service_max",
                f"must exceed t_service_min ({tmax:g} °C <= {tmin:g} °C)",
            )
        )
    cost = rec["cost"]
    if not math.isnan(cost):
        if cost < 0:
            p.append(_problem(name, line, "cost", f"must be >= 0 (got {cost:g})"))
        if rec["cost_basis"] not in _COST_BASES:
            p.append(
                _problem(
                    name,
                    line,
                    "cost_basis",
                    f"{rec['cost_basis']!r} is not a cost basis; valid: {', '.join(_COST_BASES)}",
                )
            )
        from workbench.units import CURRENCIES

        if rec["currency"] not in CURRENCIES:
            p.append(
                _problem(
                    name,
                    line,
                    "currency",
                    f"{rec['currency']!r} is not a known currency code; valid: {', '.join(CURRENCIES)}",
                )
            )


def _frame(records: list[dict]) -> pd.DataFrame:
    import pandas as pd

    frame = pd.DataFrame.from_records(records)
    frame = frame.drop(columns="_line").set_index("id")
    frame["family_label"] = frame["family"].map(FAMILIES)
    for col in ("t_service_min", "t_service_max"):
        frame[col] = frame[col] + 273.15  # °C in the files, K in the frame
    per_kg = frame["cost_basis"] == "per_kg"
    per_m3 = frame["cost_basis"] == "per_m3"
    frame["cost_per_mass"] = np.where(
        per_kg, frame["cost"], np.where(per_m3, frame["cost"] / frame["density"], np.nan)
    )
    frame["cost_per_volume"] = np.where(
        per_m3, frame["cost"], np.where(per_kg, frame["cost"] * frame["density"], np.nan)
    )
    source_cols = [c for s in _SOURCE_COLUMNS for c in (s, f"{s}_key")]
    return frame[list(FRAME_COLUMNS) + source_cols]


@functools.lru_cache(maxsize=1)
def _curated_records() -> tuple[dict, ...]:
    records, problems = _parse_materials(
        _tables_dir() / "materials.csv", _curated_sources(), curated=True
    )
    if problems:
        raise MaterialsFileError(problems)
    return tuple(records)


def _companion(path: Path, suffix: str) -> Path:
    return path.with_name(f"{path.stem}.{suffix}.csv")


def _user_records(path: Path) -> tuple[list[dict], dict[str, dict[str, str]], list[str]]:
    sources = dict(_curated_sources())
    problems: list[str] = []
    side = _companion(path, "sources")
    if side.is_file():
        extra, sp = _parse_sources(side, reserved=sources)
        problems += sp
        sources.update(extra)
    records, mp = _parse_materials(path, sources, curated=False)
    problems += mp
    return records, sources, problems


def check_materials_file(path) -> list[str]:
    """Every problem of a user's materials file (and its companion files).

    Parameters
    ----------
    path : str or Path
        The user's ``NAME.csv``; ``NAME.sources.csv`` and ``NAME.kt.csv``
        beside it are checked too when present.

    Returns
    -------
    list of str
        Problems as ``file:row:column: why``; empty when the file loads.

    Examples
    --------
    >>> check_materials_file("no/such/file.csv")
    ['no/such/file.csv:0:-: file not found']
    """
    path = Path(path)
    records, _, problems = _user_records(path)
    kt = _companion(path, "kt")
    if kt.is_file() and not any(p.startswith(f"{path}:0:") for p in problems):
        families = {r["id"]: r["family"] for r in _curated_records()}
        families.update({r["id"]: r["family"] for r in records if r["family"] in FAMILIES})
        _, kp = _parse_kt(kt, families, _sources_for_kt(path))
        problems += kp
    return problems


def _sources_for_kt(path: Path) -> dict[str, dict[str, str]]:
    sources = dict(_curated_sources())
    side = _companion(path, "sources")
    if side.is_file():
        extra, _ = _parse_sources(side, reserved=sources)
        sources.update(extra)
    return sources


def load_materials(path=None) -> pd.DataFrame:
    """Material properties, one row per material, indexed by ``id``.

    Parameters
    ----------
    path : str or Path, optional
        ``None`` for the curated tables; a user's materials file (CSV, same
        columns as ``tables/materials.csv``, optional units in the headers)
        to merge over them: a user row replaces the curated row with the
        same id, new ids are added.

    Returns
    -------
    pandas.DataFrame
        Index ``id``; columns ``name``, ``family``, ``family_label``,
        ``conductivity`` [W/(m·K)] at ``conductivity_temperature`` [K],
        ``conductivity_tolerance`` [-] (relative half-range),
        ``density`` [kg/m³], ``specific_heat`` [J/(kg·K)], ``emissivity`` [-]
        (NaN for gases), ``emissivity_finish``, ``t_service_min`` and
        ``t_service_max`` [K], ``cost`` with ``cost_basis`` (``per_kg`` /
        ``per_m3``) and ``currency``, derived ``cost_per_mass``
        [currency/kg] and ``cost_per_volume`` [currency/m³], ``note``,
        ``origin`` (``"curated"`` or the user file), and for each source
        column of the table (``conductivity_source``, ``density_source``,
        ``specific_heat_source``, ``emissivity_source``, ``t_service_source``,
        ``conductivity_tolerance_source``, ``cost_source``) the resolved
        citation text and, in ``<column>_key``, the raw key.

    Raises
    ------
    MaterialsFileError
        Listing every problem (``file:row:column: why``); nothing is loaded.

    Notes
    -----
    Curated costs are indicative demo values. Service temperatures are
    converted from the table's °C to K.

    References
    ----------
    Sources of the values: ``tables/sources.csv`` (see :func:`load_sources`).

    Examples
    --------
    >>> m = load_materials()
    >>> float(m.loc["stainless_304", "conductivity"])
    14.9
    >>> m.loc["eps_20", "cost_source"]
    'demo'
    """
    records = {r["id"]: dict(r) for r in _curated_records()}
    if path is not None:
        user, _, problems = _user_records(Path(path))
        if problems:
            raise MaterialsFileError(problems)
        for r in user:
            records.pop(r["id"], None)  # replace as a whole, and put user rows last
            records[r["id"]] = r
    return _frame(list(records.values()))


# ---------------------------------------------------------------------------
# Conductivity against temperature
# ---------------------------------------------------------------------------
def _parse_kt(
    path: Path, families: Mapping[str, str], sources: Mapping[str, Mapping[str, str]]
) -> tuple[dict[str, tuple[np.ndarray, np.ndarray, list[str]]], list[str]]:
    table = _read_csv(path)
    if not table.header:
        return {}, table.problems
    name = table.path
    columns = _split_header(table, _KT_COLUMNS)
    for col in _KT_COLUMNS:
        if col not in columns:
            table.problems.append(
                _problem(name, table.header_line, col, "required column is missing")
            )
    units = {}
    for col in ("temperature", "conductivity"):
        unit = columns.get(col, (0, None))[1]
        if unit:
            kind = "temperature" if col == "temperature" else "conductivity"
            why = _unit_problem(unit, kind, col)
            if why:
                table.problems.append(_problem(name, table.header_line, col, why))
                unit = "?"
        units[col] = unit
    points: dict[str, list[tuple[float, float, str, int]]] = {}
    p = table.problems
    for line, cells in table.rows:
        rid = _cell(cells, columns, "id")
        if rid not in families:
            renamed = (
                f" (renamed to {DEPRECATED_IDS[rid]!r})"
                if rid in DEPRECATED_IDS and DEPRECATED_IDS[rid] in families
                else ""
            )
            p.append(
                _problem(
                    name,
                    line,
                    "id",
                    f"unknown material id {rid!r}{renamed}; it must be in the materials table or the user file",
                )
            )
            continue
        values = {}
        for col in ("temperature", "conductivity"):
            raw = _cell(cells, columns, col)
            v = _to_float(raw)
            if v is None or not math.isfinite(v):
                p.append(_problem(name, line, col, f"{raw!r} is not a finite number"))
                continue
            unit = units[col]
            if unit == "?":
                continue
            if unit:
                try:
                    v = _convert(
                        v, unit, "temperature" if col == "temperature" else "conductivity", col
                    )
                except ValueError as exc:
                    p.append(_problem(name, line, col, f"cannot convert {raw} {unit}: {exc}"))
                    continue
            values[col] = v
        src = _cell(cells, columns, "source")
        if not src:
            p.append(_problem(name, line, "source", "missing source"))
        elif src not in sources and src not in MARKERS:
            p.append(_problem(name, line, "source", f"unknown source key {src!r}"))
        if len(values) < 2:
            continue
        t, k = values["temperature"], values["conductivity"]
        if t <= 0:
            p.append(
                _problem(name, line, "temperature", f"{t:g} K is not an absolute temperature > 0")
            )
            continue
        low, high = PLAUSIBILITY_BANDS[families[rid]]["conductivity"]
        if not low / KT_BAND_FACTOR <= k <= high * KT_BAND_FACTOR:
            p.append(
                _problem(
                    name,
                    line,
                    "conductivity",
                    f"{k:g} W/(m·K) is implausible for family {families[rid]!r} "
                    f"(k(T) band {low / KT_BAND_FACTOR:g} to {high * KT_BAND_FACTOR:g})",
                )
            )
            continue
        pts = points.setdefault(rid, [])
        if any(abs(q[0] - t) < 1e-9 for q in pts):
            p.append(
                _problem(name, line, "temperature", f"temperature {t:g} K given twice for {rid!r}")
            )
            continue
        pts.append((t, k, src, line))
    curves = {}
    for rid, pts in points.items():
        if len(pts) < 2:
            p.append(_problem(name, pts[0][3], "id", f"{rid!r} needs at least two k(T) points"))
            continue
        pts.sort()
        curves[rid] = (
            np.array([q[0] for q in pts]),
            np.array([q[1] for q in pts]),
            sorted({q[2] for q in pts}),
        )
    return curves, table.problems


@functools.lru_cache(maxsize=1)
def _curated_curves() -> dict:
    families = {r["id"]: r["family"] for r in _curated_records()}
    curves, problems = _parse_kt(_tables_dir() / "kt.csv", families, _curated_sources())
    if problems:
        raise MaterialsFileError(problems)
    return curves


def load_conductivity_curves(path=None) -> dict[str, tuple[np.ndarray, np.ndarray]]:
    """Conductivity against temperature, where a source tabulates it.

    Parameters
    ----------
    path : str or Path, optional
        ``None`` for the curated ``kt.csv``; a user's materials file
        ``NAME.csv``, whose companion ``NAME.kt.csv`` (if present) is merged
        over the curated curves: a user curve replaces the curated curve of
        the same id as a whole.

    Returns
    -------
    dict
        ``id -> (temperatures [K], conductivities [W/(m·K)])``, temperatures
        strictly increasing, at least two points. The source keys of each
        curve are in :func:`conductivity_curve_sources`.

    Raises
    ------
    MaterialsFileError
        Listing every problem; nothing is loaded.

    Examples
    --------
    >>> t, k = load_conductivity_curves()["air"]
    >>> bool(t[0] < t[-1] and k[0] < k[-1])
    True
    """
    curves = {rid: (t.copy(), k.copy()) for rid, (t, k, _) in _curated_curves().items()}
    if path is not None:
        path = Path(path)
        user, _, problems = _user_records(path)
        kt = _companion(path, "kt")
        if kt.is_file() and not problems:
            families = {r["id"]: r["family"] for r in _curated_records()}
            families.update({r["id"]: r["family"] for r in user})
            extra, kp = _parse_kt(kt, families, _sources_for_kt(path))
            problems += kp
            for rid, (t, k, _) in extra.items():
                curves[rid] = (t, k)
        if problems:
            raise MaterialsFileError(problems)
    return curves


def conductivity_curve_sources() -> dict[str, list[str]]:
    """Source keys of each curated k(T) curve, ``id -> [key, ...]``.

    Examples
    --------
    >>> conductivity_curve_sources()["air"]
    ['incropera7-tA4-mem']
    """
    return {rid: list(src) for rid, (_, _, src) in _curated_curves().items()}
