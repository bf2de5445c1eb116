"""Test-session settings shared by every test module."""

import os
import tempfile

# The workbench autosaves the last-used scenario; keep the test run's autosaves (and those of
# the notebook kernels it starts, which inherit the environment) out of the user's own folder.
os.environ["HEATPATH_STATE_DIR"] = tempfile.mkdtemp(prefix="heatpath-test-state-")
