"""Text inputs that take a number with a unit, with an inline message.

Every field parses through :func:`workbench.units.parse`; a bad entry shows the
:class:`~workbench.units.UnitError` text (which names the field and the
expected unit) beside the field and keeps the last good value.
"""

from __future__ import annotations

import logging
from collections.abc import Callable

import ipywidgets as widgets

from workbench import units

__all__ = ["UnitField", "input_field", "show_message", "LOG"]

LOG = logging.getLogger("workbench.widgets")


def show_message(target: widgets.HTML, text: str, ok: bool = False) -> None:
    """Write a short message (escaped) into an HTML widget; empty text clears it."""
    if not text:
        target.value = ""
        return
    cls = "hw-ok" if ok else "hw-msg"
    target.value = f'<div class="{cls}">{_escape(text).replace(chr(10), "<br>")}</div>'


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


class UnitField:
    """One quantity typed as text with a unit (``"25 mm"``, ``"1 in"``, ``"77 °F"``).

    Parameters
    ----------
    label : str
        Text shown before the field.
    kind : str
        Quantity kind of :mod:`workbench.units` (``"thickness"``, ``"temperature"``, ...).
    field : str
        Name used in messages (``"max thickness"``).
    value_si : float
        Initial value in the kind's SI unit [m, K, W/m², ...].
    on_change : callable
        Called with the new SI value; it may raise ``ValueError`` (e.g. the study
        rejects the value), which is shown beside the field like a unit error.
    system : {"SI", "US"}
        Display system of the text written back into the field.
    unit : str, optional
        Show the value in this unit in both systems (e.g. ``"min"`` for a
        contact time) instead of the kind's display unit.
    currency : str, optional
        Currency code for cost kinds.

    Notes
    -----
    A bare number is read in the unit currently displayed for the field.
    ``unit`` may be a callable of the SI value that picks the unit to show
    (e.g. seconds for a tap, minutes for a session).
    """

    def __init__(
        self,
        label: str,
        kind: str,
        field: str,
        value_si: float,
        on_change: Callable[[float], None],
        system: str = "SI",
        css: str = "",
        unit: str | None = None,
    ):
        self.unit = unit
        self.kind = kind
        self.field = field
        self.value_si = float(value_si)
        self.system = system
        self._on_change = on_change
        self._silent = False
        self.text = widgets.Text(
            description=label,
            continuous_update=False,
            style={"description_width": "118px"},
            layout=widgets.Layout(width="300px"),
        )
        self.message = widgets.HTML("", layout=widgets.Layout(margin="0 0 0 122px"))
        self.box = widgets.VBox([self.text, self.message], layout=widgets.Layout(margin="0"))
        if css:
            self.text.add_class(css)
            self.message.add_class(css + "-msg")
            self.box.add_class(css + "-box")
        self.message.add_class("hw-field-msg")
        self._write(self.value_si)
        self.text.observe(self._changed, "value")

    @property
    def error(self) -> str:
        """The message currently shown (empty when the last entry was good)."""
        return self._error

    _error = ""
    _shown_unit: str | None = None

    def _write(self, value_si: float) -> None:
        self._silent = True
        try:
            unit = self.unit(value_si) if callable(self.unit) else self.unit
            self._shown_unit = unit
            if unit is None:
                self.text.value = units.format_quantity(value_si, self.kind, self.system, sig=4)
            else:
                self.text.value = f"{float(units.from_si(value_si, self.kind, self.system, unit=unit)):.4g} {unit}"
        finally:
            self._silent = False

    def set_value(self, value_si: float, notify: bool = False) -> None:
        """Set the SI value programmatically (text rewritten in the display system)."""
        self.value_si = float(value_si)
        self._write(self.value_si)
        self._set_error("")
        if notify:
            self._on_change(self.value_si)

    def set_system(self, system: str) -> None:
        """Rewrite the text in ``system``'s display unit (the SI value is unchanged)."""
        self.system = system
        self._write(self.value_si)
        self._set_error("")

    def _set_error(self, text: str) -> None:
        self._error = text
        show_message(self.message, text)

    def _changed(self, change) -> None:
        if self._silent:
            return
        default = self._shown_unit or units.KINDS[self.kind].display[self.system][0]
        try:
            value = units.parse(change["new"], self.kind, self.field, default_unit=default)
            self._on_change(value)
        except ValueError as exc:  # UnitError is a ValueError; so are the study's checks
            LOG.info("input %s rejected: %s", self.field, exc)
            self._set_error(str(exc) if str(exc).startswith(self.field) else f"{self.field}: {exc}")
            return
        except Exception as exc:  # never let a traceback reach the user
            LOG.exception("input %s failed", self.field)
            self._set_error(f"{self.field}: could not apply this value ({type(exc).__name__}: {exc})")
            return
        self.value_si = value
        self._set_error("")


def input_field(
    kind_name: str,
    input_name: str,
    label: str,
    field: str,
    value_si: float,
    on_change: Callable[[float], None],
    system: str = "SI",
    css: str = "",
    *,
    quantity: str | None = None,
    cls: type[UnitField] = UnitField,
    **extra,
) -> UnitField:
    """A field for one scenario-file input of a study kind, described by the kind's declaration.

    The quantity kind (which units the field accepts) and the meaning (shown when the
    pointer rests on the field, with the scenario-file key it saves to) come from the
    kind's :class:`~workbench.studykind.InputSpec`; the panel gives only its short label,
    the name used in messages and where it goes. ``quantity`` overrides the quantity kind
    where the declaration allows several (a heat budget: flux, power or U-value).

    Raises
    ------
    ValueError
        The kind declares no such input, or its quantity kind differs from ``quantity``'s
        family (a panel and its declaration that disagree are a programming error, caught
        when the panel is built, never shown as a wrong number).
    """
    from workbench.scenario import study_kind

    spec = study_kind(kind_name).input_spec(input_name)
    qkind = quantity or spec.kind
    if qkind not in units.KINDS:
        raise ValueError(f"{kind_name}.{input_name}: quantity kind {qkind!r} is not a unit kind; pass quantity=")
    if quantity is not None and spec.kind in units.KINDS and spec.kind != quantity:
        raise ValueError(f"{kind_name}.{input_name}: declared as {spec.kind!r}, the panel asks {quantity!r}")
    f = cls(label, qkind, field, value_si, on_change, system, css, **extra)
    f.text.tooltip = f"{spec.doc} (scenario file: inputs.{spec.name})"
    f.input_name = spec.name
    return f
