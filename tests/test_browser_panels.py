"""Real-browser tests of the two job panels in the Voila app view.

Each test serves a temporary copy of notebooks/shipper.ipynb or
notebooks/housing.ipynb with Voila on 127.0.0.1 (isolated Jupyter config dirs,
own process group, torn down in a ``finally``; the server helpers come from
tests/test_browser.py), drives Debian's Chromium through Playwright, and checks
the user story of each panel: the charts hold data, a slider move (ArrowRight
on its handle) changes the chart data, a value typed with a unit changes the
chart data and the results table in the direction physics makes certain, and a
bad value shows the inline message beside the field (naming the field and the
expected unit) while the last good chart is kept. Screenshots (1280×800) go to
./artifacts/, the measured key-press-to-repaint times to
artifacts/interaction_browser.json ("voila_shipper", "voila_housing").

A field change may recompute in the background (with a progress bar), so every
expected state is polled for with a timeout, never assumed synchronous.

Expected values and directions:
- 104 °F = 40 °C exactly: t/°C = (t/°F − 32)/1.8 (NIST SP 811, 2008, Appendix B.8,
  "degree Fahrenheit"); the housing panel's ambient is typed in °F.
- A longer required hold time needs at least as much coolant at every wall
  thickness (more heat leaks in over a longer time: first law; common practice,
  no table), so the landed cost per shipment at the current thickness cannot fall.
- A warmer ambient with the same dissipated power raises the inside-air, surface
  and hot-spot temperatures of every wall (heat flows down a temperature
  gradient to the ambient; common practice, no table).
"""

from __future__ import annotations

import re
import shutil
import statistics
import sys
import time
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent))  # tests/ is not a package

from test_browser import (  # noqa: E402  (helpers and fixtures of the workbench browser tests)
    _ARM,
    _CHART,
    ARTIFACTS,
    BIN,
    CHROMIUM,
    ROOT,
    VIEWPORT,
    _free_port,
    _isolated_env,
    _server,
    _wait_rendered,
    browser,  # noqa: F401  (pytest fixture)
    timings,  # noqa: F401  (pytest fixture)
)
from test_browser import _measured as _measured_wall  # noqa: E402


def _record(arrow: list[float], text_ms: float, what: str) -> dict:
    """The timings of one panel run, for artifacts/interaction_browser.json."""
    return {
        "slider_arrow_to_repaint_ms": [round(v, 1) for v in arrow],
        "slider_arrow_to_repaint_median_ms": round(statistics.median(arrow), 1),
        "unit_input_enter_to_repaint_ms": round(text_ms, 1),
        "unit_input": what,
        "viewport": f"{VIEWPORT['width']}x{VIEWPORT['height']}",
    }


pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="/usr/bin/chromium is not installed (CI installs it)"),
]

RECOMPUTE_S = 60.0  # a field change may run as a background task: poll up to this long

# The rows of a panel's results table as lists of cell texts.
_TABLE = """([sel]) => Array.from(document.querySelectorAll(sel + ' tbody tr'))
  .map(tr => Array.from(tr.querySelectorAll('td')).map(td => td.textContent.trim()))"""


# ---------------------------------------------------------------------------- helpers
def _chart(page, css):
    return page.evaluate(_CHART, [f".{css}"])


def _table(page, css):
    return page.evaluate(_TABLE, [f".{css}"])


def _num(text: str) -> float:
    m = re.search(r"[-+]?\d+(?:\.\d+)?(?:[eE][-+]?\d+)?", text.replace("−", "-"))
    return float(m.group()) if m else float("nan")


def _column(rows, i):
    return [_num(r[i]) for r in rows]


def _serve_and_open(tmp_path, name: str):
    """A temporary copy of notebooks/<name>.ipynb served by Voila: (server context manager, base URL).

    The copy sits in ``notebooks/`` beside a copy of ``examples/`` (the shipper notebook reads
    the demo logger files there), as in the repository."""
    (tmp_path / "notebooks").mkdir()
    nb = tmp_path / "notebooks" / f"{name}.ipynb"
    shutil.copy(ROOT / "notebooks" / f"{name}.ipynb", nb)
    shutil.copytree(ROOT / "examples", tmp_path / "examples")
    env = _isolated_env(tmp_path)
    port = _free_port()
    cmd = [str(BIN / "voila"), str(nb), "--no-browser", f"--port={port}", "--Voila.ip=127.0.0.1"]
    base = f"http://127.0.0.1:{port}"
    return _server(cmd, tmp_path, env, f"{base}/voila/static/voila.js", tmp_path / "voila.log"), base


