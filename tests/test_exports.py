"""CSV and JSON exports.

Outside checks: the formula-leading characters neutralised in CSV are those of
the OWASP "CSV Injection" guidance (owasp.org community page, accessed 2026:
cells starting with =, +, -, @, tab or carriage return; prefix a single
quote); CSV is read back with the standard :mod:`csv` module and JSON with
:mod:`json` (RFC 8259: no NaN); the inch is 0.0254 m exactly (NIST SP 811,
2008, Appendix B.8). Scenarios are invented demo data.
"""

from __future__ import annotations

import csv
import io
import json
from dataclasses import replace
from pathlib import Path

import pytest

from workbench.exports import (
    evaluation_to_json,
    frame_to_csv,
    neutralise_cell,
    ranking_csv,
    results_csv,
)
from workbench.report import evaluate
from workbench.scenario import CriterionSpec, MaterialsSource, Scenario, load_scenario

EXAMPLES = Path(__file__).resolve().parent.parent / "examples"


def _wall(**changes) -> Scenario:
    s = Scenario(
        kind="wall",
        inputs={
            "t_inside": "2 °C",
            "t_outside": "30 °C",
            "area": "10 m²",
            "r_si": "0.13 m²·K/W",
            "r_se": "0.04 m²·K/W",
            "budget": "8 W/m²",
            "thickness": "50 mm",
            "conductivity_vs_temperature": False,
        },
        candidates=("eps_20", "pir_32"),
        criteria=(CriterionSpec("total_thickness"), CriterionSpec("cost_per_area")),
    )
    return replace(s, **changes)


@pytest.mark.parametrize(
    "text",
    ["=1+1", "+1", "-2+3", "@SUM(A1)", "\t=x", "\r=x", '=HYPERLINK("http://example.invalid","x")'],
)
def test_formula_cells_are_neutralised(text):
    assert neutralise_cell(text) == "'" + text


@pytest.mark.parametrize("value", ["PIR 32", "", "steel/PIR/steel", 3.5, -8.0, 0])
def test_other_cells_are_untouched(value):
    assert neutralise_cell(value) == value


def test_csv_of_a_hostile_candidate_name_keeps_numbers_numeric():
    evil = '=HYPERLINK("http://example.invalid","open")'
    row = {
        "id": "demo_evil",
        "name": evil,
        "family": "rigid_foam",
        "conductivity": 0.03,
        "density": 30,
        "specific_heat": 1400,
        "source": "demo",
    }
    s = _wall(
        candidates=(
            "demo_evil",
            {"name": "-cmd|' /C calc'!A0", "layers": [{"material": "eps_20"}]},
        ),
        materials=MaterialsSource(rows=(row,)),
    )
    ev = evaluate(s)
    rows = list(csv.reader(io.StringIO(results_csv(ev))))
    header, body = rows[0], rows[1:]
    assert body[0][0] == "demo_evil"
    assert body[1][0] == "'-cmd|' /C calc'!A0"
    flux = header.index("Heat flux [W/m²]")
    # the flux (a size; its direction is a separate column) stays a plain number
    assert all(float(r[flux]) == pytest.approx(8.0) for r in body)
    # a negative number in a results frame stays a plain negative number
    import pandas as pd

    negative = pd.DataFrame({"t_surface_inside": [-8.0], "candidate": ["-cmd"]})
    cells = list(csv.reader(io.StringIO(frame_to_csv(negative))))[1]
    assert "-8.0" in cells or "-8" in cells
    assert "'-cmd" in cells
    for r in body:
        for cell in r:
            assert cell[:1] not in ("=", "+", "@", "\t", "\r"), cell
            if cell.startswith("-"):
                float(cell)  # only numbers may start with a minus sign


def test_frame_to_csv_handles_nan_and_bools():
    import pandas as pd

    f = pd.DataFrame(
        {"a": [1.5, float("nan")], "ok": [True, False], "t": ["@x", "y"]},
        index=pd.Index(["=p", "q"], name="candidate"),
    )
    rows = list(csv.reader(io.StringIO(frame_to_csv(f))))
    assert rows == [
        ["candidate", "a", "ok", "t"],
        ["'=p", "1.5", "yes", "'@x"],
        ["q", "", "no", "y"],
    ]


def test_csv_in_us_units():
    ev = evaluate(_wall())
    si = list(csv.DictReader(io.StringIO(results_csv(ev, "SI"))))
    us = list(csv.DictReader(io.StringIO(results_csv(ev, "US"))))
    for a, b in zip(si, us, strict=True):
        # NIST SP 811 Appendix B.8: 1 in = 0.0254 m exactly
        assert float(b["Sized thickness [in]"]) == pytest.approx(
            float(a["Sized thickness [mm]"]) / 25.4, rel=1e-12
        )


def test_ranking_csv_best_first():
    ev = evaluate(_wall())
    rows = list(csv.DictReader(io.StringIO(ranking_csv(ev))))
    assert [r["Rank"] for r in rows] == sorted(r["Rank"] for r in rows)


@pytest.mark.parametrize(
    "kind", [k for k in ("wall", "housing") if (EXAMPLES / f"{k}.toml").is_file()]
)
def test_json_is_si_with_units(kind):
    ev = evaluate(load_scenario(EXAMPLES / f"{kind}.toml"))

    def no_constants(name):
        raise AssertionError(f"non-standard JSON constant {name}")

    data = json.loads(evaluation_to_json(ev), parse_constant=no_constants)
    assert data["scenario_hash"] == ev.scenario_hash and data["kind"] == kind
    rows = {r["candidate"]: r for r in data["results"]["rows"]}
    for name in ev.results.index:
        for col, unit in data["results"]["units"].items():
            got, want = rows[name][col], ev.results.loc[name, col]
            if want == want and abs(float(want)) == float("inf"):
                assert got is None, (col, unit)  # JSON has no infinity: null (documented)
            elif want == want:  # not NaN
                assert got == pytest.approx(float(want), rel=0, abs=0), (col, unit)
    units_map = data["results"]["units"]
    if kind == "wall":
        assert units_map["sized_thickness"] == "m" and units_map["t_surface_inside"] == "K"
        assert units_map["cost_per_area"] == "EUR/m²"
    else:
        assert units_map["t_hot_spot"] == "K" and units_map["mass"] == "kg"
    assert data["cautions"] and data["assumptions"]
    assert {s["key"] for s in data["sources"]} == set(ev.sources["key"])
