"""The workbench charts: figures created once, updated in place.

Each chart owns one :class:`plotly.graph_objects.Figure` and the
:class:`~workbench.widgets.plotview.PlotView` that shows it. Its traces are
laid out when the candidate set changes (:meth:`set_candidates`) and only
their data are replaced afterwards (:meth:`update`); :meth:`push` sends what
changed and the browser redraws with ``Plotly.react``, so a slider move never
rebuilds a figure.

All numbers come from a :class:`WallView`, computed from the study object by
:func:`compute_view`; the charts only convert units and draw.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np
import plotly.graph_objects as go

from workbench import units
from workbench.studies.wall import WallStudy
from workbench.widgets import style
from workbench.widgets.plotview import PlotView

__all__ = [
    "WallView",
    "compute_view",
    "wants_log",
    "FluxChart",
    "RequiredChart",
    "TradeoffChart",
    "ProfileChart",
    "CRITERIA",
    "EACH_TRACE_LIMIT",
    "shipper_trace_figure",
    "update_shipper_trace",
    "housing_warm_up_figure",
    "update_housing_warm_up",
]

#: Up to this many candidates the flux chart draws one coloured trace each
#: (with a legend); above it, one combined trace (fast for hundreds).
EACH_TRACE_LIMIT = 12
#: The required-thickness bar chart shows at most this many (the thinnest).
BAR_LIMIT = 20


def wants_log(values, decades: float = 1.3) -> bool:
    """True when the positive finite ``values`` span more than ``decades`` decades."""
    v = np.asarray(values, float)
    v = v[np.isfinite(v) & (v > 0)]
    if v.size < 2:
        return False
    return bool(np.log10(v.max() / v.min()) > decades)


@dataclass(frozen=True)
class WallView:
    """Everything the charts draw, in SI, from one study state.

    Attributes
    ----------
    grid : ndarray
        Thickness sweep points [m].
    flux : ndarray
        |heat flux| per candidate over ``grid``, shape (n, g) [W/m²].
    thickness : float
        Current sized thickness (slider) [m].
    flux_now : ndarray
        |heat flux| per candidate at ``thickness`` [W/m²].
    max_flux : float
        The budget as a flux at the current ΔT [W/m²].
    max_thickness : float or None
        Thickness limit [m].
    required : ndarray
        Sized thickness meeting the budget per candidate [m].
    mass : ndarray
        Mass per area at the required thickness [kg/m²].
    cost : ndarray
        Material cost per area at the required thickness [currency/m²].
    chosen : int
        Index of the highlighted candidate.
    profile_x, profile_t : ndarray
        Positions [m] and temperatures [K] through the chosen wall at ``thickness``.
    profile_where : list of str
        What each profile point is.
    layer_edges : ndarray
        Layer boundaries of the chosen wall [m].
    layer_names : list of str
        Material ids of its layers.
    """

    grid: np.ndarray
    flux: np.ndarray
    thickness: float
    flux_now: np.ndarray
    max_flux: float
    max_thickness: float | None
    required: np.ndarray
    mass: np.ndarray
    cost: np.ndarray
    chosen: int
    profile_x: np.ndarray
    profile_t: np.ndarray
    profile_where: list
    layer_edges: np.ndarray
    layer_names: list


def compute_view(study: WallStudy, grid: np.ndarray, chosen: int) -> WallView:
    """Evaluate the study once for all charts (vectorised calls only)."""
    flux = np.abs(study.flux(grid))
    flux_now = np.abs(study.flux(np.array([study.thickness])))[:, 0]
    max_flux = float(np.abs(study.max_flux()))
    required = study.design_thickness()
    prof = study.temperature_profile(study.names[chosen], sized_thickness=study.thickness)
    x = prof["position"].to_numpy()
    edges = np.unique(x)
    layer_names = [lay.material for lay in study.candidates[chosen].layers]
    return WallView(
        grid=grid,
        flux=flux,
        thickness=float(study.thickness),
        flux_now=flux_now,
        max_flux=max_flux,
        max_thickness=study.max_thickness,
        required=required,
        mass=study.design_mass_per_area(required),
        cost=study.design_cost_per_area(required),
        chosen=chosen,
        profile_x=x,
        profile_t=prof["temperature"].to_numpy(),
        profile_where=list(prof["where"]),
        layer_edges=edges,
        layer_names=layer_names,
    )


#: Trade-off criteria: key -> (title, unit kind, WallView attribute). All minimised.
CRITERIA = {
    "required": ("Required thickness", "thickness", "required"),
    "mass": ("Mass per area", "mass_per_area", "mass"),
    "cost": ("Cost per area (demo prices)", "cost_per_area", "cost"),
    "flux_now": ("Heat flux at current thickness", "heat_flux", "flux_now"),
}


def _base_layout(title: str, width: int, height: int, **extra) -> dict:
    layout = dict(
        title=dict(text=title, x=0.01, xanchor="left", font=dict(size=13)),
        width=width,
        height=height,
        margin=dict(l=62, r=14, t=34, b=46),
        template="plotly_white",
        font=dict(size=11, family="system-ui, -apple-system, Segoe UI, Roboto, sans-serif"),
        hoverlabel=dict(font_size=11),
        showlegend=False,
    )
    layout.update(extra)
    return layout


@functools.lru_cache(maxsize=256)
def _affine(kind: str, system: str) -> tuple[float, float]:
    """Display = a * SI + b for ``kind`` in ``system`` (every unit here is affine)."""
    b = float(units.from_si(0.0, kind, system))
    a = float(units.from_si(1.0, kind, system)) - b
    return a, b


class _Chart:
    css = ""

    def __init__(self, layout: dict):
        self.fig = go.Figure(layout=layout)
        self.view = PlotView(self.fig)
        self.labels: list[str] = []
        self.sources: list[str] = []
        self.system = "SI"
        self.currency: str | None = None
        self._drawn: dict = {}  # what was last sent, to send only what changed

    def set_candidates(self, labels, sources, currency=None) -> None:
        self.labels = list(labels)
        self.sources = [style.short_source(s) for s in sources]
        self.currency = currency
        self._drawn = {}

    def push(self) -> bool:
        """Send the figure's changes to the browser (True if anything changed)."""
        return self.view.push()

    def _changed(self, name: str, key) -> bool:
        """True (and remember ``key``) when ``name`` must be redrawn."""
        old = self._drawn.get(name, _MISSING)
        if old is not _MISSING and _same(old, key):
            return False
        self._drawn[name] = key
        return True

    def _unit(self, kind: str) -> str:
        return units.display_unit(kind, self.system, self.currency)

    def _label(self, kind: str, name: str) -> str:
        return units.axis_label(kind, self.system, name=name, currency=self.currency)

    def _conv(self, values, kind: str):
        a, b = _affine(kind, self.system)
        return np.asarray(values, float) * a + b


