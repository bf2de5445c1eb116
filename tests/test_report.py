"""The HTML report and the evaluation behind it.

Outside checks: the Pareto front of the ranking is compared with the
``paretoset`` package (PyPI, used only as a test oracle); the HTML is parsed
with the standard library's :mod:`html.parser`; weighted scores are recomputed
here by min-max normalisation written out by hand (common practice); the wall
sizing against ISO 6946:2017 (clause 6.7.1, Table 7) hand formula. Scenarios
are invented demo data.
"""

from __future__ import annotations

import html
import re
from dataclasses import replace
from html.parser import HTMLParser
from pathlib import Path

import numpy as np
import pytest
from paretoset import paretoset

import workbench
from workbench.report import GENERAL_CAUTIONS, engineering, evaluate, render_html, write_report
from workbench.scenario import (
    ConstraintSpec,
    CriterionSpec,
    MaterialsSource,
    Scenario,
    load_scenario,
    scenario_hash,
)

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"
KINDS = [k for k in ("wall", "shipper", "housing") if (EXAMPLES / f"{k}.toml").is_file()]


@pytest.fixture(scope="module")
def evaluations():
    return {k: evaluate(load_scenario(EXAMPLES / f"{k}.toml")) for k in KINDS}


@pytest.fixture(scope="module")
def pages(evaluations):
    return {k: render_html(ev) for k, ev in evaluations.items()}


class _Collector(HTMLParser):
    def __init__(self):
        super().__init__()
        self.scripts: list[str] = []
        self.script_src: list[str] = []
        self.links: list[str] = []
        self.text: list[str] = []
        self._in_script = False

    def handle_starttag(self, tag, attrs):
        if tag == "script":
            self._in_script = True
            self.scripts.append("")
            self.script_src += [v for k, v in attrs if k == "src"]
        self.links += [v or "" for k, v in attrs if k in ("src", "href")]
        for k, v in attrs:
            if k.startswith("on"):
                self.text.append(f"EVENT-HANDLER {k}={v}")

    def handle_endtag(self, tag):
        if tag == "script":
            self._in_script = False

    def handle_data(self, data):
        if self._in_script:
            self.scripts[-1] += data
        else:
            self.text.append(data)


def _parse(page: str) -> _Collector:
    c = _Collector()
    c.feed(page)
    return c


def _demo_wall(**changes) -> Scenario:
    s = Scenario(
        kind="wall",
        inputs={
            "t_inside": "20 °C",
            "t_outside": "-10 °C",
            "area": "10 m²",
            "r_si": "0.13 m²·K/W",
            "r_se": "0.04 m²·K/W",
            "budget": "0.25 W/(m²·K)",
            "thickness": "50 mm",
            "conductivity_vs_temperature": False,
        },
        candidates=("eps_20", "xps_35", "pir_32", "glass_wool_32", "cork_board_120"),
        criteria=(
            CriterionSpec("total_thickness", "minimise", 1.0),
            CriterionSpec("mass_per_area", "minimise", 1.0),
            CriterionSpec("cost_per_area", "minimise", 2.0),
        ),
        title="demo wall",
    )
    return replace(s, **changes)


# ---------------------------------------------------------------------------
# The page
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("kind", KINDS)
def test_page_is_standalone_with_plotly_inlined_once(pages, kind):
    page = pages[kind]
    parsed = _parse(page)
    assert parsed.script_src == []  # nothing fetched from the network
    assert not [u for u in parsed.links if re.match(r"(https?:)?//", u)]
    bundles = [s for s in parsed.scripts if "plotly.js v" in s[:400]]
    assert len(bundles) == 1
    assert page.count("Plotly.newPlot") >= 2


