"""Pieces shared by the workbench and the job panels: headings, tables, the panel frame.

Display only: numbers arrive in SI from the study objects and leave in the
display unit of the chosen system.
"""

from __future__ import annotations

import html

import ipywidgets as widgets
import numpy as np

from workbench import units
from workbench.widgets import style
from workbench.widgets.charts import _affine, _num
from workbench.widgets.fields import LOG, show_message

__all__ = ["section", "header_html", "cautions_html", "conv", "cell", "header_cell", "flag_cell",
           "guard", "panel_children", "DEMO_BADGE"]

DEMO_BADGE = "DEMO — invented numbers"


def section(text: str) -> widgets.HTML:
    return widgets.HTML(f'<div class="hw-section">{html.escape(text)}</div>')


def header_html(title: str, demo: bool, subtitle: str) -> str:
    badge = f'<span class="hw-badge">{DEMO_BADGE}</span>' if demo else ""
    return (f'{style.CSS}<div class="hw-title">{html.escape(title)}{badge}</div>'
            f'<div class="hw-subtitle">{html.escape(subtitle)}</div>')


def cautions_html(fixed, extra=()) -> str:
    items = list(dict.fromkeys([*fixed, *extra]))
    body = "".join(f"<li>{html.escape(str(c))}</li>" for c in items)
    return f'<div class="hw-cautions"><b>Cautions:</b><ul style="margin:2px 0 2px 18px;padding:0">{body}</ul></div>'


def conv(values, kind: str, system: str) -> np.ndarray:
    """SI → display unit of ``system`` (affine, vectorised)."""
    a, b = _affine(kind, system)
    return np.asarray(values, float) * a + b


def cell(value, kind: str | None, system: str, currency: str | None = None) -> str:
    """One table cell: 3 significant figures in the display unit (temperatures with 1 decimal)."""
    if kind is None:
        return f'<td class="hw-l">{html.escape(str(value))}</td>'
    try:
        v = float(value)
    except (TypeError, ValueError):
        return "<td>n/a</td>"
    if not np.isfinite(v):
        return "<td>n/a</td>"
    if kind == "currency":
        return f"<td>{_num(v)}</td>"
    x = float(conv(v, kind, system))
    return f"<td>{f'{x:.1f}' if kind == 'temperature' else _num(x)}</td>"


def header_cell(title: str, kind: str | None, system: str, currency: str | None = None) -> str:
    if kind is None:
        return f'<th class="hw-l">{html.escape(title)}</th>'
    if kind == "flag":
        return f"<th>{html.escape(title)}</th>"
    unit = (currency or "¤") if kind == "currency" else units.display_unit(kind, system, currency)
    return f"<th>{html.escape(title)} [{html.escape(unit or '–')}]</th>"


def flag_cell(ok: bool, yes: str = "✓ yes", no: str = "✗ no") -> str:
    return f"<td>{yes}</td>" if ok else f'<td class="hw-bad">{no}</td>'


def guard(status: widgets.HTML, fn, *args):
    """Run an event handler; show any problem in ``status``, never raise into the notebook."""
    try:
        return fn(*args)
    except ValueError as exc:
        show_message(status, str(exc))
    except Exception as exc:
        LOG.exception("panel event failed")
        show_message(status, f"Something went wrong ({type(exc).__name__}: {exc}); the last good result is shown.")
    return None


def panel_children(header, toggle, cautions, status, inputs: list, input_css: str, figures: list,
                   table_title: str, table) -> list:
    """The common frame of a panel: title and SI/US switch, cautions, status line,
    inputs on the left beside the charts, then the results table."""
    w = widgets.Layout
    left = widgets.VBox(inputs, layout=w(width="350px", min_width="350px", margin="0 12px 0 0"))
    left.add_class("hw-panel")
    left.add_class(input_css)
    # beside the inputs while 430 px are left; the charts wrap among themselves
    charts = widgets.HBox(figures, layout=w(flex_flow="row wrap", flex="1 1 430px", min_width="430px"))
    return [
        widgets.HBox([header, toggle], layout=w(align_items="center")),
        cautions, status,
        widgets.HBox([left, charts], layout=w(flex_flow="row wrap", align_items="flex-start")),
        section(table_title), table,
    ]