_MISSING = object()


def _same(a, b) -> bool:
    try:
        if isinstance(a, np.ndarray) or isinstance(b, np.ndarray):
            return np.array_equal(a, b)
        return bool(a == b)
    except (TypeError, ValueError):
        return False


class FluxChart(_Chart):
    """Heat flux against sized thickness, per candidate, with the budget and current thickness."""

    def __init__(self, width: int = 450, height: int = 330):
        super().__init__(
            _base_layout(
                "Heat flux through the wall vs thickness",
                width,
                height,
                yaxis=dict(type="log", title=dict(text="Heat flux [W/m²]"), gridcolor=style.GRID),
                xaxis=dict(title=dict(text="Thickness [mm]"), gridcolor=style.GRID),
                legend=dict(font=dict(size=10), x=1, xanchor="right", y=1, bgcolor="rgba(255,255,255,0.75)"),
                shapes=[dict(type="line", xref="x", yref="paper", x0=0, x1=0, y0=0, y1=1,
                             line=dict(color="#495057", width=1, dash="dot"))],
            )
        )
        self.each = True
        self._n_lines = 0

    def set_candidates(self, labels, sources, currency=None) -> None:
        super().set_candidates(labels, sources, currency)
        n = len(self.labels)
        self.each = n <= EACH_TRACE_LIMIT
        traces = []
        if self.each:
            for i, lab in enumerate(self.labels):
                traces.append(go.Scatter(name=lab, mode="lines", opacity=0.8,
                                         line=dict(width=1.8, color=style.candidate_colour(i))))
        else:
            traces.append(go.Scatter(name=f"{n} candidates", mode="lines",
                                     line=dict(width=1, color=style.CROWD), opacity=0.45))
        traces.append(go.Scatter(name="chosen", mode="lines", line=dict(width=4, color=style.ACCENT),
                                 showlegend=False))
        traces.append(go.Scatter(name="heat budget", mode="lines",
                                 line=dict(width=2, dash="dash", color=style.BUDGET)))
        traces.append(go.Scatter(name="at current thickness", mode="markers", showlegend=False,
                                 marker=dict(size=7, color="#212529", symbol="line-ew-open", line=dict(width=2)),
                                 text=self.labels))
        with self.fig.batch_update():
            self.fig.data = ()
        self.fig.add_traces(traces)
        self._n_lines = n if self.each else 1
        # no legend box over the curves: colours match the bar chart, the chosen one is orange
        self.fig.layout.showlegend = False

    def _traces(self):
        d = self.fig.data
        k = self._n_lines
        return d[:k], d[k], d[k + 1], d[k + 2]

    def update(self, view: WallView, system: str) -> None:
        self.system = system
        lines, high, budget, now = self._traces()
        x = self._conv(view.grid, "thickness")
        y = self._conv(view.flux, "heat_flux")
        c = view.chosen
        x_now = float(self._conv(view.thickness, "thickness"))
        with self.fig.batch_update():
            if self._changed("system", system):
                ul, uq = self._unit("thickness"), self._unit("heat_flux")
                body = f"L = %{{x:.3g}} {ul}<br>q = %{{y:.3g}} {uq}"
                if self.each:
                    for i, tr in enumerate(lines):
                        tr.hovertemplate = (f"<b>{self.labels[i]}</b><br>{body}<br>k source: {self.sources[i]}"
                                            "<extra></extra>")
                else:
                    lines[0].hovertemplate = f"%{{text}}<br>{body}<extra></extra>"
                budget.hovertemplate = f"heat budget<br>q = %{{y:.3g}} {uq}<extra></extra>"
                now.hovertemplate = f"%{{text}}<br>at L = %{{x:.3g}} {ul}<br>q = %{{y:.3g}} {uq}<extra></extra>"
                high.hovertemplate = f"<b>chosen: %{{text}}</b><br>{body}<extra></extra>"
                lay = self.fig.layout
                lay.xaxis.title.text = self._label("thickness", "Thickness of the sized layer")
                lay.yaxis.title.text = self._label("heat_flux", "Heat flux, air to air")
            grid_new = self._changed("grid", (system, view.grid[0], view.grid[-1], view.grid.size))
            n, g = y.shape
            if self.each:
                for i, tr in enumerate(lines):
                    if grid_new:
                        tr.x = x
                    tr.y = y[i]
            else:
                tr = lines[0]
                if grid_new:
                    tr.x = np.tile(np.append(x, np.nan), n)
                tr.y = np.hstack([y, np.full((n, 1), np.nan)]).ravel()
                if self._changed("text", g):
                    tr.text = np.repeat([f"<b>{lab}</b><br>k source: {src}" for lab, src in
                                         zip(self.labels, self.sources, strict=True)], g + 1)
            if grid_new:
                high.x = x
                budget.x = [x[0], x[-1]]
            high.y = y[c]
            if self._changed("chosen", c):
                high.text = [self.labels[c]] * g
                high.name = f"chosen: {self.labels[c]}"
            budget.y = [float(self._conv(view.max_flux, "heat_flux"))] * 2
            now.x = np.full(n, x_now)
            now.y = self._conv(view.flux_now, "heat_flux")
            self.fig.layout.shapes[0].x0 = x_now
            self.fig.layout.shapes[0].x1 = x_now
            self.fig.layout.title.text = (
                f"Heat flux vs thickness — current {units.format_quantity(view.thickness, 'thickness', system)}"
            )


