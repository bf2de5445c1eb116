"""Headless tests of the interactive workbench (workbench.widgets).

The workbench is built and driven programmatically, as a user would in the
notebook: sliders moved, text typed with units, the display system switched.
Expected numbers are computed here independently of the widgets, from the
table values and the published relations named beside each check:

* Fourier's law for a plane wall with surface resistances in series,
  q = ΔT / (Rsi + L/k + Rse), with the conventional ISO 6946:2017 Table 7
  values Rsi = 0.13 m²·K/W and Rse = 0.04 m²·K/W (horizontal heat flow).
* Unit factors from NIST SP 811 (2008), Appendix B.8/B.9:
  1 in = 0.0254 m (exact); 1 Btu_IT/(h·ft²) = 3.154 591 W/m²; °F = °C·9/5 + 32.
* The non-dominated set is checked against the ``paretoset`` package (PyPI),
  used only as an oracle.
"""

from __future__ import annotations

import threading
from pathlib import Path

import numpy as np
import plotly.graph_objects as go
import pytest
from numpy.testing import assert_allclose

from workbench.materials import load_materials
from workbench.studies.wall import Candidate, HeatBudget, Layer, WallStudy
from workbench.widgets import Workbench, fine_sweep
from workbench.widgets.charts import EACH_TRACE_LIMIT
from workbench.widgets.plotview import PlotView, figure_spec
from workbench.widgets.runner import Cancelled, TaskRunner
from workbench.widgets.style import ACCENT

R_SI, R_SE = 0.13, 0.04  # ISO 6946:2017 Table 7, horizontal heat flow
W_PER_M2_PER_BTU_H_FT2 = 3.154591  # NIST SP 811 (2008) App. B.8: Btu_IT/(h·ft²) -> W/m²
INCH = 0.0254  # NIST SP 811 (2008) App. B.8, exact


@pytest.fixture(scope="module")
def materials():
    return load_materials()


@pytest.fixture()
def wb():
    return Workbench()


def _line(wb, label):
    """The flux chart's trace for one candidate (each-trace mode)."""
    return next(t for t in wb.flux_chart.fig.data if t.name == label)


def _fourier(k, thickness, delta_t):
    return abs(delta_t) / (R_SI + thickness / k + R_SE)


def test_default_workbench_is_labelled_demo_and_shows_data(wb):
    assert "DEMO" in wb.header.value and "invented" in wb.header.value
    assert "not a substitute for testing, local codes or licensed" in wb.cautions.value
    for chart in (wb.flux_chart, wb.req_chart, wb.trade_chart, wb.prof_chart):
        values = [t.x if isinstance(t, go.Bar) else t.y for t in chart.fig.data]
        ys = [np.asarray(v, float) for v in values if v is not None and len(v)]
        assert ys and all(np.isfinite(y).any() for y in ys)
        assert chart.fig.layout.xaxis.title.text and "[" in chart.fig.layout.xaxis.title.text
    assert wb.table.html.value.count("<tr") == 1 + len(wb.study.candidates)
    assert wb.status.value == ""


def test_flux_chart_follows_fouriers_law(wb, materials):
    # PIR has no k(T) curve in the tables, so the table k applies at every thickness
    s = wb.study
    i = s.names.index("pir_32")
    line = _line(wb, wb.labels[i])
    x_m = np.asarray(line.x) / 1000.0  # chart in mm
    k = materials.loc["pir_32", "conductivity"]
    assert_allclose(np.asarray(line.y), _fourier(k, x_m, s.delta_t), rtol=1e-9)
    assert wb.flux_chart.fig.layout.yaxis.type == "log"
    assert "W/m²" in wb.flux_chart.fig.layout.yaxis.title.text


def test_thickness_slider_updates_figures_in_place(wb, materials):
    fig = wb.flux_chart.fig
    uids = [t.uid for t in fig.data]
    now = fig.data[-1]
    before = np.asarray(now.y).copy()
    wb.s_thick.value = 25.0
    assert fig is wb.flux_chart.fig and [t.uid for t in fig.data] == uids  # not rebuilt
    after = np.asarray(now.y)
    assert not np.allclose(before, after)
    i = wb.study.names.index("pir_32")
    k = materials.loc["pir_32", "conductivity"]
    assert_allclose(after[i], _fourier(k, 0.025, wb.study.delta_t), rtol=1e-9)
    assert_allclose(np.asarray(now.x), 25.0)
    assert "25 mm" in wb.prof_chart.fig.layout.title.text
    assert wb.table.html.value.count("<tr") == 1 + len(wb.study.candidates)