def _measured(page, what: str, timeout_s: float = RECOMPUTE_S) -> float:
    return _measured_wall(page, what, timeout_s)


def _chart_when(page, css, ok, what: str, timeout_s: float = RECOMPUTE_S):
    """The chart's data once ``ok(chart)`` holds (views may be re-created under Voila)."""
    deadline = time.monotonic() + timeout_s
    while True:
        c = _chart(page, css)
        if c and c["data"] and ok(c):
            return c
        if time.monotonic() > deadline:
            raise AssertionError(f"{css}: {what} not reached within {timeout_s} s; last title "
                                 f"{c and c['title']!r}")
        page.wait_for_timeout(50)


def _table_when(page, css, ok, what: str, timeout_s: float = RECOMPUTE_S):
    deadline = time.monotonic() + timeout_s
    while True:
        rows = _table(page, css)
        if rows and ok(rows):
            return rows
        if time.monotonic() > deadline:
            raise AssertionError(f"{css}: {what} not reached within {timeout_s} s; last rows {rows}")
        page.wait_for_timeout(50)


def _arrow_right(page, handle_css: str, chart_css: str, trace: int, n: int = 5) -> list[float]:
    """Press ArrowRight ``n`` times on a slider handle; each press's key-to-repaint time [ms]."""
    handle = page.locator(f".{handle_css} .noUi-handle")
    handle.scroll_into_view_if_needed()
    handle.focus()
    times = []
    for i in range(n):
        page.evaluate(_ARM, [f".{chart_css}", trace])
        page.keyboard.press("ArrowRight")
        try:
            times.append(_measured(page, f"{handle_css} ArrowRight"))
        except AssertionError as exc:
            readout = page.locator(f".{handle_css} .widget-readout").inner_text()
            focus = page.evaluate("() => document.activeElement && document.activeElement.className")
            c = _chart(page, chart_css)
            raise AssertionError(f"{exc}; press {i + 1} of {n}, readout {readout!r}, focus {focus!r}, "
                                 f"trace x {c and c['data'][trace]['x'][:2]}") from None
    return times


def _value_when(page, field_css: str, ok, what: str, timeout_s: float = RECOMPUTE_S) -> str:
    """The text field's value once ``ok(value)`` holds (the kernel writes it back after a change)."""
    deadline = time.monotonic() + timeout_s
    field = page.locator(f".{field_css} input")
    while True:
        value = field.input_value()
        if ok(value):
            return value
        if time.monotonic() > deadline:
            raise AssertionError(f".{field_css}: {what} not reached within {timeout_s} s; last value {value!r}")
        page.wait_for_timeout(50)


def _bad_value_barrier(page, field_css: str, msg_css: str, first: str, second: str) -> str:
    """Type two bad values in turn and wait until the message names the second.

    The kernel handles widget messages in order, so once the message about ``second`` shows,
    everything ``first`` could have caused (a recompute, a redraw) has been sent already:
    a check made after this barrier sees any wrong recompute, with no fixed wait.
    """
    msg = page.locator(f".{msg_css} .hw-msg")
    _type(page, field_css, first)
    msg.wait_for(timeout=30_000)
    text = msg.inner_text()
    _type(page, field_css, second)
    page.wait_for_function("([sel, want]) => { const m = document.querySelector(sel);"
                           " return m !== null && m.textContent.includes(want); }",
                           arg=[f".{msg_css} .hw-msg", second], timeout=30_000)
    return text


def _type(page, field_css: str, text: str) -> None:
    field = page.locator(f".{field_css} input")
    field.scroll_into_view_if_needed()
    field.fill(text)
    field.press("Enter")


