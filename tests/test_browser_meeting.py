"""The live review meeting in two real browsers: one shared notebook, one kernel.

The test starts the meeting server itself, through the launcher's own command
builder (:func:`workbench.meeting.build_command`: token in the environment,
the meeting identity provider, loopback only) on a free 127.0.0.1 port, with
isolated Jupyter folders and a temporary copy of notebooks/review_meeting.ipynb
and examples/wall.toml (JupyterLab autosaves into the open file); the server
runs in its own process group and is torn down in a ``finally``.

Two Chromium contexts (two profiles: two separate participants) join with the
printed link and a name each. Participant A (the chair) runs the notebook and
presses ArrowRight on the thickness slider's handle; participant B's flux chart
must show the new thickness within :data:`REPAINT_LIMIT_MS` of A's key press.
The key-press-to-repaint time in B's view (A's ``keydown`` to the first
animation frame in B whose chart data changed, both on the machine's wall clock
``Date.now()``) is measured for 5 presses; the median goes to
artifacts/meeting_timings.json. B then types a note into the notes cell and A
must see it. A request without the token is refused. Screenshots:
artifacts/meeting_A.png and artifacts/meeting_B.png.

Every wait polls on state (a chart's data, a cell's text, the kernel's status)
with a stated timeout; there is no fixed sleep.
"""

from __future__ import annotations

import http.client
import json
import shutil
import statistics
import time
from pathlib import Path

import pytest
from test_browser import (  # the existing browser-test helpers
    _LAB_READY,
    LAUNCH_ARGS,
    _free_port,
    _isolated_env,
    _server,
)

from workbench.meeting import build_command, new_token

CHROMIUM = Path("/usr/bin/chromium")
ROOT = Path(__file__).resolve().parents[1]
ARTIFACTS = ROOT / "artifacts"
VIEWPORT = {"width": 1400, "height": 900}
PRESSES = 5
REPAINT_LIMIT_MS = 3000.0
"""Longest accepted time from A's key press to the repaint in B's view [ms] (aim: under 500)."""
JOIN_LIMIT_S = 120.0
NOTE_LIMIT_S = 15.0

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="/usr/bin/chromium is not installed (CI installs it)"),
]

# The flux chart's current-thickness marker (its last trace) as [x0, number of traces], or null.
_MARKER = """() => {
  const gd = document.querySelector('.hw-chart-flux.js-plotly-plot') || document.querySelector('.hw-chart-flux .js-plotly-plot');
  if (!gd || !gd.data || !gd.data.length) return null;
  const t = gd.data[gd.data.length - 1];
  const x = t.x == null ? [] : Array.from(t.x);
  return x.length ? [Number(x[0]), gd.data.length] : null;
}"""

# B: note the wall-clock time of the first animation frame whose marker differs from now.
_ARM_VIEWER = """() => {
  const find = () => document.querySelector('.hw-chart-flux.js-plotly-plot') || document.querySelector('.hw-chart-flux .js-plotly-plot');
  const key = g => { const t = g.data[g.data.length - 1]; return JSON.stringify(Array.from(t.x || [])) + JSON.stringify(Array.from(t.y || [])); };
  const before = key(find());
  window.__meet = {t1: null};
  const poll = () => {
    const g = find();
    if (g && g.data && key(g) !== before) { window.__meet.t1 = Date.now(); return; }
    requestAnimationFrame(poll);
  };
  requestAnimationFrame(poll);
}"""

# A: note the wall-clock time of the next ArrowRight (capture phase, before the slider sees it),
# and of its own repaint.
_ARM_CHAIR = """() => {
  const find = () => document.querySelector('.hw-chart-flux.js-plotly-plot') || document.querySelector('.hw-chart-flux .js-plotly-plot');
  const key = g => { const t = g.data[g.data.length - 1]; return JSON.stringify(Array.from(t.x || [])) + JSON.stringify(Array.from(t.y || [])); };
  const before = key(find());
  window.__meet = {t0: null, t1: null};
  const onKey = e => {
    if (e.key === 'ArrowRight') { window.__meet.t0 = Date.now(); document.removeEventListener('keydown', onKey, {capture: true}); }
  };
  document.addEventListener('keydown', onKey, {capture: true});
  const poll = () => {
    const g = find();
    if (g && g.data && key(g) !== before) { window.__meet.t1 = Date.now(); return; }
    requestAnimationFrame(poll);
  };
  requestAnimationFrame(poll);
}"""

_IDENTITY = "() => { const u = window.jupyterapp && window.jupyterapp.serviceManager.user; return u && u.isReady && u.identity ? u.identity.display_name : null; }"

