"""Interactive panel for the housing study (inside air, surface and hot-spot temperatures).

:class:`HousingPanel` is an ipywidgets ``VBox``. It holds a
:class:`~workbench.studies.housing.HousingStudy`; every number it shows comes
from the study's methods (:meth:`~HousingStudy.results`,
:meth:`~HousingStudy.emissivity_sweep`, :meth:`~HousingStudy.power_sweep`,
:meth:`~HousingStudy.warm_up_frame`).
The panel converts units and draws.

The power slider recomputes on release (about half a second); the component
keeps its share of the dissipated power, as in :meth:`HousingStudy.power_sweep`.
"""

from __future__ import annotations

import dataclasses
import html
import time
import warnings

import ipywidgets as widgets
import numpy as np
import plotly.graph_objects as go

from workbench import units
from workbench.studies.housing import (
    HOUSING_CAUTIONS,
    TOUCH_RESULT_CAUTION,
    Component,
    HousingStudy,
)
from workbench.widgets import style
from workbench.widgets.charts import _affine, _base_layout, update_housing_warm_up
from workbench.widgets.fields import input_field, show_message
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
from workbench.widgets.scenario_bar import ScenarioBar, kept_from, panel_scenario

__all__ = ["HousingPanel", "demo_housing_study"]

HOUSING_DEMO_TITLE = "Demo (invented): handheld field data logger on a 35 °C bench"


_LIMIT_DASH = ("dash", "dot", "dashdot", "longdash", "longdashdot")


#: Contact times offered as buttons beside the typed field: a tap, a grab, 1 min, 10 min, 8 h. [s]
CONTACT_PRESETS: tuple[tuple[str, float], ...] = (
    ("1 s", 1.0), ("10 s", 10.0), ("1 min", 60.0), ("10 min", 600.0), ("8 h", 8 * 3600.0))


def _contact_unit(seconds: float) -> str:
    """The unit a contact time is shown in: s below 1 min, min below 3 h, h above."""
    return "s" if seconds < 60.0 else ("min" if seconds < 3 * 3600.0 else "h")


def _preset_of(seconds: float) -> float | None:
    """The preset button for a contact time [s], or None when it is not one of them."""
    for _, value in CONTACT_PRESETS:
        if abs(float(seconds) - value) <= 1e-9 * value:
            return value
    return None


def demo_housing_study() -> HousingStudy:
    """The invented demo product of ``notebooks/housing.ipynb`` (all product data made up)."""
    from workbench.materials import load_materials
    from workbench.studies.housing import HousingCandidate as C

    candidates = [
        C("aluminium_6063_t6", 0.0015, "aluminium_bare"),
        C("aluminium_6063_t6", 0.0015, "aluminium_anodised"),
        C("magnesium_az91d", 0.0015, "paint"),
        C("stainless_304", 0.0008, "stainless_polished"),
        C("carbon_steel", 0.001, "paint"),
        C("pc_abs", 0.0025, "plastic_matte"),
        C("pc_abs", 0.0025, "plastic_metallised"),
        C("pa66_gf30", 0.0025, "plastic_matte"),
        C("pa6_tc_filled", 0.0025, "plastic_matte"),
        C("pps_tc_filled", 0.0025, "plastic_glossy"),
    ]
    return HousingStudy(
        candidates, load_materials(), length=0.16, width=0.085, height=0.035, power=3.0,
        t_ambient=273.15 + 35.0, mounting="on-table", t_inside_max=273.15 + 65.0,
        component=Component(0.025, 0.025, 0.8), contact_duration=600.0,
    )


def with_power(study: HousingStudy, power: float, share: float) -> HousingStudy:
    """A copy of ``study`` at ``power`` [W], its component keeping ``share`` of it [-]."""
    comp = study.component
    if comp is not None:
        comp = Component(comp.length, comp.width, share * float(power))
    return dataclasses.replace(study, power=float(power), component=comp)