def test_delta_t_slider_moves_inside_temperature_and_scales_flux(wb, materials):
    i = wb.study.names.index("pir_32")
    wb.s_dt.value = 30.0
    assert wb.study.delta_t == pytest.approx(-30.0)  # cabinet colder than the shop
    assert wb.f_inside.text.value == "-5.0 °C"  # outside 25 °C minus 30 K
    k = materials.loc["pir_32", "conductivity"]
    line = _line(wb, wb.labels[i])
    assert_allclose(np.asarray(line.y), _fourier(k, np.asarray(line.x) / 1000, 30.0), rtol=1e-9)
    # required thickness for 6 W/m²: L = k (ΔT/q − Rsi − Rse)
    bar = wb.req_chart.fig.data[0]
    j = list(bar.y).index(wb.labels[i])
    assert bar.x[j] == pytest.approx(1000 * k * (30.0 / 6.0 - R_SI - R_SE), rel=1e-9)


def test_inputs_accept_units(wb):
    msgs = wb.set_inputs(max_thickness="1 in", t_outside="77 °F", area="2 ft^2")
    assert msgs == {"max_thickness": "", "t_outside": "", "area": ""}
    assert wb.study.max_thickness == pytest.approx(INCH)
    assert wb.study.t_outside == pytest.approx(298.15)  # 77 °F = 25 °C
    assert wb.study.area == pytest.approx(2 * 0.3048**2)
    note = wb.req_chart.fig.layout.annotations[0]
    assert note.text == "max 25.4 mm"
    assert wb.req_chart.fig.layout.shapes[0].x0 == pytest.approx(25.4)


@pytest.mark.parametrize(
    ("field", "text", "words"),
    [
        ("area", "25 kg", ["area", "m²"]),
        ("max_thickness", "thick", ["max thickness", "mm"]),
        ("max_thickness", "-5 mm", ["max thickness", "> 0 m"]),
        ("t_inside", "-300 °C", ["inside temperature", "absolute zero"]),
        ("budget", "5 W", ["heat budget", "W/m²"]),
        ("area", "", ["area", "no value"]),
        ("max_thickness", "nan mm", ["max thickness", "finite"]),
    ],
)
def test_bad_input_shows_message_and_keeps_last_good_result(wb, field, text, words):
    fig = wb.flux_chart.fig
    before_y = [np.asarray(t.y).copy() for t in fig.data]
    before_state = (wb.study.area, wb.study.max_thickness, wb.study.t_inside, wb.study.budget)
    msg = wb.set_inputs(**{field: text})[field]  # must not raise
    assert msg, "a bad value must show a message"
    for w in words:
        assert w in msg
    box = {"area": wb.f_area, "max_thickness": wb.f_max, "t_inside": wb.f_inside, "budget": wb.f_budget}[field]
    assert "hw-msg" in box.message.value
    assert (wb.study.area, wb.study.max_thickness, wb.study.t_inside, wb.study.budget) == before_state
    for old, tr in zip(before_y, fig.data, strict=True):
        assert_allclose(np.asarray(tr.y), old)
    # a good value afterwards clears the message
    good = {"area": "1 m²", "max_thickness": "50 mm", "t_inside": "4 °C", "budget": "7 W/m²"}[field]
    assert wb.set_inputs(**{field: good})[field] == ""
    assert box.message.value == ""


