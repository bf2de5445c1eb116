"""Row ids and names of the curated tables use generic names and standard designations.

A trade name or a maker's name in a row id or name would tie a generic
property row to one product. TRADE_NAMES below is a list of common trade
names of materials in this field (polymers, foams, glass and glass-ceramics,
alloys, insulation boards and blankets) and of makers, written from general
knowledge (common practice, no published source; not looked up). Matching
is on whole words (a grade number may follow, as in ``zamak3``),
case-insensitive, in ids (split at ``_``) and names.

Renamed ids keep loading through ``workbench.materials.resolve_material_id``
with a warning naming the new id; that is tested here too.
"""

from __future__ import annotations

import csv
import re
import warnings
from pathlib import Path

import pytest

from workbench.materials import (
    DEPRECATED_IDS,
    DeprecatedMaterialIdWarning,
    load_materials,
    resolve_material_id,
)

TABLES = Path(__file__).resolve().parent.parent / "tables"

TRADE_NAMES = (
    # polymers and elastomers
    "teflon", "delrin", "celcon", "hostaform", "lexan", "makrolon", "plexiglas", "plexiglass",
    "perspex", "acrylite", "lucite", "ultem", "zytel", "ultramid", "durethan", "nylatron",
    "kevlar", "nomex", "kapton", "vespel", "torlon", "ryton", "fortron", "noryl", "cycoloy",
    "bayblend", "valox", "crastin", "rynite", "santoprene", "viton", "kalrez", "tygon",
    "mylar", "melinex", "hytrel", "pebax", "styron", "lustran", "terluran", "tedlar",
    "tefzel", "kynar", "halar", "radel", "udel", "bakelite", "formica", "neoprene",
    "sorbothane", "tecapeek", "ketaspire", "victrex",
    # foams and foam boards
    "styrofoam", "styropor", "neopor", "styrodur", "foamular", "jackodur", "armaflex",
    "kaiflex", "ethafoam", "plastazote", "arpro", "neopolen", "basotect", "rohacell",
    "divinycell", "airex", "thermax", "celotex", "kingspan", "recticel", "depron",
    # glass, glass-ceramics and ceramics
    "pyroceram", "corningware", "zerodur", "ceran", "robax", "macor", "pyrex", "duran",
    "vycor", "borofloat", "neoceram", "foamglas", "shapal", "gorilla",
    # insulation boards, blankets, vacuum panels
    "rockwool", "isover", "fiberglas", "thermafiber", "pavatex", "gutex", "pyrogel",
    "cryogel", "spaceloft", "microtherm", "promalight", "promat", "superwool", "fiberfrax",
    "kaowool",
    # alloys
    "zamak", "mazak", "kirksite", "inconel", "incoloy", "monel", "hastelloy", "invar",
    "kovar", "nitinol", "alnico", "stellite", "nimonic", "nichrome", "chromel", "alumel",
    "corten", "hardox", "duralumin", "silumin", "alclad", "elektron", "permalloy", "mumetal",
    # thermal interface and filled grades
    "sil-pad", "gap pad", "coolpoly",
    # makers
    "corning", "schott", "dupont", "basf", "sabic", "covestro", "lanxess", "solvay",
    "owens corning", "knauf", "saint-gobain", "kyocera", "ceramtec", "dow",
)
_PATTERN = re.compile(
    r"(?<![a-z0-9])(" + "|".join(re.escape(t) for t in TRADE_NAMES) + r")(?![a-z])"
)


def _rows(name: str) -> list[dict[str, str]]:
    with open(TABLES / name, encoding="utf-8", newline="") as f:
        lines = [line for line in f if not line.lstrip().startswith("#")]
    return list(csv.DictReader(lines))


NAMED_ROWS = [
    (table, r["id"], r["name"])
    for table in ("materials.csv", "finishes.csv", "coolants.csv")
    for r in _rows(table)
]


def _hits(text: str) -> list[str]:
    # ids: underscores separate words
    return _PATTERN.findall(text.lower().replace("_", " "))


@pytest.mark.parametrize("table, row_id, name", NAMED_ROWS, ids=[f"{t}:{i}" for t, i, _ in NAMED_ROWS])
def test_no_trade_name_in_id_or_name(table, row_id, name):
    assert not _hits(row_id), (table, row_id, _hits(row_id))
    assert not _hits(name), (table, row_id, name, _hits(name))


def test_the_check_catches_trade_names():
    """The matcher is not vacuous: it finds the old names and spares generic words."""
    assert _hits("pyroceram") == ["pyroceram"]
    assert _hits("zinc_zamak3") == ["zamak"]  # a grade number may follow the name
    assert _hits("Zinc die-casting alloy Zamak 3") == ["zamak"]
    assert _hits("Glass-ceramic (Corning 9606 type)") == ["corning"]
    assert _hits("Ceramic tile, durable") == []  # 'ceran', 'duran' only as whole words
    assert _hits("Polyester (PET) fibre batt") == []


def test_deprecated_ids_resolve_with_a_warning_naming_the_new_id():
    ids = set(load_materials().index)
    assert DEPRECATED_IDS  # the renames of issue 17
    for old, new in DEPRECATED_IDS.items():
        assert old not in ids and new in ids, (old, new)
        with pytest.warns(DeprecatedMaterialIdWarning, match=re.escape(repr(new))):
            assert resolve_material_id(old, where="wall.toml:3:14") == new
        with pytest.warns(DeprecatedMaterialIdWarning, match="wall.toml:3:14"):
            resolve_material_id(old, where="wall.toml:3:14")


def test_current_ids_resolve_silently():
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        for rid in load_materials().index:
            assert resolve_material_id(rid) == rid
        assert resolve_material_id("no_such_material") == "no_such_material"


def test_resolve_material_id_rejects_non_strings():
    with pytest.raises(TypeError, match="material id must be a str"):
        resolve_material_id(3)  # type: ignore[arg-type]


def test_old_id_in_a_users_kt_file_names_the_new_id(tmp_path):
    from workbench.materials import check_materials_file

    (tmp_path / "mine.csv").write_text(
        "id,name,family,conductivity,density,specific_heat,source\n"
        "demo_board,Demo board (demo data),rigid_foam,0.03,30,1400,demo\n",
        encoding="utf-8",
    )
    (tmp_path / "mine.kt.csv").write_text(
        "id,temperature,conductivity,source\nzinc_zamak3,280,110,demo\nzinc_zamak3,320,112,demo\n",
        encoding="utf-8",
    )
    problems = check_materials_file(tmp_path / "mine.csv")
    assert any("'zinc_zamak3' (renamed to 'zinc_znal4')" in p for p in problems), problems
