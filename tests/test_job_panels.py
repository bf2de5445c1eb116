"""Headless tests of the shipper and housing panels (workbench.widgets.*_panel).

The panels are driven as a user would: sliders moved, text typed with units,
the display system switched. Expected numbers are computed here from fresh
study objects (the panels' own numbers are never copied), with the typed
values converted by factors from outside the project:

* scipy.constants (CODATA 2018 / NIST SP 811 (2008) Appendix B.8): pound =
  0.45359237 kg (exact), hour = 3600 s, Btu = 1055.05585262 J (International
  Table Btu), and ``convert_temperature`` for °F ↔ K (°F = °C·9/5 + 32).
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants

from workbench.widgets.housing_panel import HousingPanel, demo_housing_study, with_power
from workbench.widgets.shipper_panel import ShipperPanel, demo_shipper_study


def _f_to_k(value_f: float) -> float:
    return float(constants.convert_temperature(value_f, "Fahrenheit", "Kelvin"))


def _k_to_f(value_k):
    return constants.convert_temperature(np.asarray(value_k, float), "Kelvin", "Fahrenheit")


# ------------------------------------------------------------------- shipper
@pytest.fixture(scope="module")
def ship_study():
    return demo_shipper_study()


@pytest.fixture
def ship(ship_study):
    return ShipperPanel(ship_study, coolant_mass=3.0)


def _hold_y(panel, name):
    i = panel.study.names.index(name)
    return np.asarray(panel.fig_hold.data[i].y, float)


def test_shipper_default_is_demo_with_data_and_cautions():
    p = ShipperPanel()
    assert "DEMO — invented numbers" in p.header.value
    assert "hw-shipper" in p._dom_classes
    n_thk = p.study.thicknesses.size
    for i in range(len(p.study.names)):
        assert len(p.fig_hold.data[i].y) == n_thk
        assert len(p.fig_cost.data[i].y) == n_thk
        assert np.all(np.isfinite(np.asarray(p.fig_cost.data[i].y, float)))
    text = p.cautions.value.lower()
    assert "frozen" in text and "2–8 °c" in text
    assert "dry ice" in text and "dangerous goods" in text and "ventilate" in text
    assert "qualified by testing" in text
    assert "[mm]" in p.fig_hold.layout.xaxis.title.text and "[h]" in p.fig_hold.layout.yaxis.title.text
    assert "[EUR]" in p.fig_cost.layout.yaxis.title.text
    assert "[mm]" in p.table.value and "[kg]" in p.table.value


def test_shipper_slider_moves_markers_in_place(ship, ship_study):
    fig, marks = ship.fig_hold, ship.fig_hold.data[-1]
    before = np.asarray(marks.y, float).copy()
    ship.slider.value = 0.03
    assert ship.fig_hold is fig and ship.fig_hold.data[-1] is marks
    after = np.asarray(marks.y, float)
    assert not np.allclose(before, after)
    # independent: the study's own hold curve with 3 kg of coolant, at 30 mm (hours)
    curve = ship_study.hold_curve(3.0)
    expected = curve[np.isclose(curve["thickness"], 0.03)]["hold_time_simulated"].to_numpy() / constants.hour
    assert_allclose(after, expected, rtol=1e-9)
    assert ship.fig_cost.layout.shapes[0].x0 == pytest.approx(30.0)


def test_shipper_coolant_mass_in_pounds_updates_hold_chart(ship, ship_study):
    fig, trace = ship.fig_hold, ship.fig_hold.data[0]
    before = np.asarray(trace.y, float).copy()
    assert ship.set_inputs(coolant_mass="8 lb") == {"coolant_mass": ""}
    assert ship.fig_hold is fig and ship.fig_hold.data[0] is trace
    curve = ship_study.hold_curve(8 * constants.pound)  # lb -> kg, exact
    name = ship_study.names[0]
    expected = curve[curve["candidate"] == name]["hold_time_simulated"].to_numpy() / constants.hour
    assert not np.allclose(before, expected)
    assert_allclose(_hold_y(ship, name), expected, rtol=1e-9)


def test_shipper_target_and_rate_recompute_costs(ship, ship_study):
    star = ship.fig_cost.data[len(ship_study.names)]
    line_before = np.asarray(ship.fig_cost.data[1].y, float).copy()
    assert ship.set_inputs(duration="36 h", rate="0.9 EUR/lb") == {"duration": "", "rate": ""}
    assert ship.fig_cost.data[len(ship_study.names)] is star
    ref = dataclasses.replace(ship_study, duration=36 * constants.hour,
                              rate_per_kg=0.9 / constants.pound).results()
    assert ship.study.rate_per_kg == pytest.approx(0.9 / constants.pound)
    opt = ref.optimum[ref.optimum["meets_target"].astype(bool)]
    assert_allclose(np.asarray(star.y, float), opt["landed_cost"].to_numpy(float), rtol=1e-9)
    assert_allclose(np.asarray(star.x, float), opt["thickness"].to_numpy(float) * 1000, rtol=1e-9)
    name = ship_study.names[1]
    g = ref.sweep[ref.sweep["candidate"] == name]
    assert not np.allclose(line_before, g["landed_cost"].to_numpy(float))
    assert_allclose(np.asarray(ship.fig_cost.data[1].y, float), g["landed_cost"].to_numpy(float), rtol=1e-9)


def test_shipper_recompute_runs_as_a_task_and_cancel_keeps_the_last_result(ship_study):
    panel = ShipperPanel(ship_study, coolant_mass=3.0)  # background=True, as in a notebook
    hold_before = _hold_y(panel, ship_study.names[0]).copy()
    panel.f_duration.text.value = "400 h"  # a long run: twice 400 h for the hold chart
    assert panel.f_duration.error == ""
    assert panel.runner.busy or panel.runner.state != "idle"
    panel.runner.cancel_button.click()
    assert panel.wait(120)
    if panel.runner.state == "cancelled":  # the normal case: Cancel lands within the run
        assert "Cancelled" in panel.runner.status.value and "Not applied: target hold time 400 h" in \
            panel.runner.status.value
        assert panel.study.duration == ship_study.duration  # charts and table keep the last result
        assert_allclose(_hold_y(panel, ship_study.names[0]), hold_before)
        assert panel.f_duration.text.value == "48 h"  # the field shows the charts' input again
    # the next input starts from the last completed inputs and finishes with a full bar
    assert panel.set_inputs(duration="36 h") == {"duration": ""}
    assert panel.runner.state == "done" and panel.runner.bar.value == 1.0
    assert panel.study.duration == pytest.approx(36 * constants.hour)
    ref = dataclasses.replace(ship_study, duration=36 * constants.hour).hold_curve(3.0)
    g = ref[ref["candidate"] == ship_study.names[0]]
    assert_allclose(_hold_y(panel, ship_study.names[0]), g["hold_time_simulated"].to_numpy(float) / 3600, rtol=1e-9)
    # a second input typed while the first still runs supersedes it and keeps both changes
    panel.f_rate.text.value = "2 EUR/kg"
    panel.f_duration.text.value = "40 h"
    assert panel.wait(120) and panel.runner.state == "done"
    assert panel.study.duration == pytest.approx(40 * constants.hour) and panel.study.rate_per_kg == pytest.approx(2.0)
    ref = dataclasses.replace(ship_study, duration=40 * constants.hour).hold_curve(3.0)
    g = ref[ref["candidate"] == ship_study.names[0]]
    assert_allclose(_hold_y(panel, ship_study.names[0]), g["hold_time_simulated"].to_numpy(float) / 3600, rtol=1e-9)


def test_shipper_ambient_in_fahrenheit_shifts_profile(ship, ship_study):
    assert ship.set_inputs(ambient="95 °F") == {"ambient": ""}
    times, temps = (np.asarray(v, float) for v in ship_study.t_ambient)
    shifted = (times, temps + (_f_to_k(95.0) - temps.max()))
    ref = dataclasses.replace(ship_study, t_ambient=shifted).hold_curve(3.0)
    name = ship_study.names[2]
    expected = ref[ref["candidate"] == name]["hold_time_simulated"].to_numpy() / constants.hour
    assert_allclose(_hold_y(ship, name), expected, rtol=1e-9)


def test_shipper_bad_input_keeps_last_result(ship):
    hold = [np.asarray(t.y, float).copy() for t in ship.fig_hold.data]
    cost = [np.asarray(t.y, float).copy() for t in ship.fig_cost.data]
    study = ship.study
    msg = ship.set_inputs(ambient="3 kg")["ambient"]
    assert "hottest ambient" in msg and "temperature" in msg
    assert "3 kg" in ship.f_ambient.message.value and "Traceback" not in ship.f_ambient.message.value
    msg = ship.set_inputs(duration="-5 h")["duration"]  # the study rejects it
    assert "duration" in msg
    assert ship.study is study
    for old, tr in zip(hold, ship.fig_hold.data, strict=True):
        assert np.array_equal(old, np.asarray(tr.y, float))
    for old, tr in zip(cost, ship.fig_cost.data, strict=True):
        assert np.array_equal(old, np.asarray(tr.y, float))


def test_shipper_constant_ambient_and_toggle(ship_study):
    small = dataclasses.replace(ship_study, candidates=ship_study.candidates[:2], t_ambient=298.15,
                                thicknesses=np.array([0.02, 0.04, 0.06]))
    p = ShipperPanel(small)
    assert "DEMO" not in p.header.value
    assert p.f_ambient.text.value == "25.0 °C"
    assert p.set_inputs(ambient="30 °C") == {"ambient": ""}
    assert p.study.t_ambient == pytest.approx(303.15)
    p.system_toggle.value = "US"  # the toggle drives set_system
    assert p.system == "US" and "[in]" in p.fig_hold.layout.xaxis.title.text


def test_shipper_us_system_relabels(ship, ship_study):
    y_h = np.asarray(ship.fig_hold.data[0].x, float).copy()
    ship.set_system("US")
    assert "[in]" in ship.fig_hold.layout.xaxis.title.text
    assert "[in]" in ship.fig_cost.layout.xaxis.title.text
    assert "[lb]" in ship.table.value and "[in]" in ship.table.value
    assert ship.f_ambient.text.value.endswith("°F")
    assert float(ship.f_ambient.text.value.split()[0]) == pytest.approx(
        float(_k_to_f(np.max(ship_study.t_ambient[1]))), abs=0.05)
    assert_allclose(np.asarray(ship.fig_hold.data[0].x, float), y_h / 25.4, rtol=1e-12)  # 1 in = 25.4 mm
    assert ship.slider.label.endswith("in")
    ship.slider.value = 0.05
    assert ship.fig_hold.layout.shapes[0].x0 == pytest.approx(0.05 / 0.0254)


# ------------------------------------------------------------------- housing
@pytest.fixture(scope="module")
def house_study():
    return demo_housing_study()


@pytest.fixture
def house(house_study):
    return HousingPanel(house_study)


def _share(study):
    return study.component.power / study.power


def test_housing_default_is_demo_with_data_and_cautions():
    p = HousingPanel()
    assert "DEMO — invented numbers" in p.header.value
    assert "hw-housing" in p._dom_classes
    n = len(p.study.names)
    for i in range(n):
        assert len(p.fig_eps.data[i].y) == p.emissivities.size
        assert len(p.fig_pow.data[i].y) > 10
    text = p.cautions.value.lower()
    assert "product standard" in text and "testing" in text and "first-order" in text
    assert "°C" in p.fig_eps.layout.yaxis.title.text and "[W]" in p.fig_pow.layout.xaxis.title.text
    assert "pass" in p.table.value and "Margin" in p.table.value


def test_housing_power_field_updates_in_place(house, house_study):
    fig, trace = house.fig_eps, house.fig_eps.data[0]
    before = np.asarray(trace.y, float).copy()
    assert house.set_inputs(power="4 W") == {"power": ""}
    assert house.fig_eps is fig and house.fig_eps.data[0] is trace
    ref_study = with_power(house_study, 4.0, _share(house_study))
    assert ref_study.component.power == pytest.approx(0.8 * 4 / 3)
    eps = ref_study.emissivity_sweep(house.emissivities)
    name = house_study.names[0]
    expected = eps[eps["candidate"] == name]["t_surface"].to_numpy() - 273.15
    assert not np.allclose(before, expected)
    assert_allclose(np.asarray(trace.y, float), expected, rtol=1e-9)
    res = ref_study.results()
    current = house.fig_pow.data[-1]
    assert_allclose(np.asarray(current.y, float), res["t_hot_spot"].to_numpy() - 273.15, rtol=1e-9)
    assert house.slider.value == pytest.approx(4.0)


@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
def test_housing_slider_moves_current_point(house, house_study):
    marks = house.fig_pow.data[-1]
    before = np.asarray(marks.y, float).copy()
    house.slider.value = 2.0
    assert house.fig_pow.data[-1] is marks
    res = with_power(house_study, 2.0, _share(house_study)).results()
    assert not np.allclose(before, np.asarray(marks.y, float))
    assert_allclose(np.asarray(marks.y, float), res["t_hot_spot"].to_numpy() - 273.15, rtol=1e-9)
    assert house.fig_pow.layout.shapes[0].x0 == pytest.approx(2.0)
    assert house.f_power.text.value.startswith("2")


def test_housing_ambient_in_fahrenheit(house, house_study):
    assert house.set_inputs(ambient="86 °F") == {"ambient": ""}
    ref = dataclasses.replace(house_study, t_ambient=_f_to_k(86.0))
    sweep = ref.power_sweep(np.linspace(house.power_max / 41, house.power_max, 41))
    name = house_study.names[5]
    expected = sweep[sweep["candidate"] == name]["t_hot_spot"].to_numpy() - 273.15
    assert_allclose(np.asarray(house.fig_pow.data[5].y, float), expected, rtol=1e-9)


def test_housing_bad_input_keeps_last_result(house):
    eps = [np.asarray(t.y, float).copy() for t in house.fig_eps.data]
    pw = [np.asarray(t.y, float).copy() for t in house.fig_pow.data]
    study = house.study
    msg = house.set_inputs(ambient="3 kg")["ambient"]
    assert "ambient temperature" in msg and "temperature" in msg
    assert "3 kg" in house.f_ambient.message.value
    msg = house.set_inputs(contact="0.1 s")["contact"]  # shorter than any tabulated contact: rejected
    assert "contact" in msg
    assert house.study is study
    for old, tr in zip(eps, house.fig_eps.data, strict=True):
        assert np.array_equal(old, np.asarray(tr.y, float))
    for old, tr in zip(pw, house.fig_pow.data, strict=True):
        assert np.array_equal(old, np.asarray(tr.y, float))


def test_housing_contact_time_shows_in_minutes_and_bare_numbers_read_as_minutes(house):
    assert house.f_contact.text.value == "10 min"  # 600 s in the demo study
    assert house.set_inputs(contact="12") == {"contact": ""}
    assert house.study.contact_duration == pytest.approx(12 * constants.minute)
    assert house.set_inputs(contact="0.25 h") == {"contact": ""}
    assert house.study.contact_duration == pytest.approx(0.25 * constants.hour)
    house.set_system("US")
    assert house.f_contact.text.value == "15 min"


def test_housing_without_component_uses_mean_surface(house_study):
    study = dataclasses.replace(house_study, candidates=house_study.candidates[:3], component=None)
    p = HousingPanel(study)
    res = study.results()
    assert_allclose(np.asarray(p.fig_pow.data[-1].y, float), res["t_surface"].to_numpy() - 273.15, rtol=1e-9)
    p.system_toggle.value = "US"
    assert "[°F]" in p.fig_pow.layout.yaxis.title.text


def test_housing_us_system_relabels(house, house_study):
    house.set_system("US")
    assert "[°F]" in house.fig_eps.layout.yaxis.title.text
    assert "[°F]" in house.fig_pow.layout.yaxis.title.text
    assert "[Btu/h]" in house.fig_pow.layout.xaxis.title.text
    assert "[°F]" in house.table.value and "[in]" in house.table.value
    res = house_study.results()
    n = len(house_study.names)
    limit = house.fig_eps.data[n]  # first touch-limit line
    cls = house.classes[0]
    lim_k = float(res.loc[res["touch_class"] == cls, "touch_limit"].iloc[0])
    assert_allclose(limit.y, [_k_to_f(lim_k)] * 2, rtol=1e-12)
    btu_per_h = constants.Btu / constants.hour  # W
    assert house.slider.value == pytest.approx(house_study.power / btu_per_h, rel=1e-9)
    assert house.f_ambient.text.value.endswith("°F")


# --- shipper: trace of the trip and logger profiles --------------------------------
def test_shipper_trace_follows_the_picked_design_and_thickness(ship_study):
    p = ShipperPanel(ship_study, coolant_mass=3.0, background=False)
    first = p.trace
    assert set(first["candidate"]) == {p.trace_pick.value}
    other = [n for n in ship_study.names if n != p.trace_pick.value][0]
    p.trace_also.value = (other,)
    assert set(p.trace["candidate"]) == {p.trace_pick.value, other}
    ends = [t for t in p.fig_trace.data if "end of hold" in (t.name or "")]
    assert len(ends) == 2
    # the panel draws the study's own trace (no physics in the widget)
    want = ship_study.trace(p.trace_designs())
    np.testing.assert_array_equal(p.trace["payload_temperature"], want["payload_temperature"])
    assert "does not qualify a shipper" in p.trace_cautions.value


def test_shipper_loads_a_logger_profile_and_reports_bad_files(ship_study, tmp_path):
    p = ShipperPanel(ship_study, coolant_mass=3.0, background=False)
    bad = tmp_path / "bad.csv"
    bad.write_text("elapsed [h],temperature\n0,20\n", encoding="utf-8")
    msg = p.load_profile(str(bad), "route")
    assert msg.startswith(f"{bad}:1:2") and "missing unit" in p.profile_msg.value
    assert list(p.study.profiles) == list(ship_study.profiles)  # last good result kept
    good = tmp_path / "route.csv"
    good.write_text("elapsed [h],temperature [°F]\n0,68\n1,86\n2,77\n", encoding="utf-8")
    assert p.load_profile(str(good), "route") == ""
    assert "route" in p.study.profiles and "route" in p.profile_list.value
    assert set(p.results.by_profile["profile"]) == set(p.study.profiles)
    assert "ambient (route)" in [t.name for t in p.fig_trace.data]
    # 86 °F = 30 °C (NIST SP 811 (2008), Appendix B.9)
    assert max(p.study.profiles["route"][1]) == pytest.approx(303.15)


# ------------------------------------------------------------ housing warm-up
@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
def test_housing_warm_up_chart_follows_the_study(house, house_study):
    n = len(house_study.names)
    frame = house_study.warm_up_frame()
    for i, name in enumerate(house_study.names):
        tr = house.fig_warm.data[i]
        sub = frame[frame["candidate"] == name]
        assert tr.name == name
        # the chart draws the session's own points (at most ~150 per line, both ends kept)
        x = np.asarray(tr.x, float) * 60.0
        times = sub["time"].to_numpy()
        assert x[0] == times[0] and x[-1] == pytest.approx(times[-1]) and x.size <= 160
        assert np.isin(np.round(x, 6), np.round(times, 6)).all()
        assert_allclose(np.asarray(tr.y, float),
                        np.interp(x, times, sub["t_surface"].to_numpy()) - 273.15, rtol=1e-9)
        assert "min" in tr.hovertemplate and "°C" in tr.hovertemplate
    limits = [t for t in house.fig_warm.data[n:] if t.name.startswith("touch limit")]
    assert limits and all("°C" in t.name for t in limits)
    assert "Time into the session [min]" == house.fig_warm.layout.xaxis.title.text
    assert "Touch safety: the product standard and a measurement" in house.fig_warm.layout.annotations[0].text
    assert "Time to touch limit" in house.table.value and "not within session" in house.table.value
    assert "Touch safety and component limits stay with" in house.table.value


@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
def test_housing_session_and_contents_fields_recompute(house, house_study):
    fig = house.fig_warm
    assert house.f_session.text.value == "20 min"
    assert house.set_inputs(session="45", contents="400 J/K") == {"session": "", "contents": ""}
    assert house.fig_warm is fig
    assert house.study.session_duration == pytest.approx(45 * constants.minute)
    assert house.study.content_heat_capacity == pytest.approx(400.0)
    ref = dataclasses.replace(house_study, session_duration=2700.0, content_heat_capacity=400.0)
    sub = ref.warm_up_frame()
    sub = sub[sub["candidate"] == house_study.names[0]]
    assert float(np.max(fig.data[0].x)) == pytest.approx(45.0)
    x = np.asarray(fig.data[0].x, float) * 60.0
    assert_allclose(np.asarray(fig.data[0].y, float),
                    np.interp(x, sub["time"].to_numpy(), sub["t_surface"].to_numpy()) - 273.15, rtol=1e-9)
    assert "45-min" in fig.layout.title.text


def test_housing_bad_session_inputs_show_a_message_and_keep_the_chart(house):
    before = [np.asarray(t.y, float).copy() for t in house.fig_warm.data[:3]]
    study = house.study
    out = house.set_inputs(session="-5 min", contents="3 kg")
    assert "use-session duration" in out["session"]
    assert "heat capacity" in out["contents"]
    assert house.set_inputs(session="30 day")["session"]  # the study refuses a week-plus session
    assert house.study is study
    for old, tr in zip(before, house.fig_warm.data[:3], strict=True):
        assert np.array_equal(old, np.asarray(tr.y, float))
    assert "Traceback" not in house.status.value


def test_housing_warm_up_chart_in_fahrenheit(house):
    house.set_system("US")
    assert "[°F]" in house.fig_warm.layout.yaxis.title.text
    assert "°F" in house.fig_warm.data[0].hovertemplate


# ------------------------------------------------------------------- the app's first page (JobChooser)
# No physics here: the chooser builds panels. What is checked is that each job opens the panel of
# that job on the same study its notebook/file describes, and that a bad file becomes a message
# naming file:line:column, never an exception. The one physical value read back (48 h = 172 800 s)
# uses scipy.constants.hour (NIST SP 811, 2008, Appendix B.8).
import re  # noqa: E402
from pathlib import Path  # noqa: E402

from workbench.scenario import load_scenario, study_from_scenario  # noqa: E402
from workbench.widgets.app import Workbench  # noqa: E402
from workbench.widgets.jobs import JOBS, JobChooser  # noqa: E402

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
_PANELS = {"wall": Workbench, "shipper": ShipperPanel, "housing": HousingPanel}


def _chooser():
    return JobChooser(background=False, autosave_delay=None)


def _chart_lengths(panel):
    """Number of y values of each trace of each chart of a panel (all charts it shows)."""
    if isinstance(panel, Workbench):
        figs = [c.fig for c in panel._charts()]
    elif isinstance(panel, ShipperPanel):
        figs = [panel.fig_hold, panel.fig_cost]
    else:
        figs = [panel.fig_eps, panel.fig_pow, panel.fig_warm]
    return [[len(t.y) if t.y is not None else 0 for t in fig.data] for fig in figs]


def test_job_chooser_first_page_offers_the_three_jobs():
    j = _chooser()
    assert j.children == (j.home_page,) and j.current is None
    assert [job.key for job in JOBS] == ["wall", "shipper", "housing"]
    cards = j.cards.children
    assert len(cards) == 3
    for job, card in zip(JOBS, cards, strict=True):
        assert f"hw-job-{job.key}" in card._dom_classes
        text = " ".join(c.value for c in card.children if hasattr(c, "value"))
        assert job.name in text and "invented" in text  # demo data labelled as such
    with pytest.raises(ValueError, match="job: unknown 'roof'"):
        j.open_job("roof")


@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
@pytest.mark.parametrize("key", ["wall", "shipper", "housing"])
def test_job_chooser_button_opens_the_demo_panel_and_back_returns(key):
    j = _chooser()
    j.open_buttons[key].click()
    assert j.current == key, j.message.value
    panel = j.panels[key]
    assert isinstance(panel, _PANELS[key])
    assert j.children == (j.bar, panel)
    assert "DEMO — invented numbers" in panel.header.value
    lengths = _chart_lengths(panel)
    assert all(any(n > 1 for n in fig) for fig in lengths), lengths  # every chart holds curves
    j.back_button.click()
    assert j.current is None and j.children == (j.home_page,)
    assert j.open_buttons[key].description == "Return to it"
    j.open_buttons[key].click()
    assert j.panels[key] is panel  # the panel keeps its state between visits


@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
@pytest.mark.parametrize("name", ["wall.toml", "shipper.toml", "housing.toml"])
def test_job_chooser_opens_a_scenario_file_in_the_panel_of_its_kind(name):
    path = EXAMPLES / name
    scen = load_scenario(path)
    expected = study_from_scenario(scen)
    j = _chooser()
    j.path.value = str(path)
    j.open_file_button.click()
    assert j.current == scen.kind, j.message.value
    panel = j.panels[scen.kind]
    assert isinstance(panel, _PANELS[scen.kind])
    assert panel.title == scen.title and scen.title in panel.header.value
    assert list(panel.study.names) == list(expected.names)
    if scen.kind == "wall":  # the file's decision comes along, as with the panel's own Open button
        assert panel.decision_form.values()["chosen"] == scen.decision.chosen
    if scen.kind == "shipper":
        assert panel.study.duration == pytest.approx(48 * constants.hour)  # duration = "48 h" in the file
    assert "Opened" in j.message.value


def _bad_copy(tmp_path, name, old, new):
    """A copy of an example file with one line changed, and that line's number and column (1-based)."""
    text = (EXAMPLES / name).read_text(encoding="utf-8")
    assert text.count(old) == 1
    bad = tmp_path / f"bad_{name}"
    bad.write_text(text.replace(old, new), encoding="utf-8")
    lines = bad.read_text(encoding="utf-8").splitlines()
    line = next(i for i, t in enumerate(lines, 1) if new in t)
    return bad, line, lines[line - 1].index(new.split("=")[0].strip()) + 1