def test_us_customary_switch_relabels_every_number_and_axis(wb):
    q_si = np.asarray(wb.flux_chart.fig.data[0].y).copy()
    x_si = np.asarray(wb.flux_chart.fig.data[0].x).copy()
    wb.system_toggle.value = "US"
    f = wb.flux_chart.fig
    assert "[Btu/(h·ft²)]" in f.layout.yaxis.title.text and "[in]" in f.layout.xaxis.title.text
    assert_allclose(np.asarray(f.data[0].y), q_si / W_PER_M2_PER_BTU_H_FT2, rtol=1e-6)
    assert_allclose(np.asarray(f.data[0].x), x_si / 25.4, rtol=1e-12)
    assert "[in]" in wb.req_chart.fig.layout.xaxis.title.text
    assert "[lb/ft²]" in wb.trade_chart.fig.layout.yaxis.title.text
    assert "[°F]" in wb.prof_chart.fig.layout.yaxis.title.text
    assert "[in]" in wb.table.html.value and "[°F]" in wb.table.html.value
    assert wb.f_inside.text.value == "37.4 °F"  # 3 °C
    assert wb.f_max.text.value == "2.362 in"  # 60 mm
    assert wb.s_thick.description == "Thickness [in]" and wb.s_dt.description == "ΔT [°F]"
    assert wb.s_dt.value == pytest.approx(22 * 9 / 5)
    # typing in US units while the US display is on
    assert wb.set_inputs(max_thickness="3") == {"max_thickness": ""}  # bare number: inches
    assert wb.study.max_thickness == pytest.approx(3 * INCH)
    wb.system_toggle.value = "SI"
    assert_allclose(np.asarray(f.data[0].y), q_si, rtol=1e-9)


def test_budget_kind_switch_keeps_the_same_budget(wb):
    req = wb.view.required.copy()
    wb.budget_kind.value = "power"
    assert wb.f_budget.text.value == "3.6 W"  # 6 W/m² over the demo's 0.6 m²
    assert_allclose(wb.view.required, req, rtol=1e-9)
    wb.budget_kind.value = "u_value"
    assert wb.study.budget.kind == "u_value"
    assert wb.study.budget.value == pytest.approx(6.0 / 22.0)
    assert_allclose(wb.view.required, req, rtol=1e-9)
    assert wb.set_inputs(budget="0.2 W/(m²·K)") == {"budget": ""}
    assert np.all(wb.view.required > req)


def test_chosen_candidate_is_highlighted_the_same_way_everywhere(wb):
    i = wb.study.names.index("xps_35")
    wb.highlight.value = i
    label = wb.labels[i]
    flux = wb.flux_chart.fig
    high = next(t for t in flux.data if t.name == f"chosen: {label}")
    assert high.line.color == ACCENT
    assert_allclose(np.asarray(high.y), np.asarray(_line(wb, label).y))
    bar = wb.req_chart.fig.data[0]
    j = list(bar.y).index(label)
    assert bar.marker.color[j] == ACCENT and sum(c == ACCENT for c in bar.marker.color) == 1
    pts, ring = wb.trade_chart.fig.data[1], wb.trade_chart.fig.data[2]
    assert (ring.x[0], ring.y[0]) == (pts.x[i], pts.y[i]) and ring.marker.color == ACCENT
    assert label in wb.prof_chart.fig.layout.title.text
    assert '<tr class="hw-chosen"' in wb.table.html.value
    chosen_row = wb.table.html.value.split('<tr class="hw-chosen"')[1].split("</tr>")[0]
    assert 'data-candidate="xps_35"' in chosen_row


def test_temperature_profile_in_the_chart(wb):
    tr = wb.prof_chart.fig.data[0]
    t = np.asarray(tr.y)
    assert t[0] == pytest.approx(3.0) and t[-1] == pytest.approx(25.0)  # air temperatures, °C
    assert np.all(np.diff(t) >= 0)  # heat flows inward: temperature rises monotonically outward


def test_results_table_sorts(wb):
    frame = wb.table.frame
    wb.table.sort.value = "Mass per area"
    order = [r.split('data-candidate="')[1].split('"')[0] for r in wb.table.html.value.split("<tr")[2:]]
    assert order == list(frame.sort_values("mass_per_area").index)
    wb.table.descending.value = True
    order2 = [r.split('data-candidate="')[1].split('"')[0] for r in wb.table.html.value.split("<tr")[2:]]
    assert order2 == order[::-1]
    assert "Mass per area [kg/m²]" in wb.table.html.value


def test_trade_off_marks_the_non_dominated_candidates(wb):
    pytest.importorskip("workbench.ranking", reason="workbench.ranking (pareto_front) not landed yet")
    paretoset = pytest.importorskip("paretoset")
    pts = wb.trade_chart.fig.data[1]
    x, y = np.asarray(pts.x), np.asarray(pts.y)
    expected = paretoset.paretoset(np.column_stack([x, y]), sense=["min", "min"])
    assert list(np.asarray(pts.marker.symbol) == "diamond") == list(expected)