class RequiredChart(_Chart):
    """Required sized thickness per candidate (sorted bars) with the thickness limit."""

    def __init__(self, width: int = 450, height: int = 330):
        super().__init__(
            _base_layout(
                "Thickness needed to meet the heat budget",
                width,
                height,
                margin=dict(l=150, r=14, t=34, b=46),
                xaxis=dict(title=dict(text="Required thickness [mm]"), gridcolor=style.GRID),
                yaxis=dict(autorange="reversed", tickfont=dict(size=10), automargin=False),
                bargap=0.25,
                shapes=[dict(type="line", xref="x", yref="paper", x0=0, x1=0, y0=0, y1=1, visible=False,
                             line=dict(color=style.BUDGET, width=2, dash="dash"))],
                annotations=[dict(x=0, xref="x", y=1.0, yref="paper", yanchor="bottom", text="", showarrow=False,
                                  visible=False, font=dict(size=10, color=style.BUDGET))],
            )
        )
        self.fig.add_trace(go.Bar(orientation="h", name="required thickness", textposition="outside",
                                  cliponaxis=False, textfont=dict(size=10),
                                  marker=dict(line=dict(color=style.ACCENT_EDGE))))

    def update(self, view: WallView, system: str) -> None:
        self.system = system
        req = np.asarray(view.required, float)
        order = np.argsort(np.where(np.isfinite(req), req, np.inf), kind="stable")
        shown = order[:BAR_LIMIT]
        if view.chosen not in shown:  # keep the chosen candidate visible
            shown = np.append(shown[:-1], view.chosen)
        x = self._conv(req[shown], "thickness")
        log = wants_log(x)
        floor = float(np.nanmin(x[x > 0]) / 3) if log and np.any(x > 0) else 0.0
        ul = self._unit("thickness")
        bar = self.fig.data[0]
        lay = self.fig.layout
        with self.fig.batch_update():
            bar.x = np.where(x > 0, x, floor)
            bar.text = [("films suffice" if v <= 0 else _num(v)) for v in x]
            if self._changed("order", (tuple(shown), view.chosen)):
                bar.y = [self.labels[i] for i in shown]
                bar.marker.color = [style.ACCENT if i == view.chosen else style.candidate_colour(int(i)) for i in shown]
                bar.marker.line.width = [2.5 if i == view.chosen else 0 for i in shown]
                bar.customdata = [self.sources[i] for i in shown]
                more = len(req) - len(shown)
                lay.title.text = ("Thickness needed to meet the heat budget"
                                  + (f" — {len(shown)} thinnest of {len(req)}" if more > 0 else ""))
            if self._changed("axis", (system, log)):
                bar.hovertemplate = (f"<b>%{{y}}</b><br>required L = %{{x:.3g}} {ul}<br>"
                                     "k source: %{customdata}<extra></extra>")
                lay.xaxis.type = "log" if log else "linear"
                lay.xaxis.title.text = self._label(
                    "thickness", "Required thickness (log scale)" if log else "Required thickness")
            shape, note = lay.shapes[0], lay.annotations[0]
            if view.max_thickness is not None:
                xm = float(self._conv(view.max_thickness, "thickness"))
                shape.x0, shape.x1, shape.visible = xm, xm, True
                note.x = float(np.log10(xm)) if log else xm
                note.text, note.visible = f"max {_num(xm)} {ul}", True
            else:
                shape.visible = note.visible = False


