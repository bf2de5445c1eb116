"""Save, open and recover scenario files from the workbench.

The buttons call :mod:`workbench.scenario` (which holds the file format, the
atomic writes and the last-used store); this module only collects the file
name, reports the outcome beside the buttons, and debounces the autosave so a
slider drag does not write a file on every step.
"""

from __future__ import annotations

import threading
import weakref
from collections.abc import Callable
from pathlib import Path

import ipywidgets as widgets

from workbench import scenario as scenario_files
from workbench.widgets.fields import LOG, show_message

__all__ = ["ScenarioBar", "cancel_pending_autosaves", "kept_from", "panel_scenario"]

# Every autosave timer not yet fired, so a kernel shutdown or a test can stop them all.
_PENDING: weakref.WeakSet[threading.Timer] = weakref.WeakSet()


def cancel_pending_autosaves() -> int:
    """Cancel every autosave that is scheduled but not yet written; returns how many.

    A cancelled autosave writes nothing: the scenario shown stays in its workbench,
    and its next change schedules a new one.
    """
    timers = list(_PENDING)
    for t in timers:
        t.cancel()
    for t in timers:
        if t is not threading.current_thread():
            t.join(timeout=5.0)
    _PENDING.clear()
    return len(timers)


def kept_from(scenario) -> dict:
    """What a panel keeps from the scenario file it was opened from, so Save writes it back.

    The study holds the inputs and candidates; the file's criteria, hard limits, notes,
    decision and work limits live only in the scenario and would otherwise be lost.
    """
    if scenario is None:
        return {}
    return {
        "criteria": tuple(getattr(scenario, "criteria", ()) or ()),
        "constraints": tuple(getattr(scenario, "constraints", ()) or ()),
        "notes": getattr(scenario, "notes", "") or "",
        "decision": getattr(scenario, "decision", None),
        "limits": dict(getattr(scenario, "limits", {}) or {}),
    }


def panel_scenario(study, kept: dict, title: str, system: str):
    """The scenario of a job panel's study, with what it kept from its file (see :func:`kept_from`)."""
    from dataclasses import replace

    kw = {k: v for k, v in kept.items() if k != "limits"}
    decision = kw.get("decision")
    if decision is not None and decision.chosen not in [str(n) for n in getattr(study, "names", [])]:
        kw["decision"] = None  # the chosen candidate is no longer among the candidates
    scen = scenario_files.scenario_from_study(study, title=title, display_system=system, **kw)
    return replace(scen, limits=kept.get("limits", {}))


class ScenarioBar:
    """File name, Save / Open / Recover buttons, an overwrite tick box and a message line.

    Parameters
    ----------
    current : callable
        Returns the :class:`~workbench.scenario.Scenario` of what the workbench shows now.
    open_study : callable or None
        ``open_study(study, scenario)`` puts a loaded study into the workbench; ``None``:
        the bar saves only (no Open / Reopen buttons; the app's first page opens files).
    autosave_delay : float
        Seconds of quiet after the last change before the last-used scenario is
        written (``None`` disables autosave).
    file_name : str
        The file name offered at first.
    """

    def __init__(self, current: Callable, open_study: Callable | None, autosave_delay: float | None = 1.5,
                 file_name: str = "wall_scenario.toml"):
        self._current = current
        self._open_study = open_study
        self._delay = autosave_delay
        self._timer: threading.Timer | None = None
        lay = widgets.Layout
        self.path = widgets.Text(value=file_name, description="Scenario file",
                                 placeholder="e.g. cold_room.toml", style={"description_width": "100px"},
                                 layout=lay(width="360px"))
        self.path.add_class("hw-scenario-path")
        self.overwrite = widgets.Checkbox(value=False, description="replace an existing file (keeps a .bak)",
                                          indent=False, layout=lay(width="280px"))
        self.overwrite.add_class("hw-scenario-overwrite")
        self.save_button = widgets.Button(description="Save", icon="save", layout=lay(width="90px"))
        self.open_button = widgets.Button(description="Open", icon="folder-open", layout=lay(width="90px"))
        self.recover_button = widgets.Button(description="Reopen last used", icon="history",
                                             tooltip="The scenario last shown here, saved automatically",
                                             layout=lay(width="160px"))
        for b, css in ((self.save_button, "hw-scenario-save"), (self.open_button, "hw-scenario-open"),
                       (self.recover_button, "hw-scenario-recover")):
            b.add_class(css)
        self.message = widgets.HTML("")
        self.message.add_class("hw-scenario-message")
        self.save_button.on_click(lambda _: self._guard(self.save))
        self.open_button.on_click(lambda _: self._guard(self.open))
        self.recover_button.on_click(lambda _: self._guard(self.recover))
        self.box = widgets.VBox([
            widgets.HBox([self.path, self.save_button]
                         + ([self.open_button, self.recover_button] if open_study is not None else [])),
            self.overwrite,
            self.message,
        ])

    def _guard(self, fn) -> None:
        try:
            fn()
        except (ValueError, OSError) as exc:  # ScenarioError is a ValueError
            show_message(self.message, str(exc))
        except Exception as exc:
            LOG.exception("scenario action failed")
            show_message(self.message, f"Could not complete ({type(exc).__name__}: {exc}).")

    def save(self) -> None:
        """Write the shown scenario to the file named in the field."""
        name = self.path.value.strip()
        if not name:
            raise ValueError("scenario file: enter a file name such as cold_room.toml")
        try:
            written = scenario_files.save_scenario(self._current(), name, overwrite=self.overwrite.value)
        except FileExistsError:
            raise ValueError(f"scenario file: {name} exists; tick 'replace an existing file' to "
                             "overwrite it (the old one is kept as .bak)") from None
        show_message(self.message, f"Saved to {written}", ok=True)

    def open(self) -> None:
        """Load the file named in the field into the workbench."""
        name = self.path.value.strip()
        if not name:
            raise ValueError("scenario file: enter the name of a .toml scenario file")
        study, scen = scenario_files.open_scenario(name)
        self._open_study(study, scen)
        show_message(self.message, f"Opened {name}", ok=True)

    def recover(self) -> None:
        """Reopen the scenario last shown in any workbench session."""
        scen = scenario_files.recover_last()
        if scen is None:
            raise ValueError("no last-used scenario saved yet")
        self._open_study(scenario_files.study_from_scenario(scen), scen)
        show_message(self.message, "Reopened the last-used scenario", ok=True)

    def changed(self) -> None:
        """Note a change: the last-used scenario is written once the inputs settle."""
        if self._delay is None:
            return
        self.cancel()
        # Both taken now: the timer never sees a half-made change, and it writes to the state
        # folder in force when the change was made, not whatever is in force when it fires.
        scen = self._current()
        folder = scenario_files.state_dir()
        self._timer = threading.Timer(self._delay, self._autosave, args=(scen, folder))
        self._timer.daemon = True
        _PENDING.add(self._timer)
        self._timer.start()

    def cancel(self) -> None:
        """Drop a pending autosave without writing it."""
        if self._timer is not None:
            self._timer.cancel()
            _PENDING.discard(self._timer)
            self._timer = None

    def flush(self) -> None:
        """Write a pending autosave now (tests, kernel shutdown)."""
        timer = self._timer
        if timer is not None and timer.is_alive():
            self.cancel()
            self._autosave(*timer.args)

    @staticmethod
    def _autosave(scen, folder: Path | None = None) -> None:
        try:
            scenario_files.autosave(scen, folder)
        except Exception:  # autosave must never disturb the user
            LOG.exception("autosave failed")