_PRESENT = """() => {
  const w = window.jupyterapp && window.jupyterapp.shell.currentWidget;
  const aw = w && w.context && w.context.model && w.context.model.sharedModel && w.context.model.sharedModel.awareness;
  if (!aw) return null;
  return Array.from(aw.getStates().values()).map(s => s.user && (s.user.display_name || s.user.name)).filter(Boolean).sort();
}"""

_NOTES_INDEX = """() => {
  const w = window.jupyterapp.shell.currentWidget;
  return w.content.widgets.findIndex(c => (c.model.getMetadata('tags') || []).includes('meeting-notes'));
}"""

_NOTES_SEEN = """([i]) => {
  const w = window.jupyterapp.shell.currentWidget;
  const cell = w.content.widgets[i];
  return {source: cell.model.sharedModel.getSource(), shown: cell.node.innerText};
}"""


def _until(what: str, fn, timeout_s: float, page=None, shot: str = ""):
    """Poll ``fn()`` until it returns a truthy value; fail with ``what`` after ``timeout_s``."""
    deadline = time.monotonic() + timeout_s
    last = None
    while True:
        last = fn()
        if last:
            return last
        if time.monotonic() > deadline:
            if page is not None and shot:
                ARTIFACTS.mkdir(exist_ok=True)
                page.screenshot(path=str(ARTIFACTS / f"meeting_failed_{shot}.png"))
            raise AssertionError(f"{what}: not reached within {timeout_s:g} s (last: {last!r})")
        if page is not None:
            page.wait_for_timeout(20)
        else:
            time.sleep(0.05)


def _status(port: int, path: str) -> tuple[int, str]:
    """HTTP status and Location of one GET, redirects not followed."""
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=30)
    try:
        conn.request("GET", path)
        r = conn.getresponse()
        r.read()
        return r.status, r.getheader("Location") or ""
    finally:
        conn.close()


def _join(page, url: str, name: str) -> None:
    page.goto(url.replace("YOUR_NAME", name.replace(" ", "%20")), timeout=120_000)
    deadline = time.monotonic() + JOIN_LIMIT_S
    while not page.evaluate(_LAB_READY):
        assert time.monotonic() < deadline, f"{name}: JupyterLab kernel never became ready"
        page.wait_for_timeout(250)
    page.evaluate("() => window.jupyterapp.shell.collapseLeft()")  # room for the workbench


def _marker(page):
    return page.evaluate(_MARKER)