class TradeoffChart(_Chart):
    """Two chosen criteria against each other, non-dominated candidates marked, a third as colour."""

    def __init__(self, width: int = 450, height: int = 330):
        super().__init__(
            _base_layout(
                "Trade-off at equal heat flux",
                width,
                height,
                xaxis=dict(gridcolor=style.GRID),
                yaxis=dict(gridcolor=style.GRID),
            )
        )
        self.fig.add_traces([
            go.Scatter(name="non-dominated front", mode="lines", hoverinfo="skip",
                       line=dict(color="#868e96", width=1.5, dash="dot")),
            go.Scatter(name="candidates", mode="markers",
                       marker=dict(size=11, line=dict(width=1, color="#343a40"),
                                   colorscale=[[0, "#e3fafc"], [0.5, "#3bc9db"], [1, "#0b7285"]],
                                   showscale=True,
                                   colorbar=dict(thickness=10, len=0.85, title=dict(side="right", font=dict(size=10)),
                                                 tickfont=dict(size=9)))),
            go.Scatter(name="chosen", mode="markers", hoverinfo="skip",
                       marker=dict(size=19, symbol="circle-open", color=style.ACCENT, line=dict(width=3.5))),
        ])
        self.x_key, self.y_key, self.c_key = "required", "mass", "cost"

    def update(self, view: WallView, system: str, front=None) -> None:
        """Redraw; ``front`` is the non-dominated mask (None if unavailable)."""
        self.system = system
        tx, kx, ax = CRITERIA[self.x_key]
        ty, ky, ay = CRITERIA[self.y_key]
        tc, kc, ac = CRITERIA[self.c_key]
        x = self._conv(getattr(view, ax), kx)
        y = self._conv(getattr(view, ay), ky)
        c = self._conv(getattr(view, ac), kc)
        mask = np.zeros(len(x), bool) if front is None else np.asarray(front, bool)
        front_tr, pts, high = self.fig.data
        on = np.flatnonzero(mask)
        on = on[np.argsort(x[on])]
        i = view.chosen
        lay = self.fig.layout
        with self.fig.batch_update():
            pts.x, pts.y = x, y
            pts.marker.color = c
            if self._changed("mask", mask):
                pts.marker.symbol = np.where(mask, "diamond", "circle")
                pts.marker.size = np.where(mask, 13, 10)
                pts.customdata = np.column_stack([self.labels, self.sources,
                                                  np.where(mask, "non-dominated", "dominated")])
            if self._changed("labels", (system, self.x_key, self.y_key, self.c_key, front is None)):
                ux, uy, uc = self._unit(kx), self._unit(ky), self._unit(kc)
                pts.marker.colorbar.title.text = f"{tc.split(' (')[0]} [{uc}]"
                pts.hovertemplate = (
                    f"<b>%{{customdata[0]}}</b> (%{{customdata[2]}})<br>{tx}: %{{x:.3g}} {ux}<br>"
                    f"{ty}: %{{y:.3g}} {uy}<br>{tc}: %{{marker.color:.3g}} {uc}<br>"
                    "k source: %{customdata[1]}<extra></extra>"
                )
                lay.xaxis.title.text = f"{tx} [{ux}]"
                lay.yaxis.title.text = f"{ty} [{uy}]"
                lay.title.text = ("Trade-off at equal heat flux — ◆ non-dominated"
                                  + ("" if front is not None else " (front n/a)"))
            front_tr.x, front_tr.y = x[on], y[on]
            high.x, high.y = [x[i]], [y[i]]
            log_x, log_y = wants_log(x), wants_log(y)
            if self._changed("log", (log_x, log_y)):
                lay.xaxis.type = "log" if log_x else "linear"
                lay.yaxis.type = "log" if log_y else "linear"


