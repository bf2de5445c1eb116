"""The first page of the web app: choose one of the three jobs, or open a scenario file.

:class:`JobChooser` is an ipywidgets ``VBox`` (no physics here). Its first
page describes the three jobs of the workbench — a wall or panel between a warm
and a cold side, an insulated shipper with coolant, a device housing — each
with a button that opens its panel on the invented demo scenario. A path field
opens a scenario file instead: the file names its job (``kind``), and the
panel of that job opens on it. A bar above every panel leads back to the first
page; a panel once opened keeps its state until a file replaces it.

A file that cannot be used shows its message (``file:line:column: key: why``)
under the path field; nothing is raised into the page.
"""

from __future__ import annotations

import html
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import ipywidgets as widgets

from workbench import units
from workbench.widgets import style
from workbench.widgets.fields import LOG, show_message

__all__ = ["JobChooser", "JOBS", "Job"]


@dataclass(frozen=True)
class Job:
    """One job of the app: its key (the scenario ``kind``), its card text and its panel."""

    key: str
    name: str
    question: str
    inputs: str
    outputs: str
    demo: str
    opening: str


#: The three jobs, in the order of the first page (wording ours).
JOBS: tuple[Job, ...] = (
    Job("wall", "Wall or panel",
        "Which insulation between the warm and the cold side meets the heat budget thinnest, lightest "
        "or cheapest?",
        "inside and outside air, area, heat budget, thickness limit, candidate materials",
        "heat flux against thickness, thickness each material needs, thickness–mass trade-off, "
        "temperature through the wall",
        "demo: door panel of a refrigerated display cabinet",
        "sizing every candidate"),
    Job("shipper", "Insulated shipper with coolant",
        "Which box wall keeps the payload in range for the whole trip at the lowest landed cost?",
        "target hold time, hottest ambient of the route, coolant mass, freight rate",
        "hold time against wall thickness, landed cost per shipment, temperature trace over the trip",
        "demo: 2–8 °C laboratory kit on a two-day summer route",
        "simulating every design (a few seconds)"),
    Job("housing", "Device housing",
        "Does the inside stay below its limit, and is the outside safe to touch?",
        "dissipated power, ambient, touch contact time, use session",
        "surface temperature against finish emissivity, hot spot against power, warm-up over a session",
        "demo: handheld field data logger on a 35 °C bench",
        "solving every candidate and both sweeps"),
)

_BY_KEY = {job.key: job for job in JOBS}

_CSS = """
<style>
.hw-jobs-intro { font-size: 13px; color:#343a40; max-width: 980px; line-height: 1.4; }
.hw-job-card { background:#f8f9fa; border:1px solid #dee2e6; border-top:4px solid #0b7285; border-radius:6px;
  padding:8px 12px 10px 12px; }
.hw-job-name { font-size:16px; font-weight:650; color:#212529; margin-bottom:2px; }
.hw-job-q { font-size:13px; color:#0b7285; font-weight:600; line-height:1.3; margin-bottom:6px; }
.hw-job-text { font-size:12px; color:#495057; line-height:1.35; }
.hw-job-text b { color:#343a40; }
.hw-job-now { font-size:11.5px; color:#5c3c00; line-height:1.3; min-height: 30px; }
.hw-jobs-where { font-size:16px; font-weight:650; color:#343a40; }
</style>
"""


def _card_html(job: Job) -> str:
    return (f'{_CSS}<div class="hw-job-name">{html.escape(job.name)}</div>'
            f'<div class="hw-job-q">{html.escape(job.question)}</div>'
            f'<div class="hw-job-text"><b>You set:</b> {html.escape(job.inputs)}.<br>'
            f"<b>You see:</b> {html.escape(job.outputs)}.</div>")