def test_picker_search_filter_add_remove(wb):
    p = wb.picker
    p.search.value = "stainless"
    ids = [v for _, v in p.available.options]
    assert ids and all("stainless" in i for i in ids)
    p.available.value = ("stainless_304",)
    assert "14.9 W/(m·K)" in p.detail.value and "source" in p.detail.value
    p.add.click()
    assert "stainless_304" in wb.study.names
    assert len(wb.flux_chart.fig.data) == len(wb.study.names) + 3
    i = wb.study.names.index("stainless_304")
    assert wb.req_chart.fig.layout.xaxis.type == "log"  # steel needs metres, foams millimetres
    assert wb.labels[i] in list(wb.req_chart.fig.data[0].y) or len(wb.study.names) > 20
    p.family.value = "rigid_foam"
    p.search.value = ""
    assert all(wb.study.materials.loc[v, "family"] == "rigid_foam" for _, v in p.available.options)
    p.chosen.value = ("stainless_304",)
    p.remove.click()
    assert "stainless_304" not in wb.study.names
    p.chosen.value = tuple(p.chosen_ids)
    p.remove.click()
    assert "at least one" in p.message.value and len(wb.study.names) == 9


def test_user_materials_file(wb):
    p = wb.picker
    p.path.value = "tests/data/bad_many.csv"
    p.load.click()
    assert "bad_many.csv:5:emissivity" in p.message.value
    p.path.value = "tests/data/no_such_file.csv"
    p.load.click()
    assert "materials file" in p.message.value
    p.path.value = "tests/data/user_materials_ok.csv"
    p.load.click()
    assert "Loaded" in p.message.value
    user = load_materials("tests/data/user_materials_ok.csv")
    new = [i for i in user.index if user.loc[i, "origin"] != "curated"]
    assert new and set(new) <= {v for _, v in p.available.options} | set(wb.study.materials.index)
    assert wb.status.value == ""


def test_many_candidates_use_one_combined_trace(materials):
    ids = [i for i in materials.index if materials.loc[i, "family"] != "gas"][: EACH_TRACE_LIMIT + 8]
    study = WallStudy(ids, materials, t_inside=276.15, t_outside=298.15, budget=HeatBudget("flux", 6.0),
                      max_thickness=0.06)
    wb = Workbench(study)
    line = wb.flux_chart.fig.data[0]
    g = wb.view.grid.size
    assert len(line.y) == len(ids) * (g + 1)
    y = np.asarray(line.y, float).reshape(len(ids), g + 1)
    assert np.isnan(y[:, -1]).all()
    assert_allclose(y[:, :-1], wb.view.flux)
    assert "DEMO" not in wb.header.value


def test_build_ups_and_films_suffice(materials):
    # a two-layer build-up and a budget so loose that the films alone meet it
    panel = Candidate("steel-faced PIR", (Layer("carbon_steel", 0.0006), Layer("pir_32")))
    study = WallStudy(["eps_20", panel], materials, t_inside=293.15, t_outside=283.15,
                      budget=HeatBudget("flux", 100.0))
    wb = Workbench(study)
    assert wb.view.required.tolist() == [0.0, 0.0]  # 10 K / 0.17 m²K/W = 59 W/m² < 100 W/m²
    assert list(wb.req_chart.fig.data[0].text) == ["films suffice", "films suffice"]
    wb.highlight.value = 1
    assert wb.prof_chart.fig.layout.annotations[1].text == "pir_32"


def test_chart_views_hold_the_current_figure_after_every_change(wb):
    # what the browser draws is the view's synced data and layout: it must follow every change
    wb.s_thick.value = 33.0
    for chart in wb._charts():
        spec = figure_spec(chart.fig)
        assert chart.view.data == spec["data"] and chart.view.layout == spec["layout"]
    assert wb.flux_chart.view.data[-1]["x"][0] == pytest.approx(33.0)
    rev = wb.flux_chart.view.revision
    wb.s_thick.value = 34.0
    assert wb.flux_chart.view.revision == rev + 1
    assert wb.flux_chart.view.data[-1]["x"][0] == pytest.approx(34.0)
    assert "title" in wb.flux_chart.view.layout and "34" in wb.flux_chart.view.layout["title"]["text"]


def test_clicks_in_the_browser_choose_a_candidate(wb):
    # a click message from the browser on a required-thickness bar or a trade-off point
    label = wb.req_chart.fig.data[0].y[2]
    wb.req_chart.view._message(wb.req_chart.view, {"type": "click", "curve": 0, "point": 2}, [])
    assert wb.labels[wb.highlight.value] == label
    wb.trade_chart.view._message(wb.trade_chart.view, {"type": "click", "curve": 1, "point": 4}, [])
    assert wb.highlight.value == 4