class ProfileChart(_Chart):
    """Temperature through the chosen wall at the current thickness, air to air."""

    _SHADES = ("#f1f3f5", "#e7f5ff", "#fff4e6", "#ebfbee")

    def __init__(self, width: int = 450, height: int = 330):
        super().__init__(
            _base_layout(
                "Temperature through the chosen wall",
                width,
                height,
                xaxis=dict(gridcolor=style.GRID, zeroline=False),
                yaxis=dict(gridcolor=style.GRID),
            )
        )
        self.fig.add_trace(go.Scatter(name="temperature", mode="lines+markers",
                                      line=dict(color=style.ACCENT, width=3),
                                      marker=dict(size=7, color=style.ACCENT,
                                                  line=dict(width=1, color=style.ACCENT_EDGE))))

    def update(self, view: WallView, system: str, label: str) -> None:
        self.system = system
        # Air temperatures are drawn a little outside the wall faces so that the
        # surface film drop shows; the hover names each point.
        x_si = view.profile_x.copy()
        total = float(x_si.max()) or 1e-3
        x_si[0] = -0.12 * total
        x_si[-1] = 1.12 * total
        x = self._conv(x_si, "length")
        t = self._conv(view.profile_t, "temperature")
        edges = self._conv(view.layer_edges, "length")
        tr = self.fig.data[0]
        lay = self.fig.layout
        spans = list(zip(edges[:-1], edges[1:], strict=True))
        if len(lay.shapes) != len(spans):
            lay.shapes = [dict(type="rect", xref="x", yref="paper", y0=0, y1=1, layer="below",
                               x0=float(a), x1=float(b), fillcolor=self._SHADES[j % 4], line=dict(width=0))
                          for j, (a, b) in enumerate(spans)]
            lay.annotations = [
                dict(x=float((a + b) / 2), xref="x", y=0.02, yref="paper", text="", showarrow=False,
                     font=dict(size=10, color="#495057")) for a, b in spans
            ] + [dict(xref="x", yref="y", text=name, showarrow=False, yshift=12,
                      font=dict(size=9, color="#868e96")) for name in ("inside air", "outside air")]
        with self.fig.batch_update():
            tr.x, tr.y = x, t
            if self._changed("text", (system, tuple(view.profile_where))):
                ux, ut = self._unit("length"), self._unit("temperature")
                tr.text = view.profile_where
                tr.hovertemplate = f"%{{text}}<br>T = %{{y:.1f}} {ut}<br>x = %{{x:.3g}} {ux}<extra></extra>"
                lay.xaxis.title.text = units.axis_label("length", system, name="Position from the inside face")
                lay.yaxis.title.text = units.axis_label("temperature", system, name="Temperature")
            lay.title.text = (f"Temperature through {label} at "
                              f"{units.format_quantity(view.thickness, 'thickness', system)}")
            for j, (a, b) in enumerate(spans):
                lay.shapes[j].x0, lay.shapes[j].x1 = float(a), float(b)
                lay.annotations[j].x = float((a + b) / 2)
                lay.annotations[j].text = view.layer_names[j] if j < len(view.layer_names) else ""
            inside, outside = lay.annotations[-2], lay.annotations[-1]
            inside.x, inside.y = float(x[0]), float(t[0])
            outside.x, outside.y = float(x[-1]), float(t[-1])