def test_job_chooser_bad_file_shows_file_line_column_and_stays(tmp_path):
    j = _chooser()
    bad, line, col = _bad_copy(tmp_path, "housing.toml", 't_ambient = "25 °C"', 't_ambient = "25 kg"')
    j.path.value = str(bad)
    j.open_file_button.click()  # must not raise
    msg = j.message.value
    assert 'class="hw-msg"' in msg and f"{bad}:{line}:{col}:" in msg, msg
    assert "t_ambient" in msg and "°C" in msg and "Traceback" not in msg  # names the key and the expected unit
    assert j.current is None and j.children == (j.home_page,) and not j.panels
    assert not any(b.disabled for b in j.open_buttons.values())  # the page stays usable


def test_job_chooser_broken_toml_missing_file_and_folder_give_messages(tmp_path):
    j = _chooser()
    broken = tmp_path / "broken.toml"
    broken.write_text('format = "heatpath-scenario"\nversion = 1\nkind = "wall\n', encoding="utf-8")
    j.open_file(str(EXAMPLES / "housing.toml"))  # a panel is open; a bad file must leave it alone
    shown = j.panels["housing"]
    for path, words in ((broken, [f"{broken}:3"]), (tmp_path / "missing.toml", ["missing.toml", "not found"]),
                        (tmp_path, ["is a folder"]), ("  ", ["enter the path"])):
        j.show_home()
        j.path.value = str(path)
        j.open_file_button.click()
        msg = j.message.value
        assert 'class="hw-msg"' in msg and "Traceback" not in msg, msg
        assert all(w in msg for w in words), (words, msg)
        assert j.current is None and j.panels["housing"] is shown
    with pytest.raises(ValueError, match=re.escape(f"{broken}:3")):
        j.open_file(broken)  # called from Python it raises the same ValueError


