"""Values of tables/materials.csv re-read from copies of published tables, checked at test time.

A value whose ``*_source`` key is one of the re-read keys below was copied from
a copy of a published table that is installed as a test dependency. Each such
value is re-read here from that copy and must agree within the table's
rounding (half a unit of the last digit written in the CSV cell). The copies:

- ``en12524-2000-ht1.2.0``: DIN EN 12524:2000-07 design values (the table
  ISO 10456:2007 Table 3 continues), as carried by ``ht`` 1.2.0 in
  ``ht.insulation.building_materials`` (tuple: density, conductivity, cp).
- ``ashrae-hof-2013-ht1.2.0``: ASHRAE Handbook - Fundamentals (2013, as cited
  by the copy), building and insulating materials design values, as carried
  by ``ht`` 1.2.0 in ``ht.insulation.ASHRAE`` (list: density, cp, k, R, t).
- ``crc-hcp95-inorg-chemicals1.5.2`` / ``crc-hcp95-thermo-chemicals1.5.2``:
  CRC Handbook of Chemistry and Physics (2014), solid densities and Cp of
  the crystal at 298.15 K, as carried by ``chemicals`` 1.5.2.
- ``coolprop8.0.0-<gas>``: the reference equations of state and conductivity
  correlations named in tables/sources.csv, evaluated by CoolProp 8.0.0 at
  283.15 K and 101325 Pa.

Each row of ``REREAD`` names the copy's row the material maps to and why it
is the same material (same material class and density class). The rows are
read with the csv module, independently of the loader.
"""

from __future__ import annotations

import csv
import math
from decimal import Decimal
from pathlib import Path

import pytest

ht_insulation = pytest.importorskip("ht.insulation")
CP = pytest.importorskip("CoolProp.CoolProp")
chem_volume = pytest.importorskip("chemicals.volume")
chem_heat_capacity = pytest.importorskip("chemicals.heat_capacity")
chem_identifiers = pytest.importorskip("chemicals.identifiers")

TABLES = Path(__file__).resolve().parent.parent / "tables"
with open(TABLES / "materials.csv", encoding="utf-8", newline="") as _f:
    MATERIALS = list(csv.DictReader(_f))
with open(TABLES / "sources.csv", encoding="utf-8", newline="") as _f:
    SOURCES = {r["key"]: r for r in csv.DictReader(_f)}
BY_ID = {r["id"]: r for r in MATERIALS}
COLUMNS = ("conductivity", "density", "specific_heat")

EN = "en12524-2000-ht1.2.0"
ASHRAE = "ashrae-hof-2013-ht1.2.0"
CRC_RHO = "crc-hcp95-inorg-chemicals1.5.2"
CRC_CP = "crc-hcp95-thermo-chemicals1.5.2"
COOLPROP = {
    "coolprop8.0.0-air": "Air",
    "coolprop8.0.0-argon": "Argon",
    "coolprop8.0.0-co2": "CO2",
}
REREAD_KEYS = {EN, ASHRAE, CRC_RHO, CRC_CP, *COOLPROP}
# the copy versions named in the keys; a different installed version must be re-checked
COPY_VERSIONS = {"ht": "1.2.0", "chemicals": "1.5.2", "CoolProp": "8.0.0"}