@pytest.mark.parametrize("kind", KINDS)
def test_page_carries_cautions_version_hash_and_sources(pages, evaluations, kind):
    page, ev = pages[kind], evaluations[kind]
    for caution in (*GENERAL_CAUTIONS, *ev.cautions):
        assert html.escape(caution) in page
    assert workbench.__version__ in page
    assert scenario_hash(ev.scenario) in page
    assert len(ev.sources) >= 3
    section = page.split("<h2>Sources of the properties and methods used</h2>")[1]
    section = section.split("<h2>")[0]
    for citation in ev.sources["citation"]:
        assert section.count(html.escape(citation)) == 1  # each source once
    for text in ev.assumptions:
        assert html.escape(text) in page


def test_job_specific_cautions(evaluations):
    text = {k: " ".join(ev.cautions).lower() for k, ev in evaluations.items()}
    if "wall" in text:
        assert "fire" in text["wall"] and "foam" in text["wall"]
    if "housing" in text:
        assert "touch" in text["housing"] and "iso 13732-1" in text["housing"]
    if "shipper" in text:
        assert "medicines" in text["shipper"] and "testing" in text["shipper"]
        assert "dry ice" in text["shipper"] and "ventilat" in text["shipper"]
        assert "dangerous goods" in text["shipper"]


def test_sources_are_those_used_and_only_those(evaluations):
    ev = evaluations["wall"]
    m = ev.study.materials
    used = {lay.material for c in ev.study.candidates for lay in c.layers}
    keys = set(ev.sources["key"])
    for mid in used:
        for col in ("conductivity_source_key", "density_source_key", "cost_source_key"):
            assert m.loc[mid, col] in keys
    assert {"fourier", "iso6946-2017"} <= keys
    unused = set(m.index) - used
    only_unused = {m.loc[i, "conductivity_source_key"] for i in unused} - {
        m.loc[i, k] for i in used for k in m.columns if k.endswith("_key")
    }
    assert not (only_unused & keys)


def test_user_text_is_escaped():
    evil = "<script>alert(1)</script>"
    row = {
        "id": "demo_evil",
        "name": evil,
        "family": "rigid_foam",
        "conductivity": 0.03,
        "density": 30,
        "specific_heat": 1400,
        "source": "demo",
    }
    s = _demo_wall(
        candidates=("demo_evil", "eps_20"),
        materials=MaterialsSource(rows=(row,)),
        title=f"{evil} & <b>bold</b>",
        notes=f"notes {evil}\n<img src=x onerror=alert(2)>",
    )
    page = render_html(evaluate(s))
    assert evil not in page and "<img src=x" not in page and "<b>bold</b>" not in page
    assert html.escape(evil) in page
    parsed = _parse(page)
    assert not any("alert(1)" in sc for sc in parsed.scripts if "plotly.js v" not in sc[:400])
    assert not any(t.startswith("EVENT-HANDLER") for t in parsed.text)
    assert evil in "".join(parsed.text)  # shown to the reader as text


def test_warnings_raised_while_computing_are_reported():
    s = load_scenario(EXAMPLES / "housing.toml")
    # a near-zero power gives Rayleigh numbers below the stated range of the
    # flat-plate correlations (Lloyd–Moran/McAdams, Ra 1e4–1e11): a ValidityWarning
    s = replace(s, inputs={**s.inputs, "power": "0.001 W", "component_power": "0.0005 W"})
    ev = evaluate(s)
    assert any(w.startswith("ValidityWarning") and "Ra_L" in w for w in ev.warnings)
    page = render_html(ev)
    assert html.escape(ev.warnings[0]) in page


def test_write_report_refuses_to_clobber(tmp_path, evaluations):
    ev = next(iter(evaluations.values()))
    out = tmp_path / "r.html"
    write_report(ev, out)
    with pytest.raises(FileExistsError):
        write_report(ev, out)
    write_report(ev, out, overwrite=True)
    assert out.read_text("utf-8").startswith("<!DOCTYPE html>")


