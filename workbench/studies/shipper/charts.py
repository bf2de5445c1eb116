"""Charts of the shipper study: cost, hold and trip trace figures, and its report charts.

plotly is imported lazily inside each function; nothing here holds physics.
"""

from __future__ import annotations

import textwrap

import numpy as np
import pandas as pd

from workbench import units
from workbench.studies._chart_parts import _currency, _focus
from workbench.studies.shipper.study import TRACE_CAUTION, ShipperResults

__all__ = ["charts", "cost_figure", "hold_figure", "trace_figure"]

def cost_figure(results: ShipperResults, currency: str = "EUR", highlight: str | None = None):
    """Landed cost against sized thickness per candidate, each minimum marked.

    Designs that miss the hold time are drawn hollow. Returns a plotly ``go.Figure``.
    """
    import plotly.graph_objects as go

    sw, opt = results.sweep, results.optimum
    fig = go.Figure()
    for name, grp in sw.groupby("candidate", sort=False):
        width = 4 if name == highlight else 2
        fig.add_trace(
            go.Scatter(
                x=grp["thickness"] * 1000,
                y=grp["landed_cost"],
                mode="lines+markers",
                name=name,
                line={"width": width},
                marker={
                    "symbol": np.where(grp["meets_target"], "circle", "circle-open").tolist(),
                    "size": 7,
                },
                customdata=np.stack(
                    [
                        grp["coolant_mass"],
                        grp["billable_mass"],
                        grp["hold_time_simulated"] / 3600,
                        grp["end_reason"],
                    ],
                    axis=-1,
                ),
                hovertemplate=(
                    "thickness %{x:.0f} mm<br>landed cost %{y:.2f} "
                    + currency
                    + "<br>coolant %{customdata[0]:.2f} kg<br>billable %{customdata[1]:.1f} kg"
                    + "<br>hold %{customdata[2]:.1f} h (%{customdata[3]})<extra>%{fullData.name}</extra>"
                ),
            )
        )
    ok = opt[opt["meets_target"].astype(bool)]
    fig.add_trace(
        go.Scatter(
            x=ok["thickness"] * 1000,
            y=ok["landed_cost"],
            mode="markers",
            name="cheapest that holds",
            marker={"symbol": "star", "size": 16, "color": "black"},
            hovertemplate="%{text}: %{x:.0f} mm, %{y:.2f} " + currency + "<extra></extra>",
            text=list(ok.index),
        )
    )
    fig.update_layout(
        xaxis_title="sized insulation thickness [mm]",
        yaxis_title=f"landed cost per shipment [{currency}]",
        legend_title="wall build-up",
        template="plotly_white",
    )
    return fig


def hold_figure(run: pd.DataFrame, t_payload_min=None, t_payload_max=None, title: str = ""):
    """Payload, coolant and ambient temperature [°C] and coolant left against time [h]."""
    import plotly.graph_objects as go
    from plotly.subplots import make_subplots

    hours = run["time"] / 3600
    fig = make_subplots(specs=[[{"secondary_y": True}]])
    for col, label, dash in (
        ("ambient", "ambient (demo profile)", "dot"),
        ("payload_temperature", "payload", "solid"),
        ("coolant_temperature", "coolant", "dash"),
    ):
        fig.add_trace(
            go.Scatter(
                x=hours,
                y=run[col] - 273.15,
                name=label,
                line={"dash": dash},
                hovertemplate="%{x:.1f} h: %{y:.1f} °C",
            ),
            secondary_y=False,
        )
    fig.add_trace(
        go.Scatter(
            x=hours,
            y=run["coolant_fraction_left"] * 100,
            name="coolant left",
            line={"color": "grey"},
            hovertemplate="%{x:.1f} h: %{y:.0f} %",
        ),
        secondary_y=True,
    )
    for lim in (t_payload_min, t_payload_max):
        if lim is not None:
            fig.add_hline(y=lim - 273.15, line={"color": "firebrick", "width": 1, "dash": "dash"})
    fig.update_layout(title=title, template="plotly_white", xaxis_title="time [h]")
    fig.update_yaxes(title_text="temperature [°C]", secondary_y=False)
    fig.update_yaxes(title_text="coolant left [%]", range=[0, 105], secondary_y=True)
    return fig


#: Colours of the end-of-hold markers by reason (the two failing ends that
#: matter most, coolant spent and payload too cold, get equal weight).
_REASON_SYMBOL = {
    "coolant spent": "diamond",
    "payload too warm": "triangle-up",
    "payload too cold": "triangle-down",
    "held for the whole run": "circle",
}
_TRACE_COLOURS = ("#1c7ed6", "#d9480f", "#2b8a3e", "#862e9c", "#e67700", "#0b7285")
_PROFILE_DASH = ("solid", "dash", "dot", "dashdot")