def test_plot_view_sends_the_packaged_plotly_js_once_asked():
    import plotly

    view = PlotView(go.Figure(go.Scatter(x=[0, 1], y=[2, 3])))
    sent = []
    view.send = lambda content, buffers=None: sent.append((content, buffers))  # capture the reply
    view._message(view, {"type": "plotly-request"}, [])
    assert sent[0][0] == {"type": "plotly-source"}
    js = sent[0][1][0]
    packaged = Path(plotly.__file__).parent / "package_data" / "plotly.min.js"
    assert js == packaged.read_bytes() and js.startswith(b"/**\n* plotly.js v")
    with pytest.raises(ValueError, match="fig"):
        PlotView({"data": []})


def test_fine_sweep_runner_matches_the_study_and_reports_progress(wb):
    study = wb.study
    lt = np.linspace(0.005, 0.1, 50)
    dts = np.linspace(1.0, 40.0, 70)
    seen = []
    runner = TaskRunner()
    out = runner.run(fine_sweep, study, lt, dts, chunk=16, background=False, on_done=seen.append)
    assert runner.state == "done" and seen and seen[0] is out
    assert_allclose(out, study.sweep(lt, dts))
    fractions = []
    fine_sweep(study, lt, dts, progress=fractions.append, chunk=16)
    assert fractions == sorted(fractions) and fractions[-1] == 1.0 and len(fractions) == 5


def test_runner_cancel_stops_between_chunks(wb):
    calls = []

    def cancelled():
        calls.append(1)
        return len(calls) > 2  # the user presses Cancel during the third chunk

    with pytest.raises(Cancelled):
        fine_sweep(wb.study, np.linspace(0.01, 0.1, 20), np.linspace(1, 40, 100), cancelled=cancelled, chunk=10)
    assert len(calls) == 3
    # through the widget, in a background thread: the cancel button stops a long sweep
    runner = TaskRunner()
    started = threading.Event()

    def slow(progress, cancelled):
        def progress2(f):
            started.set()
            progress(f)
        return fine_sweep(wb.study, np.linspace(0.001, 0.2, 400), np.linspace(0.5, 60, 4000),
                          progress=progress2, cancelled=lambda: cancelled() or False, chunk=1)

    runner.run(slow)
    assert started.wait(30)
    runner.cancel_button.click()
    assert runner.wait(30)
    assert runner.state == "cancelled" and "Cancelled" in runner.status.value
    assert 0 < runner.bar.value < 1


def test_runner_failure_is_shown_not_raised(wb):
    runner = TaskRunner()
    out = runner.run(fine_sweep, wb.study, [0.01, -0.02], [10.0], background=False)
    assert out is None and runner.state == "failed"
    assert "thicknesses" in runner.status.value


def test_workbench_fine_sweep_button(wb):
    wb.start_fine_sweep(background=False, n=60)
    assert wb.runner.state == "done"
    assert "meets the budget" in wb.sweep_result.value or "exceeds the budget" in wb.sweep_result.value


def test_static_mode_shows_figure_documents_of_the_current_state():
    # the fallback for front ends without plotly's widget code
    wb = Workbench(redraw="static")
    assert "hw-redraw-static" in wb._dom_classes
    outs = wb.charts.children
    assert [type(o).__name__ for o in outs] == ["Output"] * 4
    assert "hw-chart-flux" in outs[0]._dom_classes and "hw-chart-profile" in outs[3]._dom_classes
    wb.s_thick.value = 22.0
    assert wb.charts.children == outs  # the same Output widgets, new content
    doc = outs[0].outputs[0]["data"]["application/vnd.plotly.v1+json"]
    assert doc["data"][-1]["x"][0] == pytest.approx(22.0)  # plain JSON lists
    assert "22 mm" in outs[3].outputs[0]["data"]["application/vnd.plotly.v1+json"]["layout"]["title"]["text"]
    # a thickness move changes neither the required-thickness bars nor the trade-off chart:
    # those Output widgets are not resent (the browser would redraw them for nothing)
    before = [o.outputs for o in outs]
    wb.s_thick.value = 30.0
    assert outs[1].outputs is before[1] and outs[2].outputs is before[2]
    assert outs[0].outputs is not before[0] and outs[3].outputs is not before[3]
    msg = wb.set_inputs(max_thickness="1 in")
    assert msg == {"max_thickness": ""}
    notes = outs[1].outputs[0]["data"]["application/vnd.plotly.v1+json"]["layout"]["annotations"]
    assert notes[0]["text"] == "max 25.4 mm"
    with pytest.raises(ValueError, match="redraw"):
        Workbench(redraw="sometimes")