# ---------------------------------------------------------------------------
# The ranking behind it
# ---------------------------------------------------------------------------
def test_pareto_front_matches_paretoset():
    ev = evaluate(_demo_wall())
    t = ev.ranking
    values = t[["total_thickness", "mass_per_area", "cost_per_area"]].to_numpy()
    expected = paretoset(values, sense=["min", "min", "min"], distinct=False)
    np.testing.assert_array_equal(t["pareto"].to_numpy(), expected)


def test_weighted_scores_by_hand():
    ev = evaluate(_demo_wall())
    v = ev.ranking[["total_thickness", "mass_per_area", "cost_per_area"]].to_numpy()
    s = (v - v.min(axis=0)) / (v.max(axis=0) - v.min(axis=0))  # min-max, 0 = best
    expected = (s @ np.array([1.0, 1.0, 2.0])) / 4.0
    np.testing.assert_allclose(ev.ranking["score"].to_numpy(float), expected, rtol=1e-12)
    order = np.argsort(expected)
    assert list(ev.ranking["rank"].to_numpy()[order]) == [1, 2, 3, 4, 5]
    assert ev.ranking["share_first"].sum() == pytest.approx(1.0)


def test_limits_exclude_with_reasons_in_display_units():
    """ISO 6946:2017 sizing for U = 0.25: d = λ (1/U − 0.17); limit 100 mm (in inches: 3.94 in)."""
    s = _demo_wall(
        constraints=(ConstraintSpec("total_thickness", "max", "100 mm"),), display_system="US"
    )
    ev = evaluate(s)
    lam = ev.study.materials.loc[list(ev.study.names), "conductivity"].to_numpy()
    d = lam * (1 / 0.25 - 0.13 - 0.04)
    np.testing.assert_allclose(ev.results["sized_thickness"].to_numpy(), d, rtol=1e-12)
    np.testing.assert_array_equal(ev.ranking["feasible"].to_numpy(), d <= 0.1)
    for name, why in ev.ranking.loc[~ev.ranking["feasible"], "excluded_because"].items():
        assert "above the maximum 3.94 in" in why, (name, why)
    assert ev.ranking.loc[~ev.ranking["feasible"], "rank"].isna().all()


def test_engineering_rounding():
    assert [engineering(x) for x in (0.0, 1234.5, 0.0123456, 99999.0, 1.5e7, -0.00012345)] == [
        "0",
        "1230",
        "0.0123",
        "100000",
        "1.5e7",
        "-0.000123",
    ]


@pytest.mark.skipif("housing" not in KINDS, reason="no housing example")
def test_housing_report_shows_the_warm_up(evaluations, pages):
    ev = evaluations["housing"]
    page = pages["housing"]
    from workbench.studies.housing.charts import charts as housing_charts

    figs = housing_charts(ev)
    warm = [f for f in figs if "use session" in (f.layout.title.text or "")]
    assert len(warm) == 1
    fig = warm[0]
    study = ev.study
    frame = study.warm_up_frame()
    assert frame["time"].max() == pytest.approx(study.session_duration)
    # one line per candidate, in °C over minutes, plus the touch limits in use
    names = list(ev.results.index)
    lines = {t.name: t for t in fig.data if t.name in names}
    assert set(lines) == set(names)
    first = frame[frame["candidate"] == names[0]]
    x = np.asarray(lines[names[0]].x, float) * 60.0  # drawn points: a subset of the session's
    np.testing.assert_allclose(np.asarray(lines[names[0]].y, float),
                               np.interp(x, first["time"], first["t_surface"]) - 273.15)
    assert any(str(t.name).startswith("touch limit") for t in fig.data)
    assert "°C" in lines[names[0]].hovertemplate and "min" in lines[names[0]].hovertemplate
    assert "product standard" in fig.layout.annotations[0].text
    # the results table carries the time to the limit, and the caution is on the page
    assert "Time for the mean surface to reach the touch limit [h]" in html.unescape(page)
    assert "Touch safety and component limits stay with the applicable product standard" in page
    assert "use session against the touch limit" in page  # the chart is drawn on the page
    assert np.all(ev.results["time_to_touch_limit"] >= 0)