@pytest.mark.filterwarnings("ignore::workbench._checks.ValidityWarning")
@pytest.mark.parametrize(
    "name, field, text, attr, si",
    [
        # 36 h = 129 600 s (scipy.constants.hour); 6 W stays 6 W
        ("shipper.toml", "duration", "36 h", "duration", 36 * constants.hour),
        ("housing.toml", "power", "6 W", "power", 6.0),
    ],
)
def test_a_panel_opened_from_a_file_saves_what_was_typed_and_what_the_file_held(
    tmp_path, name, field, text, attr, si
):
    """Nothing entered or saved is lost: the typed value, and the file's criteria, limits,
    notes and decision (which the study object does not hold) come back from the saved file."""
    original = load_scenario(EXAMPLES / name)
    j = _chooser()
    panel = j.open_file(str(EXAMPLES / name))
    assert panel.set_inputs(**{field: text}) == {field: ""}
    target = tmp_path / "saved.toml"
    panel.scenario_bar.path.value = str(target)
    panel.scenario_bar.save_button.click()
    assert "Saved to" in panel.scenario_bar.message.value, panel.scenario_bar.message.value
    back = load_scenario(target)
    assert back.kind == original.kind and back.title == original.title
    assert (back.criteria, back.constraints, back.notes, back.decision, back.limits) == (
        original.criteria,
        original.constraints,
        original.notes,
        original.decision,
        original.limits,
    )
    study = study_from_scenario(back)
    assert getattr(study, attr) == pytest.approx(si, rel=1e-12)
    assert list(study.names) == list(panel.study.names)
    # the saved file rebuilds the study the panel shows (same results, not only same inputs)
    if original.kind == "housing":
        assert_allclose(
            study.results()["t_surface"].to_numpy(float),
            panel.study.results()["t_surface"].to_numpy(float),
            rtol=1e-12,
        )
    else:
        assert_allclose(
            study.results().optimum["thickness"].to_numpy(float),
            panel.study.results().optimum["thickness"].to_numpy(float),
            rtol=1e-12,
        )
    # a second Save does not overwrite silently
    panel.scenario_bar.save_button.click()
    assert "exists" in panel.scenario_bar.message.value


