"""Test-session settings shared by every test module.

No test leaves anything behind for another: each test gets its own state folder (the
workbench's autosave target), and every autosave timer and background task a test started
is stopped when it ends. The unit tests run in random order (pytest-randomly prints the
seed); notebook cells keep their order, after the unit tests.
"""

import os
import sys
import tempfile

import pytest

# Notebook kernels started by nbval inherit the environment: keep their autosaves out of the
# user's own folder too.
os.environ["HEATPATH_STATE_DIR"] = tempfile.mkdtemp(prefix="heatpath-test-state-")


def _is_notebook_cell(item) -> bool:
    return type(item).__module__.startswith("nbval")


@pytest.hookimpl(wrapper=True, tryfirst=True)
def pytest_collection_modifyitems(session, config, items):
    """Keep each notebook's cells in collection order, after the (shuffled) other tests."""
    cells = [item for item in items if _is_notebook_cell(item)]
    result = yield
    if cells:
        others = [item for item in items if not _is_notebook_cell(item)]
        items[:] = others + cells
    return result


@pytest.fixture(autouse=True)
def _isolated_state(tmp_path_factory, monkeypatch):
    """A fresh state folder per test; no timer or background task outlives its test."""
    monkeypatch.setenv("HEATPATH_STATE_DIR", str(tmp_path_factory.mktemp("state")))
    yield
    if "workbench.widgets" in sys.modules:
        from workbench.widgets.runner import stop_all_tasks
        from workbench.widgets.scenario_bar import cancel_pending_autosaves

        cancel_pending_autosaves()
        stop_all_tasks()