# material id -> (copy's row, why the table row is the same material)
# EN 12524 rows: design values at 10 °C for the named material and density class.
EN_ROWS = {
    "cast_iron_grey": ("Metals, iron, cast", "grey cast iron is the usual cast iron"),
    "pc": ("Plastics, polycarbonates", "same polymer"),
    "pa6": (
        "Plastics, polyamide (nylon)",
        "unfilled polyamide; density 1150 kg/m³ is that of PA6/PA66",
    ),
    "pa66_gf25": ("Plastics, polyamide 6.6 with 25% glass fibre", "same polymer and filler content"),
    "pp": ("Plastics, polypropylene", "same polymer"),
    "pp_gf25": ("Plastics, polypropylene with 25% glass fibre", "same polymer and filler content"),
    "hdpe": ("Plastics, polyethylene / polythene, high density", "same polymer and density class"),
    "ldpe": ("Plastics, polyethylene / polythene, low density", "same polymer and density class"),
    "pmma": ("Plastics, polymethylmethacrylate (PMMA)", "same polymer"),
    "pvc_rigid": ("Plastics, Polyvinylchloride (PVC)", "rigid PVC (the plasticised grade is a separate row)"),
    "ptfe": ("Plastics, polytetrafluoroethylene (PTFE)", "same polymer"),
    "pom": (
        "Plastics, polyacetate",
        "the copy's label reads 'polyacetate'; its density 1410 kg/m³ is that of acetal (POM)",
    ),
    "silicone_rubber": ("Sealant, silicone, pure", "cured unfilled silicone elastomer"),
    "epdm": ("Rubber, ethylene propylene diene monomer (EPDM)", "same elastomer"),
    "epoxy": ("Plastics, epoxy resin", "unfilled epoxy resin"),
    "soda_lime_glass": ("Glass, soda lime", "same glass"),
    "fused_quartz": ("Glass, quartz", "fused silica (quartz glass)"),
    "porcelain": ("Tiles, ceramic or porcelain", "same ceramic"),
    "concrete_normal_2400": ("Concrete, high density", "normal-weight concrete, 2400 kg/m³"),
    "gypsum_board": ("Gypsum, plasterboard", "same board"),
    "granite": ("Stone, granite", "same stone"),
    "softwood_500": ("Timber, 500 kg/m^3", "timber by density class, 500 kg/m³"),
    "hardwood_700": ("Timber, 700 kg/m^3", "timber by density class, 700 kg/m³"),
    "plywood_500": ("Wood, plywood 500 kg/m^3", "same board and density class"),
    "osb_650": ("Wood, oriented strand board", "same board, 650 kg/m³"),
    "mdf_800": ("Wood, fibreboard, 800 kg/m^3", "MDF is a fibreboard; same density class"),
    "particleboard_600": ("Wood, particleboard, 600 kg/m^3", "same board and density class"),
    "wool_felt_120": ("Floor covering, underlay, felt", "felt, 120 kg/m³"),
}
# ASHRAE rows: values at 24 °C mean temperature (from memory; the copy gives none).
ASHRAE_ROWS = {
    "eps_20": ("Expanded polystyrene, molded beads", "moulded-bead EPS, 20 kg/m³"),
    "glass_wool_12": ("Glass-fiber batts, 90 mm", "glass wool batt, 12 kg/m³"),
    "cellulose_45": ("Loose fill, Cellulosic", "loose-fill cellulose, 42.5 kg/m³"),
    "cement_mortar": ("Cement plaster, sand aggregate", "sand-cement mix, 1860 kg/m³"),
    "brick_common_1920": ("Brick, fired clay, 1920 kg/m^3", "fired clay brick, 1920 kg/m³"),
    "concrete_light_1280": (
        "Concrete, Expanded shale, clay, or slate; expanded slags; cinders; pumice; scoria; 1280 kg/m^3",
        "lightweight aggregate concrete, 1280 kg/m³",
    ),
}
# CRC rows via chemicals: CAS of the pure solid (pure metals; alpha-alumina for cp only,
# because the copy's solid density row for alumina is the gamma phase)
CRC_ROWS = {
    "aluminium_pure": ("7429-90-5", "unalloyed aluminium"),
    "copper_pure": ("7440-50-8", "unalloyed copper"),
    "titanium_pure": ("7440-32-6", "unalloyed titanium"),
    "alumina_dense": ("1344-28-1", "alpha-Al2O3 (Cp of the crystal); sintered alumina is alpha"),
}
GAS_ROWS = {"air": "coolprop8.0.0-air", "argon": "coolprop8.0.0-argon", "co2": "coolprop8.0.0-co2"}


def _en(row: str, column: str) -> float:
    rho, k, cp = ht_insulation.building_materials[row]
    return {"conductivity": k, "density": rho, "specific_heat": cp}[column]


def _ashrae(row: str, column: str) -> float:
    rho, cp, k, _r, _t = ht_insulation.ASHRAE[row]
    return {"conductivity": k, "density": rho, "specific_heat": cp}[column]


def _molar_mass(cas: str) -> float:
    """Molar mass [kg/mol] from the copy's identifiers database."""
    return chem_identifiers.MW(cas) / 1000.0


def _crc(cas: str, column: str) -> float:
    if column == "density":
        return _molar_mass(cas) / float(chem_volume.rho_data_CRC_inorg_s_const.loc[cas, "Vm"])
    if column == "specific_heat":
        return float(chem_heat_capacity.CRC_standard_data.loc[cas, "Cps"]) / _molar_mass(cas)
    raise KeyError(column)


def _coolprop(fluid: str, column: str) -> float:
    code = {"conductivity": "L", "density": "D", "specific_heat": "C"}[column]
    return CP.PropsSI(code, "T", 283.15, "P", 101325.0, fluid)


def _copy_value(material_id: str, column: str) -> float:
    """The value the copy gives for this table cell (raises KeyError if unmapped)."""
    key = BY_ID[material_id][f"{column}_source"]
    if key == EN:
        return _en(EN_ROWS[material_id][0], column)
    if key == ASHRAE:
        return _ashrae(ASHRAE_ROWS[material_id][0], column)
    if key in (CRC_RHO, CRC_CP):
        expected = {"density": CRC_RHO, "specific_heat": CRC_CP}.get(column)
        if key != expected:
            raise KeyError(f"{key} does not carry {column}")
        return _crc(CRC_ROWS[material_id][0], column)
    if key in COOLPROP:
        if GAS_ROWS[material_id] != key:
            raise KeyError(f"{material_id} cites the wrong fluid key {key}")
        return _coolprop(COOLPROP[key], column)
    raise KeyError(f"{material_id}.{column}: {key!r} is not a re-read key")


