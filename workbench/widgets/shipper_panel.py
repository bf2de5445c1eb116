"""Interactive panel for the insulated-shipper study (hold time and landed cost).

:class:`ShipperPanel` is an ipywidgets ``VBox``. It holds a
:class:`~workbench.studies.shipper.ShipperStudy`; every number it shows comes
from the study's own methods (:meth:`~ShipperStudy.results` for the sized
designs and their landed cost, :meth:`~ShipperStudy.hold_curve` for the hold
time with a fixed coolant mass). The panel converts units and draws.

A full recompute takes about a second (every design is simulated), so it runs
when an input field changes (on Enter or leaving the field); the thickness
slider only moves the markers and the table columns "at the current
thickness", from the frames already computed.
"""

from __future__ import annotations

import dataclasses
import html
import threading
import time

import ipywidgets as widgets
import numpy as np
import pandas as pd
import plotly.graph_objects as go

from workbench import units
from workbench.studies.shipper import ShipperStudy
from workbench.transient import ambient_profile
from workbench.widgets import style
from workbench.widgets.charts import _base_layout, update_shipper_trace
from workbench.widgets.fields import LOG, UnitField, input_field, show_message
from workbench.widgets.parts import (
    cautions_html,
    cell,
    conv,
    flag_cell,
    guard,
    header_cell,
    header_html,
    panel_children,
    section,
)
from workbench.widgets.plotview import PlotView
from workbench.widgets.runner import TaskRunner
from workbench.widgets.scenario_bar import ScenarioBar, kept_from, panel_scenario

__all__ = ["ShipperPanel", "demo_shipper_study", "SHIPPER_PANEL_CAUTIONS", "CostField"]

SHIPPER_DEMO_TITLE = "Demo (invented): 2–8 °C laboratory kit on a two-day summer route"

#: Always shown above the charts (our wording); the study's own cautions follow it.
SHIPPER_PANEL_CAUTIONS = (
    "Frozen water-ice packs can freeze a 2–8 °C payload: condition the packs and keep them out of "
    "direct contact with the payload.",
    "Dry ice sublimes to CO₂ gas: never seal it gas-tight (the box can burst), ventilate vehicles and "
    "rooms (asphyxiation risk), and ship it as dangerous goods under the carrier's and air-transport rules.",
)
# The study's own cautions follow these; they always include the one on qualification by testing.


def demo_shipper_study() -> ShipperStudy:
    """The invented demo scenario of ``notebooks/shipper.ipynb`` (all product data made up)."""
    from workbench.air_layers import AirLayer
    from workbench.geometry import VacuumPanel
    from workbench.materials import load_materials
    from workbench.studies.shipper import ShipperCandidate
    from workbench.studies.wall import Layer

    materials = load_materials()
    hours = np.array([0, 6, 10, 16, 22, 30, 34, 40, 46])
    temps_c = np.array([22, 30, 35, 28, 20, 30, 38, 28, 24])
    profile = (hours * 3600.0, temps_c + 273.15)
    carton = Layer("corrugated_single_wall", 0.004)
    foil_gap = AirLayer(0.010, "horizontal", 0.05, 0.05)
    candidates = [
        ShipperCandidate("EPS 20", (Layer("eps_20"), carton)),
        ShipperCandidate("PIR 32", (Layer("pir_32"), carton)),
        ShipperCandidate("EPS + air gap", (Layer("eps_20"), AirLayer(0.010, "horizontal"), carton)),
        ShipperCandidate("EPS + foil-faced gap", (Layer("eps_20"), foil_gap, carton)),
        ShipperCandidate("VIP 20 mm + EPS", (VacuumPanel(0.020, 0.0042, 0.40, 0.30, 0.008), Layer("eps_20"), carton)),
        ShipperCandidate("PIR + foil-faced gap", (Layer("pir_32"), foil_gap, carton)),
    ]
    return ShipperStudy(
        candidates, materials, coolant="pcm_plus5",
        payload_length=0.30, payload_width=0.20, payload_height=0.15, payload_mass=3.0,
        payload_specific_heat=3500.0, t_payload_min=275.15, t_payload_max=281.15, t_payload_start=278.15,
        t_ambient=profile, duration=48 * 3600.0, thicknesses=np.round(np.arange(0.01, 0.1001, 0.005), 4),
        safety_factor=1.2, divisor=0.005, mass_increment=0.5, rate_per_kg=1.50, fixed_fee=5.0,
    )