def _num(v: float, sig: int = 3) -> str:
    """Engineering rounding of a display number: ``sig`` significant figures, no trailing zeros."""
    v = float(v)
    if not np.isfinite(v):
        return "n/a"
    if v == 0.0:
        return "0"
    exponent = int(np.floor(np.log10(abs(v))))
    if not -4 <= exponent < 6:
        return f"{v:.{sig - 1}e}"
    decimals = max(sig - 1 - exponent, 0)
    text = f"{round(v, sig - 1 - exponent):.{decimals}f}"
    return text.rstrip("0").rstrip(".") if "." in text else text


# ---------------------------------------------------------------------------
# Shipper: temperature trace of a trip
# ---------------------------------------------------------------------------
def shipper_trace_figure(trace, system: str = "SI", title: str | None = None, chosen=None) -> go.Figure:
    """Trace chart of :meth:`workbench.studies.shipper.ShipperStudy.trace` (a ``go.Figure``).

    Payload, coolant and ambient temperature against time [h], the allowed
    band, the target, the end of each hold by reason and the moment the
    coolant runs out; hover shows time [h] and temperature [°C] or [°F].
    The cautions (medicines, dry ice, freezing, and "a calculated trace does
    not qualify a shipper") are printed under the plot. The figure itself is
    built by :func:`workbench.studies.shipper.trace_figure` (no widgets), so
    the report draws the same chart.
    """
    from workbench.studies.shipper import trace_figure

    return trace_figure(trace, system=system, title=title, chosen=chosen)