def test_table_lists_at_most_40_rows(materials):
    ids = [i for i in materials.index if materials.loc[i, "family"] != "gas"][:45]
    wb = Workbench(WallStudy(ids, materials, budget=HeatBudget("flux", 10.0)))
    assert wb.table.html.value.count("<tr") == 1 + 40
    assert "first 40 of 45" in wb.table.html.value


# ---------------------------------------------------------------------------
# Scenario files from the workbench (save, open, reopen the last used)
# ---------------------------------------------------------------------------


def test_save_then_open_restores_inputs_and_choice(tmp_path, materials):
    first = Workbench(autosave_delay=None)
    assert first.set_inputs(t_inside="38 °F", budget="7 W/m^2") == {"t_inside": "", "budget": ""}
    first.highlight.value = 2
    bar = first.scenario_bar
    bar.path.value = str(tmp_path / "panel.toml")
    bar.save()
    assert "Saved" in bar.message.value

    second = Workbench(autosave_delay=None)
    second.scenario_bar.path.value = str(tmp_path / "panel.toml")
    second.scenario_bar.open()
    assert second.study.names == first.study.names
    assert second.study.t_inside == pytest.approx((38 - 32) * 5 / 9 + 273.15, abs=1e-9)
    assert second.study.budget.value == pytest.approx(7.0)
    assert second._chosen == 2
    assert_allclose(second.study.required_thickness(), first.study.required_thickness(), rtol=1e-12)
    assert second.f_inside.value_si == pytest.approx(first.f_inside.value_si, abs=1e-9)
    assert second.f_inside.text.value.endswith("°C")  # shown in the saved display system


def test_save_never_clobbers_silently(tmp_path):
    w = Workbench(autosave_delay=None)
    target = tmp_path / "panel.toml"
    target.write_text("# someone else's file\n")
    w.scenario_bar.path.value = str(target)
    w.scenario_bar._guard(w.scenario_bar.save)
    assert "exists" in w.scenario_bar.message.value
    assert target.read_text() == "# someone else's file\n"
    w.scenario_bar.overwrite.value = True
    w.scenario_bar._guard(w.scenario_bar.save)
    assert "Saved" in w.scenario_bar.message.value
    assert (tmp_path / "panel.toml.bak").read_text() == "# someone else's file\n"


def test_open_bad_or_foreign_scenario_shows_a_message_and_keeps_the_study(tmp_path):
    w = Workbench(autosave_delay=None)
    names = list(w.study.names)
    bad = tmp_path / "broken.toml"
    bad.write_text('format_version = 1\nkind = "wall"\n[inputs]\nt_inside = "20 kg"\n')
    for path in (bad, tmp_path / "missing.toml", "examples/shipper.toml"):
        w.scenario_bar.path.value = str(path)
        w.scenario_bar._guard(w.scenario_bar.open)
        assert 'class="hw-msg"' in w.scenario_bar.message.value
        assert w.study.names == names


def test_last_used_scenario_survives_a_new_workbench(tmp_path, monkeypatch):
    """After a kernel restart a new workbench can reopen what was shown last."""
    monkeypatch.setenv("HEATPATH_STATE_DIR", str(tmp_path / "state"))
    w = Workbench(autosave_delay=60.0)
    w.set_inputs(max_thickness="85 mm")
    w.scenario_bar.flush()
    fresh = Workbench(autosave_delay=None)
    fresh.scenario_bar.recover()
    assert fresh.study.max_thickness == pytest.approx(0.085)
    assert "Reopened" in fresh.scenario_bar.message.value