class CostField(UnitField):
    """A :class:`UnitField` for a cost kind with its currency (``"1.5 EUR/kg"``, ``"0.7 EUR/lb"``)."""

    def __init__(self, label, kind, field, value_si, on_change, system="SI", css="", currency="EUR"):
        self.currency = currency
        super().__init__(label, kind, field, value_si, on_change, system, css)

    def _write(self, value_si: float) -> None:
        self._silent = True
        try:
            self.text.value = units.format_quantity(value_si, self.kind, self.system, sig=4, currency=self.currency)
        finally:
            self._silent = False

    def _changed(self, change) -> None:
        if self._silent:
            return
        default = units.display_unit(self.kind, self.system, self.currency).replace("·", "*")
        try:
            value, _ = units.parse_cost(change["new"], self.kind, self.field, default_unit=default,
                                        currency=self.currency)
            self._on_change(value)
        except ValueError as exc:
            LOG.info("input %s rejected: %s", self.field, exc)
            self._set_error(str(exc) if str(exc).startswith(self.field) else f"{self.field}: {exc}")
            return
        except Exception as exc:
            LOG.exception("input %s failed", self.field)
            self._set_error(f"{self.field}: could not apply this value ({type(exc).__name__}: {exc})")
            return
        self.value_si = value
        self._set_error("")


def _peak(t_ambient) -> float:
    if isinstance(t_ambient, tuple | list):
        return float(np.max(t_ambient[1]))
    return float(t_ambient)


def _study_peak(study: ShipperStudy) -> float:
    """Hottest ambient over all of the study's named profiles [K]."""
    return max(_peak(p) for p in study.profiles.values())


def _peak_changes(study: ShipperStudy, peak: float) -> dict:
    """Study changes that move the hottest profile's hottest step to ``peak`` [K] (shape kept)."""
    if study.ambient_profiles is None:
        return {"t_ambient": _shift_to_peak(study.t_ambient, peak)}
    profiles = dict(study.ambient_profiles)
    hottest = max(profiles, key=lambda n: _peak(profiles[n]))
    profiles[hottest] = _shift_to_peak(profiles[hottest], peak)
    return {"ambient_profiles": profiles, "t_ambient": 298.15}


def _with_profile(study: ShipperStudy, name: str, profile) -> dict:
    """Study changes that add (or replace) the named profile ``name``."""
    name = str(name).strip()
    if not name:
        raise ValueError("profile name: give a name for the loaded profile, e.g. 'summer'")
    profiles = dict(study.profiles)
    profiles[name] = profile
    return {"ambient_profiles": profiles, "t_ambient": 298.15}


def _shift_to_peak(t_ambient, peak: float):
    """The ambient with its hottest value moved to ``peak`` [K], shape kept."""
    if isinstance(t_ambient, tuple | list):
        times, temps = t_ambient
        temps = np.asarray(temps, float)
        return (np.asarray(times, float), temps + (peak - float(temps.max())))
    return float(peak)


