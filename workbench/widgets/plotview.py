"""One chart on the page: a plotly figure kept in Python, drawn in the browser with ``Plotly.react``.

:class:`PlotView` is a small anywidget. Python holds an ordinary
:class:`plotly.graph_objects.Figure` (the chart classes update its traces and
layout as usual) and :meth:`PlotView.push` sends the figure's current data and
layout as two synced traits; the browser redraws with ``Plotly.react``, which
changes only what differs. Because the traits always hold the current state, a
view created later (a page opened in Voila, a re-displayed cell) shows the chart
as it is now.

plotly.js itself reaches the browser once per page: the first view asks its
kernel for the copy shipped inside the ``plotly`` Python package (a binary
message buffer) and every other view on the page reuses it. Each plotly
FigureWidget, by contrast, ships its own 5 MB module, and in a slow browser
their start-up races (seen under Voila 0.5 with plotly 7.1 and anywidget 0.11:
a chart that never applies later changes).

Clicks on a trace's points come back to Python (:meth:`PlotView.on_click`).
"""

from __future__ import annotations

import base64
from collections.abc import Callable
from functools import lru_cache
from pathlib import Path

import anywidget
import numpy as np
import plotly
import plotly.graph_objects as go
import traitlets

from workbench.widgets.fields import LOG

__all__ = ["PlotView", "figure_spec", "plain_json"]

_ESM = r"""
function loadPlotly(model) {
  if (window.__hwPlotly) return window.__hwPlotly;
  const p = new Promise((resolve, reject) => {
    const onMsg = async (msg, buffers) => {
      if (!msg || msg.type !== "plotly-source") return;
      model.off("msg:custom", onMsg);
      try {
        const src = new TextDecoder().decode(buffers[0]);
        const url = URL.createObjectURL(new Blob(
          ["const module = {exports: {}};\n", src, "\nexport default module.exports;\n"],
          {type: "text/javascript"}));
        const mod = await import(/* webpackIgnore: true */ url);
        URL.revokeObjectURL(url);
        resolve(mod.default);
      } catch (e) { reject(e); }
    };
    model.on("msg:custom", onMsg);
    model.send({type: "plotly-request"});
  });
  window.__hwPlotly = p;
  p.catch(() => { if (window.__hwPlotly === p) window.__hwPlotly = null; });
  return p;
}

async function render({ model, el }) {
  el.classList.add("hw-plotview");
  const gd = document.createElement("div");
  el.appendChild(gd);
  let Plotly;
  try {
    Plotly = await loadPlotly(model);
  } catch (e) {
    gd.textContent = "The chart library did not load: " + e;
    return;
  }
  let busy = false, again = false, gone = false;
  const draw = async () => {
    if (busy) { again = true; return; }
    busy = true;
    try {
      do {
        again = false;
        if (gone) break;
        await Plotly.react(gd, model.get("data"), model.get("layout"), model.get("config"));
        gd.dataset.hwRevision = String(model.get("revision"));
      } while (again);
    } finally { busy = false; }
  };
  await draw();
  gd.on("plotly_click", (ev) => {
    const p = ev && ev.points && ev.points[0];
    if (p) model.send({type: "click", curve: p.curveNumber, point: p.pointNumber});
  });
  model.on("change:revision", draw);
  return () => { gone = true; Plotly.purge(gd); };
}

export default { render };
"""

_CSS = ".hw-plotview { overflow: visible; }"


@lru_cache(maxsize=1)
def _plotly_js() -> bytes:
    """The plotly.js bundle shipped inside the plotly Python package."""
    return (Path(plotly.__file__).parent / "package_data" / "plotly.min.js").read_bytes()