def test_rank_stability_button_tabulates_the_studys_monte_carlo(wb):
    wb.start_rank_stability(background=False, n_samples=4000)
    assert wb.runner.state == "done", wb.runner.error
    frame = wb.study.uncertainty(n_samples=4000)  # same seed: the numbers shown are the study's
    html_ = wb.mc_result.value
    assert "4,000 samples" in html_ and html_.count("<tr>") == len(wb.study.candidates) + 1
    p90_mm = frame["total_thickness_p90"].to_numpy() * 1000
    shown = [f"{v:.3g}" for v in p90_mm]
    assert all(f"<td>{s}</td>" in html_ for s in shown)


def test_rank_stability_cancel_before_the_first_chunk(wb):
    # Cancel pressed before any sample is drawn (a loaded machine): a clean "cancelled", no table
    snapshot = wb.study
    frame = snapshot.uncertainty(n_samples=1000, cancel=lambda: True)
    assert frame.attrs["cancelled"] and frame.attrs["n_samples"] == 0
    assert frame["total_thickness_p50"].isna().all()


def test_rank_stability_cancel_shows_no_partial_estimate(wb):
    wb.start_rank_stability(background=True, n_samples=500_000)  # about 2 s of work
    wb.runner.cancel_button.click()
    assert wb.runner.wait(60)
    assert wb.runner.state == "cancelled" and "stopped after" in wb.runner.status.value
    assert wb.mc_result.value == ""


def test_buildup_search_button_lists_build_ups_that_meet_the_budget(wb):
    wb.start_buildup_search(background=False)
    assert wb.runner.state == "done", wb.runner.error
    frame = wb.study.buildup_search()
    n_ok = int(frame["meets_budget"].sum())
    text = wb.stack_result.value
    assert f"{len(frame)} non-dominated build-ups" in text and f"{n_ok} of them meet the heat budget" in text
    assert text.count("<tr>") == 1 + min(8, n_ok if n_ok else len(frame))
    wb.system_toggle.value = "US"
    wb.start_buildup_search(background=False)
    assert "[in]" in wb.stack_result.value and "/ft²]" in wb.stack_result.value


def _client(view):
    """What the browser side of a PlotView holds: the full state, then each patch applied the way
    the view's JavaScript applies it (records the messages instead of a kernel comm)."""
    state = {}
    sent = []

    def send(msg, buffers=None):
        sent.append(msg)
        if msg["type"] == "full":
            state.update(data=list(msg["data"]), layout=msg["layout"], revision=msg["revision"])
        elif msg["type"] == "patch":
            assert msg["base"] == state["revision"]
            data = state["data"][: msg["n"]]
            for i, c in msg["traces"].items():
                k = int(i)
                if k >= len(data):
                    data.append(None)
                data[k] = c["full"] if "full" in c else {**data[k], **c["set"]}
            if "layout" in msg:
                layout = msg["layout"]
                if "template" not in layout and "template" in state["layout"]:
                    layout = {**layout, "template": state["layout"]["template"]}
                state["layout"] = layout
            state.update(data=data, revision=msg["revision"])

    view.send = send
    view._message(view, {"type": "full-request"}, [])
    return state, sent


def test_plot_view_patches_rebuild_the_figure_on_the_client():
    x = np.linspace(0.0, 1.0, 500)
    fig = go.Figure([go.Scatter(x=x, y=x**2, text=[f"p{i}" for i in range(500)], name="a"),
                     go.Scatter(x=[0, 1], y=[1, 0], name="b")], layout=dict(title=dict(text="t0")))
    view = PlotView(fig)
    state, sent = _client(view)
    fig.data[0].y = x**3  # only y changes: text and x are not resent
    assert view.push()
    assert set(sent[-1]["traces"]["0"]["set"]) == {"y"} and "layout" not in sent[-1]
    fig.layout.title.text = "t1"  # layout only, without the template
    view.push()
    assert "template" not in sent[-1]["layout"] and sent[-1]["traces"] == {}
    fig.add_trace(go.Bar(x=["u", "v"], y=[np.nan, 2.0]))  # a new trace (NaN sent as null)
    fig.data[1].name = None  # a property removed: the whole trace travels
    view.push()
    assert "full" in sent[-1]["traces"]["1"] and "full" in sent[-1]["traces"]["2"]
    fig.data = fig.data[:2]  # a trace removed
    view.push()
    spec = figure_spec(fig)
    assert state["data"] == spec["data"] and state["layout"] == spec["layout"]
    assert not view.push() and state["revision"] == view.revision == 4