class JobChooser(widgets.VBox):
    """The app: a first page offering the three jobs, each opening its panel.

    Parameters
    ----------
    system : {"SI", "US"}
        Display system of the panels opened on a demo (a scenario file's own
        ``display_system`` wins for the panels it opens).
    background : bool
        Passed to :class:`~workbench.widgets.ShipperPanel`: recompute in a
        background task (True in the browser; tests may pass False).
    autosave_delay : float or None
        Passed to :class:`~workbench.widgets.Workbench` (seconds before the
        last-used scenario is written; None: no autosave).

    Attributes
    ----------
    current : str or None
        Key of the job shown (``"wall"``, ``"shipper"``, ``"housing"``), None on the first page.
    panels : dict
        The panel of each job opened so far, by key.
    """

    def __init__(self, system: str = "SI", background: bool = True, autosave_delay: float | None = 1.5):
        units.check_system(system)
        self.system = system
        self.background = bool(background)
        self.autosave_delay = autosave_delay
        self.panels: dict[str, widgets.Widget] = {}
        self.current: str | None = None
        self._build_home()
        self._build_bar()
        super().__init__(children=[self.home_page])
        self.add_class("hw-root")
        self.add_class("hw-jobs")

    # ------------------------------------------------------------------ build
    def _build_home(self) -> None:
        w = widgets.Layout
        self.intro = widgets.HTML(
            f'{style.CSS}{_CSS}<div class="hw-title">Choose a job</div>'
            '<div class="hw-jobs-intro">Three studies share one set of material tables (every value with its '
            "source). Each job opens on an invented demo scenario, labelled as such: type your own values over "
            "it (units accepted: 25 mm, 1 in, 77 °F, 48 h), or open a scenario file saved earlier.</div>")
        self.intro.add_class("hw-jobs-intro-box")
        self.open_buttons: dict[str, widgets.Button] = {}
        self.card_notes: dict[str, widgets.HTML] = {}
        cards = []
        for job in JOBS:
            button = widgets.Button(description="Open the demo", icon="arrow-right", button_style="info",
                                    tooltip=f"{job.name}: {job.demo}", layout=w(width="170px"))
            button.add_class(f"hw-job-open-{job.key}")
            button.on_click(lambda _, key=job.key: self._guard(self.open_job, key))
            note = widgets.HTML(self._note_html(job))
            note.add_class(f"hw-job-note-{job.key}")
            card = widgets.VBox([widgets.HTML(_card_html(job), layout=w(flex="1 1 auto")), note, button],
                                layout=w(width="310px", min_height="250px", margin="0 12px 12px 0",
                                         justify_content="space-between"))
            card.add_class("hw-job-card")
            card.add_class(f"hw-job-{job.key}")
            self.open_buttons[job.key] = button
            self.card_notes[job.key] = note
            cards.append(card)
        self.cards = widgets.HBox(cards, layout=w(flex_flow="row wrap", align_items="stretch"))
        self.path = widgets.Text(value="", description="Scenario file", placeholder="e.g. ../examples/shipper.toml",
                                 continuous_update=True, style={"description_width": "100px"},
                                 layout=w(width="460px"))
        self.path.add_class("hw-jobs-path")
        self.open_file_button = widgets.Button(description="Open file", icon="folder-open", layout=w(width="120px"))
        self.open_file_button.add_class("hw-jobs-open-file")
        self.open_file_button.on_click(lambda _: self._guard(self.open_file, self.path.value))
        self.file_hint = widgets.HTML(
            '<div class="hw-hint">A .toml scenario file of any of the three jobs (saved from a panel, or '
            "written with <code>heatpath scenario new KIND</code>); the file says which job it is. "
            f"Relative paths start in {html.escape(str(Path.cwd()))}.</div>")
        self.message = widgets.HTML("")
        self.message.add_class("hw-jobs-message")
        self.home_page = widgets.VBox([
            self.intro, self.cards,
            widgets.HTML('<div class="hw-section">Or open a scenario file</div>'),
            widgets.HBox([self.path, self.open_file_button]), self.file_hint, self.message,
        ])
        self.home_page.add_class("hw-jobs-home")

    def _build_bar(self) -> None:
        w = widgets.Layout
        self.back_button = widgets.Button(description="All jobs", icon="arrow-left", tooltip="Back to the first page",
                                          layout=w(width="120px"))
        self.back_button.add_class("hw-jobs-back")
        self.back_button.on_click(lambda _: self.show_home())
        self.where = widgets.HTML("")
        self.where.add_class("hw-jobs-where-box")
        self.bar = widgets.HBox([self.back_button, self.where],
                                layout=w(align_items="center", margin="0 0 6px 0",
                                         border_bottom="1px solid #dee2e6", padding="0 0 4px 0"))
        self.bar.add_class("hw-jobs-bar")

    def _note_html(self, job: Job) -> str:
        panel = self.panels.get(job.key) if hasattr(self, "panels") else None
        if panel is None:
            return f'<div class="hw-job-now">{html.escape(job.demo)} (invented numbers)</div>'
        return (f'<div class="hw-job-now">Open now: {html.escape(str(getattr(panel, "title", job.name)))} '
                "(as you left it)</div>")

    # --------------------------------------------------------------- actions
    def _guard(self, fn: Callable, *args):
        """Run a button action; any problem becomes the message under the path field."""
        try:
            return fn(*args)
        except (ValueError, OSError) as exc:  # ScenarioError is a ValueError
            show_message(self.message, str(exc))
        except Exception as exc:
            LOG.exception("job chooser action failed")
            show_message(self.message, f"Could not open this ({type(exc).__name__}: {exc}).")
        finally:
            self._busy(False)
        return None

    def _busy(self, busy: bool, text: str = "") -> None:
        for b in (*self.open_buttons.values(), self.open_file_button):
            b.disabled = busy
        if busy:
            show_message(self.message, text, ok=True)

    def open_job(self, key: str) -> widgets.Widget:
        """Show the panel of job ``key`` (built on its demo scenario the first time); returns it."""
        if key not in _BY_KEY:
            raise ValueError(f"job: unknown {key!r}; valid: {list(_BY_KEY)}")
        panel = self.panels.get(key)
        if panel is None:
            job = _BY_KEY[key]
            self._busy(True, f"Opening {job.name.lower()}: {job.opening}…")
            panel = self._demo_panel(key)
            self.panels[key] = panel
            show_message(self.message, "")
        self._show(key)
        return panel

    def open_file(self, path) -> widgets.Widget:
        """Open a scenario file in the panel of its job; returns the panel.

        Raises
        ------
        ValueError
            The file cannot be read or used; the message names the file (and,
            for a problem inside it, line, column and key).
        """
        from workbench.scenario import load_scenario, study_from_scenario

        name = str(path).strip()
        if not name:
            raise ValueError("scenario file: enter the path of a .toml scenario file, e.g. ../examples/wall.toml")
        target = Path(name).expanduser()
        if not target.is_file():
            where = target if target.is_absolute() else Path.cwd() / target
            what = "is a folder, not a file" if target.is_dir() else "not found"
            raise ValueError(f"scenario file: {name}: {what} (looked at {where})")
        self._busy(True, f"Reading {name}…")
        try:
            scen = load_scenario(target)
        except UnicodeDecodeError as exc:  # pragma: no cover - load_scenario reports these itself
            raise ValueError(f"scenario file: {name}: not UTF-8 text ({exc.reason})") from None
        if scen.kind not in _BY_KEY:
            raise ValueError(f"{name}: kind {scen.kind!r} has no panel in this app; "
                             f"valid: {list(_BY_KEY)} (try `heatpath report {name}`)")
        study = study_from_scenario(scen)
        job = _BY_KEY[scen.kind]
        self._busy(True, f"Opening {name} ({job.name.lower()}): {job.opening}…")
        panel = self._file_panel(scen.kind, study, scen)
        self.panels[scen.kind] = panel
        self._show(scen.kind)
        show_message(self.message, f"Opened {name}", ok=True)
        return panel

    def show_home(self) -> None:
        """Back to the first page (every panel keeps its state)."""
        self.current = None
        for job in JOBS:
            self.card_notes[job.key].value = self._note_html(job)
            self.open_buttons[job.key].description = ("Return to it" if job.key in self.panels
                                                      else "Open the demo")
        self.children = [self.home_page]

    def _show(self, key: str) -> None:
        job = _BY_KEY[key]
        self.current = key
        self.where.value = (f'<span class="hw-jobs-where">{html.escape(job.name)}</span>'
                            '<span class="hw-hint"> — the first page lists all three jobs and opens scenario '
                            "files</span>")
        self.children = [self.bar, self.panels[key]]

    # ----------------------------------------------------------------- panels
    def _demo_panel(self, key: str) -> widgets.Widget:
        from workbench.widgets.app import Workbench
        from workbench.widgets.housing_panel import HousingPanel
        from workbench.widgets.shipper_panel import ShipperPanel

        if key == "wall":
            return Workbench(system=self.system, autosave_delay=self.autosave_delay)
        if key == "shipper":
            return ShipperPanel(system=self.system, background=self.background)
        return HousingPanel(system=self.system)

    def _file_panel(self, key: str, study, scen) -> widgets.Widget:
        from workbench.widgets.app import Workbench
        from workbench.widgets.housing_panel import HousingPanel
        from workbench.widgets.shipper_panel import ShipperPanel

        system = scen.display_system if scen.display_system in units.SYSTEMS else self.system
        title = scen.title or None
        if key == "wall":
            panel = Workbench(study, system=system, title=title, autosave_delay=self.autosave_delay)
            panel.open_study(study, scen)  # the file's decision, criteria and notes, as its Open button does
            return panel
        if key == "shipper":
            return ShipperPanel(study, system=system, title=title, background=self.background, scenario=scen)
        return HousingPanel(study, system=system, title=title, scenario=scen)