def trace_figure(trace: pd.DataFrame, system: str = "SI", title: str | None = None, chosen=None):
    """Temperature trace of designs over the trip (plotly ``go.Figure``).

    Payload (solid, thick), coolant (thin) and ambient (grey) temperature
    against time; the allowed payload band shaded; the target as a vertical
    line; per design and profile a marker at the end of the hold, by reason
    (coolant spent / payload too warm / payload too cold, same size), and a
    cross where the coolant runs out. Hover: time [h] and temperature [°C]
    (SI) or [°F] (US). The cautions of ``trace.attrs["cautions"]`` (with
    "a calculated trace does not qualify a shipper") are printed under the
    plot.

    Parameters
    ----------
    trace : DataFrame
        :meth:`ShipperStudy.trace`.
    system : {"SI", "US"}
        Temperature in °C or °F (time always in hours).
    title : str, optional
    chosen : (str, float), optional
        The design drawn widest (default the first).
    """
    import plotly.graph_objects as go

    units.check_system(system)
    tu = units.display_unit("temperature", system)

    def temp(x):
        return np.asarray(units.from_si(np.asarray(x, float), "temperature", system), float)

    marks = trace.attrs.get("markers", pd.DataFrame())
    designs = list(dict.fromkeys(zip(trace["candidate"], trace["thickness"], strict=True)))
    profiles = list(dict.fromkeys(trace["profile"]))
    chosen = designs[0] if chosen is None else (chosen[0], float(chosen[1]))
    fig = go.Figure()
    _ambient_lines(fig, trace, designs[0], profiles, temp, tu)
    for i, (cand, th) in enumerate(designs):
        colour = _TRACE_COLOURS[i % len(_TRACE_COLOURS)]
        label = f"{cand}, {th * 1000:.0f} mm"
        for j, prof in enumerate(profiles):
            sub = trace[
                (trace["candidate"] == cand) & (trace["thickness"] == th) & (trace["profile"] == prof)
            ]
            style = (colour, _PROFILE_DASH[j % 4], (cand, th) == chosen)
            _design_lines(fig, sub, label, prof, style, temp, tu)
            if marks.empty:
                continue
            mk = marks[
                (marks["candidate"] == cand) & (marks["thickness"] == th) & (marks["profile"] == prof)
            ]
            if not mk.empty:
                _hold_markers(fig, mk.iloc[0], sub, label, prof, colour, temp, tu)
    _band_and_target(fig, trace, temp)
    _cautions_and_layout(fig, trace, title, tu)
    return fig


def _ambient_lines(fig, trace: pd.DataFrame, first_design, profiles, temp, tu: str) -> None:
    """One grey step line per ambient profile (taken from the first design's rows)."""
    import plotly.graph_objects as go

    for j, prof in enumerate(profiles):
        sub = trace[trace["profile"] == prof]
        first = sub[(sub["candidate"] == first_design[0]) & (sub["thickness"] == first_design[1])]
        fig.add_trace(
            go.Scatter(
                x=first["time"] / 3600.0,
                y=temp(first["ambient"]),
                name=f"ambient ({prof})",
                mode="lines",
                line={"color": "#868e96", "width": 1.5, "dash": _PROFILE_DASH[j % 4], "shape": "hv"},
                hovertemplate=f"ambient ({prof})<br>t = %{{x:.2f}} h<br>T = %{{y:.1f}} {tu}<extra></extra>",
            )
        )


def _design_lines(fig, sub: pd.DataFrame, label: str, prof: str, style, temp, tu: str) -> None:
    """Payload (thick; widest for the chosen design) and coolant (thin) lines of one run.

    ``style`` is ``(colour, dash, wide)``.
    """
    import plotly.graph_objects as go

    colour, dash, wide = style
    h = sub["time"] / 3600.0
    for col, what, width in (
        ("payload_temperature", "payload", 3.5 if wide else 2.0),
        ("coolant_temperature", "coolant", 1.2),
    ):
        fig.add_trace(
            go.Scatter(
                x=h,
                y=temp(sub[col]),
                name=f"{label}: {what} ({prof})",
                mode="lines",
                opacity=1.0 if what == "payload" else 0.6,
                line={"color": colour, "width": width, "dash": dash},
                hovertemplate=(
                    f"{_esc(label)}: {what} ({_esc(prof)})<br>t = %{{x:.2f}} h"
                    f"<br>T = %{{y:.1f}} {tu}<extra></extra>"
                ),
            )
        )


