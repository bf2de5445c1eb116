"""Real-browser test of the web app (`make app`): the first page, the three jobs, a bad file.

The test serves a temporary copy of notebooks/app.ipynb with Voila on 127.0.0.1
(isolated Jupyter config dirs, own process group, torn down in a ``finally``;
the server helpers come from tests/test_browser.py), beside a copy of
examples/, as in the repository, and drives Debian's Chromium through
Playwright. The user story: the first page shows the three jobs; each job's
button opens its panel, whose charts hold data; "All jobs" leads back to the
first page; a scenario file opens by a relative path in the panel of its kind, and
the panel saves it again as a file that loads;
a scenario file with a wrong unit shows a message naming file:line:column and
the key, and no traceback. Every step waits on a page state, never on time.

Screenshots (1280×800) go to ./artifacts/: voila_app_home.png,
voila_app_wall.png, voila_app_shipper.png, voila_app_housing.png,
voila_app_file.png, voila_app_saved.png, voila_app_bad_file.png.

No physical value is asserted here (the panels' numbers are checked in
tests/test_job_panels.py, tests/test_widgets.py and tests/test_browser_panels.py).
"""

from __future__ import annotations

import shutil
import sys
from pathlib import Path

import pytest

from workbench.scenario import load_scenario

sys.path.insert(0, str(Path(__file__).resolve().parent))  # tests/ is not a package

from test_browser import (  # noqa: E402  (helpers and fixtures of the workbench browser tests)
    ARTIFACTS,
    BIN,
    CHROMIUM,
    ROOT,
    WALL_CHARTS,
    _chart,
    _free_port,
    _isolated_env,
    _server,
    _wait_rendered,
    browser,  # noqa: F401  (pytest fixture)
)

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="/usr/bin/chromium is not installed (CI installs it)"),
]

# job key -> (root CSS class of its panel, CSS classes of its charts, a heading word on its card)
JOBS = {
    "wall": ("hw-workbench", WALL_CHARTS, "Wall or panel"),
    "shipper": ("hw-shipper", ("hw-shipper-chart-hold", "hw-shipper-chart-cost"), "Insulated shipper"),
    "housing": ("hw-housing", ("hw-housing-chart-emissivity", "hw-housing-chart-power",
                               "hw-housing-chart-warmup"), "Device housing"),
}
OPEN_S = 180.0  # the first panel of a page loads plotly.js and may simulate every design: poll this long


def _serve(tmp_path):
    """A temporary copy of notebooks/app.ipynb beside a copy of examples/, served by Voila."""
    (tmp_path / "notebooks").mkdir()
    nb = tmp_path / "notebooks" / "app.ipynb"
    shutil.copy(ROOT / "notebooks" / "app.ipynb", nb)
    shutil.copytree(ROOT / "examples", tmp_path / "examples")
    env = _isolated_env(tmp_path)
    port = _free_port()
    cmd = [str(BIN / "voila"), str(nb), "--no-browser", f"--port={port}", "--Voila.ip=127.0.0.1"]
    base = f"http://127.0.0.1:{port}"
    return _server(cmd, tmp_path, env, f"{base}/voila/static/voila.js", tmp_path / "voila.log"), base


def _home_shown(page) -> None:
    page.wait_for_selector(".hw-jobs-home", state="visible", timeout=OPEN_S * 1000)
    for root, _, _ in JOBS.values():
        page.wait_for_selector(f".{root}", state="detached", timeout=30_000)


def _open_file(page, path: str) -> None:
    field = page.locator(".hw-jobs-path input")
    field.fill(path)
    # the field syncs on every key, and the kernel handles widget messages in order: the click
    # arrives after the whole path
    page.locator(".hw-jobs-open-file").click()


def _no_traceback(page) -> None:
    text = page.locator("body").inner_text()
    assert "Traceback" not in text, text[-2000:]


