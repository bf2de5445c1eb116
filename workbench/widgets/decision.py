"""The meeting's decision form, and "Compare with…" an earlier scenario file.

:class:`DecisionForm` collects what the meeting decided: the chosen candidate
(one of the study's candidates), why, who decided and who attended; the date
fills itself in (today, ISO 8601) whenever the decision changes. The workbench
puts it into the scenario it saves (:meth:`Scenario.with_decision`), so the
Save button writes it and the report shows it; opening a scenario file fills
the form from the file's ``[decision]`` table.

:class:`CompareBox` opens an earlier scenario file and shows what changed
between it and the scenario shown now, as a table: the comparison is
:func:`workbench.review.diff_scenarios` (no numbers are computed here).
"""

from __future__ import annotations

import datetime as _dt
import html
from collections.abc import Callable, Sequence

import ipywidgets as widgets

from workbench.widgets.fields import LOG, show_message

__all__ = ["DecisionForm", "CompareBox", "decision_fields", "scenario_with_decision", "NOT_DECIDED"]

NOT_DECIDED = "(not decided yet)"
_FIELDS = ("chosen", "rationale", "decided_by", "attendees", "date")

def decision_fields(decision) -> dict[str, str]:
    """The form's fields (``chosen``, ``rationale``, ``decided_by``, ``attendees``, ``date``) of a
    scenario's decision (``None``: all empty)."""
    if decision is None:
        return dict.fromkeys(_FIELDS, "")
    return {k: str(getattr(decision, k, "") or "") for k in _FIELDS}


def scenario_with_decision(scenario, chosen: str, rationale: str = "", decided_by: str = "",
                           attendees: str = "", date: str = ""):
    """``scenario.with_decision(...)`` including the attendees."""
    return scenario.with_decision(chosen, rationale, decided_by, date=date, attendees=attendees)


def _today() -> str:
    return _dt.date.today().isoformat()


class DecisionForm:
    """Chosen candidate, why, who decided, attendees; the date is filled in automatically.

    Parameters
    ----------
    on_change : callable, optional
        Called (no arguments) after any change of the decision, e.g. to
        highlight the chosen candidate and schedule the autosave.
    today : callable, optional
        Returns today's date as ISO 8601 text (``"2026-12-02"``); default: the
        system date. Tests pass a fixed one.
    """

    def __init__(self, on_change: Callable[[], None] | None = None, today: Callable[[], str] = _today):
        self._on_change = on_change
        self._today = today
        self._silent = False
        self._date = ""
        lay, st = widgets.Layout, {"description_width": "110px"}
        self.chosen = widgets.Dropdown(options=[NOT_DECIDED], value=NOT_DECIDED, description="Chosen",
                                       style=st, layout=lay(width="420px"))
        self.rationale = widgets.Textarea(description="Why", placeholder="the reasons, in a sentence or two",
                                          style=st, layout=lay(width="560px", height="64px"))
        self.decided_by = widgets.Text(description="Decided by", placeholder="name or role",
                                       style=st, layout=lay(width="420px"))
        self.attendees = widgets.Text(description="Attendees", placeholder="names, separated by commas",
                                      style=st, layout=lay(width="560px"))
        self.date = widgets.HTML("")
        self.message = widgets.HTML("")
        for w, css in ((self.chosen, "hw-decision-chosen"), (self.rationale, "hw-decision-why"),
                       (self.decided_by, "hw-decision-by"), (self.attendees, "hw-decision-attendees"),
                       (self.date, "hw-decision-date"), (self.message, "hw-decision-message")):
            w.add_class(css)
        for w in (self.chosen, self.rationale, self.decided_by, self.attendees):
            w.observe(self._changed, "value")
        self.box = widgets.VBox([self.chosen, self.rationale, self.decided_by, self.attendees, self.date,
                                 self.message])
        self.box.add_class("hw-decision")
        self._show_date()

    # ------------------------------------------------------------ state
    @property
    def decided(self) -> bool:
        """True when a candidate is chosen."""
        return self.chosen.value not in (None, NOT_DECIDED)

    def values(self) -> dict[str, str]:
        """The decision as text fields (``chosen`` is "" when not decided)."""
        return {
            "chosen": self.chosen.value if self.decided else "",
            "rationale": self.rationale.value.strip(),
            "decided_by": " ".join(self.decided_by.value.split()),
            "attendees": " ".join(self.attendees.value.split()),
            "date": self._date,
        }

    def apply(self, scenario):
        """``scenario`` with this decision (unchanged when no candidate is chosen)."""
        v = self.values()
        if not v["chosen"]:
            return scenario
        return scenario_with_decision(scenario, v["chosen"], v["rationale"], v["decided_by"], v["attendees"],
                                      v["date"] or self._today())

    # ------------------------------------------------------------ updates
    def set_candidates(self, names: Sequence[str]) -> None:
        """Offer these candidates; a chosen one that is gone is dropped with a message."""
        names = [str(n) for n in names]
        old = self.chosen.value
        self._silent = True
        try:
            self.chosen.options = [NOT_DECIDED, *names]
            self.chosen.value = old if old in names else NOT_DECIDED
        finally:
            self._silent = False
        if old not in (None, NOT_DECIDED) and old not in names:
            show_message(self.message, f"decision: {old!r} is no longer a candidate; choose again")

    def load(self, decision) -> None:
        """Fill the form from a scenario's decision (``None`` clears it); no change is signalled."""
        f = decision_fields(decision)
        names = list(self.chosen.options)
        self._silent = True
        try:
            self.chosen.value = f["chosen"] if f["chosen"] in names else NOT_DECIDED
            self.rationale.value = f["rationale"]
            self.decided_by.value = f["decided_by"]
            self.attendees.value = f["attendees"]
        finally:
            self._silent = False
        self._date = f["date"]
        self._show_date()
        if f["chosen"] and f["chosen"] not in names:
            show_message(self.message, f"decision: the file chose {f['chosen']!r}, which is not among the "
                                       "candidates; choose again")
        else:
            show_message(self.message, "")

    def _changed(self, change) -> None:
        if self._silent:
            return
        self._date = self._today()
        self._show_date()
        show_message(self.message, "")
        if self._on_change is not None:
            try:
                self._on_change()
            except ValueError as exc:
                show_message(self.message, str(exc))
            except Exception as exc:  # never a traceback into the notebook
                LOG.exception("decision change failed")
                show_message(self.message, f"Could not apply the decision ({type(exc).__name__}: {exc}).")

    def _show_date(self) -> None:
        when = self._date or "set when the decision is made"
        self.date.value = (f'<div class="hw-hint">Date: <b>{html.escape(when)}</b> (filled in automatically; '
                           "Save writes the decision into the scenario file, and the report shows it)</div>")


