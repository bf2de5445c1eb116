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
  let data = null, layout = null, revision = -1, gone = false, busy = false, again = false;
  let Plotly = null;
  const draw = async () => {
    if (!Plotly || data === null) return;
    if (busy) { again = true; return; }
    busy = true;
    try {
      do {
        again = false;
        if (gone) break;
        await Plotly.react(gd, data, layout, model.get("config"));
        gd.dataset.hwRevision = String(revision);
      } while (again);
    } finally { busy = false; }
  };
  // full state on arrival (a page opened late sees the current chart), then patches
  const onMsg = (msg) => {
    if (!msg || (msg.type !== "full" && msg.type !== "patch")) return;
    if (msg.type === "full") {
      data = msg.data; layout = msg.layout;
    } else {
      if (data === null || msg.base !== revision) { model.send({type: "full-request"}); return; }
      data = data.slice(0, msg.n);
      for (const [i, c] of Object.entries(msg.traces)) {
        const k = Number(i);
        data[k] = c.full ? c.full : Object.assign({}, data[k], c.set);
      }
      if (msg.layout) {
        const template = layout && layout.template;
        layout = msg.layout;
        if (!("template" in layout) && template) layout = Object.assign({}, layout, {template});
      }
    }
    revision = msg.revision;
    draw();
  };
  model.on("msg:custom", onMsg);
  model.send({type: "full-request"});
  try {
    Plotly = await loadPlotly(model);
  } catch (e) {
    gd.textContent = "The chart library did not load: " + e;
    return;
  }
  await draw();
  gd.on("plotly_click", (ev) => {
    const p = ev && ev.points && ev.points[0];
    if (p) model.send({type: "click", curve: p.curveNumber, point: p.pointNumber});
  });
  return () => { gone = true; model.off("msg:custom", onMsg); Plotly.purge(gd); };
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
    >>> plain_json(np.array([0.5, None, "10"], dtype=object))  # text stays text
    [0.5, None, '10']
    """
    if isinstance(obj, np.ndarray):
        if obj.dtype.kind == "f":
            if obj.ndim == 1:
                out = obj.tolist()
                bad = ~np.isfinite(obj)
                if bad.any():
                    for i in np.flatnonzero(bad).tolist():
                        out[i] = None
                return out
            return [plain_json(row) for row in obj]
        if obj.dtype.kind in "iubUS":
            return obj.tolist()
        items = obj.tolist()
        if obj.dtype.kind == "O" and obj.ndim == 1 and all(
                v is None or (isinstance(v, (float, int)) and not isinstance(v, bool)) for v in items):
            return plain_json(np.array(items, dtype=float))  # numbers with None gaps: the fast path
        return [plain_json(v) for v in items]
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


def _snapshot(obj):
    """A copy of a plotly property tree deep enough to compare later (arrays are not copied:
    plotly replaces them on assignment and keeps them read-only; the layout's template is kept
    by reference, as plotly replaces it whole)."""
    if isinstance(obj, dict):
        return {k: (v if k == "template" else _snapshot(v)) for k, v in obj.items()}
    if isinstance(obj, list):
        return [_snapshot(v) for v in obj]
    return obj


def _same(a, b) -> bool:
    """Equality of two property trees, arrays compared by value (NaN equal to NaN)."""
    if a is b:
        return True
    if isinstance(a, np.ndarray) or isinstance(b, np.ndarray):
        try:
            a, b = np.asarray(a), np.asarray(b)
            if a.shape != b.shape:
                return False
            if a.dtype.kind in "fc" and b.dtype.kind in "fc":
                return bool(np.array_equal(a, b, equal_nan=True))
            return bool(np.array_equal(a, b))
        except (TypeError, ValueError):
            return False
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    if isinstance(a, (list, tuple)) and isinstance(b, (list, tuple)):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b, strict=True))
    try:
        return bool(a == b)
    except (TypeError, ValueError):
        return False


def _raw(fig: go.Figure) -> tuple[list[dict], dict]:
    """The figure's own property trees (no deep copy); ``to_plotly_json`` where they are missing."""
    data, layout = getattr(fig, "_data", None), getattr(fig, "_layout", None)
    if isinstance(data, list) and isinstance(layout, dict):
        return data, layout
    full = fig.to_plotly_json()
    return full["data"], full["layout"]