def _half_unit(cell: str) -> float:
    """Half a unit of the last digit written in a CSV cell ('0.0355' -> 0.00005)."""
    exponent = Decimal(cell).as_tuple().exponent
    return 0.5 * 10.0 ** min(int(exponent), 0)


def _agrees(material_id: str, column: str) -> bool:
    cell = BY_ID[material_id][column]
    ref = _copy_value(material_id, column)
    return ref is not None and math.isfinite(ref) and abs(float(cell) - ref) <= _half_unit(cell) * (1 + 1e-9)


REREAD_CELLS = [
    (r["id"], c) for r in MATERIALS for c in COLUMNS if r[f"{c}_source"] in REREAD_KEYS
]


@pytest.mark.parametrize("material_id, column", REREAD_CELLS, ids=[f"{i}-{c}" for i, c in REREAD_CELLS])
def test_value_matches_its_copy(material_id, column):
    cell = BY_ID[material_id][column]
    ref = _copy_value(material_id, column)
    assert abs(float(cell) - ref) <= _half_unit(cell) * (1 + 1e-9), (
        f"{material_id}.{column} = {cell}, the copy gives {ref!r} "
        f"({BY_ID[material_id][f'{column}_source']})"
    )


def test_every_mapped_row_cites_its_copy():
    """A stale entry in the maps above (row no longer citing the copy) is an error."""
    for rows, keys in (
        (EN_ROWS, {EN}),
        (ASHRAE_ROWS, {ASHRAE}),
        (CRC_ROWS, {CRC_RHO, CRC_CP}),
        (GAS_ROWS, set(COOLPROP)),
    ):
        for material_id in rows:
            cited = {BY_ID[material_id][f"{c}_source"] for c in COLUMNS}
            assert cited & keys, material_id


def test_copy_rows_exist_exactly():
    """Exact keys only: ht falls back to a fuzzy match for unknown names."""
    for row, _ in EN_ROWS.values():
        assert row in ht_insulation.building_materials, row
    for row, _ in ASHRAE_ROWS.values():
        assert row in ht_insulation.ASHRAE, row
    for cas, _ in CRC_ROWS.values():
        assert cas in chem_heat_capacity.CRC_standard_data.index, cas


def test_temperatures_of_reread_conductivities():
    """EN 12524 design values are at 10 °C; ASHRAE's at 24 °C mean (both from
    memory, the copies give none); the CoolProp values are evaluated at 283.15 K."""
    expected = {EN: 283.15, ASHRAE: 297.15, **{k: 283.15 for k in COOLPROP}}
    for r in MATERIALS:
        key = r["conductivity_source"]
        if key in expected:
            assert float(r["conductivity_temperature"]) == expected[key], r["id"]


def test_reread_keys_are_honest():
    for key in REREAD_KEYS:
        rec = SOURCES[key]
        assert not key.endswith("-mem")
        assert "recalled" not in rec["note"].lower(), key  # the loader would flag it
        assert "re-read" in rec["note"].lower() and rec["kind"] == "library", key
    # the package versions named in the keys are the ones installed
    import importlib.metadata as md

    for package, version in COPY_VERSIONS.items():
        assert md.version(package) == version, (package, md.version(package))
        assert all(
            version in SOURCES[k]["citation"]
            for k in REREAD_KEYS
            if package.lower() in SOURCES[k]["citation"].lower()
        )


def test_recalled_values_are_not_labelled_reread():
    """Rows still on recalled or common-practice sources keep their honest keys."""
    for r in MATERIALS:
        for c in COLUMNS:
            key = r[f"{c}_source"]
            assert key in REREAD_KEYS or key.endswith("-mem") or key in (
                "common-practice",
                "from-memory",
            ), (r["id"], c, key)


# Share of k, rho and cp values re-read from a copy with a passing check.
# Issue 17 sets 60 % as the goal; the copies installed here (ht, CoolProp,
# chemicals) carry no data for the filled and engineering polymer grades,
# most insulation products by density, vacuum panels, aerogel, corrugated
# board, or specific alloys, so the share reached is lower. The floor below
# guards what has been reached (the goal stays open in the issue).
SHARE_FLOOR = 0.43


def _share() -> tuple[int, int]:
    total = len(MATERIALS) * len(COLUMNS)
    ok = 0
    for material_id, column in REREAD_CELLS:
        try:
            ok += _agrees(material_id, column)
        except KeyError:
            pass
    return ok, total


def test_reread_share_floor():
    ok, total = _share()
    assert total == sum(1 for r in MATERIALS for c in COLUMNS if r[c] != "")
    assert ok / total >= SHARE_FLOOR, f"{ok}/{total} = {ok / total:.1%} re-read"