class HousingPanel(widgets.VBox):
    """Housing walls against inside-air, surface and touch limits, shown in one cell.

    Parameters
    ----------
    study : HousingStudy, optional
        Default: the invented demo product of the housing notebook, labelled as a demo.
    system : {"SI", "US"}
        Initial display system.
    title : str, optional
        Heading.
    scenario : Scenario, optional
        The scenario file the study came from: Save writes its criteria, limits, notes
        and decision back with the panel's inputs.

    Notes
    -----
    Inputs: dissipated power (field and slider), ambient temperature, touch
    contact duration, use-session duration and the contents' heat capacity
    (for the warm-up chart and the time to the touch limit). Bad input shows a message beside its field and keeps the
    last good result; errors go to the ``workbench.widgets`` logger.
    """

    def __init__(self, study: HousingStudy | None = None, system: str = "SI", title: str | None = None,
                 n_emissivity: int = 50, n_power: int = 41, scenario=None):
        units.check_system(system)
        demo = study is None
        self.study = demo_housing_study() if study is None else study
        if not isinstance(self.study, HousingStudy):
            raise ValueError(f"study: expected a HousingStudy, got {type(self.study).__name__}")
        self.system = system
        self.demo = demo
        self.title = title or (HOUSING_DEMO_TITLE if demo else "Housing comparison")
        self._kept = kept_from(scenario)
        s = self.study
        self.share = (s.component.power / s.power) if (s.component is not None and s.power > 0) else 0.0
        self.emissivities = np.linspace(0.02, 1.0, int(n_emissivity))
        self._n_power = int(n_power)
        self.power_max = max(2.0 * s.power, 1.0)
        self.timings: dict[str, float] = {}
        self.validity: tuple[str, ...] = ()
        self.results, self.eps_sweep = self._compute(s)
        self.warm = self._next_warm
        self.pow_sweep = self._power_sweep(s)
        self.classes = list(dict.fromkeys(self.results["touch_class"]))
        self._silent = False
        self._build()
        self._redraw()
        super().__init__(children=self._children)
        self.add_class("hw-root")
        self.add_class("hw-housing")

    # --------------------------------------------------------------- compute
    def _compute(self, study: HousingStudy, early=None):
        """Results, emissivity sweep and warm-up of ``study``; ``early(results)`` runs as soon
        as the results are known (before the sweeps), so the chart beside the slider can move."""
        t0 = time.perf_counter()
        with warnings.catch_warnings(record=True) as caught:
            warnings.simplefilter("always")
            w = study.warm_up()  # once, for the table's time to the limit and for the chart
            res = study.results(warm=w)
        if early is not None:
            early(res)
        t1 = time.perf_counter()
        eps = study.emissivity_sweep(self.emissivities)
        t2 = time.perf_counter()
        warm = study.warm_up_frame(warm=w)
        self.timings = {"results": t1 - t0, "emissivity_sweep": t2 - t1,
                        "warm_up": time.perf_counter() - t2}
        self.validity = tuple(dict.fromkeys(str(w.message) for w in caught))
        self._next_warm = warm
        return res, eps

    def _power_sweep(self, study: HousingStudy):
        t0 = time.perf_counter()
        frame = study.power_sweep(np.linspace(self.power_max / self._n_power, self.power_max, self._n_power))
        self.timings["power_sweep"] = time.perf_counter() - t0
        return frame

    # ------------------------------------------------------------------ build
    def _build(self) -> None:
        s, w, sys_ = self.study, widgets.Layout, self.system
        self.header = widgets.HTML(header_html(
            self.title, self.demo,
            "Will the inside stay below its limit, and is the outside safe to touch? Inputs accept units "
            "(3 W, 35 °C, 95 °F, 10 min)."), layout=w(flex="1 1 auto"))
        self.system_toggle = widgets.ToggleButtons(options=[("SI", "SI"), ("US customary", "US")],
                                                   value=sys_, style={"button_width": "112px"},
                                                   layout=w(min_width="240px", flex="0 0 auto"))
        self.system_toggle.add_class("hw-housing-system")
        self.cautions = widgets.HTML("")
        self.cautions.add_class("hw-housing-cautions")
        self.status = widgets.HTML("")
        self.status.add_class("hw-housing-status")
        self.f_power = input_field("housing", "power", "Power inside", "dissipated power", s.power, self._set_power, sys_,
                                 "hw-housing-power")
        self.f_ambient = input_field("housing", "t_ambient", "Ambient", "ambient temperature", s.t_ambient,
                                   lambda v: self._apply(t_ambient=v), sys_, "hw-housing-ambient")
        self.f_contact = input_field("housing", "contact_duration", "Touch contact", "contact duration", s.contact_duration,
                                   lambda v: self._apply(contact_duration=v), sys_, "hw-housing-contact",
                                   unit=_contact_unit)
        self.contact_presets = widgets.ToggleButtons(
            options=[(label, seconds) for label, seconds in CONTACT_PRESETS],
            value=_preset_of(s.contact_duration), tooltips=[
                "a tap", "a grab", "holding for a minute", "holding for 10 minutes",
                "a whole working day (8 h and longer)"],
            style={"button_width": "62px"}, layout=w(margin="0 0 4px 118px"))
        self.contact_presets.add_class("hw-housing-contact-presets")
        self.f_session = input_field("housing", "session_duration", "Use session", "use-session duration", s.session_duration,
                                   lambda v: self._apply(session_duration=v), sys_, "hw-housing-session", unit="min")
        self.f_contents = input_field("housing", "content_heat_capacity", "Contents heat cap.", "contents' heat capacity",
                                    s.content_heat_capacity, lambda v: self._apply(content_heat_capacity=v), sys_,
                                    "hw-housing-contents")
        self.slider = widgets.FloatSlider(description="Power", continuous_update=False, readout_format=".3g",
                                          style={"description_width": "118px"}, layout=w(width="330px"))
        self.slider.add_class("hw-housing-power-slider")
        self._configure_slider()
        hint = widgets.HTML('<div class="hw-hint">The bonded component keeps its share of the power. The slider '
                            "recomputes when released.</div>")
        self.notes = widgets.HTML("")
        self.notes.add_class("hw-housing-notes")
        line = dict(type="line", xref="x", yref="paper", x0=0, x1=0, y0=0, y1=1,
                    line=dict(color="#495057", width=1, dash="dot"))
        legend = dict(font=dict(size=10), orientation="h", yanchor="top", y=-0.2, x=0)
        self.fig_eps = go.Figure(layout=_base_layout("Mean surface temperature vs emissivity", 425, 540,
                                                           showlegend=True, legend=legend))
        self.fig_pow = go.Figure(layout=_base_layout("Hot-spot temperature vs power", 425, 540,
                                                           showlegend=True, legend=legend, shapes=[line]))
        self.fig_warm = go.Figure(layout=_base_layout("Mean surface temperature over the use session", 540, 470,
                                                      showlegend=True))
        self.view_eps, self.view_pow = PlotView(self.fig_eps), PlotView(self.fig_pow)
        self.view_warm = PlotView(self.fig_warm)
        self.view_warm.add_class("hw-housing-chart-warmup")
        self.view_eps.add_class("hw-housing-chart-emissivity")
        self.view_pow.add_class("hw-housing-chart-power")
        n = len(s.names)
        for fig in (self.fig_eps, self.fig_pow):
            # the emissivity curves of all candidates nearly coincide: their names (hover) stay out of
            # that chart's legend; the power chart beside it carries the colour key
            fig.add_traces([go.Scatter(name=nm, mode="lines", line=dict(width=1.8, color=style.candidate_colour(i)),
                                       showlegend=fig is self.fig_pow)
                            for i, nm in enumerate(s.names)])
            fig.add_traces([go.Scatter(name=f"touch limit, {cls}", mode="lines",
                                       line=dict(color=style.BUDGET, width=2, dash=_LIMIT_DASH[j % len(_LIMIT_DASH)]))
                            for j, cls in enumerate(self.classes)])
        self.fig_eps.add_trace(go.Scatter(name="design points", mode="markers", text=s.names,
                                          marker=dict(size=9, symbol="diamond", color=style.ACCENT,
                                                      line=dict(color=style.ACCENT_EDGE, width=1))))
        self.fig_pow.add_trace(go.Scatter(name="current power", mode="markers", text=s.names,
                                          marker=dict(size=9, symbol="diamond", color=style.ACCENT,
                                                      line=dict(color=style.ACCENT_EDGE, width=1))))
        self._n = n
        self.table = widgets.HTML("")
        self.table.add_class("hw-table")
        self.table.add_class("hw-housing-table")
        self._children = panel_children(
            self.header, self.system_toggle, self.cautions, self.status,
            [section("Conditions"), self.f_power.box, self.f_ambient.box, self.f_contact.box,
             self.contact_presets,
             section("Use session (warm-up)"), self.f_session.box, self.f_contents.box,
             section("Power"), self.slider, hint, self.notes],
            "hw-housing-inputs", [self.view_eps, self.view_pow, self.view_warm],
            "Results per candidate (pass/fail against the touch and inside-air limits)", self.table)
        self.scenario_bar = ScenarioBar(self.current_scenario, None, None, "housing_scenario.toml")
        self._children = [*self._children, section("Save as a scenario file"), self.scenario_bar.box]
        self.system_toggle.observe(self._toggled, "value")
        self.slider.observe(self._slid, "value")
        self.contact_presets.observe(self._preset_chosen, "value")

    def _preset_chosen(self, change) -> None:
        if self._silent or change["new"] is None:
            return
        seconds = float(change["new"])

        def apply():
            self._apply(contact_duration=seconds)
            self.f_contact.set_value(seconds)

        guard(self.status, apply)

    def _toggled(self, change) -> None:
        if not self._silent:
            guard(self.status, self.set_system, change["new"])

    def _configure_slider(self) -> None:
        a, b = _affine("power", self.system)
        self._silent = True
        try:
            hi = a * self.power_max + b
            self.slider.min, self.slider.max = 0.0, max(hi, self.slider.min + 1e-9)
            self.slider.step = hi / 200
            self.slider.description = f"Power [{units.display_unit('power', self.system)}]"
            self.slider.value = float(a * self.study.power + b)
        finally:
            self._silent = False

    # ---------------------------------------------------------------- inputs
    def _apply(self, **changes) -> None:
        """Recompute with changed study inputs (all three charts); raises ValueError if rejected."""
        new = dataclasses.replace(self.study, **changes)
        res, eps = self._compute(new)
        pow_sweep = self._power_sweep(new)
        self.study, self.results, self.eps_sweep, self.pow_sweep = new, res, eps, pow_sweep
        self.warm = self._next_warm
        self._silent = True
        try:  # the preset buttons show the typed contact time when it is one of theirs
            self.contact_presets.value = _preset_of(new.contact_duration)
        finally:
            self._silent = False
        self._redraw()

    def current_scenario(self):
        """The scenario of what is shown now (for Save): inputs and candidates, plus what the
        file it came from held besides (criteria, limits, notes, decision)."""
        return panel_scenario(self.study, self._kept, self.title, self.system)

    def _show_power_now(self, study: HousingStudy, res) -> None:
        """Move the power chart's current-power markers and line to ``study``'s power, and send it."""
        sys_ = self.system
        p_now = float(conv(study.power, "power", sys_))
        k = self._n + len(self.classes)
        with self.fig_pow.batch_update():
            c = self.fig_pow.data[k]
            c.x = np.full(len(res), p_now)
            c.y = conv(res["t_hot_spot"], "temperature", sys_)
            self.fig_pow.layout.shapes[0].x0 = p_now
            self.fig_pow.layout.shapes[0].x1 = p_now
            self.fig_pow.layout.title.text = (
                f"Hot spot vs power — current {units.format_quantity(study.power, 'power', sys_)}")
        self.view_pow.push()

    def _set_power(self, power: float) -> None:
        new = with_power(self.study, power, self.share)
        early = None
        if power <= self.power_max:  # same axis: the power chart can move before the sweeps
            def early(res):
                self._show_power_now(new, res)
        try:
            res, eps = self._compute(new, early)
        except Exception:
            if early is not None:  # put the power chart back to what the rest still shows
                self._redraw_figures()
                self.resync()
            raise
        if power > self.power_max:  # widen the power axis
            old_max = self.power_max
            self.power_max = 2.0 * power
            try:
                self.pow_sweep = self._power_sweep(new)
            except Exception:
                self.power_max = old_max
                raise
        self.study, self.results, self.eps_sweep = new, res, eps
        self.warm = self._next_warm
        self._configure_slider()
        self._redraw()

    def _slid(self, change) -> None:
        if self._silent or change["new"] is None:
            return
        a, b = _affine("power", self.system)
        power = (float(change["new"]) - b) / a

        def apply():
            self._set_power(power)
            self.f_power.set_value(power)

        guard(self.status, apply)

    def set_system(self, system: str) -> None:
        """Show every value in ``system`` ("SI" or "US"): fields, slider, axes, table."""
        units.check_system(system)
        self.system = system
        for f in self._fields():
            f.set_system(system)
        self._configure_slider()
        self._silent = True
        try:
            if self.system_toggle.value != system:
                self.system_toggle.value = system
        finally:
            self._silent = False
        self._redraw()

    def set_inputs(self, **texts: str) -> dict[str, str]:
        """Type text into fields by name (``power``, ``ambient``, ``contact``, ``session``,
        ``contents``); returns each field's message ("" if accepted)."""
        fields = dict(zip(("power", "ambient", "contact", "session", "contents"), self._fields(), strict=True))
        out = {}
        for name, text in texts.items():
            if name not in fields:
                raise ValueError(f"set_inputs: unknown field {name!r}; valid: {list(fields)}")
            fields[name].text.value = text
            out[name] = fields[name].error
        return out

    def _fields(self):
        return (self.f_power, self.f_ambient, self.f_contact, self.f_session, self.f_contents)

    # ---------------------------------------------------------------- drawing
    def _limits(self) -> list[float]:
        r = self.results
        return [float(r.loc[r["touch_class"] == cls, "touch_limit"].iloc[0]) for cls in self.classes]

    def _redraw(self) -> None:
        # charts first (the power chart, beside the slider, leads), then the table and notes:
        # the browser applies messages in order, so the chart the user is watching moves first
        self._redraw_figures()
        self.resync()
        self._draw_table()
        self.cautions.value = cautions_html(HOUSING_CAUTIONS)
        self.notes.value = ("" if not self.validity else
                            '<div class="hw-hint">Outside a correlation\'s validity range: '
                            + html.escape("; ".join(self.validity)) + "</div>")
        show_message(self.status, "")

    def _redraw_figures(self) -> None:
        s, sys_, r = self.study, self.system, self.results
        ut = units.display_unit("temperature", sys_)
        up = units.display_unit("power", sys_)
        limits = self._limits()
        p_now = float(conv(s.power, "power", sys_))
        with self.fig_eps.batch_update(), self.fig_pow.batch_update():
            for i, name in enumerate(s.names):
                g = self.eps_sweep[self.eps_sweep["candidate"] == name]
                tr = self.fig_eps.data[i]
                tr.x = g["emissivity"].to_numpy(float)
                tr.y = conv(g["t_surface"], "temperature", sys_)
                tr.hovertemplate = (f"<b>{html.escape(name)}</b><br>ε = %{{x:.2f}}<br>T_s = %{{y:.1f}} {ut}"
                                    "<extra></extra>")
                g = self.pow_sweep[self.pow_sweep["candidate"] == name]
                tp = self.fig_pow.data[i]
                tp.x = conv(g["power"], "power", sys_)
                tp.y = conv(g["t_hot_spot"], "temperature", sys_)
                tp.hovertemplate = (f"<b>{html.escape(name)}</b><br>P = %{{x:.3g}} {up}<br>T_hot = %{{y:.1f}} {ut}"
                                    "<extra></extra>")
            px = conv(self.pow_sweep["power"], "power", sys_)
            for j, (cls, lim) in enumerate(zip(self.classes, limits, strict=True)):
                y = float(conv(lim, "temperature", sys_))
                label = f"touch limit, {cls} ({units.format_quantity(lim, 'temperature', sys_)})"
                for fig, xs in ((self.fig_eps, [0.0, 1.0]), (self.fig_pow, [0.0, float(px.max())])):
                    t = fig.data[self._n + j]
                    t.x, t.y, t.name = xs, [y, y], label
            k = self._n + len(self.classes)
            d = self.fig_eps.data[k]
            d.x = r["emissivity"].to_numpy(float)
            d.y = conv(r["t_surface"], "temperature", sys_)
            d.hovertemplate = f"%{{text}}<br>ε = %{{x:.2f}}<br>T_s = %{{y:.1f}} {ut}<extra>design point</extra>"
            c = self.fig_pow.data[k]
            c.x = np.full(len(r), p_now)
            c.y = conv(r["t_hot_spot"], "temperature", sys_)
            c.hovertemplate = f"%{{text}}<br>P = %{{x:.3g}} {up}<br>T_hot = %{{y:.1f}} {ut}<extra>current</extra>"
            self.fig_pow.layout.shapes[0].x0 = p_now
            self.fig_pow.layout.shapes[0].x1 = p_now
            self.fig_eps.layout.xaxis.title.text = units.axis_label("dimensionless", sys_,
                                                                    name="Emissivity of the outer finish")
            self.fig_eps.layout.yaxis.title.text = units.axis_label("temperature", sys_, name="Mean surface temperature")
            self.fig_pow.layout.xaxis.title.text = units.axis_label("power", sys_, name="Dissipated power")
            self.fig_pow.layout.yaxis.title.text = units.axis_label("temperature", sys_, name="Hot-spot temperature")
            self.fig_eps.layout.title.text = (
                f"Mean surface temperature vs emissivity at {units.format_quantity(s.power, 'power', sys_)}")
            self.fig_pow.layout.title.text = (
                f"Hot spot vs power — current {units.format_quantity(s.power, 'power', sys_)}")
        update_housing_warm_up(
            self.fig_warm, self.warm, sys_,
            title=(f"Mean surface over a {s.session_duration / 60.0:.3g}-min session at "
                   f"{units.format_quantity(s.power, 'power', sys_)}"),
            colours=[style.candidate_colour(i) for i in range(self._n)], width=540, height=470)

    def _draw_table(self) -> None:
        sys_, r = self.system, self.results
        cols = (("Candidate", None), ("Wall", "thickness"), ("ε", "dimensionless"), ("Inside air", "temperature"),
                ("Mean surface", "temperature"), ("Hot spot", "temperature"), ("Touch limit", "temperature"),
                ("Margin, surface", "temperature_difference"), ("Margin, hot spot", "temperature_difference"),
                ("Time to touch limit [min]", None), ("Passes", "flag"), ("Why not", None))
        head = "".join(header_cell(t, k, sys_) for t, k in cols)
        rows = []
        for name, row in r.iterrows():
            margin = ""
            for col in ("margin_surface", "margin_hot_spot"):
                v = float(row[col])
                x = float(conv(v, "temperature_difference", sys_))
                cls = ' class="hw-bad"' if v < 0 else ""
                margin += f"<td{cls}>{x:+.1f}</td>"
            rows.append("<tr>" + cell(name, None, sys_) + cell(row["thickness"], "thickness", sys_)
                        + cell(row["emissivity"], "dimensionless", sys_)
                        + cell(row["t_air_inside"], "temperature", sys_) + cell(row["t_surface"], "temperature", sys_)
                        + cell(row["t_hot_spot"], "temperature", sys_) + cell(row["touch_limit"], "temperature", sys_)
                        + margin + self._reach_cell(float(row["time_to_touch_limit"]))
                        + flag_cell(bool(row["passes"]), "✓ pass", "✗ fail")
                        + cell(row["why_not"] or "—", None, sys_) + "</tr>")
        self.table.value = (f"<table><thead><tr>{head}</tr></thead><tbody>{''.join(rows)}</tbody></table>"
                            '<div class="hw-hint">Margin = touch limit − temperature (negative: above the '
                            "limit). Touch limits as entered in the study (default: skin burn thresholds, "
                            "not product limits). Time to touch limit: when the mean surface reaches it during "
                            "the use session, warming from room temperature (the hot spot gets there sooner). "
                            + html.escape(TOUCH_RESULT_CAUTION) + "</div>")

    def _reach_cell(self, seconds: float) -> str:
        if seconds == 0.0:
            return '<td class="hw-bad">at start</td>'
        if not np.isfinite(seconds):
            return "<td>not within session</td>"
        return f'<td class="hw-bad">{seconds / 60.0:.1f}</td>'

    # ------------------------------------------------------------ display
    def resync(self) -> HousingPanel:
        """Send the charts' changes to the browser (a view opened later asks for the whole chart)."""
        self.view_pow.push()
        self.view_eps.push()
        self.view_warm.push()
        return self