def test_voila_app_first_page_jobs_back_and_files(browser, tmp_path):  # noqa: F811
    bad = tmp_path / "bad_housing.toml"
    text = (ROOT / "examples" / "housing.toml").read_text(encoding="utf-8")
    assert text.count('t_ambient = "25 °C"') == 1
    bad.write_text(text.replace('t_ambient = "25 °C"', 't_ambient = "25 kg"'), encoding="utf-8")
    bad_line = next(i for i, t in enumerate(bad.read_text(encoding="utf-8").splitlines(), 1)
                    if t.startswith("t_ambient"))
    server, base = _serve(tmp_path)
    ARTIFACTS.mkdir(exist_ok=True)
    with server:
        page = browser.new_page()
        try:
            page.goto(f"{base}/", timeout=240_000)
            # the first page: three job cards, each with its open button, and the file field
            page.wait_for_selector(".hw-jobs-home", timeout=OPEN_S * 1000)
            assert page.locator(".hw-job-card").count() == 3
            for key, (_, _, word) in JOBS.items():
                card = page.locator(f".hw-job-{key}")
                assert word in card.inner_text() and "invented" in card.inner_text()
                assert page.locator(f"button.hw-job-open-{key}").is_enabled()
            assert page.locator(".hw-jobs-path input").count() == 1
            _no_traceback(page)
            page.screenshot(path=str(ARTIFACTS / "voila_app_home.png"))

            # each job: its panel with charts holding data, then back to the first page
            for key, (root, charts, word) in JOBS.items():
                page.locator(f"button.hw-job-open-{key}").click()
                _wait_rendered(page, root, charts, shot=f"app_{key}", timeout_s=OPEN_S)
                for css in charts:
                    c = _chart(page, css)
                    assert any(len(t["y"]) > 1 for t in c["data"]), (css, [t["name"] for t in c["data"]])
                assert word in page.locator(".hw-jobs-bar").inner_text()
                assert page.locator(".hw-jobs-home").count() == 0
                assert "DEMO" in page.locator(f".{root}").inner_text()
                _no_traceback(page)
                page.mouse.move(1, 1)  # no hover tool bar over a chart in the picture
                page.locator(".hw-jobs-bar").scroll_into_view_if_needed()
                page.screenshot(path=str(ARTIFACTS / f"voila_app_{key}.png"))
                page.locator("button.hw-jobs-back").click()
                _home_shown(page)
                assert "Return to it" in page.locator(f"button.hw-job-open-{key}").inner_text()

            # a scenario file by a relative path (the kernel runs in notebooks/) opens its job's panel
            _open_file(page, "../examples/housing.toml")
            _wait_rendered(page, "hw-housing", JOBS["housing"][1], shot="app_file", timeout_s=OPEN_S)
            page.wait_for_function("() => document.querySelector('.hw-housing').innerText"
                                   ".includes('Sealed controller housing')", timeout=60_000)
            page.mouse.move(1, 1)
            page.screenshot(path=str(ARTIFACTS / "voila_app_file.png"))

            # the panel saves what it shows as a scenario file that opens again (nothing entered is lost)
            saved = tmp_path / "saved_housing.toml"
            path_field = page.locator(".hw-housing .hw-scenario-path input")
            path_field.fill(str(saved))
            page.locator(".hw-housing button.hw-scenario-save").click()
            page.wait_for_function("(want) => { const m = document.querySelector('.hw-housing .hw-scenario-message');"
                                   " return m !== null && m.textContent.includes(want); }",
                                   arg=f"Saved to {saved}", timeout=60_000)
            assert load_scenario(saved).title == load_scenario(ROOT / "examples" / "housing.toml").title
            page.locator(".hw-housing .hw-scenario-message").scroll_into_view_if_needed()
            page.screenshot(path=str(ARTIFACTS / "voila_app_saved.png"))
            page.locator("button.hw-jobs-back").click()
            _home_shown(page)

            # a bad scenario file: a message naming file:line:column and the key, no traceback
            _open_file(page, str(bad))
            where = f"{bad}:{bad_line}:1:"
            page.wait_for_function("(want) => { const m = document.querySelector('.hw-jobs-message .hw-msg');"
                                   " return m !== null && m.textContent.includes(want); }",
                                   arg=where, timeout=60_000)
            msg = page.locator(".hw-jobs-message").inner_text()
            assert "t_ambient" in msg and "°C" in msg, msg
            _no_traceback(page)
            assert page.locator(".hw-jobs-home").is_visible()
            page.locator(".hw-jobs-message").scroll_into_view_if_needed()
            page.screenshot(path=str(ARTIFACTS / "voila_app_bad_file.png"))
        finally:
            page.close()