class PlotView(anywidget.AnyWidget):
    """Show a plotly figure and redraw it after :meth:`push`.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        The figure; keep updating it in Python, then call :meth:`push`.
    config : dict, optional
        plotly.js config (default: no logo, not responsive).

    Notes
    -----
    A view asks for the full chart when it is created; after that,
    :meth:`push` sends only the trace properties (and the layout) that changed
    since the last push, numbered by a revision, and the view redraws with
    ``Plotly.react``. A view that missed a revision asks for the full chart again.

    Examples
    --------
    >>> fig = go.Figure(go.Scatter(x=[0, 1], y=[1, 2]))
    >>> view = PlotView(fig)
    >>> fig.data[0].y = [3, 4]
    >>> view.push()
    True
    >>> view.data[0]["y"], view.revision
    ([3, 4], 1)
    >>> view.push()  # nothing changed: nothing sent
    False
    """

    _esm = _ESM
    _css = _CSS
    config = traitlets.Dict().tag(sync=True)

    def __init__(self, fig: go.Figure, config: dict | None = None, **kwargs):
        super().__init__(**kwargs)
        if not isinstance(fig, go.Figure):
            raise ValueError(f"fig: expected a plotly.graph_objects.Figure, got {type(fig).__name__}")
        self.fig = fig
        self.config = dict(config) if config is not None else {"displaylogo": False, "responsive": False}
        self.revision = 0
        self._clicks: dict[int, Callable[[int], None]] = {}
        self._raw_data: list = []
        self._raw_layout: dict = {}
        self._json_data: list = []
        self._json_layout: dict = {}
        self.on_msg(self._message)
        self._take()

    @property
    def data(self) -> list:
        """The traces as last sent (plain JSON values)."""
        return self._json_data

    @property
    def layout(self) -> dict:
        """The layout as last sent (plain JSON values)."""
        return self._json_layout

    def _take(self) -> tuple[dict, dict | None]:
        """Record the figure's current state; return the trace changes and the layout if changed.

        A trace change is ``{"full": trace}`` for a new trace or one that lost a
        property, else ``{"set": {property: value}}`` with only the top-level
        properties that changed (a 40,000-point hover-text array is not resent
        when only the y values moved).
        """
        data, layout = _raw(self.fig)
        changes: dict[int, dict] = {}
        raw_out, json_out = [], []
        for i, tr in enumerate(data):
            old = self._raw_data[i] if i < len(self._raw_data) else None
            if old is None or not set(old) <= set(tr):
                snap, js = _snapshot(tr), plain_json(tr)
                changes[i] = {"full": js}
            else:
                keys = [k for k in tr if k not in old or not _same(tr[k], old[k])]
                if not keys:
                    raw_out.append(old)
                    json_out.append(self._json_data[i])
                    continue
                snap, js = dict(old), dict(self._json_data[i])
                sets = {}
                for k in keys:
                    snap[k] = _snapshot(tr[k])
                    js[k] = sets[k] = plain_json(tr[k])
                changes[i] = {"set": sets}
            raw_out.append(snap)
            json_out.append(js)
        self._raw_data, self._json_data = raw_out, json_out
        sent_layout = None
        if not _same(layout, self._raw_layout):
            template = layout.get("template")
            same_template = template is self._raw_layout.get("template") and "template" in self._json_layout
            rest = plain_json({k: v for k, v in layout.items() if k != "template"})
            t_json = self._json_layout["template"] if same_template else plain_json(template)
            self._raw_layout = _snapshot(layout)
            self._json_layout = dict(rest, template=t_json) if template is not None else rest
            # the template (about 10 kB) travels only when it changed
            sent_layout = rest if same_template else self._json_layout
        return changes, sent_layout

    def push(self) -> bool:
        """Send what changed in the figure since the last push; True if anything was sent."""
        n_old = len(self._json_data)
        changes, layout = self._take()
        if not changes and layout is None and len(self._json_data) == n_old:
            return False
        base = self.revision
        self.revision += 1
        msg = {"type": "patch", "base": base, "revision": self.revision, "n": len(self._json_data),
               "traces": {str(i): c for i, c in changes.items()}}
        if layout is not None:
            msg["layout"] = layout
        self.send(msg)
        return True

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
            if kind == "full-request":
                self.send({"type": "full", "revision": self.revision, "data": self._json_data,
                           "layout": self._json_layout})
            elif kind == "plotly-request":
                self.send({"type": "plotly-source"}, buffers=[_plotly_js()])
            elif kind == "click":
                self.click(content.get("curve", -1), content.get("point", -1))
        except Exception:  # never raise into the front end's message loop
            LOG.exception("chart message %r failed", kind)
