"""Charts of the housing study: the warm-up figure and its report charts.

plotly is imported lazily inside each function; nothing here holds physics.
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np
import pandas as pd

from workbench import units
from workbench.studies._chart_parts import _e

__all__ = ["charts", "warm_up_traces", "warm_up_figure"]

_WARM_COLOURS = (
    "#1f6f8b", "#c2571a", "#4b8b3b", "#8e3b8b", "#b08900", "#3b5b8e", "#a23b3b", "#2f8f83",
    "#6b6b6b", "#7a4f1d",
)
_LIMIT_DASHES = ("dash", "dot", "dashdot", "longdash", "longdashdot")


#: The touch caution on one line under the warm-up chart (the full text is in the cautions
#: above the charts and under the table: :data:`TOUCH_RESULT_CAUTION`).
CHART_TOUCH_CAUTION = "Touch safety: the product standard and a measurement on the product decide."


def warm_up_traces(
    frame: pd.DataFrame,
    system: str = "SI",
    title: str | None = None,
    chosen: str | None = None,
    colours: Sequence[str] | None = None,
) -> tuple[list[dict], dict]:
    """The traces (plain dicts) and layout of :func:`warm_up_figure`.

    Kept apart so a live chart can update its traces in place instead of
    building a new figure for every input change.
    """
    import html as _html

    from workbench import units

    units.check_system(system)
    tu = units.display_unit("temperature", system)
    names = list(dict.fromkeys(frame["candidate"]))
    t_max = float(frame["time"].max()) if len(frame) else 0.0
    per, tlab = (60.0, "min") if t_max <= 3 * 3600.0 else (3600.0, "h")
    colours = list(colours) if colours is not None else list(_WARM_COLOURS)

    def temp(x):
        return np.asarray(units.from_si(np.asarray(x, float), "temperature", system), float)

    reach = frame.attrs.get("time_to_touch_limit", {})
    cand = frame["candidate"].to_numpy()
    times = frame["time"].to_numpy(float)
    surface = temp(frame["t_surface"].to_numpy(float))
    traces = []
    for i, name in enumerate(names):
        sel = np.flatnonzero(cand == name)
        # at most about 150 points per line on screen (the first and last always kept)
        stride = max(1, -(-sel.size // 150))
        sel = np.unique(np.r_[sel[::stride], sel[-1:]])
        esc = _html.escape(str(name))
        traces.append(dict(
            type="scatter", x=times[sel] / per, y=surface[sel], name=str(name), mode="lines",
            line={"color": colours[i % len(colours)], "width": 3.5 if name == chosen else 1.8},
            hovertemplate=f"<b>{esc}</b><br>t = %{{x:.1f}} {tlab}<br>mean surface "
            f"%{{y:.1f}} {tu}<extra></extra>",
        ))
    limits = frame.drop_duplicates("touch_class")[["touch_class", "touch_limit"]]
    x_end = t_max / per
    for j, (cls, lim) in enumerate(zip(limits["touch_class"], limits["touch_limit"], strict=True)):
        y = float(temp(lim))
        traces.append(dict(
            type="scatter", x=[0.0, x_end], y=[y, y], name=f"touch limit, {cls} ({y:.1f} {tu})",
            mode="lines",
            line={"color": "#b5452b", "width": 1.6, "dash": _LIMIT_DASHES[j % len(_LIMIT_DASHES)]},
            hovertemplate=f"touch limit, {_html.escape(str(cls))}: %{{y:.1f}} {tu}<extra></extra>",
        ))
    hits = [(n, reach.get(n, np.inf)) for n in names]
    hits = [(n, t) for n, t in hits if np.isfinite(t)]
    lim_of = dict(zip(frame["candidate"], frame["touch_limit"], strict=False))
    traces.append(dict(
        type="scatter",
        x=[t / per for _, t in hits],
        y=[float(temp(lim_of[n])) for n, _ in hits],
        text=[str(n) for n, _ in hits],
        name="reaches its touch limit",
        mode="markers",
        marker={"symbol": "x", "size": 10, "color": "#1d2433"},
        hovertemplate=f"%{{text}}<br>reaches the touch limit at %{{x:.1f}} {tlab}"
        f"<br>%{{y:.1f}} {tu}<extra></extra>",
    ))
    layout = dict(
        title={"text": title or "Mean surface temperature over the use session", "x": 0.01,
               "xanchor": "left", "font": {"size": 13}},
        xaxis={"title": {"text": f"Time into the session [{tlab}]"}},
        yaxis={"title": {"text": units.axis_label("temperature", system, name="Mean surface temperature")}},
        legend={"font": {"size": 10}, "orientation": "h", "yanchor": "top", "y": -0.22, "x": 0},
        margin={"l": 62, "r": 14, "t": 34, "b": 150},
        annotations=[
            {
                "text": CHART_TOUCH_CAUTION,
                "xref": "paper", "yref": "paper", "x": 0, "y": -0.62, "showarrow": False,
                "xanchor": "left", "align": "left", "font": {"size": 10, "color": "#8a3b24"},
            }
        ],
    )
    return traces, layout


def warm_up_figure(
    frame: pd.DataFrame,
    system: str = "SI",
    title: str | None = None,
    chosen: str | None = None,
    colours: Sequence[str] | None = None,
):
    """Mean surface temperature over the use session against the touch limit (plotly ``go.Figure``).

    One line per candidate (the ``chosen`` one wider), one dashed line per
    touch limit in use, and a marker where a candidate reaches its limit.
    Time in minutes (hours for sessions over 3 h); temperature in °C (SI) or
    °F (US). Hover shows the candidate, time and temperature with units. The
    touch caution is printed under the plot.

    Parameters
    ----------
    frame : DataFrame
        :meth:`HousingStudy.warm_up_frame`.
    system : {"SI", "US"}
    title : str, optional
    chosen : str, optional
        Candidate drawn wider.
    colours : sequence of str, optional
        One colour per candidate, in order (default a built-in palette).
    """
    import plotly.graph_objects as go

    traces, layout = warm_up_traces(frame, system, title, chosen, colours)
    fig = go.Figure(data=[go.Scatter({k: v for k, v in t.items() if k != "type"}) for t in traces])
    fig.update_layout(template="plotly_white", **layout)
    return fig


def charts(ev) -> list:
    """The report charts of a housing evaluation (:class:`workbench.report.Evaluation`)."""
    import plotly.graph_objects as go

    study, system = ev.study, ev.system
    t_unit = units.display_unit("temperature", system)
    figs = []
    sweep = study.emissivity_sweep(np.linspace(0.05, 0.95, 19))
    fig = go.Figure()
    for name, grp in sweep.groupby("candidate", sort=False):
        fig.add_trace(
            go.Scatter(
                x=grp["emissivity"],
                y=units.from_si(grp["t_surface"].to_numpy(float), "temperature", system),
                mode="lines",
                name=str(name),
                line=dict(width=4 if name == ev.chosen else 2),
                hovertemplate=f"{_e(name)}<br>ε %{{x:.2f}}: %{{y:.1f}} {_e(t_unit)}<extra></extra>",
            )
        )
    r = ev.results
    fig.add_trace(
        go.Scatter(
            x=r["emissivity"],
            y=units.from_si(r["t_surface"].to_numpy(float), "temperature", system),
            mode="markers",
            name="design point",
            text=[str(i) for i in r.index],
            marker=dict(symbol="diamond", size=11, color="#1d2433"),
            hovertemplate=f"%{{text}}<br>ε %{{x:.2f}}: %{{y:.1f}} {_e(t_unit)}<extra></extra>",
        )
    )
    lim = r["touch_limit"].to_numpy(float)
    if np.isfinite(lim).any():
        fig.add_hline(
            y=float(units.from_si(float(np.nanmin(lim)), "temperature", system)),
            line_dash="dash",
            annotation_text="lowest touch limit in use",
        )
    fig.update_layout(
        title="Mean surface temperature against the emissivity of the finish",
        xaxis_title="Emissivity [–]",
        yaxis_title=units.axis_label("temperature", system, "Surface temperature"),
    )
    figs.append(fig)
    p = float(study.power)
    powers = np.linspace(0.0, max(2.0 * p, 1.0), 21)
    ps = study.power_sweep(powers)
    fig = go.Figure()
    for name, grp in ps.groupby("candidate", sort=False):
        fig.add_trace(
            go.Scatter(
                x=units.from_si(grp["power"].to_numpy(float), "power", system),
                y=units.from_si(grp["t_hot_spot"].to_numpy(float), "temperature", system),
                mode="lines",
                name=str(name),
                line=dict(width=4 if name == ev.chosen else 2),
                hovertemplate=f"{_e(name)}<br>%{{x:.3g}} {_e(units.display_unit('power', system))}: "
                f"%{{y:.1f}} {_e(t_unit)}<extra></extra>",
            )
        )
    fig.add_vline(
        x=float(units.from_si(p, "power", system)), line_dash="dot", annotation_text="design power"
    )
    fig.update_layout(
        title="Hottest outside point against the dissipated power",
        xaxis_title=units.axis_label("power", system, "Dissipated power"),
        yaxis_title=units.axis_label("temperature", system, "Hot-spot temperature"),
    )
    figs.append(fig)

    warm = study.warm_up_frame()
    minutes = float(study.session_duration) / 60.0
    contact = float(study.contact_duration)
    contact_text = f"{contact / 60.0:.3g} min" if contact >= 60.0 else f"{contact:.3g} s"
    figs.append(
        warm_up_figure(
            warm,
            system=system,
            title=f"Mean surface temperature over a {minutes:.3g}-min use session against the "
            f"touch limit for a {contact_text} contact",
            chosen=ev.chosen,
        )
    )
    return figs
