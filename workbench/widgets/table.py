"""The results table: one row per candidate at its design point, sortable.

An HTML table (units in the headers, three significant figures) with a sort
dropdown; the rank column follows the chosen sort. The chosen candidate's row
carries the same accent as in the charts.
"""

from __future__ import annotations

import html

import ipywidgets as widgets
import numpy as np
import pandas as pd

from workbench import units
from workbench.widgets.charts import _affine, _num

__all__ = ["ResultsTable", "SORT_KEYS"]

#: Sort options: label -> column of the table frame.
SORT_KEYS = {
    "Required thickness": "sized_thickness",
    "Heat flux at current thickness": "flux_now",
    "Mass per area": "mass_per_area",
    "Cost per area": "cost_per_area",
    "Inner surface temperature": "t_surface_inside",
    "Name": "label",
}

#: Rows shown at most (the rest are one sort away).
MAX_ROWS = 40

# column, header, unit kind (None: text), css class
_COLUMNS = (
    ("label", "Candidate", None, "hw-l"),
    ("sized_thickness", "Required thickness", "thickness", ""),
    ("within_max_thickness", "≤ max thickness", "flag", ""),
    ("flux_now", "Heat flux at current thickness", "heat_flux", ""),
    ("mass_per_area", "Mass per area", "mass_per_area", ""),
    ("cost_per_area", "Cost per area (demo)", "cost_per_area", ""),
    ("conductivity", "Effective conductivity", "conductivity", ""),
    ("t_surface_inside", "Inner surface", "temperature", ""),
    ("t_surface_outside", "Outer surface", "temperature", ""),
    ("within_service_limits", "Service limits", "flag", ""),
    ("conductivity_source", "Conductivity source", "source", "hw-l hw-src"),
)


class ResultsTable:
    """Sortable HTML results table."""

    def __init__(self):
        self.sort = widgets.Dropdown(options=list(SORT_KEYS), value="Required thickness", description="Sort by",
                                     style={"description_width": "56px"}, layout=widgets.Layout(width="300px"))
        self.descending = widgets.Checkbox(value=False, description="largest first", indent=False,
                                           layout=widgets.Layout(width="120px"))
        self.html = widgets.HTML("", layout=widgets.Layout(width="100%"))
        self.html.add_class("hw-table")
        self.sort.add_class("hw-sort")
        self.box = widgets.VBox([widgets.HBox([self.sort, self.descending]), self.html])
        self.frame: pd.DataFrame | None = None
        self.system = "SI"
        self.currency: str | None = None
        self.chosen: str | None = None
        self.sort.observe(lambda _: self.render(), "value")
        self.descending.observe(lambda _: self.render(), "value")

    def set_frame(self, frame: pd.DataFrame, system: str, currency: str | None, chosen: str) -> None:
        """Show ``frame`` (the study's results plus ``label`` and ``flux_now`` columns)."""
        self.frame, self.system, self.currency, self.chosen = frame, system, currency, chosen
        self.render()

    def ordered(self) -> pd.DataFrame:
        """The frame in the current sort order (NaN last)."""
        col = SORT_KEYS[self.sort.value]
        return self.frame.sort_values(col, ascending=not self.descending.value, na_position="last", kind="stable")

    def render(self) -> None:
        if self.frame is None:
            return
        rows = self.ordered()
        total = len(rows)
        rows = rows.iloc[:MAX_ROWS]
        head = ["<th>#</th>"]
        for _col, title, kind, cls in _COLUMNS:
            unit = ""
            if kind not in (None, "flag", "source"):
                unit = units.display_unit(kind, self.system, self.currency)
                unit = f" [{html.escape(unit)}]"
            head.append(f'<th class="{cls}">{html.escape(title)}{unit}</th>')
        body = []
        for rank, (name, row) in enumerate(rows.iterrows(), start=1):
            cells = [f"<td>{rank}</td>"]
            for col, _, kind, cls in _COLUMNS:
                cells.append(self._cell(row, col, kind, cls))
            chosen = ' class="hw-chosen"' if name == self.chosen else ""
            tip = html.escape(f"k: {row['conductivity_source']} | ρ: {row['density_source']}", quote=True)
            body.append(f'<tr{chosen} title="{tip}" data-candidate="{html.escape(str(name), quote=True)}">'
                        + "".join(cells) + "</tr>")
        more = (f'<div class="hw-hint">Showing the first {MAX_ROWS} of {total} candidates in this order; '
                "change the sort to see others.</div>") if total > MAX_ROWS else ""
        self.html.value = (
            f"<table><thead><tr>{''.join(head)}</tr></thead><tbody>{''.join(body)}</tbody></table>{more}"
        )

    def _cell(self, row, col, kind, cls) -> str:
        v = row[col]
        if kind is None:
            return f'<td class="{cls}">{html.escape(str(v))}</td>'
        if kind == "source":
            return f'<td class="{cls}">{html.escape(str(v))}</td>'
        if kind == "flag":
            if col == "within_service_limits" and not v:
                return f'<td class="hw-bad" title="{html.escape(str(row["service_problems"]), quote=True)}">✗ outside</td>'
            return '<td>✓</td>' if v else '<td class="hw-bad">✗</td>'
        if v is None or not np.isfinite(float(v)):
            return "<td>n/a</td>"
        a, b = _affine(kind, self.system)
        x = a * float(v) + b
        return f"<td>{f'{x:.1f}' if kind == 'temperature' else _num(x)}</td>"