# ---------------------------------------------------------------------------- shipper
def test_voila_shipper_panel(browser, tmp_path, timings):  # noqa: F811
    server, base = _serve_and_open(tmp_path, "shipper")
    with server:
        page = browser.new_page()
        try:
            page.goto(f"{base}/", timeout=240_000)
            _wait_rendered(page, "hw-shipper", ("hw-shipper-chart-hold", "hw-shipper-chart-cost"), "shipper")
            ARTIFACTS.mkdir(exist_ok=True)
            panel = page.locator(".hw-shipper")
            panel.scroll_into_view_if_needed()
            page.screenshot(path=str(ARTIFACTS / "voila_shipper.png"))

            # both charts hold one curve per build-up (6 in the demo), plus target and markers
            hold = _chart(page, "hw-shipper-chart-hold")
            cost = _chart(page, "hw-shipper-chart-cost")
            assert len(hold["data"]) == 6 + 2 and all(len(t["x"]) >= 10 for t in hold["data"][:6])
            assert len(cost["data"]) == 6 + 2 and all(len(t["x"]) >= 10 for t in cost["data"][:6])
            assert hold["data"][-2]["y"] == [pytest.approx(48.0)] * 2  # the demo's 48 h target
            rows = _table(page, "hw-shipper-table")
            assert len(rows) == 6

            # thickness slider (a SelectionSlider): ArrowRight moves the current-thickness markers
            x0 = hold["data"][-1]["x"][0]
            table_before = page.locator(".hw-shipper-table").inner_html()
            arrow = _arrow_right(page, "hw-shipper-thickness", "hw-shipper-chart-hold", -1)
            moved = _chart_when(page, "hw-shipper-chart-hold", lambda c: c["data"][-1]["x"][0] > x0 + 20,
                                "markers 5 steps (25 mm) to the right")
            assert moved["data"][-1]["x"][0] == pytest.approx(x0 + 25.0)  # 5 steps of the 5 mm sweep grid
            assert moved["data"][-1]["y"] != hold["data"][-1]["y"]
            page.wait_for_function("(old) => document.querySelector('.hw-shipper-table').innerHTML !== old",
                                   arg=table_before, timeout=30_000)

            # a value with a unit: target hold "60 h" -> the target line moves to 60 h, costs rise
            rows_before = _table(page, "hw-shipper-table")
            cost_before = _chart(page, "hw-shipper-chart-cost")
            page.evaluate(_ARM, [".hw-shipper-chart-hold", -2])
            _type(page, "hw-shipper-duration", "60 h")
            text_ms = _measured(page, "target hold 60 h")
            after = _chart_when(page, "hw-shipper-chart-hold",
                                lambda c: c["data"][-2]["y"] == [pytest.approx(60.0)] * 2, "target line at 60 h")
            assert "60 h" in after["data"][-2]["name"]
            cost_after = _chart_when(page, "hw-shipper-chart-cost",
                                     lambda c: [t["y"] for t in c["data"][:6]] != [t["y"] for t in cost_before["data"][:6]],
                                     "cost curves changed")
            for b, a in zip(cost_before["data"][:6], cost_after["data"][:6], strict=True):
                pairs = [(p, q) for p, q in zip(b["y"], a["y"], strict=True) if p is not None and q is not None]
                assert pairs and all(q >= p - 1e-9 for p, q in pairs), b["name"]  # more coolant for longer hold
            rows_after = _table_when(page, "hw-shipper-table",
                                     lambda r: _column(r, 5) != _column(rows_before, 5), "table recomputed")
            # landed cost at the current thickness: never lower, higher in total (coolant for 60 h, not 48 h)
            pairs = [(b, a) for b, a in zip(_column(rows_before, 5), _column(rows_after, 5), strict=True)
                     if b == b and a == a]
            assert pairs and all(a >= b for b, a in pairs) and sum(a - b for b, a in pairs) > 0

            # a bad value: a mass in the time field -> message beside it, last good chart kept
            cost_good = _chart(page, "hw-shipper-chart-cost")
            text = _bad_value_barrier(page, "hw-shipper-duration", "hw-shipper-duration-msg", "25 kg", "26 kg")
            assert "target hold time" in text and "duration" in text and " h" in text, text
            # no recompute was started by either bad value: the task's Cancel button stays disabled
            assert page.locator(".hw-shipper .hw-cancel").first.is_disabled()
            kept = _chart(page, "hw-shipper-chart-hold")
            assert kept["data"][-2]["y"] == [pytest.approx(60.0)] * 2
            assert [t["y"] for t in _chart(page, "hw-shipper-chart-cost")["data"]] == \
                [t["y"] for t in cost_good["data"]]
            assert _table(page, "hw-shipper-table") == rows_after
            page.locator(".hw-shipper-duration-msg").scroll_into_view_if_needed()
            page.screenshot(path=str(ARTIFACTS / "voila_shipper_after_inputs.png"))
            timings["voila_shipper"] = _record(arrow, text_ms, "target hold 48 h -> 60 h (recomputes every design)")
        finally:
            page.close()