class CompareBox:
    """A file name, a "Compare" button and the table of what changed since that file.

    Parameters
    ----------
    current : callable
        Returns the :class:`~workbench.scenario.Scenario` shown now.
    tolerance : float
        Relative tolerance for the results [-] (0.01 = 1 %).
    """

    def __init__(self, current: Callable, tolerance: float = 0.01):
        self._current = current
        self.tolerance = tolerance
        self.diff = None
        lay = widgets.Layout
        self.path = widgets.Text(description="Compare with…", placeholder="e.g. last_review.toml",
                                 style={"description_width": "110px"}, layout=lay(width="420px"))
        self.button = widgets.Button(description="Compare", icon="exchange", layout=lay(width="110px"))
        self.message = widgets.HTML("")
        self.table = widgets.HTML("")
        for w, css in ((self.path, "hw-compare-path"), (self.button, "hw-compare-button"),
                       (self.message, "hw-compare-message"), (self.table, "hw-compare-table")):
            w.add_class(css)
        self.button.on_click(lambda _: self._guard(self.compare))
        self.box = widgets.VBox([widgets.HBox([self.path, self.button]), self.message, self.table])
        self.box.add_class("hw-compare")

    def _guard(self, fn) -> None:
        try:
            fn()
        except (ValueError, OSError) as exc:  # ScenarioError is a ValueError
            self.table.value = ""
            show_message(self.message, str(exc))
        except Exception as exc:
            LOG.exception("compare failed")
            self.table.value = ""
            show_message(self.message, f"Could not compare ({type(exc).__name__}: {exc}).")

    def compare(self, path: str | None = None):
        """Compare the scenario file ``path`` (default: the field) with the one shown now."""
        from workbench.review import diff_scenarios
        from workbench.scenario import load_scenario

        name = (self.path.value if path is None else str(path)).strip()
        if not name:
            raise ValueError("compare with: enter the name of an earlier scenario file (.toml)")
        try:
            old = load_scenario(name)
        except FileNotFoundError:
            raise ValueError(f"compare with: {name}: no such file") from None
        except IsADirectoryError:
            raise ValueError(f"compare with: {name} is a folder, not a scenario file") from None
        d = diff_scenarios(old, self._current(), self.tolerance, old_label=name, new_label="shown now")
        self.diff = d
        frame = d.to_frame()
        if d.same:
            self.table.value = ""
            show_message(self.message, f"No differences between {name} and the scenario shown now.", ok=True)
        else:
            self.table.value = ('<div class="hw-grid">'
                                + frame.to_html(index=False, escape=True, border=0) + "</div>")
            kept = "" if d.decision_changed else f"; decision unchanged ({d.decision or 'none'})"
            show_message(self.message, f"{len(frame)} differences since {name}{kept}.", ok=True)
        return d