class ShipperPanel(widgets.VBox):
    """Hold time and landed cost of insulated-shipper build-ups, shown in one cell.

    Parameters
    ----------
    study : ShipperStudy, optional
        Default: the invented demo study of the shipper notebook, labelled as a demo.
    system : {"SI", "US"}
        Initial display system.
    title : str, optional
        Heading.
    coolant_mass : float, optional
        Fixed coolant mass of the hold-time chart [kg]; default 3 kg for the
        demo, else the median coolant mass of the cheapest designs (2 figures).

    Notes
    -----
    Inputs: required hold time, hottest ambient (the ambient profile keeps its
    shape), coolant mass for the hold-time chart, freight rate per billable
    mass. Bad input shows a message beside its field and keeps the last good
    result; errors go to the ``workbench.widgets`` logger.
    """

    def __init__(self, study: ShipperStudy | None = None, system: str = "SI", title: str | None = None,
                 coolant_mass: float | None = None, background: bool = True, scenario=None):
        units.check_system(system)
        self.background = bool(background)
        self._draw_lock = threading.RLock()
        demo = study is None
        self.study = demo_shipper_study() if study is None else study
        if not isinstance(self.study, ShipperStudy):
            raise ValueError(f"study: expected a ShipperStudy, got {type(self.study).__name__}")
        self.system = system
        self.demo = demo
        self.title = title or (SHIPPER_DEMO_TITLE if demo else "Insulated shipper comparison")
        self._kept = kept_from(scenario)
        cur = sorted({str(c).strip() for c in self.study.materials.get("currency", pd.Series(dtype=str)).dropna()}
                     - {""})
        self.currency = cur[0] if len(cur) == 1 else "EUR"
        self.timings: dict[str, float] = {}
        t0 = time.perf_counter()
        self.results = self.study.results()
        t1 = time.perf_counter()
        if coolant_mass is not None:
            mass = float(coolant_mass)
            if not (np.isfinite(mass) and mass > 0):
                raise ValueError(f"coolant_mass: must be a positive mass in kg, got {coolant_mass!r}")
        elif demo:
            mass = 3.0
        else:
            m = self.results.optimum["coolant_mass"].to_numpy(float)
            m = m[np.isfinite(m)]
            mass = float(f"{np.median(m):.2g}") if m.size else 1.0
        self.coolant_mass = mass
        self.curve = self.study.hold_curve(mass)
        self.timings = {"results": t1 - t0, "hold_curve": time.perf_counter() - t1}
        ok = self.results.optimum["thickness"].to_numpy(float)
        self.thickness = float(self.study.thicknesses[0])
        if np.isfinite(ok).any():
            self.thickness = float(np.nanmin(ok))
        self._silent = False
        self._wanted = (self.study, self.coolant_mass)  # the latest inputs asked for
        self._gen = 0  # counts recompute requests; a superseded task's result is dropped
        self._build()
        self._redraw()
        super().__init__(children=self._children)
        self.add_class("hw-root")
        self.add_class("hw-shipper")

    # ------------------------------------------------------------------ build
    def _build(self) -> None:
        s, w = self.study, widgets.Layout
        self.header = widgets.HTML(header_html(
            self.title, self.demo,
            "Which wall build-up keeps the payload in range for the target time at the lowest landed "
            "cost per shipment? Inputs accept units (48 h, 35 °C, 95 °F, 3 kg, 1.5 EUR/kg)."),
            layout=w(flex="1 1 auto"))
        self.system_toggle = widgets.ToggleButtons(options=[("SI", "SI"), ("US customary", "US")],
                                                   value=self.system, style={"button_width": "112px"},
                                                   layout=w(min_width="240px", flex="0 0 auto"))
        self.system_toggle.add_class("hw-shipper-system")
        self.cautions = widgets.HTML("")
        self.cautions.add_class("hw-shipper-cautions")
        self.status = widgets.HTML("")
        self.status.add_class("hw-shipper-status")
        sys_ = self.system
        self.f_duration = input_field("shipper", "duration", "Target hold", "target hold time", s.duration,
                                    lambda v: self._apply(duration=v), sys_, "hw-shipper-duration")
        self.f_ambient = UnitField("Hottest ambient", "temperature", "hottest ambient", _study_peak(s),
                                   lambda v: self._apply(**_peak_changes(self._wanted[0], v)),
                                   sys_, "hw-shipper-ambient")
        self.f_coolant = UnitField("Coolant (chart)", "mass", "coolant mass", self.coolant_mass,
                                   self._set_coolant_mass, sys_, "hw-shipper-coolant")
        self.f_rate = input_field("shipper", "rate_per_kg", "Freight rate", "freight rate", s.rate_per_kg,
                                  lambda v: self._apply(rate_per_kg=v), sys_, "hw-shipper-rate",
                                  cls=CostField, currency=self.currency)
        self.slider = widgets.SelectionSlider(options=self._slider_options(), value=self.thickness,
                                              description="Insulation", continuous_update=True,
                                              style={"description_width": "118px"}, layout=w(width="330px"))
        self.slider.add_class("hw-shipper-thickness")
        hint = widgets.HTML('<div class="hw-hint">The ambient profile keeps its shape; its hottest step moves '
                            "to the value typed. The hold-time runs stop at twice the target. The coolant mass sets the hold-time chart only (the cost chart "
                            "sizes the coolant for the target). A change of a field recomputes every design "
                            "(a progress bar shows it; Cancel keeps the last result); the slider only moves "
                            "the markers.</div>")
        self.runner = TaskRunner("Recompute", width="150px")
        self.runner.box.add_class("hw-shipper-progress")
        self.fig_hold = go.Figure(layout=_base_layout(
            "Hold time with a fixed coolant mass", 425, 470, showlegend=True,
            legend=dict(font=dict(size=10), orientation="h", yanchor="top", y=-0.2, x=0),
            shapes=[dict(type="line", xref="x", yref="paper", x0=0, x1=0, y0=0, y1=1,
                         line=dict(color="#495057", width=1, dash="dot"))]))
        self.fig_cost = go.Figure(layout=_base_layout(
            "Landed cost per shipment (coolant sized for the target)", 425, 470, showlegend=True,
            legend=dict(font=dict(size=10), orientation="h", yanchor="top", y=-0.2, x=0),
            shapes=[dict(type="line", xref="x", yref="paper", x0=0, x1=0, y0=0, y1=1,
                         line=dict(color="#495057", width=1, dash="dot"))]))
        self.view_hold, self.view_cost = PlotView(self.fig_hold), PlotView(self.fig_cost)
        self.view_hold.add_class("hw-shipper-chart-hold")
        self.view_cost.add_class("hw-shipper-chart-cost")
        n = len(s.names)
        hold_traces = [go.Scatter(name=nm, mode="lines", line=dict(width=2, color=style.candidate_colour(i)))
                       for i, nm in enumerate(s.names)]
        hold_traces.append(go.Scatter(name="target", mode="lines", line=dict(color=style.BUDGET, width=2, dash="dash")))
        hold_traces.append(go.Scatter(name="at current thickness", mode="markers", showlegend=False,
                                      text=s.names, marker=dict(size=8, color="#212529", symbol="circle-open")))
        self.fig_hold.add_traces(hold_traces)
        cost_traces = [go.Scatter(name=nm, mode="lines+markers", line=dict(width=2, color=style.candidate_colour(i)),
                                  marker=dict(size=6)) for i, nm in enumerate(s.names)]
        cost_traces.append(go.Scatter(name="cheapest that holds", mode="markers", text=s.names,
                                      marker=dict(size=15, symbol="star", color=style.ACCENT,
                                                  line=dict(color=style.ACCENT_EDGE, width=1))))
        cost_traces.append(go.Scatter(name="at current thickness", mode="markers", showlegend=False,
                                      text=s.names, marker=dict(size=9, color="#212529", symbol="circle-open")))
        self.fig_cost.add_traces(cost_traces)
        self._n = n
        # the temperature trace of the chosen design (and any others ticked), every profile
        self.fig_trace = go.Figure(layout=_base_layout("Temperature trace", 870, 560, showlegend=True))
        self.view_trace = PlotView(self.fig_trace)
        self.view_trace.add_class("hw-shipper-chart-trace")
        self.trace_pick = widgets.Dropdown(options=list(s.names), value=s.names[0], description="Trace of",
                                           style={"description_width": "118px"}, layout=w(width="330px"))
        self.trace_pick.add_class("hw-shipper-trace-pick")
        self.trace_also = widgets.SelectMultiple(options=list(s.names), value=(), rows=min(4, n),
                                                 description="Also show", style={"description_width": "118px"},
                                                 layout=w(width="330px"))
        self.trace_also.add_class("hw-shipper-trace-also")
        self.f_profile = widgets.Text(value="", placeholder="route.csv", description="Profile file",
                                      style={"description_width": "118px"}, layout=w(width="330px"))
        self.f_profile.add_class("hw-shipper-profile-file")
        self.f_profile_name = widgets.Text(value="logger", description="Profile name",
                                           style={"description_width": "118px"}, layout=w(width="330px"))
        self.b_profile = widgets.Button(description="Load profile", layout=w(width="150px"))
        self.b_profile.add_class("hw-shipper-profile-load")
        self.profile_msg = widgets.HTML("")
        self.profile_msg.add_class("hw-shipper-profile-msg")
        self.profile_list = widgets.HTML("")
        self.profile_list.add_class("hw-shipper-profiles")
        self.trace_cautions = widgets.HTML("")
        self.profile_table = widgets.HTML("")
        self.profile_table.add_class("hw-table")
        self.profile_table.add_class("hw-shipper-profile-table")
        self.table = widgets.HTML("")
        self.table.add_class("hw-table")
        self.table.add_class("hw-shipper-table")
        self._children = panel_children(
            self.header, self.system_toggle, self.cautions, self.status,
            [section("Conditions"), self.f_duration.box, self.f_ambient.box, self.f_coolant.box,
             self.f_rate.box, section("Ambient profiles"), self.profile_list, self.f_profile,
             self.f_profile_name, self.b_profile, self.profile_msg,
             section("Insulation thickness"), self.slider, hint, self.runner.box,
             section("Trace"), self.trace_pick, self.trace_also],
            "hw-shipper-inputs", [self.view_hold, self.view_cost], "Results per build-up", self.table)
        self.scenario_bar = ScenarioBar(self.current_scenario, None, None, "shipper_scenario.toml")
        self._children = [*self._children, self.view_trace, self.trace_cautions,
                          section("Per ambient profile, at the current thickness"), self.profile_table,
                          section("Save as a scenario file"), self.scenario_bar.box]
        self.system_toggle.observe(self._toggled, "value")
        self.slider.observe(self._slid, "value")
        self.trace_pick.observe(self._trace_changed, "value")
        self.trace_also.observe(self._trace_changed, "value")
        self.b_profile.on_click(lambda _b: self.load_profile(self.f_profile.value, self.f_profile_name.value))

    def _toggled(self, change) -> None:
        if not self._silent:
            guard(self.status, self.set_system, change["new"])

    def _slider_options(self):
        return [(units.format_quantity(t, "thickness", self.system), float(t)) for t in self.study.thicknesses]

    # ---------------------------------------------------------------- inputs
    def _apply(self, **changes) -> None:
        """Recompute with changed study inputs; raises ValueError (shown by the field) if rejected.

        The study checks the inputs at once; the simulation runs as a task with a
        progress bar (in the background unless ``background=False``). Changes made
        while a task runs build on the inputs it was started with.
        """
        new = dataclasses.replace(self._wanted[0], **changes)
        self._recompute(new, self._wanted[1], full=True)

    def current_scenario(self):
        """The scenario of what was last entered (for Save), even while it is still being
        simulated: inputs and candidates, plus what the file it came from held besides
        (criteria, limits, notes, decision)."""
        return panel_scenario(self._wanted[0], self._kept, self.title, self.system)

    def _set_coolant_mass(self, mass: float) -> None:
        mass = float(mass)
        if not (np.isfinite(mass) and mass > 0):
            raise ValueError(f"coolant mass: must be a positive mass (kg or lb), got {mass!r} kg")
        study, _ = self._wanted
        self._recompute(study, mass, full=study is not self.study)

    def _recompute(self, study: ShipperStudy, mass: float, full: bool) -> None:
        self._gen += 1
        gen = self._gen
        if self.runner.busy:  # a newer input supersedes the running task
            self.runner.cancel()
            self.runner.wait(60)
        self._wanted = (study, mass)
        typed = {f.field: f.text.value for f in self._fields()}

        def task(progress, cancelled):
            t0 = time.perf_counter()
            results = study.results(progress=lambda f: progress(0.7 * f), cancel=cancelled) if full else None
            t1 = time.perf_counter()
            share = (0.7, 0.3) if full else (0.0, 1.0)
            curve = study.hold_curve(mass, progress=lambda f: progress(share[0] + share[1] * f), cancel=cancelled)
            return results, curve, {"results": t1 - t0, "hold_curve": time.perf_counter() - t1}

        def done(out):
            if gen != self._gen:
                return
            results, curve, timings = out
            with self._draw_lock:
                if results is not None:
                    self.study, self.results = study, results
                self.coolant_mass, self.curve, self.timings = mass, curve, timings
                self._redraw()

        def stopped(state):
            if gen != self._gen:  # superseded by a newer input: that one carries on
                return
            # back to the inputs the charts show; say what was typed and not applied
            self._wanted = (self.study, self.coolant_mass)
            self._show_inputs()
            lost = [f"{name} {text}" for name, text in typed.items()
                    if text != {f.field: f.text.value for f in self._fields()}[name]]
            if lost:
                self.runner.status.value += (f'<div class="hw-hint">Not applied: {html.escape(", ".join(lost))}. '
                                             "The fields show the inputs of the charts again.</div>")

        self.runner.run(task, on_done=done, on_stop=stopped, background=self.background)

    def _show_inputs(self) -> None:
        """Write the inputs of the shown result into the fields."""
        s = self.study
        self.f_duration.set_value(s.duration)
        self.f_ambient.set_value(_study_peak(s))
        self.f_coolant.set_value(self.coolant_mass)
        self.f_rate.set_value(s.rate_per_kg)

    def wait(self, timeout: float | None = 120.0) -> bool:
        """Wait for a running recompute; True when none is left running."""
        return self.runner.wait(timeout)

    def _slid(self, change) -> None:
        if self._silent or change["new"] is None:
            return
        guard(self.status, self._set_thickness, float(change["new"]))

    def _set_thickness(self, thickness: float) -> None:
        with self._draw_lock:
            self.thickness = thickness
            self._draw_marks()
            # the markers beside the slider move first; the trace (a simulation) follows
            self.view_hold.push()
            self.view_cost.push()
            self._draw_trace()
            self.resync()
            self._draw_table()
            self._draw_profiles()

    def set_system(self, system: str) -> None:
        """Show every value in ``system`` ("SI" or "US"): fields, slider, axes, table."""
        units.check_system(system)
        self.system = system
        for f in self._fields():
            f.set_system(system)
        self._silent = True
        try:
            self.slider.options = self._slider_options()
            self.slider.value = self.thickness
            if self.system_toggle.value != system:
                self.system_toggle.value = system
        finally:
            self._silent = False
        self._redraw()

    def set_inputs(self, **texts: str) -> dict[str, str]:
        """Type text into fields by name (``duration``, ``ambient``, ``coolant_mass``, ``rate``);
        returns each field's message ("" if accepted)."""
        fields = dict(zip(("duration", "ambient", "coolant_mass", "rate"), self._fields(), strict=True))
        out = {}
        for name, text in texts.items():
            if name not in fields:
                raise ValueError(f"set_inputs: unknown field {name!r}; valid: {list(fields)}")
            fields[name].text.value = text
            out[name] = fields[name].error
            self.wait()  # programmatic input: return once the recompute has finished
        return out

    def _fields(self):
        return (self.f_duration, self.f_ambient, self.f_coolant, self.f_rate)

    # ---------------------------------------------------------------- drawing
    def _redraw(self) -> None:
        with self._draw_lock:
            self._redraw_unlocked()
            self.resync()

    def _redraw_unlocked(self) -> None:
        s, sys_, sw, opt = self.study, self.system, self.results.sweep, self.results.optimum
        hours = "time"
        x_label = units.axis_label("thickness", sys_, name="Insulation thickness (sized layer)")
        with self.fig_hold.batch_update(), self.fig_cost.batch_update():
            ut, uh = units.display_unit("thickness", sys_), units.display_unit(hours, sys_)
            for i, name in enumerate(s.names):
                c = self.curve[self.curve["candidate"] == name]
                tr = self.fig_hold.data[i]
                tr.x = conv(c["thickness"], "thickness", sys_)
                tr.y = conv(c["hold_time_simulated"], hours, sys_)
                tr.hovertemplate = (f"<b>{html.escape(name)}</b><br>L = %{{x:.3g}} {ut}<br>"
                                    f"hold = %{{y:.3g}} {uh}<extra></extra>")
                g = sw[sw["candidate"] == name]
                tc = self.fig_cost.data[i]
                tc.x = conv(g["thickness"], "thickness", sys_)
                tc.y = g["landed_cost"].to_numpy(float)
                tc.marker.symbol = np.where(g["meets_target"].to_numpy(bool), "circle", "circle-open").tolist()
                tc.customdata = np.column_stack([conv(g["coolant_mass"], "mass", sys_),
                                                 conv(g["hold_time_simulated"], hours, sys_)])
                tc.hovertemplate = (f"<b>{html.escape(name)}</b><br>L = %{{x:.3g}} {ut}<br>landed cost "
                                    f"%{{y:.3g}} {self.currency}<br>coolant %{{customdata[0]:.3g}} "
                                    f"{units.display_unit('mass', sys_)}<br>hold %{{customdata[1]:.3g}} {uh}"
                                    "<extra></extra>")
            xs = conv(s.thicknesses, "thickness", sys_)
            target = self.fig_hold.data[self._n]
            target.x = [float(xs.min()), float(xs.max())]
            target.y = [float(conv(s.duration, hours, sys_))] * 2
            target.name = f"target {units.format_quantity(s.duration, hours, sys_)}"
            star = self.fig_cost.data[self._n]
            holds = opt["meets_target"].astype(bool).to_numpy()
            star.x = conv(opt["thickness"].to_numpy(float)[holds], "thickness", sys_)
            star.y = opt["landed_cost"].to_numpy(float)[holds]
            star.text = [n for n, h in zip(opt.index, holds, strict=True) if h]
            star.hovertemplate = f"cheapest that holds: %{{text}}<br>L = %{{x:.3g}} {ut}<br>%{{y:.3g}} {self.currency}<extra></extra>"
            self.fig_hold.layout.xaxis.title.text = x_label
            self.fig_cost.layout.xaxis.title.text = x_label
            self.fig_hold.layout.yaxis.title.text = units.axis_label(hours, sys_, name="Hold time (simulated)")
            self.fig_cost.layout.yaxis.title.text = f"Landed cost per shipment [{self.currency}]"
            self.fig_hold.layout.title.text = (
                f"Hold time with {units.format_quantity(self.coolant_mass, 'mass', sys_)} of coolant")
        self._draw_marks()
        self._draw_table()
        self._draw_profiles()
        self._draw_trace()
        self.cautions.value = cautions_html(SHIPPER_PANEL_CAUTIONS, self.results.cautions)
        show_message(self.status, "")

    def _draw_marks(self) -> None:
        sys_, th = self.system, self.thickness
        x = float(conv(th, "thickness", sys_))
        at_h = self.curve[np.isclose(self.curve["thickness"], th)]
        sw = self.results.sweep
        at_c = sw[np.isclose(sw["thickness"], th)]
        with self.fig_hold.batch_update(), self.fig_cost.batch_update():
            for fig in (self.fig_hold, self.fig_cost):
                fig.layout.shapes[0].x0 = x
                fig.layout.shapes[0].x1 = x
            mh = self.fig_hold.data[self._n + 1]
            mh.x = np.full(len(at_h), x)
            mh.y = conv(at_h["hold_time_simulated"], "time", sys_)
            mh.text = list(at_h["candidate"])
            mc = self.fig_cost.data[self._n + 1]
            mc.x = np.full(len(at_c), x)
            mc.y = at_c["landed_cost"].to_numpy(float)
            mc.text = list(at_c["candidate"])
            self.fig_cost.layout.title.text = (
                f"Landed cost per shipment — current {units.format_quantity(th, 'thickness', sys_)}")

    def _draw_table(self) -> None:
        sys_, cur, th = self.system, self.currency, self.thickness
        opt, sw, curve = self.results.optimum, self.results.sweep, self.curve
        cols = (("Build-up", None), ("Cheapest thickness that holds", "thickness"), ("Coolant there", "mass"),
                ("Billable mass there", "mass"), ("Landed cost there", "currency"),
                ("Landed cost at current thickness", "currency"), ("Holds at current thickness", "flag"),
                ("Hold with chart coolant at current thickness", "time"))
        head = "".join(header_cell(t, k, sys_, cur) for t, k in cols)
        rows = []
        for name in self.study.names:
            o = opt.loc[name]
            now = sw[(sw["candidate"] == name) & np.isclose(sw["thickness"], th)]
            hold = curve[(curve["candidate"] == name) & np.isclose(curve["thickness"], th)]
            holds_now = bool(now["meets_target"].iloc[0]) if len(now) else False
            rows.append("<tr>" + cell(name, None, sys_) + cell(o["thickness"], "thickness", sys_)
                        + cell(o["coolant_mass"], "mass", sys_) + cell(o["billable_mass"], "mass", sys_)
                        + cell(o["landed_cost"], "currency", sys_)
                        + cell(now["landed_cost"].iloc[0] if len(now) else np.nan, "currency", sys_)
                        + flag_cell(holds_now)
                        + cell(hold["hold_time_simulated"].iloc[0] if len(hold) else np.nan, "time", sys_)
                        + "</tr>")
        self.table.value = (f"<table><thead><tr>{head}</tr></thead><tbody>{''.join(rows)}</tbody></table>"
                            '<div class="hw-hint">Costs are demo or user values, not quotes. '
                            "n/a: no thickness of the sweep holds for the target.</div>")

    # ------------------------------------------------------------ display
    def resync(self) -> ShipperPanel:
        """Send the charts' changes to the browser (a view opened later asks for the whole chart)."""
        self.view_hold.push()
        self.view_cost.push()
        self.view_trace.push()
        return self

    # ------------------------------------------------------------- trace
    def trace_designs(self) -> list[tuple[str, float]]:
        """The designs of the trace: the picked one first, then those ticked, at the current thickness."""
        names = [self.trace_pick.value, *[n for n in self.trace_also.value if n != self.trace_pick.value]]
        return [(n, float(self.thickness)) for n in names if n in self.study.names]

    def _trace_changed(self, change) -> None:
        if self._silent:
            return
        guard(self.status, self._redraw_trace)

    def _redraw_trace(self) -> None:
        with self._draw_lock:
            self._draw_trace()
            self.view_trace.push()

    def _draw_trace(self) -> None:
        designs = self.trace_designs()
        if not designs:
            return
        self.trace = self.study.trace(designs)
        update_shipper_trace(self.fig_trace, self.trace, system=self.system,
                             title=f"Temperature trace at {units.format_quantity(self.thickness, 'thickness', self.system)}"
                                   " (calculated)", chosen=designs[0])
        self.trace_cautions.value = cautions_html(SHIPPER_PANEL_CAUTIONS, self.trace.attrs["cautions"])

    def _draw_profiles(self) -> None:
        """The named profiles (list) and hold / end / pass per profile at the current thickness (table)."""
        sys_, th = self.system, self.thickness
        items = []
        for name, prof in self.study.profiles.items():
            times, temps = ambient_profile(prof)
            items.append(f"<li><b>{html.escape(name)}</b>: {len(temps)} step(s) over "
                         f"{units.format_quantity(float(times[-1]), 'time', sys_)}, "
                         f"{units.format_quantity(float(temps.min()), 'temperature', sys_)} to "
                         f"{units.format_quantity(float(temps.max()), 'temperature', sys_)}</li>")
        self.profile_list.value = f'<ul style="margin:2px 0 2px 18px;padding:0">{"".join(items)}</ul>'
        bp = self.results.by_profile
        if bp is None:
            self.profile_table.value = ""
            return
        now = bp[np.isclose(bp["thickness"], th)]
        head = "".join(header_cell(t, k, sys_) for t, k in (
            ("Build-up", None), ("Profile", None), ("Hold (simulated)", "time"), ("End of hold", None),
            ("Holds the target", "flag")))
        rows = []
        for _, r in now.iterrows():
            reason = str(r["end_reason"])
            bad = not bool(r["meets_target"])
            why = f'<td class="hw-bad"><b>{html.escape(reason)}</b></td>' if bad else f"<td>{html.escape(reason)}</td>"
            rows.append("<tr>" + cell(r["candidate"], None, sys_) + cell(r["profile"], None, sys_)
                        + cell(r["hold_time_simulated"], "time", sys_) + why + flag_cell(not bad) + "</tr>")
        self.profile_table.value = (f"<table><thead><tr>{head}</tr></thead><tbody>{''.join(rows)}</tbody></table>"
                                    '<div class="hw-hint">A design holds only if it holds under every profile. '
                                    "Payload too cold (freezing) and coolant spent end a hold alike.</div>")

    def load_profile(self, path: str, name: str = "logger") -> str:
        """Load a logger CSV (:func:`workbench.load_ambient_profile`) as the named profile and recompute.

        Returns the message shown ("" when loaded); a bad file shows its file:line:column message.
        """
        from workbench.logger import load_ambient_profile

        try:
            profile = load_ambient_profile(str(path).strip())
            changes = _with_profile(self._wanted[0], name, profile)
            new = dataclasses.replace(self._wanted[0], **changes)
        except ValueError as exc:
            show_message(self.profile_msg, str(exc))
            return str(exc)
        show_message(self.profile_msg, f"Loaded {path} as profile {name.strip()!r} "
                     f"({profile[0].size} readings over {profile[0][-1] / 3600:.1f} h).", ok=True)
        self._recompute(new, self._wanted[1], full=True)
        return ""