def update_shipper_trace(fig: go.Figure, trace, system: str = "SI", title: str | None = None,
                         chosen=None) -> go.Figure:
    """Replace the traces and layout of an existing trace ``fig`` in one batch (for a PlotView)."""
    new = shipper_trace_figure(trace, system=system, title=title, chosen=chosen)
    with fig.batch_update():
        fig.data = ()
        fig.add_traces(list(new.data))
        fig.layout = new.layout
    return fig


# ---------------------------------------------------------------------------
# Housing: warm-up over a use session
# ---------------------------------------------------------------------------
def housing_warm_up_figure(frame, system: str = "SI", title: str | None = None, chosen=None,
                           colours=None) -> go.Figure:
    """Warm-up chart of :meth:`workbench.studies.housing.HousingStudy.warm_up_frame` (a ``go.Figure``).

    Mean surface temperature of each candidate over the use session [min],
    the touch limit of each class for the chosen contact time, and a marker
    where a candidate reaches its limit; hover shows time and temperature
    with units; the touch caution is printed under the plot. The figure is
    built by :func:`workbench.studies.housing.warm_up_figure` (no widgets),
    so the report draws the same chart. ``colours`` default to the
    candidate colours of the other workbench charts.
    """
    from workbench.studies.housing import warm_up_figure

    if colours is None:
        n = len(dict.fromkeys(frame["candidate"]))
        colours = [style.candidate_colour(i) for i in range(n)]
    return warm_up_figure(frame, system=system, title=title, chosen=chosen, colours=colours)


def update_housing_warm_up(fig: go.Figure, frame, system: str = "SI", title: str | None = None,
                           chosen=None, colours=None, width: int | None = None,
                           height: int | None = None) -> go.Figure:
    """Bring an existing warm-up ``fig`` up to date in one batch (for a PlotView).

    When the traces are the same kind and number as before (same candidates and touch
    classes), only their data, names and hover texts change, in place; otherwise the
    figure is rebuilt. ``width`` and ``height`` [px] keep the panel's size.
    """
    from workbench.studies.housing import warm_up_traces

    traces, layout = warm_up_traces(frame, system=system, title=title, chosen=chosen, colours=colours)
    same = len(fig.data) == len(traces) and all(
        old.name == new["name"] for old, new in zip(fig.data[: len(traces) - 1], traces[:-1], strict=False)
        if not str(new["name"]).startswith("touch limit")
    )
    with fig.batch_update():
        if same:
            for old, new in zip(fig.data, traces, strict=True):
                old.update({k: v for k, v in new.items() if k in ("x", "y", "name", "hovertemplate", "text")})
            fig.layout.title.text = layout["title"]["text"]
            fig.layout.xaxis.title.text = layout["xaxis"]["title"]["text"]
            fig.layout.yaxis.title.text = layout["yaxis"]["title"]["text"]
        else:
            new_fig = housing_warm_up_figure(frame, system=system, title=title, chosen=chosen,
                                             colours=colours)
            fig.data = ()
            fig.add_traces(list(new_fig.data))
            fig.layout = new_fig.layout
        if width is not None:
            fig.layout.width = width
        if height is not None:
            fig.layout.height = height
    return fig