# ---------------------------------------------------------------------------- housing
def test_voila_housing_panel(browser, tmp_path, timings):  # noqa: F811
    server, base = _serve_and_open(tmp_path, "housing")
    with server:
        page = browser.new_page()
        try:
            page.goto(f"{base}/", timeout=240_000)
            _wait_rendered(page, "hw-housing", ("hw-housing-chart-emissivity", "hw-housing-chart-power"), "housing")
            ARTIFACTS.mkdir(exist_ok=True)
            page.locator(".hw-housing").scroll_into_view_if_needed()
            page.screenshot(path=str(ARTIFACTS / "voila_housing.png"))

            # one curve per candidate (10 in the demo) in both charts, then limits and design points
            eps = _chart(page, "hw-housing-chart-emissivity")
            powc = _chart(page, "hw-housing-chart-power")
            assert len(eps["data"]) > 10 and all(len(t["x"]) >= 10 for t in eps["data"][:10])
            assert len(powc["data"]) > 10 and all(len(t["x"]) >= 10 for t in powc["data"][:10])
            assert powc["data"][-1]["x"][0] == pytest.approx(3.0)  # the demo's 3 W
            rows = _table(page, "hw-housing-table")
            assert len(rows) == 10

            # power slider: ArrowRight on the handle raises the power -> design points move right
            arrow = _arrow_right(page, "hw-housing-power-slider", "hw-housing-chart-power", -1)
            moved = _chart_when(page, "hw-housing-chart-power",
                                lambda c: c["data"][-1]["x"][0] > 3.0 + 0.1, "design points moved right")
            # hotter hot spots at more power (same walls, same ambient)
            assert all(a > b for a, b in zip(moved["data"][-1]["y"], powc["data"][-1]["y"], strict=True))
            p_now = moved["data"][-1]["x"][0]
            _table_when(page, "hw-housing-table", lambda r: _column(r, 5) != _column(rows, 5),
                        "table at the new power")
            # the field follows the slider: the kernel writes it back, so wait for that state
            _value_when(page, "hw-housing-power", lambda v: _num(v) == pytest.approx(p_now, rel=2e-3),
                        f"power field showing the slider's {p_now:.3g} W")

            # a value with a unit: ambient "104 °F" (= 40 °C exactly, NIST SP 811 B.8) -> everything warmer
            rows_before = _table(page, "hw-housing-table")
            eps_before = _chart(page, "hw-housing-chart-emissivity")
            page.evaluate(_ARM, [".hw-housing-chart-emissivity", 0])
            _type(page, "hw-housing-ambient", "104 °F")
            text_ms = _measured(page, "ambient 104 °F")
            eps_after = _chart_when(
                page, "hw-housing-chart-emissivity",
                lambda c: all(min(a["y"]) > 40.0 and a["y"] != b["y"]
                              for a, b in zip(c["data"][:10], eps_before["data"][:10], strict=True)),
                "every surface-temperature curve above the 40 °C ambient")
            for b, a in zip(eps_before["data"][:10], eps_after["data"][:10], strict=True):
                assert all(q > p for p, q in zip(b["y"], a["y"], strict=True)), b["name"]
            rows_after = _table_when(page, "hw-housing-table",
                                     lambda r: _column(r, 3) != _column(rows_before, 3), "table recomputed")
            for col in (3, 4, 5):  # inside air, mean surface, hot spot [°C]: all warmer
                assert all(a > b for a, b in zip(_column(rows_after, col), _column(rows_before, col), strict=True))
                assert all(v > 40.0 for v in _column(rows_after, col))  # above the 40 °C ambient
            assert _column(rows_after, 6) == _column(rows_before, 6)  # touch limits do not depend on ambient

            # a bad value: a mass in the temperature field -> message beside it, last good chart kept
            eps_good = _chart(page, "hw-housing-chart-emissivity")
            pow_good = _chart(page, "hw-housing-chart-power")
            text = _bad_value_barrier(page, "hw-housing-ambient", "hw-housing-ambient-msg", "25 kg", "26 kg")
            assert "ambient temperature" in text and "temperature" in text and "°C" in text, text
            assert [t["y"] for t in _chart(page, "hw-housing-chart-emissivity")["data"]] == \
                [t["y"] for t in eps_good["data"]]
            assert [t["y"] for t in _chart(page, "hw-housing-chart-power")["data"]] == \
                [t["y"] for t in pow_good["data"]]
            assert _table(page, "hw-housing-table") == rows_after
            page.locator(".hw-housing-ambient-msg").scroll_into_view_if_needed()
            page.screenshot(path=str(ARTIFACTS / "voila_housing_after_inputs.png"))
            timings["voila_housing"] = _record(
                arrow, text_ms, "ambient 35 °C -> 104 °F (recomputes every candidate and both sweeps)")
        finally:
            page.close()
