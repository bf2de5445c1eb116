"""Report charts of the wall study (plotly imported lazily).

``charts(evaluation)`` is the ``charts`` field of the kind (:mod:`.kind`): the
figures a report shows after the generic trade-off and score charts.
"""

from __future__ import annotations

import numpy as np

from workbench import units
from workbench.studies._chart_parts import _currency, _e, _focus  # noqa: F401

__all__ = ["charts"]


def charts(ev) -> list:
    """The report charts of a wall evaluation (:class:`workbench.report.Evaluation`)."""
    import plotly.graph_objects as go

    study, r, system = ev.study, ev.results, ev.system
    figs = []
    design = r["sized_thickness"].to_numpy(float)
    top = max(0.3, 1.5 * float(np.nanmax(design))) if np.isfinite(design).any() else 0.3
    thk = np.linspace(0.002, top, 150)
    q = np.abs(study.flux(thk))
    x_unit = units.display_unit("thickness", system)
    y_unit = units.display_unit("heat_flux", system)
    xs = np.asarray(units.from_si(thk, "thickness", system), float)
    fig = go.Figure()
    for i, name in enumerate(study.names):
        width = 4 if name == ev.chosen else 2
        fig.add_trace(
            go.Scatter(
                x=xs,
                y=np.asarray(units.from_si(q[i], "heat_flux", system), float),
                mode="lines",
                name=name,
                line=dict(width=width),
                hovertemplate=(
                    f"{_e(name)}<br>%{{x:.3g}} {_e(x_unit)}: %{{y:.3g}} {_e(y_unit)}"
                    f"<br>k source: {_e(r['conductivity_source'].iloc[i])}<extra></extra>"
                ),
            )
        )
    fig.add_trace(
        go.Scatter(
            x=np.asarray(units.from_si(design, "thickness", system), float).reshape(-1),
            y=np.asarray(
                units.from_si(np.abs(r["heat_flux"].to_numpy(float)), "heat_flux", system), float
            ).reshape(-1),
            mode="markers",
            name="design point",
            text=study.names,
            marker=dict(symbol="diamond", size=11, color="#1d2433"),
            hovertemplate=f"design point of %{{text}}<br>%{{x:.3g}} {_e(x_unit)}, "
            f"%{{y:.3g}} {_e(y_unit)}<extra></extra>",
        )
    )
    mf = study.max_flux()
    if mf is not None:
        # a trace, not add_hline(annotation_text=...): on a log axis plotly places that
        # annotation at 10**y and stretches the axis to it
        budget_y = float(units.from_si(float(mf), "heat_flux", system))
        fig.add_trace(
            go.Scatter(
                x=[xs[0], xs[-1]],
                y=[budget_y, budget_y],
                mode="lines",
                name="heat budget",
                line=dict(dash="dash", color="#1d2433", width=1.5),
                hovertemplate=f"heat budget %{{y:.3g}} {_e(y_unit)}<extra></extra>",
            )
        )
    fig.update_layout(
        title="Heat flux against the thickness of the sized layer",
        xaxis_title=units.axis_label("thickness", system, "Sized-layer thickness"),
        yaxis_title=units.axis_label("heat_flux", system, "Heat flux"),
        yaxis_type="log",
    )
    figs.append(fig)
    focus = _focus(ev)
    if focus is not None:
        prof = study.temperature_profile(focus)
        fig = go.Figure(
            go.Scatter(
                x=np.asarray(units.from_si(prof["position"].to_numpy(float), "thickness", system)),
                y=np.asarray(
                    units.from_si(prof["temperature"].to_numpy(float), "temperature", system)
                ),
                mode="lines+markers",
                text=list(prof["where"]),
                line=dict(color="#d9952b", width=3),
                hovertemplate=f"%{{text}}<br>%{{x:.3g}} {_e(x_unit)}: %{{y:.1f}} "
                f"{_e(units.display_unit('temperature', system))}<extra></extra>",
            )
        )
        fig.update_layout(
            title=f"Temperatures through {focus}"
            + (" (chosen)" if focus == ev.chosen else " (best ranked)"),
            xaxis_title=units.axis_label("thickness", system, "Position from inside"),
            yaxis_title=units.axis_label("temperature", system),
        )
        figs.append(fig)
    return figs