# ---------------------------------------------------------------------------
# The meeting's decision form and "Compare with…" (workbench.widgets.decision)
# ---------------------------------------------------------------------------
EXAMPLE_WALL = Path(__file__).resolve().parents[1] / "examples" / "wall.toml"


def _opened(path) -> Workbench:
    w = Workbench(autosave_delay=None)
    w.scenario_bar.path.value = str(path)
    w.scenario_bar.open()
    return w


def test_decision_form_reopens_from_the_file_and_saves_back(tmp_path):
    import datetime

    from workbench.report import evaluate, render_html
    from workbench.scenario import load_scenario
    from workbench.widgets.decision import decision_fields

    w = _opened(EXAMPLE_WALL)
    form = w.decision_form
    # the demo file's [decision] table fills the form, date as recorded
    assert form.chosen.value == "steel/PIR/steel panel"
    assert form.decided_by.value == "demo review team"
    assert form.values()["date"] == "2026-12-01"
    assert list(form.chosen.options)[1:] == w.study.names
    # the meeting changes its mind: the date becomes today's (ISO 8601), the charts mark it
    form.chosen.value = "pir_32"
    form.rationale.value = "Demo: thinnest of the cheap boards."
    form.attendees.value = "Ada,  Bo, Chen"
    assert form.values()["date"] == datetime.date.today().isoformat()
    assert w.study.names[w._chosen] == "pir_32"
    assert form.message.value == ""
    w.scenario_bar.path.value = str(tmp_path / "after_review.toml")
    w.scenario_bar.save()
    saved = load_scenario(tmp_path / "after_review.toml")
    f = decision_fields(saved.decision)
    assert f == {"chosen": "pir_32", "rationale": "Demo: thinnest of the cheap boards.",
                 "decided_by": "demo review team", "attendees": "Ada, Bo, Chen",
                 "date": datetime.date.today().isoformat()}
    # the file's criteria and constraints survive the round trip through the workbench
    demo = load_scenario(EXAMPLE_WALL)
    assert saved.criteria == demo.criteria and saved.constraints == demo.constraints
    page = render_html(evaluate(saved))
    assert "pir_32" in page and "thinnest of the cheap boards" in page
    again = _opened(tmp_path / "after_review.toml")
    assert again.decision_form.values() == form.values()


def test_decision_form_drops_a_candidate_that_is_gone():
    w = Workbench(autosave_delay=None)
    form = w.decision_form
    form.chosen.value = "xps_35"
    assert w.current_scenario().decision.chosen == "xps_35"
    w.picker.set_chosen([n for n in w.study.names if n != "xps_35"], notify=True)
    assert "xps_35" not in w.study.names
    assert not form.decided and "no longer a candidate" in form.message.value
    # undecided: the scenario keeps the highlighted candidate only, without the meeting's fields
    assert w.current_scenario().decision.rationale == ""


def test_compare_with_an_earlier_scenario_file(tmp_path):
    w = _opened(EXAMPLE_WALL)
    box = w.compare_box
    box.path.value = str(EXAMPLE_WALL)
    box.compare()
    assert box.diff.same and "No differences" in box.message.value and box.table.value == ""
    assert w.set_inputs(budget="6 W/m²") == {"budget": ""}
    w.decision_form.chosen.value = "eps_20"
    box.button.click()
    frame = box.diff.to_frame()
    assert "budget: 8 W/m² → 6 W/m²" in list(frame["change"])
    assert "decision changed: steel/PIR/steel panel → eps_20" in list(frame["change"])
    assert box.table.value.count("<tr") == len(frame) + 1  # header row + one per change
    assert f"{len(frame)} differences" in box.message.value


def test_compare_with_refuses_missing_and_broken_files_with_a_message(tmp_path):
    w = Workbench(autosave_delay=None)
    box = w.compare_box
    broken = tmp_path / "broken.toml"
    broken.write_text(EXAMPLE_WALL.read_text("utf-8").replace('area = "40 m²"', 'area = "40 kg"'), "utf-8")
    line = next(i for i, t in enumerate(broken.read_text("utf-8").splitlines(), 1) if t.startswith("area ="))
    for path, words in (("", "enter the name"), (tmp_path / "none.toml", "no such file"),
                        (broken, f"broken.toml:{line}:")):
        box.path.value = str(path)
        box.button.click()
        assert 'class="hw-msg"' in box.message.value and words in box.message.value, box.message.value
        assert "Traceback" not in box.message.value and box.table.value == ""