def test_two_participants_share_one_live_meeting(tmp_path):
    from playwright.sync_api import sync_playwright

    (tmp_path / "notebooks").mkdir()
    (tmp_path / "examples").mkdir()
    nb = tmp_path / "notebooks" / "review_meeting.ipynb"
    shutil.copy(ROOT / "notebooks" / "review_meeting.ipynb", nb)
    shutil.copy(ROOT / "examples" / "wall.toml", tmp_path / "examples" / "wall.toml")
    port, token = _free_port(), new_token()
    plan = build_command(nb, host="127.0.0.1", port=port, token=token, root_dir=tmp_path,
                         extra=["--LabApp.expose_app_in_browser=True"])
    assert plan.warning is None and token not in " ".join(plan.argv)
    env = _isolated_env(tmp_path)
    env.pop("HEATPATH_MEETING_PASSWORD_FILE", None)
    env["HEATPATH_STATE_DIR"] = str(tmp_path / "state")
    env.update(plan.env)
    timings: dict = {}
    with _server(plan.argv, tmp_path, env, f"http://127.0.0.1:{port}/api/status?token={token}",
                 tmp_path / "meeting.log"):
        # without the token: refused (API 403; pages redirect to the login form)
        assert _status(port, "/api/contents")[0] == 403
        assert _status(port, "/api/contents?token=not-the-token-not-the-token")[0] == 403
        code, where = _status(port, "/lab/tree/notebooks/review_meeting.ipynb")
        assert code in (302, 303) and "/login" in where, (code, where)
        assert _status(port, f"/api/contents?token={token}")[0] == 200

        ARTIFACTS.mkdir(exist_ok=True)
        with sync_playwright() as pw:
            ctx_a = ctx_b = None
            try:
                ctx_a = pw.chromium.launch_persistent_context(str(tmp_path / "profile-a"), executable_path=str(CHROMIUM),
                                                              headless=True, args=LAUNCH_ARGS, viewport=VIEWPORT)
                ctx_b = pw.chromium.launch_persistent_context(str(tmp_path / "profile-b"), executable_path=str(CHROMIUM),
                                                              headless=True, args=LAUNCH_ARGS, viewport=VIEWPORT)
                a, b = ctx_a.new_page(), ctx_b.new_page()

                # A (the chair) joins and runs the notebook
                _join(a, plan.url, "Ada Chair")
                assert _until("A's name", lambda: a.evaluate(_IDENTITY), 30, a) == "Ada Chair"
                a.evaluate("() => window.jupyterapp.commands.execute('notebook:run-all-cells')")
                start = _until("A's flux chart", lambda: _marker(a), JOIN_LIMIT_S, a, "A_render")

                # B joins the same notebook and sees the live workbench from the shared kernel
                t_join = time.monotonic()
                _join(b, plan.url, "Bo Viewer")
                assert _until("B's name", lambda: b.evaluate(_IDENTITY), 30, b) == "Bo Viewer"
                assert _until("B's flux chart", lambda: _marker(b), JOIN_LIMIT_S, b, "B_render") == start
                timings["b_join_to_live_chart_s"] = round(time.monotonic() - t_join, 2)
                # each sees who else is in the notebook, under the chosen names
                for page in (a, b):
                    _until("both names present", lambda p=page: p.evaluate(_PRESENT) == ["Ada Chair", "Bo Viewer"],
                           30, page, "presence")

                # A presses ArrowRight on the thickness slider; B's chart follows (5 presses)
                handle = a.locator(".hw-thickness .noUi-handle")
                handle.scroll_into_view_if_needed()
                b.locator(".hw-chart-flux").first.scroll_into_view_if_needed()
                handle.focus()
                thickness = start[0]
                remote, local = [], []
                for i in range(PRESSES):
                    b.evaluate(_ARM_VIEWER)
                    a.evaluate(_ARM_CHAIR)
                    a.keyboard.press("ArrowRight")
                    t1_b = _until(f"press {i + 1}: B's repaint", lambda: b.evaluate("() => window.__meet.t1"),
                                  REPAINT_LIMIT_MS / 1000, b, "B_repaint")
                    chair = _until(f"press {i + 1}: A's key and repaint",
                                   lambda: (lambda m: m if m and m["t0"] and m["t1"] else None)(a.evaluate("() => window.__meet")),
                                   REPAINT_LIMIT_MS / 1000, a, "A_repaint")
                    remote.append(t1_b - chair["t0"])
                    local.append(chair["t1"] - chair["t0"])
                    assert remote[-1] <= REPAINT_LIMIT_MS, f"press {i + 1}: {remote[-1]:.0f} ms in B's view"
                    thickness += 1.0  # 1 mm slider step (SI display)
                    for page in (a, b):  # settled on the new state before the next press
                        _until(f"press {i + 1}: thickness {thickness:g} mm",
                               lambda p=page, t=thickness: (lambda m: m and abs(m[0] - t) < 1e-6)(_marker(p)), 10, page)
                timings["a_key_to_b_repaint_ms"] = [round(v, 1) for v in remote]
                timings["a_key_to_b_repaint_median_ms"] = round(statistics.median(remote), 1)
                timings["a_key_to_a_repaint_ms"] = [round(v, 1) for v in local]
                timings["a_key_to_a_repaint_median_ms"] = round(statistics.median(local), 1)
                timings["thickness_mm"] = [round(start[0], 3), round(thickness, 3)]

                # B writes in the notes cell; A sees it
                i = b.evaluate(_NOTES_INDEX)
                assert i >= 0, "no cell tagged meeting-notes"
                note = f"Bo: check the panel joints before ordering ({token[:6]})"
                cell = b.locator(".jp-Notebook .jp-Cell").nth(i)
                cell.scroll_into_view_if_needed()
                cell.dblclick()
                editor = cell.locator(".cm-content")
                editor.wait_for(timeout=15_000)
                editor.click()
                b.keyboard.press("Control+End")
                t_note = time.monotonic()
                b.keyboard.type("\n\n" + note)
                b.keyboard.press("Shift+Enter")
                a.locator(".jp-Notebook .jp-Cell").nth(i).scroll_into_view_if_needed()
                seen = _until("A sees B's note", lambda: (lambda s: s if note in s["shown"] else None)(a.evaluate(_NOTES_SEEN, [i])),
                              NOTE_LIMIT_S, a, "notes")
                assert note in seen["source"]
                timings["b_note_to_a_shown_s"] = round(time.monotonic() - t_note, 2)

                for page, who in ((a, "A"), (b, "B")):
                    page.locator(".hw-chart-flux").first.scroll_into_view_if_needed()
                    page.screenshot(path=str(ARTIFACTS / f"meeting_{who}.png"))
            finally:
                for ctx in (ctx_a, ctx_b):
                    if ctx is not None:
                        ctx.close()
    timings.update({"presses": PRESSES, "limit_ms": REPAINT_LIMIT_MS,
                    "clock": "Date.now() in both pages (same machine): A's keydown to B's first frame with new chart data",
                    "viewport": f"{VIEWPORT['width']}x{VIEWPORT['height']}"})
    (ARTIFACTS / "meeting_timings.json").write_text(json.dumps(timings, indent=2))
    print("meeting timings:", json.dumps(timings))
