"""Column headers people read: every report and panel table, no generated names left over.

A generated header is what a column name turns into when nobody wrote a label for it:
snake_case fragments ("t_surface"), a one-letter symbol glued to a word ("Dsurface") or
standing alone before one ("H convection", "d emissivity"), unit codes ("degC").
"""

from __future__ import annotations

import html
import re
import warnings
from pathlib import Path

import pytest

from workbench._checks import ValidityWarning
from workbench.report import display_frame, evaluate, render_html
from workbench.scenario import load_scenario

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
SCENARIOS = sorted(EXAMPLES.glob("*.toml"))

# words a generated label glues a symbol to ("Dsurface", "Tsurface", "Hconvection")
QUANTITY_WORDS = {
    "surface",
    "temperature",
    "emissivity",
    "convection",
    "radiation",
    "thickness",
    "conductivity",
    "flux",
    "value",
    "mass",
    "cost",
    "power",
    "time",
    "area",
    "length",
    "width",
    "height",
    "inside",
    "outside",
    "ambient",
    "payload",
    "coolant",
    "resistance",
    "capacity",
    "share",
    "limit",
    "margin",
    "spot",
    "rise",
    "number",
    "wall",
}
# one-letter words that are real English words in a header
REAL_SINGLE_LETTERS = {"a", "A"}

_SNAKE = re.compile(r"\b[A-Za-z0-9]+_[A-Za-z0-9_]+\b")
_UNIT_CODES = re.compile(r"\bdeg[CF]\b|\bdelta_")
_LONE_LETTER = re.compile(r"(?<![\w\-–/·²³°])([A-Za-z])\s+(?=[a-z]{2,})")


def generated_fragments(header: str) -> list[str]:
    """The parts of ``header`` that look generated (empty when it reads as written by a person)."""
    text = re.sub(r"\[[^\]]*\]", " ", header)  # units in brackets are not words
    found = [m.group(0) for m in _SNAKE.finditer(text)]
    found += [m.group(0) for m in _UNIT_CODES.finditer(text)]
    found += [
        m.group(0).strip()
        for m in _LONE_LETTER.finditer(text)
        if m.group(1) not in REAL_SINGLE_LETTERS
    ]
    for word in re.findall(r"[A-Za-z]+", text):
        if len(word) > 4 and word[0].isupper() and word[1:].lower() in QUANTITY_WORDS:
            found.append(word)  # "Dsurface": a capital symbol glued to a quantity word
        if len(word) > 4 and word[0] in "dDtThH" and word[1:] in QUANTITY_WORDS:
            found.append(word)
    return found


@pytest.mark.parametrize(
    "bad",
    [
        "Dsurface temperature d emissivity [K]",
        "H convection [W/(m²·K)]",
        "H radiation",
        "t_surface",
        "Surface temperature degC",
        "Tsurface [°C]",
    ],
)
def test_the_check_catches_generated_headers(bad):
    assert generated_fragments(bad), bad


@pytest.mark.parametrize(
    "good",
    [
        "Mean surface temperature [°C]",
        "Outside convection coefficient [W/(m²·K)]",
        "Change of mean surface temperature per unit emissivity [K]",
        "Time for the mean surface to reach the touch limit [h]",
        "Hot-spot temperature [°F]",
        "U-value [W/(m²·K)]",
        "Density [kg/m³]",
        "Heat flux [W/m²]",
        "Share of the heat radiated",
        "ε [–]",
    ],
)
def test_the_check_passes_written_headers(good):
    assert not generated_fragments(good), good


def _headers_of_html(text: str) -> list[str]:
    """Column headers: the cells of every table's <thead> (row headers in the body are data,
    e.g. the scenario file's own input keys in the report's inputs table)."""
    heads = []
    for thead in re.findall(r"<thead>(.*?)</thead>", text, flags=re.S):
        heads += [
            html.unescape(re.sub(r"<[^>]+>", "", h)).strip()
            for h in re.findall(r"<th[^>]*>(.*?)</th>", thead, flags=re.S)
        ]
    return heads


@pytest.fixture(scope="module")
def evaluations():
    out = {}
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        for path in SCENARIOS:
            out[path.stem] = evaluate(load_scenario(path))
    return out


def test_every_example_kind_is_covered(evaluations):
    kinds = {ev.kind.name for ev in evaluations.values()}
    assert {"wall", "shipper", "housing"} <= kinds


@pytest.mark.parametrize("system", ["SI", "US"])
def test_report_headers_read_as_written(evaluations, system):
    bad = {}
    for name, ev in evaluations.items():
        frame = display_frame(ev.results, ev.kind, system)
        for head in [*frame.columns, frame.index.name or ""]:
            if generated_fragments(str(head)):
                bad.setdefault(name, []).append(head)
    assert not bad, bad


def test_report_pages_have_no_generated_table_headers(evaluations):
    bad = {}
    for name, ev in evaluations.items():
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ValidityWarning)
            page = render_html(ev, generated="2026-01-01")
        for head in _headers_of_html(page):
            if generated_fragments(head):
                bad.setdefault(name, []).append(head)
    assert not bad, bad


def test_housing_report_headers_carry_units(evaluations):
    ev = next(e for e in evaluations.values() if e.kind.name == "housing")
    r = ev.results
    for col, qkind in ev.kind.column_kinds.items():
        if col not in r.columns:
            continue
        (head,) = display_frame(r[[col]], ev.kind, "SI", results=r).columns
        if qkind is not None or r.attrs["units"].get(col, "-") != "-":
            assert re.search(r"\[[^\]–]+\]$", head), (col, head)
    heads = list(display_frame(r, ev.kind, "SI").columns)
    assert len(heads) == len(set(heads))
    assert "Time for the mean surface to reach the touch limit [h]" in heads
    assert "Outside convection coefficient [W/(m²·K)]" in heads


@pytest.fixture(scope="module")
def panel_tables():
    from workbench.widgets.app import Workbench
    from workbench.widgets.housing_panel import HousingPanel
    from workbench.widgets.shipper_panel import ShipperPanel

    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ValidityWarning)
        wall = Workbench()
        ship = ShipperPanel()
        house = HousingPanel()
        out = {}
        for system in ("SI", "US"):
            for name, panel in (("wall", wall), ("shipper", ship), ("housing", house)):
                if name == "wall":
                    panel.system_toggle.value = system
                else:
                    panel.set_system(system)
                table = wall.table.html.value if name == "wall" else panel.table.value
                out[(name, system)] = _headers_of_html(table)
    return out


@pytest.mark.parametrize(
    "panel",
    [
        "wall",
        "shipper",
        "housing",
    ],
)
def test_panel_table_headers_read_as_written(panel_tables, panel):
    bad = {}
    for system in ("SI", "US"):
        heads = panel_tables[(panel, system)]
        assert heads, (panel, system)
        for head in heads:
            if generated_fragments(head):
                bad.setdefault(system, []).append(head)
    assert not bad, bad
