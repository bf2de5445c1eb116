"""The wall workbench: pick candidates, set conditions with units, sweep, compare.

:class:`Workbench` is an ipywidgets ``VBox`` shown in one cell. It holds a
:class:`~workbench.studies.wall.WallStudy` (all numbers come from it), input
widgets that change the study, and four plotly charts plus a results table
that are updated in place on every change.
"""

from __future__ import annotations

import dataclasses
import html
import json
import time

import ipywidgets as widgets
import numpy as np
import pandas as pd

from workbench import units
from workbench._checks import Cancelled
from workbench.materials import MaterialsFileError, load_conductivity_curves, load_materials
from workbench.studies.wall import HeatBudget, WallStudy
from workbench.widgets import style
from workbench.widgets.charts import (
    CRITERIA,
    FluxChart,
    ProfileChart,
    RequiredChart,
    TradeoffChart,
    WallView,
    compute_view,
)
from workbench.widgets.decision import CompareBox, DecisionForm
from workbench.widgets.fields import input_field, show_message
from workbench.widgets.parts import cell, guard, header_cell, section
from workbench.widgets.picker import CandidatePicker, short_label
from workbench.widgets.plotview import figure_spec
from workbench.widgets.runner import TaskRunner, fine_sweep
from workbench.widgets.scenario_bar import ScenarioBar
from workbench.widgets.table import ResultsTable

__all__ = ["Workbench", "demo_study", "DEMO_CANDIDATES", "DEMO_TITLE"]

#: Invented demo scenario: the door panel of a refrigerated display cabinet.
DEMO_TITLE = "Demo (invented): door panel of a refrigerated display cabinet"
DEMO_CANDIDATES = ("eps_20", "xps_35", "pir_32", "pur_cast_40", "phenolic_35", "glass_wool_32",
                   "cork_board_120", "aerogel_blanket", "vip_effective")
_BUDGET_KINDS = {"flux": "heat_flux", "power": "power", "u_value": "u_value"}
_BUDGET_LABELS = (("Heat flux", "flux"), ("Total heat flow", "power"), ("U-value", "u_value"))


def demo_study(materials: pd.DataFrame | None = None, k_curves: dict | None = None) -> WallStudy:
    """The invented demo scenario (all numbers made up for the demo).

    A door panel of 0.6 m² between a cabinet held at 3 °C and a shop at 25 °C,
    which may pass at most 6 W/m² and be at most 60 mm thick.
    """
    m = load_materials() if materials is None else materials
    kc = load_conductivity_curves() if k_curves is None else k_curves
    return WallStudy(
        candidates=list(DEMO_CANDIDATES), materials=m,
        t_inside=276.15, t_outside=298.15, area=0.6,
        budget=HeatBudget("flux", 6.0), max_thickness=0.06, thickness=0.04, k_curves=kc,
    )


def static_figure_output(fig) -> dict:
    """One Output-widget entry showing ``fig`` as a plotly figure document (plain JSON lists)."""
    spec = json.loads(json.dumps(figure_spec(fig)))
    spec["config"] = {"displaylogo": False, "responsive": False}
    return {"output_type": "display_data", "metadata": {},
            "data": {"application/vnd.plotly.v1+json": spec, "text/plain": "<chart>"}}


