"""Server-side interaction time of the workbench: input change -> updated figure data.

Candidate set: 200 synthetic candidates made from the curated tables (every
non-gas material, repeated and renamed "<id> #n" until there are 200; labelled
synthetic here and in the output). Sweep: 200 thickness points.

Measured in the same run:
* the in-place path: moving the thickness slider, the ΔT slider, and typing a
  max thickness; the time until every chart's changes are sent to its view
  (PlotView patches), and separately the results table that follows;
* the baseline: building the four charts from scratch for the same state
  (what a rebuild-on-every-change design would pay).

Prints median milliseconds and the ratio baseline / in-place. Target: the
in-place figure update under 30 ms.
"""

from __future__ import annotations

import statistics
import sys
import time

from workbench.materials import load_conductivity_curves, load_materials
from workbench.studies.wall import Candidate, HeatBudget, Layer, WallStudy
from workbench.widgets import Workbench
from workbench.widgets.charts import (
    FluxChart,
    ProfileChart,
    RequiredChart,
    TradeoffChart,
    compute_view,
)

N_CANDIDATES = 200
N_POINTS = 200  # thickness sweep points (Workbench grid)
REPEATS = 15


def synthetic_study(k_of_t: bool = True) -> WallStudy:
    m = load_materials()
    ids = [i for i in m.index if m.loc[i, "family"] != "gas"]
    cands = [Candidate(f"{ids[j % len(ids)]} #{j}", (Layer(ids[j % len(ids)]),)) for j in range(N_CANDIDATES)]
    return WallStudy(cands, m, t_inside=276.15, t_outside=298.15, area=0.6, budget=HeatBudget("flux", 6.0),
                     max_thickness=0.06, thickness=0.04, k_curves=load_conductivity_curves() if k_of_t else {})


def _median_ms(samples):
    return 1000 * statistics.median(samples)


def measure(k_of_t: bool) -> dict:
    study = synthetic_study(k_of_t)
    wb = Workbench(study, title="Benchmark (synthetic 200 candidates)", demo=True, redraw="messages")
    assert wb._grid().size == N_POINTS

    figures, tables, computes, drawing = [], [], [], []
    for i in range(REPEATS):  # thickness slider, alternating values
        wb.s_thick.value = 30.0 + (i % 2) * 10.0
        figures.append(wb.timings["compute"] + wb.timings["figures"])
        computes.append(wb.timings["compute"])
        drawing.append(wb.timings["figures"])
        tables.append(wb.timings["table"])
    dt_fig = []
    for i in range(REPEATS):  # ΔT slider
        wb.s_dt.value = 20.0 + (i % 2) * 5.0
        dt_fig.append(wb.timings["compute"] + wb.timings["figures"])
    text_total = []
    for i in range(5):  # a typed max thickness (rebuilds the validated study state)
        t0 = time.perf_counter()
        wb.set_inputs(max_thickness=f"{60 + 5 * (i % 2)} mm")
        text_total.append(time.perf_counter() - t0)

    base = []
    labels = wb.labels
    sources = list(study.materials.loc[[c.sized_material for c in study.candidates], "conductivity_source"])
    for _ in range(5):  # baseline: the same state drawn into new figures
        t0 = time.perf_counter()
        view = compute_view(wb.study, wb._grid(), 0)
        charts = [FluxChart(), RequiredChart(), TradeoffChart(), ProfileChart()]
        for c in charts:
            c.set_candidates(labels, sources, wb.currency)
        charts[0].update(view, "SI")
        charts[1].update(view, "SI")
        charts[2].update(view, "SI", front=wb._front(view))
        charts[3].update(view, "SI", labels[0])
        base.append(time.perf_counter() - t0)

    return {"inplace": _median_ms(figures), "compute": _median_ms(computes), "drawing": _median_ms(drawing),
            "dt": _median_ms(dt_fig), "table": _median_ms(tables), "text": _median_ms(text_total),
            "baseline": _median_ms(base)}


def main() -> int:
    print(f"candidates: {N_CANDIDATES} (synthetic: curated materials repeated), thickness points: {N_POINTS}")
    for k_of_t in (True, False):
        r = measure(k_of_t)
        print(f"-- study {'with' if k_of_t else 'without'} k(T) curves")
        print(f"thickness slider -> figure data updated (server): {r['inplace']:7.1f} ms "
              f"(study compute {r['compute']:.1f} ms + chart updates {r['drawing']:.1f} ms)")
        print(f"ΔT slider        -> figure data updated (server): {r['dt']:7.1f} ms")
        print(f"results table after a slider move (sent after the figures): {r['table']:7.1f} ms")
        print(f"typed max thickness -> figures + table (server): {r['text']:7.1f} ms")
        print(f"baseline: compute + build the four figures from scratch: {r['baseline']:7.1f} ms")
        print(f"ratio baseline / in-place: {r['baseline'] / r['inplace']:.1f}x; target in-place < 30 ms: "
              f"{'met' if r['inplace'] < 30 else 'NOT met'}; chart updates alone < 30 ms: "
              f"{'met' if r['drawing'] < 30 else 'NOT met'}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