def _hold_markers(fig, mk, sub: pd.DataFrame, label: str, prof: str, colour: str, temp, tu: str):
    """The end-of-hold marker (symbol by reason) and a cross where the coolant runs out."""
    import plotly.graph_objects as go

    end, reason = float(mk["hold_time"]), str(mk["end_reason"])
    tp_end = float(np.interp(end, sub["time"], sub["payload_temperature"]))
    fig.add_trace(
        go.Scatter(
            x=[end / 3600.0],
            y=[float(temp(tp_end))],
            name=f"{label}: end of hold ({prof}): {reason}",
            mode="markers",
            marker={
                "symbol": _REASON_SYMBOL.get(reason, "circle"),
                "size": 14,
                "color": colour,
                "line": {"color": "#212529", "width": 1.5},
            },
            hovertemplate=(
                f"<b>end of hold: {reason}</b><br>{_esc(label)} ({_esc(prof)})"
                f"<br>t = %{{x:.2f}} h<br>payload T = %{{y:.1f}} {tu}<extra></extra>"
            ),
        )
    )
    t_sp = float(mk["time_coolant_spent"])
    if np.isfinite(t_sp) and t_sp <= float(sub["time"].max()):
        tc_sp = float(np.interp(t_sp, sub["time"], sub["coolant_temperature"]))
        fig.add_trace(
            go.Scatter(
                x=[t_sp / 3600.0],
                y=[float(temp(tc_sp))],
                name=f"{label}: coolant runs out ({prof})",
                mode="markers",
                marker={"symbol": "x", "size": 12, "color": colour},
                hovertemplate=(
                    f"<b>coolant runs out</b><br>{_esc(label)} ({_esc(prof)})"
                    f"<br>t = %{{x:.2f}} h<br>coolant T = %{{y:.1f}} {tu}<extra></extra>"
                ),
            )
        )


def _band_and_target(fig, trace: pd.DataFrame, temp) -> None:
    """The allowed payload band (shaded) and the hold target (a vertical line)."""
    lo, hi = trace.attrs.get("band", (None, None))
    if lo is not None or hi is not None:
        all_t = temp(trace[["ambient", "payload_temperature"]].to_numpy().ravel())
        y0 = float(temp(lo)) if lo is not None else float(np.min(all_t))
        y1 = float(temp(hi)) if hi is not None else float(np.max(all_t))
        fig.add_hrect(
            y0=y0,
            y1=y1,
            fillcolor="#40c057",
            opacity=0.12,
            line_width=0,
            annotation_text="allowed payload band",
            annotation_position="top left",
        )
    target = trace.attrs.get("target")
    if target:
        fig.add_vline(
            x=float(target) / 3600.0,
            line={"color": "#c92a2a", "width": 1.5, "dash": "dash"},
            annotation_text=f"target {float(target) / 3600:.0f} h",
            annotation_position="top right",
        )


def _cautions_and_layout(fig, trace: pd.DataFrame, title: str | None, tu: str) -> None:
    """The cautions printed under the plot, and the layout sized to hold them."""
    notes = list(dict.fromkeys([TRACE_CAUTION, *trace.attrs.get("cautions", ())]))
    foot = "<br>".join(_wrap(c) for c in notes)
    fig.add_annotation(
        text=foot,
        xref="paper",
        yref="paper",
        x=0,
        y=-0.16,
        xanchor="left",
        yanchor="top",
        showarrow=False,
        align="left",
        font={"size": 10, "color": "#495057"},
    )
    fig.update_layout(
        title=title or "Temperature trace of the trip (calculated, two-node model)",
        template="plotly_white",
        xaxis_title="time [h]",
        yaxis_title=f"temperature [{tu}]",
        height=560 + 26 * sum(_wrap(c).count("<br>") + 1 for c in notes),
        margin={"b": 80 + 26 * sum(_wrap(c).count("<br>") + 1 for c in notes)},
        legend={"font": {"size": 10}},
        hovermode="closest",
    )


def _esc(text: str) -> str:
    import html

    return html.escape(str(text))


def _wrap(text: str, width: int = 140) -> str:
    """Escaped text broken into lines of ``width`` characters joined by <br>."""

    return "<br>".join(_esc(line) for line in textwrap.wrap(str(text), width)) or ""


def charts(ev) -> list:
    """The report charts of a shipper evaluation (:class:`workbench.report.Evaluation`)."""

    figs = []
    currency = _currency(ev.results) or "EUR"
    fig = cost_figure(ev.raw, currency=currency, highlight=ev.chosen)
    fig.update_layout(title="Landed cost per shipment against insulation thickness")
    figs.append(fig)
    focus = _focus(ev)
    r = ev.results
    if focus is not None and focus in r.index and bool(r.loc[focus, "meets_target"]):
        run = ev.study.design_run(focus, float(r.loc[focus, "thickness"]))
        figs.append(
            hold_figure(
                run,
                ev.study.t_payload_min,
                ev.study.t_payload_max,
                title=f"Hold of {focus} at its cheapest thickness",
            )
        )
        trace = ev.study.trace([(focus, float(r.loc[focus, "thickness"]))])
        figs.append(trace_figure(trace, system=ev.system,
                                 title=f"Temperatures over the trip: {focus} at its cheapest thickness"))
    return figs