class Workbench(widgets.VBox):
    """Interactive wall comparison, shown in one notebook cell.

    Parameters
    ----------
    study : WallStudy, optional
        The study to start from; default: the invented demo scenario
        (:func:`demo_study`), labelled as a demo.
    system : {"SI", "US"}
        Initial display system.
    title : str, optional
        Heading; default names the demo scenario or "Wall comparison".
    demo : bool, optional
        Show the "DEMO — invented numbers" badge; default: when no study is given.
    redraw : {"auto", "messages", "static"}
        How chart changes reach the browser: "messages" ("auto" means this,
        in JupyterLab and Voila alike) sends each chart's changed data and
        layout to its :class:`~workbench.widgets.plotview.PlotView`, which
        redraws with ``Plotly.react``; "static" replaces a figure document per
        chart in an Output widget after each update (a fallback that needs
        only the front end's plotly renderer; each update redraws the whole
        chart).

    Notes
    -----
    Every input change recomputes through the study's vectorised methods and
    updates the existing figures in place. Bad input shows a message beside
    its field and keeps the last good result; errors are logged to the
    ``workbench.widgets`` logger, never raised into the notebook.
    """

    def __init__(self, study: WallStudy | None = None, system: str = "SI", title: str | None = None,
                 demo: bool | None = None, redraw: str = "auto", autosave_delay: float | None = 1.5):
        units.check_system(system)
        if redraw not in ("auto", "messages", "static"):
            raise ValueError(f"redraw: unknown {redraw!r}; valid: ['auto', 'messages', 'static']")
        # "static" shows each chart as a plotly figure document in an Output widget,
        # replaced after every update (the figures stay the model).
        self.redraw = "messages" if redraw == "auto" else redraw
        demo = study is None if demo is None else bool(demo)
        self.study = demo_study() if study is None else study
        self.system = system
        self._chosen = 0
        self._silent = False
        self.view: WallView | None = None
        self.timings: dict[str, float] = {}
        self._direction = -1.0 if self.study.t_inside < self.study.t_outside else 1.0
        if self.study.budget is None:
            self.study.budget = HeatBudget("flux", 10.0)
        title = title or (DEMO_TITLE if demo else "Wall comparison")
        self.title = title
        # kept from an opened scenario file so that Save writes them back unchanged
        self._criteria: tuple = ()
        self._constraints: tuple = ()
        self._notes = ""
        self._limits: dict = {}
        self.decision_form = DecisionForm(on_change=self._decision_changed)
        self.compare_box = CompareBox(self.current_scenario)
        self.scenario_bar = ScenarioBar(self.current_scenario, self.open_study, autosave_delay)
        self._build(title, demo)
        self._set_candidates_ui()
        self.refresh()
        super().__init__(children=self._children)
        self.add_class("hw-root")
        self.add_class("hw-workbench")
        self.add_class(f"hw-redraw-{self.redraw}")

    # ------------------------------------------------------------------ build
    def _build(self, title: str, demo: bool) -> None:
        """Make every widget, lay them out (``self._children``) and connect their events."""
        self._build_head(title, demo)
        self._build_inputs()
        self._build_charts()
        self._build_tasks()
        self._children = self._layout()
        self._connect()

    def _build_head(self, title: str, demo: bool) -> None:
        """Title, SI/US switch, cautions, summary and status lines."""
        w = widgets.Layout
        self.header = widgets.HTML(self._header_html(title, demo), layout=w(flex="1 1 auto"))
        self.system_toggle = widgets.ToggleButtons(options=[("SI", "SI"), ("US customary", "US")], value=self.system,
                                                   style={"button_width": "112px"}, tooltips=["SI units", "US customary units"],
                                                   layout=w(min_width="240px", flex="0 0 auto"))
        self.system_toggle.add_class("hw-system")
        self.cautions = widgets.HTML(f'<div class="hw-cautions"><b>Cautions:</b> {html.escape(style.CAUTIONS)}</div>')
        self.cautions.add_class("hw-cautions-box")
        self.summary = widgets.HTML("")
        self.summary.add_class("hw-summary")
        self.status = widgets.HTML("")
        self.status.add_class("hw-status")

    def _build_inputs(self) -> None:
        """Candidate picker, condition fields, sliders and the view choices."""
        s, w = self.study, widgets.Layout
        self.picker = CandidatePicker(s.materials, [c.name for c in s.candidates], self._set_candidates,
                                      on_file=self._load_file, system=self.system)

        self.f_inside = input_field("wall", "t_inside", "Inside air", "inside temperature", s.t_inside,
                                  lambda v: self._apply_temperatures(t_inside=v), self.system, "hw-t-inside")
        self.f_outside = input_field("wall", "t_outside", "Outside air", "outside temperature", s.t_outside,
                                   lambda v: self._apply_temperatures(t_outside=v), self.system, "hw-t-outside")
        self.f_area = input_field("wall", "area", "Wall area", "area", s.area, lambda v: self._apply(area=v), self.system,
                                "hw-area")
        self.budget_kind = widgets.Dropdown(options=_BUDGET_LABELS, value=s.budget.kind, description="Heat budget as",
                                            style={"description_width": "118px"}, layout=w(width="300px"))
        self.budget_kind.add_class("hw-budget-kind")
        self.f_budget = input_field("wall", "budget", "Budget", "heat budget", s.budget.value,
                                    self._apply_budget_value, self.system, "hw-budget",
                                    quantity=_BUDGET_KINDS[s.budget.kind])
        self.f_max = input_field("wall", "max_thickness", "Max thickness", "max thickness",
                               s.max_thickness if s.max_thickness is not None else 0.1,
                               lambda v: self._apply(max_thickness=v), self.system, "hw-max-thickness")

        self.s_thick = widgets.FloatSlider(description="Thickness", continuous_update=True,
                                           style={"description_width": "118px"}, layout=w(width="330px"))
        self.s_thick.add_class("hw-thickness")
        self.s_dt = widgets.FloatSlider(description="ΔT", continuous_update=True,
                                        style={"description_width": "118px"}, layout=w(width="330px"))
        self.s_dt.add_class("hw-delta-t")
        self.slider_hint = widgets.HTML("")
        self.highlight = widgets.Dropdown(description="Chosen candidate", style={"description_width": "118px"},
                                          layout=w(width="330px"))
        self.highlight.add_class("hw-highlight")
        opts = [(t, k) for k, (t, _, _) in CRITERIA.items()]
        self.crit_x = widgets.Dropdown(options=opts, value="required", description="Trade-off x",
                                       style={"description_width": "118px"}, layout=w(width="330px"))
        self.crit_y = widgets.Dropdown(options=opts, value="mass", description="Trade-off y",
                                       style={"description_width": "118px"}, layout=w(width="330px"))
        self.crit_c = widgets.Dropdown(options=opts, value="cost", description="Colour",
                                       style={"description_width": "118px"}, layout=w(width="330px"))
        for d, css in ((self.crit_x, "hw-crit-x"), (self.crit_y, "hw-crit-y"), (self.crit_c, "hw-crit-c")):
            d.add_class(css)

    def _build_charts(self) -> None:
        """The four charts (clicks choose a candidate) and the results table."""
        self.flux_chart = FluxChart(width=420, height=320)
        self.req_chart = RequiredChart(width=420, height=320)
        self.trade_chart = TradeoffChart(width=420, height=320)
        self.prof_chart = ProfileChart(width=420, height=320)
        for chart, css in ((self.flux_chart, "hw-chart-flux"), (self.req_chart, "hw-chart-required"),
                           (self.trade_chart, "hw-chart-tradeoff"), (self.prof_chart, "hw-chart-profile")):
            chart.view.add_class(css)
        self.req_chart.view.on_click(0, self._clicked_bar)
        self.trade_chart.view.on_click(1, self._clicked_point)

        self.table = ResultsTable()

    def _build_tasks(self) -> None:
        """Buttons and result lines of the long computations, and their progress bar."""
        w = widgets.Layout
        self.runner = TaskRunner("Progress")
        self.sweep_button = widgets.Button(description="Fine sweep of ΔT", icon="play",
                                           tooltip="Flux of every candidate over 400 ΔT × 400 thicknesses, in chunks",
                                           layout=w(width="170px"))
        self.sweep_button.add_class("hw-fine-sweep")
        self.mc_button = widgets.Button(description="Rank stability", icon="random",
                                        tooltip="Monte Carlo over the conductivity tolerances: 20,000 samples",
                                        layout=w(width="170px"))
        self.mc_button.add_class("hw-rank-stability")
        self.stack_button = widgets.Button(description="Build-up search", icon="search",
                                           tooltip="Every stack of up to 3 of the candidate materials, 5 mm steps, "
                                                   "within the max thickness",
                                           layout=w(width="170px"))
        self.stack_button.add_class("hw-buildup-search")
        self.sweep_result = widgets.HTML("")
        self.sweep_result.add_class("hw-sweep-result")
        self.mc_result = widgets.HTML("")
        self.mc_result.add_class("hw-mc-result")
        self.stack_result = widgets.HTML("")
        self.stack_result.add_class("hw-stack-result")

    def _layout(self) -> list:
        """The workbench's rows: inputs beside the charts, then table, decision, files and tasks."""
        w = widgets.Layout
        left = widgets.VBox([
            section("Candidates"), self.picker.box,
            section("Conditions"), self.f_inside.box, self.f_outside.box, self.f_area.box, self.budget_kind,
            self.f_budget.box, self.f_max.box,
            section("Sweep"), self.s_thick, self.s_dt, self.slider_hint,
            section("View"), self.highlight, self.crit_x, self.crit_y, self.crit_c,
        ], layout=w(width="350px", min_width="350px", margin="0 12px 0 0"))
        left.add_class("hw-panel")
        shown = [c.view for c in self._charts()]
        if self.redraw == "static":
            shown = []
            for chart in self._charts():
                out = widgets.Output(layout=w(width="424px", min_height="320px"))
                for css in chart.view._dom_classes:
                    out.add_class(css)
                shown.append(out)
        self.charts = charts = widgets.GridBox(
            shown,
            layout=w(grid_template_columns="repeat(auto-fit, 424px)", grid_gap="6px 6px", width="100%"),
        )
        right = widgets.VBox([self.summary, charts], layout=w(flex="1 1 430px", min_width="430px"))
        return [
            widgets.HBox([self.header, self.system_toggle], layout=w(align_items="center")),
            self.cautions,
            self.status,
            widgets.HBox([left, right], layout=w(flex_flow="row wrap", align_items="flex-start")),
            section("Results at the design point (each candidate at its required thickness)"),
            self.table.box,
            section("Decision (saved into the scenario file; the report shows it)"),
            self.decision_form.box,
            section("Scenario file (inputs, candidates and the chosen one, for the meeting to re-run)"),
            self.scenario_bar.box,
            section("What changed since an earlier scenario file"),
            self.compare_box.box,
            section("Long computations"),
            widgets.HBox([widgets.VBox([self.sweep_button, self.mc_button, self.stack_button]), self.runner.box]),
            self.sweep_result, self.mc_result, self.stack_result,
        ]

    def _connect(self) -> None:
        """Connect the widgets' events to the handlers (each guarded: a problem shows, never raises)."""
        self.system_toggle.observe(lambda c: self._guard(self._set_system, c["new"]), "value")
        self.budget_kind.observe(lambda c: self._guard(self._set_budget_kind, c["old"], c["new"]), "value")
        self.s_thick.observe(lambda c: self._slider(self._set_thickness, c), "value")
        self.s_dt.observe(lambda c: self._slider(self._set_delta_t, c), "value")
        self.highlight.observe(lambda c: self._guard(self._set_chosen, c["new"]), "value")
        for d in (self.crit_x, self.crit_y, self.crit_c):
            d.observe(lambda _: self._guard(self._set_criteria), "value")
        self.sweep_button.on_click(lambda _: self._guard(self.start_fine_sweep))
        self.mc_button.on_click(lambda _: self._guard(self.start_rank_stability))
        self.stack_button.on_click(lambda _: self._guard(self.start_buildup_search))

    # ------------------------------------------------------------- plumbing
    def _guard(self, fn, *args):
        """Run an event handler; show any problem in the status line, never raise."""
        return guard(self.status, fn, *args)

    def _slider(self, fn, change):
        if self._silent:
            return
        self._guard(fn, change["new"])

    @property
    def labels(self) -> list[str]:
        """Chart labels of the candidates (short material names)."""
        m = self.study.materials
        out = []
        for c in self.study.candidates:
            lab = short_label(m.loc[c.name, "name"]) if len(c.layers) == 1 and c.name == c.sized_material else c.name
            out.append(lab)
        seen: dict[str, int] = {}
        for i, lab in enumerate(out):  # keep labels unique
            if lab in seen:
                out[i] = f"{lab} ({self.study.candidates[i].name})"
            seen[lab] = i
        return out

    @property
    def currency(self) -> str | None:
        m = self.study.materials
        cur = sorted({str(c) for c in m["currency"].dropna() if str(c).strip()}) if "currency" in m else []
        return cur[0] if len(cur) == 1 else None

    def _grid(self) -> np.ndarray:
        top = max(0.2, 2.0 * (self.study.max_thickness or 0.1))
        return np.linspace(top / 200, top, 200)

    # --------------------------------------------------------------- updates
    def refresh(self, table: bool = True) -> None:
        """Recompute through the study and update every chart in place (and the table)."""
        t0 = time.perf_counter()
        view = compute_view(self.study, self._grid(), self._chosen)
        t1 = time.perf_counter()
        self.flux_chart.update(view, self.system)
        self.req_chart.update(view, self.system)
        self.trade_chart.update(view, self.system, front=self._front(view))
        self.prof_chart.update(view, self.system, self.labels[self._chosen])
        if self.redraw == "static" and getattr(self, "charts", None) is not None:
            self._show_static()
        else:
            for chart in self._charts():
                chart.push()
        t2 = time.perf_counter()
        self.view = view
        self._summary(view)
        if table:
            self._update_table(view)
        t3 = time.perf_counter()
        self.timings = {"compute": t1 - t0, "figures": t2 - t1, "table": t3 - t2, "total": t3 - t0}
        show_message(self.status, "")
        self.scenario_bar.changed()

    def _front(self, view: WallView):
        try:
            from workbench.ranking import pareto_front
        except ImportError:
            return None
        objs = np.column_stack([getattr(view, CRITERIA[k][2]) for k in (self.trade_chart.x_key, self.trade_chart.y_key)])
        ok = np.all(np.isfinite(objs), axis=1)
        mask = np.zeros(len(objs), bool)
        if ok.any():
            mask[ok] = pareto_front(objs[ok])
        return mask

    def _update_table(self, view: WallView) -> None:
        frame = self.study.results()
        frame["label"] = self.labels
        frame["flux_now"] = view.flux_now
        self.table.set_frame(frame, self.system, self.currency, self.study.names[self._chosen])

    def _summary(self, view: WallView) -> None:
        labels = self.labels
        s = self.study

        def best(values, kind):
            v = np.where(np.isfinite(values), values, np.inf)
            i = int(np.argmin(v))
            return (f"<b>{html.escape(labels[i])}</b> "
                    f"({html.escape(units.format_quantity(float(values[i]), kind, self.system, currency=self.currency))})")

        dt = units.format_quantity(abs(s.delta_t), "temperature_difference", self.system)
        budget = units.format_quantity(s.budget.value, _BUDGET_KINDS[s.budget.kind], self.system)
        fits = int(np.sum(view.required <= (s.max_thickness or np.inf)))
        self.summary.value = (
            f'<div class="hw-detail">ΔT {html.escape(dt)}, budget {html.escape(budget)} → '
            f"thinnest {best(view.required, 'thickness')}, lightest {best(view.mass, 'mass_per_area')}, "
            f"cheapest {best(view.cost, 'cost_per_area')}; {fits} of {len(labels)} fit the max thickness.</div>"
        )

    def _configure_sliders(self) -> None:
        """Set slider ranges and values in the display system (no recompute)."""
        self._silent = True
        try:
            g = self._grid()
            us = self.system == "US"
            lo, hi = (float(units.from_si(g[0], "thickness", self.system)),
                      float(units.from_si(g[-1], "thickness", self.system)))
            step = 0.05 if us else 1.0
            self.s_thick.min, self.s_thick.max = 0.0, hi  # widen first, then narrow
            self.s_thick.min = round(max(lo, step), 2)
            self.s_thick.step = step
            self.s_thick.readout_format = ".2f" if us else ".0f"
            self.s_thick.description = f"Thickness [{units.display_unit('thickness', self.system)}]"
            self.s_thick.value = float(np.clip(units.from_si(self.study.thickness, "thickness", self.system),
                                               self.s_thick.min, self.s_thick.max))
            dt = abs(self.study.delta_t)
            dmax_si = max(60.0, 1.5 * dt)
            self.s_dt.min, self.s_dt.max = 0.0, float(units.from_si(dmax_si, "temperature_difference", self.system))
            self.s_dt.min = float(units.from_si(0.5, "temperature_difference", self.system))
            self.s_dt.step = 0.5
            self.s_dt.readout_format = ".1f"
            self.s_dt.description = f"ΔT [{units.display_unit('temperature_difference', self.system)}]"
            self.s_dt.value = float(units.from_si(max(dt, 0.5), "temperature_difference", self.system))
            self.slider_hint.value = ('<div class="hw-hint">The ΔT slider moves the inside temperature; '
                                      "the outside stays as typed.</div>")
        finally:
            self._silent = False

    def _set_candidates_ui(self) -> None:
        labels = self.labels
        srcs = list(self.study.materials.loc[[c.sized_material for c in self.study.candidates], "conductivity_source"])
        for chart in (self.flux_chart, self.req_chart, self.trade_chart, self.prof_chart):
            chart.set_candidates(labels, srcs, self.currency)
        self._chosen = min(self._chosen, len(labels) - 1)
        self.decision_form.set_candidates(self.study.names)
        self._silent = True
        try:
            self.highlight.options = [(lab, i) for i, lab in enumerate(labels)]
            self.highlight.value = self._chosen
        finally:
            self._silent = False
        self._configure_sliders()

    # ---------------------------------------------------------------- inputs
    def _apply(self, **changes) -> None:
        """Replace study inputs (validated by the study), then refresh; raises ValueError if rejected."""
        new = dataclasses.replace(self.study, **changes)
        old, self.study = self.study, new
        try:
            self.refresh()
        except Exception:
            self.study = old
            self.refresh()
            raise
        if "max_thickness" in changes:
            self._configure_sliders()
            self.refresh()

    def _apply_temperatures(self, **changes) -> None:
        self._apply(**changes)
        s = self.study
        if s.t_inside != s.t_outside:
            self._direction = -1.0 if s.t_inside < s.t_outside else 1.0
        self._configure_sliders()

    def _apply_budget_value(self, value: float) -> None:
        self._apply(budget=HeatBudget(self.budget_kind.value, value))

    def _set_budget_kind(self, old: str, new: str) -> None:
        if self._silent:
            return
        s = self.study
        flux = float(np.abs(s.max_flux()))  # the present budget, as a flux at the design ΔT
        equivalent = {"flux": flux, "power": flux * s.area,
                      "u_value": flux / abs(s.delta_t) if s.delta_t else 0.3}[new]
        self.f_budget.kind = _BUDGET_KINDS[new]
        self.f_budget.set_value(equivalent)
        self._apply(budget=HeatBudget(new, equivalent))

    def _set_thickness(self, value_display: float) -> None:
        old = self.study.thickness
        self.study.thickness = float(units.to_si(value_display, units.display_unit("thickness", self.system).replace("″", ""),
                                                 "thickness", "thickness"))
        try:
            self.refresh()
        except Exception:
            self.study.thickness = old
            raise

    def _set_delta_t(self, value_display: float) -> None:
        s = self.study
        dt = float(units.to_si(value_display, units.KINDS["temperature_difference"].display[self.system][0],
                               "temperature_difference", "ΔT"))
        old = s.t_inside
        s.t_inside = s.t_outside + self._direction * dt
        try:
            self.refresh()
        except Exception:
            s.t_inside = old
            raise
        self.f_inside.set_value(s.t_inside)

    def _set_chosen(self, index) -> None:
        if self._silent or index is None:
            return
        self._chosen = int(index)
        self.refresh()

    def _set_criteria(self) -> None:
        self.trade_chart.x_key, self.trade_chart.y_key, self.trade_chart.c_key = (
            self.crit_x.value, self.crit_y.value, self.crit_c.value)
        if self.view is not None:
            self.trade_chart.update(self.view, self.system, front=self._front(self.view))
            if self.redraw == "static":
                self._show_static()
            else:
                self.trade_chart.push()

    def _set_system(self, system: str) -> None:
        self.system = system
        for f in (self.f_inside, self.f_outside, self.f_area, self.f_budget, self.f_max):
            f.set_system(system)
        self.picker.set_system(system)
        self._configure_sliders()
        self.refresh()

    def _set_candidates(self, ids: list[str]) -> None:
        build_ups = [c for c in self.study.candidates if len(c.layers) > 1]
        new = dataclasses.replace(self.study, candidates=build_ups + list(ids))
        chosen_name = self.study.names[self._chosen]
        self.study = new
        self._chosen = new.names.index(chosen_name) if chosen_name in new.names else 0
        self._set_candidates_ui()
        self.refresh()

    def _load_file(self, path: str) -> None:
        try:
            materials = load_materials(path)
            curves = load_conductivity_curves(path)
        except MaterialsFileError as exc:
            problems = getattr(exc, "problems", [str(exc)])
            more = f"\n… and {len(problems) - 6} more" if len(problems) > 6 else ""
            raise ValueError("materials file: " + "\n".join(problems[:6]) + more) from None
        except OSError as exc:
            raise ValueError(f"materials file: cannot read {path!r} ({exc.strerror or exc})") from None
        self.study = dataclasses.replace(self.study, materials=materials, k_curves=curves)
        self.picker.set_materials(materials)
        self._set_candidates_ui()
        self.refresh()

    def _clicked_bar(self, point: int) -> None:
        """A click on a required-thickness bar chooses that candidate."""
        label = self.req_chart.fig.data[0].y[point]
        self._guard(lambda: setattr(self.highlight, "value", self.labels.index(label)))

    def _clicked_point(self, point: int) -> None:
        """A click on a trade-off point chooses that candidate."""
        self._guard(lambda: setattr(self.highlight, "value", int(point)))

    @staticmethod
    def _header_html(title: str, demo: bool) -> str:
        badge = '<span class="hw-badge">DEMO — invented numbers</span>' if demo else ""
        return (f'{style.CSS}<div class="hw-title">{html.escape(title)}{badge}</div>'
                '<div class="hw-subtitle">Which wall material meets the heat budget thinnest, lightest, cheapest? '
                "Inputs accept units (25 mm, 1 in, 77 °F). Each candidate keeps its colour in the charts; "
                '<b style="color:#d9480f">orange</b> marks the chosen one.</div>')

    # ------------------------------------------------------------ scenarios
    def current_scenario(self):
        """The scenario of what is shown now (inputs, candidates, display system, chosen one)."""
        from workbench.scenario import snapshot

        decided = self.decision_form.values()["chosen"]
        chosen = decided if decided in self.study.names else self.study.names[self._chosen]
        scen = snapshot(self.study, system=self.system, chosen=chosen, title=self.title, notes=self._notes,
                        criteria=self._criteria, constraints=self._constraints)
        return self.decision_form.apply(dataclasses.replace(scen, limits=self._limits))

    def _decision_changed(self) -> None:
        """The decision form changed: mark its candidate in the charts and schedule the autosave."""
        chosen = self.decision_form.values()["chosen"]
        if chosen and chosen in self.study.names and self.study.names.index(chosen) != self._chosen:
            self.highlight.value = self.study.names.index(chosen)  # refreshes and autosaves
        else:
            self.scenario_bar.changed()

    def open_study(self, study, scenario=None) -> None:
        """Show another wall study (e.g. one loaded from a scenario file)."""
        if not isinstance(study, WallStudy):
            kind = getattr(scenario, "kind", type(study).__name__)
            raise ValueError(f"scenario: this workbench shows wall comparisons; a {kind} scenario "
                             "opens in its own panel (the app's first page: `make app`), its notebook, "
                             "or with `heatpath report`")
        if study.budget is None:
            study.budget = HeatBudget("flux", 10.0)
        old = (self.study, self._chosen, self.system)
        if scenario is not None and getattr(scenario, "title", ""):
            self.title = scenario.title
            self.header.value = self._header_html(self.title, "demo" in self.title.lower())
        old_kept = (self._criteria, self._constraints, self._notes, self._limits)
        if scenario is not None:
            self._limits = dict(getattr(scenario, "limits", {}) or {})
            self._criteria = tuple(getattr(scenario, "criteria", ()) or ())
            self._constraints = tuple(getattr(scenario, "constraints", ()) or ())
            self._notes = getattr(scenario, "notes", "") or ""
        self.study = study
        chosen = getattr(getattr(scenario, "decision", None), "chosen", None)
        self._chosen = study.names.index(chosen) if chosen in study.names else 0
        if scenario is not None and getattr(scenario, "display_system", None) in units.SYSTEMS:
            self.system = scenario.display_system
        try:
            self._silent = True
            try:
                self.system_toggle.value = self.system
                self.budget_kind.value = study.budget.kind
            finally:
                self._silent = False
            for f in (self.f_inside, self.f_outside, self.f_area, self.f_budget, self.f_max):
                f.set_system(self.system)
            self.f_budget.kind = _BUDGET_KINDS[study.budget.kind]
            self.f_inside.set_value(study.t_inside)
            self.f_outside.set_value(study.t_outside)
            self.f_area.set_value(study.area)
            self.f_budget.set_value(study.budget.value)
            self.f_max.set_value(study.max_thickness if study.max_thickness is not None else 0.1)
            self.picker.set_materials(study.materials)
            self.picker.set_system(self.system)
            self.picker.set_chosen([c.name for c in study.candidates if len(c.layers) == 1
                                    and c.name == c.layers[0].material], notify=False)
            if study.t_inside != study.t_outside:
                self._direction = -1.0 if study.t_inside < study.t_outside else 1.0
            self._set_candidates_ui()
            if scenario is not None:
                self.decision_form.load(getattr(scenario, "decision", None))
            self.refresh()
        except Exception:
            self.study, self._chosen, self.system = old
            self._criteria, self._constraints, self._notes, self._limits = old_kept
            self._set_candidates_ui()
            self.refresh()
            raise

    # ---------------------------------------------------------- public helpers
    def set_inputs(self, **texts: str) -> dict[str, str]:
        """Type text into fields by name (``t_inside``, ``t_outside``, ``area``,
        ``budget``, ``max_thickness``); returns each field's message ("" if accepted)."""
        fields = {"t_inside": self.f_inside, "t_outside": self.f_outside, "area": self.f_area,
                  "budget": self.f_budget, "max_thickness": self.f_max}
        out = {}
        for name, text in texts.items():
            if name not in fields:
                raise ValueError(f"set_inputs: unknown field {name!r}; valid: {list(fields)}")
            fields[name].text.value = text
            out[name] = fields[name].error
        return out

    def start_fine_sweep(self, background: bool = True, n: int = 400):
        """Flux of every candidate over ``n`` ΔT values × ``n`` thicknesses, chunked, cancellable."""
        snapshot = dataclasses.replace(self.study)  # the sweep must not see later slider moves
        lt = np.concatenate([[snapshot.thickness], np.linspace(self._grid()[0], self._grid()[-1], n)])
        dts = np.linspace(0.5, max(60.0, 1.5 * abs(snapshot.delta_t)), n)
        labels, chosen, system = self.labels, self._chosen, self.system

        def done(result):
            q_now = np.abs(result[:, 0, :])  # at the current thickness, per candidate and ΔT
            limit = np.abs(snapshot.max_flux(dts))
            ok = q_now <= limit
            holds = np.where(ok.any(axis=1), np.where(ok, dts, -np.inf).max(axis=1), np.nan)
            L = units.format_quantity(snapshot.thickness, "thickness", system)
            i = chosen
            if np.isnan(holds[i]):
                text = f"At {L}, {labels[i]} exceeds the budget over the whole ΔT range."
            elif ok[i].all():
                text = f"At {L}, {labels[i]} meets the budget over the whole ΔT range swept."
            else:
                text = (f"At {L}, {labels[i]} meets the budget up to ΔT = "
                        f"{units.format_quantity(holds[i], 'temperature_difference', system)}.")
            n_ok = int(np.sum(ok[:, np.searchsorted(dts, min(abs(snapshot.delta_t), dts[-1]))]))
            self.sweep_result.value = (f'<div class="hw-detail">{html.escape(text)} '
                                       f"{n_ok} of {len(labels)} candidates meet it at the design ΔT "
                                       f"({result.size:,} flux values).</div>")

        return self.runner.run(fine_sweep, snapshot, lt, dts, on_done=done, background=background, chunk=16)

    def start_rank_stability(self, background: bool = True, n_samples: int = 20000):
        """Monte Carlo over the conductivity tolerances (:meth:`WallStudy.uncertainty`), cancellable.

        Shows, per candidate, the P10/P50/P90 of the total thickness it needs to
        meet the budget, and the chance of being the thinnest, lightest and
        cheapest (ties split evenly).
        """
        snapshot = dataclasses.replace(self.study)
        labels, system, cur = self.labels, self.system, self.currency

        def task(progress, cancelled):
            frame = snapshot.uncertainty(n_samples=n_samples, progress=progress, cancel=cancelled)
            if frame.attrs["cancelled"]:
                raise Cancelled(f"stopped after {frame.attrs['n_samples']:,} of {n_samples:,} samples; "
                                "no estimate shown")
            return frame

        def done(frame):
            kinds = (("Candidate", None), ("Total thickness needed, P10", "thickness"), ("P50", "thickness"),
                     ("P90", "thickness"), ("P(thinnest)", "flag"), ("P(lightest)", "flag"), ("P(cheapest)", "flag"))
            head = "".join(header_cell(t, k, system, cur) for t, k in kinds)
            rows = []
            for lab, (_, r) in zip(labels, frame.iterrows(), strict=True):
                rows.append("<tr>" + cell(lab, None, system)
                            + "".join(cell(r[f"total_thickness_{q}"], "thickness", system) for q in ("p10", "p50", "p90"))
                            + "".join(f"<td>{100 * r[f'p_{w}']:.0f} %</td>" for w in ("thinnest", "lightest", "cheapest"))
                            + "</tr>")
            self.mc_result.value = (
                f'<div class="hw-detail"><b>Rank stability</b> — {frame.attrs["n_samples"]:,} samples; '
                "conductivity of each sized layer normal with σ = table tolerance/√3 (GUM rectangular), "
                "propagated by Monte Carlo (JCGM 101:2008). P90: thick enough in 9 of 10 samples.</div>"
                f'<div class="hw-grid"><table><thead><tr>{head}</tr></thead><tbody>{"".join(rows)}</tbody></table></div>')

        return self.runner.run(task, on_done=done, background=background)

    def start_buildup_search(self, background: bool = True, max_layers: int = 3):
        """Exact search of the build-ups of up to three candidate materials (:meth:`WallStudy.buildup_search`)."""
        snapshot = dataclasses.replace(self.study)
        system, cur = self.system, self.currency
        short = {m: short_label(n) for m, n in snapshot.materials["name"].items()}

        def task(progress, cancelled):
            return snapshot.buildup_search(max_layers=max_layers, progress=progress, cancel=cancelled)

        def done(frame):
            ok = frame[frame["meets_budget"]]
            shown = ok if len(ok) else frame
            shown = shown.head(8)
            kinds = (("Build-up (layers in any order)", None), ("Total thickness", "thickness"),
                     ("U-value", "u_value"), ("Heat flux", "heat_flux"), ("Mass", "mass_per_area"),
                     ("Cost (demo)", "cost_per_area"))
            head = "".join(header_cell(t, k, system, cur) for t, k in kinds)
            rows = []
            for _, r in shown.iterrows():
                text = " + ".join(f"{short.get(mid, mid)} {units.format_quantity(t, 'thickness', system)}"
                                  for mid, t in zip(r["materials"], r["layer_thickness"], strict=True))
                rows.append("<tr>" + cell(text, None, system) + cell(r["total_thickness"], "thickness", system)
                            + cell(r["u_value"], "u_value", system) + cell(r["heat_flux"], "heat_flux", system)
                            + cell(r["mass_per_area"], "mass_per_area", system)
                            + cell(r["cost_per_area"], "cost_per_area", system) + "</tr>")
            limit = ("" if snapshot.max_thickness is None else
                     f" within {units.format_quantity(snapshot.max_thickness, 'thickness', system)}")
            if len(ok) == 1:
                what = "1 of them meets the heat budget and is listed"
            elif len(ok):
                what = f"{len(ok)} of them meet the heat budget; the {min(8, len(ok))} cheapest of those are listed"
            else:
                what = "none meets the heat budget; the first 8 of the front are listed"
            self.stack_result.value = (
                f'<div class="hw-detail"><b>Build-up search</b> — {len(frame)} non-dominated build-ups (thermal '
                f"resistance, mass, cost) of up to {max_layers} different candidate materials{limit}, out of "
                f"{frame.attrs['n_stacks']:,} stacks scored; {what}. Table conductivities; order the layers "
                "afterwards and check each layer's service temperature.</div>"
                f'<div class="hw-grid"><table><thead><tr>{head}</tr></thead><tbody>{"".join(rows)}</tbody></table></div>')

        return self.runner.run(task, on_done=done, background=background)

    def _show_static(self) -> None:
        """Static mode: show each chart as a plotly figure document in an Output widget."""
        shown = getattr(self, "_static_shown", {})
        for chart, out in zip(self._charts(), self.charts.children, strict=True):
            entry = static_figure_output(chart.fig)
            # resend only the charts whose figure changed: the browser redraws each one it gets
            if shown.get(id(out)) != entry["data"]:
                out.outputs = (entry,)
                shown[id(out)] = entry["data"]
        self._static_shown = shown

    def _charts(self):
        return (self.flux_chart, self.req_chart, self.trade_chart, self.prof_chart)

    def resync(self) -> Workbench:
        """Send every chart's changes to the browser (a view opened later asks for the whole chart)."""
        for chart in self._charts():
            chart.push()
        return self