def test_a_save_only_bar_has_no_open_buttons():
    j = _chooser()
    panel = j.open_job("housing")
    row = panel.scenario_bar.box.children[0]
    assert panel.scenario_bar.save_button in row.children
    assert panel.scenario_bar.open_button not in row.children


def test_panel_fields_are_described_by_their_study_kind():
    """A panel's fields take their quantity kind and meaning from the kind's declaration
    (the tooltip names the scenario-file key they save to); a panel that asked for another
    quantity than its declaration would be refused when built."""
    from workbench.scenario import study_kind
    from workbench.widgets.fields import input_field

    j = _chooser()
    seen = 0
    for key in ("wall", "shipper", "housing"):
        panel = j.open_job(key)
        kind = study_kind(key)
        for f in vars(panel).values():
            name = getattr(f, "input_name", None)
            if name is None:
                continue
            spec = kind.input_spec(name)
            assert f.text.tooltip == f"{spec.doc} (scenario file: inputs.{name})"
            if spec.kind != "budget":
                assert f.kind == spec.kind
            seen += 1
    assert seen >= 12
    with pytest.raises(ValueError, match="housing.power: declared as 'power', the panel asks 'temperature'"):
        input_field("housing", "power", "P", "power", 1.0, lambda v: None, quantity="temperature")
    with pytest.raises(ValueError, match="unknown 'powr'"):
        input_field("housing", "powr", "P", "power", 1.0, lambda v: None)