def plain_json(obj):
    """Numpy arrays and scalars to plain lists and numbers (NaN and ±inf become None), recursively.

    Also decodes plotly's typed-array specs (``{"dtype", "bdata"[, "shape"]}``).

    >>> plain_json({"y": np.array([1.0, np.nan]), "n": np.int64(3)})
    {'y': [1.0, None], 'n': 3}
    """
    if isinstance(obj, np.ndarray):
        if obj.dtype.kind == "f":
            if obj.ndim == 1:
                return [float(v) if np.isfinite(v) else None for v in obj.tolist()]
            return [plain_json(row) for row in obj]
        return [plain_json(v) for v in obj.tolist()]
    if isinstance(obj, dict):
        if "bdata" in obj and "dtype" in obj:  # plotly's typed-array spec
            arr = np.frombuffer(base64.b64decode(obj["bdata"]), dtype=np.dtype(obj["dtype"]))
            if "shape" in obj:
                shape = obj["shape"]
                arr = arr.reshape([int(n) for n in str(shape).split(",")] if isinstance(shape, str) else shape)
            return plain_json(arr)
        return {k: plain_json(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [plain_json(v) for v in obj]
    if isinstance(obj, np.generic):
        return plain_json(obj.item())
    if isinstance(obj, float) and not np.isfinite(obj):
        return None
    return obj


def figure_spec(fig: go.Figure) -> dict:
    """``{"data": [...], "layout": {...}}`` of ``fig`` as plain JSON values."""
    full = fig.to_plotly_json()
    return {"data": plain_json(full["data"]), "layout": plain_json(full["layout"])}


class PlotView(anywidget.AnyWidget):
    """Show a plotly figure and redraw it after :meth:`push`.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        The figure; keep updating it in Python, then call :meth:`push`.
    config : dict, optional
        plotly.js config (default: no logo, not responsive).

    Examples
    --------
    >>> fig = go.Figure(go.Scatter(x=[0, 1], y=[1, 2]))
    >>> view = PlotView(fig)
    >>> fig.data[0].y = [3, 4]
    >>> view.push()
    True
    >>> view.data[0]["y"], view.revision
    ([3, 4], 2)
    >>> view.push()  # nothing changed: nothing sent
    False
    """

    _esm = _ESM
    _css = _CSS
    data = traitlets.List().tag(sync=True)
    layout = traitlets.Dict().tag(sync=True)
    config = traitlets.Dict().tag(sync=True)
    revision = traitlets.Int(0).tag(sync=True)

    def __init__(self, fig: go.Figure, config: dict | None = None, **kwargs):
        super().__init__(**kwargs)
        if not isinstance(fig, go.Figure):
            raise ValueError(f"fig: expected a plotly.graph_objects.Figure, got {type(fig).__name__}")
        self.fig = fig
        self.config = dict(config) if config is not None else {"displaylogo": False, "responsive": False}
        self._clicks: dict[int, Callable[[int], None]] = {}
        self.on_msg(self._message)
        self.push()

    def push(self) -> bool:
        """Send the figure's current data and layout if they changed; True if sent."""
        spec = figure_spec(self.fig)
        changed = False
        with self.hold_sync():
            if spec["data"] != self.data:
                self.data = spec["data"]
                changed = True
            if spec["layout"] != self.layout:
                self.layout = spec["layout"]
                changed = True
            if changed:
                self.revision += 1
        return changed

    def on_click(self, trace: int, callback: Callable[[int], None]) -> None:
        """Call ``callback(point_index)`` when a point of trace number ``trace`` is clicked."""
        self._clicks[int(trace)] = callback

    def click(self, trace: int, point: int) -> None:
        """What a click on point ``point`` of trace ``trace`` does (also used by the browser)."""
        cb = self._clicks.get(int(trace))
        if cb is not None:
            cb(int(point))

    def _message(self, _widget, content, _buffers) -> None:
        kind = content.get("type") if isinstance(content, dict) else None
        try:
            if kind == "plotly-request":
                self.send({"type": "plotly-source"}, buffers=[_plotly_js()])
            elif kind == "click":
                self.click(content.get("curve", -1), content.get("point", -1))
        except Exception:  # never raise into the front end's message loop
            LOG.exception("chart message %r failed", kind)
